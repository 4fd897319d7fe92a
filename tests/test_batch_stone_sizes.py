"""An inventory with many stone sizes: the stone reaches of every size are checked for shear in one vectorised call,
and the results file and the summary are those of one check per size (the way the batch checked them before, kept as
the fallback path). The inventories here are invented."""

import warnings

import numpy as np
import pytest

from app import inventory as ai
from app.context import Context
from hydraulics import many_reaches as mr
from hydraulics.linings import hec15
from hydraulics.linings.hec15 import ValidityWarning

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

HEADER = list(ai.INPUT_COLUMNS) + ["road"]


def many_sizes_rows(size, seed, sizes):
    """Invented reaches: riprap and gravel in ``sizes`` stone sizes [ft] (some below and above HEC-15's 15 to 550 mm),
    with and without their own n, open ditches on mild and steep grades (Appendix D above a slope of 0.1), sides
    steeper than the stone's angle of repose, pipes lined with stone, concrete, reaches with their own n only, and a
    few bad rows."""
    rng = np.random.default_rng(seed)
    rows = []
    for i in range(size):
        kind = ("trapezoid", "triangle", "rectangle", "circle")[int(rng.integers(4))]
        r = {"id": f"K{i}", "shape": kind, "road": f"road {i % 7}",
             "slope": f"{10 ** rng.uniform(-3.5, -0.6):.5g}", "flow": f"{10 ** rng.uniform(-0.5, 2.3):.4g}"}
        if kind in ("trapezoid", "rectangle"):
            r["bottom_width"] = f"{rng.uniform(1, 8):.1f}"
        if kind in ("trapezoid", "triangle"):
            r["left_slope"] = f"{rng.choice([0.8, 1.0, 1.5, 2.0, 3.0, 4.0])}"   # 0.8 and 1.0 too steep for stone
            r["right_slope"] = f"{rng.choice([1.5, 2.0, 3.0, 6.0])}"
        if kind == "circle":
            r["diameter"], r["flow"] = f"{rng.choice([1.5, 2.0, 3.0])}", f"{rng.uniform(0.2, 15):.3g}"
        use = rng.choice(["riprap", "gravel", "stone own n", "concrete", "own n"], p=[0.45, 0.1, 0.1, 0.1, 0.25])
        if use in ("riprap", "gravel", "stone own n"):
            r["lining"] = "gravel" if use == "gravel" else "riprap"
            r["d50"] = f"{rng.choice(sizes):g}"
            if use == "stone own n":
                r["n"] = f"{rng.choice([0.03, 0.04, 0.05])}"
        elif use == "concrete":
            r["lining"], r["n"] = "concrete", "0.015"
        else:
            r["n"] = f"{rng.choice([0.013, 0.022, 0.035])}"
        rows.append(r)
    rows[3]["flow"] = "-2"
    rows[9]["d50"], rows[9]["lining"] = "0.5", ""
    rows[15]["lining"] = "rip rap"
    return rows


def write_csv(path, rows):
    lines = [",".join(HEADER)] + [",".join(r.get(c, "") for c in HEADER) for r in rows]
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")


def checked(source, target, units):
    """(the summary, every note about groups of reaches) of ``source`` checked into ``target`` as ``ditchwright
    batch`` checks it."""
    tally = ai.check_file(source, target, units, catalogue=SHIPPED, problems=20)
    return tally.summary(), tally.messages


@pytest.mark.parametrize("units", ["us", "si"])
def test_every_size_at_once_gives_the_bytes_and_notes_of_one_check_per_size(tmp_path, monkeypatch, units):
    # 60 sizes from 0.03 to 2.3 ft (9 mm to 700 mm; in the si file the same numbers are metres)
    sizes = np.round(np.geomspace(0.03, 2.3, 60), 4)
    source = tmp_path / "inventory.csv"
    write_csv(source, many_sizes_rows(4000, seed=21, sizes=sizes))

    answers = []
    at_once = mr._stability_of_sizes

    def spy(*args, **kwargs):
        answers.append(at_once(*args, **kwargs))
        return answers[-1]

    monkeypatch.setattr(mr, "_stability_of_sizes", spy)
    fast = checked(source, tmp_path / "at_once.csv", units)
    assert answers and all(a is not None for a in answers)   # the one call served every group (no fallback)
    assert len(answers[0]) >= 50                            # of many stone sizes

    monkeypatch.setattr(mr, "_stability_of_sizes", lambda *args, **kwargs: None)   # one check per size
    per_size = checked(source, tmp_path / "per_size.csv", units)

    assert (tmp_path / "at_once.csv").read_bytes() == (tmp_path / "per_size.csv").read_bytes()
    assert fast == per_size
    size_notes = [m for m in fast[1] if "range of the HEC-15 Chapter 6 procedures" in m]
    assert len([m for m in size_notes if " to " not in m.split(" is outside")[0]]) >= 10   # worded per size
    text = (tmp_path / "at_once.csv").read_text(encoding="utf-8")
    assert len(text.splitlines()) == 4001
    for verdict in ("stable", "unstable", "non-erodible", "hydraulics-only", "no-solution", "invalid"):
        assert f",{verdict}," in text
    assert "Appendix D safety factor" in text and "stone cannot rest" in text


def test_the_notes_of_each_size_come_in_the_order_of_the_sizes(tmp_path):
    # sizes below and above the 15 to 550 mm of the HEC-15 Chapter 6 procedures (Kilgore and Cotton, FHWA HEC-15,
    # 3rd ed., 2005, Chapter 6) each get their own note, worded with their own size, smallest first
    sizes = np.array([0.03, 0.04, 0.5, 1.0, 1.9, 2.1])   # ft: 9.1 and 12.2 mm, 579 and 640 mm are outside
    source = tmp_path / "inventory.csv"
    write_csv(source, many_sizes_rows(600, seed=4, sizes=sizes))
    summary = checked(source, tmp_path / "results.csv", "us")[0]
    head = "  note: lining 'gravel': D50 = "      # gravel rows never give their own n here: checked size by size
    stated = [line[len(head):].split(" is outside")[0] for line in summary.splitlines() if line.startswith(head)]
    # 1 ft = 12 in exactly
    assert stated == ["0.360 in", "0.480 in", "22.8 in", "25.2 in"]


@pytest.mark.parametrize("d50", [[0.01], [0.2], [0.6], [0.2, 0.6], [0.01, 0.6], [0.015, 0.55]])
def test_the_stone_size_note_is_the_text_of_the_warning(d50):
    # the range is HEC-15's for its Chapter 6 procedures: 15 mm gravel to 550 mm riprap (Kilgore and Cotton,
    # FHWA HEC-15, 3rd ed., 2005, Chapter 6)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", ValidityWarning)
        hec15.stone_permissible_shear(np.array(d50))
    note = hec15.stone_size_note(d50)
    outside = any(d < 0.015 or d > 0.55 for d in d50)
    assert (note is not None) == outside
    assert [str(w.message) for w in caught] == ([note] if outside else [])
    if outside:
        assert ("to" in note.split(" is outside")[0]) == (len(set(d50)) > 1)
