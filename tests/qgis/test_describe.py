# SPDX-License-Identifier: GPL-2.0-or-later
"""seawaycomfort:describeseastate run through QGIS Processing on the demo forecast files.

The expected facts (33 three-hourly steps from 2031-03-10T00Z, a 51 x 31 grid of 0.1 deg) are
read from the files with GDAL itself (``gdal.Info`` band count, GRIB_VALID_TIME metadata), not
from our own readers; HTML checked with Python's ``html.parser``.
"""
from __future__ import annotations

from html.parser import HTMLParser

import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")

from osgeo import gdal  # noqa: E402

from seaway_comfort.processing.core.demo import scenario as ds  # noqa: E402
from seaway_comfort.processing.core.flags import CAUTION  # noqa: E402

ALG = "seawaycomfort:describeseastate"


@pytest.fixture(scope="module")
def demo(tmp_path_factory):
    return ds.build_demo_scenario(str(tmp_path_factory.mktemp("describe")))


def _run(params):
    import processing

    return processing.run(ALG, params)


def test_describe_grib(seaway_provider, demo, tmp_path):
    from qgis.core import QgsApplication

    assert QgsApplication.processingRegistry().algorithmById(ALG) is not None
    out = tmp_path / "describe.html"
    res = _run({"INPUT": demo.grib_path, "OUTPUT_REPORT": str(out)})
    text = res["DESCRIPTION"]
    g = gdal.Open(demo.grib_path)
    hs_bands = [g.GetRasterBand(i + 1) for i in range(g.RasterCount)
                if g.GetRasterBand(i + 1).GetMetadataItem("GRIB_ELEMENT") == "HTSGW"]
    valid = sorted(int(b.GetMetadataItem("GRIB_VALID_TIME").split()[0]) for b in hs_bands)
    import numpy as np

    t0 = str(np.datetime64(valid[0], "s"))
    t1 = str(np.datetime64(valid[-1], "s"))
    assert t0 in text and t1 in text
    assert f"{len(hs_bands)} steps" in text
    assert f"{g.RasterYSize} x {g.RasterXSize}" in text or f"{g.RasterXSize} x {g.RasterYSize}" in text
    for canonical in ("hs", "tp", "dir", "wind_hs", "swell1_hs"):
        assert canonical in text
    # GRIB2 code table 4.2 (10/0/5 wind waves, 10/0/8 swell at level 241 value 1) as GDAL reports them
    elements = {g.GetRasterBand(i + 1).GetMetadataItem("GRIB_ELEMENT") for i in range(g.RasterCount)}
    assert {"WVHGT", "SWELL"} <= elements
    assert "Partitions: wind, swell1" in text
    assert text.count(CAUTION) == 1
    html_text = out.read_text(encoding="utf-8")

    class P(HTMLParser):
        data = []

        def handle_data(self, d):
            self.data.append(d)

    p = P()
    p.feed(html_text)
    assert CAUTION in "".join(p.data)
    assert res["OUTPUT_REPORT"] == str(out)


def test_describe_netcdf_text_output(seaway_provider, demo, tmp_path):
    out = tmp_path / "describe.txt"
    res = _run({"INPUT": demo.netcdf_path, "OUTPUT_REPORT": str(out)})
    info = gdal.Info(f'NETCDF:"{demo.netcdf_path}":' + _first_hs_var(demo.netcdf_path))
    n_bands = info.count("Band ")
    assert f"{n_bands} steps" in res["DESCRIPTION"]
    assert out.read_text(encoding="utf-8") == res["DESCRIPTION"]


def _first_hs_var(path):
    md = gdal.Open(path).GetMetadata("SUBDATASETS")
    for k, v in md.items():
        if k.endswith("_NAME"):
            sub = gdal.Open(v)
            if "sea_surface_wave_significant_height" in str(sub.GetMetadata()):
                return v.rsplit(":", 1)[1]
    raise AssertionError("no Hs variable found by GDAL")


@pytest.mark.parametrize("kind", ["missing", "not_forecast", "overwrite"])
def test_describe_bad_input(seaway_provider, demo, tmp_path, kind):
    from qgis.core import QgsProcessingException

    if kind == "missing":
        params = {"INPUT": str(tmp_path / "nope.grib2")}
        pattern = "INPUT"
    elif kind == "not_forecast":
        junk = tmp_path / "junk.nc"
        junk.write_text("this is not a forecast\n")
        params = {"INPUT": str(junk)}
        pattern = "INPUT"
    else:
        params = {"INPUT": demo.grib_path, "OUTPUT_REPORT": demo.grib_path}
        pattern = "also an input"
    with pytest.raises(QgsProcessingException, match=pattern):
        _run(params)
