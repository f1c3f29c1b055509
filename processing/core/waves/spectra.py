# SPDX-License-Identifier: GPL-2.0-or-later
"""Wave spectra in (Hs, Tp): JONSWAP / Pierson-Moskowitz, cos-2s spreading, moments and periods.

Frequency spectra are one-sided densities in angular frequency, S(omega) [m^2 s/rad], with
moments m_n = integral omega**n S(omega) d omega [m^2 (rad/s)^n]. S(f) [m^2/Hz] = 2 pi S(omega).

Forms (DNV-RP-C205 "Environmental conditions and environmental loads", Oct. 2010, s.3.5.5;
Pierson & Moskowitz 1964, J. Geophys. Res. 69(24) 5181-5190; Hasselmann et al. 1973, Dtsch.
Hydrogr. Z. A8(12)):

    omega_p = 2 pi / Tp
    S_PM(omega) = (5/16) Hs**2 omega_p**4 omega**-5 exp(-(5/4) (omega/omega_p)**-4)
    S_J(omega)  = A_gamma S_PM(omega) gamma**exp(-(omega - omega_p)**2 / (2 sigma**2 omega_p**2))
    A_gamma = 1 - 0.287 ln(gamma);  sigma = 0.07 (omega <= omega_p), 0.09 (omega > omega_p)

gamma = 1 gives Pierson-Moskowitz exactly; S(0) = 0 (the limit); Hs = 0 gives an all-zero "calm"
spectrum. A_gamma is DNV's approximate normalisation. When a frequency grid's quadrature weights
[rad/s] are at hand (:attr:`FrequencyGrid.weights_rad_s`), :func:`jonswap_s_m2_s_rad` can take them
as ``normalise_weights`` and replace A_gamma by the numerical factor that makes
4 sqrt(sum(S * w)) == Hs on that grid, so the spectrum's m0 matches Hs whatever the grid's
truncation; weights that capture no energy of a sea state with Hs > 0 (a grid that misses the
peak) are an error rather than a silent zero.

Directional spreading (Longuet-Higgins, Cartwright & Smith 1963, "Observations of the directional
spectrum of sea waves using the motions of a floating buoy", in Ocean Wave Spectra, Prentice-Hall,
111-136): D(theta) = Gamma(s+1) / (2 sqrt(pi) Gamma(s+1/2)) cos**(2s)(theta/2), |theta| <= pi,
with circular spread sigma_theta = sqrt(2/(s+1)) (Kuik, van Vledder & Holthuijsen 1988,
J. Phys. Oceanogr. 18, 1020-1034).
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Optional, Sequence

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..numerics import log_gamma, trapezoid_weights
from ..units import DEG_PER_RAD, RAD_PER_DEG, FloatArray
from ..validation import SeawayInputError, show
from ..validation import as_float_array, require_nonnegative, require_positive

__all__ = [
    "jonswap_s_m2_s_rad",
    "pierson_moskowitz_s_m2_s_rad",
    "dnv_default_gamma",
    "FrequencyGrid",
    "frequency_grid_rad_s",
    "cos2s_spreading_per_rad",
    "DirectionGrid",
    "direction_grid",
    "spread_s_from_sigma_deg",
    "SWELL_SPREAD_S",
    "partition_spread_s",
    "sigma_deg_from_spread_s",
    "spectral_moment",
    "significant_wave_height_m",
    "tm01_s",
    "tm02_s",
    "tm_minus10_s",
    "FREQ_GRID_LOW_FACTOR",
    "FREQ_GRID_HIGH_FACTOR",
    "DEFAULT_SPREAD_S",
]

FREQ_GRID_LOW_FACTOR: float = 0.5
"""Lowest grid frequency as a multiple of the lowest peak frequency 2 pi / tp_max."""
FREQ_GRID_HIGH_FACTOR: float = 8.0
"""Highest grid frequency as a multiple of the highest peak frequency 2 pi / tp_min."""
DEFAULT_SPREAD_S: float = 6.0
"""Default cos-2s exponent: sigma_theta = sqrt(2/7) rad = 30.6 deg, a wind-sea spread
(common practice, no source; comparable to DNV-RP-C205's cos**2 wind sea, sigma_theta 31.5 deg)."""


# --------------------------------------------------------------------------------------------
# frequency spectra
# --------------------------------------------------------------------------------------------
def _omega_1d(omega_rad_s: ArrayLike) -> FloatArray:
    omega = require_nonnegative("omega_rad_s", omega_rad_s)
    if omega.ndim != 1 or omega.size < 1:
        raise SeawayInputError(
            f"omega_rad_s must be a 1-D array of frequencies, got shape {omega.shape}"
        )
    return omega


def _normalise_weights(weights: Optional[ArrayLike], nf: int) -> Optional[FloatArray]:
    if weights is None:
        return None
    w = require_nonnegative("normalise_weights", weights)
    if w.shape != (nf,):
        raise SeawayInputError(
            f"normalise_weights must have shape ({nf},) like omega_rad_s, got {w.shape}"
        )
    return w


def _jonswap_inputs(omega_rad_s: ArrayLike, hs_m: ArrayLike, tp_s: ArrayLike, gamma: ArrayLike,
                    sigma_a: float, sigma_b: float,
                    normalise_weights: Optional[ArrayLike]) -> tuple:
    """Checked (omega, hs, tp, gamma broadcast together, sigma_a, sigma_b, weights or None)."""
    omega = _omega_1d(omega_rad_s)
    hs = require_nonnegative("hs_m", hs_m)
    tp = require_positive("tp_s", tp_s)
    gam = as_float_array("gamma", gamma)
    if np.any(gam < 1.0):
        bad = gam[gam < 1.0].ravel()[0]
        raise SeawayInputError(f"gamma must be >= 1, got {show(bad)}")
    sa = float(require_positive("sigma_a", sigma_a))
    sb = float(require_positive("sigma_b", sigma_b))
    w = _normalise_weights(normalise_weights, omega.size)
    try:
        hs, tp, gam = np.broadcast_arrays(hs, tp, gam)
    except ValueError as exc:
        raise SeawayInputError(
            f"hs_m {np.shape(hs_m)}, tp_s {np.shape(tp_s)} and gamma {np.shape(gamma)} "
            "do not broadcast"
        ) from exc
    return omega, hs, tp, gam, sa, sb, w


def _normalised_to_hs(s: FloatArray, hs: FloatArray, tp: FloatArray, w: FloatArray) -> FloatArray:
    """S (S..., nf) scaled so that m0 = sum(S * w) [m^2] equals Hs**2 / 16 on the grid of ``w``."""
    m0 = s @ w  # (S...)
    target = hs * hs / 16.0
    lost = (target > 0) & ~(m0 > 0)
    if lost.any():
        raise SeawayInputError(
            "normalise_weights capture no energy for a sea state with hs_m > 0 "
            f"(first: hs_m={show(hs[lost].ravel()[0])}, tp_s={show(tp[lost].ravel()[0])}); "
            "the frequency grid does not cover the spectral peak"
        )
    scale = np.where(m0 > 0, target / np.where(m0 > 0, m0, 1.0), 0.0)
    return s * scale[..., None]


def jonswap_s_m2_s_rad(
    omega_rad_s: ArrayLike,
    hs_m: ArrayLike,
    tp_s: ArrayLike,
    gamma: ArrayLike = 3.3,
    *,
    sigma_a: float = 0.07,
    sigma_b: float = 0.09,
    normalise_weights: Optional[ArrayLike] = None,
) -> FloatArray:
    """JONSWAP spectral density S(omega) [m^2 s/rad] for sea states (Hs, Tp, gamma).

    DNV-RP-C205 (2010) s.3.5.5, in angular frequency:

        S_J(omega) = A_gamma (5/16) Hs**2 omega_p**4 omega**-5 exp(-(5/4)(omega/omega_p)**-4)
                     * gamma**exp(-(omega - omega_p)**2 / (2 sigma**2 omega_p**2)),
        omega_p = 2 pi / Tp, sigma = sigma_a for omega <= omega_p else sigma_b,
        A_gamma = 1 - 0.287 ln(gamma), or the grid normalisation of ``normalise_weights``
        (see the module docstring).

    ``omega_rad_s``: 1-D (nf,) [rad/s] >= 0. ``hs_m`` [m] >= 0, ``tp_s`` [s] > 0 and ``gamma``
    (dimensionless, >= 1) broadcast among themselves to the sea-state shape ``S``.
    ``sigma_a``/``sigma_b``: width below / above the peak (dimensionless, > 0).
    ``normalise_weights``: optional (nf,) quadrature weights [rad/s].
    Returns S [m^2 s/rad] of shape ``S + (nf,)``. Raises :class:`SeawayInputError` for hs_m < 0,
    tp_s <= 0, gamma < 1, non-finite input, omega not 1-D or < 0, weights of the wrong shape or
    weights that capture no energy of a sea state with hs_m > 0.
    """
    omega, hs, tp, gam, sa, sb, w = _jonswap_inputs(
        omega_rad_s, hs_m, tp_s, gamma, sigma_a, sigma_b, normalise_weights)
    wp = (2.0 * math.pi / tp)[..., None]  # (S..., 1)
    hs2 = (hs * hs)[..., None]
    ln_gam = np.log(gam)[..., None]
    pos = omega > 0
    om = np.where(pos, omega, 1.0)  # avoid 0**-5; S(0) is set to 0 below
    ratio = om / wp
    pm = (5.0 / 16.0) * hs2 * wp**4 * om**-5.0 * np.exp(-1.25 * ratio**-4.0)
    sigma = np.where(om <= wp, sa, sb)
    peak = np.exp(ln_gam * np.exp(-((om - wp) ** 2) / (2.0 * sigma**2 * wp**2)))
    s = np.where(pos, pm * peak, 0.0)
    if w is None:
        s = s * (1.0 - 0.287 * ln_gam)
    else:
        s = _normalised_to_hs(s, hs, tp, w)
    return np.asarray(s, dtype=float)


def pierson_moskowitz_s_m2_s_rad(
    omega_rad_s: ArrayLike,
    hs_m: ArrayLike,
    tp_s: ArrayLike,
    *,
    normalise_weights: Optional[ArrayLike] = None,
) -> FloatArray:
    """Pierson-Moskowitz spectral density S(omega) [m^2 s/rad] (DNV-RP-C205 2010 s.3.5.5).

    S_PM(omega) = (5/16) Hs**2 omega_p**4 omega**-5 exp(-(5/4)(omega/omega_p)**-4),
    omega_p = 2 pi / Tp (Pierson & Moskowitz 1964 in the Hs/Tp form). Integrates to Hs**2/16
    exactly over (0, inf). Same arguments and shapes as :func:`jonswap_s_m2_s_rad` with gamma 1.
    """
    return jonswap_s_m2_s_rad(
        omega_rad_s, hs_m, tp_s, 1.0, normalise_weights=normalise_weights
    )


def dnv_default_gamma(hs_m: ArrayLike, tp_s: ArrayLike) -> FloatArray:
    """Peak enhancement factor gamma from Hs [m] and Tp [s] when no other information exists.

    DNV-RP-C205 (2010) s.3.5.5, with r = Tp / sqrt(Hs) (Tp in s, Hs in m):
    gamma = 5 for r <= 3.6; exp(5.75 - 1.15 r) for 3.6 < r < 5; 1 for r >= 5.
    hs_m = 0 gives r = inf, hence gamma = 1.
    """
    hs = require_nonnegative("hs_m", hs_m)
    tp = require_positive("tp_s", tp_s)
    try:
        hs, tp = np.broadcast_arrays(hs, tp)
    except ValueError as exc:
        raise SeawayInputError(
            f"hs_m {hs.shape} and tp_s {tp.shape} do not broadcast"
        ) from exc
    with np.errstate(divide="ignore"):
        r = np.where(hs > 0, tp / np.sqrt(np.where(hs > 0, hs, 1.0)), np.inf)
    mid = np.exp(5.75 - 1.15 * np.where(np.isfinite(r), r, 5.0))
    g = np.where(r <= 3.6, 5.0, np.where(r < 5.0, mid, 1.0))
    return np.asarray(g, dtype=float)


@dataclass(frozen=True)
class FrequencyGrid:
    """Angular-frequency grid with trapezoid weights: integral f d omega ~= sum(f * weights).

    Fields: ``omega_rad_s`` (nf,) increasing frequencies [rad/s]; ``weights_rad_s`` (nf,)
    trapezoid weights [rad/s].
    """

    omega_rad_s: FloatArray
    weights_rad_s: FloatArray

    @property
    def n(self) -> int:
        return int(self.omega_rad_s.size)


def frequency_grid_rad_s(
    tp_min_s: float, tp_max_s: float, n_freq: int = 48
) -> FrequencyGrid:
    """Log-spaced angular-frequency grid covering every peak period in [tp_min_s, tp_max_s].

    omega runs from FREQ_GRID_LOW_FACTOR * 2 pi / tp_max_s (0.5 omega_p,min) to
    FREQ_GRID_HIGH_FACTOR * 2 pi / tp_min_s (8 omega_p,max), geometrically spaced, with
    trapezoid weights. Log spacing gives every peak period the same relative resolution
    (the spectral shape depends on omega / omega_p only).

    Resolution (common practice, no source; numbers from the PM form): below 0.5 omega_p the PM
    spectrum holds exp(-20) ~ 2e-9 of m0; above 8 omega_p the omega**-5 tail holds
    5/(4 * 8**4) = 0.03 % of m0 and about 1.26/64 = 2 % of m2 (1 % in Tz). With 48 points over
    Tp 3..15 s the trapezoid Hs and Te of JONSWAP (gamma 1..7) stay within 0.3 % of a fine-grid
    integral (checked when this grid was chosen).
    For Hs, pass ``weights_rad_s`` as ``normalise_weights`` to make 4 sqrt(m0) exact on the
    grid. m2 (and Tz) of the bare wave elevation converges only as (omega_max)**-2; response
    spectra (which fall off faster) are unaffected. Increase ``n_freq`` for peaked spectra
    over a wide Tp range.

    Parameters
    ----------
    tp_min_s, tp_max_s : smallest and largest peak period [s], 0 < tp_min_s <= tp_max_s.
    n_freq : number of frequencies, >= 48 recommended (at least 8 accepted).
    """
    tmin = float(require_positive("tp_min_s", tp_min_s))
    tmax = float(require_positive("tp_max_s", tp_max_s))
    if tmax < tmin:
        raise SeawayInputError(
            f"tp_max_s must be >= tp_min_s, got tp_min_s={show(tmin)}, tp_max_s={show(tmax)}"
        )
    if isinstance(n_freq, bool) or int(n_freq) != n_freq or int(n_freq) < 8:
        raise SeawayInputError(f"n_freq must be an integer >= 8, got {show(n_freq)}")
    lo = FREQ_GRID_LOW_FACTOR * 2.0 * math.pi / tmax
    hi = FREQ_GRID_HIGH_FACTOR * 2.0 * math.pi / tmin
    omega = np.geomspace(lo, hi, int(n_freq))
    return FrequencyGrid(omega_rad_s=omega, weights_rad_s=trapezoid_weights(omega))


# --------------------------------------------------------------------------------------------
# directional spreading
# --------------------------------------------------------------------------------------------
def _cos2s_constant(s: FloatArray) -> FloatArray:
    """Gamma(s+1) / (2 sqrt(pi) Gamma(s+1/2)), via log-gamma (no overflow for large s)."""
    return np.exp(log_gamma(s + 1.0) - log_gamma(s + 0.5)) / (2.0 * math.sqrt(math.pi))


def cos2s_spreading_per_rad(theta_rel_rad: ArrayLike, s: ArrayLike) -> FloatArray:
    """cos-2s directional spreading function D(theta) [1/rad], integral over 2 pi equal to 1.

    D(theta) = Gamma(s+1) / (2 sqrt(pi) Gamma(s+1/2)) cos**(2s)(theta/2)
    (Longuet-Higgins, Cartwright & Smith 1963), theta [rad] relative to the mean direction.
    Evaluated as ((1 + cos theta)/2)**s, which equals cos**(2s)(theta/2) and is 2 pi-periodic,
    so any theta is accepted. s >= 0 (s = 0 is uniform, 1/(2 pi)); broadcasts with theta.
    """
    theta = as_float_array("theta_rel_rad", theta_rel_rad)
    sv = require_nonnegative("s", s)
    try:
        np.broadcast_shapes(theta.shape, sv.shape)
    except ValueError as exc:
        raise SeawayInputError(
            f"theta_rel_rad {theta.shape} and s {sv.shape} do not broadcast"
        ) from exc
    c2 = np.clip(0.5 * (1.0 + np.cos(theta)), 0.0, 1.0)
    with np.errstate(divide="ignore"):
        d = _cos2s_constant(sv) * np.where(sv == 0, 1.0, c2**sv)
    return np.asarray(d, dtype=float)


SWELL_SPREAD_S: float = 13.0
"""cos-2s exponent of a swell partition: DNV-RP-C205 (2010) s.3.5.8 advises cos**n spreading with
n = 2 for wind sea and n >= 6 for swell (from memory); cos**6 has the circular spread of
cos-2s with s = m1/(1-m1) = 13.55 (m1 = 0.9313 by numerical integration; Kuik, van Vledder &
Holthuijsen 1988 spread measure), rounded down to 13. (cos**2 gives s = 5.6.)"""


def partition_spread_s(names: Sequence[str], wind_spread_s: float) -> FloatArray:
    """cos-2s exponent per partition: ``wind_spread_s`` for the wind sea and the combined sea,
    max(wind_spread_s, SWELL_SPREAD_S) for partitions named ``swell...`` (the tags of
    :data:`..seastate.variables.PARTITIONS`)."""
    s = float(require_nonnegative("spread_s", wind_spread_s))
    return np.array([max(s, SWELL_SPREAD_S) if str(n).lower().startswith("swell") else s for n in names],
                    dtype=float)


def spread_s_from_sigma_deg(sigma_deg: ArrayLike) -> FloatArray:
    """cos-2s exponent s from the circular directional spread sigma_theta [deg].

    s = 2 / sigma_theta**2 - 1 (sigma_theta in rad), from sigma_theta = sqrt(2 (1 - m1)) and
    m1 = s/(s+1) for cos-2s (Kuik, van Vledder & Holthuijsen 1988). Valid for
    0 < sigma_theta <= sqrt(2) rad = 81.03 deg (s = 0, uniform, at the upper bound).
    """
    sig = require_positive("sigma_deg", sigma_deg)
    limit = math.sqrt(2.0) * DEG_PER_RAD
    if np.any(sig > limit):
        bad = sig[sig > limit].ravel()[0]
        raise SeawayInputError(
            f"sigma_deg must be <= {limit:.4f} deg (uniform spreading) for cos-2s, got {show(bad)}"
        )
    sr = sig * RAD_PER_DEG
    return np.maximum(2.0 / (sr * sr) - 1.0, 0.0)


def sigma_deg_from_spread_s(s: ArrayLike) -> FloatArray:
    """Circular spread sigma_theta = sqrt(2/(s+1)) rad, in degrees (Kuik et al. 1988), s >= 0."""
    sv = require_nonnegative("s", s)
    return np.sqrt(2.0 / (sv + 1.0)) * DEG_PER_RAD


@dataclass(frozen=True)
class DirectionGrid:
    """Directions relative to the mean wave direction with quadrature weights summing to 1.

    Fields: ``theta_rel_rad`` (n_dir,) [rad] in [-pi, pi), ``weights`` (n_dir,) dimensionless,
    sum 1 (D(theta) dtheta renormalised).
    """

    theta_rel_rad: FloatArray
    weights: FloatArray

    @property
    def n(self) -> int:
        return int(self.theta_rel_rad.size)


def direction_grid(
    n_dir: int = 24, s: float = DEFAULT_SPREAD_S, long_crested: bool = False
) -> DirectionGrid:
    """Uniform direction grid over [-pi, pi) with cos-2s weights (Longuet-Higgins et al. 1963).

    theta_j = -pi + j 2 pi / n_dir (j = 0..n_dir-1, so theta = 0 is a node when n_dir is even);
    weights_j = D(theta_j) dtheta / sum(D dtheta), which sum to 1 (the largest weight absorbs
    the last rounding). ``long_crested=True`` returns the single direction 0 with weight 1.

    Parameters
    ----------
    n_dir : number of directions (integer >= 2) when not long-crested.
    s : cos-2s exponent (scalar >= 0); see :func:`spread_s_from_sigma_deg`.
    long_crested : if True, ignore n_dir and s.
    """
    if long_crested:
        return DirectionGrid(theta_rel_rad=np.zeros(1), weights=np.ones(1))
    if isinstance(n_dir, bool) or int(n_dir) != n_dir or int(n_dir) < 2:
        raise SeawayInputError(f"n_dir must be an integer >= 2, got {show(n_dir)}")
    sv = require_nonnegative("s", s)
    if sv.ndim != 0:
        raise SeawayInputError(f"s must be a scalar, got shape {sv.shape}")
    n = int(n_dir)
    dtheta = 2.0 * math.pi / n
    theta = -math.pi + dtheta * np.arange(n)
    w = cos2s_spreading_per_rad(theta, sv) * dtheta
    total = w.sum()
    if not total > 0:  # pragma: no cover - D(0) > 0 always and theta = 0 or near it is a node
        raise SeawayInputError(f"s={show(float(sv))} is too large for n_dir={n}: no weight left")
    w = w / total
    i = int(np.argmax(w))
    for _ in range(4):  # make np.sum(w) == 1.0 exactly in floating point, if reachable
        rest = 1.0 - w.sum()
        if rest == 0.0:
            break
        w[i] += rest
    return DirectionGrid(theta_rel_rad=theta, weights=w)


# --------------------------------------------------------------------------------------------
# moments and characteristic periods
# --------------------------------------------------------------------------------------------
def spectral_moment(
    s_m2_s_rad: ArrayLike,
    omega_rad_s: ArrayLike,
    n: float,
    weights: Optional[ArrayLike] = None,
) -> FloatArray:
    """Spectral moment m_n = integral omega**n S(omega) d omega over the last axis.

    Quadrature: sum(omega**n * S * weights); ``weights=None`` uses trapezoid weights of
    ``omega_rad_s`` (see :mod:`.numerics`). For n < 0 a node at omega = 0 contributes 0 (the
    spectra here vanish there faster than any power). Units m^2 (rad/s)**n.

    Parameters
    ----------
    s_m2_s_rad : spectral density [m^2 s/rad], shape (..., nf), finite, >= 0.
    omega_rad_s : (nf,) increasing angular frequencies [rad/s], >= 0.
    n : moment order (real, e.g. -1, 0, 1, 2).
    weights : optional (nf,) quadrature weights [rad/s].
    """
    omega = _omega_1d(omega_rad_s)
    spec = require_nonnegative("s_m2_s_rad", s_m2_s_rad)
    if spec.ndim < 1 or spec.shape[-1] != omega.size:
        raise SeawayInputError(
            f"s_m2_s_rad must have {omega.size} values on its last axis like omega_rad_s, "
            f"got shape {spec.shape}"
        )
    order = float(as_float_array("n", n))
    if weights is None:
        w = trapezoid_weights(omega)
    else:
        w = require_nonnegative("weights", weights)
        if w.shape != omega.shape:
            raise SeawayInputError(
                f"weights must have shape {omega.shape} like omega_rad_s, got {w.shape}"
            )
    if order == 0:
        wn = w
    else:
        pos = omega > 0
        # omega = 0 contributes 0 for every n != 0 (omega**n S -> 0 for these spectra)
        wn = np.where(pos, np.where(pos, omega, 1.0) ** order, 0.0) * w
    return np.asarray(spec @ wn, dtype=float)


def significant_wave_height_m(
    s_m2_s_rad: ArrayLike, omega_rad_s: ArrayLike, weights: Optional[ArrayLike] = None
) -> FloatArray:
    """Spectral significant wave height Hm0 = 4 sqrt(m0) [m] (DNV-RP-C205 2010 s.3.5.5)."""
    return 4.0 * np.sqrt(spectral_moment(s_m2_s_rad, omega_rad_s, 0, weights))


def _calm_mask(m0: FloatArray, mk: FloatArray, name: str, fill: Optional[float]) -> NDArray[np.bool_]:
    """Mask of spectra whose period is undefined (m0 or the other moment is 0).

    Raises SeawayInputError if there are any and no explicit ``fill`` was given.
    """
    calm = ~((m0 > 0) & (mk > 0))
    if calm.any() and fill is None:
        idx = int(np.flatnonzero(calm.ravel())[0])
        raise SeawayInputError(
            f"{name} is undefined for a spectrum with no energy (first at flat index {idx}); "
            "mask calm sea states or pass zero_energy_period_s explicitly"
        )
    return calm


def _fill(calm: NDArray[np.bool_], value: FloatArray, fill: Optional[float]) -> FloatArray:
    if calm.any():
        value = np.where(calm, float(fill), value)  # type: ignore[arg-type]
    return np.asarray(value, dtype=float)


def tm01_s(
    s_m2_s_rad: ArrayLike,
    omega_rad_s: ArrayLike,
    weights: Optional[ArrayLike] = None,
    *,
    zero_energy_period_s: Optional[float] = None,
) -> FloatArray:
    """Mean period Tm01 = 2 pi m0 / m1 [s] (moments in omega; DNV-RP-C205 2010 s.3.5.5).

    A spectrum with m0 = 0 raises SeawayInputError unless ``zero_energy_period_s`` is given,
    in which case that value is returned for it.
    """
    m0 = spectral_moment(s_m2_s_rad, omega_rad_s, 0, weights)
    m1 = spectral_moment(s_m2_s_rad, omega_rad_s, 1, weights)
    calm = _calm_mask(m0, m1, "tm01_s", zero_energy_period_s)
    return _fill(calm, 2.0 * math.pi * m0 / np.where(calm, 1.0, m1), zero_energy_period_s)


def tm02_s(
    s_m2_s_rad: ArrayLike,
    omega_rad_s: ArrayLike,
    weights: Optional[ArrayLike] = None,
    *,
    zero_energy_period_s: Optional[float] = None,
) -> FloatArray:
    """Mean zero-up-crossing period Tz = Tm02 = 2 pi sqrt(m0 / m2) [s] (DNV-RP-C205 s.3.5.5).

    Zero energy: see :func:`tm01_s`. m2 of an omega**-5 tail converges only as omega_max**-2.
    """
    m0 = spectral_moment(s_m2_s_rad, omega_rad_s, 0, weights)
    m2 = spectral_moment(s_m2_s_rad, omega_rad_s, 2, weights)
    calm = _calm_mask(m0, m2, "tm02_s", zero_energy_period_s)
    return _fill(calm, 2.0 * math.pi * np.sqrt(m0 / np.where(calm, 1.0, m2)), zero_energy_period_s)


def tm_minus10_s(
    s_m2_s_rad: ArrayLike,
    omega_rad_s: ArrayLike,
    weights: Optional[ArrayLike] = None,
    *,
    zero_energy_period_s: Optional[float] = None,
) -> FloatArray:
    """Energy period Te = Tm-10 = 2 pi m_-1 / m0 [s].

    Definition as in IEC TS 62600-101 (2015) (from memory) and the 23rd ITTC Specialist
    Committee on Waves (2002).

    Zero energy: see :func:`tm01_s`.
    """
    m0 = spectral_moment(s_m2_s_rad, omega_rad_s, 0, weights)
    mm1 = spectral_moment(s_m2_s_rad, omega_rad_s, -1, weights)
    calm = _calm_mask(m0, mm1, "tm_minus10_s", zero_energy_period_s)
    return _fill(calm, 2.0 * math.pi * mm1 / np.where(calm, 1.0, m0), zero_energy_period_s)
