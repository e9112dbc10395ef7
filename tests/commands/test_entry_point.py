"""The installed command line as a user's shell runs it: a few real subprocess
smoke tests (the console script, `python -m fabplan`, exit codes, pipes, shell
completion, start-up imports). Every other command-line test runs in-process
through click's runner (the `cli` fixture), which is much faster."""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

SCRIPT = Path(sys.executable).with_name("fabplan")


def _env(**extra: str) -> dict[str, str]:
    env = {k: v for k, v in os.environ.items() if k != "PYTHONWARNINGS"}
    env.update(extra)
    return env


def test_console_script_is_installed():
    """The `fabplan` entry point sits beside the interpreter that has the package."""
    assert SCRIPT.exists(), SCRIPT
    proc = subprocess.run([str(SCRIPT), "shapes"], capture_output=True, text=True, timeout=120,
                          env=_env())
    assert proc.returncode == 0 and "folded-dipole" in proc.stdout


def test_python_dash_m_and_version(run_cli):
    from fabplan import __version__

    assert run_cli("--version", check_exit=0).stdout.strip() == f"fabplan, version {__version__}"


def test_exit_codes_through_a_real_process(run_cli, write_design, folded_dipole_toml):
    """1 error findings, 2 bad input (one line), as a shell sees them (0: the other
    tests here)."""
    bad = run_cli("check", write_design(folded_dipole_toml(side="20 mm", gap="30 mm")))
    assert bad.returncode == 1 and "gap-wider-than-side" in bad.stdout
    wrong = run_cli("check", write_design("[stock\n", "broken.toml"))
    assert wrong.returncode == 2 and len(wrong.stderr.strip().splitlines()) == 1
    assert "Traceback" not in wrong.stderr


def test_pipes_between_two_real_processes(tmp_path):
    """`fabplan new SHAPE -o - | fabplan plan --json -`: standard output into standard input."""
    new = subprocess.Popen([str(SCRIPT), "new", "hairpin", "-o", "-"], stdout=subprocess.PIPE,
                           env=_env(), cwd=tmp_path)
    plan = subprocess.run([str(SCRIPT), "plan", "--json", "-"], stdin=new.stdout,
                          capture_output=True, text=True, env=_env(), cwd=tmp_path, timeout=120)
    assert new.stdout is not None
    new.stdout.close()
    assert new.wait(timeout=120) == 0 and plan.returncode == 0, plan.stderr
    data = json.loads(plan.stdout)
    assert data["source"] == "<stdin>" and data["elements"][0]["shape"] == "hairpin"
    assert list(tmp_path.iterdir()) == []  # no file named "-"


def test_a_closed_pipe_is_not_an_error_message():
    """`fabplan plan --json x.toml | head -c 10`: the reader goes away early; no
    traceback and no error line (the plan's JSON is larger than a pipe's buffer)."""
    root = Path(__file__).resolve().parents[2]
    with subprocess.Popen([str(SCRIPT), "plan", "--json",
                           "examples/club-uhf-folded-dipoles.toml"], stdout=subprocess.PIPE,
                          stderr=subprocess.PIPE, env=_env(), cwd=root) as proc:
        assert proc.stdout is not None and proc.stderr is not None
        assert proc.stdout.read(10) == b'{\n  "forma'
        proc.stdout.close()
        err = proc.stderr.read().decode()
        proc.wait(timeout=120)
    assert "Traceback" not in err and "error" not in err and "Exception" not in err, err


def test_bash_completion_script(tmp_path):
    """The README's `eval "$(_FABPLAN_COMPLETE=bash_source fabplan)"` gives a bash
    function that completes with fabplan's own choices."""
    source = subprocess.run([str(SCRIPT)], capture_output=True, text=True, timeout=120,
                            env=_env(_FABPLAN_COMPLETE="bash_source"))
    assert source.returncode == 0
    assert "complete " in source.stdout and "_FABPLAN_COMPLETE=bash_complete" in source.stdout
    done = subprocess.run([str(SCRIPT)], capture_output=True, text=True, timeout=120,
                          env=_env(_FABPLAN_COMPLETE="bash_complete",
                                   COMP_WORDS="fabplan sheet x.toml --paper ", COMP_CWORD="4"))
    assert done.stdout.split() == ["plain,a4", "plain,letter"]


def test_import_and_help_stay_light():
    """`import fabplan` and `fabplan --help` load no numpy, reportlab, ezdxf or shapely,
    and none of the standard library's slower modules a command needs only when it
    runs (issue 16: --help within 1.5x of `import click`; benchmarks/startup.py)."""
    code = ("import io, sys, fabplan, fabplan.cli\n"
            "sys.argv, sys.stdout = ['fabplan', '--help'], io.StringIO()\n"
            "try:\n"
            "    fabplan.cli.main()\n"
            "except SystemExit as e:\n"
            "    assert e.code == 0 and 'Usage: fabplan' in sys.stdout.getvalue()\n"
            "sys.stdout = sys.__stdout__\n"
            "heavy = sorted(m for m in sys.modules if m.split('.')[0] in "
            "{'numpy', 'scipy', 'reportlab', 'ezdxf', 'shapely', 'tomlkit', 'logging', "
            "'decimal', 'fractions', 'tempfile', 'difflib'} or m in "
            "{'importlib.resources', 'fabplan.design', 'fabplan.units', 'fabplan.section'})\n"
            "print(','.join(heavy))\n")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         check=True).stdout.strip()
    assert out == ""
