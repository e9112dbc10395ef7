"""Rewriting a design file with some values changed, comments and layout kept.

`rewrite_element` changes keys of one `[[element]]` table through tomlkit, a
style-preserving TOML library: every comment, blank line and the order of the
keys survive, and each changed value keeps its inline comment. The new text is
read back through the design reader and checked: the element's new values
must read as asked, and nothing else in the file may change.

Lengths are written in the shop's unit, precise to well under 0.01 mm.
"""

from __future__ import annotations

import copy
from collections.abc import Callable, Mapping
from typing import Any, Literal

from ..errors import DesignError
from ..units import IN, LengthUnit, parse_capacitance, parse_length
from .model import Design

__all__ = ["length_text", "rewrite_element", "Value"]

# ("length", mm) is written as a length string in the shop's unit; ("number", x) as a number;
# ("capacitance", F) as "33.00 pF". A key "match.length" is `length` in the element's
# `[element.match]` table.
Value = tuple[Literal["length", "number", "capacitance"], float]


def length_text(mm: float, unit: LengthUnit) -> str:
    """A length string for a design file, precise to well under 0.01 mm."""
    if unit == "in":
        return f"{mm / IN:.4f} in"
    return f"{mm:.3f} mm"


def _element_table(doc: Any, index: int) -> Any:
    tables = doc.get("element")
    if isinstance(tables, Mapping):
        return tables
    return tables[index]


def rewrite_element(text: str, design: Design, element_name: str, values: Mapping[str, Value],
                    source: str = "<rewritten design>",
                    check: Callable[[Design], None] | None = None) -> tuple[str, dict[str, str]]:
    """The design file's `text` with the element's keys in `values` changed,
    those the element's table gives (others are left out: a loop given by its
    `side` is not given a `width`). Returns (new text, {key: value as written}).

    The new text is read back: each written key must read back to its value
    (0.01 mm for lengths), `check` (if given) may inspect the new design, and
    nothing outside those keys may change."""
    import tomlkit

    from .read import parse_design

    # the element's table in the file (a matching device's part has none of its own)
    index = [e.name for e in design.elements if e.part_of is None].index(element_name)
    doc = tomlkit.parse(text.removeprefix("\ufeff"))
    table = _element_table(doc, index)
    unit = design.shop.units
    written: dict[str, str] = {}
    for key, (kind, value) in values.items():
        host, leaf = _host(table, key)
        if host is None or leaf not in host:
            continue
        if kind in ("length", "capacitance"):
            if not isinstance(host[leaf], str):
                continue
            new: Any = (length_text(value, unit) if kind == "length"
                        else f"{value * 1e12:.2f} pF")
            written[key] = new
        else:
            new = round(value, 6)
            written[key] = f"{new:g}"
        host[leaf] = new  # tomlkit keeps the key's layout and its comment
    if not written:
        keys = ", ".join(values) or "none"
        raise DesignError(f"none of the keys that carry this length ({keys}) is in the "
                          "element's table as a plain value; change the length by hand",
                          field=f"element {element_name!r}")
    new_text = tomlkit.dumps(doc)
    fresh = parse_design(new_text, source)
    _verify(fresh, design, index, values, written)
    if check is not None:
        check(fresh)
    return new_text, written


def _host(table: Any, key: str) -> tuple[Any, str]:
    """The (sub-)table that holds a dotted `key`, and the key's last part."""
    *path, leaf = key.split(".")
    for part in path:
        table = table.get(part) if isinstance(table, Mapping) else None
        if not isinstance(table, Mapping):
            return None, leaf
    return table, leaf


def _verify(fresh: Design, design: Design, index: int, values: Mapping[str, Value],
            written: Mapping[str, str]) -> None:
    table = _element_table(fresh.raw, index)
    for key in written:
        kind, want = values[key]
        host, leaf = _host(table, key)
        text = host[leaf]
        if kind == "length":
            got, tol = parse_length(text, key), 0.01
        elif kind == "capacitance":
            got, tol = parse_capacitance(text, key), 0.01e-12
        else:
            got, tol = float(text), 1e-6 * max(1.0, abs(want))
        if abs(got - want) > tol:
            raise DesignError(f"the rewritten file gives {key} = {text!r}, not "
                              f"{want:g}; change the length by hand", field=key)
    if _without(fresh.raw, index, written) != _without(design.raw, index, written):
        raise DesignError("rewriting the length changed something else in the file; change the "
                          "length by hand", field="rewrite")


def _without(raw: Mapping[str, Any], index: int, keys: Mapping[str, str]) -> dict[str, Any]:
    out = copy.deepcopy(dict(raw))
    table = _element_table(out, index)
    for k in keys:
        host, leaf = _host(table, k)
        if host is not None:
            host.pop(leaf, None)
    return out
