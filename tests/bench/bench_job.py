# SPDX-License-Identifier: GPL-2.0-or-later
"""Whole job measured from outside: ``qgis_process`` runs of routecomfort against QGIS's own
``native:rastersampling`` of just the Hs bands at the same points (prints figures; no assertions).

Run:  .venv/bin/python -P tests/bench/bench_job.py [--repeat 3]

Case: a 10-day, 3-hourly, 0.1 deg invented forecast (NetCDF-CF, processing/core/demo/writers.py;
9 variables) and a 500 NM route sampled into about 2 400 samples at 12 kn. The plugin is
enabled in a temporary QGIS profile (QGIS_CUSTOM_CONFIG_PATH), response tables are cached in
a temporary SEAWAY_CACHE_DIR. Printed, same machine and same run:
1. ``seawaycomfort:routecomfort`` (points, segments, styles, HTML report): the first run with an
   empty table cache, then the median of ``--repeat`` runs (cache warm);
2. ``native:rastersampling`` of the Hs variable (all time steps = bands, through a VRT of the
   NetCDF variable) at the route's sample points, median of ``--repeat`` runs, interleaved with
   1.; the ratio 1. / 2.;
3. the split by part: start-up = ``qgis_process`` listing the algorithm's help (QGIS, Processing
   and the plugin loaded, nothing run), and, timed alone in this process on the same inputs,
   reading (sea-state sampling), tables (build with an empty cache / load from the warm cache),
   response (motions and comfort with the tables in memory), report (HTML); writing = the
   warm whole job minus all these (remainder: layers, styles, files).
"""
from __future__ import annotations

import argparse
import json
import os
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path
from typing import List

sys.path.insert(0, str(Path(__file__).resolve().parent))  # -P drops the script folder
import _pkg  # noqa: E402,F401  (exposes the checkout as `seaway_comfort`)

import numpy as np  # noqa: E402

from _timing import median_time as _median  # noqa: E402
from bench_route import T0, make_forecast, route_vertices  # noqa: E402

QGIS_PROCESS = "/usr/bin/qgis_process.bin" if os.path.exists("/usr/bin/qgis_process.bin") else "qgis_process"
N_TARGET = 2400
SPEED_KN = 12.0
VESSEL = "coastal_survey_35m"


def _timed(cmd: List[str], env: dict) -> float:
    t = time.perf_counter()
    p = subprocess.run(cmd, env=env, capture_output=True, text=True, timeout=600)
    dt = time.perf_counter() - t
    if p.returncode != 0:
        raise RuntimeError(f"{' '.join(cmd[:4])} failed:\n{p.stderr[-2000:]}{p.stdout[-2000:]}")
    return dt


def _env(tmp: str) -> dict:
    """qgis_process environment: the plugin enabled in a temporary profile, own table cache."""
    root = Path(tmp) / "qgis-profile"
    ini = root / "profiles" / "default" / "QGIS" / "QGIS3.ini"
    ini.parent.mkdir(parents=True)
    ini.write_text("[PythonPlugins]\nseaway_comfort=true\n")
    pkg_parent = next(p for p in sys.path if (Path(p or ".") / "seaway_comfort").exists())
    env = dict(os.environ)
    env.update({"QT_QPA_PLATFORM": "offscreen", "QGIS_PLUGINPATH": pkg_parent, "QGIS_CUSTOM_CONFIG_PATH": str(root),
                "SEAWAY_CACHE_DIR": os.path.join(tmp, "table-cache")})
    env.pop("PYTHONPATH", None)
    return env


def _write_inputs(tmp: str, spacing_nm: float, plan) -> tuple:
    lon, lat = route_vertices()
    route = os.path.join(tmp, "route.geojson")
    with open(route, "w") as fh:
        json.dump({"type": "FeatureCollection", "features": [{"type": "Feature", "properties": {"name": "bench"},
                   "geometry": {"type": "LineString", "coordinates": [[a, b] for a, b in zip(lon, lat)]}}]}, fh)
    pts = os.path.join(tmp, "samples.geojson")
    with open(pts, "w") as fh:
        json.dump({"type": "FeatureCollection", "features": [
            {"type": "Feature", "properties": {"seq": i}, "geometry": {"type": "Point", "coordinates": [float(a), float(b)]}}
            for i, (a, b) in enumerate(zip(plan.lon_deg, plan.lat_deg))]}, fh)
    return route, pts


def _hs_bands(nc: str, tmp: str) -> str:
    """A VRT of the NetCDF file's Hs variable, every time step a band (no data copied:
    qgis_process does not take a GDAL subdataset string as a layer, a VRT file it does)."""
    from osgeo import gdal

    gdal.UseExceptions()
    path = os.path.join(tmp, "hs_bands.vrt")
    gdal.Translate(path, f'NETCDF:"{nc}":hs', format="VRT")
    return path


def _spacing_for(lon, lat, departure) -> tuple:
    from seaway_comfort.processing.core.passage.pipeline import plan_passage

    lo, hi = 0.05, 1.0
    for _ in range(60):
        mid = 0.5 * (lo + hi)
        plan = plan_passage(lon, lat, departure_utc=departure, speed_kn=SPEED_KN, spacing_nm=mid)
        if plan.n == N_TARGET:
            break
        lo, hi = (mid, hi) if plan.n > N_TARGET else (lo, mid)
    return mid, plan


def _core_parts(nc: str, plan, repeat: int, tmp: str) -> dict:
    """Reading, tables (cold, warm), response, report timed alone in this process."""
    from seaway_comfort.processing.core import api
    from seaway_comfort.processing.core.passage.pipeline import respond, sample_sea
    from seaway_comfort.processing.core.reports.passage import ReportInputs, build_report, render_html
    from seaway_comfort.processing.core.seastate import open_sea_state
    from seaway_comfort.processing.core.vessel.profile import resolve_vessel

    profile = resolve_vessel(VESSEL)

    def read() -> object:
        src = open_sea_state(nc)
        try:
            return sample_sea(plan, [src])
        finally:
            src.close()

    out = {"reading": _median(read, repeat)}
    sea = read()
    speed = float(plan.speed_kn[0]) * 1852.0 / 3600.0

    def tables(cold: bool) -> object:
        os.environ["SEAWAY_CACHE_DIR"] = tempfile.mkdtemp(dir=tmp) if cold else os.path.join(tmp, "core-cache")
        api._TABLE_CACHE.clear()
        return api._table_set(profile, profile.station(None), api.transfer_model(profile), np.array([speed]), None,
                              3.3, 4.0, False, 48, 24)

    tables(False)
    out["tables (build)"] = _median(lambda: tables(True), repeat)
    out["tables (load)"] = _median(lambda: tables(False), repeat)
    res = respond(plan, sea, profile)
    out["response"] = _median(lambda: respond(plan, sea, profile), repeat)
    out["method"] = res.method
    rep = build_report([("bench", res)], ReportInputs())
    out["report"] = _median(lambda: render_html(rep), repeat)
    return out


def main(argv: List[str]) -> int:
    ap = argparse.ArgumentParser()
    ap.add_argument("--repeat", type=int, default=3)
    args = ap.parse_args(argv)
    tmp = tempfile.mkdtemp(prefix="seaway_bench_job_")
    try:
        nc = make_forecast(tmp, 10)
        lon, lat = route_vertices()
        departure = T0 + np.timedelta64(12, "h")
        spacing, plan = _spacing_for(lon, lat, departure)
        route, pts = _write_inputs(tmp, spacing, plan)
        env = _env(tmp)
        hs_vrt = _hs_bands(nc, tmp)
        print(f"case: {plan.n} samples ({spacing:.4f} NM spacing, {plan.dist_m[-1] / 1852:.0f} NM at {SPEED_KN:g} kn), "
              f"10-day 3-hourly 0.1 deg forecast {os.path.getsize(nc) / 1e6:.0f} MB; cpu count {os.cpu_count()}, "
              f"load average {os.getloadavg()[0]:.2f}")

        def ours() -> List[str]:
            out = tempfile.mkdtemp(dir=tmp)
            return [QGIS_PROCESS, "run", "seawaycomfort:routecomfort", "--", f"ROUTE={route}", f"SEA_STATE={nc}",
                    f"DEPARTURE={departure}Z", f"SPEED_KN={SPEED_KN}", f"VESSEL={VESSEL}", f"SPACING_NM={spacing!r}",
                    f"OUTPUT_POINTS={out}/p.gpkg", f"OUTPUT_SEGMENTS={out}/s.gpkg", f"OUTPUT_REPORT={out}/r.html"]

        def native() -> List[str]:
            out = tempfile.mkdtemp(dir=tmp)
            return [QGIS_PROCESS, "run", "native:rastersampling", "--", f"INPUT={pts}",
                    f"RASTERCOPY={hs_vrt}", "COLUMN_PREFIX=hs_",
                    f"OUTPUT={out}/hs.gpkg"]

        cold = _timed(ours(), env)
        t_ours, t_native, t_start = [], [], []
        for _ in range(args.repeat):
            t_ours.append(_timed(ours(), env))
            t_native.append(_timed(native(), env))
            t_start.append(_timed([QGIS_PROCESS, "help", "seawaycomfort:routecomfort"], env))
        m_ours, m_native, m_start = (statistics.median(v) for v in (t_ours, t_native, t_start))
        print(f"qgis_process seawaycomfort:routecomfort  first run (empty table cache) {cold:6.2f} s")
        print(f"qgis_process seawaycomfort:routecomfort  median of {args.repeat}            {m_ours:6.2f} s  {t_ours}")
        print(f"qgis_process native:rastersampling (Hs)  median of {args.repeat}            {m_native:6.2f} s  {t_native}")
        print(f"RATIO routecomfort / rastersampling = {m_ours / m_native:.2f}  (first run: {cold / m_native:.2f})")
        parts = _core_parts(nc, plan, args.repeat, tmp)
        known = m_start + parts["reading"] + parts["tables (load)"] + parts["response"] + parts["report"]
        print(f"split of the warm run (method {parts['method']}; start-up from `qgis_process help`, the rest timed "
              f"alone in this process, median of {args.repeat}):")
        for name, v in (("start-up (QGIS, Processing, plugin)", m_start), ("reading (sea-state sampling)", parts["reading"]),
                        ("tables, load from the disk cache", parts["tables (load)"]),
                        ("response (motions, comfort, dose)", parts["response"]), ("report (HTML)", parts["report"]),
                        ("writing (layers, styles, files; remainder)", max(m_ours - known, 0.0))):
            print(f"  {name:<44} {v:6.3f} s")
        print(f"  (tables built with an empty cache instead: {parts['tables (build)']:.3f} s)")
        print(f"load average after: {os.getloadavg()[0]:.2f}")
    finally:
        shutil.rmtree(tmp, ignore_errors=True)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
