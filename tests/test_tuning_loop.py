"""`fabplan tune` on a loop its capacitor tunes: the coupling loop's size for the match."""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from fabplan import tuning
from fabplan.design.read import parse_design
from fabplan.em.stage import structure_model_of
from fabplan.plan import electrical_input, make_plan


def _swr_at(plan, element, settings, f_hz, value):
    """SWR at `f_hz` with the coupling loop's governing length at `value`, the loop's
    capacitor re-solved for X = 0 there: the model read directly."""
    from fabplan.em.build import groups
    from fabplan.geometry.shapes import SHAPES

    shape = SHAPES[element.spec.shape]
    inputs = [electrical_input(plan.design, e.spec, e.geometry, e.pieces) for e in plan.elements]
    index = plan.elements.index(element)
    group = [inputs[i] for i in next(g for g in groups(inputs) if index in g)]
    params = shape.with_governing(element.spec.params, value)
    model = structure_model_of(group, settings, settings.sweep_to_hz, {element.name: params})
    z = complex(model.solve_tuned(f_hz).z_in)
    return float(np.atleast_1d(settings.chain.swr_system(np.array([z]), np.array([f_hz])))[0])


def test_the_coupling_loop_is_sized_for_least_swr(loop_example_plan):
    # common practice, no source: the capacitor sets a small loop's frequency and the
    # coupling loop's size its match; the sized loop is no worse than the design's and a
    # local minimum of the model's SWR (1 % either side is no better), and the capacitor is
    # the one that tunes the loop at the target
    plan = loop_example_plan
    settings = plan.design.electrical
    element = tuning.fed_element(plan, None)
    assert element.name == "coupling loop" and tuning.tuned_loop(plan, element) == "main loop"
    r = tuning.tune_coupling(plan, element, settings, settings.target_hz)
    assert r.swr_after <= r.swr_before
    assert r.swr_after < 1.2
    for factor in (0.99, 1.01):
        assert _swr_at(plan, element, settings, settings.target_hz,
                       r.new_mm * factor) >= r.swr_after - 1e-6
    assert abs(r.z_after.imag) < 0.5  # the capacitor brings X to zero at the feed
    assert r.capacitance_after_f == pytest.approx(
        plan.electrical.structures[0].loop.capacitance_f, rel=0.05)


def test_tune_writes_the_sized_coupling_loop(cli, tmp_path, loop_example_plan):
    design = loop_example_plan.design.source
    out = tmp_path / "tuned.toml"
    r = cli("tune", design, "-o", out)
    assert r.returncode == 0, r.stderr
    assert "the coupling loop of 'main loop'" in r.stdout
    tuned = parse_design(out.read_text(encoding="utf-8"))
    old = next(e for e in loop_example_plan.design.elements if e.name == "coupling loop")
    new = next(e for e in tuned.elements if e.name == "coupling loop")
    assert new.params != old.params
    assert "# about a fifth of the main loop" in out.read_text(encoding="utf-8")  # kept
    # the tuned design's own check agrees with what tune printed
    plan = make_plan(dataclasses.replace(tuned))
    (el,) = [e for e in plan.elements if e.name == "coupling loop"]
    swr_line = next(line for line in r.stdout.splitlines() if line.startswith("after"))
    printed = float(swr_line.split()[-3])
    sweep = el.electrical.sweep
    at = sweep.freq_hz.index(min(sweep.freq_hz, key=lambda f: abs(f - 14.175e6)))
    assert sweep.swr_system[at] == pytest.approx(printed, abs=0.02)
