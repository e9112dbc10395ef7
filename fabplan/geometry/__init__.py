"""Bend paths and the shape templates that make them."""

from .path import Arc3, Bend, BendPath, BendSpan, Line3, Straight, neutral_radius

__all__ = ["Arc3", "Bend", "BendPath", "BendSpan", "Line3", "Straight", "neutral_radius"]
