# SPDX-License-Identifier: GPL-2.0-or-later
"""Standalone QGIS sessions for scripts (the demo, benchmarks) that run outside the desktop.

QGIS objects (projects, layers, providers) must be destroyed *before* ``exitQgis()``: a
``QgsProject`` or layer that outlives the application is freed after QGIS has torn down its
registries, which crashes the process at exit (seen on QGIS 3.40). :func:`run_with_qgis` runs
the work in its own call frame, so every QGIS object it made is released when it returns (or,
on an error, when the traceback's frames are cleared), then collects garbage, then exits QGIS.
"""
from __future__ import annotations

import gc
import os
import traceback
from typing import Callable, TypeVar

T = TypeVar("T")


def run_with_qgis(work: Callable[[], T]) -> T:
    """``work()`` inside a QGIS application; one is started (and ended) only if none runs."""
    from qgis.core import QgsApplication

    own_app = None
    if QgsApplication.instance() is None:
        os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
        own_app = QgsApplication([], False)
        own_app.initQgis()
    try:
        return work()
    except BaseException as exc:
        traceback.clear_frames(exc.__traceback__)
        raise
    finally:
        gc.collect()
        if own_app is not None:
            own_app.exitQgis()
            del own_app
            gc.collect()
