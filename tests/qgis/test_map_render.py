# SPDX-License-Identifier: GPL-2.0-or-later
"""A map rendered headless from the saved routecomfort output shows the comfort classes.

The points GeoPackage written by ``processing.run`` (no post-processor) is opened afresh, as a
user would open it later; QGIS restores the default style stored in the GeoPackage, and the
QML beside it restores renderer and temporal settings. The rendered PNG must contain the
palette colour of every comfort class present in the features (colours from
processing/core/report.py COMFORT_PALETTE, our own palette), and no other class colour.
Checked against QGIS 3.22's own renderer (QgsMapRendererParallelJob).
"""
from __future__ import annotations

import numpy as np
import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")

from seaway_comfort.processing.core.demo.writers import write_cf_netcdf  # noqa: E402

HS = "sea_surface_wave_significant_height"
TP = "sea_surface_wave_period_at_variance_spectral_density_maximum"
DIR = "sea_surface_wave_from_direction"
T0 = np.datetime64("2030-06-01T00:00", "ms")  # invented scenario


@pytest.fixture(scope="module")
def ramp_sea(tmp_path_factory):
    """Hs rising from 0.1 m to 6 m eastwards, beam seas for an eastward course."""
    folder = tmp_path_factory.mktemp("ramp")
    lon = np.round(np.arange(-0.5, 2.51, 0.05), 2)
    lat = np.round(np.arange(-0.5, 0.51, 0.25), 2)
    times = T0 + np.arange(9) * np.timedelta64(3, "h")
    hs = np.interp(lon, [0.0, 2.0], [0.1, 6.0])
    shape = (times.size, lat.size, lon.size)
    path = str(folder / "ramp.nc")
    write_cf_netcdf(path, lon, lat, times, {
        HS: np.broadcast_to(hs, shape).copy(), TP: np.full(shape, 7.0), DIR: np.zeros(shape)})
    return path


def _hex_to_rgb(h: str):
    h = h.lstrip("#")
    return tuple(int(h[i:i + 2], 16) for i in (0, 2, 4))


def test_rendered_points_show_comfort_classes(seaway_provider, ramp_sea, tmp_path):
    import processing
    from qgis.core import QgsMapRendererParallelJob, QgsMapSettings, QgsVectorLayer
    from qgis.PyQt.QtCore import QSize
    from qgis.PyQt.QtGui import QColor

    from seaway_comfort.processing.core.reports.palette import COMFORT_PALETTE

    route = tmp_path / "route.geojson"
    route.write_text('{"type":"FeatureCollection","features":[{"type":"Feature","properties":{},'
                     '"geometry":{"type":"LineString","coordinates":[[0.0,0.0],[2.0,0.0]]}}]}')
    points = str(tmp_path / "points.gpkg")
    processing.run("seawaycomfort:routecomfort", {
        "ROUTE": str(route), "SEA_STATE": [ramp_sea], "DEPARTURE": "2030-06-01T00:00:00Z",
        "SPEED_KN": 10.0, "VESSEL": "coastal_survey_35m", "SPACING_NM": 3.0,
        "OUTPUT_POINTS": points, "OUTPUT_SEGMENTS": str(tmp_path / "segments.gpkg"),
    })
    layer = QgsVectorLayer(points, "points", "ogr")
    assert layer.isValid()
    classes = {f["comfort_class"] for f in layer.getFeatures()}
    assert len(classes) >= 3, f"the ramp should span several classes, got {classes}"
    assert layer.renderer().type() == "categorizedSymbol"  # restored from the GeoPackage

    ms = QgsMapSettings()
    ms.setLayers([layer])
    ms.setDestinationCrs(layer.crs())
    extent = layer.extent()
    extent.grow(0.05)
    ms.setExtent(extent)
    ms.setOutputSize(QSize(1600, 200))
    ms.setBackgroundColor(QColor(255, 255, 255))
    job = QgsMapRendererParallelJob(ms)
    job.start()
    job.waitForFinished()
    png = tmp_path / "map.png"
    image = job.renderedImage()
    assert image.save(str(png))
    # Pixels as an (h, w, 3) array.
    image = image.convertToFormat(image.Format.Format_RGB32)
    ptr = image.constBits()
    ptr.setsize(image.sizeInBytes())
    arr = np.frombuffer(ptr, np.uint8).reshape(image.height(), image.bytesPerLine() // 4, 4)
    rgb = arr[:, : image.width(), 2::-1].reshape(-1, 3).astype(int)  # BGRA -> RGB
    for c, colour in enumerate(COMFORT_PALETTE):
        hits = int(np.count_nonzero(np.all(np.abs(rgb - _hex_to_rgb(colour)) <= 2, axis=1)))
        if c in classes:
            assert hits > 20, f"class {c} ({colour}) present in the data but not on the map"
        else:
            assert hits == 0, f"class {c} ({colour}) drawn although no feature has it"
