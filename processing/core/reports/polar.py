# SPDX-License-Identifier: GPL-2.0-or-later
"""The speed x heading report: a polar diagram drawn as inline SVG, and the table behind it.

Drawing (our own style): course true around the circle (000 at the top, clockwise), speed
outward (one ring per speed, the innermost for the lowest speed), each cell filled with the
colour of its comfort class (:mod:`.palette`). IMO MSC.1/Circ.1228 guidance is drawn over the
cells: a hatch per phenomenon (SURFRISK 4.2.1, WAVEGROUPS 4.2.2, ROLLSYNC 4.2.3.1, ROLLPARAM
4.2.3.2) and a heavy outline where any flag is graded danger; the analytic surf-riding
boundary V = 1.8 sqrt(L) / cos(180 - alpha) (4.2.1, constant from memory) of every wave system
that can drive it is a dashed line. The current course and speed, when given, is a ringed dot.
No script and no external resource; every outside text is escaped.
"""
from __future__ import annotations

import math
from typing import List, Sequence, Tuple

import numpy as np

from ..comfort.guidance import ADVISORY_HS_PER_L, CLAUSES, surf_riding_speed_limit_kn
from ..comfort.indices import COMFORT_CLASS_LABELS
from ..flags import DANGER_FLAGS, FLAG_CODES, SampleFlag, flag_codes
from ..passage.polar import SpeedHeadingResult
from .html import esc, fmt_num, fmt_time_utc, page, swatch, table
from .palette import comfort_colour

__all__ = ["polar_svg", "render_speed_heading_html"]

SIZE = 520
R_OUT = 220.0
R_IN = 24.0
_HATCH = {  # phenomenon -> (pattern id, path drawn in an 8 x 8 tile)
    SampleFlag.SURF_RIDING: ("h-surf", "M0,8 L8,0"),
    SampleFlag.HIGH_WAVE_GROUPS: ("h-groups", "M0,0 L8,8"),
    SampleFlag.SYNC_ROLL: ("h-sync", "M0,4 L8,4"),
    SampleFlag.PARAMETRIC_ROLL: ("h-param", "M4,0 L4,8"),
}


def _xy(course_deg: float, r: float) -> Tuple[float, float]:
    a = math.radians(course_deg)
    return SIZE / 2 + r * math.sin(a), SIZE / 2 - r * math.cos(a)


def _radius(res: SpeedHeadingResult, i_speed: float) -> float:
    return R_IN + (R_OUT - R_IN) * i_speed / max(len(res.speeds_kn), 1)


def _cell(c0: float, c1: float, r0: float, r1: float) -> str:
    (x0, y0), (x1, y1), (x2, y2), (x3, y3) = _xy(c0, r0), _xy(c1, r0), _xy(c1, r1), _xy(c0, r1)
    return (f"M{x0:.1f},{y0:.1f} A{r0:.1f},{r0:.1f} 0 0 1 {x1:.1f},{y1:.1f} L{x2:.1f},{y2:.1f} "
            f"A{r1:.1f},{r1:.1f} 0 0 0 {x3:.1f},{y3:.1f} Z")


def _cells(res: SpeedHeadingResult) -> List[str]:
    step = 360.0 / res.courses.size
    out = []
    for k in range(res.n):
        s, c = divmod(k, res.courses.size)
        d = _cell(res.courses[c] - step / 2, res.courses[c] + step / 2, _radius(res, s), _radius(res, s + 1))
        tip = f"{res.speed_kn[k]:g} kn, {res.course_deg[k]:03.0f} deg: " + (res.class_reason[k] or "no result")
        out.append(f'<path d="{d}" fill="{comfort_colour(int(res.comfort_class[k]))}" stroke="#ffffff" '
                   f'stroke-width="0.6"><title>{esc(tip)}</title></path>')
        for flag, (pid, _) in _HATCH.items():
            if res.flags[k] & int(flag):
                out.append(f'<path d="{d}" fill="url(#{pid})" stroke="none"/>')
        if res.flags[k] & int(DANGER_FLAGS):
            out.append(f'<path d="{d}" fill="none" stroke="#1b1b1b" stroke-width="2.2"/>')
    return out


def _surf_boundaries(res: SpeedHeadingResult) -> List[str]:
    """Dashed surf-riding boundary (4.2.1) of every wave system with Hs >= 0.02 L."""
    sea = res.sea
    systems = list(zip(sea.partition_hs_m[0], sea.partition_from_deg[0])) if sea.partition_hs_m.size else []
    if not systems and np.isfinite(sea.hs_m[0]):
        systems = [(sea.hs_m[0], sea.wave_from_deg[0])]
    sp = np.asarray(res.speeds_kn)
    out = []
    for hs, wf in systems:
        if not (np.isfinite(hs) and hs >= ADVISORY_HS_PER_L * res.length_m and np.isfinite(wf)):
            continue
        crs = np.linspace(0.0, 360.0, 721)
        lim = surf_riding_speed_limit_kn(res.length_m, np.mod(wf - crs, 360.0))
        ok = np.isfinite(lim) & (lim <= sp.max())
        pts = [_xy(c, _radius(res, float(np.interp(v, sp, np.arange(sp.size))) + 0.5)) for c, v in zip(crs[ok], lim[ok])]
        if len(pts) > 1:
            out.append('<polyline fill="none" stroke="#0b3c5d" stroke-width="1.6" stroke-dasharray="5 3" points="'
                       + " ".join(f"{x:.1f},{y:.1f}" for x, y in pts) + '"/>')
    return out


def _axes(res: SpeedHeadingResult) -> List[str]:
    out = []
    for s, v in enumerate(res.speeds_kn):
        r = (_radius(res, s) + _radius(res, s + 1)) / 2
        out.append(f'<text x="{SIZE / 2 + 3:.1f}" y="{SIZE / 2 - r + 3:.1f}" font-size="9" fill="#333">{v:g} kn</text>')
    for c in range(0, 360, 30):
        x, y = _xy(c, R_OUT + 14)
        out.append(f'<text x="{x:.1f}" y="{y + 4:.1f}" font-size="11" text-anchor="middle">{c:03d}</text>')
    return out


def _current(res: SpeedHeadingResult) -> List[str]:
    if res.current_course_deg is None or res.current_speed_kn is None:
        return []
    sp = np.asarray(res.speeds_kn)
    r = _radius(res, float(np.interp(res.current_speed_kn, sp, np.arange(sp.size))) + 0.5)
    x, y = _xy(float(res.current_course_deg), r)
    return [f'<circle cx="{x:.1f}" cy="{y:.1f}" r="7" fill="none" stroke="#000" stroke-width="2"/>',
            f'<circle cx="{x:.1f}" cy="{y:.1f}" r="2.5" fill="#000"><title>current course and speed</title></circle>']


def polar_svg(res: SpeedHeadingResult) -> str:
    """The diagram as one inline ``<svg>`` element (module docstring)."""
    defs = "".join(f'<pattern id="{pid}" width="8" height="8" patternUnits="userSpaceOnUse">'
                   f'<path d="{d}" stroke="#1b1b1b" stroke-width="0.9"/></pattern>' for pid, d in _HATCH.values())
    body = [*_cells(res), *_surf_boundaries(res), *_axes(res), *_current(res)]
    return (f'<svg xmlns="http://www.w3.org/2000/svg" width="{SIZE}" height="{SIZE}" viewBox="0 0 {SIZE} {SIZE}" '
            f'role="img" aria-label="speed and course diagram"><defs>{defs}</defs>' + "".join(body) + "</svg>")


def _legend(res: SpeedHeadingResult) -> str:
    rows = [(swatch(comfort_colour(c)), lab) for c, lab in enumerate(COMFORT_CLASS_LABELS)]
    rows.append((swatch(comfort_colour(-1)), "no result"))
    guide = [(FLAG_CODES[f], f"hatched {pid[2:]}; {CLAUSES[f]}") for f, (pid, _) in _HATCH.items()]
    guide.append(("heavy outline", "a guidance flag graded danger (a hard limit)"))
    guide.append(("dashed line", "surf-riding boundary 1.8 sqrt(L)/cos(180 - alpha) kn, IMO MSC.1/Circ.1228 4.2.1"))
    return table(("", "Comfort class"), rows, raw_cols=(0,)) + table(("Mark", "Meaning"), guide)


def _rows(res: SpeedHeadingResult) -> Sequence[Sequence[str]]:
    return [(f"{res.speed_kn[k]:g}", f"{res.course_deg[k]:03.0f}", fmt_num(res.rel_heading_deg[k], 0),
             fmt_num(res.enc_period_s[k], 1), fmt_num(res.msi_pct[k], 1), fmt_num(res.roll_rms_deg[k], 1),
             fmt_num(res.vacc_rms_m_s2[k]), fmt_num(res.lacc_rms_m_s2[k]),
             COMFORT_CLASS_LABELS[res.comfort_class[k]] if res.comfort_class[k] >= 0 else "no result",
             res.class_reason[k], flag_codes(res.flags[k])) for k in range(res.n)]


def render_speed_heading_html(res: SpeedHeadingResult, title: str = "Speed and course at one place and time") -> str:
    """The whole page: facts, the diagram with its legend, and the table."""
    sea = res.sea
    facts = [("Position", f"{res.lat_deg:.4f} N, {res.lon_deg:.4f} E (WGS84)"), ("Time", fmt_time_utc(res.time_utc)),
             ("Sea", f"Hs {fmt_num(sea.hs_m[0])} m, Tp {fmt_num(sea.tp_s[0], 1)} s, from {fmt_num(sea.wave_from_deg[0], 0)} deg"
              + (f" ({flag_codes(sea.flags[0])})" if sea.flags[0] else "")),
             ("Vessel / station", f"{res.vessel_name} / {res.station_name}"),
             ("Length, natural roll period", f"{res.length_m:g} m, {res.roll_period_s:.1f} s"),
             ("MSI", "share who would vomit after 2 h (2 h exposure) at this sea state")]
    if res.current_course_deg is not None and res.current_speed_kn is not None:
        facts.append(("Current course and speed", f"{res.current_course_deg:03.0f} deg, {res.current_speed_kn:g} kn"))
    body = [table(("Item", "Value"), facts), f"<p>{polar_svg(res)}</p>", _legend(res),
            "<h2>Every speed and course</h2>",
            table(("kn", "course", "rel. hdg", "Te s", "MSI % (2 h)", "roll deg", "v.acc m/s2", "l.acc m/s2",
                   "class", "class set by", "flags"), _rows(res))]
    return page(title, body, res.caution)
