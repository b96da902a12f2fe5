"""Two-bridge links S(p, q): Schubert normal forms checked against KnotInfo and Schubert's laws."""

from __future__ import annotations

import json
from fractions import Fraction
from functools import cache
from math import gcd

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from kidata import knot, knots

from plait.errors import InputError
from plait.scoring import determinant, jones, mirror_jones
from plait.scoring.signature import signature
from plait.scoring.twobridge import (
    candidates,
    continued_fraction,
    two_bridge_classes,
    two_bridge_plat,
)


@cache
def _knotinfo_two_bridge() -> dict[str, tuple[int, int]]:
    # source: KnotInfo via database-knotinfo (field two_bridge_notation, "[p,q]")
    from database_knotinfo import link_list

    out = {}
    for row in link_list():
        text = row.get("two_bridge_notation") or ""
        if text.startswith("["):
            p, q = json.loads(text)
            out[row["name"]] = (int(p), int(q))
    return out


def _value(cf: tuple[int, ...]) -> Fraction:
    x = Fraction(cf[-1])
    for a in reversed(cf[:-1]):
        x = a + 1 / x
    return x


@given(st.integers(2, 400).flatmap(
    lambda p: st.tuples(st.just(p), st.integers(1, p - 1))))
def test_continued_fraction_law(pq):
    # common practice: p/q = [a1, ..., am] with positive terms; m odd by [..., a] =
    # [..., a - 1, 1]
    p, q = pq
    cf = continued_fraction(p, q)
    assert len(cf) % 2 == 1
    assert all(a >= 1 for a in cf)
    assert _value(cf) == Fraction(p, q)


def test_continued_fraction_examples():
    # from memory: 5/2 = 2 + 1/2 = [2, 1, 1]; 7/3 = 2 + 1/3 = [2, 2, 1]; 3/1 = [3]
    assert continued_fraction(5, 2) == (2, 1, 1)
    assert continued_fraction(7, 3) == (2, 2, 1)
    assert continued_fraction(3, 1) == (3,)
    with pytest.raises(InputError):
        continued_fraction(5, 5)


@pytest.mark.parametrize("name,p,q", [("3_1", 3, 1), ("4_1", 5, 2), ("5_2", 7, 3)])
def test_named_two_bridge_knots(name, p, q):
    # from memory: 3_1 = S(3,1), 4_1 = S(5,2), 5_2 = S(7,3); verified by the Jones
    # polynomial against KnotInfo (source: KnotInfo via database-knotinfo)
    row = knot(name)
    v = jones(two_bridge_plat(p, q))
    assert v == row.jones
    assert _knotinfo_two_bridge()[name] == (p, q)


def test_schubert_normal_forms_match_knotinfo():
    # source: KnotInfo via database-knotinfo: for every 2-bridge knot up to 10 crossings,
    # our 4-plat of S(p,q) with KnotInfo's [p,q] has exactly the table's Jones polynomial,
    # signature and determinant (so chirality agrees too)
    from database_knotinfo import link_list

    sig = {r["name"]: r["signature"] for r in link_list()}
    table = _knotinfo_two_bridge()
    rows = [r for r in knots(10) if r.bridge_index == 2]
    assert len(rows) == 95  # source: KnotInfo via database-knotinfo
    for row in rows:
        p, q = table[row.name]
        plat = two_bridge_plat(p, q)
        assert plat.bridges == 2 and plat.components == 1
        assert jones(plat) == row.jones, row.name
        assert signature(plat) == int(sig[row.name]), row.name
        assert determinant(plat) == row.determinant == p, row.name


def test_candidates_cover_every_two_bridge_knot():
    # Schubert 1956 + source: KnotInfo via database-knotinfo: each 2-bridge knot is among
    # the candidates of its determinant (compared by Jones polynomial, chirality included)
    for row in knots(10):
        if row.bridge_index != 2:
            continue
        assert any(jones(c) == row.jones for _, c in candidates(row.determinant)), row.name


@settings(max_examples=40, deadline=None)
@given(st.integers(2, 80).flatmap(
    lambda p: st.tuples(st.just(p), st.sampled_from(
        [q for q in range(1, p) if gcd(p, q) == 1]))))
def test_schubert_laws(pq):
    # Schubert 1956: det S(p,q) = p; S(p,q) = S(p,q^-1); S(p,-q) is the mirror image
    # (Jones of the mirror is V(1/t): Jones 1985). For links (p even) these hold for the
    # unoriented link, and the Jones polynomial is compared up to a power of t (reversing
    # a component multiplies it by t^(-3 lk): Lickorish 1997, Prop. 3.7)
    p, q = pq
    plat = two_bridge_plat(p, q)
    assert determinant(plat) == p
    assert plat.components == (1 if p % 2 else 2)
    norm = (lambda v: v) if p % 2 else _up_to_shift
    v = jones(plat)
    assert norm(jones(two_bridge_plat(p, pow(q, -1, p)))) == norm(v)
    assert norm(jones(two_bridge_plat(p, p - q))) == norm(mirror_jones(v))


def _up_to_shift(v: dict) -> dict:
    low = min(v)
    return {e - low: c for e, c in v.items()}


@given(st.integers(2, 300))
def test_classes_partition_units(p):
    # Schubert 1956: the classes {q, q^-1} of units mod p; one representative each
    reps = two_bridge_classes(p)
    units = [q for q in range(1, p) if gcd(p, q) == 1]
    seen = set()
    for q in reps:
        cls = {q, pow(q, -1, p)}
        assert not cls & seen
        seen |= cls
    assert seen == set(units)


def test_degenerate_candidates():
    # common practice: S(1,0) is the unknot, S(0,1) the 2-component unlink, S(2,1) the
    # Hopf link (det 2, 2 components)
    assert [c for _, c in candidates(1)] == [two_bridge_plat(1, 0)]
    assert jones(two_bridge_plat(1, 0)) == {Fraction(0): 1}
    unlink = two_bridge_plat(0, 1)
    assert unlink.components == 2 and determinant(unlink) == 0
    hopf = two_bridge_plat(2, 1)
    assert hopf.components == 2 and determinant(hopf) == 2
    with pytest.raises(InputError):
        two_bridge_plat(6, 3)
    assert candidates(9) is candidates(9)  # cached by p
