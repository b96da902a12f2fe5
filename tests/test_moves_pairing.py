"""Membership oracle for the pairing subgroup and the conventions of the Artin action."""

import itertools

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from plait.moves.pairing import (
    artin_action,
    free_reduce,
    generator_word,
    in_pairing_subgroup,
    pairing_generators,
)


def test_artin_action_convention_is_pinned():
    # sigma_i: x_i -> x_i x_{i+1} x_i^-1, x_{i+1} -> x_i  (field notes; Artin 1947)
    assert artin_action((1,), (1,)) == (1, 2, -1)
    assert artin_action((1,), (2,)) == (1,)
    assert artin_action((1,), (3,)) == (3,)
    # letters act first to last as substitutions (a right action): sigma_1 then sigma_2
    assert artin_action((1, 2), (1,)) == (1, 2, 3, -2, -1)
    # inverse letters undo their generator
    for m in (1, 2, 3):
        assert artin_action((1, -1), (m,)) == (m,)
        assert artin_action((-2, 2), (m,)) == (m,)


def test_artin_action_respects_braid_relations():
    # source: Artin 1947 (the action is a faithful representation of B_n)
    for u, v in [((1, 2, 1), (2, 1, 2)), ((2, 3, 2), (3, 2, 3)), ((1, 3), (3, 1))]:
        for m in range(1, 5):
            assert artin_action(u, (m,)) == artin_action(v, (m,))
    assert artin_action((1, 2), (1,)) != artin_action((2, 1), (1,))


@given(st.lists(st.integers(1, 3).flatmap(lambda k: st.sampled_from((k, -k))), max_size=8),
       st.lists(st.integers(1, 3).flatmap(lambda k: st.sampled_from((k, -k))), max_size=8))
@settings(max_examples=60, deadline=None)
def test_artin_action_is_a_right_action(u, v):
    # law: (u v)(x) = v(u(x)) for our first-to-last substitution order
    for m in range(1, 5):
        assert artin_action(u + v, (m,)) == artin_action(v, artin_action(u, (m,)))


@pytest.mark.parametrize("strands", [2, 4, 6, 8])
def test_every_local_generator_and_inverse_is_a_member(strands):
    # source: Hilden 1975 (generators of K_2n); test from the field notes' handlebody argument
    count = 0
    for kind, i, e, w in pairing_generators(strands):
        assert in_pairing_subgroup(w, strands), (kind, i, e, w)
        count += 1
    n = strands // 2
    assert count == 2 * (n + 3 * (n - 1))


def test_hilden_generators_are_members():
    # source: Hilden 1975: sigma_1, sigma_2 sigma_1^2 sigma_2 and
    # sigma_2j sigma_2j-1 sigma_2j+1 sigma_2j
    assert in_pairing_subgroup((1,), 6)
    assert in_pairing_subgroup((2, 1, 1, 2), 6)
    assert in_pairing_subgroup((2, 1, 3, 2), 6)
    assert in_pairing_subgroup((4, 3, 5, 4), 6)
    assert in_pairing_subgroup((), 6)


@pytest.mark.parametrize("word", [(2,), (2, 2), (1, 2), (4,), (2, -1), (3, 2)])
def test_non_members(word):
    # source: field notes (checked there): these fail the handlebody test on 6 strands;
    # sigma_2 joins two caps, so its plat closure differs (common practice)
    assert not in_pairing_subgroup(word, 6)


def test_orientation_of_the_quotient_matters():
    # Derivation pinned here: the two feet of cap i are met with opposite orientations by
    # a loop around the cap arc, so x_{2i} maps to y_i^-1. Sending x_{2i} to y_i instead
    # would not even accept the identity braid.
    image = artin_action((), (1, 2))
    same_orientation = free_reduce([(abs(x) + 1) // 2 for x in image])
    assert same_orientation  # y_1 y_1 != 1
    assert in_pairing_subgroup((), 4)


gens6 = [w for _k, _i, _e, w in pairing_generators(6)]


@given(st.lists(st.sampled_from(gens6), max_size=5))
@settings(max_examples=40, deadline=None)
def test_products_of_generators_are_members(parts):
    # law: K_2n is a subgroup
    w = tuple(itertools.chain.from_iterable(parts))
    assert in_pairing_subgroup(w, 6)


@given(st.lists(st.sampled_from(gens6), max_size=3), st.sampled_from([(2,), (4,), (-2,)]))
@settings(max_examples=40, deadline=None)
def test_a_bridge_joining_letter_times_members_is_not_a_member(parts, bad):
    # law: h sigma_2 in K with h in K would put sigma_2 in K
    w = tuple(itertools.chain.from_iterable(parts)) + bad
    assert not in_pairing_subgroup(w, 6)


def test_generator_word_inverse():
    for kind in ("swap", "lthread", "rthread"):
        w = generator_word(kind, 1, 1, 4)
        winv = generator_word(kind, 1, -1, 4)
        assert free_reduce(w + winv) == ()
