# SPDX-License-Identifier: GPL-2.0-or-later
"""The passage report: report data from passage results, and one self-contained HTML page.

Everything that comes from outside (file names, source names, vessel and leg names, notes) is
escaped with :func:`html.escape`; the page holds no script and no external link. Plots are
drawn with matplotlib (Agg backend, embedded as base64 PNG) when it can be imported; without it
the report still has every table. The planning-aid caution (:data:`.flags.CAUTION`) heads and
closes the page. The page parts come from :mod:`.html`, the colours from :mod:`.palette`.
"""
from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass, field
from typing import Dict, List, Optional, Sequence, Tuple

import numpy as np

from ..flags import CAUTION
from ..passage.fields import MOTION_OUTPUTS
from ..passage.pipeline import NOT_COMPUTED_CLASS, PassageResult, PassageSummary
from .html import bullets, figure_png, flag_table, new_figure, page, png_img, write_page
from .html import esc as _esc, fmt_num as _fmt, fmt_time_utc as _fmt_time, swatch as _swatch, table as _table
from .palette import COMFORT_PALETTE, NOT_COMPUTED_COLOUR

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

MAX_TABLE_ROWS: int = 400
"""Sample rows in the per-leg table; longer legs are thinned evenly (vertices always kept)."""


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
    r = leg.result
    fig = new_figure(8.0, 6.0) if r.n >= 2 else None
    if fig is None:
        return None
    hours = (r.eta_utc - r.eta_utc[0]).astype("timedelta64[s]").astype(float) / 3600.0
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
    return figure_png(fig)


# ---------------------------------------------------------------------------------------------
# HTML
# ---------------------------------------------------------------------------------------------

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


def _thin_rows(r: PassageResult, max_rows: int) -> np.ndarray:
    if r.n <= max_rows:
        return np.arange(r.n)
    pick = np.unique(np.concatenate((
        np.linspace(0, r.n - 1, max_rows).round().astype(int),
        np.flatnonzero(r.is_vertex),
    )))
    return pick


def _leg_facts_html(leg: LegReport) -> str:
    """The leg's key figures as an item/value table."""
    r, s = leg.result, leg.summary
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
    return _table(("Item", "Value"), rows)


def _class_hours_html(leg: LegReport, labels: Sequence[str]) -> str:
    """Hours in each comfort class (with its colour) and without results."""
    hours = leg.summary.hours_per_class
    class_rows = [(_swatch(COMFORT_PALETTE[c]), label, _fmt(hours.get(label, 0.0), 1)) for c, label in enumerate(labels)]
    class_rows.append((_swatch(NOT_COMPUTED_COLOUR), "not computed", _fmt(hours.get("not computed", 0.0), 1)))
    return "<h3>Time in each comfort class</h3>\n" + _table(("", "Class", "Hours"), class_rows, raw_cols=(0,))


def _samples_html(r: PassageResult) -> str:
    """The (evenly thinned) per-sample table of one leg."""
    parts = ["<h3>Samples</h3>"]
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


def _leg_html(leg: LegReport, labels: Sequence[str], plots: bool) -> str:
    r, s = leg.result, leg.summary
    parts = [f"<h2>Leg {s.leg + 1}: {_esc(leg.name)}</h2>", _leg_facts_html(leg), _class_hours_html(leg, labels)]
    if plots:
        parts.append(png_img(_leg_plot_png(leg, labels), f"Time plot of leg {s.leg + 1}"))
    if s.flag_counts:
        parts.append("<h3>Flagged samples</h3>")
        parts.append(flag_table(s.flag_counts, "Samples"))
    if r.notes:
        parts.append("<h3>Notes</h3>" + bullets(r.notes))
    parts.append(_samples_html(r))
    return "\n".join(p for p in parts if p)


def _overview_html(legs: Sequence[LegReport]) -> str:
    """One row per leg: times, distance, worst class, highest MSI, dose, samples without results."""
    if not legs:
        return "<p>No leg was computed.</p>"
    over = []
    for leg in legs:
        s = leg.summary
        worst = "n/a"
        if s.worst_index is not None:
            worst = leg.result.comfort_label[s.worst_index]
        over.append((
            str(s.leg + 1), leg.name, _fmt_time(s.departure_utc), _fmt_time(s.arrival_utc),
            _fmt(s.distance_nm, 1), _fmt(s.duration_h, 1), worst, _fmt(s.max_msi_pct, 1),
            _fmt(s.final_msdv, 1), str(s.n_samples - s.n_computed),
        ))
    return "<h2>Overview</h2>\n" + _table(
        ("Leg", "Name", "Departure", "Arrival", "NM", "Hours", "Worst class", "Max MSI %",
         "MSDV at arrival", "Samples without results"),
        over,
    )


def render_html(report: ReportData, *, plots: bool = True) -> str:
    """The report as one self-contained HTML5 page (no scripts, no external resources)."""
    labels = report.class_labels or tuple(f"class {i}" for i in range(len(COMFORT_PALETTE)))
    parts = ["<h2>Inputs</h2>", _table(("Input", "Value"), report.inputs.rows())]
    if report.warnings:
        parts.append("<h2>Warnings</h2>" + bullets(report.warnings))
    parts.append(_overview_html(report.legs))
    parts.extend(_leg_html(leg, labels, plots) for leg in report.legs)
    parts.append("<h2>Methods and sources</h2>" + bullets(METHOD_NOTES))
    return page(report.title, parts, report.caution)


def write_html(path: str, report: ReportData, *, plots: bool = True) -> str:
    """Write :func:`render_html` to ``path`` (UTF-8) and return the path."""
    return write_page(path, render_html(report, plots=plots))


def text_summary(report: ReportData) -> str:
    """A short plain-text summary (for logs and the terminal), caution included."""
    lines = [report.title, ""]
    w = max([len("name"), *(len(leg.name) for leg in report.legs)]) + 2  # whole names, columns aligned
    head = f"{'leg':<4}{'name':<{w}}{'NM':>7}{'hours':>7}  {'worst':<10}{'maxMSI%':>8}{'MSDV':>7}{'no data':>8}"
    lines.append(head)
    for leg in report.legs:
        s = leg.summary
        worst = leg.result.comfort_label[s.worst_index] if s.worst_index is not None else "n/a"
        lines.append(
            f"{s.leg + 1:<4}{leg.name:<{w}}{_fmt(s.distance_nm, 1):>7}{_fmt(s.duration_h, 1):>7}  "
            f"{worst:<10}{_fmt(s.max_msi_pct, 1):>8}{_fmt(s.final_msdv, 1):>7}{s.n_samples - s.n_computed:>8}"
        )
    lines.append("")
    lines.append("CAUTION: " + report.caution)
    return "\n".join(lines)


def class_hours_text(hours: Dict[str, float]) -> str:
    """'smooth 3.0 h, steady 1.5 h, ...' for classes with time in them."""
    return ", ".join(f"{k} {v:.1f} h" for k, v in hours.items() if v > 0)
