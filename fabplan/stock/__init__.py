"""Conductor stock: materials, cross-sections, gauges and a catalogue of common sizes."""

from .catalogue import CATALOGUE, StockItem, get_stock_item
from .materials import MATERIALS, Material, get_material
from .profiles import Profile, Round, Strip, Tube, awg_diameter_mm, parse_gauge, swg_diameter_mm

__all__ = ["CATALOGUE", "StockItem", "get_stock_item", "MATERIALS", "Material", "get_material",
           "Profile", "Round", "Strip", "Tube", "awg_diameter_mm", "parse_gauge",
           "swg_diameter_mm"]
