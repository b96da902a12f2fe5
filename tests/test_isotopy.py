"""Isotopy proofs between diagrams (plait.diagrams.isotopy): mirror, reversal, simplify, join."""

from __future__ import annotations

import json
import random

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from kidata import knot, knots

from plait.diagrams.isotopy import (
    check_isotopy_proof,
    join_diagrams,
    mirror_pd,
    reverse_pd,
    simplify_pd,
    unoriented_key,
)
from plait.diagrams.pd import validate_pd
from plait.diagrams.pdjones import pd_jones
from plait.diagrams.pdmoves import apply_pd_move, pd_moves, relabel

# source: KnotInfo via database-knotinfo (PD codes and Jones polynomials)
SAMPLE = [k for k in knots(9) if k.name in
          ("3_1", "4_1", "5_2", "6_2", "7_4", "8_5", "8_19", "8_20", "9_35", "9_46")]


def _walk(pd, kinds, steps, seed):
    rng = random.Random(seed)
    cur = relabel(pd.crossings)
    for _ in range(steps):
        ms = pd_moves(cur, kinds)
        if not ms:
            break
        cur = apply_pd_move(cur, rng.choice(ms))
    return cur


@pytest.mark.parametrize("k", SAMPLE, ids=lambda k: k.name)
def test_mirror_and_reversal_against_knotinfo(k):
    # source: KnotInfo Jones polynomial; common practice: the mirror image has V(1/t),
    # and a knot's Jones polynomial does not depend on its orientation
    d = validate_pd(k.pd)
    assert pd_jones(d) == k.jones
    assert pd_jones(mirror_pd(d)) == {-e: c for e, c in k.jones.items()}
    r = reverse_pd(d)
    assert pd_jones(r) == k.jones
    assert unoriented_key(r) == unoriented_key(d)


def test_mirror_of_a_chiral_knot_is_another_diagram():
    # source: KnotInfo (3_1 is chiral): no relabelling takes a trefoil to its mirror image
    d = validate_pd(knot("3_1").pd)
    assert unoriented_key(mirror_pd(d)) != unoriented_key(d)
    assert unoriented_key(mirror_pd(mirror_pd(d))) == unoriented_key(d)


@pytest.mark.parametrize("k", SAMPLE, ids=lambda k: k.name)
def test_simplify_undoes_kinks_and_bigons(k):
    # Reidemeister 1927: added kinks and bigons come off again; the result keeps KnotInfo's
    # Jones polynomial and has the table's crossing number (KnotInfo)
    d = validate_pd(k.pd)
    messy = _walk(d, ("r1+", "r2+"), 3, seed=len(k.name))
    small, path = simplify_pd(messy, seconds=20, target=k.crossings)
    assert small.length == k.crossings
    assert pd_jones(small) == k.jones
    cur = relabel(messy.crossings)
    for m in path:
        cur = apply_pd_move(cur, m)
    assert cur == small


@pytest.mark.parametrize("k", [k for k in SAMPLE if k.name not in ("8_19", "8_20")],
                         ids=lambda k: k.name)
def test_join_finds_flypes_and_r3_and_the_proof_checks(k):
    # Menasco-Thistlethwaite 1993 (flypes join reduced alternating diagrams); the proof is
    # replayed from scratch by check_isotopy_proof
    d = validate_pd(k.pd)
    moved = _walk(d, ("flype", "r3"), 4, seed=7)
    proof = join_diagrams(moved, d, seconds=20)
    assert proof is not None
    obj = json.loads(json.dumps(proof.to_json()))
    assert check_isotopy_proof(obj, moved, d) == ""
    assert check_isotopy_proof(obj, moved, mirror_pd(d)) != ""  # another target


def test_tampered_isotopy_proof_is_rejected():
    # Reidemeister 1927: only the recorded moves may join the diagrams; an edited move,
    # a changed start or a mirrored target must not check (8_5, KnotInfo PD code)
    d = validate_pd(knot("8_5").pd)
    messy = _walk(d, ("r1+", "r2+"), 2, seed=3)
    small, path = simplify_pd(messy, seconds=20, target=8)
    proof = join_diagrams(small, d, seconds=20)
    assert proof is not None
    obj = proof.to_json()
    obj["start"] = messy.to_list()
    obj["steps"] = [m.to_json() for m in path] + obj["steps"]
    assert check_isotopy_proof(obj) == ""
    bad = json.loads(json.dumps(obj))
    bad["steps"][0] = [bad["steps"][0][0]] + [a + 1 for a in bad["steps"][0][1:]]
    assert check_isotopy_proof(bad) != ""
    bad = json.loads(json.dumps(obj))
    bad["steps"] = bad["steps"][1:]
    assert check_isotopy_proof(bad) != ""
    bad = json.loads(json.dumps(obj))
    bad["target"] = mirror_pd(d).to_list()
    assert check_isotopy_proof(bad) != ""
    assert check_isotopy_proof({"format": "something else"}) != ""


def test_different_knots_are_not_joined():
    # KnotInfo: 5_1 and 5_2 are different knots (different Jones polynomials)
    a, b = validate_pd(knot("5_1").pd), validate_pd(knot("5_2").pd)
    assert join_diagrams(a, b, seconds=2) is None


@settings(max_examples=15, deadline=None)
@given(st.sampled_from(SAMPLE), st.integers(0, 10**6))
def test_every_search_move_keeps_the_knot(k, seed):
    # law (Reidemeister 1927; source: KnotInfo Jones): a walk of the moves the searches
    # use, applied without the planarity check, still gives valid codes of the same knot
    d = validate_pd(k.pd)
    rng = random.Random(seed)
    cur = relabel(d.crossings)
    for _ in range(4):
        ms = pd_moves(cur, ("r1-", "r2-", "r2+", "r3", "flype"))
        if not ms:
            break
        cur = apply_pd_move(cur, rng.choice(ms), check=False)
        validate_pd(cur.crossings)  # planar after all
    assert pd_jones(cur) == k.jones


@pytest.mark.parametrize("k", SAMPLE, ids=lambda k: k.name)
def test_rerouted_arcs_keep_the_knot_and_the_writhe(k):
    # law: an arc lifted above (or pushed below) the rest and laid down along a shortest
    # path through the faces is an isotopy (Reidemeister 1927: R2 and R3 moves, and R1
    # where the arc turns about its own ends): the code stays valid and planar,
    # KnotInfo's Jones polynomial is kept, and the diagram loses exactly the announced
    # number of crossings
    from plait.diagrams.reroute import arc_reroutes, reroute_arc

    d = validate_pd(k.pd)
    messy = _walk(d, ("r2+",), 3, seed=11)
    found = arc_reroutes(messy)
    assert found, "three bigons always leave an arc to reroute"
    for u0, under, gain in found:
        new = validate_pd(reroute_arc(messy, u0, under))
        assert new.length == messy.length - gain
        assert pd_jones(new) == k.jones


def test_a_reroute_that_shortens_nothing_is_refused():
    # common practice: the table's diagram of 8_5 is minimal (KnotInfo crossing number 8),
    # so no arc of it can be rerouted with fewer crossings
    from plait.diagrams.pdmoves import PDMove
    from plait.diagrams.reroute import arc_reroutes
    from plait.errors import InputError

    d = validate_pd(knot("8_5").pd)
    assert arc_reroutes(d) == []
    with pytest.raises(InputError):
        apply_pd_move(d, PDMove("reroute", (0, 0)))
