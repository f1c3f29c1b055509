# SPDX-License-Identifier: GPL-2.0-or-later
"""The passage report's figures and hour-by-hour table, over all legs at once.

Legs are grouped into timeline rows by source: a leg named ``"name [source]"`` (one run per
source) goes to the row of that source, every other leg to one row. Lines break between legs.
All work is vectorised over the concatenated samples (linear in the number of samples), and
every figure is bounded in size by :mod:`.svg` (thinned lines, one path per colour).
"""
from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Dict, List, Optional, Sequence, Tuple

import numpy as np

from ..comfort.indices import MSI_CLASS_BOUNDS_PCT
from ..passage.result import PassageResult
from .charts import ClassRow, Series, class_timeline, hours_after, sample_edges, time_chart
from .html import fmt_num, line_key, legend, swatch
from .palette import COMFORT_PALETTE, NOT_COMPUTED_COLOUR, comfort_colour
from .route_map import Track, route_map

__all__ = ["Concat", "concat_legs", "group_of", "timeline_figures", "passage_map", "hourly_rows", "class_legend",
           "HOURLY_MAX_ROWS"]

SERIES_COLOURS: Tuple[str, ...] = ("#1d4e6b", "#b3591f", "#5b7f2b", "#7a3d8c", "#333333", "#a0522d")
"""Line colours of the sources (our own; distinct from the class fills)."""

HOURLY_MAX_ROWS: int = 240
"""Rows of the hour-by-hour table at most: 1 h bins up to 240 h, then 3, 6, 12 or 24 h bins."""

_GROUP_RE = re.compile(r"\s\[([^\[\]]+)\]$")


def group_of(name: str) -> str:
    """The timeline row of a leg: the source in ``"name [source]"``, else ''."""
    m = _GROUP_RE.search(name)
    return m.group(1) if m else ""


@dataclass(frozen=True)
class Concat:
    """The samples of every leg, concatenated in leg order (``leg`` = position in the report)."""

    leg: np.ndarray
    eta: np.ndarray
    cls: np.ndarray
    hs: np.ndarray
    msi: np.ndarray
    vacc: np.ndarray
    lacc: np.ndarray
    dist: np.ndarray
    dwell_s: np.ndarray
    flags: np.ndarray


def concat_legs(results: Sequence[PassageResult]) -> Concat:
    """One :class:`Concat` of ``results`` (empty arrays without legs)."""
    def cat(name: str, dtype: object) -> np.ndarray:
        arrs = [np.asarray(getattr(r, name)) for r in results]
        return np.concatenate(arrs).astype(dtype) if arrs else np.zeros(0, dtype=dtype)

    legs = [np.full(r.n, k, dtype=np.int64) for k, r in enumerate(results)]
    return Concat(leg=np.concatenate(legs) if legs else np.zeros(0, dtype=np.int64),
                  eta=cat("eta_utc", "datetime64[ms]"), cls=cat("comfort_class", np.int64), hs=cat("hs_m", float),
                  msi=cat("msi_pct", float), vacc=cat("vacc_rms_m_s2", float), lacc=cat("lacc_rms_m_s2", float),
                  dist=cat("dist_nm", float), dwell_s=cat("dwell_s", float), flags=cat("flags", np.int64))


def class_legend() -> str:
    """The complete class legend (five classes and 'no result')."""
    from ..comfort.indices import COMFORT_CLASS_LABELS

    items = [(swatch(COMFORT_PALETTE[c]), lab) for c, lab in enumerate(COMFORT_CLASS_LABELS)]
    return legend(items + [(swatch(NOT_COMPUTED_COLOUR), "no result (no sea data)")])


def _groups(names: Sequence[str]) -> Dict[str, List[int]]:
    out: Dict[str, List[int]] = {}
    for k, name in enumerate(names):
        out.setdefault(group_of(name), []).append(k)
    return out


def _joined(results: Sequence[PassageResult], legs: Sequence[int], field: str, t_ref: object
            ) -> Tuple[np.ndarray, np.ndarray]:
    """Hours and values of ``field`` over ``legs`` with a NaN between legs (lines break)."""
    hs, vs = [], []
    for k in legs:
        r = results[k]
        hs += [hours_after(r.eta_utc, t_ref), np.array([np.nan])]
        vs += [np.asarray(getattr(r, field), dtype=float), np.array([np.nan])]
    return np.concatenate(hs), np.concatenate(vs)


def _class_rows(results: Sequence[PassageResult], groups: Dict[str, List[int]], t_ref: object) -> List[ClassRow]:
    rows = []
    for g, legs in groups.items():
        pieces = []
        for k in legs:
            r = results[k]
            if r.n:
                pieces.append((sample_edges(hours_after(r.eta_utc, t_ref)),
                               tuple(comfort_colour(c) for c in r.comfort_class)))
        rows.append(ClassRow(g or "comfort class", tuple(pieces)))
    return rows


def timeline_figures(results: Sequence[PassageResult], names: Sequence[str], t_ref: object,
                     offset_h: Optional[float]) -> List[Tuple[str, str, str]]:
    """(svg, legend, caption) of the class timeline, wave height, MSI and accelerations."""
    groups = _groups(names)
    multi = len(groups) > 1
    out = [(class_timeline(t_ref, _class_rows(results, groups, t_ref), label="Comfort class over time",
                           offset_h=offset_h), class_legend(), "Comfort class along the passage over clock time.")]
    specs = (("hs_m", "significant wave height Hs [m]", "Significant wave height met on the passage.", ()),
             ("msi_pct", "MSI (2 h) [%]", "Motion sickness incidence for 2 h exposure; dashed: where the "
              "classes steady, lively, taxing and punishing begin on the MSI scale.",
              tuple((b, f"{b:g} %") for b in MSI_CLASS_BOUNDS_PCT)),
             ("vacc_rms_m_s2", "RMS acceleration [m/s²]", "Vertical (solid) and lateral (dashed) RMS "
              "acceleration at the station.", ()))
    for field, ytitle, caption, thresholds in specs:
        series, keys = [], []
        for i, (g, legs) in enumerate(groups.items()):
            colour = SERIES_COLOURS[i % len(SERIES_COLOURS)]
            h, v = _joined(results, legs, field, t_ref)
            series.append(Series(g, h, v, colour))
            keys.append((line_key(colour), (g + ": " if multi else "") + ytitle.split(" [")[0]))
            if field == "vacc_rms_m_s2":
                h2, v2 = _joined(results, legs, "lacc_rms_m_s2", t_ref)
                series.append(Series(g, h2, v2, colour, dash="5 3"))
                keys[-1] = (line_key(colour), (g + ": " if multi else "") + "vertical acceleration")
                keys.append((line_key(colour, dash="5 3"), (g + ": " if multi else "") + "lateral acceleration"))
        svg = time_chart(t_ref, series, ytitle=ytitle, label=caption, offset_h=offset_h, thresholds=thresholds)
        out.append((svg, legend(keys), caption))
    return out


def passage_map(results: Sequence[PassageResult]) -> str:
    """The route of every leg, segments coloured by the worse class of their two ends (worse
    classes drawn on top where legs overlap, e.g. one run per source)."""
    tracks = []
    for r in results:
        if r.n < 2:
            continue
        seg = np.maximum(r.comfort_class[:-1], r.comfort_class[1:])
        tracks.append(Track(np.asarray(r.lon_deg, dtype=float), np.asarray(r.lat_deg, dtype=float),
                            tuple(comfort_colour(c) for c in seg)))
    order = (NOT_COMPUTED_COLOUR, *COMFORT_PALETTE)
    return route_map(tracks, label="Map of the route coloured by comfort class", order=order)


def _bin_hours(span_h: float) -> int:
    return next((b for b in (1, 3, 6, 12, 24) if span_h / b <= HOURLY_MAX_ROWS), 24)


def hourly_rows(c: Concat, names: Sequence[str], offset_h: Optional[float]) -> Tuple[int, List[List[str]]]:
    """Bin width [h] and rows of the hour-by-hour table: per clock-time bin (UTC) the legs
    sailed, the distance reached on the last of them, the worst class (swatch markup), the
    highest Hs, MSI and vertical acceleration, and the samples without results."""
    from ..comfort.indices import COMFORT_CLASS_LABELS
    from .wording import clock_utc

    ok = ~np.isnat(c.eta)
    if not ok.any():
        return 1, []
    th = c.eta[ok].astype(np.int64) / 3.6e6
    width = _bin_hours(float(th.max() - th.min()))
    b = np.floor(th / width).astype(np.int64)
    order = np.argsort(b, kind="stable")
    bs = b[order]
    starts = np.flatnonzero(np.concatenate(([True], bs[1:] != bs[:-1])))
    sel = {k: np.asarray(getattr(c, k))[ok][order] for k in ("cls", "hs", "msi", "vacc", "leg", "dist")}
    worst = np.maximum.reduceat(sel["cls"], starts)
    peaks = {k: np.fmax.reduceat(sel[k], starts) for k in ("hs", "msi", "vacc")}
    none = np.add.reduceat((sel["cls"] < 0).astype(np.int64), starts)
    ends = np.append(starts[1:], bs.size) - 1
    rows = []
    for i, s in enumerate(starts):
        legs = np.unique(sel["leg"][s:ends[i] + 1])
        lab = COMFORT_CLASS_LABELS[worst[i]] if worst[i] >= 0 else "no result"
        t = np.datetime64(int(bs[s]) * width * 3600 * 1000, "ms")
        rows.append([clock_utc(t, offset_h), ", ".join(str(k + 1) for k in legs[:4]) + (" ..." if legs.size > 4 else ""),
                     fmt_num(sel["dist"][ends[i]], 1), swatch(comfort_colour(int(worst[i]))) + lab,
                     fmt_num(peaks["hs"][i]), fmt_num(peaks["msi"][i], 1), fmt_num(peaks["vacc"][i]), str(int(none[i]))])
    return width, rows
