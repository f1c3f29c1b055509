# SPDX-License-Identifier: GPL-2.0-or-later
"""The passage pipeline: one leg from route vertices to per-sample motions and comfort.

Three plain steps, each reusable on its own (a departure sweep repeats steps 2-3 on the stacked
tracks of many departures; a seasonal climate repeats them over hindcast chunks):

1. :func:`.plan.plan_passage` - geodesic samples along the leg and their arrival times (UTC);
2. :func:`.sample.sample_sea` - sea state (combined and partitions) and depth at each sample and
   time, first valid source wins, per-sample flags kept;
3. :func:`.respond.respond` - peak-component wave kinematics at the local depth, relative
   heading, encounter period, the vessel's motion statistics and comfort indices, and the
   cumulative motion sickness dose along the passage (formulas and sources in :mod:`.respond`).

:func:`compute_passage` chains the three. Samples without sea data are kept with NaN motions
and their flags (never zero, never dropped); their comfort class is :data:`NOT_COMPUTED_CLASS`.
The names below are re-exported so that ``passage.pipeline`` stays the one import for callers.
"""
from __future__ import annotations

from typing import Optional, Sequence

from numpy.typing import ArrayLike

from .plan import PassagePlan, Track, as_utc_datetime64, plan_passage
from .progress import PassageCancelled, Progress, Span
from .respond import RESPONSE_CHUNK, SHALLOW_DEPTH_PER_WAVELENGTH, respond, respond_motions
from .result import NOT_COMPUTED_CLASS, PassageResult, PassageSummary
from .sample import (
    DEFAULT_LAND_SEARCH_KM,
    DEFAULT_TIME_TOLERANCE_S,
    SeaAtSamples,
    check_departure_in_forecast,
    sample_sea,
    sample_sea_at,
    source_display_name,
    source_time_range,
)

__all__ = [
    "NOT_COMPUTED_CLASS", "DEFAULT_LAND_SEARCH_KM", "DEFAULT_TIME_TOLERANCE_S", "RESPONSE_CHUNK",
    "SHALLOW_DEPTH_PER_WAVELENGTH", "PassageCancelled", "Track", "PassagePlan", "SeaAtSamples",
    "PassageResult", "PassageSummary", "as_utc_datetime64", "plan_passage", "check_departure_in_forecast",
    "sample_sea", "sample_sea_at", "respond", "respond_motions", "source_display_name",
    "source_time_range", "compute_passage",
]


def compute_passage(
    route_lon_deg: ArrayLike,
    route_lat_deg: ArrayLike,
    *,
    departure_utc: object,
    speed_kn: float,
    sea_states: Sequence[object],
    profile: object,
    station: Optional[str] = None,
    depth: Optional[object] = None,
    spacing_nm: float = 1.0,
    gamma: float = 3.3,
    spread_s: float = 4.0,
    long_crested: bool = False,
    progress: Optional[Progress] = None,
    leg: int = 0,
    method: Optional[str] = None,
    land_search_km: float = DEFAULT_LAND_SEARCH_KM,
    time_tolerance_s: float = DEFAULT_TIME_TOLERANCE_S,
) -> PassageResult:
    """The whole pipeline for one leg: plan -> sample the sea -> respond.

    ``progress(fraction) -> bool`` is called with 0..1; returning False raises
    :class:`PassageCancelled`. Bad input raises :class:`SeawayInputError` naming the input.
    """
    span = Span(progress)
    span.check(0.0)
    plan = plan_passage(route_lon_deg, route_lat_deg, departure_utc=departure_utc, speed_kn=speed_kn,
                        spacing_nm=spacing_nm, leg=leg)
    span.check(0.05)
    sea = sample_sea(plan, sea_states, depth=depth, land_search_km=land_search_km,
                     time_tolerance_s=time_tolerance_s, progress=span.part(0.05, 0.5))
    return respond(plan, sea, profile, station=station, gamma=gamma, spread_s=spread_s,
                   long_crested=long_crested, method=method, progress=span.part(0.5, 1.0))
