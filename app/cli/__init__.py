"""Command-line sub-commands: one module each, with ``register(subparsers)`` that sets ``run``.

A command's module is imported only when that command is run or its help is asked for (most of them pull in
the whole core and some a PDF, CSV or CAD library); the list of commands and their one-line help is here, so
``ditchwright --help`` and ``--version`` import none of them.
"""

import importlib

#: command name -> its module in this package
COMMAND_MODULES = {
    "calc": "calc",
    "compare": "compare",
    "run": "run",
    "sheet": "sheet",
    "drawing": "drawing",
    "fingerprint": "fingerprint",
    "verify": "verify",
    "batch": "inventory_command",
    "open": "open_project",
    "import": "import_command",
}

#: command name -> its one-line help (the module's HELP)
COMMAND_HELP = {
    "calc": "compute normal and critical depth, velocity, Froude number and shear for one channel",
    "compare": "compare linings for one channel: depth, shear, safety factor, verdict, quantities and cost",
    "run": "compute the ditch runs of a project: flow, depths, lining check and the cheapest lining schedule",
    "sheet": ("write the design sheets of a project (one page per channel, a few pages per ditch run) as a PDF, "
            "optionally signed"),
    "drawing": ("write DXF drawings for CAD: the typical section of each channel and the profile of each ditch run, in "
            "the project's length unit"),
    "fingerprint": "print the design fingerprint (SHA-256 of a channel's inputs, its lining entries and the program version)",
    "verify": "check the digital signature of a design sheet: intact, and signed by the engineer whose certificate you trust",
    "batch": "check every reach of a ditch inventory (CSV or GeoPackage) and write one result row per reach",
    "open": "open a project file in the Ditchwright window",
    "import": ("make a project from a LandXML 1.2 file: road profiles become ditch runs' inverts, "
               "cross-sections their surveyed sections"),
}


def command_module(name: str):
    """The module of the command ``name`` (imported on first use)."""
    return importlib.import_module(f"{__name__}.{COMMAND_MODULES[name]}")
