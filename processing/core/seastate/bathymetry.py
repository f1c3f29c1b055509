# SPDX-License-Identifier: GPL-2.0-or-later
"""Bathymetry rasters (GeoTIFF, NetCDF, any GDAL raster): water depth at route samples.

Conventions: ``depth_positive_down`` (values are depths, sea > 0) or ``elevation_positive_up``
(values are heights, sea < 0, as in common global relief grids). ``auto`` decides, in order:

1. the CF ``positive`` attribute of the variable (CF Conventions 1.8 s.4.3: "up"/"down"), read
   from GDAL metadata (``positive`` or ``<var>#positive``);
2. the CF standard name (``sea_floor_depth_below_*`` / ``depth`` -> depth;
   ``height_above_mean_sea_level``, ``altitude``, ``surface_altitude``, ... -> elevation);
3. the values: if more than half of the valid cells (read at reduced resolution) are negative
   the file is taken as elevation, else as depth. This assumes a mostly-sea raster; a mostly-land
   depth raster is misread - pass the convention explicitly then.

Sampling: the nearest cell decides the class - no data -> NaN + DEPTH_ASSUMED_DEEP, land/dry
(depth <= 0) -> NaN + DEPTH_ON_LAND; otherwise depth is bilinear over the neighbouring sea cells
(weights renormalised, as in :mod:`.sampler`). Outside the raster: NaN + DEPTH_ASSUMED_DEEP.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Tuple

import numpy as np
from numpy.typing import NDArray

from ..flags import SampleFlag
from ..units import FloatArray
from ..validation import SeawayInputError, as_float_array, require_in_range, show
from .grid import bilinear_corners, read_window_for
from .layer import gdal_call, grid_from_dataset, open_gdal
from .probe import probe_raster_file
from .variables import HEIGHT, unit_conversion

CONVENTIONS = ("auto", "depth_positive_down", "elevation_positive_up")
_DEPTH_NAMES = {"sea_floor_depth_below_geoid", "sea_floor_depth_below_sea_surface",
                "sea_floor_depth_below_mean_sea_level", "sea_floor_depth_below_reference_ellipsoid",
                "depth", "sea_floor_depth"}
_ELEVATION_NAMES = {"height_above_mean_sea_level", "altitude", "surface_altitude",
                    "height_above_reference_ellipsoid", "height_above_geoid",
                    "bedrock_altitude", "sea_floor_height_above_reference_ellipsoid"}


@dataclass(frozen=True)
class DepthSample:
    """Water depth [m, positive down] at n samples; NaN where unknown or land, with flags."""

    depth_m: FloatArray
    flags: NDArray[np.int64]


class Bathymetry:
    """A bathymetry raster opened for sampling."""

    def __init__(self, path: str, gdal_name: str, convention: str, reason: str, factor: float):
        self.path = path
        self._name = gdal_name
        self.convention = convention
        self.convention_reason = reason
        self._ds = open_gdal(gdal_name, what="bathymetry file")
        self.grid = grid_from_dataset(self._ds, where=f"bathymetry {path}")
        self._factor = factor

    def _depth(self, raw: np.ndarray, band) -> FloatArray:  # type: ignore[no-untyped-def]
        arr = raw.astype(np.float64)
        bad = ~np.isfinite(arr)
        nd = band.GetNoDataValue()
        if nd is not None and np.isfinite(nd):
            bad |= raw == nd
        scale, offset = band.GetScale(), band.GetOffset()
        arr = arr * (1.0 if scale is None else scale) + (0.0 if offset is None else offset)
        arr *= self._factor
        if self.convention == "elevation_positive_up":
            arr = -arr
        arr[bad] = np.nan
        return arr

    CHUNK = 512
    """Consecutive samples read together: along a route each chunk needs only a small window of a
    fine global grid, where one bounding box of a whole ocean crossing would not fit in memory."""

    def sample(self, lon_deg, lat_deg) -> DepthSample:  # type: ignore[no-untyped-def]
        """Depth [m] at the given positions (degrees, WGS 84)."""
        lon = np.atleast_1d(as_float_array("lon_deg", lon_deg)).ravel()
        lat = np.atleast_1d(require_in_range("lat_deg", lat_deg, -90.0, 90.0, unit="deg")).ravel()
        if lat.size != lon.size:
            raise SeawayInputError(f"lat_deg has {lat.size} values but lon_deg has {lon.size}")
        depth = np.full(lon.size, np.nan)
        flags = np.zeros(lon.size, dtype=np.int64)
        for a in range(0, lon.size, self.CHUNK):
            part = self._sample_chunk(lon[a:a + self.CHUNK], lat[a:a + self.CHUNK])
            depth[a:a + self.CHUNK] = part.depth_m
            flags[a:a + self.CHUNK] = part.flags
        return DepthSample(depth, flags)

    def _sample_chunk(self, lon: FloatArray, lat: FloatArray) -> DepthSample:
        n = lon.size
        depth = np.full(n, np.nan)
        flags = np.zeros(n, dtype=np.int64)
        g = self.grid
        col_f, row_f, inside = g.centre_index(lon, lat)
        flags[~inside] |= int(SampleFlag.DEPTH_ASSUMED_DEEP)
        act = np.flatnonzero(inside)
        if act.size == 0:
            return DepthSample(depth, flags)
        cf, rf = col_f[act], row_f[act]
        corners = bilinear_corners(g, cf, rf)
        cc, rr, ww, ok = corners.cols, corners.rows, corners.weights, corners.valid
        cn = np.rint(cf).astype(np.int64)
        rn = np.clip(np.rint(rf).astype(np.int64), 0, g.ny - 1)
        cn = np.mod(cn, g.nx) if g.wraps else np.clip(cn, 0, g.nx - 1)
        win = read_window_for(g, np.concatenate([cc[ok], cn]), np.concatenate([rr[ok], rn]), 0, 0)
        band = self._ds.GetRasterBand(1)
        parts = [np.asarray(gdal_call(f"bathymetry {self.path}: GDAL could not read", band.ReadAsArray,
                                      x, win.row0, xs, win.nrows)) for x, xs in win.col_runs]
        arr = self._depth(parts[0] if len(parts) == 1 else np.concatenate(parts, axis=1), band)
        near = arr[win.local_row(rn), win.local_col(cn, g.nx)]
        v = arr[win.local_row(rr), win.local_col(cc, g.nx)]
        sea = ok & np.isfinite(v) & (v > 0) & (ww > 0)
        den = np.sum(np.where(sea, ww, 0.0), axis=1)
        with np.errstate(invalid="ignore", divide="ignore"):
            d = np.sum(np.where(sea, ww * v, 0.0), axis=1) / den
        nodata = ~np.isfinite(near)
        land = np.isfinite(near) & (near <= 0)
        d = np.where(nodata | land | (den <= 0), np.nan, d)
        f = np.zeros(act.size, dtype=np.int64)
        f[nodata] |= int(SampleFlag.DEPTH_ASSUMED_DEEP)
        f[land] |= int(SampleFlag.DEPTH_ON_LAND)
        f[~nodata & ~land & ~np.isfinite(d)] |= int(SampleFlag.DEPTH_ASSUMED_DEEP)
        depth[act] = d
        flags[act] |= f
        return DepthSample(depth, flags)

    def close(self) -> None:
        self._ds = None


def _pick_dataset(path: str) -> Tuple[str, dict]:
    ds = open_gdal(path, what="bathymetry file")
    subs = ds.GetSubDatasets()
    if not subs:
        if ds.RasterCount < 1:
            raise SeawayInputError(f"bathymetry file {show(path)} has no raster band")
        md = dict(ds.GetMetadata() or {})
        md.update(ds.GetRasterBand(1).GetMetadata() or {})
        return path, md
    for name, _ in subs:
        sub = open_gdal(name, what="bathymetry variable")
        md = dict(sub.GetMetadata() or {})
        md.update(sub.GetRasterBand(1).GetMetadata() or {})
        if md.get("standard_name", "") in _DEPTH_NAMES | _ELEVATION_NAMES:
            return name, md
    if len(subs) == 1:
        return subs[0][0], md
    raise SeawayInputError(
        f"bathymetry file {show(path)} has several variables ({', '.join(s[0].rsplit(':', 1)[-1] for s in subs)}) "
        "and none has a depth or elevation standard_name"
    )


def _auto_convention(ds, md: dict) -> Tuple[str, str]:  # type: ignore[no-untyped-def]
    positive = md.get("positive") or next((v for k, v in md.items() if k.endswith("#positive")), "")
    if positive.strip().lower() == "down":
        return "depth_positive_down", "CF attribute positive='down'"
    if positive.strip().lower() == "up":
        return "elevation_positive_up", "CF attribute positive='up'"
    std = md.get("standard_name", "")
    if std in _DEPTH_NAMES:
        return "depth_positive_down", f"standard_name {std}"
    if std in _ELEVATION_NAMES:
        return "elevation_positive_up", f"standard_name {std}"
    band = ds.GetRasterBand(1)
    bx, by = min(ds.RasterXSize, 512), min(ds.RasterYSize, 512)
    raw = np.asarray(gdal_call("bathymetry: GDAL could not read an overview of the values", band.ReadAsArray,
                               0, 0, ds.RasterXSize, ds.RasterYSize, buf_xsize=bx, buf_ysize=by))
    vals = raw.astype(float)
    good = np.isfinite(vals)
    nd = band.GetNoDataValue()
    if nd is not None and np.isfinite(nd):
        good &= raw != nd
    if not good.any():
        raise SeawayInputError("bathymetry has no valid values; cannot tell its convention")
    frac = float(np.mean(vals[good] < 0))
    if frac > 0.5:
        return "elevation_positive_up", f"{frac:.0%} of the values are negative (mostly-sea raster assumed)"
    return "depth_positive_down", f"{1 - frac:.0%} of the values are >= 0 (mostly-sea raster assumed)"


def open_bathymetry(path: str, *, convention: str = "auto") -> Bathymetry:
    """Open a bathymetry raster; ``convention`` "auto", "depth_positive_down" or "elevation_positive_up"."""
    if convention not in CONVENTIONS:
        raise SeawayInputError(f"convention must be one of {', '.join(CONVENTIONS)}, got {show(convention)}")
    probe_raster_file(str(path), what="bathymetry file")
    name, md = _pick_dataset(str(path))
    ds = open_gdal(name, what="bathymetry file")
    units = ds.GetRasterBand(1).GetUnitType() or md.get("units", "")
    conv = unit_conversion(HEIGHT, units, where=f"bathymetry {path}")
    if convention == "auto":
        convention, reason = _auto_convention(ds, md)
    else:
        reason = "given by the caller"
    return Bathymetry(str(path), name, convention, reason, conv.factor)
