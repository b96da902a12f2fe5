"""Composite knots: decomposing circles, factors and Schubert's additivity of bridge number."""

from __future__ import annotations

import json
from fractions import Fraction

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from kidata import knot, knots

from plait.bridge import bridge_report
from plait.cli import main
from plait.diagrams.composite import (
    connected_sum,
    decompose,
    decomposing_circles,
    jones_product,
    pd_connected_sum,
    split_pd,
)
from plait.diagrams.pd import plat_to_pd, validate_pd
from plait.diagrams.pdjones import pd_jones, plat_jones
from plait.errors import InputError
from plait.scoring.jones import jones
from plait.word import ClosedBraid, PlatWord


def _pd(name: str):
    return validate_pd(knot(name).pd)


def _braid_plat(name: str) -> PlatWord:
    return ClosedBraid.from_word(knot(name).braid).to_plat()


def _key(v: dict) -> tuple:
    return tuple(sorted(v.items()))


def test_prime_knots_are_never_split():
    # KnotInfo's knots are prime, so no circle in any of their diagrams has two knotted
    # sides: on the table's PD codes, on the plats of the braid notations, and on those
    # plats with three twists of the first cap (a circle around the twisted cap has an
    # unknotted side with 3 crossings, which confirmation must reject)
    # source: KnotInfo via database-knotinfo (pd_notation, braid_notation; all prime)
    rejected = 0
    for k in knots(10):
        pd = validate_pd(k.pd)
        assert decompose(pd) == [pd], k.name
        p = ClosedBraid.from_word(k.braid).to_plat()
        twisted = plat_to_pd(p.with_word((1, 1, 1) + p.word))
        assert decomposing_circles(twisted), k.name
        assert decompose(twisted) == [twisted], k.name
        rejected += 1
    assert rejected == 249


@pytest.mark.parametrize("names", [("3_1", "3_1"), ("3_1", "4_1"), ("8_17", "5_2"),
                                   ("3_1", "3_1", "3_1"), ("4_1", "6_2", "7_4")])
def test_sums_of_table_knots_split_into_their_factors(names):
    # the factors found are the knots summed, with their chirality: each factor's Jones
    # polynomial is KnotInfo's, and the product is the sum's (Jones is multiplicative
    # under connected sum: Jones 1987)
    # source: KnotInfo via database-knotinfo (pd_notation, jones_polynomial)
    pd = _pd(names[0])
    for n in names[1:]:
        pd = pd_connected_sum(pd, _pd(n))
    assert pd_jones(pd) == jones_product([knot(n).jones for n in names])
    fs = decompose(pd)
    assert len(fs) == len(names)
    assert sorted(_key(pd_jones(f)) for f in fs) == sorted(_key(knot(n).jones) for n in names)
    assert sum(f.length for f in fs) == pd.length


def test_split_pd_refuses_edges_that_do_not_cut():
    # two edges of a prime diagram bound no common pair of faces (common practice)
    pd = _pd("4_1")
    with pytest.raises(InputError):
        split_pd(pd, 1, 2)
    with pytest.raises(InputError):
        split_pd(pd, 1, 99)


@pytest.mark.parametrize("names", [("3_1", "4_1"), ("8_19", "3_1"), ("8_17", "8_17"),
                                   ("5_2", "6_1", "10_132")])
def test_connected_sum_plat(names):
    # the plat of a sum has b1 + ... + bk - (k - 1) bridges (Schubert 1954) and the
    # product of the factors' Jones polynomials (Jones 1987)
    # source: KnotInfo via database-knotinfo (braid_notation, jones_polynomial)
    plats = [_braid_plat(n) for n in names]
    s = connected_sum(plats)
    assert s.bridges == sum(p.bridges for p in plats) - (len(plats) - 1)
    assert jones(s) == jones_product([knot(n).jones for n in names])
    assert s.components == 1


@st.composite
def _knot_plats(draw):
    n = draw(st.integers(1, 3))
    word = draw(st.lists(st.integers(1, 2 * n - 1).flatmap(
        lambda g: st.sampled_from((g, -g))), max_size=8))
    p = PlatWord(2 * n, tuple(word))
    return p


@settings(max_examples=60, deadline=None)
@given(st.lists(_knot_plats(), min_size=1, max_size=3))
def test_connected_sum_laws(plats):
    # law: the Jones polynomial of a connected sum is the product of the factors' (for
    # links, with the orientations the plats give; Jones 1987); bridges add minus one
    # per join; components add minus one per join (common practice)
    s = connected_sum(plats)
    assert s.bridges == sum(p.bridges for p in plats) - (len(plats) - 1)
    assert s.components == sum(p.components for p in plats) - (len(plats) - 1)
    if all(p.components == 1 for p in plats):
        assert jones(s) == jones_product([jones(p) for p in plats])


def test_issue_example_three_bridge_plus_two_bridge(tmp_path):
    # 8_17 has bridge index 3 and 8_11 bridge index 2, so the sum is 4-bridge
    # (Schubert 1954). The sum's own invariants prove only b >= 3; the factors, each
    # certified, give b >= 3 + 2 - 1 = 4.
    # source: KnotInfo via database-knotinfo (pd_notation, bridge_index)
    pd = pd_connected_sum(_pd("8_17"), _pd("8_11"))
    r = bridge_report(pd, steps=0, run_dir=tmp_path / "r", handle_signals=False)
    assert r.lower == r.upper == 4
    assert r.search["bridge_bounds"]["lower"] == 3
    assert any("Schubert 1954" in x and "b ≥ 3 + 2 − 1 = 4" in x for x in r.lower_reasons)
    assert [f.upper for f in r.factors] == [3, 2] and all(f.certified for f in r.factors)
    assert plat_jones(r.result) == jones_product([knot("8_17").jones, knot("8_11").jones])


def test_plat_input_sum_of_three_trefoils(tmp_path, capsys):
    # 3_1 # 3_1 # 3_1 given as a plat: b = 2 + 2 + 2 - 2 = 4 (Schubert 1954), and the text
    # report lists the three factors, each certified 2-bridge
    # source: KnotInfo via database-knotinfo (braid_notation of 3_1, bridge_index 2)
    p = connected_sum([_braid_plat("3_1")] * 3)
    code = main(["bridge", "--plat", str(p), "--steps", "0", "--quiet",
                 "--run-dir", str(tmp_path / "r")])
    out, _ = capsys.readouterr()
    assert code == 0
    assert out.splitlines()[0] == "bridge number = 4 (certified)"
    assert sum(line.startswith("factor ") for line in out.splitlines()) == 3
    assert "factor 3: b = 2 (certified)" in out


def test_cli_json_factors(tmp_path, capsys):
    # the factors list of plait bridge --json: a sum of 8_19 (3-bridge) and the figure
    # eight (2-bridge) is 4-bridge (Schubert 1954)
    # source: KnotInfo via database-knotinfo (pd_notation, bridge_index, jones_polynomial)
    pd = pd_connected_sum(_pd("8_19"), _pd("4_1"))
    code = main(["bridge", "--pd", str(pd), "--steps", "0", "--json",
                 "--run-dir", str(tmp_path / "r")])
    out, _ = capsys.readouterr()
    assert code == 0
    obj = json.loads(out)
    assert obj["bridge_bounds"]["upper"] == 4 and obj["bridge_bounds"]["lower"] == 4
    fac = obj["factors"]
    assert len(fac) == 2
    for f, name in zip(fac, ("8_19", "4_1"), strict=True):
        assert set(f) >= {"pd", "strands", "word", "lower", "upper", "certified", "reasons"}
        assert f["upper"] == f["lower"] == knot(name).bridge_index and f["certified"]
        assert pd_jones(validate_pd(f["pd"])) == knot(name).jones
        assert jones(PlatWord(f["strands"], tuple(f["word"]))) == knot(name).jones


def test_unknotted_side_is_not_a_factor():
    # a trefoil summed with a 3-crossing diagram of the unknot: the circle is there, but
    # the unknotted side has Jones polynomial 1, so no decomposition is claimed
    # (b(K # unknot) = b(K); Schubert 1954)
    # source: KnotInfo via database-knotinfo (pd_notation of 3_1)
    unknot = plat_to_pd(PlatWord(2, (1, 1, 1)))
    assert pd_jones(unknot) == {Fraction(0): 1}
    pd = pd_connected_sum(_pd("3_1"), unknot)
    assert decomposing_circles(pd)
    assert decompose(pd) == [pd]


def test_visited_diagrams_are_the_knot(tmp_path):
    # every sampled plat along the search's certificate is a diagram of the same knot
    # (Birman 1976: the moves keep the plat closure); the scrambled sum is split in them
    # source: KnotInfo via database-knotinfo (braid_notation, jones_polynomial)
    import plait.moves as moves
    from plait.diagrams.composite import visited_diagrams
    from plait.search import reduce

    p = connected_sum([_braid_plat("3_1"), _braid_plat("4_1")])
    scr, _ = moves.scramble(p, seed=3, length_factor=3, stabilizations=1)
    r = reduce(scr, steps=60, seed=0, run_dir=tmp_path / "r", handle_signals=False)
    want = jones_product([knot("3_1").jones, knot("4_1").jones])
    seen = list(visited_diagrams(r.certificate))
    assert 1 <= len(seen) <= 12
    for _what, pd in seen:
        assert pd_jones(pd) == want
    assert any(len(decompose(pd)) == 2 for _w, pd in seen)
