"""Project files from elsewhere through the command line: one line naming channel and field, never a traceback."""

import pytest

from app import project as pj
from app.main import main

DEMO_TEXT = pj.demo_path().read_text(encoding="utf-8")


@pytest.mark.parametrize("old, new, expected", [
    ('"value": 0.35', '"value": NaN', 'channels[0] "East verge ditch": flow.value: must be a finite number, got NaN'),
    ('"slope": 0.012', '"slope": 1e400', 'channels[0] "East verge ditch": slope: must be a finite number, got 1e400'),
    ('"East verge ditch"', '"East \\udc00 ditch"', 'channels[0] "East \\udc00 ditch": name: holds a lone surrogate'),
    ('"schema_version": 2,', '"schema_version": 2, "schema_version": 2,', 'top level: the key "schema_version" is given more'),
    ('"bottom_width": 0.6', '"bottom_width": [0.6, 0.7]',
     'channels[0] "East verge ditch": section.bottom_width: must be a single number, got a list [0.6, 0.7]'),
], ids=["nan", "1e400", "surrogate", "repeated-key", "list-dimension"])
@pytest.mark.parametrize("command", ["fingerprint", "sheet"])
def test_a_file_that_could_not_be_saved_again_is_one_line(tmp_path, capsys, command, old, new, expected):
    path = tmp_path / "p.json"
    path.write_text(DEMO_TEXT.replace(old, new, 1), encoding="utf-8")
    extra = ["-o", str(tmp_path / "s.pdf")] if command == "sheet" else []
    assert main([command, str(path), *extra]) == 2
    out, err = capsys.readouterr()
    assert out == "" and err.startswith(f"ditchwright {command}: error: {expected}")
    assert err.count("\n") == 1 and "Traceback" not in err and "--" not in err


@pytest.mark.parametrize("old, new, expected", [
    ('"flow_length": 480.0', '"flow_length": null',
     'channels[2] "Outfall swale": flow.flow_length: is missing: Kirpich'),
    ('"bend_radius": null', '"bend_radius": 0.01',
     'channels[0] "East verge ditch": bend_radius: must be at least half the water-surface width'),
], ids=["kirpich-half-given", "bend-too-tight"])
def test_a_sheet_names_the_channel_and_field_not_an_option(tmp_path, capsys, old, new, expected):
    path = tmp_path / "p.json"
    path.write_text(DEMO_TEXT.replace(old, new, 1), encoding="utf-8")
    assert main(["sheet", str(path), "-o", str(tmp_path / "s.pdf")]) == 2
    err = capsys.readouterr().err
    assert err.startswith(f"ditchwright sheet: error: {expected}") and err.count("\n") == 1
    assert not (tmp_path / "s.pdf").exists()


@pytest.mark.parametrize("text, expected", [
    ("[" * 100_000 + "]" * 100_000, "lists or objects nest too deeply to read"),
    (DEMO_TEXT + " " * (50 * 1024 * 1024), "the project file is 52.4 MB; a project file is read whole"),
], ids=["nested-100000", "50-MB"])
def test_deep_or_huge_files_are_one_line(tmp_path, capsys, text, expected):
    path = tmp_path / "p.json"
    path.write_text(text, encoding="utf-8")
    assert main(["fingerprint", str(path)]) == 2
    err = capsys.readouterr().err
    assert err.startswith(f"ditchwright fingerprint: error: {expected}") and err.count("\n") == 1
