"""Move records: the small, serialisable description of one edge of the move graph."""

from __future__ import annotations

from dataclasses import dataclass

from plait.errors import InputError

__all__ = [
    "MoveRecord",
    "MOVE_KINDS",
    "PAIRING_KINDS",
    "REWRITE_KINDS",
    "SYMMETRY_KINDS",
    "NEUTRAL_KINDS",
    "LENGTH_REDUCING_KINDS",
    "BRIDGE_REDUCING_KINDS",
    "GROWING_KINDS",
    "DEFAULT_KINDS",
    "DIAGRAM_KINDS",
    "ARITY",
    "TOP",
    "BOTTOM",
    "fast_plat",
]

#: Side of the word at which a pairing-subgroup element is multiplied or a letter absorbed:
#: ``TOP`` is the cap end (left factor, first letters), ``BOTTOM`` the cup end (right factor).
TOP = 0
BOTTOM = 1

# Move kinds and what their ``args`` mean (positions are 0-based letter indices, pairs
# are 1-based, ``side`` is TOP or BOTTOM, ``e`` is +1 or -1):
#
#   twist    (side, i, e)   multiply by sigma_{2i-1}^e                        (pair i twisted)
#   swap     (side, i, e)   multiply by (s_{2i} s_{2i-1} s_{2i+1} s_{2i})^e    (pairs i, i+1 trade)
#   lthread  (side, i, e)   multiply by (s_{2i} s_{2i-1}^2 s_{2i})^e          (i through arch i+1)
#   rthread  (side, i, e)   multiply by (s_{2i} s_{2i+1}^2 s_{2i})^e          (i+1 through arch i)
#            The product is freely reduced where the factor meets the word.
#   cancel   (p,)           delete letters p, p+1 when they are x, x^-1
#   insert   (p, g)         insert g, -g before letter p
#   commute  (p,)           swap letters p, p+1 when their generators are >= 2 apart
#   braid    (p,)           rewrite letters p..p+2 by the braid relation (any sign form)
#   absorb   (side, p)      delete the odd letter p that commutes with every letter between it
#                           and that end of the word (end absorption of a twist)
#   handle   (p, q)         Dehornoy reduction of the handle spanning letters p..q
#   reduce   (a, b, *w)     replace letters a..b-1 by w, equal to them modulo far commutation
#                           and free cancellation (macro used to record canonicalisation)
#   stab     (j, p, g)      stabilize: new pair j (strands 2j-1, 2j) and letter g at p
#   destab   (j, p)         destabilize: remove pair j whose only crossing is letter p
#   turn     (axis,)        turn the whole plat over by a half turn, a rigid motion: axis 0
#                           (vertical, in the picture) sends s_k to s_{2n-k}; axis 1
#                           (horizontal) reverses the word; axis 2 (perpendicular) does both
#   flype    (c,)           w = A B -> turn-0 of A, then B, where B is letters c.. (allowed
#                           when B^-1 D B lies in the pairing subgroup, D the half twist)
PAIRING_KINDS = frozenset({"twist", "swap", "lthread", "rthread"})
REWRITE_KINDS = frozenset({"cancel", "insert", "commute", "braid", "absorb", "handle", "reduce"})
#: Half-turn symmetries (not enumerated by default; used to connect two plats).
SYMMETRY_KINDS = frozenset({"turn", "flype"})
#   rebridge (k, seeds.., s, (crossing, arc).., a, b, strands, word..)
#                           diagram step: the plat rebuilt from a Wirtinger coloring of its
#                           own diagram with fewer bridges (layout in plait.moves.rebridge)
#: Moves that rebuild the plat from its diagram rather than rewrite the word.
DIAGRAM_KINDS = frozenset({"rebridge"})
MOVE_KINDS = (PAIRING_KINDS | REWRITE_KINDS | SYMMETRY_KINDS | frozenset({"stab", "destab"})
              | DIAGRAM_KINDS)
#: Moves that never change the length (useful plateau moves).
NEUTRAL_KINDS = frozenset({"commute", "braid"})
#: Moves that can only shorten the word (or remove a bridge).
LENGTH_REDUCING_KINDS = frozenset({"cancel", "absorb", "destab"})
#: Moves that remove a bridge.
BRIDGE_REDUCING_KINDS = frozenset({"destab"})
#: Moves that always grow the word or the bridge count (random walks, scrambling).
GROWING_KINDS = frozenset({"insert", "stab"})
#: What :func:`plait.moves.neighbors` enumerates when ``kinds`` is None: every kind but the
#: growing ones, the symmetries, the diagram steps and the ``reduce`` macro (no finite
#: neighbour list).
DEFAULT_KINDS = (MOVE_KINDS - GROWING_KINDS - SYMMETRY_KINDS - frozenset({"reduce"})
                 - DIAGRAM_KINDS)

#: Number of integer arguments of each kind (``reduce`` takes at least 2).
ARITY = {
    "twist": 3, "swap": 3, "lthread": 3, "rthread": 3,
    "cancel": 1, "insert": 2, "commute": 1, "braid": 1, "absorb": 2, "handle": 2,
    "reduce": 2, "stab": 3, "destab": 2, "turn": 1, "flype": 1, "rebridge": 6,
}
#: Kinds whose arity is a minimum (variable-length arguments).
_VARIADIC = frozenset({"reduce", "rebridge"})


@dataclass(frozen=True, slots=True)
class MoveRecord:
    """One move: its kind and integer arguments, enough to replay it.

    Parameters
    ----------
    kind : str
        One of :data:`MOVE_KINDS`.
    args : tuple of int
        Arguments whose meaning depends on ``kind`` (see the table in this module).

    Examples
    --------
    >>> MoveRecord("twist", (0, 1, -1)).to_json()
    ['twist', 0, 1, -1]
    """

    kind: str
    args: tuple[int, ...]

    def to_json(self) -> list:
        """``[kind, *args]``."""
        return [self.kind, *self.args]

    @classmethod
    def from_json(cls, obj: object) -> MoveRecord:
        """Record from ``[kind, *args]`` or ``{"kind": ..., "args": [...]}``.

        Raises
        ------
        InputError
            When the object is not a well-formed record of a known kind.
        """
        if isinstance(obj, dict):
            kind, args = obj.get("kind"), obj.get("args")
        elif isinstance(obj, list) and obj:
            kind, args = obj[0], obj[1:]
        else:
            raise InputError(f"move: expected [kind, args...], got {obj!r:.60}")
        if kind not in MOVE_KINDS:
            raise InputError(f"move: unknown kind {kind!r:.40}")
        if not isinstance(args, list) or any(
            isinstance(a, bool) or not isinstance(a, int) for a in args
        ):
            raise InputError(f"move: arguments of {kind} must be integers")
        need = ARITY[kind]
        if (len(args) != need) if kind not in _VARIADIC else (len(args) < need):
            raise InputError(f"move: {kind} takes {need} arguments, got {len(args)}")
        return cls(kind, tuple(args))

    def __str__(self) -> str:
        return " ".join([self.kind, *map(str, self.args)])


def fast_plat(strands: int, word: tuple[int, ...]):
    """A :class:`~plait.word.PlatWord` built without re-checking its letters.

    Only for words produced by the move code from an already valid plat (the fast path of
    the search); everything read from outside goes through ``PlatWord(...)``.
    """
    from plait.word import PlatWord

    p = object.__new__(PlatWord)
    object.__setattr__(p, "strands", strands)
    object.__setattr__(p, "word", word)
    return p
