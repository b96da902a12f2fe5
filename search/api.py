"""``reduce`` and ``resume``: run a search with guards, checkpoints and a certificate."""

from __future__ import annotations

import math
import signal
import sys
import threading
import time as _time
from dataclasses import dataclass, field
from pathlib import Path

import plait.moves as _moves
from plait.atomic import FolderLock
from plait.convert import to_plat
from plait.errors import GuardViolation, InputError
from plait.formats import presentation_from_obj, presentation_to_obj
from plait.scoring.objective import make_objective
from plait.search.engine import (
    OMEGA_LENGTH_FACTOR,
    OMEGA_LENGTH_SLACK,
    SearchContext,
    rng_state_from_json,
    rng_state_to_json,
    word_hash,
)
from plait.search.portfolio import STRATEGY_NAMES, Budget, check_params, make_strategy
from plait.search.runfolder import DEFAULT_RUNS, STATE_FORMAT, RunFolder, new_run_dir
from plait.word import ClosedBraid, PlatWord

__all__ = ["reduce", "resume", "ReduceResult", "DEFAULT_TIME"]

#: Seconds of search when neither a time nor a step budget is given.
DEFAULT_TIME = 10.0

#: Default seconds between checkpoints of state.json (``checkpoint_every``).
CHECKPOINT_EVERY = 3.0
# Least gap in seconds between two writes of a new best (a burst of improvements is
# guarded and written once, at most this late; a checkpoint always writes it first).
BEST_EVERY = 0.5
# Greedy isolating moves tried on the start plat before the strategy begins.
INITIAL_SEEK = 40
# Least number of steps between two diagram steps from bests with equal bridge counts.
OMEGA_BEST_EVERY = 40
# Steps without a new best after which a longer best gets a diagram step too; with a
# time budget only, also after this share of the budget without a new best.
OMEGA_STALL = 400
OMEGA_STALL_SHARE = 0.2


@dataclass
class ReduceResult:
    """The outcome of :func:`reduce` or :func:`resume`.

    Attributes
    ----------
    input, result : PlatWord
        The start plat (the input converted) and the best plat found.
    lower : int
        Certified lower bound on the bridge number, with its ``reasons``.
    guards : str
        ``"passed"`` (a failure raises :class:`~plait.errors.GuardViolation` instead).
    certificate : str
        Path of the certificate from the input to ``result``.
    run_dir : str
        The run folder.
    status : str
        ``"done"`` (budget used up or optimum reached) or ``"interrupted"`` (a signal
        stopped it; :func:`resume` continues).
    """

    input: PlatWord
    result: PlatWord
    lower: int
    reasons: list = field(default_factory=list)
    guards: str = "passed"
    certificate: str = ""
    run_dir: str = ""
    status: str = "done"
    strategy: str = "auto"
    seed: int = 0
    steps: int = 0
    explored: int = 0
    elapsed: float = 0.0
    length_lower: int = 0
    length_reason: str = ""
    diagram_steps: int = 0

    @property
    def length_minimal(self) -> bool:
        """True when the result's length equals the Jones-span lower bound: no plat of
        the link has fewer letters."""
        return self.result.length <= self.length_lower

    def to_json(self) -> dict:
        """The JSON contract of ``plait reduce --json``."""
        def four(p: PlatWord) -> dict:
            return {"strands": p.strands, "word": list(p.word), "bridges": p.bridges,
                    "length": p.length}

        return {
            "result": four(self.result),
            "input": four(self.input),
            "bridge_bounds": {
                "lower": self.lower,
                "upper": self.result.bridges,
                "certified": self.lower == self.result.bridges,
                "reasons": list(self.reasons),
            },
            "guards": self.guards,
            "certificate": self.certificate,
            "run_dir": self.run_dir,
            "status": self.status,
            "strategy": self.strategy,
            "seed": self.seed,
            "steps": self.steps,
            "explored": self.explored,
            "elapsed": round(self.elapsed, 3),
            "length_lower": self.length_lower,
            "length_reason": self.length_reason,
            "length_minimal": self.length_minimal,
            "diagram_steps": self.diagram_steps,
        }


# -- invariants (looked up at call time) ---------------------------------------------------

def _fingerprint(plat: PlatWord, level: str):
    from plait.scoring import fingerprint

    return fingerprint(plat, level=level)


def _fp_json(fp) -> object:
    return fp.to_json() if hasattr(fp, "to_json") else fp


def _lower_bound(plat: PlatWord, budget: float | None = None) -> tuple[int, list[str]]:
    from plait.scoring.bounds import bridge_lower_bound

    lb = bridge_lower_bound(plat, budget)
    return int(lb.value), [str(r) for r in lb.reasons]


def _guard(before, after, detail: str = "") -> None:
    from plait.scoring import guard

    guard(before, after, detail=detail)


def _plat_obj(p: PlatWord) -> dict:
    return {"strands": p.strands, "word": list(p.word), "bridges": p.bridges,
            "length": p.length}


# -- the run ---------------------------------------------------------------------------------

class _Run:
    """One search run bound to its folder: the loop, guards, checkpoints and signals."""

    def __init__(self, folder: RunFolder, config: dict, start: PlatWord, input_obj: dict,
                 quiet: bool, handle_signals: bool) -> None:
        self.folder = folder
        self.config = config
        self.start = start
        self.input_obj = input_obj
        self.quiet = quiet
        self.handle_signals = handle_signals
        self.budget = Budget(config["time"], config["steps"])
        self.checkpoint_every = float(config.get("checkpoint_every") or CHECKPOINT_EVERY)
        self.objective = make_objective(config["objective"])
        self.fp_cheap = _fingerprint(start, "cheap")
        self.elapsed_before = 0.0
        self.t0 = _time.monotonic()
        self.interrupt: int | None = None
        self.verified_node = 0      # path node of the last best that passed the guard
        self.verified_plat = start
        self.last_best_write = 0.0
        self.last_checkpoint = 0.0
        self.best_dirty = False
        self.best_found = 0.0       # elapsed seconds when the current best was found
        self.ctx: SearchContext | None = None
        self.strategy = None
        # [word hash, steps, bridges] of the last best given a diagram step
        self.omega_tried: list | None = None

    def elapsed(self) -> float:
        return self.elapsed_before + (_time.monotonic() - self.t0)

    # -- set up ------------------------------------------------------------------------
    def fresh(self, lower: int | None = None, reasons: list[str] | None = None) -> None:
        import random

        cfg = self.config
        kinds = tuple(cfg["kinds"]) if cfg.get("kinds") else None
        ctx = SearchContext(self.start, self.objective, random.Random(cfg["seed"]), 1, kinds)
        self.ctx = ctx
        ctx.length_lower = self._length_lower()
        ctx.on_best = self._on_best
        ctx.on_diagram = self._on_diagram
        # first the cheap part: canonical form and a greedy hunt for stabilizations
        plat, node = ctx.canonical(self.start, 0)
        plat, node = ctx.destabilize(plat, node, seek=INITIAL_SEEK)
        ctx.offer(plat, node)
        # the certified bound is an invariant of the link: compute it on the shorter plat
        if lower is None:
            lower, reasons = _lower_bound(ctx.best, cfg.get("bounds_budget"))
        self.lower, self.reasons = lower, reasons
        ctx.lower_bound = max(1, lower)
        self.strategy = make_strategy(cfg["strategy"], ctx, cfg.get("params"), self.budget,
                                      self.elapsed)
        self.folder.log("start", strategy=cfg["strategy"], seed=cfg["seed"],
                        time_budget=cfg["time"], steps_budget=cfg["steps"],
                        input=_plat_obj(self.start),
                        lower=lower)
        self.best_dirty = True  # the first best.json, even if the start was canonical
        self._write_best(force=True)
        self._checkpoint("running")

    def restore(self, state: dict) -> None:
        from plait.search.engine import PathStore

        cfg = self.config
        kinds = tuple(cfg["kinds"]) if cfg.get("kinds") else None
        self.lower, self.reasons = state["lower"], state["reasons"]
        ctx = SearchContext(self.start, self.objective, rng_state_from_json(state["rng"]),
                            self.lower, kinds)
        ctx.paths = PathStore.from_json(self.start, state["paths"])
        b = state["best"]
        ctx.best = PlatWord(b["strands"], tuple(b["word"]))
        ctx.best_node = b["node"]
        ctx.best_key = self.objective.key(ctx.best)
        ctx.best_step = state["best_step"]
        ctx.steps = state["steps"]
        ctx.explored = state["explored"]
        ctx.improvements = state["improvements"]
        self.ctx = ctx
        ctx.length_lower = self._length_lower()
        self.elapsed_before = state["elapsed"]
        self.t0 = _time.monotonic()
        self.verified_node, self.verified_plat = ctx.best_node, ctx.best
        self.omega_tried = state.get("omega_tried")
        ctx.on_best = self._on_best
        ctx.on_diagram = self._on_diagram
        self.strategy = make_strategy(cfg["strategy"], ctx, cfg.get("params"), self.budget,
                                      self.elapsed, state["strategy"])
        self.folder.log("resume", steps=ctx.steps, elapsed=round(self.elapsed_before, 3))

    def _length_lower(self) -> int:
        """The Jones-span length bound from the input's cheap fingerprint (0 when its
        Jones polynomial was not computed): the search stops when the best meets it and
        the bridge bound."""
        from plait.scoring.lengthbound import length_lower_bound

        v = getattr(self.fp_cheap, "jones", None)
        if v is None:
            return 0
        return length_lower_bound(self.start, jones_poly=v).value

    def _diagram_best(self, final: bool = False) -> None:
        """The diagram step from the best plat while its bridges exceed the lower bound:
        once per best, and for bests with as many bridges as the last one tried at most
        once per ``OMEGA_BEST_EVERY`` steps (the last try is checkpointed)."""
        ctx = self.ctx
        h = word_hash(ctx.best)
        if ctx.best.bridges <= ctx.lower_bound:
            return
        last = self.omega_tried
        stalled = final or ctx.steps - ctx.best_step >= OMEGA_STALL or (
            self.budget.steps is None and self.budget.time is not None
            and self.elapsed() - self.best_found >= OMEGA_STALL_SHARE * self.budget.time)
        if last is not None and h == last[0]:
            return  # tried this best
        if (not final and last is not None and ctx.best.bridges == last[2]
                and ctx.steps - last[1] < OMEGA_BEST_EVERY):
            return  # a best with as many bridges was tried lately
        if (ctx.best.length > OMEGA_LENGTH_FACTOR * ctx.best.bridges + OMEGA_LENGTH_SLACK
                and not stalled):
            return  # wait until the search has shortened it, or stalls
        self.omega_tried = [h, ctx.steps, ctx.best.bridges]
        got = ctx.diagram_step(ctx.best, ctx.best_node,
                               length_factor=2 * OMEGA_LENGTH_FACTOR if stalled else None)
        if got is not None:
            ctx.offer(*got)

    # -- best, guard, certificate ---------------------------------------------------------
    def _on_best(self, plat: PlatWord, node: int) -> None:
        self.best_dirty = True
        self.best_found = self.elapsed()

    def _on_diagram(self, plat: PlatWord) -> None:
        self.folder.log("diagram", steps=self.ctx.steps, bridges=plat.bridges,
                        length=plat.length)

    def _write_best(self, force: bool = False) -> None:
        """Guard the best (cheap fingerprint) and write best.json and the certificate."""
        ctx = self.ctx
        now = _time.monotonic()
        if not self.best_dirty or (not force and now - self.last_best_write < BEST_EVERY):
            return
        self._check(ctx.best, ctx.best_node, "cheap", self.fp_cheap)
        self.verified_node, self.verified_plat = ctx.best_node, ctx.best
        self._write_files(ctx.best, ctx.best_node, ctx.best_step)
        self.folder.log("best", bridges=ctx.best.bridges, length=ctx.best.length,
                        step=ctx.best_step, found=round(self.best_found, 3),
                        elapsed=round(self.elapsed(), 3))
        self.best_dirty = False
        self.last_best_write = now

    def _write_files(self, plat: PlatWord, node: int, step: int) -> None:
        """certificate.json (input -> plat) and best.json."""
        records = self.ctx.paths.records(node)
        _moves.write_certificate(
            self.folder.certificate_path, self.start, records, plat,
            input_presentation_obj=self.input_obj,
            meta={"tool": "plait reduce", "strategy": self.config["strategy"],
                  "seed": self.config["seed"], "step": step})
        self.folder.write("best.json", {
            **_plat_obj(plat), "components": plat.components,
            "objective": self.config["objective"], "key": list(self.objective.key(plat)),
            "step": step, "found": round(self.best_found, 3), "moves": len(records),
        })

    def _check(self, plat: PlatWord, node: int, level: str, before) -> None:
        """Compare the fingerprint of ``plat`` with the input's; on a difference locate
        the offending move, log it, keep the last verified best and raise."""
        after = _fingerprint(plat, level)
        try:
            _guard(before, after, detail=f"{level} fingerprint of the best plat")
        except GuardViolation as exc:
            where = _locate_offense(self.ctx, node, before, level)
            if not self.folder.best_path.exists():  # failed before any best was written
                self._write_files(self.verified_plat, self.verified_node, 0)
            self.folder.log("guard", invariant=exc.invariant, level=level, offending=where,
                            rejected=_plat_obj(plat))
            self._checkpoint("guard-failed", best_node=self.verified_node,
                             best=self.verified_plat)
            raise GuardViolation(exc.invariant, exc.before, exc.after,
                                 detail=f"offending move: {where}") from None

    def _checkpoint(self, status: str, best_node: int | None = None,
                    best: PlatWord | None = None) -> None:
        """Write state.json. The saved best is always one that passed the guard (a best
        still waiting for its coalesced write is guarded and written first)."""
        ctx = self.ctx
        if best is None and self.best_dirty:
            self._write_best(force=True)
        if best is None:
            best, best_node = ctx.best, ctx.best_node
        live = list(self.strategy.live_nodes()) + [best_node, self.verified_node]
        state = {
            "format": STATE_FORMAT,
            "status": status,
            "steps": ctx.steps,
            "explored": ctx.explored,
            "improvements": ctx.improvements,
            "elapsed": self.elapsed(),
            "lower": self.lower,
            "reasons": self.reasons,
            "best": {"strands": best.strands, "word": list(best.word), "node": best_node},
            "best_step": ctx.best_step,
            "omega_tried": self.omega_tried,
            "rng": rng_state_to_json(ctx.rng),
            "strategy": self.strategy.state(),
            "paths": ctx.paths.to_json(live),
        }
        self.folder.write("state.json", state, compact=True)
        self.last_checkpoint = _time.monotonic()

    # -- loop ----------------------------------------------------------------------------
    def _budget_left(self) -> bool:
        b = self.budget
        if b.steps is not None and self.ctx.steps >= b.steps:
            return False
        if b.time is not None and self.elapsed() >= b.time:
            return False
        return True

    def _on_signal(self, signum, frame) -> None:
        if self.interrupt is not None:
            raise KeyboardInterrupt
        self.interrupt = signum

    def run(self) -> ReduceResult:
        old = {}
        if self.handle_signals and threading.current_thread() is threading.main_thread():
            for sig in (signal.SIGINT, signal.SIGTERM):
                old[sig] = signal.signal(sig, self._on_signal)
        bar = self._bar()
        try:
            while (self._budget_left() and self.interrupt is None
                   and not self.ctx.at_optimum()):
                # the diagram step from the best (the start plat first, after the first
                # checkpoint, so that a kill -9 during it can be resumed)
                self._diagram_best()
                self.strategy.step()
                self._write_best()
                if _time.monotonic() - self.last_checkpoint >= self.checkpoint_every:
                    self._checkpoint("running")
                    self.folder.log("checkpoint", steps=self.ctx.steps,
                                    elapsed=round(self.elapsed(), 3))
                if bar is not None:
                    self._bar_update(bar)
            if self.interrupt is None and not self.ctx.at_optimum():
                # budget used up: a last diagram step from the best not tried yet
                self._diagram_best(final=True)
            self._write_best(force=True)
            if bar is not None:
                self._bar_update(bar, force=True)
            if self.interrupt is not None:
                self._checkpoint("interrupted")
                self.folder.log("interrupted", signal=int(self.interrupt),
                                steps=self.ctx.steps)
                return self._result("interrupted")
            return self._finish()
        finally:
            if bar is not None:
                bar.close()
            for sig, h in old.items():
                signal.signal(sig, h)

    def _finish(self) -> ReduceResult:
        ctx = self.ctx
        self._check(ctx.best, ctx.best_node, "full", _fingerprint(self.start, "full"))
        ok = _moves.verify_certificate(self.folder.certificate_path)
        if not _verified(ok):
            raise GuardViolation("certificate", detail=f"the certificate of the best plat "
                                 f"does not replay: {_reason(ok)}")
        self._checkpoint("done")
        self.folder.log("end", bridges=ctx.best.bridges, length=ctx.best.length,
                        steps=ctx.steps, explored=ctx.explored,
                        elapsed=round(self.elapsed(), 3), guards="passed")
        return self._result("done")

    def _result(self, status: str) -> ReduceResult:
        from plait.scoring.lengthbound import length_lower_bound

        ctx = self.ctx
        lb = length_lower_bound(self.verified_plat)
        built = sum(r.kind == "rebridge" for r in ctx.paths.records(self.verified_node))
        return ReduceResult(
            input=self.start, result=self.verified_plat, lower=self.lower,
            reasons=list(self.reasons), guards="passed",
            certificate=str(self.folder.certificate_path), run_dir=str(self.folder.path),
            status=status, strategy=self.config["strategy"], seed=self.config["seed"],
            steps=ctx.steps, explored=ctx.explored, elapsed=self.elapsed(),
            length_lower=lb.value, length_reason=lb.reason, diagram_steps=built)

    # -- progress ------------------------------------------------------------------------
    def _bar(self):
        if self.quiet:
            return None
        from tqdm import tqdm

        b = self.budget
        if b.steps is not None:
            total, unit = b.steps, "step"
        else:
            total, unit = b.time, "s"
        self._bar_unit = unit
        self._bar_last = 0.0
        # disable=None: no bar when stderr is not a terminal (logs stay clean)
        return tqdm(total=total, unit=unit, file=sys.stderr, dynamic_ncols=True, disable=None,
                    desc=self.config["strategy"], leave=True,
                    bar_format="{desc}: {percentage:3.0f}%|{bar}| {n_fmt}/{total_fmt} "
                               "[{elapsed}]{postfix}")

    def _bar_update(self, bar, force: bool = False) -> None:
        now = _time.monotonic()
        if not force and now - self._bar_last < 0.25:
            return
        self._bar_last = now
        ctx = self.ctx
        done = ctx.steps if self._bar_unit == "step" else round(self.elapsed(), 1)
        bar.n = min(done, bar.total) if bar.total else done
        el = max(1e-9, self.elapsed())
        bar.set_postfix_str(f"best=({ctx.best.bridges},{ctx.best.length}) "
                            f"states={ctx.explored} rate={ctx.explored / el:,.0f}/s",
                            refresh=True)


def _verified(ok) -> bool:
    if isinstance(ok, bool):
        return ok
    return bool(getattr(ok, "ok", ok))


def _reason(ok) -> str:
    return str(getattr(ok, "reason", "") or getattr(ok, "message", "") or ok)


def _locate_offense(ctx: SearchContext, node: int, before, level: str) -> str:
    """The first move on the path to ``node`` that is wrong: one whose replay does not
    apply or gives another word than the search used, else the first after which the
    fingerprint differs from the input's (found by bisection)."""
    path = ctx.paths.path(node)
    recs = [rec for rec, _ in path]
    hashes = [h for _, h in path]
    plat = ctx.start
    plats = [plat]
    for i, (rec, h) in enumerate(zip(recs, hashes, strict=True)):
        try:
            nxt = _moves.apply_move(plat, rec)
        except Exception as exc:  # the replay rejects the move: it is the culprit
            return f"step {i + 1} {rec.to_json()} from {list(plat.word)}: {exc}"
        if h is not None and word_hash(nxt) != h:
            return (f"step {i + 1} {rec.to_json()} from {list(plat.word)}: the search "
                    f"used a word the move does not produce")
        plat = nxt
        plats.append(plat)

    def same(p: PlatWord) -> bool:
        try:
            _guard(before, _fingerprint(p, level))
            return True
        except GuardViolation:
            return False

    lo, hi = 0, len(plats) - 1
    if same(plats[hi]):
        return "none found on the recorded path"
    while hi - lo > 1:
        mid = (lo + hi) // 2
        if same(plats[mid]):
            lo = mid
        else:
            hi = mid
    return f"step {hi} {recs[hi - 1].to_json()} from {list(plats[lo].word)}"


# -- public API --------------------------------------------------------------------------

def _as_presentation(presentation):
    if isinstance(presentation, dict):
        return presentation_from_obj(presentation)
    if isinstance(presentation, (list, tuple)):
        return PlatWord.from_word(presentation)
    return presentation


def reduce(presentation, *, strategy: str = "auto", time: float | None = None,
           steps: int | None = None, seed: int = 0, run_dir=None, quiet: bool = True,
           objective: str = "bridges", kinds=None, params: dict | None = None,
           handle_signals: bool = True, checkpoint_every: float = CHECKPOINT_EVERY,
           runs_root=DEFAULT_RUNS, bounds_budget: float | None = None) -> ReduceResult:
    """Search for the simplest plat of the link of ``presentation``.

    Parameters
    ----------
    presentation : PlatWord, ClosedBraid, PDCode or dict
        The input (a dict in the JSON form of :func:`plait.formats.presentation_from_obj`).
    strategy : str
        ``auto`` (portfolio), ``beam``, ``astar`` or ``anneal``.
    time : float, optional
        Seconds of search. Not reproducible; the default is 10 s when ``steps`` is None.
    steps : int, optional
        Step budget; with a step budget and a seed the result is the same bit for bit,
        whether the run was interrupted and resumed or not.
    seed : int
        Seed of the run's only random generator.
    run_dir : path-like, optional
        The run folder (a new one under ``runs_root`` when None).
    quiet : bool
        No progress bar when True.
    objective : str
        ``bridges`` (fewest bridges, then fewest letters), ``length`` or ``weighted[:W]``.
    kinds : iterable of str, optional
        Move kinds the search may use (default: every non-growing kind).
    params : dict, optional
        Strategy parameters (fields of the strategy's ``*Params`` dataclass).
    handle_signals : bool
        Catch SIGINT/SIGTERM (main thread only): write a final checkpoint and return
        with status ``"interrupted"``.
    checkpoint_every : float
        Seconds between checkpoints of the search state (a kill -9 loses at most this
        much work; new bests are written within half a second).
    runs_root : path-like
        Parent of new run folders (default ``runs``).
    bounds_budget : float, optional
        Seconds for the lower bound computed at the start (see
        :func:`plait.scoring.bounds.bridge_lower_bound`); None: no limit.

    Returns
    -------
    ReduceResult

    Raises
    ------
    InputError
        Bad input or options.
    GuardViolation
        An invariant of the best plat differs from the input's; the run folder keeps the
        last best that passed, and the message names the offending move.

    References
    ----------
    .. [1] J. S. Birman, "On the stable equivalence of plat representations of knots
       and links", Canad. J. Math. 28 (1976).
    """
    pres = _as_presentation(presentation)
    start = to_plat(pres)
    if strategy not in STRATEGY_NAMES:
        raise InputError(f"strategy: unknown name {strategy!r} (choose from "
                         f"{', '.join(STRATEGY_NAMES)})")
    if time is not None:
        if (isinstance(time, bool) or not isinstance(time, (int, float)) or not time > 0
                or not math.isfinite(time)):
            raise InputError(f"time: expected a positive, finite number of seconds, got "
                             f"{time!r}")
        time = float(time)
    if steps is not None and (isinstance(steps, bool) or not isinstance(steps, int)
                              or steps < 0):
        raise InputError(f"steps: expected a non-negative integer, got {steps!r}")
    if time is None and steps is None:
        time = DEFAULT_TIME
    if isinstance(seed, bool) or not isinstance(seed, int):
        raise InputError(f"seed: expected an integer, got {seed!r}")
    if not (isinstance(checkpoint_every, (int, float)) and checkpoint_every > 0):
        raise InputError(f"checkpoint_every: expected a positive number of seconds, got "
                         f"{checkpoint_every!r}")
    obj = make_objective(objective)
    if kinds is not None:
        kinds = sorted(set(kinds))
        bad = [k for k in kinds if k not in _moves.MOVE_KINDS]
        if bad:
            raise InputError(f"kinds: unknown move kind {bad[0]!r}")
    if params is not None and not isinstance(params, dict):
        raise InputError(f"params: expected a dict of strategy parameters, got {params!r}")
    check_params(strategy, params)
    from plait.scoring.bounds import check_budget

    bounds_budget = check_budget(bounds_budget, "bounds_budget")
    config = {
        "format": "plait-search-config/1",
        "strategy": strategy, "time": time, "steps": steps, "seed": seed,
        "objective": obj.spec(), "kinds": kinds, "params": params,
        "checkpoint_every": float(checkpoint_every),
    }
    if bounds_budget is not None:
        config["bounds_budget"] = bounds_budget
    input_obj = presentation_to_obj(pres)
    folder = RunFolder(run_dir if run_dir is not None else new_run_dir(runs_root))
    folder.create()
    with FolderLock(folder.path, _BUSY):
        run = _Run(folder, config, start, input_obj, quiet, handle_signals)
        folder.write("config.json", config)
        folder.write("input.json", {
            "presentation": input_obj, "plat": _plat_obj(start),
            "fingerprint_cheap": _fp_json(run.fp_cheap),
        })
        run.fresh()
        return run.run()


# What a second process is told when it finds a run folder locked.
_BUSY = "another plait process is running this search (a run folder has one writer)"


def resume(run_dir, quiet: bool = True, handle_signals: bool = True) -> ReduceResult:
    """Continue the run saved in ``run_dir`` from its last checkpoint.

    A finished run is returned as it is. With a step budget the result equals that of
    an uninterrupted run with the same seed.

    Raises
    ------
    InputError
        When ``run_dir`` is not a run folder, or the run was stopped by a guard.
    """
    folder = RunFolder(run_dir)
    if not Path(run_dir).is_dir():
        raise InputError(f"run folder not found: {run_dir}")
    # config.json is written once, before anything else: reading it first also makes sure
    # that no lock file is ever put in a folder that is not a run folder
    config = folder.read("config.json")
    with FolderLock(folder.path, _BUSY):
        inp = folder.read("input.json")
        state = folder.read("state.json")
        if state.get("format") != STATE_FORMAT:
            raise InputError(f"{folder.state_path}: unknown state format "
                             f"{state.get('format')!r}")
        if state["status"] == "guard-failed":
            raise InputError(f"{run_dir}: the run was stopped by a guard failure; its "
                             f"best.json holds the last verified plat (see log.jsonl)")
        p = inp["plat"]
        start = PlatWord(p["strands"], tuple(p["word"]))
        pres = presentation_from_obj(inp["presentation"])
        if isinstance(pres, (PlatWord, ClosedBraid)) and to_plat(pres) != start:
            raise InputError(f"{folder.input_path}: the start plat does not match the input")
        run = _Run(folder, config, start, inp["presentation"], quiet, handle_signals)
        run.restore(state)
        if state["status"] == "done":
            run.verified_plat = run.ctx.best
            return run._result("done")
        return run.run()
