"""Exceptions shared by every part of plait, with the exit codes the CLI maps them to."""

from __future__ import annotations

__all__ = ["PlaitError", "InputError", "GuardViolation", "EXIT_INPUT", "EXIT_GUARD",
           "EXIT_INTERRUPTED"]

EXIT_INPUT = 2  # bad input of any kind
EXIT_GUARD = 3  # an invariant guard failed: the knot would have changed
EXIT_INTERRUPTED = 130  # SIGINT/SIGTERM after a final checkpoint


class PlaitError(Exception):
    """Base class of plait's own errors."""


class InputError(PlaitError, ValueError):
    """Bad input: the message is one line naming the token, label or generator at fault."""


class GuardViolation(PlaitError):
    """An invariant differs between two presentations that must be of the same link.

    Parameters
    ----------
    invariant : str
        Name of the invariant that differs.
    before, after : object
        Its two values.
    detail : str
        Extra context, for example the offending move.
    """

    def __init__(self, invariant: str, before: object = None, after: object = None,
                 detail: str = "") -> None:
        self.invariant = invariant
        self.before = before
        self.after = after
        self.detail = detail
        msg = f"guard failed: {invariant} changed"
        if detail:
            msg += f" ({detail})"
        super().__init__(msg)
