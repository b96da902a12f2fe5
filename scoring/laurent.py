"""Small exact Laurent polynomials over Z and over prime fields, stored as dictionaries."""

from __future__ import annotations

from collections.abc import Sequence
from fractions import Fraction

__all__ = [
    "Laurent",
    "clean",
    "add",
    "sub",
    "mul",
    "scale",
    "shift",
    "evaluate",
    "span",
    "normalize_unit",
    "symmetrize",
    "equal_up_to_unit",
    "det",
    "pack",
    "unpack",
    "poly_gcd_field",
    "poly_divmod_field",
]

# A Laurent polynomial is a dict {exponent: nonzero coefficient}; {} is zero.
Laurent = dict


def clean(p: dict) -> dict:
    """Drop zero coefficients and sort by exponent."""
    return {e: c for e, c in sorted(p.items()) if c}


def add(p: dict, q: dict) -> dict:
    out = dict(p)
    for e, c in q.items():
        out[e] = out.get(e, 0) + c
    return clean(out)


def sub(p: dict, q: dict) -> dict:
    return add(p, scale(q, -1))


def scale(p: dict, c: int) -> dict:
    return clean({e: c * v for e, v in p.items()})


def shift(p: dict, k) -> dict:
    """Multiply by ``t^k``."""
    return {e + k: c for e, c in p.items()}


def mul(p: dict, q: dict) -> dict:
    """Product, by Kronecker substitution for large integer inputs."""
    if not p or not q:
        return {}
    if len(p) * len(q) <= 256 or not _all_int_exponents(p, q):
        out: dict = {}
        for e1, c1 in p.items():
            for e2, c2 in q.items():
                out[e1 + e2] = out.get(e1 + e2, 0) + c1 * c2
        return clean(out)
    lp, lq = min(p), min(q)
    bound = sum(abs(c) for c in p.values()) * sum(abs(c) for c in q.values())
    B = bound.bit_length() + 2
    x = pack(shift(p, -lp), B) * pack(shift(q, -lq), B)
    return shift(unpack(x, B), lp + lq)


def _all_int_exponents(*ps: dict) -> bool:
    return all(isinstance(e, int) and isinstance(c, int) for p in ps for e, c in p.items())


def evaluate(p: dict, x):
    """Value at ``t = x`` (use a Fraction or an int; negative exponents need x != 0)."""
    total = 0
    for e, c in p.items():
        total += c * (Fraction(x) ** e if e < 0 else x ** e)
    return total


def span(p: dict) -> int:
    """Highest minus lowest exponent (0 for zero)."""
    return (max(p) - min(p)) if p else 0


def normalize_unit(p: dict) -> dict:
    """Representative of ``p`` up to ``+-t^k``: lowest exponent 0, top coefficient > 0."""
    if not p:
        return {}
    lo = min(p)
    sign = 1 if p[max(p)] > 0 else -1
    return {e - lo: sign * c for e, c in sorted(p.items())}


def symmetrize(p: dict) -> dict:
    """Shift by a power of ``t`` so the exponents are as symmetric about 0 as integer
    exponents allow (lowest exponent ``-(span // 2)``); the sign is left alone."""
    if not p:
        return {}
    lo = min(p)
    shift = lo + span(p) // 2  # computed once: span is linear in the number of terms
    return {e - shift: c for e, c in sorted(p.items())}


def equal_up_to_unit(p: dict, q: dict) -> bool:
    """Whether ``p = +-t^k q`` for some integer ``k``."""
    return normalize_unit(clean(p)) == normalize_unit(clean(q))


# -- Kronecker substitution ---------------------------------------------------------------


def pack(p: dict, B: int) -> int:
    """The integer ``p(2^B)`` for a polynomial with nonnegative integer exponents."""
    x = 0
    for e, c in p.items():
        x += c << (B * e)
    return x


def unpack(x: int, B: int) -> dict:
    """Inverse of :func:`pack` for coefficients of absolute value below ``2^(B-1)``."""
    out = {}
    half = 1 << (B - 1)
    mask = (1 << B) - 1
    e = 0
    while x:
        d = x & mask
        if d >= half:
            d -= 1 << B
        if d:
            out[e] = d
        x = (x - d) >> B
        e += 1
    return out


def det(matrix: Sequence[Sequence[dict]]) -> dict:
    """Determinant of a square matrix over ``Z[t, t^-1]``.

    Each row is shifted to nonnegative exponents, every entry is evaluated at
    ``t = 2^B`` with ``B`` above the bit size of any coefficient of the determinant
    (bounded by the product of the rows' l1 norms), the integer determinant is taken by
    fraction-free elimination, and the result is read back in base ``2^B``.

    References
    ----------
    .. [1] L. Kronecker (1882): substitution of a large power for the variable.
    .. [2] E. H. Bareiss, "Sylvester's identity and multistep integer-preserving Gaussian
       elimination", Math. Comp. 22 (1968).
    """
    m = len(matrix)
    if m == 0:
        return {0: 1}
    total_shift = 0
    rows = []
    bound = 1
    for row in matrix:
        exps = [e for p in row for e in p]
        if not exps:
            return {}
        lo = min(exps)
        total_shift += lo
        rows.append([shift(p, -lo) for p in row])
        bound *= sum(abs(c) for p in row for c in p.values())
    B = bound.bit_length() + 2
    a = [[pack(p, B) for p in row] for row in rows]
    d = _bareiss(a)
    return shift(unpack(d, B), total_shift) if d else {}


def _bareiss(a: list[list[int]]) -> int:
    # Fraction-free Gaussian elimination on a square integer matrix (modified in place).
    m = len(a)
    sign = 1
    prev = 1
    for k in range(m - 1):
        if a[k][k] == 0:
            for r in range(k + 1, m):
                if a[r][k] != 0:
                    a[k], a[r] = a[r], a[k]
                    sign = -sign
                    break
            else:
                return 0
        akk = a[k][k]
        for i in range(k + 1, m):
            aik = a[i][k]
            rowi, rowk = a[i], a[k]
            for j in range(k + 1, m):
                rowi[j] = (rowi[j] * akk - aik * rowk[j]) // prev
        prev = akk
    return sign * a[m - 1][m - 1]


# -- polynomials over a field (coefficient lists, lowest degree first) --------------------


def _trim(a: list) -> list:
    while a and a[-1] == 0:
        a.pop()
    return a


def poly_divmod_field(a: list, b: list, p: int | None) -> tuple[list, list]:
    """Quotient and remainder of polynomials over ``F_p`` (``p`` prime) or ``Q``
    (``p = None``, Fraction coefficients). Lists hold coefficients, lowest degree first;
    ``b`` must be nonzero and trimmed."""
    if p and p < _NUMPY_PRIME and len(a) * len(b) > 256:
        return _divmod_numpy(a, b, p)
    a = list(a)
    db = len(b) - 1
    inv = pow(b[-1], -1, p) if p else Fraction(1) / b[-1]
    q = [0] * max(len(a) - db, 0)
    while len(a) - 1 >= db and a:
        c = a[-1] * inv
        if p:
            c %= p
        k = len(a) - 1 - db
        q[k] = c
        for i, bi in enumerate(b):
            a[k + i] -= c * bi
            if p:
                a[k + i] %= p
        _trim(a)
    return q, a


# Primes below this keep every product c * b of two residues inside int64.
_NUMPY_PRIME = 1 << 31


def _divmod_numpy(a: list, b: list, p: int) -> tuple[list, list]:
    """:func:`poly_divmod_field` over ``F_p``, ``p < 2^31``, one vector operation per
    quotient term."""
    import numpy as np

    r = np.array(a, dtype=np.int64) % p
    bb = np.array(b, dtype=np.int64) % p
    db = len(b) - 1
    inv = pow(int(bb[-1]), -1, p)
    n = len(a) - db
    q = [0] * max(n, 0)
    for k in range(n - 1, -1, -1):
        c = int(r[k + db]) * inv % p
        if c:
            q[k] = c
            r[k:k + db + 1] = (r[k:k + db + 1] - c * bb) % p
    return q, _trim(r[:db].tolist() if n > 0 else r.tolist())


def poly_gcd_field(a: list, b: list, p: int | None) -> list:
    """Monic gcd of two polynomials over ``F_p`` or ``Q`` (``[]`` when both are zero)."""
    a, b = _trim(list(a)), _trim(list(b))
    while b:
        _, r = poly_divmod_field(a, b, p)
        a, b = b, r
    if not a:
        return []
    inv = pow(a[-1], -1, p) if p else Fraction(1) / a[-1]
    return [(c * inv) % p if p else c * inv for c in a]
