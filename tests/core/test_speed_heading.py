# SPDX-License-Identifier: GPL-2.0-or-later
"""The speed x course diagram's core: the same numbers as the api at each cell (the passage
engine, not a copy), its grid, its bad input, and a well-formed SVG.

Compared with: :func:`api.assess_motions` called directly with the cell's sea, course and speed
(its formulas are checked against published values in test_api.py and test_response.py);
Python's xml.etree for the SVG."""
from __future__ import annotations

import xml.etree.ElementTree as ET

import numpy as np
import pytest

from seaway_comfort.processing.core.api import assess_motions
from seaway_comfort.processing.core.demo.writers import write_cf_netcdf
from seaway_comfort.processing.core.passage.polar import courses_deg, default_speeds_kn, speed_heading
from seaway_comfort.processing.core.reports.polar import polar_svg, render_speed_heading_html
from seaway_comfort.processing.core.seastate import open_sea_state
from seaway_comfort.processing.core.units import KNOT_M_S
from seaway_comfort.processing.core.validation import SeawayInputError
from seaway_comfort.processing.core.vessel.profile import resolve_vessel

T0 = np.datetime64("2030-06-01T00:00", "ms")  # invented scenario


@pytest.fixture(scope="module")
def src(tmp_path_factory):
    lon, lat = np.arange(-1.0, 1.01, 0.5), np.arange(-1.0, 1.01, 0.5)
    times = T0 + np.arange(3) * np.timedelta64(3, "h")
    shape = (times.size, lat.size, lon.size)
    path = str(tmp_path_factory.mktemp("sh") / "u.nc")
    write_cf_netcdf(path, lon, lat, times, {
        "sea_surface_wave_significant_height": np.full(shape, 1.8),
        "sea_surface_wave_period_at_variance_spectral_density_maximum": np.full(shape, 7.0),
        "sea_surface_wave_from_direction": np.full(shape, 250.0)})
    s = open_sea_state(path)
    yield s
    s.close()


def test_cells_equal_the_api(src):
    prof = resolve_vessel("coastal_survey_35m")
    res = speed_heading(0.0, 0.0, T0 + np.timedelta64(3, "h"), [src], prof)
    assert res.n == 120 and res.speeds_kn == default_speeds_kn(11.0) == (0.0, 3.3, 6.6, 9.9, 13.2)
    direct = assess_motions(prof, hs_m=np.full(res.n, 1.8), tp_s=np.full(res.n, 7.0), wave_from_deg=np.full(res.n, 250.0),
                            course_deg=res.course_deg, speed_m_s=res.speed_kn * KNOT_M_S, method="exact")
    # 1e-6: the file stores Hs 1.8 m as float32 (1.79999995), the direct call takes 1.8 exactly
    np.testing.assert_allclose(res.msi_pct, direct.msi_pct, rtol=1e-6)
    np.testing.assert_allclose(res.roll_rms_deg, direct.roll_rms_deg, rtol=1e-6)
    np.testing.assert_array_equal(res.comfort_class, direct.comfort_class)
    np.testing.assert_array_equal(res.flags & direct.flags, direct.flags)
    assert all(res.class_reason)


def test_grid_and_bad_input(src):
    assert courses_deg(15.0).size == 24 and courses_deg(90.0).tolist() == [0.0, 90.0, 180.0, 270.0]
    prof = resolve_vessel("coastal_survey_35m")
    for kw, words in (({"heading_step_deg": 7.0}, "HEADING_STEP_DEG"), ({"speeds_kn": [-1.0]}, "SPEEDS_KN")):
        with pytest.raises(SeawayInputError, match=words):
            speed_heading(0.0, 0.0, T0, [src], prof, **kw)
    with pytest.raises(SeawayInputError, match="latitude"):
        speed_heading(0.0, 95.0, T0, [src], prof)


def test_svg_is_well_formed_and_marks_the_current_course(src):
    prof = resolve_vessel("harbour_workboat_12m")
    res = speed_heading(0.0, 0.0, T0, [src], prof, current_course_deg=70.0, current_speed_kn=6.0)
    root = ET.fromstring(polar_svg(res))
    assert root.tag.endswith("svg")
    assert sum(1 for e in root.iter() if e.tag.endswith("circle")) == 2
    html = render_speed_heading_html(res)
    assert "<script" not in html and "Planning aid only" in html
