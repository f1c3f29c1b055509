# SPDX-License-Identifier: GPL-2.0-or-later
"""Strip-theory transfer model of a profile: profile keys, disk cache, interpolation against
the engine evaluated directly, station kinematics, and a forward-speed consistency check."""
from __future__ import annotations

import dataclasses
import json
import math

import numpy as np
import pytest

from seaway_comfort.processing.core.api import assess_motions, transfer_model
from seaway_comfort.processing.core.motions import rao_cache
from seaway_comfort.processing.core.motions import strip_transfer as stt
from seaway_comfort.processing.core.motions.closed_form import ClosedFormTransfer
from seaway_comfort.processing.core.motions.strip import equations as eq
from seaway_comfort.processing.core.validation import SeawayInputError
from seaway_comfort.processing.core.vessel.profile import (
    builtin_profile,
    load_vessel_profile,
    profile_from_dict,
    profile_to_dict,
)

SHIP = builtin_profile("ocean_research_70m")


@pytest.fixture(autouse=True)
def _cache(tmp_path, monkeypatch):
    monkeypatch.setenv(rao_cache.CACHE_ENV, str(tmp_path / "cache"))
    rao_cache._MEMORY.clear()


def _dict(**kw):
    d = profile_to_dict(SHIP)
    d.update(kw)
    return d


def test_profile_keys_round_trip_and_defaults():
    p = profile_from_dict(_dict(motion_model="closed_form", roll_gyradius_m=5.5, pitch_gyradius_m=17.0))
    assert profile_from_dict(profile_to_dict(p)) == p
    assert SHIP.motion_model == "strip" and SHIP.hull_sections is None
    old = {k: v for k, v in profile_to_dict(SHIP).items()
           if k not in ("hull_sections", "motion_model", "roll_gyradius_m", "pitch_gyradius_m")}
    assert profile_from_dict(old).roll_damping_ratio == SHIP.roll_damping_ratio  # old files read as before
    assert profile_from_dict(_dict(roll_damping_ratio=None)).roll_damping_ratio is None


@pytest.mark.parametrize("key,value,text", [("motion_model", "panel", "motion_model"),
                                            ("roll_gyradius_m", -2.0, "roll_gyradius_m"),
                                            ("hull_sections", "", "hull_sections")])
def test_bad_profile_values_are_named(key, value, text):
    with pytest.raises(SeawayInputError, match=text):
        profile_from_dict(_dict(**{key: value}), source="x.json")


def test_bad_section_file_names_file_and_line_not_other_content(tmp_path):
    secret = "do-not-echo-this-line"
    (tmp_path / "s.csv").write_text(f"x_m,beam_m,draught_m,area_m2\n# {secret}\n0,1,1,oops\n", encoding="utf-8")
    (tmp_path / "p.json").write_text(json.dumps(_dict(hull_sections="s.csv")), encoding="utf-8")
    prof = load_vessel_profile(tmp_path / "p.json")
    with pytest.raises(SeawayInputError) as exc:
        transfer_model(prof)
    assert "s.csv" in str(exc.value) and "oops" in str(exc.value) and secret not in str(exc.value)


def test_model_choice_and_disk_cache(tmp_path):
    assert isinstance(transfer_model(dataclasses.replace(SHIP, motion_model="closed_form")), ClosedFormTransfer)
    a = transfer_model(SHIP)
    files = list((tmp_path / "cache").glob("strip_*.npz"))
    assert len(files) == 1
    rao_cache._MEMORY.clear()
    b = transfer_model(SHIP)  # from disk
    np.testing.assert_array_equal(a.rao, b.rao)
    assert b.roll_period_s == a.roll_period_s and b.roll_inertia_source == a.roll_inertia_source
    files[0].write_bytes(b"not an npz file")  # corrupt cache: recomputed and rewritten
    rao_cache._MEMORY.clear()
    c = transfer_model(SHIP)
    np.testing.assert_array_equal(a.rao, c.rao)
    assert np.load(files[0], allow_pickle=False)["rao"].shape == a.rao.shape


def test_cache_key_follows_section_file_content(tmp_path):
    sec = stt.hull_sections_for(SHIP)
    rows = "\n".join(f"{x},{b},{d},{a}" for x, b, d, a in zip(sec.x_m, sec.beam_m, sec.draught_m, sec.area_m2))
    (tmp_path / "s.csv").write_text("x_m,beam_m,draught_m,area_m2\n" + rows + "\n", encoding="utf-8")
    (tmp_path / "p.json").write_text(json.dumps(_dict(hull_sections="s.csv")), encoding="utf-8")
    prof = load_vessel_profile(tmp_path / "p.json")
    k1 = rao_cache.profile_key(prof)
    (tmp_path / "s.csv").write_text("x_m,beam_m,draught_m,area_m2\n" + rows.replace(",", ", ") + "\n",
                                    encoding="utf-8")
    assert rao_cache.profile_key(prof) != k1
    assert rao_cache.profile_key(dataclasses.replace(SHIP, name="other", description="x")) == \
        rao_cache.profile_key(SHIP)


@pytest.mark.parametrize("mu,u_fn", [(90.0, 0.0), (135.0, 0.13), (47.0, 0.13), (180.0, 0.27)])
def test_interpolated_raos_match_the_engine(mu, u_fn):
    # interpolation error of the cached set against strip_rao_set evaluated directly at
    # off-node speeds/frequencies: RMS over the frequency band < 4 % of the RMS RAO
    # (our tolerance; measured 0.3-3 %)
    t = transfer_model(SHIP)
    setup = stt.strip_setup(SHIP)
    L, g = setup.hull.length_m, setup.hull.g_m_s2
    om = np.linspace(0.3, 4.0, 150) * math.sqrt(g / L)
    u = u_fn * math.sqrt(g * L)
    extra = stt._damping_per_speed(setup, SHIP, np.array([u]))
    direct = stt._to_station_axes(eq.strip_rao_set(setup.hull, setup.body, om, om ** 2 / g, [mu], [u], extra)[0])
    got = t.evaluate_complex(om, np.full_like(om, mu), np.full_like(om, u))
    for i, name in enumerate(stt.MODES):
        d = direct[:, 0, i]
        if np.sqrt(np.mean(np.abs(d) ** 2)) < 1e-6:
            continue  # zero by symmetry (e.g. roll in head seas)
        a = getattr(got, [f.name for f in dataclasses.fields(got)][i])
        err = np.sqrt(np.mean(np.abs(a - d) ** 2) / np.mean(np.abs(d) ** 2))
        assert err < 0.04, f"{name}: {err:.3f}"


def test_station_vertical_motion_uses_phases():
    # V = heave - x pitch: bow and stern differ in head seas when heave and pitch are coupled
    # (they would be equal with the old phase-free sum); the mirror station off the centre
    # line differs between port and starboard waves only through y*roll
    r = assess_motions(SHIP, hs_m=2.0, tp_s=8.0, wave_from_deg=[0.0, 60.0, 300.0], course_deg=0.0,
                       speed_m_s=5.0, station="forward_cabin", method="exact", long_crested=True)
    assert np.all(np.isfinite(r.sway_rms_m)) and np.all(np.isfinite(r.yaw_rms_deg))
    assert r.sway_rms_m[0] < 1e-3 * r.sway_rms_m[1]  # head seas: no sway (symmetry)
    np.testing.assert_allclose(r.roll_rms_deg[1], r.roll_rms_deg[2], rtol=1e-6)  # mirror seas


def test_closed_form_keeps_nan_sway_and_yaw():
    r = assess_motions(dataclasses.replace(SHIP, motion_model="closed_form"), hs_m=2.0, tp_s=8.0,
                       wave_from_deg=60.0, course_deg=0.0, speed_m_s=5.0)
    assert np.isnan(r.sway_rms_m).all() and np.isnan(r.yaw_rms_deg).all()


def test_forward_speed_physical_consistency():
    # PHYSICAL CONSISTENCY CHECK, not a comparison with model tests (no published forward-speed
    # table was checked in this session). Head seas at Fn 0.25: in long waves heave -> 1 and
    # pitch -> wave slope k whatever the speed (quasi-static limit, Lewis (ed.) 1989 PNA III
    # ch. 8); following seas at speed (omega_e through 0) stay finite.
    t = transfer_model(SHIP)
    L, g = t.length_m, t.g_m_s2
    u = 0.25 * math.sqrt(g * L)
    om = np.geomspace(0.2, 3.0, 600) * math.sqrt(g / L)
    tu = t.evaluate_complex(om, 180.0, u)
    hu, pu = np.abs(tu.heave_m_per_m), np.abs(tu.pitch_rad_per_m)
    k = om ** 2 / g
    np.testing.assert_allclose(hu[:5], 1.0, atol=0.05)
    np.testing.assert_allclose(pu[:5] / k[:5], 1.0, atol=0.08)
    tf = t.evaluate_complex(om, 0.0, u)
    for f in dataclasses.fields(tf):
        assert np.all(np.isfinite(getattr(tf, f.name)))
