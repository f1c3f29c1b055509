# SPDX-License-Identifier: GPL-2.0-or-later
"""Guidance flags after IMO MSC.1/Circ.1228 (2007), "Revised guidance to the master for
avoiding dangerous situations in adverse weather and sea conditions", annex section 4.2.

Symbols as in the circular's symbol table (read): alpha angle of encounter (0 deg head sea,
90 deg sea from starboard; :func:`..waves.encounter.imo_angle_of_encounter_deg`), V speed [kn],
L length between perpendiculars [m] (we use the profile's waterline length), TW wave period
[s], lambda wave length [m], TE encounter period [s], TR natural roll period [s].

What the circular says (paragraph numbers as read in the annex):

* 4.2.1 surf-riding and broaching-to (code SURFRISK): 135 < alpha < 225 deg and
  V > 1.8 sqrt(L) / cos(180 - alpha) knots. The range of alpha is read; the speed formula is
  an image missing from the copies we read, so the constant 1.8 is FROM MEMORY.
* 4.2.2.1 successive high-wave attack (WAVEGROUPS): average wave length > 0.8 L AND
  significant wave height > 0.04 L, AND (4.2.2.2) the encounter period "nearly equal to double
  (i.e. about 1.8-3.0 times)" the wave period TW (read).
* 4.2.3.1 synchronous rolling (ROLLSYNC): TE nearly equal to TR (read).
* 4.2.3.2 parametric rolling (ROLLPARAM) in head and following seas: TE nearly equal to half
  TR (the paragraph is cut off in the copy we read; the ratio 1/2 and "head and following
  seas" are FROM MEMORY).

Wave period TW: paragraph 1.4 of the circular has TW measured with a stopwatch as the time
between successive crests, i.e. an average period, and 4.2.2.1 speaks of the "average wave
length". We use the spectrum's mean period T1 = Tm01 = 2 pi m0 / m1 (the "mean wave period"
of DNV-RP-C205 (2010) s.3.5.5) of each partition's JONSWAP spectrum, computed by integration
(0.834 Tp at gamma 3.3), and lambda the Airy wave length at TW and the local depth. Every
check uses this TW, never the peak period.

OUR DESIGN CHOICES (the circular gives no tolerances; shown to the user):

* "nearly equal": synchronous 0.8 <= TE/TR <= 1.2; parametric 0.4 <= TE/TR <= 0.6.
* Which partitions can drive a phenomenon: each check is made per partition (its own Hs, TW,
  direction); a partition counts only with Hs_i >= 0.02 L (ADVISORY_HS_PER_L), half the
  circular's own height threshold for dangerous wave groups (4.2.2.1, 0.04 L): a wave system
  lower than that cannot build the large responses the circular warns of. Parametric rolling
  also needs a wave length comparable to the ship, 0.8 L <= lambda <= 2 L (lower bound the
  circular's 0.8 L of 4.2.2.1; above 2 L the ship rides the wave and its waterplane hardly
  changes: common practice, no source), and a head (alpha within 45 deg of 0) or following
  (135 < alpha < 225, the sector of 4.2.1) sector.
* Grades: SURFRISK, ROLLSYNC and ROLLPARAM are "danger" when the driving partition has
  Hs_i > 0.04 L (the circular's height of 4.2.2.1), else "advisory". WAVEGROUPS is "advisory"
  (4.2.2.1 asks the master to act when "indices of dangerous behaviour" are seen, which a plan
  cannot see) and "danger" when the same sample also meets a danger-graded ROLLSYNC or
  ROLLPARAM (the dangers 4.2.2.1 names). Danger sets a second bit (SURFDANGER, GROUPDANGER,
  SYNCDANGER, PARAMDANGER) beside the phenomenon's own code.

These are flags for attention, not a stability assessment.
"""
from __future__ import annotations

import functools
import math
from dataclasses import dataclass
from typing import Optional, Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..flags import SampleFlag
from ..units import G_STANDARD_M_S2, KNOT_M_S, RAD_PER_DEG, FloatArray
from ..validation import SeawayInputError, as_float_array, require_nonnegative, require_positive, show
from ..waves.dispersion import wavelength_m
from ..waves.encounter import encounter_period, imo_angle_of_encounter_deg

__all__ = [
    "SYNC_ROLL_BAND", "PARAMETRIC_ROLL_BAND", "WAVE_GROUP_PERIOD_BAND", "PARAMETRIC_WAVELENGTH_BAND_L",
    "HEAD_SECTOR_HALF_DEG", "ADVISORY_HS_PER_L", "DANGER_HS_PER_L", "CLAUSES",
    "mean_period_over_tp", "surf_riding_speed_limit_kn", "surf_riding_mask", "high_wave_attack_mask",
    "period_ratio_mask", "SafetyFlags", "circ1228_flags",
]

SYNC_ROLL_BAND: Tuple[float, float] = (0.8, 1.2)
"""TE/TR taken as "nearly equal" to 1 (our choice; Circ.1228 4.2.3.1 gives no tolerance)."""
PARAMETRIC_ROLL_BAND: Tuple[float, float] = (0.4, 0.6)
"""TE/TR taken as "nearly equal" to 1/2 (our choice; ratio 1/2 from memory, 4.2.3.2)."""
WAVE_GROUP_PERIOD_BAND: Tuple[float, float] = (1.8, 3.0)
"""TE/TW of successive high-wave attack, Circ.1228 4.2.2.2 (read)."""
PARAMETRIC_WAVELENGTH_BAND_L: Tuple[float, float] = (0.8, 2.0)
"""lambda/L of a partition that can drive parametric rolling (module docstring; our choice)."""
HEAD_SECTOR_HALF_DEG: float = 45.0
"""Head sector for parametric rolling: alpha within this of 0 deg (our choice)."""
ADVISORY_HS_PER_L: float = 0.02
"""A partition drives a flag only with Hs >= this x L (half of Circ.1228 4.2.2.1's 0.04 L)."""
DANGER_HS_PER_L: float = 0.04
"""Hs > this x L grades a flag "danger" (Circ.1228 4.2.2.1's height threshold)."""

CLAUSES = {
    SampleFlag.SURF_RIDING: "IMO MSC.1/Circ.1228 4.2.1",
    SampleFlag.HIGH_WAVE_GROUPS: "IMO MSC.1/Circ.1228 4.2.2",
    SampleFlag.SYNC_ROLL: "IMO MSC.1/Circ.1228 4.2.3.1",
    SampleFlag.PARAMETRIC_ROLL: "IMO MSC.1/Circ.1228 4.2.3.2",
}
"""The paragraph each guidance flag comes from."""


@functools.lru_cache(maxsize=64)
def mean_period_over_tp(gamma: float) -> float:
    """T1/Tp = 2 pi m0 / (m1 Tp) of a JONSWAP spectrum with peak enhancement ``gamma``.

    DNV-RP-C205 (2010) s.3.5.5 spectrum integrated numerically over omega/omega_p in
    [0.2, 60] on 6000 log-spaced points (0.834 at gamma 3.3, 0.772 at gamma 1).
    """
    from ..waves.spectra import jonswap_s_m2_s_rad, spectral_moment

    g = float(require_positive("gamma", gamma))
    w = 2.0 * math.pi * np.geomspace(0.2, 60.0, 6000)  # Tp = 1 s
    s = jonswap_s_m2_s_rad(w, 1.0, 1.0, g)
    return float(2.0 * math.pi * spectral_moment(s, w, 0) / spectral_moment(s, w, 1))


def surf_riding_speed_limit_kn(length_m: float, alpha_deg: ArrayLike) -> FloatArray:
    """Speed [kn] above which the surf-riding zone begins: 1.8 sqrt(L) / cos(180 - alpha).

    IMO MSC.1/Circ.1228 4.2.1 (constant 1.8 from memory). Defined for 135 < alpha < 225 deg;
    +inf elsewhere (outside the zone for every speed).
    """
    L = float(require_positive("length_m", length_m))
    a = np.mod(as_float_array("alpha_deg", alpha_deg), 360.0)
    inside = (a > 135.0) & (a < 225.0)
    c = np.cos((180.0 - a) * RAD_PER_DEG)
    lim = np.where(inside, 1.8 * math.sqrt(L) / np.where(inside, c, 1.0), np.inf)
    return np.asarray(lim, dtype=float)


def surf_riding_mask(speed_kn: ArrayLike, alpha_deg: ArrayLike, length_m: float) -> NDArray[np.bool_]:
    """True where 135 < alpha < 225 deg and V > 1.8 sqrt(L)/cos(180 - alpha) (Circ.1228 4.2.1)."""
    v = require_nonnegative("speed_kn", speed_kn)
    return np.asarray(v > surf_riding_speed_limit_kn(length_m, alpha_deg), dtype=bool)


def high_wave_attack_mask(wavelength_m_: ArrayLike, hs_m: ArrayLike, length_m: float) -> NDArray[np.bool_]:
    """True where lambda > 0.8 L and Hs > 0.04 L (Circ.1228 4.2.2.1; the period condition of
    4.2.2.2 is applied by :func:`circ1228_flags`)."""
    lam = require_nonnegative("wavelength_m", wavelength_m_)
    hs = require_nonnegative("hs_m", hs_m)
    L = float(require_positive("length_m", length_m))
    return np.asarray((lam > 0.8 * L) & (hs > 0.04 * L), dtype=bool)


def period_ratio_mask(te_s: ArrayLike, t_ref_s: ArrayLike, band: Tuple[float, float]) -> NDArray[np.bool_]:
    """True where band[0] <= TE/T_ref <= band[1] (inclusive). TE may be +inf (never flagged)."""
    te = require_positive("te_s", te_s, allow_inf=True)
    tr = require_positive("t_ref_s", t_ref_s)
    lo, hi = float(band[0]), float(band[1])
    if not 0 < lo < hi:
        raise SeawayInputError(f"band must satisfy 0 < low < high, got {show(band)}")
    q = te / tr
    return np.asarray((q >= lo) & (q <= hi), dtype=bool)


@dataclass(frozen=True)
class SafetyFlags:
    """Circ.1228 flags for n samples: ``mask`` (n,) int64 of SampleFlag bits (phenomenon and
    danger bits); one (n,) bool array per phenomenon (any grade) and per danger grade."""

    mask: NDArray[np.int64]
    surf_riding: NDArray[np.bool_]
    high_wave_groups: NDArray[np.bool_]
    sync_roll: NDArray[np.bool_]
    parametric_roll: NDArray[np.bool_]
    surf_riding_danger: NDArray[np.bool_]
    high_wave_groups_danger: NDArray[np.bool_]
    sync_roll_danger: NDArray[np.bool_]
    parametric_roll_danger: NDArray[np.bool_]


def _as_np(name: str, v: ArrayLike, n: int, p: int) -> FloatArray:
    a = as_float_array(name, v)
    if a.ndim == 1 and p == 1 and a.shape == (n,):
        a = a[:, None]
    try:
        return np.broadcast_to(a, (n, p)).astype(float)
    except ValueError as exc:
        raise SeawayInputError(f"{name} must have shape ({n}, {p}) or broadcast to it, got {a.shape}") from exc


@dataclass(frozen=True)
class _Waves:
    """(n, p) per-partition quantities the checks need."""

    hs: FloatArray
    tw: FloatArray
    lam: FloatArray
    alpha: FloatArray
    te: FloatArray


def _waves(speed: FloatArray, course: FloatArray, hs: FloatArray, tp: FloatArray, wf: FloatArray,
           depth: Optional[FloatArray], gamma: FloatArray, g_m_s2: float) -> _Waves:
    """Mean period TW, its wave length, angle of encounter and encounter period per partition."""
    ratio = np.array([mean_period_over_tp(float(x)) for x in gamma])
    tw = tp * ratio[None, :]
    lam = wavelength_m(tw, depth, g_m_s2=g_m_s2)
    alpha = imo_angle_of_encounter_deg(course[:, None], wf)
    mu = np.mod(alpha + 180.0, 360.0)  # ITTC heading (module :mod:`..waves.encounter`)
    te = encounter_period(tw, speed[:, None], mu, depth, g_m_s2=g_m_s2).period_s
    return _Waves(hs=hs, tw=tw, lam=lam, alpha=alpha, te=te)


def _graded(w: _Waves, speed_kn: FloatArray, L: float, tr: float,
            bands: Tuple[Tuple[float, float], Tuple[float, float]]) -> dict:
    """(n, p) masks of each phenomenon (``drive`` partitions only) and of its danger grade."""
    drive = w.hs >= ADVISORY_HS_PER_L * L
    big = w.hs > DANGER_HS_PER_L * L
    a = np.mod(w.alpha, 360.0)
    following = (a > 135.0) & (a < 225.0)
    head = (a <= HEAD_SECTOR_HALF_DEG) | (a >= 360.0 - HEAD_SECTOR_HALF_DEG)
    lo, hi = PARAMETRIC_WAVELENGTH_BAND_L
    surf = surf_riding_mask(speed_kn[:, None], a, L) & drive
    groups = (high_wave_attack_mask(w.lam, w.hs, L)
              & period_ratio_mask(w.te, w.tw, WAVE_GROUP_PERIOD_BAND))
    sync = period_ratio_mask(w.te, tr, bands[0]) & drive
    para = (period_ratio_mask(w.te, tr, bands[1]) & drive & (head | following)
            & (w.lam >= lo * L) & (w.lam <= hi * L))
    return {"surf": surf, "groups": groups, "sync": sync, "para": para,
            "surf_d": surf & big, "sync_d": sync & big, "para_d": para & big}


def circ1228_flags(
    length_m: float,
    roll_period_s: float,
    speed_m_s: ArrayLike,
    course_deg: ArrayLike,
    hs_m: ArrayLike,
    tp_s: ArrayLike,
    wave_from_deg: ArrayLike,
    depth_m: Optional[ArrayLike] = None,
    *,
    gamma: ArrayLike = 3.3,
    sync_band: Tuple[float, float] = SYNC_ROLL_BAND,
    parametric_band: Tuple[float, float] = PARAMETRIC_ROLL_BAND,
    g_m_s2: float = G_STANDARD_M_S2,
) -> SafetyFlags:
    """The four Circ.1228 flags, graded, for n samples with p partitions (module docstring).

    length_m L [m]; roll_period_s TR [s]; speed_m_s, course_deg (n,) speed through the water
    [m/s] and course [deg true]; hs_m, tp_s, wave_from_deg (n, p) (or (n,)) per partition,
    Hs 0 = absent; depth_m (n,) [m] or None (deep); gamma (p,) JONSWAP gamma of each partition.
    """
    speed = require_nonnegative("speed_m_s", speed_m_s).reshape(-1)
    course = as_float_array("course_deg", course_deg).reshape(-1)
    n = max(speed.size, course.size)
    speed, course = np.broadcast_to(speed, (n,)), np.broadcast_to(course, (n,))
    hs_a = as_float_array("hs_m", hs_m)
    p = 1 if hs_a.ndim <= 1 else hs_a.shape[1]
    hs, tp, wf = (_as_np(k, v, n, p) for k, v in (("hs_m", hs_m), ("tp_s", tp_s), ("wave_from_deg", wave_from_deg)))
    require_nonnegative("hs_m", hs)
    require_positive("tp_s", tp)
    gam = np.broadcast_to(np.atleast_1d(require_positive("gamma", gamma)).astype(float), (p,))
    depth = None
    if depth_m is not None:
        depth = np.broadcast_to(require_positive("depth_m", depth_m, allow_inf=True).reshape(-1), (n,))[:, None]
    L = float(require_positive("length_m", length_m))
    tr = float(require_positive("roll_period_s", roll_period_s))
    w = _waves(speed, course, hs, tp, wf, depth, gam, g_m_s2)
    m = {k: v.any(axis=1) for k, v in _graded(w, speed / KNOT_M_S, L, tr, (sync_band, parametric_band)).items()}
    m["groups_d"] = m["groups"] & (m["sync_d"] | m["para_d"])
    bits = (("surf", SampleFlag.SURF_RIDING), ("groups", SampleFlag.HIGH_WAVE_GROUPS),
            ("sync", SampleFlag.SYNC_ROLL), ("para", SampleFlag.PARAMETRIC_ROLL),
            ("surf_d", SampleFlag.SURF_RIDING_DANGER), ("groups_d", SampleFlag.HIGH_WAVE_GROUPS_DANGER),
            ("sync_d", SampleFlag.SYNC_ROLL_DANGER), ("para_d", SampleFlag.PARAMETRIC_ROLL_DANGER))
    mask = np.zeros(n, dtype=np.int64)
    for key, flag in bits:
        mask |= np.where(m[key], int(flag), 0).astype(np.int64)
    return SafetyFlags(mask=mask, surf_riding=m["surf"], high_wave_groups=m["groups"], sync_roll=m["sync"],
                       parametric_roll=m["para"], surf_riding_danger=m["surf_d"],
                       high_wave_groups_danger=m["groups_d"], sync_roll_danger=m["sync_d"],
                       parametric_roll_danger=m["para_d"])
