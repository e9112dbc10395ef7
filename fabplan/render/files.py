"""Writing output files: refuse to overwrite unless asked, write all or nothing.

A single file goes to a temporary name in its folder and is renamed into
place. A set of files (`write_set`, what `fabplan build` writes) goes into a
temporary folder beside the target folder and each file is moved into place
only when all of them are written; on any error or interrupt the temporary
files are removed and nothing in the target is replaced. Every error names
the path and the cause.
"""

from __future__ import annotations

import os
import shutil
import tempfile
from collections.abc import Mapping
from pathlib import Path

from ..errors import FabplanError

__all__ = ["check_writable", "write_bytes", "write_text", "write_set"]


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


def _os_error(exc: OSError, path: Path) -> FabplanError:
    cause = exc.strerror or str(exc)
    return FabplanError(f"cannot write: {cause}", field="output",
                        value=str(getattr(exc, "filename", None) or path))


def write_bytes(path: str | Path, data: bytes, force: bool = False) -> Path:
    p = check_writable(path, force)
    tmp = None
    try:
        fd, tmp = tempfile.mkstemp(prefix=f".{p.name[:40]}.", suffix=".part", dir=p.parent)
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
        os.chmod(tmp, 0o644)
        os.replace(tmp, p)
        tmp = None
    except OSError as exc:
        raise _os_error(exc, p) from None
    finally:
        if tmp is not None and os.path.exists(tmp):
            os.unlink(tmp)
    return p


def write_text(path: str | Path, text: str, force: bool = False) -> Path:
    return write_bytes(path, text.encode("utf-8"), force)


def write_set(folder: str | Path, files: Mapping[str, bytes], force: bool = False) -> list[Path]:
    """Write every file of `files` ({name: bytes}) into `folder`, all or nothing.

    Every target is checked first (nothing is replaced without `force`); the
    files are written into a temporary folder beside `folder`, then moved into
    place. Returns the paths written, in name order."""
    out = Path(folder)
    if out.exists() and not out.is_dir():
        raise FabplanError("is a file, not a folder", field="--output", value=str(out))
    targets = [out / name for name in sorted(files)]
    if out.is_dir():
        for t in targets:
            check_writable(t, force)
    parent = out.parent if str(out.parent) else Path(".")
    if not parent.is_dir():
        raise FabplanError("its folder does not exist", field="--output", value=str(out))
    made_folder = not out.exists()
    stage = None
    moved: list[Path] = []
    try:
        stage = Path(tempfile.mkdtemp(prefix=f".{out.name[:40]}.", suffix=".part", dir=parent))
        for t in targets:
            (stage / t.name).write_bytes(files[t.name])
            os.chmod(stage / t.name, 0o644)
        out.mkdir(exist_ok=True)
        for t in targets:
            os.replace(stage / t.name, t)
            moved.append(t)
    except OSError as exc:
        raise _os_error(exc, out) from None
    finally:
        if stage is not None:
            shutil.rmtree(stage, ignore_errors=True)
        if len(moved) != len(targets):
            for t in moved:
                t.unlink(missing_ok=True)
            if made_folder and out.is_dir() and not any(out.iterdir()):
                out.rmdir()
    return targets
