# SPDX-License-Identifier: MIT
"""Loads of the time-domain simulation against outside references.

References used here: the AR(1) statistics of a sampled Ornstein-Uhlenbeck process and
scipy.integrate.quad of the force spectrum (its integral is the variance).
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad
from scipy.signal import lfilter

from functions.simulation import HarmonicForce, RandomForce, force_spectrum
from functions.simulation.loads import _first_order


def test_force_generator_statistics():
    load = RandomForce(3.0, 0.5, seed=11)
    dt = 0.05
    x = load.samples(400_000, dt)
    a = math.exp(-2 * math.pi * 0.5 * dt)
    # AR(1): variance rms^2 and lag-one correlation a; 400k samples with correlation time
    # ~6 samples -> standard error of the variance ~ rms^2 sqrt(2 (1+a)/(1-a) / n) ~ 0.8 %
    assert np.var(x) == pytest.approx(9.0, rel=0.03)
    assert np.corrcoef(x[:-1], x[1:])[0, 1] == pytest.approx(a, abs=0.005)
    # same seed -> same record
    np.testing.assert_array_equal(x[:100], RandomForce(3.0, 0.5, seed=11).samples(100, dt))
    assert not np.array_equal(x[:100], RandomForce(3.0, 0.5, seed=12).samples(100, dt))


def test_force_spectrum_integrates_to_variance():
    total = quad(lambda f: force_spectrum(f, 2.5, 0.3), 0, np.inf)[0]
    assert total == pytest.approx(6.25, rel=1e-9)
    np.testing.assert_allclose(force_spectrum([0.0, 0.3], 1.0, 0.3),
                               [2 / (math.pi * 0.3), 1 / (math.pi * 0.3)])


@pytest.mark.parametrize("make, match", [
    (lambda: HarmonicForce(-1.0, 0.2), r"amplitude=-1\.0 must be in \[0, inf\) \[N\]"),
    (lambda: HarmonicForce(1.0, 0.0), r"frequency=0\.0 must be in \(0, inf\) \[Hz\]"),
    (lambda: RandomForce(-1.0, 0.2), r"rms=-1\.0 must be in \[0, inf\) \[N\]"),
    (lambda: RandomForce(1.0, -0.2), r"corner_frequency=-0\.2 must be in \(0, inf\) \[Hz\]"),
    (lambda: RandomForce(1.0, 0.2, seed=-3), r"seed=-3 must be None or an integer"),
    (lambda: RandomForce(1.0, 0.2, seed=1.5), r"seed=1\.5 must be None or an integer"),
    (lambda: force_spectrum(-1.0, 1.0, 0.2), r"frequency=-1\.0 must be in \[0, inf\) \[Hz\]"),
])
def test_loads_reject_bad_input(make, match):
    with pytest.raises(ValueError, match=match):
        make()


@pytest.mark.parametrize("a", [0.0, 0.3, 0.97, 0.999999])
def test_first_order_recursion_equals_scipy_lfilter_bit_for_bit(a):
    """The random force's filter is written out (to spare scipy.signal's start-up); it must
    give exactly what scipy.signal.lfilter gives (reference library, direct form II
    transposed)."""
    x = np.random.default_rng(7).standard_normal(5000)
    gain, state = 1.7, 0.4
    want, _ = lfilter([gain], [1.0, -a], x, zi=[state])
    got = _first_order(gain, a, x, state)
    assert np.array_equal(got, want)
