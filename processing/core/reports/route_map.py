# SPDX-License-Identifier: GPL-2.0-or-later
"""A small map of the route for the report pages: inline SVG, segments coloured by the caller.

Projection: equirectangular about the middle latitude of the route, x = lon cos(lat_mid),
y = lat (degrees of a great circle on the mean sphere; Snyder 1987, "Map Projections - A
Working Manual", USGS Professional Paper 1395, p. 90, equidistant cylindrical). On the scale of
a passage (up to a few hundred NM) distances read off the map within a few per cent; the scale
bar states nautical miles along the middle latitude. Longitudes are unwrapped about the first
position, so a route across the antimeridian stays in one piece. No background map, no tiles,
no network: a lat/lon graticule, the route, the start and end marks, a north mark and the
scale bar.
"""
from __future__ import annotations

import math
from typing import Dict, List, Sequence, Tuple

import numpy as np

from .svg import AXIS, GRID, INK, MAX_MAP_POINTS, NM_PER_DEG, Track, fmt_px, nice_ticks, runs, svg_doc, text

__all__ = ["route_map", "Track"]


def _unwrapped(tracks: Sequence[Track]) -> List[np.ndarray]:
    """Longitudes of every track brought within 180 degrees of the first finite position."""
    allv = np.concatenate([np.asarray(t.lon_deg, dtype=float) for t in tracks]) if tracks else np.zeros(0)
    fin = allv[np.isfinite(allv)]
    ref = float(fin[0]) if fin.size else 0.0
    return [((np.asarray(t.lon_deg, dtype=float) - ref + 180.0) % 360.0) - 180.0 + ref for t in tracks]


def _deg_label(v: float, pos: str, neg: str) -> str:
    w = ((v + 180.0) % 360.0) - 180.0 if pos == "E" else v
    return f"{abs(w):.6g}°{pos if w >= 0 else neg}"


class _Fit:
    """Degrees -> pixels for a bounding box fitted (aspect kept) into a pixel box."""

    def __init__(self, lon: np.ndarray, lat: np.ndarray, box: Tuple[float, float, float, float]) -> None:
        lo_x, hi_x, lo_y, hi_y = float(np.min(lon)), float(np.max(lon)), float(np.min(lat)), float(np.max(lat))
        self.k = math.cos(math.radians(0.5 * (lo_y + hi_y)))
        pad = max(hi_x - lo_x, hi_y - lo_y, 0.05) * 0.08 + 0.01
        lo_x, hi_x, lo_y, hi_y = lo_x - pad, hi_x + pad, lo_y - pad, hi_y + pad
        left, top, w, h = box
        self.scale = min(w / ((hi_x - lo_x) * self.k), h / (hi_y - lo_y))  # px per degree of arc
        self.cx, self.cy = 0.5 * (lo_x + hi_x), 0.5 * (lo_y + hi_y)
        self.mx, self.my = left + w / 2, top + h / 2
        self.box = box
        self.lon_range = (self.cx - w / 2 / self.scale / self.k, self.cx + w / 2 / self.scale / self.k)
        self.lat_range = (self.cy - h / 2 / self.scale, self.cy + h / 2 / self.scale)

    def x(self, lon: object) -> np.ndarray:
        return self.mx + (np.asarray(lon, dtype=float) - self.cx) * self.k * self.scale

    def y(self, lat: object) -> np.ndarray:
        return self.my - (np.asarray(lat, dtype=float) - self.cy) * self.scale


def _graticule(fit: _Fit) -> str:
    """Light meridians and parallels at round degrees, labelled at the frame's edges."""
    left, top, w, h = fit.box
    d, labels = [], []
    for v in nice_ticks(*fit.lon_range, n=4):
        x = float(fit.x(v))
        d.append(f"M{fmt_px(x)} {fmt_px(top)}V{fmt_px(top + h)}")
        labels.append(text(x + 2, top + h - 3, _deg_label(float(v), "E", "W"), size=9, colour=AXIS))
    for v in nice_ticks(*fit.lat_range, n=4):
        y = float(fit.y(v))
        d.append(f"M{fmt_px(left)} {fmt_px(y)}H{fmt_px(left + w)}")
        labels.append(text(left + 2, y - 2, _deg_label(float(v), "N", "S"), size=9, colour=AXIS))
    frame = (f'<rect x="{fmt_px(left)}" y="{fmt_px(top)}" width="{fmt_px(w)}" height="{fmt_px(h)}" fill="#fbfcfd" '
             f'stroke="{AXIS}" stroke-width="1"/>')
    return frame + f'<path d="{"".join(d)}" stroke="{GRID}" stroke-width="1" fill="none"/>' + "".join(labels)


def _keep(colours: Sequence[str], n: int, stride: int) -> np.ndarray:
    """Point indices kept on one track: every ``stride``-th, both ends and every colour change."""
    keep = np.zeros(n, dtype=bool)
    keep[::stride] = True
    keep[[0, n - 1]] = True
    starts, _ = runs(list(colours))
    keep[starts] = True
    return keep


def _track_paths(tracks: Sequence[Track], lons: Sequence[np.ndarray], fit: _Fit, order: Sequence[str]) -> str:
    """One path per colour holding every run of segments of that colour, drawn in ``order``
    (later on top; colours not in ``order`` last)."""
    total = sum(int(np.asarray(t.lat_deg).size) for t in tracks)
    stride = max(1, math.ceil(total / MAX_MAP_POINTS))
    by_colour: Dict[str, List[str]] = {}
    for t, lon in zip(tracks, lons):
        lat = np.asarray(t.lat_deg, dtype=float)
        if lat.size < 2:
            continue
        keep = _keep(t.seg_colours, lat.size, stride)
        xs, ys = fit.x(lon), fit.y(lat)
        for s, e in zip(*runs(list(t.seg_colours))):
            idx = np.flatnonzero(keep[s:e + 1]) + s
            pts = [(a, b) for a, b in zip(xs[idx], ys[idx]) if math.isfinite(a) and math.isfinite(b)]
            if len(pts) >= 2:
                by_colour.setdefault(t.seg_colours[s], []).append(
                    "M" + "L".join(f"{fmt_px(a)} {fmt_px(b)}" for a, b in pts))
    rank = {c: i for i, c in enumerate(order)}
    items = sorted(by_colour.items(), key=lambda cd: rank.get(cd[0], len(rank)))
    return "".join(f'<path d="{"".join(d)}" fill="none" stroke="{c}" stroke-width="4" stroke-linecap="round" '
                   f'stroke-linejoin="round"/>' for c, d in items)


def _casing(tracks: Sequence[Track], lons: Sequence[np.ndarray], fit: _Fit) -> str:
    """A thin dark line under the coloured route so light classes stay visible on white."""
    total = sum(int(np.asarray(t.lat_deg).size) for t in tracks)
    stride = max(1, math.ceil(total / MAX_MAP_POINTS))
    d = []
    for t, lon in zip(tracks, lons):
        lat = np.asarray(t.lat_deg, dtype=float)
        idx = np.flatnonzero(_keep(t.seg_colours, lat.size, stride)) if lat.size >= 2 else []
        pts = [(a, b) for a, b in zip(fit.x(lon[idx]), fit.y(lat[idx])) if math.isfinite(a) and math.isfinite(b)]
        if len(pts) >= 2:
            d.append("M" + "L".join(f"{fmt_px(a)} {fmt_px(b)}" for a, b in pts))
    return f'<path d="{"".join(d)}" fill="none" stroke="{INK}" stroke-width="6.5" stroke-linecap="round" ' \
           f'stroke-linejoin="round"/>' if d else ""


def _scale_bar(fit: _Fit) -> str:
    """A bar of a round number of NM (about a quarter of the map width) under the map."""
    left, top, w, h = fit.box
    quarter_nm = w / 4 / fit.scale * NM_PER_DEG
    mag = 10.0 ** math.floor(math.log10(quarter_nm))
    length_nm = max(m * mag for m in (1.0, 2.0, 5.0) if m * mag <= quarter_nm)
    px = length_nm / NM_PER_DEG * fit.scale
    y = top + h + 14
    return (f'<path d="M{fmt_px(left)} {fmt_px(y)}h{fmt_px(px / 2)}" stroke="{INK}" stroke-width="5"/>'
            f'<path d="M{fmt_px(left + px / 2)} {fmt_px(y)}h{fmt_px(px / 2)}" stroke="{INK}" stroke-width="1.5"/>'
            f'<path d="M{fmt_px(left)} {fmt_px(y - 5)}v10M{fmt_px(left + px)} {fmt_px(y - 5)}v10" stroke="{INK}" stroke-width="1"/>'
            + text(left + px + 6, y + 4, f"{length_nm:g} NM (at {fit.cy:.1f}° latitude)", size=10))


def _ends(tracks: Sequence[Track], lons: Sequence[np.ndarray], fit: _Fit) -> str:
    """'start' at the first finite position of the first track, 'end' at the last of the last."""
    out = []
    for t, lon, which in ((tracks[0], lons[0], "start"), (tracks[-1], lons[-1], "end")):
        lat = np.asarray(t.lat_deg, dtype=float)
        ok = np.flatnonzero(np.isfinite(lat) & np.isfinite(lon))
        if ok.size == 0:
            continue
        i = ok[0] if which == "start" else ok[-1]
        x, y = float(fit.x(lon[i])), float(fit.y(lat[i]))
        mark = (f'<circle cx="{fmt_px(x)}" cy="{fmt_px(y)}" r="5" fill="#ffffff" stroke="{INK}" stroke-width="2"/>'
                if which == "start" else
                f'<rect x="{fmt_px(x - 4.5)}" y="{fmt_px(y - 4.5)}" width="9" height="9" fill="{INK}"/>')
        out.append(mark + text(x + 8, y - 6, which, size=10, bold=True))
    return "".join(out)


def route_map(tracks: Sequence[Track], *, label: str = "Map of the route", order: Sequence[str] = (),
              width: float = 640.0, height: float = 360.0) -> str:
    """The map as one ``<svg>`` (module docstring); "" when no track has a finite position.
    Segment colours are drawn in ``order`` (the worst last, on top where tracks overlap)."""
    tracks = [t for t in tracks if np.asarray(t.lat_deg).size]
    lons = _unwrapped(tracks)
    lat_all = np.concatenate([np.asarray(t.lat_deg, dtype=float) for t in tracks]) if tracks else np.zeros(0)
    lon_all = np.concatenate(lons) if lons else np.zeros(0)
    ok = np.isfinite(lat_all) & np.isfinite(lon_all)
    if not ok.any():
        return ""
    fit = _Fit(lon_all[ok], lat_all[ok], (8.0, 8.0, width - 16.0, height - 40.0))
    body = [_graticule(fit), _casing(tracks, lons, fit), _track_paths(tracks, lons, fit, order), _ends(tracks, lons, fit),
            text(width - 14, 26, "N", anchor="middle", bold=True),
            f'<path d="M{fmt_px(width - 14)} 30l-5 12h10z" fill="{INK}"/>', _scale_bar(fit)]
    return svg_doc(width, height, label, body)
