# SPDX-License-Identifier: GPL-2.0-or-later
"""No output ever overwrites an input: the files a run reads, and the check of its outputs.

An output clashes with an input when both name the same file after following symbolic links
(real paths), or when the output exists and is the same file as an input (same device and
inode: hard links, bind mounts, differently spelt paths). The check runs before any work.
QGIS-free (plain ``os``), so the algorithms and the command-line tools share it.
"""
from __future__ import annotations

import dataclasses
import os
from pathlib import Path
from typing import Any, Iterable, List, Optional, Sequence, Tuple, Union

__all__ = ["ProtectedFile", "InputClash", "file_part", "protect", "profile_files", "find_clash"]

InputSpec = Union[str, Tuple[str, str]]


class InputClash(ValueError):
    """An output names a file the run reads; the message names both."""


@dataclasses.dataclass(frozen=True)
class ProtectedFile:
    """One input file: its role (``label``), the path as given, its real path and identity."""

    label: str
    path: str
    real: str
    ident: Optional[Tuple[int, int]]


def file_part(source_or_uri: str) -> str:
    """The file path of an OGR/GDAL source string (before '|' options, without ogr: prefixes)."""
    text = str(source_or_uri or "")
    if text.startswith("ogr:"):
        text = text[4:]
        if "dbname=" in text:
            text = text.split("dbname=", 1)[1].strip().split(" ")[0].strip("'\"")
    return text.split("|", 1)[0]


def _real(path: str) -> str:
    return os.path.normcase(os.path.realpath(os.path.abspath(path)))


def _ident(path: str) -> Optional[Tuple[int, int]]:
    try:
        st = os.stat(path)  # follows symbolic links
    except OSError:
        return None
    return (int(st.st_dev), int(st.st_ino)) if st.st_ino else None


def protect(inputs: Iterable[InputSpec]) -> List[ProtectedFile]:
    """ProtectedFile of every existing input; items are paths or (label, path) pairs."""
    out: List[ProtectedFile] = []
    for item in inputs:
        label, path = item if isinstance(item, tuple) else ("input", item)
        p = file_part(path) if path else ""
        if p and os.path.exists(p):
            out.append(ProtectedFile(label, str(path), _real(p), _ident(p)))
    return out


def _profile_named_files(profile: Any) -> List[Tuple[str, str]]:
    """Files a profile names (its RAO table, hull sections, ...): every text field of the
    profile dataclass that resolves, relative to the profile's folder, to an existing file."""
    if not dataclasses.is_dataclass(profile):
        return []
    base = getattr(profile, "base_dir", None)
    out = []
    for f in dataclasses.fields(profile):
        v = getattr(profile, f.name, None)
        if f.name in ("name", "description", "base_dir") or not isinstance(v, str) or not v.strip():
            continue
        p = Path(v)
        if not p.is_absolute() and base:
            p = Path(base) / p
        if p.is_file():
            out.append((f"vessel profile {f.name}", str(p)))
    return out


def profile_files(spec: str, profile: Any, resolved_json: Optional[str],
                  stored_dirs: Sequence[Union[str, Path]] = ()) -> List[Tuple[str, str]]:
    """(label, path) of every file a vessel choice reads: the profile JSON that was loaded
    (``resolved_json``, or ``spec`` when it names a file), the files the profile names, and every
    stored profile (``*.json``) in ``stored_dirs``."""
    out: List[Tuple[str, str]] = []
    if resolved_json:
        out.append(("VESSEL profile", str(resolved_json)))
    elif spec and os.path.isfile(str(spec)):
        out.append(("VESSEL profile", str(spec)))
    out += _profile_named_files(profile)
    for folder in stored_dirs:
        d = Path(folder)
        if d.is_dir():
            out += [("stored vessel profile", str(p)) for p in sorted(d.glob("*.json"))]
    return out


def find_clash(dest: str, protected: Sequence[ProtectedFile]) -> Optional[ProtectedFile]:
    """The protected input that writing ``dest`` would overwrite, or None."""
    path = file_part(dest)
    if not path:
        return None
    real, ident = _real(path), _ident(path)
    for pf in protected:
        if real == pf.real or (ident is not None and ident == pf.ident):
            return pf
    return None
