# SPDX-License-Identifier: GPL-2.0-or-later
"""Base class of every Seaway Comfort algorithm and the one run skeleton they share.

``processAlgorithm`` lives here only: parameters -> settings (:meth:`read_settings`) -> output
destinations checked -> core call (:meth:`compute`) -> sinks and their styles
(:meth:`write_sinks`) -> report and log (:meth:`write_report`). Each algorithm fills the four
hooks; :class:`Run` carries the glue they all need (destinations, sinks, styles, progress).
"""
from __future__ import annotations

import os
from typing import Any, Callable, Dict, Iterable, Optional, Sequence

from qgis.core import (
    QgsFeatureSink,
    QgsProcessingAlgorithm,
    QgsProcessingContext,
    QgsProcessingException,
    QgsProcessingFeedback,
    QgsProcessingOutputLayerDefinition,
    QgsProcessingParameterFileDestination,
    QgsProperty,
)
from qgis.PyQt.QtCore import QCoreApplication

from ..core.validation import show
from . import common

TEMPORARY = ("memory:", "TEMPORARY_OUTPUT")


class Run:
    """One execution: the algorithm, its parameters, context and feedback, and the shared glue."""

    def __init__(self, alg: QgsProcessingAlgorithm, parameters: Dict[str, Any], context: QgsProcessingContext,
                 feedback: QgsProcessingFeedback) -> None:
        self.alg, self.parameters, self.context, self.feedback = alg, parameters, context, feedback

    def wants(self, name: str) -> bool:
        """True when the (optional) output ``name`` was asked for."""
        return bool(self.parameters.get(name))

    def progress(self, start: float, stop: float) -> Callable[[float], bool]:
        """A core ``progress(fraction) -> bool`` mapped onto start..stop % (False once cancelled)."""
        def report(fraction: float) -> bool:
            self.feedback.setProgress(start + (stop - start) * float(fraction))
            return not self.feedback.isCanceled()

        return report

    def file_output(self, name: str) -> str:
        """Path of a file destination (HTML, CSV) that was asked for, else ""."""
        return self.alg.parameterAsFileOutput(self.parameters, name, self.context) if self.wants(name) else ""

    def destination(self, name: str) -> str:
        """The file or URI chosen for output ``name``; "" for a temporary layer or none.

        Read from the parameter value (or its default) without ``parameterAsOutputLayer``,
        which for a sink would register a second, never-written ``memory:<name>`` layer to load.
        """
        definition = self.alg.parameterDefinition(name)
        if isinstance(definition, QgsProcessingParameterFileDestination):
            return self.file_output(name)
        value = self.parameters.get(name)
        if value is None and definition is not None:
            value = definition.defaultValue()
        if isinstance(value, QgsProcessingOutputLayerDefinition):
            value = value.sink
        if isinstance(value, QgsProperty):
            value = value.valueAsString(self.context.expressionContext(), "")[0]
        text = "" if value is None else str(value)
        if not text or text.startswith(TEMPORARY):
            return ""
        if not text.startswith("ogr:") and not os.path.splitext(common.file_part(text))[1] and definition is not None:
            text += "." + definition.defaultFileExtension()  # what QGIS writes for a path without extension
        return text

    def check_destinations(self, names: Sequence[str], inputs: Sequence[str]) -> None:
        """Refuse outputs that overwrite an input, cannot be written, or share one file."""
        dests = [(name, self.destination(name)) for name in names]
        common.check_outputs(dests, inputs)
        files = [common.file_part(d) for _, d in dests if d]
        if len(set(files)) < len(files):
            raise QgsProcessingException(f"{', '.join(names[:-1])} and {names[-1]} must be different files")

    def write_sink(self, name: str, fields: Any, wkb: Any, crs: Any, features: Iterable[Any],
                   style: Optional[Any] = None) -> str:
        """Create sink ``name``, write ``features``, close it, dress it (:func:`..styling.style_output`);
        returns the destination id."""
        from ..styling import style_output

        sink, dest_id = self.alg.parameterAsSink(self.parameters, name, self.context, fields, wkb, crs)
        if sink is None:
            raise QgsProcessingException(
                f"{name} {show(self.destination(name) or 'temporary layer')} could not be created: check the path")
        for feature in features:
            sink.addFeature(feature, QgsFeatureSink.Flag.FastInsert)
        del sink  # flushes and closes a file before it is reopened for its style
        if style is not None:
            style_output(dest_id, style, self.context, self.feedback)
        return dest_id


class SeawayAlgorithm(QgsProcessingAlgorithm):
    """The parts of the QGIS algorithm template that are the same for all our algorithms.

    ``tr`` translates in the context of the concrete class name, which is where pylupdate5
    files a ``self.tr("...")`` written inside that class. ``OUTPUT_FILES`` names the output
    parameters checked against the inputs and against each other before the core runs.
    """

    OUTPUT_FILES: Sequence[str] = ()

    def tr(self, text: str) -> str:
        return QCoreApplication.translate(type(self).__name__, text)

    def group(self) -> str:
        return QCoreApplication.translate("SeawayAlgorithm", "Passage planning")

    def groupId(self) -> str:  # noqa: N802 (QGIS API name)
        return "passage"

    def createInstance(self) -> "SeawayAlgorithm":  # noqa: N802
        return type(self)()

    def processAlgorithm(  # noqa: N802
        self, parameters: Dict[str, Any], context: QgsProcessingContext, feedback: QgsProcessingFeedback
    ) -> Dict[str, Any]:
        run = Run(self, parameters, context, feedback or QgsProcessingFeedback())
        settings = self.read_settings(run)
        run.check_destinations(self.OUTPUT_FILES, settings.inputs)
        result = self.compute(run, settings)
        out = self.write_sinks(run, settings, result)
        out.update(self.write_report(run, settings, result))
        run.feedback.setProgress(100)
        return out

    # hooks ------------------------------------------------------------------------------------
    def read_settings(self, run: Run) -> Any:
        """Parsed, checked parameters; must expose ``inputs`` (paths no output may overwrite)."""
        raise NotImplementedError

    def compute(self, run: Run, settings: Any) -> Any:
        """The core call; QgsProcessingException on bad input or cancel (no outputs written yet)."""
        raise NotImplementedError

    def write_sinks(self, run: Run, settings: Any, result: Any) -> Dict[str, Any]:
        """Layer outputs (through :meth:`Run.write_sink`); their ids by output name."""
        return {}

    def write_report(self, run: Run, settings: Any, result: Any) -> Dict[str, Any]:
        """Log, summary and file outputs; their values by output name."""
        return {}
