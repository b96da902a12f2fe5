"""Conditions that the Jones and Alexander polynomials of an alternating link satisfy."""

from __future__ import annotations

from fractions import Fraction

__all__ = ["jones_obstruction", "alexander_obstruction"]


def _fmt(e) -> str:
    f = Fraction(e)
    return str(f.numerator) if f.denominator == 1 else f"{f.numerator}/{f.denominator}"


def _sign_break(poly: dict) -> tuple | None:
    """Two exponents whose coefficients break the alternation of signs: the sign of the
    coefficient of ``t^e`` times ``(-1)^(e - e_min)`` must be constant."""
    terms = sorted((Fraction(e), c) for e, c in poly.items() if c)
    if not terms:
        return None
    e0, c0 = terms[0]
    ref = 1 if c0 > 0 else -1
    for e, c in terms[1:]:
        step = e - e0
        if step.denominator != 1:
            return None  # mixed exponent classes: not a link polynomial, claim nothing
        want = ref * (1 if int(step) % 2 == 0 else -1)
        if (1 if c > 0 else -1) != want:
            return (e0, c0), (e, c)
    return None


def jones_obstruction(jones: dict, det: int) -> str | None:
    """Why a link with this Jones polynomial and determinant is not a non-split
    alternating link, or None.

    For a reduced alternating diagram of a non-split link with ``c`` crossings the Jones
    polynomial ``V(t)`` has span ``c``, extreme coefficients ``+-1``, and coefficients
    that alternate in sign; and the determinant is at least ``c`` (Bankwitz). Every
    alternating link has a reduced alternating diagram (remove nugatory crossings).

    Parameters
    ----------
    jones : dict
        ``{exponent: coefficient}``, exponents integers or half-integers.
    det : int
        The determinant ``|V(-1)|``.

    Returns
    -------
    str or None
        The condition that fails, in words.

    References
    ----------
    .. [1] L. H. Kauffman, "State models and the Jones polynomial", Topology 26 (1987).
    .. [2] K. Murasugi, "Jones polynomials and classical conjectures in knot theory",
       Topology 26 (1987).
    .. [3] M. B. Thistlethwaite, "A spanning tree expansion of the Jones polynomial",
       Topology 26 (1987): the coefficients alternate in sign.
    .. [4] C. Bankwitz, "Über die Torsionszahlen der alternierenden Knoten", Math. Ann.
       103 (1930): ``det >= c`` for a reduced alternating diagram.
    """
    terms = {Fraction(e): c for e, c in jones.items() if c}
    if not terms:
        return None
    lo, hi = min(terms), max(terms)
    brk = _sign_break(terms)
    if brk is not None:
        (e0, c0), (e, c) = brk
        return (f"its Jones polynomial does not alternate in sign (coefficient {c0} at "
                f"t^{_fmt(e0)} and {c} at t^{_fmt(e)}), as that of a non-split alternating "
                "link must (Thistlethwaite 1987)")
    if abs(terms[lo]) != 1 or abs(terms[hi]) != 1:
        return (f"its Jones polynomial has extreme coefficients {terms[lo]} and {terms[hi]}, "
                "not ±1 as for a reduced alternating diagram of a non-split link "
                "(Kauffman 1987, Murasugi 1987, Thistlethwaite 1987)")
    span = hi - lo
    if det and span > det:
        return (f"the span {_fmt(span)} of its Jones polynomial exceeds its determinant "
                f"{det}; a reduced alternating diagram has span = crossings "
                "(Kauffman–Murasugi–Thistlethwaite 1987) ≤ determinant (Bankwitz 1930)")
    return None


def alexander_obstruction(alexander: dict) -> str | None:
    """Why a knot with this Alexander polynomial is not alternating, or None.

    The Alexander polynomial of an alternating knot alternates in sign (Crowell 1959,
    Murasugi 1958): the sign of the coefficient of ``t^i`` times ``(-1)^i`` is constant
    over the nonzero coefficients. (Zero coefficients are not used: the claim needs
    only the weak form of the theorem.)

    References
    ----------
    .. [1] R. H. Crowell, "Genus of alternating link types", Ann. of Math. 69 (1959).
    .. [2] K. Murasugi, "On the genus of the alternating knot I, II", J. Math. Soc.
       Japan 10 (1958).
    """
    brk = _sign_break(alexander)
    if brk is None:
        return None
    (e0, c0), (e, c) = brk
    return (f"its Alexander polynomial does not alternate in sign (coefficient {c0} at "
            f"t^{_fmt(e0)} and {c} at t^{_fmt(e)}), as that of an alternating knot must "
            "(Crowell 1959, Murasugi 1958)")
