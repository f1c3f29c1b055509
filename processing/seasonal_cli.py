# SPDX-License-Identifier: GPL-2.0-or-later
"""Headless command line of the seasonal comfort climate (no QGIS needed).

``python -m seaway_comfort seasonal HINDCAST... --vessel NAME --speed-kn 10
(--route FILE | --route-lonlat "lon,lat;lon,lat") [options]``

The route is a GeoJSON file (first LineString, or the first part of a MultiLineString, in
WGS 84 lon/lat), a CSV file of vertices (columns named lon/lat, lon_deg/lat_deg,
longitude/latitude or x/y; else the first two numeric columns) or ``--route-lonlat``.
Outputs: ``--csv`` (table per month and sample), ``--report`` (HTML page); a summary goes to
standard output and a text progress bar to standard error. Exit status: 0 done, 2 bad input
(the message names the input and value), 130 cancelled (Ctrl-C).
"""
from __future__ import annotations

import argparse
import csv
import json
import sys
import time
from typing import List, Optional, Sequence, TextIO, Tuple

from .core.flags import CAUTION
from .core.validation import SeawayInputError, show

__all__ = ["main", "build_parser", "read_route", "parse_lonlat", "ProgressBar"]


def parse_lonlat(text: str) -> Tuple[List[float], List[float]]:
    """Vertices from "lon,lat;lon,lat;..." (decimal degrees)."""
    lon: List[float] = []
    lat: List[float] = []
    for k, part in enumerate(p for p in str(text).split(";") if p.strip()):
        try:
            x, y = (float(v) for v in part.split(","))
        except ValueError:
            raise SeawayInputError(
                f"--route-lonlat vertex {k + 1} {show(part.strip())} is not 'lon,lat' in decimal degrees"
            ) from None
        lon.append(x)
        lat.append(y)
    if len(lon) < 2:
        raise SeawayInputError(f"--route-lonlat {show(text)} needs at least two 'lon,lat' vertices separated by ';'")
    return lon, lat


def _geojson_line(obj: object, path: str) -> Optional[List[List[float]]]:
    if not isinstance(obj, dict):
        return None
    kind = obj.get("type")
    if kind == "FeatureCollection":
        for f in obj.get("features") or []:
            got = _geojson_line(f, path)
            if got:
                return got
        return None
    if kind == "Feature":
        return _geojson_line(obj.get("geometry"), path)
    if kind == "LineString":
        return obj.get("coordinates")
    if kind == "MultiLineString":
        parts = obj.get("coordinates") or []
        return parts[0] if parts else None
    return None


def read_route(path: str) -> Tuple[List[float], List[float]]:
    """Route vertices (lon, lat in degrees) from a GeoJSON or CSV file (module docstring)."""
    try:
        with open(path, "r", encoding="utf-8-sig") as fh:
            text = fh.read()
    except OSError as exc:
        raise SeawayInputError(f"--route file {show(path)} cannot be read: {exc}") from None
    stripped = text.lstrip()
    if stripped.startswith("{"):
        try:
            coords = _geojson_line(json.loads(text), path)
        except json.JSONDecodeError as exc:
            raise SeawayInputError(f"--route file {show(path)} is not valid GeoJSON: {exc}") from None
        if not coords or len(coords) < 2:
            raise SeawayInputError(f"--route file {show(path)} holds no LineString with at least two vertices")
        try:
            return [float(c[0]) for c in coords], [float(c[1]) for c in coords]
        except (TypeError, ValueError, IndexError):
            raise SeawayInputError(f"--route file {show(path)}: coordinates must be [lon, lat] numbers") from None
    rows = [r for r in csv.reader(text.splitlines()) if r and any(c.strip() for c in r)]
    if not rows:
        raise SeawayInputError(f"--route file {show(path)} is empty")
    head = [c.strip().lower() for c in rows[0]]
    ix = iy = None
    for xn, yn in (("lon", "lat"), ("lon_deg", "lat_deg"), ("longitude", "latitude"), ("x", "y")):
        if xn in head and yn in head:
            ix, iy = head.index(xn), head.index(yn)
            break
    body = rows[1:] if ix is not None else rows
    if ix is None:
        try:
            float(rows[0][0])
        except (ValueError, IndexError):
            body = rows[1:]
        ix, iy = 0, 1
    lon: List[float] = []
    lat: List[float] = []
    for n, r in enumerate(body):
        try:
            lon.append(float(r[ix]))
            lat.append(float(r[iy]))
        except (ValueError, IndexError):
            raise SeawayInputError(f"--route file {show(path)} row {n + 2}: {show(r)} has no numeric lon/lat") from None
    if len(lon) < 2:
        raise SeawayInputError(f"--route file {show(path)} needs at least two vertices, found {len(lon)}")
    return lon, lat


class ProgressBar:
    """A one-line text progress bar on a stream; returns True (never cancels by itself)."""

    def __init__(self, stream: TextIO = sys.stderr, width: int = 32, enabled: bool = True) -> None:
        self.stream, self.width, self.enabled = stream, int(width), bool(enabled)
        self.t0 = time.monotonic()

    def __call__(self, fraction: float) -> bool:
        if not self.enabled:
            return True
        f = min(max(float(fraction), 0.0), 1.0)
        n = int(round(f * self.width))
        el = time.monotonic() - self.t0
        self.stream.write(f"\r[{'#' * n}{'.' * (self.width - n)}] {100 * f:5.1f} %  {el:6.1f} s")
        if f >= 1.0:
            self.stream.write("\n")
        self.stream.flush()
        return True


def build_parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(
        prog="python -m seaway_comfort seasonal",
        description="Seasonal comfort climate along a route from years of hindcast. " + CAUTION,
    )
    p.add_argument("hindcast", nargs="+", help="hindcast files (NetCDF-CF, GRIB2), any number of years")
    g = p.add_mutually_exclusive_group(required=True)
    g.add_argument("--route", help="route file: GeoJSON LineString or CSV of lon,lat vertices")
    g.add_argument("--route-lonlat", help='route vertices "lon,lat;lon,lat;..." in degrees')
    p.add_argument("--vessel", required=True, help="built-in vessel name or vessel profile JSON path")
    p.add_argument("--speed-kn", type=float, required=True, help="speed through the water [kn]")
    p.add_argument("--station", default=None, help="station on board (default: the profile's first)")
    p.add_argument("--months", default="1-12", help='months, e.g. "1-12", "6,7,8", "11-2" (default all)')
    p.add_argument("--max-class", type=int, default=1, help="worst acceptable comfort class 0..4 (default 1)")
    p.add_argument("--spacing-nm", type=float, default=1.0, help="route sample spacing [NM] (default 1)")
    p.add_argument("--gamma", type=float, default=3.3, help="JONSWAP peak enhancement (default 3.3)")
    p.add_argument("--spread-s", type=float, default=4.0, help="cos-2s spreading exponent (default 4)")
    p.add_argument("--backend", choices=("serial", "local", "dask"), default="local",
                   help="where chunks run (default: local process pool)")
    p.add_argument("--workers", type=int, default=2, help="worker processes (default 2)")
    p.add_argument("--scheduler", default=None, help="Dask scheduler address tcp://host:port (implies --backend dask)")
    p.add_argument("--fallback-local", action="store_true",
                   help="if the Dask scheduler cannot be reached, compute locally instead of failing")
    p.add_argument("--chunk-steps", type=int, default=None, help="hindcast steps per chunk")
    p.add_argument("--overlap", choices=("first", "last", "error"), default="first",
                   help="time steps in several files: use the first/last file given, or fail")
    p.add_argument("--csv", default=None, help="write the per-month table here")
    p.add_argument("--report", default=None, help="write the HTML report here")
    p.add_argument("--quiet", action="store_true", help="no progress bar")
    return p


def main(argv: Optional[Sequence[str]] = None, *, stdout: Optional[TextIO] = None,
         stderr: Optional[TextIO] = None) -> int:
    """Run the command line; returns the exit status (module docstring)."""
    from .core.climate import DEFAULT_CHUNK_STEPS, compute_climate, make_backend
    from .core.climate.backends import ClimateCancelled
    from .core.reports.climate import climate_text_summary, write_climate_html

    out = stdout or sys.stdout
    err = stderr or sys.stderr
    parser = build_parser()
    raw = list(sys.argv[1:] if argv is None else argv)
    # "--route-lonlat -9,41;..." : a value starting with '-' would be taken for an option
    fixed: List[str] = []
    k = 0
    while k < len(raw):
        if raw[k] == "--route-lonlat" and k + 1 < len(raw):
            fixed.append(f"--route-lonlat={raw[k + 1]}")
            k += 2
            continue
        fixed.append(raw[k])
        k += 1
    try:
        args = parser.parse_args(fixed)
    except SystemExit as exc:
        return int(exc.code or 0)
    try:
        lon, lat = parse_lonlat(args.route_lonlat) if args.route_lonlat else read_route(args.route)
        if args.workers < 1:
            raise SeawayInputError(f"--workers must be >= 1, got {args.workers}")
        backend = make_backend(args.backend, workers=args.workers, scheduler=args.scheduler,
                               fallback_local=args.fallback_local)
        bar = ProgressBar(err, enabled=not args.quiet)
        result = compute_climate(
            lon, lat, list(args.hindcast), args.vessel, speed_kn=args.speed_kn, station=args.station,
            months=args.months, max_class=args.max_class, spacing_nm=args.spacing_nm, gamma=args.gamma,
            spread_s=args.spread_s, chunk_steps=args.chunk_steps or DEFAULT_CHUNK_STEPS, backend=backend,
            overlap=args.overlap, progress=bar,
        )
        if args.csv:
            result.to_csv(args.csv)
        if args.report:
            write_climate_html(args.report, result, sources=list(args.hindcast))
    except SeawayInputError as exc:
        err.write(f"\nerror: {exc}\n")
        return 2
    except (KeyboardInterrupt, ClimateCancelled):
        err.write("\ncancelled\n")
        return 130
    out.write(climate_text_summary(result) + "\n")
    for note in result.notes:
        out.write(f"note: {note}\n")
    if args.csv:
        out.write(f"CSV written to {args.csv}\n")
    if args.report:
        out.write(f"report written to {args.report}\n")
    return 0


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
