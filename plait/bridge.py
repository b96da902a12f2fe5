"""The bridge-number report: upper bounds from diagrams and search, lower bounds from invariants."""

from __future__ import annotations

from dataclasses import dataclass, field
from itertools import chain

from plait.diagrams.fromdiagram import diagram_to_plat
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
    d = diagram_to_plat(pd, time_limit=time_limit)
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
                  runs_root=None, budget: float | None = None) -> BridgeReport:
    """Estimate the bridge number of a link: convert, search, and bound from both sides.

    Upper bounds: the plat built from the input diagram's Wirtinger coloring (a PD code,
    or the diagram of an input plat or closed braid when that needs fewer bridges), the
    best plat of a bridges-first search from it (:func:`plait.search.reduce`), and the
    Wirtinger number of the best plat's own diagram. Lower bounds: the invariants of
    :func:`plait.scoring.bounds.bridge_lower_bound`, as computed by the search.

    Parameters
    ----------
    pres : PlatWord, ClosedBraid or PDCode
    time, steps, seed, run_dir, quiet, handle_signals, runs_root
        Passed to :func:`plait.search.reduce` (``steps=0`` skips the search moves).
    wirtinger_time : float
        Seconds for each Wirtinger solve.
    budget : float, optional
        Seconds for each computation of the lower bounds (the slow methods that do not
        fit are reported as "not tried: …"); None: no limit. The bounds are computed at
        the start of the search (so that it stops once certified) and again on the best
        plat found (fewest bridges, then shortest), cached by the knot's fingerprint
        within the run: a knot's bounds are recomputed only on a strictly simpler plat.
        With a budget, the diagram of an input or best plat with more than
        :data:`DIAGRAM_CROSSINGS_PER_SECOND` crossings per budget second is not converted
        (an upper reason says so).

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
    from plait.convert import to_plat
    from plait.scoring.bounds import check_budget
    from plait.search import reduce

    budget = check_budget(budget)
    upper_reasons: list[str] = []
    wirt: Wirtinger | None = None
    if isinstance(pres, PDCode):
        start, wirt, why = _diagram_bound(pres, wirtinger_time, "the input diagram")
        upper_reasons.append(why)
    else:
        start = to_plat(pres)
        upper_reasons.append(f"the input as a plat has {start.bridges} bridges")
        pd = _pd_or_none(start)
        if pd is not None and pd.length:
            what = "the input plat's diagram"
            if _diagram_affordable(pd, budget):
                p2, w2, why = _diagram_bound(pd, wirtinger_time, what)
                if p2.bridges < start.bridges:
                    start, wirt = p2, w2
                    upper_reasons.append(why)
            else:
                upper_reasons.append(_diagram_not_tried(pd, budget, what))
    kw = {} if runs_root is None else {"runs_root": runs_root}
    res = reduce(start, time=time, steps=steps, seed=seed, run_dir=run_dir, quiet=quiet,
                 objective="bridges", handle_signals=handle_signals, bounds_budget=budget,
                 **kw)
    best = res.result
    search = res.to_json()
    lower, lower_reasons = res.lower, list(res.reasons)
    if lower < best.bridges and res.status == "done":
        # the bounds again on the best plat (certified by the search's moves), unless this
        # knot's bounds were already computed on a plat at least as simple
        cache = RunBounds()
        cache.put(res.input, res.lower, res.reasons)
        got = cache.get_or_compute(best, budget)
        if got[0] > lower or (got[0] == lower and not _has_not_tried(got[1])
                              and _has_not_tried(lower_reasons)):
            lower, lower_reasons = got
    if best.bridges < start.bridges:
        upper_reasons.append(f"the search found a plat with {best.bridges} bridges "
                             f"(certificate {res.certificate})")
    # the best plat's own diagram may need fewer bridges still
    pd = _pd_or_none(best)
    if pd is not None and pd.length and best.bridges > max(lower, 1):
        what = "the best plat's diagram"
        if _diagram_affordable(pd, budget):
            p3, _w3, why = _diagram_bound(pd, wirtinger_time, what)
            if p3.bridges < best.bridges:
                best = p3
                upper_reasons.append(why + " (beyond the certificate, guarded by Jones)")
        else:
            upper_reasons.append(_diagram_not_tried(pd, budget, what))
    upper = best.bridges
    if lower > upper:  # pragma: no cover - would be a contradiction between theorems
        raise AssertionError(f"lower bound {lower} exceeds upper bound {upper}")
    rep = BridgeReport(lower, upper, lower_reasons, upper_reasons, best, wirt, search)
    if best.components == 1 and res.status != "interrupted":
        # a composite knot: bound its factors and add (Schubert 1954)
        from plait.diagrams.composite import visited_diagrams, with_factors

        given = pres if isinstance(pres, PDCode) else _pd_or_none(to_plat(pres))
        diagrams = chain([("the input diagram", given),
                          ("the start plat's diagram", _pd_or_none(start)),
                          ("the best plat's diagram", pd)], visited_diagrams(res.certificate))
        rep = with_factors(rep, diagrams, time=time, steps=steps, seed=seed,
                           wirtinger_time=wirtinger_time, handle_signals=handle_signals,
                           runs_root=runs_root, budget=budget,
                           run_dir=search.get("run_dir") or None)
    return rep


#: With a budget, a plat's diagram is converted (Wirtinger number, height function and
#: sweep, Jones check: superlinear in the crossings) only up to this many crossings per
#: budget second. An input PD code is always converted: it is the only route to a plat.
DIAGRAM_CROSSINGS_PER_SECOND = 30


def _diagram_affordable(pd: PDCode, budget: float | None) -> bool:
    return budget is None or pd.length <= DIAGRAM_CROSSINGS_PER_SECOND * budget


def _diagram_not_tried(pd: PDCode, budget: float | None, what: str) -> str:
    return (f"not tried: the Wirtinger number of {what} ({pd.length} crossings; with a "
            f"budget of {budget:g} s only diagrams of up to "
            f"{int(DIAGRAM_CROSSINGS_PER_SECOND * budget)} crossings are converted)")


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
