# SPDX-License-Identifier: GPL-2.0-or-later
"""Architecture rules, checked on the source text (no imports needed).

- The numerical core (processing/core) imports no qgis, Qt/PyQt or QGIS's `processing`;
  only processing/core/seastate may use GDAL (osgeo).
- Imports go one way: plugin -> processing (algorithms) -> processing/core. The core never
  reaches up into the algorithms or the plugin, the algorithms never into the plugin.
- Inside the core, subpackages stand on floors and import only from lower floors (CORE_FLOORS):
  base modules -> waves, vessel, seastate -> comfort, demo -> motions -> api -> passage ->
  sweep, climate, routing -> reports. An algorithm never imports a sibling algorithm.
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


# Floor of each part of processing/core (a module may import only from a LOWER floor, or
# from its own subpackage). Base modules sit on floor 0.
CORE_FLOORS = {
    "units": 0, "validation": 0, "flags": 0, "numerics": 0, "plausibility": 0,
    "waves": 1, "vessel": 1, "seastate": 1,
    "comfort": 2, "demo": 2,
    "motions": 3,
    "api": 4,
    "passage": 5,
    "sweep": 6, "climate": 6, "routing": 6,
    "reports": 7,
}


def core_part(module: str) -> str:
    """'seaway_comfort.processing.core.waves.spectra' -> 'waves' ('' outside the core)."""
    parts = module.split(".")
    return parts[3] if parts[:3] == ["seaway_comfort", "processing", "core"] and len(parts) > 3 else ""


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
            problems.extend(floor_problems(rel, line, name))
    assert not problems, f"{rel}:\n" + "\n".join(problems)


def floor_problems(rel: str, line: int, name: str) -> List[str]:
    """Core floors and algorithm siblings, for one relative import ``name`` in file ``rel``."""
    here = core_part("seaway_comfort." + rel[:-3].replace("/", "."))
    there = core_part(name)
    base = CORE_FLOORS.get(here) == 0 and CORE_FLOORS.get(there) == 0  # base modules share floor 0
    if here and there and here != there and not base:
        if there not in CORE_FLOORS or here not in CORE_FLOORS:
            return [f"line {line}: core part '{here}' or '{there}' has no floor in CORE_FLOORS"]
        if CORE_FLOORS[there] >= CORE_FLOORS[here]:
            return [f"line {line}: core part '{here}' (floor {CORE_FLOORS[here]}) imports '{there}' "
                    f"(floor {CORE_FLOORS[there]}): imports go down only"]
    alg = "seaway_comfort.processing.algorithms."
    face = rel == "processing/algorithms/__init__.py"  # the package lists its algorithms
    if rel.startswith("processing/algorithms/") and name.startswith(alg) and not face:
        sibling = name[len(alg):].split(".")[0]
        if sibling not in ("base", "common", rel.split("/")[-1][:-3]):
            return [f"line {line}: algorithm imports its sibling algorithm '{sibling}'"]
    return []


def test_floor_rules_catch_violations() -> None:
    """An upward core import and a sibling-algorithm import are both reported."""
    assert floor_problems("processing/core/waves/spectra.py", 1, "seaway_comfort.processing.core.passage.route")
    assert not floor_problems("processing/core/passage/route.py", 1, "seaway_comfort.processing.core.waves.spectra")
    assert floor_problems("processing/algorithms/departure_sweep.py", 1,
                          "seaway_comfort.processing.algorithms.route_comfort")


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
