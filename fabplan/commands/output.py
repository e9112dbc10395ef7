"""`fabplan sheet`, `fabplan template` and `fabplan build`: the printed outputs.

`build` writes everything for one design into a folder, all or nothing: the
plan as JSON, the jig drawings (DXF and SVG), the PDF build sheet, the
full-scale template and, when the electrical check has run, its sweep as CSV
and as a Touchstone .s1p; with --measured SWEEP the sheet compares the first
article with the prediction. A plan with error findings writes nothing unless
--with-errors is given (the outputs then say so). The same design gives the same
bytes.
"""

from __future__ import annotations

import sys
import time
from collections.abc import Callable
from pathlib import Path
from typing import Any

import click

from ..errors import FabplanError
from .base import (
    EXIT_FINDINGS,
    check_output,
    design_argument,
    guarded,
    is_dash,
    load_plan,
    output_path,
    quiet,
    refuse_errors,
    with_errors_option,
    write_one_bytes,
    wrote,
)
from .measure import PREDICTED_NAME, measured_option, measurement_for_build, predicted_files

__all__ = ["COMMANDS", "sheet", "template", "build", "build_files", "BUILD_NAMES"]

SHEET_PAPER_CHOICES = ("a4", "letter")
TEMPLATE_PAPER_CHOICES = ("a4", "letter", "roll-610mm", "roll-914mm")
# the paper when --paper is not given: Letter for a shop in inches, A4 for millimetres
PAPER_HELP = "Default: letter for a shop in inches, a4 for millimetres ([shop] units)."
BUILD_NAMES = {
    "plan": "plan.json",
    "sheet": "build-sheet.pdf",
    "template": "template-1to1.pdf",
    "sweep": "sweep.csv",
    "predicted": PREDICTED_NAME,  # the predicted sweep, to overlay in an analyser's software
    "drilling": "drilling-1to1.pdf",
}


class _Progress:
    """Progress lines on stderr, once the work has taken more than a moment (never
    with -q)."""

    def __init__(self, after_s: float = 0.4) -> None:
        self.start = time.perf_counter()
        self.after = after_s
        self.shown = False

    def __call__(self, what: str) -> None:
        if quiet():
            return
        if self.shown or time.perf_counter() - self.start > self.after:
            self.shown = True
            click.echo(f"fabplan: {what}", err=True)


def _write_pdf(design: Path, output: Path, paper: str | None, force: bool, with_errors: bool,
               render: Callable[[Any, str | None], bytes]) -> None:
    """Check the target, plan, render(plan, paper) and write atomically (or to
    standard output for `-`)."""
    if not is_dash(output) and output.is_dir():
        raise FabplanError("is a folder: give a file name ending in .pdf", field="--output",
                           value=str(output))
    check_output(output, force)
    plan = load_plan(design)
    refuse_errors(plan, with_errors)
    write_one_bytes(output, render(plan, paper), force)
    if plan.has_errors:
        sys.exit(EXIT_FINDINGS)


@click.command()
@design_argument
@output_path("The PDF file to write", required=True)
@click.option("--paper", default=None,
              type=click.Choice(SHEET_PAPER_CHOICES, case_sensitive=False),
              help=f"Paper size. {PAPER_HELP}")
@click.option("--force", is_flag=True, help="Replace an existing file.")
@with_errors_option
@guarded
def sheet(design: Path, output: Path, paper: str | None, force: bool,
          with_errors: bool) -> None:
    """Write the PDF build sheet: cut list, marks, bends, drawing, order, safety."""
    from ..render.sheet import sheet_pdf

    _write_pdf(design, output, paper and paper.lower(), force, with_errors, sheet_pdf)


@click.command()
@design_argument
@output_path("The PDF file to write", required=True)
@click.option("--paper", default=None,
              type=click.Choice(TEMPLATE_PAPER_CHOICES, case_sensitive=False),
              help=f"Paper: tiles on a4/letter, or one page on a print shop's roll. "
                   f"{PAPER_HELP}")
@click.option("--force", is_flag=True, help="Replace an existing file.")
@with_errors_option
@guarded
def template(design: Path, output: Path, paper: str | None, force: bool,
             with_errors: bool) -> None:
    """Write the full-scale (1:1) template to print at actual size and mark from."""
    from ..render.fullscale import template_pdf
    from ..render.sheet import default_paper

    def render(plan: Any, chosen: str | None) -> bytes:
        return template_pdf(plan, chosen or default_paper(plan.design.shop.units))

    _write_pdf(design, output, paper and paper.lower(), force, with_errors, render)


def build_files(plan: Any, paper: str | None = None, template_paper: str | None = None,
                progress: Callable[[str], None] | None = None,
                measurement: Any = None) -> dict[str, bytes]:
    """Every output of `plan` as {file name: bytes} (nothing written). Without a
    paper, the shop's default (Letter for inches, A4 for millimetres). With
    `measurement` (fabplan.measuring.Measurement) the sheet compares it."""
    from ..render.csv import plan_sweep_csv
    from ..render.fullscale import template_pdf
    from ..render.jig import jig_files
    from ..render.json import plan_to_json
    from ..render.sheet import default_paper, sheet_pdf

    progress = progress or (lambda what: None)
    files: dict[str, bytes] = dict(jig_files(plan))
    sweep = plan_sweep_csv(plan)
    if sweep is not None:
        files[BUILD_NAMES["sweep"]] = sweep.encode("utf-8")
    files.update(predicted_files(plan))
    files[BUILD_NAMES["plan"]] = plan_to_json(plan).encode("utf-8")
    progress("drawing the build sheet")
    files[BUILD_NAMES["sheet"]] = sheet_pdf(plan, paper, measurement)
    progress("drawing the full-scale template")
    files[BUILD_NAMES["template"]] = template_pdf(
        plan, template_paper or paper or default_paper(plan.design.shop.units))
    if plan.drilling:
        from ..render.wrap import drilling_pdf

        progress("drawing the wrap-around drilling templates")
        files[BUILD_NAMES["drilling"]] = drilling_pdf(
            plan, template_paper or paper or default_paper(plan.design.shop.units))
    return files


@click.command()
@design_argument
@click.option("-o", "--output", required=True,
              type=click.Path(path_type=Path),
              help="The folder to write into (made if missing).")
@click.option("--paper", default=None,
              type=click.Choice(SHEET_PAPER_CHOICES, case_sensitive=False),
              help=f"Paper for the build sheet and the template tiles. {PAPER_HELP}")
@click.option("--template-paper", default=None,
              type=click.Choice(TEMPLATE_PAPER_CHOICES, case_sensitive=False),
              help="Paper for the template, if not --paper (e.g. a print shop's roll).")
@click.option("--force", is_flag=True, help="Replace existing files.")
@with_errors_option
@measured_option
@guarded
def build(design: Path, output: Path, paper: str | None, template_paper: str | None,
          force: bool, with_errors: bool, measured: str | None, **reading: Any) -> None:
    """Write everything: plan.json, jig DXF/SVG, build sheet, 1:1 template, sweep CSV,
    predicted .s1p, and the wrap-around drilling templates when there are holes to drill;
    with --measured, the sheet compares the first article."""
    from ..render.files import check_writable, write_set

    if is_dash(output):
        raise FabplanError("a build is a set of files: give a folder, not standard output",
                           field="--output", value="-")
    if output.exists() and not output.is_dir():
        raise FabplanError("is a file, not a folder", field="--output", value=str(output))
    if output.is_dir():
        for name in (BUILD_NAMES["plan"], BUILD_NAMES["sheet"], BUILD_NAMES["template"]):
            check_writable(output / name, force, "--output")
    progress = _Progress()
    plan = load_plan(design)
    refuse_errors(plan, with_errors)
    measurement = measurement_for_build(plan, measured, reading)
    files = build_files(plan, paper and paper.lower(),
                        template_paper and template_paper.lower(), progress, measurement)
    progress(f"writing {len(files)} files into {output}")
    for p in write_set(output, files, force):
        wrote(p)
    if plan.has_errors:
        sys.exit(EXIT_FINDINGS)


COMMANDS = [sheet, template, build]
