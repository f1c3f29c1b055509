# SPDX-License-Identifier: GPL-2.0-or-later
"""Seakeeping criteria by type of work (NORDFORSK 1987) and their margins at a station.

Source: NORDFORSK (1987) "Assessment of Ship Performance in a Seaway", Nordic Co-operative
Project "Seakeeping performance of ships" (as widely reproduced, e.g. Faltinsen 1990 "Sea Loads
on Ships and Offshore Structures"). THE TABLE BELOW IS FROM MEMORY (not verified against the
report). All limits are RMS values; "g" is standard gravity 9.80665 m/s^2.

| task               | vertical acc. | lateral acc. | roll  |
|--------------------|---------------|--------------|-------|
| light manual work  | 0.20 g        | 0.10 g       | 6.0 deg |
| heavy manual work  | 0.15 g        | 0.07 g       | 4.0 deg |
| intellectual work  | 0.10 g        | 0.05 g       | 3.0 deg |
| transit passengers | 0.05 g        | 0.04 g       | 2.5 deg |
| cruise liner       | 0.02 g        | 0.03 g       | 2.0 deg |

Margin of a criterion = 1 - value/limit (1 = no motion, 0 = at the limit, < 0 exceeded).
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Dict, Mapping, Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..units import G_STANDARD_M_S2, FloatArray
from ..validation import SeawayInputError, require_nonnegative, show

__all__ = [
    "TaskCriterion",
    "NORDFORSK_TASKS",
    "CRITERION_NAMES",
    "CriteriaAssessment",
    "evaluate_criteria",
]


@dataclass(frozen=True)
class TaskCriterion:
    """RMS limits for one type of work: accelerations in g, roll in degrees."""

    task: str
    label: str
    vacc_rms_g: float
    lacc_rms_g: float
    roll_rms_deg: float


NORDFORSK_TASKS: Mapping[str, TaskCriterion] = {
    c.task: c
    for c in (
        TaskCriterion("light_manual_work", "light manual work", 0.20, 0.10, 6.0),
        TaskCriterion("heavy_manual_work", "heavy manual work", 0.15, 0.07, 4.0),
        TaskCriterion("intellectual_work", "intellectual work", 0.10, 0.05, 3.0),
        TaskCriterion("transit_passengers", "transit passengers", 0.05, 0.04, 2.5),
        TaskCriterion("cruise_liner", "cruise liner", 0.02, 0.03, 2.0),
    )
}

CRITERION_NAMES: Tuple[str, ...] = ("vertical_acceleration", "lateral_acceleration", "roll")


@dataclass(frozen=True)
class CriteriaAssessment:
    """Criteria check of one station for n samples.

    ``margins``: criterion name -> (n,) margin 1 - value/limit; ``usage`` (n,) largest
    value/limit ratio; ``exceeded`` (n,) True where any value > its limit.
    """

    task: str
    margins: Dict[str, FloatArray]
    usage: FloatArray
    exceeded: NDArray[np.bool_]


def evaluate_criteria(
    task: str,
    vacc_rms_m_s2: ArrayLike,
    lacc_rms_m_s2: ArrayLike,
    roll_rms_deg: ArrayLike,
    *,
    g_m_s2: float = G_STANDARD_M_S2,
) -> CriteriaAssessment:
    """Pass/fail and margins of the NORDFORSK (1987) task criteria (table from memory).

    vacc/lacc [m/s^2] RMS, roll [deg] RMS, >= 0, broadcast to (n,). Unknown task -> error
    listing the known tasks.
    """
    if task not in NORDFORSK_TASKS:
        raise SeawayInputError(
            f"unknown criteria task {show(task)}; known tasks: {', '.join(NORDFORSK_TASKS)}"
        )
    c = NORDFORSK_TASKS[task]
    v = require_nonnegative("vacc_rms_m_s2", vacc_rms_m_s2)
    lat = require_nonnegative("lacc_rms_m_s2", lacc_rms_m_s2)
    r = require_nonnegative("roll_rms_deg", roll_rms_deg)
    try:
        v, lat, r = np.broadcast_arrays(v, lat, r)
    except ValueError as exc:
        raise SeawayInputError(
            f"vacc_rms_m_s2 {v.shape}, lacc_rms_m_s2 {lat.shape}, roll_rms_deg {r.shape} do not broadcast"
        ) from exc
    ratios = {
        "vertical_acceleration": v / (c.vacc_rms_g * g_m_s2),
        "lateral_acceleration": lat / (c.lacc_rms_g * g_m_s2),
        "roll": r / c.roll_rms_deg,
    }
    usage = np.maximum.reduce([ratios[n] for n in CRITERION_NAMES])
    return CriteriaAssessment(
        task=task,
        margins={n: np.asarray(1.0 - ratios[n], dtype=float) for n in CRITERION_NAMES},
        usage=np.asarray(usage, dtype=float),
        exceeded=np.asarray(usage > 1.0, dtype=bool),
    )
