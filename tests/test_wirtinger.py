"""Wirtinger number of PD diagrams: CP-SAT against the exhaustive oracle and KnotInfo."""

from __future__ import annotations

import json

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from kidata import knots

from plait.diagrams.pd import pd_components, plat_to_pd, validate_pd
from plait.diagrams.wirtinger import (
    coloring_steps,
    diagram_arcs,
    wirtinger,
    wirtinger_cpsat,
    wirtinger_exhaustive,
)
from plait.errors import InputError
from plait.word import PlatWord


def _valid_sequence(w) -> bool:
    # every step colors an uncolored arc from a colored over-arc and a colored neighbour
    arcs = w.arcs
    colored = set(w.seeds)
    for s in w.steps:
        j = s.crossing
        if s.over != arcs.over[j] or {s.arc, s.source} != {arcs.under_in[j], arcs.under_out[j]}:
            return False
        if s.arc in colored or s.source not in colored or s.over not in colored:
            return False
        colored.add(s.arc)
    return len(colored) == len(arcs) and len(w.steps) == len(arcs) - len(w.seeds)


def test_arcs_of_a_knot():
    # a knot diagram with m crossings has m arcs, each ending at one under-crossing
    # source: common practice (each crossing cuts the under-strand once)
    for k in knots(8):
        arcs = diagram_arcs(validate_pd(k.pd))
        assert len(arcs) == len(k.pd)
        assert sorted(arcs.end) == list(range(len(k.pd)))
        assert sorted(x for a in arcs.arcs for x in a) == list(range(1, 2 * len(k.pd) + 1))


def test_cpsat_matches_exhaustive_up_to_9_crossings():
    # CP-SAT against the exhaustive oracle on every KnotInfo diagram up to 9 crossings
    # source: KnotInfo via database-knotinfo (pd_notation)
    for k in knots(9):
        pd = validate_pd(k.pd)
        a = wirtinger_cpsat(pd, time_limit=5.0)
        b = wirtinger_exhaustive(pd)
        assert a.number == b.number, k.name
        assert a.proven_minimal and b.proven_minimal
        assert _valid_sequence(a) and _valid_sequence(b)


def test_wirtinger_number_is_bridge_index():
    # For KnotInfo's own diagrams omega(D) equals the bridge index up to 10 crossings
    # (field notes, checked by brute force over seed sets; omega(D) >= b(K) by
    # Blair-Kjuchukova-Velazquez-Villanueva 2020).
    # source: KnotInfo via database-knotinfo (bridge_index)
    for k in knots(10, 10):
        w = wirtinger(validate_pd(k.pd), time_limit=5.0)
        assert w.number == k.bridge_index, k.name
        assert w.proven_minimal


def _linkinfo(max_crossings: int):
    from database_knotinfo import link_list

    for r in link_list(proper_links=True)[1:]:
        if int(r["crossing_number"]) <= max_crossings:
            pd = json.loads(r["pd_notation_vector"].replace("{", "[").replace("}", "]"))
            yield r["name"], int(r["components"]), validate_pd(pd)


def test_links_cpsat_matches_exhaustive():
    # every component needs its own seed: omega >= components (the rule never leaves a
    # component); CP-SAT equals the exhaustive oracle on LinkInfo diagrams up to 8 crossings
    # source: LinkInfo via database-knotinfo (pd_notation_vector, components)
    for name, comps, pd in _linkinfo(8):
        a = wirtinger_cpsat(pd, time_limit=5.0)
        b = wirtinger_exhaustive(pd)
        assert a.number == b.number >= comps, name
        assert _valid_sequence(a)


def test_greedy_is_an_upper_bound():
    # common practice: a heuristic seed set is valid and never below the optimum
    for k in knots(8):
        pd = validate_pd(k.pd)
        g = wirtinger(pd, method="greedy")
        assert _valid_sequence(g)
        assert g.number >= wirtinger_exhaustive(pd).number


def test_unknown_method():
    with pytest.raises(InputError):
        wirtinger(validate_pd([[1, 5, 2, 4], [3, 1, 4, 6], [5, 3, 6, 2]]), method="magic")


def test_seed_set_that_fails():
    # a single arc of the trefoil colors nothing (every crossing needs two colored arcs)
    # source: common practice (the trefoil's diagram has Wirtinger number 2)
    pd = validate_pd([[1, 5, 2, 4], [3, 1, 4, 6], [5, 3, 6, 2]])
    arcs = diagram_arcs(pd)
    assert all(coloring_steps(arcs, [a]) is None for a in range(3))
    assert coloring_steps(arcs, [0, 1]) is not None


words = st.integers(1, 3).flatmap(
    lambda n: st.lists(st.integers(1, 2 * n - 1).flatmap(lambda k: st.sampled_from([k, -k])),
                       min_size=1, max_size=14).map(lambda w: PlatWord(2 * n, tuple(w))))


@settings(max_examples=40, deadline=None)
@given(words)
def test_plat_diagram_law(plat):
    # Law: the diagram of an n-bridge plat has Wirtinger number at most n (color the n
    # cap arcs; going down, each crossing's over-strand and incoming under-strand are
    # already colored) and at least its number of components.
    # Blair-Kjuchukova-Ozawa 2021: omega(D) is the perpendicular bridge number of D
    try:
        pd = plat_to_pd(plat)
    except InputError:
        return  # a split crossingless component has no PD code
    if pd.length == 0:
        return
    pd = validate_pd(pd.crossings)
    w = wirtinger_exhaustive(pd) if pd.length <= 10 else wirtinger_cpsat(pd, time_limit=2.0)
    assert len(pd_components(pd)) <= w.number <= plat.bridges
    assert _valid_sequence(w)
