"""Errors raised by the core.

Two kinds matter to a caller: the input is wrong (``InputError``, names the field
and its allowed range), or the input is valid but the problem has no answer
(``NoSolutionError``: adverse slope, pipe surcharged, channel overtopped...).
"""

from __future__ import annotations


class HydraulicsError(Exception):
    """Base of every error the core raises on purpose."""


class InputError(HydraulicsError, ValueError):
    """An input is missing, not a number, or outside its allowed range.

    ``field`` is the name of the offending input as the caller knows it
    (``"slope"``, ``"bottom_width"``...), so a form can mark it; ``message``
    is the rest, which a form in US units restates with
    :func:`hydraulics.wording.in_units` when the core made it with ``worded``.
    """

    def __init__(self, field: str, message: str):
        self.field = field
        self.message = message   # as given: one made by hydraulics.wording.worded restates in other units
        super().__init__(f"{field}: {message}")


class NoSolutionError(HydraulicsError):
    """The input is valid but no depth (or width, or slope) satisfies it."""


class ConvergenceError(NoSolutionError):
    """An iteration did not reach its tolerance; the message says how far it got."""
