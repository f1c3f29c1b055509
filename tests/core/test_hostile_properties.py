# SPDX-License-Identifier: GPL-2.0-or-later
"""Property tests (hypothesis) over the core's public functions with hostile inputs.

For any input, each function either returns or raises SeawayInputError (our input error, whose
message names the argument); it never raises anything else, never returns NaN where it promises
a value, and its outputs stay within physical bounds:
  [RMS]   RMS motions and accelerations are >= 0 (square roots of spectral moments);
  [MSI]   motion sickness incidence is a percentage in [0, 100] (O'Hanlon & McCauley 1974);
  [CLASS] comfort classes are 0..4;
  [GEO]   samples lie on the WGS84 ellipsoid (|lat| <= 90, lon in [-180, 180)) and cumulative
          distances never decrease; geographiclib 2.x (reference library) gives the same total;
  [WAIT]  waiting times: a start whose wait meets missing data before an acceptable departure
          is censored; the rest equal a brute-force scan written here; chunking changes nothing.
"""
from __future__ import annotations

import warnings

import numpy as np
import pytest
from geographiclib.geodesic import Geodesic
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from seaway_comfort.processing.core.api import assess_motions
from seaway_comfort.processing.core.climate.windows import merge_waits, waiting_partial
from seaway_comfort.processing.core.demo.writers import write_cf_netcdf
from seaway_comfort.processing.core.motions.closed_form import ClosedFormTransfer
from seaway_comfort.processing.core.motions.response import motion_response
from seaway_comfort.processing.core.passage.plan import plan_passage
from seaway_comfort.processing.core.passage.route import densify_route
from seaway_comfort.processing.core.seastate import open_sea_state
from seaway_comfort.processing.core.validation import SeawayInputError
from seaway_comfort.processing.core.vessel.profile import builtin_profile

FAST = settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
ANY_FLOAT = st.one_of(st.floats(allow_nan=True, allow_infinity=True), st.sampled_from([0.0, -1.0, 1e308, 1e-308]))
SEA_FLOAT = st.floats(min_value=-5.0, max_value=60.0, allow_nan=False)
BOAT = builtin_profile("harbour_workboat_12m")


def _call(fn, *a, **kw):
    """fn's result, or None when it raised our input error (any other exception fails)."""
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        try:
            return fn(*a, **kw)
        except SeawayInputError as exc:
            assert str(exc)  # a message, naming something
            return None


@FAST
@given(hs=st.lists(ANY_FLOAT, min_size=1, max_size=4), tp=ANY_FLOAT, wdir=ANY_FLOAT, course=ANY_FLOAT,
       speed=ANY_FLOAT, depth=st.one_of(st.none(), ANY_FLOAT))
def test_assess_motions_never_breaks_its_promises(hs, tp, wdir, course, speed, depth):
    r = _call(assess_motions, BOAT, hs_m=hs, tp_s=tp, wave_from_deg=wdir, course_deg=course, speed_m_s=speed,
              depth_m=depth, n_freq=16, n_dir=8)
    if r is None:
        return
    for name in ("heave_rms_m", "pitch_rms_deg", "roll_rms_deg", "vacc_rms_m_s2", "lacc_rms_m_s2"):
        v = getattr(r, name)
        assert np.all(np.isfinite(v)) and np.all(v >= 0), name  # [RMS]
    assert np.all((r.msi_pct >= 0) & (r.msi_pct <= 100))  # [MSI]
    assert set(np.unique(r.comfort_class)) <= {0, 1, 2, 3, 4}  # [CLASS]


@FAST
@given(hs=SEA_FLOAT, tp=SEA_FLOAT, speed=st.floats(min_value=-1.0, max_value=30.0), mu=st.floats(-720, 720))
def test_motion_response_is_finite_and_non_negative(hs, tp, speed, mu):
    tr = ClosedFormTransfer.from_profile(BOAT)
    r = _call(motion_response, tr, BOAT.stations[:1], hs_m=[hs], tp_s=[tp], wave_from_deg=[mu], course_deg=[0.0],
              speed_m_s=[speed], n_freq=16, n_dir=8)
    if r is None:
        return
    for name in ("heave_rms_m", "vacc_rms_m_s2", "lacc_rms_m_s2"):
        v = getattr(r, name)
        assert np.all(np.isfinite(v)) and np.all(v >= 0), name  # [RMS]


COORD = st.one_of(st.floats(min_value=-200, max_value=200), st.sampled_from([float("nan"), float("inf"), 90.0, -90.0]))


@FAST
@given(lon=st.lists(COORD, min_size=0, max_size=5), lat=st.lists(COORD, min_size=0, max_size=5),
       spacing=st.one_of(st.floats(min_value=0.5, max_value=200.0), ANY_FLOAT))
def test_route_densify_and_plan(lon, lat, spacing):
    s = _call(densify_route, lon, lat, spacing)
    if s is None:
        return
    assert np.all(np.isfinite(s.lon_deg)) and np.all(np.isfinite(s.lat_deg)) and np.all(np.isfinite(s.dist_m))
    assert np.all(np.abs(s.lat_deg) <= 90) and np.all((s.lon_deg >= -180) & (s.lon_deg < 180))  # [GEO]
    assert np.all(np.diff(s.dist_m) >= 0)
    total = sum(Geodesic.WGS84.Inverse(s.lat_deg[i], s.lon_deg[i], s.lat_deg[i + 1], s.lon_deg[i + 1])["s12"]
                for i in range(s.n - 1))
    assert s.dist_m[-1] == pytest.approx(total, rel=1e-6, abs=1e-3)
    p = _call(plan_passage, lon, lat, departure_utc="2030-06-01T00:00Z", speed_kn=8.0, spacing_nm=spacing)
    if p is not None:
        assert np.all(np.diff(p.eta_utc.astype("int64")) >= 0)


@pytest.fixture(scope="module")
def small_sea(tmp_path_factory):
    lon, lat = np.arange(-2.0, 2.01, 0.5), np.arange(-2.0, 2.01, 0.5)
    t = np.datetime64("2030-06-01T00:00", "ms") + np.arange(3) * np.timedelta64(3, "h")
    shape = (t.size, lat.size, lon.size)
    hs = np.full(shape, 1.2)
    hs[:, 3:5, 3:5] = np.nan  # an island
    path = str(tmp_path_factory.mktemp("sea") / "sea.nc")
    write_cf_netcdf(path, lon, lat, t, {"sea_surface_wave_significant_height": hs,
                                        "sea_surface_wave_period_at_variance_spectral_density_maximum": np.full(shape, 7.0),
                                        "sea_surface_wave_from_direction": np.full(shape, 45.0)})
    src = open_sea_state(path)
    yield src
    src.close()


@FAST
@given(lon=st.lists(COORD, min_size=1, max_size=4), lat=st.floats(min_value=-3, max_value=3),
       hours=st.one_of(st.floats(min_value=-10, max_value=20), st.just(float("nan"))))
def test_sampler_values_or_flags(small_sea, lon, lat, hours):
    t0 = np.datetime64("2030-06-01T00:00", "ms")
    when = t0 + np.timedelta64(int(hours * 3600e3), "ms") if np.isfinite(hours) else "not a time"
    r = _call(small_sea.sample, lon, [lat] * len(lon), when)
    if r is None:
        return
    ok = np.asarray(r.valid, dtype=bool)
    assert np.all(np.isfinite(r.hs_m[ok])) and np.all(r.hs_m[ok] >= 0)
    assert np.all(np.asarray(r.flags)[~ok] != 0)  # a sample without values always says why


def _brute_waits(ok, known, months):
    """Per month: (sum of waits, count, censored), scanning forward from every start."""
    s, c, z = np.zeros(12, int), np.zeros(12, int), np.zeros(12, int)
    for j in range(ok.size):
        for k in range(j, ok.size):
            if not known[k]:
                z[months[j]] += 1
                break
            if ok[k]:
                s[months[j]] += k - j
                c[months[j]] += 1
                break
        else:
            z[months[j]] += 1
    return s, c, z


@settings(max_examples=60, deadline=None)
@given(data=st.lists(st.tuples(st.booleans(), st.booleans()), min_size=1, max_size=40),
       cut=st.integers(min_value=1, max_value=39), m0=st.integers(0, 11))
def test_waits_censor_at_missing_data_and_do_not_depend_on_chunks(data, cut, m0):
    ok = np.array([a and k for a, k in data])
    known = np.array([k for _, k in data])
    months = (m0 + np.arange(ok.size) // 7) % 12
    want = _brute_waits(ok, known, months)
    whole = merge_waits([waiting_partial(ok, months, 0, known=known)])
    cut = min(cut, ok.size)
    parts = [waiting_partial(ok[:cut], months[:cut], 0, known=known[:cut]),
             waiting_partial(ok[cut:], months[cut:], cut, known=known[cut:])]
    split = merge_waits(parts)
    for got in (whole, split):
        np.testing.assert_array_equal(got.sum_steps, want[0])
        np.testing.assert_array_equal(got.count, want[1])
        np.testing.assert_array_equal(got.censored, want[2])
