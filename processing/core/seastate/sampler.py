# SPDX-License-Identifier: GPL-2.0-or-later
"""Space-time sampling of one sea-state layer at route samples (lon, lat, UTC time).

Method, per sample (section and equation numbers of the cited books are from memory):

1. **Space**: bilinear interpolation between the four surrounding cell centres, in the grid's
   centre-index coordinates (:mod:`.grid`), with weights ``(1-fx)(1-fy), fx(1-fy), (1-fx)fy,
   fx fy`` (Press et al., Numerical Recipes, 3rd ed. 2007, s.3.6 eq. 3.6.5). Neighbours that are
   no-data (land) or beyond the grid edge are dropped and the remaining weights renormalised to
   sum 1, so a sea point next to the coast takes only sea values and a point between the last
   centre and the grid edge takes the edge values (common practice, no source).
2. **Time**: linear between the two bracketing steps, ``v = (1-w) v0 + w v1`` with
   ``w = (t - t0)/(t1 - t0)``; a step with weight 0 is not read. Times beyond the first/last step
   by at most ``time_tolerance_s`` use that step; further out: NaN + OUTSIDE_TIME (no
   extrapolation).
3. **Directions** (degrees, coming from) are averaged as unit vectors with the same weights,
   ``theta = atan2(sum w sin, sum w cos)`` (Mardia & Jupp, Directional Statistics, 2000, s.2.2.1),
   so 350 and 10 give 0. A vanishing resultant (opposed directions) takes the direction of the
   heaviest neighbour. "Going to" directions are turned by 180 degrees.
4. **Land / no data**: when no neighbour has data, the nearest cell with data at the needed
   steps within ``land_search_km`` (great-circle distance to the cell centre) is used without
   interpolation in space: LAND_ADJUSTED; none: NaN + NO_SEA_DATA.
5. **Plausibility**: a used value outside :data:`.variables.PLAUSIBLE_RANGE` sets
   IMPLAUSIBLE_VALUE (the value is kept).

Only the bracketing time steps are read, and of each step only the window around the samples that
use it (plus the search margin; split in two at a wrapping seam).
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Dict, Tuple

import numpy as np
from numpy.typing import NDArray

from ..flags import SampleFlag
from ..units import FloatArray
from .grid import EARTH_MEAN_RADIUS_KM, Window, bilinear_corners, great_circle_km, read_window_for
from .layer import DatasetCache, VariableLayer
from .variables import DIRECTION, PLAUSIBLE_RANGE


@dataclass(frozen=True)
class LayerSample:
    """Values of one layer at n samples, NaN where not computable, with per-sample flags."""

    canonical: str
    values: FloatArray
    flags: NDArray[np.int64]


def time_brackets(times_s: NDArray[np.int64], t_s: NDArray[np.int64], tolerance_s: float
                  ) -> Tuple[NDArray[np.int64], NDArray[np.int64], FloatArray, NDArray[np.bool_]]:
    """Bracketing step indices (i0, i1), weight w of step i1 and the in-time-range mask."""
    times = np.asarray(times_s, dtype=np.float64)
    t = np.asarray(t_s, dtype=np.float64)
    in_time = (t >= times[0] - tolerance_s) & (t <= times[-1] + tolerance_s)
    tc = np.clip(t, times[0], times[-1])
    if times.size == 1:
        z = np.zeros(t.shape, dtype=np.int64)
        return z, z.copy(), np.zeros(t.shape), in_time
    i1 = np.clip(np.searchsorted(times, tc, side="right"), 1, times.size - 1)
    i0 = i1 - 1
    w = np.clip((tc - times[i0]) / (times[i1] - times[i0]), 0.0, 1.0)
    return i0.astype(np.int64), i1.astype(np.int64), w, in_time


def _margins(layer: VariableLayer, lat_deg: FloatArray, land_search_km: float) -> Tuple[int, int]:
    if land_search_km <= 0:
        return 0, 0
    g = layer.grid
    rx, ry = g.resolution()
    if g.is_geographic:
        km_per_deg = math.pi / 180.0 * EARTH_MEAN_RADIUS_KM
        coslat = max(math.cos(math.radians(min(float(np.max(np.abs(lat_deg))), 89.9))), 1e-3)
        mc = int(math.ceil(land_search_km / (rx * km_per_deg * coslat))) + 1
        mr = int(math.ceil(land_search_km / (ry * km_per_deg))) + 1
    else:
        mc = int(math.ceil(land_search_km * 1000.0 / rx)) + 1
        mr = int(math.ceil(land_search_km * 1000.0 / ry)) + 1
    return min(mc, g.nx), min(mr, g.ny)


@dataclass(frozen=True)
class _Brackets:
    """Per active sample: the two bracketing steps, the weight of the later one, which are needed."""

    s0: NDArray[np.int64]
    s1: NDArray[np.int64]
    w: FloatArray
    need0: NDArray[np.bool_]
    need1: NDArray[np.bool_]


def _read_corners(layer: VariableLayer, cache: DatasetCache, cc: NDArray[np.int64], rr: NDArray[np.int64],
                  used: NDArray[np.bool_], br: _Brackets, mc: int, mr: int
                  ) -> Tuple[FloatArray, FloatArray, Dict[int, Tuple[Window, NDArray[np.float64]]]]:
    """Corner values (n, 4) at the earlier and later step, and the window read per step.

    One window per time step around the samples that use it: a long route crossing a large grid
    over days reads a band of cells along its track, not its whole bounding box per step.
    """
    g = layer.grid
    steps = np.unique(np.concatenate([br.s0[br.need0], br.s1[br.need1]]))
    v0 = np.full(cc.shape, np.nan)
    v1 = np.full(cc.shape, np.nan)
    step_data: Dict[int, Tuple[Window, NDArray[np.float64]]] = {}
    groups = []  # per bracket end: (sample indices sorted by step, their steps, target array)
    for need, sg, target in ((br.need0, br.s0, v0), (br.need1, br.s1, v1)):
        idx = np.flatnonzero(need)
        idx = idx[np.argsort(sg[idx], kind="stable")]
        groups.append((idx, sg[idx], target))
    for s in steps:
        parts = []
        for idx, sgs, target in groups:
            a, b = np.searchsorted(sgs, [s, s + 1])
            parts.append(idx[a:b])
        sel = np.concatenate(parts)
        u = used[sel]
        win = read_window_for(g, cc[sel][u], rr[sel][u], mc, mr)
        arr = cache.read_band_window(layer, int(s), win)
        step_data[int(s)] = (win, arr)
        for k, (_, _, target) in zip(parts, groups):
            if k.size:
                # zero-weight corners may lie outside the window: clipped here, masked below
                lc = np.minimum(np.maximum(win.local_col(cc[k], g.nx), 0), win.ncols - 1)
                lr = np.minimum(np.maximum(win.local_row(rr[k]), 0), win.nrows - 1)
                target[k] = arr[lr, lc]
    return v0, v1, step_data


def _blend_directions(layer: VariableLayer, v0: FloatArray, v1: FloatArray, ok0: NDArray[np.bool_],
                      ok1: NDArray[np.bool_], ww: FloatArray, den0: FloatArray, den1: FloatArray,
                      br: _Brackets) -> FloatArray:
    """Directions [deg, coming from] averaged as unit vectors in space and time (module docstring)."""
    wt, need0, need1 = br.w, br.need0, br.need1
    turn = math.pi if layer.going_to else 0.0
    a0 = np.radians(np.where(ok0, v0, 0.0)) + turn
    a1 = np.radians(np.where(ok1, v1, 0.0)) + turn
    c_0 = np.sum(np.where(ok0, ww * np.cos(a0), 0.0), axis=1) / den0
    s_0 = np.sum(np.where(ok0, ww * np.sin(a0), 0.0), axis=1) / den0
    c_1 = np.sum(np.where(ok1, ww * np.cos(a1), 0.0), axis=1) / den1
    s_1 = np.sum(np.where(ok1, ww * np.sin(a1), 0.0), axis=1) / den1
    cx = np.where(need0, (1 - wt) * c_0, 0.0) + np.where(need1, wt * c_1, 0.0)
    sx = np.where(need0, (1 - wt) * s_0, 0.0) + np.where(need1, wt * s_1, 0.0)
    val = np.degrees(np.arctan2(sx, cx))
    val = np.where(np.isfinite(cx) & np.isfinite(sx), val, np.nan)
    tiny = np.isfinite(val) & (np.hypot(cx, sx) < 1e-9)
    if tiny.any():
        use1 = wt >= 0.5
        heavy = np.argmax(np.where(use1[:, None], np.where(ok1, ww, -1), np.where(ok0, ww, -1)), axis=1)
        j = np.arange(wt.size)
        pick = np.where(use1, a1[j, heavy], a0[j, heavy])
        val = np.where(tiny, np.degrees(pick), val)
    val = np.mod(val, 360.0)
    return np.where(val >= 360.0, 0.0, val)


def _blend(layer: VariableLayer, v0: FloatArray, v1: FloatArray, ww: FloatArray, br: _Brackets
           ) -> Tuple[FloatArray, NDArray[np.bool_]]:
    """Space-time interpolated values (NaN where a needed step has no data around the sample)
    and the implausible-value mask."""
    need0, need1, wt = br.need0, br.need1, br.w
    ok0 = np.isfinite(v0) & (ww > 0)
    ok1 = np.isfinite(v1) & (ww > 0)
    lo, hi = PLAUSIBLE_RANGE[layer.kind]
    odd = (need0[:, None] & ok0 & ((v0 < lo) | (v0 > hi))).any(axis=1)
    odd |= (need1[:, None] & ok1 & ((v1 < lo) | (v1 > hi))).any(axis=1)
    den0 = np.sum(np.where(ok0, ww, 0.0), axis=1)
    den1 = np.sum(np.where(ok1, ww, 0.0), axis=1)
    with np.errstate(invalid="ignore", divide="ignore"):
        if layer.kind == DIRECTION:
            val = _blend_directions(layer, v0, v1, ok0, ok1, ww, den0, den1, br)
        else:
            m0 = np.sum(np.where(ok0, ww * v0, 0.0), axis=1) / den0
            m1 = np.sum(np.where(ok1, ww * v1, 0.0), axis=1) / den1
            val = np.where(need0, (1 - wt) * m0, 0.0) + np.where(need1, wt * m1, 0.0)
    return np.where((need0 & (den0 <= 0)) | (need1 & (den1 <= 0)), np.nan, val), odd


def sample_layer(
    layer: VariableLayer,
    cache: DatasetCache,
    lon_deg: FloatArray,
    lat_deg: FloatArray,
    t_s: NDArray[np.int64],
    *,
    land_search_km: float,
    time_tolerance_s: float,
) -> LayerSample:
    """Sample one layer at n points and times (see the module docstring for the method)."""
    n = lon_deg.size
    values = np.full(n, np.nan)
    flags = np.zeros(n, dtype=np.int64)
    g = layer.grid
    col_f, row_f, inside = g.centre_index(lon_deg, lat_deg)
    i0, i1, w, in_time = time_brackets(layer.times_s, t_s, time_tolerance_s)
    flags[~inside] |= int(SampleFlag.OUTSIDE_GRID)
    flags[inside & ~in_time] |= int(SampleFlag.OUTSIDE_TIME)
    act = np.flatnonzero(inside & in_time)
    if act.size == 0:
        return LayerSample(layer.canonical, values, flags)
    cf, rf = col_f[act], row_f[act]
    corners = bilinear_corners(g, cf, rf)
    used = corners.valid & (corners.weights > 0)  # at least the nearest centre of every sample has weight >= 1/4
    ww = np.where(used, corners.weights, 0.0)
    mc, mr = _margins(layer, lat_deg[act], land_search_km)
    wt = w[act]
    br = _Brackets(s0=i0[act], s1=i1[act], w=wt, need0=wt < 1.0, need1=wt > 0.0)
    v0, v1, step_data = _read_corners(layer, cache, corners.cols, corners.rows, used, br, mc, mr)
    val, odd = _blend(layer, v0, v1, ww, br)
    missing = np.flatnonzero(~np.isfinite(val))
    if missing.size:
        _nearest_sea(layer, step_data, act, missing, val, odd, flags, lon_deg, lat_deg,
                     cf, rf, br.s0, br.s1, wt, br.need0, br.need1, land_search_km, mc, mr)
    values[act] = val
    flags[act[odd]] |= int(SampleFlag.IMPLAUSIBLE_VALUE)
    return LayerSample(layer.canonical, values, flags)


def _nearest_sea(layer, step_data, act, missing, val, odd, flags, lon_deg, lat_deg,  # type: ignore[no-untyped-def]
                 cf, rf, s0g, s1g, wt, need0, need1, land_search_km, mc, mr) -> None:
    """Fill ``val`` at ``missing`` from the nearest cell with data within the search radius."""
    g = layer.grid
    lo, hi = PLAUSIBLE_RANGE[layer.kind]
    is_dir = layer.kind == DIRECTION
    for j in missing:
        k = act[j]
        if land_search_km <= 0:
            flags[k] |= int(SampleFlag.NO_SEA_DATA)
            continue
        cols = int(np.rint(cf[j])) + np.arange(-mc, mc + 1)
        rows = int(np.rint(rf[j])) + np.arange(-mr, mr + 1)
        if g.wraps:
            cols = np.unique(np.mod(cols, g.nx))
        cols = cols[(cols >= 0) & (cols < g.nx)]
        rows = rows[(rows >= 0) & (rows < g.ny)]
        cgrid, rgrid = np.meshgrid(cols, rows)
        good = np.ones(cgrid.shape, dtype=bool)
        picks = []
        for needed, s in ((need0[j], int(s0g[j])), (need1[j], int(s1g[j]))):
            if not needed:
                picks.append(None)
                continue
            win, arr = step_data[s]
            lc = win.local_col(cgrid, g.nx)
            lr = rgrid - win.row0
            inwin = (lc >= 0) & (lc < win.ncols) & (lr >= 0) & (lr < win.nrows)
            vals = np.full(cgrid.shape, np.nan)
            vals[inwin] = arr[lr[inwin], lc[inwin]]
            good &= np.isfinite(vals)
            picks.append(vals)
        if not good.any():
            flags[k] |= int(SampleFlag.NO_SEA_DATA)
            continue
        clon, clat = g.centre_lonlat(cgrid[good], rgrid[good])
        dist = great_circle_km(np.full(clon.shape, lon_deg[k]), np.full(clat.shape, lat_deg[k]), clon, clat)
        best = int(np.argmin(dist))
        if not dist[best] <= land_search_km:
            flags[k] |= int(SampleFlag.NO_SEA_DATA)
            continue
        x0 = picks[0][good][best] if picks[0] is not None else 0.0
        x1 = picks[1][good][best] if picks[1] is not None else 0.0
        if (need0[j] and not lo <= x0 <= hi) or (need1[j] and not lo <= x1 <= hi):
            odd[j] = True
        if is_dir:
            turn = math.pi if layer.going_to else 0.0
            a0, a1 = math.radians(x0) + turn, math.radians(x1) + turn
            cx = (1 - wt[j]) * math.cos(a0) * need0[j] + wt[j] * math.cos(a1) * need1[j]
            sx = (1 - wt[j]) * math.sin(a0) * need0[j] + wt[j] * math.sin(a1) * need1[j]
            d = math.degrees(math.atan2(sx, cx)) % 360.0
            val[j] = 0.0 if d >= 360.0 else d
        else:
            val[j] = (1 - wt[j]) * x0 * need0[j] + wt[j] * x1 * need1[j]
        flags[k] |= int(SampleFlag.LAND_ADJUSTED)
