"""Checking an inventory: its reaches through the vectorised core, and the checked inventory the window shows.

The computation is :func:`hydraulics.many_reaches.evaluate` (vectorised, SI; the
reasons quote the inventory's units). :func:`check_file` reads, checks and
writes a file block by block; :func:`run_inventory` checks a whole file for the window.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from hydraulics import many_reaches as mr

from . import layers, writing
from .plausibility import MixedUnits, units_finding
from .reading import BLOCK_ROWS, INPUT_COLUMNS, Inventory, InventoryError, csv_fields, read_blocks, read_inventory
from .reporting import ReachLines, Tally, problem_rows, summary
from .writing import result_table


def evaluate(inventory: Inventory, progress=None, *, catalogue) -> mr.BatchResult:
    """Check every reach of ``inventory`` (results SI; reasons quote the inventory's units).

    ``catalogue`` is the lining catalogue the ``lining`` column refers to: the front end's (the shipped one with
    the user's file laid over it, ``app.context.Context.catalogue``); required, never defaulted.
    """
    return mr.evaluate(inventory.reaches, display=inventory.units, progress=progress, catalogue=catalogue)


def check_file(source, target, units: str = "us", progress=None, *, catalogue, rows: int = BLOCK_ROWS,
               problems: int = 0, layer: str | None = None, units_checked: bool = False) -> Tally:
    """Read, check and write the inventory file ``source`` block by block (``rows`` reaches a block, see
    :func:`app.inventory.reading.read_blocks`) into the results file ``target``; returns the :class:`Tally` of
    the file (its first ``problems`` problem rows kept for listing).

    Either file may be a CSV file or a GeoPackage (by its suffix, see :mod:`app.inventory.layers`); ``layer``
    names the layer of a GeoPackage inventory (default: its only one). A GeoPackage inventory's tally keeps its
    reaches' lines for the map (:attr:`Tally.lines`).

    Memory holds a few blocks and the tally, whatever the number of rows. The results file is byte for byte that
    of :func:`write_results` for the whole file checked at once; it replaces ``target`` only when every block is
    written (a file that turns out unreadable half way, or a full disk, leaves the old one). ``progress(done, total)`` is called
    after each block with the bytes of the file read so far and its size (features for a GeoPackage).

    An inventory whose columns disagree on their unit system (a ``mixed`` finding of
    :func:`app.inventory.plausibility.units_finding` on the first block) is refused with :class:`MixedUnits`
    before anything is written, unless ``units_checked`` says the user has checked them.

    Raises InventoryError (the file cannot be read as an inventory; before anything is written where the first
    block shows it), MixedUnits, InputError (unknown units) or OSError (writing).
    """
    if layers.is_geopackage(source):
        rows = min(rows, layers.BLOCK_FEATURES)
    blocks = _blocks(source, units, rows, layer)
    inventory = next(blocks)
    found = inventory.layer
    size = (found.features if found is not None else Path(source).stat().st_size) if progress is not None else 0
    tally = Tally(inventory.source, inventory.units, problems)
    tally.units_finding = units_finding(inventory)       # the first block (up to ``rows`` reaches) tells
    if tally.units_finding is not None and tally.units_finding.mixed and not units_checked:
        raise MixedUnits(tally.units_finding.text)
    if found is not None:
        tally.lines, tally.row_word = ReachLines(found, inventory.units), "feature"
    # The core checks each block in chunks of mr.CHUNK reaches, as it checks a whole file: the notes about groups of
    # reaches (a relation's range over a chunk) are those of the whole file where the blocks are whole chunks (the
    # default BLOCK_ROWS is one).
    if layers.is_geopackage(target):
        stream = layers.layer_stream(target, found, found.name if found is not None else Path(source).stem)
    else:
        stream = writing.results_stream(target)
    with stream as write:
        while inventory is not None:
            result = mr.evaluate(inventory.reaches, display=inventory.units, catalogue=catalogue)
            write(inventory, result)
            tally.add(inventory, result)
            if progress is not None:
                progress(min(size, inventory.end), size)
            inventory = next(blocks, None)
    tally.id_at = lambda row: _id_at(source, units, rows, row, layer)
    return tally


def _blocks(source, units, rows, layer):
    """The blocks of the inventory file ``source``: a GeoPackage's layer or a CSV file's rows."""
    if layers.is_geopackage(source):
        return layers.read_layer_blocks(source, units, rows, layer)
    if layer is not None:
        raise InventoryError(f"{source}: a CSV inventory has no layers (a layer is chosen in a GeoPackage, .gpkg)")
    return read_blocks(source, units, rows)


def _id_at(source, units, rows, row: int, layer=None) -> str:
    """The id of record ``row`` of the inventory file ``source`` read by :func:`check_file` (read again)."""
    for inventory in _blocks(source, units, rows, layer):
        if row < len(inventory):
            return inventory.id_at(row)
        row -= len(inventory)
    raise IndexError(row)


@dataclass
class BatchRun:
    """An inventory with its results, for the desktop window."""

    inventory: Inventory
    result: mr.BatchResult

    def table(self):
        """(columns, rows) of text; see :func:`result_table`."""
        return result_table(self.inventory, self.result)

    def problems(self):
        return problem_rows(self.inventory, self.result)

    def summary(self) -> str:
        return summary(self.inventory, self.result)

    def select(self, verdicts=None, warnings=None, text: str = "") -> np.ndarray:
        """Row indices for a filtered view: any of ``verdicts`` (None: all), carrying any of
        ``warnings`` (keys of hydraulics.many_reaches.WARNINGS; None: no condition), and ``text``
        found (case-insensitively) in the row's id or reason."""
        keep = np.ones(len(self.inventory), dtype=bool)
        if verdicts is not None:
            keep &= np.isin(self.result.verdict.astype(str), list(verdicts))
        if warnings is not None:
            flagged = np.zeros(len(keep), dtype=bool)
            for key in warnings:
                flagged |= self.result.flags[key]
            keep &= flagged
        if text:
            needle = text.lower()
            keep &= np.array([needle in i.lower() or needle in r.lower()
                              for i, r in zip(self.inventory.ids, self.result.reason.tolist())], dtype=bool)
        return np.flatnonzero(keep)

    def to_channels(self, rows=None):
        """Project channels (app.project.Channel, SI) for the reaches ``rows`` (default: all).

        Returns (channels, skipped): a reach whose row is invalid is not turned
        into a channel but listed in ``skipped`` as (line, id, reason). The
        other columns of the row go into the channel's notes.
        """
        from ..project import Channel, FlowBasis, LiningChoice

        inv, res, r = self.inventory, self.result, self.inventory.reaches
        rows = range(len(inv)) if rows is None else [int(i) for i in rows]
        extra = [(j, name) for j, name in enumerate(inv.header) if name not in INPUT_COLUMNS]
        channels, skipped = [], []
        value = lambda a, i: None if math.isnan(a[i]) else float(a[i])  # noqa: E731
        for i in rows:
            if res.verdict[i] == "invalid":
                skipped.append((int(inv.lines[i]), inv.id_at(i), res.reason[i]))
                continue
            kind = r.shape[i]
            section = {"shape": kind}
            for name in {"trapezoid": ("bottom_width", "left_slope", "right_slope"),
                         "triangle": ("left_slope", "right_slope"), "rectangle": ("bottom_width",),
                         "circle": ("diameter",)}[kind]:
                section[name] = value(getattr(r, name), i)
            lining = LiningChoice(r.lining[i], value(r.d50, i) or None) if r.lining[i] else None
            fields = csv_fields(inv.rows[i]) if extra else []
            notes = "; ".join(f"{name}: {fields[j]}" for j, name in extra if j < len(fields) and fields[j])
            channels.append(Channel(name=inv.id_at(i) or f"{inv.row_word} {inv.lines[i]}",
                                    flow=FlowBasis("typed", float(r.flow[i])), slope=float(r.slope[i]),
                                    section=section, lining=lining,
                                    manning_n=value(r.n, i), notes=notes))
        return channels, skipped


#: Features the window reads of a GeoPackage layer in one piece: all a table in a window can usefully show.
WINDOW_FEATURES = 10_000_000


def run_inventory(path, units: str = "us", progress=None, *, catalogue, layer: str | None = None) -> BatchRun:
    """Read and check the inventory at ``path`` (a CSV file, or ``layer`` of a GeoPackage: its only layer by
    default) with the lining ``catalogue`` (the front end's, required); ``progress(done, total)`` is called as it
    goes.

    Raises InventoryError (whole file unreadable, or a GeoPackage refused: see :mod:`app.inventory.layers`) or
    InputError (unknown units).
    """
    if layers.is_geopackage(path):
        inventory = next(layers.read_layer_blocks(path, units, WINDOW_FEATURES, layer))
    else:
        if layer is not None:
            raise InventoryError(f"{path}: a CSV inventory has no layers (a layer is chosen in a GeoPackage, .gpkg)")
        inventory = read_inventory(path, units)
    return BatchRun(inventory, evaluate(inventory, progress, catalogue=catalogue))
