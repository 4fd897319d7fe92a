"""Sizes quoted in lining names read in the session's units (issue 16, the lining list in US units).

Conversions: 1 in = 25.4 mm exactly (NIST Handbook 44, Appendix C, 2024 edition: the inch defined as 2.54 cm);
the catalogue names are the shipped ones (resources/linings.toml).
"""

import doctest

import pytest

import app.lining_names as ln
from app import channel_display as display
from app import project as pj
from app.context import Context
from app.evaluate import load_default_catalogue
from app.lining_names import name_in_units
from app.run_design import design_run
from hydraulics.units import SI, US

CATALOGUE = load_default_catalogue()


def test_docstring_examples():
    assert doctest.testmod(ln).failed == 0


@pytest.mark.parametrize("name, us", [
    ("Bare soil, non-cohesive, fine (D75 < 1.3 mm)", "Bare soil, non-cohesive, fine (D75 < 0.0512 in)"),  # 1.3/25.4
    ("Grass, bunch type, poor stand, about 75 mm tall", "Grass, bunch type, poor stand, about 3 in tall"),   # 2.95 in
    ("Grass, sod-forming, excellent stand, about 300 mm tall",
     "Grass, sod-forming, excellent stand, about 12 in tall"),                                             # 11.8 in
    ("Mat {type B}, 6.35mm strands", "Mat {type B}, 0.250 in strands"),                                   # 6.35/25.4
    ("Concrete, float finish", "Concrete, float finish"),
    ("Gravel 20 mmol", "Gravel 20 mmol"),                                   # not a size: mm must end the word
])
def test_sizes_in_a_name_read_in_inches(name, us):
    assert name_in_units(name, US) == us
    assert name_in_units(name, SI) == name


def test_every_shipped_name_with_a_size_has_no_millimetre_left_in_us():
    with_sizes = [lin.name for lin in CATALOGUE if " mm" in lin.name]
    assert len(with_sizes) >= 5                               # four grass heights and the fine soil's D75
    for name in with_sizes:
        assert "mm" not in name_in_units(name, US) and " in" in name_in_units(name, US)


def test_the_window_list_and_the_comparison_name_the_soil_size_in_inches():
    groups = dict(display.lining_groups(Context(catalogue=CATALOGUE, units=US)))
    soil = dict(groups["Bare soil"])
    assert soil["soil_fine_noncohesive"] == "Bare soil, non-cohesive, fine (D75 < 0.0512 in)"
    grass = dict(groups["Grass"])
    assert grass["grass_good_sod"] == "Grass, sod-forming, good stand, about 6 in tall"       # 150/25.4 = 5.9
    si = dict(dict(display.lining_groups(Context(catalogue=CATALOGUE, units=SI)))["Bare soil"])
    assert si["soil_fine_noncohesive"] == "Bare soil, non-cohesive, fine (D75 < 1.3 mm)"


def test_the_run_schedule_names_grass_heights_in_inches():
    project = pj.loads(pj.demo_path().read_text(encoding="utf-8"))
    design = design_run(project, project.runs[0], CATALOGUE)
    names = [s["lining_name"] for s in design.schedule_values(US)]
    grass = [n for n in names if n.startswith("Grass")]
    assert grass and all("mm" not in n and " in tall" in n for n in grass)
