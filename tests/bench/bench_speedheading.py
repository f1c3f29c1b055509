# SPDX-License-Identifier: GPL-2.0-or-later
"""Benchmark of the speed x course diagram (prints figures; no assertions; not collected by pytest).

Run:  .venv/bin/python -P tests/bench/bench_speedheading.py

Case: 5 speeds (0 .. 1.2 x service speed) x 24 courses (15 deg) at one point and time of a
generated 3-hourly 0.25 deg NetCDF-CF sea (invented values, written before any timing), the
coastal survey vessel's first station.

Figures printed:
1. ``speed_heading`` (one sampling + one response call for all 120 cells), after start-up (one
   warm-up call first; best of 5); target < 0.5 s.
2. Baseline in the same run: the same 120 cells as 120 separate single-sample passage calls
   (``sample_sea_at`` + ``respond_motions`` per cell, as a loop over the passage engine would do);
   best of 3. The ratio baseline / diagram is printed.
"""
from __future__ import annotations

import sys
import tempfile
import time
from pathlib import Path
from typing import Callable, List

sys.path.insert(0, str(Path(__file__).resolve().parent))  # -P drops the script folder
import _pkg  # noqa: E402,F401  (exposes the checkout as `seaway_comfort`)

import numpy as np  # noqa: E402

T0 = np.datetime64("2031-07-01T00:00", "ms")  # invented scenario
TARGET_S = 0.5


def _best_of(fn: Callable[[], object], repeat: int) -> float:
    times: List[float] = []
    for _ in range(repeat):
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return min(times)


def _sea(folder: str) -> str:
    from seaway_comfort.processing.core.demo.writers import write_cf_netcdf

    lon, lat = np.arange(-2.0, 2.01, 0.25), np.arange(50.0, 54.01, 0.25)
    times = T0 + np.arange(9) * np.timedelta64(3, "h")
    shape = (times.size, lat.size, lon.size)
    rng = np.random.default_rng(1)
    path = str(Path(folder) / "bench_sh.nc")
    write_cf_netcdf(path, lon, lat, times, {
        "sea_surface_wave_significant_height": 1.5 + 0.5 * rng.random(shape),
        "sea_surface_wave_period_at_variance_spectral_density_maximum": 7.0 + rng.random(shape),
        "sea_surface_wave_from_direction": 250.0 + 20.0 * rng.random(shape),
    })
    return path


def main() -> None:
    from seaway_comfort.processing.core.passage.plan import Track
    from seaway_comfort.processing.core.passage.polar import speed_heading
    from seaway_comfort.processing.core.passage.respond import respond_motions
    from seaway_comfort.processing.core.passage.sample import sample_sea_at
    from seaway_comfort.processing.core.seastate import open_sea_state
    from seaway_comfort.processing.core.vessel.profile import resolve_vessel

    profile = resolve_vessel("coastal_survey_35m")
    with tempfile.TemporaryDirectory() as folder:
        src = open_sea_state(_sea(folder))
        t = T0 + np.timedelta64(7, "h")
        run = lambda: speed_heading(1.0, 52.0, t, [src], profile)  # noqa: E731
        res = run()  # start-up: imports, first GDAL reads
        fast = _best_of(run, 5)

        def loop() -> None:
            for v, c in zip(res.speed_kn, res.course_deg):
                one = Track(lon_deg=np.array([1.0]), lat_deg=np.array([52.0]), course_deg=np.array([c]),
                            speed_kn=np.array([v]), eta_utc=np.array([t], dtype="datetime64[ms]"))
                respond_motions(one, sample_sea_at(one, [src]), profile)

        slow = _best_of(loop, 3)
        src.close()
    print(f"speedheading: {res.n} cells ({len(res.speeds_kn)} speeds x {res.courses.size} courses)")
    print(f"  speed_heading (one sampling, one response call), warm, best of 5: {fast:.3f} s "
          f"(target < {TARGET_S} s: {'met' if fast < TARGET_S else 'NOT met'})")
    print(f"  baseline: {res.n} single-sample passage calls, best of 3: {slow:.3f} s; ratio {slow / fast:.1f} x")


if __name__ == "__main__":
    main()
