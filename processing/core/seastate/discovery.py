# SPDX-License-Identifier: GPL-2.0-or-later
"""What one file offers: candidate layers, ignored variables and warnings (shared by the readers)."""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Dict, List, Optional, Tuple

from ..validation import SeawayInputError, show
from .variables import DIRECTION

DIRECTION_CONVENTIONS = ("auto", "from", "to")


@dataclass
class Discovery:
    """Result of scanning one file (mutable while a reader fills it)."""

    path: str
    kind: str  # "netcdf", "grib2", "geotiff"
    layers: List["VariableLayer"] = field(default_factory=list)  # noqa: F821
    ignored: List[Tuple[str, str]] = field(default_factory=list)  # (file variable, reason)
    warnings: List[str] = field(default_factory=list)


def check_direction_convention(value: str) -> str:
    if value not in DIRECTION_CONVENTIONS:
        raise SeawayInputError(
            f"direction_convention must be one of {', '.join(DIRECTION_CONVENTIONS)}, got {show(value)}"
        )
    return value


def resolve_going_to(kind: str, declared: Optional[bool], convention: str, *, where: str,
                     warnings: List[str]) -> Tuple[bool, str]:
    """Whether a direction variable is 'going to', and the note saying why.

    ``declared`` is what the file says (CF standard name ``..._to_direction`` -> True,
    ``..._from_direction`` -> False, GRIB -> False, WMO "direction from which"), None if silent.
    An explicit ``convention`` ("from"/"to") from the caller wins, with a warning if it
    contradicts the file.
    """
    if kind != DIRECTION:
        return False, ""
    if convention == "auto":
        if declared is None:
            return False, "direction convention not stated in the file: coming-from assumed"
        return declared, ("going-to in the file: turned by 180 deg to coming-from" if declared
                          else "coming-from (as in the file)")
    want = convention == "to"
    if declared is not None and declared != want:
        warnings.append(
            f"{where}: the file says {'going-to' if declared else 'coming-from'} but "
            f"direction_convention={show(convention)} was given; the given convention is used"
        )
    return want, ("going-to (caller): turned by 180 deg to coming-from" if want
                  else "coming-from (caller)")


def invert_variable_map(variable_map: Optional[Dict[str, str]]) -> Dict[str, str]:
    """file variable name -> canonical name, validating the canonical names."""
    from .variables import canonical_kind

    out: Dict[str, str] = {}
    for canonical, file_name in (variable_map or {}).items():
        canonical_kind(canonical)
        if not isinstance(file_name, str) or not file_name:
            raise SeawayInputError(
                f"variable_map[{show(canonical)}] must be a non-empty file variable name, got {show(file_name)}"
            )
        out[file_name] = canonical
    return out
