"""The build sheet's electrical section: the antenna as modelled (a picture), each
fed element's figures and SWR plot, the pattern's principal cuts as polar plots,
the loads at the design's power, and the matching and feed.

Every figure comes from the Plan; this module only draws (reportlab graphics).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from typing import Any

from ...em.records import ElementElectrical, PatternCut, StructureElectrical, SweepResult
from ...units import format_frequency
from ..text import band_text
from .context import Context

__all__ = ["electrical", "swr_axis", "nice_step", "frequency_axes", "frequency_marks"]

BLUE = (0.1, 0.3, 0.8)
GREY = (0.6, 0.6, 0.6)
RED = (0.75, 0.1, 0.1)
PATTERN_RANGE_DB = 40.0  # the polar plots show the gain down to this far below the maximum


def electrical(ctx: Context) -> list[Any]:
    """The electrical check: per structure its picture, figures and patterns; per fed
    element its sweep figures and SWR plot; the matching and feed."""
    items = [e for e in ctx.plan.elements if e.electrical is not None]
    pe = ctx.plan.electrical
    if not items and pe is None:
        return []
    out = [ctx.p("Electrical check", ctx.h2)]
    structures = pe.structures if pe is not None else ()
    for st in structures:
        out += _structure(ctx, st)
    for e in items:
        el = e.electrical
        if el is None:
            continue
        out += _element(ctx, e.name, el)
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
                         caption="Lengths in the shop's units; loss in dB; power in W.")
    return out


def _element(ctx: Context, name: str, el: ElementElectrical) -> list[Any]:
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
    out = [ctx.p(f"{name}: impedance and SWR", ctx.h3)]
    out += ctx.table(["figure", "value (unit)"], rows, [0.3, 0.7], "ll")
    out.append(_swr_plot(ctx, sw, el.target_hz))
    for note in el.notes:
        out.append(ctx.p(note, ctx.small))
    return out


def _structure(ctx: Context, st: StructureElectrical) -> list[Any]:
    out = [ctx.p(f"The antenna as modelled: {', '.join(st.elements)}", ctx.h3),
           ctx.p("Every conductor as it will be bent and placed (the element's own frame when "
                 "it stands alone), seen from one side and from above; red dots are the feed, "
                 "blue squares the capacitors or loads. "
                 f"{st.unknowns} unknowns; the sweep took {st.solves} full solves.", ctx.small),
           _picture(ctx, st)]
    ff = st.far_field
    rows: list[list[str]] = []
    if ff is not None:
        rows += [["at", format_frequency(ff.f_hz)],
                 ["gain", f"{ff.gain_dbi:.2f} dBi (directivity {ff.directivity_dbi:.2f} dBi)"],
                 ["efficiency", f"{100 * ff.efficiency:.1f} %"],
                 ["strongest towards", f"theta {ff.max_theta_deg:.0f} deg from +z, phi "
                                       f"{ff.max_phi_deg:.0f} deg from +x"]]
        if ff.front_to_back_db is not None:
            rows.append(["front-to-back", f"{ff.front_to_back_db:.1f} dB"])
        if ff.front_to_rear_db is not None:
            rows.append(["front-to-rear", f"{ff.front_to_rear_db:.1f} dB (worst of the rear "
                                          "half)"])
        widths = [f"{w:.0f} deg {plane}" for w, plane in ((ff.beamwidth_h_deg, "horizontal"),
                                                           (ff.beamwidth_v_deg, "vertical"))
                  if w is not None]
        if widths:
            rows.append(["half-power beamwidth", ", ".join(widths)])
        pol = ff.polarisation + (f", axial ratio {ff.axial_ratio_db:.1f} dB"
                                 if ff.axial_ratio_db is not None else "")
        rows.append(["polarisation", pol])
    power = f"{st.power_w:g} W" + ("" if st.power_stated else " (assumed: the design gives none)")
    rows.append([f"largest conductor current at {power}", f"{st.max_current_a_rms:.2f} A RMS"])
    out += ctx.table(["figure", "value (unit)"], rows, [0.3, 0.7], "ll",
                     caption="Gain in dBi includes conductor and capacitor losses; angles in "
                             "degrees.")
    if st.loads:
        lrows = [[ld.name,
                  "-" if ld.capacitance_f is None else
                  f"{ld.capacitance_f * 1e12:.1f}{' (solved)' if ld.solved else ''}",
                  f"{ld.voltage_v_rms:.0f}", f"{ld.voltage_v_peak:.0f}",
                  "-" if ld.rating_v is None else f"{ld.rating_v:.0f}",
                  f"{ld.current_a_rms:.2f}", f"{ld.power_w:.2f}"] for ld in st.loads]
        out += ctx.table(["capacitor or load", "pF", "V RMS", "V peak", "rated V peak",
                          "A RMS", "W lost"], lrows,
                         [0.27, 0.13, 0.11, 0.11, 0.13, 0.11, 0.12], "lrrrrrr",
                         caption=f"At {power} into the feed, at the design frequency. The "
                                 "capacitor's voltage is what destroys capacitors and hurts "
                                 "people: keep hands off while transmitting.")
    if ff is not None:
        out.append(_polar_pair(ctx, ff.azimuth, ff.elevation, ff.gain_dbi))
    if st.band is not None and any(g is not None for g in st.band.gain_dbi):
        out.append(ctx.p("Gain and front-to-back across the band are in the sweep tables of "
                         "`fabplan plan` and `fabplan sweep`.", ctx.small))
    return out


# -- the SWR plot ---------------------------------------------------------------------
def nice_step(span: float, ticks: int = 6) -> float:
    """A round step (1, 2 or 5 times a power of ten) giving about `ticks` intervals."""
    if not span > 0:
        return 1.0
    raw = span / ticks
    mag = 10.0 ** math.floor(math.log10(raw))
    for k in (1.0, 2.0, 5.0, 10.0):
        if raw <= k * mag:
            return k * mag
    return 10.0 * mag


def swr_axis(values: Sequence[float]) -> tuple[float, float, float]:
    """The SWR axis for `values`: from 1 to a round top just above the largest finite
    value (at most 10; SWR beyond is clipped), and its step."""
    finite = [v for v in values if math.isfinite(v)]
    top = min(max(finite, default=2.0), 10.0)
    step = nice_step(top - 1.0, 5)
    top = 1.0 + step * math.ceil((top - 1.0) / step - 1e-9)
    return 1.0, max(top, 1.0 + step), step


def frequency_axes(lp: Any, f_lo: float, f_hi: float, axis: tuple[float, float, float]
                   ) -> tuple[Callable[[float], float], Callable[[float], float]]:
    """Set a reportlab LinePlot's axes for a sweep: MHz from f_lo to f_hi ticked at a round
    step, the value axis (lo, top, step), labels and a light grid. Returns the functions
    from MHz and from a value to the drawing's x and y."""
    from reportlab.lib import colors

    lo, top, step = axis
    lp.yValueAxis.valueMin, lp.yValueAxis.valueMax, lp.yValueAxis.valueStep = lo, top, step
    xstep = nice_step(f_hi - f_lo, 8)
    lp.xValueAxis.valueMin, lp.xValueAxis.valueMax = f_lo, f_hi
    first = xstep * math.ceil(f_lo / xstep - 1e-9)
    lp.xValueAxis.valueSteps = [first + k * xstep
                                for k in range(int((f_hi - first) / xstep + 1e-9) + 1)]
    lp.xValueAxis.labelTextFormat = "%g"
    lp.yValueAxis.labelTextFormat = "%g"
    lp.xValueAxis.labels.fontSize = lp.yValueAxis.labels.fontSize = 7
    grid = colors.Color(0.85, 0.85, 0.85)
    lp.yValueAxis.visibleGrid = lp.xValueAxis.visibleGrid = True
    lp.yValueAxis.gridStrokeColor = lp.xValueAxis.gridStrokeColor = grid
    lp.yValueAxis.gridStrokeWidth = lp.xValueAxis.gridStrokeWidth = 0.3

    def px(f_mhz: float) -> float:
        return float(lp.x + (f_mhz - f_lo) / (f_hi - f_lo) * lp.width)

    def py(v: float) -> float:
        return float(lp.y + (v - lo) / (top - lo) * lp.height)

    return px, py


def frequency_marks(d: Any, lp: Any, px: Callable[[float], float],
                    py: Callable[[float], float], axis: tuple[float, float, float],
                    levels: Sequence[float], target_hz: float | None) -> None:
    """On a sweep's drawing `d` around its plot `lp` (axes from `frequency_axes`): a
    dotted line at each of `levels` inside the value axis, the target as a red dashed
    line, and the frequency axis's title."""
    from reportlab.graphics.shapes import Line, String
    from reportlab.lib import colors

    lo, top, _ = axis
    for level in levels:
        if lo < level < top:
            d.add(Line(lp.x, py(level), lp.x + lp.width, py(level), strokeWidth=0.4,
                       strokeColor=colors.Color(*GREY), strokeDashArray=[1, 2]))
            d.add(String(lp.x + lp.width + 2, py(level) - 2.5, f"{level:g}", fontSize=6,
                         fillColor=colors.Color(*GREY)))
    f_lo, f_hi = lp.xValueAxis.valueMin, lp.xValueAxis.valueMax
    if target_hz is not None and f_lo <= target_hz / 1e6 <= f_hi:
        x = px(target_hz / 1e6)
        d.add(Line(x, lp.y, x, lp.y + lp.height, strokeWidth=0.8,
                   strokeColor=colors.Color(*RED), strokeDashArray=[4, 2]))
        d.add(String(x + 2, lp.y + lp.height - 8, f"target {format_frequency(target_hz)}",
                     fontSize=6.5, fillColor=colors.Color(*RED)))
    d.add(String(d.width / 2, 4, "frequency, MHz", fontSize=7.5, textAnchor="middle"))


def _swr_plot(ctx: Context, sw: SweepResult, target_hz: float | None) -> Any:
    from reportlab.graphics.charts.lineplots import LinePlot
    from reportlab.graphics.shapes import Drawing, String
    from reportlab.lib import colors

    w, h = ctx.frame_w, 160
    d = Drawing(w, h)
    lp = LinePlot()
    lp.x, lp.y, lp.width, lp.height = 45, 28, w - 70, h - 48
    mhz = [f / 1e6 for f in sw.freq_hz]
    both = list(sw.swr_system) + list(sw.swr_terminals)
    lo, top, step = swr_axis(both)
    series = [list(zip(mhz, [min(v, top) for v in sw.swr_system]))]
    if list(sw.swr_terminals) != list(sw.swr_system):
        series.append(list(zip(mhz, [min(v, top) for v in sw.swr_terminals])))
    lp.data = series
    lp.lines[0].strokeColor = colors.Color(*BLUE)
    lp.lines[0].strokeWidth = 1.2
    if len(series) > 1:
        lp.lines[1].strokeColor = colors.Color(*GREY)
        lp.lines[1].strokeDashArray = [3, 2]
    px, py = frequency_axes(lp, min(mhz), max(mhz), (lo, top, step))
    d.add(lp)
    frequency_marks(d, lp, px, py, (lo, top, step), (1.5, 2.0), target_hz)
    d.add(String(4, h - 10, f"SWR (clipped at {top:g})", fontSize=7.5))
    legend = f"solid: at the feed line, against {sw.system_ohm:g} ohm"
    if len(series) > 1:
        legend += f"; dashed: at the element's terminals, against {sw.reference_ohm:g} ohm"
    d.add(String(w, h - 10, legend, fontSize=7, textAnchor="end"))
    return d


# -- polar plots ------------------------------------------------------------------------
def _polar(d: Any, cx: float, cy: float, radius: float, cut: PatternCut, peak_dbi: float,
           title: str, angle_of: Any) -> None:
    """One polar plot: rings every 10 dB below the peak, spokes every 30 deg, the cut."""
    from reportlab.graphics.shapes import Circle, Line, PolyLine, String
    from reportlab.lib import colors

    grey = colors.Color(0.75, 0.75, 0.75)
    for k in range(0, int(PATTERN_RANGE_DB) + 1, 10):
        r = radius * (1 - k / PATTERN_RANGE_DB)
        if r > 0:
            d.add(Circle(cx, cy, r, strokeWidth=0.3 if k else 0.6, strokeColor=grey,
                         fillColor=None))
            d.add(String(cx + 2, cy + r + 1, f"{peak_dbi - k:.0f}" if k == 0 else f"-{k}",
                         fontSize=5.5, fillColor=colors.Color(0.45, 0.45, 0.45)))
    for deg in range(0, 360, 30):
        a = math.radians(deg)
        d.add(Line(cx, cy, cx + radius * math.cos(a), cy + radius * math.sin(a),
                   strokeWidth=0.2, strokeColor=grey))
    pts: list[float] = []
    for ang, g in zip(cut.angle_deg, cut.gain_dbi):
        rel = -PATTERN_RANGE_DB if g is None else max(g - peak_dbi, -PATTERN_RANGE_DB)
        r = radius * (1 + rel / PATTERN_RANGE_DB)
        a = math.radians(angle_of(ang))
        pts += [cx + r * math.cos(a), cy + r * math.sin(a)]
    if len(pts) >= 4:
        d.add(PolyLine(pts, strokeWidth=1.0, strokeColor=colors.Color(*BLUE)))
    d.add(String(cx, cy - radius - 12, title, fontSize=7, textAnchor="middle"))


def _polar_pair(ctx: Context, az: PatternCut, el: PatternCut, peak_dbi: float) -> Any:
    from reportlab.graphics.shapes import Drawing, String

    w = ctx.frame_w
    radius = min(70.0, w / 4 - 20)
    h = 2 * radius + 40
    d = Drawing(w, h)
    cy = radius + 22
    # azimuth: phi measured from +x, counter-clockwise seen from above
    _polar(d, w / 4, cy, radius, az, peak_dbi,
           f"azimuth (phi from +x), at elevation {az.fixed_deg:.0f} deg", lambda a: a)
    # elevation: from the forward horizon (right) up over the zenith to the rear
    _polar(d, 3 * w / 4, cy, radius, el, peak_dbi,
           f"elevation, in the vertical plane at phi {el.fixed_deg:.0f} deg", lambda a: a)
    d.add(String(w / 2, h - 8, f"Gain pattern: rings every 10 dB below the peak "
                               f"({peak_dbi:.1f} dBi)", fontSize=7.5, textAnchor="middle"))
    return d


# -- the picture of the structure ---------------------------------------------------------
def _project(p: tuple[float, float, float], view: str) -> tuple[float, float]:
    x, y, z = p
    if view == "top":  # seen from above: x right, y up
        return x, y
    # an oblique view from the front-left and above: x right, z up, y receding
    return x - 0.45 * y, z + 0.3 * y


def _picture(ctx: Context, st: StructureElectrical) -> Any:
    from reportlab.graphics.shapes import Circle, Drawing, Line, PolyLine, Rect, String
    from reportlab.lib import colors

    w = ctx.frame_w
    half = w / 2 - 10
    h = 150.0
    d = Drawing(w, h)
    for n, view in enumerate(("oblique", "top")):
        pts = [_project(p, view) for wire in st.wires for p in wire.points_mm]
        if not pts:
            continue
        xs, ys = [p[0] for p in pts], [p[1] for p in pts]
        x0, x1, y0, y1 = min(xs), max(xs), min(ys), max(ys)
        span = max(x1 - x0, y1 - y0, 1e-9)
        k = min((half - 20) / max(x1 - x0, 1e-9), (h - 40) / max(y1 - y0, 1e-9),
                (h - 40) / span * 4)
        ox = n * (w / 2) + (half - (x1 - x0) * k) / 2 + 10 - x0 * k
        oy = 25 + ((h - 40) - (y1 - y0) * k) / 2 - y0 * k

        def P(q: tuple[float, float, float], ox: float = ox, oy: float = oy,
              k: float = k, view: str = view) -> tuple[float, float]:
            u, v = _project(q, view)
            return ox + u * k, oy + v * k

        for wire in st.wires:
            coords = [c for q in wire.points_mm for c in P(q)]
            if len(coords) >= 4:
                d.add(PolyLine(coords, strokeWidth=1.1, strokeColor=colors.Color(0.2, 0.2, 0.2)))
        for q in st.feed_points_mm:
            fx, fy = P(q)
            d.add(Circle(fx, fy, 2.6, fillColor=colors.Color(*RED), strokeWidth=0))
        for q in st.load_points_mm:
            lx, ly = P(q)
            d.add(Rect(lx - 2.5, ly - 2.5, 5, 5, fillColor=colors.Color(*BLUE), strokeWidth=0))
        if view == "oblique" and st.ground_z_mm is not None:
            gy = oy + st.ground_z_mm * k
            if 15 <= gy <= h:
                d.add(Line(n * w / 2 + 5, gy, n * w / 2 + half, gy, strokeWidth=0.5,
                           strokeColor=colors.Color(0.4, 0.3, 0.1), strokeDashArray=[4, 2]))
        label = ("oblique view (x right, z up, y receding)" if view == "oblique"
                 else "seen from above (x right, y up)")
        d.add(String(n * w / 2 + half / 2 + 10, 6, label, fontSize=7, textAnchor="middle"))
    return d
