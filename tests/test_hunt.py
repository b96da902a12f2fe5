"""The hunt for a diagram with fewer Wirtinger seeds (plait.search.hunt) and its proof files."""

from __future__ import annotations

import json
import random
import subprocess
from pathlib import Path

import pytest
from kidata import knot, knots

from plait.diagrams.pd import validate_pd
from plait.diagrams.pdjones import plat_jones
from plait.diagrams.pdmoves import apply_pd_move, random_pd_move
from plait.diagrams.wirtinger import wirtinger_exhaustive
from plait.search.hunt import check_hunt_proof, hunt, seed_deficit


def scrambled(name: str, seed: int):
    """KnotInfo's diagram of ``name`` after seeded R2/R3 moves, until it needs more seeds
    than its bridge index."""
    k = knot(name)
    pd = validate_pd(k.pd)
    rng = random.Random(seed)
    for _ in range(300):
        pd = apply_pd_move(pd, random_pd_move(pd, rng, {"r2+": 1.0, "r3": 1.0}))
        if seed_deficit(pd, k.bridge_index)[0] > 0:
            return k, pd
    raise AssertionError("scrambling never raised the Wirtinger number")


def test_seed_deficit_matches_bridge_index():
    # source: KnotInfo via database-knotinfo (bridge_index); the Wirtinger number of
    # KnotInfo's diagram equals it up to 12 crossings (field notes, checked there)
    for k in knots(8)[::3]:
        pd = validate_pd(k.pd)
        b = k.bridge_index
        assert seed_deficit(pd, b)[0] == 0, k.name
        assert seed_deficit(pd, b - 1)[0] > 0, k.name
        assert wirtinger_exhaustive(pd).number == b, k.name


def test_hunt_finds_three_seeds_after_scrambling(tmp_path):
    k, pd = scrambled("8_19", 1)
    assert seed_deficit(pd, 3)[0] > 0
    res = hunt(pd, seconds=300, evaluations=400, state_dir=tmp_path, seed=1,
               handle_signals=False)
    assert res.found and res.best_deficit == 0
    proof = json.loads((tmp_path / "proof.json").read_text())
    assert check_hunt_proof(proof) == (True, "")
    from plait.word import PlatWord

    plat = PlatWord(proof["plat"]["strands"], tuple(proof["plat"]["word"]))
    assert plat.bridges == 3
    assert plat_jones(plat) == k.jones  # source: KnotInfo via database-knotinfo
    # tampering: another diagram at one step, a wrong seed, a wrong plat
    bad = json.loads(json.dumps(proof))
    if bad["steps"]:
        bad["diagrams"][0] = proof["start"]
        assert not check_hunt_proof(bad)[0]
    bad = json.loads(json.dumps(proof))
    bad["seeds"] = bad["seeds"][:2]
    assert not check_hunt_proof(bad)[0]
    bad = json.loads(json.dumps(proof))
    bad["plat"]["word"] = [-g for g in bad["plat"]["word"]]  # the mirror image
    assert not check_hunt_proof(bad)[0]


def test_hunt_resumes_from_its_checkpoint(tmp_path):
    # an open entry of KnotInfo (bridge index [3,4]) keeps its deficit; the second call
    # continues the first (same start, counts add up) and refuses another diagram
    from database_knotinfo import link_list

    rows = [r for r in link_list() if r.get("bridge_index") == "[3,4]"][:2]
    pd = validate_pd(json.loads(rows[0]["pd_notation"]))
    a = hunt(pd, seconds=60, evaluations=15, state_dir=tmp_path, seed=2,
             handle_signals=False)
    st = json.loads((tmp_path / "hunt.json").read_text())
    assert st["evaluated"] == a.evaluated == 15
    b = hunt(pd, seconds=60, evaluations=30, state_dir=tmp_path, seed=2,
             handle_signals=False)
    assert b.evaluated == 30 and b.elapsed >= a.elapsed
    from plait.errors import InputError

    with pytest.raises(InputError):
        hunt(validate_pd(json.loads(rows[1]["pd_notation"])), seconds=5,
             state_dir=tmp_path, handle_signals=False)


def test_index_four_knots_get_no_three_seed_diagram(tmp_path):
    # source: KnotInfo via database-knotinfo: bridge index 4, so no diagram has
    # Wirtinger number 3 (Blair-Kjuchukova-Velazquez-Villanueva 2020)
    from database_knotinfo import link_list

    rows = [r for r in link_list()
            if r.get("crossing_number") == "13" and r.get("bridge_index") == "4"][:2]
    for r in rows:
        pd = validate_pd(json.loads(r["pd_notation"]))
        res = hunt(pd, seconds=60, evaluations=40, seed=3, handle_signals=False)
        assert not res.found and res.best_deficit > 0


def _plait(capsys, *args):
    from plait.cli import main

    rc = main(list(args))
    out, err = capsys.readouterr()
    return subprocess.CompletedProcess(args, rc, out, err)


def test_hunt_report_certifies_and_verifies(tmp_path, capsys):
    # the report side of a hunt: from a 4-bridge report of a scrambled 8_19 diagram, the
    # hunt finds a 3-bridge plat whose certificate from the diagram passes `plait verify`
    from plait.bridge import BridgeReport
    from plait.diagrams.fromdiagram import diagram_to_plat
    from plait.search.hunt import hunt_report

    k, pd = scrambled("8_19", 1)
    plat = diagram_to_plat(pd).plat
    assert plat.bridges == 4
    rep = BridgeReport(3, 4, ["(given)"], ["(given)"], plat, None, {})
    out = hunt_report(rep, pd, seconds=300, state_dir=tmp_path / "h", seed=1,
                      handle_signals=False)
    assert out["found"] and rep.upper == 3 and rep.certified
    assert plat_jones(rep.result) == k.jones  # source: KnotInfo via database-knotinfo
    v = _plait(capsys, "verify", out["certificate"])
    assert v.returncode == 0 and v.stdout.startswith("valid"), v.stdout
    # the certificate is checked against the diagram: a mirror plat is refused
    from plait.moves.certificate import load_certificate, verify_certificate, write_certificate

    cert = load_certificate(out["certificate"])
    mirror = cert.start.with_word([-g for g in cert.start.word])
    write_certificate(tmp_path / "bad.json", mirror, [], mirror, cert.input)
    assert not verify_certificate(tmp_path / "bad.json").ok


def test_cli_bridge_hunt_runs_and_reports(tmp_path, capsys):
    from database_knotinfo import link_list

    # an open entry that the stored rank proofs (bench/results/open13-rank-proofs) do not
    # settle, so that the hunt has something to do
    settled = {p.stem for p in (Path(__file__).parent.parent / "bench" / "results"
                                / "open13-rank-proofs").glob("*.json")}
    row = next(r for r in link_list()
               if r.get("bridge_index") == "[3,4]" and r["name"] not in settled)
    out = _plait(capsys, "bridge", "--pd", row["pd_notation"], "--steps", "20", "--hunt", "3",
                 "--bounds-time", "1", "--run-dir", str(tmp_path / "run"), "--json")
    assert out.returncode == 0, out.stderr
    obj = json.loads(out.stdout)
    # source: KnotInfo via database-knotinfo: bridge index [3,4]
    assert obj["bridge_bounds"]["lower"] >= 3 and obj["bridge_bounds"]["upper"] <= 4
    if obj["bridge_bounds"]["lower"] < obj["bridge_bounds"]["upper"]:
        assert obj["hunt"]["evaluated"] >= 1
    else:  # the hunt's own lower-bound budget settled it first
        assert obj["hunt"]["skipped"] == "certified by the lower bounds", obj["hunt"]
    assert (tmp_path / "run" / "hunt" / "hunt.json").exists()


@pytest.mark.parametrize("args", [
    ["bridge", "--pd", "[[1,5,2,4],[3,1,4,6],[5,3,6,2]]", "--hunt", "-1"],
    ["bridge", "--pd", "[[1,5,2,4],[3,1,4,6],[5,3,6,2]]", "--hunt-dir", "x"],
    ["batch", "examples/survey-small.jsonl", "--out", "o", "--hunt", "5"],
])
def test_cli_hunt_bad_options(args, tmp_path, capsys):
    out = _plait(capsys, *[a if a != "o" else str(tmp_path / "o") for a in args])
    assert out.returncode == 2 and out.stderr.count("\n") == 1, out.stderr


def test_hunt_report_gives_the_lower_side_a_budget(monkeypatch, tmp_path):
    # plumbing: a lower bound that takes a budget gets half the hunt's seconds, and a
    # bound meeting the upper one certifies the report without a diagram hunt
    import plait.scoring.bounds as bounds
    from plait.bridge import BridgeReport
    from plait.diagrams.fromdiagram import diagram_to_plat
    from plait.scoring.bounds import LowerBound
    from plait.search.hunt import hunt_report

    seen = {}

    def fake(plat, budget):
        seen["budget"] = budget
        return LowerBound(4, ("a stronger obstruction (stand-in)",), "stand-in")

    monkeypatch.setattr(bounds, "bridge_lower_bound", fake)
    k, pd = scrambled("8_19", 1)
    rep = BridgeReport(3, 4, ["(given)"], ["(given)"], diagram_to_plat(pd).plat, None, {})
    out = hunt_report(rep, pd, seconds=8, state_dir=tmp_path, handle_signals=False)
    assert seen["budget"] == 4 and rep.lower == 4 and rep.certified
    assert "status" not in out and not (tmp_path / "hunt.json").exists()


def test_batch_carries_the_hunt(tmp_path):
    # `plait batch --bridge --hunt S` gives every item's report a hunt, whose checkpoint
    # sits next to the item's run folder
    from plait.search.batch import read_rows, run_batch

    # the first entry that the stored rank proofs leave open, so the hunt has work to do
    settled = {p.stem for p in (Path(__file__).parent.parent / "bench" / "results"
                                / "open13-rank-proofs").glob("*.json")}
    src = tmp_path / "one.jsonl"
    with open("examples/open13.jsonl", encoding="utf-8") as fh:
        line = next(ln for ln in fh if json.loads(ln)["id"] not in settled)
    src.write_text(line)
    out = run_batch(src, tmp_path / "b", steps=10, bridge=True, workers=1, quiet=True,
                    search_options={"hunt": 2.0})
    assert out.summary["done"] == 1
    (row,) = read_rows(tmp_path / "b" / "results.jsonl")
    assert row["error"] is None
    assert row["hunt"]["state_dir"].endswith(".hunt")
    if row["hunt"].get("skipped") is None:
        assert row["hunt"]["evaluated"] >= 1
        assert any((tmp_path / "b" / "runs").glob("*.hunt/hunt.json"))
    else:  # the hunt's own lower-bound budget settled it first
        assert row["hunt"]["skipped"] == "certified by the lower bounds", row["hunt"]
