# SPDX-License-Identifier: GPL-2.0-or-later
"""Checks that single-line slips in the core cannot pass unnoticed (issue 20's six plants).

Each check names its reference beside it. Hand derivations used here:

* Tm01/Tp of JONSWAP gamma 3.3 is recomputed by numerical quadrature (scipy.integrate.quad) of
  the DNV-RP-C205 (2010) eq. 3.5.5 spectrum written out below, with its normalising factor
  A_gamma = 1 - 0.287 ln(gamma) and sigma = 0.07 (f <= fp) / 0.09 (f > fp); Tm01 = m0/m1.
  DNV-RP-C205 s.3.5.5 gives the fit T1/Tp = 0.7303 + 0.04936 g - 0.006556 g^2 + 0.0003610 g^3
  = 0.8348 at g = 3.3 (from memory); the quadrature must agree with it to 1e-3.
* Wavelengths in finite depth: the Airy dispersion relation w^2 = g k tanh(k h) (Dean &
  Dalrymple, Water Wave Mechanics for Engineers and Scientists, 1991, eq. 4.19) solved with
  scipy.optimize.brentq, independently of the core's Newton solver.
* Dwell time: a sample stands for half of the interval before it and half of the interval
  after it (composite trapezoid rule, e.g. Press et al., Numerical Recipes 3rd ed. 2007,
  eq. 4.1.11); for arrival times 0, t1, t2 that is t1/2, t2/2, (t2-t1)/2.
* Circ.1228 flags: IMO MSC.1/Circ.1228 (2007) s.4.2.3: synchronous rolling when TE is close
  to TR, parametric rolling when TE is close to TR/2; with the vessel at rest TE = T (the
  Circ.1228 Fig. 1 formula TE = 3 T^2 / (3 T + V cos(alpha)) with V = 0). The flag bits are
  public interface (processing/core/flags.py: "never renumber"): ROLLSYNC = 1 << 13,
  ROLLPARAM = 1 << 14, SHALLOW = 1 << 10; typed here so a swapped or renumbered bit fails.
* MSI class bounds 2, 5, 10, 20 % and "a class begins where MSI reaches its bound (>=)": our
  own design (processing/core/comfort/indices.py, MSI_CLASS_BOUNDS_PCT; no published source),
  typed here so a changed bound or comparison fails.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from geographiclib.geodesic import Geodesic
from scipy.integrate import quad
from scipy.optimize import brentq

from seaway_comfort.processing.core import climate as C
from seaway_comfort.processing.core.climate.hindcast import point_weights, read_point_values
from seaway_comfort.processing.core.comfort.guidance import circ1228_flags
from seaway_comfort.processing.core.comfort.indices import comfort_class
from seaway_comfort.processing.core.demo.writers import write_bathymetry_geotiff, write_cf_netcdf
from seaway_comfort.processing.core.flags import flag_codes
from seaway_comfort.processing.core.passage import pipeline as passage
from seaway_comfort.processing.core.seastate import open_bathymetry, open_sea_state
from seaway_comfort.processing.core.vessel.profile import resolve_vessel

HS = "sea_surface_wave_significant_height"
TP = "sea_surface_wave_period_at_variance_spectral_density_maximum"
TM01 = "sea_surface_wave_mean_period_from_variance_spectral_density_first_frequency_moment"
DIR = "sea_surface_wave_from_direction"
T0 = np.datetime64("2030-06-01T00:00", "ms")  # invented scenario
G = 9.80665  # standard gravity [m/s^2] (CGPM 1901; the core's G_STANDARD_M_S2)
BIT_SHALLOW, BIT_SYNC, BIT_PARAM = 1 << 10, 1 << 13, 1 << 14  # flags.py, public interface


def _jonswap_tm01_over_tp(gamma: float = 3.3) -> float:
    """Tm01/Tp by quadrature of DNV-RP-C205 eq. 3.5.5 (module docstring), fp = 1 Hz."""
    a_g = 1.0 - 0.287 * math.log(gamma)

    def s(f: float) -> float:
        sig = 0.07 if f <= 1.0 else 0.09
        return a_g * f ** -5 * math.exp(-1.25 * f ** -4) * gamma ** math.exp(-0.5 * ((f - 1.0) / sig) ** 2)

    m0 = sum(quad(s, a, b, limit=200)[0] for a, b in ((0.05, 1.0), (1.0, 60.0)))
    m1 = sum(quad(lambda f: f * s(f), a, b, limit=200)[0] for a, b in ((0.05, 1.0), (1.0, 60.0)))
    return m0 / m1


def test_quadrature_agrees_with_the_dnv_fit():
    # DNV-RP-C205 s.3.5.5 fit at gamma 3.3 (from memory): 0.8348
    assert _jonswap_tm01_over_tp() == pytest.approx(0.7303 + 0.04936 * 3.3 - 0.006556 * 3.3 ** 2
                                                    + 0.0003610 * 3.3 ** 3, abs=1e-3)


def test_hindcast_mean_period_becomes_peak_period(tmp_path):
    """Hindcast with Hs 1.2 m and Tm01 7 s only: Tp = 7 / (Tm01/Tp) = 8.39 s (quadrature above),
    and the notes say Tp was derived from tm01."""
    lon, lat = np.arange(-10.0, -5.99, 0.5), np.arange(40.0, 44.01, 0.5)
    times = T0 + np.arange(4) * np.timedelta64(3, "h")
    shape = (times.size, lat.size, lon.size)
    path = write_cf_netcdf(str(tmp_path / "tm01.nc"), lon, lat, times, {
        HS: np.full(shape, 1.2), TM01: np.full(shape, 7.0), DIR: np.full(shape, 270.0)})
    s = C.open_hindcast([path])
    hs, tp, _ = read_point_values(s, point_weights(s.grid, [-8.2], [41.7]), 0, 4)
    np.testing.assert_allclose(hs, 1.2, rtol=1e-6)
    np.testing.assert_allclose(tp, 7.0 / _jonswap_tm01_over_tp(), rtol=1e-3)
    assert any("tm01" in n and "Tp derived" in n for n in s.notes), s.notes


def test_comfort_class_begins_at_its_msi_bound():
    msi = np.array([0.0, 1.999, 2.0, 4.999, 5.0, 9.999, 10.0, 19.999, 20.0, 80.0])
    np.testing.assert_array_equal(comfort_class(msi, 0.0), [0, 0, 1, 1, 2, 2, 3, 3, 4, 4])


def test_parametric_and_synchronous_roll_use_their_own_bits():
    """At rest in head seas TE = T (Circ.1228 Fig. 1 with V = 0). TR 20 s: T 10 s gives
    TE/TR = 0.5 (parametric only); T 20 s gives 1.0 (synchronous only). Hs 0.1 m, L 100 m:
    no surf riding at rest, Hs < 0.04 L (no high-wave groups)."""
    f = circ1228_flags(100.0, 20.0, np.zeros(2), np.zeros(2), np.full(2, 0.1), np.array([10.0, 20.0]),
                       np.zeros(2))
    np.testing.assert_array_equal(f.mask, [BIT_PARAM, BIT_SYNC])
    assert [flag_codes(int(m)) for m in f.mask] == ["ROLLPARAM", "ROLLSYNC"]


@pytest.fixture(scope="module")
def calm_sea(tmp_path_factory):
    """Uniform Hs 1 m, Tp 8 s from the north, on -2..2 E, -2..2 N for 12 h (invented)."""
    lon = lat = np.arange(-2.0, 2.001, 0.25)
    times = T0 + np.arange(5) * np.timedelta64(3, "h")
    shape = (times.size, lat.size, lon.size)
    path = str(tmp_path_factory.mktemp("sea") / "sea.nc")
    write_cf_netcdf(path, lon, lat, times, {HS: np.full(shape, 1.0), TP: np.full(shape, 8.0),
                                            DIR: np.zeros(shape)})
    src = open_sea_state(path)
    yield src, lon, lat
    src.close()


def _airy_wavelength_m(t_s: float, depth_m: float) -> float:
    w = 2.0 * math.pi / t_s
    k = brentq(lambda k: w * w - G * k * math.tanh(k * depth_m), 1e-6, 50.0, xtol=1e-14)
    return 2.0 * math.pi / k


@pytest.mark.parametrize("depth_m, flagged", [(1.0, True), (1.5, True), (2.0, False), (10.0, False)])
def test_shallow_flag_follows_depth_over_wavelength(tmp_path, calm_sea, depth_m, flagged):
    """SHALLOW where depth < L/20 at Tp 8 s (flags.py): L = 24.79, 30.20, 34.69, 70.88 m at
    1, 1.5, 2, 10 m (brentq on Airy dispersion), L/20 = 1.24, 1.51, 1.73, 3.54 m."""
    src, lon, lat = calm_sea
    tif = str(tmp_path / "depth.tif")
    write_bathymetry_geotiff(tif, lon, lat, np.full((lat.size, lon.size), depth_m), convention="depth_positive_down")
    depth = open_bathymetry(tif, convention="depth_positive_down")
    try:
        r = passage.compute_passage([0.0, 0.0], [0.0, 0.2], departure_utc=T0, speed_kn=5.0, sea_states=[src],
                                    profile=resolve_vessel("coastal_survey_35m"), depth=depth, spacing_nm=5.0)
    finally:
        depth.close()
    assert (depth_m < _airy_wavelength_m(8.0, depth_m) / 20.0) == flagged  # the reference itself
    assert r.n >= 2
    np.testing.assert_array_equal((r.flags & BIT_SHALLOW) != 0, flagged)


def test_dwell_time_is_half_of_each_neighbouring_interval(calm_sea):
    """Vertices 0, 0.1, 0.5 deg N on 0 E, spacing larger than the legs: samples at the vertices
    only; arrival times from geographiclib distances / speed; dwell by the trapezoid rule."""
    src, _, _ = calm_sea
    lat = [0.0, 0.1, 0.5]
    speed_kn = 10.0
    r = passage.compute_passage([0.0, 0.0, 0.0], lat, departure_utc=T0, speed_kn=speed_kn, sea_states=[src],
                                profile=resolve_vessel("coastal_survey_35m"), spacing_nm=200.0)
    assert r.n == 3, r.n
    s1 = Geodesic.WGS84.Inverse(0.0, 0.0, 0.1, 0.0)["s12"]
    s2 = Geodesic.WGS84.Inverse(0.0, 0.0, 0.5, 0.0)["s12"]
    v = speed_kn * 1852.0 / 3600.0  # knot = 1852 m/h (international nautical mile)
    t1, t2 = s1 / v, s2 / v
    np.testing.assert_allclose(r.dwell_s, [t1 / 2.0, t2 / 2.0, (t2 - t1) / 2.0], rtol=1e-6)
