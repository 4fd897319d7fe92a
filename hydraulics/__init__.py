"""Ditchwright's hydraulic core: pure numpy/scipy, SI units throughout.

    import hydraulics as hy
    section = hy.Trapezoid(bottom_width=0.6, side_slope=3.0)
    y = hy.normal_depth(section, flow=0.8, slope=0.004, n=0.030)

No GUI, plotting or PDF library is imported here; the front end converts units
at its edges (see :mod:`hydraulics.units`).
"""

from . import units
from .constants import G, GAMMA_WATER, K_MANNING_SI, NU_WATER, RHO_WATER
from .errors import ConvergenceError, HydraulicsError, InputError, NoSolutionError
from .sections import (CIRCLE_CAPACITY_RATIO, SHAPES, Circle, Geometry, Irregular, Parabola, Rectangle, Section,
                       Trapezoid, Triangle, section_from_dict)
from .analysis import NEAR_CRITICAL_BAND, ChannelResult, analyse, flow_regime
from .design import bottom_width_for_depth, slope_range_for_velocity
from .solvers import (FLOW_TOLERANCE, DepthSolution, critical_depth, flow_at_depth, max_flow, normal_depth,
                      solve_critical_depth, solve_normal_depth)

__all__ = [
    "units", "G", "GAMMA_WATER", "K_MANNING_SI", "NU_WATER", "RHO_WATER",
    "ConvergenceError", "HydraulicsError", "InputError", "NoSolutionError",
    "CIRCLE_CAPACITY_RATIO", "SHAPES", "Circle", "Geometry", "Irregular", "Parabola", "Rectangle", "Section",
    "Trapezoid", "Triangle", "section_from_dict",
    "FLOW_TOLERANCE", "DepthSolution", "critical_depth", "flow_at_depth", "max_flow", "normal_depth",
    "solve_critical_depth", "solve_normal_depth",
    "NEAR_CRITICAL_BAND", "ChannelResult", "analyse", "flow_regime",
    "bottom_width_for_depth", "slope_range_for_velocity",
]
