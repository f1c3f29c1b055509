# SPDX-License-Identifier: GPL-2.0-or-later
"""Motion-comfort indices: motion sickness incidence, ISO 2631-1 Wf weighting, MSDV, classes.

* MSI, 2 h exposure (O'Hanlon & McCauley 1974, Aerospace Medicine 45(4) 366-369, in the
  seakeeping form of Lloyd 1989 "Seakeeping: Ship Behaviour in Rough Weather" p. 335 and
  Lewis (ed.) 1989 PNA vol. III ch. 8)::

      MSI [%] = 100 Phi(z),  z = (log10(a/g) - mu) / 0.4,  mu = -0.819 + 2.32 (log10 omega_e)**2

  a = MEAN ABSOLUTE vertical acceleration [m/s^2], omega_e [rad/s], g = 9.81 m/s^2, Phi the
  standard normal CDF. For irregular (Gaussian, narrow-band) motion we use
  a = sqrt(2/pi) sigma_a = 0.798 sigma_a and omega_e = sqrt(m2/m0) of the acceleration
  spectrum (our documented choice; the source fixes neither). Never feed an RMS value here.
* Other exposures: the time-dependent model of McCauley, Royal, Wylie, O'Hanlon & Mackie
  (1976), Human Factors Research Tech. Rep. 1733-2: MSI = 100 Phi(Za) Phi(Zt),
  Za = 2.128 log10(a) - 9.277 log10(f) - 5.809 (log10 f)**2 - 1.851,
  Zt = 1.134 Za + 1.989 log10(t) - 2.904, a in g (mean absolute), f in Hz, t in minutes.
  COEFFICIENTS FROM MEMORY (not verified against the report); at 2 h the two forms differ by
  up to about 3 percentage points, so exposure_h = 2.0 always uses the 1974 form.
* ISO 2631-1:1997 Annex A weighting Wf (motion sickness) and Annex D dose: MSDV_z =
  sqrt(integral a_w(t)**2 dt) [m/s^1.5]; percentage who may vomit = Km MSDV_z, Km = 1/3
  (mixed adult population). Filter parameters of Wf recalled (see iso2631_wf_weighting).
* Comfort classes are our own five-step summary (not from any standard), see comfort_class.
"""
from __future__ import annotations

import math
from typing import Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..numerics import normal_cdf
from ..units import G_SHIP_M_S2, FloatArray
from ..validation import SeawayInputError, require_nonnegative, require_positive

__all__ = [
    "msi_percent",
    "iso2631_wf_weighting",
    "iso2631_wf_weighting_squared",
    "msdv_m_s15",
    "msdv_cumulative",
    "vomiting_share_pct",
    "mean_abs_from_rms",
    "COMFORT_CLASS_LABELS",
    "COMFORT_CLASS_DESCRIPTIONS",
    "MSI_CLASS_BOUNDS_PCT",
    "USAGE_CLASS_BOUNDS",
    "comfort_class",
    "KM_VOMITING",
]

KM_VOMITING: float = 1.0 / 3.0
"""ISO 2631-1:1997 Annex D constant Km for a mixed population of unadapted adults [%/(m/s^1.5)]."""

GAUSS_MEAN_ABS: float = math.sqrt(2.0 / math.pi)
"""mean |x| / sigma for a zero-mean Gaussian variable (= 0.7979)."""


def mean_abs_from_rms(rms: ArrayLike) -> FloatArray:
    """Mean absolute value of a zero-mean Gaussian process, sqrt(2/pi) sigma (any unit)."""
    return GAUSS_MEAN_ABS * require_nonnegative("rms", rms)


def msi_percent(
    accel_mean_abs_m_s2: ArrayLike,
    omega_e_rad_s: ArrayLike,
    exposure_h: float = 2.0,
    *,
    g_m_s2: float = G_SHIP_M_S2,
) -> FloatArray:
    """Motion sickness incidence [%] of vertical motion (module docstring for the equations).

    Parameters
    ----------
    accel_mean_abs_m_s2 : mean absolute vertical acceleration [m/s^2] >= 0 (for Gaussian
        motion sqrt(2/pi) times the RMS, see :func:`mean_abs_from_rms`). 0 gives MSI 0.
    omega_e_rad_s : (mean) encounter frequency of the acceleration [rad/s], > 0.
    exposure_h : exposure [h] > 0; 2.0 = O'Hanlon & McCauley (1974) as in Lloyd (1989);
        any other value uses McCauley et al. (1976), coefficients from memory.
    g_m_s2 : gravity used to express a in g (9.81 as in Lloyd's usage).
    """
    a = require_nonnegative("accel_mean_abs_m_s2", accel_mean_abs_m_s2)
    w = require_positive("omega_e_rad_s", omega_e_rad_s)
    t_h = float(require_positive("exposure_h", exposure_h))
    g = float(require_positive("g_m_s2", g_m_s2))
    with np.errstate(divide="ignore"):
        la = np.log10(a / g)  # -inf where a == 0 -> Phi = 0 exactly
    if t_h == 2.0:
        lw = np.log10(w)
        mu = -0.819 + 2.32 * lw * lw
        return np.asarray(100.0 * normal_cdf((la - mu) / 0.4), dtype=float)
    lf = np.log10(w / (2.0 * math.pi))
    za = 2.128 * la - 9.277 * lf - 5.809 * lf * lf - 1.851
    zt = 1.134 * za + 1.989 * math.log10(t_h * 60.0) - 2.904
    return np.asarray(100.0 * normal_cdf(za) * normal_cdf(zt), dtype=float)


# ISO 2631-1:1997 Annex A, Wf: f1 0.08, f2 0.63, f3 inf, f4 0.25 Hz, Q4 0.86, f5 0.0625 Hz,
# Q5 0.80, f6 0.10 Hz, Q6 0.80, Q1 = Q2 = 1/sqrt(2) (parameters recalled, see module doc).
_WF = dict(f1=0.08, f2=0.63, f4=0.25, q4=0.86, f5=0.0625, q5=0.80, f6=0.10, q6=0.80)


def iso2631_wf_weighting(freq_hz: ArrayLike) -> FloatArray:
    """|Wf(f)|, the ISO 2631-1:1997 Annex A motion-sickness frequency weighting (dimensionless).

    Product of analogue filters with s = j 2 pi f, omega_i = 2 pi f_i:
    band-limit high-pass Hh = s**2 / (s**2 + w1 s/Q1 + w1**2); low-pass
    Hl = w2**2 / (s**2 + w2 s/Q2 + w2**2), Q1 = Q2 = 1/sqrt(2); transition
    Ht = 1 / (1 + s/(Q4 w4) + s**2/w4**2) (f3 = inf); upward step
    Hs = (s**2 + w5 s/Q5 + w5**2) / (s**2 + w6 s/Q6 + w6**2) (gain 1 at high frequency).
    Parameters in ``_WF`` (recalled; they reproduce the standard's weighting table as far as we
    recall it, e.g. 0.16 Hz ~ 1.006, 0.5 Hz ~ 0.224). ``freq_hz`` >= 0; f = 0 gives 0.
    """
    f = require_nonnegative("freq_hz", freq_hz)
    s = 2j * math.pi * f
    w1, w2, w4, w5, w6 = (2.0 * math.pi * _WF[k] for k in ("f1", "f2", "f4", "f5", "f6"))
    q1 = q2 = 1.0 / math.sqrt(2.0)
    hh = s * s / (s * s + w1 * s / q1 + w1 * w1)
    hl = w2 * w2 / (s * s + w2 * s / q2 + w2 * w2)
    ht = 1.0 / (1.0 + s / (_WF["q4"] * w4) + s * s / (w4 * w4))
    hs = (s * s + w5 * s / _WF["q5"] + w5 * w5) / (s * s + w6 * s / _WF["q6"] + w6 * w6)
    return np.asarray(np.abs(hh * hl * ht * hs), dtype=float)


def iso2631_wf_weighting_squared(freq_hz: ArrayLike) -> FloatArray:
    """|Wf(f)|**2, evaluated in real arithmetic (for weighting a spectrum inside the integral).

    Same filter as :func:`iso2631_wf_weighting`, using |b - w**2 + j a w|**2 =
    (b - w**2)**2 + a**2 w**2 for each second-order factor (w = 2 pi f).
    """
    f = require_nonnegative("freq_hz", freq_hz)
    return _wf2_unchecked(2.0 * math.pi * f)


def _wf2_unchecked(w: FloatArray) -> FloatArray:
    """|Wf|**2 at angular frequency w = 2 pi f [rad/s] (no validation; used by response)."""
    w1, w2, w4, w5, w6 = (2.0 * math.pi * _WF[k] for k in ("f1", "f2", "f4", "f5", "f6"))
    q = 1.0 / math.sqrt(2.0)
    x = w * w

    def quad(wn: float, qn: float) -> FloatArray:
        d = wn * wn - x
        return d * d + (wn / qn) ** 2 * x

    hh = x * x / quad(w1, q)
    hl = w2**4 / quad(w2, q)
    d4 = 1.0 - x / (w4 * w4)
    ht = 1.0 / (d4 * d4 + x / (_WF["q4"] * w4) ** 2)
    hs = quad(w5, _WF["q5"]) / quad(w6, _WF["q6"])
    return np.asarray(hh * hl * ht * hs, dtype=float)


def msdv_m_s15(aw_rms_m_s2: ArrayLike, duration_s: ArrayLike) -> FloatArray:
    """Motion sickness dose value of steady motion, MSDV_z = a_w,rms sqrt(T) [m/s^1.5].

    ISO 2631-1:1997 Annex D: MSDV_z = (integral_0^T a_w(t)**2 dt)**0.5; for a stationary
    record this is a_w,rms * T**0.5. a_w,rms [m/s^2] Wf-weighted RMS >= 0, T [s] >= 0.
    """
    a = require_nonnegative("aw_rms_m_s2", aw_rms_m_s2)
    t = require_nonnegative("duration_s", duration_s)
    return np.asarray(a * np.sqrt(t), dtype=float)


def msdv_cumulative(aw_rms_m_s2: ArrayLike, dt_s: ArrayLike) -> FloatArray:
    """Dose accumulated along a passage: MSDV_i = sqrt(sum_{j<=i} a_w,j**2 dt_j) [m/s^1.5].

    ISO 2631-1:1997 Annex D integral with piecewise-stationary motion: sample j lasts dt_j [s]
    at weighted RMS a_w,j [m/s^2]. 1-D arrays of equal length.
    """
    a = require_nonnegative("aw_rms_m_s2", aw_rms_m_s2)
    dt = require_nonnegative("dt_s", dt_s)
    if a.ndim != 1 or dt.shape != a.shape:
        raise SeawayInputError(
            f"aw_rms_m_s2 and dt_s must be 1-D arrays of equal length, got shapes {a.shape} and {dt.shape}"
        )
    return np.sqrt(np.cumsum(a * a * dt))


def vomiting_share_pct(msdv_m_s15_value: ArrayLike) -> FloatArray:
    """Share of people who may vomit [%] = Km MSDV_z, Km = 1/3 (ISO 2631-1:1997 Annex D).

    Capped at 100 %. ISO gives the relation for exposures of about 20 min to 6 h and
    0.1-0.5 Hz vertical motion (validity wording from memory).
    """
    m = require_nonnegative("msdv", msdv_m_s15_value)
    return np.minimum(KM_VOMITING * m, 100.0)


# ------------------------------------------------------------------------ comfort classes
COMFORT_CLASS_LABELS: Tuple[str, ...] = ("smooth", "steady", "lively", "taxing", "punishing")
COMFORT_CLASS_DESCRIPTIONS: Tuple[str, ...] = (
    "Little motion: work and rest as in harbour.",
    "Noticeable motion: most people unaffected; fine work needs care.",
    "Clear motion: some people feel unwell; hold on when moving about.",
    "Strong motion: a seakeeping criterion for the station's task is exceeded or many feel unwell; work is hard and slow.",
    "Severe motion: half as much again as a criterion limit, or one in five sick within 2 h.",
)
MSI_CLASS_BOUNDS_PCT: Tuple[float, ...] = (2.0, 5.0, 10.0, 20.0)
"""MSI (2 h) at which the classes steady, lively, taxing, punishing begin [%] (our own choice)."""
USAGE_CLASS_BOUNDS: Tuple[float, ...] = (0.5, 0.75, 1.0, 1.5)
"""Fraction of the governing criterion limit at which those classes begin (our own choice).

Exceeding a limit for the station's task (usage >= 1) makes a sample at least "taxing";
"punishing" is kept for motions 1.5 times a limit or more, so that one marginal criterion
does not rate a passage as severe as one where most people are sick."""


def comfort_class(msi_pct: ArrayLike, criteria_usage: ArrayLike) -> NDArray[np.int64]:
    """Comfort class 0..4 (COMFORT_CLASS_LABELS) per sample: the worse of two scales.

    class_msi = number of MSI_CLASS_BOUNDS_PCT that msi_pct reaches (>=);
    class_use = number of USAGE_CLASS_BOUNDS that criteria_usage (largest value/limit ratio of
    the station's seakeeping criteria, :mod:`.criteria`) reaches; class = max of both.
    Thresholds are our own design choice (no published source), shown in the UI.
    """
    msi = require_nonnegative("msi_pct", msi_pct)
    use = require_nonnegative("criteria_usage", criteria_usage)
    try:
        msi, use = np.broadcast_arrays(msi, use)
    except ValueError as exc:
        raise SeawayInputError(
            f"msi_pct {msi.shape} and criteria_usage {use.shape} do not broadcast"
        ) from exc
    c1 = np.searchsorted(np.asarray(MSI_CLASS_BOUNDS_PCT), msi, side="right")
    c2 = np.searchsorted(np.asarray(USAGE_CLASS_BOUNDS), use, side="right")
    return np.maximum(c1, c2).astype(np.int64)
