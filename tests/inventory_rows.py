"""Invented inventory rows for the batch tests (random but reproducible), and the section a row describes."""

import hydraulics as hy
from hydraulics.units import SI

SHAPES = ("trapezoid", "triangle", "rectangle", "circle")


def shape_fields(kind, bottom_width, left_slope, right_slope, diameter) -> dict:
    """The dimension fields (text) a row of ``kind`` fills in; each argument is called only if it is needed,
    so that a generator draws the same random numbers as before for the same seed."""
    out = {}
    if kind in ("trapezoid", "rectangle"):
        out["bottom_width"] = bottom_width()
    if kind in ("trapezoid", "triangle"):
        out["left_slope"] = left_slope()
        out["right_slope"] = right_slope()
    if kind == "circle":
        out["diameter"] = diameter()
    return out


def section_of(row, system=SI) -> hy.Section:
    """The core's section for an inventory row whose lengths are in ``system``."""
    length = lambda k: system.to_si("length", float(row[k]))  # noqa: E731
    kind = row["shape"]
    if kind == "trapezoid":
        return hy.Trapezoid(bottom_width=length("bottom_width"), left_slope=float(row["left_slope"]),
                            right_slope=float(row["right_slope"]))
    if kind == "triangle":
        return hy.Triangle(left_slope=float(row["left_slope"]), right_slope=float(row["right_slope"]))
    if kind == "rectangle":
        return hy.Rectangle(bottom_width=length("bottom_width"))
    return hy.Circle(diameter=length("diameter"))
