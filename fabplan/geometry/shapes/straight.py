"""A straight element: a rod or tube of a given tip-to-tip length.

Without `feed_gap` it is one piece (a parasitic element: a reflector or director).
With `feed_gap` it is a split element: two pieces of stock, one each side of an
insulator at the centre, fed across the gap between their inner ends; each half
is cut and marked on its own. The element lies along its frame's x axis, centred
on the origin.

Telescoping (`sections`): tubes that step down in size from the centre out, each
its own piece of stock (a catalogue item, or a tube's `od` and `wall` in the
element's material), listed from the centre out with the length each shows per
side (`length`, the exposed length, the centre tube's measured from the element's
centre; the tip section takes whatever the element's `length` leaves) and how far it
slides into the tube before it (`overlap`, default
3 in: "about 3 in is generally recommended", L. B. Cebik, W4RNL, "I Want to Build
a 3-Element Yagi", part 3, read in this session). The centre tube is one piece
across the centre (two, one each side of the insulator, when the element is
split). The electrical model sees one conductor per side whose radius steps where
the tubes do (fabplan.em), not the overlapping tubes. Instead of `length`, a
telescoping element may give `uniform = { length, diameter }`: the uniform element it
must behave as (a published design's, e.g. NBS TN 688's); the design reader then
solves the tip tube's length by the stepped-element method (fabplan.antennas.taper,
Leeson after Schelkunoff) at the design frequency.

A whole element can also be modelled fed at its centre (a gamma or T match feeds
it: the published transmission-line model of those matches needs the element's
centre impedance) or as two halves joined at the centre (bonded to a metal boom
that is modelled as a conductor); those are set by the design reader, not keys.

mm throughout.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass
from typing import Literal

from ...errors import DesignError, Finding
from ...section import Section
from ..path import BendPath, Straight
from .base import (
    Dimension,
    ElementGeometry,
    End,
    Gap,
    PieceGeometry,
    PieceStock,
    ShapeSpec,
    TunedValue,
)

NAME = "straight"
SUMMARY = ("a straight rod or tube, whole or split at a centre feed gap, or telescoping "
           "tubes (beam elements)")
DEFAULT_OVERLAP_MM = 3 * 25.4  # W4RNL: "about 3 in is generally recommended" [S]

ModelCentre = Literal["as-built", "fed", "joined"]


@dataclass(frozen=True)
class TubeSection:
    """One size of tube in a telescoping element: its stock, its exposed length per
    side (mm; None for the tip section, which takes the rest) and how far it slides
    into the tube before it (mm; 0 for the centre tube)."""

    stock: PieceStock
    exposed_mm: float | None
    overlap_mm: float


@dataclass(frozen=True)
class Uniform:
    """The uniform element a telescoping one must behave as (mm), and, once the design
    reader has solved the tip, the frequency (Hz) and the stepped-element correction
    (tapered minus uniform length, mm)."""

    length_mm: float
    diameter_mm: float
    frequency_hz: float | None = None
    correction_mm: float | None = None


@dataclass(frozen=True)
class Params:
    length_mm: float  # tip to tip
    feed_gap_mm: float | None = None  # None: one piece, not fed
    sections: tuple[TubeSection, ...] = ()  # telescoping, from the centre out
    model_centre: ModelCentre = "as-built"  # set by the design reader (see the docstring)
    model_gap_mm: float = 0.0  # the model's centre gap when fed through a match
    uniform: Uniform | None = None  # telescoping: the uniform element it behaves as


def _read_sections(sec: Section) -> tuple[TubeSection, ...]:
    raw = sec.raw("sections", None)
    if raw is None:
        return ()
    where = sec.field("sections")
    if not isinstance(raw, list) or len(raw) < 2:
        raise DesignError("expected a list of at least two tube sizes from the centre out, "
                          'e.g. [{ catalogue = "al-5/8x0.058", length = "600 mm" }, '
                          '{ catalogue = "al-1/2x0.058" }]', field=where, value=raw)
    out = []
    for i, item in enumerate(raw):
        t = Section(item, f"{where}[{i + 1}]")
        last = i == len(raw) - 1
        if t.has("catalogue") == (t.has("od") or t.has("wall")):
            raise DesignError("give the tube's catalogue key, or its od and wall",
                              field=t.path, value=item)
        if t.has("catalogue"):
            stock = PieceStock(catalogue=t.string("catalogue"), field=t.field("catalogue"))
        else:
            od, wall = t.length("od"), t.length("wall")
            if 2 * wall >= od:
                raise DesignError("the wall must be less than half the outside diameter",
                                  field=t.field("wall"), value=t.raw("wall"))
            stock = PieceStock(od_mm=od, wall_mm=wall, field=t.path)
        if last and t.has("length"):
            raise DesignError("the tip section takes what the element's `length` leaves: "
                              "leave out its length", field=t.field("length"))
        exposed = None if last else t.length("length")
        overlap = 0.0 if i == 0 else t.length("overlap", DEFAULT_OVERLAP_MM)
        if i == 0 and t.has("overlap"):
            raise DesignError("the centre tube slides into nothing: leave out its overlap",
                              field=t.field("overlap"))
        t.finish()
        out.append(TubeSection(stock, exposed, overlap))
    return tuple(out)


def read(sec: Section) -> Params:
    sections = _read_sections(sec)
    gap = sec.length("feed_gap", None)
    u = sec.table("uniform", None)
    if u is None:
        return Params(sec.length("length"), gap, sections)
    if not sections:
        raise DesignError("`uniform` gives the element a telescoping element behaves as: give "
                          "its sections too", field=u.path)
    if sec.has("length"):
        raise DesignError("give `length` or `uniform` (the tip is then solved), not both",
                          field=sec.field("length"))
    uniform = Uniform(u.length("length"), u.length("diameter"))
    u.finish()
    return Params(0.0, gap, sections, uniform=uniform)


def _half(p: Params) -> float:
    return (p.length_mm - (p.feed_gap_mm or 0.0)) / 2


def exposed_lengths(p: Params) -> list[float]:
    """Each section's exposed length per side (mm), measured from the element's centre
    for the centre tube (a split element's feed gap comes out of it); the tip's is what
    the element's length leaves."""
    fixed = [s.exposed_mm or 0.0 for s in p.sections[:-1]]
    return fixed + [p.length_mm / 2 - sum(fixed)]


def build(p: Params, d: float) -> BendPath:
    """The whole element as one path (a split element's geometry is two pieces)."""
    return BendPath((Straight(p.length_mm),), origin=(-p.length_mm / 2, 0.0, 0.0))


def _run(x0: float, length: float) -> BendPath:
    return BendPath((Straight(length),), origin=(x0, 0.0, 0.0))


def _tubes(p: Params) -> tuple[list[PieceGeometry], dict[tuple[int, str], int]]:
    """The telescoping pieces and which piece is section k on side "A" and "B" (the
    whole centre tube is both)."""
    e = exposed_lengths(p)
    g = (p.feed_gap_mm or 0.0) / 2
    n = len(p.sections)
    pieces: list[PieceGeometry] = []
    where: dict[tuple[int, str], int] = {}
    centre = p.sections[0].stock
    if p.feed_gap_mm is not None:
        where[(0, "A")] = len(pieces)
        pieces.append(PieceGeometry("centre tube, side A", _run(-e[0], e[0] - g), centre))
        where[(0, "B")] = len(pieces)
        pieces.append(PieceGeometry("centre tube, side B", _run(g, e[0] - g), centre))
    else:
        where[(0, "A")] = where[(0, "B")] = len(pieces)
        pieces.append(PieceGeometry("centre tube", _run(-e[0], 2 * e[0]), centre))
    inner = e[0]
    for k in range(1, n):
        s = p.sections[k]
        o = s.overlap_mm
        outer = inner + e[k]
        tip = k == n - 1
        host_a, host_b = where[(k - 1, "A")], where[(k - 1, "B")]
        fit_a = (f"slides into the {pieces[host_a].label.split(',')[0]} to here", e[k])
        fit_b = (f"slides into the {pieces[host_b].label.split(',')[0]} to here", o)
        where[(k, "A")] = len(pieces)
        pieces.append(PieceGeometry(f"tube {k + 1}, side A", _run(-outer, e[k] + o), s.stock,
                                    ("A",) if tip else (), (fit_a,), host_a))
        where[(k, "B")] = len(pieces)
        pieces.append(PieceGeometry(f"tube {k + 1}, side B", _run(inner - o, e[k] + o),
                                    s.stock, ("B",) if tip else (), (fit_b,), host_b))
        inner = outer
    return pieces, where


def _conductor(p: Params, where: dict[tuple[int, str], int], side: str,
               start_mm: float = 0.0) -> tuple[tuple[float, int], ...]:
    """Which stock piece a modelled conductor runs through, from its end A (mm): side
    "A" from its tip inward; side "B" outward from `start_mm` beyond the centre."""
    e = exposed_lengths(p)
    n = len(p.sections)
    out, s = [], 0.0
    if side == "A":
        for k in range(n - 1, -1, -1):
            out.append((s, where[(k, "A")]))
            s += e[k]
        return tuple(out)
    for k in range(n):
        out.append((max(s - start_mm, 0.0), where[(k, "B")]))
        s += e[k]
    return tuple(out)


def geometry(p: Params, d: float) -> ElementGeometry:
    half = _half(p)
    g = p.feed_gap_mm
    if p.sections:
        pieces, where = _tubes(p)
        gaps: tuple[Gap, ...] = ()
        if g is not None:
            gaps = (Gap(End(where[(0, "A")], "B"), End(where[(0, "B")], "A"), g, "feed"),)
        stock_geometry = ElementGeometry(tuple(pieces), gaps)
        centre_gap = g if g is not None else (p.model_gap_mm if p.model_centre == "fed"
                                              else 0.0)
        ca, cb = _conductor(p, where, "A"), _conductor(p, where, "B", centre_gap / 2)
        if g is None and p.model_centre == "as-built":
            # side A from its tip to the centre, then side B beyond the centre tube's middle
            whole = list(ca) + [(p.length_mm / 2 + s, i) for s, i in cb[1:]]
            model = ElementGeometry((PieceGeometry("", build(p, d), conductor_of=tuple(whole)),))
        else:
            model = _two_sides(p, centre_gap, ca, cb,
                               "feed" if g is not None or p.model_centre == "fed" else None)
        return dataclasses.replace(stock_geometry, model=model)
    if g is None:
        one = ElementGeometry((PieceGeometry("", build(p, d), tips=("A", "B")),))
        if p.model_centre == "as-built":
            return one
        gap = p.model_gap_mm if p.model_centre == "fed" else 0.0
        model = _two_sides(p, gap, (), (), "feed" if p.model_centre == "fed" else None)
        return dataclasses.replace(one, model=model)
    left = BendPath((Straight(half),), origin=(-p.length_mm / 2, 0.0, 0.0))
    right = BendPath((Straight(half),), origin=(g / 2, 0.0, 0.0))
    return ElementGeometry((PieceGeometry("half A", left, tips=("A",)),
                            PieceGeometry("half B", right, tips=("B",))),
                           (Gap(End(0, "B"), End(1, "A"), g, "feed"),))


def _two_sides(p: Params, gap: float, ca: tuple[tuple[float, int], ...],
               cb: tuple[tuple[float, int], ...], role: str | None) -> ElementGeometry:
    """The element as two conductors from the centre: across a fed gap, or meeting."""
    side = (p.length_mm - gap) / 2
    a = PieceGeometry("side A", _run(-p.length_mm / 2, side), conductor_of=ca)
    b = PieceGeometry("side B", _run(gap / 2, side), conductor_of=cb)
    gaps = (Gap(End(0, "B"), End(1, "A"), gap, "feed"),) if role == "feed" else ()
    return ElementGeometry((a, b), gaps)


def problems(p: Params, d: float) -> list[Finding]:
    out = []
    if p.feed_gap_mm is not None and not p.sections and _half(p) <= d:
        out.append(Finding("gap-wider-than-side", "error",
                           f"a {p.feed_gap_mm:.1f} mm feed gap leaves halves of "
                           f"{_half(p):.1f} mm: shorten the gap or lengthen the element"))
    if p.sections:
        e = exposed_lengths(p)
        if e[-1] <= 0:
            out.append(Finding("tip-section-too-short", "error",
                               f"the inner sections already make {sum(e[:-1]):.1f} mm a side of "
                               f"the {p.length_mm / 2:.1f} mm the element's length gives: the "
                               "tip tube has no length; shorten the inner sections"))
        g = (p.feed_gap_mm or 0.0) / 2
        if e[0] <= g + d:
            out.append(Finding("gap-wider-than-side", "error",
                               f"the centre tube shows {e[0]:.1f} mm a side from the centre, not "
                               f"enough for the {2 * g:.1f} mm feed gap: lengthen it"))
        for k in range(1, len(p.sections)):
            o = p.sections[k].overlap_mm
            room = e[k - 1] - (g if k == 1 else 0.0)
            if o >= room:
                out.append(Finding("overlap-longer-than-tube", "error",
                                   f"tube {k + 1} slides {o:.1f} mm into tube {k}, which shows "
                                   f"only {room:.1f} mm a side: shorten the overlap or lengthen "
                                   f"tube {k}"))
    return out


def governing(p: Params) -> tuple[str, float]:
    return "length", p.length_mm


def with_governing(p: Params, value: float) -> Params:
    return dataclasses.replace(p, length_mm=value)


def tuned_keys(p: Params) -> dict[str, TunedValue]:
    return {"length": ("length", p.length_mm)}


def dimensions(p: Params, d: float) -> tuple[Dimension, ...]:
    """The tip-to-tip length, above the element."""
    half = p.length_mm / 2
    return (Dimension("length", p.length_mm, (-half, 0.0, 0.0), (half, 0.0, 0.0),
                      (0.0, 1.0, 0.0)),)


KEYS = ("length", "feed_gap", "sections", "uniform")

SPEC = ShapeSpec(NAME, SUMMARY, KEYS, read, build, problems, governing, with_governing,
                 tuned_keys, geometry=geometry, dimensions=dimensions)
