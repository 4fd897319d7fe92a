"""Ditch inventories: read a CSV of reaches, check them all, write one result row per input row.

The computation is :mod:`hydraulics.many_reaches` (vectorised, SI). This package is
its edge, one module a job:

* :mod:`~app.inventory.reading`: the CSV text (pyarrow's CSV reader for a
  plain file, the csv module and Python's float for one with quotes, blank
  lines or ragged rows), screened, converted from the user's units to SI;
* :mod:`~app.inventory.checking`: the reaches through the core, chunk by
  chunk, and the checked inventory the desktop window shows
  (:func:`run_inventory`, :class:`BatchRun`);
* :mod:`~app.inventory.writing`: the results file, spreadsheet-safe and
  replaced atomically, and the table view's text (:func:`result_table`);
* :mod:`~app.inventory.reporting`: the rows in trouble, the summary for the
  terminal, and the lines of a GeoPackage inventory's reaches for its map;
* :mod:`~app.inventory.plots`: the summary plot and the map, drawn with
  matplotlib (a drawing front end: not exported here, so that this package
  loads no plotting library);
* :mod:`~app.inventory.layers`: a GeoPackage inventory (a layer of lines, read
  in blocks as the CSV is) and a results GeoPackage layer.
* :mod:`~app.inventory.plausibility`: whether the numbers look typed in the
  other unit system than the one chosen (a warning, nothing refused).

Input columns (all required in the header, blank where not relevant):
``id, shape, bottom_width, left_slope, right_slope, diameter, slope, flow,
lining, d50, n``. Lengths (bottom_width, diameter, d50) are in ft or m, flow
in ft^3/s or m^3/s, side slopes H:V, slope a ratio. Any other column is
carried through unchanged. The results file is the input with the columns
``normal_depth, critical_depth, velocity, froude, bed_shear,
permissible_shear, safety_factor, cost_per_length, verdict, reason`` added, in the same units,
one row per input row and in the same order.
"""

from .plausibility import MixedUnits, UnitsFinding, units_finding
from .checking import BatchRun, check_file, evaluate, run_inventory
from .reading import INPUT_COLUMNS, RESULT_COLUMNS, Inventory, InventoryError, parse_inventory, read_blocks, read_inventory
from .layers import LENGTH_COLUMN, is_geopackage, layer_names, read_layer_blocks
from .reporting import MAX_MESSAGES, PLOT_FORMATS, ReachLines, Tally, problem_rows, summary
from .writing import DIGITS, display_values, format_results, result_table, write_results, written_rows

__all__ = ["INPUT_COLUMNS", "RESULT_COLUMNS", "DIGITS", "MAX_MESSAGES", "PLOT_FORMATS", "Inventory", "InventoryError",
           "BatchRun", "Tally", "parse_inventory", "read_inventory", "read_blocks", "evaluate", "check_file", "run_inventory",
           "display_values", "format_results", "write_results", "written_rows", "result_table", "problem_rows",
           "summary", "MixedUnits", "UnitsFinding", "units_finding", "ReachLines", "is_geopackage", "layer_names",
           "read_layer_blocks", "LENGTH_COLUMN"]
