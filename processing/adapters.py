# SPDX-License-Identifier: GPL-2.0-or-later
"""QGIS <-> core conversions: route layers to lon/lat arrays, QDateTime <-> datetime64, results
to features. No formulas here; the numbers come from :mod:`.core.passage`."""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, Dict, Iterable, Iterator, List, Optional, Sequence, Tuple

import numpy as np
from qgis.core import (
    Qgis,
    QgsCoordinateReferenceSystem,
    QgsCoordinateTransform,
    QgsCsException,
    QgsFeature,
    QgsField,
    QgsFields,
    QgsGeometry,
    QgsPointXY,
    QgsProcessingException,
    QgsWkbTypes,
)
from qgis.PyQt.QtCore import QDate, QDateTime, Qt, QTime, QVariant

from .core.flags import flag_codes_array
from .core.passage.fields import ENSEMBLE_OUTPUTS, MOTION_OUTPUTS
from .core.passage.pipeline import NOT_COMPUTED_CLASS, PassageResult
from .core.plausibility import SPEED_KN
from .core.validation import show

WGS84 = "EPSG:4326"

# ------------------------------------------------------------------------------- date-times


def qdatetime_from_datetime64(t: Any) -> QDateTime:
    """A UTC QDateTime (Qt.TimeSpec.UTC) from a numpy datetime64 (ms precision)."""
    ms = int(np.datetime64(t, "ms").astype(np.int64))
    q = QDateTime.fromMSecsSinceEpoch(ms, Qt.TimeSpec.UTC)
    q.setTimeSpec(Qt.TimeSpec.UTC)
    return q


def round_to_second(t: Any) -> np.datetime64:
    """datetime64 rounded to the nearest whole second (half a second rounds up)."""
    ms = int(np.datetime64(t, "ms").astype(np.int64))
    return np.datetime64((ms + 500) // 1000, "s")


def datetime64_from_qdatetime(q: QDateTime, *, assume_utc: bool = True) -> np.datetime64:
    """numpy datetime64[ms] (UTC) from a QDateTime.

    A QDateTime with local time spec (what QGIS gives for a text without zone) is read as UTC
    wall-clock time when ``assume_utc`` (the parameter says UTC), else converted from local time.
    """
    if q is None or not q.isValid():
        raise QgsProcessingException(f"invalid date-time {show(q)}")
    if q.timeSpec() == Qt.TimeSpec.LocalTime and assume_utc:
        q = QDateTime(q.date(), q.time(), Qt.TimeSpec.UTC)
    return np.datetime64(int(q.toMSecsSinceEpoch()), "ms")


def datetime64_from_value(value: Any, *, what: str) -> Optional[np.datetime64]:
    """A UTC datetime64 from an attribute value (QDateTime, QDate, ISO text); None when NULL."""
    from .core.passage.pipeline import as_utc_datetime64
    from .core.validation import SeawayInputError

    if value is None or (isinstance(value, QVariant) and value.isNull()):
        return None
    if isinstance(value, QDateTime):
        return datetime64_from_qdatetime(value) if value.isValid() else None
    if isinstance(value, QDate):
        return datetime64_from_qdatetime(QDateTime(value, QTime(0, 0), Qt.TimeSpec.UTC)) if value.isValid() else None
    text = str(value).strip()
    if not text or text.upper() == "NULL":
        return None
    try:
        return as_utc_datetime64(what, text)
    except SeawayInputError as exc:
        raise QgsProcessingException(str(exc)) from exc


# ------------------------------------------------------------------------------- route legs


@dataclass(frozen=True)
class RouteLeg:
    """One part of one route feature, in WGS84 degrees."""

    feature_id: int
    part: int
    name: str
    lon_deg: np.ndarray
    lat_deg: np.ndarray
    departure_utc: Optional[np.datetime64]
    speed_kn: Optional[float]


def _field_index(fields: QgsFields, name: str) -> int:
    for i in range(fields.count()):
        if fields.at(i).name().lower() == name.lower():
            return i
    return -1


def _looks_like_degrees(xs: Sequence[float], ys: Sequence[float]) -> bool:
    return all(abs(x) <= 360.0 for x in xs) and all(abs(y) <= 90.0 for y in ys)


def route_legs(
    source: Any,
    context: Any,
    *,
    feedback: Any = None,
    name_field: str = "name",
    depart_field: str = "depart_utc",
    speed_field: str = "speed_kn",
) -> List[RouteLeg]:
    """Every part of every line feature as a leg, transformed to EPSG:4326.

    Raises QgsProcessingException for an empty layer, a missing/invalid CRS, coordinates that
    do not fit the layer's CRS (degrees vs metres), or a leg without length.
    """
    if source is None:
        raise QgsProcessingException("ROUTE: the route layer could not be read")
    if source.featureCount() == 0:
        raise QgsProcessingException("ROUTE: the route layer has no features: draw at least one line")
    crs = source.sourceCrs()
    if not crs.isValid():
        raise QgsProcessingException("ROUTE: the route layer has no valid CRS: set its CRS (e.g. EPSG:4326) and retry")
    xform = QgsCoordinateTransform(crs, QgsCoordinateReferenceSystem(WGS84), context.transformContext())
    fields = source.fields()
    i_name, i_dep, i_speed = (_field_index(fields, f) for f in (name_field, depart_field, speed_field))
    legs: List[RouteLeg] = []
    for feat in source.getFeatures():
        if feedback is not None and feedback.isCanceled():
            break
        geom = feat.geometry()
        fid = int(feat.id())
        label = str(feat[i_name]) if i_name >= 0 and not _is_null(feat[i_name]) else f"route {fid}"
        if geom is None or geom.isEmpty():
            raise QgsProcessingException(f"ROUTE: feature {show(label)} has no geometry: delete it or draw its line")
        if QgsWkbTypes.geometryType(geom.wkbType()) != QgsWkbTypes.GeometryType.LineGeometry:
            raise QgsProcessingException(f"ROUTE: feature {show(label)} is not a line")
        parts = geom.asMultiPolyline() if geom.isMultipart() else [geom.asPolyline()]
        dep = datetime64_from_value(feat[i_dep], what=f"{depart_field} of {show(label)}") if i_dep >= 0 else None
        speed = _leg_speed(feat[i_speed], speed_field, label) if i_speed >= 0 else None
        for k, pts in enumerate(parts):
            lon, lat = _part_to_wgs84(pts, k, label, crs, xform)
            name = label if len(parts) == 1 else f"{label} ({k + 1})"
            legs.append(RouteLeg(fid, k, name, lon, lat, dep, speed))
    return legs


def _is_null(value: Any) -> bool:
    return value in (None, "") or (isinstance(value, QVariant) and value.isNull())


def _leg_speed(raw: Any, speed_field: str, label: str) -> Optional[float]:
    """The route field speed_kn of one feature: None when empty, else a finite number > 0."""
    if raw is None or (isinstance(raw, QVariant) and raw.isNull()) or str(raw).strip() == "":
        return None
    try:
        speed = float(raw)
    except (TypeError, ValueError):
        raise QgsProcessingException(
            f"ROUTE: field {speed_field} of {show(label)} must be a number of knots, got {show(raw)}"
        ) from None
    if not (math.isfinite(speed) and speed > 0):
        raise QgsProcessingException(f"ROUTE: field {speed_field} of {show(label)} must be > 0 kn, got {show(raw)}")
    if speed > SPEED_KN.high:
        raise QgsProcessingException(
            f"ROUTE: field {speed_field} of {show(label)} = {show(raw)} is not a plausible speed "
            f"(allowed {SPEED_KN.text()}: {SPEED_KN.reason})"
        )
    return speed


def _part_to_wgs84(pts: Sequence[Any], k: int, label: str, crs: Any, xform: Any) -> Tuple[np.ndarray, np.ndarray]:
    """(lon, lat) in degrees of one line part, with checks that the coordinates fit the CRS."""
    xs = [p.x() for p in pts]
    ys = [p.y() for p in pts]
    if len(xs) < 2:
        raise QgsProcessingException(f"ROUTE: part {k + 1} of {show(label)} has fewer than 2 vertices")
    nan = [i for i, (x, y) in enumerate(zip(xs, ys)) if not (math.isfinite(x) and math.isfinite(y))]
    if nan:
        raise QgsProcessingException(
            f"ROUTE: vertex {nan[0] + 1} of part {k + 1} of {show(label)} has a coordinate that is not a "
            f"number ({xs[nan[0]]}, {ys[nan[0]]}): fix or delete that vertex"
        )
    if crs.isGeographic() and not _looks_like_degrees(xs, ys):
        raise QgsProcessingException(
            f"ROUTE: {show(label)} has coordinates like ({xs[0]:.1f}, {ys[0]:.1f}) that are not degrees, but "
            f"the layer CRS {crs.authid()} is geographic: set the layer's true (projected) CRS"
        )
    try:
        out = [xform.transform(QgsPointXY(x, y)) for x, y in zip(xs, ys)]
    except QgsCsException as exc:
        raise QgsProcessingException(
            f"ROUTE: {show(label)} cannot be transformed from {crs.authid()} to WGS84 ({exc}): check the layer CRS"
        ) from exc
    lon = np.array([p.x() for p in out], dtype=float)
    lat = np.array([p.y() for p in out], dtype=float)
    if not (np.isfinite(lon).all() and np.isfinite(lat).all()) or np.any(np.abs(lat) > 90):
        raise QgsProcessingException(
            f"ROUTE: {show(label)} falls outside the valid area of CRS {crs.authid()}: check the layer CRS"
        )
    if not crs.isGeographic() and _looks_like_degrees(xs, ys):
        span = max(max(xs) - min(xs), max(ys) - min(ys))
        if span < 400.0:
            raise QgsProcessingException(
                f"ROUTE: {show(label)} spans only {span:.1f} map units in the projected CRS {crs.authid()}, "
                "and its coordinates look like degrees: set the layer CRS to EPSG:4326"
            )
    return lon, lat


JOIN_TOLERANCE_NM = 0.05
"""Leg ends closer than this (about 90 m) count as the same point when legs are joined."""


def join_legs(legs: Sequence[RouteLeg]) -> Tuple[RouteLeg, List[str]]:
    """The legs as ONE passage sailed in layer order, and notes on what the joining did.

    A repeated joint vertex (end of one leg = start of the next, within
    :data:`JOIN_TOLERANCE_NM`) is dropped; a gap between legs is sailed as a straight line and
    named in the notes. The joined leg keeps the first leg's departure, and a speed only when
    every leg that gives one gives the same (1 NM = 1852 m, the international nautical mile).
    """
    if len(legs) == 1:
        return legs[0], []
    lons, lats, notes = [legs[0].lon_deg], [legs[0].lat_deg], []
    for prev, nxt in zip(legs[:-1], legs[1:]):
        gap_nm = _gap_nm(prev.lon_deg[-1], prev.lat_deg[-1], nxt.lon_deg[0], nxt.lat_deg[0])
        skip = 1 if gap_nm <= JOIN_TOLERANCE_NM else 0
        if not skip:
            notes.append(f"{show(prev.name)} ends {gap_nm:.2f} NM from the start of {show(nxt.name)}: "
                         "sailed as a straight line between them")
        lons.append(nxt.lon_deg[skip:])
        lats.append(nxt.lat_deg[skip:])
    speeds = {leg.speed_kn for leg in legs if leg.speed_kn is not None}
    name = " + ".join(leg.name for leg in legs)
    joined = RouteLeg(legs[0].feature_id, 0, name, np.concatenate(lons), np.concatenate(lats),
                      legs[0].departure_utc, speeds.pop() if len(speeds) == 1 else None)
    if len(speeds) > 1:
        notes.append("the legs give different speed_kn; the whole passage uses SPEED_KN (or SPEEDS_KN)")
    return joined, notes


def _gap_nm(lon0_deg: float, lat0_deg: float, lon1_deg: float, lat1_deg: float) -> float:
    """Ellipsoidal (WGS84) distance [NM] between two points, measured by QGIS's QgsDistanceArea."""
    from qgis.core import QgsDistanceArea

    da = QgsDistanceArea()
    da.setEllipsoid("WGS84")
    return da.measureLine(QgsPointXY(float(lon0_deg), float(lat0_deg)), QgsPointXY(float(lon1_deg), float(lat1_deg))) / 1852.0


def segment_geometry(lon0_deg: float, lat0_deg: float, lon1_deg: float, lat1_deg: float) -> QgsGeometry:
    """A two-point line from one sample to the next (EPSG:4326).

    Across the antimeridian the end longitude is unwrapped (e.g. 180.4 instead of -179.6) so
    the short segment is not drawn round the world.
    """
    x0, x1 = float(lon0_deg), float(lon1_deg)
    if x1 - x0 > 180.0:
        x1 -= 360.0
    elif x1 - x0 < -180.0:
        x1 += 360.0
    return QgsGeometry.fromPolylineXY([QgsPointXY(x0, float(lat0_deg)), QgsPointXY(x1, float(lat1_deg))])


def make_fields(spec: Iterable[Tuple[str, str]]) -> QgsFields:
    """QgsFields from (name, kind) pairs (kinds as :func:`make_field`)."""
    fields = QgsFields()
    for name, kind in spec:
        fields.append(make_field(name, kind))
    return fields


# ------------------------------------------------------------------------------- fields

# Field kinds by the names each Qt enum uses: QVariant.Type (QGIS < 3.38) and QMetaType.Type
# (QGIS >= 3.38, and Qt6). The two enums spell strings and date-times differently.
_VARIANT_TYPES = {"int": "Int", "long": "LongLong", "double": "Double", "bool": "Bool",
                  "string": "String", "datetime": "DateTime"}
_METATYPE_TYPES = {"int": "Int", "long": "LongLong", "double": "Double", "bool": "Bool",
                   "string": "QString", "datetime": "QDateTime"}
_METATYPE_FROM = 33800


def field_type(kind: str, qgis_version: int) -> Any:
    """The Qt type enum value QgsField takes for ``kind`` on QGIS ``qgis_version`` (e.g. 34006)."""
    if qgis_version >= _METATYPE_FROM:
        from qgis.PyQt.QtCore import QMetaType

        return getattr(QMetaType.Type, _METATYPE_TYPES[kind])
    return getattr(QVariant.Type, _VARIANT_TYPES[kind])


def make_field(name: str, kind: str) -> QgsField:
    """A QgsField of kind int/long/double/bool/string/datetime (QMetaType where QGIS takes it)."""
    return QgsField(name, field_type(kind, Qgis.versionInt()))


# (name, kind, PassageResult attribute or None for special handling)
POINT_FIELDS = (
    ("leg", "int", "leg"),
    ("seq", "int", "seq"),
    ("leg_name", "string", None),
    ("eta_utc", "datetime", None),
    ("dist_nm", "double", "dist_nm"),
    ("course_deg", "double", "course_deg"),
    ("speed_kn", "double", "speed_kn"),
    ("hs_m", "double", "hs_m"),
    ("tp_s", "double", "tp_s"),
    ("wave_from_deg", "double", "wave_from_deg"),
    ("depth_m", "double", "depth_m"),
    ("wavelength_m", "double", "wavelength_m"),
    ("celerity_m_s", "double", "celerity_m_s"),
    ("rel_heading_deg", "double", "rel_heading_deg"),
    ("enc_period_s", "double", "enc_period_s"),
    *((o.name, "double", o.name) for o in MOTION_OUTPUTS),  # declared once in core.passage.fields
    ("msdv_cum", "double", "msdv_cum"),
    ("vomit_pct", "double", "vomit_pct"),
    ("sick_pct_passage", "double", "sick_pct_passage"),
    ("comfort_class", "int", None),
    ("class_reason", "string", None),
    ("comfort_label", "string", None),
    ("flags", "string", None),
    ("source", "string", None),
)


# What a person reads for each field: (alias with unit, decimals shown; None = not a number).
# Display only: the stored values keep full precision and the field names stay as they are.
_BASE_DISPLAY = {
    "leg": ("Leg index (0-based; leg number = leg + 1)", None),
    "seq": ("Sample index in the leg (0-based)", None),
    "leg_name": ("Leg", None),
    "eta_utc": ("Passing time (UTC)", None),
    "dist_nm": ("Distance from leg start (NM)", 1),
    "course_deg": ("Course over ground (deg true)", 0),
    "speed_kn": ("Speed through the water (kn)", 1),
    "hs_m": ("Significant wave height Hs (m)", 1),
    "tp_s": ("Peak period Tp (s)", 1),
    "wave_from_deg": ("Waves from (deg true)", 0),
    "depth_m": ("Depth (m)", 0),
    "wavelength_m": ("Wavelength at Tp (m)", 0),
    "celerity_m_s": ("Wave celerity (m/s)", 1),
    "rel_heading_deg": ("Relative wave heading (deg; 0 following, 180 head)", 0),
    "enc_period_s": ("Encounter period (s)", 1),
    "msdv_cum": ("Motion sickness dose value, cumulative (m/s^1.5)", 1),
    "vomit_pct": ("Same as sick_pct_passage (old name, kept for one release) (%)", 1),
    "sick_pct_passage": ("Share who may vomit, ISO 2631-1, accumulated from departure (%)", 1),
    "class_reason": ("What set the comfort class (measure, value, limit)", None),
    "comfort_class": ("Comfort class (0 smooth .. 4 punishing)", None),
    "comfort_label": ("Comfort", None),
    "flags": ("Guidance flags", None),
    "source": ("Forecast source", None),
    "heave_rms_m": ("Heave, RMS (m)", 2),
    "pitch_rms_deg": ("Pitch, RMS (deg)", 1),
    "roll_rms_deg": ("Roll, RMS (deg)", 1),
    "heave_tz_s": ("Heave zero-crossing period (s)", 1),
    "pitch_tz_s": ("Pitch zero-crossing period (s)", 1),
    "roll_tz_s": ("Roll zero-crossing period (s)", 1),
    "vacc_rms_m_s2": ("Vertical acceleration, RMS (m/s^2)", 2),
    "lacc_rms_m_s2": ("Lateral acceleration, RMS (m/s^2)", 2),
    "vacc_wf_rms_m_s2": ("Vertical acceleration Wf-weighted, RMS (m/s^2)", 2),
    "msi_pct": ("Motion sickness incidence, 2 h exposure at this sea state (%)", 1),
}


def field_display() -> Dict[str, Tuple[str, Optional[int]]]:
    """(alias with unit, display decimals or None) for every point/segment field, by name; a
    motion output not named here gets its report label and unit from :data:`MOTION_OUTPUTS`."""
    out = {o.name: (f"{o.label} ({o.unit})", o.report_digits if o.report_digits is not None else 2)
           for o in MOTION_OUTPUTS}  # outputs added later still get an alias
    out.update(_BASE_DISPLAY)
    return out


def passage_fields() -> QgsFields:
    """Fields of the point and segment layers (names and units are the public interface)."""
    fields = QgsFields()
    display = field_display()
    for name, kind, _ in POINT_FIELDS:
        f = make_field(name, kind)
        if name in display:
            f.setAlias(display[name][0])
        fields.append(f)
    return fields


def _null() -> Any:
    return QVariant()


ENSEMBLE_POINT_FIELDS = tuple((o.name, "int" if o.name == "members" else "double") for o in ENSEMBLE_OUTPUTS)
"""The ensemble fields appended to the point and segment fields (core.passage.fields)."""


def ensemble_passage_fields() -> QgsFields:
    """:func:`passage_fields` plus :data:`ENSEMBLE_POINT_FIELDS` (members, prob_taxing_pct, ...)."""
    fields = passage_fields()
    for name, kind in ENSEMBLE_POINT_FIELDS:
        fields.append(make_field(name, kind))
    return fields


def with_ensemble(features: Iterator[QgsFeature], ens: Any) -> Iterator[QgsFeature]:
    """The features of one leg (feature i = sample i) with the ensemble attributes appended;
    NULL for a deterministic leg (``ens`` None) or where no member had a result."""
    for i, f in enumerate(features):
        extra: List[Any] = []
        for name, kind in ENSEMBLE_POINT_FIELDS:
            v = None if ens is None else float(getattr(ens, name)[i])
            ok = v is not None and math.isfinite(v) and not (kind == "int" and v <= 0)
            extra.append((int(v) if kind == "int" else v) if ok else _null())
        f.setAttributes(list(f.attributes())[:len(POINT_FIELDS)] + extra)
        yield f


def _column(r: PassageResult, name: str, kind: str, attr: Optional[str], leg_name: str) -> List[Any]:
    """One field's values for every sample as Python values (NULL where not computed)."""
    null = _null()
    if attr is not None:
        a = np.asarray(getattr(r, attr))
        if kind != "double":
            return a.astype(np.int64).tolist()
        a = a.astype(float)
        return [v if ok else null for v, ok in zip(a.tolist(), np.isfinite(a).tolist())]
    if name == "leg_name":
        return [leg_name] * r.n
    if name == "eta_utc":  # to the nearest second: GeoPackage date-times keep whole seconds only
        return [qdatetime_from_datetime64(round_to_second(t)) for t in r.eta_utc]
    if name == "comfort_class":
        return [c if c != NOT_COMPUTED_CLASS else null for c in np.asarray(r.comfort_class).astype(np.int64).tolist()]
    if name == "flags":
        return list(flag_codes_array(r.flags))
    if name in ("comfort_label", "class_reason", "source"):
        return [v or null for v in getattr(r, name)]
    raise ValueError(f"no writer for field {name}")


def _attribute_rows(r: PassageResult, leg_name: str) -> List[List[Any]]:
    """The attribute rows of every sample, built column by column (one pass per field)."""
    cols = [_column(r, name, kind, attr, leg_name) for name, kind, attr in POINT_FIELDS]
    return [list(row) for row in zip(*cols)]


def point_features(r: PassageResult, fields: QgsFields, leg_name: str) -> Iterator[QgsFeature]:
    """One point feature per sample (EPSG:4326)."""
    rows = _attribute_rows(r, leg_name)
    for i, (x, y) in enumerate(zip(np.asarray(r.lon_deg, dtype=float).tolist(), np.asarray(r.lat_deg, dtype=float).tolist())):
        f = QgsFeature(fields)
        f.setGeometry(QgsGeometry.fromPointXY(QgsPointXY(x, y)))
        f.setAttributes(rows[i])
        yield f


def segment_features(r: PassageResult, fields: QgsFields, leg_name: str) -> Iterator[QgsFeature]:
    """One line from each sample to the next, with the start sample's fields (EPSG:4326),
    unwrapped across the antimeridian (:func:`segment_geometry`)."""
    rows = _attribute_rows(r, leg_name)
    for i in range(r.n - 1):
        f = QgsFeature(fields)
        f.setGeometry(segment_geometry(r.lon_deg[i], r.lat_deg[i], r.lon_deg[i + 1], r.lat_deg[i + 1]))
        f.setAttributes(rows[i])
        yield f
