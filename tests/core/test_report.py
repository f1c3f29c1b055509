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
    assert "no result" in body
    assert "OFFTIME" in body and "OUTRUN" in body


def test_hours_per_class_add_up():
    r = _result()
    h = r.hours_per_class()
    assert sum(h.values()) == pytest.approx(r.dwell_s.sum() / 3600.0)
    assert h["not computed"] == pytest.approx((1800 + 900) / 3600.0)


class SvgCollector(HTMLParser):
    """The <svg> figures of a page: per figure its aria-label and every element's attributes."""

    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.figs: list = []
        self.verdict: list = []
        self._in_verdict = 0
        self._text: list = []

    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        if tag == "svg":
            self.figs.append({"label": a.get("aria-label", ""), "attrs": a, "elements": [], "text": []})
        elif self.figs and not self.figs[-1].get("closed"):
            self.figs[-1]["elements"].append((tag, a))
        if tag == "section" and a.get("id") == "verdict":
            self._in_verdict = 1

    def handle_endtag(self, tag):
        if tag == "svg":
            self.figs[-1]["closed"] = True
        if tag == "section":
            self._in_verdict = 0

    def handle_data(self, data):
        if self.figs and not self.figs[-1].get("closed"):
            self.figs[-1]["text"].append(data)
        if self._in_verdict:
            self.verdict.append(data)


def _svgs(text: str) -> SvgCollector:
    c = SvgCollector()
    c.feed(text)
    c.close()
    return c


def _fig(c: SvgCollector, start: str) -> dict:
    hits = [f for f in c.figs if f["label"].startswith(start)]
    assert len(hits) == 1, [f["label"] for f in c.figs]
    return hits[0]


def test_verdict_comes_first_and_names_worst_class_place_and_measure():
    text = rp.render_html(_report())
    c = _svgs(text)
    verdict = " ".join(c.verdict)
    assert text.index('id="verdict"') < text.index("<h2>")  # the verdict opens the page
    # sample 3 of the hand-made leg: class 4 (punishing) at 07:30 UTC, 13.5 NM; its MSI (4 %) alone
    # would give class 1 (steady, 2 <= MSI < 5 %), so the station's criteria set the class
    assert "Within the station's seakeeping criteria. Worst class: punishing." in verdict
    assert "2031-03-11 07:30 UTC, 13.5 NM along the leg" in verdict
    assert "Ruling measure: the station's seakeeping criteria" in verdict and "would rate it steady" in verdict
    assert "2 of 6 samples have no result" in verdict


def test_verdict_when_a_criterion_is_exceeded():
    r = _result()
    flags = r.flags.copy()
    flags[3] |= int(SampleFlag.CRITERIA_EXCEEDED)
    r = PassageResult(**{**r.__dict__, "flags": flags})
    rep = rp.build_report([("leg one", r)], rp.ReportInputs(created_utc="x"))
    c = _svgs(rp.render_html(rep))
    # sample 3 stands for 1800 s (dwell_s) = 0.5 h
    assert " ".join(c.verdict).startswith("Not within the station's seakeeping criteria: exceeded for 0.5 h.")


def _fills(fig: dict, attr: str) -> set:
    return {a[attr] for tag, a in fig["elements"] if tag == "path" and a.get(attr, "none") not in ("none",)}


def test_map_and_timeline_are_svg_coloured_by_class():
    from seaway_comfort.processing.core.reports.palette import COMFORT_PALETTE as P, NOT_COMPUTED_COLOUR as G

    text = rp.render_html(_report())
    c = _svgs(text)
    assert "<img" not in text and "data:image" not in text  # no raster images, nothing to fetch
    m = _fig(c, "Map of the route")
    assert m["attrs"]["viewbox"].startswith("0 0 ")
    # classes per sample 0,1,2,4,-,-: segments take the worse end: steady, lively, punishing,
    # punishing, none -> one path per colour, plus the dark casing and the grid
    route_strokes = {a["stroke"] for tag, a in m["elements"] if tag == "path" and a.get("stroke-width") == "4"}
    assert route_strokes == {P[1], P[2], P[4], G}
    assert "start" in m["text"] and "end" in m["text"] and any(t.endswith(" NM (at -24.8° latitude)") for t in m["text"])
    strip = _fig(c, "Comfort class over time")
    assert _fills(strip, "fill") == {P[0], P[1], P[2], P[4], G}
    assert "11 Mar 06:00" in strip["text"] and "07:00" in strip["text"] and "time (UTC)" in strip["text"]


def test_time_axes_are_clock_time_with_units_and_complete_legends():
    text = rp.render_html(_report())
    body = "".join(_parse(text).text)
    assert "hours since" not in body and "hours after" not in body
    for unit in ("significant wave height Hs [m]", "MSI (2 h) [%]", "RMS acceleration [m/s²]"):
        assert unit in body
    for label in ("smooth", "steady", "lively", "taxing", "punishing", "no result (no sea data)"):
        assert f"</span>{label}</span>" in text  # class legend: a swatch then the label
    assert "vertical acceleration" in body and "lateral acceleration" in body


def test_local_offset_is_stated_when_known():
    inputs = rp.ReportInputs(created_utc="x", local_utc_offset_h=2.0)
    text = rp.render_html(rp.build_report([("a", _result())], inputs))
    assert "time (UTC; local time = UTC+02:00)" in text
    assert "2031-03-11 07:30 UTC (09:30 local)" in text


def test_no_internal_terms_reach_the_page():
    r = _result()
    r = PassageResult(**{**r.__dict__, "method": "exact",
                         "notes": ("the cumulative dose (msdv_cum) leaves out 2 sample intervals",)})
    inputs = rp.ReportInputs(created_utc="x", method="exact", extra=(("Mode with several sources", "first_valid"),))
    text = rp.render_html(rp.build_report([("a", r)], inputs))
    body = "".join(_parse(text).text)
    for term in ("first_valid", "msdv_cum", "wait_censored", "departures_past_end", ">exact<"):
        assert term not in body and term not in text, term
    assert "first source with data at each sample" in body
    assert "spectral integration at every sample" in body
    assert "the cumulative dose leaves out 2 sample intervals" in body


def test_report_never_imports_matplotlib(tmp_path):
    """Building and writing a report leaves matplotlib unimported (fresh interpreter)."""
    import subprocess
    from pathlib import Path

    import seaway_comfort

    code = (
        "import sys\n"
        "sys.path.insert(0, %r)\n"
        "import numpy as np\n"
        "from seaway_comfort.processing.core.reports import passage as rp\n"
        "from seaway_comfort.processing.core.reports import sweep, climate\n"
        "import test_report as t\n"
        "rp.write_html(%r, t._report())\n"
        "print('matplotlib' in sys.modules)\n"
    ) % (str(Path(__file__).parent), str(tmp_path / "r.html"))
    env = {"PYTHONPATH": str(Path(seaway_comfort.__file__).resolve().parent.parent
                             if False else Path(seaway_comfort.__path__[0]).parent), "PATH": "/usr/bin:/bin"}
    out = subprocess.run([sys.executable, "-P", "-c", code], capture_output=True, text=True, env=env, timeout=120)
    assert out.returncode == 0, out.stderr[-2000:]
    assert out.stdout.strip() == "False"
    assert (tmp_path / "r.html").stat().st_size > 1000


def _many_legs(n_legs: int = 2000) -> list:
    """A route layer of many short features, built cheaply: each leg three samples 20 min apart,
    consecutive in time and space, classes cycling so that a few legs are much worse."""
    base = _result(3)
    t0 = np.datetime64("2031-03-11T06:00", "ms")
    legs = []
    for k in range(n_legs):
        cls = np.array([k % 3, (k * 7) % 4, 4 if k % 97 == 0 else 1], dtype=np.int64)
        eta = t0 + np.timedelta64(k * 60, "m") + (np.arange(3) * 20 * 60 * 1000).astype("timedelta64[ms]")
        labels = ("smooth", "steady", "lively", "taxing", "punishing")
        legs.append((f"feature {k}", PassageResult(**{
            **base.__dict__, "leg": np.full(3, k), "eta_utc": eta, "comfort_class": cls,
            "comfort_label": tuple(labels[c] for c in cls), "computed": np.ones(3, bool),
            "msi_pct": np.array([1.0, 3.0, 10.0 + k % 97]), "flags": np.zeros(3, dtype=np.int64),
            "hs_m": np.full(3, 1.0 + (k % 50) / 25), "vacc_rms_m_s2": np.full(3, 0.3),
            "lon_deg": -21 + k * 0.002 + np.arange(3) * 0.0007, "lat_deg": np.full(3, -24.5) + k * 0.001,
            "source": ("m",) * 3, "notes": ("no bathymetry given: deep water assumed everywhere",)})))
    return legs


def test_report_of_2000_short_legs_is_bounded():
    """Issue: 2,000 short features wrote a 121 MB report. Bounded: < 10 MB, the worst legs in
    full, the others aggregated, every figure present once (time is measured in tests/bench)."""
    legs = _many_legs(2000)
    rep = rp.build_report(legs, rp.ReportInputs(created_utc="x"))
    text = rp.render_html(rep)
    assert len(text.encode("utf-8")) < 10_000_000
    assert text.count("<h3>Leg ") == rp.LEGS_IN_FULL
    assert f"The {rp.LEGS_IN_FULL} worst of 2000 legs in full" in text
    assert f"the {rp.OVERVIEW_MAX_ROWS} worst (by worst class, then highest MSI) are listed" in text
    # the worst leg (punishing, MSI 106 % is impossible: legs k % 97 == 0 give MSI 10 %, class 4)
    c = _svgs(text)
    assert "Worst class: punishing." in " ".join(c.verdict)
    assert len(c.figs) == 5  # map, class timeline, Hs, MSI, accelerations
    for f in c.figs:
        paths = [e for e in f["elements"] if e[0] == "path"]
        assert len(paths) < 40, f["label"]  # one path per colour, not per leg
    # thinned lines still draw segments (legs are separated by gaps narrower than a pixel)
    for start in ("Significant wave height", "Motion sickness incidence", "Vertical (solid)"):
        f = _fig(c, start)
        drawn = [a for t, a in f["elements"] if t == "path" and a.get("stroke-width") == "1.6"]
        assert drawn and all(a["d"].count("L") >= 500 and a["d"].count("M") < 20 for a in drawn), start
    # the note shared by all legs is listed once, with its count
    assert text.count("no bathymetry given") == 1 and "(2000 legs)" in text
    # hour by hour: 2000 legs one hour apart = 2000 h: 12 h bins, at most 240 rows
    i = text.index("<h2>Every 12 hours</h2>")
    assert text[i:text.index("</table>", i)].count("<tr>") - 1 <= 240


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
