# SPDX-License-Identifier: GPL-2.0-or-later
"""Bathymetry in both sign conventions, automatic detection, land and no-data flags.

References: CF Conventions 1.8 s.4.3 (attribute positive = "up"/"down" for vertical coordinates);
bilinear weights on cell centres (Press et al., Numerical Recipes 3rd ed., s.3.6), exact for a
depth field linear in lon/lat.
"""
from __future__ import annotations

import numpy as np
import pytest

from seaway_comfort.processing.core.flags import SampleFlag
from seaway_comfort.processing.core.seastate import open_bathymetry
from seaway_comfort.processing.core.demo.writers import write_bathymetry_geotiff
from seaway_comfort.processing.core.validation import SeawayInputError

LON = np.round(np.arange(-5.0, 5.001, 0.5), 6)
LAT = np.round(np.arange(50.0, 45.0 - 0.001, -0.5), 6)


def depth_field():
    la, lo = np.meshgrid(LAT, LON, indexing="ij")
    d = 100.0 + 10.0 * (lo + 5.0) + 4.0 * (la - 45.0)   # 80..200 m
    d[(lo >= 3.0) & (la >= 48.0)] = -25.0                # a corner of land (negative depth = height)
    return d


@pytest.mark.parametrize("convention, sign", [("depth_positive_down", 1.0), ("elevation_positive_up", -1.0)])
@pytest.mark.parametrize("explicit", [True, False])
def test_both_conventions_same_depth(tmp_path, convention, sign, explicit):
    path = write_bathymetry_geotiff(str(tmp_path / f"b_{convention}.tif"), LON, LAT, sign * depth_field(),
                                    convention=convention, nodata=-99999.0)
    b = open_bathymetry(path, convention=convention if explicit else "auto")
    assert b.convention == convention
    if not explicit:  # mostly-sea raster: the sign of most values decides (documented heuristic)
        assert "negative" in b.convention_reason or ">= 0" in b.convention_reason
    lon = np.array([-2.3, 0.7, 4.0, 9.0])
    lat = np.array([46.1, 47.6, 49.0, 47.0])
    s = b.sample(lon, lat)
    want = 100.0 + 10.0 * (lon + 5.0) + 4.0 * (lat - 45.0)
    np.testing.assert_allclose(s.depth_m[:2], want[:2], atol=1e-4)
    assert s.flags[0] == 0 and s.flags[1] == 0
    assert s.flags[2] & SampleFlag.DEPTH_ON_LAND and np.isnan(s.depth_m[2])
    assert s.flags[3] & SampleFlag.DEPTH_ASSUMED_DEEP and np.isnan(s.depth_m[3])  # outside the raster


def test_positive_attribute_wins_over_values(tmp_path):
    # a mostly-land elevation raster would fool the value heuristic; CF 'positive' decides first
    la, lo = np.meshgrid(LAT, LON, indexing="ij")
    elev = np.where(lo < -3.0, -50.0, 30.0)  # mostly positive heights, sea only in the west
    path = write_bathymetry_geotiff(str(tmp_path / "land.tif"), LON, LAT, elev,
                                    convention="elevation_positive_up", write_positive=True)
    b = open_bathymetry(path)
    assert b.convention == "elevation_positive_up" and "positive='up'" in b.convention_reason
    s = b.sample([-4.5, 2.0], [47.0, 47.0])
    assert s.depth_m[0] == pytest.approx(50.0) and s.flags[0] == 0
    assert s.flags[1] & SampleFlag.DEPTH_ON_LAND


def test_nodata_and_coast(tmp_path):
    d = depth_field()
    d[4, 4] = np.nan
    path = write_bathymetry_geotiff(str(tmp_path / "nd.tif"), LON, LAT, d, convention="depth_positive_down",
                                    nodata=-32768.0)
    b = open_bathymetry(path)
    s = b.sample([LON[4], LON[4] + 0.3], [LAT[4], LAT[4]])
    assert np.isnan(s.depth_m[0]) and s.flags[0] & SampleFlag.DEPTH_ASSUMED_DEEP
    # 0.3 deg (0.6 cell) east of the no-data cell: the nearest cell (LON[4]+0.5) is sea, weights renormalised over it
    assert s.flags[1] == 0 and s.depth_m[1] == pytest.approx(d[4, 5], abs=1e-4)


def test_bad_input(tmp_path):
    # interface contract (no outside source): clear errors naming the input
    path = write_bathymetry_geotiff(str(tmp_path / "ok.tif"), LON, LAT, depth_field(), convention="depth_positive_down")
    with pytest.raises(SeawayInputError, match="convention"):
        open_bathymetry(path, convention="sideways")
    with pytest.raises(SeawayInputError, match="does not exist"):
        open_bathymetry(str(tmp_path / "none.tif"))
    bad = tmp_path / "bad.tif"
    bad.write_bytes(b"not a tiff")
    with pytest.raises(SeawayInputError, match="bad.tif"):
        open_bathymetry(str(bad))
    b = open_bathymetry(path)
    with pytest.raises(SeawayInputError, match="lat_deg"):
        b.sample([0.0], [91.0])
    with pytest.raises(SeawayInputError, match="lat_deg has 1 values but lon_deg has 2"):
        b.sample([0.0, 1.0], [45.0])
    with pytest.raises(SeawayInputError, match="convention"):
        write_bathymetry_geotiff(str(tmp_path / "x.tif"), LON, LAT, depth_field(), convention="up")


def test_many_samples_in_chunks(tmp_path):
    # more samples than one read chunk: every chunk's window must give the exact linear depth
    path = write_bathymetry_geotiff(str(tmp_path / "many.tif"), LON, LAT, depth_field(),
                                    convention="depth_positive_down")
    b = open_bathymetry(path)
    rng = np.random.default_rng(2)
    n = 3 * b.CHUNK + 17
    lon = rng.uniform(-5.0, 2.4, n)   # west of the land corner (lon >= 3 there)
    lat = rng.uniform(45.0, 50.0, n)
    s = b.sample(lon, lat)
    np.testing.assert_allclose(s.depth_m, 100.0 + 10.0 * (lon + 5.0) + 4.0 * (lat - 45.0), atol=1e-4)
    assert np.all(s.flags == 0)
