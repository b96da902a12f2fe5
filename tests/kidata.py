"""KnotInfo rows for tests, parsed into plait's types (source: KnotInfo via database-knotinfo)."""

from __future__ import annotations

import json
import re
from dataclasses import dataclass
from fractions import Fraction
from functools import cache

__all__ = ["KnotRow", "knots", "parse_laurent", "knot"]


def parse_laurent(text: str, var: str = "t") -> dict[Fraction, int]:
    """Parse a KnotInfo polynomial string such as ``'t^(-2)-t^(-1)+ 1-t+ t^2'`` or
    ``'-x-x^5'`` into ``{exponent: coefficient}`` (exponents as Fractions)."""
    s = text.replace(" ", "").replace("sqrt(" + var + ")", var + "^(1/2)")
    # 13-crossing rows write negative powers as quotients: '-4/t^7', '52/t'
    s = re.sub(rf"(\d*)/{var}\^\(?(\d+)\)?",
               lambda m: f"{m.group(1) or 1}*{var}^(-{m.group(2)})", s)
    s = re.sub(rf"(\d*)/{var}(?![\w^])", lambda m: f"{m.group(1) or 1}*{var}^(-1)", s)
    if not s:
        return {}
    terms, depth, cur = [], 0, ""
    for ch in s:
        if ch in "+-" and depth == 0 and cur and not cur.endswith("^"):
            terms.append(cur)
            cur = ch
        else:
            depth += ch == "("
            depth -= ch == ")"
            cur += ch
    if cur:
        terms.append(cur)
    out: dict[Fraction, int] = {}
    for t in terms:
        m = re.fullmatch(
            rf"([+-]?)(\d*)\*?(?:({var})(?:\^\(?([+-]?\d+(?:/\d+)?)\)?)?)?", t)
        if not m:
            raise ValueError(f"cannot parse term {t!r} of {text!r}")
        sign, coeff, v, exp = m.groups()
        c = int(coeff) if coeff else 1
        if sign == "-":
            c = -c
        e = Fraction(exp) if exp else (Fraction(1) if v else Fraction(0))
        out[e] = out.get(e, 0) + c
    return {e: c for e, c in out.items() if c}


@dataclass(frozen=True)
class KnotRow:
    """One KnotInfo knot: name, crossing number, first braid word, PD code, Jones and
    Alexander polynomials ({exponent: coefficient}), determinant, bridge index (None when
    KnotInfo gives a range) and Nakanishi index."""

    name: str
    crossings: int
    braid: tuple[int, ...]
    pd: list[list[int]]
    jones: dict
    alexander: dict
    determinant: int
    bridge_index: int | None
    nakanishi_index: int | None


def _int_or_none(s: str | None) -> int | None:
    try:
        return int(s) if s not in (None, "") else None
    except ValueError:
        return None


@cache
def knots(max_crossings: int = 10, min_crossings: int = 3) -> tuple[KnotRow, ...]:
    """KnotInfo knots with ``min_crossings <= crossing number <= max_crossings``."""
    from database_knotinfo import link_list

    rows = []
    for k in link_list():
        try:
            c = int(k["crossing_number"])
        except (TypeError, ValueError):
            continue
        if c < min_crossings or c > max_crossings:
            continue
        braid = json.loads(k["braid_notation"]) if k["braid_notation"] else []
        if braid and isinstance(braid[0], list):
            braid = braid[0]
        rows.append(KnotRow(
            name=k["name"],
            crossings=c,
            braid=tuple(braid),
            pd=json.loads(k["pd_notation"]) if k["pd_notation"] else [],
            jones=parse_laurent(k["jones_polynomial"]),
            alexander=parse_laurent(k["alexander_polynomial"]),
            determinant=int(k["determinant"]),
            bridge_index=_int_or_none(k["bridge_index"]),
            nakanishi_index=_int_or_none(k["nakanishi_index"]),
        ))
    return tuple(rows)


def knot(name: str) -> KnotRow:
    """One knot by KnotInfo name, e.g. ``'3_1'`` or ``'10_132'``."""
    c = int(re.match(r"(\d+)", name).group(1))
    for k in knots(c, c):
        if k.name == name:
            return k
    raise KeyError(name)
