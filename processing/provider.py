# SPDX-License-Identifier: GPL-2.0-or-later
"""The Processing provider "Seaway Comfort" (id ``seawaycomfort``)."""
from __future__ import annotations

from pathlib import Path
from typing import List

from qgis.core import QgsProcessingAlgorithm, QgsProcessingProvider
from qgis.PyQt.QtGui import QIcon

PROVIDER_ID = "seawaycomfort"
ICON_PATH = Path(__file__).resolve().parent.parent / "plugin" / "icons" / "seaway_comfort.svg"


def algorithm_classes() -> List[type]:
    """Every algorithm class of the provider, in menu order (one tuple, one place)."""
    from .algorithms import ALGORITHM_CLASSES

    return list(ALGORITHM_CLASSES)


class SeawayComfortProvider(QgsProcessingProvider):
    """Registers the plugin's algorithms with the Processing framework."""

    def id(self) -> str:  # noqa: A003 (QGIS API name)
        return PROVIDER_ID

    def name(self) -> str:
        return "Seaway Comfort"

    def longName(self) -> str:  # noqa: N802
        return "Seaway Comfort: passage comfort and safety from sea-state forecasts"

    def icon(self) -> QIcon:
        return QIcon(str(ICON_PATH))

    def loadAlgorithms(self) -> None:  # noqa: N802
        from qgis.core import QgsApplication

        from .core.motions.rao_cache import set_default_cache_folder

        # strip-theory RAO sets are cached in the QGIS settings folder for QGIS runs
        set_default_cache_folder(Path(QgsApplication.qgisSettingsDirPath()) / "seaway_comfort" / "rao_cache")
        for cls in algorithm_classes():
            alg: QgsProcessingAlgorithm = cls()
            self.addAlgorithm(alg)
