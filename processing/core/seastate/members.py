# SPDX-License-Identifier: GPL-2.0-or-later
"""Ensemble members: how the readers recognise them and how a source keeps one set per member.

* NetCDF-CF: a dimension of a (member, time, y, x) variable whose coordinate variable has
  ``standard_name = "realization"`` (CF Conventions 1.8, Appendix A / standard-name table), or
  whose name is ``number``, ``member``, ``realization`` or ``ensemble`` (common practice in
  published ensemble files, no source). The member label is the coordinate value.
* GRIB2: product definition templates 4.1 (individual ensemble forecast) and 4.11 (the same over
  a time interval) carry, after the 15 octet groups of template 4.0, the type of ensemble
  forecast (WMO Code table 4.6: 0 unperturbed high-resolution control, 1 unperturbed
  low-resolution control, 2 negatively and 3 positively perturbed), the perturbation number and
  the number of forecasts in the ensemble (WMO FM 92 GRIB2, templates 4.1/4.11; positions from
  memory, checked against GDAL 3.6's ``GRIB_PDS_TEMPLATE_ASSEMBLED_VALUES`` of messages it
  wrote itself). The member label is the perturbation number.

A deterministic layer has ``member = None`` and is shared by every member (e.g. a direction
file without members next to an ensemble of heights).
"""
from __future__ import annotations

from typing import Dict, List, Optional, Sequence, Tuple

MEMBER_DIMENSION_NAMES: Tuple[str, ...] = ("number", "member", "realization", "ensemble")
"""Dimension names taken as an ensemble-member axis (case-insensitive)."""

GRIB_ENSEMBLE_TEMPLATES: Tuple[int, ...] = (1, 11)
"""Product definition template numbers of individual ensemble members."""

_GRIB_ENSEMBLE_TYPE_AT = 15
_GRIB_PERTURBATION_AT = 16
_CONTROL_TYPES = (0, 1)


def is_member_dimension(name: str, md: Dict[str, str]) -> bool:
    """True when NetCDF dimension ``name`` is an ensemble-member axis (module docstring);
    ``md`` is GDAL's dataset metadata (``<dim>#standard_name``)."""
    std = md.get(f"{name}#standard_name", "").strip().lower()
    return std == "realization" or name.strip().lower() in MEMBER_DIMENSION_NAMES


def member_dimension(dims: Sequence[str], md: Dict[str, str]) -> Optional[str]:
    """The one member dimension among ``dims`` (None when there is none)."""
    hits = [d for d in dims if is_member_dimension(d, md)]
    return hits[0] if hits else None


def grib_member(pdtn: int, values: Sequence[int]) -> Optional[Tuple[int, str]]:
    """(perturbation number, "control" / "perturbed") of a GRIB2 ensemble message, or None for
    a message that is not an ensemble member (template other than 4.1 / 4.11, or too short)."""
    if pdtn not in GRIB_ENSEMBLE_TEMPLATES or len(values) <= _GRIB_PERTURBATION_AT:
        return None
    kind = "control" if values[_GRIB_ENSEMBLE_TYPE_AT] in _CONTROL_TYPES else "perturbed"
    return int(values[_GRIB_PERTURBATION_AT]), kind


def member_text(members: Sequence[int], kinds: Dict[int, str]) -> str:
    """One line describing the members of a source ("" when deterministic)."""
    if not members:
        return ""
    ctrl = [m for m in members if kinds.get(m) == "control"]
    pert = [m for m in members if kinds.get(m) == "perturbed"]
    parts = [f"{len(members)} ensemble members: {_span(list(members))}"]
    if ctrl:
        parts.append(f"control {_span(ctrl)}")
    if pert:
        parts.append(f"perturbed {_span(pert)}")
    return "; ".join(parts)


def _span(values: List[int]) -> str:
    v = sorted(values)
    if len(v) > 2 and v == list(range(v[0], v[-1] + 1)):
        return f"{v[0]}..{v[-1]}"
    return ", ".join(str(x) for x in v)
