"""Reading a search run folder for pictures: the best plat, the start plat, the moves used."""

from __future__ import annotations

import os
from collections import Counter
from dataclasses import dataclass
from pathlib import Path

from plait.errors import InputError
from plait.word import PlatWord

__all__ = ["RunFolder", "read_run_folder"]


@dataclass(frozen=True)
class RunFolder:
    """What a search run folder holds, as far as pictures need it.

    Attributes
    ----------
    best : PlatWord
        The best plat found (``best.json``).
    start : PlatWord or None
        The plat the search started from: the certificate's start plat when it records
        one, else ``input.json`` converted to a plat; None when neither can be read.
    moves : tuple of (str, int)
        Moves of ``certificate.json`` counted by kind, most used first.
    has_certificate : bool
        Whether ``certificate.json`` was found and read.
    """

    best: PlatWord
    start: PlatWord | None
    moves: tuple[tuple[str, int], ...]
    has_certificate: bool

    def certificate_note(self) -> str:
        """One line naming the moves of the certificate by kind."""
        if not self.has_certificate:
            return "no certificate.json in the run folder"
        total = sum(k for _, k in self.moves)
        if not total:
            return "certificate: no moves"
        kinds = ", ".join(f"{k} \u00d7 {name}" for name, k in self.moves)
        return f"certificate: {total} move{'s' * (total != 1)} ({kinds})"


def _read_json(path: Path) -> object:
    import json

    try:
        return json.loads(path.read_text(encoding="utf-8"))
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(f"cannot read {path}: {exc}") from None
    except json.JSONDecodeError as exc:
        raise InputError(f"{path}: invalid JSON ({exc.msg}, line {exc.lineno})") from None


def _plat_from(obj: object) -> PlatWord | None:
    # A plat from a record such as {"strands": 4, "word": [...]} or {"plat": [...],
    # "strands": 4}, possibly nested one level under "best", "result", "plat" or "start".
    if not isinstance(obj, dict):
        return None
    strands = obj.get("strands")
    for key in ("word", "plat"):
        w = obj.get(key)
        if isinstance(w, str):
            from plait.formats import parse_word

            w = list(parse_word(w, key))
        if isinstance(w, list) and all(isinstance(g, int) and not isinstance(g, bool)
                                       for g in w):
            if isinstance(strands, int) and not isinstance(strands, bool):
                return PlatWord(strands, tuple(w))
            return PlatWord.from_word(w)
    for key in ("best", "result", "plat", "start", "initial"):
        if isinstance(obj.get(key), dict):
            found = _plat_from(obj[key])
            if found is not None:
                return found
    return None


def _start_from_input(obj: object) -> PlatWord | None:
    # input.json holds the start plat ({"plat": {"strands", "word"}}) and/or the
    # presentation as given ({"presentation": {...}} or a bare presentation object).
    plat = _plat_from(obj)
    if plat is not None:
        return plat
    if isinstance(obj, dict):
        from plait.convert import to_plat
        from plait.formats import presentation_from_obj

        pres = obj.get("presentation", obj)
        try:
            return to_plat(presentation_from_obj(pres))
        except (InputError, ImportError):
            return None
    return None


def read_run_folder(folder: str | os.PathLike) -> RunFolder:
    """Read a search run folder: ``best.json``, ``certificate.json`` and ``input.json``.

    Raises
    ------
    InputError
        When ``best.json`` is missing or holds no plat.
    """
    folder = Path(folder)
    best_path = folder / "best.json"
    if not best_path.is_file():
        raise InputError(f"{folder}: no best.json, not a run folder")
    best = _plat_from(_read_json(best_path))
    if best is None:
        raise InputError(f"{best_path}: no plat (expected 'strands' and 'word')")
    moves: Counter[str] = Counter()
    has_cert = False
    start: PlatWord | None = None
    cert_path = folder / "certificate.json"
    if cert_path.is_file():
        cert = _read_json(cert_path)
        has_cert = True
        records = cert.get("moves", []) if isinstance(cert, dict) else cert
        if isinstance(records, list):
            for m in records:
                kind = None
                if isinstance(m, dict):
                    kind = m.get("kind", m.get("move", m.get("type")))
                elif isinstance(m, (list, tuple)) and m and isinstance(m[0], str):
                    kind = m[0]
                moves[str(kind) if kind is not None else "unnamed"] += 1
        if isinstance(cert, dict):
            for key in ("start", "initial", "before"):
                start = start or _plat_from(cert.get(key))
    if start is None and (folder / "input.json").is_file():
        start = _start_from_input(_read_json(folder / "input.json"))
    ranked = tuple(sorted(moves.items(), key=lambda kv: (-kv[1], kv[0])))
    return RunFolder(best, start, ranked, has_cert)
