# SPDX-License-Identifier: GPL-2.0-or-later
"""Styles for passage outputs: comfort-class renderers, time settings, provenance metadata.

Colours come from :data:`.core.report.COMFORT_PALETTE` (our own five-step light-to-dark palette,
kept apart by lightness so it reads under colour-vision deficiencies; grey = not computed).
Styles are written where they hold without any post-processor (qgis_process, processing.run):
a QML file beside the output (renderer AND temporal settings) and, for GeoPackages, the
default style in the file (QGIS restores its renderer on open, not its temporal settings).
When outputs are loaded into a project, :class:`StylePostProcessor` applies the same;
:func:`style_output` makes that choice for every algorithm.
"""
from __future__ import annotations

import os
from dataclasses import dataclass
from typing import Any, Callable, ClassVar, List, Optional, Tuple

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

from .core.reports.passage import COMFORT_PALETTE, NOT_COMPUTED_COLOUR
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


@dataclass(frozen=True)
class OutputStyle:
    """How one output is dressed: title and abstract (provenance and caution) always, and a
    renderer when ``apply`` sets one (``table=True``: metadata only, for layers without geometry).

    ``apply(layer, title=..., abstract=...)`` styles an open layer; the default is
    :func:`apply_comfort_style`.
    """

    title: str
    abstract: str
    apply: Callable[..., None] = apply_comfort_style
    table: bool = False


def apply_metadata_only(layer: QgsVectorLayer, *, title: str = "", abstract: str = "") -> None:
    """Provenance metadata without a renderer (the ``apply`` of table outputs)."""
    apply_metadata(layer, title, abstract)


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


def save_output_style(dest: str, style: OutputStyle) -> Tuple[str, List[str]]:
    """Open a written output, style it and save the style beside it (and into a GeoPackage).

    Writes '<base>.qml' (renderer and temporal settings; not for tables) and '<base>.qmd' (the
    provenance metadata; QGIS keeps layer metadata out of QML files). Returns (QML path or "",
    warnings). Never raises for a style that cannot be stored in the file; it reports it in the
    warnings instead. Date-times in a GeoPackage get their UTC marker first.
    """
    mark_datetimes_utc(dest)
    layer = QgsVectorLayer(dest, os.path.basename(str(dest)), "ogr")
    if not layer.isValid():
        return "", [f"could not reopen {show(dest)} to save its style"]
    style.apply(layer, title=style.title, abstract=style.abstract)
    qml = "" if style.table else qml_path_for(dest)
    saves = [(layer.saveNamedStyle, qml, "style")] if qml else []
    saves.append((layer.saveNamedMetadata, qml_path_for(dest)[: -len(".qml")] + ".qmd", "metadata"))
    warnings: List[str] = []
    for save, target, what in saves:
        msg, ok = save(target)
        if not ok:
            warnings.append(f"{what} not saved to {show(target)}: {msg}")
    path, _ = _file_and_layer(dest)
    if qml and path.lower().endswith(".gpkg"):
        err = layer.saveStyleToDatabase("default", style.title, True, "")
        if err:
            warnings.append(f"default style not stored in {show(path)}: {err}")
    return qml, warnings


def style_output(dest_id: str, style: OutputStyle, context: Any, feedback: Any) -> None:
    """Dress a written output wherever it ends up, in the one place every algorithm uses.

    A memory layer held by the context is styled directly; a file output is reopened, styled and
    its style saved beside it (so qgis_process and processing.run get it too); and an output the
    run will load into a project gets a post-processor that styles the loaded layer.
    """
    if not dest_id:
        return
    layer = context.getMapLayer(dest_id)
    if layer is not None and layer.providerType() == "memory":
        style.apply(layer, title=style.title, abstract=style.abstract)
    else:
        for warning in save_output_style(dest_id, style)[1]:
            feedback.pushWarning(warning)
    if not style.table and context.willLoadLayerOnCompletion(dest_id):
        context.layerToLoadOnCompletionDetails(dest_id).setPostProcessor(StylePostProcessor.create(style))


class StylePostProcessor(QgsProcessingLayerPostProcessorInterface):
    """Styles an output when Processing loads it into the project (GUI, runAndLoadResults)."""

    _alive: ClassVar[List["StylePostProcessor"]] = []

    def __init__(self, style: OutputStyle) -> None:
        super().__init__()
        self.style = style

    def postProcessLayer(self, layer: Any, context: Any, feedback: Any) -> None:  # noqa: N802
        if isinstance(layer, QgsVectorLayer):
            self.style.apply(layer, title=self.style.title, abstract=self.style.abstract)

    @classmethod
    def create(cls, style: OutputStyle) -> "StylePostProcessor":
        """A new instance kept alive for the session (Processing holds only a raw pointer)."""
        inst = cls(style)
        cls._alive.append(inst)
        return inst
