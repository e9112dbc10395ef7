"""Measuring the first article and correcting the next cut: a use case above the Plan.

A builder sweeps the first article with an analyser. This module compares the
sweep with the model's prediction and finds the change, for each dimension the
builder can adjust, that puts the design's feature (resonance or least SWR) on
the target. It calls the stages' own functions and the electrical model
(fabplan.em); nothing in the stages imports it. Pure: no files, no printing, no
clock (the command gives the date for the history). Hz, ohm, mm, pF.

What a frequency marks (`Feature`): the resonance (X = 0 at the element's
terminals), the least SWR read through a matching chain (a `MatchChain`: the
matching device, a feed line, the system impedance), or the X = 0 that an
analyser shows through such a chain. A single measured frequency is never
taken for a feature it was not said to be (fabplan issue 14: on the bundled
example least SWR lies about 17 MHz below resonance, so reading a dip in SWR as
the resonance corrects the wrong way).

The correction (`correct`) for one adjustable dimension with value v0 as cut,
measured feature k at f_meas, and the goal feature t at the target:

1. the article's equivalent value v_a: where the model puts feature k at f_meas,
   found from v0 by the chord method on the model's central-difference
   sensitivity df_k/dv at v0 (the article is taken to be the model with that
   one dimension off);
2. the model's sensitivity df_t/dv at v_a (central difference): the
   sensitivity at the measured point;
3. v*: where the model puts feature t on the target, found from v_a by the
   chord method on that sensitivity (the first chord step is the first-order
   correction (target - f_t(v_a)) / (df_t/dv));
4. the change for the next cut is v* - v_a, applied to the value as cut:
   v0 + (v* - v_a). When k and t are the same feature this is the measured
   miss divided by the sensitivity, refined; when they differ, the model
   carries the article from the feature measured to the feature aimed at.

Its uncertainty from the measurement is u(f_meas) / |df_k/dv| (the law of
propagation of uncertainty to first order, JCGM 100:2008 (GUM), sec. 5.1
[from memory]); the model's own uncertainty (`UNCERTAINTY_FRAC`) bears on the
predicted frequencies, not on a change computed from the article's own
measurement, except through the model's sensitivity and, when k and t differ,
through the model's gap between the two features.

Adjustable dimensions (`Adjustable`) each carry a function that changes one
model set-up (`Setup`: the elements modelled together, the electrical
settings and the shapes' params by element name) to a new value: the fed
element's governing length (its shape's `governing`), its matching device's
(a hairpin's legs, modelled as wires; a gamma or T rod's length and its
capacitor when the design fixes one, modelled as a transmission line and read
through it as the plan's check reads it), and the value of every fixed
capacitor modelled with it. A matching device is corrected within MATCH_RANGE
of its value; a dimension that cannot put the feature on target alone is left
out with a note, the others stand.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass
from typing import Any, Literal

import numpy as np
import numpy.typing as npt

from .design.electrical import ElectricalSettings
from .em.build import ElectricalInput
from .em.devices import Through, line_match
from .em.records import UNCERTAINTY_FRAC
from .em.stage import ModelFactory, design_frequency, structure_model_of
from .em.sweep import least_swr, resonance
from .errors import DesignError, FabplanError, Finding
from .feed import Direct, Line, MatchChain
from .geometry.shapes import SHAPES
from .logs import log
from .measure.analysis import DEFAULT_LEVELS, Band, SweepAnalysis, analyse_sweep
from .measure.csvsweep import read_csv_sweep
from .measure.deembed import Stage, deembed, from_matching, line_stage
from .measure.history import Adjustment, HistoryRecord, HistorySummary, summarize
from .measure.history import Feature as HistoryFeature
from .measure.sweep import MeasuredSweep
from .measure.touchstone import read_touchstone
from .numeric import brentq
from .plan import ElementPlan, Plan, core_element
from .tuning import group_of

__all__ = [
    "FEATURE_KINDS", "SINGLE_KINDS", "BRACKET_FRAC", "TOLERANCE_FRAC", "FeatureKind",
    "SingleKind", "Feature", "Setup", "Adjustable", "Correction", "ArticleCorrection",
    "HistoryCorrection", "Between", "Figure", "Comparison", "Measurement", "setup_of",
    "adjustables", "governing_dimension", "match_dimensions", "capacitor_dimensions",
    "model_feature_hz", "DesignValue",
    "correct", "correct_single", "correct_by_history", "stages_between", "measure",
    "history_record", "read_sweep_text",
    "HistoryStatus", "history_status", "design_values", "TOUCHSTONE_SUFFIXES",
]

FeatureKind = Literal["resonance", "least-swr", "analyser-x0"]
FEATURE_KINDS: tuple[FeatureKind, ...] = ("resonance", "least-swr", "analyser-x0")
# what a single measured frequency may be said to be (`fabplan tune --measured --kind`)
SingleKind = FeatureKind
SINGLE_KINDS: tuple[SingleKind, ...] = FEATURE_KINDS

BRACKET_FRAC = 0.04  # the first search for a feature: +-4 % around where it is expected
MATCH_RANGE = 2.0  # a matching device's dimension is corrected within 1/2 to 2 times its value
TOLERANCE_FRAC = 2e-6  # a chord solve stops when the model is this close (0.9 kHz at 440 MHz)
MAX_CHORD_STEPS = 8
STEP_FRAC = 0.005  # central differences: +-0.5 % of the dimension
COMPARE_SPAN = 0.5  # the comparison keeps the sweep within +-50 % of the target
DIRECT_POINTS = 16  # up to this many frequencies the model is solved at each; else fitted
FIT_RTOL = 1e-7  # the rational fit of the prediction reproduces fresh solves to this
_CACHE = 4  # models kept at once
X0_MAX_SPAN = 0.1  # an analyser's X = 0 is looked for within +-10 % of where it is expected
X0_HINT = ("X = 0 read through this matching is not a usable mark here; measure the "
           "resonance at the element's terminals, or the least SWR")


# -- what a frequency marks ----------------------------------------------------------------
@dataclass(frozen=True)
class Feature:
    """What a frequency marks. kind: "resonance" (X = 0 at the element's
    terminals), "least-swr" (least SWR of `chain.swr_system`) or "analyser-x0"
    (X = 0 of `chain.at_radio`: what an analyser shows through the chain).
    chain: the chain read through (None for a resonance)."""

    kind: FeatureKind
    chain: MatchChain | None = None

    @property
    def name(self) -> str:
        return {"resonance": "resonance", "least-swr": "least SWR",
                "analyser-x0": "X = 0 at the analyser"}[self.kind]

    def describe(self) -> str:
        if self.kind == "resonance" or self.chain is None:
            return "resonance (X = 0 at the element's terminals)"
        if self.kind == "least-swr":
            return f"least SWR (through {self.chain.describe()})"
        return f"X = 0 as the analyser reads it (through {self.chain.describe()})"


def _feature(kind: FeatureKind, chain: MatchChain) -> Feature:
    return Feature(kind, None if kind == "resonance" else chain)


# -- the model set-up and the adjustable dimensions -------------------------------------------
@dataclass(frozen=True)
class Setup:
    """What one model is built from: the elements modelled together (the fed
    element's group), the electrical settings, and other params by element
    name (a shape's params with a dimension changed)."""

    group: tuple[ElectricalInput, ...]
    settings: ElectricalSettings
    overrides: tuple[tuple[str, Any], ...] = ()

    def params_of(self, name: str) -> Any:
        for n, p in self.overrides:
            if n == name:
                return p
        return next(e.spec.params for e in self.group if e.name == name)

    def with_params(self, name: str, params: Any) -> Setup:
        rest = tuple((n, p) for n, p in self.overrides if n != name)
        return dataclasses.replace(self, overrides=rest + ((name, params),))

    def with_input(self, new: ElectricalInput) -> Setup:
        group = tuple(new if e.name == new.name else e for e in self.group)
        return dataclasses.replace(self, group=group)


AdjustmentUnit = Literal["mm", "pF"]
# a value as fabplan.design.rewrite writes it: ("length", mm), ("number", x) or
# ("capacitance", F)
DesignValue = tuple[Literal["length", "number", "capacitance"], float]


@dataclass(frozen=True)
class Adjustable:
    """One dimension a builder can change for the next article.

    name: as the design file calls it ("side", "capacitance"); element: whose it
    is; unit: "mm" or "pF"; value: as the article was made (in `unit`); step:
    the half step of the central difference (in `unit`); lower: values at or
    below this are refused; apply(setup, value): the model set-up with the
    dimension at `value` (raises FabplanError when it cannot be built);
    design_values(value): the element-table keys that carry it, for
    fabplan.design.rewrite (None when it is written by hand); cut_change_mm(value):
    the change of the element's cut length (mm) at `value` (None when the cut
    length does not follow it); upper: values at or above this are refused (a
    matching device is corrected within MATCH_RANGE of its value, not redesigned).
    """

    name: str
    element: str
    unit: AdjustmentUnit
    value: float
    step: float
    apply: Callable[[Setup, float], Setup]
    design_values: Callable[[float], Mapping[str, DesignValue]] | None = None
    cut_change_mm: Callable[[float], float] | None = None
    lower: float = 0.0
    upper: float = math.inf


def setup_of(plan: Plan, element: ElementPlan, settings: ElectricalSettings) -> Setup:
    """The model set-up of `element`: its group (the placed elements together, or
    itself alone) with `settings`."""
    return Setup(tuple(group_of(plan, element)), settings)


def governing_dimension(plan: Plan, element: ElementPlan) -> Adjustable:
    """The element's governing length (the one its shape scales: a folded
    dipole's side, a loop's perimeter)."""
    spec = element.spec
    shape = SHAPES[spec.shape]
    key, value = shape.governing(spec.params)
    diameter = plan.design.stock_of(spec).profile.outer_diameter_mm
    name = element.name
    cut_now = sum(p.cut_length_mm for p in element.pieces)

    def apply(setup: Setup, v: float) -> Setup:
        params = shape.with_governing(setup.params_of(name), v)
        bad = [f for f in shape.problems(params, diameter) if f.severity == "error"]
        if bad:
            raise FabplanError(f"at {key} = {v:.2f} mm the element cannot be built: "
                               f"{bad[0].message}", field=key, value=round(v, 3))
        return setup.with_params(name, params)

    def design_values(v: float) -> Mapping[str, DesignValue]:
        return shape.tuned_keys(shape.with_governing(spec.params, v))

    def cut_change(v: float) -> float:
        new = dataclasses.replace(spec, params=shape.with_governing(spec.params, v))
        pieces = core_element(plan.design, new)[1]
        return sum(p.cut_length_mm for p in pieces) - cut_now

    return Adjustable(key, name, "mm", value, STEP_FRAC * value, apply, design_values,
                      cut_change, 0.0)


def capacitor_dimensions(setup: Setup) -> tuple[Adjustable, ...]:
    """Every fixed capacitor modelled with the fed element (a loop's tuning
    capacitor beside its coupling loop), in pF."""
    out = []
    for e in setup.group:
        cap = e.spec.capacitor
        if cap is None or cap.capacitance_f is None:
            continue
        name = e.name

        def apply(s: Setup, v_pf: float, name: str = name) -> Setup:
            if not v_pf > 0:
                raise FabplanError("a capacitance is positive", field="capacitance",
                                   value=round(v_pf, 4))
            current = next(x for x in s.group if x.name == name)
            c = current.spec.capacitor
            if c is None:  # not reached: the element had a capacitor
                return s
            spec = dataclasses.replace(current.spec, capacitor=dataclasses.replace(
                c, capacitance_f=v_pf * 1e-12))
            return s.with_input(dataclasses.replace(current, spec=spec))

        pf = cap.capacitance_f * 1e12
        out.append(Adjustable("capacitance", name, "pF", pf, STEP_FRAC * pf, apply,
                              lambda v: {"capacitor.capacitance": ("capacitance", v * 1e-12)}))
    return tuple(out)


def match_dimensions(plan: Plan, element: ElementPlan, setup: Setup) -> tuple[Adjustable, ...]:
    """The fed element's matching device: a hairpin's legs (its part's governing
    length, modelled as wires), or a gamma or T rod's length (the strap's place)
    and its capacitor when the design fixes one (modelled as a transmission line,
    fabplan.em.devices). Each is written into `[element.match]`."""
    m = element.spec.match
    if m is None:
        return ()
    name = element.name
    out: list[Adjustable] = []
    if not m.line_modelled:
        part = next((e for e in plan.elements if e.spec.part_of == name), None)
        if part is None or not any(e.name == part.name for e in setup.group):
            return ()
        shape = SHAPES[part.spec.shape]
        _, legs = shape.governing(part.spec.params)
        diameter = plan.design.stock_of(part.spec).profile.outer_diameter_mm
        cut_now = sum(p.cut_length_mm for p in part.pieces)
        part_name, part_spec = part.name, part.spec

        def apply_legs(s: Setup, v: float) -> Setup:
            params = shape.with_governing(s.params_of(part_name), v)
            bad = [f for f in shape.problems(params, diameter) if f.severity == "error"]
            if bad:
                raise FabplanError(f"at match.length = {v:.2f} mm the hairpin cannot be made: "
                                   f"{bad[0].message}", field="match.length", value=round(v, 3))
            return s.with_params(part_name, params)

        def cut_change(v: float) -> float:
            new = dataclasses.replace(part_spec, params=shape.with_governing(part_spec.params,
                                                                              v))
            return sum(p.cut_length_mm for p in core_element(plan.design, new)[1]) - cut_now

        out.append(Adjustable("match.length", name, "mm", legs, STEP_FRAC * legs, apply_legs,
                              lambda v: {"match.length": ("length", v)}, cut_change,
                              legs / MATCH_RANGE, legs * MATCH_RANGE))
        return tuple(out)

    def apply_match(s: Setup, length_mm: float | None = None,
                    capacitance_f: float | None = None) -> Setup:
        current = next(x for x in s.group if x.name == name)
        spec_m = current.spec.match
        if spec_m is None:  # not reached: the element had its match
            return s
        if length_mm is not None:
            if not length_mm > 0:
                raise FabplanError("a rod's length is positive", field="match.length",
                                   value=round(length_mm, 3))
            spec_m = dataclasses.replace(spec_m, length_mm=length_mm)
        if capacitance_f is not None:
            if not capacitance_f > 0:
                raise FabplanError("a capacitance is positive", field="match.capacitance",
                                   value=round(capacitance_f * 1e12, 4))
            spec_m = dataclasses.replace(spec_m, capacitance_f=capacitance_f)
        spec = dataclasses.replace(current.spec, match=spec_m)
        return s.with_input(dataclasses.replace(current, spec=spec))

    def apply_rod(s: Setup, v: float) -> Setup:
        return apply_match(s, length_mm=v)

    out.append(Adjustable("match.length", name, "mm", m.length_mm, STEP_FRAC * m.length_mm,
                          apply_rod, lambda v: {"match.length": ("length", v)}, None,
                          m.length_mm / MATCH_RANGE, m.length_mm * MATCH_RANGE))
    if m.capacitance_f is not None:
        pf = m.capacitance_f * 1e12

        def apply_cap(s: Setup, v_pf: float) -> Setup:
            return apply_match(s, capacitance_f=v_pf * 1e-12)

        out.append(Adjustable("match.capacitance", name, "pF", pf, STEP_FRAC * pf, apply_cap,
                              lambda v: {"match.capacitance": ("capacitance", v * 1e-12)},
                              None, pf / MATCH_RANGE, pf * MATCH_RANGE))
    return tuple(out)


def adjustables(plan: Plan, element: ElementPlan, setup: Setup) -> tuple[Adjustable, ...]:
    """The dimensions a builder can change on `element`'s antenna: its governing
    length first, then its matching device's (`match_dimensions`), then each fixed
    capacitor modelled with it."""
    return ((governing_dimension(plan, element),) + match_dimensions(plan, element, setup)
            + capacitor_dimensions(setup))


# -- the model's features ----------------------------------------------------------------------
def _x0_crossing(model: Any, chain: MatchChain, freqs: npt.NDArray[np.float64],
                 z: npt.NDArray[np.complex128], near_hz: float) -> float | None:
    x = np.asarray(chain.at_radio(z, freqs), dtype=complex).imag
    idx = np.nonzero(np.sign(x[:-1]) * np.sign(x[1:]) <= 0)[0]
    if len(idx) == 0:
        return None
    i = int(min(idx, key=lambda k: abs(0.5 * (freqs[k] + freqs[k + 1]) - near_hz)))
    if x[i] == 0:
        return float(freqs[i])
    if x[i + 1] == 0:
        return float(freqs[i + 1])

    def xr(f: float) -> float:
        return float(complex(chain.at_radio(model.impedance(f), f)).imag)

    return float(brentq(xr, float(freqs[i]), float(freqs[i + 1]), xtol=1e-7 * float(freqs[i])))


def model_feature_hz(model: Any, feature: Feature, expect_hz: float,
                     span_frac: float = BRACKET_FRAC, points: int = 9) -> float:
    """The model's frequency (Hz) of `feature`, searched from a small sweep of
    `points` around `expect_hz` (+-`span_frac`), moved along or widened when the
    answer lies at its edge (refined by Brent's methods, fabplan.numeric)."""
    centre = expect_hz
    for _ in range(6):
        span = min(span_frac, 0.45)
        freqs = np.linspace(centre * (1 - span), centre * (1 + span), points)
        z = np.asarray(model.sweep(freqs), dtype=complex)
        if feature.kind == "resonance":
            f = resonance(model, freqs, z, expect_hz)
            if f is not None:
                return f
            centre = float(freqs[-1] if z.imag[-1] < 0 else freqs[0])
        elif feature.kind == "least-swr" and feature.chain is not None:
            s = np.atleast_1d(feature.chain.swr_system(z, freqs))
            f, _, at_edge = least_swr(model, feature.chain, freqs, s)
            if not at_edge:
                return f
            centre = f
        elif feature.chain is not None:
            got = _x0_crossing(model, feature.chain, freqs, z, expect_hz)
            if got is not None:
                return got
            if span >= X0_MAX_SPAN:  # a far crossing would be another one: refuse
                break
        span_frac *= 2
    if feature.kind == "analyser-x0":
        raise FabplanError(f"the model's X at the analyser does not cross zero within "
                           f"+-{100 * X0_MAX_SPAN:.0f} % of {expect_hz / 1e6:.3f} MHz: "
                           + X0_HINT, field="model")
    raise FabplanError(f"the model shows no {feature.name} within a wide search around "
                       f"{expect_hz / 1e6:.3f} MHz: the element may be far from the target; "
                       "check its dimensions", field="model")


class _Evaluator:
    """Models of one set-up with one dimension changed, a few kept at once."""

    def __init__(self, setup: Setup, factory: ModelFactory, f_max_hz: float) -> None:
        self.setup, self.factory, self.f_max_hz = setup, factory, f_max_hz
        self.models = 0
        self._cache: dict[tuple[str, str, float], Any] = {}
        self._solved_cap: float | None = None

    def model(self, adj: Adjustable | None, value: float) -> Any:
        key = ("", "", 0.0) if adj is None else (adj.element, adj.name, float(value))
        if key not in self._cache:
            if adj is not None and not value > adj.lower:
                raise FabplanError(f"the correction would take {adj.name} to "
                                   f"{value:.4g} {adj.unit}: the model cannot follow the "
                                   "measurement that far; check the set-up",
                                   field=adj.name, value=round(value, 4))
            if adj is not None and not value < adj.upper:
                raise FabplanError(f"it would take more than {MATCH_RANGE:g} times its "
                                   f"value ({value:.4g} {adj.unit}): a matching device is "
                                   "corrected here, not redesigned; correct another "
                                   "dimension, or redesign the match with `fabplan tune`",
                                   field=adj.name, value=round(value, 4))
            s = self.setup if adj is None else adj.apply(self.setup, value)
            model = self._through(self.factory(s.group, s.settings, self.f_max_hz,
                                               dict(s.overrides)), s)
            self.models += 1
            if len(self._cache) >= _CACHE:
                self._cache.pop(next(iter(self._cache)))
            self._cache[key] = model
        return self._cache[key]

    def _through(self, model: Any, s: Setup) -> Any:
        """`model` seen through the set-up's gamma or T match, as the plan's check sees
        it (fabplan.em.stage): a capacitor the design leaves open is the one the check
        solved at the design frequency for the design as drawn, and the article was
        built with it, so it stays at that value when another dimension changes."""
        device = line_match(s.group)
        if device is None:
            return model
        as_built = line_match(self.setup.group)  # the device of the design as drawn
        if device.capacitance_f is None and as_built is not None:
            if self._solved_cap is None:
                base = model if s is self.setup else self.model(None, 0.0).model
                f0 = design_frequency(self.setup.settings)
                solved = as_built.solved_for(complex(base.impedance(f0)), f0)
                self._solved_cap = solved.capacitance_f or 0.0
            if self._solved_cap > 0:
                device = dataclasses.replace(device, capacitance_f=self._solved_cap, solved=True)
        return Through(model, device)

    def feature(self, adj: Adjustable | None, value: float, feature: Feature,
                expect_hz: float, span_frac: float = BRACKET_FRAC) -> float:
        f = model_feature_hz(self.model(adj, value), feature, expect_hz, span_frac)
        log.debug("measure: %s = %.5g -> %s %.6f MHz", adj.name if adj else "design", value,
                  feature.name, f / 1e6)
        return f

    def slope(self, adj: Adjustable, value: float, feature: Feature, f_here: float) -> float:
        """d f / d value (Hz per unit) by central difference at `value`."""
        h = adj.step
        lo = self.feature(adj, value - h, feature, f_here, 0.015)
        hi = self.feature(adj, value + h, feature, f_here, 0.015)
        return (hi - lo) / (2 * h)

    def solve(self, adj: Adjustable, feature: Feature, goal_hz: float, value: float,
              f_value: float, slope: float) -> tuple[float, float]:
        """The value (and the model's frequency there) where `feature` falls on
        `goal_hz`, by the chord method from (`value`, `f_value`) with `slope`."""
        v, f = value, f_value
        for _ in range(MAX_CHORD_STEPS):
            if abs(f / goal_hz - 1) <= TOLERANCE_FRAC:
                return v, f
            v = v + (goal_hz - f) / slope
            f = self.feature(adj, v, feature, goal_hz, 0.015)
        if abs(f / goal_hz - 1) <= 10 * TOLERANCE_FRAC:
            return v, f
        hint = X0_HINT if feature.kind == "analyser-x0" else (
            "the model does not follow the measurement smoothly; check the set-up")
        raise FabplanError(f"the correction of {adj.name} did not settle ({v:.4g} {adj.unit} "
                           f"gives {f / 1e6:.4f} MHz for {goal_hz / 1e6:.4f} MHz): {hint}",
                           field=adj.name)


# -- the correction ---------------------------------------------------------------------------
@dataclass(frozen=True)
class Correction:
    """The change of one dimension for the next article.

    value: as the article was made; equivalent_value: where the model
    reproduces the measurement (None for a correction from the history);
    change: for the next cut (new value = value + change); change_unc: its
    uncertainty from the measured frequency's; sensitivity_hz_per_unit: d f /
    d value of the goal feature where the correction starts (the measured
    point); cut_change_mm: the change of the element's cut length (mm), when it
    follows; goal_after_hz: the model's goal feature for the corrected article
    (Hz). Values in `unit`.
    """

    dimension: str
    element: str
    unit: AdjustmentUnit
    value: float
    equivalent_value: float | None
    change: float
    change_unc: float
    sensitivity_hz_per_unit: float
    cut_change_mm: float | None
    goal_after_hz: float

    @property
    def new_value(self) -> float:
        return self.value + self.change

    @property
    def direction(self) -> str:
        """"lengthen", "shorten" (mm) or "increase", "decrease" (pF)."""
        more = self.change > 0
        if self.unit == "mm":
            return "lengthen" if more else "shorten"
        return "increase" if more else "decrease"


@dataclass(frozen=True)
class ArticleCorrection:
    """What one measured frequency says about the next cut.

    goal: the feature to put on `target_hz`; measured: the feature measured at
    `measured_hz` (+- `measured_unc_hz`); model_measured_hz / model_goal_hz: the
    model's measured and goal features for the design as the article was made;
    article_goal_hz: where the article's goal feature lies (measured, or carried
    over by the model from the feature measured); corrections: one per
    adjustable dimension; models_built: method-of-moments models built.
    Frequencies in Hz.
    """

    element: str
    target_hz: float
    goal: Feature
    measured: Feature
    measured_hz: float
    measured_unc_hz: float
    model_measured_hz: float
    model_goal_hz: float
    article_goal_hz: float
    corrections: tuple[Correction, ...]
    models_built: int
    notes: tuple[str, ...] = ()
    unreached: tuple[tuple[str, str], ...] = ()  # (dimension, why) of those left out

    @property
    def relative_difference(self) -> float:
        """(measured - model) / model of the feature measured."""
        return self.measured_hz / self.model_measured_hz - 1

    def correction(self, dimension: str | None = None) -> Correction:
        """The correction of `dimension` (default: the first, the governing length)."""
        if dimension is None:
            return self.corrections[0]
        for c in self.corrections:
            if c.dimension == dimension:
                return c
        for name, why in self.unreached:
            if name == dimension:
                raise DesignError(f"cannot put the {self.goal.name} on target alone: {why}",
                                  field="--adjust", value=dimension)
        names = ", ".join(c.dimension for c in self.corrections)
        raise DesignError(f"not an adjustable dimension of this design ({names})",
                          field="--adjust", value=dimension)


def _f_max(settings: ElectricalSettings, *freqs_hz: float) -> float:
    """The frequency the model is meshed for: the design's sweep's top, as the
    plan's own check has it, or a higher frequency asked (the solver accepts up
    to twice the meshed frequency)."""
    return max(settings.sweep_to_hz, *freqs_hz)


def _expect_hz(element: ElementPlan, feature: Feature, fallback_hz: float) -> float:
    el = element.electrical
    if el is None:
        return fallback_hz
    if feature.kind == "resonance" and el.sweep.resonance_hz is not None:
        return el.sweep.resonance_hz
    if feature.kind == "least-swr":
        return el.sweep.min_swr_hz
    return fallback_hz


def correct(plan: Plan, element: ElementPlan, settings: ElectricalSettings,
            measured: Feature, measured_hz: float, target_hz: float, goal: Feature, *,
            measured_unc_hz: float = 0.0, dimensions: Sequence[Adjustable] | None = None,
            factory: ModelFactory = structure_model_of,
            evaluator: _Evaluator | None = None) -> ArticleCorrection:
    """The change of each adjustable dimension that moves the article's `goal`
    feature onto `target_hz`, from its `measured` feature at `measured_hz` (Hz)
    (see the module docstring for the method)."""
    for name, f in (("measured frequency", measured_hz), ("target", target_hz)):
        if not (math.isfinite(f) and f > 0):
            raise DesignError("a frequency is a positive number of Hz", field=name, value=f)
    setup = setup_of(plan, element, settings) if evaluator is None else evaluator.setup
    dims = tuple(dimensions) if dimensions is not None else adjustables(plan, element, setup)
    ev = evaluator or _Evaluator(setup, factory, _f_max(settings, measured_hz, target_hz))
    span = max(BRACKET_FRAC, 1.5 * abs(measured_hz / target_hz - 1))
    f_k0 = ev.feature(None, 0.0, measured, measured_hz, span)
    f_t0 = f_k0 if goal == measured else ev.feature(
        None, 0.0, goal, _expect_hz(element, goal, target_hz), span)
    out: list[Correction] = []
    skipped: list[str] = []
    unreached: list[tuple[str, str]] = []
    article_goal = measured_hz
    for adj in dims:
        if adj is dims[0]:
            got = _correct_one(ev, adj, measured, measured_hz, target_hz, goal, f_k0, f_t0,
                               span, measured_unc_hz)
            article_goal = got[1]
        else:
            try:
                got = _correct_one(ev, adj, measured, measured_hz, target_hz, goal, f_k0,
                                   f_t0, span, measured_unc_hz)
            except FabplanError as exc:  # a matching device's dimension may not reach
                skipped.append(f"{adj.name} of {adj.element!r} alone cannot put the "
                               f"{goal.name} on target: {exc.rule}")
                unreached.append((adj.name, exc.rule))
                log.debug("measure: %s skipped: %s", adj.name, exc)
                continue
        out.append(got[0])
    notes = _notes(measured, goal, measured_hz, f_k0, f_t0, article_goal) + tuple(skipped)
    return ArticleCorrection(element.name, target_hz, goal, measured, measured_hz,
                             measured_unc_hz, f_k0, f_t0, article_goal, tuple(out), ev.models,
                             notes, tuple(unreached))


def _correct_one(ev: _Evaluator, adj: Adjustable, measured: Feature, measured_hz: float,
                 target_hz: float, goal: Feature, f_k0: float, f_t0: float, span: float,
                 measured_unc_hz: float) -> tuple[Correction, float]:
    """One dimension's correction, and the article's goal feature (Hz) it implies."""
    # the article's equivalent value: the model reproduces the measurement there
    s_k = ev.slope(adj, adj.value, measured, f_k0)
    if not (math.isfinite(s_k) and s_k != 0):
        raise FabplanError(f"the model's {measured.name} does not move with {adj.name}: "
                           "it cannot correct it", field=adj.name)
    v_a, _ = ev.solve(adj, measured, measured_hz, adj.value, f_k0, s_k)
    # the goal feature there, and the sensitivity at the measured point
    if goal == measured:
        f_ta = measured_hz
    else:
        f_ta = ev.feature(adj, v_a, goal, f_t0 + (measured_hz - f_k0), span)
    s_t = ev.slope(adj, v_a, goal, f_ta)
    if not (math.isfinite(s_t) and s_t != 0):
        raise FabplanError(f"the model's {goal.name} does not move with {adj.name}: "
                           "it cannot correct it", field=adj.name)
    v_star, f_star = ev.solve(adj, goal, target_hz, v_a, f_ta, s_t)
    change = v_star - v_a
    cut = adj.cut_change_mm(adj.value + change) if adj.cut_change_mm is not None else None
    return (Correction(adj.name, adj.element, adj.unit, adj.value, v_a, change,
                       measured_unc_hz / abs(s_k), s_t, cut, f_star), f_ta)


def _notes(measured: Feature, goal: Feature, measured_hz: float, f_k0: float, f_t0: float,
           article_goal_hz: float) -> tuple[str, ...]:
    miss = measured_hz / f_k0 - 1
    out = []
    if abs(miss) <= UNCERTAINTY_FRAC:
        out.append(f"the article's {measured.name} lies {100 * miss:+.2f} % from the model's, "
                   f"within the model's +-{100 * UNCERTAINTY_FRAC:.1f} % uncertainty")
    elif abs(miss) <= 0.03:
        out.append(f"the article's {measured.name} lies {100 * miss:+.2f} % from the model's, "
                   f"beyond the model's +-{100 * UNCERTAINTY_FRAC:.1f} % uncertainty: the "
                   "stock, the bends, the feed gap or the surroundings differ a little from "
                   "the model; the correction uses the model's sensitivity, which still holds "
                   "this near")
    else:
        out.append(f"the article's {measured.name} lies {100 * miss:+.2f} % from the model's: "
                   "something differs from the model (stock, spacing, feed gap, matching, "
                   "surroundings or the measurement set-up); check them before cutting more, "
                   "cut the next one long and trim")
    if goal != measured:
        gap = f_t0 - f_k0
        out.append(f"the {goal.name} was not measured: the model, which puts it "
                   f"{abs(gap) / 1e6:.3f} MHz {'above' if gap > 0 else 'below'} the "
                   f"{measured.name}, carries the article's {measured.name} over to its "
                   f"{goal.name} at about {article_goal_hz / 1e6:.3f} MHz; an error in that "
                   "gap adds to the correction")
    return tuple(out)


def correct_single(plan: Plan, element: ElementPlan, settings: ElectricalSettings,
                   kind: str, measured_hz: float, target_hz: float, *,
                   tune_for: str | None = None, factory: ModelFactory = structure_model_of
                   ) -> ArticleCorrection:
    """The correction from one measured frequency whose kind the builder states:
    "resonance" (X = 0 at the element), "least-swr" (least SWR read through the
    design's matching and feed line) or "analyser-x0" (X = 0 as an analyser
    reads it through them). The goal is `tune_for` (default: the design's)."""
    measured = next((k for k in SINGLE_KINDS if k == kind), None)
    if measured is None:
        raise DesignError("say what the measured frequency is: " + ", ".join(SINGLE_KINDS),
                          field="--kind", value=kind)
    goal = _goal(tune_for or settings.tune_for)
    chain = settings.chain
    return correct(plan, element, settings, _feature(measured, chain), measured_hz, target_hz,
                   _feature(goal, chain), factory=factory)


def _goal(name: str) -> FeatureKind:
    """What goes on target: "resonance" or "least-swr"."""
    if name == "resonance":
        return "resonance"
    if name == "least-swr":
        return "least-swr"
    raise DesignError("the goal is resonance or least-swr", field="--for", value=name)


@dataclass(frozen=True)
class HistoryCorrection:
    """The change for the next batch from the history's average difference:
    the model tuned to `model_goal_hz` = target / (1 + mean difference) so that
    an article that differs as the past ones did lands on the target. Hz."""

    element: str
    target_hz: float
    goal: Feature
    summary: HistorySummary
    model_goal_hz: float
    model_now_hz: float
    corrections: tuple[Correction, ...]
    models_built: int


def correct_by_history(plan: Plan, element: ElementPlan, settings: ElectricalSettings,
                       goal: Feature, target_hz: float, summary: HistorySummary, *,
                       dimensions: Sequence[Adjustable] | None = None,
                       factory: ModelFactory = structure_model_of) -> HistoryCorrection:
    """Tune the model's `goal` feature to target / (1 + the history's mean
    difference) by each adjustable dimension (chord method on the model's
    central-difference sensitivity at the design's value)."""
    goal_hz = summary.model_target_hz(target_hz)
    setup = setup_of(plan, element, settings)
    dims = tuple(dimensions) if dimensions is not None else adjustables(plan, element, setup)
    ev = _Evaluator(setup, factory, _f_max(settings, target_hz, goal_hz))
    f0 = ev.feature(None, 0.0, goal, _expect_hz(element, goal, goal_hz),
                    max(BRACKET_FRAC, 1.5 * abs(goal_hz / target_hz - 1)))
    out = []
    for adj in dims:
        try:
            s = ev.slope(adj, adj.value, goal, f0)
            if not (math.isfinite(s) and s != 0):
                raise FabplanError(f"the model's {goal.name} does not move with {adj.name}",
                                   field=adj.name)
            v, f = ev.solve(adj, goal, goal_hz, adj.value, f0, s)
        except FabplanError:
            if adj is dims[0]:
                raise
            continue  # a matching device's dimension may not reach: the others stand
        change = v - adj.value
        cut = adj.cut_change_mm(v) if adj.cut_change_mm is not None else None
        unc = 0.0
        if summary.standard_error is not None:
            unc = abs(goal_hz * summary.standard_error / (1 + summary.mean_relative_difference)
                      / s)
        out.append(Correction(adj.name, adj.element, adj.unit, adj.value, None, change, unc,
                              s, cut, f))
    return HistoryCorrection(element.name, target_hz, goal, summary, goal_hz, f0, tuple(out),
                             ev.models)


# -- comparing a measured sweep with the prediction -------------------------------------------
@dataclass(frozen=True)
class Between:
    """What lay between the analyser and the element when the sweep was taken:
    a feed line (None: the analyser at the matching device, or at the element),
    and whether the design's matching device was fitted."""

    line: Line | None = None
    matching_fitted: bool = True


def stages_between(settings: ElectricalSettings, between: Between) -> list[Stage]:
    """The de-embedding stages, from the analyser outward."""
    stages = [] if between.line is None else [line_stage(between.line)]
    if between.matching_fitted:
        stage = from_matching(settings.chain.matching)
        if stage is not None:
            stages.append(stage)
    return stages


@dataclass(frozen=True)
class Figure:
    """One figure read from the measured and the predicted sweep alike.

    unit: "Hz", "ohm" or "" (SWR); measured / predicted with their
    uncertainties from the sweep's step and noise (None when not found);
    note: why a value is missing, or what it means; measured_at_least,
    predicted_at_least: the value is a lower bound (a band with an edge beyond
    the sweep).
    """

    name: str
    unit: Literal["Hz", "ohm", ""]
    measured: float | None
    measured_unc: float | None
    predicted: float | None
    predicted_unc: float | None
    note: str = ""
    measured_at_least: bool = False
    predicted_at_least: bool = False

    @property
    def difference(self) -> float | None:
        if (self.measured is None or self.predicted is None or self.measured_at_least
                or self.predicted_at_least):
            return None
        return self.measured - self.predicted


@dataclass(frozen=True)
class Comparison:
    """A measured sweep beside the model's prediction for the article as made.

    freq_hz: the frequencies compared (the sweep's, within +-50 % of the
    target); measured_z_ohm: the measured impedance at the element's terminals
    after de-embedding (None without phase); measured_swr / predicted_swr: SWR
    read through `swr_chain` (the design's matching chain when the phase is
    known, else the matching as fitted into the analyser's reference);
    predicted_z_ohm: the model's impedance at the terminals; measured /
    predicted: the analyses of both (fabplan.measure.analysis); figures: the
    figures side by side; removed, plane, left: what de-embedding removed, where
    the sweep now is, and what it still contains; target_hz: the target (Hz);
    source: the sweep's file name; dropped: points outside the compared span.
    """

    element: str
    source: str
    target_hz: float | None
    freq_hz: tuple[float, ...]
    measured_z_ohm: tuple[complex, ...] | None
    measured_swr: tuple[float, ...]
    predicted_z_ohm: tuple[complex, ...]
    predicted_swr: tuple[float, ...]
    swr_chain: str
    system_ohm: float
    measured: SweepAnalysis
    predicted: SweepAnalysis
    figures: tuple[Figure, ...]
    removed: tuple[str, ...]
    plane: str
    left: str
    findings: tuple[Finding, ...]
    dropped: int = 0
    has_phase: bool = True
    uncertainty_frac: float = UNCERTAINTY_FRAC


@dataclass(frozen=True)
class Measurement:
    """What `measure` found: the comparison, and the correction (None when there
    is no target, or the sweep shows no feature to correct from: `note` says
    why)."""

    comparison: Comparison
    correction: ArticleCorrection | None
    note: str = ""


def _model_sweep(model: Any, freqs: npt.NDArray[np.float64]) -> npt.NDArray[np.complex128]:
    if len(freqs) <= DIRECT_POINTS:
        return np.asarray(model.sweep(freqs), dtype=complex)
    from .em.fitting import fit_sweep

    fit = fit_sweep(lambda f: complex(model.impedance(f)), float(freqs[0]), float(freqs[-1]),
                    rtol=FIT_RTOL)
    return np.asarray(fit.values(freqs, 0), dtype=complex)


def _at(freqs: npt.NDArray[np.float64], values: npt.ArrayLike, f: float) -> float | None:
    v = np.asarray(values, dtype=float)
    if not freqs[0] <= f <= freqs[-1]:
        return None
    return float(np.interp(f, freqs, v))


def _band_unc(b: Band) -> float | None:
    return sum(e.unc_hz for e in (b.lower, b.upper) if e is not None) if b.reached else None


def _figures(measured: SweepAnalysis, predicted: SweepAnalysis, target: float | None,
             f: npt.NDArray[np.float64], m_swr: npt.NDArray[np.float64],
             m_z: npt.NDArray[np.complex128] | None, p_swr: npt.NDArray[np.float64],
             p_z: npt.NDArray[np.complex128]) -> tuple[Figure, ...]:
    out: list[Figure] = []
    mr, pr = measured.resonance, predicted.resonance
    why = "" if mr is not None else ("no phase measured" if m_z is None else
                                     "none in the sweep")
    out.append(Figure("resonance (X = 0)", "Hz",
                      None if mr is None else mr.frequency_hz,
                      None if mr is None else mr.frequency_unc_hz,
                      None if pr is None else pr.frequency_hz,
                      None if pr is None else pr.frequency_unc_hz, why))
    out.append(Figure("R at resonance", "ohm", None if mr is None else mr.r_ohm,
                      None if mr is None else mr.r_unc_ohm, None if pr is None else pr.r_ohm,
                      None if pr is None else pr.r_unc_ohm, why))
    ml, pl = measured.least_swr, predicted.least_swr
    edge = "at the sweep's end: the true minimum may lie beyond"
    out.append(Figure("least SWR frequency", "Hz", ml.frequency_hz, ml.frequency_unc_hz,
                      pl.frequency_hz, pl.frequency_unc_hz, edge if ml.at_sweep_end else ""))
    out.append(Figure("least SWR", "", ml.swr, ml.swr_unc, pl.swr, pl.swr_unc))
    for mb, pb in zip(measured.bands, predicted.bands):
        out.append(Figure(f"SWR < {mb.level:g} bandwidth", "Hz", mb.width_at_least_hz,
                          _band_unc(mb), pb.width_at_least_hz, _band_unc(pb),
                          "" if mb.reached else "not reached",
                          mb.reached and mb.width_hz is None, pb.reached and pb.width_hz is None))
    if target is not None:
        outside = "the target lies outside the sweep"
        ms, ps = _at(f, m_swr, target), _at(f, p_swr, target)
        out.append(Figure("SWR at the target", "", ms, None, ps, None,
                          outside if ms is None else ""))
        for part, name in ((np.real, "R"), (np.imag, "X")):
            mv = None if m_z is None else _at(f, part(m_z), target)
            pv = _at(f, part(p_z), target)
            out.append(Figure(f"{name} at the target", "ohm", mv, None, pv, None,
                              outside if pv is None else ("no phase measured" if m_z is None
                                                          else "")))
    return tuple(out)


def measure(plan: Plan, element: ElementPlan, settings: ElectricalSettings,
            sweep: MeasuredSweep, between: Between, *, target_hz: float | None = None,
            goal_kind: str | None = None, dimensions: Sequence[Adjustable] | None = None,
            factory: ModelFactory = structure_model_of) -> Measurement:
    """Compare a first article's sweep with the model of the design as made, and
    find the correction that puts the design's feature (resonance or least SWR,
    `goal_kind`, default the design's tune_for) on `target_hz` (default the
    design's target).

    The sweep is de-embedded (`between`: a feed line, the matching device as
    modelled), read alike with the prediction through the same chain, and the
    feature measured (the goal feature when the sweep shows it, else the other
    one, carried over by the model) corrected from (see `correct`).
    """
    target = target_hz if target_hz is not None else settings.target_hz
    goal_name = _goal(goal_kind or settings.tune_for)
    src = sweep.source or None
    f_all = np.asarray(sweep.freq_hz, dtype=float)
    ref = target if target is not None else 0.5 * (f_all[0] + f_all[-1])
    keep = (f_all >= (1 - COMPARE_SPAN) * ref) & (f_all <= (1 + COMPARE_SPAN) * ref) & (f_all > 0)
    if int(keep.sum()) < 3:
        raise DesignError(f"fewer than 3 of the sweep's frequencies lie within "
                          f"+-{100 * COMPARE_SPAN:.0f} % of {ref / 1e6:.3f} MHz: sweep around "
                          "the target", field="sweep", value=f"{len(f_all)} points", source=src)
    dropped = int(len(f_all) - keep.sum())
    if dropped:
        sub_s11 = None if sweep.s11 is None else np.asarray(sweep.s11)[keep]
        sweep = dataclasses.replace(sweep, freq_hz=f_all[keep],
                                    gamma_mag=np.asarray(sweep.gamma_mag)[keep], s11=sub_s11)
    f = np.asarray(sweep.freq_hz, dtype=float)
    chain = settings.chain
    stages = stages_between(settings, between)
    if sweep.has_phase:
        de = deembed(sweep, stages, z0_ohm=chain.reference_ohm)
        z_el = de.sweep.z_ohm
        if z_el is None:  # not reached: a sweep with phase keeps it
            raise DesignError("the de-embedded sweep lost its phase", field="sweep")
        reading = chain
        m_swr = np.atleast_1d(np.asarray(chain.swr_system(z_el, f), dtype=float))
    else:
        de = deembed(sweep, [s for s in stages if s.kind == "feed line"])
        z_el = None
        fitted = chain.matching if between.matching_fitted else Direct()
        reading = MatchChain(chain.reference_ohm, sweep.z0_ohm, fitted, None)
        m_swr = np.asarray(de.sweep.swr, dtype=float)
    setup = setup_of(plan, element, settings)
    ev = _Evaluator(setup, factory, _f_max(settings, float(f[-1]), ref))
    z_pred = _model_sweep(ev.model(None, 0.0), f)
    p_swr = np.atleast_1d(np.asarray(reading.swr_system(z_pred, f), dtype=float))
    near = target
    m_an = analyse_sweep(f, swr=m_swr, z_ohm=z_el, z0_ohm=reading.system_ohm, near_hz=near,
                         levels=DEFAULT_LEVELS, source=sweep.source)
    p_an = analyse_sweep(f, swr=p_swr, z_ohm=z_pred, z0_ohm=reading.system_ohm, near_hz=near,
                         levels=DEFAULT_LEVELS)
    comparison = Comparison(
        element.name, sweep.source, target, tuple(float(x) for x in f),
        None if z_el is None else tuple(complex(z) for z in z_el),
        tuple(float(x) for x in m_swr), tuple(complex(z) for z in z_pred),
        tuple(float(x) for x in p_swr), reading.describe(), reading.system_ohm, m_an, p_an,
        _figures(m_an, p_an, target, f, m_swr, z_el, p_swr, z_pred), de.removed,
        de.sweep.plane, de.left, de.findings, dropped, sweep.has_phase)
    if target is None:
        return Measurement(comparison, None, "no target: nothing to correct towards")
    goal = _feature(goal_name, chain)
    found: list[tuple[Feature, float, float]] = []
    res = m_an.resonance
    if res is not None and res.rising:
        found.append((Feature("resonance"), res.frequency_hz, res.frequency_unc_hz))
    if not m_an.least_swr.at_sweep_end:
        ls = m_an.least_swr
        found.append((Feature("least-swr", reading), ls.frequency_hz, ls.frequency_unc_hz))
    if not found:
        why = m_an.resonance_note or "X crosses zero only from inductive to capacitive"
        return Measurement(comparison, None,
                           f"no correction: the sweep shows no resonance ({why}) and its least "
                           "SWR lies at an end of the sweep; sweep a wider span around the "
                           "target")
    measured, f_meas, f_unc = next((x for x in found if x[0] == goal), found[0])
    tuned = [e.name for e in setup.group
             if e.spec.capacitor is not None and e.spec.capacitor.capacitance_f is None]
    if tuned and dimensions is None:
        return Measurement(comparison, None,
                           _tuned_note(ev, tuned[0], measured, f_meas, target, m_an))
    correction = correct(plan, element, settings, measured, f_meas, target, goal,
                         measured_unc_hz=f_unc, dimensions=dimensions, evaluator=ev)
    return Measurement(comparison, correction)


def _tuned_note(ev: _Evaluator, loop: str, measured: Feature, f_meas: float, target: float,
                m_an: SweepAnalysis) -> str:
    """What a first article says when a capacitor solved for resonance tunes the
    antenna: no length moves its frequency; the model's capacitance at the target
    and at the article's feature, and the match."""
    note = (f"no length correction: the capacitor of {loop!r} is solved for resonance at "
            "the target, so it tunes this antenna and no length moves its frequency: turn "
            "it to the frequency")
    model = ev.model(None, 0.0)
    tuning = getattr(getattr(model, "model", model), "tuning_capacitance", None)
    if tuning is not None and measured.kind == "resonance":
        try:
            at_target, at_article = tuning(target), tuning(f_meas)
        except FabplanError:
            pass
        else:
            note += (f". The model needs {at_target * 1e12:.2f} pF for {target / 1e6:.4f} MHz "
                     f"and {at_article * 1e12:.2f} pF for the article's resonance at "
                     f"{f_meas / 1e6:.4f} MHz: compare them with the capacitor's setting")
    swr = m_an.least_swr.swr
    if math.isfinite(swr) and swr > 1.5:
        note += (f". Least SWR {swr:.2f} measured: for the match, resize or move the coupling "
                 "loop (`fabplan tune` sizes it for least SWR in the model)")
    return note


# -- reading the sweep ---------------------------------------------------------------------------
TOUCHSTONE_SUFFIXES = (".s1p", ".ts", ".z1p", ".y1p")


def read_sweep_text(text: str, source: str, *, columns: Mapping[str, str | int] | None = None,
                    frequency_unit: str | None = None, z0_ohm: float | None = None,
                    default_z0_ohm: float = 50.0) -> MeasuredSweep:
    """The sweep in an analyser's file: a CSV when `columns` names its columns
    (role -> header text or number from 1, fabplan.measure.csvsweep) with its
    `frequency_unit` and reference `z0_ohm` (default `default_z0_ohm`, ohm); else
    a one-port Touchstone file, which names its own unit and reference."""
    if columns:
        if frequency_unit is None:
            raise DesignError("a CSV sweep needs the unit of its frequency column: "
                              "--frequency-unit Hz, kHz, MHz or GHz", field="--frequency-unit",
                              source=source or None)
        return read_csv_sweep(text, columns, frequency_unit=frequency_unit,
                              z0_ohm=default_z0_ohm if z0_ohm is None else z0_ohm,
                              source=source)
    if frequency_unit is not None or z0_ohm is not None:
        raise DesignError("a Touchstone file names its own frequency unit and reference "
                          "impedance: --frequency-unit and --z0 are for a CSV sweep, whose "
                          "columns --column names", field="--column", source=source or None)
    if source.lower().endswith((".csv", ".txt", ".tsv")):
        raise DesignError("name the CSV's columns: e.g. --column frequency=1 --column swr=2 "
                          "(or --column r_ohm=R --column x_ohm=X by their headers) and give "
                          "--frequency-unit", field="--column", source=source)
    return read_touchstone(text, source).to_sweep()


# -- the history ----------------------------------------------------------------------------------
def history_record(correction: ArticleCorrection, when: str, dimension: str | None = None
                   ) -> HistoryRecord:
    """The history line of a first article: its measured feature against the
    model's, and the correction of `dimension` (default the governing length).
    `when`: the caller's date and time (ISO 8601)."""
    c = correction.correction(dimension)
    kind = correction.measured.kind
    if kind == "analyser-x0":
        raise DesignError("the history keeps resonances and least SWRs, not an analyser's "
                          "X = 0", field="--record", value=kind)
    text = (f"{c.dimension} {c.value:.3f} -> {c.new_value:.3f} {c.unit} ({c.direction} by "
            f"{abs(c.change):.3f} {c.unit}) to put the {correction.goal.name} on "
            f"{correction.target_hz / 1e6:.3f} MHz")
    return HistoryRecord(when, correction.element, kind,
                         correction.measured_hz, correction.model_measured_hz,
                         (Adjustment(c.dimension, c.value, c.new_value, c.unit),), text,
                         correction.target_hz)


@dataclass(frozen=True)
class HistoryStatus:
    """The history of one element's first articles for one feature: how many of
    the file's records, their average difference from the model, and the
    frequency to tune the model to so that the next article lands on the
    target (Hz; None without a target)."""

    element: str
    feature: HistoryFeature
    summary: HistorySummary
    total_records: int
    target_hz: float | None
    model_target_hz: float | None


def history_status(records: Sequence[HistoryRecord], element: str, feature: str,
                   target_hz: float | None) -> HistoryStatus | None:
    """The history of `element`'s `feature` ("resonance" or "least-swr"), or None
    when it has no record of it."""
    if feature not in ("resonance", "least-swr"):
        return None
    kind: HistoryFeature = "resonance" if feature == "resonance" else "least-swr"
    summary = summarize(records, feature=kind, element=element)
    if summary is None:
        return None
    return HistoryStatus(element, kind, summary, len(records), target_hz,
                         None if target_hz is None else summary.model_target_hz(target_hz))


def design_values(plan: Plan, element: ElementPlan, settings: ElectricalSettings,
                  correction: Correction) -> Mapping[str, DesignValue]:
    """The element-table keys and values that write `correction` into the
    design file (fabplan.design.rewrite.rewrite_element)."""
    setup = setup_of(plan, element, settings)
    for adj in adjustables(plan, element, setup):
        if adj.name == correction.dimension and adj.element == correction.element:
            if adj.design_values is None:
                raise DesignError(f"{adj.name} of {adj.element!r} is not written into the "
                                  "design file: change it by hand (the figure is printed), "
                                  "or choose another dimension with --adjust",
                                  field="--output")
            return adj.design_values(correction.new_value)
    raise DesignError("not an adjustable dimension of this element", field="--adjust",
                      value=correction.dimension)
