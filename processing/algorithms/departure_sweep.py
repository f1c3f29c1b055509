# SPDX-License-Identifier: GPL-2.0-or-later
"""Processing algorithm ``seawaycomfort:departuresweep``: when to leave, across forecast sources.

The route, sea-state, vessel and spectrum parameters are those of ``routecomfort``
(:func:`.common.passage_parameters`, parsed by :func:`.common.parse_passage_settings`) without
DEPARTURE and SOURCE_MODE (the sweep always compares every source); the sources are opened
and the recommended passage's points written with the shared helpers of :mod:`.common` and
:mod:`..adapters`. The numbers come from :func:`..core.sweep.engine.sweep_departures`.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, Dict, List, Optional, Tuple

from qgis.core import (
    QgsCoordinateReferenceSystem,
    QgsFeature,
    QgsFields,
    QgsProcessing,
    QgsProcessingException,
    QgsProcessingOutputNumber,
    QgsProcessingOutputString,
    QgsProcessingParameterDateTime,
    QgsProcessingParameterEnum,
    QgsProcessingParameterFeatureSink,
    QgsProcessingParameterFileDestination,
    QgsProcessingParameterNumber,
    QgsProcessingParameterString,
    QgsWkbTypes,
)
from qgis.PyQt.QtCore import QVariant

from ..core.flags import CAUTION
from ..core.validation import show
from . import common
from .base import Run, SeawayAlgorithm

DEPART_FROM = "DEPART_FROM"
DEPART_TO = "DEPART_TO"
DEPART_STEP_H = "DEPART_STEP_H"
CRITERION = "CRITERION"
MAX_CLASS = common.MAX_CLASS
SPEEDS_KN = "SPEEDS_KN"
OUTPUT_TABLE = "OUTPUT_TABLE"
OUTPUT_REPORT = "OUTPUT_REPORT"
OUTPUT_POINTS = "OUTPUT_POINTS"
SUMMARY = "SUMMARY"
RECOMMENDED_UTC = "RECOMMENDED_UTC"
N_ROWS = "N_ROWS"

NOT_SHARED = (common.DEPARTURE, common.SOURCE_MODE)
"""Shared passage parameters the sweep does not take (it sweeps departures and compares sources)."""

# (field, kind, SweepRow attribute); names are the public interface of the table (<= 10 chars
# where the brief leaves the choice to us)
TABLE_FIELDS = (
    ("rank", "int", "rank"),
    ("depart_utc", "datetime", "depart_utc"),
    ("speed_kn", "double", "speed_kn"),
    ("arrive_utc", "datetime", "arrive_utc"),
    ("duration_h", "double", "duration_h"),
    ("source", "string", "source"),
    ("worst_msi_pct", "double", "worst_msi_pct"),
    ("worst_msi_dist_nm", "double", "worst_msi_dist_nm"),
    ("worst_msi_utc", "datetime", "worst_msi_utc"),
    ("hrs_c0", "double", None),
    ("hrs_c1", "double", None),
    ("hrs_c2", "double", None),
    ("hrs_c3", "double", None),
    ("hrs_c4", "double", None),
    ("hrs_nodata", "double", "hours_missing"),
    ("hrs_above", "double", "hours_above"),
    ("msdv_arrival", "double", "msdv_arrival"),
    ("sick_pct_arrival", "double", "sick_pct_arrival"),
    ("flags", "string", None),
    ("n_missing", "int", "n_missing"),
    ("in_forecast", "bool", "in_forecast"),
    ("within_lim", "bool", "within_limits"),
    ("crit_value", "double", "criterion_value"),
    ("crit_spread", "double", "crit_spread"),
    ("msi_spread", "double", "msi_spread"),
)


def table_fields() -> QgsFields:
    """Fields of OUTPUT_TABLE."""
    from ..adapters import make_field

    fields = QgsFields()
    for name, kind, _ in TABLE_FIELDS:
        fields.append(make_field(name, kind))
    return fields


def _row_attributes(row: Any) -> List[Any]:
    import numpy as np

    from ..adapters import qdatetime_from_datetime64, round_to_second

    out: List[Any] = []
    for name, kind, attr in TABLE_FIELDS:
        if name.startswith("hrs_c"):
            v = float(row.hours_class[int(name[-1])])
            out.append(v)
            continue
        if name == "flags":
            out.append(row.flag_text)
            continue
        v = getattr(row, attr)
        if kind == "double":
            fv = float(v)
            out.append(fv if math.isfinite(fv) else QVariant())
        elif kind == "int":
            out.append(int(v))
        elif kind == "bool":
            out.append(bool(v))
        elif kind == "datetime":
            out.append(QVariant() if np.isnat(v) else qdatetime_from_datetime64(round_to_second(v)))
        else:
            out.append(str(v))
    return out


def _row_feature(fields: QgsFields, row: Any) -> QgsFeature:
    f = QgsFeature(fields)
    f.setAttributes(_row_attributes(row))
    return f


@dataclass(frozen=True)
class SweepJob:
    """The checked settings of one sweep: passage settings, the one leg, the window, speeds, ranking."""

    settings: common.PassageSettings
    leg: Any
    route_source: str
    deps: Any  # numpy datetime64 array of departures
    step_h: float
    speeds: Tuple[float, ...]
    criterion: str
    max_class: int

    @property
    def inputs(self) -> List[str]:
        return common.input_paths(self.settings, self.route_source)

    def window_text(self) -> str:
        return f"{str(self.deps[0])[:16]} to {str(self.deps[-1])[:16]}"

    def speeds_text(self) -> str:
        return ", ".join(f"{v:g}" for v in self.speeds)


@dataclass(frozen=True)
class SweepOutcome:
    """The core sweep result, the recommended passage per source (if asked for), the abstract."""

    result: Any
    points: Tuple[Tuple[str, Any], ...]
    abstract: str


class DepartureSweepAlgorithm(SeawayAlgorithm):
    """Sweep departure times (and speeds) over every forecast source; rank and recommend."""

    OUTPUT_FILES = (OUTPUT_TABLE, OUTPUT_POINTS, OUTPUT_REPORT)

    def name(self) -> str:
        return "departuresweep"

    def displayName(self) -> str:  # noqa: N802
        return self.tr("When to leave: departure sweep")

    def shortHelpString(self) -> str:  # noqa: N802
        return self.tr(
            "<p>Runs the passage of ONE route line for every departure from DEPART_FROM to DEPART_TO "
            "(UTC) every DEPART_STEP_H hours, at each speed of SPEEDS_KN (empty: SPEED_KN), through "
            "each sea-state file separately, and ranks the departures.</p>"
            "<p><b>What best means</b> (CRITERION): lowest worst-case motion sickness incidence (MSI); "
            "least time above the acceptable comfort class MAX_CLASS (0 smooth, 1 steady, 2 lively, "
            "3 taxing, 4 punishing); lowest motion sickness dose (ISO 2631-1) at arrival; or the "
            "earliest departure that stays within limits (no sample above MAX_CLASS, inside the "
            "forecast, no IMO MSC.1/Circ.1228 guidance flag).</p>"
            "<p><b>Robust across sources</b>: each departure also gets a row with source "
            "'ALL (worst case)': the worst over the files, with the spread between them. The "
            "recommendation is the best of these rows and is given with its reason in the log and "
            "the report.</p>"
            "<p><b>Outputs</b>: a table (one row per departure x speed x source, plus the robust "
            "rows; fields rank, depart_utc, speed_kn, arrive_utc, duration_h, source, worst_msi_pct, "
            "worst_msi_dist_nm, worst_msi_utc, hrs_c0..hrs_c4 hours per comfort class, hrs_nodata, "
            "hrs_above, msdv_arrival, sick_pct_arrival, flags, n_missing, in_forecast, within_lim, "
            "crit_value, crit_spread, msi_spread); an HTML report with a heat map of comfort by "
            "departure and distance; optionally the point layer of the recommended departure. "
            "Departures whose passage runs past the end of a forecast are kept and marked "
            "in_forecast = false.</p>"
            f"<p><b>Caution</b>: {CAUTION}</p>"
        )

    def initAlgorithm(self, config: Optional[Dict[str, Any]] = None) -> None:  # noqa: N802
        from ..core.sweep.engine import CRITERION_LABELS, CRITERIA

        for p in common.passage_parameters():
            if p.name() not in NOT_SHARED:
                self.addParameter(p)
        self.addParameter(QgsProcessingParameterDateTime(
            DEPART_FROM, self.tr("Earliest departure (UTC)"), QgsProcessingParameterDateTime.Type.DateTime,
        ))
        self.addParameter(QgsProcessingParameterDateTime(
            DEPART_TO, self.tr("Latest departure (UTC)"), QgsProcessingParameterDateTime.Type.DateTime,
        ))
        self.addParameter(QgsProcessingParameterNumber(
            DEPART_STEP_H, self.tr("Step between departures (hours)"), QgsProcessingParameterNumber.Type.Double,
            defaultValue=3.0,
        ))
        self.addParameter(QgsProcessingParameterEnum(
            CRITERION, self.tr("What best means"), [self.tr(CRITERION_LABELS[c].capitalize()) for c in CRITERIA],
            defaultValue=0,
        ))
        self.addParameter(QgsProcessingParameterNumber(
            MAX_CLASS, self.tr("Worst acceptable comfort class (0 smooth .. 4 punishing)"),
            QgsProcessingParameterNumber.Type.Integer, defaultValue=2,
        ))
        self.addParameter(QgsProcessingParameterString(
            SPEEDS_KN, self.tr("Alternative speeds (kn, comma-separated; empty: SPEED_KN)"), optional=True,
        ))
        self.addParameter(QgsProcessingParameterFeatureSink(
            OUTPUT_TABLE, self.tr("Departure table"), QgsProcessing.SourceType.TypeVector,
        ))
        self.addParameter(QgsProcessingParameterFileDestination(
            OUTPUT_REPORT, self.tr("Departure sweep report"), self.tr("HTML files (*.html)"), optional=True,
        ))
        self.addParameter(QgsProcessingParameterFeatureSink(
            OUTPUT_POINTS, self.tr("Samples of the recommended departure"), QgsProcessing.SourceType.TypeVectorPoint,
            optional=True, createByDefault=False,
        ))
        self.addOutput(QgsProcessingOutputString(SUMMARY, self.tr("Summary")))
        self.addOutput(QgsProcessingOutputString(RECOMMENDED_UTC, self.tr("Recommended departure (UTC, ISO 8601)")))
        self.addOutput(QgsProcessingOutputNumber(N_ROWS, self.tr("Rows in the departure table")))

    # hooks of the run skeleton (:meth:`.base.SeawayAlgorithm.processAlgorithm`) ---------------
    def read_settings(self, run: Run) -> SweepJob:
        from ..core.sweep.engine import CRITERIA, parse_speeds_kn

        p, ctx = run.parameters, run.context
        settings = common.parse_passage_settings(self, p, ctx)
        deps = departure_window(self, p, ctx)
        criterion = CRITERIA[self.parameterAsEnum(p, CRITERION, ctx)]
        max_class = common.parse_max_class(self, p, ctx)
        leg, route_src = one_leg(self, run)
        default_speed = leg.speed_kn if leg.speed_kn is not None else settings.speed_kn
        with common.input_error("SPEEDS_KN: "):
            speeds = tuple(parse_speeds_kn(self.parameterAsString(p, SPEEDS_KN, ctx), default_speed))
        step_h = float(self.parameterAsDouble(p, DEPART_STEP_H, ctx))
        return SweepJob(settings, leg, route_src, deps, step_h, speeds, criterion, max_class)

    def compute(self, run: Run, job: SweepJob) -> SweepOutcome:
        from ..core.sweep.engine import sweep_departures

        run.feedback.pushInfo(
            f"Sweeping {job.deps.size} departures ({job.window_text()} UTC) x {len(job.speeds)} speed(s) "
            f"({job.speeds_text()} kn) x {len(job.settings.sea_state_paths)} source(s) on {show(job.leg.name)}; "
            f"best = {job.criterion}, worst acceptable class {job.max_class}")
        leg, method = job.leg, job.settings.method or "table"
        with common.opened_sea(job.settings, run.feedback) as (sources, depth), \
                common.input_error(f"{show(leg.name)}: "):
            result = sweep_departures(
                leg.lon_deg, leg.lat_deg, depart_from_utc=job.deps[0], depart_to_utc=job.deps[-1],
                step_h=job.step_h, sea_states=sources, speeds_kn=list(job.speeds), criterion=job.criterion,
                max_class=job.max_class, progress=run.progress(0.0, 85.0),
                **common.passage_options(job.settings, depth, method))
            points = recommended_passages(run, job, result.recommendation, sources, depth) \
                if run.wants(OUTPUT_POINTS) else ()
        run.feedback.setProgress(88)
        return SweepOutcome(result, points, provenance_text(job, result))

    def write_sinks(self, run: Run, job: SweepJob, outcome: SweepOutcome) -> Dict[str, Any]:
        from .. import adapters
        from ..styling import OutputStyle, apply_metadata_only

        fields = table_fields()
        rows = (_row_feature(fields, row) for row in outcome.result.rows)
        table_style = OutputStyle("Seaway Comfort departure sweep", outcome.abstract, apply_metadata_only, table=True)
        out: Dict[str, Any] = {OUTPUT_TABLE: run.write_sink(
            OUTPUT_TABLE, fields, QgsWkbTypes.Type.NoGeometry, QgsCoordinateReferenceSystem(), rows, table_style)}
        if run.wants(OUTPUT_POINTS):
            pfields = adapters.passage_fields()
            feats = (f for name, res in outcome.points for f in adapters.point_features(res, pfields, name))
            out[OUTPUT_POINTS] = run.write_sink(
                OUTPUT_POINTS, pfields, QgsWkbTypes.Type.Point, QgsCoordinateReferenceSystem(adapters.WGS84), feats,
                OutputStyle("Seaway Comfort recommended departure", outcome.abstract))
        run.feedback.setProgress(94)
        return out

    def write_report(self, run: Run, job: SweepJob, outcome: SweepOutcome) -> Dict[str, Any]:
        import numpy as np

        from ..core.flags import flag_counts
        from ..core.reports.sweep import build_sweep_report, sweep_text_summary, write_sweep_html

        result = outcome.result
        flag_lines = common.flag_warning_lines(flag_counts(result.flags), int(result.flags.size))
        warnings = [*result.notes, *(line.replace(" samples - ", " passages - ") for line in flag_lines)]
        summary = sweep_text_summary(result)
        run.feedback.pushInfo(summary)
        for w in warnings:
            run.feedback.pushWarning(w)
        out: Dict[str, Any] = {SUMMARY: summary, N_ROWS: len(result.rows),
                               RECOMMENDED_UTC: str(np.datetime64(result.recommendation.depart_utc, "s")) + "Z"}
        report_path = run.file_output(OUTPUT_REPORT)
        if report_path:
            report = build_sweep_report(result, report_inputs(job, result), warnings=warnings)
            try:
                write_sweep_html(report_path, report)
            except OSError as exc:
                raise QgsProcessingException(f"OUTPUT_REPORT {show(report_path)} could not be written: {exc}") from exc
            out[OUTPUT_REPORT] = report_path
        return out


def departure_window(alg: SeawayAlgorithm, parameters: Dict[str, Any], context: Any) -> Any:
    """The departures DEPART_FROM .. DEPART_TO every DEPART_STEP_H, checked (at most MAX_DEPARTURES)."""
    from ..core.sweep.engine import MAX_DEPARTURES, departure_times

    t0 = common.parse_datetime(alg, parameters, DEPART_FROM, context, required=True)
    t1 = common.parse_datetime(alg, parameters, DEPART_TO, context, required=True)
    step = alg.parameterAsDouble(parameters, DEPART_STEP_H, context)
    if t1 < t0:
        raise QgsProcessingException(
            f"DEPART_TO {str(t1)[:16]} UTC lies before DEPART_FROM {str(t0)[:16]} UTC: give the end of the "
            "departure window after its start")
    if not (math.isfinite(step) and step > 0):
        raise QgsProcessingException(f"DEPART_STEP_H must be > 0 hours, got {step:g}")
    span_h = float((t1 - t0).astype("timedelta64[ms]").astype("int64")) / 3.6e6
    n = int(math.floor(span_h / step + 1e-9)) + 1
    if n > MAX_DEPARTURES:
        raise QgsProcessingException(
            f"DEPART_FROM to DEPART_TO every DEPART_STEP_H = {step:g} h gives {n} departures, more than the "
            f"limit of {MAX_DEPARTURES}: choose a larger step or a shorter window")
    with common.input_error("DEPART_FROM/DEPART_TO/DEPART_STEP_H: "):
        return departure_times(t0, t1, step)


def one_leg(alg: SeawayAlgorithm, run: Run) -> Tuple[Any, str]:
    """(the one route leg, the route's source text); a layer with several lines is refused."""
    legs, route_src = common.read_route(alg, run.parameters, run.context, run.feedback)
    if len(legs) > 1:
        raise QgsProcessingException(
            f"ROUTE: the departure sweep takes one line (one passage), the layer has {len(legs)} lines or "
            f"parts ({', '.join(repr(leg.name) for leg in legs[:4])}{', ...' if len(legs) > 4 else ''}): select "
            "one feature and tick 'Selected features only', or run the sweep once per line")
    if legs[0].departure_utc is not None:
        run.feedback.pushInfo(f"The route field depart_utc of {show(legs[0].name)} is not used: the sweep departs "
                              "at every step from DEPART_FROM to DEPART_TO")
    return legs[0], route_src


def recommended_passages(run: Run, job: SweepJob, rec: Any, sources: List[Any], depth: Any) -> Tuple[Any, ...]:
    """(label, PassageResult) of the recommended departure and speed, one per source."""
    from ..core.passage.pipeline import PassageCancelled, compute_passage

    out: List[Tuple[str, Any]] = []
    for src in sources:
        if run.feedback.isCanceled():
            raise PassageCancelled("cancelled")
        res = compute_passage(
            job.leg.lon_deg, job.leg.lat_deg, departure_utc=rec.depart_utc, speed_kn=rec.speed_kn,
            sea_states=[src], leg=len(out), **common.passage_options(job.settings, depth, job.settings.method or "table"))
        out.append((f"{job.leg.name} [{src.name}]", res))
    return tuple(out)


def provenance_text(job: SweepJob, result: Any) -> str:
    """The metadata abstract of the outputs: what went in, the recommendation, the caution."""
    s = job.settings
    return (
        f"Seaway Comfort departure sweep. Route: {job.route_source} ({job.leg.name}). Sea-state files: "
        f"{'; '.join(s.sea_state_paths)} (sources {', '.join(result.source_names)}, each on its own). "
        f"Bathymetry: {s.depth_path or 'none (deep water)'}. Vessel: {getattr(s.profile, 'name', s.vessel_spec)} "
        f"({s.vessel_spec}); station: {result.station_name}. Departures: {job.deps.size} from "
        f"{job.window_text()} UTC; speeds {job.speeds_text()} kn; spacing {s.spacing_nm:g} NM; "
        f"JONSWAP gamma {s.gamma:g}, {'long-crested' if s.long_crested else f'cos-2s s {s.spread_s:g}'}; "
        f"best = {job.criterion}, worst acceptable class {job.max_class}. "
        f"Recommended: {result.recommendation.reason} {CAUTION}"
    )


def report_inputs(job: SweepJob, result: Any) -> Any:
    """What went in, as the sweep report lists it."""
    from ..core.reports.passage import ReportInputs

    s = job.settings
    return ReportInputs(
        sea_state_files=s.sea_state_paths, source_names=result.source_names,
        bathymetry=s.depth_path or "", route=f"{job.route_source} ({job.leg.name})",
        vessel=f"{getattr(s.profile, 'name', s.vessel_spec)} ({s.vessel_spec})", station=result.station_name,
        departure_utc=f"{job.window_text().replace('T', ' ')} UTC every {job.step_h:g} h",
        speed_kn=", ".join(f"{v:g} kn" for v in job.speeds), spacing_nm=f"{s.spacing_nm:g} NM",
        spectrum=common.spectrum_text(s), method=result.method,
    )
