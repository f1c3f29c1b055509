# SPDX-License-Identifier: GPL-2.0-or-later
"""Time axes of forecast files: CF time decoding, GRIB valid times, ISO 8601 text, UTC arrays.

All times in this package are UTC, as ``numpy.datetime64`` with second resolution, or as int64
seconds since 1970-01-01T00:00:00Z inside the sampler.

CF time (CF Conventions 1.8, section 4.4 "Time Coordinate"): ``units = "<unit> since <reference>"``
with unit one of seconds/minutes/hours/days (UDUNITS spellings), reference an ISO-like date
``YYYY-MM-DD[ hh:mm[:ss[.f]]][Z|UTC|+hh:mm]``; value = reference + value * unit. Calendars
``standard``/``gregorian`` (mixed Julian/Gregorian, identical to proleptic Gregorian after
1582-10-15) and ``proleptic_gregorian`` are decoded; any other calendar (noleap, 360_day, julian,
...) and ``months``/``years`` units (not fixed lengths in CF) raise :class:`SeawayInputError`.
"""
from __future__ import annotations

import datetime as _dt
import re
from typing import Any, Optional, Sequence

import numpy as np
from numpy.typing import NDArray

from ..validation import SeawayInputError, show

_UNIT_SECONDS = {
    "second": 1, "seconds": 1, "sec": 1, "secs": 1, "s": 1,
    "minute": 60, "minutes": 60, "min": 60, "mins": 60,
    "hour": 3600, "hours": 3600, "hr": 3600, "hrs": 3600, "h": 3600,
    "day": 86400, "days": 86400, "d": 86400,
}
_OK_CALENDARS = {"standard", "gregorian", "proleptic_gregorian"}
_GREGORIAN_START = np.datetime64("1582-10-15T00:00:00", "s")

_REF_RE = re.compile(
    r"^\s*(?P<y>[+-]?\d{1,4})-(?P<mo>\d{1,2})-(?P<d>\d{1,2})"
    r"(?:[T ]+(?P<h>\d{1,2})(?::(?P<mi>\d{1,2})(?::(?P<s>\d{1,2}(?:\.\d*)?))?)?)?"
    r"\s*(?P<tz>Z|UTC|GMT|[+-]\d{1,2}(?::?\d{2})?)?\s*$",
    re.IGNORECASE,
)


def _parse_reference(text: str, where: str) -> np.datetime64:
    m = _REF_RE.match(text)
    if not m:
        raise SeawayInputError(f"{where}: cannot read the reference date {show(text)} of the time units")
    y, mo, d = int(m["y"]), int(m["mo"]), int(m["d"])
    h = int(m["h"] or 0)
    mi = int(m["mi"] or 0)
    sec = float(m["s"] or 0.0)
    try:
        base = np.datetime64(f"{y:04d}-{mo:02d}-{d:02d}", "s")
    except ValueError as exc:
        raise SeawayInputError(f"{where}: invalid reference date {show(text)}: {exc}") from None
    if not (0 <= h < 24 and 0 <= mi < 60 and 0 <= sec < 61):
        raise SeawayInputError(f"{where}: invalid reference time of day in {show(text)}")
    base = base + np.timedelta64(h * 3600 + mi * 60 + int(round(sec)), "s")
    tz = (m["tz"] or "").upper()
    if tz and tz not in ("Z", "UTC", "GMT"):
        sign = -1 if tz[0] == "-" else 1
        digits = tz[1:].replace(":", "")
        hh = int(digits[:-2] or 0) if len(digits) > 2 else int(digits)
        mm = int(digits[-2:]) if len(digits) > 2 else 0
        base = base - np.timedelta64(sign * (hh * 3600 + mm * 60), "s")
    return base


def decode_cf_time(
    values: Any, units: Optional[str], calendar: Optional[str] = None, *, where: str = "time"
) -> NDArray[np.datetime64]:
    """Decode CF time values to UTC ``datetime64[s]`` (CF Conventions 1.8 s.4.4).

    ``t = reference + value * unit_seconds``, rounded to the nearest second. ``where`` names the
    file and variable in error messages.
    """
    parts = re.split(r"\s+since\s+", (units or "").strip(), maxsplit=1, flags=re.IGNORECASE)
    if len(parts) != 2 or not parts[0] or not parts[1]:
        raise SeawayInputError(
            f"{where}: no usable time units (got {show(units)}); expected '<unit> since <date>'"
        )
    cal = (calendar or "standard").strip().lower()
    if cal not in _OK_CALENDARS:
        raise SeawayInputError(
            f"{where}: calendar {show(calendar)} is not supported; only standard, gregorian and "
            "proleptic_gregorian can be decoded to real UTC dates"
        )
    unit_word, ref_text = parts
    unit_key = unit_word.strip().lower()
    if unit_key not in _UNIT_SECONDS:
        raise SeawayInputError(
            f"{where}: time unit {show(unit_word.strip())} in {show(units)} is not supported "
            "(use seconds, minutes, hours or days; months/years have no fixed length in CF)"
        )
    ref = _parse_reference(ref_text, where)
    vals = np.asarray(values, dtype=float)
    if not np.all(np.isfinite(vals)):
        raise SeawayInputError(f"{where}: time values contain NaN or infinity: {show(vals)}")
    secs = np.rint(vals * _UNIT_SECONDS[unit_key]).astype(np.int64)
    out = ref + secs.astype("timedelta64[s]")
    if cal in ("standard", "gregorian") and out.size and out.min() < _GREGORIAN_START:
        raise SeawayInputError(
            f"{where}: dates before 1582-10-15 in the {cal} calendar are Julian; not supported"
        )
    return out.astype("datetime64[s]")


def parse_grib_time(text: Optional[str], *, where: str) -> np.datetime64:
    """A GRIB time from GDAL metadata: bare epoch seconds (GDAL >= 3.6) or "  1704078000 sec UTC"."""
    m = re.match(r"^\s*(-?\d+)", text or "")
    if not m:
        raise SeawayInputError(f"{where}: no valid time in GRIB metadata (got {show(text)})")
    return np.datetime64(int(m.group(1)), "s")


def parse_iso_utc(text: str, *, where: str) -> np.datetime64:
    """ISO 8601 date-time text to UTC ``datetime64[s]`` (offsets converted, naive taken as UTC)."""
    try:
        return _parse_reference(str(text).replace("T", " ", 1), where)
    except SeawayInputError:
        raise SeawayInputError(f"{where}: {show(text)} is not an ISO 8601 UTC date-time") from None


def as_utc_seconds(name: str, times: Any) -> NDArray[np.int64]:
    """Times (datetime64, ISO strings, or datetime objects; aware ones converted) to int64 epoch s."""
    if isinstance(times, (str, bytes, _dt.datetime, np.datetime64)):
        times = [times]
    arr = np.asarray(times)
    if arr.dtype.kind == "M":
        if np.isnat(arr).any():
            raise SeawayInputError(f"{name} contains NaT (missing time) at index "
                                   f"{int(np.flatnonzero(np.isnat(arr))[0])}")
        return arr.astype("datetime64[s]").astype(np.int64).ravel()
    out = np.empty(arr.size, dtype=np.int64)
    for i, item in enumerate(arr.ravel()):
        if isinstance(item, _dt.datetime):
            if item.tzinfo is not None:
                item = item.astimezone(_dt.timezone.utc).replace(tzinfo=None)
            out[i] = np.datetime64(item, "s").astype(np.int64)
        elif isinstance(item, (str, np.str_)):
            out[i] = parse_iso_utc(str(item), where=f"{name}[{i}]").astype(np.int64)
        elif isinstance(item, np.datetime64):
            if np.isnat(item):
                raise SeawayInputError(f"{name}[{i}] is NaT (missing time)")
            out[i] = item.astype("datetime64[s]").astype(np.int64)
        else:
            raise SeawayInputError(f"{name}[{i}] = {show(item)} is not a date-time")
    return out


def require_increasing(times_s: NDArray[np.int64], *, where: str) -> None:
    """Error unless the time axis is strictly increasing."""
    if times_s.size > 1:
        d = np.diff(times_s)
        if np.any(d <= 0):
            i = int(np.flatnonzero(d <= 0)[0])
            a, b = (np.datetime64(int(times_s[i]), "s"), np.datetime64(int(times_s[i + 1]), "s"))
            raise SeawayInputError(
                f"{where}: times are not increasing (step {i}: {a} then {b})"
            )


def to_datetime64(seconds: Sequence[int] | NDArray[np.int64]) -> NDArray[np.datetime64]:
    """int64 epoch seconds to ``datetime64[s]``."""
    return np.asarray(seconds, dtype=np.int64).astype("datetime64[s]")
