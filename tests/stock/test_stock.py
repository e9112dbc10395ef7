"""Stock: gauges, section properties and mass per length against published tables."""

from __future__ import annotations

import math
import re

import pytest

from fabplan.errors import DesignError
from fabplan.stock import CATALOGUE, MATERIALS, Round, Strip, Tube, awg_diameter_mm, parse_gauge
from fabplan.stock.catalogue import get_stock_item
from fabplan.units import IN

LB_PER_FT_PER_KG_PER_M = 2.20462262 * 0.3048  # kg/m -> lb/ft


# source: ASTM B258, Table 1 (nominal diameters of AWG sizes, inches)
@pytest.mark.parametrize("gauge, inches", [
    (4, 0.2043), (6, 0.1620), (8, 0.1285), (10, 0.1019), (12, 0.0808), (14, 0.0641),
])
def test_awg_diameters(gauge, inches):
    assert awg_diameter_mm(gauge) / IN == pytest.approx(inches, abs=5e-5)


def test_awg_aught_sizes_and_parsing():
    # source: ASTM B258, Table 1: 4/0 = 0.4600 in, 1/0 = 0.3249 in
    assert parse_gauge("AWG 4/0") / IN == pytest.approx(0.4600, abs=5e-5)
    assert parse_gauge("AWG 0") / IN == pytest.approx(0.3249, abs=5e-5)
    assert parse_gauge("awg 10") == awg_diameter_mm(10)
    with pytest.raises(DesignError, match="gauge such as"):
        parse_gauge("AWG")
    with pytest.raises(DesignError, match="AWG sizes run"):
        parse_gauge("AWG 60")


def test_swg():
    # from memory: BS 3737 (SWG 10 = 0.128 in, SWG 14 = 0.080 in)
    assert parse_gauge("SWG 10") / IN == pytest.approx(0.128)
    assert parse_gauge("SWG 14") / IN == pytest.approx(0.080)


def test_acr_tube_weight_per_foot():
    # source: ASTM B280, table of ACR tube: 1/4 x 0.030 in weighs 0.0804 lb/ft
    item = CATALOGUE["acr-1/4"]
    rho = MATERIALS[item.material].density_kg_m3
    lb_ft = item.profile.mass_per_m_kg(rho) * LB_PER_FT_PER_KG_PER_M
    assert lb_ft == pytest.approx(0.0804, rel=0.01)


def test_awg10_copper_weight():
    # source: standard annealed copper wire tables: AWG 10 about 31.4 lb per 1000 ft
    wire = Round(awg_diameter_mm(10))
    lb_kft = wire.mass_per_m_kg(8890) * LB_PER_FT_PER_KG_PER_M * 1000
    assert lb_kft == pytest.approx(31.4, rel=0.01)


def test_section_properties_textbook():
    # source: any strength-of-materials text: I = pi d^4/64, Z_p = d^3/6 (solid round);
    # tube (D^4 - d^4) pi/64 and (D^3 - d^3)/6; rectangle b t^3/12 and b t^2/4
    r = Round(10.0)
    assert r.second_moment_mm4 == pytest.approx(math.pi * 10 ** 4 / 64)
    assert r.plastic_modulus_mm3 == pytest.approx(1000 / 6)
    # shape factor Zp / Ze of a solid round = 16 / (3 pi)
    assert r.plastic_modulus_mm3 / (r.second_moment_mm4 / 5) == pytest.approx(16 / (3 * math.pi))
    t = Tube(10.0, 1.0)
    assert t.area_mm2 == pytest.approx(math.pi / 4 * (100 - 64))
    assert t.second_moment_mm4 == pytest.approx(math.pi * (10 ** 4 - 8 ** 4) / 64)
    assert t.plastic_modulus_mm3 == pytest.approx((1000 - 512) / 6)
    s = Strip(12.0, 2.0)
    assert s.second_moment_mm4 == pytest.approx(12 * 8 / 12)
    assert s.plastic_modulus_mm3 == pytest.approx(12 * 4 / 4)


def test_every_material_and_catalogue_row_has_a_source():
    for m in MATERIALS.values():
        assert m.source.strip(), m.key
        assert 0 < m.hollomon_n < 1 and m.yield_mpa > 0 and m.youngs_modulus_mpa > 1000
    for item in CATALOGUE.values():
        assert item.source.strip() and item.material in MATERIALS, item.key


def test_conductivity_iacs():
    # source: IACS definition: 100 % = 1.7241 micro-ohm cm (annealed copper standard)
    assert MATERIALS["cu-c11000-annealed"].conductivity_iacs == pytest.approx(100.2, abs=0.5)
    assert MATERIALS["ccs-40-hard"].conductivity_iacs == pytest.approx(40.0, abs=0.1)


@pytest.mark.parametrize(("typed", "meant"), [
    ("al-1/2", "al-1/2x0.058"),   # begins an aluminium key: not the copper acr-1/2
    ("acr-1/3", "acr-1/4"),       # the nearest in the same family
    ("awg10", "awg-10"),          # no family typed: the nearest of all
])
def test_a_catalogue_typo_suggests_the_same_family_first(typed, meant):
    with pytest.raises(DesignError, match=f"did you mean '{re.escape(meant)}'"):
        get_stock_item(typed)
