# SPDX-License-Identifier: GPL-2.0-or-later
"""The algorithms through the result handling the Processing dialog uses, with temporary outputs.

``processing.run`` skips what the dialog does after a run; ``processing.runAndLoadResults``
ends in QGIS's own ``handleAlgorithmResults`` (processing/gui/Postprocessing.py), which loads
every layer the context lists for loading and reports "The following layers were not correctly
generated." for any it cannot open. The reference is therefore QGIS's own result handling: each
run must report no error, every sink output must load into the project as a valid layer, and
nothing else (no extra ``memory:<name>`` entry) may be listed for loading.
Data: the invented uniform sea and storm scenario of test_route_comfort / test_departure_sweep.
"""
from __future__ import annotations

import json

import numpy as np
import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")

from seaway_comfort.processing.core.demo.writers import write_cf_netcdf  # noqa: E402

HS = "sea_surface_wave_significant_height"
TP = "sea_surface_wave_period_at_variance_spectral_density_maximum"
DIR = "sea_surface_wave_from_direction"
T0 = np.datetime64("2030-06-01T00:00", "ms")  # invented scenario
TEMP = "TEMPORARY_OUTPUT"


@pytest.fixture(scope="module")
def sea(tmp_path_factory):
    folder = tmp_path_factory.mktemp("sea_dialog")
    times = T0 + np.arange(9) * np.timedelta64(3, "h")
    lon = np.arange(-1.0, 2.01, 0.25)
    lat = np.arange(-1.0, 1.01, 0.25)
    shape = (times.size, lat.size, lon.size)
    path = str(folder / "uniform.nc")
    write_cf_netcdf(path, lon, lat, times, {HS: np.full(shape, 2.0), TP: np.full(shape, 8.0), DIR: np.zeros(shape)})
    return path


@pytest.fixture()
def route(tmp_path):
    path = tmp_path / "route.geojson"
    path.write_text(json.dumps({"type": "FeatureCollection", "features": [{
        "type": "Feature", "properties": {"name": "east run"},
        "geometry": {"type": "LineString", "coordinates": [[0.0, 0.0], [0.5, 0.0]]}}]}))
    return str(path)


class _Recorder:
    """A QgsProcessingFeedback that keeps every reported error."""

    def __new__(cls):  # a subclass built lazily, once QGIS is importable
        from qgis.core import QgsProcessingFeedback

        class Feedback(QgsProcessingFeedback):
            def __init__(self) -> None:
                super().__init__()
                self.errors = []

            def reportError(self, error, fatalError=False):  # noqa: N802, N803 (QGIS API)
                self.errors.append(str(error))
                super().reportError(error, fatalError)

        return Feedback()


def _run_like_dialog(alg_id, params):
    """processing.runAndLoadResults: the run, then QGIS's handleAlgorithmResults."""
    import processing
    from qgis.core import QgsProcessingContext, QgsProject

    project = QgsProject.instance()
    before = set(project.mapLayers())
    feedback = _Recorder()
    context = QgsProcessingContext()
    context.setProject(project)
    results = processing.runAndLoadResults(alg_id, dict(params), feedback=feedback, context=context)
    added = {lid: lyr for lid, lyr in project.mapLayers().items() if lid not in before}
    return results, feedback.errors, added


def _check(results, errors, added, sinks, styled=None):
    """No error, each sink loaded once and valid, nothing else loaded; ``styled``: sink -> the
    field its loaded layer's renderer must classify on (our post-processor ran)."""
    from qgis.core import QgsProject

    try:
        assert results is not None
        assert not [e for e in errors if "not correctly generated" in e], errors
        assert errors == []
        for name in sinks:
            assert results[name], name
            assert results[name] in added, (name, results[name], list(added))
            assert added[results[name]].isValid()
            assert added[results[name]].featureCount() > 0
        assert len(added) == len(sinks), [lyr.source() for lyr in added.values()]
        for name, field in (styled or {}).items():
            assert added[results[name]].renderer().classAttribute() == field, name
    finally:
        QgsProject.instance().removeMapLayers(list(added))


def test_routecomfort_temporary_outputs_load_cleanly(seaway_provider, route, sea):
    params = {"ROUTE": route, "SEA_STATE": [sea], "DEPARTURE": "2030-06-01T01:00:00Z", "SPEED_KN": 10.0,
              "VESSEL": "coastal_survey_35m", "SPACING_NM": 5.0,
              "OUTPUT_POINTS": TEMP, "OUTPUT_SEGMENTS": TEMP}
    _check(*_run_like_dialog("seawaycomfort:routecomfort", params), sinks=("OUTPUT_POINTS", "OUTPUT_SEGMENTS"),
           styled={"OUTPUT_POINTS": "comfort_class", "OUTPUT_SEGMENTS": "comfort_class"})


def test_departuresweep_temporary_outputs_load_cleanly(seaway_provider, route, sea):
    params = {"ROUTE": route, "SEA_STATE": [sea], "SPEED_KN": 10.0, "VESSEL": "coastal_survey_35m",
              "SPACING_NM": 5.0, "DEPART_FROM": "2030-06-01T03:00:00Z", "DEPART_TO": "2030-06-01T09:00:00Z",
              "DEPART_STEP_H": 3.0, "OUTPUT_TABLE": TEMP, "OUTPUT_POINTS": TEMP}
    _check(*_run_like_dialog("seawaycomfort:departuresweep", params), sinks=("OUTPUT_TABLE", "OUTPUT_POINTS"),
           styled={"OUTPUT_POINTS": "comfort_class"})


def test_seasonalclimate_temporary_output_loads_cleanly(seaway_provider, tmp_path):
    from seaway_comfort.processing.core.demo.synthetic_hindcast import SeasonalCycle, write_seasonal_hindcast

    hindcast = write_seasonal_hindcast(str(tmp_path / "hind"), [2030], cycle=SeasonalCycle(hs_mean_m=1.0, hs_amp_m=0.8))
    route = tmp_path / "route.geojson"
    route.write_text(json.dumps({"type": "FeatureCollection", "features": [{
        "type": "Feature", "properties": {"name": "invented run"},
        "geometry": {"type": "LineString", "coordinates": [[-9.0, 41.0], [-8.0, 42.0]]}}]}))
    params = {"ROUTE": str(route), "HINDCAST": hindcast, "VESSEL": "coastal_survey_35m", "SPEED_KN": 10.0,
              "MONTHS": "6,7", "MAX_CLASS": 1, "WORKERS": 1, "OUTPUT_SEGMENTS": TEMP}
    _check(*_run_like_dialog("seawaycomfort:seasonalclimate", params), sinks=("OUTPUT_SEGMENTS",),
           styled={"OUTPUT_SEGMENTS": "ok_sel"})


def test_dialog_output_onto_an_input_is_refused(seaway_provider, route, sea, tmp_path):
    # the dialog hands sinks over as QgsProcessingOutputLayerDefinition; the clobbering check
    # reads the file from that definition (no parameterAsOutputLayer), so an input is still refused
    from qgis.core import QgsProcessingException

    params = {"ROUTE": route, "SEA_STATE": [sea], "DEPARTURE": "2030-06-01T01:00:00Z", "VESSEL": "coastal_survey_35m",
              "OUTPUT_POINTS": route, "OUTPUT_SEGMENTS": TEMP}
    with pytest.raises(QgsProcessingException, match="also an input"):
        _run_like_dialog("seawaycomfort:routecomfort", params)
    params.update(OUTPUT_POINTS=str(tmp_path / "same"), OUTPUT_SEGMENTS=str(tmp_path / "same.gpkg"))
    with pytest.raises(QgsProcessingException, match="must be different files"):  # QGIS adds .gpkg to "same"
        _run_like_dialog("seawaycomfort:routecomfort", params)
