"""The estimate as the `estimate` and `compare` commands show it: text and JSON.

These read the Plan (its elements' estimates and its order) and compute no
engineering figure of their own. The cut list as CSV is in csv.py.
"""

from __future__ import annotations

import json
from typing import Any

from ..estimate.records import Order
from ..plan import Plan
from ..units import LengthUnit, format_length, format_money, format_weight
from .json import order_dict, plan_to_dict
from .text import findings_text, order_text, table

__all__ = ["estimate_text", "estimate_json", "compare_text", "compare_json"]


def _estimate_of(plan: Plan) -> Order:
    if plan.order is None:
        raise RuntimeError("the estimate step did not run")
    return plan.order


def estimate_text(plan: Plan) -> str:
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
        if est is None:
            continue
        rows.append([e.name, str(e.quantity), str(est.spares),
                     format_length(e.cut_length_mm, unit, den),
                     format_weight(est.weight_kg, unit),
                     format_weight(est.batch_weight_kg, unit),
                     format_money(est.cost, order.currency),
                     format_money(est.batch_cost, order.currency)])
    out.append(table(["element", "qty", "spares", "cut length", "weight each", "weight batch",
                      "cost each", "cost batch"], rows, "lrrrrrrr"))
    out += ["", order_text(order, unit, den), "", "Findings", "--------", findings_text(plan)]
    return "\n".join(out) + "\n"


def estimate_json(plan: Plan) -> str:
    """`fabplan estimate --json`: the elements' weights and costs and the order."""
    full = plan_to_dict(plan)
    keep = ("name", "quantity", "cut_length_mm", "mass_kg", "weight_kg", "cost", "estimate")
    out = {"project": full["project"], "source": full["source"], "units": full["units"],
           "stock": full["stock"],
           "elements": [{k: d[k] for k in keep if k in d} for d in full["elements"]],
           "order": order_dict(_estimate_of(plan)), "findings": full["findings"]}
    return json.dumps(out, indent=2, allow_nan=False) + "\n"


def _summary(plan: Plan) -> dict[str, Any]:
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


def compare_json(a: Plan, b: Plan) -> str:
    """`fabplan compare --json`: the two summaries and whether they build the same elements."""
    sa, sb = _summary(a), _summary(b)
    out = {"a": sa, "b": sb, "same_elements": sa["elements"] == sb["elements"]}
    return json.dumps(out, indent=2, allow_nan=False) + "\n"


def compare_text(a: Plan, b: Plan) -> str:
    """`fabplan compare`: two stock choices side by side."""
    unit = a.design.shop.units
    sa, sb = _summary(a), _summary(b)
    oa, ob = _estimate_of(a), _estimate_of(b)

    def both(label: str, fa: str, fb: str) -> list[str]:
        return [label, fa, fb]

    rows = [
        both("design", sa["design"], sb["design"]),
        both("stock", sa["stock"], sb["stock"]),
        both("material", sa["material"], sb["material"]),
        both("mass per metre", f"{sa['mass_per_m_kg'] * 1000:.1f} g/m",
             f"{sb['mass_per_m_kg'] * 1000:.1f} g/m"),
        both("elements", "; ".join(sa["elements"]), "; ".join(sb["elements"])),
        both("weight built", format_weight(oa.total_weight_kg, unit),
             format_weight(ob.total_weight_kg, unit)),
        both("weight to ship", _shipping(oa, unit), _shipping(ob, unit)),
        both("buy", "; ".join(sa["buy"]) or "-", "; ".join(sb["buy"]) or "-"),
        both("utilisation", _pct(oa.utilisation), _pct(ob.utilisation)),
        both("total cost", format_money(oa.total_cost, oa.currency),
             format_money(ob.total_cost, ob.currency)),
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


def _shipping(o: Order, unit: LengthUnit) -> str:
    return format_weight(o.shipping_weight_kg, unit) if o.offers else "- (no stock offered)"


def _pct(x: float | None) -> str:
    return "-" if x is None else f"{100 * x:.1f} %"


def _counts(c: dict[str, int]) -> str:
    return f"{c['error']} error(s), {c['warning']} warning(s), {c['info']} info"
