# SPDX-License-Identifier: GPL-2.0-or-later
"""Expose this checkout as the package ``seaway_comfort`` for benchmark scripts.

Same trick as tests/conftest.py: a temporary folder holding a symlink
``seaway_comfort -> <checkout>`` goes on ``sys.path`` (the repository root itself must never be
importable, its ``processing/`` folder would shadow QGIS's ``processing``). Import this module
first: ``import _pkg  # noqa: F401`` from a script in tests/bench/ run as
``.venv/bin/python -P tests/bench/bench_x.py``.
"""
from __future__ import annotations

import atexit
import os
import shutil
import sys
import tempfile
from pathlib import Path

REPO_ROOT = Path(__file__).resolve().parent.parent.parent
PACKAGE_NAME = "seaway_comfort"

if PACKAGE_NAME not in sys.modules:
    _PKG_PARENT = Path(tempfile.mkdtemp(prefix="seaway_bench_"))
    os.symlink(REPO_ROOT, _PKG_PARENT / PACKAGE_NAME, target_is_directory=True)
    atexit.register(shutil.rmtree, _PKG_PARENT, True)
    sys.path.insert(0, str(_PKG_PARENT))
    sys.path[:] = [p for p in sys.path if Path(p or ".").resolve() != REPO_ROOT]
