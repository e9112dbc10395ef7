"""The PDF build sheet, a section per stage: context.py (styles, tables), core.py
(title, stock, cut list, each piece's marks, bends, steps, drawing, formers),
estimate.py (bill of material, cutting plan), electrical.py (the electrical
check), findings.py (findings, safety), document.py (`sheet_pdf`)."""

from .document import sheet_pdf
from .findings import SAFETY

__all__ = ["sheet_pdf", "SAFETY"]
