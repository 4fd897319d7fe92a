"""Command-line sub-commands. Each module has ``register(subparsers)`` and sets ``run``."""

from . import calc, open_project

COMMANDS = (calc, open_project)
