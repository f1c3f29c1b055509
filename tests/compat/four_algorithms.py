# SPDX-License-Identifier: GPL-2.0-or-later
"""Run all four algorithms through ``qgis_process`` on the invented demo data, for comparing QGIS versions.

    python -P tests/compat/four_algorithms.py run OUT          # on this machine's QGIS
    python -P tests/compat/four_algorithms.py compare OUT_A OUT_B [--rel 1e-9]

``make compat OUT=...`` runs it on the host; ``bash .ci/chroot_test.sh trixie compat OUT=...`` in
the Debian 13 chroot (QGIS 3.40). ``compare`` reads every GeoPackage table and CSV of both folders
and reports the largest relative difference of each numeric column and every text difference;
exit 1 when a number differs by more than ``--rel`` or a text (date-times included) differs.
Invented data only; not part of the test suite (it needs two QGIS installations).
"""
from __future__ import annotations

import csv
import json
import sqlite3
import sys
from pathlib import Path
from typing import Dict, List, Tuple

import numpy as np


def _leg_route(src: str, dst: Path) -> str:
    """The demo route's first leg as its own one-feature route (the sweep and the climate take one line)."""
    data = json.loads(Path(src).read_text())
    data["features"] = data["features"][:1]
    dst.write_text(json.dumps(data))
    return str(dst)


def run(out: Path) -> int:
    from seaway_comfort.processing.core.demo.scenario import build_demo_scenario
    from seaway_comfort.processing.core.demo.synthetic_hindcast import write_seasonal_hindcast
    from seaway_comfort.processing.demo_runner import prepare_qgis_env, run_qgis_process

    out.mkdir(parents=True, exist_ok=True)
    scen = build_demo_scenario(str(out / "data"))
    hind = write_seasonal_hindcast(str(out / "hindcast"), [2030])
    env = prepare_qgis_env(out)
    leg = _leg_route(scen.route_path, out / "leg1.geojson")
    climate_route = out / "climate_route.geojson"
    climate_route.write_text(json.dumps({"type": "FeatureCollection", "features": [{
        "type": "Feature", "properties": {"name": "invented climate leg"},
        "geometry": {"type": "LineString", "coordinates": [[-9.5, 41.5], [-7.0, 42.8]]}}]}))
    dep = str(scen.legs[0]["depart_utc"])
    dep_to = str(np.datetime64(dep.rstrip("Z")) + np.timedelta64(24, "h")) + "Z"
    runs: List[Tuple[str, List[str]]] = [
        ("seawaycomfort:describeseastate", [f"INPUT={scen.netcdf_path}", f"OUTPUT_REPORT={out / 'describe.txt'}"]),
        ("seawaycomfort:routecomfort", [
            f"ROUTE={scen.route_path}", f"SEA_STATE={scen.netcdf_path}", f"DEPTH={scen.bathymetry_path}",
            f"DEPARTURE={dep}", "SPEED_KN=9", f"VESSEL={scen.vessel}",
            f"OUTPUT_POINTS={out / 'route_points.gpkg'}", f"OUTPUT_SEGMENTS={out / 'route_segments.gpkg'}"]),
        ("seawaycomfort:departuresweep", [
            f"ROUTE={leg}", f"SEA_STATE={scen.netcdf_path}", "SPEED_KN=9",
            f"VESSEL={scen.vessel}", f"DEPART_FROM={dep}", f"DEPART_TO={dep_to}", "DEPART_STEP_H=6",
            f"OUTPUT_TABLE={out / 'sweep_table.gpkg'}"]),
        ("seawaycomfort:seasonalclimate", [
            f"ROUTE={climate_route}", *[f"HINDCAST={h}" for h in hind], "SPEED_KN=10",
            f"VESSEL={scen.vessel}", "WORKERS=1", f"OUTPUT_SEGMENTS={out / 'climate_segments.gpkg'}",
            f"OUTPUT_CSV={out / 'climate.csv'}"]),
    ]
    for alg, params in runs:
        res = run_qgis_process(alg, params, env)
        print(f"{alg}: ok ({len(res.get('results', {}))} results)")
    return 0


def _gpkg_rows(path: Path) -> Dict[str, List[Dict[str, object]]]:
    con = sqlite3.connect(str(path))
    try:
        tables = [r[0] for r in con.execute("select table_name from gpkg_contents where data_type in ('features','attributes')")
                  if r[0] != "layer_styles"]  # QGIS's own style XML differs by version by design
        out = {}
        for t in tables:
            cols = [r[1] for r in con.execute(f'pragma table_info("{t}")') if r[1] != "geom"]
            out[t] = [dict(zip(cols, row)) for row in con.execute(f'select {",".join(chr(34) + c + chr(34) for c in cols)} from "{t}" order by 1')]
        return out
    finally:
        con.close()


def _csv_rows(path: Path) -> Dict[str, List[Dict[str, object]]]:
    with open(path, newline="") as fh:
        rows = [{k: _maybe_float(v) for k, v in r.items()} for r in csv.DictReader(fh)]
    return {path.name: rows}


def _maybe_float(v: str) -> object:
    try:
        return float(v)
    except (TypeError, ValueError):
        return v


def compare(a: Path, b: Path, rel: float) -> int:
    bad = 0
    for fa in sorted(list(a.glob("*.gpkg")) + list(a.glob("*.csv"))):
        fb = b / fa.name
        read = _gpkg_rows if fa.suffix == ".gpkg" else _csv_rows
        ta, tb = read(fa), read(fb)
        for t in ta:
            ra, rb = ta[t], tb.get(t, [])
            worst, texts = 0.0, set()
            if len(ra) != len(rb):
                print(f"{fa.name}:{t}: {len(ra)} vs {len(rb)} rows")
                bad += 1
                continue
            for x, y in zip(ra, rb):
                for k, u in x.items():
                    v = y.get(k)
                    if isinstance(u, float) and isinstance(v, float):
                        worst = max(worst, abs(u - v) / max(abs(u), abs(v), 1e-300))
                    elif u != v and k != "fid":
                        texts.add((k, str(u)[:32], str(v)[:32]))
            ok = worst <= rel and not texts
            bad += not ok
            print(f"{fa.name}:{t}: {len(ra)} rows, largest relative difference {worst:.3g}, "
                  f"{len(texts)} text differences {sorted(texts)[:3]} -> {'same' if ok else 'DIFFERENT'}")
    return 1 if bad else 0


def main(argv: List[str]) -> int:
    if len(argv) >= 2 and argv[0] == "run":
        return run(Path(argv[1]).resolve())
    if len(argv) >= 3 and argv[0] == "compare":
        rel = float(argv[argv.index("--rel") + 1]) if "--rel" in argv else 1e-9
        return compare(Path(argv[1]), Path(argv[2]), rel)
    print(__doc__)
    return 2


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
