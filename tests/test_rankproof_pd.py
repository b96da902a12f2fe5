"""The rank-proof checker on homomorphisms given on a PD code (fields pd, pd_arcs)."""

from __future__ import annotations

import copy
import itertools
import json
from functools import cache
from pathlib import Path

import pytest

from plait.scoring.rankproof import check_rank_proof, pd_arcs

PROOFS = Path(__file__).parent.parent / "bench" / "results" / "open13-rank-proofs"


@cache
def _knotinfo_pd() -> dict[str, str]:
    # source: KnotInfo via database-knotinfo (pd_notation)
    from database_knotinfo import link_list

    return {k["name"]: k["pd_notation"] for k in link_list() if k.get("pd_notation")}


def _pd(name: str) -> list[list[int]]:
    return json.loads(_knotinfo_pd()[name].replace("{", "[").replace("}", "]"))


def _label_sign(pd: list[list[int]], c: int) -> int:
    # KnotInfo numbers a knot's edges 1..2n consecutively along the orientation, so the
    # over strand of [i, j, k, l] runs l -> j exactly when j = l + 1 (mod 2n), which is the
    # right-handed (positive) crossing  # common practice
    n = 2 * len(pd)
    i, j, k, l = pd[c]
    return 1 if (j - l) % n == 1 else -1


def _mul(a: tuple, b: tuple) -> tuple:
    return tuple(a[i] for i in b)


def _inv(a: tuple) -> tuple:
    out = [0] * len(a)
    for i, x in enumerate(a):
        out[x] = i
    return tuple(out)


# the eight 3-cycles of A4: meridian images of order 3, so that a b a^-1 and a^-1 b a differ
THREE_CYCLES = [p for p in itertools.permutations(range(4))
                if sum(p[i] != i for i in range(4)) == 3]


def _proof(pd: list[list[int]], labels, conv: int = 1) -> dict:
    # rank 1 claims nothing beyond the crossing relations
    return {"format": "plait-rank-proof/1", "group": {"kind": "permutation"}, "pd": pd,
            "pd_arcs": [list(x) for x in labels], "pd_convention": conv, "rank": 1}


def _relations(cr, labels) -> list[tuple[bool, bool]]:
    # per crossing: (x_k = x_o x_i x_o^-1, x_k = x_o^-1 x_i x_o), arcs from pd_arcs
    out = []
    for o, i, k, _s in cr:
        a = labels[o]
        out.append((_mul(_mul(a, labels[i]), _inv(a)) == labels[k],
                    _mul(_mul(_inv(a), labels[i]), a) == labels[k]))
    return out


@pytest.mark.parametrize("name", ["3_1", "4_1", "5_2", "6_1", "7_4", "8_19", "8_20"])
def test_arcs_and_signs_of_knotinfo_diagrams(name):
    pd = _pd(name)
    arcs, cr = pd_arcs(pd)
    # a knot diagram with n crossings has n arcs, each a run of edges  # common practice
    assert len(arcs) == len(pd)
    assert sorted(x for a in arcs for x in a) == list(range(1, 2 * len(pd) + 1))
    # the checker's signs (from its own orientation of the diagram) agree with the labels
    assert [s for *_a, s in cr] == [_label_sign(pd, c) for c in range(len(pd))]
    # the over arc of a crossing contains its two over edges, the under arcs its under edges
    for (o, i, k, _s), row in zip(cr, pd, strict=True):
        assert row[1] in arcs[o] and row[3] in arcs[o]
        assert row[0] in arcs[i] and row[2] in arcs[k]


def test_writhe_of_reduced_alternating_diagrams():
    # Kauffman, Murasugi, Thistlethwaite 1987 (Tait's writhe conjecture): the writhe of a
    # reduced alternating diagram is a knot invariant, so it is 0 for the amphichiral 4_1
    # and 6_3; the trefoil's reduced diagram has three crossings of one sign
    assert sum(s for *_a, s in pd_arcs(_pd("4_1"))[1]) == 0
    assert sum(s for *_a, s in pd_arcs(_pd("6_3"))[1]) == 0
    assert abs(sum(s for *_a, s in pd_arcs(_pd("3_1"))[1])) == 3


def test_accepts_exactly_the_labellings_of_one_global_convention():
    # law: on 4_1 (two crossings of each sign), a labelling by 3-cycles passes iff every
    # crossing satisfies x_k = x_o^(c e) x_i x_o^(-c e), e its sign, c the global convention
    pd = _pd("4_1")
    signs = [_label_sign(pd, c) for c in range(len(pd))]
    seen = {1: 0, -1: 0}
    cr = pd_arcs(pd)[1]
    for labels in itertools.product(THREE_CYCLES, repeat=4):
        rel = _relations(cr, labels)
        for conv in (1, -1):
            want = all(r[0] if s * conv > 0 else r[1] for r, s in zip(rel, signs, strict=True))
            assert check_rank_proof(_proof(pd, labels, conv)).ok == want
            seen[conv] += want and len(set(labels)) > 1
    assert seen[1] > 0 and seen[-1] > 0  # the law is not vacuous


def test_rejects_a_mix_of_conventions():
    # on 6_1 there are labellings by 3-cycles that satisfy every crossing's relation only
    # when some crossings use the other sign: neither global convention accepts them
    pd = _pd("6_1")
    signs = [_label_sign(pd, c) for c in range(len(pd))]
    mixed = 0
    cr = pd_arcs(pd)[1]
    # the relations are invariant under conjugating every label by one permutation, and
    # the 3-cycles are one class of S4: the first arc's label may be fixed
    for rest in itertools.product(THREE_CYCLES, repeat=5):
        labels = (THREE_CYCLES[0],) + rest
        rel = _relations(cr, labels)
        if not all(any(r) for r in rel) or len(set(labels)) == 1:
            continue
        if any(all(r[0] if s * conv > 0 else r[1] for r, s in zip(rel, signs, strict=True))
               for conv in (1, -1)):
            continue
        mixed += 1
        if mixed <= 40:
            assert not check_rank_proof(_proof(pd, labels, 1)).ok
            assert not check_rank_proof(_proof(pd, labels, -1)).ok
    assert mixed > 0


def _stored(kind: str) -> dict:
    for path in sorted(PROOFS.glob("*.json")):
        obj = json.loads(path.read_text())
        if "pd" in obj and obj["class"]["target"].startswith(kind):
            return obj
    pytest.skip(f"no stored PD-level proof with a {kind} class")


def test_tampered_pd_proofs_fail():
    obj = _stored("Sp(4,3)")  # transvections have order 3: the convention matters
    pd_only = {k: v for k, v in obj.items() if k not in ("plat", "caps")}
    assert check_rank_proof(pd_only).ok
    for a in range(len(obj["pd_arcs"])):  # one arc's image replaced by another's
        bad = copy.deepcopy(pd_only)
        other = next(x for x in bad["pd_arcs"] if x != bad["pd_arcs"][a])
        bad["pd_arcs"][a] = other
        assert not check_rank_proof(bad).ok
    bad = copy.deepcopy(pd_only)
    bad["pd_convention"] = -bad["pd_convention"]
    assert not check_rank_proof(bad).ok
    bad = copy.deepcopy(pd_only)
    bad["pd_arcs"].pop()
    assert not check_rank_proof(bad).ok
    bad = copy.deepcopy(pd_only)  # crossing 1 switched: the other strand passes over
    bad["pd"][0] = bad["pd"][0][1:] + bad["pd"][0][:1]
    assert not check_rank_proof(bad).ok
    bad = copy.deepcopy(pd_only)  # crossing 1 reflected: its rotation reversed
    bad["pd"][0][1], bad["pd"][0][3] = bad["pd"][0][3], bad["pd"][0][1]
    assert not check_rank_proof(bad).ok
    bad = copy.deepcopy(obj)  # the plat, when present, is checked too
    bad["caps"][0], bad["caps"][1] = bad["caps"][1], bad["caps"][0]
    if bad["caps"][0] != bad["caps"][1]:
        assert not check_rank_proof(bad).ok
