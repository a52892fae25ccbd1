# SPDX-License-Identifier: MIT
"""Linear and velocity-exponent dashpots (functions.dashpots).

References, named beside each check:
* the definitions of the two linearisations in S. J. Elliott, M. Ghandchi Tehrani,
  R. S. Langley, "Nonlinear damping and quasi-linear modelling", Phil. Trans. R. Soc. A 373
  (2015) 20140402: equal energy per cycle of a harmonic velocity, and equal mean power of a
  Gaussian velocity; both are computed here by numerical integration (scipy.integrate.quad)
  of the energy per cycle and of the Gaussian moment, independently of the Gamma-function
  forms the module uses;
* mpmath's Gamma function as a second, arbitrary-precision reference for the closed forms;
* a dense numerical maximisation over the cycle for the peak force bound (Hoelder's
  inequality: Hardy, Littlewood & Polya, Inequalities, 1952, Theorem 13).
"""
from __future__ import annotations

import math

import mpmath
import numpy as np
import pytest
from scipy.integrate import quad

from functions.dashpots import (DASHPOT_FORMS, RESPONSES, dashpot_coefficient, energy_constant,
                                equivalent_dashpot, mean_dashpot_power, peak_force_bound,
                                random_constant)
from functions.worksheet import form_of

ALPHAS = [0.1, 0.25, 0.3, 0.5, 0.75, 1.0, 1.35, 1.8, 2.0]


def _energy_per_cycle(c, a, amplitude, omega):
    """Energy dissipated in one period by F = C |v|^a sign v, v = V cos(w t) (quadrature)."""
    period = 2 * math.pi / omega
    power = lambda t: c * abs(amplitude * math.cos(omega * t)) ** (1 + a)  # noqa: E731
    return quad(power, 0.0, period, limit=200)[0]


def _gaussian_moment(a, sigma):
    """E|v|^(1+a) for a zero-mean Gaussian of standard deviation sigma (quadrature)."""
    pdf = lambda v: math.exp(-0.5 * (v / sigma) ** 2) / (sigma * math.sqrt(2 * math.pi))  # noqa
    return 2 * quad(lambda v: v ** (1 + a) * pdf(v), 0.0, math.inf)[0]


@pytest.mark.parametrize("a", ALPHAS)
def test_energy_constant_by_integration_of_the_energy_per_cycle(a):
    """Elliott et al. (2015): c_eq dissipates the same energy per cycle, pi c_eq V^2 / w."""
    c, amplitude, omega = 3.7e4, 0.8, 1.2
    c_eq = _energy_per_cycle(c, a, amplitude, omega) * omega / (math.pi * amplitude ** 2)
    assert equivalent_dashpot(c, a, amplitude, "harmonic") == pytest.approx(c_eq, rel=1e-10)
    lam = c_eq * math.pi / (c * amplitude ** (a - 1))
    assert energy_constant(a) == pytest.approx(lam, rel=1e-10)
    exact = mpmath.mpf(2) ** (2 + a) * mpmath.gamma(1 + a / 2) ** 2 / mpmath.gamma(2 + a)
    assert energy_constant(a) == pytest.approx(float(exact), rel=1e-14)


@pytest.mark.parametrize("a", ALPHAS)
def test_random_constant_by_integration_of_the_gaussian_moment(a):
    """Elliott et al. (2015): statistical linearisation, c_eq = C E|v|^(1+a) / sigma^2."""
    c, sigma = 2.1e4, 0.35
    c_eq = c * _gaussian_moment(a, sigma) / sigma ** 2
    assert equivalent_dashpot(c, a, sigma) == pytest.approx(c_eq, rel=1e-9)
    exact = mpmath.mpf(2) ** ((1 + a) / 2) * mpmath.gamma(1 + a / 2) / mpmath.sqrt(mpmath.pi)
    assert random_constant(a) == pytest.approx(float(exact), rel=1e-14)
    # mean power of the Gaussian velocity: C E|v|^(1+a)
    assert mean_dashpot_power(c, a, sigma) == pytest.approx(c * _gaussian_moment(a, sigma),
                                                            rel=1e-9)


def test_linear_dashpot_is_its_own_equivalent():
    assert energy_constant(1.0) == pytest.approx(math.pi, rel=1e-15)
    assert random_constant(1.0) == pytest.approx(1.0, rel=1e-15)
    for response in RESPONSES:
        assert equivalent_dashpot(5e4, 1.0, 0.7, response) == pytest.approx(5e4, rel=1e-14)
    # harmonic mean power of a linear dashpot: c V^2 / 2 (textbook)
    assert mean_dashpot_power(5e4, 1.0, 0.7, "harmonic") == pytest.approx(5e4 * 0.49 / 2)


@pytest.mark.parametrize("response", RESPONSES)
@pytest.mark.parametrize("a", ALPHAS)
def test_coefficient_inverts_the_equivalent_dashpot(a, response):
    c = dashpot_coefficient(19199.3, a, 0.25, response)
    assert equivalent_dashpot(c, a, 0.25, response) == pytest.approx(19199.3, rel=1e-13)


def test_harmonic_mean_power_by_integration():
    c, a, amplitude, omega = 1.1e4, 0.5, 1.3, 0.9
    period = 2 * math.pi / omega
    assert mean_dashpot_power(c, a, amplitude, "harmonic") == pytest.approx(
        _energy_per_cycle(c, a, amplitude, omega) / period, rel=1e-10)


def test_arrays_broadcast():
    got = equivalent_dashpot(1e4, np.array([0.5, 1.0]), np.array([[0.2], [0.4]]))
    assert got.shape == (2, 2)
    assert got[1, 1] == pytest.approx(1e4)


def _dense_peak(fk, fd, a, n=200001):
    t = np.linspace(0.0, 2 * np.pi, n)
    c = np.cos(t)
    return float(np.max(np.abs(fk * np.sin(t) + fd * np.abs(c) ** a * np.sign(c))))


@pytest.mark.parametrize("a", [0.05, 0.3, 0.5, 1.0, 1.5, 2.0])
@pytest.mark.parametrize("ratio", [0.0, 0.3, 0.7071, 1.0, 2.0, 5.0])
def test_peak_force_bound_holds_and_is_exact_for_a_linear_dashpot(a, ratio):
    fk, fd = 3e5, 3e5 * ratio
    peak = _dense_peak(fk, fd, a)
    bound = peak_force_bound(fk, fd, a)
    assert bound >= peak * (1 - 1e-9)
    if a == 1.0 or ratio == 0.0:
        assert bound == pytest.approx(peak, rel=1e-8)
    # measured over this grid: at most 2/sqrt(3) - 1 = 15.5 % above the peak (alpha = 2)
    assert bound <= peak * (2 / math.sqrt(3)) * (1 + 1e-9)


def test_peak_force_bound_overestimate_below_alpha_one():
    """For 0 < alpha <= 1 the bound is within 9 % of the dense maximum (measured here)."""
    worst = max(peak_force_bound(1.0, r, a) / _dense_peak(1.0, r, a, 20001)
                for a in np.linspace(0.05, 1.0, 20) for r in np.linspace(0.1, 5.0, 25))
    assert 1.0 <= worst < 1.09


def test_the_twins_formulas_read_the_chains_names():
    for name, form in DASHPOT_FORMS.items():
        assert form_of(form) is not None, name
    assert "GAMMALN" in DASHPOT_FORMS["dashpot_reference_force"].worksheet.formula


@pytest.mark.parametrize("call, message", [
    (lambda: energy_constant(0.0), r"velocity_exponent=0.0 must be in \(0, 2\]"),
    (lambda: random_constant(2.5), r"velocity_exponent=2.5 must be in \(0, 2\]"),
    (lambda: equivalent_dashpot(-1.0, 0.5, 0.3), "coefficient=-1.0"),
    (lambda: equivalent_dashpot(1.0, 0.5, 0.3, "storm"), "response='storm'"),
    (lambda: dashpot_coefficient(1e4, -1.0, 0.3), "velocity_exponent=-1.0"),
    (lambda: peak_force_bound(-1.0, 1.0, 1.0), "spring_force=-1.0"),
])
def test_bad_inputs_name_the_argument(call, message):
    with pytest.raises(ValueError, match=message):
        call()
