"""Matching devices for a driven element: hairpin (beta), gamma and T matches.

Closed forms for the parts a builder cuts: parallel-wire lines and shorted
stubs, the L-network a hairpin makes with a shortened element, and the
transmission-line model of the gamma and T matches. fabplan/em models the
finished device as wires; these functions give its starting dimensions.

Units: mm, Hz, ohm, F, H. Impedances are complex ohms; a reactance is the
imaginary part (positive inductive).

SOURCES (tags as in trade-notes.md)
- Two parallel round conductors in air, centre spacing D, diameter d:
  Z0 = 120 acosh(D/d), and 276 log10(2D/d) when D >> d (Terman, Radio
  Engineers' Handbook; ARRL Antenna Book, transmission lines [M]; the two agree
  because 120 ln(10) = 276.3, worked in the tests). Unequal diameters d1, d2:
  Z0 = 60 acosh((4D^2 - d1^2 - d2^2) / (2 d1 d2)) (any transmission-line text [M]);
  it reduces to the equal form, checked in the tests.
- Shorted lossless stub: Z = j Z0 tan(beta l), beta = 2 pi f / (v c) (any
  transmission-line text [S]).
- L-network: a load R - jX_s with a shunt reactance X_p across it presents a
  real Z_sys > R when Q = sqrt(Z_sys / R - 1), X_s = Q R, X_p = Z_sys / Q (any
  circuit text on L-networks [S]). The hairpin (beta) match is this network: the
  driven element is shortened until it is capacitive by X_s and a shorted
  parallel-wire stub across its terminals gives X_p (ARRL Antenna Book, hairpin
  match [M]).
- Gamma and T matches by the folded-dipole decomposition into a
  transmission-line mode and an antenna mode (Balanis, Antenna Theory, folded
  dipole: Z_in = 2 Z_t (1+a)^2 Z_d / ((1+a)^2 Z_d + 2 Z_t) [M]), applied over the
  match section only, the model used in the published analyses of the gamma
  match (D. J. Healey III, W3PG, "An examination of the gamma match", QST, April
  1969 [M]). The antenna-mode current divides between rod (fed, diameter d1)
  and element (d2) as a = ln(2s/d1) / ln(2s/d2) (equal-potential conductors,
  thin-wire limit [M]); the step-up is (1+a)^2 (4 for equal conductors, the
  folded dipole, checked in the tests). A T match is the balanced form: two
  shorted line halves of l/2 in series, Z = parallel(2 Z0 j tan(beta l/2),
  (1+a)^2 Z_d). A gamma is one half of a T fed against the element's centre:
  Z = parallel(j Z0 tan(beta l), (1+a)^2 Z_d / 2), then the series capacitor.
  Known limits of the model: it neglects the rod's own radiation and end
  effects; the electrical model checks the finished match.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..errors import DesignError
from .common import C0_MM_S, require_positive, require_range

__all__ = ["two_wire_z0_ohm", "two_wire_z0_approx_ohm", "unequal_wire_z0_ohm",
           "shorted_stub_reactance_ohm", "shorted_stub_length_mm", "l_network_input_ohm",
           "HairpinMatch", "hairpin_match", "current_division", "gamma_input_ohm",
           "t_match_input_ohm", "GammaMatch", "gamma_match", "TMatch", "t_match"]


def two_wire_z0_ohm(spacing_mm: float, diameter_mm: float) -> float:
    """Z0 = 120 acosh(D/d) (ohm) of two parallel round wires in air, centre spacing D."""
    require_positive("spacing_mm", spacing_mm)
    require_positive("diameter_mm", diameter_mm)
    if spacing_mm <= diameter_mm:
        raise DesignError("the wires' centre spacing must exceed their diameter",
                          field="spacing_mm", value=spacing_mm)
    return 120.0 * math.acosh(spacing_mm / diameter_mm)


def two_wire_z0_approx_ohm(spacing_mm: float, diameter_mm: float) -> float:
    """Z0 = 276 log10(2D/d) (ohm): the handbook form for D >> d."""
    require_positive("spacing_mm", spacing_mm)
    require_positive("diameter_mm", diameter_mm)
    return 276.0 * math.log10(2 * spacing_mm / diameter_mm)


def unequal_wire_z0_ohm(spacing_mm: float, diameter1_mm: float, diameter2_mm: float) -> float:
    """Z0 = 60 acosh((4D^2 - d1^2 - d2^2) / (2 d1 d2)) (ohm): unequal parallel wires in air."""
    require_positive("spacing_mm", spacing_mm)
    require_positive("diameter1_mm", diameter1_mm)
    require_positive("diameter2_mm", diameter2_mm)
    if 2 * spacing_mm <= diameter1_mm + diameter2_mm:
        raise DesignError("the conductors overlap: the centre spacing must exceed the sum of "
                          "their radii", field="spacing_mm", value=spacing_mm)
    arg = (4 * spacing_mm ** 2 - diameter1_mm ** 2 - diameter2_mm ** 2) / (
        2 * diameter1_mm * diameter2_mm)
    return 60.0 * math.acosh(arg)


def _beta_per_mm(frequency_hz: float, velocity_factor: float) -> float:
    require_positive("frequency_hz", frequency_hz)
    require_range("velocity_factor", velocity_factor, 0.1, 1.0, "a line's phase velocity "
                  "over c")
    return 2 * math.pi * frequency_hz / (velocity_factor * C0_MM_S)


def shorted_stub_reactance_ohm(z0_ohm: float, length_mm: float, frequency_hz: float,
                               velocity_factor: float = 1.0) -> float:
    """Reactance X = Z0 tan(beta l) (ohm) of a lossless stub shorted at its far end."""
    require_positive("z0_ohm", z0_ohm)
    require_positive("length_mm", length_mm)
    return z0_ohm * math.tan(_beta_per_mm(frequency_hz, velocity_factor) * length_mm)


def shorted_stub_length_mm(z0_ohm: float, reactance_ohm: float, frequency_hz: float,
                           velocity_factor: float = 1.0) -> float:
    """Shortest shorted stub (mm) of `z0_ohm` with reactance `reactance_ohm`.

    A positive (inductive) reactance needs under a quarter wave, a negative one
    between a quarter and a half wave.
    """
    require_positive("z0_ohm", z0_ohm)
    if not math.isfinite(reactance_ohm) or reactance_ohm == 0:
        raise DesignError("a shorted stub of non-zero length needs a non-zero reactance",
                          field="reactance_ohm", value=reactance_ohm)
    angle = math.atan(reactance_ohm / z0_ohm)
    if angle < 0:
        angle += math.pi
    return angle / _beta_per_mm(frequency_hz, velocity_factor)


def l_network_input_ohm(load_ohm: complex, shunt_reactance_ohm: float) -> complex:
    """Impedance of `load_ohm` with a reactance `shunt_reactance_ohm` across it."""
    if shunt_reactance_ohm == 0:
        raise DesignError("a zero shunt reactance is a short circuit",
                          field="shunt_reactance_ohm", value=shunt_reactance_ohm)
    zp = 1j * shunt_reactance_ohm
    return complex(load_ohm * zp / (load_ohm + zp))


@dataclass(frozen=True)
class HairpinMatch:
    """A hairpin (beta) match.

    element_reactance_ohm: the capacitive reactance (negative) the shortened
    driven element must present; reactance_change_ohm: that minus the element's
    present reactance (when given; negative: shorten it); shunt_reactance_ohm and
    inductance_h: the hairpin's; z0_ohm: its line impedance; length_mm: from the
    element's terminals to the shorting bar; q: the network's Q.
    """

    element_resistance_ohm: float
    system_ohm: float
    q: float
    element_reactance_ohm: float
    reactance_change_ohm: float | None
    shunt_reactance_ohm: float
    inductance_h: float
    z0_ohm: float
    length_mm: float


def hairpin_match(element_resistance_ohm: float, system_ohm: float, frequency_hz: float, *,
                  rod_spacing_mm: float, rod_diameter_mm: float,
                  element_reactance_ohm: float | None = None,
                  velocity_factor: float = 1.0) -> HairpinMatch:
    """Design a hairpin match from the element's resistance to `system_ohm`.

    The element's resistance must be below the system impedance (a Yagi's driven
    element usually is). `element_reactance_ohm`, if given, is the element's
    present reactance; the result says how far to move it.
    """
    require_positive("element_resistance_ohm", element_resistance_ohm)
    require_positive("system_ohm", system_ohm)
    if element_resistance_ohm >= system_ohm:
        raise DesignError("a hairpin raises the resistance: the element's resistance must "
                          "be below the system impedance", field="element_resistance_ohm",
                          value=element_resistance_ohm)
    q = math.sqrt(system_ohm / element_resistance_ohm - 1.0)
    xs = -q * element_resistance_ohm
    xp = system_ohm / q
    z0 = two_wire_z0_ohm(rod_spacing_mm, rod_diameter_mm)
    length = shorted_stub_length_mm(z0, xp, frequency_hz, velocity_factor)
    change = None if element_reactance_ohm is None else xs - element_reactance_ohm
    return HairpinMatch(element_resistance_ohm=element_resistance_ohm, system_ohm=system_ohm,
                        q=q, element_reactance_ohm=xs, reactance_change_ohm=change,
                        shunt_reactance_ohm=xp,
                        inductance_h=xp / (2 * math.pi * frequency_hz), z0_ohm=z0,
                        length_mm=length)


def current_division(spacing_mm: float, rod_diameter_mm: float,
                     element_diameter_mm: float) -> float:
    """a = ln(2s/d_rod) / ln(2s/d_element): element current over rod current, antenna mode."""
    require_positive("spacing_mm", spacing_mm)
    require_positive("rod_diameter_mm", rod_diameter_mm)
    require_positive("element_diameter_mm", element_diameter_mm)
    if 2 * spacing_mm <= rod_diameter_mm + element_diameter_mm:
        raise DesignError("the rod and element overlap: the centre spacing must exceed the sum "
                          "of their radii", field="spacing_mm", value=spacing_mm)
    return math.log(2 * spacing_mm / rod_diameter_mm) / math.log(
        2 * spacing_mm / element_diameter_mm)


def _parallel(a: complex, b: complex) -> complex:
    return a * b / (a + b)


def gamma_input_ohm(element_ohm: complex, frequency_hz: float, *, rod_length_mm: float,
                    spacing_mm: float, rod_diameter_mm: float, element_diameter_mm: float,
                    capacitance_f: float | None = None, velocity_factor: float = 1.0) -> complex:
    """Input impedance (ohm) of a gamma match on an element of impedance `element_ohm`.

    rod_length_mm: from the element's centre to the strap; spacing_mm: rod to
    element, centre to centre; capacitance_f: the series capacitor (None: none).
    """
    require_positive("rod_length_mm", rod_length_mm)
    alpha = current_division(spacing_mm, rod_diameter_mm, element_diameter_mm)
    z0 = unequal_wire_z0_ohm(spacing_mm, rod_diameter_mm, element_diameter_mm)
    zt = 1j * z0 * math.tan(_beta_per_mm(frequency_hz, velocity_factor) * rod_length_mm)
    z = _parallel(zt, (1 + alpha) ** 2 * complex(element_ohm) / 2)
    if capacitance_f is not None:
        require_positive("capacitance_f", capacitance_f)
        z -= 1j / (2 * math.pi * frequency_hz * capacitance_f)
    return complex(z)


def t_match_input_ohm(element_ohm: complex, frequency_hz: float, *, t_length_mm: float,
                      spacing_mm: float, rod_diameter_mm: float, element_diameter_mm: float,
                      capacitance_each_f: float | None = None,
                      velocity_factor: float = 1.0) -> complex:
    """Balanced input impedance (ohm) of a T match on an element of `element_ohm`.

    t_length_mm: strap to strap (the T spans the element's centre);
    capacitance_each_f: a series capacitor in each leg (None: none).
    """
    require_positive("t_length_mm", t_length_mm)
    alpha = current_division(spacing_mm, rod_diameter_mm, element_diameter_mm)
    z0 = unequal_wire_z0_ohm(spacing_mm, rod_diameter_mm, element_diameter_mm)
    zt = 1j * z0 * math.tan(_beta_per_mm(frequency_hz, velocity_factor) * t_length_mm / 2)
    z = _parallel(2 * zt, (1 + alpha) ** 2 * complex(element_ohm))
    if capacitance_each_f is not None:
        require_positive("capacitance_each_f", capacitance_each_f)
        z -= 2j / (2 * math.pi * frequency_hz * capacitance_each_f)
    return complex(z)


def _solve_shunt(z_antenna: complex, system_ohm: float) -> tuple[float, float]:
    """Shunt reactance X_t (>0) across `z_antenna` and series capacitive X_c (>0) for a match.

    Y = 1/Z_a + 1/(j X_t) must have Re(1/Y) = R_sys with Im(1/Y) > 0 (left for
    the capacitor).
    """
    ya = 1 / z_antenna
    g, b = ya.real, ya.imag
    if g <= 0:
        raise DesignError("the element's resistance must be positive", field="element_ohm",
                          value=z_antenna)
    disc = g / system_ohm - g * g
    if disc < 0:
        raise DesignError(f"the most this match reaches is {1 / g:.4g} ohm (the stepped-up "
                          "element's |Z|^2/R): raise the step-up with a thinner rod beside the "
                          "element, or match to a lower impedance", field="system_ohm",
                          value=system_ohm)
    b_needed = -math.sqrt(disc)
    inv_xt = b - b_needed  # 1/X_t from  b - 1/X_t = b_needed
    if inv_xt <= 0:
        raise DesignError("the match would need a capacitive section: lengthen the element "
                          "so it is inductive", field="element_ohm", value=z_antenna)
    xc = -b_needed * system_ohm / g
    return 1 / inv_xt, xc


@dataclass(frozen=True)
class GammaMatch:
    """A gamma match: rod length (centre to strap, mm), series capacitor (F), the model's terms."""

    rod_length_mm: float
    capacitance_f: float
    capacitor_reactance_ohm: float
    z0_ohm: float
    current_division: float
    step_up: float
    input_ohm: complex


def gamma_match(element_ohm: complex, system_ohm: float, frequency_hz: float, *,
                spacing_mm: float, rod_diameter_mm: float, element_diameter_mm: float,
                velocity_factor: float = 1.0) -> GammaMatch:
    """Design a gamma match from the element's impedance to `system_ohm` (see SOURCES)."""
    require_positive("system_ohm", system_ohm)
    alpha = current_division(spacing_mm, rod_diameter_mm, element_diameter_mm)
    z0 = unequal_wire_z0_ohm(spacing_mm, rod_diameter_mm, element_diameter_mm)
    za = (1 + alpha) ** 2 * complex(element_ohm) / 2
    xt, xc = _solve_shunt(za, system_ohm)
    beta = _beta_per_mm(frequency_hz, velocity_factor)
    length = math.atan(xt / z0) / beta
    cap = 1 / (2 * math.pi * frequency_hz * xc)
    zin = gamma_input_ohm(element_ohm, frequency_hz, rod_length_mm=length, spacing_mm=spacing_mm,
                          rod_diameter_mm=rod_diameter_mm,
                          element_diameter_mm=element_diameter_mm, capacitance_f=cap,
                          velocity_factor=velocity_factor)
    return GammaMatch(rod_length_mm=length, capacitance_f=cap, capacitor_reactance_ohm=xc,
                      z0_ohm=z0, current_division=alpha, step_up=(1 + alpha) ** 2, input_ohm=zin)


@dataclass(frozen=True)
class TMatch:
    """A T match: length strap to strap (mm), a capacitor in each leg (F), and the model's terms."""

    t_length_mm: float
    capacitance_each_f: float
    capacitor_reactance_total_ohm: float
    z0_ohm: float
    current_division: float
    step_up: float
    input_ohm: complex


def t_match(element_ohm: complex, system_ohm: float, frequency_hz: float, *, spacing_mm: float,
            rod_diameter_mm: float, element_diameter_mm: float,
            velocity_factor: float = 1.0) -> TMatch:
    """Design a T match from the element's impedance to a balanced `system_ohm`.

    A 4:1 balun to 50 ohm coaxial cable asks for 200 ohm here.
    """
    require_positive("system_ohm", system_ohm)
    alpha = current_division(spacing_mm, rod_diameter_mm, element_diameter_mm)
    z0 = unequal_wire_z0_ohm(spacing_mm, rod_diameter_mm, element_diameter_mm)
    za = (1 + alpha) ** 2 * complex(element_ohm)
    xt2, xc = _solve_shunt(za, system_ohm)  # xt2 = 2 Z0 tan(beta l / 2)
    beta = _beta_per_mm(frequency_hz, velocity_factor)
    length = 2 * math.atan(xt2 / (2 * z0)) / beta
    cap_each = 2 / (2 * math.pi * frequency_hz * xc)
    zin = t_match_input_ohm(element_ohm, frequency_hz, t_length_mm=length, spacing_mm=spacing_mm,
                            rod_diameter_mm=rod_diameter_mm,
                            element_diameter_mm=element_diameter_mm,
                            capacitance_each_f=cap_each, velocity_factor=velocity_factor)
    return TMatch(t_length_mm=length, capacitance_each_f=cap_each,
                  capacitor_reactance_total_ohm=xc, z0_ohm=z0, current_division=alpha,
                  step_up=(1 + alpha) ** 2, input_ohm=zin)
