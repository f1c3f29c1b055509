# SPDX-License-Identifier: GPL-2.0-or-later
"""The passage pipeline: one leg from route vertices to per-sample motions and comfort.

Three plain steps, each reusable on its own (a departure sweep repeats steps 2-3 with
:meth:`PassagePlan.with_departure`; a seasonal climate repeats them over hindcast chunks):

1. :func:`plan_passage` - geodesic samples along the leg and their arrival times (UTC);
2. :func:`sample_sea` - sea state (combined and partitions) and depth at each sample and time,
   first valid source wins, per-sample flags kept;
3. :func:`respond` - peak-component wave kinematics at the local depth, relative heading,
   encounter period, the vessel's motion statistics and comfort indices, and the cumulative
   motion sickness dose along the passage.

:func:`compute_passage` chains the three. Samples without sea data are kept with NaN motions
and their flags (never zero, never dropped); their comfort class is :data:`NOT_COMPUTED_CLASS`.

Formulas used here (the others live in the modules called):

* Peak-component kinematics: wavelength L and phase speed c of a linear wave of period Tp at
  local depth h from omega**2 = g k tanh(k h) (Airy theory; USACE Shore Protection Manual 1984
  ch. 2), via :func:`.dispersion.wave_kinematics`.
* Relative heading mu (0 following, 90 beam, 180 head; ITTC convention) and encounter period
  Te = 2 pi / |omega - k U cos mu| (Lewis (ed.) 1989, Principles of Naval Architecture vol. III
  ch. 8), via :mod:`.heading`; undefined (NaN, flag OUTRUN) when the vessel overtakes the crests.
* Cumulative motion sickness dose value (ISO 2631-1:1997 Annex D):
  MSDV(t) = ( integral_0^t a_w(tau)**2 d tau )**(1/2) [m/s^1.5], a_w the Wf-weighted RMS vertical
  acceleration [m/s^2]; integrated here with the trapezoid rule on a_w**2 between consecutive
  samples (exact when a_w**2 varies linearly in time), through :func:`.comfort.msdv_cumulative`.
  Intervals with an end point without sea data contribute nothing (noted in ``notes``).
"""
from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass, field, replace
from typing import Callable, Dict, List, Optional, Sequence, Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..flags import NOT_COMPUTED_FLAGS, SampleFlag, flag_codes_array, flag_counts
from ..units import SECONDS_PER_HOUR, FloatArray, m_s_from_kn, nm_from_m
from ..validation import SeawayInputError, as_float_array, require_in_range, require_positive, show

__all__ = [
    "NOT_COMPUTED_CLASS",
    "PassageCancelled",
    "PassagePlan",
    "SeaAtSamples",
    "PassageResult",
    "PassageSummary",
    "as_utc_datetime64",
    "plan_passage",
    "check_departure_in_forecast",
    "sample_sea",
    "respond",
    "compute_passage",
]

NOT_COMPUTED_CLASS: int = -1
"""Comfort class of a sample without results (written as NULL by the algorithms)."""

DEFAULT_TIME_TOLERANCE_S: float = 1800.0
"""How far outside a forecast's time range a time may lie and still use the nearest step."""

DEFAULT_LAND_SEARCH_KM: float = 30.0
"""Radius searched for a valid sea cell when a sample falls on land or no-data."""

SHALLOW_DEPTH_PER_WAVELENGTH: float = 1.0 / 20.0
"""Shallow-water limit h/L < 1/20 (USACE Shore Protection Manual 1984, ch. 2)."""

RESPONSE_CHUNK: int = 256
"""Samples per response call (progress and cancel are checked between chunks)."""

Progress = Callable[[float], bool]


class PassageCancelled(Exception):
    """The progress callback asked to stop (returned False)."""


class _Stage:
    """Map a stage's own fraction 0..1 onto [lo, hi] of the caller's progress; raise on cancel."""

    def __init__(self, progress: Optional[Progress], lo: float, hi: float) -> None:
        self.progress, self.lo, self.hi = progress, lo, hi
        self.cancelled = False

    def __call__(self, fraction: float) -> bool:
        if self.progress is None:
            return True
        f = self.lo + (self.hi - self.lo) * min(max(float(fraction), 0.0), 1.0)
        if self.progress(f) is False:
            self.cancelled = True
            return False
        return True

    def check(self, fraction: float) -> None:
        if not self(fraction) or self.cancelled:
            raise PassageCancelled("passage computation cancelled")


# ---------------------------------------------------------------------------------------------
# time helpers
# ---------------------------------------------------------------------------------------------


def as_utc_datetime64(name: str, value: object) -> np.datetime64:
    """A UTC instant as ``numpy.datetime64[ms]``.

    Accepts ``numpy.datetime64``, ``datetime.datetime`` (naive = UTC; aware converted to UTC)
    and ISO 8601 text (``2031-05-04T06:00``, ``...Z`` or ``...+02:00``). Anything else raises
    :class:`SeawayInputError` naming ``name`` and the value.
    """
    try:
        if isinstance(value, np.datetime64):
            out = value.astype("datetime64[ms]")
        elif isinstance(value, _dt.datetime):
            if value.tzinfo is not None:
                value = value.astimezone(_dt.timezone.utc).replace(tzinfo=None)
            out = np.datetime64(value, "ms")
        elif isinstance(value, str):
            text = value.strip()
            if text.endswith(("Z", "z")):
                text = text[:-1] + "+00:00"
            parsed = _dt.datetime.fromisoformat(text)
            return as_utc_datetime64(name, parsed)
        else:
            raise TypeError(type(value).__name__)
    except (TypeError, ValueError) as exc:
        raise SeawayInputError(
            f"{name} must be a UTC date-time (ISO 8601 text, datetime or datetime64), got {show(value)}"
        ) from exc
    if np.isnat(out):
        raise SeawayInputError(f"{name} must be a valid date-time, got {show(value)}")
    return out


def _seconds_since(t: NDArray, t0: np.datetime64) -> FloatArray:
    return (t - t0).astype("timedelta64[ms]").astype(np.float64) / 1000.0


def _dwell_s(t_s: FloatArray) -> FloatArray:
    """Time each sample stands for: half the interval before plus half the interval after [s]."""
    n = t_s.size
    out = np.zeros(n)
    if n >= 2:
        d = np.diff(t_s)
        out[:-1] += 0.5 * d
        out[1:] += 0.5 * d
    return out


# ---------------------------------------------------------------------------------------------
# step 1: geometry and arrival times
# ---------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class PassagePlan:
    """Samples of one leg and the times the vessel reaches them.

    Fields (n samples): ``lon_deg``, ``lat_deg`` (WGS84), ``dist_m`` geodesic distance from the
    leg's start [m], ``course_deg`` local forward azimuth (degrees true, going to),
    ``is_vertex``, ``segment_index`` (index of the input segment), ``eta_utc``
    (``datetime64[ms]``, UTC), ``speed_kn`` speed through the water [kn] per sample; plus the
    ``leg`` index and ``departure_utc``.
    """

    leg: int
    lon_deg: FloatArray
    lat_deg: FloatArray
    dist_m: FloatArray
    course_deg: FloatArray
    is_vertex: NDArray[np.bool_]
    segment_index: NDArray[np.int64]
    eta_utc: NDArray[np.datetime64]
    speed_kn: FloatArray
    departure_utc: np.datetime64

    @property
    def n(self) -> int:
        return int(self.lon_deg.size)

    @property
    def elapsed_s(self) -> FloatArray:
        """Seconds since departure at each sample."""
        return _seconds_since(self.eta_utc, self.departure_utc)

    def with_departure(self, departure_utc: object) -> "PassagePlan":
        """The same samples with every arrival time shifted to a new departure (for sweeps)."""
        dep = as_utc_datetime64("departure_utc", departure_utc)
        shift = dep - self.departure_utc
        return replace(self, eta_utc=self.eta_utc + shift, departure_utc=dep)


def plan_passage(
    route_lon_deg: ArrayLike,
    route_lat_deg: ArrayLike,
    *,
    departure_utc: object,
    speed_kn: float,
    spacing_nm: float = 1.0,
    leg: int = 0,
) -> PassagePlan:
    """Densify one leg along geodesics and time it at constant speed.

    Parameters
    ----------
    route_lon_deg, route_lat_deg : vertices of the leg [deg, WGS84], at least two.
    departure_utc : departure instant (see :func:`as_utc_datetime64`).
    speed_kn : speed through the water [kn], > 0.
    spacing_nm : sample spacing [NM], > 0 (vertices are always samples).
    leg : leg index carried into the results.
    """
    from .route import arrival_times_utc, densify_route

    lon = as_float_array("route_lon_deg", route_lon_deg).ravel()
    lat = require_in_range("route_lat_deg", route_lat_deg, -90.0, 90.0, unit="deg").ravel()
    if lon.size != lat.size:
        raise SeawayInputError(
            f"route_lon_deg and route_lat_deg must have the same length, got {lon.size} and {lat.size}"
        )
    if lon.size < 2:
        raise SeawayInputError(f"a leg needs at least 2 vertices, got {lon.size}")
    speed = require_positive("speed_kn", speed_kn)
    if speed.ndim != 0:
        raise SeawayInputError(f"speed_kn must be one number per leg, got shape {speed.shape}")
    require_positive("spacing_nm", spacing_nm)
    dep = as_utc_datetime64("departure_utc", departure_utc)
    samples = densify_route(lon, lat, float(spacing_nm))
    dist = np.asarray(samples.dist_m, dtype=float)
    if dist.size < 2 or not dist[-1] > 0.0:
        raise SeawayInputError(
            f"leg {leg} has no length (all {lon.size} vertices coincide): draw a route with distinct points"
        )
    eta = np.asarray(arrival_times_utc(dist, dep, float(speed)), dtype="datetime64[ms]")
    return PassagePlan(
        leg=int(leg),
        lon_deg=np.asarray(samples.lon_deg, dtype=float),
        lat_deg=np.asarray(samples.lat_deg, dtype=float),
        dist_m=dist,
        course_deg=np.asarray(samples.course_deg, dtype=float),
        is_vertex=np.asarray(samples.is_vertex, dtype=bool),
        segment_index=np.asarray(samples.segment_index, dtype=np.int64),
        eta_utc=eta,
        speed_kn=np.full(dist.size, float(speed)),
        departure_utc=dep,
    )


# ---------------------------------------------------------------------------------------------
# step 2: sea state and depth at the samples
# ---------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class SeaAtSamples:
    """Sea state and depth at each sample (NaN where not available; see ``flags``).

    ``hs_m`` significant wave height [m], ``tp_s`` peak period [s], ``wave_from_deg`` direction
    the waves come from [deg true]; ``partition_names`` and ``partition_hs_m`` / ``_tp_s`` /
    ``_from_deg`` (n, p) when every contributing source has the same partitions (else p = 0);
    ``depth_m`` [m] (NaN = deep water assumed); ``valid`` (sea data present); ``source`` name of
    the source used per sample ('' where none); ``flags`` SampleFlag bit masks; ``notes``.
    """

    hs_m: FloatArray
    tp_s: FloatArray
    wave_from_deg: FloatArray
    partition_names: Tuple[str, ...]
    partition_hs_m: FloatArray
    partition_tp_s: FloatArray
    partition_from_deg: FloatArray
    depth_m: FloatArray
    valid: NDArray[np.bool_]
    source: Tuple[str, ...]
    flags: NDArray[np.int64]
    notes: Tuple[str, ...]


def source_time_range(src: object) -> Tuple[np.datetime64, np.datetime64]:
    """(first, last) valid time of a sea-state source, as datetime64[ms] UTC."""
    t0, t1 = getattr(src, "time_range_utc")
    return (np.datetime64(t0, "ms"), np.datetime64(t1, "ms"))


def source_display_name(src: object, index: int) -> str:
    """The user-facing name of a source, or "source N" (1-based) when it has none."""
    name = getattr(src, "name", None)
    return str(name) if name else f"source {index + 1}"


def check_departure_in_forecast(
    departure_utc: object,
    sea_states: Sequence[object],
    *,
    time_tolerance_s: float = DEFAULT_TIME_TOLERANCE_S,
) -> None:
    """Raise :class:`SeawayInputError` unless the departure lies inside some source's time range.

    Arrival times after the end of the forecast are not an error: those samples are flagged
    OFFTIME. A departure outside every source's range cannot give any result, so it is.
    """
    dep = as_utc_datetime64("departure_utc", departure_utc)
    tol = np.timedelta64(int(round(float(time_tolerance_s) * 1000.0)), "ms")
    ranges = []
    for i, src in enumerate(sea_states):
        t0, t1 = source_time_range(src)
        if t0 - tol <= dep <= t1 + tol:
            return
        ranges.append(f"{source_display_name(src, i)}: {t0.astype('datetime64[m]')} to {t1.astype('datetime64[m]')} UTC")
    raise SeawayInputError(
        f"departure_utc {dep.astype('datetime64[m]')} UTC lies outside the time range of every "
        f"sea-state source ({'; '.join(ranges)}): choose a departure inside the forecast"
    )


def _partition_array(sampled: object, attr: str, n: int) -> FloatArray:
    arr = getattr(sampled, attr, None)
    if arr is None:
        return np.zeros((n, 0))
    arr = np.asarray(arr, dtype=float)
    if arr.size == 0:
        return np.zeros((n, 0))
    return arr.reshape(n, -1)


def sample_sea(
    plan: PassagePlan,
    sea_states: Sequence[object],
    *,
    depth: Optional[object] = None,
    land_search_km: float = DEFAULT_LAND_SEARCH_KM,
    time_tolerance_s: float = DEFAULT_TIME_TOLERANCE_S,
    progress: Optional[Progress] = None,
) -> SeaAtSamples:
    """Sea state at every sample and arrival time; several sources: the first valid one wins.

    ``sea_states`` are open :class:`.seastate.SeaStateSource` objects, in order of preference.
    Samples that no source covers keep NaN values and the flags of the first source (why it had
    no data). ``depth`` is an open :class:`.seastate.Bathymetry` or None (deep water, every sample
    flagged DEEPASSUMED).
    """
    from ..seastate import SamplingCancelled

    if not sea_states:
        raise SeawayInputError("sea_states must hold at least one sea-state source, got none")
    stage = _Stage(progress, 0.0, 1.0)
    check_departure_in_forecast(plan.departure_utc, sea_states, time_tolerance_s=time_tolerance_s)
    n = plan.n
    hs = np.full(n, np.nan)
    tp = np.full(n, np.nan)
    wdir = np.full(n, np.nan)
    valid = np.zeros(n, dtype=bool)
    flags = np.zeros(n, dtype=np.int64)
    first_flags: Optional[NDArray[np.int64]] = None
    source = np.array([""] * n, dtype=object)
    notes: List[str] = []
    part_names: Optional[Tuple[str, ...]] = None
    part_ok = True
    part_hs = part_tp = part_dir = None
    n_src = len(sea_states)
    errors: List[SeawayInputError] = []
    for i, src in enumerate(sea_states):
        todo = np.flatnonzero(~valid)
        if todo.size == 0:
            break
        sub = _Stage(stage, i / n_src, (i + 1) / n_src)
        try:
            got = src.sample(
                plan.lon_deg[todo],
                plan.lat_deg[todo],
                plan.eta_utc[todo],
                land_search_km=land_search_km,
                time_tolerance_s=time_tolerance_s,
                progress=sub,
            )
        except SamplingCancelled as exc:
            raise PassageCancelled("passage computation cancelled while sampling the sea state") from exc
        except SeawayInputError as exc:
            # this source covers none of the remaining samples; a later one may
            errors.append(exc)
            notes.append(f"{source_display_name(src, i)}: {exc}")
            continue
        if sub.cancelled:
            raise PassageCancelled("passage computation cancelled while sampling the sea state")
        ok = np.asarray(got.valid, dtype=bool)
        gflags = np.asarray(got.flags, dtype=np.int64)
        if first_flags is None:
            first_flags = np.zeros(n, dtype=np.int64)
            first_flags[todo] = gflags
        use = todo[ok]
        hs[use] = np.asarray(got.hs_m, dtype=float)[ok]
        tp[use] = np.asarray(got.tp_s, dtype=float)[ok]
        wdir[use] = np.asarray(got.wave_from_deg, dtype=float)[ok]
        flags[use] = gflags[ok]
        valid[use] = True
        name = str(getattr(got, "source_name", "") or source_display_name(src, i))
        source[use] = name
        for note in getattr(got, "notes", ()) or ():
            notes.append(f"{name}: {note}")
        names = tuple(getattr(got, "partition_names", ()) or ())
        if use.size:
            if part_names is None:
                part_names = names
                p = len(names)
                part_hs = np.full((n, p), np.nan)
                part_tp = np.full((n, p), np.nan)
                part_dir = np.full((n, p), np.nan)
            if names != part_names:
                part_ok = False
            elif names:
                part_hs[use] = _partition_array(got, "partition_hs_m", todo.size)[ok]
                part_tp[use] = _partition_array(got, "partition_tp_s", todo.size)[ok]
                part_dir[use] = _partition_array(got, "partition_from_deg", todo.size)[ok]
    if first_flags is None:
        # no source covered any sample: the first source's reason is the message
        raise errors[0]
    flags[~valid] = first_flags[~valid]
    if part_names is None or not part_ok or not part_names:
        if part_names and not part_ok:
            notes.append(
                "sources differ in their wave partitions: the combined sea state (Hs, Tp, "
                "direction) is used for every sample"
            )
        part_names = ()
        part_hs = part_tp = part_dir = np.zeros((n, 0))
    # depth
    if depth is None:
        depth_m = np.full(n, np.nan)
        flags |= int(SampleFlag.DEPTH_ASSUMED_DEEP)
        notes.append("no bathymetry given: deep water assumed everywhere")
    else:
        ds = depth.sample(plan.lon_deg, plan.lat_deg)
        depth_m = np.asarray(ds.depth_m, dtype=float).copy()
        flags |= np.asarray(ds.flags, dtype=np.int64)
        # non-positive or missing depth means "deep water assumed": keep NaN, never 0
        bad = ~np.isfinite(depth_m) | (depth_m <= 0.0)
        depth_m[bad] = np.nan
        flags[bad & ((flags & int(SampleFlag.DEPTH_ON_LAND)) == 0)] |= int(SampleFlag.DEPTH_ASSUMED_DEEP)
    stage.check(1.0)
    return SeaAtSamples(
        hs_m=hs,
        tp_s=tp,
        wave_from_deg=wdir,
        partition_names=tuple(part_names),
        partition_hs_m=part_hs,
        partition_tp_s=part_tp,
        partition_from_deg=part_dir,
        depth_m=depth_m,
        valid=valid,
        source=tuple(str(s) for s in source),
        flags=flags,
        notes=tuple(dict.fromkeys(notes)),
    )


# ---------------------------------------------------------------------------------------------
# step 3: response, comfort and the cumulative dose
# ---------------------------------------------------------------------------------------------


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


@dataclass(frozen=True)
class PassageResult:
    """Per-sample results of one passage leg (arrays of length n; NaN where not computed).

    Public field names (the output layer's fields use the same names): ``leg``, ``seq``,
    ``eta_utc`` (datetime64[ms] UTC), ``dist_nm``, ``course_deg``, ``hs_m``, ``tp_s``,
    ``wave_from_deg``, ``depth_m`` (NaN = deep water assumed), ``wavelength_m``,
    ``celerity_m_s`` (peak component at local depth), ``rel_heading_deg`` (0 following,
    90 beam, 180 head), ``enc_period_s`` (NaN when overtaking), ``heave_rms_m``,
    ``pitch_rms_deg``, ``roll_rms_deg``, ``pitch_tz_s``, ``vacc_rms_m_s2``, ``lacc_rms_m_s2``,
    ``msi_pct`` (O'Hanlon & McCauley 1974, 2 h), ``msdv_cum`` [m/s^1.5] (ISO 2631-1),
    ``comfort_class`` (0..4, :data:`NOT_COMPUTED_CLASS` = -1 where not computed),
    ``comfort_label`` ('' where not computed), ``flags`` (SampleFlag masks), ``source``.
    Extra per-sample fields: ``lon_deg``, ``lat_deg``, ``speed_kn``, ``heave_tz_s``,
    ``roll_tz_s``, ``vacc_wf_rms_m_s2``, ``vomit_pct`` (ISO 2631-1 Annex D, from ``msdv_cum``),
    ``dwell_s`` (time each sample stands for), ``is_vertex``, ``computed``.
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
    heave_rms_m: FloatArray
    pitch_rms_deg: FloatArray
    roll_rms_deg: FloatArray
    pitch_tz_s: FloatArray
    vacc_rms_m_s2: FloatArray
    lacc_rms_m_s2: FloatArray
    msi_pct: FloatArray
    msdv_cum: FloatArray
    comfort_class: NDArray[np.int64]
    comfort_label: Tuple[str, ...]
    flags: NDArray[np.int64]
    source: Tuple[str, ...]
    lon_deg: FloatArray
    lat_deg: FloatArray
    speed_kn: FloatArray
    heave_tz_s: FloatArray
    roll_tz_s: FloatArray
    vacc_wf_rms_m_s2: FloatArray
    vomit_pct: FloatArray
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

        out: Dict[str, float] = {}
        for c, label in enumerate(COMFORT_CLASS_LABELS):
            out[label] = float(self.dwell_s[self.comfort_class == c].sum() / SECONDS_PER_HOUR)
        out["not computed"] = float(
            self.dwell_s[self.comfort_class == NOT_COMPUTED_CLASS].sum() / SECONDS_PER_HOUR
        )
        return out

    def worst_index(self) -> Optional[int]:
        """Index of the worst computed sample (highest class, then highest vertical
        acceleration), or None when nothing was computed."""
        idx = np.flatnonzero(self.computed)
        if idx.size == 0:
            return None
        acc = np.nan_to_num(self.vacc_rms_m_s2[idx], nan=-1.0)
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

        duration = float(self.dwell_s.sum() / SECONDS_PER_HOUR)
        return PassageSummary(
            leg=int(self.leg[0]) if self.n else 0,
            n_samples=self.n,
            n_computed=int(comp.sum()),
            distance_nm=float(self.dist_nm[-1]) if self.n else 0.0,
            duration_h=duration,
            departure_utc=self.eta_utc[0],
            arrival_utc=self.eta_utc[-1],
            hours_per_class=self.hours_per_class(),
            worst_index=self.worst_index(),
            max_hs_m=_max(self.hs_m),
            max_msi_pct=_max(self.msi_pct),
            final_msdv=_last(self.msdv_cum),
            final_vomit_pct=_last(self.vomit_pct),
            flag_counts=self.flag_counts(),
        )


def _interval_dose_inputs(t_s: FloatArray, aw: FloatArray) -> Tuple[FloatArray, FloatArray]:
    """Per-interval RMS a_w and duration for the trapezoid rule on a_w**2 (ISO 2631-1 MSDV).

    Interval i runs from sample i-1 to i; element 0 is an empty interval. a_i = sqrt((a_{i-1}**2 +
    a_i**2) / 2) so that a_i**2 dt_i is the trapezoid area. Intervals touching a NaN sample get
    dt = 0 (no contribution).
    """
    n = aw.size
    a_int = np.zeros(n)
    dt = np.zeros(n)
    if n >= 2:
        a2 = 0.5 * (aw[:-1] ** 2 + aw[1:] ** 2)
        ok = np.isfinite(a2)
        a_int[1:][ok] = np.sqrt(a2[ok])
        dt[1:][ok] = np.diff(t_s)[ok]
    return a_int, dt


def respond(
    plan: PassagePlan,
    sea: SeaAtSamples,
    profile: object,
    *,
    station: Optional[str] = None,
    gamma: float = 3.3,
    spread_s: float = 4.0,
    long_crested: bool = False,
    method: Optional[str] = None,
    progress: Optional[Progress] = None,
) -> PassageResult:
    """Motions and comfort at every sample with sea data, and the cumulative dose.

    Calls :func:`.api.assess_motions` on the computed samples only, with the partitions when
    the sea state has them. ``method`` None chooses once per leg as the api does (exact below
    ``AUTO_TABLE_MIN_SAMPLES`` samples, tables from there on); the exact path runs in chunks of
    :data:`RESPONSE_CHUNK` samples so that progress and cancel work.
    """
    from ..api import AUTO_TABLE_MIN_SAMPLES, SeaPartitions, assess_motions
    from ..comfort.indices import COMFORT_CLASS_LABELS, msdv_cumulative, vomiting_share_pct
    from ..waves.dispersion import wave_kinematics
    from ..waves.encounter import encounter_period, relative_heading_deg

    stage = _Stage(progress, 0.0, 1.0)
    n = plan.n
    if sea.hs_m.size != n:
        raise SeawayInputError(f"sea has {sea.hs_m.size} samples but the plan has {n}")
    gamma_v = float(require_positive("gamma", gamma))
    spread_v = float(require_positive("spread_s", spread_s))
    flags = sea.flags.copy()
    comp = sea.valid & np.isfinite(sea.hs_m) & np.isfinite(sea.tp_s) & np.isfinite(sea.wave_from_deg)
    comp &= (sea.flags & int(NOT_COMPUTED_FLAGS)) == 0
    comp &= (sea.tp_s > 0) & (sea.hs_m >= 0)
    # Hs = 0 (flat calm in the forecast) is a value, not missing data: the response is zero
    idx = np.flatnonzero(comp)
    nan = np.full(n, np.nan)

    def full() -> FloatArray:
        return nan.copy()

    speed_m_s = m_s_from_kn(plan.speed_kn)
    depth_arg = np.where(np.isfinite(sea.depth_m), sea.depth_m, np.inf)
    wavelength, celerity, rel, enc = full(), full(), full(), full()
    rel_all = np.asarray(relative_heading_deg(plan.course_deg[idx], sea.wave_from_deg[idx]), dtype=float)
    if idx.size:
        kin = wave_kinematics(sea.tp_s[idx], depth_arg[idx])
        wavelength[idx] = kin.wavelength_m
        celerity[idx] = kin.celerity_m_s
        rel[idx] = rel_all
        ep = encounter_period(sea.tp_s[idx], speed_m_s[idx], rel_all, depth_arg[idx])
        over = np.asarray(ep.overtaking, dtype=bool)
        te = np.asarray(ep.period_s, dtype=float).copy()
        te[over] = np.nan
        enc[idx] = te
        flags[idx[over]] |= int(SampleFlag.OVERTAKING)
        shallow = np.isfinite(sea.depth_m[idx]) & (
            sea.depth_m[idx] < SHALLOW_DEPTH_PER_WAVELENGTH * kin.wavelength_m
        )
        flags[idx[shallow]] |= int(SampleFlag.SHALLOW_WATER)
    stage.check(0.05)

    names = (
        "heave_rms_m", "pitch_rms_deg", "roll_rms_deg", "heave_tz_s", "pitch_tz_s", "roll_tz_s",
        "vacc_rms_m_s2", "lacc_rms_m_s2", "vacc_wf_rms_m_s2", "msi_pct",
    )
    out: Dict[str, FloatArray] = {k: full() for k in names}
    cls = np.full(n, NOT_COMPUTED_CLASS, dtype=np.int64)
    roll_period = float("nan")
    station_name = station or ""
    method_used = method or ""
    use_parts = len(sea.partition_names) > 0
    notes = list(sea.notes)
    # decide the method once for the whole leg: the table path builds its tables from the
    # speeds and depths of one call, so it gets every sample in one call (the same numbers
    # whatever the chunking); the exact path runs in chunks so progress and cancel work
    chosen = method if method not in (None, "auto") else (
        "exact" if idx.size < AUTO_TABLE_MIN_SAMPLES else "table")
    step = RESPONSE_CHUNK if chosen == "exact" else max(idx.size, 1)
    for start in range(0, idx.size, step):
        chunk = idx[start:start + step]
        parts = None
        if use_parts:
            p_hs = sea.partition_hs_m[chunk].copy()
            p_tp = sea.partition_tp_s[chunk].copy()
            p_dir = sea.partition_from_deg[chunk].copy()
            # a partition missing at a sample carries no energy there; give it the combined
            # period and direction so the (zero) term stays finite
            miss = ~(np.isfinite(p_hs) & np.isfinite(p_tp) & np.isfinite(p_dir) & (p_tp > 0))
            if miss.any():
                p_hs[miss] = 0.0
                p_tp = np.where(miss, sea.tp_s[chunk][:, None], p_tp)
                p_dir = np.where(miss, sea.wave_from_deg[chunk][:, None], p_dir)
            empty = p_hs.sum(axis=1) <= 0.0
            if empty.any():
                p_hs[empty, 0] = sea.hs_m[chunk][empty]
                p_tp[empty, 0] = sea.tp_s[chunk][empty]
                p_dir[empty, 0] = sea.wave_from_deg[chunk][empty]
            p = p_hs.shape[1]
            parts = SeaPartitions(
                hs_m=p_hs,
                tp_s=p_tp,
                wave_from_deg=p_dir,
                gamma=np.full(p, gamma_v),
                spread_s=np.full(p, spread_v),
                names=tuple(sea.partition_names),
            )
        res = assess_motions(
            profile,
            hs_m=sea.hs_m[chunk],
            tp_s=sea.tp_s[chunk],
            wave_from_deg=sea.wave_from_deg[chunk],
            course_deg=plan.course_deg[chunk],
            speed_m_s=speed_m_s[chunk],
            depth_m=depth_arg[chunk] if np.isfinite(sea.depth_m[chunk]).any() else None,
            station=station,
            gamma=gamma_v,
            spread_s=spread_v,
            long_crested=bool(long_crested),
            partitions=parts,
            method=chosen,
        )
        for k in names:
            out[k][chunk] = np.asarray(getattr(res, k), dtype=float)
        cls[chunk] = np.asarray(res.comfort_class, dtype=np.int64)
        flags[chunk] |= np.asarray(res.flags, dtype=np.int64)
        roll_period = float(getattr(res, "roll_period_s", roll_period))
        st = getattr(res, "station", None)
        station_name = str(getattr(st, "name", st) or station_name)
        method_used = str(getattr(res, "method", method_used) or method_used)
        stage.check(0.05 + 0.9 * (start + chunk.size) / max(idx.size, 1))

    t_s = plan.elapsed_s
    aw = out["vacc_wf_rms_m_s2"]
    a_int, dt_int = _interval_dose_inputs(t_s, aw)
    msdv = np.asarray(msdv_cumulative(a_int, dt_int), dtype=float).copy()
    msdv[~comp] = np.nan
    gap = np.count_nonzero((dt_int == 0.0)[1:] & (np.diff(t_s) > 0))
    if idx.size and gap:
        notes.append(
            f"the cumulative dose (msdv_cum) leaves out {gap} sample intervals without sea data"
        )
    vomit = full()
    if idx.size:
        vomit[idx] = np.asarray(vomiting_share_pct(msdv[idx]), dtype=float)
    labels = tuple(COMFORT_CLASS_LABELS[c] if c >= 0 else "" for c in cls)
    stage.check(1.0)
    vessel_name = str(getattr(profile, "name", "") or "")
    return PassageResult(
        leg=np.full(n, plan.leg, dtype=np.int64),
        seq=np.arange(n, dtype=np.int64),
        eta_utc=plan.eta_utc.copy(),
        dist_nm=np.asarray(nm_from_m(plan.dist_m), dtype=float),
        course_deg=plan.course_deg.copy(),
        hs_m=np.where(sea.valid, sea.hs_m, np.nan),
        tp_s=np.where(sea.valid, sea.tp_s, np.nan),
        wave_from_deg=np.where(sea.valid, sea.wave_from_deg, np.nan),
        depth_m=sea.depth_m.copy(),
        wavelength_m=wavelength,
        celerity_m_s=celerity,
        rel_heading_deg=rel,
        enc_period_s=enc,
        heave_rms_m=out["heave_rms_m"],
        pitch_rms_deg=out["pitch_rms_deg"],
        roll_rms_deg=out["roll_rms_deg"],
        pitch_tz_s=out["pitch_tz_s"],
        vacc_rms_m_s2=out["vacc_rms_m_s2"],
        lacc_rms_m_s2=out["lacc_rms_m_s2"],
        msi_pct=out["msi_pct"],
        msdv_cum=msdv,
        comfort_class=cls,
        comfort_label=labels,
        flags=flags,
        source=tuple(sea.source),
        lon_deg=plan.lon_deg.copy(),
        lat_deg=plan.lat_deg.copy(),
        speed_kn=plan.speed_kn.copy(),
        heave_tz_s=out["heave_tz_s"],
        roll_tz_s=out["roll_tz_s"],
        vacc_wf_rms_m_s2=aw,
        vomit_pct=vomit,
        dwell_s=_dwell_s(t_s),
        is_vertex=plan.is_vertex.copy(),
        computed=comp,
        vessel_name=vessel_name,
        station_name=station_name,
        method=method_used,
        roll_period_s=roll_period,
        departure_utc=plan.departure_utc,
        partition_names=tuple(sea.partition_names),
        notes=tuple(dict.fromkeys(notes)),
    )


def compute_passage(
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
) -> PassageResult:
    """The whole pipeline for one leg: :func:`plan_passage`, :func:`sample_sea`, :func:`respond`.

    ``progress(fraction) -> bool`` is called with 0..1; returning False raises
    :class:`PassageCancelled`. Bad input raises :class:`SeawayInputError` naming the input.
    """
    outer = _Stage(progress, 0.0, 1.0)
    outer.check(0.0)
    plan = plan_passage(
        route_lon_deg, route_lat_deg, departure_utc=departure_utc, speed_kn=speed_kn,
        spacing_nm=spacing_nm, leg=leg,
    )
    outer.check(0.05)
    sea = sample_sea(
        plan, sea_states, depth=depth, land_search_km=land_search_km,
        time_tolerance_s=time_tolerance_s, progress=_Stage(progress, 0.05, 0.5),
    )
    return respond(
        plan, sea, profile, station=station, gamma=gamma, spread_s=spread_s,
        long_crested=long_crested, method=method, progress=_Stage(progress, 0.5, 1.0),
    )
