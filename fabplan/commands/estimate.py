"""`fabplan estimate` and `fabplan compare`: weight, cost and the purchase plan."""

from __future__ import annotations

from pathlib import Path

import click

from .base import design_argument, guarded, load_plan

__all__ = ["COMMANDS", "estimate", "compare"]


@click.command()
@design_argument
@click.option("--json", "as_json", is_flag=True,
              help="Print the estimate as JSON (mm, kg, the design's currency).")
@click.option("--csv", "csv_path", type=click.Path(dir_okay=False, path_type=Path),
              help="Also write the cut list as CSV to this file.")
@click.option("--force", is_flag=True, help="Replace an existing CSV file.")
@guarded
def estimate(design: Path, as_json: bool, csv_path: Path | None, force: bool) -> None:
    """Print the bill of material, the stock to buy and the cutting plan."""
    from ..render.csv import order_csv
    from ..render.estimate import estimate_json, estimate_text
    from ..render.files import check_writable, write_text

    if csv_path is not None:
        check_writable(csv_path, force, field="--csv")
    plan = load_plan(design)
    text = estimate_json(plan) if as_json else estimate_text(plan)
    if csv_path is not None:
        write_text(csv_path, order_csv(plan), force)
    click.echo(text, nl=False)
    if csv_path is not None:
        click.echo(f"wrote {csv_path}", err=True)


@click.command()
@click.argument("design_a", type=click.Path(dir_okay=False, path_type=Path))
@click.argument("design_b", type=click.Path(dir_okay=False, path_type=Path))
@click.option("--json", "as_json", is_flag=True, help="Print the comparison as JSON.")
@guarded
def compare(design_a: Path, design_b: Path, as_json: bool) -> None:
    """Compare two designs' stock choices side by side: weight, cost, findings."""
    from ..render.estimate import compare_json, compare_text

    a, b = load_plan(design_a), load_plan(design_b)
    click.echo(compare_json(a, b) if as_json else compare_text(a, b), nl=False)


COMMANDS = [estimate, compare]
