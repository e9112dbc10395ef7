"""One error type for bad input, and coded findings for fabrication problems.

`FabplanError` carries the field, the value and the rule that was broken, so the
command line can print one clear line and exit with status 2. Fabrication
problems that do not stop the plan (a bend too tight, a former too big) are
collected as `Finding` records with stable codes instead of being raised.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass
from typing import Literal

__all__ = ["FabplanError", "DesignError", "Finding", "Severity", "SEVERITIES", "did_you_mean",
           "shown_value", "SHOWN_CHARS", "FULL_CHARS", "MAX_LINES"]

Severity = Literal["info", "warning", "error"]
SEVERITIES: tuple[Severity, ...] = ("info", "warning", "error")


FULL_CHARS = 300  # a value (or field) longer than this is shortened in an error line
SHOWN_CHARS = 80  # ... to its first SHOWN_CHARS characters and its length
MAX_LINES = 50  # error lines one FabplanError carries (the rest are counted)


def shown_value(value: object) -> str:
    """A value as an error line shows it: its repr (control characters escaped),
    shortened to its first SHOWN_CHARS characters and its length when longer than
    FULL_CHARS (a path is shown whole; a 200 KB value is not)."""
    text = repr(value)
    if len(text) <= FULL_CHARS:
        return text
    size = len(value) if isinstance(value, (str, bytes, list, dict, tuple)) else len(text)
    unit = "items" if isinstance(value, (list, dict, tuple)) else "characters"
    return f"{text[:SHOWN_CHARS]}... ({size} {unit})"


class FabplanError(Exception):
    """Bad input. `str(err)` is one line: where, field, value, rule.

    One error may carry several (every error found in a design file at once):
    `errors` holds each, `lines` their lines (the first is `str(err)`), and
    `rule`, `field`, `value` and `source` are the first one's.
    """

    def __init__(self, rule: str, *, field: str | None = None, value: object = None,
                 source: str | None = None) -> None:
        self.rule = rule
        self.field = field
        self.value = value
        self.source = source
        self.errors: tuple[FabplanError, ...] = (self,)
        self.more = 0  # errors found beyond the MAX_LINES carried
        super().__init__(self._line())

    def _line(self) -> str:
        where = []
        if self.source:
            where.append(str(self.source))
        if self.field:
            where.append(self.field if len(self.field) <= FULL_CHARS
                         else f"{self.field[:SHOWN_CHARS]}... ({len(self.field)} characters)")
        head = ": ".join(where)
        shown = "" if self.value is None else f" = {shown_value(self.value)}"
        if head:
            return f"{head}{shown}: {self.rule}"
        return f"{shown_value(self.value)}: {self.rule}" if self.value is not None else self.rule

    @property
    def lines(self) -> list[str]:
        """One line per error (the first is `str(self)`), and a count of any beyond
        the MAX_LINES carried."""
        out = [e._line() for e in self.errors]
        if self.more:
            out.append(f"{self.more} more error(s) not shown: fix these and run again")
        return out

    @classmethod
    def combine(cls, errors: Iterable[FabplanError]) -> FabplanError:
        """One error carrying `errors` in order (each counted once; at most
        MAX_LINES kept, the rest counted). Needs at least one."""
        flat: list[FabplanError] = []
        seen: set[str] = set()
        for err in errors:
            for one in err.errors:
                line = one._line()
                if line not in seen:
                    seen.add(line)
                    flat.append(one)
        if not flat:
            raise ValueError("no errors to combine")
        if len(flat) == 1:
            return flat[0]
        first = flat[0]
        out = type(first)(first.rule, field=first.field, value=first.value,
                          source=first.source)
        out.errors = tuple(flat[:MAX_LINES])
        out.more = len(flat) - len(out.errors)
        return out

    def with_source(self, source: str) -> FabplanError:
        """The same error (each one it carries), naming the file it came from."""
        return self.named(source, replace=True)

    def named(self, source: str, *, replace: bool = False) -> FabplanError:
        """The same error with `source` named on each line that names no file
        (every line with `replace`). A line about a command-line option (its
        field starts with "--") is left as it is."""
        def one(e: FabplanError) -> FabplanError:
            if (e.source and not replace) or (e.field or "").startswith("--"):
                return e
            return type(e)(e.rule, field=e.field, value=e.value, source=source)

        if len(self.errors) == 1:
            return one(self)
        out = FabplanError.combine(one(e) for e in self.errors)
        out.more = self.more
        return out


class DesignError(FabplanError, ValueError):
    """A design file or option value that breaks a rule."""


@dataclass(frozen=True)
class Finding:
    """A fabrication or electrical problem found while planning.

    `code` is stable (tests and scripts may rely on it); `message` says what is
    wrong and what to change. `element` names the element, or is "" for the design.
    """

    code: str
    severity: Severity
    message: str
    element: str = ""

    def to_dict(self) -> dict[str, str]:
        return {"code": self.code, "severity": self.severity, "message": self.message,
                "element": self.element}


def did_you_mean(word: str, options: Iterable[str], cutoff: float = 0.6) -> str:
    """`"did you mean 'x'? "` for the nearest option, or "" when none is near."""
    import difflib

    near = difflib.get_close_matches(word, sorted(options), n=1, cutoff=cutoff)
    return f"did you mean {near[0]!r}? " if near else ""
