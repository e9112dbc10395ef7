"""The command line: the `fabplan` group and its commands, registered explicitly.

Each command lives in a module of fabplan/commands/ (parse options, call the
core, call a renderer; no engineering). Bad input prints one line and exits
with status 2; error findings exit 1; an interrupt exits 130.

`-q` quietens the progress and "wrote" lines; `-v` shows the library's log
(`logging.getLogger("fabplan")`) at INFO, `-vv` at DEBUG. Shell completion is
click's: `eval "$(_FABPLAN_COMPLETE=bash_source fabplan)"` (zsh_source, fish_source).
"""

from __future__ import annotations

import os
import sys
from typing import Any

import click

from . import __version__
from .commands import core, em, estimate, jig, measure, output
from .commands.base import EXIT_INTERRUPTED, interrupted, set_verbosity

__all__ = ["main"]


class _Fabplan(click.Group):
    """The command group, with click's usage errors as one line and exit 2."""

    def main(self, args: Any = None, prog_name: str | None = None,
             complete_var: str | None = None, standalone_mode: bool = True,
             **extra: Any) -> Any:
        if not standalone_mode:
            return super().main(args, prog_name, complete_var, False, **extra)
        try:
            code = super().main(args, prog_name, complete_var, False, **extra)
        except click.UsageError as exc:
            where = f"{exc.ctx.command_path}: " if exc.ctx is not None else ""
            click.echo(f"fabplan: error: {where}{exc.format_message()}", err=True)
            sys.exit(2)
        except (click.Abort, KeyboardInterrupt):
            interrupted()
            sys.exit(EXIT_INTERRUPTED)
        except click.ClickException as exc:
            click.echo(f"fabplan: error: {exc.format_message()}", err=True)
            sys.exit(exc.exit_code)
        except BrokenPipeError:
            # the reader went away (`fabplan plan x.toml | head`): stop quietly
            _silence_stdout()
            sys.exit(1)
        sys.exit(code if isinstance(code, int) else 0)


def _silence_stdout() -> None:
    """Point standard output at the null device so that the interpreter's final
    flush does not complain about the closed pipe."""
    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
    except (OSError, ValueError):  # not a real file (a test runner's buffer)
        pass


@click.group(cls=_Fabplan, context_settings={"help_option_names": ["-h", "--help"]})
@click.version_option(__version__, prog_name="fabplan")
@click.option("-q", "--quiet", is_flag=True,
              help="No progress or \"wrote\" lines; only results, warnings and errors.")
@click.option("-v", "--verbose", count=True,
              help="Show what fabplan is doing: -v at INFO, -vv at DEBUG (on standard error).")
@click.option("--debug", is_flag=True, help="Show a traceback on errors.")
def main(quiet: bool, verbose: int, debug: bool) -> None:
    """Fabrication plans for antenna elements bent from wire, rod or tube.

    Read a design file (TOML) and get the cut length, bend marks, jig, stock
    order and an electrical check. Start with `fabplan shapes` and
    `fabplan new SHAPE -o my.toml`. A DESIGN of `-` is read from standard input.
    """
    set_verbosity(click.get_current_context(), quiet=quiet, verbose=verbose)


for _module in (core, estimate, em, measure, output, jig):
    for _command in _module.COMMANDS:
        main.add_command(_command)

if __name__ == "__main__":  # pragma: no cover
    main()
