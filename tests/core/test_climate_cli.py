# SPDX-License-Identifier: GPL-2.0-or-later
"""Command line and HTML report of the seasonal climate.

References: the library call compute_climate (checked by hand in test_climate_seasonal.py) for
the numbers the command line writes; RFC 7946 (GeoJSON) for the route file's structure;
html.escape semantics (Python standard library) for the escaping; the PNG signature bytes
(ISO/IEC 15948, 89 50 4E 47 0D 0A 1A 0A) for the embedded plots.
"""
from __future__ import annotations

import base64
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
    imgs = re.findall(r"data:image/png;base64,([A-Za-z0-9+/=]+)", page)
    assert len(imgs) == 2 and all(base64.b64decode(i)[:8] == b"\x89PNG\r\n\x1a\n" for i in imgs)
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
    assert "data:image/png" not in page and "NM</th>" in page  # the heat map as a table instead
    assert [share_bin(v) for v in (0.0, 0.19, 0.2, 0.79, 0.8, 1.0, float("nan"))] == [0, 0, 1, 3, 4, 4, -1]
