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
        arr = np.asarray(value, dtype=float)  # a float array is taken as it is, not copied
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



# -- ranges a design input may take -------------------------------------------------------------------------------

class Limit:
    """The range of one design input [SI], outside which a value is refused rather than computed.

    These are not limits of the formulas: Manning's equation would give numbers for a flow of 1e-320 m^3/s or
    a pipe of 1e-300 m, but not numbers anybody could build from, and the arithmetic degenerates (subnormal
    flows, overflowing powers). Each range is wide enough for any roadside ditch, swale or culvert and is marked
    with where it comes from ("common practice" where no publication gives it).
    """

    __slots__ = ("quantity", "low", "high", "zero", "source")

    def __init__(self, quantity: str, low: float, high: float, *, zero: bool = False, source: str = ""):
        self.quantity, self.low, self.high, self.zero, self.source = quantity, low, high, zero, source

    def holds(self, value):
        """True where ``value`` (SI, scalar or array) is within the range; NaN is outside."""
        v = np.asarray(value, dtype=float)
        ok = (v >= self.low) & (v <= self.high)
        if self.zero:
            ok = ok | (v == 0)
        return bool(ok) if ok.ndim == 0 else ok

    def describe(self, units=None) -> str:
        """The range in words, in ``units`` (a hydraulics.units.UnitSystem; SI when None)."""
        if units is None:
            from .units import SI as units
        low, high = (float(units.from_si(self.quantity, x)) for x in (self.low, self.high))
        label = units.label(self.quantity)
        unit = f" {label}" if label and self.quantity not in ("slope", "manning_n") else ""
        text = f"from {_short(low)} to {_short(high)}{unit}"
        return f"0 or {text}" if self.zero else text


def _short(x: float) -> str:
    """Three significant digits, without an exponent for numbers from 1000 to a million (10000, 353147)."""
    return f"{x:.0f}" if 1e3 <= abs(x) < 1e6 else f"{x:.3g}"


_LENGTH_NOTE = "common practice: from the smallest to the largest roadside ditch or culvert"

#: The design inputs with their ranges [SI]. The command line, the project loader, the inventory reader and
#: the window's fields all check against this one table; the name is the input as the core knows it.
LIMITS = {
    "flow": Limit("flow", 1e-6, 1e4, source="common practice: 1 mL/s (a seep) to 10,000 m^3/s, far above any "
                                            "culvert"),
    "slope": Limit("slope", 1e-6, MAX_SLOPE, source="common practice: 1 mm per km (flatter does not drain); "
                                                     "above 1:1 see MAX_SLOPE"),
    "n": Limit("manning_n", 0.005, 1.0, source="Chow (1959) Table 5-6 (as transcribed in the fluids library, "
                                               "fluids.open_flow) lists no lining below n = 0.008; the upper "
                                               "bound is common practice"),
    "bottom_width": Limit("length", 0.01, 100.0, zero=True, source=_LENGTH_NOTE + "; 0 is a V bottom"),
    "side_slope": Limit("side_slope", 0.05, 50.0, zero=True,
                        source="common practice: 0 is a vertical wall; 0.05:1 a near-vertical rock cut, 50:1 "
                               "flatter than any ditch side (a 2 % shoulder)"),
    "diameter": Limit("length", 0.05, 15.0, source=_LENGTH_NOTE),
    "top_width": Limit("length", 0.05, 200.0, source=_LENGTH_NOTE),
    "at_depth": Limit("length", 0.01, 20.0, source=_LENGTH_NOTE),
    "max_depth": Limit("length", 0.01, 20.0, source=_LENGTH_NOTE),
    "d50": Limit("length", 0.001, 3.0, source="common practice: coarse sand (1 mm) to the largest armour "
                                              "stone (3 m); HEC-15's own range is narrower and is warned about"),
    "bend_radius": Limit("length", 0.01, 1e5, source="common practice; a bend tighter than half the channel's "
                                                     "width is refused by the bend check itself"),
    "min_freeboard": Limit("length", 0.0, 10.0, source="common practice"),
}
LIMITS["left_slope"] = LIMITS["right_slope"] = LIMITS["side_slope"]
#: Other names the same inputs go by (in project files and forms).
LIMIT_ALIASES = {"manning_n": "n", "value": "flow", "flow.value": "flow"}


def limit_for(field: str) -> Limit | None:
    """The :data:`LIMITS` entry of ``field`` (also under its other names), or None."""
    return LIMITS.get(LIMIT_ALIASES.get(field, field))


def outside_limit(field: str, value, units=None, typed: float | None = None) -> str | None:
    """Why ``value`` [SI] is outside the range of ``field`` ("must be from ... to ..., got ..."), or None.

    The message quotes the range and the value in ``units`` (SI when None), or ``typed`` as the user gave it
    in those units; a field without a range gives None.
    """
    limit = limit_for(field)
    if limit is None or limit.holds(value):
        return None
    if units is None:
        from .units import SI as units
    shown = float(units.from_si(limit.quantity, value)) if typed is None else typed
    label = units.label(limit.quantity)
    unit = f" {label}" if label and limit.quantity not in ("slope", "manning_n") else ""
    message = f"must be {limit.describe(units)}, got {shown:.6g}{unit}"
    if limit.quantity == "slope" and value > MAX_SLOPE:
        message += f"; if you meant {shown:g} %, enter {shown / 100:g}"
    return message


def within_limit(field: str, value):
    """``value`` if it is within the range of ``field``, else InputError naming the field and the range."""
    problem = outside_limit(field, value)
    if problem:
        raise InputError(field, problem)
    return value
