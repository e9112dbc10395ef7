"""The build sheet's closing sections: findings and safety."""

from __future__ import annotations

from typing import Any

from .context import Context, esc, short_name

__all__ = ["findings", "safety", "SAFETY", "SAFETY_FOOTNOTE"]

SAFETY = (
    ("Power lines", "Keep every antenna, mast and ladder well clear of overhead power lines: "
     "site it so that nothing can reach a line if it falls or swings. Contact with a power line "
     "kills. Electrical codes forbid antennas over or near power conductors."),
    ("RF exposure", "Before transmitting, evaluate the station's RF exposure against your "
     "national limits (for example 47 CFR 1.1310 in the USA, or ICNIRP guidelines). Keep people "
     "away from the element while it radiates."),
    ("Lightning and grounding", "Bond the mast and a coaxial discharge unit to the building's "
     "grounding electrode system as your local electrical code requires. Disconnect feed lines "
     "when storms threaten."),
    ("Ladders and roofs", "Set a ladder at about 4 to 1, tie it off, and never work on a roof "
     "or tower alone. Use fall protection where required."),
    ("Hot solder and flux", "A soldering iron or torch burns; solder in ventilation, keep flux "
     "fumes away from your face, and wash your hands after handling lead solder."),
    ("Sharp cut ends", "Wear eye protection when cutting and bending: wire ends spring. Deburr "
     "every cut end and cap exposed ends."),
)
SAFETY_FOOTNOTE = ("These are reminders, not a complete safety guide. Local codes and licensed "
                   "practice come first: follow them where they differ from anything here.")


def findings(ctx: Context) -> list[Any]:
    out = [ctx.p("Findings", ctx.h2)]
    if not ctx.plan.findings:
        return out + [ctx.p("No findings: every check passed.")]
    words = {"error": "Must fix", "warning": "Check", "info": "Note"}
    rows = [[words.get(f.severity, f.severity), short_name(f.element) if f.element
             else "whole design", f.message, f.code]
            for f in ctx.plan.findings]
    return out + ctx.table(["what to do", "element", "finding", "code"], rows,
                           [0.1, 0.16, 0.56, 0.18], "llll")


def safety(ctx: Context) -> list[Any]:
    from reportlab.platypus import Paragraph

    out = [ctx.p("Safety", ctx.h2)]
    for head, text in SAFETY:
        out.append(Paragraph(f"<b>{esc(head)}.</b> {esc(text)}", ctx.body))
    pe = ctx.plan.electrical
    for caution in (pe.cautions if pe is not None else ()):
        out.append(Paragraph(f"<b>From the electrical check.</b> {esc(caution)}", ctx.body))
    out.append(ctx.p(SAFETY_FOOTNOTE, ctx.small))
    return out
