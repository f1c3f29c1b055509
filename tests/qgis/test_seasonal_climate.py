# SPDX-License-Identifier: GPL-2.0-or-later
"""seawaycomfort:seasonalclimate end to end through QGIS Processing on an invented hindcast.

References: the core climate (processing/core/climate, checked by hand against a sine cycle in
tests/core/test_climate_seasonal.py) called directly with the same inputs gives the numbers the
layer and CSV must hold; the layer is read back with QGIS's OGR provider, the QML with
Python's xml.etree, the report with html.parser. Bad input must raise QgsProcessingException
naming the parameter.
"""
from __future__ import annotations

import csv
import html
import json
import xml.etree.ElementTree as ET
from html.parser import HTMLParser

import numpy as np
import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")

from seaway_comfort.processing.core import climate as C  # noqa: E402
from seaway_comfort.processing.core.reports.palette import SHARE_PALETTE  # noqa: E402
from seaway_comfort.processing.core.demo.synthetic_hindcast import (
    SeasonalCycle,
    write_seasonal_hindcast,
)
from seaway_comfort.processing.core.flags import CAUTION  # noqa: E402

ALG = "seawaycomfort:seasonalclimate"
VESSEL = "coastal_survey_35m"


@pytest.fixture(scope="module")
def registered(seaway_provider):
    """The algorithm as the provider itself registers it (never added by the test: a provider
    that drops it from ALGORITHM_CLASSES must fail here)."""
    from qgis.core import QgsApplication

    assert ALG.split(":")[1] in [a.name() for a in seaway_provider.algorithms()], "provider lacks " + ALG
    assert QgsApplication.processingRegistry().algorithmById(ALG) is not None, ALG


@pytest.fixture(scope="module")
def hindcast(tmp_path_factory):
    return write_seasonal_hindcast(str(tmp_path_factory.mktemp("hind")), [2030],
                                   cycle=SeasonalCycle(hs_mean_m=1.0, hs_amp_m=0.8))


@pytest.fixture()
def route(tmp_path):
    p = tmp_path / "route.geojson"
    p.write_text(json.dumps({"type": "FeatureCollection", "features": [{
        "type": "Feature", "properties": {"name": "invented run"},
        "geometry": {"type": "LineString", "coordinates": [[-9.0, 41.0], [-8.0, 42.0], [-7.0, 43.0]]}}]}))
    return str(p)


def _params(route, hindcast, tmp_path, **over):
    p = {"ROUTE": route, "HINDCAST": hindcast, "VESSEL": VESSEL, "SPEED_KN": 10.0, "MONTHS": "6,7,8",
         "MAX_CLASS": 1, "WORKERS": 1,
         "OUTPUT_SEGMENTS": str(tmp_path / "seg.gpkg"), "OUTPUT_CSV": str(tmp_path / "c.csv"),
         "OUTPUT_REPORT": str(tmp_path / "r.html")}
    p.update(over)
    return p


def _run(params):
    import processing

    return processing.run(ALG, params)


def test_end_to_end_matches_core(registered, route, hindcast, tmp_path):
    from qgis.core import QgsVectorLayer

    res = _run(_params(route, hindcast, tmp_path))
    core = C.compute_climate([-9.0, -8.0, -7.0], [41.0, 42.0, 43.0], hindcast, VESSEL, speed_kn=10.0,
                             months="6,7,8", max_class=1, backend=C.SerialBackend())
    layer = QgsVectorLayer(res["OUTPUT_SEGMENTS"], "s", "ogr")
    assert layer.isValid()
    feats = sorted(layer.getFeatures(), key=lambda f: int(f["seq"]))
    assert len(feats) == core.n - 1
    seg = core.segment_ok_share()
    for f in feats:
        i = int(f["seq"])
        for k, m in enumerate((6, 7, 8)):
            assert float(f[f"ok_m{m:02d}"]) == pytest.approx(seg[k, i], abs=1e-12)
        assert f["ok_m01"] is None or (hasattr(f["ok_m01"], "isNull") and f["ok_m01"].isNull())
        assert float(f["ok_sel"]) == pytest.approx(float(np.mean(seg[:, i])), abs=1e-12)
    # the QML beside the output: graduated on ok_sel with our palette
    root = ET.parse(str(tmp_path / "seg.qml")).getroot()
    rend = root.find("renderer-v2")
    assert rend.get("type") == "graduatedSymbol" and rend.get("attr") == "ok_sel"
    qml_text = (tmp_path / "seg.qml").read_text()
    from qgis.PyQt.QtGui import QColor

    for hexcol in SHARE_PALETTE:  # QML stores colours as "r,g,b,a" (QColor.getRgb)
        r, g, b, _ = QColor(hexcol).getRgb()
        assert f"{r},{g},{b},255" in qml_text, hexcol
    rows = [r for r in csv.DictReader(ln for ln in open(res["OUTPUT_CSV"]).read().splitlines()
                                       if not ln.startswith("#")) if r["sample"] == "route"]
    assert [float(r["window_probability"]) for r in rows] == pytest.approx(list(core.window_probability), abs=5e-5)
    page = open(res["OUTPUT_REPORT"], encoding="utf-8").read()
    parser = HTMLParser()
    parser.feed(page)  # parses without error
    assert html.escape(CAUTION) in page
    assert CAUTION in res["SUMMARY"]


def test_bad_inputs_name_parameter(registered, route, hindcast, tmp_path):
    from qgis.core import QgsProcessingException

    for over, word in (({"SPEED_KN": 0.0}, "SPEED_KN"), ({"MONTHS": "13"}, "MONTHS"),
                       ({"VESSEL": "no_such_boat"}, "VESSEL"), ({"STATION": "crowsnest"}, "STATION"),
                       ({"HINDCAST": [str(tmp_path / "none.nc")]}, "HINDCAST"),
                       ({"SCHEDULER": "tcp://127.0.0.1:9"}, "127.0.0.1:9")):
        if word == "127.0.0.1:9" and not C.backends.dask_available():
            continue
        with pytest.raises(QgsProcessingException, match=word):
            _run(_params(route, hindcast, tmp_path, **over))


def test_local_process_pool_inside_qgis_equals_single_process(registered, route, hindcast, tmp_path):
    # reference: the single-process run through the same algorithm (exact integer reduction)
    import csv as _csv

    a = _run(_params(route, hindcast, tmp_path / "a", WORKERS=1, OUTPUT_SEGMENTS=str(tmp_path / "a.gpkg"),
                     OUTPUT_CSV=str(tmp_path / "a.csv"), OUTPUT_REPORT=str(tmp_path / "a.html")))
    b = _run(_params(route, hindcast, tmp_path / "b", WORKERS=2, OUTPUT_SEGMENTS=str(tmp_path / "b.gpkg"),
                     OUTPUT_CSV=str(tmp_path / "b.csv"), OUTPUT_REPORT=str(tmp_path / "b.html")))

    def rows(p):
        return [r for r in _csv.reader(open(p).read().splitlines()) if r and not r[0].startswith("#")]

    assert rows(a["OUTPUT_CSV"]) == rows(b["OUTPUT_CSV"])
