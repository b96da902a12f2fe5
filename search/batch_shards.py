"""Batch shards: stable seeds, shards and run-folder names per item, and merging shard folders."""

from __future__ import annotations

import hashlib
import json
import os
import re
from pathlib import Path

from plait.atomic import write_json_atomic, write_text_atomic
from plait.errors import InputError
from plait.search.batch_files import (
    BATCH_FORMAT,
    CONFIG_FILE,
    RESULTS_FILE,
    batch_lock,
    ordered_rows,
    read_rows,
    summarize,
    write_outputs,
)

__all__ = ["item_seed", "shard_of", "parse_shard", "run_folder_name", "in_shard",
           "merge_batches"]


def _digest(*parts: object) -> int:
    h = hashlib.sha256("\x00".join(str(p) for p in parts).encode("utf-8")).digest()
    return int.from_bytes(h[:8], "big")


def item_seed(seed: int, ident: str) -> int:
    """Seed of one item, derived from the batch seed and the item's id only.

    The value is the first 63 bits of SHA-256 of ``"seed\\0id"``; it does not depend on
    the number of workers, the order of completion or the shard, so every way of running
    a batch gives each item the same search.
    """
    return _digest("seed", seed, ident) >> 1


def shard_of(ident: str, count: int) -> int:
    """Shard (``0 .. count-1``) that owns the item ``ident``: SHA-256 of the id modulo
    ``count``. Stable across machines and Python runs (unlike the built-in ``hash``)."""
    if count < 1:
        raise InputError(f"shard count must be at least 1, got {count}")
    return _digest("shard", ident) % count


def parse_shard(text: str | None) -> tuple[int, int] | None:
    """``"K/N"`` (``0 <= K < N``) as ``(K, N)``; ``None`` stays ``None``."""
    if text is None:
        return None
    m = re.fullmatch(r"\s*(\d+)\s*/\s*(\d+)\s*", str(text))
    if not m:
        raise InputError(f"--shard: expected K/N such as 0/4, got {text!r}")
    k, n = int(m.group(1)), int(m.group(2))
    if n < 1 or not 0 <= k < n:
        raise InputError(f"--shard: need 0 <= K < N, got {k}/{n}")
    return k, n


def run_folder_name(ident: str) -> str:
    """Folder name of an item's run folder: the id made file-name safe (at most 40
    characters) plus 10 hex digits of its SHA-256, so distinct ids never share a folder."""
    safe = re.sub(r"[^A-Za-z0-9._-]+", "_", ident).strip("._")[:40] or "item"
    return f"{safe}-{hashlib.sha256(ident.encode('utf-8')).hexdigest()[:10]}"


def in_shard(ident: str, shard) -> bool:
    return shard is None or shard_of(ident, shard[1]) == shard[0]


def merge_batches(folders: list[str | os.PathLike], out: str | os.PathLike) -> dict:
    """Combine the folders of the shards of one batch into ``out``: ``results.jsonl`` and
    ``results.csv`` in input order, ``summary.json`` (and ``summary.svg``), and a
    ``batch.json`` naming the shards. Run folders stay where they are (rows keep their
    paths).

    Raises
    ------
    InputError
        When the folders are not shards of one batch (different input, seed, budgets or
        shard count), a shard appears twice, or two shards hold the same id.
    """
    if not folders:
        raise InputError("batch-merge: give at least one shard folder")
    out = Path(out).resolve()
    cfgs, all_rows, seen_shards = [], {}, set()
    keys = ("input_sha256", "seed", "steps", "time", "strategy", "bridge", "search_options",
            "items_total")
    for folder in folders:
        folder = Path(folder).resolve()
        cfg_path = folder / CONFIG_FILE
        try:
            cfg = json.loads(cfg_path.read_text(encoding="utf-8"))
        except FileNotFoundError:
            raise InputError(f"{folder}: not a batch folder (no {CONFIG_FILE})") from None
        except (OSError, json.JSONDecodeError) as exc:
            raise InputError(f"{cfg_path}: unreadable ({exc})") from None
        if cfg.get("format") != BATCH_FORMAT or cfg.get("merged_from") is not None:
            raise InputError(f"{folder}: not a shard folder of a plait batch")
        if cfgs:
            for k in keys:
                if cfg.get(k) != cfgs[0].get(k):
                    raise InputError(f"{folder}: {k} = {cfg.get(k)!r} differs from "
                                     f"{folders[0]} ({cfgs[0].get(k)!r}); not one batch")
        shard = tuple(cfg["shard"]) if cfg.get("shard") is not None else (0, 1)
        if cfgs and shard[1] != (tuple(cfgs[0]["shard"]) if cfgs[0].get("shard") else (0, 1))[1]:
            raise InputError(f"{folder}: shard {shard[0]}/{shard[1]} is from another split")
        if shard in seen_shards:
            raise InputError(f"{folder}: shard {shard[0]}/{shard[1]} given twice")
        seen_shards.add(shard)
        cfgs.append(cfg)
        for row in read_rows(folder / RESULTS_FILE):
            if row["id"] in all_rows:
                raise InputError(f"{folder}: id {row['id']!r} is also in another shard")
            all_rows[row["id"]] = row
    if out in {Path(f).resolve() for f in folders}:
        raise InputError("batch-merge: --out must be a new folder, not one of the shards")
    out_cfg = out / CONFIG_FILE
    if out_cfg.exists():
        try:
            old = json.loads(out_cfg.read_text(encoding="utf-8"))
        except (OSError, json.JSONDecodeError):
            old = {}
        if old.get("merged_from") is None:
            raise InputError(f"{out} holds a batch that is not a merge; choose another --out")
    elif (out / RESULTS_FILE).exists():
        raise InputError(f"{out} holds results; choose another --out")
    n = cfgs[0]["shard"][1] if cfgs[0].get("shard") else 1
    merged = {k: cfgs[0].get(k) for k in ("format", "input") + keys}
    merged.update({"shard": None, "items": cfgs[0]["items_total"],
                   "merged_from": [str(Path(f).resolve()) for f in folders],
                   "shards_present": sorted(k for k, _ in seen_shards), "shard_count": n})
    rows = ordered_rows(all_rows.values())
    out.mkdir(parents=True, exist_ok=True)
    with batch_lock(out):
        write_json_atomic(out_cfg, merged)
        write_text_atomic(out / RESULTS_FILE,
                          "".join(json.dumps(r, separators=(", ", ": ")) + "\n" for r in rows))
        summary = summarize(rows, cfgs[0]["items_total"])
        summary["shards_present"] = merged["shards_present"]
        summary["shard_count"] = n
        write_outputs(out, rows, summary)
    return summary
