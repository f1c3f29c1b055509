# SPDX-License-Identifier: GPL-2.0-or-later
"""Invented hindcast files with a known seasonal cycle (for tests, benchmarks and demos).

The sea state is uniform in space and a closed-form function of time:

    Hs(t) = hs_mean_m + hs_amp_m * sin(2 pi d(t) / 365.25)     [m]
    d(t)  = days since 1 January 00:00 UTC of t's year (fractional)

with constant Tp and direction, so every statistic of the climate can be derived by hand.
Nothing here describes a real place or data set.
"""
from __future__ import annotations

import math
import os
from dataclasses import dataclass
from typing import List, Optional, Sequence

import numpy as np
from numpy.typing import NDArray

from ..units import FloatArray
from ..validation import SeawayInputError, require_positive

__all__ = ["SeasonalCycle", "seasonal_hs_m", "step_times_utc", "write_seasonal_hindcast"]

HS_NAME = "sea_surface_wave_significant_height"
TP_NAME = "sea_surface_wave_period_at_variance_spectral_density_maximum"
DIR_NAME = "sea_surface_wave_from_direction"


@dataclass(frozen=True)
class SeasonalCycle:
    """Parameters of the closed-form sea state (module docstring)."""

    hs_mean_m: float = 2.0
    hs_amp_m: float = 1.5
    tp_s: float = 8.0
    wave_from_deg: float = 270.0
    year_days: float = 365.25


def seasonal_hs_m(times_utc: NDArray[np.datetime64], cycle: SeasonalCycle) -> FloatArray:
    """Hs [m] of the cycle at the given UTC times (float64, before any file rounding)."""
    t = np.asarray(times_utc).astype("datetime64[s]")
    d = (t - t.astype("datetime64[Y]")).astype(np.int64) / 86400.0
    return cycle.hs_mean_m + cycle.hs_amp_m * np.sin(2.0 * math.pi * d / cycle.year_days)


def step_times_utc(year: int, step_h: float = 3.0) -> NDArray[np.datetime64]:
    """Regular UTC times of one calendar year at ``step_h`` hours."""
    step = int(round(float(require_positive("step_h", step_h)) * 3600))
    return np.arange(np.datetime64(f"{int(year):04d}-01-01T00:00:00"), np.datetime64(f"{int(year) + 1:04d}-01-01T00:00:00"),
                     np.timedelta64(step, "s"))


def write_seasonal_hindcast(
    folder: str,
    years: Sequence[int],
    *,
    cycle: SeasonalCycle = SeasonalCycle(),
    lon_deg: Optional[Sequence[float]] = None,
    lat_deg: Optional[Sequence[float]] = None,
    step_h: float = 3.0,
    prefix: str = "invented_hindcast",
    drop: Optional[Sequence[np.datetime64]] = None,
) -> List[str]:
    """One CF NetCDF file per year in ``folder`` (created if needed); returns the paths.

    ``lon_deg``/``lat_deg`` regular cell-centre coordinates (default a 9 x 9 grid of 0.5 deg
    around 8 W 42 N in open water of an invented sea); ``drop`` times to leave out (gaps).
    Existing files with the same name are reused (the content is a pure function of the
    arguments encoded in the name).
    """
    from .writers import write_cf_netcdf

    lon = np.arange(-10.0, -5.99, 0.5) if lon_deg is None else np.asarray(lon_deg, dtype=float)
    lat = np.arange(40.0, 44.01, 0.5) if lat_deg is None else np.asarray(lat_deg, dtype=float)
    if not years:
        raise SeawayInputError("years is empty: give at least one year")
    os.makedirs(folder, exist_ok=True)
    paths = []
    drop_s = None if drop is None else np.asarray(drop).astype("datetime64[s]")
    for y in years:
        t = step_times_utc(int(y), step_h)
        if drop_s is not None:
            t = t[~np.isin(t.astype("datetime64[s]"), drop_s)]
        if t.size == 0:
            raise SeawayInputError(f"year {y}: every time step dropped")
        tag = (f"{prefix}_{int(y)}_{step_h:g}h_{lon.size}x{lat.size}_{cycle.hs_mean_m:g}_{cycle.hs_amp_m:g}_"
               f"{cycle.tp_s:g}_{cycle.wave_from_deg:g}_{t.size}")
        path = os.path.join(folder, tag.replace("-", "m") + ".nc")
        if not os.path.exists(path):
            hs = seasonal_hs_m(t, cycle)
            shape = (lat.size, lon.size)
            tmp = path + ".part.nc"
            write_cf_netcdf(tmp, lon, lat, t, {
                HS_NAME: lambda i, hs=hs: np.full(shape, hs[i]),
                TP_NAME: lambda i: np.full(shape, cycle.tp_s),
                DIR_NAME: lambda i: np.full(shape, cycle.wave_from_deg),
            })
            os.replace(tmp, path)
        paths.append(path)
    return paths
