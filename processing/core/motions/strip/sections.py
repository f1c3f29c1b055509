# SPDX-License-Identifier: GPL-2.0-or-later
"""Hull sections for strip theory: the data, their checks, generation from main dimensions and
form coefficients, and reading a user CSV table.

A section at station x_m (positive forward from midship) is described by its waterline beam
beam_m, draught draught_m and immersed area area_m2; the 2-D hydrodynamics use the Lewis form
with the same three numbers (``lewis.py``).

Generation from main dimensions (common-practice construction, no source; a power-law
sectional-area curve and waterline of the kind used in preliminary design sketches):

    xi = 2 x / L in [-1, 1]
    A(x) = Cm B T (1 - |xi|^n),  n = Cp / (1 - Cp),  Cp = Cb / Cm      (mean of 1 - |xi|^n is Cp)
    b(x) = B (1 - |xi|^m),       m = Cwp / (1 - Cwp)                     (mean is Cwp)
    d(x) = T                                                              (level keel)

so that the integrated volume is Cb L B T and the waterplane area Cwp L B exactly (up to the
trapezoid rule on the stations). The curve is symmetric fore and aft (LCB = LCF = 0); the area
coefficient of each section A / (b d) = Cm (1 - |xi|^n) / (1 - |xi|^m) is clipped to the Lewis
range in ``lewis.py``.
"""
from __future__ import annotations

import csv
import math
from dataclasses import dataclass
from pathlib import Path
from typing import Union

import numpy as np
from numpy.typing import ArrayLike, NDArray

from . import StripInputError

MIN_ROWS = 11
CSV_COLUMNS = ("x_m", "beam_m", "draught_m", "area_m2")


@dataclass(frozen=True)
class HullSections:
    """Sections along the hull, rows sorted by ``x_m`` (m, + forward from midship)."""

    x_m: NDArray[np.float64]
    beam_m: NDArray[np.float64]
    draught_m: NDArray[np.float64]
    area_m2: NDArray[np.float64]

    @property
    def length_m(self) -> float:
        """Distance between the aft-most and fore-most stations [m]."""
        return float(self.x_m[-1] - self.x_m[0])

    def integration_weights_m(self) -> NDArray[np.float64]:
        """Trapezoid weights w_i [m] so that sum_i w_i f(x_i) ~ integral of f over the hull."""
        dx = np.diff(self.x_m)
        w = np.zeros_like(self.x_m)
        w[:-1] += dx / 2
        w[1:] += dx / 2
        return w


def make_sections(x_m: ArrayLike, beam_m: ArrayLike, draught_m: ArrayLike, area_m2: ArrayLike,
                  *, where: str = "sections") -> HullSections:
    """Checked ``HullSections``; errors name ``where`` (a file name) and the row (1-based)."""
    cols = []
    for name, value in zip(CSV_COLUMNS, (x_m, beam_m, draught_m, area_m2)):
        arr = np.asarray(value, dtype=float)
        if arr.ndim != 1:
            raise StripInputError(f"{where}: {name} must be a 1-D sequence, got shape {arr.shape}")
        cols.append(arr)
    n = cols[0].size
    if any(c.size != n for c in cols):
        raise StripInputError(f"{where}: columns differ in length {[c.size for c in cols]}")
    if n < MIN_ROWS:
        raise StripInputError(f"{where}: {n} sections, at least {MIN_ROWS} are needed "
                              "(add stations along the hull)")
    for name, arr in zip(CSV_COLUMNS, cols):
        bad = np.flatnonzero(~np.isfinite(arr))
        if bad.size:
            raise StripInputError(f"{where}: row {bad[0] + 1}: {name} is not a finite number")
    x, b, d, a = cols
    _check_rows(x, b, d, a, where)
    return HullSections(x, b, d, a)


def _check_rows(x: NDArray, b: NDArray, d: NDArray, a: NDArray, where: str) -> None:
    steps = np.flatnonzero(np.diff(x) <= 0)
    if steps.size:
        i = steps[0] + 1
        raise StripInputError(f"{where}: row {i + 1}: x_m = {x[i]:g} is not greater than the "
                              f"previous row's {x[i - 1]:g}; sort the rows by x_m, no repeats")
    for name, arr in (("beam_m", b), ("draught_m", d), ("area_m2", a)):
        neg = np.flatnonzero(arr < 0)
        if neg.size:
            raise StripInputError(f"{where}: row {neg[0] + 1}: {name} = {arr[neg[0]]:g} is "
                                  "negative; give sizes >= 0")
    over = np.flatnonzero(a > b * d * (1 + 1e-9))
    if over.size:
        i = over[0]
        raise StripInputError(f"{where}: row {i + 1}: area_m2 = {a[i]:g} exceeds beam_m * "
                              f"draught_m = {b[i] * d[i]:g}; a section fits inside its box")
    lone = np.flatnonzero((a > 0) & ((b <= 0) | (d <= 0)))
    if lone.size:
        raise StripInputError(f"{where}: row {lone[0] + 1}: area_m2 > 0 with zero beam or draught")
    if not np.any(a > 0):
        raise StripInputError(f"{where}: every section has zero area")


def sections_from_form(length_m: float, beam_m: float, draught_m: float, block_coeff: float,
                       waterplane_coeff: float, midship_coeff: float = 0.98,
                       n_stations: int = 41) -> HullSections:
    """Sections from main dimensions and form coefficients (power-law curves, module docstring).

    length_m is the length the curves span (use Lwl, or Lpp when Lwl is unknown).
    Conditions: 0 < Cb <= Cm <= 1, Cb < Cwp < 1 (m > n keeps the area coefficient bounded).
    """
    for name, v in (("length_m", length_m), ("beam_m", beam_m), ("draught_m", draught_m)):
        if not (math.isfinite(v) and v > 0):
            raise StripInputError(f"{name} = {v!r}: give a positive size in metres")
    for name, v in (("block_coeff", block_coeff), ("waterplane_coeff", waterplane_coeff),
                    ("midship_coeff", midship_coeff)):
        if not (math.isfinite(v) and 0 < v <= 1):
            raise StripInputError(f"{name} = {v!r}: a form coefficient lies in (0, 1]")
    if block_coeff > midship_coeff:
        raise StripInputError(f"block_coeff = {block_coeff} exceeds midship_coeff = "
                              f"{midship_coeff}: the prismatic coefficient Cb/Cm must be <= 1")
    if not block_coeff < waterplane_coeff < 1:
        raise StripInputError(f"waterplane_coeff = {waterplane_coeff}: expected between "
                              f"block_coeff = {block_coeff} and 1")
    if n_stations < MIN_ROWS:
        raise StripInputError(f"n_stations = {n_stations}: at least {MIN_ROWS}")
    cp = min(block_coeff / midship_coeff, 0.999)
    n_exp = cp / (1 - cp)
    m_exp = waterplane_coeff / (1 - waterplane_coeff)
    x = np.linspace(-length_m / 2, length_m / 2, n_stations)
    xi = np.abs(2 * x / length_m)
    area = midship_coeff * beam_m * draught_m * (1 - xi ** n_exp)
    beam = beam_m * (1 - xi ** m_exp)
    draught = np.where(beam > 0, draught_m, 0.0)
    area = np.minimum(area, beam * draught)
    return make_sections(x, beam, draught, area, where="sections_from_form")


def read_sections_csv(path: Union[str, Path]) -> HullSections:
    """Read a sections table: header ``x_m,beam_m,draught_m,area_m2``, lines starting with ``#``
    are comments. Errors name the file and the (1-based) line, never other file content."""
    p = Path(path)
    label = p.name
    try:
        text = p.read_text(encoding="utf-8-sig")
    except OSError as exc:
        raise StripInputError(f"hull sections file {label}: cannot be read ({exc.strerror})") \
            from None
    except UnicodeDecodeError:
        raise StripInputError(f"hull sections file {label}: not UTF-8 text") from None
    rows = [(i + 1, line) for i, line in enumerate(text.splitlines())
            if line.strip() and not line.lstrip().startswith("#")]
    if not rows:
        raise StripInputError(f"hull sections file {label}: no header line found")
    head_no, head = rows[0]
    names = [c.strip().lower() for c in next(csv.reader([head]))]
    missing = [c for c in CSV_COLUMNS if c not in names]
    if missing:
        raise StripInputError(f"hull sections file {label}: line {head_no}: missing column(s) "
                              f"{', '.join(missing)}; expected {', '.join(CSV_COLUMNS)}")
    idx = [names.index(c) for c in CSV_COLUMNS]
    values = np.empty((len(rows) - 1, 4))
    for r, (line_no, line) in enumerate(rows[1:]):
        cells = next(csv.reader([line]))
        for j, (col, k) in enumerate(zip(CSV_COLUMNS, idx)):
            cell = cells[k].strip() if k < len(cells) else ""
            try:
                values[r, j] = float(cell)
            except ValueError:
                shown = cell if len(cell) <= 20 else cell[:20] + "..."
                raise StripInputError(f"hull sections file {label}: line {line_no}: {col} "
                                      f"{shown!r} is not a number") from None
    return make_sections(*values.T, where=f"hull sections file {label} (data row)")
