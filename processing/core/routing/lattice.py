# SPDX-License-Identifier: GPL-2.0-or-later
"""The search lattice: stages along the reference track x lateral offsets across it.

Stages are points of the reference track (densified along its geodesics, about
``stage_nm`` apart, the reference's vertices kept); at each stage the nodes lie on the geodesic
normal to the local course (the azimuth from the previous to the next stage point), at offsets
``k * lateral_nm`` for k = -K..K to starboard (+) and port (-). The first and last stage hold
only the start and the end. A node is usable only inside the detour ellipse
d(start, node) + d(node, end) <= (1 + max_detour) * L_ref (no longer track can pass it).
Edges join a node of stage i to the nodes of stage i + 1 whose offsets differ by at most
``max_jump`` steps. The lattice of lateral offsets around a reference track is the usual
discretisation of ship weather routing by graph search (e.g. Pennino S. et al. (2020),
J. Mar. Sci. Eng. 8(4) 270; Zaccone R. et al. (2018), Ocean Eng. 153, 215-224).
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray

from ..passage.route import densify_route
from ..units import NAUTICAL_MILE_M, FloatArray
from .geodesy import direct, inverse

__all__ = ["Lattice", "LatticeSettings", "lattice_settings", "build_lattice"]


@dataclass(frozen=True)
class LatticeSettings:
    """``stage_nm`` stage spacing, ``lateral_nm`` offset step, ``n_side`` offsets per side,
    ``max_jump`` largest offset change per stage (steps)."""

    stage_nm: float
    lateral_nm: float
    n_side: int
    max_jump: int


def lattice_settings(ref_length_nm: float, max_detour_pct: float, *, n_stages: int = 0, n_side: int = 12) -> LatticeSettings:
    """Default lattice for a reference of ``ref_length_nm``: about one stage per 5 NM (20 to 60
    stages unless ``n_stages`` is given); offsets spanning the half-width of the detour
    ellipse b = L/2 sqrt((1 + p)**2 - 1) (p = max_detour_pct / 100) in ``n_side`` steps per
    side; jumps up to about 60 deg off the reference's course."""
    stages = n_stages or int(min(max(round(ref_length_nm / 5.0), 20), 60))
    stage_nm = ref_length_nm / stages
    p = max(max_detour_pct, 1.0) / 100.0
    half = 0.5 * ref_length_nm * math.sqrt((1.0 + p) ** 2 - 1.0)
    lateral = half / n_side
    jump = int(min(max(round(math.tan(math.radians(60.0)) * stage_nm / lateral), 1), 4))
    return LatticeSettings(stage_nm=stage_nm, lateral_nm=lateral, n_side=n_side, max_jump=jump)


@dataclass(frozen=True)
class Lattice:
    """Nodes (S stages x K offsets): ``lon_deg``, ``lat_deg``, ``usable``; edges: ``stage``,
    ``k_from``, ``k_to``, ``length_m``, ``reason`` (0 = legal, else :mod:`.legality` bits);
    ``to_start_m``/``to_end_m`` geodesic distance of each node to the start/end; ``ref_length_m``."""

    lon_deg: FloatArray
    lat_deg: FloatArray
    usable: NDArray[np.bool_]
    to_start_m: FloatArray
    to_end_m: FloatArray
    stage: NDArray[np.int64]
    k_from: NDArray[np.int64]
    k_to: NDArray[np.int64]
    length_m: FloatArray
    reason: NDArray[np.int64]
    ref_length_m: float
    settings: LatticeSettings

    @property
    def centre(self) -> int:
        return self.settings.n_side

    def edge_ends(self) -> "tuple[FloatArray, FloatArray, FloatArray, FloatArray]":
        """(lon0, lat0, lon1, lat1) of every edge."""
        s, a, b = self.stage, self.k_from, self.k_to
        return self.lon_deg[s, a], self.lat_deg[s, a], self.lon_deg[s + 1, b], self.lat_deg[s + 1, b]


def _stage_points(ref_lon: FloatArray, ref_lat: FloatArray, stage_nm: float) -> "tuple[FloatArray, FloatArray, FloatArray, float]":
    """Stage points along the reference, the normal-defining course at each and the length [m]."""
    rs = densify_route(ref_lon, ref_lat, stage_nm)
    lon, lat = rs.lon_deg, rs.lat_deg
    prev = np.r_[0, np.arange(lon.size - 1)]
    nxt = np.r_[np.arange(1, lon.size), lon.size - 1]
    course = inverse(lon[prev], lat[prev], lon[nxt], lat[nxt])[0]
    return lon, lat, course, float(rs.dist_m[-1])


def build_lattice(ref_lon: FloatArray, ref_lat: FloatArray, settings: LatticeSettings, max_detour_pct: float) -> Lattice:
    """The lattice (module docstring); edges all marked legal (reason 0) until checked."""
    slon, slat, course, ref_len = _stage_points(ref_lon, ref_lat, settings.stage_nm)
    n_st, kk = slon.size, 2 * settings.n_side + 1
    off_m = (np.arange(kk) - settings.n_side) * settings.lateral_nm * NAUTICAL_MILE_M
    az = np.where(off_m[None, :] >= 0, course[:, None] + 90.0, course[:, None] - 90.0)
    lon, lat, _ = direct(np.repeat(slon, kk), np.repeat(slat, kk), az.ravel(), np.tile(np.abs(off_m), n_st))
    lon, lat = lon.reshape(n_st, kk), lat.reshape(n_st, kk)
    lon[:, settings.n_side], lat[:, settings.n_side] = slon, slat
    to_start = inverse(slon[0], slat[0], lon.ravel(), lat.ravel())[2].reshape(n_st, kk)
    to_end = inverse(slon[-1], slat[-1], lon.ravel(), lat.ravel())[2].reshape(n_st, kk)
    usable = to_start + to_end <= (1.0 + max_detour_pct / 100.0) * ref_len * (1.0 + 1e-9) + 1.0
    usable[0, :], usable[-1, :] = False, False
    usable[0, settings.n_side] = usable[-1, settings.n_side] = True
    stage, k_from, k_to = _edges(usable, settings.max_jump)
    length = inverse(lon[stage, k_from], lat[stage, k_from], lon[stage + 1, k_to], lat[stage + 1, k_to])[2]
    return Lattice(lon_deg=lon, lat_deg=lat, usable=usable, to_start_m=to_start, to_end_m=to_end,
                   stage=stage, k_from=k_from, k_to=k_to, length_m=length, reason=np.zeros(stage.size, np.int64),
                   ref_length_m=ref_len, settings=settings)


def _edges(usable: NDArray[np.bool_], max_jump: int) -> "tuple[NDArray[np.int64], ...]":
    """(stage, k_from, k_to) of every edge between usable nodes of consecutive stages, sorted by
    stage then k_from."""
    n_st, kk = usable.shape
    s, a, j = np.meshgrid(np.arange(n_st - 1), np.arange(kk), np.arange(-max_jump, max_jump + 1), indexing="ij")
    b = a + j
    ok = (b >= 0) & (b < kk)
    s, a, b = s[ok], a[ok], b[ok]
    ok = usable[s, a] & usable[s + 1, b]
    return s[ok].astype(np.int64), a[ok].astype(np.int64), b[ok].astype(np.int64)
