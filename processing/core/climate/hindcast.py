# SPDX-License-Identifier: GPL-2.0-or-later
"""Many hindcast files as one regular time series at fixed route positions.

A seasonal climate samples the SAME positions at very many time steps. The route-sampling
path of :mod:`..seastate` reads one window per call for a handful of (position, time) pairs;
here the window around all route samples is read ONCE per block of time steps (one GDAL
``ReadAsArray`` call with a band list per file and variable), and the bilinear weights are
computed once.

Opening (:func:`open_hindcast`): every file is inventoried with :func:`..seastate.open_sea_state`
(same variable recognition, units and direction conventions as the rest of the plugin) and
must provide a combined significant wave height ``hs``, a period (``tp``, else ``tm01``,
``tm02`` or ``tm10`` turned into Tp with the JONSWAP ratios of :mod:`..seastate.derived`) and a
direction ``dir``, all on one grid. Then:

* **Grid check**: every file must use the grid of the first file (size, geotransform, CRS);
  otherwise :class:`..validation.SeawayInputError` names both files and grids (a climate mixing
  grids would silently change the cells behind each route sample).
* **Time axis**: the base step is the most common spacing of the union of all times; every
  time must lie on ``start + k * step`` (else an error names the file and time). The series
  is the regular axis from the first to the last time.
* **Gaps**: steps of the regular axis that no file provides are reported
  (:class:`HindcastGap`) and stay missing: values are NEVER interpolated across gaps; the
  engine counts them as missing data and excludes passages that touch them.
* **Overlaps**: a time step present in several files is an overlap (:class:`HindcastOverlap`).
  ``overlap="first"`` (default) uses the file given first and reports it, ``"last"`` the file
  given last, ``"error"`` raises.

Sampling at fixed positions (:func:`point_weights`, :func:`read_point_values`):

* Space: bilinear between the four surrounding cell centres (Press et al., Numerical Recipes,
  3rd ed. 2007, s.3.6 eq. 3.6.5) in the grid's centre-index coordinates; no-data neighbours
  (land) are dropped and the remaining weights renormalised (as in :mod:`..seastate.sampler`).
  A sample whose four neighbours are all no-data has no value at that step (NaN); unlike the
  route sampler no nearest-sea search is made (state: NO_SEA_DATA in the counts).
* Directions are averaged as unit vectors with the same weights (Mardia & Jupp, Directional
  Statistics, 2000, s.2.2.1); "going to" directions are turned by 180 degrees.
* Time: only the hindcast's own steps are used (no interpolation in time at this level).
* Values: ``(raw * scale + offset) * unit_factor`` with GDAL's band scale/offset and no-data
  (CF Conventions 1.8 s.8.1); scale, offset and no-data are read from the first band of each
  file variable and assumed the same for all its time steps (true for CF variables).
"""
from __future__ import annotations

import atexit
import math
import os
import threading
from dataclasses import dataclass
from typing import Dict, List, Optional, Sequence, Tuple

import numpy as np
from numpy.typing import NDArray

from ..units import FloatArray
from ..validation import SeawayInputError, as_float_array, require_in_range, show

__all__ = [
    "HindcastGap",
    "HindcastOverlap",
    "HindcastFileInfo",
    "VariableSteps",
    "HindcastSeries",
    "PointWeights",
    "open_hindcast",
    "point_weights",
    "read_point_values",
    "PERIOD_PREFERENCE",
]

PERIOD_PREFERENCE: Tuple[str, ...] = ("tp", "tm01", "tm02", "tm10")
"""Period variables in order of preference; mean periods are converted to Tp."""

_VARS: Tuple[str, ...] = ("hs", "per", "dir")


@dataclass(frozen=True)
class HindcastGap:
    """Missing steps between two provided times (``missing_steps`` >= 1)."""

    after_utc: np.datetime64
    before_utc: np.datetime64
    missing_steps: int

    def describe(self) -> str:
        return (f"gap of {self.missing_steps} time step(s) between {self.after_utc}Z and "
                f"{self.before_utc}Z (not interpolated)")


@dataclass(frozen=True)
class HindcastOverlap:
    """Time steps given by more than one file and which file was used."""

    first_utc: np.datetime64
    last_utc: np.datetime64
    n_steps: int
    files: Tuple[str, ...]
    used: str

    def describe(self) -> str:
        return (f"{self.n_steps} time step(s) {self.first_utc}Z..{self.last_utc}Z are in "
                f"{' and '.join(self.files)}; values of {self.used} are used")


@dataclass(frozen=True)
class HindcastFileInfo:
    """One input file: its path, time range and number of steps."""

    path: str
    first_utc: np.datetime64
    last_utc: np.datetime64
    n_steps: int


@dataclass(frozen=True)
class VariableSteps:
    """Where each step of one variable is stored.

    ``datasets`` GDAL dataset names; ``dataset_index`` (n_steps,) index into them (-1 =
    missing step); ``band`` (n_steps,) 1-based band number; ``factor`` and ``going_to`` per
    dataset (unit factor; direction convention); ``period_ratio`` per dataset: the mean-period
    to Tp ratio (1.0 for a peak period).
    """

    datasets: Tuple[str, ...]
    dataset_index: NDArray[np.int64]
    band: NDArray[np.int64]
    factor: Tuple[float, ...]
    going_to: Tuple[bool, ...]
    period_ratio: Tuple[float, ...]
    file_variable: Tuple[str, ...]

    def slice(self, a: int, b: int) -> "VariableSteps":
        return VariableSteps(self.datasets, self.dataset_index[a:b].copy(), self.band[a:b].copy(),
                             self.factor, self.going_to, self.period_ratio, self.file_variable)


@dataclass(frozen=True)
class HindcastSeries:
    """A regular hindcast time axis over several files (see the module docstring).

    ``start_s`` first time [s since 1970-01-01 UTC], ``step_s`` base step [s], ``n_steps``;
    ``variables``: "hs", "per" (period, converted to Tp on reading), "dir";
    ``present`` (n_steps,) True where all three variables have a step; ``grid`` the common
    grid; ``files``, ``gaps``, ``overlaps``, ``notes``.
    """

    start_s: int
    step_s: int
    n_steps: int
    variables: Dict[str, VariableSteps]
    present: NDArray[np.bool_]
    grid: object
    files: Tuple[HindcastFileInfo, ...]
    gaps: Tuple[HindcastGap, ...]
    overlaps: Tuple[HindcastOverlap, ...]
    notes: Tuple[str, ...]

    @property
    def times_utc(self) -> NDArray[np.datetime64]:
        return (np.datetime64(int(self.start_s), "s")
                + np.arange(self.n_steps, dtype=np.int64) * np.timedelta64(int(self.step_s), "s"))

    @property
    def missing_steps(self) -> int:
        return int(self.n_steps - np.count_nonzero(self.present))

    def slice(self, a: int, b: int) -> "HindcastSeries":
        """Steps [a, b) as a series of its own (what one worker needs)."""
        a, b = max(0, int(a)), min(self.n_steps, int(b))
        return HindcastSeries(
            start_s=int(self.start_s + a * self.step_s), step_s=self.step_s, n_steps=b - a,
            variables={k: v.slice(a, b) for k, v in self.variables.items()},
            present=self.present[a:b].copy(), grid=self.grid, files=self.files, gaps=(),
            overlaps=(), notes=(),
        )


def _grid_key(g: object) -> Tuple:
    return (g.nx, g.ny, g.crs_label, tuple(round(float(v), 9) for v in g.geotransform))  # type: ignore[attr-defined]


def _grid_text(g: object) -> str:
    return (f"{g.nx} x {g.ny} cells, geotransform {tuple(float(v) for v in g.geotransform)}, "  # type: ignore[attr-defined]
            f"{g.crs_label}")  # type: ignore[attr-defined]


def _hindcast_files(paths: Sequence[str], overlap: str) -> List[str]:
    """The file list, checked: an ``overlap`` rule we know, at least one file, none twice."""
    if overlap not in ("first", "last", "error"):
        raise SeawayInputError(f"overlap must be 'first', 'last' or 'error', got {show(overlap)}")
    if isinstance(paths, (str, os.PathLike)):
        paths = [os.fspath(paths)]
    files = [os.fspath(p) for p in paths]
    if not files:
        raise SeawayInputError("hindcast paths is empty: give at least one hindcast file")
    dup = sorted({f for f in files if files.count(f) > 1})
    if dup:
        raise SeawayInputError(f"hindcast paths lists the same file more than once: {', '.join(dup)}")
    return files


def _file_layers(files: Sequence[str], notes: List[str]) -> Tuple[List[Dict[str, object]], object]:
    """Per file its hs / period / dir layers and period ratio; all on one grid (else an error)."""
    from ..seastate import open_sea_state
    from ..seastate.derived import MEAN_PERIOD_RATIOS

    per_file: List[Dict[str, object]] = []
    grid0 = None
    file0 = ""
    for f in files:
        src = open_sea_state([f])
        try:
            have = set(src.variables)
            per = next((p for p in PERIOD_PREFERENCE if p in have), None)
            lacking = [name for name, ok in (("hs (significant wave height)", "hs" in have),
                                             ("a period (tp, tm01, tm02 or tm10)", per is not None),
                                             ("dir (wave direction)", "dir" in have)) if not ok]
            if lacking:
                raise SeawayInputError(
                    f"hindcast file {show(f)} lacks {' and '.join(lacking)} as a combined-sea variable "
                    f"(found: {', '.join(sorted(have)) or 'none'}); the climate needs hs, a period and dir"
                )
            layers = {"hs": src.layer("hs"), "per": src.layer(per), "dir": src.layer("dir")}
            if per != "tp":
                notes.append(f"{f}: Tp derived from {per} with {per}/Tp = {MEAN_PERIOD_RATIOS[per]} (JONSWAP gamma 3.3)")
            for name, layer in layers.items():
                g = layer.grid
                if grid0 is None:
                    grid0, file0 = g, f
                elif _grid_key(g) != _grid_key(grid0):
                    raise SeawayInputError(
                        f"hindcast file {show(f)} ({name}: {_grid_text(g)}) does not use the grid of "
                        f"{show(file0)} ({_grid_text(grid0)}); all hindcast files of one climate must share "
                        "one grid - regrid them first"
                    )
            per_file.append({"path": f, "layers": layers, "ratio": 1.0 if per == "tp" else MEAN_PERIOD_RATIOS[per]})
        finally:
            src.close()
    return per_file, grid0


def _regular_axis(per_file: Sequence[Dict[str, object]]) -> Tuple[int, int, int]:
    """(start_s, step_s, n_steps) of the common time axis: the most frequent step; every time of
    every file must lie on it (else an error naming file, variable and time)."""
    all_t = np.unique(np.concatenate([np.asarray(pf["layers"]["hs"].times_s, dtype=np.int64)  # type: ignore[index]
                                      for pf in per_file]))
    if all_t.size >= 2:
        vals, counts = np.unique(np.diff(all_t), return_counts=True)
        step = int(vals[np.argmax(counts)])
    else:
        step = 3600
    start = int(all_t[0])
    for pf in per_file:
        for layer in pf["layers"].values():  # type: ignore[union-attr]
            t = np.asarray(layer.times_s, dtype=np.int64)
            off = (t - start) % step != 0
            if off.any():
                bad = np.datetime64(int(t[np.flatnonzero(off)[0]]), "s")
                raise SeawayInputError(
                    f"hindcast file {show(pf['path'])} variable {show(layer.file_variable)} has time {bad}Z off the "
                    f"regular {step / 3600.0:g} h axis starting {np.datetime64(start, 's')}Z; "
                    "all files must share one time step"
                )
    return start, step, int((all_t[-1] - start) // step) + 1


def _variable_steps(name: str, per_file: Sequence[Dict[str, object]], order: Sequence[int], start: int, step: int,
                    n_steps: int) -> Tuple[VariableSteps, Dict[int, NDArray[np.int64]], NDArray[np.int64]]:
    """Where each step of one variable is read (files in ``order``: the first to provide a step
    keeps it); also each file's step indices and the file owning each step."""
    datasets: List[str] = []
    ds_pos: Dict[str, int] = {}
    factor: List[float] = []
    going: List[bool] = []
    ratio: List[float] = []
    fvar: List[str] = []
    di = np.full(n_steps, -1, dtype=np.int64)
    bn = np.zeros(n_steps, dtype=np.int64)
    owner = np.full(n_steps, -1, dtype=np.int64)
    steps_of: Dict[int, NDArray[np.int64]] = {}
    for fi in order:
        pf = per_file[fi]
        layer = pf["layers"][name]  # type: ignore[index]
        k = ((np.asarray(layer.times_s, dtype=np.int64) - start) // step).astype(np.int64)
        free = di[k] < 0
        steps_of[fi] = k
        idx = np.empty(k.size, dtype=np.int64)
        for j, (dsname, _) in enumerate(layer.bands):
            pos = ds_pos.get(dsname)
            if pos is None:
                pos = ds_pos[dsname] = len(datasets)
                datasets.append(dsname)
                factor.append(float(layer.units.factor))
                going.append(bool(layer.going_to))
                ratio.append(float(pf["ratio"]) if name == "per" else 1.0)  # type: ignore[arg-type]
                fvar.append(str(layer.file_variable))
            idx[j] = pos
        bands = np.array([b for _, b in layer.bands], dtype=np.int64)
        di[k[free]] = idx[free]
        bn[k[free]] = bands[free]
        owner[k[free]] = fi
    return (VariableSteps(tuple(datasets), di, bn, tuple(factor), tuple(going), tuple(ratio), tuple(fvar)),
            steps_of, owner)


def _overlaps(files: Sequence[str], steps_of: Dict[int, NDArray[np.int64]], owner: NDArray[np.int64],
              start: int, step: int) -> List[HindcastOverlap]:
    """Steps provided by more than one file (on the hs axis), per pair of files."""
    overlaps: List[HindcastOverlap] = []
    for i in range(len(files)):
        for j in range(i + 1, len(files)):
            common = np.intersect1d(steps_of[i], steps_of[j])
            if common.size:
                overlaps.append(HindcastOverlap(
                    np.datetime64(start + int(common[0]) * step, "s"),
                    np.datetime64(start + int(common[-1]) * step, "s"), int(common.size),
                    (files[i], files[j]), files[int(owner[common[0]])]))
    return overlaps


def _gaps(present: NDArray[np.bool_], start: int, step: int) -> List[HindcastGap]:
    """Runs of missing steps, each between the last step before and the first step after."""
    edges = np.diff(np.concatenate([[0], (~present).astype(np.int8), [0]]))
    return [HindcastGap(np.datetime64(start + (int(a) - 1) * step, "s"), np.datetime64(start + int(b) * step, "s"),
                        int(b - a)) for a, b in zip(np.flatnonzero(edges == 1), np.flatnonzero(edges == -1))]


def open_hindcast(
    paths: Sequence[str],
    *,
    variable_map: Optional[Dict[str, str]] = None,
    overlap: str = "first",
) -> HindcastSeries:
    """Open hindcast files (NetCDF-CF, GRIB2, ...) as one regular time series.

    Raises :class:`SeawayInputError` for: no files, a file that cannot be read or lacks a
    variable, grids that differ between files, times off the regular axis, a bad ``overlap``
    value, or overlapping files with ``overlap="error"``. Gaps are reported, never filled.
    """
    files = _hindcast_files(paths, overlap)
    order = list(range(len(files))) if overlap != "last" else list(range(len(files)))[::-1]
    notes: List[str] = []
    per_file, grid0 = _file_layers(files, notes)
    start, step, n_steps = _regular_axis(per_file)
    variables: Dict[str, VariableSteps] = {}
    for name in _VARS:
        variables[name], steps, own = _variable_steps(name, per_file, order, start, step, n_steps)
        if name == "hs":
            steps_of, owner = steps, own
    present = np.ones(n_steps, dtype=bool)
    for v in variables.values():
        present &= v.dataset_index >= 0
    overlaps = _overlaps(files, steps_of, owner, start, step)
    if overlaps and overlap == "error":
        raise SeawayInputError(
            "hindcast files overlap in time: " + "; ".join(o.describe().split("; values")[0] for o in overlaps)
            + " (overlap='error'; use overlap='first' or 'last' to pick one)"
        )
    notes += [o.describe() for o in overlaps]
    gaps = _gaps(present, start, step)
    if gaps:
        notes.append(f"{int((~present).sum())} missing time step(s) in {len(gaps)} gap(s); first: {gaps[0].describe()}")
    infos = []
    for pf in per_file:
        t = np.asarray(pf["layers"]["hs"].times_s, dtype=np.int64)  # type: ignore[index]
        infos.append(HindcastFileInfo(str(pf["path"]), np.datetime64(int(t[0]), "s"), np.datetime64(int(t[-1]), "s"), int(t.size)))
    return HindcastSeries(start_s=start, step_s=step, n_steps=n_steps, variables=variables, present=present,
                          grid=grid0, files=tuple(infos), gaps=tuple(gaps), overlaps=tuple(overlaps),
                          notes=tuple(notes))


@dataclass(frozen=True)
class PointWeights:
    """Bilinear neighbours of n fixed positions on a grid and the window that holds them.

    ``rows``/``cols`` (n, 4) window-local indices; ``weights`` (n, 4) (0 for neighbours beyond
    the grid edge); ``inside`` (n,) position inside the grid; window ``row0``, ``col0``,
    ``nrows``, ``ncols`` (grid indices).
    """

    rows: NDArray[np.int64]
    cols: NDArray[np.int64]
    weights: FloatArray
    inside: NDArray[np.bool_]
    row0: int
    col0: int
    nrows: int
    ncols: int


def point_weights(grid: object, lon_deg: Sequence[float], lat_deg: Sequence[float]) -> PointWeights:
    """Bilinear neighbours and weights of fixed positions (module docstring); a route that lies
    entirely outside the grid raises :class:`SeawayInputError`."""
    lon = np.atleast_1d(as_float_array("lon_deg", lon_deg)).ravel()
    lat = np.atleast_1d(require_in_range("lat_deg", lat_deg, -90.0, 90.0, unit="deg")).ravel()
    if lon.size != lat.size or lon.size == 0:
        raise SeawayInputError(f"lon_deg ({lon.size}) and lat_deg ({lat.size}) must have the same non-zero length")
    g = grid
    col_f, row_f, inside = g.centre_index(lon, lat)  # type: ignore[attr-defined]
    if not inside.any():
        x0, y0, x1, y1 = g.extent()  # type: ignore[attr-defined]
        raise SeawayInputError(
            f"the route (lon {lon.min():g}..{lon.max():g}, lat {lat.min():g}..{lat.max():g}) lies entirely "
            f"outside the hindcast grid (extent lon {x0:g}..{x1:g}, lat {y0:g}..{y1:g})"
        )
    cf = np.where(inside, col_f, 0.0)
    rf = np.where(inside, row_f, 0.0)
    from ..seastate.grid import bilinear_corners

    corners = bilinear_corners(g, cf, rf)  # type: ignore[arg-type]
    cc, rr = corners.cols, corners.rows
    ok = corners.valid & inside[:, None]
    ww = np.where(ok, corners.weights, 0.0)
    # one rectangular window (a route crossing a wrapping seam reads the full width)
    c_used, r_used = cc[ok], rr[ok]
    col0, col1 = int(c_used.min()), int(c_used.max())
    row0, row1 = int(r_used.min()), int(r_used.max())
    # neighbours with weight 0 (off the grid) point at the window's first cell (never used)
    return PointWeights(rows=np.where(ok, rr - row0, 0), cols=np.where(ok, cc - col0, 0), weights=ww, inside=inside,
                        row0=row0, col0=col0, nrows=row1 - row0 + 1, ncols=col1 - col0 + 1)


class _Reader:
    """Keeps up to ``max_open`` GDAL datasets open (least recently used closed first) and
    remembers each dataset's scale/offset/no-data. Chunks run through the files in time order,
    so a few open datasets (one file's three variables and the next) are enough; the limit
    keeps memory independent of the number of years (each open NetCDF file has its own
    chunk cache)."""

    def __init__(self, max_open: int = 6) -> None:
        self._ds: Dict[str, object] = {}
        self._meta: Dict[str, Tuple[Optional[float], float, float]] = {}
        self._max = int(max_open)

    @staticmethod
    def _stamp(name: str) -> Tuple[int, int]:
        plain = name
        if name.upper().startswith(("NETCDF:", "HDF5:")):
            plain = name.split(":", 1)[1].rsplit(":", 1)[0].strip('"')
        try:
            st = os.stat(plain)
        except OSError:
            return (-1, -1)
        return (int(st.st_mtime_ns), int(st.st_size))

    def get(self, name: str):  # type: ignore[no-untyped-def]
        """The open dataset (reopened when the file changed on disk since it was opened)."""
        stamp = self._stamp(name)
        entry = self._ds.pop(name, None)
        if entry is not None and entry[1] == stamp:  # type: ignore[index]
            self._ds[name] = entry  # most recently used last
            return entry[0]  # type: ignore[index]
        from ..seastate.layer import open_gdal

        while len(self._ds) >= self._max:
            self._ds.pop(next(iter(self._ds)))
        ds = open_gdal(name, what="hindcast file")
        band = ds.GetRasterBand(1)
        nd = band.GetNoDataValue()
        sc = band.GetScale()
        of = band.GetOffset()
        self._ds[name] = (ds, stamp)
        self._meta[name] = (nd, 1.0 if sc is None else float(sc), 0.0 if of is None else float(of))
        return ds

    def read(self, name: str, bands: NDArray[np.int64], pw: PointWeights) -> FloatArray:
        ds = self.get(name)
        try:
            raw = ds.ReadAsArray(pw.col0, pw.row0, pw.ncols, pw.nrows,  # type: ignore[attr-defined]
                                 band_list=[int(b) for b in bands])
        except RuntimeError as exc:
            raise SeawayInputError(f"GDAL could not read hindcast file {show(name)}: {exc}") from None
        if raw is None:
            raise SeawayInputError(f"GDAL could not read bands {bands[0]}..{bands[-1]} of hindcast file {show(name)}")
        # every block is read once: drop it from GDAL's block cache so that memory stays bounded
        # whatever the number of years (the cache would otherwise fill up to GDAL_CACHEMAX)
        ds.FlushCache()  # type: ignore[attr-defined]
        raw = np.asarray(raw).reshape(len(bands), pw.nrows, pw.ncols)
        nd, sc, of = self._meta[name]
        arr = raw.astype(np.float64)
        bad = ~np.isfinite(arr)
        if nd is not None and np.isfinite(nd):
            bad |= raw == nd
        if sc != 1.0 or of != 0.0:
            arr = arr * sc + of
        arr[bad] = np.nan
        return arr

    def close(self) -> None:
        self._ds.clear()


_LOCAL = threading.local()
_ALL_READERS: List[_Reader] = []
_READERS_LOCK = threading.Lock()


def process_reader() -> _Reader:
    """One reader per thread of this process, shared by the chunks that run in it (files opened
    once). Per THREAD because GDAL dataset handles must not be used by two threads at once
    (Dask workers may be threads). All are closed at interpreter exit and by
    :func:`close_process_readers`."""
    rd = getattr(_LOCAL, "reader", None)
    if rd is None:
        rd = _LOCAL.reader = _Reader()
        with _READERS_LOCK:
            _ALL_READERS.append(rd)
    return rd


def close_process_readers() -> None:
    """Close every dataset the per-thread readers hold (call when a computation is done)."""
    with _READERS_LOCK:
        for rd in _ALL_READERS:
            rd.close()


atexit.register(close_process_readers)


def _cube(reader: _Reader, var: VariableSteps, pw: PointWeights, a: int, b: int) -> Tuple[FloatArray, List[int]]:
    """(b-a, nrows, ncols) physical values of steps [a, b); NaN at missing steps."""
    out = np.full((b - a, pw.nrows, pw.ncols), np.nan)
    di = var.dataset_index[a:b]
    used: List[int] = []
    for d in np.unique(di[di >= 0]):
        sel = np.flatnonzero(di == d)
        vals = reader.read(var.datasets[int(d)], var.band[a:b][sel], pw)
        f = var.factor[int(d)] / var.period_ratio[int(d)]
        if f != 1.0:
            vals *= f
        out[sel] = vals
        used.append(int(d))
    return out, used


def read_point_values(
    series: HindcastSeries,
    pw: PointWeights,
    a: int,
    b: int,
    *,
    reader: Optional[_Reader] = None,
) -> Tuple[FloatArray, FloatArray, FloatArray]:
    """Hs [m], Tp [s] and direction [deg true, coming from] at the fixed positions for steps
    [a, b) of ``series``: three (b-a, n) arrays, NaN where the step is missing, the position is
    outside the grid or all four neighbours are no-data (module docstring for the method)."""
    own = reader is None
    rd = _Reader() if own else reader
    try:
        r, c, w = pw.rows, pw.cols, pw.weights
        res: List[FloatArray] = []
        for name in _VARS:
            var = series.variables[name]
            cube, used = _cube(rd, var, pw, a, b)  # type: ignore[arg-type]
            v = cube[:, r, c]  # (nt, n, 4)
            ok = np.isfinite(v) & (w > 0)
            den = np.sum(np.where(ok, w, 0.0), axis=2)
            with np.errstate(invalid="ignore", divide="ignore"):
                if name == "dir":
                    turn = np.zeros(b - a)
                    di = var.dataset_index[a:b]
                    for d in used:
                        if var.going_to[d]:
                            turn[di == d] = math.pi
                    ang = np.radians(np.where(ok, v, 0.0)) + turn[:, None, None]
                    cx = np.sum(np.where(ok, w * np.cos(ang), 0.0), axis=2)
                    sx = np.sum(np.where(ok, w * np.sin(ang), 0.0), axis=2)
                    val = np.mod(np.degrees(np.arctan2(sx, cx)), 360.0)
                else:
                    val = np.sum(np.where(ok, w * v, 0.0), axis=2) / den
            val = np.where(den > 0, val, np.nan)
            res.append(val)
        return res[0], res[1], res[2]
    finally:
        if own:
            rd.close()  # type: ignore[union-attr]
