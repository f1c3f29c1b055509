# SPDX-License-Identifier: GPL-2.0-or-later
"""The seasonal-climate report: one self-contained HTML page and a short text summary.

Built from the shared page parts of :mod:`.html` (escaping, no script, no external link, the
planning-aid caution heading and closing the page), in the order of the passage and sweep
reports: the verdict (best and worst month, the least acceptable stretch, the measure), a map of
the route coloured by its share of acceptable time, a month bar chart of the weather-window
probability (0 % months keep a thin bar, empty months say "no data"), a month x distance heat
map of the share of time within the worst acceptable class (at most :data:`MAX_MAP_COLUMNS`
distance bins, mean share per bin), then the tables; mean waits in days. Percentages use the
sequential share palette of :mod:`.palette`, never the comfort-class colours.
"""
from __future__ import annotations

import math
from typing import List, Sequence, Tuple

import numpy as np

from ..flags import CAUTION
from ..climate.monthly import ClimateResult
from .charts import month_bars, month_heat_map
from .html import bullets, esc, figure, legend, page, swatch, table, verdict_box, write_page
from .palette import NO_DATA_COLOUR, SHARE_BOUNDS, SHARE_PALETTE, share_bin
from .route_map import Track, route_map
from .wording import plain_text

__all__ = ["SHARE_PALETTE", "SHARE_BOUNDS", "NO_DATA_COLOUR", "share_bin", "render_climate_html",
           "write_climate_html", "climate_text_summary", "share_legend", "MAX_MAP_COLUMNS"]

MAX_MAP_COLUMNS: int = 240
"""Distance bins of the heat map at most (mean share of the samples in each bin)."""

MONTH_NAMES: Tuple[str, ...] = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")

READING_NOTES: Tuple[str, ...] = (
    "Time shares count every hindcast step of the month (all years pooled) at every route sample.",
    "A departure counts for the window probability when the whole passage, with the vessel moving "
    "along the route, stays within the acceptable class.",
    "Mean wait: from a start at any hindcast step of the month to the next such departure, in days.",
)


def _pct(v: float) -> str:
    return "–" if not math.isfinite(float(v)) else f"{100.0 * float(v):.0f} %"


def _days(hours: float) -> str:
    """A waiting time in days ('3.2 d'); '–' without a value."""
    return "–" if not math.isfinite(float(hours)) else f"{float(hours) / 24.0:.1f} d"


def _label(r: ClimateResult) -> str:
    from ..comfort.indices import COMFORT_CLASS_LABELS

    return COMFORT_CLASS_LABELS[r.max_class]


def _share_colour(v: float) -> str:
    b = share_bin(v)
    return SHARE_PALETTE[b] if b >= 0 else NO_DATA_COLOUR


def share_legend() -> str:
    """The complete legend of the share colours (five steps and no data)."""
    bounds = (0.0, *SHARE_BOUNDS, 1.0)
    items = [(swatch(c), f"{100 * lo:.0f}–{100 * hi:.0f} %") for c, lo, hi in zip(SHARE_PALETTE, bounds[:-1], bounds[1:])]
    return legend(items + [(swatch(NO_DATA_COLOUR), "no data")])


def _bin_mean(a: np.ndarray, max_n: int) -> Tuple[np.ndarray, np.ndarray]:
    """Columns of ``a`` (m, n) averaged (NaN ignored) into at most ``max_n`` bins; the bins'
    first column indices."""
    n = a.shape[1]
    starts = np.unique(np.linspace(0, n, min(n, max_n) + 1).astype(int)[:-1])
    fin = np.isfinite(a)
    total = np.add.reduceat(np.where(fin, a, 0.0), starts, axis=1)
    count = np.add.reduceat(fin.astype(float), starts, axis=1)
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.where(count > 0, total / np.maximum(count, 1.0), np.nan), starts


def _heat_map_svg(r: ClimateResult) -> str:
    """Month x distance heat map of the share of time within the acceptable class."""
    d = np.asarray(r.dist_nm, dtype=float)
    share, starts = _bin_mean(np.asarray(r.ok_share, dtype=float), MAX_MAP_COLUMNS)
    full = (np.concatenate([[d[0]], 0.5 * (d[:-1] + d[1:]), [d[-1]]]) if d.size > 1 else np.array([0.0, 1.0]))
    edges = np.append(full[starts], full[-1])
    colours = [[_share_colour(v) for v in row] for row in share]
    return month_heat_map(edges, [MONTH_NAMES[m - 1] for m in r.months], colours,
                          label=f"Share of time with comfort class {_label(r)} or better by month and distance")


def _bars_svg(r: ClimateResult) -> str:
    """Month bar chart of the weather-window probability (0 % shown, empty months marked)."""
    p = [100.0 * float(v) if math.isfinite(float(v)) else float("nan") for v in r.window_probability]
    return month_bars([MONTH_NAMES[m - 1] for m in r.months], p, [_share_colour(v) for v in r.window_probability],
                      label="Window probability per month", ytitle="departures within limits [%]")


def _map_svg(r: ClimateResult) -> str:
    """The route, each stretch coloured by its share of acceptable time over the months shown."""
    if r.n < 2:
        return ""
    seg = np.asarray(r.segment_ok_share(), dtype=float)
    fin = np.isfinite(seg)
    mean = np.where(fin.any(axis=0), np.where(fin, seg, 0.0).sum(axis=0) / np.maximum(fin.sum(axis=0), 1), np.nan)
    return route_map([Track(np.asarray(r.lon_deg, dtype=float), np.asarray(r.lat_deg, dtype=float),
                            tuple(_share_colour(v) for v in mean))],
                     label="Map of the route coloured by the share of acceptable time",
                     order=(NO_DATA_COLOUR, *SHARE_PALETTE))


def _verdict_html(r: ClimateResult) -> str:
    """Best and worst month for a departure, the least acceptable stretch, the measure."""
    from ..comfort.indices import COMFORT_CLASS_LABELS

    p = np.asarray(r.window_probability, dtype=float)
    limit = f"class {COMFORT_CLASS_LABELS[r.max_class]} or better"
    if not np.isfinite(p).any():
        return verdict_box(f"No month has a departure with the whole {r.passage_h:.0f} h passage inside the data.",
                           ["See the notes below."], within=False)
    best, worst = int(np.nanargmax(p)), int(np.nanargmin(p))
    head = (f"Best month: {MONTH_NAMES[r.months[best] - 1]}, {_pct(p[best])} of departures keep the whole "
            f"{r.passage_h:.0f} h passage within {limit}.")
    lines = [f"Worst month: {MONTH_NAMES[r.months[worst] - 1]}, {_pct(p[worst])} of departures"
             f" (mean wait for a window {_days(r.mean_wait_h[worst])}).",
             f"Mean wait for a window in {MONTH_NAMES[r.months[best] - 1]}: {_days(r.mean_wait_h[best])}."]
    ok = np.asarray(r.ok_share, dtype=float)
    if np.isfinite(ok).any():
        k, i = np.unravel_index(int(np.nanargmin(np.where(np.isfinite(ok), ok, np.inf))), ok.shape)
        lines.append(f"Least acceptable stretch: {r.dist_nm[i]:.0f} NM along the route in "
                     f"{MONTH_NAMES[r.months[k] - 1]}, within {limit} {_pct(ok[k, i])} of the time.")
    lines.append(f"Ruling measure: share of departures whose whole passage stays within {limit} "
                 "(window probability); shares of time per place below.")
    return verdict_box(head, lines, within=bool(p[best] >= 0.5))


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
             _pct(r.window_probability[k]), _days(r.mean_wait_h[k]), str(int(r.departures_known[k])),
             str(int(r.wait_censored[k])), str(int(r.departures_past_end[k])), str(int(r.missing_steps[k].sum()))]
            for k, m in enumerate(r.months)]
    return table(["month", f"time within class {_label(r)} or better", "seakeeping criteria exceeded",
                  "window probability", "mean wait for a window", "departures counted",
                  "starts without a window before the data end", "departures past the data end",
                  "missing (step x sample)"], rows)


def render_climate_html(r: ClimateResult, *, title: str = "Seasonal comfort climate", plots: bool = True,
                        sources: Sequence[str] = ()) -> str:
    """The report page as text (module docstring)."""
    from ..comfort.indices import COMFORT_CLASS_LABELS

    parts: List[str] = [_verdict_html(r)]
    if plots:
        parts += ["<h2>Route</h2>", figure(_map_svg(r), "The route, each stretch coloured by its share of time "
                                           f"within class {_label(r)} or better over the months shown.", share_legend()),
                  "<h2>Window probability per month</h2>",
                  figure(_bars_svg(r), f"Departures with the whole {r.passage_h:.0f} h passage within class "
                         f"{r.max_class} or better; a thin bar marks 0 %.", share_legend()),
                  "<h2>Share of acceptable time by month and place</h2>",
                  figure(_heat_map_svg(r), "Share of time within the acceptable class at each distance along "
                         "the route.", share_legend())]
    parts += ["<h2>Per month</h2>", _month_table(r), "<h2>Class shares on the whole route</h2>",
              table(["month"] + list(COMFORT_CLASS_LABELS),
                    [[MONTH_NAMES[m - 1]] + [_pct(v) for v in r.route_class_share[k]] for k, m in enumerate(r.months)]),
              "<h2>Run</h2>", _run_table(r)]
    if sources:
        parts.append("<p>Hindcast files: " + ", ".join(esc(s) for s in sources) + "</p>")
    parts.append("<h2>How to read this</h2>" + bullets(READING_NOTES))
    if r.notes:
        parts.append("<h2>Notes</h2>" + bullets(plain_text(n) for n in r.notes))
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
                     f"{_days(r.mean_wait_h[k]):>9}")
    lines.append(CAUTION)
    return "\n".join(lines)
