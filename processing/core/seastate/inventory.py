# SPDX-License-Identifier: GPL-2.0-or-later
"""Inventory of a sea-state source: what was found, how it was recognised, grids and time axes."""
from __future__ import annotations

from dataclasses import asdict, dataclass
from typing import Any, Dict, Optional, Tuple

import numpy as np

from ..flags import CAUTION
from ..validation import show


@dataclass(frozen=True)
class GridDescription:
    shape: Tuple[int, int]           # (rows, cols)
    extent: Tuple[float, float, float, float]  # xmin, ymin, xmax, ymax of cell edges (grid CRS)
    resolution: Tuple[float, float]  # cell size x, y (grid CRS units)
    lon_convention: str              # "0..360", "-180..180", "projected", or the centre range
    crs: str
    global_wrap: bool


@dataclass(frozen=True)
class VariableEntry:
    canonical: str
    file: str
    file_variable: str
    recognised_by: str
    units_in: str
    conversion: str
    direction_note: str
    grid: GridDescription
    time_start_utc: Optional[str]
    time_end_utc: Optional[str]
    time_step_s: Optional[float]     # median step; None for a single time
    time_count: int
    used: bool
    notes: Tuple[str, ...] = ()


@dataclass(frozen=True)
class IgnoredEntry:
    file: str
    name: str
    reason: str


@dataclass(frozen=True)
class Inventory:
    source_name: str
    files: Tuple[str, ...]
    variables: Tuple[VariableEntry, ...]
    ignored: Tuple[IgnoredEntry, ...]
    warnings: Tuple[str, ...]
    caution: str = CAUTION
    members: Tuple[int, ...] = ()  # ensemble member labels; () for a deterministic source
    members_text: str = ""  # e.g. "51 ensemble members: 0..50; control 0; perturbed 1..50"

    def as_dict(self) -> Dict[str, Any]:
        return asdict(self)

    def as_text(self) -> str:
        lines = [f"Sea-state source: {self.source_name}", "Files:"]
        lines += [f"  {f}" for f in self.files]
        if self.members:
            lines.append(f"Ensemble: {self.members_text} (variables listed for member {self.members[0]})")
        lines.append("Variables:")
        for v in self.variables:
            g = v.grid
            lines.append(
                f"  {v.canonical:<11} {'' if v.used else '(not used) '}from {show(v.file_variable)} in {v.file}"
            )
            lines.append(f"      recognised by: {v.recognised_by}")
            lines.append(f"      units: {v.conversion}" + (f"; {v.direction_note}" if v.direction_note else ""))
            lines.append(
                f"      grid: {g.shape[0]} x {g.shape[1]} cells, extent {g.extent}, resolution "
                f"{g.resolution[0]:g} x {g.resolution[1]:g}, longitudes {g.lon_convention}, CRS {g.crs}"
                + (", global (wraps)" if g.global_wrap else "")
            )
            step = "" if v.time_step_s is None else f", step {v.time_step_s / 3600.0:g} h"
            lines.append(f"      time: {v.time_start_utc} .. {v.time_end_utc}, {v.time_count} steps{step}")
            for note in v.notes:
                lines.append(f"      note: {note}")
        if self.ignored:
            lines.append("Not used:")
            lines += [f"  {e.name} in {e.file}: {e.reason}" for e in self.ignored]
        if self.warnings:
            lines.append("Warnings:")
            lines += [f"  {w}" for w in self.warnings]
        lines.append(self.caution)
        return "\n".join(lines)


def entry_for_layer(layer: "VariableLayer", used: bool) -> VariableEntry:  # noqa: F821
    d = layer.grid.describe()
    grid = GridDescription(
        shape=tuple(d["shape"]), extent=tuple(d["extent"]), resolution=tuple(d["resolution"]),  # type: ignore[arg-type]
        lon_convention=str(d["lon_convention"]), crs=str(d["crs"]), global_wrap=bool(d["global_wrap"]),
    )
    t = layer.times_s
    step = float(np.median(np.diff(t))) if t.size > 1 else None
    direction_note = next((n for n in layer.notes if "coming-from" in n or "going-to" in n), "")
    others = tuple(n for n in layer.notes if n != direction_note)
    files = layer.all_files
    return VariableEntry(
        canonical=layer.canonical, file=layer.file if len(files) == 1 else f"{len(files)} files from {layer.file}",
        file_variable=layer.file_variable, recognised_by=layer.recognised_by,
        units_in=layer.units.unit_in, conversion=layer.units.description, direction_note=direction_note,
        grid=grid,
        time_start_utc=f"{np.datetime64(int(t[0]), 's')}Z" if t.size else None,
        time_end_utc=f"{np.datetime64(int(t[-1]), 's')}Z" if t.size else None,
        time_step_s=step, time_count=int(t.size), used=used, notes=others,
    )
