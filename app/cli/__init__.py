"""Command-line sub-commands. Each module has ``register(subparsers)`` and sets ``run``."""

from . import calc, compare

COMMANDS = (calc, compare)
