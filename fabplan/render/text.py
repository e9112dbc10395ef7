"""The Plan as readable text: the plan's tables, each stage's block, the findings.

Everything here reads the Plan (or one of its records) and formats it with
fabplan.units; nothing computes an engineering figure.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from typing import Any

from ..boom.records import BoomPlan
from ..em.records import BandFigures, ElementElectrical, PlanElectrical, StructureElectrical
from ..errors import Finding
from ..estimate.records import Cut, ElementEstimate, Order, StockPiece
from ..forming.records import ElementForming
from ..measure.analysis import Band
from ..plan import PiecePlan, Plan
from ..units import (
    LengthUnit,
    format_angle,
    format_frequency,
    format_length,
    format_mm,
    format_money,
    format_weight,
)
from .loops import circular_lines, helix_lines, loop_lines, qfh_lines

__all__ = ["table", "findings_text", "findings_lines", "plan_to_text", "forming_text",
           "estimate_text", "order_text", "electrical_summary_lines", "sweep_lines",
           "electrical_text", "plan_electrical_text", "swr_text", "band_text",
           "structure_lines"]


def table(headers: Sequence[str], rows: Sequence[Sequence[str]], align: str | None = None) -> str:
    """A plain text table; `align` has one 'l' or 'r' per column."""
    widths = [len(h) for h in headers]
    for row in rows:
        widths = [max(w, len(c)) for w, c in zip(widths, row)]
    align = align or "l" * len(headers)

    def fmt(row: Sequence[str]) -> str:
        cells = [c.ljust(w) if a == "l" else c.rjust(w) for c, w, a in zip(row, widths, align)]
        return "  ".join(cells).rstrip()

    lines = [fmt(headers), "  ".join("-" * w for w in widths)]
    lines += [fmt(r) for r in rows]
    return "\n".join(lines)


def _right_table(headers: list[str], rows: list[list[str]]) -> str:
    return table(headers, rows, "l" + "r" * (len(headers) - 1))


def findings_lines(findings: Sequence[Finding]) -> list[str]:
    """One line per finding: severity, code, element and message."""
    lines = []
    for f in findings:
        where = f"[{f.element}] " if f.element else ""
        lines.append(f"{f.severity.upper():7} {f.code}: {where}{f.message}")
    return lines


def findings_text(plan: Plan) -> str:
    if not plan.findings:
        return "No findings: every check passed."
    return "\n".join(findings_lines(plan.findings))


def _piece_text(p: PiecePlan, gap_mm: float | None, L: Callable[[float], str],
                signed: Callable[[float], str]) -> list[str]:
    out = [f"Developed length   {L(p.developed_length_mm)}"]
    if gap_mm is not None:
        out.append(f"Feed gap           {L(gap_mm)} (not included above)")
    out.append(f"Trim per end       {L(p.trim_mm)}")
    out.append(f"Cut length         {L(p.cut_length_mm)}")
    out.append(f"Mass (cut piece)   {p.mass_kg * 1000:.1f} g")
    out.append("")
    if not p.bends:
        out.append("No bends: cut to length and mark; nothing to form.")
        out.append("")
    else:
        out += _bend_table(p, L)
    out.append("Marks on the straight stock (from the centre mark towards end A or B; "
               "and from cut end A)")
    rows = [[m.label, signed(m.from_centre_mm), L(m.from_end_mm)] for m in p.marks]
    out.append(table(["mark", "from centre", "from end A"], rows, "lrr"))
    out.append("")
    return out


def _bend_table(p: PiecePlan, L: Callable[[float], str]) -> list[str]:
    out = ["Bend table (trade order from end A; lengths on the centreline)"]
    rows = [[str(b.index), L(b.straight_before_mm), format_angle(b.rotation_deg),
             format_angle(b.angle_deg), L(b.centreline_radius_mm)]
            + ([L(b.pitch_mm)] if b.pitch_mm else [])
            for b in p.bends]
    head = ["bend", "straight before", "rotation deg", "angle deg", "centreline radius"]
    if any(b.pitch_mm for b in p.bends):
        head.append("pitch")
        rows = [r + [""] * (len(head) - len(r)) for r in rows]
    out.append(table(head, rows, "lrrrr" + "r" * (len(head) - 5)))
    out.append(f"then {L(p.tail_straight_mm)} straight to end B")
    out.append("")
    return out


def plan_to_text(plan: Plan) -> str:
    """`fabplan plan`: every figure as readable tables, lengths in the shop's units."""
    shop = plan.design.shop
    unit, den = shop.units, shop.fraction

    def L(mm: float) -> str:
        return format_length(mm, unit, den)

    def signed(mm: float) -> str:
        if abs(mm) < 1e-9:
            return "0 (centre)"
        side = "A" if mm < 0 else "B"
        return f"{side} {L(abs(mm))}"

    s = plan.stock
    out = [f"{plan.design.project}", "=" * len(plan.design.project), "",
           f"Stock: {s.description}; {s.material_name}",
           f"  {s.mass_per_m_kg * 1000:.1f} g/m; properties: {s.material_source}",
           f"  dimensions: {s.source}; K-factor {s.k_factor:g}", ""]
    for e in plan.elements:
        title = f"Element: {e.name} ({e.spec.shape}) x {e.quantity}"
        out += [title, "-" * len(title)]
        for piece in e.pieces:
            if piece.label:
                head = f"Piece: {piece.label}"
                out += [head, "." * len(head)]
            gap = e.feed_gap_mm if len(e.pieces) == 1 else piece.gap_mm
            out += _piece_text(piece, gap, L, signed)
            if piece.forming is not None and piece.bends:
                out.append(forming_text(piece.forming, unit, den))
                out.append("")
        if qfh := qfh_lines(plan, e, L):
            out += qfh + [""]
        if e.estimate is not None:
            out.append(estimate_text(e.estimate, unit))
            out.append("")
        if e.electrical is not None:
            st = plan.electrical.structures if plan.electrical is not None else ()
            band = st[e.electrical.structure].band if e.electrical.structure < len(st) else None
            out.append(electrical_text(e.electrical, band))
            out.append("")
    if plan.boom is not None:
        out += boom_lines(plan.boom, L)
    if plan.order is not None:
        out.append(order_text(plan.order, unit, den))
        out.append("")
    if plan.electrical is not None:
        out.append(plan_electrical_text(plan.electrical, unit, den))
        out.append("")
    out.append("Findings")
    out.append("--------")
    out.append(findings_text(plan))
    return "\n".join(out) + "\n"


def forming_text(self: ElementForming, unit: LengthUnit, den: int) -> str:
    """A readable block for `fabplan plan` (lengths in the shop's units)."""

    def L(mm: float) -> str:
        return format_length(mm, unit, den)

    method = self.method
    out = ["Forming (springback from the section and the stress-strain law"
           + (", calibrated from the test bend" if self.calibrated else "")
           + ")"]
    if self.effective_yield_mpa is not None:
        out.append(f"  effective yield {self.effective_yield_mpa:.0f} MPa; "
                   "the stock springs straight back from any radius over "
                   + (L(self.elastic_limit_radius_mm)
                      if self.elastic_limit_radius_mm is not None else "-"))
    rows = []
    for b in self.bends:
        final = "straight" if b.final_radius_mm == float("inf") else L(b.final_radius_mm)
        rows.append([str(b.index), L(b.former_radius_mm), L(2 * b.former_radius_mm),
                     f"{b.overbend_deg:.1f}", f"{b.springback_deg:.1f}", final,
                     f"{100 * b.outer_strain:.1f}"])
    head = ["bend", {"former": "former radius", "rolled": "roll to inside radius"}.get(
        method, "die radius"),
            "diameter", "bend to deg", "springback deg", "final radius", "strain %"]
    out.append(_right_table(head, rows))
    if self.formers:
        out.append("Jig formers (disc centres in the drawing plane)")
        rows = [[f.label, ", ".join(map(str, f.bend_indices)),
                 f"{f.centre_mm[0]:.1f}, {f.centre_mm[1]:.1f} mm", L(2 * f.radius_mm),
                 f"{f.wrap_deg:.1f}"] for f in self.formers]
        out.append(_right_table(["former", "bends", "centre x, y", "diameter", "wrap deg"],
                                rows))
        if self.former_spacing_mm:
            out.append("  centre to centre: " + "; ".join(L(x) for x in
                                                          self.former_spacing_mm))
    if self.splay_if_ignored_mm is not None:
        out.append(f"  if springback were ignored the legs would splay by "
                   f"{L(self.splay_if_ignored_mm)} at their ends")
    if self.tool_marks:
        out.append("Bender marks, in bend order (line the pencil mark up with the tool's "
                   f"{self.tool_marks[0].tool_reference} mark)")
        rows = [[str(t.step), str(t.bend_index), _signed(t.from_centre_mm, L),
                 L(t.from_end_mm), f"{t.bend_to_deg:.1f}",
                 "-" if t.setback_mm is None else L(t.setback_mm),
                 "-" if t.gain_mm is None else L(t.gain_mm)] for t in self.tool_marks]
        out.append(_right_table(["step", "bend", "from centre", "from end A", "bend to deg",
                                 "setback", "gain"], rows))
    elif self.bend_order:
        out.append("Bend order: " + ", ".join(map(str, self.bend_order)))
    out += [f"  note: {n}" for n in self.notes]
    return "\n".join(out)


def _signed(mm: float, L: Callable[[float], str]) -> str:
    if abs(mm) < 1e-9:
        return "0 (centre)"
    return f"{'A' if mm < 0 else 'B'} {L(abs(mm))}"


def estimate_text(e: ElementEstimate, unit: LengthUnit) -> str:
    line = (f"Weight             {format_weight(e.weight_kg, unit)} each, "
            f"{format_weight(e.batch_weight_kg, unit)} for {e.quantity}")
    if e.cost is not None:
        line += (f"\nCost (stock share) {format_money(e.cost, e.currency)} each, "
                 f"{format_money(e.batch_cost, e.currency)} for {e.quantity}")
    if e.spares:
        line += f"\nSpares cut         {e.spares}"
    return line


def _cut_groups(piece: StockPiece) -> list[tuple[tuple[str, float, bool], int, Cut]]:
    groups: list[list[Any]] = []
    for c in piece.cuts:
        key = (c.element, round(c.length_mm, 6), c.spare)
        if groups and groups[-1][0] == key:
            groups[-1][1] += 1
        else:
            groups.append([key, 1, c])
    return [(key, n, c) for key, n, c in groups]


def order_text(o: Order, unit: LengthUnit, den: int) -> str:
    def L(mm: float) -> str:
        return format_length(mm, unit, den)

    cur = o.currency
    out = ["Purchase plan", "-------------"]
    if not o.offers:
        out.append(f"No stock offered in the design: {o.cut_count} cut(s), "
                   f"{L(o.cut_length_mm)} of stock before kerf and ends.")
    else:
        out.append(f"Kerf {L(o.kerf_mm)} after each cut; cuts are placed from end A of each "
                   "piece, after its unusable end.")
        out.append("")
        out.append("Stock offered")
        rows = [[f.name, L(f.length_mm), L(f.ends_mm), f"{format_money(f.price, cur)} per {f.per}",
                 format_money(c, cur), f.source] for f, c in zip(o.offers, o.offer_costs)]
        out.append(table(["offer", "length", "unusable each end", "price", "per piece",
                          "source"], rows, "lrrrrl"))
        out.append("")
        out.append("Buy")
        rows = [[str(b.count), b.offer, L(b.length_mm), format_money(b.piece_cost, cur),
                 format_money(b.cost, cur), format_weight(b.weight_kg, unit)] for b in o.buy]
        out.append(table(["count", "offer", "length", "each", "cost", "weight"], rows,
                         "rlrrrr"))
        out.append("")
        out.append("Cutting plan")
        for p in o.pieces:
            out.append(f"  piece {p.index}: {p.offer} ({L(p.length_mm)})")
            for _, n, c in _cut_groups(p):
                spare = " (spare)" if c.spare else ""
                out.append(f"    {n} x {L(c.length_mm)}  {c.element}{spare}")
            rest = f"remnant {L(p.remnant_mm)}" if p.remnant_mm > 0 else "no remnant"
            out.append(f"    {rest}; uses {100 * p.utilisation:.1f} % of the piece")
        out.append("")
        out.append(f"Pieces to buy      {o.pieces_to_buy} (lower bound {o.lower_bound_pieces}: "
                   "total of cuts and kerfs / longest usable stock, rounded up)")
        out.append(f"Stock cost         {format_money(o.stock_cost, cur)} (lower bound "
                   f"{format_money(o.lower_bound_cost, cur)}); "
                   + ("proven cheapest" if o.proven_optimal else "not proven cheapest")
                   + f" by {o.method}")
        out.append(f"Utilisation        {100 * (o.utilisation or 0):.1f} % "
                   f"({L(o.cut_length_mm)} of cuts from {L(o.stock_length_mm)} of stock)")
        offcuts = [p.remnant_mm for p in o.pieces if p.remnant_mm > 0]
        if offcuts:
            out.append("Offcuts            " + ", ".join(L(x) for x in offcuts))
    if o.items:
        out.append("")
        out.append("Other items")
        rows = [[str(i.quantity), i.name, format_weight(i.weight_each_kg, unit),
                 format_money(i.price_each, cur), format_weight(i.weight_kg, unit),
                 format_money(i.cost, cur)]
                for i in o.items]
        out.append(table(["qty", "item", "weight each", "price each", "weight", "cost"], rows,
                         "rlrrrr"))
    out.append("")
    boom = (f", boom {format_weight(o.supports_weight_kg, unit)}" if o.supports_weight_kg
            else "")
    out.append(f"Weight built       {format_weight(o.total_weight_kg, unit)} (elements "
               f"{format_weight(o.elements_weight_kg, unit)}{boom}, items "
               f"{format_weight(o.items_weight_kg, unit)})")
    if o.offers:
        out.append(f"Weight to ship     {format_weight(o.shipping_weight_kg, unit)} (stock "
                   f"{format_weight(o.stock_weight_kg, unit)}, items "
                   f"{format_weight(o.items_weight_kg, unit)})")
    else:
        out.append("Weight to ship     not known until stock is offered (stock bought is "
                   "longer than the cuts)")
    if o.total_cost is not None:
        out.append(f"Total cost         {format_money(o.total_cost, cur)} (stock "
                   f"{format_money(o.stock_cost, cur)}, items "
                   f"{format_money(o.items_cost or 0.0, cur)})")
    return "\n".join(out)


def swr_text(s: float) -> str:
    return "inf" if not math.isfinite(s) else (f"{s:.2f}" if s < 100 else f"{s:.0f}")


def electrical_summary_lines(self: ElementElectrical) -> list[str]:
    """The predicted figures, each frequency with its uncertainty."""
    s = self.sweep
    u = s.uncertainty_frac
    lines = [f"Electrical check (thin-wire method of moments, {self.unknowns} unknowns)"]
    if self.geometry:
        lines.append(f"  geometry: {self.geometry}")
    lines.append(f"  matching: {s.matching}; SWR at the terminals against "
                 f"{s.reference_ohm:g} ohm")

    def freq(hz: float | None) -> str:
        if hz is None:
            return "none in the sweep"
        return f"{format_frequency(hz)} +- {format_frequency(u * hz)} ({u * 100:.1f} %)"

    rows = []
    if self.target_hz is not None:
        rows.append(("target", format_frequency(self.target_hz)))
    off = ""
    if self.target_hz is not None:
        off = f"; {100 * (s.min_swr_hz / self.target_hz - 1):+.2f} % from the target"
    rows.append(("least SWR", f"{swr_text(s.min_swr)} at {freq(s.min_swr_hz)}{off}"))
    rows.append(("resonance (X = 0)", freq(s.resonance_hz)))
    for band in s.bands:
        rows.append((f"bandwidth SWR < {band.level:g}", band_text(band)))
    if s.efficiency is not None:
        rows.append(("efficiency", f"{100 * s.efficiency:.1f} % at least SWR"))
    width = max(len(r[0]) for r in rows)
    lines += [f"  {name.ljust(width)}  {value}" for name, value in rows]
    return lines

def _db_text(x: float | None) -> str:
    return "-" if x is None else f"{x:.2f}"


def sweep_lines(self: ElementElectrical, max_rows: int | None = 21,
                band: BandFigures | None = None) -> list[str]:
    """The sweep as a table (every k-th point when there are more than `max_rows`);
    with the structure's `band` figures, its gain and front-to-back at each point."""
    s = self.sweep
    head = f"  {'MHz':>10}  {'R ohm':>9}  {'X ohm':>9}  {'SWR term':>8}  {'SWR sys':>8}"
    if band is not None:
        head += f"  {'gain dBi':>8}  {'F/B dB':>7}  {'BW h deg':>8}"
    lines = [head]
    n = len(s.freq_hz)
    stride = 1 if max_rows is None else max(1, math.ceil(n / max_rows))
    picks = list(range(0, n, stride))
    if picks and picks[-1] != n - 1:
        picks.append(n - 1)
    for i in picks:
        z = s.z_ohm[i]
        row = (f"  {s.freq_hz[i] / 1e6:10.3f}  {z.real:9.1f}  {z.imag:9.1f}  "
               f"{swr_text(s.swr_terminals[i]):>8}  {swr_text(s.swr_system[i]):>8}")
        if band is not None and i < len(band.gain_dbi):
            bw = band.beamwidth_h_deg[i] if i < len(band.beamwidth_h_deg) else None
            row += (f"  {_db_text(band.gain_dbi[i]):>8}  {_db_text(band.front_to_back_db[i]):>7}"
                    f"  {'-' if bw is None else f'{bw:.0f}':>8}")
        lines.append(row)
    if stride > 1:
        lines.append(f"  (every {stride}th of {n} points; `fabplan sweep` lists them all)")
    return lines


def band_text(band: Band) -> str:
    """An SWR band as a builder reads it: its width and edges, and which edge lies
    beyond the sweep when one does."""
    if not band.reached:
        return f"not reached (the least SWR is not below {band.level:g})"
    lo = (format_frequency(band.lower.frequency_hz) if band.lower is not None
          else f"below {format_frequency(band.sweep_start_hz)} (beyond the sweep)")
    hi = (format_frequency(band.upper.frequency_hz) if band.upper is not None
          else f"above {format_frequency(band.sweep_stop_hz)} (beyond the sweep)")
    if band.width_hz is not None:
        return f"{format_frequency(band.width_hz)} ({lo} to {hi})"
    return f"at least {format_frequency(band.width_at_least_hz or 0.0)} ({lo} to {hi})"


def structure_lines(st: StructureElectrical) -> list[str]:
    """The antenna as modelled: its far field at the design frequency, its loads and
    currents at the design's power."""
    names = ", ".join(st.elements)
    lines = [f"The antenna as modelled ({names}): {st.unknowns} unknowns, "
             f"{st.solves} full solves for the sweep"]
    ff = st.far_field
    if ff is not None:
        rows = [("at", format_frequency(ff.f_hz)),
                ("gain", f"{ff.gain_dbi:.2f} dBi (directivity {ff.directivity_dbi:.2f} dBi, "
                         f"efficiency {100 * ff.efficiency:.1f} %)"),
                ("strongest towards", f"theta {ff.max_theta_deg:.0f} deg, phi "
                                      f"{ff.max_phi_deg:.0f} deg (theta from +z, phi from +x)")]
        if ff.front_to_back_db is not None:
            rows.append(("front-to-back", f"{ff.front_to_back_db:.1f} dB"))
        if ff.front_to_rear_db is not None:
            rows.append(("front-to-rear", f"{ff.front_to_rear_db:.1f} dB"))
        widths = [f"{w:.0f} deg {plane}" for w, plane in ((ff.beamwidth_h_deg, "horizontal"),
                                                           (ff.beamwidth_v_deg, "vertical"))
                  if w is not None]
        if widths:
            rows.append(("half-power beamwidth", ", ".join(widths)))
        pol = ff.polarisation
        if ff.axial_ratio_db is not None:
            pol += f", axial ratio {ff.axial_ratio_db:.1f} dB"
        rows.append(("polarisation", pol))
        width = max(len(r[0]) for r in rows)
        lines += [f"  {name.ljust(width)}  {value}" for name, value in rows]
        lines += circular_lines(ff)
    power = f"{st.power_w:g} W" + ("" if st.power_stated else " (no [electrical] power given)")
    lines.append(f"  at {power}: largest conductor current {st.max_current_a_rms:.2f} A RMS")
    for ld in st.loads:
        value = ("" if ld.capacitance_f is None else
                 f"{ld.capacitance_f * 1e12:.1f} pF{' (solved)' if ld.solved else ''}, ")
        lines.append(f"  {ld.name}: {value}{ld.voltage_v_rms:.0f} V RMS "
                     f"({ld.voltage_v_peak:.0f} V peak), {ld.current_a_rms:.2f} A RMS, "
                     f"{ld.power_w:.2f} W lost in it"
                     + (f"; rated {ld.rating_v:.0f} V" if ld.rating_v is not None else ""))
    if st.helix is not None:
        lines += helix_lines(st.helix)
    if st.loop is not None:
        lines += loop_lines(st.loop)
    return lines


def electrical_text(el: ElementElectrical, band: BandFigures | None = None) -> str:
    lines = electrical_summary_lines(el) + [""] + sweep_lines(el, band=band)
    lines += [f"  note: {note}" for note in el.notes]
    return "\n".join(lines)


def plan_electrical_text(self: PlanElectrical, unit: LengthUnit, den: int) -> str:
    lines = ["Electrical: matching and cautions", "---------------------------------",
             f"Matching: {self.matching}", f"Ground: {self.ground}"]
    if self.balun_loop_cut_length_mm is not None:
        lines.append(f"Cut list: balun loop of {self.balun_cable}, "
                     f"{format_length(self.balun_loop_cut_length_mm, unit, den)} "
                     "(half an electrical wavelength x velocity factor, between its two "
                     "connection points; check the cable's velocity factor first)")
    if self.feed_line_loss_db is not None:
        lines.append(f"Feed line matched loss: {self.feed_line_loss_db:.2f} dB")
    lines.append(f"Predicted frequencies carry about +-{100 * self.uncertainty_frac:.1f} % "
                 "uncertainty, dominated by the terminal and feed geometry.")
    for st in self.structures:
        lines += [""] + structure_lines(st)
    lines += [""] if self.structures else []
    lines += [f"CAUTION: {c}" for c in self.cautions]
    return "\n".join(lines)


def boom_lines(b: BoomPlan, L: Callable[[float], str]) -> list[str]:
    """`fabplan plan`: the boom, each element on it, its holes and hardware."""
    head = "Boom"
    out = [head, "-" * len(head),
           f"{b.description}, {L(b.length_mm)} long, {b.material} ({b.mass_kg * 1000:.0f} g); "
           f"x {b.quantity}",
           f"positions from the {b.datum} end (the datum); mounting {b.mounting}; "
           + ("the boom is modelled as a conductor" if b.modelled else
              "the boom's effect is the boom correction"), ""]
    rows = [[m.element, L(m.position_mm), m.mounting, format_mm(m.correction_mm, 2),
             L(sum(p.cut_length_mm for p in m.pieces)), m.applied] for m in b.mounts]
    out.append(table(["element", "from datum", "mounting", "correction mm", "cut length",
                      "how"], rows, "lrlrrl"))
    out += ["", "Drilling (from the datum; angle round the boom, 0 on top)"]
    rows = [[f"H{n}", h.label, L(h.from_datum_mm), f"{h.angle_deg:g}",
             format_mm(h.diameter_mm, 1), "through" if h.through else "", h.purpose]
            for n, h in enumerate(b.drilling.holes, 1)]
    out.append(table(["hole", "for", "from datum", "angle deg", "diameter", "", "purpose"],
                     rows, "llrrrll"))
    out += ["", "Hardware"]
    out.append(table(["item", "qty", "size"], [[x.item, str(x.quantity), x.size or "-"]
                                               for x in b.bill], "lrl"))
    if b.balance_mm is not None:
        out.append(f"balances {L(b.balance_mm)} from the datum")
    out.append("")
    return out
