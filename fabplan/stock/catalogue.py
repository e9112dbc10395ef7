"""Common conductor stock by a short name, each row with its source.

`CATALOGUE[name]` gives the profile, the usual material and temper, and where
the dimensions come from. A design picks one with `[stock] catalogue = "..."`
and may still name another material.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..errors import DesignError, did_you_mean
from ..units import IN
from .profiles import Profile, Round, Tube, awg_diameter_mm

__all__ = ["StockItem", "CATALOGUE", "get_stock_item"]


@dataclass(frozen=True)
class StockItem:
    key: str
    description: str
    profile: Profile
    material: str
    source: str


def _tube(key: str, desc: str, od_in: float, wall_in: float, material: str,
          source: str) -> StockItem:
    return StockItem(key, desc, Tube(od_in * IN, wall_in * IN), material, source)


_B280 = "ASTM B280, table of standard ACR tube sizes"
_B88 = "ASTM B88, table of water tube dimensions [M]"
_EN = "EN 1057, table of preferred sizes [M]"
_ALT = "common drawn aluminium tube sizes (0.058 in wall telescoping series) [P]"
_B258 = "ASTM B258 (AWG diameter formula)"
_ROD = "common aluminium round rod sizes (fractional inch) [P]"

_ITEMS = [
    _tube("acr-1/4", "ACR copper tube 1/4 x 0.030 in", 0.250, 0.030, "cu-c12200-annealed", _B280),
    _tube("acr-5/16", "ACR copper tube 5/16 x 0.032 in", 0.3125, 0.032, "cu-c12200-annealed",
          _B280),
    _tube("acr-3/8", "ACR copper tube 3/8 x 0.032 in", 0.375, 0.032, "cu-c12200-annealed", _B280),
    _tube("acr-1/2", "ACR copper tube 1/2 x 0.032 in", 0.500, 0.032, "cu-c12200-annealed", _B280),
    _tube("water-k-1/2", "copper water tube type K, 1/2 nominal (0.625 OD x 0.049)", 0.625, 0.049,
          "cu-c12200-drawn", _B88),
    _tube("water-l-1/2", "copper water tube type L, 1/2 nominal (0.625 OD x 0.040)", 0.625, 0.040,
          "cu-c12200-drawn", _B88),
    _tube("water-m-1/2", "copper water tube type M, 1/2 nominal (0.625 OD x 0.028)", 0.625, 0.028,
          "cu-c12200-drawn", _B88),
    _tube("water-k-3/4", "copper water tube type K, 3/4 nominal (0.875 OD x 0.065)", 0.875, 0.065,
          "cu-c12200-drawn", _B88),
    _tube("water-l-3/4", "copper water tube type L, 3/4 nominal (0.875 OD x 0.045)", 0.875, 0.045,
          "cu-c12200-drawn", _B88),
    _tube("water-m-3/4", "copper water tube type M, 3/4 nominal (0.875 OD x 0.032)", 0.875, 0.032,
          "cu-c12200-drawn", _B88),
    *[StockItem(f"cu-{od}x1", f"metric copper tube {od} x 1 mm", Tube(float(od), 1.0),
                "cu-c12200-annealed" if od <= 10 else "cu-c12200-drawn", _EN)
      for od in (6, 8, 10, 12, 15)],
    _tube("al-3/8x0.035", "aluminium drawn tube 3/8 x 0.035 in", 0.375, 0.035, "al-6063-t832",
          _ALT),
    _tube("al-1/2x0.058", "aluminium drawn tube 1/2 x 0.058 in", 0.500, 0.058, "al-6063-t832",
          _ALT),
    _tube("al-5/8x0.058", "aluminium drawn tube 5/8 x 0.058 in", 0.625, 0.058, "al-6063-t832",
          _ALT),
    _tube("al-3/4x0.058", "aluminium drawn tube 3/4 x 0.058 in", 0.750, 0.058, "al-6063-t832",
          _ALT),
    *[_tube(f"al-{name}x0.058", f"aluminium drawn tube {name} x 0.058 in", od, 0.058,
            "al-6063-t832", _ALT)
      for name, od in (("7/8", 0.875), ("1", 1.0), ("1-1/8", 1.125), ("1-1/4", 1.25))],
    *[StockItem(f"al-rod-{name}", f"aluminium round rod {name} in", Round(d * IN), "al-6061-t6",
                _ROD) for name, d in (("3/16", 0.1875), ("1/4", 0.25), ("5/16", 0.3125),
                                      ("3/8", 0.375))],
    *[StockItem(f"awg-{n}", f"solid copper wire AWG {n}", Round(awg_diameter_mm(n)),
                "cu-c11000-annealed", _B258) for n in range(4, 15)],
]

CATALOGUE: dict[str, StockItem] = {item.key: item for item in _ITEMS}


def get_stock_item(key: str, field: str = "stock.catalogue") -> StockItem:
    try:
        return CATALOGUE[key]
    except KeyError:
        raise DesignError(f"not in the stock catalogue; {_suggestion(key)}run `fabplan stock` "
                          "for the list", field=field, value=key) from None


def _suggestion(key: str) -> str:
    """The nearest catalogue key in the same family first (the part before the first
    hyphen: "al", "acr", "awg"; a key the typed one begins, "al-1/2" for
    "al-1/2x0.058", before any other), then among all keys."""
    family = key.split("-", 1)[0].lower()
    same = [k for k in CATALOGUE if k.split("-", 1)[0].lower() == family]
    starts = sorted(k for k in same if k.lower().startswith(key.lower()))
    if starts:
        return f"did you mean {starts[0]!r}? "
    return did_you_mean(key, same, 0.5) or did_you_mean(key, CATALOGUE, 0.5)
