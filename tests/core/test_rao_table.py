# SPDX-License-Identifier: GPL-2.0-or-later
"""RAO table CSV: validation, bilinear interpolation on the circle, use in the response.

Sources are named beside each check; "from memory" marks a source not re-read, "by hand" a
derivation written beside the check, "common practice, no source" a fact of the trade."""
from __future__ import annotations

import math
import re

import numpy as np
import pytest
from scipy.interpolate import RegularGridInterpolator

from seaway_comfort.processing.core.motions.rao_table import TableTransfer, load_rao_table
from seaway_comfort.processing.core.motions.response import motion_response
from seaway_comfort.processing.core.motions.closed_form import ClosedFormTransfer
from seaway_comfort.processing.core.validation import SeawayInputError
from seaway_comfort.processing.core.vessel.profile import Station

HEADER = "period_s,heading_deg,heave_m_per_m,pitch_deg_per_m,roll_deg_per_m"


def _write(tmp_path, lines, name="r.csv"):
    f = tmp_path / name
    f.write_text("\n".join(lines) + "\n")
    return f


def _grid_lines(periods, headings, fn, col="period_s"):
    out = [HEADER.replace("period_s", col)]
    for t in periods:
        for h in headings:
            a, b, c = fn(t, h)
            out.append(f"{t},{h},{a},{b},{c}")
    return out


def _fn(t, h):
    return 1.0 + 0.1 * t + 0.001 * h, 0.5 * t + 0.01 * h, 0.2 * t * (1 + math.sin(math.radians(h)) ** 2)


def test_interpolation_matches_scipy_regular_grid(tmp_path):
    # reference library: scipy.interpolate.RegularGridInterpolator(method="linear").
    periods = [3.0, 5.0, 8.0, 12.0]
    heads = [0.0, 45.0, 90.0, 135.0, 180.0]
    tab = load_rao_table(_write(tmp_path, ["# comment line", *_grid_lines(periods, heads, _fn)]))
    assert tab.symmetric
    om = 2 * np.pi / np.array(periods)[::-1]
    vals = np.array([[_fn(2 * np.pi / w, h)[0] for h in heads] for w in om])
    ref = RegularGridInterpolator((om, np.array(heads)), vals, method="linear")
    rng = np.random.default_rng(0)
    q_om = rng.uniform(om[0], om[-1], 50)
    q_h = rng.uniform(0, 180, 50)
    got = tab.interpolate(q_om, q_h).heave_m_per_m
    np.testing.assert_allclose(got, ref(np.c_[q_om, q_h]), rtol=1e-12)
    # pitch stored in rad/m (input deg/m)
    assert tab.pitch_rad_per_m[0, 0] == pytest.approx(math.radians(_fn(12.0, 0.0)[1]))


def test_symmetry_and_circle(tmp_path):
    # port/starboard symmetry: mu and 360 - mu give the same amplitudes (common practice, no source).
    tab = load_rao_table(_write(tmp_path, _grid_lines([4.0, 8.0], [0.0, 90.0, 180.0], _fn)))
    a = tab.interpolate(1.0, [60.0, 300.0, 420.0])
    assert a.roll_rad_per_m[0] == pytest.approx(a.roll_rad_per_m[1]) == pytest.approx(a.roll_rad_per_m[2])
    # full circle: periodic between 270 and 0 (= 360)
    full = load_rao_table(_write(tmp_path, _grid_lines([4.0, 8.0], [0.0, 90.0, 180.0, 270.0], _fn), "f.csv"))
    assert not full.symmetric
    v = full.interpolate(full.omega_rad_s[0], [315.0]).heave_m_per_m[0]
    ends = full.interpolate(full.omega_rad_s[0], [270.0, 0.0]).heave_m_per_m
    assert v == pytest.approx(ends.mean(), rel=1e-12)


def test_frequency_units_agree(tmp_path):
    # omega = 2 pi / T = 2 pi f (definition)
    t = load_rao_table(_write(tmp_path, _grid_lines([5.0, 10.0], [0.0, 180.0], _fn), "a.csv"))
    f = load_rao_table(_write(tmp_path, _grid_lines([0.1, 0.2], [0.0, 180.0],
                                                    lambda hz, h: _fn(1 / hz, h), col="freq_hz"), "b.csv"))
    np.testing.assert_allclose(t.omega_rad_s, f.omega_rad_s, rtol=1e-12)
    np.testing.assert_allclose(t.heave_m_per_m, f.heave_m_per_m, rtol=1e-12)


def test_beyond_range_and_coverage(tmp_path):
    tab = load_rao_table(_write(tmp_path, _grid_lines([4.0, 8.0], [0.0, 180.0], _fn)))
    tt = TableTransfer(tab)
    hi = tab.omega_rad_s[-1] * 1.5
    assert tab.interpolate(hi, 90.0).heave_m_per_m == 0.0  # short-wave limit beyond the table
    np.testing.assert_array_equal(tt.covered(np.array([tab.omega_rad_s[0] * 0.9, tab.omega_rad_s[0], hi])),
                                  [False, True, False])


@pytest.mark.parametrize("lines, words", [
    ([HEADER, "5,0,1,1,1", "5,,1,1,1"], "line 3 column heading_deg is empty"),
    ([HEADER, "5,0,1,1,1", "5,0,1,1,1"], "line 3 duplicates line 2"),
    ([HEADER, "5,180,1,1,1", "5,0,1,1,1"], "line 3 is out of order"),
    ([HEADER, "8,0,1,1,1", "5,0,1,1,1"], "line 3 is out of order"),
    ([HEADER, "5,0,-0.1,1,1"], "heave_m_per_m is a negative amplitude"),
    ([HEADER, "5,0,1,1,1", "5,180,1,1,1", "8,0,1,1,1"], "not rectangular.*missing \\[180.0\\]"),
    ([HEADER, "5,0,x,1,1"], "not a number: 'x'"),
    ([HEADER + ",colour", "5,0,1,1,1,2"], "unknown column.*'colour'"),
    ([HEADER + ",freq_hz", "5,0,1,1,1,2"], "exactly one frequency column"),
    ([HEADER, "5,0,1,1,1", "5,90,1,1,1", "8,0,1,1,1", "8,90,1,1,1"], "must include 0 and 180"),
    ([HEADER, "5,0,1,1,1", "5,360,1,1,1"], "heading_deg must lie in \\[0, 360\\)"),
    ([HEADER, "0,0,1,1,1"], "period_s must be > 0"),
    (["heading_deg,heave_m_per_m", "0,1"], "exactly one frequency column"),
])
def test_bad_tables(tmp_path, lines, words):
    # our CSV rules (rao_table.py docstring); messages name line and column.
    with pytest.raises(SeawayInputError, match=words):
        load_rao_table(_write(tmp_path, lines))


def test_comment_lines_keep_line_numbers(tmp_path):
    with pytest.raises(SeawayInputError, match=re.escape("line 5 column roll_deg_per_m is empty")):
        load_rao_table(_write(tmp_path, ["# a", HEADER, "5,0,1,1,1", "# b", "5,180,1,1,"]))


def test_table_sampled_from_closed_form_reproduces_its_response(tmp_path):
    # consistency with the closed form it was sampled from (JMO 2004 model, transfer.py): a
    # fine table (0.02 rad/s, 5 deg) gives the same irregular-sea response within 1 %.
    cf = ClosedFormTransfer(12.0, 4.0, 1.0, 0.45, 4.1129, 0.1)
    om = np.arange(0.2, 8.0001, 0.02)
    heads = np.arange(0.0, 180.1, 5.0)
    lines = ["omega_rad_s,heading_deg,heave_m_per_m,pitch_deg_per_m,roll_deg_per_m"]
    U = 2.0
    for w in om:
        k = w * w / 9.80665
        t = cf.evaluate(np.full(heads.shape, w), np.full(heads.shape, k), heads, U)
        for h, a, b, c in zip(heads, t.heave_m_per_m, np.degrees(t.pitch_rad_per_m), np.degrees(t.roll_rad_per_m)):
            lines.append(f"{w:.6f},{h},{a:.10g},{b:.10g},{c:.10g}")
    tt = TableTransfer(load_rao_table(_write(tmp_path, lines)))
    st = [Station("s", 3.0, 1.0, 2.0)]
    kw = dict(hs_m=[1.0, 1.0, 1.0], tp_s=[5.0, 7.0, 9.0], wave_from_deg=[10.0, 100.0, 200.0], course_deg=0.0, speed_m_s=U)
    a = motion_response(cf, st, **kw)
    b = motion_response(tt, st, **kw)
    for f in ("heave_rms_m", "pitch_rms_deg", "roll_rms_deg", "vacc_rms_m_s2"):
        np.testing.assert_allclose(getattr(b, f), getattr(a, f), rtol=0.01)
    assert np.all(b.flags == 0)
    # a sea whose energy lies mostly below the table's lowest frequency is flagged
    c = motion_response(tt, st, hs_m=1.0, tp_s=60.0, wave_from_deg=0.0, course_deg=0.0, speed_m_s=U)
    assert c.flags[0] == 512  # SampleFlag.OUTSIDE_VALIDITY
