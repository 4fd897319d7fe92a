"""What an inventory's results come to: the rows in trouble, a summary for the terminal, the lines of its map.

The summary counts the reaches per verdict and per warning, gives the
extremes of the shear ratio and of the bed shear, and adds the notes about
groups of reaches (:attr:`hydraulics.many_reaches.BatchResult.messages`) and about
the file itself (repeated or missing ids, blank lines, cells written with an
apostrophe). :mod:`app.inventory.plots` draws the same counts, the spread of the
shear ratio and the map of the reaches gathered here (:class:`ReachLines`).
"""

from __future__ import annotations

import numpy as np

from hydraulics import many_reaches as mr
from hydraulics import provenance
from hydraulics.linings import hec15

from .reading import Inventory
from .writing import guarded_cells, written_rows

#: Notes about groups of reaches shown in the summary (all are in BatchResult.messages).
MAX_MESSAGES = 12


def problem_rows(inventory: Inventory, result: mr.BatchResult, limit: int | None = None):
    """[(line, id, verdict, reason)] for every reach that is invalid or has no solution (the first ``limit``), in
    file order."""
    bad = np.flatnonzero((result.verdict == "invalid") | (result.verdict == "no-solution"))[:limit]
    reasons = result.reason_at(bad).tolist()
    return [(int(inventory.lines[i]), inventory.id_at(i), result.verdict[i], reason)
            for i, reason in zip(bad.tolist(), reasons)]


class Tally:
    """What the summary of an inventory needs, gathered block by block (:meth:`add`), so that a file read in
    blocks is summed up without its rows: counts, extremes, notes, the first problem rows, the checked shear
    ratios (8 bytes a checked reach, for the median and the plot) and a 64-bit hash of each id (8 bytes a
    reach, for repeated ids; the repeated id named is read back, :attr:`id_at`).

    ``len()``, :meth:`counts` and :attr:`shear_ratio` are those of a :class:`~hydraulics.many_reaches.BatchResult`
    (for :func:`app.inventory.plots.plot_summary`); :meth:`summary` is the text of :func:`summary`.
    """

    def __init__(self, source: str, units, problems: int = 0):
        self.source, self.units, self.size = source, units, 0
        self.verdicts = dict.fromkeys(mr.VERDICTS, 0)
        self.flags = dict.fromkeys(mr.WARNINGS, 0)
        self.messages: list = []
        self.problems: list = []            # the first ``problems`` (line, id, verdict, reason)
        self.problem_count = 0
        self._keep = problems
        self._ratios: list = []
        self.largest_ratio = self.largest_shear = None   # (value, line, id)
        self.depths = False
        self._hashes: list = []
        self._padded: list = []             # (row, hash of the id as written) where blanks surround an id
        self.blank_ids = 0
        self.blank_lines: list = []         # the first five
        self.blank_line_count = 0
        self._guarded = 0
        self._header_guarded = None
        self._uncounted = None              # the last block, its guarded cells counted when next asked
        #: ``id_at(row)``: the id (without surrounding blanks) of a row of the whole file.
        self.id_at = None
        #: Whether the numbers look typed in the other unit system (plausibility.units_finding of the first block).
        self.units_finding = None
        #: The reaches' lines for the map (:class:`ReachLines`), for an inventory with geometry; else None.
        self.lines = None
        #: What a row's number is: its line in a CSV file, its feature id in a GeoPackage layer.
        self.row_word = "line"

    @classmethod
    def of(cls, inventory: Inventory, result: mr.BatchResult) -> "Tally":
        tally = cls(inventory.source, inventory.units)
        tally.add(inventory, result)
        tally.id_at = inventory.id_at
        return tally

    def __len__(self):
        return self.size

    def counts(self) -> dict:
        return dict(self.verdicts)

    @property
    def shear_ratio(self) -> np.ndarray:
        """The shear ratios of the checked reaches, in file order (inf: stone that cannot rest on its sides)."""
        return np.concatenate(self._ratios) if self._ratios else np.zeros(0)

    def add(self, inventory: Inventory, result: mr.BatchResult) -> None:
        """Count the next block of the file: ``inventory``'s rows and their ``result``."""
        for verdict, count in result.counts().items():
            self.verdicts[verdict] += count
        for key in mr.WARNINGS:
            self.flags[key] += int(result.flags[key].sum())
        self.messages.extend(m for m in result.messages if m not in self.messages)
        bad = int(((result.verdict == "invalid") | (result.verdict == "no-solution")).sum())
        if bad and len(self.problems) < self._keep:
            self.problems += problem_rows(inventory, result, self._keep - len(self.problems))
        self.problem_count += bad
        ratio = result.shear_ratio
        checked = ~np.isnan(ratio)
        self._ratios.append(ratio[checked])
        held = checked & np.isfinite(ratio)
        if held.any():
            i = int(np.argmax(np.where(held, ratio, -np.inf)))
            if self.largest_ratio is None or ratio[i] > self.largest_ratio[0]:
                self.largest_ratio = (float(ratio[i]), int(inventory.lines[i]), inventory.id_at(i))
        shear = result.bed_shear
        if np.isfinite(shear).any():
            i = int(np.nanargmax(shear))
            if self.largest_shear is None or shear[i] > self.largest_shear[0]:
                self.largest_shear = (float(shear[i]), int(inventory.lines[i]), inventory.id_at(i))
        self.depths = self.depths or bool(np.isfinite(result.normal_depth).any())
        ids = inventory.ids
        stripped = list(map(str.strip, ids))
        self.blank_ids += stripped.count("")
        self._hashes.append(np.fromiter(map(hash, stripped), dtype=np.int64, count=len(stripped)))
        if stripped != ids:     # the usual block has no blanks around its ids: strip gave the same objects back
            self._padded += [(self.size + j, hash(a)) for j, (a, b) in enumerate(zip(ids, stripped)) if a != b]
        self.blank_line_count += len(inventory.blank_lines)
        self.blank_lines += inventory.blank_lines[:5 - len(self.blank_lines)]
        # The cells a results file writes with an apostrophe are counted one block late: by then the results
        # writer, which works them out for each block in its own thread, has done it for that block.
        self._count_guarded()
        self._uncounted = inventory
        self.size += len(inventory)
        if self.lines is not None:
            self.lines.add(inventory, result)

    @property
    def guarded(self) -> int:
        """Text cells of the file written with a leading apostrophe (app.files.spreadsheet_safe), the header's once."""
        self._count_guarded()
        return self._guarded

    def _count_guarded(self) -> None:
        inventory, self._uncounted = self._uncounted, None
        if inventory is None:
            return
        guarded = written_rows(inventory)[2]     # the header's cells counted in every block: once in the file
        if self._header_guarded is None:
            self._header_guarded = guarded_cells(inventory.header_text)
            self._guarded += guarded
        else:
            self._guarded += guarded - self._header_guarded

    def repeated_ids(self) -> tuple[int, str | None]:
        """(how many ids appear more than once, the first of them to appear again): ids compared without
        surrounding blanks, blank ids left out, none where the ids as written are all different."""
        if not self._hashes:
            return 0, None
        self._hashes = [np.concatenate(self._hashes)]
        ranked = np.sort(self._hashes[0])    # the usual file, every id different, needs no more than this
        again = (ranked[1:] == ranked[:-1]) & (ranked[1:] != hash(""))
        if not again.any():     # no id repeats without its blanks, so none as written either
            return 0, None
        stripped = self._hashes[0]
        written = stripped.copy()
        for row, value in self._padded:
            written[row] = value
        if len(np.unique(written)) == len(written):
            return 0, None
        order = np.argsort(stripped, kind="stable")
        ranked = stripped[order]
        again = (ranked[1:] == ranked[:-1]) & (ranked[1:] != hash(""))
        first = int(order[1:][again].min())
        return len(np.unique(ranked[1:][again])), self.id_at(first)

    def summary(self, seconds: float | None = None) -> str:
        """A few lines for the terminal: counts per verdict, warnings, extremes; with ``seconds``, the time the
        check took and the rows checked per second."""
        size, units, counts = self.size, self.units, self.verdicts
        out = [f"{size:,} reach{'es' if size != 1 else ''} in {self.source} ({units.name} units)"
               + (f", checked in {seconds:.2f} s" if seconds is not None else "")
               + (f" ({size / seconds:,.0f} rows a second)" if seconds else "")]
        width = max(len(v) for v in mr.VERDICTS)
        for verdict in mr.VERDICTS:
            out.append(f"  {verdict:<{width}}  {counts[verdict]:>9,}")
        flagged = [f"{self.flags[k]:,} {label}" for k, label in mr.WARNINGS.items() if self.flags[k]]
        if flagged:
            out.append("  warnings: " + ", ".join(flagged) + " (see the reason column)")
        ratio = self.shear_ratio
        if ratio.size:
            held = np.isfinite(ratio)
            text = (f"  shear ratio (design / permissible where highest, 1 / safety factor) of "
                    f"{ratio.size:,} reaches:")
            if held.any():
                value, line, ident = self.largest_ratio
                text += (f" median {np.median(ratio):.2f}, above 1 on {int((ratio > 1).sum()):,}, "
                         f"largest finite {value:.2f} ({self.row_word} {line}, id {ident!r})")
            if not held.all():
                text += f"; {int((~held).sum()):,} with stone that cannot rest on its side slopes"
            out.append(text)
        else:
            out.append("  no reach has a permissible shear to compare its design shear with")
        if self.largest_shear is not None:
            value, line, ident = self.largest_shear
            out.append(f"  largest bed shear {units.from_si('shear', value):.3g} {units.label('shear')} "
                       f"({self.row_word} {line}, id {ident!r})")
        for message in self.messages[:MAX_MESSAGES]:
            out.append(f"  note: {message}")
        if len(self.messages) > MAX_MESSAGES:
            out.append(f"  note: ... and {len(self.messages) - MAX_MESSAGES} more notes of this kind")
        if self.depths:
            fb = units.from_si("length", hec15.MIN_FREEBOARD)
            out.append(f"  freeboard: not checked (an inventory has no ditch depth); each open ditch needs at least "
                       f"its normal depth plus {fb:.2g} {units.label('length')} ({provenance.cite('freeboard')}; "
                       "local codes govern), and where the flow is supercritical at least twice its normal depth "
                       f"(waves, {provenance.cite('supercritical_waves')})")
        out.append("  results assist design: a licensed engineer checks them against local codes")
        repeated, first = self.repeated_ids()
        if repeated:
            out.append(f"  note: {repeated:,} id{'s' if repeated > 1 else ''} appear more than once "
                       f"(first: {first!r}); every row is still checked")
        if self.blank_ids:
            out.append(f"  note: {self.blank_ids:,} row{'s have' if self.blank_ids > 1 else ' has'} no id; "
                       "they are still checked and named by line number")
        blanks = self.blank_line_count
        if blanks:
            out.append(f"  note: {blanks:,} blank line{'s' if blanks > 1 else ''} "
                       f"skipped (line {', '.join(map(str, self.blank_lines))}{', ...' if blanks > 5 else ''})")
        if self.guarded:
            out.append(f"  note: {self.guarded:,} text cell{'s' if self.guarded > 1 else ''} starting with =, +, -, "
                       f"@, a tab or a carriage return {'were' if self.guarded > 1 else 'was'} written to the "
                       "results with a leading apostrophe (') so that a spreadsheet shows the text instead of "
                       "running it as a formula; numbers such as -1.5 are written as they are")
        return "\n".join(out)


def summary(inventory: Inventory, result: mr.BatchResult, seconds: float | None = None) -> str:
    """A few lines for the terminal: counts per verdict, warnings, extremes (see :meth:`Tally.summary`)."""
    return Tally.of(inventory, result).summary(seconds)


#: The files the summary plot and the map may be written as (:mod:`app.inventory.plots`), by suffix.
PLOT_FORMATS = (".png", ".pdf", ".svg")
#: The map's lines are simplified to about a pixel of a map this many pixels wide: what it keeps of a reach
#: is what can be seen, so its memory follows the reaches' count, not their vertices.
MAP_PIXELS = 2000


class ReachLines:
    """The lines of a GeoPackage inventory's reaches with their verdicts, gathered block by block for
    :func:`app.inventory.plots.plot_map`: each line simplified to about a pixel of the map (:data:`MAP_PIXELS`)
    and its coordinates kept as 32-bit offsets from the layer's corner; and the length of the reaches of each
    verdict, from the ``length`` column (see :mod:`app.inventory.layers`), in the inventory's units."""

    def __init__(self, layer, units):
        self.layer, self.units = layer, units
        bounds = layer.bounds if layer.bounds is not None and all(map(np.isfinite, layer.bounds)) else None
        self.origin = np.array(bounds[:2]) if bounds else None
        extent = max(bounds[2] - bounds[0], bounds[3] - bounds[1]) if bounds else 0.0
        self.tolerance = extent / MAP_PIXELS
        self.coords: list = []      # per block: (points, 2) float32
        self.starts: list = []      # per block: where each line starts in its points (and the end)
        self.verdicts: list = []    # per block: each line's verdict code (index in mr.VERDICTS)
        self.lengths = dict.fromkeys(mr.VERDICTS, 0.0)
        self.measured = True        # every reach's length was a number

    def add(self, inventory: Inventory, result: mr.BatchResult) -> None:
        import shapely

        from .layers import LENGTH_COLUMN, lines_of

        features = inventory.features
        lines = lines_of(features.column(self.layer.geometry_name))
        if self.tolerance > 0:
            lines = shapely.simplify(lines, self.tolerance, preserve_topology=False)
        parts, owner = shapely.get_parts(lines, return_index=True)
        points, which = shapely.get_coordinates(parts, return_index=True)
        if self.origin is None:
            self.origin = points.min(axis=0) if len(points) else np.zeros(2)
        code = {v: i for i, v in enumerate(mr.VERDICTS)}
        verdict = np.fromiter(map(code.__getitem__, result.verdict.tolist()), dtype=np.int8, count=len(result))
        self.coords.append((points - self.origin).astype(np.float32))
        self.starts.append(np.searchsorted(which, np.arange(len(parts) + 1)))
        self.verdicts.append(verdict[owner])
        try:
            length = features.column(LENGTH_COLUMN).cast("double").to_numpy(zero_copy_only=False)
        except (KeyError, ValueError, NotImplementedError):   # no such column, or text that is not a number
            # (pyarrow's ArrowInvalid is a ValueError): no lengths in the legend
            self.measured = False
            return
        self.measured = self.measured and not np.isnan(length).any()
        for name in mr.VERDICTS:
            self.lengths[name] += float(np.nansum(length[result.verdict == name]))
