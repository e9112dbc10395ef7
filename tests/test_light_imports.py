"""What each light module, and planning itself, must not load (issue 16: start-up near
the import floor; benchmarks/startup.py measures the time, these guard the cause).
Each case runs in a fresh interpreter and prints the forbidden modules it finds."""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
EXAMPLE = ROOT / "examples" / "club-uhf-folded-dipoles.toml"

_PLAN_EXAMPLE = ("import contextlib, io\n"
                 "from fabplan.cli import main\n"
                 "with contextlib.redirect_stdout(io.StringIO()), "
                 "contextlib.suppress(SystemExit):\n"
                 f"    main(['plan', {str(EXAMPLE)!r}])\n")


@pytest.mark.parametrize(("code", "forbidden"), [
    # the numeric helpers stand in for scipy.optimize, scipy.interpolate, scipy.spatial
    ("import fabplan.numeric", ("scipy",)),
    # the special functions stand in for scipy.special in the electrical model
    ("import fabplan.special, fabplan.em.loss, fabplan.em.kernel", ("scipy",)),
    # reading a measurement: no plotting, drawing or network libraries
    ("import fabplan.measure", ("scipy", "skrf", "pandas", "reportlab", "shapely", "ezdxf")),
    # a whole plan of the bundled example, electrical check included
    (_PLAN_EXAMPLE, ("scipy", "reportlab", "ezdxf", "tomlkit")),
], ids=["numeric", "special", "measure", "plan-of-the-example"])
def test_module_loads_nothing_heavy(code, forbidden):
    probe = (f"{code}\nimport sys\n"
             f"print(sorted({{m.split('.')[0] for m in sys.modules}} & {set(forbidden)!r}))")
    out = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True,
                         check=True, cwd=ROOT)
    assert out.stdout.strip().splitlines()[-1] == "[]"
