# SPDX-License-Identifier: GPL-2.0-or-later
"""The demo: build the invented scenario, run the algorithms headless, write a styled project.

``python -m seaway_comfort demo --out <dir>`` calls :func:`main`. Steps:

1. write the invented "Merrow Reach" scenario (forecast as NetCDF-CF and GRIB2, bathymetry,
   a two-leg route) into ``<dir>/data`` (:mod:`.core.demo_scenario`);
2. run ``seawaycomfort:describeseastate`` and ``seawaycomfort:routecomfort`` through
   ``/usr/bin/qgis_process.bin`` with an isolated QGIS profile in ``<dir>/.qgis-profile``;
3. write ``<dir>/seaway_demo.qgz``: the styled point and segment layers (their QML styles
   applied) over the route, the forecast's Hs at departure, the invented island and the
   bathymetry, opening zoomed on the passage; print a short summary and the paths.
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
from dataclasses import dataclass
from typing import Any, Dict, List, Optional, Sequence, Tuple

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


def _pseudocolour(layer: Any, band: int, ramp: Any, top: float, steps: int, opacity: float) -> None:
    """Band ``band`` coloured along ``ramp`` from 0 to ``top`` in ``steps`` classes, at ``opacity``."""
    from qgis.core import QgsColorRampShader, QgsRasterShader, QgsSingleBandPseudoColorRenderer

    shader_fn = QgsColorRampShader(0.0, top, ramp)
    shader_fn.classifyColorRamp(steps)
    shader = QgsRasterShader()
    shader.setRasterShaderFunction(shader_fn)
    renderer = QgsSingleBandPseudoColorRenderer(layer.dataProvider(), band, shader)
    renderer.setClassificationMin(0.0)
    renderer.setClassificationMax(top)
    layer.setRenderer(renderer)
    layer.setOpacity(opacity)


def _style_depth(layer: Any) -> None:
    """Depth in blues, light for shallow water, dark for deep (QGIS's built-in 'Blues' ramp), at 55 %
    opacity to keep the dark comfort classes readable on deep water."""
    from qgis.core import QgsStyle

    ramp = QgsStyle.defaultStyle().colorRamp("Blues")
    if ramp is not None:
        _pseudocolour(layer, 1, ramp, 2500.0, 8, 0.55)


@dataclass(frozen=True)
class DemoLayers:
    """The files the demo project shows (bottom to top: depth, land, forecast, route, outputs)."""

    points: str
    segments: str
    bathymetry: str
    report: str
    land: str = ""
    route: str = ""
    forecast: str = ""
    departure_utc: str = ""


def write_project(out_dir: Path, files: DemoLayers) -> str:
    """A QGIS project with the styled outputs (QML applied) over the route, the forecast's Hs at
    departure, the land and the depth, opening zoomed on the passage."""
    from .standalone import run_with_qgis

    return run_with_qgis(lambda: _write_project(out_dir, files))


def _forecast_band(path: str, departure_utc: str) -> Tuple[str, str]:
    """(GDAL source of the NetCDF Hs grid, 1-based band of the step nearest ``departure_utc``)."""
    import numpy as np
    from osgeo import gdal

    source = f'NETCDF:"{path}":hs'
    ds = gdal.Open(source)
    if ds is None:
        return "", ""
    want_s = float(np.datetime64(str(departure_utc).rstrip("Z"), "s").astype("int64"))
    unit, _, epoch = (ds.GetMetadataItem("time#units") or "").partition(" since ")
    scale_s = {"seconds": 1.0, "minutes": 60.0, "hours": 3600.0, "days": 86400.0}.get(unit.strip())
    if scale_s is None or not epoch.startswith("1970-01-01"):
        return source, "1"  # CF time units of another form: show the first step (demo only)
    best, best_gap = 1, None
    for b in range(1, ds.RasterCount + 1):
        t = ds.GetRasterBand(b).GetMetadataItem("NETCDF_DIM_time")
        if t is None:
            continue
        gap = abs(float(t) * scale_s - want_s)
        if best_gap is None or gap < best_gap:
            best, best_gap = b, gap
    return source, str(best)


def _style_forecast(layer: Any, band: int) -> None:
    """Hs in one band as a grey-to-violet ramp of our own (0-6 m), half transparent, under the route."""
    from qgis.core import QgsGradientColorRamp
    from qgis.PyQt.QtGui import QColor

    _pseudocolour(layer, band, QgsGradientColorRamp(QColor("#f2f0f7"), QColor("#54278f")), 6.0, 7, 0.45)


def _add_canvas_extent(project: Any, extent: Any) -> None:
    """Store the view the desktop opens with (a <mapcanvas> entry as QGIS itself writes one) and
    the project's default view extent."""
    from qgis.core import QgsMapSettings, QgsReferencedRectangle

    project.viewSettings().setDefaultViewExtent(QgsReferencedRectangle(extent, project.crs()))

    def write(doc: Any) -> None:
        settings = QgsMapSettings()
        settings.setDestinationCrs(project.crs())
        settings.setExtent(extent)
        canvas = doc.createElement("mapcanvas")
        canvas.setAttribute("name", "theMapCanvas")
        canvas.setAttribute("annotationsVisible", "1")
        settings.writeXml(canvas, doc)
        doc.documentElement().appendChild(canvas)

    project.writeProject.connect(write)


def _layers(files: DemoLayers) -> List[Any]:
    """The project's layers, bottom first, styled."""
    from qgis.PyQt.QtGui import QColor
    from qgis.core import QgsLineSymbol, QgsRasterLayer, QgsVectorLayer

    from .styling import qml_path_for

    layers: List[Any] = []
    depth = QgsRasterLayer(files.bathymetry, "Depth (m, invented bathymetry)", "gdal")
    if depth.isValid():
        _style_depth(depth)
        layers.append(depth)
    if files.land and os.path.exists(files.land):
        island = QgsVectorLayer(files.land, "Land (invented)", "ogr")
        if island.isValid():
            island.renderer().symbol().setColor(QColor("#d8c9a3"))
            layers.append(island)
    if files.forecast:
        source, band = _forecast_band(files.forecast, files.departure_utc)
        hs = QgsRasterLayer(source, f"Forecast Hs at departure {str(files.departure_utc)[:16]} UTC (m)", "gdal")
        if source and hs.isValid():
            _style_forecast(hs, int(band))
            layers.append(hs)
    if files.route:
        route = QgsVectorLayer(files.route, "Route (2 legs, planned)", "ogr")
        if route.isValid():
            route.setRenderer(route.renderer().clone())
            route.renderer().setSymbol(QgsLineSymbol.createSimple(
                {"line_color": "#202020", "line_width": "0.5", "line_style": "dash"}))
            layers.append(route)
    for path, name in ((files.segments, "Passage segments"), (files.points, "Passage samples")):
        layer = QgsVectorLayer(path, name, "ogr")
        if not layer.isValid():
            raise RuntimeError(f"output {show(path)} could not be opened")
        qml = qml_path_for(path)
        if os.path.exists(qml):
            layer.loadNamedStyle(qml)
        layers.append(layer)
    return layers


def _write_project(out_dir: Path, files: DemoLayers) -> str:
    from qgis.core import QgsCoordinateReferenceSystem, QgsProject, QgsRectangle

    project = QgsProject()
    project.setCrs(QgsCoordinateReferenceSystem("EPSG:4326"))
    project.setTitle("Seaway Comfort demo: Merrow Reach (invented scenario)")
    layers = _layers(files)
    from qgis.core import QgsMapLayerLegendUtils, QgsRasterLayer

    for layer in layers:
        project.addMapLayer(layer, False)
        node = project.layerTreeRoot().insertLayer(0, layer)  # last added on top
        if isinstance(layer, QgsRasterLayer):  # the band row reads "Band 1 (Gray)" otherwise
            QgsMapLayerLegendUtils.setLegendNodeUserLabel(node, 0, "metres" if "Depth" in layer.name() else "Hs, metres")
    extent = QgsRectangle()
    for layer in layers[-2:]:  # the passage: segments and samples
        extent.combineExtentWith(layer.extent())
    extent.scale(1.15)
    _add_canvas_extent(project, extent)
    project.writeEntry("SeawayComfort", "/report", files.report)
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
        project = write_project(out, DemoLayers(
            points, segments, scen.bathymetry_path, report, scen.land_path, scen.route_path, scen.netcdf_path,
            str(scen.legs[0]["depart_utc"])))
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
