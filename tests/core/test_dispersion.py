# SPDX-License-Identifier: GPL-2.0-or-later
"""Linear (Airy) dispersion: checks against published tables, a reference root finder and limits.

Sources (keys used in the comments):
  [SPM1984]   USACE Shore Protection Manual (1984), Appendix C, Table C-1 (d/L versus d/L0).
  [ref]       reference computation in this file (_reference_kinematics): k solving
              omega^2 = g k tanh(kh) (Dean & Dalrymple, Water Wave Mechanics for Engineers and
              Scientists, 1991, eq. 4.19) with scipy.optimize.brentq (not the core's Newton
              solver); L = 2 pi / k, c = omega / k, n = c_g / c = (1 + 2kh / sinh 2kh) / 2
              (Dean & Dalrymple 1991, group velocity, ch. 4; equation number from memory).
              The tables below were printed from it; test_tables_follow_from_the_reference
              recomputes every row, so each number is traceable from this file.
  [Airy]      Airy wave theory limits, SPM 1984 ch. 2; Dean & Dalrymple (1991) ch. 3.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.optimize import brentq

from seaway_comfort.processing.core.waves.dispersion import (
    WaveKinematics,
    group_speed_m_s,
    phase_speed_m_s,
    solve_kh,
    wave_kinematics,
    wavelength_m,
    wavenumber_rad_m,
)
from seaway_comfort.processing.core.validation import SeawayInputError

G = 9.80665  # standard gravity [m/s^2] (CGPM 1901), the g of every table value below


def _reference_kinematics(period_s: float, depth_m: float):
    """(k, L, c, c_g, n) by the [ref] computation of the module docstring."""
    w = 2.0 * math.pi / period_s
    k = brentq(lambda kk: w * w - G * kk * math.tanh(kk * depth_m), 1e-9, 50.0, xtol=1e-15, rtol=1e-14)
    n = 0.5 * (1.0 + 2.0 * k * depth_m / math.sinh(2.0 * k * depth_m))
    return k, 2.0 * math.pi / k, w / k, n * w / k, n

# d/L0, d/L, tanh(kd), n = c_g/c   -- [ref] (printed to 5 decimal places)
RELATIVE_DEPTH_TABLE = [
    (0.001, 0.01263, 0.07918, 0.99791),
    (0.01, 0.04032, 0.24804, 0.97923),
    (0.02, 0.05763, 0.34705, 0.95883),
    (0.05, 0.09415, 0.53104, 0.89993),
    (0.1, 0.14098, 0.70932, 0.81025),
    (0.2, 0.22512, 0.88843, 0.66771),
    (0.3, 0.31212, 0.96117, 0.57768),
    (0.5, 0.50183, 0.99636, 0.51151),
]

# [SPM1984] Table C-1 rows as recalled (from memory, tag [C]; the table itself was not read):
SPM_RECALLED = [(0.01, 0.04032), (0.1, 0.1410), (0.5, 0.5018)]

# T [s], h [m], k [rad/m], L [m], c [m/s], c_g [m/s] -- [ref]; L to 3 decimals, the rest to 5 significant digits
DIMENSIONAL_CASES = [
    (8.0, 10.0, 0.088641, 70.883, 8.8604, 7.1775),
    (10.0, 20.0, 0.051837, 121.210, 12.1210, 9.2716),
    (12.0, 5.0, 0.076562, 82.067, 6.8389, 6.5264),
    (5.0, 2.0, 0.299909, 20.950, 4.1901, 3.7608),
    (6.0, 100.0, 0.111824, 56.188, 9.3647, 4.6823),
]


def _half_unit(value: float, sig: int = 5) -> float:
    """Half a unit of the last printed digit of a value printed to ``sig`` significant digits."""
    exponent = math.floor(math.log10(abs(value)))
    return 0.5 * 10.0 ** (exponent - sig + 1)


@pytest.mark.parametrize("d_l0, d_l, tanh_kd, n_ratio", RELATIVE_DEPTH_TABLE)
def test_relative_depth_table(d_l0: float, d_l: float, tanh_kd: float, n_ratio: float) -> None:
    """d/L, tanh(kd) and n versus d/L0 [ref], to half a unit of the 5th decimal."""
    period = 8.0
    l0 = G * period**2 / (2.0 * math.pi)
    depth = d_l0 * l0
    kin = wave_kinematics(period, depth, g_m_s2=G)
    kd = float(kin.k_rad_m) * depth
    half = 0.5e-5
    assert depth / float(kin.wavelength_m) == pytest.approx(d_l, abs=half)
    assert math.tanh(kd) == pytest.approx(tanh_kd, abs=half)
    n = float(kin.group_speed_m_s / kin.celerity_m_s)
    assert n == pytest.approx(n_ratio, abs=half)


@pytest.mark.parametrize("d_l0, d_l", SPM_RECALLED)
def test_spm_table_c1_recalled_rows(d_l0: float, d_l: float) -> None:
    """[SPM1984] Table C-1, three rows recalled from memory (soft check at the printed digit)."""
    l0 = 1.0  # d/L depends on d/L0 only
    g = 2.0 * math.pi  # then T = 1 s gives L0 = g T^2 / (2 pi) = 1 m
    kin = wave_kinematics(1.0, d_l0 * l0, g_m_s2=g)
    assert d_l0 * l0 / float(kin.wavelength_m) == pytest.approx(d_l, abs=_half_unit(d_l, 4))


@pytest.mark.parametrize("period, depth, k, length, c, cg", DIMENSIONAL_CASES)
def test_dimensional_cases(
    period: float, depth: float, k: float, length: float, c: float, cg: float
) -> None:
    """k, L, c, c_g at given T and h [ref]; rel. 1e-4."""
    kin = wave_kinematics(period, depth, g_m_s2=G)
    assert float(kin.k_rad_m) == pytest.approx(k, rel=1e-4)
    assert float(kin.wavelength_m) == pytest.approx(length, rel=1e-4)
    assert float(kin.celerity_m_s) == pytest.approx(c, rel=1e-4)
    assert float(kin.group_speed_m_s) == pytest.approx(cg, rel=1e-4)
    # the thin wrappers return the same numbers
    assert float(wavelength_m(period, depth, g_m_s2=G)) == float(kin.wavelength_m)
    assert float(phase_speed_m_s(period, depth, g_m_s2=G)) == float(kin.celerity_m_s)
    assert float(group_speed_m_s(period, depth, g_m_s2=G)) == float(kin.group_speed_m_s)


@pytest.mark.parametrize("period, cg", [(12.0, 8.5947), (10.0, 8.0680)])
def test_group_speed_h10(period: float, cg: float) -> None:
    """c_g at h = 10 m, [ref] (printed to 5 significant digits)."""
    assert _reference_kinematics(period, 10.0)[3] == pytest.approx(cg, abs=_half_unit(cg))
    assert float(group_speed_m_s(period, 10.0, g_m_s2=G)) == pytest.approx(cg, rel=1e-4)


@pytest.mark.parametrize("d_l0, d_l, tanh_kd, n_ratio", RELATIVE_DEPTH_TABLE)
def test_relative_depth_table_follows_from_the_reference(d_l0, d_l, tanh_kd, n_ratio) -> None:  # type: ignore[no-untyped-def]
    period = 8.0
    depth = d_l0 * G * period**2 / (2.0 * math.pi)
    k, length, _, _, n = _reference_kinematics(period, depth)
    assert (depth / length, math.tanh(k * depth), n) == (
        pytest.approx(d_l, abs=0.5e-5), pytest.approx(tanh_kd, abs=0.5e-5), pytest.approx(n_ratio, abs=0.5e-5))


@pytest.mark.parametrize("period, depth, k, length, c, cg", DIMENSIONAL_CASES)
def test_dimensional_cases_follow_from_the_reference(period, depth, k, length, c, cg) -> None:  # type: ignore[no-untyped-def]
    rk, rl, rc, rcg, _ = _reference_kinematics(period, depth)
    assert (rk, rl, rc, rcg) == (pytest.approx(k, abs=_half_unit(k)), pytest.approx(length, abs=0.5e-3),
                                 pytest.approx(c, abs=_half_unit(c)), pytest.approx(cg, abs=_half_unit(cg)))


def test_against_brentq_reference_root_finder() -> None:
    """kh from our Newton equals scipy.optimize.brentq on x tanh x = y (reference library)."""
    ys = np.logspace(-5, 2.5, 61)
    ours = solve_kh(ys)
    for y, x in zip(ys, ours):
        ref = brentq(lambda t: t * math.tanh(t) - y, max(y, math.sqrt(y)) * (1 - 1e-9),
                     y + math.sqrt(y), xtol=1e-15, rtol=4 * np.finfo(float).eps)
        assert x == pytest.approx(ref, rel=1e-12)


def test_residual_is_at_rounding_level() -> None:
    """omega^2 = g k tanh(kh) holds to 1e-12 relative over 11 decades of y (identity check)."""
    y = np.logspace(-8, 3, 20001)
    x = solve_kh(y)
    assert np.all(np.abs(x * np.tanh(x) - y) <= 1e-12 * y)


def test_deep_water_limit_exact() -> None:
    """Deep water: k = omega^2/g, L0 = g T^2/(2 pi) = 1.56078 T^2 (g 9.80665), c_g = c/2 [Airy]."""
    periods = np.array([2.0, 6.0, 8.0, 15.0])
    deep = wave_kinematics(periods, None, g_m_s2=G)
    omega = 2.0 * math.pi / periods
    np.testing.assert_allclose(deep.k_rad_m, omega**2 / G, rtol=1e-15)
    np.testing.assert_allclose(deep.wavelength_m, 1.56078 * periods**2, rtol=5e-6)
    np.testing.assert_allclose(deep.group_speed_m_s, 0.5 * deep.celerity_m_s, rtol=1e-15)
    # +inf depth is the same as None; a very deep finite depth (kh > 20) gives the same numbers
    inf = wave_kinematics(periods, np.inf, g_m_s2=G)
    np.testing.assert_array_equal(inf.k_rad_m, deep.k_rad_m)
    very_deep = wave_kinematics(periods, 5000.0, g_m_s2=G)
    np.testing.assert_allclose(very_deep.k_rad_m, deep.k_rad_m, rtol=1e-15)
    np.testing.assert_allclose(very_deep.group_speed_m_s, deep.group_speed_m_s, rtol=1e-15)


def test_shallow_water_limit() -> None:
    """Shallow water: c and c_g -> sqrt(g h) as kh -> 0 [Airy]; error ~ (kh)^2/6."""
    depth = 0.5
    for period in (50.0, 200.0, 1000.0):
        kin = wave_kinematics(period, depth, g_m_s2=G)
        kh = float(kin.k_rad_m) * depth
        shallow = math.sqrt(G * depth)
        assert float(kin.celerity_m_s) == pytest.approx(shallow, rel=kh**2 / 6 * 1.01 + 1e-15)
        assert float(kin.group_speed_m_s) == pytest.approx(shallow, rel=kh**2 / 2 * 1.01 + 1e-15)
        assert float(kin.celerity_m_s) < shallow  # tanh(x) < x
    # The three-term series branch (y < 1e-6) joins the Newton branch smoothly
    y = np.array([0.999e-6, 1.001e-6])
    x = solve_kh(y)
    np.testing.assert_allclose(x * np.tanh(x), y, rtol=1e-13)


def test_broadcasting_and_mixed_deep() -> None:
    """omega (n,1) x depth (m,) broadcast; inf depth elements are deep water."""
    omega = np.array([[0.5], [1.0], [2.0]])
    depth = np.array([5.0, np.inf, 50.0])
    k = wavenumber_rad_m(omega, depth, g_m_s2=G)
    assert k.shape == (3, 3)
    np.testing.assert_allclose(k[:, 1], omega[:, 0] ** 2 / G, rtol=1e-15)
    np.testing.assert_allclose(k * np.tanh(k * np.where(np.isinf(depth), 1e9, depth)) * G,
                               np.broadcast_to(omega**2, (3, 3)), rtol=1e-12)
    kin = wave_kinematics(np.array([4.0, 8.0]), 10.0)
    assert isinstance(kin, WaveKinematics)
    assert kin.wavelength_m.shape == (2,)


def test_default_gravity_is_standard() -> None:
    """The default g is 9.80665 m/s^2 (3rd CGPM 1901), so L0(T=1) = 9.80665/(2 pi)."""
    assert float(wavelength_m(1.0)) == pytest.approx(9.80665 / (2 * math.pi), rel=1e-15)


@pytest.mark.parametrize("omega", [0.0, -1.0, np.nan, np.inf, [1.0, 0.0]])
def test_bad_omega(omega: object) -> None:
    """omega <= 0, NaN or inf -> SeawayInputError naming omega_rad_s."""
    with pytest.raises(SeawayInputError, match="omega_rad_s"):
        wavenumber_rad_m(omega)  # type: ignore[arg-type]


@pytest.mark.parametrize("depth", [0.0, -3.0, np.nan, -np.inf, [10.0, -1.0]])
def test_bad_depth(depth: object) -> None:
    """depth <= 0 or NaN -> SeawayInputError naming depth_m and the value."""
    with pytest.raises(SeawayInputError, match="depth_m") as info:
        wavenumber_rad_m(1.0, depth)  # type: ignore[arg-type]
    assert "got" in str(info.value)
    with pytest.raises(SeawayInputError, match="depth_m"):
        wave_kinematics(8.0, depth)  # type: ignore[arg-type]


@pytest.mark.parametrize("period", [0.0, -8.0, np.nan, np.inf, "eight"])
def test_bad_period(period: object) -> None:
    """period <= 0, NaN, inf or non-numeric -> SeawayInputError naming period_s."""
    with pytest.raises(SeawayInputError, match="period_s"):
        wave_kinematics(period)  # type: ignore[arg-type]


@pytest.mark.parametrize("g", [0.0, -9.8, np.nan, [9.8, 9.81]])
def test_bad_gravity(g: object) -> None:
    """g must be a positive finite scalar."""
    with pytest.raises(SeawayInputError, match="g_m_s2"):
        wavenumber_rad_m(1.0, 10.0, g_m_s2=g)  # type: ignore[arg-type]


def test_shape_mismatch_is_an_error() -> None:
    """Non-broadcastable omega and depth -> SeawayInputError."""
    with pytest.raises(SeawayInputError, match="broadcast"):
        wavenumber_rad_m(np.ones(3), np.ones(4) * 10.0)
