"""``plait verify``: replay a certificate and check every move."""

from __future__ import annotations

import argparse
from pathlib import Path

from plait.cli import emit_json

NAME = "verify"
HELP = "check a certificate: replay its moves from the start plat to the claimed end plat"
ORDER = 60


def configure(p: argparse.ArgumentParser) -> None:
    p.add_argument("certificate", metavar="CERT",
                   help="certificate file (JSON), or a run folder holding certificate.json")
    p.add_argument("--json", action="store_true", help="print one JSON object")


def run(args: argparse.Namespace) -> int:
    from plait.moves.certificate import load_certificate, verify_certificate

    path = Path(args.certificate)
    if path.is_dir() and (path / "certificate.json").is_file():
        path = path / "certificate.json"  # a run folder: check its certificate
    cert = load_certificate(path)
    res = verify_certificate(cert)
    if args.json:
        emit_json({
            "valid": res.ok,
            "moves": len(cert.records),
            "replayed_moves": res.steps - res.constructions if res.ok else None,
            "constructions": res.constructions if res.ok else None,
            "failed_step": res.failed_step,
            "reason": res.reason,
            "start": {"strands": cert.start.strands, "length": cert.start.length},
            "end": {"strands": cert.end.strands, "length": cert.end.length},
        })
        return 0 if res.ok else 1
    if res.ok:
        print(f"valid: {len(cert.records)} moves take a {cert.start.bridges}-bridge plat with "
              f"{cert.start.length} crossings to a {cert.end.bridges}-bridge plat with "
              f"{cert.end.length} crossings")
        print(f"steps: {res.steps - res.constructions} replayed moves, {res.constructions} "
              f"diagram constructions (rebuilt and compared)")
        return 0
    n = len(cert.records)
    if res.failed_step is None:
        where = "certificate"
    elif res.failed_step == n:
        where = "end word"
    else:  # steps are counted from 1 here, from 0 in the API
        where = f"step {res.failed_step + 1} of {n}"
    reason = res.reason if len(res.reason) <= 300 else res.reason[:297] + "..."
    print(f"invalid: {where}: {reason}")
    return 1
