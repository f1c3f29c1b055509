# SPDX-License-Identifier: GPL-2.0-or-later
"""One passage through every member of an ensemble forecast: probabilities, spread, median.

Steps (the ordinary passage steps, run for all members at once):

1. :func:`.plan.plan_passage` once;
2. :func:`.sample.sample_sea_at` once per member (each member's layers are read only in the
   windows and time steps the route needs: members x steps x window, never whole fields);
3. the members' samples are stacked into one track of M x n samples and answered by ONE
   :func:`.respond.respond_motions` call (the response tables are built once); the method is
   chosen from the samples of one member, as a single-member run would choose it, so every
   member's numbers equal those of a single-member run;
4. :func:`.respond.passage_result` per member (dose along the passage), then the per-point
   reductions of :func:`reduce_members`.

Per point, over the k members with results there (``members`` = k):

* ``prob_taxing_pct`` = 100 * #(comfort class >= 3, "taxing" or worse) / k;
* ``prob_criteria_pct`` = 100 * #(CRITERIA_EXCEEDED flag: a seakeeping criterion exceeded) / k;
* ``msi_p10_pct``, ``msi_p50_pct``, ``msi_p90_pct``: percentiles of the members' MSI, linear
  interpolation between order statistics (Hyndman & Fan 1996, "Sample quantiles in statistical
  packages", Am. Statistician 50(4) 361-365, definition 7; numpy's default);
* k = 0: NaN and the point's flags say why (no member had sea data).

The ordinary fields hold the *median member per quantity*: for each point and each scalar
quantity separately (Hs, Tp, wavelength, celerity, encounter period, every motion output, MSI,
dose, share who may vomit, comfort class), the value of the member ranking ceil(k/2)-th in
ascending order among the k members with results there (the median for odd k, the lower of the
two middle values for even k), so every value is one some member really had and a class stays
a whole class. Directions (wave direction and relative heading) are circular: they are taken
from the member that is the median member for Hs at that point. Flags and source come from the
member that is the median member for MSI there. Different quantities at one point may come
from different members.
"""
from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Dict, List, Optional, Sequence, Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..comfort.exposure import NOT_COMPUTED_CLASS
from ..flags import SampleFlag
from ..units import FloatArray
from ..validation import SeawayInputError
from .fields import ENSEMBLE_OUTPUT_NAMES, MOTION_OUTPUT_NAMES
from .plan import PassagePlan, plan_passage
from .progress import Progress, Span
from .respond import SampleMotions, _chosen_method, _computable, passage_result, respond_motions
from .result import PassageResult
from .sample import (
    DEFAULT_LAND_SEARCH_KM,
    DEFAULT_TIME_TOLERANCE_S,
    SeaAtSamples,
    check_departure_in_forecast,
    sample_sea_at,
)

__all__ = ["TAXING_CLASS", "EnsemblePassage", "ensemble_members", "sample_members", "respond_members",
           "reduce_members", "median_member_index", "compute_ensemble_passage"]

TAXING_CLASS: int = 3
"""Index of "taxing" in :data:`..comfort.indices.COMFORT_CLASS_LABELS` (our own five steps)."""

_MEDIAN_QUANTITIES = ("hs_m", "tp_s", "wavelength_m", "celerity_m_s", "enc_period_s") + MOTION_OUTPUT_NAMES + (
    "msdv_cum", "vomit_pct")


@dataclass(frozen=True)
class EnsemblePassage:
    """An ensemble passage: ``result`` (median member per quantity, module docstring),
    ``member_ids``, the per-point figures of :data:`.fields.ENSEMBLE_OUTPUTS` ((n,) arrays;
    ``members`` int64) and the members' comfort classes and MSI ((M, n))."""

    result: PassageResult
    member_ids: Tuple[int, ...]
    members: NDArray[np.int64]
    prob_taxing_pct: FloatArray
    prob_criteria_pct: FloatArray
    msi_p10_pct: FloatArray
    msi_p50_pct: FloatArray
    msi_p90_pct: FloatArray
    member_class: NDArray[np.int64]
    member_msi_pct: FloatArray

    def outputs(self) -> Dict[str, NDArray]:
        """The per-point ensemble fields by name (:data:`.fields.ENSEMBLE_OUTPUT_NAMES`)."""
        return {k: getattr(self, k) for k in ENSEMBLE_OUTPUT_NAMES}

    def class_probability_pct(self) -> FloatArray:
        """(6,) share [%] of members whose worst comfort class on this leg is 0..4, and of
        members without any result on the leg (last); sums to 100."""
        worst = self.member_class.max(axis=1) if self.member_class.size else np.zeros(0, dtype=np.int64)
        counts = np.array([np.count_nonzero(worst == c) for c in range(5)]
                          + [np.count_nonzero(worst == NOT_COMPUTED_CLASS)], dtype=float)
        return 100.0 * counts / max(len(self.member_ids), 1)


def ensemble_members(sea_states: Sequence[object]) -> Tuple[int, ...]:
    """The member labels shared by the ensemble sources among ``sea_states`` (() when none is
    an ensemble); differing member sets are refused."""
    sets = [tuple(getattr(s, "members", ()) or ()) for s in sea_states]
    sets = [m for m in sets if m]
    if not sets:
        return ()
    if any(m != sets[0] for m in sets[1:]):
        raise SeawayInputError(f"the ensemble sources have different members ({'; '.join(map(str, sets))}): "
                               "give ensembles with the same members, or one ensemble")
    return sets[0]


def sample_members(track: PassagePlan, sea_states: Sequence[object], member_ids: Sequence[int], *,
                   depth: Optional[object] = None, land_search_km: float = DEFAULT_LAND_SEARCH_KM,
                   time_tolerance_s: float = DEFAULT_TIME_TOLERANCE_S, progress: Optional[Progress] = None
                   ) -> List[SeaAtSamples]:
    """The sea at every sample for each member (deterministic sources serve every member)."""
    span = Span(progress)
    out = []
    for j, m in enumerate(member_ids):
        srcs = [s.member_source(m) if getattr(s, "members", ()) else s for s in sea_states]  # type: ignore[attr-defined]
        out.append(sample_sea_at(track, srcs, depth=depth, land_search_km=land_search_km,
                                 time_tolerance_s=time_tolerance_s,
                                 progress=span.part(j / len(member_ids), (j + 1) / len(member_ids))))
    return out


def _stack_seas(seas: Sequence[SeaAtSamples]) -> SeaAtSamples:
    """The members' samples one after the other (partitions only when all members share them)."""
    names = seas[0].partition_names
    same = all(s.partition_names == names for s in seas)
    parts = [np.concatenate([getattr(s, a) for s in seas]) if same else np.zeros((sum(x.hs_m.size for x in seas), 0))
             for a in ("partition_hs_m", "partition_tp_s", "partition_from_deg")]
    cat = {a: np.concatenate([getattr(s, a) for s in seas])
           for a in ("hs_m", "tp_s", "wave_from_deg", "depth_m", "valid", "flags")}
    return SeaAtSamples(partition_names=names if same else (), partition_hs_m=parts[0], partition_tp_s=parts[1],
                        partition_from_deg=parts[2], source=tuple(x for s in seas for x in s.source),
                        notes=tuple(dict.fromkeys(n for s in seas for n in s.notes)), **cat)


def _member_motions(mot: SampleMotions, sl: slice) -> SampleMotions:
    return replace(mot, wavelength_m=mot.wavelength_m[sl], celerity_m_s=mot.celerity_m_s[sl],
                   rel_heading_deg=mot.rel_heading_deg[sl], enc_period_s=mot.enc_period_s[sl],
                   outputs={k: v[sl] for k, v in mot.outputs.items()}, comfort_class=mot.comfort_class[sl],
                   flags=mot.flags[sl], computed=mot.computed[sl], class_driver=mot.class_driver[sl])


def respond_members(plan: PassagePlan, seas: Sequence[SeaAtSamples], profile: object, *,
                    method: Optional[str] = None, progress: Optional[Progress] = None,
                    **response: object) -> List[PassageResult]:
    """Every member's :class:`.result.PassageResult` from ONE response call on the stacked
    samples; ``method`` None chooses from one member's samples (module docstring)."""
    n, m = plan.n, len(seas)
    busiest = max(seas, key=lambda s: int(np.count_nonzero(_computable(s))))
    chosen = _chosen_method(method, plan, np.flatnonzero(_computable(busiest)), profile,
                            response.get("station"), float(response.get("gamma", 3.3)),  # type: ignore[arg-type]
                            float(response.get("spread_s", 4.0)), bool(response.get("long_crested", False)),  # type: ignore[arg-type]
                            len(busiest.partition_names))
    track = plan.take(np.tile(np.arange(n), m), np.tile(plan.eta_utc, m))
    mot = respond_motions(track, _stack_seas(seas), profile, method=chosen, progress=progress,
                          **response)  # type: ignore[arg-type]
    return [passage_result(plan, seas[j], _member_motions(mot, slice(j * n, (j + 1) * n)), profile)
            for j in range(m)]


def median_member_index(values: FloatArray, ok: NDArray[np.bool_]) -> NDArray[np.int64]:
    """(n,) index of the member ranking ceil(k/2)-th in ascending order among the k members with
    ``ok`` at each point ((M, n) inputs; ties keep member order); -1 where k = 0."""
    v = np.where(ok, values, np.inf)
    order = np.argsort(v, axis=0, kind="stable")
    k = ok.sum(axis=0)
    rank = np.maximum((k - 1) // 2, 0)
    pick = order[rank, np.arange(v.shape[1])]
    return np.where(k > 0, pick, -1).astype(np.int64)


def _percentiles(msi: FloatArray, ok: NDArray[np.bool_]) -> Tuple[FloatArray, FloatArray, FloatArray]:
    """10th, 50th, 90th percentile over the k members with a value, per point, NaN where k = 0.

    Definition 7 of Hyndman & Fan (1996): h = (k - 1) q / 100, Q = x_(floor h) + (h - floor h)
    (x_(floor h + 1) - x_(floor h)) on the sorted values x_(0..k-1) (numpy's "linear").
    """
    x = np.sort(np.where(ok, msi, np.inf), axis=0)
    k = ok.sum(axis=0)
    cols = np.arange(msi.shape[1])
    out = []
    for q in (10.0, 50.0, 90.0):
        h = np.maximum(k - 1, 0) * (q / 100.0)
        lo = np.floor(h).astype(np.int64)
        hi = np.minimum(lo + 1, np.maximum(k - 1, 0))
        a, b = x[lo, cols], x[hi, cols]
        with np.errstate(invalid="ignore"):
            v = a + (h - lo) * np.where(hi > lo, b - a, 0.0)
        out.append(np.where(k > 0, v, np.nan))
    return out[0], out[1], out[2]


def _median_result(results: Sequence[PassageResult], ok: NDArray[np.bool_], note: str) -> PassageResult:
    """The median member per quantity (module docstring) as one :class:`PassageResult`."""
    from ..comfort.indices import COMFORT_CLASS_LABELS

    n = results[0].n
    cols = np.arange(n)
    kw: Dict[str, object] = {}
    for q in _MEDIAN_QUANTITIES + ("comfort_class",):
        vals = np.stack([np.asarray(getattr(r, q), dtype=float) for r in results])
        pick = median_member_index(vals, ok & np.isfinite(vals))
        got = vals[np.maximum(pick, 0), cols]
        kw[q] = np.where(pick >= 0, got, NOT_COMPUTED_CLASS if q == "comfort_class" else np.nan)
    cls = np.asarray(kw["comfort_class"]).astype(np.int64)
    kw["comfort_class"] = cls
    by_hs = median_member_index(np.stack([r.hs_m for r in results]), ok)
    for q in ("wave_from_deg", "rel_heading_deg"):
        vals = np.stack([getattr(r, q) for r in results])
        kw[q] = np.where(by_hs >= 0, vals[np.maximum(by_hs, 0), cols], np.nan)
    msi = np.stack([r.msi_pct for r in results])  # type: ignore[attr-defined]
    by_msi = median_member_index(msi, ok & np.isfinite(msi))
    by_msi = np.where(by_msi >= 0, by_msi, 0)
    flags = np.stack([r.flags for r in results])
    kw["flags"] = flags[by_msi, cols]
    kw["source"] = tuple(results[by_msi[i]].source[i] for i in range(n))
    kw["comfort_label"] = tuple(COMFORT_CLASS_LABELS[c] if c >= 0 else "" for c in cls)
    kw["computed"] = ok.any(axis=0)
    notes = tuple(dict.fromkeys(n_ for r in results for n_ in r.notes)) + (note,)
    return replace(results[0], notes=notes, **kw)  # type: ignore[arg-type]


def reduce_members(results: Sequence[PassageResult], member_ids: Sequence[int]) -> EnsemblePassage:
    """Per-point ensemble figures and the median member per quantity (module docstring)."""
    if not results:
        raise SeawayInputError("an ensemble passage needs at least one member result, got none")
    ok = np.stack([r.computed for r in results])
    cls = np.stack([r.comfort_class for r in results]).astype(np.int64)
    crit = np.stack([(r.flags & int(SampleFlag.CRITERIA_EXCEEDED)) != 0 for r in results])
    msi = np.stack([np.asarray(r.msi_pct, dtype=float) for r in results])  # type: ignore[attr-defined]
    k = ok.sum(axis=0)
    with np.errstate(invalid="ignore", divide="ignore"):
        p_tax = np.where(k > 0, 100.0 * (ok & (cls >= TAXING_CLASS)).sum(axis=0) / k, np.nan)
        p_crit = np.where(k > 0, 100.0 * (ok & crit).sum(axis=0) / k, np.nan)
    p10, p50, p90 = _percentiles(msi, ok & np.isfinite(msi))
    note = (f"ensemble of {len(results)} members ({', '.join(map(str, member_ids))}): the ordinary fields hold "
            "the median member per quantity; members, prob_taxing_pct, prob_criteria_pct and msi_p10/p50/p90_pct "
            "describe the spread")
    return EnsemblePassage(
        result=_median_result(results, ok, note), member_ids=tuple(int(m) for m in member_ids),
        members=k.astype(np.int64), prob_taxing_pct=p_tax, prob_criteria_pct=p_crit, msi_p10_pct=p10,
        msi_p50_pct=p50, msi_p90_pct=p90, member_class=np.where(ok, cls, NOT_COMPUTED_CLASS), member_msi_pct=msi)


def compute_ensemble_passage(
    route_lon_deg: ArrayLike,
    route_lat_deg: ArrayLike,
    *,
    departure_utc: object,
    speed_kn: float,
    sea_states: Sequence[object],
    profile: object,
    station: Optional[str] = None,
    depth: Optional[object] = None,
    spacing_nm: float = 1.0,
    gamma: float = 3.3,
    spread_s: float = 4.0,
    long_crested: bool = False,
    progress: Optional[Progress] = None,
    leg: int = 0,
    method: Optional[str] = None,
    land_search_km: float = DEFAULT_LAND_SEARCH_KM,
    time_tolerance_s: float = DEFAULT_TIME_TOLERANCE_S,
) -> EnsemblePassage:
    """:func:`.pipeline.compute_passage` for every member of the ensemble source(s) among
    ``sea_states`` (module docstring); a deterministic list counts as one member (label 0)."""
    span = Span(progress)
    plan = plan_passage(route_lon_deg, route_lat_deg, departure_utc=departure_utc, speed_kn=speed_kn,
                        spacing_nm=spacing_nm, leg=leg)
    check_departure_in_forecast(plan.departure_utc, sea_states, time_tolerance_s=time_tolerance_s)
    ids = ensemble_members(sea_states)
    seas = sample_members(plan, sea_states, ids or (0,), depth=depth, land_search_km=land_search_km,
                          time_tolerance_s=time_tolerance_s, progress=span.part(0.0, 0.5))
    results = respond_members(plan, seas, profile, method=method, progress=span.part(0.5, 0.98), station=station,
                              gamma=gamma, spread_s=spread_s, long_crested=long_crested)
    out = reduce_members(results, ids or (0,))
    span.check(1.0)
    return out
