"""``plait invariants``: knot invariants of a presentation and a lower bound on its bridges."""

from __future__ import annotations

import argparse
from fractions import Fraction

from plait.cli import add_bounds_time_argument, add_input_arguments, emit_json, load_input
from plait.convert import to_plat
from plait.word import PlatWord

NAME = "invariants"
HELP = "print Jones and Alexander polynomials, determinant, linking and a bridge lower bound"
ORDER = 20


def configure(p: argparse.ArgumentParser) -> None:
    add_input_arguments(p)
    p.add_argument("--json", action="store_true", help="print one JSON object")
    add_bounds_time_argument(p)


def _pairs(poly: dict) -> list[list]:
    """``{exponent: coefficient}`` as ``[[exponent, coefficient], ...]`` sorted by exponent;
    integral exponents as ints, half-integers as floats."""
    out = []
    for e in sorted(poly):
        f = Fraction(e)
        out.append([int(f) if f.denominator == 1 else float(f), int(poly[e])])
    return out


def _poly_text(poly: dict, var: str = "t") -> str:
    if not poly:
        return "0"
    parts = []
    for e in sorted(poly):
        c = int(poly[e])
        f = Fraction(e)
        sign = "-" if c < 0 else "+"
        mag = abs(c)
        if f == 0:
            term = f"{mag}"
        else:
            power = var if f == 1 else f"{var}^{f}" if f.denominator == 1 else f"{var}^({f})"
            term = power if mag == 1 else f"{mag}{power}"
        parts.append((sign, term))
    head_sign, head = parts[0]
    text = ("-" if head_sign == "-" else "") + head
    for sign, term in parts[1:]:
        text += f" {sign} {term}"
    return text


def invariants_report(plat: PlatWord, budget: float | None = None) -> dict:
    """The JSON object printed by ``plait invariants --json`` for a plat.

    Keys: ``jones`` and ``alexander`` (lists of ``[exponent, coefficient]`` sorted by
    exponent), ``determinant``, ``signature``, ``components``, ``linking`` (the linking
    matrix, links only), ``plat`` (strands, bridges, length of the plat used) and
    ``bridge_lower_bound`` (``value``, ``reasons``, ``method``, ``exact``).
    """
    from plait.scoring import alexander, determinant, jones, linking_matrix
    from plait.scoring.bounds import bridge_lower_bound
    from plait.scoring.signature import signature

    out: dict = {
        "jones": _pairs(jones(plat)),
        "alexander": _pairs(alexander(plat)),
        "determinant": int(determinant(plat)),
        "signature": int(signature(plat)),
        "components": plat.components,
    }
    if plat.components > 1:
        out["linking"] = linking_matrix(plat)
    out["plat"] = {"strands": plat.strands, "bridges": plat.bridges, "length": plat.length}
    out["bridge_lower_bound"] = bridge_lower_bound(plat, budget).to_dict()
    return out


def run(args: argparse.Namespace) -> int:
    from plait.scoring.bounds import check_budget

    budget = check_budget(args.bounds_time, "--bounds-time")
    plat = to_plat(load_input(args))
    rep = invariants_report(plat, budget)
    if args.json:
        emit_json(rep)
        return 0
    jones_poly = {Fraction(e).limit_denominator(2): c for e, c in rep["jones"]}
    alex_poly = {e: c for e, c in rep["alexander"]}
    comps = rep["components"]
    lb = rep["bridge_lower_bound"]
    print(f"plat: {plat.bridges} bridge{'s' * (plat.bridges != 1)}, "
          f"{plat.length} crossing{'s' * (plat.length != 1)}, "
          f"{comps} component{'s' * (comps != 1)}")
    print(f"Jones polynomial:     {_poly_text(jones_poly)}")
    print(f"Alexander polynomial: {_poly_text(alex_poly)}")
    print(f"determinant:          {rep['determinant']}")
    print(f"signature:            {rep['signature']}")
    if "linking" in rep:
        print("linking matrix:       " + "; ".join(" ".join(str(v) for v in row)
                                                for row in rep["linking"]))
    status = " (attained by this plat)" if lb["exact"] else ""
    print(f"bridge number ≥ {lb['value']}{status} [proved by: {lb['method']}]")
    for r in lb["reasons"]:
        print(f"  - {r}")
    return 0
