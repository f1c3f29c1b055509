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
  (else no value);
* ``lowest_prob_taxing``: share of ensemble members [%] whose passage reaches comfort class
  taxing or worse anywhere (a deterministic source: 0 or 100 %); ties broken by the median MSI
  (ensemble sources are run member by member and reduced as :mod:`.members` describes).

A passage is *within limits* when it lies inside the forecast, every sample has results (calm
samples with Hs = 0 count as fine), no sample is above ``max_class``, no seakeeping criterion
is exceeded and no IMO MSC.1/Circ.1228 guidance flag graded "danger" is raised
(:data:`.flags.HARD_LIMIT_FLAGS`). Advisory guidance flags are shown but do not veto. Rows are
ranked within their own source (and within the robust rows) over every departure and speed:
rows within limits first, then complete rows (inside the forecast, every sample computed), then
by criterion value (rows without value last), then hours above ``max_class``, worst MSI,
departure, speed. So the recommendation is a departure within limits whenever one exists; its
text says which limit rules out the other departures (:func:`limit_reason`).

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
from dataclasses import dataclass, field
from typing import Dict, List, Optional, Sequence, Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..comfort.exposure import NOT_COMPUTED_CLASS, dwell_s, hours_in_classes, msdv_at_end
from ..flags import CAUTION, DANGER_FLAGS, HARD_LIMIT_FLAGS, SAFETY_FLAGS, UNCLASSED_FLAGS, SampleFlag, flag_codes
from ..passage.plan import PassagePlan, as_utc_datetime64, plan_passage
from ..passage.progress import Progress, Span
from ..passage.respond import respond_motions
from ..passage.sample import (
    DEFAULT_LAND_SEARCH_KM,
    DEFAULT_TIME_TOLERANCE_S,
    sample_sea_at,
    source_display_name,
    source_time_range,
)
from ..units import SECONDS_PER_HOUR, FloatArray, nm_from_m
from .members import combine_member_blocks, member_ids, prob_taxing_pct
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
    "limit_reason",
]

CRITERIA: Tuple[str, ...] = ("worst_msi", "hours_above", "dose", "earliest_ok", "lowest_prob_taxing")
"""What "best" means (see the module docstring); the algorithm's CRITERION enum in this order."""

CRITERION_LABELS: Dict[str, str] = {
    "worst_msi": "lowest worst-case motion sickness incidence (MSI)",
    "hours_above": "least time above the acceptable comfort class",
    "dose": "lowest motion sickness dose at arrival",
    "earliest_ok": "earliest departure that stays within limits",
    "lowest_prob_taxing": "lowest probability of reaching taxing or worse anywhere (ensemble)",
}
CRITERION_UNITS: Dict[str, str] = {"worst_msi": "%", "hours_above": "h", "dose": "m/s^1.5", "earliest_ok": "h",
                                   "lowest_prob_taxing": "%"}

SAFETY_ADVISORY: int = int(SAFETY_FLAGS)
"""Guidance flags shown as advisories in the recommendation (any grade)."""

ROBUST_SOURCE: str = "ALL (worst case)"
"""Source name of the robust rows (worst case over every source)."""

MAX_DEPARTURES: int = 10_000
"""More departures than this are refused (choose a larger step or a shorter window)."""

MAX_SAMPLES_PER_CALL: int = 250_000
"""Stacked samples (departures x route samples) per sampling/response call."""



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
    (robust rows only, NaN elsewhere or where a source has no value); ``limit_driver`` what set
    the class of the worst sample (:data:`..comfort.verdict.DRIVERS` index, -1 none).
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
    limit_driver: int = -1

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
    ``in_forecast``, ``within_limits``, ``criterion_value``, ``prob_taxing_pct`` (share of
    ensemble members reaching taxing or worse; 0/100 for a deterministic source, :mod:`.members`);
    ``hours_class`` (S, K, D, 5);
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
    prob_taxing_pct: FloatArray
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
    limit_driver: Optional[NDArray[np.int8]] = None

    @property
    def n_departures(self) -> int:
        return int(self.departures_utc.size)

    def robust_rows(self) -> Tuple[SweepRow, ...]:
        return tuple(r for r in self.rows if r.is_robust)

    def rows_of(self, source: str) -> Tuple[SweepRow, ...]:
        """Rows of one source (or :data:`ROBUST_SOURCE`), in speed and departure order."""
        return tuple(r for r in self.rows if r.source == source)


# ---------------------------------------------------------------------------------------------
# one speed through one source: all departures stacked into one track
# ---------------------------------------------------------------------------------------------


def _fmt_t(t: np.datetime64) -> str:
    if np.isnat(t):
        return "n/a"
    return str(np.datetime64(t, "m")).replace("T", " ") + " UTC"


@dataclass(frozen=True)
class _Block:
    """Per-departure figures of one speed and source ((D,) arrays, (D, 5) and (D, n)); the
    names are those of :class:`SweepResult`, which stacks the blocks over speeds and sources."""

    worst_msi_pct: FloatArray
    worst_idx: NDArray[np.int64]
    hours_class: FloatArray
    hours_missing: FloatArray
    msdv_arrival: FloatArray
    flags: NDArray[np.int64]
    n_missing: NDArray[np.int64]
    comfort_class: NDArray[np.int8]
    limit_driver: NDArray[np.int8]
    prob_taxing_pct: FloatArray


def _reduce(cls: NDArray[np.int64], msi: FloatArray, aw: FloatArray, flags: NDArray[np.int64],
            missing: NDArray[np.bool_], elapsed_s: FloatArray, driver: NDArray[np.int8]) -> _Block:
    """Reduce (D, n) per-sample arrays to per-departure figures (module docstring); the
    driver of the worst-class sample."""
    m = np.where(np.isfinite(msi), msi, -np.inf)
    worst_idx = np.argmax(m, axis=1).astype(np.int64)
    worst = m[np.arange(cls.shape[0]), worst_idx]
    worst = np.where(np.isfinite(worst), worst, np.nan)
    hours, hours_missing = hours_in_classes(cls, dwell_s(elapsed_s))
    return _Block(
        worst_msi_pct=worst, worst_idx=np.where(np.isfinite(worst), worst_idx, -1), hours_class=hours,
        hours_missing=hours_missing, msdv_arrival=msdv_at_end(elapsed_s, aw),
        flags=np.bitwise_or.reduce(flags, axis=1).astype(np.int64),
        n_missing=missing.sum(axis=1).astype(np.int64), comfort_class=cls.astype(np.int8),
        limit_driver=np.take_along_axis(driver, np.argmax(cls, axis=1)[:, None], axis=1)[:, 0].astype(np.int8),
        prob_taxing_pct=prob_taxing_pct(cls),
    )


@dataclass(frozen=True)
class _Setup:
    """What every (speed, source) run shares: the response and sampling settings."""

    profile: object
    station: Optional[str]
    depth: Optional[object]
    gamma: float
    spread_s: float
    long_crested: bool
    method: str
    land_search_km: float
    time_tolerance_s: float


def _outside_block(shape: Tuple[int, int], elapsed_s: FloatArray) -> _Block:
    """Departures none of whose samples lie in the source's time range: all marked OFFTIME."""
    return _reduce(np.full(shape, NOT_COMPUTED_CLASS, dtype=np.int64), np.full(shape, np.nan),
                   np.full(shape, np.nan), np.full(shape, int(SampleFlag.OUTSIDE_TIME), dtype=np.int64),
                   np.ones(shape, dtype=bool), elapsed_s, np.full(shape, -1, dtype=np.int8))


def _run_chunk(plan: PassagePlan, eta: NDArray[np.datetime64], src: object, setup: _Setup, span: Span,
               notes: List[str], name: str) -> Tuple[_Block, str, str]:
    """Departures of one chunk ((D, n) arrival times ``eta``) through one source: every
    (position, time) pair in time order as one track, sampled and answered in one call each."""
    shape = eta.shape
    flat = eta.ravel()
    order = np.argsort(flat, kind="stable")
    inv = np.empty_like(order)
    inv[order] = np.arange(order.size)
    track = plan.take(np.tile(np.arange(plan.n), shape[0])[order], flat[order])
    sea = sample_sea_at(track, [src], depth=setup.depth, land_search_km=setup.land_search_km,
                        time_tolerance_s=setup.time_tolerance_s, progress=span.part(0.0, 0.4))
    mot = respond_motions(track, sea, setup.profile, station=setup.station, gamma=setup.gamma,
                          spread_s=setup.spread_s, long_crested=setup.long_crested, method=setup.method,
                          progress=span.part(0.4, 1.0))
    notes.extend(f"{name}: {n_}" for n_ in sea.notes)
    # calm samples (Hs = 0, no motions to compute) are not missing data
    calm = ~mot.computed & np.isfinite(sea.hs_m) & (sea.hs_m <= 0.0) & ((mot.flags & int(UNCLASSED_FLAGS)) == 0)

    def back(a: NDArray) -> NDArray:
        return a[inv].reshape(shape)

    block = _reduce(back(mot.comfort_class), back(mot.outputs["msi_pct"]), back(mot.outputs["vacc_wf_rms_m_s2"]),
                    back(mot.flags), back(~mot.computed & ~calm), plan.elapsed_s, back(mot.class_driver))
    return block, mot.station_name, mot.method


def _run_source(plan: PassagePlan, deps: NDArray[np.datetime64], src: object, setup: _Setup, span: Span,
                notes: List[str], name: str) -> Tuple[_Block, str, str]:
    """All departures of one speed through one source, in chunks of at most
    :data:`MAX_SAMPLES_PER_CALL` stacked samples."""
    offsets = (deps - deps[0]).astype("timedelta64[ms]")
    per_chunk = max(1, MAX_SAMPLES_PER_CALL // max(plan.n, 1))
    t0, t1 = source_time_range(src)
    tol = np.timedelta64(int(round(setup.time_tolerance_s * 1000.0)), "ms")
    station_name, method_used = setup.station or "", setup.method
    n_chunks = int(math.ceil(deps.size / per_chunk))
    parts: List[_Block] = []
    for c in range(n_chunks):
        sub = span.part(c / n_chunks, (c + 1) / n_chunks)
        sub.check(0.0)
        eta = plan.eta_utc[None, :] + offsets[c * per_chunk:(c + 1) * per_chunk, None]
        if not np.any((eta >= t0 - tol) & (eta <= t1 + tol)):
            parts.append(_outside_block(eta.shape, plan.elapsed_s))
            continue
        block, st, me = _run_chunk(plan, eta, src, setup, sub, notes, name)
        parts.append(block)
        station_name, method_used = st or station_name, me or method_used
        sub.check(1.0)
    block = parts[0] if len(parts) == 1 else _Block(**{
        f: np.concatenate([getattr(p, f) for p in parts], axis=0) for f in _Block.__dataclass_fields__})
    return block, station_name, method_used


# ---------------------------------------------------------------------------------------------
# ranking
# ---------------------------------------------------------------------------------------------


def _criterion_values(criterion: str, worst_msi: FloatArray, hours_above: FloatArray, msdv: FloatArray,
                      within: NDArray[np.bool_], offset_h: FloatArray, prob: Optional[FloatArray] = None) -> FloatArray:
    if criterion == "lowest_prob_taxing" and prob is not None:
        return prob.copy()
    if criterion == "worst_msi":
        return worst_msi.copy()
    if criterion == "hours_above":
        return hours_above.copy()
    if criterion == "dose":
        return msdv.copy()
    return np.where(within, offset_h, np.nan)


def _rank(within: NDArray[np.bool_], complete: NDArray[np.bool_], value: FloatArray, hours_above: FloatArray,
          worst_msi: FloatArray, dep_index: NDArray[np.int64], speed_index: NDArray[np.int64]) -> NDArray[np.int64]:
    """1-based ranks: within limits first, then complete, value (NaN last), hours above, worst
    MSI, departure, speed."""
    def key(a: FloatArray) -> FloatArray:
        return np.where(np.isfinite(a), a, np.inf)

    order = np.lexsort((speed_index, dep_index, key(worst_msi), key(hours_above), key(value),
                        (~complete).astype(int), (~within).astype(int)))
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


def limit_reason(row: SweepRow, max_class: int) -> str:
    """The limit that puts ``row`` outside limits, in words ('' when within limits), in the
    order: forecast coverage, missing results, danger-graded guidance, exceeded criterion,
    comfort class above ``max_class`` (naming the measure that set the class)."""
    from ..comfort.indices import COMFORT_CLASS_LABELS
    from ..comfort.verdict import DRIVERS

    if row.within_limits:
        return ""
    if not row.in_forecast:
        return "outside the forecast's time coverage"
    if row.n_missing:
        return "samples without results"
    if row.flags & int(DANGER_FLAGS):
        return f"danger-graded IMO guidance ({flag_codes(row.flags & int(DANGER_FLAGS))})"
    what = DRIVERS[row.limit_driver] if 0 <= row.limit_driver < len(DRIVERS) else ""
    if row.flags & int(SampleFlag.CRITERIA_EXCEEDED):
        return f"{what} criterion exceeded" if row.limit_driver > 0 else "a seakeeping criterion exceeded"
    return f"comfort class above '{COMFORT_CLASS_LABELS[max_class]}'" + (f" ({what})" if what else "")


def _ruled_out(robust: Sequence[SweepRow], max_class: int) -> str:
    """'ruled out: 12 by lateral acc. criterion exceeded, 3 by ...' over the robust rows."""
    counts: Dict[str, int] = {}
    for r in robust:
        why = limit_reason(r, max_class)
        if why:
            counts[why] = counts.get(why, 0) + 1
    if not counts:
        return ""
    parts = [f"{n} by {why}" for why, n in sorted(counts.items(), key=lambda kv: -kv[1])]
    return f"{sum(counts.values())} of {len(robust)} departure/speed combinations are ruled out: " + "; ".join(parts) + "."


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
        parts.insert(0, "Go.")
        parts.append(f"It stays at or below class '{label}' throughout, inside the forecast, with no criterion "
                     "exceeded and no danger-graded IMO guidance.")
        adv = best.flags & int(SAFETY_ADVISORY)
        if adv:
            parts.append(f"Advisory guidance shown, no veto: {flag_codes(adv)}.")
    else:
        parts.insert(0, f"No departure stays within limits in {srcs}; the least bad is shown.")
        parts.append(f"Not within limits: {limit_reason(best, max_class)}.")
    parts.append(f"Worst MSI (2 h exposure) {_fmt_v(best.worst_msi_pct, '%')} at "
                 f"{_fmt_v(best.worst_msi_dist_nm, 'NM')} ({_fmt_t(best.worst_msi_utc)}); dose at arrival "
                 f"{_fmt_v(best.msdv_arrival, 'm/s^1.5')}, share who may vomit over the {best.duration_h:.1f} h "
                 f"passage {_fmt_v(best.sick_pct_arrival, '%')}.")
    if wins:
        here = [w for w in wins if w[0] <= best.depart_utc <= w[1]]
        if here:
            a, b = here[0]
            parts.append(f"Best window: {_fmt_t(a)}" + ("" if a == b else f" to {_fmt_t(b)}") + ".")
        txt = ", ".join(_fmt_t(a) if a == b else f"{_fmt_t(a)} to {_fmt_t(b)}" for a, b in wins)
        parts.append(f"Departures at {best.speed_kn:g} kn within limits in {srcs}: {txt}.")
    ruled = _ruled_out(robust, max_class)
    if ruled:
        parts.append(ruled)
    return Recommendation(
        depart_utc=best.depart_utc, speed_kn=best.speed_kn, arrive_utc=best.arrive_utc, criterion=criterion,
        criterion_value=best.criterion_value, crit_spread=best.crit_spread, within_limits=best.within_limits,
        in_forecast=best.in_forecast, reason=" ".join(parts), windows_utc=wins,
    )


# ---------------------------------------------------------------------------------------------
# the sweep
# ---------------------------------------------------------------------------------------------


def _checked_choices(criterion: str, max_class: object, method: str, speeds_kn: Sequence[float]) -> Tuple[int, Tuple[float, ...]]:
    """Validate the ranking and response choices; the distinct speeds [kn] in order."""
    if criterion not in CRITERIA:
        raise SeawayInputError(f"criterion must be one of {', '.join(CRITERIA)}, got {show(criterion)}")
    if isinstance(max_class, bool) or not isinstance(max_class, (int, np.integer)) or not 0 <= int(max_class) <= 4:
        raise SeawayInputError(f"max_class must be a whole number 0..4 (comfort class), got {show(max_class)}")
    if method not in ("table", "exact"):
        raise SeawayInputError(f"method must be 'table' or 'exact', got {show(method)}")
    speeds_arr = np.atleast_1d(as_float_array("speeds_kn", speeds_kn)).ravel()
    if speeds_arr.size == 0:
        raise SeawayInputError("speeds_kn must hold at least one speed, got none")
    if np.any(~(speeds_arr > 0)):
        raise SeawayInputError(f"speeds_kn must all be > 0 kn, got {show(speeds_arr.tolist())}")
    return int(max_class), tuple(dict.fromkeys(float(v) for v in speeds_arr))


def _tolerance(time_tolerance_s: float) -> Tuple[float, np.timedelta64]:
    """The sampler's time tolerance [s] >= 0, also as a timedelta64[ms]."""
    tol_s = float(require_nonnegative("time_tolerance_s", time_tolerance_s))
    return tol_s, np.timedelta64(int(round(tol_s * 1000.0)), "ms")


def _checked_sources(sea_states: Sequence[object], deps: NDArray[np.datetime64], tol: np.timedelta64
                     ) -> Tuple[Tuple[str, ...], Tuple[Tuple[np.datetime64, np.datetime64], ...]]:
    """Distinct source names and time ranges; the sources must overlap and hold a departure."""
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
    lo, hi = max(r[0] for r in ranges), min(r[1] for r in ranges)
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
    return names, ranges


def _run_all(plans: Sequence[PassagePlan], deps: NDArray[np.datetime64], sea_states: Sequence[object],
             names: Tuple[str, ...], setup: _Setup, span: Span, notes: List[str]) -> Tuple[Dict[str, NDArray], str, str]:
    """Every speed through every source; the blocks stacked to (S, K, D, ...) arrays by field."""
    jobs = [(s, k) for s in range(len(plans)) for k in range(len(sea_states))]
    blocks: List[_Block] = []
    station_name, method_used = setup.station or "", setup.method
    for j, (s, k) in enumerate(jobs):
        sub = span.part(0.98 * j / len(jobs), 0.98 * (j + 1) / len(jobs))
        ids = member_ids(sea_states[k]) or [None]
        parts = []
        for i, m in enumerate(ids):
            src = sea_states[k] if m is None else sea_states[k].member_source(m)  # type: ignore[attr-defined]
            b, station_name, method_used = _run_source(plans[s], deps, src, setup,
                                                       sub.part(i / len(ids), (i + 1) / len(ids)), notes, names[k])
            parts.append(b)
        blocks.append(parts[0] if len(parts) == 1 else _Block(**combine_member_blocks(
            [{f: getattr(p, f) for f in _Block.__dataclass_fields__} for p in parts])))
    shape = (len(plans), len(sea_states))
    stacked = {f: np.stack([getattr(b, f) for b in blocks]).reshape(shape + getattr(blocks[0], f).shape)
               for f in _Block.__dataclass_fields__}
    return stacked, station_name, method_used


def _where_worst(fig: Dict[str, NDArray], plans: Sequence[PassagePlan], deps: NDArray[np.datetime64],
                 dist_nm: FloatArray) -> Tuple[FloatArray, NDArray[np.datetime64]]:
    """Distance [NM] and time (UTC) of the worst MSI per speed, source and departure."""
    idx = fig.pop("worst_idx")
    ok = idx >= 0
    at = np.where(ok, idx, 0)
    elapsed_ms = np.stack([np.round(p.elapsed_s * 1000.0).astype(np.int64) for p in plans])  # (S, n)
    t_ms = np.take_along_axis(elapsed_ms[:, None, :], at.reshape(at.shape[0], 1, -1), axis=2).reshape(at.shape)
    wdist = np.where(ok, dist_nm[at], np.nan)
    wutc = np.where(ok, deps[None, None, :] + t_ms.astype("timedelta64[ms]"), np.datetime64("NaT"))
    return wdist, wutc.astype("datetime64[ms]")


def _in_forecast(fig: Dict[str, NDArray], deps: NDArray[np.datetime64], arrive: NDArray[np.datetime64],
                 ranges: Sequence[Tuple[np.datetime64, np.datetime64]], tol: np.timedelta64) -> NDArray[np.bool_]:
    """(S, K, D): departure to arrival inside each source's time range (with the tolerance)."""
    t0 = np.array([r[0] for r in ranges])[None, :, None]
    t1 = np.array([r[1] for r in ranges])[None, :, None]
    return ((deps[None, None, :] >= t0 - tol) & (arrive[:, None, :] <= t1 + tol)
            & ((fig["flags"] & int(SampleFlag.OUTSIDE_TIME)) == 0))


def _outside_note(robust_in_forecast: NDArray[np.bool_]) -> List[str]:
    n_out = int(np.count_nonzero(~robust_in_forecast))
    if not n_out:
        return []
    return [f"{n_out} of {robust_in_forecast.size} departure/speed combinations run outside the time coverage "
            "of at least one source: they are marked in_forecast = false and ranked after complete ones"]


def _judge(fig: Dict[str, NDArray], criterion: str, max_class: int, in_forecast: NDArray[np.bool_],
           offset_h: FloatArray) -> Dict[str, NDArray]:
    """Per source: share who may vomit, hours above ``max_class``, within limits, criterion."""
    from ..comfort.indices import vomiting_share_pct

    msdv = fig["msdv_arrival"]
    sick = np.full(msdv.shape, np.nan)
    fin = np.isfinite(msdv)
    sick[fin] = vomiting_share_pct(msdv[fin])
    above = fig["hours_class"][..., max_class + 1:].sum(axis=-1)
    hard = (fig["flags"] & int(HARD_LIMIT_FLAGS)) != 0
    within = in_forecast & (fig["n_missing"] == 0) & (above <= 0.0) & ~hard
    # a sample above max_class with zero dwell (single-sample passage) still counts
    within &= ~np.any(fig["comfort_class"] > max_class, axis=-1)
    crit = _criterion_values(criterion, fig["worst_msi_pct"], above, msdv, within,
                             np.broadcast_to(offset_h, msdv.shape), fig["prob_taxing_pct"])
    return dict(sick_pct_arrival=sick, hours_above=above, within_limits=within, criterion_value=crit)


def _worst_over_sources(a: FloatArray) -> FloatArray:
    fa = np.where(np.isfinite(a), a, -np.inf).max(axis=1)
    return np.where(np.isfinite(fa), fa, np.nan)


def _spread_over_sources(a: FloatArray) -> FloatArray:
    allf = np.isfinite(a).all(axis=1)
    return np.where(allf, np.nanmax(np.where(allf[:, None], a, 0.0), axis=1)
                    - np.nanmin(np.where(allf[:, None], a, 0.0), axis=1), np.nan)


def _robust(fig: Dict[str, NDArray], plans: Sequence[PassagePlan], criterion: str, max_class: int,
            offset_h: FloatArray) -> Dict[str, NDArray]:
    """Worst case over the sources ((S, D) arrays; module docstring)."""
    cls_all = fig["comfort_class"]
    rcls = np.where(np.any(cls_all == NOT_COMPUTED_CLASS, axis=1), NOT_COMPUTED_CLASS,
                    cls_all.max(axis=1)).astype(np.int8)
    hours = [hours_in_classes(rcls[s], dwell_s(p.elapsed_s)) for s, p in enumerate(plans)]
    worst = fig["worst_msi_pct"]
    k_at = np.argmax(np.where(np.isfinite(worst), worst, -np.inf), axis=1)[:, None]
    k_cls = np.argmax(cls_all.max(axis=-1), axis=1)[:, None]  # the source with the worst class
    r = dict(robust_class=rcls, hours_class=np.stack([h for h, _ in hours]),
             hours_missing=np.stack([m for _, m in hours]), worst_msi_pct=_worst_over_sources(worst),
             msdv_arrival=_worst_over_sources(fig["msdv_arrival"]),
             sick_pct_arrival=_worst_over_sources(fig["sick_pct_arrival"]),
             flags=np.bitwise_or.reduce(fig["flags"], axis=1), n_missing=fig["n_missing"].max(axis=1),
             in_forecast=fig["in_forecast"].all(axis=1), within_limits=fig["within_limits"].all(axis=1),
             crit_spread=_spread_over_sources(fig["criterion_value"]), msi_spread=_spread_over_sources(worst),
             limit_driver=np.take_along_axis(fig["limit_driver"], k_cls, axis=1)[:, 0])
    fin = np.isfinite(r["worst_msi_pct"])
    r["worst_msi_dist_nm"] = np.where(fin, np.take_along_axis(fig["worst_msi_dist_nm"], k_at, axis=1)[:, 0], np.nan)
    r["worst_msi_utc"] = np.where(fin, np.take_along_axis(fig["worst_msi_utc"], k_at, axis=1)[:, 0], np.datetime64("NaT"))
    r["hours_above"] = r["hours_class"][..., max_class + 1:].sum(axis=-1)
    if criterion == "earliest_ok":
        r["criterion_value"] = np.where(r["within_limits"], np.broadcast_to(offset_h, r["within_limits"].shape), np.nan)
    elif criterion == "hours_above":
        r["criterion_value"] = r["hours_above"].copy()
    else:
        r["criterion_value"] = _worst_over_sources(fig["criterion_value"])
    return r


def _ranks_of(f: Dict[str, NDArray], criterion: str = "") -> NDArray[np.int64]:
    """Ranks over every departure and speed of one set of (S, D) figures (module docstring);
    ``lowest_prob_taxing`` breaks ties by the (median) worst MSI before the hours above."""
    n_s, n_d = f["worst_msi_pct"].shape
    si, di = np.meshgrid(np.arange(n_s), np.arange(n_d), indexing="ij")
    complete = f["in_forecast"] & (f["n_missing"] == 0)
    second, third = f["hours_above"].ravel(), f["worst_msi_pct"].ravel()
    if criterion == "lowest_prob_taxing":
        second, third = third, second
    return _rank(f["within_limits"].ravel(), complete.ravel(), f["criterion_value"].ravel(), second, third,
                 di.ravel(), si.ravel()).reshape(n_s, n_d)


_ROW_FIELDS = ("worst_msi_pct", "worst_msi_dist_nm", "worst_msi_utc", "hours_missing", "hours_above",
               "msdv_arrival", "sick_pct_arrival", "flags", "n_missing", "in_forecast", "within_limits",
               "criterion_value", "limit_driver")


def _row(f: Dict[str, NDArray], at: Tuple[int, ...], **fixed: object) -> SweepRow:
    """One table row from (S, [K,] D) figures at index ``at``."""
    kinds = {"flags": int, "n_missing": int, "in_forecast": bool, "within_limits": bool, "worst_msi_utc": None,
             "limit_driver": int}
    kw: Dict[str, object] = {}
    for name in _ROW_FIELDS + tuple(k for k in ("crit_spread", "msi_spread") if k in f):
        v = f[name][at]
        kind = kinds.get(name, float)
        kw[name] = v if kind is None else kind(v)
    kw["hours_class"] = tuple(float(x) for x in f["hours_class"][at])
    return SweepRow(**kw, **fixed)  # type: ignore[arg-type]


def _table_rows(fig: Dict[str, NDArray], rob: Dict[str, NDArray], deps: NDArray[np.datetime64],
                speeds: Tuple[float, ...], names: Tuple[str, ...], arrive: NDArray[np.datetime64],
                duration_h: FloatArray, criterion: str = "") -> List[SweepRow]:
    """Every row ordered by speed, departure, source (robust last)."""
    ranks = np.stack([_ranks_of({k: v[:, i] for k, v in fig.items()}, criterion) for i in range(len(names))], axis=1)
    r_ranks = _ranks_of(rob, criterion)
    rows: List[SweepRow] = []
    for s in range(len(speeds)):
        for d in range(deps.size):
            common = dict(depart_utc=deps[d], speed_kn=speeds[s], arrive_utc=arrive[s, d],
                          duration_h=float(duration_h[s]))
            rows.extend(_row(fig, (s, k, d), rank=int(ranks[s, k, d]), source=names[k], **common)
                        for k in range(len(names)))
            rows.append(_row(rob, (s, d), rank=int(r_ranks[s, d]), source=ROBUST_SOURCE, **common))
    return rows


def _timing(plans: Sequence[PassagePlan], deps: NDArray[np.datetime64]) -> Dict[str, NDArray]:
    """Hours after departure per speed and sample, durations, arrivals, departure offsets [h]."""
    elapsed_h = np.stack([p.elapsed_s / SECONDS_PER_HOUR for p in plans])
    dur_ms = np.array([int(p.elapsed_s[-1] * 1000.0 + 0.5) for p in plans], dtype=np.int64)
    return dict(elapsed_h=elapsed_h, duration_h=elapsed_h[:, -1].copy(),
                arrive_utc=deps[None, :] + dur_ms[:, None].astype("timedelta64[ms]"),
                offset_h=(deps - deps[0]).astype("timedelta64[ms]").astype(np.float64) / 3.6e6)


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

    The departure window (UTC) and step [h] as :func:`departure_times`; each source evaluated on
    its own; ``criterion`` one of :data:`CRITERIA`, ``max_class`` the worst acceptable comfort
    class 0..4; ``method`` "table" (default) or "exact"; the other arguments as
    :func:`.passage.pipeline.compute_passage`. Raises :class:`SeawayInputError` for bad input
    (naming it), when the sources' time ranges do not overlap, or when no departure lies inside
    the forecast of every source; :class:`.passage.progress.PassageCancelled` on a stop.
    """
    max_class, speeds = _checked_choices(criterion, max_class, method, speeds_kn)
    deps = departure_times(depart_from_utc, depart_to_utc, step_h)
    tol_s, tol = _tolerance(time_tolerance_s)
    names, ranges = _checked_sources(sea_states, deps, tol)
    span = Span(progress, what="departure sweep")
    span.check(0.0)
    plans = [plan_passage(route_lon_deg, route_lat_deg, departure_utc=deps[0], speed_kn=v, spacing_nm=spacing_nm)
             for v in speeds]
    setup = _Setup(profile, station, depth, gamma, spread_s, long_crested, method, land_search_km, tol_s)
    notes: List[str] = []
    fig, station_name, method_used = _run_all(plans, deps, sea_states, names, setup, span, notes)
    tm = _timing(plans, deps)
    dist_nm = np.asarray(nm_from_m(plans[0].dist_m), dtype=float)
    fig["worst_msi_dist_nm"], fig["worst_msi_utc"] = _where_worst(fig, plans, deps, dist_nm)
    fig["in_forecast"] = _in_forecast(fig, deps, tm["arrive_utc"], ranges, tol)
    fig.update(_judge(fig, criterion, max_class, fig["in_forecast"], tm["offset_h"]))
    rob = _robust(fig, plans, criterion, max_class, tm["offset_h"])
    rows = _table_rows(fig, rob, deps, speeds, names, tm["arrive_utc"], tm["duration_h"], criterion)
    notes.extend(_outside_note(rob["in_forecast"]))
    rec = _recommend(rows, deps, rob["within_limits"], list(speeds), criterion, max_class, len(names))
    span.check(1.0)
    return SweepResult(
        departures_utc=deps, speeds_kn=speeds, source_names=names, criterion=criterion, max_class=max_class,
        dist_nm=dist_nm, elapsed_h=tm["elapsed_h"], arrive_utc=tm["arrive_utc"], duration_h=tm["duration_h"],
        robust_class=rob["robust_class"], rows=tuple(rows), recommendation=rec, **fig,
        vessel_name=str(getattr(profile, "name", "") or ""), station_name=station_name, method=method_used,
        source_time_ranges=ranges, notes=tuple(dict.fromkeys(notes)),
    )
