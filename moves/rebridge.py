"""The diagram step: a plat rebuilt from its own diagram's Wirtinger coloring, fewer bridges."""

from __future__ import annotations

from dataclasses import dataclass

from plait.errors import InputError
from plait.moves.records import MoveRecord
from plait.word import PlatWord

__all__ = [
    "REBRIDGE",
    "RebridgeData",
    "encode",
    "decode",
    "construct",
    "check_rebridge",
    "RebridgeError",
    "step_diagram",
]

#: Move kind of the diagram step in certificates.
REBRIDGE = "rebridge"

# Layout of the integer arguments of a ``rebridge`` record (all flat, so a record stays
# ``[kind, *ints]`` like every other move):
#
#   k, seed_1 .. seed_k,                  seed arcs (indices into diagram_arcs of the
#                                         current plat's PD code, plait.diagrams.pd.plat_to_pd)
#   s, crossing_1, arc_1 .. crossing_s, arc_s
#                                         the coloring sequence: at step t, arc_t is
#                                         colored through crossing_t (0-based)
#   a, b,                                 projection direction (plait.diagrams.heights.sweep_plat)
#   strands, letter_1 .. letter_L         the plat the construction gives
#
# A step that first redraws the diagram starts with a prefix (the seed count is never
# negative, so the two layouts cannot be confused):
#
#   -1, m, code_1, args_1.., .. code_m, args_m..
#                                         m Reidemeister moves (plait.diagrams.pdmoves; code
#                                         = index in PD_MOVE_KINDS, then that kind's
#                                         arguments) applied to the relabelled PD code of
#                                         the current plat; the coloring and the
#                                         construction then refer to the diagram they give


class RebridgeError(Exception):
    """A ``rebridge`` record that does not describe a valid diagram step."""


@dataclass(frozen=True)
class RebridgeData:
    """Decoded arguments of a ``rebridge`` record.

    Attributes
    ----------
    seeds : tuple of int
        Seed arcs of the coloring.
    steps : tuple of (int, int)
        ``(crossing, arc)`` of each coloring step, in order.
    direction : (int, int)
        Horizontal projection direction used by the sweep.
    result : PlatWord
        The plat the construction produced.
    redraw : tuple of PDMove
        Reidemeister moves that redraw the plat's diagram before it is colored (empty:
        the plat's own diagram).
    """

    seeds: tuple[int, ...]
    steps: tuple[tuple[int, int], ...]
    direction: tuple[int, int]
    result: PlatWord
    redraw: tuple = ()  # PDMove records applied to the plat's diagram first

    @property
    def number(self) -> int:
        """Number of seeds: the bridges of the result."""
        return len(self.seeds)


def encode(data: RebridgeData) -> MoveRecord:
    """The move record of a diagram step."""
    from plait.diagrams.pdmoves import PD_MOVE_KINDS

    args: list[int] = []
    if data.redraw:
        args += [-1, len(data.redraw)]
        for m in data.redraw:
            args += [PD_MOVE_KINDS.index(m.kind), *m.args]
    args += [len(data.seeds), *data.seeds, len(data.steps)]
    for j, a in data.steps:
        args += [j, a]
    args += [data.direction[0], data.direction[1], data.result.strands, *data.result.word]
    return MoveRecord(REBRIDGE, tuple(int(x) for x in args))


def decode(args) -> RebridgeData:
    """Split the arguments of a ``rebridge`` record (see the layout above).

    Raises
    ------
    RebridgeError
        When the lengths do not add up or the result is not a valid plat.
    """
    a = list(args)
    redraw: list = []
    if a and a[0] == -1:
        from plait.diagrams.pdmoves import _ARITY, PD_MOVE_KINDS, PDMove

        try:
            m, pos = a[1], 2
            for _ in range(m):
                kind = PD_MOVE_KINDS[a[pos]] if 0 <= a[pos] < len(PD_MOVE_KINDS) else None
                if kind is None:
                    raise RebridgeError(f"unknown diagram move code {a[pos]}")
                redraw.append(PDMove(kind, tuple(a[pos + 1:pos + 1 + _ARITY[kind]])))
                pos += 1 + _ARITY[kind]
        except IndexError:
            raise RebridgeError("arguments end too early for the redraw prefix") from None
        a = a[pos:]
    try:
        k = a[0]
        if k < 1:
            raise RebridgeError("a diagram step needs at least one seed")
        seeds = tuple(a[1:1 + k])
        s = a[1 + k]
        if s < 0:
            raise RebridgeError("negative number of coloring steps")
        base = 2 + k
        steps = tuple((a[base + 2 * t], a[base + 2 * t + 1]) for t in range(s))
        base += 2 * s
        direction = (a[base], a[base + 1])
        strands = a[base + 2]
        word = tuple(a[base + 3:])
    except IndexError:
        raise RebridgeError("arguments end too early for the rebridge layout") from None
    if len(seeds) != k:
        raise RebridgeError("arguments end too early for the rebridge layout")
    try:
        result = PlatWord(strands, word)
    except (InputError, ValueError, TypeError) as exc:
        raise RebridgeError(f"recorded result is not a plat: {exc}") from None
    return RebridgeData(seeds, steps, direction, result, tuple(redraw))


def step_diagram(plat: PlatWord, data: RebridgeData | None = None, check: bool = True):
    """The diagram a diagram step colors: the plat's PD code, or, when the step redraws
    it, the moves of ``data.redraw`` replayed on the relabelled code (each result
    validated when ``check``).

    Raises
    ------
    RebridgeError
        When a recorded move does not apply.
    """
    from plait.diagrams.pd import plat_to_pd
    from plait.diagrams.pdmoves import apply_pd_move, relabel

    pd = plat_to_pd(plat)
    if data is None or not data.redraw:
        return pd
    cur = relabel(pd.crossings)
    for t, m in enumerate(data.redraw, start=1):
        try:
            cur = apply_pd_move(cur, m, check=check)
        except InputError as exc:
            raise RebridgeError(f"redraw move {t} ({m.kind}): {exc}") from None
    return cur


def _build(pd, wirt, direction: tuple[int, int], lf=None) -> PlatWord:
    # the deterministic construction: drawing of the PD code, lift by the coloring,
    # sweep along the direction, cheap tidy-up
    from plait.diagrams.fromdiagram import tidy
    from plait.diagrams.heights import drawing, lift, sweep_plat

    if lf is None:
        lf = lift(pd, wirt, drawing(pd))
    return tidy(sweep_plat(lf, direction))


def construct(plat: PlatWord, *, time_limit: float = 1.0, seed: int = 0,
              directions: int = 8, redraw: int = 0,
              seed_sets: int = 1) -> tuple[int, RebridgeData | None]:
    """The Wirtinger number of the plat's diagram and, when it is below the plat's
    bridge count, the diagram step to a plat with that many bridges.

    The plat's PD code (:func:`plait.diagrams.pd.plat_to_pd`) gets a coloring sequence from as
    few seeds as CP-SAT finds within ``time_limit`` deterministic seconds
    (:func:`plait.diagrams.wirtinger.wirtinger`); the coloring gives a bridge position with one
    maximum per seed (:func:`plait.diagrams.heights.lift`), read as a plat along each of the
    first ``directions`` generic directions of :data:`plait.diagrams.heights.DIRECTIONS`; the
    shortest word is kept (the first in that order on a tie). With ``redraw > 0`` the
    diagram is also simplified by Reidemeister moves (at most that many steps of
    :func:`plait.diagrams.isotopy.simplify_pd`, a fixed seed: deterministic); when the
    simpler diagram colors from no more seeds it is the one used, and its moves are
    recorded in the step. With ``seed_sets > 1`` the word is also read off up to that
    many seed sets of the same size that color the diagram (the solver's first, then the
    others in an order fixed by ``seed``, as in
    :func:`plait.diagrams.fromdiagram.diagram_to_plat`): the word's length depends much
    on the coloring, and the step records whichever coloring gave the shortest word.

    Returns
    -------
    (int, RebridgeData or None)
        The seed count found (an upper bound on the bridge number; the plat's own bridge
        count when the diagram cannot be used) and the step, or None when it would not
        remove a bridge.

    References
    ----------
    .. [1] R. Blair, A. Kjuchukova, M. Ozawa, "The incompatibility of crossing number and
       bridge number for knot diagrams", Discrete Math. 344 (2021): the Wirtinger number
       of a diagram is its perpendicular bridge number.
    .. [2] R. Blair, A. Kjuchukova, R. Velazquez, P. Villanueva, "Wirtinger systems of
       generators of knot groups", Comm. Anal. Geom. 28 (2020).
    """
    from plait.diagrams.heights import DIRECTIONS, Degenerate, drawing, lift
    from plait.diagrams.pd import plat_to_pd
    from plait.diagrams.wirtinger import Wirtinger, wirtinger

    if not plat.word:
        return plat.bridges, None
    try:
        pd = plat_to_pd(plat)
    except InputError:
        return plat.bridges, None  # a crossingless component: no PD code
    wirt = wirtinger(pd, method="cpsat", time_limit=time_limit, seed=seed)
    moves: tuple = ()
    if redraw > 0 and wirt.number > 1:
        from plait.diagrams.isotopy import simplify_pd

        small, path = simplify_pd(pd, seconds=float("inf"), seed=seed, max_steps=redraw)
        if path and small.length < pd.length:
            w2 = wirtinger(small, method="cpsat", time_limit=time_limit, seed=seed)
            if w2.number <= wirt.number:
                pd, wirt, moves = small, w2, tuple(path)
    if wirt.number >= plat.bridges:
        return wirt.number, None
    pos = drawing(pd)
    # best = (word, direction, coloring); the first in reading order wins a tie
    best: tuple[PlatWord, tuple[int, int], Wirtinger] | None = None
    for w in _colorings(wirt, seed_sets, seed):
        lf = lift(pd, w, pos)
        tried = 0
        for d in DIRECTIONS:
            if tried >= directions:
                break
            try:
                p = _build(pd, w, d, lf)
            except Degenerate:
                continue
            tried += 1
            if best is None or p.length < best[0].length:
                best = (p, d, w)
    if best is None:
        return plat.bridges, None
    p, d, w = best
    steps = tuple((s.crossing, s.arc) for s in w.steps)
    return w.number, RebridgeData(tuple(w.seeds), steps, d, p, moves)


def _colorings(wirt, count: int, seed: int):
    # the solver's coloring, then up to count - 1 other seed sets of its size that color
    # every arc (plait.diagrams.fromdiagram._seed_sets: all sets when there are few, else
    # single swaps; the order fixed by ``seed``)
    import itertools
    import random

    from plait.diagrams.fromdiagram import _seed_sets
    from plait.diagrams.wirtinger import Wirtinger, coloring_steps

    yield wirt
    if count <= 1:
        return
    # _seed_sets yields the solver's set first (already given above as ``wirt``): skip it
    sets = _seed_sets(wirt.arcs, wirt.number, wirt.seeds, random.Random(seed))
    for seeds in itertools.islice(sets, 1, count):
        steps = coloring_steps(wirt.arcs, seeds)
        yield Wirtinger(len(seeds), tuple(seeds), tuple(steps), wirt.proven_minimal,
                        wirt.method, wirt.arcs)


def check_rebridge(word, strands: int, args) -> PlatWord:
    """Check a diagram step without trusting the search, and return its result.

    1. Rebuild the PD code of the current plat (:func:`plait.diagrams.pd.plat_to_pd`), replay
       the recorded Reidemeister moves of a redrawing step on it (each code validated
       afresh), and take the arcs.
    2. Check that the recorded sequence is a valid Wirtinger coloring from the recorded
       seeds: each step colors an uncolored under-arc at a crossing whose over-arc and
       other under-arc are already colored, and every arc ends up colored.
    3. Rerun the deterministic construction with the recorded direction and compare the
       word with the recorded one.
    4. Compare the full invariant fingerprints of the plats before and after.

    Raises
    ------
    RebridgeError
        With the reason of the first failed check.
    """
    from plait.diagrams.heights import Degenerate
    from plait.diagrams.wirtinger import ColoringStep, Wirtinger, diagram_arcs
    from plait.errors import GuardViolation
    from plait.scoring.fingerprint import fingerprint, guard

    data = decode(args)
    before = PlatWord(strands, tuple(word))
    if data.number >= before.bridges:
        raise RebridgeError(f"{data.number} seeds do not remove a bridge from a "
                            f"{before.bridges}-bridge plat")
    if data.result.bridges != data.number:
        raise RebridgeError(f"recorded result has {data.result.bridges} bridges, the "
                            f"coloring {data.number} seeds")
    try:
        pd = step_diagram(before, data)
    except InputError as exc:
        raise RebridgeError(f"the current plat has no PD code: {exc}") from None
    arcs = diagram_arcs(pd)
    n = len(arcs)
    colored: set[int] = set()
    for a in data.seeds:
        if not 0 <= a < n or a in colored:
            raise RebridgeError(f"seed {a} is not a distinct arc of the diagram (0..{n - 1})")
        colored.add(a)
    steps: list[ColoringStep] = []
    for t, (j, a) in enumerate(data.steps, start=1):
        if not 0 <= j < len(arcs.over):
            raise RebridgeError(f"coloring step {t}: crossing {j} is not in the diagram")
        o, i, u = arcs.over[j], arcs.under_in[j], arcs.under_out[j]
        if a not in (i, u):
            raise RebridgeError(f"coloring step {t}: arc {a} is not an under-arc of "
                                f"crossing {j}")
        src = u if a == i else i
        if a in colored:
            raise RebridgeError(f"coloring step {t}: arc {a} is already colored")
        if o not in colored or src not in colored:
            raise RebridgeError(f"coloring step {t}: at crossing {j} the over-arc or the "
                                f"other under-arc is not colored yet")
        colored.add(a)
        steps.append(ColoringStep(t, j, a, src, o))
    if len(colored) != n:
        raise RebridgeError(f"the coloring leaves {n - len(colored)} arcs uncolored")
    wirt = Wirtinger(data.number, tuple(data.seeds), tuple(steps), False, "recorded", arcs)
    try:
        got = _build(pd, wirt, tuple(data.direction))
    except Degenerate as exc:
        raise RebridgeError(f"direction {list(data.direction)} is degenerate: {exc}") from None
    if got != data.result:
        raise RebridgeError("the construction gives another word than the recorded one")
    try:
        guard(fingerprint(before, "full"), fingerprint(got, "full"),
              detail="diagram step")
    except GuardViolation as exc:
        raise RebridgeError(f"the diagram step changes the {exc.invariant}") from None
    return got
