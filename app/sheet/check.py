"""What the sheet prints for one channel with one lining: the hydraulics and, when it exists, the lining check.

:func:`lining_check` is the single place where the sheet asks for the
lining's stability (HEC-15 permissible shear). While the program has no
lining check it returns None and the sheet prints the hydraulic results with
the Manning's n typed in the project, and says that stability was not checked.
Everything else on the sheet reads a :class:`LiningCheck`, so the stability
block, the freeboard, the lining thickness on the section drawing and the
lining comparison fill in as soon as that function returns one.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import hydraulics as hy


@dataclass
class ShearCheck:
    """Design shear against permissible shear at one place on the boundary [Pa]."""

    where: str            # "bed", "sides", "bends"
    design: float         # design shear [Pa]
    permissible: float    # permissible shear [Pa]
    relation: str = ""    # how the design shear was found, e.g. "K1 tau_d, K1 = 0.77"

    @property
    def safety_factor(self) -> float:
        return self.permissible / self.design if self.design > 0 else float("inf")


@dataclass
class LiningCheck:
    """A lining's stability for one channel: what the sheet's stability block prints (SI)."""

    lining_name: str
    source: str                       # where the lining's n and permissible shear come from
    roughness: object                 # float n or an object with .manning_n(section, depth, slope)
    n_relation: str                   # how n was found, e.g. "Blodgett, D50 = 150 mm"
    shears: list                      # ShearCheck list (bed, sides, bends where they apply)
    required_safety_factor: float     # the SF the design must reach [-]
    stable: bool
    reason: str                       # one line: why it passes or fails
    freeboard: float                  # design freeboard [m]
    freeboard_basis: str              # e.g. "HEC-15 minimum 0.15 m" or "project minimum"
    thickness: float | None = None    # lining layer thickness [m], None when it has none (bare soil, grass)
    cost_per_length: float | None = None  # user's unit cost per metre of channel, when priced
    warnings: list = field(default_factory=list)

    @property
    def safety_factor(self) -> float:
        """The governing (smallest) permissible / design ratio."""
        return min(s.safety_factor for s in self.shears) if self.shears else float("inf")


@dataclass
class Evaluation:
    """One channel with one lining: uniform flow and, when available, the lining check."""

    result: hy.ChannelResult
    roughness: object                  # the n given to the solver: float or a depth-dependent model
    n_basis: str                       # how the n used was obtained, in words
    check: LiningCheck | None
    freeboard: float                   # [m]
    freeboard_basis: str

    @property
    def design_depth(self) -> float:
        return float(self.result.normal_depth)

    @property
    def total_depth(self) -> float:
        return self.design_depth + self.freeboard


def lining_check(channel, lining) -> LiningCheck | None:
    """The stability of ``channel`` lined with ``lining`` (a LiningChoice), or None.

    This version of the program has no lining stability check yet, so there
    is nothing to report: None.
    """
    return None


@dataclass
class CatalogueLining:
    """What the lining catalogue says about a chosen lining (no stability)."""

    name: str
    roughness: object                  # float n or a depth-dependent roughness model
    roughness_source: str
    permissible_source: str
    thickness: float | None            # [m]
    d50: float | None                  # [m], stone linings


_catalogue = None


def catalogue_lining(choice) -> CatalogueLining | None:
    """The catalogue entry for a LiningChoice, or None when the key is not in the catalogue.

    Raises hy.InputError when the entry exists but lacks a value the channel needs (e.g. a D50).
    """
    global _catalogue
    from hydraulics.linings import load_catalogue

    if _catalogue is None:
        _catalogue = load_catalogue()
    if choice is None or choice.key not in _catalogue:
        return None
    entry = _catalogue.get(choice.key)
    d50 = choice.d50 if entry.category == "stone" else None
    roughness = entry.roughness(d50)
    return CatalogueLining(
        name=entry.name, roughness=roughness, roughness_source=entry.roughness_data.get("source", ""),
        permissible_source=entry.permissible_data.get("source", ""), thickness=entry.layer_thickness(d50),
        d50=(d50 if d50 is not None else entry.d50) if entry.category == "stone" else None)


def _n_words(roughness) -> str:
    if isinstance(roughness, float):
        return "constant n"
    kind = type(roughness).__name__
    return {"StoneRoughness": "n from D50 by depth (HEC-15 Sec. 6.1)",
            "VegetationRoughness": "n by shear (HEC-15 Ch. 4)"}.get(kind, "n by depth")


def evaluate(channel, lining=None) -> Evaluation:
    """Analyse ``channel`` with ``lining`` (default: its own lining).

    The n used: the lining check's when there is one; else the Manning's n typed
    in the project (which overrides the lining's, as in app.project.Channel);
    else the catalogue lining's own n. Raises hy.InputError when there is no n
    to use, and whatever :func:`hydraulics.analyse` raises.
    """
    lining = channel.lining if lining is None else lining
    check = lining_check(channel, lining) if lining is not None else None
    section = channel.build_section()
    flow = channel.design_flow()
    if check is not None:
        roughness, n_basis = check.roughness, f"{check.lining_name}: {check.n_relation}"
    elif channel.manning_n is not None:
        roughness, n_basis = channel.manning_n, "typed in the project"
    else:
        entry = catalogue_lining(lining) if lining is not None else None
        if entry is None:
            raise hy.InputError("manning_n", f"channel {channel.name!r} has no Manning's n and no catalogue "
                                             "lining to take one from; give the channel a Manning's n")
        roughness, n_basis = entry.roughness, f"catalogue, {_n_words(entry.roughness)}"
    result = hy.analyse(section, flow, channel.slope, roughness)
    if check is not None:
        freeboard, basis = check.freeboard, check.freeboard_basis
    else:
        freeboard, basis = channel.min_freeboard, "project minimum"
    return Evaluation(result=result, roughness=roughness, n_basis=n_basis, check=check, freeboard=freeboard, freeboard_basis=basis)
