"""Command-line sub-commands. Each module has ``register(subparsers)`` and sets ``run``."""

from . import calc, compare, fingerprint, inventory_command, open_project, run, sheet, verify

COMMANDS = (calc, compare, run, sheet, fingerprint, verify, inventory_command, open_project)
