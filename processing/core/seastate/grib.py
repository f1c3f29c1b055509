# SPDX-License-Identifier: GPL-2.0-or-later
"""GRIB2 reader: bands identified by discipline 10 / category 0 parameter numbers and level.

Each GRIB message is one GDAL band. Identification uses, in order: the caller's variable map
(matched against ``GRIB_ELEMENT``), then the product definition template values
``GRIB_PDS_TEMPLATE_ASSEMBLED_VALUES`` (category, number, ..., type and scaled value of the first
fixed surface at positions 10 and 12, WMO FM 92 GRIB2 template 4.0), then ``GRIB_ELEMENT``.
A variable_map value is a GRIB element (``"SWELL"``) or an element at a level,
``"<element>@<level type>:<level value>"`` (``"SWELL@241:2"``: the second swell partition).
The valid time of each message is ``GRIB_VALID_TIME`` (epoch seconds). GDAL re-wraps 0..360
global GRIB grids to -180..180 on read; :mod:`.grid` handles either.
"""
from __future__ import annotations

import re
from typing import Dict, List, Optional, Tuple

import numpy as np

from ..validation import SeawayInputError, show
from .discovery import Discovery, resolve_going_to
from .grid import GridGeometry
from .layer import VariableLayer, grid_from_dataset, open_gdal
from .members import grib_member
from .timeaxis import parse_grib_time
from .variables import (
    GRIB_BY_ELEMENT,
    GRIB_WAVE_PARAMETERS,
    GribParameter,
    canonical_kind,
    grib_canonical,
    unit_conversion,
)


def _ints(text: str) -> List[int]:
    out = []
    for tok in (text or "").split():
        try:
            out.append(int(tok))
        except ValueError:
            out.append(-1)
    return out


def identify_band(md: Dict[str, str]) -> Tuple[Optional[GribParameter], int, float]:
    """(parameter, level type, level value) of one GRIB band from its GDAL metadata."""
    disc_m = re.match(r"\s*(\d+)", md.get("GRIB_DISCIPLINE", ""))
    discipline = int(disc_m.group(1)) if disc_m else -1
    vals = _ints(md.get("GRIB_PDS_TEMPLATE_ASSEMBLED_VALUES", ""))
    pdtn = _ints(md.get("GRIB_PDS_PDTN", "-1"))
    level_type, level_value = -1, 0.0
    param: Optional[GribParameter] = None
    if len(vals) >= 12 and pdtn and pdtn[0] in (0, 1, 8, 11):
        level_type = vals[9]
        scale = vals[10]
        level_value = vals[11] / (10.0 ** scale) if 0 <= scale < 10 else float(vals[11])
        if discipline == 10 and vals[0] == 0:
            param = GRIB_WAVE_PARAMETERS.get(vals[1])
    if param is None and discipline in (10, -1):
        param = GRIB_BY_ELEMENT.get(md.get("GRIB_ELEMENT", ""))
        if param is not None and level_type < 0:
            short = md.get("GRIB_SHORT_NAME", "")
            m = re.match(r"\s*(\d+)-", short)
            if m and "241" in short:
                level_type, level_value = 241, float(m.group(1))
    return param, level_type, level_value


def _band_identity(b: int, md: Dict[str, str], inverse_map: Dict[str, str], disc: Discovery
                   ) -> Optional[Tuple[str, int, str, str]]:
    """(canonical, priority, how recognised, note) of one band; None (and an ignored entry) when
    the band is not a wave parameter we use."""
    element = md.get("GRIB_ELEMENT", f"band{b}")
    param, ltype, lval = identify_band(md)
    qualified = f"{element}@{ltype}:{lval:g}"
    mapped = qualified if qualified in inverse_map else (element if element in inverse_map else None)
    if mapped is not None:
        return inverse_map[mapped], -1, f"variable_map {show(inverse_map[mapped])} -> GRIB {mapped}", ""
    if param is None:
        disc.ignored.append((f"{element} (band {b})", "not a GRIB2 wave parameter we use"))
        return None
    hit = grib_canonical(param, ltype, lval)
    if hit is None:
        disc.ignored.append((f"{element} (band {b})", f"{param.name}: not used by the sampler"))
        return None
    lvl = f", level type {ltype} value {lval:g}" if ltype not in (-1, 1) else ""
    return hit[0], hit[1], f"GRIB2 discipline 10 category 0 parameter {param.number} ({element}{lvl})", param.note


def _distinct_times(entries: List[Tuple[int, int]], where: str, warnings: List[str]) -> List[Tuple[int, int]]:
    """(time, band) sorted by time; of two messages for one time the first band is kept (warning)."""
    kept: List[Tuple[int, int]] = []
    for t, b in sorted(entries, key=lambda e: e[0]):
        if kept and kept[-1][0] == t:
            warnings.append(f"{where}: two messages for {np.datetime64(t, 's')}Z (bands {kept[-1][1]} and {b}); "
                            f"band {kept[-1][1]} is used")
            continue
        kept.append((t, b))
    return kept


def _grib_layer(path: str, key: Tuple[str, Optional[int]], grp: Dict[str, object], grid: GridGeometry,
                direction_convention: str, disc: Discovery, strict: bool) -> None:
    """Append the layer of one canonical variable and member (or an ignored entry for unknown units)."""
    canonical, member = key
    element = str(grp["element"])
    where = f"{path} variable {show(canonical)} (GRIB {element}" + ("" if member is None else f", member {member}") + ")"
    kept = _distinct_times(grp["entries"], where, disc.warnings)  # type: ignore[arg-type]
    try:
        kind = canonical_kind(canonical)
        conv = unit_conversion(kind, str(grp["unit"]), where=where)
    except SeawayInputError as exc:
        if strict:
            raise
        disc.ignored.append((element, str(exc)))
        return
    going_to, dir_note = resolve_going_to(kind, False, direction_convention, where=where, warnings=disc.warnings)
    disc.layers.append(VariableLayer(
        canonical=canonical, kind=kind, file=path, file_variable=element,
        recognised_by=str(grp["how"]), priority=int(grp["priority"]),  # type: ignore[arg-type]
        units=conv, going_to=going_to, grid=grid,
        times_s=np.array([t for t, _ in kept], dtype=np.int64),
        bands=tuple((path, b) for _, b in kept), notes=tuple(n for n in (str(grp["note"]), dir_note) if n),
        member=member, member_kind=str(grp["member_kind"]),
    ))


def discover_grib(path: str, inverse_map: Dict[str, str], direction_convention: str,
                  *, strict: bool) -> Discovery:
    """Scan a GRIB2 file; one layer per canonical variable and ensemble member (bands sorted by
    valid time; members from templates 4.1 / 4.11, :mod:`.members`)."""
    disc = Discovery(path, "grib2")
    ds = open_gdal(path, what="GRIB2 file")
    grid = grid_from_dataset(ds, where=f"{path}")
    groups: Dict[Tuple[str, Optional[int]], Dict[str, object]] = {}
    for b in range(1, ds.RasterCount + 1):
        md = ds.GetRasterBand(b).GetMetadata() or {}
        ident = _band_identity(b, md, inverse_map, disc)
        if ident is None:
            continue
        canonical, priority, how, note = ident
        element = md.get("GRIB_ELEMENT", f"band{b}")
        try:
            t = parse_grib_time(md.get("GRIB_VALID_TIME"), where=f"{path} variable {show(canonical)} (GRIB {element}, band {b})")
        except SeawayInputError as exc:
            if strict:
                raise
            disc.ignored.append((f"{element} (band {b})", str(exc)))
            continue
        mem = grib_member((_ints(md.get("GRIB_PDS_PDTN", "-1")) or [-1])[0],
                          _ints(md.get("GRIB_PDS_TEMPLATE_ASSEMBLED_VALUES", "")))
        grp = groups.setdefault((canonical, None if mem is None else mem[0]), {
            "entries": [], "element": element, "how": how, "priority": priority,
            "unit": md.get("GRIB_UNIT", ""), "note": note, "member_kind": "" if mem is None else mem[1]})
        grp["entries"].append((int(t.astype(np.int64)), b))  # type: ignore[union-attr]
    for key, grp in groups.items():
        _grib_layer(path, key, grp, grid, direction_convention, disc, strict)
    return disc
