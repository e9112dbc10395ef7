"""Tuning an element's length before the first cut, and after the first article.

- `tune`: change the element's governing length (a folded dipole's or
  hairpin's side, a loop's perimeter: `ShapeSpec.governing`) until the
  frequency of least SWR through the matching, or the resonance, falls on
  the target. Secant root finding on the model's frequency as a function of
  the length, starting from the proportional guess.
- `from_measurement`: the builder measured where the first article's SWR is
  least; the change in length for the next build from the model's
  sensitivity d f / d length (central difference), beside the proportional
  rule (length scales inversely with frequency; common practice), and which to
  trust.
- `tuned_values`: the design-file values the tuned length changes, for
  fabplan.design.rewrite to write back.

A use case above the Plan: it calls the stages' own functions and the
electrical model; nothing in the stages imports it. Pure: no files, no
printing. Hz and mm.
"""

from __future__ import annotations

import dataclasses
import logging
from dataclasses import dataclass
from typing import Any

import numpy as np

from .design.electrical import ElectricalSettings
from .design.model import Design
from .em.build import ElectricalInput, groups
from .em.records import UNCERTAINTY_FRAC
from .em.stage import ModelFactory, structure_model_of
from .em.sweep import Model, least_swr, resonance
from .errors import DesignError, FabplanError
from .feed import C0_M_S
from .geometry.shapes import SHAPES
from .geometry.shapes.base import TunedValue
from .lengths.records import PieceCore
from .plan import ElementPlan, Plan, core_element, electrical_input

log = logging.getLogger("fabplan")

__all__ = ["TuneResult", "MarkChange", "MeasuredResult", "feature_hz", "tune",
           "from_measurement", "proportional_length", "tuned_values", "fed_element"]

TOLERANCE_FRAC = 2e-5  # tuning stops when the model's frequency is this close to the target
MAX_ITERATIONS = 12
BRACKET_FRAC = 0.04  # the first search for the frequency: +-4 % around the expected one
# beyond this gap between the measurement and the model, the model's sensitivity is
# not trusted over the proportional rule
MODEL_TRUST_FRAC = 0.03


@dataclass(frozen=True)
class MarkChange:
    label: str
    old_from_centre_mm: float
    new_from_centre_mm: float
    old_from_end_mm: float
    new_from_end_mm: float


@dataclass(frozen=True)
class TuneResult:
    """The governing length that puts the element on target (mm, Hz)."""

    element: str
    key: str
    tune_for: str
    target_hz: float
    old_value_mm: float
    new_value_mm: float
    old_hz: float  # model frequency (least SWR or resonance) at the old length
    new_hz: float  # ... at the new length
    iterations: int
    models_built: int
    new_params: Any
    old_cut_mm: float
    new_cut_mm: float
    old_developed_mm: float
    new_developed_mm: float
    marks: tuple[MarkChange, ...]


@dataclass(frozen=True)
class MeasuredResult:
    """The change in length for the next build from a measured frequency (mm, Hz)."""

    element: str
    key: str
    tune_for: str
    value_mm: float
    measured_hz: float
    target_hz: float
    model_hz: float  # the model's frequency for the element as designed
    sensitivity_hz_per_mm: float
    change_model_mm: float
    change_proportional_mm: float
    cut_change_model_mm: float
    cut_change_proportional_mm: float
    trust: str  # "model" or "proportional"
    advice: str


def fed_element(plan: Plan, name: str | None) -> ElementPlan:
    """The element to tune: `name`, or the only element with a feed gap."""
    if name is not None:
        try:
            element = plan.element(name)
        except KeyError:
            names = ", ".join(e.name for e in plan.elements)
            raise DesignError(f"no element of that name (elements: {names})", field="--element",
                              value=name) from None
        if element.feed_gap_mm is None:
            raise DesignError("has no feed gap: only fed elements have an impedance to tune",
                              field="--element", value=name)
        return element
    fed = [e for e in plan.elements if e.feed_gap_mm is not None]
    if not fed:
        raise DesignError("no element has a feed gap: nothing to tune", field="element")
    if len(fed) > 1:
        raise DesignError("several elements have a feed gap: choose one with --element "
                          f"({', '.join(e.name for e in fed)})", field="--element")
    return fed[0]


def feature_hz(model: Model, settings: ElectricalSettings, tune_for: str, expect_hz: float,
               span_frac: float = BRACKET_FRAC, points: int = 9) -> float:
    """The model's frequency (Hz) of least SWR through the matching, or of
    resonance, searched from a small sweep of `points` around `expect_hz`
    (+-`span_frac`), moved along when the answer lies at its edge."""
    chain = settings.chain
    centre = expect_hz
    for _ in range(6):
        freqs = np.linspace(centre * (1 - span_frac), centre * (1 + span_frac), points)
        z = np.asarray(model.sweep(freqs), dtype=complex)
        if tune_for == "resonance":
            f = resonance(model, freqs, z, expect_hz)
            if f is not None:
                return f
            x = z.imag
            centre = float(freqs[-1] if x[-1] < 0 else freqs[0])  # X < 0: resonance above
        else:
            s = np.atleast_1d(chain.swr_system(z, freqs))
            f, _, at_edge = least_swr(model, chain, freqs, s)
            if not at_edge:
                return f
            centre = f
        span_frac *= 2
    raise FabplanError(f"found no {'resonance' if tune_for == 'resonance' else 'least SWR'} "
                       f"within a wide search around {expect_hz / 1e6:.3f} MHz: the element may "
                       "be far from the target; check its dimensions", field="tune")


class _Evaluator:
    """f(length) for one element: builds the model for params with that length."""

    def __init__(self, plan: Plan, element: ElementPlan, settings: ElectricalSettings,
                 tune_for: str, factory: ModelFactory) -> None:
        self.plan, self.element, self.settings = plan, element, settings
        self.tune_for, self.factory = tune_for, factory
        self.shape = SHAPES[element.spec.shape]
        self.params = element.spec.params
        self.key, self.value = self.shape.governing(self.params)
        self.models = 0
        inputs = [electrical_input(plan.design, e.spec, e.geometry, e.pieces)
                  for e in plan.elements]
        index = plan.elements.index(element)
        group = next(g for g in groups(inputs) if index in g)
        self.group: list[ElectricalInput] = [inputs[i] for i in group]
        self.input: ElectricalInput = inputs[index]

    def __call__(self, value_mm: float, expect_hz: float, span_frac: float = BRACKET_FRAC,
                 points: int = 9) -> float:
        params = self.shape.with_governing(self.params, value_mm)
        d = self.input.stock.profile.outer_diameter_mm
        problems = [f for f in self.shape.problems(params, d) if f.severity == "error"]
        if problems:
            raise FabplanError(f"at {self.key} = {value_mm:.2f} mm the element cannot be built: "
                               f"{problems[0].message}", field="tune")
        # the sweep's top frequency sets the mesh, as in the plan's own check, so the
        # tuned length gives the same answer there
        f_max = max(self.settings.sweep_to_hz, expect_hz * (1 + span_frac))
        model = self.factory(self.group, self.settings, f_max, {self.element.name: params})
        self.models += 1
        f = feature_hz(model, self.settings, self.tune_for, expect_hz, span_frac, points)
        log.debug("tune %s: %s = %.4f mm -> %.6f MHz (%d unknowns)", self.element.name,
                  self.key, value_mm, f / 1e6, getattr(model, "unknowns", -1))
        return f


def _core_piece(design: Design, element: ElementPlan, params: Any) -> PieceCore:
    """The core figures of the element's one piece with other params."""
    spec = dataclasses.replace(element.spec, params=params)
    return core_element(design, spec)[1][0]


def tune(plan: Plan, element: ElementPlan, settings: ElectricalSettings, target_hz: float, *,
         tune_for: str | None = None, factory: ModelFactory = structure_model_of) -> TuneResult:
    """The governing length that puts least SWR (or resonance) on `target_hz`."""
    tune_for = tune_for or settings.tune_for
    ev = _Evaluator(plan, element, settings, tune_for, factory)
    x0 = ev.value
    f0 = ev(x0, _first_guess_hz(element, target_hz))
    xs, fs = [x0], [f0]
    x1 = proportional_length(x0, f0, target_hz)
    x, f = x1, ev(x1, target_hz, 0.015, 5)
    xs.append(x)
    fs.append(f)
    iterations = 1
    while abs(f / target_hz - 1) > TOLERANCE_FRAC:
        if iterations >= MAX_ITERATIONS:
            raise FabplanError(f"tuning did not converge: {ev.key} {x:.2f} mm gives "
                               f"{f / 1e6:.4f} MHz", field="tune")
        (xa, fa), (xb, fb) = (xs[-2], fs[-2]), (xs[-1], fs[-1])
        if fb == fa:
            x = proportional_length(xb, fb, target_hz)
        else:
            x = xb + (target_hz - fb) * (xb - xa) / (fb - fa)
        f = ev(x, target_hz, 0.01, 5)
        xs.append(x)
        fs.append(f)
        iterations += 1
    new_params = ev.shape.with_governing(ev.params, x)
    old_core = element.pieces[0]
    new_core = _core_piece(plan.design, element, new_params)
    return TuneResult(element.name, ev.key, tune_for, target_hz, x0, x, f0, f, iterations,
                      ev.models, new_params, old_core.cut_length_mm, new_core.cut_length_mm,
                      old_core.developed_length_mm, new_core.developed_length_mm,
                      _mark_changes(old_core, new_core))


def _first_guess_hz(element: ElementPlan, target_hz: float) -> float:
    """Where to look first for the element's frequency (Hz): the plan's own
    sweep when it has one; else the target when the element's total length
    (stock plus gap) is within 10 % of a wavelength there, as it is for every
    fed shape near its first resonance (a folded dipole or a full-wave loop);
    else the frequency of one wavelength."""
    if element.electrical is not None:
        return element.electrical.sweep.min_swr_hz
    total_m = (sum(p.path.centreline_length() for p in element.pieces)
               + (element.feed_gap_mm or 0.0)) / 1000
    one_wave = C0_M_S / total_m
    return target_hz if abs(one_wave / target_hz - 1) < 0.1 else one_wave


def _mark_changes(old: PieceCore, new: PieceCore) -> tuple[MarkChange, ...]:
    news = {m.label: m for m in new.marks}
    out = []
    for m in old.marks:
        n = news.get(m.label)
        if n is not None:
            out.append(MarkChange(m.label, m.from_centre_mm, n.from_centre_mm, m.from_end_mm,
                                  n.from_end_mm))
    return tuple(out)


def proportional_length(length_mm: float, measured_hz: float, target_hz: float) -> float:
    """The proportional rule: length scales inversely with frequency (common
    practice). A length (mm) that resonates at `measured_hz` becomes
    length x measured / target for `target_hz`."""
    return length_mm * measured_hz / target_hz


def from_measurement(plan: Plan, element: ElementPlan, settings: ElectricalSettings,
                     measured_hz: float,
                     target_hz: float, *, tune_for: str | None = None,
                     factory: ModelFactory = structure_model_of,
                     step_frac: float = 0.01) -> MeasuredResult:
    """The change in governing length (mm) for the next build, from where the
    first article's SWR was measured to be least."""
    tune_for = tune_for or settings.tune_for
    ev = _Evaluator(plan, element, settings, tune_for, factory)
    x0 = ev.value
    span = max(BRACKET_FRAC, 1.5 * abs(measured_hz / target_hz - 1))
    f0 = ev(x0, measured_hz, span)
    h = step_frac * x0
    f_lo = ev(x0 - h, f0, 0.015 + step_frac)
    f_hi = ev(x0 + h, f0, 0.015 + step_frac)
    sens = (f_hi - f_lo) / (2 * h)
    if sens >= 0:
        raise FabplanError("the model's frequency does not fall as the element gets longer: "
                           "no sensible correction", field="tune")
    d_model = (target_hz - measured_hz) / sens
    d_prop = proportional_length(x0, measured_hz, target_hz) - x0
    core = element.pieces[0]
    cut_model = _core_piece(plan.design, element,
                            ev.shape.with_governing(ev.params, x0 + d_model))
    cut_prop = _core_piece(plan.design, element, ev.shape.with_governing(ev.params, x0 + d_prop))
    trust, advice = _advice(measured_hz, target_hz, f0, d_model, d_prop)
    return MeasuredResult(element.name, ev.key, tune_for, x0, measured_hz, target_hz, f0, sens,
                          d_model, d_prop, cut_model.cut_length_mm - core.cut_length_mm,
                          cut_prop.cut_length_mm - core.cut_length_mm, trust, advice)


def _advice(measured: float, target: float, model: float, d_model: float,
            d_prop: float) -> tuple[str, str]:
    miss = measured / model - 1
    step = measured / target - 1
    parts = []
    if abs(miss) <= UNCERTAINTY_FRAC:
        trust = "model"
        parts.append(f"the article measured {100 * miss:+.2f} % from the model's prediction, "
                     "within the model's uncertainty: trust the model's sensitivity, which "
                     "knows that the ends, feed gap and spacing do not change with the length "
                     "(the proportional rule scales them too)")
    elif abs(miss) <= MODEL_TRUST_FRAC:
        trust = "model"
        parts.append(f"the article measured {100 * miss:+.2f} % from the model's prediction: "
                     "the absolute figure is off, but near enough that the model's sensitivity "
                     "(how fast the frequency moves with the length) still holds, and it knows "
                     "that the ends, feed gap and spacing do not change with the length (the "
                     "proportional rule scales them too)")
    else:
        trust = "proportional"
        parts.append(f"the article measured {100 * miss:+.2f} % from the model's prediction, "
                     "more than the model's uncertainty allows: something differs from the "
                     "model (stock, spacing, feed gap, surroundings or feed line); check the "
                     "build and the measurement set-up, and meanwhile prefer the proportional "
                     "rule, which assumes nothing about the geometry")
    if abs(step) > 0.05:
        parts.append(f"the correction is large ({100 * step:+.1f} % in frequency): both figures "
                     "are first-order; cut long, measure again and trim")
    if abs(d_model - d_prop) > 0.25 * max(abs(d_model), abs(d_prop), 1e-9):
        parts.append("the two figures differ by more than a quarter: trim in two steps")
    parts.append(f"the model's own uncertainty is about +-{100 * UNCERTAINTY_FRAC:.1f} % in "
                 "frequency")
    return trust, "; ".join(parts) + "."


# -- writing the tuned design --------------------------------------------------
def tuned_values(element: ElementPlan, new_params: Any) -> dict[str, TunedValue]:
    """The design-file values the tuned length changes: every key the shape says
    carries the governing length, for the new params (fabplan.design.rewrite
    writes the ones the element's table gives)."""
    return SHAPES[element.spec.shape].tuned_keys(new_params)
