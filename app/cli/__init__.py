"""Command-line sub-commands. Each module has ``register(subparsers)`` and sets ``run``."""

from . import calc, compare, drawing, fingerprint, inventory_command, open_project, run, sheet, verify

COMMANDS = (calc, compare, run, sheet, drawing, fingerprint, verify, inventory_command, open_project)
