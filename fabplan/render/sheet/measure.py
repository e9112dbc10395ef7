"""The first article on paper: its measured sweep against the prediction (SWR, R and
X on one page, the target marked), the figures side by side and the correction.

A page of the build sheet when a measurement is given (`fabplan build
--measured`), or a document of its own (`fabplan measure --pdf`). Every figure
comes from fabplan.measuring's records; this module only draws (reportlab
graphics, like the sheet's SWR plot).
"""

from __future__ import annotations

import io
import math
from collections.abc import Sequence
from typing import Any

from ... import __version__
from ...measuring import Comparison, Correction, Measurement
from ...plan import Plan
from ...units import format_frequency
from ..measure import change_text, change_words, figure_cells
from .context import Context, default_paper
from .electrical import BLUE, GREY, frequency_axes, frequency_marks, nice_step, swr_axis

__all__ = ["comparison_section", "comparison_pdf", "TITLE", "MAX_PLOTTED"]

TITLE = "First article: measured against predicted"
MAX_PLOTTED = 1500  # points drawn per curve; a longer sweep is drawn every k-th point
ORANGE = (0.85, 0.45, 0.05)


def _every(n: int) -> int:
    return max(1, math.ceil(n / MAX_PLOTTED))


def _axis(values: Sequence[float]) -> tuple[float, float, float]:
    finite = [v for v in values if math.isfinite(v)]
    lo, hi = (min(finite), max(finite)) if finite else (-1.0, 1.0)
    if hi - lo < 1e-9:
        lo, hi = lo - 1.0, hi + 1.0
    step = nice_step(hi - lo, 5)
    return step * math.floor(lo / step + 1e-9), step * math.ceil(hi / step - 1e-9), step


def _plot(ctx: Context, c: Comparison, ylabel: str, measured: Sequence[float] | None,
          predicted: Sequence[float], axis: tuple[float, float, float],
          levels: Sequence[float] = (), zero: bool = False, height: float = 150.0) -> Any:
    from reportlab.graphics.charts.lineplots import LinePlot
    from reportlab.graphics.shapes import Drawing, Line, String
    from reportlab.lib import colors

    w = ctx.frame_w
    d = Drawing(w, height)
    lp = LinePlot()
    lp.x, lp.y, lp.width, lp.height = 45, 26, w - 70, height - 44
    lo, top, step = axis
    k = _every(len(c.freq_hz))
    mhz = [f / 1e6 for f in c.freq_hz][::k]

    def clip(vals: Sequence[float]) -> list[tuple[float, float]]:
        return [(x, min(max(v, lo), top) if math.isfinite(v) else top)
                for x, v in zip(mhz, list(vals)[::k])]

    series = [clip(predicted)]
    if measured is not None:
        series.append(clip(measured))
    lp.data = series
    lp.lines[0].strokeColor = colors.Color(*GREY)
    lp.lines[0].strokeWidth = 1.0
    lp.lines[0].strokeDashArray = [3, 2]
    if measured is not None:
        lp.lines[1].strokeColor = colors.Color(*BLUE)
        lp.lines[1].strokeWidth = 1.2
    px, py = frequency_axes(lp, mhz[0], mhz[-1], (lo, top, step))
    d.add(lp)
    if zero and lo < 0 < top:
        d.add(Line(lp.x, py(0.0), lp.x + lp.width, py(0.0), strokeWidth=0.6,
                   strokeColor=colors.Color(0.3, 0.3, 0.3)))
    frequency_marks(d, lp, px, py, (lo, top, step), levels, c.target_hz)
    d.add(String(4, height - 10, ylabel, fontSize=7.5))
    legend = "dashed grey: predicted" + ("; solid blue: measured" if measured is not None
                                         else "; not measured (no phase)")
    d.add(String(w, height - 10, legend, fontSize=7, textAnchor="end"))
    return d


def _correction_rows(ctx: Context, corrections: Sequence[Correction]) -> list[list[str]]:
    d = ctx.plan.design
    rows = []
    for c in corrections:
        if c.unit == "mm":
            now, new = ctx.L(c.value), ctx.L(c.new_value)
        else:
            now, new = f"{c.value:.2f} {c.unit}", f"{c.new_value:.2f} {c.unit}"
        cut = "-" if c.cut_change_mm is None else change_text(c.cut_change_mm, "mm", d)
        rows.append([f"{c.dimension} ({c.element})", now, change_words(c, d), new, cut])
    return rows


def comparison_section(ctx: Context, m: Measurement, page_break: bool = True) -> list[Any]:
    """The comparison page: title, what was measured and removed, the SWR, R and X
    plots, the figures side by side and the correction."""
    from reportlab.platypus import KeepTogether, PageBreak

    c = m.comparison
    f = c.freq_hz
    out: list[Any] = [PageBreak()] if page_break else []
    intro = (f"{c.element}: {c.source or 'the analyser'}, {len(f)} points from "
             f"{format_frequency(f[0])} to {format_frequency(f[-1])}. Removed from the sweep: "
             f"{'; '.join(c.removed) if c.removed else 'nothing'}; now at the {c.plane}. "
             f"Left in: {c.left}. SWR read through {c.swr_chain}. Predicted: the model of the "
             f"design as made; its frequencies carry about +-{100 * c.uncertainty_frac:.1f} %.")
    plots = [ctx.p(TITLE, ctx.h2), ctx.p(intro, ctx.small),
             _plot(ctx, c, f"SWR against {c.system_ohm:g} ohm (clipped)",
                   c.measured_swr, c.predicted_swr,
                   swr_axis(list(c.measured_swr) + list(c.predicted_swr)), levels=(1.5, 2.0))]
    for name in ("R", "X"):
        pred = [z.real if name == "R" else z.imag for z in c.predicted_z_ohm]
        meas = (None if c.measured_z_ohm is None else
                [z.real if name == "R" else z.imag for z in c.measured_z_ohm])
        axis = _axis(pred + (meas or []))
        where = ("at the element's terminals" if c.plane == "element terminals" else
                 f"measured at the {c.plane}, predicted at the element's feed")
        plots.append(_plot(ctx, c, f"{name}, ohm, {where}", meas, pred, axis,
                           zero=name == "X"))
    out.append(KeepTogether(plots))
    rows = [figure_cells(x) for x in c.figures]
    out += ctx.table(["figure", "measured", "predicted", "difference"], rows,
                     [0.26, 0.30, 0.24, 0.20], "lrrr",
                     caption="Frequencies in MHz or kHz, impedances in ohm; +- the uncertainty "
                             "from the sweep's step and noise.")
    r = m.correction
    if r is None and m.note:
        out.append(ctx.p(m.note, ctx.small))
    if r is not None:
        out.append(ctx.p(f"Correction for the next cut: the {r.goal.name} onto "
                         f"{format_frequency(r.target_hz)}", ctx.h3))
        out.append(ctx.p(f"Measured: {r.measured.describe()} at "
                         f"{format_frequency(r.measured_hz)}; the model of the design as made "
                         f"puts it at {format_frequency(r.model_measured_hz)} "
                         f"({100 * r.relative_difference:+.2f} %). Each row alone: change one "
                         "dimension, not all.", ctx.small))
        out += ctx.table(["dimension", "as made", "change for the next cut", "new",
                          "cut length change"], _correction_rows(ctx, r.corrections),
                         [0.22, 0.2, 0.22, 0.2, 0.16], "lrrrr")
        for note in r.notes:
            out.append(ctx.p(note, ctx.small))
    return out


def comparison_pdf(plan: Plan, m: Measurement, paper: str | None = None) -> bytes:
    """The comparison as a PDF document of its own, on "a4" or "letter" (default:
    the shop's, Letter for inches and A4 for millimetres); the bytes depend only
    on the inputs (reportlab invariant mode)."""
    from reportlab.platypus import SimpleDocTemplate

    ctx = Context(plan, paper or default_paper(plan.design.shop.units), paper is not None)
    buf = io.BytesIO()
    project = plan.design.project
    doc = SimpleDocTemplate(buf, pagesize=(ctx.pw, ctx.ph), leftMargin=ctx.margin,
                            rightMargin=ctx.margin, topMargin=ctx.margin,
                            bottomMargin=ctx.margin, title=f"{TITLE}: {project}",
                            author="fabplan", creator=f"fabplan {__version__}",
                            subject="first article", invariant=1, pageCompression=1)
    doc.build(comparison_section(ctx, m, page_break=False))
    return buf.getvalue()
