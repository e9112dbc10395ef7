"""The PDF build sheet, a section per stage: context.py (styles, tables), core.py
(title, stock, cut list, each piece's marks, bends, steps, drawing, formers),
estimate.py (bill of material, cutting plan), electrical.py (the electrical
check), findings.py (findings, safety), document.py (`sheet_pdf`); drawings.py
draws each piece to scale with the dimensions the user gave, on sketch.py
(strokes and labels placed clear of each other, then drawn)."""

from .document import default_paper, sheet_pdf
from .findings import SAFETY

__all__ = ["sheet_pdf", "default_paper", "SAFETY"]
