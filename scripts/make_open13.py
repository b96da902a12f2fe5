"""Write examples/open13.jsonl: KnotInfo's 13-crossing knots with bridge index [3,4].

Usage: python scripts/make_open13.py [OUT] [--index VALUE]

Reads the KnotInfo package (``database-knotinfo``) and writes one JSON object per knot,
``{"id": <table name>, "pd": <PD code>}``, in table order. ``--index 4`` writes the
468 knots of 13 crossings whose bridge index the table gives as 4 instead (the
control set of docs/open13.md). The package writes the open entries as the string
``"[3,4]"``.
"""

from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))


def rows(index: str = "[3,4]", crossings: str = "13") -> list[dict]:
    """``{"id", "pd"}`` of every KnotInfo knot with this crossing number and bridge index
    (both compared as the package's strings)."""
    from database_knotinfo import link_list

    out = []
    for k in link_list():
        if k.get("crossing_number") != crossings or k.get("bridge_index") != index:
            continue
        out.append({"id": k["name"], "pd": json.loads(k["pd_notation"])})
    return out


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("out", nargs="?", default="examples/open13.jsonl")
    ap.add_argument("--index", default="[3,4]",
                    help="bridge index as KnotInfo writes it (default [3,4])")
    a = ap.parse_args(argv)
    from plait.atomic import write_text_atomic

    rs = rows(a.index)
    write_text_atomic(a.out, "".join(json.dumps(r, separators=(",", ":")) + "\n" for r in rs))
    print(f"{a.out}: {len(rs)} knots")
    return 0


if __name__ == "__main__":
    sys.exit(main())
