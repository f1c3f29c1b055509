# SPDX-License-Identifier: GPL-2.0-or-later
"""IMO MSC.1/Circ.1228 guidance flags.

Tags beside checks: [A] printed in the named source; [C] from memory (soft expectation);
[D] computed from the named published formula by an independent implementation outside this
project (the source itself does not print the number)."""
from __future__ import annotations

import math

import numpy as np
import pytest

from seaway_comfort.processing.core.flags import SampleFlag
from seaway_comfort.processing.core.comfort.guidance import (
    circ1228_flags,
    high_wave_attack_mask,
    mean_period_over_tp,
    period_ratio_mask,
    surf_riding_mask,
    surf_riding_speed_limit_kn,
)
from seaway_comfort.processing.core.units import KNOT_M_S
from seaway_comfort.processing.core.validation import SeawayInputError


def test_surf_riding_limits():
    # IMO MSC.1/Circ.1228 4.2.1 V = 1.8 sqrt(L)/cos(180 - alpha) (1.8 from memory [C]); values [D]:
    # L 12: 6.235 kn at 180, 7.200 at 150, 8.818 at 135; L 100: 18.00 kn at 180.
    np.testing.assert_allclose(surf_riding_speed_limit_kn(12.0, [180.0, 150.0, 210.0]), [6.235, 7.200, 7.200], atol=5e-4)
    assert float(surf_riding_speed_limit_kn(100.0, 180.0)) == pytest.approx(18.0, abs=5e-3)
    # 135 deg itself is outside the open range 135 < alpha < 225 (Circ.1228 4.2.1 [A])
    assert np.isinf(surf_riding_speed_limit_kn(12.0, 135.0))
    assert float(surf_riding_speed_limit_kn(12.0, 135.0001)) == pytest.approx(8.818, abs=5e-4)
    m = surf_riding_mask([6.23, 6.24, 20.0, 20.0], [180.0, 180.0, 134.9, 225.0], 12.0)
    np.testing.assert_array_equal(m, [False, True, False, False])


def test_high_wave_attack_thresholds():
    # Circ.1228 4.2.2.1 [A]: lambda > 0.8 L and Hs > 0.04 L; L 12 -> 9.6 m and 0.48 m ([D]).
    m = high_wave_attack_mask([9.61, 9.59, 9.61], [0.49, 0.49, 0.47], 12.0)
    np.testing.assert_array_equal(m, [True, False, False])


def test_period_bands():
    # our design choice (guidance.py docstring): 0.8-1.2 and 0.4-0.6 of TR, inclusive.
    np.testing.assert_array_equal(period_ratio_mask([7.9, 8.0, 12.0, 12.1, np.inf], 10.0, (0.8, 1.2)),
                                  [False, True, True, False, False])


L12, TR4 = 12.0, 4.0
T1_OVER_TP = 0.8343  # JONSWAP gamma 3.3, DNV-RP-C205 (2010) s.3.5.5 fit 0.8348 (from memory [C])


def _flags(speed_kn, course, hs, tw, wf, **kw):
    """circ1228_flags for a 12 m boat, TR 4 s, single-partition seas given by their MEAN period."""
    n = len(speed_kn)
    tp = np.asarray(tw, dtype=float) / T1_OVER_TP
    return circ1228_flags(L12, TR4, np.asarray(speed_kn) * KNOT_M_S, np.broadcast_to(course, (n,)),
                          np.asarray(hs, dtype=float), tp, np.broadcast_to(wf, (n,)), **kw)


def test_mean_period_ratio():
    # T1/Tp of JONSWAP: 0.834 at gamma 3.3 (DNV-RP-C205 (2010) s.3.5.5 fit 0.8348, from memory [C]);
    # 0.772 for Pierson-Moskowitz, gamma 1 (DNV-RP-C205 s.3.5.5, T1 = 0.772 Tp, from memory [C]).
    assert mean_period_over_tp(3.3) == pytest.approx(0.8348, abs=1.5e-3)
    assert mean_period_over_tp(1.0) == pytest.approx(0.772, abs=1.5e-3)


def test_wave_groups_zone():
    # Circ.1228 4.2.2.1 [A]: lambda > 0.8 L (9.6 m) and Hs > 0.04 L (0.48 m); 4.2.2.2 [A]:
    # TE = 1.8..3.0 TW. Hand computation, TW 4.0 s deep water: omega 1.5708 rad/s, k 0.25160 rad/m,
    # lambda 24.97 m, c 6.2432 m/s; following sea TE/TW = 1 / (1 - U/c) in [1.8, 3.0] for
    # U/c in [0.444, 0.667], i.e. U 2.775..4.162 m/s = 5.39..8.09 kn. At 6 kn TE = 7.91 s (1.98 TW).
    f = _flags([4.0, 5.3, 5.5, 6.0, 8.0, 8.2, 6.0, 6.0, 6.0], 0.0,
               [1.0, 1.0, 1.0, 1.0, 1.0, 1.0, 0.47, 1.0, 1.0], 4.0,
               [180.0] * 6 + [180.0, 0.0, 90.0])
    np.testing.assert_array_equal(f.high_wave_groups, [False, False, True, True, True, False, False, False, False])
    # advisory only (no danger-graded rolling here)
    assert not f.high_wave_groups_danger.any()


def test_wave_groups_use_mean_not_peak_period():
    # Tp 2.8 s: lambda(Tp) = 12.24 m > 9.6 m, but TW = 0.8343 Tp = 2.336 s gives 8.52 m < 9.6 m;
    # Tp 3.2 s: TW 2.670 s, lambda 11.13 m. At U = 2.0 m/s following, TE/TW = 1/(1 - U/c):
    # c(2.336 s) 3.647 m/s -> 2.21; c(2.670 s) 4.168 m/s -> 1.92 (hand computed, Airy deep water).
    f = circ1228_flags(L12, TR4, [2.0, 2.0], [0.0, 0.0], [0.6, 0.6], [2.8, 3.2], [180.0, 180.0])
    np.testing.assert_array_equal(f.high_wave_groups, [False, True])


def test_surf_riding_zone_and_grade():
    # Circ.1228 4.2.1: 135 < alpha < 225 and V > 1.8 sqrt(L)/cos(180 - alpha) (1.8 from memory [C]);
    # L 12: 6.235 kn at alpha 180, 7.200 kn at 150. TW 8.343 s (Tp 10 s): no other zone here.
    # Grades (our choice): Hs >= 0.02 L = 0.24 m advisory, Hs > 0.04 L = 0.48 m danger.
    f = _flags([6.2, 6.3, 7.1, 7.3, 8.0, 8.0, 8.0], 0.0, [0.3, 0.3, 0.3, 0.3, 0.2, 0.5, 0.5], 8.343,
               [180.0, 180.0, 150.0, 150.0, 180.0, 180.0, 120.0])
    np.testing.assert_array_equal(f.surf_riding, [False, True, False, True, False, True, False])
    np.testing.assert_array_equal(f.surf_riding_danger, [False, False, False, False, False, True, False])
    assert f.mask[5] & int(SampleFlag.SURF_RIDING_DANGER) and f.mask[5] & int(SampleFlag.SURF_RIDING)


def test_synchronous_roll_band_and_grade():
    # Circ.1228 4.2.3.1 [A]: TE nearly TR; band 0.8..1.2 ours. Beam sea at rest: TE = TW.
    f = _flags([0.0] * 6, 0.0, [0.3, 1.0, 0.2, 1.0, 1.0, 1.0], [4.0, 4.0, 4.0, 3.1, 4.9, 3.3], 90.0)
    np.testing.assert_array_equal(f.sync_roll, [True, True, False, False, False, True])
    np.testing.assert_array_equal(f.sync_roll_danger, [False, True, False, False, False, True])
    assert not f.parametric_roll.any() and not f.high_wave_groups.any()


def test_parametric_roll_sector_length_and_ratio():
    # Circ.1228 4.2.3.2 (TE about TR/2 in head and following seas, from memory [C]); wave length
    # 0.8..2 L and sectors are our choice. TW 3.0 s: lambda 14.05 m (1.17 L), omega 2.0944,
    # k 0.44730; head sea TE = 2.0 s (= TR/2) at U = (pi - 2.0944)/0.4473 = 2.341 m/s = 4.551 kn
    # (hand computed). At rest TE = 3.0 s (0.75 TR): neither band. Beam sea: never parametric.
    # TW 2.0 s at rest: TE = TR/2 but lambda 6.25 m < 0.8 L: not parametric.
    f = _flags([4.551, 0.0, 4.551, 4.551, 0.0], 0.0, [0.3, 0.3, 0.6, 0.6, 0.6], [3.0, 3.0, 3.0, 3.0, 2.0],
               [0.0, 0.0, 0.0, 90.0, 0.0])
    np.testing.assert_array_equal(f.parametric_roll, [True, False, True, False, False])
    np.testing.assert_array_equal(f.parametric_roll_danger, [False, False, True, False, False])
    assert not f.sync_roll.any()


def test_weak_partition_cannot_drive_roll():
    # two partitions: a 0.2 m wind sea (below 0.02 L = 0.24 m) in synchronous resonance, and a
    # 1.0 m swell far from it: no ROLLSYNC (the weak system cannot drive it, our threshold).
    hs = np.array([[0.2, 1.0]])
    tp = np.array([[4.0, 12.0]]) / T1_OVER_TP
    f = circ1228_flags(L12, TR4, [0.0], [0.0], hs, tp, np.array([[90.0, 90.0]]), gamma=[3.3, 3.3])
    assert not f.sync_roll[0]
    f2 = circ1228_flags(L12, TR4, [0.0], [0.0], np.array([[0.3, 1.0]]), tp, np.array([[90.0, 90.0]]))
    assert f2.sync_roll[0] and not f2.sync_roll_danger[0]


def test_deep_water_wavelength_boundary():
    # Circ.1228 deep-water lambda = 1.56 TW^2 ([C], = g/2pi Airy); L 12 -> TW > 2.48 s ([D]);
    # following sea at U = 0.55 c (TE/TW = 2.22, inside 4.2.2.2's 1.8..3.0).
    t_edge = math.sqrt(9.6 * 2 * math.pi / 9.80665)
    u = [0.55 * 9.80665 * t * 0.999 / (2 * math.pi) for t in (t_edge * 0.999, t_edge * 1.001)]
    f = circ1228_flags(12.0, 4.0, u, [0.0, 0.0], [1.0, 1.0], [t_edge * 0.999 / T1_OVER_TP,
                                                              t_edge * 1.001 / T1_OVER_TP], [180.0, 180.0])
    np.testing.assert_array_equal(f.high_wave_groups, [False, True])


def test_bad_input():
    with pytest.raises(SeawayInputError, match="tp_s"):
        circ1228_flags(12.0, 4.0, [1.0], [0.0], [1.0], [float("nan")], [0.0])
    with pytest.raises(SeawayInputError, match="band"):
        period_ratio_mask([1.0], 1.0, (1.2, 0.8))
