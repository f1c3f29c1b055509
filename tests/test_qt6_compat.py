# SPDX-License-Identifier: GPL-2.0-or-later
"""Qt6 readiness guard, checked on the source text (no QGIS or Qt needed).

QGIS 4 is built on Qt6 (PyQt6). Code written for QGIS 3 (Qt5) keeps working there only if it
follows a few rules, which this module enforces on every ``.py`` file of the plugin (everything
except ``tests/``, ``.venv/`` and build folders):

1. Qt only through ``qgis.PyQt`` (QGIS's shim that maps to PyQt5 or PyQt6): no ``import PyQt5``,
   ``from PyQt5``, ``PyQt6``, ``PySide2``/``PySide6``.
2. ``exec()`` instead of ``exec_()`` (PyQt6 dropped the underscore spelling).
3. Fully scoped enums: PyQt6 no longer exposes enum members on the class, so ``Qt.AlignLeft``
   must be written ``Qt.AlignmentFlag.AlignLeft`` and ``QMessageBox.Yes`` must be
   ``QMessageBox.StandardButton.Yes``. Practical rule used here: an attribute ``Qt.<Capitalised>``
   is flagged unless it is itself followed by another attribute (``Qt.AlignmentFlag.X``: the
   middle name is the scoped enum class) or it names a known enum class used as a type; for a
   few widget classes a list of their well-known unscoped members is flagged.
4. No absolute ``import processing`` / ``from processing ...`` in our code: it would pick up QGIS's
   own ``processing`` package or shadow it (see tests/test_layering.py for the relative-import rule).
5. metadata.txt declares ``supportsQt6=True`` and ``qgisMaximumVersion=4.99``.

Sources: the QGIS project's Qt6 migration advice (qgis-developer mailing list, January 2024:
the upgrade script scripts/pyqt5_to_pyqt6/pyqt5_to_pyqt6.py in the QGIS repository, and the
``supportsQt6`` metadata key without which Qt6 builds ignore a plugin); PyQt6 itself dropped
``exec_`` and enum members on the class (common practice, no source). ``QAction`` may stay
imported from ``qgis.PyQt.QtWidgets``: QGIS keeps that import working in Qt6 builds (qgis/QGIS
pull request 55658). The member lists below are from memory. Each checker is also run on small
bad and good snippets, so a checker that stops finding anything fails the suite.
"""
from __future__ import annotations

import ast
import configparser
from pathlib import Path
from typing import Dict, FrozenSet, List

import pytest

ROOT = Path(__file__).resolve().parent.parent
SKIP_TOP = {"tests", ".venv", ".build", ".ci", "dist", ".git", "i18n", "demo_output",
            ".qgis-settings", ".pytest_cache", ".hypothesis"}
FORBIDDEN_QT_BINDINGS = {"PyQt5", "PyQt6", "PySide2", "PySide6"}

# Enum *classes* of the Qt namespace that may appear bare, e.g. as a type in an annotation or
# isinstance check (``Qt.AlignmentFlag``). Anything else written ``Qt.Capitalised`` without a
# further attribute is taken to be an unscoped enum member.
QT_ENUM_CLASSES: FrozenSet[str] = frozenset({
    "AlignmentFlag", "Alignment", "ItemDataRole", "ItemFlag", "ItemFlags", "CheckState",
    "Orientation", "Orientations", "WindowType", "WindowFlags", "WindowModality", "Key",
    "KeyboardModifier", "KeyboardModifiers", "MouseButton", "MouseButtons", "CursorShape",
    "SortOrder", "TextFormat", "TextInteractionFlag", "TextInteractionFlags", "GlobalColor",
    "PenStyle", "BrushStyle", "FocusPolicy", "ScrollBarPolicy", "ToolButtonStyle",
    "TimeSpec", "DateFormat", "ConnectionType", "ContextMenuPolicy", "LayoutDirection",
    "MatchFlag", "MatchFlags", "AspectRatioMode", "TransformationMode", "CaseSensitivity",
    "WidgetAttribute", "ApplicationAttribute", "ToolBarArea", "DockWidgetArea", "Corner",
    "ArrowType", "FillRule", "PenCapStyle", "PenJoinStyle", "ShortcutContext", "InputMethodHint",
    "TextElideMode", "WindowState", "WindowStates", "FocusReason", "DropAction", "EventPriority",
})

# Well-known unscoped members per widget class (the scoped spelling puts the enum class in the
# middle: QMessageBox.StandardButton.Yes, QSizePolicy.Policy.Expanding, ...).
_BUTTONS = {"Ok", "Open", "Save", "Cancel", "Close", "Discard", "Apply", "Reset",
            "RestoreDefaults", "Help", "SaveAll", "Yes", "YesToAll", "No", "NoToAll", "Abort",
            "Retry", "Ignore", "NoButton"}
_ROLES = {"AcceptRole", "RejectRole", "DestructiveRole", "ActionRole", "HelpRole", "YesRole",
          "NoRole", "ApplyRole", "ResetRole", "InvalidRole"}
_ITEM_VIEW = {"SelectRows", "SelectColumns", "SelectItems", "SingleSelection",
              "MultiSelection", "ExtendedSelection", "ContiguousSelection", "NoSelection",
              "NoEditTriggers", "DoubleClicked", "SelectedClicked", "EditKeyPressed",
              "AnyKeyPressed", "AllEditTriggers", "CurrentChanged", "ScrollPerPixel",
              "ScrollPerItem"}
_FRAME = {"NoFrame", "Box", "Panel", "StyledPanel", "HLine", "VLine", "WinPanel", "Plain",
          "Raised", "Sunken"}
UNSCOPED_MEMBERS: Dict[str, FrozenSet[str]] = {
    "QMessageBox": frozenset(_BUTTONS | _ROLES | {"NoIcon", "Information", "Warning",
                                                  "Critical", "Question"}),
    "QDialogButtonBox": frozenset(_BUTTONS | _ROLES | {"Horizontal", "Vertical"}),
    "QDialog": frozenset({"Accepted", "Rejected"}),
    "QSizePolicy": frozenset({"Fixed", "Minimum", "Maximum", "Preferred", "Expanding",
                              "MinimumExpanding", "Ignored"}),
    "QFrame": frozenset(_FRAME),
    "QLabel": frozenset(_FRAME),
    "QAbstractItemView": frozenset(_ITEM_VIEW),
    "QTableWidget": frozenset(_ITEM_VIEW),
    "QTableView": frozenset(_ITEM_VIEW),
    "QListWidget": frozenset(_ITEM_VIEW),
    "QListView": frozenset(_ITEM_VIEW),
    "QTreeWidget": frozenset(_ITEM_VIEW),
    "QTreeView": frozenset(_ITEM_VIEW),
    "QHeaderView": frozenset({"Interactive", "Fixed", "Stretch", "ResizeToContents", "Custom"}),
    "QVariant": frozenset({"Invalid", "Bool", "Int", "UInt", "LongLong", "ULongLong", "Double",
                           "String", "StringList", "Date", "Time", "DateTime", "List", "Map",
                           "ByteArray", "Char"}),
    "QLineEdit": frozenset({"Normal", "NoEcho", "Password", "PasswordEchoOnEdit"}),
    "QFileDialog": frozenset({"ShowDirsOnly", "DontConfirmOverwrite", "DontUseNativeDialog",
                              "ReadOnly", "AcceptOpen", "AcceptSave"}),
    "QAction": frozenset({"NoRole", "TextHeuristicRole", "ApplicationSpecificRole",
                          "AboutRole", "PreferencesRole", "QuitRole"}),
}


def plugin_sources() -> List[Path]:
    """Every .py file that ships with the plugin (tests and dev folders excluded)."""
    out = []
    # walk only the shipped top-level entries: never descend into .build/ (a Debian chroot lives there)
    tops = [p for p in ROOT.iterdir() if p.name not in SKIP_TOP and not p.name.startswith(".")]
    for top in sorted(tops):
        for path in sorted(top.rglob("*.py")) if top.is_dir() else [top]:
            rel = path.relative_to(ROOT)
            if path.suffix == ".py" and "__pycache__" not in rel.parts:
                out.append(path)
    return out


def qt6_problems(source: str, filename: str = "<source>") -> List[str]:
    """Rule violations 1-4 in one module's source text, as 'line N: ...' strings."""
    tree = ast.parse(source, filename=filename)
    parents: Dict[int, ast.AST] = {}
    for node in ast.walk(tree):
        for child in ast.iter_child_nodes(node):
            parents[id(child)] = node
    problems: List[str] = []
    for node in ast.walk(tree):
        line = getattr(node, "lineno", 0)
        if isinstance(node, ast.Import):
            for alias in node.names:
                top = alias.name.split(".")[0]
                if top in FORBIDDEN_QT_BINDINGS:
                    problems.append(f"line {line}: 'import {alias.name}' (use qgis.PyQt)")
                if top == "processing":
                    problems.append(f"line {line}: absolute 'import {alias.name}'")
        elif isinstance(node, ast.ImportFrom) and node.level == 0:
            top = (node.module or "").split(".")[0]
            if top in FORBIDDEN_QT_BINDINGS:
                problems.append(f"line {line}: 'from {node.module} import ...' (use qgis.PyQt)")
            if top == "processing":
                problems.append(f"line {line}: absolute 'from {node.module} import ...'")
        elif isinstance(node, ast.Call):
            func = node.func
            if isinstance(func, ast.Attribute) and func.attr == "exec_":
                problems.append(f"line {line}: '.exec_()' call (use exec())")
        elif isinstance(node, ast.Attribute) and isinstance(node.value, ast.Name):
            owner, member = node.value.id, node.attr
            parent = parents.get(id(node))
            scoped_prefix = isinstance(parent, ast.Attribute) and parent.value is node
            if owner == "Qt" and member[:1].isupper() and not scoped_prefix:
                if member not in QT_ENUM_CLASSES:
                    problems.append(f"line {line}: unscoped enum 'Qt.{member}' "
                                    f"(write Qt.<EnumClass>.{member})")
            elif member in UNSCOPED_MEMBERS.get(owner, frozenset()) and not scoped_prefix:
                problems.append(f"line {line}: unscoped enum '{owner}.{member}' "
                                f"(write {owner}.<EnumClass>.{member})")
    return problems


SOURCES = plugin_sources()


def test_sources_found():
    """The scan sees the plugin's own modules (an empty scan would pass vacuously)."""
    names = {p.relative_to(ROOT).as_posix() for p in SOURCES}
    assert "__init__.py" in names
    assert "plugin/main.py" in names
    assert not any(n.startswith(("tests/", ".venv/")) for n in names)


@pytest.mark.parametrize("path", SOURCES, ids=lambda p: p.relative_to(ROOT).as_posix())
def test_source_is_qt6_ready(path: Path):
    rel = path.relative_to(ROOT).as_posix()
    problems = qt6_problems(path.read_text(encoding="utf-8"), rel)
    assert not problems, f"{rel} is not Qt6-ready:\n" + "\n".join(problems)


@pytest.mark.parametrize(
    "snippet, expected",
    [
        ("import PyQt5.QtCore\n", "import PyQt5.QtCore"),
        ("from PyQt5.QtWidgets import QDialog\n", "from PyQt5.QtWidgets"),
        ("from PyQt6 import QtCore\n", "from PyQt6"),
        ("import PySide6\n", "import PySide6"),
        ("d.exec_()\n", ".exec_()"),
        ("x = Qt.AlignLeft\n", "Qt.AlignLeft"),
        ("f(Qt.Checked)\n", "Qt.Checked"),
        ("x = Qt.UserRole + 1\n", "Qt.UserRole"),
        ("QMessageBox.Yes | QMessageBox.No\n", "QMessageBox.Yes"),
        ("b = QDialogButtonBox.Save\n", "QDialogButtonBox.Save"),
        ("QSizePolicy(QSizePolicy.Expanding, p)\n", "QSizePolicy.Expanding"),
        ("f.setFrameShape(QFrame.HLine)\n", "QFrame.HLine"),
        ("t.setSelectionBehavior(QAbstractItemView.SelectRows)\n", "QAbstractItemView.SelectRows"),
        ("t.setSelectionBehavior(QTableWidget.SelectRows)\n", "QTableWidget.SelectRows"),
        ("h.setSectionResizeMode(QHeaderView.Stretch)\n", "QHeaderView.Stretch"),
        ("QgsField('a', QVariant.Int)\n", "QVariant.Int"),
        ("if d.exec() == QDialog.Accepted: pass\n", "QDialog.Accepted"),
        ("import processing\n", "absolute 'import processing'"),
        ("def f():\n    import processing\n", "absolute 'import processing'"),
        ("from processing.core.Processing import Processing\n", "absolute 'from processing"),
    ],
)
def test_checker_flags_bad_snippets(snippet: str, expected: str):
    """Each rule fires on a known-bad line (guards against a guard that cannot fail)."""
    problems = qt6_problems(snippet)
    assert any(expected in p for p in problems), (snippet, problems)


@pytest.mark.parametrize(
    "snippet",
    [
        "from qgis.PyQt.QtCore import Qt\n",
        "from qgis.PyQt.QtWidgets import QDialog, QMessageBox\n",
        "d.exec()\n",
        "x = Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignTop\n",
        "def f(a: Qt.AlignmentFlag) -> None: pass\n",
        "x = Qt.ItemDataRole.UserRole + 1\n",
        "QMessageBox.StandardButton.Yes | QMessageBox.StandardButton.No\n",
        "QSizePolicy(QSizePolicy.Policy.Expanding, p)\n",
        "h.setSectionResizeMode(QHeaderView.ResizeMode.Stretch)\n",
        "QgsField('a', QVariant.Type.Int)\n",
        "QMessageBox.question(None, 't', 'q')\n",
        "from .processing.provider import SeawayComfortProvider\n",
        "from ..processing.core import units\n",
        "x = 'Qt.AlignLeft and .exec_( in a string are fine'\n",
        "# Qt.AlignLeft in a comment is fine\n",
    ],
)
def test_checker_accepts_good_snippets(snippet: str):
    """Qt6-ready spellings pass (the guard does not reject the fix it asks for)."""
    assert qt6_problems(snippet) == []


def _metadata() -> configparser.ConfigParser:
    meta = configparser.ConfigParser()
    path = ROOT / "metadata.txt"
    assert path.is_file(), "metadata.txt missing at the repository root"
    meta.read(path, encoding="utf-8")
    assert meta.has_section("general"), "metadata.txt has no [general] section"
    return meta


def test_metadata_declares_qt6_support():
    """QGIS 4 loads only plugins that declare supportsQt6 and allow a 4.x maximum version."""
    general = _metadata()["general"]
    assert general.get("supportsQt6", "").strip().lower() in {"true", "yes", "1"}, (
        f"metadata.txt supportsQt6 = {general.get('supportsQt6')!r}, expected True")
    assert general.get("qgisMaximumVersion", "").strip() == "4.99", (
        f"metadata.txt qgisMaximumVersion = {general.get('qgisMaximumVersion')!r}, expected 4.99")
