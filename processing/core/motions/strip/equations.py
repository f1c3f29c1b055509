# SPDX-License-Identifier: GPL-2.0-or-later
"""Coupled heave-pitch and sway-roll-yaw motions by the strip theory of Salvesen, Tuck &
Faltinsen (1970), "Ship motions and sea loads", Trans. SNAME 78, 250-287 (STF), with forward
speed, Lewis-section 2-D coefficients (``lewis.py``) and Froude-Krylov + diffraction exciting
forces. Axes, signs, heading and time convention: ``strip/__init__``.

Equations (STF eq. 1; j, k in {3, 5} and {2, 4, 6}), complex amplitudes at encounter frequency
omega_e = omega - k U cos(mu):

    sum_k [ -omega_e^2 (M_jk + A_jk) + i omega_e B_jk + C_jk ] eta_k = F_j

Hydrodynamic coefficients (STF Table 1 without transom terms; integrals over the stations x,
2-D coefficients a, b at omega_e; a_24 the sectional sway force per unit roll acceleration about
the waterline origin):

    A33 = int a33            B33 = int b33
    A35 = -int x a33 - U/w^2 B33      B35 = -int x b33 + U A33
    A53 = -int x a33 + U/w^2 B33      B53 = -int x b33 - U A33
    A55 = int x^2 a33 + U^2/w^2 A33   B55 = int x^2 b33 + U^2/w^2 B33
    A22, B22, A24 = A42, B24 = B42, A44, B44 (+ viscous roll damping)
    A26 = int x a22 + U/w^2 B22       B26 = int x b22 - U A22
    A62 = int x a22 - U/w^2 B22       B62 = int x b22 + U A22
    A46 = int x a24 + U/w^2 B24       B46 = int x b24 - U A24
    A64 = int x a24 - U/w^2 B24       B64 = int x b24 + U A24
    A66 = int x^2 a22 + U^2/w^2 A22   B66 = int x^2 b22 + U^2/w^2 B22

Exciting forces (STF eqs. 35-38), per unit wave amplitude, incident potential
phi_I = (i g / omega) e^{k z} e^{-i k (x cos mu - y sin mu)}, pressure p_I = rho g e^{kz} (...):
sectional Froude-Krylov f_j = -int_C p_I n_j dl and diffraction by the 2-D Haskind relation
    h_j = -i omega_e rho omega int_C phi_j (i n_3 - n_2 sin mu) e^{kz} e^{i k y sin mu} dl
(phi_j the 2-D radiation potential per unit velocity at omega_e, n out of the hull), then
    F3 = int (f3 + h3) e,  F5 = -int x (f3 + h3) e - U/(i omega_e) int h3 e,
    F2 = int (f2 + h2) e,  F4 = int (f4 + h4) e,  F6 = int x (f2 + h2) e + U/(i omega_e) int h2 e
with e = exp(-i k x cos mu). Depth enters only through the given local wavenumber k; the
vertical decay uses e^{kz} (deep-water form) with that k.

Rigid-body mass matrix about O with the centre of gravity G = (x_G, 0, z_G), mass = rho * volume
(free floating): M26 = m x_G, M35 = -m x_G, M24 = -m z_G, I44 = m (k_xx^2 + z_G^2),
I55 = m (k_yy^2 + x_G^2) (pitch about the transverse axis through z_G: surge is not modelled),
I66 = m (k_zz^2 + x_G^2). Restoring: C33 = rho g Awp, C35 = C53 = -rho g int x b,
C55 = rho g int x^2 b + rho g V (z_B - z_G), C44 = rho g V GM_T. Default radii of gyration:
roll 0.35 B, pitch and yaw 0.25 L (common practice, no source). Results at G:
heave_G = eta3 - x_G eta5, sway_G = eta2 + x_G eta6 - z_G eta4.

Near omega_e = 0 (following seas) the U/omega_e^2 terms are singular: |omega_e| is floored at
OMEGA_E_FLOOR_FRACTION * sqrt(g / L) with its sign kept. Overtaking waves (omega_e < 0) use the
conjugate radiation potentials and coefficients at |omega_e| (the linear system is real).
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Optional, Union

import numpy as np
from numpy.typing import ArrayLike, NDArray

from . import StripInputError
from .lewis import LewisForms, SectionCoefficients, lewis_forms, section_coefficients
from .sections import HullSections
from ...validation import show

OMEGA_E_FLOOR_FRACTION = 0.05
HEADING_CHUNK = 6


@dataclass(frozen=True)
class HullModel:
    """A hull prepared for strip theory: sections, Lewis forms, 2-D tables and hydrostatics."""

    sections: HullSections
    forms: LewisForms
    coeffs: SectionCoefficients
    weights_m: NDArray[np.float64]
    rho_kg_m3: float
    g_m_s2: float
    volume_m3: float
    x_b_m: float
    z_b_m: float
    waterplane_m2: float
    waterplane_moment_m3: float
    waterplane_inertia_l_m4: float
    waterplane_inertia_t_m4: float
    length_m: float
    beam_m: float
    draught_m: float


def prepare_hull(sections: HullSections, rho_kg_m3: float = 1025.0,
                 g_m_s2: float = 9.81) -> HullModel:
    """Lewis forms, 2-D coefficient tables and hydrostatics of the sections (trapezoid in x).

    z_B is the centroid depth of the Lewis sections (Green's theorem on the contour), so it is
    consistent with the hydrodynamic model rather than the true hull.
    """
    for name, v in (("rho_kg_m3", rho_kg_m3), ("g_m_s2", g_m_s2)):
        if not (math.isfinite(v) and v > 0):
            raise StripInputError(f"{name} = {show(v)}: give a positive value")
    forms = lewis_forms(sections.beam_m, sections.draught_m, sections.area_m2)
    coeffs = _unique_section_coefficients(forms)
    w = sections.integration_weights_m()
    x, b = sections.x_m, sections.beam_m
    ms = forms.scale_m[:, None]
    y, z = ms * coeffs.y_hat, ms * coeffs.z_hat
    area = np.sum(-z * ms * coeffs.wy, axis=1)          # int -z dy: area below the waterline
    moment = np.sum(-0.5 * z ** 2 * ms * coeffs.wy, axis=1)   # int -z^2/2 dy = int z dA
    volume = float(np.sum(w * area))
    if volume <= 0:
        raise StripInputError("hull sections enclose no volume")
    return HullModel(
        sections=sections, forms=forms, coeffs=coeffs, weights_m=w, rho_kg_m3=rho_kg_m3,
        g_m_s2=g_m_s2, volume_m3=volume, x_b_m=float(np.sum(w * x * area) / volume),
        z_b_m=float(np.sum(w * moment) / volume), waterplane_m2=float(np.sum(w * b)),
        waterplane_moment_m3=float(np.sum(w * x * b)),
        waterplane_inertia_l_m4=float(np.sum(w * x ** 2 * b)),
        waterplane_inertia_t_m4=float(np.sum(w * b ** 3) / 12.0),
        length_m=sections.length_m, beam_m=float(b.max()),
        draught_m=float(sections.draught_m.max()))


def _unique_section_coefficients(forms: LewisForms) -> SectionCoefficients:
    """2-D tables computed once per distinct Lewis shape (a1, a3) and spread to the sections
    (the tables are per unit scale, so equal shapes share them; e.g. fore-aft symmetry)."""
    key = np.round(np.stack([forms.a1, forms.a3], axis=1), 12)
    _, first, inverse = np.unique(key, axis=0, return_index=True, return_inverse=True)
    inverse = np.asarray(inverse).reshape(-1)
    sub = LewisForms(forms.scale_m[first], forms.a1[first], forms.a3[first],
                     forms.area_coeff[first], forms.clipped[first])
    c = section_coefficients(sub)
    fields = {name: getattr(c, name) for name in c.__dataclass_fields__}
    return SectionCoefficients(**{name: (value if name == "nu" else value[inverse])
                                  for name, value in fields.items()})


@dataclass(frozen=True)
class MassProperties:
    """Loading condition: GM_T [m], radii of gyration about G [m], LCG x_g_m (None: LCB)."""

    gm_t_m: float
    roll_gyradius_m: Optional[float] = None
    pitch_gyradius_m: Optional[float] = None
    yaw_gyradius_m: Optional[float] = None
    x_g_m: Optional[float] = None


@dataclass(frozen=True)
class RigidBody:
    """Mass, G and radii of gyration resolved for a hull (defaults applied)."""

    mass_kg: float
    x_g_m: float
    z_g_m: float
    kxx_m: float
    kyy_m: float
    kzz_m: float
    gm_t_m: float


def rigid_body(hull: HullModel, mass: MassProperties) -> RigidBody:
    """Free-floating rigid body: m = rho V, z_G = z_B + BM_T - GM_T, default radii of gyration
    0.35 B (roll), 0.25 L (pitch, yaw) (common practice, no source)."""
    gm = mass.gm_t_m
    if not (isinstance(gm, (int, float)) and math.isfinite(gm) and gm > 0):
        raise StripInputError(f"gm_t_m = {show(gm)}: give a positive metacentric height in metres")
    radii = []
    for name, v, default in (("roll_gyradius_m", mass.roll_gyradius_m, 0.35 * hull.beam_m),
                             ("pitch_gyradius_m", mass.pitch_gyradius_m, 0.25 * hull.length_m),
                             ("yaw_gyradius_m", mass.yaw_gyradius_m, 0.25 * hull.length_m)):
        v = default if v is None else v
        if not (math.isfinite(v) and v > 0):
            raise StripInputError(f"{name} = {show(v)}: give a positive radius of gyration in metres")
        radii.append(float(v))
    bm = hull.waterplane_inertia_t_m4 / hull.volume_m3
    xg = hull.x_b_m if mass.x_g_m is None else float(mass.x_g_m)
    return RigidBody(hull.rho_kg_m3 * hull.volume_m3, xg, hull.z_b_m + bm - gm, *radii, gm)


@dataclass(frozen=True)
class StripRaos:
    """Complex RAOs at G per unit wave amplitude, shape (omega, heading); exp(+i omega_e t)."""

    omega_rad_s: NDArray[np.float64]
    heading_deg: NDArray[np.float64]
    speed_m_s: float
    omega_e_rad_s: NDArray[np.float64]
    heave_m_m: NDArray[np.complex128]
    sway_m_m: NDArray[np.complex128]
    roll_rad_m: NDArray[np.complex128]
    pitch_rad_m: NDArray[np.complex128]
    yaw_rad_m: NDArray[np.complex128]
    x_g_m: float
    z_g_m: float


def _as_1d(name: str, value: ArrayLike) -> NDArray[np.float64]:
    arr = np.atleast_1d(np.asarray(value, dtype=float))
    if arr.ndim != 1 or arr.size == 0:
        raise StripInputError(f"{name} must be a non-empty 1-D array, got shape {arr.shape}")
    bad = np.flatnonzero(~np.isfinite(arr))
    if bad.size:
        raise StripInputError(f"{name}[{bad[0]}] = {show(arr[bad[0]])} is not finite")
    return arr


class _Interp:
    """Log-nu linear interpolation of the 2-D tables at (sections, omega, heading)."""

    def __init__(self, hull: HullModel, omega_abs: NDArray) -> None:
        nu_grid = hull.coeffs.nu
        ms = hull.forms.scale_m[:, None, None]
        nu = np.maximum(omega_abs[None] ** 2 * ms / hull.g_m_s2, 1e-300)
        t = (np.log(nu) - np.log(nu_grid[0])) / (np.log(nu_grid[-1] / nu_grid[0])) \
            * (nu_grid.size - 1)
        t = np.clip(t, 0.0, nu_grid.size - 1.0)
        self.i = np.minimum(t.astype(int), nu_grid.size - 2)
        self.f = t - self.i
        self.s = np.arange(ms.shape[0])[:, None, None]

    def __call__(self, table: NDArray) -> NDArray:
        lo, hi = table[self.s, self.i], table[self.s, self.i + 1]
        f = self.f if table.ndim == 2 else self.f[..., None]
        return lo * (1 - f) + hi * f


def _radiation(hull: HullModel, ip: _Interp, wa: NDArray) -> dict:
    """Dimensional sectional coefficients (sections, omega, heading) at |omega_e| = wa."""
    c, rho = hull.coeffs, hull.rho_kg_m3
    ms = hull.forms.scale_m[:, None, None]
    out = {}
    for name, power in (("22", 2), ("33", 2), ("24", 3), ("44", 4)):
        out["a" + name] = rho * ms ** power * ip(getattr(c, "a" + name))
        out["b" + name] = rho * wa[None] * ms ** power * ip(getattr(c, "b" + name))
    return out


def _incident(hull: HullModel, k: NDArray, mu: NDArray) -> tuple[NDArray, ...]:
    """Speed-independent parts: sectional Froude-Krylov f2, f3, f4 and the diffraction kernel
    (i n3 - n2 sin mu) e^{kz} e^{i k y sin mu} dl at the contour nodes."""
    c, rho, g = hull.coeffs, hull.rho_kg_m3, hull.g_m_s2
    ms = hull.forms.scale_m[:, None, None, None]
    y, z = ms * c.y_hat[:, None, None, :], ms * c.z_hat[:, None, None, :]
    wy, wz = ms * c.wy[:, None, None, :], ms * c.wz[:, None, None, :]
    kk = k[None, :, None, None]
    sin_mu = np.sin(mu)[None, None, :, None]
    e_q = np.exp(kk * z + 1j * kk * y * sin_mu)
    f3 = rho * g * np.sum(e_q * wy, -1)
    f2 = -rho * g * np.sum(e_q * wz, -1)
    f4 = rho * g * np.sum(e_q * (y * wy + z * wz), -1)
    kern = e_q * (-1j * wy - sin_mu * wz)
    half = kern.shape[-1] // 2      # nodes: port half, then its mirror images (lewis.py)
    return f2, f3, f4, kern[..., :half] + kern[..., half:], kern[..., :half] - kern[..., half:]


def _exciting(hull: HullModel, ip: _Interp, k: NDArray, mu: NDArray, wes: NDArray,
              omega: NDArray, speed: float, incident: tuple) -> tuple[NDArray, ...]:
    """F2..F6 per unit wave amplitude (STF eqs. 35-38 as in the module docstring)."""
    c, rho = hull.coeffs, hull.rho_kg_m3
    ms = hull.forms.scale_m[:, None, None, None]
    f2, f3, f4, kern_sym, kern_anti = incident
    neg = (wes < 0)[None, ..., None]
    scale = -1j * wes[None] * rho * omega[None, :, None]
    half = kern_sym.shape[-1]
    h = {}
    for j, power, kern in (("2", 1, kern_anti), ("3", 1, kern_sym), ("4", 2, kern_anti)):
        # potentials are even (heave) or odd (sway, roll) across the centre plane
        phi = ip(getattr(c, "phi" + j)[:, :, :half]) * ms ** power
        phi = np.where(neg, np.conj(phi), phi)
        h[j] = scale * np.sum(phi * kern, -1)
    x = hull.sections.x_m[:, None, None]
    w = hull.weights_m[:, None, None]
    e = w * np.exp(-1j * k[None, :, None] * x * np.cos(mu)[None, None, :])
    s3, s2 = np.sum(e * h["3"], 0), np.sum(e * h["2"], 0)
    F3 = np.sum(e * (f3 + h["3"]), 0)
    F5 = -np.sum(e * x * (f3 + h["3"]), 0) - speed / (1j * wes) * s3
    F2 = np.sum(e * (f2 + h["2"]), 0)
    F4 = np.sum(e * (f4 + h["4"]), 0)
    F6 = np.sum(e * x * (f2 + h["2"]), 0) + speed / (1j * wes) * s2
    return F2, F3, F4, F5, F6


def _heave_pitch(hull: HullModel, body: RigidBody, r: dict, wes: NDArray, speed: float
                 ) -> NDArray:
    """2 x 2 impedance of heave-pitch about O (module docstring)."""
    x = hull.sections.x_m[:, None, None]
    w = hull.weights_m[:, None, None]
    rho_g = hull.rho_kg_m3 * hull.g_m_s2
    a0, b0 = np.sum(w * r["a33"], 0), np.sum(w * r["b33"], 0)
    a1, b1 = np.sum(w * x * r["a33"], 0), np.sum(w * x * r["b33"], 0)
    a2, b2 = np.sum(w * x ** 2 * r["a33"], 0), np.sum(w * x ** 2 * r["b33"], 0)
    u, w2 = speed, wes ** 2
    m, xg = body.mass_kg, body.x_g_m
    A = [[a0, -a1 - u / w2 * b0], [-a1 + u / w2 * b0, a2 + u ** 2 / w2 * a0]]
    B = [[b0, -b1 + u * a0], [-b1 - u * a0, b2 + u ** 2 / w2 * b0]]
    M = [[m, -m * xg], [-m * xg, m * (body.kyy_m ** 2 + xg ** 2)]]
    c35 = -rho_g * hull.waterplane_moment_m3
    C = [[rho_g * hull.waterplane_m2, c35],
         [c35, rho_g * hull.waterplane_inertia_l_m4
          + rho_g * hull.volume_m3 * (hull.z_b_m - body.z_g_m)]]
    return _impedance(A, B, M, C, wes)


def _sway_roll_yaw(hull: HullModel, body: RigidBody, r: dict, wes: NDArray, speed: float,
                   b44_extra: NDArray) -> NDArray:
    """3 x 3 impedance of sway-roll-yaw about O (module docstring)."""
    x = hull.sections.x_m[:, None, None]
    w = hull.weights_m[:, None, None]

    def moments(q: NDArray) -> tuple[NDArray, NDArray, NDArray]:
        return np.sum(w * q, 0), np.sum(w * x * q, 0), np.sum(w * x ** 2 * q, 0)

    a22, xa22, x2a22 = moments(r["a22"])
    b22, xb22, x2b22 = moments(r["b22"])
    a24, xa24, _ = moments(r["a24"])
    b24, xb24, _ = moments(r["b24"])
    a44, b44 = np.sum(w * r["a44"], 0), np.sum(w * r["b44"], 0) + b44_extra
    u, w2 = speed, wes ** 2
    A = [[a22, a24, xa22 + u / w2 * b22],
         [a24, a44, xa24 + u / w2 * b24],
         [xa22 - u / w2 * b22, xa24 - u / w2 * b24, x2a22 + u ** 2 / w2 * a22]]
    B = [[b22, b24, xb22 - u * a22],
         [b24, b44, xb24 - u * a24],
         [xb22 + u * a22, xb24 + u * a24, x2b22 + u ** 2 / w2 * b22]]
    m, xg, zg = body.mass_kg, body.x_g_m, body.z_g_m
    M = [[m, -m * zg, m * xg],
         [-m * zg, m * (body.kxx_m ** 2 + zg ** 2), 0.0],
         [m * xg, 0.0, m * (body.kzz_m ** 2 + xg ** 2)]]
    c44 = hull.rho_kg_m3 * hull.g_m_s2 * hull.volume_m3 * body.gm_t_m
    C = [[0.0, 0.0, 0.0], [0.0, c44, 0.0], [0.0, 0.0, 0.0]]
    return _impedance(A, B, M, C, wes)


def _impedance(A: list, B: list, M: list, C: list, wes: NDArray) -> NDArray:
    """-w^2 (M + A) + i w B + C as an array (omega, heading, n, n)."""
    n = len(A)
    z = np.empty(wes.shape + (n, n), dtype=complex)
    for i in range(n):
        for j in range(n):
            z[..., i, j] = -wes ** 2 * (M[i][j] + A[i][j]) + 1j * wes * B[i][j] + C[i][j]
    return z


def strip_raos(hull: HullModel, body: RigidBody, omega_rad_s: ArrayLike, k_rad_m: ArrayLike,
               heading_deg: ArrayLike, speed_m_s: float,
               roll_damping_extra_n_m_s: Union[float, ArrayLike] = 0.0) -> StripRaos:
    """Complex RAOs at G over absolute wave frequency x heading for one speed (STF 1970).

    omega_rad_s, k_rad_m: absolute wave frequency and the local wavenumber (same length; depth
    enters only through k). heading_deg: relative heading mu (180 head, 90 waves from port).
    roll_damping_extra_n_m_s: linear viscous roll damping [N m s/rad] added to the wave
    damping, a scalar or an array broadcastable to (omega, heading) (``roll_damping.py``).
    """
    return strip_rao_set(hull, body, omega_rad_s, k_rad_m, heading_deg, [speed_m_s],
                         [roll_damping_extra_n_m_s])[0]


def strip_rao_set(hull: HullModel, body: RigidBody, omega_rad_s: ArrayLike, k_rad_m: ArrayLike,
                  heading_deg: ArrayLike, speeds_m_s: ArrayLike,
                  roll_damping_extra_n_m_s: Optional[list] = None) -> list[StripRaos]:
    """``strip_raos`` for several speeds, sharing the speed-independent incident-wave parts.

    roll_damping_extra_n_m_s: one entry per speed (scalar or (omega, heading) array); None = 0.
    """
    omega = _as_1d("omega_rad_s", omega_rad_s)
    k = _as_1d("k_rad_m", k_rad_m)
    mu_deg = _as_1d("heading_deg", heading_deg)
    speeds = _as_1d("speeds_m_s", speeds_m_s)
    if k.shape != omega.shape:
        raise StripInputError(f"k_rad_m has {k.size} values, omega_rad_s {omega.size}: "
                              "give one wavenumber per frequency")
    for name, arr in (("omega_rad_s", omega), ("k_rad_m", k)):
        if np.any(arr <= 0):
            raise StripInputError(f"{name} = {show(arr[arr <= 0][0])}: must be > 0")
    bad = speeds[speeds < 0]
    if bad.size:
        raise StripInputError(f"speed_m_s = {show(bad[0])}: give a speed >= 0 through the water")
    shape = (omega.size, mu_deg.size)
    extras = [0.0] * speeds.size if roll_damping_extra_n_m_s is None \
        else list(roll_damping_extra_n_m_s)
    if len(extras) != speeds.size:
        raise StripInputError("roll_damping_extra_n_m_s needs one entry per speed")
    extras = [np.broadcast_to(np.asarray(e, dtype=float), shape) for e in extras]
    if any(np.any(~np.isfinite(e)) or np.any(e < 0) for e in extras):
        raise StripInputError("roll_damping_extra_n_m_s must be finite and >= 0")
    floor = OMEGA_E_FLOOR_FRACTION * math.sqrt(hull.g_m_s2 / hull.length_m)
    eta = [{n: np.empty(shape, dtype=complex) for n in "23456"} for _ in speeds]
    we_all = np.empty((speeds.size,) + shape)
    for lo in range(0, mu_deg.size, HEADING_CHUNK):
        sl = slice(lo, lo + HEADING_CHUNK)
        mu = np.deg2rad(mu_deg[sl])
        incident = _incident(hull, k, mu)
        for i, u in enumerate(speeds):
            we = omega[:, None] - k[:, None] * u * np.cos(mu)[None, :]
            we_all[i, :, sl] = we
            wa = np.maximum(np.abs(we), floor)
            wes = np.where(we < 0, -wa, wa)
            ip = _Interp(hull, wa)
            r = _radiation(hull, ip, wa)
            F2, F3, F4, F5, F6 = _exciting(hull, ip, k, mu, wes, omega, u, incident)
            hp = np.linalg.solve(_heave_pitch(hull, body, r, wes, u),
                                 np.stack([F3, F5], -1)[..., None])[..., 0]
            sry = np.linalg.solve(_sway_roll_yaw(hull, body, r, wes, u, extras[i][:, sl]),
                                  np.stack([F2, F4, F6], -1)[..., None])[..., 0]
            e = eta[i]
            e["3"][:, sl], e["5"][:, sl] = hp[..., 0], hp[..., 1]
            e["2"][:, sl], e["4"][:, sl], e["6"][:, sl] = sry[..., 0], sry[..., 1], sry[..., 2]
    xg, zg = body.x_g_m, body.z_g_m
    return [StripRaos(omega, mu_deg, float(u), we_all[i],
                      heave_m_m=e["3"] - xg * e["5"],
                      sway_m_m=e["2"] + xg * e["6"] - zg * e["4"],
                      roll_rad_m=e["4"], pitch_rad_m=e["5"], yaw_rad_m=e["6"],
                      x_g_m=xg, z_g_m=zg)
            for i, (u, e) in enumerate(zip(speeds, eta))]
