# SPDX-License-Identifier: GPL-2.0-or-later
"""Linear strip-theory seakeeping engine (Salvesen, Tuck & Faltinsen 1970) with Lewis sections.

Numerical heart; it imports the standard library, numpy, scipy and the core's base module
``validation`` (its errors are :class:`..validation.SeawayInputError`).

Axes and signs used in every module of this package (decided once):

* Ship axes: x forward from midship (the station axis of the hull sections), y to port, z up,
  origin O at midship in the calm waterline (right-handed; the same axes as capytaine's).
* Motions: heave eta3 and sway eta2 [m]; roll eta4 positive port side up (right hand about +x),
  pitch eta5 positive bow down (right hand about +y), yaw eta6 positive bow to port [rad].
  Vertical displacement of a hull point (x, y): eta3 - x*eta5 + y*eta4; lateral (to port):
  eta2 + x*eta6 - z*eta4.
* Relative heading mu on the seakeeping scale (ITTC): 180 head seas, 90 beam seas with waves
  from port, 0 following; measured clockwise from the bow to the propagation direction, so the
  waves travel along (cos mu, -sin mu) in (x, y).
* Time convention exp(+i omega_e t); complex amplitudes are per unit wave amplitude with the
  phase of the incident wave crest at O. Incident elevation at (x, y):
  zeta = a exp(i omega_e t) exp(-i k (x cos mu - y sin mu)).
* Units: SI, names carry units (omega_rad_s, k_rad_m, speed_m_s).
"""
from __future__ import annotations

from ...validation import SeawayInputError


class StripInputError(SeawayInputError):
    """Bad input to the strip-theory engine; the message names the input, its value and a fix."""
