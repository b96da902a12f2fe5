"""``plait bridge``: bounds on the bridge number against KnotInfo and Schubert's theorems."""

from __future__ import annotations

import json

from kidata import knot, knots

from plait.bridge import bridge_report
from plait.cli import main
from plait.diagrams.pd import validate_pd
from plait.diagrams.pdjones import plat_jones
from plait.word import ClosedBraid


def test_knotinfo_to_10_crossings(tmp_path):
    # Acceptance: for every KnotInfo knot 3..10 crossings from pd_notation, the upper bound
    # is the table's bridge_index, the lower bound never exceeds it, at least 95% are
    # certified, and the returned plat has KnotInfo's Jones polynomial (same chirality).
    # Bounds only (steps=0): the search is exercised in tests/test_search*.py.
    # source: KnotInfo via database-knotinfo (pd_notation, bridge_index, jones_polynomial)
    rows = knots(10)
    certified = 0
    for i, k in enumerate(rows):
        r = bridge_report(validate_pd(k.pd), steps=0, run_dir=tmp_path / str(i),
                          handle_signals=False)
        assert r.upper == k.bridge_index == r.result.bridges, k.name
        assert r.lower <= k.bridge_index, k.name
        # KnotInfo's knots are prime: no two knotted factors are ever claimed
        assert not r.factors, k.name
        certified += r.certified
        assert plat_jones(r.result) == k.jones, k.name
    assert len(rows) == 249
    assert certified >= 0.95 * len(rows)


def test_torus_knots_from_braids(tmp_path):
    # Schubert 1954: b(T(p, q)) = min(p, q); from the closed p-braid the upper bound is p
    for p, q in ((2, 5), (3, 4), (3, 5), (4, 5)):
        r = bridge_report(ClosedBraid(p, tuple(range(1, p)) * q), steps=0,
                          run_dir=tmp_path / f"{p}_{q}", handle_signals=False,
                          wirtinger_time=2.0)
        assert r.upper == p and r.lower <= p


def test_connected_sums(tmp_path):
    # Schubert 1954: b(K1 # K2) = b(K1) + b(K2) - 1 is the upper bound for the banded
    # diagram of two table knots
    # source: KnotInfo via database-knotinfo (pd_notation, bridge_index)
    from test_fromdiagram import _connected_sum

    for a, b in (("3_1", "4_1"), ("8_19", "3_1")):
        ka, kb = knot(a), knot(b)
        pd = _connected_sum(validate_pd(ka.pd), validate_pd(kb.pd))
        r = bridge_report(pd, steps=0, run_dir=tmp_path / f"{a}_{b}", handle_signals=False)
        assert r.upper == ka.bridge_index + kb.bridge_index - 1
        assert r.lower <= r.upper


def test_cli_json_contract(tmp_path, capsys):
    # the JSON object of plait reduce --json, with both bounds and the Wirtinger seeds
    # source: KnotInfo via database-knotinfo (8_19 bridge_index = 3)
    code = main(["bridge", "--pd", json.dumps(knot("8_19").pd), "--steps", "20", "--json",
                 "--run-dir", str(tmp_path / "run")])
    out, _ = capsys.readouterr()
    assert code == 0
    obj = json.loads(out)
    for key in ("result", "input", "bridge_bounds", "guards", "certificate", "wirtinger", "pd"):
        assert key in obj
    bb = obj["bridge_bounds"]
    assert bb["upper"] == obj["result"]["bridges"] == 3
    assert bb["lower"] <= 3 and bb["certified"] == (bb["lower"] == 3)
    assert bb["reasons"] and bb["upper_reasons"]
    assert obj["wirtinger"]["number"] == 3 and len(obj["wirtinger"]["seeds"]) == 3
    assert obj["guards"] == "passed"


def test_cli_human(tmp_path, capsys):
    # the trefoil: bridge number 2, certified (Schubert 1954: b = 1 only for the unknot)
    code = main(["bridge", "--pd", "[[1,5,2,4],[3,1,4,6],[5,3,6,2]]", "--steps", "5",
                 "--quiet", "--run-dir", str(tmp_path / "run")])
    out, _ = capsys.readouterr()
    assert code == 0
    assert out.splitlines()[0] == "bridge number = 2 (certified)"
    assert "upper:" in out and "lower:" in out and "pd:" in out


def test_cli_bad_input(capsys):
    # bad input: exit 2 with a one-line message (common practice)
    code = main(["bridge", "--pd", "[[1,2,3]]"])
    _, err = capsys.readouterr()
    assert code == 2 and len(err.strip().splitlines()) == 1
