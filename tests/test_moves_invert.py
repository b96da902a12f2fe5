"""Inverse move paths and the meet-in-the-middle search (laws, checked by replay)."""

from __future__ import annotations

from hypothesis import given
from hypothesis import strategies as st

from plait.moves import canonical_with_moves, handle_shorten, replay, scramble
from plait.moves.invert import expand_handle, invert_path
from plait.moves.meet import connect, meet_in_the_middle
from plait.moves.records import MoveRecord
from plait.word import PlatWord

# plats of the trefoil and of a 3-bridge word (KnotInfo braid words sent to plats)
PLATS = [PlatWord(4, (2, -1, 2)), PlatWord(6, (2, 2, -3, 4, -1, 2, -3, 4, 4))]


@given(st.integers(0, 10_000), st.sampled_from(PLATS))
def test_inverse_path_returns_to_the_start(seed, plat):
    # Birman 1976: every move is reversible; the inverse path replays (checked rules)
    # from the end of a scrambling walk, its handle reductions and canonical form back
    # to the start
    q, recs = scramble(plat, seed, length_factor=2)
    q2, r2 = handle_shorten(q)
    c, r3 = canonical_with_moves(q2)
    path = [*recs, *r2, *r3]
    assert replay(plat, path).final == c
    res = replay(c, invert_path(plat, path))
    assert res.ok and res.final == plat


def test_expanded_handle_equals_the_handle():
    # Dehornoy 1997: the handle s1 s2 s1^-1 equals s2^-1 s1 s2; written out as braid
    # relations and reduce macros it replays to the same word
    w = PlatWord(4, (1, 2, 3, 2, -1))
    recs = expand_handle(w.word, 4, 0, 4)
    direct = replay(w, [MoveRecord("handle", (0, 4))])
    assert replay(w, recs).final == direct.final


@given(st.integers(0, 10_000))
def test_connect_paths_replay(seed):
    # law: a path returned by the two-sided search replays from a to b
    a = PLATS[0]
    b, _ = scramble(a, seed, length_factor=1.5, stabilizations=0)
    path = connect(b, a, time_limit=5)
    if path is not None:
        res = replay(b, path)
        assert res.ok and res.final == a


def test_meet_finds_a_scrambled_trefoil():
    # a scrambled trefoil plat without stabilization meets its start (seed 1 from the
    # scramble model: 13 letters)
    a = PLATS[0]
    b, _ = scramble(a, 1, length_factor=2, stabilizations=0)
    assert meet_in_the_middle(b, a, time_limit=30) is not None
