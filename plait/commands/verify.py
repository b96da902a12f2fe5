"""``plait verify``: replay a certificate and check every move."""

from __future__ import annotations

import argparse
from pathlib import Path

from plait.cli import emit_json

NAME = "verify"
HELP = ("check a certificate: replay its moves from the start plat to the claimed end plat "
        "(or re-check a meridional-rank proof file)")
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
    if path.is_file():
        rc = _rank_proof(path, args.json)  # a meridional-rank proof file
        if rc is not None:
            return rc
    cert = load_certificate(path)
    res = verify_certificate(cert)
    named = ""
    if res.ok and isinstance(cert.meta.get("table"), dict):
        # a naming certificate (plait name): the end plat must be the table entry's
        from plait.names import check_table_claim, describe_claim, tables_installed

        why = check_table_claim(cert.meta, cert.end) if tables_installed() else ""
        if not tables_installed():
            named = "not checked against the table (pip install 'plait[tables]')"
        elif why:
            from plait.moves.replay import ReplayResult

            res = ReplayResult(False, None, None, f"table claim: {why}", res.steps)
        else:
            named = describe_claim(cert.meta)
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
            **({"name": named} if named else {}),
        })
        return 0 if res.ok else 1
    if res.ok:
        print(f"valid: {len(cert.records)} moves take a {cert.start.bridges}-bridge plat with "
              f"{cert.start.length} crossings to a {cert.end.bridges}-bridge plat with "
              f"{cert.end.length} crossings")
        if named:
            print(f"name:  {named}")
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


def _rank_proof(path: Path, as_json: bool) -> int | None:
    """Check ``path`` when it is a rank proof (format plait-rank-proof/1); None otherwise."""
    from plait.scoring.rankproof import check_rank_proof, is_rank_proof, load_rank_proof

    try:
        with open(path, encoding="utf-8") as fh:
            if '"plait-rank-proof/1"' not in fh.read(4096):
                return None
    except (OSError, UnicodeDecodeError):
        return None
    obj = load_rank_proof(path)
    if not is_rank_proof(obj):
        return None
    res = check_rank_proof(obj)
    if as_json:
        emit_json({"valid": res.ok, "kind": "rank-proof", "bound": res.bound,
                   "image_size": res.image_size, "exact": res.exact, "reason": res.message})
    else:
        print(res.message)
    return 0 if res.ok else 1
