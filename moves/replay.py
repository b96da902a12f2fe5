"""Checked replay of move records, written apart from the enumeration fast path."""

from __future__ import annotations

from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from functools import cache

from plait.moves.pairing import artin_action, in_pairing_subgroup
from plait.moves.records import MoveRecord
from plait.word import MAX_LENGTH, MAX_STRANDS, PlatWord

__all__ = ["ReplayResult", "replay", "check_step", "StepError", "same_modulo_commutation"]


@dataclass(frozen=True)
class ReplayResult:
    """Outcome of :func:`replay`.

    Attributes
    ----------
    ok : bool
        Every step was valid.
    final : PlatWord or None
        The word after the last step (None when a step failed).
    failed_step : int or None
        0-based index of the first invalid step.
    reason : str
        Why that step is invalid ("" when ok).
    steps : int
        Number of steps replayed successfully.
    constructions : int
        How many of those were diagram steps (``rebridge``), checked by rebuilding the
        diagram and rerunning the construction rather than by a rewrite rule.
    """

    ok: bool
    final: PlatWord | None
    failed_step: int | None
    reason: str
    steps: int = 0
    constructions: int = 0


class StepError(Exception):
    """A move whose precondition does not hold."""


# Local pairing-subgroup generators as listed by Hilden (1975), written out once more here
# so that the replay does not share code with the enumeration fast path.
def _listed_generator(kind: str, i: int, n: int) -> tuple[int, ...]:
    a, b, c = 2 * i - 1, 2 * i, 2 * i + 1
    if kind == "twist":
        if not 1 <= i <= n:
            raise StepError(f"pair {i} is not in 1..{n}")
        return (a,)
    if not 1 <= i <= n - 1:
        raise StepError(f"pair {i} is not in 1..{n - 1}")
    return {"swap": (b, a, c, b), "lthread": (b, a, a, b), "rthread": (b, c, c, b)}[kind]


@cache
def _member(word: tuple[int, ...], strands: int) -> bool:
    return in_pairing_subgroup(word, strands)


def _naive_reduce(word: Sequence[int]) -> list[int]:
    # delete x u x^-1 with every letter of u at least two indices away from x, until none
    w = list(word)
    start = 0
    while True:
        hit = None
        for i in range(start, len(w)):
            k = abs(w[i])
            for j in range(i + 1, len(w)):
                y = w[j]
                if y == -w[i]:
                    hit = (i, j)
                    break
                if abs(abs(y) - k) <= 1:
                    break
            if hit:
                break
        if hit is None:
            return w
        i, j = hit
        del w[j]
        del w[i]
        start = 0


def same_modulo_commutation(u: Sequence[int], v: Sequence[int]) -> bool:
    """Whether two braid words are equal modulo far commutation and free cancellation.

    Both are reduced (no ``x u x^-1`` with ``u`` commuting with ``x``); reduced words of
    one element of a right-angled Artin group differ only by commutations, and two words
    are equal modulo commutations exactly when their projections onto every set of
    mutually non-commuting generators (here indices ``{k, k+1}``) agree.

    References
    ----------
    .. [1] P. Cartier and D. Foata, LNM 85 (1969); the projection lemma of trace theory
       (V. Diekert and G. Rozenberg, "The Book of Traces", 1995).
    """
    ru, rv = _naive_reduce(u), _naive_reduce(v)
    if len(ru) != len(rv):
        return False
    top = max((abs(x) for x in ru + rv), default=0)
    for k in range(1, top + 1):
        if [x for x in ru if k <= abs(x) <= k + 1] != [x for x in rv if k <= abs(x) <= k + 1]:
            return False
    return True


def _same_braid_short(u: Sequence[int], v: Sequence[int], strands: int) -> bool:
    # Artin's representation on the free group is faithful: compare images of generators
    return all(artin_action(u, (m,)) == artin_action(v, (m,)) for m in range(1, strands + 1))


_BRAID_SIGNS = {
    (1, 1, 1): (1, 1, 1),
    (-1, -1, -1): (-1, -1, -1),
    (1, 1, -1): (-1, 1, 1),
    (-1, 1, 1): (1, 1, -1),
    (1, -1, -1): (-1, -1, 1),
    (-1, -1, 1): (1, -1, -1),
}


def _int_range(name: str, v: int, lo: int, hi: int) -> None:
    if not lo <= v <= hi:
        raise StepError(f"{name} {v} is not in {lo}..{hi}")


def check_step(
    word: list[int], strands: int, record: MoveRecord
) -> tuple[list[int], int]:
    """Apply one move after checking its precondition.

    Returns
    -------
    (list of int, int)
        New letters and strands.

    Raises
    ------
    StepError
        With a short reason when the precondition fails.
    """
    kind, a = record.kind, record.args
    w, L, n = word, len(word), strands // 2

    def idx(x: int) -> int:
        return x if x > 0 else -x

    if kind in ("twist", "swap", "lthread", "rthread"):
        side, i, e = a
        _int_range("side", side, 0, 1)
        if e not in (1, -1):
            raise StepError(f"sign {e} is not +1 or -1")
        h = _listed_generator(kind, i, n)
        if e == -1:
            h = tuple(-x for x in reversed(h))
        if not _member(h, strands):
            raise StepError(f"{kind} {i} is not in the pairing subgroup")
        out = list(h) + w if side == 0 else w + list(h)
        # free reduction at the junction only
        cut = len(h) if side == 0 else L
        lo, hi = cut - 1, cut
        while lo >= 0 and hi < len(out) and out[lo] == -out[hi]:
            lo -= 1
            hi += 1
        return out[: lo + 1] + out[hi:], strands
    if kind == "cancel":
        (p,) = a
        _int_range("position", p, 0, L - 2)
        if w[p] != -w[p + 1]:
            raise StepError(f"letters {w[p]} {w[p + 1]} at {p} do not cancel")
        return w[:p] + w[p + 2 :], strands
    if kind == "insert":
        p, g = a
        _int_range("position", p, 0, L)
        if g == 0 or idx(g) >= strands:
            raise StepError(f"generator {g} is out of range for {strands} strands")
        if L + 2 > MAX_LENGTH:
            raise StepError("word too long")
        return w[:p] + [g, -g] + w[p:], strands
    if kind == "commute":
        (p,) = a
        _int_range("position", p, 0, L - 2)
        if abs(idx(w[p]) - idx(w[p + 1])) < 2:
            raise StepError(f"letters {w[p]} {w[p + 1]} at {p} do not commute")
        return w[:p] + [w[p + 1], w[p]] + w[p + 2 :], strands
    if kind == "braid":
        (p,) = a
        _int_range("position", p, 0, L - 3)
        x, y, z = w[p : p + 3]
        i, j = idx(x), idx(y)
        signs = (1 if x > 0 else -1, 1 if y > 0 else -1, 1 if z > 0 else -1)
        if idx(z) != i or abs(i - j) != 1 or signs not in _BRAID_SIGNS:
            raise StepError(f"letters {x} {y} {z} at {p} are not a side of a braid relation")
        s1, s2, s3 = _BRAID_SIGNS[signs]
        new = [s1 * j, s2 * i, s3 * j]
        if not _same_braid_short([x, y, z], new, strands):
            raise StepError("braid relation does not hold")  # pragma: no cover (table is right)
        return w[:p] + new + w[p + 3 :], strands
    if kind == "absorb":
        side, p = a
        _int_range("side", side, 0, 1)
        _int_range("position", p, 0, L - 1)
        k = idx(w[p])
        if k % 2 == 0:
            raise StepError(f"letter {w[p]} at {p} is not a twist of a pair")
        between = w[:p] if side == 0 else w[p + 1 :]
        for y in between:
            if abs(idx(y) - k) < 2:
                raise StepError(f"letter {w[p]} at {p} does not commute to the "
                                f"{'top' if side == 0 else 'bottom'} (blocked by {y})")
        return w[:p] + w[p + 1 :], strands
    if kind == "handle":
        p, q = a
        _int_range("position", p, 0, L - 1)
        _int_range("end", q, p + 1, L - 1)
        x = w[p]
        k = idx(x)
        if w[q] != -x:
            raise StepError(f"letters {w[p]} at {p} and {w[q]} at {q} are not a handle's ends")
        e = 1 if x > 0 else -1
        mid: list[int] = []
        for y in w[p + 1 : q]:
            if idx(y) in (k, k - 1):
                raise StepError(f"letter {y} inside the handle at {p}..{q} is on index "
                                f"{idx(y)}")
            if idx(y) == k + 1:
                mid += [-e * (k + 1), k if y > 0 else -k, e * (k + 1)]
            else:
                mid.append(y)
        red: list[int] = []
        for y in mid:
            if red and red[-1] == -y:
                red.pop()
            else:
                red.append(y)
        if q - p + 1 <= 10 and not _same_braid_short(w[p : q + 1], red, strands):
            raise StepError("handle reduction changed the braid")  # pragma: no cover
        return w[:p] + red + w[q + 1 :], strands
    if kind == "reduce":
        lo, hi, new = a[0], a[1], list(a[2:])
        _int_range("start", lo, 0, L)
        _int_range("end", hi, lo, L)
        for g in new:
            if g == 0 or idx(g) >= strands:
                raise StepError(f"generator {g} is out of range for {strands} strands")
        if not same_modulo_commutation(w[lo:hi], new):
            raise StepError(f"new letters differ from letters {lo}..{hi - 1} modulo far "
                            f"commutation and cancellation")
        return w[:lo] + new + w[hi:], strands
    if kind == "stab":
        j, p, g = a
        _int_range("pair", j, 1, n + 1)
        _int_range("position", p, 0, L)
        if strands + 2 > MAX_STRANDS:
            raise StepError("too many strands")
        ok = (j >= 2 and idx(g) == 2 * j - 2) or (j <= n and idx(g) == 2 * j)
        if not ok:
            raise StepError(f"letter {g} does not cross the new pair {j}")
        if 2 <= j <= n and any(idx(y) == 2 * j - 2 for y in w):
            raise StepError(f"pair {j} cannot be inserted: letters cross between pairs "
                            f"{j - 1} and {j}")
        lo = 2 * j - 1
        new = [(y + 2 if y > 0 else y - 2) if idx(y) >= lo else y for y in w]
        return new[:p] + [g] + new[p:], strands + 2
    if kind == "turn":
        (axis,) = a
        _int_range("axis", axis, 0, 2)
        # a half turn of R^3 (rigid motion): about the vertical axis in the picture the
        # positions are mirrored and depth flips, so s_k becomes s_{2n-k}; about the
        # horizontal axis top and bottom trade places and depth flips, so the word is
        # read backwards with the same letters
        v = [(strands - x) if x > 0 else -(strands + x) for x in w] if axis != 1 else list(w)
        return (v[::-1] if axis != 0 else v), strands
    if kind == "flype":
        (c,) = a
        _int_range("cut", c, 0, L)
        if L - c > 40:
            raise StepError(f"flype tail of {L - c} letters is too long to check")
        tail = w[c:]
        d = tuple(k for top in range(strands - 1, 0, -1) for k in range(1, top + 1))
        if not _member(tuple(-x for x in reversed(tail)) + d + tuple(tail), strands):
            raise StepError(f"letters {c}.. conjugate the half twist out of the pairing "
                            "subgroup")
        head = [(strands - x) if x > 0 else -(strands + x) for x in w[:c]]
        return head + w[c:], strands
    if kind == "rebridge":
        from plait.moves.rebridge import RebridgeError, check_rebridge

        try:
            got = check_rebridge(w, strands, a)
        except RebridgeError as exc:
            raise StepError(str(exc)) from None
        return list(got.word), got.strands
    if kind == "destab":
        j, p = a
        if n < 2:
            raise StepError("a plat with one pair cannot be destabilized")
        _int_range("pair", j, 1, n)
        _int_range("position", p, 0, L - 1)
        if idx(w[p]) not in (2 * j - 2, 2 * j):
            raise StepError(f"letter {w[p]} at {p} does not cross pair {j} from outside")
        for q, y in enumerate(w):
            if q != p and 2 * j - 2 <= idx(y) <= 2 * j:
                raise StepError(f"pair {j} is crossed by letter {y} at {q} as well")
        out = []
        for q, y in enumerate(w):
            if q != p:
                out.append((y - 2 if y > 0 else y + 2) if idx(y) > 2 * j else y)
        return out, strands - 2
    raise StepError(f"unknown move kind {kind!r}")


def replay(start: PlatWord, records: Iterable[MoveRecord | list | dict]) -> ReplayResult:
    """Apply move records one by one, checking each precondition.

    Independent of :func:`plait.moves.apply_move`: every rule is re-derived here, local
    braid rewrites are double-checked with Artin's faithful action on the free group, and
    pairing-subgroup factors with the free-group membership test.

    Parameters
    ----------
    start : PlatWord
    records : iterable of MoveRecord (or their JSON forms)

    Returns
    -------
    ReplayResult
        ``ok`` with the final word, or the first failing step and why.

    References
    ----------
    .. [1] J. S. Birman, "On the stable equivalence of plat representations of knots and
       links", Canad. J. Math. 28 (1976).
    """
    w = list(start.word)
    strands = start.strands
    count = built = 0
    for t, rec in enumerate(records):
        try:
            if not isinstance(rec, MoveRecord):
                rec = MoveRecord.from_json(rec)
            w, strands = check_step(w, strands, rec)
        except (StepError, ValueError, TypeError, IndexError) as exc:
            return ReplayResult(False, None, t, f"{_short(rec)}: {exc}", count, built)
        count += 1
        built += rec.kind == "rebridge"
    return ReplayResult(True, PlatWord(strands, tuple(w)), None, "", count, built)


def _short(rec) -> str:
    s = str(rec)
    return s if len(s) <= 80 else s[:77] + "..."
