"""The profile of a ditch run along its stationing, drawn from the one drawing model (:mod:`app.run_drawing`).

One Figure on one canvas; the five lines are made once and moved with ``set_data``; the bands, markers and
labels, whose number changes with the run, are made again at each update. Margins are fixed (no layout
engine). Nothing here computes or converts: the model is in the user's units and worded already.
"""

from __future__ import annotations

import math

import numpy as np
from matplotlib.patches import Polygon, Rectangle
from matplotlib.transforms import blended_transform_factory

from ..run_drawing import ProfileModel
from .fields import pretty
from .plots import CRITICAL, FONT, INK, MUTED, SOIL_EDGE, WATER, WATER_EDGE, Picture

#: Fill of the lining stretches, by order of first appearance along the run.
STRETCH_COLOURS = ("#cfd8c4", "#c9c2b4", "#c3ccd6", "#e0d2b6", "#d3c7dc", "#bfd6d2")
#: Trouble spots: fill and words' colour by status (the words are the model's own).
TROUBLE_COLOURS = {"overtopped": ("#f0b9b4", "#8c1610"), "not stable": ("#f3c9c6", "#a4231b"),
                   "too shallow": ("#f7dcc0", "#8f4a0c"), "not checked": ("#ece8c8", "#6e5a08"),
                   "not computed": ("#e2e2e2", "#444444")}
#: The white ground under words drawn over the lines (the lines stay faintly seen through it).
LABEL_GROUND = dict(boxstyle="square,pad=0.1", fc="white", ec="none", alpha=0.75)
#: Line styles of the model's words (app.run_drawing.LINE_STYLES).
DASHES = {"solid": "-", "dashed": "--", "dotted": ":"}
BAND = 0.075         # height of the lining band at the foot of the axes, as a fraction of the axes
LANES = 3            # rows of inflow labels at the top of the axes
LANE_PT = 11.5       # height of a row of inflow labels [points], the first one under the top of the axes
LIFT_PT = 11.0       # a label that would cover another moves by this much at a time [points]
CHAR_PX = 6.3        # about the width of one character at the label size [logical px], to keep labels apart


#: The height of one row of the profile's key [logical px], part of the bottom pad.
KEY_ROW = 22
#: The colour of each line in words, for the key in words (the canvas's tooltip when the key is left out).
KEY_COLOURS = {"ditch_top": "brown", "invert": "black, thick", "water_surface": "blue", "normal": "blue",
               "critical": "orange"}


class ProfilePicture(Picture):
    """Ditch top, invert, the computed water surface, normal depth (dashed) and critical depth (dotted) along the
    run; hydraulic jumps marked with their station; lining stretches as labelled bands at the foot, trouble spots
    (overtopped, too shallow...) shaded with their words, inflows labelled at the top, grades under the invert."""

    margins = dict(left=0.075, right=0.985, bottom=0.2, top=0.92)
    #: Room around the axes in pixels: left (elevations), right (the last station's label), bottom (stations,
    #: their heading and the key), top (the title).
    pads = (62, 40, 74, 30)

    def __init__(self, width=9.0, height=4.2, dpi=100):
        super().__init__(width, height, dpi)
        ax = self.ax
        ax.grid(True, axis="y", color="#e4e7ea", lw=0.6)
        self.water = Polygon(np.zeros((3, 2)), closed=True, fc=WATER, ec="none", zorder=1, alpha=0.8)
        ax.add_patch(self.water)
        self.lines = {
            "ditch_top": ax.plot([], [], color=SOIL_EDGE, lw=1.0, ls=(0, (6, 2)), zorder=3)[0],
            "invert": ax.plot([], [], color=INK, lw=1.8, zorder=4)[0],
            "water_surface": ax.plot([], [], color=WATER_EDGE, lw=1.4, zorder=5)[0],
            "normal": ax.plot([], [], color=WATER_EDGE, lw=1.0, ls=DASHES["dashed"], alpha=0.8, zorder=5)[0],
            "critical": ax.plot([], [], color=CRITICAL, lw=1.3, ls=DASHES["dotted"], zorder=5)[0],
        }
        self.cursor = ax.axvline(0, color="#2c6b9f", lw=1.0, alpha=0.55, zorder=2, visible=False)
        self.cursor_label = ax.text(0, BAND + 0.01, "", transform=blended_transform_factory(ax.transData, ax.transAxes),
                                    fontsize=FONT - 1, color="#1d4f7a", ha="left", va="bottom", zorder=9,
                                    bbox=dict(boxstyle="square,pad=0.15", fc="white", ec="none", alpha=0.85))
        self.legend = None
        self._made = []      # artists made for one model: bands, markers, labels
        self.model: ProfileModel | None = None
        self.selected: float | None = None

    # -- what is drawn ---------------------------------------------------------------------
    def content_artists(self):
        return [self.water, *self.lines.values(), *self._made]

    def _clear_made(self) -> None:
        for a in self._made:
            a.remove()
        self._made = []

    def update(self, model: ProfileModel) -> None:
        """Draw ``model`` (an app.run_drawing.ProfileModel)."""
        self.model = model
        ax = self.ax
        self._fit_margins()
        self._clear_made()
        for name, artist in self.lines.items():
            line = model.lines[name]
            artist.set_data(line.x, line.y)
            artist.set_label(line.label)
            artist.set_linestyle(DASHES[model.styles.get(name, "solid")])
        inv, ws = model.lines["invert"], model.lines["water_surface"]
        bed = np.interp(ws.x, inv.x, inv.y) if inv.x.size else ws.y
        top = np.where(np.isfinite(ws.y), ws.y, bed)
        self.water.set_xy(np.column_stack([np.concatenate([ws.x, ws.x[::-1]]),
                                           np.concatenate([bed, top[::-1]])]) if ws.x.size else np.zeros((3, 2)))
        x0, x1 = model.first_station, model.last_station
        low, high = model.y_range()
        span = max(high - low, 1e-6)
        ax.set_xlim(x0 - 0.01 * (x1 - x0), x1 + 0.01 * (x1 - x0))
        ax.set_ylim(low - 0.2 * span, high + 0.3 * span)   # room for the bands below and the inflows above
        ticks = thinned(model.ticks, ax.get_window_extent().width, CHAR_PX * self.ratio)
        ax.set_xticks([t for t, _ in ticks], [text for _, text in ticks])
        ax.set_xlabel("station", fontsize=FONT, color=INK, labelpad=2)
        ax.set_ylabel(f"elevation [{pretty(model.length_unit)}]", fontsize=FONT, color=INK)
        self._title_that_fits(model.title)
        foot = blended_transform_factory(ax.transData, ax.transAxes)
        px_per_unit = ax.get_window_extent().width / self.ratio / max(x1 - x0, 1e-9)     # logical px
        self._stretches(model, foot, px_per_unit)
        self._trouble(model, foot)
        self._inflows(model, foot, px_per_unit)
        renderer = self.figure.canvas.get_renderer()
        placed = [t for t in self._made if hasattr(t, "get_text") and t.get_text()]   # band and trouble words
        inside = ax.get_window_extent(renderer)
        for g in model.grades:
            # under the invert on its upstream side, where a falling line stays above the words
            label = ax.annotate(f"grade {g.text}", (g.x, g.y), xytext=(-4 if g.falling else 4, -8),
                                textcoords="offset points", ha="right" if g.falling else "left", va="top",
                                fontsize=FONT - 1, color=INK, zorder=6,
                                bbox=dict(boxstyle="round,pad=0.2", fc="white", ec="none", alpha=0.85))
            self._made.append(label)
            if label.get_window_extent(renderer).x0 < inside.x0 or label.get_window_extent(renderer).x1 > inside.x1:
                label.set_ha("left" if g.falling else "right")          # the other side, within the axes
                label.xyann = (-label.xyann[0], label.xyann[1])
            placed.append(keep_clear(label, placed, renderer, -LIFT_PT, within=inside))
        for jm in model.jumps:
            self._made.append(ax.plot([jm.start, jm.start], [jm.low, jm.high], color=CRITICAL, lw=2.0,
                                      zorder=7)[0])
            label = ax.annotate(jm.label, (jm.start, jm.high), xytext=(0, 14), textcoords="offset points",
                                ha="center", va="bottom", fontsize=FONT - 1, color=CRITICAL, zorder=8,
                                arrowprops=dict(arrowstyle="-", color=CRITICAL, lw=0.8),
                                bbox=dict(boxstyle="round,pad=0.2", fc="white", ec="none", alpha=0.85))
            self._made.append(label)
            placed.append(keep_clear(label, placed, renderer, LIFT_PT, within=inside))
        if model.outfall:
            s, z, label = model.outfall
            self._made.append(ax.plot([s], [z], marker="s", ms=6, color=INK, zorder=7)[0])
            top_line = model.lines["ditch_top"]
            above = float(top_line.y[int(np.argmin(np.abs(top_line.x - s)))]) if top_line.x.size else z
            self._made.append(ax.plot([s, s], [z, above], color=INK, lw=0.8, zorder=7)[0])
            text = ax.annotate(label, (s, above), xytext=(-4, 8), textcoords="offset points",
                               ha="right", va="bottom", fontsize=FONT - 1, color=INK, zorder=7,
                               bbox=dict(boxstyle="round,pad=0.2", fc="white", ec="none", alpha=0.85))
            self._made.append(text)
            keep_clear(text, placed, renderer, LIFT_PT, within=inside)
        handles = [self.lines[k] for k in ("ditch_top", "water_surface", "normal", "critical", "invert")]
        if self.legend is not None:
            self.legend.remove()
        self._key(handles)
        self.show_station(self.selected)
        self.fade(False)

    def _title_that_fits(self, name: str) -> None:
        """"<name>: profile along the stationing", or shorter where the figure is narrow (the name alone last,
        broken into lines if it is still too wide)."""
        renderer = self.figure.canvas.get_renderer()
        room = self.figure.bbox.width - self.ax.get_window_extent(renderer).x0 - self.px(self.edge)
        for text in (f"{name}: profile along the stationing", f"{name}: profile", name):
            self.title.set_text(text)
            if self.title.get_window_extent(renderer).width <= room:
                return
        self.wrap_title(name, room)

    def _key(self, handles) -> None:
        """The key under the stations: one row of five where the figure is wide enough (closer together if need
        be), else as many rows as it takes (the margin below grows by the rows added). On a figure too low for
        the rows the key is left out and its words go to the canvas's tooltip, so that the profile keeps the
        room."""
        renderer = self.figure.canvas.get_renderer()
        room = self.figure.bbox.width - self.px(2 * self.edge)
        # one row, then one row drawn closer together, then more rows
        for columns, handle, gap in ((5, 2.4, 2.0), (5, 1.6, 0.8), (3, 1.6, 0.8), (2, 1.6, 0.8), (1, 1.6, 0.8)):
            self.legend = self.figure.legend(handles=handles, loc="lower center", ncol=columns, fontsize=FONT - 0.5,
                                             frameon=False, bbox_to_anchor=(0.5, 0.0), handlelength=handle,
                                             columnspacing=gap, handletextpad=0.5, borderaxespad=0.2)
            if columns == 1 or self.legend.get_window_extent(renderer).width <= room:
                break
            self.legend.remove()
        if self._fit_margins(key_height=self.legend.get_window_extent(renderer).height):
            self.legend.set_visible(True)
            self.canvas.setToolTip("")
        else:
            self.legend.set_visible(False)
            self._fit_margins(key_height=0.0)
            self.canvas.setToolTip("Key (left out for want of room): " + "; ".join(
                f"{h.get_label()} ({KEY_COLOURS[name]}, {self.model.styles.get(name, 'solid')})"
                for name, h in self.lines.items()))

    def _fit_margins(self, key_height: float | None = None) -> bool:
        """Margins of ``pads`` logical pixels whatever the size of the canvas and its pixel ratio; the bottom one
        holds a key of ``key_height`` device pixels (``KEY_ROW`` logical pixels, one row, when not given).
        False (the margins left as they were) where the plot would be left too little."""
        w, h = self.figure.get_size_inches() * self.figure.dpi
        left, right, bottom, top = (p * self.ratio for p in self.pads)
        if key_height is not None:
            bottom += key_height - KEY_ROW * self.ratio
        if w > 3 * (left + right) and h > 1.6 * (bottom + top):      # else the plot would be left too little
            self.figure.subplots_adjust(left=left / w, right=1 - right / w, bottom=bottom / h, top=1 - top / h)
            return True
        return False

    def _stretches(self, model, foot, px_per_unit) -> None:
        colours: dict[str, str] = {}
        for band in model.stretches:
            colour = colours.setdefault(band.label, STRETCH_COLOURS[len(colours) % len(STRETCH_COLOURS)])
            rect = Rectangle((band.start, 0.0), band.end - band.start, BAND, transform=foot, fc=colour,
                             ec="white", lw=1.0, zorder=6)
            self.ax.add_patch(rect)
            self._made.append(rect)
            text = fitting_label(band.label, (band.end - band.start) * px_per_unit)
            if text:
                self._made.append(self.ax.text((band.start + band.end) / 2, BAND / 2, text, transform=foot,
                                               ha="center", va="center", fontsize=FONT - 1.5, color=INK,
                                               zorder=7, clip_on=True))

    def _trouble(self, model, foot) -> None:
        renderer = self.figure.canvas.get_renderer()
        last = None        # the last label placed, to lift the next one when they would overlap
        for band in sorted(model.trouble, key=lambda b: b.start):
            fill, ink = TROUBLE_COLOURS.get(band.status, ("#eeeeee", INK))
            width = max(band.end - band.start, 0.004 * (model.last_station - model.first_station))
            start = (band.start + band.end) / 2 - width / 2
            rect = Rectangle((start, BAND), width, 0.74 - BAND, transform=foot, fc=fill, ec="none", alpha=0.7,
                             zorder=0.5)
            self.ax.add_patch(rect)
            self._made.append(rect)
            text = self.ax.text((band.start + band.end) / 2, 0.76, band.label, transform=foot, ha="center",
                                va="bottom", fontsize=FONT - 1, color=ink, fontweight="bold", zorder=8)
            self._made.append(text)
            if last is not None and last.get_position()[1] == 0.76 and \
                    text.get_window_extent(renderer).x0 < last.get_window_extent(renderer).x1 + 4:
                text.set_y(0.82)
            last = text

    def _inflows(self, model, foot, px_per_unit) -> None:
        """Inflows at the top: a range as a bracket, a point as a marker, each label in the first lane where it
        does not run into another (the rows a label high, so that on a low picture they spread down); a label
        with no lane free is left out (the inputs list every inflow), its bracket or marker drawn."""
        ends = [-np.inf] * LANES          # right end of the last label in each lane [logical px]
        row = self.px(LANE_PT) / max(self.ax.get_window_extent().height, 1.0)    # a row, fraction of the axes
        lanes = [1 - row - i * max(0.06, row) for i in range(LANES)]
        for m in sorted(model.inflows, key=lambda m: m.start):
            left = (m.start - model.first_station) * px_per_unit
            right = max(left + len(m.label) * CHAR_PX + 10, (m.end - model.first_station) * px_per_unit)
            lane = next((i for i, e in enumerate(ends) if left > e + 6), None)
            labelled = lane is not None
            if labelled:
                ends[lane] = right
            else:
                lane = int(np.argmin(ends))
            y = lanes[lane]
            if m.end > m.start:
                self._made.append(self.ax.plot([m.start, m.start, m.end, m.end], [y - 0.03, y, y, y - 0.03],
                                               transform=foot, color=WATER_EDGE, lw=0.9, zorder=8)[0])
                self._made.append(self.ax.text(m.start, y + 0.005, f" {m.label}", transform=foot, ha="left",
                                               va="bottom", fontsize=FONT - 1, color=WATER_EDGE, zorder=8,
                                               visible=labelled, bbox=LABEL_GROUND))
            else:
                self._made.append(self.ax.plot([m.start, m.start], [BAND, y], transform=foot, color=WATER_EDGE,
                                               lw=0.6, ls=(0, (2, 3)), zorder=2)[0])
                self._made.append(self.ax.plot([m.start], [y], transform=foot, marker="v", ms=6, color=WATER_EDGE,
                                               zorder=8)[0])
                self._made.append(self.ax.text(m.start, y + 0.005, f"  {m.label}", transform=foot, ha="left",
                                               va="bottom", fontsize=FONT - 1, color=WATER_EDGE, zorder=8,
                                               visible=labelled, bbox=LABEL_GROUND))

    def show_station(self, station: float | None, text: str = "") -> None:
        """Mark the station picked in the table (None: no mark)."""
        self.selected = station
        visible = station is not None
        self.cursor.set_visible(visible)
        self.cursor_label.set_visible(visible)
        if visible:
            self.cursor.set_xdata([station, station])
            self.cursor_label.set_position((station, BAND + 0.01))
            self.cursor_label.set_text(f" {text}")

    def nearest_station(self, x: float) -> int | None:
        """Index of the design point nearest the station ``x`` (user's units), from the model's invert line."""
        if self.model is None:
            return None
        xs = self.model.lines["invert"].x
        return int(np.argmin(np.abs(xs - x))) if xs.size else None


def keep_clear(label, others, renderer, step: float, tries: int = 8, within=None):
    """Move the annotation ``label`` by ``step`` points at a time (up when positive, down when negative) until its
    box covers none of the texts ``others``, at most ``tries`` times; returns ``label``. With ``within`` (a box in
    pixels, the axes') the label never leaves it that way: when moving on would take it out, it is moved the other
    way from where it started instead (on a low picture the room above or below runs out first), and where neither
    way has a clear place the label is hidden rather than drawn over the others."""
    def box(t):
        return t.get_window_extent(renderer).padded(2)      # the words and their white ground

    def outside(t):
        e = t.get_window_extent(renderer)
        return within is not None and (e.y0 < within.y0 or e.y1 > within.y1)

    start = label.xyann
    for way in (step, -step):
        label.xyann = start
        for _ in range(tries):
            if not any(box(label).overlaps(box(o)) for o in others if o.get_visible()):
                return label
            dx, dy = label.xyann
            label.xyann = (dx, dy + way)
            if outside(label):
                break
        else:
            return label
        if within is None:
            return label
    label.xyann = start                  # no clear place inside (a low picture): left out, the table says it
    label.set_visible(False)
    return label


def thinned(ticks: list, width_px: float, char_px: float) -> list:
    """Every k-th of ``ticks`` ((station, label) pairs), k the least that gives each label its width and two
    characters between on an axis ``width_px`` wide (``char_px``: the width of one character there)."""
    if not ticks:
        return ticks
    each = (max(len(text) for _, text in ticks) + 2) * char_px
    return ticks[::max(1, math.ceil(len(ticks) * each / max(width_px, 1.0)))]


def fitting_label(label: str, width_px: float) -> str:
    """The label of a band that fits ``width_px``: the whole name, its first part (up to a comma), its first word,
    or nothing (the schedule beside names every stretch in full)."""
    for text in (label, label.split(",")[0], label.split(" ")[0]):
        if len(text) * CHAR_PX * 0.9 + 8 <= width_px:
            return text
    return ""
