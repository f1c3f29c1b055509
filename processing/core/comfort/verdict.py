# SPDX-License-Identifier: GPL-2.0-or-later
"""From station motions to a verdict: MSI, the task's seakeeping criteria and the comfort class.

The one chain every caller uses (single-call facade, passage, sweep, seasonal climate):

1. MSI [%] of the vertical acceleration (:func:`.indices.msi_percent`; O'Hanlon & McCauley
   1974 for 2 h), from its mean absolute value sqrt(2/pi) * RMS (Gaussian process) and its
   mean encounter frequency sqrt(m2/m0) [rad/s];
2. NORDFORSK (1987) criteria of the station's task (:func:`.criteria.evaluate_criteria`): the
   largest value/limit ratio ("usage") and "exceeded" where usage > 1;
3. comfort class 0..4 (:func:`.indices.comfort_class`), always from the 2 h MSI and the usage,
   so that classes never depend on the exposure asked for.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..units import FloatArray
from .criteria import CriteriaAssessment, evaluate_criteria
from .indices import comfort_class, mean_abs_from_rms, msi_percent

__all__ = ["ComfortVerdict", "comfort_verdict"]


@dataclass(frozen=True)
class ComfortVerdict:
    """``msi_pct`` (n,) MSI for the exposure asked [%]; ``comfort_class`` (n,) int64 0..4;
    ``criteria`` the task's criteria check (usage, margins, exceeded)."""

    msi_pct: FloatArray
    comfort_class: NDArray[np.int64]
    criteria: CriteriaAssessment


def comfort_verdict(task: str, vacc_rms_m_s2: ArrayLike, vacc_omega_rad_s: ArrayLike,
                    lacc_rms_m_s2: ArrayLike, roll_rms_deg: ArrayLike, *,
                    exposure_h: float = 2.0) -> ComfortVerdict:
    """MSI for ``exposure_h`` [h], criteria of ``task`` and the comfort class (module docstring).

    vacc [m/s^2] RMS vertical acceleration at the station and its mean encounter frequency
    [rad/s]; lacc [m/s^2] RMS lateral specific force; roll [deg] RMS. Arrays broadcast to (n,).
    """
    crit = evaluate_criteria(task, vacc_rms_m_s2, lacc_rms_m_s2, roll_rms_deg)
    a_mean = mean_abs_from_rms(vacc_rms_m_s2)
    msi = msi_percent(a_mean, vacc_omega_rad_s, exposure_h)
    msi2 = msi if exposure_h == 2.0 else msi_percent(a_mean, vacc_omega_rad_s, 2.0)
    return ComfortVerdict(msi_pct=msi, comfort_class=comfort_class(msi2, crit.usage), criteria=crit)
