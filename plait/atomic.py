"""Atomic file writes (temporary file, fsync, rename) so that a crash never leaves half a file."""

from __future__ import annotations

import json
import os
import tempfile
from pathlib import Path

from plait.errors import InputError

__all__ = ["write_text_atomic", "write_json_atomic", "append_line_durable", "FolderLock",
           "LOCK_FILE"]

#: Name of the lock file that :class:`FolderLock` holds in a folder.
LOCK_FILE = ".lock"


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


class FolderLock:
    """An exclusive, non-blocking ``flock`` on ``DIR/.lock``: one writer per folder.

    The kernel drops the lock when the process dies, even by kill -9, so a crashed run
    never leaves a stale lock behind. On a system without ``fcntl``, or on a file system
    that refuses ``flock`` (some network mounts), nothing is locked.

    Parameters
    ----------
    folder : path-like
        The folder to lock (it must exist).
    busy : str
        What the :class:`~plait.errors.InputError` raised when another process holds the
        lock says after the folder's name, e.g. ``"another plait batch is writing this
        folder"``.
    """

    def __init__(self, folder: str | os.PathLike, busy: str) -> None:
        self.path = Path(folder) / LOCK_FILE
        self.busy = busy
        self.fd: int | None = None

    def __enter__(self) -> FolderLock:
        try:
            import fcntl
        except ImportError:  # not a POSIX system: no lock
            return self
        self.fd = os.open(self.path, os.O_RDWR | os.O_CREAT, 0o644)
        try:
            fcntl.flock(self.fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except BlockingIOError:
            os.close(self.fd)
            self.fd = None
            raise InputError(f"{self.path.parent}: {self.busy}") from None
        except OSError:
            # a file system without flock (some network mounts): go on unlocked rather
            # than refuse to run
            os.close(self.fd)
            self.fd = None
        return self

    def __exit__(self, *exc: object) -> None:
        if self.fd is not None:
            os.close(self.fd)
            self.fd = None
