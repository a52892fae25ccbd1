# SPDX-License-Identifier: MIT
"""Argument checks shared by every engine module.

Each check converts its argument to a float array, refuses what is not a finite number and
raises :class:`ValueError` naming the argument, the offending value and the valid range, e.g.
``length=-2.0 must be in (0, inf) [m]``. Engine functions call these checks first and then
compute with plain numpy, returning :func:`scalar_or_array` of the result.
"""
from __future__ import annotations

import math
from typing import Any

import numpy as np

__all__ = ["as_array", "broadcast", "check_range", "scalar_or_array", "interval_text"]


def _first_bad(values: np.ndarray, bad: np.ndarray) -> Any:
    """Return the first value flagged in ``bad`` (a Python scalar)."""
    return values[bad].flat[0].item() if values.ndim else values.item()


def interval_text(low: float, high: float, low_open: bool, high_open: bool) -> str:
    """Interval in the usual notation, e.g. ``(0, inf)`` or ``[0, 180)``."""
    def fmt(x: float) -> str:
        if math.isinf(x):
            return "inf" if x > 0 else "-inf"
        return f"{x:g}"
    low_open = low_open or math.isinf(low)
    high_open = high_open or math.isinf(high)
    return f"{'(' if low_open else '['}{fmt(low)}, {fmt(high)}{')' if high_open else ']'}"


def _as_float(name: str, value: Any) -> np.ndarray:
    """Convert to a float array without the finiteness check."""
    if value is None or isinstance(value, (str, bytes, bool, np.bool_, complex)):
        raise ValueError(f"{name}={value!r} must be a finite number")
    if isinstance(value, np.ndarray) and value.dtype == np.float64:
        return value
    try:
        arr = np.asarray(value)
        if arr.dtype == bool or arr.dtype.kind in "OUSMmVc":       # c: complex
            raise TypeError
        return arr.astype(float, copy=False)
    except (TypeError, ValueError):
        raise ValueError(f"{name}={value!r} must be a finite number") from None


def as_array(name: str, value: Any) -> np.ndarray:
    """Convert ``value`` to a float array; refuse text, booleans, None, NaN and inf.

    Raises
    ------
    ValueError
        When ``value`` is not numeric or holds NaN or inf; the message names ``name``.
    """
    arr = _as_float(name, value)
    finite = np.isfinite(arr)
    if not finite.all():
        raise ValueError(f"{name}={_first_bad(arr, ~finite)!r} must be a finite number")
    return arr


def check_range(name: str, value: Any, low: float = -math.inf, high: float = math.inf, *,
                low_open: bool = False, high_open: bool = False, unit: str = "") -> np.ndarray:
    """Convert ``value`` with :func:`as_array` and check every element lies in the interval.

    ``unit`` (e.g. ``"m"``) is shown in brackets after the interval.

    Examples
    --------
    >>> check_range("length", 2.0, 0.0, low_open=True, unit="m")
    array(2.)
    >>> check_range("length", -2.0, 0.0, low_open=True, unit="m")
    Traceback (most recent call last):
    ...
    ValueError: length=-2.0 must be in (0, inf) [m]
    """
    arr = _as_float(name, value)
    low_open = low_open or math.isinf(low)  # an infinite bound is never attained
    high_open = high_open or math.isinf(high)
    # one pass that also rejects NaN (every comparison with NaN is False) and inf
    ok = (arr > low) if low_open else (arr >= low)
    ok &= (arr < high) if high_open else (arr <= high)
    if ok.all():
        return arr
    finite = np.isfinite(arr)
    if not finite.all():
        raise ValueError(f"{name}={_first_bad(arr, ~finite)!r} must be a finite number")
    bad = ~ok
    if bad.any():
        suffix = f" [{unit}]" if unit else ""
        raise ValueError(f"{name}={_first_bad(arr, bad)!r} must be in "
                         f"{interval_text(low, high, low_open, high_open)}{suffix}")
    return arr


def positive(name: str, value: Any, unit: str = "") -> np.ndarray:
    """:func:`check_range` over (0, inf), the range of most physical arguments.

    Examples
    --------
    >>> positive("length", 2.0, "m")
    array(2.)
    """
    return check_range(name, value, 0.0, low_open=True, unit=unit)


def non_negative(name: str, value: Any, unit: str = "") -> np.ndarray:
    """:func:`check_range` over [0, inf).

    Examples
    --------
    >>> non_negative("stroke", 0.0, "m")
    array(0.)
    """
    return check_range(name, value, 0.0, unit=unit)


def broadcast(**arrays: Any) -> list[np.ndarray]:
    """Broadcast named arrays together or raise a ValueError naming them and their shapes.

    Examples
    --------
    >>> [a.shape for a in broadcast(length=np.ones(3), g=9.8)]
    [(3,), (3,)]
    >>> broadcast(length=np.ones(3), g=np.ones(2))
    Traceback (most recent call last):
    ...
    ValueError: arrays do not broadcast together: length(3,), g(2,)
    """
    try:
        return list(np.broadcast_arrays(*arrays.values()))
    except ValueError:
        shapes = ", ".join(f"{k}{tuple(np.shape(v))}" for k, v in arrays.items())
        raise ValueError(f"arrays do not broadcast together: {shapes}") from None


def scalar_or_array(x: np.ndarray) -> float | np.ndarray:
    """Return a Python float for a 0-d result, the array otherwise."""
    x = np.asarray(x, dtype=float)
    return float(x) if x.ndim == 0 else x
