# SPDX-License-Identifier: GPL-2.0-or-later
"""Shared parameter labels (processing/algorithms/common.py) are found by Qt's translator.

pylupdate5 files module-level tr() calls under the context '@default' (qgis-platform notes,
section 7); the labels must be looked up in that context or they never translate. Checked
with Qt's own lrelease and QTranslator.
"""
from __future__ import annotations

import shutil
import subprocess

import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")


def test_shared_labels_translate(qgis_app, tmp_path):
    from qgis.PyQt.QtCore import QCoreApplication, QTranslator

    from seaway_comfort.processing.algorithms.common import SPACING_NM, passage_parameters

    lrelease = shutil.which("lrelease")
    if lrelease is None:
        pytest.skip("lrelease (qttools5-dev-tools) not installed")
    english = {p.name(): p.description() for p in passage_parameters()}[SPACING_NM]
    ts = tmp_path / "probe_de.ts"
    ts.write_text(
        '<?xml version="1.0" encoding="utf-8"?>\n<!DOCTYPE TS><TS version="2.0" language="de">\n'
        f"<context><name>@default</name><message><source>{english}</source>"
        "<translation>PROBE</translation></message></context></TS>\n", encoding="utf-8")
    subprocess.run([lrelease, "-silent", str(ts)], check=True)
    translator = QTranslator()
    assert translator.load(str(tmp_path / "probe_de.qm"))
    QCoreApplication.installTranslator(translator)
    try:
        label = {p.name(): p.description() for p in passage_parameters()}[SPACING_NM]
    finally:
        QCoreApplication.removeTranslator(translator)
    assert label == "PROBE"
