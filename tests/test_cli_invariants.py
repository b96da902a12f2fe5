"""``plait invariants``: the JSON contract and human output, against KnotInfo values."""

from __future__ import annotations

import json
from fractions import Fraction

from kidata import knot

from plait.cli import main


def _run(capsys, *argv) -> tuple[int, str, str]:
    code = main(["invariants", *argv])
    out, err = capsys.readouterr()
    return code, out, err


def _as_poly(pairs) -> dict:
    return {Fraction(e).limit_denominator(2): c for e, c in pairs}


def _up_to_units(poly: dict) -> dict:
    low = min(poly)
    sign = 1 if poly[low] > 0 else -1
    return {e - low: sign * c for e, c in poly.items()}


def test_json_contract_trefoil(capsys):
    # source: KnotInfo via database-knotinfo (3_1: braid 1 1 1, Jones, Alexander, det 3)
    row = knot("3_1")
    code, out, err = _run(capsys, "--braid", "1 1 1", "--json")
    assert code == 0 and err == ""
    rep = json.loads(out)
    for key in ("jones", "alexander"):
        exps = [e for e, _ in rep[key]]
        assert exps == sorted(exps)
        assert all(isinstance(e, (int, float)) and isinstance(c, int) for e, c in rep[key])
    assert _as_poly(rep["jones"]) == row.jones
    # KnotInfo lists Alexander polynomials up to units +-t^k
    assert _up_to_units(_as_poly(rep["alexander"])) == _up_to_units(row.alexander)
    assert rep["determinant"] == row.determinant == 3
    assert rep["components"] == 1
    assert "linking" not in rep
    lb = rep["bridge_lower_bound"]
    assert lb["value"] == row.bridge_index == 2
    assert lb["reasons"] and all(isinstance(s, str) for s in lb["reasons"])


def test_json_link_half_integer_exponents(capsys):
    # common practice: the positive Hopf link (closed braid 1 1) has
    # V = -t^(1/2) - t^(5/2) and linking number 1; two components need two bridges
    code, out, _ = _run(capsys, "--braid", "1 1", "--json")
    assert code == 0
    rep = json.loads(out)
    assert rep["jones"] == [[0.5, -1], [2.5, -1]]
    assert rep["components"] == 2
    assert rep["linking"] == [[0, 1], [1, 0]]
    assert rep["bridge_lower_bound"]["value"] == 2


def test_json_bridge_three(capsys):
    # source: KnotInfo via database-knotinfo: 10_132 has bridge index 3 and shares Jones
    # and Alexander polynomials with 5_1; the report proves b >= 3 and says how
    row = knot("10_132")
    code, out, _ = _run(capsys, "--braid", " ".join(map(str, row.braid)), "--json")
    assert code == 0
    lb = json.loads(out)["bridge_lower_bound"]
    assert lb["value"] == 3
    assert lb["method"] == "not-2-bridge"
    assert any("Schubert" in s for s in lb["reasons"])


def test_pd_input(capsys):
    # source: KnotInfo via database-knotinfo: the PD code of 4_1 through plat -> invariants
    # gives the table's Jones polynomial up to mirror and its determinant
    row = knot("4_1")
    code, out, _ = _run(capsys, "--pd", json.dumps(row.pd), "--json")
    assert code == 0
    rep = json.loads(out)
    v = _as_poly(rep["jones"])
    assert v in (row.jones, {-e: c for e, c in row.jones.items()})
    assert rep["determinant"] == row.determinant
    assert rep["bridge_lower_bound"]["value"] == 2


def test_human_output(capsys):
    # source: KnotInfo via database-knotinfo: 10_129 (bridge index 3)
    row = knot("10_129")
    code, out, _ = _run(capsys, "--braid", " ".join(map(str, row.braid)))
    assert code == 0
    assert "Jones polynomial:" in out and "determinant:          25" in out
    assert "bridge number ≥ 3" in out


def test_bad_input_exits_2(capsys):
    code, out, err = _run(capsys, "--braid", "1 x 2")
    assert code == 2 and out == ""
    assert err.startswith("plait: error:") and err.count("\n") == 1
    code, _, err = _run(capsys)
    assert code == 2 and "exactly one" in err
