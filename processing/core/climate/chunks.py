# SPDX-License-Identifier: GPL-2.0-or-later
"""One chunk of hindcast time: the task a worker receives and the partial sums it returns.

A chunk owns the departure/start steps [a, b) of the series. It classifies steps
[a, min(b + P + 1, N)) where P is the passage length in steps (the overlap the weather-window
analysis needs, :mod:`.windows`), but counts per-sample monthly statistics only over [a, b), so
every step is counted exactly once whatever the chunking. All partial results are integer
counts; :func:`.monthly.reduce_chunks` adds them in chunk order, so serial, process-pool and
Dask runs give identical results.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import List, Optional, Sequence, Tuple

import numpy as np
from numpy.typing import NDArray

from ..validation import SeawayInputError, require_positive, show
from .engine import ClimateSetup, classify_steps
from .windows import N_MONTHS, WaitPartial, departure_status, waiting_partial

__all__ = ["ChunkTask", "ChunkResult", "plan_chunks", "run_chunk", "month_index", "DEFAULT_CHUNK_STEPS"]

DEFAULT_CHUNK_STEPS: int = 1464
"""Default departure steps per chunk (about half a year of 3-hourly data)."""

N_CLASS_BINS = 6
"""Class histogram bins: missing, then classes 0..4."""


@dataclass(frozen=True)
class ChunkTask:
    """Work of one chunk: ``index`` (order of reduction), departure steps [``a``, ``b``) and
    the setup whose ``series`` holds ONLY the steps [a, c) this chunk reads (c = b + overlap,
    clipped to the data end); ``steps_after`` = steps of the full series after step c."""

    index: int
    a: int
    b: int
    c: int
    steps_after: int
    setup: ClimateSetup


@dataclass(frozen=True)
class MonthlyCounts:
    """Integer counts per calendar month (months 0..11): see :class:`ChunkResult`."""

    class_counts: NDArray[np.int64]
    exceed_counts: NDArray[np.int64]
    limit_counts: NDArray[np.int64]
    implausible_counts: NDArray[np.int64]
    steps: NDArray[np.int64]
    dep_ok: NDArray[np.int64]
    dep_known: NDArray[np.int64]
    dep_unknown: NDArray[np.int64]
    dep_past_end: NDArray[np.int64]


@dataclass(frozen=True)
class ChunkResult(MonthlyCounts):
    """Integer partial sums of one chunk (global step indices; months 0..11).

    ``class_counts`` (12, n, 6): steps per month, sample and bin (missing, class 0..4);
    ``exceed_counts`` (12, n) criteria exceeded; ``limit_counts`` (12, n) method limit;
    ``implausible_counts`` (12, n); ``steps`` (12,) steps of the chunk per month;
    ``dep_ok`` / ``dep_known`` / ``dep_unknown`` / ``dep_past_end`` (12,) departures;
    ``wait`` the waiting-time partial.
    """

    index: int
    a: int
    b: int
    wait: WaitPartial


def month_index(start_s: int, step_s: int, a: int, b: int) -> NDArray[np.int64]:
    """Calendar month 0..11 (UTC) of steps [a, b) of a series starting at ``start_s``."""
    t = (np.int64(start_s) + np.arange(a, b, dtype=np.int64) * np.int64(step_s)).astype("datetime64[s]")
    return (t.astype("datetime64[M]").astype(np.int64) % 12).astype(np.int64)


def plan_chunks(setup: ClimateSetup, chunk_steps: int = DEFAULT_CHUNK_STEPS) -> List[ChunkTask]:
    """Split the series into chunks of ``chunk_steps`` departure steps with the passage overlap."""
    cs = int(require_positive("chunk_steps", chunk_steps))
    if cs != float(chunk_steps):
        raise SeawayInputError(f"chunk_steps must be a whole number, got {show(chunk_steps)}")
    n_all = setup.series.n_steps
    p = setup.passage_steps
    tasks: List[ChunkTask] = []
    from dataclasses import replace

    for k, a in enumerate(range(0, n_all, cs)):
        b = min(n_all, a + cs)
        c = min(n_all, b + p + 1)
        sub = replace(setup, series=setup.series.slice(a, c))
        tasks.append(ChunkTask(index=k, a=a, b=b, c=c, steps_after=n_all - c, setup=sub))
    return tasks


def _count(months: NDArray[np.int64], values: NDArray[np.bool_]) -> NDArray[np.int64]:
    """(12, n) number of True per month and sample."""
    nt, n = values.shape
    key = (months[:, None] * n + np.arange(n)[None, :])[values]
    return np.bincount(key, minlength=N_MONTHS * n).reshape(N_MONTHS, n).astype(np.int64)


def run_chunk(task: ChunkTask) -> ChunkResult:
    """Classify the chunk's steps and return its partial sums (runs in any process)."""
    s = task.setup
    nd = task.b - task.a
    from .hindcast import process_reader

    sc = classify_steps(s, 0, task.c - task.a, reader=process_reader())
    n = s.n
    own = slice(0, nd)
    cls = sc.comfort_class
    months = month_index(s.series.start_s, s.series.step_s, 0, nd)
    key = ((months[:, None] * n + np.arange(n)[None, :]) * N_CLASS_BINS + (cls[own].astype(np.int64) + 1)).ravel()
    cc = np.bincount(key, minlength=N_MONTHS * n * N_CLASS_BINS).reshape(N_MONTHS, n, N_CLASS_BINS).astype(np.int64)
    st = np.bincount(months, minlength=N_MONTHS).astype(np.int64)
    ds = departure_status(cls, s.offset_steps, nd, s.max_class, steps_after_block=task.steps_after)
    ok = np.bincount(months[ds.acceptable], minlength=N_MONTHS).astype(np.int64)
    kn = np.bincount(months[ds.known], minlength=N_MONTHS).astype(np.int64)
    pe = np.bincount(months[ds.past_end & ~ds.known], minlength=N_MONTHS).astype(np.int64)
    return ChunkResult(
        index=task.index, a=task.a, b=task.b, class_counts=cc,
        exceed_counts=_count(months, sc.exceeded[own]), limit_counts=_count(months, sc.method_limit[own]),
        implausible_counts=_count(months, sc.implausible[own]), steps=st, dep_ok=ok, dep_known=kn,
        dep_unknown=st - kn, dep_past_end=pe, wait=waiting_partial(ds.acceptable, months, task.a, known=ds.known),
    )
