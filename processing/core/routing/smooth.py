# SPDX-License-Identifier: GPL-2.0-or-later
"""Turning a lattice path into a track a helmsman can steer.

The rule (ours; common practice, no source, for the thresholds):

1. **Shortcuts** (string pulling, as in any-angle path planning, e.g. Botea A. et al. (2004)
   "Near optimal hierarchical path-finding", J. Game Dev. 1(1) 7-28): walking from the start,
   the next waypoint kept is the farthest path vertex (at most :data:`MAX_SKIP` stages ahead)
   whose direct geodesic is legal (:mod:`.legality`) and, for the tracks that weigh
   exposure, whose dose (:mod:`.edge_costs`, started when the path reaches the waypoint) is
   no higher than that of the path it replaces. The fastest track takes any legal shortcut.
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
    lat1, start_s)`` gives the dose of legs started at ``start_s``.
    """
    n = lon.size
    i_idx, k_idx = (a.ravel() for a in np.meshgrid(np.arange(n), np.arange(n), indexing="ij"))
    cand = (k_idx - i_idx >= 2) & (k_idx - i_idx <= MAX_SKIP)
    ci, ck = i_idx[cand], k_idx[cand]
    ok = legal(lon[ci], lat[ci], lon[ck], lat[ck]) if ci.size else np.zeros(0, bool)
    if dose is not None and ci.size:
        base = dose(lon[:-1], lat[:-1], lon[1:], lat[1:], time_s[:-1])
        cum = np.r_[0.0, np.cumsum(np.nan_to_num(base, nan=np.inf))]
        good = np.flatnonzero(ok)
        direct = dose(lon[ci[good]], lat[ci[good]], lon[ck[good]], lat[ck[good]], time_s[ci[good]])
        ok[good] = np.isfinite(direct) & (direct <= (cum[ck[good]] - cum[ci[good]]) * (1 + 1e-9))
    best = np.arange(1, n + 1)
    best[-1] = n - 1
    for a, b in zip(ci[ok], ck[ok]):
        best[a] = max(best[a], b)
    kept, i = [0], 0
    while i < n - 1:
        i = int(best[i])
        kept.append(i)
    return np.asarray(kept, dtype=np.int64)


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
