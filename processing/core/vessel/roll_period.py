# SPDX-License-Identifier: GPL-2.0-or-later
"""Natural roll period of a vessel estimated from its main particulars (IMO IS Code formula)."""
from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

from ..units import FloatArray
from ..validation import SeawayInputError, require_positive, show

__all__ = ["imo_roll_period_s"]


def imo_roll_period_s(beam_m: ArrayLike, draught_m: ArrayLike, length_wl_m: ArrayLike, gm_m: ArrayLike) -> FloatArray:
    """Natural roll period T [s] of the IMO 2008 IS Code (Res. MSC.267(85)) weather criterion.

    T = 2 C B / sqrt(GM), C = 0.373 + 0.023 (B/d) - 0.043 (Lwl/100); B moulded breadth, d mean
    moulded draught, Lwl waterline length, GM corrected for free surface, all in m.
    """
    B = require_positive("beam_m", beam_m)
    d = require_positive("draught_m", draught_m)
    L = require_positive("length_wl_m", length_wl_m)
    gm = require_positive("gm_m", gm_m)
    C = 0.373 + 0.023 * (B / d) - 0.043 * (L / 100.0)
    if np.any(C <= 0):
        raise SeawayInputError(
            f"IMO roll-period coefficient C = 0.373 + 0.023 B/d - 0.043 L/100 is <= 0 for "
            f"beam_m={show(B)}, draught_m={show(d)}, length_wl_m={show(L)}; give roll_period_s instead"
        )
    return np.asarray(2.0 * C * B / np.sqrt(gm), dtype=float)
