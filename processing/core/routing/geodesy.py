# SPDX-License-Identifier: GPL-2.0-or-later
"""Geodesics for the routing lattice: inverse and direct problems, points along legs.

WGS84 geodesics after Karney C.F.F. (2013) "Algorithms for geodesics", J. Geodesy 87(1)
43-55, through the one geodesic helper of :mod:`..passage.route` (``pyproj.Geod``). A
point at distance s along the geodesic from P1 with forward azimuth az1 is the direct problem
(lon, lat, back azimuth) = fwd(P1, az1, s); the local course there is back azimuth + 180 deg.
"""
from __future__ import annotations

from typing import Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..passage.route import geod_call
from ..units import FloatArray, wrap_deg

__all__ = ["inverse", "direct", "points_along"]


def inverse(lon1: ArrayLike, lat1: ArrayLike, lon2: ArrayLike, lat2: ArrayLike) -> Tuple[FloatArray, FloatArray, FloatArray]:
    """Forward azimuth at P1, forward azimuth at P2 [deg true] and length [m] of each geodesic."""
    a = [np.atleast_1d(np.asarray(v, dtype=float)) for v in (lon1, lat1, lon2, lat2)]
    a = list(np.broadcast_arrays(*a))
    if a[0].size == 0:
        e = np.zeros(0)
        return e, e, e
    az12, az21, s = geod_call("inv", *(v.ravel() for v in a))
    return wrap_deg(az12), wrap_deg(az21 + 180.0), s


def direct(lon1: ArrayLike, lat1: ArrayLike, az1_deg: ArrayLike, s_m: ArrayLike) -> Tuple[FloatArray, FloatArray, FloatArray]:
    """Position (lon, lat) [deg] and local course [deg true] at distance ``s_m`` [m] along
    the geodesic leaving P1 on azimuth ``az1_deg``."""
    a = list(np.broadcast_arrays(*(np.atleast_1d(np.asarray(v, dtype=float)) for v in (lon1, lat1, az1_deg, s_m))))
    if a[0].size == 0:
        e = np.zeros(0)
        return e, e, e
    lon, lat, baz = geod_call("fwd", *(v.ravel() for v in a))
    lon = np.where(lon >= 180.0, lon - 360.0, np.where(lon < -180.0, lon + 360.0, lon))
    return lon, lat, wrap_deg(baz + 180.0)


def points_along(lon1: FloatArray, lat1: FloatArray, lon2: FloatArray, lat2: FloatArray,
                 step_m: float, min_points: int = 2) -> Tuple[NDArray[np.int64], FloatArray, FloatArray, FloatArray, FloatArray]:
    """Points along each of n geodesics P1 -> P2, both ends included, no more than ``step_m``
    apart (at least ``min_points`` per geodesic, equal spacing).

    Returns (owner (N,) index of the geodesic, s_m (N,) distance from its P1 [m], lon, lat,
    course [deg true]), points in order along each geodesic, geodesics in input order.
    """
    az12, _, length = inverse(lon1, lat1, lon2, lat2)
    m = np.maximum(np.ceil(length / float(step_m)).astype(np.int64) + 1, int(min_points))
    owner = np.repeat(np.arange(length.size, dtype=np.int64), m)
    first = np.concatenate(([0], np.cumsum(m)[:-1]))
    j = np.arange(owner.size, dtype=np.int64) - first[owner]
    s = length[owner] * j / (m[owner] - 1)
    lon, lat, course = direct(np.asarray(lon1, float)[owner], np.asarray(lat1, float)[owner], az12[owner], s)
    ends = s == 0.0
    lon[ends], lat[ends] = np.asarray(lon1, float)[owner][ends], np.asarray(lat1, float)[owner][ends]
    last = j == m[owner] - 1
    lon[last], lat[last] = np.asarray(lon2, float)[owner][last], np.asarray(lat2, float)[owner][last]
    return owner, s, lon, lat, course
