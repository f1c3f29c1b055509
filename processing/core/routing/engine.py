# SPDX-License-Identifier: GPL-2.0-or-later
"""Comfort-optimal tracks: the reference and three alternatives from one call.

1. Check the inputs and the start and end (:func:`check_ends`).
2. Build the lattice around the reference (:mod:`.lattice`) and mark every edge that crosses
   a barrier, shallow water, the forecast's land or leaves the grid (:mod:`.legality`).
3. Tabulate the dose of every legal edge at every start time it can be reached
   (:mod:`.edge_costs`; slots of ``slot_h`` hours inside the edge's window between the earliest
   arrival, by the direct geodesic, and the latest that still meets the detour budget): all
   edges x slots in one batch of passage-step calls.
4. Set the time-vs-exposure labels stage by stage (:mod:`.search`) and pick fastest, balanced
   and gentlest on the front; smooth each (:mod:`.smooth`).
5. Evaluate the reference and every alternative with the passage engine itself
   (:func:`..passage.pipeline.compute_passage`, the same call and settings as a route
   assessment), so the figures of a track equal those of a route assessment of that line.

Exposure is the motion sickness dose (ISO 2631-1:1997 Annex D): ``gentlest`` has the least
MSDV at arrival the search found, ``fastest`` the least time within the same constraints. Every
result carries :data:`..flags.CAUTION`: a track is a planning aid, not a passage plan.
"""
from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Dict, Optional, Sequence, Tuple

import numpy as np

from ..flags import CAUTION, NOT_COMPUTED_FLAGS, SAFETY_FLAGS, flag_codes
from ..passage.pipeline import PassageResult, check_departure_in_forecast, compute_passage
from ..passage.plan import as_utc_datetime64
from ..passage.progress import Progress, Span
from ..passage.sample import DEFAULT_LAND_SEARCH_KM
from ..units import KNOT_M_S, NAUTICAL_MILE_M, SECONDS_PER_HOUR, FloatArray
from ..validation import SeawayInputError, as_float_array, require_nonnegative, require_positive, show
from .barriers import Barriers
from .edge_costs import ResponseSettings, leg_costs, leg_points
from .lattice import Lattice, build_lattice, lattice_settings
from .legality import REASON_TEXT, Constraints, leg_reasons
from .search import EdgeCostTable, Front, front_picks, label_setting
from .smooth import shortcut, tidy_waypoints

__all__ = ["ALTERNATIVES", "BLOCKED_CODE", "TrackAlternative", "TrackPlan", "plan_tracks", "track_fields"]

ALTERNATIVES: Tuple[str, ...] = ("reference", "fastest", "balanced", "gentlest")
BLOCKED_CODE = "BLOCKED"
"""Track flag: the line itself crosses a barrier, shallow water or the forecast's land."""
OUT_OF_BUDGET = 16
"""Edge reason: no start time inside the detour budget reaches it."""


@dataclass(frozen=True)
class TrackAlternative:
    """One track: ``name`` (one of :data:`ALTERNATIVES`), waypoints ``lon_deg``/``lat_deg``,
    the passage ``result``, ``blocked`` (legality reason bits of its legs, 0 = legal) and its
    place on the searched front (``front_index``, -1 for the reference)."""

    name: str
    lon_deg: FloatArray
    lat_deg: FloatArray
    result: PassageResult
    blocked: int
    front_index: int


@dataclass(frozen=True)
class TrackPlan:
    """The alternatives, the front (``front_hours``, ``front_msdv`` m/s^1.5 as the search
    estimated it), the search's size (``stats``), ``notes`` and the caution."""

    alternatives: Tuple[TrackAlternative, ...]
    front_hours: FloatArray
    front_msdv: FloatArray
    stats: Dict[str, float]
    notes: Tuple[str, ...]
    caution: str = CAUTION

    def get(self, name: str) -> TrackAlternative:
        return next(a for a in self.alternatives if a.name == name)


def track_fields(alt: TrackAlternative) -> Dict[str, object]:
    """The OUTPUT_TRACKS fields of one alternative (NaN where nothing was computed).

    ``worst_class`` highest comfort class met (-1 when none computed); ``hours_taxing`` hours
    at class 3 (taxing) or 4; ``sick_pct_passage`` share who may vomit at arrival (ISO 2631-1
    Annex D); ``flags`` the IMO MSC.1/Circ.1228 guidance flags met anywhere, the codes of
    samples without results, and ``BLOCKED`` when the line crosses a constraint.
    """
    res = alt.result
    s = res.summary()
    hours = s.hours_per_class
    comp = res.comfort_class[res.computed]
    mask = int(np.bitwise_or.reduce(res.flags)) if res.n else 0
    codes = [c for c in flag_codes(mask & int(SAFETY_FLAGS | NOT_COMPUTED_FLAGS)).split(",") if c]
    if alt.blocked:
        codes.append(BLOCKED_CODE)
    return {
        "alternative": alt.name, "dist_nm": s.distance_nm, "hours": s.duration_h, "eta_utc": s.arrival_utc,
        "worst_class": int(comp.max()) if comp.size else -1, "msi_max_pct": s.max_msi_pct,
        "hours_taxing": float(hours.get("taxing", 0.0) + hours.get("punishing", 0.0)),
        "sick_pct_passage": s.final_vomit_pct, "flags": ",".join(codes),
    }


def check_ends(con: Constraints, rs: ResponseSettings, lon: FloatArray, lat: FloatArray) -> None:
    """Raise :class:`SeawayInputError` when the start or the end lies in a barrier, in water
    shallower than the minimum depth, outside every forecast grid, or on the forecast's land
    with no sea cell within the land search radius."""
    from ..flags import SampleFlag
    from .legality import BARRIER, OFF_GRID, SHALLOW, point_reasons

    names = ("start (first vertex of ROUTE)", "end (last vertex of ROUTE)")
    pts = ((float(lon[0]), float(lat[0])), (float(lon[-1]), float(lat[-1])))
    reasons = point_reasons(con, [p[0] for p in pts], [p[1] for p in pts])
    for name, (x, y), r in zip(names, pts, reasons):
        where = f"the {name} at lon {x:.5f}, lat {y:.5f}"
        if r & BARRIER:
            raise SeawayInputError(f"{where} lies inside a BARRIERS polygon: move it into open water")
        if r & SHALLOW:
            raise SeawayInputError(f"{where} lies in water shallower than MIN_DEPTH_M = {con.min_depth_m:g} m "
                                   "(or on land in DEPTH): move it or lower MIN_DEPTH_M")
        if r & OFF_GRID:
            raise SeawayInputError(f"{where} lies outside the grid of every SEA_STATE source")
    sea = np.zeros(2, dtype=bool)
    for src in rs.sea_states:
        try:
            got = src.sample([p[0] for p in pts], [p[1] for p in pts], getattr(src, "time_range_utc")[0],
                             land_search_km=rs.land_search_km)
        except SeawayInputError:
            continue
        sea |= np.asarray(got.valid, dtype=bool)
    for name, (x, y), ok in zip(names, pts, sea):
        if not ok:
            raise SeawayInputError(
                f"the {name} at lon {x:.5f}, lat {y:.5f} lies on land in every SEA_STATE source, with no sea "
                f"cell within {rs.land_search_km:g} km: move it into the sea")


def _legal(lat: Lattice, con: Constraints, budget_s: float, u: float) -> Lattice:
    """The lattice with every edge's reasons (:mod:`.legality`, plus :data:`OUT_OF_BUDGET`)."""
    reason = leg_reasons(con, *lat.edge_ends())
    t_min = lat.to_start_m[lat.stage, lat.k_from] / u
    t_max = budget_s - (lat.length_m + lat.to_end_m[lat.stage + 1, lat.k_to]) / u
    reason[t_max < t_min - 1.0] |= OUT_OF_BUDGET
    return replace(lat, reason=reason)


def _cost_table(lat: Lattice, rs: ResponseSettings, budget_s: float, slot_s: float,
                span: Span) -> Tuple[EdgeCostTable, Dict[str, float], Tuple[str, ...]]:
    """Dose of every legal edge at every start slot it can be reached in (module docstring)."""
    u = rs.speed_kn * KNOT_M_S
    legal = np.flatnonzero(lat.reason == 0)
    t_min = lat.to_start_m[lat.stage, lat.k_from][legal] / u
    t_max = budget_s - (lat.length_m + lat.to_end_m[lat.stage + 1, lat.k_to])[legal] / u
    k0 = np.floor(t_min / slot_s).astype(np.int64)
    k1 = np.maximum(np.ceil(t_max / slot_s).astype(np.int64), k0)
    width = int((k1 - k0).max()) + 1 if legal.size else 1
    slot = k0[:, None] + np.arange(width)[None, :]
    use = slot <= k1[:, None]
    e_rows, j_cols = np.nonzero(use)
    pts = leg_points(*(v[legal] for v in lat.edge_ends()), step_nm=max(lat.settings.stage_nm / 2.0, 0.5))
    costs = leg_costs(pts, e_rows, slot[e_rows, j_cols] * slot_s, rs, progress=span)
    dose = np.full((lat.stage.size, width), np.nan)
    dose[legal[e_rows], j_cols] = costs.dose_m2_s3
    notes = []
    missing = ~np.isfinite(costs.dose_m2_s3)
    if missing.any():
        rate = costs.dose_m2_s3 / (lat.length_m[legal[e_rows]] / u)
        worst = float(np.nanmax(rate)) if np.isfinite(rate).any() else 0.0
        fill = worst * lat.length_m[legal[e_rows[missing]]] / u
        dose[legal[e_rows[missing]], j_cols[missing]] = fill
        notes.append(f"{int(missing.sum())} of {missing.size} edge-time pairs had samples without sea data "
                     "(e.g. after the end of the forecast): the search gave them the highest dose rate met")
    first = np.zeros(lat.stage.size, dtype=np.int64)
    first[legal] = k0
    stats = {"edge_time_pairs": float(e_rows.size), "samples_evaluated": float(pts.count[e_rows].sum())}
    return EdgeCostTable(first, dose, slot_s), stats, tuple(notes)


def _no_track_message(lat: Lattice) -> str:
    """Why no track exists: how many lattice edges each constraint closed."""
    parts = [f"{int(np.count_nonzero(lat.reason & bit))} {text}" for bit, text in REASON_TEXT.items()
             if np.any(lat.reason & bit)]
    return ("no feasible track between the start and the end within MAX_DETOUR_PCT: of "
            f"{lat.reason.size} lattice legs, " + ("; ".join(parts) or "none is closed")
            + ". Allow a longer detour, lower MIN_DEPTH_M, or check BARRIERS and the forecast's coverage")


def _smoothed(lat: Lattice, path: np.ndarray, con: Constraints, rs: ResponseSettings,
              weigh_dose: bool) -> Tuple[FloatArray, FloatArray]:
    """Waypoints of one front path after the smoothing rule (:mod:`.smooth`)."""
    stages = np.arange(path.size)
    lon, lat_ = lat.lon_deg[stages, path], lat.lat_deg[stages, path]
    u = rs.speed_kn * KNOT_M_S
    from .geodesy import inverse

    t = np.r_[0.0, np.cumsum(inverse(lon[:-1], lat_[:-1], lon[1:], lat_[1:])[2])] / u

    def legal(x0, y0, x1, y1):  # type: ignore[no-untyped-def]
        return leg_reasons(con, x0, y0, x1, y1) == 0

    def dose(x0, y0, x1, y1, start_s):  # type: ignore[no-untyped-def]
        pts = leg_points(x0, y0, x1, y1, step_nm=max(lat.settings.stage_nm / 2.0, 0.5))
        return leg_costs(pts, np.arange(np.size(x0)), start_s, rs).dose_m2_s3

    kept = shortcut(lon, lat_, t, legal, dose if weigh_dose else None)
    lon, lat_ = lon[kept], lat_[kept]
    tidy = tidy_waypoints(lon, lat_, legal)
    return lon[tidy], lat_[tidy]


def _checked(route_lon: object, route_lat: object, speed_kn: float, min_depth_m: float,
             max_detour_pct: float) -> Tuple[FloatArray, FloatArray]:
    lon = as_float_array("ROUTE longitudes", route_lon).ravel()
    lat = as_float_array("ROUTE latitudes", route_lat).ravel()
    if lon.size < 2 or lon.size != lat.size:
        raise SeawayInputError(f"ROUTE needs at least 2 vertices (start and end), got {lon.size}")
    require_positive("SPEED_KN", speed_kn)
    require_nonnegative("MIN_DEPTH_M", min_depth_m)
    if not 0.0 < float(max_detour_pct) <= 200.0:
        raise SeawayInputError(f"MAX_DETOUR_PCT must lie in (0, 200] %, got {show(max_detour_pct)}")
    return lon, lat


@dataclass(frozen=True)
class SearchSettings:
    """Tuning of the search: ``slot_h`` start-time step of the edge table [h], ``n_stages``
    (0 = automatic), ``n_side`` offsets per side, ``max_labels`` per node."""

    slot_h: float = 0.5
    n_stages: int = 0
    n_side: int = 12
    max_labels: int = 24


def _search(lon: FloatArray, lat: FloatArray, con: Constraints, rs: ResponseSettings, max_detour_pct: float,
            search: SearchSettings, span: Span) -> Tuple[Lattice, Front, Dict[str, float], Tuple[str, ...]]:
    """Steps 2-4 of the module docstring up to the front."""
    from .geodesy import inverse

    ref_nm = float(inverse(lon[:-1], lat[:-1], lon[1:], lat[1:])[2].sum()) / NAUTICAL_MILE_M
    u = rs.speed_kn * KNOT_M_S
    budget_s = (1.0 + max_detour_pct / 100.0) * ref_nm * NAUTICAL_MILE_M / u
    settings = lattice_settings(ref_nm, max_detour_pct, n_stages=search.n_stages, n_side=search.n_side)
    lattice = _legal(build_lattice(lon, lat, settings, max_detour_pct), con, budget_s, u)
    span.check(0.15)
    if not np.any(lattice.reason == 0):
        raise SeawayInputError(_no_track_message(lattice))
    table, stats, notes = _cost_table(lattice, rs, budget_s, search.slot_h * SECONDS_PER_HOUR, span.part(0.15, 0.7))
    front = label_setting(lattice, table, u, budget_s, max_labels=search.max_labels, progress=span.part(0.7, 0.8))
    if front.time_s.size == 0:
        raise SeawayInputError(_no_track_message(lattice))
    stats.update(nodes=float(lattice.usable.sum()), edges=float(lattice.reason.size),
                 legal_edges=float(np.count_nonzero(lattice.reason == 0)), labels=float(front.n_labels),
                 front_size=float(front.time_s.size), stage_nm=settings.stage_nm, lateral_nm=settings.lateral_nm)
    return lattice, front, stats, notes


def plan_tracks(route_lon: object, route_lat: object, *, departure_utc: object, speed_kn: float,
                sea_states: Sequence[object], profile: object, station: Optional[str] = None,
                depth: Optional[object] = None, min_depth_m: float = 0.0, barriers: Optional[Barriers] = None,
                max_detour_pct: float = 30.0, spacing_nm: float = 1.0, gamma: float = 3.3, spread_s: float = 4.0,
                long_crested: bool = False, method: Optional[str] = None,
                land_search_km: float = DEFAULT_LAND_SEARCH_KM, search: SearchSettings = SearchSettings(),
                progress: Optional[Progress] = None) -> TrackPlan:
    """The reference and the fastest, balanced and gentlest tracks (module docstring).

    ``route_lon``/``route_lat``: the reference's vertices [deg WGS84], first = start, last =
    end; ``barriers`` in WGS84; other arguments as :func:`..passage.pipeline.compute_passage`.
    Raises :class:`SeawayInputError` for bad input or when no legal track exists, and
    :class:`..passage.progress.PassageCancelled` when ``progress`` returns False.
    """
    span = Span(progress, what="track search")
    lon, lat = _checked(route_lon, route_lat, speed_kn, min_depth_m, max_detour_pct)
    dep = as_utc_datetime64("DEPARTURE", departure_utc)
    check_departure_in_forecast(dep, sea_states)
    rs = ResponseSettings(dep, float(speed_kn), tuple(sea_states), profile, station, depth, gamma, spread_s,
                          long_crested, land_search_km)
    con = Constraints(barriers, depth, float(min_depth_m), tuple(sea_states), (float(lon[0]), float(lat[0])),
                      (float(lon[-1]), float(lat[-1])), land_search_km * 1000.0)
    check_ends(con, rs, lon, lat)
    lattice, front, stats, notes = _search(lon, lat, con, rs, float(max_detour_pct), search, span.part(0.0, 0.8))
    picks = dict(zip(ALTERNATIVES[1:], front_picks(front.time_s, front.dose_m2_s3)))
    tracks = [("reference", lon, lat, -1, int(np.bitwise_or.reduce(leg_reasons(con, lon[:-1], lat[:-1], lon[1:], lat[1:]))))]
    for name, idx in picks.items():
        x, y = _smoothed(lattice, front.paths[idx], con, rs, weigh_dose=name != "fastest")
        tracks.append((name, x, y, idx, 0))
        span.check(0.8 + 0.1 * len(tracks) / 4)
    alts = []
    for i, (name, x, y, idx, blocked) in enumerate(tracks):
        res = compute_passage(x, y, departure_utc=dep, speed_kn=speed_kn, sea_states=sea_states, profile=profile,
                              station=station, depth=depth, spacing_nm=spacing_nm, gamma=gamma, spread_s=spread_s,
                              long_crested=long_crested, leg=i, method=method, land_search_km=land_search_km,
                              progress=span.part(0.9 + 0.025 * i, 0.925 + 0.025 * i))
        alts.append(TrackAlternative(name, np.asarray(x, float), np.asarray(y, float), res, blocked, idx))
    if tracks[0][4]:
        notes += (f"the reference line itself {', '.join(t for b, t in REASON_TEXT.items() if tracks[0][4] & b)}",)
    return TrackPlan(tuple(alts), front.time_s / SECONDS_PER_HOUR, np.sqrt(front.dose_m2_s3), stats,
                     tuple(dict.fromkeys(notes)))
