# SPDX-License-Identifier: GPL-2.0-or-later
"""A real Dask cluster on loopback for benchmarks and tests: ``dask scheduler`` and ``dask
worker`` started as separate processes with the command-line tools (as Dask's documentation
describes), every process able to import ``seaway_comfort`` through PYTHONPATH (current Dask
unpickles the task graph on the scheduler too), stopped again by :meth:`LoopbackCluster.stop`.
"""
from __future__ import annotations

import os
import shutil
import signal
import socket
import subprocess
import sys
import tempfile
import time
from pathlib import Path
from typing import List, Optional


def _free_port() -> int:
    s = socket.socket()
    s.bind(("127.0.0.1", 0))
    port = s.getsockname()[1]
    s.close()
    return port


def dask_cli() -> Optional[str]:
    """The ``dask`` command next to this Python, else on PATH (None when there is none)."""
    here = Path(sys.executable).with_name("dask")
    return str(here) if here.is_file() else shutil.which("dask")


class LoopbackCluster:
    """Scheduler and ``n_workers`` single-threaded workers on 127.0.0.1 (context manager)."""

    def __init__(self, package_parent: str, n_workers: int = 2, timeout_s: float = 60.0) -> None:
        self.address = f"tcp://127.0.0.1:{_free_port()}"
        self._procs: List[subprocess.Popen] = []
        self._log = tempfile.mkdtemp(prefix="seaway_dask_")
        env = dict(os.environ)
        env["PYTHONPATH"] = os.pathsep.join([package_parent] + [p for p in env.get("PYTHONPATH", "").split(os.pathsep) if p])
        cli = dask_cli()
        if cli is None:
            raise RuntimeError("the `dask` command-line tool is not installed")
        port = self.address.rsplit(":", 1)[1]
        self._start([cli, "scheduler", "--host", "127.0.0.1", "--port", port, "--no-dashboard"], env, "scheduler")
        for k in range(n_workers):
            self._start([cli, "worker", self.address, "--nthreads", "1", "--nworkers", "1", "--no-dashboard",
                         "--host", "127.0.0.1", "--name", f"w{k}"], env, f"worker{k}")
        self._wait(n_workers, timeout_s)

    def _start(self, cmd: List[str], env: dict, name: str) -> None:
        log = open(os.path.join(self._log, f"{name}.log"), "wb")
        self._procs.append(subprocess.Popen(cmd, env=env, stdout=log, stderr=subprocess.STDOUT,
                                            start_new_session=True))

    def _wait(self, n_workers: int, timeout_s: float) -> None:
        from distributed import Client

        t0 = time.monotonic()
        while True:
            try:
                with Client(self.address, timeout="5s") as c:
                    c.wait_for_workers(n_workers, timeout=max(1.0, timeout_s - (time.monotonic() - t0)))
                    return
            except (OSError, TimeoutError):
                if time.monotonic() - t0 > timeout_s:
                    self.stop()
                    raise RuntimeError(f"the loopback Dask cluster did not start; logs in {self._log}")
                time.sleep(0.5)

    def stop(self) -> None:
        """Stop the workers, then the scheduler (SIGTERM to each process we started, then kill)."""
        for p in reversed(self._procs):
            if p.poll() is None:
                os.killpg(p.pid, signal.SIGTERM)
        for p in reversed(self._procs):
            try:
                p.wait(timeout=15)
            except subprocess.TimeoutExpired:
                os.killpg(p.pid, signal.SIGKILL)
                p.wait()
        self._procs.clear()
        shutil.rmtree(self._log, True)

    def __enter__(self) -> "LoopbackCluster":
        return self

    def __exit__(self, *exc: object) -> None:
        self.stop()
