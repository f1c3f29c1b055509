# SPDX-License-Identifier: GPL-2.0-or-later
"""IMO MSC.1/Circ.1228 guidance flags.

Sources are named beside each check; "from memory" marks a source not re-read, "by hand" a
derivation written beside the check, "common practice, no source" a fact of the trade."""
from __future__ import annotations

import math

import numpy as np
import pytest

from seaway_comfort.processing.core.flags import SampleFlag
from seaway_comfort.processing.core.comfort.guidance import (
    circ1228_flags,
    high_wave_attack_mask,
    period_ratio_mask,
    surf_riding_mask,
    surf_riding_speed_limit_kn,
)
from seaway_comfort.processing.core.units import KNOT_M_S
from seaway_comfort.processing.core.validation import SeawayInputError


def test_surf_riding_limits():
    # IMO MSC.1/Circ.1228 4.2.1 V = 1.8 sqrt(L)/cos(180 - alpha) (1.8 from memory); by hand:
    # L 12: 1.8 x 3.464102 = 6.235 kn at 180, /cos 30 = /0.866025 -> 7.200 at 150, /cos 45 =
    # /0.707107 -> 8.818 just above 135; L 100: 1.8 x 10 = 18.00 kn at 180.
    assert 1.8 * math.sqrt(12) == pytest.approx(6.235, abs=5e-4)
    assert 1.8 * math.sqrt(12) / math.cos(math.radians(30)) == pytest.approx(7.200, abs=5e-4)
    assert 1.8 * math.sqrt(12) / math.cos(math.radians(45)) == pytest.approx(8.818, abs=5e-4)
    np.testing.assert_allclose(surf_riding_speed_limit_kn(12.0, [180.0, 150.0, 210.0]), [6.235, 7.200, 7.200], atol=5e-4)
    assert float(surf_riding_speed_limit_kn(100.0, 180.0)) == pytest.approx(18.0, abs=5e-3)
    # 135 deg itself is outside the open range 135 < alpha < 225 (Circ.1228 4.2.1, from memory)
    assert np.isinf(surf_riding_speed_limit_kn(12.0, 135.0))
    assert float(surf_riding_speed_limit_kn(12.0, 135.0001)) == pytest.approx(8.818, abs=5e-4)
    m = surf_riding_mask([6.23, 6.24, 20.0, 20.0], [180.0, 180.0, 134.9, 225.0], 12.0)
    np.testing.assert_array_equal(m, [False, True, False, False])


def test_high_wave_attack_thresholds():
    # Circ.1228 4.2.2.1 (from memory): lambda > 0.8 L and Hs > 0.04 L; by hand L 12 -> 0.8 x 12
    # = 9.6 m and 0.04 x 12 = 0.48 m.
    m = high_wave_attack_mask([9.61, 9.59, 9.61], [0.49, 0.49, 0.47], 12.0)
    np.testing.assert_array_equal(m, [True, False, False])


def test_period_bands():
    # our design choice (safety.py docstring): 0.8-1.2 and 0.4-0.6 of TR, inclusive.
    np.testing.assert_array_equal(period_ratio_mask([7.9, 8.0, 12.0, 12.1, np.inf], 10.0, (0.8, 1.2)),
                                  [False, True, True, False, False])


def test_combined_flags():
    L, tr = 12.0, 4.1129
    # sample 0: following sea (alpha 180), 8 kn > 6.235 kn -> surf riding.
    # sample 1: head sea at rest, Tp 4.2 s -> TE = Tp close to TR -> sync roll; lambda(4.2 s)
    #           = 27.5 m > 9.6 m and Hs 1 m > 0.48 m -> high-wave groups.
    # sample 2: at rest, Tp 2.1 s -> TE/TR = 0.51 -> parametric; lambda 6.9 m < 9.6 m.
    # sample 3: calm partition (hs 0) -> nothing.
    speed = np.array([8 * KNOT_M_S, 0.0, 0.0, 0.0])
    course = np.array([0.0, 0.0, 0.0, 0.0])
    hs = np.array([0.3, 1.0, 0.3, 0.0])
    tp = np.array([10.0, 4.2, 2.1, 4.2])
    wf = np.array([180.0, 0.0, 0.0, 0.0])
    f = circ1228_flags(L, tr, speed, course, hs, tp, wf)
    np.testing.assert_array_equal(f.surf_riding, [True, False, False, False])
    np.testing.assert_array_equal(f.sync_roll, [False, True, False, False])
    np.testing.assert_array_equal(f.parametric_roll, [False, False, True, False])
    np.testing.assert_array_equal(f.high_wave_groups, [False, True, False, False])
    assert f.mask[1] == int(SampleFlag.SYNC_ROLL | SampleFlag.HIGH_WAVE_GROUPS)
    assert f.mask.dtype == np.int64


def test_deep_water_wavelength_boundary():
    # Circ.1228 deep-water lambda = 1.56 T^2 (from memory; = g/2pi, Airy deep water); by hand
    # L 12 -> lambda > 9.6 m -> T > sqrt(9.6 x 2 pi/9.80665) = sqrt(6.1508) = 2.4801 s.
    assert math.sqrt(9.6 * 2 * math.pi / 9.80665) == pytest.approx(2.4801, abs=5e-5)
    t_edge = math.sqrt(9.6 * 2 * math.pi / 9.80665)
    f = circ1228_flags(12.0, 4.0, [0.0, 0.0], [0.0, 0.0], [1.0, 1.0], [t_edge * 0.999, t_edge * 1.001], [90.0, 90.0])
    np.testing.assert_array_equal(f.high_wave_groups, [False, True])


def test_bad_input():
    with pytest.raises(SeawayInputError, match="tp_s"):
        circ1228_flags(12.0, 4.0, [1.0], [0.0], [1.0], [float("nan")], [0.0])
    with pytest.raises(SeawayInputError, match="band"):
        period_ratio_mask([1.0], 1.0, (1.2, 0.8))
