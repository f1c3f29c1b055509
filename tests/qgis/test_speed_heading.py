# SPDX-License-Identifier: GPL-2.0-or-later
"""seawaycomfort:speedheading through processing.run on a uniform invented sea.

The zones are checked against IMO MSC.1/Circ.1228 as the circular puts them, computed here
independently of the core (deep-water Airy c = g T / 2 pi, USACE Shore Protection Manual 1984
ch. 2; TE = TW / |1 - U cos(180 - alpha) / c|, Lewis (ed.) 1989 PNA vol. III ch. 8):
* SURFRISK, 4.2.1: 135 < alpha < 225 and V > 1.8 sqrt(L)/cos(180 - alpha) kn (1.8 from memory);
* WAVEGROUPS, 4.2.2.1-4.2.2.2: lambda(TW) > 0.8 L, Hs > 0.04 L, TE/TW in 1.8..3.0;
* ROLLSYNC, 4.2.3.1: TE/TR in 0.8..1.2 (band our choice);
* ROLLPARAM, 4.2.3.2: never here, lambda(TW) = 69.5 m is 6 L (> 2 L, our wave-length band).
TW = 0.8343 Tp (JONSWAP gamma 3.3 mean period T1; DNV-RP-C205 (2010) s.3.5.5 fit 0.8348, from
memory). Cells within 2 % of a boundary are not asserted (the constant's last digit).
Hand values: Tp 8 s -> TW 6.674 s, lambda 69.55 m, c 10.42 m/s; alpha 180 at 10 kn (5.144 m/s):
TE = 6.674 / (1 - 0.4937) = 13.18 s (1.975 TW, inside 4.2.2.2); at 8 kn TE = 11.03 s (1.65 TW).
"""
from __future__ import annotations

import math

import numpy as np
import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")

from seaway_comfort.processing.core.demo.writers import write_cf_netcdf  # noqa: E402
from seaway_comfort.processing.core.vessel.profile import resolve_vessel  # noqa: E402

ALG = "seawaycomfort:speedheading"
HS = "sea_surface_wave_significant_height"
TP = "sea_surface_wave_period_at_variance_spectral_density_maximum"
DIR = "sea_surface_wave_from_direction"
T0 = np.datetime64("2030-06-01T00:00", "ms")  # invented scenario
VESSEL = "harbour_workboat_12m"
TP_ZONES_S = 7.0  # peak period of the zone test: synchronous roll reachable for the strip-theory TR of the 12 m boat
FIELDS = ("speed_kn", "course_deg", "rel_heading_deg", "enc_period_s", "msi_pct", "roll_rms_deg",
          "vacc_rms_m_s2", "lacc_rms_m_s2", "comfort_class", "class_reason", "flags")
G = 9.80665
KN = 1852.0 / 3600.0


def _sea(path, hs, tp, wdir=0.0):
    lon, lat = np.arange(-1.0, 2.01, 0.5), np.arange(-1.0, 2.01, 0.5)
    times = T0 + np.arange(5) * np.timedelta64(3, "h")
    shape = (times.size, lat.size, lon.size)
    write_cf_netcdf(path, lon, lat, times, {HS: np.full(shape, hs), TP: np.full(shape, tp), DIR: np.full(shape, wdir)})
    return path


def _point_3857(lon, lat):
    """EPSG:3857 by its defining spherical formulas (R = 6378137 m)."""
    r = 6378137.0
    return f"{r * math.radians(lon):.3f},{r * math.log(math.tan(math.pi / 4 + math.radians(lat) / 2)):.3f} [EPSG:3857]"


def _run(tmp_path, sea, **over):
    import processing

    p = {"SEA_STATE": [sea], "POINT": _point_3857(0.5, 0.5), "TIME": "2030-06-01T06:00:00Z", "VESSEL": VESSEL,
         "OUTPUT_TABLE": str(tmp_path / "sh.gpkg"), "OUTPUT_REPORT": str(tmp_path / "sh.html")}
    p.update(over)
    return processing.run(ALG, p)


def _rows(path):
    from qgis.core import QgsVectorLayer

    layer = QgsVectorLayer(path, "t", "ogr")
    assert layer.isValid()
    names = [f.name() for f in layer.fields()]
    return names, [dict(zip(names, f.attributes())) for f in layer.getFeatures()]


def _null(v):
    from qgis.PyQt.QtCore import QVariant

    return v is None or (isinstance(v, QVariant) and v.isNull())


def test_default_grid_reasons_and_report(seaway_provider, tmp_path):
    out = _run(tmp_path, _sea(str(tmp_path / "u.nc"), 1.0, 8.0), CURRENT_COURSE_DEG=45.0, CURRENT_SPEED_KN=5.0)
    names, rows = _rows(out["OUTPUT_TABLE"])
    assert all(f in names for f in FIELDS)
    # default speeds: 0 .. 1.2 x 7.5 kn service speed in 5 steps; courses every 15 deg
    assert len(rows) == 5 * 24
    assert sorted({round(r["speed_kn"], 1) for r in rows})[-1] == pytest.approx(9.0)
    assert sorted({r["course_deg"] for r in rows}) == [15.0 * i for i in range(24)]
    for r in rows:
        assert not _null(r["comfort_class"]) and r["class_reason"], r
    html = open(out["OUTPUT_REPORT"], encoding="utf-8").read()
    assert "<svg" in html and "4.2.1" in html and "current course and speed" in html
    assert "<script" not in html


def test_zones_where_the_circular_puts_them(seaway_provider, tmp_path):
    from seaway_comfort.processing.core.api import transfer_model

    prof = resolve_vessel(VESSEL)
    # TR: the motion model's own natural roll period (strip theory: from GM and the roll inertia
    # with added inertia), the one the circular's roll checks use; else the profile's estimate
    L, tr = prof.length_wl_m, float(getattr(transfer_model(prof), "roll_period_s", prof.natural_roll_period_s))
    out = _run(tmp_path, _sea(str(tmp_path / "u.nc"), 1.0, TP_ZONES_S), SPEEDS_KN="0,4,8,10,12")
    _, rows = _rows(out["OUTPUT_TABLE"])
    tw = 0.8343 * TP_ZONES_S
    c = G * tw / (2 * math.pi)
    lam = G * tw * tw / (2 * math.pi)
    checked = {"SURFRISK": 0, "WAVEGROUPS": 0, "ROLLSYNC": 0}
    for r in rows:
        v, alpha = r["speed_kn"], (0.0 - r["course_deg"]) % 360.0  # waves from 000
        codes = set((r["flags"] or "").split(","))
        # 4.2.1
        if 135.0 < alpha < 225.0:
            lim = 1.8 * math.sqrt(L) / math.cos(math.radians(180.0 - alpha))
            if abs(v - lim) > 0.02 * lim:
                assert ("SURFRISK" in codes) == (v > lim), r
                checked["SURFRISK"] += v > lim
        else:
            assert "SURFRISK" not in codes, r
        # 4.2.2: TE/TW = 1 / |1 - U cos(180 - alpha) / c|
        q = abs(1.0 - v * KN * math.cos(math.radians(180.0 - alpha)) / c)
        te = tw / q if q > 0 else math.inf
        ratio = te / tw
        assert lam > 0.8 * L and 1.0 > 0.04 * L
        if min(abs(ratio - 1.8), abs(ratio - 3.0)) > 0.02 * ratio:
            assert ("WAVEGROUPS" in codes) == (1.8 <= ratio <= 3.0), (r, ratio)
            checked["WAVEGROUPS"] += 1.8 <= ratio <= 3.0
        # 4.2.3.1
        s = te / tr
        if min(abs(s - 0.8), abs(s - 1.2)) > 0.02 * s:
            assert ("ROLLSYNC" in codes) == (0.8 <= s <= 1.2), (r, s)
            checked["ROLLSYNC"] += 0.8 <= s <= 1.2
        assert "ROLLPARAM" not in codes
    # Hs 1.0 m > 0.04 L = 0.46 m: every surf-riding and synchronous cell is graded danger
    assert all(n > 0 for n in checked.values()), checked
    for r in rows:
        codes = set((r["flags"] or "").split(","))
        assert ("SURFRISK" in codes) == ("SURFDANGER" in codes)
        assert ("ROLLSYNC" in codes) == ("SYNCDANGER" in codes)


def test_implausible_sea_is_not_classed(seaway_provider, tmp_path):
    out = _run(tmp_path, _sea(str(tmp_path / "odd.nc"), 1.0, 8000.0), SPEEDS_KN="0,5")
    _, rows = _rows(out["OUTPUT_TABLE"])
    assert len(rows) == 48
    for r in rows:
        assert _null(r["comfort_class"]) and _null(r["msi_pct"]) and "ODDVALUE" in r["flags"]


@pytest.mark.parametrize("over, words", [
    ({"HEADING_STEP_DEG": 7.0}, "HEADING_STEP_DEG"),
    ({"SPEEDS_KN": "5,abc"}, "SPEEDS_KN"),
    ({"TIME": "2031-01-01T00:00:00Z"}, "outside the time range"),
])
def test_bad_input_names_it(seaway_provider, tmp_path, over, words):
    from qgis.core import QgsProcessingException

    with pytest.raises(QgsProcessingException, match=words):
        _run(tmp_path, _sea(str(tmp_path / "u.nc"), 1.0, 8.0), **over)
