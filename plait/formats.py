"""Reading and writing presentations: braid words, PD codes, plait JSON and JSON Lines."""

from __future__ import annotations

import json
import os
import re
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from typing import Union

from plait.diagrams.pd import PDCode, validate_pd
from plait.errors import InputError
from plait.word import MAX_LENGTH, ClosedBraid, PlatWord

__all__ = [
    "Presentation",
    "parse_word",
    "parse_pd",
    "parse_presentation",
    "presentation_from_obj",
    "presentation_to_obj",
    "read_presentation_file",
    "iter_batch_lines",
    "input_file_errors",
    "BatchItem",
    "FORMAT_TAG",
]

#: A presentation as given by a user: a plat, a closed braid or a PD code.
Presentation = Union[PlatWord, ClosedBraid, PDCode]  # noqa: UP007 (runtime alias)

#: The ``format`` tag written into plait's single-presentation JSON files.
FORMAT_TAG = "plait-presentation/1"

_TOKEN = re.compile(r"[+-]?\d+")
MAX_TEXT = 10_000_000


def parse_word(text: str, what: str = "word") -> tuple[int, ...]:
    """Parse a braid word written as ``1 -2 3``, ``1,-2,3`` or ``[1,-2,3]``.

    Raises
    ------
    InputError
        Naming the first token that is not a nonzero integer.
    """
    if not isinstance(text, str):
        raise InputError(f"{what}: expected text, got {type(text).__name__}")
    if len(text) > MAX_TEXT:
        raise InputError(f"{what}: input of {len(text)} characters is over the limit")
    s = text.strip()
    if s.startswith("["):
        if not s.endswith("]"):
            raise InputError(f"{what}: '[' without a closing ']'")
        s = s[1:-1]
    elif s.endswith("]"):
        raise InputError(f"{what}: ']' without an opening '['")
    tokens = [t for t in re.split(r"[\s,]+", s) if t]
    out = []
    for i, t in enumerate(tokens):
        if not _TOKEN.fullmatch(t):
            raise InputError(f"{what}: token {i + 1} {t!r} is not an integer")
        g = int(t)
        if g == 0:
            raise InputError(f"{what}: token {i + 1} is 0; generators are nonzero integers")
        out.append(g)
        if len(out) > MAX_LENGTH:
            raise InputError(f"{what}: more than {MAX_LENGTH} letters is over the limit")
    return tuple(out)


def parse_pd(text: str) -> PDCode:
    """Parse and validate a PD code written as KnotInfo writes it, e.g.
    ``[[1,5,2,4],[3,1,4,6],[5,3,6,2]]``; the outer brackets may be omitted, and
    ``X[1,5,2,4]`` style crossings are accepted too. An empty code is the unknot."""
    if not isinstance(text, str):
        raise InputError(f"pd: expected text, got {type(text).__name__}")
    if len(text) > MAX_TEXT:
        raise InputError(f"pd: input of {len(text)} characters is over the limit")
    s = text.strip()
    if s in ("", "[]"):
        return validate_pd([])
    s = re.sub(r"\bX\s*\[", "[", s)
    if s.startswith("PD[") or s.startswith("PD("):
        s = s[2:]
    s = s.replace("(", "[").replace(")", "]")
    if not re.fullmatch(r"[\[\]\d\s,+-]*", s):
        bad = next(ch for ch in s if not re.match(r"[\[\]\d\s,+-]", ch))
        raise InputError(f"pd: unexpected character {bad!r}")
    if not s.startswith("[["):
        s = "[" + s + "]"
    try:
        obj = json.loads(s)
    except json.JSONDecodeError as exc:
        raise InputError(f"pd: not a list of crossings ({exc.msg} at character {exc.pos + 1})")\
            from None
    except RecursionError:
        raise InputError("pd: brackets nested too deeply") from None
    if not isinstance(obj, list) or not all(isinstance(c, list) for c in obj):
        raise InputError("pd: expected a list of crossings, each a list of four labels")
    return validate_pd(obj)


def parse_presentation(kind: str, text: str, strands: int | None = None) -> Presentation:
    """Build a presentation from a kind (``plat``, ``braid`` or ``pd``) and its text."""
    if kind == "plat":
        return PlatWord.from_word(parse_word(text, "plat"), strands)
    if kind == "braid":
        return ClosedBraid.from_word(parse_word(text, "braid"), strands)
    if kind == "pd":
        if strands is not None:
            raise InputError("pd: --strands does not apply to a PD code")
        return parse_pd(text)
    raise InputError(f"unknown presentation kind {kind!r}")


def _word_field(obj: dict, key: str) -> tuple[int, ...]:
    val = obj[key]
    if isinstance(val, str):
        return parse_word(val, key)
    if isinstance(val, list):
        for i, g in enumerate(val):
            if isinstance(g, bool) or not isinstance(g, int):
                raise InputError(f"{key}: letter {i + 1} is {g!r}, not an integer")
        return tuple(val)
    raise InputError(f"{key}: expected a list of integers or a word string")


def _strands_field(obj: dict) -> int | None:
    if "strands" not in obj or obj["strands"] is None:
        return None
    n = obj["strands"]
    if isinstance(n, bool) or not isinstance(n, int):
        raise InputError(f"strands: expected an integer, got {n!r}")
    return n


def presentation_from_obj(obj: object) -> Presentation:
    """A presentation from a JSON object with exactly one of ``plat`` (+ ``strands``),
    ``braid`` (+ ``strands``) or ``pd``."""
    if not isinstance(obj, dict):
        raise InputError(f"expected a JSON object, got {type(obj).__name__}")
    keys = [k for k in ("plat", "braid", "pd") if k in obj]
    if len(keys) != 1:
        raise InputError("expected exactly one of the keys 'plat', 'braid', 'pd'"
                         + (f" (found {', '.join(keys)})" if keys else ""))
    key = keys[0]
    if key == "plat":
        return PlatWord.from_word(_word_field(obj, "plat"), _strands_field(obj))
    if key == "braid":
        return ClosedBraid.from_word(_word_field(obj, "braid"), _strands_field(obj))
    if "strands" in obj:
        raise InputError("pd: 'strands' does not apply to a PD code")
    val = obj["pd"]
    if isinstance(val, str):
        return parse_pd(val)
    if not isinstance(val, list):
        raise InputError("pd: expected a list of crossings")
    return validate_pd(val)


def presentation_to_obj(p: Presentation) -> dict:
    """JSON object for a presentation (inverse of :func:`presentation_from_obj`)."""
    if isinstance(p, PlatWord):
        return {"plat": list(p.word), "strands": p.strands}
    if isinstance(p, ClosedBraid):
        return {"braid": list(p.word), "strands": p.strands}
    if isinstance(p, PDCode):
        return {"pd": p.to_list()}
    raise TypeError(f"not a presentation: {p!r}")


@contextmanager
def input_file_errors(path: str | os.PathLike) -> Iterator[None]:
    """Turn the errors of reading an input file into one-line :class:`InputError`."""
    try:
        yield
    except FileNotFoundError:
        raise InputError(f"file not found: {path}") from None
    except IsADirectoryError:
        raise InputError(f"{path} is a folder, not a file") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(f"cannot read {path}: {exc}") from None


def read_presentation_file(path: str | os.PathLike) -> Presentation:
    """Read one presentation from a file.

    Accepted: plait's JSON format (an object with ``format`` = ``plait-presentation/1``
    optional, and one of ``plat``/``braid``/``pd``), a JSON Lines file holding exactly one
    object, or a plain text file holding ``plat: WORD``, ``braid: WORD``, ``pd: CODE``, or
    a bare PD code.
    """
    with input_file_errors(path), open(path, encoding="utf-8") as fh:
        text = fh.read(MAX_TEXT + 1)
    if len(text) > MAX_TEXT:
        raise InputError(f"{path}: file is over the size limit")
    s = text.strip()
    if not s:
        raise InputError(f"{path}: file is empty")
    if s.startswith("{"):
        try:
            obj = json.loads(s)
        except json.JSONDecodeError as exc:
            raise InputError(f"{path}: invalid JSON ({exc.msg}, line {exc.lineno})") from None
        except RecursionError:
            raise InputError(f"{path}: JSON nested too deeply") from None
        if isinstance(obj, dict) and "format" in obj and obj["format"] != FORMAT_TAG:
            raise InputError(f"{path}: unknown format {obj['format']!r}")
        return presentation_from_obj(obj)
    return parse_text_line(s, where=str(path))


def parse_text_line(line: str, where: str = "line") -> Presentation:
    """One presentation from a line of text: ``plat: WORD``, ``braid: WORD``,
    ``pd: CODE`` or a bare PD code (starting with ``[[``)."""
    s = line.strip()
    m = re.match(r"(plat|braid|pd)\s*[:=]\s*(.*)$", s, re.S)
    if m:
        return parse_presentation(m.group(1), m.group(2))
    if s.startswith("[["):
        return parse_pd(s)
    raise InputError(f"{where}: expected 'plat: WORD', 'braid: WORD', 'pd: CODE' or a PD code")


@dataclass(frozen=True)
class BatchItem:
    """One line of a batch file: its id and either a presentation or an error message."""

    id: str
    line: int
    presentation: Presentation | None
    error: str | None = None


def iter_batch_lines(path: str | os.PathLike) -> Iterator[BatchItem]:
    """Items of a batch file: JSON Lines (``{"id": ..., "plat"|"braid"|"pd": ...}``) or
    plain text (one presentation per line, id = line number). Blank lines and lines
    starting with ``#`` are skipped. A malformed line yields an item with ``error`` set."""
    with open(path, encoding="utf-8") as fh:
        for lineno, raw in enumerate(fh, start=1):
            s = raw.strip()
            if not s or s.startswith("#"):
                continue
            if s.startswith("{"):
                try:
                    obj = json.loads(s)
                except json.JSONDecodeError as exc:
                    yield BatchItem(f"line-{lineno}", lineno, None, f"invalid JSON ({exc.msg})")
                    continue
                except RecursionError:
                    yield BatchItem(f"line-{lineno}", lineno, None, "JSON nested too deeply")
                    continue
                ident = obj.get("id", f"line-{lineno}") if isinstance(obj, dict) else None
                ident = str(ident) if ident is not None else f"line-{lineno}"
                try:
                    yield BatchItem(ident, lineno, presentation_from_obj(obj))
                except InputError as exc:
                    yield BatchItem(ident, lineno, None, str(exc))
            else:
                try:
                    yield BatchItem(f"line-{lineno}", lineno, parse_text_line(s, f"line {lineno}"))
                except InputError as exc:
                    yield BatchItem(f"line-{lineno}", lineno, None, str(exc))
