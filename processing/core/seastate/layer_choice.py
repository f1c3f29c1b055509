# SPDX-License-Identifier: GPL-2.0-or-later
"""One layer per canonical variable from many files: preference order, time-axis merging, warnings.

Rules: within one file the lower ``priority`` wins (e.g. a coming-from direction before a going-to
one); across files the first file wins; a later file on the *same grid* with the same units and
direction sense extends the time axis (forecasts delivered one file per step); times it repeats
are taken from the file read first, with a warning naming that file.
"""
from __future__ import annotations

from dataclasses import replace
from typing import Dict, List, Optional

import numpy as np

from .layer import VariableLayer
from ..validation import show


def same_grid(a: VariableLayer, b: VariableLayer) -> bool:
    ga, gb = a.grid, b.grid
    return (ga.nx, ga.ny, ga.crs_label) == (gb.nx, gb.ny, gb.crs_label) and np.allclose(
        ga.geotransform, gb.geotransform, rtol=0, atol=1e-9)


def file_of(gdal_name: str) -> str:
    """Plain file path of a GDAL dataset name (strips NETCDF:"...":var)."""
    if gdal_name.upper().startswith("NETCDF:"):
        return gdal_name.split(":", 1)[1].rsplit(":", 1)[0].strip('"')
    return gdal_name


def choose_layers(layers_in_order: List[VariableLayer], warnings: List[str]) -> Dict[str, VariableLayer]:
    """One layer per canonical variable: first file wins; same-grid files extend the time axis."""
    chosen: Dict[str, VariableLayer] = {}
    for layer in layers_in_order:
        c = layer.canonical
        old = chosen.get(c)
        if old is None:
            chosen[c] = layer
            continue
        if old.file == layer.file:
            if layer.priority < old.priority:
                chosen[c] = layer
                warnings.append(f"{layer.file}: {show(c)} found as {show(old.file_variable)} and "
                                f"{show(layer.file_variable)}; {show(layer.file_variable)} is used")
            else:
                warnings.append(f"{layer.file}: {show(c)} found as {show(old.file_variable)} and "
                                f"{show(layer.file_variable)}; {show(old.file_variable)} is used")
            continue
        if same_grid(old, layer) and old.units.factor == layer.units.factor and old.going_to == layer.going_to:
            t_old = set(int(t) for t in old.times_s)
            dup = [t for t in layer.times_s if int(t) in t_old]
            if dup:
                holder = file_of(old.bands[int(np.flatnonzero(old.times_s == dup[0])[0])][0])
                warnings.append(
                    f"{show(c)}: {layer.file} repeats {len(dup)} time(s) already read (first "
                    f"{np.datetime64(int(dup[0]), 's')}Z from {holder}); {holder} is used"
                )
            entries = list(zip(old.times_s.tolist(), old.bands))
            entries += [(int(t), b) for t, b in zip(layer.times_s.tolist(), layer.bands) if int(t) not in t_old]
            if len(entries) == len(old.bands):
                continue
            entries.sort(key=lambda e: e[0])
            chosen[c] = replace(old, times_s=np.array([e[0] for e in entries], dtype=np.int64),
                                bands=tuple(e[1] for e in entries),
                                files=tuple(dict.fromkeys(old.all_files + layer.all_files)))
            continue
        overlap = not (layer.times_s[-1] < old.times_s[0] or layer.times_s[0] > old.times_s[-1])
        why = "for the same times" if overlap else "on a different grid"
        warnings.append(f"{show(c)} is in both {old.file} and {layer.file} {why}; {old.file} is used")
    return chosen


def choose_by_member(layers_in_order: List[VariableLayer], warnings: List[str]
                     ) -> Dict[Optional[int], Dict[str, VariableLayer]]:
    """:func:`choose_layers` once per ensemble member (deterministic layers join every member);
    ``{None: ...}`` when no layer has a member. Warnings are collected once each."""
    members = sorted({l.member for l in layers_in_order if l.member is not None})
    if not members:
        return {None: choose_layers(layers_in_order, warnings)}
    out: Dict[Optional[int], Dict[str, VariableLayer]] = {}
    for m in members:
        found: List[str] = []
        out[m] = choose_layers([l for l in layers_in_order if l.member in (None, m)], found)
        warnings.extend(w for w in found if w not in warnings)
    return out
