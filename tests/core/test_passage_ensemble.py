# SPDX-License-Identifier: GPL-2.0-or-later
"""Ensemble passage: reductions against single-member runs, probabilities against hand counts.

References outside the project: the per-member figures come from the ordinary passage pipeline
run on one member at a time (the path a single-member forecast takes); percentiles from
``numpy.percentile`` (linear definition, Hyndman & Fan 1996 definition 7); probabilities from
plain Python counts of those single runs. Files are written by GDAL; sea values are invented.
"""
from __future__ import annotations

import numpy as np
import pytest

from seaway_comfort.processing.core.demo.writers import write_cf_netcdf
from seaway_comfort.processing.core.flags import SampleFlag
from seaway_comfort.processing.core.passage import pipeline as passage
from seaway_comfort.processing.core.passage.ensemble import compute_ensemble_passage, median_member_index
from seaway_comfort.processing.core.seastate import open_sea_state
from seaway_comfort.processing.core.vessel.profile import resolve_vessel

HS = "sea_surface_wave_significant_height"
TP = "sea_surface_wave_period_at_variance_spectral_density_maximum"
DIR = "sea_surface_wave_from_direction"
T0 = np.datetime64("2031-05-04T00:00", "s")
TIMES = T0 + np.arange(5) * np.timedelta64(6, "h")
LON = np.arange(-2.0, 4.01, 0.5)
LAT = np.arange(49.0, 53.01, 0.5)
M = 9
ROUTE = ([-1.0, 3.0], [50.0, 52.0])


def _member(m: int) -> dict:
    """Invented member m: Hs from 0.6 to 6.2 m across members, rising eastward; Tp 6..9 s."""
    t, y, x = np.meshgrid(np.arange(TIMES.size), LAT, LON, indexing="ij")
    hs = 0.6 + 0.7 * m * (1.0 + 0.08 * (x + 2.0)) / 1.5 + 0.05 * t
    return {HS: hs, TP: 6.0 + 0.35 * m + 0 * x, DIR: 200.0 + 8.0 * m + 2.0 * x}


@pytest.fixture(scope="module")
def ens(tmp_path_factory):
    path = str(tmp_path_factory.mktemp("ensp") / "ens.nc")
    fields = {k: np.stack([_member(m)[k] for m in range(M)]) for k in (HS, TP, DIR)}
    write_cf_netcdf(path, LON, LAT, TIMES, fields, members=range(M))
    src = open_sea_state(path)
    yield src
    src.close()


@pytest.fixture(scope="module")
def profile():
    return resolve_vessel("coastal_survey_35m")


@pytest.fixture(scope="module")
def runs(ens, profile):
    kw = dict(departure_utc=T0, speed_kn=10.0, profile=profile, spacing_nm=4.0)
    e = compute_ensemble_passage(*ROUTE, sea_states=[ens], **kw)
    singles = [passage.compute_passage(*ROUTE, sea_states=[ens.member_source(m)], **kw) for m in ens.members]
    return e, singles


def test_members_match_single_member_runs(runs):
    e, singles = runs
    msi = np.stack([s.msi_pct for s in singles])
    np.testing.assert_array_equal(e.member_msi_pct, msi)
    np.testing.assert_array_equal(e.member_class, np.stack([s.comfort_class for s in singles]))
    assert np.all(e.members == M)


def test_msi_percentiles_against_numpy(runs):
    e, singles = runs
    msi = np.stack([s.msi_pct for s in singles])
    for got, q in ((e.msi_p10_pct, 10), (e.msi_p50_pct, 50), (e.msi_p90_pct, 90)):
        np.testing.assert_allclose(got, np.percentile(msi, q, axis=0), rtol=1e-12)


def test_probabilities_against_hand_counts(runs):
    e, singles = runs
    classes = [set(s.comfort_class.tolist()) for s in singles]
    assert len(set().union(*classes) & {0, 1, 2}) and len(set().union(*classes) & {3, 4})  # the data spans classes
    for i in range(e.result.n):
        taxing = sum(1 for s in singles if s.comfort_class[i] >= 3)
        crit = sum(1 for s in singles if s.flags[i] & int(SampleFlag.CRITERIA_EXCEEDED))
        assert e.prob_taxing_pct[i] == pytest.approx(100.0 * taxing / M)
        assert e.prob_criteria_pct[i] == pytest.approx(100.0 * crit / M)
    worst = [int(s.comfort_class.max()) for s in singles]
    probs = e.class_probability_pct()
    for c in range(5):
        assert probs[c] == pytest.approx(100.0 * worst.count(c) / M)
    assert probs.sum() == pytest.approx(100.0)


def test_ordinary_fields_hold_the_median_member_per_quantity(runs):
    e, singles = runs
    r = e.result
    for q in ("hs_m", "tp_s", "msi_pct", "vacc_rms_m_s2", "msdv_cum", "roll_rms_deg"):
        vals = np.stack([getattr(s, q) for s in singles])
        # M = 9 members: the median member is the 5th smallest, i.e. numpy's median exactly
        np.testing.assert_array_equal(getattr(r, q), np.median(vals, axis=0))
    cls = np.stack([s.comfort_class for s in singles])
    np.testing.assert_array_equal(r.comfort_class, np.sort(cls, axis=0)[(M - 1) // 2])
    hs = np.stack([s.hs_m for s in singles])
    at = np.argsort(hs, axis=0, kind="stable")[(M - 1) // 2]
    np.testing.assert_array_equal(r.wave_from_deg, np.stack([s.wave_from_deg for s in singles])[at, np.arange(r.n)])


def test_median_member_even_count_takes_lower_middle_and_skips_missing():
    v = np.array([[4.0, 1.0], [1.0, np.nan], [3.0, 7.0], [2.0, 5.0]])
    ok = np.isfinite(v)
    idx = median_member_index(v, ok)
    assert v[idx[0], 0] == 2.0  # 1,2,3,4 -> lower middle 2
    assert v[idx[1], 1] == 5.0  # 1,5,7 -> 5
    assert median_member_index(v, np.zeros_like(ok)).tolist() == [-1, -1]


def test_sweep_lowest_prob_taxing_against_single_member_sweeps(ens, profile):
    from seaway_comfort.processing.core.sweep.engine import sweep_departures

    kw = dict(depart_from_utc=T0, depart_to_utc=T0 + np.timedelta64(6, "h"), step_h=3.0, profile=profile,
              speeds_kn=[10.0], spacing_nm=4.0, criterion="lowest_prob_taxing")
    e = sweep_departures(*ROUTE, sea_states=[ens], **kw)
    singles = [sweep_departures(*ROUTE, sea_states=[ens.member_source(m)], **kw) for m in ens.members]
    # hand count: members whose passage reaches class >= 3 anywhere
    hit = np.array([[np.any(s.comfort_class[0, 0, d] >= 3) for d in range(3)] for s in singles])
    assert 0 < hit.sum() < hit.size  # the data gives probabilities strictly between 0 and 100
    np.testing.assert_allclose(e.prob_taxing_pct[0, 0], 100.0 * hit.mean(axis=0))
    np.testing.assert_allclose(e.criterion_value[0, 0], e.prob_taxing_pct[0, 0])
    worst = np.stack([s.worst_msi_pct[0, 0] for s in singles])
    np.testing.assert_array_equal(e.worst_msi_pct[0, 0], np.median(worst, axis=0))  # 9 members: the median member
    rows = e.rows_of(e.source_names[0])
    first = min(rows, key=lambda r: r.rank)
    best = min(rows, key=lambda r: (not (r.in_forecast and r.n_missing == 0), r.criterion_value, r.worst_msi_pct))
    assert first.depart_utc == best.depart_utc


def test_report_section_shows_band_and_class_probabilities(runs):
    from seaway_comfort.processing.core.reports.ensemble import ensemble_section

    e, _ = runs
    html = ensemble_section([e], ["<leg A>"])
    assert f"Ensemble: {M} members" in html and "&lt;leg A&gt;" in html
    probs = e.class_probability_pct()
    row = html.split("&lt;leg A&gt;</td>")[1].split("</tr>")[0]
    cells = [c.replace("<td>", "").strip() for c in row.split("</td>") if c.strip()]
    assert [float(c) for c in cells[:6]] == pytest.approx(np.round(probs), abs=0.5)
