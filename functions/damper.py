# SPDX-License-Identifier: MIT
"""Tuned mass damper on one structural mode: optimum, effective damping, stroke.

The structure's mode is a single-degree-of-freedom oscillator (generalised mass M*, natural
frequency omega_s, damping ratio zeta_s) carrying a damper of mass m_d, natural frequency
omega_d and damping ratio zeta_d. Conventions, used everywhere in this module:

* mass ratio ``mu = m_d / M*`` with M* the generalised mass of the mode normalised to a unit
  mode ordinate at the damper;
* tuning ratio ``f = omega_d / omega_s``;
* damper damping ratio on the damper's OWN frequency, ``zeta_d = c_d / (2 m_d omega_d)``
  (Warburton's convention). Den Hartog prints ``c_d / (2 m_d omega_s) = f zeta_d``; his formula is
  converted here.

With time in units of 1/omega_s the structure's displacement per unit static displacement F/k_s
and the damper's displacement relative to the structure are (s = Laplace variable)

.. math::

    \\frac{x_s}{F/k_s} = \\frac{s^2 + 2\\zeta_d f s + f^2}{\\Delta(s)}, \\qquad
    \\frac{x_d - x_s}{F/k_s} = \\frac{-s^2}{\\Delta(s)},

    \\Delta(s) = s^4 + a_3 s^3 + a_2 s^2 + a_1 s + a_0,\\quad
    a_3 = 2\\zeta_d f (1+\\mu) + 2\\zeta_s,\\ a_2 = f^2(1+\\mu) + 1 + 4\\zeta_s\\zeta_d f,\\
    a_1 = 2\\zeta_s f^2 + 2\\zeta_d f,\\ a_0 = f^2.

Under white-noise force the variances follow in closed form from the table of integrals of
squared 4th-order rational spectra (the "I4" entry of Newland, An Introduction to Random
Vibrations, Spectral & Wavelet Analysis, 3rd ed., 1993, Appendix 1; also Crandall & Mark,
Random Vibration in Mechanical Systems, 1963) — printed form quoted from memory and checked in
the tests against an independent state-space (Lyapunov) solution (agreement ~1e-13, tested at
1e-10) and, in 50-digit arithmetic, against mpmath. The engine evaluates the integrals in a
regrouped form free of cancellation (see :func:`effective_damping`), which keeps full double
precision at small mass ratios, where the raw I4 denominator loses about -log10(mu) digits.

Contents: the closed-form optima (Den Hartog; Warburton's three; Nishihara & Asami), all for an
undamped structure; :func:`optimal_tuning`, the public dispatcher over every method; the
white-noise variances, effective damping and stroke; the required damping and mass ratio; the
peak factor and the frequency response. The numerical optima for a damped structure (``h2``,
``hinf``) are solved in :mod:`functions.optima`. Imports run one way, damper -> optima: this
module validates the arguments and passes the undamped closed-form optimum as the start.
"""
from __future__ import annotations

import math

import numpy as np

from functions._validation import broadcast, check_range, scalar_or_array
from functions.closed_forms import CLOSED_FORM_METHODS, CLOSED_FORMS
from functions.optima import _h2_optimum, _hinf_optimum

__all__ = [
    "OPTIMAL_TUNING_METHODS", "CLOSED_FORM_METHODS", "CLOSED_FORMS", "damper_mass_ratio",
    "optimal_tuning", "displacement_variance_ratio", "effective_damping", "stroke_ratio",
    "required_damping", "required_mass_ratio", "peak_factor", "frequency_response",
    "MIN_NUMERICAL_MASS_RATIO", "MAX_NUMERICAL_MASS_RATIO", "MAX_NUMERICAL_STRUCTURAL_DAMPING",
]

#: Every method accepted by :func:`optimal_tuning`; ``h2`` and ``hinf`` are numerical and hold for
#: a damped structure.
OPTIMAL_TUNING_METHODS = CLOSED_FORM_METHODS + ("h2", "hinf")

#: Range of mass ratio accepted by the numerical optima (h2, hinf) [-]; practice is 0.005-0.05.
MIN_NUMERICAL_MASS_RATIO = 1e-4
MAX_NUMERICAL_MASS_RATIO = 2.0

#: Largest structural damping accepted by the numerical optima [-].
MAX_NUMERICAL_STRUCTURAL_DAMPING = 0.3

_EULER_GAMMA = 0.5772156649015329


# --------------------------------------------------------------------------------------------
# argument handling
# --------------------------------------------------------------------------------------------


def _mass_ratio(mass_ratio, high: float = math.inf) -> np.ndarray:
    return check_range("mass_ratio", mass_ratio, 0.0, high, low_open=True, unit="-")


def _structural_damping(structural_damping, high: float = 1.0) -> np.ndarray:
    return check_range("structural_damping", structural_damping, 0.0, high,
                       high_open=high >= 1.0, unit="-")


def _system(mass_ratio, tuning_ratio, damper_damping, structural_damping):
    """Validate and broadcast the four parameters of the structure-damper system."""
    mu = _mass_ratio(mass_ratio)
    f = check_range("tuning_ratio", tuning_ratio, 0.0, low_open=True, unit="-")
    zd = check_range("damper_damping", damper_damping, 0.0, unit="-")
    zs = _structural_damping(structural_damping)
    return broadcast(mass_ratio=mu, tuning_ratio=f, damper_damping=zd,
                      structural_damping=zs)


def _variance_terms(mu, f, zd, zs):
    """Reduced numerator N, denominator D and X of the white-noise variances.

    Normalised structure variance N / (2 D), relative damper displacement variance
    X / (2 D): the I4 integrals (see :func:`displacement_variance_ratio`) with num = 2 N,
    den = 4 D and a1 = 2 X, regrouped so that no large terms cancel (the raw I4 denominator
    loses about -log10(mu) digits to cancellation; this form does not, except in the small
    term zeta_s g (w - 1)(m w - 1)).
    """
    w = f * f
    g = zd * f
    m = 1.0 + mu
    x = zs * w + g
    y = g * m + zs
    t = m * w - 1.0
    n = g * (t * t + mu * w) + 4.0 * g * x * y + zs * mu * w * w
    d = mu * g * x + zs * mu * w * w * y + zs * g * (w - 1.0) * t + 4.0 * zs * g * x * y
    return n, d, x


def _no_damping(zd, zs) -> np.ndarray:
    return (zd == 0.0) & (zs == 0.0)


# --------------------------------------------------------------------------------------------
# mass ratio and optima
# --------------------------------------------------------------------------------------------
def damper_mass_ratio(damper_mass, modal_mass):
    """Mass ratio of a damper on a structural mode.

    .. math::

        \\mu = \\frac{m_d}{M^*}

    Parameters
    ----------
    damper_mass : float or array_like
        Moving mass of the damper, > 0 [kg].
    modal_mass : float or array_like
        Generalised mass M* of the mode, normalised to a unit mode ordinate at the damper, > 0
        [kg].

    Returns
    -------
    mass_ratio : float or numpy.ndarray
        Mass ratio mu [-].

    Raises
    ------
    ValueError
        If a mass is not positive and finite, or the arrays do not broadcast.

    Notes
    -----
    M* must be the generalised mass for the mode shape scaled to 1 AT THE DAMPER'S LEVEL (see
    :func:`functions.structure.modal_mass`); with another scaling mu is wrong by the square of
    the mode ordinate there.

    Examples
    --------
    >>> damper_mass_ratio(300e3, 15e6)
    0.02

    References
    ----------
    1. J. P. Den Hartog, Mechanical Vibrations, 4th ed., McGraw-Hill, 1956, §3.3.
    """
    md = check_range("damper_mass", damper_mass, 0.0, low_open=True, unit="kg")
    mm = check_range("modal_mass", modal_mass, 0.0, low_open=True, unit="kg")
    md, mm = broadcast(damper_mass=md, modal_mass=mm)
    return scalar_or_array(md / mm)


def _closed_form(mu: np.ndarray, method: str) -> tuple[np.ndarray, np.ndarray]:
    tuning, damping = CLOSED_FORMS[method]
    return tuning(mu), damping(mu)


def _numerical_optimum(mu, zs, method: str) -> tuple[np.ndarray, np.ndarray]:
    """``h2``/``hinf`` optimum (functions.optima), started at the undamped closed form."""
    if method == "h2":
        return _h2_optimum(mu, zs, *_closed_form(mu, "white_noise_force"))
    return _hinf_optimum(mu, zs, *_closed_form(mu, "nishihara_asami"))


def optimal_tuning(mass_ratio, method="den_hartog", structural_damping=0.0):
    """Optimal tuning and damping ratios of a tuned mass damper.

    .. math::

        \\text{den\\_hartog:}\\quad f = \\frac{1}{1+\\mu},\\quad
        \\zeta_d = \\sqrt{\\frac{3\\mu}{8(1+\\mu)}}

        \\text{white\\_noise\\_force:}\\quad f = \\frac{\\sqrt{1+\\mu/2}}{1+\\mu},\\quad
        \\zeta_d = \\sqrt{\\frac{\\mu(1+3\\mu/4)}{4(1+\\mu)(1+\\mu/2)}}

        \\text{h2:}\\ \\min_{f,\\zeta_d} \\sigma_x^2, \\qquad
        \\text{hinf:}\\ \\min_{f,\\zeta_d} \\max_\\omega |x_s/x_{st}|

    Parameters
    ----------
    mass_ratio : float or array_like
        Damper mass over generalised modal mass, mu > 0; mu < 2 for the base-excitation forms
        and 1e-4 <= mu <= 2 for the numerical optima [-].
    method : str, optional
        One of :data:`OPTIMAL_TUNING_METHODS` (see Notes) [-].
    structural_damping : float or array_like, optional
        Damping ratio of the structure's mode without the damper, in [0, 0.3] for ``h2`` and
        ``hinf``; must be 0 for the closed forms [-].

    Returns
    -------
    tuning_ratio : float or numpy.ndarray
        Optimal f = omega_d / omega_s [-].
    damping_ratio : float or numpy.ndarray
        Optimal damper damping ratio on the damper's own frequency, c_d / (2 m_d omega_d) [-].

    Raises
    ------
    ValueError
        For an unknown method, mass_ratio <= 0 (or >= 2 where the form needs it), damping outside
        its range, arrays that do not broadcast, or structural_damping > 0 with a closed form.
    RuntimeError
        If a numerical optimum fails to converge (not seen in the validated range).

    Notes
    -----
    Closed forms, all for an UNDAMPED structure (structural_damping > 0 raises; use ``h2`` or
    ``hinf``, which hold for any structural damping in the validated range):

    * ``den_hartog`` — harmonic force on the structure, equal fixed-point heights (Den Hartog,
      1956). Den Hartog prints the damping on the structure's frequency, sqrt(3 mu/(8 (1+mu)^3));
      here it is divided by f to refer it to the damper's own frequency.
    * ``harmonic_base`` — harmonic base acceleration, fixed-point approximation (Warburton 1982).
    * ``white_noise_force`` — white-noise force, minimum displacement variance (Warburton 1982).
    * ``white_noise_base`` — white-noise base acceleration, minimum variance of the displacement
      relative to the ground (Warburton 1982).
    * ``nishihara_asami`` — exact minimum of the peak displacement amplification under harmonic
      force (Nishihara & Asami 2002); with s = sqrt(4 + 3 mu):
      zeta_d = sqrt((8 + 9 mu - 4 s)/(1 + mu))/4,
      f^2 = 8 (5 + 3 mu + 2 s) / (3 (16 + 9 mu + 4 s) (1 + mu)^2).

    Numerical optima (damped structure allowed; validated on 1e-4 <= mu <= 2 with
    0 <= structural_damping <= 0.3, outside which they are refused):

    * ``h2`` — minimum variance of the structure's displacement under white-noise force, by
      Newton's method on the gradient of the closed-form variance (:func:`effective_damping`),
      started from the undamped optimum (``white_noise_force``), with continuation in
      zeta_s where needed, and checked to be a maximum of zeta_eff. For zeta_s = 0 the
      gradient vanishes at Warburton's values, so it reproduces ``white_noise_force``
      (independently confirmed in the tests by Nelder-Mead on a Lyapunov variance).
    * ``hinf`` — minimum peak of |x_s / x_static| under harmonic force: Newton's method on the
      equal-peak minimax conditions (two stationary points of equal height whose gradients with
      respect to the damper parameters oppose), started from the undamped optimum
      (``nishihara_asami``) with Den Hartog's fixed points as the peak frequencies, and checked
      against all stationary points of the response (roots of a quintic). For zeta_s = 0 it
      reproduces ``nishihara_asami``; for zeta_s > 0 the tests confirm it by brute force.

    Examples
    --------
    >>> f, z = optimal_tuning(0.02, "den_hartog")
    >>> round(f, 6), round(z, 6)
    (0.980392, 0.085749)
    >>> f, z = optimal_tuning(0.02, "h2")      # = Warburton's white-noise-force optimum
    >>> round(f, 6), round(z, 6)
    (0.985282, 0.070187)
    >>> f, z = optimal_tuning(0.02, "h2", structural_damping=0.02)
    >>> round(f, 6), round(z, 6)
    (0.983922, 0.070187)

    References
    ----------
    1. J. P. Den Hartog, Mechanical Vibrations, 4th ed., McGraw-Hill, 1956, §3.3.
    2. G. B. Warburton, "Optimum absorber parameters for various combinations of response and
       excitation parameters", Earthquake Eng. Struct. Dyn. 10:381-401, 1982.
    3. O. Nishihara, T. Asami, "Closed-form solutions to the exact optimizations of dynamic
       vibration absorbers", J. Vib. Acoust. 124(4):576-582, 2002.
    """
    if not isinstance(method, str) or method not in OPTIMAL_TUNING_METHODS:
        raise ValueError(f"method={method!r} must be one of {', '.join(OPTIMAL_TUNING_METHODS)}")
    base = method in ("harmonic_base", "white_noise_base")
    numerical = method in ("h2", "hinf")
    if numerical:
        mu = check_range("mass_ratio", mass_ratio, MIN_NUMERICAL_MASS_RATIO,
                         MAX_NUMERICAL_MASS_RATIO, unit="-")
    else:
        mu = check_range("mass_ratio", mass_ratio, 0.0, 2.0 if base else math.inf,
                         low_open=True, high_open=base, unit="-")
    zs = _structural_damping(structural_damping,
                             MAX_NUMERICAL_STRUCTURAL_DAMPING if numerical else 1.0)
    mu, zs = broadcast(mass_ratio=mu, structural_damping=zs)
    if not numerical:
        if np.any(zs > 0.0):
            raise ValueError(
                f"structural_damping={float(zs[zs > 0.0].flat[0])!r} must be 0 for "
                f"method={method!r} (a closed form for an undamped structure); use "
                f"method='h2' or 'hinf' for a damped structure")
        f, zd = _closed_form(mu, method)
        bad = ~(np.isfinite(zd) & (zd < 1.0) & np.isfinite(f) & (f > 0.0))
        if np.any(bad):
            i = int(np.flatnonzero(bad.ravel())[0])
            raise ValueError(
                f"mass_ratio={mu.ravel()[i].item()!r} gives a damper damping of "
                f"{zd.ravel()[i].item():.3g} (critical or above) for method={method!r}: the "
                "closed form does not hold for so heavy a damper; use a smaller mass ratio")
        return scalar_or_array(f), scalar_or_array(zd)
    shape = mu.shape
    f, zd = _numerical_optimum(mu.ravel().copy(), zs.ravel().copy(), method)
    return scalar_or_array(f.reshape(shape)), scalar_or_array(zd.reshape(shape))


# --------------------------------------------------------------------------------------------
# white-noise response in closed form
# --------------------------------------------------------------------------------------------
def displacement_variance_ratio(mass_ratio, tuning_ratio, damper_damping,
                                structural_damping=0.0):
    """Normalised displacement variance of a structure with a damper.

    .. math::

        v = \\frac{\\sigma_x^2\\,k_s^2}{\\pi S_0\\,\\omega_s}
          = \\frac{1}{\\pi}\\int_{-\\infty}^{\\infty}
            \\left|\\frac{x_s}{F/k_s}(i\\omega)\\right|^2 d\\omega
          = \\frac{\\mathrm{num}}{\\mathrm{den}} = \\frac{N}{2D}

    Parameters
    ----------
    mass_ratio : float or array_like
        mu = m_d / M*, > 0 [-].
    tuning_ratio : float or array_like
        f = omega_d / omega_s, > 0 [-].
    damper_damping : float or array_like
        zeta_d = c_d / (2 m_d omega_d), >= 0 [-].
    structural_damping : float or array_like, optional
        zeta_s of the structure's mode, in [0, 1) [-].

    Returns
    -------
    variance_ratio : float or numpy.ndarray
        Variance of the structure's displacement under a white-noise force of two-sided spectral
        density S_0, divided by pi S_0 omega_s / k_s^2; 1 / (2 zeta) for a bare structure;
        inf when neither the damper nor the structure is damped [-].

    Raises
    ------
    ValueError
        If mass_ratio <= 0, tuning_ratio <= 0, a damping ratio is negative, structural_damping
        >= 1, or the arrays do not broadcast.

    Notes
    -----
    The integral is the I4 entry of the table of integrals of rational spectra (Newland 1993,
    Appendix 1, quoted from memory; verified against a Lyapunov solution in the tests)::

        I4 = pi [B0^2/A0 (A2 A3 - A1 A4) + A3 (B1^2 - 2 B0 B2) + A1 (B2^2 - 2 B1 B3)
                 + B3^2/A4 (A1 A2 - A0 A3)] / [A1 (A2 A3 - A1 A4) - A0 A3^2]

    with B0 = f^2, B1 = 2 zeta_d f, B2 = 1, B3 = 0 and A4 = 1, A3..A0 = a3..a0 of the module
    docstring. Written out with w = f^2 and g = zeta_d f (only + - * / needed)::

        a3  = 2 g (1 + mu) + 2 zeta_s
        a2  = w (1 + mu) + 1 + 4 zeta_s g
        a1  = 2 zeta_s w + 2 g
        P   = a2 a3 - a1
        num = w P + a3 (4 g^2 - 2 w) + a1
        den = a1 P - w a3^2

    The raw denominator loses about -log10(mu) digits to cancellation (at mu = 0.01, two of
    sixteen). Regrouped exactly (num = 2 N, den = 4 D, a1 = 2 X; every term of N is >= 0), as
    computed here::

        m   = 1 + mu
        X   = zeta_s w + g
        Y   = g m + zeta_s
        N   = g ((m w - 1)^2 + mu w) + 4 g X Y + zeta_s mu w^2
        D   = mu g X + zeta_s mu w^2 Y + zeta_s g (w - 1)(m w - 1) + 4 zeta_s g X Y
        v   = N / (2 D)

    Examples
    --------
    >>> round(displacement_variance_ratio(0.02, 0.985282, 0.070187), 4)
    14.1074

    References
    ----------
    1. D. E. Newland, An Introduction to Random Vibrations, Spectral & Wavelet Analysis, 3rd ed.,
       Longman, 1993, Appendix 1.
    2. S. H. Crandall, W. D. Mark, Random Vibration in Mechanical Systems, Academic Press, 1963.
    """
    mu, f, zd, zs = _system(mass_ratio, tuning_ratio, damper_damping, structural_damping)
    n, d, _ = _variance_terms(mu, f, zd, zs)
    none = _no_damping(zd, zs)
    v = np.where(none, np.inf, n / (2.0 * np.where(none, 1.0, d)))
    return scalar_or_array(v)


def effective_damping(mass_ratio, tuning_ratio, damper_damping, structural_damping=0.0):
    """Equivalent damping ratio of a structure with its damper.

    .. math::

        \\zeta_{eff} = \\frac{1}{2v} = \\frac{\\mathrm{den}}{2\\,\\mathrm{num}} = \\frac{D}{N}

    Parameters
    ----------
    mass_ratio : float or array_like
        mu = m_d / M*, > 0 [-].
    tuning_ratio : float or array_like
        f = omega_d / omega_s, > 0 [-].
    damper_damping : float or array_like
        zeta_d = c_d / (2 m_d omega_d), >= 0 [-].
    structural_damping : float or array_like, optional
        zeta_s of the structure's mode without the damper, in [0, 1) [-].

    Returns
    -------
    effective_damping : float or numpy.ndarray
        Damping ratio of a single-degree-of-freedom structure (same mass, same frequency) whose
        displacement variance under white-noise force equals that of the structure with its
        damper; 0 when neither is damped [-].

    Raises
    ------
    ValueError
        If mass_ratio <= 0, tuning_ratio <= 0, a damping ratio is negative, structural_damping
        >= 1, or the arrays do not broadcast.

    Notes
    -----
    This is the VARIANCE-equivalent damping (total, structure included). It is not the
    structure's damping plus a damper contribution, and it is not the harmonic-peak
    equivalent 1/(2 H_max), which is tens of percent higher for the same damper. For an
    H2-optimal damper on an undamped structure it is close to sqrt(mu)/4 (McNamara 1977,
    Luft 1979, from memory); the exact value is sqrt(mu (1+mu)/(1+3 mu/4))/4 (computed).

    Closed form for a spreadsheet, from the I4 integral (see
    :func:`displacement_variance_ratio`, regrouped so that no large terms cancel), with
    w = f^2 and g = zeta_d f (only + - * /)::

        m   = 1 + mu
        X   = zeta_s w + g
        Y   = g m + zeta_s
        N   = g ((m w - 1)^2 + mu w) + 4 g X Y + zeta_s mu w^2
        D   = mu g X + zeta_s mu w^2 Y + zeta_s g (w - 1)(m w - 1) + 4 zeta_s g X Y
        zeta_eff = D / N

    Examples
    --------
    >>> f, z = optimal_tuning(0.02, "h2")
    >>> round(effective_damping(0.02, f, z), 5)   # sqrt(0.02)/4 = 0.03536
    0.03544
    >>> round(effective_damping(0.02, 0.98, 0.07, 0.01), 5)
    0.04305

    References
    ----------
    1. D. E. Newland, An Introduction to Random Vibrations, Spectral & Wavelet Analysis, 3rd ed.,
       Longman, 1993, Appendix 1.
    2. R. J. McNamara, "Tuned mass dampers for buildings", J. Struct. Div. ASCE 103(9), 1977.
    3. R. W. Luft, "Optimal tuned mass dampers for buildings", J. Struct. Div. ASCE 105(12), 1979.
    """
    mu, f, zd, zs = _system(mass_ratio, tuning_ratio, damper_damping, structural_damping)
    n, d, _ = _variance_terms(mu, f, zd, zs)
    none = _no_damping(zd, zs)
    zeta = np.where(none, 0.0, d / np.where(none, 1.0, n))
    return scalar_or_array(zeta)


def stroke_ratio(mass_ratio, tuning_ratio, damper_damping, structural_damping=0.0):
    """RMS damper stroke over RMS structure displacement.

    .. math::

        \\frac{\\sigma_{x_d - x_s}}{\\sigma_{x_s}} = \\sqrt{\\frac{a_1}{\\mathrm{num}}}
        = \\sqrt{\\frac{X}{N}}

    Parameters
    ----------
    mass_ratio : float or array_like
        mu = m_d / M*, > 0 [-].
    tuning_ratio : float or array_like
        f = omega_d / omega_s, > 0 [-].
    damper_damping : float or array_like
        zeta_d = c_d / (2 m_d omega_d), >= 0 [-].
    structural_damping : float or array_like, optional
        zeta_s of the structure's mode without the damper, in [0, 1) [-].

    Returns
    -------
    stroke_ratio : float or numpy.ndarray
        RMS displacement of the damper RELATIVE to the structure over the RMS displacement of the
        structure, under white-noise force [-].

    Raises
    ------
    ValueError
        If mass_ratio <= 0, tuning_ratio <= 0, a damping ratio is negative, both damping ratios
        are 0 (the response is unbounded), structural_damping >= 1, or the arrays do not
        broadcast.

    Notes
    -----
    Both variances are I4 integrals with the same denominator; the relative displacement has
    B2 = -1 and B0 = B1 = B3 = 0, so its integral is pi a1 / den and the ratio is
    sqrt(a1 / num) = sqrt(X / N). Closed form with w = f^2 and g = zeta_d f (only + - * / and
    SQRT)::

        m   = 1 + mu
        X   = zeta_s w + g
        Y   = g m + zeta_s
        N   = g ((m w - 1)^2 + mu w) + 4 g X Y + zeta_s mu w^2
        D   = mu g X + zeta_s mu w^2 Y + zeta_s g (w - 1)(m w - 1) + 4 zeta_s g X Y
        ratio = SQRT(X / N)

    With equal peak factors the ratio of expected peaks is the same.

    Examples
    --------
    >>> f, z = optimal_tuning(0.02, "h2")
    >>> round(stroke_ratio(0.02, f, z), 3)
    5.062

    References
    ----------
    1. D. E. Newland, An Introduction to Random Vibrations, Spectral & Wavelet Analysis, 3rd ed.,
       Longman, 1993, Appendix 1.
    """
    mu, f, zd, zs = _system(mass_ratio, tuning_ratio, damper_damping, structural_damping)
    none = _no_damping(zd, zs)
    if none.any():
        raise ValueError("damper_damping=0.0 and structural_damping=0.0: at least one must be "
                         "> 0 [-] (the response is unbounded)")
    n, _, x = _variance_terms(mu, f, zd, zs)
    return scalar_or_array(np.sqrt(x / n))


# --------------------------------------------------------------------------------------------
# requirement
# --------------------------------------------------------------------------------------------
def required_damping(acceleration, acceleration_limit, structural_damping):
    """Total damping that brings a resonant response to a limit.

    .. math::

        \\zeta_{req} = \\zeta_s \\left(\\frac{a}{a_{lim}}\\right)^2

    Parameters
    ----------
    acceleration : float or array_like
        Peak (or RMS) acceleration without the damper, > 0 [m/s^2].
    acceleration_limit : float or array_like
        Acceptable peak (or RMS, consistently) acceleration, > 0 [m/s^2].
    structural_damping : float or array_like
        Damping ratio of the structure without the damper, in (0, 1) [-].

    Returns
    -------
    required_damping : float or numpy.ndarray
        Total effective damping ratio needed [-].

    Raises
    ------
    ValueError
        If an acceleration is not positive, structural_damping is outside (0, 1), or the arrays
        do not broadcast.

    Notes
    -----
    Resonant response: RMS response is proportional to 1/sqrt(zeta) (EN 1991-1-4:2005 Annex B,
    B.2(6), R^2 = pi^2 S_L R_h R_b / (2 delta)). The rule applies to the resonant part only;
    where the background (quasi-static) part matters it is unconservative. A result at or below
    ``structural_damping`` means no damper is needed.

    Examples
    --------
    >>> round(required_damping(0.25, 0.15, 0.015), 5)
    0.04167

    References
    ----------
    1. EN 1991-1-4:2005, Eurocode 1: Actions on structures - Wind actions, Annex B, B.2(6).
    """
    a = check_range("acceleration", acceleration, 0.0, low_open=True, unit="m/s^2")
    lim = check_range("acceleration_limit", acceleration_limit, 0.0, low_open=True,
                      unit="m/s^2")
    zs = check_range("structural_damping", structural_damping, 0.0, 1.0, low_open=True,
                     high_open=True, unit="-")
    a, lim, zs = broadcast(acceleration=a, acceleration_limit=lim, structural_damping=zs)
    return scalar_or_array(zs * (a / lim) ** 2)


def _tuned_effective(mu: float, zs: float, method: str) -> float:
    """zeta_eff of the damper ``method`` tunes as the design chain does (closed form: zs = 0)."""
    m = np.array([mu])
    f, zd = _closed_form(m, method) if method in CLOSED_FORMS else \
        _numerical_optimum(m, np.array([zs]), method)
    n, d, _ = _variance_terms(mu, f[0], zd[0], zs)
    return float(d / n)


def required_mass_ratio(total_damping, structural_damping=0.0, method="h2"):
    """Mass ratio whose optimal damper gives a total damping.

    .. math::

        \\zeta_{eff}\\big(\\mu, f_{opt}(\\mu, \\zeta_s), \\zeta_{d,opt}(\\mu, \\zeta_s),
        \\zeta_s\\big) = \\zeta_{target}

    Parameters
    ----------
    total_damping : float or array_like
        Target effective (variance-equivalent) damping ratio, in (0, 1) [-].
    structural_damping : float or array_like, optional
        Damping ratio of the structure without the damper, in [0, 0.3] [-].
    method : str, optional
        Tuning method of the damper, one of :data:`OPTIMAL_TUNING_METHODS` [-].

    Returns
    -------
    mass_ratio : float or numpy.ndarray
        mu whose damper, tuned by ``method``, reaches ``total_damping``; 0 when the structure
        alone already has it (total_damping <= structural_damping) [-].

    Raises
    ------
    ValueError
        If an argument is outside its range, the arrays do not broadcast, or the target needs
        a mass ratio above 2 (1 for the base forms: out of reach) or below 1e-4 (negligible).

    Notes
    -----
    The damper is tuned as the design chain (:mod:`functions.chain`) tunes it: ``h2`` and
    ``hinf`` for the damped structure; a closed form as printed, for an undamped structure
    (its zeta_eff is then that of the damped one). h2 maximises zeta_eff: the least mass.

    Solved with brentq on mu in [1e-4, 2] for each element (zeta_eff of the tuned damper
    rises with mu there; the base-excitation forms reach critical damper damping at mu = 1.54
    (harmonic_base) or lose zeta_eff above mu = 1.38 (white_noise_base), so their search ends
    at 1 (computed)). For ``h2`` on an undamped structure the result
    equals the root of mu^2 + mu (1 - 12 zeta^2) - 16 zeta^2 = 0, from the exact optimum
    zeta_eff = sqrt(mu (1+mu)/(1+3 mu/4))/4 (computed; used as a check in the tests).

    Examples
    --------
    >>> round(required_mass_ratio(0.04, 0.01), 5)
    0.01665
    >>> round(required_mass_ratio(0.04, 0.01, "den_hartog"), 5)
    0.01724

    References
    ----------
    1. G. B. Warburton, Earthquake Eng. Struct. Dyn. 10:381-401, 1982.
    2. J. P. Den Hartog, Mechanical Vibrations, 4th ed., McGraw-Hill, 1956, §3.3.
    """
    if not isinstance(method, str) or method not in OPTIMAL_TUNING_METHODS:
        raise ValueError(f"method={method!r} must be one of {', '.join(OPTIMAL_TUNING_METHODS)}")
    tot = check_range("total_damping", total_damping, 0.0, 1.0, low_open=True, high_open=True,
                      unit="-")
    zs = _structural_damping(structural_damping, MAX_NUMERICAL_STRUCTURAL_DAMPING)
    tot, zs = broadcast(total_damping=tot, structural_damping=zs)
    out = np.zeros(tot.shape)
    base = method in ("harmonic_base", "white_noise_base")      # searched up to 1: see Notes
    lo, hi = MIN_NUMERICAL_MASS_RATIO, 1.0 if base else MAX_NUMERICAL_MASS_RATIO
    for idx in np.ndindex(tot.shape):
        t, z = float(tot[idx]), float(zs[idx])
        if t <= z:
            continue
        if _tuned_effective(hi, z, method) < t:
            raise ValueError(f"total_damping={t!r} needs a mass_ratio above {hi:g} with "
                             f"structural_damping={z!r} and method={method!r}; no practical "
                             "damper reaches it")
        if _tuned_effective(lo, z, method) > t:
            raise ValueError(f"total_damping={t!r} needs a mass_ratio below {lo:g} with "
                             f"structural_damping={z!r} and method={method!r}; in practice "
                             "no damper is needed")
        from scipy.optimize import brentq   # lazy import: scipy.optimize's start-up (0.15 s)
        out[idx] = brentq(lambda m: _tuned_effective(m, z, method) - t, lo, hi, xtol=1e-16,
                          rtol=1e-15)
    return scalar_or_array(out)


# --------------------------------------------------------------------------------------------
# peaks and charts
# --------------------------------------------------------------------------------------------
def peak_factor(frequency, duration=600.0):
    """Expected peak over RMS of a Gaussian narrow-band response.

    .. math::

        g = \\sqrt{2 \\ln(\\nu T)} + \\frac{0.5772}{\\sqrt{2 \\ln(\\nu T)}}

    Parameters
    ----------
    frequency : float or array_like
        Mean up-crossing rate nu, for a resonant response the natural frequency, > 0 [Hz].
    duration : float or array_like, optional
        Averaging time T, > 0 with nu T > e [s].

    Returns
    -------
    peak_factor : float or numpy.ndarray
        Expected largest value over the RMS in the duration [-].

    Raises
    ------
    ValueError
        If frequency or duration is not positive, nu T <= e (the asymptotic form does not hold),
        or the arrays do not broadcast.

    Notes
    -----
    Davenport's asymptotic form with Euler's constant 0.5772156649. EN 1991-1-4:2005 B.2(3)
    writes 0.6 for the constant and floors the result at 3 with T = 600 s; that floor is not
    applied here.

    Examples
    --------
    >>> round(peak_factor(0.2), 3)
    3.281

    References
    ----------
    1. A. G. Davenport, "Note on the distribution of the largest value of a random function with
       application to gust loading", Proc. ICE 28(2):187-196, 1964.
    """
    nu = check_range("frequency", frequency, 0.0, low_open=True, unit="Hz")
    t = check_range("duration", duration, 0.0, low_open=True, unit="s")
    nu, t = broadcast(frequency=nu, duration=t)
    n = nu * t
    if np.any(n <= math.e):
        bad = float(n[n <= math.e].flat[0])
        raise ValueError(f"frequency*duration={bad!r} must be in (e, inf) [-] for the "
                         "Davenport peak factor")
    r = np.sqrt(2.0 * np.log(n))
    return scalar_or_array(r + _EULER_GAMMA / r)


def frequency_response(frequency_ratio, mass_ratio=0.0, tuning_ratio=1.0, damper_damping=0.0,
                       structural_damping=0.02):
    """Dynamic amplification of a structure with or without a damper.

    .. math::

        \\left|\\frac{x_s}{x_{st}}\\right| =
        \\left|\\frac{f^2 - r^2 + 2i\\zeta_d f r}
        {(1 - r^2 + 2i\\zeta_s r)(f^2 - r^2 + 2i\\zeta_d f r) - \\mu r^2 (f^2 + 2i\\zeta_d f r)}
        \\right|

    Parameters
    ----------
    frequency_ratio : float or array_like
        Forcing frequency over the structure's frequency, r = omega / omega_s, >= 0 [-].
    mass_ratio : float or array_like, optional
        mu = m_d / M*, >= 0; 0 gives the bare structure [-].
    tuning_ratio : float or array_like, optional
        f = omega_d / omega_s, > 0 [-].
    damper_damping : float or array_like, optional
        zeta_d = c_d / (2 m_d omega_d), >= 0 [-].
    structural_damping : float or array_like, optional
        zeta_s, in [0, 1) [-].

    Returns
    -------
    amplification : float or numpy.ndarray
        Amplitude of the structure's displacement over the static displacement F/k_s under a
        harmonic force; inf exactly at an undamped resonance [-].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Examples
    --------
    >>> round(frequency_response(1.0), 3)               # bare structure, 1/(2 zeta_s)
    25.0
    >>> f, z = optimal_tuning(0.02, "nishihara_asami")
    >>> r = np.linspace(0.8, 1.2, 40001)
    >>> round(float(frequency_response(r, 0.02, f, z, 0.0).max()), 3)  # N&A peak 10.053
    10.053

    References
    ----------
    1. J. P. Den Hartog, Mechanical Vibrations, 4th ed., McGraw-Hill, 1956, §3.3.
    """
    r = check_range("frequency_ratio", frequency_ratio, 0.0, unit="-")
    mu = check_range("mass_ratio", mass_ratio, 0.0, unit="-")
    f = check_range("tuning_ratio", tuning_ratio, 0.0, low_open=True, unit="-")
    zd = check_range("damper_damping", damper_damping, 0.0, unit="-")
    zs = _structural_damping(structural_damping)
    r, mu, f, zd, zs = broadcast(frequency_ratio=r, mass_ratio=mu, tuning_ratio=f,
                                  damper_damping=zd, structural_damping=zs)
    s = 1j * r
    d = s * s + 2.0 * zd * f * s + f * f
    with np.errstate(divide="ignore", invalid="ignore"):
        bare = 1.0 / np.abs(s * s + 2.0 * zs * s + 1.0)
        full = np.abs(d / ((s * s + 2.0 * zs * s + 1.0) * d
                           + mu * s * s * (2.0 * zd * f * s + f * f)))
    return scalar_or_array(np.where(mu == 0.0, bare, full))
