"""Hunting a diagram with fewer Wirtinger seeds: Reidemeister moves and plat moves, checkpointed."""

from __future__ import annotations

import hashlib
import json
import math
import random
import signal
import time
from dataclasses import dataclass, field
from itertools import combinations
from pathlib import Path

from plait.atomic import write_json_atomic
from plait.diagrams.pd import PDCode, plat_to_pd, validate_pd
from plait.diagrams.pdjones import pd_jones
from plait.diagrams.pdmoves import PDMove, apply_pd_move, canonical_key, random_pd_move, relabel
from plait.diagrams.wirtinger import DiagramArcs, diagram_arcs, wirtinger_cpsat
from plait.errors import InputError, PlaitError

__all__ = [
    "HUNT_FORMAT",
    "PROOF_FORMAT",
    "HuntResult",
    "seed_deficit",
    "hunt",
    "check_hunt_proof",
]

#: Format tag of the hunt's checkpoint ``hunt.json``.
HUNT_FORMAT = "plait-hunt-state/1"
#: Format tag of the proof file written when a diagram with fewer seeds is found.
PROOF_FORMAT = "plait-pd-moves/1"

# The hunt keeps a frontier of diagrams, each with the path that reaches it from the
# start diagram: a list of steps, each a PD move ([kind, *args], see plait.diagrams.pdmoves) or a
# plat step ["plat", strands, *word] meaning "replace the diagram by the PD code of this
# plat" (the plat came from the diagram by the Wirtinger route and plat moves; such a
# step is checked by the Jones polynomial only, like every diagram -> plat step).


def _closure_tables(arcs: DiagramArcs):
    # rules[a] = crossings (over, other under-arc, colored arc) that arc a can trigger
    m = len(arcs)
    touching: list[list[int]] = [[] for _ in range(m)]
    for j in range(len(arcs.over)):
        for a in {arcs.over[j], arcs.under_in[j], arcs.under_out[j]}:
            touching[a].append(j)
    return touching


def _closure(arcs: DiagramArcs, touching, mask: int, full: int) -> int:
    # the coloring rule applied until it stops, on a bitmask of colored arcs
    over, uin, uout = arcs.over, arcs.under_in, arcs.under_out
    stack = [a for a in range(len(arcs)) if mask >> a & 1]
    while stack and mask != full:
        a = stack.pop()
        for j in touching[a]:
            if not mask >> over[j] & 1:
                continue
            i, u = uin[j], uout[j]
            ci, cu = mask >> i & 1, mask >> u & 1
            if ci and not cu:
                mask |= 1 << u
                stack.append(u)
            elif cu and not ci:
                mask |= 1 << i
                stack.append(i)
    return mask


def seed_deficit(pd: PDCode, k: int = 3, max_sets: int = 60_000) -> tuple[int, tuple[int, ...]]:
    """Fewest arcs left uncolored by ``k`` seeds, and those seeds (arc indices).

    0 means the diagram's Wirtinger number is at most ``k``. All seed sets are tried
    when there are at most ``max_sets`` of them; otherwise every pair is extended by the
    best single arc (a lower-quality proxy, still exact when it reports 0). Closures of
    smaller seed sets are reused: the rule's closure of a union equals the closure of
    the union of closures.

    References
    ----------
    .. [1] R. Blair, A. Kjuchukova, R. Velazquez, P. Villanueva, "Wirtinger systems of
       generators of knot groups", Comm. Anal. Geom. 28 (2020).
    """
    arcs = diagram_arcs(pd)
    m = len(arcs)
    full = (1 << m) - 1
    if m <= k:
        return 0, tuple(range(m))
    touching = _closure_tables(arcs)
    one = [_closure(arcs, touching, 1 << a, full) for a in range(m)]
    best = [m + 1, ()]

    def left(mask: int) -> int:
        return m - bin(mask).count("1")

    def rec(first: int, depth: int, mask: int, chosen: tuple) -> bool:
        # every seed set extending `chosen` with arcs >= first; True when one colors all
        if depth == 0:
            if left(mask) < best[0]:
                best[0], best[1] = left(mask), chosen
            return best[0] == 0
        for c in range(first, m):
            if mask >> c & 1:
                continue  # an arc already colored adds nothing as a seed
            if rec(c + 1, depth - 1, _closure(arcs, touching, mask | one[c], full),
                   chosen + (c,)):
                return True
        if left(mask) < best[0]:  # fewer seeds than k already do this well
            best[0], best[1] = left(mask), chosen
        return False

    if math.comb(m, k) <= max_sets:
        rec(0, k, 0, ())
        return best[0], tuple(best[1])
    # too many sets: every pair, extended greedily by the best single arc each time
    for a, b in combinations(range(m), 2):
        mask, chosen = _closure(arcs, touching, one[a] | one[b], full), (a, b)
        for _ in range(k - 2):
            c = max(range(m), key=lambda c: bin(_closure(arcs, touching, mask | one[c],
                                                           full)).count("1"))
            mask, chosen = _closure(arcs, touching, mask | one[c], full), chosen + (c,)
        if left(mask) < best[0]:
            best[0], best[1] = left(mask), tuple(sorted(chosen))
            if best[0] == 0:
                break
    return best[0], tuple(best[1])


def _key(pd: PDCode) -> str:
    # diagrams equal up to relabelling share a key
    return hashlib.sha1(str(canonical_key(pd)).encode()).hexdigest()[:16]


@dataclass
class HuntResult:
    """Outcome of a hunt.

    Attributes
    ----------
    found : bool
        A diagram with at most ``target`` Wirtinger seeds was found.
    best_deficit : int
        Fewest arcs left uncolored by ``target`` seeds over every diagram seen.
    diagram : list or None
        The best diagram's PD code; ``path`` its steps from the start diagram.
    evaluated, elapsed, status : int, float, str
        Diagrams scored, seconds spent (all sessions), ``"done"``, ``"found"`` or
        ``"interrupted"``.
    proof : str or None
        Path of the proof file (written when found).
    """

    found: bool
    best_deficit: int
    diagram: list | None
    path: list = field(default_factory=list)
    evaluated: int = 0
    elapsed: float = 0.0
    status: str = "done"
    proof: str | None = None
    target: int = 3

    def to_json(self) -> dict:
        return {"found": self.found, "target": self.target, "best_deficit": self.best_deficit,
                "diagram": self.diagram, "path_length": len(self.path),
                "evaluated": self.evaluated, "elapsed": round(self.elapsed, 3),
                "status": self.status, "proof": self.proof}


def _rng_to_json(rng: random.Random) -> list:
    v, st, g = rng.getstate()
    return [v, list(st), g]


def _rng_from_json(obj: list) -> random.Random:
    rng = random.Random()
    rng.setstate((obj[0], tuple(obj[1]), obj[2]))
    return rng


def _plat_step(pd: PDCode, rng: random.Random, walk: int):
    # the diagram as a plat (Wirtinger route), a short random walk of pairing-subgroup
    # moves and braid relations, and back to a PD code
    from plait.diagrams.fromdiagram import diagram_to_plat
    from plait.moves.walk import random_walk

    plat = diagram_to_plat(pd, time_limit=0.5, directions=1, guard=False).plat
    kinds = {"twist": 1.0, "swap": 1.0, "lthread": 1.0, "rthread": 1.0, "braid": 3.0,
             "commute": 1.0, "cancel": 2.0, "absorb": 1.0}
    end, _ = random_walk(plat, walk, rng.randrange(2**31), kinds=kinds)
    if not end.word:
        return None
    return end, relabel(plat_to_pd(end).crossings)


def hunt(pd: PDCode, *, seconds: float, state_dir=None, seed: int = 0, target: int = 3,
         max_extra: int = 8, frontier_size: int = 64, plat_every: int = 40,
         checkpoint_every: float = 10.0, handle_signals: bool = True,
         evaluations: int | None = None) -> HuntResult:
    """Look for a diagram of the same knot with Wirtinger number at most ``target``.

    A best-first random search over diagrams: pick a frontier diagram (a tournament on
    the number of arcs ``target`` seeds leave uncolored, then crossings), apply one or
    two random Reidemeister moves (:mod:`plait.diagrams.pdmoves`) or, every ``plat_every``
    steps, turn it into a plat, walk in the pairing subgroup and read the PD code back.
    Every new diagram is validated and must have the start's Jones polynomial. The
    score is :func:`seed_deficit` (exact for diagrams of up to about 70 arcs).

    Parameters
    ----------
    pd : PDCode
        The start diagram (a knot).
    seconds : float
        Budget over all sessions of this hunt (resumed hunts count earlier time).
    evaluations : int, optional
        Stop after scoring this many diagrams (all sessions): a reproducible budget.
    state_dir : path, optional
        Folder for ``hunt.json`` (checkpoint, written atomically) and ``proof.json``.
        A folder holding a checkpoint of the same start diagram continues it.
    seed : int
        Random seed.
    target : int
        Seeds wanted (3 for the open 13-crossing entries).
    max_extra : int
        Diagrams may have at most this many more crossings than the start.
    frontier_size, plat_every, checkpoint_every
        Search knobs.
    handle_signals : bool
        Turn SIGINT/SIGTERM into a clean stop (checkpoint, status ``"interrupted"``).

    Returns
    -------
    HuntResult

    References
    ----------
    .. [1] R. Blair, A. Kjuchukova, R. Velazquez, P. Villanueva, "Wirtinger systems of
       generators of knot groups", Comm. Anal. Geom. 28 (2020).
    .. [2] K. Reidemeister, "Elementare Begründung der Knotentheorie" (1927).
    .. [3] J. S. Birman, "On the stable equivalence of plat representations of knots and
       links", Canad. J. Math. 28 (1976).
    """
    if not (seconds >= 0 and math.isfinite(seconds)):
        raise InputError(f"--hunt must be a finite, non-negative number of seconds, got {seconds}")
    start = relabel(pd.crossings)
    jones0 = pd_jones(start)
    folder = None if state_dir is None else Path(state_dir)
    st_path = None if folder is None else folder / "hunt.json"
    # frontier entries: [deficit, crossings, pd (list), path (list of steps)]
    if st_path is not None and st_path.exists():
        try:
            st = json.loads(st_path.read_text(encoding="utf-8"))
        except (OSError, json.JSONDecodeError) as exc:
            raise InputError(f"{st_path}: unreadable hunt state ({exc})") from None
        if st.get("format") != HUNT_FORMAT or st.get("start") != start.to_list():
            raise InputError(f"{st_path}: a hunt of another diagram; use another folder")
        rng = _rng_from_json(st["rng"])
        frontier = st["frontier"]
        seen = set(st["seen"])
        best = st["best"]
        evaluated, elapsed = st["evaluated"], st["elapsed"]
    else:
        rng = random.Random(seed)
        d0, _ = seed_deficit(start, target)
        frontier = [[d0, start.length, start.to_list(), []]]
        seen = {_key(start)}
        best = list(frontier[0])
        evaluated, elapsed = 1, 0.0

    def save(status: str) -> None:
        if st_path is None:
            return
        folder.mkdir(parents=True, exist_ok=True)
        write_json_atomic(st_path, {
            "format": HUNT_FORMAT, "start": start.to_list(), "status": status,
            "target": target, "seed": seed, "evaluated": evaluated,
            "elapsed": round(elapsed, 3), "best": best, "frontier": frontier,
            "seen": sorted(seen), "rng": _rng_to_json(rng)})

    stop = {"flag": False}
    old = {}
    if handle_signals:
        def on_signal(signum, frame):  # noqa: ARG001
            stop["flag"] = True
        for sig in (signal.SIGINT, signal.SIGTERM):
            old[sig] = signal.signal(sig, on_signal)
    t_start = time.monotonic()
    base = elapsed
    last_save = t_start
    status = "done"
    try:
        while best[0] > 0:
            elapsed = base + time.monotonic() - t_start
            if elapsed >= seconds or (evaluations is not None and evaluated >= evaluations):
                break
            if stop["flag"]:
                status = "interrupted"
                break
            pick = min(rng.sample(frontier, min(3, len(frontier))), key=lambda e: (e[0], e[1]))
            cur = PDCode(tuple(tuple(c) for c in pick[2]))
            path = list(pick[3])
            try:
                if plat_every and rng.randrange(plat_every) == 0:
                    got = _plat_step(cur, rng, rng.randrange(5, 30))
                    if got is None:
                        continue
                    plat, new = got
                    path.append(["plat", plat.strands, *plat.word])
                else:
                    new = cur
                    for _ in range(rng.choice((1, 1, 2))):
                        mv = random_pd_move(new, rng)
                        if mv is None:
                            break
                        new = apply_pd_move(new, mv)
                        path.append(mv.to_json())
            except PlaitError:
                continue
            if new.length > start.length + max_extra or new.length == 0:
                continue
            k = _key(new)
            if k in seen:
                continue
            seen.add(k)
            if pd_jones(new) != jones0:  # guard: every diagram is the start's knot
                raise AssertionError("a move changed the Jones polynomial")
            evaluated += 1
            d, _seeds = seed_deficit(new, target)
            entry = [d, new.length, new.to_list(), path]
            if (d, new.length) < (best[0], best[1]):
                best = entry
            frontier.append(entry)
            if len(frontier) > frontier_size:
                frontier.sort(key=lambda e: (e[0], e[1]))
                # keep the best half and a random sample of the rest (diversity)
                keep = frontier[: frontier_size // 2]
                rest = frontier[frontier_size // 2:]
                keep += rng.sample(rest, frontier_size // 2 - 1)
                frontier = keep
            if time.monotonic() - last_save > checkpoint_every:
                save("running")
                last_save = time.monotonic()
        elapsed = base + time.monotonic() - t_start
        found = best[0] == 0
        if found:
            status = "found"
        save(status)
        proof = None
        if found and folder is not None:
            proof = str(write_hunt_proof(folder / "proof.json", start, best[3], target))
        return HuntResult(found, best[0], best[2], best[3], evaluated, elapsed, status, proof,
                          target)
    finally:
        for sig, h in old.items():
            signal.signal(sig, h)


def _apply_step(cur: PDCode, step: list) -> PDCode:
    if step and step[0] == "plat":
        from plait.word import PlatWord

        plat = PlatWord(step[1], tuple(step[2:]))
        return relabel(plat_to_pd(plat).crossings)
    return apply_pd_move(cur, PDMove.from_json(step))


def write_hunt_proof(path, start: PDCode, steps: list, target: int = 3) -> Path:
    """Write the proof file of a hunt that reached ``target`` seeds.

    Layout (JSON): ``format`` (``"plait-pd-moves/1"``), ``start`` (PD code), ``steps``
    (PD moves and plat steps, see :mod:`plait.search.hunt`), ``diagrams`` (the PD code
    after each step), ``seeds`` (arcs of the last diagram, as lists of edge labels, that
    color it), ``plat`` (a plat with ``target`` bridges built from the last diagram by
    the Wirtinger route) and ``jones`` of the start.
    """
    from plait.diagrams.fromdiagram import diagram_to_plat

    cur = start
    diagrams = []
    for s in steps:
        cur = _apply_step(cur, s)
        diagrams.append(cur.to_list())
    d, seeds = seed_deficit(cur, target)
    if d:
        raise AssertionError("the last diagram is not colored by the target seeds")
    arcs = diagram_arcs(cur)
    dp = diagram_to_plat(cur, time_limit=30.0)
    obj = {
        "format": PROOF_FORMAT,
        "claim": f"the start diagram and the last diagram are the same knot, and {target} "
                 f"seed arcs color the last one, so its bridge number is at most {target}",
        "start": start.to_list(),
        "steps": steps,
        "diagrams": diagrams,
        "seeds": [list(arcs.arcs[a]) for a in seeds],
        "plat": {"strands": dp.plat.strands, "word": list(dp.plat.word)},
        "jones": {str(k): v for k, v in sorted(pd_jones(start).items())},
    }
    write_json_atomic(path, obj)
    return Path(path)


def check_hunt_proof(obj: dict) -> tuple[bool, str]:
    """Check a proof file from scratch: replay every step with a fresh validation of its
    PD code, the start's Jones polynomial at every diagram, the claimed diagrams, the seed
    arcs coloring the last diagram, and the plat's Jones polynomial.

    Returns
    -------
    (bool, str)
        Whether every check passes, and the first failure.
    """
    from plait.diagrams.pdjones import plat_jones
    from plait.diagrams.wirtinger import coloring_steps
    from plait.word import PlatWord

    if not isinstance(obj, dict) or obj.get("format") != PROOF_FORMAT:
        return False, f"not a {PROOF_FORMAT} file"
    try:
        cur = validate_pd(obj["start"])
        j0 = pd_jones(cur)
        if len(obj["steps"]) != len(obj["diagrams"]):
            return False, "steps and diagrams differ in number"
        for t, (s, want) in enumerate(zip(obj["steps"], obj["diagrams"], strict=True)):
            nxt = validate_pd(_apply_step(cur, s).crossings)
            if nxt.to_list() != validate_pd(want).to_list():
                return False, f"step {t}: the replayed diagram differs from the recorded one"
            if pd_jones(nxt) != j0:
                return False, f"step {t}: Jones polynomial changed"
            cur = nxt
        arcs = diagram_arcs(cur)
        idx = {tuple(a): i for i, a in enumerate(arcs.arcs)}
        seeds = [idx.get(tuple(a)) for a in obj["seeds"]]
        if None in seeds:
            return False, "a seed is not an arc of the last diagram"
        if coloring_steps(arcs, seeds) is None:
            return False, "the seeds do not color the last diagram"
        p = obj["plat"]
        plat = PlatWord(p["strands"], tuple(p["word"]))
        if plat.bridges != len(seeds):
            return False, "the plat has another number of bridges than seeds"
        if plat_jones(plat) != j0:
            return False, "the plat's Jones polynomial differs from the start's"
    except (PlaitError, KeyError, TypeError, ValueError) as exc:
        return False, f"malformed proof ({exc})"
    return True, ""


def wirtinger_upper(pd: PDCode, time_limit: float = 5.0) -> int:
    """Seeds found by the CP-SAT solver within ``time_limit`` (an upper bound on ω)."""
    return wirtinger_cpsat(pd, time_limit=time_limit).number


def hunt_report(rep, pres, *, seconds: float, state_dir, seed: int = 0,
                handle_signals: bool = True) -> dict:
    """Spend a long budget on both sides of a :class:`plait.bridge.BridgeReport` that is
    not certified, and update it in place.

    Upper side: :func:`hunt` from the input diagram (a PD code as given, or the diagram
    of the report's plat) for a diagram with one seed fewer than the upper bound; when
    found, the plat of the proof file becomes the report's plat. Lower side:
    :func:`plait.scoring.bounds.bridge_lower_bound` again, first, with half the seconds as
    its CPU budget; the upper side then gets the rest of ``seconds`` (wall clock, at least
    half), so an easy lower side leaves nearly the whole budget to the diagram hunt.

    Returns
    -------
    dict
        The hunt's JSON (``HuntResult.to_json`` plus ``lower_budget`` and
        ``lower_seconds``, the wall seconds the lower side took), also stored in
        ``rep.search["hunt"]``.
    """
    from plait.diagrams.pd import PDCode as _PD
    from plait.scoring.bounds import bridge_lower_bound
    from plait.word import PlatWord

    out: dict = {"seconds": seconds, "state_dir": None if state_dir is None else str(state_dir)}
    if rep.certified:
        out["skipped"] = "already certified"
        rep.search["hunt"] = out
        return out
    if isinstance(pres, _PD):
        start = pres
    else:
        start = relabel(plat_to_pd(rep.result).crossings)
    # lower side first: the stronger obstructions get half the seconds as their CPU
    # budget; the upper side gets what they leave of the whole (at least the other half)
    t0 = time.monotonic()
    lb = bridge_lower_bound(rep.result, budget=seconds / 2)
    lower_spent = time.monotonic() - t0
    seconds_up = max(seconds / 2, seconds - lower_spent)
    out["lower_budget"] = seconds / 2
    out["lower_seconds"] = round(lower_spent, 3)
    if lb.value > rep.lower:
        rep.lower = lb.value
        rep.lower_reasons[:] = list(lb.reasons)
    if rep.certified:
        out["skipped"] = "certified by the lower bounds"
        rep.search["hunt"] = out
        return out
    res = hunt(start, seconds=seconds_up, state_dir=state_dir, seed=seed,
               target=rep.upper - 1, handle_signals=handle_signals)
    out.update(res.to_json())
    if res.found and res.proof:
        proof = json.loads(Path(res.proof).read_text(encoding="utf-8"))
        ok, why = check_hunt_proof(proof)
        if not ok:  # pragma: no cover - the hunt writes only proofs that check
            raise AssertionError(f"hunt proof does not check: {why}")
        p = proof["plat"]
        rep.result = PlatWord(p["strands"], tuple(p["word"]))
        rep.upper = rep.result.bridges
        # a certificate from the start diagram that `plait verify` checks: the start plat
        # is checked against the diagram's Jones polynomial, as for every PD input
        from plait.moves.certificate import write_certificate

        cert = Path(state_dir) / "certificate.json"
        write_certificate(cert, rep.result, [], rep.result, {"pd": start.to_list()},
                          meta={"from": "hunt", "proof": res.proof})
        out["certificate"] = str(cert)
        rep.upper_reasons.append(
            f"the hunt found a diagram with Wirtinger number {res.target} after "
            f"{len(res.path)} diagram steps (proof {res.proof}; Reidemeister moves replayed, "
            f"Jones polynomial equal at every step)")
    rep.search["hunt"] = out
    return out
