# SPDX-License-Identifier: GPL-2.0-or-later
"""MSI, ISO 2631-1 Wf weighting, MSDV, comfort classes.

Tags beside checks: [A] printed in the named source; [C] from memory (soft expectation);
[D] computed from the named published formula by an independent implementation outside this
project (the source itself does not print the number)."""
from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.stats import norm

from seaway_comfort.processing.core.comfort.indices import (
    COMFORT_CLASS_DESCRIPTIONS,
    COMFORT_CLASS_LABELS,
    comfort_class,
    iso2631_wf_weighting,
    iso2631_wf_weighting_squared,
    mean_abs_from_rms,
    msdv_cumulative,
    msdv_m_s15,
    msi_percent,
    vomiting_share_pct,
)
from seaway_comfort.processing.core.validation import SeawayInputError

# [D] values of O'Hanlon & McCauley (1974) in the Lloyd (1989) / PNA (1989) form,
# g = 9.81, mean |a|, omega_e in rad/s, 2 h.
MSI_ROWS = [
    (1.4911, 1.0, 50.08), (0.5, 1.0, 11.816), (1.0, 1.0, 33.299), (0.5, 0.6, 7.082),
    (0.3, 1.2, 3.793), (1.0, 2.0, 16.922), (2.0, 1.5, 55.609), (0.8, 0.8, 23.318),
    (1.5, 1.2, 48.891), (0.2, 1.0, 1.466), (0.79788, 1.0, 24.926),
]


@pytest.mark.parametrize("a, w, expected", MSI_ROWS)
def test_msi_two_hours_table(a, w, expected):
    assert float(msi_percent(a, w)) == pytest.approx(expected, abs=6e-3)


def test_msi_against_published_formula_with_scipy_normal_cdf():
    # Lloyd (1989) p. 335 form evaluated independently with scipy.stats.norm.cdf.
    a = np.array([0.1, 0.7, 2.5]); w = np.array([0.5, 1.3, 3.0])
    mu = -0.819 + 2.32 * np.log10(w) ** 2
    ref = 100 * norm.cdf((np.log10(a / 9.81) - mu) / 0.4)
    np.testing.assert_allclose(msi_percent(a, w), ref, rtol=1e-12)
    assert float(msi_percent(0.0, 1.0)) == 0.0


def test_msi_time_dependent_model():
    # McCauley et al. (1976) time-dependent model [C, coefficients from memory]:
    # 0.5 m/s^2 at 1 rad/s for 120 min gives 10.8 % ([D], vs 11.8 % for the 1974 form).
    assert float(msi_percent(0.5, 1.0, exposure_h=2.0 + 1e-12)) == pytest.approx(10.8, abs=0.06)
    # MSI grows with exposure (common practice, no source).
    v = [float(msi_percent(1.0, 1.0, exposure_h=t)) for t in (0.5, 1.0, 4.0)]
    assert v[0] < v[1] < v[2]


@pytest.mark.parametrize("f, expected", [
    (0.02, 0.0242), (0.05, 0.1566), (0.08, 0.4607), (0.1, 0.6951), (0.125, 0.8951), (0.16, 1.0060),
    (0.2, 0.9920), (0.25, 0.8543), (0.315, 0.6191), (0.4, 0.3843), (0.5, 0.2239), (0.63, 0.1163),
    (0.8, 0.0530), (1.0, 0.0235),
])
def test_wf_weighting_at_nominal_band_frequencies(f, expected):
    # [D] |Wf| from the ISO 2631-1:1997 Annex A filter (parameters recalled [C]) at the nominal
    # frequencies; the recalled ISO table values 0.16 Hz 1.006, 0.2 Hz 0.992, 0.5 Hz 0.224 agree [C].
    assert float(iso2631_wf_weighting(f)) == pytest.approx(expected, abs=5.1e-5)


def test_wf_sinusoid_weighted_rms():
    # [D] ISO 2631-1 Wf: a 0.2 Hz sinusoid of amplitude 1 m/s^2 -> a_w,rms = 0.70146 m/s^2.
    assert float(iso2631_wf_weighting(0.2)) / math.sqrt(2) == pytest.approx(0.70146, abs=5e-6)
    assert float(iso2631_wf_weighting(0.0)) == 0.0


def test_msdv_sqrt_time_and_values():
    # ISO 2631-1:1997 Annex D MSDV = a_w sqrt(T), Km = 1/3; worked values [D]:
    # 0.5 m/s^2 for 2 h -> 42.426 -> 14.14 %; 0.3 for 1 h -> 18.000 -> 6.00 %; 1.0 for 0.5 h -> 42.426.
    assert float(msdv_m_s15(0.5, 7200)) == pytest.approx(42.426, abs=5e-4)
    assert float(vomiting_share_pct(msdv_m_s15(0.5, 7200))) == pytest.approx(14.14, abs=5e-3)
    assert float(msdv_m_s15(0.3, 3600)) == pytest.approx(18.0, abs=5e-4)
    assert float(vomiting_share_pct(18.0)) == pytest.approx(6.0, abs=5e-3)
    assert float(msdv_m_s15(1.0, 1800)) == pytest.approx(42.426, abs=5e-4)
    # linear in sqrt(time): 4 x time -> 2 x dose
    assert float(msdv_m_s15(0.7, 4 * 900) / msdv_m_s15(0.7, 900)) == pytest.approx(2.0, rel=1e-12)


def test_msdv_cumulative_matches_steady_dose():
    # ISO 2631-1 Annex D integral: 12 steps of 10 min at 0.5 m/s^2 equal 2 h steady.
    c = msdv_cumulative(np.full(12, 0.5), np.full(12, 600.0))
    assert c[-1] == pytest.approx(42.426, abs=5e-4)
    assert np.all(np.diff(c) > 0)
    with pytest.raises(SeawayInputError, match="equal length"):
        msdv_cumulative(np.ones(3), np.ones(2))


def test_comfort_classes():
    # Our own classes (comfort.py docstring); the ints and labels are the public interface.
    assert COMFORT_CLASS_LABELS == ("smooth", "steady", "lively", "taxing", "punishing")
    assert len(COMFORT_CLASS_DESCRIPTIONS) == 5
    c = comfort_class([0.0, 3.0, 6.0, 15.0, 25.0, 0.0, 0.0, 0.0, 0.0, 0.0],
                      [0.0, 0.0, 0.0, 0.0, 0.0, 0.6, 0.8, 1.0, 1.2, 1.5])
    np.testing.assert_array_equal(c, [0, 1, 2, 3, 4, 1, 2, 3, 3, 4])
    # the worse of the two scales governs
    np.testing.assert_array_equal(comfort_class([25.0, 3.0], [0.1, 1.6]), [4, 4])
    assert c.dtype == np.int64


def test_bad_inputs():
    with pytest.raises(SeawayInputError, match="accel_mean_abs_m_s2"):
        msi_percent(-1.0, 1.0)
    with pytest.raises(SeawayInputError, match="omega_e_rad_s"):
        msi_percent(1.0, 0.0)
    with pytest.raises(SeawayInputError, match="omega_e_rad_s"):
        msi_percent(1.0, float("nan"))


def test_wf_squared_real_form_equals_complex_filter():
    # algebraic identity |b - w^2 + j a w|^2 = (b - w^2)^2 + a^2 w^2 (common practice, no source)
    f = np.geomspace(0.005, 5.0, 200)
    np.testing.assert_allclose(iso2631_wf_weighting_squared(f), iso2631_wf_weighting(f) ** 2, rtol=1e-12)


def test_mean_absolute_value_of_a_gaussian_process():
    """E|x| = sigma sqrt(2/pi) = 0.79788 sigma for zero-mean Gaussian x (Papoulis & Pillai,
    Probability, Random Variables and Stochastic Processes, 4th ed. 2002, ch. 5, moments of the
    normal density; chapter from memory). Hand derivation: E|x| = 2 int_0^inf x exp(-x^2/2s^2)
    dx / (s sqrt(2 pi)) = 2 s^2 / (s sqrt(2 pi)) = s sqrt(2/pi). Checked against
    scipy.stats.norm.expect(abs) (numerical quadrature) and scipy.stats.halfnorm.mean()."""
    from scipy.stats import halfnorm

    rms = np.array([0.0, 0.25, 1.0, 3.7])
    ref = np.array([norm(scale=s).expect(abs) if s > 0 else 0.0 for s in rms])
    np.testing.assert_allclose(mean_abs_from_rms(rms), ref, rtol=1e-9, atol=0)
    assert float(mean_abs_from_rms(1.0)) == pytest.approx(halfnorm.mean(), rel=1e-12)
    # MSI fed with the mean |a| of a Gaussian acceleration of RMS 1 m/s^2 at 1 rad/s: 24.926 %
    # is the table row (0.79788, 1.0) above, NOT the row of mean |a| = 1.0 (33.299 %).
    assert float(msi_percent(mean_abs_from_rms(1.0), 1.0)) == pytest.approx(
        100 * norm.cdf((math.log10(halfnorm.mean() / 9.81) + 0.819) / 0.4), rel=1e-9)
    with pytest.raises(SeawayInputError, match="rms"):
        mean_abs_from_rms(-0.1)
