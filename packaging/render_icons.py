"""Render the application icon SVG to the PNG sizes the desktop and the bundle use.

Usage (from the repository root)::

    QT_QPA_PLATFORM=offscreen python packaging/render_icons.py [--check]

Reads ``resources/icons/ditchwright.svg`` and writes ``resources/icons/ditchwright-<size>.png``
for each size in ``SIZES``; sizes up to ``SMALL_MAX`` px are drawn from ``ditchwright-small.svg``,
the same glyph simplified on a 16-unit grid (the full drawing blurs into a smudge at 16 px). ``--check`` renders into memory and fails if a committed PNG is
missing, of another size, or differs by more than ``TOLERANCE`` in any channel of any pixel
(Qt builds on different processors round antialiased edges one step apart), so CI can tell when the PNGs were not regenerated after an edit
of the SVG. Uses Qt's own SVG renderer (QtSvg, part of PySide6-Essentials), so no extra
package is needed; works without a screen on the ``offscreen`` platform.
"""

from __future__ import annotations

import argparse
import os
import sys
from pathlib import Path

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

from PySide6.QtCore import QRectF, Qt  # noqa: E402
from PySide6.QtGui import QGuiApplication, QImage, QPainter  # noqa: E402
from PySide6.QtSvg import QSvgRenderer  # noqa: E402

ROOT = Path(__file__).resolve().parent.parent
ICON_DIR = ROOT / "resources" / "icons"
SVG = ICON_DIR / "ditchwright.svg"
SMALL_SVG = ICON_DIR / "ditchwright-small.svg"
SMALL_MAX = 16
SIZES = (16, 32, 48, 64, 128, 256, 512)
#: Largest difference of one colour channel (0-255) taken as the same render. Two Qt builds were
#: seen to differ by 1 on a few antialiased edge pixels; an edit of the drawing changes far more.
TOLERANCE = 2


def render(renderer: QSvgRenderer, size: int) -> QImage:
    """Render the SVG into a transparent square ARGB image of ``size`` pixels."""
    image = QImage(size, size, QImage.Format.Format_ARGB32_Premultiplied)
    image.fill(Qt.GlobalColor.transparent)
    painter = QPainter(image)
    painter.setRenderHint(QPainter.RenderHint.Antialiasing, True)
    painter.setRenderHint(QPainter.RenderHint.SmoothPixmapTransform, True)
    renderer.render(painter, QRectF(0, 0, size, size))
    painter.end()
    return image.convertToFormat(QImage.Format.Format_ARGB32)


def channel_difference(a: QImage, b: QImage) -> int:
    """Largest difference of one channel of one pixel between two images of one size."""
    import numpy as np

    def channels(image: QImage) -> np.ndarray:
        image = image.convertToFormat(QImage.Format.Format_ARGB32)
        rows = np.frombuffer(bytes(image.constBits()), np.uint8).reshape(image.height(), image.bytesPerLine())
        return rows[:, : image.width() * 4].astype(np.int16)

    return int(np.abs(channels(a) - channels(b)).max())


def png_path(size: int) -> Path:
    return ICON_DIR / f"ditchwright-{size}.png"


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--check", action="store_true",
                        help="do not write; fail if a PNG is missing, of the wrong size or differs")
    args = parser.parse_args(argv)

    app = QGuiApplication.instance() or QGuiApplication(sys.argv[:1])  # noqa: F841 (keeps Qt alive)
    renderers = {}
    for svg in (SVG, SMALL_SVG):
        renderers[svg] = QSvgRenderer(str(svg))
        if not renderers[svg].isValid():
            print(f"error: {svg} is not a valid SVG for QtSvg", file=sys.stderr)
            return 1

    problems = []
    for size in SIZES:
        source = SMALL_SVG if size <= SMALL_MAX else SVG
        image = render(renderers[source], size)
        out = png_path(size)
        if args.check:
            if not out.is_file():
                problems.append(f"{out.name}: missing")
                continue
            old = QImage(str(out)).convertToFormat(QImage.Format.Format_ARGB32)
            if old.size() != image.size():
                problems.append(f"{out.name}: {old.width()}x{old.height()} px, expected {size}x{size} px")
            elif (diff := channel_difference(old, image)) > TOLERANCE:
                problems.append(f"{out.name}: differs from a fresh render of {source.name} "
                                f"(by up to {diff} of 255 in a channel, {TOLERANCE} allowed)")
        else:
            if not image.save(str(out), "PNG"):
                print(f"error: could not write {out}", file=sys.stderr)
                return 1
            print(f"wrote {out.relative_to(ROOT)} ({size}x{size} px, from {source.name})")

    for line in problems:
        print(f"error: {line}", file=sys.stderr)
    if problems:
        print("run: python packaging/render_icons.py", file=sys.stderr)
        return 1
    return 0


if __name__ == "__main__":
    sys.exit(main())
