# SPDX-License-Identifier: GPL-2.0-or-later
"""Benchmark: one vessel's strip-theory RAO set, 8 speeds x 36 headings x 48 frequencies.

Run: ``.venv/bin/python -P tests/bench/bench_strip.py``

Prints the wall time of (a) the 2-D Lewis/Ursell-Tasai tables (once per hull) and (b) the RAO
set for 8 speeds (Fn 0 to 0.35), 36 headings (0, 10, ..., 350 deg) and 48 frequencies
(0.2-2.5 rad/s, deep water), for the generated 100 m hull (Cb 0.70, 41 stations) and the
load average. Target of issue 13: < 5 s on 2 cores. Then (c) a route of 1 000 samples (wind sea
+ swell partitions, short-crested, one speed) through ``api.assess_motions`` with the closed
form (today's model) and with the strip model from cached RAOs, measured in the same run
(best of 3; the strip model's cache filled beforehand, its one-off build time printed).
No assertions: figures only.
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
    route_figures()
    print(f"load average: {os.getloadavg()}")


def route_figures() -> None:
    import dataclasses
    import tempfile

    from seaway_comfort.processing.core.api import SeaPartitions, assess_motions, transfer_model
    from seaway_comfort.processing.core.vessel.profile import builtin_profile

    os.environ["SEAWAY_COMFORT_RAO_CACHE"] = tempfile.mkdtemp(prefix="rao_bench_")
    ship = builtin_profile("ocean_research_70m")
    rng = np.random.default_rng(5)
    n = 1000
    parts = SeaPartitions(rng.uniform(0.3, 3.0, (n, 2)), rng.uniform(4.0, 14.0, (n, 2)),
                          rng.uniform(0, 360, (n, 2)), [3.3, 3.3], [4.0, 13.0], ("wind", "swell1"))
    course = rng.uniform(0, 360, n)
    t0 = time.perf_counter()
    transfer_model(ship)
    print(f"strip RAO set of the 70 m example (10 x 73 x 96, incl. 2-D tables), built once: "
          f"{time.perf_counter() - t0:.2f} s")
    for label, prof in (("closed form (today)", dataclasses.replace(ship, motion_model="closed_form")),
                        ("strip, cached RAOs", ship)):
        best = min(_timed(lambda: assess_motions(prof, partitions=parts, course_deg=course, speed_m_s=5.0))
                   for _ in range(3))
        print(f"route 1000 samples, {label}: {best:.2f} s")


def _timed(fn) -> float:
    t = time.perf_counter()
    fn()
    return time.perf_counter() - t


if __name__ == "__main__":
    main()
