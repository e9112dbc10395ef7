"""`fabplan estimate` and `fabplan compare` through the installed command line."""

from __future__ import annotations

import csv
import json

import pytest

WIRE = """
[project]
name = "wire option"
[stock]
gauge = "AWG 10"
material = "cu-c11000-hard"
[shop]
units = "mm"
kerf = "1 mm"
[[element]]
name = "fd"
shape = "folded-dipole"
quantity = 4
side = "480 mm"
spacing = "30 mm"
feed_gap = "12 mm"
[purchase]
currency = "EUR"
[[purchase.offer]]
name = "25 m coil"
length = "25 m"
price = 2.40
per = "m"
"""

TUBE = WIRE.replace('gauge = "AWG 10"\nmaterial = "cu-c11000-hard"', 'catalogue = "cu-6x1"') \
    .replace('name = "wire option"', 'name = "tube option"') \
    .replace('name = "25 m coil"\nlength = "25 m"\nprice = 2.40\nper = "m"',
             'name = "3 m tube"\nlength = "3 m"\nprice = 11.0')


def test_estimate_prints_the_purchase_plan(cli, example_path):
    out = cli("estimate", example_path, check_exit=0).stdout
    assert "Bill of material" in out and "Cutting plan" in out
    assert "15 ft coil" in out and "USD 31.00" in out and "USD 95.75" in out


def test_estimate_json(cli, example_path):
    d = json.loads(cli("estimate", example_path, "--json", check_exit=0).stdout)
    assert d["order"]["pieces_to_buy"] == 2
    assert d["order"]["total_cost"] == pytest.approx(95.75)
    assert d["elements"][0]["estimate"]["pieces_to_cut"] == 7


def test_estimate_csv_refuses_to_overwrite(cli, example_path, tmp_path):
    target = tmp_path / "cuts.csv"
    cli("estimate", example_path, "--csv", target, check_exit=0)
    rows = list(csv.DictReader(target.read_text(encoding="utf-8").splitlines()))
    cuts = [r for r in rows if r["element"] != "(remnant)"]
    assert len(cuts) == 7
    assert {r["stock_piece"] for r in cuts} == {"1", "2"}
    assert float(cuts[0]["start_mm"]) == pytest.approx(12.7)  # the 1/2 in unusable end
    before = target.read_bytes()
    proc = cli("estimate", example_path, "--csv", target, check_exit=2)
    assert "already exists" in proc.stderr and len(proc.stderr.strip().splitlines()) == 1
    assert target.read_bytes() == before
    cli("estimate", example_path, "--csv", target, "--force", check_exit=0)
    assert target.read_bytes() == before  # same input, same bytes


@pytest.mark.parametrize("change, field", [
    (("price = 2.40", "price = 0"), "purchase.offer[1].price"),
    (("price = 2.40", "price = -2.40"), "purchase.offer[1].price"),
    (('currency = "EUR"', 'currency = "Euro"'), "purchase.currency"),
    (('length = "25 m"', 'length = "0.5 m"'), "element[1]"),
    (("quantity = 4", "quantity = 2.5"), "element[1].quantity"),
])
def test_bad_input_exits_2_naming_the_field(cli, write_design, change, field):
    path = write_design(WIRE.replace(*change))
    proc = cli("estimate", path, check_exit=2)
    lines = proc.stderr.strip().splitlines()
    assert len(lines) == 1 and field in lines[0] and "Traceback" not in proc.stderr
    assert proc.stdout == ""


def test_compare_two_stock_choices(cli, write_design):
    a = write_design(WIRE, "wire.toml")
    b = write_design(TUBE, "tube.toml")
    out = cli("compare", a, b, check_exit=0).stdout
    assert "weight built" in out and "total cost" in out and "findings" in out
    assert "3 m tube" in out and "25 m coil" in out
    d = json.loads(cli("compare", a, b, "--json", check_exit=0).stdout)
    assert d["same_elements"] is True
    assert d["a"]["stock"] != d["b"]["stock"]
    # AWG 10 solid is 5.26 mm2 of copper, 6 x 1 mm tube pi x 5 x 1 = 15.7 mm2: the tube weighs more
    assert d["b"]["mass_per_m_kg"] > d["a"]["mass_per_m_kg"]
    assert set(d["a"]["findings"]) == {"error", "warning", "info"}


def test_compare_missing_file_exits_2(cli, example_path, tmp_path):
    proc = cli("compare", example_path, tmp_path / "nope.toml", check_exit=2)
    assert "file not found" in proc.stderr


ELECTRICAL = """
[electrical]
target = "280 MHz"
sweep = { from = "240 MHz", to = "320 MHz", step = "4 MHz" }
[electrical.matching]
kind = "transformer"
ratio = 6
"""


def test_compare_shows_the_electrical_differences(cli, write_design):
    """With [electrical] in both designs, compare puts each fed element's resonance,
    least SWR, bandwidths and efficiency side by side, and B minus A."""
    from fabplan.design.read import load_design
    from fabplan.plan import make_plan

    a = write_design(WIRE + ELECTRICAL, "wire.toml")
    b = write_design(TUBE + ELECTRICAL, "tube.toml")
    d = json.loads(cli("compare", a, b, "--json", check_exit=0).stdout)
    sweeps = [make_plan(load_design(p)).elements[0].electrical.sweep for p in (a, b)]
    for side, s in zip("ab", sweeps):
        (el,) = d[side]["electrical"]
        assert el["element"] == "fd" and el["target_hz"] == 280e6
        assert el["resonance_hz"] == pytest.approx(s.resonance_hz, abs=0.1)
        assert el["min_swr_hz"] == pytest.approx(s.min_swr_hz, abs=0.1)
        assert el["min_swr"] == pytest.approx(s.min_swr, abs=1e-4)
        assert el["efficiency"] == pytest.approx(s.efficiency, abs=1e-5)
        assert set(el["bandwidth_hz"]) == set(s.bandwidth_hz)
        for band in s.bands:  # a band with an edge beyond the sweep: its least width
            level = f"{band.level:g}"
            assert el["bandwidth_at_least_hz"][level] == pytest.approx(
                band.width_at_least_hz, abs=0.1)
            assert el["bandwidth_beyond_sweep"][level] == (
                ["lower"] * band.lower_beyond_sweep + ["upper"] * band.upper_beyond_sweep)
    (diff,) = d["electrical_differences"]
    assert diff["resonance_hz"] == pytest.approx(sweeps[1].resonance_hz - sweeps[0].resonance_hz,
                                                 abs=0.2)
    # the fatter conductor (6 mm tube against 2.6 mm wire) resonates lower for the same
    # length: source: Kraus, Antennas, resonant length falls as the length-to-diameter
    # ratio falls (from memory)
    assert diff["resonance_hz"] < 0
    out = cli("compare", a, b, check_exit=0).stdout
    row = next(line for line in out.splitlines() if line.startswith("fd: resonance (X = 0)"))
    assert f"{sweeps[0].resonance_hz / 1e6:.3f} MHz" in row
    assert f"{sweeps[1].resonance_hz / 1e6:.3f} MHz" in row
    for label in ("fd: least SWR", "fd: bandwidth SWR < 1.5", "fd: bandwidth SWR < 2",
                  "fd: efficiency"):
        assert label in out
    assert "note: fd: B against A: resonance -" in out
    # the tube's SWR 2 band runs past the sweep's start (its lower edge beyond it)
    (band,) = [b for b in sweeps[1].bands if b.level == 2]
    assert band.lower_beyond_sweep and not band.upper_beyond_sweep
    row = next(line for line in out.splitlines() if line.startswith("fd: bandwidth SWR < 2 "))
    assert row.endswith(f"at least {band.width_at_least_hz / 1e6:.3f} MHz (lower edge beyond "
                        "the sweep)")
    # weight and cost are still compared
    assert "weight built" in out and "total cost" in out


def test_compare_says_when_only_one_design_is_checked_electrically(cli, write_design):
    a = write_design(WIRE + ELECTRICAL, "wire.toml")
    b = write_design(TUBE, "tube.toml")
    out = cli("compare", a, b, check_exit=0).stdout
    assert "note: only design A has an [electrical] table" in out
    row = next(line for line in out.splitlines() if line.startswith("fd: resonance"))
    assert row.split()[-1] == "-"  # nothing for B
    d = json.loads(cli("compare", a, b, "--json", check_exit=0).stdout)
    assert d["b"]["electrical"] is None and d["electrical_differences"] == []
    plain = cli("compare", write_design(WIRE, "w2.toml"), b, check_exit=0).stdout
    assert "resonance" not in plain and "[electrical]" not in plain
