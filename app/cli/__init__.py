"""Command-line sub-commands. Each module has ``register(subparsers)`` and sets ``run``."""

from . import batch, calc, fingerprint, sheet, verify

COMMANDS = (calc, sheet, fingerprint, verify, batch)
