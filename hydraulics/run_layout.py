"""Where things are along a ditch run: stations, the invert profile, ranges, and the design points.

A ditch run is laid out by road stations (SI metres here; the edges show
them as 0+000 or 10+00). The water runs from the run's upstream end to its
outfall, which is one end of the run: when the outfall is at the last
station the water runs ahead (toward higher stations), at the first station
it runs back. Everything downstream of here works in the *distance along
the flow* x = |station - upstream station|, so that x rises in the
direction of flow whichever way the road is stationed.

Grades follow from the invert profile's points, stretch by stretch,
S = (z_up - z_down) / (x_down - x_up): positive where the invert falls in
the direction of flow. A zero or adverse grade is kept as given and
reported; it is never changed.

Design points are placed at both ends, at every grade break, at both ends
of every section range and bend, at every inflow, and at every whole
multiple of the spacing in stations (so a table reads at round stations).
A design point lying where two ranges meet takes the values of the range
that begins there in the direction of flow (the water leaving the point);
the outfall takes those of the last range. This is the program's own
convention, stated on the run's results.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from . import validate
from .errors import InputError
from .wording import worded

__all__ = ["StationRange", "RunLayout", "POINT_TOLERANCE", "MAX_DESIGN_POINTS", "too_many_points"]

#: Two design points closer than this [m] are one point.
POINT_TOLERANCE = 1e-6
#: Most design points a run may have (common practice: a run stays solvable at once in the window).
MAX_DESIGN_POINTS = 200_000


def too_many_points(length: float, spacing: float) -> str | None:
    """Why ``spacing`` gives a run of ``length`` (one unit for both) too many design points ("gives 300,000
    design points ...; at most 200,000"), or None. Worked out from the length, before any station number is made
    whole: a spacing a hair wide gives numbers beyond any integer."""
    count = length / spacing
    if count <= MAX_DESIGN_POINTS:
        return None
    shown = f"{count:,.0f}" if count < 1e12 else "over 10^12"
    return f"gives {shown} design points; at most {MAX_DESIGN_POINTS:,}"


@dataclass(frozen=True)
class StationRange:
    """A range of stations [m] (from < to, in road stations, whatever the direction of flow)."""

    start: float
    end: float


def _station(field: str, value) -> float:
    return validate.number(field, value)


def _at(station: float) -> tuple:
    return (station, "station")


class RunLayout:
    """The stations, invert and grades of one run, and the design points along it.

    Parameters
    ----------
    profile_stations, profile_elevations : sequence of float
        The invert profile: grade-break points (station [m], elevation [m]),
        at least two, stations strictly increasing. The run extends from the
        first to the last.
    outfall_station : float
        Station of the outfall [m]: the first or the last profile station.
    spacing : float
        Largest distance between design points [m], > 0; points are added at
        every whole multiple of it in stations.
    extra_stations : sequence of float or of (field, float)
        Further stations that must be design points (range ends, inflows) [m];
        each must lie on the run (a refusal names the field when given).
    """

    def __init__(self, profile_stations, profile_elevations, outfall_station, spacing, extra_stations=()):
        st = np.asarray(profile_stations, dtype=float)
        z = np.asarray(profile_elevations, dtype=float)
        if st.ndim != 1 or st.size < 2:
            raise InputError("profile", f"needs at least two points (station, elevation), got {st.size}")
        if z.shape != st.shape:
            raise InputError("profile", f"has {st.size} stations but {z.size} elevations")
        for i, (s, e) in enumerate(zip(st, z)):
            _station(f"profile[{i}].station", s)
            validate.number(f"profile[{i}].elevation", e)
            if i and not s > st[i - 1]:
                raise InputError(f"profile[{i}].station", worded("must be beyond the station before it ({before}); "
                                                                 "stations rise along the profile, got {s}",
                                                                 before=_at(st[i - 1]), s=_at(s)))
        outfall = _station("outfall.station", outfall_station)
        if abs(outfall - st[-1]) <= POINT_TOLERANCE:
            self.direction = 1
        elif abs(outfall - st[0]) <= POINT_TOLERANCE:
            self.direction = -1
        else:
            raise InputError("outfall.station", worded("must be one end of the run ({a} or {b}), got {s}",
                                                       a=_at(st[0]), b=_at(st[-1]), s=_at(outfall)))
        self.spacing = validate.positive("spacing", spacing)
        self.first_station, self.last_station = float(st[0]), float(st[-1])
        self.upstream_station = self.first_station if self.direction == 1 else self.last_station
        self.length = self.last_station - self.first_station
        # the profile in flow order
        order = slice(None) if self.direction == 1 else slice(None, None, -1)
        self.profile_x = self.x_of(st)[order]
        self.profile_z = z[order]
        self.grades = (self.profile_z[:-1] - self.profile_z[1:]) / np.diff(self.profile_x)

        wanted = [float(s) for s in st]
        for i, s in enumerate(extra_stations):
            name, s = s if isinstance(s, tuple) else (f"stations[{i}]", s)
            s = _station(name, s)
            self.check_on_run(name, s)
            wanted.append(s)
        if too_many := too_many_points(self.length, self.spacing):
            raise InputError("spacing", worded("{why} on a run of {length} (use a larger spacing)", why=too_many,
                                               length=(self.length, "length")))
        k0 = int(np.ceil(self.first_station / self.spacing - 1e-9))
        k1 = int(np.floor(self.last_station / self.spacing + 1e-9))
        wanted += list(np.arange(k0, k1 + 1) * self.spacing)
        x = np.sort(self.x_of(np.clip(np.asarray(wanted, float), self.first_station, self.last_station)))
        keep = np.concatenate([[True], np.diff(x) > POINT_TOLERANCE])
        x = x[keep]
        x[-1] = self.length if abs(x[-1] - self.length) <= POINT_TOLERANCE else x[-1]
        #: distance along the flow of each design point [m], from 0 at the upstream end to the outfall
        self.x = x
        #: road station of each design point [m]
        self.stations = self.station_of(x)
        #: index of the profile stretch each design point lies on (the one leaving it; the outfall: the last)
        self.stretch = self.range_index(self.profile_x)
        #: grade at each design point [m/m], positive downhill in the direction of flow
        self.grade = self.grades[self.stretch]
        #: invert elevation at each design point [m]
        self.invert = np.interp(x, self.profile_x, self.profile_z)

    # -- coordinates --------------------------------------------------------
    def x_of(self, station):
        """Distance along the flow [m] of a station [m]."""
        return (np.asarray(station, dtype=float) - self.upstream_station) * self.direction

    def station_of(self, x):
        """Road station [m] of a distance along the flow [m]."""
        return self.upstream_station + self.direction * np.asarray(x, dtype=float)

    def check_on_run(self, field: str, station: float) -> None:
        if not self.first_station - POINT_TOLERANCE <= station <= self.last_station + POINT_TOLERANCE:
            raise InputError(field, worded("must lie on the run, from {a} to {b}, got {s}", a=_at(self.first_station),
                                           b=_at(self.last_station), s=_at(station)))

    def range_index(self, starts_x) -> np.ndarray:
        """For each design point, the index of the range (given by its starts in x, ascending, the first at 0) that
        holds it: the range beginning at or before the point; the outfall belongs to the last."""
        starts_x = np.asarray(starts_x, dtype=float)
        idx = np.searchsorted(starts_x, self.x + POINT_TOLERANCE, side="right") - 1
        return np.clip(idx, 0, max(len(starts_x) - 2, 0) if len(starts_x) > 1 else 0)

    def x_range(self, rng: StationRange) -> tuple[float, float]:
        """A station range as (x_from, x_to) along the flow, x_from < x_to."""
        a, b = sorted(float(v) for v in self.x_of([rng.start, rng.end]))
        return a, b

    def covering(self, field: str, ranges) -> np.ndarray:
        """Which of ``ranges`` (StationRange list, together covering the whole run without gap or overlap) holds
        each design point; refuses a gap, an overlap, or a range off the run, naming it.

        Returns an index array (one per design point).
        """
        if not ranges:
            raise InputError(field, "is empty: give at least one range covering the whole run")
        spans = []
        for i, r in enumerate(ranges):
            a = _station(f"{field}[{i}].from_station", r.start)
            b = _station(f"{field}[{i}].to_station", r.end)
            if not b > a:
                raise InputError(f"{field}[{i}].to_station", worded("must be beyond from_station ({a}), got {b}",
                                                                    a=_at(a), b=_at(b)))
            self.check_on_run(f"{field}[{i}].from_station", a)
            self.check_on_run(f"{field}[{i}].to_station", b)
            spans.append((a, b, i))
        spans.sort()
        at = self.first_station
        for a, b, i in spans:
            if a > at + POINT_TOLERANCE:
                raise InputError(f"{field}[{i}].from_station",
                                 worded("leaves a gap from {at} to {a} that no range covers", at=_at(at), a=_at(a)))
            if a < at - POINT_TOLERANCE:
                raise InputError(f"{field}[{i}].from_station",
                                 worded("overlaps the range before it, which reaches {at}; got {a}", at=_at(at),
                                        a=_at(a)))
            at = b
        if at < self.last_station - POINT_TOLERANCE:
            raise InputError(field, worded("leaves a gap from {at} to the end of the run at {end}", at=_at(at),
                                           end=_at(self.last_station)))
        # in flow order: ranges sorted by their upstream end
        by_flow = sorted(spans, key=lambda s: self.x_range(StationRange(s[0], s[1]))[0])
        starts = [self.x_range(StationRange(a, b))[0] for a, b, _ in by_flow] + [self.length]
        which = self.range_index(starts)
        return np.array([by_flow[k][2] for k in which], dtype=int)

    def within(self, ranges) -> np.ndarray:
        """For each design point, the index of the range of ``ranges`` (StationRange list, not overlapping) that
        holds it on its downstream side, or -1 (ranges need not cover the run; bends)."""
        out = np.full(self.x.shape, -1, dtype=int)
        for i, r in enumerate(ranges):
            a, b = self.x_range(r)
            inside = (self.x >= a - POINT_TOLERANCE) & (self.x < b - POINT_TOLERANCE)
            if b >= self.length - POINT_TOLERANCE:
                inside |= self.x >= self.length - POINT_TOLERANCE
            out[inside] = i
        return out

    def point_index(self, station: float) -> int:
        """Index of the design point at ``station`` (which must be one)."""
        x = float(self.x_of(station))
        i = int(np.argmin(np.abs(self.x - x)))
        if abs(self.x[i] - x) > 1e-3:
            raise InputError("station", worded("{s} is not a design point of the run", s=_at(station)))
        return i
