# SPDX-License-Identifier: GPL-2.0-or-later
"""The sea's cost of legs at candidate start times, evaluated in bulk by the passage steps.

Every (leg, start time) pair is turned into samples along the leg's geodesic (both ends, no
more than ``step_nm`` apart) timed at constant speed from that start; all samples of all
pairs form ONE :class:`..passage.plan.Track` which the passage steps answer in one go: the sea
state by :func:`..passage.sample.sample_sea_at` and the motions by
:func:`..passage.respond.respond_motions` on the response-table path. Nothing of sampling or
response is computed here.

Cost of a pair (the exposure the search minimises): the motion sickness dose increment
D = integral of a_w(t)**2 dt over the leg [m**2/s**3], a_w the ISO 2631-1 Wf-weighted RMS
vertical acceleration at the station [m/s**2], trapezoid rule over the samples; summed
over a track, MSDV = sqrt(D) is its motion sickness dose value at arrival (ISO 2631-1:1997
Annex D; the same dose the passage reports as ``msdv_cum``). A pair with a sample without
results (off the forecast's time range, no sea) gets NaN (``complete`` False).
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Optional, Sequence

import numpy as np
from numpy.typing import NDArray

from ..passage.plan import Track
from ..passage.progress import Progress, Span
from ..passage.respond import respond_motions
from ..passage.sample import DEFAULT_LAND_SEARCH_KM, sample_sea_at
from ..units import KNOT_M_S, NAUTICAL_MILE_M, FloatArray
from ..validation import SeawayInputError
from .geodesy import points_along

__all__ = ["LegPoints", "LegCosts", "ResponseSettings", "leg_points", "leg_costs", "MAX_SAMPLES_PER_CALL"]

MAX_SAMPLES_PER_CALL: int = 400_000
"""Samples per passage-step call (bounds memory; progress and cancel between calls)."""


@dataclass(frozen=True)
class LegPoints:
    """Sample points of n legs: ``first`` (n,) index of each leg's first point, ``count`` (n,),
    ``s_m`` distance from the leg's start [m], ``lon_deg``, ``lat_deg``, ``course_deg``,
    ``length_m`` (n,)."""

    first: NDArray[np.int64]
    count: NDArray[np.int64]
    s_m: FloatArray
    lon_deg: FloatArray
    lat_deg: FloatArray
    course_deg: FloatArray
    length_m: FloatArray


@dataclass(frozen=True)
class ResponseSettings:
    """What the passage steps need besides the track: sources, vessel and spectrum settings."""

    departure_utc: np.datetime64
    speed_kn: float
    sea_states: Sequence[object]
    profile: object
    station: Optional[str] = None
    depth: Optional[object] = None
    gamma: float = 3.3
    spread_s: float = 4.0
    long_crested: bool = False
    land_search_km: float = DEFAULT_LAND_SEARCH_KM


@dataclass(frozen=True)
class LegCosts:
    """Per (leg, start) pair: ``dose_m2_s3`` integral of a_w**2 dt [m**2/s**3], ``msi_max_pct``
    highest MSI on the leg [%], ``complete`` every sample has results."""

    dose_m2_s3: FloatArray
    msi_max_pct: FloatArray
    complete: NDArray[np.bool_]


def leg_points(lon0: FloatArray, lat0: FloatArray, lon1: FloatArray, lat1: FloatArray, step_nm: float,
               min_points: int = 3) -> LegPoints:
    """Sample points along each leg (module docstring)."""
    owner, s, lon, lat, course = points_along(lon0, lat0, lon1, lat1, step_nm * NAUTICAL_MILE_M, min_points)
    count = np.bincount(owner, minlength=np.size(lon0)).astype(np.int64)
    first = np.concatenate(([0], np.cumsum(count)[:-1])).astype(np.int64)
    length = s[first + count - 1] if count.size else np.zeros(0)
    return LegPoints(first, count, s, lon, lat, course, length)


def _one_call(pts: LegPoints, leg: NDArray[np.int64], start_s: FloatArray, rs: ResponseSettings,
              span: Span) -> LegCosts:
    """Costs of the pairs (leg[p], start_s[p]) with one sampling and one response call."""
    cnt = pts.count[leg]
    pair = np.repeat(np.arange(leg.size), cnt)
    idx = pts.first[leg][pair] + np.arange(pair.size) - np.repeat(np.cumsum(cnt) - cnt, cnt)
    u = rs.speed_kn * KNOT_M_S
    t_s = start_s[pair] + pts.s_m[idx] / u
    eta = rs.departure_utc + np.round(t_s * 1000.0).astype("timedelta64[ms]")
    track = Track(lon_deg=pts.lon_deg[idx], lat_deg=pts.lat_deg[idx], course_deg=pts.course_deg[idx],
                  speed_kn=np.full(idx.size, float(rs.speed_kn)), eta_utc=eta)
    nan = np.full(leg.size, np.nan)
    try:
        sea = sample_sea_at(track, rs.sea_states, depth=rs.depth, land_search_km=rs.land_search_km,
                            progress=span.part(0.0, 0.6))
    except SeawayInputError:
        return LegCosts(nan, nan.copy(), np.zeros(leg.size, dtype=bool))
    mot = respond_motions(track, sea, rs.profile, station=rs.station, gamma=rs.gamma, spread_s=rs.spread_s,
                          long_crested=rs.long_crested, method="table", progress=span.part(0.6, 1.0))
    aw, msi = mot.outputs["vacc_wf_rms_m_s2"], mot.outputs["msi_pct"]
    first = np.r_[True, pair[1:] != pair[:-1]]
    last = np.r_[pair[1:] != pair[:-1], True]
    dt = (pts.length_m[leg] / u / np.maximum(cnt - 1, 1))[pair]
    w = dt * np.where(first | last, 0.5, 1.0)
    ok = np.isfinite(aw)
    dose = np.bincount(pair, weights=np.where(ok, w * aw ** 2, 0.0), minlength=leg.size)
    complete = np.bincount(pair, weights=(~ok).astype(float), minlength=leg.size) == 0
    msi_max = np.full(leg.size, -np.inf)
    np.maximum.at(msi_max, pair[np.isfinite(msi)], msi[np.isfinite(msi)])
    return LegCosts(np.where(complete, dose, np.nan), np.where(np.isfinite(msi_max), msi_max, np.nan), complete)


def leg_costs(pts: LegPoints, leg: NDArray[np.int64], start_s: FloatArray, rs: ResponseSettings,
              progress: Optional[Progress] = None) -> LegCosts:
    """Costs of every pair (leg[p] started ``start_s[p]`` seconds after departure), in as few
    passage-step calls as :data:`MAX_SAMPLES_PER_CALL` allows."""
    span = Span(progress, what="track search")
    leg, start_s = np.asarray(leg, np.int64), np.asarray(start_s, float)
    csum = np.cumsum(pts.count[leg])
    cuts = np.searchsorted(csum, np.arange(MAX_SAMPLES_PER_CALL, int(csum[-1]) if csum.size else 0,
                                           MAX_SAMPLES_PER_CALL), side="left")
    bounds = np.unique(np.r_[0, cuts, leg.size])
    parts = []
    for i, (a, b) in enumerate(zip(bounds[:-1], bounds[1:])):
        sub = span.part(i / (bounds.size - 1), (i + 1) / (bounds.size - 1))
        parts.append(_one_call(pts, leg[a:b], start_s[a:b], rs, sub))
        span.check((i + 1) / (bounds.size - 1))
    if not parts:
        e = np.zeros(0)
        return LegCosts(e, e.copy(), np.zeros(0, dtype=bool))
    return LegCosts(*(np.concatenate([getattr(p, k) for p in parts]) for k in ("dose_m2_s3", "msi_max_pct", "complete")))
