# SPDX-License-Identifier: GPL-2.0-or-later
"""NORDFORSK 1987 criteria by task (table from memory).

Sources are named beside each check; "from memory" marks a source not re-read, "by hand" a
derivation written beside the check, "common practice, no source" a fact of the trade."""
from __future__ import annotations

import numpy as np
import pytest

from seaway_comfort.processing.core.comfort.criteria import NORDFORSK_TASKS, evaluate_criteria
from seaway_comfort.processing.core.validation import SeawayInputError

G = 9.80665


def test_table_entries():
    # NORDFORSK (1987), from memory (widely reproduced, e.g. Faltinsen 1990; not re-read here).
    want = {
        "light_manual_work": (0.20, 0.10, 6.0), "heavy_manual_work": (0.15, 0.07, 4.0),
        "intellectual_work": (0.10, 0.05, 3.0), "transit_passengers": (0.05, 0.04, 2.5),
        "cruise_liner": (0.02, 0.03, 2.0),
    }
    got = {k: (c.vacc_rms_g, c.lacc_rms_g, c.roll_rms_deg) for k, c in NORDFORSK_TASKS.items()}
    assert got == want


def test_margins_and_exceedance_at_the_limits():
    # common practice, no source: margin = 1 - value/limit, exceeded when value > limit.
    v = np.array([0.0, 0.10 * G, 0.10 * G * 1.01, 0.0])
    lat = np.array([0.0, 0.0, 0.0, 0.05 * G * 0.5])
    r = np.array([0.0, 0.0, 0.0, 3.3])
    a = evaluate_criteria("intellectual_work", v, lat, r)
    np.testing.assert_allclose(a.margins["vertical_acceleration"], [1.0, 0.0, -0.01, 1.0], atol=1e-12)
    np.testing.assert_allclose(a.margins["lateral_acceleration"], [1, 1, 1, 0.5])
    np.testing.assert_allclose(a.usage, [0.0, 1.0, 1.01, 1.1])
    np.testing.assert_array_equal(a.exceeded, [False, False, True, True])


def test_unknown_task():
    with pytest.raises(SeawayInputError, match="known tasks: light_manual_work"):
        evaluate_criteria("dancing", 0.1, 0.1, 1.0)
    with pytest.raises(SeawayInputError, match="roll_rms_deg"):
        evaluate_criteria("cruise_liner", 0.1, 0.1, float("nan"))
