"""The boom stage: positions from one datum, the boom correction added to the cut,
holes, hardware and findings."""

from __future__ import annotations

import math

import pytest

from fabplan.antennas.common import C0_MM_S
from fabplan.design.electrical import ElectricalSettings
from fabplan.em.build import build_structure
from fabplan.em.structure import resolve
from fabplan.errors import DesignError
from fabplan.feed import MatchChain
from fabplan.plan import boom_input, electrical_input

IN = 25.4


def _element(name: str, length: str, position: str, extra: str = "") -> str:
    return (f'[[element]]\nname = "{name}"\nshape = "straight"\nlength = "{length}"\n'
            f'position = "{position}"\n{extra}\n')


@pytest.mark.parametrize(("boom_in", "percent"), [(0.75, 10.56), (1.0, 13.66), (1.5, 19.21)])
def test_insulated_correction_in_the_cut_against_i0jxx_table(plan_of, beam_toml, boom_in,
                                                             percent):
    # source: I0JXX, "Boom correction for through the boom insulated elements on 2 meters &
    # 70cm" (read in this session): 2 m rows, wavelength 82 in, correction as a percentage of
    # the boom diameter: 0.75 in 10.56 %, 1.0 in 13.66 %, 1.5 in 19.21 %
    f_hz = C0_MM_S / (82 * IN)
    boom = f'tube = {{ od = "{boom_in} in", wall = "1/16 in" }}\nmaterial = "al-6063-t5"'
    plan = plan_of(beam_toml(_element("director", "900 mm", "500 mm"), boom=boom,
                             frequency=f"{f_hz / 1e6:.6f} MHz"))
    e = plan.element("director")
    want = percent / 100 * boom_in * IN
    assert e.boom.correction_mm == pytest.approx(want, abs=0.005 * boom_in * IN / 100 + 0.01)
    # the cut is the shape's cut plus the correction, half at each tip: the stock's centre
    # mark stays at the middle of the longer cut
    assert e.piece.cut_length_mm == pytest.approx(900.0 + e.boom.correction_mm, abs=1e-9)
    centre = next(m for m in e.piece.marks if m.kind == "centre")
    assert centre.from_end_mm == pytest.approx(e.piece.cut_length_mm / 2, abs=1e-9)
    assert e.geometry.pieces[0].path.centreline_length() == pytest.approx(900.0)


def test_positions_from_one_datum_and_mirrored_from_the_front(plan_of, beam_toml):
    # common practice, no source: every position from the one datum, never cumulative
    elements = (_element("reflector", "1000 mm", "40 mm")
                + _element("driven", "950 mm", "450 mm", 'feed_gap = "20 mm"\nmounting = '
                           '"above"')
                + _element("director", "900 mm", "860 mm"))
    boom = ('square = { side = "1 in", wall = "1/16 in" }\nmaterial = "al-6063-t5"\n'
            'height = "30 mm"')
    rear = plan_of(beam_toml(elements, boom=boom))
    front = plan_of(beam_toml(elements, boom=boom + '\ndatum = "front"'))
    holes = rear.boom.drilling.holes
    assert [h.from_datum_mm for h in holes] == [40.0, 450.0, 860.0]
    assert [h.label for h in holes] == ["reflector", "driven", "director"]
    # from the front the same numbers measure from the other end
    x_rear = {m.element: m.x_mm for m in rear.boom.mounts}
    x_front = {m.element: m.x_mm for m in front.boom.mounts}
    assert x_front["reflector"] == pytest.approx(1000.0 - 40.0)
    assert x_rear["reflector"] == pytest.approx(40.0)
    # the element's frame is placed there: its length across the boom (y), forward is +x
    e = rear.element("director")
    assert e.placement.origin_mm == pytest.approx((860.0, 0.0, 0.0))
    assert e.placement.x_axis == pytest.approx((0.0, 1.0, 0.0), abs=1e-12)
    # the driven element above: its axis 30 mm above the top face; a vertical bolt hole
    d = rear.element("driven")
    assert d.placement.origin_mm[2] == pytest.approx(IN / 2 + 30.0)
    assert holes[1].angle_deg == 0.0 and holes[1].diameter_mm == pytest.approx(6.5)
    assert d.boom.correction_mm == 0.0


def test_hole_sizes_bushings_and_hardware(plan_of, beam_toml):
    # common practice, no source: a hole a little over the rod for a bonded element, over
    # the bushing (element + 2 walls) for an insulated one; a pair of bushings each
    plan = plan_of(beam_toml(_element("a", "1000 mm", "100 mm")
                             + _element("b", "900 mm", "700 mm", 'mounting = "bonded-through"')))
    d = 6.35
    holes = {h.label: h for h in plan.boom.drilling.holes}
    assert holes["a"].diameter_mm == pytest.approx(d + 2 * 2.5 + 0.3)
    assert holes["b"].diameter_mm == pytest.approx(d + 0.3)
    assert all(h.through and h.angle_deg == 90.0 for h in holes.values())
    bill = {b.item: b.quantity for b in plan.boom.bill}
    assert bill["insulating shoulder bushing"] == 2
    assert bill["stainless self-tapping screw"] == 1
    assert bill["boom"] == 1


def test_findings_off_the_boom_too_close_and_near_the_end(plan_of, beam_toml):
    plan = plan_of(beam_toml(_element("a", "1000 mm", "5 mm") + _element("b", "950 mm", "18 mm")
                             + _element("c", "900 mm", "1200 mm")))
    codes = {(f.code, f.element) for f in plan.findings}
    assert ("element-off-boom", "c") in codes
    assert ("hole-near-boom-end", "a") in codes
    assert ("holes-too-close", "b") in codes
    assert plan.has_errors


def test_split_element_bonded_through_a_metal_boom_is_an_error(plan_of, beam_toml):
    plan = plan_of(beam_toml(_element("driven", "950 mm", "400 mm", 'feed_gap = "20 mm"'),
                             mounting="bonded-through"))
    assert any(f.code == "split-element-bonded" for f in plan.findings)


def test_an_insulating_boom_adds_nothing(plan_of, beam_toml):
    plan = plan_of(beam_toml(_element("d", "900 mm", "400 mm"),
                             boom='square = { side = "30 mm" }\nmaterial = "wood"'))
    e = plan.element("d")
    assert e.boom.correction_mm == 0.0 and e.piece.cut_length_mm == pytest.approx(900.0)
    assert not plan.boom.conductor


def test_bonded_elements_make_the_boom_part_of_the_model(plan_of, beam_toml):
    # the boom is modelled as a conductor when it is metal and every element through it is
    # bonded: then nothing is added to the cut (the model has the boom's effect)
    elements = (_element("reflector", "1000 mm", "40 mm")
                + _element("driven", "950 mm", "450 mm", 'feed_gap = "20 mm"\nmounting = '
                           '"above"')
                + _element("director", "900 mm", "860 mm"))
    text = beam_toml(elements, boom='square = { side = "1 in", wall = "1/16 in" }\n'
                     'material = "al-6063-t5"\nheight = "40 mm"', mounting="bonded-through")
    plan = plan_of(text)
    assert plan.boom.modelled
    r = plan.element("reflector")
    assert r.boom.correction_mm == 0.0 and r.boom.published_mm > 0
    assert r.piece.cut_length_mm == pytest.approx(1000.0)
    # modelled as two halves meeting on the boom's axis
    assert len(r.geometry.modelled.pieces) == 2
    settings = ElectricalSettings(145e6, 140e6, 150e6, 1e6, MatchChain(50.0, 50.0))
    inputs = [electrical_input(plan.design, e.spec, e.geometry, e.pieces)
              for e in plan.elements] + [boom_input(plan.design)]
    structure, owners = build_structure(inputs, settings)
    assert owners.count("boom") == 1
    topo = resolve(structure)
    boom_wire = owners.index("boom")
    # each bonded element meets the boom at one node on its interior (a T junction)
    t_nodes = [n for n in topo.nodes if any(w == boom_wire and 1.0 < s < 999.0
                                            for w, s in n.members)]
    assert len(t_nodes) == 2


def test_position_needs_a_boom(plan_of):
    from fabplan.design.read import parse_design

    with pytest.raises(DesignError, match="position needs a \\[boom\\]"):
        parse_design('[stock]\ncatalogue = "al-rod-1/4"\n[[element]]\nshape = "straight"\n'
                     'length = "1 m"\nposition = "10 mm"\n')


def test_balance_point_is_the_centre_of_mass(plan_of, beam_toml):
    # source: statics, the centre of mass of point masses sum(m x) / sum(m)
    plan = plan_of(beam_toml(_element("a", "1000 mm", "100 mm")
                             + _element("b", "1000 mm", "900 mm")))
    boom_kg = plan.boom.mass_kg
    ma, mb = (plan.element(n).piece.mass_kg for n in ("a", "b"))
    want = (boom_kg * 500.0 + ma * 100.0 + mb * 900.0) / (boom_kg + ma + mb)
    assert plan.boom.balance_mm == pytest.approx(want)
    assert math.isclose(plan.boom.balance_mm, 500.0, abs_tol=1e-6)
