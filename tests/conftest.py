# SPDX-License-Identifier: GPL-2.0-or-later
"""Test configuration: expose this checkout as the package ``seaway_comfort``.

The repository root *is* the plugin package. Putting the root itself on ``sys.path`` would
let our ``processing/`` folder shadow QGIS's own ``processing`` package, so instead a
temporary folder holding a symlink ``seaway_comfort -> <checkout>`` goes on ``sys.path``.
This works whatever the checkout folder is called. The same folder serves as
``QGIS_PLUGINPATH`` for tests that start ``qgis_process``.
"""
from __future__ import annotations

import atexit
import os
import shutil
import sys
import tempfile
from pathlib import Path

import pytest

REPO_ROOT = Path(__file__).resolve().parent.parent
PACKAGE_NAME = "seaway_comfort"

_PKG_PARENT = Path(tempfile.mkdtemp(prefix="seaway_pkg_"))
os.symlink(REPO_ROOT, _PKG_PARENT / PACKAGE_NAME, target_is_directory=True)
atexit.register(shutil.rmtree, _PKG_PARENT, True)
# strip-theory RAO sets of the test run go to a temporary folder, never the user's cache
os.environ.setdefault("SEAWAY_COMFORT_RAO_CACHE", str(_PKG_PARENT / "rao_cache"))
sys.path.insert(0, str(_PKG_PARENT))
# The repository root must never be importable as a top-level folder.
sys.path[:] = [p for p in sys.path if Path(p or ".").resolve() != REPO_ROOT]
_QGIS_PLUGINS = "/usr/share/qgis/python/plugins"
if os.path.isdir(_QGIS_PLUGINS) and _QGIS_PLUGINS not in sys.path:
    sys.path.append(_QGIS_PLUGINS)
os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
# response tables cached on disk go to a folder of this test session only (never the user's)
_CACHE_DIR = tempfile.mkdtemp(prefix="seaway_cache_")
atexit.register(shutil.rmtree, _CACHE_DIR, True)
os.environ["SEAWAY_CACHE_DIR"] = _CACHE_DIR


def require_qgis_enabled() -> bool:
    """True when QGIS tests must run (``make test`` and CI set SEAWAY_REQUIRE_QGIS=1)."""
    return os.environ.get("SEAWAY_REQUIRE_QGIS", "") == "1"


@pytest.fixture(scope="session")
def package_parent() -> Path:
    """Folder that contains the ``seaway_comfort`` symlink (use as QGIS_PLUGINPATH)."""
    return _PKG_PARENT


@pytest.fixture(scope="session")
def repo_root() -> Path:
    return REPO_ROOT


def pytest_runtest_makereport(item, call):  # type: ignore[no-untyped-def]
    """Turn a skipped QGIS test into a failure where QGIS is required."""
    if call.when != "setup" or call.excinfo is None or not require_qgis_enabled():
        return None
    if item.get_closest_marker("qgis") is None:
        return None
    if call.excinfo.errisinstance(pytest.skip.Exception):
        from _pytest.reports import TestReport

        report = TestReport.from_item_and_call(item, call)
        report.outcome = "failed"
        report.longrepr = (
            f"QGIS test skipped although SEAWAY_REQUIRE_QGIS=1: {call.excinfo.value}"
        )
        return report
    return None


QGIS_TEST_DIR = Path(__file__).resolve().parent / "qgis"


@pytest.hookimpl(hookwrapper=True)
def pytest_make_collect_report(collector):  # type: ignore[no-untyped-def]
    """Turn a QGIS test file that skips at import (``pytest.importorskip("qgis")``) into a
    failure where QGIS is required: the skip in setup above never sees such files."""
    outcome = yield
    report = outcome.get_result()
    if not (report.skipped and require_qgis_enabled()):
        return
    path = Path(str(getattr(collector, "path", None) or getattr(collector, "fspath", "")))
    if QGIS_TEST_DIR in path.resolve().parents:
        report.outcome = "failed"
        report.longrepr = f"QGIS test file {path.name} skipped although SEAWAY_REQUIRE_QGIS=1: {report.longrepr}"


@pytest.fixture(scope="session", autouse=True)
def release_before_exit_qgis(request):  # type: ignore[no-untyped-def]
    """Release every GDAL dataset and QGIS layer Python still holds BEFORE pytest-qgis calls
    ``exitQgis()`` (its ``qgis_app`` teardown). exitQgis tears down GDAL's driver manager and
    QGIS's registries; a dataset or layer freed afterwards (left in a reference cycle, a reader
    cache or the project) is freed into torn-down state at interpreter exit: "double free or
    corruption", exit 134/139. Requesting ``qgis_app`` first makes this teardown run before it.
    """
    if request.config.pluginmanager.hasplugin("pytest_qgis"):
        request.getfixturevalue("qgis_app")
    yield
    import gc

    try:
        from seaway_comfort.processing.core.climate.hindcast import close_process_readers

        close_process_readers()
    except ImportError:  # pragma: no cover (core needs GDAL)
        pass
    if "qgis.core" in sys.modules:
        from qgis.core import QgsProject

        QgsProject.instance().removeAllMapLayers()
        QgsProject.instance().clear()
    gc.collect()
    gc.collect()
    _delete_python_owned_qgis_objects()


def _delete_python_owned_qgis_objects() -> None:
    """Destroy, before exitQgis(), the layers, projects and processing contexts Python still owns.

    A failing test's traceback (kept by pytest for its report) holds the test's frames and with
    them any layer it made; freed only at interpreter shutdown, after exitQgis(), the layer's
    OGR dataset is closed into torn-down state (SIGSEGV in QgsOgrProviderUtils::GDALCloseWrapper
    during Py_FinalizeEx, seen under gdb). Python-owned wrappers are deleted here instead.
    """
    if "qgis.core" not in sys.modules:
        return
    import gc

    from qgis.core import QgsMapLayer, QgsProcessingContext, QgsProject
    from qgis.PyQt import sip

    kinds = (QgsMapLayer, QgsProcessingContext, QgsProject)
    for obj in gc.get_objects():
        try:
            if isinstance(obj, kinds) and not sip.isdeleted(obj) and sip.ispyowned(obj):
                sip.delete(obj)
        except (RuntimeError, TypeError, ReferenceError):  # half-destroyed wrappers: leave them
            continue
