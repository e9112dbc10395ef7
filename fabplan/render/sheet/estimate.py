"""The build sheet's estimate section: bill of material and cutting plan."""

from __future__ import annotations

from typing import Any

from ...units import format_money
from .context import Context, short_name

__all__ = ["order"]


def order(ctx: Context) -> list[Any]:
    """Bill of material and cutting plan from the estimate stage."""
    o = ctx.plan.order
    if o is None:
        return []
    cur = o.currency
    money_unit = f" ({cur.label})" if cur is not None else ""
    out = [ctx.p("Bill of material", ctx.h2)]
    if not o.buy:
        out.append(ctx.p(f"No stock offered in the design: {o.cut_count} cut(s), "
                         f"{ctx.L(o.cut_length_mm)} of stock in all before kerf and ends. Add "
                         "[purchase] offers for a buying and cutting plan."))
    rows = [[short_name(b.offer), ctx.L(b.length_mm), str(b.count), format_money(b.piece_cost, cur),
             format_money(b.cost, cur), f"{b.weight_kg:.3f}", b.source] for b in o.buy]
    for it in o.items:
        rows.append([short_name(it.name), "-", str(it.quantity), format_money(it.price_each, cur),
                     format_money(it.cost, cur), f"{it.weight_kg:.3f}", it.source])
    boom = ([["boom as built", f"{o.supports_weight_kg:.3f}"]] if o.supports_weight_kg
            else [])
    if not rows:
        return out + ctx.table(["weight", "kg"], [["elements as built",
                                                   f"{o.elements_weight_kg:.3f}"]] + boom,
                               [0.3, 0.2], "lr")
    out += ctx.table(["stock or item", "length", "qty", "each" + money_unit,
                      "cost" + money_unit, "weight kg", "source"], rows,
                     [0.2, 0.16, 0.05, 0.11, 0.11, 0.09, 0.28], "lrrrrrl",
                     caption=f"{ctx.lengths_note}; weights in kilograms; money in the "
                             "design's currency" + ("" if cur else " (no prices given)") + ".")
    totals = ([["elements as built", f"{o.elements_weight_kg:.3f} kg", ""]]
              + [[label, f"{kg} kg", ""] for label, kg in boom]
              + [["stock bought", f"{o.stock_weight_kg:.3f} kg", format_money(o.stock_cost, cur)],
                 ["other items", f"{o.items_weight_kg:.3f} kg", format_money(o.items_cost, cur)],
                 ["total (built / to ship)",
                  f"{o.total_weight_kg:.3f} kg / {o.shipping_weight_kg:.3f} kg",
                  format_money(o.total_cost, cur)]])
    out += ctx.table(["totals", "weight (kg)", "cost" + money_unit], totals, [0.3, 0.35, 0.2],
                     "lrr")
    if not o.pieces:
        return out
    out.append(ctx.p("Cutting plan", ctx.h3))
    # a row per cut, so that a long plan (or a long name) breaks across pages
    rows = []
    for p in o.pieces:
        head = [str(p.index), f"{short_name(p.offer)}, {ctx.L(p.length_mm)}"]
        tail = [ctx.L2(p.remnant_mm) if p.remnant_mm > 0 else "none",
                f"{p.utilisation * 100:.0f}"]
        for n, c in enumerate(p.cuts):
            cut = [f"{short_name(c.element)}{' (spare)' if c.spare else ''}",
                   ctx.L2(c.length_mm), ctx.L2(c.start_mm)]
            rows.append(head + cut + tail if n == 0 else ["", ""] + cut + ["", ""])
        if not p.cuts:
            rows.append(head + ["-", "-", "-"] + tail)
    out += ctx.table(["piece", "stock", "cut for element", "length", "starts at (from end A)",
                      "usable offcut", "used %"], rows,
                     [0.06, 0.18, 0.22, 0.15, 0.15, 0.15, 0.07], "lllrrrr",
                     caption=f"{ctx.lengths_note}; kerf {ctx.L(o.kerf_mm)} per "
                             f"cut. {o.cut_count} cuts, {o.pieces_to_buy} stock piece(s); "
                             f"plan by {o.method}"
                             + ("; proven the fewest pieces" if o.proven_optimal else "") + ".")
    return out
