# SPDX-License-Identifier: GPL-2.0-or-later
"""Errors name the user's input, and never echo a file that is not what it claims to be.

Each hostile input goes through processing.run and must stop with a QgsProcessingException
whose text names the parameter and the value (or the vertex), and says nothing of the content
of a foreign file.
"""
from __future__ import annotations

import json

import numpy as np
import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")

from seaway_comfort.processing.core.demo.writers import write_cf_netcdf  # noqa: E402
from seaway_comfort.processing.core.vessel.profile import BUILTIN_DIR  # noqa: E402

ALG = "seawaycomfort:routecomfort"
TIMES = np.datetime64("2030-06-01T00:00", "ms") + np.arange(5) * np.timedelta64(3, "h")


@pytest.fixture()
def base(tmp_path):
    lon = lat = np.arange(-3.0, 3.01, 1.0)
    shape = (TIMES.size, lat.size, lon.size)
    sea = str(tmp_path / "sea.nc")
    write_cf_netcdf(sea, lon, lat, TIMES, {
        "sea_surface_wave_significant_height": np.full(shape, 1.0),
        "sea_surface_wave_period_at_variance_spectral_density_maximum": np.full(shape, 6.0),
        "sea_surface_wave_from_direction": np.zeros(shape)})
    route = tmp_path / "route.geojson"
    route.write_text(json.dumps({"type": "FeatureCollection", "features": [{
        "type": "Feature", "properties": {"name": "short run"},
        "geometry": {"type": "LineString", "coordinates": [[0.0, 0.0], [0.0, 0.3]]}}]}))
    return {"ROUTE": str(route), "SEA_STATE": [sea], "DEPARTURE": "2030-06-01T01:00:00Z", "SPEED_KN": 8.0,
            "VESSEL": "coastal_survey_35m", "SPACING_NM": 2.0, "OUTPUT_POINTS": "TEMPORARY_OUTPUT",
            "OUTPUT_SEGMENTS": "TEMPORARY_OUTPUT"}


def _fails(params):
    import processing
    from qgis.core import QgsProcessingException

    with pytest.raises(QgsProcessingException) as err:
        processing.run(ALG, params)
    return str(err.value)


def test_huge_speed_is_an_implausible_speed(seaway_provider, base):
    msg = _fails(dict(base, SPEED_KN=1e308))
    assert "SPEED_KN" in msg and "1e+308" in msg and "not a plausible speed" in msg
    assert "vacc_rms" not in msg


def test_nan_route_vertex_is_named(seaway_provider, base):
    from qgis.core import QgsFeature, QgsGeometry, QgsPointXY, QgsVectorLayer

    layer = QgsVectorLayer("LineString?crs=EPSG:4326&field=name:string", "route", "memory")
    f = QgsFeature(layer.fields())
    f.setAttributes(["nan leg"])
    f.setGeometry(QgsGeometry.fromPolylineXY([QgsPointXY(0.0, 0.0), QgsPointXY(float("nan"), 0.2),
                                              QgsPointXY(0.0, 0.3)]))
    layer.dataProvider().addFeatures([f])
    msg = _fails(dict(base, ROUTE=layer))
    assert "vertex 2" in msg and "not a number" in msg and "'nan leg'" in msg
    assert "not degrees" not in msg


def test_profile_naming_a_foreign_file_as_rao_table_is_not_echoed(seaway_provider, base, tmp_path):
    foreign = tmp_path / "accounts"
    foreign.write_text("root:x:0:0:root:/root:/bin/bash\nalice:x:1000:1000::/home/alice:/bin/sh\n")
    data = json.loads((BUILTIN_DIR / "coastal_survey_35m.json").read_text())
    data["rao_table"] = str(foreign)
    (tmp_path / "boat.json").write_text(json.dumps(data))
    msg = _fails(dict(base, VESSEL=str(tmp_path / "boat.json")))
    assert "VESSEL" in msg and "accounts" in msg and "not a RAO table" in msg
    assert "root:" not in msg and "alice" not in msg and "/bin/" not in msg
