# SPDX-License-Identifier: GPL-2.0-or-later
"""Opening many hindcast files as one series: gaps, overlaps, grids, block reads, bad input.

Checks and their references:
* gap lengths and step counts are derived by hand from the dropped times (3-hourly axis);
* point values: bilinear interpolation between cell centres (Press et al., Numerical Recipes,
  3rd ed. 2007, s.3.6 eq. 3.6.5) compared with scipy.interpolate.RegularGridInterpolator
  (method "linear") on a field that is NOT linear, so the interpolation itself is checked;
* directions averaged as unit vectors (Mardia & Jupp 2000, s.2.2.1): 350 and 10 deg -> 0 deg;
* overlap policy and errors: behaviour specified in processing/core/climate/hindcast.py.
"""
from __future__ import annotations

import numpy as np
import pytest
from scipy.interpolate import RegularGridInterpolator

from seaway_comfort.processing.core import climate as C
from seaway_comfort.processing.core.climate.hindcast import point_weights, read_point_values
from seaway_comfort.processing.core.demo.synthetic_hindcast import (
    DIR_NAME,
    HS_NAME,
    TP_NAME,
    SeasonalCycle,
    step_times_utc,
    write_seasonal_hindcast,
)
from seaway_comfort.processing.core.demo.writers import write_cf_netcdf
from seaway_comfort.processing.core.validation import SeawayInputError

LON = np.arange(-10.0, -5.99, 0.5)
LAT = np.arange(40.0, 44.01, 0.5)


def _write(path, times, hs_fn, tp=8.0, dirs=270.0, lon=LON, lat=LAT):
    shape = (lat.size, lon.size)
    return write_cf_netcdf(str(path), lon, lat, times, {
        HS_NAME: lambda i: hs_fn(i),
        TP_NAME: lambda i: np.full(shape, tp),
        DIR_NAME: lambda i: np.full(shape, dirs) if np.ndim(dirs) == 0 else dirs,
    })


def test_gap_reported_not_filled_and_counted(tmp_path):
    t = step_times_utc(2030)
    drop = t[(t >= np.datetime64("2030-03-10T00:00")) & (t < np.datetime64("2030-03-12T00:00"))]  # 2 days
    paths = write_seasonal_hindcast(str(tmp_path), [2030], drop=drop)
    s = C.open_hindcast(paths)
    assert s.n_steps == t.size  # the regular axis spans the gap
    assert len(s.gaps) == 1 and s.gaps[0].missing_steps == 16  # 2 days x 8 steps by hand
    assert s.gaps[0].after_utc == np.datetime64("2030-03-09T21:00:00")
    assert s.gaps[0].before_utc == np.datetime64("2030-03-12T00:00:00")
    assert any("gap" in n for n in s.notes)
    r = C.compute_climate([-8.0, -8.0], [41.0, 43.0], s, "coastal_survey_35m", speed_kn=10.0,
                          backend=C.SerialBackend(), max_class=4)
    # March: 16 missing steps at every sample, never counted as data
    assert np.all(r.missing_steps[2] == 16)
    assert np.all(r.valid_steps[2] == 31 * 8 - 16)
    # max_class 4 accepts every known class: unknown departures are exactly those whose passage
    # (P + 1 steps) touches the gap: 16 + P of them in March (P = passage steps)
    p = int(round(r.passage_h / 3.0))
    assert r.departures_known[2] == 31 * 8 - 16 - p
    assert r.window_probability[2] == 1.0
    assert any("gap" in n for n in r.notes)


def test_overlap_first_last_and_error(tmp_path):
    t1 = step_times_utc(2030)[:100]
    t2 = step_times_utc(2030)[90:200]  # 10 steps in both files
    shape = (LAT.size, LON.size)
    a = _write(tmp_path / "a.nc", t1, lambda i: np.full(shape, 1.0))
    b = _write(tmp_path / "b.nc", t2, lambda i: np.full(shape, 2.0))
    first = C.open_hindcast([a, b])
    assert first.n_steps == 200 and first.missing_steps == 0
    assert len(first.overlaps) == 1 and first.overlaps[0].n_steps == 10 and first.overlaps[0].used == a
    assert any("are in" in n for n in first.notes)
    pw = point_weights(first.grid, [-8.0], [42.0])
    hs, _, _ = read_point_values(first, pw, 85, 105)
    np.testing.assert_array_equal(hs[:, 0], [1.0] * 15 + [2.0] * 5)  # steps 90..99 from a
    last = C.open_hindcast([a, b], overlap="last")
    hs, _, _ = read_point_values(last, pw, 85, 105)
    np.testing.assert_array_equal(hs[:, 0], [1.0] * 5 + [2.0] * 15)  # steps 90..99 from b
    with pytest.raises(SeawayInputError, match="overlap in time"):
        C.open_hindcast([a, b], overlap="error")
    with pytest.raises(SeawayInputError, match="overlap must be"):
        C.open_hindcast([a, b], overlap="newest")


def test_different_grid_across_years_is_an_error(tmp_path):
    p1 = write_seasonal_hindcast(str(tmp_path), [2030])
    p2 = write_seasonal_hindcast(str(tmp_path), [2031], lon_deg=np.arange(-10.0, -5.99, 0.25))
    with pytest.raises(SeawayInputError) as err:
        C.open_hindcast(p1 + p2)
    msg = str(err.value)
    assert p2[0] in msg and p1[0] in msg and "grid" in msg


def test_off_axis_times_and_missing_variable_and_empty(tmp_path):
    shape = (LAT.size, LON.size)
    t = step_times_utc(2030)[:20]
    a = _write(tmp_path / "a.nc", t, lambda i: np.full(shape, 1.0))
    b = _write(tmp_path / "b.nc", t[-1] + np.timedelta64(3600 * 3 + 1800, "s") + np.arange(5) * np.timedelta64(3, "h"),
               lambda i: np.full(shape, 1.0))
    with pytest.raises(SeawayInputError, match="off the regular"):
        C.open_hindcast([a, b])
    c = write_cf_netcdf(str(tmp_path / "c.nc"), LON, LAT, t, {HS_NAME: lambda i: np.full(shape, 1.0),
                                                             TP_NAME: lambda i: np.full(shape, 8.0)})
    with pytest.raises(SeawayInputError, match="direction"):
        C.open_hindcast([c])
    with pytest.raises(SeawayInputError, match="empty"):
        C.open_hindcast([])
    with pytest.raises(SeawayInputError, match="does not exist"):
        C.open_hindcast([str(tmp_path / "nope.nc")])
    with pytest.raises(SeawayInputError, match="more than once"):
        C.open_hindcast([a, a])


def test_point_values_against_scipy_and_direction_mean(tmp_path):
    t = step_times_utc(2030)[:6]
    xx, yy = np.meshgrid(LON, LAT)
    def field(i):
        return 1.0 + 0.3 * np.sin(xx * 1.3 + i) * np.cos(yy * 0.7)  # curved in space
    dirs = np.where(xx < -8.0, 350.0, 10.0)  # 350 west of 8 W, 10 east of it
    p = _write(tmp_path / "f.nc", t, field, dirs=dirs)
    s = C.open_hindcast([p])
    lon = np.array([-9.3, -7.77, -6.1, -8.0])
    lat = np.array([40.2, 42.33, 43.9, 41.0])
    pw = point_weights(s.grid, lon, lat)
    hs, tp, wd = read_point_values(s, pw, 0, 6)
    for i in range(6):
        ref = RegularGridInterpolator((LAT, LON), field(i).astype(np.float32).astype(float), method="linear")
        np.testing.assert_allclose(hs[i], ref(np.column_stack([lat, lon])), rtol=0, atol=1e-12)
    np.testing.assert_allclose(tp, 8.0)
    # sample at -8.25 lies halfway between a 350 and a 10 deg column: unit-vector mean 0 deg
    pw2 = point_weights(s.grid, [-8.25], [42.0])
    _, _, wd2 = read_point_values(s, pw2, 0, 1)
    assert min(wd2[0, 0], 360.0 - wd2[0, 0]) == pytest.approx(0.0, abs=1e-9)


def test_route_outside_grid_and_passage_longer_than_data(tmp_path):
    paths = write_seasonal_hindcast(str(tmp_path), [2030])
    s = C.open_hindcast(paths)
    with pytest.raises(SeawayInputError, match="outside the hindcast grid"):
        C.compute_climate([20.0, 21.0], [10.0, 11.0], s, "coastal_survey_35m", speed_kn=10.0,
                          backend=C.SerialBackend())
    short = s.slice(0, 3)  # 9 hours of data, a 12 h passage
    with pytest.raises(SeawayInputError, match="longer than the whole hindcast"):
        C.compute_climate([-8.0, -8.0], [41.0, 43.0], short, "coastal_survey_35m", speed_kn=10.0,
                          backend=C.SerialBackend())


def test_bad_parameters_name_input(tmp_path):
    s = C.open_hindcast(write_seasonal_hindcast(str(tmp_path), [2030], cycle=SeasonalCycle()))
    args = ([-8.0, -8.0], [41.0, 43.0], s, "coastal_survey_35m")
    for kw, word in (({"speed_kn": -1.0}, "speed_kn"), ({"speed_kn": 10.0, "max_class": 7}, "max_class"),
                     ({"speed_kn": 10.0, "max_class": 1.5}, "max_class"),
                     ({"speed_kn": 10.0, "months": "13"}, "months"),
                     ({"speed_kn": 10.0, "station": "crowsnest"}, "crowsnest"),
                     ({"speed_kn": 10.0, "gamma": 0.5}, "gamma"),
                     ({"speed_kn": 10.0, "chunk_steps": 0}, "chunk_steps")):
        with pytest.raises(SeawayInputError, match=word):
            C.compute_climate(*args, backend=C.SerialBackend(), **kw)
    with pytest.raises(SeawayInputError, match="neither a built-in"):
        C.compute_climate(args[0], args[1], s, "no_such_vessel", speed_kn=10.0, backend=C.SerialBackend())


def test_parse_months():
    # behaviour specified in monthly.parse_months (hand examples)
    assert C.parse_months(None) == tuple(range(1, 13))
    assert C.parse_months("1-12") == tuple(range(1, 13))
    assert C.parse_months("6,7,8") == (6, 7, 8)
    assert C.parse_months("11-2") == (1, 2, 11, 12)
    assert C.parse_months(" 3 ; 1 ") == (1, 3)
    for bad in ("0", "1-13", "may", "-"):
        with pytest.raises(SeawayInputError, match="months"):
            C.parse_months(bad)


def test_samples_off_the_grid_are_flagged_not_zero(tmp_path):
    from seaway_comfort.processing.core.flags import SampleFlag

    s = C.open_hindcast(write_seasonal_hindcast(str(tmp_path), [2030]))
    # the grid's cell edges end at 5.75 W: the eastern end of this route lies outside
    r = C.compute_climate([-7.0, -5.0], [42.0, 42.0], s, "coastal_survey_35m", speed_kn=10.0,
                          backend=C.SerialBackend(), months="1")
    lon = r.lon_deg
    off = lon > -5.75
    assert off.any() and (~off).any()
    assert np.all((r.sample_flags[off] & int(SampleFlag.OUTSIDE_GRID)) != 0)
    assert np.all((r.sample_flags[~off] & int(SampleFlag.OUTSIDE_GRID)) == 0)
    assert np.all(np.isnan(r.ok_share[0, off])) and np.all(r.valid_steps[0, off] == 0)
    assert np.all(np.isfinite(r.ok_share[0, ~off]))
    # every passage crosses the off-grid samples: no departure is known, probability NaN (not 0)
    assert r.departures_known[0] == 0 and np.isnan(r.window_probability[0])
    assert any("outside the hindcast grid" in n for n in r.notes)
    assert "OFFGRID" in r.to_csv()


def test_going_to_direction_is_turned_to_coming_from(tmp_path):
    """CF standard names (CF Standard Name Table): sea_surface_wave_to_direction is the
    direction the waves travel TOWARDS, sea_surface_wave_from_direction the direction they
    come FROM, so from = (to + 180) mod 360. A file giving only the "to" variable, 30 deg west of
    8 W and 70 deg east of it: a sample on a single column reads 210 / 250 deg from; halfway
    between the columns the unit-vector mean (Mardia & Jupp 2000, s.2.2.1) of 210 and 250 is 230."""
    t = step_times_utc(2030)[:3]
    xx, _ = np.meshgrid(LON, LAT)
    shape = (LAT.size, LON.size)
    to_dir = np.where(xx < -8.0, 30.0, 70.0)
    p = write_cf_netcdf(str(tmp_path / "to.nc"), LON, LAT, t, {
        HS_NAME: lambda i: np.full(shape, 1.5),
        TP_NAME: lambda i: np.full(shape, 9.0),
        "sea_surface_wave_to_direction": lambda i: to_dir,
    })
    s = C.open_hindcast([p])
    pw = point_weights(s.grid, [-9.0, -7.0, -8.25], [42.0, 42.0, 42.0])
    hs, tp, wd = read_point_values(s, pw, 0, 3)
    np.testing.assert_allclose(hs, 1.5, rtol=1e-6)
    np.testing.assert_allclose(tp, 9.0, rtol=1e-6)
    np.testing.assert_allclose(wd, np.tile([210.0, 250.0, 230.0], (3, 1)), atol=1e-6)
