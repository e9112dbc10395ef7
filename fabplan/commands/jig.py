"""`fabplan jig`: full-size jig drawings (DXF and SVG), one file per machine bed.

The jig is a stage of the Plan: the command-line options change the design's
`[jig]` settings before the plan is made, so `check`, `plan`, `build` and
`jig` report the same findings. shapely and ezdxf load inside the functions.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

import click

from ..choices import DRAWING_UNITS
from ..errors import FabplanError
from .base import (
    design_argument,
    guarded,
    is_dash,
    load_design_file,
    quiet,
    refuse_errors,
    with_errors_option,
    wrote,
)

__all__ = ["COMMANDS", "jig", "FormatList"]

JIG_FORMATS = ("dxf", "svg")  # the formats fabplan.render.jig writes


class FormatList(click.Choice[str]):
    """A comma-separated list of formats; help and completion list the choices."""

    def __init__(self, formats: tuple[str, ...]) -> None:
        self.formats = formats
        super().__init__((*formats, ",".join(formats)), case_sensitive=False)

    def convert(self, value: Any, param: click.Parameter | None,
                ctx: click.Context | None) -> str:
        parts = [p.strip().lower() for p in str(value).split(",")]
        if not parts or any(p not in self.formats for p in parts):
            self.fail(f"{value!r} is not a comma-separated list of "
                      f"{', '.join(self.formats)}", param, ctx)
        return ",".join(dict.fromkeys(parts))


@click.command("jig")
@design_argument
@click.option("-o", "--output", "out_dir", required=True,
              type=click.Path(file_okay=False, path_type=Path),
              help="Folder for the drawings (made if missing).")
@click.option("--format", "fmt", default="dxf,svg", show_default=True,
              type=FormatList(JIG_FORMATS), help="The formats to write, comma-separated.")
@click.option("--bed", help='Machine bed WIDTHxHEIGHT with a unit, e.g. "600x400mm", "24x18in".')
@click.option("--kerf", help='Cut width, e.g. "0.2 mm" (outlines grow, holes shrink by half).')
@click.option("--units", type=click.Choice(DRAWING_UNITS), help="Drawing unit of the DXF.")
@click.option("--force", is_flag=True, help="Replace existing files.")
@with_errors_option
@guarded
def jig(design: Path, out_dir: Path, fmt: str, bed: str | None, kerf: str | None,
        units: str | None, force: bool, with_errors: bool) -> None:
    """Write full-size jig drawings (DXF, SVG), one file per machine bed."""
    import dataclasses
    import sys

    from ..design.jig import JigSettings, with_options
    from ..plan import make_plan
    from ..render.files import write_set
    from ..render.jig import jig_files, parse_formats

    if is_dash(out_dir):
        raise FabplanError("the jig is a set of files: give a folder, not standard output",
                           field="--output", value="-")

    formats = parse_formats(fmt)
    with_options(JigSettings(), bed=bed, kerf=kerf, units=units)  # bad options fail first
    d = load_design_file(design)
    settings = with_options(d.jig or JigSettings(), bed=bed, kerf=kerf, units=units)
    plan = make_plan(dataclasses.replace(d, jig=settings))
    refuse_errors(plan, with_errors)
    for p in write_set(out_dir, jig_files(plan, formats), force):
        wrote(p)
    for f in plan.jig.findings if plan.jig is not None else ():
        if f.severity == "warning" or (f.severity == "info" and not quiet()):
            click.echo(f"{f.severity}: [{f.code}] {f.element + ': ' if f.element else ''}"
                       f"{f.message}", err=True)
    if plan.has_errors:
        sys.exit(1)


COMMANDS = [jig]
