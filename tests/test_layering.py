# SPDX-License-Identifier: GPL-2.0-or-later
"""Architecture rules, checked on the source text (no imports needed).

- The numerical core (processing/core) imports no qgis, Qt/PyQt or QGIS's `processing`;
  only processing/core/seastate may use GDAL (osgeo).
- Imports go one way: plugin -> processing (algorithms) -> processing/core. The core never
  reaches up into the algorithms or the plugin, the algorithms never into the plugin.
- Inside the package every import of our own modules is relative: no absolute
  `seaway_comfort...` and no absolute `processing` / `plugin` (they would resolve to QGIS's
  own `processing` or to nothing, depending on sys.path).
"""
from __future__ import annotations

import ast
from pathlib import Path
from typing import Iterator, List, Tuple

import pytest

ROOT = Path(__file__).resolve().parent.parent
SKIP_TOP = {"tests", ".venv", ".build", ".ci", "dist", ".git", "i18n", "demo_output"}
QT_OR_QGIS = ("qgis", "PyQt5", "PyQt6", "PySide2", "PySide6", "sip")


def package_sources() -> List[Path]:
    out = []
    # walk only the shipped top-level entries: never descend into .build/ (a Debian chroot lives there)
    tops = [p for p in ROOT.iterdir() if p.name not in SKIP_TOP and not p.name.startswith(".")]
    for top in sorted(tops):
        for path in sorted(top.rglob("*.py")) if top.is_dir() else [top]:
            rel = path.relative_to(ROOT)
            if path.suffix == ".py" and "__pycache__" not in rel.parts:
                out.append(path)
    return out


def module_parts(path: Path, root: Path = ROOT) -> List[str]:
    rel = path.relative_to(root).with_suffix("")
    parts = list(rel.parts)
    if parts[-1] == "__init__":
        parts = parts[:-1]
    return parts


def imports(path: Path, root: Path = ROOT) -> Iterator[Tuple[int, str, bool]]:
    """(line, absolute module name inside our package or external name, is_relative)."""
    tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
    here = module_parts(path, root)
    pkg = here if path.name == "__init__.py" else here[:-1]
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            for alias in node.names:
                yield node.lineno, alias.name, False
        elif isinstance(node, ast.ImportFrom):
            if node.level == 0:
                yield node.lineno, node.module or "", False
            else:
                base = pkg[: len(pkg) - (node.level - 1)] if node.level > 1 else pkg
                if node.level - 1 > len(pkg):
                    yield node.lineno, "<beyond package root>", True
                    continue
                target = ".".join(base + ([node.module] if node.module else []))
                yield node.lineno, "seaway_comfort" + ("." + target if target else ""), True


SOURCES = package_sources()


def test_sources_found():
    names = {p.relative_to(ROOT).as_posix() for p in SOURCES}
    assert "__init__.py" in names and "processing/core/units.py" in names


@pytest.mark.parametrize("path", SOURCES, ids=lambda p: p.relative_to(ROOT).as_posix())
def test_import_rules(path: Path, root: Path = ROOT):
    rel = path.relative_to(root).as_posix()
    in_core = rel.startswith("processing/core/")
    in_seastate = rel.startswith("processing/core/seastate/")
    in_algorithms = rel.startswith("processing/") and not in_core
    problems = []
    for line, name, relative in imports(path, root):
        top = name.split(".")[0]
        if not relative:
            if top in {"seaway_comfort", "processing", "plugin"}:
                problems.append(f"line {line}: absolute import of '{name}' (use a relative import)")
            if in_core and top in QT_OR_QGIS:
                problems.append(f"line {line}: core imports '{name}'")
            if in_core and not in_seastate and top == "osgeo":
                problems.append(f"line {line}: GDAL import outside processing/core/seastate")
        else:
            if name == "<beyond package root>":
                problems.append(f"line {line}: relative import beyond the package root")
            if in_core and not name.startswith("seaway_comfort.processing.core"):
                if name != "seaway_comfort.processing.core":
                    problems.append(f"line {line}: core reaches outside the core: '{name}'")
            if (in_core or in_algorithms) and name.startswith("seaway_comfort.plugin"):
                problems.append(f"line {line}: '{rel}' imports the GUI layer '{name}'")
    assert not problems, f"{rel}:\n" + "\n".join(problems)


def test_rules_catch_violations(tmp_path):
    """The checker itself flags what it must (guards against a test that cannot fail)."""
    fake = tmp_path / "processing" / "core" / "_layering_probe.py"
    fake.parent.mkdir(parents=True)
    fake.write_text("import qgis.core\nfrom ...plugin import main\nimport processing\n")
    names = [n for _, n, _ in imports(fake, tmp_path)]
    assert "qgis.core" in names and "processing" in names
    assert "seaway_comfort.plugin" in names
    with pytest.raises(AssertionError):
        test_import_rules(fake, tmp_path)
