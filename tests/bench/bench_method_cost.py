# SPDX-License-Identifier: GPL-2.0-or-later
"""Calibration of the api's response-method cost model (prints figures; no assertions).

Run:  .venv/bin/python -P tests/bench/bench_method_cost.py

BLAS/OpenMP threads pinned to 1. Measures, for the example vessel "coastal_survey_35m" (one
station, 48 x 24 spectral grid, median of 5 runs each):
1. the exact path per sample and partition (2 400 samples x 1 and x 2 partitions);
2. one response table built (default 100 x 73 grid) and one loaded from the disk cache;
3. the table look-up per sample and partition (2 400 x 2).
These are the numbers quoted in ``api.METHOD_COST_S``; the printed "auto" line shows the
choice :func:`api.choose_method` makes for 2 400 samples with a cold and a warm cache, and the
measured time of both methods on that case (the baseline for the choice).
"""
from __future__ import annotations

import os

for _v in ("OMP_NUM_THREADS", "OPENBLAS_NUM_THREADS", "MKL_NUM_THREADS"):
    os.environ.setdefault(_v, "1")

import sys  # noqa: E402
import tempfile  # noqa: E402
import time  # noqa: E402
from pathlib import Path  # noqa: E402

sys.path.insert(0, str(Path(__file__).resolve().parent))  # -P drops the script folder
import _pkg  # noqa: E402,F401
from _timing import median_time  # noqa: E402

import numpy as np  # noqa: E402

os.environ["SEAWAY_CACHE_DIR"] = tempfile.mkdtemp(prefix="seaway_cost_")
from seaway_comfort.processing.core import api  # noqa: E402
from seaway_comfort.processing.core.motions import table_cache as TC  # noqa: E402
from seaway_comfort.processing.core.motions.response import motion_response  # noqa: E402
from seaway_comfort.processing.core.motions.tables import build_response_table  # noqa: E402
from seaway_comfort.processing.core.vessel.profile import builtin_profile  # noqa: E402


def _median(fn, repeat=5):
    return median_time(fn, repeat)


def main() -> None:
    prof = builtin_profile("coastal_survey_35m")
    st = [prof.stations[0]]
    tr = api.transfer_model(prof)
    n = 2400
    rng = np.random.default_rng(1)
    hs, tp, wf = rng.uniform(0.5, 3, (n, 2)), rng.uniform(4, 14, (n, 2)), rng.uniform(0, 360, (n, 2))
    kw = dict(course_deg=45.0, speed_m_s=5.0)
    e1 = _median(lambda: motion_response(tr, st, hs_m=hs[:, :1], tp_s=tp[:, :1], wave_from_deg=wf[:, :1], **kw))
    e2 = _median(lambda: motion_response(tr, st, hs_m=hs, tp_s=tp, wave_from_deg=wf, **kw))
    b = _median(lambda: build_response_table(tr, st, 5.0))
    TC.cached_table(tr, st, 5.0)
    d = _median(lambda: TC.cached_table(tr, st, 5.0))
    tab = build_response_table(tr, st, 5.0)
    lk = _median(lambda: tab.lookup(hs, tp, wf))
    print(f"load average {os.getloadavg()[0]:.2f}, cpu count {os.cpu_count()}")
    print(f"exact path: {e1 / n * 1e6:.1f} us per sample (1 partition), {e2 / (2 * n) * 1e6:.1f} us per "
          f"sample-partition (2 partitions)")
    print(f"table: build {b:.3f} s, load from disk cache {d * 1e3:.1f} ms, look-up {lk / (2 * n) * 1e6:.2f} us "
          f"per sample-partition")
    print(f"api.METHOD_COST_S in use: {api.METHOD_COST_S}")
    for speed_nodes in (1, 3):
        print(f"break-even (cold cache, {speed_nodes} speed node(s), 1 partition): "
              f"{speed_nodes * b / max(e1 / n - lk / (2 * n), 1e-12):.0f} samples")
    api._TABLE_CACHE.clear()
    os.environ["SEAWAY_CACHE_DIR"] = tempfile.mkdtemp(prefix="seaway_cost_cold_")
    args = dict(hs_m=hs[:, 0], tp_s=tp[:, 0], wave_from_deg=wf[:, 0], course_deg=45.0, speed_m_s=5.0,
                station=st[0].name)
    cold = api.choose_method(prof, n, speed_m_s=5.0, station=st[0].name)
    t = time.perf_counter(); api.assess_motions(prof, method="table", **args); tt = time.perf_counter() - t
    api._TABLE_CACHE.clear()
    warm = api.choose_method(prof, n, speed_m_s=5.0, station=st[0].name)
    t = time.perf_counter(); api.assess_motions(prof, method="table", **args); tw = time.perf_counter() - t
    t = time.perf_counter(); api.assess_motions(prof, method="exact", **args); te = time.perf_counter() - t
    print(f"auto for {n} samples, 1 partition: cold cache -> {cold}, warm disk cache -> {warm}; measured "
          f"(whole assess_motions): table cold {tt:.3f} s, table warm {tw:.3f} s, exact {te:.3f} s")


if __name__ == "__main__":
    sys.exit(main())
