# SPDX-License-Identifier: GPL-2.0-or-later
"""The QGIS plugin object: registers the Processing provider, menus and toolbar."""
from __future__ import annotations

import importlib
from pathlib import Path
from typing import Any, Callable, Dict, List, Optional

from qgis.core import QgsApplication
from qgis.PyQt.QtCore import QCoreApplication, QTranslator
from qgis.PyQt.QtGui import QIcon
from qgis.PyQt.QtWidgets import QAction, QMessageBox

from ..processing.core.flags import CAUTION
from ..processing.provider import PROVIDER_ID, SeawayComfortProvider
from .translation import install_translator, remove_translator

ICON_PATH = Path(__file__).resolve().parent / "icons" / "seaway_comfort.svg"
ROUTE_COMFORT_ALG = f"{PROVIDER_ID}:routecomfort"
DESCRIBE_SEASTATE_ALG = f"{PROVIDER_ID}:describeseastate"
DEPARTURE_SWEEP_ALG = f"{PROVIDER_ID}:departuresweep"
SEASONAL_CLIMATE_ALG = f"{PROVIDER_ID}:seasonalclimate"
ROUTE_ALGS = (ROUTE_COMFORT_ALG, DEPARTURE_SWEEP_ALG, SEASONAL_CLIMATE_ALG)
OUTPUT_MARK_FIELDS = ("comfort_class", "ok_sel", "rank")
"""A line layer with one of these fields is one of our outputs, never offered as the route."""


def route_candidate(project: Any, active: Optional[Any] = None) -> Optional[Any]:
    """The line layer to offer as ROUTE: the active layer if it is a route, else the first
    route in the layer tree; our own outputs (passage segments, climate segments) never."""
    from qgis.core import QgsMapLayerType, QgsVectorLayer, QgsWkbTypes

    def is_route(layer: Any) -> bool:
        return (isinstance(layer, QgsVectorLayer) and layer.type() == QgsMapLayerType.VectorLayer
                and layer.geometryType() == QgsWkbTypes.GeometryType.LineGeometry
                and not any(layer.fields().indexOf(f) >= 0 for f in OUTPUT_MARK_FIELDS))

    if active is not None and is_route(active):
        return active
    for layer in project.layerTreeRoot().layerOrder():
        if is_route(layer):
            return layer
    return None


def qgis_processing_module() -> Any:
    """QGIS's own ``processing`` package (``execAlgorithmDialog`` lives there), imported late.

    Imported by name through importlib, only when a menu entry is used: a plain
    ``import processing`` statement anywhere in our package is forbidden by the layering and
    Qt6 guards (it must never be confused with our own ``processing`` subpackage, which is only
    reached by relative imports).
    """
    return importlib.import_module("processing")


class SeawayComfortPlugin:
    """Plugin entry object returned by ``classFactory``.

    Desktop QGIS calls ``initGui`` (which calls ``initProcessing``) and ``unload``;
    ``qgis_process`` calls ``initProcessing`` only, with ``iface`` None.
    """

    MENU = "&Seaway Comfort"

    def __init__(self, iface: Optional[Any]) -> None:
        self.iface = iface
        self.provider: Optional[SeawayComfortProvider] = None
        self.actions: List[QAction] = []
        self.toolbar_actions: List[QAction] = []
        self.translator: Optional[QTranslator] = None
        self.vessel_dialog: Optional[Any] = None

    @staticmethod
    def tr(text: str) -> str:
        """Translate ``text`` in this class's context (pylupdate5 files it under the class name)."""
        return QCoreApplication.translate("SeawayComfortPlugin", text)

    # ------------------------------------------------------------------ lifecycle
    def initProcessing(self) -> None:  # noqa: N802 (QGIS API name)
        if self.provider is not None:
            return
        provider = SeawayComfortProvider()
        # addProvider returns False (and deletes the object) for a duplicate id.
        if QgsApplication.processingRegistry().addProvider(provider):
            self.provider = provider

    def initGui(self) -> None:  # noqa: N802
        self.initProcessing()
        if self.translator is None:
            self.translator = install_translator()
        if self.iface is None:
            return
        icon = QIcon(str(ICON_PATH))
        self._add_action(
            self.tr("Passage comfort along a route..."),
            lambda: self.open_algorithm_dialog(ROUTE_COMFORT_ALG),
            icon=icon,
            tip=self.tr("Predict motions, comfort and guidance flags along a route from "
                        "sea-state forecasts"),
            toolbar=True,
        )
        self._add_action(
            self.tr("When to leave: departure sweep..."),
            lambda: self.open_algorithm_dialog(DEPARTURE_SWEEP_ALG),
            tip=self.tr("Compare departure times (and speeds) over the forecast and recommend one"),
        )
        self._add_action(
            self.tr("Seasonal comfort climate..."),
            lambda: self.open_algorithm_dialog(SEASONAL_CLIMATE_ALG),
            tip=self.tr("How often, month by month, a passage along the route stays comfortable (hindcast)"),
        )
        self._add_action(
            self.tr("Describe a forecast file..."),
            lambda: self.open_algorithm_dialog(DESCRIBE_SEASTATE_ALG),
            tip=self.tr("List the variables, grid and time steps of a sea-state file"),
        )
        self._add_action(
            self.tr("Vessel profiles..."),
            lambda: self.open_vessel_manager(),
            tip=self.tr("Create, check and edit the vessel profiles the calculations use"),
        )

    def unload(self) -> None:
        if self.vessel_dialog is not None:
            self.vessel_dialog.discard_and_close()
            self.vessel_dialog.deleteLater()
            self.vessel_dialog = None
        for action in self.actions:
            if self.iface is not None:
                self.iface.removePluginMenu(self.MENU, action)
                if action in self.toolbar_actions:
                    self.iface.removeToolBarIcon(action)
            action.deleteLater()
        self.actions = []
        self.toolbar_actions = []
        remove_translator(self.translator)
        self.translator = None
        if self.provider is not None:
            QgsApplication.processingRegistry().removeProvider(self.provider)
            self.provider = None

    # ------------------------------------------------------------------ slots
    def open_algorithm_dialog(self, algorithm_id: str) -> bool:
        """Open the Processing dialog of ``algorithm_id``; False (with a message) if not there."""
        registry = QgsApplication.processingRegistry()
        if registry.algorithmById(algorithm_id) is None:
            self.show_message(
                self.tr("Seaway Comfort"),
                self.tr("The Processing algorithm {0} is not available. Check that the "
                        "Seaway Comfort plugin is enabled and the Processing plugin is active "
                        "(Plugins > Manage and Install Plugins).").format(algorithm_id),
            )
            return False
        try:
            qgis_processing = qgis_processing_module()
        except ImportError as exc:
            self.show_message(
                self.tr("Seaway Comfort"),
                self.tr("QGIS's Processing framework could not be loaded: {0}").format(exc),
            )
            return False
        qgis_processing.execAlgorithmDialog(algorithm_id, self.initial_parameters(algorithm_id))
        return True

    def initial_parameters(self, algorithm_id: str) -> Dict[str, Any]:
        """Values the dialog opens with: the project's route (never one of our outputs) as ROUTE."""
        from qgis.core import QgsProject

        if algorithm_id not in ROUTE_ALGS:
            return {}
        active = self.iface.activeLayer() if self.iface is not None else None
        layer = route_candidate(QgsProject.instance(), active)
        return {"ROUTE": layer.id()} if layer is not None else {}

    def open_vessel_manager(self) -> None:
        """Show the vessel-profile manager (modal)."""
        from .vessel_manager import VesselManagerDialog

        parent = self.iface.mainWindow() if self.iface is not None else None
        if self.vessel_dialog is None:
            self.vessel_dialog = VesselManagerDialog(parent=parent)
        else:
            self.vessel_dialog.reload()
        self.vessel_dialog.exec()

    def show_message(self, title: str, text: str) -> None:
        """Warn the user (a separate method so tests can capture it)."""
        parent = self.iface.mainWindow() if self.iface is not None else None
        QMessageBox.warning(parent, title, text + "\n\n" + CAUTION)

    # ------------------------------------------------------------------ helpers
    def _add_action(self, text: str, slot: Callable[[], Any], *, icon: Optional[QIcon] = None,
                    tip: str = "", toolbar: bool = False) -> QAction:
        parent = self.iface.mainWindow()
        action = QAction(icon, text, parent) if icon is not None else QAction(text, parent)
        action.setObjectName("seaway_comfort_" + str(len(self.actions)))
        if tip:
            action.setStatusTip(tip)
            action.setToolTip(tip)
        action.triggered.connect(lambda _checked=False: slot())
        self.iface.addPluginToMenu(self.MENU, action)
        if toolbar:
            self.iface.addToolBarIcon(action)
            self.toolbar_actions.append(action)
        self.actions.append(action)
        return action
