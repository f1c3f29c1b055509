# SPDX-License-Identifier: GPL-2.0-or-later
"""Raster grid geometry: geotransform, longitude conventions, antimeridian wrap, projected CRS.

A GDAL geotransform ``gt`` maps pixel/line coordinates (P, L) of cell *edges* to georeferenced
coordinates: ``X = gt0 + P gt1 + L gt2``, ``Y = gt3 + P gt4 + L gt5`` (GDAL Raster Data Model,
"Affine GeoTransform"). The centre of cell (col i, row j) is at (P, L) = (i + 0.5, j + 0.5). We
work in *centre index* coordinates ``col_f = P - 0.5``, ``row_f = L - 0.5`` so that integer
values fall on cell centres, the points where bilinear weights are 1.

Geographic grids: a sample longitude is brought into the grid's own 360-degree window
``[x_edge_west, x_edge_west + 360)``, so 0..360, -180..180 and re-wrapped GRIB grids all take
longitudes in any convention; a grid spanning 360 degrees wraps (columns modulo nx). Projected
grids: sample lon/lat (WGS 84, EPSG:4326) are transformed to the grid CRS with pyproj
(``always_xy=True``).
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Dict, Tuple

import numpy as np
from numpy.typing import NDArray

from ..units import FloatArray
from ..validation import SeawayInputError

EARTH_MEAN_RADIUS_KM = 6371.0088
"""Mean Earth radius R1 = (2a + b)/3 of WGS 84 [km] (Moritz 2000, Geodetic Reference System 1980,
J. Geodesy 74, 128-133; value from memory), used for search distances only."""


@dataclass(frozen=True)
class GridGeometry:
    """Geometry of one raster grid (all that sampling needs, no file handle)."""

    nx: int
    ny: int
    geotransform: Tuple[float, float, float, float, float, float]
    crs_wkt: str = ""
    is_geographic: bool = True
    crs_label: str = "EPSG:4326"
    crs_assumed: bool = False
    _inv: Tuple[float, ...] = field(default=(), repr=False, compare=False)

    def __post_init__(self) -> None:
        gt = tuple(float(v) for v in self.geotransform)
        det = gt[1] * gt[5] - gt[2] * gt[4]
        if self.nx < 1 or self.ny < 1 or not np.isfinite(det) or det == 0:
            raise SeawayInputError(
                f"grid of {self.nx} x {self.ny} cells with geotransform {gt} is degenerate"
            )
        inv = (
            (gt[2] * gt[3] - gt[0] * gt[5]) / det, gt[5] / det, -gt[2] / det,
            (gt[0] * gt[4] - gt[1] * gt[3]) / det, -gt[4] / det, gt[1] / det,
        )
        object.__setattr__(self, "geotransform", gt)
        object.__setattr__(self, "_inv", inv)

    # ------------------------------------------------------------------ properties
    @property
    def rotated(self) -> bool:
        return self.geotransform[2] != 0.0 or self.geotransform[4] != 0.0

    @property
    def wraps(self) -> bool:
        """True for a north-up geographic grid whose columns span 360 degrees (a global ring)."""
        gt = self.geotransform
        return (self.is_geographic and not self.rotated
                and abs(abs(gt[1]) * self.nx - 360.0) <= 1e-6 * 360.0)

    @property
    def centre_lon_range(self) -> Tuple[float, float]:
        gt = self.geotransform
        a = gt[0] + 0.5 * gt[1]
        b = gt[0] + (self.nx - 0.5) * gt[1]
        return (min(a, b), max(a, b))

    @property
    def lon_convention(self) -> str:
        if not self.is_geographic:
            return "projected"
        lo, hi = self.centre_lon_range
        if lo >= -1e-9 and hi > 180.0:
            return "0..360"
        if lo >= -180.0 - 1e-9 and hi <= 180.0 + 1e-9:
            return "-180..180"
        return f"{lo:g}..{hi:g}"

    def extent(self) -> Tuple[float, float, float, float]:
        """(xmin, ymin, xmax, ymax) of the cell edges in grid CRS units."""
        gt = self.geotransform
        xs = [gt[0] + p * gt[1] + q * gt[2] for p in (0, self.nx) for q in (0, self.ny)]
        ys = [gt[3] + p * gt[4] + q * gt[5] for p in (0, self.nx) for q in (0, self.ny)]
        return (min(xs), min(ys), max(xs), max(ys))

    def resolution(self) -> Tuple[float, float]:
        gt = self.geotransform
        return (math.hypot(gt[1], gt[4]), math.hypot(gt[2], gt[5]))

    def cell_size_km(self) -> float:
        """Smallest cell side in km (at the equator for geographic grids)."""
        rx, ry = self.resolution()
        if self.is_geographic:
            return min(rx, ry) * math.pi / 180.0 * EARTH_MEAN_RADIUS_KM
        return min(rx, ry) / 1000.0  # projected units taken as metres

    def describe(self) -> Dict[str, object]:
        rx, ry = self.resolution()
        return {
            "shape": (self.ny, self.nx),
            "extent": tuple(round(v, 9) for v in self.extent()),
            "resolution": (rx, ry),
            "lon_convention": self.lon_convention,
            "crs": self.crs_label + (" (assumed: file has none)" if self.crs_assumed else ""),
            "global_wrap": self.wraps,
        }

    # ------------------------------------------------------------------ transforms
    def _to_grid_xy(self, lon_deg: FloatArray, lat_deg: FloatArray) -> Tuple[FloatArray, FloatArray]:
        if self.is_geographic:
            x = np.asarray(lon_deg, dtype=float)
            if not self.rotated:
                west = min(self.geotransform[0], self.geotransform[0] + self.nx * self.geotransform[1])
                x = west + np.mod(x - west, 360.0)
            return x, np.asarray(lat_deg, dtype=float)
        tr = _transformer(self.crs_wkt, to_grid=True)
        x, y = tr.transform(np.asarray(lon_deg, dtype=float), np.asarray(lat_deg, dtype=float))
        return np.asarray(x, dtype=float), np.asarray(y, dtype=float)

    def centre_index(self, lon_deg: FloatArray, lat_deg: FloatArray) -> Tuple[FloatArray, FloatArray, NDArray[np.bool_]]:
        """Fractional centre-index coordinates (col_f, row_f) and the inside-the-grid mask.

        Inside means within the cell *edges* (``-0.5 <= col_f <= nx - 0.5``); a wrapping grid has
        no column limit. Non-finite transforms count as outside.
        """
        x, y = self._to_grid_xy(lon_deg, lat_deg)
        a = self._inv
        p = a[0] + a[1] * x + a[2] * y
        q = a[3] + a[4] * x + a[5] * y
        col_f = p - 0.5
        row_f = q - 0.5
        inside = np.isfinite(col_f) & np.isfinite(row_f)
        inside &= (row_f >= -0.5) & (row_f <= self.ny - 0.5)
        if not self.wraps:
            inside &= (col_f >= -0.5) & (col_f <= self.nx - 0.5)
        return col_f, row_f, inside

    def centre_lonlat(self, col: NDArray[np.int64], row: NDArray[np.int64]) -> Tuple[FloatArray, FloatArray]:
        """Longitude/latitude (WGS 84) of cell centres given by integer indices."""
        gt = self.geotransform
        p = np.asarray(col, dtype=float) + 0.5
        q = np.asarray(row, dtype=float) + 0.5
        x = gt[0] + p * gt[1] + q * gt[2]
        y = gt[3] + p * gt[4] + q * gt[5]
        if self.is_geographic:
            return x, y
        tr = _transformer(self.crs_wkt, to_grid=False)
        lon, lat = tr.transform(x, y)
        return np.asarray(lon, dtype=float), np.asarray(lat, dtype=float)


_TRANSFORMERS: Dict[Tuple[str, bool], object] = {}


def _transformer(crs_wkt: str, *, to_grid: bool):  # type: ignore[no-untyped-def]
    key = (crs_wkt, to_grid)
    tr = _TRANSFORMERS.get(key)
    if tr is None:
        from pyproj import CRS, Transformer

        grid_crs = CRS.from_wkt(crs_wkt)
        if to_grid:
            tr = Transformer.from_crs("EPSG:4326", grid_crs, always_xy=True)
        else:
            tr = Transformer.from_crs(grid_crs, "EPSG:4326", always_xy=True)
        _TRANSFORMERS[key] = tr
    return tr


def great_circle_km(lon1: FloatArray, lat1: FloatArray, lon2: FloatArray, lat2: FloatArray) -> FloatArray:
    """Haversine distance on a sphere of radius :data:`EARTH_MEAN_RADIUS_KM` [km].

    d = 2 R asin(sqrt(sin^2(dphi/2) + cos phi1 cos phi2 sin^2(dlambda/2))) (Sinnott 1984,
    "Virtues of the haversine", Sky & Telescope 68(2), 159; citation from memory). Used only for
    land-search radii; the tests check the nearest cell against geographiclib's WGS 84 geodesics.
    """
    p1, p2 = np.radians(lat1), np.radians(lat2)
    dphi = p2 - p1
    dlam = np.radians(np.asarray(lon2, dtype=float) - np.asarray(lon1, dtype=float))
    h = np.sin(dphi / 2.0) ** 2 + np.cos(p1) * np.cos(p2) * np.sin(dlam / 2.0) ** 2
    return 2.0 * EARTH_MEAN_RADIUS_KM * np.arcsin(np.sqrt(np.clip(h, 0.0, 1.0)))


@dataclass(frozen=True)
class Window:
    """A rectangular read window; columns may be split in two runs across a wrapping seam."""

    row0: int
    nrows: int
    col_runs: Tuple[Tuple[int, int], ...]  # (xoff, xsize) per run, concatenated in order
    col_start: int                          # first column (grid index) of the window
    ncols: int
    wraps: bool

    def local_col(self, col: NDArray[np.int64], nx: int) -> NDArray[np.int64]:
        if self.wraps:
            return np.mod(col - self.col_start, nx)
        return col - self.col_start

    def local_row(self, row: NDArray[np.int64]) -> NDArray[np.int64]:
        return row - self.row0


def read_window_for(grid: GridGeometry, cols: NDArray[np.int64], rows: NDArray[np.int64],
                    margin_cols: int, margin_rows: int) -> Window:
    """Smallest window holding all (col, row) cells plus margins; split at a wrapping seam.

    For a wrapping grid the window is the complement of the largest circular gap between the
    needed columns, so a route crossing the seam reads two thin strips, not the whole ring.
    """
    rmin = max(int(rows.min()) - margin_rows, 0)
    rmax = min(int(rows.max()) + margin_rows, grid.ny - 1)
    if not grid.wraps:
        cmin = max(int(cols.min()) - margin_cols, 0)
        cmax = min(int(cols.max()) + margin_cols, grid.nx - 1)
        return Window(rmin, rmax - rmin + 1, ((cmin, cmax - cmin + 1),), cmin, cmax - cmin + 1, False)
    nx = grid.nx
    u = np.unique(np.mod(cols, nx))
    if u.size == 1:
        start, length = int(u[0]), 1
    else:
        gaps = np.diff(np.concatenate([u, [u[0] + nx]]))
        k = int(np.argmax(gaps))
        start = int(u[(k + 1) % u.size])
        length = nx - int(gaps[k]) + 1
    start -= margin_cols
    length += 2 * margin_cols
    if length >= nx:
        return Window(rmin, rmax - rmin + 1, ((0, nx),), 0, nx, True)
    start %= nx
    if start + length <= nx:
        runs: Tuple[Tuple[int, int], ...] = ((start, length),)
    else:
        runs = ((start, nx - start), (0, start + length - nx))
    return Window(rmin, rmax - rmin + 1, runs, start, length, True)


@dataclass(frozen=True)
class BilinearCorners:
    """The four neighbouring cell centres of n points and their bilinear weights, each (n, 4).

    Corners beyond the grid's rows (or columns, unless it wraps) are not ``valid``, carry weight 0
    and have their indices clipped into the grid (never read as data). Columns of a wrapping grid
    are taken modulo nx.
    """

    cols: NDArray[np.int64]
    rows: NDArray[np.int64]
    weights: FloatArray
    valid: NDArray[np.bool_]


def bilinear_corners(grid: GridGeometry, col_f: FloatArray, row_f: FloatArray) -> BilinearCorners:
    """Bilinear neighbours and weights in centre-index coordinates (:meth:`GridGeometry.centre_index`).

    Weights ``(1-fx)(1-fy), fx(1-fy), (1-fx)fy, fx fy`` for corners (c0, r0), (c0+1, r0),
    (c0, r0+1), (c0+1, r0+1) with ``c0 = floor(col_f)``, ``fx = col_f - c0`` (likewise rows)
    (Press et al., Numerical Recipes, 3rd ed. 2007, s.3.6 eq. 3.6.5; section from memory).
    """
    c0 = np.floor(col_f).astype(np.int64)
    r0 = np.floor(row_f).astype(np.int64)
    fx, fy = col_f - c0, row_f - r0
    cc = np.stack([c0, c0 + 1, c0, c0 + 1], axis=1)
    rr = np.stack([r0, r0, r0 + 1, r0 + 1], axis=1)
    ww = np.stack([(1 - fx) * (1 - fy), fx * (1 - fy), (1 - fx) * fy, fx * fy], axis=1)
    ok = (rr >= 0) & (rr < grid.ny)
    if grid.wraps:
        cc = np.mod(cc, grid.nx)
    else:
        ok &= (cc >= 0) & (cc < grid.nx)
    return BilinearCorners(cols=np.clip(cc, 0, grid.nx - 1), rows=np.clip(rr, 0, grid.ny - 1),
                           weights=np.where(ok, ww, 0.0), valid=ok)
