# SPDX-License-Identifier: GPL-2.0-or-later
"""Processing algorithm ``seawaycomfort:speedheading``: what to do out there.

Motions, comfort class (with its reason) and IMO MSC.1/Circ.1228 guidance for every speed x
course at one point and time, from :func:`..core.passage.polar.speed_heading` (the passage
engine: one sampling, one response call); a table and an HTML report with a polar diagram
(:mod:`..core.reports.polar`). The sea-state, vessel and spectrum parameters are those of
``routecomfort`` (:func:`.common.passage_parameters`).
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
    QgsProcessingContext,
    QgsProcessingException,
    QgsProcessingParameterDateTime,
    QgsProcessingParameterDefinition,
    QgsProcessingParameterFeatureSink,
    QgsProcessingParameterFileDestination,
    QgsProcessingParameterNumber,
    QgsProcessingParameterPoint,
    QgsProcessingParameterString,
    QgsWkbTypes,
)
from qgis.PyQt.QtCore import QVariant

from . import common
from .base import Run, SeawayAlgorithm
from ..core.flags import CAUTION
from ..core.validation import SeawayInputError, show

POINT = "POINT"
TIME = "TIME"
SPEEDS_KN = "SPEEDS_KN"
HEADING_STEP_DEG = "HEADING_STEP_DEG"
CURRENT_COURSE_DEG = "CURRENT_COURSE_DEG"
CURRENT_SPEED_KN = "CURRENT_SPEED_KN"
OUTPUT_TABLE = "OUTPUT_TABLE"
OUTPUT_REPORT = "OUTPUT_REPORT"
SHARED = (common.SEA_STATE, common.SOURCE_NAMES, common.DEPTH, common.VESSEL, common.STATION, common.GAMMA,
          common.SPREAD_S, common.LONG_CRESTED, common.METHOD)
"""The routecomfort parameters this algorithm takes."""
HIDDEN = (common.SPEED_KN, common.SPACING_NM)
"""Shared parameters kept hidden at their defaults (the shared parser reads them)."""

TABLE_FIELDS: Tuple[Tuple[str, str], ...] = (
    ("speed_kn", "double"), ("course_deg", "double"), ("rel_heading_deg", "double"), ("enc_period_s", "double"),
    ("msi_pct", "double"), ("roll_rms_deg", "double"), ("vacc_rms_m_s2", "double"), ("lacc_rms_m_s2", "double"),
    ("comfort_class", "int"), ("class_reason", "string"), ("flags", "string"),
)
"""OUTPUT_TABLE fields (public interface), one row per speed x course."""


def table_fields() -> QgsFields:
    from ..adapters import make_field

    fields = QgsFields()
    for name, kind in TABLE_FIELDS:
        fields.append(make_field(name, kind))
    return fields


def _attributes(res: Any, k: int) -> List[Any]:
    from ..core.flags import flag_codes

    out: List[Any] = []
    for name, kind in TABLE_FIELDS:
        v = getattr(res, name)[k]
        if name == "flags":
            out.append(flag_codes(int(v)))
        elif kind == "double":
            out.append(float(v) if math.isfinite(float(v)) else QVariant())
        elif kind == "int":
            out.append(int(v) if int(v) >= 0 else QVariant())
        else:
            out.append(str(v) or QVariant())
    return out


@dataclass(frozen=True)
class PolarJob:
    """Parsed parameters: the shared passage settings, the point and its options, the inputs."""

    settings: common.PassageSettings
    point: Dict[str, Any]
    inputs: List[str]


class SpeedHeadingAlgorithm(SeawayAlgorithm):
    """Comfort and guidance for every speed x course at one point and time."""

    def name(self) -> str:
        return "speedheading"

    def displayName(self) -> str:  # noqa: N802
        return self.tr("What to do out there: speed and course diagram")

    def shortHelpString(self) -> str:  # noqa: N802
        return self.tr(
            "<p>At one POINT (any CRS) and TIME (UTC), reads the sea state once and computes the vessel's "
            "motions at the STATION for every speed of SPEEDS_KN (comma list; empty: 0 to 1.2 x the "
            "vessel's service speed in 5 steps) and every course from 000 in HEADING_STEP_DEG steps.</p>"
            "<p><b>Outputs</b>: a table (speed_kn, course_deg, rel_heading_deg, enc_period_s, msi_pct "
            "(2 h exposure), roll_rms_deg, vacc_rms_m_s2, lacc_rms_m_s2, comfort_class, class_reason, "
            "flags) and an HTML report with a polar diagram: course around, speed outward, colour = "
            "comfort class, the IMO MSC.1/Circ.1228 zones hatched (4.2.1 surf-riding, 4.2.2 successive "
            "high waves, 4.2.3 synchronous and parametric rolling), danger-graded cells outlined, and the "
            "current course and speed (CURRENT_COURSE_DEG, CURRENT_SPEED_KN) marked when given.</p>"
            f"<p><b>Caution</b>: {CAUTION}</p>"
        )

    def initAlgorithm(self, config: Optional[Dict[str, Any]] = None) -> None:  # noqa: N802
        for p in common.passage_parameters():
            if p.name() in SHARED:
                self.addParameter(p)
            elif p.name() in HIDDEN:  # read by the shared parser; no meaning at one point
                p.setFlags(p.flags() | QgsProcessingParameterDefinition.Flag.FlagHidden)
                self.addParameter(p)
        dbl = QgsProcessingParameterNumber.Type.Double
        self.addParameter(QgsProcessingParameterPoint(POINT, self.tr("Position (any CRS)")))
        self.addParameter(QgsProcessingParameterDateTime(
            TIME, self.tr("Time (UTC)"), QgsProcessingParameterDateTime.Type.DateTime))
        self.addParameter(QgsProcessingParameterString(
            SPEEDS_KN, self.tr("Speeds (kn, comma-separated; empty: 0 to 1.2 x service speed in 5 steps)"),
            optional=True))
        self.addParameter(QgsProcessingParameterNumber(
            HEADING_STEP_DEG, self.tr("Course step (deg)"), dbl, defaultValue=15.0))
        self.addParameter(QgsProcessingParameterNumber(
            CURRENT_COURSE_DEG, self.tr("Current course (deg true, optional)"), dbl, optional=True))
        self.addParameter(QgsProcessingParameterNumber(
            CURRENT_SPEED_KN, self.tr("Current speed (kn, optional)"), dbl, optional=True))
        self.addParameter(QgsProcessingParameterFeatureSink(
            OUTPUT_TABLE, self.tr("Speed and course table"), QgsProcessing.SourceType.TypeVector))
        self.addParameter(QgsProcessingParameterFileDestination(
            OUTPUT_REPORT, self.tr("Speed and course report"), self.tr("HTML files (*.html)"), optional=True,
            createByDefault=True))

    # -----------------------------------------------------------------------------------------
    def _inputs(self, parameters: Dict[str, Any], context: QgsProcessingContext) -> Dict[str, Any]:
        """Point (WGS84), time, speeds, step and the current course/speed, checked."""
        from .. import adapters
        from ..core.passage.polar import parse_speed_list_kn

        if parameters.get(POINT) in (None, ""):
            raise QgsProcessingException("POINT is required: give a position, e.g. '5.2,53.4 [EPSG:4326]'")
        pt = self.parameterAsPoint(parameters, POINT, context, QgsCoordinateReferenceSystem(adapters.WGS84))
        qdt = self.parameterAsDateTime(parameters, TIME, context)
        if parameters.get(TIME) in (None, "") or qdt is None or not qdt.isValid():
            raise QgsProcessingException(f"TIME {show(parameters.get(TIME))} is not a valid UTC date-time: use ISO "
                                         "8601, e.g. 2031-03-11T06:00:00Z")
        text = self.parameterAsString(parameters, SPEEDS_KN, context) or ""
        try:
            speeds = parse_speed_list_kn(text) if text.strip() else None
        except SeawayInputError as exc:
            raise QgsProcessingException(f"SPEEDS_KN: {exc}") from exc
        cur = [parameters.get(k) for k in (CURRENT_COURSE_DEG, CURRENT_SPEED_KN)]
        cur_v = [self.parameterAsDouble(parameters, k, context) if v not in (None, "") else None
                 for k, v in zip((CURRENT_COURSE_DEG, CURRENT_SPEED_KN), cur)]
        return dict(lon=pt.x(), lat=pt.y(), time=adapters.datetime64_from_qdatetime(qdt, assume_utc=True),
                    speeds=speeds, step=self.parameterAsDouble(parameters, HEADING_STEP_DEG, context),
                    course=cur_v[0], speed=cur_v[1])

    OUTPUT_FILES = (OUTPUT_TABLE, OUTPUT_REPORT)

    def read_settings(self, run: Run) -> PolarJob:
        settings = common.parse_passage_settings(self, run.parameters, run.context)
        inputs = [*settings.sea_state_paths, settings.vessel_spec] + ([settings.depth_path] if settings.depth_path else [])
        return PolarJob(settings, self._inputs(run.parameters, run.context), inputs)

    def compute(self, run: Run, job: PolarJob) -> Any:
        from ..core.passage.polar import speed_heading

        s, ins = job.settings, job.point
        with common.opened_sea(s, run.feedback) as (sources, depth), common.input_error(""):
            return speed_heading(
                ins["lon"], ins["lat"], ins["time"], sources, s.profile, speeds_kn=ins["speeds"],
                heading_step_deg=ins["step"], station=s.station, depth=depth, gamma=s.gamma,
                spread_s=s.spread_s, long_crested=s.long_crested, method=s.method,
                current_course_deg=ins["course"], current_speed_kn=ins["speed"])

    def write_sinks(self, run: Run, job: PolarJob, res: Any) -> Dict[str, Any]:
        from ..styling import OutputStyle, apply_metadata_only

        fields = table_fields()
        features = (self._feature(fields, res, k) for k in range(res.n))
        style = OutputStyle("Seaway Comfort speed and course table", CAUTION, apply_metadata_only, table=True)
        table_id = run.write_sink(OUTPUT_TABLE, fields, QgsWkbTypes.Type.NoGeometry,
                                  QgsCoordinateReferenceSystem(), features, style)
        return {OUTPUT_TABLE: table_id}

    @staticmethod
    def _feature(fields: QgsFields, res: Any, k: int) -> QgsFeature:
        f = QgsFeature(fields)
        f.setAttributes(_attributes(res, k))
        return f

    def write_report(self, run: Run, job: PolarJob, res: Any) -> Dict[str, Any]:
        """The log lines and the HTML report."""
        from ..core.flags import flag_codes
        from ..core.reports.polar import render_speed_heading_html

        if res.sea.flags[0]:
            run.feedback.pushWarning(f"sea state at the point: {flag_codes(int(res.sea.flags[0]))}")
        run.feedback.pushInfo(f"{res.n} speed x course cells; {int((res.comfort_class >= 0).sum())} classed. {CAUTION}")
        report_path = run.file_output(OUTPUT_REPORT)
        if not report_path:
            return {}
        try:
            with open(report_path, "w", encoding="utf-8") as fh:
                fh.write(render_speed_heading_html(res))
        except OSError as exc:
            raise QgsProcessingException(f"OUTPUT_REPORT {show(report_path)} could not be written: {exc}") from exc
        return {OUTPUT_REPORT: report_path}
