# SPDX-License-Identifier: GPL-2.0-or-later
"""The user's own vessel profiles: one JSON file per profile in one folder (no QGIS needed).

In QGIS the folder is ``<QgsApplication.qgisSettingsDirPath()>/seaway_comfort/vessels/`` (see
:func:`vessel_folder`); the store takes the folder as an argument so it can be tested anywhere.
Files use the core's vessel format (:mod:`..processing.core.vessel`), are read with the
core's validating loader and are written atomically (temporary file, then rename). Nothing is
overwritten unless the caller says so; a file that cannot be read is listed with its error
instead of breaking the list.
"""
from __future__ import annotations

import dataclasses
import os
import re
import tempfile
from dataclasses import dataclass
from pathlib import Path
from typing import List, Optional, Union

from ..processing.core.validation import SeawayInputError, show
from ..processing.core.vessel.profile import VesselProfile, load_vessel_profile, save_vessel_profile

__all__ = [
    "SUBFOLDER",
    "ProfileExistsError",
    "StoredProfile",
    "ProfileStore",
    "vessel_folder",
    "profile_file_name",
]

SUBFOLDER = ("seaway_comfort", "vessels")
"""Path of the store below the QGIS user-profile folder."""

MAX_STEM_CHARS = 80
_UNSAFE = re.compile(r"[^A-Za-z0-9_.-]+")


class ProfileExistsError(SeawayInputError):
    """Saving would replace an existing profile file (ask the user, then pass overwrite=True)."""

    def __init__(self, message: str, path: Path, existing_name: Optional[str]) -> None:
        super().__init__(message)
        self.path = path
        self.existing_name = existing_name


@dataclass(frozen=True)
class StoredProfile:
    """One file of the store: its profile, or the reason it could not be read."""

    name: str
    """Profile name (from the file; the file stem when the file cannot be read)."""
    path: Path
    profile: Optional[VesselProfile]
    error: str = ""
    """Empty when the file is a valid profile, else the loader's message."""

    @property
    def ok(self) -> bool:
        return self.profile is not None


def vessel_folder(settings_dir: Union[str, Path]) -> Path:
    """The store folder below a QGIS settings folder (``qgisSettingsDirPath()``); not created."""
    return Path(settings_dir).joinpath(*SUBFOLDER)


def profile_file_name(name: str) -> str:
    """File name for a profile name: letters, digits, '_', '-', '.' kept, the rest -> '_'.

    ``'Survey boat / A'`` -> ``'Survey_boat_A.json'``. Raises SeawayInputError naming the
    value when nothing usable is left (e.g. ``''`` or ``'../'``), so a name can never point
    outside the store folder.
    """
    if not isinstance(name, str):
        raise SeawayInputError(f"vessel profile name must be a string, got {show(name)}")
    stem = _UNSAFE.sub("_", name.strip()).strip("._-")
    stem = re.sub(r"_+", "_", stem)[:MAX_STEM_CHARS].rstrip("._-")
    if not stem:
        raise SeawayInputError(
            f"vessel profile name {show(name)} has no letters or digits to build a file name from"
        )
    return f"{stem}.json"


class ProfileStore:
    """List, load, save and delete user vessel profiles stored as JSON files in ``folder``."""

    def __init__(self, folder: Union[str, Path]) -> None:
        self._folder = Path(folder)

    @property
    def folder(self) -> Path:
        return self._folder

    def path_for(self, name: str) -> Path:
        """Where the profile called ``name`` is (or would be) stored."""
        return self._folder / profile_file_name(name)

    def entries(self) -> List[StoredProfile]:
        """Every ``*.json`` file of the folder (hidden files skipped), sorted by profile name (case-insensitive).

        Unreadable or invalid files are included with ``profile=None`` and ``error`` set.
        A missing folder gives an empty list.
        """
        if not self._folder.is_dir():
            return []
        out: List[StoredProfile] = []
        for path in sorted(self._folder.glob("*.json")):
            if path.name.startswith("."):  # temporary files of an unfinished save
                continue
            try:
                profile = load_vessel_profile(path)
            except SeawayInputError as exc:
                out.append(StoredProfile(path.stem, path, None, str(exc)))
            else:
                out.append(StoredProfile(profile.name, path, profile))
        out.sort(key=lambda e: (e.name.casefold(), e.path.name))
        return out

    def names(self) -> List[str]:
        """Names of the valid profiles, sorted."""
        return [e.name for e in self.entries() if e.ok]

    def exists(self, name: str) -> bool:
        return self.path_for(name).exists()

    def load(self, name: str) -> VesselProfile:
        """The stored profile called ``name`` (SeawayInputError when absent or invalid)."""
        path = self.path_for(name)
        if not path.is_file():
            raise SeawayInputError(
                f"no stored vessel profile named {show(name)} (looked for {show(str(path))})"
            )
        return load_vessel_profile(path)

    def save(self, profile: VesselProfile, *, overwrite: bool = False) -> Path:
        """Store ``profile`` under its name; returns the file path.

        Raises :class:`ProfileExistsError` when the file exists and ``overwrite`` is False.
        A relative ``rao_table`` path is made absolute when the profile came from another
        folder, so the table is still found from the store.
        """
        if not isinstance(profile, VesselProfile):
            raise SeawayInputError(f"profile must be a VesselProfile, got {show(profile)}")
        path = self.path_for(profile.name)
        if path.exists() and not overwrite:
            try:
                existing: Optional[str] = load_vessel_profile(path).name
            except SeawayInputError:
                existing = None
            shown = f" (holding profile {show(existing)})" if existing is not None else ""
            raise ProfileExistsError(
                f"vessel profile {show(profile.name)}: file {show(str(path))}{shown} exists already; "
                "confirm to replace it",
                path,
                existing,
            )
        profile = self._portable(profile)
        self._folder.mkdir(parents=True, exist_ok=True)
        fd, tmp_name = tempfile.mkstemp(prefix=".saving-", suffix=".json", dir=self._folder)
        os.close(fd)
        try:
            save_vessel_profile(profile, tmp_name, overwrite=True)
            os.replace(tmp_name, path)
        except BaseException:
            Path(tmp_name).unlink(missing_ok=True)
            raise
        return path

    def delete(self, name: str) -> Path:
        """Remove the stored profile ``name``; returns the removed path."""
        path = self.path_for(name)
        if not path.is_file():
            raise SeawayInputError(
                f"no stored vessel profile named {show(name)} to delete (looked for {show(str(path))})"
            )
        path.unlink()
        return path

    def delete_file(self, path: Union[str, Path]) -> Path:
        """Remove one ``*.json`` file of the store folder (also unreadable ones); returns it."""
        target = Path(path)
        if target.parent.resolve() != self._folder.resolve() or target.suffix != ".json":
            raise SeawayInputError(
                f"path {show(str(target))} is not a profile file of the store {show(str(self._folder))}"
            )
        if not target.is_file():
            raise SeawayInputError(f"no vessel profile file {show(str(target))} to delete")
        target.unlink()
        return target

    def _portable(self, profile: VesselProfile) -> VesselProfile:
        table = profile.rao_table
        if table is None or Path(table).is_absolute() or profile.base_dir is None:
            return profile
        if Path(profile.base_dir).resolve() == self._folder.resolve():
            return profile
        absolute = profile.rao_table_path()
        return dataclasses.replace(profile, rao_table=str(absolute))
