"""Reading an inventory: the CSV text, screened, with its reaches in SI.

A plain file (no quotes, no carriage returns, no blank lines, every row as
wide as the header) is read by pyarrow's CSV reader; any other file by the
csv module and Python's float: the same fields, numbers and reasons either
way. The user's units are converted to SI on the way in. Problems of the
file as a whole raise :class:`InventoryError`; problems of one row go into
that reach's note (its reason in the results).
"""

from __future__ import annotations

import csv
import io
import itertools
import math
from dataclasses import dataclass, field
from itertools import repeat
from pathlib import Path

import numpy as np

from hydraulics import many_reaches as mr
from hydraulics.batch_reasons import text_array
from hydraulics import units as hu

# A field as long as a line may be (an id or a note column of any length, quoted or not): the csv module's own
# limit (131,072 characters) refused a valid file, or stopped a GeoPackage output half way. Memory is bounded by
# the blocks read, not by this.
csv.field_size_limit(2**31 - 1)

INPUT_COLUMNS = ("id", "shape", "bottom_width", "left_slope", "right_slope", "diameter", "slope", "flow", "lining",
                 "d50", "n")
RESULT_COLUMNS = ("normal_depth", "critical_depth", "velocity", "froude", "bed_shear", "permissible_shear",
                  "safety_factor", "cost_per_length", "verdict", "reason")
_NUMBER_COLUMNS = tuple(mr.NUMERIC_FIELDS)


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
    reaches: mr.Reaches
    blank_lines: list = field(default_factory=list)
    #: Bytes of the file read up to the end of this block (:func:`read_blocks`; 0 for a whole file).
    end: int = 0
    #: A GeoPackage block's features (a pyarrow Table: attributes as stored, geometry as WKB) and its
    #: :class:`app.inventory.layers.Layer`; None for a CSV inventory.
    features: object = None
    layer: object = None
    # (records as written to a results file, header text as written, cells given an apostrophe): made on first use
    _written: tuple | None = field(default=None, repr=False, compare=False)

    @property
    def row_word(self) -> str:
        """What a row's number is: its "line" in a CSV file, its "feature" id in a GeoPackage layer."""
        return "line" if self.layer is None else "feature"

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

    @property
    def rows(self) -> list:
        """Per record: its fields as CSV text, without the line end."""
        if isinstance(self.records, Records):
            self.records = self.records.tolist()
        return self.records


# ----------------------------------------------------------------------------- reading

def _decode(data: bytes, source: str, lines_before: int = 0, encoding: str = "utf-8-sig") -> str:
    """``data`` as text; ``lines_before``: line ends before it in the file (a block of a file read in blocks)."""
    try:
        return data.decode(encoding)
    except UnicodeDecodeError as exc:
        line = lines_before + data.count(b"\n", 0, exc.start) + 1
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
    return next(_csv_batches(io.StringIO(text, newline=""), source), None)


def _csv_batches(lines, source: str, rows: int | None = None):
    """The records of CSV ``lines`` (an iterable of lines with their line ends) by the csv module, ``rows`` at a
    time (None: all at once): for each batch what :func:`_split_fast` gives; the header is that of the first."""
    reader = csv.reader(lines, strict=True)
    records, numbers, blank, header = [], [], [], None
    start, sent = 1, False

    def batch():
        return header[0], header[1], records, np.array(numbers, dtype=np.int64), blank, \
            np.array([len(f) for f in records], dtype=np.int64)
    try:
        for fields in reader:
            if not fields or (len(fields) == 1 and not fields[0].strip()):
                blank.append(start)
            elif header is None:
                header = (start, fields)
            else:
                records.append(fields)
                numbers.append(start)
                if rows is not None and len(records) == rows:
                    yield batch()
                    records, numbers, blank, sent = [], [], [], True
            start = reader.line_num + 1
    except csv.Error as exc:
        raise InventoryError(f"{source}: line {reader.line_num}: {exc} (check the quotes)") from None
    if header is not None and (records or blank or not sent):
        yield batch()


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
                    ascii_checked: bool = False, line_feeds: np.ndarray | None = None) -> Inventory:
    """Read inventory CSV ``text`` in the unit system ``units`` ("us" or "si").

    ``text`` is a str, or bytes of ASCII text (a file that needs no decoding;
    ``ascii_checked``: the caller has made sure of that; ``line_feeds``: where
    its line feeds are, when the caller has found them already).
    Raises InventoryError for a file that cannot be an inventory (empty, no
    header, missing or duplicated columns) and InputError for unknown units.
    Problems of single rows do not raise: they go into ``reaches.notes``.
    """
    system = hu.system(units)
    if isinstance(text, bytes):
        if not (ascii_checked or text.isascii()):
            raise ValueError("parse_inventory takes bytes of ASCII text only; decode other text first")
        if b"\r" not in text and b'"' not in text:  # the common file: pyarrow reads its bytes as they are
            inventory = _parse_arrow(text, system, source, line_feeds)
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
    return _from_split(split, fast, system, source)


def _from_split(split, fast: bool, system, source: str) -> Inventory:
    """The inventory of the records ``split`` (see :func:`_split_fast`); ``fast``: split at the commas."""
    _, header_fields, records, lines, blank, field_counts = split
    names, index = _check_header(header_fields, source)
    width = len(names)
    size = len(records)
    notes = text_array(size)

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
        rows = [",".join(f) for f in fields] if fast else [csv_line(f) for f in fields]
    header_text = ",".join(header_fields) if fast else csv_line(header_fields)

    col = {name: columns[index[name]] for name in INPUT_COLUMNS}
    unreadable = {}
    numbers = {}
    for name in _NUMBER_COLUMNS:
        values = _numbers(col[name], name, notes, unreadable)
        quantity = mr.NUMERIC_FIELDS[name]
        numbers[name] = values if quantity in ("slope", "side_slope", "manning_n") else system.to_si(quantity, values)
    reaches = mr.Reaches(shape=_texts(col["shape"], lower=True), lining=_texts(col["lining"]), notes=notes,
                         unreadable=unreadable, **numbers)
    return Inventory(source=source, units=system, header=names, header_text=header_text, records=rows, lines=lines,
                     id_values=col["id"], reaches=reaches, blank_lines=blank)


# A file without quotes whose every line is a record of the header's width (no blank lines, no ragged
# rows) is parsed by pyarrow's CSV reader: the same fields, numbers parsed in C++ (fast_float, correctly
# rounded like Python's float). Where it refuses a number (text such as "1,5", " 2" or "1_0", which
# Python's float reads differently or not at all), that column is read by _numbers as before; any
# other surprise leaves the whole file to the reader above. Without pyarrow installed, the reader
# above reads every file.

def pyarrow_modules():
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


def _parse_arrow(data: bytes, system, source: str, line_feeds: np.ndarray | None = None):
    """:func:`parse_inventory` of UTF-8 ``data`` without quotes or carriage returns by pyarrow, or None where
    the Python reader must read it; ``line_feeds``: where the line feeds of ``data`` are (None: found here)."""
    modules = pyarrow_modules()
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
    if line_feeds is not None and data.endswith(b"\n"):   # the block reader has looked at every byte already
        stops = line_feeds[1:] - (end + 1)
    else:
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
    notes = text_array(size)
    unreadable = {}
    numbers = {}
    for name in _NUMBER_COLUMNS:
        values = _arrow_numbers(pa, table.column(col[name]), name, notes, unreadable)
        quantity = mr.NUMERIC_FIELDS[name]
        numbers[name] = values if quantity in ("slope", "side_slope", "manning_n") else system.to_si(quantity, values)
    shape, shape_kinds = _arrow_texts(pa, table.column(col["shape"]), lower=True)
    lining, lining_texts = _arrow_texts(pa, table.column(col["lining"]))
    kind = np.array([mr.SHAPE_CODE.get(t, -1) for t in shape_kinds], dtype=np.int8)[shape]
    named = np.array([bool(t) for t in lining_texts], dtype=bool)[lining]
    reaches = mr.Reaches(shape=np.array(shape_kinds, dtype=object)[shape],
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
            special = not np.isfinite(values).all()
        else:
            special = (np.isinf(values) | (np.isnan(values) & ~column.is_null().to_numpy())).any()
        if not special:  # "nan" and "inf" written as text are refused by _numbers, with its reasons
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


def csv_fields(row: str) -> list:
    """The fields of one CSV record as written (a quoted field may hold a line break of any kind)."""
    return next(csv.reader(io.StringIO(row, newline="")), [])


def csv_line(fields) -> str:
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


# A file read in blocks (``ditchwright batch``): memory bounded by a block, whatever the file's length. Each block
# is read as above, as if it were a file of its own with the header line in front, and its line numbers are moved
# to where the block lies in the file. A file with a double quote anywhere is read by the csv module throughout
# (as a whole file would be: a quoted field may hold a line end, so a block ends only where a record does); any
# other file is cut after a line end, and each block goes to pyarrow or to the csv module by its own content.

#: Records per block of :func:`read_blocks` (a whole number of the core's chunks of the batch).
BLOCK_ROWS = 100_000
#: Bytes read from the file at a time.
READ_BYTES = 1 << 22


def read_blocks(path, units: str = "us", rows: int = BLOCK_ROWS):
    """The inventory file at ``path`` as consecutive :class:`Inventory` blocks of ``rows`` lines at most (records
    of a file that quotes fields), in file order, each with the file's own line numbers; the first holds the
    header's blank lines before it, a block may be empty (blank lines only). The records of all blocks are those
    of :func:`read_inventory` and give the same results; InventoryError as there, raised by the block where the
    problem is (the blocks before it have been read)."""
    path = Path(path)
    system = hu.system(units)
    source = str(path)
    try:
        fh = open(path, "rb")
    except OSError as exc:
        raise InventoryError(f"cannot read {path}: {exc.strerror or exc}") from None
    with fh:
        try:
            quoted = any(b'"' in piece for piece in iter(lambda: fh.read(READ_BYTES), b""))
            fh.seek(0)
        except OSError as exc:
            raise InventoryError(f"cannot read {path}: {exc.strerror or exc}") from None
        pieces = _line_blocks(fh, path, None if quoted else rows + 1)
        if quoted:
            def texts():
                for data, before, _, _, _ in pieces:
                    yield io.StringIO(_decode(data, source, before, "utf-8" if before else "utf-8-sig"), newline="")
            for split in _csv_batches(itertools.chain.from_iterable(texts()), source, rows):
                block = _from_split(split, False, system, source)
                block.end = fh.tell()   # about: the text read ahead of the batch's last record
                yield block
            return
        header = None
        for data, before, lines_before, end, feeds in pieces:
            if header is not None:
                data = header + data
                feeds = np.concatenate([[len(header) - 1], feeds + len(header)])
            if data.isascii():
                block = parse_inventory(data, units, source=source, ascii_checked=True, line_feeds=feeds)
            else:
                block = parse_inventory(_decode(data, source, before - (header is not None),
                                                "utf-8" if header else "utf-8-sig"), units, source=source)
            if header is None:
                header = block.header_text.encode("utf-8") + b"\n"
            elif lines_before > 1:   # in the block's text the header is line 1 and its first line line 2
                block.lines = block.lines + (lines_before - 1)
                block.blank_lines = [b + lines_before - 1 for b in block.blank_lines]
            block.end = end
            yield block


def _line_blocks(fh, path, rows):
    """(bytes, line feeds before them, lines before them, bytes to their end, the offsets of their line feeds in
    them (an array; None where ``rows`` is None)) of the file ``fh``, cut after a line feed: ``rows``
    lines the first block (the header and ``rows - 1`` records), ``rows - 1`` each other one (None: about
    :data:`READ_BYTES` a block). A line end may be a line feed, a carriage return
    followed by one, or a carriage return alone (counted as a line, as :func:`parse_inventory` reads it)."""
    feeds = lines = end = 0
    rest = b""
    found = np.zeros(0, dtype=np.intp)   # where the line feeds of ``rest`` are (each byte is looked at once)
    while True:
        try:
            piece = fh.read(READ_BYTES)
        except OSError as exc:
            raise InventoryError(f"cannot read {path}: {exc.strerror or exc}") from None
        data = rest + piece
        if rows is not None:
            found = np.concatenate([found, np.flatnonzero(np.frombuffer(piece, dtype=np.uint8) == 10) + len(rest)])
        while data:
            if rows is None:
                cut = data.rfind(b"\n") + 1 if piece else len(data)
            else:
                cut = int(found[rows - 1]) + 1 if len(found) >= rows else (0 if piece else len(data))
            if not cut:
                break
            block, data = data[:cut], data[cut:]
            end += cut
            if rows is None:
                block_feeds, at = block.count(b"\n"), None
            else:   # the line feeds before the cut are the block's
                block_feeds = int(np.searchsorted(found, cut))
                at, found = found[:block_feeds], found[block_feeds:] - cut
            yield block, feeds, lines, end, at
            if rows is not None and not lines:
                rows -= 1
            returns = block.count(b"\r") if b"\r" in block else 0   # the usual file has none: a quicker look first
            feeds += block_feeds
            lines += block_feeds + returns - block.count(b"\r\n") if returns else block_feeds
        rest = data
        if not piece:
            if not end:
                yield b"", 0, 0, 0, None    # an empty file: the reader says so
            return

