"""The result quantities a user reads, with their labels and physical quantity, and the one rounding rule.

One list serves the command line, the desktop window and the design sheet, so
a value carries the same name and unit everywhere.

Numbers become text in one home per job:

* here, every value a table, panel or list shows: :func:`rounded` and :func:`format_value` to the decimals of its
  :class:`ResultField`, :func:`quantity_text` and :func:`money_text` with thousands grouped, :func:`grade_text`;
* :mod:`hydraulics.wording`, a quantity inside a sentence (warnings, reasons, notes): three significant figures
  (:func:`hydraulics.wording.significant`), a rough size in a name to whole units, a station to hundredths; the
  sheet's echoed inputs and hand check use the same function with more figures;
* ``app.gui.fields.format_number``, the text of an editable field: up to five significant figures in the user's
  decimal mark, so that what a field shows reads back as the number it holds (not a result's rounding);
* :mod:`app.numtext`, the numbers of a results file (``%g`` to a given number of significant figures, on whole
  arrays at once), which a spreadsheet reads back rather than a person.
"""

from __future__ import annotations

from dataclasses import dataclass

from hydraulics.units import UnitSystem


@dataclass(frozen=True)
class ResultField:
    key: str        # JSON key and attribute of hydraulics.ChannelResult
    label: str      # what the user reads
    quantity: str   # hydraulics.units quantity ("length", "flow", ...) or "" for pure numbers/words
    digits: int     # significant decimals shown in the chosen units


CHANNEL_FIELDS = (
    ResultField("normal_depth", "Normal depth", "length", 3),
    ResultField("critical_depth", "Critical depth", "length", 3),
    ResultField("velocity", "Velocity", "velocity", 2),
    ResultField("froude", "Froude number", "", 2),
    ResultField("regime", "Flow regime", "", 0),
    ResultField("area", "Flow area", "area", 3),
    ResultField("wetted_perimeter", "Wetted perimeter", "length", 3),
    ResultField("top_width", "Top width of flow", "length", 3),
    ResultField("hydraulic_radius", "Hydraulic radius", "length", 3),
    ResultField("hydraulic_depth", "Hydraulic depth", "length", 3),
    ResultField("critical_slope", "Critical slope", "slope", 5),
    ResultField("specific_energy", "Specific energy", "length", 3),
    ResultField("bed_shear", "Bed shear (gamma y S)", "shear", 2),
    ResultField("manning_n", "Manning's n", "", 4),
)


_BY_KEY = {f.key: f for f in CHANNEL_FIELDS}
#: The values of one channel's design as a front end lists them (the window's results panel, the sheet's results
#: and depth blocks), in reading order: each with its label, quantity and decimals, the one rounding of each value.
PANEL_FIELDS = (
    ResultField("flow", "Design flow", "flow", 3),
    _BY_KEY["normal_depth"],
    _BY_KEY["critical_depth"],
    _BY_KEY["velocity"],
    _BY_KEY["froude"],
    _BY_KEY["regime"],
    _BY_KEY["area"],
    _BY_KEY["top_width"],
    _BY_KEY["hydraulic_radius"],
    _BY_KEY["specific_energy"],
    _BY_KEY["critical_slope"],
    _BY_KEY["manning_n"],
    ResultField("bed_shear", "Design shear, bed", "shear", 2),
    ResultField("side_shear", "Design shear, side slopes", "shear", 2),
    ResultField("bend_shear", "Design shear, bend", "shear", 2),
    ResultField("permissible_shear", "Permissible shear", "shear", 2),
    ResultField("safety_factor", "Safety factor", "", 2),
    ResultField("required_d50", "Smallest stable D50", "small_length", 1),
    ResultField("layer_thickness", "Lining thickness", "small_length", 1),
    ResultField("bend_protection_length", "Protect below the bend", "length", 1),
    ResultField("freeboard", "Freeboard", "length", 3),
    ResultField("total_depth", "Depth with freeboard", "length", 3),
    ResultField("top_width_at_top", "Width at top of ditch", "length", 2),
    ResultField("lined_width", "Lined width", "length", 2),
    ResultField("layer_volume", "Layer volume", "volume_per_length", 3),
    ResultField("cost_per_length", "Cost", "cost_per_length", 2),
)


#: Values of a channel's design that the results panel does not list but the sheet and ``calc`` print beside
#: another: the bend's factor Kb (to thousandths, as the core's own check words it), the bottom width that
#: ``calc --find bottom-width`` finds (as a depth), and the time of concentration of the rational method (the
#: window's form and the sheet). A superelevation is worded as a sentence's quantity instead
#: (three significant figures, :func:`hydraulics.wording.format_quantity`), so that a few millimetres keep their size.
EXTRA_FIELDS = {f.key: f for f in (
    ResultField("bend_factor", "Bend factor Kb", "", 3),
    ResultField("bottom_width", "Bottom width found", "length", 3),
    ResultField("time_of_concentration", "Time of concentration", "duration", 1),   # as the run's station table
)}


def panel_field(key: str) -> ResultField:
    """The one definition of a value of a channel's design: of :data:`PANEL_FIELDS`, else of :data:`EXTRA_FIELDS`
    (KeyError names the keys there are)."""
    for f in PANEL_FIELDS:
        if f.key == key:
            return f
    if key in EXTRA_FIELDS:
        return EXTRA_FIELDS[key]
    raise KeyError(f"no result field {key!r}; there are: {', '.join([f.key for f in PANEL_FIELDS] + list(EXTRA_FIELDS))}")


#: What a column of an inventory is called in a table, in words (the file's own name is the column's key).
INVENTORY_WORDS = {
    "id": "Id", "shape": "Shape", "bottom_width": "Bottom width", "left_slope": "Left side slope",
    "right_slope": "Right side slope", "diameter": "Diameter", "slope": "Slope", "flow": "Flow", "lining": "Lining",
    "d50": "D50", "n": "Manning's n", "normal_depth": "Normal depth", "critical_depth": "Critical depth",
    "velocity": "Velocity", "froude": "Froude number", "bed_shear": "Design shear, bed",
    # the batch's permissible shear is the bed's (hydraulics.many_reaches); its safety factor is the governing check's
    "permissible_shear": "Permissible shear, bed", "safety_factor": "Safety factor",
    "cost_per_length": "Cost", "verdict": "Verdict", "reason": "Reason",
}


def convert(value, quantity: str, units: UnitSystem):
    """SI value -> the user's units (words and pure numbers pass through)."""
    if quantity in ("", "slope") or isinstance(value, str) or value is None:
        return value
    return units.from_si(quantity, value)


def marked(text: str, decimal_mark: str = ".", group_mark: str = ",") -> str:
    """A number written with '.' as its decimal mark and ',' between groups of thousands, rewritten with the
    given marks (the window's, from the user's locale; the sheet, files and command line keep the defaults)."""
    if decimal_mark == "." and group_mark == ",":
        return text
    return "".join(decimal_mark if c == "." else group_mark if c == "," else c for c in text)


def format_value(value, field: ResultField, units: UnitSystem, decimal_mark: str = ".") -> str:
    """A number in the user's units with its unit as a suffix, e.g. '1.234 ft' (with ``decimal_mark`` ','
    '1,234 ft')."""
    v = convert(value, field.quantity, units)
    if isinstance(v, str):
        return v
    unit = units.label(field.quantity) if field.quantity else ""
    text = marked(f"{v:.{field.digits}f}", decimal_mark)
    return f"{text} {unit}".rstrip()


def rounded(value, field: ResultField, decimal_mark: str = ".") -> str:
    """The one rounding rule of the tables: a number already in the user's units to ``field.digits`` decimals,
    True/False as yes/no, nothing as an empty cell, words as they are. ``decimal_mark`` is the window's (the
    user's locale); everything written to a file or printed keeps '.'."""
    if value is None:
        return ""
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, str):
        return value
    return marked(f"{float(value):.{field.digits}f}", decimal_mark)


#: The station table of a ditch run: key (JSON and CSV column), label, quantity, decimals shown.
RUN_STATION_FIELDS = {f.key: f for f in (
    ResultField("station", "Station", "length", 2),
    ResultField("invert", "Invert", "length", 2),
    ResultField("slope", "Grade", "slope", 4),
    ResultField("ca", "Sum of C A", "drainage_area", 3),
    ResultField("tc", "Time of concentration", "duration", 1),
    ResultField("intensity", "Intensity", "intensity", 2),
    ResultField("flow", "Design flow", "flow", 3),
    ResultField("ditch_depth", "Ditch depth as built", "length", 2),
    ResultField("manning_n", "Manning's n", "", 4),
    ResultField("normal_depth", "Normal depth", "length", 3),
    ResultField("critical_depth", "Critical depth", "length", 3),
    ResultField("water_depth", "Water depth", "length", 3),
    ResultField("water_surface", "Water surface", "length", 2),
    ResultField("profile_type", "Profile type", "", 0),
    ResultField("velocity", "Velocity", "velocity", 2),
    ResultField("froude", "Froude number", "", 2),
    ResultField("regime", "Flow regime", "", 0),
    ResultField("bed_shear", "Bed shear", "shear", 2),
    ResultField("side_shear", "Side shear", "shear", 2),
    ResultField("permissible_shear", "Permissible shear", "shear", 2),
    ResultField("safety_factor", "Safety factor", "", 2),
    ResultField("lining", "Lining", "", 0),
    ResultField("stable", "Stable", "", 0),
    ResultField("freeboard", "Freeboard", "length", 2),
    ResultField("fits", "Fits the ditch", "", 0),
    ResultField("overtopped", "Overtopped", "", 0),
    ResultField("required_d50", "Smallest stable D50", "small_length", 1),
)}


def grade_text(ratio: float, decimal_mark: str = ".") -> str:
    """A grade as a percentage to the precision of the station table's grade (a ratio to 4 decimals, so per cent to
    2): 0.006 -> '0.60 %'."""
    digits = RUN_STATION_FIELDS["slope"].digits - 2
    return marked(f"{100 * float(ratio):.{digits}f}", decimal_mark) + " %"


def table_field(key: str) -> ResultField | None:
    """The one definition (label, quantity, decimals) of a result quantity shown in a table, wherever it is shown:
    the results panel's, else the station table's; None for a key with neither."""
    for f in CHANNEL_FIELDS:
        if f.key == key:
            return f
    return RUN_STATION_FIELDS.get(key)


#: The lining schedule of a ditch run and the tables beside it: key, label, quantity, decimals shown.
RUN_TABLE_FIELDS = {f.key: f for f in (
    ResultField("length", "Length", "length", 2),
    ResultField("amount", "Quantity", "", 1),
    ResultField("area", "Area", "drainage_area", 3),
    ResultField("runoff_coefficient", "Runoff coefficient C", "", 2),
    ResultField("time_of_concentration", "Own time of concentration", "duration", 1),
    ResultField("flow", "Flow", "flow", 3),
    ResultField("duration", "Duration", "duration", 0),
    ResultField("intensity", "Intensity", "intensity", 2),
    ResultField("return_period", "Return period", "", 0),
    ResultField("unit_cost", "Unit cost", "", 2),
    ResultField("coefficient", "Coefficient", "", 4),
)}


#: A reach's length that the program measured on its line in a GeoPackage layer without a length column
#: (:mod:`app.inventory.layers`), rounded as the run's tables round a length; a length column of the file itself is
#: shown as written.
MEASURED_LENGTH = ResultField("length", "Measured length", "length", RUN_TABLE_FIELDS["length"].digits)


def quantity_text(value: float, field: ResultField, decimal_mark: str = ".", group_mark: str = ",") -> str:
    """A quantity of work in the user's units with thousands grouped, to ``field.digits`` decimals: '2,258.3'."""
    return marked(f"{float(value):,.{field.digits}f}", decimal_mark, group_mark)


def money_text(value: float, digits: int = 0, decimal_mark: str = ".", group_mark: str = ",") -> str:
    """A cost as the tables print it: '$ 54,544' (whole dollars; ``digits`` decimals for a unit price,
    '$ 473.20'), or 'no price' for a missing one (NaN or None)."""
    if value is None or value != value:
        return "no price"
    return "$ " + marked(f"{float(value):,.{digits}f}", decimal_mark, group_mark)


#: The lining comparison (the same channel and flow with several linings), in the order the window lists them:
#: key (attribute of hydraulics.lining_comparison.ComparisonRow, JSON key of ``compare --json``), label, quantity,
#: decimals.
#: The decimals are those of the same quantity in the results panel (CHANNEL_FIELDS and the panel's rows).
COMPARISON_FIELDS = (
    ResultField("lining", "Lining", "", 0),
    ResultField("depth", "Depth", "length", 3),
    ResultField("velocity", "Velocity", "velocity", 2),
    ResultField("froude", "Froude number", "", 2),
    ResultField("manning_n", "Manning's n", "", 4),
    ResultField("design_shear", "Design shear", "shear", 2),
    ResultField("permissible_shear", "Permissible shear", "shear", 2),
    ResultField("safety_factor", "Safety factor", "", 2),
    ResultField("verdict", "Verdict", "", 0),
    ResultField("governs", "Governs", "", 0),
    ResultField("total_depth", "Total depth", "length", 3),
    ResultField("lined_width", "Lined width", "length", 2),
    ResultField("layer_volume", "Layer volume", "volume_per_length", 3),
    ResultField("cost_per_length", "Cost", "cost_per_length", 2),
)
#: Values of a comparison row that no column shows but a front end words beside another (the sheet's
#: "SF / required" and "needs D50 >= ..."): the same decimals as the results panel.
COMPARISON_EXTRA_FIELDS = (
    ResultField("d50", "D50", "small_length", 1),
    ResultField("required_safety_factor", "Required safety factor", "", 2),
    ResultField("required_d50", "Smallest stable D50", "small_length", 1),
)
