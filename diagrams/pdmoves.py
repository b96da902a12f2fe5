"""Reidemeister moves on PD codes: faces, kinks, bigons and triangles of the diagram itself."""

from __future__ import annotations

import random
from dataclasses import dataclass
from functools import lru_cache

from plait.diagrams.pd import PDCode, pd_components, validate_pd
from plait.diagrams.wirtinger import occurrence_roles
from plait.errors import InputError

__all__ = [
    "PDMove",
    "PD_MOVE_KINDS",
    "faces",
    "relabel",
    "canonical_key",
    "apply_pd_move",
    "pd_moves",
    "random_pd_move",
]

# Data model. A diagram is a PD code (see plait.diagrams.pd.PDCode): crossing j is a 4-tuple of
# edge labels listed counterclockwise from the incoming under-strand, so slots 0 and 2
# are the under-strand (0 enters, 2 leaves) and slots 1, 3 the over-strand. An
# "occurrence" (j, s) is one end of an edge: slot s of crossing j. A "side" of a face is
# the occurrence at which the face boundary leaves a crossing along an edge; walking
# every face with the face on the left (counterclockwise around it), after arriving at
# (j, s) the boundary leaves along slot (s - 1) mod 4 (the next edge clockwise).
#
# A move is a small record (kind, integer arguments) that refers to occurrences of the
# diagram it applies to, so a sequence of moves replays from the first diagram:
#
#   r1+  (j, s, loop, over)  add a kink on the edge whose end is (j, s): the loop lies on
#                            the left (loop=0) or right (loop=1) of the strand, and the
#                            strand passes first over (over=1) or under (over=0)
#   r1-  (j,)                remove the kink at crossing j (two adjacent slots share a label)
#   r2+  (j1, s1, j2, s2, over)  two sides of one face: push the first edge across the
#                            second inside the face, over it (over=1) or under (over=0)
#   r2-  (j, s)              side (j, s) of a bigon face whose edges are over at both ends
#                            (or under at both): remove both crossings
#   r3   (j, s)              side (j, s) of a triangle face whose strand along that side is
#                            over at both its crossings (or under at both): slide the strand
#                            across the third crossing
#   flype (j, s, r1, r2)     crossing j whose slots s, s + 1 lead into a tangle T left by
#                            the edges labelled r1 (beside slot s + 1) and r2 (beside slot
#                            s): turn T over (a half turn about the axis through crossing j)
#                            and move crossing j to T's other side
#   reroute (j, under)       the over-arc (under=1: under-arc) whose under-strand leaves
#                            crossing j along slot 2 (of the diagram with every crossing
#                            switched, for an under-arc) is laid again along a shortest
#                            path through the faces (plait.diagrams.reroute); only when
#                            that removes crossings (R2 and R3 moves, and R1 where the
#                            arc turns about its own ends)
PD_MOVE_KINDS = ("r1+", "r1-", "r2+", "r2-", "r3", "flype", "reroute")
_ARITY = {"r1+": 4, "r1-": 1, "r2+": 5, "r2-": 2, "r3": 2, "flype": 4, "reroute": 2}


@dataclass(frozen=True)
class PDMove:
    """One Reidemeister move on a PD code: its kind and integer arguments (see the table
    at the top of :mod:`plait.diagrams.pdmoves`)."""

    kind: str
    args: tuple[int, ...]

    def to_json(self) -> list:
        return [self.kind, *self.args]

    @classmethod
    def from_json(cls, obj: object) -> PDMove:
        if not isinstance(obj, list) or not obj or obj[0] not in _ARITY:
            raise InputError(f"pd move: expected [kind, args...] with kind in "
                             f"{', '.join(PD_MOVE_KINDS)}, got {obj!r}")
        args = obj[1:]
        if len(args) != _ARITY[obj[0]] or not all(
                isinstance(a, int) and not isinstance(a, bool) for a in args):
            raise InputError(f"pd move {obj[0]}: expected {_ARITY[obj[0]]} integer arguments")
        return cls(obj[0], tuple(args))


def _where(cs) -> dict[int, list[tuple[int, int]]]:
    # where[label] = its two occurrences (crossing, slot), in crossing order
    out: dict[int, list[tuple[int, int]]] = {}
    for j, c in enumerate(cs):
        for s, x in enumerate(c):
            out.setdefault(x, []).append((j, s))
    return out


def _other(where, j: int, s: int, cs) -> tuple[int, int]:
    a, b = where[cs[j][s]]
    return b if a == (j, s) else a


def faces(pd: PDCode) -> list[list[tuple[int, int]]]:
    """Faces of the diagram, each the cyclic list of its sides (leaving occurrences),
    walked with the face on the left."""
    return [list(f) for f in _faces(pd)]


@lru_cache(maxsize=256)
def _faces(pd: PDCode) -> tuple[tuple[tuple[int, int], ...], ...]:
    # the face walk of Vogel's algorithm (face on the left), cached per diagram
    from plait.diagrams.vogel import faces as walk_faces

    return tuple(tuple(f) for f in walk_faces(pd.crossings))


def relabel(cs, planar: bool = True) -> PDCode:
    """Validate crossings ``cs`` and renumber edges 1, 2, ... along each component (in
    the order of :func:`plait.diagrams.pd.pd_components`). Crossing order is kept.
    ``planar=False`` skips the planarity check of :func:`plait.diagrams.pd.validate_pd`.

    Raises
    ------
    InputError
        When the crossings are not a valid PD code.
    """
    pd = validate_pd(cs, planar=planar)
    new: dict[int, int] = {}
    for comp in pd_components(pd):
        for x in comp:
            new[x] = len(new) + 1
    return PDCode(tuple(tuple(new[x] for x in c) for c in pd.crossings))


def canonical_key(pd: PDCode) -> tuple:
    """A key equal for two PD codes exactly when they differ by a renaming of edges that
    keeps the orientation and a reordering of crossings (a diagram isomorphism fixing the
    plane's orientation and the strands' directions).

    Tries every starting edge of the first component, numbers edges along the
    orientation (components in order of their first crossing met), and keeps the least
    sorted crossing list. Meant for knots and small links; cost is quadratic in size.
    """
    comps = pd_components(pd)
    if not comps:
        return ()
    nxt: dict[int, int] = {}
    for comp in comps:
        for i, x in enumerate(comp):
            nxt[x] = comp[(i + 1) % len(comp)]
    best = None
    for x0 in comps[0]:
        new: dict[int, int] = {}
        y = x0
        while y not in new:
            new[y] = len(new) + 1
            y = nxt[y]
        for comp in comps[1:]:  # further components in their listed order
            for z in comp:
                new.setdefault(z, len(new) + 1)
        key = tuple(sorted(tuple(new[v] for v in c) for c in pd.crossings))
        if best is None or key < best:
            best = key
    return best


def _splice(cs, gone: set[int]) -> list[list[int]] | None:
    # Delete crossings `gone`; every strand runs straight through them (slot s to s + 2),
    # and each pair of surviving ends joined that way becomes one new edge. None when a
    # closed loop would be left without crossings (no PD code for it).
    where = _where(cs)
    keep = [j for j in range(len(cs)) if j not in gone]
    out = {j: list(cs[j]) for j in keep}
    fresh = max((x for c in cs for x in c), default=0) + 1
    done: set[tuple[int, int]] = set()
    for j in keep:
        for s in range(4):
            if (j, s) in done:
                continue
            j2, s2 = _other(where, j, s, cs)
            steps = 0
            while j2 in gone:
                j2, s2 = _other(where, j2, (s2 + 2) % 4, cs)
                steps += 1
                if steps > 4 * len(cs):  # pragma: no cover - a loop through gone only
                    return None
            done.add((j, s))
            done.add((j2, s2))
            out[j][s] = fresh
            out[j2][s2] = fresh
            fresh += 1
    # every strand through a gone crossing must reach a surviving crossing
    for j in gone:
        for s in range(4):
            j2, s2, steps = j, s, 0
            while True:
                j2, s2 = _other(where, j2, s2, cs)
                if j2 not in gone:
                    break
                s2 = (s2 + 2) % 4
                steps += 1
                if steps > 4 * len(cs):
                    return None
    return [out[j] for j in keep]


def _rot(ccw: list[int], start: int) -> tuple[int, int, int, int]:
    # the crossing's tuple: the counterclockwise ring read from the incoming under slot
    return tuple(ccw[(start + t) % 4] for t in range(4))  # type: ignore[return-value]


def _r1_add(pd: PDCode, j: int, s: int, loop: int, over: int) -> list:
    cs = [list(c) for c in pd.crossings]
    role = occurrence_roles(pd)
    e = cs[j][s]
    where = _where(cs)
    tail = (j, s) if role[(j, s)] == -1 else _other(where, j, s, cs)
    head = _other(where, tail[0], tail[1], cs)
    fresh = max(x for c in cs for x in c) + 1
    e1, lp, e2 = e, fresh, fresh + 1
    cs[head[0]][head[1]] = e2
    # the strand comes in along e1 (west), runs east into the loop and returns: loop on
    # its left comes back from the north and leaves south, on its right the reverse
    if loop == 0:
        ring, first_in, second_in = [e1, e2, lp, lp], 0, 3
    else:
        ring, first_in, second_in = [e1, lp, lp, e2], 0, 1
    cs.append(list(_rot(ring, first_in if not over else second_in)))
    return cs


def _r2_add(pd: PDCode, j1: int, s1: int, j2: int, s2: int, over: int) -> list:
    cs = [list(c) for c in pd.crossings]
    role = occurrence_roles(pd)
    where = _where(cs)
    face = next((f for f in _faces(pd) if (j1, s1) in f), None)
    if face is None or (j2, s2) not in face or (j1, s1) == (j2, s2):
        raise InputError("pd move r2+: the two sides are not distinct sides of one face")
    e, f = cs[j1][s1], cs[j2][s2]
    if e == f:
        raise InputError("pd move r2+: both sides are the same edge")
    P, Q = (j1, s1), _other(where, j1, s1, cs)
    R, S = (j2, s2), _other(where, j2, s2, cs)
    e_fwd = role[P] == -1  # e is oriented along the face walk (P to Q)
    f_fwd = role[R] == -1
    base = max(x for c in cs for x in c) + 1
    ea, eb, ec = e, base, base + 1
    fa, fb, fc = f, base + 2, base + 3
    cs[Q[0]][Q[1]] = ec
    cs[S[0]][S[1]] = fc
    # the finger of e rises into the face, crossing f at X then at Y (f meets Y first);
    # counterclockwise rings from the direction of f's start (east)
    ring_x = [fb, eb, fc, ea]
    ring_y = [fa, eb, fb, ec]
    if over:  # e over: f is the under-strand
        sx = 0 if f_fwd else 2
        sy = 0 if f_fwd else 2
    else:
        sx = 3 if e_fwd else 1
        sy = 1 if e_fwd else 3
    cs.append(list(_rot(ring_x, sx)))
    cs.append(list(_rot(ring_y, sy)))
    return cs


def _bigon(pd: PDCode, j: int, s: int):
    cs = pd.crossings
    face = next((f for f in _faces(pd) if (j, s) in f), None)
    if face is None or len(face) != 2:
        return None
    (x, xo), (y, yo) = face if face[0] == (j, s) else face[::-1]
    if x == y:
        return None
    yi = _other(_where(cs), x, xo, cs)[1]  # g1 arrives at y in slot yi
    if xo % 2 != yi % 2:
        return None  # the strand of g1 is over at one end and under at the other
    return x, y


def _r2_remove(pd: PDCode, j: int, s: int) -> list:
    b = _bigon(pd, j, s)
    if b is None:
        raise InputError("pd move r2-: the side is not on a bigon with one strand over both")
    out = _splice(pd.crossings, set(b))
    if out is None or not out:
        raise InputError("pd move r2-: removing the bigon leaves a crossingless component")
    return out


def _r1_remove(pd: PDCode, j: int) -> list:
    c = pd.crossings[j]
    if not any(c[s] == c[(s + 1) % 4] for s in range(4)):
        raise InputError(f"pd move r1-: crossing {j} is not a kink")
    out = _splice(pd.crossings, {j})
    if out is None or not out:
        raise InputError("pd move r1-: removing the kink leaves a crossingless component")
    return out


def _triangle(pd: PDCode, j: int, s: int):
    # the triangle face of side (j, s), walked A -> B -> C (counterclockwise), with the
    # slots of its inner and outer edges at each corner; None when not an R3 triangle
    cs = pd.crossings
    face = next((f for f in _faces(pd) if (j, s) in f), None)
    if face is None or len(face) != 3:
        return None
    k = face.index((j, s))
    (A, sa), (B, sb), (C, _sc) = face[k], face[(k + 1) % 3], face[(k + 2) % 3]
    if len({A, B, C}) != 3:
        return None
    where = _where(cs)
    t = _other(where, A, sa, cs)[1]  # edge c arrives at B in slot t
    if t != (sb + 1) % 4:  # pragma: no cover - the face walk guarantees it
        return None
    if sa % 2 != t % 2:
        return None  # the strand along AB is not over (or under) at both ends
    u = _other(where, B, sb, cs)[1]  # edge a arrives at C in slot u
    return A, sa, B, t, C, u


def _r3(pd: PDCode, j: int, s: int) -> list:
    tri = _triangle(pd, j, s)
    if tri is None:
        raise InputError("pd move r3: the side is not on a triangle whose strand along it "
                         "passes over (or under) both other strands")
    A, sa, B, t, C, u = tri
    cs = [list(c) for c in pd.crossings]
    role = occurrence_roles(pd)
    # inner edges c (A-B), a (B-C), b (C-A) and the outer edges at each corner, read off
    # the counterclockwise rings: A = [c, b, c_A, b_A], B = [c_B, a, c, a_B],
    # C = [b_C, a_C, b, a] (see docs/open13.md for the picture)
    c_, b_, cA, bA = (cs[A][(sa + i) % 4] for i in range(4))
    a_, cB, aB = cs[B][(t - 1) % 4], cs[B][(t + 2) % 4], cs[B][(t + 1) % 4]
    bC, aC = cs[C][(u + 1) % 4], cs[C][(u + 2) % 4]
    c_under = sa % 2 == 0  # strand S_c (along c) under at A and B
    a_under_at_C = u % 2 == 0
    c_fwd = role[(A, sa)] == -1  # S_c runs from A to B
    b_fwd = role[(A, (sa + 1) % 4)] == -1  # S_b runs from A to C
    a_fwd = role[(B, (t - 1) % 4)] == -1  # S_a runs from B to C
    # after the move: S_c = c_A - B' - c - A' - c_B, S_b = b_A - C' - b - A' - b_C,
    # S_a = a_B - C' - a - B' - a_C; counterclockwise rings (east first):
    ring_b = [c_, aC, cA, a_]  # B' = S_c x S_a
    ring_a = [cB, bC, c_, b_]  # A' = S_c x S_b
    ring_c = [b_, a_, bA, aB]  # C' = S_a x S_b
    # incoming under slot of each new crossing
    if c_under:
        sb_new = 2 if c_fwd else 0  # at B' S_c enters along c_A (slot 2) or along c
        sa_new = 2 if c_fwd else 0  # at A' S_c enters along c (slot 2) or along c_B
    else:
        sb_new = 3 if a_fwd else 1  # S_a enters B' along a (slot 3) or along a_C
        sa_new = 3 if b_fwd else 1  # S_b enters A' along b (slot 3) or along b_C
    # at C' one of S_a, S_b is under, as at C
    if a_under_at_C:
        sc_new = 3 if a_fwd else 1  # S_a enters C' along a_B (slot 3) or along a
    else:
        sc_new = 2 if b_fwd else 0  # S_b enters C' along b_A (slot 2) or along b
    cs[A] = list(_rot(ring_a, sa_new))
    cs[B] = list(_rot(ring_b, sb_new))
    cs[C] = list(_rot(ring_c, sc_new))
    return cs


def _flype_tangle(pd: PDCode, j: int, s: int, r1: int, r2: int):
    # The tangle of a flype, or None. Picture crossing j with slot s pointing south-east
    # (SE), s + 1 north-east (NE), s + 2 north-west (NW), s + 3 south-west (SW); edges m1
    # (NE) and m2 (SE) run east into T, whose two other boundary edges are r1 (bordering
    # the face north of j) and r2 (bordering the face south of j), both bordering one
    # face X east of T.
    cs = pd.crossings
    where = _where(cs)
    if r1 == r2 or r1 not in where or r2 not in where:
        return None
    m1, m2 = cs[j][(s + 1) % 4], cs[j][s]
    if len({m1, m2, r1, r2}) < 4 or cs[j][(s + 2) % 4] in (m1, m2) \
            or cs[j][(s + 3) % 4] in (m1, m2):
        return None
    fs = _faces(pd)
    north = next(f for f in fs if (j, (s + 1) % 4) in f)
    south = next(f for f in fs if (j, (s + 3) % 4) in f)
    east = next(f for f in fs if (j, s) in f)

    def labels(f):
        return {cs[a][b] for a, b in f}

    if r1 not in labels(north) or r2 not in labels(south):
        return None
    if not any(r1 in labels(f) and r2 in labels(f) for f in fs if f is not east):
        return None
    cut = {m1, m2, r1, r2}
    t_start = _other(where, j, (s + 1) % 4, cs)[0]
    if t_start == j:
        return None
    tangle = {t_start}
    stack = [t_start]
    while stack:
        a = stack.pop()
        for b in range(4):
            x = cs[a][b]
            if x in cut:
                continue
            o = _other(where, a, b, cs)[0]
            if o == j:
                return None  # T touches j by another edge
            if o not in tangle:
                tangle.add(o)
                stack.append(o)
    if len(tangle) < 2:
        return None  # a single crossing turned over is itself
    ends = {}
    for x in (m1, m2, r1, r2):
        inside = [o for o in where[x] if o[0] in tangle]
        outside = [o for o in where[x] if o[0] not in tangle]
        if len(inside) != 1 or len(outside) != 1:
            return None
        ends[x] = (inside[0], outside[0])
    if ends[m1][1] != (j, (s + 1) % 4) or ends[m2][1] != (j, s):
        return None
    if ends[r1][1][0] == j or ends[r2][1][0] == j:
        return None
    # exactly four edges leave T
    leaving = sum(1 for a in tangle for b in range(4)
                  if _other(where, a, b, cs)[0] not in tangle)
    if leaving != 4:
        return None
    for b in (2, 3):  # j's west edges must reach the rest of the diagram
        o = _other(where, j, (s + b) % 4, cs)
        if o[0] in tangle or o[0] == j:
            return None
    return tangle, ends, m1, m2


def _flype(pd: PDCode, j: int, s: int, r1: int, r2: int, planar: bool = True) -> list:
    got = _flype_tangle(pd, j, s, r1, r2)
    if got is None:
        raise InputError("pd move flype: no flype tangle at that crossing and those edges")
    tangle, ends, m1, m2 = got
    cs = [list(c) for c in pd.crossings]
    role = occurrence_roles(pd)
    where = _where(pd.crossings)
    o_l1 = _other(where, j, (s + 2) % 4, pd.crossings)
    o_l2 = _other(where, j, (s + 3) % 4, pd.crossings)
    t_nw, t_sw = ends[m1][0], ends[m2][0]
    t_ne, o_r1 = ends[r1]
    t_se, o_r2 = ends[r2]
    # turn T over: a half turn about the west-east axis mirrors T's drawing and swaps
    # over and under; ring (a, b, c, d) becomes (b, a, d, c) or (d, c, b, a), read from
    # the old over-strand's incoming end
    for a in tangle:
        w, x, y, z = cs[a]
        cs[a] = [x, w, z, y] if role[(a, 1)] == 1 else [z, y, x, w]
        # slots moved: old slot k is now at slot (1 - k) or (3 - k)
    def moved(occ):
        a, b = occ
        return (a, (1 - b) % 4) if role[(a, 1)] == 1 else (a, (3 - b) % 4)

    fresh = max(x for c in cs for x in c) + 1
    A, B, C, D, E, F = range(fresh, fresh + 6)
    # T's old south-west end now faces north-west and meets j's old north-west edge, etc.
    for occ, lab in ((moved(t_sw), A), (o_l1, A), (moved(t_nw), B), (o_l2, B),
                     (moved(t_se), C), (moved(t_ne), D), (o_r1, E), (o_r2, F)):
        cs[occ[0]][occ[1]] = lab
    # the crossing, now east of T, keeps its diagonal over: ring NE, NW, SW, SE
    ring = [E, C, D, F]
    under = (1, 3) if s % 2 == 0 else (0, 2)  # NW-SE is j's under-strand when s is even
    for start in under:
        cs[j] = list(_rot(ring, start))
        try:
            return list(relabel(cs, planar).crossings)
        except InputError:
            continue
    raise InputError("pd move flype: the flyped diagram is not a valid PD code")


def apply_pd_move(pd: PDCode, move: PDMove, check: bool = True) -> PDCode:
    """The diagram after one move, validated and relabelled (see :func:`relabel`);
    ``check=False`` skips the planarity check of the result (searches use it: every move
    keeps planarity, which tests/test_pdmoves.py checks, and proofs are replayed checked).

    Raises
    ------
    InputError
        When the move does not apply to ``pd`` or its result is not a valid PD code.

    References
    ----------
    .. [1] K. Reidemeister, "Elementare Begründung der Knotentheorie", Abh. Math. Sem.
       Univ. Hamburg 5 (1927).
    """
    n = pd.length
    a = move.args

    def occ(j: int, s: int) -> None:
        if not (0 <= j < n and 0 <= s < 4):
            raise InputError(f"pd move {move.kind}: no slot {s} at crossing {j}")

    if move.kind == "r1+":
        occ(a[0], a[1])
        cs = _r1_add(pd, a[0], a[1], a[2] & 1, a[3] & 1)
    elif move.kind == "r1-":
        occ(a[0], 0)
        cs = _r1_remove(pd, a[0])
    elif move.kind == "r2+":
        occ(a[0], a[1])
        occ(a[2], a[3])
        cs = _r2_add(pd, a[0], a[1], a[2], a[3], a[4] & 1)
    elif move.kind == "r2-":
        occ(a[0], a[1])
        cs = _r2_remove(pd, a[0], a[1])
    elif move.kind == "r3":
        occ(a[0], a[1])
        cs = _r3(pd, a[0], a[1])
    elif move.kind == "flype":
        occ(a[0], a[1])
        cs = _flype(pd, a[0], a[1], a[2], a[3], check)
    elif move.kind == "reroute":
        occ(a[0], 2)
        from plait.diagrams.reroute import reroute_arc

        cs = reroute_arc(pd, a[0], a[1] & 1)
    else:
        raise InputError(f"pd move: unknown kind {move.kind!r}")
    return relabel(cs, check)


def pd_moves(pd: PDCode, kinds=PD_MOVE_KINDS) -> list[PDMove]:
    """Every move of the given kinds that applies to ``pd`` (``r1+`` on one end of each
    edge; ``r2+`` on ordered pairs of distinct edges of each face)."""
    cs = pd.crossings
    out: list[PDMove] = []
    fs = _faces(pd)
    if "r1-" in kinds:
        for j, c in enumerate(cs):
            if any(c[s] == c[(s + 1) % 4] for s in range(4)):
                out.append(PDMove("r1-", (j,)))
    if "r1+" in kinds:
        for j in range(len(cs)):
            for s in (0, 2):  # each edge once: at the under ends
                for loop in (0, 1):
                    for over in (0, 1):
                        out.append(PDMove("r1+", (j, s, loop, over)))
    for f in fs:
        if "r2-" in kinds and len(f) == 2 and _bigon(pd, *f[0]) is not None:
            out.append(PDMove("r2-", f[0]))
        if "r3" in kinds and len(f) == 3:
            for side in f:
                if _triangle(pd, *side) is not None:
                    out.append(PDMove("r3", side))
        if "r2+" in kinds:
            for p in f:
                for q in f:
                    if p != q and cs[p[0]][p[1]] != cs[q[0]][q[1]]:
                        for over in (0, 1):
                            out.append(PDMove("r2+", (*p, *q, over)))
    if "flype" in kinds:
        for j in range(len(cs)):
            for s in range(4):
                out += _flypes_at(pd, j, s)
    if "reroute" in kinds:
        from plait.diagrams.reroute import arc_reroutes

        out += [PDMove("reroute", (j, u)) for j, u, _gain in arc_reroutes(pd)]
    return out


def _flypes_at(pd: PDCode, j: int, s: int) -> list[PDMove]:
    # flypes of crossing j towards slots s, s + 1: r1 on the north face, r2 on the south
    # face, and both on one more face (east of the tangle)
    cs = pd.crossings
    fs = _faces(pd)
    north = next(f for f in fs if (j, (s + 1) % 4) in f)
    south = next(f for f in fs if (j, (s + 3) % 4) in f)
    east = next(f for f in fs if (j, s) in f)
    shared: set[tuple[int, int]] = set()
    for f in fs:
        if f is east:
            continue
        lab = {cs[a][b] for a, b in f}
        shared.update((x, y) for x in lab for y in lab if x != y)
    out = []
    for r1 in sorted({cs[a][b] for a, b in north}):
        for r2 in sorted({cs[a][b] for a, b in south}):
            if (r1, r2) in shared and _flype_tangle(pd, j, s, r1, r2) is not None:
                out.append(PDMove("flype", (j, s, r1, r2)))
    return out


def random_pd_move(pd: PDCode, rng: random.Random, weights: dict[str, float] | None = None
                   ) -> PDMove | None:
    """A random applicable move: a kind drawn by ``weights``, then a move of that kind."""
    w = weights or {"r1+": 0.2, "r1-": 1.0, "r2+": 1.0, "r2-": 1.5, "r3": 2.0, "flype": 1.5}
    kinds = [k for k in PD_MOVE_KINDS if w.get(k, 0) > 0]
    while kinds:
        k = rng.choices(kinds, [w[x] for x in kinds])[0]
        if k == "flype":  # look at crossings in random order; stop at the first with one
            places = [(j, s) for j in range(pd.length) for s in range(4)]
            rng.shuffle(places)
            for j, s in places:
                options = _flypes_at(pd, j, s)
                if options:
                    return rng.choice(options)
            kinds.remove(k)
            continue
        options = pd_moves(pd, (k,))
        if options:
            return rng.choice(options)
        kinds.remove(k)
    return None
