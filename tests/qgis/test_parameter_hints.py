# SPDX-License-Identifier: GPL-2.0-or-later
"""What the Processing dialog offers: a local help page per algorithm, decimals, profile choices.

The widget metadata keys are QGIS's own (``widget_wrapper`` ``decimals`` and ``value_hints``, read
by QgsProcessingNumericWidgetWrapper / QgsProcessingStringWidgetWrapper); scripts still pass the
same values (a profile name or a JSON path), which the run tests cover.
"""
from __future__ import annotations

from pathlib import Path

import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")

ALGS = ("routecomfort", "departuresweep", "seasonalclimate", "describeseastate")


@pytest.mark.parametrize("name", ALGS)
def test_help_url_is_a_shipped_page_with_the_algorithm_section(seaway_provider, name):
    from qgis.core import QgsApplication
    from qgis.PyQt.QtCore import QUrl

    alg = QgsApplication.processingRegistry().algorithmById(f"seawaycomfort:{name}")
    url = QUrl(alg.helpUrl())
    assert url.isLocalFile() and url.fragment() == name
    page = Path(url.toLocalFile())
    assert page.is_file() and page.parent.name == "help"
    assert f'id="{name}"' in page.read_text(encoding="utf-8")


def test_decimal_parameters_show_few_decimals(seaway_provider):
    from qgis.core import QgsApplication

    alg = QgsApplication.processingRegistry().algorithmById("seawaycomfort:routecomfort")
    decimals = {p.name(): p.metadata().get("widget_wrapper", {}).get("decimals") for p in alg.parameterDefinitions()}
    assert decimals["SPEED_KN"] == 1 and decimals["SPACING_NM"] == 2 and decimals["GAMMA"] == 2


def test_vessel_and_station_offered_as_choices(seaway_provider):
    from qgis.core import QgsApplication

    from seaway_comfort.processing.core.vessel.profile import builtin_profile_names, resolve_vessel

    alg = QgsApplication.processingRegistry().algorithmById("seawaycomfort:departuresweep")
    hints = {p.name(): p.metadata().get("widget_wrapper", {}).get("value_hints")
             for p in alg.parameterDefinitions()}
    assert hints["VESSEL"][:len(builtin_profile_names())] == list(builtin_profile_names())
    first = resolve_vessel(builtin_profile_names()[0])
    assert hints["STATION"][0] == "" and {s.name for s in first.stations} <= set(hints["STATION"])
