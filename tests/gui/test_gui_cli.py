"""`ditchwright --screenshot`, `ditchwright open` and the demo project."""

import pytest
from PySide6.QtGui import QImage

import hydraulics as hy
from app import project as pj
from app.gui import compute
from app.main import main


def test_screenshot_of_the_demo(tmp_path):
    out = tmp_path / "shot.png"
    assert main(["--screenshot", str(out)]) == 0
    image = QImage(str(out))
    assert image.width() >= 1280 and image.height() >= 800


def test_screenshot_of_a_file(tmp_path):
    path = tmp_path / "p.json"
    pj.save(pj.Project(name="Invented test site"), path)
    out = tmp_path / "shot.png"
    assert main(["--screenshot", str(out), str(path)]) == 0
    assert QImage(str(out)).width() >= 1280


def test_screenshot_of_a_bad_file_is_refused(tmp_path, capsys):
    path = tmp_path / "p.json"
    path.write_text("{", encoding="utf-8")
    assert main(["--screenshot", str(tmp_path / "x.png"), str(path)]) == 2
    assert "damaged or incomplete" in capsys.readouterr().err
    assert not (tmp_path / "x.png").exists()


def test_screenshot_takes_at_most_two_arguments(capsys):
    with pytest.raises(SystemExit) as exc:
        main(["--screenshot", "a.png", "b.json", "c"])
    assert exc.value.code == 2


def test_open_refuses_a_missing_file(tmp_path, capsys):
    assert main(["open", str(tmp_path / "nothing.json")]) == 2
    assert "no such project file" in capsys.readouterr().err


def test_demo_project_is_invented_and_varied():
    project = pj.loads(pj.demo_path().read_text(encoding="utf-8"))
    assert "demo" in pj.demo_path().name
    assert "invented" in project.name.lower() and "invented" in project.notes.lower()
    assert project.units == "si" and len(project.channels) >= 3
    assert any(c.alternatives for c in project.channels)
    for ch in project.channels:
        assert compute.evaluate(ch, hy.units.SI).ok, ch.name
