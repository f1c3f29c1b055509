# SPDX-License-Identifier: GPL-2.0-or-later
"""Weather windows along the moving vessel's timeline (persistence analysis) and waiting times.

Persistence of a sea-state condition over the duration of an operation is the classical
weather-window question (e.g. DNV-OS-H101 (2011) "Marine Operations, General", s.4, weather
windows of a given duration; Graham 1982, "The parameterisation and prediction of wave height
and wind speed persistence statistics for oil industry operational planning purposes",
Coastal Engineering 6, 303-329; both references from memory). Here the condition is not fixed at one place: the vessel
moves along the route.

Definitions used (our choices, stated in every output):

* A passage departs at a hindcast step j (time t_j) and reaches route sample i at
  t_j + elapsed_i. The hindcast class used there is that of the NEAREST hindcast step,
  j + round(elapsed_i / step) (no interpolation of classes in time; the time error is at most
  half a step).
* The departure is ACCEPTABLE when every sample's class along that timeline is known and
  <= MAX_CLASS; UNACCEPTABLE when all are known and one is worse; UNKNOWN when a class on the
  timeline is missing (gap, no data) or the passage would end after the last hindcast step
  (such departures are not counted in the window probability and reported separately).
* Window probability of a calendar month m = acceptable departures / (acceptable +
  unacceptable departures) among the departure steps in month m (all years pooled).
* Waiting time: a start time uniformly distributed over the hindcast steps of month m (the
  discrete analogue of a random start in the month); the wait is the time to the next
  ACCEPTABLE departure at or after it (0 when the start itself is acceptable). A start whose
  wait reaches an UNKNOWN departure (missing data, or the data end) before an acceptable one is
  CENSORED: the missing data may have held a window, so the wait is not known; censored starts
  are not in the mean and their count is reported. A month without data thus has no mean wait.

Chunked evaluation: departures are processed in chunks of steps; a chunk needs the classes
of its own steps plus the passage length after them (the overlap). Waiting times that run past
a chunk are carried by :class:`WaitPartial` (count and sum of the start indices still waiting)
and resolved exactly by :func:`merge_waits` with the next chunk's first acceptable departure;
all sums are integers, so the result does not depend on how the steps were chunked.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Iterable, Optional

import numpy as np
from numpy.typing import NDArray

from ..validation import SeawayInputError

__all__ = ["DepartureStatus", "departure_status", "WaitPartial", "waiting_partial", "WaitTotals", "merge_waits"]

N_MONTHS = 12


@dataclass(frozen=True)
class DepartureStatus:
    """Per departure step: ``acceptable``, ``known`` (every class on the timeline known and the
    passage inside the data) and ``past_end`` (passage would end after the data end)."""

    acceptable: NDArray[np.bool_]
    known: NDArray[np.bool_]
    past_end: NDArray[np.bool_]


def departure_status(
    classes: NDArray[np.int8],
    offset_steps: NDArray[np.int64],
    n_departures: int,
    max_class: int,
    *,
    steps_after_block: int = 0,
) -> DepartureStatus:
    """Status of departures at block rows 0..n_departures-1 (module docstring).

    ``classes`` (L, n) comfort classes of consecutive steps (-1 missing), row 0 = first
    departure; ``offset_steps`` (n,) steps from departure to each sample (>= 0).
    ``steps_after_block``: hindcast steps that exist after the block's last row; departures
    whose timeline leaves both the block and the data are ``past_end``; leaving only the block
    is an error (the caller must give the overlap).
    """
    c = np.asarray(classes)
    off = np.asarray(offset_steps, dtype=np.int64)
    if c.ndim != 2 or off.shape != (c.shape[1],):
        raise SeawayInputError(f"classes {c.shape} and offset_steps {off.shape} do not match")
    if np.any(off < 0):
        raise SeawayInputError("offset_steps must be >= 0")
    nd = int(n_departures)
    L = c.shape[0]
    need = nd + int(off.max()) if nd else 0
    if need > L and steps_after_block > 0:
        raise SeawayInputError(
            f"classes hold {L} steps but {need} are needed for {nd} departures (give the passage overlap)"
        )
    good = (c >= 0) & (c <= int(max_class))
    known_c = c >= 0
    acc = np.ones(nd, dtype=bool)
    kn = np.ones(nd, dtype=bool)
    last = L - 1
    for i in np.unique(off):
        cols = np.flatnonzero(off == i)
        o = int(i)
        hi = min(nd, max(0, L - o))  # departures whose row j + o exists
        if hi > 0:
            acc[:hi] &= good[o:o + hi][:, cols].all(axis=1)
            kn[:hi] &= known_c[o:o + hi][:, cols].all(axis=1)
        acc[hi:] = False
        kn[hi:] = False
    past = (np.arange(nd) + int(off.max()) > last) if nd else np.zeros(0, dtype=bool)
    acc &= kn
    return DepartureStatus(acceptable=acc, known=kn, past_end=past)


@dataclass(frozen=True)
class WaitPartial:
    """Waiting-time partial sums of one chunk of start steps (global step indices).

    ``first_ok`` first acceptable departure in the chunk (-1 = none); per month (12,):
    ``resolved_steps`` sum of waits [steps] of starts whose next acceptable departure lies in
    the chunk, ``resolved_count`` their number, ``pending_count`` / ``pending_sum_j`` number and
    sum of the start indices still waiting at the chunk's end.
    """

    first_ok: int
    resolved_steps: NDArray[np.int64]
    resolved_count: NDArray[np.int64]
    pending_count: NDArray[np.int64]
    pending_sum_j: NDArray[np.int64]
    censored_count: NDArray[np.int64] = field(default_factory=lambda: np.zeros(N_MONTHS, dtype=np.int64))
    first_unknown: int = -1


def waiting_partial(acceptable: NDArray[np.bool_], month_index: NDArray[np.int64], j0: int,
                    known: Optional[NDArray[np.bool_]] = None) -> WaitPartial:
    """Waits of the start steps j0.. j0+len-1 inside one chunk (module docstring); ``known``
    False marks UNKNOWN departures (None: all known)."""
    ok = np.asarray(acceptable, dtype=bool)
    m = np.asarray(month_index, dtype=np.int64)
    unk = np.zeros(ok.shape, dtype=bool) if known is None else ~np.asarray(known, dtype=bool)
    if ok.shape != m.shape or unk.shape != ok.shape:
        raise SeawayInputError(f"acceptable {ok.shape}, month_index {m.shape} and known {unk.shape} differ in shape")
    ok = ok & ~unk
    pos = int(j0) + np.arange(ok.size, dtype=np.int64)
    nxt, nxu = _next_true(ok, pos), _next_true(unk, pos)
    res = nxt < nxu                       # an acceptable departure comes before any unknown one
    cen = nxu < nxt                       # the wait reaches missing data first
    pend = ~res & ~cen                    # neither within the chunk
    z = np.zeros(N_MONTHS, dtype=np.int64)
    rs, rc, pc, pj, cc = z.copy(), z.copy(), z.copy(), z.copy(), z.copy()
    np.add.at(rs, m[res], (nxt - pos)[res])
    np.add.at(rc, m[res], 1)
    np.add.at(cc, m[cen], 1)
    np.add.at(pc, m[pend], 1)
    np.add.at(pj, m[pend], pos[pend])
    first = int(pos[ok][0]) if ok.any() else -1
    first_unk = int(pos[unk][0]) if unk.any() else -1
    return WaitPartial(first, rs, rc, pc, pj, cc, first_unk)


def _next_true(flags: NDArray[np.bool_], pos: NDArray[np.int64]) -> NDArray[np.int64]:
    """Position of the first True at or after each position (int64 max when none)."""
    big = np.iinfo(np.int64).max
    return np.minimum.accumulate(np.where(flags, pos, big)[::-1])[::-1] if pos.size else pos


@dataclass(frozen=True)
class WaitTotals:
    """Per month (12,): ``sum_steps`` total wait [steps], ``count`` starts with a known wait,
    ``censored`` starts with no acceptable departure before the data end."""

    sum_steps: NDArray[np.int64]
    count: NDArray[np.int64]
    censored: NDArray[np.int64]


def merge_waits(parts: Iterable[WaitPartial]) -> WaitTotals:
    """Combine chunk partials IN TIME ORDER (exact integer arithmetic)."""
    s = np.zeros(N_MONTHS, dtype=np.int64)
    c = np.zeros(N_MONTHS, dtype=np.int64)
    pc = np.zeros(N_MONTHS, dtype=np.int64)
    pj = np.zeros(N_MONTHS, dtype=np.int64)
    cens = np.zeros(N_MONTHS, dtype=np.int64)
    for p in parts:
        if p.first_unknown >= 0 and (p.first_ok < 0 or p.first_unknown < p.first_ok):
            cens += pc             # the pending waits reach missing data first
            pc[:] = 0
            pj[:] = 0
        elif p.first_ok >= 0:
            s += pc * p.first_ok - pj
            c += pc
            pc[:] = 0
            pj[:] = 0
        s += p.resolved_steps
        c += p.resolved_count
        cens += p.censored_count
        pc += p.pending_count
        pj += p.pending_sum_j
    return WaitTotals(sum_steps=s, count=c, censored=pc + cens)
