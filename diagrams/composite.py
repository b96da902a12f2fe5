"""Composite knots: decomposing circles in PD diagrams, factors, and plat connected sums."""

from __future__ import annotations

from collections.abc import Iterable, Iterator, Sequence
from dataclasses import dataclass, field
from fractions import Fraction

from plait.diagrams.pd import PDCode, pd_components, validate_pd
from plait.errors import InputError
from plait.word import PlatWord

__all__ = [
    "Factor",
    "connected_sum",
    "decompose",
    "decomposing_circles",
    "jones_product",
    "pd_connected_sum",
    "pd_faces",
    "split_pd",
    "visited_diagrams",
    "with_factors",
]

# Candidate circles tried per diagram (each costs two Jones polynomials of the sides).
MAX_CANDIDATES = 200

# Plats sampled along a search's certificate path to look for circles in.
VISITED_SAMPLE = 12

# A side of a decomposing circle with fewer crossings than this is an unknotted tangle:
# every nontrivial knot has crossing number at least 3.
MIN_KNOTTED = 3

_ONE: dict[Fraction, int] = {Fraction(0): 1}

# An occurrence ``(j, s)`` is slot ``s`` (0..3) of crossing ``j`` (0-based) of a PD code:
# one end of the edge whose label sits there. Read as a dart, it leaves crossing ``j``
# along that edge.


@dataclass
class Factor:
    """One factor of a connected sum, with its bridge-number bounds.

    Attributes
    ----------
    pd : PDCode
        The factor's diagram, cut out of the knot's diagram (edges relabelled 1, 2, ...
        along the orientation the knot gives it).
    plat : PlatWord
        The factor's best plat (``upper`` bridges).
    lower, upper : int
        ``lower <= b(factor) <= upper``.
    lower_reasons, upper_reasons : list of str
        The factor's own bridge report reasons.
    """

    pd: PDCode
    plat: PlatWord
    lower: int
    upper: int
    lower_reasons: list[str] = field(default_factory=list)
    upper_reasons: list[str] = field(default_factory=list)

    @property
    def certified(self) -> bool:
        return self.lower == self.upper

    def to_json(self) -> dict:
        """One entry of the ``factors`` list of ``plait bridge --json``."""
        return {"pd": self.pd.to_list(), "strands": self.plat.strands,
                "word": list(self.plat.word), "lower": self.lower, "upper": self.upper,
                "certified": self.certified, "reasons": list(self.lower_reasons),
                "upper_reasons": list(self.upper_reasons)}


def _occurrences(pd: PDCode) -> dict[int, list[tuple[int, int]]]:
    # where[label] = the two occurrences of the label, in crossing order
    where: dict[int, list[tuple[int, int]]] = {}
    for j, c in enumerate(pd.crossings):
        for s, x in enumerate(c):
            where.setdefault(x, []).append((j, s))
    return where


def pd_faces(pd: PDCode) -> dict[tuple[int, int], int]:
    """The faces of the diagram, from the code's own rotation system.

    A dart (occurrence ``(j, s)``) runs along its edge to the other end ``(j', s')`` and
    turns to the next slot ``(j', s' + 1)`` counterclockwise; the orbits of this map are
    the boundaries of the faces.

    Returns
    -------
    dict
        ``(crossing, slot) -> face index`` for every dart. The two darts of an edge lie
        in the two faces on its two sides.
    """
    where = _occurrences(pd)
    other: dict[tuple[int, int], tuple[int, int]] = {}
    for occ in where.values():
        a, b = occ
        other[a], other[b] = b, a
    face: dict[tuple[int, int], int] = {}
    k = -1
    for start in other:
        if start in face:
            continue
        k += 1
        d = start
        while d not in face:
            face[d] = k
            j, s = other[d]
            d = (j, (s + 1) % 4)
    return face


def _orient(pd: PDCode) -> dict[int, tuple[tuple[int, int], tuple[int, int]]]:
    # label -> (tail occurrence, head occurrence) under the PD's own orientation
    from plait.diagrams.wirtinger import occurrence_roles

    role = occurrence_roles(pd)
    out: dict[int, tuple[tuple[int, int], tuple[int, int]]] = {}
    for x, (a, b) in _occurrences(pd).items():
        out[x] = (a, b) if role[a] == -1 else (b, a)
    return out


def _side(pd: PDCode, cut: tuple[int, int], start: int) -> set[int]:
    # crossings reachable from ``start`` without using the edges in ``cut``
    adj: dict[int, list[int]] = {j: [] for j in range(pd.length)}
    for x, ((j0, _), (j1, _)) in _occurrences(pd).items():
        if x not in cut:
            adj[j0].append(j1)
            adj[j1].append(j0)
    seen, stack = {start}, [start]
    while stack:
        for k in adj[stack.pop()]:
            if k not in seen:
                seen.add(k)
                stack.append(k)
    return seen


def decomposing_circles(pd: PDCode) -> list[tuple[int, int]]:
    """Pairs of edges met by a simple closed curve that meets the diagram nowhere else.

    Two distinct edges ``e`` and ``f`` that both lie on the same two faces ``A != B``
    give such a curve: it runs through ``A`` from ``e`` to ``f`` and back through ``B``.
    In a connected planar graph these pairs are exactly the cuts of two edges (a cut is a
    cycle of the dual graph), so each side of the curve holds at least one crossing.

    Returns
    -------
    list of (e, f)
        Edge labels, ``e < f``, with more crossings on the smaller side first.

    References
    ----------
    .. [1] H. Schubert, "Die eindeutige Zerlegbarkeit eines Knotens in Primknoten",
       S.-B. Heidelberger Akad. Wiss. (1949): decomposing spheres and prime factors.
    .. [2] H. Whitney, "Non-separable and planar graphs", Trans. Amer. Math. Soc. 34
       (1932): cuts of a plane graph are the cycles of its dual.
    """
    face = pd_faces(pd)
    by_faces: dict[frozenset, list[int]] = {}
    for x, (a, b) in _occurrences(pd).items():
        fa, fb = face[a], face[b]
        if fa != fb:
            by_faces.setdefault(frozenset((fa, fb)), []).append(x)
    pairs = []
    for labels in by_faces.values():
        labels.sort()
        for i, e in enumerate(labels):
            for f in labels[i + 1:]:
                pairs.append((e, f))
    if not pairs:
        return []
    orient = _orient(pd)

    def balance(p: tuple[int, int]) -> int:
        n = len(_side(pd, p, orient[p[0]][0][0]))
        return -min(n, pd.length - n)

    return sorted(pairs, key=lambda p: (balance(p), p))


def _relabel(crossings: list[list[int]]) -> PDCode:
    # labels 1, 2, ... along the orientation of the (single) component, then validated
    raw = PDCode(tuple(tuple(c) for c in crossings))
    new: dict[int, int] = {}
    for comp in pd_components(raw):
        for x in comp:
            new[x] = len(new) + 1
    return validate_pd([[new[x] for x in c] for c in crossings])


def split_pd(pd: PDCode, e: int, f: int) -> tuple[PDCode, PDCode]:
    """Cut a knot diagram along a decomposing circle through edges ``e`` and ``f``.

    Each side keeps its crossings; the two cut ends on that side are joined by an arc
    running beside the circle (outside the other side, so the side stays planar). The
    knot's orientation passes to both sides, and edges are relabelled ``1, 2, ...``
    along it.

    Returns
    -------
    (PDCode, PDCode)
        The side holding the tail of ``e``, then the other side; both validated.

    Raises
    ------
    InputError
        When ``e, f`` do not cut the diagram of a knot into two sides joined by them.
    """
    if len(pd_components(pd)) != 1:
        raise InputError("composite: a decomposition is looked for in knot diagrams only")
    orient = _orient(pd)
    if e not in orient or f not in orient or e == f:
        raise InputError(f"composite: edges {e} and {f} are not two edges of the diagram")
    (te, he), (tf, hf) = orient[e], orient[f]
    side_a = _side(pd, (e, f), te[0])
    if he[0] in side_a or tf[0] in side_a or hf[0] not in side_a:
        raise InputError(f"composite: edges {e} and {f} do not cut the diagram in two")
    cs = [list(c) for c in pd.crossings]
    # side A: e leaves it and f comes back; the end of f in A becomes the end of e
    cs[hf[0]][hf[1]] = e
    # side B: e arrives and f leaves; the end of e in B becomes the end of f
    cs[he[0]][he[1]] = f
    a = [cs[j] for j in range(pd.length) if j in side_a]
    b = [cs[j] for j in range(pd.length) if j not in side_a]
    return _relabel(a), _relabel(b)


def jones_product(polys: Sequence[dict]) -> dict[Fraction, int]:
    """Product of Laurent polynomials ``{exponent: coefficient}``."""
    out: dict[Fraction, int] = dict(_ONE)
    for p in polys:
        acc: dict[Fraction, int] = {}
        for e1, c1 in out.items():
            for e2, c2 in p.items():
                acc[e1 + e2] = acc.get(e1 + e2, 0) + c1 * c2
        out = {e: c for e, c in acc.items() if c}
    return out


def decompose(pd: PDCode, max_candidates: int = MAX_CANDIDATES) -> list[PDCode]:
    """Split a knot diagram along decomposing circles into confirmed factors.

    A circle is used only when it is confirmed: both sides are valid PD codes
    (:func:`plait.diagrams.pd.validate_pd`), both have a Jones polynomial other than 1 (so both
    sides are knotted and the circle is not a trivial one around an unknotted tangle),
    and the product of their Jones polynomials is the knot's (the Jones polynomial is
    multiplicative under connected sum). The factors are split again where their own
    diagrams allow.

    Parameters
    ----------
    pd : PDCode
        A knot diagram (a link, or a diagram with fewer than 6 crossings, is returned
        whole).
    max_candidates : int
        Circles tried per diagram.

    Returns
    -------
    list of PDCode
        The factors, or ``[pd]`` when no circle is confirmed.

    References
    ----------
    .. [1] H. Schubert, "Die eindeutige Zerlegbarkeit eines Knotens in Primknoten",
       S.-B. Heidelberger Akad. Wiss. (1949).
    .. [2] V. F. R. Jones, "Hecke algebra representations of braid groups and link
       polynomials", Ann. of Math. 126 (1987): the Jones polynomial of a connected sum
       is the product of the factors'.
    """
    from plait.diagrams.pdjones import pd_jones

    if pd.length < 2 * MIN_KNOTTED or len(pd_components(pd)) != 1:
        return [pd]
    whole = None
    tried = 0
    orient = _orient(pd)
    for e, f in decomposing_circles(pd):
        n = len(_side(pd, (e, f), orient[e][0][0]))
        if min(n, pd.length - n) < MIN_KNOTTED:
            break  # sorted by the smaller side: the rest are smaller still
        if tried >= max_candidates:
            break
        tried += 1
        try:
            a, b = split_pd(pd, e, f)
        except InputError:
            continue
        # the smaller side first: it is the cheaper one and the likelier to be unknotted
        small, big = (a, b) if a.length <= b.length else (b, a)
        va = pd_jones(small)
        if va == _ONE:
            continue
        vb = pd_jones(big)
        if vb == _ONE:
            continue
        if whole is None:
            whole = pd_jones(pd)
        if jones_product([va, vb]) != whole:
            continue
        return decompose(a, max_candidates) + decompose(b, max_candidates)
    return [pd]


def pd_connected_sum(pd1: PDCode, pd2: PDCode) -> PDCode:
    """A diagram of the connected sum of two knot diagrams.

    The first edge of each diagram (its smallest label) is cut and the four ends are
    joined across, orientations matching; the second diagram is drawn in a face next to
    that edge of the first, so the result is planar.

    Returns
    -------
    PDCode
        Validated, edges relabelled ``1, 2, ...`` along the orientation.

    References
    ----------
    .. [1] H. Schubert, "Die eindeutige Zerlegbarkeit eines Knotens in Primknoten",
       S.-B. Heidelberger Akad. Wiss. (1949).
    """
    if len(pd_components(pd1)) != 1 or len(pd_components(pd2)) != 1:
        raise InputError("composite: the connected sum is built for knot diagrams only")
    shift = max(x for c in pd1.crossings for x in c)
    c1 = [list(c) for c in pd1.crossings]
    c2 = [[x + shift for x in c] for c in pd2.crossings]
    e1 = min(x for c in pd1.crossings for x in c)
    e2 = min(x for c in pd2.crossings for x in c)
    _t1, h1 = _orient(pd1)[e1]
    _t2, h2 = _orient(pd2)[e2]
    # edge e1 now runs into the head of the second's edge, and vice versa
    c1[h1[0]][h1[1]] = e2 + shift
    c2[h2[0]][h2[1]] = e1
    return _relabel(c1 + c2)


def connected_sum(plats: list[PlatWord]) -> PlatWord:
    """A plat of the connected sum of the plats' closures, on ``sum(n_i) - (k - 1)``
    bridges.

    The plats are placed one below and to the right of the other: plat ``i + 1`` is
    shifted so that its first cap pair sits on the positions of plat ``i``'s last cup
    pair, and that cap and that cup are both removed, so the two strands leaving plat
    ``i`` at the bottom run straight into plat ``i + 1``. The other strands of one plat
    pass beside the other's letters without crossing them, so a circle around plat ``i``
    meets the diagram in exactly those two strands: the closure is the connected sum.
    The join does not choose orientations: for knots the closure is K1 # K2 or
    K1 # (K2 reversed), one knot unless both are non-invertible; either way it has
    ``b(K1) + b(K2) - 1`` bridges at best (Schubert 1954).

    Parameters
    ----------
    plats : list of PlatWord
        At least one plat (a single plat is returned unchanged).

    Returns
    -------
    PlatWord

    References
    ----------
    .. [1] H. Schubert, "Über eine numerische Knoteninvariante", Math. Z. 61 (1954):
       b(K1 # K2) = b(K1) + b(K2) - 1.
    """
    if not plats:
        raise InputError("connected sum: no plats given")
    strands = plats[0].strands
    word = list(plats[0].word)
    for p in plats[1:]:
        shift = strands - 2
        word.extend(g + shift if g > 0 else g - shift for g in p.word)
        strands += p.strands - 2
    return PlatWord(strands, tuple(word))


def visited_diagrams(certificate, sample: int = VISITED_SAMPLE
                     ) -> Iterator[tuple[str, PDCode]]:
    """Diagrams of plats a search visited: an even sample of the plats along its
    certificate (the path of moves from the start plat to the best one).

    Parameters
    ----------
    certificate : path-like
        A certificate file of :func:`plait.search.reduce`.
    sample : int
        Most plats taken (the start and the end of the path are left out: the caller
        has them).

    Yields
    ------
    (description, PDCode)
        Lazily, in path order; a plat whose closure has a crossingless component is
        skipped.
    """
    from plait.diagrams.pd import plat_to_pd
    from plait.moves import load_certificate
    from plait.moves.graph import apply_move

    try:
        cert = load_certificate(certificate)
    except (InputError, OSError):
        return
    n = len(cert.records)
    if n < 2 or sample < 1:
        return
    want = {round(i * n / (sample + 1)) for i in range(1, sample + 1)} - {0, n}
    cur = cert.start
    for i, rec in enumerate(cert.records, start=1):
        cur = apply_move(cur, rec)
        if i in want and cur.word:
            try:
                pd = plat_to_pd(cur)
            except InputError:
                continue
            yield f"the plat after move {i} of {n} of the search", pd


def _invertible_known(f: Factor) -> bool:
    # 2-bridge knots (and the unknot) are invertible: Schubert's normal form of S(p, q)
    # is carried to itself with its orientation reversed by a rotation (Schubert 1956)
    return f.upper <= 2


def with_factors(report, diagrams: Iterable[tuple[str, PDCode | None]], *, time=None,
                 steps=None, seed: int = 0, wirtinger_time: float = 10.0,
                 handle_signals: bool = True, runs_root=None, run_dir=None, budget=None):
    """Bound a composite knot through its factors (Schubert's additivity).

    The diagrams are searched in order for confirmed decomposing circles
    (:func:`decompose`); the first that splits is used (a factor that splits further in
    another diagram is split in its own report). Each factor gets its own bridge report
    (:func:`plait.bridge.bridge_report`, which splits it again when its best plat's
    diagram shows another circle), and the bounds combine as
    ``b(K1 # ... # Kk) = b(K1) + ... + b(Kk) - (k - 1)``: the factors' lower bounds give
    a lower bound, and their best plats joined by :func:`connected_sum` give a plat
    with the factors' upper bounds, guarded by the Jones polynomial (the product of the
    factors' must equal the knot's).

    Parameters
    ----------
    report : plait.bridge.BridgeReport
        The knot's own report; returned updated (``factors`` filled, bounds improved).
    diagrams : iterable of (description, PDCode or None)
        Diagrams of the knot to look for circles in (read lazily, up to the first that
        splits).
    time, steps, seed, wirtinger_time, handle_signals, runs_root
        As for :func:`plait.bridge.bridge_report`; the time is shared among the factors.
    run_dir : path-like, optional
        Factor ``i``'s search runs in ``run_dir/factor-i``.

    Returns
    -------
    plait.bridge.BridgeReport

    References
    ----------
    .. [1] H. Schubert, "Über eine numerische Knoteninvariante", Math. Z. 61 (1954).
    """
    from pathlib import Path

    from plait.bridge import bridge_report
    from plait.scoring.jones import jones

    best: tuple[str, list[PDCode]] | None = None
    for what, pd in diagrams:
        if pd is None:
            continue
        fs = decompose(pd)
        if len(fs) > 1:
            best = (what, fs)
            break
    if best is None:
        return report
    what, fs = best
    if time is None and steps is None:
        from plait.search.api import DEFAULT_TIME

        time = DEFAULT_TIME
    share = None if time is None else max(float(time) / len(fs), 0.1)
    factors: list[Factor] = []
    for i, f in enumerate(fs, start=1):
        sub = bridge_report(f, time=share, steps=steps, seed=seed, quiet=True,
                            wirtinger_time=wirtinger_time, handle_signals=handle_signals,
                            runs_root=runs_root, budget=budget,
                            run_dir=None if run_dir is None else Path(run_dir) / f"factor-{i}")
        if sub.factors:
            factors.extend(sub.factors)
        else:
            factors.append(Factor(f, sub.result, sub.lower, sub.upper,
                                  list(sub.lower_reasons), list(sub.upper_reasons)))
    report.factors = factors
    k = len(factors)
    lows = [f.lower for f in factors]
    ups = [f.upper for f in factors]
    lower, upper = sum(lows) - (k - 1), sum(ups) - (k - 1)
    whence = (f"a decomposing circle in {what} splits the knot into {k} knotted factors "
              f"(confirmed: each factor's PD code is valid, its Jones polynomial is not 1, "
              f"and their product is the knot's)")
    if lower >= report.lower:
        reason = (f"{whence}; the factors have b ≥ {', '.join(map(str, lows))}, so "
                  f"b ≥ {' + '.join(map(str, lows))} − {k - 1} = {lower} (Schubert 1954: "
                  f"b(K1 # K2) = b(K1) + b(K2) − 1)")
        if lower > report.lower:
            report.lower_reasons = [reason]
        else:
            report.lower_reasons = list(report.lower_reasons) + [reason]
        report.lower = lower
    if upper < report.upper:
        plat = connected_sum([f.plat for f in factors])
        want = jones_product([jones(f.plat) for f in factors])
        if plat.bridges == upper and jones(plat) == want == jones(report.result):
            unknown = [str(i) for i, f in enumerate(factors, start=1)
                       if not _invertible_known(f)]
            caveat = ""
            if len(unknown) > 1:
                caveat = (f"; factors {', '.join(unknown)} are not known to be invertible "
                          f"and are joined in the orientations their plats carry, so the "
                          f"plat may present the sum with a factor reversed, a knot with "
                          f"the same bridge number")
            report.upper_reasons = list(report.upper_reasons) + [
                f"{whence}; their best plats with {', '.join(map(str, ups))} bridges, "
                f"joined end to end, give a plat with {' + '.join(map(str, ups))} − "
                f"{k - 1} = {upper} bridges (Schubert 1954: b(K1 # K2) = b(K1) + b(K2) − 1;"
                f" guarded by the Jones polynomial){caveat}"]
            report.result = plat
            report.upper = upper
    if report.lower > report.upper:  # pragma: no cover - a contradiction between theorems
        raise AssertionError(f"lower bound {report.lower} exceeds upper bound {report.upper}")
    return report
