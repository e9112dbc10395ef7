"""`fabplan sweep` and `fabplan tune`: the electrical check on the command line.

Parses options, calls the electrical stage and the tuning use case, prints;
no engineering here. Heavy imports stay inside the command functions.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

import click

from .base import (
    check_output,
    design_argument,
    design_text,
    guarded,
    is_dash,
    load_design_file,
    output_path,
    write_one_text,
)
from .measure import SINGLE_KINDS, write_corrected

__all__ = ["COMMANDS", "sweep", "tune"]


def _settings(design: Any) -> Any:
    from ..errors import DesignError

    if design.electrical is None:
        from importlib import resources

        shape = design.elements[0].shape if design.elements else "folded-dipole"
        template = resources.files("fabplan").joinpath("templates", f"{shape}.toml")
        if not template.is_file() or "# [electrical]" not in template.read_text("utf-8"):
            shape = "folded-dipole"  # its template has none (a helix, a hairpin: no feed gap)
        raise DesignError("the design has no [electrical] table: add one with at least "
                          f'target = "..." (`fabplan new {shape}` shows it, commented)',
                          field="electrical", source=design.source)
    return design.electrical


def _core_plan(design: Any) -> Any:
    """The plan with every stage but the electrical one (which the command runs itself)."""
    import dataclasses

    from ..errors import DesignError
    from ..plan import make_plan

    plan = make_plan(dataclasses.replace(design, electrical=None))
    for e in plan.elements:
        if e.shape_errors:
            raise DesignError(f"cannot be made as given, so it has no electrical model: "
                              f"{e.shape_errors[0].message} (`fabplan check` lists every "
                              "error)", field=f"element {e.name!r}", source=design.source)
    return plan


def _frequency(text: str | None, option: str, default: float | None,
               **bounds: float) -> float | None:
    from ..units import parse_frequency

    return default if text is None else parse_frequency(text, option, **bounds)


@click.command()
@design_argument
@click.option("--from", "f_from", metavar="FREQ", help='First frequency, e.g. "420 MHz" '
              "(default: the design's sweep, or the target -10 %).")
@click.option("--to", "f_to", metavar="FREQ", help="Last frequency.")
@click.option("--step", "f_step", metavar="FREQ", help='Frequency step, e.g. "0.5 MHz".')
@click.option("--element", "element_name", metavar="NAME", help="Only this element.")
@click.option("--csv", "csv_path",
              type=click.Path(dir_okay=False, allow_dash=True, path_type=Path),
              help="Also write every point to this CSV file (Hz, ohm; `-`: standard output, "
                   "and the report goes to standard error).")
@click.option("--s1p", "s1p_path",
              type=click.Path(dir_okay=False, allow_dash=True, path_type=Path),
              help="Also write the predicted sweep as a Touchstone .s1p file (S11 against the "
                   "system impedance), to overlay in an analyser's software (`-`: standard "
                   "output, and the report goes to standard error).")
@click.option("--s1p-plane", type=click.Choice(["radio", "element"]), default="radio",
              show_default=True,
              help="Where the .s1p is: at the radio end of the matching and feed line, or "
                   "at the element's terminals.")
@click.option("--force", is_flag=True, help="Replace an existing CSV or .s1p file.")
@guarded
def sweep(design: Path, f_from: str | None, f_to: str | None, f_step: str | None,
          element_name: str | None, csv_path: Path | None, s1p_path: Path | None,
          s1p_plane: str, force: bool) -> None:
    """Sweep each fed element's impedance and SWR through the matching, with the
    antenna's gain and front-to-back at each frequency."""
    import dataclasses

    from ..design.electrical import check_sweep
    from ..em.stage import electrical
    from ..errors import DesignError
    from ..plan import electrical_input
    from ..render.csv import sweep_csv
    from ..render.text import (
        electrical_summary_lines,
        findings_lines,
        plan_electrical_text,
        sweep_lines,
    )
    from ..tuning import driven_element, fed_element

    if is_dash(csv_path) and is_dash(s1p_path):
        raise DesignError("only one of --csv and --s1p can go to standard output",
                          field="--s1p", value="-")
    check_output(csv_path, force, "--csv")
    check_output(s1p_path, force, "--s1p")
    d = load_design_file(design)
    settings = _settings(d)
    lo = _frequency(f_from, "--from", settings.sweep_from_hz) or settings.sweep_from_hz
    hi = _frequency(f_to, "--to", settings.sweep_to_hz) or settings.sweep_to_hz
    default_step = settings.sweep_step_hz if f_from is None and f_to is None else (hi - lo) / 80
    step = _frequency(f_step, "--step", default_step, low_hz=1.0) or default_step
    check_sweep(lo, hi, step, "--from/--to/--step")
    settings = dataclasses.replace(settings, sweep_from_hz=lo, sweep_to_hz=hi, sweep_step_hz=step)
    plan = _core_plan(d)
    if element_name is not None:
        chosen = [driven_element(plan, element_name)]
    else:  # a whole element fed through a gamma or T match counts (the model feeds it)
        chosen = [e for e in plan.elements if e.geometry.modelled.feed is not None]
        if not chosen:
            fed_element(plan, None)  # raises: nothing to sweep
    inputs = [electrical_input(d, e.spec, e.geometry, e.pieces) for e in plan.elements]
    checked, pe, found = electrical(inputs, settings, strict=True)
    out: list[str] = []
    sweeps = []
    for e, ee in zip(plan.elements, checked):
        if ee is None or e not in chosen:
            continue
        title = f"{e.name} ({e.spec.shape})"
        band = pe.structures[ee.structure].band if ee.structure < len(pe.structures) else None
        out += [title, "-" * len(title)] + electrical_summary_lines(ee) + [""]
        out += sweep_lines(ee, None, band) + [f"  note: {x}" for x in ee.notes] + [""]
        sweeps.append((e.name, ee.sweep))
    out += [plan_electrical_text(pe, d.shop.units, d.shop.fraction), "", "Findings",
            "--------"]
    out += findings_lines(found) or ["No findings: every check passed."]
    if csv_path is not None:
        write_one_text(csv_path, sweep_csv(sweeps), force, "--csv")
    if s1p_path is not None:
        from ..render.touchstone import predicted_s1p

        if len(sweeps) != 1:
            raise DesignError("a .s1p file holds one port: choose the element with --element",
                              field="--s1p")
        name, result = sweeps[0]
        write_one_text(s1p_path, predicted_s1p(result, settings.chain, name, s1p_plane), force,
                       "--s1p")
    click.echo("\n".join(out), err=is_dash(csv_path) or is_dash(s1p_path))


@click.command()
@design_argument
@click.option("--target", "target", metavar="FREQ",
              help="Frequency to tune to (default: [electrical] target).")
@click.option("--measured", "measured", metavar="FREQ",
              help="A frequency measured on the first article (say which with --kind): "
                   "report the change in length for the next build instead of tuning the "
                   "model.")
@click.option("--kind", "measured_kind", type=click.Choice(SINGLE_KINDS),
              help="What --measured is: resonance (X = 0 at the element's terminals), "
                   "least-swr (where the SWR read least through the matching) or "
                   "analyser-x0 (where the analyser read X = 0 through the matching and "
                   "feed line). Required with --measured: it is never guessed.")
@click.option("--for", "tune_for", type=click.Choice(["least-swr", "resonance"]),
              help="Put least SWR (default: [electrical] tune_for) or resonance on target.")
@click.option("--element", "element_name", metavar="NAME",
              help="The element to tune (needed when several have a feed gap).")
@click.option("--goal", metavar="GOAL",
              help='A beam: also move the parasitic elements for "max-gain", '
                   '"max-front-to-back", "front-to-back>=20dB" (most gain with it) or '
                   '"gain>=8dBi" (most front-to-back with it).')
@click.option("--within", type=click.FloatRange(0.1, 30.0), default=5.0, show_default=True,
              metavar="PERCENT", help="With --goal: how far (+-%) each parasitic length may move.")
@output_path("Write the tuned design to this file; the report then goes to standard error "
             "when it is `-`")
@click.option("--force", is_flag=True, help="Replace an existing output file.")
@guarded
def tune(design: Path, target: str | None, measured: str | None, measured_kind: str | None,
         tune_for: str | None, element_name: str | None, goal: str | None, within: float,
         output: Path | None, force: bool) -> None:
    """Find the element length that puts least SWR (or resonance) on target; for a beam
    with a matching device (or a --goal), the driven element and the match together."""
    from ..em.stage import plan_electrical
    from ..errors import DesignError

    if measured is not None and measured_kind is None:
        raise DesignError("say what the measured frequency is: --kind resonance (X = 0 at the "
                          "element's terminals), least-swr (where the SWR was least) or "
                          "analyser-x0 (where the analyser read X = 0); it is never guessed",
                          field="--kind")
    if measured_kind is not None and measured is None:
        raise DesignError("--kind says what --measured FREQ is: give --measured",
                          field="--kind", value=measured_kind)
    if output is not None:
        check_output(output, force)
    d = load_design_file(design)
    settings = _settings(d)
    target_hz = _frequency(target, "--target", settings.target_hz)
    if target_hz is None:
        raise DesignError('give --target "FREQ" or set target in [electrical]', field="--target")
    measured_hz = _frequency(measured, "--measured", None)
    plan = _core_plan(d)
    lines = _tuned_lines(design, d, plan, settings, target_hz, measured_hz, measured_kind,
                         tune_for, element_name, goal, within, output, force)
    if output is None and measured_hz is None:  # a correction says how to write it itself
        lines += ["", "use -o NEW.toml to write the tuned design"]
    pe = plan_electrical(settings)
    lines += [""] + [f"CAUTION: {c}" for c in pe.cautions]
    click.echo("\n".join(lines), err=is_dash(output))


def _tuned_lines(design: Path, d: Any, plan: Any, settings: Any, target_hz: float,
                 measured_hz: float | None, measured_kind: str | None, tune_for: str | None,
                 element_name: str | None, goal: str | None, within: float,
                 output: Path | None, force: bool) -> list[str]:
    """What `tune` found (and wrote with -o), by the kind of antenna and whether a
    measured frequency was given."""
    from .. import tuning
    from ..render.tuning import tune_text

    if measured_hz is None and (goal is not None or any(
            e.spec.match is not None for e in plan.elements if e.spec.part_of is None)):
        return _tune_beam(design, d, plan, settings, target_hz, element_name, goal, within,
                          output, force)
    element = tuning.fed_element(plan, element_name)
    if measured_hz is None and tuning.tuned_loop(plan, element) is not None:
        return _tune_coupling(design, d, plan, element, settings, target_hz, output, force)
    if measured_hz is not None and measured_kind is not None:
        from ..measuring import correct_single
        from ..render.measure import correction_lines

        m = correct_single(plan, element, settings, measured_kind, measured_hz, target_hz,
                           tune_for=tune_for)
        lines = correction_lines(m, d)
        if output is not None:
            lines += ["", write_corrected(design, d, plan, element, settings, m.corrections[0],
                                          output, force)]
    else:
        r = tuning.tune(plan, element, settings, target_hz, tune_for=tune_for)
        lines = tune_text(r, d, settings)
        if output is not None:
            lines += ["", _write_tuned(design, d, element, r.new_params, output, force)]
            if settings.target_hz is not None and settings.target_hz != target_hz:
                lines.append(f"note: its [electrical] target is still "
                             f"{settings.target_hz / 1e6:g} MHz; only the length was changed")
    return lines


def _tune_beam(design: Path, d: Any, plan: Any, settings: Any, target_hz: float,
               element_name: str | None, goal: str | None, within: float, output: Path | None,
               force: bool) -> list[str]:
    """`tune` for a beam: the driven element with its match, and the parasitics for a goal."""
    from .. import tuning
    from ..design.read import parse_design
    from ..design.rewrite import rewrite_element
    from ..render.tuning import beam_tune_text

    element = tuning.driven_element(plan, element_name)
    aim = None if goal is None else tuning.parse_goal(goal, within / 100)
    r = tuning.tune_beam(plan, element, settings, target_hz, goal=aim)
    lines = beam_tune_text(r, d)
    if output is not None:
        text = design_text(design)
        current = d
        shown = []
        for name, values in tuning.beam_values(r).items():
            text, changes = rewrite_element(text, current, name, values,  # type: ignore[arg-type]
                                            str(output))
            current = parse_design(text, str(output))
            shown += [f"{name}: {k} = \"{v}\"" for k, v in changes.items()]
        write_one_text(output, text, force)
        lines += ["", f"tuned design: {'; '.join(shown)}"]
    return lines


def _write_tuned(design: Path, d: Any, element: Any, new_params: Any, output: Path,
                 force: bool) -> str:
    """Write the design with `element`'s tuned params (comments kept); the line that
    says what changed."""
    from .. import tuning
    from ..design.rewrite import rewrite_element

    new_text, changes = rewrite_element(design_text(design), d, element.name,
                                        tuning.tuned_values(element, new_params), str(output))
    write_one_text(output, new_text, force)
    shown = ", ".join(f"{k} = \"{v}\"" for k, v in changes.items())
    return f"tuned design: {shown}"


def _tune_coupling(design: Path, d: Any, plan: Any, element: Any, settings: Any,
                   target_hz: float, output: Path | None, force: bool) -> list[str]:
    """`tune` for a loop its capacitor tunes: the coupling loop's size for the match."""
    from .. import tuning
    from ..render.tuning import coupling_text

    r = tuning.tune_coupling(plan, element, settings, target_hz)
    lines = coupling_text(r, d, settings)
    if output is not None:
        lines += ["", _write_tuned(design, d, element, r.new_params, output, force)]
    return lines


COMMANDS = [sweep, tune]
