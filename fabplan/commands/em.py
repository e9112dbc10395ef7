"""`fabplan sweep` and `fabplan tune`: the electrical check on the command line.

Parses options, calls fabplan.em, prints; no engineering here. Heavy imports
stay inside the command functions.
"""

from __future__ import annotations

import sys
from pathlib import Path

import click

from .base import design_argument, guarded

__all__ = ["COMMANDS", "sweep", "tune"]

PROGRESS_MIN_POINTS = 41  # show a progress bar (on a terminal) from this many solves


def _settings(design):
    from ..errors import DesignError

    if design.electrical is None:
        raise DesignError("the design has no [electrical] table: add one with at least "
                          'target = "..." (see `fabplan new folded-dipole`)',
                          field="electrical", source=design.source)
    return design.electrical


def _core_plan(design):
    """The plan with every stage but the electrical one (which the command runs itself)."""
    import dataclasses

    from ..plan import make_plan

    return make_plan(dataclasses.replace(design, electrical=None))


def _frequency(text: str | None, option: str, default: float | None) -> float | None:
    from ..units import parse_frequency

    return default if text is None else parse_frequency(text, option)


def _csv_text(rows: list[tuple]) -> str:
    import csv
    import io

    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(["element", "f_hz", "r_ohm", "x_ohm", "swr_terminals", "swr_system"])
    for row in rows:
        w.writerow(row)
    return buf.getvalue()


@click.command()
@design_argument
@click.option("--from", "f_from", metavar="FREQ", help='First frequency, e.g. "420 MHz" '
              "(default: the design's sweep, or the target -10 %).")
@click.option("--to", "f_to", metavar="FREQ", help="Last frequency.")
@click.option("--step", "f_step", metavar="FREQ", help='Frequency step, e.g. "0.5 MHz".')
@click.option("--element", "element_name", metavar="NAME", help="Only this element.")
@click.option("--csv", "csv_path", type=click.Path(dir_okay=False, path_type=Path),
              help="Also write every point to this CSV file (Hz, ohm).")
@click.option("--force", is_flag=True, help="Replace an existing CSV file.")
@guarded
def sweep(design: Path, f_from: str | None, f_to: str | None, f_step: str | None,
          element_name: str | None, csv_path: Path | None, force: bool) -> None:
    """Sweep each fed element's impedance and SWR through the matching."""
    import contextlib
    import dataclasses
    import math

    from ..design import load_design
    from ..em import planning
    from ..em.config import check_sweep
    from ..em.tuning import fed_element
    from ..render.files import check_writable, write_text
    from ..render.report import findings_text

    if csv_path is not None:
        check_writable(csv_path, force, "--csv")
    d = load_design(design)
    settings = _settings(d)
    lo = _frequency(f_from, "--from", settings.sweep_from_hz)
    hi = _frequency(f_to, "--to", settings.sweep_to_hz)
    default_step = settings.sweep_step_hz if f_from is None and f_to is None else (hi - lo) / 80
    step = _frequency(f_step, "--step", default_step)
    check_sweep(lo, hi, step, "--from/--to/--step")
    settings = dataclasses.replace(settings, sweep_from_hz=lo, sweep_to_hz=hi, sweep_step_hz=step)
    plan = _core_plan(d)
    if element_name is not None:
        elements = [fed_element(plan, element_name)]
    else:
        elements = [e for e in plan.elements if e.gap_mm is not None]
        if not elements:
            fed_element(plan, None)  # raises: nothing to sweep
    n = len(settings.frequencies()) * len(elements)
    out, rows, found = [], [], []
    show = n >= PROGRESS_MIN_POINTS
    bar = (click.progressbar(length=n, label="sweeping", file=sys.stderr) if show
           else contextlib.nullcontext())
    with bar:
        for e in elements:
            ee, findings = planning.check_element(plan, e, settings,
                                                  progress=bar.update if show else None)
            found += findings
            title = f"{e.name} ({e.spec.shape})"
            out += [title, "-" * len(title)] + ee.summary_lines() + [""]
            out += ee.sweep_lines(None) + [f"  note: {x}" for x in ee.notes] + [""]
            s = ee.sweep
            rows += [(e.name, f"{f:.1f}", f"{z.real:.4f}", f"{z.imag:.4f}",
                      f"{a:.5f}" if math.isfinite(a) else "inf",
                      f"{b:.5f}" if math.isfinite(b) else "inf")
                     for f, z, a, b in zip(s.freq_hz, s.z_ohm, s.swr_terminals, s.swr_system)]
    pe = planning.plan_electrical(settings)
    shown = dataclasses.replace(plan, findings=tuple(found))
    out += [pe.text(d.shop.units, d.shop.fraction), "", "Findings", "--------",
            findings_text(shown)]
    click.echo("\n".join(out))
    if csv_path is not None:
        write_text(csv_path, _csv_text(rows), force)
        click.echo(f"wrote {csv_path}")


def _len(mm: float, d) -> str:
    from ..units import format_length

    return format_length(mm, d.shop.units, d.shop.fraction)


def _change(mm: float, d) -> str:
    from ..units import format_inches, format_mm

    sign = "+" if mm > 0 else ""
    if d.shop.units == "in":
        return f"{sign}{format_inches(mm, d.shop.fraction)} ({sign}{format_mm(mm)})"
    return f"{sign}{format_mm(mm)}"


def _tune_text(r, d, settings) -> list[str]:
    from ..em.model import UNCERTAINTY_FRAC
    from ..render.report import table
    from ..units import format_frequency

    what = "least SWR through the matching" if r.tune_for == "least-swr" else "resonance (X = 0)"
    u = 100 * UNCERTAINTY_FRAC
    lines = [f"Tuning {r.element!r} for {what} at {format_frequency(r.target_hz)}",
             f"  matching: {settings.chain.describe()}",
             f"  {r.key}: {_len(r.old_value_mm, d)} -> {_len(r.new_value_mm, d)} "
             f"(change {_change(r.new_value_mm - r.old_value_mm, d)})",
             f"  predicted {what}: {format_frequency(r.old_hz)} before, "
             f"{format_frequency(r.new_hz)} after (each +-{u:.1f} %)",
             f"  developed length: {_len(r.old_developed_mm, d)} -> "
             f"{_len(r.new_developed_mm, d)} (change "
             f"{_change(r.new_developed_mm - r.old_developed_mm, d)})",
             f"  cut length: {_len(r.old_cut_mm, d)} -> {_len(r.new_cut_mm, d)} (change "
             f"{_change(r.new_cut_mm - r.old_cut_mm, d)})",
             f"  ({r.iterations} secant steps, {r.models_built} models)", "",
             "Marks on the straight stock: from the centre mark, and from cut end A"]
    rows = [[m.label, _len(m.new_from_centre_mm, d),
             _change(m.new_from_centre_mm - m.old_from_centre_mm, d),
             _len(m.new_from_end_mm, d), _change(m.new_from_end_mm - m.old_from_end_mm, d)]
            for m in r.marks]
    lines.append(table(["mark", "new from centre", "change", "new from end A", "change"], rows,
                       "lrrrr"))
    return lines


def _measured_text(r, d, settings) -> list[str]:
    from ..render.report import table
    from ..units import format_frequency

    what = "resonance (X = 0)" if r.tune_for == "resonance" else "least SWR"
    lines = [f"First article {r.element!r}: {what} measured at "
             f"{format_frequency(r.measured_hz)}; target {format_frequency(r.target_hz)}",
             f"  the model predicts {format_frequency(r.model_hz)} for the element as designed "
             "(+-0.5 %)",
             f"  model sensitivity: d f / d {r.key} = {r.sensitivity_hz_per_mm / 1e3:.1f} kHz "
             "per mm", "",
             f"Change for the next build ({r.key} now {_len(r.value_mm, d)})"]
    rows = [["model sensitivity", _change(r.change_model_mm, d),
             _len(r.value_mm + r.change_model_mm, d), _change(r.cut_change_model_mm, d)],
            ["proportional rule", _change(r.change_proportional_mm, d),
             _len(r.value_mm + r.change_proportional_mm, d),
             _change(r.cut_change_proportional_mm, d)]]
    lines.append(table(["by", f"change in {r.key}", f"new {r.key}", "change in cut length"],
                       rows, "lrrr"))
    lines += ["", f"Trust the {'model' if r.trust == 'model' else 'proportional rule'}: "
              f"{r.advice}"]
    return lines


@click.command()
@design_argument
@click.option("--target", "target", metavar="FREQ",
              help="Frequency to tune to (default: [electrical] target).")
@click.option("--measured", "measured", metavar="FREQ",
              help="Where the first article's SWR was measured least: report the change in "
                   "length for the next build instead of tuning the model.")
@click.option("--for", "tune_for", type=click.Choice(["least-swr", "resonance"]),
              help="Put least SWR (default: [electrical] tune_for) or resonance on target.")
@click.option("--element", "element_name", metavar="NAME",
              help="The element to tune (needed when several have a feed gap).")
@click.option("-o", "--output", type=click.Path(dir_okay=False, path_type=Path),
              help="Write the tuned design to this file.")
@click.option("--force", is_flag=True, help="Replace an existing output file.")
@guarded
def tune(design: Path, target: str | None, measured: str | None, tune_for: str | None,
         element_name: str | None, output: Path | None, force: bool) -> None:
    """Find the element length that puts least SWR (or resonance) on target."""
    from ..design import load_design
    from ..errors import DesignError
    from ..em import tuning
    from ..em.planning import plan_electrical
    from ..render.files import check_writable, write_text

    if output is not None:
        if measured is not None:
            raise DesignError("-o writes a tuned design from --target; with --measured, change "
                              "the length by the reported figure", field="--output")
        check_writable(output, force)
    d = load_design(design)
    settings = _settings(d)
    target_hz = _frequency(target, "--target", settings.target_hz)
    if target_hz is None:
        raise DesignError('give --target "FREQ" or set target in [electrical]', field="--target")
    measured_hz = _frequency(measured, "--measured", None)
    plan = _core_plan(d)
    element = tuning.fed_element(plan, element_name)
    if measured_hz is not None:
        r = tuning.from_measurement(plan, element, settings, measured_hz, target_hz,
                                    tune_for=tune_for)
        lines = _measured_text(r, d, settings)
    else:
        r = tuning.tune(plan, element, settings, target_hz, tune_for=tune_for)
        lines = _tune_text(r, d, settings)
        if output is not None:
            text = design.read_text(encoding="utf-8")
            new_text, changes = tuning.rewrite_design(text, d, element.name, r.new_params,
                                                      str(output))
            write_text(output, new_text, force)
            shown = ", ".join(f'{k} = "{v}"' for k, v in changes.items())
            lines += ["", f"wrote {output} ({shown})"]
            if settings.target_hz is not None and settings.target_hz != target_hz:
                lines.append(f"note: its [electrical] target is still "
                             f"{settings.target_hz / 1e6:g} MHz; only the length was changed")
        else:
            lines += ["", "use -o NEW.toml to write the tuned design"]
    pe = plan_electrical(settings)
    lines += [""] + [f"CAUTION: {c}" for c in pe.cautions]
    click.echo("\n".join(lines))


COMMANDS = [sweep, tune]
