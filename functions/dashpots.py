# SPDX-License-Identifier: MIT
"""Linear and velocity-exponent dashpots: equivalent linear dashpot, power, peak force.

A damper's dashpot is often not linear: fluid dashpots are made with a force growing as a
power of the velocity,

    F = C |v|^alpha sign(v),      0 < alpha <= 2  (alpha = 1: linear, C = c),

with ``alpha`` the velocity exponent (below 1 the force flattens at high velocity, which
limits the peak force). The design chain sizes a LINEAR dashpot c; this module finds the
exponent dashpot that dissipates the same, at the velocity the damper sees, and the force and
power that follow.

Assumptions, used everywhere in this module:

* equivalent linearisation by equal dissipation: for a harmonic velocity v = V cos(w t) the
  linear dashpot that dissipates the same energy per cycle (S. J. Elliott, M. Ghandchi
  Tehrani, R. S. Langley, "Nonlinear damping and quasi-linear modelling", Phil. Trans. R.
  Soc. A 373 (2015) 20140402), and for a Gaussian velocity of standard deviation sigma the
  statistical linearisation of the same paper (equal mean power). The Gamma-function forms
  of the two constants are derived here (the moments of |cos| and of a Gaussian), not
  copied;
* the equivalent dashpot holds at ONE velocity level: the damping the damper gets varies with
  its motion as ``velocity^(alpha - 1)`` (:func:`equivalent_dashpot`);
* the design chain's stroke is a peak and its motion is taken at the structure's frequency:
  the peak velocity is ``2 pi f_s x_d`` and its standard deviation that over the Davenport
  peak factor (:func:`functions.damper.peak_factor`).

Contents: the constants lambda (harmonic) and kappa (random) (:func:`energy_constant`,
:func:`random_constant`); the equivalent linear dashpot and its inverse
(:func:`equivalent_dashpot`, :func:`dashpot_coefficient`); the mean dissipated power
(:func:`mean_dashpot_power`); a bound
of the peak horizontal force of spring and dashpot together (:func:`peak_force_bound`).
:data:`DASHPOT_FORMS` holds the closed forms a workbook shows, each a numpy twin with its
native worksheet formula over the design chain's defined names. Imports run one way:
dashpots -> damper, worksheet.
"""
from __future__ import annotations

from typing import Any, Callable

import numpy as np
from scipy.special import gammaln

from functions._validation import (broadcast, check_range, non_negative, positive,
                                   scalar_or_array)
from functions.damper import peak_factor
from functions.worksheet import renamed, twin

__all__ = [
    "VELOCITY_EXPONENTS", "RESPONSES", "DASHPOT_FORMS", "energy_constant",
    "random_constant", "equivalent_dashpot", "dashpot_coefficient", "mean_dashpot_power",
    "peak_force_bound",
]

#: Accepted velocity exponents alpha: the open-closed interval (0, 2] [-].
VELOCITY_EXPONENTS = (0.0, 2.0)

#: Kinds of response the equivalent dashpot is found for: a Gaussian random velocity (the
#: ``velocity`` is its standard deviation) or a harmonic one (its amplitude).
RESPONSES = ("random", "harmonic")

_TWO_PI = 2.0 * np.pi


# --------------------------------------------------------------------------------------------
# arguments and kernels (the public functions and the worksheet twins share the kernels)
# --------------------------------------------------------------------------------------------
def _exponent(value) -> np.ndarray:
    return check_range("velocity_exponent", value, *VELOCITY_EXPONENTS, low_open=True,
                       unit="-")


def _response(response) -> str:
    text = response.strip().lower() if isinstance(response, str) else None
    if text not in RESPONSES:
        raise ValueError(f"response={response!r} must be one of: {', '.join(RESPONSES)}")
    return text


def _law_arguments(name, value, unit, velocity_exponent, velocity, response,
                   velocity_check=positive):
    """The response text and the broadcast (constant, exponent, velocity) of a law function."""
    kind = _response(response)
    c = non_negative(name, value, unit)
    a = _exponent(velocity_exponent)
    v = velocity_check("velocity", velocity, "m/s")
    return (kind, *broadcast(**{name: c, "velocity_exponent": a, "velocity": v}))


def _lambda(a):
    """2^(2+a) Gamma(1+a/2)^2 / Gamma(2+a): energy per cycle over C V^(1+a) / omega."""
    return 2.0 ** (2.0 + a) * np.exp(2.0 * gammaln(1.0 + a / 2.0) - gammaln(2.0 + a))


def _kappa(a):
    """2^((1+a)/2) Gamma(1+a/2) / sqrt(pi): E|v|^(1+a) over sigma^(1+a)."""
    return 2.0 ** ((1.0 + a) / 2.0) * np.exp(gammaln(1.0 + a / 2.0)) / np.sqrt(np.pi)


def _per_velocity(a, response: str):
    """c_eq / (C velocity^(a-1)) of the given response."""
    return _kappa(a) if response == "random" else _lambda(a) / np.pi


def _holder_exponent(a):
    return 2.0 / (2.0 - np.minimum(a, 1.0))


def _bound(fk, fd, a):
    p = _holder_exponent(a)
    return (fk ** p + fd ** p) ** (1.0 / p)


# --------------------------------------------------------------------------------------------
# the constants
# --------------------------------------------------------------------------------------------
def energy_constant(velocity_exponent):
    """Energy constant lambda of a dashpot in harmonic motion.

    .. math::

        \\lambda(\\alpha) = \\frac{2^{2+\\alpha}\\,\\Gamma(1+\\alpha/2)^2}{\\Gamma(2+\\alpha)}
        = \\int_0^{2\\pi} |\\cos\\theta|^{1+\\alpha}\\,d\\theta,\\qquad \\lambda(1) = \\pi

    Parameters
    ----------
    velocity_exponent : float or array_like
        Velocity exponent alpha of the dashpot law F = C |v|^alpha sign(v), in (0, 2] [-].

    Returns
    -------
    constant : float or numpy.ndarray
        lambda: the energy per cycle of the dashpot under v = V cos(omega t) is
        lambda C V^(1+alpha) / omega [-].

    Raises
    ------
    ValueError
        If velocity_exponent is outside (0, 2].

    Notes
    -----
    The equal-energy linearisation of Elliott, Ghandchi Tehrani & Langley (2015): the linear
    dashpot dissipating the same energy per cycle is c_eq = lambda C V^(alpha-1) / pi. The
    integral of |cos|^(1+alpha) is a Beta function, 2 sqrt(pi) Gamma(1+alpha/2) /
    Gamma((3+alpha)/2); Legendre's duplication formula turns it into the form above (derived
    here). lambda falls from 4 (alpha -> 0, a friction-like dashpot) through pi (linear) to
    8/3 (alpha = 2).

    Examples
    --------
    >>> round(energy_constant(1.0), 12)
    3.14159265359
    >>> round(energy_constant(2.0), 6), round(energy_constant(0.5), 6)
    (2.666667, 3.496077)

    References
    ----------
    1. S. J. Elliott, M. Ghandchi Tehrani, R. S. Langley, "Nonlinear damping and quasi-linear
       modelling", Phil. Trans. R. Soc. A 373 (2015) 20140402.
    2. Abramowitz & Stegun, Handbook of Mathematical Functions (NBS AMS-55, 1964), 6.1.18
       (duplication formula) and 6.2.1 (Beta function).
    """
    a = _exponent(velocity_exponent)
    return scalar_or_array(_lambda(a))


def random_constant(velocity_exponent):
    """Statistical-linearisation constant kappa of a dashpot.

    .. math::

        \\kappa(\\alpha) = \\frac{E|v|^{1+\\alpha}}{\\sigma^{1+\\alpha}}
        = \\frac{2^{(1+\\alpha)/2}\\,\\Gamma(1+\\alpha/2)}{\\sqrt{\\pi}},\\qquad \\kappa(1) = 1

    Parameters
    ----------
    velocity_exponent : float or array_like
        Velocity exponent alpha of the dashpot law F = C |v|^alpha sign(v), in (0, 2] [-].

    Returns
    -------
    constant : float or numpy.ndarray
        kappa: the statistically linearised dashpot under a Gaussian velocity of standard
        deviation sigma is c_eq = kappa C sigma^(alpha-1) [-].

    Raises
    ------
    ValueError
        If velocity_exponent is outside (0, 2].

    Notes
    -----
    Statistical linearisation (Elliott, Ghandchi Tehrani & Langley 2015): c_eq = E[F v] /
    E[v^2] = C E|v|^(1+alpha) / sigma^2, with the absolute moment of a zero-mean Gaussian,
    E|v|^p = sigma^p 2^(p/2) Gamma((p+1)/2) / sqrt(pi), at p = 1 + alpha (derived here).
    kappa runs from sqrt(2/pi) (alpha -> 0) through 1 (linear) to 2 sqrt(2/pi) (alpha = 2).

    Examples
    --------
    >>> random_constant(1.0)
    1.0
    >>> round(random_constant(2.0), 6), round(random_constant(0.5), 6)
    (1.595769, 0.86004)

    References
    ----------
    1. S. J. Elliott, M. Ghandchi Tehrani, R. S. Langley, "Nonlinear damping and quasi-linear
       modelling", Phil. Trans. R. Soc. A 373 (2015) 20140402.
    2. A. Papoulis, S. U. Pillai, Probability, Random Variables and Stochastic Processes,
       4th ed., McGraw-Hill, 2002, ch. 5 (moments of the normal distribution).
    """
    a = _exponent(velocity_exponent)
    return scalar_or_array(_kappa(a))


# --------------------------------------------------------------------------------------------
# equivalent dashpot, its inverse, power
# --------------------------------------------------------------------------------------------
def equivalent_dashpot(coefficient, velocity_exponent, velocity, response="random"):
    """Linear dashpot equivalent to a velocity-exponent dashpot.

    .. math::

        c_{eq} = \\kappa(\\alpha)\\,C\\,\\sigma_v^{\\alpha-1}\\ \\text{(random)},\\qquad
        c_{eq} = \\frac{\\lambda(\\alpha)}{\\pi}\\,C\\,V^{\\alpha-1}\\ \\text{(harmonic)}

    Parameters
    ----------
    coefficient : float or array_like
        Dashpot coefficient C of F = C |v|^alpha sign(v), >= 0 [N (s/m)^alpha].
    velocity_exponent : float or array_like
        Velocity exponent alpha, in (0, 2] [-].
    velocity : float or array_like
        Standard deviation sigma of the dashpot's velocity (response "random") or its
        amplitude V (response "harmonic"), > 0 [m/s].
    response : str, optional
        "random" (default: a Gaussian velocity, statistical linearisation) or "harmonic"
        (v = V cos(omega t), equal energy per cycle) [-].

    Returns
    -------
    dashpot : float or numpy.ndarray
        Linear dashpot c_eq dissipating the same at that velocity [N s/m].

    Raises
    ------
    ValueError
        If an argument is outside its range, response is not one of :data:`RESPONSES`, or
        the arrays do not broadcast.

    Notes
    -----
    Elliott, Ghandchi Tehrani & Langley (2015); constants :func:`random_constant` and
    :func:`energy_constant`. For alpha = 1 both give c_eq = C. For alpha < 1 the equivalent
    dashpot falls as the velocity grows: a damper sized at the service level is less damped,
    relative to its optimum, at a stronger wind (and more at a weaker one).

    Examples
    --------
    >>> round(equivalent_dashpot(20000.0, 0.5, 0.25))
    34402
    >>> round(equivalent_dashpot(20000.0, 0.5, 0.25, "harmonic"))
    44513

    References
    ----------
    1. S. J. Elliott, M. Ghandchi Tehrani, R. S. Langley, "Nonlinear damping and quasi-linear
       modelling", Phil. Trans. R. Soc. A 373 (2015) 20140402.
    """
    kind, c, a, v = _law_arguments("coefficient", coefficient, "N (s/m)^alpha",
                                   velocity_exponent, velocity, response)
    return scalar_or_array(_per_velocity(a, kind) * c * v ** (a - 1.0))


def dashpot_coefficient(dashpot, velocity_exponent, velocity, response="random"):
    """Exponent-dashpot coefficient equivalent to a linear dashpot.

    .. math::

        C = \\frac{c}{\\kappa(\\alpha)\\,\\sigma_v^{\\alpha-1}}\\ \\text{(random)},\\qquad
        C = \\frac{\\pi\\,c}{\\lambda(\\alpha)\\,V^{\\alpha-1}}\\ \\text{(harmonic)}

    Parameters
    ----------
    dashpot : float or array_like
        Linear dashpot c to be matched (e.g. the design chain's), >= 0 [N s/m].
    velocity_exponent : float or array_like
        Velocity exponent alpha of the dashpot to be made, in (0, 2] [-].
    velocity : float or array_like
        Standard deviation sigma (response "random") or amplitude V (response "harmonic") of
        the dashpot's velocity at which the two dissipate the same, > 0 [m/s].
    response : str, optional
        "random" (default) or "harmonic", as in :func:`equivalent_dashpot` [-].

    Returns
    -------
    coefficient : float or numpy.ndarray
        C of F = C |v|^alpha sign(v) whose equivalent linear dashpot at that velocity is c
        [N (s/m)^alpha].

    Raises
    ------
    ValueError
        If an argument is outside its range, response is not one of :data:`RESPONSES`, or
        the arrays do not broadcast.

    Notes
    -----
    The inverse of :func:`equivalent_dashpot` (Elliott, Ghandchi Tehrani & Langley 2015). A
    maker usually states the dashpot by a force at a reference velocity, F_ref = C v_ref^alpha.

    Examples
    --------
    >>> round(dashpot_coefficient(34401.6, 0.5, 0.25), 1)
    20000.0
    >>> dashpot_coefficient(30000.0, 1.0, 0.4, "harmonic")
    30000.0

    References
    ----------
    1. S. J. Elliott, M. Ghandchi Tehrani, R. S. Langley, "Nonlinear damping and quasi-linear
       modelling", Phil. Trans. R. Soc. A 373 (2015) 20140402.
    """
    kind, c, a, v = _law_arguments("dashpot", dashpot, "N s/m", velocity_exponent, velocity,
                                   response)
    return scalar_or_array(c / (_per_velocity(a, kind) * v ** (a - 1.0)))


def mean_dashpot_power(coefficient, velocity_exponent, velocity, response="random"):
    """Mean power dissipated by a velocity-exponent dashpot.

    .. math::

        \\bar P = \\kappa(\\alpha)\\,C\\,\\sigma_v^{1+\\alpha}\\ \\text{(random)},\\qquad
        \\bar P = \\frac{\\lambda(\\alpha)}{2\\pi}\\,C\\,V^{1+\\alpha}\\ \\text{(harmonic)}

    Parameters
    ----------
    coefficient : float or array_like
        Dashpot coefficient C of F = C |v|^alpha sign(v), >= 0 [N (s/m)^alpha].
    velocity_exponent : float or array_like
        Velocity exponent alpha, in (0, 2] [-].
    velocity : float or array_like
        Standard deviation sigma (response "random") or amplitude V (response "harmonic") of
        the dashpot's velocity, >= 0 [m/s].
    response : str, optional
        "random" (default) or "harmonic" [-].

    Returns
    -------
    power : float or numpy.ndarray
        Mean of F v over time: the heat the dashpot must shed [W].

    Raises
    ------
    ValueError
        If an argument is outside its range, response is not one of :data:`RESPONSES`, or
        the arrays do not broadcast.

    Notes
    -----
    Random: E[F v] = C E|v|^(1+alpha) (Gaussian velocity, :func:`random_constant`).
    Harmonic: the energy per cycle lambda C V^(1+alpha) / omega over the period 2 pi / omega
    (:func:`energy_constant`); the frequency cancels. Linear dashpot: c sigma^2 and c V^2 / 2.

    Examples
    --------
    >>> round(mean_dashpot_power(20000.0, 0.5, 0.25), 1)
    2150.1
    >>> round(mean_dashpot_power(30000.0, 1.0, 0.4, "harmonic"), 9)
    2400.0

    References
    ----------
    1. S. J. Elliott, M. Ghandchi Tehrani, R. S. Langley, "Nonlinear damping and quasi-linear
       modelling", Phil. Trans. R. Soc. A 373 (2015) 20140402.
    """
    kind, c, a, v = _law_arguments("coefficient", coefficient, "N (s/m)^alpha",
                                   velocity_exponent, velocity, response, non_negative)
    factor = _kappa(a) if kind == "random" else _lambda(a) / _TWO_PI
    return scalar_or_array(factor * c * v ** (1.0 + a))


# --------------------------------------------------------------------------------------------
# peak force
# --------------------------------------------------------------------------------------------
def peak_force_bound(spring_force, dashpot_force, velocity_exponent):
    """Upper bound of the peak force of a spring and dashpot together.

    .. math::

        \\max_t \\left|F_k \\sin t + F_d |\\cos t|^{\\alpha}\\,\\mathrm{sign}(\\cos t)\\right|
        \\le \\left(F_k^{\\,p} + F_d^{\\,p}\\right)^{1/p},\\qquad
        p = \\frac{2}{2 - \\min(\\alpha, 1)}

    Parameters
    ----------
    spring_force : float or array_like
        Peak spring (restoring) force F_k = k x, >= 0 [N].
    dashpot_force : float or array_like
        Peak dashpot force F_d = C v^alpha, >= 0 [N].
    velocity_exponent : float or array_like
        Velocity exponent alpha of the dashpot, in (0, 2] [-].

    Returns
    -------
    force : float or numpy.ndarray
        Upper bound of the peak horizontal force over a harmonic cycle [N].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    Harmonic motion: the spring force follows sin t, the dashpot's |cos t|^alpha sign(cos t).
    Hoelder's inequality with exponents p and q = 2 / min(alpha, 1) bounds the sum by
    (F_k^p + F_d^p)^(1/p) (|sin t|^q + |cos t|^(alpha q))^(1/q), and the second factor is at
    most 1 since |sin t|^q <= sin^2 t and |cos t|^(alpha q) <= cos^2 t (derived here). The
    bound is exact for alpha = 1 (the root sum of squares of a linear spring and dashpot, 90
    deg apart) and at F_d = 0 or F_k = 0, tends to F_k + F_d as alpha -> 0 (a friction-like
    dashpot, whose force is near its peak at any velocity) and is an upper bound for every
    alpha in (0, 2]. Measured against a dense maximisation over the cycle
    (tests/test_dashpots.py) it overestimates by at most about 8.5 % for alpha in (0, 1] (near
    alpha = 0.3, F_d / F_k = 2) and at most 2/sqrt(3) - 1 = 15.5 % for alpha in (1, 2] (at
    alpha = 2, F_d / F_k = 1/sqrt(2)).

    Examples
    --------
    >>> round(peak_force_bound(300e3, 400e3, 1.0))
    500000
    >>> round(peak_force_bound(300e3, 400e3, 0.5))
    590632

    References
    ----------
    1. G. H. Hardy, J. E. Littlewood, G. Polya, Inequalities, 2nd ed., Cambridge University
       Press, 1952, Theorem 13 (Hoelder's inequality).
    2. A. K. Chopra, Dynamics of Structures, 4th ed., Prentice Hall, 2012, ch. 3 (forces of a
       harmonically vibrating spring and damper).
    """
    fk = non_negative("spring_force", spring_force, "N")
    fd = non_negative("dashpot_force", dashpot_force, "N")
    a = _exponent(velocity_exponent)
    fk, fd, a = broadcast(spring_force=fk, dashpot_force=fd, velocity_exponent=a)
    return scalar_or_array(_bound(fk, fd, a))


# --------------------------------------------------------------------------------------------
# the closed forms a workbook shows, beside their worksheet formulas
# --------------------------------------------------------------------------------------------
_EGTL = ("Elliott, Ghandchi Tehrani & Langley, Phil. Trans. R. Soc. A 373 (2015) 20140402; "
         "Gamma forms derived in functions/dashpots.py")
_DAVENPORT = "Davenport, Proc. Instn Civ. Engrs 28 (1964) 187-196, with T = 600 s"
_HARMONIC = "Harmonic motion at the structure's frequency (kinematics)"
_KAPPA = ("2^((1+velocity_exponent)/2)*EXP(GAMMALN(1+velocity_exponent/2))/SQRT(PI())")
_LAMBDA = ("2^(2+velocity_exponent)*EXP(2*GAMMALN(1+velocity_exponent/2)"
           "-GAMMALN(2+velocity_exponent))")
_P = "(2/(2-MIN(velocity_exponent,1)))"


def _form(formula: str, expression: str, source: str, compute: Callable[..., Any]):
    return twin(formula, compute, expression, source)


#: The service level's names and the extreme level's: the extreme forms are the same closed
#: forms renamed (functions.worksheet.renamed).
_AT_EXTREME = {"stroke": "extreme_stroke", "damper_velocity": "extreme_damper_velocity"}


def _random_damping(c, a, v, g, m, f):
    return _kappa(a) * c * (v / g) ** (a - 1.0) / (2.0 * m * _TWO_PI * f)


def _harmonic_damping(c, a, v, m, f):
    return _lambda(a) / np.pi * c * v ** (a - 1.0) / (2.0 * m * _TWO_PI * f)


#: Result name -> numpy twin with its native worksheet formula, over the design chain's defined
#: names and the inputs ``velocity_exponent``, ``dashpot_reference_velocity`` and
#: ``dashpot_units``. The damper's motion is taken at the structure's frequency and the
#: stroke as a peak (its standard deviation: over the peak factor), as the chain does.
DASHPOT_FORMS: dict[str, Callable[..., Any]] = {
    "peak_factor": _form(
        "=SQRT(2*LN(structure_frequency*600))"
        "+0.5772156649015329/SQRT(2*LN(structure_frequency*600))",
        "sqrt(2 ln(f_s T)) + gamma_E / sqrt(2 ln(f_s T)), T = 600 s, gamma_E = 0.57722 "
        "(Euler)", _DAVENPORT,
        lambda structure_frequency: peak_factor(structure_frequency, 600.0)),
    "damper_velocity": _form(
        "=2*PI()*structure_frequency*stroke", "2 pi f_s x_d", _HARMONIC,
        lambda structure_frequency, stroke: _TWO_PI * structure_frequency * stroke),
    "dashpot_reference_force": _form(
        f"=dashpot*dashpot_reference_velocity*peak_factor^(velocity_exponent-1)/({_KAPPA})",
        "c v_ref g^(a-1) / kappa(a): C with c_eq = c at sigma = v_ref / g, times v_ref^a",
        _EGTL + " (statistical linearisation)",
        lambda dashpot, dashpot_reference_velocity, peak_factor, velocity_exponent:
        dashpot * dashpot_reference_velocity * peak_factor ** (velocity_exponent - 1.0)
        / _kappa(velocity_exponent)),
    "dashpot_coefficient": _form(
        "=dashpot_reference_force/dashpot_reference_velocity^velocity_exponent",
        "F_ref / v_ref^a", "Dashpot law F = C |v|^a sign(v)",
        lambda dashpot_reference_force, dashpot_reference_velocity, velocity_exponent:
        dashpot_reference_force / dashpot_reference_velocity ** velocity_exponent),
    "dashpot_damping_random": _form(
        f"={_KAPPA}*dashpot_coefficient*(damper_velocity/peak_factor)^(velocity_exponent-1)"
        "/(4*PI()*damper_mass*damper_frequency)",
        "kappa(a) C (v / g)^(a-1) / (2 m_d 2 pi f_d)", _EGTL + " (statistical linearisation)",
        lambda dashpot_coefficient, velocity_exponent, damper_velocity, peak_factor,
        damper_mass, damper_frequency: _random_damping(
            dashpot_coefficient, velocity_exponent, damper_velocity, peak_factor, damper_mass,
            damper_frequency)),
    "dashpot_damping_harmonic": _form(
        f"={_LAMBDA}/PI()*dashpot_coefficient*damper_velocity^(velocity_exponent-1)"
        "/(4*PI()*damper_mass*damper_frequency)",
        "lambda(a) C v^(a-1) / pi / (2 m_d 2 pi f_d)", _EGTL + " (equal energy per cycle)",
        lambda dashpot_coefficient, velocity_exponent, damper_velocity, damper_mass,
        damper_frequency: _harmonic_damping(
            dashpot_coefficient, velocity_exponent, damper_velocity, damper_mass,
            damper_frequency)),
    "dashpot_unit_force": _form(
        "=dashpot_coefficient*damper_velocity^velocity_exponent/dashpot_units",
        "C v^a / n", "Dashpot law F = C |v|^a sign(v), shared by n equal units",
        lambda dashpot_coefficient, damper_velocity, velocity_exponent, dashpot_units:
        dashpot_coefficient * damper_velocity ** velocity_exponent / dashpot_units),
    "dashpot_power": _form(
        f"={_KAPPA}*dashpot_coefficient*(damper_velocity/peak_factor)^(1+velocity_exponent)",
        "kappa(a) C (v / g)^(1+a), all units, random response",
        _EGTL + " (mean power E[F v] of a Gaussian velocity)",
        lambda dashpot_coefficient, velocity_exponent, damper_velocity, peak_factor:
        _kappa(velocity_exponent) * dashpot_coefficient
        * (damper_velocity / peak_factor) ** (1.0 + velocity_exponent)),
    "extreme_dashpot_heat": _form(
        "=extreme_dashpot_power*3600", "P_x * 3600 s: heat in one hour [J]",
        "Energy = mean power times duration",
        lambda extreme_dashpot_power: extreme_dashpot_power * 3600.0),
    "horizontal_force": _form(
        f"=((stiffness*stroke)^{_P}+(dashpot_coefficient*damper_velocity^velocity_exponent)"
        f"^{_P})^(1/{_P})",
        "(F_k^p + F_d^p)^(1/p), F_k = k x_d, F_d = C v^a, p = 2 / (2 - min(a, 1))",
        "Hoelder's inequality (Hardy, Littlewood & Polya, Inequalities, 1952, Th. 13): an upper "
        "bound, exact for a linear dashpot",
        lambda stiffness, stroke, dashpot_coefficient, damper_velocity, velocity_exponent:
        _bound(stiffness * stroke, dashpot_coefficient * damper_velocity ** velocity_exponent,
               velocity_exponent)),
}
DASHPOT_FORMS.update({
    "extreme_" + name: renamed(DASHPOT_FORMS[name], _AT_EXTREME, expression)
    for name, expression in (
        ("damper_velocity", "2 pi f_s x_d,x"),
        ("dashpot_damping_random", "kappa(a) C (v_x / g)^(a-1) / (2 m_d 2 pi f_d)"),
        ("dashpot_damping_harmonic", "lambda(a) C v_x^(a-1) / pi / (2 m_d 2 pi f_d)"),
        ("dashpot_unit_force", "C v_x^a / n"),
        ("dashpot_power", "kappa(a) C (v_x / g)^(1+a), all units, random response"),
        ("horizontal_force", "(F_k^p + F_d^p)^(1/p), F_k = k x_d,x, F_d = C v_x^a, "
                             "p = 2 / (2 - min(a, 1))"))})
