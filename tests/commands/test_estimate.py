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


def test_estimate_prints_the_purchase_plan(run_cli, example_path):
    out = run_cli("estimate", example_path, check_exit=0).stdout
    assert "Bill of material" in out and "Cutting plan" in out
    assert "15 ft coil" in out and "USD 31.00" in out and "USD 95.75" in out


def test_estimate_json(run_cli, example_path):
    d = json.loads(run_cli("estimate", example_path, "--json", check_exit=0).stdout)
    assert d["order"]["pieces_to_buy"] == 2
    assert d["order"]["total_cost"] == pytest.approx(95.75)
    assert d["elements"][0]["estimate"]["pieces_to_cut"] == 7


def test_estimate_csv_refuses_to_overwrite(run_cli, example_path, tmp_path):
    target = tmp_path / "cuts.csv"
    run_cli("estimate", example_path, "--csv", target, check_exit=0)
    rows = list(csv.DictReader(target.read_text(encoding="utf-8").splitlines()))
    cuts = [r for r in rows if r["element"] != "(remnant)"]
    assert len(cuts) == 7
    assert {r["stock_piece"] for r in cuts} == {"1", "2"}
    assert float(cuts[0]["start_mm"]) == pytest.approx(12.7)  # the 1/2 in unusable end
    before = target.read_bytes()
    proc = run_cli("estimate", example_path, "--csv", target, check_exit=2)
    assert "already exists" in proc.stderr and len(proc.stderr.strip().splitlines()) == 1
    assert target.read_bytes() == before
    run_cli("estimate", example_path, "--csv", target, "--force", check_exit=0)
    assert target.read_bytes() == before  # same input, same bytes


@pytest.mark.parametrize("change, field", [
    (("price = 2.40", "price = 0"), "purchase.offer[1].price"),
    (("price = 2.40", "price = -2.40"), "purchase.offer[1].price"),
    (('currency = "EUR"', 'currency = "Euro"'), "purchase.currency"),
    (('length = "25 m"', 'length = "0.5 m"'), "element[1]"),
    (("quantity = 4", "quantity = 2.5"), "element[1].quantity"),
])
def test_bad_input_exits_2_naming_the_field(run_cli, write_design, change, field):
    path = write_design(WIRE.replace(*change))
    proc = run_cli("estimate", path, check_exit=2)
    lines = proc.stderr.strip().splitlines()
    assert len(lines) == 1 and field in lines[0] and "Traceback" not in proc.stderr
    assert proc.stdout == ""


def test_compare_two_stock_choices(run_cli, write_design):
    a = write_design(WIRE, "wire.toml")
    b = write_design(TUBE, "tube.toml")
    out = run_cli("compare", a, b, check_exit=0).stdout
    assert "weight built" in out and "total cost" in out and "findings" in out
    assert "3 m tube" in out and "25 m coil" in out
    d = json.loads(run_cli("compare", a, b, "--json", check_exit=0).stdout)
    assert d["same_elements"] is True
    assert d["a"]["stock"] != d["b"]["stock"]
    # AWG 10 solid is 5.26 mm2 of copper, 6 x 1 mm tube pi x 5 x 1 = 15.7 mm2: the tube weighs more
    assert d["b"]["mass_per_m_kg"] > d["a"]["mass_per_m_kg"]
    assert set(d["a"]["findings"]) == {"error", "warning", "info"}


def test_compare_missing_file_exits_2(run_cli, example_path, tmp_path):
    proc = run_cli("compare", example_path, tmp_path / "nope.toml", check_exit=2)
    assert "file not found" in proc.stderr
