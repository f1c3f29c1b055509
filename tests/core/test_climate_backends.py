# SPDX-License-Identifier: GPL-2.0-or-later
"""Serial, local process pool and Dask give the same climate, exactly; cluster errors are clear.

Reference: the serial in-process computation (itself checked by hand in
test_climate_seasonal.py). Equality is exact (assert_array_equal, NaN == NaN) because every
partial result is an integer count added in chunk order. The Dask test runs a
distributed.LocalCluster in this process (processes=False) on small data; it is skipped, with
the reason shown, only when dask.distributed cannot be imported.
"""
from __future__ import annotations

import socket

import numpy as np
import pytest

from seaway_comfort.processing.core import climate as C
from seaway_comfort.processing.core.climate.backends import dask_available, python_executable
from seaway_comfort.processing.core.demo.synthetic_hindcast import (
    SeasonalCycle,
    write_seasonal_hindcast,
)
from seaway_comfort.processing.core.validation import SeawayInputError

FIELDS = ("class_share", "ok_share", "exceed_share", "valid_steps", "missing_steps", "route_class_share",
          "route_ok_share", "window_probability", "departures_known", "departures_ok", "mean_wait_h",
          "wait_censored", "departures_past_end", "steps")


@pytest.fixture(scope="module")
def series(tmp_path_factory):
    folder = tmp_path_factory.mktemp("backends")
    t = np.arange(np.datetime64("2030-05-01T00"), np.datetime64("2030-05-04T00"), np.timedelta64(3, "h"))
    paths = write_seasonal_hindcast(str(folder), [2030, 2031], cycle=SeasonalCycle(hs_mean_m=1.0, hs_amp_m=0.8),
                                    drop=t)  # a 3-day gap in 2030 as well
    return C.open_hindcast(paths)


def _run(series, backend, chunk_steps=600):
    return C.compute_climate([-9.0, -7.0], [40.5, 43.5], series, "coastal_survey_35m", speed_kn=9.0,
                             max_class=1, backend=backend, chunk_steps=chunk_steps)


@pytest.fixture(scope="module")
def reference(series):
    return _run(series, C.SerialBackend())


def _same(a, b):
    for f in FIELDS:
        np.testing.assert_array_equal(getattr(a, f), getattr(b, f), err_msg=f)


def test_reference_is_not_trivial(reference):
    # guards the equality tests: mixed outcomes, a gap, censored waits
    assert np.nanmin(reference.route_ok_share) < 0.5 < np.nanmax(reference.route_ok_share)
    assert reference.missing_steps.sum() > 0
    assert reference.wait_censored.sum() > 0


def test_local_pool_equals_serial(series, reference):
    _same(_run(series, C.LocalPoolBackend(workers=2)), reference)


def test_dask_local_cluster_in_process_equals_serial(series, reference):
    if not dask_available():
        pytest.skip("dask.distributed is not importable in this Python: Dask backend not tested")
    be = C.DaskBackend(workers=2, processes=False)
    r = _run(series, be, chunk_steps=450)  # other chunking as well
    _same(r, reference)
    assert r.backend == "dask"


def _free_port() -> int:
    s = socket.socket()
    s.bind(("127.0.0.1", 0))
    port = s.getsockname()[1]
    s.close()
    return port


def test_unreachable_scheduler_clear_error_and_fallback_only_when_asked(series, reference):
    if not dask_available():
        pytest.skip("dask.distributed is not importable in this Python: Dask backend not tested")
    addr = f"tcp://127.0.0.1:{_free_port()}"  # nothing listens there
    with pytest.raises(SeawayInputError) as err:
        _run(series, C.DaskBackend(address=addr, connect_timeout_s=2.0))
    assert addr in str(err.value) and "cannot be reached" in str(err.value)
    r = _run(series, C.DaskBackend(address=addr, connect_timeout_s=2.0, fallback_local=True, workers=1))
    _same(r, reference)
    assert any("fallback" in n and addr in n for n in r.notes)


def test_backend_factory_and_bad_values():
    assert isinstance(C.make_backend("serial"), C.SerialBackend)
    assert isinstance(C.make_backend("local", workers=3), C.LocalPoolBackend)
    assert isinstance(C.make_backend("local", scheduler="tcp://h:1"), C.DaskBackend)
    with pytest.raises(SeawayInputError, match="backend"):
        C.make_backend("gpu")
    with pytest.raises(SeawayInputError, match="workers"):
        C.LocalPoolBackend(workers=0)
    assert "python" in python_executable().rsplit("/", 1)[-1]


def test_cancel_via_progress(series):
    from seaway_comfort.processing.core.climate import ClimateCancelled

    seen = []

    def progress(f):
        seen.append(f)
        return len(seen) < 2

    with pytest.raises(ClimateCancelled):
        C.compute_climate([-9.0, -7.0], [40.5, 43.5], series, "coastal_survey_35m", speed_kn=9.0,
                          backend=C.SerialBackend(), chunk_steps=600, progress=progress)
    assert len(seen) == 2 and 0 < seen[0] < seen[1] < 1


def test_real_scheduler_and_two_worker_processes_equal_serial(series, reference, package_parent):
    """`dask scheduler` and two `dask worker` processes on loopback, started with Dask's
    command-line tools; the climate equals the serial run exactly."""
    import sys
    from pathlib import Path

    if not dask_available():
        pytest.skip("dask.distributed is not importable in this Python: Dask backend not tested")
    sys.path.insert(0, str(Path(__file__).resolve().parent.parent / "bench"))
    from _dask_cli import LoopbackCluster, dask_cli

    if dask_cli() is None:
        pytest.skip("the `dask` command-line tool is not installed next to this Python")
    with LoopbackCluster(str(package_parent), n_workers=2) as cl:
        r = _run(series, C.DaskBackend(address=cl.address), chunk_steps=500)
    _same(r, reference)


@pytest.mark.parametrize("env, tuned", [({"MALLOC_TRIM_THRESHOLD_": "65536"}, True), ({}, False)])
def test_worker_allocator_tuned_only_under_dask_nanny_setting(env, tuned, package_parent):
    """glibc's thresholds are raised once per process, only where Dask's nanny set
    MALLOC_TRIM_THRESHOLD_ (backends.py docstring); a second call does nothing."""
    import subprocess
    import sys

    if not sys.platform.startswith("linux"):
        pytest.skip("mallopt is glibc-only")
    code = ("from seaway_comfort.processing.core.climate.backends import tune_worker_process as t\n"
            "print(t(), t())\n")
    out = subprocess.run([sys.executable, "-P", "-c", code], capture_output=True, text=True, check=False,
                         env={**env, "PYTHONPATH": str(package_parent), "PATH": "/usr/bin:/bin"})
    assert out.stdout.split() == [str(tuned), "False"], out.stdout + out.stderr
