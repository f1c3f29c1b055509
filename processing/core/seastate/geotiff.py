# SPDX-License-Identifier: GPL-2.0-or-later
"""GeoTIFF (or any GDAL raster) stacks: one variable per file, one band per time step.

Which variable: the caller's ``variable_map`` (value = the file's name, stem or full path), else
the dataset metadata item ``standard_name`` (a CF standard name). Times, in order: the caller's
``times_utc`` list (one per band), else each band's description or metadata item ``valid_time``
as ISO 8601 UTC text. Units: band unit type, else metadata item ``units``.
"""
from __future__ import annotations

import os
from typing import Dict, List, Optional, Sequence

import numpy as np
from numpy.typing import NDArray

from ..validation import SeawayInputError, show
from .discovery import Discovery, resolve_going_to
from .layer import VariableLayer, grid_from_dataset, open_gdal
from .timeaxis import as_utc_seconds, parse_iso_utc, require_increasing
from .variables import CF_STANDARD_NAMES, canonical_kind, unit_conversion


def _band_times(ds: object, path: str, where: str, times_utc: Optional[Sequence]) -> NDArray[np.int64]:
    """Valid time of every band [s since 1970 UTC]: ``times_utc`` when given, else each band's
    ``valid_time`` metadata or description (ISO 8601)."""
    n = ds.RasterCount  # type: ignore[attr-defined]
    if times_utc is not None:
        times_s = as_utc_seconds(f"times_utc for {path}", times_utc)
        if times_s.size != n:
            raise SeawayInputError(f"{where}: times_utc has {times_s.size} entries but the file has {n} bands")
        return times_s
    vals: List[int] = []
    for b in range(1, n + 1):
        band = ds.GetRasterBand(b)  # type: ignore[attr-defined]
        text = band.GetMetadataItem("valid_time") or band.GetDescription()
        if not text:
            raise SeawayInputError(
                f"{where}: no time information for band {b} (no band description or "
                "valid_time metadata); pass times_utc"
            )
        vals.append(int(parse_iso_utc(text, where=f"{where} band {b}").astype(np.int64)))
    return np.array(vals, dtype=np.int64)


def discover_geotiff(path: str, inverse_map: Dict[str, str], direction_convention: str, *,
                     times_utc: Optional[Sequence] = None, strict: bool) -> Discovery:
    disc = Discovery(path, "geotiff")
    ds = open_gdal(path, what="raster file")
    md = ds.GetMetadata() or {}
    base = os.path.basename(path)
    names = [path, os.path.abspath(path), base, os.path.splitext(base)[0]]
    std = md.get("standard_name", "")
    cf = CF_STANDARD_NAMES.get(std)
    hit = next((n for n in names if n in inverse_map), None)
    if hit is not None:
        canonical = inverse_map[hit]
        how = f"variable_map {show(canonical)} -> {show(hit)}"
        declared = cf.going_to if (cf and cf.canonical == canonical) else None
        priority = -1
    elif cf is not None:
        canonical, how, declared, priority = cf.canonical, f"standard_name {std} in raster metadata", cf.going_to, cf.priority
    else:
        msg = ("no variable_map entry names this file (give e.g. {'hs': '%s'}) and its metadata "
               "has no recognised standard_name" % os.path.splitext(base)[0])
        if strict:
            raise SeawayInputError(f"{path}: {msg}")
        disc.ignored.append((base, msg))
        return disc
    where = f"{path} variable {show(canonical)}"
    try:
        kind = canonical_kind(canonical)
        band1 = ds.GetRasterBand(1)
        units_text = band1.GetUnitType() or md.get("units", "")
        conv = unit_conversion(kind, units_text, where=where)
        going_to, dir_note = resolve_going_to(kind, declared, direction_convention, where=where,
                                              warnings=disc.warnings)
        n = ds.RasterCount
        times_s = _band_times(ds, path, where, times_utc)
        require_increasing(times_s, where=where)
        grid = grid_from_dataset(ds, where=where)
    except SeawayInputError as exc:
        if strict:
            raise
        disc.ignored.append((base, str(exc)))
        return disc
    disc.layers.append(VariableLayer(
        canonical=canonical, kind=kind, file=path, file_variable=base, recognised_by=how,
        priority=priority, units=conv, going_to=going_to, grid=grid, times_s=times_s,
        bands=tuple((path, b) for b in range(1, n + 1)), notes=tuple(x for x in (dir_note,) if x),
    ))
    return disc
