"""Braid-group rewrites: each one is checked with Artin's faithful action on the free group."""

import itertools
import random

from hypothesis import given, settings
from hypothesis import strategies as st

from plait.moves.pairing import artin_action
from plait.moves.replay import same_modulo_commutation
from plait.moves.rewrite import (
    braid_triple,
    handle_end,
    lex_normal,
    raag_reduce,
    reduce_handle,
)


def same_braid(u, v, strands):
    # source: Artin 1947 — the action on the free group is faithful, so equal images of
    # every generator means equal braids
    return all(artin_action(u, (m,)) == artin_action(v, (m,)) for m in range(1, strands + 1))


def test_braid_relation_in_every_sign_form():
    # source: Artin 1947 (sigma_i sigma_j sigma_i = sigma_j sigma_i sigma_j, |i-j| = 1)
    found = 0
    for i, j in [(1, 2), (2, 1), (2, 3), (3, 2)]:
        for s in itertools.product((1, -1), repeat=3):
            a, b, c = s[0] * i, s[1] * j, s[2] * i
            out = braid_triple(a, b, c)
            if out is None:
                # no word y^f1 x^f2 y^f3 equals it
                for f in itertools.product((1, -1), repeat=3):
                    assert not same_braid((a, b, c), (f[0] * j, f[1] * i, f[2] * j), 4)
            else:
                found += 1
                assert same_braid((a, b, c), out, 4)
                assert braid_triple(*out) == (a, b, c)  # the rewrite is an involution
    assert found == 4 * 6


def test_braid_triple_rejects_non_patterns():
    assert braid_triple(1, 3, 1) is None
    assert braid_triple(1, 2, 2) is None
    assert braid_triple(1, -2, 1) is None


letters = st.integers(1, 5).flatmap(lambda k: st.sampled_from((k, -k)))


@given(st.lists(letters, max_size=14))
@settings(max_examples=80, deadline=None)
def test_raag_reduce_keeps_the_braid_and_is_idempotent(w):
    r = raag_reduce(w)
    assert same_braid(w, r, 6)
    assert raag_reduce(r) == r
    assert same_modulo_commutation(w, r)


@given(st.lists(letters, max_size=30), st.randoms(use_true_random=False))
@settings(max_examples=80, deadline=None)
def test_lex_normal_form_is_invariant_under_far_commutation(w, rnd):
    v = list(w)
    for _ in range(3 * len(v)):
        if len(v) < 2:
            break
        p = rnd.randrange(len(v) - 1)
        if abs(abs(v[p]) - abs(v[p + 1])) >= 2:
            v[p], v[p + 1] = v[p + 1], v[p]
    assert lex_normal(v) == lex_normal(w)
    assert lex_normal(lex_normal(w)) == lex_normal(w)
    assert sorted(lex_normal(w)) == sorted(w)
    assert same_modulo_commutation(w, v)


def test_lex_normal_worked_example():
    # 3 1 commute, 2 blocks: least word of {3 1 2, 1 3 2} is 1 3 2 (common practice)
    assert lex_normal([3, 1, 2]) == [1, 3, 2]
    assert lex_normal([2, 3, 1]) == [2, 1, 3]
    assert lex_normal([4, 1, 4]) == [1, 4, 4]


def test_same_modulo_commutation_rejects_braid_relation():
    # a braid relation is not a commutation (common practice)
    assert not same_modulo_commutation([1, 2, 1], [2, 1, 2])
    assert not same_modulo_commutation([1, 3], [1])


def test_handle_reduction_keeps_the_braid():
    # source: Dehornoy 1997 (handle reduction never changes the braid)
    rng = random.Random(5)
    seen = 0
    for _ in range(400):
        w = [rng.choice((1, -1)) * rng.randint(1, 5) for _ in range(rng.randint(2, 9))]
        for p in range(len(w)):
            q = handle_end(w, p)
            if q is None:
                continue
            seen += 1
            new = w[:p] + reduce_handle(w, p, q) + w[q + 1 :]
            assert same_braid(w, new, 6), (w, p, q)
    assert seen > 50


def test_handle_shorten_keeps_the_braid_and_replays():
    # source: Dehornoy 1997 (handle reduction keeps the braid); checked with Artin's action
    from plait.moves import handle_shorten, replay
    from plait.word import PlatWord

    rng = random.Random(11)
    shortened = 0
    for _ in range(60):
        w = tuple(rng.choice((1, -1)) * rng.randint(1, 3) for _ in range(rng.randint(0, 10)))
        p = PlatWord(4, w)
        q, recs = handle_shorten(p)
        assert q.length <= p.length
        shortened += q.length < p.length
        assert same_braid(p.word, q.word, 4)
        assert replay(p, recs).final == q
    assert shortened > 10
