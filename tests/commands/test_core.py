"""`plan`, `check`, `shapes`, `new`, `materials` and `stock`, run in-process
(click's runner); the installed entry point is tested in test_entry_point.py."""

from __future__ import annotations

import dataclasses
import json
import math
import re
import tomllib
from importlib import resources

import pytest

from fabplan.geometry.shapes import SHAPES


def test_plan_text(cli, example_path):
    out = cli("plan", example_path, check_exit=0).stdout
    assert "Cut length" in out and "centre of stock" in out and "Bend table" in out


def test_plan_json_fields(cli, example_path):
    data = json.loads(cli("plan", "--json", example_path, check_exit=0).stdout)
    e = data["elements"][0]
    for key in ("name", "quantity", "developed_length_mm", "cut_length_mm", "bends", "marks"):
        assert key in e
    for b in e["bends"]:
        assert {"angle_deg", "centreline_radius_mm", "start_from_centre_mm",
                "end_from_centre_mm"} <= set(b)
    assert all({"label", "from_centre_mm"} <= set(m) for m in e["marks"])
    assert "od_mm" in data["stock"] and "wall_mm" in data["stock"]
    assert data["stock"]["mass_per_m_kg"] > 0
    assert isinstance(data["findings"], list)
    # common practice, no source: 2 x side + pi x centre spacing - gap, with the
    # example's own dimensions
    from fabplan.design.read import load_design

    p = load_design(example_path).elements[0].params
    assert (p.length_kind, p.spacing_kind) == ("side", "centre_spacing")
    expected = 2 * p.length_mm + math.pi * p.spacing_mm - p.feed_gap_mm
    assert e["developed_length_mm"] == pytest.approx(expected, abs=1e-3)


def test_check_exit_codes(cli, write_design, folded_dipole_toml, example_path):
    assert cli("check", example_path).returncode == 0
    bad = write_design(folded_dipole_toml(side="20 mm", gap="30 mm"))
    proc = cli("check", bad)
    assert proc.returncode == 1
    assert "gap-wider-than-side" in proc.stdout


TOO_BIG = """
[project]
name = "a loop too big for the bed"
[stock]
catalogue = "awg-10"
[[element]]
name = "loop"
shape = "rect-loop"
side = "900 mm"
corner_radius = "20 mm"
[jig]
bed = "300x200mm"
"""


def test_every_command_agrees_on_a_plate_too_big_for_the_bed(cli, write_design, tmp_path):
    # issue 10: check, plan, estimate, build and jig all say jig-too-big and exit 1; the
    # drawing commands write nothing without --with-errors
    design = write_design(TOO_BIG)
    for args in (["check", design], ["plan", design], ["plan", "--json", design],
                 ["estimate", design], ["build", design, "-o", tmp_path / "b"],
                 ["jig", design, "-o", tmp_path / "j"]):
        proc = cli(*args)
        assert proc.returncode == 1, (args, proc.stderr)
        assert "jig-too-big" in proc.stdout + proc.stderr, args
    assert not (tmp_path / "b").exists() and not (tmp_path / "j").exists()


@pytest.mark.parametrize("text, needle", [
    ("[stock]\ndiameter = 4\nmaterial = \"cu-c11000-annealed\"\n[[element]]\nshape = \"hairpin\"\n"
     "leg = \"1 in\"\nspacing = \"1 in\"\n", "stock.diameter = 4: a bare number has no unit"),
    ("[stock\n", "not valid TOML"),
])
def test_bad_input_is_one_line_exit_2(cli, write_design, text, needle):
    path = write_design(text)
    for command in ("plan", "check"):
        proc = cli(command, path)
        assert proc.returncode == 2
        assert needle in proc.stderr
        assert len(proc.stderr.strip().splitlines()) == 1
        assert "Traceback" not in proc.stderr
        assert str(path) in proc.stderr


def test_missing_file(cli, tmp_path):
    proc = cli("plan", tmp_path / "nope.toml")
    assert proc.returncode == 2 and "file not found" in proc.stderr


def test_shapes_lists_every_shape(cli):
    out = cli("shapes", check_exit=0).stdout
    assert [line.split()[0] for line in out.strip().splitlines()] == list(SHAPES)


@pytest.mark.parametrize("shape", list(SHAPES))
def test_new_writes_a_buildable_template(cli, tmp_path, shape):
    target = tmp_path / f"{shape}.toml"
    cli("new", shape, "-o", target, check_exit=0)
    assert cli("check", target).returncode == 0, cli("check", target).stdout
    # refuses to overwrite, then does with --force
    proc = cli("new", shape, "-o", target)
    assert proc.returncode == 2 and "--force" in proc.stderr
    cli("new", shape, "-o", target, "--force", check_exit=0)
    # stdout form is the same text
    assert cli("new", shape, check_exit=0).stdout == target.read_text()


def test_new_unknown_shape(cli):
    proc = cli("new", "yagi")
    assert proc.returncode == 2 and "unknown shape" in proc.stderr


def test_materials_and_stock_lists(cli):
    from fabplan.stock.materials import MATERIALS

    out = cli("materials", check_exit=0).stdout
    assert "cu-c11000-annealed" in out
    for m in MATERIALS.values():  # issue 15: it promised sources and showed none
        assert f"  {m.key}: {m.source}" in out
    assert "acr-1/4" in cli("stock", check_exit=0).stdout


# -- the templates' optional tables (issue 15: every template shows the tables that apply) --
def _template(shape: str) -> str:
    return resources.files("fabplan").joinpath("templates", f"{shape}.toml").read_text("utf-8")


@pytest.mark.parametrize("shape", list(SHAPES))
def test_template_optional_tables_switched_on_make_a_buildable_design(
        cli, write_design, uncomment_template, shape):
    """Removing the leading "# " from every commented table of a template gives a
    design that `check` passes, with [forming], [purchase] and [jig] in every one
    and [electrical] wherever the shape can be fed across a gap."""
    from fabplan.design.jig import JigSettings
    from fabplan.design.read import load_design

    text = _template(shape)
    plain = tomllib.loads(text)
    assert not {"forming", "purchase", "jig", "electrical"} & set(plain)  # all commented out
    on = uncomment_template(text)
    tables = set(tomllib.loads(on))
    fed = "feed_gap" in SHAPES[shape].keys
    # each table is there, or the template says why it does not apply (instead of
    # sending the user to another shape's template)
    shown = {t for t in ("forming", "purchase", "jig", "electrical")
             if not re.search(rf"no \[{t}\] table", text, re.IGNORECASE)}
    assert "purchase" in shown and ("electrical" in shown) == fed
    assert tables & {"forming", "purchase", "jig", "electrical"} == shown
    path = write_design(on, f"{shape}-all.toml")
    proc = cli("check", path)
    assert proc.returncode == 0, proc.stdout + proc.stderr
    d = load_design(path)
    assert d.purchase.given and d.purchase.offers and d.purchase.currency is not None
    assert (d.forming.calibration is not None) == ("forming" in shown)
    assert (d.jig is not None and d.jig != JigSettings()) == ("jig" in shown)  # kerf example
    assert (d.electrical is not None) == fed


@pytest.mark.parametrize("shape", ["folded-dipole", "rect-loop", "delta-loop", "circle-loop"])
def test_template_targets_sit_where_the_dimensions_resonate(plan_of, uncomment_template, shape):
    """Not a check against a source: only that each fed template's [electrical]
    target is where its own dimensions resonate (within 2 %, four times the
    model's stated uncertainty), so the example values belong together."""
    plan = plan_of(uncomment_template(_template(shape)))
    el = plan.elements[0].electrical
    assert el.target_hz == 440e6 and el.sweep.resonance_hz is not None
    assert el.sweep.resonance_hz == pytest.approx(el.target_hz, rel=0.02)


def _jig_block(text: str) -> list[tuple[str, str, str]]:
    """(key, shown value, comment) of each line of a template's commented [jig] table."""
    lines = text.splitlines()
    start = lines.index("# [jig]")
    rows = []
    for line in lines[start + 1:]:
        if not line.startswith("#"):
            break
        m = re.match(r"# (\w+) = (\"[^\"]*\"|\S+)\s*(?:#(.*))?$", line)
        if m:
            rows.append((m.group(1), m.group(2), m.group(3) or ""))
    return rows


@pytest.mark.parametrize("shape", list(SHAPES))
def test_template_jig_comments_state_the_real_defaults(plan_of, shape):
    """Every [jig] key is shown; each line's value is the default unless its
    comment names another one (`default "0 mm"`), and those defaults are what
    fabplan uses when the key is left out (JigSettings())."""
    from fabplan.design.jig import JigSettings
    from fabplan.design.read import parse_design

    text = _template(shape)
    if "# [jig]" not in text:
        assert re.search(r"no \[jig\] table", text, re.IGNORECASE)  # says why
        return
    rows = _jig_block(text)
    keys = {f.name.removesuffix("_mm") for f in dataclasses.fields(JigSettings)}
    assert {k for k, _, _ in rows} == keys
    defaults = []
    for key, shown, comment in rows:
        m = re.search(r"default (\"[^\"]*\"|[\w.+-]+)", comment)
        defaults.append(f"{key} = {m.group(1) if m else shown}")
    head = "\n".join(ln for ln in text.splitlines() if not ln.startswith("#"))
    design = parse_design(head + "\n[jig]\n" + "\n".join(defaults) + "\n")
    assert design.jig == JigSettings()
