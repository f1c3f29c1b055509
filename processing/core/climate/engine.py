# SPDX-License-Identifier: GPL-2.0-or-later
"""Seasonal comfort climate, step 1: comfort class per hindcast time step and route sample.

For every time step t of the hindcast and every fixed route sample i the sea state
(Hs, Tp, direction) is read (:mod:`.hindcast`) and turned into the station's motions through
the RESPONSE-TABLE path: the table of per-unit-Hs**2 responses over (Tp, relative heading) is
built ONCE for the vessel, speed and spectrum shape (:func:`..tables.build_response_table`,
through the disk cache :mod:`..motions.table_cache`)
and looked up for all (t, i) pairs; spectra are never recomputed per time step. Linear
superposition makes every RMS response proportional to Hs (Lewis (ed.) 1989, Principles of
Naval Architecture vol. III ch. 8).

From the motions at the chosen station:

* MSI [%] (2 h, O'Hanlon & McCauley 1974 as in Lloyd 1989) from the mean absolute vertical
  acceleration sqrt(2/pi) sigma_a and the mean encounter frequency sqrt(m2/m0) of the vertical
  acceleration (:func:`..comfort.msi_percent`);
* criteria usage = largest RMS value / limit of the station task's NORDFORSK (1987) criteria
  (:func:`..criteria.evaluate_criteria`); "exceeded" where usage > 1;
* comfort class 0..4 = :func:`..comfort.comfort_class` (our own five-step scale).

Conventions and choices (documented here, used by :mod:`.windows` and :mod:`.monthly`):

* relative heading mu (ITTC: 0 following, 180 head) from the local course of the sample (the
  course the vessel steers there, degrees true, going to) and the wave direction (coming from);
* deep water everywhere (the climate reads no bathymetry);
* a step is MISSING at a sample (class -1) where the hindcast has no step (gap), the position is
  outside the grid, all neighbours are no-data, or a value is implausible (Hs < 0, Tp <= 0);
  missing steps are counted, never turned into zeros;
* Tp outside the table's Tp grid is clamped and counted as "method limit" (OUTSIDE_VALIDITY).

Everything a worker needs is in one picklable :class:`ClimateSetup` (no QGIS, no open files),
so chunks can run in other processes or on Dask workers (:mod:`.backends`).
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Optional, Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..units import FloatArray
from ..validation import SeawayInputError, require_in_range, require_positive, show
from .hindcast import HindcastSeries, PointWeights, point_weights, read_point_values

__all__ = [
    "MISSING_CLASS",
    "ClimateSetup",
    "StepClasses",
    "prepare_climate",
    "classify_sea",
    "classify_steps",
]

MISSING_CLASS: int = -1
"""Class of a (step, sample) without data."""

LOOKUP_PAIRS: int = 50_000
"""(step, sample) pairs per table look-up call (bounds the temporary arrays)."""


@dataclass(frozen=True)
class ClimateSetup:
    """Everything the per-chunk computation needs (picklable; ships to worker processes).

    Route samples (n): ``lon_deg``, ``lat_deg``, ``dist_m`` along the route, ``course_deg``
    (local course, deg true), ``segment_index`` (input segment), ``elapsed_s`` time since
    departure at ``speed_kn``; ``offset_steps`` (n,) = round(elapsed_s / step_s), the hindcast
    step nearest to the moment the vessel reaches the sample (:mod:`.windows`).
    ``weights`` bilinear neighbours on the hindcast grid; ``table`` the response table;
    ``station_index`` into ``table.station_names``; ``task`` the station's criteria task;
    ``max_class`` worst acceptable comfort class (0..4); ``series`` the hindcast time axis
    and where each step is stored; ``vessel_name``, ``station_name``, ``gamma``,
    ``spread_s``, ``long_crested``.
    """

    lon_deg: FloatArray
    lat_deg: FloatArray
    dist_m: FloatArray
    course_deg: FloatArray
    segment_index: NDArray[np.int64]
    elapsed_s: FloatArray
    offset_steps: NDArray[np.int64]
    weights: PointWeights
    table: Any
    station_index: int
    task: str
    max_class: int
    speed_kn: float
    series: HindcastSeries
    vessel_name: str
    station_name: str
    gamma: float
    spread_s: float
    long_crested: bool

    @property
    def n(self) -> int:
        return int(self.lon_deg.size)

    @property
    def passage_s(self) -> float:
        """Passage duration from the first to the last sample [s]."""
        return float(self.elapsed_s[-1])

    @property
    def passage_steps(self) -> int:
        """Hindcast steps spanned by one passage (the chunk overlap)."""
        return int(self.offset_steps.max())


@dataclass(frozen=True)
class StepClasses:
    """Per (step, sample) results for nt steps and n samples.

    ``comfort_class`` (nt, n) int8, -1 = missing; ``exceeded`` (nt, n) criteria exceeded at the
    station; ``method_limit`` (nt, n) sea state outside the table/transfer validity;
    ``implausible`` (nt, n) a value was present but implausible (Hs < 0 or Tp <= 0).
    """

    comfort_class: NDArray[np.int8]
    exceeded: NDArray[np.bool_]
    method_limit: NDArray[np.bool_]
    implausible: NDArray[np.bool_]


def _timed_route(route_lon_deg: ArrayLike, route_lat_deg: ArrayLike, spacing_nm: float,
                 speed_kn: float, series: HindcastSeries) -> Tuple[Any, FloatArray, FloatArray, NDArray[np.int64]]:
    """Route samples every ``spacing_nm`` [NM], their distance [m], elapsed time [s] at
    ``speed_kn`` [kn] and offset in hindcast steps (nearest step); the passage must fit the data."""
    from ..passage.route import densify_route, elapsed_time_s

    rs = densify_route(route_lon_deg, route_lat_deg, spacing_nm)
    dist = np.asarray(rs.dist_m, dtype=float)
    if dist.size < 2 or not dist[-1] > 0:
        raise SeawayInputError("the route has no length (all vertices coincide): draw a route with distinct points")
    elapsed = np.asarray(elapsed_time_s(dist, speed_kn), dtype=float)
    offs = np.rint(elapsed / float(series.step_s)).astype(np.int64)
    if offs[-1] >= series.n_steps:
        raise SeawayInputError(
            f"the passage takes {elapsed[-1] / 3600.0:.1f} h at {speed_kn:g} kn, longer than the whole hindcast "
            f"({series.n_steps} steps of {series.step_s / 3600.0:g} h)"
        )
    return rs, dist, elapsed, offs


def prepare_climate(
    route_lon_deg: ArrayLike,
    route_lat_deg: ArrayLike,
    series: HindcastSeries,
    profile: Any,
    *,
    speed_kn: float,
    station: Optional[str] = None,
    max_class: int = 1,
    spacing_nm: float = 1.0,
    gamma: float = 3.3,
    spread_s: float = 4.0,
    long_crested: bool = False,
    table: Any = None,
) -> ClimateSetup:
    """Sample the route, time it at ``speed_kn`` [kn], place it on the hindcast grid and build
    the response table once (or reuse ``table`` when given; it must hold the station).

    ``max_class`` worst acceptable comfort class 0..4; ``spacing_nm`` sample spacing [NM];
    ``gamma`` JONSWAP peak enhancement (>= 1), ``spread_s`` cos-2s spreading exponent.
    """
    from ..api import transfer_model
    from ..motions.table_cache import cached_table
    from ..units import m_s_from_kn
    from ..vessel.profile import resolve_vessel

    prof = resolve_vessel(profile)
    speed = float(require_positive("speed_kn", speed_kn))
    mc = float(require_in_range("max_class", max_class, 0, 4))
    if mc != int(mc):
        raise SeawayInputError(f"max_class must be a whole number 0..4, got {show(max_class)}")
    g = float(require_in_range("gamma", gamma, 1.0, 20.0))
    s = float(require_in_range("spread_s", spread_s, 0.0, 200.0))
    require_positive("spacing_nm", spacing_nm)
    st = prof.station(station)
    rs, dist, elapsed, offs = _timed_route(route_lon_deg, route_lat_deg, float(spacing_nm), speed,
                                           series)
    pw = point_weights(series.grid, rs.lon_deg, rs.lat_deg)
    if table is None:
        table = cached_table(transfer_model(prof), [st], float(m_s_from_kn(speed)),
                                     gamma=g, spread_s=s, long_crested=bool(long_crested))
    if st.name not in table.station_names:
        raise SeawayInputError(f"the response table has no station {show(st.name)} (has: {', '.join(table.station_names)})")
    return ClimateSetup(
        lon_deg=np.asarray(rs.lon_deg, dtype=float), lat_deg=np.asarray(rs.lat_deg, dtype=float),
        dist_m=dist, course_deg=np.asarray(rs.course_deg, dtype=float),
        segment_index=np.asarray(rs.segment_index, dtype=np.int64), elapsed_s=elapsed, offset_steps=offs,
        weights=pw, table=table, station_index=int(table.station_names.index(st.name)), task=st.task,
        max_class=int(mc), speed_kn=speed, series=series, vessel_name=prof.name, station_name=st.name,
        gamma=g, spread_s=s, long_crested=bool(long_crested),
    )


def classify_sea(setup: ClimateSetup, hs_m: FloatArray, tp_s: FloatArray, wave_from_deg: FloatArray) -> StepClasses:
    """Comfort class, criteria exceedance and method-limit flag for (nt, n) sea states at the
    route samples (module docstring for the chain of formulas)."""
    from ..comfort.indices import comfort_class, mean_abs_from_rms, msi_percent
    from ..comfort.criteria import evaluate_criteria
    from ..flags import SampleFlag
    from ..waves.encounter import relative_heading_deg

    hs = np.asarray(hs_m, dtype=float)
    tp = np.asarray(tp_s, dtype=float)
    wd = np.asarray(wave_from_deg, dtype=float)
    shape = hs.shape
    finite = np.isfinite(hs) & np.isfinite(tp) & np.isfinite(wd)
    odd = finite & ((hs < 0) | (tp <= 0))
    valid = finite & ~odd
    cls = np.full(shape, MISSING_CLASS, dtype=np.int8)
    exc = np.zeros(shape, dtype=bool)
    lim = np.zeros(shape, dtype=bool)
    flat = np.flatnonzero(valid.ravel())
    if flat.size:
        course = np.broadcast_to(setup.course_deg[None, :], shape).ravel()
        h, t, d, c = hs.ravel(), tp.ravel(), wd.ravel(), course
        si = setup.station_index
        cls_f, exc_f, lim_f = cls.ravel(), exc.ravel(), lim.ravel()
        for a in range(0, flat.size, LOOKUP_PAIRS):
            idx = flat[a:a + LOOKUP_PAIRS]
            mu = relative_heading_deg(c[idx], d[idx])
            res = setup.table.lookup(h[idx], t[idx], mu)
            vacc = res.vacc_rms_m_s2[:, si]
            msi = msi_percent(mean_abs_from_rms(vacc), res.vacc_omega_rad_s[:, si])
            crit = evaluate_criteria(setup.task, vacc, res.lacc_rms_m_s2[:, si], res.roll_rms_deg)
            cls_f[idx] = comfort_class(msi, crit.usage).astype(np.int8)
            exc_f[idx] = crit.exceeded
            lim_f[idx] = (res.flags & int(SampleFlag.OUTSIDE_VALIDITY)) != 0
        cls, exc, lim = cls_f.reshape(shape), exc_f.reshape(shape), lim_f.reshape(shape)
    return StepClasses(comfort_class=cls, exceeded=exc, method_limit=lim, implausible=odd)


def classify_steps(setup: ClimateSetup, a: int, b: int, *, block_steps: Optional[int] = None,
                   reader: Any = None) -> StepClasses:
    """:func:`classify_sea` for hindcast steps [a, b) of ``setup.series``, read in blocks of
    ``block_steps`` steps (default: about LOOKUP_PAIRS pairs per block) to bound memory."""
    from .hindcast import _Reader

    n = setup.n
    a, b = int(a), int(b)
    if not 0 <= a <= b <= setup.series.n_steps:
        raise SeawayInputError(f"step range [{a}, {b}) outside the hindcast's 0..{setup.series.n_steps}")
    blk = int(block_steps) if block_steps else max(1, LOOKUP_PAIRS // max(n, 1))
    cls = np.empty((b - a, n), dtype=np.int8)
    exc = np.empty((b - a, n), dtype=bool)
    lim = np.empty((b - a, n), dtype=bool)
    odd = np.empty((b - a, n), dtype=bool)
    own = reader is None
    rd = _Reader() if own else reader
    try:
        for s0 in range(a, b, blk):
            s1 = min(b, s0 + blk)
            hs, tp, wd = read_point_values(setup.series, setup.weights, s0, s1, reader=rd)
            sc = classify_sea(setup, hs, tp, wd)
            sl = slice(s0 - a, s1 - a)
            cls[sl], exc[sl], lim[sl], odd[sl] = sc.comfort_class, sc.exceeded, sc.method_limit, sc.implausible
    finally:
        if own:
            rd.close()
    return StepClasses(comfort_class=cls, exceeded=exc, method_limit=lim, implausible=odd)
