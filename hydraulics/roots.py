"""Root finding for the core, with the solver library imported on first use.

``scipy.optimize`` takes longer to import than the rest of the core together;
a command that never needs a bracketed root (most one-channel checks) starts
without it.
"""

from __future__ import annotations

__all__ = ["brentq"]


def brentq(f, a, b, **options):
    """Brent's method on the bracket [a, b]: :func:`scipy.optimize.brentq`, same arguments and result."""
    from scipy.optimize import brentq as _brentq

    return _brentq(f, a, b, **options)
