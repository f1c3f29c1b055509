# SPDX-License-Identifier: GPL-2.0-or-later
"""Write sea-state and bathymetry files with GDAL (for tests and the invented demo scenario).

* :func:`write_cf_netcdf`: NetCDF-4 with CF attributes through GDAL's multidimensional API
  (``standard_name``, ``units``, ``_FillValue``, optional packing ``scale_factor``/``add_offset``
  to Int16, a ``crs`` grid-mapping variable so GDAL reports EPSG:4326).
* :func:`write_grib2`: GRIB2 discipline 10 messages, one per (variable, time), product template
  4.0; swell partitions at level type 241 (ordered sequence) value k. ``INPUT_UNIT=K`` works
  around GDAL 3.6 adding 273.15 to parameter 10/0/3.
* :func:`write_geotiff_stack`: one band per time, band descriptions = ISO UTC times.
* :func:`write_bathymetry_geotiff`: one band of depths or elevations.
"""
from __future__ import annotations

from typing import Any, Callable, Mapping, Optional, Sequence, Union

import numpy as np
from numpy.typing import ArrayLike

from ..validation import SeawayInputError, as_float_array, show
from ..seastate.layer import gdal, gdal_call, osr, require_gdal
from ..seastate.timeaxis import as_utc_seconds
from ..seastate.variables import CF_STANDARD_NAMES, canonical_kind

ArrayOrStep = Union[ArrayLike, Callable[[int], ArrayLike]]

_GRIB_CODES = {  # canonical -> (category, number, level type, level value)
    "hs": (0, 3, 1, 0), "dir": (0, 10, 1, 0), "tp": (0, 34, 1, 0), "tm01": (0, 15, 1, 0),
    "tm02": (0, 28, 1, 0), "tm10": (0, 25, 1, 0),
    "wind_hs": (0, 5, 1, 0), "wind_tp": (0, 35, 1, 0), "wind_dir": (0, 4, 1, 0),
}
for _k in (1, 2, 3):
    _GRIB_CODES.update({f"swell{_k}_hs": (0, 8, 241, _k), f"swell{_k}_tp": (0, 9, 241, _k),
                        f"swell{_k}_dir": (0, 7, 241, _k)})
GRIB_PERPW_CODE = (0, 11, 1, 0)


def _wgs84_wkt() -> str:
    srs = osr.SpatialReference()
    srs.ImportFromEPSG(4326)
    return srs.ExportToWkt()


def _regular(name: str, v: np.ndarray, *, modulo_360: bool = False) -> float:
    """The constant step of a coordinate (longitudes may jump by 360 at the antimeridian)."""
    if v.ndim != 1 or v.size < 2:
        raise SeawayInputError(f"{name} must be a 1-D array of at least 2 values, got shape {v.shape}")
    d = np.diff(v)
    if modulo_360:
        d = np.mod(d + 180.0, 360.0) - 180.0
    if not np.allclose(d, d[0], rtol=1e-6, atol=1e-9) or d[0] == 0:
        raise SeawayInputError(f"{name} must be regularly spaced, got steps {d[:5]}...")
    return float(d[0])


def _attr(obj, name: str, value) -> None:  # type: ignore[no-untyped-def]
    if isinstance(value, str):
        a = obj.CreateAttribute(name, [], gdal.ExtendedDataType.CreateString())
    else:
        a = obj.CreateAttribute(name, [], gdal.ExtendedDataType.Create(gdal.GDT_Float64))
    a.Write(value)


def _cf_axes(lon_deg: ArrayLike, lat_deg: ArrayLike, lon_0_360: bool) -> tuple:
    """Checked (lon, lat, column order); ``lon_0_360`` stores longitudes modulo 360, increasing."""
    lon = as_float_array("lon_deg", lon_deg).ravel()
    lat = as_float_array("lat_deg", lat_deg).ravel()
    order = np.arange(lon.size)
    if lon_0_360:
        lon = np.mod(lon, 360.0)
        order = np.argsort(lon, kind="stable")
        lon = lon[order]
    return lon, lat, order


def _cf_time_values(t_s: np.ndarray, time_units: str) -> np.ndarray:
    """Times in CF ``<unit> since <reference>`` numbers (seconds, minutes, hours or days)."""
    unit_word, _, ref = time_units.partition(" since ")
    factor = {"seconds": 1, "minutes": 60, "hours": 3600, "days": 86400}.get(unit_word.strip())
    if factor is None:
        raise SeawayInputError(f"time_units {show(time_units)} must be seconds/minutes/hours/days since ...")
    ref_s = as_utc_seconds("time_units reference", ref.strip().replace(" ", "T", 1))[0]
    return (t_s - ref_s) / factor


def _cf_coordinate(rg: Any, name: str, dim: Any, values: np.ndarray,
                   attrs: Mapping[str, str]) -> None:
    var = rg.CreateMDArray(name, [dim], gdal.ExtendedDataType.Create(gdal.GDT_Float64))
    var.Write(np.asarray(values, dtype=np.float64))
    for key, val in attrs.items():
        _attr(var, key, val)


def _write_cf_coordinates(rg: Any, lon: np.ndarray, lat: np.ndarray, tvals: np.ndarray,
                          time_units: str, calendar: str, members: Optional[np.ndarray] = None) -> list:
    """The [member/]time/lat/lon dimensions and coordinate variables plus the ``crs`` grid mapping."""
    head = []
    if members is not None:
        dm = rg.CreateDimension("member", None, None, members.size)
        _cf_coordinate(rg, "member", dm, members, {"standard_name": "realization", "long_name": "ensemble member"})
        head = [dm]
    dt = rg.CreateDimension("time", gdal.DIM_TYPE_TEMPORAL, None, tvals.size)
    dy = rg.CreateDimension("lat", gdal.DIM_TYPE_HORIZONTAL_Y, None, lat.size)
    dx = rg.CreateDimension("lon", gdal.DIM_TYPE_HORIZONTAL_X, None, lon.size)
    _cf_coordinate(rg, "time", dt, tvals, {"units": time_units, "calendar": calendar,
                                           "standard_name": "time", "axis": "T"})
    _cf_coordinate(rg, "lat", dy, lat, {"units": "degrees_north", "standard_name": "latitude"})
    _cf_coordinate(rg, "lon", dx, lon, {"units": "degrees_east", "standard_name": "longitude"})
    crs = rg.CreateMDArray("crs", [], gdal.ExtendedDataType.Create(gdal.GDT_Int32))
    _attr(crs, "grid_mapping_name", "latitude_longitude")
    _attr(crs, "crs_wkt", _wgs84_wkt())
    return head + [dt, dy, dx]


def _create_cf_variable(rg: Any, path: str, dims: list, std: str, name: str, *,
                        sf: Optional[float], ao: float, fill: float, units: Optional[str],
                        extra: Mapping[str, str]) -> Any:
    """One (time, lat, lon) variable with its CF attributes, no-data value and packing."""
    gdt = gdal.GDT_Int16 if sf is not None else gdal.GDT_Float32
    v = gdal_call(f"{path}: cannot create variable {show(name)}", rg.CreateMDArray, name, dims,
                  gdal.ExtendedDataType.Create(gdt))
    if std in CF_STANDARD_NAMES:
        _attr(v, "standard_name", std)
    if units is None and std in CF_STANDARD_NAMES:
        units = {"height": "m", "period": "s", "direction": "degree"}[
            canonical_kind(CF_STANDARD_NAMES[std].canonical)]
    if units is not None:
        _attr(v, "units", units)
    _attr(v, "grid_mapping", "crs")
    for k, val in extra.items():
        _attr(v, k, val)
    v.SetNoDataValueDouble(fill)
    if sf is not None:
        v.SetScale(float(sf))
        v.SetOffset(float(ao))
    return v


def _write_cf_steps(v: Any, path: str, std: str, name: str, data: ArrayOrStep, shape: tuple,
                    order: np.ndarray, sf: Optional[float], ao: float, fill: float, lead: tuple = ()) -> None:
    """Write ``data`` one time step at a time (NaN -> ``fill``; packed to Int16 when ``sf``);
    ``lead`` are the indices before time (the member)."""
    nt, ny, nx = shape
    for i in range(nt):
        step = data(i) if callable(data) else np.asarray(data, dtype=float)[i]
        step = np.asarray(step, dtype=float)
        if step.shape != (ny, nx):
            raise SeawayInputError(
                f"variables[{show(std)}] step {i} has shape {step.shape}, expected ({ny}, {nx})"
            )
        step = step[:, order]
        if sf is not None:
            packed = np.rint((step - ao) / sf)
            packed = np.where(np.isfinite(packed), np.clip(packed, -32766, 32767), fill)
            out = packed.astype(np.int16)
        else:
            out = np.where(np.isfinite(step), step, fill).astype(np.float32)
        gdal_call(f"{path}: cannot write {show(name)} step {i}", v.WriteArray,
                  np.ascontiguousarray(out.reshape((1,) * (len(lead) + 1) + out.shape)),
                  array_start_idx=list(lead) + [i, 0, 0])


def _write_cf_data(v: object, path: str, std: str, name: str, data: ArrayOrStep, shape: tuple, order: object,
                   packing: tuple, mem: Optional[np.ndarray]) -> None:
    """All steps of one variable; with ensemble ``mem`` labels, every member's steps in turn."""
    sf, ao, fill = packing
    if mem is None:
        _write_cf_steps(v, path, std, name, data, shape, order, sf, ao, fill)
        return
    full = np.asarray(data, dtype=float)
    if full.shape != (mem.size,) + shape:
        raise SeawayInputError(f"variables[{show(std)}] has shape {full.shape}, expected "
                               f"{(mem.size,) + shape} (member, time, lat, lon)")
    for k in range(mem.size):
        _write_cf_steps(v, path, std, name, full[k], shape, order, sf, ao, fill, lead=(k,))


def write_cf_netcdf(
    path: str,
    lon_deg: ArrayLike,
    lat_deg: ArrayLike,
    times_utc: Sequence,
    variables: Mapping[str, ArrayOrStep],
    *,
    var_names: Optional[Mapping[str, str]] = None,
    units: Optional[Mapping[str, str]] = None,
    fill_value: float = -9999.0,
    lon_0_360: bool = False,
    scale_factor: Optional[Union[float, Mapping[str, float]]] = None,
    add_offset: Union[float, Mapping[str, float]] = 0.0,
    time_units: str = "hours since 1970-01-01 00:00:00",
    calendar: str = "standard",
    extra_attributes: Optional[Mapping[str, Mapping[str, str]]] = None,
    members: Optional[Sequence[int]] = None,
) -> str:
    """Write a CF NetCDF file of (time, lat, lon) variables keyed by CF standard name.

    With ``members`` (ensemble member labels) every variable is (member, time, lat, lon): a
    dimension ``member`` whose coordinate has ``standard_name = "realization"``, and
    ``variables[std_name]`` an array (nm, nt, ny, nx).

    ``variables[std_name]`` is an array (nt, ny, nx) in the order of ``lat_deg``/``lon_deg`` or a
    function of the time index returning (ny, nx) (to write large files step by step). NaN is
    written as ``fill_value``. ``lon_0_360`` stores longitudes modulo 360, re-ordered to increase.
    ``scale_factor`` packs to Int16 with ``add_offset`` (fill -32767). Keys of ``variables`` that are
    not CF standard names are written without a standard_name (use ``var_names`` to name them).
    """
    require_gdal()
    lon, lat, order = _cf_axes(lon_deg, lat_deg, lon_0_360)
    t_s = as_utc_seconds("times_utc", times_utc)
    _regular("lon_deg", lon, modulo_360=True)
    _regular("lat_deg", lat)
    tvals = _cf_time_values(t_s, time_units)
    drv = gdal.GetDriverByName("netCDF")
    ds = gdal_call(f"cannot create NetCDF file {show(path)}", drv.CreateMultiDimensional, path)
    rg = ds.GetRootGroup()
    mem = None if members is None else np.asarray(members, dtype=float).ravel()
    dims = _write_cf_coordinates(rg, lon, lat, tvals, time_units, calendar, mem)
    for std, data in variables.items():
        name = (var_names or {}).get(std) or (
            CF_STANDARD_NAMES[std].canonical if std in CF_STANDARD_NAMES else std)
        sf = scale_factor.get(std) if isinstance(scale_factor, Mapping) else scale_factor
        ao = add_offset.get(std, 0.0) if isinstance(add_offset, Mapping) else add_offset
        fill = -32767.0 if sf is not None else float(fill_value)
        v = _create_cf_variable(rg, path, dims, std, name, sf=sf, ao=ao, fill=fill,
                                units=(units or {}).get(std),
                                extra=(extra_attributes or {}).get(std) or {})
        _write_cf_data(v, path, std, name, data, (t_s.size, lat.size, lon.size), order, (sf, ao, fill), mem)
        del v
    del rg, ds
    return path


def _mem_dataset(lon: np.ndarray, lat: np.ndarray, nbands: int, wkt: str, gdt: int = 0,  # type: ignore[no-untyped-def]
                 geographic: bool = True):
    dx = _regular("lon_deg", lon, modulo_360=geographic)
    dy = _regular("lat_deg", lat)
    mem = gdal.GetDriverByName("MEM").Create("", lon.size, lat.size, nbands, gdt or gdal.GDT_Float64)
    mem.SetProjection(wkt)
    mem.SetGeoTransform([lon[0] - dx / 2.0, dx, 0.0, lat[0] - dy / 2.0, 0.0, dy])
    return mem


def _grib_options(ref_s: float, decimal_scale_factor: int) -> list:
    """GDAL GRIB creation options shared by every message (discipline 10, template 4.0)."""
    ref_text = str(np.datetime64(int(ref_s), "s"))
    return [
        "DISCIPLINE=10",
        f"IDS=CENTER=255 SUBCENTER=0 MASTER_TABLE=2 LOCAL_TABLE=0 SIGNF_REF_TIME=1 "
        f"REF_TIME={ref_text}Z PROD_STATUS=0 TYPE=1",
        "PDS_PDTN=0", "DATA_ENCODING=SIMPLE_PACKING",
        f"DECIMAL_SCALE_FACTOR={int(decimal_scale_factor)}", "INPUT_UNIT=K",
    ]


def _grib_field(name: str, values: ArrayLike, shape: tuple, use_perpw_for_tp: bool) -> tuple:
    """(GRIB2 code, checked (nt, ny, nx) data) of one canonical variable."""
    if name not in _GRIB_CODES:
        raise SeawayInputError(f"write_grib2: no GRIB2 code for variable {show(name)}; known: {', '.join(_GRIB_CODES)}")
    code = GRIB_PERPW_CODE if (name == "tp" and use_perpw_for_tp) else _GRIB_CODES[name]
    data = np.asarray(values, dtype=float)
    if data.shape != shape:
        raise SeawayInputError(f"variables[{show(name)}] has shape {data.shape}, expected "
                               f"({shape[0]}, {shape[1]}, {shape[2]})")
    if not np.all(np.isfinite(data)):
        raise SeawayInputError(
            f"variables[{show(name)}] holds NaN/inf: GRIB2 simple packing as written by GDAL 3.6 "
            "cannot keep missing values (complex packing failed here); fill them or write NetCDF"
        )
    return code, data


def write_grib2(
    path: str,
    lon_deg: ArrayLike,
    lat_deg: ArrayLike,
    times_utc: Sequence,
    variables: Mapping[str, ArrayLike],
    *,
    ref_time_utc: Optional[object] = None,
    decimal_scale_factor: int = 2,
    use_perpw_for_tp: bool = False,
    members: Optional[Sequence[int]] = None,
) -> str:
    """Write GRIB2 (discipline 10) with one message per canonical variable and time.

    With ``members`` (perturbation numbers) every variable is (nm, nt, ny, nx) and each message
    uses product definition template 4.1 (individual ensemble forecast): type of ensemble
    forecast 0 (unperturbed control) for perturbation number 0, else 3 (positively perturbed;
    WMO Code table 4.6), the perturbation number and the ensemble size.

    ``variables[canonical]`` is (nt, ny, nx) in the order of ``lat_deg``/``lon_deg``. Forecast
    hours are counted from ``ref_time_utc`` (default: the first time). ``use_perpw_for_tp``
    writes ``tp`` as PERPW (10/0/11) instead of PWPER (10/0/34).
    """
    require_gdal()
    lon = as_float_array("lon_deg", lon_deg).ravel()
    lat = as_float_array("lat_deg", lat_deg).ravel()
    t_s = as_utc_seconds("times_utc", times_utc)
    ref_s = t_s[0] if ref_time_utc is None else as_utc_seconds("ref_time_utc", ref_time_utc)[0]
    hours = (t_s - ref_s) / 3600.0
    if np.any(hours < 0) or not np.allclose(hours, np.rint(hours)):
        raise SeawayInputError(f"times_utc must be whole hours at or after ref_time_utc, got {hours}")
    flip = lat[0] < lat[-1]
    lat_w = lat[::-1] if flip else lat
    names = list(variables)
    ens = [None] if members is None else [int(m) for m in members]
    mem = _mem_dataset(lon, lat_w, len(names) * t_s.size * len(ens), _wgs84_wkt())
    opts = _grib_options(ref_s, decimal_scale_factor)
    if members is not None:
        opts[opts.index("PDS_PDTN=0")] = "PDS_PDTN=1"
    b = 0
    for name in names:
        shape = (t_s.size, lat.size, lon.size)
        full = np.asarray(variables[name], dtype=float)
        for k, m in enumerate(ens):
            (cat, num, ltype, lval), data = _grib_field(name, full if m is None else full[k], shape, use_perpw_for_tp)
            tail = "" if m is None else f" {0 if m == 0 else 3} {m} {len(ens)}"
            for i in range(t_s.size):
                b += 1
                mem.GetRasterBand(b).WriteArray(data[i][::-1] if flip else data[i])
                opts.append(f"BAND_{b}_PDS_TEMPLATE_ASSEMBLED_VALUES={cat} {num} {4 if m is not None else 2} 0 0 0 0 1 "
                            f"{int(round(hours[i]))} {ltype} 0 {lval} 255 0 0{tail}")
    gdal_call(f"cannot write GRIB2 file {show(path)}", gdal.GetDriverByName("GRIB").CreateCopy, path, mem,
              options=opts)
    return path


def write_geotiff_stack(
    path: str,
    x: ArrayLike,
    y: ArrayLike,
    times_utc: Optional[Sequence],
    values: ArrayLike,
    *,
    variable: str,
    units: str = "",
    nodata: float = -9999.0,
    crs: str = "EPSG:4326",
    write_times: bool = True,
) -> str:
    """Write a GeoTIFF stack (nt, ny, nx): band i = time i, description = ISO UTC time.

    ``variable`` is a canonical name (written as its CF ``standard_name`` metadata when one
    exists) or a CF standard name. ``x``/``y`` are cell-centre coordinates in ``crs``.
    """
    require_gdal()
    xs = as_float_array("x", x).ravel()
    ys = as_float_array("y", y).ravel()
    data = np.asarray(values, dtype=float)
    if data.ndim == 2:
        data = data[None]
    if data.shape[1:] != (ys.size, xs.size):
        raise SeawayInputError(f"values has shape {data.shape}, expected (nt, {ys.size}, {xs.size})")
    srs = osr.SpatialReference()
    gdal_call(f"crs {show(crs)} is not a CRS GDAL knows", srs.SetFromUserInput, crs)
    mem = _mem_dataset(xs, ys, data.shape[0], srs.ExportToWkt(), gdal.GDT_Float32,
                       geographic=bool(srs.IsGeographic()))
    if variable in CF_STANDARD_NAMES:
        std = variable
    else:
        canonical_kind(variable)
        std = next((k for k, v in CF_STANDARD_NAMES.items() if v.canonical == variable and v.priority == 0
                    and not v.going_to), "")
    if std:
        mem.SetMetadataItem("standard_name", std)
    if units:
        mem.SetMetadataItem("units", units)
    t_s = as_utc_seconds("times_utc", times_utc) if times_utc is not None else None
    if t_s is not None and t_s.size != data.shape[0]:
        raise SeawayInputError(f"times_utc has {t_s.size} entries, values has {data.shape[0]} steps")
    for i in range(data.shape[0]):
        band = mem.GetRasterBand(i + 1)
        band.WriteArray(np.where(np.isfinite(data[i]), data[i], nodata).astype(np.float32))
        band.SetNoDataValue(float(nodata))
        if units:
            band.SetUnitType(units)
        if write_times and t_s is not None:
            band.SetDescription(f"{np.datetime64(int(t_s[i]), 's')}Z")
    # band-interleaved tiles: a window of one time step is read without touching the other steps
    gdal_call(f"cannot write GeoTIFF {show(path)}", gdal.GetDriverByName("GTiff").CreateCopy, path, mem,
              options=["TILED=YES", "INTERLEAVE=BAND"])
    return path


def write_bathymetry_geotiff(
    path: str,
    lon_deg: ArrayLike,
    lat_deg: ArrayLike,
    values: ArrayLike,
    *,
    convention: str,
    nodata: Optional[float] = None,
    write_positive: bool = False,
    units: str = "m",
) -> str:
    """Write a bathymetry GeoTIFF of depths (``depth_positive_down``) or elevations
    (``elevation_positive_up``); ``write_positive`` adds the CF-style ``positive`` metadata item."""
    require_gdal()
    if convention not in ("depth_positive_down", "elevation_positive_up"):
        raise SeawayInputError(f"convention must be depth_positive_down or elevation_positive_up, got {show(convention)}")
    lon = as_float_array("lon_deg", lon_deg).ravel()
    lat = as_float_array("lat_deg", lat_deg).ravel()
    data = np.asarray(values, dtype=float)
    mem = _mem_dataset(lon, lat, 1, _wgs84_wkt(), gdal.GDT_Float32)
    band = mem.GetRasterBand(1)
    out = data if nodata is None else np.where(np.isfinite(data), data, nodata)
    band.WriteArray(out.astype(np.float32))
    if nodata is not None:
        band.SetNoDataValue(float(nodata))
    band.SetUnitType(units)
    if write_positive:
        mem.SetMetadataItem("positive", "down" if convention == "depth_positive_down" else "up")
    gdal_call(f"cannot write GeoTIFF {show(path)}", gdal.GetDriverByName("GTiff").CreateCopy, path, mem)
    return path
