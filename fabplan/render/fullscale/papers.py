"""Paper sizes and the point scale shared by the template and the build sheet."""

from __future__ import annotations

from typing import Literal

from ...errors import DesignError
from ...units import IN

__all__ = ["PAPERS", "SHEET_PAPERS", "TEMPLATE_PAPERS", "Paper", "PT_PER_MM", "paper_size"]

PT_PER_MM = 72 / 25.4

Paper = Literal["a4", "letter", "roll-610mm", "roll-914mm"]
# (width, height) in mm; a roll's height is set by the drawing
PAPERS: dict[str, tuple[float, float | None]] = {
    "a4": (210.0, 297.0),
    "letter": (8.5 * IN, 11 * IN),
    "roll-610mm": (610.0, None),
    "roll-914mm": (914.0, None),
}
SHEET_PAPERS = ("a4", "letter")
TEMPLATE_PAPERS = tuple(PAPERS)

def paper_size(paper: str) -> tuple[float, float | None]:
    """The paper's (width, height) in mm (height None for a roll)."""
    if paper not in PAPERS:
        raise DesignError(f"unknown paper; use one of {', '.join(PAPERS)}", field="--paper",
                          value=paper)
    return PAPERS[paper]
