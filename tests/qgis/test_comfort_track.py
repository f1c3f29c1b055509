# SPDX-License-Identifier: GPL-2.0-or-later
"""seawaycomfort:comforttrack end to end through QGIS Processing on an invented storm forecast.

Checked against: shapely (the tracks never enter the barrier, given in EPSG:3857 and
transformed here with pyproj independently of QGIS); a routecomfort run of the gentlest line
through Processing (fields equal within 2 %); geographiclib for the end point.
"""
from __future__ import annotations

import json

import numpy as np
import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")

from geographiclib.geodesic import Geodesic  # noqa: E402
from pyproj import Transformer  # noqa: E402
from shapely.geometry import LineString, Polygon  # noqa: E402

from seaway_comfort.processing.core.demo.writers import write_cf_netcdf  # noqa: E402

ALG = "seawaycomfort:comforttrack"
T0 = np.datetime64("2031-07-01T00:00", "ms")  # invented scenario
LON = np.round(np.arange(-0.5, 2.5001, 0.1), 6)
LAT = np.round(np.arange(-1.5, 1.5001, 0.1), 6)
FIELDS = ("alternative", "dist_nm", "hours", "eta_utc", "worst_class", "msi_max_pct", "hours_taxing",
          "sick_pct_passage", "flags")
BOX = [(1.4, 0.2), (1.6, 0.2), (1.6, 0.6), (1.4, 0.6)]  # lon, lat (north of the storm's way round)


@pytest.fixture(scope="module")
def inputs(tmp_path_factory, seaway_provider):
    folder = tmp_path_factory.mktemp("track")
    times = T0 + np.arange(25) * np.timedelta64(3, "h")
    X, Y = np.meshgrid(LON, LAT)
    storm = np.clip(1 - np.hypot(X - 1.0, Y) / 0.35, 0, 1)[None].repeat(25, 0)
    sea = write_cf_netcdf(str(folder / "storm.nc"), LON, LAT, times, {
        "sea_surface_wave_significant_height": 1.2 + 3.8 * storm,
        "sea_surface_wave_period_at_variance_spectral_density_maximum": 7.0 + 3.0 * storm,
        "sea_surface_wave_from_direction": np.full(storm.shape, 90.0)})
    route = folder / "route.geojson"
    route.write_text(json.dumps({"type": "FeatureCollection", "features": [{"type": "Feature", "properties": {},
                     "geometry": {"type": "LineString", "coordinates": [[0.0, 0.0], [2.0, 0.0]]}}]}))
    merc = Transformer.from_crs("EPSG:4326", "EPSG:3857", always_xy=True)
    ring = [list(merc.transform(x, y)) for x, y in BOX + BOX[:1]]
    bar = folder / "barrier.geojson"
    bar.write_text(json.dumps({"type": "FeatureCollection", "crs": {"type": "name", "properties": {"name": "EPSG:3857"}},
                               "features": [{"type": "Feature", "properties": {},
                                             "geometry": {"type": "Polygon", "coordinates": [ring]}}]}))
    from qgis.core import QgsVectorLayer
    layer = QgsVectorLayer(str(bar), "barrier", "ogr")
    assert layer.isValid() and layer.crs().authid() == "EPSG:3857"
    return folder, str(route), sea, layer


def _params(inputs, **over):
    folder, route, sea, bar = inputs
    p = {"ROUTE": route, "SEA_STATE": [sea], "SPEED_KN": 10.0, "VESSEL": "coastal_survey_35m",
         "DEPARTURE": "2031-07-01T03:00:00Z", "BARRIERS": bar, "MAX_DETOUR_PCT": 30.0,
         "OUTPUT_TRACKS": str(folder / "tracks.gpkg"), "OUTPUT_REPORT": str(folder / "tracks.html")}
    p.update(over)
    return p


def test_tracks_through_processing(inputs):
    import processing
    from qgis.core import QgsVectorLayer

    out = processing.run(ALG, _params(inputs))
    layer = QgsVectorLayer(out["OUTPUT_TRACKS"], "t", "ogr")
    assert [f.name() for f in layer.fields()][-len(FIELDS):] == list(FIELDS)
    feats = {f["alternative"]: f for f in layer.getFeatures()}
    assert set(feats) == {"reference", "fastest", "balanced", "gentlest"}
    box = Polygon(BOX)
    for name, f in feats.items():
        pts = [(p.x(), p.y()) for p in f.geometry().asPolyline()]
        end = Geodesic.WGS84.Inverse(0.0, 2.0, pts[-1][1], pts[-1][0])["s12"]
        assert end <= 0.5 * 1852.0
        if name != "reference":
            assert not LineString(pts).intersects(box), name
    assert feats["gentlest"]["msi_max_pct"] <= 0.7 * feats["reference"]["msi_max_pct"]
    assert feats["gentlest"]["hours"] <= 1.15 * feats["reference"]["hours"]
    # the gentlest line through routecomfort gives the same figures
    folder = inputs[0]
    line = folder / "gentlest.geojson"
    coords = [[p.x(), p.y()] for p in feats["gentlest"].geometry().asPolyline()]
    line.write_text(json.dumps({"type": "FeatureCollection", "features": [{"type": "Feature", "properties": {},
                    "geometry": {"type": "LineString", "coordinates": coords}}]}))
    rc = processing.run("seawaycomfort:routecomfort", {
        "ROUTE": str(line), "SEA_STATE": [inputs[2]], "SPEED_KN": 10.0, "VESSEL": "coastal_survey_35m",
        "DEPARTURE": "2031-07-01T03:00:00Z", "OUTPUT_POINTS": str(folder / "p.gpkg"),
        "OUTPUT_SEGMENTS": str(folder / "s.gpkg")})
    pts = list(QgsVectorLayer(rc["OUTPUT_POINTS"], "p", "ogr").getFeatures())
    assert feats["gentlest"]["msi_max_pct"] == pytest.approx(max(p["msi_pct"] for p in pts), rel=0.02)
    assert feats["gentlest"]["dist_nm"] == pytest.approx(pts[-1]["dist_nm"], rel=0.02)
    text = open(out["OUTPUT_REPORT"], encoding="utf-8").read()
    assert "<svg" in text and "planning aid" in text


def test_start_inside_barrier_is_a_clear_error(inputs):
    import processing
    from qgis.core import QgsProcessingException

    folder = inputs[0]
    route = folder / "bad_route.geojson"
    route.write_text(json.dumps({"type": "FeatureCollection", "features": [{"type": "Feature", "properties": {},
                     "geometry": {"type": "LineString", "coordinates": [[1.5, 0.4], [2.0, 0.0]]}}]}))
    with pytest.raises(QgsProcessingException, match="start .*inside a BARRIERS polygon"):
        processing.run(ALG, _params(inputs, ROUTE=str(route), OUTPUT_TRACKS=str(folder / "bad.gpkg")))
