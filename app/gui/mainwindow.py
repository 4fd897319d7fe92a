"""The main window: channels and their inputs on the left, the picture in the middle, the verdict on the right."""

from __future__ import annotations

import copy
import dataclasses
import time
from pathlib import Path

from PySide6.QtCore import QSize, Qt, QTimer, QUrl
from PySide6.QtGui import QAction, QActionGroup, QDesktopServices, QKeySequence
from PySide6.QtWidgets import (QApplication, QDialog, QFileDialog, QHBoxLayout, QInputDialog, QLabel, QListWidget,
                               QListWidgetItem, QMainWindow, QMessageBox, QSplitter, QStackedWidget, QStyle, QTabWidget,
                               QToolButton, QVBoxLayout, QWidget)

import hydraulics as hy
from hydraulics import units as hu

from .. import __version__
from .. import channel_display as display
from .. import project as pj
from .. import sheet as sh
from ..context import Context
from ..editing import new_project
from ..files import FileChangedError, FileStamp
from . import settings
from .autosave import Autosaver, find_recoverable, save_failure_reason
from .comparison import ComparisonView
from .document import ProjectDocument
from .fields import pretty, sentence
from .forms import SHAPES, InputPanel
from .plots import EnergyPicture, RatingPicture, SectionPicture, section_drawing
from .results_view import CAUTION, ResultsPanel
from .sheet_dialogs import ExportSheetDialog, NotesDialog, SheetDetailsDialog, ask_password
from .screen_fit import SideTabs, fit_to_screen, scrolling
from .shortcuts import WindowKeys
from .style import STYLE
from .tasks import Recomputer, Task

LANDXML_FILTER = "LandXML files (*.xml);;All files (*)"
FILE_FILTER = "Ditchwright projects (*.json);;All files (*)"
SHAPE_NAMES = dict(SHAPES)
TABS = ("section", "rating", "energy", "compare")
#: A new result that takes longer than this is marked as being computed [ms] (a usual one takes a few ms).
SLOW = 300


class MainWindow(QMainWindow):
    def __init__(self, project: pj.Project | None = None, path=None, *, persistent: bool = True,
                 context: Context | None = None):
        """The window over ``project`` (read from ``path``). ``context`` is what it evaluates and exports with;
        by default the shipped lining catalogue with the user's catalogue file of the data folder laid over it
        (the shipped one alone when not ``persistent``)."""
        super().__init__()
        self.persistent = persistent
        if context is None:   # the user's own linings and unit costs, laid over the shipped catalogue
            context = Context.load(settings.user_catalogue_path() if persistent else None)
        self.doc = ProjectDocument(project, path, parent=self, context=context)
        self.last_good: display.Evaluation | None = None
        self.evaluation: display.Evaluation | None = None   # the newest result in, None until the first is
        self.evaluated_channel: pj.Channel | None = None      # the channel as it was when evaluated so
        self.complaint = ""                                  # the form's refusal of a typed value, if any
        # the current channel is evaluated off the window's thread, the newest inputs only, so typing never waits
        self.evaluator = Recomputer(self._evaluation_work, self)
        self.evaluator.succeeded.connect(lambda done: self._evaluated(*done))
        self.evaluated_drawing = None     # the section's shapes of that result, made in the worker too
        self.evaluator.failed.connect(lambda exc: self._evaluated(None, display.not_computed(exc)))
        self.slow = QTimer(self)
        self.slow.setSingleShot(True)
        self.slow.setInterval(SLOW)
        self.slow.timeout.connect(lambda: self.results.set_updating(not self.evaluator.idle))
        self._drawn: dict[str, int] = {}
        self.export_task: Task | None = None
        self.inventory_dialog = None
        self.run_view = None          # made when first shown (its modules load only then)
        self.setStyleSheet(STYLE)
        self.create_actions()
        self.create_menus()
        self.create_tool_bars()
        self.create_status_bar()
        self.create_panels()
        self.connect_document()
        self.window_keys = WindowKeys(self)   # shortcuts work while a text box has the focus
        self.read_settings()
        self.autosaver = Autosaver(self.doc, parent=self) if persistent else None
        if self.autosaver:
            self.autosaver.failed.connect(self.autosave_failed)
        if context.catalogue_problem:
            self.statusBar().showMessage(context.catalogue_problem, 15000)
        self.refresh_all()

    # -- construction, in named steps ---------------------------------------------------
    def create_actions(self) -> None:
        style = self.style()

        def act(text, slot, shortcut=None, tip="", icon=None, checkable=False):
            a = QAction(text, self)
            if shortcut is not None:
                a.setShortcut(QKeySequence(shortcut))
            if tip:
                a.setStatusTip(tip)
                a.setToolTip(tip)
            if icon is not None:
                a.setIcon(style.standardIcon(icon))
            a.setCheckable(checkable)
            if slot is not None:
                a.triggered.connect(slot)
            return a

        SP = QStyle.StandardPixmap
        K = QKeySequence.StandardKey
        self.new_action = act("&New project", self.new_project, K.New, "Start a new project", SP.SP_FileIcon)
        self.open_action = act("&Open…", self.open_dialog, K.Open, "Open a project file", SP.SP_DialogOpenButton)
        self.demo_action = act("Open the &demo project", self.open_demo, None,
                               "Open the demo project of an invented site")
        self.save_action = act("&Save", self.save, K.Save, "Save the project", SP.SP_DialogSaveButton)
        self.save_as_action = act("Save &as…", self.save_as, K.SaveAs, "Save the project under a new name")
        self.export_action = act("&Export design sheets…", self.export_dialog, "Ctrl+E",
                                 "Write the design sheet of this channel or of the whole project to a PDF",
                                 SP.SP_FileDialogDetailedView)
        self.export_action.setIconText("Export sheets")
        self.drawings_action = act("Export dra&wings (DXF)…", self.export_drawings_dialog, None,
                                   "Write the typical section of every channel and the profile of every ditch run "
                                   "as DXF drawings for CAD, into a folder")
        self.landxml_action = act("Import &LandXML…", self.import_landxml, None,
                                  "Add the road profiles and cross-sections of a LandXML file to this project as "
                                  "ditch runs (undo removes them again)")
        self.new_run_action = act("New di&tch run", self.add_run, None,
                                  "Add a ditch run at round starting values to this project (undo removes it)")
        self.inventory_action = act("Check an &inventory…", self.open_inventory, "Ctrl+I",
                                    "Check every reach of a ditch inventory (CSV) and import chosen ones")
        self.quit_action = act("&Quit", self.close, K.Quit, "Close the window")
        self.undo_action = self.doc.undo_stack.createUndoAction(self, "&Undo")
        self.undo_action.setShortcut(QKeySequence(K.Undo))
        self.undo_action.setIcon(style.standardIcon(SP.SP_ArrowBack))
        self.undo_action.setIconText("Undo")   # the tool bar keeps a short label; the menu says what
        self.redo_action = self.doc.undo_stack.createRedoAction(self, "&Redo")
        self.redo_action.setShortcuts([QKeySequence(K.Redo), QKeySequence("Ctrl+Y")])
        self.redo_action.setIcon(style.standardIcon(SP.SP_ArrowForward))
        self.redo_action.setIconText("Redo")
        self.add_action = act("&Add channel", self.doc.add_channel, "Ctrl+Shift+N", "Add a channel to the project")
        self.duplicate_action = act("&Duplicate channel", self.doc.duplicate_channel, "Ctrl+D",
                                    "Copy the current channel")
        self.rename_action = act("Re&name channel…", self.rename_channel, "F2", "Rename the current channel")
        self.delete_action = act("De&lete channel", self.delete_channel, None, "Delete the current channel")
        self.project_name_action = act("Project &name…", self.rename_project, None, "Name the project")
        self.sheet_details_action = act("&Sheet details…", self.edit_sheet_details, None,
                                        "Company, logo, project number, revision and sign-off names for the sheets")
        self.rainfall_action = act("&Rainfall (IDF)…", self.edit_rainfall, None,
                                   "The rainfall intensity by duration and return period that the ditch runs read")
        self.project_notes_action = act("Project n&otes…", self.edit_project_notes, None,
                                        "Notes about the whole project")
        self.copy_table_action = act("&Copy comparison table", self.copy_table, None,
                                     "Copy the lining comparison as tab-separated text")
        self.tab_actions = []
        for i, (key, text) in enumerate(zip(TABS, ("&Section", "&Rating curve", "Specific &energy",
                                                   "&Lining comparison"))):
            self.tab_actions.append(act(text, lambda _=False, i=i: self.show_channels(i), f"Ctrl+{i + 1}",
                                        f"Show the {text.replace('&', '').lower()}"))
        self.pages_group = QActionGroup(self)
        self.channels_action = act("C&hannels", lambda: self.show_channels(), None,
                                   "Show the channels of the project (Ctrl+1 to Ctrl+4 pick a picture)",
                                   checkable=True)
        self.runs_action = act("&Ditch runs", self.show_runs, "Ctrl+5",
                               "Show the ditch runs of the project: profile, station table and lining schedule",
                               checkable=True)
        for a in (self.channels_action, self.runs_action):
            self.pages_group.addAction(a)
        self.channels_action.setChecked(True)
        self.open_station_action = act("&Open station as a channel", self.open_station, "Ctrl+Shift+O",
                                       "Add the station chosen in the run's table to the channels and show it")
        self.open_station_action.setEnabled(False)
        self.units_group = QActionGroup(self)
        self.si_action = act("&SI (m, m³/s, Pa)", lambda: self.doc.set_units("si"), None,
                             "Show every value in SI units", checkable=True)
        self.us_action = act("&US customary (ft, ft³/s, lb/ft²)", lambda: self.doc.set_units("us"), None,
                             "Show every value in US customary units", checkable=True)
        self.si_action.setIconText("SI")
        self.us_action.setIconText("US")
        for a in (self.si_action, self.us_action):
            self.units_group.addAction(a)
        self.about_action = act("&About Ditchwright", self.about, None, "Version and cautions")

    def create_menus(self) -> None:
        bar = self.menuBar()
        m = bar.addMenu("&File")
        m.addActions([self.new_action, self.open_action])
        self.recent_menu = m.addMenu("Open &recent")
        self.recent_menu.aboutToShow.connect(self.fill_recent_menu)
        m.addAction(self.demo_action)
        m.addSeparator()
        m.addActions([self.save_action, self.save_as_action])
        m.addSeparator()
        m.addActions([self.export_action, self.drawings_action, self.landxml_action, self.new_run_action,
                      self.inventory_action])
        m.addSeparator()
        m.addAction(self.quit_action)
        m = bar.addMenu("&Edit")
        m.addActions([self.undo_action, self.redo_action])
        m.addSeparator()
        m.addActions([self.add_action, self.duplicate_action, self.rename_action, self.delete_action])
        m.addSeparator()
        m.addAction(self.copy_table_action)
        m.addAction(self.open_station_action)
        m = bar.addMenu("&Project")
        m.addActions([self.project_name_action, self.sheet_details_action, self.project_notes_action,
                      self.rainfall_action])
        m = bar.addMenu("&View")
        m.addActions([self.channels_action, self.runs_action])
        m.addSeparator()
        m.addActions(self.tab_actions)
        m.addSeparator()
        u = m.addMenu("&Units")
        u.addActions([self.si_action, self.us_action])
        m = bar.addMenu("&Help")
        m.addAction(self.about_action)

    def create_tool_bars(self) -> None:
        tb = self.addToolBar("Project")
        tb.setObjectName("projectToolBar")
        tb.setMovable(False)
        tb.setToolButtonStyle(Qt.ToolButtonStyle.ToolButtonTextBesideIcon)
        tb.setIconSize(QSize(16, 16))
        tb.addActions([self.new_action, self.open_action, self.save_action])
        tb.addSeparator()
        tb.addActions([self.undo_action, self.redo_action])
        tb.addSeparator()
        tb.addAction(self.export_action)
        tb.addSeparator()
        tb.addActions([self.channels_action, self.runs_action])
        tb.addSeparator()
        tb.addWidget(QLabel(" Units "))
        tb.addActions([self.si_action, self.us_action])

    def create_status_bar(self) -> None:
        sb = self.statusBar()
        self.units_label = QLabel()
        sb.addPermanentWidget(self.units_label)

    def create_panels(self) -> None:
        # left: the channels of the project, then the inputs of the current one
        self.channel_list = QListWidget()
        self.channel_list.setObjectName("channels")
        self.channel_list.setMaximumHeight(150)
        self.channel_list.currentRowChanged.connect(self._channel_picked)
        self.channel_list.itemChanged.connect(self._channel_renamed_in_list)
        buttons = QHBoxLayout()
        buttons.setSpacing(4)
        for a, text in ((self.add_action, "Add"), (self.duplicate_action, "Duplicate"),
                        (self.rename_action, "Rename"), (self.delete_action, "Delete")):
            b = QToolButton()
            b.setDefaultAction(a)
            b.setText(text)
            b.setToolButtonStyle(Qt.ToolButtonStyle.ToolButtonTextOnly)
            buttons.addWidget(b)
        buttons.addStretch(1)
        heading = QLabel("Channels in this project")
        heading.setObjectName("subheading")
        self.inputs = InputPanel(self.doc)
        self.inputs.validity_changed.connect(self.show_current)   # the stored channel, so its result, is the same
        listing = QWidget()
        ll = QVBoxLayout(listing)
        ll.setContentsMargins(8, 6, 0, 0)
        ll.setSpacing(4)
        ll.addWidget(heading)
        ll.addWidget(self.channel_list)
        ll.addLayout(buttons)
        self.channel_list.setMinimumHeight(3 * self.fontMetrics().height())
        # the list over the inputs, in a splitter: on a short screen the user gives the inputs the room
        left = self.left_split = QSplitter(Qt.Orientation.Vertical)
        left.setObjectName("leftSplitter")
        left.addWidget(listing)
        left.addWidget(self.inputs)
        left.setStretchFactor(0, 0)
        left.setStretchFactor(1, 1)
        left.setChildrenCollapsible(False)
        self.inputs.setMinimumHeight(120)

        # middle: the pictures
        self.section_picture = SectionPicture()
        self.rating_picture = RatingPicture()
        self.energy_picture = EnergyPicture()
        self.comparison = ComparisonView(self.doc)
        self.comparison.status_message.connect(lambda m: self.statusBar().showMessage(m, 6000))
        self.tabs = QTabWidget()
        self.tabs.setObjectName("views")
        self.tabs.addTab(self.section_picture.canvas, "Cross-section")
        self.tabs.addTab(self.rating_picture.canvas, "Rating curve")
        self.tabs.addTab(self.energy_picture.canvas, "Specific energy")
        self.tabs.addTab(self.comparison, "Lining comparison")
        self.tabs.currentChanged.connect(self.draw_current)

        # right: verdict and numbers
        self.results = ResultsPanel()

        self.splitter = QSplitter(Qt.Orientation.Horizontal)
        self.splitter.setObjectName("mainSplitter")
        self.splitter.addWidget(left)
        self.splitter.addWidget(self.tabs)
        self.splitter.addWidget(self.results)
        self.splitter.setStretchFactor(0, 0)
        self.splitter.setStretchFactor(1, 1)
        self.splitter.setStretchFactor(2, 0)
        self.splitter.setSizes([405, 695, 340])
        self.splitter.setChildrenCollapsible(False)
        # three columns in 911 logical px (1366 px at 150 %): the side panels scroll sideways when narrower
        self.results.setMinimumWidth(265)
        self.results.scroll.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAsNeeded)
        # the narrow window's left column: the inputs and the results as two tabs (see screen_fit.TWO_COLUMNS_BELOW)
        self.side_tabs = SideTabs(self.splitter, self.inputs, self.results)
        self.pages = QStackedWidget()
        self.pages.setObjectName("pages")
        self.pages.addWidget(self.splitter)
        # below the panels' least size (a small screen at a large scale) the whole page scrolls, never cut
        self.setCentralWidget(scrolling(self.pages, horizontal=True))

    def resizeEvent(self, event) -> None:
        super().resizeEvent(event)
        self.side_tabs.follow(self.width())

    @property
    def two_columns(self) -> bool:
        """Whether the window shows two columns (the inputs and the results as tabs), not three."""
        return self.side_tabs.two_columns

    def connect_document(self) -> None:
        d = self.doc
        d.reset.connect(self.refresh_all)
        d.channels_changed.connect(self.fill_channel_list)
        d.current_changed.connect(self._current_changed)
        d.channel_changed.connect(self._channel_changed)
        d.units_changed.connect(self.refresh_all)
        d.project_changed.connect(self.update_title)
        d.runs_changed.connect(self.update_run_actions)
        d.undo_stack.cleanChanged.connect(self.update_title)
        d.undo_stack.indexChanged.connect(self.update_title)

    def read_settings(self) -> None:
        fit_to_screen(self, 1440, 900)
        if not self.persistent:
            return
        geometry = settings.WINDOW_GEOMETRY.read()
        if not geometry.isEmpty():
            self.restoreGeometry(geometry)
        state = settings.WINDOW_STATE.read()
        if not state.isEmpty():
            self.restoreState(state)
        split = settings.SPLITTER_STATE.read()
        if not split.isEmpty():
            self.splitter.restoreState(split)

    def write_settings(self) -> None:
        if not self.persistent:
            return
        settings.WINDOW_GEOMETRY.write(self.saveGeometry())
        settings.WINDOW_STATE.write(self.saveState())
        if not self.two_columns:      # the widths of the three columns; the narrow window sets its own
            settings.SPLITTER_STATE.write(self.splitter.saveState())

    # -- showing ---------------------------------------------------------------------------
    def refresh_all(self, *_signal_args) -> None:
        self.last_good = self.evaluation = None
        self.fill_channel_list()
        units = self.doc.project.units
        (self.si_action if units == "si" else self.us_action).setChecked(True)
        self.units_label.setText(f"Units: {'SI' if units == 'si' else 'US customary'}")
        self.update_title()
        self.refresh()
        self.update_run_actions()

    def _current_changed(self, index: int) -> None:
        self.last_good = self.evaluation = None
        self.channel_list.blockSignals(True)
        self.channel_list.setCurrentRow(index)
        self.channel_list.blockSignals(False)
        self.refresh()

    def fill_channel_list(self, *_signal_args) -> None:
        lst = self.channel_list
        lst.blockSignals(True)
        lst.clear()
        for ch in self.doc.project.channels:
            item = QListWidgetItem(ch.name)
            item.setFlags(item.flags() | Qt.ItemFlag.ItemIsEditable)
            lst.addItem(item)
        lst.setCurrentRow(self.doc.current)
        lst.blockSignals(False)
        self.delete_action.setEnabled(len(self.doc.project.channels) > 1)

    def _channel_changed(self, index: int) -> None:
        if index == self.doc.current:
            self.refresh()

    def refresh(self, *_signal_args) -> None:
        """Evaluate the current channel off the window's thread; what is shown stays until the result is in."""
        self.evaluator.request()
        self.slow.start()

    def _evaluation_work(self):
        """The evaluation of the current channel as it is now, on copies, and the shapes of its section picture
        (numpy only), so that the window's thread only moves the artists (run in the worker)."""
        channel, context, units = copy.deepcopy(self.doc.channel()), self.doc.context, self.doc.units

        def work():
            ev = display.evaluate(channel, context)
            drawing = None
            if ev.ok:
                try:
                    drawing = section_drawing(ev, units, ev.lining.layer_thickness if ev.lining else None)
                except Exception:  # noqa: BLE001 - the picture makes it again in the window, where it is told
                    drawing = None
            return channel, ev, drawing
        return work

    def _evaluated(self, channel: pj.Channel | None, ev: display.Evaluation, drawing=None) -> None:
        """The result of the newest inputs (``channel``, None when the evaluation failed) is in: show it."""
        self.slow.stop()
        self.results.set_updating(False)
        self.evaluation, self.evaluated_channel, self.evaluated_drawing = ev, channel, drawing
        self.inputs.show_evaluation(ev)
        if ev.ok and not self.inputs.first_complaint():
            self.last_good = ev
        self.show_current()

    def show_current(self, *_signal_args) -> None:
        """Show the newest result with the form's complaint, and redraw what is in view."""
        self.complaint = self.inputs.first_complaint()
        self.results.show_evaluation(self.evaluation, self.doc.units, self.last_good, self.complaint)
        self.side_tabs.show_verdict()
        self._drawn.clear()
        self.draw_current()

    def draw_current(self, *_signal_args) -> None:
        """Update the picture of the visible tab only; the others follow when shown."""
        key = TABS[self.tabs.currentIndex()]
        if key in self._drawn or key == "compare":
            return
        if self.export_task is not None:
            # The sheet draws its rating curve with matplotlib in the export's thread, under rc_context;
            # matplotlib is not thread-safe, so the pictures wait for the export (results stay live).
            return
        # the pictures of a result drawn with the channel it is the result of, not one edited since
        ev, units, ch = self.evaluation, self.doc.units, self.evaluated_channel
        if ev is None and not self.complaint:
            return                     # the first result of this channel is on its way
        self._drawn[key] = 1
        usable = ev is not None and ev.ok and not self.complaint
        picture = {"section": self.section_picture, "rating": self.rating_picture,
                   "energy": self.energy_picture}[key]
        note = (("Last good result: " + ("fix the marked input" if self.complaint else "no result for these inputs"))
                if picture.shown else ("No result: fix the marked input" if self.complaint
                                       else "No result for these inputs"))
        if usable:
            if key == "section":
                thick = ev.lining.layer_thickness if ev.lining else None
                picture.update(ev, units, self.section_title(ch, ev), lining_thickness=thick,
                               drawing=self.evaluated_drawing)
            elif key == "rating":
                picture.update(display.rating(ch, ev), ev, units, f"{ch.name}: flow against depth on this grade")
            else:
                picture.update(display.energy(ch, ev), units, f"{ch.name}: specific energy at the design flow")
        else:
            picture.fade(True, note)
        picture.canvas.draw_idle()

    def section_title(self, ch: pj.Channel, ev: display.Evaluation) -> str:
        u = self.doc.units
        n = ev.result.manning_n
        return (f"{ch.name}  ·  {SHAPE_NAMES.get(ev.section.kind, ev.section.kind)}  ·  "
                f"Q = {u.from_si('flow', ev.flow):.3g} {pretty(u.label('flow'))}  ·  S = {ch.slope:.4g}  ·  n = {n:.3f}")

    def update_title(self, *_signal_args) -> None:
        doc = self.doc
        where = doc.path.name if doc.path else "not saved yet"
        self.setWindowTitle(f"{doc.project.name} ({where})[*] — Ditchwright")
        if self.isWindowModified() != doc.modified:     # Qt sets the title again even when it is unchanged
            self.setWindowModified(doc.modified)

    # -- ditch runs ------------------------------------------------------------------------------
    def update_run_actions(self) -> None:
        runs = bool(self.doc.project.runs)
        self.runs_action.setEnabled(runs)
        self.runs_action.setText(f"&Ditch runs ({len(self.doc.project.runs)})" if runs else "&Ditch runs")
        self.runs_action.setIconText(f"Ditch runs ({len(self.doc.project.runs)})" if runs else "Ditch runs")
        on_runs = self.pages.currentWidget() is self.run_view and self.run_view is not None
        self.open_station_action.setEnabled(on_runs and runs)
        if on_runs and not runs:
            self.show_channels()

    def show_channels(self, tab: int | None = None) -> None:
        """The channel page (``tab``: the picture to show)."""
        self.pages.setCurrentWidget(self.splitter)
        self.channels_action.setChecked(True)
        self.open_station_action.setEnabled(False)
        if tab is not None:
            self.tabs.setCurrentIndex(tab)

    def show_runs(self) -> None:
        """The run page: profile, station table and schedule of the project's ditch runs (made when first
        shown)."""
        if not self.doc.project.runs:
            self.statusBar().showMessage("This project has no ditch runs.", 6000)
            self.channels_action.setChecked(True)
            return
        if self.run_view is None:
            from .run_view import RunView
            self.run_view = RunView(self.doc, open_action=self.open_station_action,
                                    can_draw=lambda: self.export_task is None)
            self.run_view.status_message.connect(lambda m: self.statusBar().showMessage(m, 8000))
            self.run_view.open_channel.connect(self._station_opened)
            self.run_view.rainfall_asked.connect(self.edit_rainfall)
            self.pages.addWidget(self.run_view)
        self.pages.setCurrentWidget(self.run_view)
        self.runs_action.setChecked(True)
        self.open_station_action.setEnabled(True)
        self.run_view.table.setFocus()

    def open_station(self) -> None:
        if self.run_view is not None and self.pages.currentWidget() is self.run_view:
            self.run_view.open_selected_station()

    def import_landxml(self) -> None:
        """Add the ditch runs a LandXML file makes (road profiles as inverts, cross-sections as surveyed sections)
        to this project, in one undoable step. They join the open project rather than replace it: they need its
        rainfall, linings and sub-areas to be solved, and nothing open is lost (Undo takes them out again)."""
        folder = settings.LAST_FOLDER.read() if self.persistent else ""
        path, _ = QFileDialog.getOpenFileName(self, "Import LandXML", folder, LANDXML_FILTER)
        if not path:
            return
        from ..landxml_import import LandXMLError, read_landxml
        try:
            imported, report = read_landxml(path)
            pj.Project.from_dict(imported.to_dict())     # the project file's own check, as `import` makes
        except (LandXMLError, pj.ProjectFileError, OSError) as exc:
            QMessageBox.warning(self, "Cannot import the LandXML file",
                                f"{path}\n\n{sentence(str(exc)[:1].upper() + str(exc)[1:])}\n\nNothing was changed.")
            return
        names = self.doc.add_runs(imported.runs, f"Import {len(imported.runs)} ditch run"
                                                 f"{'s' if len(imported.runs) != 1 else ''} from {Path(path).name}")
        units = "SI" if self.doc.project.units == "si" else "US customary"
        lines = [sentence(t[:1].upper() + t[1:]) for t in report.lines()]
        QMessageBox.information(self, "LandXML imported",
                                f"Added to this project as {', '.join(repr(n) for n in names)}, shown in its "
                                f"{units} units. Undo removes them again.\n\n" + "\n".join(lines))
        self.statusBar().showMessage(f"Imported {len(names)} ditch run(s) from {path}.", 8000)
        self.show_runs()
        self.run_view.show_run(len(self.doc.project.runs) - len(names))

    def add_run(self) -> None:
        """Add a ditch run at round starting values (with the candidates of the run shown) and show it."""
        from ..run_editing import starting_run
        shown = self.run_view.run if self.run_view is not None else None
        run = starting_run(self.doc.project, self.doc.context.catalogue, shown)
        self.doc.add_runs([run], f"Add run '{run.name}'")
        self.show_runs()
        self.run_view.show_run(len(self.doc.project.runs) - 1)

    def _station_opened(self, _name: str) -> None:
        self.show_channels(0)
        self.channel_list.setFocus()

    # -- channel actions ------------------------------------------------------------------------
    def _channel_picked(self, row: int) -> None:
        if row >= 0:
            self.doc.set_current(row)

    def _channel_renamed_in_list(self, item: QListWidgetItem) -> None:
        row = self.channel_list.row(item)
        refusal = self.doc.rename_channel(item.text(), index=row)
        if refusal:
            self.statusBar().showMessage(refusal, 8000)
            self.fill_channel_list()

    def rename_channel(self) -> None:
        item = self.channel_list.item(self.doc.current)
        if item is not None:
            self.channel_list.editItem(item)

    def delete_channel(self) -> None:
        refusal = self.doc.remove_channel()
        if refusal:
            self.statusBar().showMessage(refusal, 8000)

    def rename_project(self) -> None:
        name, ok = QInputDialog.getText(self, "Project name", "Name of the project:", text=self.doc.project.name)
        if ok and name.strip():
            self.doc.set_project_text("name", name.strip(), "Rename project")

    def edit_sheet_details(self) -> None:
        dialog = SheetDetailsDialog(self.doc.project.sheet, parent=self)
        if dialog.exec() == QDialog.DialogCode.Accepted:
            self.doc.set_sheet_info(dialog.info())

    def edit_project_notes(self) -> None:
        dialog = NotesDialog(self.doc.project.notes, parent=self)
        if dialog.exec() == QDialog.DialogCode.Accepted:
            self.doc.set_project_text("notes", dialog.text(), "Change project notes")

    def edit_rainfall(self) -> None:
        """The project's rainfall relation in a dialog; OK makes one undoable edit and the runs are solved again."""
        from .rainfall_dialog import RainfallDialog
        dialog = RainfallDialog(self.doc.project.rainfall, self.doc.units, parent=self)
        if dialog.exec() == QDialog.DialogCode.Accepted:
            self.doc.set_rainfall(dialog.value())

    def copy_table(self) -> None:
        self.tabs.setCurrentIndex(TABS.index("compare"))
        self.comparison.copy_table()

    # -- files --------------------------------------------------------------------------------------
    def maybe_save(self) -> bool:
        """True when it is fine to drop the current project (saved, or the user said so)."""
        if not self.doc.modified:
            return True
        answer = QMessageBox.warning(
            self, "Unsaved changes", f"The project '{self.doc.project.name}' has changes that are not saved.\n\n"
            "Save them first?", QMessageBox.StandardButton.Save | QMessageBox.StandardButton.Discard
            | QMessageBox.StandardButton.Cancel, QMessageBox.StandardButton.Save)
        if answer == QMessageBox.StandardButton.Save:
            return self.save()
        return answer == QMessageBox.StandardButton.Discard

    def new_project(self) -> None:
        if self.maybe_save():
            self.doc.load(new_project(self.doc.project.units))   # round starting values in the units in use
            self._after_file_change("New project.")

    def open_dialog(self) -> None:
        if not self.maybe_save():
            return
        folder = settings.LAST_FOLDER.read() if self.persistent else ""
        path, _ = QFileDialog.getOpenFileName(self, "Open project", folder, FILE_FILTER)
        if path:
            self.open_file(path, ask=False)

    def open_file(self, path, ask: bool = True) -> bool:
        """Open ``path``; a file that cannot be read is refused with its reason and nothing changes."""
        if ask and not self.maybe_save():
            return False
        stamp = FileStamp.of(path)   # before reading: a change made meanwhile is then seen at the next save
        try:
            project = pj.load(path)
        except pj.ProjectFileError as exc:
            QMessageBox.warning(self, "Cannot open the project", f"{path}\n\n{exc}.\n\nNothing was changed.")
            return False
        self.doc.load(project, path, stamp=stamp)
        self._remember(path)
        self._after_file_change(f"Opened {path}.")
        return True

    def open_demo(self) -> None:
        if not self.maybe_save():
            return
        project = pj.loads(pj.demo_path().read_text(encoding="utf-8"))
        self.doc.load(project, None)
        self._after_file_change("Opened the demo project (an invented site). Save it under a name of your own "
                                "to keep changes.")

    def save(self) -> bool:
        if self.doc.path is None:
            return self.save_as()
        return self._write(self.doc.path)

    def save_as(self) -> bool:
        folder = settings.LAST_FOLDER.read() if self.persistent else ""
        suggestion = str(Path(folder or Path.home()) / f"{self.doc.project.name}.json")
        path, _ = QFileDialog.getSaveFileName(self, "Save project as", suggestion, FILE_FILTER)
        if not path:
            return False
        if not Path(path).suffix:
            path += ".json"
        return self._write(Path(path))

    def _write(self, path: Path, overwrite: bool = False) -> bool:
        try:
            self.doc.save(path, overwrite=overwrite)
        except FileChangedError:
            return self._changed_on_disk(path)
        except Exception as exc:  # noqa: BLE001 - any failure is shown; the work stays open and unsaved
            QMessageBox.critical(self, "Could not save", f"The project was not saved to {path}:\n\n"
                                 f"{save_failure_reason(exc)}\n\nThe file on disk is unchanged; your work is "
                                 "still open here, not saved.")
            return False
        if self.autosaver:
            self.autosaver.discard_file()
        self._remember(path)
        self.update_title()
        self.statusBar().showMessage(f"Saved to {path}.", 6000)
        return True

    def _changed_on_disk(self, path: Path) -> bool:
        """Someone else changed ``path`` since we read or wrote it: save elsewhere, reload theirs, or overwrite."""
        choice = self.ask_file_changed(path)
        if choice == "save_as":
            return self.save_as()
        if choice == "reload":
            if self.open_file(path, ask=False):
                self.statusBar().showMessage(f"Reloaded {path} as it is on disk now; your changes were dropped.",
                                             10000)
            return False
        if choice == "overwrite":
            return self._write(path, overwrite=True)
        self.statusBar().showMessage("Not saved: the file was changed by someone else. Your work is still open "
                                     "here (and in the automatic copy).", 10000)
        return False

    def ask_file_changed(self, path: Path) -> str:
        """"save_as", "reload", "overwrite" or "cancel" when ``path`` changed on disk since it was opened or saved."""
        box = QMessageBox(QMessageBox.Icon.Warning, "The file was changed",
                          f"{path}\n\nhas been changed by another program or person since you opened or saved it "
                          "here. Saving over it would lose their changes.\n\n"
                          "Save your work under another name, reload the file as it is now (your unsaved changes "
                          "are dropped), or overwrite it with your work (their changes are lost)?", parent=self)
        save_as = box.addButton("Save as...", QMessageBox.ButtonRole.AcceptRole)
        reload_ = box.addButton("Reload theirs", QMessageBox.ButtonRole.DestructiveRole)
        overwrite = box.addButton("Overwrite", QMessageBox.ButtonRole.DestructiveRole)
        box.addButton(QMessageBox.StandardButton.Cancel)
        box.setDefaultButton(save_as)
        box.exec()
        clicked = box.clickedButton()
        return {save_as: "save_as", reload_: "reload", overwrite: "overwrite"}.get(clicked, "cancel")

    def autosave_failed(self, reason: str) -> None:
        """Say once that unsaved work is not being copied; the work stays open."""
        self.statusBar().showMessage(f"Autosave failed: {reason}", 30000)
        QMessageBox.warning(self, "Autosave failed", f"Your unsaved changes could not be copied to the automatic "
                            f"backup:\n\n{reason}\n\nYour work is still open here. Save it, or fix what "
                            "is named above, so that it is not lost.")

    def _remember(self, path) -> None:
        if self.persistent:
            settings.add_recent(str(path))
            settings.LAST_FOLDER.write(str(Path(path).resolve().parent))

    def _after_file_change(self, message: str) -> None:
        self.statusBar().showMessage(message, 8000)
        if self.autosaver:
            self.autosaver.discard_file()

    def fill_recent_menu(self) -> None:
        m = self.recent_menu
        m.clear()
        files = settings.RECENT_FILES.read() if self.persistent else []
        for i, f in enumerate(files):
            p = Path(f)
            a = m.addAction(f"&{i + 1}  {p.name}  —  {p.parent}")
            a.setEnabled(p.exists())
            a.triggered.connect(lambda _=False, f=f: self.open_file(f))
        if not files:
            m.addAction("No recent projects").setEnabled(False)
        else:
            m.addSeparator()
            m.addAction("Clear the list", lambda: settings.RECENT_FILES.write([]))

    def offer_recovery(self) -> bool:
        """After a crash: offer the newest autosave left behind. True if it was recovered."""
        found = find_recoverable(self.autosaver.session if self.autosaver else None)
        if not found:
            return False
        r = found[0]
        choice = self.ask_recovery(r)
        if choice == "recover":
            try:
                project = pj.load(r.project_file)
            except pj.ProjectFileError as exc:
                QMessageBox.warning(self, "Cannot recover", f"The automatic copy cannot be read: {exc}.")
                return False
            self.doc.load(project, r.original or None, recovered=True, stamp=r.original_stamp)
            r.discard()
            self.update_title()
            self.statusBar().showMessage("Recovered the automatic copy; save it to keep it.", 10000)
            return True
        if choice == "discard":
            r.discard()
        return False

    def ask_recovery(self, r) -> str:
        """"recover", "discard" or "later" for the autosave ``r``."""
        when = time.strftime("%Y-%m-%d %H:%M", time.localtime(r.saved_at))
        origin = r.original or "a project that was never saved"
        box = QMessageBox(QMessageBox.Icon.Question, "Recover unsaved work",
                          f"Ditchwright ended without saving '{r.name}' (from {origin}).\n\n"
                          f"An automatic copy from {when} is available. Recover it?", parent=self)
        recover = box.addButton("Recover", QMessageBox.ButtonRole.AcceptRole)
        discard = box.addButton("Discard it", QMessageBox.ButtonRole.DestructiveRole)
        box.addButton("Not now", QMessageBox.ButtonRole.RejectRole)
        box.setDefaultButton(recover)
        box.exec()
        clicked = box.clickedButton()
        return "recover" if clicked is recover else "discard" if clicked is discard else "later"

    # -- design sheets ------------------------------------------------------------------------------
    def export_dialog(self) -> None:
        """Ask what to export, the password when signing, then write the PDF in the background."""
        if self.export_task is not None:
            self.statusBar().showMessage("A design-sheet export is already running.", 6000)
            return
        p = self.persistent
        folder = (settings.SHEET_FOLDER.read() or settings.LAST_FOLDER.read()) if p else ""
        if not folder and self.doc.path is not None:
            folder = str(self.doc.path.resolve().parent)
        dialog = ExportSheetDialog(self.doc.project, self.doc.current, modified=self.doc.modified, folder=folder,
                                   page=settings.SHEET_PAGE.read() if p else "",
                                   certificate=settings.CERTIFICATE.read() if p else "",
                                   open_after=settings.SHEET_OPEN.read() if p else True, parent=self)
        if dialog.exec() != QDialog.DialogCode.Accepted:
            return
        choice = dialog.choice()
        if p:
            settings.SHEET_PAGE.write(choice.page)
            settings.SHEET_OPEN.write(choice.open_after)
            settings.SHEET_FOLDER.write(str(choice.path.parent))
            if choice.certificate:
                settings.CERTIFICATE.write(choice.certificate)
        choice = self._leave_out_unsolved(choice)
        if choice is None:
            return
        sign = None
        if choice.certificate:
            password = ask_password(self, choice.certificate)
            if password is None:
                self.statusBar().showMessage("No sheet written: the password was not given.", 8000)
                return
            sign = (choice.certificate, password)
        self.export_sheets(choice, sign)

    def _leave_out_unsolved(self, choice):
        """Channels without a result have no sheet: say which and why, and offer to export the others."""
        project = self.doc.project
        names = choice.channels if choice.channels is not None else [c.name for c in project.channels]
        unsolved = []
        for name in names:
            ev = display.evaluate(project.channel(name), self.doc.context)
            if not ev.ok:
                unsolved.append((name, ev.error))
        if not unsolved:
            return choice
        listing = "\n".join(f"• {name}: {pretty(sentence(why))}" for name, why in unsolved)
        others = [n for n in names if n not in dict(unsolved)]
        if not others:
            QMessageBox.warning(self, "Design sheets not written",
                                f"{'This channel has' if len(unsolved) == 1 else 'These channels have'} no result, "
                                f"so no sheet:\n\n{listing}\n\nFix the inputs marked in the form and export again.")
            return None
        answer = QMessageBox.question(
            self, "Some channels have no sheet",
            f"{'This channel has' if len(unsolved) == 1 else 'These channels have'} no result, so no sheet:\n\n"
            f"{listing}\n\nExport the sheets of the other {len(others)} channel{'s' if len(others) != 1 else ''}?",
            QMessageBox.StandardButton.Yes | QMessageBox.StandardButton.No, QMessageBox.StandardButton.No)
        if answer != QMessageBox.StandardButton.Yes:
            return None
        return dataclasses.replace(choice, channels=others)

    def export_sheets(self, choice, sign=None) -> Task:
        """Write the sheets of ``choice`` in a worker thread; the window stays usable meanwhile.

        The worker gets a copy of the project, so edits made during the export
        do not reach a half-written sheet. ``sign`` is (PKCS#12 path, password)
        or None; the password lives only as long as the task.
        """
        project = copy.deepcopy(self.doc.project)
        count = len(choice.channels) if choice.channels is not None else len(project.channels)
        linings = self.doc.context.catalogue   # the one the window evaluates with: shipped plus the user's file

        def work(progress):
            return sh.export_sheets(project, choice.path, channels=choice.channels, page=choice.page, sign=sign,
                                    catalogue=linings)

        task = Task(work, self)
        task.succeeded.connect(lambda notes: self._export_done(choice, count, sign is not None, notes))
        task.failed.connect(lambda exc: self._export_failed(choice, exc))
        task.finished.connect(self._export_ended)
        self.export_task = task
        self.export_action.setEnabled(False)
        QApplication.setOverrideCursor(Qt.CursorShape.BusyCursor)
        self.statusBar().showMessage(f"Writing {count} design sheet{'s' if count != 1 else ''} to "
                                     f"{choice.path}…")
        task.start()
        return task

    def _export_ended(self) -> None:
        task, self.export_task = self.export_task, None
        QApplication.restoreOverrideCursor()
        self.export_action.setEnabled(True)
        if task is not None:
            task.deleteLater()
        self.draw_current()
        if self.run_view is not None:
            self.run_view.redraw()

    def _export_done(self, choice, count: int, signed: bool, notes: list) -> None:
        what = f"{count} design sheet{'s' if count != 1 else ''}" + (", signed," if signed else "")
        message = f"Wrote {what} to {choice.path}."
        if notes:
            message += " Note: " + "; ".join(notes) + "."
        if choice.open_after and not QDesktopServices.openUrl(QUrl.fromLocalFile(str(choice.path))):
            message += " No program opened it; open the file yourself."
        self.statusBar().showMessage(message, 15000)

    def _export_failed(self, choice, exc: BaseException) -> None:
        QMessageBox.warning(self, "Design sheets not written",
                            pretty(export_failure_text(exc, choice.path, self.doc.context.units)))

    # -- DXF drawings ----------------------------------------------------------------------------------
    def export_drawings_dialog(self) -> list:
        """Ask for a folder, then write one DXF per channel and per run into it in the units shown; a failure is
        told in a message box and leaves the folder as it was. Returns the paths written."""
        from ..drawings import export_drawings

        folder = (settings.LAST_FOLDER.read() if self.persistent else "") or (
            str(self.doc.path.resolve().parent) if self.doc.path is not None else "")
        folder = QFileDialog.getExistingDirectory(self, "Export drawings (DXF) into a folder", folder)
        if not folder:
            return []
        context = self.doc.context
        QApplication.setOverrideCursor(Qt.CursorShape.BusyCursor)
        try:
            written = export_drawings(self.doc.project, folder, units=context.units, catalogue=context.catalogue)
        except Exception as exc:  # noqa: BLE001 - every failure is told in words, never as a traceback
            QApplication.restoreOverrideCursor()
            QMessageBox.warning(self, "Drawings not written", pretty(drawings_failure_text(exc, folder, context.units)))
            return []
        QApplication.restoreOverrideCursor()
        count = len(written)
        self.statusBar().showMessage(f"Wrote {count} DXF drawing{'s' if count != 1 else ''} "
                                     f"({context.units.label('length')}) to {folder}.", 15000)
        return written

    # -- inventories ------------------------------------------------------------------------------------
    def open_inventory(self) -> None:
        """Show the inventory check (one window, kept while the main window lives)."""
        from .inventory import InventoryDialog
        if self.inventory_dialog is None:
            self.inventory_dialog = InventoryDialog(self.doc, persistent=self.persistent, parent=self)
        dialog = self.inventory_dialog
        dialog.show()
        dialog.raise_()
        dialog.activateWindow()

    # -- other ------------------------------------------------------------------------------------------
    def about(self) -> None:
        QMessageBox.about(self, "About Ditchwright",
                          f"<b>Ditchwright {__version__}</b><p>Design of lined drainage channels: normal and "
                          f"critical depth by Manning's equation, lining checks, freeboard.</p><p>{CAUTION}</p>")

    def closeEvent(self, event) -> None:
        self.evaluator.wait()
        self.comparison.computer.wait()
        if self.export_task is not None:
            self.export_task.wait()   # a sheet export takes seconds; let it finish its file
        if self.inventory_dialog is not None:
            self.inventory_dialog.stop(wait=True)
        if self.run_view is not None:
            self.run_view.stop()
        if self.maybe_save():
            self.write_settings()
            if self.autosaver:
                self.autosaver.close()
            event.accept()
        else:
            event.ignore()



def drawings_failure_text(exc: BaseException, folder, units=hu.SI) -> str:
    """Why the DXF drawings were not written, in words (for one message box), its numbers in ``units``."""
    tail = "\n\nNo drawing was written."
    where = getattr(exc, "channel", None)
    if isinstance(exc, hy.InputError):
        return (f"{'A channel or run' if not where else where} cannot be computed, so it has no drawing:\n\n"
                f"{sentence(exc.in_units(units))}\n\nFix that input and export again.{tail}")
    if isinstance(exc, hy.NoSolutionError):
        return (f"{where or 'A channel or run'} has no solution, so it has no drawing:\n\n"
                f"{sentence(exc.in_units(units))}{tail}")
    if isinstance(exc, KeyError):
        return f"{sentence(exc.args[0] if exc.args else exc)}{tail}"
    if isinstance(exc, OSError):
        return f"Cannot write into {folder}:\n\n{sentence(exc.strerror or exc)}"
    return f"The export stopped with an unexpected error:\n\n{type(exc).__name__}: {sentence(exc)}{tail}"


def export_failure_text(exc: BaseException, path, units=hu.SI) -> str:
    """Why the sheets were not written, in words (for one message box), its numbers in ``units``."""
    tail = "\n\nNo file was written; any earlier file of that name is unchanged."
    if isinstance(exc, sh.SigningError):
        return f"The sheets could not be signed:\n\n{sentence(exc)}{tail}"
    if isinstance(exc, sh.SheetLayoutError):
        return f"The sheet could not be laid out:\n\n{sentence(exc)}{tail}"
    if isinstance(exc, hy.InputError):
        return (f"A channel cannot be computed, so it has no sheet:\n\n{sentence(exc.in_units(units))}\n\n"
                f"Fix that input and export again.{tail}")
    if isinstance(exc, hy.NoSolutionError):
        return f"A channel has no solution, so it has no sheet:\n\n{sentence(exc.in_units(units))}{tail}"
    if isinstance(exc, KeyError):
        return f"{sentence(exc.args[0] if exc.args else exc)}{tail}"
    if isinstance(exc, OSError):
        return f"Cannot write {path}:\n\n{sentence(exc.strerror or exc)}{tail}"
    return f"The export stopped with an unexpected error:\n\n{type(exc).__name__}: {sentence(exc)}{tail}"
