"""Design files (TOML) -> `Design`, with every key checked.

A design holds one or more elements (`[element]` or `[[element]]`), the stock
they are bent from (`[stock]`) and the shop's habits (`[shop]`), and the
optional tables of the later stages, each read by its own module in this
package: `[forming]` (forming.py), `[purchase]` (purchase.py), `[jig]`
(jig.py) and `[electrical]` (electrical.py). Everything comes out in
millimetres.
"""

from __future__ import annotations

import tomllib
from pathlib import Path
from typing import Any

from ..errors import DesignError, FabplanError
from ..geometry.shapes import SHAPES
from ..section import Section
from ..stock.catalogue import get_stock_item
from ..stock.materials import OVERRIDABLE, get_material
from ..stock.profiles import Profile, Round, Strip, Tube, parse_gauge
from ..units import FRACTIONS, LENGTH_UNITS
from .beam import beam_elements
from .boom import MOUNT_KEYS, read_boom, read_mount
from .electrical import read_electrical
from .element import EXTRA_KEYS, read_element_extras
from .forming import read_forming
from .jig import read_jig
from .match import read_match
from .model import Design, ElementSpec, Shop, StockSpec
from .purchase import read_purchase

__all__ = ["load_design", "parse_design", "read_design"]


def load_design(path: str | Path) -> Design:
    """Read and validate a design file."""
    p = Path(path)
    try:
        text = p.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise DesignError("file not found", source=str(p)) from None
    except (OSError, UnicodeDecodeError) as exc:
        raise DesignError(f"cannot read: {exc}", source=str(p)) from None
    return parse_design(text, str(p))


def parse_design(text: str, source: str = "<design>") -> Design:
    try:
        doc = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise DesignError(f"not valid TOML: {exc}", source=source) from None
    try:
        return read_design(doc, source)
    except FabplanError as exc:
        raise exc.with_source(source) from None


def read_design(doc: dict[str, Any], source: str = "<design>") -> Design:
    top = Section(doc, "")
    project_sec = top.table("project", None)
    project, notes = "fabplan design", ""
    if project_sec is not None:
        project = project_sec.string("name", project)
        notes = project_sec.string("notes", "")
        project_sec.finish()
    stock = _read_stock(top.table("stock"))
    shop = _read_shop(top.table("shop", None))
    elements = _read_elements(top)
    boom = read_boom(top)
    electrical = read_electrical(top)
    elements = beam_elements(elements, boom, _element_fields(top, len(elements)),
                             lambda e: e.stock if e.stock is not None else stock, electrical)
    forming = read_forming(top, stock)
    purchase = read_purchase(top, [e.name for e in elements])
    jig = read_jig(top)
    top.finish()
    return Design(project, elements, stock, shop, source, forming, purchase, jig, electrical,
                  notes, doc, boom=boom)


def _read_stock(sec: Section) -> StockSpec:
    given = [k for k in ("catalogue", "diameter", "gauge", "tube", "strip") if sec.has(k)]
    sec.mark_used("catalogue", "diameter", "gauge", "tube", "strip")
    if len(given) != 1:
        raise DesignError("give exactly one of catalogue, diameter, gauge, tube or strip"
                          + (f" (found {', '.join(given)})" if given else ""), field=sec.path)
    kind = given[0]
    default_material = None
    profile: Profile
    if kind == "catalogue":
        item = get_stock_item(sec.string("catalogue"))
        profile, default_material = item.profile, item.material
        description, source = item.description, item.source
    elif kind == "diameter":
        profile = Round(sec.length("diameter"))
        description, source = profile.describe(), "dimensions from the design"
    elif kind == "gauge":
        text = sec.string("gauge")
        profile = Round(parse_gauge(text))
        description = f"{text} solid ({profile.diameter_mm:.3f} mm)"
        source = "ASTM B258 (AWG) or BS 3737 (SWG)"
    elif kind == "tube":
        t = sec.table("tube")
        od, wall = t.length("od"), t.length("wall")
        t.finish()
        if 2 * wall >= od:
            raise DesignError("the wall must be less than half the outside diameter",
                              field=sec.field("tube.wall"), value=sec.raw("tube")["wall"])
        profile = Tube(od, wall)
        description, source = profile.describe(), "dimensions from the design"
    else:
        t = sec.table("strip")
        profile = Strip(t.length("width"), t.length("thickness"))
        t.finish()
        description, source = profile.describe(), "dimensions from the design"
    if sec.has("material"):
        material = get_material(sec.string("material"))
    elif default_material is not None:
        sec.mark_used("material")
        material = get_material(default_material)
    else:
        raise DesignError("is required (run `fabplan materials` for the list)",
                          field=sec.field("material"))
    props = sec.table("properties", None)
    if props is not None:
        changes = {}
        for key in OVERRIDABLE:
            low_open = key != "hollomon_n"
            value = props.number(key, None, low=0.0, low_open=low_open)
            if value is not None:
                changes[key] = value
        props.finish()
        material = material.overridden(**changes)
    k_given = sec.has("k_factor")
    k = sec.number("k_factor", 0.5, low=0.0, high=0.5)
    sec.finish()
    return StockSpec(material, profile, description, source,
                     sec.data.get("catalogue"), k, k_given)


def _read_shop(sec: Section | None) -> Shop:
    if sec is None:
        return Shop()
    units = sec.string("units", "in", choices=LENGTH_UNITS)
    fraction = sec.integer("fraction", 32)
    if fraction not in FRACTIONS:
        raise DesignError(f"must be one of {', '.join(map(str, FRACTIONS))} (the denominator of "
                          "the smallest tape-measure fraction shown)", field="shop.fraction",
                          value=fraction)
    kerf = sec.length("kerf", 0.0, allow_zero=True)
    trim = sec.length("trim", 0.0, allow_zero=True)
    sec.finish()
    return Shop(units, fraction, kerf, trim)


def _read_elements(top: Section) -> tuple[ElementSpec, ...]:
    tables = top.tables("element", required=True)
    if not tables:
        raise DesignError("give at least one [[element]]", field="element")
    if len(tables) == 1 and isinstance(top.data["element"], dict):
        tables[0].path = "element"
    out = []
    names: set[str] = set()
    for i, sec in enumerate(tables, 1):
        shape = sec.string("shape", choices=SHAPES)
        name = sec.string("name", f"element {i}")
        if name in names:
            raise DesignError("two elements have the same name", field=sec.field("name"),
                              value=name)
        names.add(name)
        quantity = sec.integer("quantity", 1, low=1, high=100_000)
        trim = sec.length("trim", None, allow_zero=True)
        # misspelt keys first: they explain the rest
        sec.finish(also_allowed=SHAPES[shape].keys + EXTRA_KEYS + MOUNT_KEYS + ("match",))
        stock, placement, capacitor = read_element_extras(sec, _read_stock)
        mount, match = read_mount(sec), read_match(sec, _read_stock)
        params = SHAPES[shape].read(sec)
        sec.finish()
        out.append(ElementSpec(name, shape, params, quantity, trim, stock, placement,
                               capacitor, mount, match))
    return tuple(out)


def _element_fields(top: Section, count: int) -> list[str]:
    """Each element's table as errors name it."""
    if isinstance(top.data.get("element"), dict):
        return ["element"]
    return [f"element[{i}]" for i in range(1, count + 1)]
