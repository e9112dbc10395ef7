"""What the electrical stage adds to the Plan (the interface the build sheet
and the JSON/text reports read). Frequencies in hertz, impedances in ohms,
lengths in millimetres.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

from ..units import format_frequency, format_length

__all__ = ["SweepResult", "ElementElectrical", "PlanElectrical", "UNCERTAINTY_FRAC"]

# the stated uncertainty of a predicted frequency: about +-0.5 %, dominated by the
# terminal and feed geometry (how the feed gap and its connections are really made)
UNCERTAINTY_FRAC = 0.005


def _num(x: float | None, places: int = 6) -> float | None:
    """A JSON-safe number: None for missing or infinite values."""
    if x is None or not math.isfinite(x):
        return None
    v = round(float(x), places)
    return 0.0 if v == 0 else v


def _swr_text(s: float) -> str:
    return "inf" if not math.isfinite(s) else (f"{s:.2f}" if s < 100 else f"{s:.0f}")


@dataclass(frozen=True)
class SweepResult:
    """One element's impedance over a frequency sweep, and what it means."""

    freq_hz: tuple[float, ...]
    z_ohm: tuple[complex, ...]  # at the element's terminals
    swr_terminals: tuple[float, ...]  # against `reference_ohm`
    swr_system: tuple[float, ...]  # through the matching (and feed line), against `system_ohm`
    reference_ohm: float
    system_ohm: float
    matching: str  # plain words: "ideal 4:1 transformer into 50 ohm", ...
    min_swr: float
    min_swr_hz: float
    resonance_hz: float | None  # reactance zero crossing, if any in the sweep
    bandwidth_hz: dict[str, float | None] = field(default_factory=dict)  # {"1.5": .., "2": ..}
    efficiency: float | None = None
    uncertainty_frac: float = UNCERTAINTY_FRAC

    def to_dict(self) -> dict[str, Any]:
        return {
            "reference_ohm": _num(self.reference_ohm),
            "system_ohm": _num(self.system_ohm),
            "matching": self.matching,
            "min_swr": _num(self.min_swr, 4),
            "min_swr_hz": _num(self.min_swr_hz, 1),
            "resonance_hz": _num(self.resonance_hz, 1),
            "bandwidth_hz": {k: _num(v, 1) for k, v in self.bandwidth_hz.items()},
            "efficiency": _num(self.efficiency, 5),
            "uncertainty_frac": self.uncertainty_frac,
            "points": [{"f_hz": _num(f, 1), "r_ohm": _num(z.real, 4), "x_ohm": _num(z.imag, 4),
                        "swr_terminals": _num(st, 4), "swr_system": _num(ss, 4)}
                       for f, z, st, ss in zip(self.freq_hz, self.z_ohm, self.swr_terminals,
                                               self.swr_system)],
        }


@dataclass(frozen=True)
class ElementElectrical:
    """The electrical check of one element as it will be bent."""

    target_hz: float | None
    sweep: SweepResult
    unknowns: int
    notes: tuple[str, ...] = ()
    extra: dict[str, Any] = field(default_factory=dict, compare=False)

    def extend_json(self, d: dict) -> None:
        """Add an "electrical" section to the element's JSON dict."""
        out: dict[str, Any] = {"target_hz": _num(self.target_hz, 1), "unknowns": self.unknowns}
        out.update(self.sweep.to_dict())
        for key, value in self.extra.items():
            out[key] = _num(value) if isinstance(value, float) else value
        out["notes"] = list(self.notes)
        d["electrical"] = out

    def summary_lines(self) -> list[str]:
        """The predicted figures, each frequency with its uncertainty."""
        s = self.sweep
        u = s.uncertainty_frac
        ex = self.extra
        lines = [f"Electrical check (thin-wire method of moments, {self.unknowns} unknowns)"]
        if ex.get("geometry"):
            lines.append(f"  geometry: {ex['geometry']}")
        lines.append(f"  matching: {s.matching}; SWR at the terminals against "
                     f"{s.reference_ohm:g} ohm")

        def freq(hz: float | None) -> str:
            if hz is None:
                return "none in the sweep"
            return f"{format_frequency(hz)} +- {format_frequency(u * hz)} ({u * 100:.1f} %)"

        rows = []
        if self.target_hz is not None:
            rows.append(("target", format_frequency(self.target_hz)))
        off = ""
        if self.target_hz is not None:
            off = f"; {100 * (s.min_swr_hz / self.target_hz - 1):+.2f} % from the target"
        rows.append(("least SWR", f"{_swr_text(s.min_swr)} at {freq(s.min_swr_hz)}{off}"))
        rows.append(("resonance (X = 0)", freq(s.resonance_hz)))
        for key in ("1.5", "2"):
            bw = s.bandwidth_hz.get(key)
            edges = (ex.get("bandwidth_edges_hz") or {}).get(key)
            if bw is None:
                shown = "not reached, or wider than the sweep"
            elif edges:
                shown = (f"{format_frequency(bw)} ({format_frequency(edges[0])} to "
                         f"{format_frequency(edges[1])})")
            else:
                shown = format_frequency(bw)
            rows.append((f"bandwidth SWR < {key}", shown))
        if s.efficiency is not None:
            rows.append(("efficiency", f"{100 * s.efficiency:.1f} % at least SWR"))
        width = max(len(r[0]) for r in rows)
        lines += [f"  {name.ljust(width)}  {value}" for name, value in rows]
        return lines

    def sweep_lines(self, max_rows: int | None = 21) -> list[str]:
        """The sweep as a table (every k-th point when there are more than `max_rows`)."""
        s = self.sweep
        lines = [f"  {'MHz':>10}  {'R ohm':>9}  {'X ohm':>9}  {'SWR term':>8}  {'SWR sys':>8}"]
        n = len(s.freq_hz)
        stride = 1 if max_rows is None else max(1, math.ceil(n / max_rows))
        picks = list(range(0, n, stride))
        if picks and picks[-1] != n - 1:
            picks.append(n - 1)
        for i in picks:
            z = s.z_ohm[i]
            lines.append(f"  {s.freq_hz[i] / 1e6:10.3f}  {z.real:9.1f}  {z.imag:9.1f}  "
                         f"{_swr_text(s.swr_terminals[i]):>8}  {_swr_text(s.swr_system[i]):>8}")
        if stride > 1:
            lines.append(f"  (every {stride}th of {n} points; `fabplan sweep` lists them all)")
        return lines

    def text(self, unit: str, den: int) -> str:
        lines = self.summary_lines() + [""] + self.sweep_lines()
        lines += [f"  note: {note}" for note in self.notes]
        return "\n".join(lines)


@dataclass(frozen=True)
class PlanElectrical:
    """Design-wide electrical figures: the matching's parts and the cautions."""

    matching: str
    ground: str
    real_ground_modelled: bool
    balun_loop_cut_length_mm: float | None
    balun_cable: str | None
    feed_line_loss_db: float | None  # matched loss at the target (or sweep centre)
    power_w: float | None
    cautions: tuple[str, ...]
    uncertainty_frac: float = UNCERTAINTY_FRAC

    def extend_json(self, d: dict) -> None:
        d["electrical"] = {
            "matching": self.matching,
            "ground": self.ground,
            "real_ground_modelled": self.real_ground_modelled,
            "balun_loop_cut_length_mm": _num(self.balun_loop_cut_length_mm, 3),
            "balun_cable": self.balun_cable,
            "feed_line_loss_db": _num(self.feed_line_loss_db, 4),
            "power_w": _num(self.power_w),
            "uncertainty_frac": self.uncertainty_frac,
            "cautions": list(self.cautions),
        }

    def text(self, unit: str, den: int) -> str:
        lines = ["Electrical: matching and cautions", "---------------------------------",
                 f"Matching: {self.matching}", f"Ground: {self.ground}"]
        if self.balun_loop_cut_length_mm is not None:
            lines.append(f"Cut list: balun loop of {self.balun_cable}, "
                         f"{format_length(self.balun_loop_cut_length_mm, unit, den)} "
                         "(half an electrical wavelength x velocity factor, between its two "
                         "connection points; check the cable's velocity factor first)")
        if self.feed_line_loss_db is not None:
            lines.append(f"Feed line matched loss: {self.feed_line_loss_db:.2f} dB")
        lines.append(f"Predicted frequencies carry about +-{100 * self.uncertainty_frac:.1f} % "
                     "uncertainty, dominated by the terminal and feed geometry.")
        lines += [f"CAUTION: {c}" for c in self.cautions]
        return "\n".join(lines)
