# SPDX-License-Identifier: GPL-2.0-or-later
"""Step 1 of a passage: geodesic samples along the leg and the times the vessel reaches them.

A :class:`Track` is any set of (position, time) samples with the vessel's course and speed:
what sampling the sea (:mod:`.sample`) and the motions (:mod:`.respond`) need. A
:class:`PassagePlan` is the track of one leg from one departure, with its distances, vertices
and departure (what the dose, the dwell times and the result record need). The sweep stacks
the tracks of many departures into one :class:`Track` (:meth:`Track.take`).
"""
from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass, replace
from typing import Any

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..plausibility import SPEED_KN, check_range
from ..units import FloatArray
from ..validation import SeawayInputError, as_float_array, require_in_range, require_positive, show

__all__ = ["Track", "PassagePlan", "as_utc_datetime64", "seconds_since", "plan_passage"]


def as_utc_datetime64(name: str, value: object) -> np.datetime64:
    """A UTC instant as ``numpy.datetime64[ms]``.

    Accepts ``numpy.datetime64``, ``datetime.datetime`` (naive = UTC; aware converted to UTC)
    and ISO 8601 text (``2031-05-04T06:00``, ``...Z`` or ``...+02:00``). Anything else raises
    :class:`SeawayInputError` naming ``name`` and the value.
    """
    try:
        if isinstance(value, np.datetime64):
            out = value.astype("datetime64[ms]")
        elif isinstance(value, _dt.datetime):
            if value.tzinfo is not None:
                value = value.astimezone(_dt.timezone.utc).replace(tzinfo=None)
            out = np.datetime64(value, "ms")
        elif isinstance(value, str):
            text = value.strip()
            if text.endswith(("Z", "z")):
                text = text[:-1] + "+00:00"
            parsed = _dt.datetime.fromisoformat(text)
            return as_utc_datetime64(name, parsed)
        else:
            raise TypeError(type(value).__name__)
    except (TypeError, ValueError) as exc:
        raise SeawayInputError(
            f"{name} must be a UTC date-time (ISO 8601 text, datetime or datetime64), got {show(value)}"
        ) from exc
    if np.isnat(out):
        raise SeawayInputError(f"{name} must be a valid date-time, got {show(value)}")
    return out


def seconds_since(t: NDArray[np.datetime64], t0: np.datetime64) -> FloatArray:
    """Seconds from ``t0`` to each time of ``t`` (datetime64) [s]."""
    return (t - t0).astype("timedelta64[ms]").astype(np.float64) / 1000.0


@dataclass(frozen=True)
class Track:
    """Samples in space and time: ``lon_deg``, ``lat_deg`` (WGS84), ``course_deg`` (degrees
    true, going to), ``speed_kn`` speed through the water [kn], ``eta_utc`` (datetime64[ms])."""

    lon_deg: FloatArray
    lat_deg: FloatArray
    course_deg: FloatArray
    speed_kn: FloatArray
    eta_utc: NDArray[np.datetime64]

    @property
    def n(self) -> int:
        return int(self.lon_deg.size)

    def take(self, index: NDArray[np.int64], eta_utc: NDArray[np.datetime64]) -> "Track":
        """The samples ``index`` (repeats allowed) at the times ``eta_utc``, as a plain track."""
        return Track(lon_deg=self.lon_deg[index], lat_deg=self.lat_deg[index],
                     course_deg=self.course_deg[index], speed_kn=self.speed_kn[index], eta_utc=eta_utc)


@dataclass(frozen=True)
class PassagePlan(Track):
    """The track of one leg from one departure.

    Besides the :class:`Track` fields (n samples): ``leg`` index, ``dist_m`` geodesic distance
    from the leg's start [m], ``is_vertex``, ``segment_index`` (index of the input segment) and
    ``departure_utc``.
    """

    leg: int = 0
    dist_m: Any = None
    is_vertex: Any = None
    segment_index: Any = None
    departure_utc: Any = None

    @property
    def elapsed_s(self) -> FloatArray:
        """Seconds since departure at each sample."""
        return seconds_since(self.eta_utc, self.departure_utc)

    def with_departure(self, departure_utc: object) -> "PassagePlan":
        """The same samples with every arrival time shifted to a new departure (for sweeps)."""
        dep = as_utc_datetime64("departure_utc", departure_utc)
        shift = dep - self.departure_utc
        return replace(self, eta_utc=self.eta_utc + shift, departure_utc=dep)


def _leg_vertices(route_lon_deg: ArrayLike, route_lat_deg: ArrayLike) -> "tuple[FloatArray, FloatArray]":
    lon = as_float_array("route_lon_deg", route_lon_deg).ravel()
    lat = require_in_range("route_lat_deg", route_lat_deg, -90.0, 90.0, unit="deg").ravel()
    if lon.size != lat.size:
        raise SeawayInputError(
            f"route_lon_deg and route_lat_deg must have the same length, got {lon.size} and {lat.size}"
        )
    if lon.size < 2:
        raise SeawayInputError(f"a leg needs at least 2 vertices, got {lon.size}")
    return lon, lat


def plan_passage(
    route_lon_deg: ArrayLike,
    route_lat_deg: ArrayLike,
    *,
    departure_utc: object,
    speed_kn: float,
    spacing_nm: float = 1.0,
    leg: int = 0,
) -> PassagePlan:
    """Densify one leg along geodesics and time it at constant speed.

    route_lon_deg, route_lat_deg : vertices of the leg [deg, WGS84], at least two;
    departure_utc : departure instant (see :func:`as_utc_datetime64`); speed_kn : speed through
    the water [kn], > 0; spacing_nm : sample spacing [NM], > 0 (vertices are always samples);
    leg : leg index carried into the results.
    """
    from .route import arrival_times_utc, densify_route

    lon, lat = _leg_vertices(route_lon_deg, route_lat_deg)
    speed = check_range(SPEED_KN, "speed_kn", speed_kn)
    if speed.ndim != 0:
        raise SeawayInputError(f"speed_kn must be one number per leg, got shape {speed.shape}")
    require_positive("spacing_nm", spacing_nm)
    dep = as_utc_datetime64("departure_utc", departure_utc)
    samples = densify_route(lon, lat, float(spacing_nm))
    dist = np.asarray(samples.dist_m, dtype=float)
    if dist.size < 2 or not dist[-1] > 0.0:
        raise SeawayInputError(
            f"leg {leg} has no length (all {lon.size} vertices coincide): draw a route with distinct points"
        )
    return PassagePlan(
        lon_deg=np.asarray(samples.lon_deg, dtype=float), lat_deg=np.asarray(samples.lat_deg, dtype=float),
        course_deg=np.asarray(samples.course_deg, dtype=float), speed_kn=np.full(dist.size, float(speed)),
        eta_utc=np.asarray(arrival_times_utc(dist, dep, float(speed)), dtype="datetime64[ms]"),
        leg=int(leg), dist_m=dist, is_vertex=np.asarray(samples.is_vertex, dtype=bool),
        segment_index=np.asarray(samples.segment_index, dtype=np.int64), departure_utc=dep,
    )
