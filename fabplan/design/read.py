"""Design files (TOML) -> `Design`, with every key checked.

A design holds one or more elements (`[element]` or `[[element]]`), the stock
they are bent from (`[stock]`) and the shop's habits (`[shop]`), and the
optional tables of the later stages, each read by its own module in this
package: `[forming]` (forming.py), `[purchase]` (purchase.py), `[jig]`
(jig.py) and `[electrical]` (electrical.py). Everything comes out in
millimetres.

Every error in the file is reported at once: the tables share a
`fabplan.section.Collector`, each table (each element, each offer) is read on
its own, and one FabplanError carries a line per error. Every size a user
controls is bounded before any stage works on it (the bounds and their reasons
are in fabplan.design.model, fabplan.units and the readers).
"""

from __future__ import annotations

import math
import tomllib
from pathlib import Path
from typing import Any

from ..errors import DesignError, FabplanError
from ..geometry.shapes import SHAPES
from ..section import MAX_TEXT_CHARS, Collector, Section, key_text
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
from .model import (
    MAX_BENDS,
    MAX_DEPTH,
    MAX_ELEMENTS,
    MAX_FILE_BYTES,
    MAX_KERF_MM,
    MAX_PIECE_LENGTH_MM,
    MAX_QUANTITY,
    MAX_TRIM_MM,
    Design,
    ElementSpec,
    Shop,
    StockSpec,
)
from .purchase import read_purchase

__all__ = ["load_design", "parse_design", "read_design"]


def load_design(path: str | Path) -> Design:
    """Read and validate a design file."""
    p = Path(path)
    try:
        if p.stat().st_size > MAX_FILE_BYTES:
            raise DesignError(f"a design file is at most {MAX_FILE_BYTES // 1024} KiB; this one "
                              f"is {p.stat().st_size // 1024} KiB", source=str(p))
        text = p.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise DesignError("file not found", source=str(p)) from None
    except (OSError, UnicodeDecodeError) as exc:
        raise DesignError(f"cannot read: {exc}", source=str(p)) from None
    return parse_design(text, str(p))


def parse_design(text: str, source: str = "<design>") -> Design:
    """A Design from the text of a design file; every error in it raised at
    once (one FabplanError whose `lines` name each, with `source`)."""
    if len(text) > MAX_FILE_BYTES:
        raise DesignError(f"a design file is at most {MAX_FILE_BYTES // 1024} KiB",
                          source=source)
    text = text.removeprefix("\ufeff")  # a byte-order mark, as some editors write
    try:
        doc = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise DesignError(f"not valid TOML: {exc}", source=source) from None
    except RecursionError:
        raise DesignError(f"arrays or tables nested too deep: a design nests them at most "
                          f"{MAX_DEPTH} levels", source=source) from None
    try:
        _check_depth(doc)
        return read_design(doc, source)
    except FabplanError as exc:
        raise exc.with_source(source) from None


def _check_depth(doc: dict[str, Any]) -> None:
    """Refuse tables and arrays nested deeper than MAX_DEPTH (without recursion)."""
    stack: list[tuple[object, int, str]] = [(doc, 0, "")]
    while stack:
        value, depth, path = stack.pop()
        if depth > MAX_DEPTH:
            raise DesignError(f"nested {depth} levels deep; a design nests tables and arrays "
                              f"at most {MAX_DEPTH} levels", field=path or None)
        if isinstance(value, dict):
            stack.extend((v, depth + 1, f"{path}.{key_text(k)}" if path else key_text(k))
                         for k, v in value.items())
        elif isinstance(value, list):
            stack.extend((v, depth + 1, f"{path}[{i}]") for i, v in enumerate(value, 1))


def read_design(doc: dict[str, Any], source: str = "<design>") -> Design:
    """A Design from a parsed design file: every table read, every error in it
    collected and raised at once."""
    log = Collector()
    top = Section(doc, "", log)
    project, notes = log.attempt(_read_project, top) or ("fabplan design", "")
    stock = log.attempt(_read_stock, top)
    shop = log.attempt(_read_shop, top) or Shop()
    elements = _read_elements(top, log)
    boom = log.attempt(read_boom, top)
    electrical = log.attempt(read_electrical, top)
    failed = (boom is None and top.has("boom")) or (electrical is None and top.has("electrical"))
    if elements is not None and stock is not None and not failed:
        design_stock: StockSpec = stock  # a beam's elements are finished from the rest
        elements = log.attempt(beam_elements, elements, boom,
                               _element_fields(top, len(elements)),
                               lambda e: e.stock if e.stock is not None else design_stock,
                               electrical)
    else:
        elements = None  # what failed was recorded
    forming = log.attempt(read_forming, top, stock)
    names = None if elements is None else [e.name for e in elements]
    purchase = log.attempt(read_purchase, top, names)
    jig = log.attempt(read_jig, top)
    log.attempt(top.finish)
    for i, element in enumerate(elements or ()):
        own = element.stock if element.stock is not None else stock
        if own is not None:
            log.attempt(_check_size, top, i, element, own)
    log.raise_if_any()
    if stock is None or elements is None or forming is None or purchase is None or jig is None:
        raise DesignError("the design could not be read")  # every part failed with a line
    return Design(project, elements, stock, shop, source, forming, purchase, jig, electrical,
                  notes, doc, boom=boom)


def _read_project(top: Section) -> tuple[str, str]:
    sec = top.table("project", None)
    if sec is None:
        return "fabplan design", ""
    project = sec.name("name", "fabplan design")
    notes = sec.string("notes", "", max_chars=MAX_TEXT_CHARS)
    sec.finish()
    return project, notes


# the largest figure a design may give for each material property: above any metal's
# (from memory: osmium's density 22 590 kg/m3, diamond's modulus about 1.2e6 MPa;
# the yield, K and resistivity ceilings are ten times the strongest or most
# resistive alloy a conductor is made of)
PROPERTY_CEILINGS = {"density_kg_m3": 25_000.0, "youngs_modulus_mpa": 1.2e6,
                     "yield_mpa": 5_000.0, "hollomon_k_mpa": 20_000.0, "hollomon_n": 1.0,
                     "resistivity_ohm_m": 1e-5, "elongation": 1.0}
MAX_STOCK_MM = 200.0  # the stock's diameter, width or wall: bent by hand, far under 200 mm
STOCK_BOUND = "stock bent by hand is far thinner"
TRIM_BOUND = "trim per end: a bender's grip is 25 to 50 mm"
KERF_BOUND = "a saw's kerf: an abrasive or cold saw cuts 1 to 3 mm"


def _read_stock(top: Section) -> StockSpec:
    return _stock_table(top.table("stock"))


def _stock_table(sec: Section) -> StockSpec:
    """A stock table: the design's `[stock]` or an element's own."""
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
        profile = Round(sec.length("diameter", max_mm=MAX_STOCK_MM, bound=STOCK_BOUND))
        description, source = profile.describe(), "dimensions from the design"
    elif kind == "gauge":
        text = sec.string("gauge")
        profile = Round(parse_gauge(text))
        description = f"{text} solid ({profile.diameter_mm:.3f} mm)"
        source = "ASTM B258 (AWG) or BS 3737 (SWG)"
    elif kind == "tube":
        t = sec.table("tube")
        od = t.length("od", max_mm=MAX_STOCK_MM, bound=STOCK_BOUND)
        wall = t.length("wall", max_mm=MAX_STOCK_MM, bound=STOCK_BOUND)
        t.finish()
        if 2 * wall >= od:
            raise DesignError("the wall must be less than half the outside diameter",
                              field=t.field("wall"), value=t.data.get("wall"))
        profile = Tube(od, wall)
        description, source = profile.describe(), "dimensions from the design"
    else:
        t = sec.table("strip")
        profile = Strip(t.length("width", max_mm=MAX_STOCK_MM, bound=STOCK_BOUND),
                        t.length("thickness", max_mm=MAX_STOCK_MM, bound=STOCK_BOUND))
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
            value = props.number(key, None, low=0.0, low_open=low_open,
                                 high=PROPERTY_CEILINGS[key])
            if value is not None:
                changes[key] = value
        props.finish()
        material = material.overridden(**changes)
    k_given = sec.has("k_factor")
    k = sec.number("k_factor", 0.5, low=0.0, high=0.5)
    sec.finish()
    return StockSpec(material, profile, description, source,
                     sec.data.get("catalogue"), k, k_given)


def _read_shop(top: Section) -> Shop:
    sec = top.table("shop", None)
    if sec is None:
        return Shop()
    units = sec.string("units", "in", choices=LENGTH_UNITS)
    fraction = sec.integer("fraction", 32)
    if fraction not in FRACTIONS:
        raise DesignError(f"must be one of {', '.join(map(str, FRACTIONS))} (the denominator of "
                          "the smallest tape-measure fraction shown)", field="shop.fraction",
                          value=fraction)
    kerf = sec.length("kerf", 0.0, allow_zero=True, max_mm=MAX_KERF_MM, bound=KERF_BOUND)
    trim = sec.length("trim", 0.0, allow_zero=True, max_mm=MAX_TRIM_MM, bound=TRIM_BOUND)
    sec.finish()
    return Shop(units, fraction, kerf, trim)


def _read_elements(top: Section, log: Collector) -> tuple[ElementSpec, ...] | None:
    """Every element, each read on its own (None when any failed)."""
    tables = log.attempt(lambda: top.tables("element", required=True, max_count=MAX_ELEMENTS))
    if tables is None:
        return None
    if not tables:
        log.record(DesignError("give at least one [[element]]", field="element"))
        return None
    if len(tables) == 1 and isinstance(top.data["element"], dict):
        tables[0].path = "element"
    out: list[ElementSpec | None] = []
    for i, sec in enumerate(tables, 1):
        out.append(log.attempt(_read_element, sec, i))
    names: set[str] = set()
    for sec, spec in zip(tables, out):
        if spec is None:
            continue
        if spec.name in names:
            log.record(DesignError("two elements have the same name", field=sec.field("name"),
                                   value=spec.name))
        names.add(spec.name)
    if any(spec is None for spec in out):
        return None
    return tuple(spec for spec in out if spec is not None)


def _read_element(sec: Section, i: int) -> ElementSpec:
    with sec.strict():  # the shape decides which keys the table may hold
        shape = sec.string("shape", choices=SHAPES)
    name = sec.name("name", f"element {i}")
    quantity = sec.integer("quantity", 1, low=1, high=MAX_QUANTITY)
    trim = sec.length("trim", None, allow_zero=True, max_mm=MAX_TRIM_MM, bound=TRIM_BOUND)
    # misspelt keys first: they explain the rest
    sec.finish(also_allowed=SHAPES[shape].keys + EXTRA_KEYS + MOUNT_KEYS + ("match",))
    stock, placement, capacitor = read_element_extras(sec, _stock_table)
    mount, match = read_mount(sec), read_match(sec, _stock_table)
    params = SHAPES[shape].read(sec)
    sec.finish()
    return ElementSpec(name, shape, params, quantity, trim, stock, placement, capacitor, mount,
                       match)


def _element_fields(top: Section, count: int) -> list[str]:
    """Each element's table as errors name it."""
    if isinstance(top.data.get("element"), dict):
        return ["element"]
    return [f"element[{i}]" for i in range(1, count + 1)]


def _check_size(top: Section, index: int, spec: ElementSpec, stock: StockSpec) -> None:
    """Bound each piece of an element: its developed length and its bends, before
    any stage samples, meshes or draws it."""
    d = stock.profile.outer_diameter_mm
    raw = top.data.get("element")
    where = "element" if isinstance(raw, dict) else f"element[{index + 1}]"
    try:
        geometry = SHAPES[spec.shape].element_geometry(spec.params, d)
    except DesignError as exc:  # a shape's rule about one of its keys: as the file names it
        field = exc.field or ""
        if field.startswith("element"):
            raise
        table = raw if isinstance(raw, dict) else (raw[index] if isinstance(raw, list) else {})
        value = table.get(field, exc.value) if isinstance(table, dict) and field else exc.value
        raise DesignError(exc.rule, field=f"{where}.{field}" if field else where,
                          value=value) from None
    for piece in geometry.pieces:
        length = piece.path.centreline_length()
        if not math.isfinite(length) or length > MAX_PIECE_LENGTH_MM:
            raise DesignError(f"one piece of stock would be {length / 1000:.1f} m long; fabplan "
                              f"plans pieces up to {MAX_PIECE_LENGTH_MM / 1000:g} m (check the "
                              "dimensions and their units)", field=where)
        if len(piece.path.bends) > MAX_BENDS:
            raise DesignError(f"one piece of stock would have {len(piece.path.bends)} bends; "
                              f"fabplan plans pieces of up to {MAX_BENDS}", field=where)
