# SPDX-License-Identifier: GPL-2.0-or-later
"""Several forecast files, one source: which of the files given together belong together.

Rules (the files are then merged by :func:`.source.open_sea_state`, whose rules join variables
and extend time axes, with their warnings):

* with names (one per file): files sharing a name form one source, in the order the names first
  appear; a source whose files together lack a height, a period or a direction is refused,
  naming its files;
* without names: a file that cannot stand alone (no height, period or direction) is joined with
  the other files that cannot stand alone into one source (a forecast split by variable), or,
  when they together are still incomplete (or it is the only one), with every file; files
  that can stand alone and hold the same variables on the same grid and members at times that
  do not overlap are joined too (a forecast split by step, or an ensemble split by member when
  their members differ). Every join is logged with the files it took. Joined files that still
  lack a variable are refused, naming them.
"""
from __future__ import annotations

import os
from dataclasses import dataclass
from typing import Dict, List, Optional, Sequence, Tuple

from ..validation import SeawayInputError, show
from .inventory import Inventory
from .source import SeaStateSource, describe_file, lacking_variables, open_sea_state

__all__ = ["SourceGroup", "group_forecast_files", "open_grouped_sources"]


@dataclass(frozen=True)
class SourceGroup:
    """One source: its name and files, and why they were joined ("" for a lone file)."""

    name: str
    paths: Tuple[str, ...]
    reason: str = ""


def _stem(path: str) -> str:
    return os.path.splitext(os.path.basename(path))[0]


def _probe(path: str) -> Optional[Inventory]:
    """The file's inventory, or None when it cannot be read (opening it later says why)."""
    try:
        return describe_file(path)
    except SeawayInputError:
        return None


def _used(inv: Inventory) -> Tuple[str, ...]:
    return tuple(sorted(v.canonical for v in inv.variables if v.used))


def _by_name(paths: Sequence[str], names: Sequence[str]) -> List[SourceGroup]:
    if len(names) != len(paths):
        raise SeawayInputError(f"{len(names)} source names ({', '.join(names)}) for {len(paths)} forecast "
                               "files: give one name per file (files sharing a name form one source)")
    order: Dict[str, List[str]] = {}
    for p, n in zip(paths, names):
        if not n:
            raise SeawayInputError(f"the source name of {show(p)} is empty")
        order.setdefault(n, []).append(p)
    return [SourceGroup(n, tuple(ps), "same source name" if len(ps) > 1 else "") for n, ps in order.items()]


def _series_key(inv: Inventory) -> tuple:
    g = inv.variables[0].grid
    return (_used(inv), g.shape, g.extent)


def _span(inv: Inventory) -> Tuple[str, str]:
    return (min(v.time_start_utc or "" for v in inv.variables), max(v.time_end_utc or "" for v in inv.variables))


def _apart(a: Inventory, b: Inventory) -> bool:
    """True when two files share no time step (ISO texts compare in time order) or no member."""
    (a0, a1), (b0, b1) = _span(a), _span(b)
    if a1 < b0 or b1 < a0:
        return True
    return bool(a.members) and bool(b.members) and not set(a.members) & set(b.members)


def _disjoint(invs: Sequence[Inventory]) -> bool:
    return all(_apart(x, y) for k, x in enumerate(invs) for y in invs[k + 1:])


def _joined_parts(paths: Sequence[str], invs: Sequence[Optional[Inventory]], part: List[int]) -> List[int]:
    """Indices joined around the files that cannot stand alone: those files together when that
    completes them, else every readable file; refused when even that lacks a variable."""
    def have(idx: Sequence[int]) -> List[str]:
        return sorted(set().union(*(set(_used(invs[i])) for i in idx)))  # type: ignore[arg-type]

    if len(part) > 1 and not lacking_variables(have(part)):
        return part
    every = [i for i, inv in enumerate(invs) if inv is not None]
    missing = lacking_variables(have(every))
    if missing:
        raise SeawayInputError(
            f"{', '.join(paths[i] for i in part)} cannot stand alone (no height, period or direction) and "
            f"the files {', '.join(paths[i] for i in every)} together still lack {' and '.join(missing)}: "
            "add the missing variable's file or name the sources (SOURCE_NAMES)")
    return every


def _auto(paths: Sequence[str]) -> List[SourceGroup]:
    """Groups without names (module docstring)."""
    invs = [_probe(p) for p in paths]
    part = [i for i, inv in enumerate(invs) if inv is not None and lacking_variables(_used(inv))]
    slots: Dict[int, SourceGroup] = {}
    taken = set(_joined_parts(paths, invs, part)) if part and len(paths) > 1 else set()
    if taken:
        first = min(taken)
        slots[first] = SourceGroup(_stem(paths[first]), tuple(paths[i] for i in sorted(taken)),
                                   "a file cannot stand alone: variables joined")
    series: Dict[tuple, List[int]] = {}
    for i, inv in enumerate(invs):
        if i not in taken and inv is not None and not lacking_variables(_used(inv)) and inv.variables:
            series.setdefault(_series_key(inv), []).append(i)
    for idx in series.values():
        if len(idx) > 1 and _disjoint([invs[i] for i in idx]):  # type: ignore[misc]
            slots[idx[0]] = SourceGroup(_stem(paths[idx[0]]), tuple(paths[i] for i in idx),
                                        "same variables and grid, other times or members: joined")
            taken |= set(idx)
    for i, p in enumerate(paths):
        if i not in taken:
            slots[i] = SourceGroup(_stem(p), (p,))
    return [slots[i] for i in sorted(slots)]


def group_forecast_files(paths: Sequence[str], names: Sequence[str] = ()) -> List[SourceGroup]:
    """The sources formed by ``paths`` (with one name per file, or none; module docstring)."""
    paths = [os.fspath(p) for p in paths]
    if not paths:
        raise SeawayInputError("no forecast files given")
    names = [str(n).strip() for n in names]
    if not names and len(paths) == 1:  # one file is one source: nothing to join, no need to read it twice
        return [SourceGroup(_stem(paths[0]), (paths[0],))]
    return _by_name(paths, names) if names else _auto(paths)


def open_grouped_sources(paths: Sequence[str], names: Sequence[str] = (), **kwargs: object
                         ) -> Tuple[List[SeaStateSource], List[str]]:
    """Open every source of :func:`group_forecast_files` with :func:`.source.open_sea_state`
    (``kwargs`` passed on); returns the sources and one log line per join."""
    groups = group_forecast_files(paths, names)
    log = [f"source {show(g.name)}: {len(g.paths)} files joined ({g.reason}): {', '.join(g.paths)}"
           for g in groups if len(g.paths) > 1]
    sources = []
    for g in groups:
        try:
            sources.append(open_sea_state(list(g.paths), source_name=g.name, **kwargs))  # type: ignore[arg-type]
        except SeawayInputError as exc:
            if len(g.paths) == 1:
                raise
            raise SeawayInputError(f"source {show(g.name)} ({', '.join(g.paths)}): {exc}") from None
    return sources, log
