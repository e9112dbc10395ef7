"""The core stage: each piece of stock's developed and cut length, bend table and marks.

records.py holds what it adds to the Plan (`PieceCore`, `BendRow`, `Mark`);
stage.py computes them (`plan_pieces`).
"""
