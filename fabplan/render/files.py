"""Writing output files: refuse to overwrite unless asked, write all or nothing.

A single file goes to a temporary name in its folder and is renamed into
place. A set of files (`write_set`, what `fabplan build` and `fabplan jig`
write) goes into a temporary folder beside the target folder; only when every
file is written are they moved into place (a file they replace, with `force`,
is put aside first and put back if the move fails). On any error or interrupt
(Ctrl-C) the temporary files are removed and the target is left as it was.
Every error names the path and the cause.

File names in a set are kept to `MAX_NAME_BYTES` bytes (a long design-file
name would otherwise make some of them too long for the file system): a
longer name keeps its beginning, its last characters and its extension, with
a short hash of the whole name between them, so that the names stay unique
and the same input gives the same names.
"""

from __future__ import annotations

import hashlib
import os
import shutil
import tempfile
from collections.abc import Mapping
from pathlib import Path

from ..errors import FabplanError

__all__ = ["check_writable", "write_bytes", "write_text", "write_set", "safe_name",
           "MAX_NAME_BYTES"]

# The smallest file-name limit of the file systems in common use (eCryptfs
# home folders: 143 bytes; ext4, NTFS, APFS: 255).
MAX_NAME_BYTES = 143
_TAIL_CHARS = 12  # the end of a shortened name kept as it was ("-jig-1" before ".dxf")
_HASH_CHARS = 10


def _clip(text: str, max_bytes: int) -> str:
    """`text` cut to at most `max_bytes` bytes of UTF-8, on a character boundary."""
    return text.encode("utf-8")[:max_bytes].decode("utf-8", "ignore")


def safe_name(name: str, max_bytes: int = MAX_NAME_BYTES) -> str:
    """`name` itself when it fits in `max_bytes` bytes of UTF-8; otherwise its
    beginning, a hash of the whole name, its last characters and its extension
    (deterministic, and distinct for distinct names)."""
    if len(name.encode("utf-8")) <= max_bytes:
        return name
    dot = name.rfind(".")
    ext = name[dot:] if 0 < dot and len(name) - dot <= 10 else ""
    body = name[: len(name) - len(ext)]
    tail = body[-_TAIL_CHARS:]
    digest = hashlib.sha256(name.encode("utf-8")).hexdigest()[:_HASH_CHARS]
    end = f"~{digest}~{tail}{ext}"
    head = _clip(body[: len(body) - len(tail)], max_bytes - len(end.encode("utf-8")))
    return head + end


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


def _os_error(exc: OSError, path: Path, field: str) -> FabplanError:
    """One line naming the file that could not be written and why."""
    cause = exc.strerror or str(exc) or type(exc).__name__
    return FabplanError(f"cannot write: {cause}", field=field, value=str(path))


def _write_file(path: Path, data: bytes) -> None:
    """Write `data` to a new file `path` and flush it to the disk."""
    with open(path, "wb") as fh:
        fh.write(data)
        fh.flush()
        os.fsync(fh.fileno())
    os.chmod(path, 0o644)


def write_bytes(path: str | Path, data: bytes, force: bool = False,
                field: str = "output") -> Path:
    """Write one file atomically: a temporary file in the same folder, renamed
    into place. Returns the path."""
    p = check_writable(path, force, field)
    tmp: str | None = None
    try:
        fd, tmp = tempfile.mkstemp(prefix=f".{_clip(p.name, 40)}.", suffix=".part",
                                   dir=p.parent if str(p.parent) else ".")
        os.close(fd)
        _write_file(Path(tmp), data)
        os.replace(tmp, p)
        tmp = None
    except OSError as exc:
        raise _os_error(exc, p, field) from None
    finally:
        if tmp is not None:
            Path(tmp).unlink(missing_ok=True)
    return p


def write_text(path: str | Path, text: str, force: bool = False, field: str = "output") -> Path:
    return write_bytes(path, text.encode("utf-8"), force, field)


def write_set(folder: str | Path, files: Mapping[str, bytes], force: bool = False,
              field: str = "--output") -> list[Path]:
    """Write every file of `files` ({name: bytes}) into `folder`, all or nothing.

    Names longer than MAX_NAME_BYTES are shortened (`safe_name`). Every target
    is checked first (nothing is replaced without `force`); the files are
    written into a temporary folder beside `folder`, then moved into place.
    Returns the paths written, in name order."""
    out = Path(folder)
    if out.exists() and not out.is_dir():
        raise FabplanError("is a file, not a folder", field=field, value=str(out))
    names = {safe_name(name): name for name in files}
    if len(names) != len(files):  # pragma: no cover - a hash collision
        raise FabplanError("two output names shorten to the same name", field=field,
                           value=str(out))
    targets = [out / name for name in sorted(names)]
    if out.is_dir():
        for t in targets:
            check_writable(t, force, field)
    parent = out.parent if str(out.parent) else Path(".")
    if not parent.is_dir():
        raise FabplanError("its folder does not exist", field=field, value=str(out))
    made_folder = False
    stage: Path | None = None
    moved: list[Path] = []
    put_aside: list[Path] = []
    current = out
    done = False
    try:
        stage = Path(tempfile.mkdtemp(prefix=f".{_clip(out.name, 40)}.", suffix=".part",
                                      dir=parent))
        for t in targets:
            current = t
            _write_file(stage / t.name, files[names[t.name]])
        current = out
        if not out.is_dir():
            out.mkdir()
            made_folder = True
        aside = stage / ".replaced"
        aside.mkdir()
        for t in targets:
            current = t
            # recorded before each rename, so that an interrupt between the two
            # leaves nothing unaccounted for
            if t.exists():
                put_aside.append(t)
                os.replace(t, aside / t.name)
            moved.append(t)
            os.replace(stage / t.name, t)
        done = True
    except OSError as exc:
        raise _os_error(exc, current, field) from None
    finally:
        restored = done or _undo(moved, put_aside, stage, out if made_folder else None)
        if stage is not None and restored:
            shutil.rmtree(stage, ignore_errors=True)
    return targets


def _undo(moved: list[Path], put_aside: list[Path], stage: Path | None,
          made_folder: Path | None) -> bool:
    """Take back a set half moved into place: remove the new files, put back
    the ones they replaced, remove the folder if this run made it. False when a
    replaced file could not be put back (it is then left in the temporary folder)."""
    restored = True
    for t in moved:
        t.unlink(missing_ok=True)
    if stage is not None:
        for t in put_aside:
            kept = stage / ".replaced" / t.name
            if not kept.exists():  # interrupted before it was put aside: still in place
                continue
            try:
                os.replace(kept, t)
            except OSError:  # pragma: no cover - leave it where the user can find it
                restored = False
    if made_folder is not None:
        try:
            made_folder.rmdir()
        except OSError:
            pass
    return restored
