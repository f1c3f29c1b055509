# SPDX-License-Identifier: GPL-2.0-or-later
"""The ZIP from `make package` installs into QGIS and its provider appears in qgis_process.

Checks against QGIS itself (qgis_process.bin of the installed QGIS, 3.22 LTR on Debian 12).
"""
from __future__ import annotations

import json
import os
import subprocess
import sys
import zipfile
from pathlib import Path

import pytest

pytestmark = pytest.mark.qgis

QGIS_PROCESS = "/usr/bin/qgis_process.bin"


@pytest.fixture(scope="module")
def built_zip(tmp_path_factory, repo_root: Path) -> Path:
    out = tmp_path_factory.mktemp("dist")
    proc = subprocess.run(
        [sys.executable, "-P", str(repo_root / ".ci" / "make_package.py"), "--out", str(out)],
        capture_output=True, text=True, timeout=120,
    )
    assert proc.returncode == 0, proc.stderr
    zips = list(out.glob("seaway_comfort-*.zip"))
    assert len(zips) == 1
    return zips[0]


def test_zip_layout(built_zip: Path):
    with zipfile.ZipFile(built_zip) as zf:
        names = zf.namelist()
    # QGIS plugin repository rules (one top folder, LICENSE, metadata, no caches or tests).
    assert {n.split("/")[0] for n in names} == {"seaway_comfort"}
    for required in ("seaway_comfort/__init__.py", "seaway_comfort/metadata.txt",
                     "seaway_comfort/LICENSE", "seaway_comfort/processing/provider.py"):
        assert required in names
    assert not [n for n in names if n.endswith(".pyc") or "__pycache__" in n]
    assert not [n for n in names if n.startswith("seaway_comfort/tests/")]
    assert [n for n in names if n.endswith("metadata.txt")] == ["seaway_comfort/metadata.txt"]


def test_installed_zip_registers_provider(built_zip: Path, tmp_path: Path):
    if not os.path.exists(QGIS_PROCESS):
        pytest.skip(f"{QGIS_PROCESS} not installed")
    plugins = tmp_path / "plugins"
    with zipfile.ZipFile(built_zip) as zf:
        zf.extractall(plugins)
    config = tmp_path / "config"
    ini = config / "profiles" / "default" / "QGIS" / "QGIS3.ini"
    ini.parent.mkdir(parents=True)
    ini.write_text("[PythonPlugins]\nseaway_comfort=true\n")
    env = dict(os.environ, QT_QPA_PLATFORM="offscreen", QGIS_PLUGINPATH=str(plugins),
               QGIS_CUSTOM_CONFIG_PATH=str(config))
    proc = subprocess.run([QGIS_PROCESS, "--json", "list"], capture_output=True, text=True,
                          env=env, timeout=180, cwd=tmp_path)
    assert proc.returncode == 0, proc.stderr[-2000:]
    listing = json.loads(proc.stdout[proc.stdout.index("{"):])
    providers = listing["providers"]
    assert "seawaycomfort" in providers, sorted(providers)
    assert providers["seawaycomfort"]["name"] == "Seaway Comfort"
