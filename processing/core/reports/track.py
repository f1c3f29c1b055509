# SPDX-License-Identifier: GPL-2.0-or-later
"""The report page of a track search: a map of the alternatives coloured by comfort class, the
time-vs-exposure front, and a table of the alternatives' figures.

Built from the one HTML toolkit (:mod:`.html`) and palette (:mod:`.palette`); the two plots
are inline SVG drawn here (no plotting library, no script, no external resource). The map uses
an equirectangular projection scaled by cos(mean latitude) (common practice, no source): a
sketch, not a chart. Every page carries the caution that a track is a planning aid, not a
passage plan: charts, notices to mariners and local rules decide.
"""
from __future__ import annotations

import math
from typing import List, Sequence, Tuple

import numpy as np

from ..comfort.indices import COMFORT_CLASS_LABELS
from ..routing.engine import TrackPlan, track_fields
from .html import bullets, esc, fmt_num, fmt_time_utc, page, swatch, table
from .palette import COMFORT_PALETTE, NOT_COMPUTED_COLOUR, comfort_colour

__all__ = ["TRACK_CAUTION", "track_report_html", "map_svg", "front_svg"]

TRACK_CAUTION = (
    "A suggested track is a planning aid, not a passage plan: check it against official charts, "
    "notices to mariners, traffic separation schemes and local rules, which decide. Not a substitute "
    "for the master's judgement or official forecasts and warnings."
)
_DASH = {"reference": "6,4", "fastest": "", "balanced": "2,3", "gentlest": ""}
_W, _H, _PAD = 640.0, 420.0, 30.0


def _frame(x: np.ndarray, y: np.ndarray, equal: bool) -> Tuple[float, float, float, float, float]:
    """(x0, y0, sx, sy, h) mapping data to pixels inside the padded box."""
    x0, x1, y0, y1 = float(np.nanmin(x)), float(np.nanmax(x)), float(np.nanmin(y)), float(np.nanmax(y))
    dx, dy = max(x1 - x0, 1e-9), max(y1 - y0, 1e-9)
    sx, sy = (_W - 2 * _PAD) / dx, (_H - 2 * _PAD) / dy
    if equal:
        sx = sy = min(sx, sy)
    return x0, y0, sx, sy, _H


def _svg(body: Sequence[str], title: str) -> str:
    return (f'<svg xmlns="http://www.w3.org/2000/svg" width="{_W:.0f}" height="{_H:.0f}" '
            f'viewBox="0 0 {_W:.0f} {_H:.0f}" role="img" aria-label="{esc(title)}">'
            f'<rect width="100%" height="100%" fill="#ffffff" stroke="#bbb"/>' + "".join(body) + "</svg>")


def map_svg(plan: TrackPlan) -> str:
    """Every alternative's samples as segments coloured by comfort class, with start and end."""
    alts = plan.alternatives
    k = math.cos(math.radians(float(np.mean(np.concatenate([a.result.lat_deg for a in alts])))))
    xs = np.concatenate([a.result.lon_deg * k for a in alts])
    ys = np.concatenate([a.result.lat_deg for a in alts])
    x0, y0, sx, sy, h = _frame(xs, ys, equal=True)

    def px(lon: np.ndarray, lat: np.ndarray) -> Tuple[np.ndarray, np.ndarray]:
        return _PAD + (lon * k - x0) * sx, h - _PAD - (lat - y0) * sy

    body: List[str] = []
    for a in alts:
        x, y = px(a.result.lon_deg, a.result.lat_deg)
        dash = f' stroke-dasharray="{_DASH.get(a.name, "")}"' if _DASH.get(a.name) else ""
        for i in range(x.size - 1):
            body.append(f'<line x1="{x[i]:.1f}" y1="{y[i]:.1f}" x2="{x[i + 1]:.1f}" y2="{y[i + 1]:.1f}" '
                        f'stroke="{comfort_colour(int(a.result.comfort_class[i]))}" stroke-width="4"{dash}/>')
        j = x.size // 2
        body.append(f'<text x="{x[j]:.1f}" y="{y[j] - 7:.1f}" font-size="11" fill="#222">{esc(a.name)}</text>')
    x, y = px(alts[0].result.lon_deg[[0, -1]], alts[0].result.lat_deg[[0, -1]])
    for xi, yi, lab in zip(x, y, ("start", "end")):
        body.append(f'<circle cx="{xi:.1f}" cy="{yi:.1f}" r="4" fill="#222"/>'
                    f'<text x="{xi + 6:.1f}" y="{yi + 4:.1f}" font-size="11">{lab}</text>')
    return _svg(body, "map of the alternatives")


def front_svg(plan: TrackPlan) -> str:
    """The searched front (hours vs MSDV at arrival) and the alternatives as evaluated."""
    pts = [(track_fields(a)["hours"], a.result.summary().final_msdv, a.name) for a in plan.alternatives]
    hx = np.r_[plan.front_hours, [p[0] for p in pts]]
    my = np.r_[plan.front_msdv, [p[1] for p in pts]]
    ok = np.isfinite(hx) & np.isfinite(my)
    x0, y0, sx, sy, h = _frame(hx[ok], my[ok], equal=False)
    body = [f'<text x="{_W / 2:.0f}" y="{_H - 6:.0f}" font-size="11" text-anchor="middle">passage time [h]</text>',
            f'<text x="10" y="{_PAD - 10:.0f}" font-size="11">MSDV at arrival [m/s^1.5]</text>']
    order = np.argsort(plan.front_hours)
    line = " ".join(f"{_PAD + (plan.front_hours[i] - x0) * sx:.1f},{h - _PAD - (plan.front_msdv[i] - y0) * sy:.1f}"
                    for i in order if np.isfinite(plan.front_msdv[i]))
    body.append(f'<polyline points="{line}" fill="none" stroke="#2b5d7c" stroke-width="1.5"/>')
    for hrs, msdv, name in pts:
        if np.isfinite(hrs) and np.isfinite(msdv):
            x, y = _PAD + (hrs - x0) * sx, h - _PAD - (msdv - y0) * sy
            body.append(f'<circle cx="{x:.1f}" cy="{y:.1f}" r="5" fill="#c4572a"/>'
                        f'<text x="{x + 7:.1f}" y="{y - 5:.1f}" font-size="11">{esc(name)}</text>')
    body.append(f'<text x="{_W - _PAD:.0f}" y="{_PAD:.0f}" font-size="10" text-anchor="end">line: front as searched; '
                "dots: tracks as evaluated</text>")
    return _svg(body, "time versus exposure front")


def _rows(plan: TrackPlan) -> List[List[str]]:
    rows = []
    for a in plan.alternatives:
        f = track_fields(a)
        wc = int(f["worst_class"])
        label = COMFORT_CLASS_LABELS[wc] if wc >= 0 else "not computed"
        rows.append([str(f["alternative"]), fmt_num(f["dist_nm"], 1), fmt_num(f["hours"], 2), fmt_time_utc(f["eta_utc"]),
                     f"{swatch(comfort_colour(wc))} {esc(label)}", fmt_num(f["msi_max_pct"], 1),
                     fmt_num(f["hours_taxing"], 2), fmt_num(f["sick_pct_passage"], 1), str(f["flags"]) or "-"])
    return rows


def track_report_html(plan: TrackPlan, inputs: Sequence[Tuple[str, str]]) -> str:
    """The whole page: inputs, map, front, table, method notes; ``inputs`` (label, value) pairs."""
    legend = " ".join(f"{swatch(c)} {esc(lab)}" for c, lab in zip(COMFORT_PALETTE, COMFORT_CLASS_LABELS))
    legend += f" {swatch(NOT_COMPUTED_COLOUR)} not computed"
    stats = plan.stats
    body = [
        "<h2>Inputs</h2>", table(("Input", "Value"), inputs),
        "<h2>Alternatives</h2>",
        table(("Track", "Distance NM", "Hours", "Arrival", "Worst class", "Max MSI %", "Hours taxing or worse",
               "May vomit % at arrival", "Flags"), _rows(plan), raw_cols=(4,)),
        "<h2>Map</h2>", f"<p>{legend}</p>", map_svg(plan),
        "<h2>Time versus exposure</h2>", front_svg(plan),
        "<h2>Method</h2>",
        bullets([
            "Time-dependent bi-criteria label-setting on a lattice of lateral offsets around the reference "
            f"({stats.get('nodes', 0):.0f} nodes, {stats.get('legal_edges', 0):.0f} of {stats.get('edges', 0):.0f} legs "
            f"legal, stages {stats.get('stage_nm', 0):.1f} NM, offsets {stats.get('lateral_nm', 0):.1f} NM); "
            "each leg's dose is taken from the sea at the hour the vessel gets there.",
            "Exposure: motion sickness dose value at arrival (ISO 2631-1:1997 Annex D). Fastest: least time; "
            "gentlest: least dose; balanced: the knee of the front (Das 1999).",
            "Smoothing: shortcuts that stay legal and add no dose; consecutive legs differ by at least 5 deg, "
            "legs at least 2 NM.",
            "Every track is evaluated by the same passage engine as a route assessment.",
        ]),
        bullets(plan.notes) if plan.notes else "",
    ]
    return page("Seaway Comfort: which way to go", body, TRACK_CAUTION + " " + plan.caution)
