"""PD diagram -> plat: bridges, Jones polynomial and chirality against KnotInfo and theorems."""

from __future__ import annotations

import json
import re
from fractions import Fraction
from math import gcd

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from kidata import knot, knots, parse_laurent

from plait.cli import main
from plait.diagrams.fromdiagram import check_plat, diagram_to_plat, pd_to_plat, tidy
from plait.diagrams.heights import DIRECTIONS, Degenerate, lift, sweep_plat
from plait.diagrams.pd import PDCode, plat_to_pd, validate_pd
from plait.diagrams.pdjones import (
    pd_jones,
    pd_jones_all_orientations,
    plat_jones,
    plat_jones_all_orientations,
)
from plait.diagrams.vogel import pd_to_closed_braid, seifert_circles
from plait.diagrams.wirtinger import occurrence_roles, wirtinger
from plait.errors import GuardViolation, InputError
from plait.word import ClosedBraid, PlatWord


def _mirror(j):
    return {-e: c for e, c in j.items()}


def test_pd_jones_is_knotinfo():
    # the PD bracket with the PD's own orientation reproduces KnotInfo's Jones exactly,
    # and so does the PD export of the plat of KnotInfo's braid
    # source: KnotInfo via database-knotinfo (pd_notation, braid_notation, jones_polynomial)
    for k in knots(8):
        assert pd_jones(validate_pd(k.pd)) == k.jones, k.name
        assert pd_jones(plat_to_pd(ClosedBraid.from_word(k.braid).to_plat())) == k.jones


def test_all_knots_to_10_crossings():
    # Acceptance: for every KnotInfo knot 3..10 crossings, the plat from pd_notation has
    # exactly bridge_index bridges and KnotInfo's Jones polynomial (same chirality, not
    # merely up to mirror).
    # source: KnotInfo via database-knotinfo (pd_notation, bridge_index, jones_polynomial)
    for k in knots(10):
        d = diagram_to_plat(validate_pd(k.pd), time_limit=5.0)
        assert d.plat.bridges == k.bridge_index, k.name
        assert d.wirtinger.proven_minimal
        assert pd_jones(plat_to_pd(d.plat)) == k.jones, k.name
        # words stay short: the construction's budget is 3x the crossing number
        assert d.plat.length <= 4 * k.crossings, k.name


def test_plat_jones_by_scoring_module():
    # cross-check with the plat-side Jones of plait.scoring (Temperley-Lieb states)
    # source: KnotInfo via database-knotinfo (jones_polynomial)
    scoring = pytest.importorskip("plait.scoring")
    for k in knots(7):
        p = pd_to_plat(validate_pd(k.pd))
        v = scoring.jones(p)
        assert {Fraction(e): c for e, c in dict(v).items()} == k.jones, k.name


def _linkinfo(max_crossings: int):
    from database_knotinfo import link_list

    def jones(text):
        # LinkInfo writes the Jones polynomial in x = t^(1/2), with terms like 2/x^5
        text = re.sub(r"(\d*)/x\^(\d+)", lambda m: (m[1] or "1") + "*x^(-" + m[2] + ")", text)
        text = re.sub(r"(\d*)/x(?![\^\d])", lambda m: (m[1] or "1") + "*x^(-1)", text)
        return {e / 2: c for e, c in parse_laurent(text, "x").items()}

    for r in link_list(proper_links=True)[1:]:
        if int(r["crossing_number"]) <= max_crossings:
            pd = json.loads(r["pd_notation_vector"].replace("{", "[").replace("}", "]"))
            yield r["name"], int(r["components"]), validate_pd(pd), jones(r["jones_polynomial"])


def test_links():
    # components >= 1, bridges >= components, and the plat's Jones is LinkInfo's Jones for
    # some orientation of the plat's components (the plat orients each component from its
    # first cap, LinkInfo fixes one orientation)
    # source: LinkInfo via database-knotinfo (pd_notation_vector, components, jones_polynomial)
    seen = 0
    for name, comps, pd, jones in _linkinfo(7):
        assert pd_jones(pd) == jones, name
        d = diagram_to_plat(pd, time_limit=5.0)
        assert d.plat.components == comps >= 1
        assert d.plat.bridges == d.wirtinger.number >= comps, name
        assert jones in pd_jones_all_orientations(plat_to_pd(d.plat)), name
        seen += 1
    assert seen >= 40


def test_torus_knots():
    # Schubert 1954: b(T(p, q)) = min(p, q). The closed p-braid (sigma_1..sigma_{p-1})^q
    # gives a p-bridge plat; its diagram read back through the Wirtinger route gives at
    # most p bridges, and exactly p when the solver proves its seed set minimal.
    for p in range(2, 8):
        for q in range(p + 1, 8):
            if gcd(p, q) != 1:
                continue
            plat = ClosedBraid(p, tuple(range(1, p)) * q).to_plat()
            assert plat.bridges == p
            pd = plat_to_pd(plat)
            if pd.length > 60:
                continue  # the larger ones are in bench/fromdiagram.py
            d = diagram_to_plat(pd, time_limit=1.0)
            assert d.plat.bridges <= p
            if d.wirtinger.proven_minimal:
                assert d.plat.bridges == p


def _connected_sum(pd1: PDCode, pd2: PDCode) -> PDCode:
    # band the diagrams together along edge 1 of each: edge 1 of the first now runs into
    # the head crossing of the second's edge 1, and vice versa (planar on the sphere)
    shift = 2 * pd1.length
    pd2 = validate_pd([[x + shift for x in c] for c in pd2.crossings])
    r1, r2 = occurrence_roles(pd1), occurrence_roles(pd2)
    c1 = [list(c) for c in pd1.crossings]
    c2 = [list(c) for c in pd2.crossings]
    j1, s1 = next(o for o, r in r1.items() if r == 1 and pd1.crossings[o[0]][o[1]] == 1)
    j2, s2 = next(o for o, r in r2.items() if r == 1 and pd2.crossings[o[0]][o[1]] == 1 + shift)
    c1[j1][s1], c2[j2][s2] = 1 + shift, 1
    return validate_pd(c1 + c2)


def test_connected_sums():
    # Schubert 1954: b(K1 # K2) = b(K1) + b(K2) - 1; the Jones polynomial is
    # multiplicative under connected sum (common practice). omega of the banded diagram is
    # at least the bridge number (Blair-Kjuchukova-Velazquez-Villanueva 2020) and at most
    # omega(D1) + omega(D2) - 1, so the plat has exactly b1 + b2 - 1 bridges.
    # source: KnotInfo via database-knotinfo (pd_notation, bridge_index, jones_polynomial)
    names = [("3_1", "3_1"), ("3_1", "4_1"), ("5_2", "6_1"), ("8_19", "3_1"), ("8_19", "9_35")]
    for a, b in names:
        ka, kb = knot(a), knot(b)
        pd = _connected_sum(validate_pd(ka.pd), validate_pd(kb.pd))
        d = diagram_to_plat(pd, time_limit=5.0)
        assert d.plat.bridges == ka.bridge_index + kb.bridge_index - 1, (a, b)
        prod: dict = {}
        for e1, v1 in ka.jones.items():
            for e2, v2 in kb.jones.items():
                prod[e1 + e2] = prod.get(e1 + e2, 0) + v1 * v2
        prod = {e: v for e, v in prod.items() if v}
        assert pd_jones(plat_to_pd(d.plat)) == prod, (a, b)


def test_every_generic_direction_gives_the_same_knot():
    # the sweep is exact: every non-degenerate projection of the lift has KnotInfo's Jones
    # source: KnotInfo via database-knotinfo
    for name in ("3_1", "5_2", "7_4", "8_19", "9_42", "10_132"):
        k = knot(name)
        pd = validate_pd(k.pd)
        lf = lift(pd, wirtinger(pd))
        good = 0
        for d in DIRECTIONS:
            try:
                p = sweep_plat(lf, d)
            except Degenerate:
                continue
            good += 1
            assert p.bridges == k.bridge_index
            assert pd_jones(plat_to_pd(p)) == k.jones, (name, d)
        assert good >= len(DIRECTIONS) // 2


def test_degenerate_direction_is_refused():
    # projecting along a grid axis lines up vertices of the integer drawing: the sweep must
    # refuse rather than silently read a different knot (common practice: genericity)
    pd = validate_pd(knot("8_19").pd)
    lf = lift(pd, wirtinger(pd))
    outcomes = []
    for d in ((1, 0), (0, 1), (1, 1), (1, -1)):
        try:
            outcomes.append(pd_jones(plat_to_pd(sweep_plat(lf, d))) == knot("8_19").jones)
        except Degenerate:
            outcomes.append("refused")
    assert all(o is True or o == "refused" for o in outcomes)
    assert "refused" in outcomes


def test_guard_catches_a_mirror():
    # the trefoil is chiral: its mirror plat must be rejected by the guard
    # source: KnotInfo via database-knotinfo (3_1 Jones is not symmetric)
    pd = validate_pd(knot("3_1").pd)
    p = pd_to_plat(pd)
    check_plat(pd, p)
    with pytest.raises(GuardViolation):
        check_plat(pd, p.mirror())
    with pytest.raises(GuardViolation):
        check_plat(pd, PlatWord(4, (2, 2)))  # two components


def test_vogel_route():
    # Vogel 1990: every diagram becomes a closed braid; its plat has the diagram's Jones
    # source: KnotInfo via database-knotinfo (pd_notation, jones_polynomial)
    for k in knots(8):
        d = diagram_to_plat(validate_pd(k.pd), method="vogel")
        assert d.route == "vogel"
        assert pd_jones(plat_to_pd(d.plat)) == k.jones, k.name
        assert d.plat.bridges >= k.bridge_index
        # the closed braid has one strand per Seifert circle of the diagram (Vogel 1990)
        assert d.plat.bridges == len(set(seifert_circles(
            [list(c) for c in k.pd], occurrence_roles(validate_pd(k.pd))).values()))
    # links: the closed braid's plat has LinkInfo's Jones polynomial for some orientation
    # of its components (the plat orients each component from its first cap)
    # source: LinkInfo via database-knotinfo (pd_notation_vector, jones_polynomial)
    for name, _comps, pd, jones in _linkinfo(6):
        braid = pd_to_closed_braid(pd)
        assert plat_jones(braid.to_plat()) in pd_jones_all_orientations(pd), name
        assert jones == pd_jones(pd)


def test_component_that_never_passes_under():
    # a component lying over everything is one closed arc with no ends: it must be a seed
    # and gets its own maximum and minimum (common practice: every component of a link
    # has a maximum, so bridges >= components)
    plat = PlatWord(6, (-2, 2, -5, 5, -4))
    pd = validate_pd(plat_to_pd(plat).crossings)
    w = wirtinger(pd)
    assert any(w.arcs.closed) and all(a in w.seeds for a in range(len(w.arcs)) if w.arcs.closed[a])
    d = diagram_to_plat(pd)
    assert d.plat.components == plat.components == 2
    assert plat.components <= d.plat.bridges <= plat.bridges
    assert _same_jones(plat, d.plat)


def test_unknot_and_bad_method():
    # the empty diagram is the unknot: one bridge, no crossings (Schubert 1954: b = 1)
    assert pd_to_plat(validate_pd([])) == PlatWord(2, ())
    # a one-crossing kink diagram of the unknot (common practice)
    d = diagram_to_plat(validate_pd([[1, 1, 2, 2]]))
    assert d.plat.bridges == 1 and d.plat.components == 1
    with pytest.raises(InputError):
        pd_to_plat(validate_pd([[1, 5, 2, 4], [3, 1, 4, 6], [5, 3, 6, 2]]), method="magic")


def test_cli_show_pd(capsys):
    # plait show --pd: the figure eight's KnotInfo PD becomes a 2-bridge plat
    # source: KnotInfo via database-knotinfo (4_1 bridge_index = 2)
    code = main(["show", "--pd", json.dumps(knot("4_1").pd), "--json"])
    out, _ = capsys.readouterr()
    assert code == 0
    obj = json.loads(out)
    assert obj["bridges"] == 2 and obj["components"] == 1


words = st.integers(1, 3).flatmap(
    lambda n: st.lists(st.integers(1, 2 * n - 1).flatmap(lambda k: st.sampled_from([k, -k])),
                       min_size=0, max_size=16).map(lambda w: PlatWord(2 * n, tuple(w))))


def _same_jones(pa: PlatWord, pb: PlatWord) -> bool:
    # the Jones polynomial of b's own orientation is among those of a's reorientations
    return plat_jones(pb) in plat_jones_all_orientations(pa)


@settings(max_examples=40, deadline=None)
@given(words)
def test_tidy_law(plat):
    # Law: tidy never lengthens and keeps the closure (Hilden 1975: a twist of a cap or cup
    # pair lies in the pairing subgroup; free reduction is braid equality)
    t = tidy(plat)
    assert t.length <= plat.length and t.strands == plat.strands
    assert t.components == plat.components
    assert _same_jones(plat, t)


@settings(max_examples=30, deadline=None)
@given(words)
def test_round_trip_law(plat):
    # Law: plat -> PD -> plat keeps the Jones polynomial (for some orientation) and never
    # needs more bridges than the plat had (its diagram's omega is at most its bridges)
    try:
        pd = plat_to_pd(plat)
    except InputError:
        return
    if pd.length == 0:
        return
    pd = validate_pd(pd.crossings)
    d = diagram_to_plat(pd, time_limit=2.0)
    assert d.plat.bridges <= plat.bridges
    assert d.plat.components == plat.components
    assert _same_jones(plat, d.plat)


def test_short_word_search_keeps_the_knot_and_never_lengthens():
    # Laws of the search for a short word (sweeps > 0) over seed sets and drawings:
    # the same bridges, KnotInfo's Jones polynomial (same chirality), never longer than
    # the solver's coloring read on the given drawing, and never shorter than the
    # crossing number, since a plat's closure is a diagram of the knot.
    # source: KnotInfo via database-knotinfo (pd_notation, bridge_index, jones_polynomial,
    # crossing_number)
    for k in knots(8):
        pd = validate_pd(k.pd)
        plain = diagram_to_plat(pd, time_limit=5.0)
        short = diagram_to_plat(pd, time_limit=5.0, sweeps=300)
        assert short.plat.bridges == plain.plat.bridges == k.bridge_index, k.name
        assert pd_jones(plat_to_pd(short.plat)) == k.jones, k.name
        assert k.crossings <= short.plat.length <= plain.plat.length, k.name
        assert 0 < short.sweeps <= 300 + len(DIRECTIONS)


def test_short_word_search_finds_shorter_words_on_three_bridge_knots():
    # On the 3-bridge knots of 9 and 10 crossings the search over drawings and seed sets
    # gives a shorter total than the solver's coloring alone (the reason it exists), and
    # the choice is deterministic for a seed.
    # source: KnotInfo via database-knotinfo (bridge_index 3)
    rows = [k for k in knots(10, 9) if k.bridge_index == 3][:12]
    plain = sum(diagram_to_plat(validate_pd(k.pd)).plat.length for k in rows)
    short = [diagram_to_plat(validate_pd(k.pd), sweeps=400) for k in rows]
    assert sum(d.plat.length for d in short) < plain
    import plait.diagrams.fromdiagram as fd

    fd._RECENT.clear()  # computed afresh, not taken from the cache of recent conversions
    again = diagram_to_plat(validate_pd(rows[0].pd), sweeps=400)
    assert (again.plat, again.drawn_from) == (short[0].plat, short[0].drawn_from)


def test_short_word_budget_falls_with_diagram_size():
    # A larger diagram reads fewer words (sweeps * 12 / crossings, at least one seed
    # set's 16 directions), and the word still has the torus knot's bridge number.
    # Schubert 1954: the bridge number of the torus knot T(p, q) is min(p, q).
    plat = ClosedBraid(4, (1, 2, 3) * 5).to_plat()  # T(4, 5)
    pd = plat_to_pd(plat)
    assert pd.length > 12
    d = diagram_to_plat(pd, time_limit=2.0, sweeps=800)
    cap = max(len(DIRECTIONS), 800 * 12 // pd.length)
    assert 0 < d.sweeps <= cap + len(DIRECTIONS)
    assert d.plat.bridges == 4
    assert d.plat.length <= diagram_to_plat(pd, time_limit=2.0).plat.length
