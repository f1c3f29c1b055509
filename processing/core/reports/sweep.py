# SPDX-License-Identifier: GPL-2.0-or-later
"""The departure-sweep report: one self-contained HTML page from a :class:`.sweep.SweepResult`.

Built from the shared page parts of :mod:`.html` (escaping, no script, no external link, the
planning-aid caution heading and closing the page); figures are inline SVG (:mod:`.charts`,
:mod:`.route_map`); colours from :mod:`.palette` (also used by the QGIS styling).

Content, in the order of the passage report: the verdict (the recommended departure, within
limits or not, where that passage is worst, the ranking measure, the windows); the route
coloured by class for that departure (when the route's vertices are given); a heat map of
departure (rows, clock time) x distance along the route coloured by the worst comfort class
over the sources, the recommended departure outlined; the criterion per departure over clock
time with one line per source, the spread shaded and the recommendation marked; sections added
by other parts of the program; the ranked tables. Heat maps are bounded to
:data:`MAX_MAP_ROWS` x :data:`MAX_MAP_COLUMNS` cells (worst class per cell).
"""
from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass, field
from typing import List, Optional, Sequence, Tuple

import numpy as np

from ..flags import CAUTION, flag_counts
from .charts import Band, Series, hours_after, time_chart, time_heat_map
from .html import bullets, esc, figure, flag_table, fmt_num, legend, line_key, page, swatch, table, verdict_box, write_page
from .html import fmt_time_utc as _time
from .palette import COMFORT_PALETTE, NOT_COMPUTED_COLOUR, comfort_colour
from .passage import METHOD_NOTES, ReportInputs
from .passage_figures import SERIES_COLOURS, class_legend
from .route_map import Track, route_map
from .wording import clock_utc, plain_text, plain_value
from ..sweep.engine import CRITERION_LABELS, CRITERION_UNITS, ROBUST_SOURCE, SweepResult, SweepRow

__all__ = [
    "SweepReport",
    "build_sweep_report",
    "render_sweep_html",
    "write_sweep_html",
    "sweep_text_summary",
    "heat_map_svg",
    "criterion_svg",
    "sweep_map_svg",
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
    route_lon_deg: Tuple[float, ...] = ()
    route_lat_deg: Tuple[float, ...] = ()
    verdict_lines: Tuple[str, ...] = ()
    """Extra lines for the verdict box (plain text, escaped)."""
    sections: Tuple[Tuple[str, str], ...] = ()
    """Extra sections after the figures: (heading text, body markup built from escaped parts)."""


def build_sweep_report(result: SweepResult, inputs: ReportInputs, *, title: str = "Seaway Comfort departure sweep",
                       warnings: Sequence[str] = (), route_lonlat: Optional[Tuple[Sequence[float], Sequence[float]]] = None
                       ) -> SweepReport:
    """Collect the report data; the creation time is filled in when ``inputs`` has none.
    ``route_lonlat``: the route's vertices (degrees) for the map (no map without them)."""
    if not inputs.created_utc:
        now = _dt.datetime.now(_dt.timezone.utc).strftime("%Y-%m-%d %H:%M UTC")
        inputs = ReportInputs(**{**inputs.__dict__, "created_utc": now})
    lon, lat = route_lonlat if route_lonlat is not None else ((), ())
    return SweepReport(title=str(title), inputs=inputs, result=result, warnings=tuple(str(w) for w in warnings),
                       route_lon_deg=tuple(float(v) for v in lon), route_lat_deg=tuple(float(v) for v in lat))


# ---------------------------------------------------------------------------------------------
# figures
# ---------------------------------------------------------------------------------------------

MAX_MAP_COLUMNS: int = 240
"""Distance columns of the heat map at most (each the worst class of the samples it covers)."""

MAX_MAP_ROWS: int = 360
"""Departure rows of the heat map at most (each the worst class of the departures it covers)."""


def _worst_bins(a: np.ndarray, axis: int, max_n: int) -> Tuple[np.ndarray, np.ndarray]:
    """``a`` reduced along ``axis`` to at most ``max_n`` bins by the maximum (worst class);
    returns the reduced array and the first index of each bin."""
    n = a.shape[axis]
    starts = np.unique(np.linspace(0, n, min(n, max_n) + 1).astype(int)[:-1])
    return np.maximum.reduceat(a, starts, axis=axis), starts


def _edges(v: np.ndarray, starts: np.ndarray) -> np.ndarray:
    """Cell edges of bins starting at ``starts`` over the positions ``v`` (half way between)."""
    full = np.concatenate(([v[0] - 0.5 * (v[1] - v[0])] if v.size > 1 else [v[0] - 0.5],
                           0.5 * (v[:-1] + v[1:]), [v[-1] + 0.5 * (v[-1] - v[-2])] if v.size > 1 else [v[0] + 0.5]))
    return np.append(full[starts], full[-1])


def heat_map_svg(result: SweepResult, s: int, offset_h: Optional[float] = None) -> str:
    """Departure (rows, clock time) x distance (columns) at speed ``s`` coloured by the worst
    class over the sources; the recommended departure outlined."""
    cls = np.asarray(result.robust_class[s], dtype=np.int64)
    cls, cstarts = _worst_bins(cls, 1, MAX_MAP_COLUMNS)
    cls, rstarts = _worst_bins(cls, 0, MAX_MAP_ROWS)
    dep_h = hours_after(result.departures_utc, result.departures_utc[0])
    palette = np.array([*COMFORT_PALETTE, NOT_COMPUTED_COLOUR], dtype=object)  # index -1 = not computed
    colours = [list(palette[row]) for row in cls]
    rec = result.recommendation
    pick = None
    if rec.speed_kn == result.speeds_kn[s]:
        d = int(np.flatnonzero(result.departures_utc == rec.depart_utc)[0]) if (result.departures_utc == rec.depart_utc).any() else None
        pick = None if d is None else int(np.searchsorted(rstarts, d, side="right") - 1)
    return time_heat_map(result.departures_utc[0], _edges(result.dist_nm, cstarts), _edges(dep_h, rstarts), colours,
                         label=f"Worst comfort class over the sources by departure and distance at "
                               f"{result.speeds_kn[s]:g} kn", pick_row=pick, offset_h=offset_h)


def criterion_svg(result: SweepResult, offset_h: Optional[float] = None) -> Tuple[str, str]:
    """The criterion per departure over clock time, one line per source (and speed), the spread
    between sources shaded, the recommended departure marked; returns (svg, legend)."""
    crit = result.criterion
    if crit == "earliest_ok":
        values, ytitle = result.hours_above, "hours above the acceptable class [h]"
    else:
        values = result.criterion_value
        ytitle = {"worst_msi": "worst MSI on the passage", "hours_above": "hours above the acceptable class",
                  "dose": "dose at arrival", "lowest_prob_taxing": "P(taxing or worse)"}[crit] + f" [{CRITERION_UNITS[crit]}]"
    t0 = result.departures_utc[0]
    h = hours_after(result.departures_utc, t0)
    series, bands_, keys = [], [], []
    dashes = ("", "5 2", "2 2", "8 2 2 2")
    for s, v in enumerate(result.speeds_kn):
        vals = np.where(np.isfinite(values[s]), values[s], np.nan)
        if len(result.source_names) > 1 and np.isfinite(vals).any(axis=0).any():
            with np.errstate(all="ignore"):
                bands_.append(Band(h, np.nanmin(vals, axis=0), np.nanmax(vals, axis=0), "#9fc3d6"))
        for k, name in enumerate(result.source_names):
            colour = SERIES_COLOURS[k % len(SERIES_COLOURS)]
            label = name if len(result.speeds_kn) == 1 else f"{name}, {v:g} kn"
            series.append(Series(label, h, vals[k], colour, dashes[s % len(dashes)]))
            keys.append((line_key(colour, dashes[s % len(dashes)]), label))
    if bands_:
        keys.append((swatch("#9fc3d6"), "spread between the sources"))
    rec = result.recommendation
    keys.append((line_key("#1d4e6b", "9 3"), "recommended departure"))
    svg = time_chart(t0, series, ytitle=ytitle, label="Criterion per departure", offset_h=offset_h, bands=bands_,
                     marker=(float(hours_after(rec.depart_utc, t0)), "recommended"))
    return svg, legend(keys)


def _sample_positions(result: SweepResult, lon: Sequence[float], lat: Sequence[float]) -> Tuple[np.ndarray, np.ndarray]:
    """Positions of the route samples: each vertex's share of the route length (great circles
    on the mean sphere, haversine) mapped to the samples' distances, linear in between."""
    lo, la = np.radians(np.asarray(lon, dtype=float)), np.radians(np.asarray(lat, dtype=float))
    a = np.sin(np.diff(la) / 2) ** 2 + np.cos(la[:-1]) * np.cos(la[1:]) * np.sin(np.diff(lo) / 2) ** 2
    cum = np.concatenate(([0.0], np.cumsum(2 * np.arcsin(np.sqrt(np.clip(a, 0, 1))))))
    frac = result.dist_nm / result.dist_nm[-1] if result.dist_nm[-1] > 0 else np.zeros_like(result.dist_nm)
    at = frac * cum[-1]
    lon_u = np.degrees(np.unwrap(lo))
    return np.interp(at, cum, lon_u), np.interp(at, cum, np.degrees(la))


def sweep_map_svg(result: SweepResult, lon: Sequence[float], lat: Sequence[float]) -> str:
    """The route coloured by the worst class over the sources for the recommended departure."""
    rec = result.recommendation
    s = result.speeds_kn.index(rec.speed_kn) if rec.speed_kn in result.speeds_kn else 0
    hit = np.flatnonzero(result.departures_utc == rec.depart_utc)
    if hit.size == 0 or result.dist_nm.size < 2 or len(lon) < 2:
        return ""
    cls = np.asarray(result.robust_class[s, int(hit[0])], dtype=np.int64)
    x, y = _sample_positions(result, lon, lat)
    seg = np.maximum(cls[:-1], cls[1:])
    return route_map([Track(x, y, tuple(comfort_colour(c) for c in seg))],
                     label="Map of the route coloured by comfort class for the recommended departure",
                     order=(NOT_COMPUTED_COLOUR, *COMFORT_PALETTE))


# ---------------------------------------------------------------------------------------------
# HTML
# ---------------------------------------------------------------------------------------------

TABLE_HEADERS: Tuple[str, ...] = (
    "rank", "departure", "kn", "arrival", "hours", "source", "worst MSI %", "at NM", "at",
    "h smooth", "h steady", "h lively", "h taxing", "h punishing", "h no result", "dose m/s^1.5", "vomit %",
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


def _summary_html(res: SweepResult, offset_h: Optional[float]) -> str:
    """What was compared: criterion, acceptable class, departures, speeds, sources, route, vessel."""
    from ..comfort.indices import COMFORT_CLASS_LABELS

    rows = [
        ("What best means", CRITERION_LABELS[res.criterion]),
        ("Worst acceptable comfort class", f"{res.max_class} {COMFORT_CLASS_LABELS[res.max_class]}"),
        ("Departures", f"{res.n_departures}, {clock_utc(res.departures_utc[0], offset_h)} to "
                       f"{clock_utc(res.departures_utc[-1], offset_h)}"),
        ("Speeds", ", ".join(f"{v:g} kn" for v in res.speeds_kn)),
        ("Sources compared", ", ".join(res.source_names)),
        ("Forecast time coverage", "; ".join(f"{n}: {_time(a)} to {_time(b)}"
                                             for n, (a, b) in zip(res.source_names, res.source_time_ranges))),
        ("Route samples", f"{res.dist_nm.size} over {_num(res.dist_nm[-1])} NM"),
        ("Vessel / station", f"{res.vessel_name} / {res.station_name}"),
        ("Response method", plain_value(res.method)),
    ]
    return table(("Item", "Value"), rows)


def _worst_at_pick(res: SweepResult, offset_h: Optional[float]) -> str:
    """Worst class on the recommended passage (over the sources) with where and when."""
    from ..comfort.indices import COMFORT_CLASS_LABELS

    rec = res.recommendation
    s = res.speeds_kn.index(rec.speed_kn) if rec.speed_kn in res.speeds_kn else 0
    hit = np.flatnonzero(res.departures_utc == rec.depart_utc)
    if hit.size == 0:
        return ""
    cls = np.asarray(res.robust_class[s, int(hit[0])], dtype=np.int64)
    if not (cls >= 0).any():
        return "No sample of this passage has a result."
    i = int(np.argmax(cls))
    when = np.datetime64(rec.depart_utc, "ms") + np.timedelta64(int(round(res.elapsed_h[s, i] * 3.6e6)), "ms")
    return (f"Worst class on this passage: {COMFORT_CLASS_LABELS[cls[i]]}, first met {_num(res.dist_nm[i])} NM "
            f"along the route at {clock_utc(when, offset_h)} (worst case over the sources).")


def _verdict_html(report: SweepReport, offset_h: Optional[float]) -> str:
    """The recommendation first: when, how fast, within limits or not, where it is worst, the
    measure that ranks, the windows; then the caller's extra lines."""
    from ..comfort.indices import COMFORT_CLASS_LABELS

    res, rec = report.result, report.result.recommendation
    limit = f"class {COMFORT_CLASS_LABELS[res.max_class]} or better"
    if rec.within_limits:
        head = f"Depart {clock_utc(rec.depart_utc, offset_h)} at {rec.speed_kn:g} kn: within limits ({limit}) in every source."
    else:
        head = (f"No departure stays within limits ({limit}) in every source; least bad: "
                f"{clock_utc(rec.depart_utc, offset_h)} at {rec.speed_kn:g} kn.")
    unit = CRITERION_UNITS[res.criterion]
    lines = [_worst_at_pick(res, offset_h),
             f"Ruling measure: {CRITERION_LABELS[res.criterion]}; value {_num(rec.criterion_value, 2)} {unit}"
             + (f", spread between the sources {_num(rec.crit_spread, 2)} {unit}." if len(res.source_names) > 1 else "."),
             f"Arrival {clock_utc(rec.arrive_utc, offset_h)}." + ("" if rec.in_forecast else
                                                                  " The passage runs past the end of a forecast.")]
    if rec.windows_utc:
        spans = "; ".join(f"{_time(a)} to {_time(b)}" for a, b in rec.windows_utc[:6])
        more = f" and {len(rec.windows_utc) - 6} more" if len(rec.windows_utc) > 6 else ""
        lines.append(f"Departures within limits at {rec.speed_kn:g} kn: {spans}{more}.")
    lines.append(plain_text(rec.reason))
    return verdict_box(head, [x for x in lines if x] + list(report.verdict_lines), within=rec.within_limits)


def _figures_html(report: SweepReport, offset_h: Optional[float]) -> List[str]:
    """The map, the heat map per speed and the criterion chart, each with its legend."""
    res = report.result
    parts: List[str] = []
    if report.route_lon_deg and report.route_lat_deg:
        parts += ["<h2>Route</h2>", figure(sweep_map_svg(res, report.route_lon_deg, report.route_lat_deg),
                                           "The route for the recommended departure, each stretch coloured by the "
                                           "worse class of its two ends (worst case over the sources).",
                                           class_legend())]
    parts.append("<h2>Comfort by departure and distance</h2>")
    for s, v in enumerate(res.speeds_kn):
        parts.append(figure(heat_map_svg(res, s, offset_h), f"Worst comfort class over the sources at {v:g} kn; "
                            "rows: departures, earliest at the top; outlined: the recommended departure.",
                            class_legend()))
    svg, keys = criterion_svg(res, offset_h)
    parts += ["<h2>Criterion per departure</h2>",
              figure(svg, "The ranking measure for each departure and source.", keys)]
    return parts


BEST_HEADERS: Tuple[str, ...] = ("rank", "departure", "kn", "arrival", "worst MSI %", "hours above the class",
                                 "dose m/s^1.5", "criterion", "spread", "within limits", "in forecast")


def _best_cells(r: SweepRow, digits: int) -> List[str]:
    return [str(r.rank), _time(r.depart_utc), f"{r.speed_kn:g}", _time(r.arrive_utc), _num(r.worst_msi_pct),
            _num(r.hours_above), _num(r.msdv_arrival, 2), _num(r.criterion_value, digits), _num(r.crit_spread, digits),
            "yes" if r.within_limits else "no", "yes" if r.in_forecast else "NO"]


def _ranked_html(res: SweepResult) -> List[str]:
    """The best robust departures (short table), then all rows (robust first, by rank; capped)."""
    digits = 2 if res.criterion == "dose" else 1
    robust = sorted(res.robust_rows(), key=lambda r: r.rank)
    parts = [f"<h2>Best {min(TOP_ROWS, len(robust))} departures (worst case over the sources)</h2>",
             table(BEST_HEADERS, [_best_cells(r, digits) for r in robust[:TOP_ROWS]]), "<h2>All rows</h2>"]
    ordered = sorted(res.rows, key=lambda r: (r.source != ROBUST_SOURCE, r.rank, r.source))
    shown = ordered[:MAX_TABLE_ROWS]
    if len(shown) < len(ordered):
        parts.append(f'<p class="small">{len(shown)} of {len(ordered)} rows shown (robust rows first, by rank); '
                     "every row is in the output table.</p>")
    parts.append(table(TABLE_HEADERS, [_row_cells(r, digits) for r in shown]))
    return parts


def render_sweep_html(report: SweepReport, *, plots: bool = True, extra_sections: Sequence[str] = ()) -> str:
    """The report as one self-contained HTML5 page (no scripts, no external resources): the
    verdict, the map, heat maps and criterion chart (``plots``), extra sections, the tables,
    flags, notes, inputs and methods; ``extra_sections``: markup placed after the caller's sections
    (e.g. :mod:`.ensemble`)."""
    res = report.result
    offset_h = report.inputs.local_utc_offset_h
    parts = [_verdict_html(report, offset_h)]
    if report.warnings:
        parts.append("<h2>Warnings</h2>" + bullets(plain_text(w) for w in report.warnings))
    if plots:
        parts.extend(_figures_html(report, offset_h))
    parts += [f"<h2>{esc(head)}</h2>{body}" for head, body in report.sections]
    parts.extend(extra_sections)
    parts += ["<h2>What was compared</h2>", _summary_html(res, offset_h)]
    parts.extend(_ranked_html(res))
    counts = flag_counts(res.flags)
    if counts:
        parts.append("<h2>Flags raised on some passages</h2>")
        parts.append(flag_table(counts, "Passages"))
    if res.notes:
        parts.append("<h2>Notes</h2>" + bullets(plain_text(n) for n in res.notes))
    parts += ["<h2>Inputs</h2>", table(("Input", "Value"), report.inputs.rows()),
              "<h2>Methods and sources</h2>" + bullets((*SWEEP_METHOD_NOTES, *METHOD_NOTES))]
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
