"""Alexander polynomial, determinant, Fox colorings and the Alexander-module bound of a plat."""

from __future__ import annotations

from functools import lru_cache

import numpy as np

from plait.errors import InputError
from plait.scoring import laurent as lp
from plait.scoring.orientation import trace
from plait.word import PlatWord

__all__ = [
    "alexander_matrix",
    "alexander",
    "alexander_minors",
    "fox_matrix",
    "determinant",
    "fox_coloring_dimension",
    "nullity_mod_p",
    "invariant_factor_count",
    "nakanishi_lower_bound",
    "module_bound_rings",
]

_INT64_SAFE = 1 << 62


def alexander_matrix(plat: PlatWord) -> list[list[dict[int, int]]]:
    """Presentation matrix of the Alexander module read off the bridge presentation.

    Both top ends of cap ``j`` get the unknown ``x_j``. Colors (linear forms in the
    ``x_j`` over ``Z[t, t^-1]``) are pushed down the word: the over-strand keeps its color
    ``a``; if ``b`` is the color of the under-arc entering the crossing, the under-arc
    leaving it gets ``a + t^s (b - a)``, where ``s = +1`` when the leaving arc lies on the
    left of the over-strand (looking along its orientation) and ``s = -1`` otherwise —
    the Alexander quandle rule ``left = t * right + (1 - t) * over``. At cup ``i`` the two
    bottom ends must agree.

    Returns
    -------
    list of list of dict
        ``M[i][j]`` is the coefficient of ``x_j`` in ``color(bottom 2i-1) - color(bottom 2i)``
        (cup ``i``, cap ``j``; 0-based), a Laurent polynomial ``{exponent: coefficient}``.
        Every row sums to zero (constant colorings always exist).

    Notes
    -----
    Colors are rows of an int64 array over a window of exponents, switched to Python
    integers when a bound on the entries nears 2^62, so results are exact. The cost is
    linear in the word length for a fixed number of bridges.

    References
    ----------
    .. [1] R. H. Fox, "Free differential calculus II", Ann. of Math. 59 (1954).
    .. [2] D. Joyce, "A classifying invariant of knots, the knot quandle", J. Pure Appl.
       Algebra 23 (1982): the Alexander quandle coloring rule.
    """
    return [[dict(p) for p in row] for row in _alexander_matrix(plat.strands, plat.word)]


@lru_cache(maxsize=128)
def _alexander_matrix(strands: int, word: tuple[int, ...]) -> tuple[tuple[dict, ...], ...]:
    plat = PlatWord(strands, word)
    n = plat.bridges
    L = len(word)
    tr = trace(plat)
    # C[r, j, c]: coefficient of t^(c - off) x_j in the color held by slot r; the window
    # of columns triples when the exponents in use [lo - off, hi - off] reach its edge.
    off = min(L, 32)
    C = np.zeros((strands, n, 2 * off + 1), dtype=np.int64)
    for j in range(n):
        C[2 * j, j, off] = 1
        C[2 * j + 1, j, off] = 1
    bound = [1] * strands  # bound on |entries| of each slot
    slot = list(range(strands))  # slot[p] = row of C holding the color at position p
    lo = hi = off  # columns in use
    for j, g in enumerate(word):
        a = abs(g) - 1
        if g > 0:  # the strand entering at a+1 passes over and leaves at a
            ov, un = slot[a + 1], slot[a]
            slot[a], slot[a + 1] = ov, un
        else:  # the strand entering at a passes over and leaves at a+1
            ov, un = slot[a], slot[a + 1]
            slot[a], slot[a + 1] = un, ov
        s = (1 if g > 0 else -1) * tr.over_direction[j]
        new_bound = bound[un] + 2 * bound[ov]
        if C.dtype != object and new_bound >= _INT64_SAFE:
            bound = [int(np.abs(C[r, :, lo:hi + 1]).max()) for r in range(strands)]
            new_bound = bound[un] + 2 * bound[ov]
            if new_bound >= _INT64_SAFE:
                C = C.astype(object)
        nlo, nhi = min(lo, lo + s), max(hi, hi + s)
        if nlo < 0 or nhi >= C.shape[2]:
            W = C.shape[2]
            wider = np.zeros((strands, n, 3 * W), dtype=C.dtype)
            wider[:, :, W:2 * W] = C
            C = wider
            off, lo, hi, nlo, nhi = off + W, lo + W, hi + W, nlo + W, nhi + W
        diff = C[un, :, lo:hi + 1] - C[ov, :, lo:hi + 1]
        res = C[ov, :, nlo:nhi + 1].copy()
        res[:, lo + s - nlo:hi + s - nlo + 1] += diff
        C[un, :, nlo:nhi + 1] = res
        bound[un] = new_bound
        lo, hi = nlo, nhi
    rows = []
    for i in range(n):
        d = (C[slot[2 * i], :, lo:hi + 1] - C[slot[2 * i + 1], :, lo:hi + 1]).tolist()
        rows.append(tuple({lo - off + e: int(c) for e, c in enumerate(col) if c} for col in d))
    return tuple(rows)


def alexander_minors(plat: PlatWord) -> list[dict[int, int]]:
    """The ``n`` minors of :func:`alexander_matrix` obtained by deleting the last column
    and one row each (for tests: they agree up to ``+-t^k``)."""
    M = alexander_matrix(plat)
    n = len(M)
    return [lp.det([row[:n - 1] for r, row in enumerate(M) if r != i]) for i in range(n)]


def alexander(plat: PlatWord) -> dict[int, int]:
    """Alexander polynomial of the plat closure as ``{exponent of t: coefficient}``.

    The determinant of :func:`alexander_matrix` with its last row and column deleted. For
    a knot it is normalised to be symmetric, ``Delta(t) = Delta(1/t)``, with
    ``Delta(1) = 1``. For a link it is defined up to ``+-t^k``; it is returned shifted to
    lowest exponent ``-(span // 2)`` with a positive top coefficient (``{}`` when it
    vanishes, e.g. for split links).

    Notes
    -----
    The ``n`` cup relations satisfy one dependency with unit coefficients (the product of
    all bottom meridians equals that of the top ones, which is trivial), and the columns
    sum to zero, so every ``(n-1)``-minor is the same up to ``+-t^k`` and is the gcd of
    them all, i.e. the generator of the first elementary ideal.

    References
    ----------
    .. [1] J. W. Alexander, "Topological invariants of knots and links", Trans. Amer.
       Math. Soc. 30 (1928).
    .. [2] R. H. Fox, "Free differential calculus II", Ann. of Math. 59 (1954).
    """
    M = alexander_matrix(plat)
    n = len(M)
    delta = lp.det([row[:n - 1] for row in M[:n - 1]])
    if not delta:
        return {}
    if plat.components == 1:
        delta = lp.symmetrize(delta)
        if lp.evaluate(delta, 1) < 0:
            delta = lp.scale(delta, -1)
        return delta
    if delta[max(delta)] < 0:
        delta = lp.scale(delta, -1)
    return lp.symmetrize(delta)


def fox_matrix(plat: PlatWord) -> list[list[int]]:
    """:func:`alexander_matrix` at ``t = -1``, pushed directly with integers.

    At ``t = -1`` the rule is the Fox coloring rule ``under_out = 2 * over - under_in``
    whatever the orientation.

    References
    ----------
    .. [1] R. H. Crowell and R. H. Fox, "Introduction to Knot Theory" (1963): Fox
       colorings.
    """
    n = plat.bridges
    color = []
    for p in range(plat.strands):
        v = [0] * n
        v[p // 2] = 1
        color.append(v)
    for g in plat.word:
        a = abs(g) - 1
        ov, un = (a + 1, a) if g > 0 else (a, a + 1)
        o, u = color[ov], color[un]
        color[un] = [2 * x - y for x, y in zip(o, u, strict=True)]
        color[a], color[a + 1] = color[a + 1], color[a]
    return [[x - y for x, y in zip(color[2 * i], color[2 * i + 1], strict=True)] for i in range(n)]


def determinant(plat: PlatWord) -> int:
    """Determinant of the link, ``|Delta(-1)|``, from an ``(n-1)``-minor of
    :func:`fox_matrix` (integer fraction-free elimination).

    References
    ----------
    .. [1] R. H. Crowell and R. H. Fox, "Introduction to Knot Theory" (1963).
    """
    F = fox_matrix(plat)
    n = len(F)
    if n == 1:
        return 1
    return abs(lp._bareiss([row[:n - 1] for row in F[:n - 1]]))


def nullity_mod_p(matrix: list[list[int]], p: int) -> int:
    """Dimension of the null space of an integer matrix over ``Z/p``."""
    a = [[x % p for x in row] for row in matrix]
    rows = len(a)
    cols = len(a[0]) if a else 0
    rank = 0
    for c in range(cols):
        piv = next((r for r in range(rank, rows) if a[r][c]), None)
        if piv is None:
            continue
        a[rank], a[piv] = a[piv], a[rank]
        inv = pow(a[rank][c], -1, p)
        a[rank] = [(x * inv) % p for x in a[rank]]
        for r in range(rows):
            if r != rank and a[r][c]:
                f = a[r][c]
                a[r] = [(x - f * y) % p for x, y in zip(a[r], a[rank], strict=True)]
        rank += 1
    return cols - rank


def fox_coloring_dimension(plat: PlatWord, p: int) -> int:
    """Dimension over ``Z/p`` of the space of Fox ``p``-colorings, trivial ones included.

    Colorings are determined by the colors of the ``n`` bridges, so the dimension is at
    most the number of bridges: a lower bound for the bridge number.

    References
    ----------
    .. [1] R. H. Crowell and R. H. Fox, "Introduction to Knot Theory" (1963).

    Raises
    ------
    InputError
        When ``p`` is not a prime.
    """
    if isinstance(p, bool) or not isinstance(p, int) or p < 2 or \
            any(p % d == 0 for d in range(2, int(p ** 0.5) + 1)):
        raise InputError(f"fox colorings: p must be a prime, got {p!r}")
    return nullity_mod_p(fox_matrix(plat), p)


# -- the Alexander module over principal ideal domains ------------------------------------


def _to_field_rows(M: list[list[dict]], p: int | None) -> list[list[list]]:
    # Rows shifted to nonnegative exponents (a unit), entries as coefficient lists over
    # F_p (ints mod p) or over Z standing for Q (p = None), lowest degree first.
    out = []
    for row in M:
        exps = [e for q in row for e in q]
        lo = min(exps) if exps else 0
        new = []
        for q in row:
            if not q:
                new.append([])
                continue
            coeffs = [0] * (max(q) - lo + 1)
            for e, c in q.items():
                coeffs[e - lo] = c % p if p else c
            new.append(lp._trim(coeffs))
        out.append(new)
    return out


def _strip_t(a: list) -> list:
    # remove factors of t (units of the Laurent ring)
    k = 0
    while k < len(a) and a[k] == 0:
        k += 1
    return a[k:]


def _is_unit(a: list) -> bool:
    a = _strip_t(a)
    return len(a) == 1


def _pmul(a: list, b: list, p: int | None) -> list:
    if not a or not b:
        return []
    if p and p < (1 << 31) and len(a) * len(b) > 256 and min(len(a), len(b)) < (1 << 16):
        # two int64 convolutions: b = lo + 2^16 hi keeps each sum below 2^63
        A = np.array(a, dtype=np.int64) % p
        B = np.array(b, dtype=np.int64) % p
        lo = np.convolve(A, B & 0xFFFF) % p
        hi = np.convolve(A, B >> 16) % p
        return lp._trim(((lo + (hi << 16) % p) % p).tolist())
    out = [0] * (len(a) + len(b) - 1)
    for i, x in enumerate(a):
        if x:
            for j, y in enumerate(b):
                out[i + j] += x * y
    if p:
        out = [c % p for c in out]
    return lp._trim(out)


def _psub(a: list, b: list, p: int | None) -> list:
    m = max(len(a), len(b))
    if p and m > 64 and p < (1 << 62):
        out = np.zeros(m, dtype=np.int64)
        out[:len(a)] = np.array(a, dtype=np.int64) % p
        out[:len(b)] -= np.array(b, dtype=np.int64) % p
        return lp._trim((out % p).tolist())
    out = [(a[i] if i < len(a) else 0) - (b[i] if i < len(b) else 0) for i in range(m)]
    if p:
        out = [c % p for c in out]
    return lp._trim(out)


def _content(polys: list[list]) -> int:
    from math import gcd

    g = 0
    for q in polys:
        for c in q:
            g = gcd(g, c)
            if g == 1:
                return 1
    return g


def _pseudo_divmod(a: list, b: list) -> tuple[int, list, list]:
    # Integer pseudo-division: returns (s, q, r) with s * a = q * b + r, deg r < deg b,
    # s a power of the leading coefficient of b.
    lc = b[-1]
    n = len(a) - len(b) + 1
    if n <= 0:
        return 1, [], list(a)
    q = [0] * n
    r = list(a)
    s = 1
    for k in reversed(range(n)):
        c = r[k + len(b) - 1]
        if c == 0:
            continue
        if lc != 1:
            r = [x * lc for x in r]
            q = [x * lc for x in q]
            s *= lc
        q[k] += c
        for i, bi in enumerate(b):
            r[k + i] -= c * bi
    return s, q, lp._trim(r)


def _reduce(a: list, b: list, p: int | None) -> tuple[int, list]:
    # (s, q) with s * a - q * b of lower degree than b; s = 1 over F_p
    if p:
        q, _ = lp.poly_divmod_field(a, b, p)
        return 1, q
    s, q, _ = _pseudo_divmod(a, b)
    return s, q


def _scale(a: list, s: int, p: int | None) -> list:
    if s == 1:
        return a
    return lp._trim([(x * s) % p if p else x * s for x in a])


def _primitive(polys: list[list]) -> list[list]:
    g = _content(polys)
    if g in (0, 1):
        return polys
    return [[x // g for x in q] for q in polys]


def _zgcd(a: list, b: list) -> list:
    # gcd in Q[t] as a primitive integer polynomial (primitive remainder sequence)
    a, b = _primitive([a])[0], _primitive([b])[0]
    if len(a) < len(b):
        a, b = b, a
    while b:
        _, _, r = _pseudo_divmod(a, b)
        a, b = b, (_primitive([r])[0] if r else [])
    return a


def _zexact_div(a: list, b: list) -> list:
    # a / b in Q[t] scaled to a primitive integer polynomial
    s, q, r = _pseudo_divmod(a, b)
    if r:
        raise ArithmeticError("inexact division")
    return _primitive([q])[0]


def invariant_factor_count(M: list[list[dict]], p: int | None,
                           deadline: float | None = None) -> int:
    """Number of non-unit invariant factors (zeros included) of a square Laurent matrix
    over ``F_p[t, t^-1]`` (``p`` prime) or ``Q[t, t^-1]`` (``p = None``).

    Smith normal form by Euclidean row and column operations over ``F[t]`` (rows first
    shifted to nonnegative exponents); over ``Q`` the operations are fraction-free
    (pseudo-division, then each row or column divided by its content; nonzero integers
    are units of ``Q[t]``). The diagonal is brought to a divisibility chain by replacing
    pairs with their gcd and lcm. Localising at ``t`` keeps the chain, so an invariant
    factor is a unit of ``F[t, t^-1]`` exactly when it is ``c * t^k``.

    References
    ----------
    .. [1] H. J. S. Smith, "On systems of linear indeterminate equations and
       congruences", Phil. Trans. R. Soc. 151 (1861).
    .. [2] G. E. Collins, "Subresultants and reduced polynomial remainder sequences",
       J. ACM 14 (1967): primitive remainder sequences.

    Raises
    ------
    TimeoutError
        When ``deadline`` (a :func:`time.thread_time` value) passes during the elimination.
    """
    import time

    A = _to_field_rows(M, p)
    size = len(A)
    diag: list[list] = []
    while A and A[0]:
        nz = [(len(A[i][j]), i, j) for i in range(len(A)) for j in range(len(A[0])) if A[i][j]]
        if not nz:
            break
        _, i0, j0 = min(nz)
        A[0], A[i0] = A[i0], A[0]
        for row in A:
            row[0], row[j0] = row[j0], row[0]
        while True:
            if deadline is not None and time.thread_time() > deadline:
                raise TimeoutError("invariant factors: time budget used up")
            piv = A[0][0]
            changed = False
            for i in range(1, len(A)):
                if A[i][0]:
                    s, q = _reduce(A[i][0], piv, p)
                    A[i] = [_psub(_scale(x, s, p), _pmul(q, y, p), p)
                            for x, y in zip(A[i], A[0], strict=True)]
                    if p is None:
                        A[i] = _primitive(A[i])
                    if A[i][0]:
                        changed = True
            for j in range(1, len(A[0])):
                if A[0][j]:
                    s, q = _reduce(A[0][j], piv, p)
                    col = [_psub(_scale(row[j], s, p), _pmul(q, row[0], p), p) for row in A]
                    if p is None:
                        col = _primitive(col)
                    for row, x in zip(A, col, strict=True):
                        row[j] = x
                    if A[0][j]:
                        changed = True
            if not changed:
                break
            nz = [(len(A[i][0]), i, 0) for i in range(len(A)) if A[i][0]]
            nz += [(len(A[0][j]), 0, j) for j in range(len(A[0])) if A[0][j]]
            _, i0, j0 = min(nz)
            A[0], A[i0] = A[i0], A[0]
            for row in A:
                row[0], row[j0] = row[j0], row[0]
        diag.append(A[0][0])
        A = [row[1:] for row in A[1:]]
    # gcd / lcm passes give the divisibility chain
    r = len(diag)
    for i in range(r):
        for j in range(i + 1, r):
            a, b = diag[i], diag[j]
            g = lp.poly_gcd_field(a, b, p) if p else _zgcd(a, b)
            if len(g) == len(a):
                continue
            prod = _pmul(a, b, p)
            if p:
                lcm = lp._trim(lp.poly_divmod_field(prod, g, p)[0])
            else:
                lcm = _zexact_div(prod, g)
            diag[i], diag[j] = g, lcm
    units = sum(1 for d in diag if _is_unit(d))
    return size - units


def _small_prime_factors(m: int, limit: int = 10_000) -> list[int]:
    out = []
    d = 2
    while d * d <= m and d <= limit:
        if m % d == 0:
            out.append(d)
            while m % d == 0:
                m //= d
        d += 1
    if 1 < m and (m <= limit * limit or d * d > m):
        out.append(m)
    return out


# A large prime always used besides 2, 3, 5, 7: if the gcd g of the k-minors over Q is
# not a unit, its primitive part reduced mod p still divides every k-minor and keeps its
# degree unless p divides its first or last coefficient, so F_p usually sees what Q sees.
LARGE_PRIME = 2_147_483_647
# Q[t, t^-1] is used only when every entry of the matrix spans at most this many
# powers of t: Euclid over the rationals swells the coefficients on long words.
Q_MAX_SPAN = 12


def module_bound_rings(plat: PlatWord) -> list[int | None]:
    """The coefficient fields used by :func:`nakanishi_lower_bound`: the primes 2, 3, 5, 7,
    the primes dividing the determinant (found by trial division up to 10^4), the prime
    ``2^31 - 1``, and ``None`` for the rationals when every matrix entry spans at most
    :data:`Q_MAX_SPAN` powers of ``t``."""
    primes = {2, 3, 5, 7, LARGE_PRIME} | set(_small_prime_factors(determinant(plat)))
    M = alexander_matrix(plat)
    small = all(lp.span(q) <= Q_MAX_SPAN for row in M for q in row)
    return sorted(primes) + ([None] if small else [])


def nakanishi_lower_bound(plat: PlatWord) -> tuple[int, str]:
    """A lower bound for the Nakanishi index (minimal number of generators of the
    Alexander module), with the ring that gives it.

    The bridge presentation matrix presents ``H_1(X~, p~) = H_1(X~) + Lambda`` (one free
    summand), so over a principal ideal domain ``R = F[t, t^-1]`` the Alexander module
    needs at least (number of non-unit invariant factors) - 1 generators; the Nakanishi
    index ``m`` is at least that, and the bridge number is at least ``m + 1``.

    Returns
    -------
    (int, str)
        The bound and a sentence naming the ring, e.g. ``"Alexander module over
        F_3[t,t^-1] has 2 non-unit invariant factors besides the free summand"``.

    References
    ----------
    .. [1] Y. Nakanishi, "A note on unknotting number", Math. Sem. Notes Kobe Univ. 9
       (1981): the minimal number of generators of the Alexander module.
    .. [2] H. J. S. Smith (1861): invariant factors over a principal ideal domain.
    """
    M = alexander_matrix(plat)
    best, best_ring = 0, None
    for p in module_bound_rings(plat):
        k = invariant_factor_count(M, p) - 1
        if k > best:
            best, best_ring = k, p
    ring = "Q[t,t^-1]" if best_ring is None else f"F_{best_ring}[t,t^-1]"
    if best == 0:
        return 0, "every invariant factor of the Alexander matrix is a unit over " \
                  "F_p[t,t^-1] (p = 2, 3, 5, 7, 2^31-1 and primes dividing det) and Q[t,t^-1]"
    return best, (f"Alexander module over {ring} has {best} non-unit invariant "
                  f"factor{'s' if best != 1 else ''} besides the free summand")
