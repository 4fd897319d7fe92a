"""The pictures: a dimensioned cross-section to scale, the rating curve and the specific-energy diagram.

Each picture keeps one matplotlib Figure and one canvas and creates its
artists once; an update only moves them (``set_data``, ``set_xy``) and asks
for ``draw_idle``. Margins are fixed instead of using a layout engine, which
would double the cost of every redraw. Values arrive in SI and are drawn in the
project's units. Nothing here computes hydraulics: the numbers come from
:mod:`app.channel_display`.

The margins follow the writing: after each update (and resize) the title is
wrapped at its separators to the figure's width and the margins are set from
the measured tick labels, axis labels and title (a few milliseconds), so that
nothing is cut at a small window or a large scale factor (150 % draws the
same figure at 1.5 times the pixels).
"""

from __future__ import annotations

import re
import textwrap
from dataclasses import dataclass

import numpy as np
from matplotlib.backends.backend_qtagg import FigureCanvasQTAgg
from matplotlib.colors import to_rgba
from matplotlib.figure import Figure
from matplotlib.patches import Polygon
from PySide6.QtCore import QRect, QRectF
from PySide6.QtGui import QImage, QPainter

from hydraulics.linings.roughness import SWITCH_NOTE
from hydraulics.units import UnitSystem

from ..channel_display import EnergyData, Evaluation, RatingData
from ..results import panel_field, rounded
from ..section_geometry import SectionGeometry, section_geometry
from .fields import pretty

INK = "#33393f"
MUTED = "#7a828a"
SOIL = "#ece3d2"
SOIL_EDGE = "#6d5d48"
WATER = "#c4dcef"
WATER_EDGE = "#2c6b9f"
CRITICAL = "#b9602a"
LINING = "#9da3a8"
PIPE = "#c9ccce"
FONT = 9.5


# -- the window's framing of the one section geometry (numpy only) --------------------------
def circle_points(radius, cx=0.0, cz=0.0, count=145):
    t = np.linspace(0, 2 * np.pi, count)
    return cx + radius * np.sin(t), cz + radius - radius * np.cos(t)


class Dimension:
    """A dimension line with arrows at both ends, extension ticks and a label."""

    def __init__(self, ax, color=INK):
        self.arrow = ax.annotate("", xy=(0, 0), xytext=(0, 0), zorder=8, annotation_clip=False,
                                 arrowprops=dict(arrowstyle="<|-|>", color=color, lw=0.8, shrinkA=0, shrinkB=0,
                                                 mutation_scale=7))
        self.label = ax.text(0, 0, "", fontsize=FONT, color=color, zorder=9)
        self.ticks = ax.plot([], [], color=color, lw=0.5, zorder=8)[0]

    def show(self, p0, p1, text, *, where="right", ticks=None):
        (x0, y0), (x1, y1) = p0, p1
        self.arrow.xy = (x0, y0)
        self.arrow.set_position((x1, y1))
        mx, my = (x0 + x1) / 2, (y0 + y1) / 2
        self.label.set_text(text)
        if where == "right":
            self.label.set_position((mx, my))
            self.label.set_ha("left"), self.label.set_va("center")
            self.label.set_text("  " + text)
        elif where == "below":
            self.label.set_position((mx, my))
            self.label.set_ha("center"), self.label.set_va("top")
        else:  # above
            self.label.set_position((mx, my))
            self.label.set_ha("center"), self.label.set_va("bottom")
        if ticks is not None:
            self.ticks.set_data(*ticks)
        else:
            self.ticks.set_data([], [])
        self.set_visible(True)

    def set_visible(self, visible: bool):
        for a in (self.arrow, self.label, self.ticks):
            a.set_visible(visible)

    @property
    def artists(self):
        return (self.arrow, self.label, self.ticks)


class Canvas(FigureCanvasQTAgg):
    """matplotlib's Qt canvas, put on screen without copying the picture first.

    Qt draws the part to paint straight from the rendered buffer, without
    matplotlib's copy of it and without clearing the widget underneath: the
    figures here are opaque (a white face) and cover the canvas (a fraction of
    the cost of matplotlib's own painting, paid at every edit)."""

    def paintEvent(self, event):
        self._draw_idle()       # only does something if a draw is pending
        if not hasattr(self, "renderer"):
            return
        buf = self.renderer.buffer_rgba()
        height, width = buf.shape[:2]
        image = QImage(buf, width, height, QImage.Format.Format_RGBA8888)
        ratio = self.device_pixel_ratio
        image.setDevicePixelRatio(ratio)
        rect = event.rect()
        painter = QPainter(self)
        try:
            if not QRectF(0, 0, width / ratio, height / ratio).contains(QRectF(rect)):
                painter.eraseRect(rect)          # a part the picture does not cover (while resizing)
            painter.drawImage(rect.topLeft(), image, QRect(int(rect.x() * ratio), int(rect.y() * ratio),
                                                           int(rect.width() * ratio), int(rect.height() * ratio)))
            self._draw_rect_callback(painter)
        finally:
            painter.end()


class Picture:
    """One Figure on one Qt canvas, its margins set from its writing (:meth:`fit_writing`)."""

    margins = dict(left=0.09, right=0.98, bottom=0.13, top=0.9)
    #: White kept around the writing at the figure's edge [pt].
    edge = 5.0

    def __init__(self, width=8.0, height=4.5, dpi=100):
        self.figure = Figure(figsize=(width, height), dpi=dpi, facecolor="white")
        self.canvas = Canvas(self.figure)
        self.figure.subplots_adjust(**self.margins)
        self.ax = self.figure.add_subplot()
        ax = self.ax
        ax.tick_params(labelsize=FONT, colors=INK)
        for side in ("top", "right"):
            ax.spines[side].set_visible(False)
        for side in ("left", "bottom"):
            ax.spines[side].set_color(MUTED)
        self.title = ax.set_title("", fontsize=FONT + 1, color=INK, loc="left")
        # the figure's, placed on the axes: it stays when the axes are hidden (no result drawn yet)
        self.stale_note = self.figure.text(0.5, 0.5, "", transform=ax.transAxes, ha="center", va="center",
                                           fontsize=FONT + 1, color="#8a1c1c", zorder=20,
                                           bbox=dict(boxstyle="round,pad=0.5", fc="white", ec="#d7b0b0"))
        self.stale_note.set_visible(False)
        self._title: str | None = None          # the title as given (shown wrapped to the width)
        self._faded = (False, "")               # (faded, note) as last set by fade()
        self.shown = False                      # whether a result has been drawn (update() calls fade(False))
        self.canvas.mpl_connect("resize_event", self._resized)

    def _resized(self, _event) -> None:
        if self._title is not None:
            self.fit_writing(self._title)

    @property
    def ratio(self) -> float:
        """Device pixels per logical pixel of the canvas (1.5 at 150 % scaling)."""
        return float(getattr(self.canvas, "device_pixel_ratio", 1.0) or 1.0)

    def px(self, points: float) -> float:
        """``points`` in the figure's pixels."""
        return points * self.figure.dpi / 72

    def wrap_title(self, title: str, room: float) -> None:
        """Set the title, broken into lines no wider than ``room`` [px]: at its separators ("  ·  ", ": ")
        first, between words where one part alone is too wide."""
        renderer = self.figure.canvas.get_renderer()

        def width(text):
            self.title.set_text(text)
            return self.title.get_window_extent(renderer).width

        if not title or width(title) <= room:
            return
        parts = re.split(r"(  ·  |: )", title)                   # text, separator, text, ...
        lines, line = [], parts[0]
        for sep, part in zip(parts[1::2], parts[2::2]):
            joined = line + sep + part
            if width(joined) <= room:
                line = joined
            else:
                lines.append(line + sep.strip(" ·"))
                line = part
        lines.append(line)
        out = []
        for line in lines:                                        # a part still too wide: between words
            words, cur = line.split(" "), ""
            for word in words:
                if cur and width(f"{cur} {word}") > room:
                    out.append(cur)
                    cur = word
                else:
                    cur = f"{cur} {word}".strip()
            out.append(cur)
        self.title.set_text("\n".join(out))

    def fit_writing(self, title: str | None = None) -> None:
        """Margins from the writing: the tick labels and axis labels to the left and below, the last tick label
        to the right and the title (wrapped to the figure's width) above, each inside the figure."""
        fig, ax = self.figure, self.ax
        renderer = fig.canvas.get_renderer()
        W, H = fig.bbox.width, fig.bbox.height
        if W < 20 or H < 20:
            return
        edge = self.px(self.edge)
        for _ in range(2):                       # the ticks may change with the margins: measure once more
            box = ax.get_window_extent(renderer)
            left = bottom = right = 0.0
            if ax.axison:
                yb, xb = ax.yaxis.get_tightbbox(renderer), ax.xaxis.get_tightbbox(renderer)
                if yb is not None:
                    left = max(box.x0 - yb.x0, 0.0)
                if xb is not None:
                    bottom = max(box.y0 - xb.y0, 0.0)
                    right = max(xb.x1 - box.x1, 0.0)
            x0 = (left + edge) / W
            x1 = 1 - (right + edge) / W
            if title is not None:
                self.wrap_title(title, (x1 - x0) * W - edge)
            top = 0.0
            if self.title.get_text():
                t = self.title.get_window_extent(renderer)
                top = t.height + self.px(6)         # the title's own pad above the axes (matplotlib's 6 pt)
            y0, y1 = (bottom + edge) / H, 1 - (top + edge) / H
            if x1 - x0 < 0.2 or y1 - y0 < 0.2:
                return
            now = fig.subplotpars
            if max(abs(now.left - x0) * W, abs(now.right - x1) * W, abs(now.bottom - y0) * H,
                   abs(now.top - y1) * H) < 1:
                return                               # as they are, to the pixel: the ticks are the same
            fig.subplots_adjust(left=x0, right=x1, bottom=y0, top=y1)

    def keep_inside(self, *texts) -> None:
        """A label written to the right of its point that would reach past the figure's edge is written to the
        left of it instead, or broken after its commas where it fits neither way."""
        renderer = self.figure.canvas.get_renderer()
        edge = self.px(self.edge)
        lo, hi = self.figure.bbox.x0 + edge, self.figure.bbox.x1 - edge
        for t in texts:
            words = " ".join(t.get_text().split())
            if not t.get_visible() or not words:
                continue
            for text in (words, words.replace(", ", ",\n")):
                sides = (("left", "  " + text.replace("\n", "\n  ")), ("right", text.replace("\n", "  \n") + "  "))
                for ha, shown in sides:
                    t.set_ha(ha)
                    t.set_text(shown)
                    e = t.get_window_extent(renderer)
                    if e.x0 >= lo and e.x1 <= hi:
                        break
                else:
                    continue
                break

    def fit_legend(self, handles) -> None:
        """The legend of ``handles`` in the lower right, its entries wrapped when it is wider than the axes."""
        labels = [h.get_label() for h in handles]
        self.legend = self.ax.legend(handles=handles, labels=labels, loc="lower right", fontsize=FONT, frameon=False)
        renderer = self.figure.canvas.get_renderer()
        room = self.ax.get_window_extent(renderer).width - self.px(self.edge)
        wide = self.legend.get_window_extent(renderer).width
        if wide > room:
            longest = max(len(text) for text in labels)
            chars = max(12, int(longest * room / wide) - 6)
            labels = [textwrap.fill(text, chars) for text in labels]
            self.legend = self.ax.legend(handles=handles, labels=labels, loc="lower right", fontsize=FONT,
                                         frameon=False)

    def fade(self, faded: bool, note: str = "") -> None:
        self.shown = self.shown or not faded
        if (faded, note) == self._faded:
            return                   # as it is: setting the same alpha still recomputes every patch's colours
        self._faded = (faded, note)
        # before any result the axes hold only empty lines and a key with nothing to name: the note alone
        self.ax.set_visible(self.shown)
        alpha = 0.3 if faded else 1.0
        for artist in self.content_artists():
            artist.set_alpha(alpha)
        self.stale_note.set_text(note)
        self.stale_note.set_visible(faded and bool(note))

    def content_artists(self):
        return []


@dataclass
class SectionDrawing:
    """The window's picture of one section, in the user's length unit, invert at z = 0: the one geometry
    (:mod:`app.section_geometry`, which the sheet and the CAD drawing draw too) framed with ground beyond the banks and soil below."""

    geometry: SectionGeometry
    ground: tuple            # boundary polyline with berms (x, z)
    soil: tuple              # ground or pipe wall polygon
    air: tuple | None        # inside of a pipe above the water
    water: tuple | None      # wetted area at normal depth
    lining: tuple | None     # lining band polygon
    top: float               # top of ditch (lower bank, pipe crown)
    left: float              # extent of the drawing
    right: float
    base: float

    @property
    def kind(self) -> str:
        return self.geometry.kind


def section_drawing(ev: Evaluation, units: UnitSystem, lining_thickness=None) -> SectionDrawing:
    """The shapes to draw for a solved channel (``ev.ok``) in ``units``, from the one section geometry."""
    geo = section_geometry(ev.section, ev.result.normal_depth, ev.result.critical_depth, ev.total_depth, units,
                           lining_thickness)
    k, thick = geo.to_units, geo.thickness
    bx, bz = geo.boundary
    water = None
    if geo.water:       # one patch: the wet runs in turn, joined along the water surface
        water = (np.concatenate([w[0] for w in geo.water]), np.concatenate([w[1] for w in geo.water]))
    if geo.closed:
        d = geo.full_depth
        wall = max(d * 0.06, 0.02 * k)
        ix, iz = circle_points(d / 2)
        ox, oz = circle_points(d / 2 + wall, cz=-wall)
        soil = (np.concatenate([ox, ix[::-1]]), np.concatenate([oz, iz[::-1]]))
        return SectionDrawing(geo, (bx, bz), soil, (bx, bz), water, None, d, -d / 2 - wall, d / 2 + wall, -wall)
    top = geo.full_depth if geo.surveyed else geo.total_depth
    span = float(bx.max() - bx.min())
    berm = max(0.12 * span, 0.3 * top, 0.1 * k)
    base = -max(0.3 * top, thick + 0.12 * top, 0.05 * k)
    gx = np.concatenate([[bx[0] - berm], bx, [bx[-1] + berm]])
    gz = np.concatenate([[bz[0]], bz, [bz[-1]]])
    soil = (np.concatenate([gx, [gx[-1], gx[0]]]), np.concatenate([gz, [base, base]]))
    return SectionDrawing(geo, (gx, gz), soil, None, water, geo.lining_band, top, float(gx[0]), float(gx[-1]), base)


class SectionPicture(Picture):
    """The cross-section to scale: ground or pipe, lining, water at normal depth, critical depth, dimensions.

    Equal scale on both axes: the limits are chosen from the drawing and the
    size of the axes in pixels, with room in pixels for the labels.
    """

    #: Room for labels around the drawing, in pixels: left, right, bottom, top (the key's first three lines and
    #: the water surface's width above the drawing; a fourth key line, the lining's, adds :data:`KEY_LINE`).
    pads = (24, 140, 60, 96)
    #: Height of one line of the key, in logical pixels.
    KEY_LINE = 19

    def __init__(self, width=8.0, height=4.5, dpi=100, compact=False):
        super().__init__(width, height, dpi)
        self.compact = compact
        ax = self.ax
        ax.set_axis_off()
        self.figure.subplots_adjust(left=0.01, right=0.99, bottom=0.01, top=0.93)
        if compact:
            self.figure.subplots_adjust(left=0.02, right=0.98, bottom=0.03, top=0.97)
            self.pads = (4, 4, 4, 4)
        self.scale_bar = ax.plot([], [], color=INK, lw=1.0, zorder=9, solid_capstyle="butt")[0]
        self.scale_text = ax.text(0, 0, "", fontsize=FONT, color=INK, ha="left", va="bottom", zorder=9)
        self.water = Polygon(np.zeros((3, 2)), closed=True, fc=WATER, ec="none", zorder=1)
        self.air = Polygon(np.zeros((3, 2)), closed=True, fc="white", ec="none", zorder=0.5)
        self.soil = Polygon(np.zeros((3, 2)), closed=True, fc=SOIL, ec="none", zorder=3)
        self.lining = Polygon(np.zeros((3, 2)), closed=True, fc=LINING, ec=SOIL_EDGE, lw=0.5, zorder=3.5)
        for p in (self.water, self.air, self.soil, self.lining):
            ax.add_patch(p)
        self.ground = ax.plot([], [], color=SOIL_EDGE, lw=1.8, zorder=4, solid_joinstyle="round")[0]
        self.surface = ax.plot([], [], color=WATER_EDGE, lw=1.4, zorder=2)[0]
        self.marker = ax.plot([], [], marker="v", ms=7, color=WATER_EDGE, ls="none", zorder=6)[0]
        self.critical = ax.plot([], [], color=CRITICAL, lw=1.1, ls=(0, (5, 3)), zorder=5)[0]
        self.top_line = ax.plot([], [], color=SOIL_EDGE, lw=0.8, ls=(0, (1, 2)), zorder=5)[0]
        text = dict(fontsize=FONT, zorder=9, va="center")
        # the key, top left: what each line is, with its level
        self.key_lines, self.key_texts = [], []
        styles = (dict(color=WATER_EDGE, lw=1.4), dict(color=CRITICAL, lw=1.1, ls=(0, (5, 3))),
                  dict(color=SOIL_EDGE, lw=0.9, ls=(0, (1, 2))), dict(color=LINING, lw=6))
        for i, style in enumerate(styles):
            y = 0.985 - i * 0.045
            self.key_lines.append(ax.plot([0.01, 0.055], [y, y], transform=ax.transAxes, zorder=9, **style)[0])
            self.key_texts.append(ax.text(0.065, y, "", transform=ax.transAxes, color=INK, ha="left", **text))
        self.critical_label, self.top_label = self.key_texts[1], self.key_texts[2]
        self.slope_labels = [ax.text(0, 0, "", color=SOIL_EDGE, ha=h, **text) for h in ("right", "left")]
        self.lining_label = ax.text(0, 0, "", color=INK, ha="center", **text)
        self.dims = {"depth": Dimension(ax, color=WATER_EDGE), "freeboard": Dimension(ax),
                     "bottom": Dimension(ax), "top": Dimension(ax)}
        self._labels = [*self.key_lines, *self.key_texts, self.lining_label, *self.slope_labels]
        self._last = None
        self._fitted = None     # (title, width, height) the margins were last fitted for
        self._widths: dict = {}  # label widths by their text with digits as 0 (see _text_width)

    def content_artists(self):
        out = [self.water, self.soil, self.air, self.lining, self.ground, self.surface, self.marker,
               self.critical, self.top_line, self.scale_bar, self.scale_text, *self._labels]
        for d in self.dims.values():
            out.extend(d.artists)
        return out

    def _resized(self, _event):
        if self._last is not None:
            self.update(*self._last)

    def _text_width(self, text, renderer) -> float:
        """The width of a label [px], measured once for each pattern of its digits: the font's digits are all
        one width (DejaVu Sans, matplotlib's font), so "depth 0.31 m" measures as "depth 0.00 m" did."""
        key = (re.sub(r"\d", "0", text.get_text()), text.get_fontsize(), self.figure.dpi)
        width = self._widths.get(key)
        if width is None:
            if len(self._widths) > 256:
                self._widths.clear()
            width = self._widths[key] = text.get_window_extent(renderer).width
        return width

    def _fit(self, x0, x1, z0, z1, right: float = 0.0, above: float = 0.0):
        """Set equal-scale limits showing [x0, x1] x [z0, z1] inside the label pads (``pads`` in logical pixels,
        the right one at least ``right`` device pixels, the top one ``above`` logical pixels more); returns shown
        units per logical pixel."""
        box = self.ax.get_window_extent()
        k = self.ratio
        left, pad_right, bottom, top = (p * k for p in self.pads)
        top += above * k
        right = max(pad_right, right)
        w = max(box.width - left - right, 40)
        h = max(box.height - bottom - top, 40)
        scale = max((x1 - x0) / w, (z1 - z0) / h, 1e-9)
        cx, cz = (x0 + x1) / 2, (z0 + z1) / 2
        xl = cx - scale * (w / 2 + left)
        zl = cz - scale * (h / 2 + bottom)
        self.ax.set_xlim(xl, xl + scale * box.width)
        self.ax.set_ylim(zl, zl + scale * box.height)
        return scale * k

    def update(self, ev: Evaluation, units: UnitSystem, title: str = "", lining_thickness=None,
               drawing: SectionDrawing | None = None) -> None:
        """Redraw for a good evaluation (``ev.ok``); the caller keeps the last one when it is not. ``drawing``:
        :func:`section_drawing` of the same, when already made (off the window's thread)."""
        self._last = (ev, units, title, lining_thickness, drawing)
        # everything in the shown length unit
        g = drawing if drawing is not None else section_drawing(ev, units, lining_thickness)
        geo = g.geometry
        L = units.label("length")

        def fmt(v, key=None):
            """A length of the design as the results panel and the sheet's section print it (app.results), else
            (a dimension typed by the user) to hundredths."""
            return f"{rounded(v, panel_field(key)) if key else f'{v:.2f}'} {L}"

        def xy(pair):
            return np.column_stack([np.asarray(pair[0]), np.asarray(pair[1])])

        # the margins follow the title alone (no axes are drawn): measured again only when it or the size changes
        fitted = (title, self.figure.bbox.width, self.figure.bbox.height)
        if fitted != self._fitted:
            self.fit_writing(title)
            self._fitted = fitted
        (wl, wr), yn, yc, top = geo.surface or (0.0, 0.0), geo.normal_depth, geo.critical_depth, g.top
        gap = top - yn
        freeboard_name = {"circle": "to crown", "irregular": "to lower bank"}.get(g.kind, "freeboard")
        right = 0.0
        if not self.compact:       # the depth chain's labels right of the drawing: room for the wider one
            renderer = self.figure.canvas.get_renderer()
            d = self.dims
            d["depth"].label.set_text(f"  depth {fmt(yn, 'normal_depth')}")
            d["freeboard"].label.set_text(f"  {freeboard_name} {fmt(gap, 'freeboard')}")
            widest = max(self._text_width(d[k].label, renderer) for k in ("depth", "freeboard"))
            right = widest + (14 + 6) * self.ratio + self.px(self.edge)
        # shown units per logical pixel; a lining's line in the key pushes the drawing down, clear of the key
        s = self._fit(g.left, g.right, g.base, g.top, right,
                      self.KEY_LINE if g.lining is not None and not self.compact else 0.0)
        self.soil.set_xy(xy(g.soil))
        colour = PIPE if g.kind == "circle" else SOIL
        if self.soil.get_facecolor() != to_rgba(colour):
            self.soil.set_facecolor(colour)
        self.air.set_visible(g.air is not None)
        if g.air is not None:
            self.air.set_xy(xy(g.air))
        self.ground.set_data(g.ground[0], g.ground[1])
        self.water.set_visible(g.water is not None)
        if g.water is not None:
            self.water.set_xy(xy(g.water))
        self.lining.set_visible(g.lining is not None)
        if g.lining is not None:
            self.lining.set_xy(xy(g.lining))
        critical = geo.critical or (0.0, 0.0)
        self.surface.set_data([wl, wr], [yn, yn])
        self.marker.set_data([(wl + 0.18 * (wr - wl))], [yn + 7 * s])
        if self.compact:
            self.critical.set_data([critical[0], critical[1]], [yc, yc])
            for a in (self.top_line, self.scale_bar, self.scale_text, *self._labels):
                a.set_visible(False)
            for d in self.dims.values():
                d.set_visible(False)
            self.fade(False)
            return

        # critical depth across its own width; the top of the ditch (or the crown) across the drawing
        self.critical.set_data([critical[0], critical[1]], [yc, yc])
        self.top_line.set_data([g.left, g.right], [top, top])
        name = {"circle": "crown of the pipe", "irregular": "lower bank"}.get(g.kind, "top of ditch (total depth)")
        keys = [f"water surface at normal depth, {fmt(yn, 'normal_depth')}", f"critical depth, {fmt(yc, 'critical_depth')}",
                f"{name}, {fmt(top, 'total_depth')}"]
        if g.lining is not None:
            keys.append(f"lining, {units.from_si('small_length', lining_thickness):.0f} "
                        f"{units.label('small_length')} thick")
        step = self.KEY_LINE * self.ratio / max(self.ax.get_window_extent().height, 100)   # one key line
        for i, (line, label) in enumerate(zip(self.key_lines, self.key_texts)):
            y = 0.99 - i * step
            if label.get_position()[1] != y:     # moves with the size only: a line set anew is laid out anew
                line.set_ydata([y, y])
                label.set_y(y)
            line.set_visible(i < len(keys))
            label.set_visible(i < len(keys))
            if i < len(keys):
                label.set_text(keys[i])
        # the depth chain on the right: water depth, then freeboard (or clearance to the crown)
        x_dim = g.right + 14 * s
        d = self.dims
        d["depth"].show((x_dim, 0), (x_dim, yn), f"depth {fmt(yn, 'normal_depth')}",
                        ticks=([wr, x_dim + 4 * s], [yn, yn]))
        if gap > 1.5 * s:
            d["freeboard"].show((x_dim, yn), (x_dim, top), f"{freeboard_name} {fmt(gap, 'freeboard')}",
                                ticks=([g.right, x_dim + 4 * s], [top, top]))
            if gap < 16 * s:  # a short freeboard: lift its label clear of the depth label
                d["freeboard"].label.set_y(top + 7 * s)
        else:
            d["freeboard"].set_visible(False)
        # water-surface width above the drawing
        t_y = top + 16 * s
        d["top"].show((wl, t_y), (wr, t_y), f"water surface {fmt(wr - wl, 'top_width')}", where="above",
                      ticks=([wl, wl, np.nan, wr, wr], [yn, t_y + 3 * s, np.nan, yn,
                                                                        t_y + 3 * s]))
        d["top"].label.set_y(t_y + 3 * s)
        # bottom width under the ditch
        if geo.bottom_width:
            b2 = geo.bottom_width / 2
            yb = g.base - 6 * s
            d["bottom"].show((-b2, yb), (b2, yb), f"bottom {fmt(geo.bottom_width)}", where="below",
                             ticks=([-b2, -b2, np.nan, b2, b2], [0, yb - 3 * s, np.nan, 0, yb - 3 * s]))
            d["bottom"].label.set_y(yb - 4 * s)
        else:
            d["bottom"].set_visible(False)
        # side slopes, written in the ground just outside each bank
        if geo.side_slopes is not None and geo.kind != "rectangle":
            xl_, xr_, zm = geo.slope_points
            for lab, z, x, sign in zip(self.slope_labels, geo.side_slopes, (xl_, xr_), (-1, 1)):
                norm = float(np.hypot(1.0, z))
                off = 18 * s + geo.thickness
                lab.set_text(f"{z:g} : 1" if z > 0 else "vertical")
                lab.set_position((x + sign * off / norm, zm - off * z / norm))
                lab.set_ha("center")
                lab.set_visible(True)
        else:
            for lab in self.slope_labels:
                lab.set_visible(False)
        self.lining_label.set_visible(False)
        # a scale bar under the drawing: the picture is to scale, the bar says how large
        x0, x1 = self.ax.get_xlim()
        z0, _ = self.ax.get_ylim()
        bar = nice_length((x1 - x0) / 6)
        bx0, bz = x0 + 20 * s, z0 + 18 * s
        self.scale_bar.set_data([bx0, bx0, np.nan, bx0, bx0 + bar, np.nan, bx0 + bar, bx0 + bar],
                                [bz + 3 * s, bz - 3 * s, np.nan, bz, bz, np.nan, bz + 3 * s, bz - 3 * s])
        self.scale_text.set_text(f"{bar:g} {L}   (drawn to scale)")
        self.scale_text.set_position((bx0, bz + 5 * s))
        self.scale_bar.set_visible(True)
        self.scale_text.set_visible(True)
        self.fade(False)


def nice_length(target: float) -> float:
    """1, 2 or 5 times a power of ten, close to ``target`` (for a scale bar)."""
    if target <= 0:
        return 1.0
    power = 10 ** np.floor(np.log10(target))
    for m in (1, 2, 5, 10):
        if m * power >= target * 0.7:
            return float(m * power)
    return float(10 * power)


class RatingPicture(Picture):
    """Flow against normal depth, with critical depth for the same flows and the design point."""

    def __init__(self, width=8.0, height=4.5, dpi=100):
        super().__init__(width, height, dpi)
        ax = self.ax
        ax.grid(True, color="#e4e7ea", lw=0.6)
        self.normal = ax.plot([], [], color=WATER_EDGE, lw=1.8, label="normal depth")[0]
        self.crit = ax.plot([], [], color=CRITICAL, lw=1.2, ls=(0, (5, 3)), label="critical depth")[0]
        self.top = ax.axhline(0, color=SOIL_EDGE, lw=0.8, ls=(0, (1, 2)))
        self.point = ax.plot([], [], "o", color=INK, ms=6, zorder=5)[0]
        self.point_label = ax.text(0, 0, "", fontsize=FONT, color=INK, ha="left", va="top", zorder=6)
        self.top_label = ax.text(0, 0, "", fontsize=FONT, color=SOIL_EDGE, ha="left", va="bottom")
        # a stone lining's n changes relation at da/D50 = 1.5: the curve kinks there, and the reason is shown
        self.switch = ax.axhline(0, color=INK, lw=0.7, ls=(0, (1, 3)), visible=False, label=SWITCH_NOTE)
        self.legend = ax.legend(loc="lower right", fontsize=FONT, frameon=False)

    def content_artists(self):
        return [self.normal, self.crit, self.top, self.point, self.point_label, self.top_label, self.switch]

    def update(self, data: RatingData, ev: Evaluation, units: UnitSystem, title: str = "") -> None:
        u = units.from_si
        q = u("flow", data.flows)
        y = u("length", data.depths)
        self.normal.set_data(q, y)
        self.crit.set_data(q, u("length", data.critical))
        qd, yd = u("flow", ev.flow), u("length", ev.result.normal_depth)
        self.point.set_data([qd], [yd])
        self.point_label.set_text(f"  design: {rounded(qd, panel_field('flow'))} {pretty(units.label('flow'))} at "
                                  f"{rounded(yd, panel_field('normal_depth'))} {units.label('length')}")
        self.point_label.set_position((qd, yd))
        top = u("length", ev.total_depth)
        self.top.set_ydata([top, top])
        self.top_label.set_text(" top of ditch" if ev.section.kind != "circle" else "")
        self.top_label.set_position((0, top))
        switch = data.switch_depth
        self.switch.set_visible(switch is not None)
        if switch is not None:
            ys = float(u("length", switch))
            self.switch.set_ydata([ys, ys])
        self._handles = [a for a in (self.normal, self.crit, self.switch) if a.get_visible()]
        self.ax.set_xlim(0, float(np.nanmax(q)) * 1.02)
        self.ax.set_ylim(0, float(np.nanmax(y)) * 1.05)
        self.ax.set_xlabel(f"flow [{pretty(units.label('flow'))}]", fontsize=FONT, color=INK)
        self.ax.set_ylabel(f"depth [{units.label('length')}]", fontsize=FONT, color=INK)
        self._title = title
        self.fit_writing(title)
        self.fade(False)

    def fit_writing(self, title: str | None = None) -> None:
        super().fit_writing(title)
        self.fit_legend(getattr(self, "_handles", [self.normal, self.crit]))
        self.keep_inside(self.point_label)


class EnergyPicture(Picture):
    """Specific energy against depth for the design flow: the two branches, E = y, critical and normal depth."""

    def __init__(self, width=8.0, height=4.5, dpi=100):
        super().__init__(width, height, dpi)
        ax = self.ax
        ax.grid(True, color="#e4e7ea", lw=0.6)
        self.curve = ax.plot([], [], color=WATER_EDGE, lw=1.8, label="specific energy E = y + V²/2g")[0]
        self.diag = ax.plot([], [], color=MUTED, lw=0.8, ls=(0, (2, 2)), label="E = y")[0]
        self.crit_line = ax.plot([], [], color=CRITICAL, lw=1.0, ls=(0, (5, 3)))[0]
        self.crit = ax.plot([], [], "o", color=CRITICAL, ms=6, zorder=5)[0]
        self.normal = ax.plot([], [], "o", color=INK, ms=6, zorder=5)[0]
        self.crit_label = ax.text(0, 0, "", fontsize=FONT, color=CRITICAL, ha="left", va="top")
        self.normal_label = ax.text(0, 0, "", fontsize=FONT, color=INK, ha="left", va="bottom")
        self.legend = ax.legend(loc="lower right", fontsize=FONT, frameon=False)

    def content_artists(self):
        return [self.curve, self.diag, self.crit_line, self.crit, self.normal, self.crit_label, self.normal_label]

    def update(self, data: EnergyData, units: UnitSystem, title: str = "") -> None:
        u = lambda v: units.from_si("length", v)  # noqa: E731
        L = units.label("length")
        e, y = u(data.energy), u(data.depths)
        ymax = float(y.max())
        xmax = min(float(np.nanmax(e)), 2.2 * ymax + 1e-9)
        self.curve.set_data(e, y)
        self.diag.set_data([0, ymax], [0, ymax])
        yc, ec = u(data.critical_depth), u(data.min_energy)
        yn, en = u(data.normal_depth), u(data.normal_energy)
        self.crit.set_data([ec], [yc])
        self.crit_line.set_data([0, ec], [yc, yc])
        self.normal.set_data([en], [yn])
        self.crit_label.set_text(f"  critical: y = {yc:.3f} {L}, E min = {ec:.3f} {L}")
        self.crit_label.set_position((ec, yc))
        self.normal_label.set_text(f"  normal depth: y = {yn:.3f} {L}, E = {en:.3f} {L}")
        self.normal_label.set_position((en, yn))
        self.ax.set_xlim(0, max(xmax, en * 1.3))
        self.ax.set_ylim(0, ymax * 1.04)
        self.ax.set_xlabel(f"specific energy E [{L}]", fontsize=FONT, color=INK)
        self.ax.set_ylabel(f"depth y [{L}]", fontsize=FONT, color=INK)
        self._title = title
        self.fit_writing(title)
        self.fade(False)

    def fit_writing(self, title: str | None = None) -> None:
        super().fit_writing(title)
        self.keep_inside(self.crit_label, self.normal_label)
