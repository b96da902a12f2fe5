"""Tests of the batch engine: exactly-once rows under kill -9, shards, Dask, error rows."""

from __future__ import annotations

import json
import os
import random
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

from plait.atomic import write_json_atomic
from plait.cli import main
from plait.errors import InputError
from plait.formats import presentation_from_obj
from plait.search.batch import run_batch
from plait.search.batch_files import (
    format_summary,
    read_rows,
    rows_to_csv,
    strip_volatile,
    summarize,
)
from plait.search.batch_pool import ItemTask
from plait.search.batch_shards import item_seed, merge_batches, parse_shard, shard_of
from plait.search.randomplat import random_plats

TESTS = Path(__file__).resolve().parent
REPO = TESTS.parent


# -- a small resumable item function ------------------------------------------------------
# It really computes something deterministic: the free reduction of the plat word (delete
# adjacent letters g, -g; confluent, so the result does not depend on the order), one
# cancellation per step, choosing among the cancellable positions with the item's seed. It
# checkpoints its state to the run folder after every step and continues from it, like the
# search does, so a kill mid-item exercises the mid-item resume path of the engine.
def toy_item(task: ItemTask) -> dict:
    plat = presentation_from_obj(task.presentation)
    if not hasattr(plat, "bridges"):
        plat = plat.to_plat()
    run_dir = Path(task.run_dir)
    state_path = run_dir / "state.json"
    if state_path.exists():
        state = json.loads(state_path.read_text())
    else:
        state = {"word": list(plat.word), "steps": 0, "trace": 0,
                 "rng": None}
    rng = random.Random(task.seed)
    if state["rng"] is not None:
        rng.setstate((state["rng"][0], tuple(state["rng"][1]), state["rng"][2]))
    delay = float(os.environ.get("PLAIT_TEST_ITEM_DELAY", "0"))
    word = state["word"]
    while task.steps is None or state["steps"] < task.steps:
        spots = [i for i in range(len(word) - 1) if word[i] == -word[i + 1]]
        if not spots:
            break
        i = rng.choice(spots)
        del word[i:i + 2]
        state["steps"] += 1
        state["trace"] = (state["trace"] * 31 + i + 1) % 1_000_000_007
        st = rng.getstate()
        state["rng"] = [st[0], list(st[1]), st[2]]
        write_json_atomic(state_path, state)
        if delay:
            time.sleep(delay)
    if "boom" in task.id:
        raise ValueError("this item fails on purpose")
    if "crash" in task.id:
        os._exit(3)  # the worker process dies, as in an out-of-memory kill
    if "exit" in task.id:
        sys.exit(4)  # a BaseException that the item's own error handling lets through
    n = plat.bridges
    return {
        "result": {"strands": plat.strands, "word": word, "bridges": n, "length": len(word)},
        "input": {"strands": plat.strands, "word": list(plat.word), "bridges": n,
                  "length": plat.length},
        "bridge_bounds": {"lower": 1, "upper": n, "certified": n == 1,
                          "reasons": ["toy bound"]},
        "guards": "passed",
        "certificate": None,
        "run_dir": str(run_dir),
        "trace": state["trace"],
    }


def _with_cancellations(word: list[int], rng: random.Random, k: int) -> list[int]:
    """Insert ``k`` cancelling pairs g, -g at random places."""
    word = list(word)
    top = max(1, max((abs(g) for g in word), default=1))
    for _ in range(k):
        g = rng.randint(1, top) * rng.choice((1, -1))
        i = rng.randint(0, len(word))
        word[i:i] = [g, -g]
    return word


def write_input(path: Path, count: int, seed: int = 7, bad_lines: bool = False) -> list[str]:
    rng = random.Random(seed)
    lines, ids = [], []
    for ident, plat in random_plats(count, bridges=(2, 3), length=(4, 8), seed=seed):
        word = _with_cancellations(list(plat.word), rng, 6)
        lines.append(json.dumps({"id": ident, "plat": word, "strands": plat.strands}))
        ids.append(ident)
    if bad_lines:
        lines.insert(2, '{"id": "bad-json", "plat": [1, 2')  # invalid JSON
        lines.insert(4, json.dumps({"id": "bad-letter", "plat": [1, 0, 2]}))  # letter 0
        lines.insert(5, json.dumps({"id": "boom-1", "plat": [1, -1, 3]}))  # item raises
        ids += ["line-3", "bad-letter", "boom-1"]
    path.write_text("\n".join(lines) + "\n")
    return ids


def by_id(rows: list[dict]) -> dict[str, dict]:
    out: dict[str, dict] = {}
    for r in rows:
        assert r["id"] not in out, f"id {r['id']} written twice"
        out[r["id"]] = strip_volatile(r)
    return out


# -- stable assignment ------------------------------------------------------------------
def test_seeds_and_shards_are_stable_across_interpreters():
    # common practice: derived values must not depend on PYTHONHASHSEED
    code = ("from plait.search.batch_shards import item_seed, shard_of;"
            "print(item_seed(3, 'k-1'), shard_of('k-1', 7))")
    outs = set()
    for hs in ("1", "2"):
        env = dict(os.environ, PYTHONHASHSEED=hs)
        outs.add(subprocess.run([sys.executable, "-c", code], env=env, capture_output=True,
                                text=True, check=True).stdout)
    assert outs == {f"{item_seed(3, 'k-1')} {shard_of('k-1', 7)}\n"}
    assert item_seed(3, "k-1") != item_seed(4, "k-1") != item_seed(3, "k-2")
    counts = [0, 0, 0]
    for i in range(300):
        counts[shard_of(f"id-{i}", 3)] += 1
    assert min(counts) > 70  # a hash spreads ids roughly evenly (common practice)


def test_parse_shard_rejects_bad_values():
    assert parse_shard("1/3") == (1, 3)
    for bad in ("3/3", "1", "-1/2", "a/b", "0/0"):
        with pytest.raises(InputError):
            parse_shard(bad)


# -- rows, error rows, CSV, summary -----------------------------------------------------------
def test_batch_writes_one_row_per_item_and_error_rows(tmp_path):
    src = tmp_path / "in.jsonl"
    ids = write_input(src, 8, bad_lines=True)
    out = tmp_path / "out"
    outcome = run_batch(src, out, steps=50, seed=1, workers=2, quiet=True, item_fn=toy_item)
    rows = read_rows(out / "results.jsonl")
    assert sorted(r["id"] for r in rows) == sorted(ids)
    errs = {r["id"]: r["error"] for r in rows if r["error"]}
    assert set(errs) == {"line-3", "bad-letter", "boom-1"}
    assert "invalid JSON" in errs["line-3"]
    assert "0" in errs["bad-letter"]
    assert "on purpose" in errs["boom-1"]
    for r in rows:
        if not r["error"]:
            # free reduction leaves no adjacent cancelling pair (common practice)
            w = r["result"]["word"]
            assert all(w[i] != -w[i + 1] for i in range(len(w) - 1))
            assert r["seed"] == item_seed(1, r["id"])
    s = outcome.summary
    assert (s["items"], s["done"], s["errors"], s["complete"]) == (11, 11, 3, True)
    assert s == json.loads((out / "summary.json").read_text())
    csv_text = (out / "results.csv").read_text()
    header = csv_text.splitlines()[0].split(",")
    assert header[:3] == ["id", "line", "seed"] and header[-2:] == ["elapsed", "error"]
    assert "result.bridges" in header and "bridge_bounds.certified" in header
    assert len(csv_text.splitlines()) == 12
    text = format_summary(s)
    assert "11/11 items" in text and "3 errors" in text


def test_second_resume_does_nothing_and_new_batch_needs_resume(tmp_path, capsys):
    src = tmp_path / "in.jsonl"
    write_input(src, 4)
    out = tmp_path / "out"
    run_batch(src, out, steps=20, workers=1, quiet=True, item_fn=toy_item)
    before = {p.name: p.stat().st_mtime_ns for p in out.iterdir()}
    again = run_batch(src, out, resume=True, workers=1, quiet=True, item_fn=toy_item)
    assert again.written == 0
    assert {p.name: p.stat().st_mtime_ns for p in out.iterdir()} == before
    with pytest.raises(InputError, match="--resume"):
        run_batch(src, out, steps=20, quiet=True, item_fn=toy_item)
    with pytest.raises(InputError, match="differs"):
        run_batch(src, out, steps=21, resume=True, quiet=True, item_fn=toy_item)
    src.write_text(src.read_text() + '{"id": "new", "plat": [1]}\n')
    with pytest.raises(InputError, match="changed"):
        run_batch(src, out, resume=True, quiet=True, item_fn=toy_item)


def test_duplicate_ids_are_rejected_with_exit_2(tmp_path, capsys):
    src = tmp_path / "dup.jsonl"
    src.write_text('{"id": "a", "plat": [1]}\n{"id": "a", "plat": [1, 1, 1]}\n')
    assert main(["batch", str(src), "--out", str(tmp_path / "o"), "--steps", "5",
                 "--quiet"]) == 2
    assert "appears on lines 1 and 2" in capsys.readouterr().err


def test_torn_last_line_is_discarded_and_rewritten(tmp_path):
    src = tmp_path / "in.jsonl"
    ids = write_input(src, 5)
    out = tmp_path / "out"
    run_batch(src, out, steps=30, workers=1, quiet=True, item_fn=toy_item)
    full = by_id(read_rows(out / "results.jsonl"))
    data = (out / "results.jsonl").read_bytes()
    lines = data.splitlines(keepends=True)
    # keep two rows and half of the third, as a power cut in the middle of a write would
    (out / "results.jsonl").write_bytes(b"".join(lines[:2]) + lines[2][: len(lines[2]) // 2])
    (out / "summary.json").unlink()
    run_batch(src, out, resume=True, workers=1, quiet=True, item_fn=toy_item)
    rows = read_rows(out / "results.jsonl")
    assert (out / "results.jsonl").read_bytes().endswith(b"\n")
    assert by_id(rows) == full and sorted(full) == sorted(ids)


def test_csv_flattens_words_and_lists():
    rows = [{"id": "x", "line": 1, "seed": 5, "result": {"word": [1, -2], "bridges": 2},
             "bridge_bounds": {"reasons": ["a b", "c"], "certified": True},
             "elapsed": 0.5, "error": None},
            {"id": "y", "line": 2, "seed": 6, "elapsed": 0.0, "error": "bad, line"}]
    text = rows_to_csv(rows).splitlines()
    assert text[0] == ("id,line,seed,result.word,result.bridges,bridge_bounds.reasons,"
                       "bridge_bounds.certified,elapsed,error")
    assert text[1] == "x,1,5,1 -2,2,a b; c,true,0.5,"
    assert text[2] == 'y,2,6,,,,,0.0,"bad, line"'


def test_summary_histogram_and_medians():
    def row(i, bin_, bout, lin, lout, cert):
        return {"id": str(i), "input": {"bridges": bin_, "length": lin},
                "result": {"bridges": bout, "length": lout},
                "bridge_bounds": {"certified": cert}, "elapsed": 1.0 + i, "error": None}

    rows = [row(0, 4, 3, 40, 20, True), row(1, 4, 4, 40, 40, False),
            row(2, 5, 3, 50, 10, True), {"id": "e", "elapsed": 0.0, "error": "x"}]
    s = summarize(rows, items=5)
    assert s["bridges"] == {"4->3": 1, "4->4": 1, "5->3": 1}
    assert (s["ok"], s["errors"], s["improved"], s["complete"]) == (3, 1, 2, False)
    assert s["length_reduction_median"] == 20 and s["certified"] == 2
    assert s["time_per_item"]["median"] == 2.0


def test_a_worker_that_dies_costs_only_its_own_item(tmp_path):
    src = tmp_path / "in.jsonl"
    ids = write_input(src, 6)
    with open(src, "a") as fh:
        fh.write(json.dumps({"id": "crash-1", "plat": [1, 2, -2]}) + "\n")
        fh.write(json.dumps({"id": "exit-1", "plat": [1, 2, -2]}) + "\n")
    out = tmp_path / "out"
    run_batch(src, out, steps=30, workers=2, quiet=True, item_fn=toy_item)
    rows = {r["id"]: r for r in read_rows(out / "results.jsonl")}
    assert sorted(rows) == sorted(ids + ["crash-1", "exit-1"])
    assert "died" in rows["crash-1"]["error"]
    assert rows["exit-1"]["error"] == "worker: SystemExit: 4"
    assert not any(r["error"] for k, r in rows.items() if k not in ("crash-1", "exit-1"))


def test_one_writer_per_folder(tmp_path):
    from plait.search.batch_files import batch_lock

    src = tmp_path / "in.jsonl"
    write_input(src, 2)
    out = tmp_path / "out"
    out.mkdir()
    with batch_lock(out):
        with pytest.raises(InputError, match="another plait batch"):
            run_batch(src, out, steps=5, quiet=True, item_fn=toy_item)


# -- exactly once under kill -9 --------------------------------------------------------------
_RUNNER = """
import sys
sys.path.insert(0, {tests!r})
import test_batch
from plait.search.batch import run_batch
kw = dict(time=5, seed=3) if sys.argv[1] == "new" else dict(resume=True)
run_batch({src!r}, {out!r}, workers=2, quiet=True, item_fn=test_batch.toy_item, **kw)
"""


def test_kill_minus_9_then_resume_gives_every_id_once(tmp_path):
    src = tmp_path / "in.jsonl"
    ids = write_input(src, 10, seed=11, bad_lines=True)
    env = dict(os.environ, PLAIT_TEST_ITEM_DELAY="0.05")

    def start(out: Path, mode: str) -> subprocess.Popen:
        script = _RUNNER.format(tests=str(TESTS), src=str(src), out=str(out))
        return subprocess.Popen([sys.executable, "-c", script, mode], env=env,
                                stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)

    # the uninterrupted run, timed to place the kills
    t0 = time.monotonic()
    p = start(tmp_path / "ref", "new")
    assert p.wait(timeout=120) == 0, p.stderr.read().decode()
    span = time.monotonic() - t0
    expected = by_id(read_rows(tmp_path / "ref" / "results.jsonl"))
    out = tmp_path / "out"
    rng = random.Random(2024)
    kills = 0
    for fraction in sorted(rng.uniform(0.15, 0.85) for _ in range(3)):
        mode = "resume" if (out / "batch.json").exists() else "new"
        p = start(out, mode)
        try:
            p.wait(timeout=fraction * span)
        except subprocess.TimeoutExpired:
            p.send_signal(signal.SIGKILL)  # a kill -9 at a random moment
            p.wait()
            kills += 1
            continue
        assert p.returncode == 0, p.stderr.read().decode()
    p = start(out, "resume" if (out / "batch.json").exists() else "new")
    assert p.wait(timeout=120) == 0, p.stderr.read().decode()
    assert kills >= 2
    got = by_id(read_rows(out / "results.jsonl"))
    assert sorted(got) == sorted(ids)
    assert got == expected
    assert json.loads((out / "summary.json").read_text())["complete"]


# -- shards and merge -----------------------------------------------------------------------
def test_three_shards_merged_equal_the_unsharded_run(tmp_path, capsys):
    src = tmp_path / "in.jsonl"
    write_input(src, 12, seed=5, bad_lines=True)
    whole = tmp_path / "whole"
    run_batch(src, whole, steps=40, seed=9, workers=2, quiet=True, item_fn=toy_item)
    parts = []
    for k in range(3):
        d = tmp_path / f"shard{k}"
        run_batch(src, d, steps=40, seed=9, workers=1, shard=f"{k}/3", quiet=True,
                  item_fn=toy_item)
        parts.append(d)
        cfg = json.loads((d / "batch.json").read_text())
        assert all(shard_of(r["id"], 3) == k for r in read_rows(d / "results.jsonl"))
        assert cfg["items"] == len(read_rows(d / "results.jsonl"))
    merged = tmp_path / "merged"
    assert main(["batch-merge", *map(str, parts), "--out", str(merged)]) == 0
    assert "15/15 items" in capsys.readouterr().out
    assert by_id(read_rows(merged / "results.jsonl")) == by_id(
        read_rows(whole / "results.jsonl"))
    # two shards only: merged, but incomplete (exit 1)
    assert main(["batch-merge", str(parts[0]), str(parts[2]), "--out",
                 str(tmp_path / "m2")]) == 1
    # a shard of another batch (different seed) is refused
    other = tmp_path / "other"
    run_batch(src, other, steps=40, seed=10, workers=1, shard="1/3", quiet=True,
              item_fn=toy_item)
    with pytest.raises(InputError, match="seed"):
        merge_batches([parts[0], other], tmp_path / "m3")


# -- Dask ------------------------------------------------------------------------------------
def test_dask_local_cluster_equals_local_run(tmp_path):
    distributed = pytest.importorskip("distributed")
    src = tmp_path / "in.jsonl"
    write_input(src, 8, seed=13, bad_lines=True)
    local = tmp_path / "local"
    run_batch(src, local, steps=40, seed=2, workers=2, quiet=True, item_fn=toy_item)
    with distributed.LocalCluster(processes=False, n_workers=1, threads_per_worker=2,
                                  dashboard_address=None) as cluster:
        on_dask = tmp_path / "dask"
        outcome = run_batch(src, on_dask, steps=40, seed=2, dask=cluster.scheduler_address,
                            quiet=True, item_fn=toy_item)
    assert outcome.unfinished == 0
    assert by_id(read_rows(on_dask / "results.jsonl")) == by_id(
        read_rows(local / "results.jsonl"))


# -- the random plat generator ------------------------------------------------------------
def test_random_plats_are_seeded_and_in_the_model():
    a = list(random_plats(30, bridges=(2, 4), length=(5, 9), seed=1))
    b = list(random_plats(10, bridges=(2, 4), length=(5, 9), seed=1))
    assert a[:10] == b  # item i does not depend on the count
    assert a != list(random_plats(30, bridges=(2, 4), length=(5, 9), seed=2))
    for _ident, p in a:
        assert 2 <= p.bridges <= 4 and 5 <= p.length <= 9
        assert all(1 <= abs(g) <= p.strands - 1 for g in p.word)
    knots = list(random_plats(30, bridges=(3, 3), length=(12, 12), seed=4, knot=True))
    assert all(p.components == 1 for _, p in knots)


def test_random_plats_letters_are_uniform():
    # the random plat model draws every letter uniformly from +-1..+-(2n-1); a chi-square
    # test at 4 bridges (14 letters, 13 degrees of freedom) with 7,000 letters
    # (common practice; critical value 34.5 at p = 0.001, from memory)
    counts: dict[int, int] = {}
    for _, p in random_plats(100, bridges=(4, 4), length=(70, 70), seed=3):
        for g in p.word:
            counts[g] = counts.get(g, 0) + 1
    assert sorted(counts) == [g for g in range(-7, 8) if g]
    total = sum(counts.values())
    exp = total / 14
    chi2 = sum((c - exp) ** 2 / exp for c in counts.values())
    assert chi2 < 34.5


def test_random_plats_command_writes_jsonl(tmp_path, capsys):
    f = tmp_path / "r.jsonl"
    assert main(["random-plats", "--count", "5", "--bridges", "2-3", "--length", "10",
                 "--seed", "4", "--knot", "--out", str(f)]) == 0
    objs = [json.loads(x) for x in f.read_text().splitlines()]
    assert [o["id"] for o in objs] == [f"rp-000{i}" for i in range(1, 6)]
    for o in objs:
        p = presentation_from_obj(o)
        assert p.components == 1 and p.length == 10
    assert main(["random-plats", "--bridges", "3-2"]) == 2


def test_folder_lock_goes_on_unlocked_where_flock_is_refused(tmp_path, monkeypatch):
    # common practice: some network file systems refuse flock (ENOLCK); a run then goes on
    # unlocked instead of reporting a second writer that does not exist
    import errno
    import fcntl

    from plait.atomic import FolderLock

    def refuse(fd, op):
        raise OSError(errno.ENOLCK, "no locks available")

    monkeypatch.setattr(fcntl, "flock", refuse)
    with FolderLock(tmp_path, "busy") as lock:
        assert lock.fd is None
