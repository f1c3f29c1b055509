# SPDX-License-Identifier: GPL-2.0-or-later
"""The passage report: report data from passage results, and one self-contained HTML page.

Everything that comes from outside (file names, source names, vessel and leg names, notes) is
escaped with :func:`html.escape`; the page holds no script and no external link. Plots are
drawn with matplotlib (Agg backend, embedded as base64 PNG) when it can be imported; without it
the report still has every table. The planning-aid caution (:data:`.flags.CAUTION`) heads and
closes the page.

The comfort-class palette lives here as well (the QGIS styling reuses it): five colours of our
own, ordered from light to dark so that the classes stay apart by lightness alone (readable
under the common colour-vision deficiencies and in grey-scale print), with a neutral grey for
samples without results.
"""
from __future__ import annotations

import base64
import datetime as _dt
import html
import io
import math
from dataclasses import dataclass, field
from typing import Dict, List, Optional, Sequence, Tuple

import numpy as np

from ..flags import CAUTION, FLAG_CODES, FLAG_EXPLANATIONS
from ..passage.fields import MOTION_OUTPUTS
from ..passage.pipeline import NOT_COMPUTED_CLASS, PassageResult, PassageSummary

__all__ = [
    "COMFORT_PALETTE",
    "NOT_COMPUTED_COLOUR",
    "ReportInputs",
    "LegReport",
    "ReportData",
    "build_report",
    "render_html",
    "write_html",
    "text_summary",
]

COMFORT_PALETTE: Tuple[str, ...] = ("#e3f1f7", "#a3d6cf", "#d69a3a", "#b4492a", "#4d1a47")
"""Fill colours for comfort classes 0..4 (smooth, steady, lively, taxing, punishing); CIE L*
about 94, 82, 68, 45, 19 (more than 10 units apart, so the order reads without hue)."""

NOT_COMPUTED_COLOUR: str = "#9a9a9a"
"""Colour of samples without results (no sea data, outside the grid or the time range)."""

MAX_TABLE_ROWS: int = 400
"""Sample rows in the per-leg table; longer legs are thinned evenly (vertices always kept)."""


def _esc(value: object) -> str:
    return html.escape(str(value), quote=True)


def _fmt(value: object, digits: int = 2) -> str:
    try:
        v = float(value)  # type: ignore[arg-type]
    except (TypeError, ValueError):
        return str(value)
    if not math.isfinite(v):
        return "n/a"
    return f"{v:.{digits}f}"


def _fmt_time(t: object) -> str:
    if t is None:
        return "n/a"
    t64 = np.datetime64(t, "m")
    if np.isnat(t64):
        return "n/a"
    return str(t64).replace("T", " ") + " UTC"


@dataclass(frozen=True)
class ReportInputs:
    """What the run was given, recorded for provenance (all text, shown escaped)."""

    sea_state_files: Tuple[str, ...] = ()
    source_names: Tuple[str, ...] = ()
    bathymetry: str = ""
    route: str = ""
    vessel: str = ""
    station: str = ""
    departure_utc: str = ""
    speed_kn: str = ""
    spacing_nm: str = ""
    spectrum: str = ""
    method: str = ""
    created_utc: str = ""
    extra: Tuple[Tuple[str, str], ...] = ()

    def rows(self) -> List[Tuple[str, str]]:
        rows = [
            ("Route", self.route),
            ("Sea-state files", "; ".join(self.sea_state_files)),
            ("Source names", ", ".join(self.source_names)),
            ("Bathymetry", self.bathymetry or "none (deep water assumed)"),
            ("Vessel profile", self.vessel),
            ("Station", self.station),
            ("Departure", self.departure_utc),
            ("Speed through the water", self.speed_kn),
            ("Sample spacing", self.spacing_nm),
            ("Spectrum and spreading", self.spectrum),
            ("Response method", self.method),
            ("Report created", self.created_utc),
        ]
        rows.extend(self.extra)
        return [(k, v) for k, v in rows if v]


@dataclass(frozen=True)
class LegReport:
    """One leg: its display name, its results and their summary."""

    name: str
    result: PassageResult
    summary: PassageSummary


@dataclass(frozen=True)
class ReportData:
    """Everything the HTML page shows."""

    title: str
    inputs: ReportInputs
    legs: Tuple[LegReport, ...]
    warnings: Tuple[str, ...] = ()
    caution: str = CAUTION
    class_labels: Tuple[str, ...] = field(default_factory=tuple)


def build_report(
    legs: Sequence[Tuple[str, PassageResult]],
    inputs: ReportInputs,
    *,
    title: str = "Seaway Comfort passage report",
    warnings: Sequence[str] = (),
) -> ReportData:
    """Collect the report data: one (name, result) pair per leg, in passage order."""
    from ..comfort.indices import COMFORT_CLASS_LABELS

    reports = tuple(LegReport(str(name), res, res.summary()) for name, res in legs)
    if not inputs.created_utc:
        now = _dt.datetime.now(_dt.timezone.utc).strftime("%Y-%m-%d %H:%M UTC")
        inputs = ReportInputs(**{**inputs.__dict__, "created_utc": now})
    return ReportData(
        title=str(title),
        inputs=inputs,
        legs=reports,
        warnings=tuple(str(w) for w in warnings),
        class_labels=tuple(COMFORT_CLASS_LABELS),
    )


# ---------------------------------------------------------------------------------------------
# plots
# ---------------------------------------------------------------------------------------------


def _leg_plot_png(leg: LegReport, labels: Sequence[str]) -> Optional[bytes]:
    """A three-panel time plot of one leg as PNG bytes, or None without matplotlib."""
    try:
        from matplotlib.backends.backend_agg import FigureCanvasAgg
        from matplotlib.figure import Figure
    except Exception:  # noqa: BLE001 - any import problem means "no plots"
        return None
    r = leg.result
    if r.n < 2:
        return None
    hours = (r.eta_utc - r.eta_utc[0]).astype("timedelta64[s]").astype(float) / 3600.0
    fig = Figure(figsize=(8.0, 6.0), dpi=90)
    FigureCanvasAgg(fig)  # Agg canvas attached to this figure only (no global backend switch)
    ax1, ax2, ax3 = fig.subplots(3, 1, sharex=True)
    ax1.plot(hours, r.hs_m, color="#2b5d7c", label="Hs [m]")
    ax1.set_ylabel("Hs [m]")
    ax1b = ax1.twinx()
    ax1b.plot(hours, r.tp_s, color="#b07a2a", linestyle="--", label="Tp [s]")
    ax1b.set_ylabel("Tp [s]")
    ax1.set_title("Sea state met along the passage")
    ax2.plot(hours, r.vacc_rms_m_s2, color="#4d1a47", label="vertical acc. RMS [m/s2]")
    ax2.plot(hours, r.lacc_rms_m_s2, color="#7fa38a", label="lateral acc. RMS [m/s2]")
    ax2.set_ylabel("acc. RMS [m/s2]")
    ax2.legend(loc="upper left", fontsize=7)
    ax2b = ax2.twinx()
    ax2b.plot(hours, r.msi_pct, color="#c4572a", linestyle=":", label="MSI [%]")
    ax2b.set_ylabel("MSI 2 h [%]")
    cls = r.comfort_class
    # one bar per run of equal class (a leg of 500 samples has a few dozen runs at most)
    edges = np.append(hours, hours[-1] + (hours[-1] - hours[-2]))
    starts = np.flatnonzero(np.concatenate(([True], cls[1:] != cls[:-1])))
    ends = np.append(starts[1:], cls.size)
    run_cls = cls[starts]
    ax3.bar(edges[starts], np.where(run_cls >= 0, run_cls + 1, 0.4), width=edges[ends] - edges[starts],
            align="edge", edgecolor="none",
            color=[COMFORT_PALETTE[c] if c >= 0 else NOT_COMPUTED_COLOUR for c in run_cls])
    ax3.set_yticks(range(1, len(labels) + 1))
    ax3.set_yticklabels(labels, fontsize=7)
    ax3.set_ylabel("comfort")
    ax3.set_xlabel("hours since departure")
    fig.tight_layout()
    buf = io.BytesIO()
    fig.savefig(buf, format="png")
    return buf.getvalue()


# ---------------------------------------------------------------------------------------------
# HTML
# ---------------------------------------------------------------------------------------------

_CSS = """
body{font-family:sans-serif;margin:1.5em;color:#222;max-width:70em}
h1{font-size:1.5em}h2{font-size:1.2em;margin-top:1.6em}h3{font-size:1.05em}
table{border-collapse:collapse;margin:.5em 0}
td,th{border:1px solid #bbb;padding:.2em .5em;font-size:.9em;text-align:left}
th{background:#eef2f4}
.caution{border:2px solid #c4572a;background:#fff4ec;padding:.6em .8em;margin:1em 0}
.swatch{display:inline-block;width:1.1em;height:.9em;border:1px solid #555;vertical-align:middle}
.small{font-size:.8em;color:#555}
"""

METHOD_NOTES: Tuple[str, ...] = (
    "Route samples on WGS84 geodesics (Karney 2013, J. Geodesy 87, 43-55, via PROJ).",
    "Linear (Airy) wave dispersion at the local depth (USACE Shore Protection Manual 1984, ch. 2).",
    "Relative heading 0 following, 90 beam, 180 head seas; encounter period "
    "Te = 2 pi / |omega - k U cos mu| (Principles of Naval Architecture vol. III, 1989, ch. 8); "
    "not defined when the vessel outruns the peak-period crests.",
    "JONSWAP spectra in Hs and Tp (DNV-RP-C205, 2010, s.3.5.5) with cos-2s spreading "
    "(Longuet-Higgins et al. 1963); responses integrated over absolute frequency.",
    "Motion sickness incidence after O'Hanlon & McCauley (1974), 2-hour exposure, in the "
    "seakeeping form of Lloyd (1989).",
    "Motion sickness dose value and vomiting share after ISO 2631-1:1997 Annex D "
    "(frequency weighting Wf), accumulated along the passage.",
    "Guidance flags after IMO MSC.1/Circ.1228 (2007); they do not replace the ship's "
    "stability information.",
    "Comfort classes (smooth, steady, lively, taxing, punishing) are this tool's own five-step "
    "summary of the MSI and of how close the station's seakeeping criteria are to their limits; "
    "they are not taken from a standard.",
)


def _table(headers: Sequence[str], rows: Sequence[Sequence[str]], *, raw_cols: Sequence[int] = ()) -> str:
    """An HTML table; cells are escaped except the columns listed in raw_cols (built here)."""
    out = ["<table>", "<tr>" + "".join(f"<th>{_esc(h)}</th>" for h in headers) + "</tr>"]
    for row in rows:
        cells = []
        for i, cell in enumerate(row):
            cells.append(f"<td>{cell if i in raw_cols else _esc(cell)}</td>")
        out.append("<tr>" + "".join(cells) + "</tr>")
    out.append("</table>")
    return "\n".join(out)


def _swatch(colour: str) -> str:
    return f'<span class="swatch" style="background:{_esc(colour)}"></span>'


def _thin_rows(r: PassageResult, max_rows: int) -> np.ndarray:
    if r.n <= max_rows:
        return np.arange(r.n)
    pick = np.unique(np.concatenate((
        np.linspace(0, r.n - 1, max_rows).round().astype(int),
        np.flatnonzero(r.is_vertex),
    )))
    return pick


def _leg_html(leg: LegReport, labels: Sequence[str], plots: bool) -> str:
    r, s = leg.result, leg.summary
    parts = [f"<h2>Leg {s.leg + 1}: {_esc(leg.name)}</h2>"]
    worst = s.worst_index
    rows = [
        ("Departure", _fmt_time(s.departure_utc)),
        ("Arrival", _fmt_time(s.arrival_utc)),
        ("Distance", f"{_fmt(s.distance_nm, 1)} NM"),
        ("Duration", f"{_fmt(s.duration_h, 1)} h"),
        ("Samples with results", f"{s.n_computed} of {s.n_samples}"),
        ("Vessel / station", f"{r.vessel_name} / {r.station_name}"),
        ("Highest Hs met", f"{_fmt(s.max_hs_m)} m"),
        ("Highest MSI (2 h exposure)", f"{_fmt(s.max_msi_pct, 1)} %"),
        ("Motion sickness dose at arrival", f"{_fmt(s.final_msdv, 1)} m/s^1.5"),
        ("Share who may vomit (ISO 2631-1 Annex D)", f"{_fmt(s.final_vomit_pct, 1)} %"),
    ]
    if worst is not None:
        rows.append((
            "Worst sample",
            f"#{int(r.seq[worst])} at {_fmt_time(r.eta_utc[worst])}, {_fmt(r.dist_nm[worst], 1)} NM: "
            f"{r.comfort_label[worst]}, Hs {_fmt(r.hs_m[worst])} m, vertical acc. "
            f"{_fmt(r.vacc_rms_m_s2[worst])} m/s2 RMS, lateral acc. {_fmt(r.lacc_rms_m_s2[worst])} m/s2 RMS, "
            f"roll {_fmt(r.roll_rms_deg[worst], 1)} deg RMS, MSI {_fmt(r.msi_pct[worst], 1)} %",
        ))
    parts.append(_table(("Item", "Value"), rows))
    parts.append("<h3>Time in each comfort class</h3>")
    class_rows = []
    for c, label in enumerate(labels):
        class_rows.append((_swatch(COMFORT_PALETTE[c]), label, _fmt(s.hours_per_class.get(label, 0.0), 1)))
    class_rows.append((_swatch(NOT_COMPUTED_COLOUR), "not computed",
                       _fmt(s.hours_per_class.get("not computed", 0.0), 1)))
    parts.append(_table(("", "Class", "Hours"), class_rows, raw_cols=(0,)))
    if plots:
        png = _leg_plot_png(leg, labels)
        if png is not None:
            b64 = base64.b64encode(png).decode("ascii")
            parts.append(
                f'<p><img alt="Time plot of leg {s.leg + 1}" src="data:image/png;base64,{b64}"></p>'
            )
    if s.flag_counts:
        parts.append("<h3>Flagged samples</h3>")
        by_code = {code: flag for flag, code in FLAG_CODES.items()}
        frows = [(code, str(n), FLAG_EXPLANATIONS[by_code[code]]) for code, n in s.flag_counts.items()]
        parts.append(_table(("Flag", "Samples", "Meaning"), frows))
    if r.notes:
        parts.append("<h3>Notes</h3><ul>" + "".join(f"<li>{_esc(n)}</li>" for n in r.notes) + "</ul>")
    parts.append("<h3>Samples</h3>")
    pick = _thin_rows(r, MAX_TABLE_ROWS)
    if pick.size < r.n:
        parts.append(f'<p class="small">{pick.size} of {r.n} samples shown (evenly thinned, route '
                     "vertices kept); every sample is in the point layer.</p>")
    flag_text = r.flag_text()
    motion_cols = [o for o in MOTION_OUTPUTS if o.report_digits is not None]
    srows = []
    for i in pick:
        c = int(r.comfort_class[i])
        colour = COMFORT_PALETTE[c] if c != NOT_COMPUTED_CLASS else NOT_COMPUTED_COLOUR
        srows.append((
            str(int(r.seq[i])), _fmt_time(r.eta_utc[i]), _fmt(r.dist_nm[i], 1), _fmt(r.course_deg[i], 0),
            _fmt(r.hs_m[i]), _fmt(r.tp_s[i], 1), _fmt(r.wave_from_deg[i], 0), _fmt(r.rel_heading_deg[i], 0),
            _fmt(r.enc_period_s[i], 1),
            *(_fmt(getattr(r, o.name)[i], o.report_digits) for o in motion_cols),
            _fmt(r.msdv_cum[i], 1), _swatch(colour) + " " + _esc(r.comfort_label[i] or "not computed"),
            flag_text[i], r.source[i],
        ))
    parts.append(_table(
        ("seq", "ETA", "NM", "course", "Hs m", "Tp s", "from deg", "rel. hdg", "Te s",
         *(o.label for o in motion_cols), "MSDV", "comfort", "flags", "source"),
        srows, raw_cols=(10 + len(motion_cols),),
    ))
    return "\n".join(parts)


def render_html(report: ReportData, *, plots: bool = True) -> str:
    """The report as one self-contained HTML5 page (no scripts, no external resources)."""
    labels = report.class_labels or tuple(f"class {i}" for i in range(len(COMFORT_PALETTE)))
    caution = f'<div class="caution"><strong>Caution.</strong> {_esc(report.caution)}</div>'
    parts = [
        "<!DOCTYPE html>",
        '<html lang="en">',
        "<head>",
        '<meta charset="utf-8">',
        f"<title>{_esc(report.title)}</title>",
        f"<style>{_CSS}</style>",
        "</head>",
        "<body>",
        f"<h1>{_esc(report.title)}</h1>",
        caution,
        "<h2>Inputs</h2>",
        _table(("Input", "Value"), report.inputs.rows()),
    ]
    if report.warnings:
        parts.append("<h2>Warnings</h2><ul>" + "".join(f"<li>{_esc(w)}</li>" for w in report.warnings) + "</ul>")
    if report.legs:
        parts.append("<h2>Overview</h2>")
        over = []
        for leg in report.legs:
            s = leg.summary
            worst = "n/a"
            if s.worst_index is not None:
                worst = leg.result.comfort_label[s.worst_index]
            over.append((
                str(s.leg + 1), leg.name, _fmt_time(s.departure_utc), _fmt_time(s.arrival_utc),
                _fmt(s.distance_nm, 1), _fmt(s.duration_h, 1), worst, _fmt(s.max_msi_pct, 1),
                _fmt(s.final_msdv, 1), str(s.n_samples - s.n_computed),
            ))
        parts.append(_table(
            ("Leg", "Name", "Departure", "Arrival", "NM", "Hours", "Worst class", "Max MSI %",
             "MSDV at arrival", "Samples without results"),
            over,
        ))
    else:
        parts.append("<p>No leg was computed.</p>")
    for leg in report.legs:
        parts.append(_leg_html(leg, labels, plots))
    parts.append("<h2>Methods and sources</h2><ul>")
    parts.extend(f"<li>{_esc(m)}</li>" for m in METHOD_NOTES)
    parts.append("</ul>")
    parts.append(caution)
    parts.append('<p class="small">Made with Seaway Comfort.</p>')
    parts.append("</body>")
    parts.append("</html>")
    return "\n".join(parts) + "\n"


def write_html(path: str, report: ReportData, *, plots: bool = True) -> str:
    """Write :func:`render_html` to ``path`` (UTF-8) and return the path."""
    text = render_html(report, plots=plots)
    with open(path, "w", encoding="utf-8") as fh:
        fh.write(text)
    return path


def text_summary(report: ReportData) -> str:
    """A short plain-text summary (for logs and the terminal), caution included."""
    lines = [report.title, ""]
    head = f"{'leg':<4}{'name':<22}{'NM':>7}{'hours':>7}  {'worst':<10}{'maxMSI%':>8}{'MSDV':>7}{'no data':>8}"
    lines.append(head)
    for leg in report.legs:
        s = leg.summary
        worst = leg.result.comfort_label[s.worst_index] if s.worst_index is not None else "n/a"
        lines.append(
            f"{s.leg + 1:<4}{leg.name[:21]:<22}{_fmt(s.distance_nm, 1):>7}{_fmt(s.duration_h, 1):>7}  "
            f"{worst:<10}{_fmt(s.max_msi_pct, 1):>8}{_fmt(s.final_msdv, 1):>7}{s.n_samples - s.n_computed:>8}"
        )
    lines.append("")
    lines.append("CAUTION: " + report.caution)
    return "\n".join(lines)


def class_hours_text(hours: Dict[str, float]) -> str:
    """'smooth 3.0 h, steady 1.5 h, ...' for classes with time in them."""
    return ", ".join(f"{k} {v:.1f} h" for k, v in hours.items() if v > 0)
