"""Plat words, closed braids, parsing and PD export (the foundation)."""

from __future__ import annotations

import json

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from kidata import knots

from plait import (
    ClosedBraid,
    InputError,
    PlatWord,
    parse_pd,
    parse_word,
    plat_to_pd,
    presentation_from_obj,
    presentation_to_obj,
    validate_pd,
)
from plait.diagrams.pd import pd_components, trace_plat


@st.composite
def plats(draw, max_bridges: int = 6, max_length: int = 40):
    n = draw(st.integers(1, max_bridges))
    m = 2 * n
    if m == 2:
        gens = st.sampled_from([1, -1])
    else:
        gens = st.integers(1, m - 1).flatmap(lambda k: st.sampled_from([k, -k]))
    word = draw(st.lists(gens, max_size=max_length))
    return PlatWord(m, tuple(word))


# -- value-type laws (common practice: group laws of the braid group) --------------------


@given(plats())
def test_inverse_of_inverse(p):
    assert p.inverse().inverse() == p


@given(plats())
def test_mirror_of_mirror(p):
    assert p.mirror().mirror() == p
    assert p.mirror().components == p.components


@given(plats(), plats())
def test_concatenation_length(p, q):
    q = PlatWord(p.strands, tuple(g for g in q.word if abs(g) < p.strands))
    assert (p + q).length == p.length + q.length
    assert (p + q).word[: p.length] == p.word


@given(plats())
def test_equality_and_hash(p):
    q = PlatWord(p.strands, tuple(p.word))
    assert p == q and hash(p) == hash(q)
    assert {p: 1}[q] == 1


@given(plats())
def test_permutation_is_a_permutation(p):
    perm = p.permutation()
    assert sorted(perm) == list(range(1, p.strands + 1))
    # inverse word undoes the permutation (group law)
    inv = p.inverse().permutation()
    assert all(inv[perm[i] - 1] == i + 1 for i in range(p.strands))


@given(plats())
def test_components_agree_with_tracing(p):
    # two independent computations: union-find over caps and the explicit trace
    assert p.components == len(trace_plat(p))


@settings(max_examples=60)
@given(plats(max_bridges=5, max_length=30))
def test_pd_export_is_valid_and_counts(p):
    comps = trace_plat(p)
    # common practice: the empty PD code is the unknot, so neither a split crossingless
    # circle nor a crossingless unlink of several circles has a PD code
    if (p.word and any(not path for path in comps)) or (not p.word and p.components > 1):
        with pytest.raises(InputError):
            plat_to_pd(p)
        return
    pd = plat_to_pd(p)
    assert pd.length == p.length
    labels = sorted(x for c in pd.crossings for x in c)
    assert labels == sorted(list(range(1, 2 * p.length + 1)) * 2)
    validate_pd(pd.crossings)
    if p.word:
        assert len(pd_components(pd)) == p.components


# -- parse / format round trips ------------------------------------------------------------


@given(plats())
def test_word_round_trip_all_spellings(p):
    for text in (str(p), ",".join(map(str, p.word)), json.dumps(list(p.word))):
        assert parse_word(text) == p.word


@given(plats())
def test_presentation_json_round_trip(p):
    obj = json.loads(json.dumps(presentation_to_obj(p)))
    assert presentation_from_obj(obj) == p
    b = ClosedBraid(p.bridges, tuple(g for g in p.word if abs(g) < p.bridges))
    assert presentation_from_obj(json.loads(json.dumps(presentation_to_obj(b)))) == b


@settings(max_examples=40)
@given(plats(max_bridges=4, max_length=20).filter(lambda p: p.length > 0))
def test_pd_text_round_trip(p):
    try:
        pd = plat_to_pd(p)
    except InputError:
        return
    assert parse_pd(str(pd)) == pd
    assert presentation_from_obj(presentation_to_obj(pd)) == pd


# -- known closures --------------------------------------------------------------------------


@pytest.mark.parametrize("q", range(1, 12))
def test_torus_links_two_strands(q):
    # T(2, q): 2 components when q is even, 1 when odd (common practice)
    plat = ClosedBraid(2, (1,) * q).to_plat()
    assert plat.components == (2 if q % 2 == 0 else 1)
    assert plat.strands == 4 and plat.length == 3 * q


def test_unknot_and_unlink():
    # the empty 1-bridge plat is the unknot; the empty n-bridge plat the n-component unlink
    # (common practice)
    assert PlatWord(2, ()).components == 1
    assert PlatWord(6, ()).components == 3
    assert plat_to_pd(PlatWord(2, ())).crossings == ()


def test_braid_conversion_rule():
    # sigma_i^e -> sigma_{2i} sigma_{2i-1}^e sigma_{2i}^-1 (field notes, closed braid to plat)
    assert ClosedBraid(3, (1, -2)).to_plat().word == (2, 1, -2, 4, -3, -4)


def test_knotinfo_braids_give_one_component_plats():
    # source: KnotInfo via database-knotinfo (braid_notation of every knot 3..10 crossings)
    rows = knots(10)
    assert len(rows) == 249
    for row in rows:
        braid = ClosedBraid.from_word(row.braid)
        plat = braid.to_plat()
        assert plat.strands == 2 * braid.strands
        assert plat.components == 1, row.name
        pd = plat_to_pd(plat)
        validate_pd(pd.crossings)
        assert pd.length == plat.length
        assert len(pd_components(pd)) == 1


def test_knotinfo_pd_codes_validate():
    # source: KnotInfo via database-knotinfo (pd_notation of every knot 3..10 crossings)
    for row in knots(10):
        pd = validate_pd(row.pd)
        assert pd.length == row.crossings
        assert len(pd_components(pd)) == 1, row.name


def test_non_planar_rotation_is_rejected():
    # trefoil's code with two labels of one crossing swapped: same labels, non-planar
    # rotation system (common practice: Euler's formula V - E + F = 2)
    with pytest.raises(InputError, match="not planar"):
        validate_pd([[1, 5, 2, 4], [3, 1, 4, 6], [5, 6, 3, 2]])
