# SPDX-License-Identifier: GPL-2.0-or-later
"""Spectral motion response of a vessel in short- or long-crested seas, in the encounter domain.

For each sample (position/time on a route) and each sea-state partition (wind sea, swells) with
Hs, Tp, direction, JONSWAP gamma and cos-2s spreading s, the response moments of a motion R with
transfer function H_R(omega, mu) are integrated over ABSOLUTE wave frequency and direction
(Lewis (ed.) 1989, PNA vol. III ch. 8; Price & Bishop 1974, "Probabilistic Theory of Ship
Dynamics"; never through a Jacobian, which is singular in following seas)::

    m_n^R = sum_ij |omega_e,ij|**n |H_R(omega_i, mu_j)|**2 S(omega_i) D(theta_j) dw_i dtheta_j
    omega_e = omega - k U cos mu           (k from the Airy dispersion relation at the depth)
    sigma_R = sqrt(m0),  Tz,e = 2 pi sqrt(m0/m2),  significant amplitude = 2 sigma_R

Variances of the partitions add (linear superposition of independent seas).

Two kinds of transfer model. A COMPLEX model (``transfer.complex_motions``, the strip theory of
:mod:`.strip_transfer`) gives heave, pitch, roll, sway and yaw with their phases at O (midships,
waterline; x forward, y to starboard, z up; roll positive lifting the starboard side, pitch bow
down, sway to starboard, yaw bow to starboard). The moment array then has 12 rows: the auto
terms of heave, pitch, roll, wave, sway, yaw and the cross terms Re(a conj(b)) of (heave,
pitch), (heave, roll), (pitch, roll), (sway, yaw), (sway, roll), (yaw, roll) (:data:`ROWS_COMPLEX`),
and a station (x, y, z) gets, with its complex motions (Lewis (ed.) 1989, PNA vol. III ch. 8,
rigid-body kinematics, small angles)::

    vertical displacement  V = heave - x pitch + y roll
    lateral displacement   Y = sway + x yaw - z roll
    lateral specific force f = -omega_e**2 Y + g roll          (gravity component g*roll)
    |V|**2 = hh + x**2 pp + y**2 rr - 2x hp + 2y hr - 2xy pr
    |f|**2 = omega_e**4 |Y|**2 - 2 g omega_e**2 Re(Y conj(roll)) + g**2 rr

each a linear map of the moments (so partitions and tables still add up linearly).
A MAGNITUDE model (the closed form, RAO tables) keeps the 4-row path described next, unchanged.

Station motions of a magnitude model, ship axes x forward, y to starboard, z up from the
waterline (roll and pitch axes taken through midships on the waterline; sway, surge and yaw
are not modelled, their RMS values are NaN):

* vertical displacement amplitude |z(x, y)| = sqrt(heave**2 + x**2 pitch**2 + y**2 roll**2): we
  ASSUME heave, pitch and roll in quadrature (phase-incoherent sum). For heave and pitch this
  follows from the closed-form model's structure (elevation vs slope forcing, methods in
  Jensen, Mansour & Olsen 2004) and holds for lambda/L >~ 1.4; in shorter waves it is an
  estimate between |heave - x pitch| and heave + x pitch.
  Vertical acceleration spectrum: omega_e**4 |z|**2 S.
* lateral specific force amplitude (g + omega_e**2 z) |roll| (gravity component g*phi plus the
  roll angular acceleration times the height z; both in phase; common practice, no source).
* ISO 2631-1:1997 Wf-weighted vertical acceleration: |Wf(|omega_e|/2pi)|**2 inside the integral.
* mean encounter frequency of the vertical acceleration sqrt(m2/m0) (for MSI).

Discretisation: for each partition a log-spaced frequency grid scaled with its own peak
frequency (omega = x 2pi/Tp, x from spectra.frequency_grid_rad_s over 0.5..8 omega_p, n_freq
points; the JONSWAP shape is normalised numerically so that 4 sqrt(m0) = Hs on the grid) and a
uniform direction grid of n_dir directions with cos-2s weights (spectra.direction_grid).
Because the discretisation scales with Tp, per-unit-Hs moments depend only on (Tp, mu, U,
depth, gamma, s): that is what the response tables of :mod:`.tables` store.

Calm samples (all Hs = 0) give exactly zero RMS values; their periods are those of the
unit-height sea of the same shapes. A motion that is identically zero (e.g. pitch in
long-crested beam seas) reports the mean encounter period of the waves as its period.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, fields
from typing import Any, Optional, Sequence, Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..comfort.indices import _wf2_unchecked
from ..waves.dispersion import wavenumber_rad_m
from ..flags import SampleFlag
from ..waves.encounter import cos_deg, relative_heading_deg
from ..waves.spectra import FrequencyGrid, direction_grid, frequency_grid_rad_s, jonswap_s_m2_s_rad
from ..plausibility import HS_M, TP_S, check_range
from ..units import DEG_PER_RAD, G_STANDARD_M_S2, FloatArray
from ..validation import SeawayInputError, show
from ..validation import as_float_array, require_nonnegative, require_positive
from ..vessel.profile import Station

__all__ = [
    "ROWS",
    "chunk_moments",
    "wave_energy",
    "ROWS_COMPLEX",
    "WEIGHTS",
    "UnitMoments",
    "MotionResponse",
    "unit_moments",
    "station_quantities",
    "combine_quantities",
    "validity_flags",
    "motion_response",
    "prepare_sea",
    "OUTSIDE_COVERAGE_LIMIT",
    "RESPONSE_ARRAYS",
    "concat_responses",
]

ROWS: Tuple[str, ...] = ("heave", "pitch", "roll", "wave")
"""Rows of the moment array: heave [m], pitch [rad], roll [rad], wave elevation [m]."""
ROWS_COMPLEX: Tuple[str, ...] = ROWS + ("sway", "yaw", "heave.pitch", "heave.roll", "pitch.roll",
                                        "sway.yaw", "sway.roll", "yaw.roll")
"""Rows for a complex transfer model: auto terms, then cross terms Re(a conj(b))."""
WEIGHTS: Tuple[str, ...] = ("1", "we2", "we4", "we6", "we4_wf2")
"""Columns: integrand factors |omega_e|**0, **2, **4, **6 and omega_e**4 |Wf|**2."""
OUTSIDE_COVERAGE_LIMIT: float = 0.01
"""Share of wave variance outside a transfer table's frequency range above which a sample is
flagged OUTSIDE_VALIDITY (our own choice)."""
_CHUNK_ELEMENTS = 150_000


@dataclass(frozen=True)
class UnitMoments:
    """Response moments per unit Hs**2 for n samples and p partitions.

    ``m`` (n, p, R, 5): rows :data:`ROWS` (R = 4) or :data:`ROWS_COMPLEX` (R = 12), columns :data:`WEIGHTS` (units: row unit squared
    times (rad/s)**n per m**2 of Hs**2); ``outside_fraction`` (n, p): share of the wave variance
    at frequencies the transfer model does not cover (0 for the closed form).
    """

    m: FloatArray
    outside_fraction: FloatArray


@dataclass(frozen=True)
class MotionResponse:
    """Motion statistics for n samples at ns stations (encounter domain, RMS values).

    (n,) arrays: heave_rms_m, pitch_rms_deg, roll_rms_deg, heave_tz_s, pitch_tz_s, roll_tz_s
    (mean zero-crossing encounter periods), flags (int64 SampleFlag mask).
    (n, ns) arrays: vacc_rms_m_s2, vacc_omega_rad_s (sqrt(m2/m0) of the vertical
    acceleration), lacc_rms_m_s2 (lateral specific force), vacc_wf_rms_m_s2 (ISO 2631-1 Wf).
    """

    station_names: Tuple[str, ...]
    heave_rms_m: FloatArray
    pitch_rms_deg: FloatArray
    roll_rms_deg: FloatArray
    heave_tz_s: FloatArray
    pitch_tz_s: FloatArray
    roll_tz_s: FloatArray
    vacc_rms_m_s2: FloatArray
    vacc_omega_rad_s: FloatArray
    lacc_rms_m_s2: FloatArray
    vacc_wf_rms_m_s2: FloatArray
    flags: NDArray[np.int64]
    sway_rms_m: FloatArray
    yaw_rms_deg: FloatArray
    method: str = "exact"

    @property
    def heave_sig_m(self) -> FloatArray:
        """Significant heave amplitude 2 sigma [m] (Rayleigh amplitudes, narrow band)."""
        return 2.0 * self.heave_rms_m

    @property
    def pitch_sig_deg(self) -> FloatArray:
        return 2.0 * self.pitch_rms_deg

    @property
    def roll_sig_deg(self) -> FloatArray:
        return 2.0 * self.roll_rms_deg

    def station_index(self, name: str) -> int:
        if name not in self.station_names:
            raise SeawayInputError(
                f"station {show(name)} unknown; known stations: {', '.join(self.station_names)}"
            )
        return self.station_names.index(name)


RESPONSE_ARRAYS: Tuple[str, ...] = tuple(
    f.name for f in fields(MotionResponse) if f.name not in ("station_names", "method"))
"""The per-sample array fields of :class:`MotionResponse` (what a merge or concatenation copies)."""


def concat_responses(parts: Sequence[MotionResponse]) -> MotionResponse:
    """Responses of consecutive sample blocks joined into one (same stations and method)."""
    kw = {name: np.concatenate([getattr(p, name) for p in parts], axis=0) for name in RESPONSE_ARRAYS}
    return MotionResponse(station_names=parts[0].station_names, method=parts[0].method, **kw)


def prepare_sea(
    hs_m: ArrayLike, tp_s: ArrayLike, wave_from_deg: ArrayLike, n: Optional[int] = None
) -> Tuple[FloatArray, FloatArray, FloatArray]:
    """Validate partition arrays and return them as (n, p) float arrays.

    1-D input (n,) means one partition; scalars broadcast. hs >= 0 (0 = absent) and tp within
    their plausibility ranges (:mod:`..plausibility`), directions finite. Errors name the
    argument and the first bad value.
    """
    hs = check_range(HS_M, "hs_m", require_nonnegative("hs_m", hs_m))
    tp = check_range(TP_S, "tp_s", require_positive("tp_s", tp_s))
    wf = as_float_array("wave_from_deg", wave_from_deg)
    arrs = [np.atleast_1d(a) for a in (hs, tp, wf)]
    arrs = [a[:, None] if a.ndim == 1 else a for a in arrs]
    if any(a.ndim != 2 for a in arrs):
        raise SeawayInputError(
            f"hs_m, tp_s, wave_from_deg must be (n,) or (n, p); got shapes {hs.shape}, {tp.shape}, {wf.shape}"
        )
    try:
        shape = np.broadcast_shapes(*(a.shape for a in arrs))
    except ValueError as exc:
        raise SeawayInputError(
            f"hs_m {hs.shape}, tp_s {tp.shape}, wave_from_deg {wf.shape} do not broadcast"
        ) from exc
    if n is not None and shape[0] not in (1, n):
        raise SeawayInputError(f"sea-state arrays have {shape[0]} samples, expected {n}")
    shape = (n if n is not None else shape[0], shape[1])
    return tuple(np.ascontiguousarray(np.broadcast_to(a, shape), dtype=float) for a in arrs)  # type: ignore[return-value]


def _per_partition(name: str, v: ArrayLike, p: int, low: float) -> FloatArray:
    a = as_float_array(name, v)
    a = np.broadcast_to(a.reshape(-1) if a.ndim else a, (p,)) if a.size in (1, p) else None
    if a is None:
        raise SeawayInputError(f"{name} must be a scalar or have one value per partition ({p}), got {np.shape(v)}")
    if np.any(a < low):
        raise SeawayInputError(f"{name} must be >= {low:g}, got {show(a[a < low][0])}")
    return np.array(a, dtype=float)


def unit_moments(
    transfer: Any,
    tp_s: FloatArray,
    rel_heading_deg: FloatArray,
    speed_m_s: FloatArray,
    depth_m: Optional[FloatArray],
    gamma: FloatArray,
    spread_s: FloatArray,
    *,
    long_crested: bool = False,
    n_freq: int = 48,
    n_dir: int = 24,
    g_m_s2: float = G_STANDARD_M_S2,
    frequency_grid: Optional[FrequencyGrid] = None,
    normalise_spectrum: bool = True,
) -> UnitMoments:
    """Moments per unit Hs**2 (module docstring) for validated inputs.

    tp_s, rel_heading_deg (n, p) (mean ITTC heading of each partition); speed_m_s (n,);
    depth_m (n,) or None; gamma, spread_s (p,). ``frequency_grid`` (absolute omega with
    weights, shared by all samples) replaces the Tp-scaled grid, e.g. to reproduce a published
    uniform-grid integration; ``normalise_spectrum=False`` then keeps DNV's A_gamma.
    """
    n, p = tp_s.shape
    # direction grids (theta nodes are the same for every s: uniform over [-pi, pi))
    dgs = [direction_grid(n_dir, float(s), long_crested) for s in spread_s]
    theta_deg = dgs[0].theta_rel_rad * DEG_PER_RAD  # (nd,)
    wd = np.stack([d.weights for d in dgs])  # (p, nd)
    energy = wave_energy(gamma, n_freq, frequency_grid, normalise_spectrum)
    rows = 12 if getattr(transfer, "complex_motions", False) else 4
    m_out = np.empty((n, p, rows, 5))
    outside = np.zeros((n, p))
    n_f = n_freq if frequency_grid is None else frequency_grid.omega_rad_s.size
    chunk = max(1, _CHUNK_ELEMENTS // (p * n_f * theta_deg.size))
    # integrand buffers reused by every chunk (fresh large arrays per chunk cost page faults)
    buf = np.empty((rows + 5, min(n, chunk), p, n_f, theta_deg.size))
    for a in range(0, n, chunk):
        b = min(n, a + chunk)
        omega, e_f = energy(tp_s[a:b])
        mu = rel_heading_deg[a:b, :, None, None] + theta_deg[None, None, None, :]  # (c, p, 1, nd)
        depth = None if depth_m is None else depth_m[a:b, None, None]
        m_out[a:b] = chunk_moments(transfer, omega, e_f, wd, mu, speed_m_s[a:b], depth, g_m_s2, buf[:, :b - a])
        cov = transfer.covered(omega) if hasattr(transfer, "covered") else None
        if cov is not None:
            tot = e_f.sum(axis=-1)
            out = np.where(cov, 0.0, e_f).sum(axis=-1)
            outside[a:b] = np.where(tot > 0, out / np.where(tot > 0, tot, 1.0), 0.0)
    return UnitMoments(m=m_out, outside_fraction=outside)


def wave_energy(gamma: FloatArray, n_freq: int, frequency_grid: Optional[FrequencyGrid],
                 normalise_spectrum: bool) -> Any:
    """A function tp (c, p) -> (omega, S d omega) (c, p, nf) of the unit-Hs JONSWAP sea.

    Default: the log grid scaled with each partition's peak frequency (the spectrum values on
    it are independent of Tp, computed once); else the shared absolute ``frequency_grid``.
    """
    if frequency_grid is None:
        xg = frequency_grid_rad_s(2.0 * math.pi, 2.0 * math.pi, n_freq)  # omega_p = 1
        x, wx = xg.omega_rad_s, xg.weights_rad_s
        s_t = jonswap_s_m2_s_rad(x, 1.0, 2.0 * math.pi, gamma, normalise_weights=wx if normalise_spectrum else None)
        e_f_all = (s_t * wx)[None, :, :]  # (1, p, nf): S d omega, independent of Tp

        def scaled(tp: FloatArray) -> Tuple[FloatArray, FloatArray]:
            omega = x[None, None, :] * (2.0 * math.pi / tp)[:, :, None]  # (c, p, nf)
            return omega, np.broadcast_to(e_f_all, omega.shape)
        return scaled
    om_abs, w_abs = frequency_grid.omega_rad_s, frequency_grid.weights_rad_s

    def shared(tp: FloatArray) -> Tuple[FloatArray, FloatArray]:
        s_abs = jonswap_s_m2_s_rad(om_abs, 1.0, tp, gamma[None, :],
                                   normalise_weights=w_abs if normalise_spectrum else None)
        return np.broadcast_to(om_abs, tp.shape + (om_abs.size,)), s_abs * w_abs
    return shared


def chunk_moments(transfer: Any, omega: FloatArray, e_f: FloatArray, wd: FloatArray, mu: FloatArray,
                   speed_m_s: FloatArray, depth: Optional[FloatArray], g_m_s2: float, buf: FloatArray) -> FloatArray:
    """Moments (c, p, R, 5) of one chunk (module docstring): omega, e_f (c, p, nf) absolute
    frequencies and wave energy S d omega, wd (p, nd) direction weights, mu (c, p, 1, nd);
    ``buf`` (R + 5, c, p, nf, nd) scratch space for the integrand factors."""
    c, p = omega.shape[:2]
    k = wavenumber_rad_m(omega, depth, g_m_s2=g_m_s2)  # (c, p, nf)
    cmu = cos_deg(mu)
    om4, k4 = omega[..., None], k[..., None]
    we = om4 - k4 * speed_m_s[:, None, None, None] * cmu  # (c, p, nf, nd)
    e = e_f[..., None] * wd[None, :, None, :]  # (c, p, nf, nd)
    rows = buf.shape[0] - 5
    q, w = buf[:rows], buf[rows:]
    if rows == 12:
        _complex_rows(transfer.evaluate_parts(om4, mu, speed_m_s[:, None, None, None]), e, q)
    else:
        smu = np.abs(cos_deg(mu - 90.0))
        tr = transfer.evaluate_grid(om4, k4, mu, cmu, smu, we)
        q[0] = tr.heave_m_per_m**2 * e
        q[1] = tr.pitch_rad_per_m**2 * e
        q[2] = tr.roll_rad_per_m**2 * e
        q[3] = e
    we2 = we * we
    we4 = we2 * we2
    w[0] = 1.0
    w[1] = we2
    w[2] = we4
    w[3] = we4 * we2
    w[4] = we4 * _wf2_unchecked(np.abs(we))
    qf = q.reshape(rows, c * p, -1).transpose(1, 0, 2)  # (cp, R, F)
    wf = w.reshape(5, c * p, -1).transpose(1, 2, 0)  # (cp, F, 5)
    return np.matmul(qf, wf).reshape(c, p, rows, 5)


_CROSS = ((0, 1), (0, 2), (1, 2), (3, 4), (3, 2), (4, 2))
"""Cross terms of :data:`ROWS_COMPLEX` as index pairs into (heave, pitch, roll, sway, yaw)."""


def _complex_rows(parts: FloatArray, e: FloatArray, q: FloatArray) -> None:
    """The 12 rows of :data:`ROWS_COMPLEX` times the wave energy e, written into q; ``parts``
    (10, ...) real and imaginary parts of heave, pitch, roll, sway, yaw
    (:meth:`.strip_transfer.StripTransfer.evaluate_parts`)."""
    re, im = parts[0::2], parts[1::2]  # modes heave, pitch, roll, sway, yaw
    for i, r in ((0, 0), (1, 1), (2, 2), (4, 3), (5, 4)):
        np.multiply(re[r] * re[r] + im[r] * im[r], e, out=q[i])
    q[3] = e
    for i, (a, b) in enumerate(_CROSS):
        np.multiply(re[a] * re[b] + im[a] * im[b], e, out=q[6 + i])


def _ratio_period(m0: FloatArray, m2: FloatArray, fb0: FloatArray, fb2: FloatArray) -> FloatArray:
    """2 pi sqrt(m0/m2), falling back to (fb0, fb2) where m0 or m2 is 0."""
    ok = (m0 > 0) & (m2 > 0)
    a0 = np.where(ok, m0, fb0)
    a2 = np.where(ok, m2, fb2)
    return 2.0 * math.pi * np.sqrt(a0 / np.where(a2 > 0, a2, 1.0))


N_BASE = 8
"""Leading columns of the station-quantity array: m0, m2 of heave, pitch, roll, wave (a
complex model adds m0, m2 of sway and yaw: N_BASE + 4 columns)."""


def station_quantities(m: FloatArray, stations: Sequence[Station], g_m_s2: float = G_STANDARD_M_S2) -> FloatArray:
    """Linear map of moments (..., R, 5) to the quantities the statistics need.

    Columns: m0, m2 of heave, pitch, roll and wave elevation (and of sway and yaw when R = 12);
    then per station m0 and m2 of the vertical acceleration, m0 of the Wf-weighted vertical
    acceleration and m0 of the lateral specific force (module docstring). Linear in ``m``, so
    partitions may be summed before or after this map and tables may interpolate its output.
    """
    if m.shape[-2] == len(ROWS_COMPLEX):
        return _complex_station_quantities(m, stations, g_m_s2)
    cols = [m[..., 0, 0], m[..., 0, 1], m[..., 1, 0], m[..., 1, 1],
            m[..., 2, 0], m[..., 2, 1], m[..., 3, 0], m[..., 3, 1]]
    g = g_m_s2
    for st in stations:
        x2, y2, z = st.x_m**2, st.y_m**2, st.z_m
        cols.append(m[..., 0, 2] + x2 * m[..., 1, 2] + y2 * m[..., 2, 2])
        cols.append(m[..., 0, 3] + x2 * m[..., 1, 3] + y2 * m[..., 2, 3])
        cols.append(m[..., 0, 4] + x2 * m[..., 1, 4] + y2 * m[..., 2, 4])
        cols.append(g * g * m[..., 2, 0] + 2.0 * g * z * m[..., 2, 1] + z * z * m[..., 2, 2])
    return np.stack(cols, axis=-1)


def _complex_station_quantities(m: FloatArray, stations: Sequence[Station], g: float) -> FloatArray:
    """:func:`station_quantities` for the 12 rows of :data:`ROWS_COMPLEX` (module docstring:
    |V|**2 and |f|**2 from auto and cross moments)."""
    cols = [m[..., r, c] for r in (0, 1, 2, 3, 4, 5) for c in (0, 1)]
    for st in stations:
        x, y, z = st.x_m, st.y_m, st.z_m
        v = (m[..., 0, :] + x * x * m[..., 1, :] + y * y * m[..., 2, :] - 2.0 * x * m[..., 6, :]
             + 2.0 * y * m[..., 7, :] - 2.0 * x * y * m[..., 8, :])
        lat2 = (m[..., 4, 2] + x * x * m[..., 5, 2] + z * z * m[..., 2, 2] + 2.0 * x * m[..., 9, 2]
                - 2.0 * z * m[..., 10, 2] - 2.0 * x * z * m[..., 11, 2])
        lat_roll = m[..., 10, 1] + x * m[..., 11, 1] - z * m[..., 2, 1]
        cols += [v[..., 2], v[..., 3], v[..., 4], lat2 - 2.0 * g * lat_roll + g * g * m[..., 2, 0]]
    return np.stack(cols, axis=-1)


def combine_quantities(
    q_unit: FloatArray,
    hs_m: FloatArray,
    station_names: Sequence[str],
    *,
    flags: Optional[NDArray[np.int64]] = None,
    method: str = "exact",
) -> MotionResponse:
    """Sum partitions (q per unit Hs**2, shape (n, p, K)) with weights Hs**2 and finish the
    statistics (RMS, periods, mean acceleration frequency; module docstring for calm samples)."""
    hs2 = hs_m * hs_m
    q = np.einsum("np,npk->nk", hs2, q_unit)
    calm = ~(hs2.sum(axis=1) > 0)
    qp = np.where(calm[:, None], q_unit.sum(axis=1), q) if calm.any() else q
    w0, w2 = qp[:, 6], qp[:, 7]
    tz = [_ratio_period(qp[:, 2 * i], qp[:, 2 * i + 1], w0, w2) for i in range(3)]
    rms = [np.sqrt(np.maximum(q[:, 2 * i], 0.0)) for i in range(3)]
    ns = len(station_names)
    base = q.shape[1] - 4 * ns
    st = q[:, base:].reshape(-1, ns, 4)
    stp = qp[:, base:].reshape(-1, ns, 4)
    n = hs_m.shape[0]
    if base > N_BASE:
        sway, yaw = np.sqrt(np.maximum(q[:, 8], 0.0)), np.sqrt(np.maximum(q[:, 10], 0.0)) * DEG_PER_RAD
    else:
        sway, yaw = np.full(n, np.nan), np.full(n, np.nan)
    a0p, a2p = stp[..., 0], stp[..., 1]
    ok = (a0p > 0) & (a2p > 0)
    fb = (w2 / np.where(w0 > 0, w0, 1.0))[:, None]
    vomega = np.sqrt(np.where(ok, a2p / np.where(ok, a0p, 1.0), fb))
    return MotionResponse(
        station_names=tuple(station_names),
        heave_rms_m=rms[0],
        pitch_rms_deg=rms[1] * DEG_PER_RAD,
        roll_rms_deg=rms[2] * DEG_PER_RAD,
        heave_tz_s=tz[0],
        pitch_tz_s=tz[1],
        roll_tz_s=tz[2],
        vacc_rms_m_s2=np.sqrt(np.maximum(st[..., 0], 0.0)),
        vacc_omega_rad_s=vomega,
        lacc_rms_m_s2=np.sqrt(np.maximum(st[..., 3], 0.0)),
        vacc_wf_rms_m_s2=np.sqrt(np.maximum(st[..., 2], 0.0)),
        flags=np.zeros(n, dtype=np.int64) if flags is None else np.asarray(flags, dtype=np.int64),
        sway_rms_m=sway, yaw_rms_deg=yaw, method=method,
    )


def validity_flags(valid: Optional[ArrayLike], hs_m: FloatArray, outside_fraction: FloatArray) -> NDArray[np.int64]:
    """OUTSIDE_VALIDITY where the model is outside its range or more than
    OUTSIDE_COVERAGE_LIMIT of the wave variance lies outside a table's frequency range."""
    n = hs_m.shape[0]
    hs2 = hs_m * hs_m
    tot = hs2.sum(axis=1)
    frac = np.where(tot > 0, (hs2 * outside_fraction).sum(axis=1) / np.where(tot > 0, tot, 1.0),
                    outside_fraction.max(axis=1))
    bad = frac > OUTSIDE_COVERAGE_LIMIT
    if valid is not None:
        bad = bad | ~np.broadcast_to(np.asarray(valid, dtype=bool), (n,))
    flags = np.zeros(n, dtype=np.int64)
    flags[bad] = int(SampleFlag.OUTSIDE_VALIDITY)
    return flags


def motion_response(
    transfer: Any,
    stations: Sequence[Station],
    *,
    hs_m: ArrayLike,
    tp_s: ArrayLike,
    wave_from_deg: ArrayLike,
    course_deg: ArrayLike,
    speed_m_s: ArrayLike,
    depth_m: Optional[ArrayLike] = None,
    gamma: ArrayLike = 3.3,
    spread_s: ArrayLike = 4.0,
    long_crested: bool = False,
    n_freq: int = 48,
    n_dir: int = 24,
    g_m_s2: float = G_STANDARD_M_S2,
    frequency_grid: Optional[FrequencyGrid] = None,
    normalise_spectrum: bool = True,
) -> MotionResponse:
    """Spectral motion response for n samples (exact path; see the module docstring).

    Parameters
    ----------
    transfer : a transfer model (:class:`.closed_form.ClosedFormTransfer`,
        :class:`.rao_table.TableTransfer` or the complex :class:`.strip_transfer.StripTransfer`).
    stations : stations where accelerations are computed.
    hs_m, tp_s, wave_from_deg : (n,) or (n, p) partitions [m, s, deg true "from"]; hs 0 = absent.
    course_deg, speed_m_s : (n,) or scalars [deg true, m/s through the water].
    depth_m : (n,) depth [m] (> 0, inf = deep) or None for deep water.
    gamma, spread_s : JONSWAP gamma (>= 1) and cos-2s exponent (>= 0), scalar or (p,).
    long_crested : one direction per partition.
    n_freq, n_dir : grid sizes (defaults 48 and 24).
    g_m_s2 : gravity for dispersion, transfer and lateral force.
    """
    course = np.atleast_1d(as_float_array("course_deg", course_deg)).reshape(-1)
    speed = np.atleast_1d(require_nonnegative("speed_m_s", speed_m_s)).reshape(-1)
    firsts = [np.atleast_1d(np.asarray(v, dtype=float)).shape[0] for v in (hs_m, tp_s, wave_from_deg)]
    n = max(course.size, speed.size, *firsts)
    for name, arr in (("course_deg", course), ("speed_m_s", speed)):
        if arr.size not in (1, n):
            raise SeawayInputError(f"{name} has {arr.size} values, expected 1 or {n}")
    course = np.broadcast_to(course, (n,))
    speed = np.ascontiguousarray(np.broadcast_to(speed, (n,)))
    hs, tp, wf = prepare_sea(hs_m, tp_s, wave_from_deg, n)
    p = hs.shape[1]
    gam = _per_partition("gamma", gamma, p, 1.0)
    spr = _per_partition("spread_s", spread_s, p, 0.0)
    depth = None
    if depth_m is not None:
        d = np.atleast_1d(require_positive("depth_m", depth_m, allow_inf=True)).reshape(-1)
        if d.size not in (1, n):
            raise SeawayInputError(f"depth_m has {d.size} values, expected 1 or {n}")
        depth = np.ascontiguousarray(np.broadcast_to(d, (n,)))
    mu = relative_heading_deg(course[:, None], wf)
    um = unit_moments(transfer, tp, mu, speed, depth, gam, spr, long_crested=long_crested,
                      n_freq=n_freq, n_dir=n_dir, g_m_s2=g_m_s2, frequency_grid=frequency_grid,
                      normalise_spectrum=normalise_spectrum)
    flags = validity_flags(transfer.validity(speed), hs, um.outside_fraction)
    q = station_quantities(um.m, stations, g_m_s2)
    return combine_quantities(q, hs, [s.name for s in stations], flags=flags, method="exact")
