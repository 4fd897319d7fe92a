"""`ditchwright batch` reads, checks and writes an inventory block by block (app.inventory.check_file): the results
file is byte for byte the one the whole file in memory gives, and the summary says the same, whatever the block size
and whichever reader (pyarrow, the csv module) reads each block. The inventories here are invented."""

import csv
import functools
import io

import numpy as np
import pytest

from app import inventory as ai
from app.inventory import reading, writing
from app.main import main
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

HEADER = list(ai.INPUT_COLUMNS) + ["road"]


def mixed_rows(size, seed=3):
    """Invented reaches: own n, riprap of several sizes with and without n, grass, concrete, pipes too small for
    their flow, and bad rows of several kinds (negative flow, text for a number, an unknown lining, a formula-like
    cell, blank and repeated ids)."""
    rng = np.random.default_rng(seed)
    rows = []
    for i in range(size):
        kind = ["trapezoid", "triangle", "rectangle", "circle"][i % 4]
        r = {"id": f"M{i}", "shape": kind, "slope": f"{10 ** rng.uniform(-3.5, -1.3):.5g}",
             "flow": f"{10 ** rng.uniform(-1, 1.8):.4g}", "road": f"road {i % 5}"}
        if kind in ("trapezoid", "rectangle"):
            r["bottom_width"] = f"{rng.uniform(1, 6):.1f}"
        if kind in ("trapezoid", "triangle"):
            r["left_slope"], r["right_slope"] = "3", f"{rng.choice([2, 3, 4])}"
        if kind == "circle":
            r["diameter"], r["flow"] = f"{rng.choice([1.0, 1.5, 2.0])}", f"{rng.uniform(0.1, 12):.3g}"
        pick = i % 10
        if kind != "circle" and pick in (1, 2, 3):
            r["lining"], r["d50"] = "riprap", f"{rng.choice([0.3, 0.5, 0.75, 1.0]):g}"
            if pick == 3:
                r["n"] = "0.035"
        elif kind != "circle" and pick == 4:
            r["lining"] = "grass_good_sod"
        elif kind != "circle" and pick == 5:
            r["lining"], r["n"] = "concrete", "0.015"
        else:
            r["n"] = f"{rng.choice([0.013, 0.022, 0.035])}"
        rows.append(r)
    rows[5]["flow"] = "-3"
    rows[11]["slope"] = "1,5"
    rows[17]["lining"] = "no_such_lining"
    rows[23]["road"] = "=SUM(A1)"
    rows[29]["id"] = " "
    rows[31]["id"] = "M3"
    rows[size - 2]["id"] = " M7 "
    rows[size - 1]["flow"] = "lots"
    return rows


def write_csv(path, rows, quoted=False, line_end="\n", blank_lines=(), ragged=None):
    buf = io.StringIO()
    writer = csv.writer(buf, lineterminator=line_end, quoting=csv.QUOTE_MINIMAL)
    writer.writerow(HEADER)
    for r in rows:
        writer.writerow([r.get(c, "") for c in HEADER])
    lines = buf.getvalue().split(line_end)
    for at in sorted(blank_lines, reverse=True):
        lines.insert(at, "")
    if ragged is not None:
        lines[ragged] += ",extra"
    if quoted:   # a comma inside a field: the file quotes that field and the csv module reads every block
        lines[3] = lines[3].replace("road 2", '"road 2, east"').replace("road 3", '"road 3, east"')
    path.write_text(line_end.join(lines), encoding="utf-8", newline="")


def whole_file(path, target, units="us"):
    inventory = ai.read_inventory(path, units)
    result = ai.evaluate(inventory, catalogue=SHIPPED)
    ai.write_results(target, inventory, result)
    return inventory, result


FILES = {"plain": {}, "quoted": {"quoted": True}, "crlf blank lines ragged": {"line_end": "\r\n",
                                                                             "blank_lines": (4, 40, 41),
                                                                             "ragged": 60}}


@pytest.mark.parametrize("rows", [1, 7, 64, 5000])
@pytest.mark.parametrize("kind", list(FILES))
def test_streamed_results_are_the_bytes_of_the_whole_file(tmp_path, kind, rows):
    source = tmp_path / "inv.csv"
    write_csv(source, mixed_rows(300), **FILES[kind])
    inventory, result = whole_file(source, tmp_path / "whole.csv")
    tally = ai.check_file(source, tmp_path / "streamed.csv", rows=rows, problems=10, catalogue=SHIPPED)
    assert (tmp_path / "streamed.csv").read_bytes() == (tmp_path / "whole.csv").read_bytes()
    assert tally.counts() == result.counts() and len(tally) == len(inventory) == 300
    assert tally.problems == ai.problem_rows(inventory, result)[:10]
    assert tally.problem_count == len(ai.problem_rows(inventory, result))
    expected = ai.summary(inventory, result).splitlines()
    got = tally.summary().splitlines()
    if rows < len(inventory):   # notes on groups of reaches give a relation's range over the reaches checked together
        expected = [t for t in expected if not t.startswith("  note: lining")]
        got = [t for t in got if not t.startswith("  note: lining")]
    assert got == expected
    assert "2 ids appear more than once (first: 'M3')" in "\n".join(got)
    assert "1 text cell starting with" in "\n".join(got) and "1 row has no id" in "\n".join(got)


def test_blocks_carry_the_file_line_numbers(tmp_path):
    source = tmp_path / "inv.csv"
    write_csv(source, mixed_rows(50), line_end="\r\n", blank_lines=(1, 20))
    whole = ai.read_inventory(source, "us")
    blocks = list(ai.read_blocks(source, "us", rows=6))
    assert np.concatenate([b.lines for b in blocks]).tolist() == whole.lines.tolist()
    assert sum((b.blank_lines for b in blocks), []) == whole.blank_lines == [2, 22]
    assert sum((b.ids for b in blocks), []) == whole.ids


@pytest.mark.parametrize("read_bytes", [64, 1000, 1 << 22])
def test_the_block_reader_hands_on_where_each_blocks_line_feeds_are(tmp_path, monkeypatch, read_bytes):
    """The parser takes the line feeds the block reader has found instead of looking for them again: they are
    every line feed of each block, for pieces of the file read smaller and larger than a block."""
    source = tmp_path / "inv.csv"
    write_csv(source, mixed_rows(90))
    monkeypatch.setattr(reading, "READ_BYTES", read_bytes)
    with open(source, "rb") as fh:
        pieces = list(reading._line_blocks(fh, source, 8))
    assert b"".join(p[0] for p in pieces) == source.read_bytes() and len(pieces) == 13   # 8 lines, then 7 each
    for data, _, _, _, feeds in pieces:
        assert feeds.tolist() == np.flatnonzero(np.frombuffer(data, dtype=np.uint8) == ord("\n")).tolist()


def test_a_bad_byte_late_in_the_file_leaves_the_old_results(tmp_path):
    source, target = tmp_path / "inv.csv", tmp_path / "out.csv"
    write_csv(source, mixed_rows(200))
    source.write_bytes(source.read_bytes() + "Z1,trapezoid,2,3,3,,0.004,20,,,0.03,Foss\u00e9\n".encode("cp1252"))
    target.write_text("old results\n", encoding="utf-8")
    with pytest.raises(ai.InventoryError, match=f"{source}:202: not UTF-8 text"):
        ai.check_file(source, target, rows=20, catalogue=SHIPPED)
    assert target.read_text(encoding="utf-8") == "old results\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["inv.csv", "out.csv"]


def test_a_block_that_cannot_be_written_leaves_the_old_results(tmp_path, monkeypatch):
    source, target = tmp_path / "inv.csv", tmp_path / "out.csv"
    write_csv(source, mixed_rows(200))
    target.write_text("old results\n", encoding="utf-8")
    pieces = writing._results_pieces
    calls = []

    def failing(*args):
        calls.append(1)
        if len(calls) == 3:
            raise OSError(28, "No space left on device")
        return pieces(*args)
    monkeypatch.setattr(writing, "_results_pieces", failing)
    with pytest.raises(OSError, match="No space"):
        ai.check_file(source, target, rows=30, catalogue=SHIPPED)
    assert target.read_text(encoding="utf-8") == "old results\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["inv.csv", "out.csv"]


def test_ctrl_c_half_way_is_one_line_and_leaves_the_old_results(tmp_path, capsys, monkeypatch):
    """Interrupted by the user (Ctrl+C) after two blocks: no traceback, exit status 130 (128 + SIGINT, as shells
    report it; common practice), the old results file as it was and no half-written file beside it."""
    from hydraulics import many_reaches as mr

    source, target = tmp_path / "inv.csv", tmp_path / "out.csv"
    write_csv(source, mixed_rows(120))
    target.write_text("old results\n", encoding="utf-8")
    monkeypatch.setattr(ai, "check_file", functools.partial(ai.check_file, rows=25))   # blocks of 25 reaches
    evaluate, calls = mr.evaluate, []

    def interrupted(*args, **kwargs):
        calls.append(1)
        if len(calls) == 3:
            raise KeyboardInterrupt
        return evaluate(*args, **kwargs)
    monkeypatch.setattr(mr, "evaluate", interrupted)
    assert main(["batch", str(source), "-o", str(target), "--no-progress"]) == 130
    err = capsys.readouterr().err
    assert err == "ditchwright batch: interrupted; a file it was writing is left as it was\n"
    assert target.read_text(encoding="utf-8") == "old results\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["inv.csv", "out.csv"]


def test_an_empty_file_is_refused_before_anything_is_written(tmp_path):
    source, target = tmp_path / "inv.csv", tmp_path / "out.csv"
    source.write_text("\n\n", encoding="utf-8")
    with pytest.raises(ai.InventoryError, match="the file is empty"):
        ai.check_file(source, target, catalogue=SHIPPED)
    assert not target.exists()


def test_a_header_only_file_gives_a_header_only_results_file(tmp_path):
    source, target = tmp_path / "inv.csv", tmp_path / "out.csv"
    source.write_text(",".join(HEADER) + "\n", encoding="utf-8")
    tally = ai.check_file(source, target, catalogue=SHIPPED)
    assert len(tally) == 0 and target.read_text(encoding="utf-8").startswith(",".join(HEADER) + ",normal_depth")


def test_the_command_reports_rows_a_second_and_the_same_file(tmp_path, capsys, monkeypatch):
    source = tmp_path / "inv.csv"
    write_csv(source, mixed_rows(120))
    whole_file(source, tmp_path / "whole.csv")
    monkeypatch.setattr(ai, "check_file", functools.partial(ai.check_file, rows=25))   # blocks of 25 reaches
    assert main(["batch", str(source), "-o", str(tmp_path / "out.csv"), "--no-progress"]) == 1   # bad rows
    out = capsys.readouterr()
    assert (tmp_path / "out.csv").read_bytes() == (tmp_path / "whole.csv").read_bytes()
    assert "120 reaches in" in out.out and " rows a second)" in out.out
    assert f"{source}:7 (id 'M5'): invalid: flow" in out.err


def test_the_batch_command_asks_for_one_heap_before_its_imports(tmp_path, monkeypatch):
    """`ditchwright batch` asks for one heap for all its threads and pyarrow's buffers (app.cli.heap), other
    commands do not; on Linux with glibc the C library takes it (mallopt returns 1 on success, as glibc's own test
    malloc/tst-mallopt.c checks it)."""
    import os
    import sys

    from app.cli import heap

    asked = []
    monkeypatch.setattr(heap, "share_one_heap", lambda: asked.append(True) or True)
    source = tmp_path / "inv.csv"
    write_csv(source, mixed_rows(40))
    main(["batch", str(source), "-o", str(tmp_path / "out.csv"), "--no-progress"])
    assert asked == [True]
    main(["calc", "--units", "si", "--bottom-width", "0.6", "--side-slope", "3", "--slope", "0.01", "--flow", "0.2",
          "--n", "0.015"])
    assert asked == [True]
    monkeypatch.undo()
    glibc = sys.platform.startswith("linux") and (os.confstr("CS_GNU_LIBC_VERSION") or "").startswith("glibc")
    before = os.environ.pop("ARROW_DEFAULT_MEMORY_POOL", None)
    try:
        assert heap.share_one_heap() is glibc
        # pyarrow's buffers from the C heap too ("system": pyarrow.system_memory_pool, "a memory pool based on the
        # C malloc heap", as the Arrow documentation names it), read by pyarrow when it is loaded
        assert os.environ.get("ARROW_DEFAULT_MEMORY_POOL") == ("system" if glibc else None)
    finally:
        os.environ.pop("ARROW_DEFAULT_MEMORY_POOL", None)
        if before is not None:
            os.environ["ARROW_DEFAULT_MEMORY_POOL"] = before
