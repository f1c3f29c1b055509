# SPDX-License-Identifier: GPL-2.0-or-later
"""Plausibility ranges of the core's inputs, each with its reason.

A :class:`Range` has hard bounds (outside: impossible, refused with an error naming the input)
and soft bounds (outside: doubtful, kept but flagged per sample where there are samples).
The reason says where the numbers come from: a published value, or "common practice, no
source"; values recalled from memory say so.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Optional

import numpy as np
from numpy.typing import ArrayLike, NDArray

from .validation import SeawayInputError, as_float_array, show

__all__ = ["Range", "SPEED_KN", "SPEED_M_S", "HS_M", "TP_S", "DEPTH_M", "GAMMA", "SPREAD_S", "EXPOSURE_H",
           "STEEPNESS_DOUBT", "check_range", "doubtful", "sea_steepness"]


@dataclass(frozen=True)
class Range:
    """Hard bounds ``low``/``high`` (None = open; ``low_open``: the low bound itself is refused),
    soft bounds ``doubt_low``/``doubt_high``, unit text and the reason of the numbers."""

    name: str
    low: Optional[float]
    high: Optional[float]
    doubt_low: Optional[float]
    doubt_high: Optional[float]
    unit: str
    reason: str
    low_open: bool = False

    def text(self) -> str:
        lo = "-inf" if self.low is None else f"{self.low:g}"
        hi = "inf" if self.high is None else f"{self.high:g}"
        return f"{'(' if self.low_open else '['}{lo}, {hi}] {self.unit}".rstrip()


KN_PER_M_S = 3600.0 / 1852.0
SPEED_KN = Range("speed", 0.0, 80.0, None, 45.0, "kn", low_open=True, reason=(
    "the fastest craft in commercial service make about 40-60 kn (common practice, no source); "
    "the motion models are for displacement and semi-planing hulls"))
SPEED_M_S = Range("speed", 0.0, 80.0 / KN_PER_M_S, None, 45.0 / KN_PER_M_S, "m/s", reason=SPEED_KN.reason)
HS_M = Range("significant wave height", 0.0, 30.0, None, 20.0, "m", reason=(
    "the highest significant wave height measured by a buoy is about 19 m (WMO record of 2016, "
    "North Atlantic; from memory)"))
TP_S = Range("wave period", 0.5, 100.0, 1.0, 30.0, "s", reason=(
    "wind seas shorter than 0.5 s are ripples (wavelength < 0.4 m); swell beyond about 30 s is "
    "rare and beyond 100 s is infragravity or tide, not a sea state (common practice, no source)"))
DEPTH_M = Range("depth", 0.0, 12000.0, None, None, "m", low_open=True, reason=(
    "the deepest sounding of the oceans is about 10.9 km (Challenger Deep; from memory)"))
GAMMA = Range("JONSWAP gamma", 1.0, 20.0, None, 7.0, "", reason=(
    "DNV-RP-C205 gives 1 <= gamma <= 5 for its gamma(Tp/sqrt(Hs)) rule, fitted sea states rarely "
    "exceed 7 (from memory)"))
SPREAD_S = Range("cos-2s spreading exponent s", 0.0, 200.0, None, None, "", reason=(
    "s of about 1-30 describes wind sea to swell; beyond 200 the sea is long-crested for any "
    "practical purpose (common practice, no source)"))
EXPOSURE_H = Range("exposure", 0.0, 1000.0, None, None, "h", low_open=True, reason=(
    "MSI exposures of McCauley et al. 1976 span minutes to hours; 1000 h is six weeks at sea "
    "(common practice, no source)"))
STEEPNESS_DOUBT = 1.0 / 15.0
"""Doubtful steepness: DNV-RP-C205 (2010) 3.5.5.4 gives Hs/Lp0 <= 1/15 for Tp <= 8 s as the
limiting steepness of a sea state (from memory)."""


def check_range(rng: Range, arg: str, value: ArrayLike) -> NDArray[np.float64]:
    """Float array of ``value``; SeawayInputError naming ``arg``, the first impossible value,
    its index, the range and its reason. NaN/inf are refused by :func:`.validation.as_float_array`."""
    arr = as_float_array(arg, value)
    bad = np.zeros(arr.shape, dtype=bool)
    if rng.low is not None:
        bad |= (arr <= rng.low) if rng.low_open else (arr < rng.low)
    if rng.high is not None:
        bad |= arr > rng.high
    if bad.any():
        idx = np.flatnonzero(bad.ravel())
        where = f"[{int(idx[0])}]" if arr.ndim else ""
        raise SeawayInputError(
            f"{arg}{where} = {show(arr.ravel()[idx[0]])} is not a plausible {rng.name} "
            f"(allowed {rng.text()}: {rng.reason})"
            + (f"; {idx.size} values in all" if idx.size > 1 else "")
        )
    return arr


def doubtful(rng: Range, arr: ArrayLike) -> NDArray[np.bool_]:
    """True where a value is possible but outside the soft bounds."""
    a = np.asarray(arr, dtype=float)
    out = np.zeros(a.shape, dtype=bool)
    if rng.doubt_low is not None:
        out |= a < rng.doubt_low
    if rng.doubt_high is not None:
        out |= a > rng.doubt_high
    return out


def sea_steepness(hs_m: ArrayLike, tp_s: ArrayLike, g_m_s2: float = 9.80665) -> NDArray[np.float64]:
    """Significant steepness Sp = Hs / Lp0 with Lp0 = g Tp^2 / (2 pi) [-] (DNV-RP-C205 3.5.5.4;
    deep-water wavelength of linear theory). Hs in m, Tp in s > 0."""
    tp = np.asarray(tp_s, dtype=float)
    return np.asarray(hs_m, dtype=float) * 2.0 * math.pi / (g_m_s2 * tp * tp)
