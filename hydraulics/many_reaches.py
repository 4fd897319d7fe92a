"""Many channel reaches at once: the vectorised uniform-flow check of an inventory.

A road agency's ditch inventory holds thousands of reaches, each a section,
a slope, a design flow and a roughness (Manning's n or a named lining). This
module evaluates them all with the array form of the core: every open reach
(trapezoid, V-ditch, rectangle) is one ``Trapezoid`` with array dimensions,
every pipe one ``Circle``; :func:`hydraulics.analyse` solves each group in a
single vectorised call. The quantities and their sources are those of
:mod:`hydraulics.analysis` (Manning's equation, Chow 1959; bed shear
tau_d = gamma y S, FHWA HEC-15, Kilgore and Cotton, 3rd ed., 2005, Eq. 3.1).

Nothing here raises for one bad reach. Each reach gets a ``verdict`` and a
``reason`` in words:

* ``invalid``: an input is missing, not applicable to the shape, or out of
  range; nothing is computed for it;
* ``no-solution``: the input is valid but the section cannot carry the flow
  (a pipe that would surcharge); nothing is computed for it;
* ``hydraulics-only``: no lining was named, so the depths, velocity, Froude
  number and bed shear are computed but not compared with a permissible shear;
* ``not-checked``: a lining was named but cannot be checked (an entry whose
  values the user has to fill in from a data sheet);
* ``stable`` / ``unstable``: the lining's permissible shear holds / does not
  hold the design shear with the required safety factor at every place
  checked (bed and side slopes; FHWA HEC-15 permissible-shear method,
  :func:`hydraulics.shear_checks.shear_checks`);
* ``non-erodible``: a rigid lining, not checked for shear (common practice).

Warnings (near-critical flow, flow that is not fully turbulent, a pipe above
its full-flow capacity, and on a lined reach the cautions ``check_lining``
gives: silt settling, side slopes steeper than 1V:3H) are added to the reason
in the words and order of the single-channel check; they do not change the
verdict. A lining with a unit cost prices each of its reaches
(``cost_per_length``) as the single-channel check does. Arrays are SI throughout; ``display`` only sets the units that the
reasons quote values in. The reasons are kept as the texts each step adds (:mod:`hydraulics.batch_reasons`), each text
shared by many reaches made once, and joined only when read (``BatchResult.reason``).
"""

from __future__ import annotations

import difflib
import warnings
from collections import Counter
from dataclasses import dataclass, field
from itertools import repeat

import numpy as np

from . import units as hu
from .batch_reasons import Coded, Composed, Reasons, object_array, text_array
from .analysis import (FULL_PIPE_CAUTION, HIGH_N_CAUTION, HIGHEST_N, MIN_TURBULENT_REYNOLDS, NEAR_CRITICAL_BAND,
                       NEAR_CRITICAL_CAUTION, SUPERCRITICAL_CAUTION, TURBULENCE_CAUTION, analyse, full_pipe_flow)
from .errors import HydraulicsError, InputError
from .freeboard import ditch_tops, too_shallow_warning
from .lining_quantities import cost_per_length
from .linings import load_catalogue
from .linings import hec15
from .linings.hec15 import ValidityWarning
from .sections import SHAPE_DIMENSIONS, Circle, Trapezoid
from .shear_checks import shear_checks
from .stability import ROADSIDE_SIDE_SLOPE, SELF_CLEANING_VELOCITY, side_slope_cautions, silting_caution
from .solvers import flow_at_depth, max_flow
from . import validate
from .validate import MAX_SLOPE
from .wording import distinct_groups, in_units, printed_alike, restate_each, significant, worded

#: Shapes an inventory row may name (a parabola needs two dimensions an inventory does not carry).
SHAPES = ("trapezoid", "triangle", "rectangle", "circle")
#: Every verdict a reach can get, in the order a summary lists them.
VERDICTS = ("stable", "unstable", "non-erodible", "hydraulics-only", "not-checked", "no-solution", "invalid")
#: Fields of a reach, each with the physical quantity its values are in (see hydraulics.units).
NUMERIC_FIELDS = {
    "bottom_width": "length", "left_slope": "side_slope", "right_slope": "side_slope", "diameter": "length",
    "slope": "slope", "flow": "flow", "d50": "length", "n": "manning_n",
}
#: Result arrays (SI) with their quantity.
RESULT_FIELDS = {
    "normal_depth": "length", "critical_depth": "length", "velocity": "velocity", "froude": "ratio",
    "bed_shear": "shear", "permissible_shear": "shear", "safety_factor": "ratio",
    "cost_per_length": "cost_per_length",
}
#: Warnings a reach can carry (in its reason and in BatchResult.flags), with a short label.
WARNINGS = {
    "near_critical": "near-critical flow",
    "supercritical": "supercritical flow",
    "not_turbulent": "flow not fully turbulent",
    "high_n": "lining's n above the input range",
    "above_full_flow": "pipe above its full-flow capacity",
    "silting": "velocity low enough for silt to settle",
    "steep_sides": "side slope steeper than 1V:3H",
    "too_shallow": "pipe too shallow for its depth plus freeboard",
    "vegetated_range": "grass permissible shear above the published range",
}
#: Reaches solved per vectorised call; bounds memory and paces the progress callback.
CHUNK = 100_000

#: The dimension columns of an inventory (each side slope its own column).
_ALL_DIMENSIONS = ("bottom_width", "left_slope", "right_slope", "diameter")
# Which of them each shape needs (those it takes, sections.SHAPE_DIMENSIONS); the others must be blank (or 0,
# which many inventories write for "none").
_DIMENSIONS = {shape: tuple(d for d in _ALL_DIMENSIONS if d in SHAPE_DIMENSIONS[shape][1]) for shape in SHAPES}
#: Code of each shape in Reaches.kind (its index in SHAPES; -1 for any other text).
SHAPE_CODE = {name: code for code, name in enumerate(SHAPES)}
_CIRCLE = SHAPE_CODE["circle"]


@dataclass
class Reaches:
    """An inventory as arrays, SI. ``nan`` marks a blank number, ``""`` a blank text.

    ``shape`` and ``lining`` are object arrays of str (shape in lower case);
    the numeric fields are float arrays of one length. ``unreadable`` maps a
    field to a boolean mask of entries that were present but could not be read
    as numbers (a reader fills it, with its own reasons in ``notes``), so that
    they are not reported a second time as missing.
    """

    shape: np.ndarray
    bottom_width: np.ndarray
    left_slope: np.ndarray
    right_slope: np.ndarray
    diameter: np.ndarray
    slope: np.ndarray
    flow: np.ndarray
    lining: np.ndarray
    d50: np.ndarray
    n: np.ndarray
    notes: np.ndarray = None          # object array of str: problems found while reading ("" = none)
    unreadable: dict = field(default_factory=dict)
    #: Worked out from ``shape`` and ``lining`` unless a reader that has them already passes them:
    #: the code of each shape (SHAPE_CODE, -1 unknown) and whether a lining is named.
    kind: np.ndarray = None
    named: np.ndarray = None

    def __post_init__(self):
        size = len(self.shape)
        for name in ("bottom_width", "left_slope", "right_slope", "diameter", "slope", "flow", "d50", "n"):
            arr = np.asarray(getattr(self, name), dtype=float)
            if arr.shape != (size,):
                raise InputError(name, f"must be a 1-D array of {size} values (one per reach), got shape {arr.shape}")
            setattr(self, name, arr)
        self.shape = np.asarray(self.shape, dtype=object)
        self.lining = np.asarray(self.lining, dtype=object)
        if self.lining.shape != (size,):
            raise InputError("lining", f"must hold one entry per reach ({size}), got shape {self.lining.shape}")
        if self.notes is None:
            self.notes = text_array(size)
        # Index of the shape in SHAPES (-1: unknown) and "a lining is named", worked out once.
        if self.kind is None:
            self.kind = np.fromiter(map(SHAPE_CODE.get, self.shape.tolist(), repeat(-1, size)), dtype=np.int8,
                                    count=size)
        if self.named is None:
            self.named = np.fromiter(map(bool, self.lining.tolist()), dtype=bool, count=size)
        for name in ("kind", "named"):
            if np.shape(getattr(self, name)) != (size,):
                raise InputError(name, f"must hold one entry per reach ({size}), got shape "
                                       f"{np.shape(getattr(self, name))}")

    def __len__(self):
        return len(self.shape)

    def take(self, index) -> "Reaches":
        """The reaches at ``index`` (a slice, integer array or mask)."""
        names = ("shape", "bottom_width", "left_slope", "right_slope", "diameter", "slope", "flow", "lining",
                 "d50", "n", "notes")
        return Reaches(**{k: getattr(self, k)[index] for k in names},
                       unreadable={k: v[index] for k, v in self.unreadable.items()},
                       kind=self.kind[index], named=self.named[index])


@dataclass
class BatchResult:
    """Results per reach, SI; ``nan`` where a value was not computed."""

    normal_depth: np.ndarray
    critical_depth: np.ndarray
    velocity: np.ndarray
    froude: np.ndarray
    bed_shear: np.ndarray
    permissible_shear: np.ndarray
    safety_factor: np.ndarray
    #: The user's unit cost times the lined width (or layer volume) to the ditch top [$/m]; nan without a cost.
    cost_per_length: np.ndarray
    verdict: np.ndarray     # object array of str, one of VERDICTS
    #: The reasons in words, as kept while checking: one Reasons for each group of reaches checked together, in
    #: row order (:attr:`reason` joins them).
    reasons: list
    #: Manning's n at normal depth [s/m^(1/3)] (the lining's, where it depends on depth).
    manning_n: np.ndarray = None
    #: Boolean masks of the warnings in the reasons, keyed as in WARNINGS.
    flags: dict = field(default_factory=dict)
    #: Notes that concern groups of reaches rather than one (e.g. a relation's range for a lining).
    messages: list = field(default_factory=list)
    #: Where the lowest safety factor was found ("bed", "side slopes", "left side slope", ...; "" where the shear
    #: was not compared), object array of str.
    governs: np.ndarray = None

    @classmethod
    def empty(cls, size: int) -> "BatchResult":
        nan = lambda: np.full(size, np.nan)  # noqa: E731
        return cls(**{k: nan() for k in RESULT_FIELDS}, verdict=text_array(size),
                   reasons=[Reasons(size)], manning_n=nan(),
                   flags={k: np.zeros(size, dtype=bool) for k in WARNINGS}, governs=text_array(size))

    def __len__(self):
        return len(self.verdict)

    @property
    def reason(self) -> np.ndarray:
        """Each reach's reason in words (object array of str), joined from :attr:`reasons` when first read."""
        if len(self.reasons) == 1:
            return self.reasons[0].joined()
        return np.concatenate([r.joined() for r in self.reasons]) if self.reasons else text_array(0)

    def reason_at(self, rows) -> np.ndarray:
        """The reasons of ``rows`` alone (object array of str), without joining every reach's."""
        rows = np.asarray(rows, dtype=np.intp)
        out = text_array(len(rows))
        start = 0
        for reasons in self.reasons:
            mine = (rows >= start) & (rows < start + len(reasons))
            if mine.any():
                out[mine] = reasons.joined_at(rows[mine] - start)
            start += len(reasons)
        return out

    def counts(self) -> dict:
        """Number of reaches per verdict, every verdict listed (zeros included)."""
        found = Counter(self.verdict.tolist())
        return {v: int(found.get(v, 0)) for v in VERDICTS}

    @property
    def shear_ratio(self) -> np.ndarray:
        """Design over permissible shear where it is highest, 1 / safety_factor (nan: not checked; inf: no hold).

        Stable needs the ratio at or below 1 / the required safety factor (1 for
        most linings, up to 1/1.5 for stone, HEC-15 Table 6.1).
        """
        with np.errstate(divide="ignore", invalid="ignore"):
            return 1.0 / self.safety_factor

    def _fill(self, index, other: "BatchResult"):
        """Copy ``other``'s values into the rows ``index`` (the reasons are gathered by the caller)."""
        for k in (*RESULT_FIELDS, "verdict", "governs"):
            getattr(self, k)[index] = getattr(other, k)
        self.manning_n[index] = other.manning_n
        for k in WARNINGS:
            self.flags[k][index] = other.flags[k]
        self.messages.extend(m for m in other.messages if m not in self.messages)


# ----------------------------------------------------------------------------- screening

def _fmt(value: float) -> str:
    return f"{value:.6g}"


def _quote(values, quantity, display) -> callable:
    """Formatter of the bad value at row i in the display units, with the unit label."""
    label = display.label(quantity)
    suffix = f" {label}" if label and quantity not in ("slope", "side_slope") else ""

    def text(i):
        return _fmt(display.from_si(quantity, float(values[i]))) + suffix
    return text


def screen(reaches: Reaches, display: hu.UnitSystem = hu.SI) -> np.ndarray:
    """Reasons why each reach cannot be computed ("" for a reach that can).

    Checks, per reach: a known shape; the dimensions that shape needs, each
    finite and in range, and no other dimension (blank or 0 only); a flow
    > 0; a slope > 0 and <= 1 (a ratio, not a percentage); Manning's n in
    (0, 1] or a lining; a D50 > 0 only with a lining (0 in a dimension or D50
    that does not apply reads as "none"). Reasons quote values in
    the ``display`` units. Every problem of a reach is listed, separated by
    "; ".
    """
    size = len(reaches)
    problems = {}

    def add(mask, message):
        """``message`` is a str or a function of the row index."""
        for i in np.flatnonzero(mask):
            problems.setdefault(int(i), []).append(message(i) if callable(message) else message)

    shape = reaches.shape
    known = reaches.kind >= 0
    blank_shape = ~known & (shape == "")
    add(blank_shape, "shape: is missing (trapezoid, triangle, rectangle or circle)")
    add(~known & ~blank_shape,
        lambda i: f"shape: must be trapezoid, triangle, rectangle or circle, got {shape[i]!r}"
                  + (" (an inventory has no columns for a parabola's top width)" if shape[i] == "parabola" else ""))

    def outside(name, values, where):
        """Reaches among ``where`` whose ``name`` lies outside its design range (validate.LIMITS)."""
        limit = validate.limit_for(name)
        with np.errstate(invalid="ignore"):
            bad = where & ~limit.holds(values)
        add(bad, lambda i: f"{name}: {validate.outside_limit(name, float(values[i]), display)}")

    def unreadable(name):
        return reaches.unreadable.get(name, np.zeros(size, dtype=bool))

    def missing(name):
        return np.isnan(getattr(reaches, name)) & ~unreadable(name)

    # Dimensions, per shape.
    for kind, needed in _DIMENSIONS.items():
        rows = reaches.kind == SHAPE_CODE[kind]
        if not rows.any():
            continue
        for name in _ALL_DIMENSIONS:
            v = getattr(reaches, name)
            q = _quote(v, NUMERIC_FIELDS[name], display)
            if name in needed:
                add(rows & missing(name), f"{name}: is missing (needed for a {kind})")
                strict = kind in ("rectangle", "circle")  # width or diameter > 0; side slopes and trapezoid b >= 0
                bad = (v <= 0) if strict else (v < 0)
                add(rows & bad, lambda i, name=name, q=q, op=">" if strict else ">=":
                    f"{name}: must be {op} 0, got {q(i)}")
                outside(name, v, rows & (v > 0))
            else:
                add(rows & (v != 0) & ~np.isnan(v),
                    lambda i, name=name, kind=kind, q=q:
                    f"{name}: does not apply to a {kind} (leave it blank), got {q(i)}")
        if kind == "trapezoid":
            flat = rows & (reaches.bottom_width == 0) & (reaches.left_slope == 0) & (reaches.right_slope == 0)
            add(flat, "bottom_width: must be > 0 when both side slopes are 0 (the section has no width)")
        if kind == "triangle":
            add(rows & (reaches.left_slope + reaches.right_slope == 0),
                "left_slope, right_slope: at least one must be > 0 for a V-ditch")

    q = reaches.flow
    add(missing("flow"), "flow: is missing")
    add(q <= 0, lambda i, f=_quote(q, "flow", display): f"flow: must be > 0, got {f(i)}")
    outside("flow", q, q > 0)

    s = reaches.slope
    add(missing("slope"), "slope: is missing")
    add(s <= 0, lambda i: f"slope: must be > 0 (a falling grade as a ratio; zero or adverse slopes have no "
                          f"normal depth), got {_fmt(s[i])}")
    add(s > MAX_SLOPE, lambda i: f"slope: must be a ratio <= {MAX_SLOPE:g}, got {_fmt(s[i])}; if you meant "
                                 f"{_fmt(s[i])} %, enter {_fmt(s[i] / 100)}")
    outside("slope", s, (s > 0) & (s <= MAX_SLOPE))

    n = reaches.n
    no_lining = ~reaches.named
    add(missing("n") & no_lining, "n, lining: give Manning's n or a lining")
    add((n <= 0) | (n > 1), lambda i: f"n: must be > 0 and <= 1, got {_fmt(n[i])} (Manning's n is a small "
                                      "number such as 0.013)")
    outside("n", n, (n > 0) & (n <= 1))

    d50 = reaches.d50
    add(d50 < 0, lambda i, f=_quote(d50, "length", display): f"d50: must be > 0 (or blank), got {f(i)}")
    add(no_lining & (d50 > 0), lambda i, f=_quote(d50, "length", display):
        f"d50: applies to a stone lining and no lining is named, got {f(i)}")
    outside("d50", d50, (d50 > 0) & ~no_lining)

    out = text_array(size)
    notes = reaches.notes
    for i in sorted(set(problems) | {int(i) for i in np.flatnonzero(notes != "")}):
        out[i] = "; ".join(([notes[i]] if notes[i] else []) + problems.get(i, []))
    return out


# ----------------------------------------------------------------------------- hydraulics

def _flatten(values, default=0.0):
    return np.where(np.isnan(values), default, values)


def _open_section(reaches, idx):
    return Trapezoid(bottom_width=_flatten(reaches.bottom_width[idx]), left_slope=_flatten(reaches.left_slope[idx]),
                     right_slope=_flatten(reaches.right_slope[idx]))


def _pipe_section(reaches, idx):
    return Circle(diameter=reaches.diameter[idx])


def _analyse_robust(make_section, reaches, idx, n, failures, display):
    """hy.analyse on the reaches ``idx``; a failing group is halved until the failing reaches are found.

    Returns a list of (index array, ChannelResult); ``failures`` gets {row: message in ``display`` units}.
    """
    try:
        return [(idx, analyse(make_section(reaches, idx), reaches.flow[idx], reaches.slope[idx], n))]
    except HydraulicsError as exc:
        if len(idx) == 1:
            failures[int(idx[0])] = exc.in_units(display).replace(" (element 0)", "")
            return []
    half = len(idx) // 2
    return (_analyse_robust(make_section, reaches, idx[:half], _part(n, slice(None, half)), failures, display)
            + _analyse_robust(make_section, reaches, idx[half:], _part(n, slice(half, None)), failures, display))


def _part(n, index):
    """The n of some reaches: a per-reach array is indexed, a shared roughness model is not (a stone model of
    one size per reach gives the model of those reaches)."""
    if isinstance(n, np.ndarray):
        return n[index]
    return n.take(index) if hasattr(n, "take") else n


def solve_hydraulics(reaches: Reaches, idx, n, out: BatchResult, display: hu.UnitSystem = hu.SI) -> np.ndarray:
    """Fill the hydraulic results of the reaches ``idx`` (screened valid) with Manning's n ``n``.

    ``n`` is an array (one n per reach of ``idx``) or one roughness shared by
    all of them (a float or a depth-dependent model such as a lining's).
    Open reaches are solved as one trapezoid array, pipes as one circle array.
    A pipe asked to carry more than its largest part-full flow gets the
    verdict ``no-solution``. Returns the mask (over ``idx``) of reaches solved;
    their reasons get the warnings, their verdicts are left to the caller.
    """
    idx = np.asarray(idx, dtype=np.intp)
    if not hasattr(n, "manning_n"):
        n = np.broadcast_to(np.asarray(n, dtype=float), idx.shape)
    if not len(idx):
        return np.zeros(0, dtype=bool)
    pipe = reaches.kind[idx] == _CIRCLE
    failures = {}
    parts = []
    open_pos = np.flatnonzero(~pipe)
    if len(open_pos):
        parts += _analyse_robust(_open_section, reaches, idx[open_pos], _part(n, open_pos), failures, display)
    pipe_pos = np.flatnonzero(pipe)
    if len(pipe_pos):
        rows = idx[pipe_pos]
        section = _pipe_section(reaches, rows)
        q_max = max_flow(section, reaches.slope[rows], _part(n, pipe_pos))
        over = reaches.flow[rows] > q_max
        unit = display.label("flow")
        for row, q, q_top in zip(rows[over].tolist(), display.from_si("flow", reaches.flow[rows][over]).tolist(),
                                 display.from_si("flow", q_max[over]).tolist()):
            failures[row] = (f"flow {_fmt(q)} {unit} exceeds this pipe's largest part-full flow {_fmt(q_top)} {unit} "
                             "on this slope (Manning): it would surcharge; use a larger pipe")
        keep = ~over
        if keep.any():
            parts += _analyse_robust(_pipe_section, reaches, rows[keep], _part(_part(n, pipe_pos), keep), failures,
                                     display)

    done = np.zeros(len(out), dtype=bool)
    for rows, res in parts:
        out.normal_depth[rows] = res.normal_depth
        out.critical_depth[rows] = res.critical_depth
        out.velocity[rows] = res.velocity
        out.froude[rows] = res.froude
        out.bed_shear[rows] = res.bed_shear
        out.manning_n[rows] = res.manning_n
        _warn(reaches, rows, res, out, display)
        done[rows] = True
    if failures:
        failed = np.fromiter(failures, dtype=np.intp, count=len(failures))
        out.verdict[failed] = "no-solution"
        _reasons(out).set(failed, object_array(list(failures.values())))
    return done[idx]


def _warn(reaches, rows, res, out, display):
    """Per-reach warnings into the reasons and ``out.flags`` (limits from hydraulics.analysis)."""
    lo, hi = NEAR_CRITICAL_BAND
    fr = np.asarray(res.froude)
    for key, mask, caution in (("near_critical", (fr >= lo) & (fr <= hi), NEAR_CRITICAL_CAUTION),
                               ("supercritical", fr > hi, SUPERCRITICAL_CAUTION)):
        out.flags[key][rows[mask]] = True
        _note(out, rows[mask], _each_2f(fr[mask], caution.replace("%", "%%").format(fr="%s")))
    re = np.asarray(res.reynolds)
    slow = re < MIN_TURBULENT_REYNOLDS
    out.flags["not_turbulent"][rows[slow]] = True
    whole, which = np.unique(np.rint(re[slow]), return_inverse=True)     # as "%.0f" rounds: half to even
    _note(out, rows[slow], Coded(object_array([TURBULENCE_CAUTION.format(re=f"{r:.0f}") for r in whole.tolist()]),
                                 which.ravel()))
    n_used = np.broadcast_to(np.asarray(res.manning_n, dtype=float), rows.shape)
    high = n_used > HIGHEST_N     # a lining's relation far outside its flows (few reaches: each worded alone)
    out.flags["high_n"][rows[high]] = True
    _note(out, rows[high], object_array([HIGH_N_CAUTION.format(n=significant(n)) for n in n_used[high].tolist()]))
    pipe = reaches.kind[rows] == _CIRCLE
    if pipe.any():
        prow = rows[pipe]
        d = reaches.diameter[prow]
        q_full = full_pipe_flow(Circle(diameter=d), reaches.slope[prow], np.asarray(res.manning_n)[pipe])
        full = reaches.flow[prow] > q_full
        out.flags["above_full_flow"][prow[full]] = True
        if full.any():
            _note(out, prow[full], object_array(restate_each(worded(FULL_PIPE_CAUTION, q_full=(1.0, "flow")), "q_full",
                                                         q_full[full].tolist(), display)))


def _coded(clear, grouped: list, which, alone: list) -> Coded:
    """The texts of rows given as ``grouped[which]`` where ``clear`` and as ``alone`` (one each, in row order)
    elsewhere, each made once."""
    index = np.empty(len(clear), dtype=np.intp)
    index[clear] = np.ravel(which)
    index[~clear] = len(grouped) + np.arange(len(alone))
    return Coded(object_array(list(grouped) + list(alone)), index)


def _each_2f(values, template: str) -> Coded:
    """``template % f"{v:.2f}"`` for each value, each distinct text made once (see :func:`_fixed`)."""
    numbers = _fixed(values, 2)
    return Coded(object_array([template % t for t in numbers.texts.tolist()]), numbers.which)


def _fixed(values, decimals) -> Coded:
    """``"%.*f" % (d, v)`` for each value ``v`` and its ``decimals`` d (an int or one per value), each distinct text
    written once: the values are grouped by d and rint(v 10^d), the digits "%f" prints; a value within 1e-9 of a
    rounding tie there (or not finite) is written on its own, by Python, which rounds the exact binary value."""
    v = np.asarray(values, dtype=float)
    d = np.broadcast_to(np.asarray(decimals, dtype=np.intp), v.shape)
    if np.any((d < 0) | (d >= 32)):
        raise ValueError(f"decimals must lie in 0 to 31, got {d.min()} to {d.max()}")
    with np.errstate(invalid="ignore", over="ignore"):
        scaled = v * 10.0 ** d
        code = np.rint(scaled)
        clear = (np.abs(scaled - code) < 0.5 - 1e-9) & (np.abs(scaled) < 2.0 ** 52)
    key = code[clear].astype(np.int64) * 32 + d[clear]      # d < 32: "%.*f" of more decimals is not asked for
    first, which = distinct_groups(key)
    return _coded(clear, ["%.*f" % t for t in zip(d[clear][first].tolist(), v[clear][first].tolist())], which,
                  ["%.*f" % t for t in zip(d[~clear].tolist(), v[~clear].tolist())])


def _each_worded(values, display: hu.UnitSystem, make, name: str) -> Coded:
    """``in_units(make(v), display)`` for each SI value, written once per printed value.

    ``make`` words one value as its quantity ``name`` to three significant
    figures (:func:`hydraulics.wording.worded`), so values that round alike in
    ``display`` give one text (:func:`hydraulics.wording.printed_alike`), and a
    value within 1e-9 of a rounding tie is written on its own. The rest of the
    message is filled once (:func:`hydraulics.wording.restate_each`).
    """
    v = np.asarray(values, dtype=float)
    if not len(v):
        return _coded(np.zeros(0, dtype=bool), [], [], [])
    message = make(float(v[0]))
    groups, clear = printed_alike(display.from_si(message.quantities[name][1], v))
    first, which = distinct_groups(groups[clear])
    return _coded(clear, restate_each(message, name, v[clear][first].tolist(), display), which,
                  restate_each(message, name, v[~clear].tolist(), display))


def _note(out, rows, texts, first=False):
    """Add ``texts`` (one str, one per row, or Coded) to the reasons of ``rows``: after what is there, or ``first``."""
    _reasons(out).note(rows, texts, before=first)


def _reasons(out: BatchResult) -> Reasons:
    """The reasons of ``out`` while its reaches are checked (one group)."""
    (reasons,) = out.reasons
    return reasons


# ----------------------------------------------------------------------------- linings

_CATALOGUE = None


def default_catalogue():
    """The shipped lining catalogue, read once."""
    global _CATALOGUE
    if _CATALOGUE is None:
        _CATALOGUE = load_catalogue()
    return _CATALOGUE


def check_linings(reaches: Reaches, idx, out: BatchResult, display: hu.UnitSystem = hu.SI, catalogue=None) -> None:
    """The lining stage for the reaches ``idx`` (screened valid, each naming a lining).

    Per lining named: an unknown key, a D50 given for a lining that is not
    stone, or a stone lining without its D50 (the catalogue's typical size
    is not assumed, as in ``ditchwright calc``) makes the reach ``invalid``. The hydraulics are solved with
    the n of the row where one is given (it replaces the lining's own
    roughness), else with the lining's roughness from the catalogue: one
    vectorised solve per lining, a stone lining's reaches of every size in
    one model with a D50 per reach (its n depends on depth and D50, HEC-15
    Section 6.1). Then :func:`assess_stability` gives the verdict, vectorised
    over the reaches of every stone size at once (:func:`_stability_of_sizes`;
    the notes worded per size, in the order of the sizes).
    """
    catalogue = default_catalogue() if catalogue is None else catalogue
    idx = np.asarray(idx, dtype=np.intp)
    keys = reaches.lining[idx]
    for key in sorted(set(keys.tolist())):
        rows = idx[keys == key]
        if key not in catalogue:
            close = difflib.get_close_matches(key.lower(), list(catalogue.keys()), n=3)
            hint = f"; did you mean {' or '.join(repr(c) for c in close)}?" if close else ""
            _set(out, rows, "invalid", f"lining: {key!r} is not in the lining catalogue{hint}")
            continue
        lining = catalogue.get(key)
        d50 = reaches.d50[rows]
        sized = d50 > 0
        if lining.category != "stone" and sized.any():
            for row, d in zip(rows[sized].tolist(), d50[sized].tolist()):
                _set(out, [row], "invalid", f"d50: applies to stone linings only; {key!r} is {lining.category}, "
                                            f"got {_fmt(display.from_si('length', d))} {display.label('length')}")
            rows, d50, sized = rows[~sized], d50[~sized], sized[~sized]
        if lining.category == "stone" and not sized.all():
            # as `calc --lining riprap` without a size: the catalogue's typical D50 is no design value
            typical = "" if lining.d50 is None else (
                f" (the catalogue's typical {display.from_si('length', lining.d50):.3g} {display.label('length')} "
                "is not assumed)")
            _set(out, rows[~sized], "invalid", f"d50: give the stone size D50 of {key!r} in the d50 column{typical}")
            rows, d50 = rows[sized], d50[sized]
        own_n = ~np.isnan(reaches.n[rows])
        given = rows[own_n]
        solved = solve_hydraulics(reaches, given, reaches.n[given], out, display)
        assess_stability(lining, reaches, given[solved], out, display, n_given=True)
        rest, rest_d50 = rows[~own_n], d50[~own_n]
        if not len(rest):
            continue
        try:  # a stone lining: every size in one model and one solve (each reach's n that of its own size)
            rough = lining.roughness(rest_d50 if lining.category == "stone" else None)
        except InputError as exc:  # e.g. an entry whose data the user has to fill in
            _set(out, rest, "not-checked", f"{exc}; nothing computed")
            continue
        solved = solve_hydraulics(reaches, rest, rough, out, display)
        notes = _roughness_ranges(lining, rough, reaches, rest, solved, out, display)
        if lining.category != "stone":
            _add_messages(out, notes.get(None, ()))
            assess_stability(lining, reaches, rest[solved], out, display, n_given=False)
            continue
        # the shear checks of every size at once; the notes per size, smallest first, each size's roughness notes
        # before its stability notes (as checking each size alone words and orders them)
        each = _stability_of_sizes(lining, reaches, rest[solved], rest_d50[solved], out, display)
        for d in np.unique(rest_d50).tolist():
            _add_messages(out, notes.get(d, ()))
            if each is not None:
                _add_messages(out, each.get(d, ()))
            else:
                assess_stability(lining, reaches, rest[solved & (rest_d50 == d)], out, display, n_given=False)
    checked = idx[np.isin(out.verdict[idx], CHECKED)]
    lining_cautions(reaches, checked, out, display, catalogue)
    price(reaches, checked, out, catalogue)


#: Verdicts of reaches whose lining was checked (``check_lining``'s cautions and quantities apply to them).
CHECKED = ("stable", "unstable", "non-erodible")


def lining_cautions(reaches: Reaches, rows, out: BatchResult, display: hu.UnitSystem, catalogue) -> None:
    """The cautions :func:`hydraulics.stability.check_lining` gives a lined channel, in the reasons of the lined
    reaches ``rows``, after their other warnings and in the order that check lists them: a velocity low enough for
    silt to settle (``silting_caution``), roadside side slopes steeper than 1V:3H (``side_slope_cautions``;
    trapezoids and triangles only), a pipe too shallow for its design depth plus the minimum freeboard
    (``too_shallow_warning``), and a grass lining's permissible shear above the range published for vegetated
    soils (``VEGETATED_SHEAR_CAUTION``). Each distinct text is worded once."""
    rows = np.asarray(rows, dtype=np.intp)
    slow = rows[out.velocity[rows] < SELF_CLEANING_VELOCITY]
    out.flags["silting"][slow] = True
    _note(out, slow, _each_worded(out.velocity[slow], display, silting_caution, "v"))
    _side_cautions(reaches, rows, out)
    _pipe_depth_cautions(reaches, rows[reaches.kind[rows] == _CIRCLE], out, display)
    keys = reaches.lining[rows]
    for key in sorted(set(keys.tolist())):
        if catalogue.get(key).permissible_data["method"] == "vegetation":
            group = rows[keys == key]
            high = group[out.permissible_shear[group] > hec15.VEGETATED_SHEAR_RANGE[1]]
            out.flags["vegetated_range"][high] = True
            _note(out, high, in_units(hec15.VEGETATED_SHEAR_CAUTION, display))


def _side_cautions(reaches, rows, out) -> None:
    """``side_slope_cautions`` of the trapezoids and triangles among ``rows``, one text per pair of slopes."""
    sided = rows[np.isin(reaches.kind[rows], (SHAPE_CODE["trapezoid"], SHAPE_CODE["triangle"]))]
    sides = np.column_stack([reaches.left_slope[sided], reaches.right_slope[sided]])
    steep = (sides < ROADSIDE_SIDE_SLOPE).any(axis=1)
    sided, sides = sided[steep], sides[steep]
    if not len(sided):
        return
    out.flags["steep_sides"][sided] = True
    pairs, which = np.unique(sides[:, 0] + 1j * sides[:, 1], return_inverse=True)   # (left, right) as one number
    _note(out, sided, Coded(object_array(["; ".join(side_slope_cautions(z.real, z.imag)) for z in pairs.tolist()]),
                            which.ravel()))


def _pipe_depth_cautions(reaches, pipes, out, display) -> None:
    """``too_shallow_warning`` of the pipes ``pipes`` whose normal depth plus the minimum freeboard
    (:func:`hydraulics.freeboard.ditch_tops`, straight) is above their diameter."""
    if not len(pipes):
        return
    section, y = _pipe_section(reaches, pipes), out.normal_depth[pipes]
    tops = ditch_tops(section, y, out.velocity[pipes], section.top_width(y), out.froude[pipes])
    shallow = pipes[tops.too_shallow]
    out.flags["too_shallow"][shallow] = True
    _note(out, shallow, object_array([in_units(too_shallow_warning(t, d, "circle"), display) for t, d in
                                      zip(tops.total_depth[tops.too_shallow].tolist(),
                                          reaches.diameter[shallow].tolist())]))


def price(reaches: Reaches, rows, out: BatchResult, catalogue) -> None:
    """``cost_per_length`` of the lined reaches ``rows`` whose lining has a unit cost: the quantities of
    :func:`hydraulics.lining_quantities.lining_quantities` (the lining to the ditch top, normal depth plus the
    freeboard of :func:`hydraulics.freeboard.ditch_tops`, straight reaches, the default minimum freeboard)."""
    rows = np.asarray(rows, dtype=np.intp)
    keys = reaches.lining[rows]
    for key in sorted(set(keys.tolist())):
        lining = catalogue.get(key)
        if lining.unit_cost is None:
            continue
        group = rows[keys == key]
        pipe = reaches.kind[group] == _CIRCLE
        for make, at in ((_open_section, group[~pipe]), (_pipe_section, group[pipe])):
            if not len(at):
                continue
            section, y = make(reaches, at), out.normal_depth[at]
            top = ditch_tops(section, y, out.velocity[at], section.top_width(y), out.froude[at]).depth_at_top
            lined = np.broadcast_to(section.wetted_perimeter(top), at.shape)
            thickness = (lining.layer_thickness(reaches.d50[at]) if lining.thickness_data["rule"] == "stone"
                         else lining.layer_thickness())
            cost = cost_per_length(lining, lined, None if thickness is None else lined * thickness)
            if cost is not None:
                out.cost_per_length[at] = cost


def _roughness_ranges(lining, rough, reaches, rows, solved, out, display) -> dict:
    """The roughness model's range warnings for the reaches ``rows`` where ``solved``: each reach's own in its
    reason (after the flow's warnings, as ``check_lining`` lists them), and all of them worded for the notes:
    {stone size: [notes]} for a stone model (open reaches' notes before pipes'), {None: [notes]} for another."""
    notes = {}
    if not hasattr(rough, "check") or not solved.any():
        return notes
    pipe = reaches.kind[rows] == _CIRCLE
    for make, part in ((_open_section, solved & ~pipe), (_pipe_section, solved & pipe)):
        if part.any():
            model, at = _part(rough, np.flatnonzero(part)), rows[part]
            args = (make(reaches, at), out.normal_depth[at], reaches.slope[at])
            if hasattr(model, "check_each"):   # a stone model: its relations at the depths worked out once
                relations = model.relations(*args, flow=reaches.flow[at])
                own = model.check_elements(*args, units=display, relations=relations)
                each = model.check_each(*args, relations=relations)
            else:
                own, each = model.check_elements(*args, units=display), {None: model.check(*args)}
            said = own != ""      # each reach's own notes, as calc says them
            _note(out, at[said], own[said])
            for d, texts in each.items():
                notes.setdefault(d, []).extend(f"lining {lining.key!r}: {in_units(t, display)}" for t in texts)
    return notes


def assess_stability(lining, reaches: Reaches, rows, out: BatchResult, display: hu.UnitSystem = hu.SI, *,
                     n_given: bool) -> None:
    """HEC-15 permissible-shear check of ``lining`` on the solved reaches ``rows``, vectorised.

    The checks are :func:`hydraulics.shear_checks.shear_checks`, the ones
    :func:`hydraulics.stability.check_lining` makes, for a straight reach (an
    inventory has no bend radius): design shear tau_d = gamma d S on the bed
    (HEC-15, Kilgore and Cotton, 3rd ed., 2005, Eq. 3.1, the ``bed_shear``
    column) and K1 tau_d on each straight side slope (a pipe has no side
    check), against the lining's permissible shear (stone by Eq. 6.7 and
    Table 6.1, K2 or Appendix D on the sides; grass, soil, data-sheet values;
    rigid linings non-erodible), stable where tau_p / tau >= the required
    safety factor at every check (Eq. 3.2). See that function for the
    relations and their sources.

    ``permissible_shear`` gets tau_p on the bed and ``safety_factor`` the
    lowest factor over the checks; the reason words the governing check. A
    relation's range of validity left by some reaches is noted once per
    lining in ``out.messages``.
    """
    rows = np.asarray(rows, dtype=np.intp)
    if not len(rows):
        return
    how = "with the n given" if n_given else "with the lining's own n"
    try:
        sc, caught = _checked(lining, reaches, rows, out)
    except InputError as exc:  # an entry whose values the user has to fill in
        _prefix(out, rows, "not-checked", f"{exc}; hydraulics {how}, shear not compared with a permissible value")
        return
    if sc.non_erodible:
        _prefix(out, rows, "non-erodible", f"non-erodible: {lining.name} is a rigid lining, not checked for shear "
                                           "(common practice)")
        return
    _add_messages(out, [_lining_note(lining, text, display) for text in caught])
    _record(sc, rows, out, display, how)


def _stability_of_sizes(lining, reaches: Reaches, rows, d50, out: BatchResult, display: hu.UnitSystem) -> dict | None:
    """:func:`assess_stability` of the solved reaches ``rows`` of a stone lining with its own n, every stone size
    (``d50``, theirs) in one vectorised check instead of one check per size.

    The verdicts, values and reasons are those of each size checked alone (the checks go element by element).
    The notes are worded per size: returns {D50: the notes a check of that size's reaches alone gives}. The one
    range warning the checks of stone give, a D50 outside the HEC-15 Chapter 6 sizes
    (:func:`hydraulics.linings.hec15.stone_size_note`), depends on the size alone; where the one check gives
    any other warning, or raises, nothing is changed and None is returned: then each size is checked alone.
    """
    rows = np.asarray(rows, dtype=np.intp)
    if not len(rows):
        return {}
    try:
        sc, caught = _checked(lining, reaches, rows, out)
    except InputError:
        return None
    sizes = np.unique(d50).tolist()
    whole = hec15.stone_size_note(sizes)
    if sc.non_erodible or caught != ([] if whole is None else [whole]):
        return None
    _record(sc, rows, out, display, "with the lining's own n")
    each = {d: hec15.stone_size_note(d) for d in sizes}
    return {d: [] if text is None else [_lining_note(lining, text, display)] for d, text in each.items()}


def _checked(lining, reaches: Reaches, rows, out: BatchResult):
    """(:func:`_shear_checks` of ``rows``, the texts of the warnings it gave, in order)."""
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", ValidityWarning)
        sc = _shear_checks(lining, reaches, rows, out)
    return sc, [w.message.args[0] if w.message.args else str(w.message) for w in caught]


def _lining_note(lining, text: str, display: hu.UnitSystem) -> str:
    return f"lining {lining.key!r}: {in_units(text, display)}"


def _add_messages(out: BatchResult, notes) -> None:
    """Add each of ``notes`` to ``out.messages`` unless it is there already."""
    for note in notes:
        if note not in out.messages:
            out.messages.append(note)


def _record(sc, rows, out: BatchResult, display: hu.UnitSystem, how: str) -> None:
    """The verdict, the bed's permissible shear, the lowest safety factor, the governing place and the reason of
    each of ``rows`` from their shear checks ``sc`` (a flexible lining); the reason words the governing check."""
    gov = sc.governing()
    sf = sc.pick("safety_factor", gov)
    required = sc.required_safety_factor
    stable = sf >= required
    out.permissible_shear[rows] = sc.permissible_shear
    out.safety_factor[rows] = sf
    where, design, permissible = (sc.pick(k, gov) for k in ("location", "design_shear", "permissible_shear"))
    cannot, appendix = sc.pick("cannot_rest", gov).astype(bool), sc.pick("appendix_d", gov).astype(bool)
    unit = display.label("shear")
    design, permissible = display.from_si("shear", design), display.from_si("shear", permissible)
    dd, pd = _digits3(design), _digits3(permissible)
    word = np.where(stable, "stable", "unstable")
    plain = ~cannot & ~appendix
    # "%s, %s: %.*f %s against %.*f %s permissible (safety factor %.2f, %.2f needed); hydraulics %s", each
    # number's text written once
    m = plain
    _note(out, rows[m], Composed((_labels(stable[m], where[m]), _fixed(design[m], dd[m]), f" {unit} against ",
                                  _fixed(permissible[m], pd[m]), f" {unit} permissible (safety factor ",
                                  _fixed(sf[m], 2), ", ", _fixed(required[m], 2), f" needed); hydraulics {how}")),
          first=True)
    col = lambda a, m: a[m].tolist()  # noqa: E731  (Python numbers: "%.*f" needs a Python int)
    _note(out, rows[appendix], object_array(
        ["%s, %s: %.*f %s on side stone of a steep bed (HEC-15 Appendix D safety factor %.2f, %.2f needed); "
         "hydraulics %s" % t for t in zip(col(word, appendix), col(where, appendix), col(dd, appendix),
                                         col(design, appendix), repeat(unit), col(sf, appendix),
                                         col(required, appendix), repeat(how))]), first=True)
    _note(out, rows[cannot], object_array([f"unstable, {w}: stone cannot rest on a side as steep as or steeper than "
                                           f"its angle of repose; hydraulics {how}" for w in where[cannot]]),
          first=True)
    out.verdict[rows] = word
    out.governs[rows] = where


def _labels(stable, where) -> Coded:
    """``"stable, <where>: "`` or ``"unstable, <where>: "`` for each reach, each distinct text made once."""
    places, at = np.unique(where.astype(str), return_inverse=True)
    keys, which = np.unique(np.ravel(at) * 2 + stable, return_inverse=True)
    return Coded(object_array([f"{'stable' if k % 2 else 'unstable'}, {places[k // 2]}: " for k in keys.tolist()]),
                 np.ravel(which))


def _digits3(values):
    """Decimals that give three significant figures (none for values of 100 and more), as int array."""
    with np.errstate(divide="ignore", invalid="ignore"):
        mag = np.floor(np.log10(np.abs(values)))
    return np.clip(np.where(np.isfinite(mag), 2 - mag, 0), 0, 12).astype(int)


def _shear_checks(lining, reaches, rows, out):
    """:func:`hydraulics.shear_checks.shear_checks` for the solved reaches ``rows`` (straight reaches; pipes
    without sides)."""
    d50 = None
    if lining.permissible_data["method"] == "shields":
        d50 = np.where(reaches.d50[rows] > 0, reaches.d50[rows], np.nan)
        if np.isnan(d50).any():
            raise InputError("d50", f"lining {lining.key!r} needs a D50 (give one in the d50 column)")
    sided = reaches.kind[rows] != _CIRCLE
    return shear_checks(lining, out.normal_depth[rows], reaches.slope[rows], out.manning_n[rows], d50=d50,
                        left_slope=np.where(sided, np.nan_to_num(reaches.left_slope[rows]), np.nan),
                        right_slope=np.where(sided, np.nan_to_num(reaches.right_slope[rows]), np.nan))


def _set(out, rows, verdict, text):
    rows = np.asarray(rows, dtype=np.intp)
    out.verdict[rows] = verdict
    _reasons(out).set(rows, text)


def _prefix(out, rows, verdict, text):
    """Set the verdict of ``rows`` and put ``text`` before any warnings already in their reasons."""
    rows = np.asarray(rows, dtype=np.intp)
    out.verdict[rows] = verdict
    _note(out, rows, text, first=True)


# ----------------------------------------------------------------------------- driver

def _evaluate_chunk(reaches: Reaches, display, catalogue, problems=None) -> BatchResult:
    """Check the reaches of one chunk; ``problems`` is their :func:`screen` (made here if not given)."""
    out = BatchResult.empty(len(reaches))
    if problems is None:
        problems = screen(reaches, display)
    bad = problems != ""
    out.verdict[bad] = "invalid"
    _reasons(out).set(np.flatnonzero(bad), problems[bad])
    valid = ~bad
    named = valid & reaches.named
    plain = np.flatnonzero(valid & ~named)
    solved = solve_hydraulics(reaches, plain, reaches.n[plain], out, display)
    _prefix(out, plain[solved], "hydraulics-only", "no lining named: shear not checked")
    check_linings(reaches, np.flatnonzero(named), out, display, catalogue)
    return out


def evaluate(reaches: Reaches, display: hu.UnitSystem = hu.SI, progress=None, chunk: int = CHUNK,
             catalogue=None, on_chunk=None) -> BatchResult:
    """Check every reach; see the module notes for the verdicts.

    Parameters
    ----------
    reaches : Reaches
        The inventory, SI.
    display : UnitSystem
        Units in which reasons quote values (results stay SI).
    progress : callable, optional
        Called as ``progress(done, total)`` after each chunk of reaches.
    chunk : int
        Reaches per vectorised solve.
    catalogue : hydraulics.linings.Catalogue, optional
        Linings the reaches may name (default: the shipped catalogue).
    on_chunk : callable, optional
        Called as ``on_chunk(part, results)`` with the slice of reaches of
        each chunk and their results, as soon as the chunk is done (a caller
        can start writing them while the next chunk is computed).

    Returns
    -------
    BatchResult
        One entry per reach, in input order.
    """
    size = len(reaches)
    if size <= chunk:  # one chunk: no slicing and copying
        out = _evaluate_chunk(reaches, display, catalogue)
        if on_chunk is not None:
            on_chunk(slice(0, size), out)
        if progress is not None:
            progress(size, size)
        return out
    out = BatchResult.empty(size)
    out.reasons = []    # each chunk's, in order
    problems = screen(reaches, display)  # once for all: its cost is mostly per call, not per reach
    for start in range(0, size, chunk):
        part = slice(start, min(size, start + chunk))
        done = _evaluate_chunk(reaches.take(part), display, catalogue, problems[part])
        out._fill(part, done)
        out.reasons += done.reasons
        if on_chunk is not None:
            on_chunk(part, done)
        if progress is not None:
            progress(part.stop, size)
    return out
