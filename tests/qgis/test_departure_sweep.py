# SPDX-License-Identifier: GPL-2.0-or-later
"""seawaycomfort:departuresweep end to end through QGIS Processing, on invented storm forecasts.

The table is compared with the core sweep (processing/core/sweep.py, whose results are checked
against hand storm timing and compute_passage in tests/core/test_sweep.py) called directly with
the same inputs; the storm pick by hand as there (geographiclib distance / speed); the saved QML
with Python's xml.etree; the layers with QGIS's OGR provider. Each bad input must give a
QgsProcessingException whose text names the input and says what to fix.
"""
from __future__ import annotations

import json
import xml.etree.ElementTree as ET

import numpy as np
import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")

from geographiclib.geodesic import Geodesic  # noqa: E402

from seaway_comfort.processing.core.seastate import open_sea_state  # noqa: E402
from seaway_comfort.processing.core.demo.writers import write_cf_netcdf  # noqa: E402
from seaway_comfort.processing.core.vessel.profile import resolve_vessel  # noqa: E402

ALG = "seawaycomfort:departuresweep"
HS = "sea_surface_wave_significant_height"
TP = "sea_surface_wave_period_at_variance_spectral_density_maximum"
DIR = "sea_surface_wave_from_direction"
T0 = np.datetime64("2030-06-01T00:00", "ms")  # invented scenario
LON = np.round(np.arange(-0.2, 1.5001, 0.01), 2)
LAT = np.round(np.arange(-0.1, 0.1001, 0.05), 2)
VESSEL = "ocean_research_70m"
FIELDS = ("rank", "depart_utc", "speed_kn", "arrive_utc", "duration_h", "source", "worst_msi_pct",
          "worst_msi_dist_nm", "worst_msi_utc", "hrs_c0", "hrs_c1", "hrs_c2", "hrs_c3", "hrs_c4",
          "msdv_arrival", "sick_pct_arrival", "flags", "in_forecast", "within_lim", "crit_value",
          "crit_spread", "msi_spread")


def _storm_file(path, storm_h, horizon_h=30.0):
    times = T0 + np.arange(int(horizon_h * 4) + 1) * np.timedelta64(15, "m")
    th = np.arange(times.size) / 4.0
    in_t = (th >= storm_h[0] - 1e-9) & (th <= storm_h[1] + 1e-9)
    in_x = (LON >= 0.5 - 1e-9) & (LON <= 0.7 + 1e-9)
    storm = np.broadcast_to(in_t[:, None, None] & in_x[None, None, :], (times.size, LAT.size, LON.size))
    write_cf_netcdf(path, LON, LAT, times, {
        HS: np.where(storm, 4.5, 1.0), TP: np.where(storm, 9.0, 6.0), DIR: np.full(storm.shape, 90.0)})
    return path


@pytest.fixture(scope="module")
def seas(tmp_path_factory):
    folder = tmp_path_factory.mktemp("storm")
    return (_storm_file(str(folder / "a.nc"), (10.0, 13.5)), _storm_file(str(folder / "b.nc"), (13.0, 16.5)))


@pytest.fixture(scope="module")
def sweep_registered(seaway_provider):
    """The algorithm as the provider itself registers it (never added by the test: a provider
    that drops it from ALGORITHM_CLASSES must fail here)."""
    from qgis.core import QgsApplication

    assert ALG.split(":")[1] in [a.name() for a in seaway_provider.algorithms()], "provider lacks " + ALG
    assert QgsApplication.processingRegistry().algorithmById(ALG) is not None, ALG


def _geojson(path, features):
    doc = {"type": "FeatureCollection", "features": [
        {"type": "Feature", "properties": props, "geometry": {"type": "LineString", "coordinates": coords}}
        for props, coords in features]}
    path.write_text(json.dumps(doc))
    return str(path)


@pytest.fixture()
def route(tmp_path):
    return _geojson(tmp_path / "route.geojson", [({"name": "east run"}, [[0.0, 0.0], [1.2, 0.0]])])


def _params(route, seas, tmp_path, **over):
    p = {
        "ROUTE": route, "SEA_STATE": list(seas), "SOURCE_NAMES": "model A,model B", "SPEED_KN": 10.0,
        "VESSEL": VESSEL, "SPACING_NM": 1.0, "DEPART_FROM": "2030-06-01T06:00:00Z",
        "DEPART_TO": "2030-06-01T16:00:00Z", "DEPART_STEP_H": 1.0, "CRITERION": 3, "MAX_CLASS": 2,
        "OUTPUT_TABLE": str(tmp_path / "table.gpkg"), "OUTPUT_REPORT": str(tmp_path / "sweep.html"),
    }
    p.update(over)
    return p


def _run(params, feedback=None):
    import processing

    return processing.run(ALG, params, feedback=feedback)


def _features(path):
    from qgis.core import QgsVectorLayer

    layer = QgsVectorLayer(path, "x", "ogr")
    assert layer.isValid(), path
    return layer, list(layer.getFeatures())


def _num(v):
    from qgis.PyQt.QtCore import QVariant

    if v is None or (isinstance(v, QVariant) and v.isNull()):
        return None
    return float(v)


def _core(seas, **kw):
    from seaway_comfort.processing.core.sweep.engine import sweep_departures

    srcs = [open_sea_state(p, source_name=n) for p, n in zip(seas, ("model A", "model B"))]
    try:
        args = dict(depart_from_utc="2030-06-01T06:00", depart_to_utc="2030-06-01T16:00", step_h=1.0,
                    sea_states=srcs, profile=resolve_vessel(VESSEL), speeds_kn=[10.0], criterion="earliest_ok",
                    max_class=2, spacing_nm=1.0)
        args.update(kw)
        return sweep_departures([0.0, 1.2], [0.0, 0.0], **args)
    finally:
        for s in srcs:
            s.close()


def _ms(qdt):
    return qdt.toMSecsSinceEpoch()


def test_end_to_end_matches_core_and_hand_pick(sweep_registered, route, seas, tmp_path):
    res = _run(_params(route, seas, tmp_path))
    layer, feats = _features(res["OUTPUT_TABLE"])
    from qgis.core import QgsWkbTypes

    assert layer.wkbType() == QgsWkbTypes.Type.NoGeometry
    names = [f.name() for f in layer.fields()]
    for name in FIELDS:
        assert name in names, name
    core = _core(seas)
    assert len(feats) == len(core.rows) == 11 * 3 == res["N_ROWS"]
    by_key = {(int(r.depart_utc.astype(np.int64)), r.source): r for r in core.rows}
    for f in feats:
        r = by_key[(_ms(f["depart_utc"]), f["source"])]
        assert int(f["rank"]) == r.rank
        for field, attr in (("worst_msi_pct", "worst_msi_pct"), ("msdv_arrival", "msdv_arrival"),
                            ("hrs_c4", None), ("crit_value", "criterion_value"), ("duration_h", "duration_h")):
            want = r.hours_class[4] if attr is None else getattr(r, attr)
            got = _num(f[field])
            if np.isfinite(want):
                assert got == pytest.approx(float(want), rel=1e-9, abs=1e-12), field
            else:
                assert got is None, field  # NULL, never 0 or NaN
        assert bool(f["in_forecast"]) == r.in_forecast and bool(f["within_lim"]) == r.within_limits
    # by hand (tests/core/test_sweep.py): storm A clears from 11 h, storm B (3 h later) from 14 h
    assert res["RECOMMENDED_UTC"] == "2030-06-01T14:00:00Z"
    html = open(res["OUTPUT_REPORT"], encoding="utf-8").read()
    assert "2030-06-01 14:00 UTC" in html and "Planning aid only" in html
    assert "model A" in html and "ALL (worst case)" in html
    qmd = ET.parse(str(tmp_path / "table.qmd")).getroot()
    assert "Planning aid only" in qmd.findtext("abstract")


def test_recommended_points_styled_as_routecomfort(sweep_registered, route, seas, tmp_path):
    res = _run(_params(route, seas, tmp_path, OUTPUT_POINTS=str(tmp_path / "points.gpkg")))
    _, feats = _features(res["OUTPUT_POINTS"])
    s12 = Geodesic.WGS84.Inverse(0.0, 0.0, 0.0, 1.2)["s12"]
    n = int(np.ceil(s12 / 1852.0 - 1e-9)) + 1  # 1 NM spacing, both ends kept
    assert len(feats) == 2 * n  # one passage per source
    first = min(feats, key=lambda f: (int(f["leg"]), int(f["seq"])))
    assert _ms(first["eta_utc"]) == int(np.datetime64("2030-06-01T14:00", "ms").astype(np.int64))
    root = ET.parse(str(tmp_path / "points.qml")).getroot()
    renderer = root.find("renderer-v2")
    assert renderer.get("type") == "categorizedSymbol" and renderer.get("attr") == "comfort_class"
    assert root.find("temporal").get("startField") == "eta_utc"


def test_two_speeds_and_marked_horizon(sweep_registered, route, seas, tmp_path):
    res = _run(_params(route, seas, tmp_path, SPEEDS_KN="8, 12", DEPART_FROM="2030-06-01T20:00:00Z",
                       DEPART_TO="2030-06-01T24:00:00Z", CRITERION=2))
    _, feats = _features(res["OUTPUT_TABLE"])
    assert len(feats) == 5 * 2 * 3
    s12 = Geodesic.WGS84.Inverse(0.0, 0.0, 0.0, 1.2)["s12"]
    for f in feats:
        dep_h = (_ms(f["depart_utc"]) - int(T0.astype(np.int64))) / 3.6e6
        arrive_h = dep_h + s12 / (float(f["speed_kn"]) * 1852.0)  # hours
        # the forecasts end at 30 h; the sampler accepts 0.5 h beyond (time tolerance 1800 s)
        assert bool(f["in_forecast"]) == (arrive_h <= 30.5), (dep_h, f["speed_kn"])
        if not f["in_forecast"]:
            assert "OFFTIME" in f["flags"]


@pytest.mark.parametrize("over, pattern", [
    ({"DEPART_TO": "2030-06-01T02:00:00Z"}, "DEPART_TO .* lies before DEPART_FROM"),
    ({"DEPART_STEP_H": 0.0}, "DEPART_STEP_H must be > 0 hours, got 0"),
    ({"DEPART_STEP_H": -3.0}, "DEPART_STEP_H must be > 0 hours, got -3"),
    # by hand: 2030-06-01 06:00 to 2031-06-01 00:00 is 365 d - 6 h = 8754 h, every 0.5 h: 17509
    ({"DEPART_TO": "2031-06-01T00:00:00Z", "DEPART_STEP_H": 0.5}, "gives 17509 departures, more than the limit"),
    ({"MAX_CLASS": 7}, "MAX_CLASS must be a whole number 0..4"),
    ({"SPEEDS_KN": "8, fast"}, "SPEEDS_KN: .*'fast'"),
    ({"SPEEDS_KN": "0"}, "SPEEDS_KN: .*> 0 kn"),
    ({"DEPART_FROM": "2030-07-01T00:00:00Z", "DEPART_TO": "2030-07-02T00:00:00Z"}, "no departure .* inside the time range"),
    # a missing mandatory parameter is refused by QGIS itself, naming it
    ({"ROUTE": None}, "ROUTE"),
])
def test_bad_parameters(sweep_registered, route, seas, tmp_path, over, pattern):
    from qgis.core import QgsProcessingException

    params = _params(route, seas, tmp_path, **over)
    params = {k: v for k, v in params.items() if v is not None}
    with pytest.raises(QgsProcessingException, match=pattern):
        _run(params)


def test_non_overlapping_sources(sweep_registered, route, seas, tmp_path):
    from qgis.core import QgsProcessingException

    later = str(tmp_path / "later.nc")
    times = T0 + np.timedelta64(10, "D") + np.arange(5) * np.timedelta64(3, "h")
    shape = (times.size, LAT.size, LON.size)
    write_cf_netcdf(later, LON, LAT, times, {HS: np.ones(shape), TP: np.full(shape, 6.0), DIR: np.zeros(shape)})
    with pytest.raises(QgsProcessingException, match="do not overlap in time"):
        _run(_params(route, (seas[0], later), tmp_path))
    # no window given: the default window needs overlapping files too
    with pytest.raises(QgsProcessingException, match="DEPART_FROM/DEPART_TO: the forecast files do not overlap"):
        _run(_params(route, (seas[0], later), tmp_path, DEPART_FROM=None, DEPART_TO=None))


def test_two_leg_route_is_one_passage_in_layer_order(sweep_registered, seas, tmp_path):
    """Two legs end to start = the passage along their vertices: same table as the core sweep
    of the joined vertices (0, 0.6, 1.2 deg E on the equator), same recommendation as one line."""
    two = _geojson(tmp_path / "two.geojson", [({"name": "out"}, [[0.0, 0.0], [0.6, 0.0]]),
                                             ({"name": "on"}, [[0.6, 0.0], [1.2, 0.0]])])
    res = _run(_params(two, seas, tmp_path))
    _, feats = _features(res["OUTPUT_TABLE"])
    from seaway_comfort.processing.core.sweep.engine import sweep_departures

    srcs = [open_sea_state(p, source_name=n) for p, n in zip(seas, ("model A", "model B"))]
    try:
        core = sweep_departures([0.0, 0.6, 1.2], [0.0, 0.0, 0.0], depart_from_utc="2030-06-01T06:00",
                                depart_to_utc="2030-06-01T16:00", step_h=1.0, sea_states=srcs,
                                profile=resolve_vessel(VESSEL), speeds_kn=[10.0], criterion="earliest_ok",
                                max_class=2, spacing_nm=1.0)
    finally:
        for s in srcs:
            s.close()
    assert len(feats) == len(core.rows)
    by_key = {(int(r.depart_utc.astype(np.int64)), r.source): r for r in core.rows}
    for f in feats:
        r = by_key[(_ms(f["depart_utc"]), f["source"])]
        assert _num(f["duration_h"]) == pytest.approx(float(r.duration_h), rel=1e-9)
        assert int(f["rank"]) == r.rank
    assert res["RECOMMENDED_UTC"] == "2030-06-01T14:00:00Z"  # as the one-line route (storm timing by hand)
    html = open(res["OUTPUT_REPORT"], encoding="utf-8").read()
    assert "out + on" in html and "QgsProcessingFeatureSourceDefinition" not in html


def test_legs_with_a_gap_are_joined_with_a_warning(sweep_registered, seas, tmp_path):
    from qgis.core import QgsProcessingFeedback

    class Record(QgsProcessingFeedback):
        def __init__(self):
            super().__init__()
            self.warnings = []

        def pushWarning(self, warning):  # noqa: N802
            self.warnings.append(warning)
            super().pushWarning(warning)

    gap = _geojson(tmp_path / "gap.geojson", [({"name": "a"}, [[0.0, 0.0], [0.5, 0.0]]),
                                             ({"name": "b"}, [[0.6, 0.0], [1.2, 0.0]])])
    fb = Record()
    _run(_params(gap, seas, tmp_path), feedback=fb)
    # 0.1 deg of longitude on the equator = 6.01 NM (WGS84 a = 6378137 m: 2*pi*a/3600/1852)
    assert any("'a' ends 6.01 NM from the start of 'b'" in w for w in fb.warnings), fb.warnings


def test_default_window_is_the_forecast_range(sweep_registered, route, seas, tmp_path):
    # the storm files run from T0 to T0 + 30 h every 15 min (_storm_file), so every 6 h: 0, 6, ..., 30 h
    res = _run(_params(route, seas, tmp_path, DEPART_FROM=None, DEPART_TO=None, DEPART_STEP_H=6.0))
    _, feats = _features(res["OUTPUT_TABLE"])
    deps = sorted({_ms(f["depart_utc"]) for f in feats})
    t0 = int(T0.astype(np.int64))
    assert [(d - t0) / 3.6e6 for d in deps] == [0.0, 6.0, 12.0, 18.0, 24.0, 30.0]


def test_selected_features_only_named_in_report(sweep_registered, seas, tmp_path):
    from qgis.core import QgsProcessingFeatureSourceDefinition, QgsProject, QgsVectorLayer

    two = _geojson(tmp_path / "sel.geojson", [({"name": "a"}, [[0.0, 0.0], [1.2, 0.0]]),
                                             ({"name": "b"}, [[0.0, 0.05], [1.2, 0.05]])])
    layer = QgsVectorLayer(two, "Invented run", "ogr")
    QgsProject.instance().addMapLayer(layer)
    try:
        layer.selectByExpression("\"name\" = 'a'")
        src = QgsProcessingFeatureSourceDefinition(layer.id(), True)
        res = _run(_params(src, seas, tmp_path))
    finally:
        QgsProject.instance().removeMapLayer(layer.id())
    html = open(res["OUTPUT_REPORT"], encoding="utf-8").read()
    assert "QgsProcessingFeatureSourceDefinition" not in html
    assert "Invented run" in html and "selected features only" in html and "sel.geojson" in html
    assert res["RECOMMENDED_UTC"] == "2030-06-01T14:00:00Z"  # line a alone, as the one-line route


def test_progress_and_cancel(sweep_registered, route, seas, tmp_path):
    from qgis.core import QgsProcessingException, QgsProcessingFeedback

    class Record(QgsProcessingFeedback):
        def __init__(self):
            super().__init__()
            self.values = []
            self.infos = []
            self.progressChanged.connect(self.values.append)

        def pushInfo(self, info):  # noqa: N802
            self.infos.append(info)
            super().pushInfo(info)

    fb = Record()
    _run(_params(route, seas, tmp_path), feedback=fb)
    assert fb.values and fb.values[-1] == 100
    assert all(b >= a - 1e-9 for a, b in zip(fb.values, fb.values[1:]))
    # the recommendation with its reason and the caution are in the log
    log = "\n".join(fb.infos)
    assert "Recommended: Go. Depart 2030-06-01 14:00 UTC" in log and "within limits" in log
    assert "CAUTION: Planning aid only" in log

    class CancelSoon(QgsProcessingFeedback):
        calls = 0

        def isCanceled(self):  # noqa: N802
            CancelSoon.calls += 1
            return CancelSoon.calls > 2

    with pytest.raises(QgsProcessingException, match="Cancelled"):
        _run(_params(route, seas, tmp_path, OUTPUT_TABLE=str(tmp_path / "cancelled.gpkg")), feedback=CancelSoon())
    assert CancelSoon.calls > 2
    assert not (tmp_path / "cancelled.gpkg").exists()


def test_a_parameter_the_sweep_does_not_have_is_ignored(sweep_registered, route, seas, tmp_path):
    """DEPARTURE belongs to routecomfort; given to the sweep (a script reusing its parameters)
    it is ignored like any unknown parameter, not refused as an invalid date-time."""
    res = _run(_params(route, seas, tmp_path, DEPARTURE="2031-03-11T06:00:00Z"))
    assert res["N_ROWS"] > 0
