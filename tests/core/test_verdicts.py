# SPDX-License-Identifier: GPL-2.0-or-later
"""Verdicts the master can act on: class reasons, hard limits vs advisories, sickness exposure,
implausible seas left unclassed, a calm sweep that says go.

What each check is compared with (named beside it):
* NORDFORSK (1987) RMS limits per task as tabulated in comfort/criteria.py (from memory there):
  light manual work 0.20 g vertical, 0.10 g lateral, 6.0 deg roll; transit passengers 0.05 g;
* the class bounds of comfort/indices.py (our own design choice, shown to the user): MSI 2, 5,
  10, 20 %; 50, 75, 100, 150 % of a limit;
* ISO 2631-1:1997 Annex D: share who may vomit = MSDV / 3 [%], accumulated from departure;
* IMO MSC.1/Circ.1228: only danger-graded guidance is a hard limit (our reading of 4.2,
  guidance.py docstring); criteria exceeded are hard limits (issue brief, common practice).
"""
from __future__ import annotations

import re

import numpy as np
import pytest

from seaway_comfort.processing.core.comfort.indices import comfort_class, vomiting_share_pct
from seaway_comfort.processing.core.comfort.criteria import evaluate_criteria
from seaway_comfort.processing.core.comfort.verdict import DRIVERS, class_drivers, class_reason
from seaway_comfort.processing.core.demo.writers import write_cf_netcdf
from seaway_comfort.processing.core.flags import SampleFlag
from seaway_comfort.processing.core.passage.pipeline import compute_passage
from seaway_comfort.processing.core.seastate import open_sea_state
from seaway_comfort.processing.core.sweep import engine as sweep
from seaway_comfort.processing.core.vessel.profile import resolve_vessel

G = 9.80665
HS = "sea_surface_wave_significant_height"
TP = "sea_surface_wave_period_at_variance_spectral_density_maximum"
DIR = "sea_surface_wave_from_direction"
T0 = np.datetime64("2030-06-01T00:00", "ms")  # invented scenario
LIGHT = "light_manual_work"


# ------------------------------------------------------------------ reasons, by hand
@pytest.mark.parametrize("msi, vacc_g, lacc_g, roll, expected", [
    (12.3, 0.05, 0.01, 0.5, "MSI 12.3 % >= 10 %"),
    (1.0, 0.05, 0.11, 0.5, "lateral acc. 0.11 g > 0.10 g (light manual work)"),
    (1.0, 0.05, 0.01, 4.6, "roll 4.6 deg >= 75 % of 6.0 deg (light manual work)"),  # 4.6/6 = 0.767
    (3.0, 0.05, 0.01, 0.5, "MSI 3.0 % >= 2 %"),
    (0.4, 0.05, 0.01, 0.8, "MSI 0.4 % < 2 %; vertical acc. 0.050 g < 50 % of 0.20 g (light manual work)"),
    (25.0, 0.31, 0.01, 0.5, "vertical acc. 0.31 g > 0.20 g (light manual work)"),  # both 'punishing': the limit
])
def test_class_reason_by_hand(msi, vacc_g, lacc_g, roll, expected):
    d = int(class_drivers(LIGHT, [msi], [vacc_g * G], [lacc_g * G], [roll])[0])
    assert class_reason(LIGHT, d, msi, vacc_g * G, lacc_g * G, roll) == expected


def test_driver_scale_reaches_the_class():
    """The driver's own scale gives exactly the class (comfort_class: worse of both scales)."""
    rng = np.random.default_rng(7)
    n = 400
    msi = rng.uniform(0, 30, n)
    vacc, lacc, roll = rng.uniform(0, 0.35 * G, n), rng.uniform(0, 0.18 * G, n), rng.uniform(0, 10, n)
    crit = evaluate_criteria(LIGHT, vacc, lacc, roll)
    cls = comfort_class(msi, crit.usage)
    d = class_drivers(LIGHT, msi, vacc, lacc, roll)
    limits = {1: (vacc, 0.20 * G), 2: (lacc, 0.10 * G), 3: (roll, 6.0)}
    for i in range(n):
        own = comfort_class(msi[i], 0.0) if d[i] == 0 else comfort_class(0.0, limits[int(d[i])][0][i] / limits[int(d[i])][1])
        assert int(own) == int(cls[i])


# ------------------------------------------------------------------ passages
def _write(path, hs, tp, wdir, hours=24, lon=(-2.0, 2.01), lat=(-2.0, 2.01)):
    """A sea uniform in space; ``hs``/``tp`` scalars or callables of the hour (3-hourly steps)."""
    times = T0 + np.arange(hours // 3 + 1) * np.timedelta64(3, "h")
    lo, la = np.arange(*lon, 0.25), np.arange(*lat, 0.25)
    th = np.arange(times.size) * 3.0

    def field(v):
        vals = np.array([v(h) if callable(v) else v for h in th], dtype=float)
        return np.broadcast_to(vals[:, None, None], (times.size, la.size, lo.size)).copy()

    write_cf_netcdf(path, lo, la, times, {HS: field(hs), TP: field(tp), DIR: field(wdir)})
    return path


@pytest.fixture(scope="module")
def survey():
    return resolve_vessel("coastal_survey_35m")


def _passage(path, profile, **kw):
    src = open_sea_state(path)
    try:
        return compute_passage([0.0, 0.0], [0.0, 0.5], departure_utc=T0, speed_kn=10.0, sea_states=[src],
                               profile=profile, spacing_nm=3.0, **kw)
    finally:
        src.close()


def test_every_classed_sample_has_a_reason(tmp_path, survey):
    r = _passage(_write(str(tmp_path / "s.nc"), 2.5, 8.0, 90.0), survey, station="mess")
    assert r.computed.all()
    pat = re.compile(r"^(MSI \d+\.\d % (>=|<) \d+ %|(vertical acc\.|lateral acc\.|roll) [\d.]+ (g|deg) (>|>=|<) )")
    for c, why in zip(r.comfort_class, r.class_reason):
        assert c >= 0 and pat.match(why), why
    s = r.summary()
    assert s.worst_reason == r.class_reason[s.worst_index] and s.worst_reason
    # transit passengers (the mess) have a 0.05 g vertical limit: class taxing or worse must name it
    worst = r.class_reason[s.worst_index]
    if r.comfort_class[s.worst_index] >= 3:
        assert "(transit passengers)" in worst or worst.startswith("MSI")


def test_sick_share_accumulates_from_departure(tmp_path, survey):
    r = _passage(_write(str(tmp_path / "s.nc"), 2.0, 8.0, 0.0), survey)
    # ISO 2631-1:1997 Annex D: Km = 1/3 times the dose accumulated since departure
    np.testing.assert_allclose(r.sick_pct_passage, vomiting_share_pct(r.msdv_cum))
    assert r.vomit_pct is r.sick_pct_passage  # the old name is an alias for one release
    s = r.summary()
    hours = (r.eta_utc[-1] - r.eta_utc[0]).astype("timedelta64[ms]").astype(float) / 3.6e6
    assert s.exposure_h == pytest.approx(hours)  # 30 NM at 10 kn: 3 h (geodesic, about)
    assert 2.9 < s.exposure_h < 3.1


@pytest.mark.parametrize("hs, tp, what", [
    (2.0, 8000.0, "Tp in ms labelled s"),
    (250.0, 8.0, "Hs in cm labelled m"),
])
def test_implausible_sea_is_never_classed(tmp_path, survey, hs, tp, what):
    r = _passage(_write(str(tmp_path / "odd.nc"), hs, tp, 0.0), survey)
    odd = (r.flags & int(SampleFlag.IMPLAUSIBLE_VALUE)) != 0
    assert odd.all(), what
    assert (r.comfort_class == -1).all() and all(lab == "" for lab in r.comfort_label)
    assert np.isnan(r.msi_pct).all() and np.isnan(r.vacc_rms_m_s2).all() and np.isnan(r.sick_pct_passage).all()
    assert all(why == "" for why in r.class_reason)
    assert r.summary().worst_index is None


# ------------------------------------------------------------------ sweep verdicts
def _sweep(path, profile, **kw):
    src = open_sea_state(path)
    try:
        return sweep.sweep_departures([0.0, 0.0], [0.0, 0.2], depart_from_utc=T0,
                                      depart_to_utc=T0 + np.timedelta64(18, "h"), step_h=2.0, sea_states=[src],
                                      profile=profile, speeds_kn=[10.0], **kw)
    finally:
        src.close()


def test_calm_sweep_says_go(tmp_path):
    """Hs 0.3 m for a 68 m ship (far below the 0.02 L = 1.36 m of any guidance flag)."""
    res = _sweep(_write(str(tmp_path / "calm.nc"), 0.3, 5.0, 90.0), resolve_vessel("ocean_research_70m"))
    rec = res.recommendation
    assert rec.within_limits and res.within_limits.all()
    assert rec.reason.startswith("Go.")
    assert "Best window: 2030-06-01 00:00 UTC to 2030-06-01 18:00 UTC" in rec.reason
    assert "ruled out" not in rec.reason


def test_sweep_recommends_within_limits_and_names_the_ruling_limit(tmp_path, survey):
    """Rough (Hs 4 m) until 9 h, then calm (0.5 m): the early departures break the transit
    passengers' criteria in the mess; the recommendation is within limits and the reason says
    which limit rules out the others."""
    path = _write(str(tmp_path / "front.nc"), lambda h: 4.0 if h <= 9.0 else 0.5, 8.0, 0.0)
    res = _sweep(path, survey, station="mess", criterion="worst_msi")
    rec = res.recommendation
    assert rec.within_limits and rec.reason.startswith("Go.")
    rows = res.robust_rows()
    bad = [r for r in rows if not r.within_limits]
    assert bad and all(sweep.limit_reason(r, res.max_class) for r in bad)
    assert "ruled out" in rec.reason
    assert any(sweep.limit_reason(bad[0], res.max_class) in rec.reason for _ in (0,))
    assert rec.depart_utc >= T0 + np.timedelta64(10, "h")


def _fig(flags):
    n = len(flags)
    return dict(msdv_arrival=np.ones((1, 1, n)), hours_class=np.zeros((1, 1, n, 5)),
                flags=np.array(flags, dtype=np.int64).reshape(1, 1, n), n_missing=np.zeros((1, 1, n), dtype=np.int64),
                comfort_class=np.zeros((1, 1, n, 3), dtype=np.int8), worst_msi_pct=np.ones((1, 1, n)),
                prob_taxing_pct=np.zeros((1, 1, n)))


def test_advisories_do_not_veto_danger_and_criteria_do():
    flags = [0, int(SampleFlag.SYNC_ROLL | SampleFlag.HIGH_WAVE_GROUPS | SampleFlag.SURF_RIDING),
             int(SampleFlag.SYNC_ROLL | SampleFlag.SYNC_ROLL_DANGER),
             int(SampleFlag.SURF_RIDING | SampleFlag.SURF_RIDING_DANGER), int(SampleFlag.CRITERIA_EXCEEDED)]
    out = sweep._judge(_fig(flags), "worst_msi", 2, np.ones((1, 1, len(flags)), dtype=bool), np.zeros(len(flags)))
    np.testing.assert_array_equal(out["within_limits"][0, 0], [True, True, False, False, False])


def test_drivers_are_named():
    assert DRIVERS == ("MSI", "vertical acc.", "lateral acc.", "roll")
