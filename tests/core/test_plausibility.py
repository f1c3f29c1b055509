# SPDX-License-Identifier: GPL-2.0-or-later
"""Impossible input is refused with a message naming it; doubtful input is flagged per sample.

Sources of the bounds are in processing/core/plausibility.py and vessel/profile.py beside each
range. The hull bound GM <= T + B^2 / (12 Cb T) is recomputed here from its textbook pieces
(KB <= T, BM = I_T / V with I_T <= L B^3 / 12; from memory). The roll-period check uses the
IMO 2008 IS Code weather-criterion formula T = 2 C B / sqrt(GM) (from memory).
"""
from __future__ import annotations

import json
import math

import numpy as np
import pytest

from seaway_comfort.processing.core.api import assess_motions, transfer_model
from seaway_comfort.processing.core.demo.writers import write_bathymetry_geotiff, write_cf_netcdf
from seaway_comfort.processing.core.flags import SampleFlag
from seaway_comfort.processing.core.motions.rao_table import load_rao_table
from seaway_comfort.processing.core.passage import pipeline as passage
from seaway_comfort.processing.core.seastate import open_bathymetry, open_sea_state
from seaway_comfort.processing.core.validation import SeawayInputError
from seaway_comfort.processing.core.vessel.profile import BUILTIN_DIR, load_vessel_profile, profile_from_dict

BOAT = "coastal_survey_35m"  # L 35, B 8.6, T 2.7, Cb 0.52, GM 1.05 (invented example)
ODD = int(SampleFlag.IMPLAUSIBLE_VALUE)


def _boat(**over):
    d = json.loads((BUILTIN_DIR / f"{BOAT}.json").read_text())
    d.update(over)
    return d


@pytest.mark.parametrize("over,pattern", [
    ({"gm_m": 500.0}, r"gm_m = 500.0 is impossible.*T \+ B\^2 / \(12 Cb T\) = 7.09 m"),
    ({"roll_period_s": 0.33, "gm_m": None}, r"roll_period_s = 0.33 is not plausible \(allowed 1 to 60"),
    ({"length_wl_m": 5000.0, "beam_m": 8.6}, r"length_wl_m = 5000.0 is not plausible"),
    ({"service_speed_kn": 1e308}, r"service_speed_kn = 1e\+308 is not plausible"),
])
def test_impossible_vessel_fields_are_refused(over, pattern):
    with pytest.raises(SeawayInputError, match=pattern):
        profile_from_dict(_boat(**over), source="boat.json")


def test_gm_bound_is_the_hydrostatic_limit():
    """T + B^2/(12 Cb T) for B 8.6, T 2.7, Cb 0.52 = 2.7 + 73.96 / 16.848 = 7.0898 m."""
    bound = 2.7 + 8.6 ** 2 / (12 * 0.52 * 2.7)
    assert bound == pytest.approx(7.0898, abs=1e-4)
    profile_from_dict(_boat(gm_m=bound * 0.999), source="b")  # just inside: accepted
    with pytest.raises(SeawayInputError, match="gm_m"):
        profile_from_dict(_boat(gm_m=bound * 1.001), source="b")
    # the largest accepted GM still gives a roll period above the 1 s floor (IMO IS Code form)
    c = 0.373 + 0.023 * 8.6 / 2.7 - 0.043 * 35.0 / 100.0
    assert 2 * c * 8.6 / math.sqrt(bound) > 1.0


def test_doubtful_vessel_fields_are_reported_not_refused():
    d = _boat(gm_m=0.1, service_speed_kn=30.0)
    p = profile_from_dict(d, source="b")
    text = " | ".join(p.doubts())
    fn = 30.0 * 1852.0 / 3600.0 / math.sqrt(9.80665 * d["length_wl_m"])  # Froude number U / sqrt(g L)
    assert "0.15 m" in text and f"Froude number of {fn:.2f}" in text and fn > 0.6


def _rao(tmp_path, amp="1.0", period="4.0"):
    f = tmp_path / "rao.csv"
    f.write_text("period_s,heading_deg,heave_m_per_m,pitch_deg_per_m,roll_deg_per_m\n"
                 f"{period},0,{amp},1,1\n{period},180,1,1,1\n12,0,1,1,1\n12,180,1,1,1\n")
    return f


def test_rao_tables_with_impossible_values_are_refused(tmp_path):
    load_rao_table(_rao(tmp_path))  # the plain table reads
    with pytest.raises(SeawayInputError, match=r"line 2 column heave_m_per_m = 1000000.0 is not a plausible"):
        load_rao_table(_rao(tmp_path, amp="1e6"))
    with pytest.raises(SeawayInputError, match=r"period_s = 4000.0 is not a plausible ocean wave"):
        load_rao_table(_rao(tmp_path, period="4000"))  # milliseconds


@pytest.mark.parametrize("content", [
    "root:x:0:0:root:/root:/bin/bash\ndaemon:x:1:1:daemon:/usr/sbin\n",
    "period_s,heading_deg,heave_m_per_m,pitch_deg_per_m,roll_deg_per_m,secret:token=abc\n",
])
def test_a_file_that_is_no_rao_table_is_not_echoed(tmp_path, content):
    f = tmp_path / "passwd"
    f.write_text(content)
    (tmp_path / "boat.json").write_text(json.dumps(_boat(rao_table=str(f))))
    prof = load_vessel_profile(tmp_path / "boat.json")
    with pytest.raises(SeawayInputError) as err:
        transfer_model(prof)
    msg = str(err.value)
    assert "passwd" in msg and "root" not in msg.replace(str(tmp_path), "") and "secret" not in msg
    (tmp_path / "bin.csv").write_bytes(b"\xff\xfe\x00garbage")
    with pytest.raises(SeawayInputError, match="is not UTF-8 text"):
        load_rao_table(tmp_path / "bin.csv")


def test_api_refuses_impossible_arguments_by_name():
    prof = profile_from_dict(_boat(), source="b")
    base = dict(hs_m=[1.0, 1.0], tp_s=[6.0, 6.0], wave_from_deg=0.0, course_deg=0.0, speed_m_s=4.0)
    for arg, value, pattern in [
        ("tp_s", [6.0, 0.01], r"tp_s\[1\] = 0.01 is not a plausible wave period \(allowed \[0.5, 100\] s"),
        ("hs_m", [1e6, 1.0], r"hs_m\[0\] = 1000000.0 is not a plausible significant wave height"),
        ("speed_m_s", 1e308, r"speed_m_s = 1e\+308 is not a plausible speed"),
        ("gamma", 100.0, r"gamma = 100.0 is not a plausible JONSWAP gamma"),
        ("depth_m", 1e7, r"depth_m = 10000000.0 is not a plausible depth"),
        ("exposure_h", 0.0, r"exposure_h = 0.0 is not a plausible exposure"),
    ]:
        with pytest.raises(SeawayInputError, match=pattern):
            assess_motions(prof, **dict(base, **{arg: value}))


def test_api_flags_doubtful_samples_only():
    """Hs 22 m (beyond the 20 m soft bound) and a 1/10-steep sea are flagged; a 1 m, 6 s sea is
    not (steepness 2 pi Hs / (g Tp^2) = 0.0178 < 1/15)."""
    prof = profile_from_dict(_boat(), source="b")
    tp_steep = math.sqrt(2 * math.pi * 1.0 / (9.80665 * 0.1))  # Hs 1 m at steepness 0.1
    r = assess_motions(prof, hs_m=[1.0, 22.0, 1.0], tp_s=[6.0, 16.0, tp_steep], wave_from_deg=0.0,
                       course_deg=0.0, speed_m_s=4.0)
    assert [(int(f) & ODD) != 0 for f in r.flags] == [False, True, True]
    assert np.all(np.isfinite(r.vacc_rms_m_s2)) and np.all(r.vacc_rms_m_s2 > 0)


HS, TP, DIR = ("sea_surface_wave_significant_height",
               "sea_surface_wave_period_at_variance_spectral_density_maximum", "sea_surface_wave_from_direction")
T0 = np.datetime64("2030-06-01T00:00", "ms")


def _sea(tmp_path, tp_value):
    lon, lat = np.arange(-2.0, 2.01, 0.5), np.arange(-2.0, 2.01, 0.5)
    times = T0 + np.arange(5) * np.timedelta64(3, "h")
    shape = (times.size, lat.size, lon.size)
    tp = np.full(shape, 8.0)
    tp[:, :, lon > 0] = tp_value  # the east half in milliseconds
    path = str(tmp_path / "sea.nc")
    write_cf_netcdf(path, lon, lat, times, {HS: np.full(shape, 1.5), TP: tp, DIR: np.zeros(shape)})
    return open_sea_state(path), lon, lat


def test_passage_leaves_impossible_seas_uncomputed_and_flags_them(tmp_path):
    src, _, _ = _sea(tmp_path, 8000.0)
    prof = profile_from_dict(_boat(), source="b")
    r = passage.compute_passage([-1.0, 1.0], [0.0, 0.0], departure_utc=T0, speed_kn=10.0, sea_states=[src],
                                profile=prof, spacing_nm=10.0)
    east, west = r.lon_deg >= 0.5, r.lon_deg <= 0.0  # between: interpolated periods of either kind
    assert east.any() and west.any()
    assert np.all(r.flags[east] & ODD) and np.all(np.isnan(r.vacc_rms_m_s2[east]))
    assert np.all(np.isfinite(r.vacc_rms_m_s2[west]))
    assert np.all(r.vacc_rms_m_s2[west] > 0)


def test_depth_under_the_draught_is_flagged(tmp_path):
    """0.5 m of water under a 2.7 m draught: DRYDEPTH (depth <= draught) on every sample, and
    SHALLOW by its own rule (Tp 8 s at 0.5 m: Airy L = 17.6 m, L/20 = 0.88 m > 0.5 m); at 2.0 m,
    still under the draught but not below L/20 (0.5 * 34.69 / 10 = 1.73 m), DRYDEPTH alone."""
    src, lon, lat = _sea(tmp_path, 8.0)
    tif = str(tmp_path / "depth.tif")
    write_bathymetry_geotiff(tif, lon, lat, np.full((lat.size, lon.size), 0.5), convention="depth_positive_down")
    prof = profile_from_dict(_boat(), source="b")
    r = passage.compute_passage([-1.0, -0.5], [0.0, 0.0], departure_utc=T0, speed_kn=10.0, sea_states=[src],
                                profile=prof, spacing_nm=5.0,
                                depth=open_bathymetry(tif, convention="depth_positive_down"))
    want = int(SampleFlag.DEPTH_ON_LAND | SampleFlag.SHALLOW_WATER)
    assert np.all((r.flags & want) == want)
    write_bathymetry_geotiff(tif, lon, lat, np.full((lat.size, lon.size), 2.0), convention="depth_positive_down")
    r2 = passage.compute_passage([-1.0, -0.5], [0.0, 0.0], departure_utc=T0, speed_kn=10.0, sea_states=[src],
                                 profile=prof, spacing_nm=5.0,
                                 depth=open_bathymetry(tif, convention="depth_positive_down"))
    assert np.all(r2.flags & int(SampleFlag.DEPTH_ON_LAND)) and not np.any(r2.flags & int(SampleFlag.SHALLOW_WATER))
