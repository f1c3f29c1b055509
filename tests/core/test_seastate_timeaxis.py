# SPDX-License-Identifier: GPL-2.0-or-later
"""CF time decoding and GRIB valid times against numpy/datetime date arithmetic.

Source for the decoding rule: CF Conventions 1.8, section 4.4 "Time Coordinate" (value = reference
+ value x unit; UDUNITS unit names; calendars standard/gregorian/proleptic_gregorian, others
exist but are not real UTC dates). Expected dates are computed with Python's ``datetime`` and
numpy ``datetime64`` (reference libraries), never typed in from our own output.
"""
from __future__ import annotations

import datetime as dt

import numpy as np
import pytest

from seaway_comfort.processing.core.seastate.timeaxis import (
    as_utc_seconds,
    decode_cf_time,
    parse_grib_time,
    parse_iso_utc,
    require_increasing,
)
from seaway_comfort.processing.core.validation import SeawayInputError


def _np(d: dt.datetime) -> np.datetime64:
    return np.datetime64(d.replace(tzinfo=None), "s")


@pytest.mark.parametrize(
    "units, values, reference, step",
    [
        # CF 1.8 s.4.4 example form "days since 1950-01-01"; expected via datetime.timedelta
        ("days since 1950-01-01", [0, 1, 25567, 26663.5], dt.datetime(1950, 1, 1), dt.timedelta(days=1)),
        # ISO 'T' separator and Z suffix (CF 1.8 s.4.4 allows ISO 8601 reference times)
        ("seconds since 1970-01-01T00:00:00Z", [0, 1704067200], dt.datetime(1970, 1, 1), dt.timedelta(seconds=1)),
        # single-digit fields as in "hours since 1900-1-1 0:0:0" (CF 1.8 s.4.4 / UDUNITS)
        ("hours since 1900-1-1 0:0:0", [0, 1063200], dt.datetime(1900, 1, 1), dt.timedelta(hours=1)),
        ("minutes since 2024-02-28 12:00", [0, 1440, 2880], dt.datetime(2024, 2, 28, 12), dt.timedelta(minutes=1)),
    ],
)
def test_cf_time_matches_datetime_arithmetic(units, values, reference, step):
    got = decode_cf_time(values, units, "standard", where="t")
    want = np.array([_np(reference + v * step) for v in values], dtype="datetime64[s]")
    np.testing.assert_array_equal(got, want)


def test_known_calendar_dates():
    # 25567 days after 1950-01-01 is 2020-01-01 (17 leap days 1952..2016; numpy datetime64 check)
    got = decode_cf_time([25567], "days since 1950-01-01", "gregorian", where="t")
    assert got[0] == np.datetime64("1950-01-01", "s") + np.timedelta64(25567, "D")
    assert str(got[0].astype("datetime64[D]")) == "2020-01-01"
    # leap day: 2024-02-29 exists in the proleptic Gregorian calendar (ISO 8601)
    got = decode_cf_time([24], "hours since 2024-02-28", "proleptic_gregorian", where="t")
    assert str(got[0].astype("datetime64[D]")) == "2024-02-29"


def test_reference_offset_converted_to_utc():
    # UDUNITS time-zone suffix: "+06:00" means the reference is 6 h ahead of UTC
    got = decode_cf_time([0], "hours since 2024-01-01 06:00:00 +06:00", None, where="t")
    assert got[0] == _np(dt.datetime(2024, 1, 1, 0, 0))


@pytest.mark.parametrize("calendar", ["noleap", "365_day", "360_day", "julian", "all_leap", "none"])
def test_other_calendars_rejected(calendar):
    # CF 1.8 s.4.4.1 lists these calendars; they are not real UTC dates -> clear error naming it
    with pytest.raises(SeawayInputError, match=calendar):
        decode_cf_time([0], "days since 2000-01-01", calendar, where="file.nc variable 'hs'")


@pytest.mark.parametrize("units", ["months since 2000-01-01", "years since 2000-01-01", "days", "", None,
                                   "days since yesterday"])
def test_unusable_units_rejected(units):
    # CF 1.8 s.4.4 recommends against months/years (not fixed lengths); no 'since' -> no time
    with pytest.raises(SeawayInputError, match="f.nc"):
        decode_cf_time([0], units, "standard", where="f.nc")


def test_julian_dates_rejected_in_standard_calendar():
    # CF 1.8 s.4.4.1: 'standard' is Julian before 1582-10-15; we refuse rather than mis-date
    with pytest.raises(SeawayInputError, match="1582"):
        decode_cf_time([0], "days since 1500-01-01", "standard", where="t")


def test_grib_valid_time_both_gdal_forms():
    # qgis-platform notes s.4.2: GDAL 3.6 writes bare epoch seconds, older GDAL "  N sec UTC";
    # expected value from datetime.fromtimestamp(tz=UTC) (reference library)
    want = _np(dt.datetime.fromtimestamp(1704078000, tz=dt.timezone.utc))
    assert parse_grib_time("1704078000", where="g") == want
    assert parse_grib_time("  1704078000 sec UTC", where="g") == want
    with pytest.raises(SeawayInputError, match="g"):
        parse_grib_time("", where="g")


def test_iso_and_aware_datetimes():
    # ISO 8601 offsets; aware datetimes converted with datetime.astimezone (reference library)
    assert parse_iso_utc("2024-01-01T03:00:00+01:00", where="x") == np.datetime64("2024-01-01T02:00:00")
    aware = dt.datetime(2024, 1, 1, 12, tzinfo=dt.timezone(dt.timedelta(hours=-5)))
    got = as_utc_seconds("t", [aware, "2024-01-01T17:00Z", np.datetime64("2024-01-01T17:00")])
    assert got[0] == got[1] == got[2]
    with pytest.raises(SeawayInputError, match="t"):
        as_utc_seconds("t", [np.datetime64("NaT")])
    with pytest.raises(SeawayInputError, match=r"t\[0\]"):
        as_utc_seconds("t", [3.5])


def test_times_not_increasing_rejected():
    t = as_utc_seconds("t", ["2024-01-01T00Z", "2024-01-01T06Z", "2024-01-01T06Z"])
    with pytest.raises(SeawayInputError, match="not increasing"):
        require_increasing(t, where="f.nc variable 'hs'")
