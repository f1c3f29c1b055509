# SPDX-License-Identifier: GPL-2.0-or-later
"""Benchmark of the comfort-optimal track search (prints figures; no assertions; not collected).

Run:  .venv/bin/python -P tests/bench/bench_track.py

Case (invented): a 300 NM passage due east along 10 S at 10 kn, a 0.1 deg, 3-hourly NetCDF-CF
forecast over 6 days (written before timing) with a swell varying in space and time and a
storm cell drifting across the direct track; default search settings.

Figures printed:
1. ``plan_tracks`` in one call (cold: response tables built inside; warm: best of 2), target
   < 30 s on 2 cores;
2. baseline measured in the same run: evaluating candidate tracks one by one with
   ``compute_passage`` (as routecomfort does), timed on 20 lattice tracks and extrapolated
   to as many candidate tracks as the search evaluated in samples (samples evaluated / samples
   of one reference track).
"""
from __future__ import annotations

import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))  # -P drops the script folder
import _pkg  # noqa: E402,F401

import numpy as np  # noqa: E402

T0 = np.datetime64("2031-07-01T00:00", "ms")


def make_forecast(path: str) -> str:
    from seaway_comfort.processing.core.demo.writers import write_cf_netcdf

    lon = np.round(np.arange(-1.0, 6.5001, 0.1), 6)
    lat = np.round(np.arange(-14.0, -6.0001, 0.1), 6)
    nt = 6 * 8 + 1
    times = T0 + np.arange(nt) * np.timedelta64(3, "h")
    th = np.arange(nt)[:, None, None] * 3.0
    X, Y = np.meshgrid(lon, lat)
    cx = 2.0 + 0.02 * th
    storm = np.clip(1.0 - np.hypot(X[None] - cx, Y[None] + 10.0) / 0.9, 0.0, 1.0)
    hs = 1.3 + 0.3 * np.sin(th / 20.0 + X[None]) + 3.5 * storm
    tp = 7.0 + 0.2 * (Y[None] + 10.0) + 3.0 * storm
    wdir = 100.0 + 20.0 * np.sin(X[None] / 3.0 + th / 30.0)
    write_cf_netcdf(path, lon, lat, times, {
        "sea_surface_wave_significant_height": hs,
        "sea_surface_wave_period_at_variance_spectral_density_maximum": tp,
        "sea_surface_wave_from_direction": wdir,
    })
    return path


def main() -> None:
    from seaway_comfort.processing.core.passage.pipeline import compute_passage
    from seaway_comfort.processing.core.routing.engine import plan_tracks, track_fields
    from seaway_comfort.processing.core.routing.lattice import build_lattice, lattice_settings
    from seaway_comfort.processing.core.seastate import open_sea_state
    from seaway_comfort.processing.core.vessel.profile import resolve_vessel

    folder = tempfile.mkdtemp(prefix="bench_track_")
    src = open_sea_state(make_forecast(str(Path(folder) / "f.nc")))
    prof = resolve_vessel("coastal_survey_35m")
    route = ([0.0, 5.07], [-10.0, -10.0])
    kw = dict(departure_utc=T0 + np.timedelta64(6, "h"), speed_kn=10.0, sea_states=[src], profile=prof)
    times = []
    for _ in range(3):
        t = time.perf_counter()
        plan = plan_tracks(*route, **kw)
        times.append(time.perf_counter() - t)
    ref = plan.get("reference").result
    print(f"reference {track_fields(plan.get('reference'))['dist_nm']:.1f} NM, {ref.n} samples; search {plan.stats}")
    for a in plan.alternatives:
        f = track_fields(a)
        print(f"  {f['alternative']:9s} {f['dist_nm']:6.1f} NM {f['hours']:6.2f} h max MSI {f['msi_max_pct']:5.1f} % "
              f"taxing {f['hours_taxing']:5.2f} h flags {f['flags'] or '-'}")
    print(f"plan_tracks one call: cold {times[0]:.2f} s, warm {min(times[1:]):.2f} s (target < 30 s)")
    st = lattice_settings(300.0, 30.0)
    lat = build_lattice(np.array(route[0]), np.array(route[1]), st, 30.0)
    rng = np.random.default_rng(0)
    n_try, t = 20, time.perf_counter()
    for _ in range(n_try):
        k = np.clip(st.n_side + np.cumsum(rng.integers(-1, 2, lat.lon_deg.shape[0])), 0, 2 * st.n_side)
        k[0] = k[-1] = st.n_side
        s = np.arange(k.size)
        compute_passage(lat.lon_deg[s, k], lat.lat_deg[s, k], **kw)
    per = (time.perf_counter() - t) / n_try
    n_equiv = plan.stats["samples_evaluated"] / ref.n
    print(f"one by one: {per * 1000:.0f} ms per candidate track (compute_passage, {n_try} timed); the search "
          f"evaluated {plan.stats['samples_evaluated']:.0f} samples = {n_equiv:.0f} tracks -> "
          f"{per * n_equiv:.1f} s one by one vs {min(times[1:]):.2f} s ({per * n_equiv / min(times[1:]):.1f}x)")
    src.close()


if __name__ == "__main__":
    main()
