"""Run folders: the configuration, input, best plat, certificate, search state and log of a run."""

from __future__ import annotations

import json
import os
import tempfile
import time
from pathlib import Path

from plait.atomic import append_line_durable, write_json_atomic, write_text_atomic
from plait.errors import InputError

__all__ = ["RunFolder", "new_run_dir", "DEFAULT_RUNS", "STATE_FORMAT"]

#: Parent folder of run folders when none is given.
DEFAULT_RUNS = "runs"

#: Format tag of ``state.json`` (bumped when the saved search state changes shape).
STATE_FORMAT = "plait-search-state/1"

# The files of a run folder:
#   config.json       strategy, budgets, seed, objective, parameters (written once)
#   input.json        the presentation as given, the start plat and its fingerprints
#   best.json         the best plat so far that passed the guard, with its score
#   certificate.json  moves from the input to best.json's plat (plait verify checks it)
#   state.json        everything needed to continue bit for bit: strategy state, random
#                     generator state, counters, the move-path tree, status
#   log.jsonl         one JSON object per event (start, best, checkpoint, resume, end)
#   .lock             held (flock) by the one process running the search (plait.atomic)


def new_run_dir(parent: str | os.PathLike = DEFAULT_RUNS, prefix: str = "reduce") -> Path:
    """A fresh, uniquely named folder under ``parent`` (created)."""
    parent = Path(parent)
    parent.mkdir(parents=True, exist_ok=True)
    stamp = time.strftime("%Y%m%d-%H%M%S")
    return Path(tempfile.mkdtemp(prefix=f"{prefix}-{stamp}-", dir=parent))


class RunFolder:
    """Reads and writes the files of one run folder, each atomically.

    Parameters
    ----------
    path : path-like
        The folder (created when missing).
    """

    def __init__(self, path: str | os.PathLike) -> None:
        self.path = Path(path)

    # -- paths ------------------------------------------------------------------------
    @property
    def config_path(self) -> Path:
        return self.path / "config.json"

    @property
    def input_path(self) -> Path:
        return self.path / "input.json"

    @property
    def best_path(self) -> Path:
        return self.path / "best.json"

    @property
    def certificate_path(self) -> Path:
        return self.path / "certificate.json"

    @property
    def state_path(self) -> Path:
        return self.path / "state.json"

    @property
    def log_path(self) -> Path:
        return self.path / "log.jsonl"

    # -- writing ----------------------------------------------------------------------
    def create(self) -> None:
        """Make the folder; refuse one that already holds a run."""
        if self.path.exists() and not self.path.is_dir():
            raise InputError(f"run folder {self.path} exists and is not a folder")
        if self.state_path.exists() or self.config_path.exists():
            raise InputError(f"run folder {self.path} already holds a run "
                             f"(continue it with 'plait resume {self.path}')")
        if self.path.is_dir() and any(self.path.iterdir()):
            # never write run files among a user's own files (or overwrite them)
            raise InputError(f"run folder {self.path} is not empty; give a new or empty folder")
        self.path.mkdir(parents=True, exist_ok=True)

    def write(self, name: str, obj: object, compact: bool = False) -> None:
        """Write ``name`` atomically: indented JSON, or one line when ``compact`` (the
        large, machine-read state file)."""
        if compact:
            write_text_atomic(self.path / name, json.dumps(obj, separators=(",", ":")) + "\n")
        else:
            write_json_atomic(self.path / name, obj)

    def log(self, event: str, **fields) -> None:
        """Append one event to ``log.jsonl`` (durably)."""
        rec = {"event": event, "time": round(time.time(), 3), **fields}
        append_line_durable(self.log_path, json.dumps(rec))

    # -- reading ----------------------------------------------------------------------
    def read(self, name: str) -> dict:
        p = self.path / name
        try:
            with open(p, encoding="utf-8") as fh:
                return json.load(fh)
        except FileNotFoundError:
            raise InputError(f"{self.path} is not a run folder ({name} is missing)") from None
        except json.JSONDecodeError as exc:
            raise InputError(f"{p}: invalid JSON ({exc.msg}, line {exc.lineno})") from None

    def read_log(self) -> list[dict]:
        """Events of ``log.jsonl``; a torn last line (crash mid-write) is skipped."""
        out = []
        try:
            with open(self.log_path, encoding="utf-8") as fh:
                for line in fh:
                    if not line.endswith("\n"):
                        break
                    try:
                        out.append(json.loads(line))
                    except json.JSONDecodeError:
                        break
        except FileNotFoundError:
            pass
        return out
