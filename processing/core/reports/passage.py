# SPDX-License-Identifier: GPL-2.0-or-later
"""The passage report: report data from passage results, and one self-contained HTML page.

Everything that comes from outside (file names, source names, vessel and leg names, notes) is
escaped with :func:`html.escape`; the page holds no script and no external link. The
planning-aid caution (:data:`.flags.CAUTION`) heads and closes the page.

Order of the page (one family with the sweep and climate reports): the verdict (within the
station's criteria or not, the worst class with where and when, the measure that sets it), a
map of the route coloured by class, the timeline in clock time (UTC, local offset stated when
known), sections added by other parts of the program (:attr:`ReportData.sections`), time per
class, hour by hour, the legs, flags, notes, inputs and methods.

Bounded size (a route layer of thousands of short features): figures are bounded by :mod:`.svg`;
the :data:`LEGS_IN_FULL` worst legs (worst class, then highest MSI) are shown in full, every leg
has a row in the overview up to :data:`OVERVIEW_MAX_ROWS` legs, beyond which the worst are listed
and the others summed up by worst class; the hour-by-hour table has at most
:data:`.passage_figures.HOURLY_MAX_ROWS` rows. Work is linear in the number of samples.
"""
from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass, field
from typing import Dict, List, Optional, Sequence, Tuple

import numpy as np

from ..flags import CAUTION, SampleFlag, flag_counts
from ..passage.fields import MOTION_OUTPUTS
from ..passage.pipeline import NOT_COMPUTED_CLASS, PassageResult, PassageSummary
from .html import bullets, figure, flag_table, page, verdict_box, write_page
from .html import esc as _esc, fmt_num as _fmt, swatch as _swatch, table as _table
from .palette import COMFORT_PALETTE, NOT_COMPUTED_COLOUR
from .verdict import verdict_rows, worst_sample_line
from .passage_figures import Concat, class_legend, concat_legs, hourly_rows, passage_map, timeline_figures
from .wording import clock_utc, offset_text, plain_text, plain_value

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
    "worst_legs",
    "LEGS_IN_FULL",
    "OVERVIEW_MAX_ROWS",
]

MAX_TABLE_ROWS: int = 200
"""Sample rows in the per-leg table; longer legs are thinned evenly (vertices always kept)."""

LEGS_IN_FULL: int = 20
"""Legs shown in full (facts, class hours, flags, samples): the worst ones."""

OVERVIEW_MAX_ROWS: int = 100
"""Legs listed one per row in the overview at most; the others are summed up by worst class."""

NOTES_MAX: int = 50
"""Distinct notes listed at most."""


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
    local_utc_offset_h: Optional[float] = None

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
        if self.local_utc_offset_h is not None:
            rows.append(("Times", offset_text(self.local_utc_offset_h)))
        return [(k, plain_value(v)) for k, v in rows if v]


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
    verdict_lines: Tuple[str, ...] = ()
    """Extra lines for the verdict box (plain text, escaped), e.g. class reasons."""
    sections: Tuple[Tuple[str, str], ...] = ()
    """Extra sections after the timeline: (heading text, body markup built from escaped parts)."""


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


def _severity(leg: LegReport) -> Tuple[int, float]:
    """How bad a leg is: its worst class, then its highest MSI (legs without results last)."""
    s = leg.summary
    if s.worst_index is None:
        return (-2, 0.0)
    msi = s.max_msi_pct if np.isfinite(s.max_msi_pct) else 0.0
    return (int(leg.result.comfort_class[s.worst_index]), float(msi))


def worst_legs(legs: Sequence[LegReport], k: int) -> List[int]:
    """Positions of the ``k`` worst legs (:func:`_severity`), in passage order."""
    ranked = sorted(range(len(legs)), key=lambda i: _severity(legs[i]), reverse=True)
    return sorted(ranked[:max(k, 0)])


def _ruling_measure(r: PassageResult, i: int) -> str:
    """Which measure sets the class of sample ``i``: the MSI scale or the station's criteria."""
    from ..comfort.indices import COMFORT_CLASS_LABELS, MSI_CLASS_BOUNDS_PCT

    c, msi = int(r.comfort_class[i]), float(r.msi_pct[i])
    by_msi = int(np.searchsorted(np.asarray(MSI_CLASS_BOUNDS_PCT), msi, side="right")) if np.isfinite(msi) else -1
    if by_msi >= c:
        bound = f" ({COMFORT_CLASS_LABELS[c]} from {MSI_CLASS_BOUNDS_PCT[c - 1]:g} %)" if c >= 1 else ""
        return f"Ruling measure: motion sickness incidence {_fmt(msi, 1)} % in 2 h{bound}."
    return (f"Ruling measure: the station's seakeeping criteria (vertical acceleration {_fmt(r.vacc_rms_m_s2[i])} "
            f"m/s² RMS, lateral {_fmt(r.lacc_rms_m_s2[i])} m/s² RMS, roll {_fmt(r.roll_rms_deg[i], 1)}° RMS) "
            f"close to or over their limits; the MSI alone ({_fmt(msi, 1)} %) would rate it "
            f"{COMFORT_CLASS_LABELS[max(by_msi, 0)]}.")


def _verdict_html(report: ReportData, c: Concat, offset_h: Optional[float]) -> str:
    """The headline: within the criteria or not, the worst class with where and when, the
    ruling measure, time per class; then the caller's extra lines (``verdict_lines``)."""
    if not report.legs or not (c.cls >= 0).any():
        return verdict_box("No result: no sample of the passage could be computed.",
                           ["See the flags and notes below for the reason."] + list(report.verdict_lines),
                           within=False)
    over = (c.flags & int(SampleFlag.CRITERIA_EXCEEDED)) != 0
    k = max(range(len(report.legs)), key=lambda j: _severity(report.legs[j]))
    leg = report.legs[k]
    i = leg.summary.worst_index
    r = leg.result
    label = r.comfort_label[i]
    if over.any():
        head = (f"Not within the station's seakeeping criteria: exceeded for {_fmt(c.dwell_s[over].sum() / 3600, 1)} h. "
                f"Worst class: {label}.")
    else:
        head = f"Within the station's seakeeping criteria. Worst class: {label}."
    lines = [f"Worst on leg {leg.summary.leg + 1} ({leg.name}) at {clock_utc(r.eta_utc[i], offset_h)}, "
             f"{_fmt(r.dist_nm[i], 1)} NM along the leg ({_fmt(r.lat_deg[i], 2)}° lat, {_fmt(r.lon_deg[i], 2)}° lon), "
             f"Hs {_fmt(r.hs_m[i])} m.", _ruling_measure(r, i),
             "Time per class: " + (class_hours_text(_total_hours(report.legs)).replace("not computed", "no result")
                                   or "none") + "."]
    missing = int((c.cls < 0).sum())
    if missing:
        lines.append(f"{missing} of {c.cls.size} samples have no result (see the flags below).")
    return verdict_box(head, lines + list(report.verdict_lines), within=not over.any())


def _total_hours(legs: Sequence[LegReport]) -> Dict[str, float]:
    out: Dict[str, float] = {}
    for leg in legs:
        for k, v in leg.summary.hours_per_class.items():
            out[k] = out.get(k, 0.0) + v
    return out


def _leg_facts_html(leg: LegReport, offset_h: Optional[float]) -> str:
    """The leg's key figures as an item/value table."""
    r, s = leg.result, leg.summary
    worst = s.worst_index
    rows = [
        ("Departure", clock_utc(s.departure_utc, offset_h)),
        ("Arrival", clock_utc(s.arrival_utc, offset_h)),
        ("Distance", f"{_fmt(s.distance_nm, 1)} NM"),
        ("Duration", f"{_fmt(s.duration_h, 1)} h"),
        ("Samples with results", f"{s.n_computed} of {s.n_samples}"),
        ("Vessel / station", f"{r.vessel_name} / {r.station_name}"),
        ("Highest Hs met", f"{_fmt(s.max_hs_m)} m"),
        ("Motion sickness dose at arrival", f"{_fmt(s.final_msdv, 1)} m/s^1.5"),
    ]
    rows += verdict_rows(r, s)
    if worst is not None:
        rows.append(("Worst sample", worst_sample_line(r, s) or ""))
    return _table(("Item", "Value"), rows)


def _class_hours_html(hours: Dict[str, float], labels: Sequence[str]) -> str:
    """Hours in each comfort class (with its colour) and without results."""
    class_rows = [(_swatch(COMFORT_PALETTE[c]), label, _fmt(hours.get(label, 0.0), 1)) for c, label in enumerate(labels)]
    class_rows.append((_swatch(NOT_COMPUTED_COLOUR), "no result", _fmt(hours.get("not computed", 0.0), 1)))
    return _table(("", "Class", "Hours"), class_rows, raw_cols=(0,))


def _samples_html(r: PassageResult, offset_h: Optional[float]) -> str:
    """The (evenly thinned) per-sample table of one leg."""
    parts = ["<h4>Samples</h4>"]
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
            str(int(r.seq[i])), clock_utc(r.eta_utc[i], offset_h), _fmt(r.dist_nm[i], 1), _fmt(r.course_deg[i], 0),
            _fmt(r.hs_m[i]), _fmt(r.tp_s[i], 1), _fmt(r.wave_from_deg[i], 0), _fmt(r.rel_heading_deg[i], 0),
            _fmt(r.enc_period_s[i], 1),
            *(_fmt(getattr(r, o.name)[i], o.report_digits) for o in motion_cols),
            _fmt(r.msdv_cum[i], 1), _swatch(colour) + _esc(r.comfort_label[i] or "no result"),
            flag_text[i], r.source[i],
        ))
    parts.append(_table(
        ("seq", "time", "NM", "course °", "Hs m", "Tp s", "waves from °", "rel. heading °", "Te s",
         *(o.label for o in motion_cols), "dose m/s^1.5", "comfort", "flags", "source"),
        srows, raw_cols=(10 + len(motion_cols),),
    ))
    return "\n".join(parts)


def _leg_html(leg: LegReport, labels: Sequence[str], offset_h: Optional[float]) -> str:
    r, s = leg.result, leg.summary
    parts = [f"<h3>Leg {s.leg + 1}: {_esc(leg.name)}</h3>", _leg_facts_html(leg, offset_h),
             "<h4>Time in each comfort class</h4>", _class_hours_html(s.hours_per_class, labels)]
    if s.flag_counts:
        parts.append("<h4>Flagged samples</h4>")
        parts.append(flag_table(s.flag_counts, "Samples"))
    parts.append(_samples_html(r, offset_h))
    return "\n".join(p for p in parts if p)


def _overview_row(leg: LegReport, offset_h: Optional[float]) -> Tuple[str, ...]:
    s = leg.summary
    worst = (f"{leg.result.comfort_label[s.worst_index]} ({s.worst_reason})" if s.worst_index is not None
             else "no result")
    return (str(s.leg + 1), leg.name, clock_utc(s.departure_utc, offset_h), clock_utc(s.arrival_utc, offset_h),
            _fmt(s.distance_nm, 1), _fmt(s.duration_h, 1), worst, _fmt(s.max_msi_pct, 1), _fmt(s.final_msdv, 1),
            str(s.n_samples - s.n_computed))


def _aggregate_rows(legs: Sequence[LegReport], labels: Sequence[str]) -> List[Tuple[str, ...]]:
    """Legs not listed, grouped by their worst class: count, NM, hours, highest MSI."""
    groups: Dict[int, List[LegReport]] = {}
    for leg in legs:
        groups.setdefault(_severity(leg)[0], []).append(leg)
    rows = []
    for c in sorted(groups, reverse=True):
        g = groups[c]
        msi = [x.summary.max_msi_pct for x in g if np.isfinite(x.summary.max_msi_pct)]
        rows.append((labels[c] if c >= 0 else "no result", str(len(g)),
                     _fmt(sum(x.summary.distance_nm for x in g), 1), _fmt(sum(x.summary.duration_h for x in g), 1),
                     _fmt(max(msi), 1) if msi else "n/a"))
    return rows


def _overview_html(legs: Sequence[LegReport], labels: Sequence[str], offset_h: Optional[float]) -> str:
    """One row per leg (up to :data:`OVERVIEW_MAX_ROWS`; beyond, the worst legs and the others
    aggregated by worst class)."""
    if not legs:
        return "<p>No leg was computed.</p>"
    heads = ("Leg", "Name", "Departure", "Arrival", "NM", "Hours", "Worst class (set by)", "Max MSI % (2 h)",
             "Dose at arrival m/s^1.5", "Samples without results")
    if len(legs) <= OVERVIEW_MAX_ROWS:
        return _table(heads, [_overview_row(leg, offset_h) for leg in legs])
    shown = worst_legs(legs, OVERVIEW_MAX_ROWS)
    rest = sorted(set(range(len(legs))) - set(shown))
    return "\n".join((
        f'<p class="small">{len(legs)} legs: the {len(shown)} worst (by worst class, then highest MSI) are listed '
        f"one per row; the other {len(rest)} are summed up by their worst class below. Every leg is in the "
        "output layers.</p>",
        _table(heads, [_overview_row(legs[i], offset_h) for i in shown]),
        "<h3>Other legs, by worst class</h3>",
        _table(("Worst class", "Legs", "NM", "Hours", "Highest MSI %"), _aggregate_rows([legs[i] for i in rest], labels)),
    ))


def _notes_html(report: ReportData) -> str:
    """The legs' notes without repeats (with how many legs give each)."""
    count: Dict[str, int] = {}
    for leg in report.legs:
        for n in leg.result.notes:
            count[n] = count.get(n, 0) + 1
    if not count:
        return ""
    many = len(report.legs) > 1
    items = [plain_text(n) + (f" ({k} legs)" if many and k > 1 else "") for n, k in count.items()]
    return "<h2>Notes</h2>" + bullets(items[:NOTES_MAX] + ([f"... and {len(items) - NOTES_MAX} more notes"]
                                                            if len(items) > NOTES_MAX else []))


def _figures_html(report: ReportData, c: Concat, offset_h: Optional[float]) -> List[str]:
    """The route map and the clock-time timeline (all legs)."""
    results = [leg.result for leg in report.legs]
    names = [leg.name for leg in report.legs]
    t_ref = c.eta[~np.isnat(c.eta)].min() if (~np.isnat(c.eta)).any() else None
    parts = ["<h2>Route</h2>", figure(passage_map(results), "The route, each stretch coloured by the worse "
                                      "comfort class of its two ends.", class_legend())]
    if t_ref is not None:
        parts.append("<h2>Timeline</h2>")
        parts += [figure(svg, cap, leg) for svg, leg, cap in timeline_figures(results, names, t_ref, offset_h)]
    return parts


def _hourly_html(c: Concat, names: Sequence[str], offset_h: Optional[float]) -> str:
    width, rows = hourly_rows(c, names, offset_h)
    if not rows:
        return ""
    what = "Hour by hour" if width == 1 else f"Every {width} hours"
    return (f"<h2>{what}</h2>" + f'<p class="small">Times {_esc(offset_text(offset_h))}; worst over all legs '
            "and sources sailed in each period.</p>" + _table(
                (f"from ({offset_text(offset_h).split(';')[0]})", "legs", "NM on the leg", "worst class",
                 "highest Hs m", "highest MSI %", "highest vert. acc. m/s²", "samples without result"),
                rows, raw_cols=(3,)))


def render_html(report: ReportData, *, plots: bool = True, legs_in_full: int = LEGS_IN_FULL,
                extra_sections: Sequence[str] = ()) -> str:
    """The report as one self-contained HTML5 page (no scripts, no external resources): the
    verdict, the map and the timeline (``plots``), the caller's extra sections, time per class,
    hour by hour, the legs (the ``legs_in_full`` worst in full), ``extra_sections`` (e.g.
    :mod:`.ensemble`), inputs, flags, notes, methods."""
    labels = report.class_labels or tuple(f"class {i}" for i in range(len(COMFORT_PALETTE)))
    offset_h = report.inputs.local_utc_offset_h
    c = concat_legs([leg.result for leg in report.legs])
    parts = [_verdict_html(report, c, offset_h)]
    if report.warnings:
        parts.append("<h2>Warnings</h2>" + bullets(plain_text(w) for w in report.warnings))
    if plots:
        parts += _figures_html(report, c, offset_h)
    parts += [f"<h2>{_esc(head)}</h2>{body}" for head, body in report.sections]
    parts.extend(extra_sections)
    parts += ["<h2>Time in each comfort class</h2>", _class_hours_html(_total_hours(report.legs), labels),
              _hourly_html(c, [leg.name for leg in report.legs], offset_h), "<h2>Legs</h2>",
              _overview_html(report.legs, labels, offset_h)]
    full = worst_legs(report.legs, legs_in_full)
    if full:
        rule = ("" if len(full) == len(report.legs) else
                f'<p class="small">The {len(full)} worst of {len(report.legs)} legs in full (by worst class, '
                "then highest MSI).</p>")
        parts += ["<h2>Legs in detail</h2>", rule] + [_leg_html(report.legs[i], labels, offset_h) for i in full]
    counts = flag_counts(c.flags)
    if counts:
        parts += ["<h2>Flagged samples (all legs)</h2>", flag_table(counts, "Samples")]
    parts += [_notes_html(report), "<h2>Inputs</h2>", _table(("Input", "Value"), report.inputs.rows()),
              "<h2>Methods and sources</h2>" + bullets(METHOD_NOTES)]
    return page(report.title, parts, report.caution)


def write_html(path: str, report: ReportData, *, plots: bool = True, extra_sections: Sequence[str] = ()) -> str:
    """Write :func:`render_html` to ``path`` (UTF-8) and return the path."""
    return write_page(path, render_html(report, plots=plots, extra_sections=extra_sections))


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
        if s.worst_reason:
            lines.append(f"    worst class set by: {s.worst_reason}")
    lines.append("")
    lines.append("CAUTION: " + report.caution)
    return "\n".join(lines)


def class_hours_text(hours: Dict[str, float]) -> str:
    """'smooth 3.0 h, steady 1.5 h, ...' for classes with time in them."""
    return ", ".join(f"{k} {v:.1f} h" for k, v in hours.items() if v > 0)
