"""Published design formulas for whole antennas, as pure functions.

Modules (import the one you need; only numpy is loaded at import, scipy inside
the functions that use it):

- `small_loop`: capacitor-tuned small transmitting loop (radiation resistance,
  inductance of circle and polygon, losses, efficiency, tuning, Q, voltage).
- `quadrifilar`: self-phased resonant quadrifilar helix (loop dimensions,
  developed lengths, mast drilling).
- `yagi`: NBS Technical Note 688 starting dimensions and a diameter correction.
- `boom`: boom correction by mounting style.
- `taper`: telescoping (stepped-diameter) element correction.
- `tip_pair`: two bent elements with facing tips (starting dimensions).
- `matching`: parallel-wire lines, stubs, hairpin, gamma and T matches.

Each module's docstring lists its SOURCES with the tags of
/work/shared/design/trade-notes.md: [S] published and read, [M] recalled from
the named source, [P] common practice.
"""

__all__ = ["boom", "common", "matching", "quadrifilar", "small_loop", "taper", "tip_pair",
           "yagi"]
