"""The forming stage: how each piece of stock is bent, and whether it can be.

ends.py (before the core stage: square ends for a bender that cannot make
round ones), stage.py (springback, formers, marks, limits, bend order for each
piece), records.py (what it adds to the Plan), springback.py (the
moment-curvature model), limits.py (minimum radius, strain, thinning, kinks),
formers.py (jig discs and marks), sequence.py (bend order and bender marks).
Its settings are the design's `[forming]` table (fabplan.design.forming).
"""
