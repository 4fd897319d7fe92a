"""The lining catalogue: loading, schema validation and the user's own entries.

The shipped catalogue (``resources/linings.toml``) is read-only and versioned
(``schema_version`` for the layout, ``catalogue_version`` for the content). A
user catalogue in the same format adds entries or overrides shipped ones by
``key``: an override names only the fields it changes (typically
``unit_cost``), and nested tables are merged field by field. The merged entry is
validated like any other.

Every number in an entry carries a source: a ``source`` string in its table or a
``<field>_source`` string beside it (publication and table or equation, or
"common practice", "user data"; a value not yet verified against its
publication carries the mark of :mod:`hydraulics.provenance`). ``unit_cost``
is the user's own price and is never shipped.

Validation is hand-written (the core depends only on numpy/scipy and the
standard library); every error names the file, the entry and the field.
"""

from __future__ import annotations

import copy
import importlib.resources
import math
import re
import tomllib
from dataclasses import dataclass, field
from pathlib import Path

from ..constants import GAMMA_WATER
from ..errors import InputError
from . import hec15
from .roughness import STONE_METHODS, StoneRoughness, VegetationRoughness

__all__ = [
    "SCHEMA_VERSION", "CATEGORIES", "CatalogueError", "Lining", "Catalogue", "shipped_catalogue_path",
    "load_catalogue", "read_catalogue_file", "parse_catalogue", "dumps_user_catalogue",
]

#: Layout version this code reads.
SCHEMA_VERSION = 1
CATEGORIES = ("rigid", "stone", "vegetation", "manufactured", "soil", "gabion")
ROUGHNESS_MODELS = ("constant", "stone", "vegetation", "soil")
PERMISSIBLE_METHODS = ("none", "shields", "vegetation", "soil", "value", "gabion")
#: Categories whose entries carry a [stone] table: loose stone, and the rock fill of a gabion mattress.
STONE_TABLE_CATEGORIES = ("stone", "gabion")
SOIL_TYPES = ("fine_noncohesive", "noncohesive", "cohesive")
THICKNESS_RULES = ("none", "fixed", "stone")
COST_BASES = ("area", "volume")
_KEY_RE = re.compile(r"^[a-z][a-z0-9_]*$")
_ENTRY_FIELDS = {"key", "name", "category", "user_data", "unit_cost", "unit_cost_basis", "notes",
                 "roughness", "permissible", "stone", "soil", "thickness"}


class CatalogueError(InputError):
    """A catalogue file or entry that does not follow the schema."""


SHIPPED_NAME = "linings.toml"


def shipped_catalogue_path():
    """The shipped, read-only catalogue ``resources/linings.toml`` (an importlib.resources Traversable)."""
    return importlib.resources.files("resources").joinpath(SHIPPED_NAME)


# --------------------------------------------------------------------------
# validation helpers
# --------------------------------------------------------------------------

class _Where:
    def __init__(self, origin: str, key: str):
        self.origin, self.key = origin, key

    def fail(self, fld: str, message: str):
        raise CatalogueError(f"lining {self.key!r} {fld}", f"{message} (in {self.origin})")


def _is_number(v) -> bool:
    return isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v)


def _num(w: _Where, table: dict, name: str, fld: str, *, low=None, high=None, low_incl=False, high_incl=False,
         required=True):
    if name not in table:
        if required:
            w.fail(fld, "is missing")
        return None
    v = table[name]
    if not _is_number(v):
        w.fail(fld, f"must be a finite number, got {v!r}")
    if low is not None and (v < low or (v == low and not low_incl)):
        w.fail(fld, f"must be {'>=' if low_incl else '>'} {low:g}, got {v:g}")
    if high is not None and (v > high or (v == high and not high_incl)):
        w.fail(fld, f"must be {'<=' if high_incl else '<'} {high:g}, got {v:g}")
    return float(v)


def _choice(w: _Where, table: dict, name: str, fld: str, choices, default=None):
    v = table.get(name, default)
    if v is None:
        w.fail(fld, f"is missing (one of {', '.join(choices)})")
    if v not in choices:
        w.fail(fld, f"must be one of {', '.join(choices)}, got {v!r}")
    return v


def _text(w: _Where, table: dict, name: str, fld: str, required=True):
    v = table.get(name)
    if v is None:
        if required:
            w.fail(fld, "is missing")
        return None
    if not isinstance(v, str) or not v.strip():
        w.fail(fld, f"must be non-empty text, got {v!r}")
    return v


def _table(w: _Where, entry: dict, name: str, required=True) -> dict | None:
    t = entry.get(name)
    if t is None:
        if required:
            w.fail(name, "table is missing")
        return None
    if not isinstance(t, dict):
        w.fail(name, f"must be a table, got {type(t).__name__}")
    return t


def _check_sources(w: _Where, table: dict, prefix: str):
    """Every number in ``table`` has ``<name>_source`` or a table-wide ``source``."""
    for k, v in table.items():
        if k.endswith("_source") or k == "source":
            if not isinstance(v, str) or not v.strip():
                w.fail(f"{prefix}.{k}", f"must be non-empty text, got {v!r}")
            continue
        values = v if isinstance(v, list) else [v]
        has_number = any(isinstance(x, (int, float)) and not isinstance(x, bool) for x in values)
        if has_number and not (isinstance(table.get(f"{k}_source"), str) or isinstance(table.get("source"), str)):
            w.fail(f"{prefix}.{k}", f"has no source: add '{k}_source' or a 'source' for the table")


def _unknown(w: _Where, table: dict, allowed: set, prefix: str):
    for k in table:
        base = k[:-7] if k.endswith("_source") else k
        if base not in allowed and k != "source":
            w.fail(f"{prefix}.{k}" if prefix else k, f"is not a known field (known: {', '.join(sorted(allowed))})")


# --------------------------------------------------------------------------
# one entry
# --------------------------------------------------------------------------

def _validate_entry(raw: dict, origin: str, index: int) -> dict:
    if not isinstance(raw, dict):
        raise CatalogueError(f"lining #{index}", f"must be a table, got {type(raw).__name__} (in {origin})")
    key = raw.get("key")
    if not isinstance(key, str) or not _KEY_RE.match(key):
        raise CatalogueError(f"lining #{index} key",
                             f"must be lower-case letters, digits and '_' starting with a letter, got {key!r} (in {origin})")
    w = _Where(origin, key)
    _unknown(w, raw, _ENTRY_FIELDS, "")
    _text(w, raw, "name", "name")
    category = _choice(w, raw, "category", "category", CATEGORIES)
    user_data = raw.get("user_data", False)
    if not isinstance(user_data, bool):
        w.fail("user_data", f"must be true or false, got {user_data!r}")
    _num(w, raw, "unit_cost", "unit_cost", low=0.0, low_incl=True, required=False)
    _choice(w, raw, "unit_cost_basis", "unit_cost_basis", COST_BASES)
    _text(w, raw, "notes", "notes", required=False)
    need = not user_data  # values a user entry may leave for the user to fill in

    rough = _table(w, raw, "roughness")
    model = _choice(w, rough, "model", "roughness.model", ROUGHNESS_MODELS)
    allowed = {"model", "n", "n_min", "n_max", "method", "density_stiffness", "stem_height", "product_class"}
    _unknown(w, rough, allowed, "roughness")
    _check_sources(w, rough, "roughness")
    _text(w, rough, "source", "roughness.source", required=False)
    if "product_class" in rough:
        if category != "manufactured":
            w.fail("roughness.product_class", f"only belongs to category 'manufactured', got {category!r}")
        _choice(w, rough, "product_class", "roughness.product_class", tuple(hec15.RECP_CLASSES))
    if model == "constant":
        n = _num(w, rough, "n", "roughness.n", low=0.0, high=1.0, required=need)
        n_min = _num(w, rough, "n_min", "roughness.n_min", low=0.0, high=1.0, required=False)
        n_max = _num(w, rough, "n_max", "roughness.n_max", low=0.0, high=1.0, required=False)
        if n is not None and n_min is not None and n < n_min:
            w.fail("roughness.n", f"must be >= n_min ({n_min:g}), got {n:g}")
        if n is not None and n_max is not None and n > n_max:
            w.fail("roughness.n", f"must be <= n_max ({n_max:g}), got {n:g}")
    elif model == "stone":
        _choice(w, rough, "method", "roughness.method", STONE_METHODS, default="auto")
        if category not in STONE_TABLE_CATEGORIES:
            w.fail("roughness.model", f"'stone' needs category 'stone' or 'gabion', got {category!r}")
    elif model == "vegetation":
        _num(w, rough, "density_stiffness", "roughness.density_stiffness", low=0.0, required=need)
        _num(w, rough, "stem_height", "roughness.stem_height", low=0.0, high=5.0, required=need)

    perm = _table(w, raw, "permissible")
    method = _choice(w, perm, "method", "permissible.method", PERMISSIBLE_METHODS)
    _unknown(w, perm, {"method", "shear", "cover_factor", "growth_form", "condition"}, "permissible")
    _check_sources(w, perm, "permissible")
    _text(w, perm, "source", "permissible.source")
    if method == "shields" and category != "stone":
        w.fail("permissible.method", f"'shields' needs category 'stone', got {category!r}")
    if method == "gabion" and category != "gabion":
        w.fail("permissible.method", f"'gabion' needs category 'gabion', got {category!r}")
    if category == "gabion" and method != "gabion":
        w.fail("permissible.method", f"a gabion mattress is checked by method 'gabion', got {method!r}")
    if method in ("value", "gabion"):
        _num(w, perm, "shear", "permissible.shear", low=0.0, required=need)
    if method == "vegetation":
        cf = _num(w, perm, "cover_factor", "permissible.cover_factor", low=0.0, high=1.0, low_incl=True,
                  required=False)
        if cf is None:
            gf = _choice(w, perm, "growth_form", "permissible.growth_form", tuple(hec15.COVER_FACTOR))
            _choice(w, perm, "condition", "permissible.condition", tuple(hec15.COVER_FACTOR[gf]))

    stone = _table(w, raw, "stone", required=category in STONE_TABLE_CATEGORIES)
    if stone is not None:
        if category not in STONE_TABLE_CATEGORIES:
            w.fail("stone", f"table only belongs to categories 'stone' and 'gabion', got {category!r}")
        _unknown(w, stone, {"d50", "d100", "specific_weight", "angle_of_repose"}, "stone")
        _check_sources(w, stone, "stone")
        _text(w, stone, "source", "stone.source", required=False)
        d50 = _num(w, stone, "d50", "stone.d50", low=0.0, high=5.0, required=False)
        d100 = _num(w, stone, "d100", "stone.d100", low=0.0, high=10.0, required=False)
        if d50 is not None and d100 is not None and d100 < d50:
            w.fail("stone.d100", f"must be >= stone.d50 ({d50:g}), got {d100:g}")
        if category == "gabion" and d50 is None and need:
            w.fail("stone.d50", "is missing (the D50 of the mattress's rock fill)")
        _num(w, stone, "specific_weight", "stone.specific_weight", low=GAMMA_WATER)
        _num(w, stone, "angle_of_repose", "stone.angle_of_repose", low=0.0, high=90.0,
             required=category == "stone")
    elif method == "shields" or model == "stone":
        w.fail("stone", "table is missing")

    soil_needed = model == "soil" or method in ("soil", "vegetation")
    soil = _table(w, raw, "soil", required=soil_needed)
    if soil is not None:
        _unknown(w, soil, {"type", "d75", "soil_class", "plasticity_index", "void_ratio"}, "soil")
        _check_sources(w, soil, "soil")
        _text(w, soil, "source", "soil.source", required=False)
        stype = _choice(w, soil, "type", "soil.type", SOIL_TYPES)
        if stype == "noncohesive":
            _num(w, soil, "d75", "soil.d75", low=0.0, high=1.0, required=need)
        if stype == "cohesive":
            sc = soil.get("soil_class")
            if sc is None and need:
                w.fail("soil.soil_class", f"is missing (one of {', '.join(hec15.COHESIVE_COEFFICIENTS)})")
            if sc is not None and str(sc).upper() not in hec15.COHESIVE_COEFFICIENTS:
                w.fail("soil.soil_class", f"must be one of {', '.join(hec15.COHESIVE_COEFFICIENTS)}, got {sc!r}")
            _num(w, soil, "plasticity_index", "soil.plasticity_index", low=0.0, high=100.0, low_incl=True,
                 required=need)
            _num(w, soil, "void_ratio", "soil.void_ratio", low=0.0, high=5.0, required=need)

    thick = _table(w, raw, "thickness")
    rule = _choice(w, thick, "rule", "thickness.rule", THICKNESS_RULES)
    _unknown(w, thick, {"rule", "value", "multiple_of_d50"}, "thickness")
    _check_sources(w, thick, "thickness")
    _text(w, thick, "source", "thickness.source")
    if rule == "fixed":
        _num(w, thick, "value", "thickness.value", low=0.0, high=5.0, required=need)
    if category == "gabion" and rule != "fixed":
        w.fail("thickness.rule", f"a gabion mattress needs 'fixed' (the mattress thickness), got {rule!r}")
    if rule == "stone":
        if category != "stone":
            w.fail("thickness.rule", f"'stone' needs category 'stone', got {category!r}")
        _num(w, thick, "multiple_of_d50", "thickness.multiple_of_d50", low=1.0, high=10.0, low_incl=True,
             required=False)
    return raw


# --------------------------------------------------------------------------
# entries as objects
# --------------------------------------------------------------------------

@dataclass(frozen=True)
class Lining:
    """One validated catalogue entry. ``data`` is the entry as in the file (SI)."""

    data: dict = field(repr=False)
    origin: str = "shipped"  # "shipped", "user" or "user override"

    key = property(lambda self: self.data["key"])
    name = property(lambda self: self.data["name"])
    category = property(lambda self: self.data["category"])
    user_data = property(lambda self: bool(self.data.get("user_data", False)))
    unit_cost = property(lambda self: self.data.get("unit_cost"))
    unit_cost_basis = property(lambda self: self.data["unit_cost_basis"])
    roughness_data = property(lambda self: self.data["roughness"])
    permissible_data = property(lambda self: self.data["permissible"])
    stone_data = property(lambda self: self.data.get("stone"))
    soil_data = property(lambda self: self.data.get("soil"))
    thickness_data = property(lambda self: self.data["thickness"])

    def field_value(self, table: str, name: str):
        """The value of ``table.name`` in this entry; InputError naming the field when it is not filled in."""
        return self._need(table, name)

    def _need(self, table: str, name: str):
        t = self.data.get(table) or {}
        if t.get(name) is None:
            hint = (" (user data: type the value from the product data sheet or site investigation into your "
                    "user catalogue)" if self.user_data else "")
            raise InputError(f"lining {self.key!r} {table}.{name}", f"has no value{hint}")
        return t[name]

    # -- stone -------------------------------------------------------------
    @property
    def d50(self):
        """Default D50 [m] of a stone entry, or None (then the caller must give one)."""
        s = self.stone_data
        return None if s is None else s.get("d50")

    @property
    def product_class(self):
        """Class of a rolled erosion control product (HEC-15 Table 5.1), or None."""
        return self.roughness_data.get("product_class")

    def gabion_mattress(self):
        """(rock fill D50 [m], mattress thickness [m]) of a gabion entry; InputError naming a value not filled in."""
        if self.category != "gabion":
            raise InputError("lining", f"{self.key!r} is not a gabion mattress (category {self.category})")
        from .. import validate
        return (float(validate.positive(f"lining {self.key!r} stone.d50", self._need("stone", "d50"))),
                float(validate.positive(f"lining {self.key!r} thickness.value", self._need("thickness", "value"))))

    def _d50(self, d50):
        if self.category == "gabion":   # the fill is part of the entry (HEC-15 Section 7.1: n from its D50)
            if d50 is not None:
                raise InputError("d50", f"a gabion mattress takes the D50 of its rock fill from its catalogue entry "
                                        f"(stone.d50 of {self.key!r}), got a D50 of {d50!r}")
            from .. import validate
            return validate.positive(f"lining {self.key!r} stone.d50", self._need("stone", "d50"))
        if self.category != "stone":
            if d50 is not None:
                raise InputError("d50", f"applies to stone linings only; {self.key!r} is {self.category}")
            return None
        if d50 is None:
            d50 = self.d50
        if d50 is None:
            raise InputError("d50", f"lining {self.key!r} needs a D50 (give one, e.g. {self.key}:0.15)")
        from .. import validate
        return validate.positive("d50", d50)

    @property
    def specific_weight(self):
        return None if self.stone_data is None else self.stone_data["specific_weight"]

    @property
    def angle_of_repose(self):
        return None if self.stone_data is None else self.stone_data.get("angle_of_repose")

    # -- roughness -----------------------------------------------------------
    def roughness(self, d50=None):
        """Manning's n for the solvers: a float, or a depth-dependent roughness model.

        ``d50`` [m] overrides the entry's stone size (stone linings only).
        """
        r = self.roughness_data
        model = r["model"]
        if model == "stone":
            return StoneRoughness(self._d50(d50), r.get("method", "auto"))
        if d50 is not None:
            self._d50(d50)  # refuses a D50 for a lining that is not stone
        if model == "constant":
            return float(self._need("roughness", "n"))
        if model == "vegetation":
            return VegetationRoughness(self._need("roughness", "density_stiffness"),
                                       self._need("roughness", "stem_height"))
        return float(self.soil_grain_n())  # model == "soil"

    def soil_grain_n(self):
        """Grain roughness ns of the entry's soil (HEC-15 Chapter 4)."""
        soil = self.soil_data
        if soil is None:
            raise InputError(f"lining {self.key!r} soil", "table is missing")
        if soil["type"] == "noncohesive":
            return hec15.soil_grain_n(self._need("soil", "d75"))
        return hec15.soil_grain_n(None)

    def soil_permissible_shear(self):
        """tau_p of the entry's soil [Pa] (HEC-15 Chapter 4)."""
        soil = self.soil_data
        if soil is None:
            raise InputError(f"lining {self.key!r} soil", "table is missing")
        if soil["type"] == "fine_noncohesive":
            return 1.0  # HEC-15 Section 4.3, fine non-cohesive soil (provenance: soil_noncohesive)
        if soil["type"] == "noncohesive":
            return hec15.noncohesive_permissible_shear(self._need("soil", "d75"))
        return hec15.cohesive_permissible_shear(self._need("soil", "soil_class"),
                                                self._need("soil", "plasticity_index"),
                                                self._need("soil", "void_ratio"))

    def cover_factor(self):
        """Cover factor CF of a vegetated entry (HEC-15 Table 4.5 or the entry's own value)."""
        p = self.permissible_data
        if p.get("cover_factor") is not None:
            return float(p["cover_factor"])
        return hec15.cover_factor(p["growth_form"], p["condition"])

    def layer_thickness(self, d50=None):
        """Layer thickness [m] by the entry's rule, or None for linings without a layer."""
        t = self.thickness_data
        if t["rule"] == "none":
            return None
        if t["rule"] == "fixed":
            return float(self._need("thickness", "value"))
        d = self._d50(d50)
        d100 = self.stone_data.get("d100") if d50 is None else None
        return hec15.stone_layer_thickness(d, d100, t.get("multiple_of_d50", 1.5))

    def to_dict(self) -> dict:
        return copy.deepcopy(self.data)


@dataclass(frozen=True)
class Catalogue:
    """Validated linings by key, in file order (shipped first, then the user's additions)."""

    linings: dict
    schema_version: int = SCHEMA_VERSION
    catalogue_version: str = ""
    origin: str = ""

    def keys(self):
        return list(self.linings)

    def __iter__(self):
        return iter(self.linings.values())

    def __len__(self):
        return len(self.linings)

    def __contains__(self, key):
        return key in self.linings

    def get(self, key: str) -> Lining:
        try:
            return self.linings[key]
        except KeyError:
            raise InputError("lining", f"unknown lining {key!r}; known: {', '.join(self.linings)}") from None

    def by_category(self, category: str) -> list[Lining]:
        if category not in CATEGORIES:
            raise InputError("category", f"must be one of {', '.join(CATEGORIES)}, got {category!r}")
        return [lin for lin in self if lin.category == category]

    def merged(self, user: dict | None, origin: str = "user catalogue") -> "Catalogue":
        """This catalogue with a user catalogue (parsed TOML ``dict``) laid over it.

        A user entry whose key exists overrides the given fields (nested tables
        merged field by field); a new key is added and must be complete.
        """
        if not user:
            return self
        _check_header(user, origin)
        entries = user.get("lining", [])
        if not isinstance(entries, list):
            raise CatalogueError("lining", f"must be an array of tables ([[lining]]) (in {origin})")
        out = dict(self.linings)
        for i, raw in enumerate(entries, 1):
            if not isinstance(raw, dict):
                raise CatalogueError(f"lining #{i}", f"must be a table (in {origin})")
            key = raw.get("key")
            if key in out:
                merged = _deep_merge(out[key].data, raw)
                out[key] = Lining(_validate_entry(merged, origin, i), "user override")
            else:
                out[key] = Lining(_validate_entry(copy.deepcopy(raw), origin, i), "user")
        return Catalogue(out, self.schema_version, self.catalogue_version, f"{self.origin} + {origin}")


def _deep_merge(base: dict, over: dict) -> dict:
    out = copy.deepcopy(base)
    for k, v in over.items():
        if isinstance(v, dict) and isinstance(out.get(k), dict):
            out[k] = _deep_merge(out[k], v)
        else:
            out[k] = copy.deepcopy(v)
    return out


def _check_header(data: dict, origin: str):
    if not isinstance(data, dict):
        raise CatalogueError("catalogue", f"must be a TOML document (in {origin})")
    v = data.get("schema_version")
    if v is None:
        raise CatalogueError("schema_version", f"is missing (in {origin})")
    if not isinstance(v, int) or isinstance(v, bool) or v != SCHEMA_VERSION:
        raise CatalogueError("schema_version", f"must be {SCHEMA_VERSION} (this program's catalogue layout), "
                                               f"got {v!r} (in {origin})")
    for k in data:
        if k not in ("schema_version", "catalogue_version", "description", "lining"):
            raise CatalogueError(k, f"is not a known top-level field (in {origin})")


def parse_catalogue(data: dict, origin: str = "catalogue") -> Catalogue:
    """Validate a parsed catalogue document and return it as a :class:`Catalogue`."""
    _check_header(data, origin)
    entries = data.get("lining")
    if not isinstance(entries, list) or not entries:
        raise CatalogueError("lining", f"must be a non-empty array of tables ([[lining]]) (in {origin})")
    out = {}
    for i, raw in enumerate(entries, 1):
        entry = _validate_entry(copy.deepcopy(raw), origin, i)
        if entry["key"] in out:
            raise CatalogueError(f"lining {entry['key']!r} key", f"appears twice (entry {i}) (in {origin})")
        out[entry["key"]] = Lining(entry, "shipped")
    version = data.get("catalogue_version", "")
    if not isinstance(version, str):
        raise CatalogueError("catalogue_version", f"must be text, got {version!r} (in {origin})")
    return Catalogue(out, data["schema_version"], version, origin)


def read_catalogue_file(path) -> dict:
    """Parse a TOML catalogue file (a path or a Traversable); errors become CatalogueError naming the file."""
    p = path if hasattr(path, "read_bytes") and not isinstance(path, str) else Path(path)
    try:
        text = p.read_bytes().decode("utf-8")
    except FileNotFoundError:
        raise CatalogueError("catalogue", f"file not found: {p}") from None
    except UnicodeDecodeError as exc:
        raise CatalogueError("catalogue", f"{p} is not UTF-8 text: {exc}") from None
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise CatalogueError("catalogue", f"{p} is not valid TOML: {exc}") from None


def load_catalogue(path=None, user_path=None) -> Catalogue:
    """The shipped catalogue (or ``path``), with the user catalogue at ``user_path`` merged over it.

    The shipped file is only read, never written. A missing user file is not an
    error (the user has not made one yet).
    """
    p = Path(path) if path is not None else shipped_catalogue_path()
    cat = parse_catalogue(read_catalogue_file(p), p.name)
    if user_path is not None and Path(user_path).exists():
        cat = cat.merged(read_catalogue_file(user_path), Path(user_path).name)
    return cat


# --------------------------------------------------------------------------
# writing a user catalogue
# --------------------------------------------------------------------------

def _toml_value(v) -> str:
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if not math.isfinite(v):
            raise InputError("value", f"cannot write a non-finite number {v!r}")
        return repr(v)
    if isinstance(v, str):
        return '"' + v.replace("\\", "\\\\").replace('"', '\\"').replace("\n", "\\n") + '"'
    if isinstance(v, list):
        return "[" + ", ".join(_toml_value(x) for x in v) + "]"
    raise InputError("value", f"cannot write {type(v).__name__} to a catalogue")


def dumps_user_catalogue(entries: list[dict], description: str = "User lining catalogue") -> str:
    """TOML text of a user catalogue holding ``entries`` (dicts in the catalogue layout).

    Only the subset of TOML the catalogue uses is written (scalars, lists of
    scalars, one level of tables); the text reads back with ``tomllib``.
    """
    lines = [f"schema_version = {SCHEMA_VERSION}", f"description = {_toml_value(description)}", ""]
    for e in entries:
        lines.append("[[lining]]")
        tables = []
        for k, v in e.items():
            if isinstance(v, dict):
                tables.append((k, v))
            elif v is not None:
                lines.append(f"{k} = {_toml_value(v)}")
        for name, t in tables:
            lines.append(f"[lining.{name}]")
            for k, v in t.items():
                if isinstance(v, dict):
                    raise InputError(f"{name}.{k}", "nested tables deeper than one level are not part of the layout")
                if v is not None:
                    lines.append(f"{k} = {_toml_value(v)}")
        lines.append("")
    return "\n".join(lines)
