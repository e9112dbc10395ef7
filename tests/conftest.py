"""Shared fixtures. Tests write only into tmp_path."""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
EXAMPLE = ROOT / "examples" / "club-uhf-folded-dipoles.toml"


@pytest.fixture
def example_path() -> Path:
    return EXAMPLE


@pytest.fixture
def run_cli():
    """Run the installed command line in a subprocess; returns CompletedProcess."""

    def run(*args: str, cwd: Path | None = None, check_exit: int | None = None):
        env = dict(os.environ)
        env.pop("PYTHONWARNINGS", None)
        proc = subprocess.run([sys.executable, "-m", "fabplan", *map(str, args)],
                              capture_output=True, text=True, cwd=cwd or ROOT, env=env,
                              timeout=300)
        if check_exit is not None and proc.returncode != check_exit:
            raise AssertionError(f"exit {proc.returncode}, expected {check_exit}\n"
                                 f"stdout:\n{proc.stdout}\nstderr:\n{proc.stderr}")
        return proc

    return run


@pytest.fixture
def write_design(tmp_path):
    """Write a design file's text into tmp_path and return its path."""

    def write(text: str, name: str = "design.toml") -> Path:
        p = tmp_path / name
        p.write_text(text, encoding="utf-8")
        return p

    return write


FOLDED_DIPOLE_TOML = """
[project]
name = "test folded dipole"

[stock]
diameter = "{d}"
material = "cu-c11000-annealed"

[shop]
units = "mm"
trim = "{trim}"

[[element]]
name = "fd"
shape = "folded-dipole"
side = "{side}"
spacing = "{spacing}"
feed_gap = "{gap}"
"""


@pytest.fixture
def folded_dipole_toml():
    def make(d="4 mm", side="900 mm", spacing="50 mm", gap="12 mm", trim="0 mm") -> str:
        return FOLDED_DIPOLE_TOML.format(d=d, side=side, spacing=spacing, gap=gap, trim=trim)

    return make
