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


def plain_inventory_text(size: int) -> str:
    """A CSV inventory (invented) of ``size`` rows, each the same trapezoid with its own n, no quotes in it: the
    form the pyarrow reader takes whole."""
    head = "id,shape,bottom_width,left_slope,right_slope,diameter,slope,flow,lining,d50,n\n"
    return head + "".join(f"r{i},trapezoid,2,3,3,,0.004,{1 + i % 7},,,0.03\n" for i in range(size))


def written_both_ways(monkeypatch, result) -> tuple[str, str]:
    """The results file of :func:`plain_inventory_text` carrying ``result`` (a hydraulics.many_reaches.BatchResult
    of as many rows), as pyarrow writes it and as Python writes it."""
    from app import inventory as ai
    from app.inventory import reading

    text = plain_inventory_text(len(result))
    inventory = ai.parse_inventory(text, "us")
    assert isinstance(inventory.records, reading.Records)   # read by pyarrow, written from the file's own bytes
    by_arrow = ai.format_results(inventory, result)
    monkeypatch.setattr(reading, "pyarrow_modules", lambda: None)
    return by_arrow, ai.format_results(ai.parse_inventory(text, "us"), result)
