"""Where every published value of the method stands: its place in the text and where that text was read.

One entry per constant, table or relation the core uses from a publication.
``place`` is where the value stands in the publication (chapter, section,
equation, table or example number); ``read_in`` is where its text was read
while the program was written (a page address, or a copy and its page). An
entry with no ``read_in`` has not been verified against the publication: it is
printed with that mark wherever it is cited (:func:`cite`) and listed in the
one block :func:`not_verified` feeds on the design sheet and in the window.
The goal is an empty list.

``python -m hydraulics.provenance`` prints the table kept in
``docs/method-values.md`` (a test keeps the two the same).

Publications cited
------------------
HEC-15: Kilgore, R. T. and Cotton, G. K., *Design of Roadside Channels with
Flexible Linings*, Hydraulic Engineering Circular No. 15, 3rd ed.,
FHWA-NHI-05-114, Federal Highway Administration, September 2005.
HEC-22: Brown, S. A. et al., *Urban Drainage Design Manual*, Hydraulic
Engineering Circular No. 22, 3rd ed., FHWA-NHI-10-009, 2009.
Chow (1959): Chow, V. T., *Open-Channel Hydraulics*, McGraw-Hill, 1959.
TR-55: USDA Soil Conservation Service, *Urban Hydrology for Small Watersheds*,
Technical Release 55, 2nd ed., June 1986 (210-VI-TR-55).
NEH Part 630 Ch. 15: USDA NRCS, *National Engineering Handbook* Part 630
Hydrology, Chapter 15, Time of Concentration, 2010.
TxDOT HDM: Texas Department of Transportation, *Hydraulic Design Manual*
(online edition), Chapter 4, Hydrology.
Freeman and Fischenich (2000): Freeman, G. E. and Fischenich, J. C., *Gabions for
Streambank Erosion Control*, U.S. Army Engineer Research and Development Center,
ERDC TN-EMRRP-SR-22, May 2000.
Fischenich (2001): Fischenich, C., *Stability Thresholds for Stream Restoration
Materials*, technical note, May 2001.
Campos et al. (2020): Campos, J. N. B., Studart, T. M. de C., de Souza Filho,
F. de A. and Porto, V. C., "On the rainfall intensity-duration-frequency
curves, partial-area effect and the rational method: theory and the
engineering practice", *Water* 12(10): 2730, 2020.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

__all__ = ["Published", "REGISTER", "READ_IN", "NOT_VERIFIED_MARK", "NOT_VERIFIED_TITLE", "entry", "cite",
           "not_verified", "not_verified_lines", "cited_not_verified", "not_verified_paragraph", "unmarked",
           "markdown_table"]

#: Printed right after a citation whose value has not been read in the publication; the one list
#: headed NOT_VERIFIED_TITLE says what the mark means.
NOT_VERIFIED_MARK = "\u2020"
#: Heading of the one list of such values (sheet and window).
NOT_VERIFIED_TITLE = "Not verified against the circular"

#: Where the text was read: short names used in ``Published.read_in``.
READ_IN = {
    "fhwa-ch2": "FHWA web edition of HEC-15, Chapter 2 (fhwa.dot.gov/engineering/hydraulics/pubs/05114/hec1502.cfm, "
                "archived copy)",
    "fhwa-ch3": "FHWA web edition of HEC-15, Chapter 3 (.../pubs/05114/hec1503.cfm)",
    "fhwa-ch4": "FHWA web edition of HEC-15, Chapter 4 (.../pubs/05114/hec1504.cfm, archived copy)",
    "fhwa-ch5": "FHWA web edition of HEC-15, Chapter 5 (.../pubs/05114/hec1505.cfm, archived copy), its opening "
                "with Table 5.1",
    "fhwa-ch6": "FHWA web edition of HEC-15, Chapter 6 (.../pubs/05114/hec1506.cfm)",
    "fhwa-ch7": "FHWA web edition of HEC-15, Chapter 7 (.../pubs/05114/hec1507.cfm, archived copy)",
    "fhwa-appd": "FHWA web edition of HEC-15, Appendix D (.../pubs/05114/hec15appd.cfm)",
    "restated-2.1.3": "restatement of HEC-15 Section 2.1.3 (plainwater.co, \"Trapezoidal channel Manning's n\", "
                      "plainwater.co/water/trapezoidal-channel-mannings-n)",
    "hec22-ch5": "HEC-22, 3rd ed. (2009), Chapter 5 (pp. 5-1 to 5-18), which gives HEC-15's relations with a "
                 "reference to it, read in a markdown copy of the manual (GitHub SWMMEnablement/SWMM_MD_Documents, "
                 "\"HEC 22 (3rd edition 2009).md\")",
    "hec22-ch3": "HEC-22, 3rd ed. (2009), Chapter 3, pp. 3-4 to 3-21, read in the same markdown copy of the manual",
    "hds6-ch6": "FHWA HDS 6, River Engineering for Highway Encroachments (FHWA NHI 01-004, 2001), Chapter 6, "
                "pp. 6.24, 6.56 and 6.70 (page copy at coastalhydraulicslaboratoryfact.tpub.com/4_010491/)",
    "drms-993768": "Colorado DRMS record, doc 993768, scanned p. 30, riprap sizing by the HEC-11 method, K worked for "
                   "2:1, 3:1 and 10:1 sides (dnrweblink.state.co.us/DRMSSearch/0/doc/993768/Page30.aspx)",
    "tm5-820-4": "U.S. Army TM 5-820-4 / AFM 88-5 Chap. 4, paras. 5-4 and 5-5 (copy in UFC 3-230-17FA, "
                 "buildingcriteria1.tpub.com/ufc_3_230_17fa/ufc_3_230_17fa0038.htm)",
    "erdc-gabions": "Freeman and Fischenich (2000), ERDC TN-EMRRP-SR-22, p. 1 (scribd.com/doc/162856207)",
    "civil-tips-gabions": "civilengineeringtips.net, \"Gabions\" (civilengineeringtips.net/tag/gabions/)",
    "restated-6.2": "restatement of HEC-15 Section 6.2 with its equations in text "
                    "(plainwater.co, \"HEC-15: Permissible Shear Stress\")",
    "tr55-ch3": "TR-55 (1986) Chapter 3, its first page with Eqs. 3-1 and 3-2 (copy at "
                "scribd.com/document/552108752/TR-55-Chapter-3)",
    "tr55-ws3": "TR-55 (1986) Appendix D form 3, Appendix D p. D-3, in scanned filled-in copies kept in Colorado state "
                "records (dnrweblink.state.co.us, e.g. CWCB doc 56927 p. 28 and DRMS doc 570419 p. 32)",
    "neh630-quoted": "NRCS NEH Part 630 Chapter 15 (2010), Eq. 15-9, Table 15-2 and the 100-ft sentences as quoted "
                     "word for word in an eng-tips.com thread (\"TR-55 Sheet Flow limit\", qid=325517)",
    "txdot-hdm": "TxDOT Hydraulic Design Manual, Chapter 4, Sections 11 and 12 (txdot.gov/manuals/des/hyd/"
                 "chapter-4--hydrology/...)",
    "campos-2020": "Campos et al. (2020), Water 12(10): 2730, abstract (mdpi.com/2073-4441/12/10/2730)",
    "ponce-4-2": "V. M. Ponce, Engineering Hydrology (1989), online edition, Chapter 4, Table 4-2 and its key "
                 "(facets.sdsu.edu/enghydro/engineering_hydrology_04_table_4_2_expand.html)",
    "txdot-hdm-7": "TxDOT Hydraulic Design Manual, Chapter 7, Section 6, Standard Step Procedure (txdot.gov/manuals/des/"
                   "hyd/chapter-7--channels/section-6--.../standard-step-procedure.html)",
    "txdot-hdm-8": "TxDOT Hydraulic Design Manual, Chapter 8, Section 3, Direct Step Backwater Method (txdot.gov/manuals/"
                   "des/hyd/chapter-8--culverts/section-3--hydraulic-operation-of-culverts/direct-step-backwater-"
                   "method.html)",
    "tpub-2.8": "standard step equations 2.173 to 2.176 and Fig. 2.30 of a manual's Section 2.8, in the copy at "
                "coastalhydraulicslaboratoryfact.tpub.com/4_010491/4_0104910139.htm",
    "kitsap-f": "Kitsap County (WA) Stormwater Design Manual, Appendix F, F.2.3.2 Direct Step Backwater Method "
                "(dcd.kitsapgov.com/ordnances/stormwater_html_20210902/.../OpenChannelsBackwaterMethod.htm)",
    "irrigation-3.6": "Planning and Evaluation of Irrigation Projects (Elsevier, 2017, ISBN 978-0-12-811856-6), "
                      "Section 3.6, Eq. 3.150 and Table 3.9 (ebookreading.net copy)",
    "altdepth": "altdepth.com, \"conjugate depth\" page: the specific force is preserved in a jump; Belanger's "
                "relation as Chow (1959) Eq. 3-21",
    "momentum-depth": "\"Momentum-depth relationship in a rectangular channel\" (Wikipedia article, wikiless copy): the "
                      "momentum function (specific force) conserved across a hydraulic jump",
    "jump-6y2": "a water-engineering text's section on the hydraulic jump (its Fig. 6.9), in the copy at "
                "climate-policy-watcher.org/drinking-water-2/v-2-y1-y2-lw-1.html",
    "cef-12.17": "Civil Engineering Formulas (McGraw-Hill), p. 323, Fig. 12.17, in the copy at "
                 "digilib.universitaspertamina.ac.id (page 395 of the file)",
    "fhwa-ch3-2008": "FHWA web edition of HEC-15, Chapter 3, its opening (the chapter's introduction and Section 3.1 "
                     "to Eq. 3.1 written out in words), archived copy of 2008 (webarchive.library.unt.edu/eot2008/"
                     "20081109021927/http:/www.fhwa.dot.gov/engineering/hydraulics/pubs/05114/hec1503.cfm)",
    "erdc-thresholds": "Fischenich, C., \"Stability Thresholds for Stream Restoration Materials\", technical note, "
                       "May 2001, its Overview (copy at paperzz.com/doc/8811080/stability-thresholds-for-stream-"
                       "restoration-materials)",
}


@dataclass(frozen=True)
class Published:
    """One published value or relation the core uses."""

    key: str
    what: str        # what it is, in a few words
    value: str       # the value or relation as published (SI, customary in brackets where printed)
    place: str       # publication and its equation, table, section or example number
    read_in: tuple = ()  # keys of READ_IN where the text was read; empty: not verified
    note: str = ""   # how the program uses it, where it differs

    @property
    def verified(self) -> bool:
        return bool(self.read_in)


def _entries(*items: Published) -> dict:
    out = {}
    for item in items:
        if item.key in out:
            raise ValueError(f"provenance: key {item.key!r} given twice")
        unknown = [r for r in item.read_in if r not in READ_IN]
        if unknown:
            raise ValueError(f"provenance: {item.key!r} read in unknown sources {unknown}")
        out[item.key] = item
    return out


REGISTER: dict = _entries(
    # ---------------------------------------------------------------- HEC-15 Chapters 2 and 3
    Published("supercritical_waves", "surface waves and splash in supercritical flow",
              "supercritical flow \"may create surface waves whose height approaches the depth of flow\"; "
              "on very steep grades splash and surge need special freeboard",
              "HEC-15 Section 2.1.1", ("fhwa-ch2",)),
    Published("design_shear", "design shear at the maximum depth", "tau_d = gamma d So, d the maximum depth",
              "HEC-15 Eq. 3.1", ("fhwa-ch3-2008", "restated-6.2", "hec22-ch5"),
              "HEC-15 Section 3.1: \"tau sub d equals gamma times d times S sub o (3.1)\", tau_d the \"shear stress in "
              "channel at maximum depth\"; HEC-22 (2009) gives it as Eq. 5-13, d the maximum depth of flow"),
    Published("stability_criterion", "stability criterion", "tau_p >= SF tau_d", "HEC-15 Eq. 3.2",
              ("restated-6.2", "hec22-ch5"), "HEC-22 (2009) p. 5-14: SF typically ranges from 1.0 to 1.5"),
    Published("gamma_water", "unit weight of water", "9,810 N/m^3 (62.4 lb/ft^3)", "HEC-15 Eq. 6.7",
              ("restated-6.2", "hec22-ch5")),
    Published("gravity", "acceleration of gravity", "9.81 m/s^2 (32.2 ft/s^2)", "HEC-15 Eq. 6.2",
              ("fhwa-ch6",),
              "the program uses the standard 9.80665 m/s^2, 0.03 % apart"),
    Published("side_factor", "ratio of side to bed shear K1", "K1 by side slope Z", "HEC-15 Section 3.2", (),
              "the section number follows the order the chapter's opening states (read, HEC-15 Chapter 3: after 3.1 "
              "straight channels \"side slope stability, composite linings, and bends\", then the two sections on "
              "steep slopes and the maximum discharge); the section itself was not read. HEC-22 (2009) Section 5.1.7 "
              "gives K1 only as its Chart 17, a chart with no relation in the text; the relation the program uses "
              "(0.77 for Z <= 1.5, 0.066 Z + 0.67 between, 1.0 for Z >= 5; continuous at both ends) has not been read"),
    Published("side_stone_size", "stone size on the side slopes",
              "(D50)sides = (K1 / K2) (D50)bottom; with gravel or riprap on sides steeper than 3:1 the side slope "
              "stability based on the angle of repose must be considered", "HEC-22 (2009) Eq. 5-14 and Section 5.1.7",
              ("hec22-ch5",),
              "the relation of HEC-15 Section 6.3.2 as HEC-22 restates it (required_d50_side); the program checks the "
              "sides at every side slope, not only those steeper than 3:1; K1 (Chart 17) and K2 (Chart 18) are charts "
              "in HEC-22 and are cited to HEC-15 on their own (tests/test_hec22_examples.py)"),
    Published("bend_factor", "bend factor Kb", "Kb by Rc/T", "HEC-15 Section 3.4", (),
              "HEC-22 (2009) Eq. 5-15 and Chart 21 read Kb against Rc/B, B the bottom width; the program's Rc/T "
              "(T >= B) gives the larger, safer Kb: 2.0 in HEC-22 Example 5-2 where the chart reads 1.6"),
    Published("bend_length", "length of protection below a bend", "Lp = Ku R^(7/6) / n, Ku 0.736 SI (0.604 CU)",
              "HEC-22 (2009) Eq. 5-16", ("hec22-ch5",),
              "HEC-22 gives it with a reference to HEC-15"),
    Published("boundary_shear_slope", "slope in the mean boundary shear",
              "tau = gamma R S, S the average bed slope or energy slope", "HEC-22 (2009) Eq. 5-12", ("hec22-ch5",),
              "HEC-22 Section 5.1.7: in a uniform flow the shear equals the component of the weight along the "
              "bottom. Inside gradually varied flow the program takes a grass lining's n (grass_n) at the mean "
              "boundary shear with the energy slope of the profile there; in uniform flow it is the bed slope"),
    Published("superelevation", "superelevation of the water surface in a bend",
              "delta d = V^2 T / (g Rc), valid for subcritical flow", "HEC-22 (2009) Eq. 5-11",
              ("hec22-ch5",),
              "HEC-22 puts the outer bank's water delta d / 2 above the centre line; the program adds the whole "
              "delta d to the freeboard (the safer reading)"),
    Published("freeboard", "freeboard of a roadside channel",
              "about 150 mm (0.5 ft) generally adequate; a steep gradient channel: freeboard equal to the flow depth; "
              "temporary channels: none necessary", "HEC-22 (2009) Section 5.2.4", ("hec22-ch5",),
              "the program applies the depth rule where the flow is supercritical (Froude > 1)"),
    Published("steep_slope", "bed slope from which riprap is sized by the steep-slope method",
              "slopes greater than 10 %", "HEC-15 Section 3.5 and Appendix D", (),
              "HEC-22 (2009) Section 5.2.3 says only that riprap suits very steep channels with gradients in excess "
              "of 10 %"),
    Published("side_slope_guidance", "side slopes of a triangular or trapezoidal roadside channel",
              "not steeper than the angle of repose of the soil or lining, generally 1V:3H or flatter; 1V:4H or "
              "flatter where traffic safety may be of concern", "HEC-22 (2009) Section 5.2.2", ("hec22-ch5",),
              "the program cautions where a side is steeper than 1V:3H"),
    # ---------------------------------------------------------------- HEC-15 Chapter 6
    Published("size_classes", "stone sizes the Chapter 6 procedures apply to",
              "gravel 15-64 mm (0.6-2.5 in), cobble 64-130 mm (2.5-5.0 in), riprap 130-550 mm (5.0-22.0 in)",
              "HEC-15 Chapter 6, introduction", ("fhwa-ch6",)),
    Published("blodgett", "Blodgett's roughness relation",
              "n = alpha da^(1/6) / (2.25 + 5.23 log10(da/D50)), alpha 0.319 SI (0.262 CU); "
              "1.5 <= da/D50 <= 185", "HEC-15 Eq. 6.1", ("fhwa-ch6",)),
    Published("bathurst", "Bathurst's roughness relation",
              "n = alpha da^(1/6) / (sqrt(g) f(Fr) f(REG) f(CG)), alpha 1.0 SI (1.49 CU); 0.3 < da/D50 < 8.0",
              "HEC-15 Eq. 6.2", ("fhwa-ch6",)),
    Published("bathurst_terms", "terms of Bathurst's relation", "f(Fr), f(REG), f(CG) and b",
              "HEC-15 Eqs. 6.3 to 6.6", (),
              "read in HEC-15 Section 6.1: the three terms \"represent functions of Froude number, roughness element "
              "geometry, and channel geometry\" (Eqs. 6.3 to 6.5, T the channel top width) and b (Eq. 6.6) \"describes "
              "the relationship between effective roughness concentration and relative submergence of the roughness "
              "bed\"; the four equations are images in every copy read, so the program's expressions are not verified"),
    Published("relation_choice", "which stone roughness relation applies",
              "Eq. 6.1 (Blodgett) \"applicable for the range of conditions where 1.5 <= da/D50 <= 185\"; below the "
              "lower end of this range \"protrusion of individual riprap elements into the flow field significantly "
              "changes the roughness relationship\" and Bathurst's relation (Eq. 6.2, 0.3 < da/D50 < 8.0) \"addresses "
              "these conditions\"",
              "HEC-15 Section 6.1", ("fhwa-ch6",),
              "the program takes Bathurst's n below da/D50 = 1.5 and Blodgett's from 1.5 up, passing from one to the "
              "other over 1.5 to 1.53 (a rule of the program); the sentence that follows in the circular "
              "(\"Equations 6.1 and 6.2 both ...\") is cut off in the copy read, so any further rule for the overlap "
              "1.5 to 8.0 is not read"),
    Published("stone_shear", "permissible shear of stone", "tau_p = F* (gamma_s - gamma) D50", "HEC-15 Eq. 6.7",
              ("restated-6.2",)),
    Published("gamma_stone", "unit weight of stone", "typically 25,900 N/m^3 (165 lb/ft^3); the site value where known",
              "HEC-15 Section 6.2", ("restated-6.2",)),
    Published("stone_size", "smallest stable stone", "D50 >= SF d So / (F* (SG - 1))", "HEC-15 Eq. 6.8",
              ("restated-6.2",)),
    Published("particle_reynolds", "particle Reynolds number",
              "Re = V* D50 / nu, nu = 1.131e-6 m^2/s at 15.5 C (1.217e-5 ft^2/s at 60 F)", "HEC-15 Eq. 6.9",
              ("restated-6.2",)),
    Published("shear_velocity", "shear velocity", "V* = sqrt(g d S)", "HEC-15 Section 6.2, V*"),
    Published("table_6_1", "Shields' parameter F* and safety factor SF by particle Reynolds number",
              "F* 0.047, SF 1.0 for Re <= 4e4; F* 0.15, SF 1.5 for Re >= 2e5; linear between",
              "HEC-15 Table 6.1"),
    Published("tractive_ratio", "tractive force ratio K2 of stone on a side slope",
              "K2 = sqrt(1 - sin^2 theta / sin^2 phi)", "HEC-15 Section 6.3.2", (),
              "HEC-22 (2009) gives K2 only as its Chart 18; the same expression is HEC-11's bank factor K1, worked in a Colorado DRMS record (doc 993768 p. 30: "
              "0.7746, 0.8944, 0.9900 for 2:1, 3:1, 10:1 at 45 degrees; the program agrees, "
              "tests/test_hec15_examples_stone.py); HEC-15's own text not read"),
    Published("angle_of_repose", "angle of repose of riprap", "by size and shape (about 40-42 degrees for riprap)",
              "HEC-15 Figure 6.2", (),
              "Chow's (1959) and Henderson's (1966) tables as quoted in a published report (Witheridge 2009, "
              "Tables 1-2) give at most 41 degrees for angular rock of 100-500 mm and 42 only for very angular rock "
              "over 500 mm: the catalogue's 42 for riprap is at the top of that range"),
    Published("steep_method", "steep-slope stability of riprap", "Eq. D.1 with the Delta term; moment stability "
              "Eqs. D.2 and D.3", "HEC-15 Appendix D", ("fhwa-appd", "hds6-ch6"),
              "the moment-stability factor is checked against HDS 6 (2001) Chapter 6 problems"),
    Published("layer_thickness", "thickness of a stone layer", "the larger of 1.5 D50 and D100",
              "HEC-15 Section 6.4", (),
              "the same rule stands in U.S. Army TM 5-820-4 paras. 5-4 and 5-5; HEC-15's own text not read"),
    Published("filter", "filter beneath stone", "a granular filter or geotextile beneath the stone",
              "HEC-15 Section 6.4"),
    Published("table_2_3_riprap", "smallest riprap size in the table of typical permissible shear",
              "150 mm", "HEC-15 Table 2.3"),
    Published("table_2_3_gravel", "gravel mulch of the table of typical permissible shear",
              "coarse gravel 25 mm: 19 N/m^2", "HEC-15 Table 2.3"),
    # ---------------------------------------------------------------- HEC-15 Chapter 4
    Published("grass_n_varies", "roughness of a grass lining",
              "grass stems bend as flow depth and shear stress increase, so \"a grass-lined channel cannot be "
              "described by a single roughness coefficient\"; the resistance equation is that of Kouwen's model "
              "(Appendix C.2), which \"uses the same vegetation properties as the SCS retardance approach\"",
              "HEC-15 Chapter 4", ("fhwa-ch4",),
              "why the program computes a grass lining's n at each depth from the boundary shear there (grass_n). The "
              "same opening names Table 4.1, retardance classes A (highest resistance to flow) to E (lowest), \"a "
              "function of the height and density of the grass cover\"; the program describes a stand by Cs and stem "
              "height instead and uses no retardance class. Only the chapter's opening is held in the stored copies: "
              "Sections 4.1 to 4.5, their tables and design examples were not reached"),
    Published("grass_n", "Manning's n of grass", "n = alpha Cn tau_o^-0.4", "HEC-15 Section 4.1", (),
              "alpha 1.0 (SI, tau_o in Pa) and 0.213 (CU, lb/ft^2) give the same n for the same Cn (0.213 x "
              "47.88^0.4 = 1.001); the equation itself was not read"),
    Published("grass_cn", "grass roughness coefficient", "Cn = 0.35 Cs^0.10 h^0.528 (SI)", "HEC-15 Section 4.1", (),
              "not read. Since n takes one Cn in both unit systems (grass_n), Cn is the same number in both; with one "
              "Cs for both, the SI constant is the customary one times (1/0.3048)^0.528 = 1.873: 0.35 SI goes with "
              "0.187 CU, and the customary 0.237 that issue 12 names would mean 0.444 SI (Cn and n 27 % higher, the "
              "grass tau_p 61 % higher at the same shear). The program keeps 0.35 until the circular is read"),
    Published("table_4_3", "density-stiffness coefficient Cs by stand condition",
              "excellent 580, very good 290, good 106, fair 24, poor 8.6", "HEC-15 Table 4.3"),
    Published("table_4_5", "cover factor CF by growth form and condition", "0.98 to 0.50", "HEC-15 Table 4.5"),
    Published("grass_shear", "permissible shear of a grass lining",
              "tau_p = tau_p,soil / (1 - CF) (n / ns)^2", "HEC-15 Section 4.2", (),
              "not read. At CF 0.98 (sod, excellent) 1 / (1 - CF) is 50: the shipped excellent sod on fine soil gets "
              "about 1,950 Pa at 0.3 m^3/s on 1 % in a 1 m, 3:1 trapezoid; the program warns above the range "
              "published for vegetated soils (vegetated_shear_range)"),
    Published("vegetated_shear_range", "permissible shear published for vegetated soils",
              "\"vegetated soils (0.5 – 4 lb/sf)\", against \"generally < 0.25 lb/sf\" for \"soils found in channel "
              "beds and banks\" and \"< 13 lb/sf\" for hard armoring",
              "Fischenich (2001), Stability Thresholds for Stream Restoration Materials",
              ("erdc-thresholds",),
              "not part of HEC-15: a plausibility bound; a grass lining's tau_p above 4 lb/ft^2 (192 Pa) is "
              "reported with a warning, the verdict is unchanged"),
    Published("soil_n", "grain roughness of soil", "ns = 0.016 for D75 < 1.3 mm; 0.015 D75^(1/6) above (D75 in mm)",
              "HEC-15 Section 4.3"),
    Published("soil_noncohesive", "permissible shear of non-cohesive soil",
              "1.0 N/m^2 for D75 < 1.3 mm; 0.75 D75 (N/m^2, D75 in mm) from 1.3 to 50 mm", "HEC-15 Section 4.3"),
    Published("cohesive_threshold", "which soils are designed as cohesive",
              "\"non-cohesive soils (plasticity index less than 10)\" erode mainly by particle size; cohesive soils by "
              "cohesive strength and soil density", "HEC-22 (2009) Section 5.3.2", ("hec22-ch5",),
              "HEC-22's summary of HEC-15 Chapter 4; the program takes the cohesive relation from PI 10 up and sends a "
              "less plastic soil to the D75 relation"),
    Published("table_4_6", "permissible shear of cohesive soil",
              "tau_p = (c1 PI^2 + c2 PI + c3)(c4 + c5 e)^2 c6", "HEC-15 Table 4.6"),
    # ---------------------------------------------------------------- HEC-15 Chapters 5 and 7
    Published("recp_types", "classes of rolled erosion control product (RECP)",
              "open-weave textile (e.g. jute net), erosion control blanket (e.g. curled wood mat), turf-reinforcement "
              "mat (TRM, e.g. synthetic mat)", "HEC-15 Table 5.1", ("fhwa-ch5",)),
    Published("recp_n_classes", "Manning's n of each class of RECP (minimum, typical, maximum)",
              "open-weave textile 0.022, 0.025, 0.028; erosion control blanket 0.028, 0.035, 0.045; turf "
              "reinforcement mat 0.024, 0.030, 0.036 (a rough estimate for the class)",
              "HEC-22 (2009) Table 5-1, giving HEC-15 Table 2.1", ("hec22-ch5", "restated-2.1.3"),
              "the rows were read in HEC-22's table, which cites HEC-15 for them; HEC-15 Section 2.1.3 (restated) says "
              "Table 2.1 holds them as a rough estimate and that Chapter 5 has more; the program only checks a "
              "product's data-sheet n against them"),
    Published("recp_soil", "permissible shear of RECP and grass linings",
              "\"these lining types do not have permissible shear stresses independent of soil type\"",
              "HEC-22 (2009) Section 5.3.2, summarising HEC-15", ("hec22-ch5",),
              "HEC-15 Chapter 5's conversion of a product's tested value to the site soil could not be read: the "
              "data-sheet value is used as it is and the sheet says so"),
    Published("gabion_n", "Manning's n of a gabion mattress",
              "the riprap and gravel relations of Section 6.1 with the D50 of the basket rock; the mesh neglected",
              "HEC-15 Section 7.1", ("fhwa-ch7",)),
    Published("mattress_thickness", "usual thickness of a gabion mattress", "0.5 to 1.5 ft (0.15 to 0.46 m)",
              "Freeman and Fischenich (2000), p. 1", ("erdc-gabions",),
              "outside it the program warns; HEC-15's own limits (Section 7.2) could not be read"),
    Published("gabion_fill_size", "largest stone of a gabion fill",
              "\"not greater than 2/3 of the thickness of the basket or mattress\"",
              "civilengineeringtips.net, \"Gabions\" (common practice)", ("civil-tips-gabions",),
              "the program warns where the fill's D50 exceeds 2/3 of the mattress thickness"),
    # ---------------------------------------------------------------- other publications
    Published("rational_area", "largest area for the rational method", "80 ha (200 acres)",
              "HEC-22 (2009) Section 3.2.2, p. 3-5", ("hec22-ch3",)),
    Published("kirpich", "Kirpich's time of concentration", "t_c = 0.0078 L^0.77 S^-0.385 (min, ft, ft/ft)",
              "Kirpich (1940), Civil Engineering 10(6): 362"),
    Published("kirpich_range", "data range of Kirpich's formula", "1.2 to 112 acres, slopes 3 to 10 %",
              "Kirpich (1940)", (), "not in HEC-22 (2009) Chapter 3, pp. 3-4 to 3-21"),
    Published("self_cleaning", "minimum velocity against silting", "2 to 3 ft/s (0.6 to 0.9 m/s)",
              "Chow (1959) Section 7-3"),
    Published("strickler", "Strickler's relation for stone", "n = 0.034 D50^(1/6), D50 in ft",
              "Chow (1959) Chapter 5"),
    Published("composite_n", "composite n of a section with several roughnesses (Horton and Einstein)",
              "n = (sum P_i n_i^1.5 / P)^(2/3)", "Chow (1959) Section 6-6"),
    Published("supercritical_bend", "supercritical flow in bends", "cross waves; superelevation about twice "
              "the subcritical value", "Chow (1959) Chapter 15"),
    # ---------------------------------------------------------------- flow along a run (hydraulics.run_inflow)
    Published("collecting_tc", "time of concentration at a point of a channel that collects several areas",
              "the longest of the times to the point: each area's inlet time plus its flow time down the channel",
              "Ponce (1989) Engineering Hydrology, Table 4-2 and its key; HEC-22 Section 3.2", ("ponce-4-2",),
              "read in Ponce's key and worked table; HEC-22's own wording was not found in a stored copy"),
    Published("partial_area", "partial-area effect", "if the critical rainfall duration is shorter than the time "
              "of concentration, the partial-area effect occurs (a part of the area gives the larger peak)",
              "Campos et al. (2020), Water 12(10): 2730", ("campos-2020",)),
    Published("composite_c", "runoff coefficient of an area of several land covers",
              "C = sum(C_j A_j) / sum(A_j), weighted by area", "HEC-22 (2009) Eq. 3-2", ("hec22-ch3", "txdot-hdm"),
              "also TxDOT Hydraulic Design Manual Ch. 4 Sec. 12, Eq. 4-23; HEC-22 Example 3-1 reproduced in "
              "tests/test_hec22_examples.py"),
    # ---------------------------------------------------------------- rainfall (hydraulics.rainfall)
    Published("idf_formula", "fitted IDF relation", "I = b / (tc + d)^e, I in in./hr, tc in min; e, b, d coefficients "
              "based on rainfall IDF data (the program writes i = a / (t + b)^c)",
              "TxDOT Hydraulic Design Manual Ch. 4 Sec. 12, Eq. 4-21", ("txdot-hdm", "campos-2020"),
              "Campos et al. (2020) state the same form, i = a / (b + td)^c"),
    Published("idf_depth_consistency", "rainfall depth of an IDF relation",
              "for i = a / (b + td)^c with c > 1 the depth i td is largest at td = b / (c - 1) (an inconsistent "
              "IDF equation)", "Campos et al. (2020), Water 12(10): 2730", ("campos-2020",),
              "the program warns where a table's or formula's depth falls as the duration grows"),
    # ---------------------------------------------------------------- NRCS TR-55 (hydraulics.travel_time)
    Published("tr55_travel_time", "travel time of a flow segment and time of concentration",
              "Tt = L / (3600 V) (Tt in hr, L in ft, V in ft/s); Tc = Tt1 + Tt2 + ... + Ttm",
              "TR-55 (1986) Eqs. 3-1 and 3-2", ("tr55-ch3",)),
    Published("tr55_sheet_flow", "travel time of sheet flow (Manning's kinematic solution)",
              "Tt = 0.007 (n L)^0.8 / (P2^0.5 s^0.4), Tt in hr, L in ft, P2 (2-year 24-hour rainfall) in in, "
              "s in ft/ft", "TR-55 (1986) Chapter 3 sheet-flow equation and Appendix D form 3, line 6", ("tr55-ws3",),
              "the equation read on the form; its number in Chapter 3 (Eq. 3-3) was not read"),
    Published("tr55_sheet_length", "longest sheet flow of TR-55 (1986)", "flow length, L (total L < 300 ft)",
              "TR-55 (1986) Appendix D form 3, line 3", ("tr55-ws3",)),
    Published("neh630_sheet_length", "later NRCS limits on sheet flow",
              "\"Typically, sheet flow occurs for no more than 100 feet before transitioning to shallow concentrated "
              "flow\"; McCuen-Spiess limit L = 100 S^0.5 / n (L in ft)", "NRCS NEH Part 630 Ch. 15 (2010), Eq. 15-9",
              ("neh630-quoted",)),
    Published("tr55_shallow_velocity", "average velocity of shallow concentrated flow",
              "unpaved V = 16.1345 s^0.5, paved V = 20.3282 s^0.5 (V in ft/s, s in ft/ft)",
              "TR-55 (1986) Figure 3-1 and Appendix F", (),
              "the equations behind Figure 3-1 were not found in a stored copy of TR-55; the tests compare them "
              "with the velocity-slope coefficients of the SLO Creek Drainage Design Manual (2003), Table 4-2"),
    # ---------------------------------------------------------------- water surface along a run (hydraulics.water_surface)
    Published("gvf_energy", "energy equation between two sections (standard step method)",
              "H1 + So dL = H2 + Sf dL, H = y + V^2/(2g) above the bed; subcritical profiles start at the most "
              "downstream section", "TxDOT Hydraulic Design Manual Ch. 7 Sec. 6 (Standard Step Procedure)",
              ("txdot-hdm-7", "tpub-2.8")),
    Published("gvf_friction_slope", "friction slope of gradually varied flow",
              "Sf = n^2 V^2 / (2.21 R^1.33) (US units; Manning's equation with the energy slope)",
              "Kitsap County Stormwater Design Manual App. F, F.2.3.2", ("kitsap-f",)),
    Published("gvf_sf_average", "friction slope over a step", "the mean of the two sections' friction slopes",
              "Chow (1959) Chapter 10", (),
              "the program's choice (the trapezoidal rule for the friction loss); no stored text stating it was read"),
    Published("gvf_equation", "differential equation of gradually varied flow",
              "dh/dx = (S0 - Sf) / (1 - T Q^2 / (g A^3))", "Planning and Evaluation of Irrigation Projects (2017) "
              "Eq. 3.150", ("irrigation-3.6",)),
    Published("gvf_profiles", "classification of water-surface profiles",
              "M1 M2 M3, S1 S2 S3, C1 C3, H2 H3, A2 A3 by the depth against normal and critical depth",
              "Planning and Evaluation of Irrigation Projects (2017) Table 3.9", ("irrigation-3.6",)),
    Published("gvf_controls", "where a profile computation starts",
              "mild slope: at the outlet, the higher of critical depth and tailwater, upstream; steep slope with "
              "tailwater below critical depth: critical depth at the entrance, downstream",
              "TxDOT Hydraulic Design Manual Ch. 8 Sec. 3 (Direct Step Backwater Method)", ("txdot-hdm-8",)),
    Published("specific_force", "specific force (momentum function) preserved across a hydraulic jump",
              "M = Q^2/(gA) + A y_bar, equal on both sides of a jump",
              "momentum function of open-channel flow (Wikipedia, Momentum-depth relationship in a rectangular "
              "channel)", ("momentum-depth", "altdepth"),
              "A y_bar of every section from hydraulics.sections.Section.first_moment"),
    Published("jump_rectangle", "sequent depths of a jump in a rectangular channel",
              "y2/y1 = (sqrt(1 + 8 Fr1^2) - 1) / 2", "Chow (1959) Eq. 3-21", ("altdepth",),
              "read as restated (Belanger's form), not in Chow's text"),
    Published("jump_length", "length of a hydraulic jump",
              "L = 6 y2 for 4 < Fr1 < 20, somewhat less outside; for practical purposes 6 y2",
              "water-engineering text, hydraulic jump section (Fig. 6.9)", ("jump-6y2",),
              "the text's title was not shown in the copy read"),
    Published("jump_kinds", "kinds of hydraulic jump by Froude number",
              "undular 1-1.7, weak 1.7-2.5, oscillating 2.5-4.5, steady 4.5-9.0, strong above 9.0",
              "Civil Engineering Formulas (McGraw-Hill) Fig. 12.17", ("cef-12.17",)),
)


def entry(key: str) -> Published:
    """The register entry ``key`` (KeyError naming the key when it is not there)."""
    try:
        return REGISTER[key]
    except KeyError:
        raise KeyError(f"no published value {key!r} in hydraulics.provenance.REGISTER") from None


def cite(key: str) -> str:
    """The place of ``key`` ("HEC-15 Eq. 6.1"), marked when its text has not been read."""
    item = entry(key)
    return item.place if item.verified else f"{item.place}{NOT_VERIFIED_MARK}"


def not_verified(keys=None) -> list:
    """Entries (of ``keys``, default all) whose value has not been read in the publication, in register order."""
    wanted = REGISTER if keys is None else set(keys)
    return [item for key, item in REGISTER.items() if key in wanted and not item.verified]


def not_verified_lines(keys=None) -> list:
    """The list as printed: "HEC-15 Table 6.1†: Shields' parameter ... (F* 0.047, ...)"."""
    return [f"{cite(item.key)}: {item.what} ({item.value})" for item in not_verified(keys)]


def not_verified_paragraph(keys, values: bool = True) -> str:
    """The list of ``keys`` (from :func:`cited_not_verified`) as one paragraph, "" when none.

    With ``values`` each entry carries what it is and the value the program
    uses (the window's details); without, only the places, once each, which is
    what a full sheet has room for (its source lines say what each place gave).
    """
    items = not_verified(keys)
    if not items:
        return ""
    if values:
        parts = [f"{cite(i.key)} {i.what} ({i.value})" for i in items]
    else:
        parts = list(dict.fromkeys(cite(i.key) for i in items))
    return (f"{NOT_VERIFIED_MARK} {NOT_VERIFIED_TITLE} (recalled, not yet read in the publication; check each "
            "before relying on this result): " + "; ".join(parts) + ".")


def cited_not_verified(texts) -> list:
    """Keys of the not-verified entries whose citation (:func:`cite`) stands in any of ``texts``.

    Every printed citation goes through :func:`cite`, so the texts a front
    end prints tell which unread values a result leans on. Entries sharing one
    place are all listed (the list errs on the side of saying more).
    """
    joined = "\n".join(str(t) for t in texts)
    return [item.key for item in not_verified() if cite(item.key) in joined]


def unmarked(text: str) -> list:
    """Places of not-verified entries that ``text`` cites without the mark (a test of every printed text).

    A place followed by more of a number ("HEC-15 Section 2" in "HEC-15
    Section 2.1.1") is another place and is not counted.
    """
    out = []
    for item in not_verified():
        if item.place not in out and re.search(re.escape(item.place) + r"(?!\.?\d|" + NOT_VERIFIED_MARK + ")", text):
            out.append(item.place)
    return out


def _cell(text: str) -> str:
    return text.replace("|", "\\|")


def markdown_table() -> str:
    """The register as the markdown page ``docs/method-values.md``."""
    lines = ["# Published values the method uses",
             "",
             "Generated by `python -m hydraulics.provenance > docs/method-values.md` from "
             "`hydraulics/provenance.py`; do not edit by hand. A value with nothing under \"read in\" has not "
             "been verified against its publication: the program marks it wherever it is printed and lists it "
             f"under \"{NOT_VERIFIED_TITLE}\" on the sheet and in the window.",
             "",
             "| key | what | value as published | place | read in | note |",
             "|---|---|---|---|---|---|"]
    for item in REGISTER.values():
        read = "; ".join(READ_IN[r] for r in item.read_in) or "**not verified**"
        lines.append("| " + " | ".join(_cell(t) for t in (item.key, item.what, item.value, item.place, read,
                                                           item.note)) + " |")
    lines += ["", f"{len(not_verified())} of {len(REGISTER)} not verified.", ""]
    return "\n".join(lines)


if __name__ == "__main__":  # pragma: no cover - the docs page
    print(markdown_table(), end="")
