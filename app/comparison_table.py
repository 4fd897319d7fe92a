"""The lining comparison as every front end shows it: one table, in the user's units, rounded once. No Qt here.

The same channel and flow with several linings (:func:`hydraulics.lining_comparison.compare_linings`,
the rows of ``ChannelDesign.comparison`` or of the window's comparison) becomes
one :class:`ComparisonTable`: its columns are :data:`app.results.COMPARISON_FIELDS`
(key, label, quantity, decimals), each lining is named as in the window's lining
list (:func:`app.lining_names.lining_label`), its verdict is a word of the one
vocabulary (:mod:`app.verdicts`), every number is in the context's units and
rounded by the one rule (:func:`app.results.rounded`), and a cost is money per
length with its cents and thousands grouped. The window, the design sheet and
``ditchwright compare`` only lay this table out; ``compare --json`` gives the
same rows unrounded.

The window passes its locale's decimal mark and group separator; the sheet,
the files and the command line keep '.' and ','.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from hydraulics.units import UnitSystem
from hydraulics.wording import in_units

from .context import Context
from .lining_names import lining_label
from .results import COMPARISON_EXTRA_FIELDS, COMPARISON_FIELDS, ResultField, convert, quantity_text, rounded
from .verdicts import Verdict, row_verdict

__all__ = ["ComparisonTable", "ComparisonTableRow", "comparison_table", "EMPTY"]

#: What a cell shows where a value does not apply (a lining with no solution, no price, no safety factor).
EMPTY = "\u2014"
_FIELDS = {f.key: f for f in (*COMPARISON_FIELDS, *COMPARISON_EXTRA_FIELDS)}


@dataclass(frozen=True)
class ComparisonTableRow:
    """One lining: its name and verdict, every value in the units shown (``values``: numbers, words or None) and
    as text by the one rounding rule (``cells``, :data:`EMPTY` where nothing applies)."""

    key: str                  # catalogue key
    d50: float | None         # the stone size the row was computed with [m], stone only
    name: str                 # as in the window's lining list, with the stone size used
    verdict: Verdict
    values: dict
    cells: dict
    error: str | None = None  # why the lining has no solution, in words, in the units shown
    core: object = field(default=None, repr=False, compare=False)   # a hydraulics.lining_comparison.ComparisonRow


@dataclass(frozen=True)
class ComparisonTable:
    """Columns (:data:`app.results.COMPARISON_FIELDS`) and one row per lining, in the order compared."""

    units: UnitSystem
    rows: tuple
    columns: tuple = COMPARISON_FIELDS

    @property
    def priced(self) -> bool:
        """Whether any lining compared has a unit cost (else a front end may leave the cost column out)."""
        return any(r.values["cost_per_length"] is not None for r in self.rows)

    def unit(self, f: ResultField) -> str:
        """The unit of a column in the table's units ('' for pure numbers and words)."""
        return self.units.label(f.quantity) if f.quantity else ""

    def heading(self, f: ResultField, brackets: str = "[]") -> str:
        """'Depth [m]': the column's label with its unit in ``brackets`` (the command line uses '()')."""
        unit = self.unit(f)
        return f"{f.label} {brackets[0]}{unit}{brackets[1]}" if unit else f.label

    def body(self) -> list[list[str]]:
        """The cells of every row in column order."""
        return [[r.cells[f.key] for f in self.columns] for r in self.rows]


def _value(row, key: str, units: UnitSystem):
    v = getattr(row, key, None)
    if v is None or isinstance(v, str):
        return v
    f = _FIELDS[key]
    return float(convert(v, f.quantity, units)) if f.quantity else float(v)


def _name(row, context: Context, decimal_mark: str) -> str:
    entry = context.catalogue.linings.get(row.key)
    if entry is None:       # a key the context's catalogue does not hold: the row's own name
        return row.name
    return lining_label(entry, context.units, d50=row.d50, name=row.name, decimal_mark=decimal_mark)


def comparison_table(rows, context: Context, full_depth: float | None = None, decimal_mark: str = ".",
                     group_mark: str = ",") -> ComparisonTable:
    """The comparison table of ``rows`` (:class:`hydraulics.lining_comparison.ComparisonRow`, SI) in
    ``context.units``.

    ``full_depth`` [m] is the section's full depth, where it has one: a lining
    whose water plus freeboard reaches above it is "Too shallow", as in the
    window's verdict. ``decimal_mark`` and ``group_mark`` are the window's
    (its locale's); every other front end keeps the defaults.
    """
    units = context.units
    out = []
    for row in rows:
        verdict = row_verdict(row, full_depth)
        values = {key: _value(row, key, units) for key in _FIELDS}
        values["lining"] = _name(row, context, decimal_mark)
        values["verdict"] = verdict.words
        values["governs"] = row.governs
        if values["permissible_shear"] is None and row.verdict == "non-erodible":
            values["permissible_shear"] = "non-erodible"
        cells = {}
        for key, f in _FIELDS.items():
            v = values[key]
            if v is None:
                cells[key] = EMPTY
            elif key == "cost_per_length":
                cells[key] = quantity_text(v, f, decimal_mark, group_mark)
            else:
                cells[key] = rounded(v, f, decimal_mark)
        out.append(ComparisonTableRow(row.key, row.d50, values["lining"], verdict, values, cells,
                                      None if row.error is None else in_units(row.error, units), row))
    return ComparisonTable(units, tuple(out))
