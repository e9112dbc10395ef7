"""Comma-separated files: the electrical sweep and the cut list, each written here once."""

from __future__ import annotations

import csv
import io
import math
from collections.abc import Iterable

from ..em.records import SweepResult
from ..plan import Plan
from ..units import IN, format_number

__all__ = ["SWEEP_COLUMNS", "sweep_csv", "plan_sweep_csv", "order_csv"]

SWEEP_COLUMNS = ("element", "f_hz", "r_ohm", "x_ohm", "swr_terminals", "swr_system")


def _swr(s: float) -> str:
    return f"{s:.5f}" if math.isfinite(s) else "inf"


def sweep_csv(sweeps: Iterable[tuple[str, SweepResult]]) -> str:
    """Every point of each (element name, sweep): Hz, ohm, SWR at the terminals and
    through the matching (`fabplan sweep --csv` and the build's sweep.csv)."""
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(SWEEP_COLUMNS)
    for name, s in sweeps:
        for f, z, a, b in zip(s.freq_hz, s.z_ohm, s.swr_terminals, s.swr_system):
            w.writerow([name, f"{f:.1f}", format_number(z.real, 4), format_number(z.imag, 4),
                        _swr(a), _swr(b)])
    return buf.getvalue()


def plan_sweep_csv(plan: Plan) -> str | None:
    """The plan's sweeps as CSV, or None when the electrical check has not run."""
    sweeps = [(e.name, e.electrical.sweep) for e in plan.elements if e.electrical is not None]
    return sweep_csv(sweeps) if sweeps else None


def order_csv(plan: Plan) -> str:
    """The cut list, one row per cut (and per remnant), for a spreadsheet."""
    order = plan.order
    if order is None:
        raise ValueError("the plan has no order")
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
