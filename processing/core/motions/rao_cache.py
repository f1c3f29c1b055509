# SPDX-License-Identifier: GPL-2.0-or-later
"""On-disk cache of strip-theory RAO sets (:class:`.strip_transfer.StripTransfer`).

Key: SHA-256 of the profile's content (its JSON mapping without name, description and
stations, which do not change the RAOs), the bytes of its hull-sections file when it has one,
gravity and :data:`.strip_transfer.ENGINE_VERSION`. Value: one ``.npz`` file (numpy arrays
only, read with ``allow_pickle=False``: no code execution) named by the key.

Folder (first that is set): the ``folder`` argument, the environment variable
:data:`CACHE_ENV`, the folder given to :func:`set_default_cache_folder` (the plugin passes
``<QGIS settings folder>/seaway_comfort/rao_cache`` when QGIS loads it), else a user cache
folder (``%LOCALAPPDATA%`` on Windows, ``$XDG_CACHE_HOME`` or ``~/.cache`` elsewhere, then
``seaway_comfort/rao_cache``). A file that cannot be read or does not match is recomputed and
rewritten; a folder that cannot be written leaves the result uncached (no error).
Results also stay in memory for the session (:data:`_MEMORY`, a few profiles).
"""
from __future__ import annotations

from dataclasses import replace

import hashlib
import json
import os
import tempfile
from collections import OrderedDict
from pathlib import Path
from typing import Dict, Optional, Union

import numpy as np

from ..units import G_STANDARD_M_S2
from ..validation import SeawayInputError, show
from ..vessel.profile import VesselProfile, profile_to_dict
from .strip_transfer import ENGINE_VERSION, StripTransfer, build_strip_transfer

__all__ = ["CACHE_ENV", "cache_folder", "set_default_cache_folder", "profile_key", "cached_strip_transfer"]

CACHE_ENV = "SEAWAY_COMFORT_RAO_CACHE"
_DEFAULT: Dict[str, Optional[str]] = {"folder": None}
_MEMORY: "OrderedDict[str, StripTransfer]" = OrderedDict()
_MEMORY_SIZE = 6
_ARRAYS = ("speeds_m_s", "omega_rad_s", "heading_deg", "rao", "roll_damping_n_m_s", "zeta_per_speed")
_SCALARS = ("roll_period_s", "zeta_total", "roll_inertia_source", "damping_source", "hull_ok",
            "length_m", "g_m_s2")


def set_default_cache_folder(folder: Optional[Union[str, Path]]) -> None:
    """Folder used when neither the argument nor :data:`CACHE_ENV` is set (None = user cache)."""
    _DEFAULT["folder"] = None if folder is None else str(folder)


def cache_folder(folder: Optional[Union[str, Path]] = None) -> Path:
    """The cache folder (module docstring); not created here."""
    if folder is not None:
        return Path(folder)
    env = os.environ.get(CACHE_ENV)
    if env:
        return Path(env)
    if _DEFAULT["folder"]:
        return Path(str(_DEFAULT["folder"]))
    base = os.environ.get("LOCALAPPDATA") if os.name == "nt" else os.environ.get("XDG_CACHE_HOME")
    root = Path(base) if base else Path.home() / ".cache"
    return root / "seaway_comfort" / "rao_cache"


def profile_key(profile: VesselProfile, g_m_s2: float = G_STANDARD_M_S2) -> str:
    """Content key of the profile's RAO set (module docstring)."""
    d = profile_to_dict(profile)
    for k in ("name", "description", "stations", "rao_table", "hull_sections", "service_speed_kn"):
        d.pop(k, None)
    h = hashlib.sha256()
    h.update(json.dumps(d, sort_keys=True).encode("utf-8"))
    h.update(f"|g={g_m_s2!r}|engine={ENGINE_VERSION}|".encode("utf-8"))
    path = profile.hull_sections_path()
    if path is not None:
        try:
            h.update(path.read_bytes())
        except OSError as exc:
            raise SeawayInputError(
                f"vessel {show(profile.name)}: hull_sections file {path.name} cannot be read ({exc.strerror})"
            ) from None
    return h.hexdigest()[:32]


def _load(path: Path) -> Optional[StripTransfer]:
    """The cached transfer, or None when the file is missing, unreadable or inconsistent."""
    try:
        with np.load(path, allow_pickle=False) as z:
            arrays = {k: np.array(z[k]) for k in _ARRAYS}
            scalars = {k: z[k].item() for k in _SCALARS}
            version = str(z["engine_version"].item())
    except (OSError, KeyError, ValueError, EOFError):
        return None
    rao = arrays["rao"]
    shape = (arrays["speeds_m_s"].size, arrays["omega_rad_s"].size, arrays["heading_deg"].size, 5)
    if version != ENGINE_VERSION or rao.shape != shape or not np.all(np.isfinite(rao)):
        return None
    return StripTransfer(**arrays, **{k: (str(v) if isinstance(v, str) else v) for k, v in scalars.items()})


def _save(path: Path, t: StripTransfer) -> None:
    """Write atomically (temporary file then rename); any OS error leaves no cache file."""
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        fd, tmp = tempfile.mkstemp(suffix=".npz", dir=str(path.parent))
        with os.fdopen(fd, "wb") as fh:
            np.savez(fh, engine_version=np.array(ENGINE_VERSION),
                     **{k: getattr(t, k) for k in _ARRAYS},
                     **{k: np.array(getattr(t, k)) for k in _SCALARS})
        os.replace(tmp, path)
    except OSError:
        try:
            os.unlink(tmp)  # type: ignore[possibly-undefined]
        except (OSError, NameError):
            pass


def cached_strip_transfer(profile: VesselProfile, *, folder: Optional[Union[str, Path]] = None,
                          g_m_s2: float = G_STANDARD_M_S2) -> StripTransfer:
    """The profile's strip-theory transfer: from memory, else the disk cache, else computed
    (about 1-3 s) and stored (module docstring)."""
    key = profile_key(profile, g_m_s2)
    hit = _MEMORY.get(key)
    if hit is not None:
        _MEMORY.move_to_end(key)
        return hit
    path = cache_folder(folder) / f"strip_{key}.npz"
    t = _load(path) if path.is_file() else None
    if t is None:
        t = build_strip_transfer(profile, g_m_s2)
        _save(path, t)
    t = replace(t, cache_key=key)
    _MEMORY[key] = t
    while len(_MEMORY) > _MEMORY_SIZE:
        _MEMORY.popitem(last=False)
    return t
