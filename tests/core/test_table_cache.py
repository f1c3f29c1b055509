# SPDX-License-Identifier: GPL-2.0-or-later
"""Disk cache of response tables: a second run loads instead of building, loaded tables equal
freshly built ones bit for bit, the key follows the content, and bad files are rebuilt.
(Behaviour of our own cache; no external reference applies.)"""
from __future__ import annotations

import dataclasses
import os

import numpy as np
import pytest

from seaway_comfort.processing.core.motions import table_cache as TC
from seaway_comfort.processing.core.motions.closed_form import ClosedFormTransfer
from seaway_comfort.processing.core.motions.tables import build_response_table
from seaway_comfort.processing.core.vessel.profile import builtin_profile

SMALL = dict(tp_grid_s=np.geomspace(3.0, 15.0, 6), n_freq=24, n_dir=12)


@pytest.fixture
def counted(tmp_path, monkeypatch):
    """Cache folder in tmp_path and a counter of real table builds."""
    monkeypatch.setenv(TC.CACHE_ENV, str(tmp_path / "cache"))
    calls = []

    def counting(*a, **k):
        calls.append(a[2])
        return build_response_table(*a, **k)

    monkeypatch.setattr(TC, "build_response_table", counting)
    return calls


def _setup(name="coastal_survey_35m"):
    p = builtin_profile(name)
    return ClosedFormTransfer.from_profile(p), p.stations


def _assert_same(a, b):
    for f in dataclasses.fields(a):
        va, vb = getattr(a, f.name), getattr(b, f.name)
        if isinstance(va, np.ndarray):
            np.testing.assert_array_equal(va, vb, err_msg=f.name)
        else:
            assert va == vb, f.name


def test_second_run_loads_and_equals_fresh_build(counted, tmp_path):
    tr, st = _setup()
    first = TC.cached_table(tr, st, 4.0, **SMALL)
    assert counted == [4.0]
    assert len(list((tmp_path / "cache" / "tables").glob("*.npz"))) == 1
    second = TC.cached_table(tr, st, 4.0, **SMALL)
    assert counted == [4.0]  # loaded, not built
    _assert_same(second, build_response_table(tr, st, 4.0, **SMALL))
    _assert_same(first, second)
    assert TC.is_cached(tr, st, 4.0, **SMALL) and not TC.is_cached(tr, st, 4.5, **SMALL)


def test_table_set_through_cache(counted):
    tr, st = _setup()
    a = TC.cached_table_set(tr, st, [2.0, 5.0], [30.0, np.inf], **SMALL)
    assert sorted(counted) == [2.0, 2.0, 5.0, 5.0]
    b = TC.cached_table_set(tr, st, [2.0, 5.0], [30.0, np.inf], **SMALL)
    assert len(counted) == 4
    for ra, rb in zip(a.tables, b.tables):
        for ta, tb in zip(ra, rb):
            _assert_same(ta, tb)


def test_key_follows_content(counted):
    tr, st = _setup()
    base = TC.table_key(tr, st, 4.0, None, SMALL)
    assert TC.table_key(tr, st, 4.0, None, dict(SMALL)) == base
    other = dataclasses.replace(tr, roll_damping_ratio=tr.roll_damping_ratio * 1.01)
    moved = [dataclasses.replace(st[0], z_m=st[0].z_m + 0.1)] + list(st[1:])
    for k in (TC.table_key(other, st, 4.0, None, SMALL), TC.table_key(tr, moved, 4.0, None, SMALL),
              TC.table_key(tr, st, 4.0 + 1e-9, None, SMALL), TC.table_key(tr, st, 4.0, 50.0, SMALL),
              TC.table_key(tr, st, 4.0, None, dict(SMALL, n_dir=24)),
              TC.table_key(tr, st, 4.0, None, dict(SMALL, tp_grid_s=SMALL["tp_grid_s"] * 1.001))):
        assert k != base


def test_key_uses_the_transfer_own_cache_key(counted, monkeypatch):
    tr, st = _setup()

    @dataclasses.dataclass(frozen=True)
    class Keyed:
        inner: ClosedFormTransfer
        version: str

        def cache_key(self):
            return f"hull-abc/{self.version}"

        def __getattr__(self, name):
            return getattr(self.inner, name)

    a, b = Keyed(tr, "1"), Keyed(tr, "2")
    assert TC.transfer_cache_key(a).startswith("own:") and TC.transfer_cache_key(a).endswith("Keyed:hull-abc/1")
    assert TC.table_key(a, st, 4.0, None, SMALL) != TC.table_key(b, st, 4.0, None, SMALL)
    TC.cached_table(a, st, 4.0, **SMALL)
    TC.cached_table(a, st, 4.0, **SMALL)
    assert len(counted) == 1
    monkeypatch.setattr(TC, "ENGINE_VERSION", "another-engine")
    TC.cached_table(a, st, 4.0, **SMALL)
    assert len(counted) == 2  # engine version is part of the key


@pytest.mark.parametrize("damage", ["garbage", "truncated", "foreign", "nan"])
def test_bad_file_is_ignored_and_rebuilt(counted, damage):
    tr, st = _setup()
    fresh = TC.cached_table(tr, st, 4.0, **SMALL)
    path = TC.cache_dir() / f"{TC.table_key(tr, st, 4.0, None, SMALL)}.npz"
    if damage == "garbage":
        path.write_bytes(b"not a table at all")
    elif damage == "truncated":
        path.write_bytes(path.read_bytes()[:200])
    elif damage == "foreign":  # a valid table file written for another key, under this name
        other = TC.cache_dir() / f"{TC.table_key(tr, st, 6.0, None, SMALL)}.npz"
        TC.cached_table(tr, st, 6.0, **SMALL)
        os.replace(other, path)
    else:
        with np.load(path, allow_pickle=False) as z:
            d = {k: np.array(z[k]) for k in z.files}
        d["q"][0, 0, 0] = np.nan
        with open(path, "wb") as f:
            np.savez(f, **d)
    n = len(counted)
    again = TC.cached_table(tr, st, 4.0, **SMALL)
    assert len(counted) == n + 1
    _assert_same(again, fresh)
    TC.cached_table(tr, st, 4.0, **SMALL)
    assert len(counted) == n + 1  # the rebuilt file was written back


def test_folder_choice_and_unwritable_folder(tmp_path, monkeypatch):
    monkeypatch.delenv(TC.CACHE_ENV, raising=False)
    monkeypatch.setattr(TC, "_DEFAULT_DIR", None)
    assert TC.cache_dir() == TC.Path.home() / ".cache" / "seaway_comfort" / "tables"
    TC.set_default_cache_dir(str(tmp_path / "settings"))
    assert TC.cache_dir() == tmp_path / "settings" / "tables"
    monkeypatch.setenv(TC.CACHE_ENV, str(tmp_path / "env"))
    assert TC.cache_dir() == tmp_path / "env" / "tables"
    blocker = tmp_path / "file"
    blocker.write_text("x")
    monkeypatch.setenv(TC.CACHE_ENV, str(blocker))  # a file where the folder should be
    tr, st = _setup()
    tab = TC.cached_table(tr, st, 4.0, **SMALL)
    _assert_same(tab, build_response_table(tr, st, 4.0, **SMALL))
    TC.set_default_cache_dir(None)
