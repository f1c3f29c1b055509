# SPDX-License-Identifier: GPL-2.0-or-later
"""Linear (Airy) wave dispersion at finite depth: wavenumber, wavelength, phase and group speed.

Dispersion relation (Airy wave theory; USACE Shore Protection Manual 1984, ch. 2; Dean &
Dalrymple 1991, "Water Wave Mechanics for Engineers and Scientists", ch. 3):

    omega**2 = g k tanh(k h)

omega [rad/s] angular frequency, k [rad/m] wavenumber, h [m] still-water depth (> 0),
g [m/s^2] gravity (default standard gravity 9.80665). Deep water (h -> inf): k = omega**2 / g.

Solver: with y = omega**2 h / g and the unknown x = k h, solve F(x) = x tanh(x) - y = 0 by
Newton's method (F' = tanh x + x sech**2 x > 0, so the root is unique) from the explicit
approximation of Fenton & McKee (1990, Coastal Engineering 14, 499-513),
x0 = y / tanh(y**(3/4))**(2/3), to 1e-12 relative; a bisection on the bracket
[max(y, sqrt(y)), y + sqrt(y)] (which always contains the root, from x >= y, x**2 >= y and
tanh x >= x/(1+x)) is the fallback for any element that has not converged. Limits are exact:
x = y once y >= 20 (tanh(20) == 1 in double precision) and the series
x**2 = y (1 + y/3 + 4 y**2/45) for y < 1e-6 (from x tanh x = x**2 - x**4/3 + 2 x**6/15 - ...).
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Optional

import numpy as np
from numpy.typing import ArrayLike

from ..units import G_STANDARD_M_S2, FloatArray
from ..validation import SeawayInputError, require_positive

__all__ = [
    "WaveKinematics",
    "wavenumber_rad_m",
    "wave_kinematics",
    "wavelength_m",
    "phase_speed_m_s",
    "group_speed_m_s",
    "solve_kh",
]

_DEEP_KH = 20.0
"""Above this k h, tanh(k h) == 1 in double precision: deep-water formulas are exact."""
_SHALLOW_Y = 1e-6
"""Below this y = omega^2 h / g the three-term series is exact to double precision."""
_REL_TOL = 1e-12
_MAX_NEWTON = 50


def _validate_depth(depth_m: Optional[ArrayLike]) -> Optional[FloatArray]:
    """None for deep water everywhere; else a float array of depths (> 0, +inf allowed)."""
    if depth_m is None:
        return None
    return require_positive("depth_m", depth_m, allow_inf=True)


def _validate_g(g_m_s2: float) -> float:
    g = require_positive("g_m_s2", g_m_s2)
    if g.ndim != 0:
        raise SeawayInputError(f"g_m_s2 must be a scalar, got shape {g.shape}")
    return float(g)


def solve_kh(y: ArrayLike) -> FloatArray:
    """Solve x tanh(x) = y for x = k h > 0 (dimensionless), elementwise.

    Parameters
    ----------
    y : deep-water relative depth y = omega**2 h / g = k0 h (dimensionless, finite, > 0).

    Returns
    -------
    x = k h, same shape as ``y``, converged to 1e-12 relative.

    Notes
    -----
    Newton iteration x <- x - (x tanh x - y) / (tanh x + x (1 - tanh**2 x)) from the
    Fenton & McKee (1990) seed; bisection fallback; exact limits for y >= 20 and y < 1e-6
    (module docstring).
    """
    yarr = require_positive("y", y)
    x = np.empty_like(yarr)
    deep = yarr >= _DEEP_KH
    shallow = yarr < _SHALLOW_Y
    mid = ~(deep | shallow)
    x[deep] = yarr[deep]
    ys = yarr[shallow]
    x[shallow] = np.sqrt(ys * (1.0 + ys / 3.0 + 4.0 * ys * ys / 45.0))
    if np.any(mid):
        x[mid] = _newton_kh(yarr[mid])
    return x


def _newton_kh(y: FloatArray) -> FloatArray:
    """Newton on F(x) = x tanh x - y for 1e-6 <= y < 20 (1-D), bisection fallback."""
    x = y / np.tanh(y**0.75) ** (2.0 / 3.0)
    active = np.ones(y.shape, dtype=bool)
    for _ in range(_MAX_NEWTON):
        xa = x[active]
        ya = y[active]
        t = np.tanh(xa)
        dx = (xa * t - ya) / (t + xa * (1.0 - t * t))
        xa = xa - dx
        x[active] = xa
        done = np.abs(dx) <= _REL_TOL * xa
        idx = np.flatnonzero(active)
        active[idx[done]] = False
        if not active.any():
            break
    bad = active | ~np.isfinite(x) | (x <= 0)
    if bad.any():
        x[bad] = _bisect_kh(y[bad])
    return x


def _bisect_kh(y: FloatArray) -> FloatArray:
    """Bisection on [max(y, sqrt y), y + sqrt y], which always brackets the root."""
    lo = np.maximum(y, np.sqrt(y))
    hi = y + np.sqrt(y)
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        f = mid * np.tanh(mid) - y
        lo = np.where(f < 0, mid, lo)
        hi = np.where(f < 0, hi, mid)
        if np.all(hi - lo <= _REL_TOL * 0.25 * hi):
            break
    return 0.5 * (lo + hi)


def wavenumber_rad_m(
    omega_rad_s: ArrayLike,
    depth_m: Optional[ArrayLike] = None,
    *,
    g_m_s2: float = G_STANDARD_M_S2,
) -> FloatArray:
    """Wavenumber k [rad/m] of linear waves of angular frequency omega at depth h.

    Solves the Airy dispersion relation omega**2 = g k tanh(k h) (SPM 1984 ch. 2; Dean &
    Dalrymple 1991 ch. 3) in x = k h by Newton from the Fenton & McKee (1990) seed.

    Parameters
    ----------
    omega_rad_s : angular frequency [rad/s], finite and > 0; any shape.
    depth_m : still-water depth h [m], > 0; ``None`` or ``+inf`` (elementwise) means deep
        water, k = omega**2/g. Broadcasts with ``omega_rad_s``.
    g_m_s2 : gravity [m/s^2] (default standard gravity 9.80665).

    Returns
    -------
    k [rad/m], the broadcast shape of ``omega_rad_s`` and ``depth_m``.

    Raises
    ------
    SeawayInputError
        omega <= 0, NaN or inf; depth <= 0 or NaN (message names ``depth_m`` and the value).
    """
    g = _validate_g(g_m_s2)
    omega = require_positive("omega_rad_s", omega_rad_s)
    depth = _validate_depth(depth_m)
    k0 = omega * omega / g
    if depth is None:
        return np.asarray(k0, dtype=float)
    try:
        k0b, hb = np.broadcast_arrays(k0, depth)
    except ValueError as exc:
        raise SeawayInputError(
            f"omega_rad_s (shape {omega.shape}) and depth_m (shape {depth.shape}) do not broadcast"
        ) from exc
    k = np.array(k0b, dtype=float, copy=True)
    finite = np.isfinite(hb)
    if finite.any():
        y = k0b[finite] * hb[finite]
        # Very long waves on very shallow water can underflow y to 0: keep it a clear error.
        if np.any(y <= 0):
            raise SeawayInputError(
                "omega_rad_s**2 * depth_m / g underflows to 0; omega_rad_s or depth_m is "
                "unphysically small"
            )
        k[finite] = solve_kh(y) / hb[finite]
    return k


@dataclass(frozen=True)
class WaveKinematics:
    """Linear-wave kinematics for given periods and depths (all arrays of one shape).

    Fields: ``k_rad_m`` wavenumber [rad/m], ``wavelength_m`` L = 2 pi / k [m],
    ``celerity_m_s`` phase speed c = omega / k [m/s], ``group_speed_m_s`` c_g = n c [m/s]
    with n = (1 + 2kh / sinh(2kh)) / 2 (n = 1/2 in deep water).
    """

    k_rad_m: FloatArray
    wavelength_m: FloatArray
    celerity_m_s: FloatArray
    group_speed_m_s: FloatArray


def _group_factor(kh: FloatArray) -> FloatArray:
    """n = c_g / c = (1 + 2kh / sinh(2kh)) / 2; exactly 1/2 for kh >= 20 (and inf)."""
    n = np.full(kh.shape, 0.5)
    m = kh < _DEEP_KH
    two = 2.0 * kh[m]
    n[m] = 0.5 * (1.0 + two / np.sinh(two))
    return n


def wave_kinematics(
    period_s: ArrayLike,
    depth_m: Optional[ArrayLike] = None,
    *,
    g_m_s2: float = G_STANDARD_M_S2,
) -> WaveKinematics:
    """Wavenumber, wavelength, phase and group speed of linear waves of period T at depth h.

    omega = 2 pi / T; k from omega**2 = g k tanh(k h); L = 2 pi / k; c = omega / k;
    c_g = c (1 + 2kh / sinh(2kh)) / 2 (Airy theory, SPM 1984 ch. 2, Dean & Dalrymple 1991
    ch. 3). Deep-water limits: L0 = g T**2 / (2 pi), c0 = g T / (2 pi), c_g = c0 / 2; shallow
    limit: c = c_g = sqrt(g h).

    Parameters
    ----------
    period_s : wave period T [s], finite and > 0.
    depth_m : depth [m] > 0, ``None``/``inf`` = deep water; broadcasts with ``period_s``.
    g_m_s2 : gravity [m/s^2].

    Returns
    -------
    WaveKinematics with fields of the broadcast shape.
    """
    period = require_positive("period_s", period_s)
    omega = 2.0 * math.pi / period
    k = wavenumber_rad_m(omega, depth_m, g_m_s2=g_m_s2)
    omega_b = np.broadcast_to(omega, k.shape)
    depth = _validate_depth(depth_m)
    if depth is None:
        n = np.full(k.shape, 0.5)
    else:
        kh = k * np.broadcast_to(depth, k.shape)
        n = _group_factor(kh)
    c = omega_b / k
    return WaveKinematics(
        k_rad_m=k,
        wavelength_m=2.0 * math.pi / k,
        celerity_m_s=np.asarray(c, dtype=float),
        group_speed_m_s=n * c,
    )


def wavelength_m(
    period_s: ArrayLike,
    depth_m: Optional[ArrayLike] = None,
    *,
    g_m_s2: float = G_STANDARD_M_S2,
) -> FloatArray:
    """Wavelength L = 2 pi / k [m] of linear waves of period T [s] at depth h [m].

    See :func:`wave_kinematics` (Airy dispersion, SPM 1984 ch. 2). Deep water L0 = g T^2/(2 pi).
    """
    return wave_kinematics(period_s, depth_m, g_m_s2=g_m_s2).wavelength_m


def phase_speed_m_s(
    period_s: ArrayLike,
    depth_m: Optional[ArrayLike] = None,
    *,
    g_m_s2: float = G_STANDARD_M_S2,
) -> FloatArray:
    """Phase speed (celerity) c = omega / k = L / T [m/s] (Airy dispersion, SPM 1984 ch. 2)."""
    return wave_kinematics(period_s, depth_m, g_m_s2=g_m_s2).celerity_m_s


def group_speed_m_s(
    period_s: ArrayLike,
    depth_m: Optional[ArrayLike] = None,
    *,
    g_m_s2: float = G_STANDARD_M_S2,
) -> FloatArray:
    """Group speed c_g = c (1 + 2kh / sinh 2kh) / 2 [m/s] (Airy theory, SPM 1984 ch. 2)."""
    return wave_kinematics(period_s, depth_m, g_m_s2=g_m_s2).group_speed_m_s
