"""The bridge-number report: upper bounds from diagrams and search, lower bounds from invariants."""

from __future__ import annotations

from dataclasses import dataclass, field

from plait.errors import InputError
from plait.formats import Presentation
from plait.fromdiagram import diagram_to_plat
from plait.pd import PDCode, plat_to_pd, validate_pd
from plait.wirtinger import Wirtinger
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
    """

    lower: int
    upper: int
    lower_reasons: list[str]
    upper_reasons: list[str]
    result: PlatWord
    wirtinger: Wirtinger | None
    search: dict = field(default_factory=dict)

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
                  runs_root=None, hunt: float | None = None, hunt_dir=None) -> BridgeReport:
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
    from plait.convert import to_plat
    from plait.search import reduce

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
            p2, w2, why = _diagram_bound(pd, wirtinger_time, "the input plat's diagram")
            if p2.bridges < start.bridges:
                start, wirt = p2, w2
                upper_reasons.append(why)
    kw = {} if runs_root is None else {"runs_root": runs_root}
    res = reduce(start, time=time, steps=steps, seed=seed, run_dir=run_dir, quiet=quiet,
                 objective="bridges", handle_signals=handle_signals, **kw)
    best = res.result
    search = res.to_json()
    if best.bridges < start.bridges:
        upper_reasons.append(f"the search found a plat with {best.bridges} bridges "
                             f"(certificate {res.certificate})")
    # the best plat's own diagram may need fewer bridges still
    pd = _pd_or_none(best)
    if pd is not None and pd.length and best.bridges > max(res.lower, 1):
        p3, _w3, why = _diagram_bound(pd, wirtinger_time, "the best plat's diagram")
        if p3.bridges < best.bridges:
            best = p3
            upper_reasons.append(why + " (beyond the certificate, guarded by Jones)")
    upper = best.bridges
    lower = res.lower
    if lower > upper:  # pragma: no cover - would be a contradiction between theorems
        raise AssertionError(f"lower bound {lower} exceeds upper bound {upper}")
    rep = BridgeReport(lower, upper, list(res.reasons), upper_reasons, best, wirt, search)
    if hunt:
        from pathlib import Path

        from plait.search.hunt import hunt_report

        hdir = Path(hunt_dir) if hunt_dir is not None else Path(res.run_dir) / "hunt"
        hunt_report(rep, pres, seconds=hunt, state_dir=hdir, seed=seed,
                    handle_signals=handle_signals)
    return rep


def _pd_or_none(plat: PlatWord) -> PDCode | None:
    if not plat.word:
        return None
    try:
        return validate_pd(plat_to_pd(plat).crossings)
    except InputError:
        return None
