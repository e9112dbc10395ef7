"""Quadrifilar helix: two bifilar loops, large and small, wound on one mast.

Each loop is one continuous conductor (one piece of stock): a top half-radial
from the feed at the mast's axis, a corner, a helical arm down (a half turn by
default), a corner, the bottom radial straight through the mast, a corner, a
second helical arm up, a corner and the other top half-radial back to the feed.
The feed gap of each loop is at the top, on the axis; the two loops are fed in
parallel (one feed point, two gaps). The small loop is turned 90 degrees from
the large one about the mast (see `small_azimuth_deg`).

Give the loops' sizes one of two ways:

- `frequency` (with optional `size_ratio` or `q_loop`, `loop_length_wl`,
  `diameter_to_height`): starting dimensions from Kilgus's self-phasing design
  (fabplan.antennas.quadrifilar.design_qfh, sources there). The loop length is
  the sharp-cornered centreline length 2 D + 2 sqrt(H^2 + (pi D N)^2); rounding
  the corners shortens the conductor a little, which `fabplan tune` corrects.
- `large_diameter`, `large_height`, `small_diameter`, `small_height`: each
  loop's helix diameter (between the helical arms' centrelines, across the mast:
  the radial's length from corner to corner with sharp corners) and height
  (between the top and bottom radials' centrelines). Edit the starting
  dimensions into these.

Frame: the mast's axis is z, the top radials lie in z = 0 and the loops hang
down (z < 0); the large loop's top radial lies along x (azimuth 0), its end A
at +x; azimuths are counter-clockwise seen from above (from +z). A right-hand
winding rises counter-clockwise (a right-handed screw).

Corners: a planar bend of `corner_radius` (default 2.5 conductor diameters)
joins each radial to its helix. The corner is solved so that the radials pass
through the mast's axis and each arm is an exact helix about it: the bend's
angle is a little over 90 degrees and its plane leans by about the helix's
pitch angle. Lengths in mm, angles in degrees.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass

import numpy as np

from ...antennas.common import wavelength_mm
from ...antennas.quadrifilar import (
    DEFAULT_DIAMETER_TO_HEIGHT,
    HANDEDNESS,
    Handedness,
    QfhDesign,
    QfhLoop,
    design_qfh,
    qfh_loop,
)
from ...errors import DesignError, Finding
from ...section import Section
from ..path import Bend, BendPath, Piece, Straight
from .base import ElementGeometry, End, Gap, PieceGeometry, ShapeSpec, TunedValue

__all__ = ["NAME", "Params", "LoopShape", "read", "build", "geometry", "problems", "governing",
           "with_governing", "tuned_keys", "loop_path", "loop_shape", "qfh_design",
           "small_azimuth_deg", "DEFAULT_Q_LOOP", "SPEC", "RATIO_RANGE", "MastInputs",
           "mast_inputs", "loop_shapes", "corner_radius_of"]

NAME = "quadrifilar-helix"
SUMMARY = ("two bifilar loops (large and small) of helical half-turns on a mast, fed in "
           "parallel: a resonant quadrifilar helix")

# The loops' unloaded Q the default size ratio is derived from (Kilgus self-phasing,
# antennas/quadrifilar.self_phasing, which says to take Q from a model of the loop):
# Q = (f0 / 2 R) dX/df at resonance of one bifilar half-turn loop of D/H 0.44 and one
# wavelength, 2 mm wire, 8 mm corners, from fabplan's own method-of-moments model of
# that loop alone: 26.6 at 144.4 MHz (R 36.5 ohm). It gives a size ratio of 1.039
# (large : small); the tests check that the pair is then self-phased in the model.
DEFAULT_Q_LOOP = 26.0
RATIO_RANGE = (1.02, 1.25)  # a size ratio outside this is far from the self-phasing design
_CORNER_DIAMETERS = 2.5  # default corner radius: this many conductor diameters


@dataclass(frozen=True)
class Params:
    """Both loops (mm): helix diameter and height of each; turns of each arm;
    handedness; corner radius (None: 2.5 conductor diameters); feed gap; the
    mast's outside diameter (None: no drilling pattern); the small loop's top
    radial below the large one's; and, when the sizes were derived, the design
    frequency (Hz) and loop length (wavelengths) for the record."""

    large_diameter_mm: float
    large_height_mm: float
    small_diameter_mm: float
    small_height_mm: float
    turns: float = 0.5
    handedness: Handedness = "right"
    corner_radius_mm: float | None = None
    feed_gap_mm: float = 10.0
    mast_diameter_mm: float | None = None
    small_top_offset_mm: float = 0.0
    mast_length_mm: float | None = None
    frequency_hz: float | None = None
    loop_length_wl: float | None = None
    basis: str = "dimensions given in the design"


_DIMS = ("large_diameter", "large_height", "small_diameter", "small_height")
_DERIVED = ("frequency", "size_ratio", "q_loop", "loop_length_wl", "diameter_to_height")
KEYS = (*_DIMS, *_DERIVED, "turns", "handedness", "corner_radius", "feed_gap", "mast_diameter",
        "small_top_offset", "mast_length")


def read(sec: Section) -> Params:
    turns = sec.number("turns", 0.5, low=0.25, high=4.0)
    hand = sec.string("handedness", "right", choices=HANDEDNESS)
    corner = sec.length("corner_radius", None)
    gap = sec.length("feed_gap", 10.0)
    mast = sec.length("mast_diameter", None)
    offset = sec.length("small_top_offset", 0.0, allow_zero=True)
    mast_length = sec.length("mast_length", None)
    if mast_length is not None and mast is None:
        raise DesignError("mast_length needs mast_diameter (the mast's outside diameter)",
                          field=sec.field("mast_length"), value=sec.raw("mast_length"))
    given = [k for k in _DIMS if sec.has(k)]
    if sec.has("frequency"):
        if given:
            raise DesignError(f"give the loops' sizes ({', '.join(_DIMS)}) or a frequency to "
                              f"derive them from, not both (found {', '.join(given)})",
                              field=sec.field("frequency"))
        f_hz = sec.frequency("frequency")
        ratio = sec.number("size_ratio", None, low=1.0001, high=1.5)
        q = sec.number("q_loop", None, low=1.0, high=1000.0)
        if ratio is not None and q is not None:
            raise DesignError("give size_ratio or q_loop, not both", field=sec.field("q_loop"),
                              value=q)
        wl = sec.number("loop_length_wl", 1.0, low=0.4, high=2.2)
        dh = sec.number("diameter_to_height", DEFAULT_DIAMETER_TO_HEIGHT, low=0.05, high=5.0)
        default_q = ratio is None and q is None
        d = design_qfh(f_hz, conductor_diameter_mm=1.0, size_ratio=ratio,
                       q_loop=DEFAULT_Q_LOOP if default_q else q, loop_length_wl=wl,
                       diameter_to_height=dh, turns=turns, handedness=hand)
        basis = d.basis + ("; that Q is the default, from fabplan's model of one loop"
                           if default_q else "")
        return Params(d.large.diameter_mm, d.large.height_mm, d.small.diameter_mm,
                      d.small.height_mm, turns, hand, corner, gap, mast, offset, mast_length,
                      f_hz, wl, basis)
    for k in _DERIVED[1:]:
        if sec.has(k):
            raise DesignError(f"{k} is used only with `frequency` (to derive the loops' sizes)",
                              field=sec.field(k))
    if len(given) != len(_DIMS):
        missing = [k for k in _DIMS if k not in given]
        raise DesignError(f"give `frequency` to derive the loops' sizes, or all four of "
                          f"{', '.join(_DIMS)} (missing {', '.join(missing)})", field=sec.path)
    ld, lh, sd, sh = (sec.length(k) for k in _DIMS)
    return Params(ld, lh, sd, sh, turns, hand, corner, gap, mast, offset, mast_length)


def corner_radius_of(p: Params, d: float) -> float:
    """The corners' centreline radius (mm): the given one, or 2.5 conductor diameters."""
    return p.corner_radius_mm if p.corner_radius_mm is not None else _CORNER_DIAMETERS * d


def small_azimuth_deg(p: Params) -> float:
    """The small loop's top radial's azimuth (deg): 90 degrees from the large loop's,
    on the side that puts the beam up (towards the feed end, backfire) with the small
    loop's current leading: counter-clockwise (+90) for a right-hand winding, -90 for
    left (the mirror image); the other side fires the beam down. In the model a
    right-hand winding so fed radiates left-hand circular polarisation upwards and a
    left-hand winding right-hand (tests/em/test_helix.py)."""
    return 90.0 if p.handedness == "right" else -90.0


@dataclass(frozen=True)
class LoopShape:
    """One loop as built (mm, deg): helix radius; the straight top half-radial and
    bottom radial outside the corners; the corner's bend angle, the lean of its
    plane from the vertical, its drop and azimuth (where the helix starts); the
    helix's sweep, pitch angle and pitch per turn; the sharp-cornered loop."""

    name: str
    diameter_mm: float
    height_mm: float
    corner_radius_mm: float
    corner_start_mm: float  # corner's start from the axis, along the radial
    corner_angle_deg: float
    corner_lean_deg: float
    corner_drop_mm: float
    corner_azimuth_deg: float
    helix_sweep_deg: float
    pitch_angle_deg: float
    pitch_mm: float  # per full turn
    sharp: QfhLoop


def _corner(radius: float, rc: float, slope: float) -> tuple[float, float, float]:
    """(theta, beta, x0) of the corner joining a radial through the axis to a helix of
    `radius` about it, descending at `slope` (rad), for a corner radius `rc`
    (see the module docstring); fixed-point iteration, contraction about rc/radius."""
    theta, beta = math.pi / 2, slope
    for _ in range(200):
        py = rc * (1 - math.cos(theta)) * math.cos(beta)
        px = math.sqrt(max(radius * radius - py * py, 0.0))  # a corner too big for the
        # helix: kept finite here; problems() reports the radius as an error
        theta_new = math.atan2(px, -math.cos(beta) * py) if py > 0 else math.pi / 2
        s_theta = math.sin(theta_new)
        beta_new = (math.asin(max(-1.0, min(1.0, math.sin(slope) / s_theta))) if s_theta
                    else math.copysign(math.pi / 2, slope))
        done = abs(theta_new - theta) < 1e-15 and abs(beta_new - beta) < 1e-15
        theta, beta = theta_new, beta_new
        if done:
            break
    py = rc * (1 - math.cos(theta)) * math.cos(beta)
    px = math.sqrt(max(radius * radius - py * py, 0.0))
    return theta, beta, px - rc * math.sin(theta)


def loop_shape(name: str, diameter_mm: float, height_mm: float, turns: float,
               corner_radius_mm: float) -> LoopShape:
    """The solved corners and helix of one loop of helix diameter `diameter_mm` and
    height `height_mm` between its radials (mm), arms of `turns` turns."""
    radius = diameter_mm / 2
    rc = corner_radius_mm
    sweep_total = 2 * math.pi * turns
    slope = math.atan2(height_mm, radius * sweep_total)
    theta = beta = x0 = drop = az = sweep = 0.0
    for _ in range(200):
        theta, beta, x0 = _corner(radius, rc, slope)
        py = rc * (1 - math.cos(theta)) * math.cos(beta)
        px = math.sqrt(max(radius * radius - py * py, 0.0))  # a corner too big for the
        # helix: kept finite here; problems() reports the radius as an error
        az = math.atan2(py, px)
        drop = rc * (1 - math.cos(theta)) * math.sin(beta)
        sweep = sweep_total - 2 * az
        if sweep <= 0 or height_mm - 2 * drop <= 0:
            raise DesignError("the corners take the whole arm: use a smaller corner radius",
                              field="corner_radius", value=rc)
        new = math.atan2(height_mm - 2 * drop, radius * sweep)
        if abs(new - slope) < 1e-15:
            break
        slope = new
    return LoopShape(name, diameter_mm, height_mm, rc, x0, math.degrees(theta),
                     math.degrees(beta), drop, math.degrees(az), math.degrees(sweep),
                     math.degrees(slope), 2 * math.pi * radius * math.tan(slope),
                     qfh_loop(name, diameter_mm, height_mm, turns))


def _rotz(v: np.ndarray, deg: float) -> np.ndarray:
    c, s = math.cos(math.radians(deg)), math.sin(math.radians(deg))
    return np.array([c * v[0] - s * v[1], s * v[0] + c * v[1], v[2]])


def _signed_angle(a: np.ndarray, b: np.ndarray, axis: np.ndarray) -> float:
    """The angle (deg) turning `a` onto `b` about `axis` (right hand); a, b normal to it."""
    return math.degrees(math.atan2(float(np.dot(axis, np.cross(a, b))), float(np.dot(a, b))))


def _bend_to(path: BendPath, radius: float, angle_deg: float, final: np.ndarray) -> Bend:
    """A plane bend continuing `path` that ends heading along `final` (unit)."""
    _, t, n = path.end_frame()
    c = math.cos(math.radians(angle_deg))
    want = final - c * t
    want = want / float(np.linalg.norm(want))
    return Bend(radius, angle_deg, _signed_angle(n, want, t))


def _helix_from(path: BendPath, radius: float, sweep_deg: float, pitch_mm: float) -> Bend:
    """A helical bend continuing `path` about the z axis (the mast): its normal points at
    the axis; the pitch's sign is the one that keeps the helix's axis along z."""
    pos, t, n = path.end_frame()
    inward = np.array([-pos[0], -pos[1], 0.0])
    inward /= float(np.linalg.norm(inward))
    rot = _signed_angle(n, inward, t)
    best: Bend | None = None
    err = math.inf
    for sign in (1.0, -1.0):
        bend = Bend(radius, sweep_deg, rot, sign * pitch_mm)
        alpha = math.atan2(bend.pitch_mm, 2 * math.pi * radius)
        b = np.cross(t, inward)
        c0 = math.cos(alpha) * t - math.sin(alpha) * b
        if abs(float(c0[2])) < err:
            best, err = bend, abs(float(c0[2]))
    if best is None:  # pragma: no cover - two candidates always
        raise DesignError("no helix", field="pitch", value=pitch_mm)
    return best


def loop_path(shape: LoopShape, azimuth_deg: float, top_z_mm: float, gap_mm: float,
              handedness: Handedness, turns: float) -> BendPath:
    """One loop as a bend path from end A (the top half-radial at `azimuth_deg`, at the
    feed gap) round to end B (the other top half-radial, across the gap)."""
    sense = 1.0 if handedness == "right" else -1.0  # rises counter-clockwise when right
    out = _rotz(np.array([1.0, 0.0, 0.0]), azimuth_deg)
    origin = out * gap_mm / 2 + np.array([0.0, 0.0, top_z_mm])
    theta = shape.corner_angle_deg
    beta = math.radians(shape.corner_lean_deg)
    rc = shape.corner_radius_mm
    # the first corner: from the radial to the descending helix's tangent
    side = _rotz(np.array([0.0, 1.0, 0.0]), azimuth_deg) * (-sense)  # going down: clockwise
    first_n = side * math.cos(beta) - np.array([0.0, 0.0, 1.0]) * math.sin(beta)
    pieces: list[Piece] = [Straight(shape.corner_start_mm - gap_mm / 2), Bend(rc, theta)]

    def path() -> BendPath:
        return BendPath(tuple(pieces), origin=tuple(float(x) for x in origin),  # type: ignore
                        heading=tuple(float(x) for x in out),  # type: ignore[arg-type]
                        normal=tuple(float(x) for x in first_n))  # type: ignore[arg-type]

    bottom_az = azimuth_deg - sense * 360.0 * turns
    pieces.append(_helix_from(path(), shape.diameter_mm / 2, shape.helix_sweep_deg,
                              shape.pitch_mm))
    inward_bottom = -_rotz(np.array([1.0, 0.0, 0.0]), bottom_az)
    pieces.append(_bend_to(path(), rc, theta, inward_bottom))
    pieces.append(Straight(2 * shape.corner_start_mm))
    # the second arm is the first turned 180 degrees about the mast, run backwards
    _, t_end, _ = BendPath(tuple(pieces[:3]), origin=tuple(float(x) for x in origin),  # type: ignore
                           heading=tuple(float(x) for x in out),  # type: ignore[arg-type]
                           normal=tuple(float(x) for x in first_n)).end_frame()  # type: ignore
    up = -_rotz(t_end, 180.0)
    pieces.append(_bend_to(path(), rc, theta, up))
    pieces.append(_helix_from(path(), shape.diameter_mm / 2, shape.helix_sweep_deg,
                              shape.pitch_mm))
    pieces.append(_bend_to(path(), rc, theta, out))
    pieces.append(Straight(shape.corner_start_mm - gap_mm / 2))
    return dataclasses.replace(path(), gap_mm=gap_mm)


def _shapes(p: Params, d: float) -> tuple[LoopShape, LoopShape]:
    rc = corner_radius_of(p, d)
    return (loop_shape("large loop", p.large_diameter_mm, p.large_height_mm, p.turns, rc),
            loop_shape("small loop", p.small_diameter_mm, p.small_height_mm, p.turns, rc))


def loop_shapes(p: Params, d: float) -> tuple[LoopShape, LoopShape]:
    """The large and the small loop as built, for stock of diameter `d` (mm)."""
    return _shapes(p, d)


def geometry(p: Params, d: float) -> ElementGeometry:
    large, small = _shapes(p, d)
    a = loop_path(large, 0.0, 0.0, p.feed_gap_mm, p.handedness, p.turns)
    b = loop_path(small, small_azimuth_deg(p), -p.small_top_offset_mm, p.feed_gap_mm,
                  p.handedness, p.turns)
    return ElementGeometry((PieceGeometry("large loop", a), PieceGeometry("small loop", b)),
                           (Gap(End(0, "B"), End(0, "A"), p.feed_gap_mm, "feed"),
                            Gap(End(1, "B"), End(1, "A"), p.feed_gap_mm, "feed")))


def build(p: Params, d: float) -> BendPath:
    """The large loop alone (the element's geometry has both loops)."""
    return geometry(p, d).pieces[0].path


def qfh_design(p: Params, conductor_diameter_mm: float) -> QfhDesign:
    """The helix as the design method's record (sharp-cornered loops), for the mast."""
    large = qfh_loop("large", p.large_diameter_mm, p.large_height_mm, p.turns)
    small = qfh_loop("small", p.small_diameter_mm, p.small_height_mm, p.turns)
    f = p.frequency_hz
    lam = wavelength_mm(f) if f is not None else math.nan
    ratio = large.sharp_length_mm / small.sharp_length_mm
    return QfhDesign(frequency_hz=f or math.nan, wavelength_mm=lam, handedness=p.handedness,
                     turns=p.turns, diameter_to_height=p.large_diameter_mm / p.large_height_mm,
                     conductor_diameter_mm=conductor_diameter_mm,
                     loop_length_wl=p.loop_length_wl or math.nan, size_ratio=ratio,
                     large=large, small=small, basis=p.basis)


@dataclass(frozen=True)
class MastInputs:
    """What the mast's drilling pattern needs (mm, deg): the helix as the design method's
    record, the mast's outside diameter and length, the small loop's azimuth and how far
    its top radial lies below the large loop's, and the conductor's diameter."""

    design: QfhDesign
    mast_diameter_mm: float
    mast_length_mm: float | None
    small_azimuth_deg: float
    small_top_offset_mm: float
    conductor_diameter_mm: float


def mast_inputs(p: Params, d: float) -> MastInputs | None:
    """The mast's drilling inputs (None without a `mast_diameter`)."""
    if p.mast_diameter_mm is None:
        return None
    return MastInputs(qfh_design(p, d), p.mast_diameter_mm, p.mast_length_mm,
                      small_azimuth_deg(p), p.small_top_offset_mm, d)


def problems(p: Params, d: float) -> list[Finding]:
    out: list[Finding] = []
    rc = corner_radius_of(p, d)
    ratio = (qfh_loop("l", p.large_diameter_mm, p.large_height_mm, p.turns).sharp_length_mm
             / qfh_loop("s", p.small_diameter_mm, p.small_height_mm, p.turns).sharp_length_mm)
    if ratio <= 1.0:
        out.append(Finding("qfh-loops-not-different", "error",
                           f"the large loop is not larger than the small one (length ratio "
                           f"{ratio:.4f}): self-phasing needs the large loop longer (inductive) "
                           "and the small one shorter (capacitive); swap or resize them"))
    elif not RATIO_RANGE[0] <= ratio <= RATIO_RANGE[1]:
        out.append(Finding("qfh-loops-ratio", "warning",
                           f"the loops' length ratio {ratio:.4f} lies outside "
                           f"{RATIO_RANGE[0]:g}-{RATIO_RANGE[1]:g}, far from the self-phasing "
                           "design (the loops' currents will not be 90 degrees apart); check "
                           "the axial ratio in the electrical check"))
    dl, hl = p.large_diameter_mm, p.large_height_mm
    ds, hs = p.small_diameter_mm, p.small_height_mm
    if abs(dl / hl - ds / hs) > 0.02 * dl / hl:
        out.append(Finding("qfh-loops-proportion", "info",
                           f"the loops' diameter/height proportions differ (large {dl / hl:.3f}, "
                           f"small {ds / hs:.3f}); the design method scales one loop into the "
                           "other"))
    if p.feed_gap_mm >= min(p.large_diameter_mm, p.small_diameter_mm) / 4:
        out.append(Finding("gap-wider-than-side", "error",
                           f"feed gap {p.feed_gap_mm:.1f} mm is too wide for the loops: keep "
                           "it under a quarter of the smaller diameter"))
    if rc < d / 2 or rc > min(p.large_diameter_mm, p.small_diameter_mm) / 4:
        out.append(Finding("bend-radius-below-stock" if rc < d / 2 else "qfh-corner-radius",
                           "error", f"corner radius {rc:.1f} mm must lie between half the "
                           f"{d:.2f} mm stock and a quarter of the smaller loop's diameter"))
    mast = p.mast_diameter_mm
    if mast is not None:
        room = min(p.large_diameter_mm, p.small_diameter_mm) / 2 - rc
        if mast / 2 >= room - d:
            out.append(Finding("qfh-mast-too-thick", "error",
                               f"the {mast:.1f} mm mast leaves no straight radial between it and "
                               f"the corner bends (the corners start {room:.1f} mm from the "
                               "axis): use a thinner mast or a smaller corner radius"))
    return out


def governing(p: Params) -> tuple[str, float]:
    """The geometric mean of the two loops' sharp-cornered lengths (mm): scaling it keeps
    their ratio."""
    large = qfh_loop("l", p.large_diameter_mm, p.large_height_mm, p.turns).sharp_length_mm
    small = qfh_loop("s", p.small_diameter_mm, p.small_height_mm, p.turns).sharp_length_mm
    return "loop_length", math.sqrt(large * small)


def with_governing(p: Params, value: float) -> Params:
    k = value / governing(p)[1]
    return dataclasses.replace(
        p, large_diameter_mm=p.large_diameter_mm * k, large_height_mm=p.large_height_mm * k,
        small_diameter_mm=p.small_diameter_mm * k, small_height_mm=p.small_height_mm * k,
        loop_length_wl=None if p.loop_length_wl is None else p.loop_length_wl * k)


def tuned_keys(p: Params) -> dict[str, TunedValue]:
    out: dict[str, TunedValue] = {
        "large_diameter": ("length", p.large_diameter_mm),
        "large_height": ("length", p.large_height_mm),
        "small_diameter": ("length", p.small_diameter_mm),
        "small_height": ("length", p.small_height_mm)}
    if p.loop_length_wl is not None:
        out["loop_length_wl"] = ("number", p.loop_length_wl)
    return out


SPEC = ShapeSpec(NAME, SUMMARY, KEYS, read, build, problems, governing, with_governing,
                 tuned_keys, geometry=geometry)
