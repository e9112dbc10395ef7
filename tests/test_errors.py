"""Error lines: one line each, naming file, field, value and rule; several at once."""

from __future__ import annotations

from fabplan.errors import (
    FULL_CHARS,
    MAX_LINES,
    SHOWN_CHARS,
    DesignError,
    FabplanError,
    shown_value,
)


def test_one_error_is_one_line_with_file_field_value_rule():
    err = DesignError("must be at least 1", field="element[1].quantity", value=0,
                      source="d.toml")
    assert str(err) == "d.toml: element[1].quantity = 0: must be at least 1"
    assert err.lines == [str(err)]


def test_a_long_value_is_shortened_with_its_length():
    value = "x" * 200_000
    line = str(DesignError("not a length", field="element.side", value=value, source="d.toml"))
    assert len(line) < 200
    assert f"... ({len(value)} characters)" in line
    assert "'" + "x" * (SHOWN_CHARS - 1) in line
    # a short value (a path, say) is shown whole, control characters escaped (repr)
    assert shown_value("a\x07b") == "'a\\x07b'"
    path = "/" + "d" * (FULL_CHARS - 3)
    assert shown_value(path) == repr(path)


def test_combined_errors_keep_the_first_as_str_and_every_line():
    errors = [DesignError(f"rule {i}", field=f"f{i}", value=i, source="d.toml")
              for i in range(3)]
    both = FabplanError.combine(errors + errors[:1])  # a repeated line is kept once
    assert isinstance(both, DesignError)
    assert str(both) == str(errors[0])
    assert both.lines == [str(e) for e in errors]
    assert (both.field, both.value, both.rule) == ("f0", 0, "rule 0")


def test_combined_errors_are_counted_beyond_the_cap():
    errors = [DesignError("rule", field=f"f{i}") for i in range(MAX_LINES + 7)]
    lines = FabplanError.combine(errors).lines
    assert len(lines) == MAX_LINES + 1
    assert lines[-1].startswith("7 more error(s) not shown")


def test_named_adds_the_file_where_it_is_missing_but_not_to_options():
    errors = FabplanError.combine([
        DesignError("stage rule", field="forming.calibration.angle_released", value=94.9),
        DesignError("option rule", field="--paper", value="a7"),
        DesignError("other file", field="x", source="other.toml")])
    lines = errors.named("d.toml").lines
    assert lines[0].startswith("d.toml: forming.calibration.angle_released = 94.9: ")
    assert lines[1] == "--paper = 'a7': option rule"
    assert lines[2].startswith("other.toml: x: ")
    assert errors.with_source("d.toml").lines[2].startswith("d.toml: x: ")


# -- on the command line -------------------------------------------------------------
TWO_TABLES = """
[stock]
diameter = "4 mm"
material = "cu-c11000-annealed"
[shop]
fraction = 10
[[element]]
name = "a\\u0007"
shape = "hairpin"
leg = "100 furlongs"
spacing = "20 mm"
"""


def test_the_command_line_prints_every_error_in_the_file(tmp_path):
    from click.testing import CliRunner

    from fabplan.cli import main

    path = tmp_path / "two.toml"
    path.write_text(TWO_TABLES, encoding="utf-8")
    result = CliRunner().invoke(main, ["check", str(path)])
    assert result.exit_code == 2
    lines = result.stderr.splitlines()
    assert [line.split(": ")[3].split(" ")[0] for line in lines] == [
        "shop.fraction", "element[1].name", "element[1].leg"]
    assert all(line.startswith(f"fabplan: error: {path}: ") for line in lines)


CALIBRATION = """
[stock]
diameter = "4 mm"
material = "cu-c11000-annealed"
[forming.calibration]
former_radius = "20 mm"
angle_held = 95
angle_released = 94.9999999999999
[[element]]
shape = "hairpin"
leg = "100 mm"
spacing = "20 mm"
"""


def test_an_error_found_while_planning_names_the_file(tmp_path):
    """The test bend is checked against the springback model in the forming stage,
    after the file was read: the line names the file all the same."""
    from click.testing import CliRunner

    from fabplan.cli import main

    path = tmp_path / "cal.toml"
    path.write_text(CALIBRATION, encoding="utf-8")
    result = CliRunner().invoke(main, ["plan", str(path)])
    assert result.exit_code == 2
    assert result.stderr.startswith(
        f"fabplan: error: {path}: forming.calibration.angle_released = 94.9999999999999: ")
    assert len(result.stderr.splitlines()) == 1
