# SPDX-License-Identifier: GPL-2.0-or-later
"""Base class of every Seaway Comfort algorithm: translation, group, instance creation."""
from __future__ import annotations

from qgis.core import QgsProcessingAlgorithm
from qgis.PyQt.QtCore import QCoreApplication


class SeawayAlgorithm(QgsProcessingAlgorithm):
    """The parts of the QGIS algorithm template that are the same for all our algorithms.

    ``tr`` translates in the context of the concrete class name, which is where pylupdate5
    files a ``self.tr("...")`` written inside that class.
    """

    def tr(self, text: str) -> str:
        return QCoreApplication.translate(type(self).__name__, text)

    def group(self) -> str:
        return QCoreApplication.translate("SeawayAlgorithm", "Passage planning")

    def groupId(self) -> str:  # noqa: N802 (QGIS API name)
        return "passage"

    def createInstance(self) -> "SeawayAlgorithm":  # noqa: N802
        return type(self)()
