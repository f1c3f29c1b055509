# SPDX-License-Identifier: GPL-2.0-or-later
"""Closed-form heave/pitch (Jensen, Mansour & Olsen 2004), slope-driven roll, IMO roll period.

Every expected number is traceable from this file: the JMO rows are recomputed by _reference_jmo,
an independent scalar transcription of the JMO (2004) formulas written in this file (plain math,
direct A^2/(k B alpha^3) form, none of the core's guard identities; equations as summarised in
the core's docstring, the paper not re-read); the roll period and roll
values are derived by hand beside the checks."""
from __future__ import annotations

import math

import numpy as np
import pytest

from seaway_comfort.processing.core.vessel.roll_period import imo_roll_period_s
from seaway_comfort.processing.core.motions.closed_form import (
    ClosedFormTransfer,
    effective_slope_factor,
    jmo_heave_pitch,
    jmo_validity_mask,
    roll_transfer_rad_per_m,
)
from seaway_comfort.processing.core.validation import SeawayInputError

G = 9.81  # the check values below were computed with g = 9.81
W = np.array([0.5, 1.0, 1.5, 2.0, 2.5, 3.0])
K = W**2 / G
A = dict(length_m=12.0, beam_m=4.0, draught_m=1.0, block_coeff=0.45)   # vessel A
B = dict(length_m=82.8, beam_m=19.2, draught_m=6.0, block_coeff=0.65)  # vessel B



def _reference_jmo(w: float, mu_deg: float, u: float, length_m: float, beam_m: float, draught_m: float,
                   block_coeff: float, kappa: str = "k") -> tuple:
    """Independent transcription of Jensen, Mansour & Olsen (2004), Ocean Eng. 31(1) 61-85, for
    one deep-water frequency (the equations as summarised in closed_form's module docstring,
    re-typed here in scalar form without the core's code or guard identities):
    k = w^2/g, alpha = 1 - k U cos(mu)/w, B = Cb B0, ke = k |cos mu|, sigma = ke L/2,
    A = 2 sin(k B alpha^2/2) exp(-k T alpha^2), f = sqrt((1 - kT)^2 + (A^2/(k B alpha^3))^2),
    kappa = exp(-kT) or exp(-ke T), F = kappa f sin(sigma)/sigma,
    G = kappa f (6/L)(1/sigma)(sin(sigma)/sigma - cos(sigma)),
    eta = 1/sqrt((1 - 2 k T alpha^2)^2 + (A^2/(k B alpha^2))^2).
    Returns (heave [m/m] = eta |F|, pitch [deg/m] = eta |G|); beam seas (sigma = 0): F = kappa f,
    G = 0 (limits sin s/s -> 1, (sin s/s - cos s)/s -> 0). This catches coding errors, not a
    misreading of the paper shared with the docstring; the limits below are derived by hand."""
    k = w * w / G
    cmu = math.cos(math.radians(mu_deg))
    alpha = 1.0 - k * u * cmu / w
    b = block_coeff * beam_m
    sigma = k * abs(cmu) * length_m / 2.0
    a = 2.0 * math.sin(k * b * alpha**2 / 2.0) * math.exp(-k * draught_m * alpha**2)
    f = math.sqrt((1.0 - k * draught_m) ** 2 + (a * a / (k * b * alpha**3)) ** 2)
    kap = math.exp(-(k if kappa == "k" else k * abs(cmu)) * draught_m)
    eta = 1.0 / math.sqrt((1.0 - 2.0 * k * draught_m * alpha**2) ** 2 + (a * a / (k * b * alpha**2)) ** 2)
    if sigma < 1e-9:
        return eta * kap * f, 0.0
    big_f = kap * f * math.sin(sigma) / sigma
    big_g = kap * f * (6.0 / length_m) / sigma * (math.sin(sigma) / sigma - math.cos(sigma))
    return eta * abs(big_f), math.degrees(eta * abs(big_g))


# Check values printed from _reference_jmo (B = Cb*B0, g = 9.81; not printed in the paper);
# test_table_rows_follow_from_reference recomputes each row. Vessel A: L 12, B0 4, T 1, Cb 0.45;
# vessel B: L 82.8, B0 19.2, T 6, Cb 0.65.
TABLE = [
    # vessel, U, mu, kappa, quantity, values
    (A, 4.0, 180, "k", "heave", [1.0209, 1.2062, 1.2747, 0.0613, 0.0075, 0.0005]),
    (A, 4.0, 180, "ke", "heave", [1.0209, 1.2062, 1.2747, 0.0613, 0.0075, 0.0005]),
    (A, 4.0, 180, "k", "pitch", [1.4930, 7.2271, 19.3367, 2.8213, 0.2098, 0.0179]),
    (A, 4.0, 135, "ke", "heave", [1.0230, 1.1838, 1.8262, 0.2474, 0.0131, 0.0014]),
    (A, 4.0, 135, "k", "heave", [1.0154, 1.1490, 1.7076, 0.2196, 0.0109, 0.0011]),
    (A, 4.0, 135, "ke", "pitch", [1.0570, 4.9512, 18.1475, 5.2353, 0.9399, 0.0328]),
    (A, 4.0, 135, "k", "pitch", [1.0492, 4.8055, 16.9684, 4.6459, 0.7799, 0.0251]),
    (A, 4.0, 90, "ke", "heave", [1.0268, 1.1239, 1.3556, 1.8518, 1.1656, 0.2610]),
    (A, 4.0, 90, "k", "heave", [1.0010, 1.0150, 1.0778, 1.2317, 0.6164, 0.1043]),
    (A, 4.0, 0, "k", "heave", [0.9781, 0.8235, 0.4771, 0.1086, 0.0317, 0.0194]),
    (A, 4.0, 0, "k", "pitch", [1.4304, 4.9342, 7.2377, 5.0037, 0.8826, 0.6630]),
    (B, 5.0, 180, "k", "heave", [1.0380, 0.0248, 0.0001, 0.0004, 0.0001, 0.0000]),
    (B, 5.0, 180, "k", "pitch", [1.6414, 0.0309, 0.0054, 0.0005, 0.0001, 0.0000]),
    (B, 5.0, 90, "ke", "heave", [1.1999, 1.2828, 0.2201, 0.3716, 0.4248, 0.4500]),
    (B, 5.0, 90, "k", "heave", [1.0298, 0.6959, 0.0556, 0.0322, 0.0093, 0.0018]),
]


@pytest.mark.parametrize("hull, u, mu, kappa, qty, expected", TABLE)
def test_jmo_table_values(hull, u, mu, kappa, qty, expected):
    r = jmo_heave_pitch(W, K, mu, u, **hull, kappa=kappa)
    got = r.heave_m_per_m if qty == "heave" else np.degrees(r.pitch_rad_per_m)
    np.testing.assert_allclose(got, expected, atol=5.1e-5)  # half a unit of the 4th decimal


@pytest.mark.parametrize("hull, u, mu, kappa, qty, expected", TABLE)
def test_table_rows_follow_from_reference(hull, u, mu, kappa, qty, expected):
    ref = [_reference_jmo(w, mu, u, **hull, kappa=kappa)[0 if qty == "heave" else 1] for w in W]
    np.testing.assert_allclose(ref, expected, atol=5.1e-5)


def test_encounter_frequency_rows():
    # encounter frequency omega_e = omega - k U cos mu (PNA 1989 vol. III ch. 8), U = 4 m/s; by
    # hand: omega 0.5, head seas: 0.5 + 0.25/9.81 x 4 = 0.5 + 0.10194 = 0.60194; omega 2.5,
    # following: 2.5 - 6.25/9.81 x 4 = 2.5 - 2.54842 = -0.04842 (overtaking, negative).
    assert 0.5 + 0.5**2 / G * 4 == pytest.approx(0.6019, abs=5e-5)
    assert 2.5 - 2.5**2 / G * 4 == pytest.approx(-0.0484, abs=5e-5)
    r = jmo_heave_pitch(W, K, 180, 4.0, **A)
    np.testing.assert_allclose(r.omega_e_rad_s, [0.6019, 1.4077, 2.4174, 3.6310, 5.0484, 6.6697], atol=5e-5)
    r0 = jmo_heave_pitch(W, K, 0, 4.0, **A)
    np.testing.assert_allclose(r0.omega_e_rad_s, [0.3981, 0.5923, 0.5826, 0.3690, -0.0484, -0.6697], atol=5e-5)


def test_long_wave_limit():
    # JMO (2004) long-wave limit: L 100, B0 20, T 5, Cb 1, U 0, mu 180, omega 0.05 -> heave
    # 0.99998, pitch/k 0.99999 (_reference_jmo; heave RAO -> 1, pitch RAO -> wave slope k).
    k = 0.05**2 / G
    h_ref, p_ref = _reference_jmo(0.05, 180, 0.0, 100.0, 20.0, 5.0, 1.0)
    assert h_ref == pytest.approx(0.99998, abs=1e-5) and math.radians(p_ref) / k == pytest.approx(0.99999, abs=1e-5)
    r = jmo_heave_pitch(0.05, k, 180, 0.0, 100.0, 20.0, 5.0, 1.0)
    assert float(r.heave_m_per_m) == pytest.approx(0.99998, abs=1e-5)
    assert float(r.pitch_rad_per_m) / k == pytest.approx(0.99999, abs=1e-5)
    # common practice, no source: heave -> 1 at every heading with kappa = exp(-kT)
    # (long-wave expansion of the JMO formulas: 1 + O(k^2), derived, no source).
    for mu in (0, 45, 90, 135, 180):
        h = jmo_heave_pitch(0.02, 0.02**2 / G, mu, 0.0, 40.0, 10.0, 2.5, 0.6).heave_m_per_m
        assert abs(float(h) - 1.0) < 1e-3


def test_short_wave_limit_tends_to_zero():
    # common practice, no source: heave and pitch vanish for waves much shorter than the hull.
    w = np.array([6.0, 10.0])
    r = jmo_heave_pitch(w, w**2 / G, 150, 3.0, **B)
    assert np.all(r.heave_m_per_m < 1e-3) and np.all(r.pitch_rad_per_m < 1e-4)


def test_zero_speed_head_following_symmetry():
    # common practice, no source: at U = 0 the box hull responds alike to head and following seas.
    w = np.linspace(0.2, 3.0, 50)
    h = jmo_heave_pitch(w, w**2 / G, 180, 0.0, **A)
    f = jmo_heave_pitch(w, w**2 / G, 0, 0.0, **A)
    np.testing.assert_allclose(h.heave_m_per_m, f.heave_m_per_m, rtol=1e-12)
    np.testing.assert_allclose(h.pitch_rad_per_m, f.pitch_rad_per_m, rtol=1e-12)


def test_alpha_zero_guard_is_finite_and_has_its_limit():
    # JMO (2004) with alpha = 0 at omega = g/(U cos mu) = 9.81/4 = 2.4525 rad/s for U 4, mu 0 (by hand);
    # limit eta -> 1, f -> |1 - kT|, so heave = exp(-kT)|1-kT| sinc(sigma).
    w = G / 4.0
    k = w**2 / G
    r = jmo_heave_pitch(w, k, 0, 4.0, **A)
    sig = k * 12.0 / 2
    expected = np.exp(-k) * abs(1 - k) * abs(np.sin(sig) / sig)
    assert np.isfinite(r.heave_m_per_m) and float(r.heave_m_per_m) == pytest.approx(expected, rel=1e-9)


def test_beam_sea_pitch_is_zero_and_finite():
    r = jmo_heave_pitch(W, K, 90, 4.0, **A)
    assert np.all(np.isfinite(r.pitch_rad_per_m)) and np.all(r.pitch_rad_per_m == 0.0)


def test_imo_roll_period_table():
    # IMO 2008 IS Code (MSC.267(85)) Part A 2.3: T = 2CB/sqrt(GM), C = 0.373 + 0.023 B/d
    # - 0.043 Lwl/100. By hand, row 1: C = 0.373 + 0.0575 - 0.0645 = 0.3660, T = 14.640/1.224745
    # = 11.9535 s; row 2: C = 0.373 + 0.092 - 0.00516 = 0.45984, T = 3.67872/0.894427 = 4.1129 s.
    assert 2 * 0.3660 * 20 / math.sqrt(1.5) == pytest.approx(11.9535, abs=5e-5)
    assert 2 * 0.45984 * 4 / math.sqrt(0.8) == pytest.approx(4.1129, abs=5e-5)
    rows = [(20, 8, 150, 1.5, 11.9535), (4, 1.0, 12, 0.8, 4.1129), (3.5, 0.6, 10, 1.2, 3.2134),
            (19.2, 6, 82.8, 1.0, 15.7822)]
    for b, d, lwl, gm, t in rows:
        assert float(imo_roll_period_s(b, d, lwl, gm)) == pytest.approx(t, abs=5e-5)
        c = 0.373 + 0.023 * b / d - 0.043 * lwl / 100  # every row by the Code's formula
        assert 2 * c * b / math.sqrt(gm) == pytest.approx(t, abs=5e-5)
    with pytest.raises(SeawayInputError, match="gm_m must be > 0"):
        imo_roll_period_s(4, 1, 12, 0.0)


def test_simple_roll_model_values():
    # 1-DOF slope-driven roll (Lloyd 1989 ch. 9; Bhattacharyya 1978 ch. 5), r = 1, vessel A,
    # T_roll 4.1129 s, zeta 0.1, mu 90, U 0: roll = k / sqrt((1 - q^2)^2 + (2 zeta q)^2), q = w/wr.
    # By hand: wr = 2 pi/4.1129 = 1.527678; at resonance (q = 1) roll = k/(2 zeta) = 0.237900/0.2
    # = 1.18950 rad = 68.153 deg/m; w 1.0: k = 0.101937, q = 0.654588, 1 - q^2 = 0.571514,
    # 2 zeta q = 0.130918, root 0.586317 -> 0.173859 rad = 9.9614 deg/m; w 2.0: k = 0.407747,
    # q = 1.309177, 1 - q^2 = -0.713944, 2 zeta q = 0.261835, root 0.760443 -> 0.536197 rad
    # = 30.7218 deg/m.
    for w_, k_ in ((1.0, 0.101937), (1.527678, 0.237900), (2.0, 0.407747)):
        assert w_**2 / G == pytest.approx(k_, abs=1e-6)
    assert math.degrees(0.101937 / 0.586317) == pytest.approx(9.9614, abs=1.5e-3)
    assert math.degrees(0.237900 / 0.2) == pytest.approx(68.1533, abs=1.5e-3)
    assert math.degrees(0.407747 / 0.760443) == pytest.approx(30.7218, abs=1.5e-3)
    w = np.array([1.0, 2 * np.pi / 4.1129, 2.0])
    r = roll_transfer_rad_per_m(w**2 / G, 90, w, 4.1129, 0.1, 4.0, 1.0, slope_reduction="none")
    np.testing.assert_allclose(np.degrees(r), [9.9614, 68.1533, 30.7218], atol=1.5e-3)


def test_slope_factor_limits():
    # common practice, no source: 3(sin y - y cos y)/y^3 -> 1 as y -> 0 (series 1 - y^2/10).
    r = effective_slope_factor(np.array([1e-6, 0.1]), 90, 4.0, 1.0, "beam")
    np.testing.assert_allclose(r, [1.0, 1 - 0.2**2 / 10 + 0.2**4 / 280], rtol=1e-6)
    assert float(roll_transfer_rad_per_m(0.1, 180, 1.0, 4.0, 0.1, 4.0, 1.0)) == 0.0


def test_validity_mask_and_model():
    # Our documented range (transfer.py docstring): Fn <= 0.4.
    u = np.array([0.0, 0.4 * np.sqrt(9.80665 * 12.0) * 0.999, 0.4 * np.sqrt(9.80665 * 12.0) * 1.001])
    np.testing.assert_array_equal(jmo_validity_mask(u, 12.0, 4.0, 1.0), [True, True, False])
    assert not jmo_validity_mask(1.0, 12.0, 1.0, 0.5).any()  # L/B = 12 > 10
    m = ClosedFormTransfer(12.0, 4.0, 1.0, 0.45, 4.1129, 0.1)
    t = m.evaluate(W, K, 90.0, 0.0)
    assert t.roll_rad_per_m.shape == W.shape and np.all(t.roll_rad_per_m > 0)


def test_bad_inputs():
    with pytest.raises(SeawayInputError, match="kappa"):
        jmo_heave_pitch(W, K, 180, 1.0, **A, kappa="x")
    with pytest.raises(SeawayInputError, match="omega_rad_s"):
        jmo_heave_pitch(np.array([np.nan]), K[:1], 180, 1.0, **A)
    with pytest.raises(SeawayInputError, match="speed_m_s"):
        jmo_heave_pitch(W, K, 180, -1.0, **A)


def test_slope_factor_is_an_amplitude():
    # 3(sin y - y cos y)/y^3 changes sign at y = 4.4934 (first root of tan y = y, a standard
    # result; common practice, no source): the reduction factor must stay >= 0.
    k = np.array([2 * 4.0 / 4.0, 2 * 6.0 / 4.0])  # y = 4 and 6 for B = 4 at beam seas
    r = effective_slope_factor(k, 90, 4.0, 1.0, "beam")
    assert np.all(r >= 0) and r[1] == pytest.approx(abs(3 * (np.sin(6) - 6 * np.cos(6)) / 216), rel=1e-12)
    roll = roll_transfer_rad_per_m(k, 90, np.sqrt(9.81 * k), 4.0, 0.1, 4.0, 1.0)
    assert np.all(roll >= 0)
