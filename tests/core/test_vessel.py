# SPDX-License-Identifier: GPL-2.0-or-later
"""Vessel profiles: validation, JSON round trip, built-in examples.

Sources are named beside each check; "from memory" marks a source not re-read, "by hand" a
derivation written beside the check, "common practice, no source" a fact of the trade."""
from __future__ import annotations

import json
import math

import pytest

from seaway_comfort.processing.core.comfort import criteria
from seaway_comfort.processing.core.vessel import profile as vessel
from seaway_comfort.processing.core.validation import SeawayInputError
from seaway_comfort.processing.core.vessel.profile import (
    Station,
    VesselProfile,
    builtin_profile,
    builtin_profile_names,
    load_vessel_profile,
    profile_from_dict,
    profile_to_dict,
    resolve_vessel,
    save_vessel_profile,
)


def _d(**over):
    d = {
        "format": "seaway-comfort-vessel", "format_version": 1, "name": "t",
        "length_wl_m": 12.0, "beam_m": 4.0, "draught_m": 1.0, "block_coeff": 0.45,
        "gm_m": 0.8, "stations": [{"name": "helm", "x_m": 1.0, "y_m": 0.0, "z_m": 2.0}],
    }
    d.update(over)
    return d


def test_builtin_profiles_load_and_are_the_three_examples():
    names = builtin_profile_names()
    assert names == ["coastal_survey_35m", "harbour_workboat_12m", "ocean_research_70m"]
    for n in names:
        p = builtin_profile(n)
        assert p.name == n
        assert 2 <= len(p.stations) <= 4
        assert p.natural_roll_period_s > 0


def test_round_trip_dict_and_file(tmp_path):
    p = profile_from_dict(_d())
    assert profile_from_dict(profile_to_dict(p)) == p
    out = save_vessel_profile(p, tmp_path / "v.json")
    assert load_vessel_profile(out) == p
    with pytest.raises(SeawayInputError, match="overwrite=True"):
        save_vessel_profile(p, out)
    save_vessel_profile(p, out, overwrite=True)
    assert resolve_vessel(str(out)) == p
    assert resolve_vessel("harbour_workboat_12m").name == "harbour_workboat_12m"


def test_roll_period_defaults_to_imo_estimate():
    # IMO 2008 IS Code (MSC.267(85)) Part A 2.3: T = 2CB/sqrt(GM), C = 0.373 + 0.023 B/d
    # - 0.043 L/100; by hand, B 4, d 1, L 12, GM 0.8: C = 0.373 + 0.092 - 0.00516 = 0.45984,
    # T = 2 x 0.45984 x 4/sqrt(0.8) = 3.67872/0.894427 = 4.1129 s.
    assert 3.67872 / math.sqrt(0.8) == pytest.approx(4.1129, abs=5e-5)
    p = profile_from_dict(_d())
    assert p.natural_roll_period_s == pytest.approx(4.1129, abs=5e-5)
    assert profile_from_dict(_d(roll_period_s=5.0)).natural_roll_period_s == 5.0


def test_waterplane_estimate():
    # Cwp = (1 + 2 Cb)/3 (Schneekluth & Bertram 1998, from memory): Cb 0.45 -> 0.6333.
    assert profile_from_dict(_d()).cwp == pytest.approx(1.9 / 3)


@pytest.mark.parametrize(
    "over, words",
    [
        ({"beam_m": 13.0}, r"beam_m \(13.0\) must not exceed length_wl_m"),
        ({"block_coeff": 0.3}, r"block_coeff must lie in \[0.35, 1.0\], got 0.3"),
        ({"block_coeff": 1.05}, "block_coeff must lie in"),
        ({"gm_m": 0.0}, "gm_m must be > 0"),
        ({"gm_m": -0.2}, "gm_m must be > 0"),
        ({"draught_m": 0.0}, "draught_m must be > 0"),
        ({"gm_m": None}, "one of gm_m or roll_period_s"),
        ({"format": "other"}, "format must be"),
        ({"format_version": 2}, "format_version 2 is not supported"),
        ({"colour": "red"}, "unknown key.*'colour'.*allowed keys"),
        ({"length_wl_m": "12"}, "length_wl_m must be a number"),
        ({"length_wl_m": float("nan")}, "length_wl_m must be finite"),
        ({"stations": [{"name": "a", "x_m": 6.5}]}, "x_m=6.5 lies outside the hull"),
        ({"stations": [{"name": "a", "x_m": 0.0, "y_m": -2.5}]}, "y_m=-2.5 lies outside the hull"),
        ({"stations": [{"name": "a", "x_m": 0.0, "z_m": -1.5}]}, "z_m=-1.5 is unreasonable"),
        ({"stations": [{"name": "a", "x_m": 0.0, "z_m": 40.0}]}, "z_m=40.0 is unreasonable"),
        ({"stations": [{"name": "a", "x_m": 0.0}, {"name": "a", "x_m": 1.0}]}, "duplicate station name 'a'"),
        ({"stations": []}, "at least one station"),
        ({"stations": [{"name": "a", "x_m": 0.0, "task": "sleeping"}]}, "task must be one of"),
        ({"stations": [{"name": "a", "x_m": 0.0, "deck": 2}]}, "unknown key"),
    ],
)
def test_bad_profiles_are_rejected_with_field_and_value(over, words):
    # common practice, no source: the rules of VesselProfile's docstring.
    with pytest.raises(SeawayInputError, match=words):
        profile_from_dict(_d(**over), source="my.json")


def test_error_names_the_file(tmp_path):
    f = tmp_path / "bad.json"
    f.write_text(json.dumps(_d(beam_m=20.0)))
    with pytest.raises(SeawayInputError, match="bad.json"):
        load_vessel_profile(f)
    f.write_text("{not json")
    with pytest.raises(SeawayInputError, match="not valid JSON"):
        load_vessel_profile(f)


def test_unknown_station_lists_known():
    p = builtin_profile("coastal_survey_35m")
    with pytest.raises(SeawayInputError, match="bridge, survey_lab"):
        p.station("engine_room")
    assert p.station(None).name == "bridge"


def test_rao_path_relative_to_json(tmp_path):
    f = tmp_path / "v.json"
    f.write_text(json.dumps(_d(rao_table="raos.csv")))
    assert load_vessel_profile(f).rao_table_path() == tmp_path.resolve() / "raos.csv"


def test_task_names_match_criteria_table():
    assert set(vessel._KNOWN_TASKS) == set(criteria.NORDFORSK_TASKS)


def test_station_dataclass_is_frozen():
    s = Station("a", 0.0)
    with pytest.raises(Exception):
        s.x_m = 1.0  # type: ignore[misc]
    assert isinstance(builtin_profile("ocean_research_70m"), VesselProfile)
