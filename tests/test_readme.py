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
