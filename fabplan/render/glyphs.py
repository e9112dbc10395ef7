"""Text the PDFs' fonts can draw.

The build sheet draws with Helvetica (one of PDF's standard fonts, in the
Windows-1252 encoding) and the templates with Bitstream Vera (which covers
Windows-1252 too): a letter outside that repertoire, such as the Polish "ł" of a
club's name, would print as a black box. `printable` keeps every character those
fonts have and shows any other by its base letter (its Unicode canonical
decomposition without the accents: "ś" as "s"), by a plain spelling for a few
letters and signs that have none ("ł" as "l", "Ω" as "ohm"), or as "?". The DXF
and SVG drawings keep the text as written: CAD programs and browsers pick their
own fonts.
"""

from __future__ import annotations

import unicodedata
from functools import cache, lru_cache

__all__ = ["printable", "printable_canvas", "REPERTOIRE"]

REPERTOIRE = "cp1252"  # the encoding whose characters both fonts draw

# letters and signs without a decomposition into the repertoire, spelled plainly
_PLAIN = {
    "ł": "l", "Ł": "L", "đ": "d", "Đ": "D", "ħ": "h", "Ħ": "H", "ı": "i", "ŀ": "l",
    "Ŀ": "L", "ŋ": "ng", "Ŋ": "NG", "ſ": "s", "ĸ": "k", "ŧ": "t", "Ŧ": "T",
    "\u2126": "ohm", "\u03a9": "ohm", "λ": "lambda", "π": "pi", "−": "-", "≤": "<=",
    "≥": ">=", "≈": "~", "≠": "!=", "→": "->", "←": "<-", "√": "sqrt", "∞": "inf",
    "\u2009": " ", "\u202f": " ", "\u2007": " ", "\u2011": "-",
}


def printable(text: str) -> str:
    """`text` with every character the PDF fonts lack replaced (see the module)."""
    if text.isascii():
        return text
    return "".join(_char(ch) for ch in text)


@lru_cache(maxsize=4096)
def _char(ch: str) -> str:
    if _drawn(ch):
        return ch
    if ch in _PLAIN:
        return _PLAIN[ch]
    base = "".join(c for c in unicodedata.normalize("NFKD", ch) if not unicodedata.combining(c))
    if base and all(_drawn(c) for c in base):
        return base
    return "?"


def _drawn(ch: str) -> bool:
    if ch == "\x7f" or (ord(ch) < 32 and ch not in "\n\t"):
        return False
    try:
        ch.encode(REPERTOIRE)
    except UnicodeEncodeError:
        return False
    return True


@cache
def printable_canvas(base: type) -> type:
    """A subclass of the reportlab canvas class `base` whose drawString,
    drawRightString and drawCentredString draw `printable` text (the strings of
    page furniture and of reportlab's graphics reach the page through these)."""

    class PrintableCanvas(base):  # type: ignore[misc]  # reportlab has no types
        def drawString(self, x: float, y: float, text: str, *args: object,
                       **kwargs: object) -> None:
            super().drawString(x, y, printable(text), *args, **kwargs)

        def drawRightString(self, x: float, y: float, text: str, *args: object,
                            **kwargs: object) -> None:
            super().drawRightString(x, y, printable(text), *args, **kwargs)

        def drawCentredString(self, x: float, y: float, text: str, *args: object,
                              **kwargs: object) -> None:
            super().drawCentredString(x, y, printable(text), *args, **kwargs)

    return PrintableCanvas
