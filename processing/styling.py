# SPDX-License-Identifier: GPL-2.0-or-later
"""Styles for passage outputs: comfort-class renderers, time settings, provenance metadata.

Colours come from :data:`.core.reports.palette.COMFORT_PALETTE` (our own five-step
light-to-dark palette, kept apart by lightness so it reads under colour-vision deficiencies;
grey = not computed).
Styles are written where they hold without any post-processor (qgis_process, processing.run):
a QML file beside the output (renderer AND temporal settings) and, for GeoPackages, the
default style in the file (QGIS restores its renderer on open, not its temporal settings).
When outputs are loaded into a project, :class:`ComfortStylePostProcessor` applies the same.
"""
from __future__ import annotations

import os
from typing import Any, ClassVar, List, Optional, Tuple

from qgis.core import (
    Qgis,
    QgsCategorizedSymbolRenderer,
    QgsLineSymbol,
    QgsMarkerSymbol,
    QgsProcessingLayerPostProcessorInterface,
    QgsRendererCategory,
    QgsVectorLayer,
    QgsWkbTypes,
)
from qgis.PyQt.QtCore import QVariant
from qgis.PyQt.QtGui import QColor

from .core.reports.palette import COMFORT_PALETTE, NOT_COMPUTED_COLOUR
from .core.validation import show

CLASS_FIELD = "comfort_class"
TIME_FIELD = "eta_utc"
OUTLINE = "#3a3a3a"


def _labels() -> Tuple[str, ...]:
    from .core.comfort.indices import COMFORT_CLASS_LABELS

    return tuple(COMFORT_CLASS_LABELS)


def _symbol(geometry_type: Any, colour: str) -> Any:
    if geometry_type == QgsWkbTypes.GeometryType.LineGeometry:
        sym = QgsLineSymbol.createSimple({"line_color": colour, "line_width": "1.4", "capstyle": "round"})
    else:
        sym = QgsMarkerSymbol.createSimple({
            "name": "circle", "color": colour, "size": "2.6",
            "outline_color": OUTLINE, "outline_width": "0.2",
        })
    sym.setColor(QColor(colour))
    return sym


def comfort_renderer(geometry_type: Any) -> QgsCategorizedSymbolRenderer:
    """A categorized renderer on ``comfort_class``: classes 0..4 and NULL = not computed."""
    cats: List[QgsRendererCategory] = []
    for c, label in enumerate(_labels()):
        cats.append(QgsRendererCategory(c, _symbol(geometry_type, COMFORT_PALETTE[c]), f"{c} {label}"))
    cats.append(QgsRendererCategory(QVariant(), _symbol(geometry_type, NOT_COMPUTED_COLOUR), "not computed"))
    return QgsCategorizedSymbolRenderer(CLASS_FIELD, cats)


def apply_temporal(layer: QgsVectorLayer, field: str = TIME_FIELD) -> None:
    """Each feature is an instant at ``field``; features accumulate as time runs."""
    tp = layer.temporalProperties()
    tp.setMode(Qgis.VectorTemporalMode.FeatureDateTimeInstantFromField)
    tp.setStartField(field)
    tp.setAccumulateFeatures(True)
    tp.setIsActive(True)


def apply_metadata(layer: QgsVectorLayer, title: str, abstract: str) -> None:
    md = layer.metadata()
    md.setTitle(title)
    md.setAbstract(abstract)
    layer.setMetadata(md)


def apply_comfort_style(layer: QgsVectorLayer, *, title: str = "", abstract: str = "") -> None:
    """Renderer, temporal properties and (when given) provenance metadata on a layer."""
    layer.setRenderer(comfort_renderer(layer.geometryType()))
    if layer.fields().indexOf(TIME_FIELD) >= 0:
        apply_temporal(layer)
    if title or abstract:
        apply_metadata(layer, title, abstract)
    layer.triggerRepaint()


def _file_and_layer(dest: str) -> Tuple[str, Optional[str]]:
    """(file path, layer name or None) of an OGR output string ('x.gpkg|layername=y' or ogr:...)."""
    text = str(dest)
    layer = None
    if text.startswith("ogr:"):
        body = text[4:]
        path = body.split("dbname=", 1)[1].strip().split(" ")[0].strip("'\"") if "dbname=" in body else body
        if "table=" in body:
            layer = body.split("table=", 1)[1].strip().split(" ")[0].strip("'\"")
        return path, layer
    path, _, opts = text.partition("|")
    for opt in opts.split("|"):
        if opt.startswith("layername="):
            layer = opt.split("=", 1)[1]
    return path, layer


def qml_path_for(dest: str) -> str:
    """The QML file QGIS loads with a file output: '<file base>.qml' ('<base>_<layer>.qml' when
    the output names a table inside a multi-layer file)."""
    path, layer = _file_and_layer(dest)
    base = os.path.splitext(path)[0]
    stem = os.path.basename(base)
    if layer and layer != stem:
        return f"{base}_{layer}.qml"
    return base + ".qml"


def mark_datetimes_utc(dest: str) -> None:
    """Make every date-time in a GeoPackage output carry its UTC marker ('...Z').

    All our date-times are UTC. QGIS 3.40 writes them to a GeoPackage with the 'Z' of ISO 8601;
    QGIS 3.22 writes the same instant without it, which readers then take for local time
    (GeoPackage 1.3, requirement 5: DATETIME in ISO 8601 'YYYY-MM-DDTHH:MM:SS.SSSZ'). Adding the
    marker where it is missing gives the same file on both. Other formats are left as written.
    """
    path, layer_name = _file_and_layer(dest)
    if not path.lower().endswith(".gpkg") or not os.path.isfile(path):
        return
    from osgeo import ogr

    ds = ogr.Open(path, 1)
    if ds is None:
        return
    try:
        layers = [ds.GetLayerByName(layer_name)] if layer_name else [ds.GetLayer(i) for i in range(ds.GetLayerCount())]
        for lyr in (x for x in layers if x is not None):
            defn = lyr.GetLayerDefn()
            for i in range(defn.GetFieldCount()):
                fd = defn.GetFieldDefn(i)
                if fd.GetType() == ogr.OFTDateTime:
                    table, col = lyr.GetName().replace('"', '""'), fd.GetName().replace('"', '""')
                    ds.ExecuteSQL(f'UPDATE "{table}" SET "{col}" = "{col}" || \'Z\' '
                                  f'WHERE "{col}" IS NOT NULL AND "{col}" NOT LIKE \'%Z\'')
    finally:
        ds = None


def save_output_style(dest: str, *, title: str, abstract: str) -> Tuple[str, List[str]]:
    """Open a written output, style it and save the style beside it (and into a GeoPackage).

    Writes '<base>.qml' (renderer and temporal settings) and '<base>.qmd' (the provenance
    metadata; QGIS keeps layer metadata out of QML files). Returns (QML path, warnings). Never raises for a style that cannot be stored in the file;
    it reports it in the warnings instead (the QML still holds everything).
    """
    warnings: List[str] = []
    mark_datetimes_utc(dest)
    layer = QgsVectorLayer(dest, os.path.basename(str(dest)), "ogr")
    if not layer.isValid():
        return "", [f"could not reopen {show(dest)} to save its style"]
    apply_comfort_style(layer, title=title, abstract=abstract)
    qml = qml_path_for(dest)
    msg, ok = layer.saveNamedStyle(qml)
    if not ok:
        warnings.append(f"style not saved to {show(qml)}: {msg}")
    qmd = qml[: -len(".qml")] + ".qmd"
    msg, ok = layer.saveNamedMetadata(qmd)
    if not ok:
        warnings.append(f"metadata not saved to {show(qmd)}: {msg}")
    path, _ = _file_and_layer(dest)
    if path.lower().endswith(".gpkg"):
        err = layer.saveStyleToDatabase("default", "Seaway Comfort: comfort classes", True, "")
        if err:
            warnings.append(f"default style not stored in {show(path)}: {err}")
    return qml, warnings


class ComfortStylePostProcessor(QgsProcessingLayerPostProcessorInterface):
    """Styles an output when Processing loads it into the project (GUI, runAndLoadResults)."""

    _alive: ClassVar[List["ComfortStylePostProcessor"]] = []

    def __init__(self, title: str = "", abstract: str = "") -> None:
        super().__init__()
        self.title = title
        self.abstract = abstract

    def postProcessLayer(self, layer: Any, context: Any, feedback: Any) -> None:  # noqa: N802
        if isinstance(layer, QgsVectorLayer):
            apply_comfort_style(layer, title=self.title, abstract=self.abstract)

    @classmethod
    def create(cls, title: str = "", abstract: str = "") -> "ComfortStylePostProcessor":
        """A new instance kept alive for the session (Processing holds only a raw pointer)."""
        inst = cls(title, abstract)
        cls._alive.append(inst)
        return inst
