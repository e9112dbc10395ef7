"""Can the bend be made? Minimum radius, strain, wall thinning, kink risk.

Each rule says where it comes from. All radii are centreline radii (mm) of the
bend as it is formed (held on the former or in the tool's die), since that is
the radius the metal sees. The findings' messages speak in the builder's terms
(the finished centreline radius the shape gives, and one radius that clears
every rule). Findings carry stable codes:

    bend-too-tight          error    below the minimum radius for material/temper/profile
    bend-tight              warning  inside the rule's range: test-bend first
    outer-strain-exceeds-elongation  warning  outer fibre strain above the elongation at break
    outer-strain-high       info     outer fibre strain above 3/4 of the elongation
    mandrel-needed          warning  tube bend tighter than 1.5 D of bend
    kink-risk               warning  thin-wall tube (wall factor >= 15) tighter than 3 D
    wall-thins              warning  outside wall thins by more than 20 % (upper bound)

To add a material's rule, add a row to `TUBE_RULES`, `ROUND_RULES` or
`STRIP_RULES` (or a table like `CTH_MIN_RADIUS_IN` with its own lookup) naming
its source and tag: [S] a published source, [M] from memory of the named
source, [P] common practice.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable, Mapping
from dataclasses import dataclass
from functools import lru_cache

from ..errors import Finding
from ..stock.materials import Material
from ..stock.profiles import Profile, Round, Tube
from ..units import IN
from .records import BendLimits

__all__ = ["RadiusRule", "minimum_radius", "bend_limits", "limit_findings", "bend_list",
           "CTH_MIN_RADIUS_IN", "TUBE_RULES", "ROUND_RULES", "STRIP_RULES",
           "wall_outside", "wall_inside"]


@dataclass(frozen=True)
class RadiusRule:
    """Smallest centreline radius (mm): below `error_mm` an error, below
    `warn_mm` a warning; `basis` names the source."""

    error_mm: float
    warn_mm: float
    basis: str


_CTH = "Copper Tube Handbook (CDA), table of minimum bend radii on mechanical benders [S]"

# Copper tube by outside diameter (in): (annealed, drawn) minimum bend radius (in);
# None where the table gives no figure for that temper.
CTH_MIN_RADIUS_IN: dict[float, tuple[float | None, float | None]] = {
    0.375: (0.75, None),   # 1/4 nominal
    0.500: (1.50, 1.75),   # 3/8 nominal
    0.625: (2.25, 2.50),   # 1/2 nominal
    0.875: (3.00, 3.00),   # 3/4 nominal
    1.125: (4.00, None),   # 1 nominal
}

# (family, temper) -> (error, warning) centreline radius in outside diameters, source.
# [P]: common practice, no single source; ranges from trade-notes.md.
TUBE_RULES: dict[tuple[str, str], tuple[float, float, str]] = {
    ("aluminium", "annealed"): (1.5, 2.0, "1100-O/3003-O tube bends easily at 1.5-2 D [P]"),
    ("aluminium", "half-hard"): (2.0, 3.0, "6063-T5 tube, 2-3 D [P]"),
    ("aluminium", "hard"): (3.0, 4.0, "hard aluminium tube (6061-T6, drawn 6063) cracks "
                            "below about 3-4 D [P]"),
    ("brass", "annealed"): (1.5, 2.0, "annealed brass tube, 1.5-2 D [P]"),
    ("brass", "half-hard"): (2.5, 3.5, "half-hard brass tube, 2.5-3.5 D [P]"),
    ("stainless", "annealed"): (1.5, 2.0, "annealed 304 tube, 1.5-2 D [P]"),
}
ROUND_RULES: dict[tuple[str, str], tuple[float, float, str]] = {
    ("copper", "annealed"): (1.5, 1.5, "annealed copper wire: inside radius >= 1 d [P]"),
    ("copper", "hard"): (2.5, 3.5, "hard-drawn copper wire: inside radius >= 2-3 d [P]"),
    ("aluminium", "annealed"): (1.0, 1.5, "soft aluminium rod: inside radius >= 0.5-1 d [P]"),
    ("aluminium", "half-hard"): (1.5, 2.5, "6063 rod: inside radius >= 1-2 d [P]"),
    ("aluminium", "hard"): (3.0, 5.5, "6061-T6 rod: inside radius >= 2.5-5 d [P]"),
    ("brass", "annealed"): (1.5, 1.5, "annealed brass wire: inside radius >= 1 d [P]"),
    ("brass", "half-hard"): (2.0, 3.0, "half-hard brass wire: inside radius >= 1.5-2.5 d [P]"),
    ("stainless", "annealed"): (1.5, 2.0, "annealed 304 wire: inside radius >= 1-1.5 d [P]"),
    ("copper-clad-steel", "hard"): (3.5, 3.5, "copper-clad steel: inside radius >= 3 d or the "
                                    "cladding can crack [P]"),
}
# strip bent flat: centreline radius in thicknesses
STRIP_RULES: dict[str, tuple[float, float, str]] = {
    "annealed": (1.0, 1.0, "annealed strip: inside radius >= 0.5 t [P]"),
    "half-hard": (1.5, 2.0, "half-hard strip: inside radius >= 1-1.5 t [P]"),
    "hard": (2.5, 3.0, "hard strip: inside radius >= 2-2.5 t [P]"),
}


def _cth_rule(od_mm: float, annealed: bool) -> RadiusRule:
    """Copper tube: the table's figure, or its radius/OD ratio scaled from the
    nearest tabulated sizes (interpolated between them) for other sizes."""
    col = 0 if annealed else 1
    temper = "annealed" if annealed else "drawn"
    od_in = od_mm / IN
    rows = sorted((od, r) for od, v in CTH_MIN_RADIUS_IN.items()
                  if (r := v[col]) is not None)
    for od, r in rows:
        if abs(od - od_in) < 0.005:
            mm = r * IN
            return RadiusRule(mm, mm, f"{_CTH}: {od:g} in OD {temper}, {r:g} in")
    ratios = [(od, r / od) for od, r in rows]
    if od_in <= ratios[0][0]:
        ratio, near = ratios[0][1], f"{ratios[0][0]:g} in"
    elif od_in >= ratios[-1][0]:
        ratio, near = ratios[-1][1], f"{ratios[-1][0]:g} in"
    else:
        for (o1, q1), (o2, q2) in zip(ratios, ratios[1:]):
            if o1 <= od_in <= o2:
                ratio = q1 + (q2 - q1) * (od_in - o1) / (o2 - o1)
                near = f"{o1:g} and {o2:g} in"
                break
    mm = ratio * od_mm
    return RadiusRule(mm, mm, f"{_CTH}: {temper}, {ratio:.2f} x OD scaled from the {near} "
                      "OD rows (this size is not in the table)")


@lru_cache(maxsize=64)
def minimum_radius(material: Material, profile: Profile) -> RadiusRule:
    """The minimum centreline radius rule (mm) for this stock."""
    fam, temper = material.family, material.temper
    if isinstance(profile, Tube):
        if fam == "copper":
            return _cth_rule(profile.od_mm, temper == "annealed")
        e, w, basis = TUBE_RULES.get((fam, temper), (2.0, 3.0, "no rule for this material: "
                                                     "2-3 D assumed [P]"))
        return RadiusRule(e * profile.od_mm, w * profile.od_mm, basis)
    if isinstance(profile, Round):
        e, w, basis = ROUND_RULES.get((fam, temper), (2.0, 3.0, "no rule for this material: "
                                                      "2-3 d assumed [P]"))
        return RadiusRule(e * profile.diameter_mm, w * profile.diameter_mm, basis)
    e, w, basis = STRIP_RULES[temper]
    return RadiusRule(e * profile.thickness_mm, w * profile.thickness_mm, basis)


def wall_outside(wall_mm: float, radius_mm: float, od_mm: float) -> float:
    """Wall at the outside of a tube bend, upper bound of thinning: t 2R/(2R + D) (mm)."""
    return wall_mm * 2 * radius_mm / (2 * radius_mm + od_mm)


def wall_inside(wall_mm: float, radius_mm: float, od_mm: float) -> float:
    """Wall at the inside of a tube bend, upper bound of thickening: t 2R/(2R - D) (mm)."""
    return wall_mm * 2 * radius_mm / (2 * radius_mm - od_mm)


def bend_limits(index: int, held_radius_mm: float, material: Material,
                profile: Profile) -> BendLimits:
    """The feasibility figures of one bend formed at `held_radius_mm` (centreline, mm)."""
    depth = profile.depth_mm
    rule = minimum_radius(material, profile)
    strain = depth / (2 * held_radius_mm)
    wf = wo = wi = None
    if isinstance(profile, Tube):
        wf = profile.od_mm / profile.wall_mm
        wo = wall_outside(profile.wall_mm, held_radius_mm, profile.od_mm)
        wi = wall_inside(profile.wall_mm, held_radius_mm, profile.od_mm) \
            if 2 * held_radius_mm > profile.od_mm else None
    return BendLimits(index, held_radius_mm / depth, wf, strain, material.elongation, wo, wi,
                      rule.error_mm, rule.basis)


def _remedy(material: Material, profile: Profile) -> str:
    """What usually lets a tighter bend be made."""
    tips = []
    if material.temper != "annealed":
        if material.family == "aluminium":
            tips.append("use the O or T4 temper (a T6 part cannot simply be annealed and keep "
                        "its strength)")
        else:
            tips.append("anneal the bend zone (copper and brass: heat to a dull red and let "
                        "cool)")
    if isinstance(profile, Tube):
        tips.append("support the wall with a bending spring, packed dry sand or a mandrel "
                    "bender")
    return "; ".join(tips)


def bend_list(indices: Iterable[int]) -> str:
    """'bend 3' or 'bends 1, 2'."""
    ids = [str(i) for i in indices]
    return ("bend " if len(ids) == 1 else "bends ") + ", ".join(ids)


def _bends(items: list[BendLimits]) -> str:
    return bend_list(x.index for x in items)


def limit_findings(limits: list[BendLimits], material: Material, profile: Profile,
                   element: str, finished_for_held: Callable[[float], float] | None = None,
                   design_radius_mm: Mapping[int, float] | None = None) -> list[Finding]:
    """Findings for the bends of one element, one per code, naming the bends.

    The rules bound the radius the metal sees while it is held (on the former
    or in the tool); the messages speak in the builder's terms instead: the
    finished centreline radius the shape gives (`design_radius_mm`, by bend
    index; without it, the held radius released by `finished_for_held`) and
    one recommendation, the same in every finding: the smallest finished
    centreline radius that clears every radius rule that fired.
    `finished_for_held(held_mm)` is the finished centreline radius a bend held
    at `held_mm` springs back to (the identity without it)."""
    out: list[Finding] = []
    rule = minimum_radius(material, profile)
    release = finished_for_held or (lambda held_mm: held_mm)
    remedy = _remedy(material, profile)
    what = f"{material.name}, {profile.describe()}"
    depth = profile.depth_mm

    def held(x: BendLimits) -> float:
        return x.d_of_bend * depth

    def given(x: BendLimits) -> float:
        if design_radius_mm is not None and x.index in design_radius_mm:
            return design_radius_mm[x.index]
        return release(held(x))

    def radius_text(group: list[BendLimits]) -> str:
        """`the 40.0 mm centreline radius` (or the range, when the bends differ)."""
        radii = sorted({round(given(x), 1) for x in group})
        if len(radii) == 1:
            return f"the {radii[0]:.1f} mm centreline radius"
        return f"centreline radii of {radii[0]:.1f} to {radii[-1]:.1f} mm"

    tight = [x for x in limits if held(x) < rule.error_mm - 1e-9]
    near = [x for x in limits if x not in tight and held(x) < rule.warn_mm - 1e-9]
    over = [x for x in limits if x.outer_strain > x.elongation]
    high = [x for x in limits if x not in over and x.outer_strain > 0.75 * x.elongation]
    tube = isinstance(profile, Tube)
    od = profile.od_mm if isinstance(profile, Tube) else depth
    # mandrel and kink guidance: tooling makers' rules of thumb [P]
    mand = [x for x in limits if tube and x.d_of_bend < 1.5]
    kink = [x for x in limits if tube and x not in mand and x.wall_factor is not None
            and x.wall_factor >= 15 and x.d_of_bend < 3]
    # the held radius each fired rule needs; the one recommendation clears them all
    needs = []
    if tight or near:
        needs.append(rule.warn_mm)  # past the error bound the warning would still stand
    if over:
        needs.append(depth / (2 * min(x.elongation for x in over)))
    if mand:
        needs.append(1.5 * od)
    if kink:
        needs.append(3.0 * od)
    advice = ""
    if needs:
        advice = (f"; use a centreline radius of at least {release(max(needs)):.1f} mm to "
                  "clear every radius limit for this stock")
    if tight:
        out.append(Finding(
            "bend-too-tight", "error",
            f"{_bends(tight)}: {radius_text(tight)} is tighter than {what} allows: the "
            f"smallest is {release(rule.error_mm):.1f} mm ({rule.basis})" + advice
            + (f", or {remedy}" if remedy else ""), element))
    if near:
        out.append(Finding(
            "bend-tight", "warning",
            f"{_bends(near)}: {radius_text(near)} is at the tight end of the usual range for "
            f"{what}, under {release(rule.warn_mm):.1f} mm ({rule.basis}); make a test bend "
            "first" + advice, element))
    if over:
        worst = max(over, key=lambda x: x.outer_strain)
        out.append(Finding(
            "outer-strain-exceeds-elongation", "warning",
            f"{_bends(over)}: at {radius_text(over)} the outer fibre stretches "
            f"{100 * worst.outer_strain:.0f} % while bent, more than the "
            f"{100 * worst.elongation:.0f} % elongation at break of {material.name}: the outside "
            "may crack (a bend spreads the strain, so it often survives a little more than the "
            "tensile elongation; make a test bend, or use a softer temper)" + advice, element))
    if high:
        worst = max(high, key=lambda x: x.outer_strain)
        out.append(Finding(
            "outer-strain-high", "info",
            f"{_bends(high)}: at {radius_text(high)} the outer fibre stretches "
            f"{100 * worst.outer_strain:.0f} % while bent, near the "
            f"{100 * worst.elongation:.0f} % elongation of {material.name}; expect surface "
            "cracking; use a larger radius or a softer temper" + advice, element))
    if mand:
        out.append(Finding(
            "mandrel-needed", "warning",
            f"{_bends(mand)}: {radius_text(mand)} is tighter than 1.5 D of bend: a tube this "
            "tight usually needs a mandrel bender (or a bending spring or sand fill for soft "
            "copper)" + advice, element))
    if kink:
        out.append(Finding(
            "kink-risk", "warning",
            f"{_bends(kink)}: thin wall (wall factor {kink[0].wall_factor:.0f}) at "
            f"{radius_text(kink)}, under 3 D of bend while bent: the tube may flatten or kink; "
            "support it with a bending spring or packed dry sand, use a mandrel or a heavier "
            "wall" + advice, element))
    if isinstance(profile, Tube):
        thin = [x for x in limits if x.wall_outside_mm is not None
                and x.wall_outside_mm < 0.8 * profile.wall_mm]
        if thin:
            worst = min(thin, key=lambda x: x.wall_outside_mm or 0.0)
            out.append(Finding(
                "wall-thins", "warning",
                f"{_bends(thin)}: the outside wall may thin from {profile.wall_mm:.2f} mm to "
                f"{worst.wall_outside_mm:.2f} mm (upper bound t 2R/(2R + D)); use a larger "
                "radius or a heavier wall if the tube must hold pressure or take load",
                element))
    return out
