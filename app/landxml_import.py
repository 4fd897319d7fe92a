"""A project made from a LandXML 1.2 file: road profiles become ditch runs' inverts, cross-sections their surveyed
sections.

What is read (the element names and their meaning as the LandXML schema documentation describes them: the element
pages of the LandXML 1.1 schema at datypic.com/sc/niem20 (e-land_ProfAlign, e-land_Profile, e-land_ProfSurf,
e-land_Units, e-land_Alignment), whose Profile, ProfAlign, ProfSurf and PntList2D definitions LandXML 1.2 keeps, and
the LandXML 1.2 file header with its namespace ``http://www.landxml.org/schema/LandXML-1.2`` as shown in the Total
Open Station documentation, input format "landxml"):

- ``LandXML/Units/Metric`` or ``Units/Imperial`` with its ``linearUnit``: the unit of every station, offset and
  elevation. A metric file makes an SI project, an imperial one a US project; values are converted to SI here, at the
  edge, with :mod:`hydraulics.units` (the U.S. survey foot is 1200/3937 m: NIST, "U.S. survey foot", read in a copy of
  the page).
- ``Alignments/Alignment/Profile/ProfAlign``: a proposed vertical alignment, a sequence of ``PVI`` ("station
  elevation") and ``ParaCurve`` (a PVI with a symmetric parabolic vertical curve of horizontal ``length``). The
  curves are sampled at the run's spacing (see :func:`parabola_elevation`). ``UnsymParaCurve`` and ``CircCurve`` are
  not imported: a profile holding one is skipped, and the report says so.
- ``Profile/ProfSurf``: a station-elevation profile in ``PntList2D`` ("a sequential space delimited list of 2D
  coordinates with a minimum of 2 points"). Several ``PntList2D`` mean gaps in the profile; such a profile is skipped.
- ``Alignment/CrossSects/CrossSect`` at its station ``sta`` with ``CrossSectSurf`` surfaces whose ``PntList2D`` holds
  offset-elevation pairs. (The ``sta`` attribute was seen in public example files only, not read in the schema's
  own text: not verified.) Each becomes a surveyed (irregular) section governing the stretch nearer to it than to
  any other cross-section (the program's own convention, stated in the report).

A file that cannot be read as a whole (not XML, not LandXML, another LandXML version, a value missing or not a
number, stations out of order, a profile of one point) is refused with :class:`LandXMLError`, naming the element and
its line; nothing is written then. Parts that are valid LandXML but that a ditch run cannot use are skipped and the
report says why. Pure Python with lxml (no Qt).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path

import hydraulics as hy
from hydraulics import units as hu
from hydraulics.run_layout import too_many_points

from . import project as pj
from .editing import new_channel

NAMESPACE = "http://www.landxml.org/schema/LandXML-1.2"
_OTHER_VERSIONS = "http://www.landxml.org/schema/LandXML-"

#: linearUnit -> metres per unit, for each unit family the file may name. Foot and inch are the international ones
#: (hydraulics.units); the U.S. survey foot is 1200/3937 m (NIST, "U.S. survey foot").
LINEAR_UNITS = {
    "Metric": {"meter": 1.0, "millimeter": 1e-3, "centimeter": 1e-2, "kilometer": 1e3},
    "Imperial": {"foot": hu.FOOT, "USSurveyFoot": 1200.0 / 3937.0, "inch": hu.INCH},
}
PROJECT_UNITS = {"Metric": "si", "Imperial": "us"}

#: Design-point spacing of an imported run when none is given, in the project's unit: 15 m (the program's own
#: default for a run) or 50 ft (a round US station interval; common practice).
DEFAULT_SPACING = {"si": 15.0, "us": 50.0}
#: Manning's n put on every segment of an imported surveyed section when none is given: the program's starting n
#: of a new channel (app.editing.STARTING_VALUES; common practice).
DEFAULT_N = 0.030
#: The lining an imported run starts with (the schema needs one candidate); the user sets the real ones.
STARTING_CANDIDATE = "concrete"
#: Depth of the starting trapezoid a run gets when the file has no usable cross-section for it, in the project's
#: unit (common practice for a small roadside ditch; the user replaces it).
STARTING_DITCH_DEPTH = {"si": 0.6, "us": 2.0}


class LandXMLError(ValueError):
    """A file that is refused as a whole; the message names the element and its line."""


@dataclass
class ImportReport:
    """What an import made and what it left out, in words (one line each)."""

    imported: list = field(default_factory=list)
    skipped: list = field(default_factory=list)
    notes: list = field(default_factory=list)

    def lines(self) -> list:
        return ([f"imported: {t}" for t in self.imported] + [f"skipped: {t}" for t in self.skipped]
                + [f"note: {t}" for t in self.notes])


def parabola_elevation(station, pvi_station, pvi_elevation, g1, g2, length):
    """Elevation on a symmetric (equal-tangent) parabolic vertical curve [m].

    E(x) = E_PVC + g1 x + (g2 - g1) x^2 / (2 L), with x = station - (PVI station - L/2) the horizontal distance from
    the curve's beginning (PVC, 0 <= x <= L) and E_PVC = E_PVI - g1 L / 2.

    Source: the equal-tangent parabola "E = E_PVC + g1 x + (A x^2)/(2L)", A = g2 - g1, grades as decimals, as given in
    "8.3 Vertical Curves, Slopes, and Grades", FE Surveying study guide, open-exam-prep.com (read). A state DOT or FHWA
    text giving the equation was searched for and not found in the stored copies: not verified against one.

    Parameters
    ----------
    station : float or ndarray
        Where the elevation is wanted [m], on the curve.
    pvi_station, pvi_elevation : float
        The point of vertical intersection [m].
    g1, g2 : float
        Grades of the tangents before and after the PVI [m/m], positive rising with station.
    length : float
        Horizontal length of the curve [m], > 0.
    """
    x = station - (pvi_station - length / 2)
    return pvi_elevation - g1 * length / 2 + g1 * x + (g2 - g1) * x * x / (2 * length)


# -- reading --------------------------------------------------------------------------------------------------------

def _local(el) -> str:
    tag = el.tag
    return tag.split("}", 1)[1] if isinstance(tag, str) and "}" in tag else str(tag)


def _where(el) -> str:
    name = el.get("name")
    named = f' "{name}"' if name else ""
    return f"{_local(el)}{named} at line {el.sourceline}"


def _children(el, name):
    return el.findall(f"{{{NAMESPACE}}}{name}")


def _numbers(el, text=None, what="values") -> list:
    text = el.text if text is None else text
    parts = (text or "").split()
    out = []
    for p in parts:
        try:
            v = float(p)
        except ValueError:
            raise LandXMLError(f"{_where(el)}: {p!r} is not a number") from None
        if not math.isfinite(v):
            raise LandXMLError(f"{_where(el)}: {p!r} is not a finite number")
        out.append(v)
    return out


def _pairs(el, first: str) -> list:
    """The (first, elevation) pairs of a PntList2D; an odd count means an elevation is missing."""
    values = _numbers(el)
    if not values:
        raise LandXMLError(f"{_where(el)}: holds no {first}-elevation pairs")
    if len(values) % 2:
        raise LandXMLError(f"{_where(el)}: {len(values)} numbers, so the elevation of the last {first} "
                           f"({values[-1]:g}) is missing; a point list holds {first}-elevation pairs")
    return [(values[i], values[i + 1]) for i in range(0, len(values), 2)]


def _attribute_number(el, name: str, *, positive: bool = False) -> float:
    raw = el.get(name)
    if raw is None:
        raise LandXMLError(f"{_where(el)}: the attribute {name} is missing")
    try:
        v = float(raw)
    except ValueError:
        raise LandXMLError(f"{_where(el)}: {name}={raw!r} is not a number") from None
    if not math.isfinite(v) or (positive and v <= 0):
        raise LandXMLError(f"{_where(el)}: {name}={raw!r} must be a finite number{' > 0' if positive else ''}")
    return v


def parse(path):
    """The root element of the LandXML 1.2 file ``path``; anything else is refused with LandXMLError."""
    from lxml import etree

    parser = etree.XMLParser(resolve_entities=False, no_network=True, huge_tree=False, remove_comments=True)
    try:
        tree = etree.parse(str(path), parser)
    except etree.XMLSyntaxError as exc:
        line = f" at line {exc.lineno}" if getattr(exc, "lineno", None) else ""
        said = " ".join(str(exc.msg).split())     # libxml2's message may hold a line end: one line
        raise LandXMLError(f"{Path(path).name} is not an XML file (or is damaged){line}: {said}") from None
    except OSError as exc:
        raise LandXMLError(f"cannot read {path}: {exc.strerror or exc}") from None
    root = tree.getroot()
    local = _local(root)
    ns = root.tag.split("}", 1)[0][1:] if root.tag.startswith("{") else ""
    if local != "LandXML":
        raise LandXMLError(f"not a LandXML file: its root element is {local} (line {root.sourceline}), not LandXML")
    if ns != NAMESPACE:
        if ns.startswith(_OTHER_VERSIONS):
            raise LandXMLError(f"LandXML at line {root.sourceline} is version {ns[len(_OTHER_VERSIONS):]} (namespace "
                               f"{ns}); this program reads LandXML 1.2 ({NAMESPACE})")
        raise LandXMLError(f"LandXML at line {root.sourceline} has the namespace {ns or '(none)'}; a LandXML 1.2 file "
                           f"has {NAMESPACE}")
    version = root.get("version")
    if version is not None and version.strip() not in ("1.2", "1.20"):
        raise LandXMLError(f"LandXML at line {root.sourceline} says version=\"{version}\"; this program reads "
                           "LandXML 1.2")
    return root


def _units(root) -> tuple[str, float, str]:
    """(project unit system, metres per file unit, the unit's name) from the file's Units element."""
    units = _children(root, "Units")
    if not units:
        raise LandXMLError(f"LandXML at line {root.sourceline}: no Units element, so the length unit of the file is "
                           "unknown")
    for family, table in LINEAR_UNITS.items():
        found = _children(units[0], family)
        if found:
            el = found[0]
            name = el.get("linearUnit")
            if name is None:
                raise LandXMLError(f"{_where(el)}: the attribute linearUnit is missing")
            if name not in table:
                raise LandXMLError(f"{_where(el)}: linearUnit=\"{name}\" is not one this program reads "
                                   f"({', '.join(table)})")
            return PROJECT_UNITS[family], table[name], name
    raise LandXMLError(f"{_where(units[0])}: holds neither Metric nor Imperial")


@dataclass
class _Profile:
    name: str
    where: str
    points: list          # (station, elevation) [m], stations rising
    curves: int = 0


def _check_rising(points_with_elements, what: str, scale: float) -> None:
    """Stations [m] must rise; a refusal quotes them in the file's unit (``scale`` metres per unit)."""
    for (s0, _, _), (s1, _, el) in zip(points_with_elements, points_with_elements[1:]):
        if not s1 > s0:
            raise LandXMLError(f"{_where(el)}: {what} {s1 / scale:g} does not follow {s0 / scale:g}; stations must "
                               "rise")


def _prof_align(el, scale: float, spacing: float, report: ImportReport, label: str) -> _Profile | None:
    """The sampled invert of a ProfAlign [m], or None (skipped, with the reason in ``report``)."""
    items = []   # (station, elevation, element, curve length or None)
    for child in el:
        kind = _local(child)
        if kind in ("Feature",) or not isinstance(child.tag, str):
            continue
        if kind in ("UnsymParaCurve", "CircCurve"):
            report.skipped.append(f"{label}: {_where(child)} is a "
                                  f"{'circular' if kind == 'CircCurve' else 'non-symmetric parabolic'} vertical curve; "
                                  "only PVIs and symmetric parabolic curves (ParaCurve) are imported")
            return None
        if kind not in ("PVI", "ParaCurve"):
            report.skipped.append(f"{label}: {_where(child)} is not a PVI or a vertical curve; the profile is left out")
            return None
        values = _numbers(child)
        if len(values) != 2:
            what = "the elevation is missing" if len(values) == 1 else f"{len(values)} numbers"
            raise LandXMLError(f"{_where(child)}: needs \"station elevation\", got {what}")
        length = _attribute_number(child, "length", positive=True) * scale if kind == "ParaCurve" else None
        items.append((values[0] * scale, values[1] * scale, child, length))
    if len(items) < 2:
        raise LandXMLError(f"{_where(el)}: a profile needs at least two points, got {len(items)}")
    _check_rising([(s, z, e) for s, z, e, _ in items], "station", scale)
    # before any curve is sampled: a spacing a hair wide would take forever and all the memory
    if too_many := too_many_points(items[-1][0] - items[0][0], spacing):
        raise LandXMLError(f"{label}: along {_where(el)} the spacing {too_many} (use a larger --spacing)")
    for i, (s, z, child, length) in enumerate(items):
        if length is None:
            continue
        if i == 0 or i == len(items) - 1:
            raise LandXMLError(f"{_where(child)}: a vertical curve needs a grade on each side, so it cannot be the "
                               "first or last point of the profile")
        before = items[i - 1][0] + (items[i - 1][3] or 0) / 2
        after = items[i + 1][0] - (items[i + 1][3] or 0) / 2
        tol = 1e-9 * max(1.0, abs(s))
        if s - length / 2 < before - tol or s + length / 2 > after + tol:
            raise LandXMLError(f"{_where(child)}: the curve's length ({length / scale:g}) reaches beyond its "
                               "neighbouring PVI or overlaps the next curve")
    points = [(items[0][0], items[0][1])]
    for i in range(1, len(items)):
        s, z, _, length = items[i]
        if length is None:
            points.append((s, z))
            continue
        s0, z0 = items[i - 1][:2]
        s2, z2 = items[i + 1][:2]
        g1, g2 = (z - z0) / (s - s0), (z2 - z) / (s2 - s)
        a, b = s - length / 2, s + length / 2
        inside = [k * spacing for k in range(math.floor(a / spacing) + 1, math.ceil(b / spacing))
                  if a < k * spacing < b]
        for st in [a, *inside, b]:
            points.append((st, parabola_elevation(st, s, z, g1, g2, length)))
    # a curve's end that falls on a PVI is one point
    merged = [points[0]]
    for p in points[1:]:
        if p[0] - merged[-1][0] > 1e-9 * max(1.0, abs(p[0])):
            merged.append(p)
    curves = sum(1 for it in items if it[3] is not None)
    return _Profile(el.get("name") or "profile", _where(el), merged, curves)


def _one_point_list(el, first: str, needs: str, report: ImportReport, label: str):
    """The element's single PntList2D as (list element, pairs of `first`-elevation), or None when it has gaps
    (several lists: skipped and reported, since `needs`); no list at all is refused."""
    lists = _children(el, "PntList2D")
    if not lists:
        raise LandXMLError(f"{_where(el)}: holds no PntList2D of {first}-elevation pairs")
    if len(lists) > 1:
        report.skipped.append(f"{label}: {_where(el)} has gaps ({len(lists)} point lists); {needs}")
        return None
    return lists[0], _pairs(lists[0], first)


def _prof_surf(el, scale: float, report: ImportReport, label: str) -> _Profile | None:
    found = _one_point_list(el, "station", "a run needs one continuous invert", report, label)
    if found is None:
        return None
    plist, pairs = found
    if len(pairs) < 2:
        raise LandXMLError(f"{_where(plist)}: a profile needs at least two points, got {len(pairs)}")
    for (s0, _), (s1, _) in zip(pairs, pairs[1:]):
        if not s1 > s0:
            raise LandXMLError(f"{_where(plist)}: station {s1:g} does not follow {s0:g}; stations must rise")
    return _Profile(el.get("name") or "surface profile", _where(el),
                    [(s * scale, z * scale) for s, z in pairs])


@dataclass
class _Survey:
    station: float        # [m]
    where: str
    section: dict         # irregular, SI


def _cross_sections(alignment, scale: float, n: float, surface: str | None, report: ImportReport,
                    label: str, system: hu.UnitSystem) -> list:
    found = []
    for group in _children(alignment, "CrossSects"):
        for cs in _children(group, "CrossSect"):
            sta = _attribute_number(cs, "sta") * scale
            found.append((sta, cs))
    for (s0, _), (s1, cs) in zip(found, found[1:]):
        if not s1 > s0:
            raise LandXMLError(f"{_where(cs)}: sta {s1 / scale:g} does not follow {s0 / scale:g}; cross-sections "
                               "must be in rising station order")
    out = []
    for sta, cs in found:
        surfs = _children(cs, "CrossSectSurf")
        if surface is not None:
            surfs = [s for s in surfs if s.get("name") == surface]
        if not surfs:
            why = f"has no CrossSectSurf named \"{surface}\"" if surface else "has no CrossSectSurf"
            report.skipped.append(f"{label}: {_where(cs)} {why}")
            continue
        surf = surfs[0]
        found = _one_point_list(surf, "offset", "a surveyed section needs one continuous outline", report, label)
        if found is None:
            continue
        plist, pairs = found
        for (o0, _), (o1, _) in zip(pairs, pairs[1:]):
            if o1 < o0:
                raise LandXMLError(f"{_where(plist)}: offset {o1:g} follows {o0:g}; offsets must not decrease")
        section = {"shape": "irregular", "stations": [o * scale for o, _ in pairs],
                   "elevations": [z * scale for _, z in pairs], "n": n}
        try:
            hy.section_from_dict(section)
        except hy.InputError as exc:
            report.skipped.append(f"{label}: {_where(cs)} cannot be a surveyed ditch section: "
                                  f"{exc.in_units(system)}")
            continue
        if len(_children(cs, "CrossSectSurf")) > 1 and surface is None:
            others = [s.get("name") or "(unnamed)" for s in _children(cs, "CrossSectSurf")[1:]]
            report.notes.append(f"{label}: {_where(cs)} took its first surface \"{surf.get('name') or ''}\"; "
                                f"left out: {', '.join(others)} (choose with the surface option)")
        out.append(_Survey(sta, _where(cs), section))
    return out


def _unique(name: str, taken: set) -> str:
    out, k = name, 2
    while out in taken:
        out, k = f"{name} ({k})", k + 1
    taken.add(out)
    return out


def read_landxml(path, *, spacing: float | None = None, n: float | None = None,
                 surface: str | None = None) -> tuple[pj.Project, ImportReport]:
    """The project a LandXML 1.2 file makes, and the report of what was imported and skipped.

    Parameters
    ----------
    path : path of the file.
    spacing : float, optional
        Design-point spacing of the runs, in the file's unit system (ft or m; default 50 ft or 15 m); vertical curves
        are sampled at its whole multiples of station.
    n : float, optional
        Manning's n [-] put on every segment of the surveyed sections (default 0.030).
    surface : str, optional
        The name of the CrossSectSurf to take from each cross-section (default: the first one).

    Raises LandXMLError (naming the element and its line) for a file that cannot be read as a whole, or that gives no
    run at all.
    """
    root = parse(path)
    units, scale, unit_name = _units(root)
    system = hu.system(units)
    spacing_si = float(system.to_si("length", DEFAULT_SPACING[units] if spacing is None else spacing))
    if not (math.isfinite(spacing_si) and spacing_si > 0):
        raise LandXMLError(f"the spacing must be a number > 0, got {spacing}")
    n = DEFAULT_N if n is None else n
    if not (math.isfinite(n) and n > 0):
        raise LandXMLError(f"Manning's n must be a number > 0, got {n}")
    report = ImportReport()
    report.notes.append(f"lengths in the file are in {unit_name} ({'SI' if units == 'si' else 'US customary'} "
                        "units)")
    project_el = _children(root, "Project")
    name = (project_el[0].get("name") if project_el else None) or Path(path).stem
    runs, taken = [], set()
    alignments = [a for group in _children(root, "Alignments") for a in _children(group, "Alignment")]
    if not alignments:
        raise LandXMLError(f"LandXML at line {root.sourceline}: no Alignments/Alignment, so no profile to import")
    for al in alignments:
        label = _where(al)
        profiles = []
        for prof in _children(al, "Profile"):
            for child in prof:
                kind = _local(child)
                if kind == "ProfAlign":
                    p = _prof_align(child, scale, spacing_si, report, label)
                elif kind == "ProfSurf":
                    p = _prof_surf(child, scale, report, label)
                else:
                    continue
                if p is not None:
                    profiles.append(p)
        surveys = _cross_sections(al, scale, n, surface, report, label, system)
        if not profiles:
            report.skipped.append(f"{label}: no profile that can be a run's invert"
                                  + (f"; its {len(surveys)} cross-section(s) are left out too" if surveys else ""))
            continue
        for prof in profiles:
            runs.append(_run(prof, surveys, al.get("name") or "alignment", units, spacing_si, report, taken, label,
                             system))
    if not runs:
        raise LandXMLError(f"nothing to import from {Path(path).name}: "
                           + ("; ".join(report.skipped) or "no profile found"))
    report.notes.append("each run still needs its drainage sub-areas, the project's rainfall (IDF) and the linings it "
                        f"may use (it starts with {STARTING_CANDIDATE}) before it can be solved")
    project = pj.Project(name=name, units=units, channels=[new_channel(units)], runs=runs,
                         notes=f"Imported from the LandXML file {Path(path).name}.")
    return project, report


def _run(prof: _Profile, surveys: list, alignment: str, units: str, spacing: float, report: ImportReport,
         taken: set, label: str, system) -> pj.Run:
    first, last = prof.points[0][0], prof.points[-1][0]
    tol = 1e-6
    kept = []
    for sv in surveys:
        if first - tol <= sv.station <= last + tol:
            kept.append(sv)
        else:
            report.skipped.append(f"{label}: {sv.where} lies off the run \"{prof.name}\" "
                                  f"(stations {_shown(first, system)} to {_shown(last, system)})")
    sections = []
    if kept:
        bounds = [first] + [(a.station + b.station) / 2 for a, b in zip(kept, kept[1:])] + [last]
        for sv, a, b in zip(kept, bounds, bounds[1:]):
            if b - a <= tol:
                report.skipped.append(f"{label}: {sv.where} governs no length of the run \"{prof.name}\"")
                continue
            sections.append(pj.RunSection(from_station=a, to_station=b, section=sv.section, ditch_depth=None))
    if not sections:
        ch = new_channel(units)
        depth = float(system.to_si("length", STARTING_DITCH_DEPTH[units]))
        sections = [pj.RunSection(from_station=first, to_station=last, section=dict(ch.section), ditch_depth=depth)]
        report.notes.append(f"run \"{prof.name}\": no usable cross-section, so it starts with a trapezoid of a new "
                            f"channel, {STARTING_DITCH_DEPTH[units]:g} {system.label('length')} deep (replace it)")
    low_end = last if prof.points[-1][1] <= prof.points[0][1] else first
    run_name = _unique(f"{alignment} {prof.name}", taken)
    run = pj.Run(name=run_name, profile=[pj.ProfilePoint(s, z) for s, z in prof.points],
                 outfall=pj.Outfall(station=low_end), sections=sections,
                 candidates=[pj.RunCandidate(STARTING_CANDIDATE)], sub_areas=[], spacing=spacing,
                 notes=f"Invert from {prof.where} of the LandXML file.")
    curves = f", {prof.curves} vertical curve(s) sampled every {_shown(spacing, system)}" if prof.curves else ""
    surveyed = f"; {len(sections)} surveyed section(s)" if kept and sections[0].ditch_depth is None else ""
    report.imported.append(f"run \"{run_name}\" from {prof.where}: {len(prof.points)} invert points, stations "
                           f"{_shown(first, system)} to {_shown(last, system)}{curves}{surveyed}; outfall at the lower "
                           f"end, {_shown(low_end, system)}")
    return run


def _shown(value_si: float, system) -> str:
    return f"{float(system.from_si('length', value_si)):.3f} {system.label('length')}"


def import_landxml(path, out, **options) -> ImportReport:
    """Read the LandXML 1.2 file ``path`` and write the project to ``out`` atomically (only when all of it was read;
    see :func:`read_landxml` for ``options``). Returns the report."""
    project, report = read_landxml(path, **options)
    pj.Project.from_dict(project.to_dict())   # the schema's check before anything is written
    pj.save(project, out)
    return report
