"""Fixtures for the jig tests: real plans (forming stage included) of the
example and of two made-up designs, and readers for the drawings."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from fabplan.design.read import load_design, parse_design
from fabplan.plan import make_plan

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "examples" / "club-uhf-folded-dipoles.toml"

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


def with_forming(plan):
    """The plan, checked to carry the forming stage's figures (the jig's input)."""
    missing = [e.name for e in plan.elements if e.piece.forming is None]
    if missing:
        raise AssertionError(f"no forming figures for {missing}: is the forming step registered?")
    return plan


@pytest.fixture(scope="session")
def example_plan():
    return with_forming(make_plan(load_design(EXAMPLE)))


@pytest.fixture(scope="session")
def long_plan():
    """A folded dipole too long for a 600 x 400 mm bed (the plate must be split)."""
    return with_forming(make_plan(parse_design(LONG_DIPOLE)))


@pytest.fixture(scope="session")
def helix_plan():
    return with_forming(make_plan(parse_design(HELIX)))


def _read_dxf(data: bytes):
    """An ezdxf document from DXF bytes (ezdxf's reader: an independent check)."""
    import io

    import ezdxf

    return ezdxf.read(io.StringIO(data.decode("utf-8")))


def _datum_transform(msp):
    """(origin, unit x, unit y) of the element frame, from the two reference
    POINTs the plate carries (the datum first, then the point 10 units along +x)."""
    pts = [np.array([p.dxf.location.x, p.dxf.location.y]) for p in msp.query("POINT")]
    origin, xpt = pts[0], pts[1]
    ux = (xpt - origin) / np.linalg.norm(xpt - origin)
    return origin, ux, np.array([-ux[1], ux[0]])


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


@pytest.fixture
def plan_from_toml():
    def make(text: str):
        return with_forming(make_plan(parse_design(text)))

    return make
