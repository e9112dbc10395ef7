"""What every command shares: one-line errors with exit 2, the DESIGN
argument, and loading a design into a Plan.

Command modules import these from here (not from fabplan.cli, which imports
the command modules to register them).
"""

from __future__ import annotations

import functools
import sys
from pathlib import Path

import click

from ..errors import FabplanError

__all__ = ["EXIT_FINDINGS", "EXIT_BAD_INPUT", "guarded", "design_argument", "load_plan"]

EXIT_FINDINGS = 1
EXIT_BAD_INPUT = 2


def _fail(message: str) -> None:
    click.echo(f"fabplan: error: {message}", err=True)
    sys.exit(EXIT_BAD_INPUT)


def guarded(func):
    """Turn FabplanError (and unreadable files) into one line and exit 2."""

    @functools.wraps(func)
    def wrapper(*args, **kwargs):
        ctx = click.get_current_context()
        debug = ctx.find_root().params.get("debug", False)
        try:
            return func(*args, **kwargs)
        except FabplanError as exc:
            if debug:
                raise
            _fail(str(exc))
        except OSError as exc:
            if debug:
                raise
            _fail(f"{getattr(exc, 'filename', '') or ''}: {exc.strerror or exc}")

    return wrapper


design_argument = click.argument("design", type=click.Path(dir_okay=False, path_type=Path))


def load_plan(design_path: Path):
    """Read a design file and make its Plan."""
    from ..design import load_design
    from ..plan import make_plan

    return make_plan(load_design(design_path))
