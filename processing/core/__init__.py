# SPDX-License-Identifier: GPL-2.0-or-later
"""Pure numerical core of Seaway Comfort.

Imports only the standard library, numpy and pyproj (``seastate/`` also uses GDAL's
``osgeo``; scipy only where a module says so, never on the passage and climate paths). It never imports qgis, PyQt/Qt or QGIS's ``processing``; a test enforces this.
Everything is vectorised over numpy arrays, SI units inside, units in every name.
"""
