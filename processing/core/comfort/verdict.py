# SPDX-License-Identifier: GPL-2.0-or-later
"""From station motions to a verdict: MSI, the task's seakeeping criteria and the comfort class.

The one chain every caller uses (single-call facade, passage, sweep, seasonal climate):

1. MSI [%] of the vertical acceleration (:func:`.indices.msi_percent`; O'Hanlon & McCauley
   1974 for 2 h), from its mean absolute value sqrt(2/pi) * RMS (Gaussian process) and its
   mean encounter frequency sqrt(m2/m0) [rad/s];
2. NORDFORSK (1987) criteria of the station's task (:func:`.criteria.evaluate_criteria`): the
   largest value/limit ratio ("usage") and "exceeded" where usage > 1;
3. comfort class 0..4 (:func:`.indices.comfort_class`), always from the 2 h MSI and the usage,
   so that classes never depend on the exposure asked for;
4. the reason for the class (:func:`class_drivers`, :func:`class_reason`): the measure, its
   value and the bound that set it, in words.

MSI is always stated as the share of people who would vomit after 2 hours at that sea state
(O'Hanlon & McCauley 1974); the share accumulated along a passage is the ISO 2631-1 dose
(:mod:`.exposure`, :func:`.indices.vomiting_share_pct`).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from typing import Tuple

from ..units import G_STANDARD_M_S2, FloatArray
from .criteria import NORDFORSK_TASKS, CriteriaAssessment, evaluate_criteria
from .indices import MSI_CLASS_BOUNDS_PCT, USAGE_CLASS_BOUNDS, comfort_class, mean_abs_from_rms, msi_percent

__all__ = ["ComfortVerdict", "comfort_verdict", "DRIVERS", "class_drivers", "class_reason", "class_reasons"]


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


# --------------------------------------------------------------------------- class reasons
DRIVERS: Tuple[str, ...] = ("MSI", "vertical acc.", "lateral acc.", "roll")
"""What set a sample's comfort class (:func:`class_drivers` codes 0..3); -1 = not classed."""
_CRIT_OF_DRIVER = {1: "vertical_acceleration", 2: "lateral_acceleration", 3: "roll"}


def class_drivers(task: str, msi2_pct: ArrayLike, vacc_rms_m_s2: ArrayLike, lacc_rms_m_s2: ArrayLike,
                  roll_rms_deg: ArrayLike) -> NDArray[np.int8]:
    """Which measure set the comfort class of each sample (index into :data:`DRIVERS`).

    The class is the worse of the MSI scale and the criteria-usage scale
    (:func:`.indices.comfort_class`); the driver is the measure whose own scale reaches that
    class. Ties: a criterion when the class is 'taxing' or worse (a limit is exceeded), else
    MSI. Within the criteria, the one with the largest value/limit ratio. Our own rule.
    """
    crit = evaluate_criteria(task, vacc_rms_m_s2, lacc_rms_m_s2, roll_rms_deg)
    ratios = np.stack([1.0 - crit.margins[_CRIT_OF_DRIVER[d]] for d in (1, 2, 3)])
    worst_crit = np.argmax(ratios, axis=0) + 1
    c_msi = comfort_class(msi2_pct, 0.0)
    c_use = comfort_class(0.0, crit.usage)
    use_wins = (c_use > c_msi) | ((c_use == c_msi) & (c_use >= 3))
    return np.where(use_wins, worst_crit, 0).astype(np.int8)


def _g(x: float) -> str:
    return f"{x:.2f} g" if x >= 0.095 else f"{x:.3f} g"


def _criterion_text(task: str, d: int, vacc: float, lacc: float, roll: float) -> str:
    """'lateral acc. 0.11 g > 0.10 g (light manual work)' and the like for driver ``d``."""
    c = NORDFORSK_TASKS[task]
    value, limit = {1: (vacc / G_STANDARD_M_S2, c.vacc_rms_g), 2: (lacc / G_STANDARD_M_S2, c.lacc_rms_g),
                    3: (roll, c.roll_rms_deg)}[d]
    fmt = _g if d in (1, 2) else (lambda x: f"{x:.1f} deg")
    if d in (1, 2) and f"{value:.2f}" == f"{limit:.2f}":
        fmt = lambda x: f"{x:.3f} g"  # noqa: E731 - one more digit where two would read as equal
    lim = f"{limit:.2f} g" if d in (1, 2) else f"{limit:.1f} deg"
    use = value / limit
    if use >= 1.0:
        return f"{DRIVERS[d]} {fmt(value)} {'>' if use > 1.0 else '>='} {lim} ({c.label})"
    bounds = [b for b in USAGE_CLASS_BOUNDS if b <= use]
    if bounds:
        return f"{DRIVERS[d]} {fmt(value)} >= {bounds[-1] * 100:.0f} % of {lim} ({c.label})"
    return f"{DRIVERS[d]} {fmt(value)} < {USAGE_CLASS_BOUNDS[0] * 100:.0f} % of {lim} ({c.label})"


def class_reason(task: str, driver: int, msi2_pct: float, vacc_rms_m_s2: float, lacc_rms_m_s2: float,
                 roll_rms_deg: float) -> str:
    """One sample's class reason: the measure, its value and the bound that set the class, e.g.
    ``MSI 12.3 % >= 10 %`` or ``lateral acc. 0.11 g > 0.10 g (light manual work)``; a 'smooth'
    sample names both scales (``MSI 0.4 % < 2 %; roll 0.8 deg < 50 % of 6.0 deg (...)``).
    '' when ``driver`` < 0 (not classed). Bounds: :data:`.indices.MSI_CLASS_BOUNDS_PCT` and
    :data:`.indices.USAGE_CLASS_BOUNDS` of the NORDFORSK limits (:mod:`.criteria`)."""
    if driver < 0:
        return ""
    if driver == 0:
        reached = [b for b in MSI_CLASS_BOUNDS_PCT if b <= msi2_pct]
        if reached:
            return f"MSI {msi2_pct:.1f} % >= {reached[-1]:g} %"
        crit = evaluate_criteria(task, vacc_rms_m_s2, lacc_rms_m_s2, roll_rms_deg)
        d = 1 + int(np.argmax([1.0 - float(crit.margins[_CRIT_OF_DRIVER[k]]) for k in (1, 2, 3)]))
        other = _criterion_text(task, d, vacc_rms_m_s2, lacc_rms_m_s2, roll_rms_deg)
        return f"MSI {msi2_pct:.1f} % < {MSI_CLASS_BOUNDS_PCT[0]:g} %; {other}"
    return _criterion_text(task, driver, vacc_rms_m_s2, lacc_rms_m_s2, roll_rms_deg)


def class_reasons(task: str, drivers: ArrayLike, msi2_pct: ArrayLike, vacc_rms_m_s2: ArrayLike,
                  lacc_rms_m_s2: ArrayLike, roll_rms_deg: ArrayLike) -> Tuple[str, ...]:
    """:func:`class_reason` for every sample ('' where the driver is -1)."""
    d = np.asarray(drivers).ravel()
    cols = [np.asarray(a, dtype=float).ravel() for a in (msi2_pct, vacc_rms_m_s2, lacc_rms_m_s2, roll_rms_deg)]
    return tuple(class_reason(task, int(d[i]), *(float(c[i]) for c in cols)) if d[i] >= 0 else ""
                 for i in range(d.size))
