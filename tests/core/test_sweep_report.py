# SPDX-License-Identifier: GPL-2.0-or-later
"""The departure-sweep HTML report: well-formed, escaped, self-contained, with the cautions.

References: Python's ``html.parser`` (standard library) as the HTML tokenizer; the void elements
of the WHATWG HTML Living Standard s.13.1.2 (area, base, br, col, embed, hr, img, input, link,
meta, source, track, wbr). The sweep is run on invented uniform seas; no physics is checked here.
"""
from __future__ import annotations

import re
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
    kw.setdefault("route_lonlat", ([0.0, 0.5], [0.0, 0.0]))
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
        assert "src" not in attrs


def test_caution_heads_and_closes_the_page(result):
    text = sr.render_sweep_html(_report(result))
    assert text.count(CAUTION.replace("'", "&#x27;")) == 2
    first_h2 = text.index("<h2>")
    assert text.index("Caution.") < first_h2
    assert sr.sweep_text_summary(result).endswith("CAUTION: " + CAUTION)


def test_recommendation_and_tables(result):
    text = sr.render_sweep_html(_report(result))
    rec = result.recommendation
    assert text.index("id=\"verdict\"") < text.index("<h2>")
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


def _svg_elements(text, label_start):
    """(attrs of the <svg>, [(tag, attrs)] inside it, [text]) of the figure whose aria-label starts so."""
    class P(HTMLParser):
        def __init__(self):
            super().__init__(convert_charrefs=True)
            self.found, self.depth, self.elems, self.texts, self.attrs = 0, 0, [], [], None

        def handle_starttag(self, tag, attrs):
            a = dict(attrs)
            if tag == "svg" and a.get("aria-label", "").startswith(label_start):
                self.found += 1
                self.depth, self.attrs = 1, a
            elif self.depth:
                self.elems.append((tag, a))

        def handle_endtag(self, tag):
            if tag == "svg":
                self.depth = 0

        def handle_data(self, data):
            if self.depth:
                self.texts.append(data)

    p = P()
    p.feed(text)
    assert p.found == 1, label_start
    return p.attrs, p.elems, p.texts


def test_figures_are_inline_svg_without_raster_images(result):
    text = sr.render_sweep_html(_report(result))
    assert "<img" not in text and "data:image" not in text
    assert text.count("<svg ") == 1 + 2 + 1  # route map, a heat map per speed, the criterion chart
    assert "hours after" not in text


def test_heat_map_uses_the_class_palette_and_marks_the_pick(result):
    """Every class that occurs in the sweep's worst case fills cells of its heat map, no other
    class colour does, and the recommended departure row is outlined and labelled."""
    rec = result.recommendation
    s = result.speeds_kn.index(rec.speed_kn)
    attrs, elems, texts = _svg_elements(sr.render_sweep_html(_report(result)),
                                        f"Worst comfort class over the sources by departure and distance at {rec.speed_kn:g} kn")
    fills = {a["fill"] for t, a in elems if t == "path" and a.get("fill", "none") != "none"}
    present = set(np.unique(result.robust_class[s]).tolist())
    want = {COMFORT_PALETTE[c] if c >= 0 else sr.NOT_COMPUTED_COLOUR for c in present}
    assert fills == want
    outlined = [a for t, a in elems if t == "rect" and a.get("fill") == "none" and a.get("stroke-width") == "2.5"]
    assert len(outlined) == 1 and "◀ recommended" in texts
    # departures on the vertical axis as clock times (1 Jun 2030 from 00:00 every 2 h)
    assert "1 Jun 00:00" in texts and "departure (UTC)" in texts


def test_criterion_chart_marks_the_recommendation_inside_the_plot(result):
    _, elems, texts = _svg_elements(sr.render_sweep_html(_report(result)), "Criterion per departure")
    marker = [a for t, a in elems if t == "path" and a.get("stroke-dasharray") == "9 3"]
    assert len(marker) == 1 and "recommended" in texts
    frame = [a for t, a in elems if t == "rect" and a.get("fill") == "none"][0]
    x_marker = float(marker[0]["d"][1:].split(" ")[0])
    # the marker sits inside the frame, not on its left edge (the pick may be the first departure)
    assert float(frame["x"]) < x_marker < float(frame["x"]) + float(frame["width"])
    lines = [a for t, a in elems if t == "path" and a.get("fill") == "none" and a.get("stroke-width") == "1.6"]
    assert len(lines) == len(result.source_names) * len(result.speeds_kn)


def test_verdict_first_with_place_time_and_measure(result):
    text = sr.render_sweep_html(_report(result))
    i = text.index('id="verdict"')
    assert i < text.index("<h2>")
    verdict = text[i:text.index("</section>", i)]
    rec = result.recommendation
    assert str(np.datetime64(rec.depart_utc, "m")).replace("T", " ") + " UTC" in verdict
    assert ("within limits" in verdict) if rec.within_limits else ("No departure stays within limits" in verdict)
    assert "Ruling measure: earliest departure that stays within limits" in verdict
    assert "Worst class on this passage:" in verdict


def test_route_map_needs_the_route(result):
    text = sr.render_sweep_html(sr.build_sweep_report(result, ReportInputs(), route_lonlat=([0.0, 0.5], [0.0, 0.0])))
    attrs, elems, texts = _svg_elements(text, "Map of the route")
    assert "start" in texts and "end" in texts
    assert "Map of the route" not in sr.render_sweep_html(sr.build_sweep_report(result, ReportInputs()))


def test_write_html(result, tmp_path):
    out = sr.write_sweep_html(str(tmp_path / "sweep.html"), _report(result), plots=False)
    body = open(out, encoding="utf-8").read()
    assert body.startswith("<!DOCTYPE html>") and body.rstrip().endswith("</html>")
