# SPDX-License-Identifier: MIT
"""Load calibration and hanger damping against computations written here.

References used here: the steady resonant amplitude 1/(2 zeta) of a viscously damped
single-degree-of-freedom oscillator (J. P. Den Hartog, Mechanical Vibrations, 4th ed. 1956,
ch. 2, from memory); the bare building's RMS acceleration by scipy.integrate.quad of
|H_a|^2 S_F; Davenport's peak factor (A. G. Davenport, "Note on the distribution of the largest
value of a random function with application to gust loading", Proc. ICE 28(2):187-196, 1964);
the definition of the viscous damping ratio, c = 2 zeta m omega. Demo data are invented.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad
from simulation_reference import G

from functions.pendulum import equivalent_length
from functions.simulation import (
    PEAK_DURATION,
    HarmonicForce,
    RandomForce,
    calibrated_load,
    force_spectrum,
    hanger_damping,
    simulate,
)

# Euler-Mascheroni constant in Davenport's peak factor (0.5772 in the paper), full precision.
EULER = 0.5772156649015329


def davenport(nu, duration):
    """g = sqrt(2 ln(nu T)) + gamma / sqrt(2 ln(nu T)) (Davenport 1964)."""
    r = math.sqrt(2.0 * math.log(nu * duration))
    return r + EULER / r


def bare_acceleration_rms(rms, modal_mass, frequency, damping):
    """RMS acceleration of a bare mode under the force spectrum with corner at ``frequency``:
    sqrt(int |H_a|^2 S_F df), H_a = omega^2 / (K - M omega^2 + i C omega), by quadrature."""
    ws = 2 * math.pi * frequency
    K, C = modal_mass * ws**2, 2 * damping * modal_mass * ws

    def integrand(f):
        w = 2 * math.pi * f
        h = w * w / abs(K - modal_mass * w * w + 1j * C * w)
        return h * h * force_spectrum(f, rms, frequency)

    edges = [0.0, 0.5, 0.9, 0.99, 1.0, 1.01, 1.1, 2.0, 50.0]
    total = sum(quad(integrand, a * frequency, b * frequency, limit=400, epsabs=0,
                     epsrel=1e-12)[0] for a, b in zip(edges[:-1], edges[1:]))
    total += quad(integrand, 50 * frequency, math.inf, limit=400, epsabs=0, epsrel=1e-12)[0]
    return math.sqrt(total)


# --------------------------------------------------------------------------------------------
# Harmonic load
# --------------------------------------------------------------------------------------------
@pytest.mark.parametrize("a, M, fs, zs", [(0.2, 1e6, 0.2, 0.01), (0.05, 2.4e7, 0.19, 0.012),
                                          (1.5, 3e5, 1.1, 0.05)])
def test_harmonic_force_is_the_resonant_amplitude(a, M, fs, zs):
    # Bare mode at resonance: X = (F0/K) / (2 zeta_s), so the acceleration amplitude is
    # omega_s^2 X = F0 / (2 zeta_s M) (Den Hartog 1956, ch. 2, from memory): F0 = 2 zeta_s M a.
    load, force, g_peak = calibrated_load(a, M, fs, zs, "harmonic")
    assert force == pytest.approx(2 * zs * M * a, rel=1e-14)
    assert isinstance(load, HarmonicForce)
    assert (load.amplitude, load.frequency, g_peak) == (force, fs, None)


def test_harmonic_load_gives_the_bare_building_the_peak_acceleration():
    # The bare building's steady response in the simulation: amplitude of the fundamental by a
    # least-squares fit (exact for a steady sine); warm-up 400 s with 5 % damping leaves e^-25
    # of the start-up transient.
    a, M, fs, zs = 0.3, 1e6, 0.2, 0.05
    load, _, _ = calibrated_load(a, M, fs, zs, "harmonic")
    r = simulate(M, fs, zs, 2e4, 6.0, 0.07, load, 100.0, warmup=400.0)
    t = r.time + r.warmup
    w = 2 * math.pi * fs
    basis = np.column_stack([np.sin(w * t), np.cos(w * t)])
    amp = np.hypot(*np.linalg.lstsq(basis, r.without_damper.acceleration, rcond=None)[0])
    assert amp == pytest.approx(a, rel=1e-8)
    # the sampled peak is low by at most 1 - cos(pi / 32) (32 samples per period)
    assert a * math.cos(math.pi / 32) <= r.without_damper.acceleration_peak <= a * (1 + 1e-8)


# --------------------------------------------------------------------------------------------
# Random load
# --------------------------------------------------------------------------------------------
@pytest.mark.parametrize("a, M, fs, zs, T", [(0.2, 1e6, 0.2, 0.01, 600.0),
                                             (0.206, 2.4e7, 0.19, 0.012, 600.0),
                                             (0.05, 5e5, 0.8, 0.03, 3600.0)])
def test_random_force_gives_the_peak_by_quadrature_and_davenport(a, M, fs, zs, T):
    load, force, g_peak = calibrated_load(a, M, fs, zs, "random", T, seed=4)
    assert g_peak == pytest.approx(davenport(fs, T), rel=1e-12)
    assert bare_acceleration_rms(force, M, fs, zs) * davenport(fs, T) == pytest.approx(a,
                                                                                       rel=1e-8)
    assert isinstance(load, RandomForce)
    assert (load.rms, load.corner_frequency, load.seed) == (force, fs, 4)


def test_random_force_scales_with_the_acceleration():
    one = calibrated_load(0.1, 1e6, 0.2, 0.01)
    assert one.peak_factor == pytest.approx(davenport(0.2, PEAK_DURATION), rel=1e-12)
    assert PEAK_DURATION == 600.0
    assert calibrated_load(0.3, 1e6, 0.2, 0.01).force == pytest.approx(3 * one.force, rel=1e-14)
    assert calibrated_load(0.0, 1e6, 0.2, 0.01).force == 0.0
    # a longer averaging time has a larger expected peak, so a smaller force
    assert calibrated_load(0.1, 1e6, 0.2, 0.01, "random", 3600.0).force < one.force


# --------------------------------------------------------------------------------------------
# Hanger damping
# --------------------------------------------------------------------------------------------
def test_hanger_damping_keeps_the_dashpot():
    # c_d = 2 zeta m omega is the device's dashpot: 2 zeta_d m omega_d = 2 zeta_L m omega_L,
    # omega_L = sqrt(g / L) (definition of the damping ratio; Den Hartog 1956, ch. 2, from memory)
    zd = np.array([[0.02], [0.07], [0.12]])
    fd = np.array([0.15, 0.197, 0.5])
    length = 6.0
    got = hanger_damping(zd, fd, length)
    assert got.shape == (3, 3)
    m = 4.2e4
    np.testing.assert_allclose(2 * got * m * math.sqrt(G / length),
                               2 * zd * m * 2 * math.pi * fd, rtol=1e-14)
    assert isinstance(hanger_damping(0.07, 0.197, 6.0, 9.81), float)


def test_hanger_damping_on_the_tuned_and_the_retuned_hanger():
    # the small-angle length of f_d leaves the damping unchanged; a hanger in tune at a 20 deg
    # swing is shorter, so its small-angle frequency is higher and its damping ratio lower
    fd, zd = 0.19, 0.08
    small = G / (2 * math.pi * fd) ** 2
    assert hanger_damping(zd, fd, small) == pytest.approx(zd, rel=1e-14)
    retuned = float(equivalent_length(fd, 20.0))
    assert retuned < small
    expected = zd * math.sqrt(retuned / small)
    assert hanger_damping(zd, fd, retuned) == pytest.approx(expected, rel=1e-14)


# --------------------------------------------------------------------------------------------
# Bad inputs: one per message
# --------------------------------------------------------------------------------------------
DEMO = (0.2, 1e6, 0.2, 0.01)


@pytest.mark.parametrize("make, match", [
    (lambda: calibrated_load(*DEMO, "gust"), r"load_type='gust' must be one of harmonic, random"),
    (lambda: calibrated_load(-1.0, 1e6, 0.2, 0.01),
     r"acceleration=-1\.0 must be in \[0, inf\) \[m/s\^2\]"),
    (lambda: calibrated_load(float("nan"), 1e6, 0.2, 0.01), r"acceleration=nan must be a finite"),
    (lambda: calibrated_load(0.2, 0.0, 0.2, 0.01), r"modal_mass=0\.0 must be in \(0, inf\) \[kg\]"),
    (lambda: calibrated_load(0.2, [1e6, 2e6], 0.2, 0.01),
     r"modal_mass=\[1000000\.0, 2000000\.0\] must be a single number"),
    (lambda: calibrated_load(0.2, 1e6, -0.2, 0.01),
     r"frequency=-0\.2 must be in \(0, inf\) \[Hz\]"),
    (lambda: calibrated_load(0.2, 1e6, 0.2, 0.0, "harmonic"),
     r"structural_damping=0\.0 must be in \(0, 1\) \[-\]"),
    (lambda: calibrated_load(*DEMO, "random", 0.0), r"duration=0\.0 must be in \(0, inf\) \[s\]"),
    (lambda: calibrated_load(*DEMO, "random", 600.0, -1), r"seed=-1 must be None or an integer"),
    (lambda: calibrated_load(0.2, 1e6, 0.001, 0.01, "random", 600.0),
     r"frequency\*duration=0\.6.* must be in \(e, inf\)"),
    (lambda: hanger_damping(1.0, 0.2, 6.0), r"damper_damping=1\.0 must be in \[0, 1\) \[-\]"),
    (lambda: hanger_damping(0.07, 0.0, 6.0), r"frequency=0\.0 must be in \(0, inf\) \[Hz\]"),
    (lambda: hanger_damping(0.07, 0.2, -6.0), r"length=-6\.0 must be in \(0, inf\) \[m\]"),
    (lambda: hanger_damping(0.07, 0.2, 6.0, 0.0), r"g=0\.0 must be in \(0, inf\) \[m/s\^2\]"),
    (lambda: hanger_damping([0.05, 0.07], [0.2, 0.3, 0.4], 6.0),
     r"arrays do not broadcast together: damper_damping\(2,\), frequency\(3,\)"),
])
def test_calibration_rejects_bad_input(make, match):
    with pytest.raises(ValueError, match=match):
        make()
