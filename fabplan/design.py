"""Design files (TOML) -> `Design`, with every key checked.

A design holds one or more elements (`[element]` or `[[element]]`), the stock
they are bent from (`[stock]`) and the shop's habits (`[shop]`). Later stages
read their own tables (`[forming]`, `[purchase]`, `[jig]`, `[electrical]`)
through the readers listed in `EXTENSIONS`. Everything comes out in millimetres.
"""

from __future__ import annotations

import dataclasses
import importlib
import tomllib
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from .config import Section
from .errors import DesignError, FabplanError
from .geometry.shapes import SHAPES
from .stock.catalogue import get_stock_item
from .stock.materials import OVERRIDABLE, Material, get_material
from .stock.profiles import Profile, Round, Strip, Tube, parse_gauge
from .units import FRACTIONS, LENGTH_UNITS, LengthUnit

__all__ = ["Design", "ElementSpec", "StockSpec", "Shop", "load_design", "parse_design",
           "read_design", "EXTENSIONS"]


@dataclass(frozen=True)
class StockSpec:
    """The conductor stock: its material, cross-section and where they come from."""

    material: Material
    profile: Profile
    description: str
    source: str
    catalogue: str | None = None
    k_factor: float = 0.5
    k_factor_given: bool = False


@dataclass(frozen=True)
class Shop:
    """Shop habits: display units, fraction precision, saw kerf, trim per end (mm)."""

    units: LengthUnit = "in"
    fraction: int = 32
    kerf_mm: float = 0.0
    trim_mm: float = 0.0


@dataclass(frozen=True)
class ElementSpec:
    """One element to build: a shape with its dimensions, and how many."""

    name: str
    shape: str
    params: Any
    quantity: int = 1
    trim_mm: float | None = None  # per end; None: the shop's


@dataclass(frozen=True)
class Design:
    """The validated input: lengths in mm, nothing else."""

    project: str
    elements: tuple[ElementSpec, ...]
    stock: StockSpec
    shop: Shop
    source: str = "<design>"
    forming: Any = None
    purchase: Any = None
    jig: Any = None
    electrical: Any = None
    notes: str = ""
    raw: dict = field(default_factory=dict, compare=False, repr=False)


# top-level tables read by later stages: Design field -> "module:function".
# Each reader takes (top-level Section, Design without extensions) and returns
# its settings object (or None when its tables are absent).
EXTENSIONS: dict[str, str] = {
    "forming": "fabplan.forming.config:read_forming",
    "purchase": "fabplan.estimate.config:read_purchase",
    "electrical": "fabplan.em.config:read_electrical",
    "jig": "fabplan.jig.settings:read_jig",
}


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


def read_design(doc: dict, source: str = "<design>") -> Design:
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
    design = Design(project, elements, stock, shop, source, notes=notes, raw=doc)
    extras = {}
    for attr, where in EXTENSIONS.items():
        module, func = where.split(":")
        reader = getattr(importlib.import_module(module), func)
        extras[attr] = reader(top, design)
    top.finish()
    if extras:
        design = dataclasses.replace(design, **extras)
    return design


def _read_stock(sec: Section) -> StockSpec:
    given = [k for k in ("catalogue", "diameter", "gauge", "tube", "strip") if sec.has(k)]
    sec.mark_used("catalogue", "diameter", "gauge", "tube", "strip")
    if len(given) != 1:
        raise DesignError("give exactly one of catalogue, diameter, gauge, tube or strip"
                          + (f" (found {', '.join(given)})" if given else ""), field="stock")
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
                              field="stock.tube.wall", value=sec.raw("tube")["wall"])
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
                          field="stock.material")
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
        sec.finish(also_allowed=SHAPES[shape].keys)  # misspelt keys first: they explain the rest
        params = SHAPES[shape].read(sec)
        sec.finish()
        out.append(ElementSpec(name, shape, params, quantity, trim))
    return tuple(out)
