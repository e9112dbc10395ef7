"""The template's one typeface, embedded: Bitstream Vera, which ships with reportlab.

A print shop's preflight wants every font embedded; the fourteen standard PDF
fonts are not, so the template registers the TrueType Vera faces that come
with reportlab (reportlab/fonts/Vera.ttf and VeraBd.ttf, under the Bitstream
Vera licence) and draws every string with them. reportlab embeds a subset of
each face (a /FontFile2 stream); with the canvas in invariant mode the bytes
are the same run to run.

Text boxes are measured here from the font's own advance widths, so that the
layout can tell where a string ends before anything is drawn. Millimetres and
points as named.
"""

from __future__ import annotations

from functools import lru_cache

from ..glyphs import printable
from .papers import PT_PER_MM

__all__ = ["FONT", "FONT_BOLD", "register_fonts", "text_width_mm", "ASCENT", "DESCENT"]

FONT = "FabplanVera"
FONT_BOLD = "FabplanVera-Bold"
_FILES = {FONT: "Vera.ttf", FONT_BOLD: "VeraBd.ttf"}
# a string's box above and below its baseline, in units of the font size: Vera's
# glyphs reach 0.928 above and 0.236 below (its head table's bounding box); a
# little more is kept so that a reader's character boxes fall inside it
ASCENT = 0.95
DESCENT = 0.26


def register_fonts() -> None:
    """Register the Vera faces with reportlab (once per process)."""
    import os

    import reportlab
    from reportlab.pdfbase import pdfmetrics
    from reportlab.pdfbase.ttfonts import TTFont

    have = set(pdfmetrics.getRegisteredFontNames())
    folder = os.path.join(os.path.dirname(reportlab.__file__), "fonts")
    for name, file in _FILES.items():
        if name not in have:
            pdfmetrics.registerFont(TTFont(name, os.path.join(folder, file)))


@lru_cache(maxsize=65536)
def text_width_mm(text: str, size_pt: float, bold: bool = False) -> float:
    """The advance width of `text` set in Vera at `size_pt` (mm)."""
    from reportlab.pdfbase import pdfmetrics

    register_fonts()
    return float(pdfmetrics.stringWidth(printable(text), FONT_BOLD if bold else FONT,
                                        size_pt)) / PT_PER_MM
