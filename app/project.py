"""A project: several channels with their design inputs, and its file format.

Pure Python (no Qt), so that the window, the command line and the design sheet
share one model. All values in the file are SI; ``units`` only records how the
project is shown. The file is JSON of our own layout, checked against
``resources/project.schema.json`` on load, with a ``schema_version`` and a
migration for each older version.

Saving is atomic: the text goes to a temporary file in the same folder, is
flushed to disk, then replaces the target in one step (``os.replace``), so a
crash leaves either the old file or the new one, never half of one.
"""

from __future__ import annotations

import copy
import functools
import json
import math
import os
import re
from dataclasses import asdict, dataclass, field
from importlib import resources as ir
from pathlib import Path

import numpy as np

import hydraulics as hy
from hydraulics import validate as hv

from .files import write_atomic
from .inputs import input_named

FORMAT = "ditchwright-project"
SCHEMA_VERSION = 2


class ProjectFileError(Exception):
    """A project file that cannot be read: not JSON, truncated, wrong layout or a newer version."""


class ProjectSaveError(ValueError):
    """A project holding a value that no project file can keep (a NaN, a lone surrogate); nothing was written."""


def _shown(text, limit: int = 60) -> str:
    """Text from a file as it can be printed: a lone surrogate as \\udxxx, at most ``limit`` characters."""
    text = str(text).encode("utf-8", "backslashreplace").decode("utf-8")
    return text if len(text) <= limit else text[: limit - 3] + "..."


def field_label(path, doc=None) -> str:
    """Where a value sits in a project document, as a reader finds it in the file.

    ``["channels", 0, "flow", "value"]`` gives ``channels[0] "East verge ditch": flow.value`` (the
    channel's name is taken from ``doc`` when it has one); a top-level path gives its key.
    """
    path = list(path)
    head = ""
    if len(path) >= 2 and path[0] in ("channels", "runs") and isinstance(path[1], int):
        head = f"{path[0]}[{path[1]}]"
        try:
            name = doc[path[0]][path[1]]["name"]
        except (TypeError, KeyError, IndexError):
            name = None
        if isinstance(name, str) and name:
            head += f' "{_shown(name)}"'
        path = path[2:]
    tail = ""
    for part in path:
        tail += f"[{part}]" if isinstance(part, int) else (("." if tail else "") + _shown(part))
    return ": ".join(p for p in (head, tail) if p) or "top level"


@dataclass
class FlowBasis:
    """How the design flow was obtained: typed in, or by the rational method."""

    method: str = "typed"                 # "typed" | "rational"
    value: float = 0.5                    # design flow Q [m^3/s] when typed
    runoff_coefficient: float | None = None  # rational C [-]
    intensity: float | None = None        # rainfall intensity i [m/s]
    area: float | None = None             # drainage area A [m^2]
    flow_length: float | None = None      # longest flow path for Kirpich's t_c [m]
    flow_path_slope: float | None = None  # its average slope [m/m]


@dataclass
class LiningChoice:
    """A catalogue lining, with a stone size where the lining takes one."""

    key: str
    d50: float | None = None              # [m]


@dataclass
class Channel:
    """One ditch or reach with everything needed to design it (SI)."""

    name: str = "Ditch 1"
    location: str = ""                    # station range or a location note
    flow: FlowBasis = field(default_factory=FlowBasis)
    slope: float = 0.005                  # [m/m]
    section: dict = field(default_factory=lambda: {"shape": "trapezoid", "bottom_width": 0.6,
                                                   "left_slope": 3.0, "right_slope": 3.0})
    lining: LiningChoice | None = None
    manning_n: float | None = 0.030       # used when there is no lining (or to override its n)
    bend_radius: float | None = None      # centreline radius of the sharpest bend [m]
    min_freeboard: float = 0.15           # [m]
    alternatives: list = field(default_factory=list)  # LiningChoice list for the comparison
    notes: str = ""

    def build_section(self) -> hy.Section:
        return hy.section_from_dict(self.section)

    def design_flow(self) -> float:
        """Design discharge [m^3/s], from the typed value or the rational method."""
        if self.flow.method == "rational":
            from hydraulics.rational import rational_flow
            return rational_flow(self.flow.runoff_coefficient, self.flow.intensity, self.flow.area)
        return self.flow.value


@dataclass
class SheetInfo:
    """Title-block facts for design sheets; empty until the user fills them."""

    company: str = ""
    logo: str = ""          # path to the company's logo image, chosen by the user
    designer: str = ""
    checker: str = ""
    approver: str = ""
    date_designed: str = ""
    date_checked: str = ""
    date_approved: str = ""
    revision: str = ""
    project_number: str = ""


@dataclass
class RunCandidate:
    """A lining a run may use, with its price for this run (SI: per m^2 of lined surface or per m^3 of layer, as
    the catalogue entry's unit_cost_basis says; None: the catalogue's)."""

    key: str
    d50: float | None = None              # [m]
    unit_cost: float | None = None


@dataclass
class ProfilePoint:
    station: float                        # [m]
    elevation: float                      # invert [m]


#: What may control the water surface at a run's outfall (``Outfall.control``).
OUTFALL_CONTROLS = ("normal", "critical", "level")


@dataclass
class Outfall:
    """Where the run ends: one end of its profile, what is there, the water level there if known [m], and what
    controls the water surface there: "normal" depth (the default, and what a file without the field means),
    "critical" depth (a free overfall) or the known water "level" (``water_level``, an elevation like the
    profile's)."""

    station: float
    kind: str = ""                        # culvert, inlet, stream... in the user's words
    water_level: float | None = None
    control: str = "normal"


@dataclass
class RunSection:
    """The cross-section over a station range, with the ditch's depth as built [m]."""

    from_station: float
    to_station: float
    section: dict
    ditch_depth: float | None = None      # None only for a closed section (its own full depth)


@dataclass
class RunBend:
    from_station: float
    to_station: float
    radius: float                         # centre-line radius [m]


@dataclass
class LandCover:
    area: float                           # [m^2]
    runoff_coefficient: float             # C [-]
    cover: str = ""


@dataclass
class SubAreaInput:
    """A drainage sub-area as the user gives it: C typed or weighted from land covers; its own time of
    concentration typed or by a published method; entering at ``from_station`` or spread to ``to_station``."""

    name: str
    area: float                           # [m^2]
    time_of_concentration: dict           # {"method": "typed", "value": s} | kirpich | tr55 (see the schema)
    from_station: float
    to_station: float | None = None       # None: enters at from_station
    runoff_coefficient: float | None = None
    land_covers: list = field(default_factory=list)   # LandCover list


@dataclass
class PointInflowInput:
    name: str
    station: float                        # [m]
    flow: float                           # [m^3/s]


@dataclass
class Run:
    """A ditch run along a road (SI); see hydraulics.ditch_run for what is computed."""

    name: str
    profile: list                         # ProfilePoint list
    outfall: Outfall
    sections: list                        # RunSection list
    candidates: list                      # RunCandidate list
    sub_areas: list                       # SubAreaInput list
    return_period: float = 10.0           # design return period [yr]
    point_inflows: list = field(default_factory=list)
    bends: list = field(default_factory=list)
    spacing: float = 15.0                 # largest distance between design points [m]
    min_stretch: float = 15.0             # shortest stretch of one lining [m]
    min_duration: float = 300.0           # shortest duration intensities are read at [s]
    min_freeboard: float = 0.15           # [m]
    mat_allowance: float = 0.0            # extra seeded or mat surface for laps and anchor trenches [-]
    stone_porosity: float = 0.4           # voids of a riprap layer [-]
    notes: str = ""


@dataclass
class Project:
    name: str = "Untitled project"
    units: str = "us"
    channels: list = field(default_factory=lambda: [Channel()])
    sheet: SheetInfo = field(default_factory=SheetInfo)
    notes: str = ""
    rainfall: dict | None = None          # the project's IDF relation (hydraulics.rainfall.idf_from_dict)
    runs: list = field(default_factory=list)   # Run list

    def run(self, name: str) -> Run:
        for r in self.runs:
            if r.name == name:
                return r
        have = ", ".join(r.name for r in self.runs) or "no runs"
        raise KeyError(f"no run named {name!r}; the project has: {have}")

    def channel_label(self, channel: Channel) -> str:
        """``channels[0] "East verge ditch"``: where the channel sits in the project file."""
        index = next((i for i, ch in enumerate(self.channels) if ch is channel), None)
        if index is None:
            return f'channel "{_shown(channel.name)}"'
        return f'channels[{index}] "{_shown(channel.name)}"'

    def channel(self, name: str) -> Channel:
        for ch in self.channels:
            if ch.name == name:
                return ch
        raise KeyError(f"no channel named {name!r}; the project has: {', '.join(c.name for c in self.channels)}")

    # -- serialisation ---------------------------------------------------
    def to_dict(self) -> dict:
        data = asdict(self)
        return {"format": FORMAT, "schema_version": SCHEMA_VERSION, **data}

    @classmethod
    def from_dict(cls, data: dict) -> "Project":
        """A project from a document of the file's layout (the caller's document is left as it was)."""
        return cls._from_document(copy.deepcopy(data))

    @classmethod
    def _from_document(cls, data: dict) -> "Project":
        """A project from a document nobody else holds (parts of it become the project's own)."""
        data = migrate(data)
        validate_document(data)
        channels = [_channel_from_dict(c) for c in data["channels"]]
        return cls(name=data["name"], units=data["units"], channels=channels,
                   sheet=SheetInfo(**data.get("sheet", {})), notes=data.get("notes", ""),
                   rainfall=data.get("rainfall"), runs=[_run_from_dict(r) for r in data.get("runs", [])])


def _channel_from_dict(c: dict) -> Channel:
    c = dict(c)
    c["flow"] = FlowBasis(**c["flow"])
    c["lining"] = LiningChoice(**c["lining"]) if c.get("lining") else None
    c["alternatives"] = [LiningChoice(**a) for a in c.get("alternatives", [])]
    return Channel(**c)


def _run_from_dict(r: dict) -> Run:
    r = dict(r)
    r["profile"] = [ProfilePoint(**p) for p in r["profile"]]
    r["outfall"] = Outfall(**r["outfall"])
    r["sections"] = [RunSection(**s) for s in r["sections"]]
    r["bends"] = [RunBend(**b) for b in r.get("bends", [])]
    r["candidates"] = [RunCandidate(**c) for c in r["candidates"]]
    r["sub_areas"] = [SubAreaInput(**{**a, "land_covers": [LandCover(**lc) for lc in a.get("land_covers", [])]})
                      for a in r["sub_areas"]]
    r["point_inflows"] = [PointInflowInput(**p) for p in r.get("point_inflows", [])]
    return Run(**r)


#: A project file is read whole into memory; a larger file is refused before it is read. As the
#: program writes them, 32 MiB hold about 40,000 channels.
MAX_FILE_BYTES = 32 * 1024 * 1024
#: Lists and objects nest 8 levels deep in a project file (the project, runs, run, sub-areas, sub-area, its time of
#: concentration, segments, segment);
#: anything much deeper is not a project, and is refused before it reaches the checks below.
MAX_NESTING = 16


class _NotFinite:
    """A number written in the file that no float holds: NaN, Infinity, or too large (1e400)."""

    def __init__(self, text: str):
        self.text = text


class _KeysTwice(dict):
    """An object of the file in which some key is given more than once."""

    repeated: tuple = ()


def _parse_float(text: str):
    value = float(text)
    return value if math.isfinite(value) else _NotFinite(text)


def _parse_int(text: str):
    # Python refuses to convert integers of more than 4300 digits; far fewer already overflow a float.
    if len(text) > 400:
        return _NotFinite(text)
    value = int(text)
    try:
        float(value)
    except OverflowError:
        return _NotFinite(text)
    return value


def _object(pairs):
    obj = dict(pairs)
    if len(obj) == len(pairs):
        return obj
    seen, repeated = set(), []
    for key, _ in pairs:
        if key in seen and key not in repeated:
            repeated.append(key)
        seen.add(key)
    obj = _KeysTwice(obj)
    obj.repeated = tuple(repeated)
    return obj


def _lone_surrogate(text: str):
    try:
        text.encode("utf-8")
    except UnicodeEncodeError as exc:
        return text[exc.start]
    return None


def _check_values(doc, error=ProjectFileError) -> None:
    """Refuse what the JSON parser lets through but a project cannot hold (and could not be saved again):
    non-finite numbers, repeated keys, lone surrogate characters, and nesting far deeper than a project's.

    The walk uses its own stack, so a deep file cannot exhaust Python's recursion limit here.
    """
    stack = [(doc, ())]
    while stack:
        value, path = stack.pop()
        if len(path) > MAX_NESTING:
            raise error(f"{field_label(path[:MAX_NESTING], doc)}: lists or objects nest more than "
                                   f"{MAX_NESTING} levels deep; a project file needs 8")
        problem = None
        if isinstance(value, _NotFinite):
            problem = f"must be a finite number, got {_shown(value.text, 30)}"
        elif isinstance(value, float) and not math.isfinite(value):
            problem = f"must be a finite number, got {value}"
        elif isinstance(value, str) and _lone_surrogate(value):
            problem = (f"holds a lone surrogate character (U+{ord(_lone_surrogate(value)):04X}), which is not "
                       "text and could not be saved again")
        elif isinstance(value, dict):
            if isinstance(value, _KeysTwice):
                keys = ", ".join(f'"{_shown(k)}"' for k in value.repeated)
                problem = f"the key {keys} is given more than once; each key may appear only once"
            else:
                bad_key = next((k for k in value if _lone_surrogate(k)), None)
                if bad_key is not None:
                    problem = f'the key "{_shown(bad_key)}" holds a lone surrogate character, which is not text'
            stack.extend((v, path + (k,)) for k, v in reversed(value.items()))
        elif isinstance(value, list):
            stack.extend((v, path + (i,)) for i, v in reversed(list(enumerate(value))))
        if problem:
            raise error(f"{field_label(path, doc)}: {problem}")


_JSON_TYPES = {list: "a list", dict: "an object", str: "text", bool: "true or false", type(None): "null",
               int: "a number", float: "a number"}


def _layout_problem(exc) -> str:
    """The schema's complaint in the reader's words."""
    got = _JSON_TYPES.get(type(exc.instance), type(exc.instance).__name__)
    shown = "" if isinstance(exc.instance, dict) else " " + _shown(json.dumps(exc.instance, ensure_ascii=False), 40)
    kind, want = exc.validator, exc.validator_value
    if kind == "type":
        wants = [want] if isinstance(want, str) else list(want)
        words = {"number": "a single number", "string": "text", "array": "a list", "object": "an object",
                 "null": "null", "integer": "a whole number", "boolean": "true or false"}
        return f"must be {' or '.join(words.get(w, w) for w in wants)}, got {got}{shown}"
    if kind == "additionalProperties" and isinstance(exc.instance, dict):
        known = [k for k in exc.schema.get("properties", {}) if k != "shape"]
        extra = ", ".join(f'"{_shown(k)}"' for k in exc.instance if k not in exc.schema.get("properties", {}))
        shape = exc.instance.get("shape")
        what = "this object"
        if isinstance(shape, str) and shape:
            what = f"a{'n' * (shape[:1].lower() in 'aeiou')} {shape} section"
        return f"{extra} does not belong to {what} (it takes {', '.join(known)})"
    if kind in ("exclusiveMinimum", "minimum", "maximum", "exclusiveMaximum"):
        op = {"exclusiveMinimum": ">", "minimum": ">=", "maximum": "<=", "exclusiveMaximum": "<"}[kind]
        spec = input_named(str(exc.absolute_path[-1])) if exc.absolute_path else None
        hint = spec.percent_hint(exc.instance) if spec is not None and kind == "maximum" else ""
        return f"must be {op} {want:g}, got{shown}{hint}"
    if kind in ("enum", "const"):
        allowed = want if kind == "enum" else [want]
        return f"must be one of {', '.join(json.dumps(a) for a in allowed)}, got{shown or ' ' + got}"
    return exc.message


def schema() -> dict:
    return json.loads(ir.files("resources").joinpath("project.schema.json").read_text(encoding="utf-8"))


@functools.lru_cache(maxsize=1)
def _fast_validator():
    """The schema compiled by jsonschema-rs (Rust): about 300 times faster than the Python validator on a large
    project, which matters for a file of tens of thousands of channels; the Python validator still words the
    complaint when a file does not pass."""
    import jsonschema_rs

    return jsonschema_rs.validator_for(schema())


def validate_document(data: dict) -> None:
    """Check a project document against the schema; ProjectFileError says where it is wrong."""
    if not _fast_validator().is_valid(data):   # checked in Rust; the Python validator words what is wrong
        _check_values(data)   # first what the Python validator could choke on (nesting), and why the file is odd
        import jsonschema   # the wording validator, needed only for a file that is wrong

        try:
            jsonschema.validate(data, schema())
        except jsonschema.ValidationError as exc:
            raise ProjectFileError(f"{field_label(exc.absolute_path, data)}: {_layout_problem(exc)}") from None
    limits_hold = _all_within_limits(data["channels"])
    for i, ch in enumerate(data["channels"]):
        _check_section(data, ["channels", i, "section"], ch["section"])
        if not limits_hold:
            _check_limits(data, i)
    for i, run in enumerate(data.get("runs") or []):
        for j, rs in enumerate(run["sections"]):
            _check_section(data, ["runs", i, "sections", j, "section"], rs["section"])
        outfall = run["outfall"]
        if outfall.get("control") == "level" and outfall.get("water_level") is None:
            raise ProjectFileError(f"{field_label(['runs', i, 'outfall', 'water_level'], data)}: is missing: the "
                                   "outfall control is a known water level (\"level\"), so give that level (an "
                                   "elevation in m, like the profile's)")
    if data.get("rainfall") is not None:
        from hydraulics.rainfall import idf_from_dict
        try:
            idf_from_dict(data["rainfall"])
        except hy.InputError as exc:
            raise ProjectFileError(str(exc)) from None


def _check_section(data: dict, path: list, sec: dict) -> None:
    """Refuse an impossible section, naming where it sits in the file."""
    try:
        section = hy.section_from_dict(sec)
    except hy.InputError as exc:
        raise ProjectFileError(f"{field_label([*path, exc.field], data)}: "
                               f"{str(exc).split(': ', 1)[-1]} (an impossible section)") from None
    if section.kind != "irregular":   # the core also takes arrays (many sections at once); a file gives one
        for key, value in sec.items():
            if key != "shape" and not (isinstance(value, (int, float)) and not isinstance(value, bool)):
                raise ProjectFileError(f"{field_label([*path, key], data)}: must be a "
                                       f"single number, got {_JSON_TYPES.get(type(value), 'something else')}")


def _design_numbers(channel: dict):
    """(path within the channel, core field name, value) of each design number a channel gives."""
    if channel["flow"].get("method") == "typed":
        yield ["flow", "value"], "flow", channel["flow"].get("value")
    yield ["slope"], "slope", channel.get("slope")
    yield ["manning_n"], "n", channel.get("manning_n")
    if channel["section"].get("shape") != "irregular":
        for key, value in channel["section"].items():
            if key != "shape":
                yield ["section", key], key, value
    if channel.get("lining"):
        yield ["lining", "d50"], "d50", channel["lining"].get("d50")
    for j, alt in enumerate(channel.get("alternatives") or []):
        yield ["alternatives", j, "d50"], "d50", alt.get("d50")
    yield ["bend_radius"], "bend_radius", channel.get("bend_radius")
    yield ["min_freeboard"], "min_freeboard", channel.get("min_freeboard")


def _all_within_limits(channels: list) -> bool:
    """True when every design number of every channel lies within its range; one array check per kind of number
    (a file of tens of thousands of channels), the channel-by-channel check naming the first one otherwise."""
    by_name: dict = {}
    for ch in channels:
        for _, name, value in _design_numbers(ch):
            if isinstance(value, (int, float)) and not isinstance(value, bool):
                by_name.setdefault(name, []).append(value)
    for name, values in by_name.items():
        limit = hv.limit_for(name)
        if limit is not None and not np.all(limit.holds(np.asarray(values, dtype=float))):
            return False
    return True


def _check_limits(data: dict, i: int) -> None:
    """Refuse a design number outside the range of that input (hydraulics.validate.LIMITS), in SI as in the file."""
    for path, name, value in _design_numbers(data["channels"][i]):
        if isinstance(value, (int, float)) and not isinstance(value, bool):
            problem = hv.outside_limit(name, float(value))
            if problem:
                raise ProjectFileError(f"{field_label(['channels', i, *path], data)}: {problem}")


def _v1_to_v2(data: dict) -> dict:
    """Version 2 adds ditch runs and the project's rainfall relation; a version-1 project has neither."""
    data = dict(data)
    data["schema_version"] = 2
    data.setdefault("rainfall", None)
    data.setdefault("runs", [])
    return data


#: Upgrades from each older schema version to the next: {old_version: function(doc) -> doc}.
MIGRATIONS: dict = {1: _v1_to_v2}


def migrate(data) -> dict:
    if not isinstance(data, dict) or data.get("format") != FORMAT:
        raise ProjectFileError("this is not a Ditchwright project file (no 'format': 'ditchwright-project')")
    version = data.get("schema_version")
    if not isinstance(version, int) or version < 1:
        raise ProjectFileError(f"the project file has an invalid schema_version {version!r}")
    if version > SCHEMA_VERSION:
        raise ProjectFileError(f"the project file was written by a newer Ditchwright (file format version {version}, "
                               f"this program reads up to {SCHEMA_VERSION}); update the program to open it")
    while version < SCHEMA_VERSION:
        data = MIGRATIONS[version](data)
        version = data["schema_version"]
    return data


def _serialise(project: Project) -> bytes:
    """The file's bytes; a value no file can keep raises ProjectSaveError naming the channel and field."""
    data = project.to_dict()
    try:
        return (json.dumps(data, indent=2, ensure_ascii=False, allow_nan=False) + "\n").encode("utf-8")
    except ValueError:   # a NaN or infinity (allow_nan=False), or a lone surrogate (UnicodeEncodeError)
        _check_values(data, ProjectSaveError)
        raise


def dumps(project: Project) -> str:
    return _serialise(project).decode("utf-8")


def loads(text: str) -> Project:
    """A project from the text of its file; anything that is not a project a later save could write again is
    refused with a ProjectFileError naming the channel and the field."""
    if len(text) > MAX_FILE_BYTES:
        raise ProjectFileError(_too_large(len(text.encode("utf-8", "surrogatepass"))))
    text = text.removeprefix("\ufeff")   # a byte-order mark read as text
    odd = []   # set by the parser's hooks when the file holds what _check_values refuses

    def parse_float(t):
        v = _parse_float(t)
        if isinstance(v, _NotFinite):
            odd.append(t)
        return v

    def parse_int(t):
        v = _parse_int(t)
        if isinstance(v, _NotFinite):
            odd.append(t)
        return v

    def parse_constant(t):
        odd.append(t)
        return _NotFinite(t)

    def make_object(pairs):
        obj = _object(pairs)
        if isinstance(obj, _KeysTwice):
            odd.append("keys")
        return obj

    try:
        data = json.loads(text, parse_float=parse_float, parse_int=parse_int, parse_constant=parse_constant,
                          object_pairs_hook=make_object)
    except json.JSONDecodeError as exc:
        raise ProjectFileError(f"the project file is damaged or incomplete (not valid JSON: {exc.msg} at line "
                               f"{exc.lineno}, column {exc.colno})") from None
    except RecursionError:   # the parser's own guard against a stack overflow
        raise ProjectFileError(f"lists or objects nest too deeply to read (hundreds of levels or more); a project file "
                               f"needs 8 and may have at most {MAX_NESTING}") from None
    if odd or _SURROGATE.search(text):
        _check_values(data)   # names the place; nesting is bounded by the schema, checked next
    return Project._from_document(data)


#: A lone surrogate in the text, or a JSON escape that makes one (\ud800 to \udfff).
_SURROGATE = re.compile(r"[\ud800-\udfff]|\\u[dD][89a-fA-F][0-9a-fA-F]{2}")


def _too_large(size: int) -> str:
    return (f"the project file is {size / 1e6:.1f} MB; a project file is read whole into memory and may be at most "
            f"{MAX_FILE_BYTES / 1e6:.1f} MB ({MAX_FILE_BYTES // 2**20} MiB, about 40,000 channels)")


def load(path) -> Project:
    """Read a project file; a file larger than MAX_FILE_BYTES is refused before it is read."""
    path = Path(path)
    try:
        with path.open("rb") as fh:
            size = os.fstat(fh.fileno()).st_size
            if size > MAX_FILE_BYTES:
                raise ProjectFileError(_too_large(size))
            raw = fh.read(MAX_FILE_BYTES + 1)   # the size on disk can change, or be unknown (a pipe)
        if len(raw) > MAX_FILE_BYTES:
            raise ProjectFileError(_too_large(len(raw)))
        text = raw.decode("utf-8-sig")   # a byte-order mark, as some Windows editors write, is accepted
    except FileNotFoundError:
        raise ProjectFileError(f"no such file: {path}") from None
    except UnicodeDecodeError as exc:
        raise ProjectFileError(f"cannot read {path}: not UTF-8 text (byte {exc.start} is "
                               f"0x{raw[exc.start]:02x})") from None
    except OSError as exc:
        raise ProjectFileError(f"cannot read {path}: {exc.strerror or exc}") from None
    return loads(text)


def save(project: Project, path, *, private: bool = False) -> None:
    """Write atomically (temporary file in the same folder, fsync, then os.replace); through a symbolic link,
    the file it points to. ``private`` (autosaves) makes the file readable by its owner only.

    Raises ProjectSaveError before anything is written when the project holds a value no file can keep,
    and OSError when the file cannot be written; either way the old file is left as it was.
    """
    write_atomic(path, _serialise(project), private=private)


def demo_path():
    """The shipped demo project (an invented site)."""
    return ir.files("resources").joinpath("demo-project.json")
