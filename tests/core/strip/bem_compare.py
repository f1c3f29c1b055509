# SPDX-License-Identifier: GPL-2.0-or-later
"""Shared helpers for the strip-theory vs capytaine (BEM) comparison (not a test module).

Long-crested JONSWAP in the DNV-RP-C205 (2010, sect. 3.5.5) form, gamma 3.3, written out here
on purpose (a tiny local integration independent of the product's spectra module):
    S(w) = A_g (5/16) Hs^2 wp^4 w^-5 exp(-5/4 (w/wp)^-4) gamma^exp(-(w-wp)^2/(2 s^2 wp^2)),
    A_g = 1 - 0.287 ln(gamma), s = 0.07 (w <= wp) / 0.09 (w > wp).
RMS = sqrt(trapezoid of |H|^2 S over the BEM table's frequencies 0.30-2.00 rad/s) for both
codes on the same grid (zero speed: encounter = wave frequency).
"""
from __future__ import annotations

import re
from functools import lru_cache
from pathlib import Path

import numpy as np

from seaway_comfort.processing.core.motions.strip import equations, sections

BEM_DIR = Path(__file__).resolve().parents[2] / "reference" / "bem"
GM_T_M = {"box": 1.5, "wigley": 0.5, "fuller": 1.2}
G = 9.81
RHO = 1025.0
TP_S = (5.0, 6.0, 7.0, 8.0, 10.0, 12.0, 14.0)


def jonswap(omega: np.ndarray, hs: float, tp: float, gamma: float = 3.3) -> np.ndarray:
    wp = 2 * np.pi / tp
    sig = np.where(omega <= wp, 0.07, 0.09)
    pm = 5 / 16 * hs ** 2 * wp ** 4 * omega ** -5 * np.exp(-1.25 * (omega / wp) ** -4)
    return (1 - 0.287 * np.log(gamma)) * pm * gamma ** np.exp(-((omega - wp) ** 2)
                                                             / (2 * sig ** 2 * wp ** 2))


def trapz(y: np.ndarray, x: np.ndarray) -> float:
    return float(np.sum(0.5 * (y[1:] + y[:-1]) * np.diff(x)))


def read_bem(hull: str) -> tuple[dict, float]:
    path = BEM_DIR / f"{hull}_rao.csv"
    text = path.read_text(encoding="utf-8")
    b44 = float(re.search(r"b44_add_n_m_s = ([0-9.e+-]+)", text).group(1))
    lines = [ln for ln in text.splitlines() if ln and not ln.startswith("#")]
    names = lines[0].split(",")
    data = np.array([[float(v) for v in ln.split(",")] for ln in lines[1:]])
    cols = {n: data[:, i] for i, n in enumerate(names)}
    return cols, b44


@lru_cache(maxsize=None)
def strip_model(hull: str):
    sec = sections.read_sections_csv(BEM_DIR / f"{hull}_sections.csv")
    model = equations.prepare_hull(sec, RHO, G)
    body = equations.rigid_body(model, equations.MassProperties(gm_t_m=GM_T_M[hull]))
    return model, body


@lru_cache(maxsize=None)
def responses(hull: str, mu: float) -> dict:
    """Complex transfer functions of the compared quantities, BEM and strip, on BEM omegas."""
    cols, b44 = read_bem(hull)
    model, body = strip_model(hull)
    sel = cols["mu_deg"] == mu
    w = cols["omega_rad_s"][sel]
    r = equations.strip_raos(model, body, w, w ** 2 / G, [mu], 0.0, b44)
    code = {"heave": r.heave_m_m[:, 0], "pitch": r.pitch_rad_m[:, 0], "roll": r.roll_rad_m[:, 0],
            "sway": r.sway_m_m[:, 0], "yaw": r.yaw_rad_m[:, 0]}
    bem = {q: cols[q + "_re"][sel] + 1j * cols[q + "_im"][sel] for q in code}
    x_bow = 0.4 * model.length_m
    out = {"omega": w}
    for name, tf in (("bem", bem), ("code", code)):
        # vertical at the bow on the centre line: heave_G - (x - x_G) pitch
        bow = tf["heave"] - (x_bow - body.x_g_m) * tf["pitch"]
        # lateral specific force at the waterline on the centre line (x_G, 0, 0):
        # -w^2 (sway_G - (0 - z_G) roll) + g roll  (ship axes, y to port)
        lat = -w ** 2 * (tf["sway"] + body.z_g_m * tf["roll"]) + G * tf["roll"]
        out[name] = dict(tf, bow_acc=w ** 2 * bow, lat_acc=lat)
    return out


def rms_ratio(hull: str, mu: float, quantity: str, tp: float) -> float:
    res = responses(hull, mu)
    s = jonswap(res["omega"], 1.0, tp)
    rms = {k: np.sqrt(trapz(np.abs(res[k][quantity]) ** 2 * s, res["omega"]))
           for k in ("bem", "code")}
    return rms["code"] / rms["bem"]


CASES = [  # (quantity, heading, band) from the requirement (issue 13)
    ("heave", 180.0, (0.80, 1.25)), ("pitch", 180.0, (0.80, 1.25)),
    ("bow_acc", 180.0, (0.80, 1.25)), ("heave", 90.0, (0.70, 1.40)),
    ("lat_acc", 90.0, (0.70, 1.40)), ("roll", 90.0, (0.67, 1.50)),
]


def ratio_table() -> str:
    lines = ["hull    quantity  mu   " + " ".join(f"Tp{tp:>4.0f}" for tp in TP_S)]
    for hull in GM_T_M:
        for q, mu, _ in CASES:
            vals = " ".join(f"{rms_ratio(hull, mu, q, tp):6.3f}" for tp in TP_S)
            lines.append(f"{hull:7s} {q:9s} {mu:4.0f} {vals}")
    return "\n".join(lines)


if __name__ == "__main__":
    print(ratio_table())


KNOWN_MISSES = {
    ("box", "pitch", 180.0, 5.0), ("box", "bow_acc", 180.0, 5.0),
    ("box", "bow_acc", 180.0, 6.0), ("box", "roll", 90.0, 5.0), ("box", "roll", 90.0, 6.0),
    ("fuller", "roll", 90.0, 5.0), ("fuller", "roll", 90.0, 6.0),
}
"""(hull, quantity, heading, Tp) measured outside the goal band (strict xfail: a fix shows up)."""


def goal_band_params() -> list:
    """pytest params (hull, quantity, mu, band, tp) of every compared case, misses marked xfail."""
    import pytest

    out = []
    for hull in GM_T_M:
        for q, mu, band in CASES:
            for tp in TP_S:
                marks = ([pytest.mark.xfail(strict=True, reason="measured outside the goal band")]
                         if (hull, q, mu, tp) in KNOWN_MISSES else [])
                out.append(pytest.param(hull, q, mu, band, tp, marks=marks, id=f"{hull}-{q}-mu{mu:.0f}-Tp{tp:.0f}"))
    return out
