# SPDX-License-Identifier: GPL-2.0-or-later
"""Benchmark: one passage through 50 ensemble members x 1,000 route samples on the table path.

Run: ``.venv/bin/python -P tests/bench/bench_ensemble.py``

Data: an invented 50-member NetCDF ensemble written with GDAL (generation not timed). Timed:

1. sampling every member along the route (``sample_members``; GDAL reads, windowed), reported
   on its own;
2. engine time of the ensemble path: ``respond_members`` (ONE response call on the 50,000
   stacked samples, method "table", tables warm) + ``reduce_members`` (probabilities,
   percentiles, median member per quantity); target < 1 s;
3. baseline in the same run: 50 separate single-member runs of ``respond`` (method "table",
   tables warm) on the same sampled seas.

Best of 3; prints the times and the ratio baseline / ensemble, plus the load average.
"""
from __future__ import annotations

import os
import sys
import tempfile
import time
from pathlib import Path
from typing import Callable, List

sys.path.insert(0, str(Path(__file__).resolve().parent))  # -P drops the script folder
import _pkg  # noqa: E402,F401  (exposes the checkout as `seaway_comfort`)

import numpy as np  # noqa: E402

T0 = np.datetime64("2031-07-01T00:00", "s")  # invented scenario
MEMBERS = 50
ROUTE_LON = [0.0, 11.0]
ROUTE_LAT = [0.5, 12.0]
SPACING_NM = 0.95


def _best_of(fn: Callable[[], object], repeat: int = 3) -> float:
    times: List[float] = []
    for _ in range(repeat):
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return min(times)


def make_ensemble(path: str) -> str:
    """Invented 50-member sea, 3-hourly over 6 days: a swell whose height differs per member."""
    from seaway_comfort.processing.core.demo.writers import write_cf_netcdf

    lon = np.round(np.arange(-1.0, 13.0001, 0.25), 6)
    lat = np.round(np.arange(-0.5, 13.5001, 0.25), 6)
    nt = 6 * 8 + 1
    times = T0 + np.arange(nt) * np.timedelta64(3, "h")
    t = np.arange(nt)[None, :, None, None] * 3.0
    m = np.arange(MEMBERS)[:, None, None, None]
    X, Y = np.meshgrid(lon, lat)
    hs = 1.2 + 0.06 * m + 0.5 * np.sin(t / 20.0 + m / 7.0) + 0.05 * X
    tp = 6.5 + 0.02 * m + 0.1 * Y + 0 * t
    wdir = 230.0 + 0.8 * m + 10.0 * np.sin(X / 3.0 + t / 40.0)
    write_cf_netcdf(path, lon, lat, times, {
        "sea_surface_wave_significant_height": hs,
        "sea_surface_wave_period_at_variance_spectral_density_maximum": tp + 0 * hs,
        "sea_surface_wave_from_direction": wdir + 0 * hs,
    }, members=range(MEMBERS))
    return path


def main() -> None:
    from seaway_comfort.processing.core.passage.ensemble import reduce_members, respond_members, sample_members
    from seaway_comfort.processing.core.passage.plan import plan_passage
    from seaway_comfort.processing.core.passage.respond import respond
    from seaway_comfort.processing.core.seastate import open_sea_state
    from seaway_comfort.processing.core.vessel.profile import resolve_vessel

    folder = tempfile.mkdtemp(prefix="seaway_bench_ens_")
    src = open_sea_state(make_ensemble(os.path.join(folder, "ens.nc")))
    profile = resolve_vessel("coastal_survey_35m")
    plan = plan_passage(ROUTE_LON, ROUTE_LAT, departure_utc=T0, speed_kn=12.0, spacing_nm=SPACING_NM)
    t = time.perf_counter()
    seas = sample_members(plan, [src], src.members)
    t_sample = time.perf_counter() - t
    print(f"members {len(src.members)}, samples per member {plan.n}, stacked {len(seas) * plan.n}")
    print(f"sampling all members (GDAL windows): {t_sample:.3f} s; bytes read {src.bytes_read / 1e6:.1f} MB")
    respond_members(plan, seas, profile, method="table")  # warm the tables (built once per speed set)

    def ensemble() -> object:
        return reduce_members(respond_members(plan, seas, profile, method="table"), src.members)

    def separate() -> object:
        return [respond(plan, s, profile, method="table") for s in seas]

    t_ens = _best_of(ensemble)
    t_sep = _best_of(separate)
    print(f"engine time, ensemble path (one stacked response + reductions): {t_ens:.3f} s (target < 1 s)")
    print(f"baseline, {len(seas)} separate single-member runs (table path): {t_sep:.3f} s")
    print(f"ratio baseline / ensemble: {t_sep / t_ens:.1f}x; load average {os.getloadavg()[0]:.2f}")
    src.close()


if __name__ == "__main__":
    main()
