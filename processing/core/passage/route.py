# SPDX-License-Identifier: GPL-2.0-or-later
"""Route geodesy on the WGS84 ellipsoid: densified samples, local course, distance, arrival times.

Each leg between two route vertices is a geodesic on WGS84 (a = 6 378 137 m,
1/f = 298.257223563), solved with the algorithms of Karney C.F.F. (2013) "Algorithms for
geodesics", J. Geodesy 87(1) 43-55, doi:10.1007/s00190-012-0578-z, as implemented by PROJ's
geodesic library through ``pyproj.Geod``. A leg is split into equal pieces no longer than the
requested spacing; the course at a sample is the local forward azimuth of the geodesic there
(it changes along a leg). ``pyproj.Geod.fwd``/``inv`` return the BACK azimuth at the far
point (the azimuth from point 2 towards point 1); the forward azimuth is that plus 180 deg.

Times are UTC, ``numpy.datetime64[ms]``; distance in metres; speed in knots only at this
boundary (1 kn = 1852/3600 m/s exactly).
"""
from __future__ import annotations

import datetime as _dt
import warnings
from dataclasses import dataclass
from typing import Tuple, Union

import numpy as np
from numpy.typing import ArrayLike, NDArray
from pyproj import Geod

from ..units import KNOT_M_S, NAUTICAL_MILE_M, FloatArray, wrap_deg
from ..validation import (
    SeawayInputError,
    as_float_array,
    require_in_range,
    require_nonnegative,
    require_positive,
    show,
)

__all__ = [
    "RouteSamples",
    "geod_call",
    "densify_route",
    "arrival_times_utc",
    "elapsed_time_s",
    "leg_duration_s",
    "wrap_lon_deg",
    "DUPLICATE_TOLERANCE_M",
    "MAX_ROUTE_SAMPLES",
]

_GEOD = Geod(ellps="WGS84")


def geod_call(method: str, *arrays: FloatArray) -> Tuple[FloatArray, FloatArray, FloatArray]:
    """``pyproj.Geod.inv``/``fwd`` over 1-D arrays, always returning three float arrays.

    pyproj 3.7 turns a one-element array into a scalar itself, which numpy >= 1.25 deprecates
    (about a thousand warnings per run on Debian 13); one-element inputs are therefore passed
    as Python floats, which is what pyproj means by a scalar.
    """
    args = [np.atleast_1d(np.asarray(a, dtype=float)) for a in arrays]
    if all(a.size == 1 for a in args):
        out = getattr(_GEOD, method)(*(float(a.reshape(())) for a in args))
    else:
        out = getattr(_GEOD, method)(*args)
    n = args[0].shape
    return tuple(np.asarray(o, dtype=float).reshape(n) for o in out)  # type: ignore[return-value]

DUPLICATE_TOLERANCE_M: float = 1e-3
"""Consecutive vertices closer than this (1 mm, geodesic) are duplicates and are dropped."""

MAX_ROUTE_SAMPLES: int = 2_000_000
"""Upper bound on the number of samples densify_route will create (guards against a tiny spacing)."""

DateLike = Union[np.datetime64, _dt.datetime, str]


def wrap_lon_deg(lon_deg: ArrayLike) -> FloatArray:
    """Longitude wrapped to [-180, 180) degrees."""
    lon = as_float_array("lon_deg", lon_deg)
    out = wrap_deg(lon + 180.0) - 180.0
    out = np.where(out >= 180.0, -180.0, out)
    # values already in range are returned bit-for-bit (the mod above can round them)
    return np.where((lon >= -180.0) & (lon < 180.0), lon, out)


@dataclass(frozen=True)
class RouteSamples:
    """Points along a route, in order from departure (all arrays of length n).

    Fields: ``lon_deg`` [-180, 180), ``lat_deg``, ``dist_m`` cumulative geodesic distance from
    the first vertex [m], ``course_deg`` local forward azimuth [deg true, 0..360) (at an inner
    vertex the azimuth leaving it; at the final vertex the arrival azimuth), ``is_vertex``
    True at input vertices, ``segment_index`` index of the (de-duplicated) input leg the sample
    lies on (the final vertex belongs to the last leg).
    """

    lon_deg: FloatArray
    lat_deg: FloatArray
    dist_m: FloatArray
    course_deg: FloatArray
    is_vertex: NDArray[np.bool_]
    segment_index: NDArray[np.int64]

    @property
    def n(self) -> int:
        """Number of samples."""
        return int(self.dist_m.size)


def densify_route(lon_deg: ArrayLike, lat_deg: ArrayLike, spacing_nm: float) -> RouteSamples:
    """Geodesic route samples no more than ``spacing_nm`` apart, keeping every vertex.

    Each leg (vertex i to i+1) is the WGS84 geodesic (Karney 2013, via pyproj.Geod.inv); it is
    cut into m = ceil(s12 / spacing) equal pieces and the points at distances j s12 / m
    (j = 0..m-1) are found with the direct problem (pyproj.Geod.fwd); the final vertex closes
    the route. Consecutive duplicate vertices (closer than 1 mm) are dropped with a warning.
    Works across the antimeridian (the shorter geodesic is taken) and over the poles.

    Parameters
    ----------
    lon_deg, lat_deg : 1-D vertex coordinates [deg], WGS84; latitude in [-90, 90].
    spacing_nm : largest allowed gap between consecutive samples [NM], > 0.

    Returns
    -------
    RouteSamples.

    Raises
    ------
    SeawayInputError
        Shapes differ or are not 1-D, non-finite or out-of-range coordinates, fewer than 2
        distinct vertices (zero-length route), spacing_nm <= 0, or more than
        MAX_ROUTE_SAMPLES samples.
    """
    lon, lat, spacing_m = _checked_vertices(lon_deg, lat_deg, spacing_nm)
    lon, lat = _drop_duplicates(lon, lat)
    az12, az21, seg_len = geod_call("inv", lon[:-1], lat[:-1], lon[1:], lat[1:])
    pieces = _pieces(seg_len, spacing_m, spacing_nm)
    n_seg = seg_len.size
    counts = pieces.astype(np.int64)
    seg_idx = np.repeat(np.arange(n_seg, dtype=np.int64), counts)
    starts = np.concatenate(([0], np.cumsum(counts)[:-1]))
    j = np.arange(seg_idx.size, dtype=np.int64) - starts[seg_idx]
    along = j * (seg_len / pieces)[seg_idx]
    plon, plat, pbaz = geod_call("fwd", lon[:-1][seg_idx], lat[:-1][seg_idx], az12[seg_idx], along)
    course = wrap_deg(pbaz + 180.0)
    vertex = j == 0
    # exact input coordinates and departure azimuths at the vertices
    plon[vertex], plat[vertex], course[vertex] = lon[:-1], lat[:-1], wrap_deg(az12)
    seg_start = np.concatenate(([0.0], np.cumsum(seg_len)[:-1]))
    return RouteSamples(
        lon_deg=wrap_lon_deg(np.append(plon, lon[-1])),
        lat_deg=np.append(plat, lat[-1]),
        dist_m=np.append(seg_start[seg_idx] + along, seg_start[-1] + seg_len[-1]),
        course_deg=np.append(course, wrap_deg(az21[-1] + 180.0)),
        is_vertex=np.append(vertex, True),
        segment_index=np.append(seg_idx, n_seg - 1).astype(np.int64),
    )


def _checked_vertices(lon_deg: ArrayLike, lat_deg: ArrayLike, spacing_nm: float) -> "tuple[FloatArray, FloatArray, float]":
    """Vertices as 1-D arrays (longitudes wrapped to [-180, 180)) and the spacing [m]."""
    lon = as_float_array("lon_deg", lon_deg)
    lat = require_in_range("lat_deg", lat_deg, -90.0, 90.0, unit="deg")
    if lon.ndim != 1 or lat.ndim != 1 or lon.shape != lat.shape:
        raise SeawayInputError(
            f"lon_deg and lat_deg must be 1-D arrays of equal length, got shapes "
            f"{lon.shape} and {lat.shape}"
        )
    spacing = require_positive("spacing_nm", spacing_nm)
    if spacing.ndim != 0:
        raise SeawayInputError(f"spacing_nm must be a scalar, got shape {spacing.shape}")
    if lon.size < 2:
        raise SeawayInputError(f"a route needs at least 2 vertices, got {lon.size}")
    return wrap_lon_deg(lon), lat, float(spacing) * NAUTICAL_MILE_M


def _drop_duplicates(lon: FloatArray, lat: FloatArray) -> "tuple[FloatArray, FloatArray]":
    """Drop consecutive vertices closer than DUPLICATE_TOLERANCE_M (with a warning)."""
    _, _, s_all = geod_call("inv", lon[:-1], lat[:-1], lon[1:], lat[1:])
    dup = np.asarray(s_all, dtype=float) < DUPLICATE_TOLERANCE_M
    if dup.any():
        idx = np.flatnonzero(dup) + 1
        warnings.warn(
            f"densify_route: dropped {idx.size} consecutive duplicate vertex(es) at input "
            f"index {idx.tolist()[:10]}",
            UserWarning,
            stacklevel=3,
        )
        keep = np.ones(lon.size, dtype=bool)
        keep[idx] = False
        lon, lat = lon[keep], lat[keep]
    if lon.size < 2:
        raise SeawayInputError(
            "the route has zero length: fewer than 2 distinct vertices after dropping duplicates"
        )
    return lon, lat


def _pieces(seg_len: FloatArray, spacing_m: float, spacing_nm: float) -> FloatArray:
    """Equal pieces per leg, none longer than the spacing; refuses more than MAX_ROUTE_SAMPLES."""
    pieces = np.maximum(np.ceil(seg_len / spacing_m), 1.0)
    # guard against a rounding-down of s/m above the spacing
    pieces = np.where(seg_len / pieces > spacing_m, pieces + 1.0, pieces)
    total = int(pieces.sum()) + 1
    if total > MAX_ROUTE_SAMPLES:
        raise SeawayInputError(
            f"spacing_nm={show(float(spacing_nm))} would create {total} samples (more than "
            f"{MAX_ROUTE_SAMPLES}); choose a larger spacing"
        )
    return pieces


def _dist_1d(dist_m: ArrayLike) -> FloatArray:
    dist = as_float_array("dist_m", dist_m)
    if dist.ndim != 1 or dist.size < 1:
        raise SeawayInputError(f"dist_m must be a non-empty 1-D array, got shape {dist.shape}")
    step = np.diff(dist)
    if np.any(step < 0):
        i = int(np.flatnonzero(step < 0)[0])
        raise SeawayInputError(
            f"dist_m must be non-decreasing, got dist_m[{i}]={show(dist[i])} > "
            f"dist_m[{i + 1}]={show(dist[i + 1])}"
        )
    return dist


def _stretch_speed_m_s(speed_kn: ArrayLike, n: int) -> FloatArray:
    """Speed [m/s] on the n-1 stretches; speed_kn scalar or per-sample (element 0 ignored)."""
    arr = as_float_array("speed_kn", speed_kn, allow_nan=True)
    if arr.ndim == 0:
        spd = require_positive("speed_kn", arr)
        return np.full(n - 1, float(spd) * KNOT_M_S)
    if arr.shape != (n,):
        raise SeawayInputError(
            f"speed_kn must be a scalar or have one value per sample ({n}), got shape {arr.shape}"
        )
    spd = require_positive("speed_kn", arr[1:])
    return spd * KNOT_M_S


def leg_duration_s(dist_m: ArrayLike, speed_kn: ArrayLike) -> FloatArray:
    """Time [s] to cover ``dist_m`` metres at ``speed_kn`` knots: t = d / (V * 1852/3600).

    Elementwise with broadcasting; dist_m >= 0, speed_kn > 0 (finite).
    """
    dist = require_nonnegative("dist_m", dist_m)
    spd = require_positive("speed_kn", speed_kn)
    return np.asarray(dist / (spd * KNOT_M_S), dtype=float)


def elapsed_time_s(dist_m: ArrayLike, speed_kn: ArrayLike) -> FloatArray:
    """Elapsed time [s] at each sample from the first one.

    t_0 = 0, t_i = t_{i-1} + (d_i - d_{i-1}) / V_i with V_i = speed_kn[i] * 1852/3600 m/s
    (the speed on the stretch ending at sample i; element 0 ignored) or one scalar speed.
    """
    dist = _dist_1d(dist_m)
    if dist.size == 1:
        return np.zeros(1)
    speed = _stretch_speed_m_s(speed_kn, dist.size)
    return np.concatenate(([0.0], np.cumsum(np.diff(dist) / speed)))


def _departure_ms(departure_utc: DateLike) -> np.datetime64:
    """Departure as numpy datetime64[ms] UTC (aware datetimes converted, naive taken as UTC)."""
    if isinstance(departure_utc, str):
        text = departure_utc.strip()
        if text.endswith(("Z", "z")):
            text = text[:-1] + "+00:00"
        try:
            departure_utc = _dt.datetime.fromisoformat(text)
        except ValueError:
            pass  # let numpy try other ISO 8601 forms below
    if isinstance(departure_utc, _dt.datetime):
        if departure_utc.tzinfo is not None:
            departure_utc = departure_utc.astimezone(_dt.timezone.utc).replace(tzinfo=None)
        return np.datetime64(departure_utc, "ms")
    try:
        with warnings.catch_warnings():
            # numpy deprecates parsing zone offsets: refuse them rather than guess
            warnings.simplefilter("error", DeprecationWarning)
            dep = np.datetime64(departure_utc, "ms")
    except (TypeError, ValueError, DeprecationWarning) as exc:
        raise SeawayInputError(
            f"departure_utc must be a UTC datetime, numpy.datetime64 or ISO 8601 text, got "
            f"{show(departure_utc)}"
        ) from exc
    if np.isnat(dep):
        raise SeawayInputError(f"departure_utc must be a valid time, got {show(departure_utc)}")
    return dep


def arrival_times_utc(
    dist_m: ArrayLike, departure_utc: DateLike, speed_kn: ArrayLike
) -> NDArray[np.datetime64]:
    """Arrival time (UTC, datetime64[ms]) at each sample, leaving sample 0 at ``departure_utc``.

    t_i = departure + sum_{j=1..i} (d_j - d_{j-1}) / (speed_kn[j] * 1852/3600), rounded to the
    millisecond; ``speed_kn`` is a scalar or per-sample array whose element i applies on the
    stretch ending at sample i (element 0 ignored).

    Raises
    ------
    SeawayInputError
        dist_m not 1-D, not finite or decreasing; speed <= 0 or non-finite; bad departure.
    """
    dep = _departure_ms(departure_utc)
    elapsed = elapsed_time_s(dist_m, speed_kn)
    ms = np.rint(elapsed * 1000.0)
    if np.any(ms > 9.0e15):  # ~285 000 years: far beyond any passage
        raise SeawayInputError("arrival times overflow: speed_kn is unphysically small")
    return dep + ms.astype(np.int64).astype("timedelta64[ms]")

