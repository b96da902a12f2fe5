"""Random walks on the move graph keep the Jones polynomial of every KnotInfo knot."""

import pytest
from kidata import knot, knots

from plait.moves import canonical, destabilize_all, random_walk, replay
from plait.scoring import jones
from plait.word import ClosedBraid

KNOTS = knots(10)


def test_table_is_complete():
    # source: KnotInfo via database-knotinfo: 249 prime knots with 3 to 10 crossings
    assert len(KNOTS) == 249


@pytest.mark.parametrize("row", KNOTS, ids=[k.name for k in KNOTS])
def test_twenty_walks_keep_jones(row):
    # source: KnotInfo via database-knotinfo (braid notation and Jones polynomial); the
    # braid-to-plat conversion keeps chirality (field notes), so equality is exact
    p = ClosedBraid.from_word(row.braid).to_plat()
    assert jones(p) == row.jones
    for seed in range(20):
        q, recs = random_walk(p, 50, seed, max_bridges=p.bridges + 1)
        assert len(recs) == 50
        assert jones(q) == row.jones, (row.name, seed)
        if seed == 0:
            assert replay(p, recs).final == q


def test_best_first_search_finds_the_two_bridge_figure_eight():
    # source: KnotInfo via database-knotinfo: 4_1 has braid [1,-2,1,-2], bridge index 2
    # and this Jones polynomial; its braid plat has 3 bridges and a greedy descent stalls
    row = knot("4_1")
    p = canonical(ClosedBraid.from_word(row.braid).to_plat())
    assert p.bridges == 3
    d0, _ = destabilize_all(p, seek=10)
    d, recs = destabilize_all(p, seek=10, explore=500)
    assert d0.bridges == 3 and d.bridges == row.bridge_index == 2
    assert jones(d) == row.jones
    assert replay(p, recs).final == d
