# SPDX-License-Identifier: GPL-2.0-or-later
"""Ensemble members and several-files-one-source grouping, with files written by GDAL.

References outside the project: GDAL 3.6 writes the files (netCDF multidimensional API, GRIB
driver with product definition template 4.1) and its reader reports the member coordinates and
template values; WMO FM 92 GRIB2 template 4.1 octet order (type of ensemble forecast, then the
perturbation number, then the ensemble size, after the 15 groups of template 4.0; from memory,
confirmed by GDAL's GRIB_PDS_TEMPLATE_NUMBERS of the written messages); CF Conventions 1.8
standard name "realization" for the member axis. Sea values in the files are invented.
"""
from __future__ import annotations

import numpy as np
import pytest

from seaway_comfort.processing.core.demo.writers import write_cf_netcdf, write_grib2
from seaway_comfort.processing.core.seastate import describe_file, open_sea_state
from seaway_comfort.processing.core.seastate.grouping import group_forecast_files, open_grouped_sources
from seaway_comfort.processing.core.seastate.members import grib_member, is_member_dimension
from seaway_comfort.processing.core.validation import SeawayInputError

HS = "sea_surface_wave_significant_height"
TP = "sea_surface_wave_period_at_variance_spectral_density_maximum"
DIR = "sea_surface_wave_from_direction"
LON = np.arange(0.0, 6.0)
LAT = np.arange(50.0, 55.0)
TIMES = np.array(["2031-05-04T00", "2031-05-04T06", "2031-05-04T12"], dtype="datetime64[s]")
M = 5


def _fields(m: int) -> dict:
    """Invented member m: Hs 1 + 0.5 m + 0.1 lon + 0.2 step [m]; Tp 7 + 0.2 m [s]; from 250 + 10 m."""
    t, y, x = np.meshgrid(np.arange(TIMES.size), LAT, LON, indexing="ij")
    return {"hs": 1.0 + 0.5 * m + 0.1 * x + 0.2 * t, "tp": 7.0 + 0.2 * m + 0 * x, "dir": 250.0 + 10 * m + 0 * x}


def _ens(key: str) -> np.ndarray:
    return np.stack([_fields(m)[key] for m in range(M)])


@pytest.fixture(scope="module")
def ens_nc(tmp_path_factory):
    path = str(tmp_path_factory.mktemp("ens") / "ens.nc")
    return write_cf_netcdf(path, LON, LAT, TIMES, {HS: _ens("hs"), TP: _ens("tp"), DIR: _ens("dir")},
                           members=range(M))


@pytest.fixture(scope="module")
def ens_grib(tmp_path_factory):
    path = str(tmp_path_factory.mktemp("ensg") / "ens.grb2")
    return write_grib2(path, LON, LAT, TIMES, {k: _ens(k) for k in ("hs", "tp", "dir")}, members=range(M))


@pytest.mark.parametrize("fixture", ["ens_nc", "ens_grib"])
def test_members_read_back_as_written(request, fixture):
    """Each member samples the values GDAL wrote for it (cell centres, exact time steps).

    Tolerance: one step of GRIB2 simple packing with decimal scale factor 2 (0.01; WMO GRIB2
    template 5.0), plus rounding: GDAL 3.6 rounds to the nearest step, GDAL 3.10 was seen to
    land one step below (7.19 for 7.2)."""
    path = request.getfixturevalue(fixture)
    with open_sea_state(path) as src:
        assert src.members == tuple(range(M))
        for m in src.members:
            got = src.member_source(m).sample([2.0, 4.0], [52.0, 51.0], ["2031-05-04T06", "2031-05-04T12"])
            f = _fields(m)
            np.testing.assert_allclose(got.hs_m, [f["hs"][1, 2, 2], f["hs"][2, 1, 4]], atol=0.0101)
            np.testing.assert_allclose(got.tp_s, f["tp"][0, 0, 0], atol=0.0101)
            np.testing.assert_allclose(got.wave_from_deg, f["dir"][0, 0, 0], atol=0.0101)


def test_describe_lists_members(ens_nc, ens_grib):
    inv = describe_file(ens_nc)
    assert inv.members == tuple(range(M))
    assert "5 ensemble members: 0..4" in inv.as_text()
    g = describe_file(ens_grib)
    assert g.members == tuple(range(M))
    assert "control 0" in g.members_text and "perturbed 1..4" in g.members_text
    assert len(g.variables) == 3  # variables listed once (for the first member), not once per member


def test_grib_template_values_at_attribute_level(ens_grib):
    """GDAL reports PDTN 1 and the perturbation number at position 17 of the template values."""
    from osgeo import gdal

    ds = gdal.Open(ens_grib)
    md = ds.GetRasterBand(ds.RasterCount).GetMetadata()
    assert md["GRIB_PDS_PDTN"] == "1"
    vals = [int(v) for v in md["GRIB_PDS_TEMPLATE_ASSEMBLED_VALUES"].split()]
    assert grib_member(1, vals) == (M - 1, "perturbed")
    # a template 4.11 message (member over a time interval) carries the same three groups first
    t411 = [0, 3, 4, 0, 0, 0, 0, 1, 6, 1, 0, 0, 255, 0, 0, 1, 0, 51, 2031, 5, 4, 6, 0, 0, 1, 0]
    assert grib_member(11, t411) == (0, "control")
    assert grib_member(0, vals) is None  # template 4.0: deterministic


def test_member_dimension_by_name_or_standard_name():
    assert is_member_dimension("x9", {"x9#standard_name": "realization"})
    for name in ("number", "member", "realization", "ensemble", "Member"):
        assert is_member_dimension(name, {})
    assert not is_member_dimension("depth", {})


def _write_steps(folder, fields, steps, name):
    out = []
    for i in steps:
        out.append(write_cf_netcdf(str(folder / f"{name}_{i}.nc"), LON, LAT, TIMES[i:i + 1],
                                   {k: v[i:i + 1] for k, v in fields.items()}))
    return out


def test_split_per_step_joins_and_samples_like_the_single_file(tmp_path):
    f = _fields(1)
    fields = {HS: f["hs"], TP: f["tp"], DIR: f["dir"]}
    single = write_cf_netcdf(str(tmp_path / "single.nc"), LON, LAT, TIMES, fields)
    parts = _write_steps(tmp_path, fields, range(TIMES.size), "step")
    groups = group_forecast_files(parts[::-1])
    assert len(groups) == 1 and set(groups[0].paths) == set(parts)
    srcs, log = open_grouped_sources(parts)
    assert len(srcs) == 1 and "3 files joined" in log[0]
    lon, lat = np.linspace(0.3, 4.7, 9), np.linspace(50.2, 53.9, 9)
    t = TIMES[0] + np.linspace(0, 12 * 3600, 9).astype("timedelta64[s]")
    with open_sea_state(single) as one:
        a = one.sample(lon, lat, t)
    b = srcs[0].sample(lon, lat, t)
    for k in ("hs_m", "tp_s", "wave_from_deg"):
        np.testing.assert_array_equal(getattr(a, k), getattr(b, k))


def test_file_that_cannot_stand_alone_is_joined_and_logged(tmp_path):
    f = _fields(0)
    a = write_cf_netcdf(str(tmp_path / "height.nc"), LON, LAT, TIMES, {HS: f["hs"]})
    b = write_cf_netcdf(str(tmp_path / "period_dir.nc"), LON, LAT, TIMES, {TP: f["tp"], DIR: f["dir"]})
    srcs, log = open_grouped_sources([a, b])
    assert len(srcs) == 1 and set(srcs[0].variables) == {"hs", "tp", "dir"}
    assert a in log[0] and b in log[0] and "cannot stand alone" in log[0]


def test_named_source_still_lacking_a_variable_is_refused_naming_files(tmp_path):
    f = _fields(0)
    a = write_cf_netcdf(str(tmp_path / "h1.nc"), LON, LAT, TIMES, {HS: f["hs"]})
    b = write_cf_netcdf(str(tmp_path / "h2.nc"), LON, LAT, TIMES, {TP: f["tp"]})
    with pytest.raises(SeawayInputError, match="direction") as exc:
        open_grouped_sources([a, b], ["wavemodel", "wavemodel"])
    assert a in str(exc.value) and b in str(exc.value) and "wavemodel" in str(exc.value)
    with pytest.raises(SeawayInputError, match="together still lack") as exc:
        open_grouped_sources([a, b])
    assert a in str(exc.value) and b in str(exc.value)


def test_names_group_files_and_keep_separate_sources(tmp_path):
    f = _fields(0)
    full = {HS: f["hs"], TP: f["tp"], DIR: f["dir"]}
    a = write_cf_netcdf(str(tmp_path / "a.nc"), LON, LAT, TIMES, full)
    b = write_cf_netcdf(str(tmp_path / "b.nc"), LON, LAT, TIMES, full)
    groups = group_forecast_files([a, b])
    assert [g.paths for g in groups] == [(a,), (b,)]  # same times: two sources to compare
    groups = group_forecast_files([a, b, a], ["x", "y", "x"])
    assert [(g.name, g.paths) for g in groups] == [("x", (a, a)), ("y", (b,))]
    with pytest.raises(SeawayInputError, match="one name per file"):
        group_forecast_files([a, b], ["x"])
