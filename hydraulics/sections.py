"""Channel cross-sections: flow area, wetted perimeter and top width at a depth.

Every section measures depth ``y`` [m] from its lowest point (the invert) and
returns, through :meth:`Section.properties`, the flow area A [m^2], wetted
perimeter P [m], top width T [m] and the derivatives dP/dy and dT/dy [-] that
the solvers use for Newton steps (dA/dy = T for every section). Depths and the
section's own dimensions may be floats or numpy arrays that broadcast; a float
in gives a float out.

The closed forms are the standard ones, e.g. Chow, V. T., *Open-Channel
Hydraulics*, McGraw-Hill, 1959, Table 2-1 ("Geometric elements of channel
sections"). The parabola uses the exact arc length rather than Table 2-1's
series approximation of P.
"""

from __future__ import annotations

import math
from typing import Any, NamedTuple

import numpy as np

from . import validate
from .constants import G
from .errors import InputError
from .wording import worded


class Geometry(NamedTuple):
    """Geometric elements at one depth (or an array of depths), SI.

    A named tuple, not a frozen dataclass: the scalar solvers make one per iteration, and a frozen dataclass's
    constructor costs several times as much."""

    area: Any
    wetted_perimeter: Any
    top_width: Any
    dP_dy: Any
    dT_dy: Any


def _is_scalar(*values) -> bool:
    for v in values:  # a plain loop: this runs in every scalar iteration, where a generator costs more
        if type(v) is not float:
            return False
    return True


class Section:
    """Base class. Subclasses implement :meth:`_geometry` (no checks) and set ``kind``."""

    kind = "section"
    #: Depth to the crown (pipe) or to the lower bank (surveyed section); None if open.
    full_depth = None
    #: Depth above which the flow can no longer grow (closed or bounded sections); None if open.
    capacity_depth = None
    #: (left, right) side slopes H:V for the trapezoid family, else None.
    side_slopes = None

    # -- public, checked -------------------------------------------------
    def properties(self, depth) -> Geometry:
        """Geometric elements at ``depth`` [m] above the invert."""
        y = self._check_depth(depth)
        return self._geometry(y)

    def area(self, depth):
        """Flow area A [m^2]."""
        return self.properties(depth).area

    def wetted_perimeter(self, depth):
        """Wetted perimeter P [m]."""
        return self.properties(depth).wetted_perimeter

    def top_width(self, depth):
        """Water-surface width T [m]."""
        return self.properties(depth).top_width

    def hydraulic_radius(self, depth):
        """Hydraulic radius R = A/P [m]."""
        g = self.properties(depth)
        return g.area / g.wetted_perimeter

    def hydraulic_depth(self, depth):
        """Hydraulic depth D = A/T [m] (infinite at a pipe's crown, where T = 0)."""
        g = self.properties(depth)
        if _is_scalar(g.top_width):
            return g.area / g.top_width if g.top_width > 0 else math.inf
        with np.errstate(divide="ignore"):
            return np.where(g.top_width > 0, g.area / g.top_width, np.inf)

    def first_moment(self, depth):
        """First moment of the flow area about the water surface, A times the depth of its centroid [m^3].

        It is the pressure term of the specific force (momentum function) M = Q^2 / (g A) + A y_bar
        that a hydraulic jump conserves (see :mod:`hydraulics.water_surface`). For any section it equals the integral of
        A(eta) from the invert to ``depth`` [m], since d(A y_bar)/dy = A; each shape gives it in
        closed form (the surveyed section by Simpson's rule between its break points, exact there
        because A is quadratic between them).
        """
        y = self._check_depth(depth)
        return self._first_moment(y)

    def centroid_depth(self, depth):
        """Depth of the centroid of the flow area below the water surface, y_bar [m]."""
        y = self._check_depth(depth)
        return self._first_moment(y) / self._geometry(y).area

    def _check_depth(self, depth):
        y = validate.positive("depth", depth)
        if self.full_depth is not None:
            over = np.asarray(y) > self.full_depth * (1 + 1e-12)
            if over.any():
                raise InputError("depth", f"must be <= the section's full depth {np.max(self.full_depth):g} m, "
                                          f"got {np.max(np.broadcast_to(y, over.shape)[over]):g} m")
        return y

    # -- for subclasses and solvers --------------------------------------
    def _geometry(self, y) -> Geometry:  # pragma: no cover - abstract
        raise NotImplementedError

    def _first_moment(self, y):  # pragma: no cover - abstract
        raise NotImplementedError

    def _depth_guess(self, log_k):
        """A starting depth [m] for ln(A R^(2/3)) = log_k (= ln(Q n / sqrt(S)))."""
        raise NotImplementedError  # pragma: no cover - abstract

    def _depth_start(self, log_k):
        """A start for ln(A R^(2/3)) = log_k (an array) with a constant n, where the root is unique: a closer
        one than :meth:`_depth_guess` where the section has it (a depth-dependent n keeps that guess, from which
        the solver's steps choose among several roots)."""
        return self._depth_guess(log_k)

    @property
    def is_vector(self) -> bool:
        """True when any dimension of the section is an array."""
        return any(isinstance(v, np.ndarray) for v in self.to_dict().values())

    def take(self, index) -> "Section":
        """The section of the elements ``index`` of its 1-D array dimensions (a dimension that is one number
        stays as it is)."""
        dims = self.to_dict()
        kind = dims.pop("shape")
        if any(isinstance(v, np.ndarray) and v.ndim != 1 for v in dims.values()):
            raise InputError("section", f"only a {kind} with 1-D array dimensions can be taken apart")
        return type(self)(**{k: v[index] if isinstance(v, np.ndarray) else v for k, v in dims.items()})

    def to_dict(self) -> dict:  # pragma: no cover - abstract
        raise NotImplementedError

    def outline(self, depth: float):
        """Boundary points (x, z) [m] up to ``depth`` above the invert, invert at z = 0."""
        raise NotImplementedError  # pragma: no cover - abstract

    def __repr__(self):
        args = ", ".join(f"{k}={v!r}" for k, v in self.to_dict().items() if k != "shape")
        return f"{type(self).__name__}({args})"


def _slopes(side_slope, left_slope, right_slope, *, required: bool = True):
    """Resolve ``side_slope`` or the ``left_slope``/``right_slope`` pair."""
    if side_slope is not None and (left_slope is not None or right_slope is not None):
        raise InputError("side_slope", "give either side_slope or left_slope and right_slope, not both")
    if side_slope is not None:
        z = validate.non_negative("side_slope", side_slope)
        return z, z
    if left_slope is None and right_slope is None:
        if required:
            raise InputError("side_slope", "is missing (H:V, a number >= 0)")
        return 0.0, 0.0
    if left_slope is None or right_slope is None:
        missing = "left_slope" if left_slope is None else "right_slope"
        raise InputError(missing, "is missing; give both left_slope and right_slope (H:V, >= 0)")
    return validate.non_negative("left_slope", left_slope), validate.non_negative("right_slope", right_slope)


class Trapezoid(Section):
    """Trapezoid with bottom width b and side slopes z1 (left), z2 (right), H:V.

    A = (b + (z1 + z2) y / 2) y,  P = b + y (sqrt(1 + z1^2) + sqrt(1 + z2^2)),
    T = b + (z1 + z2) y  (Chow 1959, Table 2-1).
    """

    kind = "trapezoid"

    def __init__(self, bottom_width=None, side_slope=None, *, left_slope=None, right_slope=None):
        if bottom_width is None:
            raise InputError("bottom_width", "is missing (a number >= 0 m)")
        self.bottom_width = validate.non_negative("bottom_width", bottom_width)
        self.left_slope, self.right_slope = _slopes(side_slope, left_slope, right_slope)
        degenerate = (np.asarray(self.bottom_width) == 0) & (np.asarray(self.left_slope) + np.asarray(self.right_slope) == 0)
        if degenerate.any():
            raise InputError("bottom_width", "must be > 0 when both side slopes are 0 (the section has no width)")
        self._init_constants()

    def _init_constants(self):
        z1, z2 = self.left_slope, self.right_slope
        if _is_scalar(z1, z2):
            self._zsum = z1 + z2
            self._psum = math.sqrt(1 + z1 * z1) + math.sqrt(1 + z2 * z2)
        else:
            self._zsum = np.add(z1, z2)
            self._psum = np.sqrt(1 + np.square(z1)) + np.sqrt(1 + np.square(z2))

    @property
    def side_slopes(self):
        return (self.left_slope, self.right_slope)

    def _geometry(self, y):
        b, zs, ps = self.bottom_width, self._zsum, self._psum
        if _is_scalar(y, b, zs):
            top = b + zs * y
            return Geometry(area=(b + 0.5 * zs * y) * y, wetted_perimeter=b + ps * y, top_width=top, dP_dy=ps,
                            dT_dy=zs)
        # Arrays: A = (b + T) y / 2, each array made once and updated in place (the hot loop of large batches).
        top = zs * y
        top += b
        area = top + b
        area *= 0.5
        area *= y
        perimeter = ps * y
        perimeter += b
        # The derivatives are constants here; they broadcast against the depth arrays.
        return Geometry(area=area, wetted_perimeter=perimeter, top_width=top, dP_dy=ps, dT_dy=zs)

    def _first_moment(self, y):
        # Bottom rectangle b y (centroid y/2 down) and the two side triangles z y^2 / 2 (centroid y/3 down).
        return (0.5 * self.bottom_width + self._zsum * y / 6) * y * y

    def _depth_guess(self, log_k):
        # The smaller of the wide-rectangle (A = b y, R = y) and triangle estimates, from ln(Q n / sqrt S).
        b, zs, ps = self.bottom_width, self._zsum, self._psum
        if _is_scalar(b, zs, log_k):
            wide = math.exp(0.6 * (log_k - math.log(b))) if b > 0 else math.inf
            # ln(0.5) + ln(zs), not ln(0.5 zs), which underflows for the smallest positive zs.
            tri = math.exp(min(700.0, 0.375 * (log_k + 2 / 3 * math.log(ps)) - 0.625 * (math.log(zs) - math.log(2.0)))) \
                if zs > 0 else math.inf
            return min(wide, tri)
        with np.errstate(divide="ignore", over="ignore"):
            wide = np.multiply(log_k, 0.6)
            wide -= 0.6 * np.log(b)
            tri = np.multiply(log_k, 0.375)
            tri += 0.25 * np.log(ps) - 0.625 * (np.log(zs) - math.log(2.0))
            return np.minimum(np.exp(wide), np.exp(tri))

    def _depth_start(self, log_k):
        # One section for many flows: y/b read off a table of the section's own conveyance (see _TrapezoidTable).
        b, zs, ps = self.bottom_width, self._zsum, self._psum
        if not _is_scalar(b, zs) or not b > 0:
            return self._depth_guess(log_k)
        return b * _trapezoid_table(0.5 * zs, ps).depth_ratio(log_k - 8 / 3 * math.log(b))

    def _critical_guess(self, flow):
        # The smaller of the rectangle (q^2/g)^(1/3) and triangle (2 Q^2 / (g zm^2))^(1/5) depths.
        b, zm = self.bottom_width, 0.5 * self._zsum
        # A nearly vertical V (zm ~ 1e-160) overflows to an infinite triangle estimate: the other one is used.
        with np.errstate(divide="ignore", over="ignore"):
            rect = np.where(np.asarray(b) > 0, (flow * flow / (G * np.square(b))) ** (1 / 3), np.inf)
            tri = np.where(np.asarray(zm) > 0, (2 * flow * flow / (G * np.square(zm))) ** 0.2, np.inf)
        guess = np.minimum(rect, tri)
        return float(guess) if guess.ndim == 0 else guess

    def to_dict(self):
        return {"shape": self.kind, "bottom_width": self.bottom_width,
                "left_slope": self.left_slope, "right_slope": self.right_slope}

    def outline(self, depth):
        b, z1, z2 = (float(v) for v in (self.bottom_width, self.left_slope, self.right_slope))
        x = np.array([-b / 2 - z1 * depth, -b / 2, b / 2, b / 2 + z2 * depth])
        return x, np.array([depth, 0.0, 0.0, depth])


class Triangle(Trapezoid):
    """V-ditch: a trapezoid with no bottom width (side slopes H:V, > 0 on at least one side)."""

    kind = "triangle"

    def __init__(self, side_slope=None, *, left_slope=None, right_slope=None):
        z1, z2 = _slopes(side_slope, left_slope, right_slope)
        if (np.asarray(z1) + np.asarray(z2) <= 0).any():
            raise InputError("side_slope", "must be > 0 on at least one side for a V-ditch")
        self.bottom_width = 0.0
        self.left_slope, self.right_slope = z1, z2
        self._init_constants()

    def to_dict(self):
        return {"shape": self.kind, "left_slope": self.left_slope, "right_slope": self.right_slope}


class Rectangle(Trapezoid):
    """Rectangle of bottom width b > 0 (vertical walls)."""

    kind = "rectangle"

    def __init__(self, bottom_width=None):
        if bottom_width is None:
            raise InputError("bottom_width", "is missing (a number > 0 m)")
        self.bottom_width = validate.positive("bottom_width", bottom_width)
        self.left_slope = self.right_slope = 0.0
        self._init_constants()

    def to_dict(self):
        return {"shape": self.kind, "bottom_width": self.bottom_width}


class Parabola(Section):
    """Parabolic swale z = k x^2, given by its top width T0 at a stated depth y0.

    k = y0 / (T0/2)^2; at depth y the half-width is a = sqrt(y/k), T = 2a,
    A = 2/3 T y (Chow 1959, Table 2-1), and the exact arc length is
    P = a sqrt(1 + u^2) + asinh(u) / (2k) with u = 2 k a (integral of
    sqrt(1 + (dz/dx)^2) over -a..a). dP/dy = 2 sqrt(1 + u^2) / u.
    """

    kind = "parabola"

    def __init__(self, top_width=None, at_depth=None):
        if top_width is None:
            raise InputError("top_width", "is missing (a number > 0 m)")
        if at_depth is None:
            raise InputError("at_depth", "is missing (the depth at which top_width is measured, > 0 m)")
        self.top_width_ref = validate.positive("top_width", top_width)
        self.at_depth = validate.positive("at_depth", at_depth)
        self._k = self.at_depth / (0.5 * self.top_width_ref) ** 2

    def _geometry(self, y):
        k = self._k
        if _is_scalar(y, k):
            a = math.sqrt(y / k)
            u = 2 * k * a
            root = math.sqrt(1 + u * u)
            perim = a * root + math.asinh(u) / (2 * k)
        else:
            a = np.sqrt(y / k)
            u = 2 * k * a
            root = np.sqrt(1 + u * u)
            perim = a * root + np.arcsinh(u) / (2 * k)
        top = 2 * a
        return Geometry(area=2 / 3 * top * y, wetted_perimeter=perim, top_width=top,
                        dP_dy=2 * root / u, dT_dy=top / (2 * y))

    def _first_moment(self, y):
        # A(eta) = (4/3) eta^(3/2) / sqrt(k); its integral to y is (2/5) y A(y).
        return 0.4 * y * self._geometry(y).area

    def _depth_guess(self, log_k):
        # Wide parabola: P ~ T, R ~ 2y/3, T = T0 sqrt(y/y0) -> conveyance ~ c y^(13/6).
        c = 2 / 3 * self.top_width_ref / self.at_depth ** 0.5 * (2 / 3) ** (2 / 3)
        return np.exp((log_k - np.log(c)) * (6 / 13)) if not _is_scalar(log_k, c) else math.exp((log_k - math.log(c)) * 6 / 13)

    def _critical_guess(self, flow):
        # Exact for a parabola: Q^2 = g (8/27) (T0^2 / y0) y^4.
        return (27 * flow * flow * self.at_depth / (8 * G * self.top_width_ref ** 2)) ** 0.25

    def to_dict(self):
        return {"shape": self.kind, "top_width": self.top_width_ref, "at_depth": self.at_depth}

    def outline(self, depth):
        a = math.sqrt(depth / float(self._k))
        x = np.linspace(-a, a, 81)
        return x, float(self._k) * x * x


def _circle_capacity_ratio() -> float:
    """y/D at which Manning flow in a part-full circle peaks (about 0.938).

    d/dtheta of A^(5/3) P^(-2/3) = 0 with A = D^2/8 (theta - sin theta), P = D theta / 2
    gives 5 P dA/dtheta = 2 A dP/dtheta, i.e. 5 theta (1 - cos theta) = 2 (theta - sin theta).
    """
    # Bisection in plain floats (no solver library at import time): f > 0 at pi, f < 0 just below 2 pi,
    # one root between; 200 halvings reach the spacing of adjacent floats.
    def f(t):
        return 5 * t * (1 - math.cos(t)) - 2 * (t - math.sin(t))

    lo, hi = math.pi, 2 * math.pi - 1e-9
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        if mid in (lo, hi):
            break
        if f(mid) > 0:
            lo = mid
        else:
            hi = mid
    theta = 0.5 * (lo + hi)
    return (1 - math.cos(theta / 2)) / 2


#: y/D of the largest part-full flow by Manning's equation with constant n (0.9382), found
#: from the condition above rather than typed in; the tests check it against published values.
CIRCLE_CAPACITY_RATIO = _circle_capacity_ratio()


#: Below this central angle [rad] theta - sin(theta) is summed as a series (direct
#: subtraction would lose digits: at theta = 0.1 the series' first omitted term is 1e-19 of the sum).
_SERIES_BELOW = 0.1


def _segment_series(theta):
    """theta - sin(theta) by its Taylor series (for small theta, where the subtraction loses digits)."""
    t2 = theta * theta
    return theta * t2 * (1 / 6 - t2 * (1 / 120 - t2 * (1 / 5040 - t2 * (1 / 362880 - t2 / 39916800))))


class _TrapezoidTable:
    """ln(y/b) against F = ln(A^(5/3) P^(-2/3) / b^(8/3)) of one trapezoid, on an even grid of F.

    With eta = y/b, F = 5/3 ln(eta (1 + zm eta)) - 2/3 ln(1 + ps eta) (zm = (z1 + z2)/2, ps = sqrt(1 + z1^2)
    + sqrt(1 + z2^2)). F rises with eta, nearly linearly in ln eta (slope 5/3 for shallow flow, 8/3 for deep
    flow, 1 in a rectangle), so ln eta is linear in F to within about 1e-6 between neighbouring entries: a
    start from which one Newton step mostly finishes. The grid's end segments carry on linearly beyond it (the two
    straight asymptotes), so every F has a start.
    """

    SPAN = (-30.0, 30.0)   # ln eta covered
    SIZE = 16384

    def __init__(self, zm, ps):
        log_eta = np.linspace(*self.SPAN, 4 * self.SIZE)
        eta = np.exp(log_eta)
        f = 5 / 3 * (log_eta + np.log1p(zm * eta)) - 2 / 3 * np.log1p(ps * eta)
        self.f0, f1 = float(f[0]), float(f[-1])
        self.step = (f1 - self.f0) / (self.SIZE - 1)
        table = np.interp(np.linspace(self.f0, f1, self.SIZE), f, log_eta)
        self.table, self.rise = table[:-1], np.diff(table)

    def depth_ratio(self, f):
        """y/b at F = ``f`` (array)."""
        x = np.subtract(f, self.f0)
        x *= 1.0 / self.step
        i = x.astype(np.intp)
        np.clip(i, 0, len(self.table) - 1, out=i)
        x -= i
        x *= np.take(self.rise, i)     # np.take: the same gather as indexing, in about half the time
        x += np.take(self.table, i)
        return np.exp(x, out=x)


_TRAPEZOID_TABLES = {}


def _trapezoid_table(zm, ps) -> _TrapezoidTable:
    """The table of a trapezoid's shape (kept for the last few shapes)."""
    key = (float(zm), float(ps))
    table = _TRAPEZOID_TABLES.get(key)
    if table is None:
        if len(_TRAPEZOID_TABLES) >= 8:
            _TRAPEZOID_TABLES.pop(next(iter(_TRAPEZOID_TABLES)))
        table = _TRAPEZOID_TABLES[key] = _TrapezoidTable(*key)
    return table


_CIRCLE_TABLES = {}
_CIRCLE_SPLIT = 0.5  # y/D where the table of the normal-depth factor changes its abscissa (see below)


def _circle_guess(log_target, which):
    """y/D of a circle where ln f(y/D) (``which`` "normal") or ln F(y/D) ("critical") equals ``log_target``.

    f = a^(5/3) p^(-2/3) and F = a^3 / t with a = A/D^2, p = P/D, t = T/D, the
    section factors of Manning flow and of the critical condition for D = 1.
    Both rise with depth (f up to the largest part-full flow), so y/D is read
    off a table by linear interpolation: a start for Newton's method close
    to the root, which then needs two or three steps. The table pairs ln f
    with ln(y/D); above half full, f flattens towards its peak, where
    ln f_max - ln f grows as the square of the distance from the peak, so
    there y/D is paired with sqrt(ln f_max - ln f) instead. Below the table
    the shallow-flow limits f ~ (y/D)^(13/6) and F ~ (y/D)^4 (from
    A ~ (4 sqrt 2 / 3) D^2 (y/D)^(3/2), P ~ 2 D sqrt(y/D), T ~ 2 D sqrt(y/D))
    carry on; above it the last entry is used (the solver brackets the root
    and keeps the depth in the pipe).
    """
    if not _CIRCLE_TABLES:
        unit = Circle(diameter=1.0)
        low = np.geomspace(1e-9, _CIRCLE_SPLIT, 450)
        g = unit._geometry(low)
        _CIRCLE_TABLES["normal"] = (5 / 3 * np.log(g.area) - 2 / 3 * np.log(g.wetted_perimeter), np.log(low), 13 / 6)
        high = np.linspace(_CIRCLE_SPLIT, CIRCLE_CAPACITY_RATIO, 200)
        g = unit._geometry(high)
        log_f = 5 / 3 * np.log(g.area) - 2 / 3 * np.log(g.wetted_perimeter)
        _CIRCLE_TABLES["normal top"] = (-np.sqrt(np.maximum(0.0, log_f[-1] - log_f)), high, log_f[-1])
        eta = np.concatenate([np.geomspace(1e-9, 0.5, 450), 1 - np.geomspace(0.5, 1e-9, 300)[1:]])
        g = unit._geometry(eta)
        _CIRCLE_TABLES["critical"] = (3 * np.log(g.area) - np.log(g.top_width), np.log(eta), 4.0)
    log_f, log_eta, power = _CIRCLE_TABLES[which]
    x = np.asarray(log_target, dtype=float)
    guess = np.exp(np.where(x < log_f[0], log_eta[0] + (x - log_f[0]) / power, np.interp(x, log_f, log_eta)))
    if which == "normal":
        root, top, peak = _CIRCLE_TABLES["normal top"]
        upper = x > log_f[-1]
        if upper.any():
            guess = np.where(upper, np.interp(-np.sqrt(np.maximum(0.0, peak - x)), root, top), guess)
    return float(guess) if guess.ndim == 0 else guess


class Circle(Section):
    """Part-full circular pipe of diameter D.

    With the central angle theta = 2 arccos(1 - 2y/D):
    A = D^2 (theta - sin theta) / 8,  P = D theta / 2,  T = D sin(theta/2)
    (Chow 1959, Table 2-1). dP/dy = 2D/T and dT/dy = 2 (D - 2y)/T.
    """

    kind = "circle"

    def __init__(self, diameter=None):
        if diameter is None:
            raise InputError("diameter", "is missing (a number > 0 m)")
        self.diameter = validate.positive("diameter", diameter)

    @property
    def full_depth(self):
        return self.diameter

    @property
    def capacity_depth(self):
        return CIRCLE_CAPACITY_RATIO * self.diameter

    def _geometry(self, y):
        # theta = 2 arccos(1 - 2y/D) written as 4 arcsin(sqrt(y/D)) (same angle, from 1 - cos x = 2 sin^2(x/2)),
        # which keeps its precision at small depths; theta - sin(theta) by its Taylor series there.
        # sin(theta/2) = T/D with T the chord 2 sqrt(y (D - y)), and sin(theta) = 2 (T/D) (D - 2y)/D: these
        # keep their digits next to the crown, where the angle from arcsin does not, and spare two sines.
        d = self.diameter
        if _is_scalar(y, d):
            yc = min(y, d)
            top = 2 * math.sqrt(yc * (d - yc))
            theta = 4 * math.asin(math.sqrt(yc / d))
            segment = _segment_series(theta) if theta < _SERIES_BELOW else theta - 2 * top * (d - 2 * yc) / (d * d)
        else:
            yc = np.minimum(y, d)
            top = 2 * np.sqrt(yc * (d - yc))
            theta = 4 * np.arcsin(np.sqrt(yc / d))
            segment = theta - 2 * top * (d - 2 * yc) / (d * d)
            small = theta < _SERIES_BELOW
            if np.ndim(segment) == 0:  # numpy scalars
                segment = _segment_series(theta) if small else segment
            elif small.any():
                segment[small] = _segment_series(theta[small])
        if _is_scalar(top) and top == 0.0:  # at the invert or the crown: vertical walls, infinite rates
            return Geometry(area=d * d * segment / 8, wetted_perimeter=d * theta / 2, top_width=top,
                            dP_dy=math.inf, dT_dy=math.copysign(math.inf, d - 2 * y))
        with np.errstate(divide="ignore", invalid="ignore"):
            return Geometry(area=d * d * segment / 8, wetted_perimeter=d * theta / 2, top_width=top,
                            dP_dy=2 * d / top, dT_dy=2 * (d - 2 * y) / top)

    def _first_moment(self, y):
        # Segment centroid 4 r sin^3(theta/2) / (3 (theta - sin theta)) below the centre, with sin(theta/2) = T/D:
        # A y_bar = A (that distance - (D/2 - y)) = T^3 / 12 - A (D/2 - y).
        g = self._geometry(y)
        return g.top_width ** 3 / 12 - g.area * (0.5 * self.diameter - y)

    def _depth_guess(self, log_k):
        # ln(A^(5/3) P^(-2/3)) = (8/3) ln D + ln f(y/D): read y/D off the table of f.
        return self.diameter * _circle_guess(log_k - 8 / 3 * np.log(self.diameter), "normal")

    def _critical_guess(self, flow):
        # A^3 / T = D^5 F(y/D) = Q^2 / g: read y/D off the table of F.
        d = self.diameter
        return d * _circle_guess(np.log(flow * flow / G) - 5 * np.log(d), "critical")

    def to_dict(self):
        return {"shape": self.kind, "diameter": self.diameter}

    def outline(self, depth):
        r = float(self.diameter) / 2
        t = np.linspace(0, 2 * math.pi, 145)
        return r * np.sin(t), r - r * np.cos(t)


class Irregular(Section):
    """A surveyed cross-section from station-elevation points, with Manning's n per segment.

    Depth is measured from the lowest point. Water stands at one level across
    the whole section (low pockets are assumed to connect). The section is full
    at the lower of its two end points; deeper flow overtops it.

    Composite roughness by the Horton-Einstein (equal-velocity) method:
    n_c = (sum(P_i n_i^1.5) / P)^(2/3)  (Chow 1959, Sec. 6-3, Eq. 6-17). It assumes
    the mean velocity is about the same over every part of the perimeter, which
    holds for a single compact ditch whose bed and banks carry different linings;
    it does not hold for a main channel with wide overbanks, where the section
    should be split and the conveyances added.

    Parameters
    ----------
    stations : sequence of float
        Horizontal positions [m], non-decreasing (equal neighbours make a vertical wall).
    elevations : sequence of float
        Ground elevations [m] at the stations.
    n : float or sequence of float
        Manning's n [s/m^(1/3)], one value or one per segment (len(stations) - 1).
    """

    kind = "irregular"

    def __init__(self, stations=None, elevations=None, n=None):
        if stations is None or elevations is None:
            raise InputError("stations" if stations is None else "elevations", "is missing")
        x = validate.number("stations", stations)
        z = validate.number("elevations", elevations)
        x, z = np.atleast_1d(x), np.atleast_1d(z)
        if x.ndim != 1 or x.shape != z.shape:
            raise InputError("elevations", f"must have one value per station ({x.size} stations, {z.size} elevations)")
        if x.size < 3:
            raise InputError("stations", f"needs at least 3 surveyed points, got {x.size}")
        if (np.diff(x) < 0).any():
            i = int(np.argmax(np.diff(x) < 0))
            raise InputError("stations", f"must not decrease (point {i + 2}: {x[i + 1]:g} after {x[i]:g})")
        if x[-1] <= x[0]:
            raise InputError("stations", "must span a width > 0")
        if n is None:
            raise InputError("n", "is missing (Manning's n, one value or one per segment)")
        nn = np.atleast_1d(validate.positive("n", n))
        if nn.size == 1:
            nn = np.full(x.size - 1, nn[0])
        if nn.size != x.size - 1:
            raise InputError("n", f"needs one value per segment ({x.size - 1}), got {nn.size}")
        zmin = z.min()
        self.stations, self.elevations, self.n = x, z, nn
        self.invert = float(zmin)
        self._full = float(min(z[0], z[-1]) - zmin)
        if self._full <= 0:
            raise InputError("elevations", "both end points must be higher than the lowest point")
        self._x0, self._x1 = x[:-1], x[1:]
        self._z0, self._z1 = z[:-1] - zmin, z[1:] - zmin
        self._lo = np.minimum(self._z0, self._z1)
        self._hi = np.maximum(self._z0, self._z1)
        self._dx = self._x1 - self._x0
        self._dz = self._hi - self._lo
        self._len = np.hypot(self._dx, self._dz)
        # points one above another at one station, down to the lowest point and up again, make a slot with no
        # width there: no water stands in it, and no depth below its top carries any flow
        if not float(self._geometry(1e-9 * self._full).top_width) > 0:
            low = int(np.argmin(z))
            raise InputError("stations", worded("the lowest point (point {i}, at {x}) lies at the foot of a slot "
                                                "with no width: points stand one above another at one station down "
                                                "to it and up again, so no water stands there; move them apart or "
                                                "remove the spike", i=str(low + 1), x=(float(x[low]), "length")))

    @property
    def full_depth(self):
        return self._full

    @property
    def capacity_depth(self):
        return self._full

    def _segments(self, y):
        """Per-segment wetted perimeter, width, area and their depth derivatives, shape (..., nseg)."""
        h = np.asarray(y, dtype=float)[..., None]
        lo, hi, dz = self._lo, self._hi, self._dz
        full = h >= hi
        part = (h > lo) & ~full
        with np.errstate(divide="ignore", invalid="ignore"):
            frac = np.where(part, (h - lo) / np.where(dz > 0, dz, 1.0), 0.0)
            per = np.where(full, self._len, self._len * frac)
            width = np.where(full, self._dx, self._dx * frac)
            area = np.where(full, self._dx * (h - 0.5 * (self._z0 + self._z1)), 0.5 * width * (h - lo))
            dper = np.where(part, self._len / np.where(dz > 0, dz, 1.0), 0.0)
            dwidth = np.where(part, self._dx / np.where(dz > 0, dz, 1.0), 0.0)
        return per, width, area, dper, dwidth

    def _geometry(self, y):
        per, width, area, dper, dwidth = self._segments(y)
        out = [a.sum(axis=-1) for a in (area, per, width, dper, dwidth)]
        if _is_scalar(y):
            out = [float(v) for v in out]
        return Geometry(area=out[0], wetted_perimeter=out[1], top_width=out[2], dP_dy=out[3], dT_dy=out[4])

    def _first_moment(self, y):
        def one(h):
            # A is quadratic in depth between the elevations of the survey points: Simpson's rule is exact there.
            cuts = np.unique(np.concatenate([[0.0], self._lo[self._lo < h], self._hi[self._hi < h], [h]]))
            a, b = cuts[:-1], cuts[1:]
            area = lambda e: self._segments(e)[2].sum(axis=-1)
            return float(np.sum((b - a) / 6 * (area(a) + 4 * area(0.5 * (a + b)) + area(b))))
        if np.ndim(y) == 0:
            return one(float(y))
        return np.vectorize(one, otypes=[float])(y)

    def composite_n(self, depth):
        """Horton-Einstein composite Manning's n at ``depth`` [s/m^(1/3)] (see class notes)."""
        per = self._segments(depth)[0]
        nc = ((per * self.n ** 1.5).sum(axis=-1) / per.sum(axis=-1)) ** (2 / 3)
        return float(nc) if _is_scalar(depth) else nc

    def manning_n(self, section, depth, slope):
        """Roughness protocol: the section's own composite n (``section`` is ``self``)."""
        return self.composite_n(depth)

    def _depth_guess(self, log_k):
        return 0.5 * self._full + 0.0 * np.asarray(log_k) if not _is_scalar(log_k) else 0.5 * self._full

    def _critical_guess(self, flow):
        return self._depth_guess(flow)  # half the bank height, whatever the flow

    @property
    def is_vector(self):
        return False

    def to_dict(self):
        return {"shape": self.kind, "stations": self.stations.tolist(),
                "elevations": self.elevations.tolist(), "n": self.n.tolist()}

    def outline(self, depth):
        return self.stations - self.stations[0], self.elevations - self.invert


_KINDS = {cls.kind: cls for cls in (Trapezoid, Triangle, Rectangle, Parabola, Circle, Irregular)}

#: The dimensions each shape given by numbers takes (a survey takes its points instead): shape -> (those it
#: needs, those it may be given). ``side_slope`` is both sides at once, ``left_slope`` and ``right_slope`` each
#: side; a V-ditch needs a slope on one side at least, which its class checks. The command line, the inventory
#: reader and the project schema (``resources/project.schema.json``, tested against this) take them from here.
SHAPE_DIMENSIONS = {
    "trapezoid": (frozenset({"bottom_width"}), frozenset({"bottom_width", "side_slope", "left_slope", "right_slope"})),
    "triangle": (frozenset(), frozenset({"side_slope", "left_slope", "right_slope"})),
    "rectangle": (frozenset({"bottom_width"}), frozenset({"bottom_width"})),
    "parabola": (frozenset({"top_width", "at_depth"}), frozenset({"top_width", "at_depth"})),
    "circle": (frozenset({"diameter"}), frozenset({"diameter"})),
}


def section_from_dict(data: dict) -> Section:
    """Build a section from :meth:`Section.to_dict` output (SI)."""
    if not isinstance(data, dict) or "shape" not in data:
        raise InputError("shape", "is missing")
    kind = data["shape"]
    cls = _KINDS.get(kind)
    if cls is None:
        raise InputError("shape", f"must be one of {', '.join(sorted(_KINDS))}, got {kind!r}")
    args = {k: v for k, v in data.items() if k != "shape"}
    try:
        return cls(**args)
    except TypeError as exc:
        raise InputError("shape", f"wrong dimensions for a {kind}: {exc}") from None


SHAPES = tuple(_KINDS)
