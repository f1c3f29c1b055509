# SPDX-License-Identifier: GPL-2.0-or-later
"""Route densification, course, distance and arrival times on WGS84.

Sources (keys used in the comments):
  [Karney2013] Karney C.F.F. (2013) "Algorithms for geodesics", J. Geodesy 87(1) 43-55: worked
               examples (recalled, and reproduced exactly by geographiclib 2.1 per the project's
               methods notes sec. 8, tag [A]).
  [GLIB]       geographiclib 2.1 (Python), Geodesic.WGS84 Inverse/Direct/InverseLine: a reference
               library independent of PROJ, used only in tests. Printed [B] values from the
               methods notes sec. 8 are quoted with their digits.
  [pyproj-npts] pyproj 3.7.2 Geod.npts result recorded in the methods notes sec. 8 (tag [B]).
  [SI]         1 kn = 1852/3600 m/s, 1 NM = 1852 m exactly (international nautical mile).
"""
from __future__ import annotations

import datetime as dt
import math
import warnings

import numpy as np
import pytest
from geographiclib.geodesic import Geodesic

from seaway_comfort.processing.core.passage.route import (
    RouteSamples,
    arrival_times_utc,
    densify_route,
    elapsed_time_s,
    leg_duration_s,
    wrap_lon_deg,
)
from seaway_comfort.processing.core.validation import SeawayInputError

WGS84 = Geodesic.WGS84
NM = 1852.0


def _azi360(a: float) -> float:
    return a % 360.0


def _check_against_geographiclib(r: RouteSamples, lon: list, lat: list) -> None:
    """Every sample lies on its leg's geodesic at the stated distance with the local azimuth [GLIB]."""
    seg_start = np.concatenate(([0.0], np.cumsum([
        WGS84.Inverse(lat[i], lon[i], lat[i + 1], lon[i + 1])["s12"] for i in range(len(lon) - 1)
    ])))
    for i in range(r.n):
        seg = int(r.segment_index[i])
        line = WGS84.InverseLine(lat[seg], lon[seg], lat[seg + 1], lon[seg + 1])
        along = r.dist_m[i] - seg_start[seg]
        p = line.Position(along)
        assert r.lat_deg[i] == pytest.approx(p["lat2"], abs=1e-9)
        dlon = (r.lon_deg[i] - p["lon2"] + 180.0) % 360.0 - 180.0
        assert abs(dlon) * math.cos(math.radians(p["lat2"])) < 1e-9
        if abs(p["lat2"]) < 89.9999:  # the azimuth is undefined at a pole
            expect = _azi360(p["azi2"])
            diff = (r.course_deg[i] - expect + 180.0) % 360.0 - 180.0
            assert abs(diff) < 1e-8, (i, r.course_deg[i], expect)
    assert r.dist_m[-1] == pytest.approx(seg_start[-1], abs=1e-6)


def _max_gap_m(r: RouteSamples) -> float:
    return max(
        WGS84.Inverse(r.lat_deg[i], r.lon_deg[i], r.lat_deg[i + 1], r.lon_deg[i + 1])["s12"]
        for i in range(r.n - 1)
    )


def test_coastal_route_against_geographiclib_and_methods_values() -> None:
    """Two legs off Brittany: samples, course and distance equal [GLIB]; leg 1 length 201 323.964 m,
    departure azimuth -11.884393 (348.115607) and arrival azimuth -12.323934 [GLIB]/[B]."""
    lon = [-4.49, -5.07, -5.6]
    lat = [48.38, 50.15, 50.9]
    r = densify_route(lon, lat, 10.0)
    assert isinstance(r, RouteSamples)
    _check_against_geographiclib(r, lon, lat)
    first = r.segment_index == 0
    assert r.dist_m[np.flatnonzero(r.is_vertex)[1]] == pytest.approx(201323.964, abs=0.5e-3)
    assert r.course_deg[0] == pytest.approx(360.0 - 11.884393, abs=0.5e-6)
    assert np.count_nonzero(first) == math.ceil(201323.964 / (10 * NM))
    assert _max_gap_m(r) <= 10 * NM * (1 + 1e-12)
    np.testing.assert_array_equal(r.lon_deg[r.is_vertex], lon)
    np.testing.assert_array_equal(r.lat_deg[r.is_vertex], lat)
    # arrival azimuth of a single-leg route [B]
    one = densify_route(lon[:2], lat[:2], 10.0)
    assert one.course_deg[-1] == pytest.approx(360.0 - 12.323934, abs=0.5e-6)


def test_even_spacing_matches_pyproj_npts() -> None:
    """30 NM spacing splits the 201 km leg into 4 equal pieces; the 3 inner points equal
    [pyproj-npts] (-4.631152, 48.822821), (-4.774813, 49.265432), (-4.921066, 49.707827)."""
    r = densify_route([-4.49, -5.07], [48.38, 50.15], 30.0)
    assert r.n == 5
    inner = [(-4.631152, 48.822821), (-4.774813, 49.265432), (-4.921066, 49.707827)]
    for i, (lo, la) in enumerate(inner, start=1):
        assert r.lon_deg[i] == pytest.approx(lo, abs=0.5e-6)
        assert r.lat_deg[i] == pytest.approx(la, abs=0.5e-6)
    np.testing.assert_allclose(np.diff(r.dist_m), 201323.964 / 4, rtol=1e-8)


def test_karney_direct_example() -> None:
    """[Karney2013] Direct(40, 0, 30, 10 000 km) -> (41.79331020506, 137.84490004377), azi2
    149.09016931807: the route between these points is 10 000 km long, leaves at 30 deg and
    arrives at 149.0901693 deg."""
    r = densify_route([0.0, 137.84490004377], [40.0, 41.79331020506], 250.0)
    assert r.dist_m[-1] == pytest.approx(10_000_000.0, abs=1e-3)
    assert r.course_deg[0] == pytest.approx(30.0, abs=1e-8)
    assert r.course_deg[-1] == pytest.approx(149.09016931807, abs=1e-8)
    _check_against_geographiclib(r, [0.0, 137.84490004377], [40.0, 41.79331020506])


def test_karney_nearly_antipodal_inverse_example() -> None:
    """[Karney2013] Inverse(-30, 0, 29.9, 179.8): s12 19 989 832.827610 m, azi1 161.890524736,
    azi2 18.090737246 (nearly antipodal, the hard case of the inverse problem)."""
    r = densify_route([0.0, 179.8], [-30.0, 29.9], 500.0)
    assert r.dist_m[-1] == pytest.approx(19_989_832.827610, abs=1e-5)
    assert r.course_deg[0] == pytest.approx(161.890524736, abs=1e-8)
    assert r.course_deg[-1] == pytest.approx(18.090737246, abs=1e-8)
    assert _max_gap_m(r) <= 500 * NM * (1 + 1e-12)


def test_karney_short_line_example() -> None:
    """[Karney2013] Inverse(-30.12345, 0, -30.12344, 0.00005): s12 4.944208 m; azimuths
    77.043533541 (departure) and 77.043508448 (arrival) [GLIB]/[B]."""
    r = densify_route([0.0, 0.00005], [-30.12345, -30.12344], 1.0)
    assert r.n == 2
    assert r.dist_m[-1] == pytest.approx(4.944208, abs=0.5e-6)
    assert r.course_deg[0] == pytest.approx(77.043533541, abs=0.5e-9)
    assert r.course_deg[-1] == pytest.approx(77.043508448, abs=0.5e-9)


@pytest.mark.parametrize("lat", [0.0, 60.0, -45.0])
def test_antimeridian_route(lat: float) -> None:
    """179.5E -> 179.5W takes the 1-degree crossing of the antimeridian (not the 359-degree way);
    longitudes wrapped to [-180, 180); samples on the geodesic [GLIB]. At the equator the
    length is a*pi/180 = 111 319.491 m [B]."""
    lon, lats = [179.5, -179.5], [lat, lat]
    r = densify_route(lon, lats, 5.0)
    assert np.all((r.lon_deg >= -180.0) & (r.lon_deg < 180.0))
    assert np.all(np.abs(r.lon_deg) >= 179.5 - 1e-9)
    _check_against_geographiclib(r, lon, lats)
    if lat == 0.0:
        assert r.dist_m[-1] == pytest.approx(111319.491, abs=0.5e-3)
        np.testing.assert_allclose(r.course_deg, 90.0, atol=1e-9)
    # same route given with 180.5 instead of -179.5 (unwrapped input) gives the same samples
    r2 = densify_route([179.5, 180.5], lats, 5.0)
    np.testing.assert_allclose(r2.lon_deg, r.lon_deg, atol=1e-9)


def test_over_the_pole_and_near_polar_legs() -> None:
    """(0E, 89.5N) -> (180E, 89.5N) crosses the pole: course 0 before it, 180 after; general
    near-polar legs agree with [GLIB]."""
    r = densify_route([0.0, 180.0], [89.5, 89.5], 5.0)
    _check_against_geographiclib(r, [0.0, 180.0], [89.5, 89.5])
    assert r.dist_m[-1] == pytest.approx(WGS84.Inverse(89.5, 0.0, 89.5, 180.0)["s12"], abs=1e-6)
    before = r.lon_deg == 0.0
    assert np.all(r.course_deg[before] == pytest.approx(0.0, abs=1e-9))
    assert np.all(r.lat_deg <= 90.0)
    lon, lat = [-60.0, 100.0, 150.0], [88.7, 89.2, -89.0 + 178.0]
    r3 = densify_route(lon, lat, 3.0)
    _check_against_geographiclib(r3, lon, lat)
    assert _max_gap_m(r3) <= 3 * NM * (1 + 1e-12)


def test_meridian_degree() -> None:
    """Inverse(0, 0, 1, 0): 110 574.389 m, azimuth 0 [B]."""
    r = densify_route([0.0, 0.0], [0.0, 1.0], 100.0)
    assert r.n == 2
    assert r.dist_m[-1] == pytest.approx(110574.389, abs=0.5e-3)
    np.testing.assert_allclose(r.course_deg, 0.0, atol=1e-12)


def test_duplicates_dropped_with_warning() -> None:
    """Consecutive duplicate vertices are dropped with a warning; also lon 180 == -180."""
    with pytest.warns(UserWarning, match="duplicate"):
        r = densify_route([10.0, 10.0, 11.0, -169.0 - 180.0, 12.0], [50.0, 50.0, 50.0, 50.0, 51.0], 20.0)
    assert np.count_nonzero(r.is_vertex) == 3
    assert int(r.segment_index.max()) == 1
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        densify_route([10.0, 11.0], [50.0, 50.0], 20.0)  # no warning without duplicates


@pytest.mark.parametrize(
    "lon, lat, spacing, match",
    [
        ([10.0], [50.0], 5.0, "at least 2"),
        ([10.0, 10.0], [50.0, 50.0], 5.0, "zero length"),
        ([10.0, 370.0, 10.0], [50.0, 50.0, 50.0], 5.0, "zero length"),
        ([10.0, 11.0], [50.0, 95.0], 5.0, "lat_deg"),
        ([10.0, np.nan], [50.0, 51.0], 5.0, "lon_deg"),
        ([10.0, 11.0, 12.0], [50.0, 51.0], 5.0, "equal length"),
        ([10.0, 11.0], [50.0, 51.0], 0.0, "spacing_nm"),
        ([10.0, 11.0], [50.0, 51.0], -1.0, "spacing_nm"),
        ([10.0, 11.0], [50.0, 51.0], np.nan, "spacing_nm"),
        ([0.0, 179.0], [0.0, 0.0], 1e-5, "samples"),
    ],
)
def test_degenerate_routes(lon: list, lat: list, spacing: float, match: str) -> None:
    """Fewer than 2 distinct vertices, zero length, bad coordinates or spacing -> SeawayInputError."""
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", UserWarning)
        with pytest.raises(SeawayInputError, match=match):
            densify_route(lon, lat, spacing)


def test_wrap_lon() -> None:
    """Longitudes wrapped to [-180, 180)."""
    np.testing.assert_array_equal(wrap_lon_deg([180.0, -180.0, 540.0, 179.5, -190.0]),
                                  [-180.0, -180.0, -180.0, 179.5, 170.0])


# ---------------------------------------------------------------------------------------------
# time along the route
# ---------------------------------------------------------------------------------------------
def test_leg_duration_definition() -> None:
    """1 NM at 1 kn takes exactly 3600 s [SI]; 10 NM at 5 kn 7200 s."""
    np.testing.assert_allclose(leg_duration_s([NM, 10 * NM], [1.0, 5.0]), [3600.0, 7200.0], rtol=1e-15)
    with pytest.raises(SeawayInputError, match="speed_kn"):
        leg_duration_s(NM, 0.0)
    with pytest.raises(SeawayInputError, match="dist_m"):
        leg_duration_s(-1.0, 5.0)


def test_arrival_times_scalar_and_per_sample_speed() -> None:
    """Scalar speed: 6 NM at 6 kn = 1 h [SI]; per-sample speed applies to the stretch ending at i."""
    dist = np.array([0.0, 6 * NM, 12 * NM, 12 * NM, 15 * NM])
    t = arrival_times_utc(dist, np.datetime64("2026-03-01T06:00"), 6.0)
    assert t.dtype == np.dtype("datetime64[ms]")
    expect = np.array(["2026-03-01T06:00", "2026-03-01T07:00", "2026-03-01T08:00",
                       "2026-03-01T08:00", "2026-03-01T08:30"], dtype="datetime64[ms]")
    np.testing.assert_array_equal(t, expect)
    speeds = np.array([np.nan, 6.0, 3.0, 1.0, 2.0])  # element 0 ignored (may even be NaN)
    t2 = arrival_times_utc(dist, "2026-03-01T06:00Z", speeds)
    np.testing.assert_array_equal(
        t2, np.array(["2026-03-01T06:00", "2026-03-01T07:00", "2026-03-01T09:00",
                      "2026-03-01T09:00", "2026-03-01T10:30"], dtype="datetime64[ms]"))
    np.testing.assert_allclose(elapsed_time_s(dist, speeds), [0, 3600, 10800, 10800, 16200], rtol=1e-15)


def test_arrival_times_timezone_aware_departure() -> None:
    """A timezone-aware departure is converted to UTC; a naive one is taken as UTC."""
    aware = dt.datetime(2026, 3, 1, 8, 0, tzinfo=dt.timezone(dt.timedelta(hours=2)))
    naive = dt.datetime(2026, 3, 1, 6, 0)
    a = arrival_times_utc([0.0, NM], aware, 1.0)
    b = arrival_times_utc([0.0, NM], naive, 1.0)
    c = arrival_times_utc([0.0, NM], "2026-03-01T08:00+02:00", 1.0)
    np.testing.assert_array_equal(a, b)
    np.testing.assert_array_equal(a, c)
    assert a[1] == np.datetime64("2026-03-01T07:00", "ms")


def test_route_to_times_end_to_end() -> None:
    """Sample distances from densify_route give times consistent with distance / speed."""
    r = densify_route([-4.49, -5.07], [48.38, 50.15], 5.0)
    t = arrival_times_utc(r.dist_m, "2026-03-01T00:00", 10.0)
    hours = (t[-1] - t[0]) / np.timedelta64(1, "h")
    assert hours == pytest.approx(201323.964 / NM / 10.0, abs=1e-6)


@pytest.mark.parametrize(
    "dist, dep, speed, match",
    [
        ([0.0, 100.0], "2026-03-01T00:00", 0.0, "speed_kn"),
        ([0.0, 100.0], "2026-03-01T00:00", -3.0, "speed_kn"),
        ([0.0, 100.0], "2026-03-01T00:00", [5.0, 0.0], "speed_kn"),
        ([0.0, 100.0], "2026-03-01T00:00", [5.0, np.nan], "speed_kn"),
        ([0.0, 100.0], "2026-03-01T00:00", [5.0, 5.0, 5.0], "one value per sample"),
        ([0.0, 100.0, 50.0], "2026-03-01T00:00", 5.0, "non-decreasing"),
        ([0.0, np.nan], "2026-03-01T00:00", 5.0, "dist_m"),
        ([[0.0, 1.0]], "2026-03-01T00:00", 5.0, "1-D"),
        ([0.0, 100.0], "yesterday", 5.0, "departure_utc"),
        ([0.0, 100.0], "NaT", 5.0, "departure_utc"),
        ([0.0, 1e9], "2026-03-01T00:00", 1e-12, "overflow"),
    ],
)
def test_arrival_times_bad_input(dist: list, dep: str, speed: object, match: str) -> None:
    """Speed <= 0, decreasing or non-finite distances, bad departure -> SeawayInputError."""
    with pytest.raises(SeawayInputError, match=match):
        arrival_times_utc(dist, dep, speed)  # type: ignore[arg-type]
