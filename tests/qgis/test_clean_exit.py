# SPDX-License-Identifier: GPL-2.0-or-later
"""The test process exits clean: no heap corruption after exitQgis (issue 20).

tests/qgis/exit_sequence_probe.py leaves GDAL datasets (in reference cycles) and a project
layer alive at the end of its session; tests/conftest.py's session fixture must release them
before pytest-qgis's exitQgis, so every repetition under glibc's MALLOC_CHECK_=3 exits 0.
(A dataset still open after exitQgis aborts the process at exit: seen with a held GTiff
dataset, exit 139, in a standalone run while working on issue 20.)
"""
from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest

pytestmark = pytest.mark.qgis
pytest.importorskip("qgis")

PROBE = Path(__file__).with_name("exit_sequence_probe.py")
REPEATS = 5


def _run(*extra: str) -> subprocess.CompletedProcess:
    env = dict(os.environ, MALLOC_CHECK_="3", QT_QPA_PLATFORM="offscreen")
    return subprocess.run([sys.executable, "-P", "-m", "pytest", "-q", "-p", "no:cacheprovider", *extra, str(PROBE)],
                          cwd=PROBE.parents[2], env=env, capture_output=True, text=True, timeout=300)


def test_release_before_exit_qgis_exits_clean():
    for _ in range(REPEATS):
        r = _run()
        assert r.returncode == 0, (r.returncode, r.stdout[-2000:], r.stderr[-2000:])
