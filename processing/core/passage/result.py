# SPDX-License-Identifier: GPL-2.0-or-later
"""The record of one passage leg: per-sample results and their headline summary."""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Dict, List, Optional, Tuple

import numpy as np
from numpy.typing import NDArray

from ..comfort.exposure import NOT_COMPUTED_CLASS, hours_in_classes
from ..flags import flag_codes_array, flag_counts
from ..units import SECONDS_PER_HOUR, FloatArray
from .fields import with_motion_outputs

__all__ = ["NOT_COMPUTED_CLASS", "PassageSummary", "PassageResult"]


@dataclass(frozen=True)
class PassageSummary:
    """Headline figures of one passage (hours, NM; NaN where nothing was computed)."""

    leg: int
    n_samples: int
    n_computed: int
    distance_nm: float
    duration_h: float
    departure_utc: np.datetime64
    arrival_utc: np.datetime64
    hours_per_class: Dict[str, float]
    worst_index: Optional[int]
    max_hs_m: float
    max_msi_pct: float
    final_msdv: float
    final_vomit_pct: float
    flag_counts: Dict[str, int]
    worst_reason: str = ""
    exposure_h: float = float("nan")


@dataclass(frozen=True)
@with_motion_outputs
class PassageResult:
    """Per-sample results of one passage leg (arrays of length n; NaN where not computed).

    Public field names (the output layer's fields use the same names): ``leg``, ``seq``,
    ``eta_utc`` (datetime64[ms] UTC), ``dist_nm``, ``course_deg``, ``hs_m``, ``tp_s``,
    ``wave_from_deg``, ``depth_m`` (NaN = deep water assumed), ``wavelength_m``,
    ``celerity_m_s`` (peak component at local depth), ``rel_heading_deg`` (0 following,
    90 beam, 180 head), ``enc_period_s`` (NaN when overtaking); one float array per motion
    output of :data:`.fields.MOTION_OUTPUTS` (``heave_rms_m`` ... ``msi_pct``, MSI after
    O'Hanlon & McCauley 1974: share who would vomit after 2 HOURS at that sea state);
    ``msdv_cum`` [m/s^1.5] (ISO 2631-1), ``sick_pct_passage`` (ISO 2631-1 Annex D vomiting
    incidence from ``msdv_cum``: accumulated from departure to the sample, exposure = hours
    since departure), ``vomit_pct`` (the same array under its old name, kept for one release),
    ``comfort_class`` (0..4, :data:`NOT_COMPUTED_CLASS` = -1 where not computed),
    ``class_reason`` (measure, value and bound that set the class; '' where not classed),
    ``comfort_label`` ('' where not computed), ``flags`` (SampleFlag masks), ``source``; ``lon_deg``, ``lat_deg``,
    ``speed_kn``, ``dwell_s`` (time each sample stands for), ``is_vertex``, ``computed``.
    Passage-wide: ``vessel_name``, ``station_name``, ``method``, ``roll_period_s``,
    ``departure_utc``, ``partition_names``, ``notes``.
    """

    leg: NDArray[np.int64]
    seq: NDArray[np.int64]
    eta_utc: NDArray[np.datetime64]
    dist_nm: FloatArray
    course_deg: FloatArray
    hs_m: FloatArray
    tp_s: FloatArray
    wave_from_deg: FloatArray
    depth_m: FloatArray
    wavelength_m: FloatArray
    celerity_m_s: FloatArray
    rel_heading_deg: FloatArray
    enc_period_s: FloatArray
    msdv_cum: FloatArray
    vomit_pct: FloatArray
    comfort_class: NDArray[np.int64]
    comfort_label: Tuple[str, ...]
    flags: NDArray[np.int64]
    source: Tuple[str, ...]
    lon_deg: FloatArray
    lat_deg: FloatArray
    speed_kn: FloatArray
    dwell_s: FloatArray
    is_vertex: NDArray[np.bool_]
    computed: NDArray[np.bool_]
    vessel_name: str = ""
    station_name: str = ""
    method: str = ""
    roll_period_s: float = float("nan")
    departure_utc: Optional[np.datetime64] = None
    partition_names: Tuple[str, ...] = ()
    notes: Tuple[str, ...] = field(default_factory=tuple)
    sick_pct_passage: Optional[FloatArray] = None
    class_reason: Tuple[str, ...] = ()

    def __post_init__(self) -> None:
        # sick_pct_passage and vomit_pct are one array under two names (vomit_pct kept for one
        # release); a record built without reasons gets '' for every sample
        if self.sick_pct_passage is None:
            object.__setattr__(self, "sick_pct_passage", self.vomit_pct)
        if len(self.class_reason) != self.seq.size:
            object.__setattr__(self, "class_reason", ("",) * int(self.seq.size))

    @property
    def n(self) -> int:
        return int(self.seq.size)

    def flag_text(self) -> List[str]:
        """The comma-separated flag codes of every sample."""
        return flag_codes_array(self.flags)

    def flag_counts(self) -> Dict[str, int]:
        """How many samples carry each flag code."""
        return flag_counts(self.flags)

    def hours_per_class(self) -> Dict[str, float]:
        """Hours spent in each comfort class (label -> h), plus 'not computed'."""
        from ..comfort.indices import COMFORT_CLASS_LABELS

        hours, missing = hours_in_classes(self.comfort_class, self.dwell_s)
        out = {label: float(h) for label, h in zip(COMFORT_CLASS_LABELS, hours)}
        out["not computed"] = float(missing)
        return out

    def worst_index(self) -> Optional[int]:
        """Index of the worst computed sample (highest class, then highest vertical
        acceleration), or None when nothing was computed."""
        idx = np.flatnonzero(self.computed)
        if idx.size == 0:
            return None
        acc = np.nan_to_num(self.vacc_rms_m_s2[idx], nan=-1.0)  # type: ignore[attr-defined]
        order = np.lexsort((acc, self.comfort_class[idx]))
        return int(idx[order[-1]])

    def summary(self) -> PassageSummary:
        """Headline figures for reports and logs."""
        comp = self.computed

        def _max(a: FloatArray) -> float:
            v = a[comp & np.isfinite(a)]
            return float(v.max()) if v.size else float("nan")

        def _last(a: FloatArray) -> float:
            v = a[np.isfinite(a)]
            return float(v[-1]) if v.size else float("nan")

        return PassageSummary(
            leg=int(self.leg[0]) if self.n else 0, n_samples=self.n, n_computed=int(comp.sum()),
            distance_nm=float(self.dist_nm[-1]) if self.n else 0.0,
            duration_h=float(self.dwell_s.sum() / SECONDS_PER_HOUR),
            departure_utc=self.eta_utc[0], arrival_utc=self.eta_utc[-1],
            hours_per_class=self.hours_per_class(), worst_index=self.worst_index(),
            max_hs_m=_max(self.hs_m), max_msi_pct=_max(self.msi_pct),  # type: ignore[attr-defined]
            final_msdv=_last(self.msdv_cum), final_vomit_pct=_last(self.vomit_pct),
            flag_counts=self.flag_counts(), worst_reason=self._reason_at(self.worst_index()),
            exposure_h=_last_elapsed_h(self.sick_pct_passage, self.eta_utc),
        )

    def _reason_at(self, i: Optional[int]) -> str:
        return "" if i is None else str(self.class_reason[i])


def _last_elapsed_h(sick: FloatArray, eta_utc: NDArray[np.datetime64]) -> float:
    """Hours from the first sample (departure) to the last sample with a dose: the exposure of
    the passage's accumulated sickness share."""
    ok = np.flatnonzero(np.isfinite(sick))
    if ok.size == 0:
        return float("nan")
    return float((eta_utc[ok[-1]] - eta_utc[0]).astype("timedelta64[ms]").astype(np.float64) / 3.6e6)
