# SPDX-License-Identifier: GPL-2.0-or-later
"""Exposure along a passage: the time each sample stands for, hours per comfort class, and
the motion sickness dose over time.

One home for these sums: the passage (one departure, 1-D arrays) and the sweep (many
departures, rows of 2-D arrays) call the same functions over the last axis.

* Dwell time: sample i stands for half the interval to each neighbour,
  dwell_i = (t_{i+1} - t_{i-1}) / 2, the first and last sample half an interval [s]
  (the trapezoid weights of the time axis; common practice, no source).
* Hours per class: the dwell times of the samples in each class, summed [h].
* Motion sickness dose value (ISO 2631-1:1997 Annex D):
  MSDV(t) = ( integral_0^t a_w(tau)**2 d tau )**(1/2) [m/s^1.5], a_w the Wf-weighted RMS
  vertical acceleration [m/s^2], integrated with the trapezoid rule on a_w**2 between
  consecutive samples (exact when a_w**2 varies linearly in time). Intervals with an end point
  without results (NaN) contribute nothing.
"""
from __future__ import annotations

from typing import Tuple

import numpy as np
from numpy.typing import NDArray

from ..units import SECONDS_PER_HOUR, FloatArray
from .indices import COMFORT_CLASS_LABELS

__all__ = ["NOT_COMPUTED_CLASS", "dwell_s", "hours_in_classes", "dose_intervals", "msdv_at_end"]

NOT_COMPUTED_CLASS: int = -1
"""Comfort class of a sample without results (written as NULL by the algorithms)."""


def dwell_s(t_s: FloatArray) -> FloatArray:
    """Time each sample stands for [s] (module docstring); ``t_s`` (n,) seconds, increasing."""
    t_s = np.asarray(t_s, dtype=float)
    out = np.zeros(t_s.size)
    if t_s.size >= 2:
        d = np.diff(t_s)
        out[:-1] += 0.5 * d
        out[1:] += 0.5 * d
    return out


def hours_in_classes(cls: NDArray[np.integer], dwell: FloatArray) -> Tuple[FloatArray, FloatArray]:
    """Hours in each comfort class and hours without results, summed over the last axis.

    ``cls`` (..., n) classes 0..4 or :data:`NOT_COMPUTED_CLASS`; ``dwell`` (n,) [s].
    Returns (hours (..., 5), hours_not_computed (...)) [h].
    """
    w = np.asarray(dwell, dtype=float) / SECONDS_PER_HOUR
    hours = np.stack([np.where(cls == c, w, 0.0).sum(axis=-1) for c in range(len(COMFORT_CLASS_LABELS))],
                     axis=-1)
    missing = np.where(cls == NOT_COMPUTED_CLASS, w, 0.0).sum(axis=-1)
    return hours, missing


def dose_intervals(t_s: FloatArray, aw: FloatArray) -> Tuple[FloatArray, FloatArray]:
    """Per-interval RMS a_w and duration for the trapezoid rule on a_w**2 (module docstring).

    ``aw`` (..., n) [m/s^2] over ``t_s`` (n,) [s]. Interval i runs from sample i-1 to i;
    element 0 is empty. a_i = sqrt((a_{i-1}**2 + a_i**2) / 2), so that a_i**2 dt_i is the
    trapezoid area; intervals touching a NaN sample get a = 0, dt = 0 (no contribution).
    """
    aw = np.asarray(aw, dtype=float)
    a_int = np.zeros(aw.shape)
    dt = np.zeros(aw.shape)
    if aw.shape[-1] >= 2:
        a2 = 0.5 * (aw[..., :-1] ** 2 + aw[..., 1:] ** 2)
        ok = np.isfinite(a2)
        a_int[..., 1:] = np.sqrt(np.where(ok, a2, 0.0))
        dt[..., 1:] = np.where(ok, np.diff(np.asarray(t_s, dtype=float)), 0.0)
    return a_int, dt


def msdv_at_end(t_s: FloatArray, aw: FloatArray) -> FloatArray:
    """MSDV at the last sample [m/s^1.5] for every row of ``aw`` (..., n) [m/s^2].

    The same dose as the last value of the cumulative dose of :func:`dose_intervals` with
    :func:`.indices.msdv_cumulative`; NaN where no sample of the row has results.
    """
    a_int, dt = dose_intervals(t_s, aw)
    dose = np.sqrt((a_int * a_int * dt).sum(axis=-1))
    return np.where(np.isfinite(np.asarray(aw, dtype=float)).any(axis=-1), dose, np.nan)
