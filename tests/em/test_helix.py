"""A quadrifilar helix in the model: self-phasing, the sense of its polarisation, the
parallel feed of its two loops and the zenith and low-angle figures."""

from __future__ import annotations

import math

import numpy as np
import pytest

from fabplan.antennas.quadrifilar import loop_for_length, self_phasing
from fabplan.em.farfield import far_field
from fabplan.em.solver import structure_model
from fabplan.em.structure import Gap, Port, Structure, Wire, WireEnd
from fabplan.geometry.shapes import quadrifilar as q

F0 = 137.5e6
LAM_MM = 299792458e3 / F0
A_MM = 1.03  # AWG 12 wire's radius
RC_MM = 8.0
GAP_MM = 10.0


def loops(large_len: float, small_len: float, hand: str = "right"):
    """Paths of the large and small loop (D/H 0.44, half turns), the small one turned as the
    shape turns it."""
    out = []
    for name, length, az in (("large", large_len, 0.0),
                             ("small", small_len, 90.0 if hand == "right" else -90.0)):
        lp = loop_for_length(name, length, 0.44, 0.5)
        shape = q.loop_shape(name, lp.diameter_mm, lp.height_mm, 0.5, RC_MM)
        out.append(q.loop_path(shape, az, 0.0, GAP_MM, hand, 0.5))  # type: ignore[arg-type]
    return out


def model_of(paths, f_max: float):
    wires = tuple(Wire(p, A_MM) for p in paths)
    group = "feed" if len(paths) > 1 else None
    gaps = tuple(Gap(WireEnd(i, "B"), WireEnd(i, "A"), Port(f"loop {i}", group=group))
                 for i in range(len(paths)))
    return structure_model(Structure(wires, gaps), f_max_hz=f_max)


@pytest.fixture(scope="module")
def one_loop():
    """One bifilar loop of one wavelength (sharp) alone: its resonance and its Q from the
    reactance's slope there, Q = (f0 / 2 R) dX/df."""
    (path,) = loops(LAM_MM, LAM_MM)[:1]
    model = model_of([path], 1.1 * F0)
    f = np.array([1.03, 1.05, 1.07]) * F0
    z = np.array([model.impedance(x) for x in f])
    # the reactance's zero by a parabola through the three (it is close to linear here)
    coef = np.polyfit(f - f[1], z.imag, 2)
    roots = np.roots(coef)
    d = float(min((r.real for r in roots if abs(r.imag) < 1e-9), key=abs))
    f_r = f[1] + d
    slope = 2 * coef[0] * d + coef[1]
    r = float(np.interp(f_r, f, z.real))
    return f_r, f_r / (2 * r) * slope


def test_self_phased_loops_in_quadrature(one_loop):
    # source: Kilgus, "Resonant quadrifilar helix" (1969) [M]: the loops' sizes differ so
    # that one is inductive (+45 deg) and one capacitive (-45 deg) at the frequency;
    # fabplan.antennas.quadrifilar.self_phasing gives the size ratio from the loops' Q by
    # the series-RLC model. With Q from the model of one loop, the two loops fed in
    # parallel carry currents 90 degrees apart (within 10) and nearly equal (within
    # 20 %), and the helix is circularly polarised towards the zenith (axial ratio under
    # 1.5 dB)
    f_r, q_loop = one_loop
    assert 15 < q_loop < 40
    ratio = self_phasing(q_loop).size_ratio
    mean = LAM_MM  # resonant at f_r
    model = model_of(loops(mean * math.sqrt(ratio), mean / math.sqrt(ratio)), 1.05 * f_r)
    sol = model.solve(f_r)
    i_large, i_small = (complex(i) for i in sol.port_currents)
    phase = math.degrees(np.angle(i_small / i_large))
    assert phase == pytest.approx(90.0, abs=10.0)
    assert abs(i_small) / abs(i_large) == pytest.approx(1.0, abs=0.2)
    ff = far_field(sol, model)
    assert ff.polarisation(0.0, 0.0).axial_ratio_db < 1.5
    # the two gaps are one parallel feed: 1 / Z = (I_1 + I_2) / V
    assert sol.z_in == pytest.approx(1.0 / (i_large + i_small), rel=1e-9)


def test_handedness_sets_the_sense_towards_the_zenith(one_loop):
    # the model's sense of circular polarisation follows IEEE Std 145 and gives Kraus's
    # right-hand circular polarisation for a right-hand axial-mode helix
    # (tests/em/test_farfield.py); for the resonant quadrifilar helix, firing towards its
    # feed end (backfire), a right-hand winding radiates left-hand circular polarisation
    # towards the zenith and a left-hand winding right-hand: as builders report it ("if it
    # is left wound the polarization is RHCP and if it is right wound the resulting
    # polarization is LHCP", amsat-bb mailing list, 5 August 2012, read in this session).
    # The left-hand helix is the right-hand one's mirror image: the same gains, the
    # opposite sense.
    f_r, q_loop = one_loop
    ratio = self_phasing(q_loop).size_ratio
    out = {}
    for hand in ("right", "left"):
        model = model_of(loops(LAM_MM * math.sqrt(ratio), LAM_MM / math.sqrt(ratio), hand),
                         1.05 * f_r)
        sol = model.solve(f_r)
        ff = far_field(sol, model)
        phi = 0.7 if hand == "right" else -0.7  # the mirror in the x-z plane turns phi over
        out[hand] = (ff.polarisation(0.0, 0.0), ff.gain_dbi(np.array(0.0), np.array(0.0)),
                     ff.gain_dbi(np.array(math.radians(80)), np.array(phi)))
    (pr, gr, lr), (pl, gl, ll) = out["right"], out["left"]
    assert pr.sense == "left" and pl.sense == "right"
    assert pr.lhcp_dbi > pr.rhcp_dbi + 10 and pl.rhcp_dbi > pl.lhcp_dbi + 10
    assert float(gr) == pytest.approx(float(gl), abs=1e-6)
    assert float(lr) == pytest.approx(float(ll), abs=1e-6)
    assert pr.axial_ratio_db == pytest.approx(pl.axial_ratio_db, abs=1e-6)


def test_stage_reports_the_zenith_low_angle_and_phase(qfh_example_plan):
    # the stage's figures against the far field of the example's model read directly: the
    # gain towards the zenith, the azimuth-mean gain at 10 degrees elevation (the mean of
    # the power gain, in dBi), the loops' phase from the ports' currents
    from fabplan.em.stage import structure_model_of
    from fabplan.plan import electrical_input

    plan = qfh_example_plan
    settings = plan.design.electrical
    (st,) = plan.electrical.structures
    ff = st.far_field
    assert ff is not None and ff.gain_zenith_dbi is not None and ff.gain_low_dbi is not None
    e = plan.elements[0]
    model = structure_model_of([electrical_input(plan.design, e.spec, e.geometry, e.pieces)],
                               settings, settings.sweep_to_hz, {})
    sol = model.solve(settings.target_hz)
    direct = far_field(sol, model)
    assert ff.gain_zenith_dbi == pytest.approx(float(direct.gain_dbi(np.array(0.0),
                                                                     np.array(0.0))), abs=1e-9)
    phi = np.radians(np.arange(0.0, 360.0, 2.0))
    low = direct.gain(np.full(phi.shape, math.radians(80.0)), phi)
    assert ff.gain_low_dbi == pytest.approx(10 * math.log10(float(np.mean(low))), abs=1e-9)
    assert ff.low_elevation_deg == 10.0
    i1, i2 = (complex(i) for i in sol.port_currents)
    assert st.helix is not None
    assert st.helix.phase_deg == pytest.approx(math.degrees(np.angle(i2 / i1)), abs=1e-9)
    assert st.helix.loops == ("large loop", "small loop")
    # the example: wound left-hand, right-hand circular towards the zenith, self-phased
    assert ff.polarisation_zenith == "right"
    assert ff.axial_ratio_zenith_db is not None and ff.axial_ratio_zenith_db < 1.0
    assert ff.max_theta_deg < 10.0  # the beam is up, towards the feed end
    assert ff.gain_low_dbi < ff.gain_zenith_dbi
    assert st.helix.phase_deg == pytest.approx(90.0, abs=15.0)
    assert {f.code for f in plan.findings}.isdisjoint({"qfh-not-in-quadrature",
                                                       "em-off-target"})
