# SPDX-License-Identifier: MIT
"""Time-domain damper simulation against outside references.

References used here: scipy.special.ellipk (exact pendulum period, A&S §17.2), scipy.signal.lsim
(exact first-order-hold discretisation), scipy.integrate.quad of |H|^2 S_F (frequency-domain
variance), scipy.integrate.solve_ivp (independent nonlinear integration), the closed-form
white-noise variance of functions.damper (Newland, Random Vibrations, 3rd ed. 1993, App. 1) and
the textbook steady-state amplitude of a damped oscillator. Demo data are invented.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import quad
from scipy.interpolate import CubicHermiteSpline
from scipy.signal import lsim
from scipy.special import ellipk

from functions.pendulum import STANDARD_GRAVITY, amplitude_detuning, equivalent_length, exact_period
from functions.simulation import (
    MAX_SAMPLES,
    SUMMARY_FIELDS,
    HarmonicForce,
    RandomForce,
    force_spectrum,
    random_response_theory,
    retune_for_swing,
    simulate,
    simulation_summary,
)

G = STANDARD_GRAVITY
# Invented demo building: 0.2 Hz mode, 1e6 kg modal mass, 1 % damping; 2 % damper, 6 m hanger.
M, FS, ZS, MD, L, ZD = 1e6, 0.2, 0.01, 2e4, 6.0, 0.07
DEMO = (M, FS, ZS, MD, L, ZD)


# --------------------------------------------------------------------------------------------
# Frequency-domain reference written independently of the module (textbook 2-DOF equations)
# --------------------------------------------------------------------------------------------
def transfer(f, M, fs, zs, m, L, zd):
    """x/F, u/F of (M+m)x'' + m u'' + C x' + K x = F, m(x'' + u'') + c u' + k u = 0."""
    w = 2 * np.pi * f
    ws, wd = 2 * np.pi * fs, math.sqrt(G / L)
    K, C = M * ws**2, 2 * zs * M * ws
    k, c = m * wd**2, 2 * zd * m * wd
    a11 = K - (M + m) * w**2 + 1j * w * C
    a12 = -m * w**2
    a21 = -m * w**2
    a22 = k - m * w**2 + 1j * w * c
    det = a11 * a22 - a12 * a21
    return a22 / det, -a21 / det


def quad_variance(which, rms, fc, *system):
    def integrand(f):
        hx, hu = transfer(f, *system)
        h = {"x": hx, "u": hu, "a": -(2 * np.pi * f) ** 2 * hx}[which]
        return abs(h) ** 2 * force_spectrum(f, rms, fc)
    fs = system[1]
    pts = [0.5 * fs, 0.9 * fs, fs, 1.1 * fs, 2 * fs]
    total = 0.0
    edges = [0.0, *pts, 50 * fs]
    for a, b in zip(edges[:-1], edges[1:]):
        total += quad(integrand, a, b, limit=400, epsabs=0, epsrel=1e-11)[0]
    total += quad(integrand, 50 * fs, np.inf, limit=400, epsabs=0, epsrel=1e-11)[0]
    return total


# --------------------------------------------------------------------------------------------
# Random load: small amplitude, nonlinear vs linear vs frequency domain
# --------------------------------------------------------------------------------------------
@pytest.fixture(scope="module")
def random_small():
    # RMS swing about 0.4 deg: the nonlinearity (order theta^2 ~ 5e-5) is negligible.
    load = RandomForce(1e4, 0.1, seed=7)
    # warm-up 300 s: the coupled modes decay at ~0.05 1/s, so the start-up transient is e^-15
    return simulate(*DEMO, load, 3600.0, warmup=300.0)


def test_random_small_amplitude_variance_within_scatter(random_small):
    r = random_small
    th = r.theory
    # Expected scatter of an RMS from a 3600 s record: the Gaussian-process formula
    # sqrt((2/T) int R^2) / (2 sigma^2) (Bendat & Piersol, Random Data, 4th ed. 2010, ch. 8,
    # from memory), computed by the module; about 4 % here. We accept 3 standard deviations.
    scatter = th.displacement_rms_scatter
    assert 0.02 < scatter < 0.08
    assert 0.005 < th.acceleration_rms_scatter < 0.08 and 0.005 < th.stroke_rms_scatter < 0.08
    for resp in (r.linear, r.nonlinear):
        assert abs(resp.displacement_rms / th.displacement_rms - 1.0) < 3 * scatter
        assert abs(resp.stroke_rms / th.stroke_rms - 1.0) < 3 * th.stroke_rms_scatter
        assert abs(resp.acceleration_rms / th.acceleration_rms - 1.0) < (
            3 * th.acceleration_rms_scatter)
    # same force record: the small-amplitude nonlinear model reproduces the linear one
    assert r.nonlinear.displacement_rms == pytest.approx(r.linear.displacement_rms, rel=1e-4)
    assert r.nonlinear.stroke_rms == pytest.approx(r.linear.stroke_rms, rel=1e-4)
    assert r.departure < 1e-4 and r.within_tolerance
    # identified effective damping within the scatter of a variance (twice that of the RMS)
    assert abs(r.nonlinear.effective_damping / th.effective_damping - 1.0) < 6 * scatter


def test_theory_equals_frequency_domain_quadrature():
    rms, fc = 2e4, 0.15
    th = random_response_theory(*DEMO, rms, fc, 600.0)
    assert th.displacement_rms**2 == pytest.approx(quad_variance("x", rms, fc, *DEMO), rel=1e-7)
    assert th.stroke_rms**2 == pytest.approx(quad_variance("u", rms, fc, *DEMO), rel=1e-7)
    assert th.acceleration_rms**2 == pytest.approx(quad_variance("a", rms, fc, *DEMO), rel=1e-7)


def test_theory_white_limit_matches_damper_engine():
    damper = pytest.importorskip("functions.damper")
    mu, f = MD / M, math.sqrt(G / L) / (2 * math.pi) / FS
    # corner frequency 2000 x f_s: the force is white across the building's band to ~1e-6
    th = random_response_theory(*DEMO, 1e4, 2000 * FS, 600.0)
    assert th.effective_damping == pytest.approx(damper.effective_damping(mu, f, ZD, ZS),
                                                 rel=1e-5)
    assert th.stroke_rms / th.displacement_rms == pytest.approx(
        damper.stroke_ratio(mu, f, ZD, ZS), rel=1e-5)


def test_scatter_matches_narrow_band_formula():
    # Bare lightly damped oscillator under white force: relative std of the mean square is
    # 1/sqrt(zeta omega T) (Bendat & Piersol 2010, ch. 8, narrow-band approximation, from
    # memory), so the RMS scatter is half that. A negligible damper (1e-9 of M) leaves the mode
    # bare; the approximation is good to O(zeta).
    zs, T = 0.01, 3600.0
    th = random_response_theory(M, FS, zs, 1e-3, L, 0.5, 1.0, 100 * FS, T)
    expected = 0.5 / math.sqrt(zs * 2 * math.pi * FS * T)
    assert th.displacement_rms_scatter == pytest.approx(expected, rel=0.02)


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


# --------------------------------------------------------------------------------------------
# Linear integration is exact
# --------------------------------------------------------------------------------------------
def test_linear_matches_scipy_lsim():
    # scipy.signal.lsim with interp=True uses the same first-order hold, evaluated step by step
    r = simulate(*DEMO, RandomForce(5e4, 0.2, seed=3), 120.0, warmup=0.0)
    m = MD
    mass = np.array([[M + m, m], [m, m]])
    ws, wd = 2 * np.pi * FS, math.sqrt(G / L)
    inv = np.linalg.inv(mass)
    A = np.block([[np.zeros((2, 2)), np.eye(2)],
                  [-inv @ np.diag([M * ws**2, m * wd**2]),
                   -inv @ np.diag([2 * ZS * M * ws, 2 * ZD * m * wd])]])
    B = np.concatenate([[0, 0], inv @ [1.0, 0.0]])[:, None]
    _, y, _ = lsim((A, B, np.eye(4), np.zeros((4, 1))), r.force, r.time, interp=True)
    np.testing.assert_allclose(r.linear.displacement, y[:, 0], rtol=0,
                               atol=1e-10 * np.max(np.abs(y[:, 0])))
    np.testing.assert_allclose(r.linear.stroke, y[:, 1], rtol=0,
                               atol=1e-10 * np.max(np.abs(y[:, 1])))


def test_harmonic_steady_state_is_exact():
    # Bare building: X = (F0/K) / sqrt((1 - r^2)^2 + (2 zeta r)^2) (any vibrations text, e.g.
    # Den Hartog, Mechanical Vibrations, 4th ed. 1956, §2.3, from memory). A long warm-up
    # removes the start-up transient (e^-25); 5 % building damping keeps it short.
    F0, ff, ZS = 3e4, 0.19, 0.05
    system = (M, FS, ZS, MD, L, ZD)
    r = simulate(*system, HarmonicForce(F0, ff), 100.0, warmup=400.0)
    K = M * (2 * np.pi * FS) ** 2
    ratio = ff / FS
    X = F0 / K / math.sqrt((1 - ratio**2) ** 2 + (2 * ZS * ratio) ** 2)
    t = r.time + r.warmup
    phase = math.atan2(2 * ZS * ratio, 1 - ratio**2)
    np.testing.assert_allclose(r.without_damper.displacement,
                               X * np.sin(2 * np.pi * ff * t - phase), atol=1e-9 * X)
    # identified damping of the bare building is its own damping
    assert r.without_damper.effective_damping == pytest.approx(ZS, rel=1e-6)
    # coupled, linear: same amplitude as the textbook 2-DOF transfer function
    hx, hu = transfer(ff, *system)
    z = r.linear.displacement
    assert np.max(np.abs(z)) == pytest.approx(F0 * abs(hx), rel=1e-3)  # sampled peak
    c = np.column_stack([np.sin(2 * np.pi * ff * t), np.cos(2 * np.pi * ff * t)])
    amp = np.hypot(*np.linalg.lstsq(c, z, rcond=None)[0])
    assert amp == pytest.approx(F0 * abs(hx), rel=1e-9)
    damper = pytest.importorskip("functions.damper")
    mu, f = MD / M, math.sqrt(G / L) / (2 * math.pi) / FS
    assert amp * K / F0 == pytest.approx(
        damper.frequency_response(ratio, mu, f, ZD, ZS), rel=1e-7)


# --------------------------------------------------------------------------------------------
# Nonlinear pendulum: exact period, energy, symmetry, integrators
# --------------------------------------------------------------------------------------------
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


def test_rk4_agrees_with_solve_ivp():
    load = HarmonicForce(1.2e5, 0.2)
    kw = dict(warmup=0.0, rtol=1e-8)
    a = simulate(*DEMO, load, 60.0, **kw)
    b = simulate(*DEMO, load, 60.0, integrator="solve_ivp", **kw)
    assert a.nonlinear.swing_deg > 15.0
    for name in ("displacement", "angle_deg", "acceleration"):
        ya, yb = getattr(a.nonlinear, name), getattr(b.nonlinear, name)
        np.testing.assert_allclose(ya, yb, atol=1e-6 * np.max(np.abs(yb)))
    assert b.substeps == 0


def test_step_is_refined_until_error_estimate_meets_rtol():
    load = HarmonicForce(1.2e5, 0.2)
    loose = simulate(*DEMO, load, 60.0, warmup=0.0, rtol=1e-3)
    tight = simulate(*DEMO, load, 60.0, warmup=0.0, rtol=1e-8)
    assert loose.substeps == 2 and tight.substeps > loose.substeps
    assert tight.integration_error <= 1e-8
    # the loose run's true error is bounded by its estimate (checked against the tight run)
    err = np.max(np.abs(loose.nonlinear.angle_deg - tight.nonlinear.angle_deg))
    assert err / np.max(np.abs(tight.nonlinear.angle_deg)) <= 3 * max(loose.integration_error,
                                                                      1e-12)


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


# --------------------------------------------------------------------------------------------
# Detuning, verdict, retuning, summary
# --------------------------------------------------------------------------------------------
def test_simulated_detuning_matches_exact_period_prediction():
    # Steady resonant swing near 27 deg: the damper frequency identified from the simulated
    # motion (equivalent linearisation = harmonic balance for a sine) agrees with the
    # exact-period prediction of functions.pendulum to O(theta^4) (about 3e-4 relative here).
    r = simulate(*DEMO, HarmonicForce(1e5, 0.2), 200.0)
    assert 20.0 < r.nonlinear.swing_deg < 35.0
    assert r.detuning == pytest.approx(amplitude_detuning(r.nonlinear.swing_deg), rel=1e-12)
    assert r.simulated_detuning == pytest.approx(r.detuning, rel=2e-3)
    assert r.equivalent_swing_deg == pytest.approx(r.nonlinear.swing_deg, rel=2e-3)
    assert r.damper_frequency_at_swing == pytest.approx(
        r.damper_frequency * (1 + r.detuning), rel=1e-12)


def test_verdict_flags_large_departure():
    r = simulate(*DEMO, HarmonicForce(2e5, 0.2), 100.0, warmup=300.0, tolerance=0.05)
    assert r.nonlinear.swing_deg > 60.0
    assert not r.within_tolerance and r.departure > 0.05
    assert "departs from the linear design" in r.verdict
    over = simulate(*DEMO, HarmonicForce(5e5, 0.2), 40.0, warmup=0.0, rtol=1e-3)
    assert over.nonlinear.swing_deg > 90.0 and not over.within_tolerance
    assert "not a valid damper response" in over.verdict
    assert any("beyond 90 deg" in n for n in over.notes)
    small = simulate(*DEMO, HarmonicForce(1e4, 0.2), 100.0, warmup=300.0)
    assert small.within_tolerance and "within 5%" in small.verdict


def test_retune_for_swing():
    # Den Hartog-type optimum for white-noise force, mu = 0.02 (Warburton 1982, from memory):
    # f = sqrt(1 + mu/2)/(1 + mu) = 0.9853, zeta_d = 0.0704; hanger cut to the small-angle length.
    f_t = 0.9853 * FS
    L0 = equivalent_length(f_t, 0.0)
    c = retune_for_swing(M, FS, ZS, MD, L0, 0.0704, HarmonicForce(1e5, 0.2), 25.0, 100.0,
                         warmup=300.0)
    assert c.retuned_length == pytest.approx(equivalent_length(f_t, 25.0), rel=1e-9)
    assert c.retuned_length < c.length
    assert c.target_frequency == pytest.approx(f_t, rel=1e-12)
    # same dashpot: c_d = 2 zeta m omega_d(L) unchanged
    cd0 = 2 * c.damper_damping * MD * math.sqrt(G / c.length)
    cd1 = 2 * c.retuned_damper_damping * MD * math.sqrt(G / c.retuned_length)
    assert cd1 == pytest.approx(cd0, rel=1e-12)
    assert abs(c.retuned_mistuning) < abs(c.mistuning)
    assert c.acceleration_ratio < 1.0
    assert c.after.damper_frequency > c.before.damper_frequency
    # None -> the swing of the first simulation
    d = retune_for_swing(M, FS, ZS, MD, L0, 0.0704, HarmonicForce(1e5, 0.2), None, 20.0,
                         warmup=0.0)
    assert d.design_swing_deg == pytest.approx(d.before.nonlinear.swing_deg)


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


def test_without_damper_response_is_reported():
    r = simulate(*DEMO, RandomForce(2e4, 0.1, seed=1), 600.0)
    assert r.without_damper.angle_deg is None and r.without_damper.stroke_peak == 0.0
    assert r.without_damper.displacement.shape == r.linear.displacement.shape == r.time.shape
    assert r.theory.displacement_rms < r.theory.displacement_rms_without_damper


# --------------------------------------------------------------------------------------------
# Bad inputs
# --------------------------------------------------------------------------------------------
LOAD = HarmonicForce(1e4, 0.2)


@pytest.mark.parametrize("kwargs, match", [
    (dict(modal_mass=-1.0), r"modal_mass=-1\.0 must be in \(0, inf\) \[kg\]"),
    (dict(frequency=0.0), r"frequency=0\.0 must be in \(0, inf\) \[Hz\]"),
    (dict(structural_damping=1.0), r"structural_damping=1\.0 must be in \[0, 1\) \[-\]"),
    (dict(damper_mass=0.0), r"damper_mass=0\.0 must be in \(0, inf\) \[kg\]"),
    (dict(length=-2.0), r"length=-2\.0 must be in \(0, inf\) \[m\]"),
    (dict(damper_damping=-0.1), r"damper_damping=-0\.1 must be in \[0, 1\] \[-\]"),
    (dict(g=float("nan")), r"g=nan must be a finite number"),
    (dict(load="wind"), r"load='wind' must be a HarmonicForce, a RandomForce or None"),
    (dict(duration=0.0), r"duration=0\.0 must be in \(0, 1e\+06\] \[s\]"),
    (dict(warmup=-1.0), r"warmup=-1\.0 must be in \[0, 1e\+06\] \[s\]"),
    (dict(initial_angle_deg=180.0), r"initial_angle_deg=180\.0 must be in \(-180, 180\) \[deg\]"),
    (dict(samples_per_period=7), r"samples_per_period=7\.0 must be in \[8, 4096\]"),
    (dict(samples_per_period=32.5), r"samples_per_period=32\.5 must be an integer"),
    (dict(rtol=0.0), r"rtol=0\.0 must be in \[1e-12, 0\.1\]"),
    (dict(tolerance=0.0), r"tolerance=0\.0 must be in \(0, 1\]"),
    (dict(integrator="euler"), r"integrator='euler' must be one of rk4, solve_ivp"),
    (dict(modal_mass=[1e6, 2e6]), r"modal_mass=\[1000000\.0, 2000000\.0\] must be a single number"),
    (dict(duration=1e6, samples_per_period=4096), r"needs more than 4000000 samples"),
])
def test_simulate_rejects_bad_input(kwargs, match):
    args = dict(modal_mass=M, frequency=FS, structural_damping=ZS, damper_mass=MD, length=L,
                damper_damping=ZD, load=LOAD, duration=10.0)
    args.update(kwargs)
    with pytest.raises(ValueError, match=match):
        simulate(**args)
    assert MAX_SAMPLES == 4_000_000


@pytest.mark.parametrize("make, match", [
    (lambda: HarmonicForce(-1.0, 0.2), r"amplitude=-1\.0 must be in \[0, inf\) \[N\]"),
    (lambda: HarmonicForce(1.0, 0.0), r"frequency=0\.0 must be in \(0, inf\) \[Hz\]"),
    (lambda: RandomForce(-1.0, 0.2), r"rms=-1\.0 must be in \[0, inf\) \[N\]"),
    (lambda: RandomForce(1.0, -0.2), r"corner_frequency=-0\.2 must be in \(0, inf\) \[Hz\]"),
    (lambda: RandomForce(1.0, 0.2, seed=-3), r"seed=-3 must be None or an integer"),
    (lambda: RandomForce(1.0, 0.2, seed=1.5), r"seed=1\.5 must be None or an integer"),
    (lambda: force_spectrum(-1.0, 1.0, 0.2), r"frequency=-1\.0 must be in \[0, inf\) \[Hz\]"),
    (lambda: random_response_theory(*DEMO, 1.0, 0.2, duration=0.0),
     r"duration=0\.0 must be in \(0, inf\) \[s\]"),
    (lambda: retune_for_swing(*DEMO, LOAD, 95.0, 10.0),
     r"design_swing_deg=95\.0 must be in \[0, 90\] \[deg\]"),
    (lambda: simulation_summary(*DEMO, "gust", 1.0, 0.2),
     r"load_type='gust' must be one of harmonic, random"),
])
def test_loads_and_helpers_reject_bad_input(make, match):
    with pytest.raises(ValueError, match=match):
        make()


def test_divergence_is_reported_not_returned():
    with pytest.raises(ValueError, match=r"nonlinear integration diverged"):
        simulate(*DEMO, HarmonicForce(1e9, 0.2), 100.0, warmup=0.0, samples_per_period=8)


def test_undamped_resonance_is_refused():
    with pytest.raises(ValueError, match=r"undamped resonance"):
        simulate(M, FS, 0.0, MD, L, ZD, HarmonicForce(1.0, FS), 10.0, warmup=0.0)
