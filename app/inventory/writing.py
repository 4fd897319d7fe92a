"""Writing the results of an inventory: the input rows with the result columns added, UTF-8.

Every input row is carried through as written, except that a cell a
spreadsheet would run as a formula gets a leading apostrophe
(:func:`app.files.spreadsheet_safe`). Numbers are in the inventory's units
with :data:`DIGITS` significant digits. Files are replaced atomically: a
half-written file never replaces a good one. With pyarrow the lines are
joined in C++ from the file's own bytes; without it, in Python: the same
bytes either way.
"""

from __future__ import annotations

import csv
import io
import os
from concurrent.futures import ThreadPoolExecutor
from contextlib import contextmanager, nullcontext
from itertools import repeat

import numpy as np

from hydraulics import many_reaches as mr
from hydraulics.batch_reasons import SEPARATOR, Coded, Composed

from ..files import FORMULA_STARTS, atomic_writer, spreadsheet_safe, write_atomic
from ..numtext import format_rows_parallel
from . import reading
from .reading import RESULT_COLUMNS, Inventory, Records, csv_fields, csv_line

#: Significant digits of the numbers written (more than any inventory's inputs carry).
DIGITS = 5
_VALUE_COLUMNS = tuple(mr.RESULT_FIELDS)  # the numeric result columns, in output order


def _quote_field(text: str) -> str:
    if "," in text or '"' in text or "\n" in text or "\r" in text:
        return '"' + text.replace('"', '""') + '"'
    return text


def display_values(inventory: Inventory, result: mr.BatchResult) -> dict:
    """The numeric result columns in the inventory's units (nan where blank)."""
    return {k: inventory.units.from_si(q, getattr(result, k)) if q not in ("ratio",) else getattr(result, k)
            for k, q in mr.RESULT_FIELDS.items()}


def format_results(inventory: Inventory, result: mr.BatchResult) -> str:
    """The results file as text: the input rows with the result columns added.

    Numbers are written as Python's ``"%.5g"`` writes them (:data:`DIGITS`
    significant digits; :func:`app.numtext.format_rows` does it on whole
    arrays); a value not computed is an empty field. The reason is quoted
    where it holds a comma, a quote or a line break.
    """
    return _results_bytes(inventory, result).decode("utf-8")


def _results_bytes(inventory: Inventory, result: mr.BatchResult) -> bytes:
    """The results file, UTF-8: each row is its input text, the numbers, the verdict and the reason."""
    return b"".join(_results_pieces(inventory, result))


def _number_table(inventory: Inventory, result: mr.BatchResult) -> np.ndarray:
    """The numeric result columns in the inventory's units, one row per reach of ``result``."""
    values = display_values(inventory, result)
    return np.column_stack([values[k] for k in _VALUE_COLUMNS]) if len(result) else np.zeros((0, len(_VALUE_COLUMNS)))


def _workers() -> int:
    return min(2, os.cpu_count() or 1)


def _results_pieces(inventory: Inventory, result: mr.BatchResult) -> list:
    """The results file as a few bytes-like pieces to be written one after the other (no copy joins them)."""
    size = len(inventory)
    head = _results_head(inventory)
    # The numbers are formatted by worker threads (numpy work, without the GIL) while this thread makes
    # the verdict and reason texts (Python work, with it): on two cores the two overlap.
    workers = _workers()
    with ThreadPoolExecutor(workers) if workers > 1 else nullcontext() as pool:
        pending = format_rows_parallel(_number_table(inventory, result), DIGITS, comma_after_last=True, pool=pool,
                                       parts=4 * workers)
        modules = reading.pyarrow_modules()
        if modules is None or not size:
            reasons = result.reason.tolist()
            verdicts = result.verdict.tolist()
            quoted = {r: _quote_field(spreadsheet_safe(r)) + "\n" for r in set(reasons)}
            parts = [""] * (5 * size)
            rows = written_rows(inventory)[0]
            parts[0::5] = rows.tolist() if isinstance(rows, Records) else rows
            parts[1::5] = repeat(",", size)
            parts[3::5] = map({v: spreadsheet_safe(v) + "," for v in set(verdicts)}.__getitem__, verdicts)
            parts[4::5] = map(quoted.__getitem__, reasons)
            parts[2::5] = pending.result().tolist()
            return [head, "".join(parts).encode("utf-8")]
        gather = _lines(modules[0], inventory, result)
        numbers = pending.result()
    return [head, gather(numbers)]


def _safe_record(row: str) -> tuple[str, int]:
    """(the CSV record ``row`` with every formula-like cell given an apostrophe, how many were)."""
    fields = csv_fields(row)
    safe = [spreadsheet_safe(f) for f in fields]
    changed = sum(a is not b for a, b in zip(safe, fields))
    return (csv_line(safe), changed) if changed else (row, 0)


def guarded_cells(row: str) -> int:
    """How many cells of the CSV record ``row`` a results file writes with a leading apostrophe."""
    return _safe_record(row)[1]


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


def _row_pieces(pa, inventory: Inventory):
    """Every input row's text as a pyarrow large_string array, shifted by one line end: the first row alone, every
    later one after the line end of the one before ("\\n" + row). So a results line ends where the next row's piece
    begins, and the pieces of a plain file are its own bytes, with no copy."""
    records, size = written_rows(inventory)[0], len(inventory)
    text = pa.large_string()
    if isinstance(records, Records):   # every line of the body ends in "\n"; the last one is left out
        ends = np.append(records.starts[1:] - 1, len(records.body) - 1).astype(np.int64)
        return pa.LargeStringArray.from_buffers(size, pa.py_buffer(np.append(0, ends)), pa.py_buffer(records.body))
    return pa.array([row if i == 0 else "\n" + row for i, row in enumerate(records)], type=text)


def _lines(pa, inventory: Inventory, result: mr.BatchResult):
    """The results lines of a block, all but the numbers: ``gather(numbers)`` gives the lines' bytes once the
    numbers' texts (:class:`app.numtext.RowTexts`, each followed by a comma) are in.

    Every line is a run of pieces, each a text of one pyarrow array of every distinct piece: the row
    (:func:`_row_pieces`), a comma, its numbers, its verdict with a comma, and its reason: the reason's texts
    (:func:`_reason_texts`) with the separator between two, in quotes where one of them holds a comma, a quote or a
    line break (RFC 4180, Section 2, rules 6 and 7: a quote inside doubled), and the final line end. One ``take``
    of that array, in C++ and outside the interpreter lock, writes the pieces one after the other: its text is the
    block's bytes. A reason that would start as a spreadsheet formula (rare: reasons start with words) is made
    whole in Python with its apostrophe (:func:`app.files.spreadsheet_safe`), a piece of its own."""
    import pyarrow.compute as pc

    text = pa.large_string()
    size = len(inventory)
    rows = _row_pieces(pa, inventory)
    coded = pc.dictionary_encode(pa.array(result.verdict, type=text))
    verdicts = pa.array([spreadsheet_safe(v) + "," for v in coded.dictionary.to_pylist()], type=text)
    texts, at, which, special, formula = _reason_texts(pa, result)
    count = np.bincount(at, minlength=size)
    first = np.zeros(size + 1, dtype=np.int64)
    np.cumsum(count, out=first[1:])
    quoted = np.bincount(at, weights=special[which], minlength=size) > 0
    said = count > 0
    risky = np.zeros(size, dtype=bool)
    risky[said] = formula[which[first[:-1][said]]]     # a reason's first text decides
    fixed = np.flatnonzero(risky)
    if len(fixed):
        keep = ~risky[at]
        at, which = at[keep], which[keep]
        count[fixed] = 0
        quoted[fixed] = False
        first[1:] = np.cumsum(count)
    # The pieces, numbered as the array of them holds them: numbers, rows, marks, verdicts, texts, made reasons.
    row0, mark0 = size, 2 * size
    comma, quote, separator, line_end = mark0, mark0 + 1, mark0 + 2, mark0 + 3
    verdict0 = mark0 + 4
    text0 = verdict0 + len(verdicts)
    fixed0 = text0 + len(texts)
    marks = pa.array([",", '"', SEPARATOR, "\n"], type=text)
    made = pa.array([_quote_field(spreadsheet_safe(r)) for r in result.reason_at(fixed).tolist()], type=text)

    length = 4 + 2 * quoted + np.maximum(2 * count - 1, 0) + risky
    start = np.zeros(size + 1, dtype=np.int64)
    np.cumsum(length, out=start[1:])
    codes = np.empty(start[-1] + 1, dtype=np.int64)
    begin, index = start[:-1], np.arange(size, dtype=np.int64)
    codes[begin] = index + row0
    codes[begin + 1] = comma
    codes[begin + 2] = index
    codes[begin + 3] = np.asarray(coded.indices, dtype=np.int64) + verdict0
    codes[begin[quoted] + 4] = quote
    codes[start[1:][quoted] - 1] = quote
    codes[begin[fixed] + 4] = fixed0 + np.arange(len(fixed))
    rank = np.arange(len(at), dtype=np.int64) - first[at]        # each text's place in its reason
    place = begin[at] + 4 + quoted[at] + 2 * rank
    codes[place] = which + text0
    codes[place[rank > 0] - 1] = separator
    codes[-1] = line_end
    others = [rows, marks, verdicts, texts, made]

    def gather(numbers) -> memoryview:
        number_texts = pa.LargeStringArray.from_buffers(size, pa.py_buffer(numbers.offsets()),
                                                        pa.py_buffer(numbers.data))
        lines = pc.take(pa.concat_arrays([number_texts, *others]), pa.array(codes))
        offsets = np.frombuffer(lines.buffers()[1], dtype=np.int64, count=len(codes) + 1, offset=8 * lines.offset)
        return memoryview(lines.buffers()[2])[offsets[0]:offsets[-1]]

    return gather


def _reason_texts(pa, result: mr.BatchResult):
    """The texts of every reason of ``result`` in reading order: (the distinct texts, a pyarrow large_string array,
    each quote in them doubled as CSV writes it inside a quoted cell; for every (row, text) pair in row order and,
    within a row, in the order the reason reads: the row and the text's index; two bool arrays over the distinct
    texts: which hold a comma, a quote or a line break, and which start as a spreadsheet formula does). An empty
    text adds nothing and is left out."""
    import pyarrow.compute as pc

    text = pa.large_string()
    texts, rows, codes, count, shift = [], [], [], 0, 0
    for reasons in result.reasons:
        for at, said in reasons.parts():
            if isinstance(said, str):
                distinct, which = pa.array([said], type=text), np.zeros(len(at), dtype=np.intp)
            elif isinstance(said, Coded):
                distinct, which = pa.array(said.texts, type=text), said.which
            elif isinstance(said, Composed):   # its pieces put together row by row
                distinct, which = pc.binary_join_element_wise(
                    *(pa.scalar(p, type=text) if isinstance(p, str) else pc.take(pa.array(p.texts, type=text),
                                                                                 p.which)
                      for p in said.pieces), pa.scalar("", type=text)), np.arange(len(at))
            else:   # one str per row, many alike: each distinct one held once
                coded = pc.dictionary_encode(pa.array(said, type=text))
                distinct, which = coded.dictionary, np.asarray(coded.indices, dtype=np.intp)
            kept = ~np.asarray(pc.equal(distinct, ""), dtype=bool)[which]     # an empty text adds nothing
            texts.append(distinct)
            rows.append(at[kept] + shift)
            codes.append(which[kept] + count)
            count += len(distinct)
        shift += len(reasons)
    distinct = pa.concat_arrays(texts) if texts else pa.array([], type=text)
    special = np.asarray(pc.match_substring_regex(distinct, '[,"\n\r]'), dtype=bool)
    formula = np.asarray(pc.match_substring_regex(distinct, _FORMULA_START), dtype=bool)
    rows = np.concatenate(rows) if rows else np.zeros(0, dtype=np.intp)
    codes = np.concatenate(codes) if codes else np.zeros(0, dtype=np.intp)
    order = np.argsort(rows, kind="stable")
    return pc.replace_substring(distinct, '"', '""'), rows[order], codes[order], special, formula


#: A cell that starts as a spreadsheet formula does (app.files.FORMULA_STARTS), as a regular expression.
_FORMULA_START = "^[" + "".join(sorted(FORMULA_STARTS)).replace("-", "\\-") + "]"


def write_results(path, inventory: Inventory, result: mr.BatchResult) -> None:
    """Write the results file atomically (a half-written file never replaces a good one), UTF-8."""
    write_atomic(path, _results_pieces(inventory, result))


def result_table(inventory: Inventory, result: mr.BatchResult):
    """(columns, rows) for a table view: every input column then the result columns, all as text.

    Numbers are in the inventory's units with :data:`DIGITS` significant
    digits, blanks are "". ``result.verdict`` and ``result.flags`` give the
    masks a filter needs.
    """
    text = format_results(inventory, result)
    reader = csv.reader(io.StringIO(text, newline=""))
    columns = next(reader)
    return columns, list(reader)


@contextmanager
def results_stream(path):
    """The results file at ``path`` written block by block: yields ``add(inventory, result)``, called for each
    block of the file in order (see :func:`app.inventory.reading.read_blocks`).

    A worker thread formats, assembles and writes each block (the bytes of :func:`write_results` for it; the
    head once) while the caller reads and checks the next; at most one block waits for it, so memory holds two
    blocks at most. The file replaces ``path`` only when the with-block ends without an error and every block is
    written; otherwise the old file stays as it was.
    """
    # The pool is left before the writer: every block is written (or has failed) before the file is replaced.
    with atomic_writer(path) as fh, ThreadPoolExecutor(1) as pool:
        pending = None

        def write(inventory, result, first):
            pieces = _results_pieces(inventory, result)
            for piece in pieces if first else pieces[1:]:
                fh.write(piece)
            # Each block goes to the disk while the next is checked, not all of them at the end (the file is
            # synced before it replaces the old one); in this thread, which waits without the interpreter lock.
            fh.flush()
            os.fsync(fh.fileno())

        def add(inventory, result):
            nonlocal pending
            first = pending is None
            if not first:
                pending.result()    # a block's error (a full disk, say) is raised here
            pending = pool.submit(write, inventory, result, first)

        yield add
        if pending is not None:
            pending.result()
