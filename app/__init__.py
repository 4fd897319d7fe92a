"""Ditchwright's front ends: the desktop window and the command line, over the pure core in ``hydraulics``."""

__version__ = "0.1.0"
