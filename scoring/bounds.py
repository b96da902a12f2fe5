"""Lower bounds on the bridge number of a plat closure, each with the theorem that proves it."""

from __future__ import annotations

import time as _time
from collections.abc import Callable
from contextvars import ContextVar
from dataclasses import dataclass, field
from fractions import Fraction
from functools import cache, lru_cache

from plait.word import PlatWord

__all__ = [
    "LowerBound",
    "bridge_lower_bound",
    "not_two_bridge",
    "separating_invariants",
    "FOX_PRIMES",
    "check_budget",
]

#: Primes tried for Fox colorings besides those dividing the determinant.
FOX_PRIMES = (3, 5, 7)

#: Label operations per target in the search for b >= 4 and more.
RANK_BUDGET = 1_000_000

#: CPU seconds from which the search for b >= 4 tries every group of
#: :data:`plait.scoring.quandles.LONG_TARGETS` with no per-target operation cap.
LONG_BUDGET = 10.0

#: A homomorphism search gives up (and its count is not used) after this many label
#: operations.
QUOTIENT_BUDGET = 3_000_000


@dataclass(frozen=True)
class LowerBound:
    """A proved lower bound on the bridge number.

    Attributes
    ----------
    value : int
        The bound: the bridge number is at least this.
    reasons : tuple of str
        One line per bound that was proved, naming the theorem and the computed quantity.
    method : str
        Short name of the method that proved ``value`` (the first reason reaching it).
    exact : bool
        Whether ``value`` is attained by the plat itself (its bridge count equals it).
    """

    value: int
    reasons: tuple[str, ...] = field(default=())
    method: str = ""
    exact: bool = False

    def to_dict(self) -> dict:
        """JSON-ready form: ``value``, ``reasons`` (list of strings), ``method``, ``exact``."""
        return {"value": self.value, "reasons": list(self.reasons), "method": self.method,
                "exact": self.exact}


# -- invariants used to tell a plat from the two-bridge candidates ---------------------


def _shift_class(poly: dict) -> tuple:
    """A Laurent polynomial up to multiplication by a power of the variable."""
    if not poly:
        return ()
    low = min(poly)
    return tuple(sorted((e - low, c) for e, c in poly.items()))


@cache
def separating_invariants(components: int) -> tuple[tuple[str, Callable[[PlatWord], object]], ...]:
    """The invariants compared against the two-bridge candidates, cheapest first.

    For a knot: Alexander polynomial, Jones polynomial, signature, then the numbers of
    homomorphisms onto each group of :data:`plait.scoring.quotients.TARGETS`. For a
    two-component link the comparison must ignore orientations (Schubert's classification
    is of unoriented links): the Jones polynomial up to a power of ``t`` (reversing one
    component multiplies it by a power of ``t``: Morton 1986; Lickorish, An Introduction
    to Knot Theory, 1997, Prop. 3.7) and homomorphism counts for classes closed under
    inversion. A function returns None when its value was not computed (a homomorphism
    search over its budget, :data:`QUOTIENT_BUDGET` label operations).

    Returns
    -------
    tuple of (name, function)
    """
    from plait.scoring.jones import jones
    from plait.scoring.quotients import TARGETS, count_homomorphisms, target
    from plait.scoring.signature import signature

    def alex(p: PlatWord) -> object:
        from plait.scoring.alexander import alexander

        return tuple(sorted(alexander(p).items()))

    def jones_exact(p: PlatWord) -> object:
        return tuple(sorted(jones(p).items()))

    def jones_shift(p: PlatWord) -> object:
        return _shift_class(jones(p))

    def homs(name: str) -> Callable[[PlatWord], object]:
        return lambda p: count_homomorphisms(p, name, QUOTIENT_BUDGET)

    if components == 1:
        out: list[tuple[str, Callable[[PlatWord], object]]] = [
            ("Alexander polynomial", alex),
            ("Jones polynomial", jones_exact),
            ("signature", signature),
        ]
        names = TARGETS
    else:
        out = [("Jones polynomial up to a power of t", jones_shift)]
        names = tuple(n for n in TARGETS if target(n).inverse_closed)
    out += [(f"number of homomorphisms onto {n}", homs(n)) for n in names]
    return tuple(out)


@lru_cache(maxsize=65536)
def _candidate_value(components: int, index: int, p: int, q: int) -> object:
    from plait.scoring.twobridge import two_bridge_plat

    return separating_invariants(components)[index][1](two_bridge_plat(p, q))


def _describe(p: int, q: int) -> str:
    if p == 1:
        return "the unknot"
    if p == 0:
        return "the 2-component unlink"
    return f"S({p},{q})"


# (plat, det) -> (proved, reason); results cut short by a time budget are not kept
_NOT_TWO_BRIDGE_CACHE: dict[tuple[PlatWord, int], tuple[bool, str]] = {}


def _not_two_bridge(plat: PlatWord, det: int) -> tuple[bool, str]:
    key = (plat, det)
    if key in _NOT_TWO_BRIDGE_CACHE:
        return _NOT_TWO_BRIDGE_CACHE[key]
    out = _not_two_bridge_uncached(plat, det)
    if not (_DEADLINE.get() is not None and "time budget" in out[1]):
        if len(_NOT_TWO_BRIDGE_CACHE) >= 4096:
            _NOT_TWO_BRIDGE_CACHE.clear()
        _NOT_TWO_BRIDGE_CACHE[key] = out
    return out


def _not_two_bridge_uncached(plat: PlatWord, det: int) -> tuple[bool, str]:
    from plait.scoring.twobridge import MAX_DETERMINANT, two_bridge_classes

    comps = plat.components
    if comps >= 3:
        return True, f"{comps} components; a 2-bridge link has at most 2"
    if plat.bridges <= 2:
        return False, f"the plat itself has {plat.bridges} bridge{'s' * (plat.bridges > 1)}"
    if comps == 2 and det % 2:
        return True, f"determinant {det} is odd; a 2-component 2-bridge link S(p,q) has p even"
    if comps == 1 and det % 2 == 0:
        return True, f"determinant {det} is even; a 2-bridge knot S(p,q) has p odd"
    why = _listing_free_obstruction(plat, det)
    if why is not None:
        return True, why
    if _out_of_time():
        return False, _not_tried("listing the 2-bridge candidates")
    if det > MAX_DETERMINANT:
        return False, (f"not tried: listing the 2-bridge candidates of determinant {det} "
                       f"(over the limit of {MAX_DETERMINANT} for its cost); "
                       f"{_LISTING_FREE_PASSED}")
    # shortest normal forms first: their invariants are the cheapest (for a budget)
    classes = tuple(sorted(two_bridge_classes(det), key=lambda q: _cf_length(det, q)))
    classes, cut = _linking_form_cut(plat, det, classes)
    kind = "knot" if comps == 1 else "2-component link"
    if not classes:
        return True, (f"every 2-bridge {kind} of determinant {det} is one of the Schubert "
                      f"normal forms S({det},q) (mirrors included): {cut}")
    invariants = separating_invariants(comps)
    ours: dict[int, object] = {}
    used: dict[str, list[str]] = {}
    for done, q in enumerate(classes):
        if done and _out_of_time():
            return False, _not_tried(f"comparing the 2-bridge candidates of determinant "
                                     f"{det} after {done} of {len(classes)}")
        ruled = None
        for i, (name, fn) in enumerate(invariants):
            if i not in ours:
                ours[i] = fn(plat)
            if ours[i] is None:
                continue  # not computed within budget
            if _candidate_value(comps, i, det, q) != ours[i]:
                ruled = name
                break
        if ruled is None:
            tried = [invariants[i][0] for i, v in ours.items() if v is not None]
            return False, (f"{_describe(det, q)} agrees with it on every invariant computed "
                           f"({_summarize(tried)}); it may be 2-bridge")
        used.setdefault(ruled, []).append(_describe(det, q))
    listing = "; ".join(f"{', '.join(names)} by the {inv}" for inv, names in used.items())
    if cut:
        listing = f"{cut}; the other {len(classes)}: {listing}"
        return True, (f"every 2-bridge {kind} of determinant {det} is one of the Schubert "
                      f"normal forms S({det},q) (mirrors included) and each differs: "
                      f"{listing}")
    return True, (f"every 2-bridge {kind} of determinant {det} is one of {len(classes)} "
                  f"Schubert normal forms (mirrors included) and each differs: {listing}")


_LISTING_FREE_PASSED = ("its Jones and Alexander polynomials alternate and H_1 of its double "
                        "branched cover is cyclic, as for a 2-bridge link")


def _cf_length(p: int, q: int) -> int:
    """Crossings of Schubert's normal form of ``S(p, q)``: the sum of the terms of the
    continued fraction of ``p/q`` (Euclid's quotients)."""
    total = 0
    while q:
        total += p // q
        p, q = q, p % q
    return total


def _format_homology(h: tuple[int, ...]) -> str:
    return " ⊕ ".join("Z" if d == 0 else f"Z/{d}" for d in h) if h else "0"


def _listing_free_obstruction(plat: PlatWord, det: int) -> str | None:
    """A reason why the plat closure (a knot or 2-component link with bridges >= 3) is
    not 2-bridge that lists no candidates, or None.

    * The double branched cover of ``S(p, q)`` is the lens space ``L(p, q)`` (Schubert
      1956), so ``H_1`` is cyclic: at most one non-trivial invariant factor of the
      coloring matrix (:func:`plait.scoring.goeritz.double_cover_homology`).
    * A 2-bridge link other than the unlink (det 0) is non-split and alternating
      (Schubert's normal form is a reduced alternating diagram), so its Jones polynomial
      alternates in sign, has extreme coefficients ``±1`` and span at most the
      determinant, and a 2-bridge knot's Alexander polynomial alternates in sign
      (:mod:`plait.scoring.alternating`).
    """
    from plait.scoring.alexander import alexander
    from plait.scoring.alternating import alexander_obstruction, jones_obstruction
    from plait.scoring.goeritz import double_cover_homology
    from plait.scoring.jones import MAX_JONES_BRIDGES, jones

    h = double_cover_homology(plat)
    if len(h) >= 2:
        return (f"H_1 of the double branched cover is {_format_homology(h)}, not cyclic; the "
                "double branched cover of a 2-bridge link S(p,q) is the lens space L(p,q) "
                "(Schubert 1956)")
    if det == 0:
        return None  # the unlink is the 2-bridge link of determinant 0: split, not alternating
    if plat.components == 1:
        why = alexander_obstruction(alexander(plat))
        if why is not None:
            return why + "; a 2-bridge knot is alternating (Schubert normal form)"
    if plat.bridges <= MAX_JONES_BRIDGES:
        why = jones_obstruction(jones(plat), det)
        if why is not None:
            return why + "; a 2-bridge link is non-split alternating (Schubert normal form)"
    return None


def _linking_form_cut(plat: PlatWord, det: int, classes: tuple[int, ...]
                      ) -> tuple[tuple[int, ...], str]:
    """The candidates ``S(det, q)`` whose lens space has the plat closure's linking form
    (``q/p`` up to squares at each odd prime dividing ``p``: Seifert 1933), and a sentence
    on those cut (empty when none is)."""
    from plait.scoring.goeritz import linking_form_class, odd_prime_divisors, square_class

    if det < 3:
        return classes, ""
    primes = odd_prime_divisors(det)
    if not primes:
        return classes, ""
    ours = linking_form_class(plat, det, primes)
    if ours is None:
        return classes, ""
    kept = tuple(q for q in classes if square_class(q, det, primes) == ours)
    if len(kept) == len(classes):
        return classes, ""
    return kept, (f"{len(classes) - len(kept)} of the {len(classes)} candidates have another "
                  f"linking form of the double branched cover (L(p,q) has q/p up to squares "
                  f"mod each prime of p: Seifert 1933; read from the Goeritz matrix)")


# -- the time budget ---------------------------------------------------------------------

#: Monotonic deadline of the bound being computed (None: no budget), and the methods
#: skipped because it passed.
_DEADLINE: ContextVar[float | None] = ContextVar("bounds_deadline", default=None)
_SKIPPED: ContextVar[list | None] = ContextVar("bounds_skipped", default=None)
_BUDGET: ContextVar[float | None] = ContextVar("bounds_budget", default=None)


def _clock() -> float:
    """CPU seconds of this thread: the budget counts the bound's own work, whatever else
    runs on the machine."""
    return _time.thread_time()


def _out_of_time() -> bool:
    d = _DEADLINE.get()
    return d is not None and _clock() > d


def _not_tried(what: str) -> str:
    """The reason for a method skipped for its cost, recorded for the report."""
    why = f"not tried: {what} (time budget of {_BUDGET.get():g} s used up)"
    skipped = _SKIPPED.get()
    if skipped is not None and why not in skipped:
        skipped.append(why)
    return why


def check_budget(budget: object, what: str = "budget") -> float | None:
    """``budget`` as seconds (a positive finite number) or None; InputError otherwise."""
    import math

    from plait.errors import InputError

    if budget is None:
        return None
    if isinstance(budget, bool) or not isinstance(budget, (int, float)) or \
            not math.isfinite(budget) or budget <= 0:
        raise InputError(f"{what}: expected a positive, finite number of seconds, got "
                         f"{budget!r}")
    return float(budget)


def _summarize(names: list[str]) -> str:
    """``names`` for a one-line reason: the homomorphism counts are folded into one item
    that lists their targets."""
    prefix = "number of homomorphisms onto "
    counts = [n[len(prefix):] for n in names if n.startswith(prefix)]
    rest = [n for n in names if not n.startswith(prefix)]
    if len(counts) > 1:
        rest.append(f"numbers of homomorphisms onto {', '.join(counts)}")
    elif counts:
        rest.append(prefix + counts[0])
    return ", ".join(rest)


def _determinant(plat: PlatWord) -> int:
    from plait.scoring.alexander import determinant

    return determinant(plat)


def not_two_bridge(plat: PlatWord) -> tuple[bool, str]:
    """Decide whether invariants prove that the plat closure is not a 2-bridge link.

    Schubert (1956) classified 2-bridge links: each is some ``S(p, q)`` and its
    determinant is ``p``. So a knot or 2-component link with determinant ``p`` and bridge
    number at most 2 is one of the finitely many candidates ``S(p, q)`` (both mirror
    images; ``p = 1`` is the unknot, ``p = 0`` the unlink), and it is not 2-bridge as soon
    as each candidate differs from it in some invariant (see
    :func:`separating_invariants`).

    Returns
    -------
    (proved, explanation)
        ``proved`` is True when the link is certainly not 2-bridge; the explanation names
        the invariant that ruled out each candidate, or the candidate that could not be
        ruled out.

    References
    ----------
    .. [1] H. Schubert, "Knoten mit zwei Brücken", Math. Z. 65 (1956).
    """
    return _not_two_bridge(plat, _determinant(plat))


def _unknot_distinguished(plat: PlatWord) -> str | None:
    """Name of a computed invariant that differs from the unknot's, or None."""
    from plait.scoring.alexander import alexander
    from plait.scoring.jones import jones
    from plait.scoring.signature import signature

    if _determinant(plat) != 1:
        return f"determinant {_determinant(plat)} ≠ 1"
    if alexander(plat) != {0: 1}:
        return "Alexander polynomial ≠ 1"
    if jones(plat) != {Fraction(0): 1}:
        return "Jones polynomial ≠ 1"
    if signature(plat) != 0:
        return f"signature {signature(plat)} ≠ 0"
    return None


@lru_cache(maxsize=4096)
def bridge_lower_bound(plat: PlatWord, budget: float | None = None) -> LowerBound:
    """A lower bound on the bridge number of the plat closure, with its reasons.

    Bounds, cheapest first (each reason names the theorem and the computed quantity):

    * components: a link with ``c`` components has ``b >= c`` (each component has a
      maximum); ``b = 1`` exactly when the plat has 1 bridge, since ``b = 1`` only for
      the unknot (Schubert 1954) and invariants cannot prove a knot trivial;
    * a knot whose determinant, Alexander or Jones polynomial or signature differs from
      the unknot's is knotted, so ``b >= 2``;
    * Fox colorings: the space of Fox ``p``-colorings has dimension at most ``b``
      (a coloring is determined by the colors of the bridges);
    * the double branched cover: ``H_1`` needs at most ``b - 1`` generators (a genus
      ``b - 1`` Heegaard splitting), read from the Smith normal form of the coloring
      matrix with no factoring;
    * Nakanishi index: ``b >= m + 1``;
    * not 2-bridge (Schubert 1956 classification, :func:`not_two_bridge`): ``b >= 3``;
    * meridional rank: a homomorphism to a finite group with meridians sent into one
      conjugacy class whose image is not generated by fewer than ``k`` meridian images:
      ``b >= k`` (Boileau–Zieschang 1985, Baader–Blair–Kjuchukova 2021;
      :mod:`plait.scoring.meridional`); the search gets what is left of the budget.

    Parameters
    ----------
    plat : PlatWord
    budget : float, optional
        CPU seconds of the calling thread for the whole bound (not wall time, so a loaded
        machine does not change what is tried). The cheap bounds (components, knottedness, Fox
        colorings, the double branched cover, the listing-free not-2-bridge tests) are
        always computed; a slow method (Alexander module, candidate listing,
        homomorphism searches) is started only while time is left, and one that is not
        appears in ``reasons`` as ``"not tried: … (time budget of … s used up)"``.

    Returns
    -------
    LowerBound

    References
    ----------
    .. [1] H. Schubert, "Über eine numerische Knoteninvariante", Math. Z. 61 (1954).
    .. [2] H. Schubert, "Knoten mit zwei Brücken", Math. Z. 65 (1956).
    .. [3] R. H. Fox, "A quick trip through knot theory" (1962): Fox colorings.
    .. [4] Y. Nakanishi, "A note on unknotting number", Math. Sem. Notes Kobe Univ. 9
       (1981): the Alexander module needs at most ``b - 1`` generators.
    .. [5] M. Boileau and H. Zieschang, Comment. Math. Helv. 60 (1985).
    .. [6] S. Baader, R. Blair and A. Kjuchukova, Math. Ann. 379 (2021).
    .. [7] M. Boileau and J.-P. Otal, "Groupe des difféotopies de certaines variétés de
       Seifert", C. R. Acad. Sci. Paris 303 (1986) (from memory): the double branched cover
       of a ``b``-bridge link has a genus ``b - 1`` Heegaard splitting.
    """
    budget = check_budget(budget)
    tokens = (_DEADLINE.set(None if budget is None else _clock() + budget),
              _SKIPPED.set([]), _BUDGET.set(budget))
    try:
        lb = _bridge_lower_bound(plat)
        skipped = _SKIPPED.get()
        if skipped and not lb.exact:
            lb = LowerBound(lb.value, lb.reasons + tuple(skipped), lb.method, lb.exact)
        return lb
    finally:
        _BUDGET.reset(tokens[2])
        _SKIPPED.reset(tokens[1])
        _DEADLINE.reset(tokens[0])


def _bridge_lower_bound(plat: PlatWord) -> LowerBound:
    from plait.scoring.alexander import fox_coloring_dimension
    from plait.scoring.goeritz import double_cover_homology

    found: list[tuple[int, str, str]] = []  # (bound, method, reason)
    comps = plat.components
    if comps > 1:
        found.append((comps, "components",
                      f"{comps} components, each with at least one bridge → b ≥ {comps}"))
    else:
        found.append((1, "components", "a knot has at least one bridge → b ≥ 1"))
    if plat.bridges == 1:
        reason = ("the plat has 1 bridge, so the closure is the unknot and b = 1 "
                  "(Schubert 1954: b = 1 exactly for the unknot)")
        return LowerBound(1, (reason,), "plat", True)
    if comps == 1:
        why = _unknot_distinguished(plat)
        if why is None:
            found.append((1, "unknot", "determinant, Alexander and Jones polynomials and "
                          "signature agree with the unknot's, so nothing proves b ≥ 2; "
                          "invariants cannot prove that a knot is the unknot, so b = 1 is "
                          "claimed only for a 1-bridge plat"))
        else:
            found.append((2, "knotted", f"{why}, so the knot is not the unknot → b ≥ 2 "
                          "(Schubert 1954: b = 1 only for the unknot)"))
    det = _determinant(plat)
    primes = sorted({p for p in FOX_PRIMES} | {p for p in _odd_prime_factors(det)})
    best_fox = None
    for p in primes:
        d = fox_coloring_dimension(plat, p)
        if best_fox is None or d > best_fox[0]:
            best_fox = (d, p)
    if best_fox is not None and best_fox[0] >= 2:
        d, p = best_fox
        found.append((d, "fox", f"Fox {p}-colorings have dimension {d} → b ≥ {d} "
                      "(a coloring is fixed by the colors of the bridges; Fox 1962)"))
    h = double_cover_homology(plat)
    if len(h) + 1 >= 2 and (best_fox is None or len(h) + 1 > best_fox[0]):
        found.append((len(h) + 1, "double-cover",
                      f"H_1 of the double branched cover is {_format_homology(h)} "
                      f"(Smith normal form of the coloring matrix), {len(h)} "
                      f"generator{'s' * (len(h) > 1)} → b ≥ {len(h) + 1} (the double "
                      "branched cover of a b-bridge link has a genus b − 1 Heegaard "
                      "splitting)"))
    m, why = _module_bound(plat)
    if m >= 1:
        found.append((m + 1, "nakanishi",
                      f"the Alexander module needs at least {m} generator{'s' * (m > 1)} "
                      f"({why}) → b ≥ {m + 1} (Nakanishi index ≤ b − 1)"))
    best = max(b for b, _, _ in found)
    if best < 3 and plat.bridges >= 3:
        proved, why = _not_two_bridge(plat, det)
        if proved:
            found.append((3, "not-2-bridge", f"not 2-bridge: {why} → b ≥ 3 (Schubert 1956)"))
        else:
            rank = _meridional(plat, 3)
            if rank.value >= 3:
                found.append((rank.value, "meridional-rank", rank.reason()))
            else:
                found.append((best, "undecided", f"could not rule out 2 bridges: {why}"
                              + rank.tried_note()))
    best = max(b for b, _, _ in found)
    if 3 <= best < plat.bridges and not any(m == "meridional-rank" for _, m, _ in found):
        # finite quotients whose image needs more meridians: b >= 4 and more
        rank = _meridional(plat, best + 1)
        if rank.value > best:
            found.append((rank.value, "meridional-rank", rank.reason()))
    best = max(b for b, _, _ in found)
    method = next(m for b, m, _ in found if b == best)
    # the component count of a link, then every reason that reaches the bound (weaker
    # ones are implied)
    reasons = [r for i, (b, _, r) in enumerate(found) if b == best or (i == 0 and comps > 1)]
    return LowerBound(best, tuple(reasons), method, best == plat.bridges)


def _module_bound(plat: PlatWord) -> tuple[int, str]:
    """:func:`plait.scoring.alexander.nakanishi_lower_bound` within the time budget: the
    rings are tried in order and those not finished in time are reported as not tried."""
    from plait.scoring.alexander import (
        alexander_matrix,
        invariant_factor_count,
        module_bound_rings,
        nakanishi_lower_bound,
    )

    if _DEADLINE.get() is None:
        return nakanishi_lower_bound(plat)
    M = alexander_matrix(plat)
    best, best_ring, missed = 0, None, []
    for p in module_bound_rings(plat):
        ring = "Q[t,t^-1]" if p is None else f"F_{p}[t,t^-1]"
        if _out_of_time():
            missed.append(ring)
            continue
        try:
            k = invariant_factor_count(M, p, _DEADLINE.get()) - 1
        except TimeoutError:
            missed.append(ring)
            continue
        if k > best:
            best, best_ring = k, ring
    if missed:
        _not_tried(f"the Alexander module over {', '.join(missed)} (Nakanishi index)")
    if best == 0:
        return 0, "no non-unit invariant factor besides the free summand"
    return best, (f"Alexander module over {best_ring} has {best} non-unit invariant "
                  f"factor{'s' if best != 1 else ''} besides the free summand")


def _meridional(plat: PlatWord, want: int):
    # b >= 3: every default target with the full budget (rarely needed: the 2-bridge
    # classification usually decides first); b >= 4 and more: the rank targets. The
    # search takes a monotonic deadline: what is left of the CPU budget, from now.
    from plait.scoring.meridional import DEFAULT_TARGETS, RANK_TARGETS, meridional_rank_bound

    d = _DEADLINE.get()
    deadline = None if d is None else _time.monotonic() + max(0.0, d - _clock())
    budget = _BUDGET.get()
    if want >= 4 and budget is not None and budget >= LONG_BUDGET:
        # a long budget (the hunt): more and larger groups, no per-target operation cap
        from plait.scoring.quandles import LONG_TARGETS

        return meridional_rank_bound(plat, want, deadline=deadline, ops=None,
                                     names=LONG_TARGETS)
    if want <= 3:
        return meridional_rank_bound(plat, want, deadline=deadline, ops=QUOTIENT_BUDGET,
                                     names=DEFAULT_TARGETS)
    return meridional_rank_bound(plat, want, deadline=deadline, ops=RANK_BUDGET,
                                 names=RANK_TARGETS)


def _odd_prime_factors(n: int, limit: int = 10_000) -> list[int]:
    """Odd primes dividing ``n`` found by trial division up to ``limit``, plus the cofactor
    left when it is below ``limit**2`` (then it is prime)."""
    n = abs(n)
    out = []
    while n and n % 2 == 0:
        n //= 2
    p = 3
    while p <= limit and p * p <= n:
        if n % p == 0:
            out.append(p)
            while n % p == 0:
                n //= p
        p += 2
    if 1 < n < limit * limit:
        out.append(n)
    return out
