# SPDX-License-Identifier: MIT
"""Tests of functions.envelope: the damper over a band of building frequencies.

Every reference comes from outside the module: the detuned responses from a state-space
(Lyapunov) variance of a dimensional two-mass model built here, with the damper's frequency in
hertz fixed and the building's stiffness changed (T. T. Soong & M. Grigoriu, Random Vibration
of Mechanical and Structural Systems, Prentice Hall, 1993, state-space covariance equation);
the worst case from a dense sweep of the band; the robust optimum from a brute-force grid
search; r = 1 from the nominal design (functions.design_damper); the pendulum lengths from
the textbook small-swing length L = g / (2 pi f)^2.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.linalg import solve_continuous_lyapunov

import functions
from functions.damper import effective_damping, optimal_tuning, required_mass_ratio
from functions.design import design_damper
from functions.envelope import (
    AsBuiltRetune,
    as_built_retune,
    band_mass_ratio,
    band_worst_case,
    detuned_acceleration,
    detuned_effective_damping,
    hanger_adjustment,
    robust_tuning,
)

G = 9.80665
MODAL_MASS = 2.0e7        # kg, invented
NOMINAL = 0.15            # Hz, invented


# ---------------------------------------------------------------------------------------------
# the independent reference: a dimensional two-mass model under white-noise force
# ---------------------------------------------------------------------------------------------
def lyapunov_variance(frequency_factor, mu, f, zd, zs, s0=1.0):
    """Variance of the building's displacement under a white-noise force of two-sided density
    s0 on the building: state-space covariance A P + P A^T + 2 pi s0 B B^T = 0 (Soong &
    Grigoriu 1993). The damper is built for the nominal frequency (f_d = f f_n, c_d = 2 zeta_d
    m_d omega_d); the building has the actual frequency r f_n through its stiffness."""
    m, md = MODAL_MASS, mu * MODAL_MASS
    ws = 2.0 * math.pi * NOMINAL * frequency_factor
    wd = 2.0 * math.pi * NOMINAL * f
    ks, cs = m * ws ** 2, 2.0 * zs * m * ws
    kd, cd = md * wd ** 2, 2.0 * zd * md * wd
    a = np.array([[0.0, 0.0, 1.0, 0.0],
                  [0.0, 0.0, 0.0, 1.0],
                  [-(ks + kd) / m, kd / m, -(cs + cd) / m, cd / m],
                  [kd / md, -kd / md, cd / md, -cd / md]])
    b = np.array([[0.0], [0.0], [1.0 / m], [0.0]])
    p = solve_continuous_lyapunov(a, -2.0 * math.pi * s0 * (b @ b.T))
    return p[0, 0]


def bare_variance(frequency_factor, zeta, s0=1.0):
    """sigma^2 = pi s0 / (c k) of a single oscillator under white noise (Soong & Grigoriu 1993;
    Crandall & Mark, Random Vibration in Mechanical Systems, 1963)."""
    w = 2.0 * math.pi * NOMINAL * frequency_factor
    return math.pi * s0 / ((2.0 * zeta * MODAL_MASS * w) * (MODAL_MASS * w ** 2))


DETUNED = [  # (r, mu, f, zeta_d, zeta_s, k)
    (0.9, 0.02, 0.985, 0.07, 0.01, 0.0),
    (1.1, 0.02, 0.985, 0.07, 0.01, 0.0),
    (0.8, 0.01, 0.99, 0.05, 0.015, -1.0 / 3.0),
    (1.2, 0.05, 0.95, 0.12, 0.02, 1.0),
    (1.0, 0.005, 1.0, 0.04, 0.005, 0.0),
    (0.95, 0.3, 0.8, 0.3, 0.05, -2.0),
]


@pytest.mark.parametrize("r, mu, f, zd, zs, k", DETUNED)
def test_detuned_effective_damping_against_lyapunov(r, mu, f, zd, zs, k):
    # Soong & Grigoriu 1993 (state-space covariance): zeta_eff is the damping of the bare
    # building whose variance equals the variance with the damper, pi s0 / (2 zeta w^3 M^2)
    var = lyapunov_variance(r, mu, f, zd, zs)
    w = 2.0 * math.pi * NOMINAL * r
    expected = math.pi / (2.0 * w ** 3 * MODAL_MASS ** 2 * var)
    assert detuned_effective_damping(r, mu, f, zd, zs) == pytest.approx(expected, rel=1e-9)


@pytest.mark.parametrize("r, mu, f, zd, zs, k", DETUNED)
def test_detuned_acceleration_against_lyapunov(r, mu, f, zd, zs, k):
    # resonant rule on the actual building: a r^k times the RMS ratio with / without the
    # damper, both variances from the reference model (Soong & Grigoriu 1993)
    ratio = math.sqrt(lyapunov_variance(r, mu, f, zd, zs) / bare_variance(r, zs))
    expected = 0.2 * r ** k * ratio
    assert detuned_acceleration(r, 0.2, mu, f, zd, zs, k) == pytest.approx(expected, rel=1e-9)


def test_undamped_building_effective_damping_against_lyapunov():
    # zeta_s = 0: the damper alone damps the mode (Soong & Grigoriu 1993)
    var = lyapunov_variance(1.05, 0.02, 0.98, 0.07, 0.0)
    w = 2.0 * math.pi * NOMINAL * 1.05
    expected = math.pi / (2.0 * w ** 3 * MODAL_MASS ** 2 * var)
    assert detuned_effective_damping(1.05, 0.02, 0.98, 0.07) == pytest.approx(expected,
                                                                              rel=1e-9)


def test_detuning_is_a_stiffness_change_not_a_tuning_change():
    # the damper keeps its frequency in Hz: at r the tuning it sees is f / r (computed)
    assert detuned_effective_damping(1.1, 0.02, 0.98, 0.07, 0.01) == pytest.approx(
        effective_damping(0.02, 0.98 / 1.1, 0.07, 0.01), rel=1e-15)


def test_arrays_broadcast_and_scalars_give_floats():
    r = np.linspace(0.9, 1.1, 5)
    zeta = detuned_effective_damping(r, 0.02, 0.985, 0.07, 0.01)
    assert isinstance(zeta, np.ndarray) and zeta.shape == (5,)
    assert isinstance(detuned_acceleration(1.0, 0.2, 0.02, 0.985, 0.07, 0.01), float)
    worst, where, z = band_worst_case(np.array([0.9, 0.95]), 1.1, 0.2, 0.02, 0.985, 0.07,
                                      np.array([[0.01], [0.02]]))
    assert worst.shape == where.shape == z.shape == (2, 2)
    f, zd = robust_tuning(np.array([0.01, 0.02]), 0.9, 1.1, 0.01)
    assert f.shape == zd.shape == (2,)


# ---------------------------------------------------------------------------------------------
# worst case over the band against a dense sweep of the reference model
# ---------------------------------------------------------------------------------------------
WORST = [  # (lower, upper, mu, f, zeta_d, zeta_s, k)
    (0.9, 1.1, 0.02, 0.9839, 0.0702, 0.01, 0.0),      # h2 damper: worst at an end
    (0.9, 1.1, 0.02, 0.9839 * 0.95, 0.0702, 0.01, 0.0),
    (0.7, 1.3, 0.02, 0.9839 * 1.3, 0.0702, 0.01, 2.0),  # worst inside the band (computed)
]


@pytest.mark.parametrize("lo, hi, mu, f, zd, zs, k", WORST)
def test_worst_case_against_a_dense_sweep(lo, hi, mu, f, zd, zs, k):
    # Soong & Grigoriu 1993 (Lyapunov) on 2,001 points of the band, then a finer sweep of
    # 2,001 points between the neighbours of the largest
    def acc(r):
        return 0.2 * r ** k * math.sqrt(lyapunov_variance(r, mu, f, zd, zs)
                                        / bare_variance(r, zs))
    r = np.linspace(lo, hi, 2001)
    a = np.array([acc(x) for x in r])
    j = int(np.argmax(a))
    fine = np.linspace(r[max(j - 1, 0)], r[min(j + 1, 2000)], 2001)
    af = np.array([acc(x) for x in fine])
    worst, where, zeta = band_worst_case(lo, hi, 0.2, mu, f, zd, zs, k)
    assert worst == pytest.approx(af.max(), rel=1e-9)
    assert worst >= af.max() * (1.0 - 1e-12)          # never below a sampled point
    assert where == pytest.approx(fine[np.argmax(af)], abs=2.0 * (fine[1] - fine[0]))
    assert zeta == pytest.approx(detuned_effective_damping(where, mu, f, zd, zs), rel=1e-12)


def test_interior_worst_case_is_inside():
    # the third case above peaks inside the band (computed: r = 1.0834)
    _, where, _ = band_worst_case(*WORST[2][:2], 0.2, *WORST[2][2:])
    assert 0.75 < where < 1.25


# ---------------------------------------------------------------------------------------------
# robust tuning against a brute-force grid search
# ---------------------------------------------------------------------------------------------
def _least_damping(mu, f, zd, zs, lo, hi, points=401):
    """Least zeta_eff over the band on ``points`` values of r (damper.effective_damping,
    itself checked against a Lyapunov solution in tests/test_damper.py)."""
    r = np.linspace(lo, hi, points)
    return np.min(effective_damping(mu, f[..., None] / r, zd[..., None], zs), axis=-1)


def brute_force_robust(mu, zs, lo, hi):
    """Grid search for max over (f, zeta_d) of min over r of zeta_eff: a 81 x 81 grid, zoomed
    five times around the best point (each time to 1/4 of the span)."""
    fc, zc, fs, zspan = 1.0, 0.15, 0.2, 0.28
    for _ in range(6):
        f = np.linspace(fc - fs / 2, fc + fs / 2, 81)[:, None] * np.ones((1, 81))
        zd = np.ones((81, 1)) * np.linspace(max(zc - zspan / 2, 1e-3), zc + zspan / 2, 81)
        v = _least_damping(mu, f, zd, zs, lo, hi)
        i, j = np.unravel_index(np.argmax(v), v.shape)
        fc, zc, fs, zspan = f[i, j], zd[i, j], fs / 4, zspan / 4
    return fc, zc, float(v[i, j])


@pytest.mark.parametrize("mu, zs, lo, hi", [(0.02, 0.01, 0.9, 1.1), (0.01, 0.02, 0.85, 1.05),
                                            (0.05, 0.0, 0.8, 1.2)])
def test_robust_tuning_against_brute_force(mu, zs, lo, hi):
    fb, zb, best = brute_force_robust(mu, zs, lo, hi)
    f, zd = robust_tuning(mu, lo, hi, zs)
    ours = float(_least_damping(mu, np.array(f), np.array(zd), zs, lo, hi))
    # the optimum's value agrees to 1e-6 and ours is never worse than the grid's best
    assert ours == pytest.approx(best, rel=1e-6)
    assert ours >= best * (1.0 - 1e-9)
    # its location: the maximin is flat in zeta_d, sharper in f (computed)
    assert f == pytest.approx(fb, abs=1e-4)
    assert zd == pytest.approx(zb, rel=2e-3)
    # the two ends are equal at the optimum
    ends = effective_damping(mu, f / np.array([lo, hi]), zd, zs)
    assert ends[0] == pytest.approx(ends[1], rel=1e-9)


def test_robust_tuning_over_its_validated_range():
    # every case of a grid over the documented range converges, with equal least damping at
    # the two ends of the band and none lower on 401 points inside (computed)
    grid = np.meshgrid(np.geomspace(1e-4, 0.5, 6), [0.0, 0.01, 0.1, 0.3], [0.5, 0.8, 0.95, 1.0],
                       [1.0, 1.02, 1.2, 2.0], indexing="ij")
    mu, zs, lo, hi = (x.ravel() for x in grid)
    f, zd = robust_tuning(mu, lo, hi, zs)
    ends = np.stack([effective_damping(mu, f / lo, zd, zs), effective_damping(mu, f / hi, zd, zs)])
    wide = hi > lo
    assert np.allclose(ends[0][wide], ends[1][wide], rtol=1e-9, atol=0.0)
    r = lo + (hi - lo) * np.linspace(0.0, 1.0, 401)[:, None]
    inside = np.min(effective_damping(mu, f / r, zd, zs), axis=0)
    assert np.all(inside >= ends.min(axis=0) * (1.0 - 1e-12))


def test_robust_tuning_beats_h2_at_the_worst_case():
    # h2 maximises zeta_eff at the nominal frequency only (Warburton 1982): over a band its
    # least zeta_eff is lower than the robust damper's
    f2, z2 = optimal_tuning(0.02, "h2", 0.01)
    fr, zr = robust_tuning(0.02, 0.9, 1.1, 0.01)
    h2 = band_worst_case(0.9, 1.1, 0.2, 0.02, f2, z2, 0.01)[0]
    robust = band_worst_case(0.9, 1.1, 0.2, 0.02, fr, zr, 0.01)[0]
    assert robust < h2 * 0.97
    assert zr > z2                        # more heavily damped, flatter (computed)


# ---------------------------------------------------------------------------------------------
# at r = 1 everything is the nominal design
# ---------------------------------------------------------------------------------------------
NOMINAL_CASE = dict(frequency=NOMINAL, modal_mass=MODAL_MASS, structural_damping=0.015,
                    acceleration=0.25, acceleration_limit=0.15, clearance=1.2)


@pytest.mark.parametrize("method", ["h2", "hinf", "den_hartog"])
def test_no_band_is_the_nominal_design(method):
    d = design_damper(**NOMINAL_CASE, tuning_method=method)
    mu, f, zd, zs = d.mass_ratio, d.tuning_ratio, d.damper_damping, 0.015
    assert detuned_effective_damping(1.0, mu, f, zd, zs) == pytest.approx(
        d.effective_damping, rel=1e-12)
    assert detuned_acceleration(1.0, 0.25, mu, f, zd, zs) == pytest.approx(
        d.acceleration_with_damper, rel=1e-12)
    worst, where, zeta = band_worst_case(1.0, 1.0, 0.25, mu, f, zd, zs)
    assert (worst, where) == (pytest.approx(d.acceleration_with_damper, rel=1e-12), 1.0)
    assert band_mass_ratio(0.25, 0.15, zs, 1.0, 1.0, method) == pytest.approx(mu, rel=1e-9)
    s = as_built_retune(NOMINAL, d.damper_mass, MODAL_MASS, zs, method, d.swing_angle_deg)
    assert isinstance(s, AsBuiltRetune)
    assert s.tuning_ratio == pytest.approx(f, rel=1e-12)
    assert s.damper_frequency == pytest.approx(d.damper_frequency, rel=1e-12)
    assert s.pendulum_length == pytest.approx(d.pendulum_length, rel=1e-12)
    assert s.damper_damping == pytest.approx(zd, rel=1e-12)
    assert s.dashpot == pytest.approx(d.dashpot, rel=1e-12)
    lo, hi = hanger_adjustment(NOMINAL, 1.0, 1.0, f, d.swing_angle_deg)
    assert lo == hi == pytest.approx(d.pendulum_length, rel=1e-12)


def test_robust_tuning_with_no_band_is_h2():
    # a band of no width: the h2 optimum (Warburton 1982 for zeta_s = 0)
    assert robust_tuning(0.02, 1.0, 1.0, 0.01) == pytest.approx(
        optimal_tuning(0.02, "h2", 0.01), rel=1e-14)
    assert robust_tuning(0.02, 1.0, 1.0) == pytest.approx(
        optimal_tuning(0.02, "white_noise_force"), rel=1e-9)


def test_robust_tuning_narrows_to_h2():
    # as the band closes, the robust damper tends to the h2 damper (computed)
    f2, z2 = optimal_tuning(0.02, "h2", 0.01)
    f, zd = robust_tuning(0.02, 0.999, 1.001, 0.01)
    assert f == pytest.approx(f2, rel=1e-3) and zd == pytest.approx(z2, rel=2e-2)


# ---------------------------------------------------------------------------------------------
# mass ratio over the band
# ---------------------------------------------------------------------------------------------
@pytest.mark.parametrize("method", ["h2", "den_hartog", "robust"])
def test_band_mass_ratio_meets_the_limit_at_the_worst_point(method):
    # Soong & Grigoriu 1993 (Lyapunov): with the mass ratio found, the damper the method tunes
    # keeps the acceleration at the limit at the worst of 401 points of the band
    mu = band_mass_ratio(0.25, 0.15, 0.015, 0.9, 1.1, method)
    if method == "robust":
        f, zd = robust_tuning(mu, 0.9, 1.1, 0.015)
    else:
        f, zd = optimal_tuning(mu, method, 0.015 if method == "h2" else 0.0)
    r = np.linspace(0.9, 1.1, 401)
    acc = [0.25 * math.sqrt(lyapunov_variance(x, mu, f, zd, 0.015) / bare_variance(x, 0.015))
           for x in r]
    assert max(acc) == pytest.approx(0.15, rel=1e-8)


def test_band_needs_more_mass_than_the_nominal_design():
    # the nominal required mass ratio (damper.required_mass_ratio) is too small for a band;
    # the robust tuning needs less than h2 tuned at nominal (computed)
    nominal = required_mass_ratio(0.015 * (0.25 / 0.15) ** 2, 0.015, "h2")
    h2 = band_mass_ratio(0.25, 0.15, 0.015, 0.9, 1.1)
    robust = band_mass_ratio(0.25, 0.15, 0.015, 0.9, 1.1, "robust")
    assert nominal < robust < h2


def test_band_mass_ratio_zero_when_the_building_alone_meets_the_limit():
    assert band_mass_ratio(0.1, 0.15, 0.015, 0.9, 1.1) == 0.0
    # with a rule a ~ r^k the building's own worst case counts: 0.14 * 0.9^-1 > 0.15
    assert band_mass_ratio(0.14, 0.15, 0.015, 0.9, 1.1, "h2", -1.0) > 0.0


# ---------------------------------------------------------------------------------------------
# hangers and the as-built retune against the textbook pendulum
# ---------------------------------------------------------------------------------------------
def test_hanger_lengths_at_small_swing_are_the_textbook_length():
    # common textbook: L = g / (2 pi f)^2 for small swings
    lo, hi = hanger_adjustment(NOMINAL, 0.9, 1.1, 0.985, 0.0)
    assert lo == pytest.approx(G / (2 * math.pi * 0.985 * 0.9 * NOMINAL) ** 2, rel=1e-14)
    assert hi == pytest.approx(G / (2 * math.pi * 0.985 * 1.1 * NOMINAL) ** 2, rel=1e-14)
    # at a finite swing the length is shorter by about theta^2/8 (period ratio 1 + theta^2/16,
    # common textbook series), here at 5 deg
    lo5, _ = hanger_adjustment(NOMINAL, 0.9, 1.1, 0.985, 5.0)
    theta = math.radians(5.0)
    assert lo5 / lo == pytest.approx(1.0 / (1.0 + theta ** 2 / 16) ** 2, rel=1e-5)


def test_as_built_retune_against_the_textbook_length_and_dashpot():
    # common textbook: L = g / (2 pi f_d)^2; dashpot c = 2 zeta m omega (definition of zeta)
    s = as_built_retune(0.14, 287e3, MODAL_MASS, 0.02, "den_hartog")
    mu = 287e3 / MODAL_MASS
    f = 1.0 / (1.0 + mu)                           # Den Hartog 1956, section 3.3
    zd = math.sqrt(3.0 * mu / (8.0 * (1.0 + mu)))  # on the damper's own frequency
    assert s.damper_frequency == pytest.approx(0.14 * f, rel=1e-14)
    assert s.pendulum_length == pytest.approx(G / (2 * math.pi * 0.14 * f) ** 2, rel=1e-14)
    assert s.dashpot == pytest.approx(2.0 * zd * 287e3 * 2.0 * math.pi * 0.14 * f, rel=1e-12)


def test_retune_from_a_lower_measured_frequency_lengthens_the_hanger():
    d = design_damper(**NOMINAL_CASE)
    s = as_built_retune(0.9 * NOMINAL, d.damper_mass, MODAL_MASS, 0.015, "h2",
                        d.swing_angle_deg)
    assert s.pendulum_length == pytest.approx(d.pendulum_length / 0.81, rel=1e-12)


# ---------------------------------------------------------------------------------------------
# bad inputs
# ---------------------------------------------------------------------------------------------
def test_band_above_nominal_is_refused():
    with pytest.raises(ValueError, match=r"band_lower=1\.05 must be in \[0\.5, 1\] \[-\].*"
                                         r"must contain the nominal"):
        band_worst_case(1.05, 1.1, 0.2, 0.02, 0.98, 0.07, 0.01)


def test_band_below_nominal_is_refused():
    with pytest.raises(ValueError, match=r"band_upper=0\.95 must be in \[1, 2\] \[-\]"):
        robust_tuning(0.02, 0.9, 0.95)


def test_negative_frequency_factor_is_refused():
    with pytest.raises(ValueError, match=r"frequency_factor=-0\.9 must be in \(0, inf\)"):
        detuned_effective_damping(-0.9, 0.02, 0.98, 0.07)


def test_negative_acceleration_is_refused():
    with pytest.raises(ValueError, match=r"acceleration=-0\.2 must be in \(0, inf\) \[m/s\^2\]"):
        detuned_acceleration(1.0, -0.2, 0.02, 0.98, 0.07, 0.01)


def test_negative_mass_ratio_is_refused():
    with pytest.raises(ValueError, match=r"mass_ratio=-0\.02 must be in \[0\.0001, 0\.5\]"):
        robust_tuning(-0.02, 0.9, 1.1)


def test_undamped_building_has_no_acceleration_ratio():
    with pytest.raises(ValueError, match=r"structural_damping=0\.0 must be in \(0, 1\)"):
        detuned_acceleration(1.0, 0.2, 0.02, 0.98, 0.07, 0.0)


def test_negative_measured_frequency_is_refused():
    with pytest.raises(ValueError, match=r"measured_frequency=-0\.14 must be in \(0, inf\) "
                                         r"\[Hz\]"):
        as_built_retune(-0.14, 287e3, MODAL_MASS)


def test_negative_design_swing_is_refused():
    with pytest.raises(ValueError, match=r"amplitude_deg=-5\.0 must be in \[0, 180\)"):
        hanger_adjustment(NOMINAL, 0.9, 1.1, 0.985, -5.0)


def test_unknown_method_is_refused():
    with pytest.raises(ValueError, match=r"method='robustest' must be one of"):
        band_mass_ratio(0.25, 0.15, 0.015, 0.9, 1.1, "robustest")


def test_robust_with_an_exponent_rule_is_refused():
    with pytest.raises(ValueError, match=r"response_exponent=-0\.3 must be 0 for "
                                         r"method='robust'"):
        band_mass_ratio(0.25, 0.15, 0.015, 0.9, 1.1, "robust", -0.3)


def test_unreachable_limit_is_refused():
    with pytest.raises(ValueError, match=r"acceleration_limit=0\.001 needs a mass_ratio above"):
        band_mass_ratio(0.25, 0.001, 0.015, 0.9, 1.1)


def test_exported_through_the_package():
    for name in ("robust_tuning", "band_worst_case", "as_built_retune", "hanger_adjustment"):
        assert getattr(functions, name) is getattr(functions.envelope, name)
