"""What an evaluation depends on besides the channel: the lining catalogue, the units shown, the program's version.

A front end makes one :class:`Context` (the window when it opens, with the
user's catalogue file from its data folder) and passes it to whatever
evaluates or exports. Nothing keeps it in a module global, so two contexts
(say two catalogues with different unit costs) can be used side by side.
No Qt here.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import hydraulics as hy
from hydraulics import units as hu
from hydraulics.linings import Catalogue

from . import __version__
from .evaluate import load_default_catalogue


@dataclass(frozen=True)
class Context:
    """The lining catalogue (shipped, with the user's entries), the unit system values are shown in, and the
    program version that fingerprints and sheets are made with."""

    catalogue: Catalogue
    units: hu.UnitSystem = hu.US
    program_version: str = __version__
    catalogue_problem: str = ""   # why the user's catalogue file was not used, in words ("" when it was or none)

    @classmethod
    def load(cls, user_catalogue=None, units: str | hu.UnitSystem = "us",
             program_version: str = __version__) -> "Context":
        """A context with the shipped catalogue and the user's catalogue file (TOML at ``user_catalogue``; None or
        a file not made yet: the shipped one alone) laid over it.

        A user file that cannot be used is left out, the shipped catalogue is
        used alone, and :attr:`catalogue_problem` says why. Raises InputError
        for ``units`` other than "us" or "si".
        """
        system = _system(units)
        problem = ""
        try:
            catalogue = load_default_catalogue(user_catalogue)
        except hy.InputError as exc:
            problem = f"The user lining catalogue {user_catalogue} was not used: {exc}"
            catalogue = load_default_catalogue(None)
        return cls(catalogue, system, program_version, problem)

    def with_units(self, units: str | hu.UnitSystem) -> "Context":
        """The same context showing values in ``units`` ("us", "si" or a unit system)."""
        system = _system(units)
        return self if system is self.units else dataclasses.replace(self, units=system)


def _system(units) -> hu.UnitSystem:
    return units if isinstance(units, hu.UnitSystem) else hu.system(units)
