# SPDX-License-Identifier: GPL-2.0-or-later
"""Strip-theory transfer model of a vessel profile: complex RAOs over (speed, omega, heading),
built once per profile (:mod:`.strip`), kept on disk (:mod:`.rao_cache`) and interpolated for
the spectral response (:mod:`.response`).

Hull: the profile's ``hull_sections`` table when set, else sections from the main dimensions
and form coefficients (:func:`.strip.sections.sections_from_form`, power-law curves) with the
midship coefficient estimated from the block coefficient as Cm = 1.006 - 0.0056 Cb**-3.56
(Kerlen 1970, as quoted in Schneekluth & Bertram 1998, "Ship Design for Efficiency and
Economy", 2nd ed., ch. 2; from memory), clipped to [Cb, 0.995]; Cwp clipped to
[Cb + 0.005, 0.995] (the power-law waterline needs Cb < Cwp < 1).

Mass: displacement rho V of the sections (free floating), G above the centre of buoyancy by
BM - GM, x_G = x_B. Radii of gyration about G: pitch and yaw ``pitch_gyradius_m`` or 0.25 L
(common practice, no source). Roll inertia and natural period (first that applies):

1. ``roll_gyradius_m`` given: I44 = m kxx**2; T_roll from GM and I44 + A44(omega_n)
   (:func:`.strip.roll_damping.roll_natural`);
2. ``roll_period_s`` given: I44 = C44 / omega_n**2 - A44(omega_n) (with GM given), or, without
   GM, GM = omega_n**2 (I44 + A44) / (rho g V) with kxx = 0.35 B;
3. GM given and L >= 24 m: the period of the IMO 2008 IS Code formula (its scope, Part A 1.2),
   then as in 2;
4. otherwise kxx = 0.35 B (common practice, no source) and T_roll from GM as in 1.

Roll damping: ``roll_damping_ratio`` given: the viscous part that makes wave + viscous damping
that fraction of critical at omega_n (:func:`.strip.roll_damping.extra_damping_for_ratio`),
the same at every speed. ``None``: Ikeda's friction and lift components at omega_n for each
speed at a nominal roll amplitude of IKEDA_ROLL_AMPLITUDE_DEG (equivalent linearisation; our
choice), eddy-making left out (see :mod:`.strip.roll_damping`: a lower bound of the damping).

Axes of the stored RAOs (station axes of :mod:`..vessel.profile`): reference point O at
midships on the waterline, x forward, y to starboard, z up; heave up, pitch bow down, roll
positive lifting the starboard (+y) side, sway to starboard, yaw bow to starboard; ITTC
heading mu (180 head, 90 waves from port). Vertical displacement of a station (x, y):
heave - x pitch + y roll; lateral displacement: sway + x yaw - z roll. (The engine's own axes
have y to port: sway, roll and yaw change sign, :func:`_to_station_axes`.)

Grids (our choice): speeds Fn = 0, 0.05, ..., 0.45; headings 0..180 deg every 5 deg, mirrored
to 185..355 (port/starboard symmetry of the hull: heave and pitch even, sway, roll and yaw
odd); N_OMEGA log-spaced wave frequencies omega sqrt(L/g) in [0.05, 10] (wavelength from 630 L
down to L/16). Interpolation: linear in speed, heading and log omega of the complex RAOs;
sway, roll and yaw are stored multiplied by the roll resonance factor
D = 1 - (w_e/w_n)**2 + 2 i zeta_U w_e/w_n (signed encounter frequency, deep water; zeta_U the
total roll damping ratio at w_n for that speed node) and divided by D at the point asked for,
so that the sharp roll resonance, which moves with speed and heading, is not smeared by the
interpolation (our choice; the interpolated/direct difference is checked in the tests); below the lowest frequency the lowest node's values, above the highest zero (waves shorter
than L/16 do not move the hull measurably); speeds above the grid use its top node and are
outside the method limit Fn <= 0.40 anyway.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, Optional, Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..units import G_STANDARD_M_S2, FloatArray
from ..validation import SeawayInputError, show
from ..vessel.profile import VesselProfile
from ..vessel.roll_period import imo_roll_period_s
from .strip import equations as eq
from .strip.roll_damping import extra_damping_for_ratio, ikeda_friction_lift, roll_natural
from .strip.sections import HullSections, read_sections_csv, sections_from_form
from .strip.validity import strip_validity

__all__ = ["ENGINE_VERSION", "RHO_SEA_KG_M3", "StripTransfer", "ComplexMotionTransfer",
           "hull_sections_for", "build_strip_transfer", "StripSetup", "strip_setup", "roll_summary",
           "transfer_summary"]

ENGINE_VERSION = "strip-2"
"""Part of the on-disk cache key: change it whenever the RAOs of the same profile change."""
RHO_SEA_KG_M3 = 1025.0
FROUDE_NODES = np.round(np.arange(0.0, 0.4501, 0.05), 6)
HEADING_STEP_DEG = 5.0
N_OMEGA = 96
NU_RANGE = (0.05, 10.0)
DEFAULT_ROLL_GYRADIUS_BEAM = 0.35
DEFAULT_PITCH_GYRADIUS_LENGTH = 0.25
IKEDA_ROLL_AMPLITUDE_DEG = 5.0
MODES = ("heave", "pitch", "roll", "sway", "yaw")


@dataclass(frozen=True)
class ComplexMotionTransfer:
    """Complex RAOs at O in station axes (module docstring), one broadcast shape."""

    heave_m_per_m: NDArray[np.complex128]
    pitch_rad_per_m: NDArray[np.complex128]
    roll_rad_per_m: NDArray[np.complex128]
    sway_m_per_m: NDArray[np.complex128]
    yaw_rad_per_m: NDArray[np.complex128]


def _midship_coeff(cb: float) -> float:
    """Kerlen 1970 estimate (module docstring), clipped to [Cb, 0.995]."""
    return float(min(max(1.006 - 0.0056 * cb ** -3.56, cb), 0.995))


def hull_sections_for(profile: VesselProfile) -> HullSections:
    """The profile's section table, or sections from its main dimensions (module docstring).

    Errors name the profile and the file (never other file content)."""
    path = profile.hull_sections_path()
    if path is not None:
        try:
            return read_sections_csv(path)
        except SeawayInputError as exc:
            raise SeawayInputError(f"vessel {show(profile.name)}: hull_sections: {exc}") from None
    cb = min(profile.block_coeff, 0.99)
    cwp = min(max(profile.cwp, cb + 0.005), 0.995)
    return sections_from_form(profile.length_wl_m, profile.beam_m, profile.draught_m, cb, cwp,
                              _midship_coeff(cb), n_stations=41)


@dataclass(frozen=True)
class StripSetup:
    """A profile prepared for strip theory: hull, rigid body, roll natural values and the
    source of the roll inertia ("gyradius", "roll period", "IS Code", "default 0.35 B")."""

    hull: eq.HullModel
    body: eq.RigidBody
    roll_period_s: float
    roll_inertia_source: str


def _body(hull: eq.HullModel, gm: float, kxx: float, kyy: float) -> eq.RigidBody:
    return eq.rigid_body(hull, eq.MassProperties(gm_t_m=gm, roll_gyradius_m=kxx,
                                                 pitch_gyradius_m=kyy, yaw_gyradius_m=kyy))


def _inertia_for_period(hull: eq.HullModel, gm: float, kyy: float, period_s: float,
                        name: str) -> eq.RigidBody:
    """Rigid body whose roll natural period is ``period_s`` (I44 = C44/w^2 - A44(w))."""
    from .strip.roll_damping import roll_coefficients_at_g

    w = 2.0 * math.pi / period_s
    body = _body(hull, gm, DEFAULT_ROLL_GYRADIUS_BEAM * hull.beam_m, kyy)
    a44 = float(roll_coefficients_at_g(hull, body, w)[0][0])
    i44 = hull.rho_kg_m3 * hull.g_m_s2 * hull.volume_m3 * gm / w ** 2 - a44
    if not i44 > 0:
        raise SeawayInputError(
            f"{name} {period_s:.3g} s is too short for GM {gm:g} m and this hull (the roll added "
            f"inertia alone gives a longer period); give roll_gyradius_m or check the values")
    return _body(hull, gm, math.sqrt(i44 / body.mass_kg), kyy)


def _gm_for_period(hull: eq.HullModel, kxx: float, kyy: float, period_s: float) -> float:
    """GM [m] that gives ``period_s`` with radius kxx (fixed point: z_G moves with GM)."""
    from .strip.roll_damping import roll_coefficients_at_g

    w = 2.0 * math.pi / period_s
    gm = 1.0
    for _ in range(20):
        body = _body(hull, gm, kxx, kyy)
        a44 = float(roll_coefficients_at_g(hull, body, w)[0][0])
        gm_new = w ** 2 * (body.mass_kg * kxx ** 2 + a44) / (hull.rho_kg_m3 * hull.g_m_s2 * hull.volume_m3)
        if abs(gm_new - gm) < 1e-9 * gm:
            break
        gm = gm_new
    return gm_new


def strip_setup(profile: VesselProfile, g_m_s2: float = G_STANDARD_M_S2) -> StripSetup:
    """Hull, rigid body and roll period of ``profile`` (module docstring, steps 1-4)."""
    hull = eq.prepare_hull(hull_sections_for(profile), RHO_SEA_KG_M3, g_m_s2)
    kyy = profile.pitch_gyradius_m or DEFAULT_PITCH_GYRADIUS_LENGTH * hull.length_m
    kxx_default = DEFAULT_ROLL_GYRADIUS_BEAM * hull.beam_m
    gm, tr = profile.gm_m, profile.roll_period_s
    if profile.roll_gyradius_m is not None:
        if gm is None:
            gm = _gm_for_period(hull, profile.roll_gyradius_m, kyy, float(tr))
        body, source = _body(hull, gm, profile.roll_gyradius_m, kyy), "gyradius"
    elif tr is not None and gm is not None:
        body, source = _inertia_for_period(hull, gm, kyy, tr, "roll_period_s"), "roll period"
    elif tr is not None:
        body = _body(hull, _gm_for_period(hull, kxx_default, kyy, tr), kxx_default, kyy)
        source = "roll period, default 0.35 B"
    elif profile.is_code_roll_period_applies:
        t_is = float(imo_roll_period_s(profile.beam_m, profile.draught_m, profile.length_wl_m, gm))
        body, source = _inertia_for_period(hull, gm, kyy, t_is, "IS Code roll period"), "IS Code"
    else:
        body, source = _body(hull, gm, kxx_default, kyy), "default 0.35 B"
    return StripSetup(hull, body, roll_natural(hull, body).period_s, source)


def _damping_per_speed(setup: StripSetup, profile: VesselProfile, speeds: FloatArray) -> list:
    """Viscous roll damping [N m s/rad] per speed (module docstring)."""
    if profile.roll_damping_ratio is not None:
        b = extra_damping_for_ratio(setup.hull, setup.body, float(profile.roll_damping_ratio))
        return [b] * speeds.size
    wn = 2.0 * math.pi / setup.roll_period_s
    amp = math.radians(IKEDA_ROLL_AMPLITUDE_DEG)
    return [float(ikeda_friction_lift(setup.hull, setup.body, wn, amp, float(u))[0]) for u in speeds]


def _to_station_axes(r: eq.StripRaos) -> NDArray[np.complex128]:
    """(omega, heading, 5) RAOs at O in station axes (module docstring) from RAOs at G."""
    heave_o = r.heave_m_m + r.x_g_m * r.pitch_rad_m
    sway_o = r.sway_m_m - r.x_g_m * r.yaw_rad_m + r.z_g_m * r.roll_rad_m
    return np.stack([heave_o, r.pitch_rad_m, -r.roll_rad_m, -sway_o, -r.yaw_rad_m], axis=-1)


def _mirror(half: NDArray[np.complex128]) -> NDArray[np.complex128]:
    """Headings 0..180 -> 0..360 inclusive (symmetric hull: sway, roll, yaw odd)."""
    sign = np.array([1.0, 1.0, -1.0, -1.0, -1.0])
    other = half[:, :, -2:0:-1, :] * sign  # 185..355 from 175..5
    return np.concatenate([half, other, half[:, :, :1, :]], axis=2)


@dataclass(frozen=True)
class StripTransfer:
    """Strip-theory transfer model of one profile (module docstring).

    ``rao`` (speed, omega, heading, 5) complex, modes :data:`MODES`, headings 0..360 inclusive;
    ``roll_period_s`` natural roll period at zero speed; ``roll_damping_n_m_s`` viscous roll
    damping per speed; ``zeta_total`` total roll damping ratio at omega_n and zero speed;
    ``hull_ok`` the L/B and B/T method limits; ``length_m``.
    """

    speeds_m_s: FloatArray
    omega_rad_s: FloatArray
    heading_deg: FloatArray
    rao: NDArray[np.complex128]
    roll_period_s: float
    roll_damping_n_m_s: FloatArray
    zeta_total: float
    roll_inertia_source: str
    damping_source: str
    hull_ok: bool
    length_m: float
    zeta_per_speed: FloatArray
    g_m_s2: float = G_STANDARD_M_S2
    complex_motions: bool = True
    name: str = "strip theory (Salvesen, Tuck & Faltinsen 1970; Lewis sections)"
    cache_key: Optional[str] = None
    """Content key of the profile it was built from (:func:`.rao_cache.profile_key`); the response
    tables' disk cache uses it (:func:`.table_cache.transfer_cache_key`)."""

    def validity(self, speed_m_s: ArrayLike) -> NDArray[np.bool_]:
        """Froude number <= 0.40 and the hull's L/B and B/T limits (:mod:`.strip.validity`)."""
        from .strip.validity import FROUDE_MAX

        u = np.atleast_1d(np.asarray(speed_m_s, dtype=float))
        return (u / math.sqrt(self.g_m_s2 * self.length_m) <= FROUDE_MAX + 1e-12) & self.hull_ok

    def covered(self, omega_rad_s: FloatArray) -> None:
        """Every frequency is covered (module docstring: edge values below, zero above)."""
        return None

    def evaluate_complex(self, omega_rad_s: ArrayLike, rel_heading_deg: ArrayLike,
                         speed_m_s: ArrayLike) -> ComplexMotionTransfer:
        """Interpolated RAOs (module docstring) for broadcasting omega, mu [deg] and speed."""
        om, mu, su = (np.asarray(v, dtype=float) for v in (omega_rad_s, rel_heading_deg, speed_m_s))
        shape = np.broadcast_shapes(om.shape, mu.shape, su.shape)
        parts = self.evaluate_parts(*(np.broadcast_to(v, shape).reshape(-1, 1, 1) for v in (om, mu, su)))
        z = parts[0::2] + 1j * parts[1::2]
        return ComplexMotionTransfer(*(z[i].reshape(shape) for i in range(len(MODES))))

    def evaluate_parts(self, omega_rad_s: FloatArray, rel_heading_deg: FloatArray,
                       speed_m_s: FloatArray) -> FloatArray:
        """Real and imaginary parts (10, ...) of the interpolated RAOs (re, im of each of
        :data:`MODES`) for omega (c, ..., nf, 1), mu (c, ..., 1, nd) and speed (c, 1, ..., 1):
        the fast path of :mod:`.response` (samples grouped by speed, separable indices)."""
        shape = np.broadcast_shapes(omega_rad_s.shape, rel_heading_deg.shape, speed_m_s.shape)
        out = np.empty((2 * len(MODES),) + shape)
        su = speed_m_s.reshape(speed_m_s.shape[0], -1)[:, 0]
        for u in np.unique(su):
            rows = np.flatnonzero(su == u)
            sel = slice(rows[0], rows[-1] + 1) if rows.size == rows[-1] - rows[0] + 1 else rows
            om = np.broadcast_to(omega_rad_s, (su.size,) + omega_rad_s.shape[1:])[sel]
            mu = np.broadcast_to(rel_heading_deg, (su.size,) + rel_heading_deg.shape[1:])[sel]
            out[:, sel] = self._at_speed(float(u), om, mu)
        return out

    def resonance(self, omega_rad_s: FloatArray, mu_deg: FloatArray, u: float) -> NDArray[np.complex128]:
        """Roll resonance factor D (module docstring) at speed u [m/s], zeta interpolated."""
        re, im = self._resonance_parts(omega_rad_s, mu_deg, u)
        return re + 1j * im

    def _resonance_parts(self, omega_rad_s: FloatArray, mu_deg: FloatArray, u: float) -> Tuple[FloatArray, FloatArray]:
        wn = 2.0 * math.pi / self.roll_period_s
        zeta = float(np.interp(u, self.speeds_m_s, self.zeta_per_speed))
        we = (omega_rad_s - omega_rad_s ** 2 * (u / self.g_m_s2) * np.cos(np.radians(mu_deg))) * (1.0 / wn)
        return 1.0 - we * we, (2.0 * zeta) * we

    def _speed_slice(self, u: float) -> FloatArray:
        """RAO parts (10, omega * heading) blended linearly between the speed nodes around u."""
        sp = self.speeds_m_s
        i = int(np.clip(np.searchsorted(sp, u, side="right") - 1, 0, sp.size - 2))
        t = float(np.clip((u - sp[i]) / (sp[i + 1] - sp[i]), 0.0, 1.0))
        r = self.rao[i] * (1.0 - t) + self.rao[i + 1] * t if t > 0 else self.rao[i]
        r = r.reshape(-1, r.shape[-1])
        # single precision for the gather (memory traffic); RAOs need ~1e-4 relative at most
        return np.ascontiguousarray(np.stack([r.real, r.imag], axis=-1).reshape(r.shape[0], -1).T,
                                    dtype=np.float32)

    def _at_speed(self, u: float, om: FloatArray, mu: FloatArray) -> FloatArray:
        """Bilinear (log omega, heading) interpolation at one speed, divided by the resonance
        factor for sway, roll and yaw; zero above the frequency grid. om (..., nf, 1) and
        mu (..., 1, nd) keep their own axes so the indices are computed once per axis."""
        flat = self._speed_slice(u)
        lw = np.log(self.omega_rad_s)
        x = (np.log(om) - lw[0]) * (1.0 / (lw[1] - lw[0]))
        i = np.clip(np.floor(x), 0, lw.size - 2).astype(np.int64)
        inside = x <= lw.size - 1
        tf = (np.clip(x - i, 0.0, 1.0) * inside).astype(np.float32)  # zero weight above the grid
        t0 = ((1.0 - np.clip(x - i, 0.0, 1.0)) * inside).astype(np.float32)  # on both corners
        h = np.mod(mu, 360.0) * (1.0 / HEADING_STEP_DEG)
        j = np.clip(np.floor(h), 0, self.heading_deg.size - 2).astype(np.int64)
        th = np.clip(h - j, 0.0, 1.0).astype(np.float32)
        nh = self.heading_deg.size
        base = i * nh + j
        val = np.take(flat, base, axis=1) * (t0 * (1 - th))
        for off, w in ((1, t0 * th), (nh, tf * (1 - th)), (nh + 1, tf * th)):
            val += np.take(flat, base + off, axis=1) * w
        dre, dim = (a.astype(np.float32) for a in self._resonance_parts(om, mu, u))
        den = 1.0 / (dre * dre + dim * dim)
        for m in range(2, len(MODES)):
            a, b = val[2 * m].copy(), val[2 * m + 1]
            val[2 * m] = (a * dre + b * dim) * den
            val[2 * m + 1] = (b * dre - a * dim) * den
        return val


def _grids(length_m: float, g: float) -> Tuple[FloatArray, FloatArray, FloatArray]:
    """Speed [m/s], wave frequency [rad/s] and half-circle heading [deg] nodes."""
    speeds = FROUDE_NODES * math.sqrt(g * length_m)
    omega = np.geomspace(NU_RANGE[0], NU_RANGE[1], N_OMEGA) * math.sqrt(g / length_m)
    return speeds, omega, np.arange(0.0, 180.0 + 1e-9, HEADING_STEP_DEG)


def build_strip_transfer(profile: VesselProfile, g_m_s2: float = G_STANDARD_M_S2) -> StripTransfer:
    """Compute the strip-theory RAO set of ``profile`` (deep water; no disk cache here: see
    :func:`.rao_cache.cached_strip_transfer`)."""
    setup = strip_setup(profile, g_m_s2)
    hull = setup.hull
    speeds, omega, half = _grids(hull.length_m, g_m_s2)
    extra = _damping_per_speed(setup, profile, speeds)
    raos = eq.strip_rao_set(hull, setup.body, omega, omega ** 2 / g_m_s2, half, speeds, extra)
    nat = roll_natural(hull, setup.body)
    zetas = (nat.wave_damping_n_m_s + np.asarray(extra, dtype=float)) / nat.critical_damping_n_m_s
    rao = _mirror(np.stack([_to_station_axes(r) for r in raos]))
    heads = np.arange(0.0, 360.0 + 1e-9, HEADING_STEP_DEG)
    part = StripTransfer(speeds, omega, heads, rao, float(setup.roll_period_s), np.zeros(1), 0.0, "", "",
                         True, hull.length_m, zetas, g_m_s2)
    for i, u in enumerate(speeds):
        rao[i, :, :, 2:] *= part.resonance(omega[:, None], heads[None, :], float(u))[..., None]
    val = strip_validity(hull.length_m, hull.beam_m, hull.draught_m, [0.0], [180.0], 1.0, g_m_s2)
    damping_source = "ratio" if profile.roll_damping_ratio is not None else "Ikeda (friction, lift; eddy left out)"
    return StripTransfer(
        speeds_m_s=speeds, omega_rad_s=omega, heading_deg=np.arange(0.0, 360.0 + 1e-9, HEADING_STEP_DEG),
        rao=np.ascontiguousarray(rao), roll_period_s=float(setup.roll_period_s),
        roll_damping_n_m_s=np.asarray(extra, dtype=float), zeta_total=float(zetas[0]),
        roll_inertia_source=setup.roll_inertia_source, damping_source=damping_source,
        hull_ok=bool(val.slender_ok and val.section_ok), length_m=float(hull.length_m),
        zeta_per_speed=zetas, g_m_s2=g_m_s2)


def roll_summary(profile: VesselProfile, g_m_s2: float = G_STANDARD_M_S2) -> str:
    """The strip model's natural roll period and zero-speed roll damping ratio of ``profile``
    with their sources, without the RAO set (about 1 s: the 2-D tables)."""
    setup = strip_setup(profile, g_m_s2)
    extra = _damping_per_speed(setup, profile, np.zeros(1))[0]
    nat = roll_natural(setup.hull, setup.body)
    zeta = (nat.wave_damping_n_m_s + extra) / nat.critical_damping_n_m_s
    damping = "ratio" if profile.roll_damping_ratio is not None else "Ikeda (friction, lift; eddy left out)"
    return (f"strip theory: natural roll period {setup.roll_period_s:.2f} s ({setup.roll_inertia_source}), "
            f"roll damping {100 * zeta:.1f} % of critical at zero speed ({damping})")


def transfer_summary(t: Any) -> Optional[str]:
    """One line for people: roll period, damping and their sources (None for other models)."""
    if not isinstance(t, StripTransfer):
        return None
    return (f"strip theory: natural roll period {t.roll_period_s:.2f} s ({t.roll_inertia_source}), "
            f"roll damping {100 * t.zeta_total:.1f} % of critical at zero speed ({t.damping_source})")
