# SPDX-License-Identifier: GPL-2.0-or-later
"""Method limits of the strip-theory engine, per (speed, heading).

Ranges chosen here (justification; no single published table):

* Froude number Fn = U / sqrt(g L) <= 0.40: STF 1970 is a slender-body theory for displacement
  hulls at moderate speed; its authors and later comparisons (e.g. Journee 1992, Wigley hulls
  at Fn 0.2-0.4) show good heave/pitch up to about Fn 0.3 and a degrading pitch above it
  (from memory). Above 0.4 dynamic lift and trim change the problem (semi-planing).
* L/B >= 4: slenderness assumption of strip theory (common practice, no source; the Wigley
  hulls tested by Journee 1992 have L/B 5-10 and the BEM checks here L/B 5-10).
* 1.0 <= B/T <= 6.0: Lewis forms fit conventional sections in about this range; very wide
  shallow or very deep narrow sections lie outside the forms the Ursell-Tasai tables were
  checked on (common practice, no source).
* Following and quartering seas with |omega_e| near 0 (overtaking, cos mu > 0 and
  U cos mu > 0.7 c_phase, the wave celerity): strip theory's U/omega_e^2 terms dominate; flagged.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from . import StripInputError

FROUDE_MAX = 0.40
LENGTH_BEAM_MIN = 4.0
BEAM_DRAUGHT_RANGE = (1.0, 6.0)
SLOW_ENCOUNTER_FRACTION = 0.7


@dataclass(frozen=True)
class StripValidity:
    """Booleans (True = within limits), shape (speed, heading) unless stated."""

    froude_ok: NDArray[np.bool_]
    slender_ok: bool
    section_ok: bool
    encounter_ok: NDArray[np.bool_]

    @property
    def all_ok(self) -> NDArray[np.bool_]:
        return self.froude_ok & self.encounter_ok & self.slender_ok & self.section_ok


def strip_validity(length_m: float, beam_m: float, draught_m: float, speed_m_s: ArrayLike,
                   heading_deg: ArrayLike, peak_phase_speed_m_s: float,
                   g_m_s2: float = 9.81) -> StripValidity:
    """Method-limit flags per (speed, heading); ``peak_phase_speed_m_s`` is the phase speed of
    the waves that matter (e.g. at the spectral peak) for the overtaking check."""
    for name, v in (("length_m", length_m), ("beam_m", beam_m), ("draught_m", draught_m),
                    ("peak_phase_speed_m_s", peak_phase_speed_m_s), ("g_m_s2", g_m_s2)):
        if not (math.isfinite(v) and v > 0):
            raise StripInputError(f"{name} = {v!r}: must be a positive number")
    u = np.atleast_1d(np.asarray(speed_m_s, dtype=float))
    mu = np.atleast_1d(np.asarray(heading_deg, dtype=float))
    if np.any(~np.isfinite(u)) or np.any(u < 0):
        raise StripInputError("speed_m_s must be finite and >= 0")
    if np.any(~np.isfinite(mu)):
        raise StripInputError("heading_deg must be finite")
    fn = u / math.sqrt(g_m_s2 * length_m)
    froude = np.repeat((fn <= FROUDE_MAX)[:, None], mu.size, axis=1)
    along = u[:, None] * np.cos(np.deg2rad(mu))[None, :]
    encounter = along <= SLOW_ENCOUNTER_FRACTION * peak_phase_speed_m_s
    lo, hi = BEAM_DRAUGHT_RANGE
    return StripValidity(froude, length_m / beam_m >= LENGTH_BEAM_MIN,
                         lo <= beam_m / draught_m <= hi, encounter)
