# SPDX-License-Identifier: GPL-2.0-or-later
"""Numbers in user messages read the same on numpy 1 and numpy 2 (common practice, no source).

numpy 2 changed the repr of scalars to ``np.float64(-1.0)`` (NEP 51); messages must show ``-1.0``.
"""
from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from seaway_comfort.processing.core.validation import SeawayInputError, require_positive, show


@pytest.mark.parametrize(
    ("value", "text"),
    [
        (np.float64(-1.0), "-1.0"),
        (np.float32(0.5), "0.5"),
        (np.int64(3), "3"),
        (np.bool_(True), "True"),
        (np.array([1.5, 2.0]), "[1.5, 2.0]"),
        ((np.float64(1.0), 2), "(1.0, 2)"),
        ("Tp", "'Tp'"),
        (Path("/data/sea.nc"), "'/data/sea.nc'"),
    ],
)
def test_show_writes_plain_values(value, text) -> None:
    assert show(value) == text


def test_error_message_has_no_numpy_type_names() -> None:
    with pytest.raises(SeawayInputError) as err:
        require_positive("hs_m", np.array([1.0, np.float64(-1.0)]))
    assert "got -1.0" in str(err.value) and "np." not in str(err.value)
