# SPDX-License-Identifier: GPL-2.0-or-later
"""Recognition tables against published code tables; unit conversions; JONSWAP period ratios."""
from __future__ import annotations

import csv
import math
import os

import numpy as np
import pytest
from scipy import integrate

from seaway_comfort.processing.core.seastate import derived
from seaway_comfort.processing.core.seastate.variables import (
    CF_STANDARD_NAMES,
    GRIB_WAVE_PARAMETERS,
    grib_canonical,
    unit_conversion,
)
from seaway_comfort.processing.core.validation import SeawayInputError

# WMO Manual on Codes, Vol. I.2, FM 92 GRIB2, Code table 4.2, discipline 10, category 0 (waves):
# parameter number -> name (from memory of the WMO table; cross-checked below against GDAL's copy).
WMO_4_2_10_0 = {
    3: "Significant height of combined wind waves and swell",
    4: "Direction of wind waves",
    5: "Significant height of wind waves",
    6: "Mean period of wind waves",
    7: "Direction of swell waves",
    8: "Significant height of swell waves",
    9: "Mean period of swell waves",
    10: "Primary wave direction",
    11: "Primary wave mean period",
    12: "Secondary wave direction",
    13: "Secondary wave mean period",
    14: "Direction of combined wind waves and swell",
    15: "Mean period of combined wind waves and swell",
    25: "Inverse mean wave frequency",
    28: "Mean zero-crossing wave period",
    34: "Peak wave period",
    35: "Peak period of the wind waves",
    36: "Peak period of the total swell",
}


def test_grib_names_match_wmo_code_table_4_2():
    # WMO FM 92 GRIB2 Code table 4.2, discipline 10 category 0 (from memory, see table above)
    assert set(GRIB_WAVE_PARAMETERS) == set(WMO_4_2_10_0)
    for number, name in WMO_4_2_10_0.items():
        assert GRIB_WAVE_PARAMETERS[number].name.lower() == name.lower(), number


def _gdal_table():
    from osgeo import gdal

    path = gdal.FindFile("gdal", "grib2_table_4_2_10_0.csv")
    if not path or not os.path.exists(path):
        pytest.skip("GDAL's grib2_table_4_2_10_0.csv not installed")
    with open(path, newline="") as fh:
        return {int(r["subcat"]): r for r in csv.DictReader(fh) if int(r["subcat"]) >= 0}


def test_grib_table_matches_gdal_copy_of_wmo_table():
    # GDAL's grib2_table_4_2_10_0.csv, generated from the WMO GRIB2 tables (github.com/wmo-im/GRIB2)
    table = _gdal_table()
    for number, p in GRIB_WAVE_PARAMETERS.items():
        row = table[number]
        assert row["short_name"] == p.element, number
        assert row["name"].lower() == p.name.lower(), number


def test_grib_level_gives_swell_partition():
    # WMO Code table 4.5: 241 = ordered sequence of data; 1 = ground or water surface
    swell = GRIB_WAVE_PARAMETERS[8]
    assert grib_canonical(swell, 241, 1)[0] == "swell1_hs"
    assert grib_canonical(swell, 241, 2)[0] == "swell2_hs"
    assert grib_canonical(swell, 1, 0)[0] == "swell1_hs"
    assert grib_canonical(swell, 1, 0)[1] > grib_canonical(swell, 241, 1)[1]
    assert grib_canonical(GRIB_WAVE_PARAMETERS[12], 1, 0) is None


def test_cf_direction_names_declare_sense():
    # CF Standard Name Table: "..._from_direction" = direction the waves come from, "..._to_direction"
    # = direction they travel to (from memory of the table's definitions)
    for name, entry in CF_STANDARD_NAMES.items():
        if name.endswith("_to_direction"):
            assert entry.going_to and entry.canonical.endswith("dir"), name
        if "from_direction" in name:
            assert not entry.going_to and entry.canonical.endswith("dir"), name


@pytest.mark.parametrize("text, factor", [
    ("ft", 0.3048), ("feet", 0.3048), ("m", 1.0), ("[m]", 1.0), ("metres", 1.0), ("cm", 0.01),
])
def test_height_units(text, factor):
    # 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959)
    assert unit_conversion("height", text, where="w").factor == pytest.approx(factor, rel=1e-15)


def test_radian_directions_and_unknown_units():
    # 1 rad = 180/pi degrees (definition)
    assert unit_conversion("direction", "rad", where="w").factor == pytest.approx(180.0 / math.pi)
    with pytest.raises(SeawayInputError, match=r"f.nc variable 'hs'.*furlong"):
        unit_conversion("height", "furlong", where="f.nc variable 'hs'")
    assert "assumed" in unit_conversion("period", "", where="w").description


def _jonswap_omega(omega, hs, tp, gamma):
    """JONSWAP S(omega) [m^2 s/rad], DNV-RP-C205 (2010) s.3.5.5: S = A_g S_PM exp-peak term,
    S_PM = 5/16 Hs^2 wp^4 w^-5 exp(-5/4 (w/wp)^-4), A_g = 1 - 0.287 ln(gamma),
    sigma 0.07 / 0.09 below / above wp."""
    wp = 2 * math.pi / tp
    s_pm = 5.0 / 16.0 * hs**2 * wp**4 * omega**-5 * math.exp(-1.25 * (omega / wp) ** -4)
    sigma = 0.07 if omega <= wp else 0.09
    return (1 - 0.287 * math.log(gamma)) * s_pm * gamma ** math.exp(-0.5 * ((omega - wp) / (sigma * wp)) ** 2)


def _moment(n, tp, gamma):
    wp = 2 * math.pi / tp
    f = lambda w: w**n * _jonswap_omega(w, 2.0, tp, gamma)  # noqa: E731
    return (integrate.quad(f, 1e-3 * wp, wp, limit=400)[0]
            + integrate.quad(f, wp, 60 * wp, limit=400)[0]
            + integrate.quad(f, 60 * wp, np.inf, limit=200)[0])


def test_jonswap_period_ratios_by_numerical_integration():
    # Reference: scipy.integrate.quad of the DNV-RP-C205 (2010) s.3.5.5 JONSWAP spectrum, gamma 3.3;
    # Tm01 = 2 pi m0/m1, Tm02 = 2 pi sqrt(m0/m2), Tm-1,0 = 2 pi m-1/m0 (DNV-RP-C205 s.3.5.5 / ITTC)
    tp = 10.0
    m0, m1, m2, mm1 = (_moment(k, tp, 3.3) for k in (0, 1, 2, -1))
    assert 2 * math.pi * m0 / m1 / tp == pytest.approx(derived.TM01_OVER_TP, abs=5e-4)
    assert 2 * math.pi * math.sqrt(m0 / m2) / tp == pytest.approx(derived.TM02_OVER_TP, abs=5e-4)
    assert 2 * math.pi * mm1 / m0 / tp == pytest.approx(derived.TM10_OVER_TP, abs=5e-4)
    # DNV-RP-C205 s.3.5.5 polynomial fits (coefficients from memory), gamma 3.3, agree within 0.25 %
    g = 3.3
    tz_fit = 0.6673 + 0.05037 * g - 0.006230 * g**2 + 0.0003341 * g**3
    t1_fit = 0.7303 + 0.04936 * g - 0.006556 * g**2 + 0.0003610 * g**3
    assert derived.TM02_OVER_TP == pytest.approx(tz_fit, rel=2.5e-3)
    assert derived.TM01_OVER_TP == pytest.approx(t1_fit, rel=2.5e-3)


def test_partition_sum_and_dominant():
    # Hs_total = sqrt(sum Hs_i^2): 2.0 m and 1.5 m give 2.5 m (variances add; 3-4-5 triangle)
    p = np.array([[2.0, 1.5, np.nan], [np.nan, np.nan, np.nan]])
    hs = derived.hs_m_from_partitions(p)
    assert hs[0] == pytest.approx(2.5, rel=1e-12)
    assert np.isnan(hs[1])
    idx, ok = derived.dominant_partition(p)
    assert idx[0] == 0 and ok[0] and not ok[1]
