"""Writing the jig drawings: every bed as DXF and/or SVG into one folder.

Every target is checked before any is written (nothing replaced without
`force`), and each file goes to a temporary name and is renamed. The same
plan and settings give the same bytes. `fabplan jig` and `fabplan build`
both call `write_jig_files`.
"""

from __future__ import annotations

import re
from pathlib import Path

from ..errors import DesignError

__all__ = ["FORMATS", "parse_formats", "jig_layout_files", "write_jig_files", "write_jig"]

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


def _stem(plan) -> str:
    source = plan.design.source
    base = Path(source).stem if source and not source.startswith("<") else "design"
    return re.sub(r"[^A-Za-z0-9._-]+", "-", base).strip("-") or "design"


def jig_layout_files(plan, settings, formats: tuple[str, ...] = FORMATS):
    """The layout and the {file name: bytes} of every drawing (nothing written)."""
    from ..jig.layout import layout_jig
    from .dxf import bed_to_dxf
    from .svg import bed_to_svg

    layout = layout_jig(plan, settings)
    stem = _stem(plan)
    files: dict[str, bytes] = {}
    for bed in layout.beds:
        if "dxf" in formats:
            files[f"{stem}-jig-{bed.index}.dxf"] = bed_to_dxf(layout, bed)
        if "svg" in formats:
            files[f"{stem}-jig-{bed.index}.svg"] = bed_to_svg(layout, bed)
    return layout, files


def write_jig(plan, settings, out_dir: str | Path, formats=FORMATS, force: bool = False):
    """Write the drawings; returns (layout, written paths)."""
    from .files import check_writable, write_bytes

    if isinstance(formats, str):
        formats = parse_formats(formats)
    out = Path(out_dir)
    if out.exists() and not out.is_dir():
        raise DesignError("is a file, not a folder", field="output folder", value=str(out))
    layout, files = jig_layout_files(plan, settings, tuple(formats))
    out.mkdir(parents=True, exist_ok=True)
    targets = [out / name for name in files]
    for t in targets:
        check_writable(t, force)
    return layout, [write_bytes(t, files[t.name], force) for t in targets]


def write_jig_files(plan, settings, out_dir: str | Path, formats=FORMATS,
                    force: bool = False) -> list[Path]:
    """Write the jig drawings of `plan` into `out_dir`; returns the paths."""
    return write_jig(plan, settings, out_dir, formats, force)[1]
