"""Random walks on the move graph keep the Jones polynomial of every KnotInfo knot."""

import pytest
from kidata import knots
from plait.moves import random_walk, replay
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
