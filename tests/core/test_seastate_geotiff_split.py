# SPDX-License-Identifier: GPL-2.0-or-later
"""GeoTIFF stacks, projected grids, split files on different grids/time axes, land search.

References: pyproj (PROJ) transforms for the projected grid (reference library); geographiclib
Geodesic.WGS84.Inverse (Karney 2013, reference library) for the brute-force nearest sea cell;
bilinear interpolation on cell centres (Press et al., Numerical Recipes 3rd ed., s.3.6) - exact for
fields linear in the grid coordinates.
"""
from __future__ import annotations

import numpy as np
import pytest
from geographiclib.geodesic import Geodesic
from pyproj import Transformer

from seaway_comfort.processing.core.flags import SampleFlag
from seaway_comfort.processing.core.seastate import open_sea_state
from seaway_comfort.processing.core.demo.writers import (
    write_cf_netcdf,
    write_geotiff_stack,
    write_grib2,
)
from seaway_comfort.processing.core.validation import SeawayInputError

T0 = np.datetime64("2025-02-01T00:00:00", "s")


def _at(hours):
    return T0 + np.rint(np.asarray(hours, dtype=float) * 3600).astype("timedelta64[s]")


def test_stack_with_band_times_and_standard_name(tmp_path):
    # band descriptions as ISO 8601 UTC times; field linear in lon/lat/time: exact under bilinear +
    # linear-in-time interpolation (Numerical Recipes s.3.6)
    lon = np.arange(-10.0, 10.01, 1.0)
    lat = np.arange(50.0, 40.0 - 0.01, -1.0)
    times = _at([0, 6])
    h, la, lo = np.meshgrid([0.0, 6.0], lat, lon, indexing="ij")
    p_hs = write_geotiff_stack(str(tmp_path / "h.tif"), lon, lat, times, 1.0 + 0.1 * lo + 0.05 * la + 0.1 * h,
                               variable="hs", units="m")
    p_tp = write_geotiff_stack(str(tmp_path / "t.tif"), lon, lat, times, 8.0 + 0.0 * h, variable="tp", units="s")
    p_dr = write_geotiff_stack(str(tmp_path / "d.tif"), lon, lat, times, 135.0 + 0.0 * h, variable="dir",
                               units="degree")
    src = open_sea_state([p_hs, p_tp, p_dr])
    assert src.name == "h"
    r = src.sample([-3.3, 4.6], [45.5, 41.2], _at([1.5, 4.0]))
    want = 1.0 + 0.1 * np.array([-3.3, 4.6]) + 0.05 * np.array([45.5, 41.2]) + 0.1 * np.array([1.5, 4.0])
    np.testing.assert_allclose(r.hs_m, want, atol=1e-5)
    inv = {v.canonical: v for v in src.inventory().variables}
    assert "standard_name sea_surface_wave_significant_height" in inv["hs"].recognised_by


def test_stack_with_times_list_and_variable_map(tmp_path):
    # interface contract (no outside source): times_utc list and variable_map by file name/stem
    lon = np.arange(0.0, 5.01, 0.5)
    lat = np.arange(5.0, -0.01, -0.5)
    times = _at([0, 3, 6])
    shape = (3, lat.size, lon.size)
    a = write_geotiff_stack(str(tmp_path / "sig_height.tif"), lon, lat, None, np.full(shape, 1.0), variable="hs",
                            write_times=False)
    b = write_geotiff_stack(str(tmp_path / "peak.tif"), lon, lat, None, np.full(shape, 7.0), variable="tp",
                            write_times=False)
    c = write_geotiff_stack(str(tmp_path / "wdir.tif"), lon, lat, None, np.full(shape, 10.0), variable="dir",
                            write_times=False)
    with pytest.raises(SeawayInputError, match=r"sig_height.tif.*no time information.*times_utc"):
        open_sea_state([a, b, c])
    with pytest.raises(SeawayInputError, match="times_utc has 2 entries but the file has 3 bands"):
        open_sea_state([a, b, c], times_utc=times[:2])
    vm = {"hs": "sig_height", "tp": "peak.tif", "dir": "wdir"}
    src = open_sea_state([a, b, c], times_utc=times, variable_map=vm)
    r = src.sample([2.0], [2.0], _at([4.5]))
    assert (r.hs_m[0], r.tp_s[0], r.wave_from_deg[0]) == pytest.approx((1.0, 7.0, 10.0), abs=1e-6)
    # a raster nobody names: clear error with a hint
    other = write_geotiff_stack(str(tmp_path / "mystery.tif"), lon, lat, None, np.full(shape, 1.0),
                                variable="hs", write_times=False)
    from osgeo import gdal
    ds = gdal.Open(other, gdal.GA_Update)
    ds.SetMetadata({})
    del ds
    with pytest.raises(SeawayInputError, match=r"mystery.tif.*variable_map"):
        open_sea_state([other], times_utc=times)


def test_projected_grid_via_pyproj(tmp_path):
    # UTM zone 32N grid (EPSG:32632), field linear in x and y: the expected value uses pyproj's own
    # transform of the sample lon/lat (reference library)
    x = np.arange(400000.0, 520001.0, 10000.0)
    y = np.arange(6300000.0, 6200000.0 - 1, -10000.0)
    h, yy, xx = np.meshgrid([0.0, 6.0], y, x, indexing="ij")
    field = 1.0 + (xx - 400000.0) / 1e5 + (yy - 6200000.0) / 2e5
    times = _at([0, 6])
    p = write_geotiff_stack(str(tmp_path / "utm_hs.tif"), x, y, times, field, variable="hs", crs="EPSG:32632")
    q = write_geotiff_stack(str(tmp_path / "utm_tp.tif"), x, y, times, 9.0 + 0 * field, variable="tp",
                            crs="EPSG:32632")
    d = write_geotiff_stack(str(tmp_path / "utm_dir.tif"), x, y, times, 90.0 + 0 * field, variable="dir",
                            crs="EPSG:32632")
    src = open_sea_state([p, q, d])
    inv = src.inventory().variables[0]
    assert inv.grid.lon_convention == "projected" and "32632" in inv.grid.crs
    lon = np.array([8.0, 9.2, 7.5])
    lat = np.array([56.2, 56.5, 55.0])
    tr = Transformer.from_crs("EPSG:4326", "EPSG:32632", always_xy=True)
    ex, ey = tr.transform(lon, lat)
    r = src.sample(lon, lat, _at([3, 3, 3]))
    inside = (ex > 400000) & (ex < 520000) & (ey > 6200000) & (ey < 6300000)
    assert inside.tolist() == [True, True, False]
    want = 1.0 + (ex - 400000.0) / 1e5 + (ey - 6200000.0) / 2e5
    np.testing.assert_allclose(r.hs_m[inside], want[inside], atol=1e-5)
    assert r.flags[2] & SampleFlag.OUTSIDE_GRID


def test_split_files_different_grids_and_time_axes(tmp_path):
    # heights in a NetCDF (1 deg, 3-hourly); periods and directions in GRIB2 (0.5 deg, 6-hourly, other extent)
    lon1 = np.arange(-20.0, 20.01, 1.0)
    lat1 = np.arange(30.0, 60.01, 1.0)
    t1 = _at([0, 3, 6, 9, 12])
    h1, la1, lo1 = np.meshgrid([0, 3, 6, 9, 12.0], lat1, lon1, indexing="ij")
    nc = write_cf_netcdf(str(tmp_path / "heights.nc"), lon1, lat1, t1,
                         {"sea_surface_wave_significant_height": 2.0 + 0.02 * lo1 + 0.01 * la1 + 0.05 * h1})
    lon2 = np.arange(-10.0, 10.01, 0.5)
    lat2 = np.arange(55.0, 35.0 - 0.01, -0.5)
    t2 = _at([0, 6, 12])
    h2, la2, lo2 = np.meshgrid([0, 6, 12.0], lat2, lon2, indexing="ij")
    grb = write_grib2(str(tmp_path / "periods.grb2"), lon2, lat2, t2,
                      {"tp": 10.0 + 0.1 * lo2 + 0.1 * h2, "dir": 180.0 + 2.0 * la2 - 80.0})
    src = open_sea_state([nc, grb])
    inv = {v.canonical: v for v in src.inventory().variables}
    assert inv["hs"].grid.resolution == (1.0, 1.0) and inv["tp"].grid.resolution == (0.5, 0.5)
    assert inv["hs"].time_count == 5 and inv["tp"].time_count == 3
    lon = np.array([-5.3, 3.7, 15.0])
    lat = np.array([45.2, 50.9, 45.0])
    hr = np.array([4.5, 7.5, 1.0])
    r = src.sample(lon, lat, _at(hr))
    np.testing.assert_allclose(r.hs_m[:2], 2.0 + 0.02 * lon[:2] + 0.01 * lat[:2] + 0.05 * hr[:2], atol=1e-5)
    np.testing.assert_allclose(r.tp_s[:2], 10.0 + 0.1 * lon[:2] + 0.1 * hr[:2], atol=0.01 + 1e-9)  # GRIB 0.01 step
    np.testing.assert_allclose(r.wave_from_deg[:2], 100.0 + 2.0 * lat[:2], atol=0.01 + 1e-9)
    # lon 15 is inside the height grid but outside the period grid: not valid, flagged outside grid
    assert r.partition_names == () and r.partition_hs_m.shape == (3, 0)
    assert not r.valid[2] and r.flags[2] & SampleFlag.OUTSIDE_GRID and np.isnan(r.hs_m[2])


def test_land_mask_nearest_sea(tmp_path):
    # 0.1 deg grid, a 7 x 7 cell island (no data); expected nearest sea cell by brute force with
    # geographiclib's WGS 84 geodesic distance (reference library)
    lon = np.round(np.arange(10.0, 12.001, 0.1), 6)
    lat = np.round(np.arange(44.0, 42.0 - 0.001, -0.1), 6)
    la, lo = np.meshgrid(lat, lon, indexing="ij")
    field = 1.0 + 2.0 * (lo - 10.0) + 0.5 * (la - 42.0)
    land = (np.abs(lo - 11.0) < 0.35) & (np.abs(la - 43.0) < 0.35)
    field = np.where(land, np.nan, field)
    stack = np.stack([field, field + 0.3])
    times = _at([0, 6])
    p = write_geotiff_stack(str(tmp_path / "isl_hs.tif"), lon, lat, times, stack, variable="hs")
    q = write_geotiff_stack(str(tmp_path / "isl_tp.tif"), lon, lat, times, 0 * stack + 8.0, variable="tp")
    d = write_geotiff_stack(str(tmp_path / "isl_dir.tif"), lon, lat, times, 0 * stack + 45.0, variable="dir")
    src = open_sea_state([p, q, d])
    pts_lon = np.array([11.27, 11.0, 10.5])
    pts_lat = np.array([43.02, 43.0, 43.0])
    r = src.sample(pts_lon, pts_lat, _at([3, 3, 3]), land_search_km=15.0)
    # point 0: 0.02 deg inside the island's east edge -> nearest sea cell
    sea = ~land
    g = Geodesic.WGS84
    dist = np.array([[g.Inverse(pts_lat[0], pts_lon[0], a, b)["s12"] for b in lon] for a in lat])
    dist[~sea] = np.inf
    j = np.unravel_index(np.argmin(dist), dist.shape)
    assert dist[j] < 15000.0
    assert r.flags[0] & SampleFlag.LAND_ADJUSTED and r.valid[0]
    assert r.hs_m[0] == pytest.approx(field[j] + 0.15, abs=1e-5)  # time-interpolated at 3 h of 0..6 h
    # point 1: island centre, nearest sea 0.4 deg (~33-44 km) away: beyond 15 km -> NaN + NO_SEA_DATA
    assert r.flags[1] & SampleFlag.NO_SEA_DATA and np.isnan(r.hs_m[1]) and not r.valid[1]
    # point 2: open sea, ordinary interpolation
    assert r.flags[2] == 0 and r.hs_m[2] == pytest.approx(1.0 + 1.0 + 0.5 + 0.15, abs=1e-5)
    # with land_search_km=0 the island point is not moved
    r0 = src.sample(pts_lon, pts_lat, _at([3, 3, 3]), land_search_km=0.0)
    assert r0.flags[0] & SampleFlag.NO_SEA_DATA and np.isnan(r0.hs_m[0])
