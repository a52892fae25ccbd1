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
Imports run one way: directions -> design, damper, pendulum.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, Callable, Mapping

import numpy as np

from functions._validation import broadcast, check_range, scalar_or_array
from functions.damper import (MIN_NUMERICAL_MASS_RATIO, effective_damping, required_mass_ratio,
                              stroke_ratio)
from functions.design import (ACCELERATION_RTOL, Check, CheckRule, DesignResult, _fmt, _rel,
                              design_tuning)
from functions.pendulum import STANDARD_GRAVITY, exact_period
from functions.quantities import DESIGN_INPUTS, by_name
from functions.worksheet import twin

__all__ = [
    "spring_stiffness", "spring_pendulum_frequency", "combined_stroke", "DIRECTION_FORMS",
    "DIRECTION_INPUTS", "DIRECTION_CHECK_RULES", "SecondDirection", "design_second_direction",
    "MAX_SPRING_SWING_DEG",
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
    "acceleration_with_damper_2": _form(
        "=acceleration_2*SQRT(structural_damping_2/effective_damping_2)",
        lambda acceleration_2, structural_damping_2, effective_damping_2:
        acceleration_2 * np.sqrt(structural_damping_2 / effective_damping_2),
        "a_2 sqrt(zeta_s2 / zeta_eff2)", "Resonant rule, as for zeta_req"),
    "displacement_2": _form(
        "=acceleration_with_damper_2/(2*PI()*frequency_2)^2",
        lambda acceleration_with_damper_2, frequency_2:
        acceleration_with_damper_2 / (_TWO_PI * frequency_2) ** 2,
        "a_d2 / (2 pi f_s2)^2", "Harmonic at the mode's frequency"),
    "stroke_2": _form(
        "=stroke_ratio_2*displacement_2", lambda stroke_ratio_2, displacement_2:
        stroke_ratio_2 * displacement_2, "(x_d/x_s)_2 x_s2", "Equal peak factors"),
    "swing_angle_deg_2": _form(
        "=DEGREES(ASIN(stroke_2/pendulum_length))", lambda stroke_2, pendulum_length:
        np.degrees(np.arcsin(stroke_2 / pendulum_length)), "asin(x_d2 / L)"),
    "small_swing_frequency_2": _form(
        "=SQRT(gravity/pendulum_length+spring_stiffness_2/damper_mass)/(2*PI())",
        lambda gravity, pendulum_length, spring_stiffness_2, damper_mass:
        np.sqrt(gravity / pendulum_length + spring_stiffness_2 / damper_mass) / _TWO_PI,
        "sqrt(g / L + k_2 / m_d) / (2 pi)", "Textbook, small swing"),
    "detuning_2": _form(
        "=frequency_at_swing_2/small_swing_frequency_2-1",
        lambda frequency_at_swing_2, small_swing_frequency_2:
        frequency_at_swing_2 / small_swing_frequency_2 - 1.0, "f_2(theta_2) / f_2(0) - 1",
        "functions.directions.spring_pendulum_frequency (exact)"),
    "frequency_error_2": _form(
        "=frequency_at_swing_2/damper_frequency_2-1",
        lambda frequency_at_swing_2, damper_frequency_2:
        frequency_at_swing_2 / damper_frequency_2 - 1.0, "f_2(theta_2) / f_d2 - 1",
        "Off the target at direction 2's own swing (springs sized at direction 1's)"),
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


#: The checks of the two-direction damper (the style of :data:`functions.design.CHECK_RULES`).
DIRECTION_CHECK_RULES: tuple[CheckRule, ...] = (
    CheckRule("acceleration_2", "Direction 2: acceleration with damper within its limit",
              twin("=acceleration_with_damper_2", lambda acceleration_with_damper_2:
                   acceleration_with_damper_2),
              "acceleration_limit_2", "a_d2 <= a_lim2 (1 + 1e-9)",
              lambda v, lim, lo, ok: f"direction 2: acceleration with damper {_fmt(v)} m/s^2 "
                                     f"{_rel(ok)} limit {_fmt(lim)} m/s^2",
              rtol=ACCELERATION_RTOL, unit="m/s^2"),
    CheckRule("combined_stroke", "Combined (SRSS) stroke within the clearance",
              twin("=combined_stroke", lambda combined_stroke: combined_stroke), "clearance",
              "sqrt(x_d1^2 + x_d2^2) <= x_max",
              lambda v, lim, lo, ok: f"combined stroke {_fmt(v)} m {_rel(ok)} clearance "
                                     f"{_fmt(lim)} m (SRSS, common practice, no source)",
              unit="m"),
    CheckRule("combined_swing", "Combined swing within the accepted angle",
              twin("=combined_swing_deg", lambda combined_swing_deg: combined_swing_deg),
              "max_swing_deg", "asin(x_r / L) <= theta_max",
              lambda v, lim, lo, ok: f"combined swing {_fmt(v)} deg {_rel(ok)} {_fmt(lim)} deg",
              unit="deg"),
    CheckRule("detuning_2", "Direction 2: detuning within the accepted value",
              twin("=ABS(detuning_2)", lambda detuning_2: np.abs(detuning_2)), "max_detuning",
              "|df_2/f_2| <= |df/f|_max",
              lambda v, lim, lo, ok: f"direction 2: |detuning| {v:.3%} {_rel(ok)} {lim:.3%}"),
)


# --------------------------------------------------------------------------------------------
# the second direction of a design
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True)
class SecondDirection:
    """The damper of a design in its second sway direction (SI units), and the checks.

    ``cells`` maps every defined name of direction 2 (inputs, :data:`DIRECTION_FORMS`, engine
    values) to its value; the numbers are also fields. ``checks`` are
    :data:`DIRECTION_CHECK_RULES` evaluated on the design's and direction 2's cells.
    """

    mass_ratio_2: float
    required_damping_2: float
    tuning_ratio_2: float
    damper_damping_2: float
    damper_frequency_2: float
    spring_stiffness_2: float
    dashpot_2: float
    effective_damping_2: float
    acceleration_with_damper_2: float
    displacement_2: float
    stroke_ratio_2: float
    stroke_2: float
    swing_angle_deg_2: float
    small_swing_frequency_2: float
    frequency_at_swing_2: float
    detuning_2: float
    frequency_error_2: float
    required_mass_ratio_2: float
    required_damper_mass_2: float
    combined_stroke: float
    stroke_sum: float
    combined_swing_deg: float
    cells: Mapping[str, float]
    checks: tuple[Check, ...]

    @property
    def ok(self) -> bool:
        """True when every check passes."""
        return all(c.ok for c in self.checks)

    def check(self, name: str) -> Check:
        """The check called ``name``."""
        for c in self.checks:
            if c.name == name:
                return c
        raise KeyError(name)


def _inputs(values: dict[str, Any]) -> dict[str, float]:
    """Direction-2 inputs checked against the ranges of their direction-1 quantities."""
    declared = by_name(DESIGN_INPUTS)
    out = {}
    for name, value in values.items():
        q = declared[DIRECTION_INPUTS[name]]
        arr = check_range(name, value, q.low, q.high, low_open=q.low_open,
                          high_open=q.high_open, unit=q.unit)
        if arr.ndim:
            raise ValueError(f"{name}={value!r} must be a single number: "
                             "design_second_direction sizes one damper")
        out[name] = float(arr)
    return out


def _negligible(need: float, zs: float, method: str) -> bool:
    """True when the smallest damper the optima cover already gives the damping needed."""
    if need <= zs:
        return True
    f, zd = design_tuning(MIN_NUMERICAL_MASS_RATIO, method, zs)
    return float(effective_damping(MIN_NUMERICAL_MASS_RATIO, f, zd, zs)) >= need


def _evaluate(name: str, cells: dict[str, float]) -> float:
    form = DIRECTION_FORMS[name]
    return float(form(**{n: cells[n] for n in form.worksheet.names}))


def design_second_direction(result, frequency, modal_mass, structural_damping, acceleration,
                            acceleration_limit):
    """The design's pendulum mass in its second sway direction.

    .. math::

        \\mu_2 = \\frac{m_d}{M^*_2},\\quad k_2 = m_d (2\\pi)^2 (f_{d2}^2 - f_{d1}^2),\\quad
        c_2 = 2\\zeta_{d2} m_d (2\\pi f_{d2}),\\quad
        a_{d2} = a_2\\sqrt{\\frac{\\zeta_{s2}}{\\zeta_{eff,2}}},\\quad
        x_r = \\sqrt{x_{d1}^2 + x_{d2}^2}

    Parameters
    ----------
    result : DesignResult
        Direction 1's design (:func:`functions.design.design_damper`): the damper's mass,
        tuning method, pendulum length and limits (clearance, swing, detuning) [-].
    frequency : float
        Frequency f_s2 of the second sway mode, in the range of the design's frequency [Hz].
    modal_mass : float
        Generalised mass M*_2 of that mode, normalised to 1 at the damper, > 0 [kg].
    structural_damping : float
        Damping ratio of that mode without the damper, in the design's range [-].
    acceleration : float
        Peak acceleration in direction 2 without the damper, > 0 [m/s^2].
    acceleration_limit : float
        Accepted peak acceleration in direction 2, > 0 [m/s^2].

    Returns
    -------
    direction : SecondDirection
        Every number of direction 2 and the combined stroke and swing (units in the class's
        ``cells``: Hz, kg, N/m, N s/m, m/s^2, m, deg, ratios) with the checks [-].

    Raises
    ------
    ValueError
        If an input is outside its range (named with the suffix ``_2``: ``frequency_2``, ...);
        if direction 2 needs a lower damper frequency than direction 1's pendulum gives
        (negative spring stiffness: give the lower-frequency direction as the main mode); if a
        stroke exceeds the pendulum length; if direction 2's limit needs a mass ratio out of
        reach (:func:`functions.damper.required_mass_ratio`).

    Notes
    -----
    Assumptions in the module docstring: one mass, hangers cut for direction 1, springs in
    direction 2 sized at direction 1's design swing, uncorrelated directions combined by SRSS
    (common practice, no source). The checks: direction 2's acceleration against its limit,
    the combined stroke against the design's clearance, the combined swing against its accepted
    swing and direction 2's detuning (frequency at its design swing against small swings,
    exact: :func:`spring_pendulum_frequency`) against the accepted detuning;
    ``frequency_error_2`` says how far that frequency lies from the target f_d2 (the springs
    are sized at direction 1's design swing with the gravity part only). Direction 1's own
    checks stay in ``result.checks``; with two directions the combined stroke and swing are the
    ones that govern the clearance. ``required_damper_mass_2`` is the mass direction 2 alone
    would need to meet its limit (0 when the structure alone meets it, or a damper of mass
    ratio 1e-4, the smallest the optima cover, would): raise the damper mass to it when
    direction 2 fails.

    Preliminary design aid: results must be checked by a licensed engineer against local
    codes, wind-tunnel data and the manufacturer's design.

    Examples
    --------
    Invented scenario: the tower of :func:`functions.design.design_damper`'s example, its second
    sway mode at 0.17 Hz with M*_2 = 18,000 t, 1.5 % damping, 0.2 m/s^2 against 0.15 m/s^2:

    >>> from functions.design import design_damper
    >>> r = design_damper(frequency=0.15, modal_mass=2.0e7, structural_damping=0.015,
    ...                   acceleration=0.25, acceleration_limit=0.15, clearance=1.2)
    >>> d = design_second_direction(r, 0.17, 1.8e7, 0.015, 0.2, 0.15)
    >>> round(d.mass_ratio_2, 5), round(d.damper_frequency_2, 5)
    (0.01594, 0.16784)
    >>> round(d.spring_stiffness_2 / 1e3, 1), round(d.acceleration_with_damper_2, 4)
    (70.1, 0.1177)
    >>> round(d.stroke_2, 3), round(d.combined_stroke, 3), d.ok
    (0.552, 1.098, True)

    References
    ----------
    1. G. B. Warburton, Earthquake Eng. Struct. Dyn. 10:381-401, 1982.
    2. EN 1991-1-4:2005, Eurocode 1: Actions on structures - Wind actions, Annex B, B.2(6).
    3. S. S. Rao, Mechanical Vibrations, 5th ed., Prentice Hall, 2011 (springs in parallel).
    """
    if not isinstance(result, DesignResult):
        raise ValueError(f"result={result!r} must be a DesignResult (functions.design_damper)")
    cells: dict[str, float] = dict(result.cells)
    cells.update(_inputs({"frequency_2": frequency, "modal_mass_2": modal_mass,
                          "structural_damping_2": structural_damping,
                          "acceleration_2": acceleration,
                          "acceleration_limit_2": acceleration_limit}))
    method = result.method
    for name in ("mass_ratio_2", "required_damping_2"):
        cells[name] = _evaluate(name, cells)
    f2, zd2 = design_tuning(cells["mass_ratio_2"], method, cells["structural_damping_2"])
    cells["tuning_ratio_2"], cells["damper_damping_2"] = float(f2), float(zd2)
    cells["damper_frequency_2"] = _evaluate("damper_frequency_2", cells)
    fd1, fd2 = cells["damper_frequency"], cells["damper_frequency_2"]
    if fd2 < fd1 * (1.0 - _SAME_FREQUENCY_RTOL):
        raise ValueError(
            f"frequency_2={cells['frequency_2']!r} Hz needs a damper frequency of {fd2:.6g} Hz, "
            f"below direction 1's {fd1:.6g} Hz to which the hangers are cut: spring_stiffness_2 "
            "would be negative. Give the lower-frequency direction as the main mode "
            "(design_damper) and this one as the second direction")
    for name in ("spring_stiffness_2", "dashpot_2"):
        cells[name] = _evaluate(name, cells)
    mu2, zs2 = cells["mass_ratio_2"], cells["structural_damping_2"]
    cells["effective_damping_2"] = float(effective_damping(mu2, f2, zd2, zs2))
    cells["stroke_ratio_2"] = float(stroke_ratio(mu2, f2, zd2, zs2))
    for name in ("acceleration_with_damper_2", "displacement_2", "stroke_2",
                 "combined_stroke", "stroke_sum"):
        cells[name] = _evaluate(name, cells)
    length = cells["pendulum_length"]
    for name in ("stroke_2", "combined_stroke"):
        if cells[name] >= length:
            raise ValueError(f"{name}={cells[name]!r} m must be below pendulum_length={length!r}"
                             " m: the pendulum cannot reach it; raise the damper mass or the "
                             "clearance")
    for name in ("swing_angle_deg_2", "small_swing_frequency_2", "combined_swing_deg"):
        cells[name] = _evaluate(name, cells)
    cells["frequency_at_swing_2"] = float(spring_pendulum_frequency(
        length, cells["spring_stiffness_2"], cells["damper_mass"], cells["swing_angle_deg_2"],
        cells["gravity"]))
    for name in ("detuning_2", "frequency_error_2"):
        cells[name] = _evaluate(name, cells)
    need = cells["required_damping_2"]
    try:
        cells["required_mass_ratio_2"] = 0.0 if _negligible(need, zs2, method) else float(
            required_mass_ratio(need, zs2, method))
    except ValueError as exc:
        raise ValueError(f"acceleration_2={cells['acceleration_2']!r} against "
                         f"acceleration_limit_2={cells['acceleration_limit_2']!r} [m/s^2] needs "
                         f"required_damping_2={need:.4g}: {exc}") from None
    cells["required_damper_mass_2"] = _evaluate("required_damper_mass_2", cells)
    checks = tuple(rule.evaluate(cells) for rule in DIRECTION_CHECK_RULES)
    own = {n: cells[n] for n in (*DIRECTION_INPUTS, *SecondDirection.__dataclass_fields__)
           if n in cells}
    fields = {n: cells[n] for n in SecondDirection.__dataclass_fields__ if n in cells}
    return SecondDirection(**fields, cells=own, checks=checks)
