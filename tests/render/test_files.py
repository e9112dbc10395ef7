"""Writing output files (fabplan/render/files.py): all or nothing, named safely.

Issue 15: a long design-file name made `build` fail after 3 of 5 files; a full
disk left a partial set and an error line without the path; Ctrl-C left
partial sets and 0-byte temporary files."""

from __future__ import annotations

import errno
import os
from pathlib import Path

import pytest

from fabplan.errors import FabplanError
from fabplan.render import files
from fabplan.render.files import MAX_NAME_BYTES, safe_name, write_bytes, write_set

SET = {"b-jig-1.dxf": b"one", "a.json": b"{}", "c.pdf": b"%PDF-1.4 three"}


def _leftovers(folder: Path) -> list[str]:
    """Temporary files or folders (ours start with a dot) anywhere under `folder`."""
    return sorted(str(p) for p in folder.rglob(".*"))


# -- names ----------------------------------------------------------------------------------
def test_short_names_are_kept():
    for name in ("plan.json", "design-jig-1.dxf", "x" * (MAX_NAME_BYTES - 4) + ".pdf"):
        assert safe_name(name) == name


@pytest.mark.parametrize("stem", ["d" * 236, "é" * 200, "a" * 300])
def test_long_names_shortened_unique_and_deterministic(stem):
    names = [f"{stem}-jig-{i}.{ext}" for i in (1, 2, 10) for ext in ("dxf", "svg")]
    short = [safe_name(n) for n in names]
    assert all(len(s.encode("utf-8")) <= MAX_NAME_BYTES for s in short)
    assert len(set(short)) == len(names)  # still distinct
    assert short == [safe_name(n) for n in names]  # the same names every run
    for name, s in zip(names, short):
        assert s.endswith(name[-10:])  # "-jig-1.dxf": which bed and which format
        assert s.startswith(stem[:20])  # and where it came from
        s.encode("utf-8").decode("utf-8")  # cut on a character boundary


def test_a_set_with_a_long_design_name_is_written_whole(tmp_path):
    stem = "d" * 250  # a design file "ddd...d.toml" of 255 bytes, the most ext4 allows
    data = {f"{stem}-jig-{i}.{ext}": f"{i}{ext}".encode() for i in (1, 2) for ext in ("dxf",
                                                                                     "svg")}
    data["plan.json"] = b"{}"
    paths = write_set(tmp_path / "out", data)
    assert len(paths) == 5 and all(p.is_file() for p in paths)
    assert sorted(p.name for p in (tmp_path / "out").iterdir()) == sorted(p.name for p in paths)
    assert sorted(p.read_bytes() for p in paths) == sorted(data.values())
    assert _leftovers(tmp_path) == []


# -- all or nothing -------------------------------------------------------------------------
def test_an_existing_file_is_not_replaced_without_force(tmp_path):
    out = tmp_path / "out"
    out.mkdir()
    (out / "c.pdf").write_bytes(b"mine")
    with pytest.raises(FabplanError, match="already exists; use --force"):
        write_set(out, SET)
    assert sorted(p.name for p in out.iterdir()) == ["c.pdf"]
    assert (out / "c.pdf").read_bytes() == b"mine"
    write_set(out, SET, force=True)
    assert {p.name: p.read_bytes() for p in out.iterdir()} == SET
    assert _leftovers(tmp_path) == []


def _failing_write(monkeypatch, exc: BaseException, after: int) -> list[Path]:
    """Make the `after`+1-th file write fail part-way (some bytes on disk, then `exc`)."""
    real = files._write_file
    seen: list[Path] = []

    def write(path: Path, data: bytes) -> None:
        seen.append(path)
        if len(seen) > after:
            path.write_bytes(data[:1])  # a partial file, as a full disk leaves
            raise exc
        real(path, data)

    monkeypatch.setattr(files, "_write_file", write)
    return seen


def test_a_full_disk_leaves_nothing_and_names_the_path(monkeypatch, tmp_path):
    _failing_write(monkeypatch, OSError(errno.ENOSPC, os.strerror(errno.ENOSPC)), after=2)
    with pytest.raises(FabplanError) as caught:
        write_set(tmp_path / "out", SET)
    line = str(caught.value)
    assert "\n" not in line
    assert str(tmp_path / "out" / "c.pdf") in line and "No space left on device" in line
    assert list(tmp_path.iterdir()) == []  # no folder, no temporary files


def test_a_full_disk_keeps_what_force_would_have_replaced(monkeypatch, tmp_path):
    out = tmp_path / "out"
    out.mkdir()
    (out / "a.json").write_bytes(b"old")
    (out / "other.txt").write_bytes(b"not ours")
    _failing_write(monkeypatch, OSError(errno.ENOSPC, os.strerror(errno.ENOSPC)), after=1)
    with pytest.raises(FabplanError, match="No space left on device"):
        write_set(out, SET, force=True)
    assert {p.name: p.read_bytes() for p in out.iterdir()} == {"a.json": b"old",
                                                                "other.txt": b"not ours"}
    assert _leftovers(tmp_path) == []


def test_an_interrupt_while_writing_leaves_nothing(monkeypatch, tmp_path):
    _failing_write(monkeypatch, KeyboardInterrupt(), after=1)
    with pytest.raises(KeyboardInterrupt):
        write_set(tmp_path / "out", SET)
    assert list(tmp_path.iterdir()) == []


def test_an_interrupt_while_moving_into_place_puts_everything_back(monkeypatch, tmp_path):
    """Ctrl-C between two renames: the files already moved are taken back and the
    ones they replaced (with force) are put back as they were."""
    out = tmp_path / "out"
    out.mkdir()
    old = {"a.json": b"old a", "b-jig-1.dxf": b"old b", "c.pdf": b"old c"}
    for name, data in old.items():
        (out / name).write_bytes(data)
    real = os.replace
    moves: list[tuple[str, str]] = []

    def replace(src, dst):
        moves.append((str(src), str(dst)))
        if len(moves) == 4:  # a.json aside, a.json in, b aside, then Ctrl-C
            raise KeyboardInterrupt
        real(src, dst)

    monkeypatch.setattr(files.os, "replace", replace)
    with pytest.raises(KeyboardInterrupt):
        write_set(out, SET, force=True)
    monkeypatch.setattr(files.os, "replace", real)
    assert {p.name: p.read_bytes() for p in out.iterdir()} == old
    assert _leftovers(tmp_path) == []


# -- one file --------------------------------------------------------------------------------
def test_one_file_on_a_full_disk_leaves_nothing(monkeypatch, tmp_path):
    _failing_write(monkeypatch, OSError(errno.ENOSPC, os.strerror(errno.ENOSPC)), after=0)
    target = tmp_path / "cuts.csv"
    with pytest.raises(FabplanError) as caught:
        write_bytes(target, b"x,y\n", field="--csv")
    assert str(caught.value) == (f"--csv = '{target}': cannot write: No space left on device")
    assert list(tmp_path.iterdir()) == []


def test_one_file_replaced_only_with_force(tmp_path):
    target = tmp_path / "a.txt"
    target.write_bytes(b"mine")
    with pytest.raises(FabplanError, match="already exists"):
        write_bytes(target, b"new")
    assert target.read_bytes() == b"mine"
    write_bytes(target, b"new", force=True)
    assert target.read_bytes() == b"new" and _leftovers(tmp_path) == []
