# SPDX-License-Identifier: GPL-2.0-or-later
"""Run by tests/qgis/test_clean_exit.py in a subprocess (not collected: no test_ prefix).

The sequence behind the exit crash: GDAL datasets and a QGIS layer still alive when pytest-qgis
calls exitQgis() (kept alive by reference cycles and by the
climate reader cache, whose atexit close runs only after exitQgis)."""
from __future__ import annotations

from osgeo import gdal


class _Holder:
    def __init__(self, ds):  # type: ignore[no-untyped-def]
        self.ds = ds
        self.me = self  # a cycle: freed only by the garbage collector


def test_hold_datasets_and_layer_in_cycles(tmp_path):
    from qgis.core import QgsProject, QgsVectorLayer

    for i in range(20):
        _Holder(gdal.GetDriverByName("GTiff").Create(str(tmp_path / f"d{i}.tif"), 8, 8, 1))
    from seaway_comfort.processing.core.climate.hindcast import process_reader

    src = tmp_path / "held.tif"
    gdal.GetDriverByName("GTiff").Create(str(src), 8, 8, 1).FlushCache()
    process_reader().get(str(src))  # the per-thread reader cache keeps it open (closed atexit)
    layer = QgsVectorLayer("Point?crs=EPSG:4326", "probe", "memory")
    assert layer.isValid()
    QgsProject.instance().addMapLayer(layer)
