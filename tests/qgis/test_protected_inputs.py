# SPDX-License-Identifier: GPL-2.0-or-later
"""No output overwrites an input, in every algorithm, also through symbolic and hard links.

Each run points one output at a file the run reads (route, forecast, vessel profile JSON, the
RAO table that profile names, a stored profile), directly, through a symbolic link or through
a hard link. Each must stop with a QgsProcessingException naming the output and the input,
before any work (no output file appears) and with every input byte-identical afterwards.
"""
from __future__ import annotations

import json
import os
import shutil

import numpy as np
import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")

from seaway_comfort.processing.core.demo.writers import write_cf_netcdf  # noqa: E402
from seaway_comfort.processing.core.vessel.profile import BUILTIN_DIR  # noqa: E402

HS = "sea_surface_wave_significant_height"
TP = "sea_surface_wave_period_at_variance_spectral_density_maximum"
DIR = "sea_surface_wave_from_direction"
TIMES = np.datetime64("2030-06-01T00:00", "ms") + np.arange(9) * np.timedelta64(3, "h")
RAO_CSV = "period_s,heading_deg,heave_m_per_m,pitch_deg_per_m,roll_deg_per_m\n" + "".join(
    f"{t},{h},1.0,1.0,1.0\n" for t in (4.0, 12.0) for h in (0.0, 180.0))


@pytest.fixture()
def files(tmp_path):
    lon, lat = np.arange(-10.0, 10.01, 1.0), np.arange(-10.0, 10.01, 1.0)
    shape = (TIMES.size, lat.size, lon.size)
    sea = tmp_path / "sea.nc"
    write_cf_netcdf(str(sea), lon, lat, TIMES, {HS: np.full(shape, 1.5), TP: np.full(shape, 7.0),
                                                DIR: np.zeros(shape)})
    route = tmp_path / "route.geojson"
    route.write_text(json.dumps({"type": "FeatureCollection", "features": [{
        "type": "Feature", "properties": {"name": "short run"},
        "geometry": {"type": "LineString", "coordinates": [[0.0, 0.0], [0.0, 0.3]]}}]}))
    (tmp_path / "boat_rao.csv").write_text(RAO_CSV)
    data = json.loads((BUILTIN_DIR / "coastal_survey_35m.json").read_text())
    data["rao_table"] = "boat_rao.csv"
    vessel = tmp_path / "boat.json"
    vessel.write_text(json.dumps(data))
    os.symlink(vessel, tmp_path / "boat_link.json")
    os.symlink(tmp_path / "boat_rao.csv", tmp_path / "rao_link.html")
    os.link(vessel, tmp_path / "boat_hard.html")
    os.symlink(sea, tmp_path / "sea_link.html")
    (tmp_path / "barriers.geojson").write_text(json.dumps({"type": "FeatureCollection", "features": [{
        "type": "Feature", "properties": {},
        "geometry": {"type": "Polygon", "coordinates": [[[5, 5], [6, 5], [6, 6], [5, 5]]]}}]}))
    return tmp_path


def _snapshot(folder):
    return {p.name: p.read_bytes() for p in folder.iterdir() if p.is_file() and not p.is_symlink()}


PASSAGE = {"DEPARTURE": "2030-06-01T01:00:00Z", "SPEED_KN": 8.0, "SPACING_NM": 2.0}
CASES = {
    "seawaycomfort:routecomfort": lambda f: dict(
        PASSAGE, ROUTE=str(f / "route.geojson"), SEA_STATE=[str(f / "sea.nc")], VESSEL=str(f / "boat_link.json"),
        OUTPUT_POINTS=str(f / "p.gpkg"), OUTPUT_SEGMENTS=str(f / "s.gpkg")),
    "seawaycomfort:departuresweep": lambda f: dict(
        ROUTE=str(f / "route.geojson"), SEA_STATE=[str(f / "sea.nc")], VESSEL=str(f / "boat_link.json"),
        SPEED_KN=8.0, SPACING_NM=2.0, DEPART_FROM="2030-06-01T01:00:00Z", DEPART_TO="2030-06-01T04:00:00Z",
        DEPART_STEP_H=1.0, OUTPUT_TABLE=str(f / "t.gpkg")),
    "seawaycomfort:comforttrack": lambda f: dict(
        PASSAGE, ROUTE=str(f / "route.geojson"), SEA_STATE=[str(f / "sea.nc")], VESSEL=str(f / "boat_link.json"),
        BARRIERS=str(f / "barriers.geojson"), OUTPUT_TRACKS=str(f / "k.gpkg")),
    "seawaycomfort:seasonalclimate": lambda f: dict(
        ROUTE=str(f / "route.geojson"), HINDCAST=[str(f / "sea.nc")], VESSEL=str(f / "boat_link.json"),
        SPEED_KN=8.0, MONTHS="6", MAX_CLASS=1, WORKERS=1, OUTPUT_SEGMENTS=str(f / "g.gpkg")),
}
TARGETS = [  # (output parameter, file name it is pointed at, input it reaches)
    ("OUTPUT_REPORT", "boat.json", "VESSEL profile"),
    ("OUTPUT_REPORT", "boat_hard.html", "VESSEL profile"),           # hard link of the JSON
    ("OUTPUT_REPORT", "rao_link.html", "vessel profile rao_table"),  # symbolic link to the RAO table
    ("OUTPUT_REPORT", "sea_link.html", "sea.nc"),                    # symbolic link to the forecast
]


# every algorithm x every target, plus the seasonal climate's own CSV output (only it has one)
COMBINATIONS = [(alg, *t) for alg in sorted(CASES) for t in TARGETS] + [
    ("seawaycomfort:seasonalclimate", "OUTPUT_CSV", "boat_rao.csv", "rao_table")]


@pytest.mark.parametrize("alg,output,target,names", COMBINATIONS)
def test_outputs_never_overwrite_inputs(seaway_provider, files, alg, output, target, names):
    import processing
    from qgis.core import QgsApplication, QgsProcessingException

    params = CASES[alg](files)
    before = _snapshot(files)
    params[output] = str(files / target)
    assert QgsApplication.processingRegistry().algorithmById(alg) is not None
    with pytest.raises(QgsProcessingException, match=rf"{output} .*also an input.*{names}"):
        processing.run(alg, params)
    assert _snapshot(files) == before  # byte-identical, and no output file was created


def test_route_as_output_and_stored_profiles(seaway_provider, files):
    import processing
    from qgis.core import QgsProcessingException

    from seaway_comfort.processing.algorithms.common import user_vessel_dir

    params = CASES["seawaycomfort:routecomfort"](files)
    before = _snapshot(files)
    with pytest.raises(QgsProcessingException, match="OUTPUT_POINTS .*also an input"):
        processing.run("seawaycomfort:routecomfort", dict(params, OUTPUT_POINTS=str(files / "route.geojson")))
    folder = user_vessel_dir()
    made = not folder.exists()
    folder.mkdir(parents=True, exist_ok=True)
    stored = folder / "pytest_stored_boat.json"
    stored.write_text((BUILTIN_DIR / "harbour_workboat_12m.json").read_text())
    try:
        with pytest.raises(QgsProcessingException, match="OUTPUT_REPORT .*also an input.*stored vessel profile"):
            processing.run("seawaycomfort:routecomfort", dict(params, OUTPUT_REPORT=str(stored)))
        assert stored.read_text() == (BUILTIN_DIR / "harbour_workboat_12m.json").read_text()
    finally:
        stored.unlink()
        if made:
            shutil.rmtree(folder)
    assert _snapshot(files) == before


def test_comfort_track_protects_its_barriers(seaway_provider, files):
    import processing
    from qgis.core import QgsProcessingException

    params = CASES["seawaycomfort:comforttrack"](files)
    before = _snapshot(files)
    with pytest.raises(QgsProcessingException, match="OUTPUT_REPORT .*also an input.*BARRIERS layer"):
        processing.run("seawaycomfort:comforttrack", dict(params, OUTPUT_REPORT=str(files / "barriers.geojson")))
    assert _snapshot(files) == before


def test_describe_refuses_its_input_before_reading(seaway_provider, files):
    import processing
    from qgis.core import QgsProcessingException

    before = _snapshot(files)
    with pytest.raises(QgsProcessingException, match="OUTPUT_REPORT .*also an input.*INPUT file"):
        processing.run("seawaycomfort:describeseastate",
                       {"INPUT": str(files / "sea.nc"), "OUTPUT_REPORT": str(files / "sea_link.html")})
    assert _snapshot(files) == before
