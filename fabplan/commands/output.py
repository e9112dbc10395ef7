"""`fabplan sheet`, `fabplan template` and `fabplan build`: the printed outputs.

`build` writes everything for one design into a folder: the plan as JSON, the
jig drawings (DXF and SVG), the PDF build sheet, the full-scale template and,
when the electrical check has run, its sweep as CSV. Every target path is
checked before anything is written; each file is written atomically; the same
design gives the same bytes.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

import click

from .base import EXIT_FINDINGS, design_argument, guarded, load_plan
from ..errors import FabplanError

__all__ = ["COMMANDS", "sheet", "template", "build", "build_files"]

SHEET_PAPER_CHOICES = ("a4", "letter")
TEMPLATE_PAPER_CHOICES = ("a4", "letter", "roll-610mm", "roll-914mm")
BUILD_NAMES = {
    "plan": "plan.json",
    "sheet": "build-sheet.pdf",
    "template": "template-1to1.pdf",
    "sweep": "sweep.csv",
}


def _paper(value: str, allowed: tuple[str, ...]) -> str:
    v = value.lower()
    if v not in allowed:
        raise FabplanError(f"unknown paper; use one of {', '.join(allowed)}", field="--paper",
                           value=value)
    return v


class _Progress:
    """Progress lines on stderr, once the work has taken more than a moment."""

    def __init__(self, after_s: float = 0.4) -> None:
        self.start = time.perf_counter()
        self.after = after_s
        self.shown = False

    def __call__(self, what: str) -> None:
        if self.shown or time.perf_counter() - self.start > self.after:
            self.shown = True
            click.echo(f"fabplan: {what}", err=True)


def _findings_exit(plan) -> None:
    errors = sum(f.severity == "error" for f in plan.findings)
    if errors:
        click.echo(f"fabplan: {errors} error finding(s): not buildable as it stands; "
                   "see the Findings section", err=True)
        sys.exit(EXIT_FINDINGS)


def _write_pdf(design: Path, output: Path, paper: str, force: bool, render) -> None:
    """Check the target, plan, render(plan, paper) and write atomically."""
    from ..render.files import check_writable, write_bytes

    if output.is_dir():
        raise FabplanError("is a folder: give a file name ending in .pdf", field="--output",
                           value=str(output))
    check_writable(output, force)
    plan = load_plan(design)
    write_bytes(output, render(plan, paper), force)
    click.echo(f"wrote {output}")
    _findings_exit(plan)




@click.command()
@design_argument
@click.option("-o", "--output", required=True, type=click.Path(path_type=Path),
              help="The PDF file to write.")
@click.option("--paper", default="a4", show_default=True, metavar="a4|letter", help="Paper size.")
@click.option("--force", is_flag=True, help="Replace an existing file.")
@guarded
def sheet(design: Path, output: Path, paper: str, force: bool) -> None:
    """Write the PDF build sheet: cut list, marks, bends, drawing, order, safety."""
    from ..render.sheet import sheet_pdf

    _write_pdf(design, output, _paper(paper, SHEET_PAPER_CHOICES), force, sheet_pdf)


@click.command()
@design_argument
@click.option("-o", "--output", required=True, type=click.Path(path_type=Path),
              help="The PDF file to write.")
@click.option("--paper", default="a4", show_default=True,
              metavar="a4|letter|roll-610mm|roll-914mm",
              help="Paper: tiles on a4/letter, or one page on a print shop's roll.")
@click.option("--force", is_flag=True, help="Replace an existing file.")
@guarded
def template(design: Path, output: Path, paper: str, force: bool) -> None:
    """Write the full-scale (1:1) template to print at actual size and mark from."""
    from ..render.fullscale import template_pdf

    _write_pdf(design, output, _paper(paper, TEMPLATE_PAPER_CHOICES), force, template_pdf)


def _sweep_csv(plan) -> str | None:
    """Each element's sweep as CSV (the columns of `fabplan sweep --csv`: Hz, ohm,
    SWR), or None when the electrical check has not run."""
    import csv
    import io

    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(["element", "f_hz", "r_ohm", "x_ohm", "swr_terminals", "swr_system"])
    n = 0
    for e in plan.elements:
        if e.electrical is None:
            continue
        sw = e.electrical.sweep
        for f, z, s_t, s_s in zip(sw.freq_hz, sw.z_ohm, sw.swr_terminals, sw.swr_system):
            w.writerow([e.name, f"{f:.1f}", f"{z.real:.4f}", f"{z.imag:.4f}", f"{s_t:.5f}",
                        f"{s_s:.5f}"])
            n += 1
    return buf.getvalue() if n else None


def _jig_files(plan) -> dict[str, bytes]:
    """The jig stage's drawings {file name: bytes}, once that stage exists."""
    import importlib.util

    if importlib.util.find_spec("fabplan.render.jigfiles") is None:
        return {}
    from ..jig.settings import JigSettings
    from ..render.jigfiles import jig_layout_files

    settings = plan.design.jig if plan.design.jig is not None else JigSettings()
    return jig_layout_files(plan, settings, ("dxf", "svg"))[1]


def build_files(design: Path, out_dir: Path, paper: str = "a4", template_paper: str | None = None,
                force: bool = False, progress=None) -> tuple[list[Path], object]:
    """Write every output of `design` into `out_dir`; returns the paths written
    and the Plan. Every target is checked before anything is written."""
    from ..render.files import check_writable, write_bytes
    from ..render.report import plan_to_json

    progress = progress or (lambda what: None)
    out_dir = Path(out_dir)
    if out_dir.exists() and not out_dir.is_dir():
        raise FabplanError("is a file, not a folder", field="--output", value=str(out_dir))

    def check(names) -> None:
        if out_dir.is_dir():
            for name in names:
                check_writable(out_dir / name, force)

    fixed = [BUILD_NAMES["plan"], BUILD_NAMES["sheet"], BUILD_NAMES["template"]]
    check(fixed)
    plan = load_plan(design)
    files: dict[str, bytes] = dict(_jig_files(plan))
    sweep = _sweep_csv(plan)
    if sweep is not None:
        files[BUILD_NAMES["sweep"]] = sweep.encode("utf-8")
    check(files)
    files[BUILD_NAMES["plan"]] = plan_to_json(plan).encode("utf-8")
    from ..render.fullscale import template_pdf
    from ..render.sheet import sheet_pdf

    progress("drawing the build sheet")
    files[BUILD_NAMES["sheet"]] = sheet_pdf(plan, paper)
    progress("drawing the full-scale template")
    files[BUILD_NAMES["template"]] = template_pdf(plan, template_paper or paper)
    out_dir.mkdir(parents=True, exist_ok=True)
    progress(f"writing {len(files)} files into {out_dir}")
    written = [write_bytes(out_dir / name, data, force) for name, data in sorted(files.items())]
    return written, plan


@click.command()
@design_argument
@click.option("-o", "--output", required=True,
              type=click.Path(path_type=Path),
              help="The folder to write into (made if missing).")
@click.option("--paper", default="a4", show_default=True, metavar="a4|letter",
              help="Paper for the build sheet and the template tiles.")
@click.option("--template-paper", default=None, metavar="a4|letter|roll-610mm|roll-914mm",
              help="Paper for the template, if not --paper (e.g. a print shop's roll).")
@click.option("--force", is_flag=True, help="Replace existing files.")
@guarded
def build(design: Path, output: Path, paper: str, template_paper: str | None,
          force: bool) -> None:
    """Write everything: plan.json, jig DXF/SVG, build sheet, 1:1 template, sweep CSV."""
    paper = _paper(paper, SHEET_PAPER_CHOICES)
    if template_paper is not None:
        template_paper = _paper(template_paper, TEMPLATE_PAPER_CHOICES)
    written, plan = build_files(design, output, paper, template_paper, force, _Progress())
    for p in written:
        click.echo(f"wrote {p}")
    _findings_exit(plan)


COMMANDS = [sheet, template, build]
