"""`fabplan estimate` and `fabplan compare`: weight, cost and the purchase plan."""

from __future__ import annotations

from pathlib import Path

import click

from ..errors import FabplanError
from .base import (
    check_output,
    design_argument,
    exit_if_errors,
    guarded,
    is_dash,
    load_plan,
    write_one_text,
)

__all__ = ["COMMANDS", "estimate", "compare"]


@click.command()
@design_argument
@click.option("--json", "as_json", is_flag=True,
              help="Print the estimate as JSON (mm, kg, the design's currency).")
@click.option("--csv", "csv_path",
              type=click.Path(dir_okay=False, allow_dash=True, path_type=Path),
              help="Also write the cut list as CSV to this file (`-`: standard output, and "
                   "the report goes to standard error).")
@click.option("--force", is_flag=True, help="Replace an existing CSV file.")
@guarded
def estimate(design: Path, as_json: bool, csv_path: Path | None, force: bool) -> None:
    """Print the bill of material, the stock to buy and the cutting plan."""
    from ..render.csv import order_csv
    from ..render.estimate import estimate_json, estimate_text

    if is_dash(csv_path) and as_json:
        raise FabplanError("--csv - and --json would both print on standard output: give the "
                           "CSV a file name", field="--csv", value="-")
    check_output(csv_path, force, "--csv")
    plan = load_plan(design)
    text = estimate_json(plan) if as_json else estimate_text(plan)
    if csv_path is None:
        click.echo(text, nl=False)
    else:
        # the CSV first: the report is not printed when the file cannot be written
        write_one_text(csv_path, order_csv(plan), force, "--csv")
        click.echo(text, nl=False, err=is_dash(csv_path))
    exit_if_errors(plan)


@click.command()
@click.argument("design_a", type=click.Path(dir_okay=False, allow_dash=True, path_type=Path))
@click.argument("design_b", type=click.Path(dir_okay=False, allow_dash=True, path_type=Path))
@click.option("--json", "as_json", is_flag=True, help="Print the comparison as JSON.")
@guarded
def compare(design_a: Path, design_b: Path, as_json: bool) -> None:
    """Compare two designs' stock choices side by side: weight, cost, findings and,
    when they have an [electrical] table, each fed element's resonance, least SWR,
    bandwidth and efficiency. One of them may be `-` (standard input)."""
    from ..render.estimate import compare_json, compare_text

    if is_dash(design_a) and is_dash(design_b):
        raise FabplanError("only one design can come from standard input", field="DESIGN_B",
                           value="-")
    a, b = load_plan(design_a), load_plan(design_b)
    click.echo(compare_json(a, b) if as_json else compare_text(a, b), nl=False)


COMMANDS = [estimate, compare]
