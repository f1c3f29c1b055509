# SPDX-License-Identifier: GPL-2.0-or-later
"""Processing algorithm ``seawaycomfort:seasonalclimate``: seasonal comfort climate of a route.

QGIS glue only: reads the parameters, converts the route layer with the shared adapters, runs
:func:`..core.climate.compute_climate` (chunks on a local process pool or a Dask cluster), and
writes the segment layer (styled by the share of acceptable time, QML beside the output), the
CSV table and the HTML report.
"""
from __future__ import annotations

import os
from typing import Any, ClassVar, Dict, List, Optional

from qgis.core import (
    QgsCoordinateReferenceSystem,
    QgsFeature,
    QgsFeatureRequest,
    QgsFeatureSink,
    QgsFields,
    QgsGeometry,
    QgsGraduatedSymbolRenderer,
    QgsLineSymbol,
    QgsPointXY,
    QgsProcessing,
    QgsProcessingContext,
    QgsProcessingException,
    QgsProcessingFeedback,
    QgsProcessingLayerPostProcessorInterface,
    QgsProcessingOutputString,
    QgsProcessingParameterBoolean,
    QgsProcessingParameterDefinition,
    QgsProcessingParameterFeatureSink,
    QgsProcessingParameterFeatureSource,
    QgsProcessingParameterFileDestination,
    QgsProcessingParameterMultipleLayers,
    QgsProcessingParameterNumber,
    QgsProcessingParameterString,
    QgsRendererRange,
    QgsVectorLayer,
    QgsWkbTypes,
)
from qgis.PyQt.QtCore import QVariant
from qgis.PyQt.QtGui import QColor

from ..core.flags import CAUTION
from ..core.validation import SeawayInputError, show
from . import common
from .base import SeawayAlgorithm

HINDCAST = "HINDCAST"
MONTHS = "MONTHS"
MAX_CLASS = "MAX_CLASS"
SCHEDULER = "SCHEDULER"
WORKERS = "WORKERS"
FALLBACK_LOCAL = "FALLBACK_LOCAL"
OUTPUT_SEGMENTS = "OUTPUT_SEGMENTS"
OUTPUT_CSV = "OUTPUT_CSV"
OUTPUT_REPORT = "OUTPUT_REPORT"
SUMMARY = "SUMMARY"

STYLE_FIELD = "ok_sel"
"""Field the segment layer is styled on: mean share of acceptable time over the chosen months."""


def _advanced(p: QgsProcessingParameterDefinition) -> QgsProcessingParameterDefinition:
    p.setFlags(p.flags() | QgsProcessingParameterDefinition.Flag.FlagAdvanced)
    return p


def share_renderer() -> QgsGraduatedSymbolRenderer:
    """Graduated renderer on :data:`STYLE_FIELD` with the climate palette (our own colours)."""
    from ..core.reports.climate import SHARE_BOUNDS, SHARE_PALETTE

    edges = [0.0, *SHARE_BOUNDS, 1.0]
    ranges = []
    for k, colour in enumerate(SHARE_PALETTE):
        sym = QgsLineSymbol.createSimple({"line_color": colour, "line_width": "1.6", "capstyle": "round"})
        sym.setColor(QColor(colour))
        label = f"{100 * edges[k]:.0f}-{100 * edges[k + 1]:.0f} % of the time acceptable"
        ranges.append(QgsRendererRange(edges[k], edges[k + 1], sym, label))
    return QgsGraduatedSymbolRenderer(STYLE_FIELD, ranges)


def apply_share_style(layer: QgsVectorLayer, *, title: str = "", abstract: str = "") -> None:
    from ..styling import apply_metadata

    layer.setRenderer(share_renderer())
    if title or abstract:
        apply_metadata(layer, title, abstract)
    layer.triggerRepaint()


class ShareStylePostProcessor(QgsProcessingLayerPostProcessorInterface):
    """Styles the segment layer when Processing loads it into the project."""

    _alive: ClassVar[List["ShareStylePostProcessor"]] = []

    def __init__(self, title: str = "", abstract: str = "") -> None:
        super().__init__()
        self.title, self.abstract = title, abstract

    def postProcessLayer(self, layer: Any, context: Any, feedback: Any) -> None:  # noqa: N802
        if isinstance(layer, QgsVectorLayer):
            apply_share_style(layer, title=self.title, abstract=self.abstract)

    @classmethod
    def create(cls, title: str, abstract: str) -> "ShareStylePostProcessor":
        inst = cls(title, abstract)
        cls._alive.append(inst)  # Processing keeps only a raw pointer
        return inst


def segment_fields() -> QgsFields:
    from ..adapters import make_field

    fields = QgsFields()
    for name, kind in (("seq", "int"), ("route_segment", "int"), ("dist_from_nm", "double"),
                       ("dist_to_nm", "double")):
        fields.append(make_field(name, kind))
    for m in range(1, 13):
        fields.append(make_field(f"ok_m{m:02d}", "double"))
    for name in (STYLE_FIELD, "exceed_sel"):
        fields.append(make_field(name, "double"))
    fields.append(make_field("max_class", "int"))
    return fields


class SeasonalClimateAlgorithm(SeawayAlgorithm):
    """Per-month share of comfortable time, weather windows and waiting times along a route."""

    def name(self) -> str:
        return "seasonalclimate"

    def displayName(self) -> str:  # noqa: N802
        return self.tr("Seasonal comfort climate along a route")

    def shortHelpString(self) -> str:  # noqa: N802
        return self.tr(
            "<p>From years of hindcast sea states (NetCDF-CF or GRIB2 files with significant wave "
            "height, a period and a direction, all on one grid and time step), works out for every "
            "calendar month how often the passage along the route is comfortable enough.</p>"
            "<p>Every hindcast time step is evaluated at every route sample (spacing 1 NM) through the "
            "vessel's response table (built once), giving the comfort class 0-4 (smooth, steady, "
            "lively, taxing, punishing) at the station. Per month: the share of time within "
            "MAX_CLASS per segment and for the whole route, how often the station's seakeeping "
            "criteria are exceeded, the probability that a departure in that month keeps the whole "
            "passage (vessel moving at SPEED_KN, class taken at the nearest hindcast step when the "
            "vessel reaches each sample) within MAX_CLASS, and the mean wait from a random moment "
            "of the month to the next such departure.</p>"
            "<p>Gaps in the hindcast are reported and never interpolated; files that overlap in time "
            "are reported (the file listed first is used); files on different grids are refused.</p>"
            "<p><b>Computation</b>: chunks of time run on WORKERS local processes, or on a Dask "
            "cluster when SCHEDULER (tcp://host:port) is given; FALLBACK_LOCAL computes locally if the "
            "scheduler cannot be reached.</p>"
            "<p><b>Outputs</b>: segments with ok_m01..ok_m12 (share 0-1; NULL for months not chosen), "
            f"{STYLE_FIELD} (mean over the chosen months, used for the style), a CSV table and an "
            "HTML report.</p>"
            f"<p><b>Caution</b>: {CAUTION}</p>"
        )

    def initAlgorithm(self, config: Optional[Dict[str, Any]] = None) -> None:  # noqa: N802
        from ..core.vessel.profile import builtin_profile_names

        names = builtin_profile_names()
        default_vessel = common.DEFAULT_VESSEL if common.DEFAULT_VESSEL in names else (names[0] if names else "")
        self.addParameter(QgsProcessingParameterFeatureSource(
            common.ROUTE, self.tr("Route (line layer; the first line is used)"), [QgsProcessing.SourceType.TypeVectorLine]))
        self.addParameter(QgsProcessingParameterMultipleLayers(
            HINDCAST, self.tr("Hindcast files (NetCDF-CF or GRIB2, any number of years)"),
            QgsProcessing.SourceType.TypeFile))
        self.addParameter(QgsProcessingParameterString(
            common.VESSEL, self.tr("Vessel profile: a JSON file or a profile name ({})").format(", ".join(names)),
            defaultValue=default_vessel))
        self.addParameter(QgsProcessingParameterNumber(
            common.SPEED_KN, self.tr("Speed through the water (kn)"), QgsProcessingParameterNumber.Type.Double,
            defaultValue=8.0))
        self.addParameter(QgsProcessingParameterString(
            common.STATION, self.tr("Station on board (default: the profile's first)"), optional=True))
        self.addParameter(QgsProcessingParameterString(
            MONTHS, self.tr("Months (e.g. 1-12, 6,7,8 or 11-2)"), defaultValue="1-12", optional=True))
        self.addParameter(QgsProcessingParameterNumber(
            MAX_CLASS, self.tr("Worst acceptable comfort class (0 smooth ... 4 punishing)"),
            QgsProcessingParameterNumber.Type.Integer, defaultValue=1, minValue=0, maxValue=4))
        self.addParameter(_advanced(QgsProcessingParameterString(
            SCHEDULER, self.tr("Dask scheduler address (tcp://host:port; empty = local processes)"), optional=True)))
        self.addParameter(_advanced(QgsProcessingParameterNumber(
            WORKERS, self.tr("Local worker processes"), QgsProcessingParameterNumber.Type.Integer, defaultValue=2,
            minValue=1)))
        self.addParameter(_advanced(QgsProcessingParameterBoolean(
            FALLBACK_LOCAL, self.tr("Compute locally if the Dask scheduler cannot be reached"), defaultValue=False)))
        self.addParameter(_advanced(QgsProcessingParameterNumber(
            common.GAMMA, self.tr("JONSWAP peak enhancement gamma (1 = Pierson-Moskowitz)"),
            QgsProcessingParameterNumber.Type.Double, defaultValue=3.3)))
        self.addParameter(_advanced(QgsProcessingParameterNumber(
            common.SPREAD_S, self.tr("Directional spreading exponent s (cos-2s)"),
            QgsProcessingParameterNumber.Type.Double, defaultValue=4.0)))
        self.addParameter(QgsProcessingParameterFeatureSink(
            OUTPUT_SEGMENTS, self.tr("Seasonal climate segments"), QgsProcessing.SourceType.TypeVectorLine))
        self.addParameter(QgsProcessingParameterFileDestination(
            OUTPUT_CSV, self.tr("Seasonal climate table"), self.tr("CSV files (*.csv)"), optional=True))
        self.addParameter(QgsProcessingParameterFileDestination(
            OUTPUT_REPORT, self.tr("Seasonal climate report"), self.tr("HTML files (*.html)"), optional=True))
        self.addOutput(QgsProcessingOutputString(SUMMARY, self.tr("Summary")))

    # -----------------------------------------------------------------------------------------
    def _settings(self, parameters: Dict[str, Any], context: QgsProcessingContext) -> Dict[str, Any]:
        from ..core.climate import make_backend, parse_months

        paths = [str(p) for p in (self.parameterAsFileList(parameters, HINDCAST, context) or []) if str(p)]
        if not paths:
            raise QgsProcessingException("HINDCAST: give at least one hindcast file (NetCDF-CF or GRIB2)")
        for p in paths:
            if not os.path.isfile(p):
                raise QgsProcessingException(f"HINDCAST: file {show(p)} does not exist")
        speed = common.checked_speed_kn(self.parameterAsDouble(parameters, common.SPEED_KN, context))
        raw_max = parameters.get(MAX_CLASS, 1)
        max_class = self.parameterAsInt(parameters, MAX_CLASS, context)
        try:
            if float(raw_max if raw_max not in (None, "") else 1) != max_class or not 0 <= max_class <= 4:
                raise ValueError
        except (TypeError, ValueError):
            raise QgsProcessingException(f"MAX_CLASS must be a whole number 0..4, got {show(raw_max)}") from None
        months_text = self.parameterAsString(parameters, MONTHS, context)
        try:
            months = parse_months(months_text)
        except SeawayInputError as exc:
            raise QgsProcessingException(f"MONTHS: {exc}") from exc
        gamma = self.parameterAsDouble(parameters, common.GAMMA, context)
        if not gamma >= 1.0:
            raise QgsProcessingException(f"GAMMA must be >= 1 (1 = Pierson-Moskowitz), got {gamma:g}")
        spread = self.parameterAsDouble(parameters, common.SPREAD_S, context)
        if not spread > 0:
            raise QgsProcessingException(f"SPREAD_S must be > 0, got {spread:g}")
        workers = self.parameterAsInt(parameters, WORKERS, context)
        if workers < 1:
            raise QgsProcessingException(f"WORKERS must be >= 1, got {workers}")
        scheduler = (self.parameterAsString(parameters, SCHEDULER, context) or "").strip() or None
        fallback = self.parameterAsBoolean(parameters, FALLBACK_LOCAL, context)
        vessel_spec = self.parameterAsString(parameters, common.VESSEL, context)
        profile = common.resolve_vessel_spec(vessel_spec)
        station = (self.parameterAsString(parameters, common.STATION, context) or "").strip() or None
        if station is not None and station not in profile.station_names:
            raise QgsProcessingException(
                f"STATION {show(station)} is not on vessel {show(profile.name)}: choose one of {', '.join(profile.station_names)}")
        try:
            backend = make_backend("local", workers=workers, scheduler=scheduler, fallback_local=fallback)
        except SeawayInputError as exc:
            raise QgsProcessingException(f"SCHEDULER/WORKERS: {exc}") from exc
        return dict(paths=paths, speed=float(speed), max_class=max_class, months=months, gamma=float(gamma),
                    spread=float(spread), backend=backend, scheduler=scheduler, profile=profile,
                    vessel_spec=vessel_spec, station=station)

    def processAlgorithm(  # noqa: N802
        self, parameters: Dict[str, Any], context: QgsProcessingContext, feedback: QgsProcessingFeedback
    ) -> Dict[str, Any]:
        import numpy as np

        from .. import adapters, styling
        from ..core.climate import ClimateCancelled, compute_climate
        from ..core.reports.climate import climate_text_summary, write_climate_html

        feedback = feedback or QgsProcessingFeedback()
        s = self._settings(parameters, context)
        context.setInvalidGeometryCheck(QgsFeatureRequest.InvalidGeometryCheck.GeometryNoCheck)
        source = self.parameterAsSource(parameters, common.ROUTE, context)
        route_layer = self.parameterAsVectorLayer(parameters, common.ROUTE, context)
        route_src = route_layer.source() if route_layer is not None else str(parameters.get(common.ROUTE))
        legs = adapters.route_legs(source, context, feedback=feedback)
        if not legs:
            raise QgsProcessingException("ROUTE: no line could be read from the route layer")
        if len(legs) > 1:
            feedback.pushWarning(f"ROUTE has {len(legs)} lines; the seasonal climate uses the first one, {show(legs[0].name)}")
        leg = legs[0]
        seg_dest = self.parameterAsOutputLayer(parameters, OUTPUT_SEGMENTS, context)
        csv_path = self.parameterAsFileOutput(parameters, OUTPUT_CSV, context) if parameters.get(OUTPUT_CSV) else ""
        rep_path = self.parameterAsFileOutput(parameters, OUTPUT_REPORT, context) if parameters.get(OUTPUT_REPORT) else ""
        common.check_outputs([(OUTPUT_SEGMENTS, seg_dest), (OUTPUT_CSV, csv_path), (OUTPUT_REPORT, rep_path)],
                             [route_src, *s["paths"], *common.vessel_input_files(s["vessel_spec"], s["profile"])])
        dests = [d for d in (seg_dest, csv_path, rep_path) if d and not str(d).startswith(("memory:", "TEMPORARY"))]
        if len({common.file_part(d) for d in dests}) < len(dests):
            raise QgsProcessingException("OUTPUT_SEGMENTS, OUTPUT_CSV and OUTPUT_REPORT must be different files")

        where = f"Dask scheduler {s['scheduler']}" if s["scheduler"] else f"{getattr(s['backend'], 'workers', 1)} local process(es)"
        feedback.pushInfo(f"Seasonal climate of {show(leg.name)}: {len(s['paths'])} hindcast file(s), computed on {where}")
        feedback.setProgress(2)

        def progress(fraction: float) -> bool:
            feedback.setProgress(5.0 + 85.0 * float(fraction))
            return not feedback.isCanceled()

        try:
            result = compute_climate(
                leg.lon_deg, leg.lat_deg, s["paths"], s["profile"], speed_kn=s["speed"], station=s["station"],
                months=s["months"], max_class=s["max_class"], gamma=s["gamma"], spread_s=s["spread"],
                backend=s["backend"], progress=progress)
        except ClimateCancelled as exc:
            raise QgsProcessingException("Cancelled: no outputs were written") from exc
        except SeawayInputError as exc:
            raise QgsProcessingException(str(exc)) from exc
        for note in result.notes:
            if any(w in note for w in ("gap", "are in", "fallback", "validity", "missing", "no hindcast")):
                feedback.pushWarning(note)
            else:
                feedback.pushInfo(note)

        # segments between consecutive route samples (the samples the engine used)
        lon, lat = result.lon_deg, result.lat_deg
        seg_ok = result.segment_ok_share()                       # (nm, n-1)
        seg_ex = 0.5 * (result.exceed_share[:, :-1] + result.exceed_share[:, 1:])
        fields = segment_fields()
        crs = QgsCoordinateReferenceSystem(adapters.WGS84)
        sink, seg_id = self.parameterAsSink(parameters, OUTPUT_SEGMENTS, context, fields, QgsWkbTypes.Type.LineString, crs)
        if sink is None:
            raise QgsProcessingException(f"OUTPUT_SEGMENTS {show(seg_dest)} could not be created: check the path")
        null = QVariant()
        month_pos = {m: k for k, m in enumerate(result.months)}
        for i in range(result.n - 1):
            f = QgsFeature(fields)
            f.setGeometry(QgsGeometry.fromPolylineXY([QgsPointXY(float(lon[i]), float(lat[i])),
                                                      QgsPointXY(float(lon[i + 1]), float(lat[i + 1]))]))
            attrs: List[Any] = [i, int(result.segment_index[i]), float(result.dist_nm[i]), float(result.dist_nm[i + 1])]
            for m in range(1, 13):
                k = month_pos.get(m)
                v = seg_ok[k, i] if k is not None else float("nan")
                attrs.append(float(v) if np.isfinite(v) else null)
            sel = seg_ok[:, i]
            attrs.append(float(np.nanmean(sel)) if np.isfinite(sel).any() else null)
            ex = seg_ex[:, i]
            attrs.append(float(np.nanmean(ex)) if np.isfinite(ex).any() else null)
            attrs.append(int(result.max_class))
            f.setAttributes(attrs)
            sink.addFeature(f, QgsFeatureSink.Flag.FastInsert)
        del sink
        feedback.setProgress(93)

        title = "Seaway Comfort seasonal climate"
        abstract = (f"Seasonal comfort climate. Route: {route_src}. Hindcast: {'; '.join(s['paths'])}. "
                    f"Vessel {result.vessel_name}, station {result.station_name}, {s['speed']:g} kn, "
                    f"worst acceptable class {result.max_class}, months {','.join(str(m) for m in result.months)}. "
                    f"{CAUTION}")
        layer_in_context = context.getMapLayer(seg_id) if seg_id else None
        if layer_in_context is not None and layer_in_context.providerType() == "memory":
            apply_share_style(layer_in_context, title=title, abstract=abstract)
        elif seg_id:
            layer = QgsVectorLayer(seg_id, "segments", "ogr")
            if layer.isValid():
                apply_share_style(layer, title=title, abstract=abstract)
                qml = styling.qml_path_for(seg_id)
                msg, ok = layer.saveNamedStyle(qml)
                if not ok:
                    feedback.pushWarning(f"style not saved to {show(qml)}: {msg}")
            else:
                feedback.pushWarning(f"could not reopen {show(seg_id)} to save its style")
        if seg_id and context.willLoadLayerOnCompletion(seg_id):
            context.layerToLoadOnCompletionDetails(seg_id).setPostProcessor(ShareStylePostProcessor.create(title, abstract))

        out: Dict[str, Any] = {OUTPUT_SEGMENTS: seg_id}
        if csv_path:
            result.to_csv(csv_path)
            out[OUTPUT_CSV] = csv_path
        if rep_path:
            write_climate_html(rep_path, result, sources=s["paths"])
            out[OUTPUT_REPORT] = rep_path
        summary = climate_text_summary(result)
        feedback.pushInfo(summary)
        out[SUMMARY] = summary
        feedback.setProgress(100)
        return out
