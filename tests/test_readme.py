"""The README's promises: two set-up commands, CI runs the test one exactly."""

from __future__ import annotations

import re
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def _commands() -> list[str]:
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    head = text.split("## Using it")[0]
    return re.findall(r"```sh\n(.+?)\n```", head)


def test_two_commands_and_ci_runs_the_test_one():
    main, tests = _commands()
    assert "fabplan build examples/" in main and "pip install ." in main
    assert "pytest" in tests and ".[test]" in tests
    ci = (ROOT / ".ci" / "run").read_text(encoding="utf-8")
    assert tests in ci.splitlines()


def test_example_named_by_the_main_command_exists():
    main, _ = _commands()
    example = re.search(r"(examples/\S+\.toml)", main).group(1)
    assert (ROOT / example).is_file()


def test_readme_states_the_safety_cautions():
    text = (ROOT / "README.md").read_text(encoding="utf-8").lower()
    for word in ("power line", "rf exposure", "lightning", "ladder", "solder", "cut tube ends",
                 "local electrical", "licensed practice"):
        assert word in text, word


def test_readme_says_how_to_run_and_use_the_command():
    """Issue 15: how to run the installed command after the first set-up command,
    --version, shell completion, the test suite's duration, --with-errors, -q/-v and
    `-` for standard input and output."""
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    head = " ".join(text.split("## Using it")[0].split())
    assert ".venv/bin/fabplan --help" in head and ". .venv/bin/activate" in head
    assert re.search(r"The tests take about \d+ s(econds)? on a two-core machine", head)
    assert re.search(r"about \d+ s of processor time", head)
    for needle in ("fabplan --version", "--with-errors", "fabplan -q COMMAND",
                   "fabplan -v COMMAND", "`-vv`", "fabplan new hairpin -o - | fabplan plan -",
                   "--csv -", "docs/plan-json.md", "130 interrupted"):
        assert needle in text, needle


def test_readme_shell_completion_line_works(tmp_path):
    """The README's bash line, run by bash with the installed command on PATH,
    registers a completion function for `fabplan`."""
    import os
    import shutil
    import subprocess
    import sys

    import pytest

    text = (ROOT / "README.md").read_text(encoding="utf-8")
    line = 'eval "$(_FABPLAN_COMPLETE=bash_source fabplan)"'
    assert line in text
    assert '_FABPLAN_COMPLETE=zsh_source fabplan' in text
    assert '_FABPLAN_COMPLETE=fish_source fabplan | source' in text
    bash = shutil.which("bash")
    if bash is None:  # pragma: no cover - every CI image here has bash
        pytest.fail("bash is needed to check the README's completion line")
    env = {k: v for k, v in os.environ.items() if k != "PYTHONWARNINGS"}
    env["PATH"] = f"{Path(sys.executable).parent}{os.pathsep}{env.get('PATH', '')}"
    proc = subprocess.run([bash, "--norc", "-c", f"{line}\ncomplete -p fabplan"],
                          capture_output=True, text=True, env=env, timeout=120, cwd=tmp_path)
    assert proc.returncode == 0, proc.stderr
    assert proc.stdout.strip().endswith(" fabplan") and "-F _fabplan_completion" in proc.stdout
