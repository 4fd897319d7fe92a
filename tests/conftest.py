"""Test set-up shared by every test module."""

import os

# Qt must never look for a screen in the tests (set before any QApplication exists).
os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

# Property tests draw the same examples on every run: CI must not pass or fail by chance (a random draw once
# failed a health check). A profile, so that a search for new cases can still be asked for by name.
from hypothesis import settings as _hypothesis_settings  # noqa: E402

_hypothesis_settings.register_profile("fixed", derandomize=True)
_hypothesis_settings.register_profile("explore", derandomize=False)
_hypothesis_settings.load_profile(os.environ.get("HYPOTHESIS_PROFILE", "fixed"))
