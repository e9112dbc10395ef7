"""What the electrical stage adds to the Plan (the interface the build sheet
and the JSON/text reports read). Frequencies in hertz, impedances in ohms.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

__all__ = ["SweepResult", "ElementElectrical"]


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
    uncertainty_frac: float = 0.005


@dataclass(frozen=True)
class ElementElectrical:
    """The electrical check of one element as it will be bent."""

    target_hz: float | None
    sweep: SweepResult
    unknowns: int
    notes: tuple[str, ...] = ()
    extra: dict[str, Any] = field(default_factory=dict, compare=False)

    def extend_json(self, d: dict) -> None:  # pragma: no cover - replaced by the em stage
        raise NotImplementedError

    def text(self, unit: str, den: int) -> str:  # pragma: no cover - replaced by the em stage
        raise NotImplementedError
