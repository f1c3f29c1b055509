# SPDX-License-Identifier: GPL-2.0-or-later
"""Sea-state ingest (GRIB2, NetCDF-CF, GeoTIFF stacks, bathymetry) and sampling along a route.

Pure numerical core plus GDAL's ``osgeo`` bindings; never imports QGIS. Results are planning aids
only (see :data:`..flags.CAUTION`).
"""
from __future__ import annotations

from . import probe
from .bathymetry import Bathymetry, DepthSample, open_bathymetry
from .inventory import GridDescription, IgnoredEntry, Inventory, VariableEntry
from .source import (
    SampledSeaState,
    SamplingCancelled,
    SeaStateSource,
    describe_file,
    open_sea_state,
)

__all__ = [
    "Bathymetry", "DepthSample", "open_bathymetry",
    "GridDescription", "IgnoredEntry", "Inventory", "VariableEntry",
    "SampledSeaState", "SamplingCancelled", "SeaStateSource", "describe_file", "open_sea_state",
]
