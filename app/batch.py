"""Ditch inventories: read a CSV of reaches, check them all, write one result row per input row.

The computation is :mod:`hydraulics.batch` (vectorised, SI). This module is
its edge: it reads the CSV text (pyarrow's CSV reader for a plain file, the
csv module and Python's float for one with quotes, blank lines or ragged
rows: the same fields, numbers and reasons either way), converts the user's
units to SI on the way in and back on the way out, writes the results file,
and prepares the summary and the summary plot. The desktop window calls
:func:`run_inventory` and :func:`result_table`.

Input columns (all required in the header, blank where not relevant):
``id, shape, bottom_width, left_slope, right_slope, diameter, slope, flow,
lining, d50, n``. Lengths (bottom_width, diameter, d50) are in ft or m, flow
in ft^3/s or m^3/s, side slopes H:V, slope a ratio. Any other column is
carried through unchanged. The results file is the input with the columns
``normal_depth, critical_depth, velocity, froude, bed_shear,
permissible_shear, safety_factor, verdict, reason`` added, in the same units,
one row per input row and in the same order.
"""

from __future__ import annotations

import csv
import io
import math
import os
import sys
from concurrent.futures import ThreadPoolExecutor
from contextlib import nullcontext
from dataclasses import dataclass, field
from itertools import repeat
from pathlib import Path

import numpy as np

from hydraulics import batch as hb
from hydraulics import provenance
from hydraulics.linings import hec15
from hydraulics import units as hu

from .files import FORMULA_STARTS, atomic_writer, spreadsheet_safe, write_atomic
from .numtext import format_rows, format_rows_parallel
from .verdicts import Verdict

INPUT_COLUMNS = ("id", "shape", "bottom_width", "left_slope", "right_slope", "diameter", "slope", "flow", "lining",
                 "d50", "n")
RESULT_COLUMNS = ("normal_depth", "critical_depth", "velocity", "froude", "bed_shear", "permissible_shear",
                  "safety_factor", "verdict", "reason")
_NUMBER_COLUMNS = tuple(hb.NUMERIC_FIELDS)
_VALUE_COLUMNS = tuple(hb.RESULT_FIELDS)  # the numeric result columns, in output order
#: Significant digits of the numbers written (more than any inventory's inputs carry).
DIGITS = 5
#: Notes about groups of reaches shown in the summary (all are in BatchResult.messages).
MAX_MESSAGES = 12


class InventoryError(Exception):
    """The file as a whole cannot be read as an inventory (no results are written)."""


class Records:
    """The records of a plain file as its own UTF-8 text: each line ends in "\\n"; ``starts`` where each begins."""

    def __init__(self, body: bytes, starts: np.ndarray):
        self.body, self.starts = body, starts

    def __len__(self):
        return len(self.starts)

    def tolist(self) -> list:
        return self.body.decode("utf-8").split("\n")[:-1]


@dataclass
class Inventory:
    """An inventory read from CSV: its text per row (for carrying through) and its reaches in SI."""

    source: str
    units: hu.UnitSystem
    header: list            # column names as written
    header_text: str        # the header line, CSV-encoded
    records: object         # per record its fields as CSV text (carried through unchanged): a list, or Records
    lines: np.ndarray       # per record: the line number where it starts (the header is line 1)
    id_values: object       # per record: the id as written (surrounding blanks kept): a list, or pyarrow's column
    reaches: hb.Reaches
    blank_lines: list = field(default_factory=list)
    # (records as written to a results file, header text as written, cells given an apostrophe): made on first use
    _written: tuple | None = field(default=None, repr=False, compare=False)

    def __len__(self):
        return len(self.records)

    @property
    def ids(self) -> list:
        """Per record: the id as written, as a list of str (made from pyarrow's column on first use)."""
        if not isinstance(self.id_values, list):
            self.id_values = self.id_values.to_pylist()
        return self.id_values

    def id_at(self, i: int) -> str:
        """The id of record ``i`` without surrounding blanks."""
        value = self.id_values[i]
        return (value if isinstance(value, str) else value.as_py()).strip()

    def duplicate_ids(self) -> list:
        """Ids (without surrounding blanks) that appear more than once, in the order their repeats appear."""
        if not isinstance(self.id_values, list):  # the usual case, all different, found without a list
            import pyarrow.compute as pc

            if pc.count_distinct(self.id_values).as_py() == len(self):
                return []
        return _duplicates(self.ids)

    def blank_id_count(self) -> int:
        if not isinstance(self.id_values, list):
            import pyarrow.compute as pc

            return int(pc.sum(pc.equal(pc.utf8_trim_whitespace(self.id_values), "")).as_py() or 0)
        return sum(1 for i in self.id_values if not i.strip())

    @property
    def rows(self) -> list:
        """Per record: its fields as CSV text, without the line end."""
        if isinstance(self.records, Records):
            self.records = self.records.tolist()
        return self.records


# ----------------------------------------------------------------------------- reading

def _decode(data: bytes, source: str) -> str:
    try:
        return data.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        line = data.count(b"\n", 0, exc.start) + 1
        column = exc.start - (data.rfind(b"\n", 0, exc.start) + 1) + 1
        raise InventoryError(f"{source}:{line}: not UTF-8 text (byte 0x{data[exc.start]:02x} at column {column} "
                             "of that line); an inventory is read as UTF-8: save the sheet as 'CSV UTF-8' "
                             "and try again") from None


def _split_fast(text: str):
    """Records of a CSV text without double quotes: (header line, header fields, record lines, numbers, blanks).

    Each record's fields are exactly its line split at the commas, so the
    line itself is what is carried through to the results.
    """
    lines = text.split("\n")
    if lines and lines[-1] == "":
        lines.pop()
    commas = np.fromiter(map(str.count, lines, repeat(",", len(lines))), dtype=np.int64, count=len(lines))
    blank = [int(i) for i in np.flatnonzero(commas == 0) if not lines[i].strip()]
    keep = np.ones(len(lines), dtype=bool)
    keep[blank] = False
    kept = np.flatnonzero(keep)
    if not len(kept):
        return None
    head = int(kept[0])
    rows_at = kept[1:]
    if len(rows_at) == len(lines) - head - 1:
        records = lines[head + 1:]
    else:
        records = [lines[i] for i in rows_at]
    return head + 1, lines[head].split(","), records, rows_at + 1, [b + 1 for b in blank], commas[rows_at] + 1


def _split_csv(text: str, source: str):
    """The same as :func:`_split_fast` by the csv module, for files that quote fields."""
    reader = csv.reader(io.StringIO(text, newline=""), strict=True)
    records, numbers, blank, header = [], [], [], None
    start = 1
    try:
        for fields in reader:
            if not fields or (len(fields) == 1 and not fields[0].strip()):
                blank.append(start)
            elif header is None:
                header = (start, fields)
            else:
                records.append(fields)
                numbers.append(start)
            start = reader.line_num + 1
    except csv.Error as exc:
        raise InventoryError(f"{source}: line {reader.line_num}: {exc} (check the quotes)") from None
    if header is None:
        return None
    return header[0], header[1], records, np.array(numbers, dtype=np.int64), blank, \
        np.array([len(f) for f in records], dtype=np.int64)


def _check_header(fields, source):
    names = [f.strip() for f in fields]
    seen = {}
    for i, name in enumerate(names):
        if name in seen:
            raise InventoryError(f"{source}: column {name!r} appears twice in the header (columns {seen[name] + 1} "
                                 f"and {i + 1})")
        seen[name] = i
    missing = [c for c in INPUT_COLUMNS if c not in seen]
    if missing:
        hints = []
        lower = {n.lower(): n for n in names}
        for c in missing:
            if c in lower:
                hints.append(f"{lower[c]!r} for {c!r}: names are lower case")
        if len(names) == 1 and any(sep in names[0] for sep in ";\t|"):
            hints.append("the file seems to separate columns with something other than commas")
        hint = f" ({'; '.join(hints)})" if hints else ""
        raise InventoryError(f"{source}: missing column{'s' if len(missing) > 1 else ''} "
                             f"{', '.join(missing)}; the header needs {', '.join(INPUT_COLUMNS)}{hint}")
    clash = [c for c in RESULT_COLUMNS if c in seen]
    if clash:
        raise InventoryError(f"{source}: the input already has the result column{'s' if len(clash) > 1 else ''} "
                             f"{', '.join(clash)} (is it a results file?); rename or remove "
                             f"{'them' if len(clash) > 1 else 'it'}")
    return names, seen


def _hint(text: str) -> str:
    if "%" in text:
        return " (write a slope as a ratio: 0.5 % is 0.005)"
    if "," in text:
        return " (use a point as the decimal mark)"
    return ""


def _numbers(texts, name, notes, unreadable):
    """Parse one column: blanks -> nan; anything that is not a finite number is noted on its row.

    The common case (plain numbers and empty fields) is converted in one
    numpy call. Text with letters that could spell nan or inf, underscores
    (which Python's float accepts) or anything float refuses is read one
    entry at a time.
    """
    size = len(texts)
    if not size:
        return np.zeros(0)
    joined = "".join(texts)
    if not any(c in joined for c in "_nN"):
        try:
            distinct = set(texts)
            if len(distinct) * 8 < size:  # side slopes, n, blank columns: each text parsed once
                table = {t: float(t) if t else math.nan for t in distinct}
                values = np.fromiter(map(table.__getitem__, texts), dtype=float, count=size)
            else:
                values = np.fromiter(map(float, [t or "nan" for t in texts] if "" in texts else texts), dtype=float,
                                     count=size)
            if not np.isinf(values).any():
                return values
        except ValueError:
            pass
    values = np.full(size, math.nan)
    bad = np.zeros(size, dtype=bool)
    for i, raw in enumerate(texts):
        t = raw.strip()
        if not t:
            continue
        try:
            if "_" in t:
                raise ValueError
            v = float(t)
        except ValueError:
            bad[i] = True
            _add_note(notes, i, f"{name}: not a number, got {t!r}{_hint(t)}")
            continue
        if math.isfinite(v):
            values[i] = v
        else:
            bad[i] = True
            _add_note(notes, i, f"{name}: must be a finite number, got {t!r}")
    if bad.any():
        unreadable[name] = bad
    return values


def _add_note(notes, i, text):
    notes[i] = f"{notes[i]}; {text}" if notes[i] else text


def _texts(texts, lower=False):
    """A text column as an object array, surrounding blanks stripped (and lower case if asked)."""
    mapping = {t: (t.strip().lower() if lower else t.strip()) for t in set(texts)}
    if all(k == v for k, v in mapping.items()):
        return np.array(texts, dtype=object)
    return np.array([mapping[t] for t in texts], dtype=object)


def parse_inventory(text: str | bytes, units: str = "us", source: str = "inventory", *,
                    ascii_checked: bool = False) -> Inventory:
    """Read inventory CSV ``text`` in the unit system ``units`` ("us" or "si").

    ``text`` is a str, or bytes of ASCII text (a file that needs no decoding;
    ``ascii_checked``: the caller has made sure of that).
    Raises InventoryError for a file that cannot be an inventory (empty, no
    header, missing or duplicated columns) and InputError for unknown units.
    Problems of single rows do not raise: they go into ``reaches.notes``.
    """
    system = hu.system(units)
    if isinstance(text, bytes):
        if not (ascii_checked or text.isascii()):
            raise ValueError("parse_inventory takes bytes of ASCII text only; decode other text first")
        if b"\r" not in text and b'"' not in text:  # the common file: pyarrow reads its bytes as they are
            inventory = _parse_arrow(text, system, source)
            if inventory is not None:
                return inventory
        text = text.decode("ascii")
    fast = '"' not in text
    if fast and "\r" in text:   # the csv module takes any line end itself and keeps a quoted field's as written
        text = text.replace("\r\n", "\n").replace("\r", "\n")
    if fast:
        inventory = _parse_arrow(text.encode("utf-8"), system, source)
        if inventory is not None:
            return inventory
    split = _split_fast(text) if fast else _split_csv(text, source)
    if split is None:
        raise InventoryError(f"{source}: the file is empty (it needs a header line with the columns "
                             f"{', '.join(INPUT_COLUMNS)})")
    _, header_fields, records, lines, blank, field_counts = split
    names, index = _check_header(header_fields, source)
    width = len(names)
    size = len(records)
    notes = hb.text_array(size)

    ragged = np.flatnonzero(field_counts != width)
    if fast and not len(ragged):
        flat = ",".join(records).split(",") if size else []
        columns = [flat[j::width] for j in range(width)]
        rows = records
    else:
        fields = [r.split(",") for r in records] if fast else records
        for i in ragged:
            fields[i] = _ragged(fields[i], width, notes, i)
        columns = [list(c) for c in zip(*fields)] if size else [[] for _ in range(width)]
        rows = [",".join(f) for f in fields] if fast else [_csv_line(f) for f in fields]
    header_text = ",".join(header_fields) if fast else _csv_line(header_fields)

    col = {name: columns[index[name]] for name in INPUT_COLUMNS}
    unreadable = {}
    numbers = {}
    for name in _NUMBER_COLUMNS:
        values = _numbers(col[name], name, notes, unreadable)
        quantity = hb.NUMERIC_FIELDS[name]
        numbers[name] = values if quantity in ("slope", "side_slope", "manning_n") else system.to_si(quantity, values)
    reaches = hb.Reaches(shape=_texts(col["shape"], lower=True), lining=_texts(col["lining"]), notes=notes,
                         unreadable=unreadable, **numbers)
    return Inventory(source=source, units=system, header=names, header_text=header_text, records=rows, lines=lines,
                     id_values=col["id"], reaches=reaches, blank_lines=blank)


# A file without quotes whose every line is a record of the header's width (no blank lines, no ragged
# rows) is parsed by pyarrow's CSV reader: the same fields, numbers parsed in C++ (fast_float, correctly
# rounded like Python's float). Where it refuses a number (text such as "1,5", " 2" or "1_0", which
# Python's float reads differently or not at all), that column is read by _numbers as before; any
# other surprise leaves the whole file to the reader above. Without pyarrow installed, the reader
# above reads every file.

def _pyarrow():
    """(pyarrow, pyarrow.csv), or None where pyarrow is not installed."""
    try:
        import pyarrow
        import pyarrow.csv
    except ImportError:  # pragma: no cover - pyarrow is a dependency; without it the Python reader serves
        return None
    return pyarrow, pyarrow.csv


def _arrow_table(pa, pacsv, body: bytes, names, types):
    return pacsv.read_csv(
        pa.py_buffer(body),
        read_options=pacsv.ReadOptions(column_names=names, use_threads=True),
        parse_options=pacsv.ParseOptions(delimiter=",", quote_char=False, escape_char=False, double_quote=False,
                                         newlines_in_values=False, ignore_empty_lines=False),
        convert_options=pacsv.ConvertOptions(column_types=types, include_columns=list(types), null_values=[""],
                                             strings_can_be_null=False, quoted_strings_can_be_null=False))


def _parse_arrow(data: bytes, system, source: str):
    """:func:`parse_inventory` of UTF-8 ``data`` without quotes or carriage returns by pyarrow, or None where
    the Python reader must read it."""
    modules = _pyarrow()
    if modules is None:
        return None
    pa, pacsv = modules
    end = data.find(b"\n")
    if end < 0:
        return None  # a header only: the Python reader says so
    header = data[:end].decode("utf-8")
    if not header.strip() or end + 1 == len(data):
        return None  # empty, or a header only: the Python reader says so
    body = data[end + 1:] if data.endswith(b"\n") else data[end + 1:] + b"\n"
    stops = np.flatnonzero(np.frombuffer(body, dtype=np.uint8) == ord("\n"))
    starts = np.concatenate([[0], stops[:-1] + 1])
    if (stops == starts).any():
        return None  # blank lines, which the Python reader reports
    names, index = _check_header(header.split(","), source)
    size, width = len(starts), len(names)
    slots = [f"f{j}" for j in range(width)]  # positional: the header is checked above, with its own messages
    col = {name: slots[index[name]] for name in INPUT_COLUMNS}
    typed = {col[n]: pa.float64() for n in _NUMBER_COLUMNS}
    typed.update({col["shape"]: pa.dictionary(pa.int32(), pa.string()),
                  col["lining"]: pa.dictionary(pa.int32(), pa.string()), col["id"]: pa.string()})
    try:
        table = _arrow_table(pa, pacsv, body, slots, typed)
    except pa.ArrowInvalid:  # a number pyarrow refuses (or a ragged row): every column as text, numbers below
        try:
            table = _arrow_table(pa, pacsv, body, slots, {c: pa.string() for c in typed})
        except pa.ArrowInvalid:
            return None
    if table.num_rows != size:
        return None
    notes = hb.text_array(size)
    unreadable = {}
    numbers = {}
    for name in _NUMBER_COLUMNS:
        values = _arrow_numbers(pa, table.column(col[name]), name, notes, unreadable)
        quantity = hb.NUMERIC_FIELDS[name]
        numbers[name] = values if quantity in ("slope", "side_slope", "manning_n") else system.to_si(quantity, values)
    shape, shape_kinds = _arrow_texts(pa, table.column(col["shape"]), lower=True)
    lining, lining_texts = _arrow_texts(pa, table.column(col["lining"]))
    kind = np.array([hb.SHAPE_CODE.get(t, -1) for t in shape_kinds], dtype=np.int8)[shape]
    named = np.array([bool(t) for t in lining_texts], dtype=bool)[lining]
    reaches = hb.Reaches(shape=np.array(shape_kinds, dtype=object)[shape],
                         lining=np.array(lining_texts, dtype=object)[lining], notes=notes, unreadable=unreadable,
                         kind=kind, named=named, **numbers)
    return Inventory(source=source, units=system, header=names, header_text=header, records=Records(body, starts),
                     lines=np.arange(2, size + 2), id_values=table.column(col["id"]), reaches=reaches,
                     blank_lines=[])


def _arrow_numbers(pa, column, name, notes, unreadable):
    """A number column read by pyarrow as float64 (blank: nan); else, as text, through :func:`_numbers`."""
    if column.type == pa.float64():
        values = column.to_numpy()
        if not column.null_count:
            special = np.isnan(values) | np.isinf(values)
        else:
            special = np.isinf(values) | (np.isnan(values) & ~column.is_null().to_numpy())
        if not special.any():  # "nan" and "inf" written as text are refused by _numbers, with its reasons
            return values
        column = column.cast(pa.string())
    else:
        try:
            numeric = column.cast(pa.float64())  # "" was read as null, so blanks stay blank
        except pa.ArrowInvalid:
            numeric = None
        if numeric is not None:
            return _arrow_numbers(pa, numeric, name, notes, unreadable)
    return _numbers([t if t is not None else "" for t in column.to_pylist()], name, notes, unreadable)


def _arrow_texts(pa, column, lower=False):
    """(codes, distinct texts) of a text column: each distinct text stripped (and lower-cased) once."""
    if column.type != pa.dictionary(pa.int32(), pa.string()):
        column = column.dictionary_encode()
    column = column.combine_chunks() if column.num_chunks != 1 else column.chunk(0)
    texts = [(t or "").strip().lower() if lower else (t or "").strip() for t in column.dictionary.to_pylist()]
    codes = column.indices.to_numpy(zero_copy_only=False)
    if not texts:  # no rows
        texts = [""]
        codes = np.zeros(0, dtype=np.intp)
    return codes, texts


def _ragged(fields, width, notes, i):
    if len(fields) < width:
        _add_note(notes, i, f"the row has {len(fields)} fields and the header {width}; "
                            "the missing ones were read as blank")
        return fields + [""] * (width - len(fields))
    extra = fields[width:]
    shown = [repr(e) if len(e) <= MAX_EXTRA_CHARS else repr(e[:MAX_EXTRA_CHARS]) + "..." for e in extra[:MAX_EXTRA_SHOWN]]
    if len(extra) <= MAX_EXTRA_SHOWN and all(len(e) <= MAX_EXTRA_CHARS for e in extra):
        kept = (f"the extra field{'s' if len(extra) > 1 else ''} {', '.join(shown)} "
                f"{'are' if len(extra) > 1 else 'is'} kept only in this reason")
    else:   # a reason stays short however wide or long the row (a million columns)
        kept = (f"{len(extra):,} extra fields were dropped (the first {len(shown)}: {', '.join(shown)})"
                if len(extra) > 1 else f"the extra field {shown[0]} was dropped")
    _add_note(notes, i, f"the row has {len(fields):,} fields and the header {width}; {kept}")
    return fields[:width]


#: How much of the extra fields of a too-long row its reason quotes.
MAX_EXTRA_SHOWN = 5
MAX_EXTRA_CHARS = 40


def _fields(row: str) -> list:
    """The fields of one CSV record as written (a quoted field may hold a line break of any kind)."""
    return next(csv.reader(io.StringIO(row, newline="")), [])


def _csv_line(fields) -> str:
    """Fields as one CSV record (quoted where needed, line breaks inside quotes), without its line end."""
    buf = io.StringIO()
    csv.writer(buf, lineterminator="\r\n").writerow(fields)  # makes a field holding \r or \n quoted
    return buf.getvalue()[:-2]


def read_inventory(path, units: str = "us") -> Inventory:
    """Read the inventory file at ``path``; see :func:`parse_inventory`."""
    path = Path(path)
    try:
        data = path.read_bytes()
    except OSError as exc:
        raise InventoryError(f"cannot read {path}: {exc.strerror or exc}") from None
    if data.isascii():  # no decoding needed (and no byte-order mark): the bytes go to the reader as they are
        return parse_inventory(data, units, source=str(path), ascii_checked=True)
    return parse_inventory(_decode(data, str(path)), units, source=str(path))


# ----------------------------------------------------------------------------- computing

def evaluate(inventory: Inventory, progress=None, catalogue=None) -> hb.BatchResult:
    """Check every reach of ``inventory`` (results SI; reasons quote the inventory's units).

    ``catalogue`` is the lining catalogue the ``lining`` column refers to
    (default: the shipped one; see hydraulics.linings.load_catalogue for a
    user catalogue on top of it).
    """
    return hb.evaluate(inventory.reaches, display=inventory.units, progress=progress, catalogue=catalogue)


# ----------------------------------------------------------------------------- writing

def _quote_field(text: str) -> str:
    if "," in text or '"' in text or "\n" in text or "\r" in text:
        return '"' + text.replace('"', '""') + '"'
    return text


def display_values(inventory: Inventory, result: hb.BatchResult) -> dict:
    """The numeric result columns in the inventory's units (nan where blank)."""
    return {k: inventory.units.from_si(q, getattr(result, k)) if q not in ("ratio",) else getattr(result, k)
            for k, q in hb.RESULT_FIELDS.items()}


def format_results(inventory: Inventory, result: hb.BatchResult) -> str:
    """The results file as text: the input rows with the result columns added.

    Numbers are written as Python's ``"%.5g"`` writes them (:data:`DIGITS`
    significant digits; :func:`app.numtext.format_rows` does it on whole
    arrays); a value not computed is an empty field. The reason is quoted
    where it holds a comma, a quote or a line break.
    """
    return _results_bytes(inventory, result).decode("utf-8")


def _results_bytes(inventory: Inventory, result: hb.BatchResult) -> bytes:
    """The results file, UTF-8: each row is its input text, the numbers, the verdict and the reason."""
    return b"".join(_results_pieces(inventory, result))


def _number_table(inventory: Inventory, result: hb.BatchResult) -> np.ndarray:
    """The numeric result columns in the inventory's units, one row per reach of ``result``."""
    values = display_values(inventory, result)
    return np.column_stack([values[k] for k in _VALUE_COLUMNS]) if len(result) else np.zeros((0, len(_VALUE_COLUMNS)))


def _workers() -> int:
    return min(2, os.cpu_count() or 1)


def _results_pieces(inventory: Inventory, result: hb.BatchResult) -> list:
    """The results file as a few bytes-like pieces to be written one after the other (no copy joins them)."""
    size = len(inventory)
    head = _results_head(inventory)
    # The numbers are formatted by worker threads (numpy work, without the GIL) while this thread makes
    # the verdict and reason texts (Python work, with it): on two cores the two overlap.
    workers = _workers()
    with ThreadPoolExecutor(workers) if workers > 1 else nullcontext() as pool:
        pending = format_rows_parallel(_number_table(inventory, result), DIGITS, comma_after_last=True, pool=pool,
                                       parts=workers)
        reasons = result.reason.tolist()
        verdicts = result.verdict.tolist()
        modules = _pyarrow()
        if modules is None or not size:
            quoted = {r: _quote_field(spreadsheet_safe(r)) + "\n" for r in set(reasons)}
            parts = [""] * (5 * size)
            rows = written_rows(inventory)[0]
            parts[0::5] = rows.tolist() if isinstance(rows, Records) else rows
            parts[1::5] = repeat(",", size)
            parts[3::5] = map({v: v + "," for v in set(verdicts)}.__getitem__, verdicts)
            parts[4::5] = map(quoted.__getitem__, reasons)
            parts[2::5] = pending.result().tolist()
            return [head, "".join(parts).encode("utf-8")]
        pa = modules[0]
        rows = _row_array(pa, inventory)
        verdict_texts, reason_texts = _verdict_texts(pa, verdicts), _reason_texts(pa, reasons)
        numbers = pending.result()
    return [head, _joined_lines(pa, rows, numbers, verdict_texts, reason_texts)]


def _safe_record(row: str) -> tuple[str, int]:
    """(the CSV record ``row`` with every formula-like cell given an apostrophe, how many were)."""
    fields = _fields(row)
    safe = [spreadsheet_safe(f) for f in fields]
    changed = sum(a is not b for a, b in zip(safe, fields))
    return (_csv_line(safe), changed) if changed else (row, 0)


_TRIGGER_BYTES = sorted(ord(c) for c in FORMULA_STARTS)


def written_rows(inventory: Inventory) -> tuple:
    """(records, header text, count) as a results file carries them: every input cell that a spreadsheet would
    read as a formula (see :func:`app.files.spreadsheet_safe`) with a leading apostrophe; ``count`` cells were.

    The usual file has none, and its records are returned as they are (the file's own bytes); only the rows with
    a cell starting with one of the trigger characters are looked at one by one.
    """
    if inventory._written is not None:
        return inventory._written
    header, head_count = _safe_record(inventory.header_text)
    records, count = inventory.records, head_count
    if isinstance(records, Records):   # no quotes in the file: a cell starts a line or follows a comma
        body = np.frombuffer(records.body, dtype=np.uint8)
        hit = body == _TRIGGER_BYTES[0]
        for byte in _TRIGGER_BYTES[1:]:   # six comparisons cost less than one table look-up per byte
            hit |= body == byte
        at = np.flatnonzero(hit)
        if len(at):
            before = body[np.maximum(at - 1, 0)]
            at = at[(at == 0) | (before == ord(",")) | (before == ord("\n"))]
        rows = np.unique(np.searchsorted(records.starts, at, side="right") - 1) if len(at) else ()
        changes = {}
        for i in rows.tolist() if len(rows) else ():
            end = records.starts[i + 1] - 1 if i + 1 < len(records) else len(records.body) - 1
            row, n = _safe_record(records.body[records.starts[i]:end].decode("utf-8"))
            if n:
                changes[i], count = row, count + n
        if changes:
            records = records.tolist()
            for i, row in changes.items():
                records[i] = row
    else:
        safe = []
        for row in records:
            if any(c in row for c in FORMULA_STARTS):
                row, n = _safe_record(row)
                count += n
            safe.append(row)
        records = safe
    inventory._written = (records, header, count)
    return inventory._written


def _results_head(inventory: Inventory) -> bytes:
    return (written_rows(inventory)[1] + "," + ",".join(RESULT_COLUMNS) + "\n").encode("utf-8")


def _row_array(pa, inventory: Inventory):
    """Every input row's text followed by a comma, as a pyarrow large_string array (64-bit offsets: no 2 GB limit)."""
    records, size = written_rows(inventory)[0], len(inventory)
    if isinstance(records, Records):  # the file's own bytes; each line end becomes the comma after the row
        return pa.LargeStringArray.from_buffers(
            size, pa.py_buffer(np.append(records.starts, len(records.body)).astype(np.int64)),
            pa.py_buffer(records.body.replace(b"\n", b",")))
    import pyarrow.compute as pc

    text = pa.large_string()
    return pc.binary_join_element_wise(pa.array(records, type=text), pa.scalar("", type=text),
                                       pa.scalar(",", type=text))


def _joined_lines(pa, rows, numbers, verdict_texts, reason_texts) -> memoryview:
    """The results lines ("row," "numbers," "verdict," "reason\\n") of some reaches, joined in C++, as bytes."""
    import pyarrow.compute as pc

    text = pa.large_string()
    size = len(rows)
    lines = pc.binary_join_element_wise(
        rows, pa.LargeStringArray.from_buffers(size, pa.py_buffer(numbers.offsets()), pa.py_buffer(numbers.data)),
        verdict_texts.cast(text), reason_texts.cast(text), pa.scalar("", type=text))
    offsets = np.frombuffer(lines.buffers()[1], dtype=np.int64, count=size + 1, offset=8 * lines.offset)
    return memoryview(lines.buffers()[2])[offsets[0]:offsets[-1]]


def _verdict_texts(pa, verdicts: list):
    return _coded(pa, verdicts, lambda v: v + ",")


def _reason_texts(pa, reasons: list):
    return _coded(pa, reasons, lambda r: _quote_field(spreadsheet_safe(r)) + "\n")


def _coded(pa, values: list, text_of):
    """A pyarrow dictionary array of ``text_of(v)`` for each of ``values``, each distinct text made once."""
    distinct = list(dict.fromkeys(values))
    code = {v: i for i, v in enumerate(distinct)}
    indices = np.fromiter(map(code.__getitem__, values), dtype=np.int32, count=len(values))
    texts = pa.array([text_of(v) for v in distinct], type=pa.large_string())
    return pa.DictionaryArray.from_arrays(pa.array(indices), texts)


def write_results(path, inventory: Inventory, result: hb.BatchResult) -> None:
    """Write the results file atomically (a half-written file never replaces a good one), UTF-8."""
    write_atomic(path, _results_pieces(inventory, result))


def result_table(inventory: Inventory, result: hb.BatchResult):
    """(columns, rows) for a table view: every input column then the result columns, all as text.

    Numbers are in the inventory's units with :data:`DIGITS` significant
    digits, blanks are "". ``result.verdict`` and ``result.flags`` give the
    masks a filter needs.
    """
    text = format_results(inventory, result)
    reader = csv.reader(io.StringIO(text, newline=""))
    columns = next(reader)
    return columns, list(reader)


#: Reaches per chunk in :func:`check_and_write`: small enough that formatting overlaps computing.
WRITE_CHUNK = 25_000


def check_and_write(path, inventory: Inventory, progress=None, catalogue=None) -> hb.BatchResult:
    """:func:`evaluate`, then :func:`write_results` to ``path``; returns the results.

    On a machine with two cores or more, the reaches are checked in chunks
    of :data:`WRITE_CHUNK`, and a worker thread formats each chunk's numbers,
    assembles its lines and writes them to the temporary file while this
    thread checks the next chunk (the checking holds Python's GIL much of
    the time, the formatting, joining and writing hardly at all). The file
    replaces ``path`` only when every chunk is written, and it is the same
    byte for byte either way.
    """
    modules = _pyarrow()
    if modules is None or _workers() < 2 or len(inventory) < 2 * WRITE_CHUNK:
        result = evaluate(inventory, progress, catalogue)
        write_results(path, inventory, result)
        return result
    pa = modules[0]
    rows = _row_array(pa, inventory)
    blocks = []
    # The pool is left before the writer: every block is written (or has failed) before the file is replaced.
    with atomic_writer(path) as fh, ThreadPoolExecutor(1) as pool:  # one worker: the blocks are written in order
        fh.write(_results_head(inventory))

        def write_block(rows, table, verdict_texts, reason_texts):
            fh.write(_joined_lines(pa, rows, format_rows(table, DIGITS, True), verdict_texts, reason_texts))

        def start_block(part, done):
            blocks.append(pool.submit(write_block, rows.slice(part.start, part.stop - part.start),
                                      _number_table(inventory, done), _verdict_texts(pa, done.verdict.tolist()),
                                      _reason_texts(pa, done.reason.tolist())))

        result = hb.evaluate(inventory.reaches, display=inventory.units, progress=progress, chunk=WRITE_CHUNK,
                             catalogue=catalogue, on_chunk=start_block)
        for block in blocks:
            block.result()  # a block's error (a full disk, say) is raised here, and the file is not replaced
    return result


# ----------------------------------------------------------------------------- reporting

def problem_rows(inventory: Inventory, result: hb.BatchResult):
    """[(line, id, verdict, reason)] for every reach that is invalid or has no solution, in file order."""
    bad = [i for i, v in enumerate(result.verdict.tolist()) if v in ("invalid", "no-solution")]
    return [(int(inventory.lines[i]), inventory.id_at(i), result.verdict[i], result.reason[i]) for i in bad]


def summary(inventory: Inventory, result: hb.BatchResult, seconds: float | None = None) -> str:
    """A few lines for the terminal: counts per verdict, warnings, extremes."""
    counts = result.counts()
    size = len(inventory)
    units = inventory.units
    out = [f"{size:,} reach{'es' if size != 1 else ''} in {inventory.source} ({units.name} units)"
           + (f", checked in {seconds:.2f} s" if seconds is not None else "")]
    width = max(len(v) for v in hb.VERDICTS)
    for verdict in hb.VERDICTS:
        out.append(f"  {verdict:<{width}}  {counts[verdict]:>9,}")
    flagged = [f"{int(result.flags[k].sum()):,} {label}" for k, label in hb.WARNINGS.items() if result.flags[k].any()]
    if flagged:
        out.append("  warnings: " + ", ".join(flagged) + " (see the reason column)")
    ratio = result.shear_ratio
    checked = ~np.isnan(ratio)
    if checked.any():
        held = checked & np.isfinite(ratio)
        text = (f"  shear ratio (design / permissible where highest, 1 / safety factor) of "
                f"{int(checked.sum()):,} reaches:")
        if held.any():
            worst = int(np.argmax(np.where(held, ratio, -np.inf)))
            text += (f" median {np.median(ratio[checked]):.2f}, above 1 on {int((ratio[checked] > 1).sum()):,}, "
                     f"largest finite {ratio[worst]:.2f} (line {inventory.lines[worst]}, "
                     f"id {inventory.id_at(worst)!r})")
        if (checked & ~held).any():
            text += f"; {int((checked & ~held).sum()):,} with stone that cannot rest on its side slopes"
        out.append(text)
    else:
        out.append("  no reach has a permissible shear to compare its design shear with")
    shear = result.bed_shear
    if np.isfinite(shear).any():
        worst = int(np.nanargmax(shear))
        out.append(f"  largest bed shear {units.from_si('shear', float(shear[worst])):.3g} {units.label('shear')} "
                   f"(line {inventory.lines[worst]}, id {inventory.id_at(worst)!r})")
    for message in result.messages[:MAX_MESSAGES]:
        out.append(f"  note: {message}")
    if len(result.messages) > MAX_MESSAGES:
        out.append(f"  note: ... and {len(result.messages) - MAX_MESSAGES} more notes of this kind")
    if np.isfinite(result.normal_depth).any():
        fb = units.from_si("length", hec15.MIN_FREEBOARD)
        out.append(f"  freeboard: not checked (an inventory has no ditch depth); each open ditch needs at least "
                   f"its normal depth plus {fb:.2g} {units.label('length')} ({provenance.cite('freeboard')}; local "
                   "codes govern), and where the flow is supercritical at least twice its normal depth "
                   f"(waves, {provenance.cite('supercritical_waves')})")
    out.append("  results assist design: a licensed engineer checks them against local codes")
    duplicated = inventory.duplicate_ids()
    if duplicated:
        out.append(f"  note: {len(duplicated):,} id{'s' if len(duplicated) > 1 else ''} appear more than once "
                   f"(first: {duplicated[0]!r}); every row is still checked")
    blank_ids = inventory.blank_id_count()
    if blank_ids:
        out.append(f"  note: {blank_ids:,} row{'s have' if blank_ids > 1 else ' has'} no id; "
                   "they are still checked and named by line number")
    if inventory.blank_lines:
        out.append(f"  note: {len(inventory.blank_lines):,} blank line{'s' if len(inventory.blank_lines) > 1 else ''} "
                   f"skipped (line {', '.join(map(str, inventory.blank_lines[:5]))}"
                   f"{', ...' if len(inventory.blank_lines) > 5 else ''})")
    guarded = written_rows(inventory)[2]
    if guarded:
        out.append(f"  note: {guarded:,} text cell{'s' if guarded > 1 else ''} starting with =, +, -, @, a tab or a "
                   f"carriage return {'were' if guarded > 1 else 'was'} written to the results with a leading "
                   "apostrophe (') so that a spreadsheet shows the text instead of running it as a formula; "
                   "numbers such as -1.5 are written as they are")
    return "\n".join(out)


def _duplicates(ids):
    seen, dup = set(), []
    if len(set(ids)) == len(ids):
        return dup
    for i in (t.strip() for t in ids):
        if i and i in seen and i not in dup:
            dup.append(i)
        seen.add(i)
    return dup


PLOT_FORMATS = (".png", ".pdf", ".svg")


def plot_summary(result: hb.BatchResult, path, title: str = "Ditch inventory") -> None:
    """Save a two-panel summary figure: reaches per verdict, and the distribution of shear ratio.

    The format follows the suffix of ``path`` (PNG, PDF or SVG). Uses
    matplotlib's Agg canvas, so no display is needed.
    """
    path = Path(path)
    if path.suffix.lower() not in PLOT_FORMATS:
        raise InventoryError(f"plot {path}: the name must end in {', '.join(PLOT_FORMATS)}")
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    fig = Figure(figsize=(10, 4.2), layout="constrained")
    FigureCanvasAgg(fig)
    ax1, ax2 = fig.subplots(1, 2, width_ratios=(1.1, 1))
    counts = result.counts()
    colours = {"stable": "#3a7d44", "unstable": "#c0392b", "non-erodible": "#5d6d7e", "hydraulics-only": "#95a5a6",
               "not-checked": "#b7950b",
               "no-solution": "#8e44ad", "invalid": "#34495e"}
    labels = list(counts)
    bars = ax1.barh([Verdict.from_token(v).words for v in labels[::-1]], [counts[v] for v in labels[::-1]],
                    color=[colours[v] for v in labels[::-1]])
    ax1.bar_label(bars, labels=[f"{counts[v]:,}" for v in labels[::-1]], padding=3)
    ax1.set_xlabel("reaches")
    ax1.xaxis.get_major_locator().set_params(integer=True)
    ax1.set_title(f"Reaches by verdict ({len(result):,} in all)")
    ax1.margins(x=0.15)
    ratio = result.shear_ratio
    ratio = ratio[~np.isnan(ratio)]
    finite = ratio[np.isfinite(ratio) & (ratio > 0)]
    if finite.size:
        # Ratios span decades (a riprap ditch on a flat grade to bare soil on a steep one): log bins.
        lo, hi = min(float(finite.min()), 0.5), max(float(finite.max()), 2.0)
        bins = np.geomspace(lo, hi * 1.0001, 41)
        ax2.hist(finite, bins=bins, color="#2e86c1")
        ax2.set_xscale("log")
        ax2.axvline(1.0, color="#c0392b", linestyle="--", label="design shear = permissible")
        ax2.legend(loc="upper right")
        held = ratio.size - finite.size
        ax2.set_ylabel("reaches")
    else:
        message = ("no reach has a permissible shear\nto compare its design shear with" if not ratio.size else
                   f"{ratio.size:,} reaches with stone that\ncannot rest on its side slopes")
        ax2.text(0.5, 0.5, message, transform=ax2.transAxes, ha="center", va="center")
        ax2.set_yticks([])
    ax2.set_xlabel("design / permissible shear (1 / safety factor)")
    held = ratio.size - finite.size if finite.size else 0
    ax2.set_title("Distribution of shear ratio" + (f"\n({held:,} not shown: stone cannot rest on the sides)"
                                                   if held else ""), fontsize=None if not held else 10)
    fig.suptitle(title)
    fig.savefig(path)


# ----------------------------------------------------------------------------- for the window

def _row_fields(inventory: Inventory, i: int) -> list:
    return _fields(inventory.rows[i])


@dataclass
class BatchRun:
    """An inventory with its results, for the desktop window."""

    inventory: Inventory
    result: hb.BatchResult

    def table(self):
        """(columns, rows) of text; see :func:`result_table`."""
        return result_table(self.inventory, self.result)

    def problems(self):
        return problem_rows(self.inventory, self.result)

    def summary(self) -> str:
        return summary(self.inventory, self.result)

    def select(self, verdicts=None, warnings=None, text: str = "") -> np.ndarray:
        """Row indices for a filtered view: any of ``verdicts`` (None: all), carrying any of
        ``warnings`` (keys of hydraulics.batch.WARNINGS; None: no condition), and ``text``
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
        from .project import Channel, FlowBasis, LiningChoice

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
            fields = _row_fields(inv, i) if extra else []
            notes = "; ".join(f"{name}: {fields[j]}" for j, name in extra if j < len(fields) and fields[j])
            channels.append(Channel(name=inv.id_at(i) or f"line {inv.lines[i]}",
                                    flow=FlowBasis("typed", float(r.flow[i])), slope=float(r.slope[i]),
                                    section=section, lining=lining,
                                    manning_n=value(r.n, i), notes=notes))
        return channels, skipped


def run_inventory(path, units: str = "us", progress=None, catalogue=None) -> BatchRun:
    """Read and check the inventory at ``path``; ``progress(done, total)`` is called as it goes.

    Raises InventoryError (whole file unreadable) or InputError (unknown units).
    """
    inventory = read_inventory(path, units)
    return BatchRun(inventory, evaluate(inventory, progress, catalogue))


class ProgressBar:
    """A one-line progress bar on a terminal stream; silent when the stream is not a terminal."""

    def __init__(self, label: str, stream=None, enabled: bool | None = None, width: int = 30):
        self.stream = stream if stream is not None else sys.stderr
        self.enabled = self.stream.isatty() if enabled is None else enabled
        self.label, self.width, self.shown = label, width, False

    def __call__(self, done: int, total: int) -> None:
        if not self.enabled or total <= 0:
            return
        filled = int(self.width * done / total)
        self.stream.write(f"\r{self.label} [{'#' * filled}{'.' * (self.width - filled)}] "
                          f"{100 * done / total:3.0f}% {done:,}/{total:,}")
        self.stream.flush()
        self.shown = True

    def close(self) -> None:
        if self.shown:
            self.stream.write("\n")
            self.stream.flush()
            self.shown = False
