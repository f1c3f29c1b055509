# SPDX-License-Identifier: GPL-2.0-or-later
"""The departure-sweep report: one self-contained HTML page from a :class:`.sweep.SweepResult`.

Built from the shared page parts of :mod:`.html` (escaping, no script, no external link, the
planning-aid caution heading and closing the page, plots only when matplotlib imports, every
table without it); colours from :mod:`.palette` (also used by the QGIS styling).

Content: the recommendation in words; a heat map of departure time (vertical) x distance along
the route (horizontal) coloured by the worst comfort class over the sources; the criterion per
departure with one line per source and the spread between sources shaded; the ranked table.
"""
from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass, field
from typing import List, Optional, Sequence, Tuple

import numpy as np

from ..flags import CAUTION, flag_counts
from .html import bullets, esc, figure_png, flag_table, fmt_num, new_figure, page, png_img, swatch, table, write_page
from .html import fmt_time_utc as _time
from .palette import COMFORT_PALETTE, NOT_COMPUTED_COLOUR
from .passage import METHOD_NOTES, ReportInputs
from ..sweep.engine import CRITERION_LABELS, CRITERION_UNITS, ROBUST_SOURCE, SweepResult, SweepRow

__all__ = [
    "SweepReport",
    "build_sweep_report",
    "render_sweep_html",
    "write_sweep_html",
    "sweep_text_summary",
    "MAX_TABLE_ROWS",
]

MAX_TABLE_ROWS: int = 300
"""Rows of the full table in the page (the best-ranked first; every row is in the table layer)."""

TOP_ROWS: int = 10

SWEEP_METHOD_NOTES: Tuple[str, ...] = (
    "Each departure is the same route at the same speed shifted in time; the sea state is read "
    "for every sample at the time the vessel gets there, from each forecast source separately.",
    "Hours in a class: each sample stands for half the interval to each neighbour. Dose at "
    "arrival: ISO 2631-1:1997 Annex D, trapezoid rule on the squared Wf-weighted acceleration.",
    "Worst case over sources: per sample the worst comfort class, per departure the highest MSI, "
    "dose and criterion; the spread is the largest minus the smallest value over the sources.",
)


def _num(value: float, digits: int = 1) -> str:
    return fmt_num(float(value), digits)


@dataclass(frozen=True)
class SweepReport:
    """What the page shows: the result, the provenance inputs, warnings and the caution."""

    title: str
    inputs: ReportInputs
    result: SweepResult
    warnings: Tuple[str, ...] = ()
    caution: str = field(default=CAUTION)


def build_sweep_report(result: SweepResult, inputs: ReportInputs, *, title: str = "Seaway Comfort departure sweep",
                       warnings: Sequence[str] = ()) -> SweepReport:
    """Collect the report data; the creation time is filled in when ``inputs`` has none."""
    if not inputs.created_utc:
        now = _dt.datetime.now(_dt.timezone.utc).strftime("%Y-%m-%d %H:%M UTC")
        inputs = ReportInputs(**{**inputs.__dict__, "created_utc": now})
    return SweepReport(title=str(title), inputs=inputs, result=result, warnings=tuple(str(w) for w in warnings))


# ---------------------------------------------------------------------------------------------
# plots
# ---------------------------------------------------------------------------------------------


def heat_map_png(result: SweepResult) -> Optional[bytes]:
    """Departure (vertical) x distance (horizontal) coloured by the worst class over sources."""
    fig = new_figure(8.0, 2.2 + 2.6 * len(result.speeds_kn))
    if fig is None:
        return None
    from matplotlib.colors import BoundaryNorm, ListedColormap
    from matplotlib.patches import Patch

    from ..comfort.indices import COMFORT_CLASS_LABELS

    cmap = ListedColormap([NOT_COMPUTED_COLOUR, *COMFORT_PALETTE])
    norm = BoundaryNorm(np.arange(-1.5, 5.0, 1.0), cmap.N)
    deps_h = (result.departures_utc - result.departures_utc[0]).astype("timedelta64[ms]").astype(float) / 3.6e6
    dist = result.dist_nm
    axes = fig.subplots(len(result.speeds_kn), 1, squeeze=False)[:, 0]
    half_d = 0.5 * (deps_h[1] - deps_h[0]) if deps_h.size > 1 else 0.5
    half_x = 0.5 * (dist[1] - dist[0]) if dist.size > 1 else 0.5
    for s, ax in enumerate(axes):
        ax.imshow(result.robust_class[s].astype(float), cmap=cmap, norm=norm, aspect="auto", origin="lower",
                  interpolation="nearest",
                  extent=(dist[0] - half_x, dist[-1] + half_x, deps_h[0] - half_d, deps_h[-1] + half_d))
        ax.set_ylabel(f"hours after\n{_time(result.departures_utc[0])[:16]}", fontsize=7)
        ax.set_title(f"Worst comfort class over the sources at {result.speeds_kn[s]:g} kn", fontsize=9)
        rec = result.recommendation
        if rec.speed_kn == result.speeds_kn[s]:
            y = float((rec.depart_utc - result.departures_utc[0]).astype("timedelta64[ms]").astype(float) / 3.6e6)
            ax.axhline(y, color="#2b5d7c", linewidth=1.2, linestyle="--")
    axes[-1].set_xlabel("distance along the route [NM]")
    handles = [Patch(facecolor=COMFORT_PALETTE[c], edgecolor="#555", label=lab) for c, lab in enumerate(COMFORT_CLASS_LABELS)]
    handles.append(Patch(facecolor=NOT_COMPUTED_COLOUR, edgecolor="#555", label="not computed"))
    # outside the map so it never hides departures (the top rows are often the ones past the horizon)
    axes[0].legend(handles=handles, fontsize=6, loc="upper left", bbox_to_anchor=(1.01, 1.0))
    return figure_png(fig)


def criterion_plot_png(result: SweepResult) -> Optional[bytes]:
    """The criterion per departure: one line per source (and speed), the spread shaded."""
    fig = new_figure(8.0, 3.4)
    if fig is None:
        return None
    ax = fig.subplots()
    deps_h = (result.departures_utc - result.departures_utc[0]).astype("timedelta64[ms]").astype(float) / 3.6e6
    crit = result.criterion
    unit = CRITERION_UNITS[crit]
    if crit == "earliest_ok":
        values = result.hours_above  # no value for unacceptable departures: show what fails them
        ylabel = "hours above the acceptable class [h]"
    else:
        values = result.criterion_value
        ylabel = {"worst_msi": "worst MSI on the passage", "hours_above": "hours above the acceptable class",
                  "dose": "MSDV at arrival", "lowest_prob_taxing": "P(taxing or worse)"}[crit] + f" [{unit}]"
    styles = ["-", "--", ":", "-."]
    for s, v in enumerate(result.speeds_kn):
        lo = np.where(np.isfinite(values[s]), values[s], np.nan)
        with np.errstate(all="ignore"):
            mn, mx = np.nanmin(lo, axis=0), np.nanmax(lo, axis=0)
        if len(result.source_names) > 1:
            ax.fill_between(deps_h, mn, mx, color="#9fd1cf", alpha=0.45, linewidth=0)
        for k, name in enumerate(result.source_names):
            label = name if len(result.speeds_kn) == 1 else f"{name}, {v:g} kn"
            ax.plot(deps_h, values[s, k], linestyle=styles[s % len(styles)], linewidth=1.2, label=label)
    ax.set_xlabel(f"departure, hours after {_time(result.departures_utc[0])}")
    ax.set_ylabel(ylabel, fontsize=8)
    ax.set_title("Criterion per departure (shaded: spread between sources)", fontsize=9)
    ax.legend(fontsize=7)
    return figure_png(fig)


# ---------------------------------------------------------------------------------------------
# HTML
# ---------------------------------------------------------------------------------------------

TABLE_HEADERS: Tuple[str, ...] = (
    "rank", "departure", "kn", "arrival", "hours", "source", "worst MSI %", "at NM", "at",
    "h smooth", "h steady", "h lively", "h taxing", "h punishing", "h no data", "MSDV", "vomit %",
    "criterion", "spread", "in forecast", "within limits", "flags",
)


def _row_cells(r: SweepRow, digits: int) -> List[str]:
    return [
        str(r.rank), _time(r.depart_utc), f"{r.speed_kn:g}", _time(r.arrive_utc), _num(r.duration_h),
        r.source, _num(r.worst_msi_pct), _num(r.worst_msi_dist_nm), _time(r.worst_msi_utc),
        *(_num(h) for h in r.hours_class), _num(r.hours_missing), _num(r.msdv_arrival, 2),
        _num(r.sick_pct_arrival), _num(r.criterion_value, digits), _num(r.crit_spread, digits),
        "yes" if r.in_forecast else "NO", "yes" if r.within_limits else "no", r.flag_text,
    ]


def _summary_html(res: SweepResult) -> str:
    """What was compared: criterion, acceptable class, departures, speeds, sources, route, vessel."""
    from ..comfort.indices import COMFORT_CLASS_LABELS

    rows = [
        ("What best means", CRITERION_LABELS[res.criterion]),
        ("Worst acceptable comfort class", f"{res.max_class} {COMFORT_CLASS_LABELS[res.max_class]}"),
        ("Departures", f"{res.n_departures}, {_time(res.departures_utc[0])} to {_time(res.departures_utc[-1])}"),
        ("Speeds", ", ".join(f"{v:g} kn" for v in res.speeds_kn)),
        ("Sources compared", ", ".join(res.source_names)),
        ("Forecast time coverage", "; ".join(f"{n}: {_time(a)} to {_time(b)}"
                                             for n, (a, b) in zip(res.source_names, res.source_time_ranges))),
        ("Route samples", f"{res.dist_nm.size} over {_num(res.dist_nm[-1])} NM"),
        ("Vessel / station", f"{res.vessel_name} / {res.station_name}"),
        ("Response method", res.method),
    ]
    return table(("Item", "Value"), rows)


def _plots_html(res: SweepResult) -> List[str]:
    """The heat map with its class legend and the criterion plot ("" parts without matplotlib)."""
    from ..comfort.indices import COMFORT_CLASS_LABELS

    legend = " ".join(f"{swatch(COMFORT_PALETTE[c])} {esc(lab)}" for c, lab in enumerate(COMFORT_CLASS_LABELS))
    return [
        "<h2>Comfort by departure and distance</h2>",
        png_img(heat_map_png(res), "Heat map of comfort class by departure and distance"),
        f'<p class="small">{legend} {swatch(NOT_COMPUTED_COLOUR)} not computed (no data in at least one '
        "source). Dashed line: the recommended departure.</p>",
        "<h2>Criterion per departure</h2>",
        png_img(criterion_plot_png(res), "Criterion per departure for each source"),
    ]


def _ranked_html(res: SweepResult) -> List[str]:
    """The best robust departures, then all rows (robust first, by rank; capped)."""
    digits = 2 if res.criterion == "dose" else 1
    robust = sorted(res.robust_rows(), key=lambda r: r.rank)
    parts = [f"<h2>Best {min(TOP_ROWS, len(robust))} departures (worst case over the sources)</h2>",
             table(TABLE_HEADERS, [_row_cells(r, digits) for r in robust[:TOP_ROWS]]), "<h2>All rows</h2>"]
    ordered = sorted(res.rows, key=lambda r: (r.source != ROBUST_SOURCE, r.rank, r.source))
    shown = ordered[:MAX_TABLE_ROWS]
    if len(shown) < len(ordered):
        parts.append(f'<p class="small">{len(shown)} of {len(ordered)} rows shown (robust rows first, by rank); '
                     "every row is in the output table.</p>")
    parts.append(table(TABLE_HEADERS, [_row_cells(r, digits) for r in shown]))
    return parts


def render_sweep_html(report: SweepReport, *, plots: bool = True, extra_sections: Sequence[str] = ()) -> str:
    """The report as one self-contained HTML5 page (no scripts, no external resources);
    ``extra_sections``: markup placed after the plots (e.g. :mod:`.ensemble`)."""
    res = report.result
    rec = res.recommendation
    parts = [
        "<h2>Recommended departure</h2>",
        f'<div class="pick"><strong>{esc(_time(rec.depart_utc))} at {esc(f"{rec.speed_kn:g}")} kn.</strong> '
        f"{esc(rec.reason)}</div>",
        _summary_html(res), "<h2>Inputs</h2>", table(("Input", "Value"), report.inputs.rows()),
    ]
    if report.warnings:
        parts.append("<h2>Warnings</h2>" + bullets(report.warnings))
    if plots:
        parts.extend(_plots_html(res))
    parts.extend(extra_sections)
    parts.extend(_ranked_html(res))
    counts = flag_counts(res.flags)
    if counts:
        parts.append("<h2>Flags raised on some passages</h2>")
        parts.append(flag_table(counts, "Passages"))
    if res.notes:
        parts.append("<h2>Notes</h2>" + bullets(res.notes))
    parts.append("<h2>Methods and sources</h2>" + bullets((*SWEEP_METHOD_NOTES, *METHOD_NOTES)))
    return page(report.title, parts, report.caution)


def write_sweep_html(path: str, report: SweepReport, *, plots: bool = True, extra_sections: Sequence[str] = ()) -> str:
    """Write :func:`render_sweep_html` to ``path`` (UTF-8) and return the path."""
    return write_page(path, render_sweep_html(report, plots=plots, extra_sections=extra_sections))


def sweep_text_summary(result: SweepResult, *, top: int = 5) -> str:
    """Plain text for logs: the recommendation, the best robust rows, and the caution."""
    crit = result.criterion
    lines = [f"Departure sweep: {result.n_departures} departures x {len(result.speeds_kn)} speed(s) x "
             f"{len(result.source_names)} source(s); best = {CRITERION_LABELS[crit]}", "",
             "Recommended: " + result.recommendation.reason, ""]
    lines.append(f"{'rank':>4}  {'departure':<21}{'kn':>6}  {'worst MSI%':>10}{'h above':>8}{'MSDV':>7}"
                 f"{'criterion':>10}{'spread':>8}  ok  in fc")
    for r in sorted(result.robust_rows(), key=lambda r: r.rank)[:top]:
        lines.append(f"{r.rank:>4}  {_time(r.depart_utc):<21}{r.speed_kn:>6g}  {_num(r.worst_msi_pct):>10}"
                     f"{_num(r.hours_above):>8}{_num(r.msdv_arrival, 2):>7}{_num(r.criterion_value, 2):>10}"
                     f"{_num(r.crit_spread, 2):>8}  {'y' if r.within_limits else 'n':<3} {'y' if r.in_forecast else 'n'}")
    lines.append("")
    lines.append("CAUTION: " + result.caution)
    return "\n".join(lines)
