# SPDX-License-Identifier: MIT
"""One pendulum mass serving two horizontal sway directions: springs, dashpots, combined stroke.

A pendulum swings in any horizontal direction, so one mass m_d can damp a tower's two sway
modes, direction 1 (the design's main mode, :func:`functions.design.design_damper`) and
direction 2 (the other sway direction, frequency f_s2, generalised mass M*_2). Conventions and
assumptions, used everywhere in this module:

* the same mass serves both directions: two mass ratios ``mu_i = m_d / M*_i``;
* each direction is tuned by the design's method (:func:`functions.design.design_tuning`)
  to its own damper frequency ``f_di = f_i f_si``;
* the hangers are cut for direction 1, which must be the direction with the LOWER damper
  frequency: the pendulum's length L is in tune at direction 1's design swing theta_1
  (:func:`functions.pendulum.pendulum_length`), where its gravity frequency is exactly f_d1;
* in direction 2 horizontal springs of total stiffness k_2 stiffen the pendulum. The textbook
  small-swing frequency of a mass on a pendulum with a horizontal spring is
  ``omega^2 = g / L + k / m``; the springs are sized with the pendulum's gravity part at
  direction 1's design swing, ``g / L_0 = (2 pi f_d1)^2`` (L_0 = g / (2 pi f_d1)^2, the
  ``small_angle_length`` of the design chain), so that
  ``k_2 = m_d ((2 pi f_d2)^2 - g / L_0) = m_d (2 pi)^2 (f_d2^2 - f_d1^2)``: direction 2 is in
  tune at the swing at which direction 1 is, and two identical directions need no springs;
* a dashpot per direction, ``c_i = 2 zeta_di m_d (2 pi f_di)``, damper damping on the damper's
  own frequency in that direction;
* per direction the design chain's relations: effective damping (white-noise variance,
  :func:`functions.damper.effective_damping`), acceleration with the damper by the resonant
  rule ``a_i sqrt(zeta_si / zeta_eff,i)``, displacement ``a_d / (2 pi f_si)^2`` and stroke by the
  RMS stroke ratio (:func:`functions.damper.stroke_ratio`);
* the two directions' responses are uncorrelated and their peaks combine by the square root of
  the sum of squares (SRSS): ``x_r = sqrt(x_1^2 + x_2^2)`` (common practice, no source; the
  absolute sum ``x_1 + x_2`` is shown as an upper bound); the radial swing is
  ``asin(x_r / L)``.

With a rigid hanger and a horizontal spring the swing detunes the spring part too: the
restoring moment is ``m g L sin(theta) + k L^2 sin(theta) cos(theta)``, so the spring part
softens about four times as fast as the gravity part (``1 - theta^2/2`` against
``1 - theta^2/8`` in omega^2, from the expansion of the equation of motion). The exact period of
that oscillator is a complete elliptic integral (:func:`spring_pendulum_frequency`, derived
here); the direction-2 detuning at its design swing is reported beside the design.

The closed forms a workbook writes are numpy twins with native worksheet formulas over defined
names (:data:`DIRECTION_FORMS`); :func:`design_second_direction` evaluates them in order.
The design chain evaluates them (:func:`functions.chain.sections`, part ``direction_2``);
:func:`functions.design.design_second_direction` gives direction 2 of a design. Imports run
one way: directions -> pendulum, quantities, worksheet.
"""
from __future__ import annotations

import math
from typing import Any, Callable

import numpy as np

from functions._validation import broadcast, check_range, scalar_or_array
from functions.pendulum import STANDARD_GRAVITY, exact_period
from functions.worksheet import twin

__all__ = [
    "spring_stiffness", "spring_pendulum_frequency", "combined_stroke", "DIRECTION_FORMS",
    "DIRECTION_INPUTS", "MAX_SPRING_SWING_DEG",
]

#: Largest swing accepted by :func:`spring_pendulum_frequency` [deg]: at 90 deg a horizontal
#: spring pulls along the hanger and no longer restores the swing.
MAX_SPRING_SWING_DEG = 90.0

#: Direction-2 inputs (defined names) and the direction-1 quantity whose range each takes.
DIRECTION_INPUTS: dict[str, str] = {
    "frequency_2": "frequency", "modal_mass_2": "modal_mass",
    "structural_damping_2": "structural_damping", "acceleration_2": "acceleration",
    "acceleration_limit_2": "acceleration_limit",
}

# relative allowance for a direction-2 damper frequency below direction 1's by rounding only
_SAME_FREQUENCY_RTOL = 1e-12
_TWO_PI = 2.0 * math.pi


# --------------------------------------------------------------------------------------------
# one spring-stiffened pendulum
# --------------------------------------------------------------------------------------------
def spring_stiffness(damper_mass, damper_frequency, pendulum_length, g=STANDARD_GRAVITY):
    """Horizontal spring stiffness lifting a pendulum to a frequency.

    .. math::

        k = m_d \\left((2\\pi f_d)^2 - \\frac{g}{L}\\right)

    Parameters
    ----------
    damper_mass : float or array_like
        Moving mass of the damper, > 0 [kg].
    damper_frequency : float or array_like
        Frequency the pendulum with its springs must have, > 0 [Hz].
    pendulum_length : float or array_like
        Length whose small-swing gravity frequency sqrt(g/L)/(2 pi) the springs add to, > 0
        (for the second direction of a design, the small-angle length g/(2 pi f_d1)^2 of
        direction 1: see Notes) [m].
    g : float or array_like, optional
        Acceleration of gravity, > 0 [m/s^2].

    Returns
    -------
    stiffness : float or numpy.ndarray
        Total horizontal spring stiffness acting on the mass in that direction, >= 0 [N/m].

    Raises
    ------
    ValueError
        If an argument is outside its range, the arrays do not broadcast, or the pendulum alone
        is already faster than ``damper_frequency`` (the stiffness would be negative: springs
        cannot lower a frequency: lengthen the hangers or swap the directions).

    Notes
    -----
    Small swings: the gravity stiffness m g / L and the spring add (textbook). A pendulum cut to
    L in tune at a design swing theta_1 has the gravity frequency sqrt(g/L_0)/(2 pi) at that
    swing, with L_0 = L (1 + e(theta_1))^2 its small-angle equivalent; passing L_0 tunes the
    springs at the same swing (what :func:`design_second_direction` does), passing L tunes them
    at small swings.

    Examples
    --------
    Invented damper: 287 t on an 11.3 m pendulum (0.1483 Hz) lifted to 0.16 Hz:

    >>> round(spring_stiffness(287e3, 0.16, 11.298) / 1e3, 1)
    40.9

    References
    ----------
    1. S. S. Rao, Mechanical Vibrations, 5th ed., Prentice Hall, 2011 (springs in parallel;
       the simple pendulum).
    """
    md = check_range("damper_mass", damper_mass, 0.0, low_open=True, unit="kg")
    fd = check_range("damper_frequency", damper_frequency, 0.0, low_open=True, unit="Hz")
    L = check_range("pendulum_length", pendulum_length, 0.0, low_open=True, unit="m")
    gg = check_range("g", g, 0.0, low_open=True, unit="m/s^2")
    md, fd, L, gg = broadcast(damper_mass=md, damper_frequency=fd, pendulum_length=L, g=gg)
    k = md * ((_TWO_PI * fd) ** 2 - gg / L)
    bad = k < 0.0
    if bad.any():
        i = int(np.flatnonzero(bad.ravel())[0])
        own = math.sqrt(gg.ravel()[i] / L.ravel()[i]) / _TWO_PI
        raise ValueError(
            f"damper_frequency={fd.ravel()[i].item()!r} must be in [{own:.6g}, inf) [Hz]: the "
            f"pendulum_length={L.ravel()[i].item()!r} m alone swings at {own:.6g} Hz and "
            "spring_stiffness would be negative (springs raise a frequency, never lower it)")
    return scalar_or_array(k)


def spring_pendulum_frequency(pendulum_length, spring_stiffness, damper_mass, swing_deg=0.0,
                              g=STANDARD_GRAVITY):
    """Frequency of a pendulum with a horizontal spring at a swing.

    .. math::

        \\ddot\\theta = -\\frac{g}{L}\\sin\\theta - \\frac{k}{m}\\sin\\theta\\cos\\theta,
        \\qquad f(0) = \\frac{1}{2\\pi}\\sqrt{\\frac{g}{L} + \\frac{k}{m}}

        T = \\frac{4 K(m_K)}{\\sqrt{s}},\\quad u = \\sin^2\\frac{\\theta_0}{2},\\quad
        a = \\frac{g}{L},\\ b = \\frac{k}{m}:\\quad
        \\begin{cases} s = a + b(1-2u),\\ m_K = \\frac{u(a - bu)}{s} & a \\ge bu \\\\
        s = (1-u)(a + b(1-u)),\\ m_K = \\frac{u(bu - a)}{s} & a < bu \\end{cases}

    Parameters
    ----------
    pendulum_length : float or array_like
        Hanger length L from pivot to the mass's centre, > 0 [m].
    spring_stiffness : float or array_like
        Total horizontal spring stiffness on the mass, >= 0 [N/m].
    damper_mass : float or array_like
        Moving mass, > 0 [kg].
    swing_deg : float or array_like, optional
        Swing amplitude theta_0 from the vertical, in [0, 90) [deg].
    g : float or array_like, optional
        Acceleration of gravity, > 0 [m/s^2].

    Returns
    -------
    frequency : float or numpy.ndarray
        Frequency 1/T of the free swing at that amplitude [Hz].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    Point mass on a rigid massless hanger; the spring acts horizontally on the mass with a
    force -k x, x = L sin(theta) (a long spring, or one guided horizontally); no damping. The
    energy integral, with u = sin^2(theta/2), is
    T = 2 int_0^u0 du / sqrt(u (1-u) (u0-u) (a + b (1-u0-u))), an elliptic integral over the
    two smallest of four real roots reduced to K (derived here; the tests check it against
    a time-domain integration). K is evaluated by :func:`functions.pendulum.exact_period`
    (length 1, gravity s, amplitude 2 asin(sqrt(m_K))). With k = 0 it is the exact simple
    pendulum; with g = 0 it is a pendulum in 2 theta (Landen's transformation). For small
    swings f^2(theta) ~ (g/L)(1 - theta^2/8) + (k/m)(1 - theta^2/2): the spring part detunes
    too, four times faster than gravity (theta in radians).

    Examples
    --------
    >>> round(spring_pendulum_frequency(11.288, 0.0, 287e3, 4.82), 6)   # the pendulum alone
    0.148279
    >>> round(spring_pendulum_frequency(11.288, 4.1e4, 287e3), 6)
    0.160077
    >>> round(spring_pendulum_frequency(11.288, 4.1e4, 287e3, 5.0), 6)
    0.159969

    References
    ----------
    1. P. F. Byrd, M. D. Friedman, Handbook of Elliptic Integrals for Engineers and
       Scientists, 2nd ed., Springer, 1971 (reduction of quartic integrals to K).
    2. M. Abramowitz, I. A. Stegun, Handbook of Mathematical Functions, NBS AMS-55 (1964),
       §17.2 (parameter m = k^2), §17.5 (Landen's transformation).
    """
    L = check_range("pendulum_length", pendulum_length, 0.0, low_open=True, unit="m")
    k = check_range("spring_stiffness", spring_stiffness, 0.0, unit="N/m")
    md = check_range("damper_mass", damper_mass, 0.0, low_open=True, unit="kg")
    th = check_range("swing_deg", swing_deg, 0.0, MAX_SPRING_SWING_DEG, high_open=True,
                     unit="deg")
    gg = check_range("g", g, 0.0, low_open=True, unit="m/s^2")
    L, k, md, th, gg = broadcast(pendulum_length=L, spring_stiffness=k, damper_mass=md,
                                 swing_deg=th, g=gg)
    a = gg / L
    b = k / md
    u = np.sin(np.radians(th) / 2.0) ** 2
    soft = a >= b * u                          # the gravity part holds the spring's softening
    s = np.where(soft, a + b * (1.0 - 2.0 * u), (1.0 - u) * (a + b * (1.0 - u)))
    m_k = np.abs(u * (a - b * u)) / s
    amplitude = np.degrees(2.0 * np.arcsin(np.sqrt(m_k)))
    period = np.asarray(exact_period(1.0, amplitude, s))
    return scalar_or_array(1.0 / period)


def combined_stroke(stroke_1, stroke_2):
    """Radial stroke of two uncorrelated directions (SRSS).

    .. math::

        x_r = \\sqrt{x_1^2 + x_2^2}

    Parameters
    ----------
    stroke_1 : float or array_like
        Peak stroke in direction 1, >= 0 [m].
    stroke_2 : float or array_like
        Peak stroke in direction 2, >= 0 [m].

    Returns
    -------
    stroke : float or numpy.ndarray
        Combined radial peak stroke [m].

    Raises
    ------
    ValueError
        If a stroke is negative or not finite, or the arrays do not broadcast.

    Notes
    -----
    Square root of the sum of squares for peaks of uncorrelated responses of the two sway
    directions (common practice, no source). Correlated responses (a diagonal wind, a coupled
    mode) can approach the absolute sum x_1 + x_2, an upper bound; show both directions' own
    peaks too.

    Examples
    --------
    >>> combined_stroke(0.9, 1.2)
    1.5

    References
    ----------
    1. Common practice for combining the peaks of uncorrelated orthogonal responses; no
       single published source.
    """
    x1 = check_range("stroke_1", stroke_1, 0.0, unit="m")
    x2 = check_range("stroke_2", stroke_2, 0.0, unit="m")
    x1, x2 = broadcast(stroke_1=x1, stroke_2=x2)
    return scalar_or_array(np.hypot(x1, x2))


# --------------------------------------------------------------------------------------------
# the second direction's closed forms, each beside its worksheet formula
# --------------------------------------------------------------------------------------------
def _form(formula: str, compute: Callable[..., Any], expression: str,
          source: str = "") -> Callable[..., Any]:
    return twin(formula, compute, expression, source)


#: Defined name -> numpy twin with its native worksheet formula, in the order of evaluation.
#: Direction-1 names are cells of :class:`functions.design.DesignResult`; direction-2 inputs
#: are :data:`DIRECTION_INPUTS`; the engine values between them (tuning_ratio_2,
#: damper_damping_2, effective_damping_2, stroke_ratio_2, required_mass_ratio_2,
#: frequency_at_swing_2) have no closed form on a worksheet.
DIRECTION_FORMS: dict[str, Callable[..., Any]] = {
    "mass_ratio_2": _form(
        "=damper_mass/modal_mass_2", lambda damper_mass, modal_mass_2:
        damper_mass / modal_mass_2, "m_d / M*_2", "The same mass in both directions"),
    "required_damping_2": _form(
        "=structural_damping_2*(acceleration_2/acceleration_limit_2)^2",
        lambda structural_damping_2, acceleration_2, acceleration_limit_2:
        structural_damping_2 * (acceleration_2 / acceleration_limit_2) ** 2,
        "zeta_s2 (a_2 / a_lim2)^2",
        "Resonant response ~ 1/sqrt(zeta): EN 1991-1-4:2005 Annex B, B.2(6)"),
    "damper_frequency_2": _form(
        "=tuning_ratio_2*frequency_2", lambda tuning_ratio_2, frequency_2:
        tuning_ratio_2 * frequency_2, "f_2 f_s2"),
    "spring_stiffness_2": _form(
        "=damper_mass*(2*PI())^2*MAX(0,damper_frequency_2^2-damper_frequency^2)",
        lambda damper_mass, damper_frequency_2, damper_frequency:
        damper_mass * _TWO_PI ** 2 * np.maximum(0.0, damper_frequency_2 ** 2
                                                - damper_frequency ** 2),
        "m_d ((2 pi f_d2)^2 - g / L_0), g / L_0 = (2 pi f_d1)^2",
        "omega^2 = g/L + k/m (textbook, small swing); in tune at direction 1's design swing"),
    "dashpot_2": _form(
        "=2*damper_mass*2*PI()*damper_frequency_2*damper_damping_2",
        lambda damper_mass, damper_frequency_2, damper_damping_2:
        2.0 * damper_mass * _TWO_PI * damper_frequency_2 * damper_damping_2,
        "2 m_d (2 pi f_d2) zeta_d2"),
    "swing_angle_deg_2": _form(
        "=DEGREES(ASIN(stroke_2/pendulum_length))", lambda stroke_2, pendulum_length:
        np.degrees(np.arcsin(stroke_2 / pendulum_length)), "asin(x_d2 / L)"),
    "small_swing_frequency_2": _form(
        "=SQRT(gravity/pendulum_length+spring_stiffness_2/damper_mass)/(2*PI())",
        lambda gravity, pendulum_length, spring_stiffness_2, damper_mass:
        np.sqrt(gravity / pendulum_length + spring_stiffness_2 / damper_mass) / _TWO_PI,
        "sqrt(g / L + k_2 / m_d) / (2 pi)", "Textbook, small swing"),
    "required_damper_mass_2": _form(
        "=required_mass_ratio_2*modal_mass_2", lambda required_mass_ratio_2, modal_mass_2:
        required_mass_ratio_2 * modal_mass_2, "mu_req2 M*_2"),
    "combined_stroke": _form(
        "=SQRT(stroke^2+stroke_2^2)", lambda stroke, stroke_2: np.sqrt(stroke ** 2
                                                                      + stroke_2 ** 2),
        "sqrt(x_d1^2 + x_d2^2)", "SRSS of uncorrelated peaks (common practice, no source)"),
    "stroke_sum": _form(
        "=stroke+stroke_2", lambda stroke, stroke_2: stroke + stroke_2, "x_d1 + x_d2",
        "Upper bound: fully correlated peaks"),
    "combined_swing_deg": _form(
        "=DEGREES(ASIN(combined_stroke/pendulum_length))",
        lambda combined_stroke, pendulum_length:
        np.degrees(np.arcsin(combined_stroke / pendulum_length)), "asin(x_r / L)"),
}
