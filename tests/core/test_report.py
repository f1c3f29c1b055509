# SPDX-License-Identifier: GPL-2.0-or-later
"""The HTML passage report: well-formed, escaped, self-contained, with the cautions.

References: Python's ``html.parser`` (standard library) as the HTML tokenizer; the list of void
elements from the WHATWG HTML Living Standard s.13.1.2 ("Elements": area, base, br, col, embed,
hr, img, input, link, meta, source, track, wbr); the PNG signature 89 50 4E 47 0D 0A 1A 0A from
the PNG specification (ISO/IEC 15948:2004, s.5.2). The report data are built by hand here (no
physics is checked in this module).
"""
from __future__ import annotations

import base64
import re
import sys
from html.parser import HTMLParser

import numpy as np
import pytest

from seaway_comfort.processing.core.reports import passage as rp
from seaway_comfort.processing.core.flags import CAUTION, SampleFlag
from seaway_comfort.processing.core.passage.pipeline import NOT_COMPUTED_CLASS, PassageResult

VOID = {"area", "base", "br", "col", "embed", "hr", "img", "input", "link", "meta", "source", "track", "wbr"}
EVIL = '<script>alert("x")</script><img src=x onerror=alert(1)>'


class StrictParser(HTMLParser):
    """Collects tags, text and nesting errors."""

    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.stack: list = []
        self.errors: list = []
        self.starts: list = []
        self.text: list = []
        self.imgs: list = []

    def handle_starttag(self, tag, attrs):
        self.starts.append((tag, dict(attrs)))
        if tag == "img":
            self.imgs.append(dict(attrs))
        if tag not in VOID:
            self.stack.append(tag)

    def handle_endtag(self, tag):
        if not self.stack or self.stack[-1] != tag:
            self.errors.append(f"unexpected </{tag}> with open {self.stack[-3:]}")
        else:
            self.stack.pop()

    def handle_data(self, data):
        self.text.append(data)


def _result(n: int = 6, *, source: str = "model A") -> PassageResult:
    """A hand-made leg: samples 0-3 computed, 4-5 without sea data (NaN, class -1)."""
    t0 = np.datetime64("2031-03-11T06:00", "ms")
    eta = t0 + (np.arange(n) * 1800 * 1000).astype("timedelta64[ms]")
    comp = np.arange(n) < 4
    def vals(v):
        a = np.full(n, float(v))
        a[~comp] = np.nan
        return a
    cls = np.where(comp, np.array([0, 1, 2, 4, 0, 0])[:n], NOT_COMPUTED_CLASS).astype(np.int64)
    labels = ("smooth", "steady", "lively", "taxing", "punishing")
    flags = np.zeros(n, dtype=np.int64)
    flags[~comp] = int(SampleFlag.OUTSIDE_TIME)
    flags[1] = int(SampleFlag.OVERTAKING)
    dwell = np.full(n, 1800.0)
    dwell[0] = dwell[-1] = 900.0
    return PassageResult(
        leg=np.zeros(n, dtype=np.int64), seq=np.arange(n, dtype=np.int64), eta_utc=eta,
        dist_nm=np.arange(n) * 4.5, course_deg=np.full(n, 45.0), hs_m=vals(2.1), tp_s=vals(9.0),
        wave_from_deg=vals(200.0), depth_m=np.full(n, np.nan), wavelength_m=vals(126.4),
        celerity_m_s=vals(14.0), rel_heading_deg=vals(25.0), enc_period_s=vals(12.0),
        heave_rms_m=vals(0.4), pitch_rms_deg=vals(1.5), roll_rms_deg=vals(3.0), pitch_tz_s=vals(7.0),
        vacc_rms_m_s2=np.where(comp, [0.2, 0.3, 0.5, 0.9, 0, 0][:n], np.nan), lacc_rms_m_s2=vals(0.2),
        msi_pct=vals(4.0), msdv_cum=vals(10.0), comfort_class=cls,
        comfort_label=tuple(labels[c] if c >= 0 else "" for c in cls), flags=flags,
        source=tuple(source if c else "" for c in comp), lon_deg=np.linspace(-21, -20, n),
        lat_deg=np.linspace(-24.5, -25, n), speed_kn=np.full(n, 9.0), heave_tz_s=vals(8.0),
        roll_tz_s=vals(6.0), vacc_wf_rms_m_s2=vals(0.15), sway_rms_m=vals(0.1), yaw_rms_deg=vals(0.5), vomit_pct=vals(3.3), dwell_s=dwell,
        is_vertex=np.isin(np.arange(n), [0, n - 1]), computed=comp, vessel_name="test vessel",
        station_name="bridge", method="table", roll_period_s=6.0, departure_utc=t0,
        notes=("a note with <b>markup</b> & ampersand",),
    )


def _report(**kw):
    inputs = rp.ReportInputs(sea_state_files=(f"/tmp/{EVIL}.nc",), source_names=(EVIL,),
                             vessel=EVIL, route="route.geojson", created_utc="2031-03-10 00:00 UTC")
    return rp.build_report([(EVIL, _result(source=EVIL))], inputs, warnings=(EVIL,), **kw)


def _parse(text: str) -> StrictParser:
    p = StrictParser()
    p.feed(text)
    p.close()
    return p


def test_html_is_well_formed_and_escaped():
    text = rp.render_html(_report(), plots=False)
    p = _parse(text)
    assert p.errors == [] and p.stack == [], (p.errors, p.stack)
    assert text.startswith("<!DOCTYPE html>")
    # nothing from the inputs becomes markup: no script element, no injected img, no handler
    assert "script" not in {t for t, _ in p.starts}
    assert re.search(r"<\s*script", text, re.IGNORECASE) is None
    assert all("onerror" not in attrs for _, attrs in p.starts)
    assert p.imgs == []  # plots off, and the injected <img> stayed text
    assert EVIL in "".join(p.text)  # shown to the reader as text, unescaped by the parser


def test_caution_heads_and_closes_the_page():
    p = _parse(rp.render_html(_report(), plots=False))
    assert "".join(p.text).count(CAUTION) >= 2


def test_not_computed_samples_show_na_not_zero():
    text = rp.render_html(_report(), plots=False)
    p = _parse(text)
    # sample 5 (no sea data) appears as a row starting with its seq number, values n/a
    body = "".join(p.text)
    assert "n/a" in body
    assert "not computed" in body
    assert "OFFTIME" in body and "OUTRUN" in body


def test_hours_per_class_add_up():
    r = _result()
    h = r.hours_per_class()
    assert sum(h.values()) == pytest.approx(r.dwell_s.sum() / 3600.0)
    assert h["not computed"] == pytest.approx((1800 + 900) / 3600.0)


def test_plots_are_embedded_png_when_matplotlib_is_present():
    pytest.importorskip("matplotlib")
    p = _parse(rp.render_html(_report(), plots=True))
    assert len(p.imgs) == 1
    src = p.imgs[0]["src"]
    assert src.startswith("data:image/png;base64,")
    png = base64.b64decode(src.split(",", 1)[1])
    assert png[:8] == b"\x89PNG\r\n\x1a\n"  # PNG signature, ISO/IEC 15948 s.5.2


def test_report_works_without_matplotlib(monkeypatch):
    monkeypatch.setitem(sys.modules, "matplotlib", None)
    monkeypatch.setitem(sys.modules, "matplotlib.figure", None)
    monkeypatch.setitem(sys.modules, "matplotlib.backends.backend_agg", None)
    text = rp.render_html(_report(), plots=True)
    p = _parse(text)
    assert p.errors == [] and p.imgs == []
    assert CAUTION in "".join(p.text)


def test_write_html_and_text_summary(tmp_path):
    path = rp.write_html(str(tmp_path / "r.html"), _report(), plots=False)
    text = open(path, encoding="utf-8").read()
    assert _parse(text).errors == []
    summary = rp.text_summary(_report())
    assert CAUTION in summary
    assert "punishing" in summary  # the worst class of the hand-made leg


def _cie_lightness(hex_colour: str) -> float:
    """CIE 1976 L* of an sRGB colour: sRGB decoding per IEC 61966-2-1:1999, relative luminance
    Y = 0.2126 R + 0.7152 G + 0.0722 B (ITU-R BT.709 primaries), L* per CIE 15:2004 /
    ISO/CIE 11664-4 (L* = 116 f(Y) - 16)."""
    h = hex_colour.lstrip("#")
    c = [int(h[i:i + 2], 16) / 255.0 for i in (0, 2, 4)]
    lin = [x / 12.92 if x <= 0.04045 else ((x + 0.055) / 1.055) ** 2.4 for x in c]
    y = 0.2126 * lin[0] + 0.7152 * lin[1] + 0.0722 * lin[2]
    f = y ** (1 / 3) if y > 216 / 24389 else (24389 / 27 * y + 16) / 116
    return 116 * f - 16


def test_palette_orders_by_lightness():
    """Classes must stay apart without hue (colour-vision deficiencies, grey print): L* falls
    by at least 10 from each class to the next (threshold: common practice, no source)."""
    lightness = [_cie_lightness(c) for c in rp.COMFORT_PALETTE]
    assert len(lightness) == 5
    assert all(a - b >= 10.0 for a, b in zip(lightness, lightness[1:])), lightness
    # spot check of the formula: sRGB white and black give L* 100 and 0 (CIE 15:2004)
    assert _cie_lightness("#ffffff") == pytest.approx(100.0, abs=1e-9)
    assert _cie_lightness("#000000") == pytest.approx(0.0, abs=1e-9)
