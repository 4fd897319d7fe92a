"""hydraulics.collector: the cyclic garbage collector held during a long profile, and always given back.

Python Standard Library, ``gc`` module: ``gc.disable``, ``gc.enable``, ``gc.isenabled``. The collector is
process-wide, so the rule tested is that a computation leaves it as it found it (common practice for code that
holds it).
"""

import gc

import numpy as np
import pytest

import hydraulics as hy
import hydraulics.water_surface as wsm
from hydraulics.collector import collector_held


@pytest.fixture(autouse=True)
def collector_on():
    gc.enable()
    yield
    gc.enable()


def test_held_inside_and_given_back():
    with collector_held():
        assert not gc.isenabled()
    assert gc.isenabled()


def test_given_back_after_an_error():
    with pytest.raises(ValueError):
        with collector_held():
            raise ValueError("inside")
    assert gc.isenabled()


def test_left_off_when_found_off():
    gc.disable()
    with collector_held():
        assert not gc.isenabled()
    assert not gc.isenabled()


def test_nested_holds_give_it_back_once_outermost_ends():
    with collector_held():
        with collector_held():
            pass
        assert not gc.isenabled()
    assert gc.isenabled()


def test_a_profile_holds_it_and_gives_it_back(monkeypatch):
    seen = []
    nodes = wsm._nodes

    def spy(*args):
        seen.append(gc.isenabled())
        return nodes(*args)

    monkeypatch.setattr(wsm, "_nodes", spy)
    x = np.linspace(0.0, 200.0, 21)
    ws = wsm.water_surface(x, 10.0 - 0.001 * x, hy.Trapezoid(bottom_width=1.0, side_slope=2.0), 0.015, 1.0)
    assert seen == [False] and gc.isenabled()
    assert np.all(np.isfinite(ws.depth))
    # an input error raised inside gives it back too
    with pytest.raises(hy.InputError):
        wsm.water_surface(x, 10.0 - 0.001 * x, hy.Trapezoid(bottom_width=1.0, side_slope=2.0), 0.015, -1.0)
    assert gc.isenabled()
