# SPDX-License-Identifier: GPL-2.0-or-later
"""The invented demo scenario: its files read back with GDAL itself, and its route is usable.

References: GDAL (osgeo, reference library) reads the NetCDF (multidimensional API), GRIB2 and
GeoTIFF files; WMO Manual on Codes FM 92 GRIB2 Code table 4.2, discipline 10, category 0:
parameter 3 = significant height of combined wind waves and swell (GDAL element HTSGW);
GeoJSON structure and [lon, lat] order from RFC 7946 (s.3.3, s.3.1.1, s.3.1.4); the partition
sum Hs = sqrt(sum Hs_i^2) (DNV-RP-C205 2010 s.3.5; common practice).
"""
from __future__ import annotations

import json

import numpy as np
import pytest
from osgeo import gdal

from seaway_comfort.processing.core.demo import scenario as ds

gdal.UseExceptions()
HS_STD = "sea_surface_wave_significant_height"


@pytest.fixture(scope="module")
def scenario(tmp_path_factory):
    return ds.build_demo_scenario(str(tmp_path_factory.mktemp("demo")))


def _netcdf_by_standard_name(path):
    mds = gdal.OpenEx(path, gdal.OF_MULTIDIM_RASTER)
    rg = mds.GetRootGroup()
    out = {}
    for name in rg.GetMDArrayNames():
        arr = rg.OpenMDArray(name)
        attrs = {a.GetName(): a.Read() for a in arr.GetAttributes()}
        if "standard_name" in attrs:
            out[attrs["standard_name"]] = (name, arr)
    lat = rg.OpenMDArray("lat").ReadAsArray()
    return out, lat


def test_netcdf_holds_the_generated_fields(scenario):
    f = ds.demo_fields()
    by_std, lat = _netcdf_by_standard_name(scenario.netcdf_path)
    assert HS_STD in by_std
    _, arr = by_std[HS_STD]
    data = arr.ReadAsArray().astype(float)
    fill = arr.GetNoDataValueAsDouble()
    if fill is not None:
        data[data == fill] = np.nan
    if lat[0] > lat[-1]:
        data = data[:, ::-1, :]
    sea = np.isfinite(f.hs_m)
    np.testing.assert_allclose(data[sea], f.hs_m[sea], rtol=1e-6)  # float32 storage
    assert np.all(np.isnan(data[~sea]))  # the island is missing data, never zero
    assert (~sea).any()


def test_combined_height_is_the_partition_sum():
    f = ds.demo_fields()
    sea = np.isfinite(f.hs_m)
    # Hs = sqrt(Hs_wind^2 + Hs_swell^2), DNV-RP-C205 s.3.5 (common practice)
    np.testing.assert_allclose(f.hs_m[sea], np.hypot(f.wind_hs_m, f.swell_hs_m)[sea], rtol=1e-12)
    # the wind sea really passes: calm at the start, a peak of about 3 m later
    assert np.nanmax(f.wind_hs_m[0]) < 0.5 and np.nanmax(f.wind_hs_m) > 2.5


def test_grib_matches_netcdf_within_packing(scenario):
    f = ds.demo_fields()
    g = gdal.Open(scenario.grib_path)
    bands = [g.GetRasterBand(i + 1) for i in range(g.RasterCount)]
    hs = [b for b in bands if b.GetMetadataItem("GRIB_ELEMENT") == "HTSGW"]  # WMO 4.2 10/0/3
    assert len(hs) == f.times_utc.size
    first = hs[0].ReadAsArray().astype(float)
    gt = g.GetGeoTransform()
    if gt[5] < 0:  # north-up: first row is the northernmost latitude
        first = first[::-1, :]
    sea = np.isfinite(f.hs_m[0])
    # decimal scale factor 2 -> 0.01 m steps: half a step
    np.testing.assert_allclose(first[sea], f.hs_m[0][sea], atol=0.0051)


def test_bathymetry_geotiff(scenario):
    f = ds.demo_fields()
    t = gdal.Open(scenario.bathymetry_path)
    depth = t.GetRasterBand(1).ReadAsArray().astype(float)
    if t.GetGeoTransform()[5] < 0:
        depth = depth[::-1, :]
    land = ds.land_mask(f.lon_deg, f.lat_deg)
    assert np.all(depth[land] == 0.0)
    assert np.all(depth[~land] > 0.0) and depth.max() <= 2500.0
    gt = t.GetGeoTransform()
    assert gt[1] == pytest.approx(ds.GRID_STEP_DEG)
    assert gt[0] + gt[1] / 2 == pytest.approx(f.lon_deg[0])  # first cell centre


def test_route_geojson_is_usable(scenario):
    doc = json.load(open(scenario.route_path, encoding="utf-8"))
    assert doc["type"] == "FeatureCollection"  # RFC 7946 s.3.3
    f = ds.demo_fields()
    land = ds.land_mask(f.lon_deg, f.lat_deg)
    for feat in doc["features"]:
        assert feat["geometry"]["type"] == "LineString"
        coords = np.array(feat["geometry"]["coordinates"])
        lon, lat = coords[:, 0], coords[:, 1]  # RFC 7946 s.3.1.1: [longitude, latitude]
        assert np.all((lon > f.lon_deg[0]) & (lon < f.lon_deg[-1]))
        assert np.all((lat > f.lat_deg[0]) & (lat < f.lat_deg[-1]))
        ix = np.rint((lon - f.lon_deg[0]) / ds.GRID_STEP_DEG).astype(int)
        iy = np.rint((lat - f.lat_deg[0]) / ds.GRID_STEP_DEG).astype(int)
        assert not land[iy, ix].any(), feat["properties"]["name"]
        props = feat["properties"]
        dep = np.datetime64(props["depart_utc"].rstrip("Z"), "ms")
        assert scenario.forecast_start_utc <= dep < scenario.forecast_end_utc
        assert props["speed_kn"] > 0 and props["name"]


def test_rebuild_overwrites_cleanly(scenario):
    again = ds.build_demo_scenario(scenario.folder)
    assert gdal.Open(again.grib_path).RasterCount == 9 * ds.FORECAST_STEPS
