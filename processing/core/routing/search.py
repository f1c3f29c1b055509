# SPDX-License-Identifier: GPL-2.0-or-later
"""Time-dependent bi-criteria label-setting on the stage lattice: the time-vs-exposure front.

A label at a node is (arrival time t [s since departure], exposure D [m**2/s**3], parent).
Edges only lead from stage i to stage i + 1, so the lattice is acyclic and labels are set
stage by stage (the multi-criteria label-setting of Martins E.Q.V. (1984) "On a
multicriteria shortest path problem", Eur. J. Oper. Res. 16(2) 236-245, on a DAG; time
dependence as in Orda A. & Rom R. (1990) "Shortest-path and minimum-delay algorithms in
networks with time-dependent edge-length", J. ACM 37(3) 607-625): extending a label over an
edge e gives t' = t + L_e / U and D' = D + c_e(t), c_e(t) the edge's dose when it is started at
time t (the sea at the hour the boat gets there), linear between the tabulated start times
(:class:`EdgeCostTable`). At each node only the labels no other label dominates are kept
(smaller or equal time and exposure, one strictly; exposure ties within a relative 1e-9),
thinned to at most ``max_labels`` spread evenly over time with both extremes kept (the
thinning is the only approximation besides the lattice). A label is dropped when even the
direct geodesic from its node to the end would exceed the time budget
T_max = (1 + max_detour) L_ref / U (constant speed, so time and track length are the same
constraint). The labels reaching the end form the Pareto front.

Picks on the front (:func:`front_picks`): ``fastest`` least time (then least exposure),
``gentlest`` least exposure (then least time), ``balanced`` the knee: with time and exposure
scaled to 0..1 between the two extremes, the point farthest below the straight line joining
them (largest 1 - t* - D*), after Das I. (1999) "On characterizing the 'knee' of the Pareto
curve based on Normal-Boundary Intersection", Struct. Optim. 18, 107-115.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import List, Optional, Tuple

import numpy as np
from numpy.typing import NDArray

from ..passage.progress import Progress, Span
from ..units import FloatArray
from .lattice import Lattice

__all__ = ["EdgeCostTable", "Front", "label_setting", "front_picks", "DEFAULT_MAX_LABELS"]

DEFAULT_MAX_LABELS: int = 24
"""Labels kept per node after the dominance filter."""


@dataclass(frozen=True)
class EdgeCostTable:
    """Dose of each lattice edge (E, W) started at times (first_slot[e] + j) * slot_s [s]."""

    first_slot: NDArray[np.int64]
    dose: FloatArray
    slot_s: float

    def at(self, edge: NDArray[np.int64], t_s: FloatArray) -> FloatArray:
        """Dose of ``edge`` started at ``t_s`` [s], linear between slots, clamped to the table."""
        x = t_s / self.slot_s - self.first_slot[edge]
        w_max = self.dose.shape[1] - 1
        x = np.clip(x, 0.0, w_max)
        j0 = np.floor(x).astype(np.int64)
        j1 = np.minimum(j0 + 1, w_max)
        d0, d1 = self.dose[edge, j0], self.dose[edge, j1]
        d1 = np.where(np.isfinite(d1), d1, d0)
        f = x - j0
        return (1.0 - f) * d0 + f * d1


@dataclass(frozen=True)
class Front:
    """The labels reaching the end: ``time_s``, ``dose_m2_s3`` and the offset index of the
    track at every stage, ``paths`` (n, S); ``n_labels`` labels set in all."""

    time_s: FloatArray
    dose_m2_s3: FloatArray
    paths: NDArray[np.int64]
    n_labels: int


def _pareto(group: NDArray[np.int64], t: FloatArray, d: FloatArray, max_labels: int) -> NDArray[np.int64]:
    """Indices of the labels kept per group: non-dominated, then thinned (module docstring)."""
    if group.size == 0:
        return np.zeros(0, dtype=np.int64)
    order = np.lexsort((d, t, group))
    g, dd = group[order], d[order]
    big = 2.0 * float(np.max(np.abs(dd))) + 1.0
    key = dd - g * big
    prev = np.minimum.accumulate(np.r_[np.inf, key[:-1]])
    keep = order[key < prev - 1e-9 * np.maximum(np.abs(dd), 1e-12)]
    kg = group[keep]
    counts = np.bincount(kg - kg.min()) if kg.size else np.zeros(0, np.int64)
    if counts.size == 0 or counts.max() <= max_labels:
        return keep
    out: List[NDArray[np.int64]] = []
    for gv in np.unique(kg):
        sel = keep[kg == gv]
        if sel.size > max_labels:
            sel = sel[np.unique(np.round(np.linspace(0, sel.size - 1, max_labels)).astype(np.int64))]
        out.append(sel)
    return np.concatenate(out)


def _expand(lat: Lattice, table: EdgeCostTable, legal: NDArray[np.int64], k: NDArray[np.int64],
            t: FloatArray, d: FloatArray, u: float) -> Tuple[NDArray[np.int64], ...]:
    """Every label x every legal edge out of its node: (label index, edge index, t', D')."""
    kf = lat.k_from[legal]
    lo, hi = np.searchsorted(kf, k, "left"), np.searchsorted(kf, k, "right")
    cnt = hi - lo
    li = np.repeat(np.arange(k.size), cnt)
    ei = legal[np.repeat(lo, cnt) + np.arange(li.size) - np.repeat(np.cumsum(cnt) - cnt, cnt)]
    return li, ei, t[li] + lat.length_m[ei] / u, d[li] + table.at(ei, t[li])


def label_setting(lat: Lattice, table: EdgeCostTable, speed_m_s: float, budget_s: float, *,
                  max_labels: int = DEFAULT_MAX_LABELS, progress: Optional[Progress] = None) -> Front:
    """The Pareto front of (time, exposure) from the start to the end (module docstring)."""
    span = Span(progress, what="track search")
    n_st = lat.lon_deg.shape[0]
    k, t, d = np.array([lat.centre]), np.zeros(1), np.zeros(1)
    ks: List[NDArray[np.int64]] = [k]
    parents: List[NDArray[np.int64]] = [np.array([-1])]
    n_labels = 1
    for i in range(n_st - 1):
        legal = np.flatnonzero((lat.stage == i) & (lat.reason == 0))
        li, ei, t2, d2 = _expand(lat, table, legal, k, t, d, speed_m_s)
        k2 = lat.k_to[ei]
        ok = np.isfinite(d2) & (t2 + lat.to_end_m[i + 1, k2] / speed_m_s <= budget_s * (1 + 1e-9) + 1.0)
        keep = np.flatnonzero(ok)[_pareto(k2[ok], t2[ok], d2[ok], max_labels)]
        k, t, d = k2[keep], t2[keep], d2[keep]
        ks.append(k)
        parents.append(li[keep])
        n_labels += k.size
        if k.size == 0:
            break
        span.check((i + 1) / (n_st - 1))
    return Front(t, d, _backtrack(ks, parents), n_labels) if len(ks) == n_st else \
        Front(np.zeros(0), np.zeros(0), np.zeros((0, n_st), np.int64), n_labels)


def _backtrack(ks: List[NDArray[np.int64]], parents: List[NDArray[np.int64]]) -> NDArray[np.int64]:
    """Offset index per stage of every final label (n_final, S)."""
    n_st = len(ks)
    idx = np.arange(ks[-1].size)
    paths = np.zeros((idx.size, n_st), dtype=np.int64)
    for s in range(n_st - 1, -1, -1):
        paths[:, s] = ks[s][idx]
        idx = parents[s][idx]
    return paths


def front_picks(time_s: FloatArray, dose: FloatArray) -> Tuple[int, int, int]:
    """(fastest, balanced, gentlest) indices into the front (module docstring)."""
    fastest = int(np.lexsort((dose, time_s))[0])
    gentlest = int(np.lexsort((time_s, dose))[0])
    t_span = time_s[gentlest] - time_s[fastest]
    d_span = dose[fastest] - dose[gentlest]
    if not (t_span > 0 and d_span > 0):
        return fastest, fastest if dose[fastest] <= dose[gentlest] else gentlest, gentlest
    ts = (time_s - time_s[fastest]) / t_span
    ds = (dose - dose[gentlest]) / d_span
    gain = 1.0 - ts - ds
    gain[(ts < 0) | (ds < 0)] = -np.inf
    return fastest, int(np.argmax(gain)), gentlest
