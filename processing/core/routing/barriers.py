# SPDX-License-Identifier: GPL-2.0-or-later
"""Barrier polygons (land, exclusion zones, traffic separation areas) and what crosses them.

Polygons are given in WGS84 longitude/latitude as rings (exterior and holes alike); a point is
inside by the even-odd rule over all rings of a polygon (ray casting: Shimrat M. (1962)
"Algorithm 112: Position of point relative to polygon", Comm. ACM 5(8) 434; the crossing-number
form of Haines E. (1994) "Point in polygon strategies", Graphics Gems IV). A segment crosses a
barrier when it properly intersects a ring edge (orientation test, Cormen et al. (2009)
Introduction to Algorithms, 3rd ed., s.33.1) or either end lies inside. Segments are tested as
straight lines in longitude/latitude; callers split geodesics into pieces short enough (<= 1 NM)
that the chord stays within metres of the geodesic. Polygons crossing the antimeridian are not
supported (their longitudes must be continuous).
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence, Tuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..units import FloatArray
from ..validation import SeawayInputError, as_float_array

__all__ = ["Barriers", "barriers_from_rings"]

_CHUNK = 2_000_000
"""Segment x ring-edge pairs per vectorised block (bounds memory)."""


@dataclass(frozen=True)
class Barriers:
    """Ring edges of every barrier polygon: (x0, y0, x1, y1) [deg] and the polygon index of
    each edge; ``names`` one label per polygon (for messages)."""

    x0: FloatArray
    y0: FloatArray
    x1: FloatArray
    y1: FloatArray
    polygon: NDArray[np.int64]
    names: Tuple[str, ...]

    @property
    def empty(self) -> bool:
        return self.x0.size == 0

    def inside(self, lon: ArrayLike, lat: ArrayLike) -> NDArray[np.int64]:
        """Index of the polygon each point lies in (-1 = outside every barrier)."""
        x, y = np.atleast_1d(np.asarray(lon, float)), np.atleast_1d(np.asarray(lat, float))
        out = np.full(x.size, -1, dtype=np.int64)
        if self.empty or x.size == 0:
            return out
        n_poly = len(self.names)
        step = max(1, _CHUNK // max(self.x0.size, 1))
        for a in range(0, x.size, step):
            px, py = x[a:a + step, None], y[a:a + step, None]
            straddle = (self.y0 > py) != (self.y1 > py)
            with np.errstate(divide="ignore", invalid="ignore"):
                xc = self.x0 + (py - self.y0) * (self.x1 - self.x0) / (self.y1 - self.y0)
            hit = straddle & (px < xc)
            counts = np.zeros((px.shape[0], n_poly), dtype=np.int64)
            rows, cols = np.nonzero(hit)
            np.add.at(counts, (rows, self.polygon[cols]), 1)
            odd = counts % 2 == 1
            out[a:a + step] = np.where(odd.any(axis=1), np.argmax(odd, axis=1), -1)
        return out

    def crossed(self, x0: ArrayLike, y0: ArrayLike, x1: ArrayLike, y1: ArrayLike) -> NDArray[np.bool_]:
        """True for each segment that enters a barrier (see the module docstring)."""
        ax, ay, bx, by = (np.atleast_1d(np.asarray(v, float)) for v in (x0, y0, x1, y1))
        out = (self.inside(ax, ay) >= 0) | (self.inside(bx, by) >= 0)
        if self.empty:
            return out
        step = max(1, _CHUNK // max(self.x0.size, 1))
        for a in range(0, ax.size, step):
            s = slice(a, a + step)
            out[s] |= _proper_intersections(ax[s], ay[s], bx[s], by[s], self).any(axis=1)
        return out


def _orient(ax: FloatArray, ay: FloatArray, bx: FloatArray, by: FloatArray, cx: FloatArray, cy: FloatArray) -> FloatArray:
    """Sign of the cross product (b - a) x (c - a): > 0 left turn, < 0 right turn."""
    return np.sign((bx - ax) * (cy - ay) - (by - ay) * (cx - ax))


def _proper_intersections(ax: FloatArray, ay: FloatArray, bx: FloatArray, by: FloatArray, b: Barriers) -> NDArray[np.bool_]:
    """(n, m) True where segment i and ring edge j cross (endpoints strictly on opposite sides)."""
    ax, ay, bx, by = ax[:, None], ay[:, None], bx[:, None], by[:, None]
    d1 = _orient(b.x0, b.y0, b.x1, b.y1, ax, ay)
    d2 = _orient(b.x0, b.y0, b.x1, b.y1, bx, by)
    d3 = _orient(ax, ay, bx, by, b.x0, b.y0)
    d4 = _orient(ax, ay, bx, by, b.x1, b.y1)
    return (d1 * d2 < 0) & (d3 * d4 < 0)


def barriers_from_rings(polygons: Sequence[Sequence[ArrayLike]], names: Sequence[str] = ()) -> Barriers:
    """Barriers from polygons, each a sequence of rings, each ring (k, 2) (lon, lat) [deg]
    in WGS84 (closed or not). Raises :class:`SeawayInputError` for a ring with fewer than 3
    points or non-finite coordinates."""
    cols: list = [[], [], [], [], []]
    for p, rings in enumerate(polygons):
        for r, ring in enumerate(rings):
            xy = as_float_array(f"barrier polygon {p + 1} ring {r + 1}", ring)
            if xy.ndim != 2 or xy.shape[1] < 2 or xy.shape[0] < 3:
                raise SeawayInputError(
                    f"barrier polygon {p + 1} ring {r + 1} needs at least 3 (lon, lat) points, got shape {xy.shape}")
            x, y = xy[:, 0], xy[:, 1]
            nx, ny = np.roll(x, -1), np.roll(y, -1)
            keep = (x != nx) | (y != ny)
            for c, v in zip(cols, (x[keep], y[keep], nx[keep], ny[keep], np.full(int(keep.sum()), p))):
                c.append(v)
    arrs = [np.concatenate(c) if c else np.zeros(0) for c in cols]
    labels = tuple(names) if len(names) == len(polygons) else tuple(f"barrier {i + 1}" for i in range(len(polygons)))
    return Barriers(arrs[0], arrs[1], arrs[2], arrs[3], arrs[4].astype(np.int64), labels)
