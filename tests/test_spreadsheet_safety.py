"""Every CSV/TSV the program writes keeps formula-like text as text (issue 18, item 3).

A cell starting with =, +, -, @, a tab or a carriage return is read by spreadsheets as a formula; written with a
leading apostrophe it is shown as text. Numbers, negative ones included, stay numbers.
"""

import csv
import io

import numpy as np
import pytest

from app import inventory as ai
from app.inventory import reading
from app.files import FORMULA_STARTS, spreadsheet_safe, tsv_cell
from app.main import main
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

HEADER = list(ai.INPUT_COLUMNS) + ["owner", "offset"]
ROW = {"shape": "trapezoid", "bottom_width": "2", "left_slope": "3", "right_slope": "3", "slope": "0.004",
       "flow": "20", "n": "0.03"}
# A payload for each trigger character (a carriage return reaches a CSV cell only through a quoted field, which
# the reader turns into a line break, so it is tested on the cell functions below).
PAYLOADS = {"=": '=HYPERLINK("http://example.invalid")', "+": "+cmd|' /C calc'!A0", "-": "-2+3+cmd|' /C calc'!A0",
            "@": "@SUM(1+1)*cmd|' /C calc'!A0", "\t": "\t=1+1"}
NUMBERS = ["-1.5", "+2", "-3e-2", "12", "0.5", "-.25"]


def _csv(rows, header=HEADER) -> str:
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(header)
    for r in rows:
        w.writerow([r.get(c, "") for c in header])
    return buf.getvalue()


def _results(text, monkeypatch=None, pyarrow=True):
    if not pyarrow:
        monkeypatch.setattr(reading, "pyarrow_modules", lambda: None)
    inv = ai.parse_inventory(text, "us")
    res = ai.evaluate(inv, catalogue=SHIPPED)
    written = ai.format_results(inv, res)
    return inv, res, list(csv.DictReader(io.StringIO(written, newline="")))


@pytest.mark.parametrize("trigger", sorted(FORMULA_STARTS))
def test_each_trigger_character_gets_an_apostrophe(trigger):
    assert spreadsheet_safe(trigger + "cmd") == "'" + trigger + "cmd"
    assert tsv_cell(trigger + "cmd").startswith("'")
    assert "\t" not in tsv_cell(trigger + "cmd") and "\r" not in tsv_cell(trigger + "cmd")


@pytest.mark.parametrize("text", NUMBERS + ["", "plain", "D-2", "a=b", "1-2"])
def test_numbers_and_harmless_text_are_left_alone(text):
    assert spreadsheet_safe(text) == text and tsv_cell(text) == text


@pytest.mark.parametrize("trigger", sorted(PAYLOADS), ids=lambda t: repr(t))
@pytest.mark.parametrize("reader", ["pyarrow", "python"])
def test_batch_results_keep_formulas_as_text_in_id_and_carried_columns(trigger, reader, monkeypatch):
    payload = PAYLOADS[trigger]
    rows = [dict(ROW, id=payload, owner=payload, offset="-1.5"), dict(ROW, id="D-2", owner="ok", offset="+2")]
    text = _csv(rows)
    if reader == "pyarrow" and '"' in text:     # the plain-file reader takes only files without quotes
        text = text.replace('"', "")
        payload = payload.replace('"', "")
    inv, res, out = _results(text, monkeypatch, pyarrow=reader == "pyarrow")
    assert out[0]["id"] == "'" + payload and out[0]["owner"] == "'" + payload
    assert out[0]["offset"] == "-1.5" and out[1]["offset"] == "+2" and out[1]["id"] == "D-2"
    assert out[0]["verdict"] == "hydraulics-only" and float(out[0]["normal_depth"]) > 0
    assert inv.id_at(0) == payload.strip()        # the reach keeps its own id; only the written cell changes


def test_a_formula_in_a_column_name_is_kept_as_text():
    header = list(ai.INPUT_COLUMNS) + ["=cmd|' /C calc'!A0"]
    inv, res, out = _results(_csv([dict(ROW, id="A")], header))
    assert "'=cmd|' /C calc'!A0" in out[0]


def test_the_file_written_block_by_block_is_the_same_guarded_file(tmp_path):
    rows = [dict(ROW, id=f"{'=' if i % 3 == 0 else ''}R{i}", owner=f"@o{i}" if i % 5 == 0 else "", offset=str(-i))
            for i in range(40)]
    text = _csv(rows)
    inv = ai.parse_inventory(text, "us")
    expected = ai.format_results(inv, ai.evaluate(inv, catalogue=SHIPPED))
    source = tmp_path / "in.csv"
    source.write_text(text, encoding="utf-8")
    tally = ai.check_file(source, tmp_path / "out.csv", "us", rows=7, catalogue=SHIPPED)
    written = (tmp_path / "out.csv").read_text(encoding="utf-8")
    assert written == expected
    # the cells guarded, counted block by block (each block's count taken one block late, the last one when asked):
    # 14 ids starting with "=" and 8 owners with "@"
    assert tally.guarded == 14 + 8
    out = list(csv.DictReader(io.StringIO(written, newline="")))
    assert [r["id"] for r in out[:4]] == ["'=R0", "R1", "R2", "'=R3"]
    assert out[5]["owner"] == "'@o5" and out[5]["offset"] == "-5"


def test_the_summary_says_so_once_and_only_when_it_happened(tmp_path, capsys):
    src = tmp_path / "inv.csv"
    src.write_text(_csv([dict(ROW, id="=1+1", owner="@x", offset="-1"), dict(ROW, id="B", owner="+y")]),
                   encoding="utf-8")
    assert main(["batch", str(src), "-o", str(tmp_path / "out.csv")]) == 0
    out = capsys.readouterr().out
    assert out.count("apostrophe") == 1 and "3 text cells starting with =, +, -, @" in out
    src.write_text(_csv([dict(ROW, id="A", owner="x", offset="-1")]), encoding="utf-8")
    assert main(["batch", str(src), "-o", str(tmp_path / "out.csv")]) == 0
    assert "apostrophe" not in capsys.readouterr().out


def test_a_file_without_triggers_is_written_byte_for_byte_as_before():
    text = _csv([dict(ROW, id=f"R{i}", owner="x", offset=str(-i)) for i in range(5)])
    inv = ai.parse_inventory(text, "us")
    body = ai.format_results(inv, ai.evaluate(inv, catalogue=SHIPPED))
    lines = text.splitlines()
    assert [line.rsplit(",", len(ai.RESULT_COLUMNS))[0] for line in body.splitlines()[1:]] == lines[1:]
    assert ai.written_rows(inv)[0] is inv.records   # the file's own bytes, untouched


@pytest.mark.parametrize("trigger", sorted(FORMULA_STARTS - {"\t", "\r"}))
def test_a_formula_like_name_in_a_dxf_drawing_is_plain_text(trigger):
    """The DXF text holding a channel's or a run's name carries it as typed, and the drawing holds no FIELD object
    (the DXF way to make text that a CAD program computes), so nothing in it is evaluated."""
    from app import project as pj
    from app.drawings import make_drawings

    project = pj.load(pj.demo_path())
    project.channels, project.runs = project.channels[:1], project.runs[:1]
    project.channels[0].name = PAYLOADS[trigger] + r" %<\AcVar Date>%"
    project.runs[0].name = PAYLOADS[trigger] + " run"
    drawings = make_drawings(project, catalogue=SHIPPED)
    assert len(drawings) == 2
    for drawing, name in zip(drawings, [project.channels[0].name, project.runs[0].name]):
        doc = drawing.document
        texts = [e.dxf.text if e.dxftype() == "TEXT" else e.text for e in doc.modelspace().query("TEXT MTEXT")]
        holding = [t for t in texts if name in t]
        assert holding, texts
        assert len(doc.objects.query("FIELD")) == 0


@pytest.mark.parametrize("quote", [True, False])
def test_result_cells_made_by_pyarrow_are_those_of_the_python_rules(monkeypatch, quote):
    """The results writer's cells, put together by pyarrow's compute functions, are each text as spreadsheet_safe
    makes it, and a reason's (``quote``) as CSV quotes it too (RFC 4180, Section 2, rules 6 and 7: a field with a
    comma, quote or line break in quotes, a quote in it doubled), repeated texts included, formula-like ones too;
    the file is byte for byte the one written by Python."""
    pytest.importorskip("pyarrow")
    from hydraulics import many_reaches as mr
    from hydraulics.batch_reasons import Reasons
    from inventory_rows import written_both_ways

    texts = ["stable, bed: 1.2 Pa", "plain", 'a "quoted" word', "two\nlines", "cr\ronly", "", "-1.5", "-2+3",
             *PAYLOADS.values(), "stable, bed: 1.2 Pa", "plain", "=SUM(A1), again"]
    if not quote:   # verdicts: words with no comma, quote or line break (the writer does not quote them)
        texts = [t for t in texts if not any(c in t for c in ',"\n\r')]
    values = np.empty(len(texts), dtype=object)
    values[:] = texts
    result = mr.BatchResult.empty(len(texts))
    if quote:   # the texts as reasons set whole
        reasons = Reasons(len(texts))
        reasons.set(np.arange(len(texts)), values)
        result.reasons = [reasons]
    else:
        result.verdict = values
    by_arrow, by_python = written_both_ways(monkeypatch, result)
    assert by_arrow == by_python
    got = [row["reason" if quote else "verdict"] for row in csv.DictReader(io.StringIO(by_arrow, newline=""))]
    assert got == [spreadsheet_safe(t) for t in texts]
