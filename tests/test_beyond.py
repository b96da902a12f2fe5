"""Bounds beyond the tables: listing-free not-2-bridge tests, double branched covers, families."""

from __future__ import annotations

import json
import random
from functools import cache
from math import gcd, prod

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from kidata import knots, parse_laurent

from plait.errors import InputError
from plait.scoring.alternating import alexander_obstruction, jones_obstruction
from plait.scoring.bounds import _listing_free_obstruction, bridge_lower_bound, not_two_bridge
from plait.scoring.goeritz import (
    double_cover_homology,
    jacobi,
    linking_form_class,
    odd_prime_divisors,
    smith_invariants,
    square_class,
)
from plait.scoring.signature import goeritz_matrix
from plait.scoring.twobridge import two_bridge_classes, two_bridge_plat
from plait.search.families import (
    connected_sum_braid,
    scrambled_two_bridge,
    torus_braid,
    twisted_plat,
)
from plait.word import ClosedBraid, PlatWord


@cache
def two_bridge_rows() -> tuple:
    """KnotInfo knots of bridge index 2 up to 13 crossings: (name, braid, Jones, Alexander,
    determinant, [p, q]). Read directly (only these rows are parsed)."""
    from database_knotinfo import link_list

    out = []
    for k in link_list():
        if k.get("bridge_index") != "2" or not k.get("crossing_number"):
            continue
        braid = json.loads(k["braid_notation"])
        if braid and isinstance(braid[0], list):
            braid = braid[0]
        pq = json.loads(k["two_bridge_notation"]) if k["two_bridge_notation"] else None
        out.append((k["name"], tuple(braid), parse_laurent(k["jones_polynomial"]),
                    parse_laurent(k["alexander_polynomial"]), int(k["determinant"]), pq))
    return tuple(out)


def test_two_bridge_rows_cover_thirteen_crossings():
    rows = two_bridge_rows()
    # source: KnotInfo via database-knotinfo (714 knots of bridge index 2 up to 13 crossings)
    assert len(rows) == 714
    assert sum(1 for r in rows if r[0].startswith("13")) == 352


def test_polynomial_obstructions_never_fire_on_two_bridge_knots():
    # source: KnotInfo via database-knotinfo; a 2-bridge knot is alternating (Schubert 1956)
    for name, _braid, V, A, det, _pq in two_bridge_rows():
        assert jones_obstruction(V, det) is None, name
        assert alexander_obstruction(A) is None, name


def test_double_cover_cyclic_and_linking_form_keep_two_bridge_knots():
    # source: KnotInfo via database-knotinfo (braid notation, two_bridge_notation); the
    # double branched cover of S(p,q) is L(p,q) (Schubert 1956), linking form q/p
    # (Seifert 1933)
    for name, braid, _V, _A, det, pq in two_bridge_rows():
        plat = ClosedBraid.from_word(braid).to_plat()
        h = double_cover_homology(plat)
        assert h == (det,), name
        primes = odd_prime_divisors(det)
        assert linking_form_class(plat, det, primes) == square_class(pq[1], det, primes), name


def test_not_two_bridge_never_claimed_on_a_sample_up_to_thirteen():
    # source: KnotInfo via database-knotinfo; the full method, candidates included, on
    # every 50th 2-bridge knot (the cheap parts run on all of them above)
    for name, braid, _V, _A, det, _pq in two_bridge_rows()[::50]:
        plat = ClosedBraid.from_word(braid).to_plat()
        assert _listing_free_obstruction(plat, det) is None, name
        proved, why = not_two_bridge(plat)
        assert not proved, (name, why)


def test_polynomial_obstructions_find_non_alternating_knots():
    # source: KnotInfo via database-knotinfo: 8_19 = T(3,4) and 10_124 = T(3,5) are not
    # alternating, and their Alexander polynomials break the alternation
    for r in knots(10, 8):
        if r.name in ("8_19", "10_124"):
            assert alexander_obstruction(r.alexander) is not None, r.name


def test_smith_form_of_coloring_matrix_against_knotinfo_and_goeritz():
    # source: KnotInfo via database-knotinfo (determinant); the coloring group is
    # H_1(double branched cover) + Z (Przytycki 1998), presented also by the Goeritz matrix
    # (Gordon–Litherland 1978)
    for r in knots(10):
        plat = ClosedBraid.from_word(r.braid).to_plat()
        h = double_cover_homology(plat)
        assert prod(h) == r.determinant, r.name
        assert tuple(d for d in smith_invariants(goeritz_matrix(plat)) if d != 1) == h, r.name
    # source: KnotInfo via database-knotinfo: 9_41 has H_1 = Z/7 + Z/7 (determinant 49,
    # Fox 7-colorings of dimension 3)
    r = next(k for k in knots(9, 9) if k.name == "9_41")
    assert double_cover_homology(ClosedBraid.from_word(r.braid).to_plat()) == (7, 7)


def test_smith_invariants_small_cases():
    # common practice: diag(2, 3) ~ diag(1, 6); a zero matrix has zero factors
    assert smith_invariants([[2, 0], [0, 3]]) == [1, 6]
    assert smith_invariants([[0, 0], [0, 0]]) == [0, 0]
    assert smith_invariants([[2, 4], [6, 8]]) == [2, 4]
    assert smith_invariants([[1, 2, 3]]) == [1]


@pytest.mark.parametrize("n", [3, 5, 7, 9, 15, 21, 45, 1001])
def test_jacobi_symbol_agrees_with_euler_on_primes(n):
    # Euler's criterion (common practice) on the prime factors, multiplied out
    ps = odd_prime_divisors(n)
    for a in range(1, 40):
        if gcd(a, n) != 1:
            continue
        want = 1
        m = n
        for p in ps:
            while m % p == 0:
                m //= p
                e = pow(a, (p - 1) // 2, p)
                want *= 1 if e == 1 else -1
        assert jacobi(a, n) == want


def test_linking_form_of_lens_spaces():
    # Seifert 1933: L(p,q) has linking form q/p up to squares; S(p,q) has double branched
    # cover L(p,q) (Schubert 1956); checked through our own Goeritz matrix
    for p in (5, 7, 9, 15, 25, 33, 45, 105):
        primes = odd_prime_divisors(p)
        for q in two_bridge_classes(p):
            assert linking_form_class(two_bridge_plat(p, q), p, primes) == \
                square_class(q, p, primes)


@settings(max_examples=40, deadline=None)
@given(st.integers(3, 500), st.integers(1, 500))
def test_two_bridge_law(p, q):
    # Schubert 1956: S(p,q) has double branched cover L(p,q), H_1 = Z/p, linking form q/p
    # (Seifert 1933), and is non-split alternating: no listing-free test may fire
    q = q % p
    if gcd(p, q) != 1 or q == 0:
        return
    plat = two_bridge_plat(p, q)
    assert double_cover_homology(plat) == (p,)
    if p % 2 and plat.length <= 120:
        primes = odd_prime_divisors(p)
        assert linking_form_class(plat, p, primes) == square_class(q, p, primes)
    if plat.length <= 60:
        assert _listing_free_obstruction(plat, p) is None


# -- families, small instances against their theorems ------------------------------------

@pytest.mark.parametrize("p,q", [(2, 3), (2, 5), (3, 4), (3, 5), (2, 7)])
def test_torus_knot_bounds(p, q):
    # Schubert 1954: b(T(p,q)) = min(p, q); the bound never exceeds it and reaches it for
    # these (Fox colorings / not 2-bridge)
    plat = torus_braid(p, q).to_plat()
    assert plat.components == 1
    lb = bridge_lower_bound(plat)
    assert lb.value == p, lb.reasons


def test_connected_sums_of_trefoils():
    # Schubert 1954: b(K1 # K2) = b(K1) + b(K2) - 1; the double branched cover of a sum of
    # k trefoils has H_1 = (Z/3)^k, so the bound reaches k + 1
    tref = ClosedBraid.from_word((1, 1, 1))
    for k in (2, 3):
        plat = connected_sum_braid([tref] * k).to_plat()
        assert double_cover_homology(plat) == (3,) * k
        lb = bridge_lower_bound(plat)
        assert lb.value == k + 1, lb.reasons


def test_connected_sum_of_table_knots_is_bounded_by_schubert():
    # Schubert 1954; factors from KnotInfo via database-knotinfo
    rng = random.Random(7)
    table = [r for r in knots(8) if r.bridge_index in (2, 3)]
    for _ in range(4):
        a, b = rng.choice(table), rng.choice(table)
        plat = connected_sum_braid([ClosedBraid.from_word(a.braid),
                                    ClosedBraid.from_word(b.braid)]).to_plat()
        assert plat.components == 1
        assert bridge_lower_bound(plat, 5.0).value <= a.bridge_index + b.bridge_index - 1


@pytest.mark.parametrize("seed", range(3))
def test_scrambled_two_bridge_is_never_claimed_not_two_bridge(seed):
    # Schubert 1956: S(p,q) is 2-bridge, whatever moves hide it (Birman 1976)
    rng = random.Random(seed)
    p = rng.randrange(51, 2001, 2)
    q = next(x for x in range(rng.randrange(1, p), 2 * p) if gcd(p, x % p) == 1) % p
    plat = scrambled_two_bridge(p, q, seed)
    assert plat.bridges >= 3
    proved, why = not_two_bridge(plat)
    assert not proved, why
    assert bridge_lower_bound(plat, 5.0).value == 2


@pytest.mark.parametrize("seed", range(3))
def test_highly_twisted_three_plats_reach_three(seed):
    # Johnson–Moriah, Algebr. Geom. Topol. 16 (2016): b = m for these plats
    plat = twisted_plat(3, random.Random(seed))
    assert plat.bridges == 3 and plat.components == 1
    assert bridge_lower_bound(plat, 5.0).value == 3


def test_highly_twisted_four_plat_bound_at_most_four():
    # Johnson–Moriah 2016: b = 4; no bound may exceed it
    plat = twisted_plat(4, random.Random(1))
    assert 3 <= bridge_lower_bound(plat, 5.0).value <= 4


def test_budget_reports_what_was_not_tried():
    # a tiny budget still computes the cheap bounds and names the skipped methods
    plat = ClosedBraid.from_word((1, 1, 1, -2, -1, -1, -2, -3, 2, -3, -3)).to_plat()  # 10_132
    lb = bridge_lower_bound(plat, 1e-9)
    assert lb.value >= 2
    assert any(r.startswith("not tried:") and "time budget" in r for r in lb.reasons)
    with pytest.raises(InputError):
        bridge_lower_bound(plat, 0)
    with pytest.raises(InputError):
        bridge_lower_bound(plat, float("nan"))


def test_families_refuse_bad_parameters():
    with pytest.raises(InputError):
        twisted_plat(2, random.Random(0))
    with pytest.raises(InputError):
        torus_braid(0, 3)
    with pytest.raises(InputError):
        connected_sum_braid([ClosedBraid.from_word((1, 1))])  # the Hopf link is no knot
    assert isinstance(twisted_plat(3, random.Random(0), rows=3), PlatWord)
