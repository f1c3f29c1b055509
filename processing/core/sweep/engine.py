# SPDX-License-Identifier: GPL-2.0-or-later
"""When to leave: a sweep over departure times (and speeds), compared across forecast sources.

For every speed the route is planned once (:func:`.passage.plan_passage`); the samples of all
departures are then stacked into ONE time-ordered set of (position, time) pairs per source, so
the sea state is read with one :func:`.passage.sample_sea` call and the motions with one
:func:`.passage.respond` call on the response-table path (tables built once per speed), instead
of one pipeline run per departure. Long sweeps are cut into chunks of at most
:data:`MAX_SAMPLES_PER_CALL` stacked samples so that memory stays bounded and progress/cancel
are honoured between chunks. The per-departure figures are then reduced over the sample axis
with numpy:

* worst motion sickness incidence (MSI, 2 h; O'Hanlon & McCauley 1974 via :mod:`.comfort`)
  and where/when it happens;
* hours in each comfort class: each sample stands for half the interval to its neighbours
  (dwell_i = (t_{i+1} - t_{i-1}) / 2, first/last sample half an interval) [h];
* motion sickness dose at arrival (ISO 2631-1:1997 Annex D):
  MSDV = ( sum_i (a_w,i-1**2 + a_w,i**2) / 2 * (t_i - t_i-1) )**(1/2) [m/s^1.5], the trapezoid
  rule on a_w**2 [m/s^2]**2 over time [s], intervals touching a sample without results left
  out - the same dose as the last value of :attr:`.passage.PassageResult.msdv_cum`;
* share who may vomit = MSDV / 3 [%] (ISO 2631-1:1997 Annex D, Km = 1/3), capped at 100 %;
* the flags raised anywhere on the passage (bitwise OR) and ``in_forecast``: the whole passage
  (departure to arrival) lies inside the source's time coverage (with the sampler's time
  tolerance). Departures that run past the forecast are kept and marked, never truncated.

Ranking ("what best means", :data:`CRITERIA`; lower criterion value is better):

* ``worst_msi``: the highest MSI met on the passage [%];
* ``hours_above``: hours spent in a comfort class above ``max_class`` [h];
* ``dose``: MSDV at arrival [m/s^1.5];
* ``earliest_ok``: hours after the first departure, for departures that stay within limits
  (else no value).

A passage is *within limits* when it lies inside the forecast, every sample has results (calm
samples with Hs = 0 count as fine), no sample is above ``max_class`` and no IMO
MSC.1/Circ.1228 guidance flag (:data:`.flags.SAFETY_FLAGS`) is raised. Rows are ranked within
their own source (and within the robust rows) over every departure and speed: complete rows
(inside the forecast, every sample computed) first, then by criterion value (rows without
value last), then hours above ``max_class``, worst MSI, departure, speed.

Robustness across sources: besides one row per source there is one row per departure and speed
with source :data:`ROBUST_SOURCE`: every figure is the worst over the sources (per sample the
worst comfort class; worst MSI, dose and criterion the largest; flags combined; in forecast and
within limits only when true for every source), and the spread (largest minus smallest over the
sources) of the criterion and of the worst MSI is reported. The recommendation is the best
robust row, with the reason in words.

The comfort classes are our own five-step summary (:mod:`.comfort`). Every result carries
:data:`.flags.CAUTION`: a planning aid, not a substitute for the master's judgement, official
forecasts and warnings, or local rules and regulations.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field, replace
from typing import Callable, Dict, List, Optional, Sequence, Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..flags import CAUTION, NOT_COMPUTED_FLAGS, SAFETY_FLAGS, SampleFlag, flag_codes
from ..passage.pipeline import (
    DEFAULT_LAND_SEARCH_KM,
    DEFAULT_TIME_TOLERANCE_S,
    NOT_COMPUTED_CLASS,
    PassageCancelled,
    PassagePlan,
    as_utc_datetime64,
    plan_passage,
    respond,
    sample_sea,
    source_display_name,
    source_time_range,
)
from ..units import SECONDS_PER_HOUR, FloatArray, nm_from_m
from ..validation import SeawayInputError, as_float_array, require_nonnegative, show

__all__ = [
    "CRITERIA",
    "CRITERION_LABELS",
    "CRITERION_UNITS",
    "ROBUST_SOURCE",
    "MAX_DEPARTURES",
    "MAX_SAMPLES_PER_CALL",
    "departure_times",
    "parse_speeds_kn",
    "SweepRow",
    "Recommendation",
    "SweepResult",
    "sweep_departures",
]

CRITERIA: Tuple[str, ...] = ("worst_msi", "hours_above", "dose", "earliest_ok")
"""What "best" means (see the module docstring); the algorithm's CRITERION enum in this order."""

CRITERION_LABELS: Dict[str, str] = {
    "worst_msi": "lowest worst-case motion sickness incidence (MSI)",
    "hours_above": "least time above the acceptable comfort class",
    "dose": "lowest motion sickness dose at arrival",
    "earliest_ok": "earliest departure that stays within limits",
}
CRITERION_UNITS: Dict[str, str] = {"worst_msi": "%", "hours_above": "h", "dose": "m/s^1.5", "earliest_ok": "h"}

ROBUST_SOURCE: str = "ALL (worst case)"
"""Source name of the robust rows (worst case over every source)."""

MAX_DEPARTURES: int = 10_000
"""More departures than this are refused (choose a larger step or a shorter window)."""

MAX_SAMPLES_PER_CALL: int = 250_000
"""Stacked samples (departures x route samples) per sampling/response call."""

N_CLASSES: int = 5
Progress = Callable[[float], bool]


# ---------------------------------------------------------------------------------------------
# inputs
# ---------------------------------------------------------------------------------------------


def departure_times(depart_from_utc: object, depart_to_utc: object, step_h: float) -> NDArray[np.datetime64]:
    """Departures from ``depart_from_utc`` to ``depart_to_utc`` (both included when on the grid)
    every ``step_h`` hours, as ``datetime64[ms]`` UTC.

    Raises :class:`SeawayInputError` when the end lies before the start, the step is not a
    positive number of hours, or there would be more than :data:`MAX_DEPARTURES` departures.
    """
    t0 = as_utc_datetime64("depart_from_utc", depart_from_utc)
    t1 = as_utc_datetime64("depart_to_utc", depart_to_utc)
    try:
        step = float(step_h)
    except (TypeError, ValueError):
        raise SeawayInputError(f"step_h must be a number of hours > 0, got {show(step_h)}") from None
    if not (math.isfinite(step) and step > 0.0):
        raise SeawayInputError(f"step_h must be a number of hours > 0, got {show(step_h)}")
    if t1 < t0:
        raise SeawayInputError(
            f"depart_to_utc {t1.astype('datetime64[m]')} UTC lies before depart_from_utc "
            f"{t0.astype('datetime64[m]')} UTC: give the end of the departure window after its start"
        )
    step_ms = int(round(step * SECONDS_PER_HOUR * 1000.0))
    if step_ms <= 0:
        raise SeawayInputError(f"step_h must be at least 1 ms, got {show(step_h)}")
    span_ms = int((t1 - t0).astype("timedelta64[ms]").astype(np.int64))
    n = span_ms // step_ms + 1
    if n > MAX_DEPARTURES:
        raise SeawayInputError(
            f"the window {t0.astype('datetime64[m]')} to {t1.astype('datetime64[m]')} UTC every {step:g} h "
            f"gives {n} departures, more than the limit of {MAX_DEPARTURES}: choose a larger step_h or a "
            "shorter window"
        )
    return t0 + np.arange(n, dtype=np.int64) * np.timedelta64(step_ms, "ms")


def parse_speeds_kn(text: object, default_kn: float) -> Tuple[float, ...]:
    """Speeds from a comma-separated text such as ``"8, 10.5"`` [kn]; empty -> ``(default_kn,)``.

    Every value must be a finite number > 0; repeated values are kept once (first order).
    """
    raw = "" if text is None else str(text)
    if not raw.strip():
        vals = [default_kn]
    else:
        vals = []
        for part in raw.replace(";", ",").split(","):
            p = part.strip()
            if not p:
                continue
            try:
                v = float(p)
            except ValueError:
                raise SeawayInputError(
                    f"speeds_kn: {show(p)} in {show(raw)} is not a number of knots: give speeds like '8, 10.5'"
                ) from None
            vals.append(v)
        if not vals:
            raise SeawayInputError(f"speeds_kn {show(raw)} holds no speed: give speeds like '8, 10.5' or leave it empty")
    out: List[float] = []
    for v in vals:
        if not (math.isfinite(float(v)) and float(v) > 0.0):
            raise SeawayInputError(f"speeds_kn: every speed must be > 0 kn, got {show(v)}")
        if float(v) not in out:
            out.append(float(v))
    return tuple(out)


# ---------------------------------------------------------------------------------------------
# results
# ---------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class SweepRow:
    """One row of the sweep table: one departure x speed x source (or the robust row).

    ``rank`` 1 = best within the row's source (see the module docstring); times are
    ``datetime64[ms]`` UTC (``worst_msi_utc`` NaT when nothing was computed); hours [h];
    ``hours_class`` the hours in classes 0..4, ``hours_missing`` hours without results;
    ``msdv_arrival`` [m/s^1.5]; ``sick_pct_arrival`` [%]; ``flags`` SampleFlag mask of the
    passage; ``n_missing`` samples without results (calm Hs = 0 samples not counted);
    ``criterion_value`` in :data:`CRITERION_UNITS` (NaN = no value, e.g. not within limits for
    ``earliest_ok``); ``crit_spread``, ``msi_spread``: largest minus smallest over the sources
    (robust rows only, NaN elsewhere or where a source has no value).
    """

    rank: int
    depart_utc: np.datetime64
    speed_kn: float
    arrive_utc: np.datetime64
    duration_h: float
    source: str
    worst_msi_pct: float
    worst_msi_dist_nm: float
    worst_msi_utc: np.datetime64
    hours_class: Tuple[float, ...]
    hours_missing: float
    hours_above: float
    msdv_arrival: float
    sick_pct_arrival: float
    flags: int
    n_missing: int
    in_forecast: bool
    within_limits: bool
    criterion_value: float
    crit_spread: float = float("nan")
    msi_spread: float = float("nan")

    @property
    def is_robust(self) -> bool:
        return self.source == ROBUST_SOURCE

    @property
    def flag_text(self) -> str:
        return flag_codes(self.flags)


@dataclass(frozen=True)
class Recommendation:
    """The best robust departure and why, in words (``reason``); ``windows_utc``: runs of
    consecutive departures at the recommended speed that stay within limits in every source
    ((first, last) departure pairs)."""

    depart_utc: np.datetime64
    speed_kn: float
    arrive_utc: np.datetime64
    criterion: str
    criterion_value: float
    crit_spread: float
    within_limits: bool
    in_forecast: bool
    reason: str
    windows_utc: Tuple[Tuple[np.datetime64, np.datetime64], ...] = ()


@dataclass(frozen=True)
class SweepResult:
    """Everything the sweep found.

    Axes: S speeds (``speeds_kn``), K sources (``source_names``), D departures
    (``departures_utc``), n route samples (``dist_nm``). Per source: ``(S, K, D)`` arrays
    ``worst_msi_pct``, ``worst_msi_dist_nm``, ``worst_msi_utc``, ``hours_missing``,
    ``hours_above``, ``msdv_arrival``, ``sick_pct_arrival``, ``flags``, ``n_missing``,
    ``in_forecast``, ``within_limits``, ``criterion_value``; ``hours_class`` (S, K, D, 5);
    ``comfort_class`` (S, K, D, n) int8 per sample (-1 = not computed). Robust (worst case over
    sources): ``robust_class`` (S, D, n), and the robust :class:`SweepRow` in ``rows``.
    ``arrive_utc`` (S, D), ``duration_h`` (S,), ``elapsed_h`` (S, n) hours after departure at
    each sample. ``rows`` every table row ordered by speed, departure, source (robust last);
    ``recommendation`` the best robust row.
    """

    departures_utc: NDArray[np.datetime64]
    speeds_kn: Tuple[float, ...]
    source_names: Tuple[str, ...]
    criterion: str
    max_class: int
    dist_nm: FloatArray
    elapsed_h: FloatArray
    arrive_utc: NDArray[np.datetime64]
    duration_h: FloatArray
    worst_msi_pct: FloatArray
    worst_msi_dist_nm: FloatArray
    worst_msi_utc: NDArray[np.datetime64]
    hours_class: FloatArray
    hours_missing: FloatArray
    hours_above: FloatArray
    msdv_arrival: FloatArray
    sick_pct_arrival: FloatArray
    flags: NDArray[np.int64]
    n_missing: NDArray[np.int64]
    in_forecast: NDArray[np.bool_]
    within_limits: NDArray[np.bool_]
    criterion_value: FloatArray
    comfort_class: NDArray[np.int8]
    robust_class: NDArray[np.int8]
    rows: Tuple[SweepRow, ...]
    recommendation: Recommendation
    vessel_name: str = ""
    station_name: str = ""
    method: str = ""
    source_time_ranges: Tuple[Tuple[np.datetime64, np.datetime64], ...] = ()
    notes: Tuple[str, ...] = ()
    caution: str = field(default=CAUTION)

    @property
    def n_departures(self) -> int:
        return int(self.departures_utc.size)

    def robust_rows(self) -> Tuple[SweepRow, ...]:
        return tuple(r for r in self.rows if r.is_robust)

    def rows_of(self, source: str) -> Tuple[SweepRow, ...]:
        """Rows of one source (or :data:`ROBUST_SOURCE`), in speed and departure order."""
        return tuple(r for r in self.rows if r.source == source)


# ---------------------------------------------------------------------------------------------
# helpers
# ---------------------------------------------------------------------------------------------


class _Span:
    """Map a part's own progress 0..1 onto [lo, hi] of the caller's; remember a stop request."""

    def __init__(self, progress: Optional[Progress], lo: float, hi: float) -> None:
        self.progress, self.lo, self.hi = progress, lo, hi

    def __call__(self, fraction: float) -> bool:
        if self.progress is None:
            return True
        f = self.lo + (self.hi - self.lo) * min(max(float(fraction), 0.0), 1.0)
        return self.progress(f) is not False

    def check(self, fraction: float) -> None:
        if not self(fraction):
            raise PassageCancelled("departure sweep cancelled")


def _dwell_h(elapsed_s: FloatArray) -> FloatArray:
    """Hours each sample stands for: half the interval before plus half the interval after."""
    out = np.zeros(elapsed_s.size)
    if elapsed_s.size >= 2:
        d = np.diff(elapsed_s)
        out[:-1] += 0.5 * d
        out[1:] += 0.5 * d
    return out / SECONDS_PER_HOUR


def _msdv_at_arrival(aw: FloatArray, elapsed_s: FloatArray) -> FloatArray:
    """ISO 2631-1:1997 Annex D dose at arrival per departure (rows of ``aw``, (D, n) [m/s^2]).

    MSDV = sqrt( sum_i (a_{i-1}**2 + a_i**2) / 2 * (t_i - t_{i-1}) ) [m/s^1.5] (trapezoid rule
    on a_w**2); intervals with a NaN end point contribute nothing; NaN where no sample of the
    departure has results.
    """
    if aw.shape[1] < 2:
        out = np.where(np.isfinite(aw[:, 0]), 0.0, np.nan)
        return out
    a2 = 0.5 * (aw[:, :-1] ** 2 + aw[:, 1:] ** 2)
    dt = np.diff(elapsed_s)[None, :]
    dose2 = np.where(np.isfinite(a2), a2 * dt, 0.0).sum(axis=1)
    any_ok = np.isfinite(aw).any(axis=1)
    return np.where(any_ok, np.sqrt(dose2), np.nan)


def _fmt_t(t: np.datetime64) -> str:
    if np.isnat(t):
        return "n/a"
    return str(np.datetime64(t, "m")).replace("T", " ") + " UTC"


@dataclass(frozen=True)
class _Block:
    """Per-departure figures of one speed and source ((D,) arrays, (D, 5) and (D, n))."""

    worst_msi_pct: FloatArray
    worst_idx: NDArray[np.int64]
    hours_class: FloatArray
    hours_missing: FloatArray
    msdv: FloatArray
    flags: NDArray[np.int64]
    n_missing: NDArray[np.int64]
    cls: NDArray[np.int8]


def _reduce(cls: NDArray[np.int64], msi: FloatArray, aw: FloatArray, flags: NDArray[np.int64],
            missing: NDArray[np.bool_], dwell_h: FloatArray, elapsed_s: FloatArray) -> _Block:
    """Reduce (D, n) per-sample arrays to per-departure figures."""
    d = cls.shape[0]
    m = np.where(np.isfinite(msi), msi, -np.inf)
    worst_idx = np.argmax(m, axis=1).astype(np.int64)
    worst = m[np.arange(d), worst_idx]
    worst = np.where(np.isfinite(worst), worst, np.nan)
    worst_idx = np.where(np.isfinite(worst), worst_idx, -1)
    hours = np.stack([(np.where(cls == c, dwell_h[None, :], 0.0)).sum(axis=1) for c in range(N_CLASSES)], axis=1)
    hours_missing = np.where(cls == NOT_COMPUTED_CLASS, dwell_h[None, :], 0.0).sum(axis=1)
    return _Block(
        worst_msi_pct=worst,
        worst_idx=worst_idx,
        hours_class=hours,
        hours_missing=hours_missing,
        msdv=_msdv_at_arrival(aw, elapsed_s),
        flags=np.bitwise_or.reduce(flags, axis=1).astype(np.int64),
        n_missing=missing.sum(axis=1).astype(np.int64),
        cls=cls.astype(np.int8),
    )


def _run_source(plan: PassagePlan, deps: NDArray[np.datetime64], src: object, *, profile: object,
                station: Optional[str], depth: Optional[object], gamma: float, spread_s: float,
                long_crested: bool, method: str, land_search_km: float, time_tolerance_s: float,
                span: _Span, notes: List[str], name: str) -> Tuple[_Block, str, str]:
    """All departures of one speed through one source: stacked, time-ordered, chunked."""
    n = plan.n
    elapsed_s = plan.elapsed_s
    offsets = (deps - deps[0]).astype("timedelta64[ms]")
    per_chunk = max(1, MAX_SAMPLES_PER_CALL // max(n, 1))
    t0, t1 = source_time_range(src)
    tol = np.timedelta64(int(round(time_tolerance_s * 1000.0)), "ms")
    dwell_h = _dwell_h(elapsed_s)
    station_name, method_used = station or "", method
    n_chunks = int(math.ceil(deps.size / per_chunk))
    parts: List[_Block] = []
    for c in range(n_chunks):
        sl = slice(c * per_chunk, min((c + 1) * per_chunk, deps.size))
        sub = _Span(span, c / n_chunks, (c + 1) / n_chunks)
        sub.check(0.0)
        dc = deps[sl].size
        shape = (dc, n)
        eta = (plan.eta_utc[None, :] + offsets[sl, None]).ravel()
        if not np.any((eta >= t0 - tol) & (eta <= t1 + tol)):
            # no sample of these departures lies in this source's time range: all marked
            parts.append(_reduce(np.full(shape, NOT_COMPUTED_CLASS, dtype=np.int64), np.full(shape, np.nan),
                                 np.full(shape, np.nan), np.full(shape, int(SampleFlag.OUTSIDE_TIME), dtype=np.int64),
                                 np.ones(shape, dtype=bool), dwell_h, elapsed_s))
            continue
        order = np.argsort(eta, kind="stable")
        inv = np.empty_like(order)
        inv[order] = np.arange(order.size)
        tile = np.tile(np.arange(n), dc)[order]
        eta_sorted = eta[order]
        inside = (eta_sorted >= t0 - tol) & (eta_sorted <= t1 + tol)
        # the stacked plan: every (position, time) pair of these departures in time order; its
        # departure is a time inside the forecast (sample_sea checks it, nothing else uses it:
        # the dose and the dwell are computed per departure below)
        stacked = replace(
            plan,
            lon_deg=plan.lon_deg[tile], lat_deg=plan.lat_deg[tile], dist_m=plan.dist_m[tile],
            course_deg=plan.course_deg[tile], is_vertex=plan.is_vertex[tile],
            segment_index=plan.segment_index[tile], eta_utc=eta_sorted, speed_kn=plan.speed_kn[tile],
            departure_utc=eta_sorted[int(np.flatnonzero(inside)[0])],
        )
        sea = sample_sea(stacked, [src], depth=depth, land_search_km=land_search_km,
                         time_tolerance_s=time_tolerance_s, progress=_Span(sub, 0.0, 0.4))
        res = respond(stacked, sea, profile, station=station, gamma=gamma, spread_s=spread_s,
                      long_crested=long_crested, method=method, progress=_Span(sub, 0.4, 1.0))
        for n_ in res.notes:
            # respond's note on msdv_cum counts intervals of the stacked set; the dose here is
            # taken per departure (intervals without sea data are left out the same way)
            if not n_.startswith("the cumulative dose"):
                notes.append(f"{name}: {n_}")
        station_name = res.station_name or station_name
        method_used = res.method or method_used
        # calm samples (Hs = 0, no motions to compute) are not missing data
        calm = ~res.computed & np.isfinite(res.hs_m) & (res.hs_m <= 0.0)
        calm &= (res.flags & int(NOT_COMPUTED_FLAGS)) == 0
        parts.append(_reduce(
            res.comfort_class[inv].reshape(shape), res.msi_pct[inv].reshape(shape),
            res.vacc_wf_rms_m_s2[inv].reshape(shape), res.flags[inv].reshape(shape),
            (~res.computed & ~calm)[inv].reshape(shape), dwell_h, elapsed_s,
        ))
        del sea, res, stacked
        sub.check(1.0)
    block = parts[0] if len(parts) == 1 else _Block(**{
        f: np.concatenate([getattr(p, f) for p in parts], axis=0) for f in _Block.__dataclass_fields__})
    return block, station_name, method_used


# ---------------------------------------------------------------------------------------------
# ranking
# ---------------------------------------------------------------------------------------------


def _criterion_values(criterion: str, worst_msi: FloatArray, hours_above: FloatArray, msdv: FloatArray,
                      within: NDArray[np.bool_], offset_h: FloatArray) -> FloatArray:
    if criterion == "worst_msi":
        return worst_msi.copy()
    if criterion == "hours_above":
        return hours_above.copy()
    if criterion == "dose":
        return msdv.copy()
    return np.where(within, offset_h, np.nan)


def _rank(complete: NDArray[np.bool_], value: FloatArray, hours_above: FloatArray, worst_msi: FloatArray,
          dep_index: NDArray[np.int64], speed_index: NDArray[np.int64]) -> NDArray[np.int64]:
    """1-based ranks: complete first, then value (NaN last), hours above, worst MSI, departure, speed."""
    def key(a: FloatArray) -> FloatArray:
        return np.where(np.isfinite(a), a, np.inf)

    order = np.lexsort((speed_index, dep_index, key(worst_msi), key(hours_above), key(value),
                        (~complete).astype(int)))
    ranks = np.empty(order.size, dtype=np.int64)
    ranks[order] = np.arange(1, order.size + 1)
    return ranks


def _windows(deps: NDArray[np.datetime64], ok: NDArray[np.bool_]) -> Tuple[Tuple[np.datetime64, np.datetime64], ...]:
    out = []
    i = 0
    while i < ok.size:
        if ok[i]:
            j = i
            while j + 1 < ok.size and ok[j + 1]:
                j += 1
            out.append((deps[i], deps[j]))
            i = j + 1
        else:
            i += 1
    return tuple(out)


def _fmt_v(v: float, unit: str) -> str:
    if not math.isfinite(v):
        return "n/a"
    digits = 2 if unit == "m/s^1.5" or (unit == "%" and abs(v) < 1.0) else 1
    return f"{v:.{digits}f} {unit}"


def _recommend(rows: Sequence[SweepRow], deps: NDArray[np.datetime64], robust_ok: NDArray[np.bool_],
               speeds: Sequence[float], criterion: str, max_class: int, n_sources: int) -> Recommendation:
    from ..comfort.indices import COMFORT_CLASS_LABELS

    robust = [r for r in rows if r.is_robust]
    best = min(robust, key=lambda r: r.rank)
    s = speeds.index(best.speed_kn)
    wins = _windows(deps, robust_ok[s])
    unit = CRITERION_UNITS[criterion]
    label = COMFORT_CLASS_LABELS[max_class]
    srcs = "the only source" if n_sources == 1 else f"all {n_sources} sources"
    head = f"Depart {_fmt_t(best.depart_utc)} at {best.speed_kn:g} kn (arrive {_fmt_t(best.arrive_utc)})"
    if criterion == "earliest_ok":
        crit = (f"the earliest departure ({_fmt_v(best.criterion_value, 'h')} after the first) that stays "
                f"within limits in {srcs}") if best.within_limits else ""
    else:
        crit = (f"{CRITERION_LABELS[criterion]}: {_fmt_v(best.criterion_value, unit)} in the worst case over {srcs}")
        if n_sources > 1:
            crit += f" (spread between sources {_fmt_v(best.crit_spread, unit)})"
    parts = [head + (": " + crit if crit else "") + "."]
    if best.within_limits:
        parts.append(f"It stays at or below class '{label}' throughout, inside the forecast, without IMO guidance flags.")
    else:
        why = []
        if not best.in_forecast:
            why.append("the passage runs outside the forecast's time coverage")
        if best.n_missing:
            why.append(f"{best.n_missing} samples have no results")
        if best.hours_above > 0:
            why.append(f"{best.hours_above:.1f} h above class '{label}'")
        if best.flags & int(SAFETY_FLAGS):
            why.append(f"guidance flags {flag_codes(best.flags & int(SAFETY_FLAGS))}")
        parts.insert(0, f"No departure stays within limits in {srcs}; the least bad is shown.")
        parts.append("Not within limits: " + "; ".join(why) + ".")
    parts.append(f"Worst MSI {_fmt_v(best.worst_msi_pct, '%')} at {_fmt_v(best.worst_msi_dist_nm, 'NM')} "
                 f"({_fmt_t(best.worst_msi_utc)}); dose at arrival {_fmt_v(best.msdv_arrival, 'm/s^1.5')}, "
                 f"share who may vomit {_fmt_v(best.sick_pct_arrival, '%')}.")
    if wins:
        txt = ", ".join(_fmt_t(a) if a == b else f"{_fmt_t(a)} to {_fmt_t(b)}" for a, b in wins)
        parts.append(f"Departures at {best.speed_kn:g} kn within limits in {srcs}: {txt}.")
    return Recommendation(
        depart_utc=best.depart_utc, speed_kn=best.speed_kn, arrive_utc=best.arrive_utc, criterion=criterion,
        criterion_value=best.criterion_value, crit_spread=best.crit_spread, within_limits=best.within_limits,
        in_forecast=best.in_forecast, reason=" ".join(parts), windows_utc=wins,
    )


# ---------------------------------------------------------------------------------------------
# the sweep
# ---------------------------------------------------------------------------------------------


def sweep_departures(
    route_lon_deg: ArrayLike,
    route_lat_deg: ArrayLike,
    *,
    depart_from_utc: object,
    depart_to_utc: object,
    step_h: float,
    sea_states: Sequence[object],
    profile: object,
    speeds_kn: Sequence[float],
    criterion: str = "worst_msi",
    max_class: int = 2,
    station: Optional[str] = None,
    depth: Optional[object] = None,
    spacing_nm: float = 1.0,
    gamma: float = 3.3,
    spread_s: float = 4.0,
    long_crested: bool = False,
    method: str = "table",
    progress: Optional[Progress] = None,
    land_search_km: float = DEFAULT_LAND_SEARCH_KM,
    time_tolerance_s: float = DEFAULT_TIME_TOLERANCE_S,
) -> SweepResult:
    """Sweep departures (and speeds) over every sea-state source; rank them; recommend one.

    Parameters
    ----------
    route_lon_deg, route_lat_deg : vertices of the one leg [deg WGS84].
    depart_from_utc, depart_to_utc, step_h : the departure window (UTC) and step [h]
        (:func:`departure_times`).
    sea_states : open sea-state sources, each evaluated on its own (forecast comparison).
    profile : the vessel profile; ``station`` its station (None = first).
    speeds_kn : one or more speeds through the water [kn] > 0.
    criterion : one of :data:`CRITERIA`; ``max_class`` worst acceptable comfort class 0..4.
    depth, spacing_nm, gamma, spread_s, long_crested, land_search_km, time_tolerance_s : as
        :func:`.passage.compute_passage`.
    method : response method, "table" (default, fast) or "exact".
    progress : ``progress(fraction) -> bool``; False stops with :class:`.passage.PassageCancelled`.

    Raises :class:`SeawayInputError` for bad input (naming it), when the sources' time ranges
    do not overlap, or when no departure lies inside the forecast of every source.
    """
    if criterion not in CRITERIA:
        raise SeawayInputError(f"criterion must be one of {', '.join(CRITERIA)}, got {show(criterion)}")
    if isinstance(max_class, bool) or not isinstance(max_class, (int, np.integer)) or not 0 <= int(max_class) <= 4:
        raise SeawayInputError(f"max_class must be a whole number 0..4 (comfort class), got {show(max_class)}")
    max_class = int(max_class)
    if method not in ("table", "exact"):
        raise SeawayInputError(f"method must be 'table' or 'exact', got {show(method)}")
    speeds_arr = np.atleast_1d(as_float_array("speeds_kn", speeds_kn)).ravel()
    if speeds_arr.size == 0:
        raise SeawayInputError("speeds_kn must hold at least one speed, got none")
    if np.any(~(speeds_arr > 0)):
        raise SeawayInputError(f"speeds_kn must all be > 0 kn, got {show(speeds_arr.tolist())}")
    speeds = tuple(dict.fromkeys(float(v) for v in speeds_arr))
    deps = departure_times(depart_from_utc, depart_to_utc, step_h)
    if not sea_states:
        raise SeawayInputError("sea_states must hold at least one sea-state source, got none")
    names = tuple(source_display_name(s, i) for i, s in enumerate(sea_states))
    if len(set(names)) != len(names):
        raise SeawayInputError(
            f"sea-state sources need distinct names to be compared, got {', '.join(names)}: give each source "
            "its own name")
    if ROBUST_SOURCE in names:
        raise SeawayInputError(f"a source may not be called {show(ROBUST_SOURCE)} (that name marks the robust rows)")
    ranges = tuple(source_time_range(s) for s in sea_states)
    tol_s = float(require_nonnegative("time_tolerance_s", time_tolerance_s))
    tol = np.timedelta64(int(round(tol_s * 1000.0)), "ms")
    lo = max(r[0] for r in ranges)
    hi = min(r[1] for r in ranges)
    desc = "; ".join(f"{n}: {_fmt_t(a)} to {_fmt_t(b)}" for n, (a, b) in zip(names, ranges))
    if lo > hi + 2 * tol:
        raise SeawayInputError(
            f"the sea-state sources do not overlap in time ({desc}): a comparison needs forecasts for "
            "the same period"
        )
    if not np.any((deps >= lo - tol) & (deps <= hi + tol)):
        raise SeawayInputError(
            f"no departure from {_fmt_t(deps[0])} to {_fmt_t(deps[-1])} lies inside the time range "
            f"covered by every source ({desc}): choose departures inside the forecast"
        )

    outer = _Span(progress, 0.0, 1.0)
    outer.check(0.0)
    n_s, n_k, n_d = len(speeds), len(sea_states), deps.size
    plans = [plan_passage(route_lon_deg, route_lat_deg, departure_utc=deps[0], speed_kn=v, spacing_nm=spacing_nm)
             for v in speeds]
    n = plans[0].n
    notes: List[str] = []
    blocks: List[List[_Block]] = []
    station_name, method_used = station or "", method
    job = 0
    for s, plan in enumerate(plans):
        row: List[_Block] = []
        for k, src in enumerate(sea_states):
            span = _Span(outer, 0.98 * job / (n_s * n_k), 0.98 * (job + 1) / (n_s * n_k))
            b, station_name, method_used = _run_source(
                plan, deps, src, profile=profile, station=station, depth=depth, gamma=gamma, spread_s=spread_s,
                long_crested=long_crested, method=method, land_search_km=land_search_km,
                time_tolerance_s=tol_s, span=span, notes=notes, name=names[k],
            )
            row.append(b)
            job += 1
        blocks.append(row)

    elapsed_h = np.stack([p.elapsed_s / SECONDS_PER_HOUR for p in plans])
    duration_h = elapsed_h[:, -1].copy()
    dist_nm = np.asarray(nm_from_m(plans[0].dist_m), dtype=float)
    dur_ms = np.array([int(p.elapsed_s[-1] * 1000.0 + 0.5) for p in plans], dtype=np.int64)
    arrive = deps[None, :] + dur_ms[:, None].astype("timedelta64[ms]")
    offset_h = (deps - deps[0]).astype("timedelta64[ms]").astype(np.float64) / 3.6e6

    shape = (n_s, n_k, n_d)
    worst = np.full(shape, np.nan)
    wdist = np.full(shape, np.nan)
    wutc = np.full(shape, np.datetime64("NaT"), dtype="datetime64[ms]")
    hcls = np.zeros(shape + (N_CLASSES,))
    hmiss = np.zeros(shape)
    msdv = np.full(shape, np.nan)
    flags = np.zeros(shape, dtype=np.int64)
    nmiss = np.zeros(shape, dtype=np.int64)
    infc = np.zeros(shape, dtype=bool)
    cls_all = np.full(shape + (n,), NOT_COMPUTED_CLASS, dtype=np.int8)
    elapsed_ms = [np.round(p.elapsed_s * 1000.0).astype(np.int64) for p in plans]
    for s in range(n_s):
        for k in range(n_k):
            b = blocks[s][k]
            worst[s, k] = b.worst_msi_pct
            ok = b.worst_idx >= 0
            wdist[s, k, ok] = dist_nm[b.worst_idx[ok]]
            wutc[s, k, ok] = deps[ok] + elapsed_ms[s][b.worst_idx[ok]].astype("timedelta64[ms]")
            hcls[s, k] = b.hours_class
            hmiss[s, k] = b.hours_missing
            msdv[s, k] = b.msdv
            flags[s, k] = b.flags
            nmiss[s, k] = b.n_missing
            t0, t1 = ranges[k]
            infc[s, k] = ((deps >= t0 - tol) & (arrive[s] <= t1 + tol)
                          & ((b.flags & int(SampleFlag.OUTSIDE_TIME)) == 0))
            cls_all[s, k] = b.cls
    from ..comfort.indices import vomiting_share_pct

    sick = np.full(shape, np.nan)
    fin = np.isfinite(msdv)
    sick[fin] = vomiting_share_pct(msdv[fin])
    above = hcls[..., max_class + 1:].sum(axis=-1)
    safety = (flags & int(SAFETY_FLAGS)) != 0
    within = infc & (nmiss == 0) & (above <= 0.0) & ~safety
    # a sample above max_class with zero dwell (single-sample passage) still counts
    within &= ~np.any(cls_all > max_class, axis=-1)
    crit = _criterion_values(criterion, worst, above, msdv, within, np.broadcast_to(offset_h, shape))

    # robust: worst case over sources
    any_missing = np.any(cls_all == NOT_COMPUTED_CLASS, axis=1)
    rcls = np.where(any_missing, NOT_COMPUTED_CLASS, cls_all.max(axis=1)).astype(np.int8)
    dwell = [_dwell_h(p.elapsed_s) for p in plans]
    r_hcls = np.stack([np.stack([(np.where(rcls[s] == c, dwell[s][None, :], 0.0)).sum(axis=1)
                                 for c in range(N_CLASSES)], axis=1) for s in range(n_s)])
    r_hmiss = np.stack([np.where(rcls[s] == NOT_COMPUTED_CLASS, dwell[s][None, :], 0.0).sum(axis=1)
                        for s in range(n_s)])

    def wmax(a: FloatArray) -> FloatArray:
        fa = np.where(np.isfinite(a), a, -np.inf).max(axis=1)
        return np.where(np.isfinite(fa), fa, np.nan)

    def spread(a: FloatArray) -> FloatArray:
        allf = np.isfinite(a).all(axis=1)
        return np.where(allf, np.nanmax(np.where(allf[:, None], a, 0.0), axis=1)
                        - np.nanmin(np.where(allf[:, None], a, 0.0), axis=1), np.nan)

    r_worst = wmax(worst)
    k_at = np.argmax(np.where(np.isfinite(worst), worst, -np.inf), axis=1)
    ii = np.indices(k_at.shape)
    r_wdist = np.where(np.isfinite(r_worst), wdist[ii[0], k_at, ii[1]], np.nan)
    r_wutc = np.where(np.isfinite(r_worst), wutc[ii[0], k_at, ii[1]], np.datetime64("NaT"))
    r_msdv = wmax(msdv)
    r_sick = wmax(sick)
    r_flags = np.bitwise_or.reduce(flags, axis=1)
    r_nmiss = nmiss.max(axis=1)
    r_infc = infc.all(axis=1)
    r_within = within.all(axis=1)
    r_above = r_hcls[..., max_class + 1:].sum(axis=-1)
    if criterion == "earliest_ok":
        r_crit = np.where(r_within, np.broadcast_to(offset_h, r_within.shape), np.nan)
    elif criterion == "hours_above":
        r_crit = r_above.copy()
    else:
        r_crit = wmax(crit)
    r_crit_spread = spread(crit)
    r_msi_spread = spread(worst)

    # ranks within each source and within the robust rows, over every departure and speed
    si, di = np.meshgrid(np.arange(n_s), np.arange(n_d), indexing="ij")
    ranks = np.zeros(shape, dtype=np.int64)
    for k in range(n_k):
        ranks[:, k] = _rank((infc[:, k] & (nmiss[:, k] == 0)).ravel(), crit[:, k].ravel(), above[:, k].ravel(),
                            worst[:, k].ravel(), di.ravel(), si.ravel()).reshape(n_s, n_d)
    r_ranks = _rank((r_infc & (r_nmiss == 0)).ravel(), r_crit.ravel(), r_above.ravel(), r_worst.ravel(),
                    di.ravel(), si.ravel()).reshape(n_s, n_d)

    rows: List[SweepRow] = []
    for s in range(n_s):
        for d in range(n_d):
            for k in range(n_k):
                rows.append(SweepRow(
                    rank=int(ranks[s, k, d]), depart_utc=deps[d], speed_kn=speeds[s], arrive_utc=arrive[s, d],
                    duration_h=float(duration_h[s]), source=names[k], worst_msi_pct=float(worst[s, k, d]),
                    worst_msi_dist_nm=float(wdist[s, k, d]), worst_msi_utc=wutc[s, k, d],
                    hours_class=tuple(float(x) for x in hcls[s, k, d]), hours_missing=float(hmiss[s, k, d]),
                    hours_above=float(above[s, k, d]), msdv_arrival=float(msdv[s, k, d]),
                    sick_pct_arrival=float(sick[s, k, d]), flags=int(flags[s, k, d]), n_missing=int(nmiss[s, k, d]),
                    in_forecast=bool(infc[s, k, d]), within_limits=bool(within[s, k, d]),
                    criterion_value=float(crit[s, k, d]),
                ))
            rows.append(SweepRow(
                rank=int(r_ranks[s, d]), depart_utc=deps[d], speed_kn=speeds[s], arrive_utc=arrive[s, d],
                duration_h=float(duration_h[s]), source=ROBUST_SOURCE, worst_msi_pct=float(r_worst[s, d]),
                worst_msi_dist_nm=float(r_wdist[s, d]), worst_msi_utc=r_wutc[s, d],
                hours_class=tuple(float(x) for x in r_hcls[s, d]), hours_missing=float(r_hmiss[s, d]),
                hours_above=float(r_above[s, d]), msdv_arrival=float(r_msdv[s, d]),
                sick_pct_arrival=float(r_sick[s, d]), flags=int(r_flags[s, d]), n_missing=int(r_nmiss[s, d]),
                in_forecast=bool(r_infc[s, d]), within_limits=bool(r_within[s, d]),
                criterion_value=float(r_crit[s, d]), crit_spread=float(r_crit_spread[s, d]),
                msi_spread=float(r_msi_spread[s, d]),
            ))
    n_out = int(np.count_nonzero(~r_infc))
    if n_out:
        notes.append(f"{n_out} of {r_infc.size} departure/speed combinations run outside the time coverage of "
                     "at least one source: they are marked in_forecast = false and ranked after complete ones")
    rec = _recommend(rows, deps, r_within, list(speeds), criterion, max_class, n_k)
    outer.check(1.0)
    return SweepResult(
        departures_utc=deps, speeds_kn=speeds, source_names=names, criterion=criterion, max_class=max_class,
        dist_nm=dist_nm, elapsed_h=elapsed_h, arrive_utc=arrive, duration_h=duration_h, worst_msi_pct=worst,
        worst_msi_dist_nm=wdist, worst_msi_utc=wutc, hours_class=hcls, hours_missing=hmiss, hours_above=above,
        msdv_arrival=msdv, sick_pct_arrival=sick, flags=flags, n_missing=nmiss, in_forecast=infc,
        within_limits=within, criterion_value=crit, comfort_class=cls_all, robust_class=rcls, rows=tuple(rows),
        recommendation=rec, vessel_name=str(getattr(profile, "name", "") or ""), station_name=station_name,
        method=method_used, source_time_ranges=ranges, notes=tuple(dict.fromkeys(notes)),
    )
