"""The build sheet's electrical section: each fed element's figures and SWR plot,
the matching and feed."""

from __future__ import annotations

from typing import Any

from ...em.records import SweepResult
from ...units import format_frequency
from ..text import band_text
from .context import Context

__all__ = ["electrical"]


def electrical(ctx: Context) -> list[Any]:
    """The electrical check: a summary per element and its SWR plot."""
    items = [e for e in ctx.plan.elements if e.electrical is not None]
    if not items and ctx.plan.electrical is None:
        return []
    out = [ctx.p("Electrical check", ctx.h2)]
    for e in items:
        el = e.electrical
        if el is None:
            continue
        sw = el.sweep
        bw = "; ".join(f"SWR < {b.level:g}: {band_text(b)}" for b in sw.bands)
        rows = [["target frequency", format_frequency(el.target_hz) if el.target_hz else "-"],
                ["resonance (reactance zero)", format_frequency(sw.resonance_hz)
                 if sw.resonance_hz else "none in the sweep"],
                ["lowest SWR", f"{sw.min_swr:.2f} at {format_frequency(sw.min_swr_hz)}"],
                ["bandwidth", bw or "-"],
                ["matching", f"{sw.matching}; SWR against {sw.system_ohm:g} ohm"],
                ["uncertainty", f"about {sw.uncertainty_frac * 100:.1f} % in frequency"],
                ["model size", f"{el.unknowns} unknowns"]]
        if sw.efficiency is not None:
            rows.insert(4, ["efficiency", f"{sw.efficiency * 100:.1f} %"])
        out.append(ctx.p(e.name, ctx.h3))
        out += ctx.table(["figure", "value (unit)"], rows, [0.3, 0.7], "ll")
        out.append(_swr_plot(ctx, sw))
        for note in el.notes:
            out.append(ctx.p(note, ctx.small))
    pe = ctx.plan.electrical
    if pe is not None:
        rows = [["matching", pe.matching], ["ground", pe.ground]]
        if pe.balun_loop_cut_length_mm is not None:
            rows.append(["balun loop cut length", f"{ctx.L(pe.balun_loop_cut_length_mm)} of "
                                                  f"{pe.balun_cable or 'coaxial cable'}"])
        if pe.feed_line_loss_db is not None:
            rows.append(["feed line loss (matched)", f"{pe.feed_line_loss_db:.2f} dB"])
        if pe.power_w is not None:
            rows.append(["transmitter power", f"{pe.power_w:g} W"])
        rows.append(["uncertainty", f"about {pe.uncertainty_frac * 100:.1f} % in frequency"])
        out.append(ctx.p("Matching and feed", ctx.h3))
        out += ctx.table(["figure", "value (unit)"], rows, [0.3, 0.7], "ll",
                         caption="Lengths in inches and millimetres; loss in dB; power in W.")
    return out


def _swr_plot(ctx: Context, sw: SweepResult) -> Any:
    from reportlab.graphics.charts.lineplots import LinePlot
    from reportlab.graphics.shapes import Drawing, String
    from reportlab.lib import colors

    w, h = ctx.frame_w, 150
    d = Drawing(w, h)
    lp = LinePlot()
    lp.x, lp.y, lp.width, lp.height = 45, 28, w - 70, h - 45
    mhz = [f / 1e6 for f in sw.freq_hz]
    top = 5.0
    series = [list(zip(mhz, [min(v, top) for v in sw.swr_system]))]
    if list(sw.swr_terminals) != list(sw.swr_system):
        series.append(list(zip(mhz, [min(v, top) for v in sw.swr_terminals])))
    lp.data = series
    lp.lines[0].strokeColor = colors.Color(0.1, 0.3, 0.8)
    lp.lines[0].strokeWidth = 1.2
    if len(series) > 1:
        lp.lines[1].strokeColor = colors.Color(0.6, 0.6, 0.6)
        lp.lines[1].strokeDashArray = [3, 2]
    lp.yValueAxis.valueMin, lp.yValueAxis.valueMax, lp.yValueAxis.valueStep = 1, top, 0.5
    lp.xValueAxis.valueMin, lp.xValueAxis.valueMax = min(mhz), max(mhz)
    lp.xValueAxis.labelTextFormat = "%.1f"
    lp.yValueAxis.labelTextFormat = "%.1f"
    lp.xValueAxis.labels.fontSize = lp.yValueAxis.labels.fontSize = 7
    d.add(lp)
    d.add(String(w / 2, 4, "frequency, MHz", fontSize=7.5, textAnchor="middle"))
    d.add(String(4, h - 10, f"SWR (1 to {top:g}; clipped above)", fontSize=7.5))
    legend = f"solid: at the feed line, against {sw.system_ohm:g} ohm"
    if len(series) > 1:
        legend += f"; dashed: at the element's terminals, against {sw.reference_ohm:g} ohm"
    d.add(String(w, h - 10, legend, fontSize=7, textAnchor="end"))
    return d
