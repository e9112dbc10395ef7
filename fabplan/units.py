"""Quantities at the edges: parsing what people type, formatting what they read.

Inside, lengths are millimetres, masses kilograms, frequencies hertz, power
watts. A length in a design file is a string with its unit: "35 1/4 in",
"35.25in", "10-3/4 in", "2 ft 11 1/4 in", "2'-11 1/4\"", "2′ 11-1/4″", "1/4\"",
"894.6 mm", "89.46 cm", "0.8946 m". A bare number is an error, never a guess;
so is a unit given twice or after a smaller one ("10 in 3 in", "3 in 2 ft").
Every length, frequency, mass and power is bounded (MAX_LENGTH_MM and the
other constants below, each with its reason).

This is the one module that formats numbers for people: every renderer (text,
tables, the build sheet, drawings) and every finding message takes its
lengths, frequencies, money and weights from here.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from fractions import Fraction
from typing import Literal

from .errors import DesignError

__all__ = [
    "MM", "CM", "M", "IN", "FT", "LB_KG", "OZ_KG", "LengthUnit", "LENGTH_UNITS", "FRACTIONS",
    "Currency", "CURRENCY_SYMBOLS", "MAX_LENGTH_MM", "MIN_LENGTH_MM", "MAX_LENGTH_CHARS",
    "MIN_FREQUENCY_HZ", "MAX_FREQUENCY_HZ", "MAX_POWER_W", "MAX_MASS_KG", "format_limit",
    "parse_length", "parse_frequency", "parse_angle", "parse_mass", "parse_power",
    "parse_currency", "format_inches", "format_mm", "format_length", "format_signed_length",
    "format_frequency", "format_money", "format_weight", "format_number", "format_angle",
    "format_drawing_length", "wrap_words", "parse_capacitance", "parse_resistance",
    "parse_voltage", "format_capacitance", "format_voltage",
]

MM = 1.0
CM = 10.0
M = 1000.0
IN = 25.4
FT = 304.8
# source: NIST SP 811, appendix B (exact definitions of the avoirdupois pound and ounce)
LB_KG = 0.45359237
OZ_KG = LB_KG / 16

LengthUnit = Literal["in", "mm"]
LENGTH_UNITS: tuple[LengthUnit, ...] = ("in", "mm")
FRACTIONS = (8, 16, 32, 64)

_FACTORS = {
    "mm": MM, "millimetre": MM, "millimetres": MM, "millimeter": MM, "millimeters": MM,
    "cm": CM, "m": M, "metre": M, "metres": M, "meter": M, "meters": M,
    "in": IN, "inch": IN, "inches": IN, '"': IN, "''": IN,
    "ft": FT, "foot": FT, "feet": FT, "'": FT,
}
_METRIC = {MM, CM, M}

# -- bounds on what a design may say (checked before any work starts) ----------------
# A hand-built antenna element: no one dimension over 100 m (an 80 m-band full-wave
# loop has sides of about 21 m; a 160 m-band half-wave dipole is about 80 m long),
# and nothing finer than 0.01 mm (finer than a micrometer reads in a shop).
MAX_LENGTH_MM = 100_000.0
MIN_LENGTH_MM = 0.01
MAX_LENGTH_CHARS = 100  # a length as typed ("2 ft 11 1/4 in" is 14 characters)
# Frequencies an antenna element bent by hand is made for: 1 kHz (far below any
# radio band) to 100 GHz (wavelength 3 mm, about the size of the stock itself).
MIN_FREQUENCY_HZ = 1e3
MAX_FREQUENCY_HZ = 100e9
MAX_POWER_W = 1e6  # 1 MW: far above any amateur or broadcast transmitter
MAX_MASS_KG = 1000.0  # one bought part: 1 t

# typographic marks people paste from word processors, and spaces that are not spaces
_MARKS = str.maketrans({"\u2033": '"', "\u201d": '"', "\u201c": '"', "\u2032": "'",
                        "\u2019": "'", "\u2018": "'", "\u00a0": " ", "\u2009": " ",
                        "\u202f": " "})
# one number: a decimal, a whole number and a fraction (a space or a dash between),
# or a fraction
_NUM = r"(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?"
_QTY = rf"(?:(?P<whole>\d+)(?:\s+|\s*-\s*)(?P<frac>\d+/\d+)|(?P<only>\d+/\d+)|(?P<dec>{_NUM}))"
_TERM = re.compile(rf"\s*{_QTY}\s*(?P<unit>[a-zA-Z]+|''|\"|')\s*(?:-\s*)?")
_LENGTH_EXAMPLES = '"35 1/4 in", "10-3/4 in", "2 ft 11 1/4 in" or "894.6 mm"'


def _fraction(text: str) -> float:
    num, den = text.split("/")
    if int(den) == 0:
        raise ValueError("zero denominator")
    return int(num) / int(den)


def _quantity(m: re.Match[str]) -> float:
    if m.group("whole") is not None:
        return int(m.group("whole")) + _fraction(m.group("frac"))
    if m.group("only") is not None:
        return _fraction(m.group("only"))
    return float(m.group("dec"))


def _unit_name(factor: float) -> str:
    return {MM: "mm", CM: "cm", M: "m", IN: "in", FT: "ft"}[factor]


def parse_length(text: object, field: str, *, allow_zero: bool = False,
                 allow_negative: bool = False, max_mm: float = MAX_LENGTH_MM,
                 bound: str = "") -> float:
    """Parse a length with its unit and return millimetres.

    Accepts what the trade writes: "35 1/4 in", "10-3/4 in", "10 3/4\"",
    "2 ft 11-1/4 in", "2'-11 1/4\"", typographic marks (″ ′ and curly quotes),
    "894.6 mm", "0.8946 m". Several terms give each unit once, the larger first,
    never metric and inch units together. `field` names the design key for the
    error message. Zero and negative lengths are errors unless allowed; a
    non-zero length must lie between MIN_LENGTH_MM and `max_mm` (mm); `bound`
    says why `max_mm` (by default: fabplan's bound on one dimension of a
    hand-built antenna).
    """
    if isinstance(text, bool) or not isinstance(text, str):
        if isinstance(text, (int, float)):
            raise DesignError('a bare number has no unit: write it as a string with its unit, '
                              'e.g. "35 1/4 in" or "894.6 mm"', field=field, value=text)
        raise DesignError("expected a length with a unit, e.g. \"35 1/4 in\" or \"894.6 mm\"",
                          field=field, value=text)
    if len(text) > MAX_LENGTH_CHARS:
        raise DesignError(f"a length is at most {MAX_LENGTH_CHARS} characters, e.g. "
                          f"{_LENGTH_EXAMPLES}", field=field, value=text)
    raw = text.translate(_MARKS).strip()
    sign = 1.0
    if raw.startswith("-"):
        sign = -1.0
        raw = raw[1:].lstrip()
    if re.search(r"nan|inf", raw.lower()):
        raise DesignError("a length must be a finite number with a unit", field=field, value=text)
    pos = 0
    total = 0.0
    units: list[float] = []
    while pos < len(raw):
        m = _TERM.match(raw, pos)
        if not m or m.end() == pos:
            break
        unit = m.group("unit")
        factor = _FACTORS.get(unit.lower() if unit not in {'"', "'", "''"} else unit)
        if factor is None:
            raise DesignError(f"unknown unit {unit!r}: use in, ft, mm, cm or m",
                              field=field, value=text)
        if units and factor >= units[-1]:
            again = "repeats" if factor == units[-1] else "comes after a smaller unit"
            raise DesignError(f"the unit {_unit_name(factor)!r} {again}: give each unit once, "
                              'the larger first, e.g. "2 ft 11 1/4 in"', field=field, value=text)
        if units and (factor in _METRIC) != (units[-1] in _METRIC):
            raise DesignError('do not mix metric and inch units in one length: write e.g. '
                              '"2 ft 11 1/4 in" or "895.4 mm"', field=field, value=text)
        try:
            total += _quantity(m) * factor
        except (ValueError, ZeroDivisionError, OverflowError):
            raise DesignError("not a number", field=field, value=text) from None
        units.append(factor)
        pos = m.end()
    rest = raw[pos:].strip()
    if not units or rest:
        if re.fullmatch(rf"{_NUM}(\s*-?\s*\d+/\d+)?|\d+/\d+", raw):
            raise DesignError('a bare number has no unit: add one, e.g. "35 1/4 in" or "894.6 mm"',
                              field=field, value=text)
        raise DesignError(f"not a length: write a number with its unit, e.g. {_LENGTH_EXAMPLES}",
                          field=field, value=text)
    value = sign * total
    if not math.isfinite(value):
        raise DesignError("a length must be finite", field=field, value=text)
    if value < 0 and not allow_negative:
        raise DesignError("must not be negative", field=field, value=text)
    if value == 0 and not allow_zero:
        raise DesignError("must be greater than zero", field=field, value=text)
    if abs(value) > max_mm:
        why = bound or "fabplan's bound on one dimension of a hand-built antenna"
        raise DesignError(f"must be at most {format_limit(max_mm)} ({why})", field=field,
                          value=text)
    if 0 < abs(value) < MIN_LENGTH_MM:
        raise DesignError(f"a length other than zero must be at least {MIN_LENGTH_MM:g} mm "
                          "(finer than a shop can measure)", field=field, value=text)
    return value


def format_limit(mm: float) -> str:
    """A bound on a length for an error message: "100 m", "500 mm", "0.5 mm"."""
    if mm >= 1000 and mm % 1000 == 0:
        return f"{mm / 1000:g} m"
    return f"{mm:g} mm"


_FREQ = {"hz": 1.0, "khz": 1e3, "mhz": 1e6, "ghz": 1e9}


def parse_frequency(text: object, field: str, *, low_hz: float = MIN_FREQUENCY_HZ,
                    high_hz: float = MAX_FREQUENCY_HZ) -> float:
    """Parse "146 MHz", "7.1 MHz", "433.92MHz" into hertz, from `low_hz` to
    `high_hz` (by default 1 kHz to 100 GHz)."""
    if not isinstance(text, str) or len(text) > MAX_LENGTH_CHARS:
        raise DesignError('expected a frequency with its unit, e.g. "146 MHz"', field=field,
                          value=text)
    m = re.fullmatch(rf"\s*({_NUM})\s*([a-zA-Z]+)\s*", text)
    if not m:
        raise DesignError('expected a frequency with its unit, e.g. "146 MHz"', field=field,
                          value=text)
    factor = _FREQ.get(m.group(2).lower())
    if factor is None:
        raise DesignError(f"unknown frequency unit {m.group(2)!r}: use Hz, kHz, MHz or GHz",
                          field=field, value=text)
    value = float(m.group(1)) * factor
    if not math.isfinite(value) or value <= 0:
        raise DesignError("must be a positive frequency", field=field, value=text)
    if not low_hz <= value <= high_hz:
        raise DesignError(f"must lie between {_hz_text(low_hz)} and {_hz_text(high_hz)} (the "
                          "frequencies fabplan plans a hand-built element for)", field=field,
                          value=text)
    return value


def _hz_text(hz: float) -> str:
    """A frequency bound in the largest unit it is a whole number of: "1 kHz", "100 GHz"."""
    for unit, factor in (("GHz", 1e9), ("MHz", 1e6), ("kHz", 1e3)):
        if hz >= factor:
            return f"{hz / factor:g} {unit}"
    return f"{hz:g} Hz"


def parse_angle(value: object, field: str) -> float:
    """An angle in degrees: a number, or a string such as "90 deg"."""
    if isinstance(value, bool):
        raise DesignError("expected an angle in degrees", field=field, value=value)
    if isinstance(value, (int, float)):
        try:
            deg = float(value)
        except OverflowError:
            raise DesignError("an angle must be finite", field=field, value=value) from None
    elif isinstance(value, str) and len(value) <= MAX_LENGTH_CHARS:
        m = re.fullmatch(rf"\s*(-?{_NUM})\s*(deg|degrees|°)?\s*", value)
        if not m:
            raise DesignError('expected an angle in degrees, e.g. 90 or "90 deg"', field=field,
                              value=value)
        deg = float(m.group(1))
    else:
        raise DesignError("expected an angle in degrees", field=field, value=value)
    if not math.isfinite(deg):
        raise DesignError("an angle must be finite", field=field, value=value)
    return deg


def format_inches(mm: float, denominator: int = 32) -> str:
    """A length as a tape measure reads it: `35 1/4"`, `1 3/32"`, `-5/8"`."""
    if denominator not in FRACTIONS:
        raise DesignError(f"fraction precision must be one of {FRACTIONS}", field="precision",
                          value=denominator)
    sign = "-" if mm < 0 else ""
    ticks = round(round(abs(mm) / IN * denominator, 6))
    whole, rest = divmod(ticks, denominator)
    if rest == 0:
        return f'{sign}{whole}"'
    frac = Fraction(rest, denominator)
    if whole == 0:
        return f'{sign}{frac.numerator}/{frac.denominator}"'
    return f'{sign}{whole} {frac.numerator}/{frac.denominator}"'


def format_mm(mm: float, places: int = 1) -> str:
    """Millimetres to 0.1 by default: `894.6 mm`."""
    value = round(round(mm, 6), places)
    if value == 0:
        value = 0.0
    return f"{value:.{places}f} mm"


def format_length(mm: float, primary: LengthUnit = "in", denominator: int = 32) -> str:
    """Both units, the design's primary unit first: `35 1/4" (895.4 mm)`."""
    if primary == "in":
        return f"{format_inches(mm, denominator)} ({format_mm(mm)})"
    return f"{format_mm(mm)} ({format_inches(mm, denominator)})"


def format_frequency(hz: float) -> str:
    """`146.000 MHz`, `7.150 MHz`, `915 kHz` style."""
    if hz >= 1e9:
        return f"{hz / 1e9:.4f} GHz"
    if hz >= 1e6:
        return f"{hz / 1e6:.3f} MHz"
    if hz >= 1e3:
        return f"{hz / 1e3:.2f} kHz"
    return f"{hz:.1f} Hz"


def format_voltage(volt: float) -> str:
    """`850 V`, `6.13 kV` style (V in)."""
    if abs(volt) >= 1000:
        return f"{volt / 1000:.2f} kV"
    return f"{volt:.0f} V"


def format_signed_length(mm: float, primary: LengthUnit = "in", denominator: int = 32) -> str:
    """A change of length with its sign: `+1/8" (+3.2 mm)`, `-2.0 mm`."""
    sign = "+" if mm > 0 else ""
    if primary == "in":
        return f"{sign}{format_inches(mm, denominator)} ({sign}{format_mm(mm)})"
    return f"{sign}{format_mm(mm)}"


def format_number(x: float, places: int = 1) -> str:
    """A figure to `places` decimals, never "-0.0"."""
    v = round(x, places)
    return f"{0.0 if v == 0 else v:.{places}f}"


def format_impedance(z: complex, places: int = 1) -> str:
    """An impedance as `R +Xj` to `places` decimals (`40.1 +0.0j`), never "-0.0"."""
    x = format_number(z.imag, places)
    return f"{format_number(z.real, places)} {x if x.startswith('-') else '+' + x}j"


def format_angle(deg: float) -> str:
    """An angle in degrees for people: one decimal at most, none when whole
    (`90`, `355.4`, `-12.5`)."""
    v = round(deg, 1)
    if v == 0:
        return "0"
    return f"{v:.0f}" if v == round(v) else f"{v:.1f}"


def format_weight(kg: float, unit: LengthUnit = "mm") -> str:
    """`84.8 g`, `1.234 kg`; with pounds beside it when the shop works in inches."""
    text = f"{kg * 1000:.1f} g" if kg < 1 else f"{kg:.3f} kg"
    return f"{text} ({kg / LB_KG:.2f} lb)" if unit == "in" else text


# -- money ---------------------------------------------------------------------
# currency symbols accepted in place of an ISO 4217 code (written before the amount)
CURRENCY_SYMBOLS = ("$", "€", "£", "¥", "₹", "₩", "₽", "₺", "₪", "₱", "₫", "₴", "₦", "฿", "R$",
                    "A$", "C$", "NZ$", "HK$", "S$", "kr", "zł", "Kč", "Fr", "CHF")
_CODE = re.compile(r"[A-Z]{3}")


@dataclass(frozen=True)
class Currency:
    """An ISO 4217 code ("USD", shown "USD 12.50") or a symbol ("$", shown "$12.50")."""

    label: str
    is_code: bool

    def format(self, amount: float) -> str:
        """Two decimals with the code or symbol: "USD 1,234.50", "$1,234.50"."""
        sign = "-" if amount < 0 else ""
        text = f"{abs(round(amount, 2)):,.2f}"
        if self.is_code:
            return f"{sign}{self.label} {text}"
        return f"{sign}{self.label}{text}"


def format_money(amount: float | None, currency: Currency | None) -> str:
    """An amount in its currency ("USD 1,234.50"), "1,234.50" without one, "-" for none."""
    if amount is None:
        return "-"
    return currency.format(amount) if currency is not None else f"{amount:,.2f}"


def parse_currency(value: object, field: str) -> Currency:
    """A currency: a three-letter ISO 4217 code such as "USD", "EUR", "GBP", or a symbol."""
    if isinstance(value, str):
        text = value.strip()
        if _CODE.fullmatch(text):
            return Currency(text, True)
        if text in CURRENCY_SYMBOLS:
            return Currency(text, False)
        if _CODE.fullmatch(text.upper()):
            raise DesignError(f"write the currency code in capitals, e.g. {text.upper()!r}",
                              field=field, value=value)
    raise DesignError('unknown currency format: give a three-letter code such as "USD", "EUR" '
                      f'or "GBP", or one of the symbols {" ".join(CURRENCY_SYMBOLS)}',
                      field=field, value=value)


# -- mass and power ---------------------------------------------------------------
_MASS_UNITS = {"kg": 1.0, "g": 1e-3, "lb": LB_KG, "lbs": LB_KG, "oz": OZ_KG}
_MASS = re.compile(r"\s*(?P<num>(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?)\s*(?P<unit>[a-zA-Z]+)\s*")


def parse_mass(value: object, field: str) -> float:
    """A mass with its unit ("45 g", "0.2 kg", "1.5 oz", "2 lb") in kilograms; zero allowed."""
    if isinstance(value, str):
        m = _MASS.fullmatch(value)
        if m:
            unit = m.group("unit").lower()
            if unit not in _MASS_UNITS:
                raise DesignError(f"unknown mass unit {m.group('unit')!r}: use g, kg, oz or lb",
                                  field=field, value=value)
            kg = float(m.group("num")) * _MASS_UNITS[unit]
            if math.isfinite(kg) and kg > MAX_MASS_KG:
                raise DesignError(f"must be at most {MAX_MASS_KG:g} kg", field=field,
                                  value=value)
            if math.isfinite(kg):
                return kg
    raise DesignError('expected a mass with its unit, e.g. "45 g", "0.2 kg", "1.5 oz" or '
                      '"2 lb"', field=field, value=value)


_POWER = re.compile(r"\s*((?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?)\s*(mW|W|kW)\s*")


def parse_power(text: object, field: str) -> float:
    """"50 W", "1.5 kW", "500 mW" -> watts."""
    m = _POWER.fullmatch(text) if isinstance(text, str) else None
    if not m:
        raise DesignError('expected a power with its unit, e.g. "50 W" or "1.5 kW"', field=field,
                          value=text)
    value = float(m.group(1)) * {"mW": 1e-3, "W": 1.0, "kW": 1e3}[m.group(2)]
    if not math.isfinite(value) or value <= 0:
        raise DesignError("must be a positive power", field=field, value=text)
    if value > MAX_POWER_W:
        raise DesignError("must be at most 1 MW", field=field, value=text)
    return value


def format_drawing_length(mm: float, unit: LengthUnit) -> str:
    """A length for a drawing's notes, in the drawing's unit first, to 0.001 in or
    0.01 mm: `1.250 in (31.75 mm)`, `31.75 mm (1.250 in)`."""
    if unit == "in":
        return f"{mm / IN:.3f} in ({mm:.2f} mm)"
    return f"{mm:.2f} mm ({mm / IN:.3f} in)"


def wrap_words(text: str, width: int) -> list[str]:
    """Words of `text` in lines of at most `width` characters (a longer word stands alone)."""
    lines: list[str] = []
    cur = ""
    for w in text.split(" "):
        if cur and len(cur) + 1 + len(w) > width:
            lines.append(cur)
            cur = w
        else:
            cur = f"{cur} {w}" if cur else w
    if cur:
        lines.append(cur)
    return lines


# -- electrical quantities of parts: capacitance, resistance, voltage -----------------
_PART = re.compile(r"\s*((?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?)\s*([a-zA-Zµμ]+)\s*")
_CAPACITANCE = {"pf": 1e-12, "nf": 1e-9, "uf": 1e-6, "µf": 1e-6, "μf": 1e-6, "f": 1.0}
_RESISTANCE = {"mohm": 1e-3, "ohm": 1.0, "ohms": 1.0, "kohm": 1e3}
_VOLTAGE = {"v": 1.0, "kv": 1e3}


def _part(text: object, field: str, table: dict[str, float], what: str, example: str,
          high: float) -> float:
    m = _PART.fullmatch(text) if isinstance(text, str) else None
    if not m:
        raise DesignError(f"expected {what} with its unit, e.g. {example}", field=field,
                          value=text)
    unit = m.group(2)
    factor = table.get(unit.lower()) if unit != "mOhm" else 1e-3
    if factor is None:
        raise DesignError(f"unknown unit {unit!r} for {what}: use "
                          + ", ".join(k for k in table if k.isascii()), field=field, value=text)
    value = float(m.group(1)) * factor
    if not (math.isfinite(value) and 0 < value <= high):
        raise DesignError(f"must be positive and at most {high:g} in SI units", field=field,
                          value=text)
    return value


def parse_capacitance(text: object, field: str) -> float:
    """"120 pF", "0.1 uF", "1 nF" -> farads (positive, at most 1 F)."""
    return _part(text, field, _CAPACITANCE, "a capacitance", '"120 pF"', 1.0)


def parse_resistance(text: object, field: str) -> float:
    """"0.05 ohm", "50 mohm", "1 kohm" -> ohms (positive, at most 1 Mohm)."""
    return _part(text, field, _RESISTANCE, "a resistance", '"0.05 ohm"', 1e6)


def parse_voltage(text: object, field: str) -> float:
    """"5 kV", "500 V" -> volts (positive, at most 1 MV)."""
    return _part(text, field, _VOLTAGE, "a voltage", '"5 kV"', 1e6)


def format_capacitance(farads: float) -> str:
    """A capacitance for people: "33.0 pF", "1.20 nF" (F in)."""
    if farads < 1e-9:
        return f"{farads * 1e12:.1f} pF"
    if farads < 1e-6:
        return f"{farads * 1e9:.2f} nF"
    return f"{farads * 1e6:.2f} uF"
