"""Changing a project's inputs without Qt: one input of a channel read or changed by its path, a starting section
for another shape, new channels and projects at round starting values, and the names of what is added or renamed.

The window's document (:class:`app.gui.document.ProjectDocument`) turns each
edit into an undoable command with these; they work on :mod:`app.project`
objects alone and leave the one given unchanged (each change is a copy).
"""

from __future__ import annotations

import copy

import hydraulics as hy

from . import project as pj


def with_value(channel: pj.Channel, path: str, value) -> pj.Channel:
    """A copy of ``channel`` with one input changed; ``path`` like "slope", "flow.value", "section.diameter"."""
    out = copy.deepcopy(channel)
    head, _, rest = path.partition(".")
    if head == "section" and rest:
        out.section[rest] = value
    elif head == "flow" and rest:
        setattr(out.flow, rest, value)
    elif head == "lining" and rest:
        if out.lining is None:
            raise KeyError(f"{path!r}: the channel has no lining")
        setattr(out.lining, rest, value)
    elif rest:
        raise KeyError(f"unknown input {path!r}")
    else:
        if not hasattr(out, head):
            raise KeyError(f"unknown input {path!r}")
        setattr(out, head, copy.deepcopy(value))
    return out


def value_at(channel: pj.Channel, path: str):
    head, _, rest = path.partition(".")
    if head == "section" and rest:
        return channel.section.get(rest)
    if head == "flow" and rest:
        return getattr(channel.flow, rest)
    if head == "lining" and rest:
        return None if channel.lining is None else getattr(channel.lining, rest)
    return getattr(channel, head)


def segment_n(section: dict) -> list:
    """The n of each segment of a surveyed section (a project file may give one n for them all)."""
    ns = section["n"]
    return list(ns) if isinstance(ns, (list, tuple)) else [float(ns)] * (len(section["stations"]) - 1)


def section_for_shape(channel: pj.Channel, shape: str) -> tuple[dict, float | None]:
    """A starting section of ``shape`` that resembles the channel's present one, and the n to use with it.

    Widths and slopes carry over where the shapes share them. A surveyed
    (irregular) section starts from the present outline, with the channel's n
    on every segment; leaving it takes the first segment's n.
    """
    old = channel.section
    n = channel.manning_n
    b = old.get("bottom_width") or old.get("top_width") or old.get("diameter") or 1.0
    z1 = old.get("left_slope", 2.0) or 2.0
    z2 = old.get("right_slope", z1) or z1
    if old.get("shape") == "irregular":
        n = segment_n(old)[0] if old.get("n") is not None else 0.030
        xs = old["stations"]
        b = max(0.5, (xs[-1] - xs[0]) / 3)
    if shape == "trapezoid":
        sec = {"shape": shape, "bottom_width": b, "left_slope": z1, "right_slope": z2}
    elif shape == "triangle":
        sec = {"shape": shape, "left_slope": z1, "right_slope": z2}
    elif shape == "rectangle":
        sec = {"shape": shape, "bottom_width": b}
    elif shape == "parabola":
        sec = {"shape": shape, "top_width": max(b, 1.0) * 2, "at_depth": 0.5}
    elif shape == "circle":
        sec = {"shape": shape, "diameter": max(0.3, min(b, 3.0))}
    elif shape == "irregular":
        depth = 1.0
        try:
            current = hy.section_from_dict(old)
            depth = current.full_depth or 1.0
            if current.kind != "irregular" and current.full_depth is None:
                depth = 1.0
            x, z = current.outline(depth)
        except hy.InputError:
            x, z = hy.Trapezoid(bottom_width=1.0, side_slope=2.0).outline(depth)
        if old.get("shape") == "circle":
            # A pipe is not a surveyed ditch: start from a plain trapezoid of similar size.
            x, z = hy.Trapezoid(bottom_width=b / 2, side_slope=2.0).outline(b / 2)
        x = [round(float(v) - float(x[0]), 4) for v in x]
        z = [round(float(v), 4) for v in z]
        seg_n = n if n is not None else 0.030
        sec = {"shape": shape, "stations": x, "elevations": z, "n": [seg_n] * (len(x) - 1)}
        return sec, None
    else:
        raise KeyError(f"unknown shape {shape!r}")
    return sec, (n if n is not None else 0.030)


#: Round starting values of a new channel in each unit system's own units: (input path, quantity, US, SI).
#: A US project starts at 20 ft^3/s and 2 ft, not at 0.5 m^3/s shown as 17.657 ft^3/s. Typical sizes of a
#: small grassed roadside ditch (common practice); the freeboard is the 0.5 ft / 0.15 m minimum of the README.
STARTING_VALUES = (
    ("flow.value", "flow", 20.0, 0.5),
    ("slope", "slope", 0.005, 0.005),
    ("section.bottom_width", "length", 2.0, 0.6),
    ("section.left_slope", "", 3.0, 3.0),
    ("section.right_slope", "", 3.0, 3.0),
    ("manning_n", "", 0.030, 0.030),
    ("min_freeboard", "length", 0.5, 0.15),
)


def numbered(base: str, taken) -> str:
    """``base``, or "base (2)", "base (3)"... the first not in ``taken`` (names of channels, runs, sub-areas)."""
    name, k = base, 2
    while name in taken:
        name = f"{base} ({k})"
        k += 1
    return name


def named_copies(items: list, taken: set, blank: str) -> list:
    """Copies of ``items`` (channels or runs), each named apart from ``taken`` and from each other ("name (2)");
    a blank name becomes ``blank``. ``taken`` gains the names given."""
    out = []
    for item in items:
        item = copy.deepcopy(item)
        item.name = numbered(item.name.strip() or blank, taken)
        taken.add(item.name)
        out.append(item)
    return out


def new_name(base: str, taken) -> str:
    """The name of a channel the user adds or duplicates: ``base`` where it is free, else "base 1", "base 2"...
    the first not in ``taken``; "Ditch", the name of a new channel, always gets its number."""
    if base not in taken and base != "Ditch":
        return base
    k = 1
    while f"{base} {k}" in taken:
        k += 1
    return f"{base} {k}"


def name_refusal(name: str, others, what: str) -> str | None:
    """Why ``name`` (stripped) cannot name a ``what`` ("channel", "ditch run") beside ``others`` (the names of
    the rest), or None when it can."""
    name = name.strip()
    if not name:
        return f"A {what} needs a name."
    if name in others:
        return f"Another {what} is already called '{name}'."
    return None


def new_channel(units: str = "us", name: str = "Ditch 1") -> pj.Channel:
    """A new trapezoidal channel with the round starting values of the unit system ``units`` (stored in SI)."""
    system = hy.units.system(units)
    ch = pj.Channel(name=name)
    for path, quantity, us, si in STARTING_VALUES:
        shown = us if units == "us" else si
        ch = with_value(ch, path, float(system.to_si(quantity, shown)) if quantity else shown)
    return ch


def new_project(units: str = "us") -> pj.Project:
    """A fresh project in ``units`` with one channel at that unit system's round starting values."""
    return pj.Project(units=units, channels=[new_channel(units)])
