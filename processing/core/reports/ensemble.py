# SPDX-License-Identifier: GPL-2.0-or-later
"""The ensemble section of a passage report: the MSI spread along the route as a band, and the
probability of each comfort class per leg (:class:`..passage.ensemble.EnsemblePassage`).

A small self-contained helper: :func:`ensemble_section` returns HTML markup to insert into a
page built with :mod:`.html`; it draws with the same toolkit and shows every number as a table
too (figures are optional, tables are not).
"""
from __future__ import annotations

from typing import Optional, Sequence

import numpy as np

from ..comfort.indices import COMFORT_CLASS_LABELS
from .html import figure_png, fmt_num, new_figure, png_img, table

__all__ = ["ensemble_band_png", "ensemble_section"]


def ensemble_band_png(legs: Sequence[object], leg_names: Sequence[str]) -> Optional[bytes]:
    """MSI p10-p90 band and p50 line against distance [NM] for every leg; None without plots."""
    fig = new_figure(8.0, 3.0)
    if fig is None:
        return None
    ax = fig.add_subplot(1, 1, 1)
    offset = 0.0
    for e, name in zip(legs, leg_names):
        d = offset + np.asarray(e.result.dist_nm, dtype=float)  # type: ignore[attr-defined]
        ax.fill_between(d, e.msi_p10_pct, e.msi_p90_pct, alpha=0.3, color="#2b5d7c",  # type: ignore[attr-defined]
                        label="MSI p10-p90" if offset == 0.0 else None)
        ax.plot(d, e.msi_p50_pct, color="#2b5d7c", lw=1.2, label="MSI p50" if offset == 0.0 else None)  # type: ignore[attr-defined]
        offset = float(d[-1]) if d.size else offset
    ax.set_xlabel("distance along the route (NM)")
    ax.set_ylabel("MSI (%), 2 h")
    ax.legend(loc="upper left", fontsize=8)
    return figure_png(fig)


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
    return "\n".join(head + [png_img(ensemble_band_png(legs, leg_names), "MSI spread along the route"),
                             table(headers, rows)])


def probability_heat_map_png(result: object) -> Optional[bytes]:
    """Speed (vertical) x departure (horizontal) coloured by the highest probability over the
    sources that the passage reaches taxing or worse [%] (a sweep's ``prob_taxing_pct``)."""
    fig = new_figure(8.0, 1.6 + 0.5 * len(result.speeds_kn))  # type: ignore[attr-defined]
    if fig is None:
        return None
    prob = np.asarray(result.prob_taxing_pct, dtype=float)  # type: ignore[attr-defined]  # (S, K, D)
    worst = np.where(np.isfinite(prob), prob, -1.0).max(axis=1)
    deps = result.departures_utc  # type: ignore[attr-defined]
    hours = (deps - deps[0]).astype("timedelta64[ms]").astype(float) / 3.6e6
    ax = fig.add_subplot(1, 1, 1)
    im = ax.imshow(np.where(worst >= 0, worst, np.nan), cmap="Reds", vmin=0.0, vmax=100.0, aspect="auto",
                   origin="lower", interpolation="nearest")
    step = max(1, hours.size // 10)
    ax.set_xticks(np.arange(0, hours.size, step))
    ax.set_xticklabels([f"{h:g}" for h in hours[::step]], fontsize=7)
    ax.set_yticks(np.arange(len(result.speeds_kn)))  # type: ignore[attr-defined]
    ax.set_yticklabels([f"{v:g} kn" for v in result.speeds_kn], fontsize=7)  # type: ignore[attr-defined]
    ax.set_xlabel(f"departure, hours after {str(deps[0])[:16]} UTC")
    fig.colorbar(im, ax=ax, label="P(taxing or worse) %")
    return figure_png(fig)


def sweep_probability_section(result: object) -> str:
    """Markup: the probability heat map and a note on how it is counted."""
    return "\n".join([
        "<h2>Probability of a taxing passage</h2>",
        "<p>Share of ensemble members whose passage reaches comfort class taxing or worse at any sample "
        "(a deterministic source counts as one member: 0 or 100 %); the highest over the sources. "
        "Blank where no member had results.</p>",
        png_img(probability_heat_map_png(result), "Probability of a taxing passage by speed and departure"),
    ])
