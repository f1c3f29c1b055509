# SPDX-License-Identifier: GPL-2.0-or-later
"""The QGIS plugin object: registers the Processing provider, menus and toolbar."""
from __future__ import annotations

from typing import Any, List, Optional

from qgis.core import QgsApplication

from ..processing.provider import SeawayComfortProvider


class SeawayComfortPlugin:
    """Plugin entry object returned by ``classFactory``.

    Desktop QGIS calls ``initGui`` (which calls ``initProcessing``) and ``unload``;
    ``qgis_process`` calls ``initProcessing`` only, with ``iface`` None.
    """

    def __init__(self, iface: Optional[Any]) -> None:
        self.iface = iface
        self.provider: Optional[SeawayComfortProvider] = None
        self.actions: List[Any] = []

    def initProcessing(self) -> None:  # noqa: N802 (QGIS API name)
        if self.provider is not None:
            return
        provider = SeawayComfortProvider()
        # addProvider returns False (and deletes the object) for a duplicate id.
        if QgsApplication.processingRegistry().addProvider(provider):
            self.provider = provider

    def initGui(self) -> None:  # noqa: N802
        self.initProcessing()

    def unload(self) -> None:
        for action in self.actions:
            if self.iface is not None:
                self.iface.removePluginMenu("&Seaway Comfort", action)
                self.iface.removeToolBarIcon(action)
            action.deleteLater()
        self.actions = []
        if self.provider is not None:
            QgsApplication.processingRegistry().removeProvider(self.provider)
            self.provider = None
