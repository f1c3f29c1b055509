# SPDX-License-Identifier: GPL-2.0-or-later
"""The colours of every output, in one place: the reports and the QGIS styling both read them.

Comfort classes: five warm colours of our own (straw to plum), ordered from light to dark so that
the classes stay apart by lightness alone (readable under the common colour-vision deficiencies
and in grey-scale print) and apart from the blues of a depth layer, with a neutral grey for
samples without results.

Climate shares (percentages): five steps of "share of time within the acceptable class" in a
sequential green of their own, pale for rarely acceptable to deep green for nearly always
acceptable, ordered by lightness and kept apart from every comfort colour so that a percentage
is never read as a comfort class; the same grey for no data.
"""
from __future__ import annotations

import math
from typing import Optional, Tuple

import numpy as np

__all__ = ["COMFORT_PALETTE", "NOT_COMPUTED_COLOUR", "comfort_colour", "SHARE_PALETTE", "SHARE_BOUNDS",
           "NO_DATA_COLOUR", "share_bin"]

COMFORT_PALETTE: Tuple[str, ...] = ("#f6e8a6", "#e7b43f", "#d9722b", "#a8283f", "#3b1030")
"""Fill colours for comfort classes 0..4 (smooth, steady, lively, taxing, punishing): pale straw,
gold, orange, crimson, near-black plum. CIE L* about 92, 76, 59, 38, 13 (order readable without
hue, also in grey-scale print). Chosen to stay off the blues of bathymetry: CIE76 colour
difference >= 25 from every step of a 9-step light-to-dark blue depth ramp (plain and at 55 %
opacity over white), and >= 16 between classes, with normal vision and under simulated
deuteranopia and protanopia (Machado, Oliveira & Fernandes 2009, severity 1); checked in
tests/core/test_palette.py."""

NOT_COMPUTED_COLOUR: str = "#9a9a9a"
"""Colour of samples without results (no sea data, outside the grid or the time range)."""

SHARE_PALETTE: Tuple[str, ...] = ("#e6f2e8", "#c8e0a0", "#8cbd62", "#4a8a3a", "#1c4f24")
"""Fill colours for shares of acceptable time in [0, .2), [.2, .4), [.4, .6), [.6, .8), [.8, 1];
CIE L* about 94, 86, 71, 52, 29 (light = low share, dark = high share)."""

SHARE_BOUNDS: Tuple[float, ...] = (0.2, 0.4, 0.6, 0.8)
"""Upper bounds of the first four share steps (share 0..1)."""

NO_DATA_COLOUR: str = NOT_COMPUTED_COLOUR
"""Colour of climate cells without data."""


def comfort_colour(comfort_class: int) -> str:
    """Colour of a comfort class 0..4; :data:`NOT_COMPUTED_COLOUR` for any other value (-1)."""
    c = int(comfort_class)
    return COMFORT_PALETTE[c] if 0 <= c < len(COMFORT_PALETTE) else NOT_COMPUTED_COLOUR


def share_bin(share: Optional[float]) -> int:
    """Palette step 0..4 of a share 0..1 (-1 for NaN)."""
    if share is None or not math.isfinite(float(share)):
        return -1
    return int(np.searchsorted(np.asarray(SHARE_BOUNDS), float(share), side="right"))
