# SPDX-License-Identifier: GPL-2.0-or-later
"""Relative heading, IMO angle of encounter, encounter frequency and period.

Sources (keys used in the comments):
  [ITTC]      ITTC seakeeping convention mu = 180 head, 90 beam, 0 following (ITTC Symbols and
              Terminology List; edition from memory [C]).
  [IMO1228]   IMO MSC.1/Circ.1228 (2007) symbol table: alpha = 0 head sea, 90 sea from starboard.
  [PNA1989]   Lewis (ed.) (1989) Principles of Naval Architecture vol. III ch. 8:
              omega_e = omega - k U cos(mu).
  [ref]       reference computation in this file (_reference_encounter): omega = 2 pi / T; k from
              the Airy dispersion relation omega^2 = g k tanh(k h) (Dean & Dalrymple, Water Wave
              Mechanics for Engineers and Scientists, 1991, eq. 4.19; deep water k = omega^2 / g)
              solved with scipy.optimize.brentq, not with the core's solver; c = omega / k;
              omega_e = omega - k U cos mu [PNA1989]; Te = 2 pi / |omega_e|. The tables below were
              printed from it and test_tables_follow_from_the_reference recomputes every row.
  [practice]  practitioner's worked example: common practice, no source (rounded figures).
"""
from __future__ import annotations

import math

import numpy as np
import pytest

from seaway_comfort.processing.core.waves.dispersion import wave_kinematics, wavenumber_rad_m
from seaway_comfort.processing.core.waves.encounter import (
    EncounterPeriod,
    cos_deg,
    encounter_frequency_rad_s,
    encounter_period,
    fold_heading_deg,
    imo_angle_of_encounter_deg,
    relative_heading_deg,
)
from seaway_comfort.processing.core.units import KNOT_M_S
from seaway_comfort.processing.core.validation import SeawayInputError

G = 9.80665  # standard gravity [m/s^2] (CGPM 1901)


def _reference_encounter(period_s, depth_m, speed_m_s, mu_deg):
    """(k, c, omega_e, Te) by the [ref] computation of the module docstring."""
    from scipy.optimize import brentq

    w = 2.0 * math.pi / period_s
    if depth_m is None:
        k = w * w / G
    else:
        k = brentq(lambda kk: w * w - G * kk * math.tanh(kk * depth_m), 1e-9, 10.0, xtol=1e-15)
    we = w - k * speed_m_s * math.cos(math.radians(mu_deg))
    return k, w / k, we, 2.0 * math.pi / abs(we)

# course, wave_from, mu (ITTC), alpha (IMO)  -- by hand from the definitions: waves coming from
# dead ahead (from == course) are head seas, mu 180 [ITTC], alpha 0 [IMO1228]; a wave direction
# turned by x deg clockwise from the bow turns mu by -x and alpha by +x.
HEADING_TABLE = [
    (0.0, 0.0, 180.0, 0.0),      # head seas
    (180.0, 0.0, 0.0, 180.0),    # following seas
    (90.0, 0.0, 90.0, 270.0),    # beam, waves from port
    (45.0, 0.0, 135.0, 315.0),   # bow quartering
    (350.0, 10.0, 200.0, 20.0),  # near head (wrap-around)
    (200.0, 30.0, 10.0, 190.0),  # near following
]


@pytest.mark.parametrize("course, wave_from, mu, alpha", HEADING_TABLE)
def test_relative_heading_table(course: float, wave_from: float, mu: float, alpha: float) -> None:
    """mu = (from + 180 - course) mod 360 [ITTC] and alpha = (from - course) mod 360 [IMO1228];
    rows by hand (table comment); mu = (alpha + 180) mod 360 and cos mu = -cos alpha in every row."""
    got_mu = float(relative_heading_deg(course, wave_from))
    got_alpha = float(imo_angle_of_encounter_deg(course, wave_from))
    assert got_mu == pytest.approx(mu, abs=1e-12)
    assert got_alpha == pytest.approx(alpha, abs=1e-12)
    assert (got_alpha + 180.0) % 360.0 == pytest.approx(got_mu, abs=1e-12)
    assert math.cos(math.radians(got_mu)) == pytest.approx(-math.cos(math.radians(got_alpha)), abs=1e-12)


def test_beam_seas_from_port_and_starboard() -> None:
    """[ITTC] as used here: mu 90 = waves from port, 270 = from starboard; fold maps both to 90."""
    # course north, waves from west (port side) -> 90; from east (starboard) -> 270
    assert float(relative_heading_deg(0.0, 270.0)) == 90.0
    assert float(relative_heading_deg(0.0, 90.0)) == 270.0
    # IMO: sea from starboard is alpha 90 [IMO1228]
    assert float(imo_angle_of_encounter_deg(0.0, 90.0)) == 90.0
    np.testing.assert_array_equal(fold_heading_deg([90.0, 270.0, 0.0, 180.0, 200.0, -30.0, 720.0]),
                                  [90.0, 90.0, 0.0, 180.0, 160.0, 30.0, 0.0])


def test_relative_heading_range_and_broadcast() -> None:
    """Output in [0, 360) for any finite input, with numpy broadcasting."""
    mu = relative_heading_deg(np.array([[-720.0], [359.999], [1e6]]), np.array([0.0, 180.0, -1e-17]))
    assert mu.shape == (3, 3)
    assert np.all((mu >= 0.0) & (mu < 360.0))


def test_cos_deg_exact_quadrants() -> None:
    """cos is exactly 0 at 90/270 and exactly -1/1 at 180/0 (so beam seas give omega_e == omega)."""
    np.testing.assert_array_equal(cos_deg([0.0, 90.0, 180.0, 270.0, 360.0, -90.0]), [1, 0, -1, 0, 1, 0])
    np.testing.assert_allclose(cos_deg([45.0, 135.0]), [math.sqrt(0.5), -math.sqrt(0.5)], rtol=1e-15)


# T, h, U [m/s], mu, k, c, omega_e, Te -- [ref] (formula [PNA1989]), printed digits
U10 = 10.0 * KNOT_M_S
ENCOUNTER_TABLE = [
    (8.0, None, U10, 180.0, 0.062901, 12.4862, 1.10899, 5.6657),
    (8.0, None, U10, 135.0, 0.062901, 12.4862, 1.01421, 6.1951),
    (8.0, None, U10, 90.0, 0.062901, 12.4862, 0.78540, 8.0000),
    (8.0, None, U10, 45.0, 0.062901, 12.4862, 0.55658, 11.2888),
    (8.0, None, U10, 0.0, 0.062901, 12.4862, 0.46181, 13.6057),
    (4.0, None, 8.0, 0.0, 0.251605, 6.2431, -0.44204, 14.2140),   # overtaking
    (8.0, 10.0, 5.0, 180.0, 0.088641, 8.8604, 1.22860, 5.1141),
    (8.0, 10.0, 5.0, 0.0, 0.088641, 8.8604, 0.34219, 18.3616),
]


@pytest.mark.parametrize("period, depth, speed, mu, k, c, omega_e, te", ENCOUNTER_TABLE)
def test_encounter_table(period, depth, speed, mu, k, c, omega_e, te) -> None:  # type: ignore[no-untyped-def]
    """[ref] rows to half a unit of the last printed digit; Te = L/|c - U cos mu| is the same
    quantity written with wavelength and celerity (equivalence of the core's two paths)."""
    enc = encounter_period(period, speed, mu, depth, g_m_s2=G)
    kin = wave_kinematics(period, depth, g_m_s2=G)
    assert float(kin.k_rad_m) == pytest.approx(k, abs=0.5e-6)
    assert float(kin.celerity_m_s) == pytest.approx(c, abs=0.5e-4)
    assert float(enc.omega_e_rad_s) == pytest.approx(omega_e, abs=0.5e-5)
    assert float(enc.period_s) == pytest.approx(te, abs=0.5e-4)
    direct = float(kin.wavelength_m) / abs(float(kin.celerity_m_s) - speed * math.cos(math.radians(mu)))
    assert float(enc.period_s) == pytest.approx(direct, rel=1e-12)
    assert bool(enc.overtaking) == (omega_e < 0)


def test_encounter_frequency_function_matches_and_deep_form() -> None:
    """encounter_frequency_rad_s = omega - k U cos mu [PNA1989]; deep water equals
    omega - omega^2 U cos(mu)/g; beam seas and zero speed give omega exactly."""
    omega = np.linspace(0.3, 2.0, 7)
    k = wavenumber_rad_m(omega, g_m_s2=G)
    mu = np.array([[0.0], [45.0], [90.0], [180.0], [270.0]])
    oe = encounter_frequency_rad_s(omega, k, 4.0, mu)
    np.testing.assert_allclose(oe, omega - omega**2 * 4.0 * np.cos(np.radians(mu)) / G, rtol=1e-13, atol=1e-15)
    np.testing.assert_array_equal(oe[2], omega)
    np.testing.assert_array_equal(oe[4], omega)
    np.testing.assert_array_equal(encounter_frequency_rad_s(omega, k, 0.0, 180.0), omega)
    enc = encounter_period(2 * math.pi / omega, 4.0, mu, g_m_s2=G)
    np.testing.assert_allclose(enc.omega_e_rad_s, oe, rtol=1e-12, atol=1e-15)


def test_imo_nomogram_formula_close_to_exact() -> None:
    """The IMO practical formula TE = 3 TW^2/(3 TW + V cos alpha) (Circ.1228 Fig. 1, formula from
    memory [C]) lies within 1.2 % of the exact deep-water period, which [ref] gives as (8 s,
    10 kn, alpha 0) 5.6657 (nomogram 5.6471), (alpha 180) 13.6057 (13.7143), (10 s, 15 kn,
    alpha 180) 19.779 (20.000)."""
    for tw, v_kn, alpha, exact in [(8.0, 10.0, 0.0, 5.6657), (8.0, 10.0, 180.0, 13.6057), (10.0, 15.0, 180.0, 19.779)]:
        mu = (alpha + 180.0) % 360.0
        ours = float(encounter_period(tw, v_kn * KNOT_M_S, mu, g_m_s2=G).period_s)
        assert _reference_encounter(tw, None, v_kn * 1852.0 / 3600.0, mu)[3] == pytest.approx(exact, abs=0.5e-3)
        assert ours == pytest.approx(exact, abs=0.5e-3)
        nomogram = 3 * tw**2 / (3 * tw + v_kn * math.cos(math.radians(alpha)))
        assert ours == pytest.approx(nomogram, rel=1.2e-2)


def test_practitioner_worked_example() -> None:
    """[practice] (common practice, no source; rounded figures) deep water, representative period
    Te ~ 0.86 Tp: Tp 3 s -> L ~ 10.4 m, c ~ 4.03 m/s; Tp 6 s -> L ~ 41.6 m, c ~ 8.05 m/s. Boat
    3.25 m/s: head seas on the 3 s sea -> ~1.43 s; following -> ~13.3 s; 6 s sea following ->
    ~8.66 s; waves travelling 40 deg off the course (mu = 40) -> ~7.44 s. The core must equal
    the [ref] computation (deep water: k = omega^2/g, L = g T^2 / (2 pi), c = g T / (2 pi);
    e.g. T 2.58 s: L = 9.80665 * 2.58^2 / 6.28319 = 10.389 m); the example's rounded figures
    must lie within 1 % of [ref] (it gives 13.37 s and 7.47 s for the two most sensitive)."""
    u = 3.25
    for t, l_ex, c_ex in [(0.86 * 3.0, 10.4, 4.03), (0.86 * 6.0, 41.6, 8.05)]:
        k, c, _, _ = _reference_encounter(t, None, u, 0.0)
        kin = wave_kinematics(t, g_m_s2=G)
        assert float(kin.wavelength_m) == pytest.approx(2 * math.pi / k, rel=1e-9)
        assert float(kin.celerity_m_s) == pytest.approx(c, rel=1e-9)
        assert 2 * math.pi / k == pytest.approx(l_ex, abs=0.05)
        assert c == pytest.approx(c_ex, abs=0.005)
    for t, mu, te_ex in [(0.86 * 3.0, 180.0, 1.43), (0.86 * 3.0, 0.0, 13.3), (0.86 * 6.0, 0.0, 8.66),
                         (0.86 * 6.0, 40.0, 7.44)]:
        te = _reference_encounter(t, None, u, mu)[3]
        assert float(encounter_period(t, u, mu, g_m_s2=G).period_s) == pytest.approx(te, rel=1e-9)
        assert te == pytest.approx(te_ex, rel=1e-2)


@pytest.mark.parametrize("period, depth, speed, mu, k, c, omega_e, te", ENCOUNTER_TABLE)
def test_tables_follow_from_the_reference(period, depth, speed, mu, k, c, omega_e, te) -> None:  # type: ignore[no-untyped-def]
    """Every ENCOUNTER_TABLE row recomputed by [ref], to half a unit of its last printed digit."""
    rk, rc, rwe, rte = _reference_encounter(period, depth, speed, mu)
    assert (rk, rc, rwe, rte) == (pytest.approx(k, abs=0.5e-6), pytest.approx(c, abs=0.5e-4),
                                  pytest.approx(omega_e, abs=0.5e-5), pytest.approx(te, abs=0.5e-4))


def test_overtaking_and_zero_encounter() -> None:
    """U cos mu >= c -> overtaking; U cos mu == c -> omega_e ~ 0, period inf or huge (never NaN)."""
    kin = wave_kinematics(6.0)
    c = float(kin.celerity_m_s)
    enc = encounter_period(6.0, np.array([0.5 * c, c, 1.5 * c]), 0.0)
    assert isinstance(enc, EncounterPeriod)
    np.testing.assert_array_equal(enc.overtaking, [False, True, True])
    assert enc.period_s[1] > 1e6 and not np.isnan(enc.period_s[1])
    assert enc.omega_e_rad_s[2] < 0 and np.isfinite(enc.period_s[2])
    # head and beam seas never overtake
    assert not np.any(encounter_period(6.0, 2 * c, [90.0, 180.0, 270.0]).overtaking)
    # the exact-zero branch returns inf
    assert float(encounter_period(2 * math.pi, 1.0, 0.0, g_m_s2=1.0).period_s) == math.inf


def test_broadcast_shapes() -> None:
    """period (n,1) x heading (m,) broadcast; speed per element."""
    enc = encounter_period(np.array([[5.0], [8.0]]), np.array([2.0, 3.0, 4.0]), np.array([0.0, 90.0, 180.0]))
    assert enc.period_s.shape == (2, 3) == enc.omega_e_rad_s.shape == enc.overtaking.shape


@pytest.mark.parametrize(
    "args, name",
    [
        ((8.0, -1.0, 180.0), "speed_m_s"),
        ((8.0, np.nan, 180.0), "speed_m_s"),
        ((0.0, 5.0, 180.0), "period_s"),
        ((np.nan, 5.0, 180.0), "period_s"),
        ((8.0, 5.0, np.nan), "rel_heading_deg"),
        ((8.0, 5.0, 180.0, -10.0), "depth_m"),
        ((np.ones(3) * 8, np.ones(4), 180.0), "broadcast"),
    ],
)
def test_encounter_period_bad_input(args: tuple, name: str) -> None:
    """speed < 0, bad period/heading/depth, non-broadcastable shapes -> SeawayInputError."""
    with pytest.raises(SeawayInputError, match=name):
        encounter_period(*args)


def test_heading_bad_input() -> None:
    """NaN/inf or non-numeric angles are rejected with the argument's name."""
    with pytest.raises(SeawayInputError, match="course_deg"):
        relative_heading_deg(np.nan, 0.0)
    with pytest.raises(SeawayInputError, match="wave_from_deg"):
        relative_heading_deg(0.0, np.inf)
    with pytest.raises(SeawayInputError, match="wave_from_deg"):
        imo_angle_of_encounter_deg(0.0, "north")
    with pytest.raises(SeawayInputError, match="rel_heading_deg"):
        fold_heading_deg(np.nan)
    with pytest.raises(SeawayInputError, match="k_rad_m"):
        encounter_frequency_rad_s(1.0, 0.0, 1.0, 0.0)
    with pytest.raises(SeawayInputError, match="speed_m_s"):
        encounter_frequency_rad_s(1.0, 0.1, -1.0, 0.0)
    with pytest.raises(SeawayInputError, match="broadcast"):
        relative_heading_deg(np.zeros(2), np.zeros(3))
    with pytest.raises(SeawayInputError, match="broadcast"):
        imo_angle_of_encounter_deg(np.zeros(2), np.zeros(3))
    with pytest.raises(SeawayInputError, match="broadcast"):
        encounter_frequency_rad_s(np.ones(2), np.ones(3), 1.0, 0.0)
