"""A plain CSV sweep: frequency plus SWR, or R and X, or return loss, or S11.

The user names the columns: a mapping from role to the column's header text
(matched ignoring letter case and surrounding spaces and quotes) or to its
number, counted from 1 as a spreadsheet shows it. Roles and units:

- "frequency" (required), in the unit the caller gives (Hz, kHz, MHz, GHz);
- exactly one of these sets:
  - "swr" (>= 1)                                   magnitude only
  - "return_loss_db" (dB, >= 0)                    magnitude only
  - "s11_db" (dB, 20 log10 |S11|, normally <= 0)   magnitude only
  - "s11_mag" (>= 0)                               magnitude only
  - "r_ohm" and "x_ohm" (ohm)                      impedance
  - "s11_re" and "s11_im"                          S11
  - "s11_mag" and "s11_angle_deg" (degrees)        S11
  - "s11_db" and "s11_angle_deg"                   S11
  - "return_loss_db" and "s11_angle_deg"           S11

The delimiter is a comma, a semicolon or a tab: sniffed from the first line
that is not blank or a comment (a semicolon wins over a tab, a tab over a
comma, so that "1,5" decimal commas in a semicolon or tab file are read as
decimals). Lines beginning with "#" or "!" are comments; blank lines are
skipped. A header line is required when a column is named by its text; when
every column is named by number, the first line is taken as a header if any
of its cells is not a number. Quoted cells are unquoted (Python's csv module).
Every bad cell is one `DesignError` line naming the file, the line, the
column and the value. Bounds as in fabplan.measure.sweep.
"""

from __future__ import annotations

import csv
import re
from collections.abc import Mapping
from typing import Literal

import numpy as np

from ..errors import DesignError, did_you_mean
from .sweep import (
    MAX_POINTS,
    MeasuredSweep,
    check_text,
    frequency_factor,
    gamma_from_z,
    gamma_mag_from_return_loss_db,
    gamma_mag_from_swr,
    parse_number,
    short,
    sweep_from_gamma_mag,
    sweep_from_s11,
)

__all__ = ["ROLES", "ROLE_SETS", "Role", "read_csv_sweep"]

Role = Literal["frequency", "swr", "r_ohm", "x_ohm", "return_loss_db", "s11_db", "s11_re",
               "s11_im", "s11_mag", "s11_angle_deg"]
ROLES: tuple[Role, ...] = ("frequency", "swr", "r_ohm", "x_ohm", "return_loss_db", "s11_db",
                           "s11_re", "s11_im", "s11_mag", "s11_angle_deg")
ROLE_SETS: tuple[frozenset[str], ...] = tuple(frozenset(s) for s in (
    ("swr",), ("return_loss_db",), ("s11_db",), ("s11_mag",), ("r_ohm", "x_ohm"),
    ("s11_re", "s11_im"), ("s11_mag", "s11_angle_deg"), ("s11_db", "s11_angle_deg"),
    ("return_loss_db", "s11_angle_deg")))

_LINES = re.compile(r"\r\n|\r|\n")
_DECIMAL_COMMA = re.compile(r"[+-]?\d*,\d+(?:[eE][+-]?\d+)?\Z|[+-]?\d+,(?:[eE][+-]?\d+)?\Z")


def _sets_text() -> str:
    return "; ".join(" + ".join(sorted(s)) for s in ROLE_SETS)


def _check_columns(columns: Mapping[str, str | int], source: str | None) -> dict[str, str | int]:
    out: dict[str, str | int] = {}
    for role, col in columns.items():
        if role not in ROLES:
            raise DesignError(f"{did_you_mean(role, ROLES)}a column role is one of "
                              f"{', '.join(ROLES)}", field="columns", value=short(str(role)),
                              source=source)
        if isinstance(col, bool) or not isinstance(col, (str, int)):
            raise DesignError("a column is its header text or its number from 1",
                              field=f"columns.{role}", value=short(repr(col)), source=source)
        if isinstance(col, int) and col < 1:
            raise DesignError("columns are counted from 1", field=f"columns.{role}", value=col,
                              source=source)
        if isinstance(col, str) and not col.strip():
            raise DesignError("a column's header text is not empty", field=f"columns.{role}",
                              value=col, source=source)
        out[role] = col
    if "frequency" not in out:
        raise DesignError("name the frequency column (role 'frequency')", field="columns",
                          value=", ".join(sorted(out)) or "(none)", source=source)
    rest = frozenset(out) - {"frequency"}
    if rest not in ROLE_SETS:
        raise DesignError(f"name one set of value columns besides frequency: {_sets_text()}",
                          field="columns", value=", ".join(sorted(rest)) or "(none)",
                          source=source)
    return out


def _cell_number(cell: str, delimiter: str) -> float | None:
    text = cell.strip().strip('"').strip()
    if delimiter != "," and _DECIMAL_COMMA.match(text):
        text = text.replace(",", ".")
    return parse_number(text)


def _clean(name: str) -> str:
    return " ".join(name.strip().strip('"').strip("'").split()).casefold()


def read_csv_sweep(text: str, columns: Mapping[str, str | int], *, frequency_unit: str,
                   z0_ohm: float = 50.0, source: str = "", header: bool | None = None,
                   delimiter: str | None = None) -> MeasuredSweep:
    """Read a CSV sweep into a `MeasuredSweep` against `z0_ohm` (ohm).

    columns: role -> header text or column number from 1 (see the module
    docstring); frequency_unit: "Hz", "kHz", "MHz" or "GHz"; header: True or
    False to say whether the first line is a header (None: decide as the
    module docstring says); delimiter: ",", ";" or a tab (None: sniff).
    """
    src = source or None
    check_text(text, source)
    cols = _check_columns(columns, src)
    factor = frequency_factor(frequency_unit, field="frequency_unit", source=src)
    if delimiter is not None and delimiter not in (",", ";", "\t"):
        raise DesignError("the delimiter is a comma, a semicolon or a tab", field="delimiter",
                          value=delimiter, source=src)
    text = text.removeprefix("\ufeff")
    rows = [(n, line) for n, line in enumerate(_LINES.split(text), start=1)
            if line.strip() and not line.lstrip().startswith(("#", "!"))]
    if not rows:
        raise DesignError("the file holds no rows", field="file", value="(empty)", source=src)
    first_no, first = rows[0]
    if delimiter is None:
        delimiter = next((d for d in (";", "\t", ",") if d in first), None)
        if delimiter is None:
            raise DesignError("no column delimiter (comma, semicolon or tab) in the first row",
                              field=f"line {first_no}", value=short(first), source=src)

    def split(line: str) -> list[str]:
        return next(csv.reader([line], delimiter=delimiter))

    named = any(isinstance(c, str) for c in cols.values())
    if header is None:
        header = named or any(_cell_number(c, delimiter) is None for c in split(first))
    if named and not header:
        raise DesignError("a column named by its header text needs a header line",
                          field="header", value=False, source=src)
    index: dict[str, int] = {}
    head_cells: list[str] = []
    if header:
        head_cells = split(first)
        cleaned = [_clean(c) for c in head_cells]
        for role, col in cols.items():
            if isinstance(col, int):
                index[role] = col - 1
                continue
            hits = [i for i, c in enumerate(cleaned) if c == _clean(col)]
            if len(hits) != 1:
                shown = ", ".join(repr(c.strip()) for c in head_cells)
                rule = (f"{did_you_mean(_clean(col), cleaned)}no single column has this header; "
                        f"the header line has {shown}" if not hits else
                        "two or more columns have this header: name the column by number")
                raise DesignError(rule, field=f"columns.{role}", value=short(col), source=src)
            index[role] = hits[0]
        rows = rows[1:]
    else:
        index = {role: int(col) - 1 for role, col in cols.items()}
    if len(rows) > MAX_POINTS:
        raise DesignError(f"a sweep holds at most {MAX_POINTS} frequencies: export fewer points",
                          field="rows", value=len(rows), source=src)

    def label(role: str) -> str:
        i = index[role]
        name = head_cells[i].strip() if i < len(head_cells) else ""
        return f"column {i + 1}" + (f" ({name})" if name else "")

    values: dict[str, list[float]] = {role: [] for role in cols}
    lines: list[int] = []
    for n, line in rows:
        cells = split(line)
        for role, i in index.items():
            if i >= len(cells):
                raise DesignError(f"the row has {len(cells)} columns; {label(role)} "
                                  f"({role}) is missing", field=f"line {n}",
                                  value=short(line.strip()), source=src)
            x = _cell_number(cells[i], delimiter)
            if x is None:
                raise DesignError(f"expected a number for {role}",
                                  field=f"line {n}, {label(role)}",
                                  value=short(cells[i].strip()), source=src)
            values[role].append(x)
        lines.append(n)
    if not lines:
        raise DesignError("the file holds a header but no rows", field="file",
                          value="(no data)", source=src)

    def fail(role: str, k: int, rule: str) -> DesignError:
        return DesignError(rule, field=f"line {lines[k]}, {label(role)}",
                           value=values[role][k], source=src)

    f = np.asarray(values["frequency"], dtype=np.float64) * factor
    for k in range(len(f)):
        if f[k] < 0:
            raise fail("frequency", k, "a frequency is not negative")
        if k and f[k] <= f[k - 1]:
            raise fail("frequency", k, "frequencies must increase from one row to the next")

    def column(role: str, low: float | None = None, rule: str = "") -> np.ndarray:
        a = np.asarray(values[role], dtype=np.float64)
        if low is not None:
            bad = np.nonzero(a < low)[0]
            if len(bad):
                raise fail(role, int(bad[0]), rule)
        return a

    kind = frozenset(cols) - {"frequency"}
    plane = "analyser port"
    if kind == {"r_ohm", "x_ohm"}:
        z = column("r_ohm") + 1j * column("x_ohm")
        return sweep_from_s11(f, gamma_from_z(z, z0_ohm), z0_ohm, plane=plane, source=source)
    if "swr" in kind:
        mag = gamma_mag_from_swr(column("swr", 1.0, "an SWR is at least 1"))
    elif "return_loss_db" in kind:
        mag = gamma_mag_from_return_loss_db(column(
            "return_loss_db", 0.0, "return loss is a positive figure in dB; a negative column "
            "is |S11| in dB: give it the role s11_db"))
    elif "s11_db" in kind:
        mag = 10.0 ** (column("s11_db") / 20.0)
    elif "s11_mag" in kind:
        mag = column("s11_mag", 0.0, "a magnitude is not negative")
    else:
        s11 = column("s11_re") + 1j * column("s11_im")
        return sweep_from_s11(f, s11, z0_ohm, plane=plane, source=source)
    if "s11_angle_deg" in kind:
        s11 = mag * np.exp(1j * np.deg2rad(column("s11_angle_deg")))
        return sweep_from_s11(f, s11, z0_ohm, plane=plane, source=source)
    return sweep_from_gamma_mag(f, mag, z0_ohm, plane=plane, source=source)

