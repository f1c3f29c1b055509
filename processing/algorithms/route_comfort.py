# SPDX-License-Identifier: GPL-2.0-or-later
"""Processing algorithm ``seawaycomfort:routecomfort``: comfort and motions along a route."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Dict, List, Optional, Tuple

from qgis.core import (
    QgsCoordinateReferenceSystem,
    QgsProcessing,
    QgsProcessingException,
    QgsProcessingOutputNumber,
    QgsProcessingOutputString,
    QgsProcessingParameterFeatureSink,
    QgsProcessingParameterFileDestination,
    QgsWkbTypes,
)

from ..core.flags import CAUTION
from ..core.validation import show
from . import common
from .base import Run, SeawayAlgorithm

OUTPUT_POINTS = "OUTPUT_POINTS"
OUTPUT_SEGMENTS = "OUTPUT_SEGMENTS"
OUTPUT_REPORT = "OUTPUT_REPORT"
SUMMARY = "SUMMARY"
N_SAMPLES = "N_SAMPLES"


def provenance_text(settings: common.PassageSettings, route_source: str) -> str:
    """The metadata abstract of the outputs: what went in, and the caution."""
    vessel = getattr(settings.profile, "name", settings.vessel_spec)
    dep = str(settings.departure_utc.astype("datetime64[m]")) + " UTC" if settings.departure_utc is not None else "per route feature"
    return (
        "Seaway Comfort passage assessment. "
        f"Route: {route_source}. Sea-state files: {'; '.join(settings.sea_state_paths)}. "
        f"Source names: {', '.join(settings.source_names) or 'from the files'} ({settings.source_mode}). "
        f"Bathymetry: {settings.depth_path or 'none (deep water)'}. Vessel: {vessel} ({settings.vessel_spec}); "
        f"station: {settings.station or 'first of the profile'}. Departure: {dep}. Speed: {settings.speed_kn:g} kn "
        "(route fields override). "
        f"Spacing {settings.spacing_nm:g} NM, JONSWAP gamma {settings.gamma:g}, cos-2s s {settings.spread_s:g}"
        f"{', long-crested' if settings.long_crested else ''}. {CAUTION}"
    )


@dataclass(frozen=True)
class RouteJob:
    """The checked settings, the route legs (WGS84) and the route's source text."""

    settings: common.PassageSettings
    legs: Tuple[Any, ...]
    route_source: str

    @property
    def inputs(self) -> List[str]:
        return common.input_paths(self.settings, self.route_source)


@dataclass(frozen=True)
class Passages:
    """(label, PassageResult) per leg and source group, and the names of the sources read."""

    results: Tuple[Tuple[str, Any], ...]
    source_names: Tuple[str, ...]

    @property
    def n_samples(self) -> int:
        return sum(r.n for _, r in self.results)

    def flag_lines(self) -> List[str]:
        """One log line per flag code over every sample."""
        import numpy as np

        from ..core.flags import flag_counts

        counts = flag_counts(np.concatenate([r.flags for _, r in self.results])) if self.results else {}
        return common.flag_warning_lines(counts, self.n_samples)


class RouteComfortAlgorithm(SeawayAlgorithm):
    """Motions, comfort indices and guidance flags at every sample along a route."""

    OUTPUT_FILES = (OUTPUT_POINTS, OUTPUT_SEGMENTS, OUTPUT_REPORT)

    def name(self) -> str:
        return "routecomfort"

    def displayName(self) -> str:  # noqa: N802
        return self.tr("Passage comfort along a route")

    def shortHelpString(self) -> str:  # noqa: N802
        return self.tr(
            "<p>Samples the route every SPACING_NM nautical miles along WGS84 geodesics, works out "
            "when the vessel reaches each sample at the given speed, reads the sea state there and "
            "then from the forecast files, and computes how the vessel moves and how the motion is "
            "likely to feel at the chosen station on board.</p>"
            "<p><b>Route</b>: a line layer in any CRS; each feature (and each part of a multi-part "
            "line) is one leg. Optional fields: <code>name</code> (leg name), "
            "<code>depart_utc</code> (departure, date-time or ISO 8601 text, UTC) and "
            "<code>speed_kn</code> (knots); they override DEPARTURE and SPEED_KN.</p>"
            "<p><b>Sea state</b>: one or more GRIB2 / NetCDF-CF / GeoTIFF files; with several files the "
            "first one with data at a sample is used (or, in compare mode, each file gives its own "
            "result). Bathymetry is optional; without it deep water is assumed.</p>"
            "<p><b>Method</b>: linear wave theory at the local depth (Airy), encounter period from "
            "the relative heading (0 following, 90 beam, 180 head), JONSWAP spectra with cos-2s "
            "spreading (DNV-RP-C205), closed-form heave and pitch (Jensen, Mansour &amp; Olsen 2004) "
            "and a slope-driven roll model, motion sickness incidence (O'Hanlon &amp; McCauley 1974), "
            "ISO 2631-1 motion sickness dose value accumulated along the passage, seakeeping criteria "
            "and IMO MSC.1/Circ.1228 guidance flags.</p>"
            "<p><b>Outputs</b>: points and segments (EPSG:4326) with fields in SI units named with "
            "their unit (hs_m, tp_s, enc_period_s, vacc_rms_m_s2, msi_pct, msdv_cum in m/s^1.5, ...), "
            "comfort_class 0-4 (smooth, steady, lively, taxing, punishing), flags (comma-separated "
            "codes), styled by class and time-enabled on eta_utc; values are NULL where nothing "
            "could be computed. An optional HTML report summarises each leg.</p>"
            f"<p><b>Caution</b>: {CAUTION}</p>"
        )

    def initAlgorithm(self, config: Optional[Dict[str, Any]] = None) -> None:  # noqa: N802
        for p in common.passage_parameters():
            self.addParameter(p)
        self.addParameter(QgsProcessingParameterFeatureSink(
            OUTPUT_POINTS, self.tr("Passage samples"), QgsProcessing.SourceType.TypeVectorPoint,
        ))
        self.addParameter(QgsProcessingParameterFeatureSink(
            OUTPUT_SEGMENTS, self.tr("Passage segments"), QgsProcessing.SourceType.TypeVectorLine,
        ))
        self.addParameter(QgsProcessingParameterFileDestination(
            OUTPUT_REPORT, self.tr("Passage report"), self.tr("HTML files (*.html)"), optional=True,
        ))
        self.addOutput(QgsProcessingOutputString(SUMMARY, self.tr("Summary")))
        self.addOutput(QgsProcessingOutputNumber(N_SAMPLES, self.tr("Number of samples")))

    # hooks of the run skeleton (:meth:`.base.SeawayAlgorithm.processAlgorithm`) ---------------
    def read_settings(self, run: Run) -> RouteJob:
        settings = common.parse_passage_settings(self, run.parameters, run.context)
        legs, route_src = common.read_route(self, run.parameters, run.context, run.feedback)
        return RouteJob(settings, tuple(legs), route_src)

    def compute(self, run: Run, job: RouteJob) -> Passages:
        results: List[Tuple[str, Any]] = []
        with common.opened_sea(job.settings, run.feedback) as (sources, depth):
            groups = source_groups(job.settings, sources)
            n_jobs = len(job.legs) * len(groups)
            for leg in job.legs:
                departure, speed = leg_plan(job.settings, leg)
                for gname, group in groups:
                    k = len(results)
                    label = leg.name if not gname else f"{leg.name} [{gname}]"
                    run.feedback.pushInfo(f"Leg {k + 1}: {label}, departing {str(departure)[:16]} UTC at {speed:g} kn")
                    progress = run.progress(90.0 * k / n_jobs, 90.0 * (k + 1) / n_jobs)
                    results.append((label, _passage(job, leg, (departure, speed), group, depth, progress, k)))
        return Passages(tuple(results), tuple(s.name for s in sources))

    def write_sinks(self, run: Run, job: RouteJob, passages: Passages) -> Dict[str, Any]:
        from .. import adapters
        from ..styling import OutputStyle

        fields = adapters.passage_fields()
        crs = QgsCoordinateReferenceSystem(adapters.WGS84)
        abstract = provenance_text(job.settings, job.route_source)
        out: Dict[str, Any] = {}
        for name, wkb, features, title in (
            (OUTPUT_POINTS, QgsWkbTypes.Type.Point, adapters.point_features, "Seaway Comfort passage samples"),
            (OUTPUT_SEGMENTS, QgsWkbTypes.Type.LineString, adapters.segment_features, "Seaway Comfort passage segments"),
        ):
            feats = (f for label, res in passages.results for f in features(res, fields, label))
            out[name] = run.write_sink(name, fields, wkb, crs, feats, OutputStyle(title, abstract))
        run.feedback.setProgress(92)
        return out

    def write_report(self, run: Run, job: RouteJob, passages: Passages) -> Dict[str, Any]:
        from ..core.reports.passage import build_report, text_summary, write_html

        warnings = passages.flag_lines()
        report = build_report(list(passages.results), report_inputs(job, passages), warnings=warnings)
        if warnings:
            run.feedback.pushWarning("Flagged samples:")
            for line in warnings:
                run.feedback.pushWarning("  " + line)
        summary = text_summary(report)
        run.feedback.pushInfo(summary)
        out: Dict[str, Any] = {SUMMARY: summary, N_SAMPLES: passages.n_samples}
        report_path = run.file_output(OUTPUT_REPORT)
        if report_path:
            try:
                write_html(report_path, report)
            except OSError as exc:
                raise QgsProcessingException(f"OUTPUT_REPORT {show(report_path)} could not be written: {exc}") from exc
            out[OUTPUT_REPORT] = report_path
        return out


def source_groups(settings: common.PassageSettings, sources: List[Any]) -> List[Tuple[str, List[Any]]]:
    """(group name, sources) per result: one per file in compare mode, else one for all."""
    if settings.source_mode == "compare" and len(sources) > 1:
        return [(s.name, [s]) for s in sources]
    return [("", sources)]


def leg_plan(settings: common.PassageSettings, leg: Any) -> Tuple[Any, float]:
    """(departure, speed) of a leg: its route fields, else DEPARTURE and SPEED_KN."""
    departure = leg.departure_utc if leg.departure_utc is not None else settings.departure_utc
    if departure is None:
        raise QgsProcessingException(
            f"DEPARTURE: leg {show(leg.name)} has no departure time: set DEPARTURE or fill the route field depart_utc"
        )
    return departure, (leg.speed_kn if leg.speed_kn is not None else settings.speed_kn)


def _passage(job: RouteJob, leg: Any, plan: Tuple[Any, float], group: List[Any], depth: Any, progress: Any,
             index: int) -> Any:
    """Result ``index``: one leg with its (departure, speed) through one group of sources."""
    from ..core.passage.pipeline import compute_passage

    with common.input_error(f"leg {show(leg.name)}: "):
        return compute_passage(
            leg.lon_deg, leg.lat_deg, departure_utc=plan[0], speed_kn=plan[1], sea_states=group,
            progress=progress, leg=index, **common.passage_options(job.settings, depth, job.settings.method),
        )


def report_inputs(job: RouteJob, passages: Passages) -> Any:
    """What went in, as the passage report lists it."""
    from ..core.reports.passage import ReportInputs

    s = job.settings
    first = passages.results[0][1] if passages.results else None
    return ReportInputs(
        sea_state_files=s.sea_state_paths,
        source_names=passages.source_names,
        bathymetry=s.depth_path or "",
        route=job.route_source,
        vessel=common.vessel_text(s),
        station=first.station_name if first is not None else (s.station or ""),
        departure_utc=(str(s.departure_utc.astype("datetime64[m]")).replace("T", " ") + " UTC")
        if s.departure_utc is not None else "per route feature",
        speed_kn=f"{s.speed_kn:g} kn (route field speed_kn overrides)",
        spacing_nm=f"{s.spacing_nm:g} NM",
        spectrum=common.spectrum_text(s),
        method=first.method if first is not None else "",
        extra=(("Mode with several sources", s.source_mode),),
    )
