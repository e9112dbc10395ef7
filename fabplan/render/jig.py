"""The jig drawings of a Plan: every bed as DXF and/or SVG.

The jig itself is the Plan's (`Plan.jig`, laid out by the jig stage); this
module only names the files and asks dxf.py and svg.py for their bytes, with a
status line on every bed when the plan has errors (in the lines each bed keeps
free for it). The same plan gives the same bytes.
"""

from __future__ import annotations

import re
from pathlib import Path

from ..errors import DesignError
from ..plan import Plan

__all__ = ["FORMATS", "parse_formats", "jig_files"]

FORMATS = ("dxf", "svg")


def parse_formats(text: str) -> tuple[str, ...]:
    """"dxf,svg" -> ("dxf", "svg"); each must be a known format."""
    out: list[str] = []
    for part in (p.strip().lower() for p in text.split(",")):
        if part not in FORMATS:
            raise DesignError(f"must be a comma-separated list of {', '.join(FORMATS)}",
                              field="--format", value=text)
        if part not in out:
            out.append(part)
    return tuple(out)


def _stem(plan: Plan) -> str:
    source = plan.design.source
    base = Path(source).stem if source and not source.startswith("<") else "design"
    return re.sub(r"[^A-Za-z0-9._-]+", "-", base).strip("-") or "design"


def jig_files(plan: Plan, formats: tuple[str, ...] = FORMATS) -> dict[str, bytes]:
    """{file name: bytes} of every bed's drawing (nothing written)."""
    from .dxf import bed_to_dxf
    from .svg import bed_to_svg

    layout = plan.jig
    files: dict[str, bytes] = {}
    if layout is None:
        return files
    errors = sum(f.severity == "error" for f in plan.findings)
    status = (f"NOT BUILDABLE AS IT STANDS: the plan has {errors} error finding(s); written on "
              "request (--with-errors)") if errors else ""
    stem = _stem(plan)
    for bed in layout.beds:
        if "dxf" in formats:
            files[f"{stem}-jig-{bed.index}.dxf"] = bed_to_dxf(layout, bed, status)
        if "svg" in formats:
            files[f"{stem}-jig-{bed.index}.svg"] = bed_to_svg(layout, bed, status)
    return files
