"""Bridge lower bounds, signature and meridional quotients, against KnotInfo and theorems."""

from __future__ import annotations

from functools import cache

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from kidata import knot, knots

from plait.scoring import alexander, fox_coloring_dimension, jones
from plait.scoring.bounds import LowerBound, bridge_lower_bound, not_two_bridge
from plait.scoring.quotients import (
    TARGETS,
    count_homomorphisms,
    meridional_rank_witness,
    target,
)
from plait.scoring.signature import goeritz_matrix, signature, symmetric_inertia
from plait.word import ClosedBraid, PlatWord


def _plat(name: str) -> PlatWord:
    return ClosedBraid.from_word(knot(name).braid).to_plat()


@cache
def _knotinfo_signature() -> dict[str, int]:
    # source: KnotInfo via database-knotinfo (field signature; KnotInfo's convention: the
    # positive trefoil, closure of the braid 1 1 1, has signature -2)
    from database_knotinfo import link_list

    out = {}
    for row in link_list():
        try:
            out[row["name"]] = int(row["signature"])
        except (TypeError, ValueError):
            pass
    return out


# -- signature -------------------------------------------------------------------------


def test_signature_matches_knotinfo():
    # source: KnotInfo via database-knotinfo: all 249 knots of 3 to 10 crossings, plats
    # from KnotInfo's braid notation (same chirality as the table)
    sig = _knotinfo_signature()
    rows = knots(10)
    assert len(rows) == 249
    wrong = [r.name for r in rows
             if signature(ClosedBraid.from_word(r.braid).to_plat()) != sig[r.name]]
    assert wrong == []


def test_signature_of_torus_knots_and_hopf_link():
    # from memory / Murasugi 1965: sigma(T(2,q)) = -(q-1) for the positive torus knot in
    # KnotInfo's convention; the positive Hopf link has signature -1 (common practice)
    for q in (3, 5, 7, 9):
        assert signature(ClosedBraid.from_word([1] * q).to_plat()) == -(q - 1)
    assert signature(ClosedBraid.from_word([1, 1]).to_plat()) == -1


@settings(max_examples=30, deadline=None)
@given(st.sampled_from([r.name for r in knots(8)]))
def test_signature_of_mirror_is_negated(name):
    # Gordon-Litherland 1978 / common practice: sigma(mirror K) = -sigma(K)
    p = _plat(name)
    assert signature(p.mirror()) == -signature(p)


@given(st.lists(st.lists(st.integers(-3, 3), min_size=4, max_size=4), min_size=4,
                max_size=4))
def test_inertia_law(rows):
    # Sylvester 1852: inertia of M and of P M P^T agree for invertible P; here M = A + A^T
    # and P is an elementary matrix (add row 0 to row 1)
    m = [[rows[i][j] + rows[j][i] for j in range(4)] for i in range(4)]
    p = [[1 if i == j else 0 for j in range(4)] for i in range(4)]
    p[1][0] = 1
    pm = [[sum(p[i][k] * m[k][j] for k in range(4)) for j in range(4)] for i in range(4)]
    pmp = [[sum(pm[i][k] * p[j][k] for k in range(4)) for j in range(4)] for i in range(4)]
    assert symmetric_inertia(m) == symmetric_inertia(pmp)
    pos, neg, zero = symmetric_inertia(m)
    assert pos + neg + zero == 4


def test_goeritz_determinant_is_knot_determinant():
    # Goeritz 1933 / common practice: |det G| is the determinant of the knot
    # (source of the determinants: KnotInfo via database-knotinfo)
    from fractions import Fraction

    def det(m):
        a = [[Fraction(x) for x in row] for row in m]
        n, d = len(a), Fraction(1)
        for i in range(n):
            piv = next((r for r in range(i, n) if a[r][i]), None)
            if piv is None:
                return 0
            if piv != i:
                a[i], a[piv] = a[piv], a[i]
                d = -d
            d *= a[i][i]
            for r in range(i + 1, n):
                f = a[r][i] / a[i][i]
                for c in range(i, n):
                    a[r][c] -= f * a[i][c]
        return d

    for r in knots(8):
        g = goeritz_matrix(ClosedBraid.from_word(r.braid).to_plat())
        assert abs(det(g)) == r.determinant, r.name


# -- meridional quotients ------------------------------------------------------------------


def test_s3_quotients_are_fox_colorings():
    # Fox 1962: homomorphisms onto S_3 = D_3 with meridians to transpositions are the Fox
    # 3-colorings, 3^dim of them (trivial colorings included)
    for r in knots(9):
        p = ClosedBraid.from_word(r.braid).to_plat()
        assert count_homomorphisms(p, "S3/transposition") == 3 ** fox_coloring_dimension(p, 3)


def test_trefoil_quotient_counts():
    # from memory, by hand: the trefoil has 6 nontrivial 3-colorings; homomorphisms onto
    # S_4 with transpositions = 6 trivial + 4 choices of 3 points x 6 = 30; onto S_5:
    # 10 + 10 x 6 = 70
    p = _plat("3_1")
    assert count_homomorphisms(p, "S4/transposition") == 30
    assert count_homomorphisms(p, "S5/transposition") == 70


def _braid_variants(word):
    # a cyclic rotation (conjugation) and a Markov stabilization: the same closed braid
    # link (Markov 1935)
    m = max(abs(g) for g in word) + 1
    rotated = list(word[1:]) + [word[0]]
    return ClosedBraid.from_word(rotated + [m]).to_plat()


# Hilden 1975 (field notes): local generators of the pairing subgroup; multiplying the
# word by one on either side does not change the plat closure
def _pairing_generators(n2: int) -> list[tuple[int, ...]]:
    out = []
    for i in range(1, n2 // 2 + 1):
        out.append((2 * i - 1,))
        if 2 * i + 1 < n2:
            out.append((2 * i, 2 * i - 1, 2 * i + 1, 2 * i))
            out.append((2 * i, 2 * i - 1, 2 * i - 1, 2 * i))
            out.append((2 * i, 2 * i + 1, 2 * i + 1, 2 * i))
    return out


@settings(max_examples=25, deadline=None)
@given(st.sampled_from([r.name for r in knots(9)]), st.data())
def test_quotients_and_signature_are_invariant(name, data):
    # law: link invariants do not change under the pairing subgroup (Hilden 1975) nor
    # under conjugation and Markov stabilization of the closed braid (Markov 1935)
    p = _plat(name)
    gens = _pairing_generators(p.strands)
    left = data.draw(st.sampled_from(gens))
    right = data.draw(st.sampled_from(gens))
    sign = data.draw(st.sampled_from([1, -1]))
    q = p.with_word(tuple(sign * g for g in left) + p.word + right)
    r = _braid_variants(knot(name).braid)
    names = ["S4/transposition", "A4/3-cycle", "A5/3-cycle", "S5/4-cycle", "GL3(2)/order-7"]
    for other in (q, r):
        assert signature(other) == signature(p)
        for t in names:
            assert count_homomorphisms(other, t) == count_homomorphisms(p, t), t


def test_targets_are_conjugacy_classes():
    # common practice: group orders and class sizes (S_4: 24, 6 transpositions; A_5: 60,
    # 20 3-cycles, two classes of 12 5-cycles; B_3: 48 with 3 + 6 reflections; GL(3,2):
    # 168 with 56 elements of order 3, 42 of order 4, two classes of 24 of order 7)
    sizes = {"S4/transposition": (24, 6), "A5/3-cycle": (60, 20), "A5/5-cycle": (60, 12),
             "B3/short": (48, 3), "B3/long": (48, 6), "GL3(2)/order-3": (168, 56),
             "GL3(2)/order-4": (168, 42), "GL3(2)/order-7": (168, 24)}
    for name, (g, c) in sizes.items():
        t = target(name)
        assert (len(t.group), len(t.klass)) == (g, c), name
    assert all(target(n).klass for n in TARGETS)


# -- the lower-bound report -----------------------------------------------------------


@cache
def _bounds_to_10() -> dict[str, tuple[int | None, LowerBound]]:
    return {r.name: (r.bridge_index, bridge_lower_bound(ClosedBraid.from_word(r.braid).to_plat()))
            for r in knots(10)}


def test_bridge_three_proved_up_to_ten_crossings():
    # source: KnotInfo via database-knotinfo (bridge_index): every knot of bridge index 3
    # up to 10 crossings gets b >= 3 (154 knots); none is left
    res = _bounds_to_10()
    three = [n for n, (b, _) in res.items() if b == 3]
    assert len(three) == 154
    left = [n for n in three if res[n][1].value < 3]
    assert left == []


def test_bound_never_exceeds_bridge_index():
    # source: KnotInfo via database-knotinfo: the bound is a theorem, so it never exceeds
    # the table's bridge index; in particular b >= 3 is never claimed for the 95 2-bridge
    # knots, and for those the bound is exactly 2 (they are knotted)
    res = _bounds_to_10()
    assert [n for n, (b, lb) in res.items() if lb.value > b] == []
    two = [lb.value for b, lb in res.values() if b == 2]
    assert len(two) == 95 and set(two) == {2}


def test_methods_are_reported():
    # each report names the method that proved its value and gives reasons as strings
    res = _bounds_to_10()
    methods = {lb.method for _, lb in res.values()}
    assert {"fox", "not-2-bridge"} <= methods
    for _, lb in res.values():
        assert lb.reasons and all(isinstance(s, str) and s for s in lb.reasons)
        assert any(f"b ≥ {lb.value}" in s for s in lb.reasons)


@pytest.mark.parametrize("name,twin", [("10_132", "5_1"), ("10_56", "10_25"),
                                       ("10_129", "8_8")])
def test_jones_and_alexander_are_not_enough(name, twin):
    # source: KnotInfo via database-knotinfo: each pair shares Jones and Alexander
    # polynomials (up to mirror and units), the first has bridge index 3, the second is
    # 2-bridge; the proof of b >= 3 must use another invariant
    a, b = knot(name), knot(twin)
    assert a.bridge_index == 3 and b.bridge_index == 2
    pa, pb = _plat(name), _plat(twin)
    ja, jb = jones(pa), jones(pb)
    assert ja in (jb, {-e: c for e, c in jb.items()})
    assert alexander(pa) == alexander(pb)
    proved, why = not_two_bridge(pa)
    assert proved, why
    twin_word = "S(" + str(b.determinant)
    assert twin_word in why
    assert not not_two_bridge(pb)[0]


def test_bridge_four_by_transpositions():
    # source: KnotInfo via database-knotinfo: 11n_71 has bridge index 4 and determinant
    # 63; Fox colorings only give b >= 3 there, a homomorphism onto S_5 with meridians to
    # transpositions moving all 5 points needs 4 meridians (Boileau-Zieschang 1985)
    row = knot("11n_71")
    assert row.bridge_index == 4
    p = _plat("11n_71")
    assert max(fox_coloring_dimension(p, q) for q in (3, 7)) <= 3
    lb = bridge_lower_bound(p)
    assert lb.value == 4 and lb.method == "meridional-rank"
    assert lb.exact == (p.bridges == 4)


def test_knot_with_determinant_one():
    # Schubert 1954: b(T(3,5)) = 3; KnotInfo 10_124 = T(3,5) has determinant 1
    # (source: KnotInfo via database-knotinfo). It is not alternating: its Alexander
    # polynomial does not alternate in sign (Crowell 1959, Murasugi 1958), so it is not
    # 2-bridge without listing any candidate
    row = knot("10_124")
    assert row.determinant == 1
    lb = bridge_lower_bound(_plat("10_124"))
    assert lb.value == 3 and lb.method == "not-2-bridge"
    assert "Crowell 1959" in " ".join(lb.reasons)


def test_connected_sums():
    # Schubert 1954: b(K1 # K2) = b(K1) + b(K2) - 1, so 3_1 # 3_1 and 3_1 # 4_1 have
    # b = 3. The braid of a connected sum: the second braid shifted to share the last
    # strand of the first (common practice)
    granny = ClosedBraid.from_word([1, 1, 1, 2, 2, 2]).to_plat()
    assert bridge_lower_bound(granny).value == 3
    with_eight = ClosedBraid.from_word([1, 1, 1, 2, -3, 2, -3]).to_plat()
    assert bridge_lower_bound(with_eight).value == 3
    # det 15: H_1 of the double branched cover is cyclic, so Fox colorings give only
    # b >= 2; the classification of 2-bridge knots proves b >= 3 on its own
    assert max(fox_coloring_dimension(with_eight, p) for p in (3, 5)) == 2
    assert not_two_bridge(with_eight)[0]


def test_unknot_and_links():
    # Schubert 1954: b = 1 only for the unknot; a 1-bridge plat is the unknot
    lb = bridge_lower_bound(PlatWord(2, ()))
    assert lb.value == 1 and lb.exact
    # an unknot drawn with 2 bridges: invariants cannot prove it knotted, the bound stays 1
    lb = bridge_lower_bound(PlatWord(4, (2,)))
    assert lb.value == 1 and not lb.exact
    assert "cannot prove" in " ".join(lb.reasons)
    # common practice: a link of c components has b >= c; the Hopf link has b = 2
    hopf = ClosedBraid.from_word([1, 1]).to_plat()
    assert bridge_lower_bound(hopf).value == 2
    three = ClosedBraid.from_word([1, 1, 2, 2]).to_plat()  # a 3-component chain
    assert three.components == 3
    assert bridge_lower_bound(three).value >= 3


def test_meridional_rank_witness_is_sound():
    # Boileau-Zieschang 1985: a witness proves b >= 3, so none may exist for the 2-bridge
    # knots (source of the bridge indices: KnotInfo via database-knotinfo); and the
    # S_4 witness exists for a knot with a transitive transposition image on 4 points
    found = 0
    for r in knots(9):
        p = ClosedBraid.from_word(r.braid).to_plat()
        for name in ("S4/transposition", "B3/short", "A4/3-cycle"):
            w = meridional_rank_witness(p, name, 200_000)
            if r.bridge_index == 2:
                assert w is None, (r.name, name)
            elif w is not None:
                assert w[0] <= r.bridge_index
                found += 1
    assert found > 0


def _two_bridge_link_classes(n: int) -> set[tuple[int, int]]:
    # Conway 1970: a rational link is the closure of the rational tangle of a continued
    # fraction [a1, ..., am] with positive terms, an alternating diagram with a1 + ... + am
    # crossings that is minimal (Kauffman, Murasugi, Thistlethwaite 1987); S(p,q) up to
    # q -> q^-1 and mirror (Schubert 1956). Here: the 2-component ones (p even), n crossings.
    from fractions import Fraction

    def compositions(k):
        if k == 0:
            yield ()
            return
        for a in range(1, k + 1):
            for rest in compositions(k - a):
                yield (a, *rest)

    out = set()
    for cf in compositions(n):
        if cf[-1] < 2:
            continue  # [..., a, 1] = [..., a + 1]
        x = Fraction(cf[-1])
        for a in reversed(cf[:-1]):
            x = a + 1 / x
        p, q = x.numerator, x.denominator % x.numerator
        if p % 2 == 0:
            qs = [q, pow(q, -1, p), -q % p, pow(-q % p, -1, p)]
            out.add((p, min(qs)))
    return out


def test_two_component_links_against_linkinfo():
    # source: LinkInfo via database-knotinfo (2-component links up to 7 crossings, braid
    # notation, signature); the number of 2-bridge link types per crossing number comes
    # from Conway's enumeration above. Every link that is not 2-bridge gets b >= 3, every
    # 2-bridge one is left at 2, and the signature agrees with the table.
    import re

    from database_knotinfo import link_list

    from plait.scoring import determinant

    kept: dict[int, set[tuple[str, int]]] = {}
    for row in link_list(proper_links=True)[1:]:
        if row["components"] != "2" or int(row["crossing_number"]) > 7:
            continue
        m = re.fullmatch(r"\{(\d+),\{(.*)\}\}", row["braid_notation"].replace(" ", ""))
        word = tuple(int(x) for x in m.group(2).split(","))
        plat = ClosedBraid(int(m.group(1)), word).to_plat()
        assert signature(plat) == int(row["signature"]), row["name"]
        proved, why = not_two_bridge(plat)
        if not proved:
            kept.setdefault(int(row["crossing_number"]), set()).add(
                (row["name"].split("{")[0], determinant(plat)))
    for n in range(2, 8):
        dets = sorted(d for _, d in kept.get(n, ()))
        assert dets == sorted(p for p, _ in _two_bridge_link_classes(n)), n


@settings(max_examples=40, deadline=None)
@given(st.lists(st.sampled_from([1, -1, 2, -2, 3, -3]), min_size=1, max_size=12),
       st.sampled_from([1, -1]), st.data())
def test_bound_sound_on_scrambled_two_bridge_plats(word, e, data):
    # law: every 4-plat closes to a link with b <= 2, and a stabilization (Birman 1976:
    # b -> b sigma_4^(+-1) on 6 strands) and pairing-subgroup multiplications on both
    # sides (Hilden 1975) keep the link; the bound may never exceed 2 on the result
    four = PlatWord(4, tuple(g for g in word if abs(g) < 4))
    six = PlatWord(6, four.word + (4 * e,))
    gens = _pairing_generators(6)
    left = data.draw(st.lists(st.sampled_from(gens), max_size=2))
    right = data.draw(st.lists(st.sampled_from(gens), max_size=2))
    flip = data.draw(st.sampled_from([1, -1]))
    scrambled = six.with_word(tuple(flip * g for w in left for g in w) + six.word
                              + tuple(g for w in right for g in w))
    assert bridge_lower_bound(scrambled).value <= 2


def _count_by_caps(plat: PlatWord, name: str) -> int:
    # Test oracle, a different algorithm: try every labelling of the caps (the generators
    # of the bridge presentation), push the labels down the word by Wirtinger's relation
    # and keep those whose two ends agree at every cup (Fox 1962).
    from itertools import product

    from plait.diagrams.pd import trace_plat

    t = target(name)
    word = plat.word

    def mul(a, b):
        return tuple(a[i] for i in b)

    def inv(a):
        out = [0] * len(a)
        for i, x in enumerate(a):
            out[x] = i
        return tuple(out)

    over_dir = [0] * len(word)
    for path in trace_plat(plat):
        for j, d, p, q in path:
            k = abs(word[j])
            top = p if d == 1 else q
            if top == (k + 1 if word[j] > 0 else k):
                over_dir[j] = d
    total = 0
    for caps in product(t.klass, repeat=plat.bridges):
        lab = [c for c in caps for _ in (0, 1)]
        for j, g in enumerate(word):
            k = abs(g) - 1
            # the under strand crosses from the right of the over strand to its left
            # going down exactly when sign(letter) * direction(over) = +1: b -> a b a^-1
            s = (1 if g > 0 else -1) * over_dir[j]
            if g > 0:
                a, b = lab[k + 1], lab[k]
                lab[k] = a
                lab[k + 1] = mul(mul(a, b), inv(a)) if s > 0 else mul(mul(inv(a), b), a)
            else:
                a, b = lab[k], lab[k + 1]
                lab[k + 1] = a
                lab[k] = mul(mul(a, b), inv(a)) if s > 0 else mul(mul(inv(a), b), a)
        if all(lab[2 * i] == lab[2 * i + 1] for i in range(plat.bridges)):
            total += 1
    return total


@pytest.mark.parametrize("name", ["S4/transposition", "A4/3-cycle", "B3/short",
                                  "GL3(2)/order-7"])
def test_counts_match_cap_oracle(name):
    # the arc-propagation search with conjugation symmetry against the plain count over
    # cap labels, on the knots to 7 crossings with at most 3 bridges, their mirrors, and
    # a 2-component link (source of the braids: KnotInfo via database-knotinfo)
    plats = [ClosedBraid.from_word(r.braid).to_plat() for r in knots(7)]
    plats = [p for p in plats if p.bridges <= 3]
    plats += [p.mirror() for p in plats] + [ClosedBraid.from_word([1, 1, 2, -1, 2]).to_plat()]
    for p in plats:
        assert count_homomorphisms(p, name) == _count_by_caps(p, name), p
