"""The model's predicted sweep as a one-port Touchstone file (.s1p), for overlaying in
an analyser's own software (`fabplan build`'s predicted.s1p, `fabplan sweep --s1p`)."""

from __future__ import annotations

from typing import Literal

import numpy as np

from ..em.records import UNCERTAINTY_FRAC, SweepResult
from ..errors import DesignError
from ..feed import MatchChain
from ..measure.touchstone import predicted_touchstone

__all__ = ["predicted_s1p", "S1P_PLANES", "S1pPlane"]

S1pPlane = Literal["radio", "element"]
S1P_PLANES: tuple[S1pPlane, ...] = ("radio", "element")


def predicted_s1p(result: SweepResult, chain: MatchChain, element: str,
                  plane: str = "radio") -> str:
    """The model's sweep as a one-port Touchstone file (version 1.1, RI, MHz) of
    S11 against the system impedance, for overlaying in an analyser's software:
    at the radio end of the matching chain (through the matching device and the
    design's feed line, as the analyser sees the antenna there), or at the
    element's terminals."""
    if plane not in S1P_PLANES:
        raise DesignError("the plane is 'radio' or 'element'", field="plane", value=plane)
    f = np.asarray(result.freq_hz, dtype=float)
    z = np.asarray(result.z_ohm, dtype=complex)
    # a gamma or T match is in the sweep already (its input is the model's feed
    # point); its words lead the sweep's `matching`
    device = result.matching.split(", then ")[0] if ", then " in result.matching else None
    if plane == "radio":
        z = np.asarray(chain.at_radio(z, f), dtype=complex)
        where = f"at the radio end of: {result.matching}"
    elif device is not None:
        where = f"at the input of the {device} (no balun or transformer, no feed line)"
    else:
        where = "at the element's terminals (no matching, no feed line)"
    comments = [f"predicted by the fabplan model for element {element}"[:200],
                where[:200],
                f"S11 against {chain.system_ohm:g} ohm; predicted frequencies carry about "
                f"+-{100 * UNCERTAINTY_FRAC:.1f} %"]
    comments = [c.encode("ascii", "replace").decode("ascii") for c in comments]
    return predicted_touchstone(f, z, chain.system_ohm, comments=comments)
