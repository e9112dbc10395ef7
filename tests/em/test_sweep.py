"""Reading a model's sweep: the resonance where the reactance crosses or touches zero."""

from __future__ import annotations

import numpy as np
import pytest

from fabplan.em.sweep import resonance

F0 = 14.175e6


class _Touching:
    """Z = 40 + j(k (f - f0)^2 + offset): a loop tuned by its capacitor at critical
    coupling touches X = 0 at f0 (common practice, no source)."""

    def __init__(self, offset: float) -> None:
        self.offset = offset

    def impedance(self, f: float) -> complex:
        return complex(40.0, 1e-8 * (f - F0) ** 2 + self.offset)


@pytest.mark.parametrize("offset", [0.0, 1e-12, -1e-12])
def test_a_reactance_touching_zero_is_a_resonance_whatever_the_round_off(offset):
    model = _Touching(offset)
    freqs = np.linspace(14.125e6, 14.225e6, 41)
    z = np.array([model.impedance(f) for f in freqs])
    f = resonance(model, freqs, z, near_hz=F0)
    assert f is not None and f == pytest.approx(F0, rel=1e-6)


def test_a_reactance_clear_of_zero_has_no_resonance():
    model = _Touching(0.5)
    freqs = np.linspace(14.125e6, 14.225e6, 41)
    z = np.array([model.impedance(f) for f in freqs])
    assert resonance(model, freqs, z, near_hz=F0) is None
