"""`fabplan tune`'s text: the tuned marks in the convention `fabplan plan` prints."""

from __future__ import annotations

import re

from fabplan.render.text import plan_to_text
from fabplan.render.tuning import tune_text
from fabplan.tuning import MarkChange, TuneResult
from fabplan.units import format_length


def test_tuned_marks_read_like_the_plans(example_plan):
    """Issue 15: `tune` printed marks as signed "-1122.1 mm" where `plan` prints
    "A 995.7 mm". Fed the example's own marks as "tuned" (unchanged), `tune` must
    print each from-centre figure exactly as `fabplan plan` does."""
    piece = example_plan.elements[0].piece
    d = example_plan.design
    marks = tuple(MarkChange(m.label, m.from_centre_mm, m.from_centre_mm * 1.01,
                             m.from_end_mm, m.from_end_mm) for m in piece.marks)
    r = TuneResult("70 cm driven element", "side", "resonance", 440e6, 276.2, 278.0, 437e6,
                   440e6, 3, 4, None, 700.0, 704.0, 660.0, 664.0, marks)
    text = "\n".join(tune_text(r, d, d.electrical))
    plan = plan_to_text(example_plan)
    u, den = d.shop.units, d.shop.fraction
    for m in piece.marks:
        new = m.from_centre_mm * 1.01
        if abs(new) < 1e-9:
            assert re.search(rf"{re.escape(m.label)}\s+0 \(centre\)", text)
            continue
        side = "A" if new < 0 else "B"
        assert f"{side} {format_length(abs(new), u, den)}" in text
        # the plan's own line for the mark uses the same side-and-distance form
        assert f"{side} {format_length(abs(m.from_centre_mm), u, den)}" in plan
        # moved 1 % further from the centre: a positive change
        change = format_length(abs(new) - abs(m.from_centre_mm), u, den)
        assert f"+{change.split(' (')[0]}" in text
    rows = text.split("new from end A", 1)[1].splitlines()[2:]
    assert len(rows) == len(piece.marks)
    for m, row in zip(piece.marks, rows):
        # after the mark's name, the half of the stock: never a bare signed figure
        assert row.startswith(m.label)
        assert re.match(r"\s+(A |B |0 \(centre\))", row[len(m.label):]), row
