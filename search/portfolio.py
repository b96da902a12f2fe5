"""The ``auto`` strategy: a portfolio that splits the budget between beam, annealing and A*."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field

from plait.errors import InputError
from plait.search.anneal import Annealer, AnnealParams
from plait.search.astar import AStarParams, AStarSearch
from plait.search.beam import BeamParams, BeamSearch
from plait.search.engine import SearchContext

__all__ = [
    "STRATEGY_NAMES", "make_strategy", "check_params", "Portfolio", "PortfolioParams",
    "Budget",
]

#: Strategy names accepted by :func:`make_strategy` and ``plait reduce --strategy``.
STRATEGY_NAMES = ("auto", "beam", "astar", "anneal")

_SINGLE = {
    "beam": (BeamSearch, BeamParams),
    "astar": (AStarSearch, AStarParams),
    "anneal": (Annealer, AnnealParams),
}


@dataclass(frozen=True)
class Budget:
    """How long a run may go: seconds of search and/or steps (None = no limit of that
    kind). A run stops at whichever comes first."""

    time: float | None = None
    steps: int | None = None


@dataclass
class PortfolioParams:
    """Tuning of :class:`Portfolio`.

    Parameters
    ----------
    phases : list of [name, share]
        Strategies run in this order, each for its share of the budget, each starting
        from the overall best plat; after the last the cycle begins again.
    """

    phases: list = field(default_factory=lambda: [["beam", 0.35], ["astar", 0.35],
                                                  ["anneal", 0.3]])


def _params(cls, obj: dict | None):
    try:
        return cls(**(obj or {}))
    except TypeError as exc:
        raise InputError(f"strategy parameters: {exc}") from None


def check_params(name: str, params: dict | None) -> None:
    """Raise :class:`InputError` when ``params`` are not valid fields of the strategy's
    parameter dataclass (checked before a run folder is created)."""
    if name == "auto":
        Portfolio.check(_params(PortfolioParams, params))
    elif name in _SINGLE:
        _params(_SINGLE[name][1], params)
    else:
        raise InputError(f"strategy: unknown name {name!r} (choose from "
                         f"{', '.join(STRATEGY_NAMES)})")


def make_strategy(name: str, ctx: SearchContext, params: dict | None, budget: Budget,
                  elapsed: Callable[[], float], state: dict | None = None):
    """A strategy object by name (``auto``, ``beam``, ``astar``, ``anneal``).

    Every strategy has ``step()``, ``state() -> dict`` and ``live_nodes()``; ``state``
    given here continues a saved one.
    """
    if name == "auto":
        return Portfolio(ctx, _params(PortfolioParams, params), budget, elapsed, state)
    if name not in _SINGLE:
        raise InputError(f"strategy: unknown name {name!r} (choose from "
                         f"{', '.join(STRATEGY_NAMES)})")
    cls, pcls = _SINGLE[name]
    if state is not None and params is None:
        params = state.get("params")
    return cls(ctx, _params(pcls, params), state)


class Portfolio:
    """Run the strategies one after another, each on its share of the budget.

    With a step budget the phase boundaries are step counts (so the run is
    reproducible); with only a time budget they are seconds. Each phase starts from the
    overall best plat; the context keeps the best over all phases.

    References
    ----------
    .. [1] B. A. Huberman, R. M. Lukose, T. Hogg, "An economics approach to hard
       computational problems", Science 275 (1997): algorithm portfolios.
    """

    name = "auto"

    def __init__(self, ctx: SearchContext, params: PortfolioParams, budget: Budget,
                 elapsed: Callable[[], float], state: dict | None = None) -> None:
        self.ctx = ctx
        self.p = params
        self.budget = budget
        self.elapsed = elapsed
        self.check(params)
        if state is None:
            self.phase = 0
            self.phase_start_steps = ctx.steps
            self.phase_start_time = elapsed()
            self.sub = self._new_sub(None)
        else:
            self.phase = state["phase"]
            self.phase_start_steps = state["phase_start_steps"]
            self.phase_start_time = state["phase_start_time"]
            self.sub = self._new_sub(state["sub"])

    @staticmethod
    def check(params: PortfolioParams) -> None:
        if not isinstance(params.phases, (list, tuple)) or not params.phases:
            raise InputError("auto: phases must be a non-empty list of [strategy, share]")
        for ph in params.phases:
            ok = isinstance(ph, (list, tuple)) and len(ph) == 2 and ph[0] in _SINGLE
            if ok:
                try:
                    ok = float(ph[1]) > 0
                except (TypeError, ValueError):
                    ok = False
            if not ok:
                raise InputError(f"auto: bad phase {ph!r} (expected [strategy, share > 0])")

    def _new_sub(self, state: dict | None):
        name = self.p.phases[self.phase][0]
        cls, pcls = _SINGLE[name]
        params = pcls(**state["params"]) if state is not None else pcls()
        return cls(self.ctx, params, state)

    def _share(self) -> float:
        total = sum(float(s) for _, s in self.p.phases)
        return float(self.p.phases[self.phase][1]) / total

    def _phase_over(self) -> bool:
        if self.budget.steps is not None:
            return self.ctx.steps - self.phase_start_steps >= max(
                1, int(self._share() * self.budget.steps))
        if self.budget.time is not None:
            return self.elapsed() - self.phase_start_time >= self._share() * self.budget.time
        return False

    def live_nodes(self) -> list[int]:
        return self.sub.live_nodes()

    def state(self) -> dict:
        return {
            "params": {"phases": [list(ph) for ph in self.p.phases]},
            "phase": self.phase,
            "phase_start_steps": self.phase_start_steps,
            "phase_start_time": self.phase_start_time,
            "sub": self.sub.state(),
        }

    @property
    def current(self) -> str:
        return self.p.phases[self.phase][0]

    def step(self) -> None:
        if self._phase_over():
            self.phase = (self.phase + 1) % len(self.p.phases)
            self.phase_start_steps = self.ctx.steps
            self.phase_start_time = self.elapsed()
            self.sub = self._new_sub(None)
        self.sub.step()
