"""H_1 of the double branched cover (coloring matrix) and its linking form (Goeritz matrix)."""

from __future__ import annotations

from collections.abc import Sequence
from functools import lru_cache

import numpy as np

from plait.word import PlatWord

__all__ = [
    "smith_invariants",
    "double_cover_homology",
    "linking_form_class",
    "square_class",
    "jacobi",
    "odd_prime_divisors",
]


def smith_invariants(matrix: Sequence[Sequence[int]]) -> list[int]:
    """Invariant factors of an integer matrix (its Smith normal form over Z).

    Parameters
    ----------
    matrix : sequence of sequences of int
        An ``r x c`` integer matrix.

    Returns
    -------
    list of int
        ``min(r, c)`` nonnegative integers ``d_1 | d_2 | ...`` (zeros last): the cokernel
        is ``Z/d_1 + ... + Z/d_k + Z^(r - k)``, where ``Z/0 = Z`` and ``Z/1 = 0``.

    Notes
    -----
    Row and column operations with the entry of least absolute value as pivot (Euclid on
    the pivot's row and column); when the pivot does not divide the rest of the matrix,
    the offending row is added to the pivot's row, which keeps the diagonal a
    divisibility chain. Exact with Python integers; meant for the small ``n x n``
    matrices of a bridge presentation.

    References
    ----------
    .. [1] H. J. S. Smith, "On systems of linear indeterminate equations and
       congruences", Phil. Trans. R. Soc. 151 (1861).
    """
    A = [[int(x) for x in row] for row in matrix]
    diag: list[int] = []
    while A and A[0]:
        entries = [(abs(A[i][j]), i, j) for i in range(len(A)) for j in range(len(A[0]))
                   if A[i][j]]
        if not entries:
            diag += [0] * min(len(A), len(A[0]))
            break
        _, i0, j0 = min(entries)
        A[0], A[i0] = A[i0], A[0]
        for row in A:
            row[0], row[j0] = row[j0], row[0]
        while True:
            piv = A[0][0]
            dirty = False
            for i in range(1, len(A)):
                if A[i][0]:
                    q = A[i][0] // piv
                    A[i] = [x - q * y for x, y in zip(A[i], A[0], strict=True)]
                    dirty = dirty or A[i][0] != 0
            for j in range(1, len(A[0])):
                if A[0][j]:
                    q = A[0][j] // piv
                    for row in A:
                        row[j] -= q * row[0]
                    dirty = dirty or A[0][j] != 0
            if not dirty:
                bad = next((i for i in range(1, len(A))
                            if any(x % piv for x in A[i][1:])), None)
                if bad is None:
                    break
                A[0] = [x + y for x, y in zip(A[0], A[bad], strict=True)]
            # move the smallest nonzero entry of the pivot's row and column to the corner
            cand = [(abs(A[i][0]), i, 0) for i in range(len(A)) if A[i][0]]
            cand += [(abs(A[0][j]), 0, j) for j in range(1, len(A[0])) if A[0][j]]
            _, i0, j0 = min(cand)
            A[0], A[i0] = A[i0], A[0]
            for row in A:
                row[0], row[j0] = row[j0], row[0]
        diag.append(abs(A[0][0]))
        A = [row[1:] for row in A[1:]]
    nonzero = sorted(d for d in diag if d)
    return nonzero + [0] * (len(diag) - len(nonzero))


@lru_cache(maxsize=4096)
def double_cover_homology(plat: PlatWord) -> tuple[int, ...]:
    """The non-trivial invariant factors of ``H_1`` of the double branched cover.

    The Fox coloring matrix of the bridge presentation
    (:func:`plait.scoring.alexander.fox_matrix`, ``n x n`` for ``n`` bridges) presents
    the group of Z-valued Fox colorings, which is ``H_1(Sigma_2) + Z`` for every link
    (the coloring group; the bridge presentation of the Alexander module at
    ``t = -1``). Its Smith normal form less one zero is the answer: no factoring of the
    determinant is needed.

    Returns
    -------
    tuple of int
        ``(d_1, ..., d_k)`` with ``1 < d_1 | d_2 | ... | d_k`` (``0`` stands for a ``Z``
        summand): ``H_1(Sigma_2) = Z/d_1 + ... + Z/d_k``. Its length is the least number
        of generators of ``H_1(Sigma_2)``, and the bridge number is at least that plus one,
        since the double cover of ``S^3`` branched over a ``b``-bridge link has a Heegaard
        splitting of genus ``b - 1``.

    References
    ----------
    .. [1] R. H. Fox, "A quick trip through knot theory" (1962): colorings and the
       double branched cover.
    .. [2] J. H. Przytycki, "3-coloring and other elementary invariants of knots", Banach
       Center Publ. 42 (1998): the coloring group is ``H_1(Sigma_2) + Z``.
    """
    from plait.scoring.alexander import fox_matrix

    inv = smith_invariants(fox_matrix(plat))
    inv = [d for d in inv if d != 1]
    inv.remove(0)  # the Z summand of the trivial colorings; always present
    return tuple(inv)


# -- the linking form of a cyclic H_1 ---------------------------------------------------


def jacobi(a: int, n: int) -> int:
    """The Jacobi symbol ``(a / n)`` for odd ``n > 0`` (the Legendre symbol when ``n`` is
    prime).

    References
    ----------
    .. [1] C. G. J. Jacobi, "Über die Kreistheilung und ihre Anwendung auf die
       Zahlentheorie", J. Reine Angew. Math. 30 (1846).
    """
    a %= n
    result = 1
    while a:
        while a % 2 == 0:
            a //= 2
            if n % 8 in (3, 5):
                result = -result
        a, n = n, a
        if a % 4 == 3 and n % 4 == 3:
            result = -result
        a %= n
    return result if n == 1 else 0


def square_class(a: int, p: int, primes: Sequence[int]) -> tuple[int, ...]:
    """Legendre symbols ``(a s_r / r)`` for the odd primes ``r`` of ``primes`` dividing
    ``p``, with ``s_r`` the part of ``p`` prime to ``r``: the square class of the form
    ``a / p`` on ``Z/p`` at each odd prime, as :func:`linking_form_class` reports it."""
    out = []
    for r in primes:
        s = p
        while s % r == 0:
            s //= r
        out.append(jacobi(a * s, r))
    return tuple(out)


def _det_mod(A: np.ndarray, r: int) -> int:
    """Determinant of a square int64 matrix modulo a prime ``r < 2^31``."""
    A = A % r
    m = A.shape[0]
    det = 1
    for c in range(m):
        nz = np.nonzero(A[c:, c])[0]
        if nz.size == 0:
            return 0
        piv = c + int(nz[0])
        if piv != c:
            A[[c, piv]] = A[[piv, c]]
            det = -det
        pv = int(A[c, c])
        det = det * pv % r
        inv = pow(pv, -1, r)
        below = A[c + 1:, c].copy()
        if below.any():
            f = (below * inv) % r
            A[c + 1:, c:] = (A[c + 1:, c:] - np.outer(f, A[c, c:]) % r) % r
    return det % r


def _kernel_vector_mod(A: np.ndarray, r: int) -> np.ndarray | None:
    """A nonzero vector ``v`` with ``A v = 0 mod r`` (prime ``r``), or None."""
    A = A % r
    m, n = A.shape
    pivots: list[int] = []
    row = 0
    for c in range(n):
        nz = np.nonzero(A[row:, c])[0]
        if nz.size == 0:
            continue
        piv = row + int(nz[0])
        A[[row, piv]] = A[[piv, row]]
        A[row] = A[row] * pow(int(A[row, c]), -1, r) % r
        others = np.nonzero(A[:, c])[0]
        for i in others:
            if i != row:
                A[i] = (A[i] - int(A[i, c]) * A[row]) % r
        pivots.append(c)
        row += 1
        if row == m:
            break
    free = [c for c in range(n) if c not in pivots]
    if not free:
        return None
    f = free[0]
    v = np.zeros(n, dtype=np.int64)
    v[f] = 1
    for i, c in enumerate(pivots):
        v[c] = (-A[i, f]) % r
    return v


_SIGN_PRIME = 2_147_483_647  # decides the sign of det G when |det G| is below half of it


@lru_cache(maxsize=4096)
def linking_form_class(plat: PlatWord, p: int, primes: tuple[int, ...]) -> tuple[int, ...] | None:
    """Square class of the linking form of the double branched cover at odd primes.

    When ``H_1(Sigma_2)`` is cyclic of order ``p`` its linking form is ``x, y -> a x y /
    p`` for a generator, with ``a`` a unit mod ``p`` determined up to squares; for the
    lens space ``L(p, q)`` it is ``q/p`` up to sign convention (Seifert 1933). A Goeritz
    matrix ``G`` of the diagram presents ``H_1(Sigma_2)`` and ``G^-1`` gives the form
    (Gordon–Litherland 1978). At an odd prime ``r | p`` the class of ``a`` is read from
    one diagonal entry of the adjugate of ``G``: modulo ``r`` the adjugate has rank one,
    ``c v v^T`` with ``v`` spanning the kernel, so an entry ``j`` with ``v_j != 0`` gives
    ``lambda(e_j, e_j) = adj_jj / det G`` with ``adj_jj`` prime to ``r``.

    Parameters
    ----------
    plat : PlatWord
    p : int
        The determinant, ``|det G|``; below ``2^30``.
    primes : tuple of int
        The distinct odd primes dividing ``p``.

    Returns
    -------
    tuple of int or None
        For each prime ``r`` of ``primes``, the Legendre symbol of ``a * (p / r^k)`` mod
        ``r`` (see :func:`square_class`); None when the Goeritz matrix does not present
        a cyclic group of order ``p`` at these primes (then nothing is claimed).

    References
    ----------
    .. [1] H. Seifert, "Verschlingungsinvarianten", Sitzungsber. Preuss. Akad. Wiss.
       (1933): the linking form of a lens space.
    .. [2] C. McA. Gordon and R. A. Litherland, "On the signature of a link",
       Invent. Math. 47 (1978): the Goeritz matrix and the double branched cover.
    """
    from plait.scoring.signature import goeritz_matrix

    G = np.array(goeritz_matrix(plat), dtype=np.int64)
    if G.size == 0 or p >= _SIGN_PRIME // 2:
        return None
    d = _det_mod(G.copy(), _SIGN_PRIME)
    if d == p % _SIGN_PRIME:
        sign = 1
    elif d == (-p) % _SIGN_PRIME:
        sign = -1
    else:
        return None
    out = []
    for r in primes:
        v = _kernel_vector_mod(G.copy(), r)
        if v is None:
            return None
        j = int(np.nonzero(v)[0][0])
        minor = np.delete(np.delete(G, j, axis=0), j, axis=1)
        adj = _det_mod(minor, r) if minor.size else 1
        if adj == 0:
            return None  # r-torsion not cyclic
        s = p
        while s % r == 0:
            s //= r
        out.append(jacobi(sign * adj * s, r))
    return tuple(out)


def odd_prime_divisors(p: int) -> tuple[int, ...]:
    """The distinct odd primes dividing ``p`` (trial division; for small ``p``)."""
    out = []
    n = abs(p)
    while n and n % 2 == 0:
        n //= 2
    r = 3
    while r * r <= n:
        if n % r == 0:
            out.append(r)
            while n % r == 0:
                n //= r
        r += 2
    if n > 1:
        out.append(n)
    return tuple(out)
