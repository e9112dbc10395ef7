"""What a command-line user expects of every command (issue 15, "Conventions a user
expects"): `-` for standard input and output, -q and -v, fixed option values that
help and shell completion list, and every "wrote" line on standard error.
In-process through click's runner (the `cli` fixture)."""

from __future__ import annotations

import csv
import io
import json
import logging
import os
from importlib import resources

import pdfplumber
import pytest

from fabplan.geometry.shapes import SHAPES

FOLDED = resources.files("fabplan").joinpath("templates", "folded-dipole.toml").read_text("utf-8")


@pytest.fixture
def priced(write_design, uncomment_template):
    """A folded dipole with [forming], [purchase] and [jig] but no [electrical] (a
    quick plan): the folded-dipole template with those tables switched on."""
    import tomlkit

    doc = tomlkit.parse(uncomment_template(FOLDED))
    del doc["electrical"]
    return write_design(tomlkit.dumps(doc), "priced.toml")


def _no_dash_file(folder) -> None:
    """Nothing was written under the literal name `-`."""
    assert not (folder / "-").exists()


# -- `-` for standard input ------------------------------------------------------------------
def test_plan_reads_the_design_from_standard_input(cli, priced, tmp_path):
    text = priced.read_text(encoding="utf-8")
    piped = json.loads(cli("plan", "--json", "-", input=text, check_exit=0).stdout)
    direct = json.loads(cli("plan", "--json", priced, check_exit=0).stdout)
    assert piped["source"] == "<stdin>" and direct["source"] == str(priced)
    piped["source"] = direct["source"]
    assert piped == direct
    assert cli("plan", "-", input=text, check_exit=0).stdout == \
        cli("plan", priced, check_exit=0).stdout


@pytest.mark.parametrize("command", [("check",), ("estimate",), ("estimate", "--json")])
def test_every_design_argument_takes_standard_input(cli, priced, command):
    text = priced.read_text(encoding="utf-8")
    piped = cli(command[0], "-", *command[1:], input=text, check_exit=0)
    direct = cli(command[0], priced, *command[1:], check_exit=0)
    assert piped.stdout.replace("<stdin>", str(priced)) == direct.stdout
    assert piped.stderr == direct.stderr == ""


def test_compare_takes_either_design_from_standard_input(cli, priced):
    text = priced.read_text(encoding="utf-8")
    direct = json.loads(cli("compare", priced, priced, "--json",
                            check_exit=0).stdout)
    for args in (("-", priced), (priced, "-")):
        piped = json.loads(cli("compare", *args, "--json", input=text, check_exit=0).stdout)
        which = "a" if args[0] == "-" else "b"
        assert piped[which]["design"] == "<stdin>"
        piped[which]["design"] = str(priced)
        assert piped == direct


def test_sheet_reads_standard_input_and_names_it(cli, priced, tmp_path):
    out = tmp_path / "sheet.pdf"
    cli("sheet", "-", "-o", out, input=priced.read_bytes(), check_exit=0)
    with pdfplumber.open(out) as pdf:
        assert "My folded dipole" in pdf.pages[0].extract_text()


def test_a_bad_design_on_standard_input_is_one_line_naming_stdin(cli):
    proc = cli("check", "-", input="[stock\n")
    assert proc.returncode == 2 and proc.stdout == ""
    lines = proc.stderr.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("fabplan: error: <stdin>: not valid TOML")


def test_compare_takes_only_one_design_from_standard_input(cli, priced):
    proc = cli("compare", "-", "-", input=priced.read_text(encoding="utf-8"))
    assert proc.returncode == 2 and "only one design" in proc.stderr
    assert len(proc.stderr.strip().splitlines()) == 1


# -- `-` for standard output -----------------------------------------------------------------
def test_new_writes_to_standard_output_with_dash(cli, tmp_path):
    for shape in SHAPES:
        text = resources.files("fabplan").joinpath("templates", f"{shape}.toml").read_text()
        proc = cli("new", shape, "-o", "-", cwd=tmp_path, check_exit=0)
        assert proc.stdout == text and proc.stderr == ""
    _no_dash_file(tmp_path)


def test_estimate_csv_to_standard_output(cli, priced, tmp_path):
    file = tmp_path / "cuts.csv"
    report = cli("estimate", priced, "--csv", file, check_exit=0).stdout
    proc = cli("estimate", priced, "--csv", "-", cwd=tmp_path, check_exit=0)
    _no_dash_file(tmp_path)
    # the CSV alone on standard output (what a pipe gets), the report on standard error
    assert proc.stdout == file.read_text(encoding="utf-8")
    rows = list(csv.DictReader(io.StringIO(proc.stdout)))  # the csv module reads it back
    assert len([r for r in rows if r["element"] != "(remnant)"]) == 2  # 1 and a spare
    assert proc.stderr == report
    refused = cli("estimate", priced, "--csv", "-", "--json")
    assert refused.returncode == 2 and "--csv" in refused.stderr and refused.stdout == ""


def test_sweep_csv_to_standard_output(cli, write_design, tmp_path, swept_folded_dipole_toml):
    design = write_design(swept_folded_dipole_toml)
    proc = cli("sweep", design, "--csv", "-", cwd=tmp_path, check_exit=0)
    _no_dash_file(tmp_path)
    rows = list(csv.DictReader(io.StringIO(proc.stdout)))
    assert [float(r["f_hz"]) for r in rows] == [420e6, 430e6, 440e6, 450e6, 460e6]
    assert "least SWR" in proc.stderr and "least SWR" not in proc.stdout


def test_tune_writes_the_tuned_design_to_standard_output(cli, write_design,
                                                         swept_folded_dipole_toml, tmp_path):
    from fabplan.design.read import parse_design

    design = write_design(swept_folded_dipole_toml)
    proc = cli("tune", design, "--target", "440 MHz", "-o", "-", cwd=tmp_path, check_exit=0)
    _no_dash_file(tmp_path)
    tuned = parse_design(proc.stdout)  # standard output holds a valid design, nothing else
    assert tuned.elements[0].params.length_mm != parse_design(
        swept_folded_dipole_toml).elements[0].params.length_mm
    assert "tuned design: side = " in proc.stderr and "CAUTION" in proc.stderr


def test_sheet_and_template_write_pdf_to_standard_output(cli, priced, tmp_path):
    for command in ("sheet", "template"):
        proc = cli(command, priced, "-o", "-", cwd=tmp_path, check_exit=0)
        assert proc.stdout_bytes.startswith(b"%PDF") and proc.stderr == ""
        with pdfplumber.open(io.BytesIO(proc.stdout_bytes)) as pdf:
            assert len(pdf.pages) >= 1
    _no_dash_file(tmp_path)


@pytest.mark.parametrize("command", ["build", "jig"])
def test_a_set_of_files_cannot_go_to_standard_output(cli, priced, tmp_path, command):
    proc = cli(command, priced, "-o", "-", cwd=tmp_path)
    assert proc.returncode == 2 and proc.stdout == ""
    lines = proc.stderr.strip().splitlines()
    assert len(lines) == 1 and "give a folder" in lines[0]
    _no_dash_file(tmp_path)


# -- every "wrote" line on standard error, and -q ---------------------------------------------
def _writing_commands(example, design, tmp):
    return [
        ("new", "hairpin", "-o", tmp / "new.toml"),
        ("estimate", example, "--csv", tmp / "cuts.csv"),
        ("sweep", design, "--csv", tmp / "sweep.csv"),
        ("tune", design, "--target", "440 MHz", "-o", tmp / "tuned.toml"),
        ("sheet", example, "-o", tmp / "sheet.pdf"),
        ("template", example, "-o", tmp / "template.pdf"),
        ("jig", example, "-o", tmp / "jig"),
        ("build", example, "-o", tmp / "build"),
    ]


def test_wrote_lines_go_to_standard_error_and_q_silences_them(
        cli, priced, write_design, swept_folded_dipole_toml, tmp_path):
    design = write_design(swept_folded_dipole_toml)
    for quiet, folder in ((False, tmp_path / "loud"), (True, tmp_path / "quiet")):
        folder.mkdir()
        for args in _writing_commands(priced, design, folder):
            proc = cli(*(("-q",) if quiet else ()), *args, check_exit=0)
            assert "wrote" not in proc.stdout, args
            written = [ln for ln in proc.stderr.splitlines() if ln.startswith("wrote ")]
            if quiet:
                assert written == [] and proc.stderr == "", (args, proc.stderr)
            else:
                assert written, args
                for line in written:
                    assert os.path.isfile(line.removeprefix("wrote ")), line
    # -q changed nothing in what was written
    loud = sorted(p.relative_to(tmp_path / "loud") for p in (tmp_path / "loud").rglob("*"))
    quiet_ = sorted(p.relative_to(tmp_path / "quiet") for p in (tmp_path / "quiet").rglob("*"))
    assert loud == quiet_ and len(loud) > 8


# -- -v and -vv: the library's log on standard error ----------------------------------------
def test_verbose_shows_the_log_at_info_and_debug(cli, write_design, swept_folded_dipole_toml):
    design = write_design(swept_folded_dipole_toml)
    plain = cli("plan", design, check_exit=0)
    info = cli("-v", "plan", design, check_exit=0)
    debug = cli("-vv", "plan", design, check_exit=0)
    assert plain.stderr == ""
    assert "fabplan: INFO: read " in info.stderr and "DEBUG" not in info.stderr
    # the solver and the rational fit log at DEBUG (fabplan/em/solver.py, fitting.py)
    assert "fabplan: DEBUG: " in debug.stderr and "fabplan: INFO: read " in debug.stderr
    assert plain.stdout == info.stdout == debug.stdout  # the log never mixes into the output
    # no handler is left behind on the library's logger after a run
    assert all(isinstance(h, logging.NullHandler) for h in logging.getLogger("fabplan").handlers)


def test_warnings_of_the_library_show_unless_quiet(cli, write_design, folded_dipole_toml,
                                                   monkeypatch):
    import fabplan.plan

    real = fabplan.plan.make_plan

    def make_plan(design):
        logging.getLogger("fabplan").warning("a library warning")
        return real(design)

    monkeypatch.setattr(fabplan.plan, "make_plan", make_plan)
    design = write_design(folded_dipole_toml())
    assert cli("plan", design, check_exit=0).stderr == "fabplan: WARNING: a library warning\n"
    assert cli("-q", "plan", design, check_exit=0).stderr == ""


# -- fixed option values: listed by help and by shell completion ----------------------------
@pytest.mark.parametrize("command, option, values", [
    ("jig", "--format", ["dxf", "svg", "dxf,svg"]),
    ("jig", "--units", ["mm", "in"]),
    ("sheet", "--paper", ["a4", "letter"]),
    ("template", "--paper", ["a4", "letter", "roll-610mm", "roll-914mm"]),
    ("build", "--template-paper", ["a4", "letter", "roll-610mm", "roll-914mm"]),
    ("tune", "--for", ["least-swr", "resonance"]),
])
def test_choices_are_listed_by_help_and_completion(cli, command, option, values):
    helptext = cli(command, "--help", check_exit=0).stdout
    assert f"{option} [{'|'.join(values)}]" in " ".join(helptext.split())
    words = f"fabplan {command} x.toml {option} "
    proc = _complete(cli, words)
    assert proc == [f"plain,{v}" for v in values]


def _complete(cli, words: str) -> list[str]:
    """click's bash completion protocol, in-process: what the shell would be offered."""
    from click.testing import CliRunner

    from fabplan.cli import main

    cword = len(words.split()) - (0 if words.endswith(" ") else 1)  # the word completed
    env = {"_FABPLAN_COMPLETE": "bash_complete", "COMP_WORDS": words, "COMP_CWORD": str(cword)}
    result = CliRunner().invoke(main, [], prog_name="fabplan", env=env)
    assert result.exit_code == 0, result.output
    return result.stdout.splitlines()


def test_completion_lists_the_shapes_and_the_commands(cli):
    assert _complete(cli, "fabplan new ") == [f"plain,{s}" for s in SHAPES]
    assert _complete(cli, "fabplan new c") == ["plain,circle-loop", "plain,custom"]
    commands = [line.split(",", 1)[1] for line in _complete(cli, "fabplan ")]
    assert {"plan", "check", "build", "jig", "sweep", "tune", "new"} <= set(commands)


def test_a_bad_choice_is_one_line_exit_2(cli, priced, tmp_path):
    for args in (("jig", priced, "-o", tmp_path / "j", "--format", "dxf,pdf"),
                 ("jig", priced, "-o", tmp_path / "j", "--units", "cm"),
                 ("tune", priced, "--for", "swr")):
        proc = cli(*args)
        assert proc.returncode == 2 and proc.stdout == ""
        lines = proc.stderr.strip().splitlines()
        assert len(lines) == 1 and args[-2] in lines[0], proc.stderr
    assert not (tmp_path / "j").exists()


def test_jig_formats_are_the_renderers(cli):
    """The --format choices are the formats fabplan.render.jig writes."""
    from fabplan.commands.jig import JIG_FORMATS
    from fabplan.render.jig import FORMATS

    assert tuple(JIG_FORMATS) == tuple(FORMATS)
