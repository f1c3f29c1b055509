# SPDX-License-Identifier: GPL-2.0-or-later
"""Where the chunks run: in this process, in a local process pool, or on a Dask cluster.

Every backend maps :func:`.chunks.run_chunk` over the chunk tasks and returns the results in
CHUNK ORDER; the reduction (:func:`.monthly.reduce_chunks`) sorts by chunk index and adds
integers, so all backends give identical results.

* :class:`SerialBackend` - one chunk after another in this process.
* :class:`LocalPoolBackend` - :class:`concurrent.futures.ProcessPoolExecutor` with ``workers``
  processes: "spawn" start method with this Python (:func:`python_executable`) when running as
  a plain Python; "fork" when Python is embedded (QGIS, qgis_process) on Linux/macOS, because a
  freshly started interpreter may pick up another installation's standard library there (seen
  with qgis_process and a pyenv Python on PATH). Workers never touch Qt.
* :class:`DaskBackend` - ``dask.distributed``: a user-supplied scheduler address
  (``tcp://host:8786``) or, when none is given, a :class:`distributed.LocalCluster` of
  ``workers`` processes (or threads with ``processes=False``). Dask is imported only here and
  only when this backend is used; the workers need this package importable (a remote
  cluster: install the plugin's folder on the workers' Python path) and numpy/scipy/pyproj/GDAL
  but never QGIS. An unreachable scheduler raises :class:`..validation.SeawayInputError`; with
  ``fallback_local=True`` the local pool is used instead and the fallback is stated in the
  result's notes.

Progress: ``progress(fraction) -> bool`` after each finished chunk; False cancels the rest
(:class:`ClimateCancelled`).

What a Dask worker pays once, not per chunk: the setup common to all chunks (route, weights,
response table) is sent once with ``scatter(broadcast=True)`` and kept in each worker's memory;
each task carries only its chunk bounds and time slice (:func:`run_light_chunk`). The open
hindcast files stay open per worker thread (:func:`.hindcast.process_reader`). And the memory
allocator: Dask's nanny starts workers with ``MALLOC_TRIM_THRESHOLD_=65536``, which makes
glibc return every large numpy buffer to the system and fault it in again on the next
allocation (measured: twice the CPU time of the same chunks in a plain process, most of it in
the kernel); :func:`tune_worker_process` restores large thresholds with ``mallopt`` once per
worker process (glibc only; elsewhere nothing changes).
"""
from __future__ import annotations

import os
import sys
from dataclasses import dataclass, field, replace
from typing import Any, Callable, List, Optional, Sequence

from ..validation import SeawayInputError, show
from .chunks import ChunkResult, ChunkTask, run_chunk

__all__ = ["ClimateCancelled", "SerialBackend", "LocalPoolBackend", "DaskBackend", "make_backend",
           "python_executable", "dask_available", "tune_worker_process", "run_light_chunk"]

Progress = Callable[[float], Optional[bool]]


class ClimateCancelled(Exception):
    """The progress callback asked to stop."""


def _tick(progress: Optional[Progress], done: int, total: int) -> None:
    if progress is not None and progress(done / max(total, 1)) is False:
        raise ClimateCancelled("seasonal climate computation cancelled")


def dask_available() -> bool:
    """True when ``dask.distributed`` can be imported."""
    try:
        import distributed  # noqa: F401
    except Exception:
        return False
    return True


def own_interpreter() -> bool:
    """True when ``sys.executable`` is a Python of THIS installation (its real path lies under
    ``sys.base_prefix``; a venv's python links there). False when Python is embedded (QGIS,
    qgis_process), where ``sys.executable`` may be the application or another Python found on
    PATH (seen: qgis_process reporting a pyenv python3, whose workers then failed to import
    numpy)."""
    exe = sys.executable or ""
    if not os.path.basename(exe).lower().startswith("python") or not os.path.isfile(exe):
        return False
    real = os.path.realpath(exe)
    base = os.path.realpath(sys.base_prefix)
    return real.startswith(base.rstrip(os.sep) + os.sep)


def python_executable() -> str:
    """A Python interpreter for worker processes: the one this process runs on.

    ``sys.executable`` when it is a Python of this installation (:func:`own_interpreter`); inside an application that embeds Python (QGIS,
    qgis_process) it is the application, so the interpreter of the SAME installation is taken
    from the compiled-in ``sysconfig`` BINDIR (e.g. /usr/bin/python3.11 for the libpython QGIS
    links), then ``<exec_prefix>/bin``. A same-named Python elsewhere on PATH (pyenv, conda)
    would have another standard library and is never used.
    """
    import sysconfig

    exe = sys.executable or ""
    if own_interpreter():
        return exe
    ver = f"python{sys.version_info.major}.{sys.version_info.minor}"
    bindir = sysconfig.get_config_var("BINDIR") or ""
    for cand in (os.path.join(bindir, ver), os.path.join(bindir, "python3"),
                 os.path.join(sys.base_exec_prefix, "bin", ver), os.path.join(sys.exec_prefix, "bin", ver),
                 os.path.join(sys.exec_prefix, "python.exe")):
        if cand and os.path.isfile(cand):
            return cand
    raise SeawayInputError(
        f"no Python interpreter of this installation found for worker processes (looked in {show(bindir)} "
        f"and {show(sys.exec_prefix)}); use WORKERS=1 / --workers 1"
    )


@dataclass(frozen=True)
class SerialBackend:
    """Run every chunk in this process."""

    name: str = "serial"

    def map(self, tasks: Sequence[ChunkTask], progress: Optional[Progress] = None) -> List[ChunkResult]:
        from .hindcast import close_process_readers

        out: List[ChunkResult] = []
        try:
            for k, t in enumerate(tasks):
                out.append(run_chunk(t))
                _tick(progress, k + 1, len(tasks))
        finally:
            close_process_readers()  # release the files when the computation is done
        return out


@dataclass(frozen=True)
class LocalPoolBackend:
    """A local process pool of ``workers`` processes (spawned, see module docstring)."""

    workers: int = 2
    name: str = "local"

    def __post_init__(self) -> None:
        if not isinstance(self.workers, int) or self.workers < 1:
            raise SeawayInputError(f"workers must be a whole number >= 1, got {show(self.workers)}")

    def map(self, tasks: Sequence[ChunkTask], progress: Optional[Progress] = None) -> List[ChunkResult]:
        if self.workers == 1 or len(tasks) <= 1:
            return SerialBackend().map(tasks, progress)
        import multiprocessing as mp
        from concurrent.futures import ProcessPoolExecutor, as_completed

        if not own_interpreter() and os.name == "posix":
            # inside QGIS / qgis_process: a fresh interpreter could pick up another Python's
            # standard library from the host's paths; fork the worker from this process instead
            # (the workers run numpy/GDAL only and open their own files, never Qt)
            ctx = mp.get_context("fork")
            try:  # helper processes (resource tracker) are still started from an executable
                ctx.set_executable(python_executable())
            except SeawayInputError:
                pass
        else:
            ctx = mp.get_context("spawn")
            ctx.set_executable(python_executable())
        results: List[Optional[ChunkResult]] = [None] * len(tasks)
        with ProcessPoolExecutor(max_workers=min(self.workers, len(tasks)), mp_context=ctx) as ex:
            futs = {ex.submit(run_chunk, t): k for k, t in enumerate(tasks)}
            done = 0
            try:
                for f in as_completed(futs):
                    results[futs[f]] = f.result()
                    done += 1
                    _tick(progress, done, len(tasks))
            except BaseException:
                for f in futs:
                    f.cancel()
                raise
        return [r for r in results if r is not None]


_TUNED = False
_M_TRIM_THRESHOLD, _M_MMAP_THRESHOLD = -1, -3  # glibc <malloc.h> mallopt parameters
_TRIM_BYTES, _MMAP_BYTES = 256 * 1024 * 1024, 32 * 1024 * 1024


def tune_worker_process() -> bool:
    """Once per process: where ``MALLOC_TRIM_THRESHOLD_`` is set (Dask's nanny does), raise
    glibc's trim threshold to 256 MiB and its mmap threshold to 32 MiB (the largest glibc
    accepts on 64-bit) so numpy buffers are reused instead of faulted in anew (module
    docstring). Returns True when the thresholds were set."""
    global _TUNED
    if _TUNED:
        return False
    _TUNED = True
    if not sys.platform.startswith("linux") or "MALLOC_TRIM_THRESHOLD_" not in os.environ:
        return False
    try:
        import ctypes

        libc = ctypes.CDLL("libc.so.6")
        return bool(libc.mallopt(_M_TRIM_THRESHOLD, _TRIM_BYTES)) and bool(libc.mallopt(_M_MMAP_THRESHOLD, _MMAP_BYTES))
    except (OSError, AttributeError):  # not glibc
        return False


def run_light_chunk(shared: Any, task: ChunkTask) -> ChunkResult:
    """:func:`.chunks.run_chunk` on a worker: ``shared`` the setup common to all chunks (sent once
    per worker), ``task`` a chunk whose setup holds only its time slice (see DaskBackend)."""
    tune_worker_process()
    return run_chunk(replace(task, setup=replace(shared, series=task.setup.series)))


def _light_tasks(tasks: Sequence[ChunkTask]) -> Any:
    """The setup common to all chunks and the chunks without it (only their time slice)."""
    shared = tasks[0].setup
    light = [replace(t, setup=_SliceOnly(t.setup.series)) for t in tasks]
    return shared, light


@dataclass(frozen=True)
class _SliceOnly:
    """Stand-in for a chunk's setup carrying only its hindcast time slice."""

    series: Any


@dataclass(frozen=True)
class DaskBackend:
    """``dask.distributed`` cluster (module docstring). ``address`` None = a LocalCluster."""

    address: Optional[str] = None
    workers: int = 2
    processes: bool = True
    threads_per_worker: int = 1
    fallback_local: bool = False
    connect_timeout_s: float = 10.0
    name: str = "dask"
    notes: List[str] = field(default_factory=list, compare=False)

    def _client(self):  # type: ignore[no-untyped-def]
        try:
            from distributed import Client, LocalCluster
        except Exception as exc:
            raise SeawayInputError(
                f"the Dask backend needs the Python package 'distributed' (dask.distributed), which is "
                f"not importable here ({exc}); install it or use the local backend"
            ) from None
        if self.address:
            try:
                client = Client(self.address, timeout=f"{float(self.connect_timeout_s)}s")
            except (OSError, TimeoutError, ValueError) as exc:
                raise SeawayInputError(
                    f"the Dask scheduler at {show(self.address)} cannot be reached "
                    f"({type(exc).__name__}: {exc}); check the address (tcp://host:port) and that the "
                    "scheduler runs"
                ) from None
            return client, None
        cluster = LocalCluster(n_workers=int(self.workers), threads_per_worker=int(self.threads_per_worker),
                               processes=bool(self.processes), dashboard_address=None)
        return Client(cluster), cluster

    def map(self, tasks: Sequence[ChunkTask], progress: Optional[Progress] = None) -> List[ChunkResult]:
        self.notes.clear()  # notes of this run only
        if not tasks:
            return []
        try:
            client, cluster = self._client()
        except SeawayInputError as exc:
            if not (self.fallback_local and self.address):
                raise
            self.notes.append(f"{exc}; computed on the local process pool instead (fallback requested)")
            return LocalPoolBackend(workers=max(1, int(self.workers))).map(tasks, progress)
        try:
            from distributed import as_completed

            shared, light = _light_tasks(tasks)
            shared_f = client.scatter(shared, broadcast=True, hash=False)
            futs = [client.submit(run_light_chunk, shared_f, t, pure=False) for t in light]
            pos = {f.key: k for k, f in enumerate(futs)}
            results: List[Optional[ChunkResult]] = [None] * len(tasks)
            done = 0
            try:
                for f in as_completed(futs):
                    results[pos[f.key]] = f.result()
                    done += 1
                    _tick(progress, done, len(tasks))
            except BaseException:
                client.cancel(futs)
                raise
            return [r for r in results if r is not None]
        finally:
            client.close()
            if cluster is not None:
                cluster.close()
            from .hindcast import close_process_readers

            close_process_readers()  # in-process (thread) workers opened files here


def make_backend(kind: str = "local", *, workers: int = 2, scheduler: Optional[str] = None,
                 fallback_local: bool = False, processes: bool = True):  # type: ignore[no-untyped-def]
    """Backend by name: "serial", "local" (process pool) or "dask" (scheduler address or a
    LocalCluster). A scheduler address implies "dask"."""
    k = (kind or "local").lower()
    if scheduler:
        k = "dask"
    if k == "serial":
        return SerialBackend()
    if k == "local":
        return LocalPoolBackend(workers=int(workers))
    if k == "dask":
        return DaskBackend(address=scheduler or None, workers=int(workers), fallback_local=bool(fallback_local),
                           processes=bool(processes))
    raise SeawayInputError(f"backend must be 'serial', 'local' or 'dask', got {show(kind)}")
