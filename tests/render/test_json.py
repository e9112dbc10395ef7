"""`fabplan plan --json` (fabplan/render/json.py): a format name and version at
the top, and every key listed in docs/plan-json.md with the type it has."""

from __future__ import annotations

import json
import re
from importlib import resources
from pathlib import Path

import pytest

from fabplan.geometry.shapes import SHAPES
from fabplan.render.json import PLAN_FORMAT, PLAN_FORMAT_VERSION, plan_to_dict, plan_to_json

DOC = Path(__file__).resolve().parents[2] / "docs" / "plan-json.md"

# a loop with a capacitor in its gap, fed by a coupling loop placed beside it: one
# structure with a load
LOADED = """
[project]
name = "loaded loop"
[stock]
catalogue = "cu-10x1"
[shop]
units = "mm"
[[element]]
name = "loop"
shape = "circle-loop"
diameter = "800 mm"
feed_gap = "20 mm"
[element.capacitor]
q = 2000
[element.placement]
at = ["0 mm", "0 mm", "0 mm"]
[[element]]
name = "coupling"
shape = "circle-loop"
diameter = "160 mm"
feed_gap = "10 mm"
[element.placement]
at = ["0 mm", "-300 mm", "0 mm"]
[electrical]
target = "14.1 MHz"
sweep = { from = "13.9 MHz", to = "14.3 MHz", step = "0.05 MHz" }
power = "10 W"
"""

STRIP = """
[project]
name = "strip hairpin"
[stock]
strip = { width = "12 mm", thickness = "1 mm" }
material = "cu-c11000-annealed"
[[element]]
shape = "hairpin"
leg = "60 mm"
spacing = "30 mm"
"""


def _doc() -> dict[str, tuple[str, str]]:
    """{key path: (type, unit)} from the doc's tables; a section's heading holds
    the path of its object (`elements[].bends[]`), "Top level" the root."""
    out: dict[str, tuple[str, str]] = {}
    section: str | None = None
    for line in DOC.read_text(encoding="utf-8").splitlines():
        head = re.match(r"## (.+)$", line)
        if head:
            title = head.group(1)
            m = re.fullmatch(r"`([^`]+)`", title)
            section = m.group(1) if m else ("" if title == "Top level" else None)
            continue
        row = re.match(r"\| `(\w+)` \| ((?:[^|\\]|\\\|)*)\| ([^|]*)\|", line)
        if row and section is not None:
            key = f"{section}.{row.group(1)}" if section else row.group(1)
            out[key] = (row.group(2).replace("\\|", "|").strip(), row.group(3).strip())
    return out


def _documented(path: str, doc) -> str | None:
    """The doc's entry for a key path: itself, or what the doc says it repeats (a
    piece's keys are a one-piece element's; with one structure its figures also
    stand in `electrical`)."""
    if path in doc:
        return path
    for prefix, same in (("elements[].pieces[].", "elements[]."),
                         ("electrical.", "electrical.structures[].")):
        if path.startswith(prefix) and same + path[len(prefix):] in doc:
            return same + path[len(prefix):]
    return None


def _walk(value, path: str, doc, seen: dict[str, list]) -> None:
    if isinstance(value, dict):
        for k, v in value.items():
            p = f"{path}.{k}" if path else k
            seen.setdefault(p, []).append(v)
            entry = _documented(p, doc)
            if entry is not None and doc[entry][0].startswith("map"):
                continue  # its keys are data (SWR limits)
            _walk(v, p, doc, seen)
    elif isinstance(value, list):
        for v in value:
            _walk(v, path + "[]", doc, seen)


def _fits(kind: str, v) -> bool:
    if v is None:
        return "null" in kind
    base = kind.split("|")[0].strip()
    if base.startswith("list"):
        return isinstance(v, list)
    return {
        "string": isinstance(v, str),
        "integer": isinstance(v, int) and not isinstance(v, bool),
        "number": isinstance(v, (int, float)) and not isinstance(v, bool),
        "boolean": isinstance(v, bool),
        "object": isinstance(v, dict),
        "map": isinstance(v, dict),
    }[base]


# a telescoping element given by the uniform element it behaves as
TELESCOPING = """
[stock]
catalogue = "al-5/8x0.058"
[boom]
square = { side = "30 mm" }
material = "wood"
length = "1 m"
frequency = "50.15 MHz"
[[element]]
shape = "straight"
feed_gap = "20 mm"
sections = [{ catalogue = "al-3/4x0.058", length = "700 mm" }, { catalogue = "al-1/2x0.058" }]
uniform = { length = "2800 mm", diameter = "15.875 mm" }
"""


@pytest.fixture(scope="module")
def plans(example_plan, beam_plan, uncomment_template):
    """The example, every template as written and with its optional tables switched
    on (and with a bender where the template shows one), and strip stock."""
    from fabplan.design.read import parse_design
    from fabplan.plan import make_plan

    out = [example_plan, beam_plan, make_plan(parse_design(STRIP)),
           make_plan(parse_design(LOADED)), make_plan(parse_design(TELESCOPING))]
    for shape in SHAPES:
        text = resources.files("fabplan").joinpath("templates", f"{shape}.toml").read_text()
        on = uncomment_template(text)
        out += [make_plan(parse_design(text)), make_plan(parse_design(on))]
        if "[forming.bender]" in on:
            out.append(make_plan(parse_design(on.replace('method = "former"',
                                                          'method = "bender"'))))
    return out


def test_the_json_starts_with_its_format_and_version(cli, example_path):
    text = cli("plan", example_path, "--json", check_exit=0).stdout
    data = json.loads(text)
    assert list(data)[:2] == ["format", "format_version"]
    assert (data["format"], data["format_version"]) == ("fabplan-plan", 1)
    assert (PLAN_FORMAT, PLAN_FORMAT_VERSION) == ("fabplan-plan", 1)
    assert text.startswith('{\n  "format": "fabplan-plan",\n  "format_version": 1,\n')


def test_every_key_is_documented_with_its_type(plans):
    doc = _doc()
    seen: dict[str, list] = {}
    for plan in plans:
        _walk(plan_to_dict(plan), "", doc, seen)
    missing = sorted(p for p in seen if _documented(p, doc) is None)
    assert missing == [], f"keys not in docs/plan-json.md: {missing}"
    wrong = sorted(p for p, values in seen.items()
                   if not all(_fits(doc[_documented(p, doc)][0], v) for v in values))
    assert wrong == [], f"values that do not have the documented type: {wrong}"
    # the plans above reach every documented key
    reached = {_documented(p, doc) for p in seen}
    unseen = sorted(set(doc) - reached)
    assert all(p.startswith("drilling") for p in unseen), unseen


def test_documented_units_match_the_key_names():
    suffix_unit = {"_mm": "mm", "_kg": "kg", "_deg": "deg", "_hz": "Hz", "_ohm": "ohm",
                   "_dbi": "dBi", "_a_rms": "A",
                   "_mpa": "MPa", "_db": "dB", "_w": "W", "_ohm_m": "ohm m", "_per_m_kg": "kg/m"}
    for path, (_, unit) in _doc().items():
        key = path.rsplit(".", 1)[-1]
        for suffix, expected in sorted(suffix_unit.items(), key=lambda kv: -len(kv[0])):
            if key.endswith(suffix):
                assert unit == expected, (path, unit)
                break


def test_estimate_and_compare_json_carry_their_format(cli, example_path):
    est = json.loads(cli("estimate", example_path, "--json", check_exit=0).stdout)
    assert (est["format"], est["format_version"]) == ("fabplan-estimate", 1)
    cmp = json.loads(cli("compare", example_path, example_path, "--json", check_exit=0).stdout)
    assert (cmp["format"], cmp["format_version"]) == ("fabplan-compare", 1)


def test_same_plan_same_text(example_plan):
    assert plan_to_json(example_plan) == plan_to_json(example_plan)


def test_no_figure_carries_round_off_digits(plans):
    # every figure is rounded for people and for stable files (at most 12 significant
    # digits: 0.1 Hz of a GHz); the SWR band edges once came out with 17
    def floats(x):
        if isinstance(x, dict):
            for v in x.values():
                yield from floats(v)
        elif isinstance(x, list):
            for v in x:
                yield from floats(v)
        elif isinstance(x, float):
            yield x

    for plan in plans:
        noisy = [v for v in floats(plan_to_dict(plan)) if float(f"{v:.12g}") != v]
        assert noisy == [], plan.design.source
