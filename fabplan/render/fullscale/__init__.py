"""The full-scale (1:1) template: a PDF to print at actual size and mark from.

Each piece of stock gets a marking strip (the straight stock at true length
with a tick at every mark, measured from the centre, and at every full turn
of a helical bend; a long strip folded into rows joined at ticks J1, J2, ...
when that saves pages) and a drawing of the bent piece (centreline, outline,
marks and the jig's formers), all as vectors at 1:1, tiled over A4 or Letter
pages with an overlap, numbered alignment crosses and an assembly map that
says why each tile is printed, or put on one large-format roll page. Every
page carries a 100 mm and a 4 in calibration bar; every label lies whole on
one tile; lengths read in the shop's unit first.

papers.py (paper sizes), fonts.py (the embedded typeface and text widths),
geometry.py (a piece drawn flat, shared with the build sheet), layout.py
(decides every line and label at 1:1, in blocks), tiling.py (the grid, labels
off the seams, which tiles to print), arrange.py (orientation, folding,
stacking), drawing.py (reportlab). Reads the Plan; decides no engineering
figure.
"""

from .drawing import template_pdf

__all__ = ["template_pdf"]
