"""Project files: round trip, atomic save, and clear refusals of bad files."""

import json
import re

import pytest

from app import project as pj


def sample():
    p = pj.Project(name="Invented test site", units="si")
    p.channels.append(pj.Channel(name="Ditch 2", flow=pj.FlowBasis(method="rational", runoff_coefficient=0.45,
                                                                   intensity=2.5e-5, area=3.0e4),
                                 lining=pj.LiningChoice("riprap", d50=0.15),
                                 alternatives=[pj.LiningChoice("concrete"), pj.LiningChoice("gravel", 0.025)]))
    return p


def test_round_trip(tmp_path):
    path = tmp_path / "site.json"
    p = sample()
    pj.save(p, path)
    again = pj.load(path)
    assert again == p
    assert again.channels[1].design_flow() == pytest.approx(0.45 * 2.5e-5 * 3.0e4)
    assert list(tmp_path.iterdir()) == [path]  # no temporary file left behind


@pytest.mark.parametrize("damage, message", [
    (lambda t: t[: len(t) // 2], "damaged or incomplete"),
    (lambda t: "", "damaged or incomplete"),
    (lambda t: "[1, 2]", "not a Ditchwright project"),
    (lambda t: t.replace('"schema_version": 2', '"schema_version": 7'), "newer Ditchwright"),
    (lambda t: t.replace('"units": "si"', '"units": "furlongs"'), '^units: must be one of "us", "si", got "furlongs"$'),
    (lambda t: t.replace('"slope": 0.005', '"slope": -0.005', 1), r'^channels\[0\] "Ditch 1": slope: must be > 0, got -0.005$'),
    (lambda t: t.replace('"bottom_width": 0.6', '"bottom_width": -0.6', 1), "^channels.0. \"Ditch 1\": section.bottom_width: "),
])
def test_bad_files_are_refused_and_left_alone(tmp_path, damage, message):
    path = tmp_path / "bad.json"
    text = damage(pj.dumps(sample()))
    path.write_text(text)
    with pytest.raises(pj.ProjectFileError, match=message):
        pj.load(path)
    assert path.read_text() == text


def test_failed_save_keeps_the_old_file(tmp_path, monkeypatch):
    path = tmp_path / "site.json"
    pj.save(sample(), path)
    before = path.read_text()

    def boom(*a, **k):
        raise OSError("disk full")
    import app.files
    monkeypatch.setattr(app.files.os, "replace", boom)
    p = sample()
    p.name = "changed"
    with pytest.raises(OSError):
        pj.save(p, path)
    assert path.read_text() == before
    assert [f.name for f in tmp_path.iterdir()] == ["site.json"]


def test_schema_is_valid_json_schema():
    import jsonschema
    jsonschema.Draft202012Validator.check_schema(pj.schema())
    json.dumps(pj.schema())


# -- values a JSON parser lets through but a project cannot hold (issue 18, items 1 and 5) ----------------------
DEMO_TEXT = pj.demo_path().read_text(encoding="utf-8")
EAST = 'channels[0] "East verge ditch"'


def _replace_once(old, new):
    def damage(text):
        assert text.count(old) >= 1, old
        return text.replace(old, new, 1)
    return damage


@pytest.mark.parametrize("damage, message", [
    (_replace_once('"value": 0.35', '"value": NaN'), f"{EAST}: flow.value: must be a finite number, got NaN"),
    (_replace_once('"slope": 0.012', '"slope": Infinity'), f"{EAST}: slope: must be a finite number, got Infinity"),
    (_replace_once('"slope": 0.012', '"slope": -Infinity'), f"{EAST}: slope: must be a finite number, got -Infinity"),
    (_replace_once('"slope": 0.012', '"slope": 1e400'), f"{EAST}: slope: must be a finite number, got 1e400"),
    (_replace_once('"bottom_width": 0.6', '"bottom_width": ' + "9" * 320),
     f"{EAST}: section.bottom_width: must be a finite number, got 9999"),
    (_replace_once('"bottom_width": 0.6', '"bottom_width": ' + "9" * 5000),
     f"{EAST}: section.bottom_width: must be a finite number, got 9999"),
    (_replace_once('"min_freeboard": 0.15', '"min_freeboard": NaN'),
     f"{EAST}: min_freeboard: must be a finite number, got NaN"),
    (_replace_once('"East verge ditch"', '"East \\ud800 ditch"'),
     'channels[0] "East \\ud800 ditch": name: holds a lone surrogate character (U+D800)'),
    (_replace_once('"name": "Demo', '"name": "\\udfff Demo'), "name: holds a lone surrogate character (U+DFFF)"),
    (_replace_once('"notes": "Invented example: a paved', '"notes": "\\udc80'),
     f"{EAST}: notes: holds a lone surrogate character (U+DC80)"),
    (_replace_once('"schema_version": 2,', '"schema_version": 2, "schema_version": 2,'),
     'top level: the key "schema_version" is given more than once'),
    (_replace_once('"format": "ditchwright-project",', '"format": "ditchwright-project", "format": "x",'),
     'top level: the key "format" is given more than once'),
    (_replace_once('"slope": 0.012,', '"slope": 0.012, "slope": 0.5,'),
     f'{EAST}: the key "slope" is given more than once'),
    (_replace_once('"bottom_width": 0.6,', '"bottom_width": 0.6, "bottom_width": 0.6,'),
     f'{EAST}: section: the key "bottom_width" is given more than once'),
    (_replace_once('"key": "concrete",', '"key": "concrete", "key": "riprap",'),
     f'{EAST}: lining: the key "key" is given more than once'),
], ids=["nan", "infinity", "minus-infinity", "1e400", "huge-integer", "5000-digit-integer", "nan-freeboard",
        "surrogate-channel-name", "surrogate-project-name", "surrogate-notes", "twice-schema-version",
        "twice-format", "twice-slope", "twice-in-section", "twice-in-lining"])
def test_values_that_could_not_be_saved_again_are_refused_naming_channel_and_field(tmp_path, damage, message):
    path = tmp_path / "bad.json"
    text = damage(DEMO_TEXT)
    path.write_text(text, encoding="utf-8", errors="surrogatepass")
    with pytest.raises(pj.ProjectFileError) as caught:
        pj.load(path)
    assert str(caught.value).startswith(message)
    assert "\n" not in str(caught.value) and "--" not in str(caught.value)
    str(caught.value).encode("utf-8")                       # printable as it is
    assert path.read_text(encoding="utf-8") == text


def test_the_shipped_demo_passes_the_value_checks():
    assert pj.loads(DEMO_TEXT).channels[0].name == "East verge ditch"


def test_a_field_label_names_channel_and_field():
    doc = {"channels": [{"name": "A"}, {"name": 3}]}
    assert pj.field_label(["channels", 0, "flow", "value"], doc) == 'channels[0] "A": flow.value'
    assert pj.field_label(["channels", 1, "section", "stations", 2], doc) == "channels[1]: section.stations[2]"
    assert pj.field_label(["sheet", "company"], doc) == "sheet.company"
    assert pj.field_label([], doc) == "top level"


# -- deep and huge files (issue 18, item 4) -----------------------------------------------------------------------
@pytest.mark.parametrize("text, message", [
    ("[" * 100_000 + "]" * 100_000, "nest too deeply to read"),
    ('{"a": ' * 100_000 + "1" + "}" * 100_000, "nest too deeply to read"),
    (DEMO_TEXT.replace('"notes": "Invented example: a paved ditch on a moderate grade."',
                       '"notes": ' + "[" * 100_000 + "]" * 100_000, 1), "nest too deeply to read"),
    (DEMO_TEXT.replace('"notes": "Invented example: a paved ditch on a moderate grade."',
                       '"notes": ' + "[" * 500 + "]" * 500, 1),
     f"{EAST}: notes[0][0][0][0][0][0][0][0][0][0][0][0][0]: lists or objects nest more than 16 levels deep"),
], ids=["lists-100000", "objects-100000", "inside-a-channel-100000", "inside-a-channel-500"])
def test_deeply_nested_json_is_refused_cleanly(tmp_path, text, message):
    path = tmp_path / "deep.json"
    path.write_text(text, encoding="utf-8")
    with pytest.raises(pj.ProjectFileError, match=re.escape(message)):
        pj.load(path)
    assert path.read_text(encoding="utf-8") == text


def test_a_50_mb_file_is_refused_with_the_cap_named(tmp_path):
    path = tmp_path / "huge.json"
    padding = " " * (50 * 1024 * 1024 - len(DEMO_TEXT))
    path.write_text(DEMO_TEXT + padding, encoding="utf-8")   # a valid project, but 50 MiB of it
    assert path.stat().st_size == 50 * 1024 * 1024
    with pytest.raises(pj.ProjectFileError) as caught:
        pj.load(path)
    assert str(caught.value) == ("the project file is 52.4 MB; a project file is read whole into memory and may be "
                                 "at most 33.6 MB (32 MiB, about 40,000 channels)")
    with pytest.raises(pj.ProjectFileError, match="may be at most 33.6 MB"):
        pj.loads(DEMO_TEXT + padding)


def test_a_file_at_the_cap_is_read_and_one_byte_more_is_not(tmp_path, monkeypatch):
    monkeypatch.setattr(pj, "MAX_FILE_BYTES", len(DEMO_TEXT.encode("utf-8")) + 10)
    path = tmp_path / "p.json"
    path.write_text(DEMO_TEXT + " " * 10, encoding="utf-8")
    assert pj.load(path).channels[0].name == "East verge ditch"
    path.write_text(DEMO_TEXT + " " * 11, encoding="utf-8")
    with pytest.raises(pj.ProjectFileError, match="may be at most"):
        pj.load(path)


def test_a_file_larger_than_it_said_is_cut_at_the_cap(tmp_path, monkeypatch):
    # A pipe or a file still growing: its size from fstat says nothing; the read itself stops at the cap.
    import os as os_module
    monkeypatch.setattr(pj, "MAX_FILE_BYTES", 1000)
    path = tmp_path / "p.json"
    path.write_text(DEMO_TEXT, encoding="utf-8")
    real = os_module.fstat
    monkeypatch.setattr(pj.os, "fstat", lambda fd: type("S", (), {"st_size": 0})() if fd else real(fd))
    with pytest.raises(pj.ProjectFileError, match="file is 0.0 MB; .* at most 0.0 MB"):
        pj.load(path)


# -- a section dimension given as a list (issue 18, item 9) --------------------------------------------------------
PIPE = 'channels[3] "Farm crossing pipe"'
SURVEY = 'channels[4] "Surveyed outfall channel"'
LIST_DAMAGE = [
    (_replace_once('"bottom_width": 0.6', '"bottom_width": [0.6, 0.7]'),
     f"{EAST}: section.bottom_width: must be a single number, got a list [0.6, 0.7]"),
    (_replace_once('"left_slope": 2.0', '"left_slope": [2.0, 3.0, 4.0]'),
     f"{EAST}: section.left_slope: must be a single number, got a list [2.0, 3.0, 4.0]"),
    (_replace_once('"left_slope": 2.0,\n        "right_slope": 2.0', '"side_slope": [2, 3, 3]'),
     f"{EAST}: section.side_slope: must be a single number, got a list [2, 3, 3]"),
    (_replace_once('"diameter": 0.75', '"diameter": [0.75]'),
     f"{PIPE}: section.diameter: must be a single number, got a list [0.75]"),
    (_replace_once('"bottom_width": 0.6', '"bottom_width": {"value": 0.6}'),
     f"{EAST}: section.bottom_width: must be a single number, got an object"),
    (_replace_once('"bottom_width": 0.6', '"bottom_width": "0.6"'),
     f'{EAST}: section.bottom_width: must be a single number, got text "0.6"'),
    (_replace_once('"stations": [', '"stations": [[0.0, 0.5],'),
     f"{SURVEY}: section.stations[0]: must be a single number, got a list [0.0, 0.5]"),
    (_replace_once('"bottom_width": 0.6', '"top_width": 0.6'),
     f'{EAST}: section: "top_width" does not belong to a trapezoid section (it takes bottom_width, side_slope, '
     "left_slope, right_slope)"),
]


@pytest.mark.parametrize("damage, message", LIST_DAMAGE,
                         ids=["bottom-width-list", "three-left-slopes", "three-side-slopes", "diameter-list",
                              "object", "text", "station-pair", "stray-dimension"])
def test_a_section_dimension_must_be_one_number(tmp_path, damage, message):
    path = tmp_path / "list.json"
    text = damage(DEMO_TEXT)
    path.write_text(text, encoding="utf-8")
    with pytest.raises(pj.ProjectFileError) as caught:
        pj.load(path)
    assert str(caught.value) == message
    assert path.read_text(encoding="utf-8") == text


@pytest.mark.parametrize("damage, message", LIST_DAMAGE[:4], ids=["bottom-width", "left-slopes", "side-slopes",
                                                                  "diameter"])
def test_the_loader_refuses_a_list_dimension_even_without_the_schema(monkeypatch, damage, message):
    # The core takes arrays (many sections at once), so it would build a section from a list; the loader must not.
    permissive = pj.schema()
    permissive["$defs"]["section"] = {"type": "object"}
    monkeypatch.setattr(pj, "schema", lambda: permissive)
    with pytest.raises(pj.ProjectFileError, match=re.escape(message.split(", got")[0])):
        pj.loads(damage(DEMO_TEXT))


def test_runs_round_trip_and_a_version_1_file_opens_without_runs(tmp_path):
    demo = pj.load(pj.demo_path())
    assert demo.runs and demo.rainfall["kind"] == "table"
    path = tmp_path / "round.json"
    pj.save(demo, path)
    again = pj.load(path)
    assert again == demo
    assert again.runs[0].sub_areas[1].land_covers[0].cover == "pasture"
    # a file of the first version (no runs, no rainfall) opens unchanged and gains empty ones
    old = json.loads(pj.dumps(demo))
    old["schema_version"] = 1
    del old["runs"], old["rainfall"]
    v1 = tmp_path / "v1.json"
    v1.write_text(json.dumps(old))
    opened = pj.load(v1)
    assert opened.runs == [] and opened.rainfall is None
    assert opened.channels == demo.channels


@pytest.mark.parametrize("damage, message", [
    (lambda d: d["runs"][0]["sub_areas"][0].update(runoff_coefficient=1.5),
     r'runs\[0\] "North verge ditch": sub_areas\[0\].runoff_coefficient: must be <= 1'),
    (lambda d: d["runs"][0]["sections"][0]["section"].update(bottom_width=-1),
     r'runs\[0\] "North verge ditch": sections\[0\].section.bottom_width'),
    (lambda d: d["runs"][0]["profile"][0].pop("elevation"),
     r'runs\[0\] "North verge ditch": profile\[0\]'),
    (lambda d: d["rainfall"].update(kind="curve"), r"rainfall.kind: must be one of"),
])
def test_bad_runs_in_a_file_are_refused_naming_them(tmp_path, damage, message):
    doc = json.loads(pj.dumps(pj.load(pj.demo_path())))
    damage(doc)
    path = tmp_path / "bad.json"
    path.write_text(json.dumps(doc))
    before = path.read_bytes()
    with pytest.raises(pj.ProjectFileError, match=message):
        pj.load(path)
    assert path.read_bytes() == before


def test_a_rainfall_table_rising_with_duration_is_refused_on_opening(tmp_path):
    doc = json.loads(pj.dumps(pj.load(pj.demo_path())))
    cells = doc["rainfall"]["intensities"]
    cells[2][0] = cells[1][0] * 1.5          # the 15-minute intensity above the 10-minute one
    path = tmp_path / "bad.json"
    path.write_text(json.dumps(doc))
    with pytest.raises(pj.ProjectFileError, match=r"rainfall.intensities\[2\]\[0\]"):
        pj.load(path)


def test_a_large_project_opens_in_a_small_multiple_of_parsing_its_json():
    """Issue 18: a 60,000-channel project took 64 s to open (the schema check in Python, about 100 times the time of
    json.loads on its text). The same measure as benchmarks/bench_project.py, on 5,000 channels: opening it takes at
    most 25 times json.loads of the same text (4.4x measured on 40,000 channels, README "Speed"); each side the
    best of three, timed in alternating rounds so that both meet the machine in the same state."""
    import time

    data = json.loads(DEMO_TEXT)
    data["channels"] = data["channels"][:1] * 5000
    data["runs"] = []
    text = json.dumps(data)
    opened, parsed = [], []
    for _ in range(3):
        started = time.perf_counter()
        project = pj.loads(text)
        opened.append(time.perf_counter() - started)
        started = time.perf_counter()
        json.loads(text)
        parsed.append(time.perf_counter() - started)
    assert len(project.channels) == 5000
    assert min(opened) < 25 * min(parsed), (min(opened), min(parsed))
