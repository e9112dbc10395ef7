"""What the tuning use case found, as text: the tuned length and its marks, or the
change for the next build from a first article's measurement."""

from __future__ import annotations

from ..design.electrical import ElectricalSettings
from ..design.model import Design
from ..em.records import UNCERTAINTY_FRAC
from ..tuning import BeamTuneResult, CouplingTuneResult, MeasuredResult, TuneResult
from ..units import (
    format_capacitance,
    format_frequency,
    format_impedance,
    format_length,
    format_signed_length,
)
from .text import table

__all__ = ["tune_text", "measured_text", "beam_tune_text", "coupling_text"]


def _len(mm: float, d: Design) -> str:
    return format_length(mm, d.shop.units, d.shop.fraction)


def _change(mm: float, d: Design) -> str:
    return format_signed_length(mm, d.shop.units, d.shop.fraction)


def _from_centre(mm: float, d: Design) -> str:
    """A mark as `fabplan plan` gives it: the half of the stock (A or B) and the
    distance from the centre mark, `A 995.7 mm (39 7/32")`."""
    if abs(mm) < 1e-9:
        return "0 (centre)"
    return f"{'A' if mm < 0 else 'B'} {_len(abs(mm), d)}"


def tune_text(r: TuneResult, d: Design, settings: ElectricalSettings) -> list[str]:
    """`fabplan tune`: the tuned length, what it moves, and the new marks."""
    what = "least SWR through the matching" if r.tune_for == "least-swr" else "resonance (X = 0)"
    u = 100 * UNCERTAINTY_FRAC
    lines = [f"Tuning {r.element!r} for {what} at {format_frequency(r.target_hz)}",
             f"  matching: {settings.chain.describe()}",
             f"  {r.key}: {_len(r.old_value_mm, d)} -> {_len(r.new_value_mm, d)} "
             f"(change {_change(r.new_value_mm - r.old_value_mm, d)})",
             f"  predicted {what}: {format_frequency(r.old_hz)} before, "
             f"{format_frequency(r.new_hz)} after (each +-{u:.1f} %)",
             f"  developed length: {_len(r.old_developed_mm, d)} -> "
             f"{_len(r.new_developed_mm, d)} (change "
             f"{_change(r.new_developed_mm - r.old_developed_mm, d)})",
             f"  cut length: {_len(r.old_cut_mm, d)} -> {_len(r.new_cut_mm, d)} (change "
             f"{_change(r.new_cut_mm - r.old_cut_mm, d)})",
             f"  ({r.iterations} secant steps, {r.models_built} models)", "",
             "Marks on the straight stock: from the centre mark towards end A or B (a change "
             "of + moves the mark away from the centre), and from cut end A"]
    rows = [[m.label, _from_centre(m.new_from_centre_mm, d),
             _change(abs(m.new_from_centre_mm) - abs(m.old_from_centre_mm), d),
             _len(m.new_from_end_mm, d), _change(m.new_from_end_mm - m.old_from_end_mm, d)]
            for m in r.marks]
    lines.append(table(["mark", "new from centre", "change", "new from end A", "change"], rows,
                       "lrrrr"))
    return lines


def measured_text(r: MeasuredResult, d: Design) -> list[str]:
    """`fabplan tune --measured`: the change for the next build from a measurement."""
    what = "resonance (X = 0)" if r.tune_for == "resonance" else "least SWR"
    lines = [f"First article {r.element!r}: {what} measured at "
             f"{format_frequency(r.measured_hz)}; target {format_frequency(r.target_hz)}",
             f"  the model predicts {format_frequency(r.model_hz)} for the element as designed "
             "(+-0.5 %)",
             f"  model sensitivity: d f / d {r.key} = {r.sensitivity_hz_per_mm / 1e3:.1f} kHz "
             "per mm", "",
             f"Change for the next build ({r.key} now {_len(r.value_mm, d)})"]
    rows = [["model sensitivity", _change(r.change_model_mm, d),
             _len(r.value_mm + r.change_model_mm, d), _change(r.cut_change_model_mm, d)],
            ["proportional rule", _change(r.change_proportional_mm, d),
             _len(r.value_mm + r.change_proportional_mm, d),
             _change(r.cut_change_proportional_mm, d)]]
    lines.append(table(["by", f"change in {r.key}", f"new {r.key}", "change in cut length"],
                       rows, "lrrr"))
    lines += ["", f"Trust the {'model' if r.trust == 'model' else 'proportional rule'}: "
              f"{r.advice}"]
    return lines


def beam_tune_text(r: BeamTuneResult, d: Design) -> list[str]:
    """`fabplan tune` on a beam: what changed, and the beam before and after."""
    what = f" with its {r.match}" if r.match else ""
    lines = [f"Tuning the beam at {format_frequency(r.target_hz)}: {r.element!r}{what} for "
             "least SWR through the matching"
             + ("" if r.goal is None else f"; the parasitic elements for {r.goal.describe()} "
                f"(each within +-{100 * r.goal.within:g} %)"),
             f"  start: {r.start}", ""]
    rows = []
    for c in r.changes:
        if c.kind == "capacitance":
            old = format_capacitance(c.old) if c.old > 0 else "solved by the check"
            rows.append([c.element, c.key, old, format_capacitance(c.new), ""])
        else:
            rows.append([c.element, c.key, _len(c.old, d), _len(c.new, d),
                         _change(c.new - c.old, d)])
    lines.append(table(["element", "key", "before", "after", "change"], rows, "llrrr")
                 if rows else "  nothing needed changing")
    lines.append("")
    head = ["", "R + jX at the terminals (ohm)", "SWR", "gain dBi (+x)", "front-to-back dB"]
    fig = []
    for name, f in (("before", r.before), ("after", r.after)):
        fig.append([name, f"{f.z_ohm.real:.1f} {'+' if f.z_ohm.imag >= 0 else '-'} "
                          f"j{abs(f.z_ohm.imag):.1f}", f"{f.swr:.2f}", f"{f.gain_dbi:.2f}",
                    f"{f.front_to_back_db:.1f}"])
    lines.append(table(head, fig, "lrrrr"))
    if r.goal_met is False:
        lines.append(f"  the goal's floor is not reached within +-{100 * r.goal.within:g} % "
                     "(shown: the best found); allow more (--within) or change the spacings"
                     if r.goal is not None else "")
    u = 100 * UNCERTAINTY_FRAC
    lines.append(f"  ({r.evaluations} solves of the model; each figure +-{u:.1f} % in frequency)")
    return lines


def coupling_text(r: CouplingTuneResult, d: Design, settings: ElectricalSettings) -> list[str]:
    """`fabplan tune` on a capacitor-tuned loop: the coupling loop's size for the match."""
    u = 100 * UNCERTAINTY_FRAC

    def cap(c: float | None) -> str:
        return "-" if c is None else format_capacitance(c)

    rows = [["before", _len(r.old_mm, d), f"{format_impedance(r.z_before)} ohm",
             f"{r.swr_before:.2f}", cap(r.capacitance_before_f)],
            ["after", _len(r.new_mm, d), f"{format_impedance(r.z_after)} ohm",
             f"{r.swr_after:.2f}", cap(r.capacitance_after_f)]]
    return [f"Tuning {r.element!r}, the coupling loop of {r.loop!r}, for least SWR at "
            f"{format_frequency(r.target_hz)}",
            f"  the capacitor of {r.loop!r} tunes the frequency (solved for X = 0 at the "
            "target at each size; turn it there): the coupling loop's size sets the match",
            f"  matching: {settings.chain.describe()}",
            f"  {r.key}: {_len(r.old_mm, d)} -> {_len(r.new_mm, d)} (change "
            f"{_change(r.new_mm - r.old_mm, d)})", "",
            table(["", r.key, "R + jX at the feed", "SWR", "capacitor"], rows, "lrrrr"),
            f"  ({r.models_built} models; the frequency figures +-{u:.1f} %)"]
