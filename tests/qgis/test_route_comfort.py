# SPDX-License-Identifier: GPL-2.0-or-later
"""seawaycomfort:routecomfort end to end through QGIS Processing, on uniform sea fields.

The numbers are compared with the core pipeline (processing/core/passage.py, whose own
formulas are checked against published values in the core tests) called directly with the
same inputs, and with geographiclib (WGS84 geodesics) for distances; the saved QML is read with
Python's xml.etree; the layers with QGIS's OGR provider. Each bad input must give a
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

ALG = "seawaycomfort:routecomfort"
HS = "sea_surface_wave_significant_height"
TP = "sea_surface_wave_period_at_variance_spectral_density_maximum"
DIR = "sea_surface_wave_from_direction"
T0 = np.datetime64("2030-06-01T00:00", "ms")
TIMES = T0 + np.arange(9) * np.timedelta64(3, "h")
VESSEL = "coastal_survey_35m"
INTERFACE_FIELDS = (
    "leg", "seq", "eta_utc", "dist_nm", "course_deg", "hs_m", "tp_s", "wave_from_deg", "depth_m",
    "wavelength_m", "celerity_m_s", "rel_heading_deg", "enc_period_s", "heave_rms_m", "pitch_rms_deg",
    "roll_rms_deg", "pitch_tz_s", "vacc_rms_m_s2", "lacc_rms_m_s2", "msi_pct", "msdv_cum",
    "comfort_class", "comfort_label", "flags", "source",
)


@pytest.fixture(scope="module")
def sea(tmp_path_factory):
    folder = tmp_path_factory.mktemp("sea")
    lon = np.arange(-10.0, 10.01, 0.5)
    lat = np.arange(-10.0, 20.01, 0.5)
    shape = (TIMES.size, lat.size, lon.size)
    path = str(folder / "uniform.nc")
    write_cf_netcdf(path, lon, lat, TIMES, {HS: np.full(shape, 2.0), TP: np.full(shape, 8.0), DIR: np.zeros(shape)})
    return path


def _geojson(path, features, crs=None):
    doc = {"type": "FeatureCollection", "features": [
        {"type": "Feature", "properties": props, "geometry": {"type": "LineString", "coordinates": coords}}
        for props, coords in features
    ]}
    if crs:
        doc["crs"] = {"type": "name", "properties": {"name": crs}}
    path.write_text(json.dumps(doc))
    return str(path)


@pytest.fixture()
def route(tmp_path):
    return _geojson(tmp_path / "route.geojson", [
        ({"name": "north run"}, [[0.0, 0.0], [0.0, 0.5]]),
        ({"name": "east run", "depart_utc": "2030-06-01T06:00:00Z", "speed_kn": 6.0}, [[1.0, 1.0], [1.4, 1.0]]),
    ])


def _params(route, sea, tmp_path, **over):
    p = {
        "ROUTE": route, "SEA_STATE": [sea], "DEPARTURE": "2030-06-01T01:00:00Z", "SPEED_KN": 10.0,
        "VESSEL": VESSEL, "SPACING_NM": 2.0,
        "OUTPUT_POINTS": str(tmp_path / "points.gpkg"), "OUTPUT_SEGMENTS": str(tmp_path / "segments.gpkg"),
        "OUTPUT_REPORT": str(tmp_path / "report.html"),
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


def _core(sea, lon, lat, departure, speed):
    from seaway_comfort.processing.core.passage.pipeline import compute_passage

    src = open_sea_state(sea)
    try:
        return compute_passage(lon, lat, departure_utc=departure, speed_kn=speed, sea_states=[src],
                               profile=resolve_vessel(VESSEL), spacing_nm=2.0)
    finally:
        src.close()


def _overview_rows(text):
    """Data rows (cell texts) of the table after the report's "Legs" heading (html.parser)."""
    from html.parser import HTMLParser

    class Rows(HTMLParser):
        def __init__(self):
            super().__init__()
            self.rows, self.heading, self.cell, self.active = [], "", None, False

        def handle_starttag(self, tag, attrs):
            if tag == "h2":
                self.heading = ""
            elif tag == "td" and self.active:
                self.cell = ""
            elif tag == "tr" and self.active:
                self.rows.append([])

        def handle_endtag(self, tag):
            if tag == "h2":
                self.active = self.heading.strip() in ("Overview", "Legs")  # the legs table
            elif tag == "td" and self.cell is not None:
                self.rows[-1].append(self.cell.strip())
                self.cell = None
            elif tag == "table":
                self.active = False

        def handle_data(self, data):
            self.heading += data
            if self.cell is not None:
                self.cell += data

    p = Rows()
    p.feed(text)
    return [r for r in p.rows if r]


def _num(v):
    from qgis.PyQt.QtCore import QVariant

    if v is None or (isinstance(v, QVariant) and v.isNull()):
        return None
    return float(v)


def test_end_to_end_matches_core(seaway_provider, route, sea, tmp_path):
    res = _run(_params(route, sea, tmp_path))
    layer, feats = _features(res["OUTPUT_POINTS"])
    names = [f.name() for f in layer.fields()]
    for name in INTERFACE_FIELDS:
        assert name in names, name
    legs = {0: _core(sea, [0.0, 0.0], [0.0, 0.5], "2030-06-01T01:00:00Z", 10.0),
            1: _core(sea, [1.0, 1.4], [1.0, 1.0], "2030-06-01T06:00:00Z", 6.0)}
    assert len(feats) == sum(r.n for r in legs.values())
    assert res["N_SAMPLES"] == len(feats)
    for f in feats:
        r = legs[int(f["leg"])]
        i = int(f["seq"])
        for field in ("hs_m", "tp_s", "enc_period_s", "rel_heading_deg", "wavelength_m", "heave_rms_m",
                      "vacc_rms_m_s2", "msi_pct", "msdv_cum", "dist_nm"):
            assert _num(f[field]) == pytest.approx(float(getattr(r, field)[i]), rel=1e-9, abs=1e-12), field
        assert int(f["comfort_class"]) == int(r.comfort_class[i])
        eta = f["eta_utc"]
        # GeoPackage keeps whole seconds: the stored ETA is the core ETA rounded to the second
        assert abs(eta.toMSecsSinceEpoch() - int(r.eta_utc[i].astype(np.int64))) <= 500
    # leg 2 uses its own departure and speed fields: distance / 6 kn (geographiclib)
    last = max((f for f in feats if int(f["leg"]) == 1), key=lambda f: int(f["seq"]))
    s12 = Geodesic.WGS84.Inverse(1.0, 1.0, 1.0, 1.4)["s12"]
    hours = (last["eta_utc"].toMSecsSinceEpoch() - int(np.datetime64("2030-06-01T06:00", "ms").astype(np.int64))) / 3.6e6
    assert hours == pytest.approx(s12 / (6.0 * 1852.0), abs=0.5 / 3600)
    _, segs = _features(res["OUTPUT_SEGMENTS"])
    assert len(segs) == len(feats) - 2  # one fewer segment than samples per leg
    text = open(res["OUTPUT_REPORT"], encoding="utf-8").read()
    # the report's overview table, parsed (html.parser): one row per leg with its name, distance
    # [NM] = geodesic length (geographiclib, 1852 m/NM), hours = NM / speed [kn], max MSI [%]
    rows = {r[1]: r for r in _overview_rows(text)}
    assert set(rows) == {"north run", "east run"}
    for name, (lat1, lon1, lat2, lon2), speed, leg in (("north run", (0.0, 0.0, 0.5, 0.0), 10.0, 0),
                                                       ("east run", (1.0, 1.0, 1.0, 1.4), 6.0, 1)):
        nm = Geodesic.WGS84.Inverse(lat1, lon1, lat2, lon2)["s12"] / 1852.0
        assert rows[name][0] == str(leg + 1)
        assert float(rows[name][4]) == pytest.approx(nm, abs=0.05 + 1e-9), name
        assert float(rows[name][5]) == pytest.approx(nm / speed, abs=0.05 + 1e-9), name
        assert float(rows[name][7]) == pytest.approx(float(np.nanmax(legs[leg].msi_pct)), abs=0.05 + 1e-9)


def test_nulls_where_not_computed(seaway_provider, sea, tmp_path):
    """Samples outside the grid (east of 10.25 E) and overtaking samples get NULL, not 0, as QGIS
    reads the layer back. The features are turned into plain values and the layer dropped
    before any assertion: a failing assertion's traceback must not keep a QgsVectorLayer alive
    past exitQgis() (freed afterwards by the garbage collector, it crashed the process with
    exit 139 instead of reporting the failure)."""
    fields = ("hs_m", "heave_rms_m", "msi_pct", "comfort_class", "comfort_label", "enc_period_s")
    rt = _geojson(tmp_path / "r.geojson", [({"name": "off east"}, [[9.5, 0.0], [11.0, 0.0]]),
                                            ({"name": "fast south", "speed_kn": 30.0}, [[0.0, 1.0], [0.0, 0.5]])])
    res = _run(_params(rt, sea, tmp_path))
    layer, feats = _features(res["OUTPUT_POINTS"])
    rows = [dict({n: _plain(f[n]) for n in fields + ("flags", "leg")}, x=f.geometry().asPoint().x())
            for f in feats]
    del layer, feats
    off = [r for r in rows if r["x"] > 10.3]
    assert off
    for r in off:
        assert [r[n] for n in fields] == [None] * len(fields), r
        assert "OFFGRID" in r["flags"]
    fast = [r for r in rows if int(r["leg"]) == 1]
    for r in fast:  # 30 kn in following seas outruns 8 s crests (c0 = 12.5 m/s)
        assert "OUTRUN" in r["flags"]
        assert r["enc_period_s"] is None
        assert r["heave_rms_m"] is not None


def _plain(v):
    """A QGIS attribute value as a plain Python value, NULL as None."""
    from qgis.PyQt.QtCore import QVariant

    if v is None or (isinstance(v, QVariant) and v.isNull()):
        return None
    return v if isinstance(v, (int, float, str)) else str(v)


def test_styles_and_time_saved_beside_outputs(seaway_provider, route, sea, tmp_path):
    from qgis.core import QgsVectorLayer

    res = _run(_params(route, sea, tmp_path))
    for key in ("OUTPUT_POINTS", "OUTPUT_SEGMENTS"):
        path = res[key]
        qml = path[: -len(".gpkg")] + ".qml"
        root = ET.parse(qml).getroot()
        renderer = root.find("renderer-v2")
        assert renderer.get("type") == "categorizedSymbol" and renderer.get("attr") == "comfort_class"
        cats = renderer.find("categories").findall("category")
        assert len(cats) == 6  # five classes + not computed
        temporal = root.find("temporal")
        assert temporal.get("enabled") == "1" and temporal.get("startField") == "eta_utc"
        assert temporal.get("accumulate") == "1"
        # the GeoPackage default style restores the renderer on open (QGIS 3.22 behaviour)
        layer = QgsVectorLayer(path, "x", "ogr")
        assert layer.renderer().type() == "categorizedSymbol"
        # provenance in the metadata abstract, saved as a QGIS metadata file beside the output
        qmd = ET.parse(qml[: -len(".qml")] + ".qmd").getroot()
        abstract = qmd.findtext("abstract")
        assert sea in abstract and VESSEL in abstract and "Planning aid" in abstract
        layer.loadDefaultMetadata()  # QGIS finds '<base>.qmd' as the layer's default metadata
        assert layer.metadata().abstract() == abstract


def _bad_route(tmp_path, kind):
    if kind == "empty":
        return _geojson(tmp_path / "empty.geojson", [])
    if kind == "no_length":
        return _geojson(tmp_path / "dot.geojson", [({"name": "dot"}, [[0.0, 0.0], [0.0, 0.0]])])
    if kind == "metres_in_degrees":
        return _geojson(tmp_path / "m.geojson", [({"name": "metres"}, [[500000.0, 100000.0], [510000.0, 100000.0]])])
    if kind == "degrees_in_metres":
        return _geojson(tmp_path / "d.geojson", [({"name": "deg"}, [[1.0, 1.0], [1.5, 1.2]])],
                        crs="urn:ogc:def:crs:EPSG::3857")
    raise AssertionError(kind)


@pytest.mark.parametrize(
    "kind, pattern",
    [
        ("empty", "no features"),
        ("no_length", "zero length"),
        ("metres_in_degrees", "not degrees"),
        ("degrees_in_metres", "look like degrees"),
    ],
)
def test_bad_routes(seaway_provider, sea, tmp_path, kind, pattern):
    from qgis.core import QgsProcessingException

    with pytest.raises(QgsProcessingException, match=pattern):
        _run(_params(_bad_route(tmp_path, kind), sea, tmp_path))


@pytest.mark.parametrize(
    "over, pattern",
    [
        ({"DEPARTURE": "2030-06-09T00:00:00Z"}, "outside the time range"),
        ({"SPEED_KN": 0.0}, "SPEED_KN must be > 0"),
        ({"SPEED_KN": -2.0}, "SPEED_KN must be > 0"),
        ({"STATION": "crow's nest"}, "STATION .crow's nest. is not on vessel"),
        ({"VESSEL": "no_such_vessel"}, "VESSEL 'no_such_vessel'"),
        ({"SPACING_NM": 0.0}, "SPACING_NM must be > 0"),
        ({"SOURCE_NAMES": "a,b"}, "SOURCE_NAMES has 2 names"),
        ({"DEPARTURE": None}, "has no departure time"),
    ],
)
def test_bad_parameters(seaway_provider, route, sea, tmp_path, over, pattern):
    from qgis.core import QgsProcessingException

    params = _params(route, sea, tmp_path, **over)
    if over.get("DEPARTURE", "x") is None:
        params.pop("DEPARTURE")
        route = _geojson(tmp_path / "nodep.geojson", [({"name": "no time"}, [[0.0, 0.0], [0.0, 0.5]])])
        params["ROUTE"] = route
    with pytest.raises(QgsProcessingException, match=pattern):
        _run(params)


def test_invalid_vessel_file(seaway_provider, route, sea, tmp_path):
    from qgis.core import QgsProcessingException

    bad = tmp_path / "vessel.json"
    bad.write_text('{"format": "seaway-comfort-vessel", "name": "half a boat"}')
    with pytest.raises(QgsProcessingException, match="VESSEL"):
        _run(_params(route, sea, tmp_path, VESSEL=str(bad)))


def test_outputs_never_overwrite_inputs(seaway_provider, route, sea, tmp_path):
    from qgis.core import QgsProcessingException

    with pytest.raises(QgsProcessingException, match="also an input"):
        _run(_params(route, sea, tmp_path, OUTPUT_REPORT=sea))
    with pytest.raises(QgsProcessingException, match="also an input"):
        _run(_params(route, sea, tmp_path, OUTPUT_POINTS=route))


def test_output_folder_missing(seaway_provider, route, sea, tmp_path):
    from qgis.core import QgsProcessingException

    with pytest.raises(QgsProcessingException, match="does not exist"):
        _run(_params(route, sea, tmp_path, OUTPUT_REPORT=str(tmp_path / "nowhere" / "r.html")))


def test_cancel_stops_the_run(seaway_provider, route, sea, tmp_path):
    from qgis.core import QgsProcessingException, QgsProcessingFeedback

    class CancelSoon(QgsProcessingFeedback):
        calls = 0

        def isCanceled(self):  # noqa: N802
            CancelSoon.calls += 1
            return CancelSoon.calls > 2

    fb = CancelSoon()
    with pytest.raises(QgsProcessingException, match="Cancelled"):
        _run(_params(route, sea, tmp_path, SPACING_NM=0.2), feedback=fb)
    assert CancelSoon.calls > 2
    assert not (tmp_path / "points.gpkg").exists()


def test_warning_summary_in_log(seaway_provider, sea, tmp_path):
    from qgis.core import QgsProcessingFeedback

    class Log(QgsProcessingFeedback):
        def __init__(self):
            super().__init__()
            self.lines = []

        def pushWarning(self, text):  # noqa: N802
            self.lines.append(text)

    rt = _geojson(tmp_path / "r.geojson", [({"name": "off east"}, [[9.5, 0.0], [11.0, 0.0]])])
    fb = Log()
    _run(_params(rt, sea, tmp_path), feedback=fb)
    joined = "\n".join(fb.lines)
    assert "OFFGRID" in joined and "outside the forecast grid" in joined


def test_multipart_and_compare_mode(seaway_provider, sea, tmp_path):
    """A MultiLineString gives one leg per part; compare mode gives one result per source."""
    doc = {"type": "FeatureCollection", "features": [{"type": "Feature", "properties": {"name": "two parts"},
           "geometry": {"type": "MultiLineString", "coordinates": [[[0.0, 0.0], [0.0, 0.3]], [[1.0, 0.0], [1.3, 0.0]]]}}]}
    rt = tmp_path / "multi.geojson"
    rt.write_text(json.dumps(doc))
    res = _run(_params(str(rt), sea, tmp_path, SEA_STATE=[sea, sea], SOURCE_NAMES="first,second", SOURCE_MODE=1))
    _, feats = _features(res["OUTPUT_POINTS"])
    names = {f["leg_name"] for f in feats}
    assert names == {"two parts (1) [first]", "two parts (1) [second]", "two parts (2) [first]", "two parts (2) [second]"}
    assert {f["source"] for f in feats} == {"first", "second"}
    one = [f for f in feats if f["leg_name"] == "two parts (1) [first]"]
    two = [f for f in feats if f["leg_name"] == "two parts (1) [second]"]
    assert [_num(f["msi_pct"]) for f in one] == [_num(f["msi_pct"]) for f in two]  # same file twice


def test_post_processor_styles_loaded_outputs(seaway_provider, route, sea, tmp_path, qgis_new_project):
    """runAndLoadResults loads the outputs and the post-processor styles them (QGIS platform
    notes s.5: post-processors run only when outputs are loaded)."""
    import processing
    from qgis.core import QgsProject

    processing.runAndLoadResults(ALG, _params(route, sea, tmp_path, OUTPUT_POINTS="TEMPORARY_OUTPUT",
                                              OUTPUT_SEGMENTS=str(tmp_path / "seg_loaded.gpkg")))
    layers = list(QgsProject.instance().mapLayers().values())
    assert len(layers) == 2
    for layer in layers:
        assert layer.renderer().type() == "categorizedSymbol"
        assert layer.temporalProperties().isActive()
        assert "Planning aid" in layer.metadata().abstract()


def test_vessel_from_user_profile_folder(seaway_provider, route, sea, tmp_path):
    """VESSEL may name a profile stored in <QGIS settings dir>/seaway_comfort/vessels."""
    import shutil

    from seaway_comfort.processing.algorithms.common import user_vessel_dir
    from seaway_comfort.processing.core.vessel.profile import BUILTIN_DIR

    folder = user_vessel_dir()
    folder.mkdir(parents=True, exist_ok=True)
    target = folder / "pytest_own_boat.json"
    data = json.loads((BUILTIN_DIR / f"{VESSEL}.json").read_text())
    data["name"] = "pytest_own_boat"
    target.write_text(json.dumps(data))
    try:
        res = _run(_params(route, sea, tmp_path, VESSEL="pytest_own_boat"))
        text = open(res["OUTPUT_REPORT"], encoding="utf-8").read()
        assert "pytest_own_boat" in text
    finally:
        target.unlink()
        if not any(folder.iterdir()):
            shutil.rmtree(folder)


def test_datetime_and_path_helpers():
    """QDateTime <-> datetime64 against Python's datetime (UTC epoch milliseconds); output
    path helpers on plain paths and OGR URIs."""
    import datetime as dt

    from qgis.PyQt.QtCore import QDate, QDateTime, Qt, QTime

    from seaway_comfort.processing import adapters, styling
    from seaway_comfort.processing.algorithms.common import file_part

    t = np.datetime64("2031-03-11T06:07:08.901", "ms")
    q = adapters.qdatetime_from_datetime64(t)
    assert q.timeSpec() == Qt.TimeSpec.UTC
    ref_ms = int(dt.datetime(2031, 3, 11, 6, 7, 8, 901000, tzinfo=dt.timezone.utc).timestamp() * 1000)
    assert q.toMSecsSinceEpoch() == ref_ms
    assert adapters.datetime64_from_qdatetime(q) == t
    # a zone-less (local) QDateTime is read as UTC wall-clock time
    local = QDateTime(QDate(2031, 3, 11), QTime(6, 7, 8, 901), Qt.TimeSpec.LocalTime)
    assert adapters.datetime64_from_qdatetime(local, assume_utc=True) == t
    assert adapters.round_to_second(t) == np.datetime64("2031-03-11T06:07:09", "s")
    assert adapters.round_to_second(np.datetime64("2031-03-11T06:07:08.499", "ms")) == np.datetime64(
        "2031-03-11T06:07:08", "s")
    assert adapters.datetime64_from_value("2031-03-11T08:07:08.901+02:00", what="x") == t
    assert adapters.datetime64_from_value(None, what="x") is None
    assert styling.qml_path_for("/d/out.gpkg") == "/d/out.qml"
    assert styling.qml_path_for("/d/out.gpkg|layername=legs") == "/d/out_legs.qml"
    assert styling.qml_path_for("ogr:dbname='/d/out.gpkg' table=\"legs\" (geom)") == "/d/out_legs.qml"
    assert file_part("/d/route.shp|layerid=0") == "/d/route.shp"
    assert file_part("ogr:dbname='/d/out.gpkg' table=\"legs\" (geom)") == "/d/out.gpkg"


def test_default_source_names_are_distinct():
    """Two files with the same stem get distinct default names (our own rule: stem, then the
    extension, then a number), so sources can always be compared."""
    from seaway_comfort.processing.algorithms.common import default_source_names

    assert default_source_names(["/a/f.nc", "/b/g.grib2"]) == ("f", "g")
    assert default_source_names(["/a/f.nc", "/a/f.grib2"]) == ("f (nc)", "f (grib2)")
    names = default_source_names(["/a/f.nc", "/b/f.nc", "/c/f.grib2"])
    assert names == ("f (nc) #1", "f (nc) #2", "f (grib2)")
    assert len(set(names)) == 3


def test_datetimes_stored_as_utc_on_every_qgis(seaway_provider, route, sea, tmp_path):
    """eta_utc is stored with its UTC marker whichever QGIS wrote it (GeoPackage 1.3 requirement 5:
    ISO 8601 'YYYY-MM-DDTHH:MM:SS.SSSZ'), so 3.22 and 3.40 outputs mean the same instant; the
    first sample is the departure itself (2030-06-01T01:00Z, the parameter)."""
    import sqlite3

    _run(_params(route, sea, tmp_path))
    for name in ("points", "segments"):
        con = sqlite3.connect(str(tmp_path / f"{name}.gpkg"))
        table = con.execute("select table_name from gpkg_contents where data_type='features'").fetchone()[0]
        etas = [r[0] for r in con.execute(f'select eta_utc from "{table}" order by fid')]
        con.close()
        assert etas and all(e.endswith("Z") for e in etas), etas[:3]
        assert etas[0] == "2030-06-01T01:00:00.000Z"


def _gpkg_rows(path, columns):
    """Rows of the single feature table of a GeoPackage read with Python's sqlite3 (OGC
    GeoPackage 1.3, OGC 12-128r18, s.1.1.3: feature tables are SQLite tables listed in
    gpkg_contents), as plain Python values; SQL NULL comes back as None. Reads outside QGIS, so
    a failure holds no QGIS object alive in its traceback."""
    import sqlite3
    from contextlib import closing

    with closing(sqlite3.connect(f"file:{path}?mode=ro", uri=True)) as con:
        (table,), = con.execute("SELECT table_name FROM gpkg_contents WHERE data_type = 'features'").fetchall()
        sql = "SELECT " + ", ".join(f'"{c}"' for c in columns) + f' FROM "{table}" ORDER BY leg, seq'
        return [dict(zip(columns, row)) for row in con.execute(sql)]


def test_null_stays_null_in_the_written_geopackage(seaway_provider, sea, tmp_path):
    """Leg 0 runs east along the equator from 9.5 E to 11 E; the sea grid's last cell centre is
    10 E, its edge 10.25 E, so samples farther than s(9.5 -> 10.25 E) = 45.0 nm (geographiclib,
    WGS84) from the start have no sea state: hs_m, heave_rms_m, msi_pct, enc_period_s and
    comfort_class must be SQL NULL, not 0. Leg 1 runs south at 30 kn with waves from the north
    (following seas): the deep-water crest speed c = g T / (2 pi) = 9.80665 * 8 / (2 pi) =
    12.49 m/s (Airy; Dean & Dalrymple 1991 eq. 4.19 with tanh -> 1) is below 30 kn =
    15.43 m/s, so the vessel outruns the crests and the encounter period is undefined (NULL)
    while the motions are computed (not NULL). On-grid values are the field's Hs 2.0 m."""
    import math

    rt = _geojson(tmp_path / "r.geojson", [({"name": "off east"}, [[9.5, 0.0], [11.0, 0.0]]),
                                            ({"name": "fast south", "speed_kn": 30.0}, [[0.0, 1.0], [0.0, 0.5]])])
    res = _run(_params(rt, sea, tmp_path))
    cols = ["leg", "seq", "dist_nm", "hs_m", "heave_rms_m", "msi_pct", "enc_period_s", "comfort_class", "flags"]
    rows = _gpkg_rows(res["OUTPUT_POINTS"], cols)
    edge_nm = Geodesic.WGS84.Inverse(0.0, 9.5, 0.0, 10.25)["s12"] / 1852.0
    assert edge_nm == pytest.approx(45.0, abs=0.2)
    assert 9.80665 * 8.0 / (2 * math.pi) < 30.0 * 1852.0 / 3600.0
    leg0 = [r for r in rows if r["leg"] == 0]
    off = [r for r in leg0 if r["dist_nm"] > edge_nm + 1.0]
    on = [r for r in leg0 if r["dist_nm"] < edge_nm - 1.0]
    fast = [r for r in rows if r["leg"] == 1]
    assert off and on and fast, (len(off), len(on), len(fast))
    for r in off:
        assert [r[c] for c in ("hs_m", "heave_rms_m", "msi_pct", "enc_period_s", "comfort_class")] \
            == [None] * 5, r
    for r in on:
        assert r["hs_m"] == pytest.approx(2.0, rel=1e-6), r
    for r in fast:
        assert r["enc_period_s"] is None, r
        assert r["heave_rms_m"] is not None and r["heave_rms_m"] > 0.0, r
