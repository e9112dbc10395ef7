"""Text the PDFs' fonts can draw: no black boxes for a club's own letters."""

from __future__ import annotations

import dataclasses
import io

import pdfplumber
from hypothesis import given, settings
from hypothesis import strategies as st

from fabplan.render.glyphs import printable


def test_letters_outside_the_fonts_are_shown_by_their_base_letter():
    # source: the Unicode canonical decompositions (NFKD) of these letters; Windows-1252
    # holds o-acute, a-grave and the em dash, so they stay
    assert printable("Koło krótkofalowców, Łódź — 70 cm") == "Kolo krótkofalowców, Lódz — 70 cm"
    assert printable("Anténa na Žižkově, şehir, Ağ") == "Anténa na Žižkove, sehir, Ag"
    assert printable("50 Ω, λ/2, −3 dB") == "50 ohm, lambda/2, -3 dB"
    assert printable("Антенна") == "???????"
    assert printable("plain ASCII stays") == "plain ASCII stays"


@settings(max_examples=200, derandomize=True, deadline=None)
@given(st.text(max_size=40))
def test_every_character_printed_is_in_the_fonts_repertoire(text):
    # source: the Windows-1252 code page (Helvetica's WinAnsi encoding in PDF and a
    # subset of Bitstream Vera's characters)
    out = printable(text)
    out.encode("cp1252")
    assert "\x7f" not in out


def test_sheet_and_template_print_a_polish_club_name(example_path):
    from fabplan.design.read import load_design
    from fabplan.plan import make_plan
    from fabplan.render.fullscale.drawing import template_pdf
    from fabplan.render.sheet.document import sheet_pdf

    d = load_design(example_path)
    name = "Koło krótkofalowców Łódź"
    elements = (dataclasses.replace(d.elements[0], name="dipol ż"),) + d.elements[1:]
    plan = make_plan(dataclasses.replace(d, project=name, electrical=None, elements=elements))
    for pdf in (sheet_pdf(plan), template_pdf(plan)):
        with pdfplumber.open(io.BytesIO(pdf)) as doc:
            text = "\n".join(p.extract_text() or "" for p in doc.pages)
        assert "Kolo krótkofalowców Lódz" in text
        assert "dipol z" in text
        assert all(ch in "\n" or ch.encode("cp1252", "replace") != b"?" for ch in text)
