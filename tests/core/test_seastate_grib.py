# SPDX-License-Identifier: GPL-2.0-or-later
"""GRIB2 ingest: parameter identification, partitions, valid times, multi-file merging.

References: WMO Manual on Codes FM 92 GRIB2, Code table 4.2 (discipline 10, category 0) and Code
table 4.5 (241 = ordered sequence); GDAL's GRIB driver (reference library) decodes what the
writer encoded; Hs_total = sqrt(sum Hs_i^2) (variances add, DNV-RP-C205 2010 s.3.5.1 definition
Hs = 4 sqrt(m0)); "most energetic partition" for Tp/direction is common practice, no source.
Simple packing with DECIMAL_SCALE_FACTOR=2 keeps 0.01 steps: tolerance one step (seen here: truncation).
"""
from __future__ import annotations

import numpy as np
import pytest
from osgeo import gdal

from seaway_comfort.processing.core.flags import SampleFlag
from seaway_comfort.processing.core.seastate import describe_file, open_sea_state
from seaway_comfort.processing.core.seastate.grib import identify_band
from seaway_comfort.processing.core.demo.writers import write_grib2
from seaway_comfort.processing.core.validation import SeawayInputError

LON = np.arange(0.0, 360.0, 5.0)     # 0..355, GDAL re-wraps to -180..175 on read
LAT = np.arange(60.0, -60.01, -5.0)  # north to south
T0 = np.datetime64("2024-06-10T00:00:00", "s")
TIMES = T0 + np.arange(3) * np.timedelta64(6, "h")
HOURS = np.array([0.0, 6.0, 12.0])
PACK = 0.01 + 1e-6  # one 0.01 packing step (+ float32 rounding): GDAL 3.6 was seen to truncate (2.1 read back as 2.09)


def _grid():
    return np.meshgrid(HOURS, LAT, LON, indexing="ij")


def partitions_only():
    h, la, lo = _grid()
    one = np.ones(h.shape)
    return {
        "wind_hs": 0.5 + 0.05 * (la + 60.0), "wind_tp": 5.0 * one, "wind_dir": 270.0 * one,
        "swell1_hs": 1.5 + 0.1 * h, "swell1_tp": 12.0 * one, "swell1_dir": 300.0 * one,
        "swell2_hs": 1.0 * one, "swell2_tp": 15.0 * one, "swell2_dir": 200.0 * one,
    }


@pytest.fixture()
def grib_parts(tmp_path):
    return write_grib2(str(tmp_path / "parts.grb2"), LON, LAT, TIMES, partitions_only())


def _at(hours):
    return T0 + np.rint(np.asarray(hours, dtype=float) * 3600).astype("timedelta64[s]")


def test_identification_by_parameter_number(grib_parts):
    # each band's (category, number) -> WMO Code table 4.2 name; level 241 value k -> k-th swell
    ds = gdal.Open(grib_parts)
    seen = set()
    for b in range(1, ds.RasterCount + 1):
        md = ds.GetRasterBand(b).GetMetadata()
        param, ltype, lval = identify_band(md)
        assert param is not None
        # GDAL's own decoding of the same message (reference library) names the same parameter
        assert md["GRIB_COMMENT"].lower().startswith(param.name.lower()), md["GRIB_COMMENT"]
        seen.add((param.number, ltype, lval))
    # WMO 4.2: 4/5/35 wind-wave direction/height/peak period; 7/8/9 swell direction/height/period
    assert {(5, 1, 0.0), (35, 1, 0.0), (4, 1, 0.0), (8, 241, 1.0), (8, 241, 2.0), (9, 241, 2.0),
            (7, 241, 1.0)} <= seen


def test_partitions_only_give_combined_sea(grib_parts):
    src = open_sea_state(grib_parts)
    assert src.partitions == ("wind", "swell1", "swell2")
    lat = np.array([-55.0, 40.0, -50.0])
    lon = np.array([-170.0, 100.0, 190.0])  # 190 = -170 after GDAL's re-wrap: either convention works
    hours = np.array([3.0, 6.0, 9.0])
    r = src.sample(lon, lat, _at(hours))
    wind = 0.5 + 0.05 * (lat + 60.0)
    sw1 = 1.5 + 0.1 * hours
    np.testing.assert_allclose(r.partition_hs_m[:, 0], wind, atol=PACK)
    np.testing.assert_allclose(r.partition_hs_m[:, 1], sw1, atol=PACK)
    np.testing.assert_allclose(r.hs_m, np.sqrt(wind**2 + sw1**2 + 1.0), atol=2 * PACK)
    # dominant partition (largest Hs_i): swell1, wind, swell1 at these three samples
    dominant = np.argmax(np.column_stack([wind, sw1, np.ones(3)]), axis=1)
    assert dominant.tolist() == [1, 0, 1]
    np.testing.assert_allclose(r.tp_s, np.array([5.0, 12.0, 15.0])[dominant], atol=PACK)
    np.testing.assert_allclose(r.wave_from_deg, np.array([270.0, 300.0, 200.0])[dominant], atol=PACK)
    assert np.all(r.valid) and np.all(r.flags == 0)
    assert any("most energetic" in n for n in r.notes)


def test_combined_and_perpw(tmp_path):
    h, la, lo = _grid()
    hs = 2.0 + 0.01 * (lo % 360.0) / 5.0 + 0.1 * h
    path = write_grib2(str(tmp_path / "comb.grb2"), LON, LAT, TIMES,
                       {"hs": hs, "tp": np.full(h.shape, 9.5), "dir": np.full(h.shape, 45.0)},
                       use_perpw_for_tp=True)
    src = open_sea_state(path)
    inv = {v.canonical: v for v in src.inventory().variables}
    assert "parameter 11 (PERPW" in inv["tp"].recognised_by  # WMO 4.2: 11 = primary wave mean period
    assert any("peak period" in n for n in inv["tp"].notes)
    assert inv["hs"].grid.lon_convention == "-180..180" and inv["hs"].grid.global_wrap
    # across the antimeridian: 177.5 is halfway between centres 175 and 180 (= -180)
    r = src.sample([177.5, -177.5, 20.0], [0.0, 0.0, 0.0], _at([6, 6, 6]))
    v175 = 2.0 + 0.01 * 175 / 5 + 0.6
    v180 = 2.0 + 0.01 * 180 / 5 + 0.6
    v185 = 2.0 + 0.01 * 185 / 5 + 0.6
    assert r.hs_m[0] == pytest.approx(0.5 * (v175 + v180), abs=PACK)
    assert r.hs_m[1] == pytest.approx(0.5 * (v180 + v185), abs=PACK)
    assert r.tp_s[2] == pytest.approx(9.5, abs=PACK)


def test_one_file_per_step_merged_and_duplicates_warned(tmp_path):
    # interface contract (no outside source): same-grid files extend the time axis; a repeated
    # time is taken from the first file, with a warning naming it
    f = partitions_only()
    paths = []
    for i in range(3):
        step = {k: v[i:i + 1] for k, v in f.items()}
        paths.append(write_grib2(str(tmp_path / f"step{i}.grb2"), LON, LAT, TIMES[i:i + 1], step,
                                 ref_time_utc=TIMES[0]))
    dup = {k: v[1:2] + 3.0 for k, v in f.items()}
    paths.append(write_grib2(str(tmp_path / "again.grb2"), LON, LAT, TIMES[1:2], dup, ref_time_utc=TIMES[0]))
    src = open_sea_state(paths, source_name="merged")
    assert src.name == "merged"
    a, b = src.time_range_utc
    assert a == TIMES[0] and b == TIMES[2]
    assert src.layer("swell1_hs").times_s.size == 3
    assert any("again.grb2" in w and "step1.grb2" in w and "is used" in w for w in src.warnings)
    r = src.sample([10.0], [0.0], _at([9.0]))  # 9 h: between files step1 (6 h) and step2 (12 h)
    assert r.partition_hs_m[0, 1] == pytest.approx(1.5 + 0.9, abs=PACK)  # first file's values, not +3


def test_same_variable_two_grids_keeps_first(tmp_path):
    # interface contract (no outside source): first file wins, warning says which is used
    f = partitions_only()
    a = write_grib2(str(tmp_path / "a.grb2"), LON, LAT, TIMES, f)
    lon2 = np.arange(-30.0, 30.01, 2.5)
    lat2 = np.arange(30.0, -30.01, -2.5)
    h, la, lo = np.meshgrid(HOURS, lat2, lon2, indexing="ij")
    b = write_grib2(str(tmp_path / "b.grb2"), lon2, lat2, TIMES, {"swell1_hs": np.full(h.shape, 9.0)})
    src = open_sea_state([a, b])
    assert any("'swell1_hs'" in w and "a.grb2 is used" in w for w in src.warnings)
    r = src.sample([0.0], [0.0], _at([0]))
    assert r.partition_hs_m[0, 1] == pytest.approx(1.5, abs=PACK)


def test_partition_outside_its_grid_marks_partial(tmp_path):
    # interface contract (no outside source): a missing auxiliary variable -> PARTIAL_VARIABLES
    # combined sea on a global grid, a swell partition on a small regional grid
    h, la, lo = _grid()
    comb = write_grib2(str(tmp_path / "c.grb2"), LON, LAT, TIMES,
                       {"hs": np.full(h.shape, 2.0), "tp": np.full(h.shape, 9.0), "dir": np.full(h.shape, 10.0)})
    lon2 = np.arange(0.0, 20.01, 5.0)
    lat2 = np.arange(20.0, -0.01, -5.0)
    h2 = np.meshgrid(HOURS, lat2, lon2, indexing="ij")[0]
    part = write_grib2(str(tmp_path / "p.grb2"), lon2, lat2, TIMES, {"swell1_hs": np.full(h2.shape, 1.0)})
    r = open_sea_state([comb, part]).sample([10.0, 100.0], [10.0, 10.0], _at([1, 1]))
    assert r.valid.all()
    assert r.flags[0] == 0
    assert r.flags[1] & SampleFlag.PARTIAL_VARIABLES and np.isnan(r.partition_hs_m[1, 0])


def test_describe_lists_unused_and_missing_error(tmp_path):
    # interface contract (no outside source): the error lists what was found
    h = _grid()[0]
    path = write_grib2(str(tmp_path / "hs_only.grb2"), LON, LAT, TIMES, {"hs": np.full(h.shape, 2.0)})
    inv = describe_file(path)
    assert [v.canonical for v in inv.variables] == ["hs"]
    with pytest.raises(SeawayInputError, match=r"hs_only.grb2: missing a wave period.*found: hs"):
        open_sea_state(path)


def test_writer_refuses_missing_values(tmp_path):
    # GDAL 3.6 GRIB writer: simple packing cannot preserve no-data (GDAL's own warning, seen here)
    h = _grid()[0]
    hs = np.full(h.shape, 2.0)
    hs[0, 3, 3] = np.nan
    with pytest.raises(SeawayInputError, match=r"variables\['hs'\] holds NaN"):
        write_grib2(str(tmp_path / "nan.grb2"), LON, LAT, TIMES, {"hs": hs})


@pytest.mark.parametrize("fmt", ["grib2", "netcdf_jump"])
def test_regional_grid_across_antimeridian(tmp_path, fmt):
    # a Pacific grid 150E..150W; the field is linear in the eastward distance from 150E, so a route
    # crossing 180 must see it continue smoothly (the grid's own 360-degree window, not a wrap)
    from seaway_comfort.processing.core.demo.writers import write_cf_netcdf

    lon = np.arange(150.0, 210.01, 1.0)
    lat = np.arange(10.0, -10.01, -1.0)
    h, la, lo = np.meshgrid(HOURS[:2], lat, lon, indexing="ij")
    hs = 1.0 + 0.01 * (lo - 150.0)
    if fmt == "grib2":
        path = write_grib2(str(tmp_path / "pac.grb2"), lon, lat, TIMES[:2],
                           {"hs": hs, "tp": 0 * h + 9.0, "dir": 0 * h + 90.0})
    else:  # longitudes written in -180..180, jumping from 180 to -179 inside the file
        path = write_cf_netcdf(str(tmp_path / "pac.nc"), np.where(lon > 180, lon - 360, lon), lat, TIMES[:2], {
            "sea_surface_wave_significant_height": hs,
            "sea_surface_wave_period_at_variance_spectral_density_maximum": 0 * h + 9.0,
            "sea_surface_wave_from_direction": 0 * h + 90.0})
    src = open_sea_state(path)
    assert not src.inventory().variables[0].grid.global_wrap
    qlon = np.array([179.5, -179.5, 175.0, -155.0, 151.0, -140.0])
    r = src.sample(qlon, np.zeros(6), _at(np.zeros(6)))
    east = np.mod(qlon - 150.0, 360.0)
    np.testing.assert_allclose(r.hs_m[:5], 1.0 + 0.01 * east[:5], atol=PACK)
    assert r.flags[5] & SampleFlag.OUTSIDE_GRID  # 140W lies east of the grid's 150W edge


def test_dominant_partition_without_period_falls_back(tmp_path):
    # the most energetic partition (swell1) has no period in the file: the next partition that has
    # one gives Tp, and the sample says so (PARTIAL_VARIABLES); direction still from swell1
    f = partitions_only()
    del f["swell1_tp"]
    path = write_grib2(str(tmp_path / "nop.grb2"), LON, LAT, TIMES, f)
    r = open_sea_state(path).sample([10.0], [-55.0], _at([3.0]))  # wind 0.25 m, swell1 1.8 m, swell2 1.0 m
    assert r.tp_s[0] == pytest.approx(15.0, abs=PACK)     # swell2's period (next most energetic)
    assert r.wave_from_deg[0] == pytest.approx(300.0, abs=PACK)
    assert r.flags[0] & SampleFlag.PARTIAL_VARIABLES and r.valid[0]


def test_variable_map_with_grib_levels(tmp_path):
    # interface contract: "ELEMENT@<level type>:<value>" picks one level (WMO Code table 4.5: 241 =
    # ordered sequence of data); here the two swell partitions are swapped on purpose
    path = write_grib2(str(tmp_path / "lv.grb2"), LON, LAT, TIMES, partitions_only())
    vm = {"swell1_hs": "SWELL@241:2", "swell2_hs": "SWELL@241:1"}
    src = open_sea_state(path, variable_map=vm)
    r = src.sample([10.0], [0.0], _at([6.0]))
    assert r.partition_hs_m[0, 1] == pytest.approx(1.0, abs=PACK)        # file's second swell
    assert r.partition_hs_m[0, 2] == pytest.approx(1.5 + 0.6, abs=PACK)  # file's first swell
    assert "SWELL@241:2" in src.inventory().variables[[v.canonical for v in src.inventory().variables].index("swell1_hs")].recognised_by
