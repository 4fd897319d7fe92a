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
            parts[3::5] = map({v: v + "," for v in set(verdicts)}.__getitem__, verdicts)
            parts[4::5] = map(quoted.__getitem__, reasons)
            parts[2::5] = pending.result().tolist()
            return [head, "".join(parts).encode("utf-8")]
        pa = modules[0]
        rows = _row_array(pa, inventory)
        verdict_texts = _cells(pa, result.verdict, ",")
        reason_texts = _reason_cells(pa, result)
        numbers = pending.result()
    return [head, _joined_lines(pa, rows, numbers, verdict_texts, reason_texts)]


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


def _reason_cells(pa, result: mr.BatchResult):
    """The reason cells of ``result`` as a results file writes them, each followed by a line end: a pyarrow
    large_string array: each reason guarded (:func:`app.files.spreadsheet_safe`) and quoted as CSV quotes it
    (:func:`_quote_field`), built in C++ from the reasons'
    texts (:func:`_joined_reasons`) without making a Python string per reach in the thread that checks the next
    block.

    A cell is quoted where any of its texts holds a comma, a quote or a line break (the separator holds none),
    its quotes doubled in each text; a cell a spreadsheet would run as a formula (rare: reasons start with words)
    is made again from ``result.reason_at`` with its apostrophe (:func:`app.files.spreadsheet_safe`)."""
    import pyarrow.compute as pc

    text = pa.large_string()
    cells = []
    start = 0
    for reasons in result.reasons:
        joined, quoted, risky = _joined_reasons(pa, reasons, quote=True)
        marks = pa.array(quoted.astype(np.int8))
        cell = pc.binary_join_element_wise(
            pa.DictionaryArray.from_arrays(marks, pa.array(["", '"'], type=text)).cast(text), joined,
            pa.DictionaryArray.from_arrays(marks, pa.array(["\n", '"\n'], type=text)).cast(text),
            pa.scalar("", type=text))
        risky = np.flatnonzero(risky)
        if len(risky):
            again = [_quote_field(spreadsheet_safe(r)) + "\n" for r in result.reason_at(risky + start).tolist()]
            fixed = np.asarray(cell.to_numpy(zero_copy_only=False), dtype=object)
            fixed[risky] = again
            cell = pa.array(fixed, type=text)
        cells.append(cell)
        start += len(reasons)
    return cells[0] if len(cells) == 1 else pa.concat_arrays(cells)


def _joined_reasons(pa, reasons, quote: bool = False):
    """(the reasons of ``reasons`` (a :class:`hydraulics.batch_reasons.Reasons`) as a pyarrow large_string array,
    each joined from its texts in C++; two bool arrays: where a text of the reason holds a comma, a quote or a
    line break, and where the reason starts as a spreadsheet formula does). With ``quote``, the quotes of every
    text are doubled, as CSV writes them inside a quoted cell.

    Each part's distinct texts go into one array; every (row, text) pair is listed, in row order and, within a
    row, in the order the reason reads (a stable sort of the parts' rows); the texts are gathered into a list per
    row, and each list is joined with the separator."""
    import pyarrow.compute as pc

    text = pa.large_string()
    texts, rows, codes, count = [], [], [], 0
    for at, said in reasons.parts():
        if isinstance(said, str):
            distinct, which = pa.array([said], type=text), np.zeros(len(at), dtype=np.intp)
        elif isinstance(said, Coded):
            distinct, which = pa.array(said.texts, type=text), said.which
        elif isinstance(said, Composed):   # its pieces put together row by row
            distinct, which = pc.binary_join_element_wise(
                *(pa.scalar(p, type=text) if isinstance(p, str) else pc.take(pa.array(p.texts, type=text), p.which)
                  for p in said.pieces), pa.scalar("", type=text)), np.arange(len(at))
        else:
            distinct, which = pa.array(said, type=text), np.arange(len(at))
        kept = ~np.asarray(pc.equal(distinct, ""), dtype=bool)[which]     # an empty text adds nothing
        texts.append(distinct)
        rows.append(at[kept])
        codes.append(which[kept] + count)
        count += len(distinct)
    dictionary = pa.concat_arrays(texts)
    special = np.asarray(pc.match_substring_regex(dictionary, '[,"\n\r]'), dtype=bool)
    formula = np.asarray(pc.match_substring_regex(dictionary, _FORMULA_START), dtype=bool)
    if quote:
        dictionary = pc.replace_substring(dictionary, '"', '""')
    rows, codes = np.concatenate(rows), np.concatenate(codes)
    order = np.argsort(rows, kind="stable")
    rows, codes = rows[order], codes[order]
    offsets = np.zeros(len(reasons) + 1, dtype=np.int64)
    np.cumsum(np.bincount(rows, minlength=len(reasons)), out=offsets[1:])
    values = pc.take(dictionary, pa.array(codes))
    joined = pc.binary_join(pa.LargeListArray.from_arrays(pa.array(offsets), values), pa.scalar(SEPARATOR, type=text))
    quoted = np.bincount(rows, weights=special[codes], minlength=len(reasons)) > 0
    said = offsets[1:] > offsets[:-1]
    starts = np.zeros(len(reasons), dtype=bool)
    starts[said] = formula[codes[offsets[:-1][said]]]     # a reason's first text decides
    return joined, quoted, starts


#: A cell that starts as a spreadsheet formula does (app.files.FORMULA_STARTS), as a regular expression.
_FORMULA_START = "^[" + "".join(sorted(FORMULA_STARTS)).replace("-", "\\-") + "]"


def _cells(pa, values: np.ndarray, end: str):
    """The text cells ``values`` (an object array of str, texts that need no CSV quotes, such as the verdicts) as
    written, each followed by ``end``: a pyarrow dictionary array, each distinct text made once. A cell a
    spreadsheet would run as a formula gets its apostrophe (:func:`app.files.spreadsheet_safe`).

    The distinct texts are found by pyarrow's compute functions, in C++ and mostly without the interpreter lock, so
    that the writer's thread leaves the lock to the check of the next block."""
    import pyarrow.compute as pc

    text = pa.large_string()
    coded = pc.dictionary_encode(pa.array(values, type=text))
    cells = coded.dictionary
    risky = pc.match_substring_regex(cells, _FORMULA_START)
    if pc.any(risky).as_py():   # rare (results texts start with words): the few that do, one by one
        cells = pa.array([spreadsheet_safe(c) for c in cells.to_pylist()], type=text)
    cells = pc.binary_join_element_wise(cells, pa.scalar(end, type=text), pa.scalar("", type=text))
    return pa.DictionaryArray.from_arrays(coded.indices, cells)


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
