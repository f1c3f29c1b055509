# SPDX-License-Identifier: GPL-2.0-or-later
"""The seasonal-climate report: one self-contained HTML page and a short text summary.

All text from outside (file names, vessel and station names, notes) is escaped with
:func:`html.escape`; the page has no script and no external link. With matplotlib (a bare
``Figure``, rendered by Agg; pyplot and the host's backend are never touched) it holds a month x distance heat map of the share of time within the worst acceptable
class and a month bar chart of the weather-window probability, embedded as base64 PNG; without
matplotlib the same numbers are given as tables. The planning-aid caution
(:data:`..flags.CAUTION`) heads and closes the page.

Palette (our own): five steps of "share of time within the acceptable class", dark plum for
rarely acceptable to pale mint for nearly always acceptable, ordered by lightness so that it
reads in grey-scale print; neutral grey for no data.
"""
from __future__ import annotations

import base64
import html
import io
import math
from typing import List, Optional, Sequence, Tuple

import numpy as np

from ..flags import CAUTION
from ..climate.monthly import ClimateResult

__all__ = ["SHARE_PALETTE", "SHARE_BOUNDS", "NO_DATA_COLOUR", "share_bin", "render_climate_html",
           "write_climate_html", "climate_text_summary"]

SHARE_PALETTE: Tuple[str, ...] = ("#4a1f3d", "#9c4a3c", "#d49a3f", "#86bfae", "#e4f3ef")
"""Fill colours for shares of acceptable time in [0, .2), [.2, .4), [.4, .6), [.6, .8), [.8, 1]."""
SHARE_BOUNDS: Tuple[float, ...] = (0.2, 0.4, 0.6, 0.8)
"""Upper bounds of the first four palette steps (share 0..1)."""
NO_DATA_COLOUR: str = "#9a9a9a"

MONTH_NAMES: Tuple[str, ...] = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")


def share_bin(share: float) -> int:
    """Palette step 0..4 of a share 0..1 (-1 for NaN)."""
    if share is None or not math.isfinite(float(share)):
        return -1
    return int(np.searchsorted(np.asarray(SHARE_BOUNDS), float(share), side="right"))


def _e(v: object) -> str:
    return html.escape(str(v), quote=True)


def _pct(v: float) -> str:
    return "–" if not math.isfinite(float(v)) else f"{100.0 * float(v):.0f} %"


def _h(v: float) -> str:
    return "–" if not math.isfinite(float(v)) else f"{float(v):.0f} h"


def _plots_png(r: ClimateResult) -> Optional[Tuple[bytes, bytes]]:
    try:
        from matplotlib.colors import BoundaryNorm, ListedColormap
        from matplotlib.figure import Figure
    except Exception:
        return None
    labels = [MONTH_NAMES[m - 1] for m in r.months]
    fig = Figure(figsize=(8.0, 0.35 * len(r.months) + 1.6), dpi=96)
    ax = fig.add_subplot(1, 1, 1)
    cmap = ListedColormap(list(SHARE_PALETTE))
    cmap.set_bad(NO_DATA_COLOUR)
    norm = BoundaryNorm([0.0, *SHARE_BOUNDS, 1.0000001], cmap.N)
    d = r.dist_nm
    edges = np.concatenate([[d[0]], 0.5 * (d[:-1] + d[1:]), [d[-1]]]) if d.size > 1 else np.array([0.0, 1.0])
    data = np.ma.masked_invalid(r.ok_share)
    mesh = ax.pcolormesh(edges, np.arange(len(r.months) + 1), data, cmap=cmap, norm=norm, shading="flat")
    ax.set_yticks(np.arange(len(r.months)) + 0.5)
    ax.set_yticklabels(labels)
    ax.invert_yaxis()
    ax.set_xlabel("distance along the route [NM]")
    ax.set_title(f"Share of time with comfort class <= {r.max_class}")
    cb = fig.colorbar(mesh, ax=ax, ticks=[0.0, *SHARE_BOUNDS, 1.0])
    cb.ax.set_yticklabels(["0", "20 %", "40 %", "60 %", "80 %", "100 %"])
    fig.tight_layout()
    b1 = io.BytesIO()
    fig.savefig(b1, format="png")
    fig2 = Figure(figsize=(8.0, 3.0), dpi=96)
    ax2 = fig2.add_subplot(1, 1, 1)
    p = np.nan_to_num(np.asarray(r.window_probability, dtype=float), nan=0.0)
    cols = [SHARE_PALETTE[max(share_bin(v), 0)] if math.isfinite(v) else NO_DATA_COLOUR for v in r.window_probability]
    ax2.bar(labels, 100.0 * p, color=cols, edgecolor="#333333", linewidth=0.6)
    ax2.set_ylim(0, 100)
    ax2.set_ylabel("window probability [%]")
    ax2.set_title(f"Departures with the whole {r.passage_h:.0f} h passage within class <= {r.max_class}")
    fig2.tight_layout()
    b2 = io.BytesIO()
    fig2.savefig(b2, format="png")
    return b1.getvalue(), b2.getvalue()


def _table(headers: Sequence[str], rows: Sequence[Sequence[str]]) -> str:
    head = "".join(f"<th>{_e(h)}</th>" for h in headers)
    body = "".join("<tr>" + "".join(f"<td>{_e(c)}</td>" for c in row) + "</tr>" for row in rows)
    return f"<table><thead><tr>{head}</tr></thead><tbody>{body}</tbody></table>"


def _thin(n: int, k: int = 12) -> List[int]:
    if n <= k:
        return list(range(n))
    return sorted(set(int(round(x)) for x in np.linspace(0, n - 1, k)))


def render_climate_html(r: ClimateResult, *, title: str = "Seasonal comfort climate", plots: bool = True,
                        sources: Sequence[str] = ()) -> str:
    """The report page as text (module docstring)."""
    from ..comfort.indices import COMFORT_CLASS_LABELS

    png = _plots_png(r) if plots else None
    parts: List[str] = [
        "<!DOCTYPE html><html><head><meta charset='utf-8'>",
        f"<title>{_e(title)}</title>",
        "<style>body{font-family:sans-serif;max-width:60em;margin:1em auto;color:#222}"
        "table{border-collapse:collapse;margin:.5em 0}td,th{border:1px solid #bbb;padding:2px 6px;"
        "text-align:right}th{background:#eee}.caution{border:2px solid #9c4a3c;padding:.5em;"
        "background:#fbf3ee}</style></head><body>",
        f"<h1>{_e(title)}</h1>",
        f"<p class='caution'><strong>{_e(CAUTION)}</strong></p>",
        "<h2>Run</h2>",
        _table(["item", "value"], [
            ["vessel", r.vessel_name], ["station", f"{r.station_name} ({r.task})"],
            ["speed", f"{r.speed_kn:g} kn"], ["route length", f"{r.dist_nm[-1]:.1f} NM ({r.n} samples)"],
            ["passage", f"{r.passage_h:.1f} h"],
            ["worst acceptable class", f"{r.max_class} ({COMFORT_CLASS_LABELS[r.max_class]})"],
            ["hindcast", f"{r.first_utc}Z to {r.last_utc}Z, step {r.step_h:g} h, {r.n_years} year(s)"],
            ["computed on", r.backend or "-"],
        ]),
    ]
    if sources:
        parts.append("<p>Hindcast files: " + ", ".join(_e(s) for s in sources) + "</p>")
    parts.append("<h2>Per month</h2>")
    rows = []
    for k, m in enumerate(r.months):
        rows.append([MONTH_NAMES[m - 1], _pct(r.route_ok_share[k]), _pct(r.route_exceed_share[k]),
                     _pct(r.window_probability[k]), _h(r.mean_wait_h[k]), str(int(r.departures_known[k])),
                     str(int(r.wait_censored[k])), str(int(r.missing_steps[k].sum()))])
    parts.append(_table(["month", f"time within class <= {r.max_class}", "criteria exceeded",
                         "window probability", "mean wait", "departures counted", "starts without window",
                         "missing (step x sample)"], rows))
    if png is not None:
        for img, alt in zip(png, ("month x distance heat map of acceptable time", "window probability per month")):
            parts.append(f"<p><img alt='{_e(alt)}' src='data:image/png;base64,{base64.b64encode(img).decode('ascii')}'></p>")
    else:
        idx = _thin(r.n)
        parts.append("<h2>Share of time within the acceptable class along the route</h2>")
        hdr = ["month"] + [f"{r.dist_nm[i]:.0f} NM" for i in idx]
        parts.append(_table(hdr, [[MONTH_NAMES[m - 1]] + [_pct(r.ok_share[k, i]) for i in idx]
                                  for k, m in enumerate(r.months)]))
    parts.append("<h2>Class shares on the whole route</h2>")
    parts.append(_table(["month"] + list(COMFORT_CLASS_LABELS),
                        [[MONTH_NAMES[m - 1]] + [_pct(v) for v in r.route_class_share[k]] for k, m in enumerate(r.months)]))
    parts.append("<h2>How to read this</h2><ul>"
                 "<li>Time shares count every hindcast step of the month (all years pooled) at every route sample.</li>"
                 "<li>A departure counts for the window probability when the whole passage, with the vessel moving "
                 "along the route, stays within the acceptable class.</li>"
                 "<li>Mean wait: from a start at any hindcast step of the month to the next such departure.</li>"
                 "</ul>")
    if r.notes:
        parts.append("<h2>Notes</h2><ul>" + "".join(f"<li>{_e(n)}</li>" for n in r.notes) + "</ul>")
    parts.append(f"<p class='caution'>{_e(CAUTION)}</p></body></html>")
    return "\n".join(parts)


def write_climate_html(path: str, r: ClimateResult, **kwargs: object) -> str:
    """Write :func:`render_climate_html` to ``path`` (UTF-8); returns the path."""
    text = render_climate_html(r, **kwargs)  # type: ignore[arg-type]
    with open(path, "w", encoding="utf-8") as fh:
        fh.write(text)
    return path


def climate_text_summary(r: ClimateResult) -> str:
    """A few lines for logs and the command line."""
    lines = [f"{r.vessel_name} at {r.speed_kn:g} kn, station {r.station_name}, passage {r.passage_h:.1f} h, "
             f"class <= {r.max_class}, hindcast {r.first_utc}Z..{r.last_utc}Z ({r.n_years} year(s))"]
    lines.append("month  ok-time  window  mean-wait")
    for k, m in enumerate(r.months):
        lines.append(f"{MONTH_NAMES[m - 1]:<5}  {_pct(r.route_ok_share[k]):>7}  {_pct(r.window_probability[k]):>6}  "
                     f"{_h(r.mean_wait_h[k]):>9}")
    lines.append(CAUTION)
    return "\n".join(lines)
