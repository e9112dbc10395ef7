"""`fabplan build`, `sheet` and `template`, in-process (click's runner), with one real
subprocess build for the same-bytes check across string-hash seeds."""

from __future__ import annotations

import json

import pdfplumber
import pytest

from fabplan.commands.output import BUILD_NAMES


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    """The example built twice into two folders: once in this process, once by the
    installed command in a subprocess whose string hashing differs from this
    process's (no output may depend on set order). Returns (base, [one, two]), each
    with returncode, stdout and stderr."""
    import os
    import subprocess
    import sys
    from pathlib import Path

    from click.testing import CliRunner

    from fabplan.cli import main

    root = Path(__file__).resolve().parents[2]
    example = root / "examples" / "club-uhf-folded-dipoles.toml"
    base = tmp_path_factory.mktemp("build")
    one = CliRunner().invoke(main, ["build", str(example), "-o", str(base / "one")],
                             prog_name="fabplan", catch_exceptions=False)
    one.returncode = one.exit_code
    env = {k: v for k, v in os.environ.items() if k != "PYTHONWARNINGS"}
    env["PYTHONHASHSEED"] = "2" if os.environ.get("PYTHONHASHSEED") == "1" else "1"
    two = subprocess.run([sys.executable, "-m", "fabplan", "build", str(example),
                          "-o", str(base / "two")], capture_output=True, text=True, env=env,
                         cwd=root, timeout=300)
    return base, [one, two]


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


def test_refuses_to_overwrite_then_force(cli, example_path, tmp_path):
    out = tmp_path / "out"
    out.mkdir()
    (out / BUILD_NAMES["template"]).write_text("keep me")
    proc = cli("build", example_path, "-o", out)
    assert proc.returncode == 2
    assert len(proc.stderr.strip().splitlines()) == 1
    assert "already exists" in proc.stderr and "--force" in proc.stderr
    # nothing else was written before the refusal, and the file is untouched
    assert sorted(p.name for p in out.iterdir()) == [BUILD_NAMES["template"]]
    assert (out / BUILD_NAMES["template"]).read_text() == "keep me"
    proc = cli("build", example_path, "-o", out, "--force")
    assert proc.returncode == 0, proc.stderr
    assert (out / BUILD_NAMES["template"]).read_bytes().startswith(b"%PDF")


def test_sheet_and_template_commands(cli, example_path, tmp_path):
    sheet = tmp_path / "s.pdf"
    proc = cli("sheet", example_path, "-o", sheet, "--paper", "letter", check_exit=0)
    with pdfplumber.open(sheet) as pdf:
        assert (pdf.pages[0].width, pdf.pages[0].height) == (612, 792)  # Letter 8.5 x 11 in
    proc = cli("sheet", example_path, "-o", sheet, "--paper", "letter")
    assert proc.returncode == 2 and "already exists" in proc.stderr
    roll = tmp_path / "t.pdf"
    cli("template", example_path, "-o", roll, "--paper", "roll-914mm", check_exit=0)
    with pdfplumber.open(roll) as pdf:
        assert len(pdf.pages) == 1
        assert pdf.pages[0].width == pytest.approx(914 * 72 / 25.4, abs=0.01)  # 914 mm roll


@pytest.mark.parametrize("args", [("sheet", "--paper", "a3"),
                                  ("template", "--paper", "tabloid"),
                                  ("build", "--paper", "roll-914mm")])
def test_bad_paper_is_one_line_exit_2(cli, example_path, tmp_path, args):
    command, *rest = args
    target = tmp_path / ("out" if command == "build" else "x.pdf")
    proc = cli(command, example_path, "-o", target, *rest)
    assert proc.returncode == 2
    lines = proc.stderr.strip().splitlines()
    assert len(lines) == 1 and "--paper" in lines[0] and "Traceback" not in proc.stderr
    assert not target.exists()


def test_build_writes_the_sweep_as_csv(cli, write_design, swept_folded_dipole_toml, tmp_path):
    """With an [electrical] table the build adds sweep.csv: one row per
    frequency, the Plan's impedance and SWR (read back with the csv module)."""
    import csv

    from fabplan.design.read import load_design
    from fabplan.plan import make_plan

    design = write_design(swept_folded_dipole_toml)
    out = tmp_path / "out"
    proc = cli("build", design, "-o", out)
    assert proc.returncode in (0, 1), proc.stderr  # 1: error findings, files still written
    with open(out / BUILD_NAMES["sweep"], newline="") as fh:
        rows = list(csv.DictReader(fh))
    sw = make_plan(load_design(design)).elements[0].electrical.sweep
    assert [float(r["f_hz"]) for r in rows] == pytest.approx(list(sw.freq_hz), abs=0.1)
    assert [float(r["swr_system"]) for r in rows] == pytest.approx(list(sw.swr_system),
                                                                   abs=1e-5)
    assert [float(r["r_ohm"]) for r in rows] == pytest.approx([z.real for z in sw.z_ohm],
                                                              abs=1e-4)


def test_build_into_a_file_is_one_line_exit_2(cli, example_path, tmp_path):
    target = tmp_path / "not-a-folder"
    target.write_text("x")
    proc = cli("build", example_path, "-o", target)
    assert proc.returncode == 2
    assert len(proc.stderr.strip().splitlines()) == 1 and "Traceback" not in proc.stderr
    assert target.read_text() == "x"


# -- output sets through the command (issue 15: long names, a full disk, Ctrl-C) -----------
@pytest.mark.parametrize("length", [236, 250])
def test_build_with_a_long_design_name_writes_every_file(cli, example_path, tmp_path, length):
    from fabplan.render.files import MAX_NAME_BYTES

    design = tmp_path / ("d" * length + ".toml")  # 250 + ".toml": the longest ext4 allows
    design.write_bytes(example_path.read_bytes())
    out = tmp_path / "out"
    proc = cli("build", design, "-o", out, check_exit=0)
    names = sorted(p.name for p in out.iterdir())
    assert {BUILD_NAMES[k] for k in ("plan", "sheet", "template")} <= set(names)
    jig = [n for n in names if n.endswith((".dxf", ".svg"))]
    assert len(jig) >= 2 and all(n.startswith("d" * 20) for n in jig)
    assert all(len(n.encode("utf-8")) <= MAX_NAME_BYTES for n in names)
    written = sorted(line.split(" ", 1)[1].rsplit("/", 1)[-1]
                     for line in proc.stderr.splitlines() if line.startswith("wrote "))
    assert written == names  # the "wrote" lines name the files as they are on disk
    # the same design gives the same (shortened) names on a second run
    again = tmp_path / "again"
    cli("build", design, "-o", again, check_exit=0)
    assert sorted(p.name for p in again.iterdir()) == names


def _fail_third_write(monkeypatch, exc):
    from fabplan.render import files

    real = files._write_file
    count = []

    def write(path, data):
        count.append(path)
        if len(count) == 3:
            path.write_bytes(b"")  # the 0-byte file an interrupted write leaves
            raise exc
        real(path, data)

    monkeypatch.setattr(files, "_write_file", write)


def test_build_on_a_full_disk_leaves_nothing_and_says_where(cli, example_path, tmp_path,
                                                            monkeypatch):
    import errno
    import os

    _fail_third_write(monkeypatch, OSError(errno.ENOSPC, os.strerror(errno.ENOSPC)))
    out = tmp_path / "out"
    proc = cli("-q", "build", example_path, "-o", out)  # -q: no progress lines, which
    assert proc.returncode == 2 and proc.stdout == ""   # appear when the machine is slow
    lines = proc.stderr.strip().splitlines()
    assert len(lines) == 1, proc.stderr
    assert lines[0].startswith(f"fabplan: error: --output = '{out}/")  # the file, by name
    assert lines[0].endswith(": cannot write: No space left on device")
    assert list(tmp_path.iterdir()) == []  # no folder, no partial set, no temporary files


def test_build_interrupted_while_writing_leaves_nothing(cli, example_path, tmp_path,
                                                        monkeypatch):
    _fail_third_write(monkeypatch, KeyboardInterrupt())
    out = tmp_path / "out"
    proc = cli("-q", "build", example_path, "-o", out)  # -q: no progress lines
    assert proc.returncode == 130  # 128 + SIGINT, as a shell reports Ctrl-C
    assert proc.stderr == "fabplan: interrupted\n" and proc.stdout == ""
    assert list(tmp_path.iterdir()) == []
    # into a folder that holds an earlier build: that build is left as it was
    monkeypatch.undo()
    cli("build", example_path, "-o", out, check_exit=0)
    before = {p.name: p.read_bytes() for p in out.iterdir()}
    _fail_third_write(monkeypatch, KeyboardInterrupt())
    proc = cli("-q", "build", example_path, "-o", out, "--force")
    assert proc.returncode == 130 and proc.stderr == "fabplan: interrupted\n"
    assert {p.name: p.read_bytes() for p in out.iterdir()} == before
    assert not [p for p in tmp_path.rglob(".*")]
