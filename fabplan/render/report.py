"""The plan as readable text tables and as JSON.

Both read the Plan and nothing else. Later stages add their part through the
`*_json` and `*_text` hooks at the end of this module.
"""

from __future__ import annotations

import json
from typing import Any

from ..plan import ElementPlan, Plan
from ..units import format_length, format_mm

__all__ = ["plan_to_dict", "plan_to_json", "plan_to_text", "findings_text", "table"]


def _r(x: float, places: int = 4) -> float:
    v = round(float(x), places)
    return 0.0 if v == 0 else v


def _vec(v) -> list[float]:
    return [_r(c) for c in v]


def profile_dict(profile) -> dict[str, Any]:
    if profile.kind == "round":
        return {"profile": "round", "diameter_mm": _r(profile.diameter_mm)}
    if profile.kind == "tube":
        return {"profile": "tube", "od_mm": _r(profile.od_mm), "wall_mm": _r(profile.wall_mm)}
    return {"profile": "strip", "width_mm": _r(profile.width_mm),
            "thickness_mm": _r(profile.thickness_mm)}


def element_dict(e: ElementPlan) -> dict[str, Any]:
    d: dict[str, Any] = {
        "name": e.name,
        "shape": e.spec.shape,
        "quantity": e.quantity,
        "centreline_length_mm": _r(e.centreline_length_mm),
        "developed_length_mm": _r(e.developed_length_mm),
        "trim_per_end_mm": _r(e.trim_mm),
        "cut_length_mm": _r(e.cut_length_mm),
        "feed_gap_mm": None if e.gap_mm is None else _r(e.gap_mm),
        "tail_straight_mm": _r(e.tail_straight_mm),
        "planar": e.planar,
        "mass_kg": _r(e.mass_kg, 5),
        "bends": [{
            "index": b.index,
            "straight_before_mm": _r(b.straight_before_mm),
            "rotation_deg": _r(b.rotation_deg),
            "angle_deg": _r(b.angle_deg),
            "centreline_radius_mm": _r(b.centreline_radius_mm),
            "neutral_radius_mm": _r(b.neutral_radius_mm),
            "pitch_mm": _r(b.pitch_mm),
            "arc_length_mm": _r(b.arc_length_mm),
            "start_from_centre_mm": _r(b.start_from_centre_mm),
            "end_from_centre_mm": _r(b.end_from_centre_mm),
            "start_from_end_mm": _r(b.start_from_end_mm),
            "end_from_end_mm": _r(b.end_from_end_mm),
            "start_point_mm": _vec(b.start_point),
            "end_point_mm": _vec(b.end_point),
        } for b in e.bends],
        "marks": [{"label": m.label, "kind": m.kind, "from_centre_mm": _r(m.from_centre_mm),
                   "from_end_mm": _r(m.from_end_mm)} for m in e.marks],
    }
    for ext in (e.forming, e.estimate, e.electrical):
        if ext is not None:
            ext.extend_json(d)
    return d


def plan_to_dict(plan: Plan) -> dict[str, Any]:
    s = plan.stock
    design = plan.design
    out: dict[str, Any] = {
        "project": design.project,
        "source": design.source,
        "units": {"lengths": "mm", "mass": "kg", "angles": "deg"},
        "shop": {"display_units": design.shop.units, "fraction": design.shop.fraction,
                 "kerf_mm": _r(design.shop.kerf_mm), "trim_per_end_mm": _r(design.shop.trim_mm)},
        "stock": {
            "description": s.description,
            **profile_dict(s.profile),
            "material": s.material_key,
            "material_name": s.material_name,
            "material_source": s.material_source,
            "dimension_source": s.source,
            "k_factor": s.k_factor,
            "mass_per_m_kg": _r(s.mass_per_m_kg, 6),
        },
        "elements": [element_dict(e) for e in plan.elements],
        "findings": [f.to_dict() for f in plan.findings],
    }
    for ext_name in ("order", "electrical"):
        ext = getattr(plan, ext_name)
        if ext is not None:
            ext.extend_json(out)
    return out


def plan_to_json(plan: Plan) -> str:
    return json.dumps(plan_to_dict(plan), indent=2, sort_keys=False, allow_nan=False) + "\n"


def table(headers: list[str], rows: list[list[str]], align: str | None = None) -> str:
    """A plain text table; `align` has one 'l' or 'r' per column."""
    widths = [len(h) for h in headers]
    for row in rows:
        widths = [max(w, len(c)) for w, c in zip(widths, row)]
    align = align or "l" * len(headers)

    def fmt(row: list[str]) -> str:
        cells = [c.ljust(w) if a == "l" else c.rjust(w) for c, w, a in zip(row, widths, align)]
        return "  ".join(cells).rstrip()

    lines = [fmt(headers), "  ".join("-" * w for w in widths)]
    lines += [fmt(r) for r in rows]
    return "\n".join(lines)


def findings_text(plan: Plan) -> str:
    if not plan.findings:
        return "No findings: every check passed."
    lines = []
    for f in plan.findings:
        where = f"[{f.element}] " if f.element else ""
        lines.append(f"{f.severity.upper():7} {f.code}: {where}{f.message}")
    return "\n".join(lines)


def plan_to_text(plan: Plan) -> str:
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
        out.append(f"Developed length   {L(e.developed_length_mm)}")
        if e.gap_mm is not None:
            out.append(f"Feed gap           {L(e.gap_mm)} (not included above)")
        out.append(f"Trim per end       {L(e.trim_mm)}")
        out.append(f"Cut length         {L(e.cut_length_mm)}")
        out.append(f"Mass (cut piece)   {e.mass_kg * 1000:.1f} g")
        out.append("")
        out.append("Bend table (trade order from end A; lengths on the centreline)")
        rows = [[str(b.index), L(b.straight_before_mm), f"{b.rotation_deg:g}",
                 f"{b.angle_deg:g}", L(b.centreline_radius_mm)]
                + ([format_mm(b.pitch_mm)] if b.pitch_mm else [])
                for b in e.bends]
        head = ["bend", "straight before", "rotation deg", "angle deg", "centreline radius"]
        if any(b.pitch_mm for b in e.bends):
            head.append("pitch")
            rows = [r + [""] * (len(head) - len(r)) for r in rows]
        out.append(table(head, rows, "lrrrr" + "r" * (len(head) - 5)))
        out.append(f"then {L(e.tail_straight_mm)} straight to end B")
        out.append("")
        out.append("Marks on the straight stock (from the centre mark towards end A or B; "
                   "and from cut end A)")
        rows = [[m.label, signed(m.from_centre_mm), L(m.from_end_mm)] for m in e.marks]
        out.append(table(["mark", "from centre", "from end A"], rows, "lrr"))
        out.append("")
        for ext in (e.forming, e.estimate, e.electrical):
            if ext is not None:
                out.append(ext.text(unit, den))
                out.append("")
    for ext in (plan.order, plan.electrical):
        if ext is not None:
            out.append(ext.text(unit, den))
            out.append("")
    out.append("Findings")
    out.append("--------")
    out.append(findings_text(plan))
    return "\n".join(out) + "\n"
