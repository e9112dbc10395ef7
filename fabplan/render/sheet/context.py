"""What every section of the build sheet shares: paper, styles, tables, units."""

from __future__ import annotations

from typing import Any

from ...plan import Plan
from ...units import LengthUnit, format_drawing_length, format_inches, format_mm
from ..fullscale.papers import PAPERS, PT_PER_MM
from ..glyphs import printable

__all__ = ["Context", "esc", "default_paper", "short_name", "NAME_LIMIT"]

NAME_LIMIT = 60  # characters of a name shown in a table cell or a drawing


def default_paper(units: LengthUnit) -> str:
    """The build sheet's paper when none is chosen: Letter for a shop that works
    in inches (North America), A4 for one in millimetres."""
    return "letter" if units == "in" else "a4"


def short_name(name: str, limit: int = NAME_LIMIT) -> str:
    """A name cut to `limit` characters (with an ellipsis) for a table or drawing;
    the element's heading shows it whole."""
    return name if len(name) <= limit else name[:limit - 1].rstrip() + "\u2026"


class Context:
    """Styles and formatting shared by the section builders."""

    def __init__(self, plan: Plan, paper: str, paper_chosen: bool = True) -> None:
        from reportlab.lib import colors
        from reportlab.lib.styles import ParagraphStyle, getSampleStyleSheet

        self.plan = plan
        self.den = plan.design.shop.fraction
        self.unit = plan.design.shop.units
        self.paper = paper
        self.paper_chosen = paper_chosen
        ss = getSampleStyleSheet()
        self.colors = colors
        self.h1 = ParagraphStyle("h1", parent=ss["Heading1"], fontSize=15, leading=18,
                                 spaceAfter=4, spaceBefore=0)
        self.h2 = ParagraphStyle("h2", parent=ss["Heading2"], fontSize=12, leading=14,
                                 spaceBefore=10, spaceAfter=4, keepWithNext=1)
        self.h3 = ParagraphStyle("h3", parent=ss["Heading3"], fontSize=10, leading=12,
                                 spaceBefore=6, spaceAfter=3, keepWithNext=1)
        self.body = ParagraphStyle("body", parent=ss["BodyText"], fontSize=8.5, leading=10.5,
                                   spaceAfter=3)
        self.small = ParagraphStyle("small", parent=self.body, fontSize=7.5, leading=9)
        self.caption = ParagraphStyle("caption", parent=self.small, keepWithNext=1)
        self.cell = ParagraphStyle("cell", parent=self.body, fontSize=8, leading=9.5,
                                   spaceAfter=0)
        self.cellr = ParagraphStyle("cellr", parent=self.cell, alignment=2)
        width, height = PAPERS[paper]
        if height is None:
            raise ValueError(f"the build sheet needs a cut sheet of paper, not {paper}")
        self.pw, self.ph = width * PT_PER_MM, height * PT_PER_MM
        self.margin = 15 * PT_PER_MM
        self.frame_w = self.pw - 2 * self.margin

    def L(self, mm: float) -> str:
        """Both units, the shop's first: `27 15/16" (709.3 mm)`."""
        if self.unit == "in":
            return f"{format_inches(mm, self.den)} ({format_mm(mm)})"
        return f"{format_mm(mm)} ({format_inches(mm, self.den)})"

    @property
    def lengths_note(self) -> str:
        """How a caption says its lengths are given."""
        if self.unit == "in":
            return "Lengths in inches (tape measure) first, millimetres in brackets"
        return "Lengths in millimetres first, inches (tape measure) in brackets"

    def size(self, mm: float) -> str:
        """A small size (wall, strip, pitch) in both units, the shop's first, to
        0.001 in or 0.01 mm: `0.058 in (1.47 mm)`."""
        return format_drawing_length(mm, self.unit)

    def L2(self, mm: float) -> Any:
        """Both units on two lines of a right-aligned table cell."""
        from reportlab.platypus import Paragraph

        first, second = self.L(mm).split(" (", 1)
        return Paragraph(f"{esc(first)}<br/>({esc(second)}", self.cellr)

    def p(self, text: str, style: Any = None) -> Any:
        from reportlab.platypus import Paragraph

        return Paragraph(esc(text), style or self.body)

    def table(self, head: list[str], rows: list[list[Any]], widths: list[float] | None = None,
              align: str | None = None, caption: str | None = None) -> list[Any]:
        """A table with a header row; `widths` are fractions of the frame width;
        `align` one 'l' or 'r' per column. Returns a list of flowables."""
        from reportlab.pdfbase.pdfmetrics import stringWidth
        from reportlab.platypus import Paragraph, Table, TableStyle

        align = align or "l" * len(head)
        col_w = None if widths is None else [w * self.frame_w for w in widths]
        room = col_w or [self.frame_w / len(head)] * len(head)

        def cell(c: Any, a: str, w: float) -> Any:
            if not isinstance(c, str):
                return c
            # short figures stay plain text (quick to lay out); anything that
            # might not fit its column wraps as a paragraph
            c = printable(c)
            if "\n" not in c and stringWidth(c, "Helvetica", 8) <= w - 7:
                return c
            return Paragraph(esc(c), self.cellr if a == "r" else self.cell)

        cells = [[Paragraph(f"<b>{esc(h)}</b>", self.cellr if a == "r" else self.cell)
                  for h, a in zip(head, align)]]
        for row in rows:
            cells.append([cell(c, a, w) for c, a, w in zip(row, align, room)])
        # rows taller than a page (long names) split across pages instead of failing
        t = Table(cells, colWidths=col_w, repeatRows=1, hAlign="LEFT", splitInRow=1)
        t.setStyle(TableStyle([
            ("GRID", (0, 0), (-1, -1), 0.4, self.colors.Color(0.6, 0.6, 0.6)),
            ("BACKGROUND", (0, 0), (-1, 0), self.colors.Color(0.88, 0.88, 0.88)),
            ("VALIGN", (0, 0), (-1, -1), "TOP"),
            ("FONT", (0, 1), (-1, -1), "Helvetica", 8, 9.5),
            ("TOPPADDING", (0, 0), (-1, -1), 2), ("BOTTOMPADDING", (0, 0), (-1, -1), 2),
            ("LEFTPADDING", (0, 0), (-1, -1), 3), ("RIGHTPADDING", (0, 0), (-1, -1), 3),
        ] + [("ALIGN", (i, 1), (i, -1), "RIGHT") for i, a in enumerate(align) if a == "r"]
            + [("VALIGN", (0, 1), (-1, -1), "TOP")]))
        out = []
        if caption:
            out.append(self.p(caption, self.caption))
        out.append(t)
        return out


def esc(text: object) -> str:
    """`text` for a paragraph: its markup characters escaped, and what the font
    cannot draw replaced (fabplan.render.glyphs)."""
    return printable(str(text)).replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")
