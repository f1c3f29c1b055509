# SPDX-License-Identifier: GPL-2.0-or-later
"""The motion outputs of a passage, declared once.

:data:`MOTION_OUTPUTS` lists every per-sample motion and comfort figure the passage takes from
:func:`.api.assess_motions`, in the order of the output layer's fields. This one list drives
the result record (:class:`.result.PassageResult` gets one float array field per entry), the
copy from the motion assessment (:mod:`.respond`), the layer fields
(``processing/adapters.py`` ``POINT_FIELDS``) and the report's sample columns. Adding an
output means adding one line here (and computing it in :func:`.api.assess_motions`).
Field names are public interface: never rename.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Dict, Optional, Tuple

__all__ = ["MotionOutput", "MOTION_OUTPUTS", "MOTION_OUTPUT_NAMES", "ENSEMBLE_OUTPUTS", "ENSEMBLE_OUTPUT_NAMES",
           "with_motion_outputs"]


@dataclass(frozen=True)
class MotionOutput:
    """One per-sample output: ``name`` (result attribute and layer field), ``unit``, ``label``
    (report column heading) and ``report_digits`` (decimals in the report; None = not in the
    report's sample table)."""

    name: str
    unit: str
    label: str
    report_digits: Optional[int] = None


MOTION_OUTPUTS: Tuple[MotionOutput, ...] = (
    MotionOutput("heave_rms_m", "m", "heave m", 2),
    MotionOutput("pitch_rms_deg", "deg", "pitch deg", 1),
    MotionOutput("roll_rms_deg", "deg", "roll deg", 1),
    MotionOutput("heave_tz_s", "s", "heave Tz s"),
    MotionOutput("pitch_tz_s", "s", "pitch Tz s"),
    MotionOutput("roll_tz_s", "s", "roll Tz s"),
    MotionOutput("vacc_rms_m_s2", "m/s^2", "v.acc m/s2", 2),
    MotionOutput("lacc_rms_m_s2", "m/s^2", "l.acc m/s2"),
    MotionOutput("vacc_wf_rms_m_s2", "m/s^2", "v.acc Wf m/s2"),
    MotionOutput("msi_pct", "%", "MSI %", 1),
    MotionOutput("sway_rms_m", "m", "sway m"),
    MotionOutput("yaw_rms_deg", "deg", "yaw deg"),
)
"""RMS motions, mean zero-crossing encounter periods, RMS vertical acceleration, lateral
specific force and ISO 2631-1 Wf-weighted vertical acceleration at the station, the
motion sickness incidence (2 h), and RMS sway (midships) and yaw (strip model; NULL for the
closed form, which has neither); see :class:`.api.MotionAssessment`."""

MOTION_OUTPUT_NAMES: Tuple[str, ...] = tuple(o.name for o in MOTION_OUTPUTS)

ENSEMBLE_OUTPUTS: Tuple[MotionOutput, ...] = (
    MotionOutput("members", "", "members"),
    MotionOutput("prob_taxing_pct", "%", "P(taxing+) %", 0),
    MotionOutput("prob_criteria_pct", "%", "P(criteria) %", 0),
    MotionOutput("msi_p10_pct", "%", "MSI p10 %", 1),
    MotionOutput("msi_p50_pct", "%", "MSI p50 %", 1),
    MotionOutput("msi_p90_pct", "%", "MSI p90 %", 1),
)
"""Per-point figures of an ensemble passage (:mod:`.ensemble`): members with results, share of
members in comfort class taxing or worse, share with a seakeeping criterion exceeded, and the
10th/50th/90th percentiles of the members' MSI. Field names are public interface."""

ENSEMBLE_OUTPUT_NAMES: Tuple[str, ...] = tuple(o.name for o in ENSEMBLE_OUTPUTS)


def with_motion_outputs(cls: Any) -> Any:
    """Class decorator (apply before ``@dataclass``): one ``FloatArray`` field per motion
    output, placed before the first field that has a default."""
    ann: Dict[str, Any] = dict(cls.__dict__.get("__annotations__", {}))
    names = list(ann)
    cut = next((i for i, k in enumerate(names) if k in cls.__dict__), len(names))
    out = {k: ann[k] for k in names[:cut]}
    out.update({o.name: "FloatArray" for o in MOTION_OUTPUTS})
    out.update({k: ann[k] for k in names[cut:]})
    cls.__annotations__ = out
    return cls
