"""Certificates: a start plat, a list of moves and the claimed end plat, checked by replay."""

from __future__ import annotations

import hashlib
import json
import os
from collections.abc import Iterable
from dataclasses import dataclass, field

from plait.atomic import write_text_atomic
from plait.errors import InputError
from plait.moves.records import MoveRecord
from plait.moves.replay import ReplayResult, replay
from plait.word import PlatWord

__all__ = [
    "CERT_FORMAT",
    "Certificate",
    "write_certificate",
    "load_certificate",
    "verify_certificate",
    "certificate_digest",
]

#: Value of the ``format`` key of a certificate file.
CERT_FORMAT = "plait-certificate/1"
MAX_CERT_BYTES = 200_000_000


@dataclass(frozen=True)
class Certificate:
    """A loaded certificate (see :func:`write_certificate` for the file layout)."""

    start: PlatWord
    records: tuple[MoveRecord, ...]
    end: PlatWord
    input: dict | None = None
    meta: dict = field(default_factory=dict)
    digest: str = ""


def _plat_obj(p: PlatWord) -> dict:
    return {"strands": p.strands, "word": list(p.word)}


def certificate_digest(start: dict, moves: list, end: dict, input_obj: dict | None) -> str:
    """SHA-256 of the certified content (start, moves, end, input) in compact JSON."""
    blob = json.dumps([start, moves, end, input_obj], separators=(",", ":"), sort_keys=True)
    return "sha256:" + hashlib.sha256(blob.encode("utf-8")).hexdigest()


def write_certificate(
    path: str | os.PathLike,
    start: PlatWord,
    records: Iterable[MoveRecord],
    end: PlatWord,
    input_presentation_obj: dict | None = None,
    meta: dict | None = None,
) -> None:
    """Write a certificate file atomically.

    Layout (JSON object): ``format`` (``"plait-certificate/1"``), ``start`` and ``end``
    (``{"strands": int, "word": [int, ...]}``), ``moves`` (a list of ``[kind, *args]``,
    see :mod:`plait.moves.records`), ``input`` (the presentation the start plat was made
    from, as in plait's presentation JSON, or null), ``meta`` (free-form, not certified)
    and ``digest`` (SHA-256 of start, moves, end and input, required). The replay, not the
    digest, proves the claim: an edit with a recomputed digest is caught by the replay
    unless the edited file is itself a valid proof; the digest flags every other edit.
    """
    s, e = _plat_obj(start), _plat_obj(end)
    moves = [r.to_json() for r in records]
    obj = {
        "format": CERT_FORMAT,
        "claim": "end has the same plat closure as start (each move keeps the link type)",
        "start": s,
        "end": e,
        "input": input_presentation_obj,
        "moves": moves,
        "meta": meta or {},
        "digest": certificate_digest(s, moves, e, input_presentation_obj),
    }
    write_text_atomic(path, _layout(obj))


def _layout(obj: dict) -> str:
    # one key per line and one move per line: readable, diffable, and still plain JSON
    lines = ["{"]
    items = list(obj.items())
    for t, (k, v) in enumerate(items):
        end = "," if t + 1 < len(items) else ""
        if k == "moves":
            lines.append('  "moves": [')
            for u, m in enumerate(v):
                lines.append("    " + json.dumps(m) + ("," if u + 1 < len(v) else ""))
            lines.append("  ]" + end)
        else:
            lines.append(f"  {json.dumps(k)}: {json.dumps(v)}{end}")
    lines.append("}")
    return "\n".join(lines) + "\n"


def _plat_field(obj: dict, key: str) -> PlatWord:
    v = obj.get(key)
    if not isinstance(v, dict) or "strands" not in v or "word" not in v:
        raise InputError(f"certificate: '{key}' must be an object with 'strands' and 'word'")
    word = v["word"]
    if not isinstance(word, list):
        raise InputError(f"certificate: '{key}.word' must be a list of integers")
    return PlatWord(v["strands"], tuple(word))


def load_certificate(path: str | os.PathLike) -> Certificate:
    """Read and parse a certificate file.

    Raises
    ------
    InputError
        When the file cannot be read or is not a well-formed certificate (CLI exit 2).
    """
    try:
        size = os.path.getsize(path)
        if size > MAX_CERT_BYTES:
            raise InputError(f"certificate: {path} is over {MAX_CERT_BYTES} bytes")
        with open(path, encoding="utf-8") as fh:
            obj = json.load(fh)
    except InputError:
        raise
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(f"certificate: cannot read {path}: {exc.__class__.__name__}") from None
    except json.JSONDecodeError as exc:
        raise InputError(f"certificate: {path} is not JSON (line {exc.lineno})") from None
    except RecursionError:
        raise InputError(f"certificate: {path} is JSON nested too deeply") from None
    return certificate_from_obj(obj)


def certificate_from_obj(obj: object) -> Certificate:
    """A :class:`Certificate` from its parsed JSON object (see :func:`load_certificate`)."""
    if not isinstance(obj, dict):
        raise InputError("certificate: expected a JSON object")
    if obj.get("format") != CERT_FORMAT:
        raise InputError(f"certificate: 'format' must be {CERT_FORMAT!r}")
    start = _plat_field(obj, "start")
    end = _plat_field(obj, "end")
    moves = obj.get("moves")
    if not isinstance(moves, list):
        raise InputError("certificate: 'moves' must be a list")
    records = []
    for t, m in enumerate(moves):
        try:
            records.append(MoveRecord.from_json(m))
        except InputError as exc:
            raise InputError(f"certificate: step {t}: {exc}") from None
    inp = obj.get("input")
    if inp is not None and not isinstance(inp, dict):
        raise InputError("certificate: 'input' must be an object or null")
    meta = obj.get("meta") or {}
    if not isinstance(meta, dict):
        raise InputError("certificate: 'meta' must be an object")
    digest = obj.get("digest")
    if not isinstance(digest, str):
        raise InputError("certificate: 'digest' must be a string (sha256 of the content)")
    return Certificate(start, tuple(records), end, inp, meta, digest)


def _check_input(cert: Certificate) -> str:
    # the start plat must be the given presentation (plat or closed braid), or at least
    # have as many components as a given PD code
    from plait.diagrams.pd import PDCode, pd_components
    from plait.formats import presentation_from_obj
    from plait.word import ClosedBraid

    pres = presentation_from_obj(cert.input)
    if isinstance(pres, ClosedBraid):
        pres = pres.to_plat()
    if isinstance(pres, PlatWord):
        if pres != cert.start:
            return "start word is not the plat of the input presentation"
    elif isinstance(pres, PDCode):
        comps = len(pd_components(pres)) if pres.crossings else 1
        if comps != cert.start.components:
            return (f"start word has {cert.start.components} components, the input PD code "
                    f"{comps}")
        # the diagram -> plat step is not a sequence of moves; it is checked the way the
        # conversion itself is guarded: same Jones polynomial as the PD code (for links,
        # under some orientation of its components)
        from plait.diagrams.fromdiagram import check_plat
        from plait.errors import GuardViolation

        try:
            check_plat(pres, cert.start)
        except GuardViolation as exc:
            return f"start word is not a plat of the input PD code ({exc.invariant} differs)"
    return ""


def verify_certificate(cert: str | os.PathLike | Certificate) -> ReplayResult:
    """Check a certificate: digest, input presentation, every move, and the end word.

    Returns
    -------
    ReplayResult
        ``ok`` when every check passes; otherwise ``failed_step`` is the index of the
        first invalid move (``len(moves)`` when the claimed end word differs from the
        replayed one, None for a digest or input mismatch) and ``reason`` says why.

    Raises
    ------
    InputError
        When the file is unreadable or malformed.
    """
    if not isinstance(cert, Certificate):
        cert = load_certificate(cert)
    want = certificate_digest(_plat_obj(cert.start), [r.to_json() for r in cert.records],
                              _plat_obj(cert.end), cert.input)
    if want != cert.digest:
        return ReplayResult(False, None, None, "digest does not match the certified "
                            "content (start, moves, end or input was edited)")
    if cert.input is not None:
        why = _check_input(cert)
        if why:
            return ReplayResult(False, None, None, why)
    res = replay(cert.start, cert.records)
    if not res.ok:
        return res
    if res.final != cert.end:
        return ReplayResult(False, None, len(cert.records), "claimed end word differs from "
                            "the word the moves produce", res.steps)
    return res
