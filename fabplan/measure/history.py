"""The first-article history: one line per measured first article, appended.

A club that builds many elements keeps, beside the design file, a text file of
what each first article measured and what was changed, so that the average
difference between model and stock can be applied before the next batch is
cut. This module only turns records into lines and lines into records; the
command that owns the file appends `record_line(record)` to it (never
rewrites it) and reads it back with `read_history(text, source)`. The library
reads no clock: the caller gives the date and time.

Format (JSON Lines: one JSON object per line, UTF-8, lines end with "\\n";
blank lines are ignored; keys are written sorted, numbers as Python's
shortest round-trip decimal, so a record always gives the same line):

    {"adjustments": [{"after": 247.5, "before": 250.0, "dimension": "side",
      "unit": "mm"}], "correction": "side 250.0 -> 247.5 mm", "element": "driven",
      "feature": "resonance", "format": 1, "measured_hz": 446000000.0,
      "predicted_hz": 440000000.0, "target_hz": 440000000.0,
      "when": "2025-03-01T14:30:00"}

(one line in the file; wrapped here.) Fields:

- format: 1 (this layout; a later layout gets a new number, and this reader
  refuses numbers it does not know);
- when: the caller's date and time, ISO 8601 (as datetime.fromisoformat
  reads it);
- element: the element's name in the design ("" for a one-element design);
- feature: "resonance" (X = 0) or "least-swr";
- measured_hz: where the first article showed the feature (Hz);
- predicted_hz: where the model put the same feature for the same article (Hz);
- target_hz: the design's target frequency (Hz), or null;
- adjustments: each dimension changed for the next cut: its name, the value
  before and after, and the unit ("mm" for a length, "pF" for a capacitor);
- correction: the correction applied, in words (free text, one line).

The relative difference of a record is (measured - predicted) / predicted.
`summarize` averages it; `HistorySummary.model_target_hz(target)` is the
frequency to tune the model to so that the built element lands on `target`:
target / (1 + mean difference). Bounds: at most `MAX_RECORDS` lines of at
most `MAX_LINE_CHARS` characters.
"""

from __future__ import annotations

import json
import math
import re
import statistics
from collections.abc import Sequence
from dataclasses import dataclass
from datetime import datetime
from typing import Any, Literal

from ..errors import DesignError
from .sweep import short

__all__ = [
    "FEATURES",
    "FORMAT",
    "MAX_LINE_CHARS",
    "MAX_RECORDS",
    "Adjustment",
    "Feature",
    "HistoryRecord",
    "HistorySummary",
    "read_history",
    "record_line",
    "summarize",
]

Feature = Literal["resonance", "least-swr"]
FEATURES: tuple[Feature, ...] = ("resonance", "least-swr")
AdjustmentUnit = Literal["mm", "pF"]
FORMAT = 1
MAX_RECORDS = 100_000
MAX_LINE_CHARS = 10_000
_LINES = re.compile(r"\r\n|\r|\n")


@dataclass(frozen=True)
class Adjustment:
    """One dimension changed: its name in the design, the value before and
    after, and the unit ("mm" for a length, "pF" for a capacitor)."""

    dimension: str
    before: float
    after: float
    unit: AdjustmentUnit = "mm"


@dataclass(frozen=True)
class HistoryRecord:
    """One first article (see the module docstring for each field's meaning;
    frequencies in Hz)."""

    when: str
    element: str
    feature: Feature
    measured_hz: float
    predicted_hz: float
    adjustments: tuple[Adjustment, ...] = ()
    correction: str = ""
    target_hz: float | None = None

    @property
    def relative_difference(self) -> float:
        """(measured - predicted) / predicted (dimensionless)."""
        return (self.measured_hz - self.predicted_hz) / self.predicted_hz


def _check(rec: HistoryRecord, source: str | None, where: str) -> None:
    def bad(field: str, value: object, rule: str) -> DesignError:
        return DesignError(rule, field=f"{where}{field}", value=value, source=source)

    try:
        datetime.fromisoformat(rec.when)
    except (TypeError, ValueError):
        raise bad("when", short(str(rec.when)), "the date and time are ISO 8601, e.g. "
                  "2025-03-01T14:30") from None
    if rec.feature not in FEATURES:
        raise bad("feature", rec.feature, "the feature is 'resonance' or 'least-swr'")
    for name, v in (("measured_hz", rec.measured_hz), ("predicted_hz", rec.predicted_hz),
                    ("target_hz", rec.target_hz)):
        if v is None and name == "target_hz":
            continue
        if not isinstance(v, (int, float)) or isinstance(v, bool) or not (
                math.isfinite(v) and v > 0):
            raise bad(name, v, "a frequency is a positive number of Hz")
    for text, name in ((rec.element, "element"), (rec.correction, "correction")):
        if not isinstance(text, str) or "\n" in text or "\r" in text:
            raise bad(name, short(repr(text)), "a one-line text")
    for k, a in enumerate(rec.adjustments):
        if not isinstance(a.dimension, str) or not a.dimension.strip():
            raise bad(f"adjustments[{k}].dimension", a.dimension, "name the dimension")
        if a.unit not in ("mm", "pF"):
            raise bad(f"adjustments[{k}].unit", a.unit, "the unit is 'mm' or 'pF'")
        for name, v in (("before", a.before), ("after", a.after)):
            if not isinstance(v, (int, float)) or isinstance(v, bool) or not math.isfinite(v):
                raise bad(f"adjustments[{k}].{name}", v, "a finite number")


def record_line(record: HistoryRecord) -> str:
    """The record as one line of the history file (ending with "\\n")."""
    _check(record, None, "")
    d: dict[str, Any] = {
        "format": FORMAT, "when": record.when, "element": record.element,
        "feature": record.feature, "measured_hz": float(record.measured_hz),
        "predicted_hz": float(record.predicted_hz),
        "target_hz": None if record.target_hz is None else float(record.target_hz),
        "adjustments": [{"dimension": a.dimension, "before": float(a.before),
                         "after": float(a.after), "unit": a.unit} for a in record.adjustments],
        "correction": record.correction,
    }
    return json.dumps(d, sort_keys=True, ensure_ascii=False, allow_nan=False) + "\n"


def _record(obj: object, source: str | None, n: int) -> HistoryRecord:
    where = f"line {n}: "

    def bad(field: str, value: object, rule: str) -> DesignError:
        return DesignError(rule, field=f"{where}{field}", value=value, source=source)

    if not isinstance(obj, dict):
        raise bad("record", short(repr(obj)), "each line is one JSON object")
    if obj.get("format") != FORMAT:
        raise bad("format", obj.get("format"), f"this reader knows history format {FORMAT}")
    known = {"format", "when", "element", "feature", "measured_hz", "predicted_hz", "target_hz",
             "adjustments", "correction"}
    extra = sorted(set(obj) - known)
    if extra:
        raise bad(extra[0], "", "not a field of history format 1")
    for key in ("when", "feature", "measured_hz", "predicted_hz"):
        if key not in obj:
            raise bad(key, None, "this field is required")
    adj = obj.get("adjustments", [])
    if not isinstance(adj, list):
        raise bad("adjustments", short(repr(adj)), "a list of adjustments")
    adjustments: list[Adjustment] = []
    for k, a in enumerate(adj):
        if not isinstance(a, dict) or set(a) != {"dimension", "before", "after", "unit"}:
            raise bad(f"adjustments[{k}]", short(repr(a)),
                      "an adjustment has dimension, before, after and unit")
        adjustments.append(Adjustment(a["dimension"], a["before"], a["after"], a["unit"]))
    rec = HistoryRecord(obj["when"], obj.get("element", ""), obj["feature"], obj["measured_hz"],
                        obj["predicted_hz"], tuple(adjustments), obj.get("correction", ""),
                        obj.get("target_hz"))
    _check(rec, source, where)
    return rec


def read_history(text: str, source: str = "") -> tuple[HistoryRecord, ...]:
    """The records of a history file's text, in file order."""
    src = source or None
    if len(text) > MAX_RECORDS * MAX_LINE_CHARS or text.count("\n") > 2 * MAX_RECORDS:
        raise DesignError(f"a history holds at most {MAX_RECORDS} records of at most "
                          f"{MAX_LINE_CHARS} characters: start a new file", field="size",
                          value=f"{len(text)} characters", source=src)
    records: list[HistoryRecord] = []
    text = text.removeprefix("\ufeff")
    for n, line in enumerate(_LINES.split(text), start=1):
        if not line.strip():
            continue
        if len(line) > MAX_LINE_CHARS:
            raise DesignError(f"a history line is at most {MAX_LINE_CHARS} characters",
                              field=f"line {n}", value=short(line), source=src)
        if len(records) >= MAX_RECORDS:
            raise DesignError(f"a history holds at most {MAX_RECORDS} records: start a new file",
                              field=f"line {n}", value=short(line), source=src)
        try:
            obj = json.loads(line, parse_constant=_no_constant)
        except ValueError as exc:
            raise DesignError(f"not a JSON object ({exc.args[0].split(':')[0]})",
                              field=f"line {n}", value=short(line.strip()), source=src) from None
        records.append(_record(obj, src, n))
    return tuple(records)


def _no_constant(name: str) -> float:
    raise ValueError(f"{name} is not a number JSON allows")


@dataclass(frozen=True)
class HistorySummary:
    """The model against the first articles.

    count: records averaged; mean_relative_difference: mean of (measured -
    predicted) / predicted; stdev_relative_difference: their sample standard
    deviation (None for fewer than two); standard_error: stdev / sqrt(count)
    (None for fewer than two).
    """

    count: int
    mean_relative_difference: float
    stdev_relative_difference: float | None
    standard_error: float | None

    def model_target_hz(self, target_hz: float) -> float:
        """The frequency (Hz) to tune the model to so that, if the next article
        differs from the model as the past ones did on average, it lands on
        `target_hz` (Hz)."""
        return target_hz / (1.0 + self.mean_relative_difference)


def summarize(records: Sequence[HistoryRecord], *, feature: Feature | None = None,
              element: str | None = None) -> HistorySummary | None:
    """Average the relative difference over the records of `feature` and
    `element` (None: all); None when no record matches."""
    picked = [r for r in records if (feature is None or r.feature == feature)
              and (element is None or r.element == element)]
    if not picked:
        return None
    d = [r.relative_difference for r in picked]
    mean = math.fsum(d) / len(d)
    if len(d) < 2:
        return HistorySummary(1, mean, None, None)
    sd = statistics.stdev(d)
    return HistorySummary(len(d), mean, sd, sd / math.sqrt(len(d)))
