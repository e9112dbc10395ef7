"""Command-line commands of the later stages, one module per stage.

Each module defines click commands and a `COMMANDS` list; `fabplan.cli`
registers the modules named in its `COMMAND_MODULES`. Keep imports at the top
of these modules light (no reportlab, ezdxf, shapely, scipy).
"""
