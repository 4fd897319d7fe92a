"""Entry script for the PyInstaller bundle: the same as the ``ditchwright`` console script.

PyInstaller needs a script file; the wheel uses the entry point ``app.main:main`` instead.
"""

import multiprocessing
import sys

from app.main import main

if __name__ == "__main__":
    multiprocessing.freeze_support()  # a frozen program that starts workers needs this first
    sys.exit(main())
