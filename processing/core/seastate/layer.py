# SPDX-License-Identifier: GPL-2.0-or-later
"""One sea-state variable found in a file (a *layer*) and the GDAL reads behind it.

A layer is one canonical variable (e.g. ``hs``) on one grid with one time axis; each time step is
one GDAL band, possibly in different files (GRIB forecasts often come one file per step). The
readers (:mod:`.netcdf`, :mod:`.grib`, :mod:`.geotiff`) build layers; :mod:`.sampler` reads only
the windows and time steps it needs through :class:`DatasetCache`.

Raw band values become physical values as ``(raw * scale + offset) * unit_factor`` with GDAL's
band scale/offset (CF ``scale_factor``/``add_offset``, CF Conventions 1.8 s.8.1); no-data (CF
``_FillValue``/``missing_value``) and raw values outside ``valid_min``/``valid_max``/``valid_range``
(CF 1.8 s.2.5.1: such values are missing; the limits are in packed units) become NaN first.
"""
from __future__ import annotations

import os
from dataclasses import dataclass, field
from typing import Any, Callable, Dict, List, Optional, Tuple

import numpy as np
from numpy.typing import NDArray

from ..validation import SeawayInputError, show
from .grid import GridGeometry, Window
from .variables import UnitConversion

try:  # GDAL is a hard requirement of this sub-package only
    from osgeo import gdal, osr
except ImportError as _exc:  # pragma: no cover - exercised only without GDAL
    gdal = None  # type: ignore[assignment]
    osr = None  # type: ignore[assignment]
    _GDAL_IMPORT_ERROR: Optional[ImportError] = _exc
else:
    _GDAL_IMPORT_ERROR = None
# GDAL's exception mode is process-wide and shared with QGIS and other plugins, so this package
# never switches it: every call goes through gdal_call(), which works in either mode.


def require_gdal() -> None:
    if gdal is None:
        raise SeawayInputError(f"GDAL's Python bindings (osgeo) are not available: {_GDAL_IMPORT_ERROR}")


def gdal_call(what: str, fn: Callable[..., Any], *args: Any, **kwargs: Any) -> Any:
    """Call a GDAL function quietly; None, a failure code or a GDAL exception -> SeawayInputError.

    ``what`` names the file and the action for the message. Integer results are GDAL error codes
    (CE_None = 0 is success).
    """
    require_gdal()
    gdal.ErrorReset()
    gdal.PushErrorHandler("CPLQuietErrorHandler")
    try:
        out = fn(*args, **kwargs)
    except RuntimeError as exc:
        raise SeawayInputError(f"{what}: {exc}") from None
    finally:
        gdal.PopErrorHandler()
    if out is None or (isinstance(out, int) and not isinstance(out, bool) and out != 0):
        raise SeawayInputError(f"{what}: {gdal.GetLastErrorMsg() or 'GDAL reported a failure'}")
    return out


def open_gdal(name: str, *, what: str) -> "gdal.Dataset":
    """Open a GDAL dataset read-only; a clear :class:`SeawayInputError` on any failure."""
    require_gdal()
    plain = name
    if name.upper().startswith(("NETCDF:", "HDF5:")):
        plain = name.split(":", 1)[1].rsplit(":", 1)[0].strip('"')
    if not os.path.exists(plain):
        raise SeawayInputError(f"{what} {show(plain)} does not exist")
    return gdal_call(f"GDAL cannot open {what} {show(name)}", gdal.Open, name, gdal.GA_ReadOnly)


def grid_from_dataset(ds: "gdal.Dataset", *, where: str) -> GridGeometry:
    """Grid geometry from a GDAL dataset. No CRS: WGS 84 lon/lat assumed if the extent fits."""
    gt = ds.GetGeoTransform(can_return_null=True)
    if gt is None:
        raise SeawayInputError(f"{where}: the raster has no georeferencing (no geotransform)")
    wkt = ds.GetProjection() or ""
    nx, ny = ds.RasterXSize, ds.RasterYSize
    if not wkt:
        g = GridGeometry(nx, ny, tuple(gt), "", True, "EPSG:4326", True)
        x0, y0, x1, y1 = g.extent()
        if x0 < -540 or x1 > 540 or y0 < -91 or y1 > 91:
            raise SeawayInputError(
                f"{where}: the raster has no CRS and its extent {g.extent()} is not lon/lat degrees"
            )
        return g
    srs = osr.SpatialReference()
    srs.ImportFromWkt(wkt)
    code = srs.GetAuthorityCode(None)
    name = srs.GetAuthorityName(None)
    label = f"{name}:{code}" if code and name else (srs.GetName() or "custom CRS")
    if srs.IsGeographic():
        return GridGeometry(nx, ny, tuple(gt), wkt, True, label, False)
    return GridGeometry(nx, ny, tuple(gt), srs.ExportToWkt(), False, label, False)


@dataclass(frozen=True, eq=False)
class VariableLayer:
    """One canonical variable on one grid and time axis (bands may span files)."""

    canonical: str
    kind: str
    file: str
    file_variable: str
    recognised_by: str
    priority: int
    units: UnitConversion
    going_to: bool
    grid: GridGeometry
    times_s: NDArray[np.int64]
    bands: Tuple[Tuple[str, int], ...]
    notes: Tuple[str, ...] = ()
    extra_nodata: Tuple[float, ...] = ()
    files: Tuple[str, ...] = field(default=())
    valid_range_raw: Optional[Tuple[float, float]] = None  # CF valid_min/valid_max, packed units
    member: Optional[int] = None  # ensemble member label (None: deterministic, see .members)
    member_kind: str = ""  # "control", "perturbed" or "" (unknown / deterministic)

    @property
    def all_files(self) -> Tuple[str, ...]:
        return self.files or (self.file,)


class DatasetCache:
    """Keeps GDAL datasets open between reads; :meth:`close` releases them."""

    def __init__(self) -> None:
        self._open: Dict[str, "gdal.Dataset"] = {}
        self.bytes_read = 0

    def get(self, name: str) -> "gdal.Dataset":
        ds = self._open.get(name)
        if ds is None:
            ds = open_gdal(name, what="forecast file")
            self._open[name] = ds
        return ds

    def read_band_window(self, layer: VariableLayer, step: int, window: Window) -> NDArray[np.float64]:
        """Physical values of one time step inside ``window`` (NaN where no data)."""
        name, bandno = layer.bands[step]
        band = self.get(name).GetRasterBand(bandno)
        parts: List[NDArray[np.float64]] = []
        for xoff, xsize in window.col_runs:
            raw = gdal_call(f"{layer.file} variable {show(layer.file_variable)}: GDAL could not read band {bandno}",
                            band.ReadAsArray, xoff, window.row0, xsize, window.nrows)
            parts.append(np.asarray(raw))
        raw = parts[0] if len(parts) == 1 else np.concatenate(parts, axis=1)
        self.bytes_read += raw.nbytes
        arr = raw.astype(np.float64)
        bad = ~np.isfinite(arr)
        nd = band.GetNoDataValue()
        if nd is not None and np.isfinite(nd):
            bad |= raw == nd
        for extra in layer.extra_nodata:
            bad |= raw == extra
        if layer.valid_range_raw is not None:
            lo, hi = layer.valid_range_raw
            with np.errstate(invalid="ignore"):
                bad |= (raw < lo) | (raw > hi)
        scale = band.GetScale()
        offset = band.GetOffset()
        if scale not in (None, 1.0) or offset not in (None, 0.0):
            arr = arr * (1.0 if scale is None else scale) + (0.0 if offset is None else offset)
        if layer.units.factor != 1.0:
            arr = arr * layer.units.factor
        arr[bad] = np.nan
        return arr

    def close(self) -> None:
        self._open.clear()
