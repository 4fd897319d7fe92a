"""Rainfall intensity against duration and return period (IDF relations), as a table or as a fitted formula.

The rational method takes the rainfall intensity for a duration equal to the
time of concentration and for the design return period. Two ways of giving
that relation are provided, both in SI inside (durations [s], intensities
[m/s], return periods [years]) and both answering :meth:`intensity` the same
way:

* :class:`IdfTable`, intensities printed for a few durations and return
  periods (as published by a weather service or a local drainage manual),
  read between its durations along a straight line on log-log axes;
* :class:`IdfFormula`, the fitted relation i = a / (t + b)^c for each return
  period.

Reading a table between its durations
-------------------------------------
Between two neighbouring table durations t1 < t < t2 the program takes

    log i = log i1 + (log i2 - log i1) (log t - log t1) / (log t2 - log t1)

that is, the power law i = k t^-m through the two points (a straight line on
log-log paper), so a table drawn from a power law is read back exactly. This
is common practice: IDF curves are drawn and fitted on logarithmic duration
axes because they are close to straight there (Gutierrez-Lopez, Jimenez
Hernandez and Escalante Sandoval, "Physical parameterization of IDF curves
based on short-duration storms", *Water* 11(9): 1813, 2019, describe fitting
a curve "until curves are transformed into straight lines when the axis of
duration ... is represented in logarithmic scale"). The TxDOT *Hydraulic
Design Manual* (Chapter 4, Section 12, "Rainfall Intensity") says only that
"linear interpolation or curve generation is needed to obtain intensity values
between tabular durations". What FHWA HEC-22 (3rd ed., 2009) says about reading
IDF curves was not found in the stored copies searched. A table is never read
beyond its first or last duration, nor between return periods: a duration
outside the table or a return period that is not one of its columns is refused.

The fitted formula
------------------
i = a / (t + b)^c is the form of TxDOT *Hydraulic Design Manual*, Chapter 4,
Section 12, Equation 4-21 (written there I = b / (tc + d)^e, I in in./hr, tc
in min, "e, b, d = coefficients based on rainfall IDF data"); the same general
form i = a / (b + td)^c is studied by Campos, Studart, de Souza Filho and Porto,
"On the rainfall intensity-duration-frequency curves, partial-area effect and
the rational method", *Water* 12(10): 2730, 2020. It is a curve fitted to data
over some range of durations and means nothing outside it: give that range
(``duration_range``) and the formula refuses durations outside it, as a table
does. Campos et al. (2020) also show that with c > 1 the rainfall depth i t of
the formula reaches a maximum at t = b / (c - 1) and falls after it, which no
record of rainfall can do (a longer storm holds the shorter one);
:meth:`IdfFormula.warnings` says so when that duration lies in the range of use.

Examples
--------
>>> from hydraulics.units import SI
>>> table = IdfTable([600, 1800, 3600], [10], [[SI.to_si("intensity", v)] for v in (120.0, 70.0, 45.0)])
>>> round(SI.from_si("intensity", table.intensity(1800.0, 10)), 6)
70.0
>>> formula = IdfFormula.from_customary({10: (1200.0, 10.0, 0.8)}, "si")
>>> round(SI.from_si("intensity", formula.intensity(20 * 60.0, 10)), 3)   # 1200 / (20 + 10)^0.8 mm/h
78.974
"""

from __future__ import annotations

import bisect
import math
from numbers import Real

import numpy as np

from . import validate
from .errors import InputError
from .provenance import cite
from .units import system as unit_system
from .wording import worded

__all__ = ["IdfTable", "IdfFormula", "idf_from_dict", "KINDS", "MINUTE", "RETURN_PERIOD_RTOL", "IDF_FORMULA_SOURCE",
           "IDF_DEPTH_SOURCE"]

#: One minute [s]; customary IDF relations are written with durations in minutes.
MINUTE = 60.0
#: A return period asked for matches a table column (or formula) within this relative difference.
RETURN_PERIOD_RTOL = 1e-9
#: Where the form i = a / (t + b)^c stands (provenance: ``idf_formula``).
IDF_FORMULA_SOURCE = cite("idf_formula")
#: Where the rainfall depth of an IDF relation is shown to have to grow with duration (``idf_depth_consistency``).
IDF_DEPTH_SOURCE = cite("idf_depth_consistency")


def _minutes(t: float) -> str:
    return f"{t / MINUTE:.4g} min"


def _years(values) -> str:
    return ", ".join(f"{v:g}" for v in values) + " years"


def _finite_positive(field: str, value) -> float:
    """A finite number > 0 (a plain Python or numpy scalar), else InputError naming ``field``."""
    if isinstance(value, bool) or not isinstance(value, (Real, np.floating, np.integer)):
        raise InputError(field, f"must be a number, got {value!r}")
    v = float(value)
    if not math.isfinite(v) or v <= 0:
        raise InputError(field, f"must be a finite number > 0, got {v:g}")
    return v


def _vector(field: str, values, *, minimum_length: int, shown=lambda v: f"{v:g}") -> np.ndarray:
    """A 1-D array of finite numbers > 0 in strictly increasing order, at least ``minimum_length`` long; a refusal
    quotes the values as ``shown`` writes them (with their unit)."""
    try:
        arr = np.array(values, dtype=float)
    except (TypeError, ValueError):
        raise InputError(field, f"must be a list of numbers, got {values!r}") from None
    if arr.ndim != 1:
        raise InputError(field, f"must be a flat list of numbers, got an array of shape {arr.shape}")
    if arr.size < minimum_length:
        raise InputError(field, f"must hold at least {minimum_length} values, got {arr.size}")
    for k, v in enumerate(arr):
        if not math.isfinite(v) or v <= 0:
            raise InputError(f"{field}[{k}]", f"must be a finite number > 0, got {shown(v)}")
    for k in range(1, arr.size):
        if arr[k] <= arr[k - 1]:
            raise InputError(f"{field}[{k}]", f"must be greater than the value before it ({shown(arr[k - 1])}), "
                                              f"got {shown(arr[k])}; the values must be in increasing order")
    arr.setflags(write=False)
    return arr


class _Idf:
    """What a table and a formula share: the return periods, the duration range and the checks on a request."""

    _return_periods: tuple
    _duration_range: tuple | None
    #: The intensity falls (never rises) as the duration grows: a table's columns are refused otherwise and
    #: a / (t + b)^c falls for c > 0, b >= 0. The run's flow search relies on it (hydraulics.run_inflow).
    falls_with_duration = True

    @property
    def return_periods(self) -> tuple:
        """The return periods this relation gives [years], increasing."""
        return self._return_periods

    @property
    def duration_range(self) -> tuple | None:
        """(shortest, longest) duration this relation may be read at [s]; None for a formula given without one."""
        return self._duration_range

    def _column(self, return_period) -> int:
        """Index of ``return_period`` [years] among :attr:`return_periods` (relative match within 1e-9)."""
        t = _finite_positive("return_period", return_period)
        for k, known in enumerate(self._return_periods):
            if abs(t - known) <= RETURN_PERIOD_RTOL * known:
                return k
        raise InputError("return_period", f"must be one of the return periods {self._what} gives "
                                          f"({_years(self._return_periods)}), got {t:g} years; intensities are "
                                          "not interpolated between return periods")

    def _durations(self, duration):
        """``duration`` [s] as float or float array, refused where it is not > 0 or lies outside the range."""
        d = validate.positive("duration", duration)
        if self._duration_range is None:
            return d
        low, high = self._duration_range
        if isinstance(d, float):
            shortest = longest = d
        else:
            shortest, longest = float(d.min()), float(d.max())
        if shortest < low * (1 - 1e-12):
            raise InputError("duration", f"{_minutes(shortest)} is below the shortest duration {self._what} covers "
                                         f"({_minutes(low)} to {_minutes(high)}); it is not extrapolated")
        if longest > high * (1 + 1e-12):
            raise InputError("duration", f"{_minutes(longest)} is above the longest duration {self._what} covers "
                                         f"({_minutes(low)} to {_minutes(high)}); it is not extrapolated")
        return d

    @property
    def _what(self) -> str:  # pragma: no cover - overridden
        raise NotImplementedError


class IdfTable(_Idf):
    """Rainfall intensities printed for some durations and return periods, read between durations on log-log axes.

    Parameters
    ----------
    durations : sequence of float
        Storm durations [s], at least two, strictly increasing, > 0.
    return_periods : sequence of float
        Return periods [years], strictly increasing, > 0 (the table's columns).
    intensities : array_like, shape (len(durations), len(return_periods))
        Intensity for each duration (row) and return period (column) [m/s], finite and > 0.

    Notes
    -----
    Each column must fall as the duration grows (a longer storm has a lower
    average intensity) and each row must not fall as the return period grows
    (a rarer storm is not weaker); a cell that breaks either is refused, naming
    the cell. Between durations the table is read along the power law through
    the two neighbouring points (see the module notes: common practice); it is
    never read outside its durations nor between its return periods.
    :meth:`warnings` says where the rainfall depth (intensity times duration)
    falls as the duration grows, which a record of rainfall cannot do
    (Campos et al. 2020).
    """

    _what = "the IDF table"

    def __init__(self, durations, return_periods, intensities):
        t = _vector("rainfall.durations", durations, minimum_length=2, shown=_minutes)
        periods = _vector("rainfall.return_periods", return_periods, minimum_length=1,
                          shown=lambda v: f"{v:g} years")
        try:
            cells = np.array(intensities, dtype=float)
        except (TypeError, ValueError):
            raise InputError("rainfall.intensities", "must be a table of numbers (one row per duration, one "
                                                     f"column per return period), got {intensities!r}") from None
        if cells.shape != (t.size, periods.size):
            raise InputError("rainfall.intensities", f"must have {t.size} rows (durations) of {periods.size} "
                                                     f"values (return periods), got shape {cells.shape}")
        for (r, c), v in np.ndenumerate(cells):
            if not math.isfinite(v) or v <= 0:
                raise InputError(f"rainfall.intensities[{r}][{c}]",
                                 worded("must be a finite intensity > 0, got {v}", v=(v, "intensity")))
        for c in range(periods.size):
            for r in range(1, t.size):
                if not cells[r, c] < cells[r - 1, c]:
                    raise InputError(f"rainfall.intensities[{r}][{c}]", worded(
                        "{i} at {t} is not below {i0} at {t0} ({period} years); intensity must fall as the duration "
                        "grows", i=(cells[r, c], "intensity"), t=_minutes(t[r]), i0=(cells[r - 1, c], "intensity"),
                        t0=_minutes(t[r - 1]), period=f"{periods[c]:g}"))
        for r in range(t.size):
            for c in range(1, periods.size):
                if cells[r, c] < cells[r, c - 1]:
                    raise InputError(f"rainfall.intensities[{r}][{c}]", worded(
                        "{i} for {period} years is below {i0} for {period0} years ({t}); intensity must not fall as "
                        "the return period grows", i=(cells[r, c], "intensity"), period=f"{periods[c]:g}",
                        i0=(cells[r, c - 1], "intensity"), period0=f"{periods[c - 1]:g}", t=_minutes(t[r])))
        cells.setflags(write=False)
        self._t, self._periods, self._cells = t, periods, cells
        self._return_periods = tuple(float(p) for p in periods)
        self._duration_range = (float(t[0]), float(t[-1]))
        self._log_t = np.log(t)
        self._log_i = np.log(cells)
        self._log_t.setflags(write=False)
        self._log_i.setflags(write=False)
        self._t_list = [float(v) for v in t]

    @property
    def durations(self) -> np.ndarray:
        """The table's durations [s] (read-only)."""
        return self._t

    @property
    def intensities(self) -> np.ndarray:
        """The table's intensities [m/s], one row per duration (read-only)."""
        return self._cells

    def intensity(self, duration, return_period):
        """Rainfall intensity [m/s] for ``duration`` [s] (float or array) and one of the table's return periods.

        Read on the straight line through the two neighbouring table points on
        log-log axes (common practice, see the module notes). A float duration
        gives a float, an array an array of the same shape.
        """
        col = self._column(return_period)
        d = self._durations(duration)
        if isinstance(d, float):
            k = min(max(bisect.bisect_right(self._t_list, d), 1), len(self._t_list) - 1)
            lt0, lt1 = self._log_t[k - 1], self._log_t[k]
            li0, li1 = self._log_i[k - 1, col], self._log_i[k, col]
            x = min(max(math.log(d), lt0), lt1)  # d lies in the table, up to the 1e-12 let through on its ends
            return math.exp(li0 + (li1 - li0) * (x - lt0) / (lt1 - lt0))
        return np.exp(np.interp(np.log(d), self._log_t, self._log_i[:, col]))

    def warnings(self) -> list:
        """Where the rainfall depth i t falls from one duration to the next (Campos et al. 2020), in words."""
        notes = []
        depth = self._cells * self._t[:, None]
        for c, period in enumerate(self._periods):
            for r in range(1, self._t.size):
                if depth[r, c] < depth[r - 1, c]:
                    notes.append(worded(
                        "IDF table, {period} years: the rainfall depth falls from {p0} in {t0} to {p1} in {t1}; a "
                        "longer storm holds the shorter one, so the table is not consistent ({source}); check its "
                        "source", source=IDF_DEPTH_SOURCE, period=f"{period:g}",
                        p0=(depth[r - 1, c], "small_length"), t0=_minutes(self._t[r - 1]),
                        p1=(depth[r, c], "small_length"), t1=_minutes(self._t[r])))
        return notes

    def to_dict(self) -> dict:
        """The table in SI with plain JSON types: durations [s], return periods [years], intensities [m/s]."""
        return {"kind": "table", "durations": [float(v) for v in self._t],
                "return_periods": [float(v) for v in self._periods],
                "intensities": [[float(v) for v in row] for row in self._cells]}

    @classmethod
    def from_dict(cls, d) -> "IdfTable":
        """The table written by :meth:`to_dict`; anything else is refused naming the missing or bad entry."""
        _expect_kind(d, "table")
        return cls(_entry(d, "durations"), _entry(d, "return_periods"), _entry(d, "intensities"))

    def __eq__(self, other):
        return isinstance(other, IdfTable) and self.to_dict() == other.to_dict()

    __hash__ = None

    def __repr__(self):
        return (f"IdfTable(durations {_minutes(self._t[0])} to {_minutes(self._t[-1])} ({self._t.size}), "
                f"return periods {_years(self._return_periods)})")


class IdfFormula(_Idf):
    """The fitted relation i = a / (t + b)^c, one set of coefficients per return period (SI).

    Parameters
    ----------
    coefficients : mapping
        return period [years] -> (a, b, c): a > 0 [m/s * s^c], b >= 0 [s], c > 0 [-], with t in seconds and i in
        m/s. :meth:`from_customary` converts the published forms (minutes and mm/h or in/h).
    duration_range : (float, float), optional
        (shortest, longest) duration the formula was fitted on [s]; outside it :meth:`intensity` refuses, as a
        table does. Without it the formula is read at any duration > 0.

    Notes
    -----
    Form of TxDOT *Hydraulic Design Manual* Ch. 4, Sec. 12, Eq. 4-21 (I = b / (tc + d)^e, in./hr and min) and of
    Campos et al. (2020), *Water* 12(10): 2730 (i = a / (b + td)^c); see the module notes. A fitted relation is
    only valid over the durations it was fitted on: state them with ``duration_range``.
    """

    _what = "the IDF formula"

    def __init__(self, coefficients, duration_range=None):
        if not hasattr(coefficients, "items") or not coefficients:
            raise InputError("rainfall.coefficients", "must map each return period [years] to its (a, b, c), got "
                                                      f"{coefficients!r}")
        table = {}
        for period, abc in coefficients.items():
            p = _finite_positive("rainfall.coefficients", period)
            field = f"rainfall.coefficients[{p:g}]"
            try:
                a, b, c = (float(v) for v in abc)
            except (TypeError, ValueError):
                raise InputError(field, f"must be three numbers (a, b, c), got {abc!r}") from None
            for name, v in (("a", a), ("b", b), ("c", c)):
                if not math.isfinite(v):
                    raise InputError(f"{field}.{name}", f"must be a finite number, got {v:g}")
            if a <= 0:
                raise InputError(f"{field}.a", f"must be > 0, got {a:g}")
            if b < 0:
                raise InputError(f"{field}.b", f"must be >= 0 [s], got {b:g}")
            if c <= 0:
                raise InputError(f"{field}.c", f"must be > 0, got {c:g}")
            if any(abs(p - q) <= RETURN_PERIOD_RTOL * q for q in table):
                raise InputError(field, f"the return period {p:g} years is given twice")
            table[p] = (a, b, c)
        self._coefficients = {p: table[p] for p in sorted(table)}
        self._return_periods = tuple(self._coefficients)
        self._rows = tuple(self._coefficients.values())
        if duration_range is None:
            self._duration_range = None
        else:
            try:
                low, high = duration_range
            except (TypeError, ValueError):
                raise InputError("rainfall.duration_range", "must be (shortest, longest) [s], got "
                                                            f"{duration_range!r}") from None
            low = _finite_positive("rainfall.duration_range[0]", low)
            high = _finite_positive("rainfall.duration_range[1]", high)
            if high <= low:
                raise InputError("rainfall.duration_range[1]", f"must be above the shortest duration "
                                                               f"{_minutes(low)}, got {_minutes(high)}")
            self._duration_range = (low, high)

    @property
    def coefficients(self) -> dict:
        """return period [years] -> (a [m/s s^c], b [s], c [-]), in increasing return period."""
        return dict(self._coefficients)

    @classmethod
    def from_customary(cls, coefficients, units, duration_range=None) -> "IdfFormula":
        """The formula from coefficients as published: t and b in minutes, i in mm/h (``"si"``) or in/h (``"us"``).

        Exactly: i [m/s] = f a' / ((t + b) / 60)^c with f the SI value of one mm/h or in/h, so the SI
        coefficients are a = f a' 60^c, b = 60 b', c = c'. ``duration_range`` stays in seconds [s].
        """
        factor = _intensity_unit(units)
        if not hasattr(coefficients, "items"):
            raise InputError("rainfall.coefficients", "must map each return period [years] to its (a, b, c), got "
                                                      f"{coefficients!r}")
        si = {}
        for period, abc in coefficients.items():
            try:
                a, b, c = (float(v) for v in abc)
            except (TypeError, ValueError):
                raise InputError(f"rainfall.coefficients[{period}]", f"must be three numbers (a, b, c), got "
                                                                     f"{abc!r}") from None
            si[period] = (factor * a * MINUTE ** c, MINUTE * b, c)
        return cls(si, duration_range)

    def customary(self, units) -> dict:
        """The coefficients as published: return period -> (a', b' [min], c) with i in mm/h or in/h (``units``)."""
        factor = _intensity_unit(units)
        return {p: (a / (factor * MINUTE ** c), b / MINUTE, c) for p, (a, b, c) in self._coefficients.items()}

    def intensity(self, duration, return_period):
        """Rainfall intensity [m/s] = a / (t + b)^c for ``duration`` t [s] (float or array) and a given return period.

        Refused outside ``duration_range`` when one was given (a fitted relation is not extrapolated).
        """
        a, b, c = self._rows[self._column(return_period)]
        d = self._durations(duration)
        return a / (d + b) ** c

    def warnings(self) -> list:
        """Where the formula's rainfall depth i t falls as the duration grows (c > 1; Campos et al. 2020), in words.

        With c > 1 the depth a t / (t + b)^c peaks at t = b / (c - 1); the note is given when that duration lies
        below the longest duration of use (any duration when no range was given).
        """
        notes = []
        for period, (a, b, c) in self._coefficients.items():
            if c <= 1:
                continue
            peak = b / (c - 1)
            if self._duration_range is None or peak < self._duration_range[1]:
                notes.append(worded(
                    "IDF formula, {period} years: with c = {c} above 1 the rainfall depth i t is largest at t = "
                    "b/(c - 1) = {peak} and falls for longer storms, which rainfall cannot do ({source}); check the "
                    "coefficients", source=IDF_DEPTH_SOURCE, period=f"{period:g}", c=f"{c:g}", peak=_minutes(peak)))
        return notes

    def to_dict(self) -> dict:
        """The formula in SI with plain JSON types: a [m/s s^c], b [s], c [-], duration range [s] or None."""
        return {"kind": "formula",
                "coefficients": [{"return_period": p, "a": a, "b": b, "c": c}
                                 for p, (a, b, c) in self._coefficients.items()],
                "duration_range": None if self._duration_range is None else list(self._duration_range)}

    @classmethod
    def from_dict(cls, d) -> "IdfFormula":
        """The formula written by :meth:`to_dict`; anything else is refused naming the missing or bad entry."""
        _expect_kind(d, "formula")
        rows = _entry(d, "coefficients")
        if not isinstance(rows, list):
            raise InputError("rainfall.coefficients", f"must be a list of {{return_period, a, b, c}}, got {rows!r}")
        coefficients = {}
        for k, row in enumerate(rows):
            if not isinstance(row, dict):
                raise InputError(f"rainfall.coefficients[{k}]", f"must be a table of return_period, a, b, c, got "
                                                                f"{row!r}")
            missing = [name for name in ("return_period", "a", "b", "c") if name not in row]
            if missing:
                raise InputError(f"rainfall.coefficients[{k}]", f"is missing {', '.join(missing)}")
            period = _finite_positive(f"rainfall.coefficients[{k}].return_period", row["return_period"])
            if period in coefficients:
                raise InputError(f"rainfall.coefficients[{k}]", f"the return period {period:g} years is given twice")
            coefficients[period] = (row["a"], row["b"], row["c"])
        return cls(coefficients, d.get("duration_range"))

    def __eq__(self, other):
        return isinstance(other, IdfFormula) and self.to_dict() == other.to_dict()

    __hash__ = None

    def __repr__(self):
        span = "any duration" if self._duration_range is None else \
            f"{_minutes(self._duration_range[0])} to {_minutes(self._duration_range[1])}"
        return f"IdfFormula(return periods {_years(self._return_periods)}, {span})"


def _intensity_unit(units) -> float:
    """SI value [m/s] of the customary intensity unit of ``units``: mm/h for "si", in/h for "us"."""
    return unit_system(units).unit("intensity").factor


def _expect_kind(d, kind: str) -> None:
    if not isinstance(d, dict):
        raise InputError("rainfall", f"must be a table with a 'kind', got {d!r}")
    if d.get("kind") != kind:
        raise InputError("rainfall.kind", f"must be {kind!r} here, got {d.get('kind')!r}")


def _entry(d: dict, key: str):
    try:
        return d[key]
    except KeyError:
        raise InputError(f"rainfall.{key}", "is missing") from None


#: The kinds of IDF relation a file may hold.
KINDS = {"table": IdfTable, "formula": IdfFormula}


def idf_from_dict(d):
    """The IDF table or formula written by its ``to_dict`` (dispatching on ``d["kind"]``)."""
    if not isinstance(d, dict):
        raise InputError("rainfall", f"must be a table with a 'kind' ('table' or 'formula'), got {d!r}")
    kind = d.get("kind")
    if kind not in KINDS:
        raise InputError("rainfall.kind", f"must be one of {', '.join(repr(k) for k in KINDS)}, got {kind!r}")
    return KINDS[kind].from_dict(d)

