"""Where an element sits in the assembly: a rigid placement of its own frame.

Each element is drawn in its own frame (its bend path starts at the shape's
origin, planar shapes lie in z = 0). A `Placement` maps that frame into the
assembly's frame: the element's x axis goes to `x_axis`, its y axis to
`y_axis` (both unit vectors, perpendicular), its z axis to their cross
product, and its origin to `origin_mm`. The default is the identity.

Units: millimetres.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

__all__ = ["Placement", "Vec3"]

Vec3 = tuple[float, float, float]


@dataclass(frozen=True)
class Placement:
    """A rotation (the images of the element's x and y axes) and a translation (mm)."""

    origin_mm: Vec3 = (0.0, 0.0, 0.0)
    x_axis: Vec3 = (1.0, 0.0, 0.0)
    y_axis: Vec3 = (0.0, 1.0, 0.0)

    def __post_init__(self) -> None:
        x, y = np.asarray(self.x_axis, float), np.asarray(self.y_axis, float)
        if not (math.isclose(float(np.linalg.norm(x)), 1.0, abs_tol=1e-9)
                and math.isclose(float(np.linalg.norm(y)), 1.0, abs_tol=1e-9)
                and abs(float(x @ y)) <= 1e-9):
            raise ValueError("a placement's axes must be perpendicular unit vectors")

    @property
    def rotation(self) -> NDArray[np.float64]:
        """The 3 x 3 rotation matrix whose columns are the element's axes."""
        x = np.asarray(self.x_axis, float)
        y = np.asarray(self.y_axis, float)
        return np.column_stack([x, y, np.cross(x, y)])

    @property
    def is_identity(self) -> bool:
        return self == Placement()

    def apply(self, points_mm: ArrayLike) -> NDArray[np.float64]:
        """Points (..., 3) of the element's frame in the assembly's frame (mm)."""
        p = np.asarray(points_mm, dtype=float)
        out: NDArray[np.float64] = p @ self.rotation.T + np.asarray(self.origin_mm, float)
        return out

    def direction(self, vectors: ArrayLike) -> NDArray[np.float64]:
        """Directions (..., 3) of the element's frame in the assembly's frame."""
        out: NDArray[np.float64] = np.asarray(vectors, dtype=float) @ self.rotation.T
        return out

    @staticmethod
    def translated(x_mm: float = 0.0, y_mm: float = 0.0, z_mm: float = 0.0) -> Placement:
        return Placement((x_mm, y_mm, z_mm))
