# SPDX-License-Identifier: GPL-2.0-or-later
"""Wave spectra, spreading, moments and the trapezoid helpers, checked against outside sources.

Sources (keys used in the comments):
  [DNV2010]   DNV-RP-C205 (Oct. 2010) s.3.5.5: JONSWAP/PM forms, A_gamma, sigma 0.07/0.09, the
              gamma(Tp/sqrt(Hs)) rule, and the Tz/Tp, T1/Tp polynomial fits versus gamma
              (coefficients from memory; not re-read from the document).
  [ITTC2002]  23rd ITTC Specialist Committee on Waves (2002), Table A4: Te/Tp fit versus gamma
              (coefficients from memory, like the DNV fits above).
  [PM-Gamma]  closed-form moments of omega^-5 exp(-B omega^-4) through the Gamma function
              (integral x^(n-5) exp(-B x^-4) dx = Gamma((4-n)/4) B^((n-4)/4) / 4).
  [quad-ref]  reference computation in this file (_reference_jonswap, _reference_ratios): the
              [DNV2010] eq. 3.5.5 JONSWAP written out anew, S(w) = A_g (5/16) Hs^2 wp^4 w^-5
              exp(-1.25 (w/wp)^-4) g^exp(-(w-wp)^2 / (2 s^2 wp^2)), A_g = 1 - 0.287 ln g,
              s = 0.07 (w <= wp) / 0.09, integrated by scipy.integrate.quad (split at wp); the
              tables below were printed from it and test_integrated_table_follows_from_quad
              recomputes every row.
  [cos2s-ref] _reference_cos2s in this file: D(theta) = C(s) cos^2s(theta/2), C(s) =
              Gamma(s+1)/(2 sqrt(pi) Gamma(s+1/2)) [LH1963] with scipy.special.gamma, integrated
              by scipy.integrate.quad.
  [LH1963]    Longuet-Higgins, Cartwright & Smith (1963): cos-2s normalisation.
  [Kuik1988]  Kuik, van Vledder & Holthuijsen (1988) J. Phys. Oceanogr. 18: sigma_theta = sqrt(2(1-m1)).
  scipy.integrate.quad / scipy.integrate.trapezoid / scipy.special.gamma: reference library.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import integrate
from scipy.special import gamma as gamma_fn

from seaway_comfort.processing.core.numerics import trapezoid, trapezoid_weights
from seaway_comfort.processing.core.waves.spectra import (
    DirectionGrid,
    FrequencyGrid,
    cos2s_spreading_per_rad,
    direction_grid,
    dnv_default_gamma,
    frequency_grid_rad_s,
    jonswap_s_m2_s_rad,
    pierson_moskowitz_s_m2_s_rad,
    sigma_deg_from_spread_s,
    significant_wave_height_m,
    spectral_moment,
    spread_s_from_sigma_deg,
    tm01_s,
    tm02_s,
    tm_minus10_s,
)
from seaway_comfort.processing.core.validation import SeawayInputError

HS, TP = 2.0, 8.0
WP = 2.0 * math.pi / TP


def _fine_grid(tp: float = TP) -> np.ndarray:
    """Dense log grid from 0.2 to 1000 omega_p (tails beyond hold < 1e-20 of m0 and 1.3e-6 of m2)."""
    wp = 2.0 * math.pi / tp
    return np.geomspace(0.2 * wp, 1000.0 * wp, 200001)


# ---------------------------------------------------------------------------------------------
# numerics: trapezoid
# ---------------------------------------------------------------------------------------------
def test_trapezoid_matches_scipy() -> None:
    """Our trapezoid equals scipy.integrate.trapezoid (reference library) on an uneven grid."""
    x = np.sort(np.random.default_rng(1).uniform(0.0, 3.0, 57))
    y = np.vstack([np.sin(x), np.exp(-x) * x**2])
    np.testing.assert_allclose(trapezoid(y, x), integrate.trapezoid(y, x, axis=-1), rtol=1e-14)
    np.testing.assert_allclose(trapezoid(y.T, x, axis=0), integrate.trapezoid(y, x), rtol=1e-14)
    w = trapezoid_weights(x)
    assert w.sum() == pytest.approx(x[-1] - x[0], rel=1e-14)  # integral of 1


def test_trapezoid_exact_for_linear() -> None:
    """The trapezoid rule integrates linear functions exactly (any numerical-analysis text)."""
    x = np.array([0.0, 0.3, 1.0, 2.5])
    assert float(trapezoid(2.0 * x + 1.0, x)) == pytest.approx(2.5**2 + 2.5, rel=1e-15)


@pytest.mark.parametrize("x", [[1.0], [0.0, 0.0, 1.0], [0.0, np.nan], [[0.0, 1.0]], [2.0, 1.0]])
def test_trapezoid_bad_abscissae(x: object) -> None:
    """Fewer than 2 points, non-increasing, NaN or 2-D abscissae are rejected."""
    with pytest.raises(SeawayInputError, match="x"):
        trapezoid_weights(x)  # type: ignore[arg-type]


def test_trapezoid_bad_y() -> None:
    """Mismatched length, bad axis, NaN and scalar y are rejected."""
    x = np.linspace(0, 1, 5)
    with pytest.raises(SeawayInputError, match="y has 4"):
        trapezoid(np.ones(4), x)
    with pytest.raises(SeawayInputError, match="axis"):
        trapezoid(np.ones(5), x, axis=3)
    with pytest.raises(SeawayInputError, match="y must be finite"):
        trapezoid(np.array([0, 1, np.nan, 1, 0.0]), x)
    with pytest.raises(SeawayInputError, match="scalar"):
        trapezoid(1.0, x)


# ---------------------------------------------------------------------------------------------
# JONSWAP / PM
# ---------------------------------------------------------------------------------------------
def test_peak_values() -> None:
    """By hand from [DNV2010] at w = wp = 2 pi/8: S_PM(wp) = (5/16) Hs^2 wp^-1 e^-5/4 = 1.25 x
    (4/pi) x 0.2865048 = 0.455987 m^2 s; S_J(wp; 3.3) = A_gamma gamma S_PM(wp) with
    A_gamma = 1 - 0.287 ln 3.3 = 0.657344 -> 2.169236 x 0.455987 = 0.989142 m^2 s (Hs 2, Tp 8);
    also _reference_jonswap at wp."""
    pm = float(pierson_moskowitz_s_m2_s_rad(np.array([WP]), HS, TP)[0])
    js = float(jonswap_s_m2_s_rad(np.array([WP]), HS, TP, 3.3)[0])
    assert pm == pytest.approx(0.455987, abs=0.5e-6)
    assert pm == pytest.approx(5.0 / 16.0 * HS**2 / WP * math.exp(-1.25), rel=1e-14)
    assert js == pytest.approx(0.989142, abs=0.5e-6)
    assert js == pytest.approx(_reference_jonswap(WP, 3.3), rel=1e-13)
    assert 5.0 / math.pi * math.exp(-1.25) == pytest.approx(0.455987, abs=0.5e-6)


def test_gamma_one_is_pierson_moskowitz_exactly() -> None:
    """gamma = 1 gives PM exactly [DNV2010] (gamma**anything = 1, A_1 = 1)."""
    om = _fine_grid()[::100]
    np.testing.assert_array_equal(
        jonswap_s_m2_s_rad(om, HS, TP, 1.0), pierson_moskowitz_s_m2_s_rad(om, HS, TP)
    )
    # outside anchor: both equal the [quad-ref] transcription with gamma = 1
    pick = om[::200]
    np.testing.assert_allclose(pierson_moskowitz_s_m2_s_rad(pick, HS, TP),
                               [_reference_jonswap(w, 1.0) for w in pick], rtol=1e-12, atol=1e-300)


def _pm_moment(n: float, hs: float, tp: float) -> float:
    """[PM-Gamma] m_n of S_PM: (5/16) Hs^2 wp^4 * Gamma((4-n)/4) B^((n-4)/4) / 4, B = 1.25 wp^4."""
    wp = 2.0 * math.pi / tp
    b = 1.25 * wp**4
    return 5.0 / 16.0 * hs**2 * wp**4 * gamma_fn((4.0 - n) / 4.0) * b ** ((n - 4.0) / 4.0) / 4.0


def test_pm_moments_and_period_ratios_closed_form() -> None:
    """PM: m0 = Hs^2/16; Te/Tp = (4/5)^(1/4) Gamma(5/4) = 0.857223, Tm01/Tp = (4/5)^(1/4)/Gamma(3/4)
    = 0.771771, Tz/Tp = (4/5)^(1/4) pi^(-1/4) = 0.710371 [PM-Gamma], on a fine trapezoid grid."""
    om = _fine_grid()
    s = pierson_moskowitz_s_m2_s_rad(om, HS, TP)
    for n in (-1, 0, 1, 2):
        assert float(spectral_moment(s, om, n)) == pytest.approx(_pm_moment(n, HS, TP), rel=5e-6)
    assert _pm_moment(0, HS, TP) == pytest.approx(HS**2 / 16.0, rel=1e-14)
    q = 0.8**0.25
    assert float(tm_minus10_s(s, om)) / TP == pytest.approx(q * gamma_fn(1.25), rel=5e-6)
    assert float(tm01_s(s, om)) / TP == pytest.approx(q / gamma_fn(0.75), rel=5e-6)
    assert float(tm02_s(s, om)) / TP == pytest.approx(q * math.pi**-0.25, rel=5e-6)
    # the same closed forms printed to 6 decimals (scipy.special.gamma), typed so a changed q fails
    assert q * gamma_fn(1.25) == pytest.approx(0.857223, abs=0.5e-6)
    assert q / gamma_fn(0.75) == pytest.approx(0.771771, abs=0.5e-6)
    assert q * math.pi**-0.25 == pytest.approx(0.710371, abs=0.5e-6)


# gamma, Hm0/Hs with A_gamma, Tz/Tp, T1/Tp, Te/Tp  -- [quad-ref] (Hs 2, Tp 8), 4 decimals
INTEGRATED_TABLE = [
    (1.0, 1.0000, 0.7104, 0.7718, 0.8572),
    (2.0, 0.9989, 0.7464, 0.8063, 0.8835),
    (3.3, 1.0012, 0.7774, 0.8343, 0.9033),
    (5.0, 1.0000, 0.8053, 0.8583, 0.9192),
    (7.0, 0.9912, 0.8285, 0.8775, 0.9312),
]


@pytest.mark.parametrize("gam, hm0_ratio, tz, t1, te", INTEGRATED_TABLE)
def test_integrated_periods_table(gam: float, hm0_ratio: float, tz: float, t1: float, te: float) -> None:
    """Hm0/Hs (A_gamma accuracy) and period ratios versus gamma [quad-ref], half a unit of 1e-4."""
    om = _fine_grid()
    s = jonswap_s_m2_s_rad(om, HS, TP, gam)
    half = 0.5e-4 + 1e-6  # printed to 4 decimals (+ margin for the grid's 1e-6 truncation)
    assert float(significant_wave_height_m(s, om)) / HS == pytest.approx(hm0_ratio, abs=half)
    assert float(tm02_s(s, om)) / TP == pytest.approx(tz, abs=half)
    assert float(tm01_s(s, om)) / TP == pytest.approx(t1, abs=half)
    assert float(tm_minus10_s(s, om)) / TP == pytest.approx(te, abs=half)


@pytest.mark.parametrize("gam", [1.0, 1.5, 2.0, 3.3, 4.0, 5.0, 6.0, 7.0])
def test_period_ratio_fits_versus_integrals(gam: float) -> None:
    """[DNV2010] Tz/Tp, T1/Tp fits and the [ITTC2002] Te/Tp fit (valid 1 <= gamma <= 7) agree with
    our numerically integrated moments within 0.3 % (the fits' stated agreement is <= 0.25 %)."""
    om = _fine_grid()
    s = jonswap_s_m2_s_rad(om, HS, TP, gam)
    tz_fit = 0.6673 + 0.05037 * gam - 0.006230 * gam**2 + 0.0003341 * gam**3
    t1_fit = 0.7303 + 0.04936 * gam - 0.006556 * gam**2 + 0.0003610 * gam**3
    te_fit = 0.8255 + 0.03852 * gam - 0.005537 * gam**2 + 0.0003154 * gam**3
    assert float(tm02_s(s, om)) / TP == pytest.approx(tz_fit, rel=3e-3)
    assert float(tm01_s(s, om)) / TP == pytest.approx(t1_fit, rel=3e-3)
    assert float(tm_minus10_s(s, om)) / TP == pytest.approx(te_fit, rel=3e-3)


def _reference_jonswap(w: float, gam: float) -> float:
    """[quad-ref] DNV-RP-C205 eq. 3.5.5 at Hs = HS, Tp = TP [m^2 s/rad]."""
    sig = 0.07 if w <= WP else 0.09
    pm = (5.0 / 16.0) * HS**2 * WP**4 * w**-5 * math.exp(-1.25 * (w / WP) ** -4)
    return (1.0 - 0.287 * math.log(gam)) * pm * gam ** math.exp(-((w - WP) ** 2) / (2 * sig**2 * WP**2))


def _reference_ratios(gam: float):
    """(Hm0/Hs, Tz/Tp, T1/Tp, Te/Tp) by quad of _reference_jonswap: Hm0 = 4 sqrt(m0),
    Tz = 2 pi sqrt(m0/m2), T1 = 2 pi m0/m1, Te = 2 pi m_-1/m0 (DNV-RP-C205 s.3.5.5 definitions)."""
    def m(n: int) -> float:
        return sum(integrate.quad(lambda w: w**n * _reference_jonswap(w, gam), a, b, limit=400,
                                  epsabs=0, epsrel=1e-11)[0] for a, b in ((1e-3 * WP, WP), (WP, 200 * WP)))
    m0, m1, m2, mm1 = m(0), m(1), m(2), m(-1)
    return (4 * math.sqrt(m0) / HS, 2 * math.pi * math.sqrt(m0 / m2) / TP, 2 * math.pi * m0 / m1 / TP,
            2 * math.pi * mm1 / m0 / TP)


@pytest.mark.parametrize("gam, hm0_ratio, tz, t1, te", INTEGRATED_TABLE)
def test_integrated_table_follows_from_quad(gam: float, hm0_ratio: float, tz: float, t1: float, te: float) -> None:
    """Every INTEGRATED_TABLE row recomputed by [quad-ref], half a unit of 1e-4 (+ the m2 tail
    beyond 200 wp, < 1e-5 relative)."""
    got = _reference_ratios(gam)
    assert got == tuple(pytest.approx(v, abs=0.5e-4 + 1e-5) for v in (hm0_ratio, tz, t1, te))


def test_independent_quad_check() -> None:
    """m0, m1, m_-1 of JONSWAP (gamma 3.3) by scipy.integrate.quad (reference library) on the
    independent transcription _reference_jonswap [quad-ref] versus our spectrum's trapezoid
    moments; quad split at wp."""
    om = _fine_grid()
    s = jonswap_s_m2_s_rad(om, HS, TP, 3.3)

    def spec(w: float) -> float:
        return _reference_jonswap(w, 3.3)

    for n in (-1, 0, 1):
        pieces = [(1e-6 * WP, WP), (WP, 60 * WP), (60 * WP, np.inf)]
        ref = sum(integrate.quad(lambda w: w**n * spec(w), a, b, limit=200, epsabs=0, epsrel=1e-11)[0]
                  for a, b in pieces)
        assert float(spectral_moment(s, om, n)) == pytest.approx(ref, rel=2e-6)
    # quad's own Hm0 reproduces the A_gamma error of the table: 1.0012 [quad-ref]
    m0 = sum(integrate.quad(spec, a, b, limit=200)[0] for a, b in [(1e-6 * WP, WP), (WP, np.inf)])
    assert 4 * math.sqrt(m0) / HS == pytest.approx(1.0012, abs=0.5e-4)


def test_numerical_normalisation_is_exact_on_the_grid() -> None:
    """With normalise_weights, 4 sqrt(sum(S w)) == Hs to rounding, for every sea state."""
    grid = frequency_grid_rad_s(3.0, 15.0)
    hs = np.array([[0.5, 1.0, 2.0], [3.0, 4.5, 8.0]])
    tp = np.array([3.0, 8.0, 15.0])
    gam = np.array([[1.0], [3.3]])
    s = jonswap_s_m2_s_rad(grid.omega_rad_s, hs, tp, gam, normalise_weights=grid.weights_rad_s)
    assert s.shape == (2, 3, grid.n)
    hm0 = significant_wave_height_m(s, grid.omega_rad_s, grid.weights_rad_s)
    np.testing.assert_allclose(hm0, hs, rtol=1e-14)
    # the shape is unchanged: ratio to the A_gamma version is one constant per sea state
    s_a = jonswap_s_m2_s_rad(grid.omega_rad_s, hs, tp, gam)
    peak = np.argmax(s_a, axis=-1)[..., None]
    scale = np.take_along_axis(s, peak, -1) / np.take_along_axis(s_a, peak, -1)
    np.testing.assert_allclose(s, scale * s_a, rtol=1e-13, atol=0)


def test_calm_partition_gives_zeros() -> None:
    """hs_m = 0 is allowed and gives an all-zero spectrum (with and without normalisation)."""
    grid = frequency_grid_rad_s(5.0, 10.0)
    assert not np.any(jonswap_s_m2_s_rad(grid.omega_rad_s, 0.0, 8.0))
    s = jonswap_s_m2_s_rad(grid.omega_rad_s, [0.0, 1.0], 8.0, normalise_weights=grid.weights_rad_s)
    assert not np.any(s[0]) and np.all(np.isfinite(s))


def test_zero_frequency_node() -> None:
    """S(0) = 0 (limit of omega^-5 exp(-B omega^-4)); m_-1 ignores the omega = 0 node."""
    om = np.concatenate(([0.0], _fine_grid()))
    s = jonswap_s_m2_s_rad(om, HS, TP)
    assert s[0] == 0.0
    assert np.isfinite(spectral_moment(s, om, -1))


@pytest.mark.parametrize(
    "hs, tp, gam",
    [(6.0, 8.0, 5.0), (4.0, 8.0, math.exp(1.15)), (1.0, 8.0, 1.0), (0.0, 8.0, 1.0),
     (1.0, 3.6, 5.0), (1.0, 5.0, 1.0), (1.0, 4.3, math.exp(5.75 - 1.15 * 4.3))],
)
def test_dnv_default_gamma(hs: float, tp: float, gam: float) -> None:
    """[DNV2010] gamma rule on p = Tp/sqrt(Hs): 5 for p <= 3.6, exp(5.75 - 1.15 p) for 3.6 < p < 5,
    1 for p >= 5. By hand: (Hs 4, Tp 8) p = 4 -> e^(5.75 - 4.6) = e^1.15 = 3.15819; (Hs 6, Tp 8)
    p = 3.266 -> 5; (Hs 1, Tp 3.6) p = 3.6 -> 5 (edge); (Hs 1, Tp 5) p = 5 -> 1 (edge)."""
    assert float(dnv_default_gamma(hs, tp)) == pytest.approx(gam, rel=1e-14)


def test_dnv_default_gamma_bad_input() -> None:
    """Negative Hs, non-positive Tp and non-broadcastable shapes are rejected."""
    with pytest.raises(SeawayInputError, match="hs_m"):
        dnv_default_gamma(-1.0, 8.0)
    with pytest.raises(SeawayInputError, match="tp_s"):
        dnv_default_gamma(1.0, 0.0)
    with pytest.raises(SeawayInputError, match="broadcast"):
        dnv_default_gamma(np.ones(2), np.ones(3))


@pytest.mark.parametrize("hs, gam, hm0", [(4.0, math.exp(1.15), 4.0042), (6.0, 5.0, 6.0000)])
def test_dnv_rule_spectrum_hm0(hs: float, gam: float, hm0: float) -> None:
    """Hm0 of the A_gamma-normalised JONSWAP with the DNV gamma rule (gamma by hand, see
    test_dnv_default_gamma), Tp 8 s: 4.0042 and 6.0000, i.e. Hs x Hm0/Hs of [quad-ref]
    (_reference_ratios; the ratio does not depend on Hs); our fine trapezoid within 2e-4 rel."""
    assert hs * _reference_ratios(gam)[0] == pytest.approx(hm0, abs=0.5e-4 + 1e-5)
    om = _fine_grid()
    s = jonswap_s_m2_s_rad(om, hs, 8.0, dnv_default_gamma(hs, 8.0))
    assert float(significant_wave_height_m(s, om)) == pytest.approx(hm0, rel=2e-4)


@pytest.mark.parametrize(
    "kwargs, name",
    [
        (dict(hs_m=-1.0, tp_s=8.0), "hs_m"),
        (dict(hs_m=np.nan, tp_s=8.0), "hs_m"),
        (dict(hs_m=1.0, tp_s=0.0), "tp_s"),
        (dict(hs_m=1.0, tp_s=-3.0), "tp_s"),
        (dict(hs_m=1.0, tp_s=np.inf), "tp_s"),
        (dict(hs_m=1.0, tp_s=8.0, gamma=0.9), "gamma"),
        (dict(hs_m=1.0, tp_s=8.0, gamma=np.nan), "gamma"),
        (dict(hs_m=1.0, tp_s=8.0, sigma_a=0.0), "sigma_a"),
        (dict(hs_m=[1.0, 2.0], tp_s=[8.0, 9.0, 10.0]), "broadcast"),
        (dict(hs_m=1.0, tp_s=8.0, normalise_weights=np.ones(3)), "normalise_weights"),
    ],
)
def test_jonswap_bad_input(kwargs: dict, name: str) -> None:
    """Every invalid argument raises SeawayInputError naming it."""
    om = np.linspace(0.2, 3.0, 10)
    with pytest.raises(SeawayInputError, match=name):
        jonswap_s_m2_s_rad(om, **kwargs)


@pytest.mark.parametrize("om", [np.ones((2, 3)), np.array([-0.1, 0.5]), np.array([np.nan, 1.0]), 1.0])
def test_jonswap_bad_omega(om: object) -> None:
    """omega must be 1-D, finite, >= 0."""
    with pytest.raises(SeawayInputError, match="omega_rad_s"):
        jonswap_s_m2_s_rad(om, 1.0, 8.0)  # type: ignore[arg-type]


def test_normalise_weights_missing_the_peak() -> None:
    """Weights on a grid far below the spectrum capture no energy -> clear error, not 0/0."""
    om = np.linspace(0.001, 0.002, 8)
    with pytest.raises(SeawayInputError, match="capture no energy"):
        jonswap_s_m2_s_rad(om, 2.0, 8.0, normalise_weights=trapezoid_weights(om))


# ---------------------------------------------------------------------------------------------
# frequency grid
# ---------------------------------------------------------------------------------------------
def test_frequency_grid_layout() -> None:
    """48 log-spaced points from 0.5 wp,min to 8 wp,max with trapezoid weights."""
    grid = frequency_grid_rad_s(4.0, 12.0)
    assert isinstance(grid, FrequencyGrid)
    assert grid.n == 48
    assert grid.omega_rad_s[0] == pytest.approx(0.5 * 2 * math.pi / 12.0, rel=1e-14)
    assert grid.omega_rad_s[-1] == pytest.approx(8.0 * 2 * math.pi / 4.0, rel=1e-14)
    ratios = grid.omega_rad_s[1:] / grid.omega_rad_s[:-1]
    np.testing.assert_allclose(ratios, ratios[0], rtol=1e-12)
    np.testing.assert_allclose(grid.weights_rad_s, integrate.trapezoid(np.eye(48), grid.omega_rad_s), rtol=1e-13)


def test_frequency_grid_resolution_claims() -> None:
    """The grid docstring's claims: 48 points over Tp 3..15 s keep Hs (A_gamma) and Te within 0.3 %
    of a fine-grid integral for gamma 1..7; PM Tz on a single-Tp grid within 1.5 % of the
    [PM-Gamma] value 0.710371 Tp (the omega^-5 tail above 8 wp is cut off)."""
    grid = frequency_grid_rad_s(3.0, 15.0)
    for tp in (3.0, 6.0, 15.0):
        fine = _fine_grid(tp)
        for gam in (1.0, 3.3, 7.0):
            s = jonswap_s_m2_s_rad(grid.omega_rad_s, HS, tp, gam)
            sf = jonswap_s_m2_s_rad(fine, HS, tp, gam)
            hs_c = float(significant_wave_height_m(s, grid.omega_rad_s, grid.weights_rad_s))
            assert hs_c == pytest.approx(float(significant_wave_height_m(sf, fine)), rel=3e-3)
            te_c = float(tm_minus10_s(s, grid.omega_rad_s, grid.weights_rad_s))
            assert te_c == pytest.approx(float(tm_minus10_s(sf, fine)), rel=3e-3)
    single = frequency_grid_rad_s(TP, TP)
    s = pierson_moskowitz_s_m2_s_rad(single.omega_rad_s, HS, TP, normalise_weights=single.weights_rad_s)
    tz = float(tm02_s(s, single.omega_rad_s, single.weights_rad_s))
    assert tz / TP == pytest.approx(0.710371, rel=1.5e-2)


@pytest.mark.parametrize("args", [(0.0, 10.0), (10.0, 5.0), (5.0, np.nan), (5.0, 10.0, 4), (5.0, 10.0, 48.5)])
def test_frequency_grid_bad_input(args: tuple) -> None:
    """Non-positive/NaN periods, tp_max < tp_min and n_freq < 8 or non-integer are rejected."""
    with pytest.raises(SeawayInputError):
        frequency_grid_rad_s(*args)


# ---------------------------------------------------------------------------------------------
# directional spreading
# ---------------------------------------------------------------------------------------------
def _reference_cos2s(theta: float, s: float) -> float:
    """[cos2s-ref] D(theta) = Gamma(s+1)/(2 sqrt(pi) Gamma(s+1/2)) cos^2s(theta/2) [1/rad]."""
    return gamma_fn(s + 1) / (2 * math.sqrt(math.pi) * gamma_fn(s + 0.5)) * math.cos(theta / 2) ** (2 * s)


# s, normalising constant, sigma_theta [deg] -- by hand and [cos2s-ref]: s = 1: Gamma(2)/(2 sqrt(pi)
# Gamma(3/2)) = 1/(2 sqrt(pi) sqrt(pi)/2) = 1/pi = 0.31831, sigma = sqrt(2/2) rad = 57.296 deg;
# s = 2: Gamma(3)/(2 sqrt(pi) (3/4) sqrt(pi)) = 4/(3 pi) = 0.42441, sigma = sqrt(2/3) rad = 46.782 deg.
COS2S_TABLE = [(1.0, 0.31831, 57.296), (2.0, 0.42441, 46.782), (4.0, 0.58205, 36.237), (10.0, 0.90328, 24.431)]


@pytest.mark.parametrize("s, const, sigma_deg", COS2S_TABLE)
def test_cos2s_normalisation_and_spread(s: float, const: float, sigma_deg: float) -> None:
    """[LH1963] constant Gamma(s+1)/(2 sqrt(pi) Gamma(s+1/2)) and integral 1 (scipy quad);
    [Kuik1988] sigma_theta = sqrt(2(1 - m1)) equals sqrt(2/(s+1)); the printed row follows from
    [cos2s-ref] (m1 by quad of the reference, not of the core)."""
    assert _reference_cos2s(0.0, s) == pytest.approx(const, abs=0.5e-5)
    m1_ref = integrate.quad(lambda t: _reference_cos2s(t, s) * math.cos(t), -math.pi, math.pi)[0]
    assert math.degrees(math.sqrt(2 * (1 - m1_ref))) == pytest.approx(sigma_deg, abs=0.5e-3)
    assert math.degrees(math.sqrt(2 / (s + 1))) == pytest.approx(sigma_deg, abs=0.5e-3)
    assert float(cos2s_spreading_per_rad(0.0, s)) == pytest.approx(const, abs=0.5e-5)
    th = np.linspace(-3.1, 3.1, 9)
    np.testing.assert_allclose(cos2s_spreading_per_rad(th, s), [_reference_cos2s(t, s) for t in th], rtol=1e-12, atol=1e-15)
    total = integrate.quad(lambda t: float(cos2s_spreading_per_rad(t, s)), -math.pi, math.pi)[0]
    assert total == pytest.approx(1.0, abs=1e-12)
    m1 = integrate.quad(lambda t: float(cos2s_spreading_per_rad(t, s)) * math.cos(t), -math.pi, math.pi)[0]
    assert m1 == pytest.approx(s / (s + 1.0), rel=1e-10)
    assert math.degrees(math.sqrt(2 * (1 - m1))) == pytest.approx(sigma_deg, abs=0.5e-3)
    assert float(sigma_deg_from_spread_s(s)) == pytest.approx(sigma_deg, abs=0.5e-3)


def test_cos2s_large_s_and_periodicity() -> None:
    """Large s does not overflow (log-gamma); D(theta) is 2 pi-periodic and even; s = 0 uniform."""
    d = cos2s_spreading_per_rad(0.0, 2000.0)
    assert np.isfinite(d) and d > 0
    # Gamma(s+1)/Gamma(s+1/2) ~ sqrt(s) for large s (Stirling): D(0) ~ sqrt(s / (4 pi))
    assert float(d) == pytest.approx(math.sqrt(2000.0 / (4 * math.pi)), rel=1e-3)
    th = np.linspace(-3, 3, 13)
    np.testing.assert_allclose(cos2s_spreading_per_rad(th + 2 * math.pi, 3.0), cos2s_spreading_per_rad(th, 3.0), rtol=1e-12)
    np.testing.assert_allclose(cos2s_spreading_per_rad(-th, 3.0), cos2s_spreading_per_rad(th, 3.0), rtol=1e-14)
    np.testing.assert_allclose(cos2s_spreading_per_rad(th, 0.0), 1 / (2 * math.pi), rtol=1e-15)


def test_cos2s_bad_input() -> None:
    """Negative or NaN s, NaN theta and non-broadcastable shapes are rejected."""
    with pytest.raises(SeawayInputError, match="s must be >= 0"):
        cos2s_spreading_per_rad(0.0, -1.0)
    with pytest.raises(SeawayInputError, match="theta_rel_rad"):
        cos2s_spreading_per_rad(np.nan, 2.0)
    with pytest.raises(SeawayInputError, match="broadcast"):
        cos2s_spreading_per_rad(np.zeros(2), np.ones(3))


def test_spread_s_from_sigma() -> None:
    """[Kuik1988] s = 2/sigma^2 - 1: sigma 30 deg = pi/6 rad -> s = 2/0.274156 - 1 = 6.2951
    (by hand); round trip."""
    assert float(spread_s_from_sigma_deg(30.0)) == pytest.approx(6.295, abs=0.5e-3)
    s = np.array([0.5, 2.0, 6.0, 40.0])
    np.testing.assert_allclose(spread_s_from_sigma_deg(sigma_deg_from_spread_s(s)), s, rtol=1e-12)
    for bad in (0.0, -5.0, 90.0, np.nan):
        with pytest.raises(SeawayInputError, match="sigma_deg"):
            spread_s_from_sigma_deg(bad)


def test_direction_grid() -> None:
    """Uniform grid over [-pi, pi), weights sum to 1 exactly, symmetric about 0; with 72
    directions the discrete circular spread matches sqrt(2/(s+1)) [Kuik1988] within 0.1 %."""
    g = direction_grid(24, 6.0)
    assert isinstance(g, DirectionGrid)
    assert g.n == 24 and g.theta_rel_rad[0] == -math.pi and g.theta_rel_rad[12] == 0.0
    assert g.weights.sum() == 1.0
    np.testing.assert_allclose(g.weights[1:], g.weights[1:][::-1], rtol=1e-12)
    assert int(np.argmax(g.weights)) == 12
    fine = direction_grid(72, 6.0)
    m1 = float(np.sum(fine.weights * np.cos(fine.theta_rel_rad)))
    assert math.degrees(math.sqrt(2 * (1 - m1))) == pytest.approx(float(sigma_deg_from_spread_s(6.0)), rel=1e-3)
    lc = direction_grid(24, 6.0, long_crested=True)
    np.testing.assert_array_equal(lc.theta_rel_rad, [0.0])
    np.testing.assert_array_equal(lc.weights, [1.0])


@pytest.mark.parametrize("n_dir, s", [(1, 6.0), (0, 6.0), (12.5, 6.0), (24, -1.0), (24, np.nan), (24, [1.0, 2.0])])
def test_direction_grid_bad_input(n_dir: object, s: object) -> None:
    """n_dir < 2 or non-integer, negative/NaN or non-scalar s are rejected."""
    with pytest.raises(SeawayInputError):
        direction_grid(n_dir, s)  # type: ignore[arg-type]


# ---------------------------------------------------------------------------------------------
# moments: bad input and zero-energy handling
# ---------------------------------------------------------------------------------------------
def test_moments_bad_input() -> None:
    """Shape mismatch, negative density and bad weights are rejected."""
    om = np.linspace(0.1, 2.0, 6)
    with pytest.raises(SeawayInputError, match="last axis"):
        spectral_moment(np.ones(5), om, 0)
    with pytest.raises(SeawayInputError, match="s_m2_s_rad"):
        spectral_moment(-np.ones(6), om, 0)
    with pytest.raises(SeawayInputError, match="weights"):
        spectral_moment(np.ones(6), om, 0, np.ones(5))
    with pytest.raises(SeawayInputError, match="s_m2_s_rad"):
        spectral_moment(np.array([1, 1, np.nan, 1, 1, 1.0]), om, 0)


def test_zero_energy_periods() -> None:
    """Periods of a calm spectrum: clear error by default, explicit fill value on request."""
    grid = frequency_grid_rad_s(5.0, 10.0)
    s = jonswap_s_m2_s_rad(grid.omega_rad_s, [0.0, 2.0], 8.0, normalise_weights=grid.weights_rad_s)
    for fn in (tm01_s, tm02_s, tm_minus10_s):
        with pytest.raises(SeawayInputError, match="no energy"):
            fn(s, grid.omega_rad_s, grid.weights_rad_s)
        out = fn(s, grid.omega_rad_s, grid.weights_rad_s, zero_energy_period_s=-1.0)
        assert out[0] == -1.0 and 4.0 < out[1] < 9.0
