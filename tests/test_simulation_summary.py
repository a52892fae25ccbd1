# SPDX-License-Identifier: MIT
"""simulation_summary: flat inputs, ordered repeatable numbers. Demo data are invented."""
from __future__ import annotations

import math

import pytest
from simulation_reference import DEMO, FS, L, M, MD, ZD

from functions.simulation import SUMMARY_FIELDS, simulation_summary


def test_summary_is_flat_ordered_and_repeatable():
    # 5 % building damping keeps the automatic warm-up short (6 / (zeta omega) ~ 95 s)
    args = (M, FS, 0.05, MD, L, ZD, "random", 5e4, 0.1, 120.0)
    s1 = simulation_summary(*args, seed=5)
    s2 = simulation_summary(*args, seed=5)
    assert list(s1) == [name for name, _, _ in SUMMARY_FIELDS]
    assert all(isinstance(v, float) and math.isfinite(v) for v in s1.values())
    assert s1 == s2
    assert s1 != simulation_summary(*args, seed=6)
    assert s1["acceleration_rms"] < s1["acceleration_rms_without_damper"]


def test_summary_rejects_bad_input():
    with pytest.raises(ValueError, match=r"load_type='gust' must be one of harmonic, random"):
        simulation_summary(*DEMO, "gust", 1.0, 0.2)
