"""`fabplan jig`: full-size jig drawings (DXF and SVG), one file per machine bed.

`write_jig_files(plan, settings, out_dir, formats, force)` does the same work
as a function (the build command calls it); it lives in
`fabplan.render.jigfiles` and is re-exported here. shapely and ezdxf load
inside the functions.
"""

from __future__ import annotations

from pathlib import Path

import click

from .base import EXIT_FINDINGS, design_argument, guarded, load_plan
from ..render.jigfiles import FORMATS, parse_formats, write_jig, write_jig_files

__all__ = ["COMMANDS", "FORMATS", "write_jig_files", "jig"]


@click.command("jig")
@design_argument
@click.option("-o", "--output", "out_dir", required=True,
              type=click.Path(file_okay=False, path_type=Path),
              help="Folder for the drawings (made if missing).")
@click.option("--format", "fmt", default="dxf,svg", show_default=True,
              help="Comma-separated: dxf, svg.")
@click.option("--bed", help='Machine bed WIDTHxHEIGHT with a unit, e.g. "600x400mm", "24x18in".')
@click.option("--kerf", help='Cut width, e.g. "0.2 mm" (outlines grow, holes shrink by half).')
@click.option("--units", help="Drawing unit of the DXF: mm or in.")
@click.option("--force", is_flag=True, help="Replace existing files.")
@guarded
def jig(design: Path, out_dir: Path, fmt: str, bed: str | None, kerf: str | None,
        units: str | None, force: bool) -> None:
    """Write full-size jig drawings (DXF, SVG), one file per machine bed."""
    from ..jig.settings import JigSettings, with_options

    formats = parse_formats(fmt)
    with_options(JigSettings(), bed=bed, kerf=kerf, units=units)  # bad options fail first
    plan = load_plan(design)
    settings = with_options(plan.design.jig or JigSettings(), bed=bed, kerf=kerf, units=units)
    layout, paths = write_jig(plan, settings, out_dir, formats, force)
    for p in paths:
        click.echo(f"wrote {p}")
    for f in layout.findings:
        click.echo(f"{f.severity}: [{f.code}] {f.element + ': ' if f.element else ''}"
                   f"{f.message}")
    if any(f.severity == "error" for f in layout.findings):
        raise SystemExit(EXIT_FINDINGS)


COMMANDS = [jig]
