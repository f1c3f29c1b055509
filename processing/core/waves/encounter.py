# SPDX-License-Identifier: GPL-2.0-or-later
"""Relative wave heading and encounter frequency/period of a vessel under way.

Conventions (degrees true, clockwise from north):

* ``course_deg``: direction the vessel goes TO (for motions: heading through the water).
* ``wave_from_deg``: direction the waves come FROM (nautical convention of wave forecasts).
* relative heading mu (ITTC seakeeping convention, ITTC Symbols and Terminology List): angle
  from the ship's forward axis to the wave propagation direction, measured clockwise seen from
  above: mu = (wave_from + 180 - course) mod 360; 0 following, 90 beam with waves from port,
  180 head, 270 beam with waves from starboard.
* IMO angle of encounter alpha (IMO MSC.1/Circ.1228, symbol table): 0 head sea, 90 sea from
  starboard: alpha = (wave_from - course) mod 360 = (mu + 180) mod 360.

Encounter frequency of a regular wave (Lewis (ed.) 1989, Principles of Naval Architecture
vol. III ch. 8; Lloyd 1989, Seakeeping: Ship Behaviour in Rough Weather):
omega_e = omega - k U cos(mu) [rad/s], U speed through the water [m/s], k from the Airy
dispersion relation (:mod:`.dispersion`). Encounter period T_e = 2 pi / |omega_e|
= L / |c - U cos mu|. The vessel outruns the crests (overtaking) when U cos mu >= c.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Optional, Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from .dispersion import wave_kinematics
from ..units import G_STANDARD_M_S2, RAD_PER_DEG, FloatArray, wrap_deg
from ..validation import SeawayInputError, as_float_array, require_nonnegative, require_positive

__all__ = [
    "relative_heading_deg",
    "fold_heading_deg",
    "cos_deg",
    "encounter_frequency_rad_s",
    "EncounterPeriod",
    "encounter_period",
    "imo_angle_of_encounter_deg",
]


def _angles(course_deg: ArrayLike, wave_from_deg: ArrayLike) -> Tuple[FloatArray, FloatArray]:
    course = as_float_array("course_deg", course_deg)
    wave_from = as_float_array("wave_from_deg", wave_from_deg)
    try:
        np.broadcast_shapes(course.shape, wave_from.shape)
    except ValueError as exc:
        raise SeawayInputError(
            f"course_deg {course.shape} and wave_from_deg {wave_from.shape} do not broadcast"
        ) from exc
    return course, wave_from


def cos_deg(angle_deg: ArrayLike) -> FloatArray:
    """cos of an angle in degrees, exactly 0 at odd multiples of 90 deg (and exactly +-1 at
    multiples of 180), so beam seas give omega_e == omega without rounding residue."""
    a = wrap_deg(as_float_array("angle_deg", angle_deg))
    c = np.cos(a * RAD_PER_DEG)
    c = np.where((a == 90.0) | (a == 270.0), 0.0, c)
    c = np.where(a == 0.0, 1.0, np.where(a == 180.0, -1.0, c))
    return np.asarray(c, dtype=float)


def relative_heading_deg(course_deg: ArrayLike, wave_from_deg: ArrayLike) -> FloatArray:
    """Relative wave heading mu [deg] in [0, 360), ITTC convention (180 head, 0 following).

    mu = (wave_from + 180 - course) mod 360; 90 = beam seas from port, 270 = from starboard.

    Parameters
    ----------
    course_deg : course/heading the vessel goes TO [deg true], finite.
    wave_from_deg : direction the waves come FROM [deg true], finite. Broadcasts with course.
    """
    course, wave_from = _angles(course_deg, wave_from_deg)
    return wrap_deg(wave_from + 180.0 - course)


def fold_heading_deg(rel_heading_deg: ArrayLike) -> FloatArray:
    """Relative heading folded to [0, 180] deg for a port/starboard-symmetric hull.

    mu' = 180 - |180 - (mu mod 360)|; cos mu' = cos mu and |sin mu'| = |sin mu|.
    """
    mu = wrap_deg(as_float_array("rel_heading_deg", rel_heading_deg))
    return 180.0 - np.abs(180.0 - mu)


def imo_angle_of_encounter_deg(course_deg: ArrayLike, wave_from_deg: ArrayLike) -> FloatArray:
    """IMO angle of encounter alpha [deg] in [0, 360) (MSC.1/Circ.1228 symbol table).

    alpha = (wave_from - course) mod 360: 0 = head sea, 90 = sea from starboard,
    180 = following sea. Related to the ITTC heading by alpha = (mu + 180) mod 360.
    """
    course, wave_from = _angles(course_deg, wave_from_deg)
    return wrap_deg(wave_from - course)


def encounter_frequency_rad_s(
    omega_rad_s: ArrayLike,
    k_rad_m: ArrayLike,
    speed_m_s: ArrayLike,
    rel_heading_deg: ArrayLike,
) -> FloatArray:
    """Signed encounter frequency omega_e = omega - k U cos(mu) [rad/s].

    PNA vol. III (Lewis 1989) ch. 8. Negative when the vessel overtakes the waves
    (U cos mu > c); motions see |omega_e|. All arguments broadcast.

    Parameters
    ----------
    omega_rad_s : absolute wave frequency [rad/s], > 0.
    k_rad_m : wavenumber [rad/m], > 0 (from :func:`.dispersion.wavenumber_rad_m`).
    speed_m_s : speed through the water U [m/s], >= 0.
    rel_heading_deg : ITTC relative heading mu [deg] (180 head seas).
    """
    omega = require_positive("omega_rad_s", omega_rad_s)
    k = require_positive("k_rad_m", k_rad_m)
    speed = require_nonnegative("speed_m_s", speed_m_s)
    c = cos_deg(as_float_array("rel_heading_deg", rel_heading_deg))
    try:
        np.broadcast_shapes(omega.shape, k.shape, speed.shape, c.shape)
    except ValueError as exc:
        raise SeawayInputError(
            f"omega_rad_s {omega.shape}, k_rad_m {k.shape}, speed_m_s {speed.shape} and "
            f"rel_heading_deg {c.shape} do not broadcast"
        ) from exc
    return np.asarray(omega - k * speed * c, dtype=float)


@dataclass(frozen=True)
class EncounterPeriod:
    """Encounter of a regular wave: all fields share one broadcast shape.

    Fields: ``period_s`` T_e = 2 pi / |omega_e| [s] (inf where omega_e == 0);
    ``omega_e_rad_s`` signed encounter frequency [rad/s]; ``overtaking`` True where
    U cos mu >= c (the vessel keeps pace with or outruns the crests, waves appear from ahead).
    """

    period_s: FloatArray
    omega_e_rad_s: FloatArray
    overtaking: NDArray[np.bool_]


def encounter_period(
    period_s: ArrayLike,
    speed_m_s: ArrayLike,
    rel_heading_deg: ArrayLike,
    depth_m: Optional[ArrayLike] = None,
    *,
    g_m_s2: float = G_STANDARD_M_S2,
) -> EncounterPeriod:
    """Encounter period and frequency of regular waves of period T met at speed U, heading mu.

    omega = 2 pi / T, k from omega**2 = g k tanh(kh) (:mod:`.dispersion`),
    omega_e = omega - k U cos(mu), T_e = 2 pi / |omega_e| = L / |c - U cos mu|
    (PNA vol. III ch. 8, Lewis 1989). In deep water omega_e = omega - omega**2 U cos(mu) / g.

    Parameters
    ----------
    period_s : absolute wave period T [s], > 0.
    speed_m_s : speed through the water U [m/s], >= 0.
    rel_heading_deg : ITTC relative heading mu [deg] (0 following, 180 head).
    depth_m : depth [m] > 0, None/inf = deep water.
    g_m_s2 : gravity [m/s^2].

    Raises
    ------
    SeawayInputError
        speed < 0, period <= 0, bad depth, non-finite values.
    """
    speed = require_nonnegative("speed_m_s", speed_m_s)
    kin = wave_kinematics(period_s, depth_m, g_m_s2=g_m_s2)
    period = require_positive("period_s", period_s)
    mu = as_float_array("rel_heading_deg", rel_heading_deg)
    try:
        shape = np.broadcast_shapes(kin.k_rad_m.shape, speed.shape, mu.shape)
    except ValueError as exc:
        raise SeawayInputError(
            f"period_s/depth_m {kin.k_rad_m.shape}, speed_m_s {speed.shape} and "
            f"rel_heading_deg {mu.shape} do not broadcast"
        ) from exc
    omega = np.broadcast_to(2.0 * math.pi / period, kin.k_rad_m.shape)
    u_cos = speed * cos_deg(mu)
    omega_e = np.broadcast_to(omega - kin.k_rad_m * u_cos, shape)
    abs_e = np.abs(omega_e)
    with np.errstate(divide="ignore"):
        te = np.where(abs_e > 0, 2.0 * math.pi / np.where(abs_e > 0, abs_e, 1.0), np.inf)
    overtaking = np.broadcast_to(u_cos >= kin.celerity_m_s, shape)
    return EncounterPeriod(
        period_s=np.asarray(te, dtype=float),
        omega_e_rad_s=np.array(omega_e, dtype=float),
        overtaking=np.array(overtaking, dtype=bool),
    )
