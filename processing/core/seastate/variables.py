# SPDX-License-Identifier: GPL-2.0-or-later
"""Recognition tables for sea-state variables: canonical names, CF standard names, GRIB2 codes, units.

Our canonical names (one per quantity the passage pipeline needs):

* combined sea: ``hs`` (significant wave height, m), ``tp`` (peak period, s), ``dir`` (mean/peak
  wave direction, degrees true, coming FROM), ``tm01``/``tm02``/``tm10`` (spectral mean periods
  Tm01, Tm02 and Tm-1,0, s);
* partitions ``wind``, ``swell1``, ``swell2``, ``swell3``: ``<partition>_hs``, ``<partition>_tp``,
  ``<partition>_dir``.

Sources of the tables:

* CF standard names: CF Standard Name Table (cfconventions.org), names as remembered from
  versions 70-84 (from memory; a name that does not exist in the table is simply never met).
* GRIB2: WMO Manual on Codes, Vol. I.2, FM 92 GRIB edition 2, Code table 4.2, discipline 10
  (oceanographic products), category 0 (waves); level types from Code table 4.5
  (1 = ground or water surface, 241 = ordered sequence of data). GDAL ships the same table,
  generated from the WMO tables, as ``grib2_table_4_2_10_0.csv``.
* Whether a GRIB "mean period" of a partition (WVPER, SWPER) is in practice the partition's peak
  period differs between producers; we use it as the partition's period and say so in the
  inventory (common practice, no source).
"""
from __future__ import annotations

import math
import re
from dataclasses import dataclass
from typing import Dict, Optional, Tuple

from ..units import FOOT_M
from ..validation import SeawayInputError, show

PARTITIONS: Tuple[str, ...] = ("wind", "swell1", "swell2", "swell3")
"""Partition names in their fixed output order."""

COMBINED: Tuple[str, ...] = ("hs", "tp", "dir", "tm01", "tm02", "tm10")

HEIGHT, PERIOD, DIRECTION = "height", "period", "direction"


def _kind_of(canonical: str) -> str:
    if canonical.endswith("hs"):
        return HEIGHT
    if canonical.endswith("dir"):
        return DIRECTION
    return PERIOD


CANONICAL_KIND: Dict[str, str] = {name: _kind_of(name) for name in COMBINED}
for _p in PARTITIONS:
    for _q in ("hs", "tp", "dir"):
        CANONICAL_KIND[f"{_p}_{_q}"] = _kind_of(_q)

CANONICAL_UNITS: Dict[str, str] = {HEIGHT: "m", PERIOD: "s", DIRECTION: "degree"}


def canonical_kind(canonical: str) -> str:
    """Kind (height, period or direction) of a canonical variable name; error if unknown."""
    try:
        return CANONICAL_KIND[canonical]
    except KeyError:
        raise SeawayInputError(
            f"unknown canonical sea-state variable {show(canonical)}; known: {', '.join(CANONICAL_KIND)}"
        ) from None


@dataclass(frozen=True)
class CfName:
    """One CF standard name we recognise."""

    canonical: str
    going_to: bool = False  # True for "..._to_direction" names (converted to coming-from)
    priority: int = 0       # lower wins when one file has two candidates for the same canonical


CF_STANDARD_NAMES: Dict[str, CfName] = {
    "sea_surface_wave_significant_height": CfName("hs"),
    "sea_surface_wave_period_at_variance_spectral_density_maximum": CfName("tp"),
    "sea_surface_wave_from_direction": CfName("dir"),
    "sea_surface_wave_to_direction": CfName("dir", going_to=True, priority=1),
    "sea_surface_wave_from_direction_at_variance_spectral_density_maximum": CfName("dir", priority=2),
    "sea_surface_wave_mean_period_from_variance_spectral_density_first_frequency_moment": CfName("tm01"),
    "sea_surface_wave_mean_period_from_variance_spectral_density_second_frequency_moment": CfName("tm02"),
    "sea_surface_wave_zero_upcrossing_period": CfName("tm02", priority=1),
    "sea_surface_wave_mean_period_from_variance_spectral_density_inverse_frequency_moment": CfName("tm10"),
    "sea_surface_wind_wave_significant_height": CfName("wind_hs"),
    "sea_surface_wind_wave_period_at_variance_spectral_density_maximum": CfName("wind_tp"),
    "sea_surface_wind_wave_mean_period": CfName("wind_tp", priority=1),
    "sea_surface_wind_wave_from_direction": CfName("wind_dir"),
    "sea_surface_wind_wave_to_direction": CfName("wind_dir", going_to=True, priority=1),
    "sea_surface_primary_swell_wave_significant_height": CfName("swell1_hs"),
    "sea_surface_primary_swell_wave_period_at_variance_spectral_density_maximum": CfName("swell1_tp"),
    "sea_surface_primary_swell_wave_mean_period": CfName("swell1_tp", priority=1),
    "sea_surface_primary_swell_wave_from_direction": CfName("swell1_dir"),
    "sea_surface_primary_swell_wave_to_direction": CfName("swell1_dir", going_to=True, priority=1),
    "sea_surface_swell_wave_significant_height": CfName("swell1_hs", priority=3),
    "sea_surface_swell_wave_period_at_variance_spectral_density_maximum": CfName("swell1_tp", priority=3),
    "sea_surface_swell_wave_mean_period": CfName("swell1_tp", priority=4),
    "sea_surface_swell_wave_from_direction": CfName("swell1_dir", priority=3),
    "sea_surface_swell_wave_to_direction": CfName("swell1_dir", going_to=True, priority=4),
    "sea_surface_secondary_swell_wave_significant_height": CfName("swell2_hs"),
    "sea_surface_secondary_swell_wave_period_at_variance_spectral_density_maximum": CfName("swell2_tp"),
    "sea_surface_secondary_swell_wave_mean_period": CfName("swell2_tp", priority=1),
    "sea_surface_secondary_swell_wave_from_direction": CfName("swell2_dir"),
    "sea_surface_secondary_swell_wave_to_direction": CfName("swell2_dir", going_to=True, priority=1),
    "sea_surface_tertiary_swell_wave_significant_height": CfName("swell3_hs"),
    "sea_surface_tertiary_swell_wave_mean_period": CfName("swell3_tp", priority=1),
    "sea_surface_tertiary_swell_wave_from_direction": CfName("swell3_dir"),
}


@dataclass(frozen=True)
class GribParameter:
    """One entry of WMO GRIB2 Code table 4.2, discipline 10, category 0 (waves)."""

    number: int
    element: str      # the abbreviation GDAL reports as GRIB_ELEMENT
    name: str         # the WMO parameter name
    canonical: Optional[str]  # our combined or partition quantity (None: recognised, not used)
    partition: Optional[str] = None  # "wind" or "swell" (swell index taken from the level)
    priority: int = 0
    note: str = ""


_MEAN_AS_PERIOD = "GRIB names it a mean period; used as the partition period (common practice, no source)"

GRIB_WAVE_PARAMETERS: Dict[int, GribParameter] = {
    p.number: p
    for p in (
        GribParameter(3, "HTSGW", "Significant height of combined wind waves and swell", "hs"),
        GribParameter(4, "WVDIR", "Direction of wind waves", "dir", partition="wind"),
        GribParameter(5, "WVHGT", "Significant height of wind waves", "hs", partition="wind"),
        GribParameter(6, "WVPER", "Mean period of wind waves", "tp", partition="wind", priority=1,
                      note=_MEAN_AS_PERIOD),
        GribParameter(7, "SWDIR", "Direction of swell waves", "dir", partition="swell"),
        GribParameter(8, "SWELL", "Significant height of swell waves", "hs", partition="swell"),
        GribParameter(9, "SWPER", "Mean period of swell waves", "tp", partition="swell", priority=1,
                      note=_MEAN_AS_PERIOD),
        GribParameter(10, "DIRPW", "Primary wave direction", "dir"),
        GribParameter(11, "PERPW", "Primary wave mean period", "tp", priority=1,
                      note="GRIB names it the primary wave mean period; used as the peak period "
                           "(common practice, no source)"),
        GribParameter(12, "DIRSW", "Secondary wave direction", None),
        GribParameter(13, "PERSW", "Secondary wave mean period", None),
        GribParameter(14, "WWSDIR", "Direction of combined wind waves and swell", "dir", priority=1),
        GribParameter(15, "MWSPER", "Mean period of combined wind waves and swell", "tm01",
                      note="GRIB does not say which spectral moment; taken as Tm01"),
        GribParameter(25, "IMWF", "Inverse mean wave frequency", "tm10"),
        GribParameter(28, "MZWPER", "Mean zero-crossing wave period", "tm02"),
        GribParameter(34, "PWPER", "Peak wave period", "tp"),
        GribParameter(35, "PPERWW", "Peak period of the wind waves", "tp", partition="wind"),
        GribParameter(36, "PPERTS", "Peak period of the total swell", "tp", partition="swell",
                      priority=2),
    )
}
GRIB_BY_ELEMENT: Dict[str, GribParameter] = {p.element: p for p in GRIB_WAVE_PARAMETERS.values()}

GRIB_LEVEL_SURFACE = 1
"""WMO Code table 4.5: ground or water surface."""
GRIB_LEVEL_ORDERED_SEQUENCE = 241
"""WMO Code table 4.5: ordered sequence of data (used for the n-th swell partition)."""


def grib_canonical(param: GribParameter, level_type: int, level_value: float) -> Optional[Tuple[str, int]]:
    """Canonical name and priority for a GRIB wave parameter at a level, or None if unused.

    Swell parameters at level type 241 with value k map to partition ``swell<k>`` (k = 1..3); at
    the water surface (type 1) the total swell maps to ``swell1`` with a lower priority.
    """
    if param.canonical is None:
        return None
    if param.partition is None:
        return param.canonical, param.priority
    if param.partition == "wind":
        return f"wind_{param.canonical}", param.priority
    if level_type == GRIB_LEVEL_ORDERED_SEQUENCE:
        k = int(round(level_value))
        if 1 <= k <= 3:
            return f"swell{k}_{param.canonical}", param.priority
        return None
    return f"swell1_{param.canonical}", param.priority + 5


# --- units ---------------------------------------------------------------------------------

_HEIGHT_UNITS = {"m": 1.0, "meter": 1.0, "meters": 1.0, "metre": 1.0, "metres": 1.0,
                 "ft": FOOT_M, "feet": FOOT_M, "foot": FOOT_M, "cm": 0.01}
_PERIOD_UNITS = {"s": 1.0, "sec": 1.0, "secs": 1.0, "second": 1.0, "seconds": 1.0}
_DIRECTION_UNITS = {"degree": 1.0, "degrees": 1.0, "deg": 1.0, "degree_true": 1.0,
                    "degrees_true": 1.0, "degree true": 1.0, "degrees true": 1.0, "°": 1.0,
                    "rad": 180.0 / math.pi, "radian": 180.0 / math.pi, "radians": 180.0 / math.pi}
_UNITS = {HEIGHT: _HEIGHT_UNITS, PERIOD: _PERIOD_UNITS, DIRECTION: _DIRECTION_UNITS}
_NO_UNIT = {"", "-", "1", "none", "unknown"}


@dataclass(frozen=True)
class UnitConversion:
    """How a file's values become our SI/degree values: ``value = raw * factor``."""

    unit_in: str
    unit_out: str
    factor: float
    description: str


def unit_conversion(kind: str, unit_text: Optional[str], *, where: str) -> UnitConversion:
    """Conversion factor for a file unit string (UDUNITS-like spellings, GRIB "[m]" brackets).

    Missing units are taken as SI (m, s, degree) and said so; unknown units raise a
    :class:`SeawayInputError` naming ``where`` (file and variable). 1 ft = 0.3048 m exactly.
    """
    raw = (unit_text or "").strip()
    key = re.sub(r"^\[(.*)\]$", r"\1", raw).strip().lower()
    out = CANONICAL_UNITS[kind]
    if key in _NO_UNIT:
        return UnitConversion(raw, out, 1.0, f"no units in file; assumed {out}")
    table = _UNITS[kind]
    if key not in table:
        raise SeawayInputError(
            f"{where}: unit {show(raw)} is not a known {kind} unit (expected one of "
            f"{', '.join(sorted(table))})"
        )
    factor = table[key]
    if factor == 1.0:
        return UnitConversion(raw, out, 1.0, f"{raw} (no conversion)")
    return UnitConversion(raw, out, factor, f"{raw} -> {out} (x {factor:g})")


# --- plausibility --------------------------------------------------------------------------

PLAUSIBLE_RANGE: Dict[str, Tuple[float, float]] = {
    HEIGHT: (0.0, 25.0),
    PERIOD: (0.5, 30.0),
    DIRECTION: (0.0, 360.0),
}
"""Plausible value ranges after unit conversion (common practice, no source): open-ocean Hs
beyond 25 m and periods outside 0.5-30 s are taken as unit or decoding errors."""
