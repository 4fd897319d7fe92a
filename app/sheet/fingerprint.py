"""The design fingerprint: SHA-256 of one channel's design inputs, its linings and the program version.

A reviewer holding a printed sheet and a project file recomputes the
fingerprint with ``ditchwright fingerprint FILE --channel NAME`` (with
``--user-catalogue FILE`` when the sheet was made with one); equal
fingerprints mean the sheet was made from these inputs, these lining data and
this version.

What is hashed is the UTF-8 text of a canonical JSON document::

    {"inputs": {...channel design inputs, SI...},
     "linings": {"riprap": {...the catalogue entry as resolved...}, ...},
     "program": "ditchwright", "version": "0.1.0"}

written with sorted keys, no spaces, ASCII only, and every number (integer or
not) written as a float with 12 significant digits (``format(x, ".12g")``,
``-0`` written as ``0``), so that 3 and 3.0, or a width typed in feet and
stored as 0.6095999999999999 m and as 0.6096 m, give the same text.

The inputs are those that change the design: flow basis, slope, section,
lining and its stone size, Manning's n, bend radius, minimum freeboard and the
alternative linings. ``linings`` holds the catalogue entry of every lining
the channel names (its own and the alternatives), as resolved from the
shipped catalogue with any user catalogue laid over it: the values the sheet
was computed with (roughness, permissible shear, stone data, layer rule,
unit cost, sources), so that a changed catalogue entry changes the
fingerprint. The channel's name, location and notes are not hashed (renaming
a channel does not change its design), nor is the display unit system.

A ditch run's fingerprint (:func:`run_fingerprint`, printed on each page of
its sheet and given by ``ditchwright fingerprint FILE --run NAME``) is made the
same way from::

    {"inputs": {...the run as in the project file, SI, without its name and notes...},
     "linings": {...the catalogue entry of each of its candidate linings...},
     "rainfall": {...the project's rainfall relation, its source text included...},
     "program": "ditchwright", "version": "0.1.0"}

so that a changed grade point, sub-area, candidate, price, rainfall value or
catalogue entry changes it, and renaming the run does not.
"""

from __future__ import annotations

import hashlib
import json
import math
from dataclasses import asdict

from .. import __version__

PROGRAM = "ditchwright"
#: Channel fields that make up the design inputs (app.project.Channel).
DESIGN_FIELDS = ("flow", "slope", "section", "lining", "manning_n", "bend_radius", "min_freeboard", "alternatives")
SIGNIFICANT_DIGITS = 12


def _number(x) -> str:
    x = float(x)
    if not math.isfinite(x):
        raise ValueError(f"a design input is not a finite number: {x}")
    if x == 0:
        return "0"
    return format(x, f".{SIGNIFICANT_DIGITS}g")


def canonical_json(value) -> str:
    """Canonical JSON text of plain data (dict, list, str, bool, None, numbers); see the module notes."""
    if value is None:
        return "null"
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, (int, float)):
        return _number(value)
    if hasattr(value, "tolist"):  # numpy scalars and arrays
        return canonical_json(value.tolist())
    if isinstance(value, str):
        return json.dumps(value, ensure_ascii=True)
    if isinstance(value, dict):
        items = sorted(value.items())
        return "{" + ",".join(f"{json.dumps(str(k), ensure_ascii=True)}:{canonical_json(v)}" for k, v in items) + "}"
    if isinstance(value, (list, tuple)):
        return "[" + ",".join(canonical_json(v) for v in value) + "]"
    raise TypeError(f"cannot write {type(value).__name__} into a design fingerprint")


def design_inputs(channel) -> dict:
    """The channel's design inputs as plain SI data (see DESIGN_FIELDS)."""
    data = asdict(channel)
    return {key: data[key] for key in DESIGN_FIELDS}


def used_linings(channel, catalogue) -> dict:
    """{key: catalogue entry data} of the linings ``channel`` names (its own and the alternatives).

    ``catalogue`` is a hydraulics.linings.Catalogue (the one the sheet was made with).
    Raises hydraulics.InputError naming an unknown key.
    """
    keys = [c.key for c in (channel.lining, *channel.alternatives) if c is not None]
    if not keys:
        return {}
    return {key: catalogue.get(key).to_dict() for key in keys}


def fingerprint_document(channel, version: str = __version__, *, catalogue) -> str:
    """The exact text that is hashed."""
    return canonical_json({"program": PROGRAM, "version": version, "inputs": design_inputs(channel),
                           "linings": used_linings(channel, catalogue)})


def fingerprint(channel, version: str = __version__, *, catalogue) -> str:
    """SHA-256 (64 hex digits) of the channel's canonical design inputs, its lining entries and the version.

    ``catalogue``: the lining catalogue the sheet was made with (required: the shipped one alone would give another
    fingerprint wherever the user's file changes a lining used).
    """
    return hashlib.sha256(fingerprint_document(channel, version, catalogue=catalogue).encode("ascii")).hexdigest()



#: Run fields that are labels, not design inputs (app.project.Run).
RUN_LABEL_FIELDS = ("name", "notes")


def run_design_inputs(run) -> dict:
    """The run's design inputs as plain SI data: every field of app.project.Run but its name and notes."""
    data = asdict(run)
    return {key: value for key, value in data.items() if key not in RUN_LABEL_FIELDS}


def run_used_linings(run, catalogue) -> dict:
    """{key: catalogue entry data} of the run's candidate linings. Raises hydraulics.InputError naming an unknown
    key."""
    keys = [c.key for c in run.candidates]
    if not keys:
        return {}
    return {key: catalogue.get(key).to_dict() for key in keys}


def run_fingerprint_document(project, run, version: str = __version__, *, catalogue) -> str:
    """The exact text hashed for a run of ``project``."""
    return canonical_json({"program": PROGRAM, "version": version, "inputs": run_design_inputs(run),
                           "rainfall": project.rainfall, "linings": run_used_linings(run, catalogue)})


def run_fingerprint(project, run, version: str = __version__, *, catalogue) -> str:
    """SHA-256 (64 hex digits) of a run's design inputs, the project's rainfall, its candidates' catalogue entries
    and the program version (``catalogue``: the one the sheet was made with; required)."""
    document = run_fingerprint_document(project, run, version, catalogue=catalogue)
    return hashlib.sha256(document.encode("ascii")).hexdigest()
