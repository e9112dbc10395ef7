"""The estimate as the `estimate` and `compare` commands show it: text and JSON.

These read the Plan (its elements' estimates and its order) and compute no
engineering figure of their own. The cut list as CSV is in csv.py.
"""

from __future__ import annotations

import json
from collections.abc import Callable
from typing import Any

from ..estimate.records import Order
from ..plan import Plan
from ..units import LengthUnit, format_frequency, format_length, format_money, format_weight
from .json import num, order_dict, plan_to_dict
from .text import findings_text, order_text, swr_text, table

__all__ = ["estimate_text", "estimate_json", "compare_text", "compare_json",
           "ESTIMATE_FORMAT", "COMPARE_FORMAT", "FORMAT_VERSION"]

ESTIMATE_FORMAT = "fabplan-estimate"
COMPARE_FORMAT = "fabplan-compare"
FORMAT_VERSION = 1  # raised when a key is removed or changes its unit or meaning


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
    if plan.boom is not None and plan.boom.bill:
        out += ["", "Hardware (the boom and its fittings; counted here, priced when listed as "
                    "[[purchase.item]])"]
        out.append(table(["item", "qty", "size", "note"],
                         [[b.item, str(b.quantity), b.size, b.note] for b in plan.boom.bill],
                         "lrll"))
    out += ["", order_text(order, unit, den), "", "Findings", "--------", findings_text(plan)]
    return "\n".join(out) + "\n"


def estimate_json(plan: Plan) -> str:
    """`fabplan estimate --json`: the elements' weights and costs and the order."""
    full = plan_to_dict(plan)
    keep = ("name", "quantity", "cut_length_mm", "mass_kg", "weight_kg", "cost", "estimate")
    out = {"format": ESTIMATE_FORMAT, "format_version": FORMAT_VERSION,
           "project": full["project"], "source": full["source"], "units": full["units"],
           "stock": full["stock"],
           "elements": [{k: d[k] for k in keep if k in d} for d in full["elements"]],
           "order": order_dict(_estimate_of(plan)), "findings": full["findings"]}
    return json.dumps(out, indent=2, allow_nan=False) + "\n"


def _electrical_summary(plan: Plan) -> list[dict[str, Any]] | None:
    """Each fed element's predicted figures (Hz, SWR, fraction), or None when the
    design has no [electrical] table."""
    if plan.design.electrical is None:
        return None
    out = []
    for e in plan.elements:
        el = e.electrical
        if el is None:
            continue
        s = el.sweep
        out.append({
            "element": e.name,
            "target_hz": num(el.target_hz, 1),
            "resonance_hz": num(s.resonance_hz, 1),
            "min_swr": num(s.min_swr, 4),
            "min_swr_hz": num(s.min_swr_hz, 1),
            "bandwidth_hz": {k: num(v, 1) for k, v in s.bandwidth_hz.items()},
            "bandwidth_at_least_hz": {f"{b.level:g}": num(b.width_at_least_hz, 1)
                                      for b in s.bands},
            "bandwidth_beyond_sweep": {
                f"{b.level:g}": [side for side, beyond in (("lower", b.lower_beyond_sweep),
                                                            ("upper", b.upper_beyond_sweep))
                                 if beyond] for b in s.bands},
            "efficiency": num(s.efficiency, 5),
            "uncertainty_frac": s.uncertainty_frac,
        })
    return out


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
        "electrical": _electrical_summary(plan),
    }


def _electrical_differences(sa: dict[str, Any], sb: dict[str, Any]) -> list[dict[str, Any]]:
    """B minus A for each element both designs check electrically (by name):
    resonance and least-SWR frequency (Hz), least SWR, efficiency."""
    if sa["electrical"] is None or sb["electrical"] is None:
        return []
    b_of = {x["element"]: x for x in sb["electrical"]}
    out = []
    for xa in sa["electrical"]:
        xb = b_of.get(xa["element"])
        if xb is None:
            continue
        diff: dict[str, Any] = {"element": xa["element"]}
        for key, places in (("resonance_hz", 1), ("min_swr_hz", 1), ("min_swr", 4),
                            ("efficiency", 5)):
            va, vb = xa[key], xb[key]
            diff[key] = None if va is None or vb is None else num(vb - va, places)
        out.append(diff)
    return out


def compare_json(a: Plan, b: Plan) -> str:
    """`fabplan compare --json`: the two summaries, whether they build the same
    elements, and B minus A for each element both check electrically."""
    sa, sb = _summary(a), _summary(b)
    out = {"format": COMPARE_FORMAT, "format_version": FORMAT_VERSION, "a": sa, "b": sb,
           "same_elements": sa["elements"] == sb["elements"],
           "electrical_differences": _electrical_differences(sa, sb)}
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
    rows += _electrical_rows(sa["electrical"], sb["electrical"])
    out = [table(["", "A", "B"], rows)]
    if sa["elements"] != sb["elements"]:
        out.append("note: the two designs do not build the same elements and quantities")
    if (sa["currency"] is None) != (sb["currency"] is None):
        out.append("note: only one of the designs prices its stock")
    elif sa["currency"] != sb["currency"]:
        out.append("note: the two designs price in different currencies")
    if (sa["electrical"] is None) != (sb["electrical"] is None):
        which = "A" if sb["electrical"] is None else "B"
        out.append(f"note: only design {which} has an [electrical] table: add the same one to "
                   "the other to compare them electrically")
    for d in _electrical_differences(sa, sb):
        out += _difference_lines(d, sa, sb)
    return "\n".join(out) + "\n"


_BANDWIDTH_LIMITS = ("1.5", "2")  # the SWR limits the electrical stage reports


def _electrical_rows(ea: list[dict[str, Any]] | None,
                     eb: list[dict[str, Any]] | None) -> list[list[str]]:
    """Rows of each fed element's predicted figures, A beside B (by element name)."""
    if ea is None and eb is None:
        return []
    a_of = {x["element"]: x for x in ea or []}
    b_of = {x["element"]: x for x in eb or []}
    names = list(a_of) + [n for n in b_of if n not in a_of]
    rows: list[list[str]] = []
    for name in names:
        xa, xb = a_of.get(name), b_of.get(name)
        fig = (("resonance (X = 0)", _resonance), ("least SWR", _least_swr),
               *((f"bandwidth SWR < {k}", _bandwidth(k)) for k in _BANDWIDTH_LIMITS),
               ("efficiency", _efficiency))
        for label, show in fig:
            rows.append([f"{name}: {label}", show(xa), show(xb)])
    return rows


def _resonance(x: dict[str, Any] | None) -> str:
    if x is None:
        return "-"
    hz = x["resonance_hz"]
    return "none in the sweep" if hz is None else format_frequency(hz)


def _least_swr(x: dict[str, Any] | None) -> str:
    if x is None or x["min_swr"] is None:
        return "-"
    return f"{swr_text(x['min_swr'])} at {format_frequency(x['min_swr_hz'])}"


def _bandwidth(limit: str) -> Callable[[dict[str, Any] | None], str]:
    def show(x: dict[str, Any] | None) -> str:
        if x is None:
            return "-"
        hz = x["bandwidth_hz"].get(limit)
        if hz is not None:
            return format_frequency(hz)
        least = x["bandwidth_at_least_hz"].get(limit)
        if least is None:
            return "not reached"
        beyond = " and ".join(x["bandwidth_beyond_sweep"].get(limit, []))
        return f"at least {format_frequency(least)} ({beyond} edge beyond the sweep)"

    return show


def _efficiency(x: dict[str, Any] | None) -> str:
    if x is None or x["efficiency"] is None:
        return "-"
    return f"{100 * x['efficiency']:.1f} %"


def _difference_lines(d: dict[str, Any], sa: dict[str, Any], sb: dict[str, Any]) -> list[str]:
    """What changes electrically from A to B, in words, for one element."""
    a_of = {x["element"]: x for x in sa["electrical"]}
    xa = a_of[d["element"]]
    parts = []
    compared = False
    for key, what in (("resonance_hz", "resonance"), ("min_swr_hz", "least SWR")):
        delta = d[key]
        if delta is None:
            continue
        compared = True
        if delta != 0:
            rel = 100 * delta / xa[key]
            parts.append(f"{what} {_signed_frequency(delta)} ({rel:+.2f} %)")
    if d["efficiency"] is not None:
        compared = True
        if round(100 * d["efficiency"], 1) != 0:
            parts.append(f"efficiency {100 * d['efficiency']:+.1f} points")
    if not compared:
        return []
    if not parts:
        return [f"note: {d['element']}: the same resonance, least SWR and efficiency in both"]
    return [f"note: {d['element']}: B against A: {'; '.join(parts)}"]


def _signed_frequency(hz: float) -> str:
    return ("+" if hz > 0 else "-" if hz < 0 else "") + format_frequency(abs(hz))


def _shipping(o: Order, unit: LengthUnit) -> str:
    return format_weight(o.shipping_weight_kg, unit) if o.offers else "- (no stock offered)"


def _pct(x: float | None) -> str:
    return "-" if x is None else f"{100 * x:.1f} %"


def _counts(c: dict[str, int]) -> str:
    return f"{c['error']} error(s), {c['warning']} warning(s), {c['info']} info"
