"""Command-line sub-commands. Each module has ``register(subparsers)`` and sets ``run``."""

from . import calc, compare, fingerprint, inventory_command, open_project, sheet, verify

COMMANDS = (calc, compare, sheet, fingerprint, verify, inventory_command, open_project)
