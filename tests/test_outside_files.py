"""Files from elsewhere that used to end in tracebacks or unreadable reasons: an unreadable user catalogue, a plot
into a missing folder, an inventory in another encoding or with a row a million fields wide, a project file with
a byte-order mark. The inventories and projects here are invented."""

import json
from os import PathLike

import pytest

from app import inventory as ai
from app.inventory import plots
from app import project as pj
from app.main import main
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

US_TRAP = ["--flow", "20", "--bottom-width", "2", "--side-slope", "3", "--slope", "0.004"]
HEADER = ",".join(ai.INPUT_COLUMNS)
ROW = "a,trapezoid,2,3,3,,0.004,20,,,0.03"


def one_line(capsys, argv, *words, status=2):
    assert main(argv) == status
    err = capsys.readouterr().err
    assert "Traceback" not in err and len(err.strip().splitlines()) == 1, err
    for w in words:
        assert w in err, err
    return err


@pytest.fixture
def unreadable_catalogue(tmp_path, monkeypatch):
    """A user catalogue the program may not read (as a file of another user is; the tests may run as root,
    which reads anything, so the refusal of the system is made here)."""
    from app.cli import lining_args
    from hydraulics.linings import load_catalogue
    path = tmp_path / "theirs.toml"
    path.write_text("schema_version = 1\n", encoding="utf-8")

    def refuse(*args, user_path=None, **kwargs):
        if user_path is not None:
            raise PermissionError(13, "Permission denied", str(user_path))
        return load_catalogue(*args, **kwargs)
    monkeypatch.setattr(lining_args, "load_catalogue", refuse)
    return path


def test_an_unreadable_user_catalogue_is_one_line_in_each_command(capsys, tmp_path, unreadable_catalogue):
    project = tmp_path / "p.json"
    project.write_text(pj.demo_path().read_text(encoding="utf-8"), encoding="utf-8")
    for argv in (["calc", *US_TRAP, "--lining", "concrete"], ["compare", *US_TRAP, "--lining", "concrete"],
                 ["sheet", str(project), "-o", str(tmp_path / "s.pdf")], ["fingerprint", str(project)]):
        one_line(capsys, argv + ["--user-catalogue", str(unreadable_catalogue)],
                 f"--user-catalogue: cannot read {unreadable_catalogue}: Permission denied")
    assert not (tmp_path / "s.pdf").exists()


def test_a_plot_into_a_missing_folder_is_refused_before_any_work(capsys, tmp_path):
    inventory = tmp_path / "inv.csv"
    inventory.write_text(f"{HEADER}\n{ROW}\n", encoding="utf-8")
    one_line(capsys, ["batch", str(inventory), "-o", str(tmp_path / "out.csv"), "--plot",
                      str(tmp_path / "missing" / "plot.png")], "--plot", "no such folder", "missing")
    assert not (tmp_path / "out.csv").exists()


def test_a_plot_that_cannot_be_written_says_so_and_where_the_results_are(capsys, tmp_path, monkeypatch):
    inventory = tmp_path / "inv.csv"
    inventory.write_text(f"{HEADER}\n{ROW}\n", encoding="utf-8")

    def full(*args, **kwargs):
        raise OSError(28, "No space left on device")
    monkeypatch.setattr(plots, "plot_summary", full)
    assert main(["batch", str(inventory), "-o", str(tmp_path / "out.csv"), "--plot", str(tmp_path / "p.png")]) == 2
    err = capsys.readouterr().err
    assert "Traceback" not in err and "No space left on device" in err and "results were written" in err
    assert (tmp_path / "out.csv").exists()


@pytest.mark.parametrize("suffix, magic", [(".png", b"\x89PNG"), (".pdf", b"%PDF"), (".svg", b"<?xml")])
def test_a_plot_that_fails_half_way_leaves_the_old_plot_whole(tmp_path, monkeypatch, suffix, magic):
    """The plot is replaced in one step like every file the program writes (README "Files: what is guaranteed"):
    a drawing that fails after some bytes leaves the earlier plot as it was, and no temporary file."""
    from matplotlib.figure import Figure
    result = ai.evaluate(ai.parse_inventory(f"{HEADER}\n{ROW}\n", "us"), catalogue=SHIPPED)
    path = tmp_path / f"plot{suffix}"
    plots.plot_summary(result, path)
    old = path.read_bytes()
    assert old.startswith(magic)

    def fails_half_way(self, target, **kwargs):
        if isinstance(target, str | PathLike):
            target = open(target, "wb")    # noqa: SIM115 (left open, as a failing writer leaves it)
        target.write(old[:100])
        raise OSError(28, "No space left on device")
    monkeypatch.setattr(Figure, "savefig", fails_half_way)
    with pytest.raises(OSError):
        plots.plot_summary(result, path)
    assert path.read_bytes() == old and [p.name for p in tmp_path.iterdir()] == [path.name]


def test_a_byte_that_is_not_utf8_names_the_line_and_the_encoding(tmp_path):
    path = tmp_path / "inv.csv"
    path.write_bytes(f"{HEADER}\n{ROW}\n".encode() + "b,trapezoid,2,3,3,,0.004,20,,,0.03,Fossé nord\n".encode("cp1252"))
    with pytest.raises(ai.InventoryError) as info:
        ai.read_inventory(path, "us")
    text = str(info.value)
    assert f"{path}:3:" in text and "byte 0xe9" in text and "UTF-8" in text and "CSV UTF-8" in text


def test_a_row_of_a_million_fields_gets_a_short_reason():
    text = f"{HEADER}\n{ROW}\n{ROW.replace('a,', 'b,', 1)}{',x' * 1_000_000}\n{ROW.replace('a,', 'c,', 1)},{'y' * 10_000}\n"
    inv = ai.parse_inventory(text, "us")
    res = ai.evaluate(inv, catalogue=SHIPPED)
    reasons = list(res.reason)
    assert len(reasons[1]) < 300 and "1,000,011 fields" in reasons[1] and "1,000,000 extra fields were dropped" in reasons[1]
    assert len(reasons[2]) < 300 and "'yyyy" in reasons[2] and "dropped" in reasons[2]
    assert res.verdict[0] == "hydraulics-only"


def test_a_few_short_extra_fields_are_still_kept_in_the_reason():
    inv = ai.parse_inventory(f"{HEADER}\n{ROW},note one,note two\n", "us")
    assert "'note one', 'note two' are kept only in this reason" in ai.evaluate(inv, catalogue=SHIPPED).reason[0]


def test_a_project_file_with_a_byte_order_mark_opens(tmp_path):
    path = tmp_path / "bom.json"
    text = pj.demo_path().read_text(encoding="utf-8")
    path.write_bytes(b"\xef\xbb\xbf" + text.encode("utf-8"))
    assert pj.load(path).name == json.loads(text)["name"]
    assert pj.loads("\ufeff" + text).name == json.loads(text)["name"]


def test_a_carriage_return_inside_a_quoted_field_stays_in_its_record():
    """Issue 18: a bare carriage return inside a quoted field neither splits the record nor changes the field;
    the results file quotes it and reads back with the same records. Line ends of any kind still end records."""
    import csv
    import io

    from app import inventory as ai
    head = "id,shape,bottom_width,left_slope,right_slope,diameter,slope,flow,lining,d50,n,note"
    row_b = "B,trapezoid,2,3,3,,0.004,20,,,0.03,z"
    for end in ("\r\n", "\n", "\r"):
        text = head + end + 'A,trapezoid,2,3,3,,0.004,20,,,0.03,"x\ry"' + end + row_b + end
        inventory = ai.parse_inventory(text, "us")
        assert len(inventory) == 2, repr(end)
        text = ai.format_results(inventory, ai.evaluate(inventory, catalogue=SHIPPED))
        out = list(csv.DictReader(io.StringIO(text, newline="")))
        assert [r["id"] for r in out] == ["A", "B"] and out[0]["note"] == "x\ry" and out[1]["note"] == "z"
        assert out[0]["verdict"] == out[1]["verdict"] == "hydraulics-only"
    # an unquoted file with old-style carriage-return line ends is still read line by line
    plain = ai.parse_inventory((head + "\r" + row_b + "\r" + row_b.replace("B,", "C,") + "\r"), "us")
    assert len(plain) == 2
