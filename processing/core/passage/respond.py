# SPDX-License-Identifier: GPL-2.0-or-later
"""Step 3 of a passage: motions, comfort and the cumulative dose at every sample with sea data.

* Peak-component kinematics: wavelength L and phase speed c of a linear wave of period Tp at
  local depth h from omega**2 = g k tanh(k h) (Airy theory; USACE Shore Protection Manual 1984
  ch. 2), via :func:`..waves.dispersion.wave_kinematics`.
* Relative heading mu (0 following, 90 beam, 180 head; ITTC convention) and encounter period
  Te = 2 pi / |omega - k U cos mu| (Lewis (ed.) 1989, Principles of Naval Architecture vol. III
  ch. 8), via :mod:`..waves.encounter`; undefined (NaN, flag OUTRUN) when the vessel overtakes.
* Motions, MSI, criteria and comfort class from :func:`..api.assess_motions`.
* Cumulative motion sickness dose (ISO 2631-1:1997 Annex D) with the trapezoid rule on a_w**2
  (:mod:`..comfort.exposure`); intervals with an end point without sea data contribute nothing
  (noted in ``notes``).

:func:`respond_motions` works on any :class:`.plan.Track` (the sweep's stacked departures too);
:func:`respond` adds what belongs to one passage (dose, dwell, the result record).
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Dict, List, Optional, Tuple

import numpy as np
from numpy.typing import NDArray

from ..comfort.exposure import NOT_COMPUTED_CLASS, dose_intervals, dwell_s
from ..flags import UNCLASSED_FLAGS, SampleFlag
from ..plausibility import HS_M, TP_S
from ..units import FloatArray, m_s_from_kn, nm_from_m
from ..validation import SeawayInputError, require_positive
from .fields import MOTION_OUTPUT_NAMES
from .plan import PassagePlan, Track
from .progress import Progress, Span
from .result import PassageResult
from .sample import SeaAtSamples

__all__ = ["RESPONSE_CHUNK", "SHALLOW_DEPTH_PER_WAVELENGTH", "SampleMotions", "respond_motions", "respond",
           "passage_result"]

SHALLOW_DEPTH_PER_WAVELENGTH: float = 1.0 / 20.0
"""Shallow-water limit h/L < 1/20 (USACE Shore Protection Manual 1984, ch. 2)."""

RESPONSE_CHUNK: int = 256
"""Samples per response call on the exact path (progress and cancel are checked between)."""


@dataclass(frozen=True)
class SampleMotions:
    """Motions at every sample of a track (NaN where not computed).

    ``wavelength_m``, ``celerity_m_s``, ``rel_heading_deg``, ``enc_period_s`` (peak component);
    ``outputs`` one array per :data:`.fields.MOTION_OUTPUTS` name; ``comfort_class`` (-1 where
    not computed); ``class_driver`` what set the class (:data:`..comfort.verdict.DRIVERS` index,
    -1 where not computed); ``task`` the station's criteria task; ``flags`` the sea's flags plus the response's; ``computed`` mask; and the
    station, method and natural roll period used.
    """

    wavelength_m: FloatArray
    celerity_m_s: FloatArray
    rel_heading_deg: FloatArray
    enc_period_s: FloatArray
    outputs: Dict[str, FloatArray]
    comfort_class: NDArray[np.int64]
    flags: NDArray[np.int64]
    computed: NDArray[np.bool_]
    station_name: str
    method: str
    roll_period_s: float
    class_driver: NDArray[np.int8]
    task: str

    def class_reasons(self) -> Tuple[str, ...]:
        """The class reason of every sample ('' where not classed), see
        :func:`..comfort.verdict.class_reason`."""
        from ..comfort.verdict import class_reasons

        o = self.outputs
        return class_reasons(self.task, self.class_driver, o["msi_pct"], o["vacc_rms_m_s2"], o["lacc_rms_m_s2"],
                             o["roll_rms_deg"])


def _computable(sea: SeaAtSamples) -> NDArray[np.bool_]:
    """Samples with a usable sea state (Hs = 0, flat calm, is a value, not missing data).

    A sea flagged ODDVALUE (a value outside its plausible range, e.g. Tp stored in ms or Hs in
    cm) is not usable: such samples get NULL motions and no class (:data:`..flags.UNCLASSED_FLAGS`).
    """
    comp = sea.valid & np.isfinite(sea.hs_m) & np.isfinite(sea.tp_s) & np.isfinite(sea.wave_from_deg)
    comp &= (sea.flags & int(UNCLASSED_FLAGS)) == 0
    comp &= _possible(sea.hs_m, sea.tp_s)
    if sea.partition_names:  # a partition with an impossible value spoils its sample (NaN = absent)
        p_hs, p_tp = sea.partition_hs_m, sea.partition_tp_s
        given = np.isfinite(p_hs) & np.isfinite(p_tp)
        comp &= ~(given & ~_possible(np.where(given, p_hs, 0.0), np.where(given, p_tp, TP_S.low))).any(axis=1)
    return comp


def _possible(hs: FloatArray, tp: FloatArray) -> NDArray[np.bool_]:
    """Hs and Tp inside the hard bounds of :mod:`..plausibility` (outside: left uncomputed, the
    sampler's IMPLAUSIBLE_VALUE flag says why)."""
    with np.errstate(invalid="ignore"):
        return (hs >= HS_M.low) & (hs <= HS_M.high) & (tp >= TP_S.low) & (tp <= TP_S.high)


def _kinematics(track: Track, sea: SeaAtSamples, idx: NDArray[np.int64], depth_arg: FloatArray,
                flags: NDArray[np.int64]) -> Tuple[FloatArray, ...]:
    """Wavelength, celerity, relative heading and encounter period at ``idx``; OUTRUN and
    SHALLOW flags added to ``flags``."""
    from ..waves.dispersion import wave_kinematics
    from ..waves.encounter import encounter_period, relative_heading_deg

    out = tuple(np.full(track.n, np.nan) for _ in range(4))
    if idx.size == 0:
        return out
    wavelength, celerity, rel, enc = out
    kin = wave_kinematics(sea.tp_s[idx], depth_arg[idx])
    wavelength[idx], celerity[idx] = kin.wavelength_m, kin.celerity_m_s
    rel[idx] = np.asarray(relative_heading_deg(track.course_deg[idx], sea.wave_from_deg[idx]), dtype=float)
    ep = encounter_period(sea.tp_s[idx], m_s_from_kn(track.speed_kn[idx]), rel[idx], depth_arg[idx])
    over = np.asarray(ep.overtaking, dtype=bool)
    enc[idx] = np.where(over, np.nan, np.asarray(ep.period_s, dtype=float))
    flags[idx[over]] |= int(SampleFlag.OVERTAKING)
    shallow = np.isfinite(sea.depth_m[idx]) & (sea.depth_m[idx] < SHALLOW_DEPTH_PER_WAVELENGTH * kin.wavelength_m)
    flags[idx[shallow]] |= int(SampleFlag.SHALLOW_WATER)
    return out


def _partitions(sea: SeaAtSamples, chunk: NDArray[np.int64], gamma: float, spread_s: float) -> object:
    """The sea's partitions at ``chunk`` as :class:`..api.SeaPartitions` (None without); swell
    partitions get the narrower swell spreading (:func:`..waves.spectra.partition_spread_s`)."""
    from ..api import SeaPartitions
    from ..waves.spectra import partition_spread_s

    if not sea.partition_names:
        return None
    p_hs, p_tp, p_dir = (a[chunk].copy() for a in (sea.partition_hs_m, sea.partition_tp_s, sea.partition_from_deg))
    hs, tp, wdir = sea.hs_m[chunk], sea.tp_s[chunk], sea.wave_from_deg[chunk]
    # a partition missing at a sample carries no energy there; give it the combined period
    # and direction so the (zero) term stays finite
    miss = ~(np.isfinite(p_hs) & np.isfinite(p_tp) & np.isfinite(p_dir) & (p_tp > 0))
    if miss.any():
        p_hs[miss] = 0.0
        p_tp = np.where(miss, tp[:, None], p_tp)
        p_dir = np.where(miss, wdir[:, None], p_dir)
    empty = p_hs.sum(axis=1) <= 0.0
    if empty.any():
        p_hs[empty, 0], p_tp[empty, 0], p_dir[empty, 0] = hs[empty], tp[empty], wdir[empty]
    p = p_hs.shape[1]
    return SeaPartitions(hs_m=p_hs, tp_s=p_tp, wave_from_deg=p_dir, gamma=np.full(p, gamma),
                         spread_s=partition_spread_s(sea.partition_names, spread_s),
                         names=tuple(sea.partition_names))


def _chosen_method(method: Optional[str], track: Track, idx: NDArray[np.int64], profile: object,
                   station: Optional[str], gamma: float, spread_s: float, long_crested: bool, n_partitions: int) -> str:
    """The method for the whole track, decided once (:func:`..api.choose_method` on the computed
    samples): the table path builds its tables from the speeds of one call, so it gets every
    sample in one call (the same numbers whatever the chunking); the exact path runs in chunks
    so progress and cancel work."""
    from ..api import choose_method

    if method not in (None, "auto"):
        return str(method)
    p = max(1, n_partitions)
    return choose_method(profile, idx.size, speed_m_s=m_s_from_kn(track.speed_kn[idx]), station=station,  # type: ignore[arg-type]
                         gamma=np.full(p, gamma), spread_s=np.full(p, spread_s), long_crested=long_crested)


def _aground_flags(depth_m: FloatArray, profile: object) -> NDArray[np.int64]:
    """DRYDEPTH where the charted depth is no more than the vessel's draught (the vessel would
    touch bottom there; common practice, no source: no under-keel margin assumed). SHALLOW keeps
    its own rule (depth < L/20, :func:`_kinematics`)."""
    draught = float(getattr(profile, "draught_m", 0.0) or 0.0)
    with np.errstate(invalid="ignore"):
        under = np.isfinite(depth_m) & (depth_m <= draught)
    return np.where(under, int(SampleFlag.DEPTH_ON_LAND), 0).astype(np.int64)


def respond_motions(track: Track, sea: SeaAtSamples, profile: object, *, station: Optional[str] = None,
                    gamma: float = 3.3, spread_s: float = 4.0, long_crested: bool = False,
                    method: Optional[str] = None, progress: Optional[Progress] = None) -> SampleMotions:
    """Motions and comfort class at every sample of ``track`` with a usable sea state.

    Calls :func:`..api.assess_motions` on those samples only, with the partitions when the sea
    has them; ``method`` None chooses once per track as the api does. Progress runs to 0.95.
    """
    from ..api import assess_motions

    span = Span(progress)
    n = track.n
    if sea.hs_m.size != n:
        raise SeawayInputError(f"sea has {sea.hs_m.size} samples but the plan has {n}")
    gamma_v, spread_v = float(require_positive("gamma", gamma)), float(require_positive("spread_s", spread_s))
    flags, comp = sea.flags.copy(), _computable(sea)
    flags |= _aground_flags(sea.depth_m, profile)
    idx = np.flatnonzero(comp)
    depth_arg = np.where(np.isfinite(sea.depth_m), sea.depth_m, np.inf)
    kin = _kinematics(track, sea, idx, depth_arg, flags)
    span.check(0.05)
    outputs = {k: np.full(n, np.nan) for k in MOTION_OUTPUT_NAMES}
    cls = np.full(n, NOT_COMPUTED_CLASS, dtype=np.int64)
    info = {"station": station or "", "method": method or "", "roll": float("nan")}
    chosen = _chosen_method(method, track, idx, profile, station, gamma_v, spread_v, bool(long_crested),
                            len(sea.partition_names))
    step = RESPONSE_CHUNK if chosen == "exact" else max(idx.size, 1)
    for start in range(0, idx.size, step):
        chunk = idx[start:start + step]
        res = assess_motions(
            profile, hs_m=sea.hs_m[chunk], tp_s=sea.tp_s[chunk], wave_from_deg=sea.wave_from_deg[chunk],
            course_deg=track.course_deg[chunk], speed_m_s=m_s_from_kn(track.speed_kn[chunk]),
            depth_m=depth_arg[chunk] if np.isfinite(sea.depth_m[chunk]).any() else None, station=station,
            gamma=gamma_v, spread_s=spread_v, long_crested=bool(long_crested),
            partitions=_partitions(sea, chunk, gamma_v, spread_v), method=chosen,
        )
        for k in MOTION_OUTPUT_NAMES:
            outputs[k][chunk] = np.asarray(getattr(res, k), dtype=float)
        cls[chunk] = np.asarray(res.comfort_class, dtype=np.int64)
        flags[chunk] |= np.asarray(res.flags, dtype=np.int64)
        info.update(station=str(res.station or info["station"]), method=str(res.method or info["method"]),
                    roll=float(res.roll_period_s))
        span.check(0.05 + 0.9 * (start + chunk.size) / max(idx.size, 1))
    task = profile.station(station).task  # type: ignore[attr-defined]
    return SampleMotions(*kin, outputs=outputs, comfort_class=cls, flags=flags, computed=comp,
                         station_name=str(info["station"]), method=str(info["method"]),
                         roll_period_s=float(info["roll"]), class_driver=_drivers(task, outputs, cls), task=task)


def _drivers(task: str, outputs: Dict[str, FloatArray], cls: NDArray[np.int64]) -> NDArray[np.int8]:
    """What set each sample's class (-1 where not classed); MSI here is the 2 h MSI that the
    class uses (:func:`..api.assess_motions` default exposure)."""
    from ..comfort.verdict import class_drivers

    out = np.full(cls.size, -1, dtype=np.int8)
    ok = cls >= 0
    if ok.any():
        out[ok] = class_drivers(task, outputs["msi_pct"][ok], outputs["vacc_rms_m_s2"][ok],
                                outputs["lacc_rms_m_s2"][ok], outputs["roll_rms_deg"][ok])
    return out


def _passage_dose(t_s: FloatArray, aw: FloatArray, comp: NDArray[np.bool_],
                  notes: List[str]) -> Tuple[FloatArray, FloatArray]:
    """Cumulative MSDV [m/s^1.5] and share who may vomit [%] along one passage (NaN where not
    computed); notes the intervals left out of the dose."""
    from ..comfort.indices import msdv_cumulative, vomiting_share_pct

    a_int, dt_int = dose_intervals(t_s, aw)
    msdv = np.asarray(msdv_cumulative(a_int, dt_int), dtype=float).copy()
    msdv[~comp] = np.nan
    gap = np.count_nonzero((dt_int == 0.0)[1:] & (np.diff(t_s) > 0))
    if comp.any() and gap:
        notes.append(f"the cumulative dose (msdv_cum) leaves out {gap} sample intervals without sea data")
    vomit = np.full(aw.size, np.nan)
    if comp.any():
        vomit[comp] = np.asarray(vomiting_share_pct(msdv[comp]), dtype=float)
    return msdv, vomit


def respond(plan: PassagePlan, sea: SeaAtSamples, profile: object, *, station: Optional[str] = None,
            gamma: float = 3.3, spread_s: float = 4.0, long_crested: bool = False,
            method: Optional[str] = None, progress: Optional[Progress] = None) -> PassageResult:
    """Motions and comfort at every sample with sea data (:func:`respond_motions`), and the
    cumulative dose along the passage; the whole :class:`.result.PassageResult`."""
    span = Span(progress)
    mot = respond_motions(plan, sea, profile, station=station, gamma=gamma, spread_s=spread_s,
                          long_crested=long_crested, method=method, progress=span)
    out = passage_result(plan, sea, mot, profile)
    span.check(1.0)
    return out


def passage_result(plan: PassagePlan, sea: SeaAtSamples, mot: SampleMotions, profile: object) -> PassageResult:
    """The :class:`.result.PassageResult` of one passage from its sea and motions (adds the
    cumulative dose along the passage)."""
    from ..comfort.indices import COMFORT_CLASS_LABELS

    t_s, notes = plan.elapsed_s, list(sea.notes)
    if mot.computed.any() and not np.isfinite(mot.outputs["sway_rms_m"][mot.computed]).any():
        notes.append("sway_rms_m and yaw_rms_deg are not computed by this motion model (closed form or "
                     "RAO table): left empty")
    msdv, vomit = _passage_dose(t_s, mot.outputs["vacc_wf_rms_m_s2"], mot.computed, notes)
    n = plan.n
    return PassageResult(
        leg=np.full(n, plan.leg, dtype=np.int64), seq=np.arange(n, dtype=np.int64), eta_utc=plan.eta_utc.copy(),
        dist_nm=np.asarray(nm_from_m(plan.dist_m), dtype=float), course_deg=plan.course_deg.copy(),
        hs_m=np.where(sea.valid, sea.hs_m, np.nan), tp_s=np.where(sea.valid, sea.tp_s, np.nan),
        wave_from_deg=np.where(sea.valid, sea.wave_from_deg, np.nan), depth_m=sea.depth_m.copy(),
        wavelength_m=mot.wavelength_m, celerity_m_s=mot.celerity_m_s, rel_heading_deg=mot.rel_heading_deg,
        enc_period_s=mot.enc_period_s, **mot.outputs, msdv_cum=msdv, vomit_pct=vomit,
        comfort_class=mot.comfort_class,
        comfort_label=tuple(COMFORT_CLASS_LABELS[c] if c >= 0 else "" for c in mot.comfort_class),
        flags=mot.flags, source=tuple(sea.source), lon_deg=plan.lon_deg.copy(), lat_deg=plan.lat_deg.copy(),
        speed_kn=plan.speed_kn.copy(), dwell_s=dwell_s(t_s), is_vertex=plan.is_vertex.copy(),
        computed=mot.computed, vessel_name=str(getattr(profile, "name", "") or ""),
        station_name=mot.station_name, method=mot.method, roll_period_s=mot.roll_period_s,
        departure_utc=plan.departure_utc, partition_names=tuple(sea.partition_names),
        notes=tuple(dict.fromkeys(notes)), sick_pct_passage=vomit, class_reason=mot.class_reasons(),
    )
