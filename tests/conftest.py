"""Test set-up shared by every test module."""

import os

# Qt must never look for a screen in the tests (set before any QApplication exists).
os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
