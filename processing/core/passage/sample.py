# SPDX-License-Identifier: GPL-2.0-or-later
"""Step 2 of a passage: sea state (combined and partitions) and depth at each sample and time.

Several sources: the first valid one wins per sample; samples no source covers keep NaN values
and the flags of the first source (why it had no data); never zero, never dropped.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import List, Optional, Sequence, Tuple

import numpy as np
from numpy.typing import NDArray

from ..flags import SampleFlag
from ..seastate.sampled_sea_state import SeaArrays
from ..units import FloatArray
from ..validation import SeawayInputError
from .plan import PassagePlan, Track, as_utc_datetime64
from .progress import PassageCancelled, Progress, Span

__all__ = [
    "DEFAULT_TIME_TOLERANCE_S", "DEFAULT_LAND_SEARCH_KM", "SeaAtSamples", "source_time_range",
    "source_display_name", "check_departure_in_forecast", "sample_sea_at", "sample_sea",
]

DEFAULT_TIME_TOLERANCE_S: float = 1800.0
"""How far outside a forecast's time range a time may lie and still use the nearest step."""

DEFAULT_LAND_SEARCH_KM: float = 30.0
"""Radius searched for a valid sea cell when a sample falls on land or no-data."""

_CANCELLED = "passage computation cancelled while sampling the sea state"


@dataclass(frozen=True)
class SeaAtSamples(SeaArrays):
    """Sea state and depth at each sample (NaN where not available; see ``flags``).

    ``hs_m`` significant wave height [m], ``tp_s`` peak period [s], ``wave_from_deg`` direction
    the waves come from [deg true]; ``partition_names`` and ``partition_hs_m`` / ``_tp_s`` /
    ``_from_deg`` (n, p) when every contributing source has the same partitions (else p = 0);
    ``depth_m`` [m] (NaN = deep water assumed); ``valid`` (sea data present); ``source`` name of
    the source used per sample ('' where none); ``flags`` SampleFlag bit masks; ``notes``.
    """

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


def check_departure_in_forecast(departure_utc: object, sea_states: Sequence[object], *,
                                time_tolerance_s: float = DEFAULT_TIME_TOLERANCE_S) -> None:
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


class _FirstValid:
    """Sea state gathered source by source: a sample keeps the first source with data."""

    def __init__(self, n: int) -> None:
        self.n = n
        self.hs, self.tp, self.wdir = np.full(n, np.nan), np.full(n, np.nan), np.full(n, np.nan)
        self.valid = np.zeros(n, dtype=bool)
        self.flags = np.zeros(n, dtype=np.int64)
        self.first_flags: Optional[NDArray[np.int64]] = None
        self.source = np.array([""] * n, dtype=object)
        self.notes: List[str] = []
        self.part_names: Optional[Tuple[str, ...]] = None
        self.part_ok = True
        self.parts = (np.zeros((n, 0)),) * 3

    def add(self, got: object, todo: NDArray[np.int64], name: str) -> None:
        """Take the valid samples of one source's answer for the samples ``todo``."""
        ok = np.asarray(got.valid, dtype=bool)
        gflags = np.asarray(got.flags, dtype=np.int64)
        if self.first_flags is None:
            self.first_flags = np.zeros(self.n, dtype=np.int64)
            self.first_flags[todo] = gflags
        use = todo[ok]
        for arr, attr in ((self.hs, "hs_m"), (self.tp, "tp_s"), (self.wdir, "wave_from_deg")):
            arr[use] = np.asarray(getattr(got, attr), dtype=float)[ok]
        self.flags[use] = gflags[ok]
        self.valid[use] = True
        self.source[use] = name
        self.notes.extend(f"{name}: {note}" for note in (getattr(got, "notes", ()) or ()))
        if use.size:
            self._add_partitions(got, todo, ok, use)

    def _add_partitions(self, got: object, todo: NDArray[np.int64], ok: NDArray[np.bool_],
                        use: NDArray[np.int64]) -> None:
        names = tuple(getattr(got, "partition_names", ()) or ())
        if self.part_names is None:
            self.part_names = names
            self.parts = tuple(np.full((self.n, len(names)), np.nan) for _ in range(3))
        if names != self.part_names:
            self.part_ok = False
        elif names:
            for arr, attr in zip(self.parts, ("partition_hs_m", "partition_tp_s", "partition_from_deg")):
                arr[use] = _partition_array(got, attr, todo.size)[ok]

    def partitions(self) -> Tuple[Tuple[str, ...], FloatArray, FloatArray, FloatArray]:
        """Partition names and (n, p) arrays, or none when sources differ in their partitions."""
        if self.part_names and self.part_ok:
            return (self.part_names,) + tuple(self.parts)  # type: ignore[return-value]
        if self.part_names and not self.part_ok:
            self.notes.append("sources differ in their wave partitions: the combined sea state (Hs, Tp, "
                              "direction) is used for every sample")
        empty = np.zeros((self.n, 0))
        return (), empty, empty, empty


def _read_sources(track: Track, sea_states: Sequence[object], land_search_km: float,
                  time_tolerance_s: float, span: Span) -> _FirstValid:
    """Ask each source in turn for the samples still without sea data."""
    from ..seastate import SamplingCancelled

    acc = _FirstValid(track.n)
    errors: List[SeawayInputError] = []
    for i, src in enumerate(sea_states):
        todo = np.flatnonzero(~acc.valid)
        if todo.size == 0:
            break
        sub = span.part(i / len(sea_states), (i + 1) / len(sea_states))
        try:
            got = src.sample(track.lon_deg[todo], track.lat_deg[todo], track.eta_utc[todo],
                             land_search_km=land_search_km, time_tolerance_s=time_tolerance_s, progress=sub)
        except SamplingCancelled as exc:
            raise PassageCancelled(_CANCELLED) from exc
        except SeawayInputError as exc:
            # this source covers none of the remaining samples; a later one may
            errors.append(exc)
            acc.notes.append(f"{source_display_name(src, i)}: {exc}")
            continue
        if sub.cancelled:
            raise PassageCancelled(_CANCELLED)
        acc.add(got, todo, str(getattr(got, "source_name", "") or source_display_name(src, i)))
    if acc.first_flags is None:
        # no source covered any sample: the first source's reason is the message
        raise errors[0]
    acc.flags[~acc.valid] = acc.first_flags[~acc.valid]
    return acc


def _sample_depth(track: Track, depth: Optional[object], flags: NDArray[np.int64],
                  notes: List[str]) -> FloatArray:
    """Depth at the samples [m] (NaN = deep water assumed, flagged); updates ``flags``."""
    if depth is None:
        flags |= int(SampleFlag.DEPTH_ASSUMED_DEEP)
        notes.append("no bathymetry given: deep water assumed everywhere")
        return np.full(track.n, np.nan)
    ds = depth.sample(track.lon_deg, track.lat_deg)
    depth_m = np.asarray(ds.depth_m, dtype=float).copy()
    flags |= np.asarray(ds.flags, dtype=np.int64)
    # non-positive or missing depth means "deep water assumed": keep NaN, never 0
    bad = ~np.isfinite(depth_m) | (depth_m <= 0.0)
    depth_m[bad] = np.nan
    flags[bad & ((flags & int(SampleFlag.DEPTH_ON_LAND)) == 0)] |= int(SampleFlag.DEPTH_ASSUMED_DEEP)
    return depth_m


def sample_sea_at(track: Track, sea_states: Sequence[object], *, depth: Optional[object] = None,
                  land_search_km: float = DEFAULT_LAND_SEARCH_KM,
                  time_tolerance_s: float = DEFAULT_TIME_TOLERANCE_S,
                  progress: Optional[Progress] = None) -> SeaAtSamples:
    """Sea state at every (position, time) of ``track``; several sources: the first valid wins.

    ``sea_states`` are open :class:`.seastate.SeaStateSource` objects, in order of preference.
    ``depth`` is an open :class:`.seastate.Bathymetry` or None (deep water, every sample
    flagged DEEPASSUMED).
    """
    if not sea_states:
        raise SeawayInputError("sea_states must hold at least one sea-state source, got none")
    span = Span(progress)
    acc = _read_sources(track, sea_states, land_search_km, time_tolerance_s, span)
    names, p_hs, p_tp, p_dir = acc.partitions()
    depth_m = _sample_depth(track, depth, acc.flags, acc.notes)
    span.check(1.0)
    return SeaAtSamples(
        hs_m=acc.hs, tp_s=acc.tp, wave_from_deg=acc.wdir, partition_names=tuple(names),
        partition_hs_m=p_hs, partition_tp_s=p_tp, partition_from_deg=p_dir, depth_m=depth_m,
        valid=acc.valid, source=tuple(str(s) for s in acc.source), flags=acc.flags,
        notes=tuple(dict.fromkeys(acc.notes)),
    )


def sample_sea(plan: PassagePlan, sea_states: Sequence[object], *, depth: Optional[object] = None,
               land_search_km: float = DEFAULT_LAND_SEARCH_KM,
               time_tolerance_s: float = DEFAULT_TIME_TOLERANCE_S,
               progress: Optional[Progress] = None) -> SeaAtSamples:
    """:func:`sample_sea_at` for one passage, after checking that its departure lies inside
    some source's forecast (:func:`check_departure_in_forecast`)."""
    if not sea_states:
        raise SeawayInputError("sea_states must hold at least one sea-state source, got none")
    check_departure_in_forecast(plan.departure_utc, sea_states, time_tolerance_s=time_tolerance_s)
    return sample_sea_at(plan, sea_states, depth=depth, land_search_km=land_search_km,
                         time_tolerance_s=time_tolerance_s, progress=progress)
