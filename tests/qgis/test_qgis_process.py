# SPDX-License-Identifier: GPL-2.0-or-later
"""The algorithms through ``/usr/bin/qgis_process.bin`` (headless, as users script them), and the
demo runner end to end.

Environment as established in the project's QGIS platform notes (s.2b): QT_QPA_PLATFORM=offscreen,
QGIS_PLUGINPATH = a folder holding the ``seaway_comfort`` package, the plugin enabled in an
isolated profile (``[PythonPlugins] seaway_comfort=true``). Repeated ``SEA_STATE=`` arguments are
how qgis_process passes a list. Results are compared with the core pipeline run in this process
on the same inputs, and the written files are read back with QGIS's OGR provider and
xml.etree.
"""
from __future__ import annotations

import json
import os
import subprocess
import xml.etree.ElementTree as ET
from pathlib import Path

import numpy as np
import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")

from seaway_comfort.processing.core.demo import scenario as ds  # noqa: E402
from seaway_comfort.processing.core.flags import CAUTION  # noqa: E402

QGIS_PROCESS = "/usr/bin/qgis_process.bin"


@pytest.fixture(scope="module")
def qp_env(tmp_path_factory, package_parent):
    if not os.path.exists(QGIS_PROCESS):
        pytest.skip(f"{QGIS_PROCESS} not installed")
    root = tmp_path_factory.mktemp("qgis-profile")
    ini = root / "profiles" / "default" / "QGIS" / "QGIS3.ini"
    ini.parent.mkdir(parents=True)
    ini.write_text("[PythonPlugins]\nseaway_comfort=true\n")
    env = dict(os.environ)
    env.update({"QT_QPA_PLATFORM": "offscreen", "QGIS_PLUGINPATH": str(package_parent),
                "QGIS_CUSTOM_CONFIG_PATH": str(root)})
    env.pop("PYTHONPATH", None)
    return env


@pytest.fixture(scope="module")
def demo(tmp_path_factory):
    return ds.build_demo_scenario(str(tmp_path_factory.mktemp("qp-demo")))


def _qp(env, *args, timeout=300):
    proc = subprocess.run([QGIS_PROCESS, *args], env=env, capture_output=True, text=True, timeout=timeout)
    return proc


def test_help_lists_the_interface(qp_env):
    proc = _qp(qp_env, "help", "seawaycomfort:routecomfort")
    assert proc.returncode == 0, proc.stderr[-2000:]
    for pid in ("ROUTE", "SEA_STATE", "SOURCE_NAMES", "DEPTH", "DEPARTURE", "SPEED_KN", "VESSEL", "STATION",
                "SPACING_NM", "GAMMA", "SPREAD_S", "LONG_CRESTED", "OUTPUT_POINTS", "OUTPUT_SEGMENTS", "OUTPUT_REPORT"):
        assert pid in proc.stdout, pid


def test_routecomfort_with_two_sources(qp_env, demo, tmp_path):
    from qgis.core import QgsVectorLayer

    from seaway_comfort.processing.core.passage.pipeline import compute_passage
    from seaway_comfort.processing.core.seastate import open_bathymetry, open_sea_state
    from seaway_comfort.processing.core.vessel.profile import resolve_vessel

    points = tmp_path / "pts.gpkg"
    proc = _qp(qp_env, "--json", "run", "seawaycomfort:routecomfort", "--",
               f"ROUTE={demo.route_path}", f"SEA_STATE={demo.netcdf_path}", f"SEA_STATE={demo.grib_path}",
               "SOURCE_NAMES=nc,grib", f"DEPTH={demo.bathymetry_path}", "SPEED_KN=9", f"VESSEL={demo.vessel}",
               "SPACING_NM=2", f"OUTPUT_POINTS={points}", f"OUTPUT_SEGMENTS={tmp_path / 'seg.gpkg'}",
               f"OUTPUT_REPORT={tmp_path / 'rep.html'}")
    assert proc.returncode == 0, proc.stderr[-3000:] + proc.stdout[-2000:]
    out = json.loads(proc.stdout[proc.stdout.find("{"):])["results"]
    assert CAUTION in out["SUMMARY"]
    layer = QgsVectorLayer(str(points), "p", "ogr")
    feats = sorted(layer.getFeatures(), key=lambda f: (int(f["leg"]), int(f["seq"])))
    # the same legs through the core in this process (first valid source: the NetCDF file)
    srcs = [open_sea_state(demo.netcdf_path, source_name="nc"), open_sea_state(demo.grib_path, source_name="grib")]
    bathy = open_bathymetry(demo.bathymetry_path)
    try:
        core = [compute_passage([c[0] for c in leg["coords"]], [c[1] for c in leg["coords"]],
                                departure_utc=leg["depart_utc"], speed_kn=leg["speed_kn"], sea_states=srcs,
                                profile=resolve_vessel(demo.vessel), depth=bathy, spacing_nm=2.0, leg=i)
                for i, leg in enumerate(demo.legs)]
    finally:
        for s in srcs:
            s.close()
        bathy.close()
    assert len(feats) == sum(r.n for r in core) == int(out["N_SAMPLES"])
    hs = np.array([f["hs_m"] for f in feats], dtype=float)
    np.testing.assert_allclose(hs, np.concatenate([r.hs_m for r in core]), rtol=1e-9)
    msi = np.array([f["msi_pct"] for f in feats], dtype=float)
    np.testing.assert_allclose(msi, np.concatenate([r.msi_pct for r in core]), rtol=1e-9)
    assert {f["source"] for f in feats} <= {"nc", "grib"}
    # styles hold without any post-processor: QML beside the file with the temporal settings
    root = ET.parse(str(points)[:-5] + ".qml").getroot()
    assert root.find("renderer-v2").get("attr") == "comfort_class"
    assert root.find("temporal").get("startField") == "eta_utc"


def test_describe_via_qgis_process(qp_env, demo):
    proc = _qp(qp_env, "--json", "run", "seawaycomfort:describeseastate", "--", f"INPUT={demo.grib_path}")
    assert proc.returncode == 0, proc.stderr[-2000:]
    text = json.loads(proc.stdout[proc.stdout.find("{"):])["results"]["DESCRIPTION"]
    assert "HTSGW" in text and "33 steps" in text


def test_bad_input_exit_code_and_message(qp_env, demo, tmp_path):
    proc = _qp(qp_env, "run", "seawaycomfort:routecomfort", "--",
               f"ROUTE={demo.route_path}", f"SEA_STATE={demo.grib_path}", "SPEED_KN=0",
               f"OUTPUT_POINTS={tmp_path / 'p.gpkg'}", f"OUTPUT_SEGMENTS={tmp_path / 's.gpkg'}")
    assert proc.returncode != 0
    assert "SPEED_KN must be > 0" in proc.stdout + proc.stderr


def test_demo_runner_end_to_end(tmp_path, package_parent):
    """python -m seaway_comfort demo --out <dir> as the Makefile runs it."""
    from qgis.core import QgsProject

    env = dict(os.environ)
    # MALLOC_CHECK_=3: glibc aborts on a heap error, so a QGIS object freed after exitQgis()
    # (the 3.40 crash at exit) fails this test instead of passing by luck.
    env.update({"QT_QPA_PLATFORM": "offscreen", "PYTHONPATH": str(package_parent), "MALLOC_CHECK_": "3"})
    out = tmp_path / "demo"
    py = Path(os.environ.get("SEAWAY_PYTHON", "/usr/bin/python3"))
    proc = subprocess.run([str(py), "-P", "-m", "seaway_comfort", "demo", "--out", str(out)], env=env,
                          capture_output=True, text=True, timeout=300, cwd=str(tmp_path))
    assert proc.returncode == 0, proc.stderr[-3000:] + proc.stdout[-2000:]
    for name in ("passage_points.gpkg", "passage_segments.gpkg", "passage_report.html", "seaway_demo.qgz",
                 "passage_points.qml", "forecast_description.txt"):
        assert (out / name).exists(), name
    assert "Port Ansel to Tarrow" in proc.stdout and "CAUTION" in proc.stdout
    project = QgsProject()
    assert project.read(str(out / "seaway_demo.qgz"))
    names = sorted(layer.name() for layer in project.mapLayers().values())
    assert "Passage samples" in names and "Passage segments" in names
    samples = project.mapLayersByName("Passage samples")[0]
    assert samples.renderer().type() == "categorizedSymbol"
    assert samples.temporalProperties().isActive()
    # opens on the passage (a <mapcanvas> extent as the desktop reads it) with route and forecast
    route = project.mapLayersByName("Route (2 legs, planned)")[0]
    assert route.featureCount() == 2
    assert any(n.startswith("Forecast Hs at departure 2031-03-11T06:00") for n in names), names
    assert any(n.startswith("Depth") for n in names)
    project.clear()
    import re
    import zipfile

    with zipfile.ZipFile(out / "seaway_demo.qgz") as z:
        xml = z.read(next(n for n in z.namelist() if n.endswith(".qgs"))).decode("utf-8")
    canvas = xml[xml.index('<mapcanvas'):xml.index('</mapcanvas>')]
    box = [float(re.search(f"<{k}>([^<]+)</{k}>", canvas).group(1)) for k in ("xmin", "ymin", "xmax", "ymax")]
    from qgis.core import QgsVectorLayer

    ext = QgsVectorLayer(str(out / "data" / "merrow_reach_route.geojson"), "r", "ogr").extent()
    assert box[0] <= ext.xMinimum() and box[1] <= ext.yMinimum() and box[2] >= ext.xMaximum() \
        and box[3] >= ext.yMaximum(), (box, ext.toString())
    assert (box[2] - box[0]) < 3 * ext.width()  # zoomed on the passage, not the world
