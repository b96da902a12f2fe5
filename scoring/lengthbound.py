"""A lower bound on the length of every plat of a link: the span of its Jones polynomial."""

from __future__ import annotations

from dataclasses import dataclass

from plait.word import PlatWord

__all__ = ["LengthBound", "jones_span", "length_lower_bound"]


@dataclass(frozen=True)
class LengthBound:
    """A lower bound on the number of letters of any plat of a link.

    Attributes
    ----------
    value : int
        No plat of the link has fewer letters.
    reason : str
        The theorem and the computed quantity.
    """

    value: int
    reason: str

    def proves(self, plat: PlatWord) -> bool:
        """True when ``plat`` has as few letters as the bound allows."""
        return plat.length <= self.value


def jones_span(v: dict) -> int:
    """Highest minus lowest exponent of a Jones polynomial ``{exponent: coefficient}``
    (0 for the empty or constant polynomial)."""
    exps = [e for e, c in v.items() if c]
    return int(max(exps) - min(exps)) if exps else 0


def length_lower_bound(plat: PlatWord, jones_poly: dict | None = None) -> LengthBound:
    """The span of the Jones polynomial, a lower bound on the length of every plat.

    A plat word with ``L`` letters closes to a diagram with ``L`` crossings, so the
    crossing number bounds the length from below. For a connected diagram with ``c``
    crossings the span of the Jones polynomial is at most ``c``, with equality for
    reduced alternating diagrams (Kauffman, Murasugi, Thistlethwaite). A diagram of a
    link of ``mu`` components has at most ``mu`` split pieces and each extra piece adds
    one to the span (a factor ``-t^(1/2) - t^(-1/2)``), so ``L >= span - (mu - 1)``;
    for a knot ``L >= span``.

    Parameters
    ----------
    plat : PlatWord
        Any plat of the link (the one with fewest bridges is cheapest).
    jones_poly : dict, optional
        Its Jones polynomial when already known.

    Returns
    -------
    LengthBound

    References
    ----------
    .. [1] L. H. Kauffman, "State models and the Jones polynomial", Topology 26 (1987).
    .. [2] K. Murasugi, "Jones polynomials and classical conjectures in knot theory",
       Topology 26 (1987).
    .. [3] M. B. Thistlethwaite, "A spanning tree expansion of the Jones polynomial",
       Topology 26 (1987).
    """
    from plait.scoring.jones import MAX_JONES_BRIDGES, jones

    if jones_poly is None:
        if plat.bridges > MAX_JONES_BRIDGES:
            return LengthBound(0, f"the Jones polynomial is not computed for "
                                  f"{plat.bridges} bridges (limit {MAX_JONES_BRIDGES})")
        jones_poly = jones(plat)
    span = jones_span(jones_poly)
    mu = plat.components
    value = max(0, span - (mu - 1))
    if mu == 1:
        why = (f"the Jones polynomial has span {span}, and span ≤ crossing number ≤ "
               f"letters of any plat (Kauffman–Murasugi–Thistlethwaite)")
    else:
        why = (f"the Jones polynomial has span {span}; a diagram of {mu} components has "
               f"at least span - {mu - 1} crossings (Kauffman–Murasugi–Thistlethwaite, "
               f"one per split piece)")
    return LengthBound(value, why)
