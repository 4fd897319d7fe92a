"""Project files: round trip, atomic save, and clear refusals of bad files."""

import json

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
    (lambda t: t.replace('"schema_version": 1', '"schema_version": 7'), "newer Ditchwright"),
    (lambda t: t.replace('"units": "si"', '"units": "furlongs"'), "expected layout at units"),
    (lambda t: t.replace('"slope": 0.005', '"slope": -0.005', 1), "expected layout"),
    (lambda t: t.replace('"bottom_width": 0.6', '"bottom_width": -0.6', 1), "impossible section"),
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
