"""fabplan: fabrication plans for antenna elements bent from wire, rod or tube.

    >>> import fabplan
    >>> plan = fabplan.make_plan(fabplan.load_design("examples/club-uhf-loops.toml"))

Lengths are millimetres inside. Heavy libraries load only when a stage needs them.
"""

from __future__ import annotations

import logging
from typing import TYPE_CHECKING, Any

__version__ = "0.1.0"
__all__ = ["load_design", "make_plan", "FabplanError", "__version__"]

logging.getLogger("fabplan").addHandler(logging.NullHandler())

from .errors import FabplanError  # noqa: E402

if TYPE_CHECKING:  # pragma: no cover
    from .design.read import load_design
    from .plan import make_plan


def __getattr__(name: str) -> Any:
    if name == "load_design":
        from .design.read import load_design
        return load_design
    if name == "make_plan":
        from .plan import make_plan
        return make_plan
    raise AttributeError(name)
