"""`ditchwright --screenshot`, `ditchwright open` and the demo project."""

import pytest
from PySide6.QtGui import QImage

from app import project as pj
from app.context import Context
from app import channel_display as display
from app.editing import new_project
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
        assert display.evaluate(ch, Context.load(units="si")).ok, ch.name


def test_no_arguments_opens_the_demo_on_first_start_only(monkeypatch):
    from PySide6.QtWidgets import QApplication

    from app.gui import application, settings
    monkeypatch.setattr(QApplication, "exec", lambda self: 0)
    assert main([]) == 0
    first = application.last_window
    assert "invented" in first.doc.project.name.lower() and first.doc.path is None
    assert settings.DEMO_SHOWN.read() is True
    first.close()
    assert main([]) == 0
    second = application.last_window
    assert second.doc.project == new_project("us")
    second.close()


def test_open_command_opens_the_file(monkeypatch, tmp_path):
    from PySide6.QtWidgets import QApplication

    from app.gui import application
    monkeypatch.setattr(QApplication, "exec", lambda self: 0)
    path = tmp_path / "site.json"
    project = pj.Project(name="Invented test site", units="us")
    pj.save(project, path)
    assert main(["open", str(path)]) == 0
    w = application.last_window
    assert w.doc.project == project and w.doc.path == path and w.doc.project.units == "us"
    w.close()


def test_a_start_up_error_is_shown_in_a_dialog(monkeypatch, dialogs):
    from PySide6.QtWidgets import QApplication

    from app.gui import mainwindow
    monkeypatch.setattr(QApplication, "exec", lambda self: 0)

    def broken(*a, **k):
        raise RuntimeError("the lining catalogue could not be read")
    monkeypatch.setattr(mainwindow, "MainWindow", broken)
    assert main([]) == 1
    kind, title, text = dialogs.shown[-1]
    assert kind == "critical" and "could not start" in title and "lining catalogue" in text


def test_no_display_is_explained(monkeypatch, capsys):
    from app.gui import application
    for var in ("DISPLAY", "WAYLAND_DISPLAY", "QT_QPA_PLATFORM"):
        monkeypatch.delenv(var, raising=False)
    monkeypatch.setattr(application.sys, "platform", "linux")
    assert application.run() == 1
    assert "no display found" in capsys.readouterr().err
