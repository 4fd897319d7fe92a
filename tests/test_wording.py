"""Messages whose quantities follow the unit system (hydraulics.wording).

Factors: 1 ft = 0.3048 m and 1 lb = 0.45359237 kg exactly (NIST Special Publication 811, 2008 ed.,
Appendix B.8), as in hydraulics.units.
"""

import pytest

import hydraulics as hy
from hydraulics.linings import load_catalogue
from hydraulics.stability import check_lining
from hydraulics.units import SI, US
from hydraulics.wording import Worded, format_quantity, in_units, worded


def test_a_worded_message_reads_in_si_and_restates_in_us():
    w = worded("depth {d} with {tau} on the bed ({source})", d=(0.3048, "length"), tau=(47.880258980335840, "shear"),
               source="HEC-15 {Eq. 3.1}")
    assert isinstance(w, str) and isinstance(w, Worded)
    assert w == "depth 0.305 m with 47.9 Pa on the bed (HEC-15 {Eq. 3.1})"
    assert in_units(w, US) == "depth 1.00 ft with 1.00 lb/ft^2 on the bed (HEC-15 {Eq. 3.1})"
    assert in_units(w, SI) == str(w)
    assert in_units("plain text, 3 m", US) == "plain text, 3 m"  # not ours to restate


def test_three_significant_figures():
    assert format_quantity(0.025, "small_length", SI) == "25.0 mm"
    assert format_quantity(0.025, "small_length", US) == "0.984 in"
    assert format_quantity(123456.0, "length", SI) == "123456 m"


def test_lining_warnings_follow_the_session_units():
    # A concrete ditch on a flat grade runs below the self-cleaning velocity (0.61 m/s, 2 ft/s, Chow 1959,
    # Sec. 7-3, not verified).
    st = check_lining(hy.Trapezoid(bottom_width=2.0, side_slope=3.0), 0.2, 0.0005, load_catalogue().get("concrete"))
    slow = next(w for w in st.warnings if "silt" in w)
    assert slow.startswith("velocity 0.420 m/s is below 0.610 m/s, so silt")
    assert in_units(slow, US).startswith("velocity 1.38 ft/s is below 2.00 ft/s, so silt")  # / 0.3048


@pytest.mark.parametrize("units, unit", [(US, "ft^3/s"), (SI, "m^3/s")])
def test_pipe_capacity_warning_follows_the_units(units, unit):
    # A pipe carrying more than its full-flow capacity but less than its part-full peak (Chow 1959, Sec. 6-8).
    pipe = hy.Circle(diameter=0.6)
    q_full = hy.flow_at_depth(pipe, 0.6, 0.01, 0.013)
    res = hy.analyse(pipe, 1.03 * q_full, 0.01, 0.013)
    text = [in_units(w, units) for w in res.warnings if "full-flow capacity" in w]
    assert len(text) == 1 and f" {unit}): " in text[0]


def test_sizes_quoted_in_a_lining_name_follow_the_units():
    # 150 mm / 25.4 mm per inch = 5.91 in, a rough size to whole inches: 6 in; 1.3 mm = 0.0512 in
    # (1 in = 25.4 mm exactly, NIST Special Publication 811, 2008 ed., Appendix B.8).
    from hydraulics.wording import worded_sizes
    grass = worded_sizes("Grass, sod-forming, good stand, about 150 mm tall")
    assert grass == "Grass, sod-forming, good stand, about 150 mm tall"       # reads in SI as written
    assert in_units(grass, SI) == "Grass, sod-forming, good stand, about 150 mm tall"
    assert in_units(grass, US) == "Grass, sod-forming, good stand, about 6 in tall"
    soil = worded_sizes("Bare soil (D75 < 1.3 mm)")
    assert in_units(soil, SI) == "Bare soil (D75 < 1.3 mm)" and in_units(soil, US) == "Bare soil (D75 < 0.0512 in)"
    assert worded_sizes("Concrete") == "Concrete" and not isinstance(worded_sizes("Concrete"), Worded)
    # nested in a message, restated with the rest of it
    w = worded("at {s} ({lining}): depth {d}", s=(15.0, "station"), lining=grass, d=(0.1524, "length"))
    assert str(w) == "at 0+015.00 (Grass, sod-forming, good stand, about 150 mm tall): depth 0.152 m"
    assert in_units(w, US) == "at 0+49.21 (Grass, sod-forming, good stand, about 6 in tall): depth 0.500 ft"


def test_values_printed_alike_share_a_group():
    """printed_alike groups values exactly as they print to three significant figures (format_value, and "%.3g"):
    one group, one text (and for format_value two groups, two texts); a value at a rounding tie is set apart."""
    import numpy as np
    from hydraulics.wording import format_value, printed_alike
    rng = np.random.default_rng(3)
    v = np.concatenate([10 ** rng.uniform(-4, 5, 20000),
                        [0.0995, 0.09996, 0.99996, 1.0, 0.12345, 999.5, 1894.13, 1886.0, 1e-5, -0.25, 0.25]])
    for whole_numbers, write in ((True, format_value), (False, lambda x: f"{x:.3g}")):
        groups, clear = printed_alike(v, whole_numbers=whole_numbers)
        texts = {}
        for g, x in zip(groups[clear].tolist(), v[clear].tolist()):
            assert texts.setdefault(g, write(x)) == write(x), x
        if whole_numbers:   # two groups print differently ("%.3g" drops trailing zeros: 0.1 and 0.0999... meet)
            assert len(set(texts.values())) == len(texts)
        assert not clear[np.flatnonzero(v == 999.5)].any()        # a tie is written on its own


def test_distinct_groups_are_those_of_numpys_unique():
    """The table of values present gives np.unique's groups (numpy's own function as the reference); the member
    named for a group may be any of it; spans too wide for a table go to np.unique itself."""
    import numpy as np
    from hydraulics.wording import distinct_groups
    rng = np.random.default_rng(7)
    for key in (rng.integers(0, 30_000, 20_000), rng.integers(-5, 5, 5_000), rng.integers(-2**62, 2**62, 3_000),
                np.array([2**62, -2**62, 0, 2**62]), np.array([4]), np.zeros(0)):
        key = key.astype(np.int64)
        members, groups = distinct_groups(key)
        distinct, inverse = np.unique(key, return_inverse=True)
        assert np.array_equal(key[members], distinct)
        assert np.array_equal(groups, inverse)


def test_values_too_large_for_whole_number_keys_are_grouped_as_they_print():
    """Values whose printed digits pass 2^40 (whole numbers kept, "1e+15" written in full) group as they print."""
    import numpy as np
    from hydraulics.wording import format_value, printed_alike
    v = np.array([1.0e15, 1.0e15 + 1, 2.5e14, 1.0e15, 0.5, 0.5004])
    groups, clear = printed_alike(v, whole_numbers=True)
    texts = {}
    for g, x in zip(groups[clear].tolist(), v[clear].tolist()):
        assert texts.setdefault(g, format_value(x)) == format_value(x), x
    assert len(set(texts.values())) == len(texts)


def test_a_core_error_is_restated_in_the_users_units():
    """A core error made with `worded` keeps its quantities (HydraulicsError.said) and is restated by in_units;
    one made from plain text reads as it is in every unit system; an InputError keeps its field in front.
    1 ft = 0.3048 m exactly, 1 ft^3/s = 0.3048^3 m^3/s."""
    from hydraulics.errors import InputError, NoSolutionError
    from hydraulics.units import SI, US

    err = NoSolutionError(worded("flow {q} exceeds {q_max}", q=(0.3048 ** 3 * 20, "flow", "g"),
                                 q_max=(0.3048 ** 3 * 3.5, "flow", "g")))
    assert err.in_units(US) == "flow 20 ft^3/s exceeds 3.5 ft^3/s"
    assert err.in_units(SI) == str(err) == "flow 0.566337 m^3/s exceeds 0.099109 m^3/s"
    assert worded("no depth: {why}", why=err.said()).in_units(US) == "no depth: flow 20 ft^3/s exceeds 3.5 ft^3/s"
    plain = NoSolutionError("no design point of the run could be checked")
    assert plain.in_units(US) == plain.said() == str(plain)
    field = InputError("depth", worded("must be below {top}", top=(0.6096, "length")))
    assert field.in_units(US) == "depth: must be below 2.00 ft" and str(field) == "depth: must be below 0.610 m"
    assert InputError("n", "must be > 0").in_units(US) == "n: must be > 0"
