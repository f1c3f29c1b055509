# SPDX-License-Identifier: GPL-2.0-or-later
"""The user's vessel-profile store (plugin/profile_store.py), without QGIS.

Files written by the store are read back independently with Python's standard ``json`` module
(an RFC 8259 parser outside this project), so a store that wrote the wrong thing and read its
own mistake back could not pass.
"""
from __future__ import annotations

import dataclasses
import json
from pathlib import Path

import pytest

from seaway_comfort.plugin.profile_store import (
    ProfileExistsError,
    ProfileStore,
    profile_file_name,
    vessel_folder,
)
from seaway_comfort.processing.core.validation import SeawayInputError
from seaway_comfort.processing.core.vessel.profile import (
    FORMAT_NAME,
    Station,
    VesselProfile,
    builtin_profile,
    builtin_profile_names,
)


def _profile(name: str = "Test launch 9 m", **changes) -> VesselProfile:
    # An invented small craft; plausible numbers, not any real vessel.
    base = VesselProfile(
        name=name,
        length_wl_m=9.0,
        beam_m=3.1,
        draught_m=0.8,
        block_coeff=0.42,
        gm_m=0.9,
        roll_damping_ratio=0.1,
        service_speed_kn=8.0,
        description="invented test vessel",
        stations=(Station("helm", 0.5, 0.0, 1.6), Station("bow seat", 3.5, -0.4, 0.6)),
    )
    return dataclasses.replace(base, **changes)


def test_vessel_folder_is_below_settings_dir(tmp_path: Path):
    assert vessel_folder(tmp_path) == tmp_path / "seaway_comfort" / "vessels"
    assert not vessel_folder(tmp_path).exists()  # only computed, not created


def test_round_trip_and_file_read_back_with_json(tmp_path: Path):
    store = ProfileStore(tmp_path / "vessels")
    assert store.entries() == []  # missing folder: empty, no error
    prof = _profile()
    path = store.save(prof)
    assert path.parent == tmp_path / "vessels" and path.name == "Test_launch_9_m.json"
    # Independent read with the standard library's JSON parser.
    data = json.loads(path.read_text(encoding="utf-8"))
    assert data["format"] == FORMAT_NAME
    assert data["name"] == "Test launch 9 m"
    assert data["length_wl_m"] == 9.0 and data["beam_m"] == 3.1 and data["gm_m"] == 0.9
    assert [s["name"] for s in data["stations"]] == ["helm", "bow seat"]
    assert data["stations"][1]["y_m"] == -0.4
    # And through the store: equal profile, listed by name.
    assert store.load("Test launch 9 m") == prof
    assert store.names() == ["Test launch 9 m"]
    assert store.exists("Test launch 9 m")
    assert not any(p.name.startswith(".") for p in path.parent.iterdir())  # no temp leftovers


def test_nothing_overwritten_without_asking(tmp_path: Path):
    store = ProfileStore(tmp_path)
    store.save(_profile(gm_m=0.9))
    with pytest.raises(ProfileExistsError, match="exists already") as info:
        store.save(_profile(gm_m=1.4))
    assert info.value.existing_name == "Test launch 9 m"
    assert store.load("Test launch 9 m").gm_m == 0.9  # unchanged
    store.save(_profile(gm_m=1.4), overwrite=True)
    assert store.load("Test launch 9 m").gm_m == 1.4


def test_delete(tmp_path: Path):
    store = ProfileStore(tmp_path)
    store.save(_profile("A"))
    store.save(_profile("B"))
    removed = store.delete("A")
    assert not removed.exists()
    assert store.names() == ["B"]
    with pytest.raises(SeawayInputError, match="no stored vessel profile named 'A'"):
        store.delete("A")
    with pytest.raises(SeawayInputError, match="no stored vessel profile named 'A'"):
        store.load("A")


def test_listing_sorted_and_broken_files_reported(tmp_path: Path):
    store = ProfileStore(tmp_path)
    for name in ("zeta", "Alpha", "mike"):
        store.save(_profile(name))
    (tmp_path / "broken.json").write_text("{not json", encoding="utf-8")
    bad = json.loads((tmp_path / "mike.json").read_text(encoding="utf-8"))
    bad["beam_m"] = -2.0
    (tmp_path / "bad_beam.json").write_text(json.dumps(bad), encoding="utf-8")
    (tmp_path / ".saving-123.json").write_text("{}", encoding="utf-8")  # unfinished save
    entries = store.entries()
    assert [e.name for e in entries] == ["Alpha", "bad_beam", "broken", "mike", "zeta"]
    by_name = {e.name: e for e in entries}
    assert not by_name["broken"].ok and "not valid JSON" in by_name["broken"].error
    assert not by_name["bad_beam"].ok
    assert "beam_m" in by_name["bad_beam"].error and "-2.0" in by_name["bad_beam"].error
    assert store.names() == ["Alpha", "mike", "zeta"]


@pytest.mark.parametrize(
    "name, expected",
    [
        ("Survey boat / A", "Survey_boat_A.json"),
        ("../../etc/passwd", "etc_passwd.json"),
        ("harbour_workboat_12m", "harbour_workboat_12m.json"),
        ("  Mk.2 launch  ", "Mk.2_launch.json"),
    ],
)
def test_file_names_stay_inside_the_folder(tmp_path: Path, name: str, expected: str):
    assert profile_file_name(name) == expected
    store = ProfileStore(tmp_path)
    assert store.path_for(name).parent == tmp_path


@pytest.mark.parametrize("name", ["", "   ", "../", "///"])
def test_unusable_name_is_rejected_naming_the_value(name: str):
    with pytest.raises(SeawayInputError, match=r"vessel profile name .* no letters or digits"):
        profile_file_name(name)


def test_save_rejects_non_profile(tmp_path: Path):
    with pytest.raises(SeawayInputError, match=r"profile must be a VesselProfile, got \{'name'"):
        ProfileStore(tmp_path).save({"name": "x"})  # type: ignore[arg-type]


def test_builtin_example_can_be_copied_into_the_store(tmp_path: Path):
    names = builtin_profile_names()
    assert names, "the core ships example profiles"
    original = builtin_profile(names[0])
    copy = dataclasses.replace(original, name=original.name + " (my copy)")
    store = ProfileStore(tmp_path)
    store.save(copy)
    loaded = store.load(copy.name)
    assert loaded == copy
    assert loaded.stations == original.stations


def test_relative_rao_table_made_absolute_when_copied(tmp_path: Path):
    src = tmp_path / "elsewhere"
    src.mkdir()
    prof = _profile(rao_table="tables/rao.csv", base_dir=str(src))
    store = ProfileStore(tmp_path / "store")
    path = store.save(prof)
    data = json.loads(path.read_text(encoding="utf-8"))
    assert Path(data["rao_table"]) == (src / "tables" / "rao.csv").resolve()
