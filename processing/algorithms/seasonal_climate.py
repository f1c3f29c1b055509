# SPDX-License-Identifier: GPL-2.0-or-later
"""Processing algorithm ``seawaycomfort:seasonalclimate``: seasonal comfort climate of a route.

QGIS glue only: reads the parameters, converts the route layer with the shared adapters, runs
:func:`..core.climate.compute_climate` (chunks on a local process pool or a Dask cluster), and
writes the segment layer (styled by the share of acceptable time, QML beside the output), the
CSV table and the HTML report.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Dict, Iterator, List, Optional, Tuple

from qgis.core import (
    QgsCoordinateReferenceSystem,
    QgsFeature,
    QgsFields,
    QgsGraduatedSymbolRenderer,
    QgsLineSymbol,
    QgsProcessing,
    QgsProcessingException,
    QgsProcessingOutputString,
    QgsProcessingParameterBoolean,
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
from ..core.validation import show
from . import common
from .base import Run, SeawayAlgorithm

HINDCAST = "HINDCAST"
MONTHS = "MONTHS"
MAX_CLASS = common.MAX_CLASS
SCHEDULER = "SCHEDULER"
WORKERS = "WORKERS"
FALLBACK_LOCAL = "FALLBACK_LOCAL"
OUTPUT_SEGMENTS = "OUTPUT_SEGMENTS"
OUTPUT_CSV = "OUTPUT_CSV"
OUTPUT_REPORT = "OUTPUT_REPORT"
SUMMARY = "SUMMARY"

STYLE_FIELD = "ok_sel"
"""Field the segment layer is styled on: mean share of acceptable time over the chosen months."""


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


def segment_fields() -> QgsFields:
    from ..adapters import make_fields

    return make_fields([
        ("seq", "int"), ("route_segment", "int"), ("dist_from_nm", "double"), ("dist_to_nm", "double"),
        *((f"ok_m{m:02d}", "double") for m in range(1, 13)),
        (STYLE_FIELD, "double"), ("exceed_sel", "double"), ("max_class", "int"),
    ])


def _mean_or_null(values: Any) -> Any:
    import numpy as np

    return float(np.nanmean(values)) if np.isfinite(values).any() else QVariant()


def segment_features(result: Any, fields: QgsFields) -> Iterator[QgsFeature]:
    """One line between consecutive route samples (the samples the engine used), with the share
    of acceptable time per month, its mean over the chosen months and the exceedance share."""
    import numpy as np

    from ..adapters import segment_geometry

    lon, lat = result.lon_deg, result.lat_deg
    seg_ok = result.segment_ok_share()                       # (nm, n-1)
    seg_ex = 0.5 * (result.exceed_share[:, :-1] + result.exceed_share[:, 1:])
    month_pos = {m: k for k, m in enumerate(result.months)}
    for i in range(result.n - 1):
        f = QgsFeature(fields)
        f.setGeometry(segment_geometry(lon[i], lat[i], lon[i + 1], lat[i + 1]))
        attrs: List[Any] = [i, int(result.segment_index[i]), float(result.dist_nm[i]), float(result.dist_nm[i + 1])]
        for m in range(1, 13):
            v = seg_ok[month_pos[m], i] if m in month_pos else float("nan")
            attrs.append(float(v) if np.isfinite(v) else QVariant())
        attrs += [_mean_or_null(seg_ok[:, i]), _mean_or_null(seg_ex[:, i]), int(result.max_class)]
        f.setAttributes(attrs)
        yield f


@dataclass(frozen=True)
class ClimateJob:
    """The checked settings of one seasonal run, the route leg used and the route's source text."""

    paths: Tuple[str, ...]
    speed_kn: float
    max_class: int
    months: Any
    gamma: float
    spread_s: float
    backend: Any
    scheduler: Optional[str]
    profile: Any
    station: Optional[str]
    leg: Any = None
    route_source: str = ""
    route_text: str = ""
    vessel_spec: str = ""

    @property
    def inputs(self) -> List[Any]:
        return [self.route_source, *self.paths, *common.vessel_input_files(self.vessel_spec, self.profile)]


class SeasonalClimateAlgorithm(SeawayAlgorithm):
    """Per-month share of comfortable time, weather windows and waiting times along a route."""

    OUTPUT_FILES = (OUTPUT_SEGMENTS, OUTPUT_CSV, OUTPUT_REPORT)

    def name(self) -> str:
        return "seasonalclimate"

    def displayName(self) -> str:  # noqa: N802
        return self.tr("Seasonal comfort climate along a route")

    def shortHelpString(self) -> str:  # noqa: N802
        return self.tr(
            "<p>From years of hindcast sea states (NetCDF-CF or GRIB2 files with significant wave "
            "height, a period and a direction, all on one grid and time step), works out for every "
            "calendar month how often the passage along the route is comfortable enough. A route with "
            "several lines is sailed as one passage, the lines one after another in layer order.</p>"
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
        self.addParameter(QgsProcessingParameterFeatureSource(
            common.ROUTE, self.tr("Route (line layer; several lines are sailed one after another, in layer order)"), [QgsProcessing.SourceType.TypeVectorLine]))
        self.addParameter(QgsProcessingParameterMultipleLayers(
            HINDCAST, self.tr("Hindcast files (NetCDF-CF or GRIB2, any number of years)"),
            QgsProcessing.SourceType.TypeFile))
        self.addParameter(common.vessel_parameter(self.tr("Vessel profile: a JSON file or a profile name ({})")))
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
        for p in (
            QgsProcessingParameterString(
                SCHEDULER, self.tr("Dask scheduler address (tcp://host:port; empty = local processes)"), optional=True),
            QgsProcessingParameterNumber(
                WORKERS, self.tr("Local worker processes"), QgsProcessingParameterNumber.Type.Integer, defaultValue=2,
                minValue=1),
            QgsProcessingParameterBoolean(
                FALLBACK_LOCAL, self.tr("Compute locally if the Dask scheduler cannot be reached"), defaultValue=False),
        ):
            self.addParameter(common.advanced(p))
        for p in common.spectrum_parameters():
            self.addParameter(p)
        self.addParameter(QgsProcessingParameterFeatureSink(
            OUTPUT_SEGMENTS, self.tr("Seasonal climate segments"), QgsProcessing.SourceType.TypeVectorLine))
        self.addParameter(QgsProcessingParameterFileDestination(
            OUTPUT_CSV, self.tr("Seasonal climate table"), self.tr("CSV files (*.csv)"), optional=True))
        self.addParameter(QgsProcessingParameterFileDestination(
            OUTPUT_REPORT, self.tr("Seasonal climate report"), self.tr("HTML files (*.html)"), optional=True))
        self.addOutput(QgsProcessingOutputString(SUMMARY, self.tr("Summary")))

    # hooks of the run skeleton (:meth:`.base.SeawayAlgorithm.processAlgorithm`) ---------------
    def read_settings(self, run: Run) -> ClimateJob:
        from ..core.climate import make_backend, parse_months

        common.use_settings_cache_dir()
        p, ctx = run.parameters, run.context
        paths = common.existing_files(self, p, HINDCAST, ctx, "hindcast file (NetCDF-CF or GRIB2)")
        speed = common.checked_speed_kn(self.parameterAsDouble(p, common.SPEED_KN, ctx))
        max_class = common.parse_max_class(self, p, ctx)
        with common.input_error("MONTHS: "):
            months = parse_months(self.parameterAsString(p, MONTHS, ctx))
        gamma, spread = common.spectrum_shape(self, p, ctx)
        workers = self.parameterAsInt(p, WORKERS, ctx)
        if workers < 1:
            raise QgsProcessingException(f"WORKERS must be >= 1, got {workers}")
        scheduler = (self.parameterAsString(p, SCHEDULER, ctx) or "").strip() or None
        vessel_spec, profile, station = common.vessel_and_station(self, p, ctx)
        with common.input_error("SCHEDULER/WORKERS: "):
            backend = make_backend("local", workers=workers, scheduler=scheduler,
                                   fallback_local=self.parameterAsBoolean(p, FALLBACK_LOCAL, ctx))
        legs, route_src = common.read_route(self, p, ctx, run.feedback)
        leg = common.join_route(legs, run.feedback)
        return ClimateJob(tuple(paths), speed, max_class, months, gamma, spread, backend, scheduler, profile,
                          station, leg, route_src, common.route_layer_and_text(p.get(common.ROUTE), ctx)[1],
                          vessel_spec)

    def compute(self, run: Run, job: ClimateJob) -> Any:
        from ..core.climate import ClimateCancelled, compute_climate

        where = f"Dask scheduler {job.scheduler}" if job.scheduler else \
            f"{getattr(job.backend, 'workers', 1)} local process(es)"
        run.feedback.pushInfo(
            f"Seasonal climate of {show(job.leg.name)}: {len(job.paths)} hindcast file(s), computed on {where}")
        run.feedback.setProgress(2)
        with common.cancellable(ClimateCancelled), common.input_error(""):
            result = compute_climate(
                job.leg.lon_deg, job.leg.lat_deg, list(job.paths), job.profile, speed_kn=job.speed_kn,
                station=job.station, months=job.months, max_class=job.max_class, gamma=job.gamma,
                spread_s=job.spread_s, backend=job.backend, progress=run.progress(5.0, 90.0))
        for note in result.notes:
            if any(w in note for w in ("gap", "are in", "fallback", "validity", "missing", "no hindcast")):
                run.feedback.pushWarning(note)
            else:
                run.feedback.pushInfo(note)
        return result

    def write_sinks(self, run: Run, job: ClimateJob, result: Any) -> Dict[str, Any]:
        from .. import adapters
        from ..styling import OutputStyle

        abstract = (f"Seasonal comfort climate. Route: {job.route_text or job.route_source}. Hindcast: {'; '.join(job.paths)}. "
                    f"Vessel {result.vessel_name}, station {result.station_name}, {job.speed_kn:g} kn, "
                    f"worst acceptable class {result.max_class}, months {','.join(str(m) for m in result.months)}. "
                    f"{CAUTION}")
        fields = segment_fields()
        seg_id = run.write_sink(
            OUTPUT_SEGMENTS, fields, QgsWkbTypes.Type.LineString, QgsCoordinateReferenceSystem(adapters.WGS84),
            segment_features(result, fields), OutputStyle("Seaway Comfort seasonal climate", abstract, apply_share_style))
        run.feedback.setProgress(93)
        return {OUTPUT_SEGMENTS: seg_id}

    def write_report(self, run: Run, job: ClimateJob, result: Any) -> Dict[str, Any]:
        from ..core.reports.climate import climate_text_summary, write_climate_html

        out: Dict[str, Any] = {}
        csv_path, rep_path = run.file_output(OUTPUT_CSV), run.file_output(OUTPUT_REPORT)
        if csv_path:
            result.to_csv(csv_path)
            out[OUTPUT_CSV] = csv_path
        if rep_path:
            write_climate_html(rep_path, result, sources=list(job.paths))
            out[OUTPUT_REPORT] = rep_path
        out[SUMMARY] = climate_text_summary(result)
        run.feedback.pushInfo(out[SUMMARY])
        return out
