"""The cheapest buildable lining schedule (hydraulics.lining_schedule).

Source of every check: the rules stated in the module's docstring (the program's own rules; the minimum stretch
length is common practice) and the trapezoidal rule for the cost of a segment. The margin is HEC-15's
permissible-shear check (Kilgore and Cotton, HEC-15, 3rd ed., FHWA-NHI-05-114, 2005, Eq. 3.2), used here only
as "stable when >= 1". The algorithm is checked against a brute-force enumeration of every assignment of
candidates to segments on small runs, and against the plain O(N^2 K) recursion on longer ones; every
schedule returned is checked against the rules themselves. All data here are invented.
"""

import itertools
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from hydraulics import InputError, NoSolutionError
from hydraulics.lining_schedule import Schedule, allowed_candidates, cheapest_schedule
from hydraulics.units import US
from hydraulics.wording import in_units

INF = math.inf
NAN = math.nan


# -- the rules, written out independently of the module -----------------------------------------------------------

def allowed_sets(margin):
    """Rule 3, point by point: the stable candidates, or at a failing point the strongest (ties 1e-9 relative)."""
    sets, failing = [], []
    for row in np.asarray(margin, dtype=float):
        stable = {k for k, v in enumerate(row) if v >= 1.0}
        usable = [v for v in row if not math.isnan(v)]
        if stable or not usable:
            sets.append(stable)
            failing.append(False)
        else:
            top = max(usable)
            sets.append({k for k, v in enumerate(row) if not math.isnan(v) and v >= top - 1e-9 * abs(top)})
            failing.append(True)
    return sets, failing


def length_tolerance(x, min_length):
    return 1e-9 * max(1.0, float(np.max(np.abs(x))), min_length)


def segment_costs(x, cost):
    """The trapezoidal rule on each segment: (c[i,k] + c[i+1,k]) / 2 * (x[i+1] - x[i]) (rule 4)."""
    x, cost = np.asarray(x, dtype=float), np.asarray(cost, dtype=float)
    return 0.5 * (cost[:-1] + cost[1:]) * np.diff(x)[:, None]


def runs_of(choice):
    """(first point, last point, candidate) of each maximal run of equal choices (rule 1)."""
    out, i = [], 0
    for j in range(1, len(choice) + 1):
        if j == len(choice) or choice[j] != choice[i]:
            out.append((i, j, choice[i]))
            i = j
    return out


def buildable(x, sets, choice, min_length):
    """Rules 1 to 3 for an assignment of candidates to segments."""
    tol = length_tolerance(x, min_length)
    runs = runs_of(choice)
    if x[-1] - x[0] < min_length:
        if len(runs) != 1:
            return False
    elif any(x[j] - x[i] < min_length - tol for i, j, _ in runs):
        return False
    return all(k in sets[p] for i, j, k in runs for p in range(i, j + 1))


def brute_force(x, margin, cost, min_length):
    """Every assignment of candidates to segments: the buildable ones sorted by (cost, stretches, choices)."""
    sets, _ = allowed_sets(margin)
    seg = segment_costs(x, cost)
    n, k_count = np.shape(margin)
    found = []
    for choice in itertools.product(range(k_count), repeat=n - 1):
        if buildable(x, sets, choice, min_length):
            total = math.fsum(seg[s, k] for s, k in enumerate(choice))
            found.append((total, len(runs_of(choice)), choice))
    return sorted(found)


def assert_obeys_the_rules(schedule, x, margin, cost, min_length):
    """Every output: coverage, lengths, allowed points, neighbours differ, total = stretches = trapezoid sum."""
    assert isinstance(schedule, Schedule)
    x = np.asarray(x, dtype=float)
    n = len(x)
    sets, failing = allowed_sets(margin)
    seg = segment_costs(x, cost)
    s = schedule.stretches
    assert s[0].first == 0 and s[-1].last == n - 1
    assert all(a.last == b.first and a.choice != b.choice for a, b in zip(s, s[1:]))
    tol = length_tolerance(x, min_length)
    for t in s:
        assert t.last > t.first
        assert (t.start, t.end) == (x[t.first], x[t.last]) and t.length == pytest.approx(t.end - t.start)
        if x[-1] - x[0] >= min_length:
            assert t.length >= min_length - tol
        assert all(t.choice in sets[p] for p in range(t.first, t.last + 1))
        assert t.cost == pytest.approx(seg[t.first:t.last, t.choice].sum(), rel=1e-12, abs=1e-12)
        assert list(schedule.choice_at[t.first:t.last]) == [t.choice] * (t.last - t.first)
    if x[-1] - x[0] < min_length:
        assert len(s) == 1
    assert schedule.choice_at.shape == (n - 1,)
    trapezoid = math.fsum(seg[i, k] for i, k in enumerate(schedule.choice_at))
    assert schedule.total_cost == pytest.approx(math.fsum(t.cost for t in s), rel=1e-12, abs=1e-12)
    assert schedule.total_cost == pytest.approx(trapezoid, rel=1e-12, abs=1e-12)
    assert schedule.failing.tolist() == failing


# -- random runs ----------------------------------------------------------------------------------------------------

def random_run(rng, n, k_count, whole_numbers=False):
    """An invented run: stations, margins (some below 1, some NaN, some rigid), prices and a minimum length."""
    if whole_numbers:
        x = np.cumsum(np.concatenate([[rng.integers(0, 50)], rng.integers(1, 6, n - 1) * 5])).astype(float)
        margin = rng.choice([0.5, 0.8, 1.5, NAN, INF], size=(n, k_count), p=[0.15, 0.1, 0.55, 0.1, 0.1])
        # one price per candidate from two values, now and then another price at a point: many equal totals
        cost = (rng.integers(1, 3, size=(1, k_count)) + (rng.random((n, k_count)) < 0.15)).astype(float)
    else:
        x = np.cumsum(np.concatenate([[rng.uniform(-100, 100)], rng.uniform(0.5, 20, n - 1)]))
        margin = rng.uniform(0.3, 2.5, size=(n, k_count))
        margin[rng.random((n, k_count)) < 0.12] = NAN
        margin[rng.random((n, k_count)) < 0.08] = INF
        cost = rng.uniform(1, 60, size=(n, k_count))
    cost[np.isnan(margin) & (rng.random((n, k_count)) < 0.5)] = NAN   # a price may be missing where unusable
    total = x[-1] - x[0]
    pick = rng.integers(0, 4)
    min_length = [0.0, float(rng.uniform(0, 0.6 * total)), float(rng.uniform(0.6, 1.3) * total),
                  float(rng.choice(np.diff(x)))][pick]
    if whole_numbers:
        min_length = float(round(min_length / 5) * 5)
    return x, margin, cost, min_length


@pytest.mark.parametrize("whole_numbers", [False, True], ids=["random reals", "whole numbers with ties"])
def test_the_schedule_is_the_best_of_every_assignment(whole_numbers):
    """Against a brute-force enumeration (N up to 7, K up to 3): same feasibility, same least cost; where the
    data are whole numbers (exact sums, many ties) the very same schedule by the tie rules of rule 4."""
    rng = np.random.default_rng(20240611 + whole_numbers)
    counts = {"solved": 0, "none": 0, "ties": 0, "index decides": 0}
    for _ in range(800):
        n, k_count = int(rng.integers(2, 8)), int(rng.integers(1, 4))
        x, margin, cost, min_length = random_run(rng, n, k_count, whole_numbers)
        found = brute_force(x, margin, cost, min_length)
        if not found:
            with pytest.raises(NoSolutionError, match="no buildable lining schedule"):
                cheapest_schedule(x, margin, cost, min_length)
            counts["none"] += 1
            continue
        schedule = cheapest_schedule(x, margin, cost, min_length)
        assert_obeys_the_rules(schedule, x, margin, cost, min_length)
        best = found[0]
        assert schedule.total_cost == pytest.approx(best[0], rel=1e-9, abs=1e-9)
        counts["solved"] += 1
        if whole_numbers:
            assert tuple(schedule.choice_at) == best[2]
            if len(found) > 1 and found[1][0] == best[0]:
                counts["ties"] += 1
                counts["index decides"] += found[1][1] == best[1]
        elif len(found) == 1 or found[1][0] - best[0] > 1e-6 * max(1.0, best[0]):
            assert tuple(schedule.choice_at) == best[2]
    # the draws reach every case: solved, no schedule at all, and (whole numbers) ties of cost
    assert counts["solved"] > 300 and counts["none"] > 100, counts
    assert not whole_numbers or (counts["ties"] > 40 and counts["index decides"] > 20), counts


def plain_recursion(x, margin, cost, min_length):
    """The recursion as first written (module docstring), O(N^2 K): best[j][k] over every earlier start i."""
    sets, _ = allowed_sets(margin)
    seg = segment_costs(x, cost)
    n, k_count = np.shape(margin)
    whole = x[-1] - x[0] < min_length
    tol = length_tolerance(x, min_length)
    best = np.full((n, k_count), INF)
    for j in range(1, n):
        for k in range(k_count):
            for i in range(j - 1, -1, -1):
                if k not in sets[i] or k not in sets[j] or any(k not in sets[p] for p in range(i, j)):
                    break
                if whole and (i, j) != (0, n - 1) or not whole and x[j] - x[i] < min_length - tol:
                    continue
                before = 0.0 if i == 0 else min((best[i][q] for q in range(k_count) if q != k), default=INF)
                best[j][k] = min(best[j][k], before + math.fsum(seg[i:j, k]))
    return best[n - 1].min()


@settings(max_examples=60, deadline=None)
@given(seed=st.integers(0, 2**32 - 1), n=st.integers(2, 45), k_count=st.integers(1, 5))
def test_longer_runs_cost_what_the_plain_recursion_gives(seed, n, k_count):
    rng = np.random.default_rng(seed)
    x, margin, cost, min_length = random_run(rng, n, k_count)
    least = plain_recursion(x, margin, cost, min_length)
    if least == INF:
        with pytest.raises(NoSolutionError):
            cheapest_schedule(x, margin, cost, min_length)
        return
    schedule = cheapest_schedule(x, margin, cost, min_length)
    assert_obeys_the_rules(schedule, x, margin, cost, min_length)
    assert schedule.total_cost == pytest.approx(least, rel=1e-9)


# -- cases by hand (invented data) ----------------------------------------------------------------------------------

STATIONS = np.arange(0.0, 201.0, 10.0)           # 21 design points, every 10 m


def test_one_cheap_candidate_stable_everywhere_is_one_stretch():
    n = len(STATIONS)
    margin = np.column_stack([np.full(n, 1.3), np.full(n, INF)])                 # grass, concrete
    cost = np.column_stack([np.linspace(8.0, 12.0, n), np.full(n, 60.0)])
    s = cheapest_schedule(STATIONS, margin, cost, 25.0)
    (only,) = s.stretches
    assert (only.first, only.last, only.choice, only.start, only.end, only.length) == (0, n - 1, 0, 0.0, 200.0, 200.0)
    assert only.cost == pytest.approx(10.0 * 200.0, rel=1e-12)    # a linear price: the trapezoid sum is exact
    assert not s.failing.any()


def steep_middle(min_length):
    """Grass fails at 80 m and at 120 m (a steeper part); concrete is stable everywhere."""
    n = len(STATIONS)
    grass = np.full(n, 1.4)
    grass[[8, 12]] = 0.7
    margin = np.column_stack([grass, np.full(n, INF)])
    cost = np.column_stack([np.full(n, 10.0), np.full(n, 50.0)])
    return cheapest_schedule(STATIONS, margin, cost, min_length)


def test_a_steep_middle_part_takes_the_stronger_candidate():
    # no minimum: concrete only on the four segments touching 80 m and 120 m, grass between them (90-110 m)
    free = steep_middle(0.0)
    assert [(t.start, t.end, t.choice) for t in free.stretches] == [
        (0.0, 70.0, 0), (70.0, 90.0, 1), (90.0, 110.0, 0), (110.0, 130.0, 1), (130.0, 200.0, 0)]
    assert free.total_cost == pytest.approx(160 * 10.0 + 40 * 50.0)


def test_a_stretch_shorter_than_the_minimum_is_absorbed():
    # a 30 m minimum: the 20 m of grass between 90 and 110 m is too short, so concrete runs through
    s = steep_middle(30.0)
    assert [(t.start, t.end, t.choice) for t in s.stretches] == [(0.0, 70.0, 0), (70.0, 130.0, 1), (130.0, 200.0, 0)]
    assert s.total_cost == pytest.approx(140 * 10.0 + 60 * 50.0)
    assert min(t.length for t in s.stretches) >= 30.0
    # a 20 m minimum still lets the grass stretch stand (exactly 20 m long)
    assert len(steep_middle(20.0).stretches) == 5


def test_a_failing_point_takes_the_strongest_candidate_and_is_flagged():
    n = len(STATIONS)
    grass = np.full(n, 1.5)
    stone = np.full(n, 2.5)
    mat = np.full(n, 1.8)
    grass[10], stone[10], mat[10] = 0.6, 0.9, 0.75     # at 100 m nothing is stable; stone is the strongest
    margin = np.column_stack([grass, mat, stone])
    cost = np.column_stack([np.full(n, 10.0), np.full(n, 20.0), np.full(n, 40.0)])
    s = cheapest_schedule(STATIONS, margin, cost, 0.0)
    assert s.failing.tolist() == [i == 10 for i in range(n)]
    assert [(t.start, t.end, t.choice) for t in s.stretches] == [(0.0, 90.0, 0), (90.0, 110.0, 2), (110.0, 200.0, 0)]
    allowed, failing = allowed_candidates(margin)
    assert allowed[10].tolist() == [False, False, True] and failing.sum() == 1
    # two candidates equally strong there (within 1e-9 relative): both allowed, the cheaper is carried
    margin[10, 1] = 0.9 * (1 + 1e-12)
    s = cheapest_schedule(STATIONS, margin, cost, 0.0)
    assert [t.choice for t in s.stretches] == [0, 1, 0] and s.failing[10]


def test_a_run_shorter_than_the_minimum_is_one_stretch():
    x = [0.0, 5.0, 10.0, 12.0]
    margin = [[1.2, INF], [1.2, INF], [1.2, INF], [0.8, INF]]       # grass fails at the last point
    cost = [[10.0, 50.0]] * 4
    s = cheapest_schedule(x, margin, cost, 15.0)
    (only,) = s.stretches
    assert (only.choice, only.first, only.last, only.cost) == (1, 0, 3, pytest.approx(600.0))
    # with a minimum the run does reach, grass may stop at 10 m only if its stretch is long enough: 10 m is
    assert [t.choice for t in cheapest_schedule(x, margin, cost, 10.0).stretches] == [1]
    assert [t.choice for t in cheapest_schedule(x, margin, cost, 2.0).stretches] == [0, 1]
    # no candidate allowed at every point: refused, saying the run must be one stretch
    margin = [[1.2, NAN], [1.2, 1.0], [1.2, 1.0], [0.8, 1.0]]
    with pytest.raises(NoSolutionError, match=r"from 0 m to 12.0 m is shorter than the minimum stretch \(15.0 m\)"):
        cheapest_schedule(x, margin, cost, 15.0)


def test_the_schedule_arrays_are_read_only():
    s = steep_middle(0.0)
    with pytest.raises(ValueError):
        s.choice_at[0] = 1
    with pytest.raises(ValueError):
        s.failing[0] = True


# -- no schedule: the message names the stations and says why --------------------------------------------------------

def two_demands(gap):
    """Only candidate 0 is allowed at 120 m, only candidate 1 at 120 m + gap; both everywhere else."""
    x = np.array([0.0, 40.0, 80.0, 120.0, 120.0 + gap, 170.0, 220.0])
    margin = np.full((7, 2), 1.5)
    margin[3, 1] = NAN
    margin[4, 0] = 0.5
    return x, margin, np.full((7, 2), 20.0)


def test_two_points_needing_different_candidates_too_close_together():
    x, margin, cost = two_demands(10.0)
    with pytest.raises(NoSolutionError) as caught:
        cheapest_schedule(x, margin, cost, 15.0)
    message = caught.value.args[0]
    assert str(message) == ("no buildable lining schedule: between 120 m and 130 m no candidate is allowed over a "
                            "stretch of at least 15.0 m")
    assert in_units(message, US) == ("no buildable lining schedule: between 394 ft and 427 ft no candidate is "
                                     "allowed over a stretch of at least 49.2 ft")
    # farther apart than the minimum... still not: the segment between them needs both ends allowed
    x, margin, cost = two_demands(30.0)
    with pytest.raises(NoSolutionError, match="between 120 m and 150 m no candidate is allowed over a stretch"):
        cheapest_schedule(x, margin, cost, 15.0)
    # with a point between them where both are allowed, a change there is buildable
    x = np.array([0.0, 40.0, 80.0, 120.0, 140.0, 160.0, 220.0])
    margin = np.full((7, 2), 1.5)
    margin[3, 1], margin[5, 0] = NAN, 0.5
    s = cheapest_schedule(x, margin, np.full((7, 2), 20.0), 15.0)
    assert [(t.end, t.choice) for t in s.stretches][0] == (140.0, 0)


def test_stretches_that_cannot_be_joined():
    # candidate 0 at 0-20 m, candidate 1 at 10-30 m: each segment can be covered, but a change at 10 m leaves
    # 10 m of candidate 0 and a change at 20 m leaves 10 m of candidate 1, under a 15 m minimum
    x = [0.0, 10.0, 20.0, 30.0]
    margin = [[2.0, NAN], [2.0, 2.0], [2.0, 2.0], [0.5, 2.0]]
    with pytest.raises(NoSolutionError, match=r"between 10.0 m and 20.0 m the stretches cannot be joined.* 15.0 m"):
        cheapest_schedule(x, margin, [[1.0, 1.0]] * 4, 15.0)
    assert len(cheapest_schedule(x, margin, [[1.0, 1.0]] * 4, 10.0).stretches) == 2


def test_a_point_where_no_candidate_can_be_used():
    x = [0.0, 10.0, 20.0, 30.0]
    margin = [[2.0, 1.0], [2.0, 1.0], [NAN, NAN], [0.5, 2.0]]
    with pytest.raises(NoSolutionError, match=r"no candidate can be used at 20.0 m \(every margin there is NaN\)"):
        cheapest_schedule(x, margin, [[1.0, 1.0]] * 4, 0.0)


def test_no_minimum_and_no_candidate_at_both_ends_of_a_segment():
    x = [0.0, 10.0, 20.0]
    margin = [[2.0, 0.5], [0.5, 2.0], [0.5, 2.0]]
    with pytest.raises(NoSolutionError, match="between 0 m and 10.0 m no candidate is allowed at both ends"):
        cheapest_schedule(x, margin, [[1.0, 1.0]] * 3, 0.0)


# -- inputs refused -----------------------------------------------------------------------------------------------

GOOD = dict(stations=[0.0, 10.0, 20.0], margin=[[1.2, INF]] * 3, cost_per_length=[[10.0, 50.0]] * 3, min_length=5.0)

REFUSED = [
    ("one point", dict(stations=[0.0], margin=[[1.2]], cost_per_length=[[1.0]]), "stations", "at least 2"),
    ("not increasing", dict(stations=[0.0, 10.0, 10.0]), "stations", "increase strictly, got 10 m after 10 m"),
    ("decreasing", dict(stations=[0.0, 20.0, 10.0]), "stations", "got 10 m after 20 m"),
    ("infinite station", dict(stations=[0.0, 10.0, INF]), "stations", "finite numbers, got inf"),
    ("NaN station", dict(stations=[0.0, NAN, 20.0]), "stations", "finite numbers, got nan"),
    ("two-dimensional stations", dict(stations=[[0.0, 10.0, 20.0]]), "stations", "one-dimensional"),
    ("text", dict(stations="0, 10, 20"), "stations", "array of numbers"),
    ("margin rows", dict(margin=[[1.2, INF]] * 2), "margin", "N = 3 stations, got shape (2, 2)"),
    ("margin one-dimensional", dict(margin=[1.2, 1.2, 1.2]), "margin", "shape (N, K)"),
    ("no candidate", dict(margin=np.zeros((3, 0)), cost_per_length=np.zeros((3, 0))), "margin", "K >= 1"),
    ("negative margin", dict(margin=[[1.2, INF], [-0.5, INF], [1.2, INF]]), "margin", "got -0.5 at point 1"),
    ("minus infinity", dict(margin=[[1.2, -INF]] * 3), "margin", "got -inf"),
    ("cost shape", dict(cost_per_length=[[10.0]] * 3), "cost_per_length", "shape of margin (3, 2)"),
    ("negative cost", dict(cost_per_length=[[10.0, 50.0], [10.0, -1.0], [10.0, 50.0]]), "cost_per_length",
     "must be >= 0, got -1 at point 1, candidate 1"),
    ("missing cost", dict(cost_per_length=[[10.0, NAN]] * 3), "cost_per_length", "NaN only where the margin"),
    ("infinite cost", dict(cost_per_length=[[10.0, INF]] * 3), "cost_per_length", "got inf"),
    ("negative minimum", dict(min_length=-1.0), "min_length", "got -1"),
    ("infinite minimum", dict(min_length=INF), "min_length", "finite"),
    ("minimum as a list", dict(min_length=[5.0]), "min_length", "one number"),
    ("minimum as text", dict(min_length="5"), "min_length", "one number"),
]


@pytest.mark.parametrize("changes, field, words", [r[1:] for r in REFUSED], ids=[r[0] for r in REFUSED])
def test_bad_inputs_are_refused_naming_the_field(changes, field, words):
    with pytest.raises(InputError) as caught:
        cheapest_schedule(**{**GOOD, **changes})
    assert caught.value.field == field and words in str(caught.value)


def test_the_good_inputs_of_the_refusals_are_accepted():
    # so that each refusal above is due to its own change; a missing price where the margin is NaN is accepted
    assert len(cheapest_schedule(**GOOD).stretches) == 1
    changed = {**GOOD, "margin": [[1.2, NAN]] * 3, "cost_per_length": [[10.0, NAN]] * 3}
    assert cheapest_schedule(**changed).total_cost == pytest.approx(200.0)


def test_a_candidate_cheapest_everywhere_gives_the_table_answer(monkeypatch):
    """A candidate allowed at every point and cheaper than every other on every segment is the schedule by itself,
    found without the table (rule 4: nothing else comes within the rounding allowance of it); the schedule is the
    one the table gives (the short cut switched off), on invented runs where it applies and where it does not."""
    import hydraulics.lining_schedule as ls
    rng = np.random.default_rng(8)
    taken, short_cut = [], ls._sole_cheapest
    monkeypatch.setattr(ls, "_sole_cheapest", lambda *a: taken.append(short_cut(*a)) or taken[-1])
    for _ in range(300):
        n, k_count = int(rng.integers(2, 60)), int(rng.integers(1, 5))
        x, margin, cost, min_length = random_run(rng, n, k_count)
        k = int(rng.integers(k_count))
        margin[:, k] = rng.choice([1.2, INF], n)
        others = np.delete(cost, k, axis=1)
        floor = np.nanmin(np.where(np.isnan(others), INF, others), axis=1, initial=100.0) if k_count > 1 else 100.0
        cost[:, k] = floor * rng.choice([0.5, 0.99, 1.0, 1.3], p=[0.5, 0.2, 0.1, 0.2])
        try:
            fast = cheapest_schedule(x, margin, cost, min_length)
        except NoSolutionError:
            continue
        with monkeypatch.context() as table_only:
            table_only.setattr(ls, "_sole_cheapest", lambda *a: None)
            slow = cheapest_schedule(x, margin, cost, min_length)
        assert [(s.first, s.last, s.choice, s.cost) for s in fast.stretches] == \
            [(s.first, s.last, s.choice, s.cost) for s in slow.stretches]
        assert (fast.total_cost, fast.choice_at.tolist(), fast.failing.tolist()) == \
            (slow.total_cost, slow.choice_at.tolist(), slow.failing.tolist())
    used = sum(t is not None for t in taken)
    assert used > 80 and len(taken) - used > 40, (used, len(taken))
