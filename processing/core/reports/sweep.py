# SPDX-License-Identifier: GPL-2.0-or-later
"""The departure-sweep report: one self-contained HTML page from a :class:`.sweep.SweepResult`.

Same rules as the passage report (:mod:`.report`): every text from outside (file, source,
vessel and route names, notes) is escaped with :func:`html.escape`; no script and no external
link; the planning-aid caution (:data:`.flags.CAUTION`) heads and closes the page; plots are
drawn with matplotlib (Agg canvas, embedded as base64 PNG) only when it can be imported, and
the page keeps every table without it. Colours are the comfort-class palette of :mod:`.report`
(also used by the QGIS styling).

Content: the recommendation in words; a heat map of departure time (vertical) x distance along
the route (horizontal) coloured by the worst comfort class over the sources; the criterion per
departure with one line per source and the spread between sources shaded; the ranked table.
"""
from __future__ import annotations

import base64
import datetime as _dt
import html
import io
import math
from dataclasses import dataclass, field
from typing import List, Optional, Sequence, Tuple

import numpy as np

from ..flags import CAUTION, FLAG_CODES, FLAG_EXPLANATIONS, flag_counts
from .passage import COMFORT_PALETTE, METHOD_NOTES, NOT_COMPUTED_COLOUR, ReportInputs
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

_CSS = """
body{font-family:sans-serif;margin:1.5em;color:#222;max-width:74em}
h1{font-size:1.5em}h2{font-size:1.2em;margin-top:1.6em}
table{border-collapse:collapse;margin:.5em 0}
td,th{border:1px solid #bbb;padding:.2em .45em;font-size:.85em;text-align:left}
th{background:#eef2f4}
.caution{border:2px solid #c4572a;background:#fff4ec;padding:.6em .8em;margin:1em 0}
.pick{border:2px solid #2b5d7c;background:#eef6fa;padding:.6em .8em;margin:1em 0}
.swatch{display:inline-block;width:1.1em;height:.9em;border:1px solid #555;vertical-align:middle}
.small{font-size:.8em;color:#555}
"""


# minimal own helpers (the passage report's _esc/_fmt/_table are private to report.py)
def _esc(value: object) -> str:
    return html.escape(str(value), quote=True)


def _num(value: float, digits: int = 1) -> str:
    v = float(value)
    return f"{v:.{digits}f}" if math.isfinite(v) else "n/a"


def _time(t: object) -> str:
    t64 = np.datetime64(t, "m")
    return "n/a" if np.isnat(t64) else str(t64).replace("T", " ") + " UTC"


def _table(headers: Sequence[str], rows: Sequence[Sequence[str]], raw_cols: Sequence[int] = ()) -> str:
    out = ["<table>", "<tr>" + "".join(f"<th>{_esc(h)}</th>" for h in headers) + "</tr>"]
    for row in rows:
        out.append("<tr>" + "".join(f"<td>{c if i in raw_cols else _esc(c)}</td>" for i, c in enumerate(row)) + "</tr>")
    out.append("</table>")
    return "\n".join(out)


def _swatch(colour: str) -> str:
    return f'<span class="swatch" style="background:{_esc(colour)}"></span>'


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


def _figure(w: float, h: float):  # type: ignore[no-untyped-def]
    try:
        from matplotlib.backends.backend_agg import FigureCanvasAgg
        from matplotlib.figure import Figure
    except Exception:  # noqa: BLE001 - any import problem means "no plots"
        return None
    fig = Figure(figsize=(w, h), dpi=90)
    FigureCanvasAgg(fig)
    return fig


def _png(fig) -> bytes:  # type: ignore[no-untyped-def]
    fig.tight_layout()
    buf = io.BytesIO()
    fig.savefig(buf, format="png")
    return buf.getvalue()


def heat_map_png(result: SweepResult) -> Optional[bytes]:
    """Departure (vertical) x distance (horizontal) coloured by the worst class over sources."""
    fig = _figure(8.0, 2.2 + 2.6 * len(result.speeds_kn))
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
    return _png(fig)


def criterion_plot_png(result: SweepResult) -> Optional[bytes]:
    """The criterion per departure: one line per source (and speed), the spread shaded."""
    fig = _figure(8.0, 3.4)
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
                  "dose": "MSDV at arrival"}[crit] + f" [{unit}]"
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
    return _png(fig)


def _img(png: Optional[bytes], alt: str) -> str:
    if png is None:
        return ""
    return f'<p><img alt="{_esc(alt)}" src="data:image/png;base64,{base64.b64encode(png).decode("ascii")}"></p>'


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


def render_sweep_html(report: SweepReport, *, plots: bool = True) -> str:
    """The report as one self-contained HTML5 page (no scripts, no external resources)."""
    res = report.result
    rec = res.recommendation
    crit = res.criterion
    digits = 2 if crit == "dose" else 1
    from ..comfort.indices import COMFORT_CLASS_LABELS

    caution = f'<div class="caution"><strong>Caution.</strong> {_esc(report.caution)}</div>'
    parts = [
        "<!DOCTYPE html>", '<html lang="en">', "<head>", '<meta charset="utf-8">',
        f"<title>{_esc(report.title)}</title>", f"<style>{_CSS}</style>", "</head>", "<body>",
        f"<h1>{_esc(report.title)}</h1>", caution,
        "<h2>Recommended departure</h2>",
        f'<div class="pick"><strong>{_esc(_time(rec.depart_utc))} at {_esc(f"{rec.speed_kn:g}")} kn.</strong> '
        f"{_esc(rec.reason)}</div>",
    ]
    summary_rows = [
        ("What best means", CRITERION_LABELS[crit]),
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
    parts.append(_table(("Item", "Value"), summary_rows))
    parts.append("<h2>Inputs</h2>")
    parts.append(_table(("Input", "Value"), report.inputs.rows()))
    if report.warnings:
        parts.append("<h2>Warnings</h2><ul>" + "".join(f"<li>{_esc(w)}</li>" for w in report.warnings) + "</ul>")
    if plots:
        parts.append("<h2>Comfort by departure and distance</h2>")
        parts.append(_img(heat_map_png(res), "Heat map of comfort class by departure and distance"))
        parts.append('<p class="small">' + " ".join(
            f"{_swatch(COMFORT_PALETTE[c])} {_esc(lab)}" for c, lab in enumerate(COMFORT_CLASS_LABELS))
            + f" {_swatch(NOT_COMPUTED_COLOUR)} not computed (no data in at least one source). Dashed line: "
            "the recommended departure.</p>")
        parts.append("<h2>Criterion per departure</h2>")
        parts.append(_img(criterion_plot_png(res), "Criterion per departure for each source"))
    robust = sorted(res.robust_rows(), key=lambda r: r.rank)
    parts.append(f"<h2>Best {min(TOP_ROWS, len(robust))} departures (worst case over the sources)</h2>")
    parts.append(_table(TABLE_HEADERS, [_row_cells(r, digits) for r in robust[:TOP_ROWS]]))
    parts.append("<h2>All rows</h2>")
    ordered = sorted(res.rows, key=lambda r: (r.source != ROBUST_SOURCE, r.rank, r.source))
    shown = ordered[:MAX_TABLE_ROWS]
    if len(shown) < len(ordered):
        parts.append(f'<p class="small">{len(shown)} of {len(ordered)} rows shown (robust rows first, by rank); '
                     "every row is in the output table.</p>")
    parts.append(_table(TABLE_HEADERS, [_row_cells(r, digits) for r in shown]))
    counts = flag_counts(res.flags)
    if counts:
        by_code = {code: f for f, code in FLAG_CODES.items()}
        parts.append("<h2>Flags raised on some passages</h2>")
        parts.append(_table(("Flag", "Passages", "Meaning"),
                            [(c, str(n), FLAG_EXPLANATIONS[by_code[c]]) for c, n in counts.items()]))
    if res.notes:
        parts.append("<h2>Notes</h2><ul>" + "".join(f"<li>{_esc(n)}</li>" for n in res.notes) + "</ul>")
    parts.append("<h2>Methods and sources</h2><ul>")
    parts.extend(f"<li>{_esc(m)}</li>" for m in (*SWEEP_METHOD_NOTES, *METHOD_NOTES))
    parts.append("</ul>")
    parts.append(caution)
    parts.append('<p class="small">Made with Seaway Comfort.</p>')
    parts.append("</body>")
    parts.append("</html>")
    return "\n".join(p for p in parts if p) + "\n"


def write_sweep_html(path: str, report: SweepReport, *, plots: bool = True) -> str:
    """Write :func:`render_sweep_html` to ``path`` (UTF-8) and return the path."""
    text = render_sweep_html(report, plots=plots)
    with open(path, "w", encoding="utf-8") as fh:
        fh.write(text)
    return path


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
