# SPDX-License-Identifier: GPL-2.0-or-later
"""Shared QGIS test fixtures: the Seaway Comfort provider, registered once per session.

QGIS's ``addProvider`` returns False for a duplicate id AND deletes the object passed, so the
provider is registered exactly once here and its return value is checked.
"""
from __future__ import annotations

import pytest


@pytest.fixture(scope="session")
def seaway_provider(qgis_app, qgis_processing):  # noqa: ARG001 (fixtures start QGIS)
    from qgis.core import QgsApplication

    from seaway_comfort.processing.provider import PROVIDER_ID, SeawayComfortProvider

    registry = QgsApplication.processingRegistry()
    existing = registry.providerById(PROVIDER_ID)
    if existing is not None:
        yield existing
        return
    provider = SeawayComfortProvider()
    assert registry.addProvider(provider), "addProvider refused the Seaway Comfort provider"
    yield provider
    if registry.providerById(PROVIDER_ID) is provider:
        registry.removeProvider(provider)


@pytest.fixture(scope="session", autouse=True)
def layer_tree_view(qgis_app, qgis_iface):  # noqa: ARG001 (fixtures start QGIS)
    """A real layer tree view behind the stub iface.

    QGIS >= 3.44's result handling (processing.gui.Postprocessing) passes
    ``iface.layerTreeView()`` to ``QgsProcessingGuiUtils.addResultLayers``, which refuses the
    stub's MagicMock; the desktop gives a real view, so the tests do too.
    """
    from qgis.core import QgsLayerTreeModel, QgsProject
    from qgis.gui import QgsLayerTreeView

    model = QgsLayerTreeModel(QgsProject.instance().layerTreeRoot())
    view = QgsLayerTreeView()
    view.resize(300, 400)
    view.setModel(model)
    original = qgis_iface.layerTreeView
    qgis_iface.layerTreeView = lambda: view
    yield view
    qgis_iface.layerTreeView = original
    QgsProject.instance().removeAllMapLayers()
    view.setModel(None)
    view.deleteLater()
    model.deleteLater()
    qgis_app.processEvents()
