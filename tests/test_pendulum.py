# SPDX-License-Identifier: MIT
"""Pendulum core against outside references: mpmath, scipy.special, A&S ch. 17, series."""
from __future__ import annotations

import math

import mpmath as mp
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import solve_ivp
from scipy.special import ellipk

from functions.pendulum import (
    STANDARD_GRAVITY,
    amplitude_detuning,
    amplitude_for_error,
    compound_pendulum_length,
    equivalent_length,
    exact_period,
    folded_pendulum_length,
    pendulum_frequency,
    pendulum_motion,
    small_angle_error,
    small_angle_period,
    swing_angle,
)

mp.mp.dps = 40


def mp_period_ratio(amplitude_deg: float) -> mp.mpf:
    """T/T0 = 2 K(m) / pi, m = sin^2(theta0/2), evaluated by mpmath at 40 digits.

    The float amplitude is converted exactly, so this is the true value for that input.
    """
    a = mp.mpf(amplitude_deg)
    m = mp.sin(a * mp.pi / 360) ** 2
    return 2 * mp.ellipk(m) / mp.pi


# --- standard gravity ------------------------------------------------------------------------

def test_standard_gravity_is_the_cgpm_value():
    # 3rd CGPM (1901); BIPM SI Brochure, 9th ed. (2019): g_n = 9.80665 m/s^2 exactly.
    assert STANDARD_GRAVITY == 9.80665


# --- K(m) against reference values --------------------------------------------------------------

# Abramowitz & Stegun, Handbook of Mathematical Functions (NBS AMS-55, 1964), Table 17.1,
# K(m) with the parameter m = k^2 (NOT the modulus k). Values recalled to 10 decimals
# (from memory); the test also checks each against mpmath at 40 digits, so a mis-recalled
# row fails loudly instead of passing silently. The m = 0.4 row was recalled wrongly
# (1.7775193546) and corrected from that check; rows 0.2 and 0.3 differ from mpmath by one unit
# of the 10th decimal, so the tolerance is one unit of the last printed place.
AS_TABLE_17_1 = [
    (0.0, 1.5707963268),
    (0.1, 1.6124413487),
    (0.2, 1.6596235987),
    (0.3, 1.7138894481),
    (0.4, 1.7775193715),
    (0.5, 1.8540746773),
    (0.6, 1.9495677498),
    (0.7, 2.0753631353),
    (0.8, 2.2572053268),
    (0.9, 2.5780921134),
]


@pytest.mark.parametrize("m, k_printed", AS_TABLE_17_1)
def test_period_ratio_matches_as_table_17_1(m, k_printed):
    # amplitude whose parameter is m: sin^2(a/2) = m
    amplitude = 2 * math.degrees(math.asin(math.sqrt(m)))
    ratio = 1 + small_angle_error(amplitude)
    assert math.isclose(float(mp.ellipk(m)), k_printed, abs_tol=1.01e-10)  # the row itself
    assert math.isclose(ratio * math.pi / 2, k_printed, abs_tol=1.01e-10)  # printed to 10 places


def test_k_of_one_half_closed_form():
    # Exact identity K(1/2) = Gamma(1/4)^2 / (4 sqrt(pi)) (A&S 17.3.?; DLMF 19.6.1 form), computed.
    amplitude = 90.0  # sin^2(45 deg) = 1/2
    exact = mp.gamma(mp.mpf(1) / 4) ** 2 / (4 * mp.sqrt(mp.pi))
    ratio = 1 + small_angle_error(amplitude)
    assert math.isclose(ratio * math.pi / 2, float(exact), rel_tol=2e-15)
    assert math.isclose(float(exact), 1.854074677301372, rel_tol=1e-15)


AMPLITUDES = [1e-6, 1e-3, 0.5, 1.0, 5.0, 10.0, 15.0, 20.0, 30.0, 45.0, 60.0, 89.0, 90.0, 91.0,
              120.0, 150.0, 170.0, 175.0, 179.0, 179.5, 179.9, 179.99, 179.999, 179.99999]


@pytest.mark.parametrize("amplitude", AMPLITUDES)
def test_exact_period_against_mpmath(amplitude):
    # mpmath.ellipk at 40 digits is the reference; issue requirement: rel. error <= 1e-13.
    L, g = 12.5, STANDARD_GRAVITY
    ref = 4 * mp.sqrt(mp.mpf(L) / mp.mpf(g)) * mp.ellipk(mp.sin(mp.mpf(amplitude) * mp.pi / 360) ** 2)
    assert abs(exact_period(L, amplitude, g) / float(ref) - 1) <= 1e-13


@pytest.mark.parametrize("amplitude", AMPLITUDES)
def test_small_angle_error_relative_accuracy(amplitude):
    # e = T/T0 - 1 must keep relative precision even when tiny (series branch) -- mpmath reference.
    ref = mp_period_ratio(amplitude) - 1
    assert abs(small_angle_error(amplitude) / float(ref) - 1) <= 1e-12


def test_exact_period_agrees_with_plain_scipy_where_scipy_is_accurate():
    # scipy.special.ellipk(m) with m = sin^2(a/2): the textbook expression, valid away from 180 deg.
    a = np.linspace(0, 150, 301)
    L = 7.0
    plain = 4 * np.sqrt(L / STANDARD_GRAVITY) * ellipk(np.sin(np.radians(a) / 2) ** 2)
    np.testing.assert_allclose(exact_period(L, a), plain, rtol=1e-14)


def test_near_180_asymptote():
    # Near 180 deg: T/T0 ~ (2/pi) ln(4 / cos(theta0/2)) (computed; A&S 17.3.26 leading term).
    # The next term is O(p ln p) with p = cos^2(theta0/2): below 1e-9 at 179.99 deg.
    for a in (179.99, 179.999, 179.9999):
        c = math.sin(math.radians(180 - a) / 2)
        asym = 2 / math.pi * math.log(4 / c)
        assert math.isclose(1 + small_angle_error(a), asym, rel_tol=1e-8)


# --- series at small amplitudes --------------------------------------------------------------

@pytest.mark.parametrize("amplitude", [0.1, 1.0, 3.0, 5.0, 8.0])
def test_legendre_series(amplitude):
    # T/T0 = 1 + th^2/16 + 11 th^4/3072 + 173 th^6/737280 + 22931 th^8/1321205760 + O(th^10)
    # (coefficients computed by expanding 2K(m)/pi in theta with mpmath; the series in k^2 is
    # A&S 17.3.11).
    th = math.radians(amplitude)
    series = th**2 / 16 + 11 * th**4 / 3072 + 173 * th**6 / 737280 + 22931 * th**8 / 1321205760
    # truncation ~ th^10 * 1.3e-6 relative to e ~ th^2/16
    assert math.isclose(small_angle_error(amplitude), series, rel_tol=3e-5 * th**8 + 1e-14)


def test_small_angle_rule_of_thumb_15_degrees():
    # Rule of thumb of the trade: the small-angle period is good to about 15 deg (0.25 rad),
    # error about 0.43 % there. Common practice, no source.
    assert 0.0040 < small_angle_error(15.0) < 0.0045
    assert small_angle_error(10.0) < 0.002
    assert small_angle_error(30.0) > 0.015  # clearly not "small" any more
    assert 14.5 < amplitude_for_error(0.0043) < 15.5


# --- inverse and round trips -----------------------------------------------------------------

@pytest.mark.parametrize("error", [0.0, 1e-12, 1e-6, 1e-3, 0.01, 0.05, 0.1, 0.18, 0.2, 0.5, 1.0,
                                   2.0, 5.0, 10.0])
def test_amplitude_for_error_round_trip(error):
    a = amplitude_for_error(error)
    assert 0 <= a < 180
    if error == 0:
        assert a == 0
    elif error < 1:
        assert math.isclose(small_angle_error(a), error, rel_tol=1e-11)
    else:
        # Close to 180 deg the amplitude's own resolution (one ulp of 180 is 2.8e-14 deg) limits
        # the round trip: the answer must be within a few ulps of the true root.
        lo, hi = a, a
        for _ in range(4):
            lo, hi = np.nextafter(lo, 0.0), np.nextafter(hi, 180.0)
        assert small_angle_error(lo) <= error <= small_angle_error(hi)


def test_amplitude_for_one_percent_against_mpmath():
    # mpmath findroot of 2K(m)/pi - 1 = 0.01 (computed): 22.81384926195723 deg.
    ref = mp.findroot(lambda a: mp_period_ratio(a) - 1 - mp.mpf("0.01"), 22.8)
    assert math.isclose(amplitude_for_error(0.01), float(ref), rel_tol=1e-13)


@pytest.mark.parametrize("frequency, amplitude", [(0.1, 0.0), (0.15, 10.0), (0.3, 25.0),
                                                  (1.0, 60.0), (0.05, 170.0)])
def test_equivalent_length_round_trip(frequency, amplitude):
    L = equivalent_length(frequency, amplitude)
    assert math.isclose(exact_period(L, amplitude), 1 / frequency, rel_tol=1e-14)
    assert math.isclose(pendulum_frequency(L, amplitude), frequency, rel_tol=1e-14)


def test_small_angle_period_is_textbook_formula():
    # T0 = 2 pi sqrt(L/g); a 1 m pendulum at standard gravity: 2.0064092925890407 s (computed).
    assert math.isclose(small_angle_period(1.0), 2 * math.pi / math.sqrt(9.80665), rel_tol=1e-15)
    assert math.isclose(small_angle_period(1.0), exact_period(1.0, 0.0), rel_tol=1e-15)


# --- properties --------------------------------------------------------------------------------

@settings(max_examples=200, deadline=None)
@given(st.floats(0.0, 179.0), st.floats(0.0, 179.0))
def test_period_monotonic_in_amplitude(a1, a2):
    lo, hi = sorted((a1, a2))
    assert exact_period(3.0, lo) <= exact_period(3.0, hi)


@settings(max_examples=200, deadline=None)
@given(st.floats(1e-3, 1e3), st.floats(0.0, 170.0), st.floats(1.0, 30.0))
def test_period_scales_with_root_length_over_g(L, a, g):
    T = exact_period(L, a, g)
    assert math.isclose(T, exact_period(4 * L, a, g) / 2, rel_tol=1e-13)
    assert math.isclose(T / small_angle_period(L, g), 1 + small_angle_error(a), rel_tol=1e-13)


@settings(max_examples=200, deadline=None)
@given(st.floats(1e-6, 9.0))
def test_inverse_is_monotonic_and_consistent(e):
    a = amplitude_for_error(e)
    assert amplitude_for_error(e * 1.01) > a
    assert math.isclose(small_angle_error(a), e, rel_tol=1e-10)


@settings(max_examples=100, deadline=None)
@given(st.floats(0.0, 1e-3))
def test_limit_small_swing(a):
    # e -> theta^2/16 as theta -> 0 (first term of the series)
    th = math.radians(a)
    assert math.isclose(small_angle_error(a), th * th / 16, rel_tol=1e-6, abs_tol=1e-300)


def test_broadcasting_shapes():
    L = np.array([[1.0], [4.0]])
    a = np.array([0.0, 10.0, 20.0])
    T = exact_period(L, a)
    assert T.shape == (2, 3)
    assert isinstance(exact_period(1.0, 10.0), float)
    assert isinstance(small_angle_error(np.float64(3.0)), float)
    assert amplitude_for_error(np.array([0.01, 0.02])).shape == (2,)
    np.testing.assert_allclose(T[1], 2 * T[0], rtol=1e-15)


# --- motion ------------------------------------------------------------------------------------

@pytest.mark.parametrize("amplitude", [5.0, 60.0, 120.0, 170.0])
def test_motion_against_numerical_integration(amplitude):
    # theta'' = -(g/L) sin(theta), integrated with scipy's DOP853 at tight tolerance (independent).
    L = 4.0
    w2 = STANDARD_GRAVITY / L
    T = exact_period(L, amplitude)
    t = np.linspace(0, 2.3 * T, 57)
    sol = solve_ivp(lambda _t, y: [y[1], -w2 * math.sin(y[0])], (0, t[-1]),
                    [math.radians(amplitude), 0.0], method="DOP853", t_eval=t,
                    rtol=1e-12, atol=1e-13)
    np.testing.assert_allclose(pendulum_motion(t, L, amplitude), np.degrees(sol.y[0]),
                               atol=2e-6 * amplitude)


def test_motion_small_swing_is_harmonic():
    # theta(t) -> theta0 cos(w0 t) for small swings (textbook limit).
    t = np.linspace(0, 30, 101)
    w = 2 * math.pi / exact_period(2.0, 0.01)
    np.testing.assert_allclose(pendulum_motion(t, 2.0, 0.01), 0.01 * np.cos(w * t), atol=1e-12)


def test_motion_is_periodic_over_long_times():
    T = exact_period(9.0, 40.0)
    t = np.array([0.0, 1000 * T, 1000 * T + T / 2])
    np.testing.assert_allclose(pendulum_motion(t, 9.0, 40.0), [40.0, 40.0, -40.0], atol=1e-8)


# --- compound, folded, swing, detuning -----------------------------------------------------------

def test_compound_pendulum_uniform_rod():
    # Uniform rod about one end: I = m l^2 / 3, d = l/2 -> L_eq = 2 l / 3 (textbook, from memory).
    l, m = 3.0, 250.0
    assert math.isclose(compound_pendulum_length(m * l * l / 3, m, l / 2), 2 * l / 3, rel_tol=1e-15)


def test_compound_pendulum_point_mass_limit():
    assert math.isclose(compound_pendulum_length(5.0 * 2.0**2, 5.0, 2.0), 2.0, rel_tol=1e-15)


def test_folded_pendulum_adds_stage_lengths():
    assert folded_pendulum_length([3.0, 3.5]) == 6.5
    np.testing.assert_allclose(folded_pendulum_length([[1.0, 2.0], [3.0, 4.0]]), [3.0, 7.0])


def test_swing_angle_geometry():
    assert math.isclose(swing_angle(5.0, 10.0), 30.0, rel_tol=1e-14)
    assert swing_angle(0.0, 10.0) == 0.0


def test_detuning_is_minus_error_over_one_plus_error():
    e = small_angle_error(20.0)
    assert math.isclose(amplitude_detuning(20.0), -e / (1 + e), rel_tol=1e-15)
    assert math.isclose(pendulum_frequency(8.0, 20.0) / pendulum_frequency(8.0) - 1,
                        amplitude_detuning(20.0), rel_tol=1e-12)


# --- bad input -----------------------------------------------------------------------------------

@pytest.mark.parametrize("call, message", [
    (lambda: exact_period(-1.0), r"length=-1\.0 must be in \(0, inf\) \[m\]"),
    (lambda: exact_period(0.0), r"length=0\.0 must be in \(0, inf\)"),
    (lambda: exact_period(1.0, 180.0), r"amplitude_deg=180\.0 must be in \[0, 180\) \[deg\]"),
    (lambda: exact_period(1.0, -1.0), r"amplitude_deg=-1\.0 must be in \[0, 180\)"),
    (lambda: exact_period(1.0, 10.0, 0.0), r"g=0\.0 must be in \(0, inf\) \[m/s\^2\]"),
    (lambda: exact_period(float("nan")), r"length=nan must be a finite number"),
    (lambda: exact_period(float("inf")), r"length=inf must be a finite number"),
    (lambda: exact_period("ten"), r"length='ten' must be a finite number"),
    (lambda: exact_period(None), r"length=None must be a finite number"),
    (lambda: exact_period(True), r"length=True must be a finite number"),
    (lambda: exact_period([1.0, -2.0]), r"length=-2\.0 must be in \(0, inf\)"),
    (lambda: small_angle_period(-3.0), r"length=-3\.0 must be in \(0, inf\)"),
    (lambda: small_angle_error(200.0), r"amplitude_deg=200\.0 must be in \[0, 180\)"),
    (lambda: amplitude_for_error(-0.1), r"error=-0\.1 must be in \[0, 10\]"),
    (lambda: amplitude_for_error(11.0), r"error=11\.0 must be in \[0, 10\]"),
    (lambda: equivalent_length(0.0), r"frequency=0\.0 must be in \(0, inf\) \[Hz\]"),
    # A length beyond the largest float is named as such (no inf, no RuntimeWarning).
    (lambda: equivalent_length(1e-300, 10.0),
     r"frequency=1e-300 \[Hz\] is too small for a pendulum.*beyond the largest number"),
    (lambda: pendulum_frequency(1.0, 190.0), r"amplitude_deg=190\.0 must be in \[0, 180\)"),
    (lambda: compound_pendulum_length(1.0, 10.0, 1.0),
     r"inertia_about_pivot=1\.0 must be in \[mass\*pivot_to_centre\^2, inf\) = \[10, inf\)"),
    (lambda: compound_pendulum_length(1.0, 0.0, 1.0), r"mass=0\.0 must be in \(0, inf\)"),
    (lambda: folded_pendulum_length([2.0, 0.0]), r"stage_lengths=0\.0 must be in \(0, inf\)"),
    (lambda: folded_pendulum_length([]), r"stage_lengths=\[\] must hold at least one"),
    (lambda: pendulum_motion(float("nan"), 1.0, 10.0), r"time=nan must be a finite number"),
    (lambda: swing_angle(2.0, 1.0), r"stroke=2\.0 must be in \[0, length\] = \[0, 1\] \[m\]"),
    (lambda: swing_angle(-0.1, 1.0), r"stroke=-0\.1 must be in \[0, inf\) \[m\]"),
    (lambda: amplitude_detuning(180.0), r"amplitude_deg=180\.0 must be in \[0, 180\)"),
])
def test_bad_input_names_argument_value_and_range(call, message):
    with pytest.raises(ValueError, match=message):
        call()
