"""Curves of one channel over a range of depths: specific energy and the Manning rating.

Pure numpy; the window draws them, the design sheet may print them.
"""

from __future__ import annotations

import numpy as np

from . import validate
from .constants import G
from .sections import Section
from .solvers import flow_at_depth


def specific_energy(section: Section, flow, depth):
    """Specific energy above the invert, E = y + Q^2 / (2 g A^2) [m].

    Chow, V. T., *Open-Channel Hydraulics*, McGraw-Hill, 1959, Sec. 3-1
    (specific energy with the velocity-distribution coefficient alpha = 1 and
    a small bed slope, so that the pressure head equals the depth).

    Parameters
    ----------
    section : Section
        Channel cross-section.
    flow : float
        Discharge Q [m^3/s], > 0.
    depth : float or ndarray
        Depths y [m] above the invert, > 0 and at most the section's full depth.

    Returns
    -------
    float or ndarray
        E [m], same shape as ``depth``.

    Notes
    -----
    For a given flow E has one minimum, at critical depth; every other energy
    is reached at two alternate depths, one sub- and one supercritical
    (Chow 1959, Sec. 3-2). In a rectangle E_min = 1.5 y_c.
    """
    q = validate.positive("flow", flow)
    area = section.properties(depth).area
    return validate.positive("depth", depth) + q * q / (2 * G * area * area)


def rating_curve(section: Section, slope, n, depths):
    """Uniform-flow discharge at each depth by Manning's equation, Q(y) [m^3/s].

    Chow 1959, Eq. 5-6 (k = 1 in SI), through :func:`hydraulics.flow_at_depth`;
    ``n`` may be a number or a depth-dependent roughness model.

    Parameters
    ----------
    section : Section
        Channel cross-section.
    slope : float
        Bed slope S [m/m].
    n : float, roughness model or None
        Manning's n [s/m^(1/3)] (None for a surveyed section with its own n).
    depths : ndarray
        Depths y [m], > 0 and at most the section's full depth.

    Returns
    -------
    ndarray
        Q [m^3/s] for each depth.
    """
    y = np.atleast_1d(np.asarray(depths, dtype=float))
    return np.atleast_1d(flow_at_depth(section, y, slope, n))
