"""The first-article history file (JSON Lines; format in fabplan/measure/history.py).

source for the reader: Python's json module, an independent JSON reader, must read every
line the writer writes (JSON Lines: one JSON value per line).
"""

from __future__ import annotations

import json
import math
import statistics

import pytest

from fabplan.errors import DesignError
from fabplan.measure import (
    Adjustment,
    HistoryRecord,
    read_history,
    record_line,
    summarize,
)


def _rec(measured_mhz: float, predicted_mhz: float = 440.0, feature="resonance",
         element="driven", when="2025-03-01T14:30") -> HistoryRecord:
    return HistoryRecord(when, element, feature, measured_mhz * 1e6, predicted_mhz * 1e6,
                         (Adjustment("side", 250.0, 247.5), Adjustment("capacitor", 12.0, 11.5,
                                                                       "pF")),
                         "side 250.0 -> 247.5 mm", 440e6)


def test_line_is_json_with_sorted_keys_and_reads_back():
    rec = _rec(446.0)
    line = record_line(rec)
    assert line.endswith("\n") and line.count("\n") == 1
    obj = json.loads(line)
    assert list(obj) == sorted(obj) and obj["format"] == 1
    assert obj["measured_hz"] == 446e6 and obj["adjustments"][1]["unit"] == "pF"
    assert read_history(line, "h.jsonl") == (rec,)
    assert record_line(rec) == line  # same record, same bytes


def test_appended_lines_read_in_order_and_blank_lines_are_skipped():
    text = record_line(_rec(446.0)) + "\n" + record_line(_rec(444.0, when="2025-03-08"))
    recs = read_history(text)
    assert [r.measured_hz for r in recs] == [446e6, 444e6]


def test_summary_is_the_mean_relative_difference():
    # a club's twelve elements: (measured - predicted)/predicted, mean and sample stdev
    # (statistics module as the reference)
    measured = [446.0, 444.0, 445.5, 443.0, 447.0, 444.5, 446.5, 445.0, 444.0, 446.0, 445.0,
                443.5]
    recs = [_rec(m) for m in measured] + [_rec(430.0, feature="least-swr")]
    s = summarize(recs, feature="resonance")
    d = [(m - 440.0) / 440.0 for m in measured]
    assert s.count == 12
    assert s.mean_relative_difference == pytest.approx(statistics.fmean(d), rel=1e-12)
    assert s.stdev_relative_difference == pytest.approx(statistics.stdev(d), rel=1e-12)
    assert s.standard_error == pytest.approx(statistics.stdev(d) / math.sqrt(12), rel=1e-12)
    # the article lands on the target when the model is tuned to target / (1 + mean)
    target = 440e6
    model_target = s.model_target_hz(target)
    assert model_target * (1 + s.mean_relative_difference) == pytest.approx(target)
    assert model_target < target  # the stock resonates high: tune the model lower
    assert summarize(recs, element="other") is None
    one = summarize(recs, feature="least-swr")
    assert one.count == 1 and one.stdev_relative_difference is None


@pytest.mark.parametrize(("line", "match"), [
    ("not json", r"h\.jsonl: line 1 = 'not json': not a JSON object"),
    ("[1, 2]", "each line is one JSON object"),
    ('{"format": 2}', "format = 2: this reader knows history format 1"),
    ('{"format": 1, "when": "2025-01-01", "feature": "resonance", "measured_hz": 1e8}',
     "predicted_hz: this field is required"),
    (('{"format": 1, "when": "yesterday", "feature": "resonance", "measured_hz": 1e8, '
     '"predicted_hz": 1e8}'), "when = 'yesterday': the date and time are ISO 8601"),
    (('{"format": 1, "when": "2025-01-01", "feature": "dip", "measured_hz": 1e8, '
     '"predicted_hz": 1e8}'), "feature = 'dip'"),
    (('{"format": 1, "when": "2025-01-01", "feature": "resonance", "measured_hz": -1, '
     '"predicted_hz": 1e8}'), "measured_hz = -1: a frequency is a positive number"),
    (('{"format": 1, "when": "2025-01-01", "feature": "resonance", "measured_hz": NaN, '
     '"predicted_hz": 1e8}'), "not a JSON object"),
    (('{"format": 1, "when": "2025-01-01", "feature": "resonance", "measured_hz": 1e8, '
     '"predicted_hz": 1e8, "colour": "red"}'), "colour"),
    (('{"format": 1, "when": "2025-01-01", "feature": "resonance", "measured_hz": 1e8, '
     '"predicted_hz": 1e8, "adjustments": [{"dimension": "side"}]}'), "adjustments\\[0\\]"),
])
def test_bad_lines_are_refused_naming_the_line(line, match):
    with pytest.raises(DesignError, match=match):
        read_history("\n" * 0 + line + "\n", "h.jsonl")


def test_a_bad_record_is_not_written():
    with pytest.raises(DesignError, match="ISO 8601"):
        record_line(_rec(440.0, when="3 March"))
    with pytest.raises(DesignError, match="one-line text"):
        record_line(HistoryRecord("2025-03-01", "a\nb", "resonance", 1e8, 1e8))
