"""Render the README's screenshots of the window and its dialogs from the demo project (offscreen).

    python docs/screenshots/render.py

Each screen runs the fit probe (tests/gui/fit_probe.py) in a fresh process,
as the fit tests do: the window on an emulated screen of the given size and
scale (maximised), the demo project in the given units, every view and
dialog shown in turn and saved as a PNG, and the inventory dialog checking
invented-inventory.csv (an invented road inventory of 60 reaches, some of
them faulty on purpose) with line 11 (a misspelt shape) chosen. The probe
also lists whatever does not fit; this script stops if anything does. A
chosen few of the pictures are copied here under the names the README uses
(``SHOTS``); several dialogs of one kind are put side by side in one picture
(the rainfall dialog's table with a refused cell and its formula, a run's
sub-area and section dialogs, the message boxes). The dialogs are drawn on
every screen at 100 %, in both unit systems and at both sizes.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys
import tempfile
from pathlib import Path

from PIL import Image

HERE = Path(__file__).resolve().parent
ROOT = HERE.parents[1]
PROBE = ROOT / "tests" / "gui" / "fit_probe.py"

#: The rainfall dialog (its table with a refused cell, then its formula) and a run's item dialogs (a sub-area with
#: land covers, one with TR-55 travel times, a section range), each kind side by side in one picture.
RAINFALL = ("rainfall-complaint", "rainfall-formula")
RUN_DIALOGS = ("run-sub-area-covers", "run-sub-area-tr55", "run-section")


def dialogs(size: int, units: str) -> dict:
    """The pictures of the dialogs drawn on every screen at 100 % (``size`` its width)."""
    return {RAINFALL: f"rainfall-{size}-{units}.png", RUN_DIALOGS: f"run-dialogs-{size}-{units}.png"}


#: (width, height, scale, units, channel shown or "") -> {picture of the probe, or several side by side: name here}
SHOTS = {
    (1920, 1080, 1.0, "us", ""): {"main-section": "window-1920-us-section.png",
                                  "main-energy": "window-1920-us-energy.png",
                                  "main-runs": "window-1920-us-runs.png",
                                  "inventory-checked": "inventory-1920-us.png", **dialogs(1920, "us")},
    (1920, 1080, 1.0, "si", ""): {"main-rating": "window-1920-si-rating.png",
                                  "main-comparison": "window-1920-si-comparison.png",
                                  "sheet-details": "sheet-details-1920-si.png", **dialogs(1920, "si")},
    (1366, 768, 1.0, "us", ""): {"main-comparison": "window-1366-us-comparison.png",
                                 "sheet-export-complaint": "sheet-export-1366-us.png", **dialogs(1366, "us")},
    (1366, 768, 1.0, "si", "North cut ditch"): {"main-section": "window-1366-si-failing-lining.png",
                                                "main-runs": "window-1366-si-runs.png", **dialogs(1366, "si")},
    (1366, 768, 1.5, "us", ""): {"main-section": "window-1366-150-us-section.png",
                                 "main-runs": "window-1366-150-us-runs.png",
                                 "project-notes": "project-notes-1366-150-us.png",
                                 "rainfall-complaint": "rainfall-1366-150-us.png"},
    (1366, 768, 1.5, "si", ""): {"main-comparison": "window-1366-150-si-comparison.png",
                                 "main-runs": "window-1366-150-si-runs.png",
                                 "inventory-checked": "inventory-1366-150-si.png"},
}
MESSAGES = (1920, 1080, 1.0, "us", "")          # the screen whose message boxes are put side by side
MESSAGES_NAME = "messages-1920-us.png"


def probe(width, height, scale, units, channel, shots: Path) -> dict:
    env = {k: v for k, v in os.environ.items() if not k.startswith("QT_")}
    env["PYTHONPATH"] = os.pathsep.join([str(ROOT)] + ([env["PYTHONPATH"]] if env.get("PYTHONPATH") else []))
    args = [sys.executable, str(PROBE), str(width), str(height), str(scale), "--units", units, "--maximized",
            "--shots", str(shots), "--inventory", "docs/screenshots/invented-inventory.csv", "--inventory-row", "9"]
    if channel:
        args += ["--channel", channel]
    out = subprocess.run(args, capture_output=True, text=True, env=env, cwd=ROOT, timeout=300, check=False)
    if out.returncode != 0:
        raise SystemExit(out.stderr[-3000:])
    return json.loads(out.stdout)


def side_by_side(pictures: list[Path], out: Path, gap: int = 16) -> None:
    """``pictures`` in a row on a white ground, tops aligned."""
    images = [Image.open(p).convert("RGB") for p in pictures]
    width = sum(i.width for i in images) + gap * (len(images) + 1)
    height = max(i.height for i in images) + 2 * gap
    sheet = Image.new("RGB", (width, height), "white")
    x = gap
    for image in images:
        sheet.paste(image, (x, gap))
        x += image.width + gap
    sheet.save(out, optimize=True)


def main() -> int:
    with tempfile.TemporaryDirectory(prefix="ditchwright-shots-") as tmp:
        for screen, chosen in SHOTS.items():
            shots = Path(tmp) / "-".join(str(v) for v in screen if v != "")
            report = probe(*screen, shots)
            wrong = {name: seen["problems"] for name, seen in report.items() if seen["problems"]}
            if wrong:
                raise SystemExit(f"does not fit at {screen}: {wrong}")
            for probe_names, name in chosen.items():
                if isinstance(probe_names, tuple):
                    side_by_side([shots / f"{p}.png" for p in probe_names], HERE / name)
                else:
                    Image.open(shots / f"{probe_names}.png").save(HERE / name, optimize=True)
                print(HERE / name)
            if screen == MESSAGES:
                boxes = sorted(shots.glob("message-*.png"))
                side_by_side(boxes, HERE / MESSAGES_NAME)
                print(HERE / MESSAGES_NAME)
    return 0


if __name__ == "__main__":
    sys.exit(main())
