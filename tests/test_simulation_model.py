# SPDX-License-Identifier: MIT
"""Equations of motion of the building mode with its pendulum, through simulate.

References used here: scipy.special.ellipk (exact pendulum period, A&S §17.2), the energy
integral of the Lagrangian, the odd symmetry of the equations in (x, theta) and a
fourth-order central difference of the simulated velocity. Demo data are invented.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.interpolate import CubicHermiteSpline
from scipy.special import ellipk
from simulation_reference import FS, G, L, M, ZD, ZS

from functions.pendulum import exact_period
from functions.simulation import HarmonicForce, simulate


def upward_crossings(result):
    t = result.time
    th = result.nonlinear.angle_deg
    w = result.nonlinear.angular_velocity_deg
    out = []
    for i in np.flatnonzero((th[:-1] < 0) & (th[1:] >= 0)):
        spline = CubicHermiteSpline(t[i:i + 2], th[i:i + 2], w[i:i + 2])
        out.append([x for x in spline.roots() if t[i] - 1e-12 <= x <= t[i + 1] + 1e-12][0])
    return np.array(out)


@pytest.mark.parametrize("release_deg", [120.0, 170.0])
def test_free_pendulum_reproduces_exact_period(release_deg):
    # The building is made 1e12 times heavier than the mass: the hanger's support is fixed to
    # ~1e-12, and the pendulum swings freely from rest at the release angle.
    T_ref = exact_period(L, release_deg)
    # independent of our code: T = 4 sqrt(L/g) K(m), m = sin^2(a/2) (A&S §17.2, scipy ellipk)
    T_scipy = 4 * math.sqrt(L / G) * ellipk(math.sin(math.radians(release_deg) / 2) ** 2)
    assert T_ref == pytest.approx(T_scipy, rel=1e-13)
    # rtol 1e-7 on the state gives periods good to a few 1e-9 (zero crossings by cubic Hermite
    # interpolation of angle and rate between samples)
    r = simulate(1e15, FS, 0.0, 1e3, L, 0.0, None, 4.5 * T_ref, initial_angle_deg=release_deg,
                 samples_per_period=64, rtol=1e-7)
    assert r.integration_error <= 1e-7
    periods = np.diff(upward_crossings(r))
    assert len(periods) >= 3
    np.testing.assert_allclose(periods, T_ref, rtol=1e-6)
    np.testing.assert_allclose(periods, T_scipy, rtol=1e-6)
    assert r.nonlinear.swing_deg == pytest.approx(release_deg, rel=1e-6)


def test_energy_conserved_for_undamped_system():
    # Undamped building and damper, no load, released at 90 deg with the building displaced:
    # E = (M+m) v^2/2 + m L cos(th) v w + m L^2 w^2/2 + K x^2/2 + m g L (1 - cos th) is constant
    # (the Lagrangian's energy integral). The drift stays within the integrator's error estimate.
    m, fs = 5e4, 0.2
    K = M * (2 * math.pi * fs) ** 2
    r = simulate(M, fs, 0.0, m, L, 0.0, None, 100.0, initial_angle_deg=90.0,
                 initial_displacement=0.3, rtol=1e-6)
    n = r.nonlinear
    x, v = n.displacement, n.velocity
    th, w = np.radians(n.angle_deg), np.radians(n.angular_velocity_deg)
    E = (0.5 * (M + m) * v**2 + m * L * np.cos(th) * v * w + 0.5 * m * L**2 * w**2
         + 0.5 * K * x**2 + m * G * L * (1 - np.cos(th)))
    assert r.integration_error <= 1e-6
    assert np.max(np.abs(E / E[0] - 1)) <= max(r.integration_error, 1e-12)
    # the acceleration output (x'' from the equations of motion) against a fourth-order central
    # difference of the velocity history; the 90 deg release whips the mass through the bottom
    # (harmonics up to ~5 f_d at 32 samples per period), so the difference is only good to ~0.4 %
    h = r.time_step
    fd = (-v[4:] + 8 * v[3:-1] - 8 * v[1:-3] + v[:-4]) / (12 * h)
    np.testing.assert_allclose(n.acceleration[2:-2], fd, atol=1e-2 * np.max(np.abs(fd)))


@settings(max_examples=5, deadline=None)
@given(st.floats(1.0, 150.0), st.floats(-0.5, 0.5), st.floats(0.005, 0.2))
def test_mirror_symmetry(angle, x0, mu):
    # The equations are odd in (x, theta): mirrored initial state -> mirrored motion, exactly.
    a = simulate(M, FS, ZS, mu * M, L, ZD, None, 10.0, initial_angle_deg=angle,
                 initial_displacement=x0)
    b = simulate(M, FS, ZS, mu * M, L, ZD, None, 10.0, initial_angle_deg=-angle,
                 initial_displacement=-x0)
    np.testing.assert_array_equal(a.nonlinear.angle_deg, -b.nonlinear.angle_deg)
    np.testing.assert_array_equal(a.nonlinear.displacement, -b.nonlinear.displacement)


# --- the velocity-exponent dashpot and the hanger tension ---------------------------------
# A floor that does not move: a modal mass 1e12 times the damper's (the pendulum swings on a
# fixed pivot, textbook free pendulum).
RIGID_M, MD, LEN = 1e12, 1e3, 6.0
#: The reference building's damper (2 % of M) forced at resonance (invented demo data).
MD_REF, RESONANT = 2e4, HarmonicForce(4e4, 0.2)


def _free(release_deg, zd=0.0, **kw):
    return simulate(RIGID_M, 0.2, 0.01, MD, LEN, zd, None, 30.0, warmup=0.0,
                    initial_angle_deg=release_deg, samples_per_period=256, rtol=1e-9, **kw)


@pytest.mark.parametrize("release_deg", [5.0, 20.0, 45.0])
def test_tension_peaks_at_the_bottom_of_a_free_swing(release_deg):
    """Energy and the radial equation of a free pendulum: T_max = m g (3 - 2 cos theta_0)
    (J. L. Meriam, L. G. Kraige, Engineering Mechanics: Dynamics, normal-tangential
    coordinates); sampled at 256 points a period the peak is caught to about 1e-6."""
    r = _free(release_deg)
    bound = MD * G * (3 - 2 * math.cos(math.radians(release_deg)))
    assert r.nonlinear.tension_peak == pytest.approx(bound, rel=2e-5)
    assert r.nonlinear.tension_peak <= bound * (1 + 1e-9)
    assert r.summary()["tension_peak"] == r.nonlinear.tension_peak
    assert r.linear.tension_peak == 0.0


def test_tension_at_rest_is_the_weight():
    r = _free(0.0)
    assert r.nonlinear.tension_peak == pytest.approx(MD * G, rel=1e-12)


def test_linear_law_through_the_coefficient_reproduces_the_linear_dashpot():
    """C |v|^1 with C = c_d = 2 zeta_d m_d omega_d is the linear dashpot (our own rule)."""
    c_d = 2 * ZD * MD_REF * math.sqrt(G / L)
    plain = simulate(M, FS, ZS, MD_REF, L, ZD, RESONANT, 120.0)
    law = simulate(M, FS, ZS, MD_REF, L, ZD, RESONANT, 120.0, velocity_exponent=1.0,
                   dashpot_coefficient=c_d)
    np.testing.assert_allclose(law.nonlinear.stroke, plain.nonlinear.stroke, rtol=1e-9,
                               atol=1e-12 * plain.nonlinear.stroke_peak)
    assert law.departure == pytest.approx(plain.departure, rel=1e-6, abs=1e-12)


@pytest.mark.parametrize("alpha", [0.3, 0.5, 1.5])
def test_energy_lost_per_cycle_is_the_equal_energy_law(alpha):
    """A lightly damped swing of 2 deg loses lambda C V^(1+alpha) / omega per cycle,
    lambda = 2^(2+alpha) Gamma(1+alpha/2)^2 / Gamma(2+alpha) (S. J. Elliott, M. Ghandchi
    Tehrani, R. S. Langley, Phil. Trans. R. Soc. A 373 (2015) 20140402: equal energy per cycle;
    the Gamma form is checked by quadrature in tests/test_dashpots.py). The loss is measured
    from the simulated energy m (L theta')^2 / 2 + m g L (1 - cos theta) one period apart."""
    w = math.sqrt(G / LEN)
    theta0 = math.radians(2.0)
    v = LEN * theta0 * w
    C = 0.002 * 2 * MD * w / v ** (alpha - 1)         # about 0.2 % damping at this velocity
    r = _free(2.0, velocity_exponent=alpha, dashpot_coefficient=C)
    th = np.radians(r.nonlinear.angle_deg)
    rate = np.radians(r.nonlinear.angular_velocity_deg)
    energy = MD * (0.5 * (LEN * rate) ** 2 + G * LEN * (1 - np.cos(th)))
    period = 2 * math.pi / w * (1 + theta0 ** 2 / 16)      # A&S 17.3.11, to theta^2
    k = int(round(period / r.time_step))
    lost = energy[0] - np.interp(period, r.time, energy)
    amplitude = math.sqrt((energy[0] + energy[k]) / MD)    # peak speed V, mean of the cycle
    lam = 2 ** (2 + alpha) * math.gamma(1 + alpha / 2) ** 2 / math.gamma(2 + alpha)
    assert lost == pytest.approx(lam * C * amplitude ** (1 + alpha) / w, rel=0.01)


def test_a_soft_law_is_integrated_accurately():
    """alpha = 0.3 has an infinite force slope at v = 0: the fixed-step Runge-Kutta with its
    step-doubling check agrees with scipy's DOP853 at a tight tolerance (J. R. Dormand, P. J.
    Prince, J. Comput. Appl. Math. 6 (1980) 19-26) on the same output grid."""
    c_d = 2 * ZD * MD_REF * math.sqrt(G / L)
    kw = dict(velocity_exponent=0.3, dashpot_coefficient=c_d * 0.5 ** 0.7)
    for n in (32, 128):
        rk4 = simulate(M, FS, ZS, MD_REF, L, ZD, RESONANT, 120.0, samples_per_period=n, **kw)
        ivp = simulate(M, FS, ZS, MD_REF, L, ZD, RESONANT, 120.0, samples_per_period=n,
                       integrator="solve_ivp", rtol=1e-8, **kw)
        assert rk4.nonlinear.stroke_rms == pytest.approx(ivp.nonlinear.stroke_rms, rel=1e-4)
        assert rk4.nonlinear.tension_peak == pytest.approx(ivp.nonlinear.tension_peak,
                                                           rel=1e-4)


@pytest.mark.parametrize("kw, message", [
    (dict(velocity_exponent=0.0, dashpot_coefficient=1.0), r"velocity_exponent=0.0"),
    (dict(velocity_exponent=2.5, dashpot_coefficient=1.0), r"velocity_exponent=2.5"),
    (dict(velocity_exponent=0.5), "needs dashpot_coefficient"),
    (dict(dashpot_coefficient=-3.0), "dashpot_coefficient=-3.0"),
])
def test_bad_dashpot_law_is_refused(kw, message):
    with pytest.raises(ValueError, match=message):
        _free(2.0, **kw)
