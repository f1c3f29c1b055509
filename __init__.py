# SPDX-License-Identifier: GPL-2.0-or-later
"""Seaway Comfort: passage comfort and safety along a route from gridded sea-state data.

QGIS loads this package by its folder name and calls :func:`classFactory`. Nothing here may
touch ``iface`` at import time: ``qgis_process`` calls ``classFactory(None)`` and then
``initProcessing()`` only.
"""


def classFactory(iface):  # noqa: N802 (QGIS API name)
    """Return the plugin object (QGIS entry point)."""
    from .plugin.main import SeawayComfortPlugin

    return SeawayComfortPlugin(iface)
