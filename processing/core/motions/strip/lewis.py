# SPDX-License-Identifier: GPL-2.0-or-later
"""2-D sectional added mass, damping and radiation potentials of Lewis-form sections by the
Ursell-Tasai multipole method (deep water), vectorised over sections and frequencies.

Lewis form (Lewis 1929; coefficients as in Journee & Adegeest 2003, "Theoretical manual of strip
theory program SEAWAY for Windows", TU Delft report 1370, ch. 3). With zeta = e^{i psi} on the
unit circle (psi in (0, pi) is the immersed contour) and the 2-D section coordinates
w = X + iY (X horizontal, Y downward, origin in the waterline at the centre plane):

    w = M_s (zeta + a1 / zeta + a3 / zeta^3)
    B/2 = M_s (1 + a1 + a3),  T = M_s (1 - a1 + a3),  H0 = B / (2T)
    sigma = A / (B T) = (pi/4) (1 - a1^2 - 3 a3^2) / ((1 + a3)^2 - a1^2)
    c1 = 3 + 4 sigma/pi + (1 - 4 sigma/pi) ((H0 - 1)/(H0 + 1))^2
    a3 = (-c1 + 3 + sqrt(9 - 2 c1)) / c1,   a1 = (H0 - 1)/(H0 + 1) (1 + a3)

A form is accepted when the map is conformal outside the unit circle (the roots of
zeta^4 - a1 zeta^2 - 3 a3 = 0 lie inside it) and the half contour stays on its side of the
centre plane and below the waterline; otherwise the area coefficient sigma is moved to the
nearest accepted value (reported in ``LewisForms.clipped``), as is usual with Lewis forms.

Multipole method (Ursell 1949, Q. J. Mech. Appl. Math. 2, 218-231 for the circle; Tasai 1959,
1961 for Lewis forms; the form used here is re-derived in these docstrings). Length unit M_s,
nu = omega^2 M_s / g, time factor exp(+i omega t), free surface condition
dphi/dY + nu phi = 0 on Y = 0. The radiation potential is a sum of complex potentials F with
phi = Re F, stream function psi_s = Im F:

* symmetric wave source at the origin (X >= 0; mirrored for X < 0), outgoing in
  combination with the regular wave:
      F_c = e^{i nu w} (E1(i nu w) + i pi),  F_r = pi e^{i nu w},  phi_src = Re F_c - i Re F_r
  (far field -i pi e^{-nu Y} e^{-i nu |X|}; E1 the exponential integral);
* antisymmetric wave dipole = d/dX of the source: F_d = i nu F_c - 1/w, F_rd = i nu F_r;
* wave-free multipoles satisfying the free surface condition exactly, m = 1..M:
      symmetric      zeta^{-2m} + i nu (-zeta^{-(2m-1)}/(2m-1) + a1 zeta^{-(2m+1)}/(2m+1)
                                         + 3 a3 zeta^{-(2m+3)}/(2m+3))
      antisymmetric  zeta^{-(2m+1)} + i nu (-zeta^{-2m}/(2m) + a1 zeta^{-(2m+2)}/(2m+2)
                                         + 3 a3 zeta^{-(2m+4)}/(2m+4))
  (from nu f'(r) Re F = Im F' on the real zeta axis, f the Lewis map).

The body condition is imposed on the stream function at collocation points of the half contour
in the least-squares sense: heave (unit downward velocity) psi_s = -X + const, sway (unit
velocity along +X) psi_s = Y + const, roll (unit angular velocity turning +X into +Y)
psi_s = -(X^2 + Y^2)/2 + const. Forces follow from the pressure p = -i omega rho phi on the
contour. Results are returned in ship axes (``strip/__init__``): X = y (port), Y = -z, so the
roll of the 2-D problem is minus the ship's roll and the sway-roll coupling changes sign.

Non-dimensional outputs: a_22, a_33 / (rho M_s^2); a_24 / (rho M_s^3); a_44 / (rho M_s^4);
damping b / (rho omega M_s^n) with the same n; potentials per unit velocity / M_s (translations)
and per unit angular velocity / M_s^2 (roll).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from . import StripInputError
from ...validation import show

NU_GRID = np.geomspace(1e-4, 30.0, 100)
N_MULTIPOLES = 16
N_COLLOCATION = 40
N_QUAD_HALF = 16
_SIGMA_SCAN = np.linspace(0.05, 1.35, 521)


@dataclass(frozen=True)
class LewisForms:
    """Lewis parameters per section; empty sections (zero beam or draught) have scale 0."""

    scale_m: NDArray[np.float64]
    a1: NDArray[np.float64]
    a3: NDArray[np.float64]
    area_coeff: NDArray[np.float64]
    clipped: NDArray[np.bool_]


def _lewis_a1_a3(h0: NDArray, sigma: NDArray) -> tuple[NDArray, NDArray]:
    """a1, a3 from H0 = B/(2T) and sigma = A/(BT) (Lewis 1929; module docstring)."""
    r = (h0 - 1.0) / (h0 + 1.0)
    c1 = 3.0 + 4.0 * sigma / np.pi + (1.0 - 4.0 * sigma / np.pi) * r ** 2
    a3 = (-c1 + 3.0 + np.sqrt(np.maximum(9.0 - 2.0 * c1, 0.0))) / c1
    return r * (1.0 + a3), a3


def _lewis_valid(a1: NDArray, a3: NDArray) -> NDArray[np.bool_]:
    """Conformal outside the unit circle and a simple half contour (module docstring)."""
    disc = np.sqrt((a1 ** 2 + 12.0 * a3).astype(complex))
    roots = np.stack([(a1 + disc) / 2, (a1 - disc) / 2])          # values of zeta^2
    conformal = np.all(np.abs(roots) < 0.98, axis=0)
    psi = np.linspace(0.0, np.pi / 2, 91)
    x = (1 + a1[..., None]) * np.cos(psi) + a3[..., None] * np.cos(3 * psi)
    y = (1 - a1[..., None]) * np.sin(psi) - a3[..., None] * np.sin(3 * psi)
    simple = np.all(x >= -1e-9, axis=-1) & np.all(y >= -1e-9, axis=-1)
    return conformal & simple


def lewis_forms(beam_m: ArrayLike, draught_m: ArrayLike, area_m2: ArrayLike) -> LewisForms:
    """Lewis forms of sections (beam B, draught T, area A), sigma clipped to the valid range."""
    b = np.atleast_1d(np.asarray(beam_m, dtype=float))
    d = np.atleast_1d(np.asarray(draught_m, dtype=float))
    a = np.atleast_1d(np.asarray(area_m2, dtype=float))
    for name, v in (("beam_m", b), ("draught_m", d), ("area_m2", a)):
        if not np.all(np.isfinite(v)) or np.any(v < 0):
            bad = v[~np.isfinite(v) | (v < 0)][0]
            raise StripInputError(f"{name} = {show(bad)}: section sizes must be finite and >= 0")
    empty = (b <= 0) | (d <= 0) | (a <= 0)
    bs, ds = np.where(empty, 1.0, b), np.where(empty, 1.0, d)
    h0 = bs / (2 * ds)
    sigma = np.where(empty, np.pi / 4, a / (bs * ds))
    a1, a3 = _lewis_a1_a3(h0, sigma)
    ok = _lewis_valid(a1, a3) | empty
    if not np.all(ok):
        grid_a1, grid_a3 = _lewis_a1_a3(h0[~ok, None], _SIGMA_SCAN[None, :])
        valid = _lewis_valid(grid_a1, grid_a3)
        dist = np.where(valid, np.abs(_SIGMA_SCAN[None, :] - sigma[~ok, None]), np.inf)
        if np.any(~np.isfinite(dist.min(axis=1))):
            raise StripInputError(f"no Lewis form exists for beam/draught ratio "
                                  f"{(2 * h0[~ok])[~np.isfinite(dist.min(axis=1))][0]:g}")
        sigma = sigma.copy()
        sigma[~ok] = _SIGMA_SCAN[np.argmin(dist, axis=1)]
        a1, a3 = _lewis_a1_a3(h0, sigma)
    scale = np.where(empty, 0.0, bs / (2 * (1 + a1 + a3)))
    return LewisForms(scale, np.where(empty, 0.0, a1), np.where(empty, 0.0, a3),
                      np.where(empty, 0.0, sigma), ~ok)


@dataclass(frozen=True)
class SectionCoefficients:
    """Non-dimensional 2-D coefficients on ``nu`` (module docstring), ship axes and signs.

    Coefficient arrays have shape (sections, nu); potentials (sections, nu, nodes) are the
    ship-axis radiation potentials per unit velocity (heave upward, sway to port, roll port
    up) at the contour nodes ``y_hat``, ``z_hat`` (units of M_s, z <= 0); ``wy``/``wz`` are
    quadrature weights with sum(f * wy) = integral of f dy along the contour from the
    starboard waterline to the port waterline (likewise dz).
    """

    nu: NDArray[np.float64]
    a22: NDArray[np.float64]
    b22: NDArray[np.float64]
    a33: NDArray[np.float64]
    b33: NDArray[np.float64]
    a44: NDArray[np.float64]
    b44: NDArray[np.float64]
    a24: NDArray[np.float64]
    b24: NDArray[np.float64]
    a42: NDArray[np.float64]
    phi2: NDArray[np.complex128]
    phi3: NDArray[np.complex128]
    phi4: NDArray[np.complex128]
    y_hat: NDArray[np.float64]
    z_hat: NDArray[np.float64]
    wy: NDArray[np.float64]
    wz: NDArray[np.float64]
    far2: NDArray[np.float64]
    far3: NDArray[np.float64]
    far4: NDArray[np.float64]


def _map(a1: NDArray, a3: NDArray, psi: NDArray) -> tuple[NDArray, NDArray]:
    """w(psi) and dw/dpsi of the unit-scale Lewis map on the unit circle."""
    z = np.exp(1j * psi)
    w = z + a1 / z + a3 / z ** 3
    dw = 1j * z * (1 - a1 / z ** 2 - 3 * a3 / z ** 4)
    return w, dw


def _e1_upper(z: NDArray) -> NDArray:
    """E1(z) continuous from Im z > 0 onto the negative real axis (E1(-x + i0) = -Ei(x) - i pi)."""
    from scipy.special import exp1  # only when a profile's RAO set is built (then cached)

    z = np.where((z.imag == 0) & (z.real < 0), z + 1e-300j, z)
    return exp1(z)


def _wave_terms(w: NDArray, nu: NDArray) -> tuple[NDArray, NDArray, NDArray, NDArray]:
    """Source F_c, regular F_r and their X-derivatives F_d, F_rd at w with X >= 0."""
    w = np.abs(w.real) + 1j * w.imag
    arg = 1j * nu * w
    ez = np.exp(arg)
    fc = ez * (_e1_upper(arg) + 1j * np.pi)
    fr = np.pi * ez
    return fc, fr, 1j * nu * fc - 1.0 / w, 1j * nu * fr


def _multipoles(a1: NDArray, a3: NDArray, nu: NDArray, psi: NDArray, sym: bool,
                n_mp: int) -> NDArray:
    """Wave-free multipoles F_m at psi; shape (..., len(psi), n_mp)."""
    z = np.exp(1j * psi)[..., None]
    m = np.arange(1, n_mp + 1)
    p = 2 * m if sym else 2 * m + 1
    a1, a3, nu = a1[..., None], a3[..., None], nu[..., None]
    return (z ** -p + 1j * nu * (-z ** -(p - 1) / (p - 1) + a1 * z ** -(p + 1) / (p + 1)
                                 + 3 * a3 * z ** -(p + 3) / (p + 3)))


def _cholesky_solve(h: NDArray, rhs: NDArray) -> NDArray:
    """Solve h x = rhs for a stack of small Hermitian positive-definite h (..., n, n).

    Plain vectorised Cholesky over the stack: thousands of 20 x 20 systems are solved without
    LAPACK's per-matrix calls (whose threading dominated the cost on a loaded 2-core machine).
    """
    n = h.shape[-1]
    low = np.zeros_like(h)
    for j in range(n):
        d = h[..., j, j].real - np.sum(np.abs(low[..., j, :j]) ** 2, axis=-1)
        low[..., j, j] = np.sqrt(np.maximum(d, 1e-300))
        if j + 1 < n:
            s = h[..., j + 1:, j] - np.einsum("...ik,...k->...i", low[..., j + 1:, :j],
                                              np.conj(low[..., j, :j]))
            low[..., j + 1:, j] = s / low[..., j, j][..., None]
    y = np.zeros_like(rhs)
    for j in range(n):
        y[..., j, :] = (rhs[..., j, :] - np.einsum("...k,...km->...m", low[..., j, :j],
                                                   y[..., :j, :])) / low[..., j, j][..., None]
    x = np.zeros_like(rhs)
    for j in range(n - 1, -1, -1):
        x[..., j, :] = (y[..., j, :] - np.einsum("...k,...km->...m",
                                                 np.conj(low[..., j + 1:, j]),
                                                 x[..., j + 1:, :])) / low[..., j, j][..., None]
    return x


def _lstsq(a: NDArray, rhs: NDArray) -> NDArray:
    """Batched least squares a x = rhs (rhs (..., n, k)) by column-scaled normal equations."""
    scale = np.sqrt(np.sum(np.abs(a) ** 2, axis=-2, keepdims=True))
    a = a / scale
    ah = np.conj(a)
    normal = np.einsum("...ki,...kj->...ij", ah, a) + 1e-13 * np.eye(a.shape[-1])
    x = _cholesky_solve(normal, np.einsum("...ki,...km->...im", ah, rhs))
    return x / np.swapaxes(scale, -1, -2)


def _solve_modes(a1: NDArray, a3: NDArray, nu: NDArray, n_mp: int, n_col: int,
                 psi_q: NDArray) -> dict:
    """Heave, sway and roll 2-D potentials (2-D axes) at psi_q and far-field amplitudes."""
    psi_c = (np.arange(n_col) + 0.5) / n_col * (np.pi / 2)
    psi_k = np.array([np.pi / 2])
    A1, A3, NU = a1[:, None, None], a3[:, None, None], nu[None, :, None]
    wc, _ = _map(A1, A3, psi_c)
    fc, fr, fd, frd = _wave_terms(wc, NU)
    fck, frk, _, _ = _wave_terms(_map(A1, A3, psi_k)[0], NU)
    src = (fc.imag - fck.imag) - 1j * (fr.imag - frk.imag)
    mp_s = _multipoles(A1, A3, NU, psi_c, True, n_mp).imag
    heave = _lstsq(np.concatenate([src[..., None], mp_s], -1),
                   np.broadcast_to(-wc.real, src.shape)[..., None])[..., 0]
    dip = fd.imag - 1j * frd.imag
    mp_a = _multipoles(A1, A3, NU, psi_c, False, n_mp).imag
    mat = np.concatenate([dip[..., None], mp_a, np.ones_like(dip)[..., None]], -1)
    rhs = np.stack(np.broadcast_arrays(wc.imag, -0.5 * np.abs(wc) ** 2 + 0 * dip.real), -1)
    both = _lstsq(mat, rhs.astype(complex))
    sway, roll = both[..., 0], both[..., 1]
    wq, _ = _map(A1, A3, psi_q)
    qc, qr, qd, qrd = _wave_terms(wq, NU)
    pot_s = np.concatenate([(qc.real - 1j * qr.real)[..., None],
                            _multipoles(A1, A3, NU, psi_q, True, n_mp).real], -1)
    pot_a = np.concatenate([(qd.real - 1j * qrd.real)[..., None],
                            _multipoles(A1, A3, NU, psi_q, False, n_mp).real], -1)
    phi3 = np.einsum("svqm,svm->svq", pot_s, heave)
    phi2 = np.einsum("svqm,svm->svq", pot_a, sway[..., :-1])
    phi4 = np.einsum("svqm,svm->svq", pot_a, roll[..., :-1])
    return dict(phi3=phi3, phi2=phi2, phi4=phi4,
                far3=np.pi * np.abs(heave[..., 0]),
                far2=np.pi * nu[None, :] * np.abs(sway[..., 0]),
                far4=np.pi * nu[None, :] * np.abs(roll[..., 0]))


def section_coefficients(forms: LewisForms, nu: ArrayLike = NU_GRID,
                         n_multipoles: int = N_MULTIPOLES, n_collocation: int = N_COLLOCATION,
                         n_quad_half: int = N_QUAD_HALF) -> SectionCoefficients:
    """Non-dimensional 2-D added mass, damping and potentials of Lewis sections on ``nu``.

    Forces from the contour pressure (2-D axes X, Y down; module docstring), contour traversed
    from X = -B/2 to +B/2, integral I[f, U] = -sum_q w_q f(psi_q) U'(psi_q):
        heave   F_Y = -I[p, X];  sway F_X = I[p, Y];  roll M = -I[p X, X] - I[p Y, Y]
    with p = -i omega phi and F = -(i omega a + b) for unit velocity.
    """
    nu = np.asarray(nu, dtype=float)
    if nu.ndim != 1 or np.any(~np.isfinite(nu)) or np.any(nu <= 0):
        raise StripInputError("nu grid must be a 1-D array of positive finite values")
    gx, gw = np.polynomial.legendre.leggauss(n_quad_half)
    psi_q = (gx + 1) * np.pi / 4
    wq = gw * np.pi / 4
    r = _solve_modes(forms.a1, forms.a3, nu, n_multipoles, n_collocation, psi_q)
    psi_all = np.concatenate([psi_q, np.pi - psi_q])
    w_all = np.concatenate([wq, wq])
    w, dw = _map(forms.a1[:, None], forms.a3[:, None], psi_all[None, :])
    X, Y, dX, dY = w.real, w.imag, dw.real, dw.imag

    def full(phi: NDArray, sym: bool) -> NDArray:
        return np.concatenate([phi, phi if sym else -phi], axis=-1)

    def integral(f: NDArray, du: NDArray) -> NDArray:
        return -np.sum(w_all * f * du[:, None, :], axis=-1)

    p3, p2, p4 = full(r["phi3"], True), full(r["phi2"], False), full(r["phi4"], False)
    i3 = integral(p3, dX)
    i2 = integral(p2, dY)
    i4 = integral(p4 * X[:, None, :], dX) + integral(p4 * Y[:, None, :], dY)
    i24 = integral(p4, dY)
    i42 = integral(p2 * X[:, None, :], dX) + integral(p2 * Y[:, None, :], dY)
    return SectionCoefficients(
        nu=nu, a22=i2.real, b22=-i2.imag, a33=-i3.real, b33=i3.imag,
        a44=-i4.real, b44=i4.imag,
        # ship axes: roll eta4 = -Omega of the 2-D problem -> coupling changes sign
        a24=-i24.real, b24=i24.imag, a42=i42.real,
        phi2=p2, phi3=-p3, phi4=-p4,
        y_hat=X, z_hat=-Y, wy=-w_all * dX, wz=w_all * dY,
        far2=r["far2"], far3=r["far3"], far4=r["far4"])
