"""From a PD diagram to a plat with as few bridges as the diagram's Wirtinger number."""

from __future__ import annotations

import itertools
import random
from collections.abc import Iterator
from dataclasses import dataclass
from functools import lru_cache
from math import comb

from plait.diagrams.heights import DIRECTIONS, Degenerate, drawing, lift, sweep_plat
from plait.diagrams.pd import PDCode, pd_components
from plait.diagrams.pdjones import pd_jones, pd_jones_all_orientations, plat_jones
from plait.diagrams.wirtinger import Wirtinger, coloring_steps, diagram_arcs, wirtinger
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
    drawn_from : str
        Which drawing of the diagram gave the word: ``"the diagram"``, or a diagram with
        the same crossings met on the way (see :func:`diagram_to_plat`).
    sweeps : int
        Plats read off in all (one per seed set, drawing and direction).
    """

    plat: PlatWord
    route: str
    wirtinger: Wirtinger | None
    direction: tuple[int, int] | None
    directions_tried: int
    drawn_from: str = "the diagram"
    sweeps: int = 0

    def to_dict(self) -> dict:
        return {
            "plat": self.plat.to_dict(),
            "route": self.route,
            "wirtinger": None if self.wirtinger is None else self.wirtinger.to_dict(),
            "direction": None if self.direction is None else list(self.direction),
            "directions_tried": self.directions_tried,
            "drawn_from": self.drawn_from,
            "sweeps": self.sweeps,
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


# The Jones polynomial of the last diagrams converted: the short-word search's stopping
# bound and the guard both need it (PDCode is a frozen dataclass, so it keys a cache).
@lru_cache(maxsize=16)
def _diagram_jones(pd: PDCode) -> dict:
    return pd_jones(pd)


@lru_cache(maxsize=16)
def _diagram_jones_options(pd: PDCode) -> tuple:
    return tuple(pd_jones_all_orientations(pd))


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
        theirs = _diagram_jones(pd)
        if mine != theirs:
            raise GuardViolation("jones", theirs, mine, "diagram -> plat")
        return
    options = _diagram_jones_options(pd)
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
    return DiagramPlat(best, "wirtinger", wirt, best_dir, tried, sweeps=tried)


# Seed sets of one size are listed in full up to this many candidates; past it, only
# the solver's set and its single swaps are tried (the cost of a check is linear).
_ALL_SEED_SETS = 20_000
# Seed sets tried per drawing other than the given one.
_PER_DRAWING = 6


def _seed_sets(arcs, size: int, first: tuple[int, ...] | None, rng: random.Random,
               ) -> Iterator[tuple[int, ...]]:
    # seed sets of the given size that color every arc: ``first`` (when given) leads,
    # the others follow in a shuffled order fixed by ``rng``; checked lazily, since a
    # large diagram's words run out of budget long before its seed sets do
    n = len(arcs)
    if comb(n, size) <= _ALL_SEED_SETS:
        pool = list(itertools.combinations(range(n), size))
    elif first is not None:
        pool = sorted({tuple(sorted(set(first) - {a} | {b}))
                       for a in first for b in range(n) if b not in first})
    else:
        return
    rng.shuffle(pool)
    lead = None if first is None else tuple(sorted(first))
    if lead is not None:
        yield lead
    for s in pool:
        if s != lead and coloring_steps(arcs, s) is not None:
            yield s


def _drawings(pd: PDCode) -> Iterator[tuple[str, PDCode]]:
    # other drawings of the same diagram size: flypes and Reidemeister III moves (each
    # keeps the crossing number), the reversed diagram, and the same code with its
    # crossings listed from another place (the grid drawing depends on that order);
    # interleaved so that a small budget sees some of each kind
    from plait.diagrams.isotopy import reverse_pd
    from plait.diagrams.pd import validate_pd
    from plait.diagrams.pdmoves import apply_pd_move, pd_moves

    def moved():
        for m in pd_moves(pd, kinds=("flype", "r3")):
            try:
                q = apply_pd_move(pd, m)
            except InputError:  # pragma: no cover - pd_moves lists applicable moves
                continue
            if q.length == pd.length:
                yield f"the diagram after {m.kind} {list(m.args)}", q

    def listed():
        yield "the reversed diagram", reverse_pd(pd)
        cs = list(pd.crossings)
        for i in range(1, len(cs)):
            yield f"the diagram listed from crossing {i}", validate_pd(cs[i:] + cs[:i])

    for pair in itertools.zip_longest(moved(), listed()):
        for item in pair:
            if item is not None:
                yield item


def _shortest_route(pd: PDCode, wirt: Wirtinger, sweeps: int, seed: int) -> DiagramPlat:
    # the shortest plat over seed sets of the solver's size, drawings and directions,
    # within ``sweeps`` read-offs; deterministic for a given seed
    from plait.scoring.lengthbound import jones_span

    rng = random.Random(seed)
    best: tuple[PlatWord, tuple[int, int], Wirtinger, str] | None = None
    done = 0
    first = True
    # no word is shorter than the Jones span (Kauffman-Murasugi-Thistlethwaite): stop there
    floor = jones_span(_diagram_jones(pd) if wirt.arcs.components == 1
                       else _diagram_jones_options(pd)[0])
    # the full budget up to 12 crossings; past that it falls in proportion (a word costs
    # more), but never below one seed set's words
    sweeps = min(sweeps, max(len(DIRECTIONS), sweeps * 12 // pd.length))
    for name, q in itertools.chain([("the diagram", pd)], _drawings(pd)):
        arcs = wirt.arcs if first else diagram_arcs(q)
        sets = _seed_sets(arcs, wirt.number, wirt.seeds if first else None, rng)
        if not first:
            sets = itertools.islice(sets, _PER_DRAWING)
        lead = next(sets, None)
        if lead is None:
            first = False
            continue
        pos = drawing(q)
        for seeds in itertools.chain([lead], sets):
            steps = coloring_steps(arcs, seeds)
            w = Wirtinger(len(seeds), tuple(seeds), tuple(steps), wirt.proven_minimal,
                          wirt.method, arcs)
            lf = lift(q, w, pos)
            for d in DIRECTIONS:
                done += 1
                try:
                    p = tidy(sweep_plat(lf, d))
                except Degenerate:
                    continue
                if best is None or p.length < best[0].length:
                    best = (p, d, w, name)
            if done >= sweeps or best is not None and best[0].length <= floor:
                break
        first = False
        if done >= sweeps or best is not None and best[0].length <= floor:
            break
    if best is None:  # pragma: no cover - every candidate direction degenerate
        raise Degenerate("no generic direction among the candidates")
    p, d, w, name = best
    # the reported coloring is the solver's on the given diagram when another drawing won
    return DiagramPlat(p, "wirtinger", w if name == "the diagram" else wirt, d,
                       len(DIRECTIONS), name, done)


def diagram_to_plat(pd: PDCode, *, method: str = "auto", time_limit: float = 10.0,
                    seed: int = 0, directions: int = 8, guard: bool = True,
                    sweeps: int = 0) -> DiagramPlat:
    """Plat of a PD diagram with as many bridges as the diagram's Wirtinger number.

    A coloring sequence from the fewest seeds found (CP-SAT,
    :func:`plait.diagrams.wirtinger.wirtinger`) gives a height function on the diagram with
    one maximum per seed, all above the minima (:func:`plait.diagrams.heights.lift`); the
    lifted link is projected onto vertical planes along several generic horizontal
    directions and read as plats by sweeping the height downward
    (:func:`plait.diagrams.heights.sweep_plat`). The shortest word is kept.

    With ``sweeps > 0`` the word is also looked for among other colorings and drawings,
    since the word's length depends much on both: other seed sets of the same size (all
    of them when there are few, else single swaps of the solver's set), then diagrams
    with the same crossings reached by one flype or Reidemeister III move, the reversed
    diagram and the code listed from other crossings (their grid drawings differ), a
    few seed sets each, every one read along all of
    :data:`plait.diagrams.heights.DIRECTIONS`, until ``sweeps`` words were read (up to
    12 crossings; a larger diagram gets ``sweeps * 12 / crossings`` words, at least 16,
    since its words cost more). The choice is deterministic for a given ``seed``. A word
    of a 12-crossing diagram is about a millisecond.

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
        Number of non-degenerate projection directions to try (``sweeps == 0``).
    guard : bool
        Check the Jones polynomial against the diagram's (see :func:`check_plat`).
    sweeps : int
        Words to read in the search for a short one; 0 reads the solver's coloring on
        the given drawing only.

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
    key = (pd, method, time_limit, seed, directions, sweeps)
    if key in _RECENT:
        out = _RECENT[key]
    else:
        out = _RECENT[key] = _convert(pd, method, time_limit, seed, directions, sweeps)
        while len(_RECENT) > 8:
            del _RECENT[next(iter(_RECENT))]
    if guard:
        check_plat(pd, out.plat)
    return out


# The last conversions made, by their arguments: ``plait bridge`` reports the conversion
# that its search made a moment before (the conversion is deterministic given them).
_RECENT: dict[tuple, DiagramPlat] = {}


def _convert(pd: PDCode, method: str, time_limit: float, seed: int, directions: int,
             sweeps: int) -> DiagramPlat:
    if method == "vogel":
        out = _vogel_route(pd)
    else:
        wirt = wirtinger(pd, method="cpsat", time_limit=time_limit, seed=seed)
        try:
            out = (_shortest_route(pd, wirt, sweeps, seed) if sweeps > 0
                   else _wirtinger_route(pd, wirt, directions))
        except Degenerate:
            if method == "wirtinger":
                raise InputError("pd: no generic projection direction found") from None
            out = _vogel_route(pd)
    return out


def _vogel_route(pd: PDCode) -> DiagramPlat:
    from plait.diagrams.vogel import pd_to_closed_braid

    braid = pd_to_closed_braid(pd)
    return DiagramPlat(tidy(braid.to_plat()), "vogel", None, None, 0)


# Words read by default when a PD code is converted for a search (about a second).
SWEEPS = 800


def pd_to_plat(pd: PDCode, *, method: str = "auto", time_limit: float = 10.0,
               seed: int = 0, sweeps: int = SWEEPS) -> PlatWord:
    """Plat word of a PD diagram with the diagram's Wirtinger number of bridges.

    See :func:`diagram_to_plat` (here with ``sweeps`` words read in the search for a
    short one), which also returns the seeds and the route taken.
    """
    return diagram_to_plat(pd, method=method, time_limit=time_limit, seed=seed,
                           sweeps=sweeps).plat
