# SPDX-License-Identifier: GPL-2.0-or-later
"""Benchmark: seasonal comfort climate, 3-hourly hindcast x 500 route samples.

Run: ``.venv/bin/python -P tests/bench/bench_climate.py [--years 1,2,5,10] [--no-dask]``

Prints, for 1, 2, 5 and 10 years of invented 3-hourly hindcast (one NetCDF file per year,
cached in the temporary folder; generation is not timed) and a 500-sample route:
wall time, (step x sample) pairs per second and peak memory of the local process-pool run
(2 workers), the ratio against the serial run (baseline: SerialBackend) measured on the same
data in the same session for the smallest and largest number of years, the load average, and,
on the largest number of years, side by side (median of 3 each): serial, local pool x2, and a
real Dask scheduler with 1 and with 2 worker processes on loopback (started here with the
`dask` command-line tool and stopped after), each compared with the serial result. No
assertions: figures only.
"""
from __future__ import annotations

import argparse
import os
import resource
import statistics
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))  # -P drops the script folder
import _pkg  # noqa: E402,F401  (exposes the checkout as the package seaway_comfort)
import numpy as np  # noqa: E402

from seaway_comfort.processing.core import climate as C  # noqa: E402
from seaway_comfort.processing.core.climate.backends import dask_available  # noqa: E402
from seaway_comfort.processing.core.climate.engine import prepare_climate  # noqa: E402
from seaway_comfort.processing.core.demo.synthetic_hindcast import (
    SeasonalCycle,
    write_seasonal_hindcast,
)

ROUTE_LON = [-20.0, -15.0, -10.5]
ROUTE_LAT = [40.0, 43.5, 44.5]
VESSEL, SPEED_KN = "coastal_survey_35m", 10.0
FIRST_YEAR = 2001
REPEAT = 3


def _route_for_500_samples(series):
    """Spacing so that the route has 500 samples."""
    s = prepare_climate(ROUTE_LON, ROUTE_LAT, series, VESSEL, speed_kn=SPEED_KN, spacing_nm=1.0)
    length_nm = s.dist_m[-1] / 1852.0
    lo, hi = 0.5 * length_nm / 500, 2.0 * length_nm / 500
    from seaway_comfort.processing.core.passage.route import densify_route

    for _ in range(60):
        mid = 0.5 * (lo + hi)
        n = densify_route(ROUTE_LON, ROUTE_LAT, mid).n
        if n == 500:
            return mid
        if n > 500:
            lo = mid
        else:
            hi = mid
    return mid


def _maxrss_mb(who: int) -> float:
    return resource.getrusage(who).ru_maxrss / 1024.0


def _run(paths, backend, spacing, chunk_steps=C.DEFAULT_CHUNK_STEPS):
    t0 = time.perf_counter()
    r = C.compute_climate(ROUTE_LON, ROUTE_LAT, paths, VESSEL, speed_kn=SPEED_KN, spacing_nm=spacing,
                          max_class=1, backend=backend, chunk_steps=chunk_steps)
    return time.perf_counter() - t0, r


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--years", default="1,2,5,10")
    ap.add_argument("--no-dask", action="store_true")
    args = ap.parse_args()
    years_list = [int(v) for v in args.years.split(",")]
    folder = os.path.join(tempfile.gettempdir(), "seaway_climate_bench")
    lon = np.arange(-21.0, -8.9, 0.5)
    lat = np.arange(38.0, 46.01, 0.5)
    t0 = time.perf_counter()
    all_paths = write_seasonal_hindcast(folder, list(range(FIRST_YEAR, FIRST_YEAR + max(years_list))),
                                        cycle=SeasonalCycle(hs_mean_m=1.2, hs_amp_m=0.9), lon_deg=lon, lat_deg=lat)
    print(f"hindcast files ready in {time.perf_counter() - t0:.1f} s (cached in {folder}; not timed below)")
    series1 = C.open_hindcast(all_paths[:1])
    spacing = _route_for_500_samples(series1)
    print(f"route: {spacing:.4f} NM spacing -> 500 samples; grid {lon.size} x {lat.size} cells; "
          f"cpu count {os.cpu_count()}")
    print(f"load average before: {os.getloadavg()[0]:.2f} (other work on this machine slows every figure)")
    print(f"{'years':>5} {'steps':>6} {'backend':>10} {'time_s':>8} {'pairs/s':>12} {'vs serial':>9}")
    results = {}
    for y in years_list:
        paths = all_paths[:y]
        nsteps = C.open_hindcast(paths).n_steps
        pairs = nsteps * 500
        ts = None
        if y in (years_list[0], years_list[-1]):
            ts, rs = _run(paths, C.SerialBackend(), spacing)
            print(f"{y:>5} {nsteps:>6} {'serial':>10} {ts:>8.2f} {pairs / ts:>12.0f} {1.0:>9.2f}")
        tl, rl = _run(paths, C.LocalPoolBackend(workers=2), spacing)
        results[y] = (tl, rl)
        ratio = f"{ts / tl:>9.2f}" if ts else f"{'':>9}"  # serial baseline on the same data, same session
        print(f"{y:>5} {nsteps:>6} {'local x2':>10} {tl:>8.2f} {pairs / tl:>12.0f} {ratio}")
    if len(years_list) > 1:
        y0, y1 = years_list[0], years_list[-1]
        print(f"growth: {y1} years take {results[y1][0] / results[y0][0]:.2f} x the time of {y0} "
              f"(linear would be {y1 / y0:.2f} x)")
    print(f"peak memory: main process {_maxrss_mb(resource.RUSAGE_SELF):.0f} MB, "
          f"largest finished worker {_maxrss_mb(resource.RUSAGE_CHILDREN):.0f} MB (ru_maxrss)")
    if args.no_dask:
        return
    if not dask_available():
        print("dask.distributed not importable: Dask comparison skipped")
        return
    _dask_side_by_side(all_paths[:years_list[-1]], spacing, results[years_list[-1]][1])


def _dask_side_by_side(paths, spacing, local_result) -> None:
    """Serial, local pool x2, and a real scheduler with 1 and 2 worker processes on loopback
    (``dask scheduler`` / ``dask worker``, started here and stopped after), same data, same
    session; each figure the median of REPEAT runs; results compared with the serial run."""
    from _dask_cli import LoopbackCluster, dask_cli

    fields = ("class_share", "window_probability", "mean_wait_h", "wait_censored", "route_ok_share")

    def same(a, b):
        return all(np.array_equal(getattr(a, f), getattr(b, f), equal_nan=True) for f in fields)

    def med(backend):
        runs = [_run(paths, backend, spacing) for _ in range(REPEAT)]
        return statistics.median(t for t, _ in runs), runs[0][1]

    rows = [("serial",) + med(C.SerialBackend()), ("local pool x2",) + med(C.LocalPoolBackend(workers=2))]
    if dask_cli() is None:
        print("the `dask` command-line tool is not installed: real-cluster comparison skipped")
    else:
        for nw in (1, 2):
            with LoopbackCluster(_pkg_parent(), n_workers=nw) as cl:
                rows.append((f"dask scheduler + {nw} worker{'s' if nw > 1 else ''}",) + med(C.DaskBackend(address=cl.address)))
    t_ser, r_ser = rows[0][1], rows[0][2]
    print(f"{len(paths)} years, median of {REPEAT} (load average {os.getloadavg()[0]:.2f}):")
    for name, t, r in rows:
        print(f"  {name:<26} {t:>7.2f} s  {t / t_ser:>5.2f} x serial  identical to serial: {same(r, r_ser)}")
    print(f"  local pool identical to serial: {same(local_result, r_ser)}")


def _pkg_parent() -> str:
    """Folder holding the ``seaway_comfort`` link that _pkg put on sys.path."""
    return next(p for p in sys.path if (Path(p or ".") / "seaway_comfort").exists())


if __name__ == "__main__":
    sys.exit(main())
