"""The inventory's lining verdicts against the single-channel lining check, reach by reach.

hydraulics.stability.check_lining strings HEC-15's relations together for one
channel (Kilgore and Cotton, FHWA HEC-15, 3rd ed., 2005, Chapter 3); the batch
does the same on arrays. Every number the batch writes for a lined reach must
be the one that check gives.
"""

import csv
import io
import math
from collections import Counter

import numpy as np
import pytest

import hydraulics as hy
from app import inventory as ai
from hydraulics import many_reaches as mr
from hydraulics.stability import check_lining
from inventory_rows import section_of, shape_fields
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

KEYS = ["riprap", "gravel", "grass_good_sod", "grass_poor_bunch", "concrete", "soil_fine_noncohesive"]


def random_lined_rows(size, seed):
    rng = np.random.default_rng(seed)
    rows = []
    for i in range(size):
        kind = ["trapezoid", "triangle", "rectangle", "circle"][i % 4]
        key = KEYS[(i // 4) % len(KEYS)]
        r = dict.fromkeys(ai.INPUT_COLUMNS, "")
        r.update(id=f"S{i}", shape=kind, slope=f"{10 ** rng.uniform(-3, -0.7):.5f}",
                 flow=f"{10 ** rng.uniform(-1, 1):.4f}", lining=key)
        r.update(shape_fields(kind, bottom_width=lambda: f"{rng.uniform(0.3, 3):.3f}",
                              left_slope=lambda: f"{rng.choice([1.0, 1.5, 2.0, 3.0, 4.0])}",
                              right_slope=lambda: f"{rng.choice([1.5, 2.0, 3.0, 6.0])}",
                              diameter=lambda: f"{rng.uniform(1.0, 3):.3f}"))
        if key == "riprap":    # a stone row without its d50 is refused (test_batch.py)
            r["d50"] = f"{rng.uniform(0.05, 0.5):.3f}" if i % 3 == 0 else "0.15"
        elif key == "gravel":
            r["d50"] = "0.025"
        if i % 5 == 0:
            r["n"] = f"{rng.uniform(0.02, 0.05):.3f}"
        rows.append(r)
    return rows


def _batch(rows, catalogue):
    """The batch's results of the inventory ``rows`` (SI)."""
    buf = io.StringIO()
    w = csv.DictWriter(buf, fieldnames=list(ai.INPUT_COLUMNS), lineterminator="\n")
    w.writeheader()
    w.writerows(rows)
    return ai.evaluate(ai.parse_inventory(buf.getvalue(), "si"), catalogue=catalogue)


def _single(rows, catalogue, size_stone=True):
    """check_lining of each row's channel, one by one (None where the channel cannot carry its flow)."""
    for r in rows:
        v = lambda k: float(r[k]) if r[k] else None  # noqa: E731
        try:
            yield check_lining(section_of(r), float(r["flow"]), float(r["slope"]), catalogue.get(r["lining"]),
                               d50=v("d50"), n=v("n"), size_stone=size_stone)
        except hy.NoSolutionError:
            yield None


@pytest.mark.parametrize("seed", [5, 6])
def test_every_lined_reach_matches_check_lining(seed):
    rows = random_lined_rows(240, seed)
    res = _batch(rows, SHIPPED)
    seen = set()
    for i, (r, ref) in enumerate(zip(rows, _single(rows, mr.default_catalogue()))):
        if ref is None:
            assert res.verdict[i] == "no-solution", (r, res.reason[i])
            continue
        expected = {"stable": "stable", "not stable": "unstable", "non-erodible": "non-erodible"}[ref.verdict]
        assert res.verdict[i] == expected, (r, res.reason[i])
        seen.add(expected)
        assert res.normal_depth[i] == pytest.approx(ref.depth, rel=1e-8)
        assert res.bed_shear[i] == pytest.approx(ref.bed_shear, rel=1e-8)
        if ref.permissible_shear is None:
            assert math.isnan(res.permissible_shear[i]) and math.isnan(res.safety_factor[i])
        else:
            assert res.permissible_shear[i] == pytest.approx(ref.permissible_shear, rel=1e-9)
            assert res.safety_factor[i] == pytest.approx(ref.safety_factor, rel=1e-9, abs=1e-12)
    assert seen == {"stable", "unstable", "non-erodible"}
    reasons = " ".join(res.reason.tolist())
    assert "Appendix D safety factor" in reasons and "stone cannot rest" in reasons  # both special cases met


def test_lined_inventory_summary_and_plot(tmp_path, capsys):
    from app.main import main

    rows = random_lined_rows(80, 7)
    src, dst, png = tmp_path / "inv.csv", tmp_path / "out.csv", tmp_path / "sum.png"
    with src.open("w", newline="") as fh:
        w = csv.DictWriter(fh, fieldnames=list(ai.INPUT_COLUMNS))
        w.writeheader()
        w.writerows(rows)
    assert main(["batch", str(src), "-o", str(dst), "--units", "si", "--plot", str(png)]) == 0
    out = capsys.readouterr().out
    assert "shear ratio" in out and "stable" in out
    got = list(csv.DictReader(dst.open(newline="")))
    lined = [g for g in got if g["verdict"] in ("stable", "unstable")]
    assert lined and all(g["permissible_shear"] != "" and g["safety_factor"] != "" for g in lined)
    assert png.read_bytes()[:4] == b"\x89PNG"


#: Unit costs of an invented user catalogue: per area, per volume (a stone layer), and none (gravel).
PRICES = ('schema_version = 1\n'
          '[[lining]]\nkey = "concrete"\nunit_cost = 70.0\nunit_cost_basis = "area"\n'
          '[[lining]]\nkey = "grass_good_sod"\nunit_cost = 9.5\nunit_cost_basis = "area"\n'
          '[[lining]]\nkey = "riprap"\nunit_cost = 85.0\nunit_cost_basis = "volume"\n')


def test_every_lined_reach_has_check_linings_cost_and_warnings(tmp_path):
    """The cost per length and the warnings of each lined reach are those check_lining gives the same channel: the
    cost to rel 1e-9, every warning word for word and in its order, after the verdict's words in the reason. The
    batch checks the stone it is given and does not size one, so the check is made without sizing stone
    (``size_stone=False``, which leaves out only the warnings about the smallest stable size)."""
    from hydraulics.linings import load_catalogue
    user = tmp_path / "prices.toml"
    user.write_text(PRICES, encoding="utf-8")
    cat = load_catalogue(user_path=user)
    rows = [r for seed in (5, 6, 8) for r in random_lined_rows(240, seed)]
    res = _batch(rows, cat)
    priced, said = 0, Counter()
    for i, (r, ref) in enumerate(zip(rows, _single(rows, cat, size_stone=False))):
        if ref is None:
            continue
        if ref.cost_per_length is None:
            assert math.isnan(res.cost_per_length[i]), r
        else:
            assert res.cost_per_length[i] == pytest.approx(ref.cost_per_length, rel=1e-9), r
            priced += 1
        at = [res.reason[i].find(str(w)) for w in ref.warnings]
        assert -1 not in at and at == sorted(at), (r, res.reason[i], ref.warnings)
        said.update(k for k in ("silt may settle", "steeper than 1V:3H", "da/D50", "Reynolds number",
                                "vegetated soils", "not deep enough") if any(k in str(w) for w in ref.warnings))
        assert res.flags["silting"][i] == any("so silt may settle" in str(w) for w in ref.warnings)
        assert res.flags["steep_sides"][i] == any("steeper than 1V:3H" in str(w) for w in ref.warnings)
    assert priced > 100 and all(said[k] > 0 for k in ("silt may settle", "steeper than 1V:3H", "da/D50",
                                                      "vegetated soils", "not deep enough")), said   # all met


@pytest.mark.parametrize("units", ["si", "us"])
def test_a_caution_worded_once_per_printed_value_reads_as_worded_one_by_one(units):
    """The batch words the silting caution once per printed velocity (mr._each_worded); each reach's text must be
    the one the single-channel check words for its own velocity, at decade edges and rounding ties included."""
    from hydraulics.stability import silting_caution
    from hydraulics.units import system
    from hydraulics.wording import in_units
    u = system(units)
    rng = np.random.default_rng(11)
    edges = [0.0995, 0.09996, 0.1, 0.3048, 0.30479999, 0.12345, 0.1235, 1e-5, 0.0]
    v = np.concatenate([rng.uniform(0.001, 0.61, 5000), edges, u.to_si("velocity", np.array([0.1235, 0.9995]))])
    got = mr._each_worded(v, u, silting_caution, "v").expanded()
    assert got.tolist() == [in_units(silting_caution(x), u) for x in v.tolist()]
