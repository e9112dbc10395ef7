"""Writing output files: refuse to overwrite unless asked, write atomically.

Every file goes to a temporary name in the same folder and is renamed into
place, so an interrupted run leaves no half-written file.
"""

from __future__ import annotations

import os
import tempfile
from pathlib import Path

from ..errors import FabplanError

__all__ = ["check_writable", "write_bytes", "write_text"]


def check_writable(path: str | Path, force: bool, field: str = "output") -> Path:
    """Fail (before any work is done) if `path` exists and `force` is off."""
    p = Path(path)
    if p.exists() and not force:
        raise FabplanError("already exists; use --force to replace it", field=field,
                           value=str(p))
    if p.exists() and p.is_dir():
        raise FabplanError("is a folder, not a file", field=field, value=str(p))
    parent = p.parent if str(p.parent) else Path(".")
    if not parent.is_dir():
        raise FabplanError("its folder does not exist", field=field, value=str(p))
    return p


def write_bytes(path: str | Path, data: bytes, force: bool = False) -> Path:
    p = check_writable(path, force)
    fd, tmp = tempfile.mkstemp(prefix=f".{p.name}.", suffix=".part", dir=p.parent or ".")
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
        os.chmod(tmp, 0o644)
        os.replace(tmp, p)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise
    return p


def write_text(path: str | Path, text: str, force: bool = False) -> Path:
    return write_bytes(path, text.encode("utf-8"), force)
