"""Touchstone one-port (.s1p) files: a reader and a writer.

Written from the published specification: "Touchstone(R) File Format
Specification, Version 2.0", ratified by the IBIS Open Forum, 24 April 2009
(its general syntax rules, option line, keywords and data lines), which also
defines the original syntax ("Version 1.x": files without [Version], the
syntax of the EIA/IBIS "Touchstone File Format Specification, Rev 1.1", 2002).
Sections are named below; points read from the specification in the session
that wrote this module are marked [read], points recalled are marked [memory].

What the reader accepts
-----------------------
- Case does not matter anywhere (general syntax rule 1) [read].
- Outside comments only printable ASCII and tab (rule 2) [read]; inside a
  comment any character but control characters is let through, because
  analyser software writes degree and ohm signs there.
- "!" starts a comment, to the end of the line, on a line of its own or after
  data (rule 3) [read]. Blank lines are allowed anywhere.
- The option line "# <frequency unit> <parameter> <format> R <n>" (section
  "Option Line") [read]: unit Hz, kHz, MHz or GHz (default GHz); parameter S,
  Y or Z (default S; H and G exist only for two-ports and are refused); format
  RI (real, imaginary), MA (magnitude, angle in degrees) or DB (20 log10 of the
  magnitude, angle in degrees) (default MA); R and a positive reference
  resistance in ohms (default 50). Missing fields take their defaults; the
  fields are told apart by their values, so their order is not checked.
  Option lines after the first are ignored (section "Option Line") [read].
  Several values after R (version 1.1's per-port syntax, added to the 2.1
  specification) are refused: a one-port has one.
- Version 1.x data: one line per frequency, "frequency pair" (a one-port's
  data set is on one data line, section "Data Lines") [read]; data sets in
  increasing order of frequency [read]. Y and Z of a version 1.x file are
  normalized to R [memory; scikit-rf 2.2 writes them so, see the skrf_v1_z and
  skrf_v1_y reference files].
- Version 2.0 (and 2.1) keywords [memory of the 2.0 keyword list and order]:
  [Version] first; the option line; [Number of Ports] (must be 1);
  [Number of Frequencies] (required, checked against the data); [Reference]
  (one positive value, on its own line or the next; it overrides R);
  [Matrix Format] (Full, Lower or Upper: the same for one port);
  [Begin Information] ... [End Information] (skipped); [Network Data]; the
  data; [End] (required: TSIRD 4, accepted by the IBIS Open Forum 2022, made
  explicit that [End] is required) [read]. [Two-Port Data Order],
  [Number of Noise Frequencies], [Noise Data] and [Mixed-Mode Order] belong to
  multi-port files and are refused. In a version 2 file the values of one
  frequency may continue on the next lines, a complex pair never split: a
  line with an odd count of numbers starts a frequency, an even count
  continues it (the IBIS parser's rule, as its test file
  v1/network_data/whitespace_4.ts shows, citing the 2.0 specification, page
  13, item 2) [read]. Y and Z in version 2 files are in siemens and ohms, not
  normalized [memory; scikit-rf 2.2 writes them so].

Anything else (two or more ports, a bad token, a decreasing frequency, a
truncated file) is one `DesignError` line naming the file, the line number,
the value and the rule. Bounds: `MAX_TEXT_CHARS` characters and `MAX_POINTS`
frequencies (fabplan.measure.sweep).

The writer writes version 1.1 syntax by default (or 2.0), S parameters, any
unit and format, numbers as Python's shortest round-trip decimal (same input,
same bytes).
"""

from __future__ import annotations

import math
import re
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Literal

import numpy as np
import numpy.typing as npt

from ..errors import DesignError
from .sweep import (
    FREQUENCY_FACTORS,
    MAX_POINTS,
    ComplexArray,
    FloatArray,
    FrequencyUnit,
    MeasuredSweep,
    check_text,
    gamma_from_z,
    parse_number,
    short,
    sweep_from_s11,
)

__all__ = [
    "DataFormat",
    "Parameter",
    "TouchstoneOnePort",
    "TouchstoneVersion",
    "WriteVersion",
    "predicted_touchstone",
    "read_touchstone",
    "write_touchstone",
]

DataFormat = Literal["RI", "MA", "DB"]
Parameter = Literal["S", "Y", "Z"]
TouchstoneVersion = Literal["1.x", "2.0", "2.1"]
WriteVersion = Literal["1.1", "2.0"]

_FORMATS: tuple[DataFormat, ...] = ("RI", "MA", "DB")
_PARAMETERS: tuple[Parameter, ...] = ("S", "Y", "Z")
_UNITS: dict[str, FrequencyUnit] = {u.lower(): u for u in FREQUENCY_FACTORS}
_LINES = re.compile(r"\r\n|\r|\n")
_NOT_ASCII = re.compile(r"[^\t\x20-\x7e]")
_CONTROL = re.compile(r"[\x00-\x08\x0a-\x1f\x7f]")
_KEYWORD = re.compile(r"\[([^\]]*)\](.*)\Z")
_MULTI_PORT_KEYWORDS = ("two-port data order", "number of noise frequencies", "noise data",
                        "mixed-mode order")
_MAX_COMMENTS = 200


@dataclass(frozen=True, eq=False)
class TouchstoneOnePort:
    """What a one-port Touchstone file holds.

    freq_hz: frequencies (Hz); s11: S11 against `z0_ohm` (converted from Y or Z
    when the file held those); z0_ohm: reference resistance (ohm, from R or
    [Reference]); version: "1.x" (no [Version] keyword), "2.0" or "2.1";
    frequency_unit, parameter, data_format: as the option line gave them;
    comments: the comment lines' text, in order (at most 200); source: the
    file name given to the reader.
    """

    freq_hz: FloatArray
    s11: ComplexArray
    z0_ohm: float
    version: TouchstoneVersion
    frequency_unit: FrequencyUnit
    parameter: Parameter
    data_format: DataFormat
    comments: tuple[str, ...]
    source: str

    def to_sweep(self) -> MeasuredSweep:
        return sweep_from_s11(self.freq_hz, self.s11, self.z0_ohm, source=self.source)


class _Parser:
    """One pass over the lines; all state lives here."""

    def __init__(self, source: str) -> None:
        self.source = source
        self.version: TouchstoneVersion | None = None
        self.seen_content = False
        self.option_line = 0
        self.unit: FrequencyUnit = "GHz"
        self.parameter: Parameter = "S"
        self.fmt: DataFormat = "MA"
        self.r_ohm = 50.0
        self.reference_ohm: float | None = None
        self.reference_pending = 0  # line number of a [Reference] still waiting for its value
        self.n_ports_line = 0
        self.n_freq: int | None = None
        self.n_freq_line = 0
        self.in_data = False
        self.in_information = 0
        self.ended = False
        self.comments: list[str] = []
        self.freq: list[float] = []
        self.a: list[float] = []
        self.b: list[float] = []
        self.point_lines: list[int] = []
        self.current: list[float] = []
        self.current_line = 0

    # -- errors ---------------------------------------------------------------
    def fail(self, line_no: int, value: str, rule: str) -> DesignError:
        return DesignError(rule, field=f"line {line_no}", value=short(value),
                           source=self.source or None)

    # -- lines ------------------------------------------------------------------
    def feed(self, n: int, raw: str) -> None:
        code, bang, comment = raw.partition("!")
        if bang:
            if _CONTROL.search(comment):
                raise self.fail(n, comment, "a control character is not allowed in a "
                                "Touchstone file (general syntax rules)")
            if len(self.comments) < _MAX_COMMENTS:
                self.comments.append(comment.strip())
        bad = _NOT_ASCII.search(code)
        if bad:
            raise self.fail(n, code.strip(), f"character {bad.group()!r} is not allowed outside "
                            "a comment: a Touchstone file is printable ASCII (general syntax "
                            "rules)")
        text = code.strip()
        if not text:
            return
        if self.ended:
            raise self.fail(n, text, "nothing but comments may follow [End]")
        if self.in_information:
            if re.fullmatch(r"\[\s*end\s+information\s*\].*", text, flags=re.IGNORECASE):
                self.in_information = 0
            return
        if text.startswith("["):
            self.keyword(n, text)
        elif text.startswith("#"):
            self.option(n, text)
        else:
            self.data(n, text)
        self.seen_content = True

    def keyword(self, n: int, text: str) -> None:
        m = _KEYWORD.match(text)
        if not m:
            raise self.fail(n, text, "a keyword is a name in square brackets, e.g. [Version]")
        name = " ".join(m.group(1).lower().split())
        rest = m.group(2).strip()
        if self.reference_pending and name != "reference":
            raise self.fail(self.reference_pending, "[Reference]",
                            "[Reference] needs one reference impedance for the one port")
        if name == "version":
            if self.seen_content:
                raise self.fail(n, text, "[Version] must be the first line that is not a comment")
            if rest not in ("2.0", "2.1"):
                raise self.fail(n, rest, "this reader knows [Version] 2.0 and 2.1 (files "
                                "without [Version] are version 1.x)")
            self.version = "2.0" if rest == "2.0" else "2.1"
            return
        if self.version is None:
            raise self.fail(n, text, "keywords belong to version 2 files: begin the file with "
                            "[Version] 2.0, or remove the keyword")
        if self.in_data and name != "end":
            raise self.fail(n, text, "after [Network Data] only the data and [End] may follow")
        if not self.option_line:
            raise self.fail(n, text, "the option line (# ...) must follow [Version] before "
                            "any other keyword")
        if name == "number of ports":
            k = self.integer(n, rest, "[Number of Ports]")
            if k != 1:
                raise self.fail(n, rest, f"this is a {k}-port file: fabplan reads one-port "
                                "files (S11 of the element)")
            self.n_ports_line = n
        elif name in _MULTI_PORT_KEYWORDS:
            raise self.fail(n, text, "this keyword belongs to files of two or more ports: "
                            "fabplan reads one-port files")
        elif not self.n_ports_line:
            raise self.fail(n, text, "[Number of Ports] must follow the option line")
        elif name == "number of frequencies":
            k = self.integer(n, rest, "[Number of Frequencies]")
            if k < 1:
                raise self.fail(n, rest, "[Number of Frequencies] is a positive whole number")
            if k > MAX_POINTS:
                raise self.fail(n, rest, f"a sweep holds at most {MAX_POINTS} frequencies: "
                                "export fewer points")
            self.n_freq, self.n_freq_line = k, n
        elif name == "reference":
            self.reference_pending = n
            if rest:
                self.reference_values(n, rest)
        elif name == "matrix format":
            if rest.lower() not in ("full", "lower", "upper"):
                raise self.fail(n, rest, "[Matrix Format] is Full, Lower or Upper")
        elif name == "begin information":
            self.in_information = n
        elif name == "end information":
            raise self.fail(n, text, "[End Information] without [Begin Information]")
        elif name == "network data":
            if self.n_freq is None:
                raise self.fail(n, text, "[Number of Frequencies] must come before "
                                "[Network Data]")
            self.in_data = True
        elif name == "end":
            if not self.in_data:
                raise self.fail(n, text, "[End] before [Network Data]")
            self.close_point()
            self.ended = True
        else:
            raise self.fail(n, text, "not a Touchstone 2.0 keyword for a one-port file")

    def integer(self, n: int, text: str, what: str) -> int:
        if not re.fullmatch(r"[+-]?\d{1,9}", text):
            raise self.fail(n, text, f"{what} takes a whole number")
        return int(text)

    def reference_values(self, n: int, text: str) -> None:
        toks = text.split()
        if len(toks) != 1:
            raise self.fail(n, text, "[Reference] takes one reference impedance (ohm) for a "
                            "one-port file")
        x = parse_number(toks[0])
        if x is None or x <= 0:
            raise self.fail(n, toks[0], "a reference impedance is a positive number of ohms")
        self.reference_ohm = x
        self.reference_pending = 0

    def option(self, n: int, text: str) -> None:
        if self.option_line:
            return  # the specification: option lines after the first are ignored
        if self.version is None and self.seen_content:
            raise self.fail(n, text, "the option line must come before the data")
        if self.version is not None and self.n_ports_line:
            raise self.fail(n, text, "the option line must come before [Number of Ports]")
        toks = text[1:].split()
        seen: set[str] = set()
        i = 0
        while i < len(toks):
            t = toks[i].lower()
            if t in _UNITS:
                kind = "frequency unit"
                self.unit = _UNITS[t]
            elif t.upper() in _PARAMETERS:
                kind = "parameter"
                self.parameter = t.upper()  # type: ignore[assignment]
            elif t in ("h", "g"):
                raise self.fail(n, toks[i], "H and G parameters are defined for two-ports; a "
                                "one-port file holds S, Y or Z")
            elif t.upper() in _FORMATS:
                kind = "format"
                self.fmt = t.upper()  # type: ignore[assignment]
            elif t == "r":
                kind = "R"
                values = toks[i + 1:]
                if not values:
                    raise self.fail(n, text, "R is followed by the reference resistance in ohms")
                if len(values) > 1:
                    raise self.fail(n, " ".join(values), "a one-port file has one reference "
                                    "resistance after R")
                x = parse_number(values[0])
                if x is None or x <= 0:
                    raise self.fail(n, values[0], "the reference resistance after R is a "
                                    "positive number of ohms")
                self.r_ohm = x
                i = len(toks)
            else:
                hint = " (write R and its value apart: R 50)" if t.startswith("r") else ""
                raise self.fail(n, toks[i], "not an option: the option line is '# <Hz|kHz|MHz|"
                                f"GHz> <S|Y|Z> <RI|MA|DB> R <ohms>'{hint}")
            if kind in seen:
                raise self.fail(n, toks[min(i, len(toks) - 1)],
                                f"the option line gives the {kind} twice")
            seen.add(kind)
            i += 1
        self.option_line = n

    def data(self, n: int, text: str) -> None:
        if self.reference_pending:
            self.reference_values(n, text)
            return
        if self.version is not None and not self.in_data:
            raise self.fail(n, text, "data must follow [Network Data]")
        if not self.option_line:
            raise self.fail(n, text, "the option line (# <unit> <parameter> <format> R <ohms>) "
                            "must come before the data")
        values: list[float] = []
        for tok in text.split():
            x = parse_number(tok)
            if x is None:
                raise self.fail(n, tok, "expected a number")
            values.append(x)
        if self.version is None:
            if len(values) != 3:
                if len(values) >= 5:
                    rule = (f"{len(values)} numbers on a data line: a file of two or more ports; "
                            "fabplan reads one-port files (frequency and one pair per line)")
                else:
                    rule = ("a one-port data line is a frequency and one pair of values "
                            f"(3 numbers), not {len(values)}")
                raise self.fail(n, text, rule)
            self.current, self.current_line = values, n
            self.close_point()
        elif len(values) % 2:
            self.close_point()
            self.current, self.current_line = values, n
        else:
            if not self.current:
                raise self.fail(n, text, "a line of value pairs must follow a line that begins "
                                "with a frequency")
            self.current.extend(values)

    def close_point(self) -> None:
        if not self.current:
            return
        vals, n = self.current, self.current_line
        self.current = []
        if len(vals) != 3:
            pairs = (len(vals) - 1) // 2
            raise self.fail(n, f"{vals[0]:g}", f"this frequency carries {pairs} pairs of values; "
                            "a one-port file carries one")
        f = vals[0] * FREQUENCY_FACTORS[self.unit]
        if f < 0:
            raise self.fail(n, f"{vals[0]:g}", "a frequency is not negative")
        if self.freq and f <= self.freq[-1]:
            raise self.fail(n, f"{vals[0]:g}", "frequencies must increase from one data line "
                            "to the next (the specification: increasing order of frequency)")
        if len(self.freq) >= MAX_POINTS:
            raise self.fail(n, f"{vals[0]:g}", f"a sweep holds at most {MAX_POINTS} "
                            "frequencies: export fewer points")
        self.freq.append(f)
        self.point_lines.append(n)
        self.a.append(vals[1])
        self.b.append(vals[2])

    def finish(self, last_line: int) -> TouchstoneOnePort:
        if self.reference_pending:
            raise self.fail(self.reference_pending, "[Reference]",
                            "[Reference] needs one reference impedance for the one port")
        if self.in_information:
            raise self.fail(self.in_information, "[Begin Information]",
                            "[Begin Information] is never closed by [End Information]")
        self.close_point()
        if not self.option_line:
            raise self.fail(last_line, "", "no option line (# <unit> <parameter> <format> R "
                            "<ohms>): not a Touchstone file")
        if self.version is not None:
            if not self.n_ports_line:
                raise self.fail(last_line, "", "a version 2 file needs [Number of Ports] 1")
            if not self.in_data:
                raise self.fail(last_line, "", "a version 2 file needs [Network Data]")
            if not self.ended:
                raise self.fail(last_line, "", "a version 2 file ends with [End] (the file may "
                                "be cut short)")
            if self.n_freq != len(self.freq):
                raise self.fail(self.n_freq_line, str(self.n_freq),
                                f"[Number of Frequencies] says {self.n_freq}, the data holds "
                                f"{len(self.freq)}")
        if not self.freq:
            raise self.fail(last_line, "", "the file holds no data")
        z0 = self.reference_ohm if self.reference_ohm is not None else self.r_ohm
        v = _to_complex(np.asarray(self.a), np.asarray(self.b), self.fmt)
        s11 = _to_s11(v, self.parameter, z0, normalized=self.version is None)
        bad = np.nonzero(~np.isfinite(s11))[0]
        if len(bad):
            k = int(bad[0])
            raise self.fail(self.point_lines[k], f"{self.a[k]:g} {self.b[k]:g}",
                            f"this {self.parameter} value is not a one-port's that S11 against "
                            f"{z0:g} ohm can express (S11 would be infinite)")
        return TouchstoneOnePort(np.asarray(self.freq, dtype=np.float64), s11, float(z0),
                                 self.version or "1.x", self.unit, self.parameter, self.fmt,
                                 tuple(self.comments), self.source)


def _to_complex(a: FloatArray, b: FloatArray, fmt: DataFormat) -> ComplexArray:
    if fmt == "RI":
        return np.asarray(a + 1j * b, dtype=np.complex128)
    mag = a if fmt == "MA" else 10.0 ** (a / 20.0)
    return np.asarray(mag * np.exp(1j * np.deg2rad(b)), dtype=np.complex128)


def _to_s11(v: ComplexArray, parameter: Parameter, z0_ohm: float, *, normalized: bool
            ) -> ComplexArray:
    if parameter == "S":
        return v
    with np.errstate(divide="ignore", invalid="ignore"):
        if parameter == "Z":
            z = v * z0_ohm if normalized else v
            return gamma_from_z(z, z0_ohm)
        y = v / z0_ohm if normalized else v
        return np.asarray((1 - y * z0_ohm) / (1 + y * z0_ohm), dtype=np.complex128)


def read_touchstone(text: str, source: str = "") -> TouchstoneOnePort:
    """Read the text of a one-port Touchstone file (version 1.x, 2.0 or 2.1).

    `source` names the file in error lines (and its extension, when it names a
    port count other than one, is refused at once). Raises `DesignError`
    (field "line N") for anything that is not a well-formed one-port file.
    """
    check_text(text, source)
    m = re.search(r"\.s(\d+)p\Z", source, flags=re.IGNORECASE)
    if m and int(m.group(1)) != 1:
        raise DesignError(f"the file name says {int(m.group(1))} ports: fabplan reads one-port "
                          "(.s1p) files", field="file name", value=short(source),
                          source=source)
    text = text.removeprefix("\ufeff")
    parser = _Parser(source)
    lines = _LINES.split(text)
    for n, line in enumerate(lines, start=1):
        parser.feed(n, line)
    return parser.finish(len(lines))


# -- writing -----------------------------------------------------------------
def _num(x: float) -> str:
    """Shortest round-trip decimal of a finite float, "50" rather than "50.0"."""
    r = repr(float(x) + 0.0)
    return r.removesuffix(".0")


def write_touchstone(freq_hz: npt.ArrayLike, s11: npt.ArrayLike, z0_ohm: float = 50.0, *,
                     data_format: DataFormat = "RI", frequency_unit: FrequencyUnit = "MHz",
                     version: WriteVersion = "1.1", comments: Sequence[str] = ()) -> str:
    """The text of a one-port Touchstone file of S11 (against `z0_ohm`, ohm).

    freq_hz: strictly increasing frequencies (Hz); data_format: "RI", "MA"
    or "DB" (angles in degrees; a magnitude of 0 is written as -400 dB in DB);
    frequency_unit: the unit the file's frequencies are written in; version:
    "1.1" (no keywords) or "2.0" (with [Version], [Number of Ports],
    [Number of Frequencies], [Network Data] and [End]); comments: lines written
    first, each after "! " (printable ASCII, no line breaks). Lines end with
    "\\n". The same input gives the same text.
    """
    f = np.asarray(freq_hz, dtype=np.float64)
    s = np.asarray(s11, dtype=np.complex128)
    if f.ndim != 1 or s.shape != f.shape or len(f) == 0:
        raise DesignError("frequencies and S11 must be one-dimensional, non-empty and of equal "
                          "length", field="s11", value=f"{f.shape} and {s.shape}")
    if not (np.all(np.isfinite(f)) and np.all(f >= 0) and np.all(np.diff(f) > 0)):
        raise DesignError("frequencies must be finite, not negative and increasing",
                          field="freq_hz", value=f"{len(f)} values")
    if not np.all(np.isfinite(s)):
        raise DesignError("S11 must be finite", field="s11", value=str(s[~np.isfinite(s)][0]))
    if not (math.isfinite(z0_ohm) and z0_ohm > 0):
        raise DesignError("the reference impedance is a positive number of ohms",
                          field="z0_ohm", value=z0_ohm)
    if data_format not in _FORMATS:
        raise DesignError("the data format is RI, MA or DB", field="data_format",
                          value=data_format)
    if frequency_unit not in FREQUENCY_FACTORS:
        raise DesignError("the frequency unit is one of Hz, kHz, MHz, GHz",
                          field="frequency_unit", value=frequency_unit)
    if version not in ("1.1", "2.0"):
        raise DesignError("the writer writes version 1.1 or 2.0", field="version", value=version)
    out: list[str] = []
    for c in comments:
        if _NOT_ASCII.search(c) or "\n" in c or "\r" in c:
            raise DesignError("a comment is one line of printable ASCII", field="comments",
                              value=short(c))
        out.append(f"! {c}".rstrip())
    if version == "2.0":
        out.append("[Version] 2.0")
    out.append(f"# {frequency_unit} S {data_format} R {_num(z0_ohm)}")
    if version == "2.0":
        out += ["[Number of Ports] 1", f"[Number of Frequencies] {len(f)}", "[Network Data]"]
    heads = {"RI": "S11 real, S11 imaginary", "MA": "|S11|, S11 angle (deg)",
             "DB": "|S11| (dB), S11 angle (deg)"}
    out.append(f"! frequency ({frequency_unit}), {heads[data_format]}")
    scale = FREQUENCY_FACTORS[frequency_unit]
    if data_format == "RI":
        a, b = s.real, s.imag
    else:
        mag = np.abs(s)
        b = np.degrees(np.angle(s))
        if data_format == "MA":
            a = mag
        else:
            with np.errstate(divide="ignore"):
                a = np.maximum(20.0 * np.log10(mag), -400.0)
    for fi, ai, bi in zip(f / scale, a, b, strict=True):
        out.append(f"{_num(fi)} {_num(ai)} {_num(bi)}")
    if version == "2.0":
        out.append("[End]")
    return "\n".join(out) + "\n"


def predicted_touchstone(freq_hz: npt.ArrayLike, z_ohm: npt.ArrayLike, z0_ohm: float = 50.0, *,
                         data_format: DataFormat = "RI", frequency_unit: FrequencyUnit = "MHz",
                         version: WriteVersion = "1.1", comments: Sequence[str] = ()) -> str:
    """A predicted sweep of impedance `z_ohm` (ohm; at the element, or at the radio
    through the matching and feed line, as the caller computed it) as a
    one-port Touchstone file of S11 against `z0_ohm` (ohm), for overlaying in
    the analyser's own software. Arguments as `write_touchstone`.
    """
    z = np.asarray(z_ohm, dtype=np.complex128)
    if not np.all(np.isfinite(z)):
        raise DesignError("impedances must be finite", field="z_ohm",
                          value=str(z[~np.isfinite(z)][0]))
    return write_touchstone(freq_hz, gamma_from_z(z, z0_ohm), z0_ohm, data_format=data_format,
                            frequency_unit=frequency_unit, version=version, comments=comments)
