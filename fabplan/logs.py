"""The library's logger, "fabplan", quiet unless its user configures logging (a
NullHandler, as the logging HOWTO asks of libraries). The command line adds its own
handler for -v and -vv (fabplan.commands.base.set_verbosity).

Kept apart from fabplan/__init__.py so that importing the package (and `fabplan
--help`) does not load the logging module.
"""

from __future__ import annotations

import logging

__all__ = ["log"]

log = logging.getLogger("fabplan")
log.addHandler(logging.NullHandler())
