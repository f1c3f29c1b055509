# SPDX-License-Identifier: GPL-2.0-or-later
"""The public sea-state source: open forecast files, inventory them, sample them along a route.

``open_sea_state`` accepts GRIB2, NetCDF-CF and GeoTIFF stacks (one or many files; each variable
may come from a different file, grid and time axis and is sampled on its own grid). The sampling
method is described in :mod:`.sampler`; derived quantities in :mod:`.derived`.
"""
from __future__ import annotations

import os
from typing import Callable, Dict, List, Optional, Sequence, Tuple, Union

import numpy as np

from ..flags import SampleFlag
from ..validation import (
    SeawayInputError,
    as_float_array,
    require_in_range,
    require_nonnegative,
    show,
)
from .sampled_sea_state import SampledSeaState, sea_state_from_layer_samples
from .discovery import Discovery, check_direction_convention, invert_variable_map
from .geotiff import discover_geotiff
from .grib import discover_grib
from .inventory import IgnoredEntry, Inventory, entry_for_layer
from .layer import DatasetCache, VariableLayer, open_gdal
from .layer_choice import choose_by_member
from .members import member_text
from .netcdf import discover_netcdf
from .probe import probe_raster_file
from .sampler import LayerSample, sample_layer
from .timeaxis import as_utc_seconds, to_datetime64
from .variables import PARTITIONS

__all__ = ["SampledSeaState", "SamplingCancelled", "SeaStateSource", "describe_file", "lacking_variables",
           "open_sea_state"]

ProgressCallback = Callable[[float], Optional[bool]]


class SamplingCancelled(Exception):
    """Raised by :meth:`SeaStateSource.sample` when the progress callback returns False."""


def _discover(path: str, inverse_map: Dict[str, str], direction_convention: str,
              times_utc: Optional[Sequence], strict: bool) -> Discovery:
    probe_raster_file(path, what="forecast file")  # a file that kills GDAL never reaches this process
    ds = open_gdal(path, what="forecast file")
    driver = ds.GetDriver().ShortName
    del ds
    if driver == "netCDF":
        return discover_netcdf(path, inverse_map, direction_convention, strict=strict)
    if driver == "GRIB":
        return discover_grib(path, inverse_map, direction_convention, strict=strict)
    return discover_geotiff(path, inverse_map, direction_convention, times_utc=times_utc, strict=strict)


class SeaStateSource:
    """Sea-state variables from one or more files, ready to sample along a route."""

    def __init__(self, name: str, layers: Dict[str, VariableLayer], files: Tuple[str, ...],
                 unused: List[VariableLayer], ignored: List[IgnoredEntry], warnings: List[str],
                 members: Optional[Dict[int, Dict[str, VariableLayer]]] = None,
                 cache: Optional[DatasetCache] = None):
        self.name = name
        self._layers = layers
        self._files = files
        self._unused = unused
        self._ignored = ignored
        self.warnings: List[str] = warnings
        self._members = dict(members or {})
        self._cache = cache if cache is not None else DatasetCache()

    # --------------------------------------------------------------- ensemble members
    @property
    def members(self) -> Tuple[int, ...]:
        """Ensemble member labels (GRIB perturbation numbers / NetCDF member coordinate values);
        () for a deterministic source. :meth:`sample` samples the first member."""
        return tuple(self._members)

    def member_source(self, member: int) -> "SeaStateSource":
        """The source of one ensemble member (same name and files, shared open datasets)."""
        if member not in self._members:
            raise SeawayInputError(f"{self.name}: no ensemble member {show(member)}; members: "
                                   f"{member_text(self.members, {}) or 'none (deterministic source)'}")
        return SeaStateSource(self.name, self._members[member], self._files, [], self._ignored,
                              self.warnings, cache=self._cache)

    def _member_kinds(self) -> Dict[int, str]:
        return {m: next((l.member_kind for l in ls.values() if l.member is not None), "")
                for m, ls in self._members.items()}

    # --------------------------------------------------------------- description
    @property
    def variables(self) -> Tuple[str, ...]:
        return tuple(self._layers)

    @property
    def partitions(self) -> Tuple[str, ...]:
        return tuple(p for p in PARTITIONS if f"{p}_hs" in self._layers)

    @property
    def time_range_utc(self) -> Tuple[np.datetime64, np.datetime64]:
        """Earliest and latest time of any variable (each variable has its own axis)."""
        t0 = min(int(l.times_s[0]) for l in self._layers.values())
        t1 = max(int(l.times_s[-1]) for l in self._layers.values())
        return np.datetime64(t0, "s"), np.datetime64(t1, "s")

    def layer(self, canonical: str) -> VariableLayer:
        return self._layers[canonical]

    def inventory(self) -> Inventory:
        entries = [entry_for_layer(l, True) for l in self._layers.values()]
        entries += [entry_for_layer(l, False) for l in self._unused]
        return Inventory(self.name, self._files, tuple(entries), tuple(self._ignored), tuple(self.warnings),
                         members=self.members, members_text=member_text(self.members, self._member_kinds()))

    def close(self) -> None:
        self._cache.close()

    def __enter__(self) -> "SeaStateSource":
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()

    @property
    def bytes_read(self) -> int:
        """Raw bytes read from files by sample() so far (for memory checks)."""
        return self._cache.bytes_read

    # --------------------------------------------------------------- sampling
    def sample(self, lon_deg, lat_deg, time_utc, *, land_search_km: float = 30.0,  # type: ignore[no-untyped-def]
               time_tolerance_s: float = 1800.0, progress: Optional[ProgressCallback] = None
               ) -> SampledSeaState:
        """Sea state at route samples (lon, lat in degrees WGS 84; UTC times).

        ``time_utc`` is an array of datetime64 / ISO strings / datetimes of the same length as the
        positions, or a single time for all. Raises :class:`SeawayInputError` for bad input or
        when no sample lies inside the grid and time range of the wave-height variables.
        """
        lon = np.atleast_1d(as_float_array("lon_deg", lon_deg)).ravel()
        lat = np.atleast_1d(require_in_range("lat_deg", lat_deg, -90.0, 90.0, unit="deg")).ravel()
        if lon.size == 0:
            raise SeawayInputError("lon_deg is empty: no samples to take")
        if lat.size != lon.size:
            raise SeawayInputError(f"lat_deg has {lat.size} values but lon_deg has {lon.size}")
        t = as_utc_seconds("time_utc", time_utc)
        if t.size == 1 and lon.size > 1:
            t = np.full(lon.size, t[0], dtype=np.int64)
        if t.size != lon.size:
            raise SeawayInputError(f"time_utc has {t.size} values but lon_deg has {lon.size}")
        search = float(require_nonnegative("land_search_km", land_search_km))
        tol = float(require_nonnegative("time_tolerance_s", time_tolerance_s))

        heights = ["hs"] if "hs" in self._layers else [f"{p}_hs" for p in self.partitions]
        order = heights + [c for c in self._layers if c not in heights]
        out: Dict[str, LayerSample] = {}
        for k, c in enumerate(order):
            out[c] = sample_layer(self._layers[c], self._cache, lon, lat, t,
                                  land_search_km=search, time_tolerance_s=tol)
            if k == len(heights) - 1:
                self._check_any_inside([out[h] for h in heights], lon, lat, t)
            if progress is not None and progress((k + 1) / len(order)) is False:
                raise SamplingCancelled("sea-state sampling cancelled")
        return sea_state_from_layer_samples(out, lon.size, self._layers, self.partitions, self.name, self.warnings)

    def _check_any_inside(self, samples: List[LayerSample], lon, lat, t) -> None:  # type: ignore[no-untyped-def]
        off = int(SampleFlag.OUTSIDE_GRID | SampleFlag.OUTSIDE_TIME)
        if any(np.any((s.flags & off) == 0) for s in samples):
            return
        s = samples[0]
        layer = self._layers[s.canonical]
        if np.all(s.flags & int(SampleFlag.OUTSIDE_GRID)):
            raise SeawayInputError(
                f"the route lies entirely outside the grid of {layer.file} variable "
                f"{show(layer.file_variable)} (grid extent {layer.grid.extent()}, {layer.grid.crs_label}; "
                f"route lon {lon.min():g}..{lon.max():g}, lat {lat.min():g}..{lat.max():g})"
            )
        a, b = to_datetime64([layer.times_s[0], layer.times_s[-1]])
        ta, tb = to_datetime64([t.min(), t.max()])
        raise SeawayInputError(
            f"no route sample lies inside both the grid and the time range of {layer.file} variable "
            f"{show(layer.file_variable)} (forecast {a}Z..{b}Z; route times {ta}Z..{tb}Z)"
        )

def _as_paths(paths: Union[str, os.PathLike, Sequence[Union[str, os.PathLike]]]) -> List[str]:
    if isinstance(paths, (str, os.PathLike)):
        items = [paths]
    else:
        items = list(paths)
    if not items:
        raise SeawayInputError("paths is empty: give at least one forecast file")
    out = []
    for p in items:
        if not isinstance(p, (str, os.PathLike)):
            raise SeawayInputError(f"paths must be file names, got {show(p)}")
        out.append(os.fspath(p))
    return out


def open_sea_state(
    paths: Union[str, Sequence[str]],
    *,
    source_name: Optional[str] = None,
    variable_map: Optional[Dict[str, str]] = None,
    direction_convention: str = "auto",
    times_utc: Optional[Sequence] = None,
) -> SeaStateSource:
    """Open GRIB2 / NetCDF-CF / GeoTIFF-stack forecast files as one :class:`SeaStateSource`.

    ``variable_map`` maps our canonical names ("hs", "tp", "dir", "tm01", "wind_hs", "swell1_tp",
    ...) to file variable names (NetCDF variable; GRIB element, optionally at a level as
    "SWELL@241:2"; or a GeoTIFF's file name/stem).
    ``direction_convention``: "auto" (file's declaration, else coming-from), "from" or "to".
    ``times_utc``: times of the bands of GeoTIFF stacks without time metadata.
    Needs a wave height (combined or partitions), a period and a direction source.
    """
    files = _as_paths(paths)
    check_direction_convention(direction_convention)
    inverse = invert_variable_map(variable_map)
    warnings: List[str] = []
    ignored: List[IgnoredEntry] = []
    layers: List[VariableLayer] = []
    for f in files:
        d = _discover(f, inverse, direction_convention, times_utc, strict=True)
        warnings += d.warnings
        ignored += [IgnoredEntry(f, name, reason) for name, reason in d.ignored]
        layers += sorted(d.layers, key=lambda l: l.priority)
    by_member = choose_by_member(layers, warnings)
    chosen = next(iter(by_member.values()))
    _check_map(variable_map, inverse, by_member, files)
    for m, ch in by_member.items():
        _require(ch, files, ignored, member=m)
    unused = [l for l in layers if l.member in (None, next(iter(by_member))) and chosen.get(l.canonical) is not l
              and not any(l.bands[0] in c.bands for c in chosen.values())]
    name = source_name if source_name else os.path.splitext(os.path.basename(files[0]))[0]
    members = {m: ch for m, ch in by_member.items() if m is not None}
    return SeaStateSource(name, chosen, tuple(files), unused, ignored, warnings, members=members)


def _check_map(variable_map: Optional[Dict[str, str]], inverse: Dict[str, str],
               by_member: Dict[Optional[int], Dict[str, VariableLayer]], files: List[str]) -> None:
    """Error when a variable_map entry matched nothing in the files."""
    found = set().union(*(set(ch) for ch in by_member.values()))
    missing_map = sorted({inverse[k] for k in inverse} - found)
    if missing_map:
        raise SeawayInputError(
            f"variable_map names {', '.join(repr(variable_map[c]) for c in missing_map)} "  # type: ignore[index]
            f"for {', '.join(missing_map)}, but no such variable was found in {', '.join(files)}"
        )


def lacking_variables(have: Sequence[str]) -> List[str]:
    """What a set of canonical variables lacks to describe a sea state (height, period, direction)."""
    got = set(have)
    parts = [p for p in PARTITIONS if f"{p}_hs" in got]
    needs = {
        "a significant wave height (hs or a partition height)": "hs" in got or bool(parts),
        "a wave period (tp, tm01, tm02, tm10 or a partition period)":
            bool(got & {"tp", "tm01", "tm02", "tm10"}) or any(f"{p}_tp" in got for p in parts),
        "a wave direction (dir or a partition direction)":
            "dir" in got or any(f"{p}_dir" in got for p in parts),
    }
    return [k for k, ok in needs.items() if not ok]


def _require(chosen: Dict[str, VariableLayer], files: List[str], ignored: List[IgnoredEntry],
             member: Optional[int] = None) -> None:
    lacking = lacking_variables(list(chosen))
    if lacking:
        found = ", ".join(sorted(chosen)) or "none"
        skipped = "; ".join(f"{e.name}: {e.reason}" for e in ignored[:8])
        who = "" if member is None else f" (ensemble member {member})"
        raise SeawayInputError(
            f"{', '.join(files)}{who}: missing {' and '.join(lacking)}. Sea-state variables found: {found}."
            + (f" Not used: {skipped}." if skipped else "")
            + " Use variable_map to name non-standard variables."
        )


def describe_file(path: str, *, variable_map: Optional[Dict[str, str]] = None) -> Inventory:
    """Inventory of one file without requiring any variable (for a 'describe file' tool)."""
    f = _as_paths(path)[0]
    inverse = invert_variable_map(variable_map)
    d = _discover(f, inverse, "auto", None, strict=False)
    warnings = list(d.warnings)
    layers = sorted(d.layers, key=lambda l: l.priority)
    by_member = choose_by_member(layers, warnings)
    first = next(iter(by_member))
    chosen = by_member[first]
    entries = [entry_for_layer(l, chosen.get(l.canonical) is l) for l in layers if l.member in (None, first)]
    members = tuple(m for m in by_member if m is not None)
    kinds = {l.member: l.member_kind for l in layers if l.member is not None}
    return Inventory(os.path.splitext(os.path.basename(f))[0], (f,), tuple(entries),
                     tuple(IgnoredEntry(f, n, r) for n, r in d.ignored), tuple(warnings),
                     members=members, members_text=member_text(members, kinds))
