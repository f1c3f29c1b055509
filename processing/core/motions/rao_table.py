# SPDX-License-Identifier: GPL-2.0-or-later
"""User-supplied response amplitude operator (RAO) tables: CSV reader, validation, interpolation.

CSV layout (our own; ``#`` lines are comments; the first other line is the header):

* exactly one frequency column: ``period_s`` (wave period [s]), ``freq_hz`` [Hz] or
  ``omega_rad_s`` [rad/s] - ABSOLUTE wave frequency (not encounter frequency);
* ``heading_deg``: ITTC relative heading [deg] (180 head seas, 90 beam seas from port,
  0 following). Headings within 0..180 only: the hull is taken as port/starboard symmetric
  and headings are folded (mu' = 180 - |180 - mu|); then 0 and 180 must be present. Headings
  beyond 180: the full circle is given, values in [0, 360), interpolated periodically;
* ``heave_m_per_m`` [m/m], ``pitch_deg_per_m`` [deg/m], ``roll_deg_per_m`` [deg/m] (amplitudes
  per unit wave amplitude, >= 0); optional ``heave_phase_deg``, ``pitch_phase_deg``,
  ``roll_phase_deg`` (read and checked, not used: station motions use the quadrature
  assumption of :mod:`.response`).

Rows must be sorted by the frequency column (ascending as written), then by heading, with no
duplicates, and form a full rectangular grid (every frequency has the same headings).
Interpolation is bilinear (linear in omega, linear in heading on the circle). Beyond the
highest tabulated frequency the amplitudes are taken as 0 (short-wave limit); below the lowest
the first row is held. Wave variance at uncovered frequencies is reported so that
:mod:`.response` can flag OUTSIDE_VALIDITY. The table is used as given at every speed (it
should be computed for the service speed); the encounter frequency uses the actual speed.
"""
from __future__ import annotations

import csv
import math
import re
from dataclasses import dataclass
from pathlib import Path
from typing import Dict, List, Optional, Sequence, Union

import numpy as np
from numpy.typing import ArrayLike, NDArray

from .closed_form import MotionTransfer
from ..units import RAD_PER_DEG, FloatArray
from ..validation import SeawayInputError, show

__all__ = ["RaoTable", "load_rao_table", "rao_table_from_rows", "TableTransfer", "FREQ_COLUMNS", "AMPLITUDE_COLUMNS"]

FREQ_COLUMNS = ("period_s", "freq_hz", "omega_rad_s")
AMPLITUDE_COLUMNS = ("heave_m_per_m", "pitch_deg_per_m", "roll_deg_per_m")
PHASE_COLUMNS = ("heave_phase_deg", "pitch_phase_deg", "roll_phase_deg")
_ALLOWED = FREQ_COLUMNS + ("heading_deg",) + AMPLITUDE_COLUMNS + PHASE_COLUMNS


@dataclass(frozen=True)
class RaoTable:
    """Validated RAO grid. ``omega_rad_s`` (nf,) ascending; ``heading_deg`` (nh,) ascending;
    amplitude arrays (nf, nh): heave [m/m], pitch and roll [rad/m]; ``symmetric`` True when only
    0..180 deg was given; ``source`` names the file."""

    omega_rad_s: FloatArray
    heading_deg: FloatArray
    heave_m_per_m: FloatArray
    pitch_rad_per_m: FloatArray
    roll_rad_per_m: FloatArray
    symmetric: bool
    source: str = "<rows>"

    def interpolate(self, omega_rad_s: ArrayLike, rel_heading_deg: ArrayLike) -> MotionTransfer:
        """Bilinear amplitudes at (omega, mu); arguments broadcast (see module docstring)."""
        om = np.asarray(omega_rad_s, dtype=float)
        mu = np.mod(np.asarray(rel_heading_deg, dtype=float), 360.0)
        x = self.omega_rad_s
        i = np.clip(np.searchsorted(x, om, side="right") - 1, 0, x.size - 2)
        tf = np.clip((om - x[i]) / (x[i + 1] - x[i]), 0.0, 1.0)
        beyond = om > x[-1]
        if self.symmetric:
            h = self.heading_deg
            mu = 180.0 - np.abs(180.0 - mu)
            cols = [self.heave_m_per_m, self.pitch_rad_per_m, self.roll_rad_per_m]
        else:
            h = np.append(self.heading_deg, self.heading_deg[0] + 360.0)
            mu = np.where(mu < h[0], mu + 360.0, mu)
            cols = [np.concatenate([a, a[:, :1]], axis=1)
                    for a in (self.heave_m_per_m, self.pitch_rad_per_m, self.roll_rad_per_m)]
        j = np.clip(np.searchsorted(h, mu, side="right") - 1, 0, h.size - 2)
        th = np.clip((mu - h[j]) / (h[j + 1] - h[j]), 0.0, 1.0)
        out = []
        for a in cols:
            v = ((1 - tf) * (1 - th)) * a[i, j] + ((1 - tf) * th) * a[i, j + 1] \
                + (tf * (1 - th)) * a[i + 1, j] + (tf * th) * a[i + 1, j + 1]
            out.append(np.where(beyond, 0.0, v))
        return MotionTransfer(*out)


def _err(source: str, msg: str) -> SeawayInputError:
    return SeawayInputError(f"{source}: {msg}")


AMPLITUDE_MAX: Dict[str, float] = {"heave_m_per_m": 10.0, "pitch_deg_per_m": 90.0, "roll_deg_per_m": 90.0}
"""Impossible above (common practice, no source): heave RAOs of ships peak at about 1-3 m/m; a
unit-amplitude wave cannot pitch or roll a hull by a right angle."""
FREQ_RANGE: Dict[str, tuple] = {"period_s": (0.1, 1000.0), "freq_hz": (0.001, 10.0), "omega_rad_s": (0.006, 63.0)}
"""Impossible outside (common practice, no source): tables may reach far into the long-wave
limit, but a period beyond 1000 s or below 0.1 s is a unit mix-up (milliseconds, say)."""
_NAME_LIKE = re.compile(r"^[A-Za-z][A-Za-z0-9_]{0,39}$")


def _frequency_column(cols: List[str], source: str) -> str:
    """Check the header's column names; the one frequency column's name. A header without any
    known column is not a RAO table: its text is not repeated (the file may be anything)."""
    unknown = [c for c in cols if c not in _ALLOWED]
    if len(unknown) == len(cols):
        raise _err(source, f"is not a RAO table: its first line is not a header of the columns "
                           f"{', '.join(_ALLOWED)}")
    if unknown:
        names = [repr(c) for c in unknown if _NAME_LIKE.match(c)]
        other = len(unknown) - len(names)
        listed = ", ".join(names + ([f"{other} more"] if other else []))
        raise _err(source, f"unknown column(s) {listed}; allowed: {', '.join(_ALLOWED)}")
    if len(set(cols)) != len(cols):
        raise _err(source, f"duplicate column names in header {show(cols)}")
    fcols = [c for c in cols if c in FREQ_COLUMNS]
    if len(fcols) != 1:
        raise _err(source, f"exactly one frequency column of {', '.join(FREQ_COLUMNS)} is required, got {show(fcols)}")
    need = ("heading_deg",) + AMPLITUDE_COLUMNS
    missing = [c for c in need if c not in cols]
    if missing:
        raise _err(source, f"missing column(s): {', '.join(missing)}")
    return fcols[0]


def _parse_cells(cols: List[str], rows: Sequence[Sequence[str]], ln: List[int],
                 source: str) -> Dict[str, FloatArray]:
    """Column name -> finite numbers of every row (no empty, non-numeric or missing cells)."""
    data: Dict[str, List[float]] = {c: [] for c in cols}
    for r, row in enumerate(rows):
        line = ln[r]
        if len(row) != len(cols):
            raise _err(source, f"line {line} has {len(row)} fields, the header has {len(cols)}")
        for c, cell in zip(cols, row):
            s = cell.strip()
            if s == "":
                raise _err(source, f"line {line} column {c} is empty (gap in the table)")
            try:
                v = float(s)
            except ValueError:
                raise _err(source, f"line {line} column {c} is not a number: {show(s[:20])}") from None
            if not math.isfinite(v):
                raise _err(source, f"line {line} column {c} must be finite, got {show(s)}")
            data[c].append(v)
    if not rows:
        raise _err(source, "no data rows")
    return {c: np.array(v) for c, v in data.items()}


def _check_ranges(data: Dict[str, FloatArray], fcol: str, ln: List[int], source: str) -> None:
    """Frequency > 0, heading in [0, 360), amplitudes >= 0; the first bad line is named."""
    f, h = data[fcol], data["heading_deg"]
    bad = np.flatnonzero(f <= 0)
    if bad.size:
        raise _err(source, f"line {ln[bad[0]]} column {fcol} must be > 0, got {show(f[bad[0]])}")
    bad = np.flatnonzero((h < 0) | (h >= 360))
    if bad.size:
        raise _err(source, f"line {ln[bad[0]]} column heading_deg must lie in [0, 360), got {show(h[bad[0]])}")
    lo, hi = FREQ_RANGE[fcol]
    bad = np.flatnonzero((f < lo) | (f > hi))
    if bad.size:
        raise _err(source, f"line {ln[bad[0]]} column {fcol} = {show(f[bad[0]])} is not a plausible ocean wave "
                           f"(allowed {lo:g} to {hi:g}; wrong unit?)")
    for c in AMPLITUDE_COLUMNS:
        a = data[c]
        bad = np.flatnonzero(a < 0)
        if bad.size:
            raise _err(source, f"line {ln[bad[0]]} column {c} is a negative amplitude: {show(a[bad[0]])}")
        bad = np.flatnonzero(a > AMPLITUDE_MAX[c])
        if bad.size:
            raise _err(source, f"line {ln[bad[0]]} column {c} = {show(a[bad[0]])} is not a plausible amplitude "
                               f"per metre of wave (allowed 0 to {AMPLITUDE_MAX[c]:g}; wrong unit?)")


def _check_order(f: FloatArray, h: FloatArray, fcol: str, ln: List[int], source: str) -> None:
    """Rows sorted by frequency column then heading, without duplicates."""
    for r in range(1, f.size):
        prev, cur = (f[r - 1], h[r - 1]), (f[r], h[r])
        if cur == prev:
            raise _err(source, f"line {ln[r]} duplicates line {ln[r - 1]} ({fcol}={show(f[r])}, heading_deg={show(h[r])})")
        if cur < prev:
            raise _err(source, f"line {ln[r]} is out of order: rows must be sorted by {fcol}, then heading_deg (got {fcol}={show(f[r])}, heading_deg={show(h[r])} after {fcol}={show(prev[0])}, heading_deg={show(prev[1])})")


def _grid_axes(f: FloatArray, h: FloatArray, fcol: str, source: str) -> tuple:
    """(unique frequencies, headings, symmetric) of a full rectangular grid of >= 2 x 2."""
    fu = np.unique(f)
    heads = h[f == fu[0]]
    for fv in fu[1:]:
        hv = h[f == fv]
        if hv.shape != heads.shape or np.any(hv != heads):
            miss = sorted(set(heads.tolist()) - set(hv.tolist()))
            extra = sorted(set(hv.tolist()) - set(heads.tolist()))
            raise _err(source, f"grid is not rectangular: {fcol}={show(fv)} has headings missing {miss} / extra {extra} compared with {fcol}={show(fu[0])}")
    if fu.size < 2 or heads.size < 2:
        raise _err(source, f"need at least 2 frequencies and 2 headings, got {fu.size} and {heads.size}")
    symmetric = bool(heads.max() <= 180.0)
    if symmetric and not (heads[0] == 0.0 and heads[-1] == 180.0):
        raise _err(source, f"headings within 0..180 deg must include 0 and 180 (symmetric hull), got {heads.tolist()}")
    return fu, heads, symmetric


def _omega_from_column(fcol: str, values: FloatArray) -> FloatArray:
    """Angular frequency [rad/s]: omega = 2 pi / T (period_s), 2 pi f (freq_hz), or as given."""
    if fcol == "period_s":
        return 2 * math.pi / values
    if fcol == "freq_hz":
        return 2 * math.pi * values
    return values.copy()


def rao_table_from_rows(header: Sequence[str], rows: Sequence[Sequence[str]], *, source: str = "<rows>",
                        line_numbers: Optional[Sequence[int]] = None) -> RaoTable:
    """Validate parsed CSV rows (strings) and build a :class:`RaoTable`.

    ``line_numbers`` are the file line numbers of the rows (default 2, 3, ...), used in
    messages. Errors name the source, the line and the column.
    """
    ln = list(line_numbers) if line_numbers is not None else list(range(2, 2 + len(rows)))
    cols = [c.strip() for c in header]
    fcol = _frequency_column(cols, source)
    data = _parse_cells(cols, rows, ln, source)
    _check_ranges(data, fcol, ln, source)
    f, h = data[fcol], data["heading_deg"]
    _check_order(f, h, fcol, ln, source)
    fu, heads, symmetric = _grid_axes(f, h, fcol, source)
    omega = _omega_from_column(fcol, fu)
    grid = {c: data[c].reshape(fu.size, heads.size) for c in AMPLITUDE_COLUMNS}
    order = np.argsort(omega)
    return RaoTable(
        omega_rad_s=omega[order], heading_deg=heads.astype(float),
        heave_m_per_m=grid["heave_m_per_m"][order],
        pitch_rad_per_m=grid["pitch_deg_per_m"][order] * RAD_PER_DEG,
        roll_rad_per_m=grid["roll_deg_per_m"][order] * RAD_PER_DEG,
        symmetric=symmetric, source=source,
    )


def load_rao_table(path: Union[str, Path]) -> RaoTable:
    """Read and validate a RAO table CSV (module docstring)."""
    p = Path(path)
    try:
        text = p.read_text(encoding="utf-8")
    except OSError as exc:
        raise SeawayInputError(f"cannot read RAO table {show(str(p))}: {exc.strerror}") from None
    except UnicodeDecodeError:
        raise SeawayInputError(f"RAO table {show(str(p))} is not UTF-8 text: not a RAO table CSV") from None
    lines = text.splitlines()
    rows: List[List[str]] = []
    numbers: List[int] = []
    header: Optional[List[str]] = None
    for no, rec in enumerate(csv.reader(lines), start=1):
        if not rec or (len(rec) == 1 and not rec[0].strip()) or rec[0].lstrip().startswith("#"):
            continue
        if header is None:
            header = rec
            continue
        rows.append(rec)
        numbers.append(no)
    if header is None:
        raise SeawayInputError(f"{p}: no header line")
    return rao_table_from_rows(header, rows, source=str(p), line_numbers=numbers)


@dataclass(frozen=True)
class TableTransfer:
    """Transfer model backed by a :class:`RaoTable` (same interface as ClosedFormTransfer)."""

    table: RaoTable
    name: str = "RAO table"

    def evaluate(self, omega_rad_s: ArrayLike, k_rad_m: ArrayLike, rel_heading_deg: ArrayLike,
                 speed_m_s: ArrayLike = 0.0, omega_e_rad_s: Optional[ArrayLike] = None) -> MotionTransfer:
        return self.table.interpolate(omega_rad_s, rel_heading_deg)

    def evaluate_grid(self, omega_rad_s: FloatArray, k_rad_m: FloatArray, rel_heading_deg: FloatArray,
                      cos_mu: FloatArray, abs_sin_mu: FloatArray, omega_e_rad_s: FloatArray) -> MotionTransfer:
        return self.table.interpolate(omega_rad_s, rel_heading_deg)

    def validity(self, speed_m_s: ArrayLike) -> NDArray[np.bool_]:
        """No speed limit is known for a table: all True (coverage is checked separately)."""
        return np.ones(np.shape(np.atleast_1d(speed_m_s)), dtype=bool)

    def covered(self, omega_rad_s: FloatArray) -> NDArray[np.bool_]:
        """True where omega lies within the tabulated frequency range."""
        x = self.table.omega_rad_s
        return (omega_rad_s >= x[0]) & (omega_rad_s <= x[-1])
