# SPDX-License-Identifier: GPL-2.0-or-later
"""Output field types on every QGIS we support, checked on whichever QGIS runs the test.

QGIS >= 3.38 takes ``QMetaType.Type`` for QgsField, older QGIS ``QVariant.Type``; the two Qt enums
spell strings and date-times differently (QMetaType: ``QString``, ``QDateTime``; Qt 5.15 and Qt 6
class reference, "QMetaType::Type"). Both branches are exercised here whatever QGIS is installed,
so a misspelt member fails on 3.22 too, not only on the QGIS where the branch is taken.
"""
from __future__ import annotations

import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")

from qgis.core import QgsField  # noqa: E402
from qgis.PyQt.QtCore import QMetaType, QVariant  # noqa: E402

from seaway_comfort.processing.adapters import field_type, make_field  # noqa: E402

KINDS = ("int", "long", "double", "bool", "string", "datetime")
# The Qt type each kind must map to (Qt class reference for QMetaType::Type / QVariant::Type).
META = {"int": "Int", "long": "LongLong", "double": "Double", "bool": "Bool",
        "string": "QString", "datetime": "QDateTime"}
VARIANT = {"int": "Int", "long": "LongLong", "double": "Double", "bool": "Bool",
           "string": "String", "datetime": "DateTime"}


@pytest.mark.parametrize("kind", KINDS)
def test_metatype_branch_resolves(kind: str) -> None:
    """The QGIS >= 3.38 branch names members that exist in this PyQt's QMetaType.Type."""
    assert field_type(kind, 34006) == getattr(QMetaType.Type, META[kind])


@pytest.mark.parametrize("kind", KINDS)
def test_variant_branch_resolves(kind: str) -> None:
    assert field_type(kind, 32216) == getattr(QVariant.Type, VARIANT[kind])


@pytest.mark.parametrize("kind", KINDS)
def test_make_field_type_on_this_qgis(kind: str) -> None:
    """The field QGIS builds reports the same QVariant type on 3.22 and on 3.40."""
    field = make_field("x", kind)
    assert isinstance(field, QgsField)
    assert int(field.type()) == int(getattr(QVariant.Type, VARIANT[kind]))
