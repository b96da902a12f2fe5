"""Stored proofs of b ≥ 4 for KnotInfo's open 13-crossing entries, on KnotInfo's own PD codes."""

from __future__ import annotations

import json
import re
from functools import cache
from pathlib import Path

import pytest

from plait.scoring.jones import jones
from plait.scoring.rankproof import check_rank_proof
from plait.word import PlatWord

PROOFS = sorted((Path(__file__).parent.parent / "bench" / "results" /
                 "open13-rank-proofs").glob("*.json"))


def _parse_jones(text: str) -> dict[int, int]:
    # KnotInfo's 13-crossing Jones strings: '47 + t^(-8) - 4/t^7 + 10/t^6 - 52/t - 37*t'
    # a negative exponent in parentheses is written with "n" so that "-" only separates terms
    s = re.sub(r"\^\((-?\d+)\)", lambda m: "^" + m.group(1).replace("-", "n"),
               text.replace(" ", ""))
    terms = re.findall(r"[+-]?[^+-]+", s)
    out: dict[int, int] = {}
    for t in terms:
        m = re.fullmatch(r"([+-]?)(\d*)\*?(?:(/)?t(?:\^(n?\d+))?)?", t)
        assert m, (t, text)
        sign, coeff, inv, exp = m.groups()
        c = int(coeff) if coeff else 1
        c = -c if sign == "-" else c
        if "t" in t:
            e = int(exp.replace("n", "-")) if exp else 1
            e = -e if inv else e
        else:
            e = 0
        out[e] = out.get(e, 0) + c
    return {e: c for e, c in out.items() if c}


@cache
def _knotinfo() -> dict[str, tuple[str, dict[int, int], list]]:
    # source: KnotInfo via database-knotinfo (bridge_index, jones_polynomial, pd_notation)
    from database_knotinfo import link_list

    return {k["name"]: (str(k["bridge_index"]), _parse_jones(k["jones_polynomial"]),
                        json.loads(k["pd_notation"].replace("{", "[").replace("}", "]")))
            for k in link_list() if str(k.get("crossing_number")) == "13"}


def test_jones_parser():
    # KnotInfo's 13-crossing notation, a worked example of our own
    assert _parse_jones("47 + t^(-8) - 4/t^7 - 52/t - 37*t + t^5") == {
        0: 47, -8: 1, -7: -4, -1: -52, 1: -37, 5: 1}


@pytest.mark.skipif(not PROOFS, reason="no stored proofs")
@pytest.mark.parametrize("path", PROOFS, ids=[p.stem for p in PROOFS])
def test_open_entry_proof(path):
    # the file alone proves b >= 4 (Boileau-Zieschang 1985: b >= meridional rank) for the
    # knot of KnotInfo's own PD code: the homomorphism is given on that diagram's arcs and
    # the checker verifies Wirtinger's relation at each of its crossings. The knot is
    # listed as [3,4] by KnotInfo (source: KnotInfo via database-knotinfo).
    obj = json.loads(path.read_text())
    bridge_index, kj, kpd = _knotinfo()[path.stem]
    assert bridge_index == "[3,4]"
    assert obj["pd"] == kpd
    # every homomorphism the file gives (PD code and plat) is checked in full, and the
    # rank argument is run on each one's image class
    res = check_rank_proof(obj)
    assert res.ok, res.message
    assert res.bound == 4
    assert "the pd code's labels satisfy all 13 crossing relations" in res.message
    # extra evidence: the plat of the same homomorphism has KnotInfo's Jones polynomial
    # up to mirror image (the bridge number does not depend on the mirror)
    plat = PlatWord(obj["plat"]["strands"], tuple(obj["plat"]["word"]))
    assert plat.components == 1 and plat.bridges >= 4
    ours = {int(e): c for e, c in jones(plat).items()}
    assert ours in (kj, {-e: c for e, c in kj.items()})


@pytest.mark.skipif(not PROOFS, reason="no stored proofs")
def test_pd_homomorphism_alone_suffices():
    # the PD code's homomorphism proves the bound without the plat (one file of each
    # image class kind; the per-file test above runs the same argument on every file)
    kinds: dict[str, dict] = {}
    for path in PROOFS:
        obj = json.loads(path.read_text())
        kinds.setdefault(obj["class"]["target"], obj)
    for obj in kinds.values():
        pd_only = {k: v for k, v in obj.items() if k not in ("plat", "caps")}
        res = check_rank_proof(pd_only)
        assert res.ok and res.bound == 4, res.message
        assert "plat" not in res.message
