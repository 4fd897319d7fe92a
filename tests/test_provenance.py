"""One register of the published values the method uses, and one list of those not yet verified.

The register (hydraulics/provenance.py) is checked for its own consistency, against the docs page generated from
it, against every source string of the shipped lining catalogue, and against what the command line, the design
sheet and the window print: a value not yet read in its publication is printed with the mark wherever it is cited
and listed once, under "Not verified against the circular". The values read are cited to FHWA HEC-15, 3rd ed.
(Kilgore and Cotton, 2005, FHWA-NHI-05-114); see the register for each place.
"""

import json
import re
import subprocess
import sys
from pathlib import Path

import pytest

import hydraulics as hy
from app import project as P
from app.evaluate import evaluate_channel
from app.main import main
from hydraulics import provenance as pv
from hydraulics.linings import load_catalogue
from hydraulics.stability import check_lining
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

ROOT = Path(__file__).resolve().parents[1]


def test_register_keys_sources_and_marks():
    assert len(pv.REGISTER) >= 40 and all(k == e.key for k, e in pv.REGISTER.items())
    for item in pv.REGISTER.values():
        assert item.what and item.value and item.place
        assert all(r in pv.READ_IN for r in item.read_in)
        assert pv.cite(item.key) == (item.place if item.read_in else item.place + pv.NOT_VERIFIED_MARK)
    # values read in the circular (HEC-15 Eq. 6.1 and its range; Eq. 6.7) carry no mark
    assert pv.cite("blodgett") == "HEC-15 Eq. 6.1" and pv.cite("stone_shear") == "HEC-15 Eq. 6.7"
    assert pv.cite("table_6_1") == "HEC-15 Table 6.1" + pv.NOT_VERIFIED_MARK
    with pytest.raises(KeyError, match="no published value 'nothing'"):
        pv.cite("nothing")


def test_duplicate_keys_and_unknown_sources_are_refused():
    one = pv.Published("a", "what", "value", "HEC-15 Eq. 1.1")
    with pytest.raises(ValueError, match="given twice"):
        pv._entries(one, one)
    with pytest.raises(ValueError, match="unknown sources"):
        pv._entries(pv.Published("b", "what", "value", "HEC-15 Eq. 1.2", ("nowhere",)))


def test_unmarked_finds_a_place_cited_without_the_mark():
    assert pv.unmarked("K1 from HEC-15 Section 3.2, see there") == ["HEC-15 Section 3.2"]
    assert pv.unmarked("K1 from HEC-15 Section 3.2" + pv.NOT_VERIFIED_MARK) == []
    # another place that starts with the same words is not the same place
    assert pv.unmarked("waves (HEC-15 Section 2.1.1)") == []
    assert pv.unmarked("layer (HEC-15 Section 6.4)") == ["HEC-15 Section 6.4"]
    assert pv.unmarked("layer (HEC-15 Section 6.41)") == []


def test_cited_not_verified_and_the_two_paragraphs():
    texts = [f"size from {pv.cite('stone_size')} with {pv.cite('table_6_1')}", f"rule {pv.cite('side_factor')}"]
    keys = pv.cited_not_verified(texts)
    assert keys == ["side_factor", "table_6_1"]           # register order; the verified Eq. 6.8 is not listed
    full = pv.not_verified_paragraph(keys)
    short = pv.not_verified_paragraph(keys, values=False)
    assert full.startswith(pv.NOT_VERIFIED_MARK + " " + pv.NOT_VERIFIED_TITLE)
    assert "F* 0.047" in full and "F* 0.047" not in short and "HEC-15 Table 6.1" + pv.NOT_VERIFIED_MARK in short
    assert pv.not_verified_paragraph([]) == "" and pv.not_verified_paragraph(["blodgett"]) == ""


def test_docs_page_is_the_register():
    page = (ROOT / "docs" / "method-values.md").read_text(encoding="utf-8")
    assert page == pv.markdown_table(), "regenerate: python -m hydraulics.provenance > docs/method-values.md"
    out = subprocess.run([sys.executable, "-m", "hydraulics.provenance"], capture_output=True, text=True, cwd=ROOT,
                         check=True).stdout
    assert out == page
    assert f"{len(pv.not_verified())} of {len(pv.REGISTER)} not verified." in page


def test_no_value_is_cited_from_memory_anywhere():
    """The words of recall are gone; what is unread is marked and listed instead."""
    for folder, pattern in (("hydraulics", "*.py"), ("app", "*.py"), ("resources", "*.toml")):
        for path in (ROOT / folder).rglob(pattern):
            text = path.read_text(encoding="utf-8")
            assert "from memory" not in text.lower(), path
            assert "recollection" not in text.lower(), path


def test_every_source_of_the_shipped_catalogue_marks_what_is_unread():
    text = (ROOT / "resources" / "linings.toml").read_text(encoding="utf-8")
    sources = re.findall(r'^\s*\w*source\s*=\s*"([^"]*)"', text, flags=re.M)
    assert len(sources) > 30
    for s in sources:
        assert pv.unmarked(s) == [], s


# -- what the front ends print ------------------------------------------------------------------------------------
# An invented riprap channel in a bend: it uses K1, K2, Kb, Table 6.1, the layer rule and the freeboard rule.
RIPRAP = ["--units", "si", "--bottom-width", "1", "--side-slope", "3", "--slope", "0.01", "--flow", "1.5",
          "--lining", "riprap:0.3", "--bend-radius", "15"]


def test_calc_lists_the_unverified_values_it_leans_on(capsys):
    assert main(["calc", *RIPRAP]) == 0
    text = capsys.readouterr().out
    assert pv.unmarked(text) == []
    listed = text.split(pv.NOT_VERIFIED_TITLE)[1]
    for key in ("table_6_1", "side_factor", "tractive_ratio", "bend_factor", "layer_thickness"):
        item = pv.entry(key)
        assert f"{item.place}{pv.NOT_VERIFIED_MARK}: {item.what}" in listed, key
    assert pv.entry("blodgett").what not in listed        # read in the circular: not listed
    assert main(["calc", *RIPRAP, "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["not_verified"] == [line.strip() for line in listed.splitlines()[1:] if line.strip()]


def test_a_concrete_channel_leans_on_fewer_unread_values():
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    cat = load_catalogue()
    stone = pv.cited_not_verified(check_lining(section, 1.5, 0.01, cat.get("riprap")).cited_texts())
    rigid = pv.cited_not_verified(check_lining(section, 1.5, 0.01, cat.get("concrete")).cited_texts())
    assert "table_6_1" in stone and "table_6_1" not in rigid and "layer_thickness" not in rigid
    assert set(rigid) < set(stone)


@pytest.mark.parametrize("units", ["si", "us"])
def test_every_demo_design_marks_what_it_cites(units):
    project = P.load(P.demo_path())
    project.units = units
    for channel in project.channels:
        design = evaluate_channel(channel, catalogue=SHIPPED)
        for text in design.cited_texts():
            assert pv.unmarked(text) == [], (channel.name, text)
        assert design.to_dict()["not_verified"] == design.not_verified
        assert all(line in pv.not_verified_lines() for line in design.not_verified)


def test_the_lowest_n_allowed_is_below_every_n_of_chows_table():
    """hydraulics.validate.LIMITS["n"] cites Chow (1959) Table 5-6 as transcribed in the fluids library: its lowest
    value (0.008) must stay inside the range the program accepts."""
    from fluids import open_flow
    from hydraulics.validate import LIMITS
    values = []

    def walk(table):
        for v in table.values():
            if isinstance(v, dict):
                walk(v)
            elif isinstance(v, (tuple, list)):
                values.extend(x for x in v if isinstance(x, (int, float)))
    for name in ("n_closed_conduit", "n_excavated_dredged", "n_lined_built", "n_natural"):
        walk(getattr(open_flow, name))
    assert min(values) == 0.008 and LIMITS["n"].low < min(values) and max(values) < LIMITS["n"].high
