"""What a lining check rests on, in words: the relation that gave Manning's n and the permissible-shear method.

Kilgore, R. T. and Cotton, G. K., *Design of Roadside Channels with Flexible Linings*, HEC-15, 3rd ed.,
FHWA-NHI-05-114, 2005 ("HEC-15"): stone n by Blodgett's and Bathurst's relations (Eqs. 6.1, 6.2), grass n and
permissible shear (Chapter 4), rolled products (Chapter 5), stone (Chapter 6, Appendix D for steep slopes),
gabion mattresses (Chapter 7). :func:`hydraulics.stability.check_lining` puts these sentences in a result's
``n_source`` and ``notes``; quantities are made in SI and restate themselves in the user's units
(:func:`hydraulics.wording.worded`).
"""

from __future__ import annotations

from .linings import hec15
from .linings.catalogue import Lining
from .provenance import cite
from .wording import worded

__all__ = ["STEEP_SLOPE_SOURCE", "RIGID_NOTE", "FILTER_NOTE", "roughness_words", "method_notes"]

STEEP_SLOPE_SOURCE = (f"{cite('steep_slope')}: riprap on slopes steeper than "
                      f"{100 * hec15.STEEP_SLOPE:g} % is sized by the steep-slope (safety factor) method")
RIGID_NOTE = ("rigid lining treated as non-erodible (common practice: the permissible-shear method of HEC-15 is "
              "written for flexible linings); joints, uplift, abrasion by bed load and velocity limits are left "
              "to local practice")
FILTER_NOTE = ("place a granular filter or a geotextile beneath the stone unless the subgrade is graded to retain "
               f"itself against the stone ({cite('filter')}; common practice)")

_RELATION_WORDS = {
    "blodgett": "Blodgett's relation, HEC-15 Eq. 6.1",
    "bathurst": "Bathurst's relation, HEC-15 Eq. 6.2",
    "held": "Bathurst's relation held at its lowest usable depth (a rule of this program; see the warnings)",
    "transition": "between Bathurst's and Blodgett's relations at da/D50 = 1.5 (a rule of this program; see the "
                  "warnings)",
    "strickler": f"Strickler's relation n = 0.034 D50^(1/6), D50 in ft ({cite('strickler')})",
}


def roughness_words(lining: Lining, relation: str) -> str:
    """The relation that gave the lining's Manning's n (a ``StabilityResult.n_relation``), in words with its
    source."""
    src = lining.roughness_data.get("source", "")
    if relation in _RELATION_WORDS and lining.category == "gabion":
        return f"{_RELATION_WORDS[relation]}, with the D50 of the mattress's rock fill ({cite('gabion_n')})"
    if relation in _RELATION_WORDS:
        return _RELATION_WORDS[relation]
    if relation == "vegetation":
        return f"grass, n = Cn (gamma R S)^-0.4 ({src})"
    if relation == "soil":
        return f"soil grain roughness ns ({src})"
    return f"constant n ({src})"


def method_notes(lining: Lining, method: str, s: float, n_used: float, tau_p: float | None) -> list:
    """What the lining's permissible-shear method rests on, in words: ``method`` as in the catalogue
    (``permissible_data["method"]``), ``s`` the slope [m/m], ``n_used`` Manning's n at the design flow [-], ``tau_p``
    the permissible shear [Pa] (None for a rigid lining)."""
    source = lining.permissible_data.get("source", "")
    if method == "none":
        return [RIGID_NOTE]
    if method == "shields":
        steep = ([f"slope {s:g} is steeper than {hec15.STEEP_SLOPE:g}: the side slopes are checked by the "
                  f"steep-slope method ({STEEP_SLOPE_SOURCE})"] if s > hec15.STEEP_SLOPE else [])
        return steep + [FILTER_NOTE]
    if method == "vegetation":
        return [worded("grass on soil: soil permissible shear {tau_s}, cover factor {cf}, soil grain n {ns}, "
                       "lining n {n} ({source})", tau_s=(float(lining.soil_permissible_shear()), "shear"),
                       cf=f"{float(lining.cover_factor()):g}", ns=f"{float(lining.soil_grain_n()):.3g}",
                       n=f"{n_used:.3g}", source=source)]
    if method == "gabion":
        return [_gabion_note(lining, tau_p, source)]
    if method == "value" and lining.category == "manufactured":
        return _product_notes(lining, n_used, tau_p, source)
    if method == "value" and lining.user_data:
        return [worded("permissible shear {tau_p} and n are user data ({source})", tau_p=(tau_p, "shear"),
                       source=source)]
    return []


def _gabion_note(lining, tau_p, source) -> str:
    """What a gabion mattress's check rests on: n from its fill (HEC-15 Section 7.1), the designer's tau_p."""
    d50, thickness = lining.gabion_mattress()
    return worded("gabion mattress {t} thick with rock fill of D50 {d}: Manning's n from the fill ({n_src}); "
                  "permissible shear {tau_p} as entered ({source}); HEC-15 Section 7.2's relation of the rock size "
                  "and the mattress thickness is not built into this program, so check the value against it; the "
                  "side slopes are checked against K1 times the bed shear, like the bed",
                  t=(thickness, "small_length"), d=(d50, "small_length"), n_src=cite("gabion_n"),
                  tau_p=(tau_p, "shear"), source=source)


def _product_notes(lining, n_used, tau_p, source) -> list:
    """A rolled product's data-sheet values: its n against its class (HEC-15 Table 2.1), its tau_p and the soil."""
    if lining.product_class is not None and lining.roughness_data.get("model") == "constant":
        hec15.recp_data_sheet_n(n_used, lining.product_class)     # a ValidityWarning when outside its class
    return [worded("permissible shear {tau_p} and n are the product's data-sheet values ({source}); they hold for "
                   "the soil and the vegetation the product was tested with: rolled products have no permissible "
                   "shear independent of the soil ({soil}), and HEC-15 Chapter 5's conversion to the site soil is "
                   "not built into this program", tau_p=(tau_p, "shear"), source=source, soil=cite("recp_soil"))]
