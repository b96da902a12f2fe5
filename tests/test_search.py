"""Tests of the search: objectives, strategies, guards, run folders and the reduce CLI."""

from __future__ import annotations

import json
from fractions import Fraction

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from kidata import knot

import plait.moves as moves
from plait.cli import main
from plait.errors import GuardViolation, InputError
from plait.scoring import jones
from plait.scoring.objective import (
    cancel_potential,
    isolation,
    make_objective,
    pair_touches,
    sign_mix,
    writhe_imbalance,
)
from plait.search import ReduceResult, reduce, resume
from plait.search.engine import BoundedSet, PathStore, rng_state_from_json, rng_state_to_json
from plait.word import ClosedBraid, PlatWord


def _kinfo_jones(name: str) -> dict:
    return {Fraction(e): c for e, c in knot(name).jones.items()}


def _plat_of(name: str) -> PlatWord:
    return ClosedBraid.from_word(knot(name).braid).to_plat()


def _same(a: ReduceResult, b: ReduceResult) -> bool:
    ja, jb = a.to_json(), b.to_json()
    return all(ja[k] == jb[k] for k in ("result", "input", "bridge_bounds", "steps"))


# -- objectives -------------------------------------------------------------------------

def test_objective_names_and_errors():
    # common practice: lexicographic (bridges, length) is the tool's order
    assert make_objective(None).key(PlatWord(4, (2, 2, 2))) == (2, 3)
    assert make_objective("length").key(PlatWord(4, (2, 2, 2))) == (3, 2)
    w = make_objective("weighted:5")
    assert w.key(PlatWord(4, (2,))) < w.key(PlatWord(6, ()))
    assert make_objective("weighted:5").spec() == "weighted:5"
    for bad in ("fewest", "length:3", "weighted:x", "weighted:-1", "weighted:nan"):
        with pytest.raises(InputError):
            make_objective(bad)
    # a huge weight is refused with a message that names the allowed range
    with pytest.raises(InputError, match="up to"):
        make_objective("weighted:1e308")


def test_stabilization_has_isolation_one():
    # Birman 1976: b on 2n strands -> b sigma_2n^(+-1) on 2n+2 strands is a stabilization;
    # the new pair is touched by one letter, the pattern the search creates on purpose.
    b = _plat_of("5_2")
    for e in (1, -1):
        s = PlatWord(b.strands + 2, b.word + (e * b.strands,))
        assert pair_touches(s)[-1] == 1
        assert isolation(s) == 1
        assert moves.destab_sites(s.word, s.strands)  # the move graph agrees


words = st.lists(st.integers(1, 7).flatmap(lambda k: st.sampled_from([k, -k])), max_size=40)


@settings(max_examples=60, deadline=None)
@given(words)
def test_pair_touches_counts_letters(word):
    # law: an odd letter touches one pair, an even letter two (common practice)
    p = PlatWord(8, tuple(word))
    assert sum(pair_touches(p)) == sum(1 if abs(g) % 2 else 2 for g in word)


@settings(max_examples=60, deadline=None)
@given(words, st.integers(1, 7), st.integers(0, 40))
def test_cancel_potential_sees_inserted_pair(word, g, at):
    # law: inserting g g^-1 creates a free cancellation; the potential counts it
    at = min(at, len(word))
    w2 = tuple(word[:at]) + (g, -g) + tuple(word[at:])
    assert cancel_potential(w2) >= 2
    assert sign_mix(w2) >= 1
    assert writhe_imbalance(w2) >= 2


@settings(max_examples=40, deadline=None)
@given(st.lists(st.integers(1, 7), max_size=30))
def test_positive_words_have_nothing_to_cancel(word):
    # law: a positive braid word has no inverse letters, hence no cancellation
    w = tuple(word)
    assert cancel_potential(w) == 0 and sign_mix(w) == 0 and writhe_imbalance(w) == 0


@settings(max_examples=40, deadline=None)
@given(st.lists(st.integers(1, 5).flatmap(lambda k: st.sampled_from([k, -k])), max_size=30))
def test_facts_behind_the_astar_heuristic(word):
    # The admissibility statement of plait.search.astar.heuristic rests on these: every
    # single move changes the bridge count by at most one, and (handle reduction and the
    # canonical-form macro aside) shortens the word by at most 4 letters, 2 for a
    # cancellation. (Birman 1976 moves; the drop bounds are counted from the moves.)
    from plait.search.astar import heuristic

    p = PlatWord(6, tuple(word))
    for rec, nb in moves.neighbors(p):
        assert abs(nb.bridges - p.bridges) <= 1
        if rec.kind != "handle":
            assert p.length - nb.length <= 4
        if rec.kind == "cancel":
            assert p.length - nb.length == 2
        # h never exceeds the moves needed to reach its own target from a neighbour + 1
        h0 = heuristic(p, 1, 0, 4)
        h1 = heuristic(nb, 1, 0, 4)
        if rec.kind != "handle":
            assert h0 <= h1 + 1  # consistency (monotone) for max_drop = 4


# -- engine data structures -----------------------------------------------------------------

def test_rng_state_round_trip_and_bounded_set():
    import random

    r = random.Random(7)
    r.random()
    r2 = rng_state_from_json(json.loads(json.dumps(rng_state_to_json(r))))
    assert [r.random() for _ in range(5)] == [r2.random() for _ in range(5)]
    s = BoundedSet(3, [1, 2, 3, 4])
    assert 1 not in s and 4 in s and len(s) == 3
    assert BoundedSet(3, s.to_json()).to_json() == s.to_json()


def test_path_store_replays():
    # the saved path tree replays to the word the search reached (moves.replay checks
    # every step's precondition)
    start = _plat_of("3_1")
    store = PathStore(start)
    node, cur = 0, start
    for _ in range(4):
        rec, cur = next(iter(moves.neighbors(cur)))
        node = store.add(node, rec, cur)
    saved = PathStore.from_json(start, json.loads(json.dumps(store.to_json([node]))))
    res = moves.replay(start, saved.records(node))
    assert res.ok and res.final == cur
    assert saved.depth(node) == 4


# -- reduce ------------------------------------------------------------------------------

@pytest.mark.parametrize("strategy", ["beam", "astar", "anneal", "auto"])
def test_reduce_scrambled_trefoil(strategy, tmp_path):
    # source: KnotInfo via database-knotinfo (3_1: braid [1,1,1], bridge index 2, Jones)
    clean = _plat_of("3_1")
    scr, _ = moves.scramble(clean, seed=3)
    assert scr.bridges == clean.bridges + 2
    res = reduce(scr, strategy=strategy, steps=400, seed=1, run_dir=tmp_path / "r")
    assert res.status == "done" and res.guards == "passed"
    assert res.result.bridges == knot("3_1").bridge_index
    assert res.result.length <= clean.length
    assert jones(res.result) == _kinfo_jones("3_1")
    assert moves.verify_certificate(res.certificate).ok
    best = json.loads((tmp_path / "r" / "best.json").read_text())
    assert best["word"] == list(res.result.word)


def test_same_seed_same_result_and_resume_of_done_run(tmp_path):
    scr, _ = moves.scramble(_plat_of("5_2"), seed=5)
    a = reduce(scr, strategy="auto", steps=300, seed=11, run_dir=tmp_path / "a")
    b = reduce(scr, strategy="auto", steps=300, seed=11, run_dir=tmp_path / "b")
    assert _same(a, b)
    c = resume(tmp_path / "a")  # a finished run is returned as it is
    assert _same(a, c) and c.status == "done"


@pytest.mark.parametrize("strategy", ["anneal", "auto"])
def test_checkpoints_do_not_change_the_run(strategy, tmp_path):
    # a checkpoint after every step (pruning the path tree each time) gives the same
    # result as rare checkpoints, and the certificate still replays
    scr, _ = moves.scramble(_plat_of("6_1"), seed=9)
    a = reduce(scr, strategy=strategy, steps=120, seed=3, run_dir=tmp_path / "a",
               checkpoint_every=1e-6)
    b = reduce(scr, strategy=strategy, steps=120, seed=3, run_dir=tmp_path / "b",
               checkpoint_every=1e3)
    assert _same(a, b)
    assert moves.verify_certificate(a.certificate).ok


def test_run_folder_files(tmp_path):
    d = tmp_path / "run"
    res = reduce(PlatWord.from_word((2, 2, 2, 1, -1)), steps=20, run_dir=d)
    for name in ("config.json", "input.json", "best.json", "certificate.json", "state.json"):
        json.loads((d / name).read_text())
    events = [json.loads(line)["event"] for line in (d / "log.jsonl").read_text().splitlines()]
    assert events[0] == "start" and events[-1] == "end"
    state = json.loads((d / "state.json").read_text())
    assert state["status"] == "done" and state["steps"] == res.steps
    with pytest.raises(InputError):  # a folder holding a run is not overwritten
        reduce(PlatWord.from_word((2, 2, 2)), steps=5, run_dir=d)


def test_cli_reduce_json_contract_and_verify(tmp_path, capsys):
    d = tmp_path / "run"
    rc = main(["reduce", "--braid", "1 1 1", "--steps", "60", "--seed", "2", "--run-dir",
               str(d), "--json"])
    assert rc == 0
    out = json.loads(capsys.readouterr().out)
    for key in ("strands", "word", "bridges", "length"):
        assert key in out["result"] and key in out["input"]
    bb = out["bridge_bounds"]
    assert set(bb) >= {"lower", "upper", "certified", "reasons"}
    # source: KnotInfo via database-knotinfo (3_1 has bridge index 2, det 3 != 1)
    assert bb["lower"] == 2 and bb["upper"] == 2 and bb["certified"] is True
    assert out["guards"] == "passed" and out["run_dir"] == str(d)
    assert main(["verify", out["certificate"]]) == 0


def test_bad_parameters_create_no_run_folder(tmp_path):
    p = PlatWord.from_word((2, 2, 2))
    for kw in ({"strategy": "beam", "params": {"widht": 3}},
               {"strategy": "auto", "params": {"phases": [["beam", 0]]}},
               {"steps": -1}, {"time": 0}, {"seed": "x"}, {"objective": "fast"},
               {"kinds": ["teleport"]}):
        with pytest.raises(InputError):
            reduce(p, run_dir=tmp_path / "r", **kw)
        assert not (tmp_path / "r").exists()


def test_cli_bad_input_exit_2(tmp_path, capsys):
    assert main(["reduce", "--braid", "1 1 1", "--time", "-1", "--quiet"]) == 2
    assert main(["reduce", "--braid", "1 1 1", "--strategy", "bogus"]) == 2
    assert main(["reduce", "--braid", "1 x 1", "--steps", "3"]) == 2
    assert main(["resume", str(tmp_path)]) == 2
    assert main(["resume", str(tmp_path / "missing")]) == 2
    err = capsys.readouterr().err
    assert "Traceback" not in err


def test_wrong_move_stops_run_with_exit_3(tmp_path, monkeypatch, capsys):
    # A deliberately wrong move: it claims to be a free cancellation but deletes the
    # first letter alone (changing a crossing of the diagram). The guard must stop the
    # run, keep the last verified best (still the trefoil) and name the move.
    real = moves.neighbors

    def bad_neighbors(plat, kinds=None):
        if plat.length >= 3:
            yield moves.MoveRecord("cancel", (0,)), plat.with_word(plat.word[1:])
        yield from real(plat, kinds)

    monkeypatch.setattr(moves, "neighbors", bad_neighbors)
    # the trefoil's canonical 3-letter plat meets both bounds at once (2 bridges, Jones
    # span 3), which ends a run before any move; keep the run going so the bad move shows
    from plait.search.engine import SearchContext

    monkeypatch.setattr(SearchContext, "at_optimum", lambda self: False)
    d = tmp_path / "run"
    rc = main(["reduce", "--braid", "1 1 1", "--strategy", "beam", "--steps", "50",
               "--run-dir", str(d), "--quiet"])
    assert rc == 3
    err = capsys.readouterr().err
    assert "guard failed" in err and "offending move" in err and "cancel" in err
    best = json.loads((d / "best.json").read_text())
    # source: KnotInfo via database-knotinfo (Jones polynomial of 3_1)
    assert jones(PlatWord(best["strands"], tuple(best["word"]))) == _kinfo_jones("3_1")
    assert moves.verify_certificate(d / "certificate.json").ok
    assert json.loads((d / "state.json").read_text())["status"] == "guard-failed"
    with pytest.raises(InputError):
        resume(d)


def test_guard_violation_from_api(tmp_path, monkeypatch):
    real = moves.neighbors

    def mirror_neighbors(plat, kinds=None):
        # wrong: flips every crossing and drops a letter (a shorter mirror image)
        if plat.length >= 2:
            yield moves.MoveRecord("cancel", (0,)), PlatWord(plat.strands,
                                                            tuple(-g for g in plat.word[1:]))
        yield from real(plat, kinds)

    monkeypatch.setattr(moves, "neighbors", mirror_neighbors)
    with pytest.raises(GuardViolation):
        reduce(_plat_of("4_1"), strategy="beam", steps=30, run_dir=tmp_path / "r")


def test_cli_reduce_takes_the_diagram_step_and_drops_the_hint(tmp_path, capsys):
    # The braid 1 2 -1 2 3 -2 3 -2 1 closes to a knot of determinant 3 as a 4-bridge plat.
    # Even with no search steps, reduce takes the diagram step: its own diagram has a
    # Wirtinger coloring from 2 seeds, whose bridge position is a 2-bridge plat
    # (Blair–Kjuchukova–Ozawa 2021), at the lower bound 2, so no hint is printed.
    rc = main(["reduce", "--braid", "1 2 -1 2 3 -2 3 -2 1", "--steps", "0",
               "--run-dir", str(tmp_path / "r"), "--quiet"])
    out = capsys.readouterr().out
    assert rc == 0
    assert "result: 2 bridges (certified minimal)" in out
    assert "1 diagram step" in out and "hint:" not in out
    assert "length: at least" in out
    # without diagram steps (the move kinds restricted) it stays at 4 bridges against a
    # lower bound of 2: not proved minimal, with the hint and the folded reason
    from plait.commands.reduce import report

    braid = ClosedBraid.from_word([1, 2, -1, 2, 3, -2, 3, -2, 1])
    res = reduce(braid, steps=0, run_dir=tmp_path / "k", kinds=sorted(moves.DEFAULT_KINDS))
    capsys.readouterr()
    report(res, False)
    out = capsys.readouterr().out
    assert "lower bound 2" in out and "hint:   not proved minimal" in out
    assert "numbers of homomorphisms onto S4/transposition, S5/transposition" in out
    assert "number of homomorphisms onto" not in out
    # a certified result gets no hint
    capsys.readouterr()
    assert main(["reduce", "--braid", "1 1 1", "--steps", "60", "--run-dir",
                 str(tmp_path / "c"), "--quiet"]) == 0
    assert "hint:" not in capsys.readouterr().out
