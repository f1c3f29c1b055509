# SPDX-License-Identifier: GPL-2.0-or-later
"""Guidance flags after IMO MSC.1/Circ.1228 (2007), "Revised guidance to the master for
avoiding dangerous situations in adverse weather and sea conditions".

Symbols as in the circular: alpha angle of encounter (0 deg head sea, 90 deg sea from
starboard; :func:`.heading.imo_angle_of_encounter_deg`), V speed [kn], L length [m], TE
encounter period [s], TR natural roll period [s], lambda wave length [m].

* Surf-riding / broaching (4.2.1): 135 < alpha < 225 deg and V > 1.8 sqrt(L) / cos(180 - alpha)
  knots (the constant 1.8 is from memory; the formula is an image in the copies we read).
* Successive high-wave attack (4.2.2): lambda > 0.8 L and Hs > 0.04 L.
* Synchronous rolling (4.2.3): TE nearly equal to TR.
* Parametric rolling (4.2.3): TE nearly equal to TR/2 (paragraph text from memory).

The circular gives no tolerance for "nearly equal". OUR DESIGN CHOICES (shown to the user):
synchronous band 0.8 <= TE/TR <= 1.2, parametric band 0.4 <= TE/TR <= 0.6; the wave period of a
partition is its peak period Tp and lambda is the Airy wavelength at Tp and the local depth
(conservative: longer than a mean-period wavelength); surf-riding and the rolling checks are made
for every partition with Hs > 0 (a sample is flagged if any partition meets the condition);
high-wave attack uses the total Hs = sqrt(sum Hs_i**2) and the wavelength of the partition with
the largest Hs. These are flags for attention, not a stability assessment.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Optional, Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..waves.dispersion import wavelength_m
from ..flags import SampleFlag
from ..waves.encounter import encounter_period, imo_angle_of_encounter_deg, relative_heading_deg
from ..units import G_STANDARD_M_S2, KNOT_M_S, RAD_PER_DEG, FloatArray
from ..validation import (
    SeawayInputError,
    as_float_array,
    require_nonnegative,
    require_positive,
    show,
)

__all__ = [
    "SYNC_ROLL_BAND",
    "PARAMETRIC_ROLL_BAND",
    "surf_riding_speed_limit_kn",
    "surf_riding_mask",
    "high_wave_attack_mask",
    "period_ratio_mask",
    "SafetyFlags",
    "circ1228_flags",
]

SYNC_ROLL_BAND: Tuple[float, float] = (0.8, 1.2)
PARAMETRIC_ROLL_BAND: Tuple[float, float] = (0.4, 0.6)


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
    """True where lambda > 0.8 L and Hs > 0.04 L (Circ.1228 4.2.2.1)."""
    lam = require_nonnegative("wavelength_m", wavelength_m_)
    hs = require_nonnegative("hs_m", hs_m)
    L = float(require_positive("length_m", length_m))
    return np.asarray((lam > 0.8 * L) & (hs > 0.04 * L), dtype=bool)


def period_ratio_mask(te_s: ArrayLike, tr_s: float, band: Tuple[float, float]) -> NDArray[np.bool_]:
    """True where band[0] <= TE/TR <= band[1] (inclusive). TE may be +inf (never flagged)."""
    te = require_positive("te_s", te_s, allow_inf=True)
    tr = float(require_positive("roll_period_s", tr_s))
    lo, hi = float(band[0]), float(band[1])
    if not 0 < lo < hi:
        raise SeawayInputError(f"band must satisfy 0 < low < high, got {show(band)}")
    q = te / tr
    return np.asarray((q >= lo) & (q <= hi), dtype=bool)


@dataclass(frozen=True)
class SafetyFlags:
    """Circ.1228 flags for n samples: ``mask`` (n,) int64 of SampleFlag bits and one (n,) bool
    array per condition."""

    mask: NDArray[np.int64]
    surf_riding: NDArray[np.bool_]
    high_wave_groups: NDArray[np.bool_]
    sync_roll: NDArray[np.bool_]
    parametric_roll: NDArray[np.bool_]


def _as_np(name: str, v: ArrayLike, n: int, p: int) -> FloatArray:
    a = as_float_array(name, v)
    if a.ndim == 1 and p == 1 and a.shape == (n,):
        a = a[:, None]
    try:
        return np.broadcast_to(a, (n, p)).astype(float)
    except ValueError as exc:
        raise SeawayInputError(f"{name} must have shape ({n}, {p}) or broadcast to it, got {a.shape}") from exc


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
    sync_band: Tuple[float, float] = SYNC_ROLL_BAND,
    parametric_band: Tuple[float, float] = PARAMETRIC_ROLL_BAND,
    g_m_s2: float = G_STANDARD_M_S2,
) -> SafetyFlags:
    """All four Circ.1228 flags for n samples with p sea-state partitions (module docstring).

    Parameters
    ----------
    length_m : vessel length L [m]; roll_period_s : TR [s].
    speed_m_s, course_deg : (n,) speed through the water [m/s] and course [deg true].
    hs_m, tp_s, wave_from_deg : (n, p) (or (n,) for one partition); hs 0 = absent partition.
    depth_m : (n,) depth [m] or None (deep water).
    """
    speed = require_nonnegative("speed_m_s", speed_m_s).reshape(-1)
    course = as_float_array("course_deg", course_deg).reshape(-1)
    n = max(speed.size, course.size)
    speed = np.broadcast_to(speed, (n,))
    course = np.broadcast_to(course, (n,))
    hs_a = as_float_array("hs_m", hs_m)
    p = 1 if hs_a.ndim <= 1 else hs_a.shape[1]
    hs = _as_np("hs_m", hs_m, n, p)
    tp = _as_np("tp_s", tp_s, n, p)
    wf = _as_np("wave_from_deg", wave_from_deg, n, p)
    require_nonnegative("hs_m", hs)
    require_positive("tp_s", tp)
    depth = None
    if depth_m is not None:
        depth = np.broadcast_to(require_positive("depth_m", depth_m, allow_inf=True).reshape(-1), (n,))[:, None]
    L = float(require_positive("length_m", length_m))
    tr = float(require_positive("roll_period_s", roll_period_s))
    present = hs > 0
    speed_kn = speed / KNOT_M_S
    alpha = imo_angle_of_encounter_deg(course[:, None], wf)
    surf = (surf_riding_mask(speed_kn[:, None], alpha, L) & present).any(axis=1)
    lam = wavelength_m(tp, depth, g_m_s2=g_m_s2)
    dom = np.argmax(hs, axis=1)
    lam_dom = lam[np.arange(n), dom]
    hs_tot = np.sqrt(np.sum(hs * hs, axis=1))
    high = high_wave_attack_mask(lam_dom, hs_tot, L)
    mu = relative_heading_deg(course[:, None], wf)
    te = encounter_period(tp, speed[:, None], mu, depth, g_m_s2=g_m_s2).period_s
    sync = (period_ratio_mask(te, tr, sync_band) & present).any(axis=1)
    para = (period_ratio_mask(te, tr, parametric_band) & present).any(axis=1)
    mask = np.zeros(n, dtype=np.int64)
    for hit, flag in ((surf, SampleFlag.SURF_RIDING), (high, SampleFlag.HIGH_WAVE_GROUPS),
                      (sync, SampleFlag.SYNC_ROLL), (para, SampleFlag.PARAMETRIC_ROLL)):
        mask |= np.where(hit, int(flag), 0)
    return SafetyFlags(mask=mask.astype(np.int64), surf_riding=surf, high_wave_groups=high,
                       sync_roll=sync, parametric_roll=para)
