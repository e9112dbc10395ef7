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
from .logs import log
from .plan import ElementPlan, Plan, core_element, electrical_input

__all__ = ["TuneResult", "MarkChange", "MeasuredResult", "feature_hz", "tune",
           "from_measurement", "proportional_length", "tuned_values", "fed_element", "is_fed",
           "Goal", "parse_goal", "Change", "BeamFigures", "BeamTuneResult", "tune_beam",
           "driven_element", "beam_values", "CouplingTuneResult", "tuned_loop", "group_of",
           "tune_coupling"]

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


def group_of(plan: Plan, element: ElementPlan) -> list[ElectricalInput]:
    """The electrical inputs of the elements modelled with `element`: the placed
    elements together, or the element alone."""
    inputs = [electrical_input(plan.design, e.spec, e.geometry, e.pieces)
              for e in plan.elements]
    index = plan.elements.index(element)
    return [inputs[i] for i in next(g for g in groups(inputs) if index in g)]


def is_fed(e: ElementPlan) -> bool:
    """Fed at a gap, or through a gamma or T match on a whole element (the model's
    feed at its centre, read through the device)."""
    m = e.spec.match
    return e.spec.capacitor is None and e.spec.part_of is None and (
        e.feed_gap_mm is not None or (m is not None and m.line_modelled))


def fed_element(plan: Plan, name: str | None) -> ElementPlan:
    """The element to tune: `name`, or the only element with a feed gap (or a gamma or
    T match)."""
    if name is not None:
        try:
            element = plan.element(name)
        except KeyError:
            names = ", ".join(e.name for e in plan.elements)
            raise DesignError(f"no element of that name (elements: {names})", field="--element",
                              value=name) from None
        if not is_fed(element):
            raise DesignError("has no feed gap or gamma or T match: only fed elements have an "
                              "impedance to tune", field="--element", value=name)
        return element
    fed = [e for e in plan.elements if is_fed(e)]
    if not fed:
        raise DesignError("no element has a feed gap or a gamma or T match, so none has an "
                          "impedance to sweep or tune (a helix fed at a lead against a ground "
                          "plane is not modelled)", field="element")
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
        self.group: list[ElectricalInput] = group_of(plan, element)
        tuned = [e.name for e in self.group
                 if e.spec.capacitor is not None and e.spec.capacitor.capacitance_f is None]
        if tuned:
            raise DesignError(f"{tuned[0]!r} has a capacitor solved for resonance at the target: "
                              "the capacitor tunes it, no length does (for the match, "
                              "`fabplan tune` sizes the coupling loop)", field="--element",
                              value=element.name)
        self.input: ElectricalInput = next(e for e in self.group if e.name == element.name)

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


# -- beams: the driven element and its match, and the parasitic elements -------------
GOAL_KINDS = ("max-gain", "max-front-to-back")
MATCH_SWR = 1.01  # the match refinement stops below this SWR at the target
MATCH_STEPS = 12
NEAR_SWR = 2.0  # below this a hairpin's own lengths are refined, not designed afresh
DEFAULT_WITHIN = 0.05  # a goal may move each parasitic element's length by +-5 %
GOAL_EVALUATIONS = 60  # per parasitic element, at most


@dataclass(frozen=True)
class Goal:
    """What `tune --goal` asks of the parasitic elements: `kind` "max-gain" or
    "max-front-to-back", with an optional floor on the other figure
    (`front_to_back_db` for max-gain, `gain_dbi` for max-front-to-back), each
    parasitic length kept within +-`within` (a fraction) of its design value."""

    kind: str
    front_to_back_db: float | None = None
    gain_dbi: float | None = None
    within: float = DEFAULT_WITHIN

    def describe(self) -> str:
        if self.kind == "max-gain":
            floor = ("" if self.front_to_back_db is None else
                     f" with front-to-back at least {self.front_to_back_db:g} dB")
            return f"most forward gain{floor}"
        floor = "" if self.gain_dbi is None else f" with gain at least {self.gain_dbi:g} dBi"
        return f"most front-to-back{floor}"


def parse_goal(text: str, within: float = DEFAULT_WITHIN) -> Goal:
    """`--goal`: "max-gain", "max-front-to-back", "front-to-back>=20dB" (most gain with
    that front-to-back) or "gain>=8dBi" (most front-to-back with that gain)."""
    t = text.replace(" ", "").lower()
    if t in GOAL_KINDS:
        return Goal(t, within=within)
    for key, unit, kind in (("front-to-back>=", "db", "max-gain"),
                            ("gain>=", "dbi", "max-front-to-back")):
        if t.startswith(key):
            number = t[len(key):].removesuffix(unit).removesuffix("db")
            try:
                value = float(number)
            except ValueError:
                break
            if kind == "max-gain":
                return Goal(kind, front_to_back_db=value, within=within)
            return Goal(kind, gain_dbi=value, within=within)
    raise DesignError('expected "max-gain", "max-front-to-back", "front-to-back>=20dB" or '
                      '"gain>=8dBi"', field="--goal", value=text)


@dataclass(frozen=True)
class Change:
    """One design-file value the tuner changed: the element, the key in its table
    ("length", "match.length", "match.capacitance"), its kind, old and new value
    (mm, or F for a capacitance)."""

    element: str
    key: str
    kind: str  # "length" or "capacitance"
    old: float
    new: float


@dataclass(frozen=True)
class BeamFigures:
    """The beam at the target: terminal impedance (ohm), SWR through the matching,
    forward gain (dBi, towards +x) and front-to-back (dB, +x against -x)."""

    z_ohm: complex
    swr: float
    gain_dbi: float
    front_to_back_db: float


@dataclass(frozen=True)
class BeamTuneResult:
    """What `tune_beam` changed and the beam before and after (Hz, mm, F)."""

    element: str
    match: str | None
    target_hz: float
    goal: Goal | None
    start: str  # how the starting point was found
    changes: tuple[Change, ...]
    before: BeamFigures
    after: BeamFigures
    evaluations: int
    params: dict[str, Any]  # new params by element name
    matches: dict[str, Any]  # new MatchSpecs by element name
    network: Any = None  # the published hairpin design the search started from, if it did

    @property
    def goal_met(self) -> bool | None:
        """Whether the goal's floor holds after tuning (None: no goal or no floor)."""
        g = self.goal
        if g is None:
            return None
        if g.front_to_back_db is not None:
            return self.after.front_to_back_db >= g.front_to_back_db - 1e-9
        if g.gain_dbi is not None:
            return self.after.gain_dbi >= g.gain_dbi - 1e-9
        return None


class _Beam:
    """The group of elements modelled with `element`, solved at one frequency for any
    params (by element name) and matching device."""

    def __init__(self, plan: Plan, element: ElementPlan, settings: ElectricalSettings,
                 factory: ModelFactory) -> None:
        from .plan import boom_input

        boom = boom_input(plan.design, [e.spec for e in plan.elements])
        self.group: list[ElectricalInput] = group_of(plan, element)
        if boom is not None and element.spec.placement is not None:
            self.group.append(boom)
        self.settings, self.factory = settings, factory
        self.evaluations = 0

    def figures(self, f_hz: float, params: dict[str, Any], match: Any = None,
                without: tuple[str, ...] = ()) -> BeamFigures:
        """Solve at `f_hz` with `params` (by element name), leaving out the elements
        named in `without`; `match` (a fabplan.em.devices.LineMatch) is applied to the
        terminal impedance."""
        import math as _m

        import numpy as _np

        from .em.farfield import far_field

        members = [e for e in self.group if e.name not in without]
        model = self.factory(members, self.settings, max(self.settings.sweep_to_hz, f_hz),
                             params)
        self.evaluations += 1
        sol = model.solve(f_hz)
        z = complex(sol.z_in)
        if match is not None:
            z = complex(match.transform(z, f_hz)[0])
        swr = float(self.settings.chain.swr_system(_np.array([z]), _np.array([f_hz]))[0])
        ff = far_field(sol, model)
        g = ff.gain(_np.array([_m.pi / 2, _m.pi / 2]), _np.array([0.0, _m.pi]))
        gf, gb = float(g[0]), float(g[1])
        return BeamFigures(z, swr, 10 * _m.log10(max(gf, 1e-30)),
                           10 * _m.log10(max(gf, 1e-30) / max(gb, 1e-30)))


def _system_at_terminals(settings: ElectricalSettings, f_hz: float) -> complex:
    """The terminal impedance (ohm) that the matching chain turns into the system
    impedance at `f_hz` (what a match at the feed should present), by a few Newton
    steps on the chain's own transform."""
    chain = settings.chain
    z = complex(chain.system_ohm * chain.matching.ratio)
    for _ in range(20):
        g = complex(chain.at_radio(np.array([z]), np.array([f_hz]))[0]) - chain.system_ohm
        h = 1e-6 * max(abs(z), 1.0)
        d = (complex(chain.at_radio(np.array([z + h]), np.array([f_hz]))[0])
             - chain.system_ohm - g) / h
        if d == 0:
            break
        step = g / d
        z -= step
        if abs(step) < 1e-9 * abs(z):
            break
    return z


def tune_beam(plan: Plan, element: ElementPlan, settings: ElectricalSettings, target_hz: float,
              *, goal: Goal | None = None, factory: ModelFactory = structure_model_of,
              max_goal_evaluations: int | None = None) -> BeamTuneResult:
    """Tune a beam at `target_hz`: with a `goal`, first the parasitic elements' lengths
    (within the goal's bounds, by Nelder and Mead's simplex search over the model's
    forward gain and front-to-back); then the driven element and its matching device
    so that the SWR through the matching is least at the target.

    Hairpin: the starting point is fabplan.antennas.matching.hairpin_match on the
    driven element's impedance without the hairpin (its resistance gives the network's
    Q; the element is shortened to the capacitive reactance the network asks for, by
    the secant method on the model), then Newton's method on the two lengths (driven,
    hairpin legs) drives the reflection at the target to zero. Gamma and T: the
    published design (gamma_match, t_match) on the element's centre impedance gives
    the rod length and capacitor outright. Without a match: the driven element's
    length for least SWR (`tune`)."""
    beam = _Beam(plan, element, settings, factory)
    params = {e.name: e.spec.params for e in beam.group}
    matches: dict[str, Any] = {}
    changes: list[Change] = []
    spec = element.spec
    m = spec.match
    part = next((e for e in plan.elements if e.spec.part_of == element.name), None)
    device = _device(beam, element, m)
    before = beam.figures(target_hz, {}, device)
    if goal is not None:
        params, found = _goal_search(beam, params, goal, target_hz, device,
                                     max_goal_evaluations)
        changes += found
    start = "no matching device: the driven element's length for least SWR"
    network = None
    if m is None:
        r = tune(plan, element, settings, target_hz, tune_for="least-swr", factory=factory)
        params[element.name] = r.new_params
        start = f"least SWR on target by the secant method ({r.iterations} steps)"
    elif m.kind == "hairpin" and part is not None:
        params, start, network = _tune_hairpin(beam, element, part, params, target_hz)
    elif m.kind in ("gamma", "t-match"):
        params, new_match, start = _tune_line_match(beam, element, params, target_hz)
        matches[element.name] = new_match
        device = _device(beam, element, new_match)
        for key, kind, old, new in (("match.length", "length", m.length_mm, new_match.length_mm),
                                    ("match.capacitance", "capacitance",
                                     m.capacitance_f or 0.0, new_match.capacitance_f or 0.0)):
            changes.append(Change(element.name, key, kind, old, new))
    for e in beam.group:
        old, new = e.spec.params, params[e.name]
        if new is old or e.spec.part_of is not None or e.name == "boom":
            continue
        key, value = SHAPES[e.spec.shape].governing(new)
        _, was = SHAPES[e.spec.shape].governing(old)
        if abs(value - was) > 1e-9 and not any(c.element == e.name and c.key == key
                                               for c in changes):
            changes.append(Change(e.name, key, "length", was, value))
    if part is not None and params.get(part.name) is not part.spec.params:
        changes.append(Change(element.name, "match.length", "length",
                              part.spec.params.leg_mm, params[part.name].leg_mm))
    after = beam.figures(target_hz, {k: v for k, v in params.items()}, device)
    changes = _latest(changes)
    return BeamTuneResult(element.name, None if m is None else m.kind, target_hz, goal, start,
                          tuple(changes), before, after, beam.evaluations, params, matches,
                          network)


def _latest(changes: list[Change]) -> list[Change]:
    """One change per value: the first old value and the last new one."""
    out: dict[tuple[str, str], Change] = {}
    for c in changes:
        first = out.get((c.element, c.key))
        out[(c.element, c.key)] = c if first is None else dataclasses.replace(c, old=first.old)
    return [c for c in out.values() if abs(c.new - c.old) > 1e-12]


def _device(beam: _Beam, element: ElementPlan, match: Any) -> Any:
    if match is None or not match.line_modelled:
        return None
    from .em.devices import line_match

    e = next(x for x in beam.group if x.name == element.name)
    device = line_match([dataclasses.replace(e, spec=dataclasses.replace(e.spec, match=match))])
    if device is not None and device.capacitance_f is None:
        return None  # solved by the electrical check; the tuner designs it
    return device


def _tune_hairpin(beam: _Beam, element: ElementPlan, part: ElementPlan,
                  params: dict[str, Any], target_hz: float) -> tuple[dict[str, Any], str, Any]:
    from .antennas.matching import hairpin_match

    params = dict(params)
    name, hp = element.name, part.name
    shape = SHAPES[element.spec.shape]
    key, length = shape.governing(params[name])
    z_sys = _system_at_terminals(beam.settings, target_hz)
    now = beam.figures(target_hz, params)
    if now.swr < NEAR_SWR:  # near already: refine the design's own lengths
        params, steps = _newton_hairpin(beam, params, name, hp, shape, target_hz, z_sys)
        return params, (f"the design's lengths (SWR {now.swr:.2f} at the target); "
                        f"{steps} Newton step(s) on both lengths"), None
    # 1. the element alone (no hairpin): its resistance sets the network
    alone = beam.figures(target_hz, params, without=(hp,)).z_ohm
    gap = part.spec.params.centre_spacing(part.pieces[0].conductor_diameter_mm)
    design = hairpin_match(max(alone.real, 1e-3), z_sys.real, target_hz, rod_spacing_mm=gap,
                           rod_diameter_mm=part.pieces[0].conductor_diameter_mm,
                           element_reactance_ohm=alone.imag)
    # 2. shorten the element to the capacitive reactance the network asks for (secant)
    xs, ys = [length], [alone.imag - design.element_reactance_ohm]
    x = length * (1 - 0.01 * (1 if ys[0] > 0 else -1))
    for _ in range(MAX_ITERATIONS):
        p = shape.with_governing(params[name], x)
        z = beam.figures(target_hz, {**params, name: p}, without=(hp,)).z_ohm
        xs.append(x)
        ys.append(z.imag - design.element_reactance_ohm)
        if abs(ys[-1]) < 0.05 or ys[-1] == ys[-2]:
            break
        x = xs[-1] - ys[-1] * (xs[-1] - xs[-2]) / (ys[-1] - ys[-2])
    params[name] = shape.with_governing(params[name], xs[-1])
    leg = max(design.length_mm - gap / 2, 2 * gap)
    params[hp] = dataclasses.replace(params[hp], leg_mm=leg)
    start = (f"hairpin_match on the element alone: R = {alone.real:.1f} ohm, so Q = "
             f"{design.q:.2f}; element made {design.element_reactance_ohm:.1f} ohm reactive; "
             f"hairpin {design.length_mm:.1f} mm of {design.z0_ohm:.0f} ohm line")
    params, steps = _newton_hairpin(beam, params, name, hp, shape, target_hz, z_sys)
    return params, start + f"; then {steps} Newton step(s) on both lengths", design


def _newton_hairpin(beam: _Beam, params: dict[str, Any], name: str, hp: str, shape: Any,
                    target_hz: float, z_sys: complex) -> tuple[dict[str, Any], int]:
    """Newton's method on (element length, hairpin legs): the reflection at the target
    to zero, each step limited to 2 % of the element and 30 % of the legs."""
    params = dict(params)
    steps = 0
    while steps < MATCH_STEPS:
        base = _gamma(beam, params, target_hz, z_sys)
        if abs(base) < (MATCH_SWR - 1) / (MATCH_SWR + 1):
            break
        steps += 1
        cols = []
        for who, h in ((name, 1e-3 * shape.governing(params[name])[1]),
                       (hp, 1e-2 * params[hp].leg_mm)):
            trial = dict(params)
            trial[who] = _moved(trial[who], who == name, shape, h)
            cols.append((_gamma(beam, trial, target_hz, z_sys) - base) / h)
        j = np.array([[cols[0].real, cols[1].real], [cols[0].imag, cols[1].imag]])
        try:
            dx = np.linalg.solve(j, -np.array([base.real, base.imag]))
        except np.linalg.LinAlgError:
            break
        limit = np.array([0.02 * shape.governing(params[name])[1], 0.3 * params[hp].leg_mm])
        scale = float(min(1.0, *(limit / np.maximum(np.abs(dx), 1e-12))))
        params[name] = _moved(params[name], True, shape, float(dx[0]) * scale)
        params[hp] = _moved(params[hp], False, shape, float(dx[1]) * scale)
    return params, steps


def _moved(p: Any, governing: bool, shape: Any, by: float) -> Any:
    if governing:
        return shape.with_governing(p, shape.governing(p)[1] + by)
    return dataclasses.replace(p, leg_mm=p.leg_mm + by)


def _gamma(beam: _Beam, params: dict[str, Any], f_hz: float, z_t: complex) -> complex:
    z = beam.figures(f_hz, params).z_ohm
    return (z - z_t) / (z + z_t.conjugate())


def _tune_line_match(beam: _Beam, element: ElementPlan, params: dict[str, Any],
                     target_hz: float) -> tuple[dict[str, Any], Any, str]:
    """A gamma or T match: the driven element's length that lets the rod keep the
    design's length (its strap where the design puts it), by the secant method on the
    published design's rod length against the element's length; then the capacitor.
    When no length within +-8 % does, the design at the element's own length."""
    m = element.spec.match
    if m is None:
        raise DesignError("no matching device", field="match")
    name = element.name
    shape = SHAPES[element.spec.shape]
    _, l0 = shape.governing(params[name])

    def rod_error(length: float) -> float | None:
        trial = {**params, name: shape.with_governing(params[name], length)}
        try:
            design, _ = _design_line_match(beam, element, trial, target_hz)
        except DesignError:
            return None
        return float(design.length_mm - m.length_mm)

    # a scan of the element's length (the rod's length is not monotonic in it: the
    # published design jumps between branches where the element's reactance crosses zero)
    scan = [(x, rod_error(x)) for x in np.linspace(0.92 * l0, 1.08 * l0, 9)]
    valid = [(float(x), y) for x, y in scan if y is not None]
    if not valid:
        new, how = _design_line_match(beam, element, params, target_hz)
        return params, new, how
    best_x, best_y = min(valid, key=lambda xy: abs(xy[1]))
    for (xa, ya), (xb, yb) in zip(valid, valid[1:]):
        if ya * yb <= 0 and abs(ya - yb) < 0.5 * m.length_mm + 1.0:  # one branch
            for _ in range(MAX_ITERATIONS):
                x = xb - yb * (xb - xa) / (yb - ya) if yb != ya else xb
                y = rod_error(x)
                if y is None:
                    break
                if abs(y) < abs(best_y):
                    best_x, best_y = x, y
                if abs(y) < 0.2:
                    break
                (xa, ya), (xb, yb) = ((xa, ya), (x, y)) if ya * y <= 0 else ((x, y), (xb, yb))
            break
    params = {**params, name: shape.with_governing(params[name], best_x)}
    new, how = _design_line_match(beam, element, params, target_hz)
    if abs(best_y) < 0.2:
        return params, new, (f"{how}; the element's length chosen (scan, then the secant "
                             f"method) so that the rod keeps its {m.length_mm:.1f} mm")
    return params, new, (f"{how}; no element length within +-8 % keeps the rod at "
                         f"{m.length_mm:.1f} mm: the nearest rod length found")


def _design_line_match(beam: _Beam, element: ElementPlan, params: dict[str, Any],
                       target_hz: float) -> tuple[Any, str]:
    from .antennas.matching import gamma_match, t_match

    m = element.spec.match
    if m is None:
        raise DesignError("no matching device", field="match")
    z_sys = _system_at_terminals(beam.settings, target_hz).real
    zd = beam.figures(target_hz, params).z_ohm
    e = next(x for x in beam.group if x.name == element.name)
    rod = (m.stock or e.stock).profile.outer_diameter_mm
    d = e.stock.profile.outer_diameter_mm
    if m.kind == "gamma":
        g = gamma_match(zd, z_sys, target_hz, spacing_mm=m.spacing_mm or 0.0,
                        rod_diameter_mm=rod, element_diameter_mm=d)
        new = dataclasses.replace(m, length_mm=g.rod_length_mm, capacitance_f=g.capacitance_f)
        return new, (f"gamma_match on the element's centre impedance {zd.real:.1f} "
                     f"{'+' if zd.imag >= 0 else '-'} j{abs(zd.imag):.1f} ohm (step-up "
                     f"{g.step_up:.2f})")
    t = t_match(zd, z_sys, target_hz, spacing_mm=m.spacing_mm or 0.0, rod_diameter_mm=rod,
                element_diameter_mm=d)
    new = dataclasses.replace(m, length_mm=t.t_length_mm, capacitance_f=t.capacitance_each_f)
    return new, (f"t_match on the element's centre impedance {zd.real:.1f} "
                 f"{'+' if zd.imag >= 0 else '-'} j{abs(zd.imag):.1f} ohm (step-up "
                 f"{t.step_up:.2f})")


def _goal_search(beam: _Beam, params: dict[str, Any], goal: Goal, target_hz: float,
                 device: Any, max_evaluations: int | None) -> tuple[dict[str, Any], list[Change]]:
    """Nelder and Mead's simplex search over the parasitic elements' lengths (each
    within +-goal.within of its design value) for the goal; a floor on the other
    figure is a penalty of 3 dB per dB short."""
    from scipy.optimize import minimize  # type: ignore[import-untyped, unused-ignore]

    parasitic = [e for e in beam.group
                 if not e.fed and e.spec.part_of is None and e.name != "boom"]
    if not parasitic:
        raise DesignError("the goal moves the parasitic elements, and none is modelled with "
                          "the driven element", field="--goal")
    shapes = [SHAPES[e.spec.shape] for e in parasitic]
    x0 = [s.governing(params[e.name])[1] for e, s in zip(parasitic, shapes)]

    def trial(u: np.ndarray) -> dict[str, Any]:
        out = dict(params)
        for e, s, base, ui in zip(parasitic, shapes, x0, u):
            out[e.name] = s.with_governing(params[e.name],
                                           base * (1 + goal.within * float(np.clip(ui, -1, 1))))
        return out

    def cost(u: np.ndarray) -> float:
        f = beam.figures(target_hz, trial(u), device)
        if goal.kind == "max-gain":
            short = (0.0 if goal.front_to_back_db is None
                     else max(0.0, goal.front_to_back_db - f.front_to_back_db))
            return -f.gain_dbi + 3 * short
        short = 0.0 if goal.gain_dbi is None else max(0.0, goal.gain_dbi - f.gain_dbi)
        return -min(f.front_to_back_db, 60.0) + 3 * short

    n = len(parasitic)
    limit = max_evaluations or GOAL_EVALUATIONS * n
    res = minimize(cost, np.zeros(n), method="Nelder-Mead",
                   bounds=[(-1.0, 1.0)] * n,
                   options={"maxfev": limit, "xatol": 2e-3, "fatol": 1e-3,
                            "initial_simplex": np.vstack([np.zeros(n), 0.4 * np.eye(n)])})
    best = trial(np.asarray(res.x, float))
    changes = [Change(e.name, s.governing(best[e.name])[0], "length", base,
                      s.governing(best[e.name])[1])
               for e, s, base in zip(parasitic, shapes, x0)]
    return best, changes


def driven_element(plan: Plan, name: str | None) -> ElementPlan:
    """The fed element of a beam: `name`, or the only element the model feeds (a whole
    element fed through a gamma or T match counts)."""
    fed = [e for e in plan.elements
           if e.geometry.modelled.feed is not None and e.spec.capacitor is None
           and e.spec.part_of is None]
    if name is not None:
        chosen = next((e for e in fed if e.name == name), None)
        if chosen is None:
            return fed_element(plan, name)  # its own message
        return chosen
    if len(fed) == 1:
        return fed[0]
    return fed_element(plan, None)


def beam_values(result: BeamTuneResult) -> dict[str, dict[str, TunedValue | tuple[str, float]]]:
    """The design-file values a beam tuning changed, by element: each length key of
    the element's table and its match table ("match.length", "match.capacitance")."""
    out: dict[str, dict[str, TunedValue | tuple[str, float]]] = {}
    for c in result.changes:
        out.setdefault(c.element, {})[c.key] = (
            "capacitance" if c.kind == "capacitance" else "length", c.new)
    return out


# -- a capacitor-tuned loop: the coupling loop's size for the match ----------------------------
COUPLING_RANGE = (0.5, 2.0)  # the coupling loop is sized within these times its own size
COUPLING_SCAN = 9  # sizes tried across that range before the bounded minimiser


@dataclass(frozen=True)
class CouplingTuneResult:
    """The fed (coupling) element's governing length that gives least SWR at the target
    when the loop's capacitor is tuned for X = 0 there: `key` and its value before and
    after (mm), the impedance (ohm), SWR and capacitor (F) before and after, and the
    models built. `loop`: the element whose capacitor tunes; `new_params`: the fed
    element's params after."""

    element: str
    loop: str
    target_hz: float
    key: str
    old_mm: float
    new_mm: float
    z_before: complex
    z_after: complex
    swr_before: float
    swr_after: float
    capacitance_before_f: float | None
    capacitance_after_f: float | None
    models_built: int
    new_params: Any


def tuned_loop(plan: Plan, element: ElementPlan) -> str | None:
    """The element modelled with `element` whose capacitor is solved for resonance (a
    small loop tuned by its capacitor), if any."""
    for e in group_of(plan, element):
        cap = e.spec.capacitor
        if cap is not None and cap.capacitance_f is None:
            return e.name
    return None


def tune_coupling(plan: Plan, element: ElementPlan, settings: ElectricalSettings,
                  target_hz: float, factory: ModelFactory = structure_model_of
                  ) -> CouplingTuneResult:
    """Size the coupling loop (`element`, fed) of a capacitor-tuned loop for least SWR
    through the matching at `target_hz`, the capacitor re-solved for X = 0 there at each
    size (the operator turns it to the frequency): a scan of COUPLING_SCAN sizes across
    COUPLING_RANGE of the present one, then Brent's bounded minimiser between the best
    scan point's neighbours. The published rule of thumb (the plan's coupling-loop
    figure) is where the design starts; this is the model's answer."""
    from .numeric import minimize_bounded

    loop = tuned_loop(plan, element)
    if loop is None:
        raise DesignError("no capacitor tunes this element's antenna", field="--element",
                          value=element.name)
    shape = SHAPES[element.spec.shape]
    key, v0 = shape.governing(element.spec.params)
    diameter = plan.design.stock_of(element.spec).profile.outer_diameter_mm
    group = group_of(plan, element)
    f_max = max(settings.sweep_to_hz, target_hz)
    f = np.array([target_hz])
    models = [0]
    cache: dict[float, tuple[complex, float, float | None]] = {}

    def at(v: float) -> tuple[complex, float, float | None]:
        if v not in cache:
            params = shape.with_governing(element.spec.params, v)
            if any(p.severity == "error" for p in shape.problems(params, diameter)):
                cache[v] = (complex(0.0), float("inf"), None)
            else:
                model = factory(group, settings, f_max, {element.name: params})
                models[0] += 1
                try:
                    sol = model.solve_tuned(target_hz)
                except FabplanError:
                    cache[v] = (complex(0.0), float("inf"), None)
                else:
                    z = complex(sol.z_in)
                    s = float(np.atleast_1d(settings.chain.swr_system(np.array([z]), f))[0])
                    cache[v] = (z, s if np.isfinite(s) else float("inf"), sol.capacitance_f)
        return cache[v]

    lo, hi = v0 * COUPLING_RANGE[0], v0 * COUPLING_RANGE[1]
    grid = [float(x) for x in np.geomspace(lo, hi, COUPLING_SCAN)] + [v0]
    grid.sort()
    k = min(range(len(grid)), key=lambda i: at(grid[i])[1])
    a, b = grid[max(k - 1, 0)], grid[min(k + 1, len(grid) - 1)]
    best = grid[k]
    if a < b:
        x, s = minimize_bounded(lambda v: at(v)[1], a, b, xatol=1e-4 * v0)
        if s < at(best)[1]:
            best = float(x)
    if not np.isfinite(at(best)[1]):
        raise FabplanError(f"no coupling-loop {key} within {COUPLING_RANGE[0]:g} to "
                           f"{COUPLING_RANGE[1]:g} times the present one gives a match the "
                           "model can solve", field=key)
    z0, s0, c0 = at(v0)
    z1, s1, c1 = at(best)
    log.info("coupling loop %s: %s %.2f -> %.2f mm, SWR %.3f -> %.3f (%d models)",
             element.name, key, v0, best, s0, s1, models[0])
    return CouplingTuneResult(element.name, loop, target_hz, key, v0, best, z0, z1, s0, s1,
                              c0, c1, models[0], shape.with_governing(element.spec.params,
                                                                      best))
