"""The window's shortcuts keep working while a text box has the focus.

A text box claims some key combinations for itself before the window sees
them: with the X11 key scheme of Linux desktops a line edit takes Ctrl+E (end
of line) and Ctrl+D (delete), so File > Export did nothing while the cursor
was in a field. :class:`WindowKeys` sits in front of each text box of the
window (also the editors that item views make on the fly) and hands every
combination that one of the window's actions uses over to the window; keys
without Ctrl, Alt or Meta (typing) and combinations no action uses stay
with the box.
"""

from __future__ import annotations

from PySide6.QtCore import QEvent, QObject, Qt
from PySide6.QtGui import QAction, QKeySequence
from PySide6.QtWidgets import QAbstractSpinBox, QApplication, QLineEdit, QPlainTextEdit, QTextEdit

TEXT_BOXES = (QLineEdit, QPlainTextEdit, QTextEdit, QAbstractSpinBox)
_COMMAND_MODIFIERS = (Qt.KeyboardModifier.ControlModifier | Qt.KeyboardModifier.AltModifier
                      | Qt.KeyboardModifier.MetaModifier)


class WindowKeys(QObject):
    """Event filter for the text boxes of ``window``: the window's shortcuts win over the box's own keys."""

    def __init__(self, window):
        super().__init__(window)
        self.window = window
        app = QApplication.instance()
        app.focusChanged.connect(self._focus_changed)
        for kind in TEXT_BOXES:
            for box in window.findChildren(kind):
                box.installEventFilter(self)

    def _focus_changed(self, _old, new) -> None:
        try:
            mine = new is not None and isinstance(new, TEXT_BOXES) and new.window() is self.window
        except RuntimeError:      # the window is being deleted
            return
        if mine:
            new.removeEventFilter(self)
            new.installEventFilter(self)

    def window_takes(self, event) -> QAction | None:
        """The enabled action of the window whose shortcut is this key event, or None."""
        if not (event.modifiers() & _COMMAND_MODIFIERS) and not Qt.Key.Key_F1 <= event.key() <= Qt.Key.Key_F35:
            return None
        pressed = QKeySequence(event.keyCombination())
        for action in self.window.findChildren(QAction):
            if action.isEnabled() and any(s.matches(pressed) == QKeySequence.SequenceMatch.ExactMatch
                                          for s in action.shortcuts()):
                return action
        return None

    def eventFilter(self, obj, event) -> bool:
        if event.type() == QEvent.Type.ShortcutOverride and self.window_takes(event) is not None:
            event.ignore()        # not the box's: the shortcut map gives it to the window's action
            return True
        return False
