# SPDX-License-Identifier: GPL-2.0-or-later
"""Turning a lattice path into a track a helmsman can steer.

The rule (ours; common practice, no source, for the thresholds):

1. **Shortcuts** (string pulling, as in any-angle path planning, e.g. Botea A. et al. (2004)
   "Near optimal hierarchical path-finding", J. Game Dev. 1(1) 7-28): among the chains of
   path vertices joined by legal direct geodesics (:mod:`.legality`; at most
   :data:`MAX_SKIP` vertices apart), keep the cheapest: the shortest for the fastest track;
   for the tracks that weigh exposure the one with the least dose (:mod:`.edge_costs`, each
   leg started when the path reaches its first vertex), so no shortcut adds dose.
2. **Waypoints kept**: consecutive legs differ in course by at least :data:`MIN_TURN_DEG` and
   no leg is shorter than :data:`MIN_LEG_NM`; a waypoint breaking either rule is dropped when
   the leg replacing it is legal (else it stays, and the track keeps the turn it needs).

Legs are geodesics between the waypoints kept.
"""
from __future__ import annotations

from typing import Callable, List, Optional

import numpy as np
from numpy.typing import NDArray

from ..units import NAUTICAL_MILE_M, FloatArray, wrap_deg
from .geodesy import inverse

__all__ = ["MAX_SKIP", "MIN_TURN_DEG", "MIN_LEG_NM", "shortcut", "tidy_waypoints"]

MAX_SKIP: int = 16
"""Farthest shortcut tried, in path vertices."""

MIN_TURN_DEG: float = 5.0
"""Smallest course change kept between consecutive legs [deg]."""

MIN_LEG_NM: float = 2.0
"""Shortest leg kept [NM]."""

LegalFn = Callable[[FloatArray, FloatArray, FloatArray, FloatArray], NDArray[np.bool_]]
DoseFn = Callable[[FloatArray, FloatArray, FloatArray, FloatArray, FloatArray], FloatArray]


def shortcut(lon: FloatArray, lat: FloatArray, time_s: FloatArray, legal: LegalFn,
             dose: Optional[DoseFn]) -> NDArray[np.int64]:
    """Indices of the path vertices kept by rule 1 (``dose`` None: the fastest track's rule).

    ``legal(lon0, lat0, lon1, lat1)`` tells which legs are legal; ``dose(lon0, lat0, lon1,
    lat1, start_s)`` gives the dose of legs started at ``start_s``. The vertices kept are the
    cheapest chain through the legal shortcuts (dynamic programming over the path's vertices;
    cost: length for the fastest track, else the dose with length as a tie-break), so no
    shortcut raises the estimated dose.
    """
    n = lon.size
    i_idx, k_idx = (a.ravel() for a in np.meshgrid(np.arange(n), np.arange(n), indexing="ij"))
    cand = (k_idx - i_idx >= 1) & (k_idx - i_idx <= MAX_SKIP)
    ci, ck = i_idx[cand], k_idx[cand]
    ok = (ck - ci == 1) | legal(lon[ci], lat[ci], lon[ck], lat[ck])
    ci, ck = ci[ok], ck[ok]
    length = inverse(lon[ci], lat[ci], lon[ck], lat[ck])[2]
    cost = length
    if dose is not None:
        d = dose(lon[ci], lat[ci], lon[ck], lat[ck], time_s[ci])
        d = np.where(np.isfinite(d), d, np.inf)
        base = d[ck - ci == 1]
        scale = float(np.sum(base[np.isfinite(base)])) / max(float(np.sum(length[ck - ci == 1])), 1.0)
        cost = d + 1e-6 * max(scale, 1e-30) * length
    best = np.full(n, np.inf)
    prev = np.zeros(n, dtype=np.int64)
    best[0] = 0.0
    for k in range(1, n):
        sel = np.flatnonzero(ck == k)
        tot = best[ci[sel]] + cost[sel]
        j = int(np.argmin(tot))
        best[k], prev[k] = tot[j], ci[sel][j]
    kept = [n - 1]
    while kept[-1] != 0:
        kept.append(int(prev[kept[-1]]))
    return np.asarray(kept[::-1], dtype=np.int64)


def _turns_and_legs(lon: FloatArray, lat: FloatArray) -> "tuple[FloatArray, FloatArray]":
    """Course change at each interior waypoint [deg, 0..180] and each leg's length [NM]."""
    az1, az2, s = inverse(lon[:-1], lat[:-1], lon[1:], lat[1:])
    turn = np.abs(wrap_deg(az1[1:] - az2[:-1] + 180.0) - 180.0)
    return turn, s / NAUTICAL_MILE_M


def tidy_waypoints(lon: FloatArray, lat: FloatArray, legal: LegalFn) -> NDArray[np.int64]:
    """Indices of the waypoints kept by rule 2 (module docstring); start and end always stay."""
    keep: List[int] = list(range(lon.size))
    blocked: set = set()
    while len(keep) > 2:
        x, y = lon[keep], lat[keep]
        turn, leg = _turns_and_legs(x, y)
        short = np.minimum(leg[:-1], leg[1:]) < MIN_LEG_NM
        bad = [j for j in np.argsort(turn) if (turn[j] < MIN_TURN_DEG or short[j]) and keep[j + 1] not in blocked]
        if not bad:
            break
        j = int(bad[0])
        if bool(legal(x[j:j + 1], y[j:j + 1], x[j + 2:j + 3], y[j + 2:j + 3])[0]):
            del keep[j + 1]
        else:
            blocked.add(keep[j + 1])
    return np.asarray(keep, dtype=np.int64)
