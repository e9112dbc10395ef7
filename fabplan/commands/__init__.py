"""The commands, one module per family (core, estimate, em, output, jig).

Each module defines click commands and a `COMMANDS` list that fabplan.cli
registers. base.py holds what they share. Keep imports at the top of these
modules light (no reportlab, ezdxf, shapely, scipy): heavy imports go inside
the command functions.
"""
