"""The installed command line, run in a subprocess as a user would."""

from __future__ import annotations

import json
import math
import subprocess
import sys

import pytest

from fabplan.geometry.shapes import SHAPES


def test_plan_text(run_cli, example_path):
    out = run_cli("plan", example_path, check_exit=0).stdout
    assert "Cut length" in out and "centre of stock" in out and "Bend table" in out


def test_plan_json_fields(run_cli, example_path):
    data = json.loads(run_cli("plan", "--json", example_path, check_exit=0).stdout)
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


def test_check_exit_codes(run_cli, write_design, folded_dipole_toml, example_path):
    assert run_cli("check", example_path).returncode == 0
    bad = write_design(folded_dipole_toml(side="20 mm", gap="30 mm"))
    proc = run_cli("check", bad)
    assert proc.returncode == 1
    assert "gap-wider-than-side" in proc.stdout


@pytest.mark.parametrize("text, needle", [
    ("[stock]\ndiameter = 4\nmaterial = \"cu-c11000-annealed\"\n[[element]]\nshape = \"hairpin\"\n"
     "leg = \"1 in\"\nspacing = \"1 in\"\n", "stock.diameter = 4: a bare number has no unit"),
    ("[stock\n", "not valid TOML"),
])
def test_bad_input_is_one_line_exit_2(run_cli, write_design, text, needle):
    path = write_design(text)
    for command in ("plan", "check"):
        proc = run_cli(command, path)
        assert proc.returncode == 2
        assert needle in proc.stderr
        assert len(proc.stderr.strip().splitlines()) == 1
        assert "Traceback" not in proc.stderr
        assert str(path) in proc.stderr


def test_missing_file(run_cli, tmp_path):
    proc = run_cli("plan", tmp_path / "nope.toml")
    assert proc.returncode == 2 and "file not found" in proc.stderr


def test_shapes_lists_every_shape(run_cli):
    out = run_cli("shapes", check_exit=0).stdout
    assert [line.split()[0] for line in out.strip().splitlines()] == list(SHAPES)


@pytest.mark.parametrize("shape", list(SHAPES))
def test_new_writes_a_buildable_template(run_cli, tmp_path, shape):
    target = tmp_path / f"{shape}.toml"
    run_cli("new", shape, "-o", target, check_exit=0)
    assert run_cli("check", target).returncode == 0, run_cli("check", target).stdout
    # refuses to overwrite, then does with --force
    proc = run_cli("new", shape, "-o", target)
    assert proc.returncode == 2 and "--force" in proc.stderr
    run_cli("new", shape, "-o", target, "--force", check_exit=0)
    # stdout form is the same text
    assert run_cli("new", shape, check_exit=0).stdout == target.read_text()


def test_new_unknown_shape(run_cli):
    proc = run_cli("new", "yagi")
    assert proc.returncode == 2 and "unknown shape" in proc.stderr


def test_import_and_help_stay_light():
    """`import fabplan` and `fabplan --help` load no reportlab, ezdxf or shapely."""
    code = ("import sys, fabplan, fabplan.cli\n"
            "from click.testing import CliRunner\n"
            "r = CliRunner().invoke(fabplan.cli.main, ['--help'])\n"
            "assert r.exit_code == 0, r.output\n"
            "heavy = sorted(m for m in sys.modules if m.split('.')[0] in "
            "{'reportlab', 'ezdxf', 'shapely'})\n"
            "print(','.join(heavy))\n")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         check=True).stdout.strip()
    assert out == ""


def test_python_dash_m_and_version(run_cli):
    assert "fabplan" in run_cli("--version", check_exit=0).stdout


def test_materials_and_stock_lists(run_cli):
    assert "cu-c11000-annealed" in run_cli("materials", check_exit=0).stdout
    assert "acr-1/4" in run_cli("stock", check_exit=0).stdout


def test_console_script_is_installed():
    """The `fabplan` entry point sits beside the interpreter that has the package."""
    from pathlib import Path

    script = Path(sys.executable).with_name("fabplan")
    assert script.exists(), script
    proc = subprocess.run([str(script), "shapes"], capture_output=True, text=True, timeout=120)
    assert proc.returncode == 0 and "folded-dipole" in proc.stdout
