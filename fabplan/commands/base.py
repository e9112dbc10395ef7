"""What every command shares: one-line errors with exit 2, the DESIGN argument
(a file, or `-` for standard input), loading a design into a Plan, writing one
output (a file, or `-` for standard output), the quiet and verbose settings,
reporting error findings, and the flag that writes drawings despite them.

Command modules import these from here; fabplan.cli imports the command
modules and registers their commands.
"""

from __future__ import annotations

import functools
import sys
from collections.abc import Callable
from pathlib import Path
from typing import IO, Any, BinaryIO, TypeVar

import click

from ..errors import FabplanError

__all__ = ["EXIT_FINDINGS", "EXIT_BAD_INPUT", "EXIT_INTERRUPTED", "STDIN_SOURCE", "guarded",
           "exit_if_errors",
           "design_argument", "is_dash", "load_design_file", "design_text", "load_plan",
           "with_errors_option", "refuse_errors", "report_errors", "set_verbosity", "quiet",
           "progress", "wrote", "interrupted", "output_path", "write_one_text",
           "write_one_bytes", "check_output"]

EXIT_FINDINGS = 1
EXIT_BAD_INPUT = 2
EXIT_INTERRUPTED = 130  # 128 + SIGINT, what a shell reports for Ctrl-C
STDIN_SOURCE = "<stdin>"  # the design's source name when it is read from standard input

F = TypeVar("F", bound=Callable[..., Any])

# -- quiet and verbose -----------------------------------------------------------------------
def set_verbosity(ctx: click.Context, *, quiet: bool, verbose: int) -> None:
    """Remember -q for this run, and send the library's log to standard error:
    warnings by default, errors only with -q, INFO with -v, DEBUG with -vv.
    The handler is removed when the command ends."""
    import logging

    from ..logs import log

    ctx.meta["fabplan.quiet"] = quiet
    if verbose >= 2:
        level = logging.DEBUG
    elif verbose == 1:
        level = logging.INFO
    else:
        level = logging.ERROR if quiet else logging.WARNING
    handler = logging.StreamHandler(sys.stderr)
    handler.setFormatter(logging.Formatter("fabplan: %(levelname)s: %(message)s"))
    handler.setLevel(level)
    old_level = log.level
    log.addHandler(handler)
    log.setLevel(min(level, old_level) if old_level else level)

    def restore() -> None:
        log.removeHandler(handler)
        log.setLevel(old_level)

    ctx.call_on_close(restore)


def quiet() -> bool:
    """True when -q was given (no progress and no "wrote" lines)."""
    ctx = click.get_current_context(silent=True)
    return bool(ctx is not None and ctx.find_root().meta.get("fabplan.quiet", False))


def progress(what: str) -> None:
    """A progress line on standard error (not with -q)."""
    if not quiet():
        click.echo(f"fabplan: {what}", err=True)


def wrote(path: str | Path) -> None:
    """Say on standard error that a file was written (not with -q)."""
    if not quiet():
        click.echo(f"wrote {path}", err=True)


def interrupted() -> None:
    """The one line for Ctrl-C (after a newline when a terminal echoed "^C")."""
    if sys.stderr.isatty():
        click.echo("", err=True)
    click.echo("fabplan: interrupted", err=True)


# -- errors ----------------------------------------------------------------------------------
def _fail(message: str) -> None:
    click.echo(f"fabplan: error: {message}", err=True)
    sys.exit(EXIT_BAD_INPUT)


def guarded(func: F) -> F:
    """Turn FabplanError (and unreadable files) into one line per error and exit 2,
    and Ctrl-C into one line and exit 130."""

    @functools.wraps(func)
    def wrapper(*args: Any, **kwargs: Any) -> Any:
        ctx = click.get_current_context()
        debug = ctx.find_root().params.get("debug", False)
        try:
            return func(*args, **kwargs)
        except FabplanError as exc:
            if debug:
                raise
            design = kwargs.get("design")  # a line without a file is about the design's
            source = STDIN_SOURCE if is_dash(design) else str(design)
            lines = (exc.named(source) if design is not None else exc).lines
            for line in lines[:-1]:
                click.echo(f"fabplan: error: {line}", err=True)
            _fail(lines[-1])
        except KeyboardInterrupt:
            if debug:
                raise
            interrupted()
            sys.exit(EXIT_INTERRUPTED)
        except BrokenPipeError:
            raise  # the group stops quietly
        except OSError as exc:
            if debug:
                raise
            name = getattr(exc, "filename", None)
            cause = exc.strerror or str(exc)
            _fail(f"{name}: {cause}" if name else cause)

    return wrapper  # type: ignore[return-value]


with_errors_option = click.option(
    "--with-errors", is_flag=True,
    help="Write the files even when the plan has error findings (the outputs say so); "
         "the exit status is still 1.")


# -- the design: a file or standard input ----------------------------------------------------
design_argument = click.argument(
    "design", type=click.Path(dir_okay=False, allow_dash=True, path_type=Path))


def _binary(stream: IO[str]) -> BinaryIO:
    """The byte stream under a text stream (standard input or output)."""
    raw: BinaryIO = getattr(stream, "buffer", None) or stream  # type: ignore[assignment]
    return raw


def is_dash(path: str | Path | None) -> bool:
    """True for `-`: standard input or output."""
    return path is not None and str(path) == "-"


def _stdin_text() -> str:
    """Standard input as text, read once per command (a second read gets the same)."""
    ctx = click.get_current_context()
    root = ctx.find_root()
    if "fabplan.stdin" not in root.meta:
        data = _binary(sys.stdin).read()
        try:
            root.meta["fabplan.stdin"] = data.decode("utf-8-sig")
        except UnicodeDecodeError as exc:
            raise FabplanError(f"cannot read: not UTF-8 text ({exc.reason} at byte "
                               f"{exc.start})", source=STDIN_SOURCE) from None
    text: str = root.meta["fabplan.stdin"]
    return text


def design_text(design_path: Path) -> str:
    """The text of the design file (or of standard input for `-`)."""
    if is_dash(design_path):
        return _stdin_text()
    try:
        return design_path.read_text(encoding="utf-8-sig")
    except OSError as exc:
        raise FabplanError(f"cannot read: {exc.strerror or exc}",
                           source=str(design_path)) from None


def load_design_file(design_path: Path) -> Any:
    """Read and validate a design file (a Design); `-` reads standard input,
    and the design's source is then "<stdin>"."""
    if is_dash(design_path):
        from ..design.read import parse_design

        design = parse_design(_stdin_text(), STDIN_SOURCE)
    else:
        from ..design.read import load_design

        design = load_design(design_path)
    from ..logs import log

    log.info("read %s: %d element(s), stock %s", design.source, len(design.elements),
              design.stock.description)
    return design


def load_plan(design_path: Path, **changes: Any) -> Any:
    """Read a design file and make its Plan; `changes` replace Design fields first
    (e.g. jig settings from the command line)."""
    import dataclasses

    from ..plan import make_plan

    design = load_design_file(design_path)
    if changes:
        design = dataclasses.replace(design, **changes)
    plan = make_plan(design)
    from ..logs import log

    log.info("planned %s: %d finding(s)", design.source, len(plan.findings))
    return plan


# -- one output: a file or standard output ---------------------------------------------------
def output_path(help_text: str, *, required: bool = False) -> Callable[[F], F]:
    """The `-o/--output` option of a command that writes one file (`-`: standard output)."""
    return click.option("-o", "--output", required=required,
                        type=click.Path(dir_okay=False, allow_dash=True, path_type=Path),
                        help=f"{help_text} (`-` for standard output).")


def check_output(path: Path | None, force: bool, field: str = "--output") -> None:
    """Before any work: refuse an existing file without --force (nothing to check for `-`)."""
    if path is None or is_dash(path):
        return
    from ..render.files import check_writable

    check_writable(path, force, field)


def write_one_text(path: Path, text: str, force: bool, field: str = "--output") -> None:
    """Write `text` to the file (atomically, saying so) or to standard output for `-`."""
    if is_dash(path):
        click.echo(text, nl=False)
        return
    from ..render.files import write_text

    wrote(write_text(path, text, force, field))


def write_one_bytes(path: Path, data: bytes, force: bool, field: str = "--output") -> None:
    """Write `data` to the file (atomically, saying so) or to standard output for `-`
    (refused on a terminal: binary data would garble it)."""
    if is_dash(path):
        out = _binary(sys.stdout)
        if out.isatty():
            raise FabplanError("standard output is a terminal: redirect it to a file or a "
                               "pipe, or give a file name", field=field, value="-")
        out.write(data)
        out.flush()
        return
    from ..render.files import write_bytes

    wrote(write_bytes(path, data, force, field))


# -- error findings --------------------------------------------------------------------------
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


def exit_if_errors(plan: Any) -> None:
    """After printing a plan's figures: exit 1 when it has error findings (they are in
    what was printed), as `check`, `build` and `jig` do."""
    if any(f.severity == "error" for f in plan.findings):
        sys.exit(EXIT_FINDINGS)


def refuse_errors(plan: Any, with_errors: bool) -> bool:
    """Before writing outputs: report the plan's error findings; True when the
    files may be written (no errors, or --with-errors). Exits 1 when there are
    errors and --with-errors was not given."""
    if report_errors(plan) and not with_errors:
        click.echo("fabplan: nothing written; fix the design, or use --with-errors to write "
                   "the files anyway", err=True)
        sys.exit(EXIT_FINDINGS)
    return True
