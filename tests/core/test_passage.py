# SPDX-License-Identifier: GPL-2.0-or-later
"""The passage pipeline on uniform sea fields written by GDAL in the test.

What each check is compared with (named beside it):
* geographiclib 2.x (``Geodesic.WGS84``, Karney 2013 algorithms) for distances and arrival times;
* the deep-water Airy relations L0 = g T^2 / (2 pi), c0 = g T / (2 pi) (USACE Shore Protection
  Manual 1984 ch. 2) and omega_e = omega - omega^2 U cos(mu) / g (Lewis (ed.) 1989, PNA vol. III
  ch. 8), written out here independently of the core;
* the ITTC relative-heading convention mu = (wave_from + 180 - course) mod 360 (0 following,
  90 beam, 180 head; methods table in the project reference, from the ITTC symbols list);
* ISO 2631-1:1997 Annex D, steady motion: MSDV = a_w,rms * sqrt(T);
* the core's own modules (dispersion, heading, api) called directly: the pipeline must not
  change their numbers (their formulas are checked against published values in their tests).
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from geographiclib.geodesic import Geodesic

from seaway_comfort.processing.core.passage import pipeline as passage
from seaway_comfort.processing.core.flags import SampleFlag
from seaway_comfort.processing.core.seastate import open_bathymetry, open_sea_state
from seaway_comfort.processing.core.demo.writers import write_bathymetry_geotiff, write_cf_netcdf
from seaway_comfort.processing.core.units import G_STANDARD_M_S2, KNOT_M_S
from seaway_comfort.processing.core.validation import SeawayInputError
from seaway_comfort.processing.core.vessel.profile import resolve_vessel

HS = "sea_surface_wave_significant_height"
TP = "sea_surface_wave_period_at_variance_spectral_density_maximum"
DIR = "sea_surface_wave_from_direction"
T0 = np.datetime64("2030-06-01T00:00", "ms")
STEPS = 9  # 0..24 h, three-hourly
TIMES = T0 + np.arange(STEPS) * np.timedelta64(3, "h")
HS_M, TP_S, FROM_DEG = 2.0, 8.0, 0.0  # uniform sea from the north


def _uniform(lon, lat, value):
    return np.full((STEPS, lat.size, lon.size), float(value))


@pytest.fixture(scope="module")
def uniform_source(tmp_path_factory):
    """A uniform sea (Hs 2 m, Tp 8 s, from 0 deg) on -10..10 E, -10..20 N for 24 h."""
    folder = tmp_path_factory.mktemp("uniform")
    lon = np.arange(-10.0, 10.01, 0.5)
    lat = np.arange(-10.0, 20.01, 0.5)
    path = str(folder / "uniform.nc")
    write_cf_netcdf(path, lon, lat, TIMES, {
        HS: _uniform(lon, lat, HS_M), TP: _uniform(lon, lat, TP_S), DIR: _uniform(lon, lat, FROM_DEG),
    })
    src = open_sea_state(path, source_name="uniform test sea")
    yield src
    src.close()


@pytest.fixture(scope="module")
def global_ring_source(tmp_path_factory):
    """The same uniform sea on a 0..359 E ring (longitudes across the antimeridian)."""
    folder = tmp_path_factory.mktemp("ring")
    lon = np.arange(0.0, 360.0, 1.0)
    lat = np.arange(-10.0, 10.01, 1.0)
    path = str(folder / "ring.nc")
    write_cf_netcdf(path, lon, lat, TIMES, {
        HS: _uniform(lon, lat, HS_M), TP: _uniform(lon, lat, TP_S), DIR: _uniform(lon, lat, 90.0),
    })
    src = open_sea_state(path)
    yield src
    src.close()


@pytest.fixture(scope="module")
def profile():
    return resolve_vessel("coastal_survey_35m")


def _run(src, profile, lon, lat, *, speed_kn=10.0, departure=T0, **kw):
    return passage.compute_passage(
        lon, lat, departure_utc=departure, speed_kn=speed_kn, sea_states=[src], profile=profile, **kw
    )


def _ittc_mu(course_deg, from_deg):
    # ITTC convention: mu = (wave_from + 180 - course) mod 360, 0 following, 180 head
    return np.mod(np.asarray(from_deg) + 180.0 - np.asarray(course_deg), 360.0)


@pytest.mark.parametrize(
    "name, lon, lat, mu_expected",
    [
        # course north into a sea from the north: head seas (ITTC mu = 180)
        ("head", [0.0, 0.0], [0.0, 1.0], 180.0),
        # course south, sea from the north: following seas (mu = 0)
        ("following", [0.0, 0.0], [1.0, 0.0], 0.0),
        # course east along the equator, sea from the north: beam seas, waves from port (mu = 90)
        ("beam", [0.0, 1.0], [0.0, 0.0], 90.0),
    ],
)
def test_heading_cases_match_ittc_and_deep_water_encounter(uniform_source, profile, name, lon, lat, mu_expected):
    r = _run(uniform_source, profile, lon, lat, speed_kn=10.0, spacing_nm=5.0)
    assert r.computed.all(), r.flag_text()
    # ITTC relative heading convention (see module docstring)
    np.testing.assert_allclose(r.rel_heading_deg, _ittc_mu(r.course_deg, FROM_DEG), atol=1e-9)
    fold = 180.0 - np.abs(180.0 - np.mod(r.rel_heading_deg, 360.0))
    np.testing.assert_allclose(fold, mu_expected, atol=1e-6)
    # Airy deep-water wavelength and celerity (SPM 1984 ch. 2): L0 = g T^2/2pi, c0 = g T/2pi
    g = G_STANDARD_M_S2
    np.testing.assert_allclose(r.wavelength_m, g * TP_S**2 / (2 * math.pi), rtol=1e-10)
    np.testing.assert_allclose(r.celerity_m_s, g * TP_S / (2 * math.pi), rtol=1e-10)
    # encounter frequency in deep water (PNA vol. III ch. 8): omega_e = omega - omega^2 U cos(mu)/g
    omega = 2 * math.pi / TP_S
    u = 10.0 * KNOT_M_S
    omega_e = omega - omega**2 * u * np.cos(np.radians(r.rel_heading_deg)) / g
    np.testing.assert_allclose(r.enc_period_s, 2 * math.pi / np.abs(omega_e), rtol=1e-9)
    assert not np.any(r.flags & int(SampleFlag.OVERTAKING))


def test_head_seas_value_from_encounter_table(uniform_source, profile):
    """Deep water T 8 s, U 10 kn, head seas: Te = 5.6657 s (PNA vol. III ch. 8 deep-water
    encounter frequency, by hand: omega = 2 pi/8 = 0.785398 rad/s, U = 10 x 1852/3600 =
    5.144444 m/s, omega_e = omega + omega^2 U/g = 0.785398 + 0.323592 = 1.108990 rad/s,
    Te = 2 pi/omega_e = 5.6657 s, g = 9.80665)."""
    w = 2 * math.pi / 8.0
    assert 2 * math.pi / (w + w * w * (10 * 1852 / 3600) / 9.80665) == pytest.approx(5.6657, abs=5e-5)
    r = _run(uniform_source, profile, [0.0, 0.0], [0.0, 0.5], speed_kn=10.0, spacing_nm=10.0)
    np.testing.assert_allclose(r.enc_period_s, 5.6657, atol=5e-5)


def test_pipeline_keeps_core_numbers(uniform_source, profile):
    """Wavelength, heading, encounter and motions equal the core functions called directly."""
    from seaway_comfort.processing.core.api import assess_motions
    from seaway_comfort.processing.core.waves.dispersion import wave_kinematics
    from seaway_comfort.processing.core.waves.encounter import (
        encounter_period,
        relative_heading_deg,
    )

    r = _run(uniform_source, profile, [0.0, 0.5, 0.5], [0.0, 0.3, 0.8], speed_kn=8.0, spacing_nm=3.0)
    assert r.computed.all()
    n = r.n
    kin = wave_kinematics(np.full(n, TP_S))
    np.testing.assert_allclose(r.wavelength_m, kin.wavelength_m)
    rel = relative_heading_deg(r.course_deg, np.full(n, FROM_DEG))
    np.testing.assert_allclose(r.rel_heading_deg, rel)
    ep = encounter_period(np.full(n, TP_S), np.full(n, 8.0 * KNOT_M_S), rel)
    np.testing.assert_allclose(r.enc_period_s, np.where(ep.overtaking, np.nan, ep.period_s))
    direct = assess_motions(
        profile, hs_m=np.full(n, HS_M), tp_s=np.full(n, TP_S), wave_from_deg=np.full(n, FROM_DEG),
        course_deg=r.course_deg, speed_m_s=np.full(n, 8.0 * KNOT_M_S), spread_s=4.0,
    )
    for field in ("heave_rms_m", "pitch_rms_deg", "roll_rms_deg", "vacc_rms_m_s2", "lacc_rms_m_s2", "msi_pct"):
        np.testing.assert_allclose(getattr(r, field), getattr(direct, field), rtol=1e-12, err_msg=field)
    np.testing.assert_array_equal(r.comfort_class, direct.comfort_class)


def test_arrival_times_follow_geodesic_distance(uniform_source, profile):
    """ETA at each vertex = cumulative WGS84 geodesic length / speed (geographiclib Inverse)."""
    lon = [-3.0, 1.5, 4.0, 4.2]
    lat = [2.0, 6.0, 5.0, 12.0]
    speed = 12.5
    r = _run(uniform_source, profile, lon, lat, speed_kn=speed, spacing_nm=2.0)
    s = [0.0]
    for i in range(3):
        s.append(s[-1] + Geodesic.WGS84.Inverse(lat[i], lon[i], lat[i + 1], lon[i + 1])["s12"])
    vert = np.flatnonzero(r.is_vertex)
    assert vert.size == 4
    elapsed_s = (r.eta_utc[vert] - T0).astype("timedelta64[ms]").astype(float) / 1000.0
    np.testing.assert_allclose(elapsed_s, np.array(s) / (speed * KNOT_M_S), atol=2e-3)
    np.testing.assert_allclose(r.dist_nm[vert], np.array(s) / 1852.0, atol=1e-6)
    # the hours in all classes add up to the passage duration
    assert sum(r.hours_per_class().values()) == pytest.approx(elapsed_s[-1] / 3600.0, rel=1e-12)


def test_route_across_the_antimeridian(global_ring_source, profile):
    """179.5 E -> 179.5 W on the equator is the short way: 1 deg of equator (geographiclib)."""
    r = _run(global_ring_source, profile, [179.5, -179.5], [0.0, 0.0], speed_kn=10.0, spacing_nm=5.0)
    s12 = Geodesic.WGS84.Inverse(0.0, 179.5, 0.0, -179.5)["s12"]
    assert r.dist_nm[-1] * 1852.0 == pytest.approx(s12, abs=1e-3)
    assert r.computed.all(), r.flag_text()
    # course east, sea from the east: head seas everywhere (ITTC mu = 180)
    np.testing.assert_allclose(r.rel_heading_deg, _ittc_mu(r.course_deg, 90.0), atol=1e-9)
    np.testing.assert_allclose(180.0 - np.abs(180.0 - r.rel_heading_deg), 180.0, atol=1e-6)


def test_flagged_samples_are_kept_with_nan(uniform_source, profile):
    """Leaving the grid (east of 10 E) and outliving the forecast (after 24 h) keeps the samples,
    NaN motions, class -1 and the flags (never zeros, never dropped)."""
    r = _run(uniform_source, profile, [8.0, 12.0], [0.0, 0.0], speed_kn=10.0, spacing_nm=2.0)
    lon = r.lon_deg
    off = lon > 10.0 + 0.25 + 1e-9
    assert off.any() and (~off).any()
    assert np.all(r.flags[off] & int(SampleFlag.OUTSIDE_GRID))
    assert np.all(np.isnan(r.heave_rms_m[off])) and np.all(np.isnan(r.msdv_cum[off]))
    assert np.all(r.comfort_class[off] == passage.NOT_COMPUTED_CLASS)
    assert all(label == "" for label, o in zip(r.comfort_label, off) if o)
    assert np.all(np.isfinite(r.heave_rms_m[lon < 9.5]))
    # a slow passage beyond the forecast end (24 h): 3 kn over 240 NM takes 80 h
    slow = _run(uniform_source, profile, [0.0, 0.0], [0.0, 4.0], speed_kn=3.0, spacing_nm=5.0)
    late = (slow.eta_utc - TIMES[-1]) > np.timedelta64(1800, "s")
    assert late.any()
    assert np.all(slow.flags[late] & int(SampleFlag.OUTSIDE_TIME))
    assert np.all(np.isnan(slow.vacc_rms_m_s2[late]))
    assert slow.n == late.size


def test_msdv_steady_motion_iso2631(uniform_source, profile):
    """Uniform sea, straight leg: MSDV at arrival = a_w,rms * sqrt(T) (ISO 2631-1 Annex D)."""
    from seaway_comfort.processing.core.comfort.indices import vomiting_share_pct

    r = _run(uniform_source, profile, [0.0, 0.0], [0.0, 1.5], speed_kn=10.0, spacing_nm=1.0)
    aw = r.vacc_wf_rms_m_s2
    assert np.ptp(aw) < 1e-9 * max(aw[0], 1e-12) + 1e-12
    t_s = (r.eta_utc[-1] - r.eta_utc[0]).astype("timedelta64[ms]").astype(float) / 1000.0
    assert r.msdv_cum[-1] == pytest.approx(aw[0] * math.sqrt(t_s), rel=1e-9)
    assert r.msdv_cum[0] == 0.0
    # ISO 2631-1 Annex D: share who may vomit = MSDV / 3 (Km = 1/3), via the core function
    np.testing.assert_allclose(r.vomit_pct, vomiting_share_pct(r.msdv_cum))


def test_shallow_bathymetry_changes_wavelength(tmp_path, uniform_source, profile):
    """Depth 10 m, T 8 s: L = 70.883 m, c = 8.8604 m/s (Airy dispersion omega^2 = g k tanh(kh),
    Dean & Dalrymple 1991 ch. 3, solved here by scipy.optimize.brentq, g = 9.80665)."""
    from scipy.optimize import brentq
    w = 2 * math.pi / 8.0
    k = brentq(lambda kk: 9.80665 * kk * math.tanh(kk * 10.0) - w * w, 1e-6, 10.0, xtol=1e-15)
    assert 2 * math.pi / k == pytest.approx(70.883, abs=5e-4) and w / k == pytest.approx(8.8604, abs=5e-5)
    lon = np.arange(-10.0, 10.01, 0.5)
    lat = np.arange(-10.0, 20.01, 0.5)
    tif = str(tmp_path / "depth10.tif")
    write_bathymetry_geotiff(tif, lon, lat, np.full((lat.size, lon.size), 10.0), convention="depth_positive_down")
    bathy = open_bathymetry(tif, convention="depth_positive_down")
    r = _run(uniform_source, profile, [0.0, 0.0], [0.0, 0.2], speed_kn=5.0, spacing_nm=5.0, depth=bathy)
    np.testing.assert_allclose(r.depth_m, 10.0, rtol=1e-6)
    np.testing.assert_allclose(r.wavelength_m, 70.883, atol=5e-4)
    np.testing.assert_allclose(r.celerity_m_s, 8.8604, atol=5e-5)
    assert not np.any(r.flags & int(SampleFlag.DEPTH_ASSUMED_DEEP))
    deep = _run(uniform_source, profile, [0.0, 0.0], [0.0, 0.2], speed_kn=5.0, spacing_nm=5.0)
    assert np.all(deep.flags & int(SampleFlag.DEPTH_ASSUMED_DEEP))
    assert np.all(np.isnan(deep.depth_m))


def test_overtaking_gives_nan_encounter_period(uniform_source, profile):
    """Following seas faster than the crests (c0 = 12.49 m/s at 8 s, SPM deep water): 30 kn."""
    r = _run(uniform_source, profile, [0.0, 0.0], [1.0, 0.0], speed_kn=30.0, spacing_nm=10.0)
    assert np.all(r.flags & int(SampleFlag.OVERTAKING))
    assert np.all(np.isnan(r.enc_period_s))
    assert np.all(np.isfinite(r.wavelength_m))


def test_departure_outside_forecast_is_an_error(uniform_source, profile):
    with pytest.raises(SeawayInputError, match="departure_utc"):
        _run(uniform_source, profile, [0.0, 0.0], [0.0, 1.0], departure=T0 + np.timedelta64(5, "D"))


@pytest.mark.parametrize(
    "kwargs, pattern",
    [
        ({"speed_kn": 0.0}, "speed_kn"),
        ({"speed_kn": -3.0}, "speed_kn"),
        ({"spacing_nm": 0.0}, "spacing_nm"),
        ({"departure": "not a date"}, "departure_utc"),
    ],
)
def test_bad_input_names_the_argument(uniform_source, profile, kwargs, pattern):
    with pytest.raises(SeawayInputError, match=pattern):
        _run(uniform_source, profile, [0.0, 0.0], [0.0, 1.0], **kwargs)


def test_zero_length_leg_is_an_error(uniform_source, profile):
    with pytest.raises(SeawayInputError):
        _run(uniform_source, profile, [1.0, 1.0], [2.0, 2.0])


def test_cancel_stops_with_passage_cancelled(uniform_source, profile):
    calls = []

    def progress(f):
        calls.append(f)
        return len(calls) < 3

    with pytest.raises(passage.PassageCancelled):
        _run(uniform_source, profile, [0.0, 0.0], [0.0, 2.0], spacing_nm=0.5, progress=progress)
    assert all(0.0 <= f <= 1.0 for f in calls)


def test_progress_is_monotone_and_reaches_one(uniform_source, profile):
    seen = []
    _run(uniform_source, profile, [0.0, 0.0], [0.0, 2.0], progress=lambda f: seen.append(f) or True)
    assert seen[-1] == pytest.approx(1.0)
    assert all(b >= a - 1e-12 for a, b in zip(seen, seen[1:]))


def test_plan_with_departure_shifts_times_only(profile):
    """Departure sweeps reuse the geometry: same samples, times shifted by the difference."""
    plan = passage.plan_passage([0.0, 1.0], [0.0, 1.0], departure_utc=T0, speed_kn=7.0, spacing_nm=3.0)
    later = plan.with_departure("2030-06-01T06:00:00Z")
    np.testing.assert_array_equal(later.lon_deg, plan.lon_deg)
    assert np.all(later.eta_utc - plan.eta_utc == np.timedelta64(6 * 3600 * 1000, "ms"))


def test_first_valid_source_fallback(tmp_path, uniform_source, profile):
    """Two sources: the second fills samples outside the first one's grid; 'source' says which."""
    lon = np.arange(9.0, 20.01, 0.5)
    lat = np.arange(-10.0, 20.01, 0.5)
    path = str(tmp_path / "east.nc")
    write_cf_netcdf(path, lon, lat, TIMES, {
        HS: _uniform(lon, lat, 3.0), TP: _uniform(lon, lat, 9.0), DIR: _uniform(lon, lat, 0.0),
    })
    east = open_sea_state(path, source_name="east sea")
    try:
        r = passage.compute_passage([8.0, 12.0], [0.0, 0.0], departure_utc=T0, speed_kn=10.0,
                                    sea_states=[uniform_source, east], profile=profile, spacing_nm=2.0)
    finally:
        east.close()
    assert r.computed.all()
    west = r.lon_deg < 10.0
    assert set(np.array(r.source)[west]) == {"uniform test sea"}
    assert set(np.array(r.source)[r.lon_deg > 10.3]) == {"east sea"}
    np.testing.assert_allclose(r.hs_m[r.lon_deg > 10.3], 3.0, rtol=1e-6)


def test_summary_helpers(uniform_source, profile):
    r = _run(uniform_source, profile, [0.0, 0.0], [0.0, 1.0], spacing_nm=1.0)
    s = r.summary()
    assert s.n_samples == r.n and s.n_computed == r.n
    assert s.worst_index is not None and r.comfort_class[s.worst_index] == r.comfort_class.max()
    assert s.flag_counts == r.flag_counts()
    assert s.distance_nm == pytest.approx(Geodesic.WGS84.Inverse(0, 0, 1, 0)["s12"] / 1852.0, abs=1e-6)


def test_partitions_reach_the_response(tmp_path, profile):
    """Wind sea + swell partitions go to the response as SeaPartitions (api called directly
    gives the same numbers; the swell with the swell spreading s = 13 of DNV-RP-C205's
    n >= 6, waves.spectra.SWELL_SPREAD_S); a partition missing at a cell counts as absent (Hs 0, the api's
    convention), never as a NaN sample."""
    from seaway_comfort.processing.core.api import SeaPartitions, assess_motions

    lon = np.arange(-2.0, 2.01, 0.5)
    lat = np.arange(-2.0, 2.01, 0.5)
    shape = (STEPS, lat.size, lon.size)
    wind_hs = np.full(shape, 1.0)
    wind_hs[:, :, lon < 0] = np.nan  # no wind sea west of 0 E
    fields = {
        HS: np.full(shape, math.sqrt(1.0 + 1.5**2)), TP: np.full(shape, 11.0), DIR: np.zeros(shape),
        "sea_surface_wind_wave_significant_height": wind_hs,
        "sea_surface_wind_wave_period_at_variance_spectral_density_maximum": np.full(shape, 5.0),
        "sea_surface_wind_wave_from_direction": np.full(shape, 90.0),
        "sea_surface_primary_swell_wave_significant_height": np.full(shape, 1.5),
        "sea_surface_primary_swell_wave_period_at_variance_spectral_density_maximum": np.full(shape, 11.0),
        "sea_surface_primary_swell_wave_from_direction": np.zeros(shape),
    }
    path = str(tmp_path / "parts.nc")
    write_cf_netcdf(path, lon, lat, TIMES, fields)
    src = open_sea_state(path)
    try:
        r = passage.compute_passage([-1.0, 1.0], [0.5, 0.5], departure_utc=T0, speed_kn=8.0, sea_states=[src],
                                    profile=profile, spacing_nm=10.0, gamma=2.0, spread_s=5.0)
    finally:
        src.close()
    assert r.computed.all(), r.flag_text()
    assert r.partition_names == ("wind", "swell1")
    n = r.n
    east = r.lon_deg > 0.01
    west = r.lon_deg < -0.51  # bilinear weights reach one cell (0.5 deg) into the gap
    assert east.any() and west.any()
    p_hs = np.column_stack([np.where(r.lon_deg > 0.0, 1.0, 0.0), np.full(n, 1.5)])
    keep = east | west  # leave out samples whose interpolation cells straddle the wind-sea edge
    parts = SeaPartitions(hs_m=p_hs[keep], tp_s=np.column_stack([np.full(n, 5.0), np.full(n, 11.0)])[keep],
                          wave_from_deg=np.column_stack([np.full(n, 90.0), np.zeros(n)])[keep],
                          gamma=np.array([2.0, 2.0]), spread_s=np.array([5.0, 13.0]), names=("wind", "swell1"))
    direct = assess_motions(profile, course_deg=r.course_deg[keep], speed_m_s=np.full(keep.sum(), 8.0 * KNOT_M_S),
                            partitions=parts)
    for field in ("heave_rms_m", "roll_rms_deg", "vacc_rms_m_s2", "msi_pct"):
        np.testing.assert_allclose(getattr(r, field)[keep], getattr(direct, field), rtol=1e-9, err_msg=field)
    # the peak-component kinematics use the combined Tp (11 s, deep water: L0 = g T^2 / 2 pi)
    np.testing.assert_allclose(r.wavelength_m, G_STANDARD_M_S2 * 11.0**2 / (2 * math.pi), rtol=1e-9)


def test_flat_calm_is_a_value_not_missing(tmp_path, profile):
    """Hs = 0 in the forecast: zero response as the api gives it (linear theory: response
    variance scales with Hs^2), class 0, not a NaN sample."""
    from seaway_comfort.processing.core.api import assess_motions

    lon = np.arange(-2.0, 2.01, 0.5)
    lat = np.arange(-2.0, 2.01, 0.5)
    shape = (STEPS, lat.size, lon.size)
    path = str(tmp_path / "calm.nc")
    write_cf_netcdf(path, lon, lat, TIMES, {HS: np.zeros(shape), TP: np.full(shape, 6.0), DIR: np.zeros(shape)})
    src = open_sea_state(path)
    try:
        r = _run(src, profile, [0.0, 0.0], [0.0, 0.3], spacing_nm=6.0)
    finally:
        src.close()
    assert r.computed.all()
    direct = assess_motions(profile, hs_m=np.zeros(r.n), tp_s=np.full(r.n, 6.0), wave_from_deg=np.zeros(r.n),
                            course_deg=r.course_deg, speed_m_s=np.full(r.n, 10.0 * KNOT_M_S))
    np.testing.assert_array_equal(r.heave_rms_m, direct.heave_rms_m)
    np.testing.assert_array_equal(r.comfort_class, direct.comfort_class)
    assert np.all(r.heave_rms_m == 0.0) and np.all(r.msdv_cum == 0.0)
