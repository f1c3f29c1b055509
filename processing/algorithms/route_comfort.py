# SPDX-License-Identifier: GPL-2.0-or-later
"""Processing algorithm ``seawaycomfort:routecomfort``: comfort and motions along a route."""
from __future__ import annotations

from typing import Any, Dict, List, Optional, Tuple

from qgis.core import (
    QgsCoordinateReferenceSystem,
    QgsFeatureSink,
    QgsProcessing,
    QgsProcessingContext,
    QgsProcessingException,
    QgsProcessingFeedback,
    QgsProcessingOutputNumber,
    QgsProcessingOutputString,
    QgsProcessingParameterFeatureSink,
    QgsProcessingParameterFileDestination,
    QgsWkbTypes,
)

from .base import SeawayAlgorithm
from ..core.flags import CAUTION
from ..core.validation import SeawayInputError, show
from . import common

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


class RouteComfortAlgorithm(SeawayAlgorithm):
    """Motions, comfort indices and guidance flags at every sample along a route."""

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

    # -----------------------------------------------------------------------------------------
    def processAlgorithm(  # noqa: N802
        self, parameters: Dict[str, Any], context: QgsProcessingContext, feedback: QgsProcessingFeedback
    ) -> Dict[str, Any]:
        from .. import adapters, styling
        from ..core.passage.pipeline import PassageCancelled, compute_passage
        from ..core.reports.passage import ReportInputs, build_report, text_summary, write_html

        feedback = feedback or QgsProcessingFeedback()
        settings = common.parse_passage_settings(self, parameters, context)
        legs, route_src = common.read_route(self, parameters, context, feedback)

        points_dest = self.parameterAsOutputLayer(parameters, OUTPUT_POINTS, context)
        segs_dest = self.parameterAsOutputLayer(parameters, OUTPUT_SEGMENTS, context)
        report_path = self.parameterAsFileOutput(parameters, OUTPUT_REPORT, context) if parameters.get(OUTPUT_REPORT) else ""
        inputs = [route_src, *settings.sea_state_paths] + ([settings.depth_path] if settings.depth_path else [])
        inputs += common.vessel_input_files(settings.vessel_spec, settings.profile)
        common.check_outputs(
            [(OUTPUT_POINTS, points_dest), (OUTPUT_SEGMENTS, segs_dest), (OUTPUT_REPORT, report_path)], inputs,
        )
        dests = [d for d in (points_dest, segs_dest, report_path) if d and not str(d).startswith(("memory:", "TEMPORARY"))]
        if len({common.file_part(d) for d in dests}) < len(dests):
            raise QgsProcessingException(
                "OUTPUT_POINTS, OUTPUT_SEGMENTS and OUTPUT_REPORT must be different files"
            )

        sources = common.open_sources(settings, feedback)
        depth = common.open_depth(settings)
        groups: List[Tuple[str, List[Any]]]
        if settings.source_mode == "compare" and len(sources) > 1:
            groups = [(s.name, [s]) for s in sources]
        else:
            groups = [("", sources)]
        n_jobs = len(legs) * len(groups)
        results: List[Tuple[str, Any]] = []
        try:
            for j, leg in enumerate(legs):
                departure = leg.departure_utc if leg.departure_utc is not None else settings.departure_utc
                if departure is None:
                    raise QgsProcessingException(
                        f"DEPARTURE: leg {show(leg.name)} has no departure time: set DEPARTURE or fill the "
                        "route field depart_utc"
                    )
                speed = leg.speed_kn if leg.speed_kn is not None else settings.speed_kn
                for g, (gname, group) in enumerate(groups):
                    k = j * len(groups) + g
                    label = leg.name if not gname else f"{leg.name} [{gname}]"
                    feedback.pushInfo(f"Leg {len(results) + 1}: {label}, departing {str(departure)[:16]} UTC at {speed:g} kn")

                    def progress(fraction: float, k: int = k) -> bool:
                        feedback.setProgress(100.0 * (k + fraction) / n_jobs * 0.9)
                        return not feedback.isCanceled()

                    try:
                        res = compute_passage(
                            leg.lon_deg, leg.lat_deg, departure_utc=departure, speed_kn=speed,
                            sea_states=group, profile=settings.profile, station=settings.station,
                            depth=depth, spacing_nm=settings.spacing_nm, gamma=settings.gamma,
                            spread_s=settings.spread_s, long_crested=settings.long_crested,
                            progress=progress, leg=len(results), method=settings.method,
                        )
                    except SeawayInputError as exc:
                        raise QgsProcessingException(f"leg {show(leg.name)}: {exc}") from exc
                    results.append((label, res))
        except PassageCancelled as exc:
            raise QgsProcessingException("Cancelled: no outputs were written") from exc
        finally:
            for s in sources:
                s.close()
            if depth is not None:
                depth.close()

        fields = adapters.passage_fields()
        crs = QgsCoordinateReferenceSystem(adapters.WGS84)
        sink, points_id = self.parameterAsSink(parameters, OUTPUT_POINTS, context, fields, QgsWkbTypes.Type.Point, crs)
        if sink is None:
            raise QgsProcessingException(f"OUTPUT_POINTS {show(points_dest)} could not be created: check the path")
        for name, res in results:
            for f in adapters.point_features(res, fields, name):
                sink.addFeature(f, QgsFeatureSink.Flag.FastInsert)
        del sink
        sink, segs_id = self.parameterAsSink(parameters, OUTPUT_SEGMENTS, context, fields, QgsWkbTypes.Type.LineString, crs)
        if sink is None:
            raise QgsProcessingException(f"OUTPUT_SEGMENTS {show(segs_dest)} could not be created: check the path")
        for name, res in results:
            for f in adapters.segment_features(res, fields, name):
                sink.addFeature(f, QgsFeatureSink.Flag.FastInsert)
        del sink
        feedback.setProgress(92)

        abstract = provenance_text(settings, route_src)
        for dest_id, title in ((points_id, "Seaway Comfort passage samples"), (segs_id, "Seaway Comfort passage segments")):
            layer_in_context = context.getMapLayer(dest_id) if dest_id else None
            if layer_in_context is not None and layer_in_context.providerType() == "memory":
                styling.apply_comfort_style(layer_in_context, title=title, abstract=abstract)
            elif dest_id:
                qml, warns = styling.save_output_style(dest_id, title=title, abstract=abstract)
                for w in warns:
                    feedback.pushWarning(w)
            if context.willLoadLayerOnCompletion(dest_id):
                context.layerToLoadOnCompletionDetails(dest_id).setPostProcessor(
                    styling.ComfortStylePostProcessor.create(title, abstract)
                )

        vessel_name = getattr(settings.profile, "name", settings.vessel_spec)
        rinputs = ReportInputs(
            sea_state_files=settings.sea_state_paths,
            source_names=tuple(s.name for s in sources),
            bathymetry=settings.depth_path or "",
            route=route_src,
            vessel=vessel_name if str(settings.vessel_spec) == str(vessel_name) else f"{vessel_name} ({settings.vessel_spec})",
            station=results[0][1].station_name if results else (settings.station or ""),
            departure_utc=(str(settings.departure_utc.astype("datetime64[m]")).replace("T", " ") + " UTC")
            if settings.departure_utc is not None else "per route feature",
            speed_kn=f"{settings.speed_kn:g} kn (route field speed_kn overrides)",
            spacing_nm=f"{settings.spacing_nm:g} NM",
            spectrum=f"JONSWAP gamma {settings.gamma:g}, "
            + ("long-crested" if settings.long_crested else f"cos-2s spreading s = {settings.spread_s:g}"),
            method=results[0][1].method if results else "",
            extra=(("Mode with several sources", settings.source_mode),),
        )
        all_warnings: List[str] = []
        n_total = sum(r.n for _, r in results)
        from ..core.flags import flag_counts
        import numpy as np

        counts = flag_counts(np.concatenate([r.flags for _, r in results])) if results else {}
        for line in common.flag_warning_lines(counts, n_total):
            all_warnings.append(line)
        report = build_report(results, rinputs, warnings=all_warnings)
        if all_warnings:
            feedback.pushWarning("Flagged samples:")
            for line in all_warnings:
                feedback.pushWarning("  " + line)
        summary = text_summary(report)
        feedback.pushInfo(summary)
        out: Dict[str, Any] = {OUTPUT_POINTS: points_id, OUTPUT_SEGMENTS: segs_id, SUMMARY: summary, N_SAMPLES: n_total}
        if report_path:
            try:
                write_html(report_path, report)
            except OSError as exc:
                raise QgsProcessingException(f"OUTPUT_REPORT {show(report_path)} could not be written: {exc}") from exc
            out[OUTPUT_REPORT] = report_path
        feedback.setProgress(100)
        return out
