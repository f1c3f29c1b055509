# SPDX-License-Identifier: GPL-2.0-or-later
"""Processing algorithm ``seawaycomfort:departuresweep``: when to leave, across forecast sources.

The route, sea-state, vessel and spectrum parameters are those of ``routecomfort``
(:func:`.common.passage_parameters`, parsed by :func:`.common.parse_passage_settings`) without
DEPARTURE and SOURCE_MODE (the sweep always compares every source); the sources are opened
and the recommended passage's points written with the routecomfort helpers. The numbers come
from :func:`..core.sweep.sweep_departures`.
"""
from __future__ import annotations

import math
import os
from typing import Any, Dict, List, Optional

from qgis.core import (
    QgsCoordinateReferenceSystem,
    QgsFeature,
    QgsFeatureRequest,
    QgsFeatureSink,
    QgsFields,
    QgsProcessing,
    QgsProcessingContext,
    QgsProcessingException,
    QgsProcessingFeedback,
    QgsProcessingOutputNumber,
    QgsProcessingOutputString,
    QgsProcessingParameterDateTime,
    QgsProcessingParameterEnum,
    QgsProcessingParameterFeatureSink,
    QgsProcessingParameterFileDestination,
    QgsProcessingParameterNumber,
    QgsProcessingParameterString,
    QgsVectorLayer,
    QgsWkbTypes,
)
from qgis.PyQt.QtCore import QVariant

from .base import SeawayAlgorithm
from ..core.flags import CAUTION
from ..core.validation import SeawayInputError, show
from . import common

DEPART_FROM = "DEPART_FROM"
DEPART_TO = "DEPART_TO"
DEPART_STEP_H = "DEPART_STEP_H"
CRITERION = "CRITERION"
MAX_CLASS = "MAX_CLASS"
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


class DepartureSweepAlgorithm(SeawayAlgorithm):
    """Sweep departure times (and speeds) over every forecast source; rank and recommend."""

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

    # -----------------------------------------------------------------------------------------
    def _datetime(self, parameters: Dict[str, Any], name: str, context: QgsProcessingContext) -> Any:
        from .. import adapters

        raw = parameters.get(name)
        if raw in (None, ""):
            raise QgsProcessingException(f"{name} is required: give a UTC date-time, e.g. 2031-03-11T06:00:00Z")
        qdt = self.parameterAsDateTime(parameters, name, context)
        if qdt is None or not qdt.isValid():
            raise QgsProcessingException(
                f"{name} {show(raw)} is not a valid date-time: use ISO 8601, e.g. 2031-03-11T06:00:00Z (UTC)")
        return adapters.datetime64_from_qdatetime(qdt, assume_utc=True)

    def _window(self, parameters: Dict[str, Any], context: QgsProcessingContext) -> Any:
        from ..core.sweep.engine import MAX_DEPARTURES, departure_times

        t0 = self._datetime(parameters, DEPART_FROM, context)
        t1 = self._datetime(parameters, DEPART_TO, context)
        step = self.parameterAsDouble(parameters, DEPART_STEP_H, context)
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
        try:
            return departure_times(t0, t1, step)
        except SeawayInputError as exc:
            raise QgsProcessingException(f"DEPART_FROM/DEPART_TO/DEPART_STEP_H: {exc}") from exc

    def processAlgorithm(  # noqa: N802
        self, parameters: Dict[str, Any], context: QgsProcessingContext, feedback: QgsProcessingFeedback
    ) -> Dict[str, Any]:
        import numpy as np

        from .. import adapters, styling
        from ..core.passage.pipeline import PassageCancelled, compute_passage
        from ..core.reports.passage import ReportInputs
        from ..core.sweep.engine import CRITERIA, parse_speeds_kn, sweep_departures
        from ..core.reports.sweep import build_sweep_report, sweep_text_summary, write_sweep_html

        feedback = feedback or QgsProcessingFeedback()
        settings = common.parse_passage_settings(self, parameters, context)
        deps = self._window(parameters, context)
        criterion = CRITERIA[self.parameterAsEnum(parameters, CRITERION, context)]
        max_class_raw = parameters.get(MAX_CLASS, 2)
        max_class = self.parameterAsInt(parameters, MAX_CLASS, context)
        try:
            ok_class = float(max_class_raw) == max_class and 0 <= max_class <= 4
        except (TypeError, ValueError):
            ok_class = False
        if not ok_class:
            raise QgsProcessingException(
                f"MAX_CLASS must be a whole number 0..4 (0 smooth, 1 steady, 2 lively, 3 taxing, 4 punishing), "
                f"got {show(max_class_raw)}")

        context.setInvalidGeometryCheck(QgsFeatureRequest.InvalidGeometryCheck.GeometryNoCheck)
        source = self.parameterAsSource(parameters, common.ROUTE, context)
        route_layer = self.parameterAsVectorLayer(parameters, common.ROUTE, context)
        route_src = route_layer.source() if route_layer is not None else str(parameters.get(common.ROUTE))
        legs = adapters.route_legs(source, context, feedback=feedback)
        if not legs:
            raise QgsProcessingException("ROUTE: no line could be read from the route layer")
        if len(legs) > 1:
            raise QgsProcessingException(
                f"ROUTE: the departure sweep takes one line (one passage), the layer has {len(legs)} lines or "
                f"parts ({', '.join(repr(l.name) for l in legs[:4])}{', ...' if len(legs) > 4 else ''}): select "
                "one feature and tick 'Selected features only', or run the sweep once per line")
        leg = legs[0]
        if leg.departure_utc is not None:
            feedback.pushInfo(f"The route field depart_utc of {show(leg.name)} is not used: the sweep departs at "
                              "every step from DEPART_FROM to DEPART_TO")
        default_speed = leg.speed_kn if leg.speed_kn is not None else settings.speed_kn
        try:
            speeds = parse_speeds_kn(self.parameterAsString(parameters, SPEEDS_KN, context), default_speed)
        except SeawayInputError as exc:
            raise QgsProcessingException(f"SPEEDS_KN: {exc}") from exc

        table_dest = self.parameterAsOutputLayer(parameters, OUTPUT_TABLE, context)
        points_dest = self.parameterAsOutputLayer(parameters, OUTPUT_POINTS, context) if parameters.get(OUTPUT_POINTS) else ""
        report_path = self.parameterAsFileOutput(parameters, OUTPUT_REPORT, context) if parameters.get(OUTPUT_REPORT) else ""
        inputs = [route_src, *settings.sea_state_paths] + ([settings.depth_path] if settings.depth_path else [])
        inputs += common.vessel_input_files(settings.vessel_spec, settings.profile)
        common.check_outputs([(OUTPUT_TABLE, table_dest), (OUTPUT_POINTS, points_dest), (OUTPUT_REPORT, report_path)],
                             inputs)
        dests = [d for d in (table_dest, points_dest, report_path) if d and not str(d).startswith(("memory:", "TEMPORARY"))]
        if len({common.file_part(d) for d in dests}) < len(dests):
            raise QgsProcessingException("OUTPUT_TABLE, OUTPUT_POINTS and OUTPUT_REPORT must be different files")

        feedback.pushInfo(
            f"Sweeping {deps.size} departures ({str(deps[0])[:16]} to {str(deps[-1])[:16]} UTC) x {len(speeds)} "
            f"speed(s) ({', '.join(f'{v:g}' for v in speeds)} kn) x {len(settings.sea_state_paths)} source(s) on "
            f"{show(leg.name)}; best = {criterion}, worst acceptable class {max_class}")
        sources = common.open_sources(settings, feedback)
        depth = common.open_depth(settings)
        method = settings.method or "table"

        def progress(fraction: float) -> bool:
            feedback.setProgress(85.0 * fraction)
            return not feedback.isCanceled()

        points_results: List[Any] = []
        try:
            try:
                result = sweep_departures(
                    leg.lon_deg, leg.lat_deg, depart_from_utc=deps[0], depart_to_utc=deps[-1],
                    step_h=float(self.parameterAsDouble(parameters, DEPART_STEP_H, context)), sea_states=sources,
                    profile=settings.profile, speeds_kn=speeds, criterion=criterion, max_class=max_class,
                    station=settings.station, depth=depth, spacing_nm=settings.spacing_nm, gamma=settings.gamma,
                    spread_s=settings.spread_s, long_crested=settings.long_crested, method=method,
                    progress=progress,
                )
                rec = result.recommendation
                if points_dest:
                    for src in sources:
                        if feedback.isCanceled():
                            raise PassageCancelled("cancelled")
                        res = compute_passage(
                            leg.lon_deg, leg.lat_deg, departure_utc=rec.depart_utc, speed_kn=rec.speed_kn,
                            sea_states=[src], profile=settings.profile, station=settings.station, depth=depth,
                            spacing_nm=settings.spacing_nm, gamma=settings.gamma, spread_s=settings.spread_s,
                            long_crested=settings.long_crested, method=method, leg=len(points_results),
                        )
                        points_results.append((f"{leg.name} [{src.name}]", res))
            except SeawayInputError as exc:
                raise QgsProcessingException(f"{show(leg.name)}: {exc}") from exc
        except PassageCancelled as exc:
            raise QgsProcessingException("Cancelled: no outputs were written") from exc
        finally:
            for s in sources:
                s.close()
            if depth is not None:
                depth.close()
        feedback.setProgress(88)

        # the table
        fields = table_fields()
        sink, table_id = self.parameterAsSink(parameters, OUTPUT_TABLE, context, fields, QgsWkbTypes.Type.NoGeometry,
                                              QgsCoordinateReferenceSystem())
        if sink is None:
            raise QgsProcessingException(f"OUTPUT_TABLE {show(table_dest)} could not be created: check the path")
        for row in result.rows:
            f = QgsFeature(fields)
            f.setAttributes(_row_attributes(row))
            sink.addFeature(f, QgsFeatureSink.Flag.FastInsert)
        del sink
        vessel_name = getattr(settings.profile, "name", settings.vessel_spec)
        abstract = (
            f"Seaway Comfort departure sweep. Route: {route_src} ({leg.name}). Sea-state files: "
            f"{'; '.join(settings.sea_state_paths)} (sources {', '.join(result.source_names)}, each on its own). "
            f"Bathymetry: {settings.depth_path or 'none (deep water)'}. Vessel: {vessel_name} "
            f"({settings.vessel_spec}); station: {result.station_name}. Departures: {deps.size} from "
            f"{str(deps[0])[:16]} to {str(deps[-1])[:16]} UTC; speeds {', '.join(f'{v:g}' for v in speeds)} kn; "
            f"spacing {settings.spacing_nm:g} NM; JONSWAP gamma {settings.gamma:g}, "
            f"{'long-crested' if settings.long_crested else f'cos-2s s {settings.spread_s:g}'}; best = {criterion}, "
            f"worst acceptable class {max_class}. Recommended: {rec.reason} {CAUTION}"
        )
        self._table_metadata(table_id, context, abstract, feedback)

        out: Dict[str, Any] = {OUTPUT_TABLE: table_id}
        if points_dest:
            crs = QgsCoordinateReferenceSystem(adapters.WGS84)
            pfields = adapters.passage_fields()
            psink, points_id = self.parameterAsSink(parameters, OUTPUT_POINTS, context, pfields,
                                                    QgsWkbTypes.Type.Point, crs)
            if psink is None:
                raise QgsProcessingException(f"OUTPUT_POINTS {show(points_dest)} could not be created: check the path")
            for name, res in points_results:
                for f in adapters.point_features(res, pfields, name):
                    psink.addFeature(f, QgsFeatureSink.Flag.FastInsert)
            del psink
            title = "Seaway Comfort recommended departure"
            layer_in_context = context.getMapLayer(points_id) if points_id else None
            if layer_in_context is not None and layer_in_context.providerType() == "memory":
                styling.apply_comfort_style(layer_in_context, title=title, abstract=abstract)
            elif points_id:
                _, warns = styling.save_output_style(points_id, title=title, abstract=abstract)
                for w in warns:
                    feedback.pushWarning(w)
            if context.willLoadLayerOnCompletion(points_id):
                context.layerToLoadOnCompletionDetails(points_id).setPostProcessor(
                    styling.ComfortStylePostProcessor.create(title, abstract))
            out[OUTPUT_POINTS] = points_id
        feedback.setProgress(94)

        warnings: List[str] = list(result.notes)
        from ..core.flags import flag_counts

        counts = flag_counts(result.flags)
        flag_lines = common.flag_warning_lines(counts, int(result.flags.size))
        warnings.extend(line.replace(" samples - ", " passages - ") for line in flag_lines)
        summary = sweep_text_summary(result)
        feedback.pushInfo(summary)
        for w in warnings:
            feedback.pushWarning(w)
        if report_path:
            rinputs = ReportInputs(
                sea_state_files=settings.sea_state_paths, source_names=result.source_names,
                bathymetry=settings.depth_path or "", route=f"{route_src} ({leg.name})",
                vessel=f"{vessel_name} ({settings.vessel_spec})", station=result.station_name,
                departure_utc=f"{str(deps[0])[:16].replace('T', ' ')} to {str(deps[-1])[:16].replace('T', ' ')} UTC "
                              f"every {self.parameterAsDouble(parameters, DEPART_STEP_H, context):g} h",
                speed_kn=", ".join(f"{v:g} kn" for v in speeds), spacing_nm=f"{settings.spacing_nm:g} NM",
                spectrum=f"JONSWAP gamma {settings.gamma:g}, "
                + ("long-crested" if settings.long_crested else f"cos-2s spreading s = {settings.spread_s:g}"),
                method=result.method,
            )
            report = build_sweep_report(result, rinputs, warnings=warnings)
            try:
                write_sweep_html(report_path, report)
            except OSError as exc:
                raise QgsProcessingException(f"OUTPUT_REPORT {show(report_path)} could not be written: {exc}") from exc
            out[OUTPUT_REPORT] = report_path
        out[SUMMARY] = summary
        out[RECOMMENDED_UTC] = str(np.datetime64(rec.depart_utc, "s")) + "Z"
        out[N_ROWS] = len(result.rows)
        feedback.setProgress(100)
        return out

    @staticmethod
    def _table_metadata(table_id: str, context: QgsProcessingContext, abstract: str,
                        feedback: QgsProcessingFeedback) -> None:
        """Provenance and caution in the table's metadata (memory layer) or a .qmd beside the file."""
        from .. import styling

        title = "Seaway Comfort departure sweep"
        layer = context.getMapLayer(table_id) if table_id else None
        if layer is not None and layer.providerType() == "memory":
            styling.apply_metadata(layer, title, abstract)
            return
        if not table_id:
            return
        styling.mark_datetimes_utc(table_id)
        lyr = QgsVectorLayer(table_id, os.path.basename(str(table_id)), "ogr")
        if not lyr.isValid():
            feedback.pushWarning(f"could not reopen {show(table_id)} to save its metadata")
            return
        styling.apply_metadata(lyr, title, abstract)
        qmd = styling.qml_path_for(table_id)[: -len(".qml")] + ".qmd"
        msg, ok = lyr.saveNamedMetadata(qmd)
        if not ok:
            feedback.pushWarning(f"metadata not saved to {show(qmd)}: {msg}")
