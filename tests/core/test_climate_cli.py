# SPDX-License-Identifier: GPL-2.0-or-later
"""Command line and HTML report of the seasonal climate.

References: the library call compute_climate (checked by hand in test_climate_seasonal.py) for
the numbers the command line writes; RFC 7946 (GeoJSON) for the route file's structure;
html.escape semantics (Python standard library) for the escaping; the PNG signature bytes
(ISO/IEC 15948, 89 50 4E 47 0D 0A 1A 0A) for the embedded plots.
"""
from __future__ import annotations

import csv
import io
import html
import json
import re

import numpy as np
import pytest

from seaway_comfort.processing.core import climate as C
from seaway_comfort.processing.seasonal_cli import main, parse_lonlat, read_route
from seaway_comfort.processing.core.reports.climate import render_climate_html
from seaway_comfort.processing.core.reports.palette import share_bin
from seaway_comfort.processing.core.demo.synthetic_hindcast import (
    SeasonalCycle,
    write_seasonal_hindcast,
)
from seaway_comfort.processing.core.flags import CAUTION
from seaway_comfort.processing.core.validation import SeawayInputError


@pytest.fixture(scope="module")
def files(tmp_path_factory):
    return write_seasonal_hindcast(str(tmp_path_factory.mktemp("cli")), [2030],
                                   cycle=SeasonalCycle(hs_mean_m=1.0, hs_amp_m=0.8))


def _run(argv):
    out, err = io.StringIO(), io.StringIO()
    code = main(argv, stdout=out, stderr=err)
    return code, out.getvalue(), err.getvalue()


def test_cli_writes_same_numbers_as_library(files, tmp_path):
    csv_path, rep = tmp_path / "c.csv", tmp_path / "r.html"
    code, out, err = _run(files + ["--route-lonlat", "-9,41;-7,43", "--vessel", "coastal_survey_35m",
                                   "--speed-kn", "10", "--months", "6,7,8", "--backend", "serial",
                                   "--csv", str(csv_path), "--report", str(rep)])
    assert code == 0, err
    assert "100.0 %" in err  # progress bar reached the end
    assert CAUTION in out
    lib = C.compute_climate([-9, -7], [41, 43], files, "coastal_survey_35m", speed_kn=10, months="6,7,8",
                            backend=C.SerialBackend())
    rows = [r for r in csv.DictReader(ln for ln in csv_path.read_text().splitlines() if not ln.startswith("#"))
            if r["sample"] == "route"]
    assert [int(r["month"]) for r in rows] == [6, 7, 8]
    for k, r in enumerate(rows):
        assert float(r["ok_share"]) == pytest.approx(lib.route_ok_share[k], abs=5e-5)
        assert float(r["window_probability"]) == pytest.approx(lib.window_probability[k], abs=5e-5)
    page = rep.read_text()
    assert page.count(html.escape(CAUTION)) == 2  # head and foot, escaped (html.escape)
    assert "data:image" not in page and page.count("<svg ") == 3  # map, window bars, heat map
    assert "<script" not in page


def test_cli_bad_input_exit_2_and_message(files, tmp_path):
    code, _, err = _run(files + ["--route-lonlat", "-9,41;x,43", "--vessel", "coastal_survey_35m", "--speed-kn", "10"])
    assert code == 2 and "'x,43'" in err
    code, _, err = _run(files + ["--route-lonlat", "-9,41;-7,43", "--vessel", "coastal_survey_35m",
                                 "--speed-kn", "10", "--max-class", "9", "--backend", "serial"])
    assert code == 2 and "max_class" in err
    code, _, err = _run(["--vessel", "coastal_survey_35m", "--speed-kn", "10"])  # no files, no route
    assert code == 2
    code, _, err = _run(files + ["--route-lonlat", "-9,41;-7,43", "--vessel", "coastal_survey_35m",
                                 "--speed-kn", "10", "--scheduler", "tcp://127.0.0.1:9", "--quiet"])
    if C.backends.dask_available():
        assert code == 2 and "tcp://127.0.0.1:9" in err and "cannot be reached" in err


def test_route_files(tmp_path):
    gj = tmp_path / "r.geojson"
    gj.write_text(json.dumps({"type": "FeatureCollection", "features": [
        {"type": "Feature", "properties": {}, "geometry": {"type": "Point", "coordinates": [0, 0]}},
        {"type": "Feature", "properties": {}, "geometry": {"type": "LineString",
                                                           "coordinates": [[-9, 41], [-8, 42], [-7, 43]]}}]}))
    assert read_route(str(gj)) == ([-9.0, -8.0, -7.0], [41.0, 42.0, 43.0])
    cf = tmp_path / "r.csv"
    cf.write_text("name,latitude,longitude\na,41,-9\nb,43,-7\n")
    assert read_route(str(cf)) == ([-9.0, -7.0], [41.0, 43.0])
    nf = tmp_path / "n.csv"
    nf.write_text("-9,41\n-7,43\n")
    assert read_route(str(nf)) == ([-9.0, -7.0], [41.0, 43.0])
    bad = tmp_path / "b.csv"
    bad.write_text("lon,lat\n-9,41\n")
    with pytest.raises(SeawayInputError, match="at least two"):
        read_route(str(bad))
    with pytest.raises(SeawayInputError, match="cannot be read"):
        read_route(str(tmp_path / "none.csv"))
    assert parse_lonlat("1,2;3,4") == ([1.0, 3.0], [2.0, 4.0])


def test_report_escapes_and_tables_without_plots(files):
    r = C.compute_climate([-9, -7], [41, 43], files, "coastal_survey_35m", speed_kn=10, months="1",
                          backend=C.SerialBackend())
    page = render_climate_html(r, title="<b>T&C</b>", plots=False, sources=["<x>.nc"])
    assert "&lt;b&gt;T&amp;C&lt;/b&gt;" in page and "&lt;x&gt;.nc" in page  # html.escape
    assert "<svg" not in page and "Per month" in page
    assert [share_bin(v) for v in (0.0, 0.19, 0.2, 0.79, 0.8, 1.0, float("nan"))] == [0, 0, 1, 3, 4, 4, -1]


def _lab(hex_colour):
    """CIE 1976 L*a*b* (D65) of an sRGB colour: sRGB decoding per IEC 61966-2-1:1999, XYZ with
    the sRGB matrix of IEC 61966-2-1, Lab per CIE 15:2004 (ISO/CIE 11664-4)."""
    h = hex_colour.lstrip("#")
    c = [int(h[i:i + 2], 16) / 255.0 for i in (0, 2, 4)]
    r, g, b = [x / 12.92 if x <= 0.04045 else ((x + 0.055) / 1.055) ** 2.4 for x in c]
    xyz = (0.4124 * r + 0.3576 * g + 0.1805 * b, 0.2126 * r + 0.7152 * g + 0.0722 * b,
           0.0193 * r + 0.1192 * g + 0.9505 * b)
    white = (0.95047, 1.0, 1.08883)
    f = [(v / w) ** (1 / 3) if v / w > 216 / 24389 else (24389 / 27 * v / w + 16) / 116 for v, w in zip(xyz, white)]
    return 116 * f[1] - 16, 500 * (f[0] - f[1]), 200 * (f[1] - f[2])


def test_share_palette_is_its_own_sequence():
    """Percentages never borrow a comfort colour: every share colour is at least 15 CIE76 units
    from every class colour, and the five steps grow darker by at least 8 L* each (thresholds:
    common practice, no source)."""
    from seaway_comfort.processing.core.reports.palette import COMFORT_PALETTE, SHARE_PALETTE

    for s_col in SHARE_PALETTE:
        for c_col in COMFORT_PALETTE:
            d = sum((a - b) ** 2 for a, b in zip(_lab(s_col), _lab(c_col))) ** 0.5
            assert d >= 15.0, (s_col, c_col, d)
    light = [_lab(c)[0] for c in SHARE_PALETTE]
    assert all(a - b >= 8.0 for a, b in zip(light, light[1:])), light
    assert _lab("#ffffff")[0] == pytest.approx(100.0, abs=1e-6)  # CIE 15:2004: white L* = 100


def test_report_month_bars_days_and_plain_words(files):
    from seaway_comfort.processing.core.reports.climate import _bars_svg

    r = C.compute_climate([-9, -7], [41, 43], files, "coastal_survey_35m", speed_kn=10, months="1,7",
                          backend=C.SerialBackend())
    page = render_climate_html(r)
    # mean wait in days (hours / 24), never hours
    for h in r.mean_wait_h:
        if np.isfinite(h):
            assert f">{h / 24:.1f} d<" in page
    assert not re.search(r">\d+ h<", page)
    for term in ("wait_censored", "departures_past_end", "departures_known"):
        assert term not in page
    # one bar per month with a value, even at 0 % (a thin bar and its '0 %' label)
    svg = _bars_svg(r)
    n_val = int(np.isfinite(r.window_probability).sum())
    assert svg.count("<rect ") - 1 == n_val  # minus the plot frame
    n_zero = int((np.asarray(r.window_probability) == 0).sum())
    assert svg.count(">0 %<") == n_zero
    verdict = page[page.index('id="verdict"'):page.index("</section>")]
    assert "Best month:" in verdict and "Worst month:" in verdict and "Ruling measure:" in verdict
