# SPDX-License-Identifier: GPL-2.0-or-later
"""The invented demo scenario: a fictional sea area, its forecast, bathymetry and a two-leg route.

Nothing here is real data. The sea area "Merrow Reach" with "Tarrow Island", the harbours
"Port Ansel" and "Cape Vell" and every value are made up; they are placed in an empty stretch
of the South Atlantic (about 24-27 S, 17-22 W) only so that the files have ordinary
geographic coordinates. The forecast (invented dates in March 2031) holds:

* a long south-westerly swell (from 225 deg) of 1.0-1.8 m and 11-13 s that builds slowly, and
  is sheltered to the north-east of the island;
* a wind sea raised by a passing disturbance that crosses the area from west to east on
  the second and third day: up to about 3 m and 7-8 s, its direction veering from south
  (180 deg) through south-west to west (270 deg) as it passes.

Combined values follow the usual partition sum: Hs = sqrt(sum Hs_i**2) (e.g. DNV-RP-C205,
2010, s.3.5; common practice), Tp and direction of the partition with the most energy.
The bathymetry is a shelf of our own making around the island (20 m at the coast, deepening
to 2500 m offshore). The files are written with the project's own writers, as NetCDF-CF and
as GRIB2 (the same fields), a GeoTIFF depth grid and a GeoJSON route (RFC 7946).
"""
from __future__ import annotations

import json
import math
import os
from dataclasses import dataclass
from typing import Dict, Tuple

import numpy as np

from ..units import FloatArray
from ..validation import SeawayInputError, show

__all__ = [
    "DemoScenario",
    "DemoFields",
    "demo_grid",
    "demo_fields",
    "demo_depth_m",
    "DEMO_LEGS",
    "DEMO_VESSEL",
    "build_demo_scenario",
]

FORECAST_START_UTC = np.datetime64("2031-03-10T00:00", "ms")
FORECAST_STEP_H = 3
FORECAST_STEPS = 33  # four days, three-hourly
GRID_LON_DEG = (-22.0, -17.0)
GRID_LAT_DEG = (-27.0, -24.0)
GRID_STEP_DEG = 0.1

ISLAND_CENTRE_DEG = (-19.6, -25.35)  # (lon, lat) of Tarrow Island
ISLAND_RADIUS_DEG = 0.22

DEMO_VESSEL = "coastal_survey_35m"
"""The built-in example profile the demo uses."""

DEMO_LEGS: Tuple[Dict[str, object], ...] = (
    {
        "name": "Port Ansel to Tarrow Island",
        "depart_utc": "2031-03-11T06:00:00Z",
        "speed_kn": 9.0,
        # north-east with the swell behind, over the Ansel Bank
        "coords": ((-21.5, -26.6), (-20.4, -25.9), (-19.85, -25.58)),
    },
    {
        "name": "Tarrow Island to Cape Vell",
        "depart_utc": "2031-03-12T09:00:00Z",
        "speed_kn": 9.0,
        # south-east with the swell on the beam, then south-west into it
        "coords": ((-19.25, -25.45), (-18.3, -26.0), (-18.9, -26.7)),
    },
)
"""Two legs of the invented passage: name, departure, speed and (lon, lat) vertices."""


def demo_grid() -> Tuple[FloatArray, FloatArray, np.ndarray]:
    """Cell-centre longitudes, latitudes (ascending) [deg] and forecast times (datetime64[ms])."""
    lon = np.round(np.arange(GRID_LON_DEG[0], GRID_LON_DEG[1] + 1e-9, GRID_STEP_DEG), 6)
    lat = np.round(np.arange(GRID_LAT_DEG[0], GRID_LAT_DEG[1] + 1e-9, GRID_STEP_DEG), 6)
    times = FORECAST_START_UTC + np.arange(FORECAST_STEPS) * np.timedelta64(FORECAST_STEP_H, "h")
    return lon, lat, times.astype("datetime64[ms]")


def _island_distance_deg(lon2: FloatArray, lat2: FloatArray) -> FloatArray:
    cx, cy = ISLAND_CENTRE_DEG
    dx = (lon2 - cx) * math.cos(math.radians(cy))
    # a slightly irregular outline of our own: radius varies with bearing
    ang = np.arctan2(lat2 - cy, dx)
    r = ISLAND_RADIUS_DEG * (1.0 + 0.18 * np.cos(3.0 * ang) + 0.08 * np.sin(5.0 * ang))
    return np.hypot(dx, lat2 - cy) / r


def island_outline(n: int = 90) -> Tuple[Tuple[float, float], ...]:
    """Closed outline of Tarrow Island as (lon, lat) pairs: the curve where the scaled distance of
    :func:`_island_distance_deg` equals 1 (first and last points equal, RFC 7946 s.3.1.6)."""
    cx, cy = ISLAND_CENTRE_DEG
    coslat = math.cos(math.radians(cy))
    ang = np.linspace(0.0, 2.0 * math.pi, n, endpoint=False)
    r = ISLAND_RADIUS_DEG * (1.0 + 0.18 * np.cos(3.0 * ang) + 0.08 * np.sin(5.0 * ang))
    pts = [(float(cx + r_i * math.cos(a) / coslat), float(cy + r_i * math.sin(a))) for a, r_i in zip(ang, r)]
    return tuple(pts + [pts[0]])


def land_mask(lon_deg: FloatArray, lat_deg: FloatArray) -> np.ndarray:
    """True on Tarrow Island (grid of lon x lat given as 1-D axes; shape (ny, nx))."""
    lon2, lat2 = np.meshgrid(lon_deg, lat_deg)
    return _island_distance_deg(lon2, lat2) <= 1.0


def demo_depth_m(lon_deg: FloatArray, lat_deg: FloatArray) -> FloatArray:
    """Invented depth [m, positive down] on the lon x lat grid; 0 on land (shape (ny, nx))."""
    lon2, lat2 = np.meshgrid(lon_deg, lat_deg)
    rel = _island_distance_deg(lon2, lat2)
    depth = 20.0 + 2480.0 * (1.0 - np.exp(-np.maximum(rel - 1.0, 0.0) / 1.6))
    # the Ansel Bank: a shallow bank of our own south-west of the island
    bank = np.exp(-(((lon2 + 20.4) / 0.25) ** 2 + ((lat2 + 25.9) / 0.15) ** 2))
    depth = depth * (1.0 - 0.985 * bank)
    depth[rel <= 1.0] = 0.0
    return depth


@dataclass(frozen=True)
class DemoFields:
    """Forecast fields (nt, ny, nx) [m, s, deg coming from]; NaN on land."""

    lon_deg: FloatArray
    lat_deg: FloatArray
    times_utc: np.ndarray
    swell_hs_m: FloatArray
    swell_tp_s: FloatArray
    swell_dir_deg: FloatArray
    wind_hs_m: FloatArray
    wind_tp_s: FloatArray
    wind_dir_deg: FloatArray
    hs_m: FloatArray
    tp_s: FloatArray
    dir_deg: FloatArray


def demo_fields(*, mask_land: bool = True) -> DemoFields:
    """The invented forecast on :func:`demo_grid`; NaN on the island when ``mask_land``."""
    lon, lat, times = demo_grid()
    t_h = (times - times[0]).astype("timedelta64[m]").astype(float) / 60.0
    T, Y, X = np.meshgrid(t_h, lat, lon, indexing="ij")
    # swell from the south-west, slowly building, sheltered north-east of the island
    swell_hs = 1.0 + 0.8 * (T / t_h[-1])
    cx, cy = ISLAND_CENTRE_DEG
    dxe, dyn = X - cx, Y - cy
    along = (dxe + dyn) / math.sqrt(2.0)  # distance down-wave (towards NE) [deg]
    across = (dxe - dyn) / math.sqrt(2.0)
    shadow = np.where(along > 0, np.exp(-(across / 0.35) ** 2) * np.exp(-along / 1.2), 0.0)
    swell_hs = swell_hs * (1.0 - 0.55 * shadow)
    swell_tp = 11.0 + 2.0 * (T / t_h[-1]) + 0.3 * np.sin(X * 1.3)
    swell_dir = 225.0 + 6.0 * np.sin((Y + 25.5) * 2.0)
    # passing disturbance: centre moves west to east across the area between 30 h and 78 h
    x_c = -23.5 + (T - 30.0) * (7.5 / 48.0)
    y_c = -25.2 + 0.0 * T
    r2 = ((X - x_c) / 1.6) ** 2 + ((Y - y_c) / 1.3) ** 2
    strength = np.clip(np.sin(np.pi * (T - 24.0) / 60.0), 0.0, None) * (T > 24.0) * (T < 84.0)
    wind_hs = 0.35 + 2.7 * strength * np.exp(-r2)
    wind_tp = 3.2 + 4.6 * np.sqrt(wind_hs / 3.05)
    # veering from south (ahead of the centre) to west (behind it)
    behind = np.clip((x_c - X) / 2.0, -1.0, 1.0)
    wind_dir = 225.0 + 45.0 * behind
    land = land_mask(lon, lat)[None, :, :]
    land_b = np.broadcast_to(land, T.shape)
    hs = np.sqrt(swell_hs**2 + wind_hs**2)
    swell_wins = swell_hs >= wind_hs
    tp = np.where(swell_wins, swell_tp, wind_tp)
    wdir = np.where(swell_wins, swell_dir, wind_dir)
    swell_dir, wind_dir, wdir = (np.mod(a, 360.0) for a in (swell_dir, wind_dir, wdir))
    arrays = [swell_hs, swell_tp, swell_dir, wind_hs, wind_tp, wind_dir, hs, tp, wdir]
    if mask_land:
        arrays = [np.where(land_b, np.nan, a) for a in arrays]
    return DemoFields(lon, lat, times, *arrays)


@dataclass(frozen=True)
class DemoScenario:
    """Paths and settings of a built demo scenario."""

    folder: str
    netcdf_path: str
    grib_path: str
    bathymetry_path: str
    route_path: str
    land_path: str
    vessel: str
    legs: Tuple[Dict[str, object], ...]
    forecast_start_utc: np.datetime64
    forecast_end_utc: np.datetime64
    description: str


def _route_geojson(path: str) -> None:
    features = []
    for i, leg in enumerate(DEMO_LEGS):
        features.append({
            "type": "Feature",
            "properties": {
                "name": leg["name"],
                "depart_utc": leg["depart_utc"],
                "speed_kn": leg["speed_kn"],
                "leg": i + 1,
            },
            "geometry": {"type": "LineString", "coordinates": [list(c) for c in leg["coords"]]},
        })
    doc = {"type": "FeatureCollection", "name": "merrow_reach_route", "features": features}
    with open(path, "w", encoding="utf-8") as fh:
        json.dump(doc, fh, indent=1)


def _land_geojson(path: str) -> None:
    doc = {"type": "FeatureCollection", "name": "merrow_reach_land", "features": [{
        "type": "Feature", "properties": {"name": "Tarrow Island (invented)"},
        "geometry": {"type": "Polygon", "coordinates": [[list(p) for p in island_outline()]]},
    }]}
    with open(path, "w", encoding="utf-8") as fh:
        json.dump(doc, fh)


def build_demo_scenario(folder: str) -> DemoScenario:
    """Write the demo files into ``folder`` (created if needed) and describe them."""
    from . import writers

    if not folder:
        raise SeawayInputError("folder must name an output folder for the demo, got ''")
    os.makedirs(folder, exist_ok=True)
    if not os.access(folder, os.W_OK):
        raise SeawayInputError(f"folder {show(folder)} is not writable: choose another output folder")
    f = demo_fields()
    nc = os.path.join(folder, "merrow_reach_forecast.nc")
    grb = os.path.join(folder, "merrow_reach_forecast.grib2")
    tif = os.path.join(folder, "merrow_reach_depth.tif")
    route = os.path.join(folder, "merrow_reach_route.geojson")
    land = os.path.join(folder, "merrow_reach_land.geojson")
    for old in (nc, grb, tif, route, land):
        # fresh files every time (GDAL's GRIB writer fails on an existing file)
        if os.path.exists(old):
            os.remove(old)
    cf = {
        "sea_surface_wave_significant_height": f.hs_m,
        "sea_surface_wave_period_at_variance_spectral_density_maximum": f.tp_s,
        "sea_surface_wave_from_direction": f.dir_deg,
        "sea_surface_wind_wave_significant_height": f.wind_hs_m,
        "sea_surface_wind_wave_period_at_variance_spectral_density_maximum": f.wind_tp_s,
        "sea_surface_wind_wave_from_direction": f.wind_dir_deg,
        "sea_surface_primary_swell_wave_significant_height": f.swell_hs_m,
        "sea_surface_primary_swell_wave_period_at_variance_spectral_density_maximum": f.swell_tp_s,
        "sea_surface_primary_swell_wave_from_direction": f.swell_dir_deg,
    }
    writers.write_cf_netcdf(nc, f.lon_deg, f.lat_deg, f.times_utc, cf)
    # GRIB2 simple packing has no missing values (GDAL refuses NaN), so the GRIB copy carries
    # the unmasked fields over the island; the NetCDF copy and the bathymetry mark it as land.
    g = demo_fields(mask_land=False)
    canonical = {
        "hs": g.hs_m, "tp": g.tp_s, "dir": g.dir_deg,
        "wind_hs": g.wind_hs_m, "wind_tp": g.wind_tp_s, "wind_dir": g.wind_dir_deg,
        "swell1_hs": g.swell_hs_m, "swell1_tp": g.swell_tp_s, "swell1_dir": g.swell_dir_deg,
    }
    writers.write_grib2(grb, g.lon_deg, g.lat_deg, g.times_utc, canonical)
    writers.write_bathymetry_geotiff(tif, f.lon_deg, f.lat_deg, demo_depth_m(f.lon_deg, f.lat_deg),
                                     convention="depth_positive_down", write_positive=True)
    _route_geojson(route)
    _land_geojson(land)
    return DemoScenario(
        folder=folder,
        netcdf_path=nc,
        grib_path=grb,
        bathymetry_path=tif,
        route_path=route,
        land_path=land,
        vessel=DEMO_VESSEL,
        legs=DEMO_LEGS,
        forecast_start_utc=f.times_utc[0],
        forecast_end_utc=f.times_utc[-1],
        description=(
            "Invented scenario 'Merrow Reach': a fictional island and shelf, a building "
            "south-westerly swell and a passing wind sea; no real data."
        ),
    )
