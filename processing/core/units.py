# SPDX-License-Identifier: GPL-2.0-or-later
"""Physical constants and unit conversions (one place for every number with a unit).

SI units inside the core; knots, nautical miles, hours and feet only at the boundary.
Sources: 1 kn = 1852 m / 3600 s and 1 NM = 1852 m exactly (International nautical mile,
1929; BIPM SI Brochure, 9th ed., Table 8); 1 ft = 0.3048 m exactly (international yard and
pound agreement, 1959); standard gravity g_n = 9.80665 m/s^2 (3rd CGPM, 1901).
"""
from __future__ import annotations

import math

import numpy as np
from numpy.typing import ArrayLike, NDArray

FloatArray = NDArray[np.float64]

G_STANDARD_M_S2: float = 9.80665
"""Standard acceleration of gravity [m/s^2] (3rd CGPM 1901)."""

G_SHIP_M_S2: float = 9.81
"""Gravity used by the ship-motion and comfort formulas' source implementations [m/s^2]."""

RHO_SEAWATER_KG_M3: float = 1025.0
"""Nominal sea-water density [kg/m^3] (common practice, no source)."""

KNOT_M_S: float = 1852.0 / 3600.0
"""One knot in m/s (exact by definition)."""

NAUTICAL_MILE_M: float = 1852.0
"""One international nautical mile in metres (exact by definition)."""

FOOT_M: float = 0.3048
"""One international foot in metres (exact by definition)."""

DEG_PER_RAD: float = 180.0 / math.pi
RAD_PER_DEG: float = math.pi / 180.0
SECONDS_PER_HOUR: float = 3600.0


def m_s_from_kn(speed_kn: ArrayLike) -> FloatArray:
    """Speed in m/s from knots."""
    return np.asarray(speed_kn, dtype=float) * KNOT_M_S


def kn_from_m_s(speed_m_s: ArrayLike) -> FloatArray:
    """Speed in knots from m/s."""
    return np.asarray(speed_m_s, dtype=float) / KNOT_M_S


def m_from_nm(distance_nm: ArrayLike) -> FloatArray:
    """Distance in metres from nautical miles."""
    return np.asarray(distance_nm, dtype=float) * NAUTICAL_MILE_M


def nm_from_m(distance_m: ArrayLike) -> FloatArray:
    """Distance in nautical miles from metres."""
    return np.asarray(distance_m, dtype=float) / NAUTICAL_MILE_M


def m_from_ft(length_ft: ArrayLike) -> FloatArray:
    """Length in metres from feet."""
    return np.asarray(length_ft, dtype=float) * FOOT_M


def wrap_deg(angle_deg: ArrayLike) -> FloatArray:
    """Angle wrapped to [0, 360) degrees."""
    out = np.mod(np.asarray(angle_deg, dtype=float), 360.0)
    # np.mod(-1e-17, 360) == 360.0 in floating point: fold that back to 0.
    return np.where(out >= 360.0, 0.0, out)
