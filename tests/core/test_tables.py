# SPDX-License-Identifier: GPL-2.0-or-later
"""Response tables (fast path) against the exact spectral path.

Sources are named beside each check; "from memory" marks a source not re-read, "by hand" a
derivation written beside the check, "common practice, no source" a fact of the trade."""
from __future__ import annotations

import numpy as np
import pytest

from seaway_comfort.processing.core.waves.encounter import relative_heading_deg
from seaway_comfort.processing.core.motions.response import motion_response
from seaway_comfort.processing.core.motions.tables import (
    build_response_table,
    build_response_table_set,
)
from seaway_comfort.processing.core.motions.closed_form import ClosedFormTransfer
from seaway_comfort.processing.core.validation import SeawayInputError
from seaway_comfort.processing.core.vessel.profile import Station, builtin_profile

FIELDS = ("heave_rms_m", "pitch_rms_deg", "roll_rms_deg", "heave_tz_s", "pitch_tz_s", "roll_tz_s",
          "vacc_rms_m_s2", "lacc_rms_m_s2", "vacc_wf_rms_m_s2", "vacc_omega_rad_s")


def _rel_err(a, b):
    """|b - a| relative to the larger of |a| and 1 % of the largest |a| of the set (so that
    nearly vanishing values, e.g. roll in near-head seas, do not dominate)."""
    a = np.asarray(a); b = np.asarray(b)
    return np.max(np.abs(b - a) / (np.abs(a) + 0.01 * np.abs(a).max()))


def _random_sea(n, p, seed):
    rng = np.random.default_rng(seed)
    return (rng.uniform(0.3, 4.0, (n, p)), rng.uniform(3.0, 16.0, (n, p)), rng.uniform(0, 360, (n, p)),
            rng.uniform(0, 360, n))


@pytest.mark.parametrize("name", ["harbour_workboat_12m", "ocean_research_70m"])
def test_table_agrees_with_exact_within_one_percent(name):
    # The brief's acceptance check: table path within 1 % of the exact path on random samples
    # (short-crested, 2 partitions). Linear superposition (PNA vol. III ch. 8) makes the
    # per-unit-Hs^2 table exact apart from the bilinear interpolation.
    p = builtin_profile(name)
    tr = ClosedFormTransfer.from_profile(p)
    tab = build_response_table(tr, p.stations, 3.0)
    hs, tp, wf, co = _random_sea(300, 2, 7)
    ex = motion_response(tr, p.stations, hs_m=hs, tp_s=tp, wave_from_deg=wf, course_deg=co, speed_m_s=3.0)
    tl = tab.lookup(hs, tp, relative_heading_deg(co[:, None], wf))
    assert tl.method == "table" and tl.station_names == ex.station_names
    for f in FIELDS:
        assert _rel_err(getattr(ex, f), getattr(tl, f)) < 0.01, f
    np.testing.assert_array_equal(tl.flags, ex.flags)


@pytest.mark.parametrize("mu, heave, sa0", [(90.0, 0.3862, 0.7248), (135.0, 0.4528, 1.3528)])
def test_table_against_outside_reference(mu, heave, sa0):
    # Outside anchor for the table-vs-exact group: vessel A (L 12, B0 4, T 1, Cb 0.45), long-crested
    # JONSWAP Hs 1.5, Tp 6, gamma 3.3, U 4 m/s, x = 0: heave sigma and vertical acceleration sigma
    # of test_response.py ROWS_K, which its _reference_rows recomputes from DNV-RP-C205 eq. 3.5.5
    # written anew and scipy.integrate.trapezoid. Tolerance 0.5 %: the rows use the A_gamma form
    # (Hm0/Hs = 1.0012 at gamma 3.3), the table scales to Hs exactly, plus interpolation.
    tr = ClosedFormTransfer(12.0, 4.0, 1.0, 0.45, 4.1129, 0.1, kappa="k")
    tab = build_response_table(tr, [Station("mid", 0.0)], 4.0, long_crested=True)
    r = tab.lookup([1.5], [6.0], [mu])
    assert r.heave_rms_m[0] == pytest.approx(heave, rel=5e-3)
    assert r.vacc_rms_m_s2[0, 0] == pytest.approx(sa0, rel=5e-3)


def test_long_crested_heave_and_acceleration_within_three_percent():
    # Documented limit (tables.py docstring): long-crested roll/pitch near special headings can be
    # off by more; heave and vertical acceleration stay within a few percent.
    p = builtin_profile("coastal_survey_35m")
    tr = ClosedFormTransfer.from_profile(p)
    tab = build_response_table(tr, p.stations, 4.0, long_crested=True)
    hs, tp, wf, co = _random_sea(200, 1, 3)
    ex = motion_response(tr, p.stations, hs_m=hs, tp_s=tp, wave_from_deg=wf, course_deg=co, speed_m_s=4.0, long_crested=True)
    tl = tab.lookup(hs, tp, relative_heading_deg(co[:, None], wf))
    for f in ("heave_rms_m", "vacc_rms_m_s2", "vacc_wf_rms_m_s2"):
        assert _rel_err(getattr(ex, f), getattr(tl, f)) < 0.03, f


def test_lookup_is_linear_in_hs_and_flags_tp_off_grid():
    p = builtin_profile("harbour_workboat_12m")
    tr = ClosedFormTransfer.from_profile(p)
    tab = build_response_table(tr, p.stations, 2.0, tp_grid_s=np.geomspace(3.0, 15.0, 30),
                               heading_grid_deg=np.arange(0.0, 181.0, 10.0))
    r = tab.lookup([0.5, 1.0, 2.0, 1.0, 0.0], [7.0, 7.0, 7.0, 20.0, 7.0], [130.0, 130.0, 130.0, 130.0, 130.0])
    np.testing.assert_allclose(r.heave_rms_m[:3] / np.array([0.5, 1.0, 2.0]), r.heave_rms_m[1], rtol=1e-12)
    np.testing.assert_array_equal(r.flags, [0, 0, 0, 512, 0])  # Tp 20 s is outside 3..15 s
    assert r.heave_rms_m[4] == 0.0 and np.isfinite(r.heave_tz_s[4])


def test_speed_set_matches_single_tables_at_nodes():
    p = builtin_profile("harbour_workboat_12m")
    tr = ClosedFormTransfer.from_profile(p)
    kw = dict(tp_grid_s=np.geomspace(3.0, 15.0, 40), heading_grid_deg=np.arange(0.0, 181.0, 5.0))
    ts = build_response_table_set(tr, p.stations, [1.0, 3.0], **kw)
    single = build_response_table(tr, p.stations, 3.0, **kw)
    a = ts.lookup([1.0], [6.0], [150.0], [3.0])
    b = single.lookup([1.0], [6.0], [150.0])
    np.testing.assert_allclose(a.vacc_rms_m_s2, b.vacc_rms_m_s2, rtol=1e-12)
    # speeds outside the set are flagged
    c = ts.lookup([1.0], [6.0], [150.0], [4.0])
    assert c.flags[0] == 512
    with pytest.raises(SeawayInputError, match="strictly increasing"):
        build_response_table_set(tr, p.stations, [3.0, 1.0], **kw)


def test_bad_grids():
    p = builtin_profile("harbour_workboat_12m")
    tr = ClosedFormTransfer.from_profile(p)
    with pytest.raises(SeawayInputError, match="heading_grid_deg must run from 0 to 180"):
        build_response_table(tr, p.stations, 1.0, heading_grid_deg=[0.0, 90.0])
    with pytest.raises(SeawayInputError, match="tp_grid_s"):
        build_response_table(tr, p.stations, 1.0, tp_grid_s=[5.0, 4.0])
    with pytest.raises(SeawayInputError, match="speed_m_s"):
        build_response_table(tr, p.stations, float("nan"))


def test_full_circle_rao_table_uses_headings_0_to_360():
    # An RAO table without port/starboard symmetry (headings to 345 deg) must not be folded.
    from seaway_comfort.processing.core.motions.rao_table import TableTransfer, rao_table_from_rows
    from seaway_comfort.processing.core.vessel.profile import Station

    header = ["omega_rad_s", "heading_deg", "heave_m_per_m", "pitch_deg_per_m", "roll_deg_per_m"]
    rows = []
    for w in np.arange(0.2, 4.01, 0.05):
        for h in np.arange(0.0, 346.0, 15.0):
            asym = 1.0 + 0.5 * np.sin(np.radians(h))  # more roll with waves from port (mu 90)
            rows.append([f"{w:.4f}", f"{h}", f"{1.0 / (1 + (w / 1.5) ** 4):.8f}",
                         f"{5.0 * w * w / 9.81 / (1 + (w / 1.5) ** 4):.8f}",
                         f"{asym * 8.0 / (1 + ((w - 1.2) / 0.3) ** 2):.8f}"])
    tt = TableTransfer(rao_table_from_rows(header, rows))
    st = [Station("s", 2.0, 1.0, 1.5)]
    tab = build_response_table(tt, st, 2.0)
    assert tab.full_circle and tab.heading_grid_deg[-1] > 180.0
    hs, tp, wf, co = _random_sea(150, 1, 5)
    tp = np.clip(tp, 4.0, 12.0)
    ex = motion_response(tt, st, hs_m=hs, tp_s=tp, wave_from_deg=wf, course_deg=co, speed_m_s=2.0)
    tl = tab.lookup(hs, tp, relative_heading_deg(co[:, None], wf))
    for f in ("heave_rms_m", "roll_rms_deg", "vacc_rms_m_s2", "lacc_rms_m_s2"):
        assert _rel_err(getattr(ex, f), getattr(tl, f)) < 0.01, f
    # port and starboard beam seas differ for this table (mu 90 vs 270)
    r = tab.lookup([1.0, 1.0], [7.0, 7.0], [90.0, 270.0])
    assert r.roll_rms_deg[0] > 1.2 * r.roll_rms_deg[1]


def _asymmetric_rao_table(tmp_path, full_circle):
    """An invented RAO grid (demo data, not a real vessel): smooth in period and heading,
    port and starboard different when ``full_circle``."""
    from seaway_comfort.processing.core.motions.rao_table import TableTransfer, load_rao_table

    heads = np.arange(0.0, 360.0, 15.0) if full_circle else np.arange(0.0, 180.1, 15.0)
    lines = ["period_s,heading_deg,heave_m_per_m,pitch_deg_per_m,roll_deg_per_m"]
    for t in np.arange(2.0, 30.01, 1.0):
        for h in heads:
            s = np.sin(np.radians(h))
            lines.append(f"{t},{h},{1.0 - 0.8 * np.exp(-t / 6.0):.8f},{0.4 * t * abs(np.cos(np.radians(h))):.8f},"
                         f"{2.0 * t / (1.0 + (t - 9.0) ** 2) * (abs(s) + (0.3 * s if full_circle else 0.0)):.8f}")
    f = tmp_path / ("full.csv" if full_circle else "half.csv")
    f.write_text("\n".join(lines) + "\n")
    return TableTransfer(load_rao_table(f))


@pytest.mark.parametrize("model", ["closed_form", "rao_half", "rao_full"])
@pytest.mark.parametrize("long_crested", [False, True])
def test_table_nodes_equal_the_exact_path_to_rounding(tmp_path, model, long_crested):
    """Each distinct (Tp, frequency, direction) point is evaluated once when building a table
    (tables.py docstring); the table's values AT its nodes must still equal the exact spectral
    integration at those (Tp, mu), Hs = 1 m, to rounding (1e-12 relative, self-consistency of the
    two summation orders), for the closed form, a folded and a full-circle RAO table, also with
    finite depth."""
    p = builtin_profile("coastal_survey_35m")
    tr = (ClosedFormTransfer.from_profile(p) if model == "closed_form"
          else _asymmetric_rao_table(tmp_path, model == "rao_full"))
    tp_nodes, depth = np.geomspace(3.0, 18.0, 7), 35.0
    tab = build_response_table(tr, p.stations, 4.0, tp_grid_s=tp_nodes, long_crested=long_crested, depth_m=depth)
    T, H = np.meshgrid(tab.tp_grid_s, tab.heading_grid_deg, indexing="ij")
    n = T.size
    # course 0 and waves "from" mu - 180 give the ITTC relative heading mu
    ex = motion_response(tr, p.stations, hs_m=np.ones(n), tp_s=T.ravel(), wave_from_deg=(H.ravel() - 180.0) % 360.0,
                         course_deg=0.0, speed_m_s=4.0, depth_m=np.full(n, depth), long_crested=long_crested)
    assert np.allclose(relative_heading_deg(0.0, (H.ravel() - 180.0) % 360.0), H.ravel())
    tl = tab.lookup(np.ones(n), T.ravel(), H.ravel())
    for f in FIELDS:
        a, b = getattr(ex, f), getattr(tl, f)
        assert np.max(np.abs(b - a) / np.maximum(np.abs(a), 1e-9 * np.abs(a).max())) < 1e-12, f
    np.testing.assert_array_equal(tl.flags, ex.flags)
