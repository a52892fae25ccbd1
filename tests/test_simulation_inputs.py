# SPDX-License-Identifier: MIT
"""Scalar inputs of the time-domain simulation (functions.simulation._inputs).

The simulation integrates one system at a time, so its settings are single numbers: ``_scalar``
applies the engine's range check (functions._validation.check_range, tested in
test_validation.py) and then refuses an array, naming the argument, the value and its shape.
Messages are the module's own format; each is matched by its own ``pytest.raises``.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import math

import numpy as np
import pytest

from functions.simulation._inputs import _scalar
from functions.simulation.loads import HarmonicForce, RandomForce


@pytest.mark.parametrize("value", [5, 5.0, np.float32(5.0), np.float64(5.0), np.array(5.0)])
def test_a_single_number_is_returned_as_a_float(value):
    out = _scalar("duration", value, 0.0, 1e6, low_open=True, unit="s")
    assert type(out) is float and out == 5.0


def test_range_ends_as_check_range():
    assert _scalar("structural_damping", 0.0, 0.0, 1.0, high_open=True) == 0.0
    with pytest.raises(ValueError, match=r"^structural_damping=1\.0 must be in \[0, 1\) \[-\]$"):
        _scalar("structural_damping", 1.0, 0.0, 1.0, high_open=True, unit="-")


def test_open_low_end():
    with pytest.raises(ValueError, match=r"^duration=0\.0 must be in \(0, 1e\+06\] \[s\]$"):
        _scalar("duration", 0, 0.0, 1e6, low_open=True, unit="s")


def test_not_a_number():
    with pytest.raises(ValueError, match=r"^seed='7' must be a finite number$"):
        _scalar("seed", "7")


def test_not_finite():
    with pytest.raises(ValueError, match=r"^rms=nan must be a finite number$"):
        _scalar("rms", math.nan, 0.0, unit="N")


def test_an_array_is_refused_with_its_shape():
    with pytest.raises(ValueError, match=r"^duration=array\(\[1\., 2\.\]\) must be a single "
                                         r"number, not an array of shape \(2,\)$"):
        _scalar("duration", np.array([1.0, 2.0]), 0.0, low_open=True, unit="s")


def test_a_list_of_one_number_is_an_array():
    with pytest.raises(ValueError, match=r"^g=\[9\.81\] must be a single number, not an array "
                                         r"of shape \(1,\)$"):
        _scalar("g", [9.81], 0.0, low_open=True, unit="m/s^2")


def test_the_range_is_checked_before_the_shape():
    with pytest.raises(ValueError, match=r"^amplitude=-1\.0 must be in \[0, inf\) \[N\]$"):
        _scalar("amplitude", [-1.0, 2.0], 0.0, unit="N")


def test_loads_take_single_numbers():
    # the loads of simulate() check their fields through _scalar
    load = HarmonicForce(amplitude=np.float64(2.0), frequency=0.2)
    assert type(load.amplitude) is float and load.amplitude == 2.0
    with pytest.raises(ValueError, match=r"^amplitude=\[1, 2\] must be a single number"):
        HarmonicForce(amplitude=[1, 2], frequency=0.2)


def test_random_force_frequency_range():
    with pytest.raises(ValueError, match=r"^corner_frequency=0\.0 must be in \(0, inf\) \[Hz\]$"):
        RandomForce(rms=1.0, corner_frequency=0.0)
