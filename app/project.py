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
import json
from dataclasses import asdict, dataclass, field
from importlib import resources as ir
from pathlib import Path

import jsonschema

import hydraulics as hy

from .files import write_atomic

FORMAT = "ditchwright-project"
SCHEMA_VERSION = 1


class ProjectFileError(Exception):
    """A project file that cannot be read: not JSON, truncated, wrong layout or a newer version."""


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
class Project:
    name: str = "Untitled project"
    units: str = "us"
    channels: list = field(default_factory=lambda: [Channel()])
    sheet: SheetInfo = field(default_factory=SheetInfo)
    notes: str = ""

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
        data = migrate(copy.deepcopy(data))
        validate_document(data)
        channels = [_channel_from_dict(c) for c in data["channels"]]
        return cls(name=data["name"], units=data["units"], channels=channels,
                   sheet=SheetInfo(**data.get("sheet", {})), notes=data.get("notes", ""))


def _channel_from_dict(c: dict) -> Channel:
    c = dict(c)
    c["flow"] = FlowBasis(**c["flow"])
    c["lining"] = LiningChoice(**c["lining"]) if c.get("lining") else None
    c["alternatives"] = [LiningChoice(**a) for a in c.get("alternatives", [])]
    return Channel(**c)


def schema() -> dict:
    return json.loads(ir.files("resources").joinpath("project.schema.json").read_text(encoding="utf-8"))


def validate_document(data: dict) -> None:
    """Check a project document against the schema; ProjectFileError says where it is wrong."""
    try:
        jsonschema.validate(data, schema())
    except jsonschema.ValidationError as exc:
        where = "/".join(str(p) for p in exc.absolute_path) or "top level"
        raise ProjectFileError(f"the project file does not have the expected layout at {where}: {exc.message}") from None
    for i, ch in enumerate(data["channels"]):
        try:
            hy.section_from_dict(ch["section"])
        except hy.InputError as exc:
            raise ProjectFileError(f"channel {i + 1} ({ch['name']!r}) has an impossible section: {exc}") from None


#: Upgrades from each older schema version to the next: {old_version: function(doc) -> doc}.
MIGRATIONS: dict = {}


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


def dumps(project: Project) -> str:
    return json.dumps(project.to_dict(), indent=2, ensure_ascii=False, allow_nan=False) + "\n"


def loads(text: str) -> Project:
    try:
        data = json.loads(text)
    except json.JSONDecodeError as exc:
        raise ProjectFileError(f"the project file is damaged or incomplete (not valid JSON: {exc.msg} at line "
                               f"{exc.lineno}, column {exc.colno})") from None
    return Project.from_dict(data)


def load(path) -> Project:
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise ProjectFileError(f"no such file: {path}") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise ProjectFileError(f"cannot read {path}: {exc}") from None
    return loads(text)


def save(project: Project, path) -> None:
    """Write atomically (temporary file in the same folder, fsync, then os.replace)."""
    write_atomic(path, dumps(project))


def demo_path():
    """The shipped demo project (an invented site)."""
    return ir.files("resources").joinpath("demo-project.json")
