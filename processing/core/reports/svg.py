# SPDX-License-Identifier: GPL-2.0-or-later
"""Inline SVG figures for the report pages: our own small plotting kit (no matplotlib).

Every figure is one ``<svg>`` element with a ``viewBox`` and no fixed size, so it scales to the
page width on a phone and in print; it holds no script, no link and no external reference. Text
uses the page's font. Coordinates are rounded to 0.1 px, every colour's areas or lines are one
``<path>`` (one element per colour, not per sample), and long series are thinned to
:data:`MAX_POINTS` per line keeping each bucket's first, lowest, highest and last point, so the
size of a figure is bounded whatever the length of the passage.

Parts: :class:`Frame` (data -> pixel box), :func:`nice_ticks`, :func:`time_ticks` (clock-time
labels, UTC), :func:`axes`, :func:`line`, :func:`band`, :func:`rect_runs` (class strips),
:func:`heat_grid`, :func:`vmarker`, :func:`hmarker`, :func:`bars` and :func:`route_map`
(equirectangular, with a scale bar in NM). Text passed in is escaped here.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Dict, List, Optional, Sequence, Tuple

import numpy as np

from .html import esc

__all__ = ["Frame", "MAX_POINTS", "fmt_px", "nice_ticks", "time_ticks", "svg_doc", "text", "axes", "line", "band",
           "rect_runs", "heat_grid", "vmarker", "hmarker", "bars", "Track", "NM_PER_DEG"]

MAX_POINTS: int = 1200
"""Points per drawn line at most (thinned by buckets above that)."""

MAX_MAP_POINTS: int = 4000
"""Route positions drawn on a map at most (colour changes always kept)."""

NM_PER_DEG: float = 2.0 * math.pi * 6371008.8 / 360.0 / 1852.0
"""Nautical miles per degree of a great circle on the mean Earth sphere (R = 6371.0088 km,
IUGG mean radius, Moritz 2000, Geodetic Reference System 1980; 1 NM = 1852 m): 60.04 NM."""

INK, GRID, AXIS = "#222222", "#d9dee2", "#666666"
FONT = 11


def fmt_px(v: float) -> str:
    """A pixel coordinate with at most one decimal."""
    s = f"{v:.1f}"
    return s[:-2] if s.endswith(".0") else s


@dataclass(frozen=True)
class Frame:
    """Data box (``x0..x1``, ``y0..y1``) drawn into the pixel box ``left, top, width, height``
    (y grows upwards in data, downwards in pixels)."""

    x0: float
    x1: float
    y0: float
    y1: float
    left: float
    top: float
    width: float
    height: float

    def px(self, x: object) -> np.ndarray:
        span = (self.x1 - self.x0) or 1.0
        return self.left + (np.asarray(x, dtype=float) - self.x0) / span * self.width

    def py(self, y: object) -> np.ndarray:
        span = (self.y1 - self.y0) or 1.0
        return self.top + self.height - (np.asarray(y, dtype=float) - self.y0) / span * self.height

    @property
    def bottom(self) -> float:
        return self.top + self.height

    @property
    def right(self) -> float:
        return self.left + self.width


def nice_ticks(lo: float, hi: float, n: int = 5) -> np.ndarray:
    """Round tick values (steps 1, 2, 2.5, 5 x 10^k) covering ``lo..hi``, about ``n`` of them."""
    if not (math.isfinite(lo) and math.isfinite(hi)):
        return np.array([0.0])
    if hi <= lo:
        hi = lo + (abs(lo) or 1.0)
    raw = (hi - lo) / max(n, 1)
    mag = 10.0 ** math.floor(math.log10(raw))
    step = next(m * mag for m in (1.0, 2.0, 2.5, 5.0, 10.0) if m * mag >= raw)
    first = math.ceil(lo / step - 1e-9) * step
    return np.round(np.arange(first, hi + 1e-9 * step, step), 10)


def tick_label(v: float) -> str:
    """A tick value without needless decimals."""
    return f"{v:.10g}" if abs(v) >= 1e-9 else "0"


TIME_STEPS_H: Tuple[float, ...] = (1, 2, 3, 6, 12, 24, 48, 72, 168, 336, 672)
MONTHS: Tuple[str, ...] = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")


def _epoch_h(t: object) -> float:
    return float(np.datetime64(t, "ms").astype(np.int64)) / 3.6e6


def day_label(t: np.datetime64) -> str:
    """'11 Mar' of a UTC time."""
    d = str(np.datetime64(t, "D"))
    return f"{int(d[8:10])} {MONTHS[int(d[5:7]) - 1]}"


def time_ticks(t_ref: object, h0: float, h1: float, n: int = 7) -> Tuple[np.ndarray, List[str]]:
    """Ticks of a clock-time axis whose values are hours after ``t_ref`` (UTC), from ``h0`` to
    ``h1``: positions at whole UTC hours of a round step, labels 'HH:MM' with the date added
    at the first tick and at each new day ('11 Mar 06:00'), or the date alone for steps of a
    day or more."""
    ref = _epoch_h(t_ref)
    span = max(h1 - h0, 1e-6)
    step = next((s for s in TIME_STEPS_H if span / s <= n), TIME_STEPS_H[-1])
    first = math.ceil((ref + h0) / step - 1e-9) * step
    ticks = np.arange(first, ref + h1 + 1e-9, step) - ref
    labels: List[str] = []
    last_day = ""
    for h in ticks:
        t = np.datetime64(int(round((ref + h) * 3.6e6)), "ms")
        day = day_label(t)
        hhmm = str(np.datetime64(t, "m"))[11:16]
        if step >= 24:
            labels.append(day)
        else:
            labels.append(hhmm if day == last_day else f"{day} {hhmm}")
        last_day = day
    return ticks, labels


def svg_doc(width: float, height: float, label: str, body: Sequence[str]) -> str:
    """One figure: ``<svg>`` with a viewBox, an accessible name (``role="img"``, ``<title>``)."""
    head = (f'<svg class="chart" width="{fmt_px(width)}" height="{fmt_px(height)}" '
            f'viewBox="0 0 {fmt_px(width)} {fmt_px(height)}" xmlns="http://www.w3.org/2000/svg" '
            f'role="img" aria-label="{esc(label)}" font-family="sans-serif" font-size="{FONT}">'
            f"<title>{esc(label)}</title>")
    return head + "".join(body) + "</svg>"


def text(x: float, y: float, s: str, *, anchor: str = "start", size: Optional[float] = None,
         colour: str = INK, bold: bool = False, rotate: bool = False) -> str:
    """A text element (escaped); ``rotate`` turns it 90 degrees anticlockwise about (x, y)."""
    extra = f' font-size="{fmt_px(size)}"' if size else ""
    extra += ' font-weight="bold"' if bold else ""
    extra += f' transform="rotate(-90 {fmt_px(x)} {fmt_px(y)})"' if rotate else ""
    fill = f' fill="{colour}"' if colour != INK else ""
    return f'<text x="{fmt_px(x)}" y="{fmt_px(y)}" text-anchor="{anchor}"{fill}{extra}>{esc(s)}</text>'


def axes(f: Frame, xticks: Sequence[float], xlabels: Sequence[str], yticks: Sequence[float],
         ylabels: Sequence[str], *, xtitle: str = "", ytitle: str = "") -> str:
    """Grid lines, tick labels, the frame and the axis titles of ``f``."""
    out = []
    grid = []
    for v, lab in zip(yticks, ylabels):
        y = float(f.py(v))
        if f.top - 0.5 <= y <= f.bottom + 0.5:
            grid.append(f"M{fmt_px(f.left)} {fmt_px(y)}H{fmt_px(f.right)}")
            out.append(text(f.left - 4, y + 4, lab, anchor="end"))
    for v, lab in zip(xticks, xlabels):
        x = float(f.px(v))
        if f.left - 0.5 <= x <= f.right + 0.5:
            grid.append(f"M{fmt_px(x)} {fmt_px(f.top)}V{fmt_px(f.bottom)}")
            out.append(text(x, f.bottom + 14, lab, anchor="middle"))
    head = f'<path d="{"".join(grid)}" stroke="{GRID}" stroke-width="1" fill="none"/>' if grid else ""
    frame = (f'<rect x="{fmt_px(f.left)}" y="{fmt_px(f.top)}" width="{fmt_px(f.width)}" height="{fmt_px(f.height)}" '
             f'fill="none" stroke="{AXIS}" stroke-width="1"/>')
    if xtitle:
        out.append(text(f.left + f.width / 2, f.bottom + 30, xtitle, anchor="middle"))
    if ytitle:
        out.append(text(12, f.top + f.height / 2, ytitle, anchor="middle", rotate=True))
    return head + frame + "".join(out)


def thin(x: np.ndarray, y: np.ndarray, max_points: int = MAX_POINTS) -> Tuple[np.ndarray, np.ndarray]:
    """At most about ``max_points`` points: per bucket the first, lowest, highest and last
    finite point; a bucket without any finite value keeps one NaN (a visible gap). Gaps
    narrower than a bucket (under a pixel or two) are bridged."""
    n = x.size
    if n <= max_points:
        return x, y
    edges = np.linspace(0, n, max_points // 4 + 1).astype(int)
    fin = np.isfinite(y) & np.isfinite(x)
    keep: List[int] = []
    for a, b in zip(edges[:-1], edges[1:]):
        idx = np.flatnonzero(fin[a:b]) + a
        if idx.size == 0:
            keep.append(a)
            continue
        seg = y[idx]
        keep += [int(idx[0]), int(idx[np.argmin(seg)]), int(idx[np.argmax(seg)]), int(idx[-1])]
    pick = np.unique(np.array(keep))
    return x[pick], y[pick]


def _path_d(px: np.ndarray, py: np.ndarray) -> str:
    """'M x y L x y ...' with a new subpath after every NaN."""
    ok = np.isfinite(px) & np.isfinite(py)
    out: List[str] = []
    pen = False
    for a, b, good in zip(px, py, ok):
        if not good:
            pen = False
            continue
        out.append(f"{'L' if pen else 'M'}{fmt_px(a)} {fmt_px(b)}")
        pen = True
    return "".join(out)


def line(f: Frame, x: object, y: object, colour: str, *, width: float = 1.6, dash: str = "",
         max_points: int = MAX_POINTS) -> str:
    """A line through (x, y) in data units, broken at NaN; "" when nothing is finite."""
    xa, ya = thin(np.asarray(x, dtype=float), np.asarray(y, dtype=float), max_points)
    d = _path_d(f.px(xa), f.py(ya))
    if not d:
        return ""
    dash_attr = f' stroke-dasharray="{dash}"' if dash else ""
    return (f'<path d="{d}" fill="none" stroke="{colour}" stroke-width="{fmt_px(width)}" '
            f'stroke-linejoin="round"{dash_attr}/>')


def band(f: Frame, x: object, lo: object, hi: object, colour: str, opacity: float = 0.35) -> str:
    """The area between ``lo`` and ``hi`` (one polygon per run of finite values)."""
    xa, la, ha = (np.asarray(v, dtype=float) for v in (x, lo, hi))
    ok = np.isfinite(xa) & np.isfinite(la) & np.isfinite(ha)
    parts = []
    for s, e in zip(*runs(ok)):
        if not ok[s]:
            continue
        xs, ls, hs = f.px(xa[s:e]), f.py(la[s:e]), f.py(ha[s:e])
        pts = [f"{fmt_px(a)} {fmt_px(b)}" for a, b in zip(xs, hs)] + [f"{fmt_px(a)} {fmt_px(b)}" for a, b in zip(xs[::-1], ls[::-1])]
        parts.append("M" + "L".join(pts) + "Z")
    if not parts:
        return ""
    return f'<path d="{"".join(parts)}" fill="{colour}" fill-opacity="{opacity:g}" stroke="none"/>'


def runs(values: Sequence[object]) -> Tuple[np.ndarray, np.ndarray]:
    """Start and end (exclusive) indices of the runs of equal consecutive values."""
    v = np.asarray(values)
    if v.size == 0:
        return np.zeros(0, dtype=int), np.zeros(0, dtype=int)
    starts = np.flatnonzero(np.concatenate(([True], v[1:] != v[:-1])))
    return starts, np.append(starts[1:], v.size)


def _rect_d(x0: float, y0: float, x1: float, y1: float) -> str:
    return f"M{fmt_px(x0)} {fmt_px(y0)}H{fmt_px(x1)}V{fmt_px(y1)}H{fmt_px(x0)}Z"


def rect_runs(f: Frame, pieces: Sequence[Tuple[object, Sequence[str]]], y_lo: float, y_hi: float) -> str:
    """Coloured boxes between ``y_lo`` and ``y_hi`` (data units): each piece is (x edges
    (m + 1), colours (m)), box i from edge i to edge i + 1; equal neighbours merged, one path
    per colour over all pieces; colour "" draws nothing."""
    by_colour: Dict[str, List[str]] = {}
    py0, py1 = float(f.py(y_hi)), float(f.py(y_lo))
    for x_edges, colours in pieces:
        px = f.px(np.asarray(x_edges, dtype=float))
        for s, e in zip(*runs(list(colours))):
            c = colours[s]
            if c:
                by_colour.setdefault(c, []).append(_rect_d(float(px[s]), py0, float(px[e]), py1))
    return "".join(f'<path d="{"".join(d)}" fill="{c}" stroke="none"/>' for c, d in by_colour.items())


def heat_grid(f: Frame, x_edges: object, y_edges: object, colours: Sequence[Sequence[str]]) -> str:
    """A grid of coloured cells: row ``j`` spans ``y_edges[j]..y_edges[j+1]`` and holds
    ``colours[j][i]`` from ``x_edges[i]`` to ``x_edges[i+1]``; one path per colour."""
    xe = np.asarray(x_edges, dtype=float)
    ye = np.asarray(y_edges, dtype=float)
    by_colour: Dict[str, List[str]] = {}
    for j, row in enumerate(colours):
        ya, yb = sorted((float(f.py(ye[j])), float(f.py(ye[j + 1]))))
        for s, e in zip(*runs(list(row))):
            if row[s]:
                by_colour.setdefault(row[s], []).append(_rect_d(float(f.px(xe[s])), ya, float(f.px(xe[e])), yb))
    return "".join(f'<path d="{"".join(d)}" fill="{c}" stroke="none"/>' for c, d in by_colour.items())


def vmarker(f: Frame, x: float, label: str, colour: str = "#1d4e6b") -> str:
    """A vertical marker line at ``x`` with its label above the plot."""
    px = float(f.px(x))
    anchor = "end" if px > f.left + 0.7 * f.width else "start"
    dx = -4 if anchor == "end" else 4
    return (f'<path d="M{fmt_px(px)} {fmt_px(f.top - 12)}V{fmt_px(f.bottom)}" stroke="{colour}" stroke-width="2.2" '
            f'stroke-dasharray="9 3" fill="none"/>' + text(px + dx, f.top - 4, label, anchor=anchor, colour=colour,
                                                          bold=True))


def hmarker(f: Frame, y_lo: float, y_hi: float, label: str, colour: str = "#1d4e6b") -> str:
    """An outlined row from ``y_lo`` to ``y_hi`` across the plot, labelled in the right margin."""
    ya, yb = sorted((float(f.py(y_lo)), float(f.py(y_hi))))
    return (f'<rect x="{fmt_px(f.left - 1)}" y="{fmt_px(ya)}" width="{fmt_px(f.width + 2)}" height="{fmt_px(max(yb - ya, 2.0))}" '
            f'fill="none" stroke="{colour}" stroke-width="2.5"/>'
            + text(f.right + 6, (ya + yb) / 2 + 4, label, colour=colour, bold=True, size=10))


def bars(f: Frame, values: Sequence[float], colours: Sequence[str], *, zero_label: str = "0 %",
         missing_label: str = "no data") -> str:
    """One bar per value at x = 0, 1, ... (data units, bar width 0.7); a value of 0 gets a thin
    dark bar and ``zero_label``; NaN gets ``missing_label`` (no bar)."""
    out = []
    for i, (v, c) in enumerate(zip(values, colours)):
        x0, x1 = float(f.px(i - 0.35)), float(f.px(i + 0.35))
        base = float(f.py(0.0))
        if not math.isfinite(v):
            out.append(text((x0 + x1) / 2, base - 6, missing_label, anchor="middle", size=9, colour=AXIS))
            continue
        top = min(float(f.py(v)), base - 2.5)  # 0 and tiny values stay visible as a 2.5 px bar
        out.append(f'<rect x="{fmt_px(x0)}" y="{fmt_px(top)}" width="{fmt_px(x1 - x0)}" height="{fmt_px(base - top)}" '
                   f'fill="{c}" stroke="{INK}" stroke-width="0.8"/>')
        if v == 0:
            out.append(text((x0 + x1) / 2, top - 4, zero_label, anchor="middle", size=9))
    return "".join(out)


@dataclass(frozen=True)
class Track:
    """One line on a map: positions (degrees) and the colour of each segment (n - 1)."""

    lon_deg: np.ndarray
    lat_deg: np.ndarray
    seg_colours: Tuple[str, ...]
