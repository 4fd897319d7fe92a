"""Checks on inputs, shared by every module of the core.

Each check returns the value as a float (scalar input) or a new float ndarray
(array input; the caller's array is never modified) and raises ``InputError``
naming the field, the allowed range and the bad value.
"""

from __future__ import annotations

import math
from numbers import Real

import numpy as np

from .errors import InputError

#: A slope above this is almost always a percentage typed as a ratio (2 for 2 %).
#: A 1:1 grade is far steeper than any lined ditch that Manning's equation serves.
MAX_SLOPE = 1.0


def _as_number(field: str, value):
    if isinstance(value, bool) or value is None:
        raise InputError(field, f"must be a number, got {value!r}")
    if isinstance(value, Real):
        return float(value)
    if isinstance(value, str):
        raise InputError(field, f"must be a number, got text {value!r}")
    try:
        arr = np.array(value, dtype=float)
    except (TypeError, ValueError):
        raise InputError(field, f"must be a number or an array of numbers, got {value!r}") from None
    return arr if arr.ndim else float(arr)


def _fmt_bad(value) -> str:
    if isinstance(value, float):
        return f"{value:g}"
    bad = np.asarray(value).ravel()
    return f"{bad[0]:g}" + (f" (and {bad.size - 1} more)" if bad.size > 1 else "")


def number(field: str, value, *, low: float | None = None, high: float | None = None,
           low_inclusive: bool = False, high_inclusive: bool = True, hint: str = ""):
    """Return ``value`` as float/ndarray after checking it is finite and within range."""
    if type(value) is float and math.isfinite(value) and (low is None or value > low) and (high is None or value < high):
        return value  # fast path for the common scalar case; edge values take the full check
    v = _as_number(field, value)
    scalar = isinstance(v, float)
    arr = np.asarray(v)
    if arr.size == 0:
        raise InputError(field, "must not be empty")
    lowest, highest = arr.min(), arr.max()  # two reductions instead of element-wise masks
    if not (np.isfinite(lowest) and np.isfinite(highest)):
        raise InputError(field, f"must be a finite number, got {_fmt_bad(arr[~np.isfinite(arr)])}")
    if low is not None and (lowest < low or (lowest == low and not low_inclusive)):
        op = ">=" if low_inclusive else ">"
        rng = f"{op} {low:g}" + (f" and {'<=' if high_inclusive else '<'} {high:g}" if high is not None else "")
        raise InputError(field, f"must be {rng}, got {lowest:g}{hint}")
    if high is not None and (highest > high or (highest == high and not high_inclusive)):
        op = "<=" if high_inclusive else "<"
        raise InputError(field, f"must be {op} {high:g}, got {highest:g}{hint}")
    # Never written to by the core, so no copy is needed to protect the caller's array.
    return v if scalar else arr.astype(float, copy=False)


def positive(field: str, value):
    """A finite number > 0."""
    return number(field, value, low=0.0)


def non_negative(field: str, value):
    """A finite number >= 0."""
    return number(field, value, low=0.0, low_inclusive=True)


def slope(value, field: str = "slope"):
    """A bed slope as a ratio (m/m or ft/ft): finite, > 0 and <= MAX_SLOPE.

    Zero or negative (adverse) slopes have no normal depth; a value above 1 is
    refused with a hint that it looks like a percentage.
    """
    if type(value) is float and 0.0 < value <= MAX_SLOPE:
        return value
    v = _as_number(field, value)
    arr = np.asarray(v)
    lowest, highest = (arr.min(), arr.max()) if arr.size else (math.nan, math.nan)
    if np.isfinite(lowest) and lowest <= 0:
        raise InputError(field, "must be > 0 (a falling grade, as a ratio); zero or adverse slopes "
                                f"have no normal depth, got {lowest:g}")
    if np.isfinite(highest) and highest > MAX_SLOPE:
        raise InputError(field, f"must be a ratio <= {MAX_SLOPE:g}, got {highest:g}; if you meant "
                                f"{highest:g} %, enter {highest / 100:g}")
    return number(field, v, low=0.0, high=MAX_SLOPE)


def is_array(*values) -> bool:
    return any(isinstance(v, np.ndarray) for v in values)

