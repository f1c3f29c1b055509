# SPDX-License-Identifier: GPL-2.0-or-later
"""Closed-form transfer functions (RAOs) for heave, pitch and roll, and the natural roll period.

Amplitudes per unit wave amplitude of a regular wave of angular frequency omega [rad/s],
wavenumber k [rad/m] (deep water k = omega**2/g; a local finite-depth k may be passed) met at
speed U [m/s] and ITTC relative heading mu [deg] (180 head, 90 beam, 0 following).

Heave and pitch: Jensen, Mansour & Olsen (2004) "Estimation of ship motions using closed-form
expressions", Ocean Engineering 31(1) 61-85 (box-shaped, homogeneously loaded monohull; deep
water; linear)::

    alpha = omega_e / omega = 1 - k U cos(mu) / omega     (= 1 - Fn sqrt(kL) cos mu, deep water)
    B     = Cb B0 (default, "block")  or  B0 ("full")
    ke    = k |cos mu|,  sigma = ke L / 2
    A     = 2 sin(k B alpha**2 / 2) exp(-k T alpha**2)
    f     = sqrt((1 - kT)**2 + (A**2 / (k B alpha**3))**2)
    kappa = exp(-k T) (default)  or  exp(-ke T) (option "ke", as in some public reproductions)
    F     = kappa f sin(sigma)/sigma
    G     = kappa f (6/L) (1/sigma) (sin(sigma)/sigma - cos(sigma))
    eta   = 1 / sqrt((1 - 2 k T alpha**2)**2 + (A**2 / (k B alpha**2))**2)
    heave = eta |F| [m/m],  pitch = eta |G| [rad/m]

The default kappa = exp(-kT) is the one that keeps heave = 1 + O(k**2) in long waves at every
heading (with exp(-ke T) beam-sea heave tends to 1/2 in short waves instead of 0). Evaluation is
guard-free: A**2/(k B alpha**3) is computed as k B alpha sinc(x)**2 exp(-2 k T alpha**2) with
x = k B alpha**2/2 (exact identity), which is finite as alpha -> 0 (following seas) and k -> 0;
(sin s - s cos s)/s**3 uses its series 1/3 - s**2/30 + s**4/840 for s < 1e-2 (beam seas).
The range we accept as "valid" is our own choice from strip-theory practice (slender
displacement hull at moderate speed; common practice, no source): Fn = U/sqrt(gL) <= 0.4,
2.5 <= L/B <= 10, 1.5 <= B/T <= 6; outside it the per-sample OUTSIDE_VALIDITY flag is set.

Roll: single-degree-of-freedom damped oscillator driven by the effective wave slope (Lloyd
1989, "Seakeeping: Ship Behaviour in Rough Weather", ch. 9; Bhattacharyya 1978, "Dynamics of
Marine Vehicles", ch. 5)::

    roll = r k |sin mu| / sqrt((1 - (omega_e/omega_r)**2)**2 + (2 zeta omega_e/omega_r)**2)  [rad/m]
    omega_r = 2 pi / T_roll,  zeta = damping as a fraction of critical

with effective-slope reduction r (our documented choice, default "beam_draught"):
r = 3 (sin y - y cos y)/y**3 * exp(-k T), y = k |sin mu| B0/2 (slope averaged over the beam
and the pressure decay to the keel); "beam" drops exp(-kT); "none" uses r = 1.
Natural roll period (IMO 2008 IS Code, Res. MSC.267(85), Part A s.2.3 weather criterion):
T = 2 C B / sqrt(GM), C = 0.373 + 0.023 B/d - 0.043 Lwl/100 (lengths in m, T in s).
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Optional, Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..waves.encounter import cos_deg
from ..units import G_STANDARD_M_S2, FloatArray
from ..validation import SeawayInputError, show
from ..validation import as_float_array, require_nonnegative, require_positive

__all__ = [
    "HeavePitchTransfer",
    "MotionTransfer",
    "jmo_heave_pitch",
    "roll_transfer_rad_per_m",
    "effective_slope_factor",
    "jmo_validity_mask",
    "ClosedFormTransfer",
    "FN_MAX",
    "L_OVER_B_RANGE",
    "B_OVER_T_RANGE",
]

FN_MAX: float = 0.4
L_OVER_B_RANGE = (2.5, 10.0)
B_OVER_T_RANGE = (1.5, 6.0)
_KAPPA = ("k", "ke")
_BREADTH = ("block", "full")
_SLOPE = ("beam_draught", "beam", "none")


def _scalar_pos(name: str, v: float) -> float:
    arr = require_positive(name, v)
    if arr.ndim != 0:
        raise SeawayInputError(f"{name} must be a scalar, got shape {arr.shape}")
    return float(arr)


def _cube_ratio(s: FloatArray) -> FloatArray:
    """(sin s - s cos s) / s**3 with its series below |s| < 1e-2 (-> 1/3 at s = 0).

    Above 1e-2 the closed form loses at most about eps/s**2 ~ 2e-12 relative to cancellation.
    """
    s = np.abs(np.asarray(s, dtype=float))
    shape = s.shape
    s = s.reshape(-1)
    with np.errstate(divide="ignore", invalid="ignore"):
        out = (np.sin(s) - s * np.cos(s)) / (s * s * s)
    small = s < 1e-2
    if np.any(small):
        s2 = s[small] ** 2
        out[small] = 1.0 / 3.0 - s2 / 30.0 + s2 * s2 / 840.0
    return out.reshape(shape)


def _sin_deg_abs(mu_deg: ArrayLike) -> FloatArray:
    """|sin mu| with exact zeros at 0/180 deg."""
    return np.abs(cos_deg(np.asarray(mu_deg, dtype=float) - 90.0))


@dataclass(frozen=True)
class HeavePitchTransfer:
    """JMO heave/pitch amplitudes. ``heave_m_per_m`` [m/m], ``pitch_rad_per_m`` [rad/m],
    ``omega_e_rad_s`` signed encounter frequency [rad/s]; one broadcast shape."""

    heave_m_per_m: FloatArray
    pitch_rad_per_m: FloatArray
    omega_e_rad_s: FloatArray


def jmo_heave_pitch(
    omega_rad_s: ArrayLike,
    k_rad_m: ArrayLike,
    rel_heading_deg: ArrayLike,
    speed_m_s: ArrayLike,
    length_m: float,
    beam_m: float,
    draught_m: float,
    block_coeff: float,
    *,
    kappa: str = "k",
    breadth: str = "block",
) -> HeavePitchTransfer:
    """Heave [m/m] and pitch [rad/m] amplitudes of Jensen, Mansour & Olsen (2004).

    Equations in the module docstring (Ocean Engineering 31(1) 61-85). Arguments broadcast:
    omega [rad/s] > 0, k [rad/m] > 0 (pass the local finite-depth k if wanted; the formulas are
    the deep-water ones with that k), mu [deg] ITTC (180 head), U [m/s] >= 0; L, B0, T [m] and
    Cb scalars. ``kappa`` "k" (exp(-kT), default) or "ke" (exp(-|k cos mu| T));
    ``breadth`` "block" (B = Cb B0, default) or "full" (B = B0).
    """
    if kappa not in _KAPPA:
        raise SeawayInputError(f"kappa must be one of {_KAPPA}, got {show(kappa)}")
    if breadth not in _BREADTH:
        raise SeawayInputError(f"breadth must be one of {_BREADTH}, got {show(breadth)}")
    L = _scalar_pos("length_m", length_m)
    B0 = _scalar_pos("beam_m", beam_m)
    T = _scalar_pos("draught_m", draught_m)
    cb = _scalar_pos("block_coeff", block_coeff)
    omega = require_positive("omega_rad_s", omega_rad_s)
    k = require_positive("k_rad_m", k_rad_m)
    U = require_nonnegative("speed_m_s", speed_m_s)
    c = cos_deg(as_float_array("rel_heading_deg", rel_heading_deg))
    omega_e = omega - k * U * c
    heave, pitch = _jmo_core(omega, k, c, omega_e, L, cb * B0 if breadth == "block" else B0, T, kappa)
    return HeavePitchTransfer(
        heave_m_per_m=np.asarray(heave, dtype=float),
        pitch_rad_per_m=np.asarray(pitch, dtype=float),
        omega_e_rad_s=np.asarray(omega_e, dtype=float),
    )


def _jmo_core(omega: FloatArray, k: FloatArray, c: FloatArray, omega_e: FloatArray,
              L: float, Beff: float, T: float, kappa: str) -> Tuple[FloatArray, FloatArray]:
    """Unchecked JMO evaluation (inputs validated by the caller); c = cos mu."""
    alpha = omega_e / omega
    a2 = alpha * alpha
    kta2 = k * T * a2
    sinc2 = np.sinc((0.5 / math.pi) * k * Beff * a2) ** 2
    q3 = (k * Beff) * alpha * sinc2 * np.exp(-2.0 * kta2)  # = A**2 / (k B alpha**3)
    q2 = q3 * alpha  # = A**2 / (k B alpha**2)
    one_kt = 1.0 - k * T
    f = np.sqrt(one_kt * one_kt + q3 * q3)
    ke = k * np.abs(c)
    kap = np.exp(-k * T) if kappa == "k" else np.exp(-ke * T)
    sigma = 0.5 * ke * L
    d = 1.0 - 2.0 * kta2
    eta_kf = kap * f / np.sqrt(d * d + q2 * q2)
    heave = eta_kf * np.abs(np.sinc(sigma / math.pi))
    pitch = eta_kf * (6.0 / L) * np.abs(sigma * _cube_ratio(sigma))
    return heave, pitch


def effective_slope_factor(
    k_rad_m: ArrayLike,
    rel_heading_deg: ArrayLike,
    beam_m: float,
    draught_m: float,
    mode: str = "beam_draught",
) -> FloatArray:
    """Effective wave-slope reduction r for roll (dimensionless, 0 <= r <= 1).

    "beam_draught": r = |3 (sin y - y cos y)/y**3| exp(-k T), y = k |sin mu| B/2 (beam average of
    the slope of a cosine wave, and the exp(-kT) pressure decay; our documented choice after
    Lloyd 1989 ch. 9); "beam": without exp(-kT); "none": r = 1.
    """
    if mode not in _SLOPE:
        raise SeawayInputError(f"slope_reduction must be one of {_SLOPE}, got {show(mode)}")
    k = require_positive("k_rad_m", k_rad_m)
    if mode == "none":
        return np.ones(np.broadcast_shapes(k.shape, np.shape(rel_heading_deg)))
    B = _scalar_pos("beam_m", beam_m)
    y = 0.5 * k * _sin_deg_abs(rel_heading_deg) * B
    r = np.abs(3.0 * _cube_ratio(y))  # amplitude: the beam average changes sign for y > 4.49
    if mode == "beam_draught":
        r = r * np.exp(-k * _scalar_pos("draught_m", draught_m))
    return np.asarray(r, dtype=float)


def roll_transfer_rad_per_m(
    k_rad_m: ArrayLike,
    rel_heading_deg: ArrayLike,
    omega_e_rad_s: ArrayLike,
    roll_period_s: float,
    damping_ratio: float,
    beam_m: float,
    draught_m: float,
    *,
    slope_reduction: str = "beam_draught",
) -> FloatArray:
    """Roll amplitude [rad/m] of the slope-driven 1-DOF model (Lloyd 1989; Bhattacharyya 1978).

    roll = r k |sin mu| / sqrt((1 - (we/wr)**2)**2 + (2 zeta we/wr)**2), wr = 2 pi / T_roll,
    we = |omega_e| [rad/s]; r from :func:`effective_slope_factor`. Arguments broadcast.
    """
    tr = _scalar_pos("roll_period_s", roll_period_s)
    zeta = _scalar_pos("damping_ratio", damping_ratio)
    k = require_positive("k_rad_m", k_rad_m)
    we = as_float_array("omega_e_rad_s", omega_e_rad_s)
    if slope_reduction not in _SLOPE:
        raise SeawayInputError(f"slope_reduction must be one of {_SLOPE}, got {show(slope_reduction)}")
    B = _scalar_pos("beam_m", beam_m)
    T = _scalar_pos("draught_m", draught_m)
    sa = _sin_deg_abs(as_float_array("rel_heading_deg", rel_heading_deg))
    return np.asarray(_roll_core(k, sa, we, tr, zeta, B, T, slope_reduction), dtype=float)


def _roll_core(k: FloatArray, abs_sin: FloatArray, omega_e: FloatArray, tr: float, zeta: float,
               B: float, T: float, mode: str) -> FloatArray:
    """Unchecked roll evaluation (inputs validated by the caller)."""
    q = omega_e * (tr / (2.0 * math.pi))
    q2 = q * q
    den = np.sqrt((1.0 - q2) ** 2 + (4.0 * zeta * zeta) * q2)
    slope = k * abs_sin
    if mode != "none":
        slope = slope * np.abs(3.0 * _cube_ratio((0.5 * B) * slope))
        if mode == "beam_draught":
            slope = slope * np.exp(-k * T)
    return slope / den


def jmo_validity_mask(
    speed_m_s: ArrayLike,
    length_m: float,
    beam_m: float,
    draught_m: float,
    *,
    g_m_s2: float = G_STANDARD_M_S2,
) -> NDArray[np.bool_]:
    """True where the closed-form model is inside our documented range (module docstring):
    Fn = U/sqrt(g L) <= 0.4, 2.5 <= L/B <= 10 and 1.5 <= B/T <= 6."""
    U = require_nonnegative("speed_m_s", speed_m_s)
    L = _scalar_pos("length_m", length_m)
    B = _scalar_pos("beam_m", beam_m)
    T = _scalar_pos("draught_m", draught_m)
    fn = U / math.sqrt(_scalar_pos("g_m_s2", g_m_s2) * L)
    hull_ok = (L_OVER_B_RANGE[0] <= L / B <= L_OVER_B_RANGE[1]) and (
        B_OVER_T_RANGE[0] <= B / T <= B_OVER_T_RANGE[1]
    )
    return np.asarray((fn <= FN_MAX) & hull_ok, dtype=bool)


@dataclass(frozen=True)
class MotionTransfer:
    """Heave [m/m], pitch [rad/m] and roll [rad/m] amplitudes on one broadcast shape."""

    heave_m_per_m: FloatArray
    pitch_rad_per_m: FloatArray
    roll_rad_per_m: FloatArray


@dataclass(frozen=True)
class ClosedFormTransfer:
    """Transfer model of one hull: JMO 2004 heave/pitch and the slope-driven roll model.

    Common interface with :class:`.rao_table.TableTransfer`: ``evaluate(omega, k, mu, U,
    omega_e)`` returns :class:`MotionTransfer`; ``validity(U)`` returns the per-sample mask;
    ``covered(omega)`` is None (no frequency range limit).
    """

    length_m: float
    beam_m: float
    draught_m: float
    block_coeff: float
    roll_period_s: float
    roll_damping_ratio: float
    kappa: str = "k"
    breadth: str = "block"
    slope_reduction: str = "beam_draught"
    g_m_s2: float = G_STANDARD_M_S2
    name: str = "closed-form (Jensen, Mansour & Olsen 2004; slope-driven roll)"

    @classmethod
    def from_profile(cls, profile: "object", *, kappa: str = "k", breadth: str = "block",
                     slope_reduction: str = "beam_draught", g_m_s2: float = G_STANDARD_M_S2) -> "ClosedFormTransfer":
        p = profile
        return cls(
            length_m=p.length_wl_m, beam_m=p.beam_m, draught_m=p.draught_m,  # type: ignore[attr-defined]
            block_coeff=p.block_coeff, roll_period_s=p.natural_roll_period_s,  # type: ignore[attr-defined]
            roll_damping_ratio=p.closed_form_damping_ratio, kappa=kappa, breadth=breadth,  # type: ignore[attr-defined]
            slope_reduction=slope_reduction, g_m_s2=g_m_s2,
        )

    def evaluate(self, omega_rad_s: ArrayLike, k_rad_m: ArrayLike, rel_heading_deg: ArrayLike,
                 speed_m_s: ArrayLike, omega_e_rad_s: Optional[ArrayLike] = None) -> MotionTransfer:
        hp = jmo_heave_pitch(omega_rad_s, k_rad_m, rel_heading_deg, speed_m_s, self.length_m,
                             self.beam_m, self.draught_m, self.block_coeff,
                             kappa=self.kappa, breadth=self.breadth)
        we = hp.omega_e_rad_s if omega_e_rad_s is None else omega_e_rad_s
        roll = roll_transfer_rad_per_m(k_rad_m, rel_heading_deg, we, self.roll_period_s,
                                       self.roll_damping_ratio, self.beam_m, self.draught_m,
                                       slope_reduction=self.slope_reduction)
        return MotionTransfer(hp.heave_m_per_m, hp.pitch_rad_per_m,
                              np.broadcast_to(roll, hp.heave_m_per_m.shape))

    def evaluate_grid(self, omega_rad_s: FloatArray, k_rad_m: FloatArray, rel_heading_deg: FloatArray,
                      cos_mu: FloatArray, abs_sin_mu: FloatArray, omega_e_rad_s: FloatArray) -> MotionTransfer:
        """Unchecked fast path for :mod:`.response` (validated inputs, broadcasting shapes)."""
        beff = self.block_coeff * self.beam_m if self.breadth == "block" else self.beam_m
        heave, pitch = _jmo_core(omega_rad_s, k_rad_m, cos_mu, omega_e_rad_s, self.length_m, beff,
                                 self.draught_m, self.kappa)
        roll = _roll_core(k_rad_m, abs_sin_mu, omega_e_rad_s, self.roll_period_s,
                          self.roll_damping_ratio, self.beam_m, self.draught_m, self.slope_reduction)
        return MotionTransfer(heave, pitch, roll)

    def validity(self, speed_m_s: ArrayLike) -> NDArray[np.bool_]:
        return jmo_validity_mask(speed_m_s, self.length_m, self.beam_m, self.draught_m, g_m_s2=self.g_m_s2)

    def covered(self, omega_rad_s: FloatArray) -> Optional[NDArray[np.bool_]]:
        """Closed form covers every frequency: None."""
        return None
