"""Laws of the move graph: every move keeps the link, replay reproduces walks, canonical form."""

import random

from hypothesis import assume, given, settings
from hypothesis import strategies as st

from plait.moves import (
    MOVE_KINDS,
    apply_move,
    canonical,
    canonical_with_moves,
    destab_sites,
    destabilize_all,
    isolating_moves,
    neighbor_deltas,
    neighbors,
    random_walk,
    replay,
    scramble,
)
from plait.moves.records import MoveRecord
from plait.scoring import fingerprint, guard
from plait.word import ClosedBraid, PlatWord


@st.composite
def plats(draw, max_bridges=8, max_length=60):
    n = draw(st.integers(1, max_bridges))
    s = 2 * n
    letter = st.integers(1, s - 1).flatmap(lambda k: st.sampled_from((k, -k)))
    word = draw(st.lists(letter, max_size=max_length))
    return PlatWord(s, tuple(word))


def same_link(a, b, detail=""):
    # invariants from plait.scoring: components, linking numbers, determinant, Jones
    # (Kauffman 1987); raises GuardViolation when they differ
    guard(fingerprint(a), fingerprint(b), detail)


@given(plats(), st.integers(0, 10**6), st.integers(1, 15))
@settings(max_examples=30, deadline=None)
def test_random_walks_keep_the_link_and_replay(p, seed, steps):
    # source: Birman 1976 — pairing-subgroup factors, braid relations and (de)stabilization
    # keep the plat closure
    q, recs = random_walk(p, steps, seed, max_bridges=8)
    same_link(p, q, f"walk seed {seed}")
    res = replay(p, recs)
    assert res.ok, res.reason
    assert res.final == q
    # records survive their JSON form
    assert replay(p, [MoveRecord.from_json(r.to_json()) for r in recs]).final == q


@given(plats(max_bridges=3, max_length=12), st.randoms(use_true_random=False))
@settings(max_examples=15, deadline=None)
def test_every_kind_of_neighbour_keeps_the_link(p, rnd):
    # source: Birman 1976 (each move is a double-coset move, a braid relation or a
    # stabilization)
    moves = list(neighbors(p, MOVE_KINDS - {"reduce"}))
    byk: dict = {}
    for rec, q in moves:
        byk.setdefault(rec.kind, []).append((rec, q))
    for _kind, lst in byk.items():
        for rec, q in rnd.sample(lst, min(4, len(lst))):
            same_link(p, q, str(rec))
            assert replay(p, [rec]).final == q


@given(plats(max_bridges=5, max_length=40))
@settings(max_examples=40, deadline=None)
def test_deltas_give_the_length_of_the_applied_move(p):
    for rec, L in neighbor_deltas(p):
        q = apply_move(p, rec)
        assert q.length == L, rec
        assert (q.bridges < p.bridges) == (rec.kind == "destab")


@given(plats(), st.randoms(use_true_random=False))
@settings(max_examples=60, deadline=None)
def test_canonical_form_is_idempotent_and_ignores_far_commutation(p, rnd):
    c = canonical(p)
    assert canonical(c) == c
    w = list(p.word)
    for _ in range(2 * len(w)):
        if len(w) < 2:
            break
        i = rnd.randrange(len(w) - 1)
        if abs(abs(w[i]) - abs(w[i + 1])) >= 2:
            w[i], w[i + 1] = w[i + 1], w[i]
    assert canonical(PlatWord(p.strands, tuple(w))) == c
    assert c.length <= p.length
    c2, recs = canonical_with_moves(p)
    assert c2 == c
    res = replay(p, recs)
    assert res.ok, res.reason
    assert res.final == c


@given(plats(max_bridges=4, max_length=30))
@settings(max_examples=20, deadline=None)
def test_canonical_form_keeps_the_link(p):
    # source: Birman 1976 (end absorption is multiplication by a pairing-subgroup element)
    same_link(p, canonical(p))


@given(plats(max_bridges=7, max_length=60), st.integers(0, 10**6))
@settings(max_examples=40, deadline=None)
def test_destabilization_after_stabilization_returns_the_canonical_form(p, seed):
    rng = random.Random(seed)
    c = canonical(p)
    assume(not destab_sites(c.word, c.strands))
    n = c.bridges
    j = rng.choice((1, n + 1))
    g = rng.choice((2 * j, -2 * j) if j == 1 else (2 * j - 2, -(2 * j - 2)))
    rec = MoveRecord("stab", (j, rng.randrange(c.length + 1), g))
    s = apply_move(c, rec)
    assert s.bridges == n + 1
    d, recs = destabilize_all(s)
    assert d == c
    assert replay(s, recs).final == c


def test_unknot_loses_its_extra_bridge():
    # source: Schubert 1954 (b = 1 exactly for the unknot); the closed 2-braid sigma_1 is the
    # unknot and its plat 2 1 -2 has a kink once a braid relation is applied
    p = ClosedBraid.from_word([1]).to_plat()
    assert p.word == (2, 1, -2)
    d, recs = destabilize_all(p, seek=5)
    assert d.bridges == 1 and d.length == 0
    assert replay(p, recs).final == d


def test_trefoil_keeps_two_bridges():
    # source: KnotInfo via database-knotinfo / Schubert 1954: 3_1 has bridge index 2, so no
    # sequence of valid moves can reach one bridge
    p = ClosedBraid.from_word([1, 1, 1]).to_plat()
    d, recs = destabilize_all(p, seek=20)
    assert d.bridges == 2
    same_link(p, d)
    assert replay(p, recs).final == d


def test_isolating_moves_lower_the_key():
    p = PlatWord(4, (2, 1, -2))
    got = list(isolating_moves(p))
    assert got
    recs, q, key = got[0]
    assert key < (2, 3)
    assert replay(p, recs).final == q


@given(plats(max_bridges=4, max_length=20), st.integers(0, 10**6))
@settings(max_examples=15, deadline=None)
def test_scramble_keeps_the_link_and_is_replayable(p, seed):
    q, recs = scramble(p, seed, length_factor=3, stabilizations=2)
    assert q.bridges == p.bridges + 2
    assert q.length >= max(3 * p.length, p.length + 10)
    same_link(p, q)
    assert replay(p, recs).final == q
    assert scramble(p, seed, length_factor=3, stabilizations=2)[0] == q  # seeded


def test_inner_stabilization_at_a_split_position():
    # two trefoil plats side by side (nothing crosses between pairs 2 and 3): a split link.
    # A new pair 3 crossing either neighbour once is a kink (Reidemeister 1927, move I).
    t = (2, 1, -2, 2, 1, -2, 2, 1, -2)
    p = PlatWord(8, t + tuple(x + 4 if x > 0 else x - 4 for x in t))
    for g in (4, -4, 6, -6):
        for pos in (0, 5, p.length):
            rec = MoveRecord("stab", (3, pos, g))
            q = replay(p, [rec]).final
            assert q is not None and q.bridges == 5
            assert q == apply_move(p, rec)
            same_link(p, q, str(rec))
            assert (3, pos) in destab_sites(q.word, q.strands)
            assert replay(q, [MoveRecord("destab", (3, pos))]).final == p
    # where letters cross between pairs 2 and 3 the local form does not exist
    bad = PlatWord(8, (4,))
    assert not replay(bad, [MoveRecord("stab", (3, 0, 4))]).ok


@given(plats(max_bridges=3, max_length=10),
       st.lists(st.tuples(st.sampled_from(sorted(MOVE_KINDS)),
                          st.lists(st.integers(-7, 12), min_size=1, max_size=5)),
                min_size=1, max_size=4))
@settings(max_examples=150, deadline=None)
def test_replay_accepts_only_moves_that_keep_the_link(p, raw):
    # law: whatever records are fed to the checked replay, an accepted sequence ends at a
    # plat of the same link (Birman 1976), so forged certificates cannot lie
    recs = [[kind, *args] for kind, args in raw]
    res = replay(p, recs)
    if res.ok:
        same_link(p, res.final, str(recs))
    else:
        assert res.failed_step is not None and res.reason


def test_walks_from_the_unknot_come_back_to_the_empty_plat():
    # source: Schubert 1954 — the unknot is the only 1-bridge knot and its minimal plat is
    # the empty word on 2 strands; the reducer must find it from random presentations
    p = PlatWord(2, ())
    for seed in range(10):
        q, _ = random_walk(p, 80, seed, max_bridges=4)
        d, recs = destabilize_all(q, seek=40, explore=1000)
        assert (d.bridges, d.length) == (1, 0), seed
        assert replay(q, recs).final == d
