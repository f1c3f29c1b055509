# SPDX-License-Identifier: GPL-2.0-or-later
"""routecomfort / departuresweep / describeseastate with an ensemble and with split files.

References outside the tool: the per-member numbers of the same algorithm run on single-member
files (written by GDAL from the same arrays), ``numpy.percentile`` for the MSI percentiles,
plain counts for the probabilities; the split-by-step files give the numbers of the single file.
Sea values are invented.
"""
from __future__ import annotations

import json

import numpy as np
import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")

from seaway_comfort.processing.core.demo.writers import write_cf_netcdf, write_grib2  # noqa: E402

HS = "sea_surface_wave_significant_height"
TP = "sea_surface_wave_period_at_variance_spectral_density_maximum"
DIR = "sea_surface_wave_from_direction"
T0 = np.datetime64("2031-05-04T00:00", "s")
TIMES = T0 + np.arange(9) * np.timedelta64(3, "h")
LON = np.arange(-1.0, 3.01, 0.5)
LAT = np.arange(49.0, 52.01, 0.5)
M = 5


def _member(m):
    t, y, x = np.meshgrid(np.arange(TIMES.size), LAT, LON, indexing="ij")
    return {"hs": 0.8 + 0.9 * m + 0.1 * (x + 1) + 0.05 * t, "tp": 6.0 + 0.5 * m + 0 * x, "dir": 220.0 + 10 * m + 0 * x}


@pytest.fixture(scope="module")
def files(tmp_path_factory):
    d = tmp_path_factory.mktemp("ensalg")
    ens = write_grib2(str(d / "ens.grb2"), LON, LAT, TIMES, {k: np.stack([_member(m)[k] for m in range(M)])
                                                            for k in ("hs", "tp", "dir")}, members=range(M))
    singles = [write_grib2(str(d / f"m{m}.grb2"), LON, LAT, TIMES, _member(m)) for m in range(M)]
    full = {HS: _member(1)["hs"], TP: _member(1)["tp"], DIR: _member(1)["dir"]}
    whole = write_cf_netcdf(str(d / "whole.nc"), LON, LAT, TIMES, full)
    steps = [write_cf_netcdf(str(d / f"step{i}.nc"), LON, LAT, TIMES[i:i + 1], {k: v[i:i + 1] for k, v in full.items()})
             for i in range(TIMES.size)]
    route = d / "route.geojson"
    route.write_text(json.dumps({"type": "FeatureCollection", "features": [{"type": "Feature", "properties": {
        "name": "trial"}, "geometry": {"type": "LineString", "coordinates": [[-0.5, 49.5], [2.5, 51.5]]}}]}))
    return dict(ens=ens, singles=singles, whole=whole, steps=steps, route=str(route), dir=d)


def _route(files, sea, tag, **over):
    import processing

    d = files["dir"]
    p = {"ROUTE": files["route"], "SEA_STATE": sea, "DEPARTURE": "2031-05-04T00:00:00Z", "SPEED_KN": 10.0,
         "VESSEL": "coastal_survey_35m", "SPACING_NM": 5.0, "OUTPUT_POINTS": str(d / f"{tag}.gpkg"),
         "OUTPUT_SEGMENTS": str(d / f"{tag}_seg.gpkg"), "OUTPUT_REPORT": str(d / f"{tag}.html")}
    p.update(over)
    out = processing.run("seawaycomfort:routecomfort", p)
    from qgis.core import QgsVectorLayer

    layer = QgsVectorLayer(out["OUTPUT_POINTS"], "x", "ogr")
    assert layer.isValid()
    feats = list(layer.getFeatures())
    text = ("comfort_label", "class_reason", "flags", "leg_name", "source", "eta_utc", "fid")
    return {name: np.array([np.nan if f[name] is None or f[name] == qgis.core.NULL else f[name] for f in feats],
                           dtype=object if name in text else float)
            for name in layer.fields().names()}, out


def test_routecomfort_ensemble_against_single_member_runs(seaway_provider, files):
    ens, out = _route(files, [files["ens"]], "ens")
    singles = [_route(files, [p], f"s{m}")[0] for m, p in enumerate(files["singles"])]
    msi = np.stack([s["msi_pct"] for s in singles])
    cls = np.stack([s["comfort_class"] for s in singles])
    assert np.all(ens["members"] == M), (ens["members"], ens["hs_m"], ens["flags"])
    np.testing.assert_allclose(ens["msi_p10_pct"], np.percentile(msi, 10, axis=0), rtol=1e-9)
    np.testing.assert_allclose(ens["msi_p50_pct"], np.percentile(msi, 50, axis=0), rtol=1e-9)
    np.testing.assert_allclose(ens["msi_p90_pct"], np.percentile(msi, 90, axis=0), rtol=1e-9)
    np.testing.assert_allclose(ens["prob_taxing_pct"], 100.0 * (cls >= 3).sum(axis=0) / M)
    crit = np.stack([np.array(["CRITERIA" in str(f) for f in s["flags"]]) for s in singles])
    np.testing.assert_allclose(ens["prob_criteria_pct"], 100.0 * crit.sum(axis=0) / M)
    np.testing.assert_allclose(ens["msi_pct"], np.median(msi, axis=0), rtol=1e-12)  # M odd: the median member
    np.testing.assert_allclose(ens["hs_m"], np.median(np.stack([s["hs_m"] for s in singles]), axis=0), rtol=1e-12)
    assert 0 < np.nanmax(ens["prob_taxing_pct"]) and np.nanmin(ens["prob_taxing_pct"]) < 100
    html = open(out["OUTPUT_REPORT"], encoding="utf-8").read()
    assert f"Ensemble: {M} members" in html


def test_split_per_step_gives_the_single_file_numbers(seaway_provider, files):
    whole, _ = _route(files, [files["whole"]], "whole")
    split, _ = _route(files, files["steps"][::-1], "split")
    for k in ("hs_m", "tp_s", "msi_pct", "vacc_rms_m_s2", "msdv_cum"):
        np.testing.assert_array_equal(whole[k], split[k])


def test_describe_lists_members(seaway_provider, files, tmp_path):
    import processing

    out = processing.run("seawaycomfort:describeseastate", {"INPUT": files["ens"], "OUTPUT_REPORT": str(tmp_path / "d.html")})
    html = open(out["OUTPUT_REPORT"], encoding="utf-8").read()
    assert "5 ensemble members: 0..4; control 0; perturbed 1..4" in html


def test_sweep_lowest_prob_taxing(seaway_provider, files, tmp_path):
    import processing

    from seaway_comfort.processing.core.sweep.engine import CRITERIA

    out = processing.run("seawaycomfort:departuresweep", {
        "ROUTE": files["route"], "SEA_STATE": [files["ens"]], "DEPART_FROM": "2031-05-04T00:00:00Z",
        "DEPART_TO": "2031-05-04T03:00:00Z", "DEPART_STEP_H": 3.0, "SPEED_KN": 10.0, "VESSEL": "coastal_survey_35m",
        "SPACING_NM": 5.0, "CRITERION": CRITERIA.index("lowest_prob_taxing"),
        "OUTPUT_TABLE": str(tmp_path / "t.gpkg"), "OUTPUT_REPORT": str(tmp_path / "s.html")})
    html = open(out["OUTPUT_REPORT"], encoding="utf-8").read()
    assert "Probability of a taxing passage" in html
