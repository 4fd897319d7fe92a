"""The desktop window (PySide6 with matplotlib). Start it with :func:`app.gui.application.run`."""
