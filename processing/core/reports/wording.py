# SPDX-License-Identifier: GPL-2.0-or-later
"""Plain words for the report pages: program identifiers never reach the reader.

Parameter values (``first_valid``, ``exact`` ...) and field names that notes from the core
mention (``wait_censored``, ``departures_past_end``, ``msdv_cum`` ...) are replaced by words
here, once for all reports. Field names stay the public interface of the layers and the CSV;
only the page shows words.
"""
from __future__ import annotations

import re
from typing import Dict, Optional

import numpy as np

__all__ = ["PLAIN_VALUES", "PLAIN_TERMS", "plain_value", "plain_text", "clock_utc", "offset_text"]

PLAIN_VALUES: Dict[str, str] = {
    "exact": "spectral integration at every sample",
    "table": "response tables per unit wave height, interpolated",
    "first_valid": "first source with data at each sample",
    "compare": "each source computed on its own",
    "worst_msi": "lowest worst motion sickness incidence",
    "hours_above": "fewest hours above the acceptable class",
    "dose": "lowest motion sickness dose at arrival",
    "earliest_ok": "earliest departure within limits",
}
"""Whole values of a report field -> words (method, source mode, criterion)."""

PLAIN_TERMS: Dict[str, str] = {
    "wait_censored": "starts without a window before the data end",
    "departures_past_end": "departures whose passage would end after the data",
    "departures_known": "departures counted",
    "departures_unknown": "departures with missing data",
    "mean_wait_h": "mean wait",
    "msdv_cum": "motion sickness dose",
    "first_valid": "first source with data at each sample",
    "ok_share": "share of acceptable time",
    "window_probability": "window probability",
}
"""Identifiers that may appear inside a sentence -> words."""

_TERM_RE = re.compile(r"\s*\(\s*(" + "|".join(map(re.escape, PLAIN_TERMS)) + r")\s*\)|\b("
                      + "|".join(map(re.escape, PLAIN_TERMS)) + r")\b")


def plain_value(value: object) -> str:
    """A field value in words when it is one of :data:`PLAIN_VALUES`, else as text."""
    s = str(value)
    return PLAIN_VALUES.get(s.strip(), plain_text(s))


def plain_text(text: object) -> str:
    """``text`` with every identifier of :data:`PLAIN_TERMS` in words; an identifier in
    parentheses after its own description is dropped."""
    def repl(m: "re.Match[str]") -> str:
        return "" if m.group(1) else PLAIN_TERMS[m.group(2)]

    return _TERM_RE.sub(repl, str(text))


def clock_utc(t: object, offset_h: Optional[float] = None) -> str:
    """'2031-03-11 06:30 UTC', with the local time added when ``offset_h`` is known
    ('2031-03-11 06:30 UTC (08:30 local)'); 'n/a' for None or NaT."""
    if t is None:
        return "n/a"
    t64 = np.datetime64(t, "m")
    if np.isnat(t64):
        return "n/a"
    out = str(t64).replace("T", " ") + " UTC"
    if offset_h is not None and np.isfinite(offset_h):
        local = t64 + np.timedelta64(int(round(offset_h * 60)), "m")
        out += f" ({str(local)[11:16]} local)"
    return out


def offset_text(offset_h: Optional[float]) -> str:
    """How times are given: 'UTC' or 'UTC; local time = UTC+02:00'."""
    if offset_h is None or not np.isfinite(offset_h):
        return "UTC"
    minutes = int(round(offset_h * 60))
    sign = "+" if minutes >= 0 else "-"
    return f"UTC; local time = UTC{sign}{abs(minutes) // 60:02d}:{abs(minutes) % 60:02d}"
