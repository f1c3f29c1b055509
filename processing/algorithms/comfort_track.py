# SPDX-License-Identifier: GPL-2.0-or-later
"""Processing algorithm ``seawaycomfort:comforttrack``: which way to go (comfort-optimal tracks)."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Dict, List, Optional, Tuple

from qgis.core import (
    QgsCoordinateReferenceSystem,
    QgsCoordinateTransform,
    QgsFeature,
    QgsGeometry,
    QgsPointXY,
    QgsProcessing,
    QgsProcessingException,
    QgsProcessingParameterFeatureSink,
    QgsProcessingParameterFeatureSource,
    QgsProcessingParameterFileDestination,
    QgsProcessingParameterNumber,
    QgsWkbTypes,
)

from ..core.flags import CAUTION
from ..core.validation import show
from . import common
from .base import Run, SeawayAlgorithm

MIN_DEPTH_M = "MIN_DEPTH_M"
BARRIERS = "BARRIERS"
MAX_DETOUR_PCT = "MAX_DETOUR_PCT"
OUTPUT_TRACKS = "OUTPUT_TRACKS"
OUTPUT_REPORT = "OUTPUT_REPORT"
TRACK_FIELDS = (("alternative", "string"), ("dist_nm", "double"), ("hours", "double"), ("eta_utc", "datetime"),
                ("worst_class", "int"), ("msi_max_pct", "double"), ("hours_taxing", "double"),
                ("sick_pct_passage", "double"), ("flags", "string"))


@dataclass(frozen=True)
class TrackJob:
    """Checked settings, the reference leg (WGS84), barrier rings (WGS84) and sources text."""

    settings: common.PassageSettings
    leg: Any
    route_source: str
    barrier_rings: Tuple[Any, ...]
    min_depth_m: float
    max_detour_pct: float
    barrier_source: str = ""

    @property
    def inputs(self) -> List[Any]:
        return common.input_paths(self.settings, self.route_source) + [("BARRIERS layer", self.barrier_source)]


def barrier_rings(alg: Any, run: Run) -> Tuple[Any, ...]:
    """Every polygon of BARRIERS as rings of (lon, lat), transformed from the layer's CRS to WGS84."""
    from .. import adapters

    source = alg.parameterAsSource(run.parameters, BARRIERS, run.context)
    if source is None:
        return ()
    crs = source.sourceCrs()
    if not crs.isValid():
        raise QgsProcessingException("BARRIERS: the layer has no valid CRS: set its CRS and retry")
    xform = QgsCoordinateTransform(crs, QgsCoordinateReferenceSystem(adapters.WGS84), run.context.transformContext())
    out = []
    for feat in source.getFeatures():
        geom = QgsGeometry(feat.geometry())
        if geom.isEmpty():
            continue
        geom.transform(xform)
        polys = geom.asMultiPolygon() if geom.isMultipart() else [geom.asPolygon()]
        out.extend([[(p.x(), p.y()) for p in ring] for ring in poly] for poly in polys if poly)
    return tuple(out)


class ComfortTrackAlgorithm(SeawayAlgorithm):
    """The reference track and the fastest, balanced and gentlest alternatives around it."""

    OUTPUT_FILES = (OUTPUT_TRACKS, OUTPUT_REPORT)

    def name(self) -> str:
        return "comforttrack"

    def displayName(self) -> str:  # noqa: N802
        return self.tr("Which way to go: comfort-optimal tracks")

    def shortHelpString(self) -> str:  # noqa: N802
        return self.tr(
            "<p>Searches tracks from the first to the last vertex of ROUTE (the line itself is the reference) "
            "on a lattice of lateral offsets around it, with the sea taken at the hour the vessel gets to each "
            "place, and returns four lines: <code>reference</code>, <code>fastest</code> (least time), "
            "<code>gentlest</code> (least motion sickness dose at arrival, ISO 2631-1) and <code>balanced</code> "
            "(the knee of the time-versus-dose front). Tracks keep off BARRIERS polygons (any CRS), water "
            "shallower than MIN_DEPTH_M (default 2 x the vessel's draught) and land in the forecast, and are at "
            "most MAX_DETOUR_PCT longer than the reference. Each track is evaluated exactly as the route "
            "assessment evaluates a line.</p>"
            f"<p><b>Caution</b>: a track is a planning aid, not a passage plan. {CAUTION}</p>"
        )

    def initAlgorithm(self, config: Optional[Dict[str, Any]] = None) -> None:  # noqa: N802
        for p in common.passage_parameters():
            self.addParameter(p)
        self.addParameter(QgsProcessingParameterNumber(
            MIN_DEPTH_M, self.tr("Minimum depth (m; empty = 2 x the vessel's draught)"),
            QgsProcessingParameterNumber.Type.Double, optional=True, minValue=0.0))
        self.addParameter(QgsProcessingParameterFeatureSource(
            BARRIERS, self.tr("Barriers (polygons: land, exclusion zones, traffic separation areas)"),
            [QgsProcessing.SourceType.TypeVectorPolygon], optional=True))
        self.addParameter(QgsProcessingParameterNumber(
            MAX_DETOUR_PCT, self.tr("Longest track allowed (% longer than the reference)"),
            QgsProcessingParameterNumber.Type.Double, defaultValue=30.0, minValue=1.0, maxValue=200.0))
        self.addParameter(QgsProcessingParameterFeatureSink(
            OUTPUT_TRACKS, self.tr("Tracks"), QgsProcessing.SourceType.TypeVectorLine))
        self.addParameter(QgsProcessingParameterFileDestination(
            OUTPUT_REPORT, self.tr("Track report"), self.tr("HTML files (*.html)"), optional=True))

    # hooks of the run skeleton ---------------------------------------------------------------
    def read_settings(self, run: Run) -> TrackJob:
        settings = common.parse_passage_settings(self, run.parameters, run.context)
        legs, route_src = common.read_route(self, run.parameters, run.context, run.feedback)
        if len(legs) != 1:
            raise QgsProcessingException(f"ROUTE must hold exactly one line (the reference track), got {len(legs)} legs")
        raw = run.parameters.get(MIN_DEPTH_M)
        depth_min = (2.0 * float(settings.profile.draught_m) if raw in (None, "")
                     else self.parameterAsDouble(run.parameters, MIN_DEPTH_M, run.context))
        barriers = self.parameterAsVectorLayer(run.parameters, BARRIERS, run.context)
        return TrackJob(settings, legs[0], route_src, barrier_rings(self, run), depth_min,
                        self.parameterAsDouble(run.parameters, MAX_DETOUR_PCT, run.context),
                        barriers.source() if barriers is not None else "")

    def compute(self, run: Run, job: TrackJob) -> Any:
        from ..core.routing.barriers import barriers_from_rings
        from ..core.routing.engine import plan_tracks

        leg, s = job.leg, job.settings
        departure = leg.departure_utc if leg.departure_utc is not None else s.departure_utc
        if departure is None:
            raise QgsProcessingException("DEPARTURE: set DEPARTURE or fill the route field depart_utc")
        with common.opened_sea(s, run.feedback) as (sources, depth), common.input_error(""):
            bar = barriers_from_rings(job.barrier_rings) if job.barrier_rings else None
            return plan_tracks(leg.lon_deg, leg.lat_deg, departure_utc=departure,
                               speed_kn=leg.speed_kn if leg.speed_kn is not None else s.speed_kn,
                               sea_states=sources, min_depth_m=job.min_depth_m, barriers=bar,
                               max_detour_pct=job.max_detour_pct, progress=run.progress(0.0, 95.0),
                               **common.passage_options(s, depth, s.method))

    def write_sinks(self, run: Run, job: TrackJob, plan: Any) -> Dict[str, Any]:
        from .. import adapters
        from ..core.routing.engine import track_fields

        fields = adapters.make_fields(TRACK_FIELDS)
        feats = []
        for alt in plan.alternatives:
            f = QgsFeature(fields)
            f.setGeometry(QgsGeometry.fromPolylineXY([QgsPointXY(float(x), float(y))
                                                      for x, y in zip(alt.lon_deg, alt.lat_deg)]))
            vals = track_fields(alt)
            f.setAttributes([adapters.qdatetime_from_datetime64(vals[k]) if kind == "datetime" else
                             (None if isinstance(vals[k], float) and vals[k] != vals[k] else vals[k])
                             for k, kind in TRACK_FIELDS])
            feats.append(f)
        crs = QgsCoordinateReferenceSystem(adapters.WGS84)
        return {OUTPUT_TRACKS: run.write_sink(OUTPUT_TRACKS, fields, QgsWkbTypes.Type.LineString, crs, feats)}

    def write_report(self, run: Run, job: TrackJob, plan: Any) -> Dict[str, Any]:
        from ..core.reports.html import write_page
        from ..core.reports.track import track_report_html

        for note in plan.notes:
            run.feedback.pushWarning(note)
        path = run.file_output(OUTPUT_REPORT)
        if not path:
            return {}
        s = job.settings
        inputs = [("Route (reference)", job.route_source), ("Sea-state files", "; ".join(s.sea_state_paths)),
                  ("Bathymetry", s.depth_path or "none (deep water)"), ("Minimum depth", f"{job.min_depth_m:g} m"),
                  ("Barrier polygons", str(len(job.barrier_rings))), ("Longest track", f"+{job.max_detour_pct:g} %"),
                  ("Vessel", common.vessel_text(s)), ("Speed", f"{s.speed_kn:g} kn"), ("Spectrum", common.spectrum_text(s))]
        try:
            write_page(path, track_report_html(plan, inputs))
        except OSError as exc:
            raise QgsProcessingException(f"OUTPUT_REPORT {show(path)} could not be written: {exc}") from exc
        return {OUTPUT_REPORT: path}
