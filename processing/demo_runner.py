# SPDX-License-Identifier: GPL-2.0-or-later
"""The demo: build the invented scenario, run the algorithms headless, write a styled project.

``python -m seaway_comfort demo --out <dir>`` calls :func:`main`. Steps:

1. write the invented "Merrow Reach" scenario (forecast as NetCDF-CF and GRIB2, bathymetry,
   a two-leg route) into ``<dir>/data`` (:mod:`.core.demo_scenario`);
2. run ``seawaycomfort:describeseastate`` and ``seawaycomfort:routecomfort`` through
   ``/usr/bin/qgis_process.bin`` with an isolated QGIS profile in ``<dir>/.qgis-profile``;
3. write ``<dir>/seaway_demo.qgz`` with the styled point and segment layers (their QML styles
   applied), the invented island and the bathymetry, and print a short summary and the paths.
"""
from __future__ import annotations

import argparse
import json
import os
import shutil
import subprocess
import sys
import time
from pathlib import Path
from typing import Dict, List, Optional, Sequence

from .core.flags import CAUTION
from .core.validation import show

QGIS_PROCESS = "/usr/bin/qgis_process.bin"
PACKAGE_NAME = "seaway_comfort"


def _package_dir() -> Path:
    return Path(__file__).resolve().parent.parent


def prepare_qgis_env(out_dir: Path) -> Dict[str, str]:
    """Environment for qgis_process: the plugin on QGIS_PLUGINPATH, enabled in a fresh profile."""
    plugins = out_dir / ".qgis-plugins"
    plugins.mkdir(parents=True, exist_ok=True)
    link = plugins / PACKAGE_NAME
    if link.is_symlink() or link.exists():
        if link.is_symlink():
            link.unlink()
        else:
            shutil.rmtree(link)
    os.symlink(_package_dir(), link, target_is_directory=True)
    profile_root = out_dir / ".qgis-profile"
    ini = profile_root / "profiles" / "default" / "QGIS" / "QGIS3.ini"
    ini.parent.mkdir(parents=True, exist_ok=True)
    ini.write_text(f"[PythonPlugins]\n{PACKAGE_NAME}=true\n", encoding="utf-8")
    env = dict(os.environ)
    env["QT_QPA_PLATFORM"] = "offscreen"
    env["QGIS_PLUGINPATH"] = str(plugins)
    env["QGIS_CUSTOM_CONFIG_PATH"] = str(profile_root)
    env.setdefault("PROJ_DATA", "/usr/share/proj")
    env.pop("PYTHONPATH", None)  # qgis_process uses the system Python; our package comes via QGIS_PLUGINPATH
    return env


def run_qgis_process(alg: str, params: Sequence[str], env: Dict[str, str], *, timeout_s: float = 600) -> Dict:
    """Run one algorithm with ``qgis_process.bin --json``; return the parsed JSON or raise."""
    if not os.path.exists(QGIS_PROCESS):
        raise RuntimeError(f"{QGIS_PROCESS} not found: install QGIS (make setup) first")
    cmd = [QGIS_PROCESS, "--json", "run", alg, "--", *params]
    proc = subprocess.run(cmd, env=env, capture_output=True, text=True, timeout=timeout_s)
    start = proc.stdout.find("{")
    if proc.returncode != 0 or start < 0:
        tail = (proc.stderr or "").strip().splitlines()[-15:]
        raise RuntimeError(f"{alg} failed (exit {proc.returncode}):\n" + "\n".join(tail)
                           + "\n" + proc.stdout[-2000:])
    return json.loads(proc.stdout[start:])


def _style_depth(layer: object) -> None:
    """Depth in blues, light for shallow water, dark for deep (QGIS's built-in 'Blues' ramp)."""
    from qgis.core import QgsColorRampShader, QgsRasterShader, QgsSingleBandPseudoColorRenderer, QgsStyle

    ramp = QgsStyle.defaultStyle().colorRamp("Blues")
    if ramp is None:
        return
    shader_fn = QgsColorRampShader(0.0, 2500.0, ramp)
    shader_fn.classifyColorRamp(8)
    shader = QgsRasterShader()
    shader.setRasterShaderFunction(shader_fn)
    renderer = QgsSingleBandPseudoColorRenderer(layer.dataProvider(), 1, shader)
    renderer.setClassificationMin(0.0)
    renderer.setClassificationMax(2500.0)
    layer.setRenderer(renderer)
    layer.setOpacity(0.55)  # keep the dark comfort classes readable on deep water


def write_project(out_dir: Path, points: str, segments: str, bathymetry: str, report: str,
                  land: str = "") -> str:
    """A QGIS project with the styled outputs (QML applied) and the bathymetry underneath."""
    from .standalone import run_with_qgis

    return run_with_qgis(lambda: _write_project(out_dir, points, segments, bathymetry, report, land))


def _write_project(out_dir: Path, points: str, segments: str, bathymetry: str, report: str,
                   land: str) -> str:
    from qgis.PyQt.QtGui import QColor
    from qgis.core import QgsCoordinateReferenceSystem, QgsProject, QgsRasterLayer, QgsVectorLayer

    from .styling import qml_path_for

    project = QgsProject()
    project.setCrs(QgsCoordinateReferenceSystem("EPSG:4326"))
    project.setTitle("Seaway Comfort demo: Merrow Reach (invented scenario)")
    layers = []
    depth = QgsRasterLayer(bathymetry, "Depth (invented bathymetry, m)", "gdal")
    if depth.isValid():
        _style_depth(depth)
        layers.append(depth)
    if land and os.path.exists(land):
        island = QgsVectorLayer(land, "Land (invented)", "ogr")
        if island.isValid():
            island.renderer().symbol().setColor(QColor("#d8c9a3"))
            layers.append(island)
    for path, name in ((segments, "Passage segments"), (points, "Passage samples")):
        layer = QgsVectorLayer(path, name, "ogr")
        if not layer.isValid():
            raise RuntimeError(f"output {show(path)} could not be opened")
        qml = qml_path_for(path)
        if os.path.exists(qml):
            layer.loadNamedStyle(qml)
        layers.append(layer)
    for layer in layers:
        project.addMapLayer(layer)
    project.writeEntry("SeawayComfort", "/report", report)
    project.writeEntry("SeawayComfort", "/caution", CAUTION)
    target = str(out_dir / "seaway_demo.qgz")
    if not project.write(target):
        raise RuntimeError(f"could not write {target}: {project.error()}")
    project.clear()
    return target


def main(argv: Optional[List[str]] = None) -> int:
    """Build and run the demo; 0 on success."""
    from .core.demo.scenario import build_demo_scenario

    parser = argparse.ArgumentParser(prog="python -m seaway_comfort demo",
                                     description="Run the invented Merrow Reach demo passage.")
    parser.add_argument("--out", default="demo_output", help="output folder (created)")
    parser.add_argument("--spacing-nm", type=float, default=1.0, help="sample spacing along the route")
    args = parser.parse_args(argv)
    out = Path(args.out).resolve()
    t_start = time.monotonic()
    try:
        out.mkdir(parents=True, exist_ok=True)
        scen = build_demo_scenario(str(out / "data"))
        env = prepare_qgis_env(out)
        desc = run_qgis_process("seawaycomfort:describeseastate", [
            f"INPUT={scen.grib_path}", f"OUTPUT_REPORT={out / 'forecast_description.txt'}",
        ], env)
        points = str(out / "passage_points.gpkg")
        segments = str(out / "passage_segments.gpkg")
        report = str(out / "passage_report.html")
        for old in (points, segments, report):
            if os.path.exists(old):
                os.remove(old)
        res = run_qgis_process("seawaycomfort:routecomfort", [
            f"ROUTE={scen.route_path}",
            f"SEA_STATE={scen.netcdf_path}",
            f"SEA_STATE={scen.grib_path}",
            "SOURCE_NAMES=Merrow NetCDF,Merrow GRIB",
            f"DEPTH={scen.bathymetry_path}",
            f"DEPARTURE={scen.legs[0]['depart_utc']}",
            f"SPEED_KN={scen.legs[0]['speed_kn']}",
            f"VESSEL={scen.vessel}",
            f"SPACING_NM={args.spacing_nm}",
            f"OUTPUT_POINTS={points}",
            f"OUTPUT_SEGMENTS={segments}",
            f"OUTPUT_REPORT={report}",
        ], env)
        project = write_project(out, points, segments, scen.bathymetry_path, report, scen.land_path)
    except Exception as exc:  # noqa: BLE001 - the demo reports any failure and exits non-zero
        print(f"demo failed: {exc}", file=sys.stderr)
        return 1
    results = res.get("results", {})
    print(results.get("SUMMARY", "").strip())
    print()
    print(f"forecast description: {desc.get('results', {}).get('OUTPUT_REPORT', '')}")
    print(f"points:   {points}")
    print(f"segments: {segments}")
    print(f"report:   {report}")
    print(f"project:  {project}")
    print(f"data:     {scen.folder}  ({scen.description})")
    print(f"done in {time.monotonic() - t_start:.1f} s")
    return 0


if __name__ == "__main__":
    sys.exit(main())
