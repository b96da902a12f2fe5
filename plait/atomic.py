"""Atomic file writes (temporary file, fsync, rename) so that a crash never leaves half a file."""

from __future__ import annotations

import json
import os
import tempfile
from pathlib import Path

from plait.errors import InputError

__all__ = ["write_text_atomic", "write_json_atomic", "append_line_durable"]


def write_text_atomic(path: str | os.PathLike, text: str) -> None:
    """Write ``text`` to ``path`` so that readers see the old file or the new one, never
    a mixture: write a temporary file in the same folder, fsync it, rename it over the
    target, then fsync the folder so the rename itself survives a power cut."""
    path = _writable_target(Path(path))
    fd, tmp = tempfile.mkstemp(prefix="." + path.name + ".", suffix=".tmp", dir=path.parent)
    try:
        with os.fdopen(fd, "w", encoding="utf-8") as fh:
            fh.write(text)
            fh.flush()
            os.fsync(fh.fileno())
        # mkstemp creates 0600 files; give the result the usual umask-based mode
        umask = os.umask(0)
        os.umask(umask)
        os.chmod(tmp, 0o666 & ~umask)
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
        raise
    _fsync_dir(path.parent)


def write_json_atomic(path: str | os.PathLike, obj: object) -> None:
    """:func:`write_text_atomic` of ``obj`` as indented JSON with a final newline."""
    write_text_atomic(path, json.dumps(obj, indent=2, sort_keys=False) + "\n")


def append_line_durable(path: str | os.PathLike, line: str) -> None:
    """Append one line (newline added) and fsync. A single ``write`` of a line below the
    pipe buffer size by the only writer is not interleaved; a torn last line after a
    crash is detected by readers because it lacks its newline."""
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    data = (line.rstrip("\n") + "\n").encode("utf-8")
    fd = os.open(path, os.O_WRONLY | os.O_APPEND | os.O_CREAT, 0o644)
    try:
        view = memoryview(data)
        while view:  # a short write (e.g. a full disk) must not leave half a line unnoticed
            n = os.write(fd, view)
            if n <= 0:
                raise OSError(f"could not append to {path}")
            view = view[n:]
        os.fsync(fd)
    finally:
        os.close(fd)


def _writable_target(path: Path) -> Path:
    # a folder as target, or a file where a parent folder should be, is the caller's
    # mistake: say so in one line instead of failing inside mkdir or mkstemp
    if path.is_dir():
        raise InputError(f"{path} is a folder, not a file")
    for parent in path.parents:
        if parent.exists():
            if not parent.is_dir():
                raise InputError(f"cannot write {path}: {parent} is a file, not a folder")
            break
    path.parent.mkdir(parents=True, exist_ok=True)
    return path


def _fsync_dir(folder: Path) -> None:
    try:
        fd = os.open(folder, os.O_RDONLY)
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)
