"""From a PD diagram to a plat with as few bridges as the diagram's Wirtinger number."""

from __future__ import annotations

from dataclasses import dataclass

from plait.diagrams.heights import DIRECTIONS, Degenerate, drawing, lift, sweep_plat
from plait.diagrams.pd import PDCode, pd_components
from plait.diagrams.pdjones import pd_jones, pd_jones_all_orientations, plat_jones
from plait.diagrams.wirtinger import Wirtinger, wirtinger
from plait.errors import GuardViolation, InputError
from plait.word import PlatWord

__all__ = ["DiagramPlat", "diagram_to_plat", "pd_to_plat", "tidy", "check_plat"]


@dataclass(frozen=True)
class DiagramPlat:
    """A plat built from a diagram, with how it was built.

    Attributes
    ----------
    plat : PlatWord
        The plat; its closure is the diagram's link (guarded by the Jones polynomial).
    route : str
        ``"wirtinger"`` (bridge position from a coloring) or ``"vogel"`` (closed braid).
    wirtinger : Wirtinger or None
        Seeds and coloring sequence used (None for the empty diagram or the Vogel route).
    direction : tuple of int or None
        The projection direction that gave the shortest word.
    directions_tried : int
        Directions tried (degenerate ones included).
    """

    plat: PlatWord
    route: str
    wirtinger: Wirtinger | None
    direction: tuple[int, int] | None
    directions_tried: int

    def to_dict(self) -> dict:
        return {
            "plat": self.plat.to_dict(),
            "route": self.route,
            "wirtinger": None if self.wirtinger is None else self.wirtinger.to_dict(),
            "direction": None if self.direction is None else list(self.direction),
            "directions_tried": self.directions_tried,
        }


def tidy(plat: PlatWord) -> PlatWord:
    """Cheap shortening that keeps the plat closure: free reduction, and deletion of a
    letter ``sigma_{2i-1}^{+-1}`` that commutes to either end of the word.

    A twist of a cap pair (or a cup pair) lies in Hilden's pairing subgroup, so it can
    be absorbed into the caps (cups).

    References
    ----------
    .. [1] H. M. Hilden, "Generators for two groups related to the braid group", Pacific
       J. Math. 59 (1975).
    """
    w = list(plat.word)
    changed = True
    while changed:
        changed = False
        out: list[int] = []
        for g in w:
            if out and out[-1] == -g:
                out.pop()
                changed = True
            else:
                out.append(g)
        w = out
        for rev in (False, True):
            seq = w[::-1] if rev else w
            touched: set[int] = set()
            keep = []
            for g in seq:
                k = abs(g)
                if k % 2 == 1 and k not in touched and k - 1 not in touched \
                        and k + 1 not in touched:
                    changed = True
                    continue  # commutes to the end: absorbed by the caps/cups
                keep.append(g)
                touched.add(k)
            w = keep[::-1] if rev else keep
    return plat.with_word(w)


def check_plat(pd: PDCode, plat: PlatWord) -> None:
    """Guard: the plat's closure has the diagram's number of components and Jones
    polynomial (for a link, the diagram's Jones under some reorientation of components).

    Raises
    ------
    GuardViolation
        When an invariant differs.
    """
    ncomp = len(pd_components(pd)) if pd.length else 1
    if plat.components != ncomp:
        raise GuardViolation("components", ncomp, plat.components, "diagram -> plat")
    if pd.length == 0:
        if plat.word:
            raise GuardViolation("jones", {0: 1}, None, "diagram -> plat")
        return
    mine = plat_jones(plat)
    if ncomp == 1:
        theirs = pd_jones(pd)
        if mine != theirs:
            raise GuardViolation("jones", theirs, mine, "diagram -> plat")
        return
    options = pd_jones_all_orientations(pd)
    if mine not in options:
        raise GuardViolation("jones", options[0], mine, "diagram -> plat (any orientation)")


def _wirtinger_route(pd: PDCode, wirt: Wirtinger, directions: int) -> DiagramPlat:
    pos = drawing(pd)
    lf = lift(pd, wirt, pos)
    best: PlatWord | None = None
    best_dir = None
    tried = 0
    for d in DIRECTIONS:
        if tried >= directions and best is not None:
            break
        tried += 1
        try:
            p = tidy(sweep_plat(lf, d))
        except Degenerate:
            continue
        if best is None or p.length < best.length:
            best, best_dir = p, d
    if best is None:  # pragma: no cover - every candidate direction degenerate
        raise Degenerate("no generic direction among the candidates")
    return DiagramPlat(best, "wirtinger", wirt, best_dir, tried)


def diagram_to_plat(pd: PDCode, *, method: str = "auto", time_limit: float = 10.0,
                    seed: int = 0, directions: int = 8, guard: bool = True) -> DiagramPlat:
    """Plat of a PD diagram with as many bridges as the diagram's Wirtinger number.

    A coloring sequence from the fewest seeds found (CP-SAT,
    :func:`plait.diagrams.wirtinger.wirtinger`) gives a height function on the diagram with
    one maximum per seed, all above the minima (:func:`plait.diagrams.heights.lift`); the
    lifted link is projected onto vertical planes along several generic horizontal
    directions and read as plats by sweeping the height downward
    (:func:`plait.diagrams.heights.sweep_plat`). The shortest word is kept.

    Parameters
    ----------
    pd : PDCode
        The diagram (validated).
    method : {"auto", "wirtinger", "vogel"}
        ``"auto"`` takes the Wirtinger route and falls back to Vogel's closed braid when
        no generic direction is found.
    time_limit : float
        Seconds for the Wirtinger solver.
    seed : int
        Random seed of the solver.
    directions : int
        Number of non-degenerate projection directions to try.
    guard : bool
        Check the Jones polynomial against the diagram's (see :func:`check_plat`).

    Raises
    ------
    GuardViolation
        When the plat's invariants differ from the diagram's.

    References
    ----------
    .. [1] R. Blair, A. Kjuchukova, M. Ozawa, "The incompatibility of crossing number and
       bridge number for knot diagrams", Discrete Math. 344 (2021).
    .. [2] P. Vogel, "Representation of links by braids: a new algorithm", Comment. Math.
       Helv. 65 (1990).
    """
    if method not in ("auto", "wirtinger", "vogel"):
        raise InputError(f"pd: unknown conversion method {method!r} (auto, wirtinger, vogel)")
    if pd.length == 0:
        return DiagramPlat(PlatWord(2, ()), "wirtinger", None, None, 0)
    if method == "vogel":
        out = _vogel_route(pd)
    else:
        wirt = wirtinger(pd, method="cpsat", time_limit=time_limit, seed=seed)
        try:
            out = _wirtinger_route(pd, wirt, directions)
        except Degenerate:
            if method == "wirtinger":
                raise InputError("pd: no generic projection direction found") from None
            out = _vogel_route(pd)
    if guard:
        check_plat(pd, out.plat)
    return out


def _vogel_route(pd: PDCode) -> DiagramPlat:
    from plait.diagrams.vogel import pd_to_closed_braid

    braid = pd_to_closed_braid(pd)
    return DiagramPlat(tidy(braid.to_plat()), "vogel", None, None, 0)


def pd_to_plat(pd: PDCode, *, method: str = "auto", time_limit: float = 10.0,
               seed: int = 0) -> PlatWord:
    """Plat word of a PD diagram with the diagram's Wirtinger number of bridges.

    See :func:`diagram_to_plat`, which also returns the seeds and the route taken.
    """
    return diagram_to_plat(pd, method=method, time_limit=time_limit, seed=seed).plat
