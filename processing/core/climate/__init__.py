# SPDX-License-Identifier: GPL-2.0-or-later
"""Seasonal comfort climate along a route from years of hindcast (no QGIS).

Pipeline: :func:`.hindcast.open_hindcast` (many files -> one regular series, gaps/overlaps/grid
checks) -> :func:`.engine.prepare_climate` (route samples, timing, grid weights, ONE response
table) -> :func:`.chunks.plan_chunks` (chunks of time with the passage overlap) -> a backend
(:mod:`.backends`: serial, local process pool, Dask) running :func:`.chunks.run_chunk` ->
:func:`.monthly.reduce_chunks` (exact integer sums in chunk order) ->
:func:`.monthly.finish_climate` (per-month shares, weather windows, waiting times).

:func:`compute_climate` chains them. Results are planning aids only (:data:`..flags.CAUTION`).
"""
from __future__ import annotations

from typing import Any, Callable, Optional, Sequence

from ..validation import SeawayInputError, show
from .backends import ClimateCancelled, DaskBackend, LocalPoolBackend, SerialBackend, make_backend
from .chunks import DEFAULT_CHUNK_STEPS, plan_chunks, run_chunk
from .engine import ClimateSetup, prepare_climate
from .hindcast import HindcastSeries, open_hindcast
from .monthly import ClimateResult, finish_climate, parse_months, reduce_chunks, write_climate_csv

__all__ = [
    "compute_climate", "ClimateResult", "ClimateSetup", "ClimateCancelled", "HindcastSeries",
    "open_hindcast", "prepare_climate", "plan_chunks", "run_chunk", "reduce_chunks", "finish_climate",
    "parse_months", "write_climate_csv", "make_backend", "SerialBackend", "LocalPoolBackend",
    "DaskBackend", "DEFAULT_CHUNK_STEPS",
]


def compute_climate(
    route_lon_deg: Sequence[float],
    route_lat_deg: Sequence[float],
    hindcast: Any,
    vessel: Any,
    *,
    speed_kn: float,
    station: Optional[str] = None,
    months: Any = None,
    max_class: int = 1,
    spacing_nm: float = 1.0,
    gamma: float = 3.3,
    spread_s: float = 4.0,
    long_crested: bool = False,
    chunk_steps: int = DEFAULT_CHUNK_STEPS,
    backend: Any = None,
    overlap: str = "first",
    variable_map: Optional[dict] = None,
    progress: Optional[Callable[[float], Optional[bool]]] = None,
) -> ClimateResult:
    """Seasonal comfort climate of a route (see the package docstring).

    ``hindcast`` file paths or an open :class:`HindcastSeries`; ``vessel`` a built-in name, a
    profile JSON path or a :class:`..vessel.VesselProfile`; ``speed_kn`` [kn] > 0; ``months``
    as :func:`parse_months` (None = all); ``max_class`` worst acceptable class 0..4;
    ``backend`` a backend object or None (local process pool of 2 workers); ``progress(f)``
    0..1, returning False cancels (:class:`ClimateCancelled`).
    """
    ms = parse_months(months)
    series = hindcast if isinstance(hindcast, HindcastSeries) else open_hindcast(
        hindcast, variable_map=variable_map, overlap=overlap)
    setup = prepare_climate(route_lon_deg, route_lat_deg, series, vessel, speed_kn=speed_kn, station=station,
                            max_class=max_class, spacing_nm=spacing_nm, gamma=gamma, spread_s=spread_s,
                            long_crested=long_crested)
    be = backend if backend is not None else LocalPoolBackend(workers=2)
    if not hasattr(be, "map"):
        raise SeawayInputError(f"backend must be a climate backend object, got {show(be)}")
    tasks = plan_chunks(setup, chunk_steps)
    results = be.map(tasks, progress)
    notes = list(getattr(be, "notes", []) or [])
    return finish_climate(setup, reduce_chunks(results), ms, notes=notes, backend=str(getattr(be, "name", "")))
