# SPDX-License-Identifier: GPL-2.0-or-later
"""NetCDF-CF ingest and space-time sampling, on files written by GDAL in the test.

References: bilinear weights on cell centres (Press et al., Numerical Recipes 3rd ed. 2007,
s.3.6) checked against scipy.interpolate.RegularGridInterpolator (reference library; trilinear =
bilinear in space x linear in time); CF Conventions 1.8 (s.4.4 time, s.8.1 packing, s.2.5.1
_FillValue); circular mean of directions (Mardia & Jupp 2000, s.2.2.1).
"""
from __future__ import annotations

import os

import numpy as np
import pytest
from scipy.interpolate import RegularGridInterpolator

from seaway_comfort.processing.core.flags import SampleFlag
from seaway_comfort.processing.core.seastate import describe_file, open_sea_state
from seaway_comfort.processing.core.demo.writers import write_cf_netcdf
from seaway_comfort.processing.core.validation import SeawayInputError

HS = "sea_surface_wave_significant_height"
TP = "sea_surface_wave_period_at_variance_spectral_density_maximum"
DIR = "sea_surface_wave_from_direction"
TM01 = "sea_surface_wave_mean_period_from_variance_spectral_density_first_frequency_moment"

LON = np.arange(0.0, 360.0, 2.5)     # 0..357.5: a global ring in 0..360 convention
LAT = np.arange(-60.0, 60.01, 2.5)
T0 = np.datetime64("2024-03-01T00:00:00", "s")
TIMES = T0 + np.arange(4) * np.timedelta64(3, "h")
HOURS = np.arange(4) * 3.0


def linear_hs(lon, lat, hours):
    """Analytic field linear in lon, lat and time (exact under bilinear/linear interpolation)."""
    return 1.0 + 0.01 * lon + 0.02 * (lat + 60.0) + 0.1 * hours


def _fields():
    h, la, lo = np.meshgrid(HOURS, LAT, LON, indexing="ij")
    return {HS: linear_hs(lo, la, h), TP: 8.0 + 0.05 * la + 0.2 * h, DIR: np.full(h.shape, 200.0)}


@pytest.fixture()
def nc_global(tmp_path):
    return write_cf_netcdf(str(tmp_path / "ring.nc"), LON, LAT, TIMES, _fields())


def _hours(h):
    """Times at h hours after T0; h must be whole seconds (use _whole_s)."""
    return T0 + np.rint(np.asarray(h, dtype=float) * 3600).astype("timedelta64[s]")


def _whole_s(hours):
    return np.rint(np.asarray(hours) * 3600.0) / 3600.0


def test_inventory_and_recognition(nc_global):
    # facts written into the file above by GDAL (CF standard names, 4 steps of 3 h, 0..360 ring);
    # default source name = file stem is our interface contract (no outside source)
    src = open_sea_state(nc_global)
    assert src.name == "ring"  # default source name: file stem
    assert set(src.variables) == {"hs", "tp", "dir"}
    assert src.partitions == ()
    a, b = src.time_range_utc
    assert a == TIMES[0] and b == TIMES[-1]
    inv = src.inventory()
    hs = next(v for v in inv.variables if v.canonical == "hs")
    assert "standard_name" in hs.recognised_by
    assert hs.grid.lon_convention == "0..360" and hs.grid.global_wrap
    assert hs.time_count == 4 and hs.time_step_s == 3 * 3600
    d = inv.as_dict()
    assert d["variables"][0]["grid"]["shape"] == (LAT.size, LON.size)
    assert "Planning aid" in inv.as_text()
    assert describe_file(nc_global).variables[0].file == nc_global


def test_linear_field_exact_in_space_and_time(nc_global):
    # bilinear + linear-in-time reproduce a trilinear field exactly (Numerical Recipes s.3.6);
    # longitudes given in -180..180 must hit the same 0..360 cells
    rng = np.random.default_rng(1)
    lon = rng.uniform(2.0, 355.0, 200)
    lat = rng.uniform(-59.0, 59.0, 200)
    hours = _whole_s(rng.uniform(0.0, 9.0, 200))
    lon_in = np.where(lon > 180.0, lon - 360.0, lon)
    r = open_sea_state(nc_global).sample(lon_in, lat, _hours(hours))
    np.testing.assert_allclose(r.hs_m, linear_hs(lon, lat, hours), atol=2e-5)
    np.testing.assert_allclose(r.tp_s, 8.0 + 0.05 * lat + 0.2 * hours, atol=2e-5)
    assert np.all(r.valid) and np.all(r.flags == 0)


def test_route_across_zero_and_antimeridian(nc_global):
    src = open_sea_state(nc_global)
    # across 0 deg: -1.25 lies halfway between the centres 357.5 and 0 (= 360) of the ring
    r = src.sample([-1.25, 358.75, 1.0, 180.0, -180.0, 179.0, -179.0], [10.0] * 7, _hours([3] * 7))
    want_seam = 0.5 * (linear_hs(357.5, 10, 3) + linear_hs(0.0, 10, 3))
    assert r.hs_m[0] == pytest.approx(want_seam, abs=2e-5)
    assert r.hs_m[1] == pytest.approx(want_seam, abs=2e-5)
    assert r.hs_m[2] == pytest.approx(linear_hs(1.0, 10, 3), abs=2e-5)
    # 180 and -180 are the same meridian; 179 / -179 (= 181) lie on the linear part of the field
    assert r.hs_m[3] == pytest.approx(r.hs_m[4], abs=1e-12)
    assert r.hs_m[5] == pytest.approx(linear_hs(179.0, 10, 3), abs=2e-5)
    assert r.hs_m[6] == pytest.approx(linear_hs(181.0, 10, 3), abs=2e-5)


def test_against_scipy_regular_grid_interpolator(tmp_path):
    # reference library: scipy.interpolate.RegularGridInterpolator(method="linear") on the same
    # (time, lat, lon) grid, with the ring closed by repeating column 0 at lon 360
    rng = np.random.default_rng(7)
    data = rng.uniform(0.5, 6.0, (TIMES.size, LAT.size, LON.size)).astype(np.float32).astype(float)
    path = write_cf_netcdf(str(tmp_path / "rand.nc"), LON, LAT, TIMES,
                           {HS: data, TP: np.full(data.shape, 9.0), DIR: np.full(data.shape, 90.0)})
    closed = np.concatenate([data, data[:, :, :1]], axis=2)
    ref = RegularGridInterpolator((HOURS, LAT, np.append(LON, 360.0)), closed, method="linear")
    n = 500
    lon = rng.uniform(0.0, 360.0, n)
    lat = rng.uniform(-60.0, 60.0, n)
    hours = _whole_s(rng.uniform(0.0, 9.0, n))
    lon[:50] = rng.uniform(358.0, 360.0, 50)  # force the seam
    r = open_sea_state(path).sample(lon - 360.0 * (lon > 180), lat, _hours(hours))
    np.testing.assert_allclose(r.hs_m, ref(np.column_stack([hours, lat, lon])), rtol=0, atol=1e-6)


def test_directions_across_north(tmp_path):
    # circular mean of unit vectors (Mardia & Jupp 2000 s.2.2.1): 350 and 10 average to 0, not 180
    h, la, lo = np.meshgrid(HOURS, LAT, LON, indexing="ij")
    cols = np.where((np.round(lo / 2.5) % 2) == 0, 350.0, 10.0)
    timewise = np.where(h < 4.5, 340.0, 20.0) * np.ones_like(lo)
    path = write_cf_netcdf(str(tmp_path / "dir.nc"), LON, LAT, TIMES,
                           {HS: np.full(h.shape, 2.0), TP: np.full(h.shape, 9.0), DIR: cols})
    r = open_sea_state(path).sample([1.25, 3.75, 1.25], [0.0, 0.0, 0.0], _hours([0, 0, 1.5]))
    d = np.mod(r.wave_from_deg + 180.0, 360.0) - 180.0
    np.testing.assert_allclose(d, 0.0, atol=1e-9)
    path2 = write_cf_netcdf(str(tmp_path / "dirt.nc"), LON, LAT, TIMES,
                            {HS: np.full(h.shape, 2.0), TP: np.full(h.shape, 9.0), DIR: timewise})
    r2 = open_sea_state(path2).sample([10.0], [0.0], _hours([4.5]))  # halfway between 3 h and 6 h
    assert (r2.wave_from_deg[0] + 180.0) % 360.0 - 180.0 == pytest.approx(0.0, abs=1e-9)


def test_to_direction_converted(tmp_path):
    # CF standard name sea_surface_wave_to_direction = direction of travel: from = to + 180
    shape = (TIMES.size, LAT.size, LON.size)
    path = write_cf_netcdf(str(tmp_path / "to.nc"), LON, LAT, TIMES, {
        HS: np.full(shape, 2.0), TP: np.full(shape, 9.0), "sea_surface_wave_to_direction": np.full(shape, 90.0)})
    src = open_sea_state(path)
    assert src.sample([20.0], [5.0], _hours([1]))  .wave_from_deg[0] == pytest.approx(270.0, abs=1e-9)
    dnote = next(v for v in src.inventory().variables if v.canonical == "dir").direction_note
    assert "going-to" in dnote


def test_feet_and_packing_and_fill(tmp_path):
    # feet -> m with 1 ft = 0.3048 m (1959 agreement); CF 1.8 s.8.1: unpacked = packed*scale + offset;
    # s.2.5.1: _FillValue cells are missing
    f = _fields()
    hs_ft = f[HS] / 0.3048
    hs_ft[:, 20, 40] = np.nan  # one missing cell, filled with _FillValue by the writer
    path = write_cf_netcdf(str(tmp_path / "pk.nc"), LON, LAT, TIMES, {HS: hs_ft, TP: f[TP], DIR: f[DIR]},
                           units={HS: "ft"}, scale_factor={HS: 0.01, TP: 0.001}, add_offset={HS: 10.0})
    src = open_sea_state(path)
    inv = next(v for v in src.inventory().variables if v.canonical == "hs")
    assert inv.units_in == "ft" and "0.3048" in inv.conversion
    lon, lat, hr = np.array([30.0, 100.0]), np.array([0.0, 20.0]), np.array([2.0, 7.0])
    r = src.sample(lon, lat, _hours(hr))
    # packing step 0.01 ft = 0.003 m: half a step per value is the rounding bound
    np.testing.assert_allclose(r.hs_m, linear_hs(lon, lat, hr), atol=0.01 * 0.3048 / 2 + 1e-9)
    np.testing.assert_allclose(r.tp_s, 8.0 + 0.05 * lat + 0.2 * hr, atol=0.0005 + 1e-9)
    # sample exactly at the filled cell centre: no data there -> nearest sea cell (2.5 deg ~ 278 km away
    # is beyond 30 km) -> NO_SEA_DATA; with a 300 km search radius it is LAND_ADJUSTED
    lon_c, lat_c = LON[40], LAT[20]
    r = src.sample([lon_c], [lat_c], _hours([0]))
    assert np.isnan(r.hs_m[0]) and r.flags[0] & SampleFlag.NO_SEA_DATA and not r.valid[0]
    r = src.sample([lon_c], [lat_c], _hours([0]), land_search_km=300.0)
    assert r.flags[0] & SampleFlag.LAND_ADJUSTED and r.valid[0]
    neighbours = [linear_hs(LON[40 + dc], LAT[20 + dr], 0) for dc, dr in ((1, 0), (-1, 0), (0, 1), (0, -1))]
    # nearest valid cell: an east/west neighbour at lat 0 is 278 km, north/south also 278 km;
    # the value must be one of the four neighbours' values (common practice, no source)
    assert min(abs(r.hs_m[0] - v) for v in neighbours) < 0.003


def test_coast_renormalises_over_sea_neighbours(tmp_path):
    # renormalised bilinear weights over valid neighbours (documented method, common practice)
    f = _fields()
    hs = f[HS].copy()
    hs[:, 20, 40] = np.nan
    path = write_cf_netcdf(str(tmp_path / "coast.nc"), LON, LAT, TIMES, {HS: hs, TP: f[TP], DIR: f[DIR]})
    lon, lat = LON[40] + 0.5 * 2.5, LAT[20] + 0.25 * 2.5  # fx = 0.5, fy = 0.25 from the land cell
    r = open_sea_state(path).sample([lon], [lat], _hours([0]))
    # GDAL stores rows north-up but the weights are symmetric: land corner weight (1-fx)(1-fy)
    w = {(0, 0): 0.5 * 0.75, (1, 0): 0.5 * 0.75, (0, 1): 0.5 * 0.25, (1, 1): 0.5 * 0.25}
    num = sum(wt * linear_hs(LON[40 + dc], LAT[20 + dr], 0) for (dc, dr), wt in w.items() if (dc, dr) != (0, 0))
    den = sum(wt for k, wt in w.items() if k != (0, 0))
    assert r.hs_m[0] == pytest.approx(num / den, abs=2e-5)
    assert r.flags[0] == 0


def test_outside_grid_and_time_flags(nc_global):
    # interface contract (no outside source): no extrapolation in time beyond the tolerance; the
    # grid covers its cells' edges (GDAL geotransform, cell-edge convention)
    src = open_sea_state(nc_global)
    lon = [10.0, 10.0, 10.0, 10.0, 10.0]
    lat = [70.0, 0.0, 0.0, 0.0, 61.0]       # grid cells reach 61.25: 61 inside, 70 outside
    t = _hours([1.0, -2.0, 9.4, 12.0, 1.0])  # -2 h and +3 h beyond: outside; +0.4 h: inside tolerance
    r = src.sample(lon, lat, t)
    assert r.flags[0] & SampleFlag.OUTSIDE_GRID and np.isnan(r.hs_m[0])
    assert r.flags[1] & SampleFlag.OUTSIDE_TIME and np.isnan(r.hs_m[1])
    assert r.flags[2] == 0 and r.hs_m[2] == pytest.approx(linear_hs(10, 0, 9), abs=2e-5)  # no extrapolation
    assert r.flags[3] & SampleFlag.OUTSIDE_TIME
    assert r.flags[4] == 0 and r.hs_m[4] == pytest.approx(linear_hs(10, 60, 1), abs=2e-5)
    assert not r.valid[0] and not r.valid[1] and r.valid[2]
    r = src.sample([10.0, 10.0], [0.0, 0.0], _hours([9.4, 9.0]), time_tolerance_s=0.0)
    assert r.flags[0] & SampleFlag.OUTSIDE_TIME and r.flags[1] == 0


def test_route_entirely_outside_raises(nc_global):
    # interface contract (no outside source): an error naming the file when no sample is inside
    src = open_sea_state(nc_global)
    with pytest.raises(SeawayInputError, match=r"entirely outside the grid.*ring.nc"):
        src.sample([10.0, 20.0], [80.0, 85.0], _hours([1, 2]))
    with pytest.raises(SeawayInputError, match=r"time range.*ring.nc"):
        src.sample([10.0, 20.0], [0.0, 1.0], _hours([100, 101]))


def test_implausible_values_flagged_and_warned(tmp_path):
    # Hs above 25 m is taken as a unit error (common practice, no source): flag + warning naming file
    f = _fields()
    f[HS] = f[HS] * 10.0
    path = write_cf_netcdf(str(tmp_path / "odd.nc"), LON, LAT, TIMES, f)
    src = open_sea_state(path)
    r = src.sample([300.0, 5.0], [50.0, -50.0], _hours([1, 1]))
    assert r.flags[0] & SampleFlag.IMPLAUSIBLE_VALUE
    assert not r.flags[1] & SampleFlag.IMPLAUSIBLE_VALUE
    assert any("odd.nc" in w and "'hs'" in w for w in src.warnings)


def test_tp_from_tm01_flagged(tmp_path):
    # Tp = Tm01 / 0.8343 for JONSWAP gamma 3.3 (DNV-RP-C205 s.3.5.5; ratio checked in test_seastate_variables)
    f = _fields()
    path = write_cf_netcdf(str(tmp_path / "tm.nc"), LON, LAT, TIMES, {HS: f[HS], TM01: np.full(f[HS].shape, 7.0),
                                                                     DIR: f[DIR]})
    r = open_sea_state(path).sample([20.0], [0.0], _hours([1]))
    assert r.tp_s[0] == pytest.approx(7.0 / 0.8343, rel=1e-6)
    assert r.tm01_s[0] == pytest.approx(7.0, rel=1e-6)
    assert r.flags[0] & SampleFlag.PARTIAL_VARIABLES and r.valid[0]
    assert any("tm01" in n for n in r.notes)


def test_variable_map_for_nonstandard_names(tmp_path):
    # interface contract (no outside source): names without CF standard_name need variable_map
    f = _fields()
    path = write_cf_netcdf(str(tmp_path / "plain.nc"), LON, LAT, TIMES,
                           {"HSIG": f[HS], "TPEAK": f[TP], "PDIR": f[DIR]}, units={"HSIG": "m", "TPEAK": "s"})
    with pytest.raises(SeawayInputError, match="missing"):
        open_sea_state(path)
    src = open_sea_state(path, variable_map={"hs": "HSIG", "tp": "TPEAK", "dir": "PDIR"})
    r = src.sample([20.0], [0.0], _hours([1]))
    assert r.hs_m[0] == pytest.approx(linear_hs(20, 0, 1), abs=2e-5)
    inv = src.inventory()
    assert all("variable_map" in v.recognised_by for v in inv.variables)
    assert "coming-from assumed" in next(v for v in inv.variables if v.canonical == "dir").direction_note
    with pytest.raises(SeawayInputError, match="NOPE"):
        open_sea_state(path, variable_map={"hs": "NOPE", "tp": "TPEAK", "dir": "PDIR"})
    with pytest.raises(SeawayInputError, match="unknown canonical"):
        open_sea_state(path, variable_map={"height": "HSIG"})


def test_cf_time_units_in_file(tmp_path):
    # CF 1.8 s.4.4: "days since 1950-01-01" decoded to the same instants as written
    path = write_cf_netcdf(str(tmp_path / "days.nc"), LON, LAT, TIMES, _fields(), time_units="days since 1950-01-01")
    a, b = open_sea_state(path).time_range_utc
    assert a == TIMES[0] and b == TIMES[-1]


def test_bad_calendar_and_order_and_missing(tmp_path):
    # CF 1.8 s.4.4.1 calendars; increasing time axis and required variables: interface contract
    path = write_cf_netcdf(str(tmp_path / "cal.nc"), LON, LAT, TIMES, _fields(), calendar="noleap")
    with pytest.raises(SeawayInputError, match=r"cal.nc.*noleap"):
        open_sea_state(path)
    back = TIMES[[0, 2, 1, 3]]
    path = write_cf_netcdf(str(tmp_path / "order.nc"), LON, LAT, back, _fields())
    with pytest.raises(SeawayInputError, match=r"order.nc.*not increasing"):
        open_sea_state(path)
    f = _fields()
    path = write_cf_netcdf(str(tmp_path / "onlyhs.nc"), LON, LAT, TIMES, {HS: f[HS]})
    with pytest.raises(SeawayInputError, match=r"missing a wave period.*found: hs"):
        open_sea_state(path)


def test_no_time_and_unreadable_files(tmp_path):
    # interface contract (no outside source): clear errors naming the file and GDAL's reason
    from osgeo import gdal

    mem = gdal.GetDriverByName("MEM").Create("", 10, 5, 1, gdal.GDT_Float32)
    mem.SetGeoTransform([0, 1, 0, 5, 0, -1])
    gdal.GetDriverByName("netCDF").CreateCopy(str(tmp_path / "flat.nc"), mem)
    with pytest.raises(SeawayInputError, match=r"flat.nc.*no time information"):
        open_sea_state(str(tmp_path / "flat.nc"), variable_map={"hs": "Band1", "tp": "Band1", "dir": "Band1"})
    junk = tmp_path / "junk.grb2"
    junk.write_text("this is not a forecast file\n")
    with pytest.raises(SeawayInputError, match=r"GDAL cannot open .*junk.grb2"):
        open_sea_state(str(junk))
    with pytest.raises(SeawayInputError, match=r"does not exist"):
        open_sea_state(str(tmp_path / "absent.nc"))
    with pytest.raises(SeawayInputError, match="paths is empty"):
        open_sea_state([])
    with pytest.raises(SeawayInputError, match="direction_convention"):
        open_sea_state(str(junk), direction_convention="sideways")


def test_bad_sample_arguments(nc_global):
    # interface contract (no outside source): every bad argument named in the error
    src = open_sea_state(nc_global)
    t = _hours([1, 1])
    with pytest.raises(SeawayInputError, match="lat_deg"):
        src.sample([1.0, 2.0], [0.0, 95.0], t)
    with pytest.raises(SeawayInputError, match="lon_deg"):
        src.sample([1.0, np.nan], [0.0, 1.0], t)
    with pytest.raises(SeawayInputError, match="time_utc has 2"):
        src.sample([1.0, 2.0, 3.0], [0.0, 1.0, 2.0], t)
    with pytest.raises(SeawayInputError, match="land_search_km"):
        src.sample([1.0, 2.0], [0.0, 1.0], t, land_search_km=-1)
    with pytest.raises(SeawayInputError, match="time_tolerance_s"):
        src.sample([1.0, 2.0], [0.0, 1.0], t, time_tolerance_s=np.nan)
    with pytest.raises(SeawayInputError, match="empty"):
        src.sample([], [], [])


def test_progress_and_cancel(nc_global):
    # interface contract (design: progress(fraction) -> False means stop)
    from seaway_comfort.processing.core.seastate import SamplingCancelled

    seen = []
    src = open_sea_state(nc_global)
    src.sample([1.0], [0.0], _hours([1]), progress=lambda f: seen.append(f) or True)
    assert seen[-1] == pytest.approx(1.0) and seen == sorted(seen)
    with pytest.raises(SamplingCancelled):
        src.sample([1.0], [0.0], _hours([1]), progress=lambda f: False)


def test_explicit_direction_convention_overrides_with_warning(nc_global):
    # the file declares coming-from (CF sea_surface_wave_from_direction = 200); the caller insists on
    # going-to: the caller wins (documented), the contradiction is reported
    src = open_sea_state(nc_global, direction_convention="to")
    assert src.sample([20.0], [0.0], _hours([1])).wave_from_deg[0] == pytest.approx(20.0, abs=1e-9)
    assert any("direction_convention='to'" in w and "ring.nc" in w for w in src.warnings)


def test_odd_direction_values_flagged(tmp_path):
    # directions outside 0..360 degrees are not valid compass bearings (common practice, no source)
    f = _fields()
    f[DIR] = np.full(f[DIR].shape, 400.0)
    path = write_cf_netcdf(str(tmp_path / "dir400.nc"), LON, LAT, TIMES, f)
    src = open_sea_state(path)
    r = src.sample([20.0], [0.0], _hours([1]))
    assert r.flags[0] & SampleFlag.IMPLAUSIBLE_VALUE
    assert r.wave_from_deg[0] == pytest.approx(40.0, abs=1e-9)  # kept (as a unit vector), flagged
    assert any("dir400.nc" in w and "'dir'" in w for w in src.warnings)


def test_period_missing_where_height_present(tmp_path):
    # Tp no-data in one region while Hs has data: the sample is not valid and says why
    f = _fields()
    tp = f[TP].copy()
    tp[:, :, 10:20] = np.nan   # lon 25..47.5
    path = write_cf_netcdf(str(tmp_path / "tpgap.nc"), LON, LAT, TIMES, {HS: f[HS], TP: tp, DIR: f[DIR]})
    r = open_sea_state(path).sample([36.0, 100.0], [0.0, 0.0], _hours([1, 1]))
    assert not r.valid[0] and np.isnan(r.tp_s[0]) and np.isnan(r.hs_m[0])
    assert r.flags[0] & SampleFlag.NO_SEA_DATA
    assert r.valid[1] and r.flags[1] == 0


def test_describe_lists_ignored_variables(tmp_path):
    # interface contract (no outside source): describe_file reports what it does not use
    f = _fields()
    path = write_cf_netcdf(str(tmp_path / "mixed.nc"), LON, LAT, TIMES,
                           {HS: f[HS], "air_temperature": f[TP]})
    inv = describe_file(path)
    assert [v.canonical for v in inv.variables] == ["hs"]
    assert any(e.name == "air_temperature" and "standard_name" in e.reason for e in inv.ignored)
    assert "Not used:" in inv.as_text()


def test_uneven_latitudes_rejected(tmp_path):
    # GDAL fits a geotransform to uneven coordinates with only a warning; we refuse such grids
    from osgeo import gdal

    path = write_cf_netcdf(str(tmp_path / "uneven.nc"), LON, LAT, TIMES, _fields())
    ds = gdal.OpenEx(path, gdal.OF_MULTIDIM_RASTER | gdal.OF_UPDATE)
    lat = LAT.copy()
    lat[10:] += 0.7 * np.linspace(0.0, 1.0, lat.size - 10) ** 2
    ds.GetRootGroup().OpenMDArray("lat").WriteArray(lat)
    del ds
    with pytest.raises(SeawayInputError, match=r"uneven.nc.*'lat' is not evenly spaced"):
        open_sea_state(path)


def test_combined_gap_filled_from_partitions(tmp_path):
    # where the combined Hs is missing but partitions exist: sqrt(sum Hs_i^2) + PARTIAL_VARIABLES
    f = _fields()
    hs = f[HS].copy()
    hs[:, :, 10:20] = np.nan
    shape = hs.shape
    path = write_cf_netcdf(str(tmp_path / "gap.nc"), LON, LAT, TIMES, {
        HS: hs, TP: f[TP], DIR: f[DIR],
        "sea_surface_wind_wave_significant_height": np.full(shape, 1.2),
        "sea_surface_primary_swell_wave_significant_height": np.full(shape, 1.6)})
    r = open_sea_state(path).sample([36.0, 100.0], [0.0, 0.0], _hours([1, 1]))
    assert r.hs_m[0] == pytest.approx(2.0, abs=1e-6)   # sqrt(1.2^2 + 1.6^2) = 2.0 (3-4-5 triangle)
    assert r.flags[0] & SampleFlag.PARTIAL_VARIABLES and r.valid[0]
    assert r.hs_m[1] == pytest.approx(linear_hs(100, 0, 1), abs=2e-5) and r.flags[1] == 0


def test_directions_weighted_circular_mean(tmp_path):
    # unequal weights in space and time: reference = arg(sum_k w_k exp(i theta_k)), the weighted
    # mean direction (Mardia & Jupp 2000, s.2.2.1, from memory), evaluated with numpy complex numbers
    h, la, lo = np.meshgrid(HOURS, LAT, LON, indexing="ij")
    col_even = (np.round(lo / 2.5) % 2) == 0
    dirs = np.where(col_even, 350.0, 40.0)
    dirs = np.where(h >= 3.0, np.where(col_even, 300.0, 80.0), dirs)  # steps 1.. differ from step 0
    path = write_cf_netcdf(str(tmp_path / "wdir.nc"), LON, LAT, TIMES,
                           {HS: np.full(h.shape, 2.0), TP: np.full(h.shape, 9.0), DIR: dirs})
    fx, wt = 0.3, 0.25                      # 30 % of the way to the odd column, 25 % of the way to 3 h
    r = open_sea_state(path).sample([2.5 * 4 + fx * 2.5], [0.0], _hours([wt * 3.0]))
    z = np.exp(1j * np.radians([350.0, 40.0, 300.0, 80.0]))
    w = np.array([(1 - fx) * (1 - wt), fx * (1 - wt), (1 - fx) * wt, fx * wt])
    want = np.degrees(np.angle(np.sum(w * z))) % 360.0
    assert r.wave_from_deg[0] == pytest.approx(want, abs=1e-9)


def test_two_candidates_in_one_file_first_by_preference(tmp_path):
    # both a coming-from and a going-to direction: the coming-from one is used, and the choice is
    # reported (our documented preference order)
    f = _fields()
    path = write_cf_netcdf(str(tmp_path / "both.nc"), LON, LAT, TIMES, {
        HS: f[HS], TP: f[TP], DIR: f[DIR], "sea_surface_wave_to_direction": np.full(f[DIR].shape, 0.0)},
        var_names={"sea_surface_wave_to_direction": "dir_to"})
    src = open_sea_state(path)
    assert src.layer("dir").file_variable == "dir"
    assert any("'dir'" in w and "'dir_to'" in w and "is used" in w for w in src.warnings)
    assert src.sample([20.0], [0.0], _hours([1])).wave_from_deg[0] == pytest.approx(200.0, abs=1e-9)


def test_values_outside_valid_range_are_missing(tmp_path):
    # CF 1.8 s.2.5.1: values outside valid_min/valid_max are missing (limits in packed units)
    f = _fields()
    hs = f[HS].copy()
    hs[:, 20, 40] = 99.0                     # outside the declared valid range
    path = write_cf_netcdf(str(tmp_path / "vr.nc"), LON, LAT, TIMES, {HS: hs, TP: f[TP], DIR: f[DIR]},
                           extra_attributes={HS: {"valid_min": 0.0, "valid_max": 30.0}})
    r = open_sea_state(path).sample([LON[40], LON[41]], [LAT[20], LAT[20]], _hours([0, 0]), land_search_km=0.0)
    assert np.isnan(r.hs_m[0]) and r.flags[0] & SampleFlag.NO_SEA_DATA
    assert r.hs_m[1] == pytest.approx(linear_hs(LON[41], LAT[20], 0), abs=2e-5)
    assert not r.flags[0] & SampleFlag.IMPLAUSIBLE_VALUE  # missing, not an odd value
