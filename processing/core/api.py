# SPDX-License-Identifier: GPL-2.0-or-later
"""One-call facade: motions, comfort indices, criteria and guidance flags at one station.

Pipeline: sea state(s) -> encounter with the vessel -> spectral motion response
(:mod:`.response`, or the tabulated fast path :mod:`.tables`) -> MSI (:mod:`.comfort`),
NORDFORSK criteria (:mod:`.criteria`), comfort class, IMO MSC.1/Circ.1228 flags
(:mod:`.safety`).

Every result carries :data:`.flags.CAUTION`: a planning aid, not a substitute for the
master's judgement, official forecasts and warnings, or local rules and regulations.

Example (QGIS Python console or a notebook; inside QGIS the package is the installed plugin,
e.g. ``import seaway_comfort``)::

    import numpy as np
    from seaway_comfort.processing.core.api import assess_motions
    from seaway_comfort.processing.core.vessel.profile import builtin_profile

    boat = builtin_profile("harbour_workboat_12m")
    res = assess_motions(boat, hs_m=[0.8, 1.2, 1.6], tp_s=[5.0, 6.0, 7.0],
                         wave_from_deg=[250.0, 260.0, 270.0], course_deg=90.0,
                         speed_m_s=3.5, station="wheelhouse")
    print(res.vacc_rms_m_s2, res.msi_pct, res.comfort_class, res.flags)
    print(res.caution)
"""
from __future__ import annotations

import math
from collections import OrderedDict
from dataclasses import dataclass, field
from typing import Any, Dict, Optional, Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from .comfort.verdict import comfort_verdict
from .flags import CAUTION, SampleFlag
from .waves.encounter import relative_heading_deg
from .motions.rao_table import TableTransfer, load_rao_table
from .motions.response import (
    MotionResponse,
    combine_quantities,
    RESPONSE_ARRAYS,
    motion_response,
    prepare_sea,
    validity_flags,
)
from .comfort.guidance import circ1228_flags
from .motions.table_cache import cached_table_set, is_cached
from .motions.tables import ResponseTableSet
from .motions.closed_form import ClosedFormTransfer
from .plausibility import (
    DEPTH_M, EXPOSURE_H, GAMMA, HS_M, SPEED_M_S, SPREAD_S, STEEPNESS_DOUBT, TP_S,
    check_range, doubtful, sea_steepness,
)
from .motions.rao_cache import cached_strip_transfer
from .units import G_STANDARD_M_S2, FloatArray
from .validation import (
    SeawayInputError,
    as_float_array,
    require_nonnegative,
    require_positive,
    show,
)
from .vessel.profile import Station, VesselProfile

__all__ = ["SeaPartitions", "MotionAssessment", "assess_motions", "transfer_model", "choose_method",
           "METHOD_COST_S"]

METHOD_COST_S: Dict[str, float] = {
    "exact_per_sample_partition": 9.0e-5,
    "table_build": 0.065,
    "table_load": 0.0015,
    "lookup_per_sample_partition": 2.5e-7,
}
"""Cost model of the automatic method choice [s] on ONE core, 48 x 24 spectral grid, one
station, measured with tests/bench/bench_method_cost.py on the project's 2-core test machine
(example vessel coastal_survey_35m, median of 5): exact path 89-94 us per sample and
partition; one default response table (100 Tp x 73 headings) 0.063 s to build, 1.1 ms to load
from the disk cache; look-up 0.23 us per sample and partition. Only the ratios matter. The
exact path and the build scale with n_freq x n_dir (factor n_freq n_dir / 1152). See
:func:`choose_method`."""
_TABLE_CACHE: "OrderedDict[Any, ResponseTableSet]" = OrderedDict()
_TABLE_CACHE_SIZE = 8


@dataclass(frozen=True)
class SeaPartitions:
    """Sea-state partitions for n samples: hs_m, tp_s, wave_from_deg (n, p) [m, s, deg true
    "from"]; gamma, spread_s (p,) JONSWAP gamma and cos-2s exponent; names (p,) labels.
    hs_m = 0 marks an absent partition."""

    hs_m: FloatArray
    tp_s: FloatArray
    wave_from_deg: FloatArray
    gamma: FloatArray
    spread_s: FloatArray
    names: Tuple[str, ...]

    def __post_init__(self) -> None:
        hs, tp, wf = prepare_sea(self.hs_m, self.tp_s, self.wave_from_deg)
        _check_sea("partitions.hs_m", hs, "partitions.tp_s", tp)
        p = hs.shape[1]
        gam = np.atleast_1d(as_float_array("gamma", self.gamma)).astype(float)
        spr = np.atleast_1d(require_nonnegative("spread_s", self.spread_s)).astype(float)
        if gam.shape != (p,) or spr.shape != (p,) or len(self.names) != p:
            raise SeawayInputError(
                f"SeaPartitions: {p} partitions in hs_m, but gamma {gam.shape}, spread_s {spr.shape}, "
                f"names {len(self.names)}"
            )
        if np.any(gam < 1.0):
            raise SeawayInputError(f"SeaPartitions gamma must be >= 1, got {show(gam[gam < 1][0])}")
        for k, v in (("hs_m", hs), ("tp_s", tp), ("wave_from_deg", wf), ("gamma", gam), ("spread_s", spr)):
            object.__setattr__(self, k, v)
        object.__setattr__(self, "names", tuple(str(x) for x in self.names))


@dataclass(frozen=True)
class MotionAssessment:
    """Results at one station for n samples ((n,) arrays unless stated).

    heave_rms_m, pitch_rms_deg, roll_rms_deg: RMS motions; *_tz_s: mean zero-crossing
    encounter periods; vacc_rms_m_s2 / lacc_rms_m_s2: RMS vertical acceleration / lateral
    specific force at the station; vacc_wf_rms_m_s2: ISO 2631-1 Wf-weighted RMS vertical
    acceleration (accumulate MSDV with :func:`.comfort.msdv_cumulative`); vacc_omega_rad_s:
    mean encounter frequency sqrt(m2/m0) of the vertical acceleration (used for MSI);
    msi_pct: motion sickness incidence for ``exposure_h``; comfort_class: int64 0..4
    (:data:`.comfort.COMFORT_CLASS_LABELS`; always from the 2 h MSI and the criteria usage, so
    classes do not depend on ``exposure_h``); flags: int64 SampleFlag mask; criteria_margin:
    criterion -> 1 - value/limit; sway_rms_m, yaw_rms_deg: RMS sway at midships and yaw (NaN
    for a model without them: closed form, RAO table); roll_period_s: natural roll period
    used (the strip model's own from GM and the roll inertia); station, task,
    method ("exact" or "table"); caution: the planning-aid caution text.
    """

    heave_rms_m: FloatArray
    pitch_rms_deg: FloatArray
    roll_rms_deg: FloatArray
    heave_tz_s: FloatArray
    pitch_tz_s: FloatArray
    roll_tz_s: FloatArray
    vacc_rms_m_s2: FloatArray
    lacc_rms_m_s2: FloatArray
    vacc_wf_rms_m_s2: FloatArray
    vacc_omega_rad_s: FloatArray
    msi_pct: FloatArray
    comfort_class: NDArray[np.int64]
    flags: NDArray[np.int64]
    criteria_margin: Dict[str, FloatArray]
    roll_period_s: float
    sway_rms_m: FloatArray
    yaw_rms_deg: FloatArray
    station: str
    method: str
    task: str = ""
    exposure_h: float = 2.0
    caution: str = field(default=CAUTION)


def transfer_model(profile: VesselProfile, *, g_m_s2: float = G_STANDARD_M_S2,
                   cache_folder: Optional[str] = None) -> Any:
    """The profile's transfer model: its RAO table when one is set; else by ``motion_model``:
    "strip" (default) the strip-theory RAO set (:mod:`.motions.strip_transfer`, cached on disk
    in ``cache_folder`` or the default of :func:`.motions.rao_cache.cache_folder`), or
    "closed_form" (:mod:`.motions.closed_form`)."""
    path = profile.rao_table_path()
    if path is not None:
        return TableTransfer(load_rao_table(path))
    if profile.motion_model == "closed_form":
        return ClosedFormTransfer.from_profile(profile, g_m_s2=g_m_s2)
    return cached_strip_transfer(profile, folder=cache_folder, g_m_s2=g_m_s2)


def _vec(name: str, v: ArrayLike, n: int, *, nonneg: bool = False) -> FloatArray:
    a = require_nonnegative(name, v) if nonneg else as_float_array(name, v)
    a = np.atleast_1d(a).reshape(-1)
    if a.size not in (1, n):
        raise SeawayInputError(f"{name} has {a.size} values, expected 1 or {n} (one per sample)")
    return np.ascontiguousarray(np.broadcast_to(a, (n,)), dtype=float)


def _file_key(path: Any) -> Any:
    """(path, modification time) of an input file so that an edited file is re-read; None."""
    if path is None:
        return None
    try:
        return (str(path), path.stat().st_mtime_ns)
    except OSError:
        return (str(path), None)


def _table_set_key(profile: VesselProfile, station: Station, speeds: FloatArray, depths: Optional[FloatArray],
                   gamma: float, spread: float, long_crested: bool, n_freq: int, n_dir: int) -> Any:
    """Key of a table set in the in-memory cache (an edited RAO table or section file is re-read)."""
    rao_key = tuple(_file_key(f) for f in (profile.rao_table_path(), profile.hull_sections_path()))
    return (profile, rao_key, station, tuple(np.round(speeds, 6)), None if depths is None else tuple(np.round(depths, 6)),
            gamma, spread, long_crested, n_freq, n_dir)


def _table_set(profile: VesselProfile, station: Station, transfer: Any, speeds: FloatArray,
               depths: Optional[FloatArray], gamma: float, spread: float, long_crested: bool, n_freq: int,
               n_dir: int) -> ResponseTableSet:
    """Table set for ONE station (the one assessed): from memory, else from the disk cache
    (:mod:`.motions.table_cache`), else built."""
    key = _table_set_key(profile, station, speeds, depths, gamma, spread, long_crested, n_freq, n_dir)
    hit = _TABLE_CACHE.get(key)
    if hit is not None:
        _TABLE_CACHE.move_to_end(key)
        return hit
    ts = cached_table_set(transfer, (station,), speeds, depths, gamma=gamma, spread_s=spread,
                          long_crested=long_crested, n_freq=n_freq, n_dir=n_dir)
    _TABLE_CACHE[key] = ts
    while len(_TABLE_CACHE) > _TABLE_CACHE_SIZE:
        _TABLE_CACHE.popitem(last=False)
    return ts


def _table_path_cost_s(profile: VesselProfile, st: Station, speeds: FloatArray, shapes: Any,
                       long_crested: bool, n_freq: int, n_dir: int) -> float:
    """Cost [s] of getting the tables (memory: 0, disk: load, else build) by METHOD_COST_S."""
    c, scale, transfer = METHOD_COST_S, n_freq * n_dir / 1152.0, None
    cost = 0.0
    for g, s in shapes:
        if _table_set_key(profile, st, speeds, None, g, s, long_crested, n_freq, n_dir) in _TABLE_CACHE:
            continue
        transfer = transfer_model(profile) if transfer is None else transfer
        for u in speeds:
            warm = is_cached(transfer, (st,), float(u), gamma=g, spread_s=s, long_crested=long_crested,
                             n_freq=n_freq, n_dir=n_dir)
            cost += c["table_load"] if warm else c["table_build"] * scale
    return cost


def choose_method(profile: VesselProfile, n_samples: int, *, speed_m_s: ArrayLike, station: Optional[str] = None,
                  gamma: ArrayLike = 3.3, spread_s: ArrayLike = 4.0, long_crested: bool = False,
                  n_freq: int = 48, n_dir: int = 24) -> str:
    """The cheaper response method, "exact" or "table", for ``n_samples`` samples by the cost
    model :data:`METHOD_COST_S`: exact = n p c_exact; table = look-ups n p c_lookup plus, per
    speed node (:func:`_speed_nodes`) and spectrum shape (distinct gamma, spread; one per
    partition given), nothing when the table set is in memory, c_load when it is in the disk
    cache, else c_build. With one speed and one shape a cold cache chooses the table path from
    about 720 sample-partitions (c_build / c_exact), a warm cache from about 17; with 8 speed
    nodes from about 5 800 (cold). Both paths agree within the tolerances stated in
    :mod:`.motions.tables` (1 % short-crested; tests/core/test_api.py checks the chosen cases).
    """
    n = int(n_samples)
    if n <= 0:
        return "exact"
    st = profile.station(station)
    gam = np.atleast_1d(np.asarray(gamma, dtype=float)).reshape(-1)
    spr = np.atleast_1d(np.asarray(spread_s, dtype=float)).reshape(-1)
    p = max(gam.size, spr.size)
    shapes = sorted(set(zip(np.broadcast_to(gam, (p,)).tolist(), np.broadcast_to(spr, (p,)).tolist())))
    speeds = _speed_nodes(np.atleast_1d(np.asarray(speed_m_s, dtype=float)).reshape(-1))
    c, scale = METHOD_COST_S, n_freq * n_dir / 1152.0
    exact = n * p * c["exact_per_sample_partition"] * scale
    table = n * p * c["lookup_per_sample_partition"]
    if table >= exact:
        return "exact"
    table += _table_path_cost_s(profile, st, speeds, shapes, bool(long_crested), n_freq, n_dir)
    return "table" if table < exact else "exact"


SPEED_NODES = 8
"""Tables are built at the call's distinct speeds when there are at most SPEED_NODES of them,
else at SPEED_NODES speeds spread over the range (linear interpolation in speed: roll near its
resonance is sensitive to speed, see the test report)."""
DEEP_KH = math.pi
"""Table path: a sample counts as deep water when k h >= pi at 0.6 times the lowest peak
frequency of its partitions (tanh(pi) = 0.996); shallower samples use the exact path."""


def _speed_nodes(u: FloatArray) -> FloatArray:
    uniq = np.unique(u)
    if uniq.size <= SPEED_NODES:
        return uniq
    return np.linspace(uniq[0], uniq[-1], SPEED_NODES)


def _needs_depth(depth: Optional[FloatArray], hs: FloatArray, tp: FloatArray, g: float) -> NDArray[np.bool_]:
    """True where finite depth matters (see DEEP_KH)."""
    n = hs.shape[0]
    if depth is None:
        return np.zeros(n, dtype=bool)
    tmax = np.where(hs > 0, tp, 0.0).max(axis=1)
    tmax = np.where(tmax > 0, tmax, tp.max(axis=1))
    k_low = (0.6 * 2.0 * math.pi / tmax) ** 2 / g
    return np.isfinite(depth) & (k_low * np.where(np.isfinite(depth), depth, 0.0) < DEEP_KH)


def _merge(n: int, parts: Any, names: Tuple[str, ...], method: str) -> MotionResponse:
    """Assemble a MotionResponse from (index, response) parts covering 0..n-1."""
    kw: Dict[str, Any] = {}
    for f in RESPONSE_ARRAYS:
        first = getattr(parts[0][1], f)
        arr = np.zeros((n,) + first.shape[1:], dtype=first.dtype)
        for idx, r in parts:
            arr[idx] = getattr(r, f)
        kw[f] = arr
    return MotionResponse(station_names=names, method=method, **kw)


def assess_motions(
    profile: VesselProfile,
    *,
    hs_m: Optional[ArrayLike] = None,
    tp_s: Optional[ArrayLike] = None,
    wave_from_deg: Optional[ArrayLike] = None,
    course_deg: ArrayLike,
    speed_m_s: ArrayLike,
    depth_m: Optional[ArrayLike] = None,
    station: Optional[str] = None,
    gamma: float = 3.3,
    spread_s: float = 4.0,
    long_crested: bool = False,
    partitions: Optional[SeaPartitions] = None,
    method: Optional[str] = None,
    n_freq: int = 48,
    n_dir: int = 24,
    exposure_h: float = 2.0,
) -> MotionAssessment:
    """Motions, comfort and guidance flags of ``profile`` at one station for n samples.

    Parameters
    ----------
    profile : the vessel (:mod:`.vessel`).
    hs_m, tp_s, wave_from_deg : (n,) combined sea [m, s, deg true the waves come FROM];
        scalars broadcast. Ignored (may be None) when ``partitions`` is given.
    course_deg : (n,) course/heading through the water [deg true, going TO].
    speed_m_s : (n,) speed through the water [m/s] >= 0.
    depth_m : (n,) depth [m] (> 0; inf = deep) or None for deep water.
    station : station name (None = the profile's first station).
    gamma, spread_s, long_crested : JONSWAP gamma, cos-2s exponent, one direction only.
    partitions : :class:`SeaPartitions` replacing the combined sea.
    method : "exact" (spectral integration per sample), "table" (tabulated per unit Hs,
        interpolated; deep-water tables at the call's speeds, samples where the depth matters
        (DEEP_KH) go through the exact path), or None / "auto": the cheaper of the two by the
        measured cost model of :func:`choose_method` (tables already in memory or in the disk
        cache count as nearly free). Tables are cached in memory and on disk per vessel, speed
        and spectrum shape (:mod:`.motions.table_cache`; one costs about 0.1 s to build).
    n_freq, n_dir : spectral grid (defaults 48 x 24).
    exposure_h : MSI exposure [h] (2 h: O'Hanlon & McCauley 1974; else McCauley et al. 1976,
        coefficients from memory).

    NaN or inf anywhere in the inputs raises SeawayInputError naming the argument: mask samples
    without sea data before calling. Every argument has a plausibility range
    (:mod:`.plausibility`, with its reason): an impossible value (Tp 0.01 s, Hs over 30 m, over
    80 kn) raises SeawayInputError naming the argument, the value and its index; a doubtful one
    (a sea steeper than Hs/Lp0 = 1/15 included) sets IMPLAUSIBLE_VALUE (ODDVALUE) on its sample. Unknown station: SeawayInputError listing the stations.
    """
    if not isinstance(profile, VesselProfile):
        raise SeawayInputError(f"profile must be a VesselProfile, got {type(profile).__name__}")
    st = profile.station(station)
    hs, tp, wf, gam, spr = _sea_inputs(partitions, hs_m, tp_s, wave_from_deg, course_deg, speed_m_s, gamma, spread_s)
    n = hs.shape[0]
    course = _vec("course_deg", course_deg, n)
    speed = _vec("speed_m_s", check_range(SPEED_M_S, "speed_m_s", speed_m_s), n)
    depth = _checked_depth(depth_m, n)
    _check_options(exposure_h, n_freq, n_dir)
    if method is None or method == "auto":
        method = choose_method(profile, n, speed_m_s=speed, station=st.name, gamma=gam, spread_s=spr,
                               long_crested=long_crested, n_freq=n_freq, n_dir=n_dir)
    method = _checked_method(method, gam)
    transfer = transfer_model(profile)
    sea = _Sea(hs, tp, wf, course, speed, depth, gam, spr)
    grid = (bool(long_crested), n_freq, n_dir)
    r = (_exact(transfer, st, sea, grid) if method == "exact" else _tabled(profile, transfer, st, sea, grid))
    return _assessment(profile, st, sea, r, method, exposure_h, getattr(transfer, "roll_period_s", None))


def _checked_depth(depth_m: Optional[ArrayLike], n: int) -> Optional[FloatArray]:
    """(n,) depth [m] (inf = deep) inside its plausible range, or None for deep water."""
    if depth_m is None:
        return None
    d = require_positive("depth_m", depth_m, allow_inf=True)
    check_range(DEPTH_M, "depth_m", np.where(np.isinf(d), 1.0, d))
    return _vec("depth_m", d, n)


def _check_options(exposure_h: float, n_freq: int, n_dir: int) -> None:
    """The MSI exposure and the spectral grid sizes inside their ranges (:mod:`.plausibility`)."""
    check_range(EXPOSURE_H, "exposure_h", exposure_h)
    for name, v, lo, hi in (("n_freq", n_freq, 8, 4096), ("n_dir", n_dir, 1, 720)):
        if isinstance(v, bool) or not isinstance(v, (int, np.integer)) or not lo <= v <= hi:
            raise SeawayInputError(f"{name} must be a whole number in [{lo}, {hi}], got {show(v)}")


def _checked_method(method: Optional[str], gam: FloatArray) -> str:
    """The response method checked; checks gamma."""
    if method not in ("exact", "table"):
        raise SeawayInputError(f"method must be 'exact', 'table' or None, got {show(method)}")
    if np.any(gam < 1.0):
        raise SeawayInputError(f"gamma must be >= 1, got {show(gam[gam < 1][0])}")
    return method


@dataclass(frozen=True)
class _Sea:
    """Validated inputs of one call: (n, p) partitions, (n,) course, speed, depth, (p,) shapes."""

    hs: FloatArray
    tp: FloatArray
    wf: FloatArray
    course: FloatArray
    speed: FloatArray
    depth: Optional[FloatArray]
    gam: FloatArray
    spr: FloatArray


def _sea_inputs(partitions: Optional[SeaPartitions], hs_m: Optional[ArrayLike], tp_s: Optional[ArrayLike],
                wave_from_deg: Optional[ArrayLike], course_deg: ArrayLike, speed_m_s: ArrayLike, gamma: float,
                spread_s: float) -> Tuple[FloatArray, FloatArray, FloatArray, FloatArray, FloatArray]:
    """(n, p) Hs, Tp, direction and (p,) gamma, spread from the partitions or the combined sea."""
    if partitions is not None:
        if not isinstance(partitions, SeaPartitions):
            raise SeawayInputError(f"partitions must be SeaPartitions, got {type(partitions).__name__}")
        return (partitions.hs_m, partitions.tp_s, partitions.wave_from_deg, partitions.gamma,
                partitions.spread_s)
    for name, v in (("hs_m", hs_m), ("tp_s", tp_s), ("wave_from_deg", wave_from_deg)):
        if v is None:
            raise SeawayInputError(f"{name} is required when partitions is not given")
    hs = np.atleast_1d(check_range(HS_M, "hs_m", hs_m)).reshape(-1)
    tp = np.atleast_1d(check_range(TP_S, "tp_s", tp_s)).reshape(-1)
    n0 = max(hs.size, tp.size, np.size(wave_from_deg), np.size(course_deg), np.size(speed_m_s))
    hs2, tp2 = _vec("hs_m", hs, n0)[:, None], _vec("tp_s", tp, n0)[:, None]
    _check_sea("hs_m", hs2, "tp_s", tp2)
    return (hs2, tp2, _vec("wave_from_deg", wave_from_deg, n0)[:, None],
            np.array([float(check_range(GAMMA, "gamma", gamma))]),
            np.array([float(check_range(SPREAD_S, "spread_s", spread_s))]))


def _check_sea(hs_name: str, hs: FloatArray, tp_name: str, tp: FloatArray) -> None:
    """Hs and Tp within their :mod:`.plausibility` ranges (steepness is judged per sample)."""
    check_range(HS_M, hs_name, hs)
    check_range(TP_S, tp_name, tp)


def _doubt_flags(sea: "_Sea") -> NDArray[np.int64]:
    """IMPLAUSIBLE_VALUE where a sea value or the speed is possible but doubtful (plausibility)."""
    live = sea.hs > 0
    odd = (doubtful(HS_M, sea.hs) | (live & doubtful(TP_S, sea.tp))
           | (live & (sea_steepness(sea.hs, sea.tp) > STEEPNESS_DOUBT))).any(axis=1)
    odd |= doubtful(SPEED_M_S, sea.speed)
    return np.where(odd, int(SampleFlag.IMPLAUSIBLE_VALUE), 0).astype(np.int64)


def _exact(transfer: Any, st: Station, sea: _Sea, grid: Tuple[bool, int, int],
           idx: Optional[NDArray[np.int64]] = None) -> MotionResponse:
    """The exact path (spectral integration) for all samples or those at ``idx``."""
    sel = slice(None) if idx is None else idx
    return motion_response(
        transfer, (st,), hs_m=sea.hs[sel], tp_s=sea.tp[sel], wave_from_deg=sea.wf[sel],
        course_deg=sea.course[sel], speed_m_s=sea.speed[sel], depth_m=None if sea.depth is None else sea.depth[sel],
        gamma=sea.gam, spread_s=sea.spr, long_crested=grid[0], n_freq=grid[1], n_dir=grid[2],
    )


def _tabled(profile: VesselProfile, transfer: Any, st: Station, sea: _Sea, grid: Tuple[bool, int, int]) -> MotionResponse:
    """The table path: deep-water samples from cached tables (one set per partition shape),
    samples where the depth matters (DEEP_KH) through the exact path."""
    n = sea.hs.shape[0]
    shallow = _needs_depth(sea.depth, sea.hs, sea.tp, G_STANDARD_M_S2)
    parts = []
    deep_idx = np.flatnonzero(~shallow)
    if deep_idx.size:
        hs, tp, speed = sea.hs[deep_idx], sea.tp[deep_idx], sea.speed[deep_idx]
        mu = relative_heading_deg(sea.course[deep_idx, None], sea.wf[deep_idx])
        rs = []
        for g_, s_ in sorted(set(zip(sea.gam.tolist(), sea.spr.tolist()))):
            cols = [i for i in range(sea.hs.shape[1]) if sea.gam[i] == g_ and sea.spr[i] == s_]
            rs.append((cols, _table_set(profile, st, transfer, _speed_nodes(speed), None, g_, s_, *grid)))
        if len(rs) == 1:
            rd = rs[0][1].lookup(hs, tp, mu, speed)
        else:
            rd = _multi_shape_lookup(rs, hs, tp, mu, speed, None)
        parts.append((deep_idx, rd))
    sh_idx = np.flatnonzero(shallow)
    if sh_idx.size:
        parts.append((sh_idx, _exact(transfer, st, sea, grid, sh_idx)))
    return _merge(n, parts, (st.name,), "table")


def _assessment(profile: VesselProfile, st: Station, sea: _Sea, r: MotionResponse, method: str,
                exposure_h: float, model_roll_period_s: Optional[float] = None) -> MotionAssessment:
    """Comfort verdict and guidance flags on top of the station's motions; the natural roll
    period is the transfer model's own when it has one (strip), else the profile's."""
    tr_s = profile.natural_roll_period_s if model_roll_period_s is None else float(model_roll_period_s)
    safety = circ1228_flags(profile.length_wl_m, tr_s, sea.speed, sea.course, sea.hs, sea.tp, sea.wf, sea.depth,
                            gamma=sea.gam)
    vacc, lacc = r.vacc_rms_m_s2[:, 0], r.lacc_rms_m_s2[:, 0]
    v = comfort_verdict(st.task, vacc, r.vacc_omega_rad_s[:, 0], lacc, r.roll_rms_deg, exposure_h=exposure_h)
    flags = r.flags | safety.mask | _doubt_flags(sea)
    flags = flags | np.where(v.criteria.exceeded, int(SampleFlag.CRITERIA_EXCEEDED), 0).astype(np.int64)
    return MotionAssessment(
        heave_rms_m=r.heave_rms_m, pitch_rms_deg=r.pitch_rms_deg, roll_rms_deg=r.roll_rms_deg,
        heave_tz_s=r.heave_tz_s, pitch_tz_s=r.pitch_tz_s, roll_tz_s=r.roll_tz_s,
        vacc_rms_m_s2=vacc, lacc_rms_m_s2=lacc, vacc_wf_rms_m_s2=r.vacc_wf_rms_m_s2[:, 0],
        vacc_omega_rad_s=r.vacc_omega_rad_s[:, 0], msi_pct=v.msi_pct, comfort_class=v.comfort_class,
        flags=flags.astype(np.int64), criteria_margin=v.criteria.margins, roll_period_s=float(tr_s),
        sway_rms_m=r.sway_rms_m, yaw_rms_deg=r.yaw_rms_deg,
        station=st.name, method=method, task=st.task, exposure_h=float(exposure_h),
    )


def _inv_depth(depth: Optional[FloatArray], n: int) -> FloatArray:
    if depth is None:
        return np.zeros(n)
    return np.where(np.isinf(depth), 0.0, 1.0 / np.where(np.isinf(depth), 1.0, depth))


def _multi_shape_lookup(rs: Any, hs: FloatArray, tp: FloatArray, mu: FloatArray, speed: FloatArray,
                        depth: Optional[FloatArray]) -> MotionResponse:
    """Partitions of different spectrum shapes: each shape group through its own tables; the
    per-unit quantities of all partitions are then summed with Hs**2 (linear superposition)."""
    n = hs.shape[0]
    inv = _inv_depth(depth, n)
    qs, os_, offs, hss = [], [], [], []
    valid = np.ones(n, dtype=bool)
    names: Tuple[str, ...] = ()
    for cols, ts in rs:
        q, o, off, v = ts.quantities(tp[:, cols], mu[:, cols], speed, inv)
        qs.append(q); os_.append(o); offs.append(off); hss.append(hs[:, cols])
        valid &= v
        names = ts.tables[0][0].station_names
    hsc = np.concatenate(hss, axis=1)
    flags = validity_flags(valid, hsc, np.concatenate(os_, axis=1))
    flags[(np.concatenate(offs, axis=1) & (hsc > 0)).any(axis=1)] |= int(SampleFlag.OUTSIDE_VALIDITY)
    return combine_quantities(np.concatenate(qs, axis=1), hsc, names, flags=flags, method="table")
