"""The bridge-number report: upper bounds from diagrams and search, lower bounds from invariants."""

from __future__ import annotations

from dataclasses import dataclass, field
from itertools import chain

from plait.diagrams.fromdiagram import SWEEPS, diagram_to_plat
from plait.diagrams.pd import PDCode, plat_to_pd, validate_pd
from plait.diagrams.wirtinger import Wirtinger
from plait.errors import InputError
from plait.formats import Presentation
from plait.word import PlatWord

__all__ = ["BridgeReport", "bridge_report"]


@dataclass
class BridgeReport:
    """Bounds on the bridge number of a link, each with its reason.

    Attributes
    ----------
    lower, upper : int
        ``lower <= bridge number <= upper``; certified when equal.
    lower_reasons, upper_reasons : list of str
        One line per bound (theorem and computed quantity).
    result : PlatWord
        A plat with ``upper`` bridges.
    wirtinger : Wirtinger or None
        Seeds of the diagram that gave the first plat (the input PD code, or the input
        plat's own diagram).
    search : dict
        The JSON of the search run (:meth:`plait.search.api.ReduceResult.to_json`).
    factors : list of plait.diagrams.composite.Factor
        The factors of a composite knot, when a confirmed decomposing circle was found
        (:func:`plait.diagrams.composite.with_factors`); empty otherwise.
    """

    lower: int
    upper: int
    lower_reasons: list[str]
    upper_reasons: list[str]
    result: PlatWord
    wirtinger: Wirtinger | None
    search: dict = field(default_factory=dict)
    factors: list = field(default_factory=list)

    @property
    def certified(self) -> bool:
        return self.lower == self.upper

    def to_json(self) -> dict:
        """The JSON contract of ``plait bridge --json``: the object of ``plait reduce
        --json`` with ``bridge_bounds`` filled from both sides, plus ``wirtinger`` and
        the result's ``pd`` code."""
        obj = dict(self.search)
        r = self.result
        obj["result"] = {"strands": r.strands, "word": list(r.word), "bridges": r.bridges,
                         "length": r.length}
        obj["bridge_bounds"] = {
            "lower": self.lower,
            "upper": self.upper,
            "certified": self.certified,
            "reasons": list(self.lower_reasons),
            "upper_reasons": list(self.upper_reasons),
        }
        w = self.wirtinger
        obj["wirtinger"] = None if w is None else {
            "number": w.number,
            "seeds": [list(w.arcs.arcs[a]) for a in w.seeds],
            "proven_minimal": w.proven_minimal,
        }
        obj["pd"] = _pd_list(r)
        obj["factors"] = [f.to_json() for f in self.factors]
        return obj


def _pd_list(plat: PlatWord) -> list | None:
    try:
        return plat_to_pd(plat).to_list()
    except InputError:
        return None  # a crossingless component (or unlink) has no PD code


def _diagram_bound(pd: PDCode, time_limit: float, what: str):
    d = diagram_to_plat(pd, time_limit=time_limit, sweeps=SWEEPS)
    w = d.wirtinger
    if w is None:
        return d.plat, None, f"{what} has no crossings: the unknot, 1 bridge"
    proven = "proven minimal" if w.proven_minimal else "not proven minimal"
    return d.plat, w, (
        f"{what} has Wirtinger number {w.number} ({proven}; seeds are arcs "
        f"{', '.join(str(list(w.arcs.arcs[a])) for a in w.seeds)}); its bridge position "
        f"gives a plat with {d.plat.bridges} bridge{'s' * (d.plat.bridges != 1)} "
        f"(Blair–Kjuchukova–Ozawa: the "
        f"Wirtinger number of a diagram is its perpendicular bridge number)")


def bridge_report(pres: Presentation, *, time: float | None = None, steps: int | None = None,
                  seed: int = 0, run_dir=None, quiet: bool = True,
                  wirtinger_time: float = 10.0, handle_signals: bool = True,
                  runs_root=None, budget: float | None = None,
                  hunt: float | None = None, hunt_dir=None) -> BridgeReport:
    """Estimate the bridge number of a link: convert, search, and bound from both sides.

    Runs exactly the search of ``plait reduce`` (:func:`plait.search.reduce`, strategy
    ``auto``, objective ``bridges``), so both commands give the same best plat for the
    same input, seed and step budget; this function only adds the report. Upper bounds:
    the plat built from the input diagram's Wirtinger coloring (a PD code), the diagram
    steps of the search (plats rebuilt from Wirtinger colorings of visited plats'
    diagrams) and its best plat. Lower bounds: the invariants of
    :func:`plait.scoring.bounds.bridge_lower_bound`, as computed by the search.

    Parameters
    ----------
    pres : PlatWord, ClosedBraid or PDCode
    time, steps, seed, run_dir, quiet, handle_signals, runs_root
        Passed to :func:`plait.search.reduce` (``steps=0`` skips the search moves).
    wirtinger_time : float
        Seconds for the Wirtinger solve of an input PD code (the report's reason).
    budget : float, optional
        Seconds for each computation of the lower bounds (the slow methods that do not
        fit are reported as "not tried: …"); None: no limit. The bounds are computed at
        the start of the search (so that it stops once certified) and again on the best
        plat found (fewest bridges, then shortest), cached by the knot's fingerprint
        within the run: a knot's bounds are recomputed only on a strictly simpler plat.
    hunt : float, optional
        Seconds for a long search on both sides when the bounds differ
        (:func:`plait.search.hunt.hunt_report`); checkpointed in ``hunt_dir`` (default:
        ``hunt`` inside the run folder), where a later call continues it.

    Returns
    -------
    BridgeReport

    References
    ----------
    .. [1] R. Blair, A. Kjuchukova, M. Ozawa, "The incompatibility of crossing number and
       bridge number for knot diagrams", Discrete Math. 344 (2021).
    .. [2] J. S. Birman, "On the stable equivalence of plat representations of knots and
       links", Canad. J. Math. 28 (1976).
    """
    from plait.scoring.bounds import check_budget
    from plait.search import reduce

    budget = check_budget(budget)
    upper_reasons: list[str] = []
    wirt: Wirtinger | None = None
    if isinstance(pres, PDCode):
        # the same conversion reduce makes (deterministic), kept here for its reason
        _p, wirt, why = _diagram_bound(pres, wirtinger_time, "the input diagram")
        upper_reasons.append(why)
    kw = {} if runs_root is None else {"runs_root": runs_root}
    # one answer: the search path of plait reduce, with its defaults (strategy auto,
    # objective bridges); its diagram steps rebuild plats from Wirtinger colorings
    res = reduce(pres, time=time, steps=steps, seed=seed, run_dir=run_dir, quiet=quiet,
                 objective="bridges", handle_signals=handle_signals, bounds_budget=budget,
                 **kw)
    best, start = res.result, res.input
    search = res.to_json()
    lower, lower_reasons = res.lower, list(res.reasons)
    if lower < best.bridges and res.status == "done":
        # the bounds again on the best plat (reached by the search's certified moves),
        # unless this knot's bounds were already computed on a plat at least as simple
        cache = RunBounds()
        cache.put(res.input, res.lower, res.reasons)
        got = cache.get_or_compute(best, budget)
        if got[0] > lower or (got[0] == lower and not _has_not_tried(got[1])
                              and _has_not_tried(lower_reasons)):
            lower, lower_reasons = got
    if not isinstance(pres, PDCode):
        upper_reasons.append(f"the input as a plat has {start.bridges} bridges")
    steps_wirt = _diagram_steps(res)
    for t, plat_before, data in steps_wirt:
        upper_reasons.append(
            f"diagram step {t} of the certificate: the diagram of a {plat_before.bridges}-"
            f"bridge plat on the path"
            + (f", redrawn by {len(data.redraw)} Reidemeister moves," if data.redraw else "")
            + f" has a Wirtinger coloring from {data.number} seeds; its "
            f"bridge position gives a plat with {data.number} bridges (Blair–Kjuchukova–"
            f"Ozawa: the Wirtinger number of a diagram is its perpendicular bridge number)")
    if wirt is None and steps_wirt:
        wirt = _wirtinger_of(*steps_wirt[-1][1:])
    if best.bridges < start.bridges:
        upper_reasons.append(f"the search found a plat with {best.bridges} bridges "
                             f"(certificate {res.certificate})")
    upper = best.bridges
    if lower > upper:  # pragma: no cover - would be a contradiction between theorems
        raise AssertionError(f"lower bound {lower} exceeds upper bound {upper}")
    rep = BridgeReport(lower, upper, lower_reasons, upper_reasons, best, wirt, search)
    if best.components == 1 and res.status != "interrupted":
        # a composite knot: bound its factors and add (Schubert 1954)
        from plait.convert import to_plat
        from plait.diagrams.composite import visited_diagrams, with_factors

        given = pres if isinstance(pres, PDCode) else _pd_or_none(to_plat(pres))
        diagrams = chain([("the input diagram", given),
                          ("the start plat's diagram", _pd_or_none(start)),
                          ("the best plat's diagram", _pd_or_none(best))],
                         visited_diagrams(res.certificate))
        rep = with_factors(rep, diagrams, time=time, steps=steps, seed=seed,
                           wirtinger_time=wirtinger_time, handle_signals=handle_signals,
                           runs_root=runs_root, budget=budget,
                           run_dir=search.get("run_dir") or None)
    if hunt:
        from pathlib import Path

        from plait.search.hunt import hunt_report

        hdir = Path(hunt_dir) if hunt_dir is not None else Path(res.run_dir) / "hunt"
        hunt_report(rep, pres, seconds=hunt, state_dir=hdir, seed=seed,
                    handle_signals=handle_signals)
    return rep


def _has_not_tried(reasons: list[str] | tuple[str, ...]) -> bool:
    return any(r.startswith("not tried:") for r in reasons)


class RunBounds:
    """Lower bounds of one knot within one run, keyed by its cheap fingerprint.

    Every plat offered belongs to the same run, so to the same knot (the search's moves
    certify it); the fingerprint is only the key. A knot's bounds are (re)computed on a
    plat strictly simpler (fewer bridges, then fewer letters) than the one they were
    computed on, and the best bound is kept.
    """

    def __init__(self) -> None:
        # fingerprint JSON -> ((bridges, length) of the plat used, bound, reasons)
        self._seen: dict[str, tuple[tuple[int, int], int, list[str]]] = {}

    @staticmethod
    def _key(plat: PlatWord) -> str:
        import json

        from plait.scoring import fingerprint

        return json.dumps(fingerprint(plat, "cheap").to_json(), sort_keys=True)

    def put(self, plat: PlatWord, value: int, reasons: list[str]) -> None:
        self._seen[self._key(plat)] = ((plat.bridges, plat.length), value, list(reasons))

    def get_or_compute(self, plat: PlatWord, budget: float | None) -> tuple[int, list[str]]:
        from plait.scoring.bounds import bridge_lower_bound

        key = self._key(plat)
        old = self._seen.get(key)
        if old is not None and old[0] <= (plat.bridges, plat.length):
            return old[1], old[2]
        lb = bridge_lower_bound(plat, budget)
        value, reasons = int(lb.value), [str(r) for r in lb.reasons]
        if old is not None and old[1] > value:
            value, reasons = old[1], old[2]
        self._seen[key] = ((plat.bridges, plat.length), value, reasons)
        return value, reasons


def _pd_or_none(plat: PlatWord) -> PDCode | None:
    if not plat.word:
        return None
    try:
        return validate_pd(plat_to_pd(plat).crossings)
    except InputError:
        return None


def _diagram_steps(res) -> list:
    """``(1-based step, plat before, RebridgeData)`` of every diagram step on the
    certificate of a search result (the plats by the fast replay)."""
    from plait.moves import apply_move, load_certificate
    from plait.moves.rebridge import decode

    if not res.certificate:
        return []
    cert = load_certificate(res.certificate)
    out = []
    plat = cert.start
    for t, rec in enumerate(cert.records, start=1):
        if rec.kind == "rebridge":
            out.append((t, plat, decode(rec.args)))
        plat = apply_move(plat, rec)
    return out


def _wirtinger_of(plat: PlatWord, data) -> Wirtinger:
    # the recorded seeds and coloring of a diagram step, on the arcs of the plat's diagram
    from plait.diagrams.wirtinger import ColoringStep, diagram_arcs
    from plait.moves.rebridge import step_diagram

    arcs = diagram_arcs(step_diagram(plat, data))
    steps = []
    for t, (j, a) in enumerate(data.steps, start=1):
        i, u = arcs.under_in[j], arcs.under_out[j]
        steps.append(ColoringStep(t, j, a, u if a == i else i, arcs.over[j]))
    return Wirtinger(data.number, tuple(data.seeds), tuple(steps), False, "recorded", arcs)
