# SPDX-License-Identifier: GPL-2.0-or-later
"""The strip-theory model through the whole response path (vessel profile with a hull-sections
table -> api.transfer_model -> cached RAO set -> interpolation -> spectral response ->
station quantities -> api.assess_motions, long-crested) against the capytaine 3.0.0 BEM RAOs
of tests/reference/bem (zero speed), code/BEM RMS ratios within the goal bands of issue 13.

BEM side: the committed BEM transfer functions integrated with the local DNV-RP-C205 JONSWAP
of bem_compare.py over the BEM frequencies 0.30-2.00 rad/s; code side: the product's own
spectral integration (its log grid 0.5-8 omega_p, spectrum normalised on the grid). The same
viscous roll damping as the BEM runs: the profile's roll_damping_ratio is chosen so that the
strip model's viscous part equals the b44 of the BEM file header. Stations: bow (0.4 L, 0, 0)
for the vertical acceleration, midships on the waterline for the lateral specific force (the
BEM side at G's x on the waterline, x_G = 0 for these hulls).
"""
from __future__ import annotations

import importlib.util
import json
import math
from functools import lru_cache
from pathlib import Path

import numpy as np
import pytest

from seaway_comfort.processing.core.api import assess_motions
from seaway_comfort.processing.core.motions.strip.roll_damping import roll_natural
from seaway_comfort.processing.core.motions.strip_transfer import strip_setup
from seaway_comfort.processing.core.vessel.profile import load_vessel_profile

_spec = importlib.util.spec_from_file_location("bem_compare", Path(__file__).with_name("bem_compare.py"))
bem_compare = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(bem_compare)

# measured outside the band through the integrated path (same cases as the direct comparison in
# test_bem_comparison.py, where the short-sea misses of the engine itself are documented)
MAIN = {"box": (60.0, 12.0, 3.0), "wigley": (100.0, 10.0, 6.25), "fuller": (100.0, 16.0, 6.0)}


def _header_value(hull: str, name: str) -> float:
    import re

    text = (bem_compare.BEM_DIR / f"{hull}_rao.csv").read_text(encoding="utf-8")
    return float(re.search(name + r" ([0-9.e+-]+) m3", text).group(1))


@lru_cache(maxsize=None)
def profile_for(hull: str, folder: str):
    """A vessel profile JSON next to a copy of the hull's section table (relative path)."""
    L, B, T = MAIN[hull]
    vol = _header_value(hull, "displaced volume")
    d = {"format": "seaway-comfort-vessel", "format_version": 1, "name": f"bem {hull}",
         "length_wl_m": L, "beam_m": B, "draught_m": T, "block_coeff": min(vol / (L * B * T), 1.0),
         "gm_m": bem_compare.GM_T_M[hull], "roll_gyradius_m": 0.35 * B, "pitch_gyradius_m": 0.25 * L,
         "hull_sections": "sections.csv", "motion_model": "strip", "service_speed_kn": 10.0,
         "stations": [{"name": "bow", "x_m": 0.4 * L}, {"name": "mid", "x_m": 0.0}]}
    root = Path(folder) / hull
    root.mkdir(parents=True, exist_ok=True)
    (root / "sections.csv").write_bytes((bem_compare.BEM_DIR / f"{hull}_sections.csv").read_bytes())
    (root / "p.json").write_text(json.dumps(d), encoding="utf-8")
    prof = load_vessel_profile(root / "p.json")
    # same viscous roll damping as the BEM run: ratio = (b44 + B44_wave(w_n)) / B_crit
    _, b44 = bem_compare.read_bem(hull)
    setup = strip_setup(prof)
    nat = roll_natural(setup.hull, setup.body)
    d["roll_damping_ratio"] = (b44 + nat.wave_damping_n_m_s) / nat.critical_damping_n_m_s
    (root / "p.json").write_text(json.dumps(d), encoding="utf-8")
    return load_vessel_profile(root / "p.json")


QUANTITY = {  # product field, station, unit factor to the BEM side's units
    "heave": ("heave_rms_m", "mid", 1.0), "pitch": ("pitch_rms_deg", "mid", math.pi / 180),
    "roll": ("roll_rms_deg", "mid", math.pi / 180), "bow_acc": ("vacc_rms_m_s2", "bow", 1.0),
    "lat_acc": ("lacc_rms_m_s2", "mid", 1.0),
}


def integrated_ratio(hull: str, quantity: str, mu: float, tp: float, folder: str) -> float:
    prof = profile_for(hull, folder)
    field, station, unit = QUANTITY[quantity]
    # course 0 (north); ITTC mu = wave_from + 180 - course: head seas from 0, port beam from 270
    res = assess_motions(prof, hs_m=1.0, tp_s=tp, wave_from_deg=(mu + 180.0) % 360.0, course_deg=0.0,
                         speed_m_s=0.0, station=station, long_crested=True, method="exact")
    code = float(np.atleast_1d(getattr(res, field))[0]) * unit
    bem = bem_compare.responses(hull, mu)
    s = bem_compare.jonswap(bem["omega"], 1.0, tp)
    ref = math.sqrt(bem_compare.trapz(np.abs(bem["bem"][quantity]) ** 2 * s, bem["omega"]))
    return code / ref


@pytest.fixture(scope="module")
def cache_dir(tmp_path_factory, monkeypatch_module=None):
    return str(tmp_path_factory.mktemp("integrated"))


PARAMS = bem_compare.goal_band_params()


@pytest.mark.parametrize("hull,quantity,mu,band,tp", PARAMS)
def test_integrated_rms_ratio_in_goal_band(hull, quantity, mu, band, tp, cache_dir, monkeypatch):
    # source: capytaine 3.0.0 BEMSolver + post_pro.rao tables (header of each CSV)
    monkeypatch.setenv("SEAWAY_COMFORT_RAO_CACHE", cache_dir)
    ratio = integrated_ratio(hull, quantity, mu, tp, cache_dir)
    assert band[0] <= ratio <= band[1], f"code/BEM RMS ratio {ratio:.3f} outside {band}"


if __name__ == "__main__":
    import tempfile

    with tempfile.TemporaryDirectory() as tmp:
        import os

        os.environ["SEAWAY_COMFORT_RAO_CACHE"] = tmp
        for h in bem_compare.GM_T_M:
            for q, mu, _ in bem_compare.CASES:
                vals = " ".join(f"{integrated_ratio(h, q, mu, tp, tmp):6.3f}" for tp in bem_compare.TP_S)
                print(f"{h:7s} {q:8s} {mu:4.0f} {vals}")
