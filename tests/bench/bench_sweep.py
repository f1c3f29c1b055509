# SPDX-License-Identifier: GPL-2.0-or-later
"""Benchmark of the departure sweep (prints figures; no assertions; not collected by pytest).

Run:  .venv/bin/python -P tests/bench/bench_sweep.py [--quick]

Case: 240 hourly departures x 1,000 route samples (a 100 NM leg sampled about every 0.1 NM)
x 2 forecast sources (generated 13-day, 3-hourly, 0.1 deg NetCDF-CF files with invented values;
written before any timing starts), one speed, the vessel's first station.

Figures printed:
1. ``sweep_departures`` (core engine, response-table path): cold (the response tables are built
   inside the call, first use in a session) and warm (tables already built; best of 3); target
   < 2 s.
2. Baselines measured in the same run, each timed on a subset of departures and extrapolated to
   240 departures x 2 sources (stated in the output):
   (a) the per-departure route path as routecomfort calls it, ``compute_passage`` with the api's
       automatic method choice (exact spectral integration below 2,000 samples);
   (b) ``compute_passage`` forced to ``method="table"`` (tables warm), i.e. the same response
       path as the sweep but one pipeline run per departure: what the stacking alone gains.
   The ratio baseline / sweep (warm) is printed for both.
"""
from __future__ import annotations

import argparse
import os
import shutil
import sys
import tempfile
import time
from pathlib import Path
from typing import Callable, List

sys.path.insert(0, str(Path(__file__).resolve().parent))  # -P drops the script folder
import _pkg  # noqa: E402,F401  (exposes the checkout as `seaway_comfort`)

import numpy as np  # noqa: E402

T0 = np.datetime64("2031-07-01T00:00", "ms")  # invented scenario
N_DEPARTURES = 240
N_SAMPLES = 1000
ROUTE_LON = [0.0, 1.1]
ROUTE_LAT = [0.5, 1.6]
SPEED_KN = 10.0


def _best_of(fn: Callable[[], object], repeat: int) -> float:
    times: List[float] = []
    for _ in range(repeat):
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return min(times)


def make_forecast(path: str, days: int, phase: float) -> str:
    """A smooth invented sea: a swell slowly varying in space and time; phase shifts it in time."""
    from seaway_comfort.processing.core.demo.writers import write_cf_netcdf

    lon = np.round(np.arange(-1.0, 3.0001, 0.1), 6)
    lat = np.round(np.arange(-0.5, 2.5001, 0.1), 6)
    nt = days * 8 + 1
    times = T0 + np.arange(nt) * np.timedelta64(3, "h")
    t = np.arange(nt)[:, None, None] * 3.0
    X, Y = np.meshgrid(lon, lat)
    hs = 1.4 + 0.7 * np.sin(t / 18.0 + phase) + 0.1 * X[None]
    tp = 6.5 + 0.8 * Y[None] + 0.5 * np.cos(t / 30.0)
    wdir = 230.0 + 25.0 * np.sin(X[None] / 2.0 + t / 40.0)
    write_cf_netcdf(path, lon, lat, times, {
        "sea_surface_wave_significant_height": hs,
        "sea_surface_wave_period_at_variance_spectral_density_maximum": tp,
        "sea_surface_wave_from_direction": wdir,
    })
    return path


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true", help="smaller baseline subsets")
    args = ap.parse_args()

    from geographiclib.geodesic import Geodesic

    from seaway_comfort.processing.core import api as _api
    from seaway_comfort.processing.core.passage.pipeline import compute_passage
    from seaway_comfort.processing.core.seastate import open_sea_state
    from seaway_comfort.processing.core.sweep.engine import sweep_departures
    from seaway_comfort.processing.core.vessel.profile import resolve_vessel

    folder = tempfile.mkdtemp(prefix="seaway_bench_sweep_")
    try:
        t = time.perf_counter()
        paths = [make_forecast(os.path.join(folder, f"src_{k}.nc"), 13, ph) for k, ph in enumerate((0.0, 0.8))]
        t_write = time.perf_counter() - t
        sources = [open_sea_state(p, source_name=f"model {'AB'[k]}") for k, p in enumerate(paths)]
        profile = resolve_vessel("coastal_survey_35m")
        dist_nm = Geodesic.WGS84.Inverse(ROUTE_LAT[0], ROUTE_LON[0], ROUTE_LAT[1], ROUTE_LON[1])["s12"] / 1852.0
        spacing = dist_nm / (N_SAMPLES - 1) * (1.0 + 1e-9)
        kw = dict(depart_from_utc=T0, depart_to_utc=T0 + np.timedelta64(N_DEPARTURES - 1, "h"), step_h=1.0,
                  sea_states=sources, profile=profile, speeds_kn=[SPEED_KN], spacing_nm=spacing,
                  criterion="worst_msi", max_class=2)

        def sweep() -> object:
            return sweep_departures(ROUTE_LON, ROUTE_LAT, **kw)

        _api._TABLE_CACHE.clear()
        t = time.perf_counter()
        res = sweep()
        t_cold = time.perf_counter() - t
        t_warm = _best_of(sweep, 1 if args.quick else 3)
        n = res.dist_nm.size
        total = res.n_departures * n * len(sources)
        print(f"Departure sweep: {res.n_departures} departures x {n} route samples x {len(sources)} sources "
              f"= {total:,} passage samples ({dist_nm:.1f} NM at {SPEED_KN:g} kn, {res.duration_h[0]:.1f} h)")
        load = os.getloadavg()[0] if hasattr(os, "getloadavg") else float("nan")
        print(f"  machine: {os.cpu_count()} cores, 1-min load average {load:.2f} (other work on the machine "
              "slows every figure)")
        print(f"  synthetic forecasts written first, not timed:            {t_write:.2f} s")
        print(f"  sweep_departures, cold (response tables built inside):   {t_cold:.3f} s")
        print(f"  sweep_departures, warm (tables built; best of {1 if args.quick else 3}):       {t_warm:.3f} s"
              f"   target < 2 s -> {'met' if t_warm < 2.0 else 'NOT met'}")
        print(f"  recommended: {res.recommendation.reason[:110]}...")

        deps = res.departures_utc
        base_kw = dict(speed_kn=SPEED_KN, spacing_nm=spacing)

        def per_departure(idx: np.ndarray, method: object) -> float:
            t0 = time.perf_counter()
            for d in idx:
                for src in sources:
                    compute_passage(ROUTE_LON, ROUTE_LAT, departure_utc=deps[d], sea_states=[src],
                                    method=method, profile=profile, **base_kw)
            return time.perf_counter() - t0

        full_runs = N_DEPARTURES * len(sources)
        n_auto = 2 if args.quick else 6
        idx = np.linspace(0, N_DEPARTURES - 1, n_auto).round().astype(int)
        t_auto = per_departure(idx, None)
        t_auto_full = t_auto / (n_auto * len(sources)) * full_runs
        print(f"  baseline (a) compute_passage, automatic method (exact below 2000 samples): "
              f"{t_auto:.2f} s for {n_auto * len(sources)} runs -> extrapolated to {full_runs} runs: "
              f"{t_auto_full:.1f} s; ratio baseline / sweep(warm) = {t_auto_full / t_warm:.1f}")
        n_tab = 12 if args.quick else 48
        idx = np.linspace(0, N_DEPARTURES - 1, n_tab).round().astype(int)
        per_departure(idx[:1], "table")  # tables for this configuration built once, outside the timing
        t_tab = per_departure(idx, "table")
        t_tab_full = t_tab / (n_tab * len(sources)) * full_runs
        print(f"  baseline (b) compute_passage, method='table' (tables warm): {t_tab:.2f} s for "
              f"{n_tab * len(sources)} runs -> extrapolated to {full_runs} runs: {t_tab_full:.1f} s; "
              f"ratio baseline / sweep(warm) = {t_tab_full / t_warm:.1f}")
        for s in sources:
            s.close()
    finally:
        shutil.rmtree(folder, ignore_errors=True)


if __name__ == "__main__":
    main()
