# SPDX-License-Identifier: GPL-2.0-or-later
"""Units and flag codes."""
import numpy as np
import pytest

from seaway_comfort.processing.core import flags, units
from seaway_comfort.processing.core.validation import SeawayInputError, require_positive


def test_knot_definition():
    # 1 kn = 1852 m per hour (BIPM SI Brochure, 9th ed., Table 8: exact by definition)
    assert units.m_s_from_kn(1.0) == pytest.approx(0.5144444444444445, rel=1e-15)
    assert units.kn_from_m_s(units.m_s_from_kn(12.5)) == pytest.approx(12.5, rel=1e-15)


def test_wrap_deg_tiny_negative_is_zero():
    assert units.wrap_deg(-1e-17) == 0.0
    np.testing.assert_allclose(units.wrap_deg([-90.0, 370.0, 360.0]), [270.0, 10.0, 0.0])


def test_flag_codes_unique_and_explained():
    codes = list(flags.FLAG_CODES.values())
    assert len(codes) == len(set(codes))
    assert set(flags.FLAG_CODES) == set(flags.FLAG_EXPLANATIONS)
    mask = int(flags.SampleFlag.OVERTAKING | flags.SampleFlag.SYNC_ROLL)
    assert flags.flag_codes(mask) == "OUTRUN,ROLLSYNC"
    assert flags.flag_counts([mask, 0, int(flags.SampleFlag.OVERTAKING)]) == {"OUTRUN": 2, "ROLLSYNC": 1}


def test_require_positive_names_argument():
    with pytest.raises(SeawayInputError, match=r"tp_s must be > 0, got -1\.0"):
        require_positive("tp_s", [3.0, -1.0])
    with pytest.raises(SeawayInputError, match="tp_s"):
        require_positive("tp_s", float("nan"))
