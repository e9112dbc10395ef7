"""The PDF build sheet: one document that tells a builder everything, in order.

Sections: title block, stock and material, cut list, then per element (and
per piece of stock) the marks and bend table, the bending steps, a drawing to
scale and the jig's formers; then the bill of material and cutting plan, the
electrical check, findings and safety cautions. A stage's section appears
only when the Plan has it. Every table states its units; every page carries
its number. The bytes depend only on the Plan (reportlab invariant mode: no
dates, fixed document id).
"""

from __future__ import annotations

import io
from typing import TYPE_CHECKING, Any

from ... import __version__
from ...errors import DesignError
from ...plan import Plan
from ..fullscale.papers import PT_PER_MM, SHEET_PAPERS, paper_size
from ..glyphs import printable_canvas
from . import core
from .boom import boom
from .context import Context, default_paper
from .electrical import electrical
from .estimate import order
from .findings import findings, safety
from .loops import loops

if TYPE_CHECKING:
    from ...measuring import Measurement

__all__ = ["sheet_pdf", "default_paper"]


def sheet_pdf(plan: Plan, paper: str | None = None,
              measurement: Measurement | None = None) -> bytes:
    """The build sheet of `plan` as PDF bytes, on "a4" or "letter"; without a
    paper, the shop's default (`default_paper`: Letter for inches, A4 for mm),
    which the title block then names as the default. With `measurement` (the
    first article against the model), a page comparing them."""
    from reportlab.pdfgen import canvas
    from reportlab.platypus import KeepTogether, SimpleDocTemplate

    chosen = paper is not None
    paper = paper if paper is not None else default_paper(plan.design.shop.units)
    if paper not in SHEET_PAPERS:
        paper_size(paper)  # unknown paper: its own message
        raise DesignError("the build sheet prints on a4 or letter", field="--paper",
                          value=paper)
    ctx = Context(plan, paper, chosen)
    story: list[Any] = []
    story += core.title(ctx)
    story += core.stock(ctx)
    story += core.cut_list(ctx)
    story += boom(ctx)
    for e in plan.elements:
        story += core.element(ctx, e)
    story += order(ctx)
    story += electrical(ctx)
    story += loops(ctx)
    if measurement is not None:
        from .measure import comparison_section

        story += comparison_section(ctx, measurement)
    story += findings(ctx)
    story.append(KeepTogether(safety(ctx)))

    project = plan.design.project

    class NumberedCanvas(printable_canvas(canvas.Canvas)):  # type: ignore[misc]
        """Defers pages so that each can say "page N of M"."""

        def __init__(self, *args: Any, **kwargs: Any) -> None:
            super().__init__(*args, **kwargs)
            self._pages: list[dict[str, Any]] = []

        def showPage(self) -> None:
            self._pages.append(dict(self.__dict__))
            self._startPage()

        def save(self) -> None:
            total = len(self._pages)
            for state in self._pages:
                self.__dict__.update(state)
                self.setFont("Helvetica", 7.5)
                self.setFillGray(0.3)
                y = 8 * PT_PER_MM
                self.drawString(ctx.margin, y, project[:90])
                self.drawRightString(ctx.pw - ctx.margin, y,
                                     f"page {self._pageNumber} of {total}")
                self.drawCentredString(ctx.pw / 2, y, "build sheet; units on every table")
                super().showPage()
            super().save()

    buf = io.BytesIO()
    doc = SimpleDocTemplate(buf, pagesize=(ctx.pw, ctx.ph), leftMargin=ctx.margin,
                            rightMargin=ctx.margin, topMargin=ctx.margin,
                            bottomMargin=ctx.margin, title=f"Build sheet: {project}",
                            author="fabplan", creator=f"fabplan {__version__}",
                            subject="fabrication plan", invariant=1, pageCompression=1)
    doc.build(story, canvasmaker=NumberedCanvas)
    return buf.getvalue()
