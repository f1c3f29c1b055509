# SPDX-License-Identifier: GPL-2.0-or-later
"""Forecast files are probed in a child process: a file that kills GDAL becomes a clean error.

The damaged file is made here: a valid NetCDF-4 file written with GDAL, then the size field of
the last object in its HDF5 global heap (the heap holding the dimension-scale references) is given
a huge high byte. HDF5 file format specification, "Global Heap" (object header: index 2 B,
reference count 2 B, reserved 4 B, size 8 B, then the data). On the GDAL/HDF5 build of this
machine (GDAL 3.6, Debian 12) `gdalinfo` on that file dies with SIGSEGV (seen); the test first
checks that a plain GDAL read in a child dies, and is skipped where it does not.
"""
from __future__ import annotations

import os
import re
import signal
import struct
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

from seaway_comfort.processing.core.seastate import describe_file, open_bathymetry, open_sea_state, probe
from seaway_comfort.processing.core.validation import SeawayInputError

gdal = pytest.importorskip("osgeo.gdal")
gdal.UseExceptions()

PLAIN_READ = (
    "import sys\nfrom osgeo import gdal\ngdal.UseExceptions()\nds = gdal.Open(sys.argv[1])\n"
    "for n, _ in ds.GetSubDatasets() or [(sys.argv[1], '')]:\n"
    "    d = gdal.Open(n)\n"
    "    [d.GetRasterBand(b + 1).ReadRaster() for b in range(d.RasterCount)]\n"
)


@pytest.fixture(autouse=True)
def _own_cache(tmp_path, monkeypatch):
    monkeypatch.setenv("SEAWAY_COMFORT_CACHE_DIR", str(tmp_path / "cache"))
    probe.clear_probe_memory()
    yield
    probe.clear_probe_memory()


def _good_nc4(path: Path) -> Path:
    ds = gdal.GetDriverByName("netCDF").Create(str(path), 32, 32, 3, gdal.GDT_Float32,
                                                 options=["FORMAT=NC4", "COMPRESS=DEFLATE"])
    ds.SetGeoTransform([0, 0.25, 0, 8, 0, -0.25])
    for b in range(3):
        ds.GetRasterBand(b + 1).WriteArray(np.full((32, 32), 1.0 + b, dtype=np.float32))
    ds = None
    return path


def _corrupt_global_heap(good: Path, out: Path) -> Path:
    """Give the last global-heap object of ``good`` an impossible size (high byte 0xD8)."""
    data = bytearray(good.read_bytes())
    heap = data.find(b"GCOL")
    assert heap > 0, "the NetCDF-4 file has no HDF5 global heap"
    size = struct.unpack_from("<Q", data, heap + 8)[0]
    headers = {m.start() for m in re.finditer(b"OHDR", data)}
    refs = [i for i in range(heap + 16, heap + size - 8) if struct.unpack_from("<Q", data, i)[0] in headers]
    assert refs, "no object reference found in the global heap"
    data[refs[-1] - 1] = 0xD8  # last byte of the 8-byte size field just before the last reference
    out.write_bytes(bytes(data))
    return out


@pytest.fixture()
def crashing_nc(tmp_path) -> Path:
    bad = _corrupt_global_heap(_good_nc4(tmp_path / "good.nc"), tmp_path / "damaged.nc")
    run = subprocess.run([sys.executable, "-c", PLAIN_READ, str(bad)], capture_output=True, timeout=120)
    if run.returncode >= 0:
        pytest.skip(f"this GDAL/HDF5 build reads the damaged file without dying (status {run.returncode})")
    return bad


def test_damaged_netcdf4_is_refused_without_crashing(crashing_nc):
    for opener in (open_sea_state, describe_file, open_bathymetry):
        with pytest.raises(SeawayInputError) as err:
            opener(str(crashing_nc))
        msg = str(err.value)
        assert "damaged.nc" in msg and "killed the reader process" in msg
    assert os.getpid() > 0  # still here: this process never opened the file


def test_dead_child_by_signal_is_an_error_naming_the_file(tmp_path, monkeypatch):
    """Any signal, whatever the cause: the child kills itself here (POSIX signals)."""
    if not hasattr(signal, "SIGSEGV") or sys.platform.startswith("win"):
        pytest.skip("POSIX signals only")
    monkeypatch.setattr(probe, "_CHILD_CODE", "import os, signal\nos.kill(os.getpid(), signal.SIGSEGV)\n")
    f = _good_nc4(tmp_path / "forecast.nc")
    with pytest.raises(SeawayInputError, match=r"forecast file '.*forecast\.nc' is damaged.*signal 11"):
        probe.probe_raster_file(str(f), what="forecast file")


def test_good_file_is_probed_once_then_again_when_changed(tmp_path, monkeypatch):
    runs = []
    real = probe._run_child
    monkeypatch.setattr(probe, "_run_child", lambda p: runs.append(p) or real(p))
    f = _good_nc4(tmp_path / "good.nc")
    probe.probe_raster_file(str(f))
    probe.probe_raster_file(str(f))
    assert len(runs) == 1
    probe.clear_probe_memory()       # a new QGIS session: the on-disk cache answers
    probe.probe_raster_file(str(f))
    assert len(runs) == 1
    assert (tmp_path / "cache" / "raster_probe.json").is_file()
    st = f.stat()
    os.utime(f, ns=(st.st_atime_ns, st.st_mtime_ns + 10**9))  # edited file: probed again
    probe.probe_raster_file(str(f))
    assert len(runs) == 2


@pytest.mark.parametrize("content", [b"", b"hs,tp\n1,2\n", None], ids=["empty", "text", "truncated"])
def test_unreadable_files_keep_their_clean_errors(tmp_path, content):
    f = tmp_path / "forecast.nc"
    if content is None:
        good = _good_nc4(tmp_path / "whole.nc").read_bytes()
        content = good[: len(good) // 3]
    f.write_bytes(content)
    with pytest.raises((SeawayInputError, RuntimeError)) as err:
        open_sea_state(str(f))
    assert "damaged" not in str(err.value)  # the reader's own message, not the probe's
    assert "forecast.nc" in str(err.value)
