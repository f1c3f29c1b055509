# SPDX-License-Identifier: GPL-2.0-or-later
"""The test/demo writers, read back with GDAL itself (reference library), and their error paths.

References: CF Conventions 1.8 (standard_name, units, _FillValue, scale_factor/add_offset, time
units); WMO FM 92 GRIB2 Code table 4.2 (discipline 10 category 0: 3 = HTSGW, 10 = DIRPW,
34 = PWPER) as named by GDAL's GRIB driver.
"""
from __future__ import annotations

import numpy as np
import pytest
from osgeo import gdal

from seaway_comfort.processing.core.demo.writers import (
    write_bathymetry_geotiff,
    write_cf_netcdf,
    write_geotiff_stack,
    write_grib2,
)
from seaway_comfort.processing.core.validation import SeawayInputError

LON = np.arange(0.0, 10.01, 2.0)
LAT = np.arange(40.0, 50.01, 2.0)
TIMES = np.datetime64("2030-01-01T00", "s") + np.arange(2) * np.timedelta64(6, "h")
SHAPE = (2, LAT.size, LON.size)


def test_netcdf_attributes_as_cf(tmp_path):
    data = np.full(SHAPE, 1.25)
    data[0, 0, 0] = np.nan
    p = write_cf_netcdf(str(tmp_path / "a.nc"), LON, LAT, TIMES, {"sea_surface_wave_significant_height": data},
                        scale_factor=0.01, add_offset=0.5)
    ds = gdal.Open(f'NETCDF:"{p}":hs')
    md = ds.GetMetadata()
    assert md["hs#standard_name"] == "sea_surface_wave_significant_height"
    assert md["hs#units"] == "m" and md["time#units"].startswith("hours since 1970-01-01")
    b = ds.GetRasterBand(1)
    assert (b.GetScale(), b.GetOffset()) == (0.01, 0.5) and b.DataType == gdal.GDT_Int16
    raw = b.ReadAsArray()
    assert (raw == b.GetNoDataValue()).sum() == 1          # the NaN became _FillValue
    assert np.allclose(raw[raw != b.GetNoDataValue()] * 0.01 + 0.5, 1.25)
    assert ds.GetProjection() and "4326" in ds.GetProjection()


def test_grib_elements_and_times(tmp_path):
    ones = np.ones(SHAPE)
    p = write_grib2(str(tmp_path / "a.grb2"), LON, LAT, TIMES, {"hs": 2 * ones, "dir": 90 * ones, "tp": 9 * ones})
    ds = gdal.Open(p)
    md = [ds.GetRasterBand(i + 1).GetMetadata() for i in range(ds.RasterCount)]
    assert [m["GRIB_ELEMENT"] for m in md] == ["HTSGW", "HTSGW", "DIRPW", "DIRPW", "PWPER", "PWPER"]
    want = (TIMES.astype(np.int64)).tolist() * 3
    assert [int(m["GRIB_VALID_TIME"].split()[0]) for m in md] == want
    assert ds.GetRasterBand(1).ReadAsArray() == pytest.approx(np.full((LAT.size, LON.size), 2.0), abs=0.01)


def test_geotiff_stack_descriptions_and_bathymetry(tmp_path):
    p = write_geotiff_stack(str(tmp_path / "s.tif"), LON, LAT, TIMES, np.ones(SHAPE), variable="tp", units="s")
    ds = gdal.Open(p)
    assert [ds.GetRasterBand(i + 1).GetDescription() for i in range(2)] == ["2030-01-01T00:00:00Z",
                                                                          "2030-01-01T06:00:00Z"]
    assert ds.GetMetadataItem("standard_name") == "sea_surface_wave_period_at_variance_spectral_density_maximum"
    b = write_bathymetry_geotiff(str(tmp_path / "b.tif"), LON, LAT, np.ones(SHAPE[1:]),
                                 convention="elevation_positive_up", write_positive=True)
    assert gdal.Open(b).GetMetadataItem("positive") == "up"


def test_writer_errors(tmp_path):
    with pytest.raises(SeawayInputError, match="cannot create NetCDF file"):
        write_cf_netcdf(str(tmp_path / "no" / "dir" / "a.nc"), LON, LAT, TIMES, {"x": np.ones(SHAPE)})
    with pytest.raises(SeawayInputError, match="cannot write GeoTIFF"):
        write_geotiff_stack(str(tmp_path / "no" / "a.tif"), LON, LAT, TIMES, np.ones(SHAPE), variable="hs")
    with pytest.raises(SeawayInputError, match="not a CRS"):
        write_geotiff_stack(str(tmp_path / "c.tif"), LON, LAT, TIMES, np.ones(SHAPE), variable="hs",
                            crs="EPSG:99999999")
    with pytest.raises(SeawayInputError, match="regularly spaced"):
        write_cf_netcdf(str(tmp_path / "i.nc"), [0.0, 1.0, 3.0], LAT, TIMES, {"x": np.ones((2, LAT.size, 3))})
    with pytest.raises(SeawayInputError, match=r"step 0 has shape"):
        write_cf_netcdf(str(tmp_path / "s.nc"), LON, LAT, TIMES, {"x": np.ones((2, 3, 3))})
    with pytest.raises(SeawayInputError, match="no GRIB2 code"):
        write_grib2(str(tmp_path / "g.grb2"), LON, LAT, TIMES, {"swell4_hs": np.ones(SHAPE)})
    with pytest.raises(SeawayInputError, match="unknown canonical"):
        write_geotiff_stack(str(tmp_path / "u.tif"), LON, LAT, TIMES, np.ones(SHAPE), variable="wave_height")
