# SPDX-License-Identifier: GPL-2.0-or-later
"""The report figures built from :mod:`.svg`: clock-time line charts, class timelines, heat maps
and month bars. Times on every axis are clock times (UTC, :func:`.svg.time_ticks`); the axis
title says so and states the local offset when the caller knows it.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Optional, Sequence, Tuple

import numpy as np

from .svg import Frame, axes, band, bars, heat_grid, hmarker, line, nice_ticks, rect_runs, svg_doc, text, \
    tick_label, time_ticks, vmarker
from .wording import offset_text

__all__ = ["Series", "Band", "ClassRow", "time_chart", "class_timeline", "time_heat_map", "month_heat_map",
           "month_bars", "hours_after", "sample_edges"]

WIDTH = 640.0
LEFT, RIGHT = 58.0, 40.0


@dataclass(frozen=True)
class Series:
    """One line: values at hours after the chart's reference time."""

    label: str
    hours: np.ndarray
    values: np.ndarray
    colour: str
    dash: str = ""


@dataclass(frozen=True)
class Band:
    """A shaded range between ``lo`` and ``hi`` at ``hours``."""

    hours: np.ndarray
    lo: np.ndarray
    hi: np.ndarray
    colour: str


@dataclass(frozen=True)
class ClassRow:
    """One row of a class timeline: pieces of (hour edges (m+1), colours (m))."""

    label: str
    pieces: Tuple[Tuple[np.ndarray, Tuple[str, ...]], ...]


def hours_after(t: object, t_ref: object) -> np.ndarray:
    """Hours from ``t_ref`` to ``t`` (datetime64, NaT -> NaN)."""
    ta = np.asarray(t, dtype="datetime64[ms]")
    out = (ta - np.datetime64(t_ref, "ms")).astype("timedelta64[ms]").astype(float) / 3.6e6
    return np.where(np.isnat(ta), np.nan, out)


def sample_edges(h: np.ndarray) -> np.ndarray:
    """Edges of the time each sample stands for: half way to each neighbour (n + 1 values)."""
    if h.size == 1:
        return np.array([h[0] - 0.25, h[0] + 0.25])
    mid = 0.5 * (h[:-1] + h[1:])
    return np.concatenate(([h[0] - (mid[0] - h[0])], mid, [h[-1] + (h[-1] - mid[-1])]))


def _x_domain(hours: Sequence[np.ndarray]) -> Tuple[float, float]:
    vals = np.concatenate([np.asarray(h, dtype=float).ravel() for h in hours]) if hours else np.zeros(0)
    vals = vals[np.isfinite(vals)]
    if vals.size == 0:
        return 0.0, 1.0
    lo, hi = float(vals.min()), float(vals.max())
    pad = max(0.02 * (hi - lo), 0.25)
    return lo - pad, hi + pad


def _time_axes(f: Frame, t_ref: object, offset_h: Optional[float], yt: np.ndarray, ylabels: Sequence[str],
               ytitle: str) -> str:
    xt, xl = time_ticks(t_ref, f.x0, f.x1)
    return axes(f, xt, xl, yt, ylabels, xtitle="time (" + offset_text(offset_h) + ")", ytitle=ytitle)


def time_chart(t_ref: object, series: Sequence[Series], *, ytitle: str, label: str,
               offset_h: Optional[float] = None, bands: Sequence[Band] = (),
               thresholds: Sequence[Tuple[float, str]] = (), marker: Optional[Tuple[float, str]] = None,
               height: float = 210.0) -> str:
    """Lines over clock time, optional shaded bands, dashed horizontal thresholds (labelled at
    the right) and one vertical marker; the y axis starts at 0. "" when no value is finite."""
    vals = np.concatenate([np.asarray(s.values, dtype=float) for s in series] +
                          [np.asarray(b.hi, dtype=float) for b in bands]) if series else np.zeros(0)
    vals = vals[np.isfinite(vals)]
    if vals.size == 0:
        return ""
    top_v = max(float(vals.max()), *(t for t, _ in thresholds if t <= 2 * vals.max()), 1e-6)
    yt = nice_ticks(0.0, top_v, 4)
    if yt.size >= 2 and yt[-1] < top_v * 1.02:
        yt = np.append(yt, yt[-1] + (yt[1] - yt[0]))
    x0, x1 = _x_domain([s.hours for s in series] + ([np.array([marker[0]])] if marker else []))
    f = Frame(x0, x1, 0.0, float(yt[-1]) if yt[-1] > 0 else 1.0, LEFT, 22.0, WIDTH - LEFT - RIGHT, height - 62.0)
    body = [_time_axes(f, t_ref, offset_h, yt, [tick_label(v) for v in yt], ytitle)]
    body += [band(f, b.hours, b.lo, b.hi, b.colour) for b in bands]
    for value, lab in thresholds:
        if value <= f.y1:
            y = float(f.py(value))
            body.append(f'<path d="M{f.left:.1f} {y:.1f}H{f.right:.1f}" stroke="#888" stroke-dasharray="3 3"/>')
            body.append(text(f.right - 3, y - 3, lab, anchor="end", size=9, colour="#555"))
    body += [line(f, s.hours, s.values, s.colour, dash=s.dash) for s in series]
    if marker is not None:
        body.append(vmarker(f, marker[0], marker[1]))
    return svg_doc(WIDTH, height, label, body)


def class_timeline(t_ref: object, rows: Sequence[ClassRow], *, label: str, offset_h: Optional[float] = None,
                   marker: Optional[Tuple[float, str]] = None) -> str:
    """One coloured strip per row over clock time (row labels at the left)."""
    if not rows:
        return ""
    left = 110.0
    height = 58.0 + 26.0 * len(rows)
    x0, x1 = _x_domain([e for r in rows for e, _ in r.pieces])
    f = Frame(x0, x1, 0.0, float(len(rows)), left, 22.0, WIDTH - left - RIGHT, 26.0 * len(rows))
    xt, xl = time_ticks(t_ref, x0, x1)
    body = [axes(f, xt, xl, [], [], xtitle="time (" + offset_text(offset_h) + ")")]
    for j, r in enumerate(rows):
        lo, hi = len(rows) - j - 0.9, len(rows) - j - 0.1
        body.append(rect_runs(f, r.pieces, lo, hi))
        body.append(text(left - 6, float(f.py((lo + hi) / 2)) + 4, r.label[:18], anchor="end"))
    if marker is not None:
        body.append(vmarker(f, marker[0], marker[1]))
    return svg_doc(WIDTH, height, label, body)


def time_heat_map(t_ref: object, dist_edges: np.ndarray, dep_edges_h: np.ndarray, colours: Sequence[Sequence[str]],
                  *, label: str, pick_row: Optional[int] = None, offset_h: Optional[float] = None) -> str:
    """Rows of departures (clock time, earliest at the top) x distance along the route [NM];
    the row ``pick_row`` outlined and labelled 'recommended' in the right margin."""
    right = 112.0
    n = len(colours)
    height = max(150.0, min(420.0, 60.0 + 9.0 * n))
    f = Frame(float(dist_edges[0]), float(dist_edges[-1]), float(dep_edges_h[-1]), float(dep_edges_h[0]),
              92.0, 10.0, WIDTH - 92.0 - right, height - 52.0)
    xt = nice_ticks(f.x0, f.x1, 6)
    yt, yl = time_ticks(t_ref, float(dep_edges_h[0]), float(dep_edges_h[-1]), n=6)
    body = [heat_grid(f, dist_edges, dep_edges_h, colours),
            axes(f, xt, [tick_label(v) for v in xt], yt, yl, xtitle="distance along the route [NM]"),
            text(10, f.top + f.height / 2, "departure (" + offset_text(offset_h) + ")", anchor="middle",
                 rotate=True)]
    if pick_row is not None:
        body.append(hmarker(f, float(dep_edges_h[pick_row]), float(dep_edges_h[pick_row + 1]), "◀ recommended"))
    return svg_doc(WIDTH, height, label, body)


def month_heat_map(dist_edges: np.ndarray, month_labels: Sequence[str], colours: Sequence[Sequence[str]], *,
                   label: str) -> str:
    """Months (rows, first at the top) x distance along the route [NM]."""
    n = len(month_labels)
    height = 56.0 + 20.0 * n
    f = Frame(float(dist_edges[0]), float(dist_edges[-1]), float(n), 0.0, 48.0, 10.0, WIDTH - 48.0 - RIGHT,
              20.0 * n)
    xt = nice_ticks(f.x0, f.x1, 6)
    body = [heat_grid(f, dist_edges, np.arange(n + 1, dtype=float), colours),
            axes(f, xt, [tick_label(v) for v in xt], np.arange(n) + 0.5, list(month_labels),
                 xtitle="distance along the route [NM]")]
    return svg_doc(WIDTH, height, label, body)


def month_bars(month_labels: Sequence[str], values_pct: Sequence[float], colours: Sequence[str], *, label: str,
               ytitle: str) -> str:
    """A bar per month (0..100 %); 0 % months show a thin bar and '0 %', empty months 'no data'."""
    n = len(month_labels)
    f = Frame(-0.6, n - 0.4, 0.0, 100.0, LEFT, 14.0, WIDTH - LEFT - RIGHT, 170.0)
    yt = np.arange(0.0, 100.1, 25.0)
    body = [axes(f, np.arange(n), list(month_labels), yt, [f"{v:g}" for v in yt], ytitle=ytitle),
            bars(f, values_pct, colours)]
    return svg_doc(WIDTH, 226.0, label, body)
