# SPDX-License-Identifier: GPL-2.0-or-later
"""Combined sea state derived from partitions or from mean periods (when the file lacks them).

* Combined height from partitions: ``Hs = sqrt(sum_i Hs_i^2)`` - partition variances add
  (spectral moment m0 is additive; Hm0 = 4 sqrt(m0); DNV-RP-C205 (2010) s.3.5.1 definition of
  Hs; Holthuijsen, Waves in Oceanic and Coastal Waters, 2007, s.4.2). A partition that is
  no-data where others have data counts as absent (no energy).
* Peak period and direction from partitions: those of the most energetic partition (largest
  Hs_i) (common practice, no source); where that partition has no period (or direction) the
  next most energetic one that has it is used and the sample flagged PARTIAL_VARIABLES.
* Peak period from a mean period for a JONSWAP spectrum with gamma = 3.3:
  ``Tp = Tm01 / 0.8343``, ``Tp = Tm02 / 0.7774``, ``Tp = Tm-1,0 / 0.9033``. The ratios are the
  JONSWAP moments of DNV-RP-C205 (2010) s.3.5.5 (their fits give Tz/Tp = 0.7776 and
  T1/Tp = 0.8348 at gamma 3.3, from memory); the tests recompute them by numerical
  integration. A real sea that is not JONSWAP(3.3) gives a different Tp: such samples carry
  PARTIAL_VARIABLES.
"""
from __future__ import annotations

from typing import Dict, Tuple

import numpy as np
from numpy.typing import NDArray

from ..units import FloatArray

JONSWAP_GAMMA = 3.3
TM01_OVER_TP = 0.8343
TM02_OVER_TP = 0.7774
TM10_OVER_TP = 0.9033
MEAN_PERIOD_RATIOS: Dict[str, float] = {"tm01": TM01_OVER_TP, "tm02": TM02_OVER_TP, "tm10": TM10_OVER_TP}


def tp_s_from_mean_period(mean_period_s: FloatArray, which: str) -> FloatArray:
    """Peak period [s] from Tm01, Tm02 or Tm-1,0 [s] for JONSWAP gamma 3.3: Tp = T / ratio."""
    return np.asarray(mean_period_s, dtype=float) / MEAN_PERIOD_RATIOS[which]


def hs_m_from_partitions(partition_hs_m: FloatArray) -> FloatArray:
    """Combined Hs [m] = sqrt(sum Hs_i^2) over the finite partitions of each row (NaN if none)."""
    p = np.asarray(partition_hs_m, dtype=float)
    if p.shape[1] == 0:
        return np.full(p.shape[0], np.nan)
    any_ok = np.isfinite(p).any(axis=1)
    total = np.sqrt(np.sum(np.where(np.isfinite(p), p * p, 0.0), axis=1))
    return np.where(any_ok, total, np.nan)


def dominant_partition(partition_hs_m: FloatArray) -> Tuple[NDArray[np.int64], NDArray[np.bool_]]:
    """Index of the most energetic partition per row and whether the row has any partition."""
    p = np.asarray(partition_hs_m, dtype=float)
    if p.shape[1] == 0:
        return np.zeros(p.shape[0], dtype=np.int64), np.zeros(p.shape[0], dtype=bool)
    any_ok = np.isfinite(p).any(axis=1)
    idx = np.argmax(np.where(np.isfinite(p), p, -np.inf), axis=1)
    return idx.astype(np.int64), any_ok
