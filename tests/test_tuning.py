"""Reading a sweep, tuning the governing length, the measured mode, and
rewriting the design file.

Most tests use a stand-in model whose behaviour is known in closed form (a
series RLC whose resonance follows the element's total length), so that the
tuning logic is checked against exact answers; the end-to-end tests at the
bottom run the real method-of-moments solver.
"""

from __future__ import annotations

import dataclasses
import math
from types import SimpleNamespace

import numpy as np
import pytest

from fabplan import tuning
from fabplan.design.read import parse_design
from fabplan.em import stage
from fabplan.em.build import released_paths
from fabplan.em.sweep import analyse
from fabplan.feed import C0_M_S, MatchChain, Transformer
from fabplan.plan import make_plan

X0 = 600.0  # reactance slope of the stand-in (ohm)
K = 0.96  # stand-in's total length is K wavelengths at resonance


class RLC:
    """Z = R + j X0 (f/f0 - f0/f): a series RLC resonator (Pozar, Microwave
    Engineering, sec. 6.1), f0 set by the element's total length (mm)."""

    unknowns = 7

    def __init__(self, total_mm: float, r_ohm: float = 200.0, x0_ohm: float = X0) -> None:
        self.f0 = K * C0_M_S / (total_mm / 1000)
        self.r = r_ohm
        self.x0 = x0_ohm

    def impedance(self, f):
        return complex(self.r, self.x0 * (f / self.f0 - self.f0 / f))

    def sweep(self, f):
        return np.array([self.impedance(x) for x in np.atleast_1d(f)], dtype=complex)

    def solve(self, f):
        return SimpleNamespace(efficiency=0.99, z_in=self.impedance(f))


def total_length(path) -> float:
    return path.centreline_length() + path.gap_mm


def rlc_factory(elements, settings, f_max_hz, overrides=None):
    """A stand-in model factory: the series RLC of the (one) element's total length."""
    [element] = elements
    paths, _, _ = released_paths(element, (overrides or {}).get(element.name))
    return RLC(total_length(paths[0]))


def model_input(plan, e=None):
    """The electrical stage's input for the plan's first element (or `e`)."""
    from fabplan.plan import electrical_input

    e = e or plan.elements[0]
    return electrical_input(plan.design, e.spec, e.geometry, e.pieces)


DESIGN = """
[project]
name = "tuning test"

[stock]
diameter = "4 mm"
material = "cu-c11000-annealed"

[shop]
units = "{units}"
trim = "10 mm"

[[element]]
name = "fd"
shape = "folded-dipole"   # a comment that must survive
side = "{side}"
centre_spacing = "40 mm"
feed_gap = "12 mm"

[electrical]
target = "146 MHz"
{extra}

[electrical.matching]
kind = "transformer"
ratio = 4
system_impedance = 50
"""


def design(side="950 mm", units="mm", extra=""):
    text = DESIGN.format(side=side, units=units, extra=extra)
    return text, parse_design(text, "t.toml")


def core_plan(d):
    return make_plan(dataclasses.replace(d, electrical=None))


# -- reading a sweep ---------------------------------------------------------------
def test_analyse_finds_least_swr_resonance_and_bandwidth_of_a_series_rlc():
    model = RLC(2000.0)
    chain = MatchChain(200.0, 50.0, Transformer(4.0))
    f0 = model.f0
    freqs = np.linspace(0.8 * f0, 1.2 * f0, 401)
    result, at_edge = analyse(model, chain, freqs)
    assert result.min_swr_hz == pytest.approx(f0, rel=1e-5)
    assert result.min_swr == pytest.approx(1.0, abs=1e-6)
    assert result.resonance_hz == pytest.approx(f0, rel=1e-7)
    # source: series resonator (Pozar, Microwave Engineering, sec. 6.1): Z/4 = 50 + jX/4
    # against 50 ohm has SWR 2 where |X/4| = 100/sqrt(8); with X = X0 (u - 1/u) the band
    # is f0 (u+ - u-) = f0 * X/X0 exactly
    x2 = 4 * 100 / math.sqrt(8)
    assert result.bandwidth_hz["2"] == pytest.approx(f0 * x2 / X0, rel=2e-3)
    x15 = 4 * 100 * 0.2 / math.sqrt(1 - 0.04)  # |Gamma| = 0.2 at SWR 1.5
    assert result.bandwidth_hz["1.5"] == pytest.approx(f0 * x15 / X0, rel=2e-3)
    band = result.bands[1]
    assert band.level == 2.0 and band.lower.frequency_hz < f0 < band.upper.frequency_hz
    assert not at_edge


def test_analyse_flags_least_swr_at_the_end_of_the_sweep():
    model = RLC(2000.0)
    chain = MatchChain(200.0, 50.0, Transformer(4.0))
    freqs = np.linspace(0.8 * model.f0, 0.95 * model.f0, 31)
    result, at_edge = analyse(model, chain, freqs)
    assert at_edge
    assert result.min_swr_hz == freqs[-1]
    assert result.resonance_hz is None
    assert result.bandwidth_hz == {"1.5": None, "2": None}


@pytest.mark.parametrize("x0, broad", [(X0, False), (40.0, True)])
def test_a_broad_shallow_minimum_is_pointed_out(x0, broad):
    # SWR 1 + 0.02 within +-1 %: with Z/4 = 50 + j x0 (u - 1/u)/4 and u = 1.01,
    # x0 = 600 gives SWR 1.06 (sharp), x0 = 40 gives 1.004 (broad)
    model = RLC(2000.0, x0_ohm=x0)
    chain = MatchChain(200.0, 50.0, Transformer(4.0))
    freqs = np.linspace(0.9 * model.f0, 1.1 * model.f0, 81)
    result, at_edge = analyse(model, chain, freqs)
    settings = SimpleNamespace(target_hz=None)
    codes = [f.code for f in stage._findings("x", settings, result, at_edge)]
    assert ("em-broad-swr-minimum" in codes) == broad


# -- the stage with a stand-in model ---------------------------------------------------
def test_electrical_stage_sweeps_by_a_rational_fit_that_matches_direct_solves():
    """The stage sweeps through a rational fit of a handful of solves: at every point
    of the sweep its impedance equals the model's own solve there."""
    from fabplan.em.stage import structure_model_of
    from fabplan.render.json import sweep_dict
    from fabplan.render.text import electrical_text, plan_electrical_text

    text, d = design()
    d = dataclasses.replace(d, electrical=dataclasses.replace(
        d.electrical, sweep_from_hz=140e6, sweep_to_hz=152e6, sweep_step_hz=0.5e6))
    plan = core_plan(d)
    [checked], plan_el, findings = stage.electrical([model_input(plan)], d.electrical)
    assert checked is not None and plan_el is not None
    [st] = plan_el.structures
    assert st.solves < len(checked.sweep.freq_hz)  # fewer solves than points
    model = structure_model_of([model_input(plan)], d.electrical, 152e6, {})
    for f, z in list(zip(checked.sweep.freq_hz, checked.sweep.z_ohm))[::5]:
        assert z == pytest.approx(model.impedance(f), rel=1e-6)
    out = sweep_dict(checked.sweep)
    assert len(out["points"]) == 25
    txt = electrical_text(checked, st.band)
    assert "least SWR" in txt and "+- " in txt and "(0.5 %)" in txt and "gain dBi" in txt
    ptxt = plan_electrical_text(plan_el, "mm", 32)
    assert "RF exposure" in ptxt and "surroundings" in ptxt and "+-0.5 %" in ptxt
    assert "antenna as modelled" in ptxt


def test_a_model_that_breaks_its_limits_becomes_a_finding():
    from fabplan.errors import FabplanError

    def refusing(elements, settings, f_max_hz, overrides=None):
        raise FabplanError("the wire is too thick", field="radius_mm", value=99)

    text, d = design()
    plan = core_plan(d)
    [checked], _, findings = stage.electrical([model_input(plan)], d.electrical,
                                              factory=refusing)
    assert checked is None
    [f] = [f for f in findings if f.code == "em-model-limits"]
    assert "too thick" in f.message and f.severity == "warning" and f.element == "fd"


def test_released_radii_replace_the_design_radii():
    from fabplan.forming.records import BendForming, ElementForming

    text, d = design()
    plan = core_plan(d)
    e = dataclasses.replace(model_input(plan), forming=(None,))
    bends = tuple(BendForming(i, "former", 18.0, 20.0, 185.0, 5.0, 21.5, 180.0, 0.1)
                  for i in (1, 2))
    e2 = dataclasses.replace(e, forming=(ElementForming(bends),))
    (path,), _, released = released_paths(e2)
    assert released and [b.radius_mm for b in path.bends] == [21.5, 21.5]
    assert [b.radius_mm for b in e.piece.path.bends] == [20.0, 20.0]
    (plain,), _, released = released_paths(e)
    assert not released and plain is e.piece.path


def test_released_radii_follow_a_tuned_loop():
    from fabplan.forming.records import BendForming, ElementForming

    d = parse_design("""[stock]
diameter = "3 mm"
material = "cu-c11000-annealed"
[[element]]
name = "loop"
shape = "circle-loop"
diameter = "680 mm"
feed_gap = "15 mm"
""")
    plan = core_plan(d)
    bend = BendForming(1, "former", 300.0, 330.0, 340.0, 10.0, 340.0 * 1.02, 340.0, 0.01)
    e = dataclasses.replace(model_input(plan), forming=(ElementForming((bend,)),))
    spec = tuning.SHAPES["circle-loop"]
    bigger = spec.with_governing(e.spec.params, math.pi * 700.0)
    (path,), _, released = released_paths(e, bigger)
    # the loop's radius is the tuned length: it keeps the element's final/design ratio
    assert released and path.bends[0].radius_mm == pytest.approx(350.0 * 1.02)


# -- tuning --------------------------------------------------------------------------
@pytest.mark.parametrize("tune_for", ["least-swr", "resonance"])
def test_tune_finds_the_exact_length_for_the_stand_in(tune_for):
    text, d = design()
    plan = core_plan(d)
    e = plan.elements[0]
    target = 146e6
    r = tuning.tune(plan, e, d.electrical, target, tune_for=tune_for, factory=rlc_factory)
    # closed form: total length K c / f; a folded dipole's total (2 x side + the ends + the
    # gap) changes by twice the change in side
    old_total = total_length(e.piece.path)
    need = K * C0_M_S / target * 1000
    assert r.new_value_mm == pytest.approx(950.0 + (need - old_total) / 2, abs=0.01)
    assert r.new_hz == pytest.approx(target, rel=1e-4)
    assert r.iterations <= 4
    # the cut length changes by twice the side; the centre mark stays at the centre
    assert r.new_cut_mm - r.old_cut_mm == pytest.approx(2 * (r.new_value_mm - 950.0), abs=1e-6)
    centre = next(m for m in r.marks if m.label == "centre of stock")
    assert centre.old_from_centre_mm == centre.new_from_centre_mm == 0.0
    ends = [m for m in r.marks if m.label.startswith("end")]
    for m in ends:  # the ends move out by half the change in cut length each
        assert abs(m.new_from_centre_mm) - abs(m.old_from_centre_mm) == pytest.approx(
            (r.new_cut_mm - r.old_cut_mm) / 2, abs=1e-6)


def test_tune_rejects_a_length_that_cannot_be_built():
    text, d = design(side="950 mm")
    plan = core_plan(d)
    from fabplan.errors import FabplanError

    with pytest.raises(FabplanError, match="cannot be built"):
        # 100 x the frequency: the first step's side would be shorter than the feed gap
        tuning.tune(plan, plan.elements[0], d.electrical, 14600e6, factory=rlc_factory)


def test_proportional_rule():
    # common practice, no source: length scales inversely with frequency;
    # 1000 mm measured at 146 MHz, wanted at 144 MHz: 1000 x 146/144 = 1013.889 mm
    assert tuning.proportional_length(1000.0, 146e6, 144e6) == pytest.approx(1013.8889, abs=1e-4)
    assert tuning.proportional_length(500.0, 440e6, 440e6) == 500.0


def test_measured_mode_on_a_synthetic_case():
    """The article behaves exactly like the model; the target is where the model
    puts a 1 % longer side. The model-sensitivity correction must recover that
    side to first order; the proportional rule, which also scales the ends and the
    gap that do not change, must miss by more."""
    text, d = design()
    plan = core_plan(d)
    e = plan.elements[0]
    measured = rlc_factory([model_input(plan)], d.electrical, 0).f0
    side_star = 950.0 * 1.01
    params = tuning.SHAPES[e.spec.shape].with_governing(e.spec.params, side_star)
    target = rlc_factory([model_input(plan)], d.electrical, 0, {"fd": params}).f0
    r = tuning.from_measurement(plan, e, d.electrical, measured, target, factory=rlc_factory)
    want = side_star - 950.0
    assert r.change_model_mm == pytest.approx(want, rel=0.01)
    assert abs(r.change_proportional_mm - want) > abs(r.change_model_mm - want)
    assert r.change_proportional_mm == pytest.approx(950.0 * (measured / target - 1))
    assert r.sensitivity_hz_per_mm < 0
    assert r.trust == "model"
    assert r.cut_change_model_mm == pytest.approx(2 * r.change_model_mm, abs=1e-6)


def test_measured_far_from_the_model_prefers_the_proportional_rule():
    text, d = design()
    plan = core_plan(d)
    e = plan.elements[0]
    model_f = rlc_factory([model_input(plan)], d.electrical, 0).f0
    r = tuning.from_measurement(plan, e, d.electrical, model_f * 1.06, 146e6,
                                factory=rlc_factory)
    assert r.trust == "proportional" and "differs from the model" in r.advice


def test_a_capacitor_tuned_loop_is_not_tuned_by_length(loop_example_plan):
    # the loop's capacitor is solved for resonance at the target: tune has no length to
    # change, and the coupling loop (not the capacitor's loop) is the fed element
    from fabplan.errors import FabplanError

    plan = loop_example_plan
    element = tuning.fed_element(plan, None)
    assert element.name == "coupling loop"
    with pytest.raises(FabplanError, match="capacitor tunes it"):
        tuning.tune(plan, element, plan.design.electrical, 14.2e6)
