# SPDX-License-Identifier: GPL-2.0-or-later
"""Benchmark of sea-state sampling along a route (prints figures; no assertions; not collected by pytest).

Run:  .venv/bin/python -P tests/bench/bench_seastate.py [--quick] [--no-qgis] [--no-memory]

1. Speed: 10,000 route samples (times spread over 80 three-hourly steps) x 3 variables (hs, tp,
   dir GeoTIFF stacks, 0.1 deg regional grid). Our sampler (bilinear in space, linear in time)
   against QGIS's ``native:rastersampling`` run on the same three rasters and the same points in the
   same process (it samples every band of a raster, nearest cell, no time interpolation). If one
   QGIS run is slow, only the first raster is timed and the total extrapolated x3 (said so).
2. Memory: a 10-day, 3-hourly, global 0.25 deg Hs file (1440 x 720 x 81, Int16 with scale_factor,
   generated into a temporary folder); sampling a 5,000-sample ocean route in a child process,
   peak RSS and tracemalloc peak reported, against a child that loads the whole variable with
   GDAL (the naive baseline) measured in the same run.
"""
from __future__ import annotations

import argparse
import os
import shutil
import subprocess
import sys
import tempfile
import time
from pathlib import Path
from typing import Callable, List

sys.path.insert(0, str(Path(__file__).resolve().parent))  # -P drops the script folder
import _pkg  # noqa: E402,F401  (exposes the checkout as `seaway_comfort`)

import numpy as np  # noqa: E402

from seaway_comfort.processing.core.seastate import open_sea_state  # noqa: E402
from seaway_comfort.processing.core.demo.writers import write_cf_netcdf, write_geotiff_stack  # noqa: E402

T0 = np.datetime64("2031-01-05T00:00:00", "s")  # invented scenario


def _best_of(fn: Callable[[], object], repeat: int) -> float:
    times: List[float] = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return min(times)


def _regional_files(folder: str, nsteps: int, step_deg: float):
    lon = np.round(np.arange(-30.0, 10.0 + 1e-9, step_deg), 6)
    lat = np.round(np.arange(60.0, 35.0 - 1e-9, -step_deg), 6)
    times = T0 + np.arange(nsteps) * np.timedelta64(3, "h")
    la, lo = np.meshgrid(lat, lon, indexing="ij")
    k = np.arange(nsteps)[:, None, None]
    hs = 1.0 + 0.05 * (lo + 30.0) + 0.03 * (la - 35.0) + 0.5 * np.sin(k / 7.0)
    tp = 6.0 + 0.1 * (la - 35.0) + 0.02 * k
    wd = np.mod(200.0 + 3.0 * (lo + 30.0) + 2.0 * k, 360.0)
    paths = []
    for name, data, var, unit in (("bench_hs", hs, "hs", "m"), ("bench_tp", tp, "tp", "s"),
                                  ("bench_dir", wd, "dir", "degree")):
        paths.append(write_geotiff_stack(os.path.join(folder, f"{name}.tif"), lon, lat, times,
                                         data.astype(np.float32), variable=var, units=unit))
    return paths, lon, lat, times


def _route(n: int, times):
    lon = np.linspace(-27.0, 6.0, n)
    lat = 37.0 + 20.0 * np.sin(np.linspace(0.0, 1.3, n))
    span = (times[-1] - times[0]).astype(np.int64) - 7200
    eta = times[0] + np.timedelta64(3600, "s") + (np.linspace(0.0, 1.0, n) * span).astype("timedelta64[s]")
    return lon, lat, eta


def _qgis_rastersampling(paths, lon, lat):
    """Seconds for native:rastersampling on each raster (None if QGIS is not available)."""
    os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
    try:
        from qgis.core import (QgsApplication, QgsFeature, QgsGeometry, QgsPointXY, QgsRasterLayer,
                               QgsVectorLayer)
    except ImportError as exc:
        print(f"  QGIS not importable ({exc}); baseline skipped")
        return None
    app = QgsApplication([], False)
    app.initQgis()
    plugins = "/usr/share/qgis/python/plugins"
    if plugins not in sys.path:
        sys.path.append(plugins)
    from processing.core.Processing import Processing

    Processing.initialize()
    import processing

    layer = QgsVectorLayer("Point?crs=EPSG:4326", "route", "memory")
    feats = []
    for x, y in zip(lon, lat):
        f = QgsFeature()
        f.setGeometry(QgsGeometry.fromPointXY(QgsPointXY(float(x), float(y))))
        feats.append(f)
    layer.dataProvider().addFeatures(feats)
    out = []
    for p in paths:
        raster = QgsRasterLayer(p, os.path.basename(p), "gdal")
        t0 = time.perf_counter()
        processing.run("native:rastersampling", {"INPUT": layer, "RASTERCOPY": raster,
                                                 "COLUMN_PREFIX": "S_", "OUTPUT": "TEMPORARY_OUTPUT"})
        dt = time.perf_counter() - t0
        out.append((dt, raster.bandCount()))
        if dt > 60.0:
            print(f"  (one QGIS run took {dt:.1f} s: remaining rasters extrapolated from this one)")
            out += [(dt, raster.bandCount())] * (len(paths) - 1)
            break
    return out


def bench_speed(quick: bool, with_qgis: bool) -> None:
    nsteps = 20 if quick else 80
    n = 2000 if quick else 10_000
    folder = tempfile.mkdtemp(prefix="seaway_bench_speed_")
    try:
        paths, glon, glat, times = _regional_files(folder, nsteps, 0.1)
        lon, lat, eta = _route(n, times)
        print(f"[speed] grid {glat.size} x {glon.size} cells (0.1 deg), {nsteps} steps, 3 variables; "
              f"{n} route samples spread over the whole forecast")
        t_open = _best_of(lambda: open_sea_state(paths).close(), 3)
        src = open_sea_state(paths)
        t_first = _best_of(lambda: src.sample(lon, lat, eta), 1)
        first_bytes = src.bytes_read
        t_ours = _best_of(lambda: src.sample(lon, lat, eta), 5)
        r = src.sample(lon, lat, eta)
        print(f"  open_sea_state: {t_open * 1e3:.1f} ms; sample(): first call {t_first * 1e3:.1f} ms, "
              f"best of 5 {t_ours * 1e3:.1f} ms -> {n / t_ours:,.0f} samples/s "
              f"({3 * n / t_ours:,.0f} variable-samples/s incl. time interpolation); "
              f"valid {int(r.valid.sum())}/{n}; raw bytes read by one call {first_bytes:,}")
        src.close()
        if with_qgis:
            res = _qgis_rastersampling(paths, lon, lat)
            if res:
                total = sum(dt for dt, _ in res)
                bands = sum(nb for _, nb in res)
                print(f"  QGIS native:rastersampling: {total:.2f} s for 3 rasters x {res[0][1]} bands "
                      f"({total / bands * 1e3:.1f} ms per band) on the same {n} points")
                print(f"  ratio QGIS / ours: {total / t_first:,.1f}x against our first (cold) call, "
                      f"{total / t_ours:,.1f}x against our best of 5 (QGIS samples every band at the "
                      f"nearest cell; ours reads the 2 bracketing steps and interpolates)")
    finally:
        shutil.rmtree(folder, ignore_errors=True)


_CHILD = r'''
import sys, tracemalloc, json, time
sys.path.insert(0, sys.argv[1]); import _pkg
def status_mb(key):
    # /proc/self/status VmHWM (peak RSS) / VmRSS; per address space, so fresh after exec
    # (getrusage ru_maxrss is inherited across execve on Linux and would show the parent's peak)
    with open("/proc/self/status") as fh:
        for line in fh:
            if line.startswith(key + ":"):
                return int(line.split()[1]) / 1024.0
    return float("nan")
import numpy as np
mode, path, coarse = sys.argv[2], sys.argv[3], sys.argv[4]
from osgeo import gdal
gdal.UseExceptions()
r0 = status_mb("VmRSS")
if mode == "naive":
    ds = gdal.Open('NETCDF:"%s":hs' % path)
    tracemalloc.start()
    t = time.perf_counter()
    arr = ds.ReadAsArray().astype(np.float32)
    dt = time.perf_counter() - t
    out = {"shape": list(arr.shape)}
else:
    from seaway_comfort.processing.core.seastate import open_sea_state
    src = open_sea_state([path, coarse])
    n = 5000
    lon = np.linspace(-70.0, -10.0, n); lat = np.linspace(35.0, 50.0, n)
    t0 = src.time_range_utc[0]
    eta = t0 + np.timedelta64(3600, "s") + (np.linspace(0, 1, n) * (9.5 * 86400)).astype("timedelta64[s]")
    r0 = status_mb("VmRSS")
    tracemalloc.start()
    t = time.perf_counter()
    r = src.sample(lon, lat, eta)
    dt = time.perf_counter() - t
    out = {"valid": int(r.valid.sum()), "n": n, "bytes_read": src.bytes_read}
cur, peak = tracemalloc.get_traced_memory()
r1 = status_mb("VmHWM")
out.update({"tracemalloc_peak_mb": round(peak / 2**20, 2), "rss_before_mb": round(r0, 1),
            "rss_peak_mb": round(r1, 1), "seconds": round(dt, 3)})
print(json.dumps(out))
'''


def bench_memory(quick: bool) -> None:
    nx, ny, nt = (360, 180, 21) if quick else (1440, 720, 81)
    step = 360.0 / nx
    folder = tempfile.mkdtemp(prefix="seaway_bench_mem_")
    try:
        lon = np.arange(0.0, 360.0, step)
        lat = np.arange(-90.0 + step / 2, 90.0, step)
        times = T0 + np.arange(nt) * np.timedelta64(3, "h")
        lo, la = np.meshgrid(lon, lat)
        base = 2.0 + 1.5 * np.cos(np.radians(la)) + 0.3 * np.sin(np.radians(lo))
        t0 = time.perf_counter()
        big = write_cf_netcdf(os.path.join(folder, "global_hs.nc"), lon, lat, times,
                              {"sea_surface_wave_significant_height": lambda i: base + 0.01 * i},
                              scale_factor=0.001)
        t_write = time.perf_counter() - t0
        clon = np.arange(0.0, 360.0, 10.0)
        clat = np.arange(-80.0, 80.01, 10.0)
        shape = (nt, clat.size, clon.size)
        coarse = write_cf_netcdf(os.path.join(folder, "coarse_tp_dir.nc"), clon, clat, times, {
            "sea_surface_wave_period_at_variance_spectral_density_maximum": np.full(shape, 9.0),
            "sea_surface_wave_from_direction": np.full(shape, 250.0)})
        size_mb = os.path.getsize(big) / 2**20
        print(f"[memory] global {ny} x {nx} x {nt} Int16 (scale_factor) Hs file: {size_mb:.0f} MB on disk, "
              f"written in {t_write:.1f} s; whole variable as float32 would be {nx * ny * nt * 4 / 2**20:.0f} MB")
        here = str(Path(__file__).resolve().parent)
        for mode in ("ours", "naive"):
            res = subprocess.run([sys.executable, "-P", "-c", _CHILD, here, mode, big, coarse],
                                 capture_output=True, text=True, check=False)
            if res.returncode != 0:
                print(f"  {mode}: child failed: {res.stderr[-500:]}")
                continue
            print(f"  {mode}: {res.stdout.strip()}")
    finally:
        shutil.rmtree(folder, ignore_errors=True)


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--quick", action="store_true", help="smaller sizes (smoke run)")
    ap.add_argument("--no-qgis", action="store_true", help="skip the QGIS baseline")
    ap.add_argument("--no-memory", action="store_true", help="skip the large-file memory part")
    a = ap.parse_args()
    bench_speed(a.quick, not a.no_qgis)
    if not a.no_memory:
        bench_memory(a.quick)


if __name__ == "__main__":
    main()
