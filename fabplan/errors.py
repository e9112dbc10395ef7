"""One error type for bad input, and coded findings for fabrication problems.

`FabplanError` carries the field, the value and the rule that was broken, so the
command line can print one clear line and exit with status 2. Fabrication
problems that do not stop the plan (a bend too tight, a former too big) are
collected as `Finding` records with stable codes instead of being raised.
"""

from __future__ import annotations

import difflib
from collections.abc import Iterable
from dataclasses import dataclass
from typing import Literal

__all__ = ["FabplanError", "DesignError", "Finding", "Severity", "SEVERITIES", "did_you_mean"]

Severity = Literal["info", "warning", "error"]
SEVERITIES: tuple[Severity, ...] = ("info", "warning", "error")


class FabplanError(Exception):
    """Bad input. `str(err)` is one line: where, field, value, rule."""

    def __init__(self, rule: str, *, field: str | None = None, value: object = None,
                 source: str | None = None) -> None:
        self.rule = rule
        self.field = field
        self.value = value
        self.source = source
        super().__init__(self._line())

    def _line(self) -> str:
        where = []
        if self.source:
            where.append(str(self.source))
        if self.field:
            where.append(self.field)
        head = ": ".join(where)
        shown = "" if self.value is None else f" = {self.value!r}"
        if head:
            return f"{head}{shown}: {self.rule}"
        return f"{self.value!r}: {self.rule}" if self.value is not None else self.rule

    def with_source(self, source: str) -> FabplanError:
        """The same error, naming the file it came from."""
        return type(self)(self.rule, field=self.field, value=self.value, source=source)


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
    near = difflib.get_close_matches(word, sorted(options), n=1, cutoff=cutoff)
    return f"did you mean {near[0]!r}? " if near else ""
