"""What measuring the first article found, as text: the measured sweep beside the
prediction, the correction for the next cut, and the history.

Reads the records of fabplan.measuring and formats them with fabplan.units;
nothing here computes an engineering figure.
"""

from __future__ import annotations

from collections.abc import Sequence

from ..design.model import Design
from ..measure.history import HistoryRecord
from ..measuring import (
    ArticleCorrection,
    Comparison,
    Correction,
    Figure,
    HistoryCorrection,
    HistoryStatus,
)
from ..units import format_frequency, format_length, format_signed_length
from .text import findings_lines, table

__all__ = ["comparison_lines", "correction_lines", "history_lines", "history_correction_lines",
           "figure_cells", "value_text", "change_text", "change_words", "recorded_line"]


def value_text(x: float | None, unit: str, unc: float | None = None) -> str:
    """A figure with its unit and, when known, its uncertainty ("-" when missing)."""
    if x is None:
        return "-"
    if unit == "Hz":
        text = format_frequency(x)
        return text if not unc else f"{text} +- {format_frequency(unc)}"
    if unit == "ohm":
        text = f"{x:.1f} ohm"
        return text if not unc else f"{text} +- {unc:.1f}"
    text = f"{x:.2f}"
    return text if not unc else f"{text} +- {unc:.2f}"


def _difference(f: Figure) -> str:
    d = f.difference
    if d is None or f.predicted is None:
        return "-"
    if f.unit == "Hz":
        sign = "+" if d >= 0 else "-"
        rel = f" ({100 * d / f.predicted:+.2f} %)" if f.predicted else ""
        return f"{sign}{format_frequency(abs(d))}{rel}"
    if f.unit == "ohm":
        return f"{d:+.1f} ohm"
    return f"{d:+.2f}"


def figure_cells(f: Figure) -> list[str]:
    """One row of the comparison: figure, measured, predicted, difference."""
    measured = value_text(f.measured, f.unit, f.measured_unc)
    if f.measured_at_least and f.measured is not None:
        measured = "at least " + measured
    if f.measured is None and f.note:
        measured = f"- ({f.note})"
    elif f.note:
        measured += f" ({f.note})"
    predicted = value_text(f.predicted, f.unit, f.predicted_unc)
    if f.predicted_at_least and f.predicted is not None:
        predicted = "at least " + predicted
    return [f.name, measured, predicted, _difference(f)]


def comparison_lines(c: Comparison) -> list[str]:
    """`fabplan measure`: the sweep, what de-embedding did, and the figures side by side."""
    f = c.freq_hz
    head = f"First article of {c.element!r}"
    lines = [head, "-" * len(head),
             f"  sweep: {c.source or 'the analyser'}, {len(f)} points from "
             f"{format_frequency(f[0])} to {format_frequency(f[-1])}"
             + (f" ({c.dropped} points further than 50 % from the target left out)"
                if c.dropped else ""),
             f"  removed: {'; '.join(c.removed) if c.removed else 'nothing'}",
             f"  now at the {c.plane}; left in: {c.left}",
             f"  SWR read through: {c.swr_chain}"]
    if not c.has_phase:
        lines.append("  only the SWR (or return loss) was measured: no impedance, so no "
                     "resonance or R and X; the matching device stays in the reading")
    lines += ["", f"Measured against predicted (the model of the design as made; its "
                  f"frequencies +-{100 * c.uncertainty_frac:.1f} %)"]
    rows = [figure_cells(x) for x in c.figures]
    lines.append(table(["figure", "measured", "predicted", "difference"], rows, "lrrr"))
    if c.has_phase and c.measured.resonance_note:
        lines.append(f"  measured resonance: {c.measured.resonance_note}")
    if c.target_hz is not None:
        lines.append(f"  target {format_frequency(c.target_hz)}")
    if c.findings:
        lines += [""] + findings_lines(c.findings)
    return lines


def _amount(x: float, unit: str, d: Design) -> str:
    if unit == "mm":
        return format_length(x, d.shop.units, d.shop.fraction)
    return f"{x:.2f} {unit}"


def change_text(x: float, unit: str, d: Design) -> str:
    """A signed change in the shop's units (mm, in) or in pF."""
    if unit == "mm":
        return format_signed_length(x, d.shop.units, d.shop.fraction)
    return f"{x:+.2f} {unit}"


def change_words(c: Correction, d: Design) -> str:
    """"lengthen by 7/32\" (5.3 mm) +- 0.05 mm", "decrease by 1.20 pF"."""
    text = f"{c.direction} by {_amount(abs(c.change), c.unit, d)}"
    shown = 0.005 if c.unit == "mm" else 0.0005
    if c.change_unc >= shown:
        text += f" +- {c.change_unc:.2f} mm" if c.unit == "mm" else f" +- {c.change_unc:.3f} pF"
    return text


def _rows(corrections: Sequence[Correction], d: Design) -> list[list[str]]:
    rows = []
    for c in corrections:
        cut = "-" if c.cut_change_mm is None else change_text(c.cut_change_mm, "mm", d)
        name = c.dimension if c is corrections[0] else f"{c.dimension} ({c.element})"
        rows.append([name, _amount(c.value, c.unit, d), change_words(c, d),
                     _amount(c.new_value, c.unit, d), cut])
    return rows


def _sensitivities(corrections: Sequence[Correction]) -> list[str]:
    return [f"  d f / d {c.dimension}: {c.sensitivity_hz_per_unit / 1e6:+.4f} MHz per {c.unit}"
            for c in corrections]


_HEAD = ["dimension", "as made", "change for the next cut", "new", "cut length change"]


def correction_lines(r: ArticleCorrection, d: Design) -> list[str]:
    """The change of each adjustable dimension that puts the goal on target."""
    lines = [f"Correction for the next cut: the {r.goal.name} onto "
             f"{format_frequency(r.target_hz)}",
             f"  measured: {r.measured.describe()} at {format_frequency(r.measured_hz)}"
             + (f" +- {format_frequency(r.measured_unc_hz)}" if r.measured_unc_hz else ""),
             f"  the model of the design as made puts it at "
             f"{format_frequency(r.model_measured_hz)} ({100 * r.relative_difference:+.2f} %)"]
    if r.goal != r.measured:
        lines.append(f"  the model puts the {r.goal.describe()} at "
                     f"{format_frequency(r.model_goal_hz)}; the article's is about "
                     f"{format_frequency(r.article_goal_hz)}")
    first = r.corrections[0]
    if first.equivalent_value is not None:
        lines.append(f"  the model reproduces the article with {first.dimension} = "
                     f"{_amount(first.equivalent_value, first.unit, d)} (as made: "
                     f"{_amount(first.value, first.unit, d)})")
    lines += ["", table(_HEAD, _rows(r.corrections, d), "lrrrr")]
    if len(r.corrections) > 1:
        lines.append("  (each row alone: change one dimension, not all)")
    lines += ["  the model's sensitivity of the " + r.goal.name + " at the measured point:"]
    lines += _sensitivities(r.corrections)
    lines += ["", "Notes"] + [f"  - {n}" for n in r.notes]
    return lines


def history_lines(h: HistoryStatus | None, path: str) -> list[str]:
    """The running average of the history file (or that it has none yet)."""
    if h is None:
        return [f"History ({path}): no first article of this element and feature recorded "
                "yet (add --record to keep this one)"]
    s = h.summary
    spread = ("" if s.stdev_relative_difference is None else
              f", standard deviation {100 * s.stdev_relative_difference:.2f} %, standard error "
              f"{100 * (s.standard_error or 0.0):.2f} %")
    lines = [f"History ({path}): {s.count} first article(s) of {h.element!r} measured for "
             f"{'resonance' if h.feature == 'resonance' else 'least SWR'} (of {h.total_records} "
             "records)",
             f"  on average the articles came {100 * s.mean_relative_difference:+.2f} % from "
             f"the model{spread}"]
    if h.target_hz is not None and h.model_target_hz is not None:
        lines.append(f"  to land on {format_frequency(h.target_hz)}, tune the model to "
                     f"{format_frequency(h.model_target_hz)} (--apply-history does)")
    return lines


def history_correction_lines(h: HistoryCorrection, d: Design) -> list[str]:
    """The change for the next batch from the history's average."""
    s = h.summary
    lines = [f"Next batch from the history: the model's {h.goal.name} onto "
             f"{format_frequency(h.model_goal_hz)} = target {format_frequency(h.target_hz)} / "
             f"(1 {s.mean_relative_difference * 100:+.2f} %), averaged over {s.count} "
             "article(s)",
             f"  the model of the design puts it at {format_frequency(h.model_now_hz)}", "",
             table(_HEAD, _rows(h.corrections, d), "lrrrr")]
    lines += ["  the model's sensitivity at the design's values:"]
    lines += _sensitivities(h.corrections)
    if s.count < 2:
        lines.append("  one article is no average: measure more before trusting it")
    return lines


def recorded_line(record: HistoryRecord, path: str) -> str:
    """What was appended to the history."""
    return (f"recorded in {path}: {record.feature} measured {format_frequency(record.measured_hz)}"
            f", model {format_frequency(record.predicted_hz)} "
            f"({100 * record.relative_difference:+.2f} %)")
