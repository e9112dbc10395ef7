"""The estimate stage: weight, cost and a purchase plan cut from real stock lengths.

stage.py turns the pieces' cut lengths into an order: the cheapest mix of
stock pieces found by `cutting.pack` (one-dimensional cutting stock with
kerf), the cuts from each piece, offcuts, utilisation, lower bounds, weights
and costs. records.py holds what it adds to the Plan; costing.py prices one
stock piece. Its settings are the design's `[purchase]` table
(fabplan.design.purchase).
"""
