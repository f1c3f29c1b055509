# SPDX-License-Identifier: GPL-2.0-or-later
"""Output styles that work for every format and read well: classes, aliases, labels, scales.

A Shapefile keeps 10 characters of a field name (dBASE III field descriptor, 11 bytes with the
terminator: the ESRI Shapefile Technical Description, 1998, points to dBASE for attributes); the
style must classify on the truncated ``comfort_cl`` there. Checked through QGIS's own renderer
(symbolForFeature) and expression engine, on the uniform invented sea of test_dialog_results.
"""
from __future__ import annotations

import json

import numpy as np
import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")

from seaway_comfort.processing.core.demo.writers import write_cf_netcdf  # noqa: E402
from seaway_comfort.processing.core.reports.palette import COMFORT_PALETTE  # noqa: E402

HS = "sea_surface_wave_significant_height"
TP = "sea_surface_wave_period_at_variance_spectral_density_maximum"
DIR = "sea_surface_wave_from_direction"
T0 = np.datetime64("2030-06-01T00:00", "ms")  # invented scenario


@pytest.fixture(scope="module")
def run(seaway_provider, tmp_path_factory):
    folder = tmp_path_factory.mktemp("styles")
    times = T0 + np.arange(9) * np.timedelta64(3, "h")
    lon, lat = np.arange(-1.0, 2.01, 0.25), np.arange(-1.0, 1.01, 0.25)
    shape = (times.size, lat.size, lon.size)
    sea = str(folder / "sea.nc")
    write_cf_netcdf(sea, lon, lat, times, {HS: np.full(shape, 2.5), TP: np.full(shape, 8.0), DIR: np.zeros(shape)})
    route = folder / "route.geojson"
    route.write_text(json.dumps({"type": "FeatureCollection", "features": [
        {"type": "Feature", "properties": {"name": "first run"},
         "geometry": {"type": "LineString", "coordinates": [[0.0, 0.0], [0.3, 0.0]]}},
        {"type": "Feature", "properties": {"name": "second run"},
         "geometry": {"type": "LineString", "coordinates": [[0.3, 0.0], [0.3, 0.3]]}}]}))
    import processing

    return processing.run("seawaycomfort:routecomfort", {
        "ROUTE": str(route), "SEA_STATE": [sea], "DEPARTURE": "2030-06-01T01:00:00Z", "SPEED_KN": 10.0,
        "VESSEL": "coastal_survey_35m", "SPACING_NM": 2.0,
        "OUTPUT_POINTS": str(folder / "points.shp"), "OUTPUT_SEGMENTS": str(folder / "segments.shp")})


def _layer(path):
    from qgis.core import QgsVectorLayer

    layer = QgsVectorLayer(path, "x", "ogr")
    assert layer.isValid()
    return layer


def test_shapefile_classified_on_the_truncated_name(run):
    from qgis.core import QgsRenderContext

    for key in ("OUTPUT_POINTS", "OUTPUT_SEGMENTS"):
        layer = _layer(run[key])  # its QML beside the file loads with it
        assert layer.fields().indexOf("comfort_cl") >= 0 and layer.fields().indexOf("comfort_class") < 0
        renderer = layer.renderer()
        assert renderer.classAttribute() == "comfort_cl"
        ctx = QgsRenderContext()
        renderer.startRender(ctx, layer.fields())
        try:
            classes = set()
            for f in layer.getFeatures():
                c = f["comfort_cl"]
                classes.add(int(c))
                sym = renderer.symbolForFeature(f, ctx)
                assert sym is not None
                colours = {sym.symbolLayer(i).color().name() for i in range(sym.symbolLayerCount())}
                assert COMFORT_PALETTE[int(c)] in colours, (c, colours)  # not the grey of "not computed"
        finally:
            renderer.stopRender(ctx)
        assert classes  # at least one computed class was drawn in its colour


def test_aliases_with_units_and_display_decimals(run):
    layer = _layer(run["OUTPUT_POINTS"])
    idx = layer.fields().indexOf("hs_m")
    assert layer.attributeAlias(idx) == "Significant wave height Hs (m)"
    assert "(deg" in layer.attributeAlias(layer.fields().indexOf("rel_headin"))  # truncated name, alias kept
    setup = layer.editorWidgetSetup(idx)
    assert setup.type() == "Range" and setup.config()["Precision"] == 1
    from qgis.core import QgsApplication

    formatter = QgsApplication.fieldFormatterRegistry().fieldFormatter("Range")
    f = next(layer.getFeatures())
    assert formatter.representValue(layer, idx, setup.config(), None, f["hs_m"]) == "2.5"


def test_legs_labelled_one_based_and_points_scale_dependent(run):
    from qgis.core import QgsExpression, QgsExpressionContext, QgsExpressionContextUtils

    seg = _layer(run["OUTPUT_SEGMENTS"])
    assert seg.labelsEnabled()
    expr = QgsExpression(seg.labeling().settings().fieldName)
    ctx = QgsExpressionContext(QgsExpressionContextUtils.globalProjectLayerScopes(seg))
    labels = []
    for f in seg.getFeatures():
        ctx.setFeature(f)
        value = expr.evaluate(ctx)
        if value:
            labels.append((int(f["leg"]), value))
    # leg keeps its documented meaning (0-based index); people read "Leg 1", "Leg 2" as in the report
    assert labels == [(0, "Leg 1: first run"), (1, "Leg 2: second run")]
    pts = _layer(run["OUTPUT_POINTS"])
    assert pts.hasScaleBasedVisibility() and pts.minimumScale() == 1_000_000
    # at the most zoomed-out scale the points show, 2 NM samples stay apart: size < spacing on paper
    from seaway_comfort.processing.styling import POINT_SIZE_MM

    scope_ctx = QgsExpressionContext()
    scope_ctx.appendScope(QgsExpressionContextUtils.globalScope())
    from qgis.core import QgsExpressionContextScope

    scope = QgsExpressionContextScope()
    scope.setVariable("map_scale", 1_000_000)
    scope_ctx.appendScope(scope)
    size_mm = QgsExpression(POINT_SIZE_MM).evaluate(scope_ctx)
    one_nm_mm = 1852.0 * 1000.0 / 1_000_000
    assert size_mm < one_nm_mm  # 1 NM samples do not merge at 1:1,000,000
    from seaway_comfort.processing.styling import LINE_WIDTH_MM

    assert size_mm < LINE_WIDTH_MM  # and a point is smaller than a segment is wide
