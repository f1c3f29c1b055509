# SPDX-License-Identifier: GPL-2.0-or-later
"""Which legs a track may use: off barriers, off water shallower than the minimum depth, off
the forecast's land, inside the forecast grid.

A leg (a geodesic) is checked at points no more than :data:`CHECK_STEP_NM` apart, ends
included: depth from the bathymetry at each point (shallower than ``min_depth_m``, or land in
the bathymetry, is illegal; no depth data is allowed, as deep water is assumed elsewhere); the
forecast's land mask at each point (no source has sea data within one grid cell: the sampler's
bilinear neighbours are all land or missing; points within ``harbour_radius_m`` of the start
or the end are exempt, since a harbour usually lies in a land cell of a coarse forecast; this
is the same radius within which the passage engine takes the nearest sea cell); inside the
grid of at least one source; and the chords between consecutive points against the barrier
polygons (:mod:`.barriers`).
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Optional, Sequence, Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..flags import SampleFlag
from ..units import NAUTICAL_MILE_M, FloatArray
from ..validation import SeawayInputError
from .barriers import Barriers
from .geodesy import inverse, points_along

__all__ = ["CHECK_STEP_NM", "BARRIER", "SHALLOW", "FORECAST_LAND", "OFF_GRID", "REASON_TEXT", "Constraints",
           "point_reasons", "leg_reasons"]

CHECK_STEP_NM: float = 0.5
"""Largest gap between the points at which a leg is checked [NM]."""

BARRIER, SHALLOW, FORECAST_LAND, OFF_GRID = 1, 2, 4, 8
REASON_TEXT = {BARRIER: "crosses a BARRIERS polygon", SHALLOW: "crosses water shallower than MIN_DEPTH_M",
               FORECAST_LAND: "crosses land in the forecast", OFF_GRID: "leaves the forecast grid"}


@dataclass(frozen=True)
class Constraints:
    """Everything a leg is checked against: ``barriers`` (or None), ``depth`` an open
    bathymetry (or None), ``min_depth_m`` [m], ``sea_states`` open sources, and the start and
    end (lon, lat) with ``harbour_radius_m`` (forecast-land exemption)."""

    barriers: Optional[Barriers]
    depth: Optional[object]
    min_depth_m: float
    sea_states: Sequence[object]
    start: Tuple[float, float]
    end: Tuple[float, float]
    harbour_radius_m: float


def _forecast_reasons(con: Constraints, lon: FloatArray, lat: FloatArray) -> NDArray[np.int64]:
    """FORECAST_LAND / OFF_GRID per point: land where no source has sea data, off the grid
    where every source's grid misses the point (land mask read at each source's first time)."""
    has_sea = np.zeros(lon.size, dtype=bool)
    in_grid = np.zeros(lon.size, dtype=bool)
    for src in con.sea_states:
        t0 = getattr(src, "time_range_utc")[0]
        try:
            got = src.sample(lon, lat, t0, land_search_km=0.0)
        except SeawayInputError:
            continue  # every point outside this source's grid
        f = np.asarray(got.flags, dtype=np.int64)
        in_grid |= (f & int(SampleFlag.OUTSIDE_GRID)) == 0
        has_sea |= np.asarray(got.valid, dtype=bool)
    out = np.where(in_grid, 0, OFF_GRID).astype(np.int64)
    out[in_grid & ~has_sea] |= FORECAST_LAND
    near = np.zeros(lon.size, dtype=bool)
    for x, y in (con.start, con.end):
        near |= inverse(x, y, lon, lat)[2] <= con.harbour_radius_m
    out[near] &= ~FORECAST_LAND
    return out


def point_reasons(con: Constraints, lon: ArrayLike, lat: ArrayLike) -> NDArray[np.int64]:
    """Bit mask of the reasons (BARRIER, SHALLOW, FORECAST_LAND, OFF_GRID) each point is illegal."""
    x, y = np.atleast_1d(np.asarray(lon, float)), np.atleast_1d(np.asarray(lat, float))
    out = np.zeros(x.size, dtype=np.int64)
    if x.size == 0:
        return out
    if con.barriers is not None and not con.barriers.empty:
        out[con.barriers.inside(x, y) >= 0] |= BARRIER
    if con.depth is not None:
        ds = con.depth.sample(x, y)
        d, f = np.asarray(ds.depth_m, float), np.asarray(ds.flags, np.int64)
        shallow = (np.isfinite(d) & (d < con.min_depth_m)) | ((f & int(SampleFlag.DEPTH_ON_LAND)) != 0)
        out[shallow] |= SHALLOW
    return out | _forecast_reasons(con, x, y)


def leg_reasons(con: Constraints, lon0: ArrayLike, lat0: ArrayLike, lon1: ArrayLike, lat1: ArrayLike) -> NDArray[np.int64]:
    """Bit mask of the reasons each leg (geodesic lon0, lat0 -> lon1, lat1) is illegal (0 = legal)."""
    a = [np.atleast_1d(np.asarray(v, float)) for v in (lon0, lat0, lon1, lat1)]
    out = np.zeros(a[0].size, dtype=np.int64)
    if out.size == 0:
        return out
    owner, _, x, y, _ = points_along(*a, CHECK_STEP_NM * NAUTICAL_MILE_M)
    np.bitwise_or.at(out, owner, point_reasons(con, x, y) & ~BARRIER)
    if con.barriers is not None and not con.barriers.empty:
        same = owner[1:] == owner[:-1]
        hit = con.barriers.crossed(x[:-1][same], y[:-1][same], x[1:][same], y[1:][same])
        np.bitwise_or.at(out, owner[:-1][same][hit], BARRIER)
    return out
