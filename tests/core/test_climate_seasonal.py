# SPDX-License-Identifier: GPL-2.0-or-later
"""Seasonal climate on an invented hindcast with a known seasonal cycle, checked by hand.

The sea is uniform in space: Hs(t) = c + a sin(2 pi d / 365.25) (d = day of the year, UTC),
constant Tp = 8 s from 270 deg; the route runs due north along 8 W (course 0, so the relative
heading is mu = (270 + 180 - 0) mod 360 = 90 deg, ITTC convention). How the expected values are
derived (independently of the climate engine):

* Class threshold H*: for fixed (Tp, mu) every RMS response is proportional to Hs (linear
  superposition, Lewis (ed.) 1989, PNA vol. III ch. 8), MSI (O'Hanlon & McCauley 1974) grows
  with the acceleration and the criteria usage is linear in Hs, so the comfort class is a
  non-decreasing step function of Hs. H* = the smallest Hs with class > MAX_CLASS, found here by
  bisection on the SAME response table, looked up directly (tables.lookup + comfort + criteria
  functions), never through the engine. Likewise the exceedance height H_x = 1 / usage(Hs = 1 m)
  (usage linear in Hs).
* The cycle is then chosen with c = H* + a/2, a = 0.8 H*: "acceptable" (Hs < H*) means
  sin(theta) < -1/2, i.e. theta in (7 pi/6, 11 pi/6): the days d in (7/12, 11/12) x 365.25
  (arcsin(-1/2) = -pi/6, exact).
* Exact discrete expectations: the same rule evaluated at every 3-hourly step (Hs rounded to
  float32 as stored in the file), a passage departing at step j needs steps j..j+P acceptable
  with P = round(passage hours / 3) (passage length from geographiclib, Karney 2013), and the
  wait from step j is the distance to the next acceptable departure (plain Python loops here).
* Continuous expectations (tolerance = the 3 h step): month shares = overlap of the month with
  the acceptable days; window probability = overlap with (d_lo, d_hi - passage); mean wait for a
  month wholly before d_lo = d_lo - (middle of the month).
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from geographiclib.geodesic import Geodesic

from seaway_comfort.processing.core import climate as C
from seaway_comfort.processing.core.api import assess_motions, transfer_model
from seaway_comfort.processing.core.climate.engine import classify_sea, prepare_climate
from seaway_comfort.processing.core.demo.synthetic_hindcast import (
    SeasonalCycle,
    seasonal_hs_m,
    write_seasonal_hindcast,
)
from seaway_comfort.processing.core.comfort.indices import (
    comfort_class,
    mean_abs_from_rms,
    msi_percent,
)
from seaway_comfort.processing.core.comfort.criteria import evaluate_criteria
from seaway_comfort.processing.core.flags import CAUTION
from seaway_comfort.processing.core.motions.tables import build_response_table
from seaway_comfort.processing.core.units import KNOT_M_S
from seaway_comfort.processing.core.vessel.profile import resolve_vessel

VESSEL = "coastal_survey_35m"
STATION = "bridge"
SPEED_KN = 10.0
TP_S, FROM_DEG, MU_DEG = 8.0, 270.0, 90.0
MAX_CLASS = 1
ROUTE_LON, ROUTE_LAT = [-8.0, -8.0], [41.0, 43.0]
YEARS = (2030, 2031)  # both 365 days
YEAR_DAYS = 365.25
MONTH_START_DAY = np.cumsum([0, 31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31])  # non-leap year


@pytest.fixture(scope="module")
def table():
    prof = resolve_vessel(VESSEL)
    return build_response_table(transfer_model(prof), [prof.station(STATION)], SPEED_KN * KNOT_M_S)


def _class_and_usage(table, hs):
    task = resolve_vessel(VESSEL).station(STATION).task
    hs = np.atleast_1d(np.asarray(hs, dtype=float))
    res = table.lookup(hs, np.full(hs.size, TP_S), np.full(hs.size, MU_DEG))
    vacc = res.vacc_rms_m_s2[:, 0]
    msi = msi_percent(mean_abs_from_rms(vacc), res.vacc_omega_rad_s[:, 0])
    crit = evaluate_criteria(task, vacc, res.lacc_rms_m_s2[:, 0], res.roll_rms_deg)
    return comfort_class(msi, crit.usage), crit.usage


def _threshold(table):
    lo, hi = 0.01, 20.0
    assert _class_and_usage(table, lo)[0][0] <= MAX_CLASS < _class_and_usage(table, hi)[0][0]
    for _ in range(80):
        mid = 0.5 * (lo + hi)
        if _class_and_usage(table, mid)[0][0] > MAX_CLASS:
            hi = mid
        else:
            lo = mid
    return hi


@pytest.fixture(scope="module")
def case(tmp_path_factory, table):
    h_star = _threshold(table)
    amp = 0.8 * h_star
    cycle = SeasonalCycle(hs_mean_m=h_star + 0.5 * amp, hs_amp_m=amp, tp_s=TP_S, wave_from_deg=FROM_DEG,
                          year_days=YEAR_DAYS)
    folder = tmp_path_factory.mktemp("seasonal")
    paths = write_seasonal_hindcast(str(folder), YEARS, cycle=cycle)
    series = C.open_hindcast(paths)
    result = C.compute_climate(ROUTE_LON, ROUTE_LAT, series, VESSEL, speed_kn=SPEED_KN, station=STATION,
                               max_class=MAX_CLASS, backend=C.SerialBackend(), chunk_steps=1000)
    return {"h_star": h_star, "cycle": cycle, "series": series, "result": result, "paths": paths}


def _discrete(case, table):
    series = case["series"]
    t = series.times_utc
    hs = seasonal_hs_m(t, case["cycle"]).astype(np.float32).astype(np.float64)  # file stores float32
    h_star = case["h_star"]
    assert np.min(np.abs(hs - h_star)) > 1e-7  # no step ambiguously on the threshold
    ok = hs < h_star
    usage1 = float(_class_and_usage(table, 1.0)[1][0])
    exceed = hs > 1.0 / usage1
    months = (t.astype("datetime64[M]").astype(np.int64) % 12)
    length_m = Geodesic.WGS84.Inverse(ROUTE_LAT[0], ROUTE_LON[0], ROUTE_LAT[1], ROUTE_LON[1])["s12"]
    passage_h = length_m / (SPEED_KN * KNOT_M_S) / 3600.0
    p = int(round(passage_h / 3.0))
    n = t.size
    dep_ok = np.zeros(n, dtype=bool)
    dep_known = np.zeros(n, dtype=bool)
    for j in range(n):
        if j + p < n:
            dep_known[j] = True
            dep_ok[j] = bool(ok[j:j + p + 1].all())
    wait = np.full(n, -1)
    nxt = -1
    for j in range(n - 1, -1, -1):
        if dep_ok[j]:
            nxt = j
        wait[j] = nxt - j if nxt >= 0 else -1
    return dict(ok=ok, exceed=exceed, months=months, passage_h=passage_h, p=p, dep_ok=dep_ok,
                dep_known=dep_known, wait=wait)


def test_threshold_inside_cycle_and_nontrivial(case, table):
    # guards that the checks below can fail: both states occur in the data
    d = _discrete(case, table)
    assert 0.2 < d["ok"].mean() < 0.5
    assert 0.0 < d["exceed"].mean() < 0.6
    assert d["p"] >= 3  # the passage spans several steps (persistence matters)


def test_ok_and_exceedance_shares_exact(case, table):
    d = _discrete(case, table)
    r = case["result"]
    assert r.months == tuple(range(1, 13))
    for k in range(12):
        sel = d["months"] == k
        # uniform sea: every sample has the same share as the route
        assert np.all(r.ok_share[k] == d["ok"][sel].mean())
        assert r.route_ok_share[k] == d["ok"][sel].mean()
        assert r.route_exceed_share[k] == d["exceed"][sel].mean()
        assert np.all(r.valid_steps[k] == sel.sum())
        assert np.all(r.missing_steps[k] == 0)
        # shares of the five classes add to one
        assert np.allclose(r.route_class_share[k].sum(), 1.0, atol=1e-12)
        assert np.isclose(r.route_class_share[k][:MAX_CLASS + 1].sum(), r.route_ok_share[k], atol=1e-12)


def test_ok_share_matches_continuous_sine(case):
    r = case["result"]
    d_lo, d_hi = 7.0 / 12.0 * YEAR_DAYS, 11.0 / 12.0 * YEAR_DAYS  # arcsin(-1/2) = -pi/6
    for k in range(12):
        a, b = MONTH_START_DAY[k], MONTH_START_DAY[k + 1]
        expect = max(0.0, min(b, d_hi) - max(a, d_lo)) / (b - a)
        assert r.route_ok_share[k] == pytest.approx(expect, abs=2 * 0.125 / (b - a) + 1e-9)


def test_window_probability_exact_and_continuous(case, table):
    d = _discrete(case, table)
    r = case["result"]
    assert r.passage_h == pytest.approx(d["passage_h"], rel=1e-9)  # geographiclib distance / speed
    d_lo, d_hi = 7.0 / 12.0 * YEAR_DAYS, 11.0 / 12.0 * YEAR_DAYS
    for k in range(12):
        sel = d["months"] == k
        known = sel & d["dep_known"]
        assert r.departures_known[k] == known.sum()
        assert r.departures_ok[k] == (known & d["dep_ok"]).sum()
        assert r.window_probability[k] == (known & d["dep_ok"]).sum() / known.sum()
        a, b = MONTH_START_DAY[k], MONTH_START_DAY[k + 1]
        expect = max(0.0, min(b, d_hi - d["passage_h"] / 24.0) - max(a, d_lo)) / (b - a)
        assert r.window_probability[k] == pytest.approx(expect, abs=3 * 0.125 / (b - a) + 1e-9)
    # the last departures of the data cannot finish: they are not counted (December of the last year)
    assert r.departures_past_end[11] == d["p"]


def test_waiting_time_exact_continuous_and_censored(case, table):
    d = _discrete(case, table)
    r = case["result"]
    for k in range(12):
        sel = d["months"] == k
        w = d["wait"][sel]
        known = w >= 0
        assert r.wait_censored[k] == (~known).sum()
        if known.any():
            assert r.mean_wait_h[k] == pytest.approx(w[known].mean() * 3.0, rel=0, abs=1e-9)
        else:
            assert math.isnan(r.mean_wait_h[k])
    d_lo = 7.0 / 12.0 * YEAR_DAYS
    for k in range(7):  # January..July lie wholly before the first acceptable day
        a, b = MONTH_START_DAY[k], MONTH_START_DAY[k + 1]
        assert r.mean_wait_h[k] == pytest.approx((d_lo - 0.5 * (a + b)) * 24.0, abs=3.0)
    # December of the last year: only the departures at 1 Dec (day 334) + k steps whose passage
    # (P steps) ends before d_hi = 11/12 x 365.25 are acceptable; every later start is censored
    d_hi = 11.0 / 12.0 * YEAR_DAYS
    n_ok_dec = math.floor((d_hi - d["p"] * 0.125 - 334.0) * 8.0) + 1
    assert 0 < n_ok_dec < 8  # the case is non-trivial
    assert r.wait_censored[11] == 31 * 8 - n_ok_dec


def test_chunking_does_not_change_anything(case):
    # the same climate with very different chunk sizes: identical integers and shares
    r1 = case["result"]
    r2 = C.compute_climate(ROUTE_LON, ROUTE_LAT, case["series"], VESSEL, speed_kn=SPEED_KN, station=STATION,
                           max_class=MAX_CLASS, backend=C.SerialBackend(), chunk_steps=97)
    for name in ("ok_share", "class_share", "exceed_share", "window_probability", "mean_wait_h",
                 "wait_censored", "departures_known", "departures_past_end"):
        np.testing.assert_array_equal(getattr(r1, name), getattr(r2, name))


def test_month_selection_and_csv(case, tmp_path):
    r = C.compute_climate(ROUTE_LON, ROUTE_LAT, case["series"], VESSEL, speed_kn=SPEED_KN, station=STATION,
                          max_class=MAX_CLASS, backend=C.SerialBackend(), months="8-10")
    full = case["result"]
    assert r.months == (8, 9, 10)
    np.testing.assert_array_equal(r.route_ok_share, full.route_ok_share[7:10])
    text = r.to_csv(str(tmp_path / "c.csv"))
    lines = [ln for ln in text.splitlines() if not ln.startswith("#")]
    assert len(lines) == 1 + 3 * (1 + r.n)  # header + per month one route row and n sample rows
    assert CAUTION in text  # planning-aid caution carried by the output
    route_rows = [ln.split(",") for ln in lines[1:] if ln.split(",")[1] == "route"]
    assert [int(x[0]) for x in route_rows] == [8, 9, 10]
    assert float(route_rows[0][10]) == pytest.approx(full.route_ok_share[7], abs=5e-5)


def test_setup_uses_one_table_and_nearest_step_offsets(case):
    s = prepare_climate(ROUTE_LON, ROUTE_LAT, case["series"], VESSEL, speed_kn=SPEED_KN, station=STATION)
    # nearest hindcast step at each sample: round(elapsed / 3 h), elapsed = distance / speed
    np.testing.assert_array_equal(s.offset_steps, np.rint(s.dist_m / (SPEED_KN * KNOT_M_S) / 10800.0))
    assert s.passage_steps == int(round(s.dist_m[-1] / (SPEED_KN * KNOT_M_S) / 10800.0))


def test_classes_equal_the_one_call_facade(case):
    # reference: api.assess_motions (method "table"), the project's one-call path, whose
    # formulas are checked against published values in its own tests; same sea states, same
    # vessel, speed and station -> the same comfort class and criteria exceedance
    rng = np.random.default_rng(7)
    n = 400
    hs = rng.uniform(0.1, 4.0, n)
    tp = rng.uniform(3.0, 14.0, n)
    wd = rng.uniform(0.0, 360.0, n)
    s = prepare_climate(ROUTE_LON, ROUTE_LAT, case["series"], VESSEL, speed_kn=SPEED_KN, station=STATION)
    def rep(v):  # the same sea state at every route sample (the check uses sample 0)
        return np.repeat(v[:, None], s.n, axis=1)

    got = classify_sea(s, rep(hs), rep(tp), rep(wd))
    ref = assess_motions(resolve_vessel(VESSEL), hs_m=hs, tp_s=tp, wave_from_deg=wd,
                         course_deg=float(s.course_deg[0]), speed_m_s=SPEED_KN * KNOT_M_S, station=STATION,
                         method="table")
    np.testing.assert_array_equal(got.comfort_class[:, 0], ref.comfort_class)
    np.testing.assert_array_equal(got.exceeded[:, 0], (ref.flags & 0x8000) != 0)  # CRITERIA_EXCEEDED bit
    assert len(set(ref.comfort_class.tolist())) >= 3  # the comparison covers several classes
