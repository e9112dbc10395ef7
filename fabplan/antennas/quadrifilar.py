"""Resonant quadrifilar helix: two bifilar loops, self-phased, and the mast drilling.

Each bifilar loop is a closed conductor: a top radial split at the axis for the
feed, a helical arm down, a bottom radial straight across the axis, a second
helical arm up. The two loops are mounted at right angles on one mast and fed in
parallel at the top. One loop is made larger than resonant (inductive at the
operating frequency) and the other smaller (capacitive), so that their currents
are 90 degrees apart without a phasing line: Kilgus's self-phasing
arrangement.

Units: mm, Hz, degrees where a name says `_deg`. Azimuths are measured
counter-clockwise seen from above the mast (from its top end), from a reference
line scribed along the mast; heights are measured down from the top radials.

Handedness: "right" is a right-handed screw: the conductor turns
counter-clockwise (seen from above) as it rises, so going down from the top its
azimuth decreases. Which circular polarisation a given winding radiates
depends also on the feed connection: fabplan's electrical model decides it.

SOURCES (tags as in trade-notes.md)
- The resonant quadrifilar helix and the self-phasing of two loops of different
  sizes: C. C. Kilgus, "Resonant quadrifilar helix", IEEE Trans. Antennas
  Propag. AP-17, 1969, pp. 349-351, and "Resonant quadrifilar helix design",
  Microwave Journal 13(12), 1970 [M: neither was readable in this session].
- The phasing condition, read in a builder's write-up (PA1ARE, "Quadrifilar Helix
  Antenna", pa1are.webklik.nl) [S]: the larger loop must be inductive with its
  reactance equal to its resistance (+45 degrees), the smaller capacitive with
  -45 degrees; in parallel on one source their currents are then 90 degrees
  apart. Modelling each loop near its resonance as a series RLC circuit,
  Z = R (1 + j Q (f/f0 - f0/f)) (any circuit-theory text [S]), gives the two
  resonances f/x and f x with x - 1/x = 1/Q, so the loops' sizes stand in the
  ratio x^2 and the pair presents Z = R at f (worked in the tests). Q is the
  loop's own; take it from the electrical model (Q = (f0 / 2R) dX/df).
- Height-to-diameter proportion: the same write-up gives 0.44 as the QFH's
  width-to-height ratio [S]; fabplan uses it as the default diameter/height.
- Mast layout (four top holes at one height, each loop's bottom radial through
  the mast at its own height, 900 and 1000 mm down in that build): a builder's
  write-up, lloydm.net "137 MHz Quadrifilar Helix" [S].
- Helix arm length sqrt(H^2 + (pi D N)^2) and the rounded-corner developed
  length L = sum of straights - 2 r sum tan(theta/2) + r sum theta (trade-notes.md,
  [P]; the corner between a radial and a helix is 90 degrees in space because
  a helix's tangent has no radial component).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

from ..errors import DesignError
from .common import require_positive, require_range, wavelength_mm

__all__ = ["Handedness", "SelfPhasing", "QfhLoop", "QfhDesign", "MastHole", "ArmMark",
           "MastDrilling", "DEFAULT_DIAMETER_TO_HEIGHT", "self_phasing", "quadrature_deg",
           "helix_arm_length_mm", "corner_gain_mm", "qfh_loop", "loop_for_length",
           "design_qfh", "arm_azimuth_deg", "radial_straight_mm", "mast_drilling"]

Handedness = Literal["right", "left"]
HANDEDNESS: tuple[Handedness, ...] = ("right", "left")
DEFAULT_DIAMETER_TO_HEIGHT = 0.44  # PA1ARE's write-up [S]
CORNER_ANGLE_RAD = math.pi / 2  # radial to helix: 90 degrees in space


@dataclass(frozen=True)
class SelfPhasing:
    """Kilgus self-phasing of two loops of unloaded Q `q_loop`.

    frequency_ratio x: the large loop resonates at f/x, the small at f x;
    size_ratio = x^2 (large : small, every dimension); the loops' impedance
    phases at f are +45 and -45 degrees and the pair in parallel presents R.
    """

    q_loop: float
    frequency_ratio: float
    size_ratio: float
    phase_large_deg: float
    phase_small_deg: float


def self_phasing(q_loop: float) -> SelfPhasing:
    """The loop resonances and size ratio that put the currents 90 degrees apart.

    Series-RLC model of each loop: Z = R (1 + j Q (f/f0 - f0/f)); the large loop
    needs Q (x - 1/x) = +1 with x = f/f0, the small the opposite (see SOURCES).
    """
    require_range("q_loop", q_loop, 1.0, 1000.0, "a resonant loop's Q")
    inv = 1.0 / q_loop
    x = (inv + math.sqrt(inv * inv + 4.0)) / 2.0
    big = q_loop * (x - 1 / x)
    small = q_loop * (1 / x - x)
    return SelfPhasing(q_loop=q_loop, frequency_ratio=x, size_ratio=x * x,
                       phase_large_deg=math.degrees(math.atan(big)),
                       phase_small_deg=math.degrees(math.atan(small)))


def quadrature_deg(z_large_ohm: complex, z_small_ohm: complex) -> float:
    """Phase (degrees) by which the small loop's current leads the large loop's.

    With both loops across one voltage, I = V / Z, so this is
    arg(Z_large) - arg(Z_small); self-phasing wants 90.
    """
    if z_large_ohm == 0 or z_small_ohm == 0:
        raise DesignError("a loop impedance of zero has no phase", field="z_ohm", value=0)
    d = math.degrees(math.atan2(z_large_ohm.imag, z_large_ohm.real)
                     - math.atan2(z_small_ohm.imag, z_small_ohm.real))
    return (d + 180.0) % 360.0 - 180.0


def helix_arm_length_mm(diameter_mm: float, height_mm: float, turns: float) -> float:
    """Centreline length (mm) of one helical arm: sqrt(H^2 + (pi D N)^2)."""
    require_positive("diameter_mm", diameter_mm)
    require_positive("height_mm", height_mm)
    require_positive("turns", turns)
    return math.hypot(height_mm, math.pi * diameter_mm * turns)


def corner_gain_mm(radius_mm: float, angle_rad: float = CORNER_ANGLE_RAD) -> float:
    """Length saved (mm) by rounding one corner: 2 r tan(theta/2) - r theta."""
    if radius_mm < 0 or not math.isfinite(radius_mm):
        raise DesignError("must be zero or more", field="corner_radius_mm", value=radius_mm)
    return 2 * radius_mm * math.tan(angle_rad / 2) - radius_mm * angle_rad


@dataclass(frozen=True)
class QfhLoop:
    """One bifilar loop's dimensions (mm, centreline).

    radial_mm: one radial across the axis (= diameter_mm); helix_arm_mm: one
    helical arm, sharp corners; sharp_length_mm: 2 radials + 2 arms;
    developed_length_mm: the conductor's length with four 90-degree corners of
    centreline radius `corner_radius_mm` and the feed gap taken out; pitch_angle_deg:
    the arm's slope from the horizontal; twist_deg: the azimuth turned by one arm.
    """

    name: str
    diameter_mm: float
    height_mm: float
    turns: float
    radial_mm: float
    helix_arm_mm: float
    sharp_length_mm: float
    corner_radius_mm: float
    feed_gap_mm: float
    developed_length_mm: float
    pitch_angle_deg: float
    twist_deg: float


def qfh_loop(name: str, diameter_mm: float, height_mm: float, turns: float,
             corner_radius_mm: float = 0.0, feed_gap_mm: float = 0.0) -> QfhLoop:
    """A loop of helix diameter `diameter_mm` and height `height_mm` (radial centrelines).

    turns: each arm's turns (0.5 = half turn); corner_radius_mm: centreline bend
    radius at the four radial-to-helix corners; feed_gap_mm: the gap in the top
    radial at the axis.
    """
    arm = helix_arm_length_mm(diameter_mm, height_mm, turns)
    if corner_radius_mm < 0 or corner_radius_mm > diameter_mm / 4:
        raise DesignError("the corner radius must lie between zero and a quarter of the "
                          "helix diameter (the bend must fit on the radial)",
                          field="corner_radius_mm", value=corner_radius_mm)
    if feed_gap_mm < 0 or feed_gap_mm > diameter_mm / 4:
        raise DesignError("the feed gap must lie between zero and a quarter of the helix "
                          "diameter", field="feed_gap_mm", value=feed_gap_mm)
    sharp = 2 * diameter_mm + 2 * arm
    developed = sharp - 4 * corner_gain_mm(corner_radius_mm) - feed_gap_mm
    return QfhLoop(name=name, diameter_mm=diameter_mm, height_mm=height_mm, turns=turns,
                   radial_mm=diameter_mm, helix_arm_mm=arm, sharp_length_mm=sharp,
                   corner_radius_mm=corner_radius_mm, feed_gap_mm=feed_gap_mm,
                   developed_length_mm=developed,
                   pitch_angle_deg=math.degrees(math.atan2(height_mm,
                                                           math.pi * diameter_mm * turns)),
                   twist_deg=360.0 * turns)


def loop_for_length(name: str, developed_length_mm: float, diameter_to_height: float,
                    turns: float, corner_radius_mm: float = 0.0,
                    feed_gap_mm: float = 0.0) -> QfhLoop:
    """The loop of proportion D/H = `diameter_to_height` whose developed length is given.

    Solves 2D + 2 sqrt((D/ratio)^2 + (pi D N)^2) = developed + corner gains + gap.
    """
    require_positive("developed_length_mm", developed_length_mm)
    require_range("diameter_to_height", diameter_to_height, 0.05, 5.0,
                  "a helix between very slender and very squat")
    require_positive("turns", turns)
    sharp = developed_length_mm + 4 * corner_gain_mm(corner_radius_mm) + feed_gap_mm
    per_d = 2 + 2 * math.sqrt(1 / diameter_to_height ** 2 + (math.pi * turns) ** 2)
    d = sharp / per_d
    return qfh_loop(name, d, d / diameter_to_height, turns, corner_radius_mm, feed_gap_mm)


@dataclass(frozen=True)
class QfhDesign:
    """Starting dimensions of a self-phased quadrifilar helix at `frequency_hz`.

    loop_length_wl: the developed length, in wavelengths, of a loop resonant at
    `frequency_hz` (the geometric mean of the two loops); size_ratio: large :
    small; `large` and `small` the loops; `basis` says where each figure came from.
    """

    frequency_hz: float
    wavelength_mm: float
    handedness: Handedness
    turns: float
    diameter_to_height: float
    conductor_diameter_mm: float
    loop_length_wl: float
    size_ratio: float
    large: QfhLoop
    small: QfhLoop
    basis: str


def design_qfh(frequency_hz: float, *, conductor_diameter_mm: float,
               size_ratio: float | None = None, q_loop: float | None = None,
               loop_length_wl: float = 1.0, corner_radius_mm: float = 0.0,
               diameter_to_height: float = DEFAULT_DIAMETER_TO_HEIGHT, turns: float = 0.5,
               handedness: Handedness = "right", feed_gap_mm: float = 0.0) -> QfhDesign:
    """Both loops of a self-phased quadrifilar helix for `frequency_hz`.

    Give the size ratio directly (`size_ratio`, large : small, > 1) or the loops'
    unloaded Q (`q_loop`, from the electrical model) to derive it with
    `self_phasing`. `loop_length_wl` (default 1.0: full-wave loops, Kilgus's
    resonant loop [M]) is the developed length of a loop resonant at the
    frequency; a thick conductor resonates shorter, so tune it with the
    electrical model. The loops keep the same diameter/height proportion.
    """
    lam = wavelength_mm(frequency_hz)
    require_positive("conductor_diameter_mm", conductor_diameter_mm)
    require_range("loop_length_wl", loop_length_wl, 0.4, 2.2,
                  "fractional-turn resonant loops of a half to two wavelengths")
    require_range("turns", turns, 0.25, 4.0, "fractional- and few-turn resonant helices")
    if handedness not in HANDEDNESS:
        raise DesignError("handedness is 'right' or 'left'", field="handedness", value=handedness)
    if (size_ratio is None) == (q_loop is None):
        raise DesignError("give the loops' size ratio or their Q (one of the two)",
                          field="size_ratio", value=size_ratio)
    if q_loop is not None:
        ratio = self_phasing(q_loop).size_ratio
        how = f"size ratio {ratio:.4f} from the loops' Q {q_loop:g} (self-phasing, series RLC)"
    else:
        ratio = float(size_ratio)  # type: ignore[arg-type]
        require_range("size_ratio", ratio, 1.0001, 1.5,
                      "the large loop must be larger, by tens of percent at most")
        how = f"size ratio {ratio:.4f} given"
    if corner_radius_mm and corner_radius_mm < conductor_diameter_mm / 2:
        raise DesignError("a bend's centreline radius cannot be under the conductor's radius",
                          field="corner_radius_mm", value=corner_radius_mm)
    mean = loop_length_wl * lam
    root = math.sqrt(ratio)
    large = loop_for_length("large", mean * root, diameter_to_height, turns,
                            corner_radius_mm, feed_gap_mm)
    small = loop_for_length("small", mean / root, diameter_to_height, turns,
                            corner_radius_mm, feed_gap_mm)
    basis = ("Kilgus self-phasing [M]; " + how + f"; loop length {loop_length_wl:g} "
             f"wavelength (geometric mean of the loops); D/H {diameter_to_height:g}")
    return QfhDesign(frequency_hz=frequency_hz, wavelength_mm=lam, handedness=handedness,
                     turns=turns, diameter_to_height=diameter_to_height,
                     conductor_diameter_mm=conductor_diameter_mm, loop_length_wl=loop_length_wl,
                     size_ratio=ratio, large=large, small=small, basis=basis)


def radial_straight_mm(loop: QfhLoop, mast_diameter_mm: float) -> float:
    """Straight length (mm) of one half-radial outside the mast, up to where its corner bend starts.

    D/2 - r - mast/2: from the mast's surface to the bend's tangent point, along
    the centreline (add what goes inside the mast or into a fitting yourself).
    """
    require_positive("mast_diameter_mm", mast_diameter_mm)
    straight = loop.diameter_mm / 2 - loop.corner_radius_mm - mast_diameter_mm / 2
    if straight <= 0:
        raise DesignError("no straight radial is left between the mast and the corner bend: "
                          "use a thinner mast or a smaller corner radius",
                          field="mast_diameter_mm", value=mast_diameter_mm)
    return straight


def arm_azimuth_deg(top_azimuth_deg: float, depth_fraction: float, turns: float,
                    handedness: Handedness) -> float:
    """Azimuth (degrees, 0..360) of an arm `depth_fraction` of the way down from the top.

    A right-handed arm's azimuth decreases going down (it rises counter-clockwise).
    """
    require_range("depth_fraction", depth_fraction, 0.0, 1.0, "along the arm")
    if handedness not in HANDEDNESS:
        raise DesignError("handedness is 'right' or 'left'", field="handedness", value=handedness)
    sense = -1.0 if handedness == "right" else 1.0
    return (top_azimuth_deg + sense * 360.0 * turns * depth_fraction) % 360.0


@dataclass(frozen=True)
class MastHole:
    """One hole in the mast (mm, degrees).

    from_top_mm: the hole centre's distance below the top radials' datum;
    azimuth_deg: counter-clockwise seen from above, from the reference line;
    arc_mm: the same angle as a distance round the mast's surface;
    through: True when the radial passes through the mast (a bottom radial);
    the top half-radials end inside the mast at the feed.
    """

    loop: str
    end: Literal["top", "bottom"]
    from_top_mm: float
    azimuth_deg: float
    arc_mm: float
    through: bool


@dataclass(frozen=True)
class ArmMark:
    """Where an arm passes a height (a spacer or check mark): loop, arm (0 or 1), mm, degrees."""

    loop: str
    arm: int
    from_top_mm: float
    azimuth_deg: float
    arc_mm: float


@dataclass(frozen=True)
class MastDrilling:
    """Holes (sorted by height, then azimuth) and mid-height arm marks for a mast."""

    mast_diameter_mm: float
    circumference_mm: float
    holes: tuple[MastHole, ...]
    marks: tuple[ArmMark, ...]


def mast_drilling(design: QfhDesign, mast_diameter_mm: float, *,
                  top_azimuth_deg: float = 0.0, small_top_offset_mm: float = 0.0,
                  marks_per_arm: int = 1, small_turn_deg: float = 90.0) -> MastDrilling:
    """The mast's holes and arm marks for `design`.

    The large loop's top radial lies at `top_azimuth_deg` and +180, the small
    loop's `small_turn_deg` on (90 or -90; their top radials at the datum, the small
    loop's `small_top_offset_mm` lower if the feed needs room); each bottom radial
    passes through the mast at its loop's height, turned by the arm's twist.
    `marks_per_arm` marks evenly spaced down each arm (1: at mid-height, where
    handedness shows: a right-handed half-turn arm is 90 degrees clockwise of its
    top there).
    """
    require_positive("mast_diameter_mm", mast_diameter_mm)
    smallest = min(design.large.diameter_mm, design.small.diameter_mm)
    if mast_diameter_mm >= smallest - 2 * design.conductor_diameter_mm:
        raise DesignError("the mast must be thinner than the smaller loop's diameter less two "
                          "conductor diameters", field="mast_diameter_mm", value=mast_diameter_mm)
    if small_top_offset_mm < 0 or small_top_offset_mm > design.small.height_mm / 4:
        raise DesignError("the small loop's top offset must lie between zero and a quarter of "
                          "its height", field="small_top_offset_mm", value=small_top_offset_mm)
    if marks_per_arm < 0 or marks_per_arm > 16:
        raise DesignError("between 0 and 16 marks per arm", field="marks_per_arm",
                          value=marks_per_arm)
    if small_turn_deg not in (90.0, -90.0):
        raise DesignError("the small loop lies 90 degrees either way from the large",
                          field="small_turn_deg", value=small_turn_deg)
    radius = mast_diameter_mm / 2

    def arc(az: float) -> float:
        return math.radians(az) * radius

    holes: list[MastHole] = []
    marks: list[ArmMark] = []
    for loop, az0, z0 in ((design.large, top_azimuth_deg % 360.0, 0.0),
                          (design.small, (top_azimuth_deg + small_turn_deg) % 360.0,
                           small_top_offset_mm)):
        for arm, start in enumerate((az0, (az0 + 180.0) % 360.0)):
            holes.append(MastHole(loop.name, "top", z0, start, arc(start), False))
            for i in range(1, marks_per_arm + 1):
                frac = i / (marks_per_arm + 1)
                az = arm_azimuth_deg(start, frac, loop.turns, design.handedness)
                marks.append(ArmMark(loop.name, arm, z0 + frac * loop.height_mm, az, arc(az)))
        bottom = arm_azimuth_deg(az0, 1.0, loop.turns, design.handedness)
        for az in sorted((bottom, (bottom + 180.0) % 360.0)):
            holes.append(MastHole(loop.name, "bottom", z0 + loop.height_mm, az, arc(az), True))
    holes.sort(key=lambda h: (h.from_top_mm, h.azimuth_deg, h.loop))
    marks.sort(key=lambda m: (m.from_top_mm, m.azimuth_deg, m.loop))
    return MastDrilling(mast_diameter_mm=mast_diameter_mm,
                        circumference_mm=math.pi * mast_diameter_mm,
                        holes=tuple(holes), marks=tuple(marks))
