# SPDX-License-Identifier: GPL-2.0-or-later
"""Per-sample flags: our own short codes, one bit each, with a one-line explanation.

A flag marks a sample that is kept but must be read with care (never dropped silently).
The writer turns the bit mask into the comma-separated ``flags`` text field with
:func:`flag_codes`. Codes and bits are part of the public interface: never renumber.
"""
from __future__ import annotations

import enum
from typing import Dict, List

import numpy as np
from numpy.typing import ArrayLike, NDArray


class SampleFlag(enum.IntFlag):
    """Bit flags attached to route samples."""

    NONE = 0
    # --- sea-state sampling ---
    LAND_ADJUSTED = 1 << 0     # sample on land/nodata: nearest valid sea cell used
    NO_SEA_DATA = 1 << 1       # no valid sea state within the search radius
    OUTSIDE_GRID = 1 << 2      # position outside the forecast grid
    OUTSIDE_TIME = 1 << 3      # arrival time outside the forecast's time coverage
    PARTIAL_VARIABLES = 1 << 4  # some variables missing here (e.g. period); defaults used
    IMPLAUSIBLE_VALUE = 1 << 5  # value outside a plausible range (unit mix-up?)
    DEPTH_ASSUMED_DEEP = 1 << 6  # no bathymetry here: deep water assumed
    DEPTH_ON_LAND = 1 << 7     # bathymetry says land/dry at a sea sample
    # --- encounter and method ---
    OVERTAKING = 1 << 8        # vessel outruns the peak wave crests: encounter period undefined
    OUTSIDE_VALIDITY = 1 << 9  # sea state outside the response method's validity range
    SHALLOW_WATER = 1 << 10    # depth/wavelength < 1/20 at the peak period
    # --- IMO MSC.1/Circ.1228 guidance ---
    SURF_RIDING = 1 << 11      # surf-riding / broaching speed zone
    HIGH_WAVE_GROUPS = 1 << 12  # successive high-wave attack conditions
    SYNC_ROLL = 1 << 13        # encounter period close to the natural roll period
    PARAMETRIC_ROLL = 1 << 14  # encounter period close to half the natural roll period
    # --- comfort criteria ---
    CRITERIA_EXCEEDED = 1 << 15  # a seakeeping criterion at the station is exceeded
    # --- grade "danger" of the IMO guidance flags (beside the phenomenon's own bit) ---
    SURF_RIDING_DANGER = 1 << 16
    HIGH_WAVE_GROUPS_DANGER = 1 << 17
    SYNC_ROLL_DANGER = 1 << 18
    PARAMETRIC_ROLL_DANGER = 1 << 19


FLAG_CODES: Dict[SampleFlag, str] = {
    SampleFlag.LAND_ADJUSTED: "LANDSHIFT",
    SampleFlag.NO_SEA_DATA: "NOSEA",
    SampleFlag.OUTSIDE_GRID: "OFFGRID",
    SampleFlag.OUTSIDE_TIME: "OFFTIME",
    SampleFlag.PARTIAL_VARIABLES: "PARTVAR",
    SampleFlag.IMPLAUSIBLE_VALUE: "ODDVALUE",
    SampleFlag.DEPTH_ASSUMED_DEEP: "DEEPASSUMED",
    SampleFlag.DEPTH_ON_LAND: "DRYDEPTH",
    SampleFlag.OVERTAKING: "OUTRUN",
    SampleFlag.OUTSIDE_VALIDITY: "METHODLIMIT",
    SampleFlag.SHALLOW_WATER: "SHALLOW",
    SampleFlag.SURF_RIDING: "SURFRISK",
    SampleFlag.HIGH_WAVE_GROUPS: "WAVEGROUPS",
    SampleFlag.SYNC_ROLL: "ROLLSYNC",
    SampleFlag.PARAMETRIC_ROLL: "ROLLPARAM",
    SampleFlag.CRITERIA_EXCEEDED: "CRITERIA",
    SampleFlag.SURF_RIDING_DANGER: "SURFDANGER",
    SampleFlag.HIGH_WAVE_GROUPS_DANGER: "GROUPDANGER",
    SampleFlag.SYNC_ROLL_DANGER: "SYNCDANGER",
    SampleFlag.PARAMETRIC_ROLL_DANGER: "PARAMDANGER",
}

FLAG_EXPLANATIONS: Dict[SampleFlag, str] = {
    SampleFlag.LAND_ADJUSTED: "Point falls on land or a no-data cell; the nearest valid sea cell was used.",
    SampleFlag.NO_SEA_DATA: "No valid sea state within the search radius; motions not computed here.",
    SampleFlag.OUTSIDE_GRID: "Point lies outside the forecast grid; motions not computed here.",
    SampleFlag.OUTSIDE_TIME: "Arrival time lies outside the forecast's time range; not extrapolated.",
    SampleFlag.PARTIAL_VARIABLES: "Some sea-state variables are missing here; the stated fallback was used.",
    SampleFlag.IMPLAUSIBLE_VALUE: "A sea-state value is outside the plausible range; check the file's units.",
    SampleFlag.DEPTH_ASSUMED_DEEP: "No depth available here; deep water assumed.",
    SampleFlag.DEPTH_ON_LAND: "Bathymetry reports land, zero depth or less water than the vessel's draught at this sea point (deep water assumed where it reports land).",
    SampleFlag.OVERTAKING: "The vessel outruns the peak-period wave crests; the regular encounter period is undefined.",
    SampleFlag.OUTSIDE_VALIDITY: "Sea state or speed outside the response method's validity range; results indicative only.",
    SampleFlag.SHALLOW_WATER: "Shallow water at the peak period (depth < 1/20 wavelength); waves may steepen or break.",
    SampleFlag.SURF_RIDING: "Speed and heading in the surf-riding/broaching zone of IMO MSC.1/Circ.1228 4.2.1 (advisory unless SURFDANGER).",
    SampleFlag.HIGH_WAVE_GROUPS: "Average wavelength > 0.8 L, Hs > 0.04 L and encounter period 1.8-3.0 times the wave period: successive high-wave attack (IMO MSC.1/Circ.1228 4.2.2; advisory unless GROUPDANGER).",
    SampleFlag.SYNC_ROLL: "Encounter period close to the natural roll period: synchronous rolling possible (IMO MSC.1/Circ.1228 4.2.3.1; advisory unless SYNCDANGER).",
    SampleFlag.PARAMETRIC_ROLL: "Head or following sea of about the ship's length, encounter period close to half the natural roll period: parametric rolling possible (IMO MSC.1/Circ.1228 4.2.3.2; advisory unless PARAMDANGER).",
    SampleFlag.CRITERIA_EXCEEDED: "A seakeeping criterion (RMS acceleration or roll) at the station is exceeded.",
    SampleFlag.SURF_RIDING_DANGER: "Danger grade of SURFRISK: the wave system has Hs > 0.04 L (IMO MSC.1/Circ.1228 4.2.1).",
    SampleFlag.HIGH_WAVE_GROUPS_DANGER: "Danger grade of WAVEGROUPS: successive high waves together with danger-graded synchronous or parametric rolling (IMO MSC.1/Circ.1228 4.2.2).",
    SampleFlag.SYNC_ROLL_DANGER: "Danger grade of ROLLSYNC: the wave system has Hs > 0.04 L (IMO MSC.1/Circ.1228 4.2.3.1).",
    SampleFlag.PARAMETRIC_ROLL_DANGER: "Danger grade of ROLLPARAM: the wave system has Hs > 0.04 L (IMO MSC.1/Circ.1228 4.2.3.2).",
}

SAFETY_FLAGS = (
    SampleFlag.SURF_RIDING
    | SampleFlag.HIGH_WAVE_GROUPS
    | SampleFlag.SYNC_ROLL
    | SampleFlag.PARAMETRIC_ROLL
)
"""Flags that warn of dangerous situations (IMO guidance) rather than data quality (any grade)."""

DANGER_FLAGS = (
    SampleFlag.SURF_RIDING_DANGER
    | SampleFlag.HIGH_WAVE_GROUPS_DANGER
    | SampleFlag.SYNC_ROLL_DANGER
    | SampleFlag.PARAMETRIC_ROLL_DANGER
)
"""Danger-graded guidance: a hard limit (a passage with one is not within limits)."""

HARD_LIMIT_FLAGS = DANGER_FLAGS | SampleFlag.CRITERIA_EXCEEDED
"""Flags that put a sample outside limits; the other guidance flags are advisories."""

NOT_COMPUTED_FLAGS = SampleFlag.NO_SEA_DATA | SampleFlag.OUTSIDE_GRID | SampleFlag.OUTSIDE_TIME
"""Flags after which a sample carries no motion results (values are NULL, never zero)."""

UNCLASSED_FLAGS = NOT_COMPUTED_FLAGS | SampleFlag.IMPLAUSIBLE_VALUE
"""Flags after which the passage computes no motions and no class: no sea, or a sea value
outside its plausible range (a unit mix-up is likely; motions on it would mislead)."""

CAUTION = (
    "Planning aid only: not a substitute for the master's judgement, official forecasts and "
    "warnings, or local rules and regulations. Guidance flags follow IMO MSC.1/Circ.1228 and "
    "do not replace the ship's stability information."
)


def flag_codes(mask: int) -> str:
    """Comma-separated codes for one bit mask, in bit order ('' when none)."""
    mask = int(mask)
    return ",".join(code for flag, code in FLAG_CODES.items() if mask & int(flag))


def flag_codes_array(masks: ArrayLike) -> List[str]:
    """:func:`flag_codes` for every element of an integer array."""
    return [flag_codes(m) for m in np.asarray(masks, dtype=np.int64).ravel()]


def flag_counts(masks: ArrayLike) -> Dict[str, int]:
    """How many samples carry each flag code (codes with zero count omitted)."""
    arr = np.asarray(masks, dtype=np.int64)
    out: Dict[str, int] = {}
    for flag, code in FLAG_CODES.items():
        n = int(np.count_nonzero(arr & int(flag)))
        if n:
            out[code] = n
    return out


def empty_flags(n: int) -> NDArray[np.int64]:
    """A zeroed flag array for n samples."""
    return np.zeros(int(n), dtype=np.int64)
