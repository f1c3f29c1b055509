# SPDX-License-Identifier: GPL-2.0-or-later
"""Benchmark of the motion-response core (prints figures; no assertions; not collected by pytest).

Run:  .venv/bin/python -P tests/bench/bench_response.py [--quick]

BLAS/OpenMP threads are pinned to 1 (one core) before numpy is imported.

1. Exact spectral path: 1 000 samples x 2 partitions x 48 frequencies x 24 directions x 3 DOF
   (heave, pitch, roll; all stations of the 35 m example vessel), one vectorised call
   (target < 0.3 s), against a straightforward per-sample Python loop (one call per sample)
   measured in the same run on a subsample and extrapolated to 1 000 samples (said so).
2. Table path: 1 000 000 samples look-up (1 and 2 partitions; target < 1 s), the one-off table
   build time, and the ratio against the exact vectorised path (measured on 2 000 samples and
   extrapolated) and against the per-sample loop (extrapolated).
"""
from __future__ import annotations

import os

for _v in ("OMP_NUM_THREADS", "OPENBLAS_NUM_THREADS", "MKL_NUM_THREADS"):
    os.environ.setdefault(_v, "1")

import argparse  # noqa: E402
import sys  # noqa: E402
import time  # noqa: E402
from pathlib import Path  # noqa: E402
from typing import Callable, List  # noqa: E402

sys.path.insert(0, str(Path(__file__).resolve().parent))  # -P drops the script folder
import _pkg  # noqa: E402,F401  (exposes the checkout as `seaway_comfort`)

import numpy as np  # noqa: E402

from seaway_comfort.processing.core.waves.encounter import relative_heading_deg  # noqa: E402
from seaway_comfort.processing.core.motions.response import motion_response  # noqa: E402
from seaway_comfort.processing.core.motions.tables import build_response_table  # noqa: E402
from seaway_comfort.processing.core.motions.closed_form import ClosedFormTransfer  # noqa: E402
from seaway_comfort.processing.core.vessel.profile import builtin_profile  # noqa: E402


_CPU: List[float] = []


def _best_of(fn: Callable[[], object], repeat: int) -> float:
    """Smallest wall time [s] of ``repeat`` runs (time.perf_counter); the CPU time of that
    run (time.process_time) is kept in _CPU[-1] (less sensitive to other load on the machine)."""
    times: List[float] = []
    cpus: List[float] = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        c0 = time.process_time()
        fn()
        cpus.append(time.process_time() - c0)
        times.append(time.perf_counter() - t0)
    k = int(np.argmin(times))
    _CPU.append(cpus[k])
    return times[k]


def _sea(n: int, p: int, seed: int):
    rng = np.random.default_rng(seed)
    return (rng.uniform(0.3, 4.0, (n, p)), rng.uniform(3.0, 15.0, (n, p)), rng.uniform(0.0, 360.0, (n, p)),
            rng.uniform(0.0, 360.0, n))


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--quick", action="store_true", help="smaller baseline subsample and 1 repeat")
    args = ap.parse_args()
    repeat = 1 if args.quick else 3
    prof = builtin_profile("coastal_survey_35m")
    tr = ClosedFormTransfer.from_profile(prof)
    speed = 5.0
    kw = dict(gamma=[3.3, 5.0], spread_s=[4.0, 12.0], n_freq=48, n_dir=24)

    # ---------------------------------------------------------------- 1. exact path
    n = 1000
    hs, tp, wf, co = _sea(n, 2, 1)

    def exact_all() -> object:
        return motion_response(tr, prof.stations, hs_m=hs, tp_s=tp, wave_from_deg=wf, course_deg=co,
                               speed_m_s=speed, **kw)

    t_exact = _best_of(exact_all, repeat)
    n_loop = 50 if args.quick else 200

    def loop() -> None:
        for i in range(n_loop):
            motion_response(tr, prof.stations, hs_m=hs[i:i + 1], tp_s=tp[i:i + 1], wave_from_deg=wf[i:i + 1],
                            course_deg=co[i:i + 1], speed_m_s=speed, **kw)

    t_loop = _best_of(loop, 1) * n / n_loop
    print("1. exact spectral path, 1000 samples x 2 partitions x 48 freq x 24 dir x 3 DOF "
          f"({len(prof.stations)} stations), one core")
    print(f"   vectorised call:            {t_exact:8.3f} s   (target < 0.3 s; CPU time {_CPU[0]:.3f} s)")
    print(f"   per-sample Python loop:     {t_loop:8.3f} s   (measured on {n_loop} samples, extrapolated to {n})")
    print(f"   ratio loop / vectorised:    {t_loop / t_exact:8.1f} x")

    # ---------------------------------------------------------------- 2. table path
    t0 = time.perf_counter()
    tab_all = build_response_table(tr, prof.stations, speed, gamma=3.3, spread_s=4.0)
    t_build = time.perf_counter() - t0
    tab_one = build_response_table(tr, prof.stations[:1], speed, gamma=3.3, spread_s=4.0)
    N = 1_000_000
    for p, tab in ((1, tab_one), (2, tab_one), (1, tab_all), (2, tab_all)):
        hs2, tp2, wf2, co2 = _sea(N, p, 2 + p)
        mu = relative_heading_deg(co2[:, None], wf2)
        t_tab = _best_of(lambda: tab.lookup(hs2, tp2, mu), repeat)
        c_tab = _CPU[-1]
        n_ex = 2000
        t_ex = _best_of(lambda: motion_response(tr, prof.stations, hs_m=hs2[:n_ex], tp_s=tp2[:n_ex],
                                                wave_from_deg=wf2[:n_ex], course_deg=co2[:n_ex], speed_m_s=speed,
                                                gamma=3.3, spread_s=4.0), repeat) * N / n_ex
        print(f"2. table path, 1 000 000 samples x {p} partition(s), {len(tab.station_names)} station(s)")
        print(f"   look-up:                    {t_tab:8.3f} s   (target < 1 s; CPU time {c_tab:.3f} s)")
        print(f"   exact vectorised path:      {t_ex:8.1f} s   (measured on {n_ex} samples, extrapolated)")
        print(f"   ratio exact / table:        {t_ex / t_tab:8.0f} x")
        print(f"   ratio per-sample loop/table:{t_loop / n * N * p / 2 / t_tab:8.0f} x   (loop cost per sample from part 1, scaled by partitions)")
    print(f"   one-off table build ({tab.tp_grid_s.size} Tp x {tab.heading_grid_deg.size} headings): {t_build:.2f} s")


if __name__ == "__main__":
    main()
