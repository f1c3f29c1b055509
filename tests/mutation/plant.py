# SPDX-License-Identifier: GPL-2.0-or-later
"""Plant realistic single-line bugs one at a time and report which no test catches (not in CI).

Each plant names a regular expression that finds its site anywhere under ``processing/`` or
``plugin/`` (so it survives modules being moved), the replacement, and the tests to run. The
file is restored after every run (also on Ctrl-C). A site that is not found is reported as
"site not found", never planted. Usage, from the checkout::

    /work/main/.venv/bin/python -P tests/mutation/plant.py [--full] [--only NAME ...]

``--full`` runs every core test (tests/core) for each plant instead of the listed targets;
QGIS targets need a Python that imports qgis (they run with SEAWAY_REQUIRE_QGIS=1).
"""
from __future__ import annotations

import argparse
import os
import re
import subprocess
import sys
import time
from pathlib import Path
from typing import List, NamedTuple, Optional, Sequence, Tuple

ROOT = Path(__file__).resolve().parents[2]
SEARCH_DIRS = ("processing", "plugin")


class Plant(NamedTuple):
    name: str
    pattern: str  # regex (re.S); its first match in the first file holding it is replaced
    replacement: str
    tests: Tuple[str, ...]


P = Plant
PLANTS: Tuple[Plant, ...] = (
    P("doppler sign", r"omega - kin\.k_rad_m \* u_cos", "omega + kin.k_rad_m * u_cos",
      ("tests/core/test_heading.py", "tests/core/test_passage.py")),
    P("heading convention", r"wrap_deg\(wave_from \+ 180\.0 - course\)", "wrap_deg(wave_from - course)",
      ("tests/core/test_heading.py", "tests/core/test_passage.py")),
    P("knots as km/h", r"KNOT_M_S: float = 1852\.0 / 3600\.0", "KNOT_M_S: float = 1000.0 / 3600.0",
      ("tests/core/test_units_flags.py", "tests/core/test_passage.py")),
    P("Wf dropped", r"w\[4\] = we4 \* _wf2_unchecked\(np\.abs\(we\)\)", "w[4] = we4",
      ("tests/core/test_response.py", "tests/core/test_api.py")),
    P("MSDV without sqrt (steady)", r"return np\.asarray\(a \* np\.sqrt\(t\), dtype=float\)",
      "return np.asarray(a * t, dtype=float)", ("tests/core/test_comfort.py",)),
    P("MSDV without sqrt (cumulative)", r"return np\.sqrt\(np\.cumsum\(a \* a \* dt\)\)",
      "return np.cumsum(a * a * dt)", ("tests/core/test_comfort.py", "tests/core/test_passage.py")),
    P("bilinear weights transposed",
      r"\[\(1 - fx\) \* \(1 - fy\), fx \* \(1 - fy\), \(1 - fx\) \* fy, fx \* fy\]",
      "[(1 - fx) * (1 - fy), (1 - fx) * fy, fx * (1 - fy), fx * fy]",
      ("tests/core/test_climate_hindcast.py", "tests/core/test_seastate_netcdf.py", "tests/core/test_seastate_grid.py")),
    P("time weights swapped", r"np\.where\(need0, \(1 - wt\) \* m0, 0\.0\) \+ np\.where\(need1, wt \* m1, 0\.0\)",
      "np.where(need0, wt * m0, 0.0) + np.where(need1, (1 - wt) * m1, 0.0)",
      ("tests/core/test_seastate_netcdf.py", "tests/core/test_seastate_timeaxis.py")),
    P("JONSWAP sigma swapped", r"np\.where\(om <= wp, sa, sb\)", "np.where(om <= wp, sb, sa)",
      ("tests/core/test_spectra.py",)),
    P("PM constant 5/16 -> 5/8", r"\(5\.0 / 16\.0\) \* hs2", "(5.0 / 8.0) * hs2", ("tests/core/test_spectra.py",)),
    P("Hm0 = 2 sqrt(m0)", r"return 4\.0 \* np\.sqrt\(spectral_moment\(", "return 2.0 * np.sqrt(spectral_moment(",
      ("tests/core/test_spectra.py",)),
    P("partition Hs summed, not in quadrature", r"np\.where\(np\.isfinite\(p\), p \* p, 0\.0\)",
      "np.where(np.isfinite(p), p, 0.0)", ("tests/core/test_seastate_variables.py", "tests/core/test_seastate_grib.py",
                                           "tests/core/test_passage.py")),
    P("Tm01 as Tp in forecasts", r"TM01_OVER_TP = 0\.8343", "TM01_OVER_TP = 1.0",
      ("tests/core/test_seastate_variables.py", "tests/core/test_seastate_netcdf.py")),
    P("vomiting Km 1/3 -> 1/2", r"KM_VOMITING: float = 1\.0 / 3\.0", "KM_VOMITING: float = 1.0 / 2.0",
      ("tests/core/test_comfort.py",)),
    P("mean |a| = RMS", r"GAUSS_MEAN_ABS: float = math\.sqrt\(2\.0 / math\.pi\)", "GAUSS_MEAN_ABS: float = 1.0",
      ("tests/core/test_comfort.py",)),
    P("going-to direction not turned", r"turn\[di == d\] = math\.pi", "turn[di == d] = 0.0",
      ("tests/core/test_climate_hindcast.py",)),
    P("NULL written as 0", r"\[v if ok else null for v, ok in zip\(a\.tolist\(\), np\.isfinite\(a\)\.tolist\(\)\)\]",
      "[v if ok else 0.0 for v, ok in zip(a.tolist(), np.isfinite(a).tolist())]",
      ("tests/qgis/test_field_types.py", "tests/qgis/test_route_comfort.py")),
    P("profile clobber check removed", r"if path\.exists\(\) and not overwrite:", "if False:",
      ("tests/core/test_profile_store.py",)),
    P("output-over-input check removed", r"        if clash is not None:\n", "        if False:\n",
      ("tests/qgis/test_route_comfort.py", "tests/qgis/test_protected_inputs.py")),
    # --- the six plants of issue 20 ---
    P("hindcast Tm01 taken as Tp", r'"ratio": 1\.0 if per == "tp" else MEAN_PERIOD_RATIOS\[per\]', '"ratio": 1.0',
      ("tests/core/test_climate_hindcast.py", "tests/core/test_regression_guards.py")),
    P("provider drops sweep and climate", r"    DepartureSweepAlgorithm,\n(    ComfortTrackAlgorithm,\n)?    SeasonalClimateAlgorithm,\n", r"\1",
      ("tests/qgis/test_departure_sweep.py", "tests/qgis/test_seasonal_climate.py")),
    P("SHALLOW never set", r"flags\[idx\[shallow\]\] \|= int\(SampleFlag\.SHALLOW_WATER\)", "flags[idx[shallow]] |= 0",
      ("tests/core/test_passage.py", "tests/core/test_regression_guards.py")),
    P("parametric roll under sync bit", r'\("para", SampleFlag\.PARAMETRIC_ROLL\)',
      '("para", SampleFlag.SYNC_ROLL)',
      ("tests/core/test_safety.py", "tests/core/test_regression_guards.py")),
    P("dwell wholly to the earlier sample", r"out\[:-1\] \+= 0\.5 \* d\n(\s*)out\[1:\] \+= 0\.5 \* d",
      r"out[:-1] += d", ("tests/core/test_passage.py", "tests/core/test_regression_guards.py")),
    P("MSI class bound >= -> >", r'np\.searchsorted\(np\.asarray\(MSI_CLASS_BOUNDS_PCT\), msi, side="right"\)',
      'np.searchsorted(np.asarray(MSI_CLASS_BOUNDS_PCT), msi, side="left")',
      ("tests/core/test_comfort.py", "tests/core/test_regression_guards.py")),
)


def find_site(pattern: str) -> Optional[Tuple[Path, re.Match]]:
    rx = re.compile(pattern, re.S)
    for d in SEARCH_DIRS:
        for path in sorted((ROOT / d).rglob("*.py")):
            m = rx.search(path.read_text(encoding="utf-8"))
            if m:
                return path, m
    return None


def run_tests(targets: Sequence[str], timeout_s: float) -> Tuple[str, float]:
    """'caught' (a test failed or errored), 'missed' (all passed) or 'error: ...'."""
    env = dict(os.environ, QT_QPA_PLATFORM="offscreen", SEAWAY_REQUIRE_QGIS="1")
    env.setdefault("PROJ_DATA", "/usr/share/proj")
    qgis = any("/qgis/" in t for t in targets)
    cmd = [sys.executable, "-P", "-m", "pytest", "-q", "-x", "-p", "no:cacheprovider", *targets]
    if not qgis:
        cmd[5:5] = ["-p", "no:pytest_qgis"]
    t0 = time.monotonic()
    try:
        r = subprocess.run(cmd, cwd=ROOT, env=env, capture_output=True, text=True, timeout=timeout_s)
    except subprocess.TimeoutExpired:
        return "error: timeout", time.monotonic() - t0
    dt = time.monotonic() - t0
    if r.returncode == 0:
        return "missed", dt
    if r.returncode in (1, 2):  # test failures / collection errors
        return "caught", dt
    return f"error: exit {r.returncode}", dt


def plant_once(p: Plant, full: bool, timeout_s: float) -> Tuple[str, str, float]:
    site = find_site(p.pattern)
    if site is None:
        return "site not found", "-", 0.0
    path, m = site
    original = path.read_text(encoding="utf-8")
    mutated = original[: m.start()] + m.expand(p.replacement) + original[m.end():]
    try:
        path.write_text(mutated, encoding="utf-8")
        targets = ("tests/core",) if full and not any("/qgis/" in t for t in p.tests) else p.tests
        verdict, dt = run_tests(targets, timeout_s)
    finally:
        path.write_text(original, encoding="utf-8")
    return verdict, str(path.relative_to(ROOT)), dt


def main(argv: Optional[List[str]] = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--full", action="store_true", help="run all core tests for each core plant")
    ap.add_argument("--only", nargs="*", default=None, help="plant names (substring match)")
    ap.add_argument("--timeout", type=float, default=900.0)
    a = ap.parse_args(argv)
    chosen = [p for p in PLANTS if not a.only or any(o.lower() in p.name.lower() for o in a.only)]
    rows = []
    for p in chosen:
        verdict, where, dt = plant_once(p, a.full, a.timeout)
        rows.append((p.name, where, verdict, dt))
        print(f"{p.name:40s} {verdict:15s} {dt:6.1f} s  {where}", flush=True)
    print("\n| plant | file | result |\n|---|---|---|")
    for name, where, verdict, _ in rows:
        print(f"| {name} | {where} | {'NOT CAUGHT' if verdict == 'missed' else verdict} |")
    missed = [r for r in rows if r[2] != "caught"]
    print(f"\n{len(rows) - len(missed)}/{len(rows)} plants caught; not caught: "
          + (", ".join(r[0] for r in missed) or "none"))
    return 1 if missed else 0


if __name__ == "__main__":
    sys.exit(main())
