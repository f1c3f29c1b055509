# SPDX-License-Identifier: GPL-2.0-or-later
"""The departure sweep on invented forecasts with a storm patch at a known place and time.

What each check is compared with (named beside it):
* the storm timing by hand: the vessel reaches longitude x on the equator at
  d + s(x) / U, with s(x) the WGS84 geodesic distance from geographiclib (Karney 2013) and U the
  speed; the sampler interpolates linearly in time and bilinearly in space (Numerical Recipes
  3rd ed. s.3.6, as documented in seastate/sampler.py), so the storm's influence reaches one grid
  step (0.01 deg) and one time step (15 min) beyond its nodes. Only departures that clear those
  bands (or meet full storm values for at least 0.2 h) are asserted;
* the core pipeline itself (:func:`passage.compute_passage`, checked against published values in
  test_passage.py) on the same inputs, for agreement of the per-departure figures;
* the table path's documented accuracy (tables.py docstring: accelerations within 1 % of the
  exact path in short-crested seas); the MSI tolerance is derived from it by hand below;
* ISO 2631-1:1997 Annex D for the share who may vomit (Km = 1/3 times MSDV).
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from geographiclib.geodesic import Geodesic

from seaway_comfort.processing.core.sweep import engine as sweep
from seaway_comfort.processing.core.api import assess_motions
from seaway_comfort.processing.core.flags import CAUTION, SampleFlag
from seaway_comfort.processing.core.passage.pipeline import PassageCancelled, compute_passage
from seaway_comfort.processing.core.seastate import open_sea_state
from seaway_comfort.processing.core.demo.writers import write_cf_netcdf
from seaway_comfort.processing.core.units import KNOT_M_S, NAUTICAL_MILE_M
from seaway_comfort.processing.core.validation import SeawayInputError
from seaway_comfort.processing.core.vessel.profile import resolve_vessel

HS = "sea_surface_wave_significant_height"
TP = "sea_surface_wave_period_at_variance_spectral_density_maximum"
DIR = "sea_surface_wave_from_direction"
T0 = np.datetime64("2030-06-01T00:00", "ms")  # invented scenario
HORIZON_H = 30.0
STEP_MIN = 15
LON = np.round(np.arange(-0.2, 1.5001, 0.01), 2)
LAT = np.round(np.arange(-0.1, 0.1001, 0.05), 2)
CALM = (1.0, 6.0)   # Hs m, Tp s
STORM = (4.5, 9.0)
STORM_LON = (0.50, 0.70)
STORM_A_H = (10.0, 13.5)
STORM_B_H = (13.0, 16.5)  # source B: the same storm 3 h later
ROUTE_LON, ROUTE_LAT = [0.0, 1.2], [0.0, 0.0]  # due east along the equator: head seas (waves from 090)
SPEED_KN = 10.0
VESSEL = "ocean_research_70m"
MAX_CLASS = 2
BLUR_LON = 0.01
BLUR_H = STEP_MIN / 60.0


def _write(path, storm_h, horizon_h=HORIZON_H):
    times = T0 + np.arange(int(horizon_h * 60 / STEP_MIN) + 1) * np.timedelta64(STEP_MIN, "m")
    th = np.arange(times.size) * STEP_MIN / 60.0
    in_t = (th >= storm_h[0] - 1e-9) & (th <= storm_h[1] + 1e-9)
    in_x = (LON >= STORM_LON[0] - 1e-9) & (LON <= STORM_LON[1] + 1e-9)
    storm = np.broadcast_to(in_t[:, None, None] & in_x[None, None, :], (times.size, LAT.size, LON.size))
    write_cf_netcdf(path, LON, LAT, times, {
        HS: np.where(storm, STORM[0], CALM[0]), TP: np.where(storm, STORM[1], CALM[1]),
        DIR: np.full(storm.shape, 90.0),
    })
    return path


@pytest.fixture(scope="module")
def sources(tmp_path_factory):
    folder = tmp_path_factory.mktemp("storm")
    a = open_sea_state(_write(str(folder / "a.nc"), STORM_A_H), source_name="model A")
    b = open_sea_state(_write(str(folder / "b.nc"), STORM_B_H), source_name="model B")
    yield a, b
    a.close()
    b.close()


@pytest.fixture(scope="module")
def profile():
    return resolve_vessel(VESSEL)


def _hours_to(lon_deg):
    """Hours from departure to longitude lon on the equator (geographiclib distance / speed)."""
    s = Geodesic.WGS84.Inverse(0.0, 0.0, 0.0, lon_deg)["s12"]
    return s / (SPEED_KN * NAUTICAL_MILE_M)


def _meets(d_h, storm_h, *, full=False, margin_h=0.1):
    """By hand: does departure d_h meet the storm? Returns True / False / None (too close to tell).

    Blurred influence: lon (0.49, 0.71), time (start - 15 min, end + 15 min). Full strength:
    lon [0.50, 0.70] and time [start, end], overlap >= 0.2 h counts as a clear meeting.
    """
    a0, a1 = d_h + _hours_to(STORM_LON[0] - BLUR_LON), d_h + _hours_to(STORM_LON[1] + BLUR_LON)
    clear = a1 < storm_h[0] - BLUR_H - margin_h or a0 > storm_h[1] + BLUR_H + margin_h
    f0, f1 = d_h + _hours_to(STORM_LON[0]), d_h + _hours_to(STORM_LON[1])
    overlap = min(f1, storm_h[1]) - max(f0, storm_h[0])
    if clear:
        return False
    if overlap >= 0.2:
        return True
    return None


def _dep(h):
    return T0 + np.timedelta64(int(round(h * 3600)), "s")


def _hours(t):
    return float((np.datetime64(t, "ms") - T0).astype("timedelta64[ms]").astype(np.int64)) / 3.6e6


def _run(srcs, profile, h_from, h_to, **kw):
    args = dict(depart_from_utc=_dep(h_from), depart_to_utc=_dep(h_to), step_h=1.0, sea_states=list(srcs),
                profile=profile, speeds_kn=[SPEED_KN], max_class=MAX_CLASS, spacing_nm=1.0)
    args.update(kw)
    return sweep.sweep_departures(ROUTE_LON, ROUTE_LAT, **args)


def _sea_msi(profile, sea):
    r = assess_motions(profile, hs_m=[sea[0]], tp_s=[sea[1]], wave_from_deg=90.0, course_deg=90.0,
                       speed_m_s=SPEED_KN * KNOT_M_S, method="exact")
    return float(r.msi_pct[0]), int(r.comfort_class[0]), int(r.flags[0])


# MSI tolerance derived by hand from the table path's 1 % on accelerations (tables.py docstring):
# MSI = 100 Phi(z), z = (log10(a/g) - mu)/0.4 (O'Hanlon & McCauley 1974), so da/a = 1 % moves z by
# 0.01 / (0.4 ln 10) = 0.011 and MSI by at most 100 * phi(0) * 0.011 = 0.43 percentage points.
MSI_TOL_PCT = 100.0 * (1.0 / math.sqrt(2.0 * math.pi)) * 0.01 / (0.4 * math.log(10.0)) + 0.02


def test_scenario_preconditions(profile):
    """The calm sea is acceptable (class <= MAX_CLASS, no guidance flag), the storm is not."""
    from seaway_comfort.processing.core.flags import SAFETY_FLAGS

    _, c_calm, f_calm = _sea_msi(profile, CALM)
    _, c_storm, _ = _sea_msi(profile, STORM)
    assert c_calm <= MAX_CLASS < c_storm
    assert f_calm & int(SAFETY_FLAGS) == 0


def test_storm_is_avoided_hours_above_by_hand(sources, profile):
    res = _run(sources[:1], profile, 3.0, 20.0, criterion="hours_above")
    msi_calm, _, _ = _sea_msi(profile, CALM)
    msi_storm, _, _ = _sea_msi(profile, STORM)
    seen_meet = seen_clear = 0
    for row in res.rows_of("model A"):
        d = _hours(row.depart_utc)
        m = _meets(d, STORM_A_H)
        if m is True:
            seen_meet += 1
            assert row.hours_above > 0 and not row.within_limits, d
            # the worst sample sits in the full storm: MSI of the storm sea (exact path)
            assert row.worst_msi_pct == pytest.approx(msi_storm, abs=MSI_TOL_PCT), d
            # ... and inside the storm's longitudes: 1 deg on the equator = 2 pi a / 360 / 1852
            # = 60.11 NM (WGS84 a = 6378137 m), +-1 NM for the sample spacing
            assert STORM_LON[0] * 60.11 - 1.0 <= row.worst_msi_dist_nm <= STORM_LON[1] * 60.11 + 1.0
        elif m is False:
            seen_clear += 1
            assert row.hours_above == 0.0 and row.within_limits, d
            assert row.worst_msi_pct == pytest.approx(msi_calm, abs=MSI_TOL_PCT), d
    assert seen_meet >= 4 and seen_clear >= 8
    # the pick avoids the storm (best value 0 h above; ties go to the earliest departure)
    rec = res.recommendation
    assert _meets(_hours(rec.depart_utc), STORM_A_H) is False
    assert rec.within_limits and rec.criterion_value == 0.0
    assert _hours(rec.depart_utc) == 3.0


def _expected_earliest(h_from, h_to, storms):
    """By hand: the first departure on the grid that clears every storm (none may be unclear)."""
    for d in np.arange(h_from, h_to + 1e-9, 1.0):
        verdicts = [_meets(float(d), s) for s in storms]
        assert None not in verdicts, f"departure {d} h is too close to a storm edge for this test"
        if not any(verdicts):
            return float(d)
    return None


@pytest.mark.parametrize("h_from, expected_h", [(3.0, 3.0), (6.0, 11.0)])
def test_earliest_ok_picks_the_window_before_or_after(sources, profile, h_from, expected_h):
    assert _expected_earliest(h_from, 20.0, [STORM_A_H]) == expected_h  # the hand rule itself
    res = _run(sources[:1], profile, h_from, 20.0, criterion="earliest_ok")
    rec = res.recommendation
    assert _hours(rec.depart_utc) == expected_h
    assert rec.within_limits
    assert rec.criterion_value == pytest.approx(expected_h - h_from)
    assert "within limits" in rec.reason
    # the windows of acceptable departures: before the storm (3..5 h) and after it (11..20 h)
    wins = [(_hours(a), _hours(b)) for a, b in rec.windows_utc]
    assert wins == ([(3.0, 5.0), (11.0, 20.0)] if h_from == 3.0 else [(11.0, 20.0)])


def test_two_sources_disagree_spread_and_robust_pick(sources, profile):
    res = _run(sources, profile, 6.0, 22.0, criterion="earliest_ok")
    first = {src: min(res.rows_of(src), key=lambda r: r.rank) for src in ("model A", "model B")}
    # by hand: A clears its storm from 11 h, B (storm 3 h later) is still clear at 6 h
    assert _hours(first["model A"].depart_utc) == _expected_earliest(6.0, 22.0, [STORM_A_H]) == 11.0
    assert _hours(first["model B"].depart_utc) == _expected_earliest(6.0, 22.0, [STORM_B_H]) == 6.0
    # robust: the first departure clear of both storms
    assert _hours(res.recommendation.depart_utc) == _expected_earliest(6.0, 22.0, [STORM_A_H, STORM_B_H]) == 14.0
    assert res.recommendation.within_limits


def test_spread_between_sources(sources, profile):
    res = _run(sources, profile, 6.0, 22.0, criterion="worst_msi")
    msi_calm, _, _ = _sea_msi(profile, CALM)
    msi_storm, _, _ = _sea_msi(profile, STORM)
    checked = 0
    for row in res.robust_rows():
        d = _hours(row.depart_utc)
        ma, mb = _meets(d, STORM_A_H), _meets(d, STORM_B_H)
        if ma is False and mb is False:
            # the same calm sea in both sources: no spread at all
            assert row.msi_spread == 0.0 and row.crit_spread == 0.0, d
            checked += 1
        elif {ma, mb} == {True, False}:
            # one source meets the storm, the other not: worst case = storm, spread = storm - calm
            assert row.worst_msi_pct == pytest.approx(msi_storm, abs=MSI_TOL_PCT), d
            assert row.msi_spread == pytest.approx(msi_storm - msi_calm, abs=2 * MSI_TOL_PCT), d
            assert not row.within_limits
            checked += 1
    assert checked >= 10
    # robust pick: lowest worst case, ties to the earliest -> first departure clear of both storms
    assert _hours(res.recommendation.depart_utc) == 14.0
    # a source row never carries a spread
    assert all(math.isnan(r.msi_spread) for r in res.rows if not r.is_robust)


def test_departures_beyond_the_horizon_are_marked(sources, profile):
    res = _run(sources[:1], profile, 20.0, 26.0, criterion="dose")
    duration = _hours_to(1.2)  # geographiclib distance / speed
    tol_h = 0.5  # the sampler's default time tolerance, 1800 s
    for row in res.rows_of("model A"):
        d = _hours(row.depart_utc)
        expected = d + duration <= HORIZON_H + tol_h
        assert row.in_forecast == expected, d
        assert bool(row.flags & int(SampleFlag.OUTSIDE_TIME)) == (not expected), d
        assert row.arrive_utc == row.depart_utc + np.timedelta64(int(round(duration * 3.6e6)), "ms")
        if not expected:
            assert row.n_missing > 0 and not row.within_limits
    # incomplete passages rank after every complete one
    ranks = {bool(r.in_forecast): [] for r in res.rows_of("model A")}
    for r in res.rows_of("model A"):
        ranks[bool(r.in_forecast)].append(r.rank)
    assert max(ranks[True]) < min(ranks[False])


@pytest.mark.parametrize("h", [3.0, 7.0, 12.0])
def test_per_departure_figures_agree_with_compute_passage(sources, profile, h):
    res = _run(sources[:1], profile, 3.0, 12.0, criterion="worst_msi")
    row = next(r for r in res.rows_of("model A") if _hours(r.depart_utc) == h)
    kw = dict(departure_utc=_dep(h), speed_kn=SPEED_KN, sea_states=[sources[0]], profile=profile, spacing_nm=1.0)
    same = compute_passage(ROUTE_LON, ROUTE_LAT, method="table", **kw).summary()
    # the same inputs through the per-departure path on the table method: the same numbers
    assert row.worst_msi_pct == pytest.approx(same.max_msi_pct, rel=1e-9)
    assert row.msdv_arrival == pytest.approx(same.final_msdv, rel=1e-9)
    assert row.sick_pct_arrival == pytest.approx(same.final_vomit_pct, rel=1e-9)
    labels = ("smooth", "steady", "lively", "taxing", "punishing")
    for c, lab in enumerate(labels):
        assert row.hours_class[c] == pytest.approx(same.hours_per_class[lab], abs=1e-9), lab
    assert row.duration_h == pytest.approx(same.duration_h, rel=1e-12)
    # ISO 2631-1 Annex D: share who may vomit = MSDV / 3
    assert row.sick_pct_arrival == pytest.approx(row.msdv_arrival / 3.0, rel=1e-12)
    # the default per-departure path (exact spectral integration below 2000 samples) within the
    # table-path tolerance: 1 % on accelerations, so 1 % on the dose (MSDV is linear in a_w)
    exact = compute_passage(ROUTE_LON, ROUTE_LAT, **kw).summary()
    assert exact.n_computed == exact.n_samples
    assert row.worst_msi_pct == pytest.approx(exact.max_msi_pct, abs=MSI_TOL_PCT)
    assert row.msdv_arrival == pytest.approx(exact.final_msdv, rel=0.01)


def test_departure_grid_by_hand():
    deps = sweep.departure_times("2030-06-01T00:00Z", "2030-06-01T02:00Z", 0.5)
    assert [str(t)[11:16] for t in deps] == ["00:00", "00:30", "01:00", "01:30", "02:00"]
    assert sweep.departure_times("2030-06-01T00:00", "2030-06-01T00:00", 3.0).size == 1
    # the end need not be on the grid: 0, 3, 6 h in a 7 h window
    assert sweep.departure_times("2030-06-01T00:00", "2030-06-01T07:00", 3.0).size == 3


@pytest.mark.parametrize("t_from, t_to, step, match", [
    ("2030-06-02T00:00", "2030-06-01T00:00", 1.0, "depart_to_utc .* before depart_from_utc"),
    ("2030-06-01T00:00", "2030-06-02T00:00", 0.0, "step_h must be a number of hours > 0, got 0.0"),
    ("2030-06-01T00:00", "2030-06-02T00:00", -2.0, "step_h .* got -2.0"),
    ("2030-06-01T00:00", "2030-06-02T00:00", float("nan"), "step_h .* got nan"),
    ("2030-06-01T00:00", "2031-06-01T00:00", 0.5, "17521 departures, more than the limit of 10000"),
    ("tomorrow", "2031-06-01T00:00", 1.0, "depart_from_utc must be a UTC date-time.*'tomorrow'"),
])
def test_bad_departure_window(t_from, t_to, step, match):
    with pytest.raises(SeawayInputError, match=match):
        sweep.departure_times(t_from, t_to, step)


def test_speeds_text():
    assert sweep.parse_speeds_kn("", 9.0) == (9.0,)
    assert sweep.parse_speeds_kn(" 8, 10.5 ,8", 9.0) == (8.0, 10.5)
    with pytest.raises(SeawayInputError, match="'fast' in '8, fast' is not a number"):
        sweep.parse_speeds_kn("8, fast", 9.0)
    with pytest.raises(SeawayInputError, match="every speed must be > 0 kn, got -3.0"):
        sweep.parse_speeds_kn("-3", 9.0)
    with pytest.raises(SeawayInputError, match="holds no speed"):
        sweep.parse_speeds_kn(" , ", 9.0)


def test_bad_sweep_inputs(sources, profile, tmp_path):
    with pytest.raises(SeawayInputError, match="criterion must be one of .* got 'best'"):
        _run(sources[:1], profile, 3.0, 4.0, criterion="best")
    with pytest.raises(SeawayInputError, match="max_class must be a whole number 0..4.* got 5"):
        _run(sources[:1], profile, 3.0, 4.0, max_class=5)
    with pytest.raises(SeawayInputError, match=r"speeds_kn must all be > 0 kn, got \[0.0\]"):
        _run(sources[:1], profile, 3.0, 4.0, speeds_kn=[0.0])
    with pytest.raises(SeawayInputError, match="no departure .* lies inside the time range"):
        _run(sources[:1], profile, 40.0, 44.0)
    # a forecast for another week does not overlap: no comparison possible
    later = tmp_path / "later.nc"
    times = T0 + np.timedelta64(7, "D") + np.arange(5) * np.timedelta64(3, "h")
    shape = (times.size, LAT.size, LON.size)
    write_cf_netcdf(str(later), LON, LAT, times, {HS: np.ones(shape), TP: np.full(shape, 6.0), DIR: np.zeros(shape)})
    with open_sea_state(str(later), source_name="next week") as src:
        with pytest.raises(SeawayInputError, match="do not overlap in time .*model A.*next week"):
            _run([sources[0], src], profile, 3.0, 4.0)


def test_progress_and_cancel(sources, profile):
    seen = []

    def progress(f):
        seen.append(f)
        return True

    res = _run(sources, profile, 3.0, 6.0, progress=progress)
    assert seen[0] == 0.0 and seen[-1] == pytest.approx(1.0)
    assert all(b >= a - 1e-12 for a, b in zip(seen, seen[1:]))
    assert res.caution == CAUTION

    calls = []

    def stop_soon(f):
        calls.append(f)
        return len(calls) < 3

    with pytest.raises(PassageCancelled):
        _run(sources, profile, 3.0, 6.0, progress=stop_soon)
    assert len(calls) == 3


def test_rows_and_speeds(sources, profile):
    """Two speeds: one row per departure x speed x source plus a robust row per departure x speed;
    the faster passage is shorter in proportion (duration = distance / speed, geographiclib)."""
    res = _run(sources, profile, 3.0, 5.0, speeds_kn=[8.0, 12.0], criterion="dose")
    assert len(res.rows) == 3 * 2 * (2 + 1)
    for v in (8.0, 12.0):
        rows = [r for r in res.rows if r.speed_kn == v]
        assert {r.source for r in rows} == {"model A", "model B", sweep.ROBUST_SOURCE}
        # arrival times are kept to the millisecond (passage.plan_passage): 1 ms = 2.8e-7 h
        assert rows[0].duration_h == pytest.approx(_hours_to(1.2) * SPEED_KN / v, abs=1e-6)
    robust_ranks = sorted(r.rank for r in res.robust_rows())
    assert robust_ranks == list(range(1, 7))
    # robust dose = the larger of the two sources (worst case)
    for r in res.robust_rows():
        pair = [x.msdv_arrival for x in res.rows if x.speed_kn == r.speed_kn and x.depart_utc == r.depart_utc
                and not x.is_robust]
        assert r.msdv_arrival == max(pair)


def test_chosen_station_not_the_first(sources, profile):
    """A station other than the profile's first: the worst MSI of a departure that meets the
    storm equals the exact spectral path at THAT station (api.assess_motions method="exact",
    station given) within the table tolerance, and differs from the first station's value.
    (This caught the table path assessing the first station; fixed in api.py since.)"""
    other = profile.stations[-1].name
    assert other != profile.stations[0].name
    res = _run(sources[:1], profile, 7.0, 7.0, station=other, criterion="worst_msi")
    row = res.rows_of("model A")[0]
    assert _meets(7.0, STORM_A_H) is True
    kw = dict(hs_m=[STORM[0]], tp_s=[STORM[1]], wave_from_deg=90.0, course_deg=90.0,
              speed_m_s=SPEED_KN * KNOT_M_S, method="exact")
    at_other = float(assess_motions(profile, station=other, **kw).msi_pct[0])
    at_first = float(assess_motions(profile, **kw).msi_pct[0])
    assert res.station_name == other
    assert row.worst_msi_pct == pytest.approx(at_other, abs=MSI_TOL_PCT)
    assert abs(at_other - at_first) > 2 * MSI_TOL_PCT  # the check can tell the stations apart


def test_chunks_give_the_same_rows(sources, profile, monkeypatch):
    """Cutting the stacked samples into several calls (memory bound) changes no figure."""
    whole = _run(sources, profile, 3.0, 12.0, criterion="dose")
    monkeypatch.setattr(sweep, "MAX_SAMPLES_PER_CALL", 3 * whole.dist_nm.size)  # 3 departures per call
    cut = _run(sources, profile, 3.0, 12.0, criterion="dose")
    for a, b in zip(whole.rows, cut.rows):
        assert a == b or all(
            (x == y) or (isinstance(x, float) and math.isnan(x) and math.isnan(y))
            for x, y in zip(a.__dict__.values(), b.__dict__.values())), (a, b)


def test_route_outside_every_grid_is_an_error(sources, profile):
    with pytest.raises(SeawayInputError, match="outside the grid"):
        sweep.sweep_departures([10.0, 11.0], [0.0, 0.0], depart_from_utc=_dep(3.0), depart_to_utc=_dep(4.0),
                               step_h=1.0, sea_states=[sources[0]], profile=profile, speeds_kn=[SPEED_KN])


def test_partly_overlapping_sources_mark_the_robust_rows(sources, profile, tmp_path):
    """A second source that ends at 20 h: its rows and the robust rows of passages arriving after
    20.5 h (end + the sampler's 0.5 h tolerance) are marked, model A's own rows are not."""
    short = open_sea_state(_write(str(tmp_path / "short.nc"), STORM_A_H, horizon_h=20.0), source_name="short")
    try:
        res = _run([sources[0], short], profile, 11.0, 16.0, criterion="worst_msi")
    finally:
        short.close()
    duration = _hours_to(1.2)
    for r in res.rows:
        d = _hours(r.depart_utc)
        horizon = HORIZON_H if r.source == "model A" else 20.0
        assert r.in_forecast == (d + duration <= horizon + 0.5), (r.source, d)
    robust_in = [r.in_forecast for r in res.robust_rows()]
    assert robust_in == [d + duration <= 20.5 for d in np.arange(11.0, 16.5, 1.0)]
    assert res.recommendation.in_forecast
