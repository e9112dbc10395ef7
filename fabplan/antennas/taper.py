"""Telescoping (stepped-diameter) elements: the uniform element they behave as.

An element made of tubes that step down in diameter towards the tips resonates
longer than a uniform element. The published method treats each half of the
element as a chain of transmission-line sections, open at the tip, each of the
average characteristic impedance of a cylindrical antenna of its diameter, and
converts the chain into an equal uniform element.

Units: mm and Hz; sections are listed from the element's centre outward, each
(diameter_mm, length_mm) with the length along ONE half of the element (exposed
length; overlaps inside the next tube are not counted).

The method (the tests repeat it with chain matrices):
- Z_k = 120 (ln(4 h / d_k) - 1) ohm, h the half-length, d_k the section's
  diameter (Schelkunoff's average characteristic impedance of a cylindrical
  antenna, 120 (ln(2h/a) - 1) with a the radius: Schelkunoff & Friis, Antennas:
  Theory and Practice, 1952 [M]);
- from the tip inward, the open-ended outer part seen from a step is a stub of
  electrical angle phi (input impedance -j Z_out cot(phi)); in the next section
  inward it is the stub of angle phi' with Z_in cot(phi') = Z_out cot(phi), that
  is tan(phi') = (Z_in / Z_out) tan(phi); then that section's own length adds
  beta l;
- the uniform element of reference diameter d_ref behaves the same when its
  half-length gives the same angle converted into Z_ref.
This is the stepped-element method D. Leeson presents after Schelkunoff (Leeson,
Physical Design of Yagi Antennas, ARRL 1992, the chapter on tapered elements
[M: the book was not readable in this session; the form here is as recalled,
so the correction is a starting figure for fabplan's electrical model to check]).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from ..errors import DesignError
from ..numeric import brentq
from .common import require_positive, wavelength_mm

__all__ = ["TaperResult", "average_impedance_ohm", "equivalent_uniform", "tip_length_for"]

MAX_HALF_WL = 0.35  # per side: beyond this the stub picture is not a resonant element's


def average_impedance_ohm(half_length_mm: float, diameter_mm: float) -> float:
    """Schelkunoff's average characteristic impedance 120 (ln(4h/d) - 1) (ohm) [M]."""
    require_positive("half_length_mm", half_length_mm)
    require_positive("diameter_mm", diameter_mm)
    if diameter_mm * 10 > half_length_mm:
        raise DesignError("the section must be thin beside the element (diameter at most "
                          "1/10 of the half-length)", field="diameter_mm", value=diameter_mm)
    return 120.0 * (math.log(4 * half_length_mm / diameter_mm) - 1.0)


@dataclass(frozen=True)
class TaperResult:
    """A stepped element and its equal uniform element.

    tapered_length_mm: the stepped element tip to tip (2 x the sections);
    equivalent_length_mm: tip to tip of the uniform element of
    `reference_diameter_mm` that behaves the same; correction_mm:
    tapered - equivalent (add it to a uniform design length to get the stepped
    element's length); section_impedances_ohm: Z_k from the centre outward.
    """

    frequency_hz: float
    reference_diameter_mm: float
    tapered_length_mm: float
    equivalent_length_mm: float
    correction_mm: float
    section_impedances_ohm: tuple[float, ...]


def _check_sections(sections: Sequence[tuple[float, float]]) -> list[tuple[float, float]]:
    if len(sections) == 0:
        raise DesignError("at least one (diameter_mm, length_mm) section", field="sections",
                          value=list(sections))
    out: list[tuple[float, float]] = []
    for i, sec in enumerate(sections):
        if len(sec) != 2:
            raise DesignError("each section is (diameter_mm, length_mm)",
                              field=f"sections[{i}]", value=sec)
        d, ell = float(sec[0]), float(sec[1])
        require_positive(f"sections[{i}] diameter_mm", d)
        require_positive(f"sections[{i}] length_mm", ell)
        out.append((d, ell))
    return out


def _angle_at_centre(secs: list[tuple[float, float]], half_mm: float, beta: float,
                     z_ref: float) -> tuple[float, tuple[float, ...]]:
    zs = tuple(average_impedance_ohm(half_mm, d) for d, _ in secs)
    phi = beta * secs[-1][1]
    for k in range(len(secs) - 2, -1, -1):
        # cot(phi') Z_k = cot(phi) Z_{k+1}: tan(phi') = (Z_k / Z_{k+1}) tan(phi), same quadrant
        phi = math.atan2(zs[k] * math.sin(phi), zs[k + 1] * math.cos(phi)) + beta * secs[k][1]
    phi_ref = math.atan2(z_ref * math.sin(phi), zs[0] * math.cos(phi))
    return phi_ref, zs


def equivalent_uniform(sections: Sequence[tuple[float, float]], reference_diameter_mm: float,
                       frequency_hz: float) -> TaperResult:
    """The uniform element of `reference_diameter_mm` equal to a stepped element.

    sections: (diameter_mm, length_mm) from the centre outward, lengths per side.
    """
    secs = _check_sections(sections)
    require_positive("reference_diameter_mm", reference_diameter_mm)
    lam = wavelength_mm(frequency_hz)
    half = sum(ell for _, ell in secs)
    if half > MAX_HALF_WL * lam:
        raise DesignError(f"each half is {half / lam:.3f} wavelength; the method is for "
                          f"elements up to {MAX_HALF_WL} wavelength a side",
                          field="sections", value=list(sections))
    beta = 2 * math.pi / lam
    h_eq = half
    zs: tuple[float, ...] = ()
    for _ in range(60):  # Z_ref depends on the equivalent's own half-length: fixed point
        phi_ref, zs = _angle_at_centre(secs, half, beta,
                                       average_impedance_ohm(h_eq, reference_diameter_mm))
        new = phi_ref / beta
        if abs(new - h_eq) < 1e-10 * lam:
            h_eq = new
            break
        h_eq = new
    return TaperResult(frequency_hz=frequency_hz, reference_diameter_mm=reference_diameter_mm,
                       tapered_length_mm=2 * half, equivalent_length_mm=2 * h_eq,
                       correction_mm=2 * (half - h_eq), section_impedances_ohm=zs)


def tip_length_for(inner_sections: Sequence[tuple[float, float]], tip_diameter_mm: float,
                   uniform_length_mm: float, reference_diameter_mm: float,
                   frequency_hz: float) -> TaperResult:
    """Solve the tip section's length so the stepped element equals a uniform one.

    inner_sections: the fixed sections from the centre outward (per side);
    tip_diameter_mm: the outermost tube; uniform_length_mm: tip-to-tip length of
    the uniform design element of `reference_diameter_mm` (e.g. from TN 688).
    Returns the stepped element with its tip length in the last section.
    """
    inner = _check_sections(inner_sections) if inner_sections else []
    require_positive("tip_diameter_mm", tip_diameter_mm)
    require_positive("uniform_length_mm", uniform_length_mm)
    lam = wavelength_mm(frequency_hz)
    inner_half = sum(ell for _, ell in inner)

    def gap(tip: float) -> float:
        res = equivalent_uniform([*inner, (tip_diameter_mm, tip)], reference_diameter_mm,
                                 frequency_hz)
        return res.equivalent_length_mm - uniform_length_mm

    low = 1e-4 * lam
    high = MAX_HALF_WL * lam - inner_half
    if high <= low or gap(low) > 0:
        raise DesignError("the inner sections alone are already longer than the uniform "
                          "element: shorten them", field="inner_sections",
                          value=list(inner_sections))
    if gap(high) < 0:
        raise DesignError("no tip length up to the method's limit reaches the uniform "
                          "element's length", field="uniform_length_mm", value=uniform_length_mm)
    tip = brentq(gap, low, high, xtol=1e-9 * lam)
    return equivalent_uniform([*inner, (tip_diameter_mm, float(tip))], reference_diameter_mm,
                              frequency_hz)
