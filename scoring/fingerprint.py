"""Fingerprints bundling link invariants, and the guard that compares two of them."""

from __future__ import annotations

from dataclasses import dataclass, field
from fractions import Fraction

from plait.errors import GuardViolation, InputError
from plait.scoring import laurent as lp
from plait.scoring.alexander import (
    alexander,
    alexander_matrix,
    determinant,
    fox_coloring_dimension,
    invariant_factor_count,
    module_bound_rings,
)
from plait.scoring.jones import MAX_JONES_BRIDGES, jones, mirror_jones
from plait.scoring.orientation import linking_matrix
from plait.scoring.signature import signature
from plait.word import PlatWord

__all__ = [
    "Fingerprint", "fingerprint", "guard", "same_up_to_mirror", "LEVELS", "FOX_PRIMES",
    "CHEAP_JONES_BRIDGES",
]

LEVELS = ("cheap", "full")
FOX_PRIMES = (3, 5, 7)
# The cheap level computes Jones up to this many bridges (Catalan(8) = 1430 states).
CHEAP_JONES_BRIDGES = 8


@dataclass(frozen=True)
class Fingerprint:
    """Invariants of one link, as computed from one presentation.

    Attributes
    ----------
    level : str
        ``"cheap"`` (components, linking numbers, determinant, Jones) or ``"full"``
        (also Alexander polynomial, Fox colorings and Alexander-module counts).
    components : int
    linking : list of list of int
        Linking matrix in plait's component numbering and orientation (compared only up
        to renumbering and reorientation, see :func:`guard`).
    determinant : int
    jones : dict or None
        ``{Fraction exponent: coefficient}``; ``None`` when the plat has too many bridges
        for the state vector.
    alexander : dict or None
        ``{int exponent: coefficient}`` (full level).
    fox : dict or None
        ``{p: dimension of Fox p-colorings}`` for p = 3, 5, 7 (full level).
    module : dict or None
        ``{ring: number of non-unit invariant factors minus one}`` over ``F_p[t,t^-1]``
        (key ``"F_p"``) and ``Q[t,t^-1]`` (key ``"Q"``) (full level).
    signature : int or None
        Knot signature (Gordon–Litherland, KnotInfo's sign convention), full level and
        knots only: it separates pairs that Jones and Alexander do not (10_132 and 5_1).
    """

    level: str
    components: int
    linking: list = field(default_factory=list)
    determinant: int = 0
    jones: dict | None = None
    alexander: dict | None = None
    fox: dict | None = None
    module: dict | None = None
    signature: int | None = None

    def __hash__(self) -> int:  # dicts inside: hash the JSON form
        import json

        return hash(json.dumps(self.to_json(), sort_keys=True))

    def to_json(self) -> dict:
        """A JSON-ready dict: polynomials as ``[[exponent, coefficient], ...]`` sorted by
        exponent, exponents as numbers (half-integers as floats such as ``0.5``)."""
        return {
            "level": self.level,
            "components": self.components,
            "linking": [list(r) for r in self.linking],
            "determinant": self.determinant,
            "jones": None if self.jones is None else _poly_to_json(self.jones),
            "alexander": None if self.alexander is None else _poly_to_json(self.alexander),
            "fox": None if self.fox is None else {str(p): d for p, d in sorted(self.fox.items())},
            "module": None if self.module is None else dict(sorted(self.module.items())),
            "signature": self.signature,
        }

    @classmethod
    def from_json(cls, obj: dict) -> Fingerprint:
        """Inverse of :meth:`to_json`.

        Raises
        ------
        InputError
            When a field is missing or malformed.
        """
        try:
            return cls(
                level=str(obj["level"]),
                components=int(obj["components"]),
                linking=[[int(x) for x in r] for r in obj.get("linking", [])],
                determinant=int(obj["determinant"]),
                jones=None if obj.get("jones") is None else {
                    Fraction(str(e)): int(c) for e, c in obj["jones"]},
                alexander=None if obj.get("alexander") is None else {
                    int(e): int(c) for e, c in obj["alexander"]},
                fox=None if obj.get("fox") is None else {
                    int(p): int(d) for p, d in obj["fox"].items()},
                module=None if obj.get("module") is None else {
                    str(k): int(v) for k, v in obj["module"].items()},
                signature=None if obj.get("signature") is None else int(obj["signature"]),
            )
        except (KeyError, TypeError, ValueError) as exc:
            raise InputError(f"fingerprint: malformed JSON ({exc.__class__.__name__}: {exc})"
                             ) from None


def _poly_to_json(p: dict) -> list[list]:
    out = []
    for e, c in sorted(p.items()):
        e = Fraction(e)
        out.append([int(e) if e.denominator == 1 else float(e), int(c)])
    return out


def fingerprint(plat: PlatWord, level: str = "cheap") -> Fingerprint:
    """Compute the invariants of a plat closure.

    Parameters
    ----------
    plat : PlatWord
    level : {"cheap", "full"}
        ``"cheap"``: components, linking matrix, determinant and Jones polynomial (all
        linear in the word length for a fixed number of bridges; Jones is skipped above
        :data:`CHEAP_JONES_BRIDGES` bridges, and above
        :data:`plait.scoring.jones.MAX_JONES_BRIDGES` at the full level). ``"full"``
        adds the Alexander polynomial, Fox 3-, 5- and 7-coloring dimensions, the
        Alexander-module invariant factor counts and, for knots, the signature.

    Returns
    -------
    Fingerprint
    """
    if level not in LEVELS:
        raise InputError(f"fingerprint: level must be one of {', '.join(LEVELS)}, got {level!r}")
    kw: dict = {
        "level": level,
        "components": plat.components,
        "linking": linking_matrix(plat),
        "determinant": determinant(plat),
        "jones": jones(plat) if plat.bridges <= (
            CHEAP_JONES_BRIDGES if level == "cheap" else MAX_JONES_BRIDGES) else None,
    }
    if level == "full":
        kw["alexander"] = alexander(plat)
        kw["fox"] = {p: fox_coloring_dimension(plat, p) for p in FOX_PRIMES}
        M = alexander_matrix(plat)
        kw["module"] = {("Q" if p is None else f"F_{p}"): invariant_factor_count(M, p) - 1
                        for p in module_bound_rings(plat)}
        if kw["components"] == 1:
            kw["signature"] = signature(plat)
    return Fingerprint(**kw)


# -- comparison ---------------------------------------------------------------------------


def _linking_key(m: list) -> list[int]:
    # Renumbering components permutes the matrix and reorienting one negates a row and a
    # column; the sorted absolute off-diagonal entries survive both.
    return sorted(abs(m[i][j]) for i in range(len(m)) for j in range(i + 1, len(m)))


def _jones_key(v: dict, components: int) -> dict:
    # For links, reversing one component multiplies V by t^(3 lambda) (lambda its total
    # linking number with the rest); compare links up to that shift.
    if components <= 1 or not v:
        return dict(v)
    lo = min(v)
    return {e - lo: c for e, c in sorted(v.items())}


def _differences(a: Fingerprint, b: Fingerprint, mirror: bool) -> list[tuple[str, object, object]]:
    out: list[tuple[str, object, object]] = []
    if a.components != b.components:
        return [("components", a.components, b.components)]
    if _linking_key(a.linking) != _linking_key(b.linking):
        out.append(("linking numbers", a.linking, b.linking))
    if a.determinant != b.determinant:
        out.append(("determinant", a.determinant, b.determinant))
    if a.fox is not None and b.fox is not None:
        for p in sorted(set(a.fox) & set(b.fox)):
            if a.fox[p] != b.fox[p]:
                out.append((f"Fox {p}-coloring dimension", a.fox[p], b.fox[p]))
    if a.jones is not None and b.jones is not None:
        va = _jones_key(a.jones, a.components)
        vb_raw = mirror_jones(b.jones) if mirror else b.jones
        vb = _jones_key(vb_raw, b.components)
        if va != vb:
            out.append(("Jones polynomial", a.jones, b.jones))
    # the single-variable Alexander polynomial and module of a link depend on the
    # orientation of its components; they are compared for knots only
    if a.components == 1 and a.alexander is not None and b.alexander is not None:
        if not lp.equal_up_to_unit(a.alexander, b.alexander):
            out.append(("Alexander polynomial", a.alexander, b.alexander))
    if a.components == 1 and a.module is not None and b.module is not None:
        for r in sorted(set(a.module) & set(b.module)):
            if a.module[r] != b.module[r]:
                out.append((f"Alexander module over {r}[t,t^-1]", a.module[r], b.module[r]))
    if a.components == 1 and a.signature is not None and b.signature is not None:
        sb = -b.signature if mirror else b.signature
        if a.signature != sb:
            out.append(("signature", a.signature, b.signature))
    return out


def guard(before: Fingerprint, after: Fingerprint, detail: str = "",
          mirror_ok: bool = False) -> None:
    """Raise if two fingerprints cannot be of the same link.

    Invariants present in both are compared (a cheap and a full fingerprint compare on
    the cheap part). Linking numbers are compared up to renumbering and reorientation of
    components; for links the Jones polynomial is compared up to a power of ``t`` (the
    effect of reversing a component) and the Alexander polynomial and module are not
    compared (they depend on orientations).

    Parameters
    ----------
    before, after : Fingerprint
    detail : str
        Context for the message, e.g. the move that was applied.
    mirror_ok : bool
        Also accept ``after`` being the mirror image (see :func:`same_up_to_mirror`).

    Raises
    ------
    GuardViolation
        Naming the first invariant that differs.
    """
    diffs = _differences(before, after, mirror=False)
    if diffs and mirror_ok:
        mdiffs = _differences(before, after, mirror=True)
        if not mdiffs:
            return
    if diffs:
        name, x, y = diffs[0]
        raise GuardViolation(name, x, y, detail)


def same_up_to_mirror(a: Fingerprint, b: Fingerprint) -> bool:
    """Whether ``b`` agrees with ``a`` or with the mirror image of ``a``.

    Useful when one fingerprint comes from a PD code whose chirality convention is not
    known: mirroring sends ``V(t)`` to ``V(1/t)`` and keeps the (symmetric) Alexander
    polynomial, determinant, Fox colorings and module counts.
    """
    return not _differences(a, b, mirror=False) or not _differences(a, b, mirror=True)
