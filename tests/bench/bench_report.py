# SPDX-License-Identifier: GPL-2.0-or-later
"""Benchmark of the passage report on a route layer of many short features (prints figures; no
assertions; not collected by pytest).

Run:  .venv/bin/python -P tests/bench/bench_report.py [--legs 2000]

Case: 2,000 legs of 3 samples each (invented values, built directly as PassageResult records,
no physics run), one hour apart.

Figures printed (best of 3 each):
1. ``build_report`` + ``render_html`` as the algorithm calls them (the 20 worst legs in full,
   the rest aggregated, SVG figures): time and page size.
2. Baselines measured in the same run:
   Linearity: the same at half the legs.
   (a) the same page with every leg in full (``legs_in_full`` = number of legs): the cost of
       per-leg detail that the bound removes;
   (b) when matplotlib can be imported, the former per-leg figure (three panels drawn with
       matplotlib on an Agg canvas and saved as PNG, as the report did before inline SVG), timed
       on 20 legs and extrapolated to all legs (stated in the output).
   Ratios baseline / bounded report are printed.
"""
from __future__ import annotations

import argparse
import io
import sys
import time
from pathlib import Path
from typing import Callable, List, Tuple

sys.path.insert(0, str(Path(__file__).resolve().parent))  # -P drops the script folder
import _pkg  # noqa: E402,F401  (exposes the checkout as `seaway_comfort`)

import numpy as np  # noqa: E402

T0 = np.datetime64("2031-03-11T06:00", "ms")  # invented scenario
LABELS = ("smooth", "steady", "lively", "taxing", "punishing")


def _best_of(fn: Callable[[], object], repeat: int = 3) -> Tuple[float, object]:
    best, out = float("inf"), None
    for _ in range(repeat):
        t = time.perf_counter()
        out = fn()
        best = min(best, time.perf_counter() - t)
    return best, out


def make_legs(n_legs: int) -> List[tuple]:
    """Short legs of three samples, consecutive in time and space, classes cycling."""
    from seaway_comfort.processing.core.passage.fields import MOTION_OUTPUTS
    from seaway_comfort.processing.core.passage.result import PassageResult

    legs = []
    for k in range(n_legs):
        n = 3
        cls = np.array([k % 3, (k * 7) % 4, 4 if k % 97 == 0 else 1], dtype=np.int64)
        eta = T0 + np.timedelta64(k * 60, "m") + (np.arange(n) * 20 * 60 * 1000).astype("timedelta64[ms]")
        full = np.full(n, 1.0)
        motions = {o.name: full * 0.3 for o in MOTION_OUTPUTS}
        motions["msi_pct"] = np.array([1.0, 3.0, 10.0 + k % 97])
        legs.append((f"feature {k}", PassageResult(
            leg=np.full(n, k), seq=np.arange(n), eta_utc=eta, dist_nm=np.arange(n) * 1.5, course_deg=full * 45,
            hs_m=full * (1.0 + (k % 50) / 25), tp_s=full * 8, wave_from_deg=full * 200, depth_m=full * np.nan,
            wavelength_m=full * 100, celerity_m_s=full * 12, rel_heading_deg=full * 30, enc_period_s=full * 9,
            msdv_cum=full * 5, vomit_pct=full * 1.6, comfort_class=cls, comfort_label=tuple(LABELS[c] for c in cls),
            flags=np.zeros(n, dtype=np.int64), source=("model A",) * n,
            lon_deg=-21 + k * 0.002 + np.arange(n) * 0.0007, lat_deg=np.full(n, -24.5) + k * 0.001,
            speed_kn=full * 9, dwell_s=np.array([600.0, 1200.0, 600.0]), is_vertex=np.array([True, False, True]),
            computed=np.ones(n, dtype=bool), vessel_name="bench vessel", station_name="bridge", method="table",
            departure_utc=eta[0], **motions)))
    return legs


def old_leg_figure(r) -> bytes:  # type: ignore[no-untyped-def]
    """The former per-leg figure: three matplotlib panels on an Agg canvas, saved as PNG."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    fig = Figure(figsize=(8.0, 6.0), dpi=90)
    FigureCanvasAgg(fig)
    hours = (r.eta_utc - r.eta_utc[0]).astype("timedelta64[s]").astype(float) / 3600.0
    ax1, ax2, ax3 = fig.subplots(3, 1, sharex=True)
    ax1.plot(hours, r.hs_m)
    ax1.twinx().plot(hours, r.tp_s, linestyle="--")
    ax2.plot(hours, r.vacc_rms_m_s2)
    ax2.plot(hours, r.lacc_rms_m_s2)
    ax2.legend(["v", "l"], fontsize=7)
    ax2.twinx().plot(hours, r.msi_pct, linestyle=":")
    ax3.bar(hours, r.comfort_class + 1, width=0.3)
    fig.tight_layout()
    buf = io.BytesIO()
    fig.savefig(buf, format="png")
    return buf.getvalue()


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--legs", type=int, default=2000)
    args = ap.parse_args()
    from seaway_comfort.processing.core.reports import passage as rp

    legs = make_legs(args.legs)
    inputs = rp.ReportInputs(created_utc="bench")
    t_b, rep = _best_of(lambda: rp.build_report(legs, inputs))
    t_r, text = _best_of(lambda: rp.render_html(rep))
    size_mb = len(text.encode("utf-8")) / 1e6
    print(f"case: {args.legs} legs x 3 samples (invented), one page")
    print(f"1. bounded report ({rp.LEGS_IN_FULL} worst legs in full): build {t_b:.2f} s + render {t_r:.2f} s "
          f"= {t_b + t_r:.2f} s, {size_mb:.2f} MB, matplotlib imported: {'matplotlib' in sys.modules}")
    half = legs[: args.legs // 2]
    t_h, _ = _best_of(lambda: rp.render_html(rp.build_report(half, inputs)))
    print(f"   linearity: {len(half)} legs {t_h:.2f} s, {args.legs} legs {t_b + t_r:.2f} s "
          f"(ratio {(t_b + t_r) / t_h:.2f}, 2.0 = linear)")
    t_f, full = _best_of(lambda: rp.render_html(rep, legs_in_full=args.legs), repeat=1)
    full_mb = len(full.encode("utf-8")) / 1e6
    print(f"2a. baseline, every leg in full: render {t_f:.2f} s, {full_mb:.2f} MB "
          f"(ratio time {t_f / t_r:.1f}x, size {full_mb / size_mb:.1f}x)")
    try:
        import matplotlib  # noqa: F401
    except ImportError:
        print("2b. baseline, former matplotlib figure per leg: matplotlib not installed, skipped")
        return
    k = 20
    t_m, _ = _best_of(lambda: [old_leg_figure(r) for _, r in legs[:k]], repeat=1)
    est = t_m / k * args.legs
    print(f"2b. baseline, former matplotlib figure per leg: {t_m:.2f} s for {k} legs, extrapolated to "
          f"{args.legs} legs {est:.0f} s (ratio {est / (t_b + t_r):.0f}x)")


if __name__ == "__main__":
    main()
