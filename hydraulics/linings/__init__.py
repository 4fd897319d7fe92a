"""Channel linings: the catalogue, depth-dependent roughness and the HEC-15 relations.

Pure core (numpy, scipy, standard library). The relations are those of FHWA
HEC-15, *Design of Roadside Channels with Flexible Linings* (Kilgore and
Cotton, 3rd ed., 2005, FHWA-NHI-05-114); see :mod:`hydraulics.linings.hec15`
and :mod:`hydraulics.provenance` for where each value stands in the text and
which have not yet been verified against it.

    import hydraulics as hy
    from hydraulics.linings import load_catalogue
    cat = load_catalogue()
    gravel = cat.get("gravel")
    y = hy.normal_depth(hy.Trapezoid(bottom_width=0.4, side_slope=3), 0.42, 0.008, n=gravel.roughness())
"""

from . import hec15
from .catalogue import (CATEGORIES, SCHEMA_VERSION, Catalogue, CatalogueError, Lining, dumps_user_catalogue,
                        load_catalogue, parse_catalogue, read_catalogue_file, shipped_catalogue_path)
from .hec15 import ValidityWarning
from .roughness import STONE_METHODS, StoneRoughness, VegetationRoughness

__all__ = [
    "hec15", "CATEGORIES", "SCHEMA_VERSION", "Catalogue", "CatalogueError", "Lining", "dumps_user_catalogue",
    "load_catalogue", "parse_catalogue", "read_catalogue_file", "shipped_catalogue_path", "ValidityWarning",
    "STONE_METHODS", "StoneRoughness", "VegetationRoughness",
]
