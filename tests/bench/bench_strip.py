# SPDX-License-Identifier: GPL-2.0-or-later
"""Benchmark: one vessel's strip-theory RAO set, 8 speeds x 36 headings x 48 frequencies.

Run: ``.venv/bin/python -P tests/bench/bench_strip.py``

Prints the wall time of (a) the 2-D Lewis/Ursell-Tasai tables (once per hull) and (b) the RAO
set for 8 speeds (Fn 0 to 0.35), 36 headings (0, 10, ..., 350 deg) and 48 frequencies
(0.2-2.5 rad/s, deep water), for the generated 100 m hull (Cb 0.70, 41 stations) and the
load average. Target of issue 13: < 5 s on 2 cores. No assertions: figures only.
"""
from __future__ import annotations

import os
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))  # -P drops the script folder
import _pkg  # noqa: E402,F401  (exposes the checkout as the package seaway_comfort)
import numpy as np  # noqa: E402

from seaway_comfort.processing.core.motions.strip import equations as eq  # noqa: E402
from seaway_comfort.processing.core.motions.strip.sections import sections_from_form  # noqa: E402


def main() -> None:
    g = 9.81
    sec = sections_from_form(100.0, 16.0, 6.0, 0.70, 0.80, 0.98, n_stations=41)
    t0 = time.perf_counter()
    hull = eq.prepare_hull(sec, 1025.0, g)
    t1 = time.perf_counter()
    body = eq.rigid_body(hull, eq.MassProperties(gm_t_m=1.2))
    w = np.linspace(0.2, 2.5, 48)
    headings = np.arange(0.0, 360.0, 10.0)
    speeds = np.linspace(0.0, 0.35, 8) * np.sqrt(g * 100.0)
    eq.strip_rao_set(hull, body, w, w ** 2 / g, headings, speeds, [1e7] * speeds.size)
    t2 = time.perf_counter()
    print(f"2-D tables (41 sections): {t1 - t0:.2f} s")
    print(f"RAO set 8 x 36 x 48:      {t2 - t1:.2f} s")
    print(f"total:                    {t2 - t0:.2f} s (target < 5 s)")
    print(f"load average: {os.getloadavg()}")


if __name__ == "__main__":
    main()
