"""Interrupted searches: kill -9 and SIGINT during a run, then ``plait resume``."""

from __future__ import annotations

import json
import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest
from kidata import knot

import plait.moves as moves
from plait.cli import main
from plait.formats import presentation_to_obj
from plait.search import reduce
from plait.word import ClosedBraid, PlatWord

pytestmark = pytest.mark.skipif(os.name != "posix", reason="POSIX signals")

STEPS = 1500
SEED = 4


@pytest.fixture(scope="module")
def scrambled(tmp_path_factory):
    # source: KnotInfo via database-knotinfo (braid notation of 8_18)
    clean = ClosedBraid.from_word(knot("8_18").braid).to_plat()
    scr, _ = moves.scramble(clean, seed=2)
    d = tmp_path_factory.mktemp("input")
    path = d / "scr.json"
    path.write_text(json.dumps(presentation_to_obj(scr)))
    ref = reduce(scr, strategy="auto", steps=STEPS, seed=SEED, run_dir=d / "ref")
    return path, ref


def _running(path: Path, run_dir: Path) -> subprocess.Popen:
    """A ``plait reduce`` subprocess that has checkpointed a tenth of its step budget."""
    proc = _start(path, run_dir)
    _wait_for_progress(proc, run_dir, STEPS // 10)
    return proc


def _start(path: Path, run_dir: Path) -> subprocess.Popen:
    cmd = [sys.executable, "-m", "plait.cli", "reduce", "--file", str(path), "--strategy",
           "auto", "--steps", str(STEPS), "--seed", str(SEED), "--run-dir", str(run_dir),
           "--checkpoint-every", "0.2", "--quiet", "--json"]
    return subprocess.Popen(cmd, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)


def _wait_for_progress(proc: subprocess.Popen, run_dir: Path, min_steps: int) -> None:
    """Wait until a checkpoint past ``min_steps`` steps is on disk."""
    deadline = time.monotonic() + 60
    while time.monotonic() < deadline:
        assert proc.poll() is None, "the run ended before it could be interrupted"
        try:
            state = json.loads((run_dir / "state.json").read_text())
            if state["steps"] >= min_steps:
                return
        except (FileNotFoundError, json.JSONDecodeError, KeyError):
            pass
        time.sleep(0.02)
    raise AssertionError("no checkpoint appeared")


def _resume_json(run_dir: Path, capsys) -> dict:
    capsys.readouterr()
    assert main(["resume", str(run_dir), "--json"]) == 0
    return json.loads(capsys.readouterr().out)


def _same(out: dict, ref) -> None:
    r = ref.to_json()
    for key in ("result", "input", "bridge_bounds", "steps"):
        assert out[key] == r[key], key


def test_kill_9_then_resume_gives_the_same_verified_result(scrambled, tmp_path, capsys):
    path, ref = scrambled
    run_dir = tmp_path / "k"
    proc = _running(path, run_dir)
    proc.kill()
    assert proc.wait() == -signal.SIGKILL
    out = _resume_json(run_dir, capsys)
    _same(out, ref)  # same seed + step budget: identical with and without the kill
    assert moves.verify_certificate(out["certificate"]).ok
    assert main(["verify", out["certificate"]]) == 0


def test_sigint_leaves_a_consistent_run_folder(scrambled, tmp_path, capsys):
    path, ref = scrambled
    run_dir = tmp_path / "i"
    proc = _running(path, run_dir)
    proc.send_signal(signal.SIGINT)
    _, err = proc.communicate(timeout=60)
    assert proc.returncode == 130, err
    assert "plait resume" in err
    state = json.loads((run_dir / "state.json").read_text())
    assert state["status"] == "interrupted" and 0 < state["steps"] < STEPS
    best = json.loads((run_dir / "best.json").read_text())
    cert = moves.verify_certificate(run_dir / "certificate.json")
    assert cert.ok
    assert cert.final == PlatWord(best["strands"], tuple(best["word"]))
    assert state["best"]["word"] == best["word"]
    events = [json.loads(x)["event"] for x in (run_dir / "log.jsonl").read_text().splitlines()]
    assert events[-1] == "interrupted"
    out = _resume_json(run_dir, capsys)
    _same(out, ref)


def test_a_running_search_locks_its_folder(scrambled, tmp_path, capsys):
    # common practice: one writer per run folder; a second process is refused with exit 2
    # and a one-line message, and the kernel frees the lock when the writer dies (kill -9)
    path, ref = scrambled
    run_dir = tmp_path / "l"
    proc = _running(path, run_dir)
    capsys.readouterr()
    try:
        assert main(["resume", str(run_dir), "--quiet"]) == 2
    finally:
        proc.kill()
        proc.wait()
    err = capsys.readouterr().err
    assert "another plait process" in err and len(err.strip().splitlines()) == 1
    out = _resume_json(run_dir, capsys)
    _same(out, ref)


def test_resume_of_a_foreign_folder_leaves_no_lock_file(tmp_path, capsys):
    # common practice: a tool never writes into a folder that is not its own
    (tmp_path / "notes.txt").write_text("mine")
    assert main(["resume", str(tmp_path)]) == 2
    assert sorted(p.name for p in tmp_path.iterdir()) == ["notes.txt"]
    assert "not a run folder" in capsys.readouterr().err


DIAGRAM_STEPS = 600


def test_kill_9_during_a_diagram_step_then_resume(tmp_path, capsys):
    # A scrambled 9_28 (KnotInfo bridge index 3) whose search takes a diagram step: the
    # process is killed as soon as the run logs the start of a Wirtinger computation
    # (the solver and the construction take far longer than the kill), then resumed; the
    # result equals an uninterrupted run with the same seed and step budget.
    # source: KnotInfo via database-knotinfo (braid notation of 9_28)
    clean = ClosedBraid.from_word(knot("9_28").braid).to_plat()
    scr, _ = moves.scramble(clean, seed=2)
    path = tmp_path / "scr.json"
    path.write_text(json.dumps(presentation_to_obj(scr)))
    ref = reduce(scr, strategy="auto", steps=DIAGRAM_STEPS, seed=SEED, run_dir=tmp_path / "ref")
    assert ref.diagram_steps >= 1
    run_dir = tmp_path / "k"
    cmd = [sys.executable, "-m", "plait.cli", "reduce", "--file", str(path), "--strategy",
           "auto", "--steps", str(DIAGRAM_STEPS), "--seed", str(SEED), "--run-dir",
           str(run_dir), "--checkpoint-every", "0.2", "--quiet", "--json"]
    proc = subprocess.Popen(cmd, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    log = run_dir / "log.jsonl"
    deadline = time.monotonic() + 120
    while time.monotonic() < deadline:
        assert proc.poll() is None, "the run ended before its diagram step"
        if log.exists() and '"event": "diagram"' in log.read_text():
            break
        time.sleep(0.005)
    else:
        raise AssertionError("no diagram step was logged")
    proc.kill()
    assert proc.wait() == -signal.SIGKILL
    last = json.loads(log.read_text().splitlines()[-1])
    assert last["event"] == "diagram"  # nothing was logged after the step began
    out = _resume_json(run_dir, capsys)
    r = ref.to_json()
    for key in ("result", "input", "bridge_bounds", "steps", "diagram_steps"):
        assert out[key] == r[key], key
    assert moves.verify_certificate(out["certificate"]).ok
