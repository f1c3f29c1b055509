# SPDX-License-Identifier: GPL-2.0-or-later
"""Spectral response in the encounter domain (integration over absolute frequency).

The tabulated values are recomputed in this file by _reference_rows: the DNV-RP-C205 eq. 3.5.5
JONSWAP written anew (_reference_jonswap), the encounter-domain integrals of PNA 1989 vol. III
ch. 8 by scipy.integrate.trapezoid, MSI by the published formula with scipy.stats.norm.cdf.
It takes the heave/pitch RAOs from jmo_heave_pitch and |Wf| from iso2631_wf_weighting, each
anchored to its own reference in test_transfer.py and test_comfort.py; so these checks anchor
the spectrum, the encounter frequency, the station combination and the integration."""
from __future__ import annotations

import math

import numpy as np
import pytest

from scipy import integrate
from scipy.stats import norm

from seaway_comfort.processing.core.comfort.indices import (
    iso2631_wf_weighting,
    mean_abs_from_rms,
    msdv_m_s15,
    msi_percent,
    vomiting_share_pct,
)
from seaway_comfort.processing.core.numerics import trapezoid_weights
from seaway_comfort.processing.core.motions.response import motion_response, unit_moments
from seaway_comfort.processing.core.waves.spectra import FrequencyGrid
from seaway_comfort.processing.core.motions.closed_form import ClosedFormTransfer, jmo_heave_pitch
from seaway_comfort.processing.core.validation import SeawayInputError
from seaway_comfort.processing.core.vessel.profile import Station, builtin_profile

G = 9.81
# Case of the tables (printed from _reference_rows, which test_rows_follow_from_reference re-runs):
# vessel A (L 12, B0 4, T 1, Cb 0.45), long-crested JONSWAP Hs 1.5, Tp 6, gamma 3.3 (DNV A_gamma
# normalisation), U 4 m/s, trapezoid on omega in [0.1, 6.0] with 59 001 points, g 9.81;
# accelerations at x = 0 and x = 4.8 m with heave and pitch in quadrature; MSI with
# mean|a| = sqrt(2/pi) sigma_a (Lloyd 1989 form).
_OM = np.linspace(0.1, 6.0, 59001)
GRID = FrequencyGrid(_OM, trapezoid_weights(_OM))
STATIONS = [Station("mid", 0.0), Station("fwd", 4.8)]


def _vessel_a(kappa: str, slope: str = "beam_draught") -> ClosedFormTransfer:
    return ClosedFormTransfer(12.0, 4.0, 1.0, 0.45, 4.1129, 0.1, kappa=kappa, slope_reduction=slope, g_m_s2=G)


def _run(tr, mu, speed=4.0):
    return motion_response(tr, STATIONS, hs_m=1.5, tp_s=6.0, wave_from_deg=mu - 180.0, course_deg=0.0,
                           speed_m_s=speed, long_crested=True, g_m_s2=G, frequency_grid=GRID,
                           normalise_spectrum=False)


ROWS_KE = [  # mu, heave, pitch deg, sa0, wz0, msi0, sa48, wz48, msi48 (kappa = exp(-ke T))
    (180, 0.4626, 4.116, 1.4971, 2.0279, 21.61, 2.1080, 2.1792, 29.77),
    (135, 0.4728, 3.218, 1.4361, 2.0252, 20.37, 1.8423, 2.1512, 25.61),
    (90, 0.4602, 0.0, 1.0252, 2.0491, 11.26, 1.0252, 2.0491, 11.26),
    (45, 0.3053, 1.816, 0.1711, 0.7632, None, None, None, None),
    (0, 0.2661, 2.099, 0.0938, 0.6000, None, None, None, None),
]
ROWS_K = [  # recommended kappa = exp(-kT)
    (135, 0.4528, 3.038, 1.3528, 2.0088, 18.92, 1.7255, 2.1312, 23.86),
    (90, 0.3862, 0.0, 0.7248, 1.7324, 8.74, 0.7248, 1.7324, 8.74),
    (45, 0.2941, 1.717, 0.1641, 0.7607, None, 0.1875, 0.7722, None),
]


def _reference_jonswap(w, hs, tp, gam):
    """DNV-RP-C205 eq. 3.5.5 written anew: A_g (5/16) Hs^2 wp^4 w^-5 exp(-1.25 (w/wp)^-4)
    gam^exp(-(w - wp)^2/(2 s^2 wp^2)), A_g = 1 - 0.287 ln gam, s = 0.07 (w <= wp) / 0.09."""
    wp = 2 * math.pi / tp
    sig = np.where(w <= wp, 0.07, 0.09)
    pm = 5 / 16 * hs**2 * wp**4 * w**-5 * np.exp(-1.25 * (w / wp) ** -4)
    return (1 - 0.287 * math.log(gam)) * pm * gam ** np.exp(-((w - wp) ** 2) / (2 * sig**2 * wp**2))


def _reference_msi(sigma_a, wz):
    """Lloyd (1989) p. 335 MSI (2 h) of a Gaussian acceleration: mean |a| = sqrt(2/pi) sigma."""
    mu = -0.819 + 2.32 * math.log10(wz) ** 2
    return 100 * norm.cdf((math.log10(math.sqrt(2 / math.pi) * sigma_a / G) - mu) / 0.4)


def _reference_rows(kappa, mu, u=4.0):
    """(heave sigma [m], pitch sigma [deg], then per x in (0, 4.8) m: sigma_a, wz = sqrt(m6/m4)
    of omega_e^4 |z|^2 S, MSI; last the Wf-weighted sigma_a at x = 0) by the encounter-domain
    integrals over absolute frequency (PNA 1989 vol. III ch. 8): m = int f(omega_e) |H|^2 S d omega,
    omega_e = omega - omega^2 U cos(mu)/g, |z|^2 = heave^2 + x^2 pitch^2."""
    w = np.linspace(0.1, 6.0, 59001)
    we = w - w * w / G * u * math.cos(math.radians(mu))
    s = _reference_jonswap(w, 1.5, 6.0, 3.3)
    r = jmo_heave_pitch(w, w * w / G, mu, u, 12.0, 4.0, 1.0, 0.45, kappa=kappa)
    out = [math.sqrt(integrate.trapezoid(r.heave_m_per_m**2 * s, w)),
           math.degrees(math.sqrt(integrate.trapezoid(r.pitch_rad_per_m**2 * s, w)))]
    for x in (0.0, 4.8):
        z2 = r.heave_m_per_m**2 + x**2 * r.pitch_rad_per_m**2
        m4, m6 = (integrate.trapezoid(we**n * z2 * s, w) for n in (4, 6))
        out += [math.sqrt(m4), math.sqrt(m6 / m4), _reference_msi(math.sqrt(m4), math.sqrt(m6 / m4))]
    wf2 = iso2631_wf_weighting(np.abs(we) / (2 * math.pi)) ** 2
    return out + [math.sqrt(integrate.trapezoid(we**4 * r.heave_m_per_m**2 * wf2 * s, w))]


def _half_unit(v: float) -> float:
    """Half a unit of the last printed digit of a check value (the values are printed rounded)."""
    s = f"{v}"
    dec = len(s.split(".")[1]) if "." in s else 0
    return 0.5 * 10 ** (-dec) + 1e-12


@pytest.mark.parametrize("kappa, row", [("ke", r) for r in ROWS_KE] + [("k", r) for r in ROWS_K])
def test_integrated_responses_methods_4_6(kappa, row):
    mu, heave, pitch, sa0, wz0, msi0, sa48, wz48, msi48 = row
    r = _run(_vessel_a(kappa), mu)
    assert r.heave_rms_m[0] == pytest.approx(heave, abs=_half_unit(heave))
    assert r.pitch_rms_deg[0] == pytest.approx(pitch, abs=_half_unit(pitch))
    assert r.vacc_rms_m_s2[0, 0] == pytest.approx(sa0, abs=_half_unit(sa0))
    assert r.vacc_omega_rad_s[0, 0] == pytest.approx(wz0, abs=_half_unit(wz0))
    if msi0 is not None:
        m = msi_percent(mean_abs_from_rms(r.vacc_rms_m_s2[0, 0]), r.vacc_omega_rad_s[0, 0])
        assert float(m) == pytest.approx(msi0, abs=_half_unit(msi0))
    if sa48 is not None:
        assert r.vacc_rms_m_s2[0, 1] == pytest.approx(sa48, abs=_half_unit(sa48))
        assert r.vacc_omega_rad_s[0, 1] == pytest.approx(wz48, abs=_half_unit(wz48))
    if msi48 is not None:
        m = msi_percent(mean_abs_from_rms(r.vacc_rms_m_s2[0, 1]), r.vacc_omega_rad_s[0, 1])
        assert float(m) == pytest.approx(msi48, abs=_half_unit(msi48))
    assert np.all(np.isfinite(r.heave_tz_s)) and r.flags[0] == 0


@pytest.mark.parametrize("kappa, row", [("ke", r) for r in ROWS_KE] + [("k", r) for r in ROWS_K])
def test_rows_follow_from_reference(kappa, row):
    ref = _reference_rows(kappa, row[0])
    for got, want in zip(ref[:8], row[1:]):
        if want is not None:
            assert got == pytest.approx(want, abs=_half_unit(want))


@pytest.mark.parametrize("kappa, mu, aw, msdv, vomit", [
    ("ke", 180, 0.9877, 83.81, 27.9), ("ke", 90, 0.7407, 62.85, 21.0),
    ("k", 135, 0.9139, 77.55, 25.8), ("k", 90, 0.5778, 49.03, 16.3),
])
def test_wf_weighted_acceleration_and_dose(kappa, mu, aw, msdv, vomit):
    # same case: ISO 2631-1 Wf at |omega_e|/2pi inside the integral (aw from _reference_rows);
    # MSDV(2 h) = aw sqrt(7200) and Km = 1/3 (ISO 2631-1:1997 Annex D), e.g. by hand 0.9877 x
    # 84.8528 = 83.81 m/s^1.5 -> 27.9 %.
    assert _reference_rows(kappa, mu)[-1] == pytest.approx(aw, abs=_half_unit(aw))
    assert aw * math.sqrt(7200) == pytest.approx(msdv, abs=0.01) and msdv / 3 == pytest.approx(vomit, abs=0.06)
    r = _run(_vessel_a(kappa), mu)
    a = r.vacc_wf_rms_m_s2[0, 0]
    assert a == pytest.approx(aw, abs=_half_unit(aw))
    d = float(msdv_m_s15(a, 7200.0))
    assert d == pytest.approx(msdv, abs=0.01)
    assert float(vomiting_share_pct(d)) == pytest.approx(vomit, abs=0.06)


def test_simple_roll_irregular():
    # simple roll model (Lloyd 1989 ch. 9, r = 1), vessel A at zero speed in beam seas, same
    # spectrum: roll = k/sqrt((1 - q^2)^2 + (2 zeta q)^2), q = omega/omega_r, integrated here:
    # roll sigma = 10.146 deg (printed 10.15).
    w = np.linspace(0.1, 6.0, 59001)
    q = w / (2 * math.pi / 4.1129)
    roll = (w * w / G) / np.sqrt((1 - q * q) ** 2 + (0.2 * q) ** 2)
    ref = math.degrees(math.sqrt(integrate.trapezoid(roll**2 * _reference_jonswap(w, 1.5, 6.0, 3.3), w)))
    assert ref == pytest.approx(10.15, abs=0.005)
    r = _run(_vessel_a("k", "none"), 90, speed=0.0)
    assert r.roll_rms_deg[0] == pytest.approx(ref, rel=1e-6)
    assert r.roll_rms_deg[0] == pytest.approx(10.15, abs=0.005)
    # lateral specific force at z = 0 is g * roll (common practice, no source: g*phi term)
    assert r.lacc_rms_m_s2[0, 0] == pytest.approx(G * math.radians(r.roll_rms_deg[0]), rel=1e-12)


@pytest.mark.parametrize("mu, m2e", [(180.0, 0.78806), (90.0, 0.25335), (0.0, 0.08189)])
def test_wave_encounter_moments_methods_3_3(mu, m2e):
    # encounter moments (PNA 1989 vol. III ch. 8) of the wave elevation (H = 1), Hs 2, Tp 8,
    # gamma 3.3, U 5 m/s, deep water, trapezoid on [0.05, 8.0] rad/s with 400 001 points,
    # g 9.80665: m0 0.25058 and m2e, recomputed here from _reference_jonswap.
    om = np.linspace(0.05, 8.0, 400001)
    s_ref = _reference_jonswap(om, 2.0, 8.0, 3.3)
    we = om - om**2 / 9.80665 * 5.0 * math.cos(math.radians(mu))
    assert integrate.trapezoid(s_ref, om) == pytest.approx(0.25058, abs=5e-6)
    assert integrate.trapezoid(we**2 * s_ref, om) == pytest.approx(m2e, abs=5e-6)
    fg = FrequencyGrid(om, trapezoid_weights(om))
    tr = ClosedFormTransfer(12.0, 4.0, 1.0, 0.45, 4.1129, 0.1)
    um = unit_moments(tr, np.array([[8.0]]), np.array([[mu]]), np.array([5.0]), None, np.array([3.3]),
                      np.array([0.0]), long_crested=True, frequency_grid=fg, normalise_spectrum=False,
                      g_m_s2=9.80665)
    assert um.m[0, 0, 3, 0] * 4.0 == pytest.approx(0.25058, abs=5e-6)
    assert um.m[0, 0, 3, 1] * 4.0 == pytest.approx(m2e, abs=5e-6)


def test_variance_scales_with_hs_squared_and_periods_do_not():
    # linear seakeeping superposition (PNA vol. III ch. 8): sigma proportional to Hs.
    p = builtin_profile("coastal_survey_35m")
    tr = ClosedFormTransfer.from_profile(p)
    hs = np.array([0.5, 1.0, 3.0])
    r = motion_response(tr, p.stations, hs_m=hs, tp_s=7.0, wave_from_deg=30.0, course_deg=200.0, speed_m_s=4.0)
    for f in ("heave_rms_m", "pitch_rms_deg", "roll_rms_deg"):
        np.testing.assert_allclose(getattr(r, f) / hs, getattr(r, f)[1], rtol=1e-12)
    np.testing.assert_allclose(r.vacc_rms_m_s2 / hs[:, None], np.broadcast_to(r.vacc_rms_m_s2[1], (3, 4)), rtol=1e-12)
    np.testing.assert_allclose(r.heave_tz_s, r.heave_tz_s[1], rtol=1e-12)


def test_partitions_add_variances():
    # independent seas: variances add (PNA vol. III ch. 8).
    p = builtin_profile("harbour_workboat_12m")
    tr = ClosedFormTransfer.from_profile(p)
    kw = dict(course_deg=40.0, speed_m_s=3.0, gamma=[3.3, 5.0], spread_s=[4.0, 10.0])
    both = motion_response(tr, p.stations, hs_m=[[1.0, 0.7]], tp_s=[[5.0, 10.0]], wave_from_deg=[[0.0, 250.0]], **kw)
    a = motion_response(tr, p.stations, hs_m=[[1.0, 0.0]], tp_s=[[5.0, 10.0]], wave_from_deg=[[0.0, 250.0]], **kw)
    b = motion_response(tr, p.stations, hs_m=[[0.0, 0.7]], tp_s=[[5.0, 10.0]], wave_from_deg=[[0.0, 250.0]], **kw)
    for f in ("heave_rms_m", "roll_rms_deg", "vacc_rms_m_s2", "lacc_rms_m_s2", "vacc_wf_rms_m_s2"):
        np.testing.assert_allclose(getattr(both, f) ** 2, getattr(a, f) ** 2 + getattr(b, f) ** 2, rtol=1e-12)


def test_zero_speed_head_equals_following():
    # common practice, no source: at U = 0 a fore-aft symmetric box responds alike to head and
    # following seas (short-crested, symmetric spreading).
    p = builtin_profile("ocean_research_70m")
    tr = ClosedFormTransfer.from_profile(p)
    r = motion_response(tr, p.stations, hs_m=2.0, tp_s=[9.0, 9.0], wave_from_deg=[0.0, 180.0], course_deg=0.0, speed_m_s=0.0)
    np.testing.assert_allclose(r.heave_rms_m[0], r.heave_rms_m[1], rtol=1e-10)
    np.testing.assert_allclose(r.pitch_rms_deg[0], r.pitch_rms_deg[1], rtol=1e-10)


def test_long_waves_heave_tends_to_wave_sigma():
    # heave RAO -> 1 in long waves (JMO 2004 long-wave limit): heave sigma -> Hs/4.
    p = builtin_profile("harbour_workboat_12m")
    tr = ClosedFormTransfer.from_profile(p)
    r = motion_response(tr, p.stations, hs_m=2.0, tp_s=40.0, wave_from_deg=0.0, course_deg=0.0, speed_m_s=0.0)
    assert r.heave_rms_m[0] == pytest.approx(0.5, rel=0.01)


def test_calm_and_zero_motions_are_finite():
    # module docstring rules: calm -> zero RMS, finite periods; pitch in long-crested beam seas
    # is zero and reports the waves' encounter period.
    p = builtin_profile("harbour_workboat_12m")
    tr = ClosedFormTransfer.from_profile(p)
    r = motion_response(tr, p.stations, hs_m=[0.0, 1.0], tp_s=6.0, wave_from_deg=270.0, course_deg=0.0,
                        speed_m_s=2.0, long_crested=True)
    assert r.heave_rms_m[0] == 0.0 and r.vacc_rms_m_s2[0, 0] == 0.0
    assert r.pitch_rms_deg[1] == 0.0
    for f in ("heave_tz_s", "pitch_tz_s", "roll_tz_s"):
        assert np.all(np.isfinite(getattr(r, f))) and np.all(getattr(r, f) > 0)
    assert np.all(np.isfinite(r.vacc_omega_rad_s)) and np.all(r.vacc_omega_rad_s > 0)


def test_validity_flag_for_high_froude_number():
    # transfer.py documented range Fn <= 0.4: 12 m hull at 6 m/s has Fn 0.55.
    p = builtin_profile("harbour_workboat_12m")
    tr = ClosedFormTransfer.from_profile(p)
    r = motion_response(tr, p.stations, hs_m=1.0, tp_s=6.0, wave_from_deg=0.0, course_deg=0.0, speed_m_s=[2.0, 6.0])
    assert r.flags[0] == 0 and r.flags[1] == 512  # SampleFlag.OUTSIDE_VALIDITY


@pytest.mark.parametrize("arg", ["hs_m", "tp_s", "wave_from_deg", "course_deg", "speed_m_s", "depth_m"])
def test_nan_inputs_raise_naming_the_argument(arg):
    p = builtin_profile("harbour_workboat_12m")
    tr = ClosedFormTransfer.from_profile(p)
    kw = dict(hs_m=[1.0, 1.0], tp_s=[6.0, 6.0], wave_from_deg=[0.0, 0.0], course_deg=[0.0, 0.0],
              speed_m_s=[1.0, 1.0], depth_m=[20.0, 20.0])
    kw[arg] = [1.0, float("nan")]
    with pytest.raises(SeawayInputError, match=arg):
        motion_response(tr, p.stations, **kw)


def test_negative_hs_raises():
    p = builtin_profile("harbour_workboat_12m")
    with pytest.raises(SeawayInputError, match="hs_m must be >= 0"):
        motion_response(ClosedFormTransfer.from_profile(p), p.stations, hs_m=-1.0, tp_s=6.0,
                        wave_from_deg=0.0, course_deg=0.0, speed_m_s=1.0)
