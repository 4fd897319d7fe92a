"""Command-line sub-commands. Each module has ``register(subparsers)`` and sets ``run``."""

from . import calc, fingerprint, open_project, sheet, verify

COMMANDS = (calc, sheet, fingerprint, verify, open_project)
