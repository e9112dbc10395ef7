"""What every command shares: one-line errors with exit 2, the DESIGN argument,
loading a design into a Plan, reporting error findings, and the flag that
writes drawings despite them.

Command modules import these from here; fabplan.cli imports the command
modules and registers their commands.
"""

from __future__ import annotations

import functools
import sys
from collections.abc import Callable
from pathlib import Path
from typing import Any, TypeVar

import click

from ..errors import FabplanError

__all__ = ["EXIT_FINDINGS", "EXIT_BAD_INPUT", "guarded", "design_argument", "load_design_file",
           "load_plan", "with_errors_option", "refuse_errors", "report_errors"]

EXIT_FINDINGS = 1
EXIT_BAD_INPUT = 2

F = TypeVar("F", bound=Callable[..., Any])


def _fail(message: str) -> None:
    click.echo(f"fabplan: error: {message}", err=True)
    sys.exit(EXIT_BAD_INPUT)


def guarded(func: F) -> F:
    """Turn FabplanError (and unreadable files) into one line and exit 2."""

    @functools.wraps(func)
    def wrapper(*args: Any, **kwargs: Any) -> Any:
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

    return wrapper  # type: ignore[return-value]


design_argument = click.argument("design", type=click.Path(dir_okay=False, path_type=Path))

with_errors_option = click.option(
    "--with-errors", is_flag=True,
    help="Write the files even when the plan has error findings (the outputs say so); "
         "the exit status is still 1.")


def load_design_file(design_path: Path) -> Any:
    """Read and validate a design file (a Design)."""
    from ..design.read import load_design

    return load_design(design_path)


def load_plan(design_path: Path, **changes: Any) -> Any:
    """Read a design file and make its Plan; `changes` replace Design fields first
    (e.g. jig settings from the command line)."""
    import dataclasses

    from ..plan import make_plan

    design = load_design_file(design_path)
    if changes:
        design = dataclasses.replace(design, **changes)
    return make_plan(design)


def report_errors(plan: Any) -> int:
    """Print the plan's error findings on standard error; returns how many."""
    from ..render.text import findings_lines

    errors = [f for f in plan.findings if f.severity == "error"]
    for line in findings_lines(errors):
        click.echo(f"fabplan: {line}", err=True)
    if errors:
        click.echo(f"fabplan: {len(errors)} error finding(s): not buildable as it stands",
                   err=True)
    return len(errors)


def refuse_errors(plan: Any, with_errors: bool) -> bool:
    """Before writing outputs: report the plan's error findings; True when the
    files may be written (no errors, or --with-errors). Exits 1 when there are
    errors and --with-errors was not given."""
    if report_errors(plan) and not with_errors:
        click.echo("fabplan: nothing written; fix the design, or use --with-errors to write "
                   "the files anyway", err=True)
        sys.exit(EXIT_FINDINGS)
    return True
