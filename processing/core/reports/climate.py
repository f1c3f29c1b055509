# SPDX-License-Identifier: GPL-2.0-or-later
"""The seasonal-climate report: one self-contained HTML page and a short text summary.

Built from the shared page parts of :mod:`.html` (escaping, no script, no external link, the
planning-aid caution heading and closing the page). With matplotlib it holds a month x distance
heat map of the share of time within the worst acceptable class and a month bar chart of the
weather-window probability, embedded as base64 PNG; without matplotlib the same numbers are
given as tables. The share palette lives in :mod:`.palette`.
"""
from __future__ import annotations

import math
from typing import List, Optional, Sequence, Tuple

import numpy as np

from ..flags import CAUTION
from ..climate.monthly import ClimateResult
from .html import bullets, esc, figure_png, new_figure, page, png_img, table, write_page
from .palette import NO_DATA_COLOUR, SHARE_BOUNDS, SHARE_PALETTE, share_bin

__all__ = ["SHARE_PALETTE", "SHARE_BOUNDS", "NO_DATA_COLOUR", "share_bin", "render_climate_html",
           "write_climate_html", "climate_text_summary"]

MONTH_NAMES: Tuple[str, ...] = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")

READING_NOTES: Tuple[str, ...] = (
    "Time shares count every hindcast step of the month (all years pooled) at every route sample.",
    "A departure counts for the window probability when the whole passage, with the vessel moving "
    "along the route, stays within the acceptable class.",
    "Mean wait: from a start at any hindcast step of the month to the next such departure.",
)


def _pct(v: float) -> str:
    return "–" if not math.isfinite(float(v)) else f"{100.0 * float(v):.0f} %"


def _h(v: float) -> str:
    return "–" if not math.isfinite(float(v)) else f"{float(v):.0f} h"


def _heat_map_png(r: ClimateResult) -> Optional[bytes]:
    """Month x distance heat map of the share of time within the acceptable class."""
    fig = new_figure(8.0, 0.35 * len(r.months) + 1.6, dpi=96)
    if fig is None:
        return None
    from matplotlib.colors import BoundaryNorm, ListedColormap

    ax = fig.add_subplot(1, 1, 1)
    cmap = ListedColormap(list(SHARE_PALETTE))
    cmap.set_bad(NO_DATA_COLOUR)
    norm = BoundaryNorm([0.0, *SHARE_BOUNDS, 1.0000001], cmap.N)
    d = r.dist_nm
    edges = np.concatenate([[d[0]], 0.5 * (d[:-1] + d[1:]), [d[-1]]]) if d.size > 1 else np.array([0.0, 1.0])
    data = np.ma.masked_invalid(r.ok_share)
    mesh = ax.pcolormesh(edges, np.arange(len(r.months) + 1), data, cmap=cmap, norm=norm, shading="flat")
    ax.set_yticks(np.arange(len(r.months)) + 0.5)
    ax.set_yticklabels([MONTH_NAMES[m - 1] for m in r.months])
    ax.invert_yaxis()
    ax.set_xlabel("distance along the route [NM]")
    ax.set_title(f"Share of time with comfort class <= {r.max_class}")
    cb = fig.colorbar(mesh, ax=ax, ticks=[0.0, *SHARE_BOUNDS, 1.0])
    cb.ax.set_yticklabels(["0", "20 %", "40 %", "60 %", "80 %", "100 %"])
    return figure_png(fig)


def _window_bars_png(r: ClimateResult) -> Optional[bytes]:
    """Month bar chart of the weather-window probability."""
    fig = new_figure(8.0, 3.0, dpi=96)
    if fig is None:
        return None
    ax = fig.add_subplot(1, 1, 1)
    p = np.nan_to_num(np.asarray(r.window_probability, dtype=float), nan=0.0)
    cols = [SHARE_PALETTE[max(share_bin(v), 0)] if math.isfinite(v) else NO_DATA_COLOUR for v in r.window_probability]
    ax.bar([MONTH_NAMES[m - 1] for m in r.months], 100.0 * p, color=cols, edgecolor="#333333", linewidth=0.6)
    ax.set_ylim(0, 100)
    ax.set_ylabel("window probability [%]")
    ax.set_title(f"Departures with the whole {r.passage_h:.0f} h passage within class <= {r.max_class}")
    return figure_png(fig)


def _thin(n: int, k: int = 12) -> List[int]:
    if n <= k:
        return list(range(n))
    return sorted(set(int(round(x)) for x in np.linspace(0, n - 1, k)))


def _run_table(r: ClimateResult) -> str:
    from ..comfort.indices import COMFORT_CLASS_LABELS

    return table(["item", "value"], [
        ["vessel", r.vessel_name], ["station", f"{r.station_name} ({r.task})"],
        ["speed", f"{r.speed_kn:g} kn"], ["route length", f"{r.dist_nm[-1]:.1f} NM ({r.n} samples)"],
        ["passage", f"{r.passage_h:.1f} h"],
        ["worst acceptable class", f"{r.max_class} ({COMFORT_CLASS_LABELS[r.max_class]})"],
        ["hindcast", f"{r.first_utc}Z to {r.last_utc}Z, step {r.step_h:g} h, {r.n_years} year(s)"],
        ["computed on", r.backend or "-"],
    ])


def _month_table(r: ClimateResult) -> str:
    rows = [[MONTH_NAMES[m - 1], _pct(r.route_ok_share[k]), _pct(r.route_exceed_share[k]),
             _pct(r.window_probability[k]), _h(r.mean_wait_h[k]), str(int(r.departures_known[k])),
             str(int(r.wait_censored[k])), str(int(r.missing_steps[k].sum()))] for k, m in enumerate(r.months)]
    return table(["month", f"time within class <= {r.max_class}", "criteria exceeded", "window probability",
                  "mean wait", "departures counted", "starts without window", "missing (step x sample)"], rows)


def _share_figures(r: ClimateResult, plots: bool) -> List[str]:
    """The two figures, or without matplotlib the share along the route as a table."""
    if plots:
        imgs = (_heat_map_png(r), _window_bars_png(r))
        if all(i is not None for i in imgs):
            return [png_img(i, alt) for i, alt in zip(imgs, ("month x distance heat map of acceptable time",
                                                             "window probability per month"))]
    idx = _thin(r.n)
    hdr = ["month"] + [f"{r.dist_nm[i]:.0f} NM" for i in idx]
    return ["<h2>Share of time within the acceptable class along the route</h2>",
            table(hdr, [[MONTH_NAMES[m - 1]] + [_pct(r.ok_share[k, i]) for i in idx] for k, m in enumerate(r.months)])]


def render_climate_html(r: ClimateResult, *, title: str = "Seasonal comfort climate", plots: bool = True,
                        sources: Sequence[str] = ()) -> str:
    """The report page as text (module docstring)."""
    from ..comfort.indices import COMFORT_CLASS_LABELS

    parts: List[str] = ["<h2>Run</h2>", _run_table(r)]
    if sources:
        parts.append("<p>Hindcast files: " + ", ".join(esc(s) for s in sources) + "</p>")
    parts += ["<h2>Per month</h2>", _month_table(r), *_share_figures(r, plots)]
    parts.append("<h2>Class shares on the whole route</h2>")
    parts.append(table(["month"] + list(COMFORT_CLASS_LABELS),
                       [[MONTH_NAMES[m - 1]] + [_pct(v) for v in r.route_class_share[k]] for k, m in enumerate(r.months)]))
    parts.append("<h2>How to read this</h2>" + bullets(READING_NOTES))
    if r.notes:
        parts.append("<h2>Notes</h2>" + bullets(r.notes))
    return page(title, parts, CAUTION)


def write_climate_html(path: str, r: ClimateResult, **kwargs: object) -> str:
    """Write :func:`render_climate_html` to ``path`` (UTF-8); returns the path."""
    return write_page(path, render_climate_html(r, **kwargs))  # type: ignore[arg-type]


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
