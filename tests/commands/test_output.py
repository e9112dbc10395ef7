"""`fabplan build`, `sheet` and `template` run as the installed command line."""

from __future__ import annotations

import json

import pdfplumber
import pytest

from fabplan.commands.output import BUILD_NAMES


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    """The example built twice into two folders, by the command line."""
    import os
    import subprocess
    import sys
    from pathlib import Path

    root = Path(__file__).resolve().parents[2]
    example = root / "examples" / "club-uhf-folded-dipoles.toml"
    base = tmp_path_factory.mktemp("build")
    procs = []
    for name, seed in (("one", "1"), ("two", "2")):
        # different string hashing in each run: no output may depend on set order
        env = {k: v for k, v in os.environ.items() if k != "PYTHONWARNINGS"}
        env["PYTHONHASHSEED"] = seed
        procs.append(subprocess.run([sys.executable, "-m", "fabplan", "build", str(example),
                                     "-o", str(base / name)], capture_output=True, text=True,
                                    env=env, cwd=root, timeout=300))
    return base, procs


def test_build_writes_everything(built):
    base, procs = built
    assert procs[0].returncode == 0, procs[0].stderr
    out = base / "one"
    for key in ("plan", "sheet", "template"):
        assert (out / BUILD_NAMES[key]).stat().st_size > 0
    plan = json.loads((out / BUILD_NAMES["plan"]).read_text())
    assert plan["project"].startswith("Hillcrest")
    for key in ("sheet", "template"):
        with pdfplumber.open(out / BUILD_NAMES[key]) as pdf:
            assert len(pdf.pages) >= 2
    written = [line.split(" ", 1)[1] for line in procs[0].stderr.splitlines()
               if line.startswith("wrote ")]
    assert sorted(p.rsplit("/", 1)[-1] for p in written) == sorted(
        p.name for p in out.iterdir())  # it says what it wrote, and wrote nothing else


def test_same_input_same_bytes(built):
    base, procs = built
    assert procs[1].returncode == 0, procs[1].stderr
    one = sorted(p.name for p in (base / "one").iterdir())
    assert one == sorted(p.name for p in (base / "two").iterdir())
    assert any(name.endswith(".dxf") for name in one)  # the jig drawings are in the build
    for name in one:
        assert (base / "one" / name).read_bytes() == (base / "two" / name).read_bytes(), name


def test_refuses_to_overwrite_then_force(run_cli, example_path, tmp_path):
    out = tmp_path / "out"
    out.mkdir()
    (out / BUILD_NAMES["template"]).write_text("keep me")
    proc = run_cli("build", example_path, "-o", out)
    assert proc.returncode == 2
    assert len(proc.stderr.strip().splitlines()) == 1
    assert "already exists" in proc.stderr and "--force" in proc.stderr
    # nothing else was written before the refusal, and the file is untouched
    assert sorted(p.name for p in out.iterdir()) == [BUILD_NAMES["template"]]
    assert (out / BUILD_NAMES["template"]).read_text() == "keep me"
    proc = run_cli("build", example_path, "-o", out, "--force")
    assert proc.returncode == 0, proc.stderr
    assert (out / BUILD_NAMES["template"]).read_bytes().startswith(b"%PDF")


def test_sheet_and_template_commands(run_cli, example_path, tmp_path):
    sheet = tmp_path / "s.pdf"
    proc = run_cli("sheet", example_path, "-o", sheet, "--paper", "letter", check_exit=0)
    with pdfplumber.open(sheet) as pdf:
        assert (pdf.pages[0].width, pdf.pages[0].height) == (612, 792)  # Letter 8.5 x 11 in
    proc = run_cli("sheet", example_path, "-o", sheet, "--paper", "letter")
    assert proc.returncode == 2 and "already exists" in proc.stderr
    roll = tmp_path / "t.pdf"
    run_cli("template", example_path, "-o", roll, "--paper", "roll-914mm", check_exit=0)
    with pdfplumber.open(roll) as pdf:
        assert len(pdf.pages) == 1
        assert pdf.pages[0].width == pytest.approx(914 * 72 / 25.4, abs=0.01)  # 914 mm roll


@pytest.mark.parametrize("args", [("sheet", "--paper", "a3"),
                                  ("template", "--paper", "tabloid"),
                                  ("build", "--paper", "roll-914mm")])
def test_bad_paper_is_one_line_exit_2(run_cli, example_path, tmp_path, args):
    command, *rest = args
    target = tmp_path / ("out" if command == "build" else "x.pdf")
    proc = run_cli(command, example_path, "-o", target, *rest)
    assert proc.returncode == 2
    lines = proc.stderr.strip().splitlines()
    assert len(lines) == 1 and "--paper" in lines[0] and "Traceback" not in proc.stderr
    assert not target.exists()


def test_build_writes_the_sweep_as_csv(run_cli, write_design, swept_folded_dipole_toml, tmp_path):
    """With an [electrical] table the build adds sweep.csv: one row per
    frequency, the Plan's impedance and SWR (read back with the csv module)."""
    import csv

    from fabplan.design.read import load_design
    from fabplan.plan import make_plan

    design = write_design(swept_folded_dipole_toml)
    out = tmp_path / "out"
    proc = run_cli("build", design, "-o", out)
    assert proc.returncode in (0, 1), proc.stderr  # 1: error findings, files still written
    with open(out / BUILD_NAMES["sweep"], newline="") as fh:
        rows = list(csv.DictReader(fh))
    sw = make_plan(load_design(design)).elements[0].electrical.sweep
    assert [float(r["f_hz"]) for r in rows] == pytest.approx(list(sw.freq_hz), abs=0.1)
    assert [float(r["swr_system"]) for r in rows] == pytest.approx(list(sw.swr_system),
                                                                   abs=1e-5)
    assert [float(r["r_ohm"]) for r in rows] == pytest.approx([z.real for z in sw.z_ohm],
                                                              abs=1e-4)


def test_build_into_a_file_is_one_line_exit_2(run_cli, example_path, tmp_path):
    target = tmp_path / "not-a-folder"
    target.write_text("x")
    proc = run_cli("build", example_path, "-o", target)
    assert proc.returncode == 2
    assert len(proc.stderr.strip().splitlines()) == 1 and "Traceback" not in proc.stderr
    assert target.read_text() == "x"
