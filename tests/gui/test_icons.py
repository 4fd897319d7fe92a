"""The icon check of packaging/render_icons.py: rounding noise passes, a real change does not."""

import importlib.util
from pathlib import Path

from PySide6.QtGui import QColor, QImage

ROOT = Path(__file__).resolve().parents[2]


def _module():
    spec = importlib.util.spec_from_file_location("render_icons", ROOT / "packaging" / "render_icons.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def test_committed_icons_match_their_svg(qapp):
    assert _module().main(["--check"]) == 0


def test_difference_counts_one_changed_pixel(qapp):
    icons = _module()
    image = QImage(str(icons.png_path(48))).convertToFormat(QImage.Format.Format_ARGB32)
    changed = image.copy()
    changed.setPixelColor(20, 20, QColor(255, 0, 0, 255) if image.pixelColor(20, 20).red() < 128
                          else QColor(0, 0, 255, 255))
    assert icons.channel_difference(image, image.copy()) == 0
    assert icons.channel_difference(image, changed) > icons.TOLERANCE
