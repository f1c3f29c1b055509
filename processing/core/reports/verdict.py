# SPDX-License-Identifier: GPL-2.0-or-later
"""Verdict lines shared by the reports: why a sample got its class, the sickness figures with
their exposure in hours, and the IMO guidance flags with their grade and clause.

Kept apart from the page layout (:mod:`.passage`, :mod:`.sweep`) so that the wording of a
verdict has one home.
"""
from __future__ import annotations

from typing import List, Mapping, Optional, Tuple

from ..comfort.guidance import CLAUSES
from ..flags import FLAG_CODES, SampleFlag
from ..passage.result import PassageResult, PassageSummary
from .html import fmt_num, fmt_time_utc

__all__ = ["worst_sample_line", "sickness_rows", "guidance_rows", "verdict_rows"]

_DANGER_OF = {
    SampleFlag.SURF_RIDING: SampleFlag.SURF_RIDING_DANGER,
    SampleFlag.HIGH_WAVE_GROUPS: SampleFlag.HIGH_WAVE_GROUPS_DANGER,
    SampleFlag.SYNC_ROLL: SampleFlag.SYNC_ROLL_DANGER,
    SampleFlag.PARAMETRIC_ROLL: SampleFlag.PARAMETRIC_ROLL_DANGER,
}


def worst_sample_line(r: PassageResult, s: PassageSummary) -> Optional[str]:
    """'#12 at ...: taxing because lateral acc. 0.11 g > 0.10 g (light manual work); Hs ...'."""
    i = s.worst_index
    if i is None:
        return None
    return (f"#{int(r.seq[i])} at {fmt_time_utc(r.eta_utc[i])}, {fmt_num(r.dist_nm[i], 1)} NM: "
            f"{r.comfort_label[i]} because {s.worst_reason}; Hs {fmt_num(r.hs_m[i])} m, vertical acc. "
            f"{fmt_num(r.vacc_rms_m_s2[i])} m/s2 RMS, lateral acc. {fmt_num(r.lacc_rms_m_s2[i])} m/s2 RMS, "
            f"roll {fmt_num(r.roll_rms_deg[i], 1)} deg RMS, MSI (2 h exposure) {fmt_num(r.msi_pct[i], 1)} %")


def sickness_rows(s: PassageSummary) -> List[Tuple[str, str]]:
    """MSI as a 2-hour figure and the ISO 2631-1 share accumulated over the passage's hours."""
    return [
        ("Highest MSI (2 h exposure at that sea state)", f"{fmt_num(s.max_msi_pct, 1)} %"),
        (f"Share who may vomit over the {fmt_num(s.exposure_h, 1)} h from departure (ISO 2631-1 Annex D)",
         f"{fmt_num(s.final_vomit_pct, 1)} %"),
    ]


def guidance_rows(counts: Mapping[str, int]) -> List[Tuple[str, str]]:
    """One row per IMO guidance flag present: code, samples per grade and the clause."""
    rows = []
    for flag, danger in _DANGER_OF.items():
        n_any = counts.get(FLAG_CODES[flag], 0)
        if not n_any:
            continue
        n_d = counts.get(FLAG_CODES[danger], 0)
        grades = f"{n_d} danger, {n_any - n_d} advisory" if n_d else f"{n_any} advisory"
        rows.append((f"{FLAG_CODES[flag]} ({CLAUSES[flag]})", f"{grades} samples"))
    return rows


def verdict_rows(r: PassageResult, s: PassageSummary) -> List[Tuple[str, str]]:
    """The leg's verdict rows: the class reason of the worst sample, sickness with exposure,
    and the graded guidance flags."""
    rows: List[Tuple[str, str]] = []
    if s.worst_index is not None:
        rows.append(("Worst class set by", f"{r.comfort_label[s.worst_index]}: {s.worst_reason}"))
    return rows + sickness_rows(s) + guidance_rows(s.flag_counts)

