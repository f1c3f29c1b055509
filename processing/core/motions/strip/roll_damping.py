# SPDX-License-Identifier: GPL-2.0-or-later
"""Roll natural frequency and viscous roll damping added to the strip-theory wave damping.

Roll about G (axes in ``strip/__init__``). Added inertia about G from the waterline-origin
2-D coefficients (transformation of the sway-roll block to G, eta2_O = eta2_G + z_G eta4):

    A44_G = A44_O + 2 z_G A24_O + z_G^2 A22_O          (A24 = A42 in 2-D)
    omega_n^2 (I44 + A44_G(omega_n)) = C44 = rho g V GM_T,   T_n = 2 pi / omega_n

solved by fixed-point iteration (A44 varies slowly with frequency). Critical damping
B_crit = 2 sqrt(C44 (I44 + A44_G)); a given total ratio zeta gives the viscous part
B_extra = max(zeta B_crit - B44_wave(omega_n), 0).

Ikeda's component method (Ikeda, Himeno & Tanaka 1978, Osaka Prefecture Univ. report 00405;
summarised in Himeno 1981, Univ. Michigan NAME report 239; the simplified regression is
Kawahara, Maekawa & Ikeda 2009): total = friction + eddy + lift + wave (+ bilge keels). Here:

* wave: the strip-theory potential damping (``lewis.py``), not a regression;
* friction (Kato 1958 as used by Ikeda; formula from memory, Himeno 1981 eq. for B_F):
      B_F = (4/(3 pi)) rho S r_f^3 phi_a omega C_f (1 + 4.1 U / (omega L))
      C_f = 1.328 (3.22 r_f^2 phi_a^2 omega / (pi nu))^(-1/2)
      r_f = ((0.887 + 0.145 Cb) S / L + 2 OG) / pi,  S = L (1.7 T + Cb B),  OG = -z_G
* lift (Ikeda; from memory): B_L = (rho/2) S_L U k_N l_0 l_R (1 + 1.4 OG/l_R + 0.7 OG^2/(l_0 l_R))
      with S_L = L T, l_0 = 0.3 T, l_R = 0.5 T, k_N = 2 pi T / L + kappa (4.1 B/L - 0.045),
      kappa = 0 (Cm <= 0.92), 0.1 (0.92 < Cm <= 0.97), 0.3 (Cm > 0.97);
* eddy making: NOT implemented. The regression of Kawahara, Maekawa & Ikeda 2009 could not be
  checked against the paper in this session and the coefficients as recalled gave an
  implausibly small eddy damping, so it was left out rather than guessed. Without it the
  "ikeda" damping is a lower bound at low speed for hulls without bilge keels (larger roll).
  A later search found public transcriptions of the authors' own program of the simplified
  method, but not the paper or ITTC 7.5-02-07-04.5 text to check them against; still left out.

Both friction and eddy depend on the roll amplitude phi_a: they are equivalent linear damping
coefficients at that amplitude (equal dissipated energy per cycle).
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from . import StripInputError
from .equations import HullModel, RigidBody
from ...validation import show

KINEMATIC_VISCOSITY_M2_S = 1.19e-6   # sea water about 15 C (ITTC 2011 fresh/sea water tables, from memory)


@dataclass(frozen=True)
class RollNatural:
    """Undamped roll natural frequency about G at zero speed and the quantities behind it."""

    omega_rad_s: float
    period_s: float
    inertia_kg_m2: float
    added_inertia_kg_m2: float
    stiffness_n_m: float
    wave_damping_n_m_s: float

    @property
    def critical_damping_n_m_s(self) -> float:
        return 2.0 * math.sqrt(self.stiffness_n_m * (self.inertia_kg_m2
                                                     + self.added_inertia_kg_m2))


def roll_coefficients_at_g(hull: HullModel, body: RigidBody, omega_rad_s: ArrayLike
                           ) -> tuple[NDArray, NDArray]:
    """A44_G [kg m^2] and B44_G (wave) [N m s] at zero speed (module docstring)."""
    w = np.atleast_1d(np.asarray(omega_rad_s, dtype=float))
    if np.any(~np.isfinite(w)) or np.any(w <= 0):
        raise StripInputError("omega_rad_s must be finite and > 0")
    c, rho, g = hull.coeffs, hull.rho_kg_m3, hull.g_m_s2
    ms = hull.forms.scale_m[:, None]
    nu = np.maximum(w[None, :] ** 2 * ms / g, c.nu[0])
    zg = body.z_g_m
    out = []
    for kind in ("a", "b"):
        tab = {}
        for name, power in (("22", 2), ("24", 3), ("44", 4)):
            val = np.array([np.interp(np.log(nu[s]), np.log(c.nu), getattr(c, kind + name)[s])
                            for s in range(ms.shape[0])])
            fac = rho * ms ** power * (w[None, :] if kind == "b" else 1.0)
            tab[name] = np.sum(hull.weights_m[:, None] * fac * val, axis=0)
        out.append(tab["44"] + 2 * zg * tab["24"] + zg ** 2 * tab["22"])
    return out[0], out[1]


def roll_natural(hull: HullModel, body: RigidBody, iterations: int = 30) -> RollNatural:
    """Undamped roll natural frequency from GM and the roll inertia (module docstring)."""
    i44 = body.mass_kg * body.kxx_m ** 2
    c44 = hull.rho_kg_m3 * hull.g_m_s2 * hull.volume_m3 * body.gm_t_m
    w = math.sqrt(c44 / i44)
    for _ in range(iterations):
        a44, _ = roll_coefficients_at_g(hull, body, w)
        w_new = math.sqrt(c44 / (i44 + float(a44[0])))
        if abs(w_new - w) < 1e-10 * w:
            break
        w = w_new
    a44, b44 = roll_coefficients_at_g(hull, body, w)
    return RollNatural(w, 2 * math.pi / w, i44, float(a44[0]), c44, float(b44[0]))


def extra_damping_for_ratio(hull: HullModel, body: RigidBody, total_ratio: float) -> float:
    """Viscous B44 [N m s/rad] so that wave + viscous damping is ``total_ratio`` of critical
    at the roll natural frequency (never negative: if the wave damping alone exceeds it, 0)."""
    if not (math.isfinite(total_ratio) and 0 <= total_ratio < 1):
        raise StripInputError(f"roll_damping_ratio = {show(total_ratio)}: give a fraction of "
                              "critical damping in [0, 1)")
    nat = roll_natural(hull, body)
    return max(total_ratio * nat.critical_damping_n_m_s - nat.wave_damping_n_m_s, 0.0)


def ikeda_friction_lift(hull: HullModel, body: RigidBody, omega_rad_s: ArrayLike,
                        roll_amplitude_rad: float, speed_m_s: float = 0.0,
                        kinematic_viscosity_m2_s: float = KINEMATIC_VISCOSITY_M2_S
                        ) -> NDArray[np.float64]:
    """Friction + lift roll damping [N m s/rad] after Ikeda (module docstring; eddy omitted)."""
    w = np.atleast_1d(np.asarray(omega_rad_s, dtype=float))
    if np.any(~np.isfinite(w)) or np.any(w <= 0):
        raise StripInputError("omega_rad_s must be finite and > 0")
    if not (math.isfinite(roll_amplitude_rad) and 0 < roll_amplitude_rad < 1.0):
        raise StripInputError(f"roll_amplitude_rad = {show(roll_amplitude_rad)}: give an "
                              "amplitude in (0, 1) rad")
    if not (math.isfinite(speed_m_s) and speed_m_s >= 0):
        raise StripInputError(f"speed_m_s = {show(speed_m_s)}: give a speed >= 0")
    rho, L, B, T = hull.rho_kg_m3, hull.length_m, hull.beam_m, hull.draught_m
    cb = hull.volume_m3 / (L * B * T)
    og = -body.z_g_m
    s_wet = L * (1.7 * T + cb * B)
    r_f = ((0.887 + 0.145 * cb) * s_wet / L + 2 * og) / math.pi
    r_f = max(r_f, 0.1 * T)
    phi = roll_amplitude_rad
    c_f = 1.328 * (3.22 * r_f ** 2 * phi ** 2 * w / (math.pi * kinematic_viscosity_m2_s)) ** -0.5
    b_f = 4 / (3 * math.pi) * rho * s_wet * r_f ** 3 * phi * w * c_f \
        * (1 + 4.1 * speed_m_s / (w * L))
    mid = int(np.argmax(hull.sections.area_m2))
    cm = hull.sections.area_m2[mid] / (hull.sections.beam_m[mid] * hull.sections.draught_m[mid])
    kappa = 0.0 if cm <= 0.92 else (0.1 if cm <= 0.97 else 0.3)
    k_n = 2 * math.pi * T / L + kappa * (4.1 * B / L - 0.045)
    l0, lr = 0.3 * T, 0.5 * T
    b_l = 0.5 * rho * L * T * speed_m_s * k_n * l0 * lr * (1 + 1.4 * og / lr
                                                          + 0.7 * og ** 2 / (l0 * lr))
    return b_f + max(b_l, 0.0)
