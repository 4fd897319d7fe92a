"""Command-line sub-commands. Each module has ``register(subparsers)`` and sets ``run``."""

from . import batch, calc, compare, fingerprint, open_project, run, sheet, verify

COMMANDS = (calc, compare, run, sheet, fingerprint, verify, batch, open_project)
