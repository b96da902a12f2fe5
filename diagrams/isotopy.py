"""Isotopy proofs between diagrams: simplify a PD code, then join two by flypes and R3."""

from __future__ import annotations

import random
import time
from collections import deque
from dataclasses import dataclass, field
from itertools import product

from plait.diagrams.pd import PDCode, pd_components, validate_pd
from plait.diagrams.pdmoves import PDMove, apply_pd_move, canonical_key, pd_moves, relabel
from plait.errors import InputError

__all__ = [
    "mirror_pd",
    "reverse_pd",
    "unoriented_key",
    "simplify_pd",
    "join_diagrams",
    "IsotopyProof",
    "check_isotopy_proof",
    "ISOTOPY_FORMAT",
    "simplified_closure",
    "proof_to_diagram",
]

ISOTOPY_FORMAT = "plait-pd-isotopy/1"

# Data model. Diagrams are PD codes (plait.diagrams.pd.PDCode), always relabelled
# (edges 1, 2, ... along the components) so that moves, which name crossings and slots,
# replay exactly. A path is a list of PDMove (plait.diagrams.pdmoves); applying them one by
# one with apply_pd_move gives the next diagram. Two diagrams are "the same" when their
# unoriented keys agree: a renaming of edges and crossings, allowing the orientation of
# each component to be reversed (a plat closure has no orientation), keeping the plane's
# orientation (a mirror image is a different key).

_SHAPE_KINDS = ("r3", "flype")  # moves that keep the number of crossings
_DOWN_KINDS = ("r1-", "r2-", "reroute")  # moves that remove crossings


def mirror_pd(pd: PDCode) -> PDCode:
    """The mirror image: the plane reflected, so every crossing's counterclockwise order
    is reversed, ``(a, b, c, d) -> (a, d, c, b)`` (the under-strand still enters at a)."""
    return relabel([(a, d, c, b) for a, b, c, d in pd.crossings])


def reverse_pd(pd: PDCode, flip: tuple[bool, ...] | None = None) -> PDCode:
    """Reverse the orientation of the components marked in ``flip`` (all when None), in
    the order of :func:`plait.diagrams.pd.pd_components`. A crossing whose under-strand is
    reversed is rewritten from its new incoming under-edge, ``(a, b, c, d) -> (c, d, a, b)``;
    an over-strand's direction is read from its edges, so relabelling carries it."""
    comps = pd_components(pd)
    flip = tuple(True for _ in comps) if flip is None else flip
    rev = {x for comp, f in zip(comps, flip, strict=True) if f for x in comp}
    cs = [(c, d, a, b) if a in rev else (a, b, c, d) for a, b, c, d in pd.crossings]
    return relabel(cs)


def unoriented_key(pd: PDCode) -> tuple:
    """The least :func:`plait.diagrams.pdmoves.canonical_key` over every choice of
    orientation of the components (the first component's orientation is free too)."""
    k = len(pd_components(pd))
    best = None
    for flip in product((False, True), repeat=k):
        try:
            key = canonical_key(reverse_pd(pd, flip) if any(flip) else pd)
        except InputError:  # pragma: no cover - reversal keeps a valid code
            continue
        if best is None or key < best:
            best = key
    return best


def _apply(pd: PDCode, m: PDMove) -> PDCode | None:
    try:
        return apply_pd_move(pd, m, check=False)  # proofs are replayed with the check
    except InputError:
        return None


def _shape_moves(pd: PDCode) -> list[PDMove]:
    return pd_moves(pd, _SHAPE_KINDS)


def simplify_pd(pd: PDCode, *, seconds: float = 2.0, seed: int = 0, extra: int = 2,
                target: int = 0, patience: int = 30, max_steps: int | None = None
                ) -> tuple[PDCode, list[PDMove]]:
    """Fewer crossings by Reidemeister moves: a random walk that takes a
    crossing-removing move whenever there is one (R1 and R2 removals, arcs rerouted
    above or below the rest), and otherwise slides strands by R3 and flypes, or now and
    then adds a bigon (R2) while at most ``extra`` crossings above the best diagram so
    far. After ``patience`` steps without a better diagram it restarts from the best.
    Stops at ``seconds``, after ``max_steps`` moves tried (a deterministic budget: same
    diagram and seed, same result), or at a diagram with at most ``target`` crossings (a
    known lower bound of the crossing number, say).

    Returns
    -------
    (PDCode, list of PDMove)
        The diagram with the fewest crossings found and the moves from ``pd`` (relabelled)
        to it.

    References
    ----------
    .. [1] K. Reidemeister, "Elementare Begründung der Knotentheorie", Abh. Math. Sem.
       Univ. Hamburg 5 (1927).
    """
    from plait.diagrams.pdmoves import random_pd_move

    deadline = time.monotonic() + seconds
    rng = random.Random(seed)
    start = relabel(pd.crossings)
    best, best_path = start, []
    cur, path, idle = start, [], 0
    steps = 0
    while best.length > target and time.monotonic() < deadline:
        steps += 1
        if max_steps is not None and steps > max_steps:
            break
        down = pd_moves(cur, _DOWN_KINDS)
        if down:
            nxt = _apply(cur, m := rng.choice(down))
            if nxt is not None:
                cur, path = nxt, path + [m]
                if cur.length < best.length:
                    best, best_path, idle = cur, path, 0
                continue
        idle += 1
        if idle > patience:
            cur, path, idle = best, best_path, 0
        weights = {"r3": 1.0, "flype": 1.0}
        if cur.length < best.length + extra and rng.random() < 0.3:
            weights["r2+"] = 1.0
        m = random_pd_move(cur, rng, weights)
        nxt = None if m is None else _apply(cur, m)
        if nxt is None:  # nothing to slide here: back to the best diagram
            cur, path = best, best_path
            continue
        cur, path = nxt, path + [m]
    return best, best_path


@dataclass
class IsotopyProof:
    """Two move paths that end in the same diagram: ``start`` by ``steps`` and
    ``target`` by ``target_steps`` reach diagrams with equal :func:`unoriented_key`."""

    start: PDCode
    steps: list[PDMove]
    target: PDCode
    target_steps: list[PDMove] = field(default_factory=list)

    def to_json(self) -> dict:
        return {"format": ISOTOPY_FORMAT, "start": self.start.to_list(),
                "steps": [m.to_json() for m in self.steps],
                "target": self.target.to_list(),
                "target_steps": [m.to_json() for m in self.target_steps]}


def join_diagrams(a: PDCode, b: PDCode, *, seconds: float = 2.0, extra: int = 2,
                  seed: int = 0, max_states: int = 200_000) -> IsotopyProof | None:
    """Look for Reidemeister moves and flypes that take diagrams ``a`` and ``b`` to one
    diagram, breadth-first from both sides at once, meeting on :func:`unoriented_key`.

    First only moves that keep the number of crossings (flypes, R3) until both sides are
    exhausted; then also R1 and R2 removals and sampled R2 additions, up to ``extra``
    crossings above the larger of the two diagrams.

    Two reduced alternating diagrams of one prime knot are joined by flypes (the Tait
    flyping conjecture, proved by Menasco and Thistlethwaite), so for them the first phase
    is complete up to its budget; for other diagrams the search may fail.

    References
    ----------
    .. [1] W. Menasco and M. Thistlethwaite, "The classification of alternating links",
       Ann. of Math. 138 (1993).
    """
    a, b = relabel(a.crossings), relabel(b.crossings)
    deadline = time.monotonic() + seconds
    rng = random.Random(seed)
    cap = max(a.length, b.length) + extra
    for phase in ((0, 1) if a.length == b.length else (1,)):
        proof = _join(a, b, deadline, max_states, phase, cap, rng)
        if proof is not None:
            return proof
    return None


def _join(a: PDCode, b: PDCode, deadline: float, max_states: int, phase: int, cap: int,
          rng: random.Random) -> IsotopyProof | None:
    # parents[side][key] = (previous key or None, move, diagram)
    parents: list[dict] = [{}, {}]
    queues: list[deque] = [deque(), deque()]
    for side, d in enumerate((a, b)):
        k = unoriented_key(d)
        parents[side][k] = (None, None, d)
        queues[side].append(k)
    meet = next(iter(parents[0])) if next(iter(parents[0])) in parents[1] else None
    side = 0
    while meet is None and (queues[0] or queues[1]) and time.monotonic() < deadline:
        if len(parents[0]) + len(parents[1]) > max_states:
            break
        if not queues[side]:
            side = 1 - side
        k = queues[side].popleft()
        cur = parents[side][k][2]
        moves = _shape_moves(cur)
        if phase:
            moves = pd_moves(cur, _DOWN_KINDS) + moves
            if cur.length < cap:
                ups = pd_moves(cur, ("r2+",))
                moves += rng.sample(ups, min(len(ups), 8))
        for m in moves:
            nxt = _apply(cur, m)
            if nxt is None:
                continue
            nk = unoriented_key(nxt)
            if nk in parents[side]:
                continue
            parents[side][nk] = (k, m, nxt)
            queues[side].append(nk)
            if nk in parents[1 - side]:
                meet = nk
                break
        side = 1 - side
    if meet is None:
        return None

    def path(side: int) -> list[PDMove]:
        out, k = [], meet
        while parents[side][k][0] is not None:
            prev, m, _d = parents[side][k]
            out.append(m)
            k = prev
        return out[::-1]

    return IsotopyProof(a, path(0), b, path(1))


def _replay(pd: PDCode, steps: list) -> PDCode:
    cur = relabel(pd.crossings)
    for i, s in enumerate(steps):
        m = PDMove.from_json(s)
        try:
            cur = apply_pd_move(cur, m)
        except InputError as exc:
            raise InputError(f"step {i + 1} ({s[0]}): {exc}") from None
    return cur


def check_isotopy_proof(obj: dict, start: PDCode | None = None,
                        target: PDCode | None = None) -> str:
    """Re-check an isotopy proof from scratch: both paths replayed move by move (each
    diagram validated afresh) and the two ends compared by :func:`unoriented_key`. When
    ``start`` or ``target`` are given, the proof's diagrams must be them (up to the
    relabelling every path starts with). Returns "" when it holds, else why not."""
    try:
        if not isinstance(obj, dict) or obj.get("format") != ISOTOPY_FORMAT:
            return f"not a {ISOTOPY_FORMAT} proof"
        s = validate_pd(obj["start"])
        t = validate_pd(obj["target"])
        if start is not None and relabel(start.crossings) != relabel(s.crossings):
            return "the proof starts from another diagram"
        if target is not None and relabel(target.crossings) != relabel(t.crossings):
            return "the proof ends at another diagram"
        try:
            e1 = _replay(s, list(obj["steps"]))
        except InputError as exc:
            return f"input side: {exc}"
        try:
            e2 = _replay(t, list(obj["target_steps"]))
        except InputError as exc:
            return f"table side: {exc}"
    except (KeyError, TypeError, InputError) as exc:
        return f"malformed isotopy proof: {exc}"
    if unoriented_key(e1) != unoriented_key(e2):
        return "the two paths end in different diagrams"
    return ""


def simplified_closure(plat, *, seconds: float = 2.0, seed: int = 0, target: int = 0
                       ) -> tuple[PDCode, PDCode, list[PDMove]]:
    """The plat's closure as a PD code (relabelled), a simpler diagram of it by
    :func:`simplify_pd`, and the moves between them."""
    from plait.diagrams.pd import plat_to_pd

    d = relabel(plat_to_pd(plat).crossings)
    small, path = simplify_pd(d, seconds=max(0.2, seconds), seed=seed, target=target)
    return d, small, path


def proof_to_diagram(closure: tuple[PDCode, PDCode, list[PDMove]], target: PDCode, *,
                     mirror: bool = False, seconds: float = 2.0) -> dict | None:
    """An isotopy proof (its JSON) from ``closure`` (as returned by
    :func:`simplified_closure`) to ``target``, or to its mirror image when ``mirror``:
    the simplification moves, then :func:`join_diagrams`. None when none is found."""
    d, small, path = closure
    tab = mirror_pd(target) if mirror else relabel(target.crossings)
    proof = join_diagrams(small, tab, seconds=max(0.2, seconds))
    if proof is None:
        return None
    return IsotopyProof(d, list(path) + proof.steps, tab, proof.target_steps).to_json()
