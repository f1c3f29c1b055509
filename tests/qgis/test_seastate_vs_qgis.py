# SPDX-License-Identifier: GPL-2.0-or-later
"""Our sampler against QGIS's own ``native:rastersampling`` (reference implementation) at cell centres.

At a cell centre and at a forecast step, bilinear-in-space and linear-in-time sampling must return
the stored cell value, which is what QGIS's raster sampling algorithm reads for each band.
"""
from __future__ import annotations

import numpy as np
import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")

from seaway_comfort.processing.core.seastate import open_sea_state  # noqa: E402
from seaway_comfort.processing.core.demo.writers import write_cf_netcdf, write_geotiff_stack  # noqa: E402

T0 = np.datetime64("2030-05-01T00:00:00", "s")
TIMES = T0 + np.arange(3) * np.timedelta64(3, "h")
LON = np.round(np.arange(-8.0, -3.99, 0.25), 6)
LAT = np.round(np.arange(48.0, 45.99, -0.25), 6)


def _field():
    rng = np.random.default_rng(11)
    return rng.uniform(0.3, 5.0, (TIMES.size, LAT.size, LON.size)).astype(np.float32).astype(float)


def _points_layer(lons, lats):
    from qgis.core import QgsFeature, QgsGeometry, QgsPointXY, QgsVectorLayer

    layer = QgsVectorLayer("Point?crs=EPSG:4326", "pts", "memory")
    feats = []
    for x, y in zip(lons, lats):
        f = QgsFeature()
        f.setGeometry(QgsGeometry.fromPointXY(QgsPointXY(float(x), float(y))))
        feats.append(f)
    assert layer.dataProvider().addFeatures(feats)[0]
    return layer


def _qgis_sample(raster_uri, lons, lats, nbands):
    import processing
    from qgis.core import QgsRasterLayer

    raster = QgsRasterLayer(raster_uri, "r", "gdal")
    assert raster.isValid(), raster_uri
    res = processing.run("native:rastersampling", {
        "INPUT": _points_layer(lons, lats), "RASTERCOPY": raster, "COLUMN_PREFIX": "S_",
        "OUTPUT": "TEMPORARY_OUTPUT"})
    out = res["OUTPUT"]
    names = [f.name() for f in out.fields()]
    cols = [n for n in names if n.startswith("S_")]
    assert len(cols) == nbands, names
    vals = np.array([[f[c] for c in cols] for f in out.getFeatures()], dtype=float)
    return vals


def _centres():
    rng = np.random.default_rng(5)
    i = rng.integers(0, LON.size, 40)
    j = rng.integers(0, LAT.size, 40)
    return LON[i], LAT[j]


def _compare(src, uri):
    lons, lats = _centres()
    ref = _qgis_sample(uri, lons, lats, TIMES.size)
    assert np.isfinite(ref).all() and np.ptp(ref) > 1.0  # real, varying values to compare
    for k, t in enumerate(TIMES):
        r = src.sample(lons, lats, np.full(lons.size, t))
        np.testing.assert_allclose(r.hs_m, ref[:, k], rtol=0, atol=1e-6)


def test_geotiff_band_values_equal_qgis(qgis_app, qgis_processing, tmp_path):  # noqa: ARG001
    data = _field()
    hs = write_geotiff_stack(str(tmp_path / "hs.tif"), LON, LAT, TIMES, data, variable="hs")
    tp = write_geotiff_stack(str(tmp_path / "tp.tif"), LON, LAT, TIMES, 0 * data + 8.0, variable="tp")
    di = write_geotiff_stack(str(tmp_path / "dir.tif"), LON, LAT, TIMES, 0 * data + 90.0, variable="dir")
    _compare(open_sea_state([hs, tp, di]), hs)


def test_netcdf_band_values_equal_qgis(qgis_app, qgis_processing, tmp_path):  # noqa: ARG001
    data = _field()
    p = write_cf_netcdf(str(tmp_path / "f.nc"), LON, LAT[::-1], TIMES, {
        "sea_surface_wave_significant_height": data[:, ::-1, :],   # written south-to-north
        "sea_surface_wave_period_at_variance_spectral_density_maximum": 0 * data + 8.0,
        "sea_surface_wave_from_direction": 0 * data + 90.0})
    _compare(open_sea_state(p), f'NETCDF:"{p}":hs')
