# SPDX-License-Identifier: MIT
"""Checks of the scalar inputs of the time-domain simulation (ValueError naming the argument)."""
from __future__ import annotations

import math

from functions._validation import check_range

__all__: list[str] = []


def _scalar(name, value, low=-math.inf, high=math.inf, *, low_open=False, high_open=False,
            unit="") -> float:
    """One finite number in the range, as a float; ValueError for an array."""
    arr = check_range(name, value, low, high, low_open=low_open, high_open=high_open, unit=unit)
    if arr.ndim != 0:
        raise ValueError(f"{name}={value!r} must be a single number, not an array of shape "
                         f"{arr.shape}")
    return float(arr)
