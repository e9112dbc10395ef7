"""Shared fixtures. Tests write only into tmp_path."""

from __future__ import annotations

import contextlib
import os
import subprocess
import sys
from dataclasses import dataclass
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
EXAMPLE = ROOT / "examples" / "club-uhf-folded-dipoles.toml"


@pytest.fixture
def example_path() -> Path:
    return EXAMPLE


@dataclass(frozen=True)
class CliRun:
    """What one run of the command line gave: exit code, standard output and error apart."""

    returncode: int
    stdout: str
    stderr: str
    stdout_bytes: bytes


@pytest.fixture
def cli():
    """Run the command line in this process (click's CliRunner: fast, no interpreter
    start-up); returns a CliRun. `input` is standard input (text or bytes). An
    exception the command does not turn into an exit status fails the test with
    its traceback. Use `run_cli` for the few tests of the installed entry point."""
    from click.testing import CliRunner

    from fabplan.cli import main

    def run(*args: object, input: str | bytes | None = None, cwd: Path | None = None,
            check_exit: int | None = None) -> CliRun:
        runner = CliRunner()
        with contextlib.chdir(cwd or ROOT):
            result = runner.invoke(main, [str(a) for a in args], input=input,
                                   prog_name="fabplan", catch_exceptions=False)
        out = CliRun(result.exit_code, result.stdout, result.stderr, result.stdout_bytes)
        if check_exit is not None and out.returncode != check_exit:
            raise AssertionError(f"exit {out.returncode}, expected {check_exit}\n"
                                 f"stdout:\n{out.stdout}\nstderr:\n{out.stderr}")
        return out

    return run


@pytest.fixture
def run_cli():
    """Run the installed command line in a subprocess; returns CompletedProcess.
    Slow (an interpreter start-up and every import per run): for the smoke tests
    of the entry point, exit codes and start-up cost; use `cli` otherwise."""

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


# one folded dipole with a short electrical sweep (a quick plan with every stage)
SWEPT_FOLDED_DIPOLE_TOML = """
[project]
name = "one folded dipole"
[stock]
catalogue = "acr-1/4"
[[element]]
name = "fd"
shape = "folded-dipole"
side = "11 1/2 in"
centre_spacing = "1 1/4 in"
feed_gap = "1/2 in"
[electrical]
target = "440 MHz"
sweep = { from = "420 MHz", to = "460 MHz", step = "10 MHz" }
"""


@pytest.fixture
def swept_folded_dipole_toml() -> str:
    return SWEPT_FOLDED_DIPOLE_TOML


@pytest.fixture
def folded_dipole_toml():
    def make(d="4 mm", side="900 mm", spacing="50 mm", gap="12 mm", trim="0 mm") -> str:
        return FOLDED_DIPOLE_TOML.format(d=d, side=side, spacing=spacing, gap=gap, trim=trim)

    return make


class _EmWires:
    """Straight-wire test geometries for the method-of-moments solver (mm)."""

    @staticmethod
    def dipole_nodes(length: float, gap: float, h: float, axis: int = 2,
                     split_gap: bool = False):
        """Nodes of a centre-fed straight dipole: the gap (one segment, or two halves
        when split_gap) in the middle, segments growing by 1.6 up to h towards the
        ends. Returns (nodes (N, 3), source segment indices)."""
        import numpy as np

        half = [gap / 2]
        s = gap
        while half[-1] < length / 2 - 1e-9:
            s = min(1.6 * s, h)
            rest = length / 2 - half[-1]
            if rest < 1.5 * s:
                if rest > s:
                    half.append(half[-1] + rest / 2)
                half.append(length / 2)
                break
            half.append(half[-1] + s)
        side = np.array(half)
        if split_gap:
            z = np.concatenate([-side[::-1], [0.0], side])
            src = [len(side) - 1, len(side)]
        else:
            z = np.concatenate([-side[::-1], side])
            src = [len(side) - 1]
        nodes = np.zeros((len(z), 3))
        nodes[:, axis] = z
        return nodes, src

    @staticmethod
    def circle_nodes(radius: float, n: int):
        """n nodes of a regular polygon whose perimeter equals the circle's, in z = 0."""
        import math

        import numpy as np

        r = radius * (math.pi / n) / math.sin(math.pi / n)
        phi = np.arange(n) * 2 * math.pi / n
        return np.stack([r * np.cos(phi), r * np.sin(phi), np.zeros(n)], axis=1)


@pytest.fixture
def em_wires():
    return _EmWires


LOOP_EXAMPLE = ROOT / "examples" / "portable-20m-loop.toml"
QFH_EXAMPLE = ROOT / "examples" / "weather-satellite-qfh.toml"


@pytest.fixture(scope="session")
def loop_example_plan():
    """The capacitor-tuned loop example's Plan, made once per session (read only)."""
    from fabplan.design.read import load_design
    from fabplan.plan import make_plan

    return make_plan(load_design(LOOP_EXAMPLE))


@pytest.fixture
def qfh_example_path() -> Path:
    return QFH_EXAMPLE


@pytest.fixture(scope="session")
def qfh_example_plan():
    """The quadrifilar helix example's Plan, made once per session (read only)."""
    from fabplan.design.read import load_design
    from fabplan.plan import make_plan

    return make_plan(load_design(QFH_EXAMPLE))


@pytest.fixture(scope="session")
def example_builds(tmp_path_factory):
    """`fabplan build` of the loop and the helix examples, once per session: {name: (the
    completed process, the output folder)}."""
    from click.testing import CliRunner

    from fabplan.cli import main

    out = {}
    for name, path in (("loop", LOOP_EXAMPLE), ("qfh", QFH_EXAMPLE)):
        folder = tmp_path_factory.mktemp(f"build-{name}") / "out"
        result = CliRunner().invoke(main, ["build", str(path), "-o", str(folder)],
                                    prog_name="fabplan", catch_exceptions=False)
        out[name] = (CliRun(result.exit_code, result.stdout, result.stderr,
                            result.stdout_bytes), folder)
    return out


@pytest.fixture(scope="session")
def example_plan():
    """The bundled example's Plan, made once per test session (read only)."""
    from fabplan.design.read import load_design
    from fabplan.plan import make_plan

    return make_plan(load_design(EXAMPLE))


@pytest.fixture(scope="session")
def paper_pt():
    """Paper sizes in PDF points (1 in = 25.4 mm = 72 pt), portrait (width, height)."""
    return {
        "a4": (595.276, 841.89),  # source: ISO 216, A4 = 210 x 297 mm
        "letter": (612.0, 792.0),  # source: ANSI/ASME Y14.1, Letter = 8.5 x 11 in
    }


@pytest.fixture
def plan_of():
    """Make the Plan of a design given as TOML text."""

    def make(text: str):
        from fabplan.design.read import parse_design
        from fabplan.plan import make_plan

        return make_plan(parse_design(text))

    return make


# -- two made-up designs for the jig and its drawings ------------------------------------
LONG_DIPOLE = """
[project]
name = "long folded dipole"

[stock]
diameter = "4 mm"
material = "cu-c11000-annealed"

[shop]
units = "mm"

[[element]]
name = "fd"
shape = "folded-dipole"
side = "900 mm"
spacing = "50 mm"
feed_gap = "12 mm"
"""

HELIX = """
[project]
name = "helix test"

[stock]
gauge = "AWG 10"
material = "cu-c11000-annealed"

[shop]
units = "mm"

[[element]]
name = "coil"
shape = "helix"
turns = 5
diameter = "40 mm"
pitch = "12 mm"
lead_in = "20 mm"
lead_out = "20 mm"
"""


@pytest.fixture(scope="session")
def long_plan():
    """A folded dipole too long for a 600 x 400 mm bed (the plate must be split)."""
    from fabplan.design.read import parse_design
    from fabplan.plan import make_plan

    return make_plan(parse_design(LONG_DIPOLE))


@pytest.fixture(scope="session")
def helix_plan():
    from fabplan.design.read import parse_design
    from fabplan.plan import make_plan

    return make_plan(parse_design(HELIX))


# issue 15's case: a 520 mm square loop of 1/2 in aluminium tube, whose plate is
# larger than the default 600 x 400 mm bed both ways
SQUARE_LOOP = """
[project]
name = "square loop"

[stock]
catalogue = "al-1/2x0.058"

[shop]
units = "mm"

[[element]]
name = "loop"
shape = "rect-loop"
side = "520 mm"
corner_radius = "75 mm"
feed_gap = "20 mm"
"""


@pytest.fixture(scope="session")
def square_loop_plan():
    """A 520 mm square loop of 1/2 x 0.058 in aluminium tube (issue 15)."""
    from fabplan.design.read import parse_design
    from fabplan.plan import make_plan

    return make_plan(parse_design(SQUARE_LOOP))


# -- reading the jig's DXF back with ezdxf -----------------------------------------------
def _read_dxf(data: bytes):
    """An ezdxf document from DXF bytes (ezdxf's reader: an independent check)."""
    import io

    import ezdxf

    return ezdxf.read(io.StringIO(data.decode("utf-8")))


def _datum_transform(msp):
    import numpy

    """(origin, unit x, unit y) of the element frame, from the two reference
    POINTs the plate carries (the datum first, then the point 10 units along +x)."""
    pts = [numpy.array([p.dxf.location.x, p.dxf.location.y]) for p in msp.query("POINT")]
    origin, xpt = pts[0], pts[1]
    ux = (xpt - origin) / numpy.linalg.norm(xpt - origin)
    return origin, ux, numpy.array([-ux[1], ux[0]])


def _to_bed(frame, p, scale: float = 1.0):
    origin, ux, uy = frame
    return origin + (p[0] * ux + p[1] * uy) * scale


@pytest.fixture(scope="session")
def read_dxf():
    return _read_dxf


@pytest.fixture(scope="session")
def datum_transform():
    return _datum_transform


@pytest.fixture(scope="session")
def to_bed():
    return _to_bed


# -- a priced hairpin for the estimate ------------------------------------------------------
HAIRPIN = """
[project]
name = "estimate test"

[stock]
{stock}

[shop]
units = "mm"
kerf = "{kerf}"
trim = "{trim}"

[[element]]
name = "pin"
shape = "hairpin"
quantity = {quantity}
leg = "{leg}"
spacing = "{spacing}"
"""


def hairpin_design(purchase: str = "", *, stock: str = 'gauge = "AWG 12"\nmaterial = '
                   '"cu-c11000-annealed"', kerf: str = "0 mm", trim: str = "0 mm",
                   quantity: int = 1, leg: str = "100 mm", spacing: str = "20 mm") -> str:
    return HAIRPIN.format(stock=stock, kerf=kerf, trim=trim, quantity=quantity,
                          leg=leg, spacing=spacing) + purchase


@pytest.fixture
def hairpin():
    """A hairpin design's text, with [purchase] tables and stock of your choosing."""
    return hairpin_design


# -- the templates' optional tables --------------------------------------------------------
def _uncomment_optional_tables(text: str) -> str:
    """A template with its commented optional tables switched on: from each line
    that starts with "# [" (a commented table header) to the next line that is
    not a comment, "# X" becomes "X" and any other comment line is dropped.
    Lines outside those blocks (alternatives of required keys) stay as they are."""
    import re

    out: list[str] = []
    block = False
    for line in text.splitlines():
        if re.match(r"# \[", line):
            block = True
        if block and line.startswith("#"):
            out.append(line[2:] if line.startswith("# ") else "")
            continue
        block = False
        out.append(line)
    return "\n".join(out) + "\n"


@pytest.fixture(scope="session")
def uncomment_template():
    return _uncomment_optional_tables


# -- beams on a boom ---------------------------------------------------------------------
BEAM_EXAMPLE = ROOT / "examples" / "field-day-2m-beam.toml"


@pytest.fixture
def beam_example_path() -> Path:
    return BEAM_EXAMPLE


@pytest.fixture(scope="session")
def beam_plan():
    """The 2 m beam example's Plan, made once per test session (read only)."""
    from fabplan.design.read import load_design
    from fabplan.plan import make_plan

    return make_plan(load_design(BEAM_EXAMPLE))


BEAM_TOML = """
[project]
name = "test beam"
[stock]
catalogue = "al-rod-1/4"
[shop]
units = "mm"
[boom]
{boom}
length = "{boom_length}"
mounting = "{mounting}"
frequency = "{frequency}"
{elements}
"""


@pytest.fixture
def beam_toml():
    """A beam design's text: the [boom] stock keys, its length, mounting and the
    correction's frequency, and the elements' tables (TOML text)."""

    def make(elements: str, boom: str = 'square = { side = "1 in", wall = "1/16 in" }\n'
             'material = "al-6063-t5"', boom_length: str = "1000 mm",
             mounting: str = "insulated", frequency: str = "145 MHz") -> str:
        return BEAM_TOML.format(boom=boom, boom_length=boom_length, mounting=mounting,
                                frequency=frequency, elements=elements)

    return make
