# SPDX-License-Identifier: GPL-2.0-or-later
"""Timing helper shared by the benchmark scripts."""
from __future__ import annotations

import statistics
import time
from typing import Callable


def median_time(fn: Callable[[], object], repeat: int) -> float:
    """Median wall time [s] of ``repeat`` calls of ``fn``."""
    ts = []
    for _ in range(repeat):
        t = time.perf_counter()
        fn()
        ts.append(time.perf_counter() - t)
    return statistics.median(ts)
