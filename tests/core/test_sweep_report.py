# SPDX-License-Identifier: GPL-2.0-or-later
"""The departure-sweep HTML report: well-formed, escaped, self-contained, with the cautions.

References: Python's ``html.parser`` (standard library) as the HTML tokenizer; the void elements
of the WHATWG HTML Living Standard s.13.1.2 (area, base, br, col, embed, hr, img, input, link,
meta, source, track, wbr); the PNG signature 89 50 4E 47 0D 0A 1A 0A (PNG specification,
ISO/IEC 15948:2004 s.5.2). The sweep is run on invented uniform seas; no physics is checked here.
"""
from __future__ import annotations

import base64
import re
import sys
from html.parser import HTMLParser

import numpy as np
import pytest

from seaway_comfort.processing.core.sweep import engine as sweep
from seaway_comfort.processing.core.reports import sweep as sr
from seaway_comfort.processing.core.flags import CAUTION
from seaway_comfort.processing.core.reports.palette import COMFORT_PALETTE
from seaway_comfort.processing.core.reports.passage import ReportInputs
from seaway_comfort.processing.core.seastate import open_sea_state
from seaway_comfort.processing.core.demo.writers import write_cf_netcdf
from seaway_comfort.processing.core.vessel.profile import resolve_vessel

VOID = {"area", "base", "br", "col", "embed", "hr", "img", "input", "link", "meta", "source", "track", "wbr"}
EVIL = '<script>alert("x")</script>&<b>'
T0 = np.datetime64("2030-06-01T00:00", "ms")
PNG_SIGNATURE = bytes([0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A])


class StrictParser(HTMLParser):
    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.stack: list = []
        self.errors: list = []
        self.starts: list = []
        self.text: list = []

    def handle_starttag(self, tag, attrs):
        self.starts.append((tag, dict(attrs)))
        if tag not in VOID:
            self.stack.append(tag)

    def handle_endtag(self, tag):
        if not self.stack or self.stack[-1] != tag:
            self.errors.append(f"unexpected </{tag}> with open {self.stack[-3:]}")
        else:
            self.stack.pop()

    def handle_data(self, data):
        self.text.append(data)


@pytest.fixture(scope="module")
def result(tmp_path_factory):
    folder = tmp_path_factory.mktemp("uniform")
    lon = np.arange(-1.0, 2.01, 0.25)
    lat = np.arange(-1.0, 1.01, 0.25)
    srcs = []
    for name, hs, hours in ((EVIL, 1.0, 24), ("model B", 1.6, 12)):
        times = T0 + np.arange(hours // 3 + 1) * np.timedelta64(3, "h")
        shape = (times.size, lat.size, lon.size)
        path = str(folder / f"{'ab'[len(srcs)]}.nc")
        write_cf_netcdf(path, lon, lat, times, {
            "sea_surface_wave_significant_height": np.full(shape, hs),
            "sea_surface_wave_period_at_variance_spectral_density_maximum": np.full(shape, 6.0),
            "sea_surface_wave_from_direction": np.full(shape, 90.0)})
        srcs.append(open_sea_state(path, source_name=name))
    res = sweep.sweep_departures([0.0, 0.5], [0.0, 0.0], depart_from_utc=T0, depart_to_utc=T0 + np.timedelta64(12, "h"),
                                 step_h=2.0, sea_states=srcs, profile=resolve_vessel("coastal_survey_35m"),
                                 speeds_kn=[10.0, 12.0], criterion="earliest_ok", max_class=4, spacing_nm=2.0)
    for s in srcs:
        s.close()
    return res


def _report(result, **kw):
    inputs = ReportInputs(route=EVIL, sea_state_files=("a.nc", EVIL), vessel="coastal_survey_35m")
    return sr.build_sweep_report(result, inputs, warnings=[EVIL], **kw)


def _parse(text):
    p = StrictParser()
    p.feed(text)
    p.close()
    return p


def test_html_is_well_formed_and_escaped(result):
    text = sr.render_sweep_html(_report(result))
    p = _parse(text)
    assert p.errors == [] and p.stack == []
    assert not any(tag == "script" for tag, _ in p.starts)
    # the hostile name is shown as text (escaped), never as markup
    assert EVIL in "".join(p.text)
    assert "<script>" not in text
    # self-contained: images only as data: URIs, no external links
    for tag, attrs in p.starts:
        assert "href" not in attrs
        if tag == "img":
            assert attrs["src"].startswith("data:image/png;base64,")


def test_caution_heads_and_closes_the_page(result):
    text = sr.render_sweep_html(_report(result))
    assert text.count(CAUTION.replace("'", "&#x27;")) == 2
    first_h2 = text.index("<h2>")
    assert text.index("Caution.") < first_h2
    assert sr.sweep_text_summary(result).endswith("CAUTION: " + CAUTION)


def test_recommendation_and_tables(result):
    text = sr.render_sweep_html(_report(result))
    rec = result.recommendation
    assert "Recommended departure" in text
    assert str(np.datetime64(rec.depart_utc, "m")).replace("T", " ") + " UTC" in text
    # one data row per table row of the result (up to MAX_TABLE_ROWS) in "All rows"; the best
    # robust rows in the top table
    n_rows = len(result.rows)
    assert n_rows == 7 * 2 * 3  # 7 departures x 2 speeds x (2 sources + robust)
    assert _data_rows(text, "All rows") == min(n_rows, sr.MAX_TABLE_ROWS)
    assert _data_rows(text, "Best ") == min(sr.TOP_ROWS, 14)
    # passages past model B's 12 h horizon are marked, and numbers without value read n/a, not nan
    assert ">NO<" in text
    assert "n/a" in text and ">nan<" not in text


def _data_rows(text, heading):
    i = text.index("<h2>" + heading)
    j = text.index("</table>", i)
    return text[i:j].count("<tr>") - 1


def test_plots_are_embedded_png(result):
    pytest.importorskip("matplotlib")
    text = sr.render_sweep_html(_report(result))
    srcs = re.findall(r'src="data:image/png;base64,([^"]+)"', text)
    assert len(srcs) == 2  # heat map and criterion plot
    for s in srcs:
        assert base64.b64decode(s)[:8] == PNG_SIGNATURE


def test_heat_map_uses_the_class_palette(result):
    """The heat map's pixels hold the palette colour of a class that occurs in the sweep."""
    mpl_image = pytest.importorskip("matplotlib.image")
    import io

    png = sr.heat_map_png(result)
    img = mpl_image.imread(io.BytesIO(png), format="png")
    rgb = np.round(img[..., :3] * 255).astype(int).reshape(-1, 3)
    present = set(np.unique(result.robust_class[result.robust_class >= 0]).tolist())
    assert present
    for c in present:
        hexc = COMFORT_PALETTE[c].lstrip("#")
        want = np.array([int(hexc[i:i + 2], 16) for i in (0, 2, 4)])
        # the class fills a whole block of the map: many pixels, not just the legend swatch
        assert np.count_nonzero(np.all(rgb == want, axis=1)) > 2000, c


def test_report_works_without_matplotlib(result, monkeypatch):
    monkeypatch.setitem(sys.modules, "matplotlib", None)
    monkeypatch.setitem(sys.modules, "matplotlib.figure", None)
    monkeypatch.setitem(sys.modules, "matplotlib.backends.backend_agg", None)
    text = sr.render_sweep_html(_report(result))
    assert "<img" not in text
    assert "All rows" in text and _parse(text).errors == []


def test_write_html(result, tmp_path):
    out = sr.write_sweep_html(str(tmp_path / "sweep.html"), _report(result), plots=False)
    body = open(out, encoding="utf-8").read()
    assert body.startswith("<!DOCTYPE html>") and body.rstrip().endswith("</html>")
