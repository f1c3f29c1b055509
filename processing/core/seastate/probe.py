# SPDX-License-Identifier: GPL-2.0-or-later
"""Probe a forecast or bathymetry file in a child process before this process opens it.

A damaged file can crash GDAL's drivers (HDF5 under NetCDF-4, for example) with a signal
that no Python ``try`` catches: the whole QGIS session would go down with it. So every
raster file is first opened in a short-lived child Python (the same interpreter, ``-P``,
GDAL only) that reads every variable; when the child dies, the file is refused with an
error naming it, and this process never touches it.

Verdicts are cached by (real path, size, modification time): in memory, and in a small JSON
file in the user cache folder (``SEAWAY_COMFORT_CACHE_DIR`` overrides the folder), so a good
file is probed once. A child that ends with a Python-level error (a truncated, empty or text
file) is *not* a crash: the file is handed to the normal reader, whose clean error the user
then sees.
"""
from __future__ import annotations

import json
import os
import subprocess
import sys
import tempfile
from pathlib import Path
from typing import Dict, List, Optional, Tuple

from ..validation import SeawayInputError, show

__all__ = ["probe_raster_file", "probe_cache_dir", "clear_probe_memory", "PROBE_TIMEOUT_S"]

PROBE_TIMEOUT_S = 600.0
"""Longest a probe may take (s); a child still running then is stopped and the file refused."""
READ_BUDGET_CELLS = 200_000_000
"""Cells the child reads in full (all bands of all variables); beyond that, one block per band."""
_CACHE_FILE = "raster_probe.json"
_CACHE_MAX = 500
_OK, _CRASH, _SKIP = "ok", "crash", "skip"
_MEMORY: Dict[Tuple[str, int, int], Tuple[str, str]] = {}

_CHILD_CODE = r"""
import sys
from osgeo import gdal
gdal.UseExceptions()
path, budget = sys.argv[1], int(sys.argv[2])
top = gdal.Open(path)
names = [n for n, _ in (top.GetSubDatasets() or [])] or [path]
total = 0
for name in names:
    ds = top if name == path else gdal.Open(name)
    for b in range(1, ds.RasterCount + 1):
        band = ds.GetRasterBand(b)
        band.GetMetadata(); band.GetNoDataValue(); band.GetUnitType()
        total += ds.RasterXSize * ds.RasterYSize
        if total <= budget:
            band.ReadRaster(0, 0, ds.RasterXSize, ds.RasterYSize)
        else:
            bx, by = band.GetBlockSize()
            band.ReadRaster(0, 0, min(bx, ds.RasterXSize), min(by, ds.RasterYSize))
print("probe-ok")
"""


def probe_cache_dir() -> Path:
    """The user cache folder of the plugin (platform convention; env override for tests)."""
    env = os.environ.get("SEAWAY_COMFORT_CACHE_DIR")
    if env:
        return Path(env)
    if sys.platform.startswith("win"):
        base = Path(os.environ.get("LOCALAPPDATA") or Path.home() / "AppData" / "Local")
    elif sys.platform == "darwin":
        base = Path.home() / "Library" / "Caches"
    else:
        base = Path(os.environ.get("XDG_CACHE_HOME") or Path.home() / ".cache")
    return base / "seaway_comfort"


def clear_probe_memory() -> None:
    """Forget the in-memory verdicts (the on-disk cache stays)."""
    _MEMORY.clear()


def _python_command() -> List[str]:
    """The interpreter for the child: this one when it is a Python (not the QGIS binary)."""
    exe = sys.executable or ""
    if not Path(exe).name.lower().startswith("python"):
        prefix = Path(sys.exec_prefix)
        for cand in (prefix / "bin" / "python3", prefix / "python.exe", prefix / "python3.exe",
                     Path(sys.base_exec_prefix) / "bin" / "python3"):
            if cand.is_file():
                exe = str(cand)
                break
    return [exe, "-P"] if sys.version_info >= (3, 11) else [exe]


def _key(path: str) -> Tuple[str, int, int]:
    real = os.path.realpath(path)
    st = os.stat(real)
    return real, int(st.st_size), int(st.st_mtime_ns)


def _disk_load() -> Dict[str, List[str]]:
    try:
        data = json.loads((probe_cache_dir() / _CACHE_FILE).read_text(encoding="utf-8"))
        return data if isinstance(data, dict) else {}
    except (OSError, ValueError):
        return {}


def _disk_store(key: Tuple[str, int, int], verdict: Tuple[str, str]) -> None:
    """Add one verdict to the on-disk cache (best effort: a read-only home is no error)."""
    data = _disk_load()
    data[json.dumps(key)] = list(verdict)
    while len(data) > _CACHE_MAX:
        data.pop(next(iter(data)))
    try:
        folder = probe_cache_dir()
        folder.mkdir(parents=True, exist_ok=True)
        tmp = folder / f"{_CACHE_FILE}.{os.getpid()}.tmp"
        tmp.write_text(json.dumps(data), encoding="utf-8")
        os.replace(tmp, folder / _CACHE_FILE)
    except OSError:
        pass


def _run_child(path: str) -> Tuple[str, str]:
    """(verdict, reason) of one child run: "ok" unless the child died or hung."""
    cmd = _python_command() + ["-c", _CHILD_CODE, os.path.realpath(path), str(READ_BUDGET_CELLS)]
    flags = getattr(subprocess, "CREATE_NO_WINDOW", 0)
    try:
        done = subprocess.run(cmd, stdin=subprocess.DEVNULL, stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                              timeout=PROBE_TIMEOUT_S, creationflags=flags, cwd=tempfile.gettempdir())
    except subprocess.TimeoutExpired:
        return _CRASH, f"reading it did not finish within {PROBE_TIMEOUT_S:g} s"
    except OSError as exc:
        return _SKIP, f"probe not run ({exc.strerror})"  # no child possible: the reader decides
    code = done.returncode
    if code < 0:
        return _CRASH, f"reading it killed the reader process (signal {-code})"
    if code in (0, 1):  # 1: Python exception inside the child = a clean error for the reader
        return _OK, ""
    return _CRASH, f"reading it made the reader process fail (exit status {code})"


def probe_raster_file(path: str, *, what: str = "file") -> None:
    """Refuse ``path`` when reading it with GDAL kills a child process (see module docstring).

    ``what`` names the file's role in the error, e.g. "forecast file". Missing files pass
    (the reader's own error names them); so do files whose child ended with a Python error.
    """
    try:
        key = _key(path)
    except OSError:
        return
    verdict = _MEMORY.get(key)
    if verdict is None:
        stored = _disk_load().get(json.dumps(key))
        if isinstance(stored, list) and len(stored) == 2:
            verdict = (str(stored[0]), str(stored[1]))
    if verdict is None:
        verdict = _run_child(path)
        if verdict[0] == _SKIP:
            return
        _disk_store(key, verdict)
    _MEMORY[key] = verdict
    if verdict[0] == _CRASH:
        raise SeawayInputError(
            f"{what} {show(os.fspath(path))} is damaged: {verdict[1]}. It was not opened here; "
            "check or download the file again"
        )
