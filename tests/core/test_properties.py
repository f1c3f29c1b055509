# SPDX-License-Identifier: GPL-2.0-or-later
"""Property tests (hypothesis) of the wave-physics core and the route geodesy.

Each property is a consequence of the theory named beside it, checked on random inputs:
  [Airy]    omega^2 = g k tanh(kh): L increases with T at fixed h; c -> sqrt(g h) as kh -> 0;
            c < min(sqrt(g h), c0) (tanh x < min(x, 1)); SPM 1984 ch. 2, Dean & Dalrymple 1991 ch. 3.
  [PNA1989] omega_e = omega - k U cos(mu): equals omega at U = 0 (Lewis 1989, PNA vol. III ch. 8).
  [ITTC]    mu = (from + 180 - course) mod 360; mirror images port/starboard fold to one value.
  [GLIB]    geographiclib 2.1 (reference library): consecutive samples no further apart than the
            spacing, and the route length equals the sum of the vertex-to-vertex geodesics.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from geographiclib.geodesic import Geodesic
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from seaway_comfort.processing.core.waves.dispersion import (
    solve_kh,
    wave_kinematics,
    wavelength_m,
    wavenumber_rad_m,
)
from seaway_comfort.processing.core.waves.encounter import (
    encounter_frequency_rad_s,
    encounter_period,
    fold_heading_deg,
    relative_heading_deg,
)
from seaway_comfort.processing.core.passage.route import densify_route
from seaway_comfort.processing.core.waves.spectra import (
    direction_grid,
    frequency_grid_rad_s,
    jonswap_s_m2_s_rad,
    significant_wave_height_m,
)

G = 9.80665
periods = st.floats(min_value=0.5, max_value=40.0)
depths = st.floats(min_value=0.1, max_value=6000.0)
angles = st.floats(min_value=-720.0, max_value=720.0)
FAST = settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])


@FAST
@given(st.lists(periods, min_size=2, max_size=20, unique=True), depths)
def test_wavelength_increases_with_period(ts: list, depth: float) -> None:
    """[Airy] At fixed depth, L increases with T (dL/dT > 0 from omega^2 = g k tanh kh).

    In floating point two periods a few ulps apart can give the same L, so the property is
    stated as: never decreasing (to rounding), and strictly increasing wherever the periods
    differ by more than 1e-9 relative (the solver's own tolerance is far below that).
    """
    t = np.sort(np.array(ts))
    length = wavelength_m(t, depth)
    step = np.diff(length)
    assert np.all(step >= -1e-12 * length[1:])
    distinct = np.diff(t) > 1e-9 * t[1:]
    assert np.all(step[distinct] > 0)


@FAST
@given(periods, depths)
def test_celerity_bounds(period: float, depth: float) -> None:
    """[Airy] c <= sqrt(g h) and c <= c0 = g T / (2 pi); c_g <= c; residual of the relation tiny."""
    kin = wave_kinematics(period, depth, g_m_s2=G)
    c = float(kin.celerity_m_s)
    assert c <= math.sqrt(G * depth) * (1 + 1e-14)
    assert c <= G * period / (2 * math.pi) * (1 + 1e-14)
    assert float(kin.group_speed_m_s) <= c * (1 + 1e-14)
    k = float(kin.k_rad_m)
    omega = 2 * math.pi / period
    assert G * k * math.tanh(k * depth) == pytest.approx(omega**2, rel=1e-12)


@FAST
@given(st.floats(min_value=0.01, max_value=10.0), st.floats(min_value=60.0, max_value=2000.0))
def test_shallow_water_celerity_limit(depth: float, period: float) -> None:
    """[Airy] Long waves on shallow water: when kh < 0.05, c = sqrt(g h) within (kh)^2/6."""
    kin = wave_kinematics(period, depth, g_m_s2=G)
    kh = float(kin.k_rad_m) * depth
    if kh < 0.05:
        ratio = float(kin.celerity_m_s) / math.sqrt(G * depth)
        assert 1.0 - ratio <= kh**2 / 6.0 * 1.01 + 1e-15
        assert ratio <= 1.0 + 1e-15


@FAST
@given(st.floats(min_value=1e-9, max_value=1e4))
def test_solve_kh_residual(y: float) -> None:
    """[Airy] x tanh x = y holds to 1e-12 relative for every y."""
    x = float(solve_kh(y))
    assert abs(x * math.tanh(x) - y) <= 1e-12 * y


@FAST
@given(angles, angles)
def test_port_starboard_symmetry_of_folded_heading(course: float, wave_from: float) -> None:
    """[ITTC] Mirroring the situation about the ship's axis (waves from the other side) leaves the
    folded heading unchanged; folded value lies in [0, 180]; fold(mu) = fold(360 - mu)."""
    mu = float(relative_heading_deg(course, wave_from))
    mirror_from = 2.0 * course - wave_from  # reflect the wave direction about the course line
    mu_m = float(relative_heading_deg(course, mirror_from))
    f, fm = float(fold_heading_deg(mu)), float(fold_heading_deg(mu_m))
    assert 0.0 <= f <= 180.0
    assert abs(f - fm) < 1e-9
    assert abs(float(fold_heading_deg(360.0 - mu)) - f) < 1e-9
    assert 0.0 <= mu < 360.0


@FAST
@given(st.floats(min_value=0.05, max_value=10.0), st.one_of(st.none(), depths), angles)
def test_encounter_equals_absolute_at_zero_speed(omega: float, depth, mu: float) -> None:  # type: ignore[no-untyped-def]
    """[PNA1989] U = 0 gives omega_e == omega exactly at every heading and depth."""
    k = wavenumber_rad_m(omega, depth)
    assert float(encounter_frequency_rad_s(omega, k, 0.0, mu)) == omega
    enc = encounter_period(2 * math.pi / omega, 0.0, mu, depth)
    assert float(enc.period_s) == pytest.approx(2 * math.pi / omega, rel=1e-14)
    assert not bool(enc.overtaking)


@FAST
@given(
    # calm (0) or a physical height; sub-micrometre heights underflow Hs^2 and are not physical
    st.one_of(st.just(0.0), st.floats(min_value=1e-6, max_value=15.0)),
    st.floats(min_value=2.0, max_value=20.0),
    st.floats(min_value=1.0, max_value=7.0),
)
def test_normalised_jonswap_recovers_hs(hs: float, tp: float, gam: float) -> None:
    """4 sqrt(m0) = Hs exactly on the grid when normalise_weights is given (definition of Hm0)."""
    grid = frequency_grid_rad_s(2.0, 20.0)
    s = jonswap_s_m2_s_rad(grid.omega_rad_s, hs, tp, gam, normalise_weights=grid.weights_rad_s)
    assert np.all(np.isfinite(s)) and np.all(s >= 0)
    assert float(significant_wave_height_m(s, grid.omega_rad_s, grid.weights_rad_s)) == pytest.approx(hs, rel=1e-13, abs=0)


@FAST
@given(st.integers(min_value=2, max_value=180), st.floats(min_value=0.0, max_value=500.0))
def test_direction_weights_sum_to_one(n_dir: int, s: float) -> None:
    """Direction weights are >= 0 and sum to 1 (discrete normalisation of D)."""
    w = direction_grid(n_dir, s).weights
    assert np.all(w >= 0)
    assert abs(w.sum() - 1.0) <= 1e-15


lons = st.floats(min_value=-180.0, max_value=180.0)
lats = st.floats(min_value=-89.9, max_value=89.9)


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.lists(st.tuples(lons, lats), min_size=2, max_size=4), st.floats(min_value=20.0, max_value=600.0))
def test_route_gaps_and_length(points: list, spacing_nm: float) -> None:
    """[GLIB] No gap exceeds the spacing; the total equals the sum of vertex-to-vertex geodesics;
    courses in [0, 360); longitudes in [-180, 180)."""
    lon = [p[0] for p in points]
    lat = [p[1] for p in points]
    legs = [Geodesic.WGS84.Inverse(lat[i], lon[i], lat[i + 1], lon[i + 1])["s12"] for i in range(len(lon) - 1)]
    if min(legs) < 1.0:  # duplicates are covered by the example tests
        return
    r = densify_route(lon, lat, spacing_nm)
    spacing_m = spacing_nm * 1852.0
    gaps = [
        Geodesic.WGS84.Inverse(r.lat_deg[i], r.lon_deg[i], r.lat_deg[i + 1], r.lon_deg[i + 1])["s12"]
        for i in range(r.n - 1)
    ]
    assert max(gaps) <= spacing_m * (1 + 1e-9)
    assert abs(r.dist_m[-1] - sum(legs)) <= 1e-6 * max(1.0, len(legs))
    assert np.all((r.course_deg >= 0) & (r.course_deg < 360))
    assert np.all((r.lon_deg >= -180) & (r.lon_deg < 180))
    assert np.all(np.diff(r.dist_m) > 0)
