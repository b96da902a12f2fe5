"""``plait batch`` with the real search: kill -9 and resume, shards, Dask, all equal to one run."""

from __future__ import annotations

import json
import random
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

from plait.cli import main
from plait.search.batch import run_batch
from plait.search.batch_files import read_rows, strip_volatile
from plait.search.randomplat import random_plats

STEPS = "60"
SEED = "5"


def _rows(folder: Path) -> dict[str, dict]:
    out: dict[str, dict] = {}
    for r in read_rows(folder / "results.jsonl"):
        assert r["id"] not in out, f"id {r['id']} written twice"
        # "explored" counts states seen, a function of the steps; only timing and paths
        # differ between runs of the same batch
        out[r["id"]] = strip_volatile(r)
    return out


@pytest.fixture(scope="module")
def reference(tmp_path_factory):
    """A small batch of random plats (plus a malformed line), run once without
    interruption: the rows every other way of running it must reproduce."""
    tmp = tmp_path_factory.mktemp("batch-search")
    src = tmp / "in.jsonl"
    lines = [json.dumps({"id": ident, "plat": list(p.word), "strands": p.strands})
             for ident, p in random_plats(7, bridges=(2, 3), length=(8, 14), seed=5)]
    lines.insert(3, '{"id": "typo", "braid": "1 2 x"}')
    src.write_text("\n".join(lines) + "\n")
    out = tmp / "ref"
    t0 = time.monotonic()
    assert main(["batch", str(src), "--out", str(out), "--steps", STEPS, "--seed", SEED,
                 "--workers", "2", "--quiet"]) == 0
    rows = _rows(out)
    assert len(rows) == 8
    assert rows["typo"]["error"] and "'x'" in rows["typo"]["error"]
    ok = [r for r in rows.values() if not r["error"]]
    assert len(ok) == 7, [r["error"] for r in rows.values()]
    for r in ok:
        assert r["guards"] == "passed" and r["status"] == "done"
        # the search never makes a plat worse (common practice: it keeps the best)
        assert (r["result"]["bridges"], r["result"]["length"]) <= (
            r["input"]["bridges"], r["input"]["length"])
    return src, rows, time.monotonic() - t0


def test_kill_minus_9_at_random_moments_then_resume(reference, tmp_path):
    src, expected, span = reference
    out = tmp_path / "out"
    cmd = [sys.executable, "-m", "plait.cli", "batch", str(src), "--out", str(out),
           "--workers", "2", "--quiet"]
    rng = random.Random(7)
    kills = 0
    for fraction in sorted(rng.uniform(0.2, 0.9) for _ in range(3)):
        if (out / "batch.json").exists():
            args = cmd + ["--resume"]
        else:
            args = cmd + ["--steps", STEPS, "--seed", SEED]
        p = subprocess.Popen(args, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
        try:
            p.wait(timeout=fraction * span)
        except subprocess.TimeoutExpired:
            p.send_signal(signal.SIGKILL)
            p.wait()
            kills += 1
            continue
        assert p.returncode == 0, p.stderr.read().decode()
    done = subprocess.run(cmd + ["--resume"], capture_output=True, text=True, timeout=300)
    assert done.returncode == 0, done.stderr
    assert kills >= 1
    assert _rows(out) == expected
    # a second resume on the finished batch does nothing
    stamp = (out / "results.jsonl").stat().st_mtime_ns
    again = subprocess.run(cmd + ["--resume"], capture_output=True, text=True, timeout=120)
    assert again.returncode == 0 and "nothing to do" in again.stdout
    assert (out / "results.jsonl").stat().st_mtime_ns == stamp


def test_shards_merged_equal_the_single_run(reference, tmp_path, capsys):
    src, expected, _ = reference
    parts = []
    for k in range(3):
        d = tmp_path / f"s{k}"
        assert main(["batch", str(src), "--out", str(d), "--steps", STEPS, "--seed", SEED,
                     "--workers", "1", "--shard", f"{k}/3", "--quiet"]) == 0
        parts.append(str(d))
    merged = tmp_path / "merged"
    assert main(["batch-merge", *parts, "--out", str(merged)]) == 0
    assert _rows(merged) == expected
    assert json.loads((merged / "summary.json").read_text())["complete"]


def test_dask_local_cluster_equals_the_local_run(reference, tmp_path):
    distributed = pytest.importorskip("distributed")
    src, expected, _ = reference
    with distributed.LocalCluster(processes=False, n_workers=1, threads_per_worker=2,
                                  dashboard_address=None) as cluster:
        out = tmp_path / "dask"
        assert main(["batch", str(src), "--out", str(out), "--steps", STEPS, "--seed", SEED,
                     "--dask", cluster.scheduler_address, "--quiet"]) == 0
    assert _rows(out) == expected


def test_batch_command_reports_bad_options(tmp_path, capsys):
    src = tmp_path / "x.txt"
    src.write_text("braid: 1 1 1\n")
    assert main(["batch", str(src), "--out", str(tmp_path / "o"), "--shard", "3/3"]) == 2
    assert main(["batch", str(tmp_path / "missing.jsonl"), "--out", str(tmp_path / "o")]) == 2
    assert main(["batch", "--out", str(tmp_path / "never"), "--resume"]) == 2
    assert main(["batch", str(src), "--out", str(tmp_path / "o"), "--strategy", "nope"]) == 2
    err = capsys.readouterr().err
    assert "--shard" in err and "not found" in err and "no batch to resume" in err
    assert "unknown name 'nope'" in err
    assert not (tmp_path / "o").exists() and not (tmp_path / "never").exists()


def test_bridge_batch_on_knotinfo_diagrams(tmp_path):
    import kidata

    names = ["4_1", "8_19"]
    src = tmp_path / "ki.jsonl"
    src.write_text("".join(json.dumps({"id": n, "pd": kidata.knot(n).pd}) + "\n"
                           for n in names))
    out = tmp_path / "bridge"
    assert main(["batch", str(src), "--out", str(out), "--steps", "50", "--bridge",
                 "--workers", "2", "--quiet"]) == 0
    rows = _rows(out)
    assert sorted(rows) == sorted(names)
    for n in names:
        r = rows[n]
        assert r["error"] is None
        # source: KnotInfo via database-knotinfo (bridge_index)
        assert r["bridge_bounds"]["upper"] == kidata.knot(n).bridge_index
        assert r["result"]["bridges"] == r["bridge_bounds"]["upper"]
        assert r["wirtinger"]["number"] >= r["bridge_bounds"]["lower"]


_MID_ITEM = """
import sys
from plait.search.batch import run_batch
kw = dict(steps=300, seed=1, search_options={{"checkpoint_every": 0.2}})
run_batch({src!r}, {out!r}, workers=1, quiet=True,
          **(kw if sys.argv[1] == "new" else dict(resume=True)))
"""


def test_kill_minus_9_mid_item_continues_from_the_run_folder(tmp_path):
    # the first knot of the examples' survey: a 4- to 6-bridge random plat, long enough
    # for the search to write checkpoints (every 0.2 s here)
    (ident, plat), = list(random_plats(1, bridges=(4, 6), length=(40, 80), seed=2026,
                                        knot=True, prefix="survey-"))
    src = tmp_path / "one.jsonl"
    src.write_text(json.dumps({"id": ident, "plat": list(plat.word),
                               "strands": plat.strands}) + "\n")
    ref = tmp_path / "ref"
    run_batch(src, ref, steps=300, seed=1, workers=1, quiet=True,
              search_options={"checkpoint_every": 0.2})
    out = tmp_path / "out"
    script = _MID_ITEM.format(src=str(src), out=str(out))
    p = subprocess.Popen([sys.executable, "-c", script, "new"], stdout=subprocess.DEVNULL,
                         stderr=subprocess.PIPE)
    deadline = time.monotonic() + 120
    log = None
    while p.poll() is None and time.monotonic() < deadline:
        logs = list((out / "runs").glob("*/log.jsonl")) if (out / "runs").exists() else []
        if logs and '"checkpoint"' in logs[0].read_text():
            log = logs[0]
            break
        time.sleep(0.02)
    if p.poll() is None:
        p.send_signal(signal.SIGKILL)  # kill -9 in the middle of the item
    p.wait()
    assert log is not None, "the search finished before its first checkpoint"
    assert read_rows(out / "results.jsonl") == []
    done = subprocess.run([sys.executable, "-c", script, "resume"], capture_output=True,
                          text=True, timeout=300)
    assert done.returncode == 0, done.stderr
    assert '"resume"' in log.read_text()  # continued from the checkpoint, not restarted
    assert _rows(out) == _rows(ref)
