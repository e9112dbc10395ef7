"""`fabplan measure`: the first article's analyser sweep against the model, and the
correction for the next cut.

Parses options, reads the sweep and the history file, calls fabplan.measuring,
prints and writes; no engineering here. Heavy imports stay inside the functions.
The options that say how to read a sweep and what lay between the analyser and
the element (`sweep_options`) are shared with `fabplan build --measured`.
"""

from __future__ import annotations

import re
import sys
from collections.abc import Callable, Mapping
from pathlib import Path
from typing import Any, BinaryIO, TypeVar

import click

from ..errors import DesignError
from .base import (
    check_output,
    design_argument,
    design_text,
    guarded,
    is_dash,
    load_design_file,
    output_path,
    write_one_bytes,
    write_one_text,
)

__all__ = ["COMMANDS", "measure", "sweep_options", "measured_option", "measurement_for_build",
           "history_path_of", "write_corrected", "predicted_files", "PREDICTED_NAME",
           "SINGLE_KINDS", "FREQUENCY_UNITS"]

F = TypeVar("F", bound=Callable[..., Any])

# the same tuples as fabplan.measuring.SINGLE_KINDS and fabplan.measure.FREQUENCY_UNITS
# (a test keeps them equal): written out so that the command line starts without numpy
SINGLE_KINDS = ("resonance", "least-swr", "analyser-x0")
FREQUENCY_UNITS = ("Hz", "kHz", "MHz", "GHz")
TUNE_FOR = ("resonance", "least-swr")
_LOSS = re.compile(r"\s*((?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?)\s*dB\s*/\s*(100\s*m|100\s*ft|m)"
                   r"\s*", re.IGNORECASE)
PREDICTED_NAME = "predicted.s1p"  # what `fabplan build` calls the predicted sweep
_READING_KEYS = ("columns", "frequency_unit", "z0", "line", "line_impedance", "line_vf",
                 "line_loss", "line_loss_at", "matching")


def sweep_options(func: F) -> F:
    """The options that say how to read the sweep and what lay between the
    analyser and the element."""
    options = [
        click.option("--column", "columns", multiple=True, metavar="ROLE=COLUMN",
                     help="A CSV sweep's column, by header text or number from 1; roles: "
                          "frequency with swr, or r_ohm and x_ohm, or return_loss_db, or "
                          "s11_re and s11_im, s11_mag, s11_db, s11_angle_deg (repeat the "
                          "option). Without it SWEEP is read as Touchstone (.s1p)."),
        click.option("--frequency-unit", type=click.Choice(FREQUENCY_UNITS,
                                                           case_sensitive=False),
                     help="The unit of a CSV sweep's frequency column."),
        click.option("--z0", type=float, metavar="OHM",
                     help="The reference impedance of a CSV sweep's SWR or S11 (default: the "
                          "design's system impedance)."),
        click.option("--line", metavar="none|design|LENGTH",
                     help='The feed line between the analyser and the matching device: a '
                          'length ("2 m"), "design" for [electrical.feed_line], or "none" '
                          "(the default when the design has no feed line; required when it "
                          "has one)."),
        click.option("--line-impedance", type=float, metavar="OHM",
                     help="That line's characteristic impedance (default: the system's)."),
        click.option("--line-vf", type=float, metavar="VF",
                     help="That line's velocity factor (needed with a length)."),
        click.option("--line-loss", metavar='"DB/100 m"',
                     help='That line\'s matched loss, e.g. "13 dB/100 m" or "4 dB/100 ft".'),
        click.option("--line-loss-at", metavar="FREQ",
                     help="The frequency that loss is quoted at (it scales with its square "
                          "root)."),
        click.option("--matching", type=click.Choice(["fitted", "absent"]), default="fitted",
                     show_default=True,
                     help="Whether the design's matching device was fitted when the sweep was "
                          "taken (fitted: it is removed from the sweep as modelled)."),
    ]
    for option in reversed(options):
        func = option(func)
    return func


def measured_option(func: F) -> F:
    """`--measured SWEEP` and the sweep options, for `fabplan build`."""
    func = sweep_options(func)
    return click.option("--measured", metavar="SWEEP",
                        help="The first article's analyser sweep (.s1p, or CSV with "
                             "--column): the build sheet gets a page of it against the "
                             "prediction.")(func)


def _columns(values: tuple[str, ...]) -> dict[str, str | int]:
    out: dict[str, str | int] = {}
    for v in values:
        role, eq, col = v.partition("=")
        if not eq or not role.strip() or not col.strip():
            raise DesignError("write a column as ROLE=COLUMN, e.g. frequency=1 or swr=SWR",
                              field="--column", value=v)
        if role.strip() in out:
            raise DesignError("this role is given twice", field="--column", value=v)
        col = col.strip()
        out[role.strip()] = int(col) if col.isdigit() else col
    return out


def _line(settings: Any, reading: Mapping[str, Any]) -> Any:
    """The fabplan.feed.Line the sweep was taken through, or None."""
    from ..feed import Line, db_per_m
    from ..units import parse_frequency, parse_length

    text = reading.get("line")
    design_line = settings.chain.feed_line
    detail = [k for k in ("line_impedance", "line_vf", "line_loss", "line_loss_at")
              if reading.get(k) is not None]
    if text is None:
        if design_line is not None:
            raise DesignError("the design has a feed line: say whether the sweep was taken "
                              "through it (--line design), through another (--line LENGTH "
                              "with --line-vf), or at the matching device (--line none)",
                              field="--line")
        text = "none"
    choice = text.strip().lower()
    if choice in ("none", "design"):
        if detail:
            raise DesignError(f"--{detail[0].replace('_', '-')} describes a line given by its "
                              "length: --line LENGTH", field=f"--{detail[0].replace('_', '-')}")
        if choice == "none":
            return None
        if design_line is None:
            raise DesignError("the design has no [electrical.feed_line]: give the line's "
                              "length (--line LENGTH) or --line none", field="--line",
                              value=text)
        return design_line
    length = parse_length(text, "--line")
    vf = reading.get("line_vf")
    if vf is None:
        raise DesignError("give the line's velocity factor (--line-vf, e.g. 0.66 for solid "
                          "polyethylene)", field="--line-vf")
    z0 = reading.get("line_impedance")
    loss_db_per_m, ref_hz = 0.0, 100e6
    if reading.get("line_loss") is not None:
        m = _LOSS.fullmatch(reading["line_loss"])
        if m is None:
            raise DesignError('write the loss as "13 dB/100 m", "4 dB/100 ft" or "0.13 dB/m"',
                              field="--line-loss", value=reading["line_loss"])
        per = m.group(2).replace(" ", "").lower()
        value = float(m.group(1))
        loss_db_per_m = value if per == "m" else db_per_m(value, per)
        if reading.get("line_loss_at") is None:
            raise DesignError("give the frequency the loss is quoted at (--line-loss-at)",
                              field="--line-loss-at")
        ref_hz = parse_frequency(reading["line_loss_at"], "--line-loss-at")
    elif reading.get("line_loss_at") is not None:
        raise DesignError("--line-loss-at needs --line-loss", field="--line-loss-at")
    return Line(float(settings.chain.system_ohm if z0 is None else z0), float(vf), length,
                loss_db_per_m, ref_hz)


def _read_sweep(arg: str, settings: Any, reading: Mapping[str, Any]) -> Any:
    from ..measure.sweep import MAX_TEXT_CHARS, check_text_size, decode_sweep_bytes
    from ..measuring import read_sweep_text

    if is_dash(arg):
        source = "<stdin>"
        ctx = click.get_current_context()
        if is_dash(ctx.params.get("design")):
            raise DesignError("the design and the sweep cannot both come from standard input",
                              field="SWEEP", value="-")
        stream: BinaryIO = sys.stdin.buffer
        data = stream.read(MAX_TEXT_CHARS + 1)
    else:
        path = Path(arg)
        source = str(path)
        if path.is_dir():
            raise DesignError("is a folder: give the analyser's sweep file", field="SWEEP",
                              value=arg)
        check_text_size(path.stat().st_size, source)
        data = path.read_bytes()
    text = decode_sweep_bytes(data, source)
    columns = _columns(tuple(reading.get("columns") or ()))
    return read_sweep_text(text, source, columns=columns or None,
                           frequency_unit=reading.get("frequency_unit"),
                           z0_ohm=reading.get("z0"), default_z0_ohm=settings.chain.system_ohm)


def _measurement(plan: Any, element: Any, settings: Any, sweep_arg: str,
                 reading: Mapping[str, Any], target_hz: float | None,
                 tune_for: str | None) -> Any:
    from ..measuring import Between, measure

    sweep = _read_sweep(sweep_arg, settings, reading)
    between = Between(_line(settings, reading), reading.get("matching", "fitted") != "absent")
    return measure(plan, element, settings, sweep, between, target_hz=target_hz,
                   goal_kind=tune_for)


def _electrical(design: Any) -> Any:
    if design.electrical is None:
        raise DesignError("the design has no [electrical] table: the model to compare with "
                          'needs one, with at least target = "..."', field="electrical",
                          source=design.source)
    return design.electrical


def measurement_for_build(plan: Any, measured: str | None, reading: Mapping[str, Any]) -> Any:
    """The measurement for `fabplan build --measured SWEEP` (None without it)."""
    given = [k for k in _READING_KEYS
             if reading.get(k) not in (None, (), "fitted")]
    if measured is None:
        if given:
            raise DesignError(f"--{given[0].replace('_', '-')} describes the sweep of "
                              "--measured SWEEP", field=f"--{given[0].replace('_', '-')}")
        return None
    from ..tuning import is_fed

    settings = _electrical(plan.design)
    fed = [e for e in plan.elements if is_fed(e)]
    if len(fed) != 1:
        raise DesignError("the build sheet compares a sweep of the one fed element: compare "
                          "several with `fabplan measure --element NAME --pdf`",
                          field="--measured", value=measured)
    return _measurement(plan, fed[0], settings, measured, reading, None, None)


def predicted_files(plan: Any) -> dict[str, bytes]:
    """The predicted sweep of each fed element as a Touchstone file, at the radio
    end of the matching chain: predicted.s1p for one fed element, else
    predicted-NAME.s1p per element."""
    import re

    from ..render.touchstone import predicted_s1p

    fed = [e for e in plan.elements if e.electrical is not None]
    if plan.design.electrical is None or not fed:
        return {}
    chain = plan.design.electrical.chain
    out = {}
    for e in fed:
        name = (PREDICTED_NAME if len(fed) == 1 else
                "predicted-" + (re.sub(r"[^A-Za-z0-9]+", "-", e.name).strip("-") or "element")
                + ".s1p")
        out[name] = predicted_s1p(e.electrical.sweep, chain, e.name).encode("ascii")
    return out


def history_path_of(design: Path) -> Path | None:
    """DESIGN.history.jsonl beside the design file (None for standard input)."""
    if str(design) == "-":
        return None
    return design.with_name(design.stem + ".history.jsonl")


def write_corrected(design_path: Path, design: Any, plan: Any, element: Any, settings: Any,
                    correction: Any, output: Path, force: bool) -> str:
    """Write the design with `correction` applied (comments kept) to `output` (`-`:
    standard output); returns the report's line saying what changed."""
    from ..design.rewrite import rewrite_element
    from ..measuring import design_values

    values = design_values(plan, element, settings, correction)
    # the dimension's own element: the fed element's table holds its length and its
    # match; a loop's capacitor is in the loop's table
    new_text, changes = rewrite_element(design_text(design_path), design, correction.element,
                                        values, str(output))
    write_one_text(output, new_text, force)
    shown = ", ".join(f'{k} = "{v}"' for k, v in changes.items())
    return f"corrected design: {shown}"


def _read_history(path: Path | None) -> tuple[Any, ...]:
    from ..measure.history import read_history

    if path is None or not path.exists():
        return ()
    return read_history(path.read_text(encoding="utf-8"), str(path))


def _append(path: Path, line: str) -> None:
    """Append one line (the history is never rewritten)."""
    with open(path, "a", encoding="utf-8", newline="") as fh:
        fh.write(line)


def _when(text: str | None) -> str:
    from datetime import datetime

    if text is None:
        return datetime.now().replace(microsecond=0).isoformat()
    try:
        return datetime.fromisoformat(text).isoformat()
    except ValueError:
        raise DesignError("a date and time in ISO 8601, e.g. 2025-03-01T14:30",
                          field="--when", value=text) from None


@click.command()
@design_argument
@click.argument("sweep_arg", metavar="[SWEEP]", required=False)
@sweep_options
@click.option("--target", metavar="FREQ", help="The target (default: [electrical] target).")
@click.option("--for", "tune_for", type=click.Choice(TUNE_FOR),
              help="What to put on target: resonance or least-swr (default: [electrical] "
                   "tune_for).")
@click.option("--element", "element_name", metavar="NAME",
              help="The element measured (needed when several have a feed gap).")
@click.option("--adjust", metavar="DIMENSION",
              help="The dimension -o changes and --record keeps (default: the element's "
                   "governing length).")
@output_path("Write the corrected design to this file (comments kept); the report then "
             "goes to standard error when it is `-`")
@click.option("--pdf", type=click.Path(dir_okay=False, allow_dash=True, path_type=Path),
              help="Write the comparison page (SWR, R and X, measured and predicted) as PDF "
                   "(`-`: standard output).")
@click.option("--paper", type=click.Choice(["a4", "letter"], case_sensitive=False),
              help="Paper of the comparison page (default: Letter for an inch shop, A4 for "
                   "millimetres).")
@click.option("--history", "history_file", type=click.Path(dir_okay=False, path_type=Path),
              help="The history file (default: DESIGN.history.jsonl beside the design).")
@click.option("--record", is_flag=True,
              help="Append this first article and its correction to the history.")
@click.option("--when", metavar="DATE",
              help="When the article was measured, ISO 8601 (default: now), for --record.")
@click.option("--apply-history", is_flag=True,
              help="Correct by the history's average difference (tune the model to "
                   "target / (1 + mean)) instead of this article alone; SWEEP may be left "
                   "out.")
@click.option("--force", is_flag=True, help="Replace existing output files.")
@guarded
def measure(design: Path, sweep_arg: str | None, target: str | None, tune_for: str | None,
            element_name: str | None, adjust: str | None, output: Path | None,
            pdf: Path | None, paper: str | None, history_file: Path | None, record: bool,
            when: str | None, apply_history: bool, force: bool, **reading: Any) -> None:
    """Compare the first article's analyser sweep (SWEEP: .s1p, or CSV with --column)
    with the model, and give the length change that puts the next one on target."""
    import dataclasses

    from .. import measuring
    from ..measure.history import record_line, summarize
    from ..plan import make_plan
    from ..render import measure as text
    from ..tuning import fed_element
    from ..units import parse_frequency

    if sweep_arg is None and not apply_history:
        raise DesignError("give the analyser's sweep file (SWEEP), or --apply-history to "
                          "correct by the history alone", field="SWEEP")
    for flag, on in (("--record", record), ("--pdf", pdf is not None),
                     ("--when", when is not None)):
        if on and sweep_arg is None:
            raise DesignError(f"{flag} needs the sweep (SWEEP)", field=flag)
    if when is not None and not record:
        raise DesignError("--when dates a recorded article: add --record", field="--when")
    stamp = _when(when) if record else ""
    if is_dash(output) and is_dash(pdf):
        raise DesignError("only one of -o and --pdf can go to standard output", field="--pdf",
                          value="-")
    check_output(output, force)
    check_output(pdf, force, "--pdf")
    d = load_design_file(design)
    settings = _electrical(d)
    target_hz = parse_frequency(target, "--target") if target is not None else settings.target_hz
    if target_hz is None:
        raise DesignError('give --target "FREQ" or set target in [electrical]', field="--target")
    goal = tune_for or settings.tune_for
    hist_path = history_file or history_path_of(design)
    if (record or apply_history) and hist_path is None:
        raise DesignError("a design read from standard input has no history beside it: give "
                          "--history FILE", field="--history")
    plan = make_plan(dataclasses.replace(d, electrical=None))
    element = fed_element(plan, element_name)
    records = _read_history(hist_path)
    lines: list[str] = []
    chosen = None
    result = None
    if sweep_arg is not None:
        result = _measurement(plan, element, settings, sweep_arg, reading, target_hz, goal)
        lines += text.comparison_lines(result.comparison)
        if result.correction is None:
            lines += ["", result.note]
        else:
            lines += [""] + text.correction_lines(result.correction, d)
            chosen = result.correction.correction(adjust)
            if record and hist_path is not None:
                rec = measuring.history_record(result.correction, stamp, chosen.dimension)
                _append(hist_path, record_line(rec))
                records = records + (rec,)
                lines += ["", text.recorded_line(rec, str(hist_path))]
    elif any(reading.get(k) not in (None, (), "fitted") for k in _READING_KEYS):
        raise DesignError("the sweep options describe SWEEP: give it", field="SWEEP")
    if hist_path is None:
        lines += ["", "History: none for a design read from standard input (--history FILE "
                      "keeps one)"]
    else:
        lines += [""] + text.history_lines(
            measuring.history_status(records, element.name, goal, target_hz), str(hist_path))
    if apply_history:
        summary = summarize(records, feature="resonance" if goal == "resonance"
                            else "least-swr", element=element.name)
        if summary is None:
            raise DesignError(f"the history has no {goal} measured on {element.name!r}: "
                              "record first articles with --record", field="--apply-history",
                              value=str(hist_path))
        feature = measuring.Feature("resonance") if goal == "resonance" else measuring.Feature(
            "least-swr", settings.chain)
        hc = measuring.correct_by_history(plan, element, settings, feature, target_hz, summary)
        lines += [""] + text.history_correction_lines(hc, d)
        chosen = next((c for c in hc.corrections if adjust is None or c.dimension == adjust),
                      None)
        if chosen is None:
            raise DesignError("not an adjustable dimension of this element", field="--adjust",
                              value=adjust)
    if output is not None:
        if chosen is None:
            raise DesignError("no correction to write: the sweep showed no feature to correct "
                              "from", field="--output")
        lines += ["", write_corrected(design, d, plan, element, settings, chosen, output,
                                      force)]
    if pdf is not None and result is not None:
        from ..render.sheet.measure import comparison_pdf

        write_one_bytes(pdf, comparison_pdf(plan, result, paper and paper.lower()), force,
                        "--pdf")
    click.echo("\n".join(lines), err=is_dash(output) or is_dash(pdf))


COMMANDS = [measure]
