# SPDX-License-Identifier: GPL-2.0-or-later
"""Weather-window and waiting-time building blocks on tiny cases worked out by hand.

Every expected value below is derived by hand in the comment beside it from the definitions
in processing/core/climate/windows.py (persistence along the vessel's timeline, next
acceptable departure, censoring at the data end).
"""
from __future__ import annotations

import numpy as np
import pytest

from seaway_comfort.processing.core.climate.windows import (
    departure_status,
    merge_waits,
    waiting_partial,
)
from seaway_comfort.processing.core.validation import SeawayInputError


def test_departure_status_by_hand():
    # 2 samples reached 0 and 1 steps after departure; classes per step (rows) and sample (cols)
    cls = np.array([[0, 0],
                    [1, 2],
                    [0, 0],
                    [0, -1],
                    [1, 1]], dtype=np.int8)
    st = departure_status(cls, np.array([0, 1]), 5, max_class=1)
    # dep 0: (0,0) at sample 0, row 1 sample 1 = 2 > 1 -> not acceptable, known
    # dep 1: row 1 s0 = 1 ok, row 2 s1 = 0 ok -> acceptable
    # dep 2: row 2 s0 = 0, row 3 s1 = -1 missing -> unknown
    # dep 3: row 3 s0 = 0, row 4 s1 = 1 -> acceptable
    # dep 4: row 5 does not exist, no data after the block -> past end, unknown
    assert st.acceptable.tolist() == [False, True, False, True, False]
    assert st.known.tolist() == [True, True, False, True, False]
    assert st.past_end.tolist() == [False, False, False, False, True]
    # with more data after the block the caller must give the overlap
    with pytest.raises(SeawayInputError, match="overlap"):
        departure_status(cls, np.array([0, 1]), 5, max_class=1, steps_after_block=3)


def test_waits_by_hand_and_chunk_independent():
    ok = np.array([False, True, True, False, False, True, False, False])
    months = np.array([0, 0, 0, 0, 1, 1, 1, 1])
    # next acceptable at or after each start: 1,1,2,5,5,5,-,- -> waits 1,0,0,2,1,0 and two censored
    whole = merge_waits([waiting_partial(ok, months, 0)])
    assert whole.sum_steps[:2].tolist() == [1 + 0 + 0 + 2, 1 + 0]
    assert whole.count[:2].tolist() == [4, 2]
    assert whole.censored[:2].tolist() == [0, 2]
    for cut in ([3], [1, 4], [2, 3, 6], [7]):
        edges = [0, *cut, ok.size]
        parts = [waiting_partial(ok[a:b], months[a:b], a) for a, b in zip(edges, edges[1:])]
        m = merge_waits(parts)
        np.testing.assert_array_equal(m.sum_steps, whole.sum_steps)
        np.testing.assert_array_equal(m.count, whole.count)
        np.testing.assert_array_equal(m.censored, whole.censored)


def test_bad_shapes():
    with pytest.raises(SeawayInputError):
        departure_status(np.zeros((3, 2), dtype=np.int8), np.array([0, 1, 2]), 2, 1)
    with pytest.raises(SeawayInputError):
        waiting_partial(np.array([True]), np.array([0, 1]), 0)
