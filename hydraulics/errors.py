"""Errors raised by the core.

Two kinds matter to a caller: the input is wrong (``InputError``, names the field
and its allowed range), or the input is valid but the problem has no answer
(``NoSolutionError``: adverse slope, pipe surcharged, channel overtopped...).
"""

from __future__ import annotations


class HydraulicsError(Exception):
    """Base of every error the core raises on purpose.

    The core works in SI, and so do its messages; one made by :func:`hydraulics.wording.worded` can be restated
    in the user's units by :meth:`in_units`, which a front end calls instead of ``str``.
    """

    def said(self) -> str:
        """The message as the core made it: one made by :func:`hydraulics.wording.worded` keeps its quantities
        (for a note that quotes this error and is restated later), any other is its text."""
        message = self.args[0] if len(self.args) == 1 else None
        return message if isinstance(message, str) else str(self)

    def in_units(self, units) -> str:
        """The message in ``units`` (a :class:`hydraulics.units.UnitSystem`) where the core made it with
        :func:`hydraulics.wording.worded`, else as it is."""
        said = self.said()
        return said.in_units(units) if hasattr(said, "in_units") else str(said)


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

    def said(self) -> str:
        if not hasattr(self.message, "in_units"):
            return str(self)
        from .wording import worded   # here: the wording module imports this one (through the units)

        return worded("{field}: {message}", field=self.field, message=self.message)


class NoSolutionError(HydraulicsError):
    """The input is valid but no depth (or width, or slope) satisfies it."""


class ConvergenceError(NoSolutionError):
    """An iteration did not reach its tolerance; the message says how far it got."""
