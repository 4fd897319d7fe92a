"""GeoPackage inventories: a layer of line features read in blocks, and the results written as a layer.

A GeoPackage inventory is a layer of lines (LineString or MultiLineString) whose attribute columns are those of
the CSV inventory (:data:`~app.inventory.reading.INPUT_COLUMNS`, other columns carried through). GDAL reads and
writes the file (through pyogrio's Arrow interface); nothing here knows the format itself.

Each block of features becomes the same :class:`~app.inventory.reading.Inventory` a CSV block does: its attribute
columns are written as CSV text (pyarrow's CSV writer) and read by :func:`~app.inventory.reading.parse_inventory`,
so a layer's rows are screened, numbered and checked exactly as the same rows in a CSV file. The block keeps its
features (attributes as stored, geometry as WKB) in :attr:`Inventory.features` for the results layer and the map.
A row's "line" is its feature id.

Lengths: a layer without a ``length`` column gets one, each reach's length measured on its geometry with shapely
(in plan: x and y only) in the layer's own coordinate system and given in the inventory's units. That needs a projected system: one in
degrees is refused for lengths (a layer with its own ``length`` column is read whatever its system).
"""

from __future__ import annotations

import io
import json
import math
import os
import tempfile
import warnings
from contextlib import contextmanager
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from hydraulics import units as hu

from ..files import remove_stale_temporaries, write_target
from .reading import RESULT_COLUMNS, InventoryError, csv_fields, csv_line, parse_inventory

SUFFIX = ".gpkg"
#: The attribute holding a reach's length (in the inventory's units); measured on the geometry where missing.
LENGTH_COLUMN = "length"
#: Geometry types an inventory layer may have (GDAL's names; Z, M and ZM variants too).
LINE_TYPES = ("LineString", "MultiLineString")


#: Features a block of a GeoPackage inventory holds at most: a block holds its features three times over (the
#: layer's table with its geometry, its rows as CSV text, the parsed rows), so blocks four times smaller than a
#: CSV file's keep the peak memory of a batch near the CSV path's (measured: 341 MB for 700,000 reaches in blocks
#: of 25,000, 591 MB in blocks of 100,000, equally fast).
BLOCK_FEATURES = 25_000


def is_geopackage(path) -> bool:
    """Whether ``path`` names a GeoPackage (by its suffix, as GDAL chooses its driver)."""
    return Path(path).suffix.lower() == SUFFIX


@dataclass
class Layer:
    """A layer of a GeoPackage inventory: what its results layer keeps of it."""

    name: str
    crs: str | None             # as GDAL names it (e.g. "EPSG:32633", or WKT), written back unchanged
    geometry_type: str
    geometry_name: str
    features: int               # how many (for the progress bar)
    bounds: tuple | None        # (xmin, ymin, xmax, ymax) in the layer's coordinates
    metres_per_unit: float | None   # of the coordinates; None: geographic or unknown (no lengths measured)
    projected: bool
    unit_name: str = ""             # of the coordinates, as the coordinate system names it ("metre", "US survey foot")
    measured_length: bool = False   # the layer had no length column: each reach's length was measured on its line


def _modules():
    import pyogrio
    import pyogrio.errors

    return pyogrio


def _gdal_errors(pyogrio) -> tuple:
    """What pyogrio raises where GDAL cannot read or write a file (RuntimeError subclasses)."""
    return pyogrio.errors.DataSourceError, pyogrio.errors.DataLayerError


def layer_names(path) -> list:
    """The names of the layers of the GeoPackage at ``path`` (InventoryError where it cannot be read)."""
    pyogrio = _modules()
    path = Path(path)
    if not path.is_file():
        raise InventoryError(f"cannot read {path}: no such file")
    try:
        return [str(name) for name, _ in pyogrio.list_layers(path)]
    except _gdal_errors(pyogrio) as exc:
        raise InventoryError(f"cannot read {path} as a GeoPackage: {_first_line(exc)}") from None


def _first_line(exc) -> str:
    return (str(exc).strip().splitlines() or [type(exc).__name__])[0]


def _crs_of(schema, geometry_name) -> dict | None:
    """The layer's coordinate system as PROJJSON (a dict), from the GeoArrow metadata of its geometry column.

    GDAL writes the system there as PROJJSON (a JSON document, read with the json module); its ``type`` says
    whether it is projected or geographic and its first axis's ``unit`` what a coordinate measures. No CRS
    text format is read by hand.
    """
    try:
        meta = schema.field(geometry_name).metadata or {}
        crs = json.loads(meta.get(b"ARROW:extension:metadata", b"{}")).get("crs")
    except (KeyError, ValueError, AttributeError):
        return None
    if isinstance(crs, str):
        try:
            crs = json.loads(crs)
        except ValueError:
            return None
    return crs if isinstance(crs, dict) else None


def _metres_per_unit(crs: dict | None) -> tuple[bool, float | None, str]:
    """(projected, metres per coordinate unit, the unit's name) of a PROJJSON system; None where lengths cannot be
    measured."""
    if crs is None:
        return False, None, ""
    if crs.get("type") == "CompoundCRS":     # horizontal system first, then the vertical one
        crs = (crs.get("components") or [{}])[0]
    try:
        unit = crs["coordinate_system"]["axis"][0]["unit"]
    except (KeyError, IndexError, TypeError):
        unit = ""
    name = unit if isinstance(unit, str) else str(unit.get("name", "")) if isinstance(unit, dict) else ""
    if crs.get("type") != "ProjectedCRS":
        return False, None, name
    if unit == "metre":     # PROJJSON writes the metre by name only
        return True, 1.0, name
    if isinstance(unit, dict) and unit.get("type") == "LinearUnit":
        factor = unit.get("conversion_factor")
        if isinstance(factor, (int, float)) and math.isfinite(factor) and factor > 0:
            return True, float(factor), name
    return True, None, name


def _choose_layer(path, layer: str | None) -> str:
    names = layer_names(path)
    if layer is not None:
        if layer not in names:
            raise InventoryError(f"{path}: no layer {layer!r}; the file has {_listed(names)}")
        return layer
    if len(names) == 1:
        return names[0]
    if not names:
        raise InventoryError(f"{path}: the GeoPackage has no layer")
    raise InventoryError(f"{path}: the GeoPackage has {len(names)} layers ({_listed(names)}); choose one with --layer")


def _listed(names) -> str:
    return ", ".join(repr(n) for n in names) if names else "no layer"


def read_layer_blocks(path, units: str = "us", rows: int = 100_000, layer: str | None = None):
    """The line features of ``layer`` (default: the file's only layer) of the GeoPackage at ``path`` as
    consecutive :class:`~app.inventory.reading.Inventory` blocks of ``rows`` features at most, in the layer's
    order; each block has ``features`` (a pyarrow Table: the attributes as stored, the measured ``length`` where
    the layer has none, the geometry as WKB) and ``layer`` (a :class:`Layer`); ``end`` counts the features read.

    Raises InventoryError, before the first block, for a file that cannot be read, a layer that is not one of
    lines, a missing column (see :func:`~app.inventory.reading.parse_inventory`) or a layer in degrees without a
    ``length`` column; InputError for unknown units.
    """
    import pyarrow as pa
    import shapely

    pyogrio = _modules()
    system = hu.system(units)
    path = Path(path)
    name = _choose_layer(path, layer)
    source = str(path)
    try:
        info = pyogrio.read_info(path, layer=name)
    except _gdal_errors(pyogrio) as exc:
        raise InventoryError(f"cannot read {path}: {_first_line(exc)}") from None
    kind = info.get("geometry_type")
    if kind is None or kind.split(" ")[0] not in LINE_TYPES:    # pyogrio's names: "LineString", "LineString Z"
        kind = f"{kind} geometry" if kind else "no geometry"
        raise InventoryError(f"{path}: layer {name!r} holds {kind}, not lines; an inventory layer holds each reach "
                             f"as a {' or a '.join(LINE_TYPES)}")
    fields = [str(f) for f in info["fields"]]
    measure = LENGTH_COLUMN not in fields
    try:
        with pyogrio.open_arrow(path, layer=name, batch_size=rows, return_fids=True, use_pyarrow=True) as (meta, reader):
            geometry = meta["geometry_name"] or "wkb_geometry"
            fid = meta.get("fid_column") or "fid"
            projected, factor, unit_name = _metres_per_unit(_crs_of(reader.schema, geometry))
            found = Layer(name=name, crs=info.get("crs"), geometry_type=kind, geometry_name=geometry,
                          features=int(info.get("features") or 0), bounds=info.get("total_bounds"),
                          metres_per_unit=factor, projected=projected, unit_name=unit_name,
                          measured_length=measure)
            if measure and factor is None:
                where = ("its coordinates are in degrees (a geographic system, " + str(found.crs) + ")"
                         if not projected and found.crs else
                         "it has no coordinate system" if not found.crs else
                         f"the unit of its coordinate system ({found.crs}) is not a length")
                raise InventoryError(f"{path}: layer {name!r} has no '{LENGTH_COLUMN}' column and the lengths cannot "
                                     f"be measured on its lines: {where}; reproject it to a projected system in "
                                     f"metres or feet, or add a '{LENGTH_COLUMN}' column")
            done, header, first = 0, None, True
            for batch in _batches(pa, reader, path):
                table = pa.Table.from_batches([batch])
                if fid in table.column_names:
                    fids = table.column(fid).to_numpy()
                    table = table.drop_columns([fid])
                else:
                    fids = np.arange(done + 1, done + len(table) + 1)
                attributes = table.drop_columns([geometry])
                if measure:
                    lengths = shapely.length(lines_of(table.column(geometry)))
                    lengths = system.from_si("length", lengths * factor)
                    length = pa.array(np.round(lengths, 3), mask=~np.isfinite(lengths))
                    attributes = attributes.append_column(LENGTH_COLUMN, length)
                    table = table.append_column(LENGTH_COLUMN, length)
                if header is None:
                    header = csv_line(attributes.column_names)
                body = _csv_body(pa, attributes, source, fids)
                block = parse_inventory(header + "\n" + body, units, source=source)
                block.lines = np.asarray(fids, dtype=np.int64)
                block.features, block.layer = table, found
                done += len(table)
                block.end = done
                first = False
                yield block
            if first:   # no feature: the header alone, so that a missing column is still named
                header = csv_line(fields + ([LENGTH_COLUMN] if measure else []))
                parse_inventory(header + "\n", units, source=source)
                raise InventoryError(f"{path}: layer {name!r} has no features")
    except _gdal_errors(pyogrio) as exc:
        raise InventoryError(f"cannot read {path}: {_first_line(exc)}") from None


def lines_of(column):
    """The geometries of a WKB column as shapely objects; one that cannot be read (damaged) is None (no length)."""
    import shapely

    return shapely.from_wkb(column.to_numpy(zero_copy_only=False), on_invalid="ignore")


def _batches(pa, reader, path):
    """The record batches of ``reader``; a file found damaged on the way is refused in one line."""
    while True:
        try:
            batch = reader.read_next_batch()
        except StopIteration:
            return
        except (OSError, pa.ArrowException) as exc:   # e.g. "database disk image is malformed"
            raise InventoryError(f"cannot read {path}: {_first_line(exc)}") from None
        yield batch


def _csv_body(pa, attributes, source, fids) -> str:
    """The rows of ``attributes`` (features ``fids``) as CSV text (no header), quoted only where a value needs it."""
    import pyarrow.csv as pacsv

    out = io.BytesIO()
    try:
        try:   # the usual layer: no value holds a comma, a quote or a line end, so nothing is quoted
            pacsv.write_csv(attributes, out, pacsv.WriteOptions(include_header=False, quoting_style="none"))
        except pa.ArrowInvalid:
            out = io.BytesIO()
            pacsv.write_csv(attributes, out, pacsv.WriteOptions(include_header=False, quoting_style="needed"))
    except pa.ArrowNotImplementedError as exc:
        raise InventoryError(f"{source}: an attribute column cannot be read as text ({_first_line(exc)})") from None
    data = out.getvalue()
    try:
        return data.decode("utf-8")
    except UnicodeDecodeError as exc:   # GDAL passes on text a damaged file holds as it finds it
        row = data.count(b"\n", 0, exc.start)
        raise InventoryError(f"{source}: feature {fids[row]}: text that is not UTF-8 (byte 0x{data[exc.start]:02x}); "
                             "a GeoPackage holds its text as UTF-8") from None


# ----------------------------------------------------------------------------- writing

@contextmanager
def layer_stream(path, layer: Layer | None, name: str):
    """The results GeoPackage at ``path`` written block by block: yields ``add(inventory, result)``, like
    :func:`app.inventory.writing.results_stream`.

    The layer ``name`` holds each input row's features (attributes as stored, geometry and coordinate system of
    ``layer``; a CSV inventory's columns as text, no geometry) with the result columns added: the numbers in the
    inventory's units, the verdict and the reason. GDAL writes it into a temporary file beside ``path``, which
    replaces ``path`` only when every block is written; otherwise the old file stays as it was.
    """
    import pyarrow as pa
    import pyogrio

    from .writing import display_values

    path = write_target(path)
    remove_stale_temporaries(path.parent, path.name)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.{os.getpid()}.", suffix=".tmp", dir=path.parent)
    os.close(fd)
    os.unlink(tmp)      # GDAL creates the file itself
    written = False

    def add(inventory, result):
        nonlocal written
        if inventory.features is not None:
            table = inventory.features
        else:
            rows = [csv_fields(r) for r in inventory.rows]
            table = pa.table({n: pa.array([r[j] if j < len(r) else "" for r in rows], type=pa.string())
                              for j, n in enumerate(inventory.header)})
        values = display_values(inventory, result)
        for column in RESULT_COLUMNS:
            if column in values:
                data = pa.array(values[column], mask=np.isnan(values[column]))
            else:
                data = pa.array(getattr(result, column).astype(str).tolist(), type=pa.string())
            table = table.append_column(column, data)
        options = {}
        if layer is not None:
            options = dict(geometry_name=layer.geometry_name, geometry_type=layer.geometry_type, crs=layer.crs)
        with warnings.catch_warnings():   # GDAL's note that the temporary file's name does not end in .gpkg
            warnings.filterwarnings("ignore", message=".*extension", category=RuntimeWarning)
            try:
                pyogrio.write_arrow(table, tmp, layer=name, driver="GPKG", append=written, **options)
            except _gdal_errors(pyogrio) as exc:   # a full disk, a folder not writable: said as for a CSV file
                raise OSError(f"GDAL: {_first_line(exc)}") from None
        written = True

    try:
        yield add
        if not written:
            raise InventoryError(f"{path}: nothing to write (the inventory has no rows)")
        with open(tmp, "rb+") as fh:
            os.fsync(fh.fileno())
        os.replace(tmp, path)
    except BaseException:
        for leftover in (tmp, tmp + "-journal", tmp + "-wal", tmp + "-shm"):
            try:
                os.unlink(leftover)
            except FileNotFoundError:
                pass
        raise
