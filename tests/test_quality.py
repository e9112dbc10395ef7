"""The code itself: the import layers hold and ruff is clean.

The layers are the contract in pyproject.toml ([tool.importlinter]): a renderer may read
the Plan, a stage may not import a renderer, and so on; the test fails on the first import
that crosses a layer the wrong way. mypy (strict on the core) runs in the README's test
command before the tests (a static check of about 10 s of processor time; the test
below makes sure the command keeps it).
"""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
BIN = Path(sys.executable).parent


def _run(*cmd: str) -> subprocess.CompletedProcess[str]:
    return subprocess.run(cmd, capture_output=True, text=True, cwd=ROOT, timeout=600)


def test_import_layers_hold():
    proc = _run(str(BIN / "lint-imports"))
    assert proc.returncode == 0, proc.stdout + proc.stderr


def test_a_stage_importing_a_renderer_breaks_the_layers(tmp_path):
    """The contract is live: a deliberate import from render/ into a stage fails it."""
    import shutil

    copy = tmp_path / "src"
    shutil.copytree(ROOT / "fabplan", copy / "fabplan")
    shutil.copy(ROOT / "pyproject.toml", copy / "pyproject.toml")
    stage = copy / "fabplan" / "forming" / "stage.py"
    stage.write_text(stage.read_text(encoding="utf-8")
                     + "\nfrom ..render.text import table  # noqa: E402,F401\n",
                     encoding="utf-8")
    proc = subprocess.run([str(BIN / "lint-imports")], capture_output=True, text=True,
                          cwd=copy, timeout=600, env={"PYTHONPATH": str(copy), "PATH": ""})
    assert proc.returncode != 0
    assert "fabplan.forming.stage -> fabplan.render.text" in proc.stdout


def test_the_test_command_runs_mypy_on_the_package():
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    assert ".venv/bin/mypy && .venv/bin/python -m pytest" in text
    config = (ROOT / "pyproject.toml").read_text(encoding="utf-8")
    assert 'files = ["fabplan"]' in config


def test_ruff_is_clean():
    proc = _run(str(BIN / "ruff"), "check", "fabplan", "tests", "benchmarks")
    assert proc.returncode == 0, proc.stdout[-4000:]
