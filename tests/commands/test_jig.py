"""`fabplan jig` through the installed command line (subprocess)."""

from __future__ import annotations

import ezdxf
import pytest


@pytest.fixture
def design(write_design, folded_dipole_toml):
    return write_design(folded_dipole_toml(side="300 mm", spacing="30 mm", gap="10 mm"),
                        "dipole.toml")


def test_writes_dxf_and_svg_and_refuses_to_overwrite(cli, design, tmp_path):
    out = tmp_path / "jig"
    proc = cli("jig", design, "-o", out, check_exit=0)
    files = sorted(p.name for p in out.iterdir())
    assert files == ["dipole-jig-1.dxf", "dipole-jig-1.svg"]
    assert proc.stderr.count("wrote ") == 2
    first = {p.name: p.read_bytes() for p in out.iterdir()}
    refused = cli("jig", design, "-o", out, "--kerf", "0.3 mm")
    assert refused.returncode == 2
    assert len(refused.stderr.strip().splitlines()) == 1
    assert "already exists" in refused.stderr and "--force" in refused.stderr
    assert {p.name: p.read_bytes() for p in out.iterdir()} == first  # untouched
    # --force replaces them; the same input gives the same bytes
    cli("jig", design, "-o", out, "--force", check_exit=0)
    assert {p.name: p.read_bytes() for p in out.iterdir()} == first
    assert not [p for p in out.iterdir() if p.name.startswith(".")]  # no temp files left


def test_options_reach_the_drawing(cli, design, tmp_path):
    out = tmp_path / "inch"
    cli("jig", design, "-o", out, "--format", "dxf", "--units", "in", "--kerf", "0.2 mm",
            "--bed", "24x18in", check_exit=0)
    assert [p.suffix for p in out.iterdir()] == [".dxf"]
    doc = ezdxf.readfile(next(out.iterdir()))
    assert doc.header["$INSUNITS"] == 1  # source: DXF reference, $INSUNITS 1 = inches
    assert not doc.audit().has_errors
    bed = doc.modelspace().query("LWPOLYLINE[layer=='JIG_REFERENCE']")[0]
    xs = [p[0] for p in bed.get_points("xy")]
    assert max(xs) - min(xs) == pytest.approx(24.0)  # the bed outline, in inches


@pytest.mark.parametrize("args, field", [
    (["--bed", "600x400"], "--bed"),
    (["--format", "pdf"], "--format"),
    (["--units", "cm"], "--units"),
    (["--kerf", "0.2"], "--kerf"),
])
def test_bad_options_give_one_line_and_exit_2(cli, design, tmp_path, args, field):
    out = tmp_path / "bad"
    proc = cli("jig", design, "-o", out, *args)
    assert proc.returncode == 2
    lines = proc.stderr.strip().splitlines()
    assert len(lines) == 1 and field in lines[0] and "Traceback" not in proc.stderr
    assert not out.exists() or not any(out.iterdir())


def test_the_module_imports_no_heavy_library():
    import subprocess
    import sys

    code = ("import sys, fabplan.cli, fabplan.commands.jig, fabplan.design.jig; "
            "print(sorted(m for m in ('ezdxf', 'shapely', 'reportlab') if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         check=True).stdout.strip()
    assert out == "[]"
