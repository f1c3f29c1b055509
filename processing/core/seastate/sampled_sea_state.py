# SPDX-License-Identifier: GPL-2.0-or-later
"""The sea state at route samples, assembled from the sampled layers (combined sea and partitions).

Per sample: combined Hs from ``hs``, else (or where it has no data) sqrt(sum Hs_i^2) of the
partitions; Tp from ``tp``, else from Tm01 / Tm02 / Tm-1,0 with the JONSWAP ratios, else from the
most energetic partition; direction from ``dir``, else from the most energetic partition (rules and
sources in :mod:`.derived`). Every fallback used where the file has the primary variable sets
PARTIAL_VARIABLES; a sample without Hs, Tp and direction is not valid, carries NaN in all three
and at least one flag saying why (never a silent zero).
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Dict, List, Optional, Tuple

import numpy as np
from numpy.typing import NDArray

from ..flags import CAUTION, NOT_COMPUTED_FLAGS, SampleFlag
from ..units import FloatArray
from .derived import (
    MEAN_PERIOD_RATIOS,
    dominant_partition,
    hs_m_from_partitions,
    tp_s_from_mean_period,
)
from .layer import VariableLayer
from .sampler import LayerSample
from ..validation import show


@dataclass(frozen=True)
class SeaArrays:
    """The sea at n samples: combined Hs [m], Tp [s], direction the waves come FROM [deg true],
    and the partitions as (n, p) arrays in the order of ``partition_names`` (NaN = absent)."""

    hs_m: FloatArray
    tp_s: FloatArray
    wave_from_deg: FloatArray
    partition_names: Tuple[str, ...]
    partition_hs_m: FloatArray
    partition_tp_s: FloatArray
    partition_from_deg: FloatArray


@dataclass(frozen=True)
class SampledSeaState(SeaArrays):
    """Sea state at n route samples of one source. NaN + a flag where not computable, never 0."""

    tm01_s: FloatArray
    flags: NDArray[np.int64]
    source_name: str
    valid: NDArray[np.bool_]
    notes: Tuple[str, ...] = ()
    caution: str = CAUTION

    @property
    def n(self) -> int:
        return int(self.hs_m.size)


def _implausible_flags(s: Dict[str, LayerSample], layers: Dict[str, VariableLayer], n: int,
                       notes: List[str], warnings: List[str]) -> NDArray[np.int64]:
    """LAND_ADJUSTED / IMPLAUSIBLE_VALUE from every layer; a warning per layer with odd values."""
    flags = np.zeros(n, dtype=np.int64)
    keep = int(SampleFlag.LAND_ADJUSTED | SampleFlag.IMPLAUSIBLE_VALUE)
    for c, ls in s.items():
        flags |= ls.flags & keep
        if np.any(ls.flags & int(SampleFlag.IMPLAUSIBLE_VALUE)):
            layer = layers[c]
            warn = (f"{layer.file} variable {show(layer.file_variable)} ({c}): implausible values; "
                    f"check the file's units (units read: {show(layer.units.unit_in)})")
            count = int(np.count_nonzero(ls.flags & int(SampleFlag.IMPLAUSIBLE_VALUE)))
            notes.append(f"{warn} - at {count} samples")
            if warn not in warnings:
                warnings.append(warn)
    return flags


def _partition_arrays(s: Dict[str, LayerSample], parts: Tuple[str, ...], n: int,
                      layers: Optional[Dict[str, VariableLayer]] = None, notes: Optional[List[str]] = None
                      ) -> Tuple[FloatArray, FloatArray, FloatArray]:
    """(n, p) Hs, Tp and direction of the partitions, NaN where a partition lacks one.

    A partition period recognised by a CF "..._mean_period" standard name is a mean period, not
    Tp: it is taken as Tm01 (the moment Copernicus-style partition products give; from memory)
    and converted with the JONSWAP ratio Tp = Tm01 / TM01_OVER_TP of :mod:`.derived` (noted)."""
    nan2 = np.full((n, len(parts)), np.nan)
    p_hs, p_tp, p_dir = nan2.copy(), nan2.copy(), nan2.copy()
    for j, p in enumerate(parts):
        for arr, q in ((p_hs, "hs"), (p_tp, "tp"), (p_dir, "dir")):
            if f"{p}_{q}" in s:
                arr[:, j] = s[f"{p}_{q}"].values
        lay = (layers or {}).get(f"{p}_tp")
        if lay is not None and "_mean_period" in str(lay.recognised_by) and f"{p}_tp" in s:
            p_tp[:, j] = tp_s_from_mean_period(p_tp[:, j], "tm01")
            if notes is not None:
                notes.append(f"{p} period is a mean period in the file: Tp = Tm01 / "
                             f"{MEAN_PERIOD_RATIOS['tm01']} (JONSWAP gamma 3.3)")
    return p_hs, p_tp, p_dir


def _dominant_value(p_hs: FloatArray, values: FloatArray) -> Tuple[FloatArray, NDArray[np.bool_]]:
    """Per sample the value of the most energetic partition that has one, and whether that is a
    weaker partition than the most energetic one overall (then PARTIAL)."""
    n = p_hs.shape[0]
    target = np.full(n, np.nan)
    weaker = np.zeros(n, dtype=bool)
    if p_hs.shape[1]:
        dom, _ = dominant_partition(p_hs)
        d2, ok2 = dominant_partition(np.where(np.isfinite(values), p_hs, np.nan))
        target[ok2] = values[np.arange(n)[ok2], d2[ok2]]
        weaker |= ok2 & (d2 != dom)
    return target, weaker


def _combined_hs(s: Dict[str, LayerSample], p_hs: FloatArray, parts: Tuple[str, ...], partial: NDArray[np.bool_],
                 notes: List[str], consulted: List[str]) -> FloatArray:
    """Hs of the file, gaps filled from the partitions; without it sqrt(sum Hs_i^2)."""
    if "hs" not in s:
        consulted += [f"{p}_hs" for p in parts]
        notes.append("combined Hs = sqrt(sum of partition Hs^2); Tp and direction of the most "
                     "energetic partition (the file has no combined sea)")
        return hs_m_from_partitions(p_hs)
    hs = s["hs"].values.copy()
    consulted.append("hs")
    if parts:
        from_parts = hs_m_from_partitions(p_hs)
        fill = ~np.isfinite(hs) & np.isfinite(from_parts)
        if fill.any():
            hs[fill] = from_parts[fill]
            partial |= fill
            notes.append(f"combined Hs missing at {int(fill.sum())} samples: sqrt(sum of partition Hs^2) used")
        consulted += [f"{p}_hs" for p in parts]
    return hs


def _fill_from_dominant(values: FloatArray, dom: Tuple[FloatArray, NDArray[np.bool_]], primary: bool,
                        partial: NDArray[np.bool_], notes: List[str], what: str) -> None:
    """Fill gaps of ``values`` from the most energetic partition; PARTIAL where the file has a
    primary variable for it (or the partition is a weaker one)."""
    dom_v, weaker = dom
    fill = ~np.isfinite(values) & np.isfinite(dom_v)
    if fill.any():
        values[fill] = dom_v[fill]
        partial |= fill & weaker
        if primary:
            partial |= fill
            notes.append(f"{what} of the most energetic partition used at {int(fill.sum())} samples")


def _peak_period(s: Dict[str, LayerSample], p_hs: FloatArray, p_tp: FloatArray, parts: Tuple[str, ...],
                 partial: NDArray[np.bool_], notes: List[str], consulted: List[str]) -> FloatArray:
    """Tp of the file, else from a mean period (JONSWAP ratios), else of the dominant partition."""
    n = p_hs.shape[0]
    tp = s["tp"].values.copy() if "tp" in s else np.full(n, np.nan)
    if "tp" in s:
        consulted.append("tp")
    for key in ("tm01", "tm02", "tm10"):
        if key in s:
            consulted.append(key)
            fill = ~np.isfinite(tp) & np.isfinite(s[key].values)
            if fill.any():
                tp[fill] = tp_s_from_mean_period(s[key].values[fill], key)
                partial |= fill
                notes.append(f"Tp derived from {key} at {int(fill.sum())} samples with "
                             f"{key}/Tp = {MEAN_PERIOD_RATIOS[key]} (JONSWAP gamma 3.3)")
    _fill_from_dominant(tp, _dominant_value(p_hs, p_tp), "hs" in s or "tp" in s, partial, notes, "Tp")
    consulted += [f"{p}_tp" for p in parts if f"{p}_tp" in s]
    return tp


def _wave_from(s: Dict[str, LayerSample], p_hs: FloatArray, p_dir: FloatArray, parts: Tuple[str, ...],
               partial: NDArray[np.bool_], notes: List[str], consulted: List[str]) -> FloatArray:
    """Direction of the file, else of the dominant partition."""
    wdir = s["dir"].values.copy() if "dir" in s else np.full(p_hs.shape[0], np.nan)
    if "dir" in s:
        consulted.append("dir")
    _fill_from_dominant(wdir, _dominant_value(p_hs, p_dir), "hs" in s or "dir" in s, partial, notes, "direction")
    consulted += [f"{p}_dir" for p in parts if f"{p}_dir" in s]
    return wdir


def sea_state_from_layer_samples(s: Dict[str, LayerSample], n: int, layers: Dict[str, VariableLayer],
                                 partitions: Tuple[str, ...], source_name: str, warnings: List[str]) -> SampledSeaState:
    """Combined sea state and partitions from per-layer samples (rules: module docstring)."""
    notes: List[str] = []
    flags = _implausible_flags(s, layers, n, notes, warnings)
    nc = int(NOT_COMPUTED_FLAGS)
    parts = partitions
    p_hs, p_tp, p_dir = _partition_arrays(s, parts, n, layers, notes)
    partial = np.zeros(n, dtype=bool)
    consulted: Dict[str, List[str]] = {"hs": [], "tp": [], "dir": []}
    hs = _combined_hs(s, p_hs, parts, partial, notes, consulted["hs"])
    tp = _peak_period(s, p_hs, p_tp, parts, partial, notes, consulted["tp"])
    wdir = _wave_from(s, p_hs, p_dir, parts, partial, notes, consulted["dir"])
    tm01 = s["tm01"].values.copy() if "tm01" in s else np.full(n, np.nan)
    valid = np.isfinite(hs) & np.isfinite(tp) & np.isfinite(wdir)
    for field_name, arr in (("hs", hs), ("tp", tp), ("dir", wdir)):
        bad = ~np.isfinite(arr)
        for c in consulted[field_name]:
            flags[bad] |= s[c].flags[bad] & nc
        if field_name != "hs" and not consulted[field_name]:
            partial |= bad
    any_nc = np.zeros(n, dtype=bool)
    for ls in s.values():
        any_nc |= (ls.flags & nc) != 0
    partial |= valid & any_nc
    flags[partial] |= int(SampleFlag.PARTIAL_VARIABLES)
    orphan = ~valid & ((flags & nc) == 0) & ((flags & int(SampleFlag.PARTIAL_VARIABLES)) == 0)
    flags[orphan] |= int(SampleFlag.PARTIAL_VARIABLES)
    for arr in (hs, tp, wdir):
        arr[~valid] = np.nan
    return SampledSeaState(
        hs_m=hs, tp_s=tp, wave_from_deg=wdir, partition_names=parts, partition_hs_m=p_hs,
        partition_tp_s=p_tp, partition_from_deg=p_dir, tm01_s=tm01, flags=flags,
        source_name=source_name, valid=valid, notes=tuple(dict.fromkeys(notes)),
    )
