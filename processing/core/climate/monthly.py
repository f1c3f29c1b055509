# SPDX-License-Identifier: GPL-2.0-or-later
"""Seasonal comfort climate, step 3: per calendar month statistics and the CSV writer.

Per calendar month m (all years pooled, UTC months) and route sample i, from the integer
counts of the chunks (:mod:`.chunks`):

* class shares p_{m,i,c} = N_{m,i,c} / N_{m,i}, N_{m,i} = steps with data (missing steps are
  left out of the denominator and reported as ``missing_steps``);
* route-wide class shares pool all samples: sum_i N_{m,i,c} / sum_i N_{m,i} (each sample
  stands for an equal length of route because samples are evenly spaced);
* ``ok_share`` = share of time with class <= MAX_CLASS; ``exceed_share`` = share of time with a
  station criterion exceeded (criteria usage > 1);
* weather windows and waiting times as defined in :mod:`.windows`.

A share with an empty denominator is NaN and stated in ``notes`` (never 0).
"""
from __future__ import annotations

import csv
import io
import math
from dataclasses import dataclass
from typing import Iterable, List, Optional, Sequence, Tuple

import numpy as np
from numpy.typing import NDArray

from ..flags import CAUTION, SampleFlag
from ..units import FloatArray, nm_from_m
from ..validation import SeawayInputError, show
from .chunks import ChunkResult, MonthlyCounts
from .engine import ClimateSetup
from .windows import WaitTotals, merge_waits

__all__ = ["ClimateTotals", "ClimateResult", "reduce_chunks", "finish_climate", "parse_months", "write_climate_csv"]


def parse_months(text: object) -> Tuple[int, ...]:
    """Months 1..12 from "1-12", "6,7,8", "11-2" (wrapping), a sequence of ints, or None/"" (all).

    Raises :class:`SeawayInputError` naming the text for anything else.
    """
    if text is None or (isinstance(text, str) and not text.strip()):
        return tuple(range(1, 13))
    if isinstance(text, (list, tuple)):
        items = [str(v) for v in text]
    else:
        items = str(text).replace(";", ",").split(",")
    out: List[int] = []
    try:
        for it in items:
            it = it.strip()
            if not it:
                continue
            if "-" in it:
                lo_s, hi_s = it.split("-", 1)
                lo, hi = int(lo_s), int(hi_s)
                if not (1 <= lo <= 12 and 1 <= hi <= 12):
                    raise ValueError(it)
                rng = list(range(lo, hi + 1)) if lo <= hi else list(range(lo, 13)) + list(range(1, hi + 1))
                out += rng
            else:
                v = int(it)
                if not 1 <= v <= 12:
                    raise ValueError(it)
                out.append(v)
    except ValueError:
        raise SeawayInputError(
            f"months {show(text)} is not a list of months 1..12 (examples: '1-12', '6,7,8', '11-2')"
        ) from None
    if not out:
        raise SeawayInputError(f"months {show(text)} selects no month")
    return tuple(sorted(set(out)))


@dataclass(frozen=True)
class ClimateTotals(MonthlyCounts):
    """Integer sums over all chunks (months 0..11); see :class:`.chunks.ChunkResult`."""

    wait: WaitTotals


def reduce_chunks(results: Iterable[ChunkResult]) -> ClimateTotals:
    """Add chunk results in chunk order (sorted by ``index``; exact integer arithmetic).

    The chunks must tile the series without gaps or overlap; otherwise an error."""
    rs = sorted(results, key=lambda r: r.index)
    if not rs:
        raise SeawayInputError("no chunk results to reduce")
    for p, q in zip(rs, rs[1:]):
        if q.a != p.b:
            raise SeawayInputError(f"chunk {q.index} starts at step {q.a}, expected {p.b}")
    tot = {k: sum(getattr(r, k) for r in rs[1:]) + getattr(rs[0], k) for k in (
        "class_counts", "exceed_counts", "limit_counts", "implausible_counts", "steps",
        "dep_ok", "dep_known", "dep_unknown", "dep_past_end")}
    return ClimateTotals(wait=merge_waits(r.wait for r in rs), **tot)


def _share(num: NDArray[np.int64], den: NDArray[np.int64]) -> FloatArray:
    num = np.asarray(num, dtype=np.float64)
    den = np.asarray(den, dtype=np.float64)
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.where(den > 0, num / np.where(den > 0, den, 1.0), np.nan)


@dataclass(frozen=True)
class ClimateResult:
    """Seasonal comfort climate of one route, vessel, speed and station.

    Month axis (nm = len(months), calendar months 1..12); sample axis n.

    Per sample: ``lon_deg``, ``lat_deg``, ``dist_nm``, ``segment_index``.
    Per month and sample: ``class_share`` (nm, n, 5), ``ok_share`` (nm, n),
    ``exceed_share`` (nm, n), ``valid_steps`` (nm, n), ``missing_steps`` (nm, n),
    ``method_limit_steps`` (nm, n).
    Per sample: ``sample_flags`` (n,) SampleFlag masks: OUTSIDE_GRID (position off the
    hindcast grid), NO_SEA_DATA (inside the grid but no data at any step, e.g. on land),
    OUTSIDE_VALIDITY (some steps outside the response method's range).
    Per month: ``route_class_share`` (nm, 5), ``route_ok_share``, ``route_exceed_share``,
    ``window_probability`` (acceptable / known departures), ``departures_known``,
    ``departures_ok``, ``departures_unknown``, ``departures_past_end``, ``mean_wait_h``,
    ``wait_censored`` (starts without an acceptable departure before the data end),
    ``steps`` (hindcast steps per month).
    Run: ``max_class``, ``passage_h``, ``step_h``, ``speed_kn``, ``vessel_name``,
    ``station_name``, ``task``, ``first_utc``, ``last_utc``, ``n_years`` (distinct years),
    ``notes``, ``caution``, ``backend``.
    """

    months: Tuple[int, ...]
    lon_deg: FloatArray
    lat_deg: FloatArray
    dist_nm: FloatArray
    segment_index: NDArray[np.int64]
    class_share: FloatArray
    ok_share: FloatArray
    exceed_share: FloatArray
    valid_steps: NDArray[np.int64]
    missing_steps: NDArray[np.int64]
    method_limit_steps: NDArray[np.int64]
    route_class_share: FloatArray
    route_ok_share: FloatArray
    route_exceed_share: FloatArray
    window_probability: FloatArray
    departures_known: NDArray[np.int64]
    departures_ok: NDArray[np.int64]
    departures_unknown: NDArray[np.int64]
    departures_past_end: NDArray[np.int64]
    mean_wait_h: FloatArray
    wait_censored: NDArray[np.int64]
    steps: NDArray[np.int64]
    sample_flags: NDArray[np.int64]
    max_class: int
    passage_h: float
    step_h: float
    speed_kn: float
    vessel_name: str
    station_name: str
    task: str
    first_utc: np.datetime64
    last_utc: np.datetime64
    n_years: int
    notes: Tuple[str, ...] = ()
    caution: str = CAUTION
    backend: str = ""

    @property
    def n(self) -> int:
        return int(self.lon_deg.size)

    def segment_ok_share(self) -> FloatArray:
        """(nm, n-1) share of time within MAX_CLASS per segment between consecutive samples:
        mean of its two end samples (NaN if either is NaN)."""
        return 0.5 * (self.ok_share[:, :-1] + self.ok_share[:, 1:])

    def to_csv(self, path: Optional[str] = None) -> str:
        """Write (or return, when ``path`` is None) the CSV of :func:`write_climate_csv`."""
        return write_climate_csv(self, path)


def _coverage_notes(ms: Sequence[int], route_valid: NDArray[np.int64], totals: ClimateTotals,
                    mi: NDArray[np.int64]) -> List[str]:
    """Notes on empty months and on sea states counted as out of range or implausible."""
    nts: List[str] = []
    for m, v in zip(ms, route_valid):
        if v == 0:
            nts.append(f"month {m:02d}: no hindcast data on the route; its shares are empty (NaN)")
    for m, k in zip(ms, totals.dep_known[mi]):
        if k == 0:
            nts.append(f"month {m:02d}: no departure with a complete passage inside the data; "
                       "window probability empty (NaN)")
    if int(totals.limit_counts.sum()):
        nts.append(f"{int(totals.limit_counts.sum())} (step, sample) sea states outside the response "
                   "method's validity range (Tp off the table or speed beyond the hull model): indicative only")
    if int(totals.implausible_counts.sum()):
        nts.append(f"{int(totals.implausible_counts.sum())} (step, sample) values with Hs < 0 or Tp <= 0 "
                   "were treated as missing")
    return nts


def _sample_flags(setup: ClimateSetup,
                  totals: ClimateTotals) -> Tuple[NDArray[np.int64], List[str]]:
    """Per-sample flags (OUTSIDE_GRID, NO_SEA_DATA, OUTSIDE_VALIDITY) and their notes."""
    sflags = np.zeros(setup.n, dtype=np.int64)
    sflags[~setup.weights.inside] |= int(SampleFlag.OUTSIDE_GRID)
    never = setup.weights.inside & (totals.class_counts[:, :, 1:].sum(axis=(0, 2)) == 0)
    sflags[never] |= int(SampleFlag.NO_SEA_DATA)
    sflags[totals.limit_counts.sum(axis=0) > 0] |= int(SampleFlag.OUTSIDE_VALIDITY)
    nts: List[str] = []
    n_off = int(np.count_nonzero(~setup.weights.inside))
    if n_off:
        nts.append(f"{n_off} of {setup.n} route samples lie outside the hindcast grid: no data there (OFFGRID)")
    if int(never.sum()):
        nts.append(f"{int(never.sum())} route samples inside the grid have no data at any step (NOSEA)")
    return sflags, nts


_METHOD_NOTES = (
    "departures whose passage would end after the last hindcast step are not counted "
    "(departures_past_end); starts with no acceptable departure before the data end are "
    "censored (wait_censored) and left out of the mean waiting time",
    "the class at each sample is that of the hindcast step nearest to the moment the "
    "vessel reaches it (no interpolation in time); deep water assumed",
)


def finish_climate(setup: ClimateSetup, totals: ClimateTotals, months: Sequence[int] = tuple(range(1, 13)),
                   *, notes: Sequence[str] = (), backend: str = "") -> ClimateResult:
    """Shares, window probabilities and waiting times for the selected ``months`` (1..12)."""
    ms = parse_months(list(months))
    mi = np.array([m - 1 for m in ms], dtype=np.int64)
    cc = totals.class_counts[mi]                        # (nm, n, 6)
    valid = cc[:, :, 1:].sum(axis=2)                    # (nm, n)
    ok = cc[:, :, 1:2 + setup.max_class].sum(axis=2)
    route_valid = valid.sum(axis=1)
    series, w = setup.series, totals.wait
    step_h = series.step_s / 3600.0
    sflags, flag_notes = _sample_flags(setup, totals)
    nts = (list(notes) + list(series.notes) + _coverage_notes(ms, route_valid, totals, mi)
           + flag_notes + list(_METHOD_NOTES))
    t = series.times_utc
    years = np.unique(t[series.present].astype("datetime64[Y]")).size if series.present.any() else 0
    return ClimateResult(
        months=ms, lon_deg=setup.lon_deg.copy(), lat_deg=setup.lat_deg.copy(),
        dist_nm=np.asarray(nm_from_m(setup.dist_m), dtype=float), segment_index=setup.segment_index.copy(),
        class_share=_share(cc[:, :, 1:], valid[:, :, None]), ok_share=_share(ok, valid),
        exceed_share=_share(totals.exceed_counts[mi], valid), valid_steps=valid,
        missing_steps=cc[:, :, 0], method_limit_steps=totals.limit_counts[mi],
        route_class_share=_share(cc[:, :, 1:].sum(axis=1), route_valid[:, None]),
        route_ok_share=_share(ok.sum(axis=1), route_valid),
        route_exceed_share=_share(totals.exceed_counts[mi].sum(axis=1), route_valid),
        window_probability=_share(totals.dep_ok[mi], totals.dep_known[mi]),
        departures_known=totals.dep_known[mi], departures_ok=totals.dep_ok[mi],
        departures_unknown=totals.dep_unknown[mi], departures_past_end=totals.dep_past_end[mi],
        mean_wait_h=_share(w.sum_steps[mi], w.count[mi]) * step_h, wait_censored=w.censored[mi],
        steps=totals.steps[mi], sample_flags=sflags, max_class=setup.max_class,
        passage_h=setup.passage_s / 3600.0, step_h=step_h, speed_kn=setup.speed_kn,
        vessel_name=setup.vessel_name, station_name=setup.station_name, task=setup.task,
        first_utc=t[0], last_utc=t[-1], n_years=int(years), notes=tuple(dict.fromkeys(nts)),
        backend=backend,
    )


def _f(v: float, nd: int = 4) -> str:
    return "" if not math.isfinite(float(v)) else f"{float(v):.{nd}f}"


def write_climate_csv(result: ClimateResult, path: Optional[str] = None) -> str:
    """CSV with one row per month and sample plus one route row (``sample`` = "route") per
    month; ends with comment lines ('#') holding the run description, notes and the caution.

    Columns: month, sample, dist_nm, lon_deg, lat_deg, share_class0..4, ok_share,
    exceed_share, valid_steps, missing_steps, window_probability, mean_wait_h,
    departures_known, wait_censored (these four on route rows only), flags (sample flag codes,
    sample rows only).
    """
    from ..comfort.indices import COMFORT_CLASS_LABELS

    buf = io.StringIO()
    wr = csv.writer(buf, lineterminator="\n")
    head = ["month", "sample", "dist_nm", "lon_deg", "lat_deg"]
    head += [f"share_{lab}" for lab in COMFORT_CLASS_LABELS]
    head += ["ok_share", "exceed_share", "valid_steps", "missing_steps", "window_probability",
             "mean_wait_h", "departures_known", "wait_censored", "flags"]
    wr.writerow(head)
    from ..flags import flag_codes
    r = result
    for k, m in enumerate(r.months):
        row = [m, "route", _f(r.dist_nm[-1], 2), "", ""]
        row += [_f(v) for v in r.route_class_share[k]]
        row += [_f(r.route_ok_share[k]), _f(r.route_exceed_share[k]), int(r.valid_steps[k].sum()),
                int(r.missing_steps[k].sum()), _f(r.window_probability[k]), _f(r.mean_wait_h[k], 2),
                int(r.departures_known[k]), int(r.wait_censored[k]), ""]
        wr.writerow(row)
        for i in range(r.n):
            row = [m, i, _f(r.dist_nm[i], 2), _f(r.lon_deg[i], 5), _f(r.lat_deg[i], 5)]
            row += [_f(v) for v in r.class_share[k, i]]
            row += [_f(r.ok_share[k, i]), _f(r.exceed_share[k, i]), int(r.valid_steps[k, i]),
                    int(r.missing_steps[k, i]), "", "", "", "", flag_codes(int(r.sample_flags[i]))]
            wr.writerow(row)
    buf.write(f"# vessel {r.vessel_name}, station {r.station_name} ({r.task}), speed {r.speed_kn:g} kn, "
              f"passage {r.passage_h:.1f} h, worst acceptable class {r.max_class} "
              f"({COMFORT_CLASS_LABELS[r.max_class]}), hindcast {r.first_utc}Z..{r.last_utc}Z, "
              f"step {r.step_h:g} h, {r.n_years} year(s)\n")
    for note in r.notes:
        buf.write(f"# note: {note}\n")
    buf.write(f"# {r.caution}\n")
    text = buf.getvalue()
    if path is not None:
        with open(path, "w", encoding="utf-8", newline="") as fh:
            fh.write(text)
    return text
