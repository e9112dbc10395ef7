"""Measuring the first article: read the analyser's sweep, move it to the
element, find what it says, keep a history. Pure functions (text in, records
out); numpy only at import.

- `sweep`: the `MeasuredSweep` record (S11 against a reference, or |Gamma|
  only), the conversions S11 <-> Z, return loss <-> |Gamma| <-> SWR, and the
  input bounds (`MAX_TEXT_CHARS`, `MAX_POINTS`).
- `touchstone`: one-port Touchstone (.s1p) reader (versions 1.x, 2.0, 2.1) and
  writer (1.1 or 2.0); `predicted_touchstone` writes a predicted sweep.
- `csvsweep`: a CSV of frequency with SWR, R and X, return loss or S11, the
  columns named by the user.
- `deembed`: feed line, ideal transformer, any two-port (ABCD or the em
  package's matching devices); what was removed and what is left.
- `analysis`: resonance, least SWR, SWR 1.5 and 2 bands, R at resonance, each
  with its uncertainty from the step and from noise.
- `history`: the first-article history file (JSON Lines) and its average.

Own Touchstone reader, not scikit-rf (measured on this project's 2-core
machine, Python 3.11, scikit-rf 2.2.0 with numpy 2.4 and scipy 1.17, median of
5 cold runs of `python -c ...` in a subprocess after one warm-up): `import
skrf` took 147 ms, against 85 ms for `import numpy` and 24 ms for an empty
interpreter, so about 60 ms more than numpy alone (`python -X importtime` puts
about 123 ms of it under skrf.calibration, with no plotting library loaded); a
second series gave 175 ms against 103 ms, and reading a small .s1p with
skrf.Network 206 ms. That cost would be acceptable in the measuring command
alone. It is not taken because: scikit-rf requires pandas (84 MB installed)
besides numpy and scipy, a large dependency for one file format; fabplan needs
one-port files only, and errors as one line naming the file, line, value and
rule (scikit-rf raises exceptions without the line, e.g. "x does not have a
s-parameter extension" for a file-like object without a .s1p name), so it
would need a wrapper anyway; and the reader here (touchstone.py, about 560
lines with its documentation) is written from the published specification and
tested against files scikit-rf wrote (tests/measure/data/make_reference.py
made them; scikit-rf is not a dependency of the project, not even for tests).
"""

from __future__ import annotations

from .analysis import (
    DEFAULT_LEVELS,
    DEFAULT_WINDOW,
    Band,
    BandEdge,
    LeastSwr,
    Resonance,
    SweepAnalysis,
    analyse,
    analyse_sweep,
)
from .csvsweep import ROLE_SETS, ROLES, Role, read_csv_sweep
from .deembed import (
    ABCD,
    Deembedded,
    Stage,
    deembed,
    embed,
    feed_line,
    from_matching,
    from_transform,
    line_stage,
    transformer,
    two_port,
)
from .history import (
    Adjustment,
    HistoryRecord,
    HistorySummary,
    read_history,
    record_line,
    summarize,
)
from .sweep import (
    FREQUENCY_UNITS,
    MAX_LINES,
    MAX_POINTS,
    MAX_TEXT_CHARS,
    MeasuredSweep,
    check_text,
    check_text_size,
    decode_sweep_bytes,
    gamma_from_z,
    gamma_mag_from_return_loss_db,
    gamma_mag_from_swr,
    return_loss_db_from_gamma_mag,
    return_loss_db_from_swr,
    sweep_from_gamma_mag,
    sweep_from_impedance,
    sweep_from_s11,
    sweep_from_swr,
    swr_from_gamma_mag,
    swr_from_return_loss_db,
    z_from_gamma,
)
from .touchstone import (
    TouchstoneOnePort,
    predicted_touchstone,
    read_touchstone,
    write_touchstone,
)

__all__ = [
    "ABCD",
    "DEFAULT_LEVELS",
    "DEFAULT_WINDOW",
    "FREQUENCY_UNITS",
    "MAX_LINES",
    "MAX_POINTS",
    "MAX_TEXT_CHARS",
    "ROLES",
    "ROLE_SETS",
    "Adjustment",
    "Band",
    "BandEdge",
    "Deembedded",
    "HistoryRecord",
    "HistorySummary",
    "LeastSwr",
    "MeasuredSweep",
    "Resonance",
    "Role",
    "Stage",
    "SweepAnalysis",
    "TouchstoneOnePort",
    "analyse",
    "analyse_sweep",
    "check_text",
    "check_text_size",
    "decode_sweep_bytes",
    "deembed",
    "embed",
    "feed_line",
    "from_matching",
    "from_transform",
    "gamma_from_z",
    "gamma_mag_from_return_loss_db",
    "gamma_mag_from_swr",
    "line_stage",
    "predicted_touchstone",
    "read_csv_sweep",
    "read_history",
    "read_touchstone",
    "record_line",
    "return_loss_db_from_gamma_mag",
    "return_loss_db_from_swr",
    "summarize",
    "sweep_from_gamma_mag",
    "sweep_from_impedance",
    "sweep_from_s11",
    "sweep_from_swr",
    "swr_from_gamma_mag",
    "swr_from_return_loss_db",
    "transformer",
    "two_port",
    "write_touchstone",
    "z_from_gamma",
]
