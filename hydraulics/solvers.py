"""Normal depth, critical depth and capacity by Manning's equation, SI.

Manning's equation (Manning 1891; e.g. Chow, V. T., *Open-Channel Hydraulics*,
McGraw-Hill, 1959, Eq. 5-6), with k = 1 m^(1/3)/s in SI:

    Q = (k / n) A R^(2/3) S^(1/2)

Both depths are found by one safeguarded Newton iteration in log-depth:

* normal depth solves ln(A^(5/3) P^(-2/3) / n) = ln(Q / sqrt(S));
* critical depth solves Q^2 T / (g A^3) = 1 (Chow 1959, Eq. 4-4) as
  3 ln A - ln T = ln(Q^2 / g).

In log-log form both are nearly straight lines (slopes between 1 and 8/3
for open sections), so Newton converges in a few steps. Every step keeps a
bracket [lo, hi] of depths known to lie below and above the root; a step that
leaves the bracket is replaced by a bisection (geometric mean), so the
iteration cannot diverge. It stops when |Q(y) - Q| / Q <= 1e-12 and checks the
documented tolerance (1e-10) before returning; otherwise it raises.

Depth-dependent roughness (an object with ``manning_n(section, depth, slope)``,
such as a stone lining by Blodgett's relation or a surveyed section's composite
n) is solved in the same loop, with d ln n / d ln y taken by a finite
difference; the bracket keeps the coupled iteration safe.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from . import validate
from .constants import G, K_MANNING_SI
from .errors import ConvergenceError, InputError, NoSolutionError
from .sections import Section, Trapezoid
from .wording import worded

#: Relative flow residual that every returned depth meets (|Q(y) - Q| / Q).
FLOW_TOLERANCE = 1e-10
_LOG_TOL = 1e-12  # iteration stops a little tighter than the promise above
_MAX_ITER = 200
_FD_STEP = 1e-6  # relative depth step for d ln n / d ln y


@dataclass(frozen=True)
class DepthSolution:
    """A solved depth with its iteration record."""

    depth: object  # float or ndarray [m]
    iterations: int
    residual: object  # |Q(y) - Q| / Q [-], float or ndarray


def _check_section(section):
    if not isinstance(section, Section):
        raise InputError("section", f"must be a channel section (Trapezoid, Circle, ...), got {type(section).__name__}")


def resolve_roughness(section, n):
    """Return ``("constant", n)`` or ``("model", obj)`` for Manning's n input ``n``."""
    if n is None:
        if hasattr(section, "manning_n"):
            return "model", section
        raise InputError("n", "is missing (Manning's n, a number > 0)")
    if hasattr(n, "manning_n"):
        return "model", n
    return "constant", validate.number("n", n, low=0.0, high=1.0,
                                       hint=" (Manning's n is a small number such as 0.013)")


def _n_value(rough, section, y, slope):
    kind, value = rough
    if kind == "constant":
        return value
    n = value.manning_n(section, y, slope)
    if not np.all(np.isfinite(n)) or np.any(np.asarray(n) <= 0):
        raise NoSolutionError(f"the roughness model gave an invalid Manning's n ({n!r}) at depth {y!r} m")
    return n


def _reusable(array, y):
    """``array`` as an output buffer when the geometry made it fresh for this call (not ``y``, not read-only,
    the full shape), else None (numpy then allocates)."""
    ok = isinstance(array, np.ndarray) and array is not y and array.flags.writeable and array.shape == np.shape(y)
    return array if ok else None


def _log_section_factor(section, y, scalar):
    """ln(A^(5/3) P^(-2/3)) and its derivative with respect to ln y."""
    if scalar:
        g = section._geometry(y)
        a, p = g.area, g.wetted_perimeter
        return 5 / 3 * math.log(a) - 2 / 3 * math.log(p), y * (5 / 3 * g.top_width / a - 2 / 3 * g.dP_dy / p)
    geo, state = _log_section_factor_value(section, y)
    return geo, _log_section_factor_slope(y, state)


# The hot loop of large batches, in two halves so that an iteration checks the value before it pays for the
# slope: one log instead of two, and in-place updates on the geometry's own arrays (each fresh array of a million
# depths costs about as much as the arithmetic on it).
def _log_section_factor_value(section, y):
    """ln(A^(5/3) P^(-2/3)) on arrays, with what :func:`_log_section_factor_slope` needs."""
    g = section._geometry(y)
    a = g.area
    geo = a * a
    geo *= geo
    geo *= a
    inv_p = np.divide(1.0, g.wetted_perimeter, out=_reusable(g.wetted_perimeter, y))
    geo *= inv_p
    geo *= inv_p
    np.log(geo, out=geo)
    geo *= 1 / 3
    return geo, (g, inv_p)


def _log_section_factor_slope(y, state):
    """d ln(A^(5/3) P^(-2/3)) / d ln y = y (5/3 T/A - 2/3 P'/P) on arrays (uses up ``state``'s arrays)."""
    g, inv_p = state
    slope = np.divide(g.top_width, g.area, out=_reusable(g.area, y))
    slope *= 5 / 3
    inv_p *= g.dP_dy
    inv_p *= 2 / 3
    slope -= inv_p
    slope *= y
    return slope


def _trapezoid_residual(section, target):
    """g(y) = ln(A^(5/3) P^(-2/3)) - ``target`` and dg/d ln y of one trapezoid (rectangle, triangle) at a float
    depth: :func:`_log_section_factor` with ``Trapezoid._geometry``'s formulas written out, the same operations
    in the same order (so the same floats), without a Geometry made per step (a single solve's hot loop)."""
    b, zs, ps = section.bottom_width, section._zsum, section._psum
    log = math.log

    def evaluate(y):
        a, p = (b + 0.5 * zs * y) * y, b + ps * y
        return 5 / 3 * log(a) - 2 / 3 * log(p) - target, y * (5 / 3 * (b + zs * y) / a - 2 / 3 * ps / p)
    return evaluate


def _trapezoid_value(section, y):
    """:func:`_log_section_factor_value` for a trapezoid (rectangle, triangle) of float dimensions: A and P
    from their formulas written out (A = (b + zs y / 2) y, P = b + ps y; no top width until a slope is asked
    for), A^5 / P^2 divided rather than multiplied by 1/P: fewer passes over the arrays."""
    b, zs, ps = section.bottom_width, section._zsum, section._psum
    a = np.multiply(y, 0.5 * zs)
    a += b
    a *= y
    p = np.multiply(y, ps)
    p += b
    geo = a * a
    geo *= geo
    geo *= a
    geo /= p
    geo /= p
    np.log(geo, out=geo)
    geo *= 1 / 3
    return geo, (section, a, p)


def _trapezoid_slope(y, state):
    """:func:`_log_section_factor_slope` for the state of :func:`_trapezoid_value`: y (5/3 T/A - 2/3 P'/P)."""
    section, a, p = state
    slope = np.multiply(y, section._zsum)
    slope += section.bottom_width
    slope /= a
    slope *= 5 / 3
    np.divide(section._psum * (2 / 3), p, out=p)
    slope -= p
    slope *= y
    return slope


def _log_conveyance(section, rough, y, slope, scalar):
    """ln(A^(5/3) P^(-2/3) / n) and its derivative with respect to ln y."""
    geo, dgeo = _log_section_factor(section, y, scalar)
    log = math.log if scalar else np.log
    if rough[0] == "constant":
        return geo - log(rough[1]), dgeo
    # A backward difference, so the trial depth never passes a pipe's crown or a survey's bank.
    if scalar or section.is_vector:
        n0 = _n_value(rough, section, y, slope)
        n1 = _n_value(rough, section, y * (1 - _FD_STEP), slope)
    else:  # both depths in one call of the model (much of its cost is per call)
        shape, size = np.shape(y), np.size(y)
        flat = np.ravel(np.broadcast_to(slope, shape))
        both = _n_value(rough, section, np.concatenate([np.ravel(y), np.ravel(y * (1 - _FD_STEP))]),
                        np.concatenate([flat, flat]))
        both = np.broadcast_to(both, (2 * size,))
        n0, n1 = both[:size].reshape(shape), both[size:].reshape(shape)
    dlogn = (log(n0) - log(n1)) / -math.log1p(-_FD_STEP)
    return geo - log(n0), dgeo - dlogn


_JUMP_MESSAGE = ("no depth carries this flow: the flow falls in a jump of the roughness relation near "
                 "depth {depth} (the depth-dependent n is discontinuous there)")
_CROWN_MESSAGE = ("critical depth lies at {depth}, so close to the crown of the pipe that its top width "
                  "cannot be resolved: for a part-full critical depth this flow is too large for the pipe")


def _newton_log_scalar(evaluate, y, lo, hi, collapsed=_JUMP_MESSAGE):
    """Safeguarded Newton on an increasing g(y), in ln y. Returns (y, iterations, g).

    When the bracket shrinks to the resolution of a float before |g| reaches the iteration tolerance, the depth
    is returned if it still meets FLOW_TOLERANCE (g is then limited by rounding in the geometry, as near a pipe's
    crown), else NoSolutionError with ``collapsed`` (formatted with ``depth``) says why.
    """
    if not lo < y < hi:
        y = 0.5 * (lo + hi) if math.isfinite(hi) else 1.0
    last_step = step_before_last = math.inf
    for it in range(1, _MAX_ITER + 1):
        g, gp = evaluate(y)
        if abs(g) <= _LOG_TOL:
            return y, it, g
        if g < 0:
            lo = y
        else:
            hi = y
        step = max(-50.0, min(50.0, -g / gp)) if gp > 0 and math.isfinite(g) else math.nan
        y_new = y * math.exp(step)
        # Bisect when Newton leaves the bracket, or when its steps stop shrinking (as in
        # "rtsafe", Press et al., Numerical Recipes, 3rd ed., 2007, Sec. 9.4): a kink in a
        # depth-dependent n can otherwise make it creep along one side of the bracket.
        slow = abs(step) > 0.5 * step_before_last
        step_before_last, last_step = last_step, abs(step)
        if slow or not lo < y_new < hi:
            if hi / lo < 1 + 1e-14 if lo > 0 else False:
                if abs(g) <= FLOW_TOLERANCE:
                    return y, it, g
                raise NoSolutionError(worded(collapsed, depth=(y, "length", "g")))
            if not math.isfinite(hi):
                y_new = 4.0 * y
            elif lo == 0.0:
                y_new = 0.25 * hi
            else:
                y_new = math.sqrt(lo * hi)
        y = y_new
    raise ConvergenceError(f"no convergence in {_MAX_ITER} iterations (last depth {y:g} m, "
                           f"log residual {g:.3g})")


def _newton_log_plain(evaluate, y, iterations=12, split=None):
    """Unguarded Newton in ln y for open sections, the fast path for large arrays.

    Returns (y, iterations, g) once every |g| <= tolerance, or None if any
    element has not converged (or left the finite numbers) in ``iterations``;
    the caller then runs the guarded iteration from the start. With ``split``
    = (value, slope), g comes from ``value(y) -> (g, state)`` and g' from
    ``slope(y, state)`` only when another step is needed.
    """
    y = y.copy()
    with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
        for it in range(1, iterations + 1):
            if split is None:
                g, gp = evaluate(y)
            else:
                g, state = split[0](y)
            worst = np.max(np.abs(g))
            if worst <= _LOG_TOL:
                return y, it, g
            if not np.isfinite(worst):
                return None
            if split is not None:
                gp = split[1](y, state)
            np.divide(g, gp, out=g)
            np.negative(g, out=g)
            np.exp(g, out=g)
            y *= g
    return None


def _newton_log_vector(evaluate, y, lo, hi, collapsed=_JUMP_MESSAGE, fast=True, subset=False, split=None):
    """Vectorised version of :func:`_newton_log_scalar`; all arrays of one shape.

    Each element takes the steps the scalar iteration takes from the same start (the same clipped Newton step,
    the same bisection when a step leaves the bracket or stops shrinking, the same stop), so where g has several
    roots (a depth-dependent n with a jump) an element ends on the root the scalar call finds. With ``fast`` and
    no upper bound anywhere (open sections) an unguarded Newton is tried first: for an increasing g with one
    root (a constant n) it reaches the same root at less cost. A collapsed bracket raises NoSolutionError with
    ``collapsed`` for the first such element. With ``subset`` (``evaluate(y, at)`` takes the depths of the
    elements ``at`` only) the elements still iterating are evaluated alone once they are half or fewer.
    ``split`` is handed to the unguarded Newton (see :func:`_newton_log_plain`).
    """
    if fast and np.isinf(hi).all():
        done_fast = _newton_log_plain(evaluate, y, split=split)
        if done_fast is not None:
            return done_fast
    y = np.where((lo < y) & (y < hi), y, np.where(np.isfinite(hi), 0.5 * (lo + hi), 1.0))
    lo, hi = np.array(lo, dtype=float), np.array(hi, dtype=float)
    last_step = np.full(y.shape, np.inf)
    step_before_last = np.full(y.shape, np.inf)
    done = np.zeros(y.shape, dtype=bool)
    g = gp = np.zeros(y.shape)
    with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
        for it in range(1, _MAX_ITER + 1):
            if subset and it > 1 and 2 * np.count_nonzero(~done) <= done.size:
                at = np.flatnonzero(~done)
                g_at, gp_at = evaluate(y[at], at)
                g, gp = g.copy(), gp.copy()       # a converged element keeps its last residual
                g[at], gp[at] = g_at, gp_at
            else:
                g, gp = evaluate(y)
            done |= np.abs(g) <= _LOG_TOL
            if done.all():
                return y, it, g
            active = ~done
            below = g < 0                      # a NaN residual counts as above, as in the scalar iteration
            lo = np.where(active & below, y, lo)
            hi = np.where(active & ~below, y, hi)
            step = np.where((gp > 0) & np.isfinite(g), np.clip(-g / gp, -50.0, 50.0), np.nan)
            y_new = y * np.exp(step)
            slow = np.abs(step) > 0.5 * step_before_last
            step_before_last, last_step = last_step, np.abs(step)
            bisect = active & (slow | ~((lo < y_new) & (y_new < hi)))
            if bisect.any():
                with np.errstate(divide="ignore", invalid="ignore"):
                    shut = bisect & (lo > 0) & (hi / lo < 1 + 1e-14)
                if shut.any():
                    kept = shut & (np.abs(g) <= FLOW_TOLERANCE)
                    if (shut & ~kept).any():
                        raise NoSolutionError(worded(collapsed, depth=(float(y[shut & ~kept].flat[0]), "length", "g")))
                    done |= kept
                    bisect &= ~kept
                fallback = np.where(~np.isfinite(hi), 4.0 * y, np.where(lo == 0.0, 0.25 * hi, np.sqrt(lo * hi)))
                y_new = np.where(bisect, fallback, y_new)
            y = np.where(done, y, y_new)  # a converged element stays where it is
    worst = int(np.argmax(np.where(np.isfinite(g), np.abs(g), np.inf)))  # a non-finite residual is the worst
    raise ConvergenceError(f"no convergence in {_MAX_ITER} iterations for element {worst} "
                           f"(depth {y.flat[worst]:g} m, log residual {np.abs(g).flat[worst]:.3g})")


def _finish(y, it, g):
    """Check the promised tolerance; |Q(y)/Q - 1| = |exp(g) - 1|."""
    if type(y) is not float and np.ndim(y):
        # Where every |g| <= 1e-8, |exp(g) - 1| equals |g| to within g^2 / 2 < 1e-16 (of a residual promised to
        # 1e-10), so the exponential is spared on the large arrays that converge.
        residual = np.abs(g)
        if not residual.max(initial=0.0) <= 1e-8:
            residual = np.abs(np.expm1(g))
        if not np.all(residual <= FLOW_TOLERANCE):
            raise ConvergenceError(f"flow residual {np.max(residual):.3g} above {FLOW_TOLERANCE:g}")
        return DepthSolution(y, it, residual)
    residual = abs(math.expm1(g))
    if not residual <= FLOW_TOLERANCE:
        raise ConvergenceError(f"flow residual {residual:.3g} above {FLOW_TOLERANCE:g}")
    return DepthSolution(y, it, residual)


def _broadcast(section, *values):
    """Broadcast inputs and the section's dimensions; return (arrays, shape) or (values, None)."""
    if not (validate.is_array(*values) or section.is_vector):
        return values, None
    dims = [v for v in section.to_dict().values() if isinstance(v, np.ndarray)] if section.is_vector else []
    shape = np.broadcast_shapes(*(np.shape(v) for v in (*values, *dims)))
    return tuple(np.broadcast_to(np.asarray(v, dtype=float), shape) for v in values), shape  # read-only views


def _log_flow_over_root_slope(q, s, n=None):
    """ln(Q / sqrt(S)), or ln(Q n / sqrt(S)) with ``n``, on arrays: one logarithm of the quotient where it is a
    normal float (the usual case), else a sum of logarithms, which keeps its digits for subnormal or overflowing
    quotients."""
    ratio = np.sqrt(s)
    np.divide(q, ratio, out=ratio)
    if n is not None:
        ratio *= n
    if ratio.size and np.finfo(float).tiny <= ratio.min() and ratio.max() < math.inf:
        return np.log(ratio, out=ratio)
    return np.log(q) - 0.5 * np.log(s) + (0.0 if n is None else np.log(n))


def _describe_limit(section):
    """The end of the message on a flow above a section's capacity (a template of :func:`worded`: ``{bank}`` the
    depth of the lower bank)."""
    if section.kind == "circle":
        return ("the largest part-full flow this pipe can carry on this slope (at depth "
                f"{np.max(section.capacity_depth / section.diameter):.3f} D); it would surcharge")
    return "the bank-full capacity (depth {bank} at the lower bank); the flow overtops the section"


def solve_normal_depth(section, flow, slope, n=None, *, within=None) -> DepthSolution:
    """Normal depth with its iteration record; see :func:`normal_depth`."""
    _check_section(section)
    q = validate.positive("flow", flow)
    s = validate.slope(slope)
    rough = resolve_roughness(section, n)
    if rough[0] == "constant":
        (q, s, nv), shape = _broadcast(section, q, s, rough[1])
        rough = ("constant", nv)
    else:
        (q, s), shape = _broadcast(section, q, s)
    scalar = shape is None
    log = math.log if scalar else np.log
    # ln(Q / sqrt(S)) less ln k; with a constant n, ln(Q n / sqrt(S)) less ln k (n folded in once, outside the loop)
    n_in = rough[1] if rough[0] == "constant" else None
    if scalar:
        target = log(q) - 0.5 * log(s) - math.log(K_MANNING_SI)
        if n_in is not None:
            target = target + log(n_in)
    else:
        target = _log_flow_over_root_slope(q, s, n_in) - math.log(K_MANNING_SI)

    cap = section.capacity_depth
    if cap is not None:
        cap_y = cap if scalar else np.broadcast_to(np.asarray(cap, dtype=float), shape)
        g_cap = (_log_section_factor(section, cap_y, scalar) if n_in is not None else
                 _log_conveyance(section, rough, cap_y, s, scalar))[0] - target
        if np.any(np.asarray(g_cap) < 0):
            over = np.asarray(g_cap) < 0
            qmax = np.exp(np.asarray(g_cap) + np.log(np.asarray(q)))
            i = int(np.argmax(over)) if over.ndim else 0
            qi, qm = np.asarray(q).flat[i], np.asarray(qmax).flat[i]
            where = f" (element {i})" if not scalar else ""
            bank = float(np.ravel(np.broadcast_to(np.asarray(cap_y, dtype=float), over.shape))[i])
            raise NoSolutionError(worded("flow {q}" + where + " exceeds {q_max}, " + _describe_limit(section),
                                         q=(qi, "flow", "g"), q_max=(qm, "flow", "g"), bank=(bank, "length", "g")))
        hi = cap_y * (1 + 1e-12)
    else:
        hi = math.inf   # an open section: no upper bound (broadcast by the array iteration where it needs one)
    lo = 0.0
    if within is not None:   # the root between two depths (a depth-dependent n may give several)
        lo, hi = _bracket(within, hi, scalar, shape)

    if rough[0] == "constant":
        y0 = section._depth_guess(target) if scalar else section._depth_start(target)
    else:  # a model's n is guessed as 0.03 for the start
        y0 = section._depth_guess(target + math.log(0.03))
    if not scalar and _reusable(y0, np.broadcast_to(0.0, shape)) is None:
        y0 = np.array(np.broadcast_to(y0, shape), dtype=float)  # one writeable array of the full shape
    if within is not None:   # a start inside the bracket: its geometric middle, or twice its foot when open above
        inside = (lo < y0) & (y0 < hi)
        middle = np.where(np.isfinite(hi), np.where(lo > 0, np.sqrt(lo * hi), 0.5 * hi), 2.0 * lo)
        y0 = float(np.where(inside, y0, middle)) if scalar else np.where(inside, y0, middle)

    split = None
    if rough[0] == "constant" and scalar and isinstance(section, Trapezoid):
        evaluate = _trapezoid_residual(section, target)
    elif rough[0] == "constant":

        def evaluate(y):
            geo, dgeo = _log_section_factor(section, y, scalar)
            if scalar:
                return geo - target, dgeo
            geo -= target
            return geo, dgeo

        def value(y):
            geo, state = _log_section_factor_value(section, y)
            geo -= target
            return geo, state

        split = (value, _log_section_factor_slope)
        if isinstance(section, Trapezoid) and not section.is_vector:

            def value(y):
                geo, state = _trapezoid_value(section, y)
                geo -= target
                return geo, state

            split = (value, _trapezoid_slope)
    else:
        def evaluate(y, at=None):
            """g and g' at ``y``; with ``at`` (indices), ``y`` holds the depths of those elements only."""
            if at is None:
                lk, dlk = _log_conveyance(section, rough, y, s, scalar)
                return lk - target, dlk
            if by_element:  # the section and a model with values per element, at those elements
                take = getattr(rough[1], "take", None)
                lk, dlk = _log_conveyance(section.take(at), rough if take is None else ("model", take(at)), y,
                                          s[at], scalar)
            else:
                lk, dlk = _log_conveyance(section, rough, y, s[at], scalar)
            return lk - target[at], dlk

    if scalar:
        y, it, g = _newton_log_scalar(evaluate, y0, float(lo), float(hi))
    else:  # a depth-dependent n may give several roots: follow the scalar steps to the one it finds
        model = rough[0] != "constant"
        # the elements still iterating evaluated alone; a section with array dimensions is taken apart for them
        # where they are 1-D arrays of the solve's shape
        by_element = model and section.is_vector
        fits = not by_element or (len(shape) == 1 and all(
            np.shape(v) in ((), shape) for k, v in section.to_dict().items() if k != "shape"))
        y, it, g = _newton_log_vector(evaluate, y0, lo, hi, fast=not model and within is None,
                                      subset=model and fits, split=split)
    return _finish(y, it, g)


def _bracket(within, hi, scalar, shape):
    """(low, high) depths of ``within`` = (low, high) [m], high no more than the section's own bound ``hi``, checked
    0 <= low < high; arrays of the solve's shape, or floats for a scalar solve."""
    low, high = (np.asarray(v, dtype=float) for v in within)
    if scalar and (low.ndim or high.ndim):
        raise InputError("within", "must be two numbers for one channel")
    high = np.minimum(high, hi)
    if np.any(~(low >= 0)) or np.any(~(high > low)):
        raise InputError("within", "must be two depths, 0 <= low < high (and low below the section's top)")
    if scalar:
        return float(low), float(high)
    return np.broadcast_to(low, shape).astype(float), np.broadcast_to(high, shape).astype(float)


def normal_depth(section, flow, slope, n=None, *, within=None):
    """Normal (uniform-flow) depth by Manning's equation [m].

    Parameters
    ----------
    section : Section
        Channel cross-section (SI dimensions).
    flow : float or ndarray
        Discharge Q [m^3/s], > 0.
    slope : float or ndarray
        Bed slope S [m/m], 0 < S <= 1.
    n : float, ndarray or roughness model, optional
        Manning's n [s/m^(1/3)], or an object with ``manning_n(section, depth, slope)``.
        Omitted for a surveyed section, which carries its own n per segment.
    within : (float, float) or (ndarray, ndarray), optional
        Depths (low, high) [m] between which the root is looked for; high may be inf. With a depth-dependent n
        the flow may have several uniform-flow depths, and this picks the one between them (the conveyance must
        cross the flow's once there, or the solve fails with NoSolutionError or ConvergenceError).

    Returns
    -------
    float or ndarray
        Depth y [m] with |Q(y) - Q| / Q <= 1e-10; an ndarray when any input is one.

    Raises
    ------
    InputError
        A non-positive, non-finite or missing input (the message names it).
    NoSolutionError
        A pipe or surveyed section asked to carry more than it can.

    Examples
    --------
    A rectangular channel b = 5 m, n = 0.015, S = 0.0025 carrying 9.548 m^3/s
    runs 0.8 m deep (V. M. Ponce, open-channel hydraulics solutions, San Diego
    State University):

    >>> import hydraulics as hy
    >>> round(hy.normal_depth(hy.Rectangle(bottom_width=5.0), 9.548, 0.0025, 0.015), 3)
    0.8
    """
    return solve_normal_depth(section, flow, slope, n, within=within).depth


def solve_critical_depth(section, flow) -> DepthSolution:
    """Critical depth with its iteration record; see :func:`critical_depth`."""
    _check_section(section)
    q = validate.positive("flow", flow)
    (q,), shape = _broadcast(section, q)
    scalar = shape is None
    log = math.log if scalar else np.log
    target = log(q * q / G)

    def evaluate(y):
        geo = section._geometry(y)
        return (3 * log(geo.area) - log(geo.top_width) - target,
                y * (3 * geo.top_width / geo.area - geo.dT_dy / geo.top_width))

    full = section.full_depth
    if full is None:
        hi = math.inf if scalar else np.full(shape, np.inf)
    elif section.kind == "circle":
        hi = full if scalar else np.broadcast_to(np.asarray(full, dtype=float), shape).copy()
    else:
        g_full = evaluate(full if scalar else np.full(shape, full))[0]
        if np.any(np.asarray(g_full) < 0):
            raise NoSolutionError(worded("critical depth lies above the lower bank ({bank}) for this flow; "
                                         "the section is too small", bank=(full, "length", "g")))
        hi = full * (1 + 1e-12) if scalar else np.full(shape, full * (1 + 1e-12))
    lo = 0.0 if scalar else np.zeros(shape)
    y0 = section._critical_guess(q)
    if not scalar:
        y0 = np.broadcast_to(y0, shape).astype(float)
    if scalar:
        y, it, g = _newton_log_scalar(evaluate, y0, lo, hi, collapsed=_CROWN_MESSAGE)
    else:
        y, it, g = _newton_log_vector(evaluate, y0, lo, hi, collapsed=_CROWN_MESSAGE)
    # Residual of the critical condition Q^2 T / (g A^3) = 1, i.e. |Fr^2 - 1|.
    return _finish(y, it, g)


def critical_depth(section, flow):
    """Critical depth, where Q^2 T / (g A^3) = 1 (Chow 1959, Eq. 4-4) [m].

    Parameters
    ----------
    section : Section
        Channel cross-section.
    flow : float or ndarray
        Discharge Q [m^3/s], > 0.

    Returns
    -------
    float or ndarray
        y_c [m] with |Fr^2 - 1| <= 1e-10 at y_c. Independent of slope and n.

    Examples
    --------
    Rectangle, closed form y_c = (q^2 / g)^(1/3) with q = Q / b
    (Chow 1959, Eq. 4-5): b = 2 m, Q = 4 m^3/s gives (2^2 / 9.80665)^(1/3) = 0.7416 m.

    >>> import hydraulics as hy
    >>> round(hy.critical_depth(hy.Rectangle(bottom_width=2.0), 4.0), 4)
    0.7416
    """
    return solve_critical_depth(section, flow).depth


def flow_at_depth(section, depth, slope, n=None):
    """Discharge carried at ``depth`` by Manning's equation, Q = (1/n) A R^(2/3) S^(1/2) [m^3/s].

    (Chow 1959, Eq. 5-6, k = 1 in SI.) ``depth`` [m] > 0 and at most the
    section's full depth; ``slope`` [m/m]; ``n`` as in :func:`normal_depth`.
    """
    _check_section(section)
    geo = section.properties(depth)
    s = validate.slope(slope)
    rough = resolve_roughness(section, n)
    y = validate.positive("depth", depth)
    nv = _n_value(rough, section, y, s)
    sqrt = math.sqrt if isinstance(s, float) else np.sqrt
    return K_MANNING_SI / nv * geo.area * (geo.area / geo.wetted_perimeter) ** (2 / 3) * sqrt(s)


def max_flow(section, slope, n=None):
    """Largest flow the section can carry by Manning's equation [m^3/s]; inf for open sections.

    For a pipe this is the part-full peak near 0.938 D (above the full-pipe
    flow); for a surveyed section it is the flow at the lower bank.
    """
    _check_section(section)
    if section.capacity_depth is None:
        return math.inf
    return flow_at_depth(section, section.capacity_depth, slope, n)
