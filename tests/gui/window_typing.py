"""Typing into the main window's fields as a user does, for the window tests."""


def field(w, key):
    """The form field of ``w`` for the input ``key`` (e.g. "trapezoid:section.bottom_width")."""
    return w.inputs.fields[key]


def type_into(qtbot, f, text):
    """Select the field's text and type ``text`` over it, key by key."""
    f.edit.setFocus()
    f.edit.selectAll()
    qtbot.keyClicks(f.edit, text)
