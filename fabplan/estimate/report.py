"""The estimate as text, JSON, CSV and a side-by-side comparison.

These read the Plan (its `ElementEstimate`s and `Order`) and compute no
engineering figure of their own.
"""

from __future__ import annotations

import csv
import io
import json
from typing import Any

from ..render.report import findings_text, plan_to_dict, table
from ..units import IN, format_length
from .costing import LB_KG
from .model import ElementEstimate, Order, order_dict

__all__ = ["element_text", "order_text", "order_csv", "estimate_text", "estimate_json",
           "compare_text", "compare_json", "weight_text"]


def weight_text(kg: float, unit: str = "mm") -> str:
    """`84.8 g`, `1.234 kg`; with pounds beside it when the shop works in inches."""
    text = f"{kg * 1000:.1f} g" if kg < 1 else f"{kg:.3f} kg"
    return f"{text} ({kg / LB_KG:.2f} lb)" if unit == "in" else text


def _money(currency, amount: float | None) -> str:
    if amount is None:
        return "-"
    return currency.format(amount) if currency is not None else f"{amount:.2f}"


def element_text(e: ElementEstimate, unit: str, den: int) -> str:
    line = (f"Weight             {weight_text(e.weight_kg, unit)} each, "
            f"{weight_text(e.batch_weight_kg, unit)} for {e.quantity}")
    if e.cost is not None:
        line += (f"\nCost (stock share) {_money(e.currency, e.cost)} each, "
                 f"{_money(e.currency, e.batch_cost)} for {e.quantity}")
    if e.spares:
        line += f"\nSpares cut         {e.spares}"
    return line


def _cut_groups(piece) -> list[tuple]:
    groups: list[list[Any]] = []
    for c in piece.cuts:
        key = (c.element, round(c.length_mm, 6), c.spare)
        if groups and groups[-1][0] == key:
            groups[-1][1] += 1
        else:
            groups.append([key, 1, c])
    return [(key, n, c) for key, n, c in groups]


def order_text(o: Order, unit: str, den: int) -> str:
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
        rows = [[f.name, L(f.length_mm), L(f.ends_mm), f"{_money(cur, f.price)} per {f.per}",
                 _money(cur, c), f.source] for f, c in zip(o.offers, o.offer_costs)]
        out.append(table(["offer", "length", "unusable each end", "price", "per piece",
                          "source"], rows, "lrrrrl"))
        out.append("")
        out.append("Buy")
        rows = [[str(b.count), b.offer, L(b.length_mm), _money(cur, b.piece_cost),
                 _money(cur, b.cost), weight_text(b.weight_kg, unit)] for b in o.buy]
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
        out.append(f"Stock cost         {_money(cur, o.stock_cost)} (lower bound "
                   f"{_money(cur, o.lower_bound_cost)}); "
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
        rows = [[str(i.quantity), i.name, weight_text(i.weight_each_kg, unit),
                 _money(cur, i.price_each), weight_text(i.weight_kg, unit), _money(cur, i.cost)]
                for i in o.items]
        out.append(table(["qty", "item", "weight each", "price each", "weight", "cost"], rows,
                         "rlrrrr"))
    out.append("")
    out.append(f"Weight built       {weight_text(o.total_weight_kg, unit)} (elements "
               f"{weight_text(o.elements_weight_kg, unit)}, items "
               f"{weight_text(o.items_weight_kg, unit)})")
    if o.offers:
        out.append(f"Weight to ship     {weight_text(o.shipping_weight_kg, unit)} (stock "
                   f"{weight_text(o.stock_weight_kg, unit)}, items "
                   f"{weight_text(o.items_weight_kg, unit)})")
    else:
        out.append("Weight to ship     not known until stock is offered (stock bought is "
                   "longer than the cuts)")
    if o.total_cost is not None:
        out.append(f"Total cost         {_money(cur, o.total_cost)} (stock "
                   f"{_money(cur, o.stock_cost)}, items {_money(cur, o.items_cost or 0.0)})")
    return "\n".join(out)


def _estimate_of(plan) -> Order:
    if plan.order is None:
        raise RuntimeError("the estimate step did not run")
    return plan.order


def estimate_text(plan) -> str:
    """`fabplan estimate`: the bill of material and the purchase plan."""
    shop = plan.design.shop
    unit, den = shop.units, shop.fraction
    order = _estimate_of(plan)
    title = f"{plan.design.project}: material estimate"
    out = [title, "=" * len(title), "",
           f"Stock: {plan.stock.description}; {plan.stock.material_name}; "
           f"{plan.stock.mass_per_m_kg * 1000:.1f} g/m", "", "Bill of material", "-" * 16]
    rows = []
    for e in plan.elements:
        est = e.estimate
        rows.append([e.name, str(e.quantity), str(est.spares),
                     format_length(e.cut_length_mm, unit, den),
                     weight_text(est.weight_kg), weight_text(est.batch_weight_kg),
                     _money(order.currency, est.cost), _money(order.currency, est.batch_cost)])
    out.append(table(["element", "qty", "spares", "cut length", "weight each", "weight batch",
                      "cost each", "cost batch"], rows, "lrrrrrrr"))
    out += ["", order_text(order, unit, den), "", "Findings", "--------", findings_text(plan)]
    return "\n".join(out) + "\n"


def estimate_json(plan) -> str:
    """`fabplan estimate --json`: the elements' weights and costs and the order."""
    full = plan_to_dict(plan)
    keep = ("name", "quantity", "cut_length_mm", "mass_kg", "weight_kg", "cost", "estimate")
    out = {"project": full["project"], "source": full["source"], "units": full["units"],
           "stock": full["stock"],
           "elements": [{k: d[k] for k in keep if k in d} for d in full["elements"]],
           "order": order_dict(_estimate_of(plan)), "findings": full["findings"]}
    return json.dumps(out, indent=2, allow_nan=False) + "\n"


def order_csv(plan) -> str:
    """The cut list, one row per cut (and per remnant), for a spreadsheet."""
    order = _estimate_of(plan)
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(["stock_piece", "offer", "stock_length_mm", "cut", "element", "spare",
                "length_mm", "length_in", "start_mm", "end_mm", "piece_cost"])
    for p in order.pieces:
        for n, c in enumerate(p.cuts, 1):
            w.writerow([p.index, p.offer, f"{p.length_mm:.1f}", n, c.element,
                        "yes" if c.spare else "no", f"{c.length_mm:.1f}",
                        f"{c.length_mm / IN:.3f}", f"{c.start_mm:.1f}",
                        f"{c.start_mm + c.length_mm:.1f}",
                        f"{p.cost:.2f}" if n == 1 and p.cost is not None else ""])
        if p.remnant_mm > 0:
            w.writerow([p.index, p.offer, f"{p.length_mm:.1f}", "", "(remnant)", "",
                        f"{p.remnant_mm:.1f}", f"{p.remnant_mm / IN:.3f}", "", "", ""])
    return buf.getvalue()


def _summary(plan) -> dict[str, Any]:
    o = _estimate_of(plan)
    count = {s: sum(f.severity == s for f in plan.findings) for s in ("error", "warning", "info")}
    return {
        "design": plan.design.source,
        "project": plan.design.project,
        "stock": plan.stock.description,
        "material": plan.stock.material_key,
        "mass_per_m_kg": round(plan.stock.mass_per_m_kg, 6),
        "elements": [f"{e.name} x {e.quantity}" for e in plan.elements],
        "cut_length_mm": round(o.cut_length_mm, 4),
        "weight_built_kg": round(o.total_weight_kg, 5),
        "weight_to_ship_kg": round(o.shipping_weight_kg, 5),
        "buy": [f"{b.count} x {b.offer}" for b in o.buy],
        "pieces_to_buy": o.pieces_to_buy,
        "utilisation": None if o.utilisation is None else round(o.utilisation, 4),
        "currency": None if o.currency is None else o.currency.label,
        "total_cost": None if o.total_cost is None else round(o.total_cost, 2),
        "findings": count,
    }


def compare_json(a, b) -> str:
    """`fabplan compare --json`: the two summaries and whether they build the same elements."""
    sa, sb = _summary(a), _summary(b)
    out = {"a": sa, "b": sb, "same_elements": sa["elements"] == sb["elements"]}
    return json.dumps(out, indent=2, allow_nan=False) + "\n"


def compare_text(a, b) -> str:
    """`fabplan compare`: two stock choices side by side."""
    unit = a.design.shop.units
    sa, sb = _summary(a), _summary(b)
    oa, ob = _estimate_of(a), _estimate_of(b)

    def both(label: str, fa, fb) -> list[str]:
        return [label, fa, fb]

    rows = [
        both("design", sa["design"], sb["design"]),
        both("stock", sa["stock"], sb["stock"]),
        both("material", sa["material"], sb["material"]),
        both("mass per metre", f"{sa['mass_per_m_kg'] * 1000:.1f} g/m",
             f"{sb['mass_per_m_kg'] * 1000:.1f} g/m"),
        both("elements", "; ".join(sa["elements"]), "; ".join(sb["elements"])),
        both("weight built", weight_text(oa.total_weight_kg, unit),
             weight_text(ob.total_weight_kg, unit)),
        both("weight to ship", _shipping(oa, unit), _shipping(ob, unit)),
        both("buy", "; ".join(sa["buy"]) or "-", "; ".join(sb["buy"]) or "-"),
        both("utilisation", _pct(oa.utilisation), _pct(ob.utilisation)),
        both("total cost", _money(oa.currency, oa.total_cost), _money(ob.currency, ob.total_cost)),
        both("findings", _counts(sa["findings"]), _counts(sb["findings"])),
    ]
    out = [table(["", "A", "B"], rows)]
    if sa["elements"] != sb["elements"]:
        out.append("note: the two designs do not build the same elements and quantities")
    if (sa["currency"] is None) != (sb["currency"] is None):
        out.append("note: only one of the designs prices its stock")
    elif sa["currency"] != sb["currency"]:
        out.append("note: the two designs price in different currencies")
    return "\n".join(out) + "\n"


def _shipping(o: Order, unit: str) -> str:
    return weight_text(o.shipping_weight_kg, unit) if o.offers else "- (no stock offered)"


def _pct(x: float | None) -> str:
    return "-" if x is None else f"{100 * x:.1f} %"


def _counts(c: dict[str, int]) -> str:
    return f"{c['error']} error(s), {c['warning']} warning(s), {c['info']} info"
