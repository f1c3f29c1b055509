# SPDX-License-Identifier: GPL-2.0-or-later
"""Disk cache of built response tables (:mod:`.tables`), one file per table.

A table depends only on the transfer model (the vessel's hull data or RAO table, or a
strip-theory model), the stations, the speed, the depth, the spectrum shape and the grids; the
cache key is a SHA-256 over exactly these plus :data:`ENGINE_VERSION`:

* the transfer's own ``cache_key`` when it offers one (attribute or method returning a string,
  e.g. a model whose RAOs are themselves cached), else its content: class name and every
  dataclass field, arrays by dtype, shape and bytes;
* station names and coordinates, speed, depth, gamma, spread, long-crestedness, n_freq, n_dir,
  g, and the Tp and heading grids (bytes).

Folder: ``SEAWAY_CACHE_DIR`` when set, else the folder given by :func:`set_default_cache_dir`
(the Processing algorithms pass a folder in the QGIS settings folder), else
``~/.cache/seaway_comfort``; tables go to its ``tables/`` subfolder. Files are ``.npz`` without
pickles (``allow_pickle=False``) holding the key they were written for: a file that cannot be
read, holds another key or other array shapes is ignored and the table rebuilt and rewritten.
Writes go to a temporary file renamed into place (no half-written file is ever read); a folder
that cannot be written only costs the rebuild next time.
"""
from __future__ import annotations

import dataclasses
import hashlib
import json
import os
import tempfile
from pathlib import Path
from typing import Any, Dict, Optional, Sequence

import numpy as np
from numpy.typing import ArrayLike

from ..vessel.profile import Station
from .tables import ResponseTable, ResponseTableSet, build_response_table, build_response_table_set

__all__ = ["ENGINE_VERSION", "CACHE_ENV", "cache_dir", "set_default_cache_dir", "transfer_cache_key",
           "table_key", "cached_table", "cached_table_set", "is_cached"]

ENGINE_VERSION = "response-tables-2"
"""Changes whenever the numbers a table holds would change (bump with the response code)."""
CACHE_ENV = "SEAWAY_CACHE_DIR"
_DEFAULT_DIR: Optional[str] = None
_FORMAT = 1


def set_default_cache_dir(path: Optional[str]) -> None:
    """The folder used when ``SEAWAY_CACHE_DIR`` is not set (None: ~/.cache/seaway_comfort)."""
    global _DEFAULT_DIR
    _DEFAULT_DIR = str(path) if path else None


def cache_dir() -> Path:
    """Folder of the table files (module docstring for the order of choices)."""
    env = os.environ.get(CACHE_ENV, "").strip()
    base = Path(env) if env else Path(_DEFAULT_DIR) if _DEFAULT_DIR else Path.home() / ".cache" / "seaway_comfort"
    return base / "tables"


def _digest_value(h: Any, v: Any) -> None:
    """Feed one value (scalars, strings, arrays, sequences, dataclasses) into the hash ``h``."""
    if dataclasses.is_dataclass(v) and not isinstance(v, type):
        h.update(f"<{type(v).__module__}.{type(v).__qualname__}>".encode())
        for f in dataclasses.fields(v):
            h.update(f.name.encode())
            _digest_value(h, getattr(v, f.name))
    elif isinstance(v, np.ndarray):
        a = np.ascontiguousarray(v)
        h.update(f"{a.dtype.str}{a.shape}".encode())
        h.update(a.tobytes())
    elif isinstance(v, (list, tuple)):
        h.update(f"[{len(v)}".encode())
        for x in v:
            _digest_value(h, x)
    else:
        h.update(repr(v).encode())


def transfer_cache_key(transfer: Any) -> str:
    """The transfer's own ``cache_key`` if it offers one, else a digest of its content."""
    own = getattr(transfer, "cache_key", None)
    if callable(own):
        own = own()
    if own is not None:
        return f"own:{type(transfer).__qualname__}:{own}"
    h = hashlib.sha256()
    _digest_value(h, transfer)
    return "content:" + h.hexdigest()


def table_key(transfer: Any, stations: Sequence[Station], speed_m_s: float, depth_m: Optional[float],
              params: Dict[str, Any]) -> str:
    """SHA-256 hex key of one table (module docstring); ``params`` the build keywords."""
    h = hashlib.sha256()
    for v in (ENGINE_VERSION, transfer_cache_key(transfer),
              tuple((s.name, float(s.x_m), float(s.y_m), float(s.z_m)) for s in stations),
              float(speed_m_s), None if depth_m is None or np.isinf(depth_m) else float(depth_m)):
        _digest_value(h, v)
    for k in sorted(params):
        h.update(k.encode())
        v = params[k]
        _digest_value(h, np.asarray(v, dtype=float) if k.endswith("_grid_s") or k.endswith("_grid_deg") else v)
    return h.hexdigest()


_ARRAYS = ("tp_grid_s", "heading_grid_deg", "q", "outside")
_SCALARS = ("speed_m_s", "depth_m", "gamma", "spread_s", "long_crested", "valid", "full_circle")


def _path(key: str) -> Path:
    return cache_dir() / f"{key}.npz"


def _load(key: str, n_stations: int) -> Optional[ResponseTable]:
    """The table stored under ``key``, or None when absent, unreadable or not ours."""
    try:
        with np.load(_path(key), allow_pickle=False) as z:
            meta = json.loads(str(z["meta"]))
            if meta.get("key") != key or meta.get("format") != _FORMAT or meta.get("engine") != ENGINE_VERSION:
                return None
            arrs = {k: np.array(z[k], dtype=float) for k in _ARRAYS}
        nt, nh = arrs["tp_grid_s"].size, arrs["heading_grid_deg"].size
        if arrs["q"].shape not in ((nt, nh, 8 + 4 * n_stations), (nt, nh, 12 + 4 * n_stations)) or arrs["outside"].shape != (nt, nh):
            return None
        if not all(np.all(np.isfinite(a)) for a in arrs.values()):
            return None
        sc = meta["scalars"]
        return ResponseTable(station_names=tuple(meta["station_names"]), **arrs,
                             speed_m_s=float(sc["speed_m_s"]),
                             depth_m=None if sc["depth_m"] is None else float(sc["depth_m"]),
                             gamma=float(sc["gamma"]), spread_s=float(sc["spread_s"]),
                             long_crested=bool(sc["long_crested"]), valid=bool(sc["valid"]),
                             full_circle=bool(sc["full_circle"]))
    except Exception:  # missing, truncated, foreign or corrupt file: rebuild
        return None


def _save(key: str, tab: ResponseTable) -> None:
    """Write atomically; a folder that cannot be written is not an error (rebuilt next time)."""
    meta = {"key": key, "format": _FORMAT, "engine": ENGINE_VERSION, "station_names": list(tab.station_names),
            "scalars": {k: getattr(tab, k) for k in _SCALARS}}
    tmp = None
    try:
        folder = cache_dir()
        folder.mkdir(parents=True, exist_ok=True)
        fd, tmp = tempfile.mkstemp(prefix=".tmp-", suffix=".npz", dir=str(folder))
        with os.fdopen(fd, "wb") as f:
            np.savez(f, meta=np.array(json.dumps(meta)), **{k: getattr(tab, k) for k in _ARRAYS})
        os.replace(tmp, _path(key))
        tmp = None
    except OSError:
        pass
    finally:
        if tmp is not None:
            try:
                os.unlink(tmp)
            except OSError:
                pass


def is_cached(transfer: Any, stations: Sequence[Station], speed_m_s: float, *,
              depth_m: Optional[float] = None, **params: Any) -> bool:
    """True when a readable table for these arguments is on disk (no build)."""
    return _load(table_key(transfer, stations, speed_m_s, depth_m, params), len(stations)) is not None


def cached_table(transfer: Any, stations: Sequence[Station], speed_m_s: float, *,
                 depth_m: Optional[float] = None, **params: Any) -> ResponseTable:
    """:func:`.tables.build_response_table` through the disk cache (same arguments)."""
    key = table_key(transfer, stations, speed_m_s, depth_m, params)
    tab = _load(key, len(stations))
    if tab is None:
        tab = build_response_table(transfer, stations, speed_m_s, depth_m=depth_m, **params)
        _save(key, tab)
    return tab


def cached_table_set(transfer: Any, stations: Sequence[Station], speeds_m_s: ArrayLike,
                     depths_m: Optional[ArrayLike] = None, **params: Any) -> ResponseTableSet:
    """:func:`.tables.build_response_table_set` with every table through the disk cache."""
    return build_response_table_set(transfer, stations, speeds_m_s, depths_m, table_builder=cached_table, **params)
