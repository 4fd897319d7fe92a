"""Evaluate one project channel: design flow, uniform flow, lining stability, lining comparison.

The one call the desktop window, the design sheet and the batch checker share::

    from app.evaluate import evaluate_channel, load_default_catalogue
    catalogue = load_default_catalogue(user_path)      # shipped + the user's own entries
    design = evaluate_channel(channel, catalogue)      # an app.project.Channel
    design.analysis.normal_depth, design.stability.reason(units), design.warnings

Everything is SI (the project model is SI); convert at the edge with
:mod:`hydraulics.units`. Bad input raises ``hydraulics.InputError`` naming the
field; a channel that cannot carry its flow raises ``hydraulics.NoSolutionError``.
No Qt here.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace

import hydraulics as hy
from hydraulics import provenance, rational, validate
from hydraulics.linings import hec15
from hydraulics.linings import Catalogue, load_catalogue
from hydraulics.units import SI
from hydraulics.lining_comparison import ComparisonRow, compare_linings
from hydraulics.stability import StabilityResult, check_lining
from hydraulics.freeboard import ditch_top, freeboard_rule
from hydraulics.wording import in_units, worded, worded_sizes

from .project import Channel
from .verdicts import Verdict, verdict_of, with_tokens
from .results import CHANNEL_FIELDS, convert, panel_field, rounded

__all__ = ["ChannelDesign", "evaluate_channel", "lining_comparison", "width_for_depth", "load_default_catalogue",
           "design_flow"]


def load_default_catalogue(user_path=None) -> Catalogue:
    """The shipped lining catalogue with the user's catalogue (a TOML file at ``user_path``) laid over it.

    ``user_path`` is chosen by the application (for instance in the user's
    settings folder); a path that does not exist yet simply adds nothing.
    Errors in the user's file raise ``hydraulics.linings.CatalogueError``
    (an InputError) naming the file, entry and field.
    """
    return load_catalogue(user_path=user_path)


def lining_json(stability: StabilityResult, units) -> dict:
    """The lining of a check as the JSON outputs give it, in ``units`` (the sizes its name quotes too)."""
    return {"key": stability.lining_key, "name": in_units(worded_sizes(stability.lining_name), units),
            "n_used": stability.manning_n, "n_relation": stability.n_relation, "n_source": stability.n_source,
            "d50": None if stability.d50 is None else float(units.from_si("length", stability.d50))}


@dataclass
class ChannelDesign:
    """Everything evaluated for one channel (SI). Fields:

    ``flow`` design discharge [m^3/s]; ``flow_method`` "typed" or "rational";
    ``time_of_concentration`` Kirpich's t_c [s] when the flow path is given,
    else None; ``section`` the built section; ``analysis`` the uniform-flow
    state (:class:`hydraulics.ChannelResult`, with the lining's n when there is
    a lining); ``stability`` the lining check or None without a lining;
    ``freeboard``, ``superelevation``, ``total_depth``, ``top_width_at_top``
    the ditch depth (from the lining check, or by the same rule without one);
    ``comparison`` one row per lining (the channel's own lining first, then
    its alternatives), empty without alternatives; ``warnings`` every caution,
    in words, flow basis first; ``notes`` statements of method (sources,
    rules applied).
    """

    channel: Channel
    flow: float
    flow_method: str
    time_of_concentration: float | None
    section: hy.Section
    analysis: hy.ChannelResult
    stability: StabilityResult | None
    freeboard: float = 0.0                # [m] minimum plus any bend superelevation
    superelevation: float | None = None   # [m], with a bend
    wave_allowance: float | None = None   # [m] the flow depth, where supercritical flow set the freeboard
    total_depth: float = 0.0              # design depth plus freeboard [m]
    top_width_at_top: float = 0.0         # width at the top of the ditch [m]
    comparison: list = field(default_factory=list)   # ComparisonRow list
    warnings: list = field(default_factory=list)
    notes: list = field(default_factory=list)

    @property
    def stable(self) -> bool | None:
        """The lining's verdict as a flag; None without a lining."""
        return None if self.stability is None else self.stability.stable

    @property
    def verdict(self) -> Verdict:
        """The verdict in the one vocabulary of :mod:`app.verdicts` (too shallow, the lining's, or hydraulics only)."""
        return verdict_of(self.stability, self.total_depth, self.section.full_depth)

    def freeboard_rule(self, units=SI) -> str:
        """The freeboard rule applied to this channel, in words, in ``units``, with its source."""
        ch = self.channel
        min_fb = hec15.MIN_FREEBOARD if ch.min_freeboard is None else ch.min_freeboard
        return freeboard_rule(min_fb, self.superelevation, units, self.wave_allowance)

    def cited_texts(self) -> list:
        """Every caution and statement of method of this design that may cite a publication."""
        return [*self.warnings, *self.notes, *(self.stability.cited_texts() if self.stability is not None else ())]

    @property
    def not_verified(self) -> list:
        """The published values this design leans on that are not yet verified against their publication, one line
        each (what, value, place), from :mod:`hydraulics.provenance`; empty when every cited value was read."""
        return provenance.not_verified_lines(provenance.cited_not_verified(self.cited_texts()))

    def to_dict(self, units=SI) -> dict:
        """JSON-friendly summary in ``units`` (a hydraulics.units.UnitSystem): the same keys as
        ``ditchwright calc --json`` (uniform flow, ``lining``, ``stability``) plus ``channel``, ``flow_method``,
        ``time_of_concentration`` [s], ``freeboard``, ``total_depth``, ``top_width_at_top``, ``comparison``
        (rows as ``ditchwright compare --json``), ``warnings``, ``notes`` and ``not_verified`` (the published values
        leant on that are not yet verified against their publication, :mod:`hydraulics.provenance`)."""
        L = lambda v: None if v is None else float(units.from_si("length", v))  # noqa: E731
        out = {"channel": self.channel.name, "flow_method": self.flow_method,
               "time_of_concentration": self.time_of_concentration}
        out.update({f.key: convert(getattr(self.analysis, f.key), f.quantity, units) for f in CHANNEL_FIELDS})
        out["flow"] = float(units.from_si("flow", self.flow))
        if self.stability is not None:
            st = self.stability
            out["lining"] = lining_json(st, units)
            out["stability"] = st.to_dict(units)
        out.update({"freeboard": L(self.freeboard), "superelevation": L(self.superelevation),
                    "total_depth": L(self.total_depth), "top_width_at_top": L(self.top_width_at_top),
                    "comparison": [r.to_dict(units) for r in self.comparison],
                    "units": {k: units.label(k) for k in ("length", "flow", "velocity", "area", "shear", "slope")},
                    "warnings": [in_units(w, units) for w in self.warnings],
                    "notes": [in_units(n, units) for n in self.notes],
                    "not_verified": [in_units(n, units) for n in self.not_verified]})
        return with_tokens(out, self.stability, self.section.full_depth, self.comparison)


def design_flow(channel: Channel) -> tuple[float, float | None, list[str], list[str]]:
    """(Q [m^3/s], Kirpich t_c [s] or None, warnings, notes) from the channel's flow basis."""
    basis = channel.flow
    if basis.method == "typed":
        return float(validate.positive("flow.value", basis.value)), None, [], []
    if basis.method != "rational":
        raise hy.InputError("flow.method", f"must be 'typed' or 'rational', got {basis.method!r}")
    q = rational.rational_flow(basis.runoff_coefficient, basis.intensity, basis.area)
    warns = list(rational.rational_warnings(basis.area))
    notes = [f"design flow by the rational method Q = C i A = {basis.runoff_coefficient:g} x "
             f"{basis.intensity * 3.6e6:.4g} mm/h x {basis.area / 1e4:.4g} ha = {q:.4g} m^3/s "
             "(FHWA HEC-22, 3rd ed., 2009, Eq. 3-1)"]
    tc = None
    if basis.flow_length is not None or basis.flow_path_slope is not None:
        if basis.flow_length is None or basis.flow_path_slope is None:
            missing = "flow.flow_length" if basis.flow_length is None else "flow.flow_path_slope"
            raise hy.InputError(missing, "is missing: Kirpich's time of concentration needs both the flow-path "
                                         "length and its slope")
        tc = rational.kirpich_time(basis.flow_length, basis.flow_path_slope)
        warns += rational.kirpich_warnings(basis.flow_path_slope, basis.area)
        notes.append(f"time of concentration {tc / 60:.3g} min by Kirpich's formula (Kirpich 1940); the "
                     "intensity should be read for this duration")
    return q, tc, warns, notes


def comparison_choices(channel: Channel) -> list:
    """The channel's own lining first, then its alternatives (each once)."""
    out, seen = [], set()
    for c in ([channel.lining] if channel.lining is not None else []) + list(channel.alternatives):
        key = (c.key, c.d50)
        if key not in seen:
            seen.add(key)
            out.append(c)
    return out


def evaluate_channel(channel: Channel, catalogue: Catalogue) -> ChannelDesign:
    """Design flow -> section -> uniform flow -> lining stability -> comparison, for one channel.

    Parameters
    ----------
    channel : app.project.Channel
        The channel (SI). With ``channel.lining`` its catalogue entry sets n
        and is checked; without, ``channel.manning_n`` is used and there is no
        stability check. ``bend_radius`` and ``min_freeboard`` are passed on;
        ``alternatives`` are compared together with the channel's own lining.
    catalogue : hydraulics.linings.Catalogue
        Where lining keys are looked up: the front end's (``Context.catalogue``, the shipped one with the
        user's file laid over it). Required, so that no path falls back to the shipped one unseen.

    Returns
    -------
    ChannelDesign

    Notes
    -----
    With a lining, the lining's own roughness is used and
    ``channel.manning_n`` is ignored (stated in ``notes``).
    """
    if not isinstance(channel, Channel):
        raise hy.InputError("channel", f"must be an app.project.Channel, got {type(channel).__name__}")
    q, tc, warns, notes = design_flow(channel)
    section = channel.build_section()
    min_fb = hec15.MIN_FREEBOARD if channel.min_freeboard is None else channel.min_freeboard
    stability = None
    comparison: list[ComparisonRow] = []
    if channel.lining is not None:
        lining = catalogue.get(channel.lining.key)
        stability = check_lining(section, q, channel.slope, lining, d50=channel.lining.d50,
                                 bend_radius=channel.bend_radius, min_freeboard=min_fb)
        analysis = stability.analysis
        warns += stability.warnings
        notes += stability.notes + [f"freeboard: {stability.freeboard_rule()}"]
        if channel.manning_n is not None:
            n_used = rounded(stability.manning_n, panel_field("manning_n"))   # as the results print the n used
            notes.append(f"the lining's own n ({n_used}) is used; the channel's Manning's n "
                         f"{channel.manning_n:g} applies only without a lining")
    else:
        if channel.manning_n is None and not isinstance(section, hy.Irregular):
            raise hy.InputError("manning_n", "is missing: give Manning's n or choose a lining")
        # A surveyed section without an n of its own type uses its n per segment (composite n).
        analysis = hy.analyse(section, q, channel.slope, channel.manning_n)
        warns += analysis.warnings
        notes.append("no lining chosen: uniform flow with the given Manning's n, no shear check")
    if stability is not None:
        fb, se, wave, total, top = (stability.freeboard, stability.superelevation, stability.wave_allowance,
                                    stability.total_depth, stability.top_width_at_top)
    else:
        fb, se, wave, total, top = _ditch_depth(section, analysis, channel.bend_radius, min_fb, warns, notes)
    if channel.alternatives:
        comparison = lining_comparison(channel, catalogue, section=section, flow=q)
    return ChannelDesign(channel=channel, flow=q, flow_method=channel.flow.method, time_of_concentration=tc,
                         section=section, analysis=analysis, stability=stability, freeboard=fb,
                         superelevation=se, wave_allowance=wave, total_depth=total, top_width_at_top=top,
                         comparison=comparison,
                         warnings=list(dict.fromkeys(warns)), notes=list(dict.fromkeys(notes)))


def lining_comparison(channel: Channel, catalogue: Catalogue, choices=None, *, section: hy.Section | None = None,
                      flow: float | None = None) -> list[ComparisonRow]:
    """The channel's section, flow and slope with several linings: one row each (``ditchwright compare`` and the
    comparison of :func:`evaluate_channel` alike).

    ``choices``: the linings in the order wanted ((key, D50 [m]) pairs, "key[:D50]" or LiningChoice); None for
    the channel's own lining then its alternatives, each once. The channel's bend radius and minimum freeboard
    apply to every row (the HEC-15 default minimum when it has none). ``section`` and ``flow``: the channel's, when
    the caller has them already. Rows as :func:`hydraulics.lining_comparison.compare_linings` makes them.
    """
    section = channel.build_section() if section is None else section
    q = design_flow(channel)[0] if flow is None else flow
    min_fb = hec15.MIN_FREEBOARD if channel.min_freeboard is None else channel.min_freeboard
    return compare_linings(section, q, channel.slope, comparison_choices(channel) if choices is None else choices,
                           catalogue, bend_radius=channel.bend_radius, min_freeboard=min_fb)


#: Shapes whose bottom width :func:`width_for_depth` finds.
WIDTH_SHAPES = ("trapezoid", "rectangle")


def width_for_depth(channel: Channel, max_depth: float, catalogue: Catalogue) -> tuple[Channel, float]:
    """The channel with the smallest bottom width [m] whose normal depth is at most ``max_depth`` [m], and that
    width (``ditchwright calc --find bottom-width``).

    ``channel.section`` names the shape ("trapezoid" or "rectangle") and, for a trapezoid, its side slopes; a
    bottom width there is ignored. Manning's n is the lining's (from ``catalogue``, with its D50) or, without a
    lining, ``channel.manning_n``. A width of 0 means a V-ditch of these side slopes already runs shallow
    enough: the channel returned is then a triangle. The width itself is
    :func:`hydraulics.bottom_width_for_depth`'s.
    """
    shape = channel.section.get("shape")
    if shape not in WIDTH_SHAPES:
        raise hy.InputError("section.shape", f"must be one of {', '.join(WIDTH_SHAPES)} to find a bottom width, "
                                             f"got {shape!r}")
    slopes = {k: channel.section[k] for k in ("side_slope", "left_slope", "right_slope")
              if shape == "trapezoid" and channel.section.get(k) is not None}
    q = design_flow(channel)[0]
    if channel.lining is not None:
        n = catalogue.get(channel.lining.key).roughness(channel.lining.d50)
    elif channel.manning_n is not None:
        n = channel.manning_n
    else:
        raise hy.InputError("manning_n", "is missing: give Manning's n or choose a lining")
    found = hy.bottom_width_for_depth(q, channel.slope, n, max_depth, **slopes)
    if found == 0.0:
        section = hy.Triangle(**slopes)
    elif shape == "rectangle":
        section = hy.Rectangle(bottom_width=found)
    else:
        section = hy.Trapezoid(bottom_width=found, **slopes)
    return replace(channel, section=section.to_dict()), found


def _ditch_depth(section, analysis, bend_radius, min_fb, warns, notes):
    """Freeboard of a channel without a lining, by the one rule of :mod:`hydraulics.freeboard`."""
    top = float(analysis.top_width)
    rc = None if bend_radius is None else float(validate.positive("bend_radius", bend_radius))
    if rc is not None and rc < top / 2:
        raise hy.InputError("bend_radius", worded("must be at least half the water-surface width ({half}), got {rc}",
                                                  half=(top / 2, "length"), rc=(rc, "length")))
    ditch = ditch_top(section, analysis.normal_depth, analysis.velocity, top, analysis.froude, rc, min_fb)
    warns += ditch.warnings
    notes.append(f"freeboard: {freeboard_rule(min_fb, ditch.superelevation, wave_allowance=ditch.wave_allowance)}")
    return ditch.freeboard, ditch.superelevation, ditch.wave_allowance, ditch.total_depth, ditch.top_width
