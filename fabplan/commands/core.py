"""`fabplan plan`, `check`, `shapes`, `new`, `materials` and `stock`: the core commands.

Parses options, calls the core, calls a renderer; no engineering here.
"""

from __future__ import annotations

import sys
from pathlib import Path

import click
from click.shell_completion import CompletionItem

from ..errors import FabplanError
from .base import (
    EXIT_FINDINGS,
    check_output,
    design_argument,
    exit_if_errors,
    guarded,
    load_plan,
    output_path,
    write_one_text,
)

__all__ = ["COMMANDS", "plan", "check", "shapes", "new", "materials", "stock"]


@click.command()
@design_argument
@click.option("--json", "as_json", is_flag=True, help="Print the plan as JSON (mm, kg, deg).")
@guarded
def plan(design: Path, as_json: bool) -> None:
    """Print the fabrication plan: lengths, bend table, marks, findings."""
    from ..render.json import plan_to_json
    from ..render.text import plan_to_text

    p = load_plan(design)
    click.echo(plan_to_json(p) if as_json else plan_to_text(p), nl=False)
    exit_if_errors(p)


@click.command()
@design_argument
@guarded
def check(design: Path) -> None:
    """Validate a design and list findings (exit 0 buildable, 1 errors, 2 bad input)."""
    from ..render.text import findings_text

    p = load_plan(design)
    click.echo(findings_text(p))
    errors = sum(f.severity == "error" for f in p.findings)
    warnings = sum(f.severity == "warning" for f in p.findings)
    click.echo(f"{errors} error(s), {warnings} warning(s): "
               + ("not buildable as it stands." if errors else "buildable."))
    if errors:
        sys.exit(EXIT_FINDINGS)


@click.command()
def shapes() -> None:
    """List the shape templates."""
    from ..geometry.shapes import SHAPES

    width = max(len(n) for n in SHAPES)
    for name, spec in SHAPES.items():
        click.echo(f"{name.ljust(width)}  {spec.summary}")


def _complete_shape(ctx: click.Context, param: click.Parameter,
                    incomplete: str) -> list[CompletionItem]:
    """Shell completion of SHAPE: the shape names."""
    from ..geometry.shapes import SHAPES

    return [CompletionItem(name, help=spec.summary) for name, spec in SHAPES.items()
            if name.startswith(incomplete)]


@click.command()
@click.argument("shape", shell_complete=_complete_shape)
@output_path("Write to this file instead of standard output")
@click.option("--force", is_flag=True, help="Replace an existing file.")
@guarded
def new(shape: str, output: Path | None, force: bool) -> None:
    """Write a commented design file for SHAPE (`fabplan shapes` lists them)."""
    from ..geometry.shapes import SHAPES

    if shape not in SHAPES:
        raise FabplanError(f"unknown shape; run `fabplan shapes` (known: {', '.join(SHAPES)})",
                           field="SHAPE", value=shape)
    check_output(output, force)
    from importlib import resources

    text = resources.files("fabplan").joinpath("templates", f"{shape}.toml").read_text("utf-8")
    write_one_text(output or Path("-"), text, force)


@click.command()
def materials() -> None:
    """List the materials with their key properties and sources."""
    from ..render.text import table
    from ..stock.materials import MATERIALS

    rows = [[m.key, f"{m.density_kg_m3:g}", f"{m.youngs_modulus_mpa / 1000:g}",
             f"{m.yield_mpa:g}", f"{m.resistivity_ohm_m * 1e8:.2f}", m.name]
            for m in MATERIALS.values()]
    click.echo(table(["key", "kg/m3", "E GPa", "yield MPa", "uohm cm", "name"], rows, "lrrrrl"))
    click.echo("\nSources ([M]: a handbook figure recalled, not read from the book; [E]: an "
               "estimate; [P]: common practice):")
    for m in MATERIALS.values():
        click.echo(f"  {m.key}: {m.source}")


@click.command()
def stock() -> None:
    """List the stock catalogue (use the key as [stock] catalogue = "...")."""
    from ..render.text import table
    from ..stock.catalogue import CATALOGUE

    rows = [[i.key, i.description, i.material, i.source] for i in CATALOGUE.values()]
    click.echo(table(["key", "description", "default material", "source"], rows))


COMMANDS = [plan, check, shapes, new, materials, stock]
