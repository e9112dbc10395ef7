"""Reading one TOML table with every key checked.

`Section` wraps a table from the design file. Each typed getter validates one
key and records it as used; `finish()` then rejects any key nobody asked for,
with a "did you mean" for near misses. Every error names the field by its full
dotted path (for example `element[2].spacing`).
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Mapping
from typing import Any

from .errors import DesignError, did_you_mean
from .units import parse_angle, parse_frequency, parse_length

__all__ = ["Section", "MISSING"]


class _Missing:
    def __repr__(self) -> str:
        return "MISSING"


MISSING: Any = _Missing()


class Section:
    """One table of the design file, read key by key."""

    def __init__(self, data: Mapping[str, Any], path: str) -> None:
        if not isinstance(data, Mapping):
            raise DesignError("expected a table", field=path, value=data)
        self.data = dict(data)
        self.path = path
        self._used: set[str] = set()

    # -- plumbing -----------------------------------------------------------
    def field(self, key: str) -> str:
        return f"{self.path}.{key}" if self.path else key

    def has(self, key: str) -> bool:
        return key in self.data

    def keys(self) -> list[str]:
        return list(self.data)

    def raw(self, key: str, default: Any = MISSING) -> Any:
        self._used.add(key)
        if key in self.data:
            return self.data[key]
        if default is MISSING:
            raise DesignError("is required", field=self.field(key))
        return default

    def mark_used(self, *keys: str) -> None:
        self._used.update(keys)

    def finish(self, also_allowed: Iterable[str] = ()) -> None:
        """Reject keys that no getter asked for."""
        allowed = self._used | set(also_allowed)
        for key in self.data:
            if key not in allowed:
                near = did_you_mean(key, allowed).strip()
                hint = f"; {near}" if near else ""
                known = ", ".join(sorted(allowed)) or "none"
                raise DesignError(f"unknown key{hint} (known keys here: {known})",
                                  field=self.field(key))

    # -- typed getters ------------------------------------------------------
    def length(self, key: str, default: Any = MISSING, *, allow_zero: bool = False,
               allow_negative: bool = False) -> Any:
        value = self.raw(key, default)
        if value is default and key not in self.data:
            return default
        return parse_length(value, self.field(key), allow_zero=allow_zero,
                            allow_negative=allow_negative)

    def frequency(self, key: str, default: Any = MISSING) -> Any:
        value = self.raw(key, default)
        if key not in self.data:
            return default
        return parse_frequency(value, self.field(key))

    def angle(self, key: str, default: Any = MISSING) -> Any:
        value = self.raw(key, default)
        if key not in self.data:
            return default
        return parse_angle(value, self.field(key))

    def number(self, key: str, default: Any = MISSING, *, low: float | None = None,
               high: float | None = None, low_open: bool = False, high_open: bool = False) -> Any:
        value = self.raw(key, default)
        if key not in self.data:
            return default
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise DesignError("expected a number", field=self.field(key), value=value)
        value = float(value)
        if not math.isfinite(value):
            raise DesignError("must be a finite number", field=self.field(key), value=value)
        _check_range(self.field(key), value, low, high, low_open, high_open)
        return value

    def integer(self, key: str, default: Any = MISSING, *, low: int | None = None,
                high: int | None = None) -> Any:
        value = self.raw(key, default)
        if key not in self.data:
            return default
        if isinstance(value, bool) or not isinstance(value, int):
            raise DesignError("expected a whole number", field=self.field(key), value=value)
        _check_range(self.field(key), value, low, high, False, False)
        return value

    def string(self, key: str, default: Any = MISSING, *,
               choices: Iterable[str] | None = None) -> Any:
        value = self.raw(key, default)
        if key not in self.data:
            return default
        if not isinstance(value, str) or not value.strip():
            raise DesignError("expected a non-empty text string", field=self.field(key),
                              value=value)
        if choices is not None:
            options = list(choices)
            if value not in options:
                hint = did_you_mean(value, options, 0.5)
                raise DesignError(f"{hint}must be one of: {', '.join(options)}",
                                  field=self.field(key), value=value)
        return value

    def boolean(self, key: str, default: Any = MISSING) -> Any:
        value = self.raw(key, default)
        if key not in self.data:
            return default
        if not isinstance(value, bool):
            raise DesignError("expected true or false", field=self.field(key), value=value)
        return value

    def table(self, key: str, default: Any = MISSING) -> Any:
        value = self.raw(key, default)
        if key not in self.data:
            return default
        return Section(value, self.field(key))

    def tables(self, key: str, *, required: bool = False) -> list[Section]:
        """An array of tables (`[[key]]`) or a single table (`[key]`), as a list."""
        value = self.raw(key, MISSING if required else [])
        if isinstance(value, Mapping):
            return [Section(value, self.field(key))]
        if not isinstance(value, list):
            raise DesignError("expected a table or an array of tables", field=self.field(key),
                              value=value)
        out = []
        for i, item in enumerate(value, 1):
            out.append(Section(item, f"{self.field(key)}[{i}]"))
        return out


def _check_range(field: str, value: float, low: float | None, high: float | None,
                 low_open: bool, high_open: bool) -> None:
    if low is not None and (value < low or (low_open and value == low)):
        rule = f"must be greater than {low:g}" if low_open else f"must be at least {low:g}"
        raise DesignError(rule, field=field, value=value)
    if high is not None and (value > high or (high_open and value == high)):
        rule = f"must be less than {high:g}" if high_open else f"must be at most {high:g}"
        raise DesignError(rule, field=field, value=value)
