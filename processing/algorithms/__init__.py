# SPDX-License-Identifier: GPL-2.0-or-later
"""Processing algorithms of Seaway Comfort: one module per algorithm.

ALGORITHM_CLASSES is the single list the provider loads.
"""
from __future__ import annotations

from typing import Tuple

from .comfort_track import ComfortTrackAlgorithm
from .departure_sweep import DepartureSweepAlgorithm
from .describe_sea_state import DescribeSeaStateAlgorithm
from .route_comfort import RouteComfortAlgorithm
from .seasonal_climate import SeasonalClimateAlgorithm

ALGORITHM_CLASSES: Tuple[type, ...] = (
    RouteComfortAlgorithm,
    DepartureSweepAlgorithm,
    ComfortTrackAlgorithm,
    SeasonalClimateAlgorithm,
    DescribeSeaStateAlgorithm,
)
