"""Material estimate: weight, cost and a purchase plan cut from real stock lengths.

The design's `[purchase]` table (read by `config.read_purchase`) lists the
currency, the stock offered (`[[purchase.offer]]`: length, price per piece,
per length or per weight, unusable ends) and extra line items
(`[[purchase.item]]`: balun, hardware). `planning.apply` turns the Plan's cut
lengths into an order: the cheapest mix of stock pieces found by
`cutting.pack` (one-dimensional cutting stock with kerf), the cuts from each
piece, offcuts, utilisation, lower bounds, weights and costs.

    config.py    [purchase] tables -> PurchaseSettings (currency, offers, items, spares)
    cutting.py   the cutting-stock solver: pieces per stock, heuristics, exact search, bounds
    costing.py   price units -> cost of one stock piece; currency formatting
    planning.py  Plan -> Plan with ElementEstimate per element and an Order
    model.py     the records added to the Plan (extend_json / text hooks)
    report.py    text, CSV and side-by-side comparison (read the Plan only)
"""

from __future__ import annotations

__all__: list[str] = []
