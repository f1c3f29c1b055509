# SPDX-License-Identifier: GPL-2.0-or-later
"""Grid geometry: geotransform inversion against GDAL, seam-split read windows, window-only reads.

References: GDAL Raster Data Model, affine geotransform; gdal.InvGeoTransform/ApplyGeoTransform
(reference library) for the inverse mapping, including rotated grids.
"""
from __future__ import annotations

import numpy as np
import pytest
from osgeo import gdal

from seaway_comfort.processing.core.seastate import open_sea_state
from seaway_comfort.processing.core.seastate.grid import (
    GridGeometry,
    great_circle_km,
    read_window_for,
)
from seaway_comfort.processing.core.demo.writers import write_cf_netcdf
from seaway_comfort.processing.core.validation import SeawayInputError


@pytest.mark.parametrize("gt", [
    (-10.0, 0.25, 0.0, 60.0, 0.0, -0.25),
    (100.0, 0.1, 0.02, 5.0, 0.01, -0.1),   # rotated / sheared
])
def test_centre_index_matches_gdal_inverse(gt):
    g = GridGeometry(40, 30, gt, is_geographic=True)
    rng = np.random.default_rng(3)
    px = rng.uniform(0, 40, 50)
    py = rng.uniform(0, 30, 50)
    xy = np.array([gdal.ApplyGeoTransform(list(gt), float(a), float(b)) for a, b in zip(px, py)])
    inv = gdal.InvGeoTransform(list(gt))
    back = np.array([gdal.ApplyGeoTransform(inv, float(x), float(y)) for x, y in xy])
    col_f, row_f, inside = g.centre_index(xy[:, 0], xy[:, 1])
    np.testing.assert_allclose(col_f, back[:, 0] - 0.5, atol=1e-9)  # centre index = pixel - 0.5
    np.testing.assert_allclose(row_f, back[:, 1] - 0.5, atol=1e-9)
    assert inside.all()


def test_degenerate_grid_rejected():
    # a geotransform with zero determinant has no inverse (linear algebra); interface: clear error
    with pytest.raises(SeawayInputError, match="degenerate"):
        GridGeometry(10, 10, (0.0, 0.0, 0.0, 0.0, 0.0, -1.0))


def test_window_split_at_seam():
    # design contract (no outside source): a window across the seam of a global ring is two strips
    g = GridGeometry(144, 49, (-1.25, 2.5, 0.0, 61.25, 0.0, -2.5))
    assert g.wraps
    w = read_window_for(g, np.array([0, 1, 142, 143]), np.array([10, 11, 10, 11]), 0, 0)
    assert w.col_runs == ((142, 2), (0, 2)) and w.ncols == 4
    assert w.local_col(np.array([142, 143, 0, 1]), 144).tolist() == [0, 1, 2, 3]
    w = read_window_for(g, np.array([10, 20]), np.array([5, 5]), 3, 1)
    assert w.col_runs == ((7, 17),) and (w.row0, w.nrows) == (4, 3)


def test_haversine_against_known_arc():
    # a quarter meridian on the sphere of radius R is pi R / 2 (geometry, no source needed beyond R)
    from seaway_comfort.processing.core.seastate.grid import EARTH_MEAN_RADIUS_KM
    d = great_circle_km(np.array([0.0]), np.array([0.0]), np.array([0.0]), np.array([90.0]))
    assert d[0] == pytest.approx(np.pi * EARTH_MEAN_RADIUS_KM / 2, rel=1e-12)


def test_only_window_and_bracketing_steps_are_read(tmp_path):
    # design contract (memory rule of the brief, no outside source): read only the window and the
    # two bracketing steps; byte count from the float32 sample size of the file GDAL wrote
    lon = np.arange(0.0, 360.0, 1.0)
    lat = np.arange(-80.0, 80.01, 1.0)
    times = np.datetime64("2024-01-01T00", "s") + np.arange(10) * np.timedelta64(3, "h")
    shape = (10, lat.size, lon.size)
    p = write_cf_netcdf(str(tmp_path / "g.nc"), lon, lat, times, {
        "sea_surface_wave_significant_height": np.full(shape, 2.0),
        "sea_surface_wave_period_at_variance_spectral_density_maximum": np.full(shape, 8.0),
        "sea_surface_wave_from_direction": np.full(shape, 10.0)})
    src = open_sea_state(p)
    # a short route across the 0/360 seam at 4 h: steps 1 and 2 only, a few columns each side
    r = src.sample([-1.5, 0.0, 1.5], [10.0, 10.5, 11.0], np.datetime64("2024-01-01T04", "s"), land_search_km=0.0)
    assert r.valid.all()
    full = 3 * np.prod(shape) * 4  # three float32 variables
    assert src.bytes_read < full / 1000
    assert src.bytes_read == 3 * 2 * (2 * 5) * 4  # 3 vars x 2 steps x (2 rows x 5 cols) x 4 bytes
