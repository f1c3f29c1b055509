# SPDX-License-Identifier: GPL-2.0-or-later
"""The ensemble section of a passage report: the MSI spread along the route as a band, and the
probability of each comfort class per leg (:class:`..passage.ensemble.EnsemblePassage`).

A small self-contained helper: :func:`ensemble_section` returns HTML markup to insert into a
page built with :mod:`.html`; it draws with the same toolkit and shows every number as a table
too (figures are optional, tables are not).
"""
from __future__ import annotations

from typing import Sequence

import numpy as np

from ..comfort.indices import COMFORT_CLASS_LABELS
from .html import figure, fmt_num, legend, table
from .svg import Frame, axes, band, heat_grid, line, nice_ticks, svg_doc, tick_label

__all__ = ["ensemble_band_svg", "ensemble_section", "probability_heat_map_svg", "sweep_probability_section"]

BAND_COLOUR = "#2b5d7c"


def ensemble_band_svg(legs: Sequence[object], leg_names: Sequence[str]) -> str:
    """MSI p10-p90 band and p50 line against distance [NM] along all legs (inline SVG)."""
    xs, lo, mid, hi, offset = [], [], [], [], 0.0
    for e in legs:
        d = offset + np.asarray(e.result.dist_nm, dtype=float)  # type: ignore[attr-defined]
        xs.append(np.append(d, np.nan))
        for out, key in ((lo, "msi_p10_pct"), (mid, "msi_p50_pct"), (hi, "msi_p90_pct")):
            out.append(np.append(np.asarray(getattr(e, key), dtype=float), np.nan))
        offset = float(d[-1]) if d.size else offset
    x, l, m, h = (np.concatenate(v) if v else np.zeros(0) for v in (xs, lo, mid, hi))
    top = float(np.nanmax(h)) if np.isfinite(h).any() else 1.0
    f = Frame(0.0, max(offset, 1e-9), 0.0, max(top * 1.1, 1.0), 52, 10, 560, 170)
    xt, yt = nice_ticks(f.x0, f.x1), nice_ticks(f.y0, f.y1)
    body = [axes(f, xt, [tick_label(v) for v in xt], yt, [tick_label(v) for v in yt],
                 xtitle="distance along the route (NM)", ytitle="MSI (%), 2 h"),
            band(f, x, l, h, BAND_COLOUR), line(f, x, m, BAND_COLOUR, width=1.4)]
    return svg_doc(630, 222, "MSI spread of the ensemble along the route", body)


def ensemble_section(legs: Sequence[object], leg_names: Sequence[str]) -> str:
    """Markup of the ensemble section: members, the spread band and the per-leg class table."""
    if not legs:
        return ""
    members = legs[0].member_ids  # type: ignore[attr-defined]
    head = [f"<h2>Ensemble: {len(members)} members</h2>",
            "<p>Band: 10th to 90th percentile of the members' MSI at each sample; line: the median. "
            "Table: share of members whose worst comfort class on the leg is each class.</p>"]
    rows = []
    for e, name in zip(legs, leg_names):
        p = e.class_probability_pct()  # type: ignore[attr-defined]
        tax = np.nanmax(e.prob_taxing_pct) if np.isfinite(e.prob_taxing_pct).any() else float("nan")  # type: ignore[attr-defined]
        rows.append([str(name)] + [fmt_num(v, 0) for v in p] + [fmt_num(tax, 0)])
    headers = ["leg"] + [f"{c} %" for c in COMFORT_CLASS_LABELS] + ["no result %", "max P(taxing+) at a sample %"]
    key = legend([(BAND_COLOUR, "MSI 10th to 90th percentile (band)"), (BAND_COLOUR, "MSI median (line)")])
    return "\n".join(head + [figure(ensemble_band_svg(legs, leg_names), "MSI spread along the route.", key),
                             table(headers, rows)])


def _prob_colour(p: float) -> str:
    """White (0 %) to dark red (100 %); blank (no colour) where no member had results."""
    if not np.isfinite(p) or p < 0:
        return ""
    t = min(max(p / 100.0, 0.0), 1.0)
    r, g, b = (int(round(255 + (c - 255) * t)) for c in (140, 20, 30))
    return f"#{r:02x}{g:02x}{b:02x}"


def probability_heat_map_svg(result: object) -> str:
    """Speed (rows) x departure (columns) coloured by the highest probability over the sources
    that the passage reaches taxing or worse [%] (a sweep's ``prob_taxing_pct``), inline SVG."""
    prob = np.asarray(result.prob_taxing_pct, dtype=float)  # type: ignore[attr-defined]  # (S, K, D)
    worst = np.where(np.isfinite(prob), prob, -1.0).max(axis=1)
    deps = result.departures_utc  # type: ignore[attr-defined]
    speeds = list(result.speeds_kn)  # type: ignore[attr-defined]
    n_d, n_s = worst.shape[1], worst.shape[0]
    f = Frame(0.0, float(n_d), 0.0, float(n_s), 60, 10, 540, 22.0 * n_s)
    step = max(1, n_d // 6)
    xt = np.arange(0, n_d, step) + 0.5
    xl = [str(np.datetime64(deps[int(i)], "m")).replace("T", " ")[5:] for i in xt - 0.5]
    yt = np.arange(n_s) + 0.5
    cells = [[_prob_colour(v) for v in row] for row in worst]
    body = [heat_grid(f, np.arange(n_d + 1), np.arange(n_s + 1), cells),
            axes(f, xt, xl, yt, [f"{v:g} kn" for v in speeds], xtitle="departure (UTC)")]
    return svg_doc(620, f.bottom + 40, "Probability of a taxing passage by speed and departure", body)


def sweep_probability_section(result: object) -> str:
    """Markup: the probability heat map and a note on how it is counted."""
    return "\n".join([
        "<h2>Probability of a taxing passage</h2>",
        "<p>Share of ensemble members whose passage reaches comfort class taxing or worse at any sample "
        "(a deterministic source counts as one member: 0 or 100 %); the highest over the sources. "
        "Blank where no member had results.</p>",
        figure(probability_heat_map_svg(result), "Probability of a taxing passage by speed and departure.",
               legend([(_prob_colour(0.0), "0 %"), (_prob_colour(50.0), "50 %"), (_prob_colour(100.0), "100 %")])),
    ])
