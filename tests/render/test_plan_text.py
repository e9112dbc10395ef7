"""`fabplan plan`'s text: sections that say something, none left empty."""

from __future__ import annotations

from fabplan.render.text import plan_to_text

STRAIGHT = """
[project]
name = "two straight rods"
[shop]
units = "mm"
[stock]
material = "al-6061-t6"
diameter = "6 mm"
[[element]]
name = "rod"
shape = "straight"
length = "800 mm"
feed_gap = "10 mm"
"""


def test_a_piece_without_bends_prints_no_empty_bend_or_forming_table(plan_of):
    """Issue 15: a straight piece printed a bend table and a forming table with
    headings and no rows."""
    text = plan_to_text(plan_of(STRAIGHT))
    assert "Bend table" not in text and "Forming (" not in text
    assert text.count("No bends: cut to length") == 2  # one per half
    assert text.count("centre of stock") == 2  # the marks are still there


def test_a_bent_piece_keeps_its_tables(example_plan):
    text = plan_to_text(example_plan)
    assert "Bend table" in text and "Forming (" in text and "No bends" not in text
