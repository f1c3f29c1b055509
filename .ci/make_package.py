# SPDX-License-Identifier: GPL-2.0-or-later
"""Build the plugin ZIP for QGIS "Install from ZIP" (one top folder named seaway_comfort).

Ships the tracked files of the plugin (git ls-files) and compiled translations; leaves out
tests, CI, developer files, caches and anything the official repository rejects (.pyc,
__pycache__, .git). Usage: python3 -P .ci/make_package.py --out dist
"""
from __future__ import annotations

import argparse
import configparser
import shutil
import subprocess
import sys
import zipfile
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
PACKAGE = "seaway_comfort"
EXCLUDED_TOP = {"tests", ".ci", ".venv", ".build", "dist", ".git", ".qgis-settings"}
EXCLUDED_FILES = {"Makefile", "pyproject.toml", ".gitignore", ".gitattributes", "DEVELOPERS.md"}


def tracked_files() -> list[Path]:
    try:
        out = subprocess.run(["git", "ls-files"], cwd=ROOT, check=True, capture_output=True,
                             text=True).stdout
        files = [ROOT / line for line in out.splitlines() if line]
    except (OSError, subprocess.CalledProcessError):
        files = [p for p in ROOT.rglob("*") if p.is_file()]
    return files


def compile_translations() -> list[Path]:
    """Compile i18n/*.ts with lrelease when available; return the .qm files present."""
    lrelease = shutil.which("lrelease")
    for ts in sorted((ROOT / "i18n").glob("*.ts")):
        if lrelease:
            subprocess.run([lrelease, "-silent", str(ts)], check=True)
    return sorted((ROOT / "i18n").glob("*.qm"))


def wanted(path: Path) -> bool:
    rel = path.relative_to(ROOT)
    parts = rel.parts
    if parts[0] in EXCLUDED_TOP or rel.name in EXCLUDED_FILES:
        return False
    if "__pycache__" in parts or rel.suffix in {".pyc", ".pyo"} or rel.suffix == ".ts":
        return False
    return path.is_file()


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__)
    ap.add_argument("--out", default="dist", help="output folder (created)")
    args = ap.parse_args(argv)
    meta = configparser.ConfigParser()
    meta.read(ROOT / "metadata.txt", encoding="utf-8")
    version = meta["general"]["version"]
    out_dir = Path(args.out).resolve()
    out_dir.mkdir(parents=True, exist_ok=True)
    target = out_dir / f"{PACKAGE}-{version}.zip"
    files = sorted({p for p in tracked_files() + compile_translations() if wanted(p)})
    for required in ("__init__.py", "metadata.txt", "LICENSE"):
        if ROOT / required not in files:
            print(f"package: required file {required} is missing", file=sys.stderr)
            return 1
    tmp = target.with_suffix(".zip.part")
    with zipfile.ZipFile(tmp, "w", zipfile.ZIP_DEFLATED) as zf:
        for path in files:
            zf.write(path, f"{PACKAGE}/{path.relative_to(ROOT).as_posix()}")
    tmp.replace(target)
    print(f"package: {target} ({len(files)} files, {target.stat().st_size / 1024:.0f} KiB)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
