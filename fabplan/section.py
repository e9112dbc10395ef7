"""Reading one TOML table with every key checked, and every error found at once.

`Section` wraps a table from the design file. Each typed getter validates one
key and records it as used; `finish()` then rejects any key nobody asked for,
with a "did you mean" for near misses. Every error names the field by its full
dotted path (for example `element[2].spacing`; a key that is not a bare TOML
key is quoted: `purchase.spares_by_element."driven element"`, `project.""`).

Reading a whole design file, the sections share a `Collector`: a getter whose
key breaks a rule records the error and returns a stand-in value (its default,
or any valid value) so that the other keys of the table are still checked.
`Collector.attempt` reads one table (or one element, one offer) and returns
None when anything in it was wrong; an error raised by a later check that
combines several keys is dropped when an earlier key of the same table already
failed (it may only be a consequence of the stand-in). At the end
`Collector.raise_if_any` raises one error carrying every line.
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable, Iterable, Iterator, Mapping
from contextlib import contextmanager
from typing import Any, TypeVar

from .errors import DesignError, FabplanError, did_you_mean
from .units import MAX_LENGTH_MM, parse_angle, parse_frequency, parse_length

__all__ = ["Section", "MISSING", "Collector", "key_text", "MAX_TEXT_CHARS", "MAX_NAME_CHARS",
           "MAX_TABLES", "check_text"]

T = TypeVar("T")

MAX_NAME_CHARS = 200  # a name (project, element, offer, item): the sheet wraps or shortens it
MAX_TEXT_CHARS = 1000  # free text (notes, sources) and any other text value
MAX_UNKNOWN_KEYS = 10  # unknown keys named one by one in a table (more: counted)
MAX_TABLES = 1000  # entries in one array of tables ([[element]], [[purchase.offer]], bends)
_BARE_KEY = re.compile(r"[A-Za-z0-9_-]+")


class _Missing:
    def __repr__(self) -> str:
        return "MISSING"


MISSING: Any = _Missing()


def key_text(key: str) -> str:
    """A key as the design file would spell it: bare when it may be bare, else
    quoted with its control characters escaped (`""`, `"side "`, `"a\\u0007"`)."""
    if _BARE_KEY.fullmatch(key):
        return key
    out = []
    for ch in key:
        if ch in '"\\':
            out.append("\\" + ch)
        elif not ch.isprintable() or ch in "\t":
            out.append(f"\\u{ord(ch):04x}" if ord(ch) <= 0xFFFF else f"\\U{ord(ch):08x}")
        else:
            out.append(ch)
    return '"' + "".join(out) + '"'


def check_text(value: str, field: str, max_chars: int, what: str = "a text") -> str:
    """`value` unless it holds a character that does not print (a control
    character, a line break, a tab) or is longer than `max_chars`."""
    if len(value) > max_chars:
        raise DesignError(f"{what} is at most {max_chars} characters", field=field, value=value)
    bad = next((ch for ch in value if not ch.isprintable()), None)
    if bad is not None:
        raise DesignError(f"{what} is one line of printable characters; this one holds "
                          f"U+{ord(bad):04X} (a control or other unprintable character)",
                          field=field, value=value)
    return value


class Collector:
    """Every DesignError found while reading one design file (see the module)."""

    def __init__(self) -> None:
        self.errors: list[FabplanError] = []
        self._seen: set[str] = set()
        self._own: list[int] = []  # errors recorded in each open attempt, innermost last

    def record(self, exc: FabplanError) -> None:
        """Keep `exc` (each error it carries, once) against the open attempt."""
        for one in exc.errors:
            line = str(one)
            if line not in self._seen:
                self._seen.add(line)
                self.errors.append(one)
        if self._own:
            self._own[-1] += 1

    def attempt(self, read: Callable[..., T], *args: Any) -> T | None:
        """`read(*args)`, or None when it failed or recorded an error."""
        self._own.append(0)
        try:
            value = read(*args)
        except FabplanError as exc:
            own = self._own.pop()
            if own == 0:
                self.record(exc)
            elif self._own:
                self._own[-1] += 1
            return None
        except (ArithmeticError, LookupError, TypeError, ValueError):
            own = self._own.pop()
            if own == 0:
                raise
            if self._own:  # a stand-in value broke a later step: already reported
                self._own[-1] += 1
            return None
        own = self._own.pop()
        if own and self._own:
            self._own[-1] += 1
        return value if own == 0 else None

    def raise_if_any(self) -> None:
        if self.errors:
            raise FabplanError.combine(self.errors)


class Section:
    """One table of the design file, read key by key."""

    def __init__(self, data: Mapping[str, Any], path: str,
                 collector: Collector | None = None) -> None:
        if not isinstance(data, Mapping):
            raise DesignError("expected a table", field=path or None, value=data)
        self.data = dict(data)
        self.path = path
        self.collector = collector
        self._used: set[str] = set()
        self._strict = False

    # -- plumbing -----------------------------------------------------------
    def field(self, key: str) -> str:
        return f"{self.path}.{key_text(key)}" if self.path else key_text(key)

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

    @contextmanager
    def strict(self) -> Iterator[None]:
        """Getters raise at once inside this block (for a key the rest depends on)."""
        before, self._strict = self._strict, True
        try:
            yield
        finally:
            self._strict = before

    def _get(self, key: str, default: Any, check: Callable[[Any], Any],
             stand_in: Any) -> Any:
        """The checked value of `key`, or `default` when absent; with a collector,
        a broken rule is recorded and `stand_in` returned."""
        value = self.raw(key, default) if self.collector is None or self._strict \
            else self._raw_or_record(key, default)
        if key not in self.data:
            return default if value is not _RECORDED else stand_in
        try:
            return check(value)
        except FabplanError as exc:
            if self.collector is None or self._strict:
                raise
            self.collector.record(exc)
            return stand_in

    def _raw_or_record(self, key: str, default: Any) -> Any:
        try:
            return self.raw(key, default)
        except FabplanError as exc:
            if self.collector is None:
                raise
            self.collector.record(exc)
            return _RECORDED

    def finish(self, also_allowed: Iterable[str] = ()) -> None:
        """Reject keys that no getter asked for (each one, with a collector)."""
        allowed = self._used | set(also_allowed)
        unknown = [key for key in self.data if key not in allowed]
        self._used.update(unknown)  # each reported once
        if len(unknown) > MAX_UNKNOWN_KEYS:
            error = DesignError(f"{len(unknown)} unknown keys in this table (known keys here: "
                                f"{', '.join(sorted(allowed)) or 'none'})", field=self.path or None)
            if self.collector is None or self._strict:
                raise error
            self.collector.record(error)
            return
        for key in unknown:
            near = did_you_mean(key, allowed).strip() if len(key) <= 100 else ""
            hint = f"; {near}" if near else ""
            known = ", ".join(sorted(allowed)) or "none"
            error = DesignError(f"unknown key{hint} (known keys here: {known})",
                                field=self.field(key))
            if self.collector is None or self._strict:
                raise error
            self.collector.record(error)

    # -- typed getters ------------------------------------------------------
    def length(self, key: str, default: Any = MISSING, *, allow_zero: bool = False,
               allow_negative: bool = False, max_mm: float = MAX_LENGTH_MM,
               bound: str = "") -> Any:
        """A length with its unit, in mm, up to `max_mm` (by default 100 m);
        `bound` says why (see parse_length)."""
        return self._get(key, default, lambda v: parse_length(
            v, self.field(key), allow_zero=allow_zero, allow_negative=allow_negative,
            max_mm=max_mm, bound=bound), _stand_in(default, min(1.0, max_mm)))

    def frequency(self, key: str, default: Any = MISSING, **bounds: float) -> Any:
        """A frequency with its unit, in Hz (`low_hz`, `high_hz`: see parse_frequency)."""
        return self._get(key, default, lambda v: parse_frequency(v, self.field(key), **bounds),
                         _stand_in(default, 100e6))

    def angle(self, key: str, default: Any = MISSING) -> Any:
        return self._get(key, default, lambda v: parse_angle(v, self.field(key)),
                         _stand_in(default, 90.0))

    def number(self, key: str, default: Any = MISSING, *, low: float | None = None,
               high: float | None = None, low_open: bool = False, high_open: bool = False) -> Any:
        def check(value: Any) -> float:
            if isinstance(value, bool) or not isinstance(value, (int, float)):
                raise DesignError("expected a number", field=self.field(key), value=value)
            try:
                number = float(value)
            except OverflowError:
                number = math.inf
            if not math.isfinite(number):
                raise DesignError("must be a finite number", field=self.field(key), value=value)
            _check_range(self.field(key), number, low, high, low_open, high_open)
            return number

        if low is not None and high is not None:
            inside = (low + high) / 2
        else:
            inside = low + 1.0 if low is not None else high - 1.0 if high is not None else 1.0
        return self._get(key, default, check, _stand_in(default, inside))

    def integer(self, key: str, default: Any = MISSING, *, low: int | None = None,
                high: int | None = None) -> Any:
        def check(value: Any) -> int:
            if isinstance(value, bool) or not isinstance(value, int):
                raise DesignError("expected a whole number", field=self.field(key), value=value)
            _check_range(self.field(key), value, low, high, False, False)
            return value

        return self._get(key, default, check,
                         _stand_in(default, low if low is not None else 1))

    def string(self, key: str, default: Any = MISSING, *,
               choices: Iterable[str] | None = None, max_chars: int = MAX_TEXT_CHARS,
               what: str = "a text") -> Any:
        """A non-empty, one-line string of printable characters (at most
        `max_chars`), one of `choices` when given."""
        options = None if choices is None else list(choices)

        def check(value: Any) -> str:
            if not isinstance(value, str) or not value.strip():
                raise DesignError("expected a non-empty text string", field=self.field(key),
                                  value=value)
            if options is not None:
                if value not in options:
                    hint = did_you_mean(value, options, 0.5) if len(value) <= 100 else ""
                    raise DesignError(f"{hint}must be one of: {', '.join(options)}",
                                      field=self.field(key), value=value)
                return value
            return check_text(value, self.field(key), max_chars, what)

        stand_in = options[0] if options else "?"
        return self._get(key, default, check, _stand_in(default, stand_in))

    def name(self, key: str = "name", default: Any = MISSING) -> Any:
        """A name (project, element, offer, item): printable, one line, at most
        MAX_NAME_CHARS characters."""
        return self.string(key, default, max_chars=MAX_NAME_CHARS, what="a name")

    def boolean(self, key: str, default: Any = MISSING) -> Any:
        def check(value: Any) -> bool:
            if not isinstance(value, bool):
                raise DesignError("expected true or false", field=self.field(key), value=value)
            return value

        return self._get(key, default, check, _stand_in(default, False))

    def table(self, key: str, default: Any = MISSING) -> Any:
        value = self.raw(key, default)
        if key not in self.data:
            return default
        return Section(value, self.field(key), self.collector)

    def tables(self, key: str, *, required: bool = False,
               max_count: int = MAX_TABLES) -> list[Section]:
        """An array of tables (`[[key]]`) or a single table (`[key]`), as a list
        of at most `max_count`."""
        value = self.raw(key, MISSING if required else [])
        if isinstance(value, Mapping):
            return [Section(value, self.field(key), self.collector)]
        if not isinstance(value, list):
            raise DesignError("expected a table or an array of tables", field=self.field(key),
                              value=value)
        if len(value) > max_count:
            raise DesignError(f"{len(value)} tables; at most {max_count} here",
                              field=self.field(key))
        return [Section(item, f"{self.field(key)}[{i}]", self.collector)
                for i, item in enumerate(value, 1)]


class _Recorded:
    pass


_RECORDED: Any = _Recorded()


def _stand_in(default: Any, otherwise: Any) -> Any:
    return otherwise if default is MISSING or default is None else default


def _check_range(field: str, value: float, low: float | None, high: float | None,
                 low_open: bool, high_open: bool) -> None:
    if low is not None and (value < low or (low_open and value == low)):
        rule = f"must be greater than {low:g}" if low_open else f"must be at least {low:g}"
        raise DesignError(rule, field=field, value=value)
    if high is not None and (value > high or (high_open and value == high)):
        rule = f"must be less than {high:g}" if high_open else f"must be at most {high:g}"
        raise DesignError(rule, field=field, value=value)
