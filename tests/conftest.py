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
