# SPDX-License-Identifier: GPL-2.0-or-later
"""Benchmark of the wave-physics core (prints figures; no assertions; not collected by pytest).

Run:  .venv/bin/python -P tests/bench/bench_waves.py [--quick]

1. Dispersion: wavenumber for 1e6 random (period, depth) pairs with the vectorised Newton solver,
   against a per-element scipy.optimize.brentq baseline measured in the same run on a random
   subsample (its per-element cost is extrapolated to 1e6 elements; said so in the output).
2. JONSWAP: spectra for 1e4 sea states x 48 frequencies in one call, against a Python loop that
   builds one sea state per call (same function, measured in the same run on all sea states).
"""
from __future__ import annotations

import argparse
import math
import sys
import time
from pathlib import Path
from typing import Callable, List

sys.path.insert(0, str(Path(__file__).resolve().parent))  # -P drops the script folder
import _pkg  # noqa: E402,F401  (exposes the checkout as `seaway_comfort`)

import numpy as np  # noqa: E402
from scipy.optimize import brentq  # noqa: E402

from seaway_comfort.processing.core.waves.dispersion import wavenumber_rad_m  # noqa: E402
from seaway_comfort.processing.core.waves.spectra import frequency_grid_rad_s, jonswap_s_m2_s_rad
from seaway_comfort.processing.core.units import G_STANDARD_M_S2  # noqa: E402


def _best_of(fn: Callable[[], object], repeat: int) -> float:
    """Smallest wall time [s] of ``repeat`` runs (time.perf_counter)."""
    times: List[float] = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return min(times)


def bench_dispersion(n: int, n_baseline: int, repeat: int) -> None:
    rng = np.random.default_rng(20261201)
    period = rng.uniform(2.0, 20.0, n)
    depth = np.exp(rng.uniform(math.log(1.0), math.log(500.0), n))
    omega = 2.0 * math.pi / period
    g = G_STANDARD_M_S2

    t_vec = _best_of(lambda: wavenumber_rad_m(omega, depth, g_m_s2=g), repeat)
    k_vec = wavenumber_rad_m(omega, depth, g_m_s2=g)

    idx = rng.choice(n, n_baseline, replace=False)

    def baseline() -> np.ndarray:
        out = np.empty(idx.size)
        for j, i in enumerate(idx):
            w, h = omega[i], depth[i]
            y = w * w * h / g
            lo, hi = max(y, math.sqrt(y)), y + math.sqrt(y)
            x = brentq(lambda x: x * math.tanh(x) - y, lo * (1 - 1e-12), hi, xtol=1e-14, rtol=1e-13)
            out[j] = x / h
        return out

    t_base_sub = _best_of(baseline, max(1, repeat // 2))
    k_base = baseline()
    per_elem = t_base_sub / idx.size
    t_base_full = per_elem * n
    err = float(np.max(np.abs(k_vec[idx] / k_base - 1.0)))
    print("Dispersion solve (omega^2 = g k tanh kh), %d (period, depth) pairs" % n)
    print("  vectorised Newton (Fenton-McKee seed): %.3f s  -> %.2f M elements/s" % (t_vec, n / t_vec / 1e6))
    print("  baseline scipy.optimize.brentq per element: measured on %d random elements: %.3f s"
          " (%.1f us/element), EXTRAPOLATED to %d elements: %.1f s" % (idx.size, t_base_sub, per_elem * 1e6, n, t_base_full))
    print("  speed-up vs brentq loop (extrapolated): %.0fx" % (t_base_full / t_vec))
    print("  max relative difference to brentq on the subsample: %.2e" % err)


def bench_jonswap(n_states: int, repeat: int) -> None:
    rng = np.random.default_rng(7)
    hs = rng.uniform(0.2, 8.0, n_states)
    tp = rng.uniform(3.0, 16.0, n_states)
    gam = rng.uniform(1.0, 7.0, n_states)
    grid = frequency_grid_rad_s(3.0, 16.0, 48)
    om, w = grid.omega_rad_s, grid.weights_rad_s

    def vectorised() -> np.ndarray:
        return jonswap_s_m2_s_rad(om, hs, tp, gam, normalise_weights=w)

    def loop() -> np.ndarray:
        out = np.empty((n_states, om.size))
        for i in range(n_states):
            out[i] = jonswap_s_m2_s_rad(om, hs[i], tp[i], gam[i], normalise_weights=w)
        return out

    t_vec = _best_of(vectorised, repeat)
    t_loop = _best_of(loop, max(1, repeat // 2))
    diff = float(np.max(np.abs(vectorised() - loop())))
    print("JONSWAP construction, %d sea states x %d frequencies (numerical normalisation)" % (n_states, om.size))
    print("  one vectorised call: %.4f s -> %.2f M spectral values/s" % (t_vec, n_states * om.size / t_vec / 1e6))
    print("  baseline Python loop, one sea state per call (all %d measured): %.3f s" % (n_states, t_loop))
    print("  speed-up vs loop: %.0fx; max |difference| %.1e m^2 s/rad" % (t_loop / t_vec, diff))


def main(argv: List[str] | None = None) -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true", help="smaller sizes for a smoke run")
    args = parser.parse_args(argv)
    print("numpy %s; best-of timings with time.perf_counter" % np.__version__)
    if args.quick:
        bench_dispersion(100_000, 500, 2)
        bench_jonswap(1_000, 2)
    else:
        bench_dispersion(1_000_000, 5_000, 3)
        bench_jonswap(10_000, 3)


if __name__ == "__main__":
    main()
