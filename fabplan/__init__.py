"""fabplan: fabrication plans for antenna elements bent from wire, rod or tube.

    >>> import fabplan
    >>> plan = fabplan.make_plan(fabplan.load_design("examples/club-uhf-folded-dipoles.toml"))

Lengths are millimetres inside. Heavy libraries load only when a stage needs them.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

__version__ = "0.1.0"
__all__ = ["load_design", "make_plan", "FabplanError", "__version__"]

if TYPE_CHECKING:  # pragma: no cover
    from .design.read import load_design
    from .errors import FabplanError
    from .plan import make_plan


def __getattr__(name: str) -> Any:
    if name == "load_design":
        from .design.read import load_design
        return load_design
    if name == "make_plan":
        from .plan import make_plan
        return make_plan
    if name == "FabplanError":
        from .errors import FabplanError
        return FabplanError
    raise AttributeError(name)
