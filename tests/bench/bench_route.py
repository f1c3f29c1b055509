# SPDX-License-Identifier: GPL-2.0-or-later
"""Benchmark of one route-comfort run (prints figures; no assertions; not collected by pytest).

Run:  .venv/bin/python -P tests/bench/bench_route.py [--quick]

Case: a 500 NM route sampled every 1 NM (about 500 samples) on a generated 10-day, 3-hourly,
0.1 deg forecast (combined sea plus wind-sea and swell partitions, NetCDF-CF), invented values.

Figures printed:
1. ``seawaycomfort:routecomfort`` through ``processing.run`` in this process (QGIS start-up
   excluded), writing points, segments, styles and the HTML report; target < 3 s.
2. Its share in reading (sea-state sampling), response (motions and comfort) and writing
   (layers, styles, report), from the core steps timed alone on the same inputs; writing =
   algorithm time minus the core steps.
3. Baselines measured in the same run: (a) reading every cell of the forecast's Hs variable
   with GDAL (what a naive reader does) against our windowed sampling of the route; (b) the
   response with ``method="exact"`` (spectral integration at every sample) against
   ``method="table"`` (response tables per unit Hs); the default is the api's automatic choice.
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


def _best_of(fn: Callable[[], object], repeat: int) -> float:
    times: List[float] = []
    for _ in range(repeat):
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return min(times)


def make_forecast(folder: str, days: int) -> str:
    from seaway_comfort.processing.core.demo.writers import write_cf_netcdf

    lon = np.round(np.arange(-1.0, 10.0001, 0.1), 6)
    lat = np.round(np.arange(-1.0, 6.0001, 0.1), 6)
    nt = days * 8 + 1
    times = T0 + np.arange(nt) * np.timedelta64(3, "h")
    t = np.arange(nt)[:, None, None] * 3.0
    X, Y = np.meshgrid(lon, lat)
    swell_hs = 1.2 + 0.5 * np.sin(t / 40.0) + 0.02 * X[None]
    swell_tp = 11.0 + 0.1 * Y[None] + 0.0 * t
    swell_dir = 200.0 + 5.0 * np.sin(X[None] / 3.0) + 0.0 * t
    wind_hs = 0.5 + 1.5 * np.exp(-(((X[None] - t / 24.0) / 2.0) ** 2))
    wind_tp = 4.0 + 1.5 * wind_hs
    wind_dir = 250.0 + 20.0 * np.cos(t / 30.0) + 0.0 * X[None]
    hs = np.hypot(swell_hs, wind_hs)
    tp = np.where(swell_hs >= wind_hs, swell_tp, wind_tp)
    wdir = np.where(swell_hs >= wind_hs, swell_dir, wind_dir)
    path = os.path.join(folder, "bench_forecast.nc")
    write_cf_netcdf(path, lon, lat, times, {
        "sea_surface_wave_significant_height": hs,
        "sea_surface_wave_period_at_variance_spectral_density_maximum": tp,
        "sea_surface_wave_from_direction": wdir,
        "sea_surface_wind_wave_significant_height": wind_hs,
        "sea_surface_wind_wave_period_at_variance_spectral_density_maximum": wind_tp,
        "sea_surface_wind_wave_from_direction": wind_dir,
        "sea_surface_primary_swell_wave_significant_height": swell_hs,
        "sea_surface_primary_swell_wave_period_at_variance_spectral_density_maximum": swell_tp,
        "sea_surface_primary_swell_wave_from_direction": swell_dir,
    })
    return path


def route_vertices() -> tuple:
    """A 500 NM dog-leg route inside the grid (WGS84)."""
    from pyproj import Geod

    g = Geod(ellps="WGS84")
    lon1, lat1, _ = g.fwd(0.0, 0.5, 60.0, 250 * 1852.0)
    lon2, lat2, _ = g.fwd(lon1, lat1, 110.0, 250 * 1852.0)
    return [0.0, lon1, lon2], [0.5, lat1, lat2]


def main(argv: List[str]) -> int:
    ap = argparse.ArgumentParser()
    ap.add_argument("--quick", action="store_true", help="2-day forecast, one repetition")
    args = ap.parse_args(argv)
    days = 2 if args.quick else 10
    repeat = 1 if args.quick else 3
    os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

    from seaway_comfort.processing.core.passage.pipeline import plan_passage, respond, sample_sea
    from seaway_comfort.processing.core.seastate import open_sea_state
    from seaway_comfort.processing.core.vessel.profile import resolve_vessel

    tmp = tempfile.mkdtemp(prefix="seaway_bench_route_")
    try:
        t = time.perf_counter()
        nc = make_forecast(tmp, days)
        print(f"forecast: {days} days, 3-hourly, 0.1 deg, 9 variables, "
              f"{os.path.getsize(nc) / 1e6:.1f} MB written in {time.perf_counter() - t:.1f} s")
        lon, lat = route_vertices()
        route_path = os.path.join(tmp, "route.geojson")
        import json

        with open(route_path, "w") as fh:
            json.dump({"type": "FeatureCollection", "features": [{"type": "Feature", "properties": {"name": "bench"},
                       "geometry": {"type": "LineString", "coordinates": [[a, b] for a, b in zip(lon, lat)]}}]}, fh)
        profile = resolve_vessel("coastal_survey_35m")
        departure = T0 + np.timedelta64(12, "h")

        # ---- core steps alone
        plan = plan_passage(lon, lat, departure_utc=departure, speed_kn=12.0, spacing_nm=1.0)
        print(f"route: {plan.dist_m[-1] / 1852.0:.1f} NM, {plan.n} samples, "
              f"{plan.elapsed_s[-1] / 3600.0:.1f} h at 12 kn")

        def read() -> object:
            src = open_sea_state(nc)
            try:
                return sample_sea(plan, [src])
            finally:
                src.close()

        t_read = _best_of(read, repeat)
        sea = read()
        t_resp = _best_of(lambda: respond(plan, sea, profile), repeat)
        t_exact = _best_of(lambda: respond(plan, sea, profile, method="exact"), repeat)
        from seaway_comfort.processing.core import api as _api

        def table_cold() -> object:
            _api._TABLE_CACHE.clear()  # include building the tables (first use in a session)
            return respond(plan, sea, profile, method="table")

        t_table = _best_of(table_cold, repeat)
        t_table_warm = _best_of(lambda: respond(plan, sea, profile, method="table"), repeat)

        from osgeo import gdal

        gdal.UseExceptions()

        def naive_read() -> object:
            ds = gdal.Open(f'NETCDF:"{nc}":hs')
            return ds.ReadAsArray()

        t_naive = _best_of(naive_read, repeat)

        # ---- the algorithm in QGIS (start-up excluded)
        from seaway_comfort.processing.standalone import run_with_qgis

        sys.path.append("/usr/share/qgis/python/plugins")

        def qgis_part() -> int:
            from qgis.core import QgsApplication
            from processing.core.Processing import Processing

            Processing.initialize()
            from seaway_comfort.processing.provider import SeawayComfortProvider

            provider = SeawayComfortProvider()
            if not QgsApplication.processingRegistry().addProvider(provider):
                print("could not register the provider")
                return 1
            import processing

            def run_alg() -> object:
                out = tempfile.mkdtemp(dir=tmp)
                return processing.run("seawaycomfort:routecomfort", {
                    "ROUTE": route_path, "SEA_STATE": [nc], "DEPARTURE": str(departure) + "Z", "SPEED_KN": 12.0,
                    "VESSEL": "coastal_survey_35m", "SPACING_NM": 1.0,
                    "OUTPUT_POINTS": os.path.join(out, "p.gpkg"), "OUTPUT_SEGMENTS": os.path.join(out, "s.gpkg"),
                    "OUTPUT_REPORT": os.path.join(out, "r.html"),
                })

            t_alg = _best_of(run_alg, repeat)
            t_write = max(t_alg - t_read - t_resp, 0.0)
            print()
            print(f"routecomfort algorithm (processing.run, QGIS start-up excluded): {t_alg:.3f} s  (target < 3 s)")
            print(f"  reading  (sea-state sampling):        {t_read:.3f} s  {100 * t_read / t_alg:5.1f} %")
            print(f"  response (motions, comfort, dose):    {t_resp:.3f} s  {100 * t_resp / t_alg:5.1f} %")
            print(f"  writing  (layers, styles, report):    {t_write:.3f} s  {100 * t_write / t_alg:5.1f} %  (remainder)")
            print()
            print("baselines measured in this run:")
            print(f"  GDAL read of every Hs cell and step:  {t_naive:.3f} s  -> route sampling of 9 variables "
                  f"takes {t_read / t_naive:.2f}x that")
            print(f"  response, spectral integration at every sample (method='exact'): {t_exact:.3f} s")
            print(f"  response, tables per unit Hs (method='table'):                   {t_table:.3f} s  "
                  f"-> ratio exact / table = {t_exact / t_table:.2f} (tables built in the call)")
            print(f"  response, tables already built (later legs, sweeps):            {t_table_warm:.3f} s")
            print(f"  (the default for {plan.n} samples is the api's automatic choice, timed above as response)")
            return 0

        if run_with_qgis(qgis_part):
            return 1
    finally:
        shutil.rmtree(tmp, ignore_errors=True)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
