# SPDX-License-Identifier: GPL-2.0-or-later
"""Input validation shared by the core: clear errors that name the argument and value.

Every public core function validates its inputs with these helpers, so that bad input never
produces a silent NaN or zero. Per-sample problems that only affect some samples are not
errors: they become flags (see :mod:`.flags`).
"""
from __future__ import annotations

from numbers import Number
from os import PathLike
from typing import Any, Optional

import numpy as np
from numpy.typing import ArrayLike

from .units import FloatArray


class SeawayInputError(ValueError):
    """Bad input to the core. The message names the argument, the offending value and the fix."""


def show(value: Any) -> str:
    """A value as a person reads it in a message, whatever numpy version made it.

    numpy 2 writes scalars as ``np.float64(-1.0)``; here numbers are plain (``-1.0``, ``3``),
    arrays and sequences are lists of plain numbers, paths and text are quoted, so the same
    message reads the same on every numpy.
    """
    if isinstance(value, np.ndarray):
        return show(value.tolist())
    if isinstance(value, np.generic):
        return show(value.item())
    if isinstance(value, (list, tuple)):
        inner = ", ".join(show(v) for v in value)
        return f"[{inner}]" if isinstance(value, list) else f"({inner}{',' if len(value) == 1 else ''})"
    if isinstance(value, PathLike):
        return repr(str(value))
    if isinstance(value, bool) or not isinstance(value, Number):
        return repr(value)
    return repr(value) if isinstance(value, (int, float)) else str(value)


def _first_bad(values: np.ndarray, bad: np.ndarray) -> str:
    idx = np.flatnonzero(bad.ravel())
    first = values.ravel()[idx[0]]
    more = f" ({idx.size} values in all, first at index {int(idx[0])})" if idx.size > 1 else ""
    return f"{show(first)}{more}"


def as_float_array(name: str, value: ArrayLike, *, allow_nan: bool = False) -> FloatArray:
    """Convert to a float64 array; reject non-numeric input and (unless allowed) NaN/inf."""
    try:
        arr = np.asarray(value, dtype=float)
    except (TypeError, ValueError) as exc:
        raise SeawayInputError(f"{name} must be numeric, got {show(value)}") from exc
    if not allow_nan:
        bad = ~np.isfinite(arr)
        if bad.any():
            raise SeawayInputError(f"{name} must be finite, got {_first_bad(arr, bad)}")
    return arr


def require_positive(name: str, value: ArrayLike, *, allow_inf: bool = False) -> FloatArray:
    """Array of strictly positive values (inf allowed only if ``allow_inf``)."""
    arr = np.asarray(as_float_array(name, value, allow_nan=True), dtype=float)
    bad = np.isnan(arr) | (arr <= 0) | (np.isinf(arr) & (not allow_inf))
    if bad.any():
        raise SeawayInputError(f"{name} must be > 0, got {_first_bad(arr, bad)}")
    return arr


def require_nonnegative(name: str, value: ArrayLike) -> FloatArray:
    """Array of finite values >= 0."""
    arr = as_float_array(name, value)
    bad = arr < 0
    if bad.any():
        raise SeawayInputError(f"{name} must be >= 0, got {_first_bad(arr, bad)}")
    return arr


def require_in_range(
    name: str,
    value: ArrayLike,
    low: Optional[float],
    high: Optional[float],
    *,
    unit: str = "",
) -> FloatArray:
    """Array of finite values with low <= value <= high (either bound may be None)."""
    arr = as_float_array(name, value)
    bad = np.zeros(arr.shape, dtype=bool)
    if low is not None:
        bad |= arr < low
    if high is not None:
        bad |= arr > high
    if bad.any():
        lo = "-inf" if low is None else f"{low:g}"
        hi = "inf" if high is None else f"{high:g}"
        u = f" {unit}" if unit else ""
        raise SeawayInputError(
            f"{name} must lie in [{lo}, {hi}]{u}, got {_first_bad(arr, bad)}"
        )
    return arr
