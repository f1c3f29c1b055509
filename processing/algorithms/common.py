# SPDX-License-Identifier: GPL-2.0-or-later
"""Parameters shared by the passage algorithms: definitions, parsing and input checks.

The route-comfort algorithm uses them today; a departure sweep will reuse the same
definitions and parsers (one place, no copies). Every check turns bad input into a
:class:`QgsProcessingException` whose text says what to fix.
"""
from __future__ import annotations

import os
from contextlib import contextmanager
from dataclasses import dataclass
from pathlib import Path
from typing import Any, Dict, Iterator, List, Optional, Sequence, Tuple

from qgis.core import (
    QgsApplication,
    QgsProcessing,
    QgsProcessingAlgorithm,
    QgsProcessingContext,
    QgsProcessingException,
    QgsProcessingParameterBoolean,
    QgsProcessingParameterDateTime,
    QgsProcessingParameterDefinition,
    QgsProcessingParameterEnum,
    QgsProcessingParameterFeatureSource,
    QgsProcessingParameterMultipleLayers,
    QgsProcessingParameterNumber,
    QgsProcessingParameterRasterLayer,
    QgsProcessingParameterString,
)
from qgis.PyQt.QtCore import QCoreApplication, QDateTime

from ..core.validation import SeawayInputError, show
from ..protected_inputs import file_part

ROUTE = "ROUTE"
SEA_STATE = "SEA_STATE"
SOURCE_NAMES = "SOURCE_NAMES"
SOURCE_MODE = "SOURCE_MODE"
DEPTH = "DEPTH"
DEPARTURE = "DEPARTURE"
SPEED_KN = "SPEED_KN"
VESSEL = "VESSEL"
STATION = "STATION"
SPACING_NM = "SPACING_NM"
GAMMA = "GAMMA"
SPREAD_S = "SPREAD_S"
LONG_CRESTED = "LONG_CRESTED"
METHOD = "METHOD"
MAX_CLASS = "MAX_CLASS"

SOURCE_MODES: Tuple[str, ...] = ("first_valid", "compare")
METHOD_CHOICES: Tuple[Optional[str], ...] = (None, "table", "exact")

ROUTE_NAME_FIELD = "name"
ROUTE_DEPART_FIELD = "depart_utc"
ROUTE_SPEED_FIELD = "speed_kn"

DEFAULT_VESSEL = "coastal_survey_35m"
USER_VESSEL_SUBDIR = ("seaway_comfort", "vessels")


class Tr:
    """Translation of the shared parameter texts.

    pylupdate5 files a ``tr("...")`` call made outside a class under the context
    ``@default``, so the texts are looked up there (QTranslator finds ``@default`` messages
    by that literal context name; checked with lrelease/QTranslator of Qt 5.15).
    """

    @staticmethod
    def tr(text: str) -> str:
        return QCoreApplication.translate("@default", text)


def advanced(p: QgsProcessingParameterDefinition) -> QgsProcessingParameterDefinition:
    """``p`` shown under the dialog's "Advanced parameters"."""
    p.setFlags(p.flags() | QgsProcessingParameterDefinition.Flag.FlagAdvanced)
    return p


def vessel_parameter(label: str) -> QgsProcessingParameterString:
    """VESSEL: a JSON file or a profile name; ``label`` holds "{}" for the built-in names."""
    from ..core.vessel.profile import builtin_profile_names

    names = builtin_profile_names()
    default_vessel = DEFAULT_VESSEL if DEFAULT_VESSEL in names else (names[0] if names else "")
    return QgsProcessingParameterString(VESSEL, label.format(", ".join(names)), defaultValue=default_vessel)


def vessel_choices() -> List[str]:
    """Profile names the dialog offers: the built-in ones, then those stored in the user's QGIS
    profile folder (a JSON path can still be typed or given by scripts)."""
    from ..core.vessel.profile import builtin_profile_names

    folder = user_vessel_dir()
    stored = sorted(p.stem for p in folder.glob("*.json")) if folder.is_dir() else []
    names = list(builtin_profile_names())
    return names + [n for n in stored if n not in names]


def station_choices() -> List[str]:
    """Station names of the built-in and stored profiles, in profile order (empty = the profile's
    first); a station not on the chosen vessel is refused at run time, naming the vessel's own."""
    out: List[str] = [""]
    for name in vessel_choices():
        try:
            stations = _station_names(resolve_vessel_spec(name))
        except QgsProcessingException:
            continue  # a broken stored profile: the vessel manager reports it
        out += [s for s in stations if s not in out]
    return out


def widget_hints(parameter: QgsProcessingParameterDefinition, decimals: Dict[str, int]) -> Dict[str, Any]:
    """Dialog metadata of ``parameter``: display decimals, or value hints for VESSEL / STATION."""
    if isinstance(parameter, QgsProcessingParameterNumber) and \
            parameter.dataType() == QgsProcessingParameterNumber.Type.Double:
        return {"widget_wrapper": {"decimals": decimals.get(parameter.name(), 2)}}
    if parameter.name() in (VESSEL, STATION) and isinstance(parameter, QgsProcessingParameterString):
        hints = vessel_choices() if parameter.name() == VESSEL else station_choices()
        return {"widget_wrapper": {"value_hints": hints}}
    return {}


def spectrum_parameters() -> List[QgsProcessingParameterDefinition]:
    """GAMMA and SPREAD_S (advanced): the JONSWAP and cos-2s shape of every sea state."""
    tr = Tr.tr
    return [
        advanced(QgsProcessingParameterNumber(
            GAMMA, tr("JONSWAP peak enhancement gamma (1 = Pierson-Moskowitz)"),
            QgsProcessingParameterNumber.Type.Double, defaultValue=3.3,
        )),
        advanced(QgsProcessingParameterNumber(
            SPREAD_S, tr("Directional spreading exponent s (cos-2s)"),
            QgsProcessingParameterNumber.Type.Double, defaultValue=4.0,
        )),
    ]


def _sea_parameters() -> List[QgsProcessingParameterDefinition]:
    """ROUTE, the forecast files and how several combine, the bathymetry."""
    tr = Tr.tr
    return [
        QgsProcessingParameterFeatureSource(
            ROUTE, tr("Route (line layer; optional fields name, depart_utc, speed_kn)"),
            [QgsProcessing.SourceType.TypeVectorLine],
        ),
        QgsProcessingParameterMultipleLayers(
            SEA_STATE, tr("Sea-state forecast files (GRIB2, NetCDF-CF or GeoTIFF)"),
            QgsProcessing.SourceType.TypeFile,
        ),
        QgsProcessingParameterString(
            SOURCE_NAMES, tr("Source names (comma-separated, one per forecast file; files sharing a name form one source)"),
            optional=True,
        ),
        advanced(QgsProcessingParameterEnum(
            SOURCE_MODE, tr("Several sources"),
            [tr("First file with data at each sample"), tr("Compare: one result per file")],
            defaultValue=0,
        )),
        QgsProcessingParameterRasterLayer(
            DEPTH, tr("Bathymetry raster (optional; deep water when absent)"), optional=True,
        ),
    ]


def _voyage_parameters() -> List[QgsProcessingParameterDefinition]:
    """Departure, speed, vessel, station and sample spacing."""
    tr = Tr.tr
    return [
        QgsProcessingParameterDateTime(
            DEPARTURE, tr("Departure (UTC; a route field depart_utc overrides it)"),
            QgsProcessingParameterDateTime.Type.DateTime, optional=True,
        ),
        QgsProcessingParameterNumber(
            SPEED_KN, tr("Speed through the water (kn; a route field speed_kn overrides it)"),
            QgsProcessingParameterNumber.Type.Double, defaultValue=8.0,
        ),
        vessel_parameter(tr("Vessel profile: a JSON file or a profile name ({})")),
        QgsProcessingParameterString(
            STATION, tr("Station on board (default: the profile's first)"), optional=True,
        ),
        QgsProcessingParameterNumber(
            SPACING_NM, tr("Sample spacing (NM)"), QgsProcessingParameterNumber.Type.Double,
            defaultValue=1.0,
        ),
    ]


def passage_parameters() -> List[QgsProcessingParameterDefinition]:
    """The input parameters of a passage computation, in dialog order."""
    tr = Tr.tr
    return [
        *_sea_parameters(),
        *_voyage_parameters(),
        *spectrum_parameters(),
        advanced(QgsProcessingParameterBoolean(
            LONG_CRESTED, tr("Long-crested seas (no directional spreading)"), defaultValue=False,
        )),
        advanced(QgsProcessingParameterEnum(
            METHOD, tr("Response method"),
            [tr("Automatic"), tr("Response tables (fast)"), tr("Full spectral integration")],
            defaultValue=0,
        )),
    ]


@dataclass(frozen=True)
class PassageSettings:
    """Parsed, checked passage parameters (everything except the route and the outputs)."""

    sea_state_paths: Tuple[str, ...]
    source_names: Tuple[str, ...]
    source_mode: str
    depth_path: Optional[str]
    departure_utc: Optional[Any]  # numpy.datetime64 or None (then every feature needs depart_utc)
    speed_kn: float
    vessel_spec: str
    profile: Any
    station: Optional[str]
    spacing_nm: float
    gamma: float
    spread_s: float
    long_crested: bool
    method: Optional[str]
    names_given: bool = False  # SOURCE_NAMES was filled (else files are grouped automatically)


def user_vessel_dir() -> Path:
    """``<QGIS settings dir>/seaway_comfort/vessels`` (user-stored vessel profiles)."""
    return Path(QgsApplication.qgisSettingsDirPath()).joinpath(*USER_VESSEL_SUBDIR)


def resolve_vessel_spec(spec: str) -> Any:
    """A vessel profile from a built-in name, a user-profile name or a JSON file path."""
    from ..core.vessel.profile import builtin_profile_names, load_vessel_profile, resolve_vessel

    text = (spec or "").strip()
    if not text:
        raise QgsProcessingException(
            "VESSEL is empty: give a vessel profile JSON file or one of the profile names "
            f"{', '.join(builtin_profile_names())}"
        )
    user = user_vessel_dir() / f"{text}.json"
    try:
        if text not in builtin_profile_names() and user.is_file():
            profile = load_vessel_profile(user)
        else:
            profile = resolve_vessel(text)
        if profile.rao_table_path() is not None:  # read now, before any work
            from ..core.motions.rao_table import load_rao_table

            load_rao_table(profile.rao_table_path())
        return profile
    except SeawayInputError as exc:
        stored = sorted(p.stem for p in user_vessel_dir().glob("*.json")) if user_vessel_dir().is_dir() else []
        extra = f"; profiles in your QGIS profile folder: {', '.join(stored)}" if stored else ""
        raise QgsProcessingException(f"VESSEL {show(text)}: {exc}{extra}") from exc
    except (OSError, ValueError, KeyError, TypeError) as exc:
        raise QgsProcessingException(f"VESSEL {show(text)} could not be read as a vessel profile: {exc}") from exc


def _station_names(profile: Any) -> List[str]:
    return [str(getattr(s, "name", s)) for s in getattr(profile, "stations", ())]


def default_source_names(paths: Sequence[str]) -> Tuple[str, ...]:
    """One distinct name per forecast file: the file stem, with the extension (and then a
    number) added where stems coincide, e.g. ``forecast (nc)`` and ``forecast (grib2)``."""
    stems = [Path(p).stem for p in paths]
    names = [
        f"{stem} ({Path(p).suffix.lstrip('.') or 'file'})" if stems.count(stem) > 1 else stem
        for stem, p in zip(stems, paths)
    ]
    first = list(names)
    return tuple(
        f"{name} #{first[:i + 1].count(name)}" if first.count(name) > 1 else name
        for i, name in enumerate(first)
    )


def existing_files(
    alg: QgsProcessingAlgorithm, parameters: Dict[str, Any], name: str, context: QgsProcessingContext, what: str
) -> List[str]:
    """The files of list parameter ``name``: at least one, each existing (``what`` names the kind)."""
    paths = [str(p) for p in (alg.parameterAsFileList(parameters, name, context) or []) if str(p)]
    if not paths:
        raise QgsProcessingException(f"{name}: give at least one {what}")
    for p in paths:
        if not os.path.isfile(p):
            raise QgsProcessingException(f"{name}: file {show(p)} does not exist")
    return paths


def _source_names(
    alg: QgsProcessingAlgorithm, parameters: Dict[str, Any], context: QgsProcessingContext, paths: Sequence[str]
) -> Tuple[str, ...]:
    raw = alg.parameterAsString(parameters, SOURCE_NAMES, context) or ""
    names = tuple(n.strip() for n in raw.split(",") if n.strip())
    if names and len(names) != len(paths):
        raise QgsProcessingException(
            f"SOURCE_NAMES has {len(names)} names ({show(raw)}) but SEA_STATE has {len(paths)} "
            "files: give one name per file, comma-separated, or leave it empty"
        )
    return names or default_source_names(paths)


def _probe(path: str, param: str) -> None:
    """Refuse a raster file that kills GDAL (probed in a child process, see core.seastate.probe)."""
    from ..core.seastate.probe import probe_raster_file

    try:
        probe_raster_file(path, what=f"{param} file")
    except SeawayInputError as exc:
        raise QgsProcessingException(str(exc)) from exc


def checked_speed_kn(speed: float, what: str = SPEED_KN) -> float:
    """A plausible speed through the water (core.plausibility.SPEED_KN) or a message naming ``what``."""
    from ..core.plausibility import SPEED_KN as SPEED_RANGE, check_range

    if not speed > 0:
        raise QgsProcessingException(f"{what} must be > 0 kn, got {speed:g}: give the planned speed through the water")
    try:
        return float(check_range(SPEED_RANGE, what, speed))
    except SeawayInputError as exc:
        raise QgsProcessingException(f"{exc}: give the planned speed through the water") from None


def _depth_path(alg: QgsProcessingAlgorithm, parameters: Dict[str, Any], context: QgsProcessingContext) -> Optional[str]:
    raw = parameters.get(DEPTH)
    if isinstance(raw, str) and os.path.isfile(raw):
        _probe(raw, DEPTH)  # before QGIS opens it as a layer
    layer = alg.parameterAsRasterLayer(parameters, DEPTH, context)
    if layer is not None:
        return layer.source()
    if parameters.get(DEPTH) not in (None, ""):
        raise QgsProcessingException(f"DEPTH {show(parameters.get(DEPTH))} is not a readable raster")
    return None


def parse_datetime(
    alg: QgsProcessingAlgorithm, parameters: Dict[str, Any], name: str, context: QgsProcessingContext,
    *, required: bool = False,
) -> Optional[Any]:
    """Date-time parameter ``name`` as a UTC datetime64; None when unset and not ``required``,
    or when the algorithm has no such parameter (an extra one is ignored, as QGIS ignores it)."""
    from .. import adapters

    if alg.parameterDefinition(name) is None:
        return None
    raw = parameters.get(name)
    if isinstance(raw, QDateTime) and not raw.isValid():
        raw = None  # the dialog's "not set" value
    if raw in (None, ""):
        if required:
            raise QgsProcessingException(f"{name} is required: give a UTC date-time, e.g. 2031-03-11T06:00:00Z")
        return None
    qdt = alg.parameterAsDateTime(parameters, name, context)
    if qdt is None or not qdt.isValid():
        raise QgsProcessingException(
            f"{name} {show(raw)} is not a valid date-time: use ISO 8601, e.g. 2031-03-11T06:00:00Z (UTC)"
        )
    return adapters.datetime64_from_qdatetime(qdt, assume_utc=True)


def positive(
    alg: QgsProcessingAlgorithm, parameters: Dict[str, Any], name: str, context: QgsProcessingContext,
    unit: str = "", hint: str = "",
) -> float:
    """Number parameter ``name``, refused unless > 0 (``unit`` and ``hint`` complete the message)."""
    value = alg.parameterAsDouble(parameters, name, context)
    if not value > 0:
        unit_text = f" {unit}" if unit else ""
        raise QgsProcessingException(f"{name} must be > 0{unit_text}, got {value:g}{hint}")
    return float(value)


def spectrum_shape(alg: QgsProcessingAlgorithm, parameters: Dict[str, Any], context: QgsProcessingContext) -> Tuple[float, float]:
    """(GAMMA >= 1, SPREAD_S > 0)."""
    gamma = alg.parameterAsDouble(parameters, GAMMA, context)
    if not gamma >= 1.0:
        raise QgsProcessingException(f"GAMMA must be >= 1 (1 = Pierson-Moskowitz), got {gamma:g}")
    return float(gamma), positive(alg, parameters, SPREAD_S, context)


def vessel_and_station(
    alg: QgsProcessingAlgorithm, parameters: Dict[str, Any], context: QgsProcessingContext
) -> Tuple[str, Any, Optional[str]]:
    """(VESSEL text, its profile, STATION or None), the station checked against the profile."""
    vessel_spec = alg.parameterAsString(parameters, VESSEL, context)
    profile = resolve_vessel_spec(vessel_spec)
    station = (alg.parameterAsString(parameters, STATION, context) or "").strip() or None
    stations = _station_names(profile)
    if station is not None and station not in stations:
        raise QgsProcessingException(
            f"STATION {show(station)} is not on vessel {show(getattr(profile, 'name', vessel_spec))}: "
            f"choose one of {', '.join(stations)}"
        )
    return vessel_spec, profile, station


def parse_max_class(alg: QgsProcessingAlgorithm, parameters: Dict[str, Any], context: QgsProcessingContext) -> int:
    """MAX_CLASS, a whole comfort class 0..4 (unset: the parameter's default)."""
    raw = parameters.get(MAX_CLASS)
    if raw in (None, ""):
        raw = alg.parameterDefinition(MAX_CLASS).defaultValue()
    value = alg.parameterAsInt(parameters, MAX_CLASS, context)
    try:
        ok = float(raw) == value and 0 <= value <= 4
    except (TypeError, ValueError):
        ok = False
    if not ok:
        raise QgsProcessingException(
            "MAX_CLASS must be a whole number 0..4 (0 smooth, 1 steady, 2 lively, 3 taxing, 4 punishing), "
            f"got {show(raw)}")
    return value


def use_settings_cache_dir() -> None:
    """Response tables cached in the QGIS settings folder (unless SEAWAY_CACHE_DIR is set)."""
    from qgis.core import QgsApplication

    from ..core.motions.table_cache import set_default_cache_dir

    base = QgsApplication.qgisSettingsDirPath()
    set_default_cache_dir(os.path.join(base, "cache", "seaway_comfort") if base else None)


def parse_passage_settings(
    alg: QgsProcessingAlgorithm, parameters: Dict[str, Any], context: QgsProcessingContext
) -> PassageSettings:
    """Read and check every shared passage parameter; QgsProcessingException on bad input."""
    use_settings_cache_dir()
    paths = existing_files(alg, parameters, SEA_STATE, context, "forecast file (GRIB2, NetCDF-CF or GeoTIFF)")
    names = _source_names(alg, parameters, context, paths)
    depth_path = _depth_path(alg, parameters, context)
    departure = parse_datetime(alg, parameters, DEPARTURE, context)
    speed = checked_speed_kn(alg.parameterAsDouble(parameters, SPEED_KN, context))
    spacing = positive(alg, parameters, SPACING_NM, context, "NM")
    gamma, spread = spectrum_shape(alg, parameters, context)
    vessel_spec, profile, station = vessel_and_station(alg, parameters, context)
    return PassageSettings(
        sea_state_paths=tuple(paths),
        source_names=names,
        source_mode=SOURCE_MODES[alg.parameterAsEnum(parameters, SOURCE_MODE, context)],
        depth_path=depth_path,
        departure_utc=departure,
        speed_kn=speed,
        vessel_spec=vessel_spec,
        profile=profile,
        station=station,
        spacing_nm=spacing,
        gamma=gamma,
        spread_s=spread,
        long_crested=alg.parameterAsBoolean(parameters, LONG_CRESTED, context),
        method=METHOD_CHOICES[alg.parameterAsEnum(parameters, METHOD, context)],
        names_given=bool((alg.parameterAsString(parameters, SOURCE_NAMES, context) or "").strip()),
    )


def vessel_input_files(spec: str, profile: Any) -> List[Tuple[str, str]]:
    """(label, path) of every file the VESSEL choice reads: the profile JSON (built-in, stored or
    given), the RAO table / hull sections it names, and every stored profile."""
    from ..core.vessel.profile import BUILTIN_DIR, builtin_profile_names
    from ..protected_inputs import profile_files

    text = (spec or "").strip()
    user = user_vessel_dir() / f"{text}.json" if text else None
    if text in builtin_profile_names():
        loaded: Optional[str] = str(BUILTIN_DIR / f"{text}.json")
    elif user is not None and user.is_file():
        loaded = str(user)
    else:
        loaded = text if text and os.path.isfile(text) else None
    return profile_files(text, profile, loaded, stored_dirs=[user_vessel_dir()])


def check_outputs(outputs: Sequence[Tuple[str, str]], inputs: Sequence[Any]) -> None:
    """Refuse outputs that would overwrite an input (also through links), or that cannot be written.

    ``outputs``: (parameter name, destination path or URI); memory/temporary outputs pass.
    ``inputs``: paths or (label, path) pairs of every file the run reads.
    """
    from ..protected_inputs import find_clash, protect

    protected = protect(inputs)
    for name, dest in outputs:
        if not dest or str(dest).startswith(("memory:", "TEMPORARY_OUTPUT")):
            continue
        path = file_part(dest)
        clash = find_clash(path, protected)
        if clash is not None:
            raise QgsProcessingException(
                f"{name} {show(path)} is also an input of this run ({clash.label} {show(clash.path)}): choose "
                "another output file; inputs are never overwritten"
            )
        folder = os.path.dirname(os.path.abspath(path)) or "."
        if not os.path.isdir(folder):
            raise QgsProcessingException(f"{name}: folder {show(folder)} does not exist: create it or choose another path")
        if not os.access(folder, os.W_OK) or (os.path.exists(path) and not os.access(path, os.W_OK)):
            raise QgsProcessingException(f"{name}: {show(path)} is not writable: choose another path")


def read_route(
    alg: QgsProcessingAlgorithm, parameters: Dict[str, Any], context: QgsProcessingContext, feedback: Any = None
) -> Tuple[List[Any], str]:
    """The ROUTE parameter as legs in WGS84 (:func:`..adapters.route_legs`) and its source text.

    Route lines are checked by our own code with messages in passage terms (a degenerate line
    becomes "the route has zero length"), so QGIS's generic geometry-validity check is switched
    off for this run's context before the source is opened.
    """
    from qgis.core import QgsFeatureRequest

    from .. import adapters

    context.setInvalidGeometryCheck(QgsFeatureRequest.InvalidGeometryCheck.GeometryNoCheck)
    source = alg.parameterAsSource(parameters, ROUTE, context)
    legs = adapters.route_legs(source, context, feedback=feedback)
    if not legs:
        raise QgsProcessingException("ROUTE: no line could be read from the route layer")
    return legs, route_layer_and_text(parameters.get(ROUTE), context)[0]


def join_route(legs: Sequence[Any], feedback: Any) -> Any:
    """Every leg as one passage in layer order (:func:`..adapters.join_legs`); the legs (numbered
    from 1, as in the reports) and any gap between them go to the log."""
    from ..adapters import join_legs

    leg, notes = join_legs(legs)
    if len(legs) > 1:
        feedback.pushInfo(f"ROUTE: {len(legs)} legs sailed one after another as one passage, in layer order: "
                          + ", ".join(f"{k + 1} {show(x.name)}" for k, x in enumerate(legs)))
    for note in notes:
        feedback.pushWarning(f"ROUTE: {note}")
    return leg


def route_layer_and_text(value: Any, context: QgsProcessingContext) -> Tuple[str, str]:
    """(source path or URI, text a person reads) of a ROUTE value.

    The dialog hands a layer over as a QgsProcessingFeatureSourceDefinition (with "selected
    features only" as a flag); scripts give a layer, a layer id or a path. The text is the layer
    name with its source, e.g. ``Merrow route (/data/route.geojson; selected features only)``.
    """
    from qgis.core import QgsMapLayer, QgsProcessingFeatureSourceDefinition, QgsProcessingUtils, QgsProperty

    selected = False
    if isinstance(value, QgsProcessingFeatureSourceDefinition):
        selected = bool(value.selectedFeaturesOnly)
        value = value.source
    if isinstance(value, QgsProperty):
        value = value.valueAsString(context.expressionContext(), "")[0]
    layer = value if isinstance(value, QgsMapLayer) else \
        QgsProcessingUtils.mapLayerFromString(str(value or ""), context) if value else None
    path = layer.source() if layer is not None else str(value or "")
    name = layer.name() if layer is not None else ""
    notes = "; ".join(n for n in (path, "selected features only" if selected else "") if n)
    return path, (f"{name} ({notes})" if name and name != path else notes)


def open_sources(settings: PassageSettings, feedback: Optional[Any]) -> List[Any]:
    """Open the forecast files as sea-state sources: files sharing a name in SOURCE_NAMES form one
    source; without names, files that cannot stand alone (or hold other steps or members of the
    same forecast) are joined (:mod:`..core.seastate.grouping`); every join is logged."""
    from ..core.seastate.grouping import open_grouped_sources

    paths = list(settings.sea_state_paths)
    names = list(settings.source_names) if settings.names_given else []
    try:
        sources, log = open_grouped_sources(paths, names)
    except SeawayInputError as exc:
        raise QgsProcessingException(f"SEA_STATE: {exc}") from exc
    except RuntimeError as exc:  # GDAL errors
        raise QgsProcessingException(f"SEA_STATE could not be read: {exc}") from exc
    if not names:  # distinct display names from the files (stems may coincide)
        default = dict(zip(paths, settings.source_names))
        for src in sources:
            src.name = default.get(src.inventory().files[0], src.name)
    for line in log:
        if feedback is not None:
            feedback.pushInfo(line)
    for src in sources:
        for w in getattr(src, "warnings", ()) or ():
            if feedback is not None:
                feedback.pushWarning(f"{src.name}: {w}")
        if getattr(src, "members", ()) and feedback is not None:
            feedback.pushInfo(f"{src.name}: {src.inventory().members_text}")
    return sources


def open_depth(settings: PassageSettings) -> Any:
    from ..core.seastate import open_bathymetry

    if not settings.depth_path:
        return None
    try:
        return open_bathymetry(settings.depth_path)
    except (SeawayInputError, RuntimeError) as exc:
        raise QgsProcessingException(f"DEPTH {show(settings.depth_path)}: {exc}") from exc


@contextmanager
def cancellable(*cancelled: type) -> Iterator[None]:
    """Turn the core's cancel exceptions into "Cancelled: no outputs were written"."""
    try:
        yield
    except cancelled as exc:
        raise QgsProcessingException("Cancelled: no outputs were written") from exc


@contextmanager
def input_error(prefix: str) -> Iterator[None]:
    """Turn a core SeawayInputError into a QgsProcessingException starting with ``prefix``."""
    try:
        yield
    except SeawayInputError as exc:
        raise QgsProcessingException(f"{prefix}{exc}") from exc


@contextmanager
def opened_sea(settings: PassageSettings, feedback: Optional[Any]) -> Iterator[Tuple[List[Any], Any]]:
    """(sea-state sources, bathymetry or None), open for the block and closed after it; a
    cancelled passage becomes "Cancelled: no outputs were written"."""
    from ..core.passage.pipeline import PassageCancelled

    sources = open_sources(settings, feedback)
    depth = None
    try:
        depth = open_depth(settings)
        with cancellable(PassageCancelled):
            yield sources, depth
    finally:
        for s in sources:
            s.close()
        if depth is not None:
            depth.close()


def passage_options(settings: PassageSettings, depth: Any, method: Optional[str]) -> Dict[str, Any]:
    """The keyword arguments every core passage call takes from the shared settings."""
    return dict(profile=settings.profile, station=settings.station, depth=depth, spacing_nm=settings.spacing_nm,
                gamma=settings.gamma, spread_s=settings.spread_s, long_crested=settings.long_crested, method=method)


def input_paths(settings: PassageSettings, route_source: str) -> List[Any]:
    """Every input file of a passage run (no output may overwrite one): paths and (label, path)."""
    return ([route_source, *settings.sea_state_paths] + ([settings.depth_path] if settings.depth_path else [])
            + vessel_input_files(settings.vessel_spec, settings.profile))


def spectrum_text(settings: PassageSettings) -> str:
    """The spectrum line of the reports."""
    spread = "long-crested" if settings.long_crested else f"cos-2s spreading s = {settings.spread_s:g}"
    return f"JONSWAP gamma {settings.gamma:g}, {spread}"


def vessel_text(settings: PassageSettings) -> str:
    """The vessel's name, with the VESSEL text when that differs (a file path)."""
    name = getattr(settings.profile, "name", settings.vessel_spec)
    return name if str(settings.vessel_spec) == str(name) else f"{name} ({settings.vessel_spec})"


def push_table(feedback: Any, text: str) -> None:
    """Log a plain-text table so its columns stay aligned in the dialog's HTML log: as <pre> where
    QGIS takes formatted messages (3.36+); else with no-break spaces (HTML collapses runs of
    spaces), which keeps the widths though the dialog's font is proportional."""
    import html

    if hasattr(feedback, "pushFormattedMessage"):
        feedback.pushFormattedMessage(f"<pre>{html.escape(text)}</pre>", text)
    else:
        feedback.pushInfo(text.replace("  ", "\u00a0\u00a0"))


def flag_warning_lines(counts: Dict[str, int], n_total: int) -> List[str]:
    """One log line per flag code: how many samples and why."""
    from ..core.flags import FLAG_CODES, FLAG_EXPLANATIONS

    by_code = {code: flag for flag, code in FLAG_CODES.items()}
    return [
        f"{code}: {n} of {n_total} samples - {FLAG_EXPLANATIONS[by_code[code]]}"
        for code, n in sorted(counts.items(), key=lambda kv: -kv[1])
    ]
