"""The reasons of many reaches, kept as their texts and joined when read (hydraulics.batch_reasons).

The reference is the wording the check always had, written out here step by step: each reach's reason is a string
built as the steps come (a reason set whole replaces it; a note goes after it, or before it for the verdict's own
words, "; " between two; an empty text adds nothing). Both joins are compared with it: the one in Python
(``Reasons.joined``) and the one a results file's writer makes in C++ (``app.inventory.writing._lines``): its
cells are the reference text with the CSV quoting and the spreadsheet guard applied.
"""

import csv
import io

import numpy as np
import pytest

from app.files import spreadsheet_safe
from app.inventory.reading import pyarrow_modules
from inventory_rows import written_both_ways
from hydraulics import many_reaches as mr
from hydraulics.batch_reasons import Coded, Composed, Reasons

WORDS = ["stable, bed: 0.12 lb/ft^2", "near critical", "silt, may settle", 'a "quoted" word', "", "n held",
         "side slopes (2H:1V)", "ünïcode †", "=1+2", "-3.5", "line\nbreak"]


def _random_steps(rng, size, count):
    """``count`` random steps on ``size`` reaches: ("set" | "note" | "before", rows, texts as given)."""
    steps = []
    for _ in range(count):
        kind = rng.choice(["set", "note", "note", "before"])
        rows = np.sort(rng.choice(size, rng.integers(0, size + 1), replace=False))
        form = rng.integers(4) if kind != "set" else rng.integers(2)
        if form == 0:
            texts = str(rng.choice(WORDS))
        elif form == 1:
            texts = np.empty(len(rows), dtype=object)
            texts[:] = [str(w) + f" {i}" if rng.random() < 0.5 else str(w)
                        for i, w in enumerate(rng.choice(WORDS, len(rows)))]
        elif form == 2:
            texts = Coded(_objects(WORDS), rng.integers(len(WORDS), size=len(rows)))
        else:   # a sentence quoting numbers: words and coded numbers put together
            numbers = _objects(["0.125", "14.01", "", "2,5"])
            texts = Composed((str(rng.choice(WORDS)), Coded(numbers, rng.integers(4, size=len(rows))), " lb/ft^2 ",
                              Coded(numbers, rng.integers(4, size=len(rows)))))
        steps.append((kind, rows, texts))
    return steps


def _objects(texts):
    out = np.empty(len(texts), dtype=object)
    out[:] = texts
    return out


def _text(texts, j):
    """Row ``j``'s text of ``texts`` as given to a step."""
    if isinstance(texts, str):
        return texts
    if isinstance(texts, Coded):
        return texts.texts[texts.which[j]]
    if isinstance(texts, Composed):
        return "".join(_text(p, j) for p in texts.pieces)
    return texts[j]


def _reference(size, steps):
    """The reasons built step by step, as one string each."""
    out = [""] * size
    for kind, rows, texts in steps:
        for j, i in enumerate(rows.tolist()):
            t = _text(texts, j)
            if kind == "set":
                out[i] = t
            elif t:
                out[i] = t if not out[i] else (t + "; " + out[i] if kind == "before" else out[i] + "; " + t)
    return out


def _reasons(size, steps):
    reasons = Reasons(size)
    for kind, rows, texts in steps:
        if kind == "set":
            reasons.set(rows, texts)
        else:
            reasons.note(rows, texts, before=kind == "before")
    return reasons


@pytest.mark.parametrize("seed", range(12))
def test_joined_reasons_read_as_built_step_by_step(seed):
    rng = np.random.default_rng(seed)
    size = int(rng.integers(1, 40))
    steps = _random_steps(rng, size, int(rng.integers(0, 9)))
    reasons = _reasons(size, steps)
    want = _reference(size, steps)
    assert reasons.joined().tolist() == want
    rows = rng.permutation(size)[: size // 2]
    assert _reasons(size, steps).joined_at(rows).tolist() == [want[i] for i in rows]


def test_a_reason_set_whole_drops_the_notes_before_it_and_keeps_those_after():
    reasons = Reasons(3)
    reasons.note([0, 1, 2], "first note")
    reasons.set([1], "set whole")
    reasons.note([1, 2], "later", before=True)
    assert reasons.joined().tolist() == ["first note", "later; set whole", "later; first note"]


def _result(pieces):
    size = sum(len(p) for p in pieces)
    result = mr.BatchResult.empty(size)
    result.reasons = pieces
    return result


@pytest.mark.skipif(pyarrow_modules() is None, reason="pyarrow is not installed")
@pytest.mark.parametrize("seed", range(12))
def test_the_writers_join_gives_the_same_reasons(monkeypatch, seed):
    """Several groups of reaches (a whole file checked in chunks), rows whose every text is empty, texts with
    commas, quotes and characters beyond ASCII."""
    rng = np.random.default_rng(100 + seed)
    pieces, want = [], []
    for _ in range(int(rng.integers(1, 4))):
        size = int(rng.integers(1, 30))
        steps = _random_steps(rng, size, int(rng.integers(0, 9)))
        pieces.append(_reasons(size, steps))
        want += _reference(size, steps)
    result = _result(pieces)
    # the cells of a results file, put together in C++: quoted as CSV quotes them (RFC 4180, Section 2, rules 6
    # and 7), never run as a formula, the same bytes as Python writes from the reasons it joins
    by_arrow, by_python = written_both_ways(monkeypatch, result)
    assert by_arrow == by_python
    cells = [row[-1] for row in csv.reader(io.StringIO(by_arrow, newline=""))][1:]
    assert cells == [spreadsheet_safe(r) for r in want]
    assert by_arrow.count("\n") - sum(r.count("\n") for r in want) == 1 + len(want)    # one line each, and the head
    assert result.reason.tolist() == want
    rows = rng.permutation(len(want))[: len(want) // 2]
    assert result.reason_at(rows).tolist() == [want[i] for i in rows]
