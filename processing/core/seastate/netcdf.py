# SPDX-License-Identifier: GPL-2.0-or-later
"""NetCDF-CF reader: variables by CF ``standard_name`` (or the caller's variable map), CF time.

GDAL's netCDF driver exposes each (time, y, x) variable as a subdataset ``NETCDF:"file":var``
with one band per time step; band metadata ``NETCDF_DIM_<dim>`` holds the raw coordinate value,
dataset metadata ``<dim>#units`` / ``<dim>#calendar`` the CF time units (CF Conventions 1.8 s.4.4).
Packed values (``scale_factor``/``add_offset``, s.8.1) and ``_FillValue``/``missing_value``
(s.2.5.1) are honoured on read (:mod:`.layer`).
"""
from __future__ import annotations

import re
from typing import Dict, List, Optional, Tuple

import numpy as np

from ..validation import SeawayInputError, show
from .discovery import Discovery, resolve_going_to
from .grid import GridGeometry
from .layer import VariableLayer, gdal, gdal_call, grid_from_dataset, open_gdal
from .members import member_dimension
from .timeaxis import decode_cf_time, require_increasing
from .variables import CF_STANDARD_NAMES, canonical_kind, unit_conversion


def _braced(text: str) -> List[str]:
    return [s for s in re.split(r"[{},\s]+", text or "") if s]


def _variable_datasets(path: str) -> List[Tuple[str, str]]:
    """(gdal name, variable name) for every 2-D+ variable in the file."""
    ds = open_gdal(path, what="NetCDF file")
    subs = ds.GetSubDatasets()
    if subs:
        out = []
        for name, _desc in subs:
            out.append((name, name.rsplit(":", 1)[-1]))
        return out
    if ds.RasterCount == 0:
        return []
    var = ds.GetRasterBand(1).GetMetadataItem("NETCDF_VARNAME") or "band"
    return [(f'NETCDF:"{path}":{var}', var)]


def _time_dimension(md: Dict[str, str], where: str) -> Tuple[Optional[str], List[str]]:
    dims = _braced(md.get("NETCDF_DIM_EXTRA", ""))
    time_dims = []
    for d in dims:
        units = md.get(f"{d}#units", "")
        axis = md.get(f"{d}#axis", "")
        std = md.get(f"{d}#standard_name", "")
        if " since " in units.lower() or axis.upper() == "T" or std == "time":
            time_dims.append(d)
    if len(time_dims) > 1:
        raise SeawayInputError(f"{where}: more than one time dimension ({', '.join(time_dims)})")
    return (time_dims[0] if time_dims else None), [d for d in dims if d not in time_dims]


def discover_netcdf(path: str, inverse_map: Dict[str, str], direction_convention: str,
                    *, strict: bool) -> Discovery:
    """Scan a NetCDF file for sea-state variables."""
    disc = Discovery(path, "netcdf")
    for gdal_name, var in _variable_datasets(path):
        where = f"{path} variable {show(var)}"
        ds = open_gdal(gdal_name, what="NetCDF variable")
        md = ds.GetMetadata() or {}
        band_md = ds.GetRasterBand(1).GetMetadata() if ds.RasterCount else {}
        std = band_md.get("standard_name", md.get(f"{var}#standard_name", ""))
        units_text = band_md.get("units", md.get(f"{var}#units", ""))
        cf = CF_STANDARD_NAMES.get(std)
        if var in inverse_map:
            canonical = inverse_map[var]
            how = f"variable_map {show(canonical)} -> {show(var)}"
            declared = cf.going_to if (cf and cf.canonical == canonical) else None
            priority = -1
        elif cf is not None:
            canonical, how, declared, priority = cf.canonical, f"CF standard_name {std}", cf.going_to, cf.priority
        else:
            disc.ignored.append((var, f"standard_name {show(std)} not a sea-state quantity we use"
                                 if std else "no standard_name and not in variable_map"))
            continue
        try:
            layers = _layers(path, gdal_name, var, ds, md, canonical, how, declared, priority,
                             units_text, direction_convention, where, disc.warnings)
        except SeawayInputError as exc:
            if strict:
                raise
            disc.ignored.append((var, str(exc)))
            continue
        disc.layers.extend(layers)
    return disc


def _band_axes(ds, tdim: str, mdim: Optional[str], where: str) -> Tuple[List[float], List[Optional[int]]]:  # type: ignore[no-untyped-def]
    """Raw time coordinate and member label of every band (None without a member dimension)."""
    raw: List[float] = []
    members: List[Optional[int]] = []
    for b in range(1, ds.RasterCount + 1):
        band = ds.GetRasterBand(b)
        item = band.GetMetadataItem(f"NETCDF_DIM_{tdim}")
        if item is None:
            raise SeawayInputError(f"{where}: band {b} has no {tdim} coordinate")
        raw.append(float(item))
        if mdim is None:
            members.append(None)
            continue
        m = band.GetMetadataItem(f"NETCDF_DIM_{mdim}")
        try:
            members.append(int(round(float(m))))
        except (TypeError, ValueError):
            raise SeawayInputError(f"{where}: band {b} has no usable {mdim} (member) coordinate, got {show(m)}") from None
    return raw, members


def _layers(path, gdal_name, var, ds, md, canonical, how, declared, priority, units_text,  # type: ignore[no-untyped-def]
            direction_convention, where, warnings) -> List[VariableLayer]:
    """One layer per ensemble member (one layer when the variable has no member dimension)."""
    kind = canonical_kind(canonical)
    conv = unit_conversion(kind, units_text, where=where)
    going_to, dir_note = resolve_going_to(kind, declared, direction_convention, where=where,
                                          warnings=warnings)
    tdim, others = _time_dimension(md, where)
    if tdim is None:
        raise SeawayInputError(f"{where}: no time information (no time dimension with CF units)")
    mdim = member_dimension(others, md)
    for d in others:
        size = _braced(md.get(f"NETCDF_DIM_{d}_DEF", ""))
        if d != mdim and size and int(size[0]) > 1:
            raise SeawayInputError(
                f"{where}: extra dimension {show(d)} of size {size[0]}; only (time, y, x) and "
                "(member, time, y, x) variables are read"
            )
    raw, members = _band_axes(ds, tdim, mdim, where)
    times_s = decode_cf_time(raw, md.get(f"{tdim}#units"), md.get(f"{tdim}#calendar"),
                             where=f"{where} time axis {show(tdim)}").astype(np.int64)
    if ds.GetMetadata("GEOLOCATION"):
        raise SeawayInputError(
            f"{where}: the grid is curvilinear (2-D latitude/longitude arrays); only regular "
            "grids are read - regrid the file first (e.g. gdalwarp)"
        )
    grid: GridGeometry = grid_from_dataset(ds, where=where)
    _check_regular_axes(path, var, grid, where)
    band_md = ds.GetRasterBand(1).GetMetadata() or {}
    common = dict(canonical=canonical, kind=kind, file=path, file_variable=var, recognised_by=how,
                  priority=priority, units=conv, going_to=going_to, grid=grid,
                  notes=tuple(n for n in (dir_note,) if n), extra_nodata=_missing_values(band_md),
                  valid_range_raw=_valid_range(band_md, where))
    out = []
    for m in dict.fromkeys(members):
        bands = [b for b, mb in enumerate(members, start=1) if mb == m]
        t = times_s[[b - 1 for b in bands]]
        mwhere = where if m is None else f"{where} member {m}"
        require_increasing(t, where=mwhere)
        out.append(VariableLayer(times_s=t, bands=tuple((gdal_name, b) for b in bands), member=m, **common))
    return out


def _missing_values(md: Dict[str, str]) -> Tuple[float, ...]:
    """CF missing_value(s) besides _FillValue (CF 1.8 s.2.5.1); unreadable text is ignored."""
    mv = md.get("missing_value")
    if mv is None:
        return ()
    try:
        return tuple(float(v) for v in _braced(mv))
    except ValueError:
        return ()


def _valid_range(md: Dict[str, str], where: str) -> Optional[Tuple[float, float]]:
    """CF valid_range / valid_min / valid_max (CF 1.8 s.2.5.1), in the file's packed units."""
    try:
        if "valid_range" in md:
            vals = [float(v) for v in _braced(md["valid_range"])]
            if len(vals) == 2:
                return (min(vals), max(vals))
        lo = float(md["valid_min"]) if "valid_min" in md else -np.inf
        hi = float(md["valid_max"]) if "valid_max" in md else np.inf
    except ValueError:
        raise SeawayInputError(f"{where}: unreadable valid_range/valid_min/valid_max attribute") from None
    return None if (lo == -np.inf and hi == np.inf) else (lo, hi)


def _check_regular_axes(path: str, var: str, grid: GridGeometry, where: str) -> None:
    """Error unless the 1-D x/y coordinates are evenly spaced with GDAL's cell size.

    GDAL fits a geotransform even to uneven coordinates (e.g. Gaussian latitudes) and only warns;
    sampling through it would shift values silently. Longitude steps are taken modulo 360.
    """
    try:
        mds = gdal_call(f"{where}: multidimensional view", gdal.OpenEx, path, gdal.OF_MULTIDIM_RASTER)
        arr = gdal_call(f"{where}: array", mds.GetRootGroup().OpenMDArray, var)
        dims = arr.GetDimensions()
    except SeawayInputError:
        return  # no multidimensional view of this variable: nothing more to check
    if len(dims) < 2:
        return
    rx, ry = grid.resolution()
    for dim, cell in ((dims[-1], rx), (dims[-2], ry)):
        iv = dim.GetIndexingVariable()
        if iv is None:
            continue
        try:
            c = np.asarray(gdal_call(f"{where}: coordinate {show(dim.GetName())}", iv.ReadAsArray), dtype=float).ravel()
        except SeawayInputError:
            continue
        if c.size < 2:
            continue
        d = np.diff(c)
        d = np.mod(d + 180.0, 360.0) - 180.0 if grid.is_geographic else d
        step = float(np.median(np.abs(d)))
        if np.max(np.abs(np.abs(d) - step)) > 1e-3 * step or abs(step - cell) > 1e-3 * cell:
            raise SeawayInputError(
                f"{where}: coordinate {show(dim.GetName())} is not evenly spaced (steps "
                f"{np.min(np.abs(d)):g} to {np.max(np.abs(d)):g}); only regular grids are read"
            )
