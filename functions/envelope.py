# SPDX-License-Identifier: MIT
"""A damper over a band of building frequencies: detuning, worst case, robust tuning, retune.

Before a tower is built its frequency is known only to within a band (model against
measurement, commonly +-10 to 20 %). This module follows a damper designed for the NOMINAL
frequency f_n when the building turns out at f_a = r f_n, with the frequency factor
``r = f_a / f_n`` anywhere in the band ``band_lower <= r <= band_upper`` (which contains 1).

Assumptions, used everywhere in this module:

* the generalised mass M* and the damper (m_d, omega_d, c_d) are as designed; the frequency
  error is a stiffness error. The mass ratio is therefore unchanged, the damper damping
  zeta_d (on the damper's own frequency) is unchanged, and the tuning ratio seen by the actual
  structure is ``f_d / f_a = f / r`` with f the tuning ratio to the nominal frequency;
* the structure's damping ratio zeta_s is the same at every r;
* the acceleration WITHOUT the damper across the band is ``a(r) = a r^k`` with a the value at
  the nominal frequency and k the ``response_exponent``. The default k = 0 holds it constant.
  A rule k != 0 is the user's: for example, a resonant response on a structure of fixed mass
  has sigma_a^2 = pi S_F(n) omega / (2 zeta M*^2) (white-noise variance of a single
  oscillator); a quasi-steady force follows the velocity spectrum, whose high-frequency
  asymptote falls as n^(-5/3) (EN 1991-1-4:2005, B.1(2)), so k = (1 - 5/3) / 2 = -1/3
  (computed; aerodynamic admittance, size effects and the project's wind-tunnel data may say
  otherwise);
* the acceleration WITH the damper follows the design chain's resonant rule
  (:mod:`functions.chain`): ``a_d(r) = a(r) sqrt(zeta_s / zeta_eff(r))`` with zeta_eff the
  variance-equivalent damping of :func:`functions.damper.effective_damping` evaluated on the
  actual structure, ``zeta_eff(mu, f / r, zeta_d, zeta_s)``.

Contents: the detuned effective damping and acceleration (:func:`detuned_effective_damping`,
:func:`detuned_acceleration`); the worst case over the band and where it lies
(:func:`band_worst_case`); the robust tuning that minimises the worst-case acceleration over
the band (:func:`robust_tuning`); the mass ratio that meets a limit over the whole band
(:func:`band_mass_ratio`); the hanger lengths in tune at the ends of the band
(:func:`hanger_adjustment`) and the retune after the building's frequency is measured
(:func:`as_built_retune`). Imports run one way: envelope -> damper, optima, pendulum.
"""
from __future__ import annotations

from typing import NamedTuple

import numpy as np

from functions._validation import broadcast, check_range, scalar_or_array
from functions.damper import (CLOSED_FORMS, MAX_NUMERICAL_STRUCTURAL_DAMPING,
                              OPTIMAL_TUNING_METHODS, _variance_terms, effective_damping,
                              optimal_tuning)
from functions.optima import _batched_newton, _h2_residual
from functions.pendulum import STANDARD_GRAVITY, equivalent_length

__all__ = [
    "BAND_LIMITS", "ROBUST_LIMITS", "BAND_METHODS", "detuned_effective_damping",
    "detuned_acceleration", "band_worst_case", "robust_tuning", "band_mass_ratio",
    "hanger_adjustment", "AsBuiltRetune", "as_built_retune",
]

#: Accepted frequency factors: band_lower in [0.5, 1], band_upper in [1, 2] [-].
BAND_LIMITS = (0.5, 2.0)

#: Validated range of :func:`robust_tuning`: mass ratio and structural damping [-] (the band:
#: :data:`BAND_LIMITS`).
ROBUST_LIMITS = {"mass_ratio": (1e-4, 0.5), "structural_damping": (0.0, 0.3)}

#: Tuning methods of :func:`band_mass_ratio`: every nominal method and ``robust``.
BAND_METHODS = OPTIMAL_TUNING_METHODS + ("robust",)

# points of the band searched for the worst case before the golden-section refinement
_BAND_POINTS = 257
_GOLDEN = 0.5 * (np.sqrt(5.0) - 1.0)
_GOLDEN_STEPS = 64


# --------------------------------------------------------------------------------------------
# arguments
# --------------------------------------------------------------------------------------------
def _band(band_lower, band_upper) -> tuple[np.ndarray, np.ndarray]:
    """Validate the band's frequency factors; the band must contain the nominal frequency."""
    why = " (frequency factor f_actual/f_nominal; the band must contain the nominal, 1)"
    try:
        lo = check_range("band_lower", band_lower, BAND_LIMITS[0], 1.0, unit="-")
        hi = check_range("band_upper", band_upper, 1.0, BAND_LIMITS[1], unit="-")
    except ValueError as err:
        raise ValueError(f"{err}{why}") from None
    return lo, hi


def _exponent(response_exponent) -> np.ndarray:
    return check_range("response_exponent", response_exponent, -3.0, 3.0, unit="-")


def _damped(structural_damping, high: float = 1.0) -> np.ndarray:
    return check_range("structural_damping", structural_damping, 0.0, high, low_open=True,
                       high_open=high >= 1.0, unit="-")


def _log_zeta(mu, w, g, zs):
    """ln zeta_eff at w = f^2, g = zeta_d f (the regrouped I4 closed form of damper.py)."""
    f = np.sqrt(w)
    n, d, _ = _variance_terms(mu, f, g / f, zs)
    return np.log(d) - np.log(n)


def _log_response(r, mu, f, zd, zs, k):
    """ln(a_d(r) / a) = k ln r - ln(zeta_eff(r) / zeta_s) / 2, up to the constant ln zeta_s."""
    ft = f / r
    return k * np.log(r) - 0.5 * _log_zeta(mu, ft * ft, zd * ft, zs)


def _worst(lo, hi, mu, f, zd, zs, k):
    """Largest of ln(a_d(r)) - ln(a sqrt(zeta_s)) over the band, and where: a dense grid
    (:data:`_BAND_POINTS`), then golden-section search between the grid points beside the
    largest. Arrays of one shape in; (value, r) of that shape out."""
    t = np.linspace(0.0, 1.0, _BAND_POINTS)
    args = [a[..., None] for a in (mu, f, zd, zs, k)]
    r = lo[..., None] + (hi - lo)[..., None] * t
    phi = _log_response(r, *args)
    j = np.argmax(phi, axis=-1)[..., None]
    best = np.take_along_axis(phi, j, -1)[..., 0]
    where = np.take_along_axis(r, j, -1)[..., 0]
    a = np.take_along_axis(r, np.maximum(j - 1, 0), -1)[..., 0]
    b = np.take_along_axis(r, np.minimum(j + 1, _BAND_POINTS - 1), -1)[..., 0]
    args = [x[..., 0] for x in args]
    c, d = b - _GOLDEN * (b - a), a + _GOLDEN * (b - a)
    pc, pd = _log_response(c, *args), _log_response(d, *args)
    for _ in range(_GOLDEN_STEPS):
        left = pc > pd                       # the largest lies in [a, d]: drop (d, b]
        a, b = np.where(left, a, c), np.where(left, d, b)
        new = np.where(left, b - _GOLDEN * (b - a), a + _GOLDEN * (b - a))
        pn = _log_response(new, *args)
        c, pc, d, pd = (np.where(left, new, d), np.where(left, pn, pd),
                        np.where(left, c, new), np.where(left, pc, pn))
    for x, px in ((c, pc), (d, pd)):
        better = px > best
        best, where = np.where(better, px, best), np.where(better, x, where)
    return best, where


# --------------------------------------------------------------------------------------------
# the damper across the band
# --------------------------------------------------------------------------------------------
def detuned_effective_damping(frequency_factor, mass_ratio, tuning_ratio, damper_damping,
                              structural_damping=0.0):
    """Effective damping when the building's frequency is off.

    .. math::

        \\zeta_{eff}(r) = \\zeta_{eff}\\left(\\mu, \\frac{f}{r}, \\zeta_d, \\zeta_s\\right),
        \\qquad r = \\frac{f_{actual}}{f_{nominal}}

    Parameters
    ----------
    frequency_factor : float or array_like
        r = actual over nominal frequency of the structure's mode, > 0 [-].
    mass_ratio : float or array_like
        mu = m_d / M*, > 0 [-].
    tuning_ratio : float or array_like
        f = f_d / f_nominal, the damper's tuning to the NOMINAL frequency, > 0 [-].
    damper_damping : float or array_like
        zeta_d = c_d / (2 m_d omega_d) on the damper's own frequency, >= 0 [-].
    structural_damping : float or array_like, optional
        zeta_s of the structure's mode without the damper, in [0, 1) [-].

    Returns
    -------
    effective_damping : float or numpy.ndarray
        Variance-equivalent damping ratio of the actual structure with the damper [-].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    The damper is unchanged (mass, frequency, dashpot) and so is M*: the building's frequency
    differs through its stiffness, so the tuning ratio to the actual structure is f / r and
    zeta_d, referred to the damper's own frequency, stays as built (module docstring). At
    r = 1 this is :func:`functions.damper.effective_damping`.

    Examples
    --------
    >>> f, z = optimal_tuning(0.02, "h2", 0.01)
    >>> [round(detuned_effective_damping(r, 0.02, f, z, 0.01), 5) for r in (0.9, 1.0, 1.1)]
    [0.02647, 0.04311, 0.02955]

    References
    ----------
    1. D. E. Newland, An Introduction to Random Vibrations, Spectral & Wavelet Analysis, 3rd ed.,
       Longman, 1993, Appendix 1.
    2. G. B. Warburton, "Optimum absorber parameters for various combinations of response and
       excitation parameters", Earthquake Eng. Struct. Dyn. 10:381-401, 1982.
    """
    r = check_range("frequency_factor", frequency_factor, 0.0, low_open=True, unit="-")
    f = check_range("tuning_ratio", tuning_ratio, 0.0, low_open=True, unit="-")
    r, f = broadcast(frequency_factor=r, tuning_ratio=f)
    return effective_damping(mass_ratio, f / r, damper_damping, structural_damping)


def detuned_acceleration(frequency_factor, acceleration, mass_ratio, tuning_ratio,
                         damper_damping, structural_damping, response_exponent=0.0):
    """Acceleration with the damper when the frequency is off.

    .. math::

        a_d(r) = a\\,r^k \\sqrt{\\frac{\\zeta_s}{\\zeta_{eff}(\\mu, f/r, \\zeta_d, \\zeta_s)}}

    Parameters
    ----------
    frequency_factor : float or array_like
        r = actual over nominal frequency of the structure's mode, > 0 [-].
    acceleration : float or array_like
        Peak acceleration without the damper at the NOMINAL frequency, > 0 [m/s^2].
    mass_ratio : float or array_like
        mu = m_d / M*, > 0 [-].
    tuning_ratio : float or array_like
        f = f_d / f_nominal, > 0 [-].
    damper_damping : float or array_like
        zeta_d on the damper's own frequency, >= 0 [-].
    structural_damping : float or array_like
        zeta_s of the structure's mode without the damper, in (0, 1) [-].
    response_exponent : float or array_like, optional
        k of the rule a(r) = a r^k for the acceleration without the damper across the band, in
        [-3, 3]; 0 (default) holds it constant [-].

    Returns
    -------
    acceleration_with_damper : float or numpy.ndarray
        Peak acceleration of the actual structure with the damper [m/s^2].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    The resonant rule of the design chain (response ~ 1/sqrt(zeta), EN 1991-1-4:2005 Annex B,
    B.2(6)) applied on the actual structure: the ratio of the displacement variances with and
    without the damper at the frequency f_a = r f_n. What holds the acceleration without the
    damper across the band is an assumption (module docstring): constant by default. At
    r = 1 this is the design chain's ``acceleration_with_damper``.

    Examples
    --------
    >>> f, z = optimal_tuning(0.02, "h2", 0.01)
    >>> round(detuned_acceleration(1.0, 0.2, 0.02, f, z, 0.01), 5)
    0.09633
    >>> round(detuned_acceleration(0.9, 0.2, 0.02, f, z, 0.01), 5)
    0.12292

    References
    ----------
    1. EN 1991-1-4:2005, Eurocode 1: Actions on structures - Wind actions, Annex B, B.2(6).
    2. D. E. Newland, An Introduction to Random Vibrations, Spectral & Wavelet Analysis, 3rd ed.,
       Longman, 1993, Appendix 1.
    """
    a = check_range("acceleration", acceleration, 0.0, low_open=True, unit="m/s^2")
    zs = _damped(structural_damping)
    k = _exponent(response_exponent)
    r = check_range("frequency_factor", frequency_factor, 0.0, low_open=True, unit="-")
    zeta = np.asarray(detuned_effective_damping(r, mass_ratio, tuning_ratio, damper_damping,
                                                zs))
    a, r, zs, k, zeta = broadcast(acceleration=a, frequency_factor=r, structural_damping=zs,
                                  response_exponent=k, effective_damping=zeta)
    return scalar_or_array(a * r ** k * np.sqrt(zs / zeta))


def band_worst_case(band_lower, band_upper, acceleration, mass_ratio, tuning_ratio,
                    damper_damping, structural_damping, response_exponent=0.0):
    """Worst acceleration with the damper over a frequency band.

    .. math::

        a_{worst} = \\max_{r_{lo} \\le r \\le r_{hi}} a\\,r^k
        \\sqrt{\\frac{\\zeta_s}{\\zeta_{eff}(\\mu, f/r, \\zeta_d, \\zeta_s)}}

    Parameters
    ----------
    band_lower : float or array_like
        Lowest frequency factor r = f_actual / f_nominal of the band, in [0.5, 1] [-].
    band_upper : float or array_like
        Highest frequency factor of the band, in [1, 2] [-].
    acceleration : float or array_like
        Peak acceleration without the damper at the nominal frequency, > 0 [m/s^2].
    mass_ratio : float or array_like
        mu = m_d / M*, > 0 [-].
    tuning_ratio : float or array_like
        f = f_d / f_nominal, > 0 [-].
    damper_damping : float or array_like
        zeta_d on the damper's own frequency, >= 0 [-].
    structural_damping : float or array_like
        zeta_s of the structure's mode without the damper, in (0, 1) [-].
    response_exponent : float or array_like, optional
        k of a(r) = a r^k, in [-3, 3]; 0 holds the acceleration without the damper constant
        [-].

    Returns
    -------
    worst_acceleration : float or numpy.ndarray
        Largest peak acceleration with the damper anywhere in the band [m/s^2].
    worst_factor : float or numpy.ndarray
        Frequency factor r at which it occurs [-].
    worst_effective_damping : float or numpy.ndarray
        Effective damping zeta_eff there (the least over the band when k = 0) [-].

    Raises
    ------
    ValueError
        If the band does not contain the nominal frequency (band_lower > 1 or band_upper < 1),
        an argument is outside its range, or the arrays do not broadcast.

    Notes
    -----
    Searched on 257 equally spaced points of the band, then refined by golden-section search
    between the neighbours of the largest (64 steps: the location to about 1e-13 of the grid
    step). For a damper tuned near the middle of the band the worst case lies at an end.

    Examples
    --------
    >>> f, z = optimal_tuning(0.02, "h2", 0.01)
    >>> a, r, zeta = band_worst_case(0.9, 1.1, 0.2, 0.02, f, z, 0.01)
    >>> round(a, 5), round(r, 3), round(zeta, 5)
    (0.12292, 0.9, 0.02647)

    References
    ----------
    1. EN 1991-1-4:2005, Eurocode 1: Actions on structures - Wind actions, Annex B, B.2(6).
    2. D. E. Newland, An Introduction to Random Vibrations, Spectral & Wavelet Analysis, 3rd ed.,
       Longman, 1993, Appendix 1.
    """
    lo, hi = _band(band_lower, band_upper)
    a = check_range("acceleration", acceleration, 0.0, low_open=True, unit="m/s^2")
    mu = check_range("mass_ratio", mass_ratio, 0.0, low_open=True, unit="-")
    f = check_range("tuning_ratio", tuning_ratio, 0.0, low_open=True, unit="-")
    zd = check_range("damper_damping", damper_damping, 0.0, unit="-")
    zs = _damped(structural_damping)
    k = _exponent(response_exponent)
    lo, hi, a, mu, f, zd, zs, k = broadcast(
        band_lower=lo, band_upper=hi, acceleration=a, mass_ratio=mu, tuning_ratio=f,
        damper_damping=zd, structural_damping=zs, response_exponent=k)
    with np.errstate(divide="ignore", invalid="ignore"):
        phi, r = _worst(lo, hi, mu, f, zd, zs, k)
    worst = a * np.sqrt(zs) * np.exp(phi)
    zeta = np.asarray(effective_damping(mu, f / r, zd, zs))
    return scalar_or_array(worst), scalar_or_array(r), scalar_or_array(zeta)


# --------------------------------------------------------------------------------------------
# robust tuning
# --------------------------------------------------------------------------------------------
def _robust_residual(u, mu, zs, a, b):
    """Minimax conditions in u = (ln f^2, ln zeta_d f), the tuning to the nominal frequency:
    ln zeta_eff is equal at the two ends r = e^a, e^b of the band and its gradients with
    respect to u there are parallel (opposed at the minimax: checked). At an end the damper
    sees w / r^2 and g / r, so u shifts by (-2 ln r, -ln r)."""
    ul = np.stack([u[..., 0] - 2.0 * a, u[..., 1] - a], axis=-1)
    uh = np.stack([u[..., 0] - 2.0 * b, u[..., 1] - b], axis=-1)
    gap = (_log_zeta(mu, np.exp(ul[..., 0]), np.exp(ul[..., 1]), zs)
           - _log_zeta(mu, np.exp(uh[..., 0]), np.exp(uh[..., 1]), zs))
    dl, dh = _h2_residual(ul, mu, zs), _h2_residual(uh, mu, zs)
    return np.stack([gap, dl[..., 0] * dh[..., 1] - dl[..., 1] * dh[..., 0]], axis=-1)


def _robust_check(u, mu, zs, a, b) -> np.ndarray:
    """True where the equal-ends solution is the minimax: the gradients at the two ends oppose
    and no point inside the band has less effective damping than the ends."""
    ul = np.stack([u[:, 0] - 2.0 * a, u[:, 1] - a], axis=-1)
    uh = np.stack([u[:, 0] - 2.0 * b, u[:, 1] - b], axis=-1)
    opposed = np.sum(_h2_residual(ul, mu, zs) * _h2_residual(uh, mu, zs), axis=-1) < 0.0
    f, zd = np.exp(0.5 * u[:, 0]), np.exp(u[:, 1] - 0.5 * u[:, 0])
    lo, hi = np.exp(a), np.exp(b)
    zero = np.zeros_like(mu)
    phi, _ = _worst(lo, hi, mu, f, zd, zs, zero)
    ends = np.maximum(_log_response(lo, mu, f, zd, zs, zero),
                      _log_response(hi, mu, f, zd, zs, zero))
    return opposed & (phi <= ends + 1e-9)


def _robust_optimum(mu, zs, lo, hi) -> tuple[np.ndarray, np.ndarray]:
    """Robust (f, zeta_d) for 1-D arrays of validated cases.

    Newton on :func:`_robust_residual` from the h2 optimum moved to the band's middle (in
    ln r); where that fails, continuation in the band's width (1/n, 2/n, ... of it, n = 8 then
    64). A band of no width gives the h2 optimum.
    """
    f2, z2 = (np.atleast_1d(np.asarray(x, dtype=float)) for x in optimal_tuning(mu, "h2", zs))
    a, b = np.log(lo), np.log(hi)
    mid = 0.5 * (a + b)
    u0 = np.stack([np.log(f2 * f2) + 2.0 * mid, np.log(z2 * f2) + mid], axis=-1)
    wide = b - a > 1e-9
    u = u0.copy()
    ok = ~wide
    idx = np.flatnonzero(wide)
    with np.errstate(all="ignore"):
        u[idx], ok[idx] = _batched_newton(_robust_residual, u0[idx].copy(),
                                          (mu[idx], zs[idx], a[idx], b[idx]))
        ok[idx] &= _robust_check(u[idx], mu[idx], zs[idx], a[idx], b[idx])
    for n in (8, 64):
        bad = np.flatnonzero(~ok)
        if bad.size == 0:
            break
        ub = u0[bad].copy()
        okb = np.ones(bad.size, dtype=bool)
        with np.errstate(all="ignore"):
            for j in range(1, n + 1):
                ab = mid[bad] + (j / n) * (a[bad] - mid[bad])
                bb = mid[bad] + (j / n) * (b[bad] - mid[bad])
                ub, okj = _batched_newton(_robust_residual, ub, (mu[bad], zs[bad], ab, bb))
                okb &= okj
            okb &= _robust_check(ub, mu[bad], zs[bad], a[bad], b[bad])
        u[bad[okb]] = ub[okb]
        ok[bad[okb]] = True
    if not ok.all():
        j = int(np.flatnonzero(~ok)[0])
        raise RuntimeError(f"robust optimum not found for mass_ratio={mu[j]!r}, "
                           f"structural_damping={zs[j]!r}, band {lo[j]!r} to {hi[j]!r}")
    f = np.exp(0.5 * u[:, 0])
    return f, np.exp(u[:, 1]) / f


def robust_tuning(mass_ratio, band_lower, band_upper, structural_damping=0.0):
    """Tuning that minimises the worst acceleration over a band.

    .. math::

        (f, \\zeta_d) = \\arg\\max_{f,\\,\\zeta_d}\\ \\min_{r_{lo} \\le r \\le r_{hi}}
        \\zeta_{eff}\\left(\\mu, \\frac{f}{r}, \\zeta_d, \\zeta_s\\right)

    Parameters
    ----------
    mass_ratio : float or array_like
        mu = m_d / M*, in [1e-4, 0.5] [-].
    band_lower : float or array_like
        Lowest frequency factor r = f_actual / f_nominal of the band, in [0.5, 1] [-].
    band_upper : float or array_like
        Highest frequency factor of the band, in [1, 2] [-].
    structural_damping : float or array_like, optional
        zeta_s of the structure's mode without the damper, in [0, 0.3] [-].

    Returns
    -------
    tuning_ratio : float or numpy.ndarray
        f = f_d / f_nominal, the damper's frequency over the NOMINAL structure frequency [-].
    damping_ratio : float or numpy.ndarray
        Damper damping ratio on the damper's own frequency, c_d / (2 m_d omega_d) [-].

    Raises
    ------
    ValueError
        If the band does not contain the nominal frequency, an argument is outside its range,
        or the arrays do not broadcast.
    RuntimeError
        If the optimum is not found (not seen in the validated range, see Notes).

    Notes
    -----
    With the acceleration without the damper held constant across the band (the module's
    default assumption) the worst acceleration sqrt(zeta_s / zeta_eff) is least where the
    least effective damping over the band is greatest. The effective damping rises to one
    peak as the tuning passes through the structure's frequency, so over the band it is least
    at an end; the damper tuned to its h2 optimum at one end leaves the other end worse, so at
    the optimum both ends are equal and the gradients of ln zeta_eff at the two ends with
    respect to (ln f^2, ln zeta_d f) oppose (the minimum of two smooth functions is greatest
    where they are equal and no direction raises both). Solved by batched Newton iteration on
    these two conditions (the h2 gradient of :mod:`functions.optima`), started at the h2
    optimum moved to the middle of the band, with continuation in the width of the band where
    needed; each solution is checked: opposed gradients and no point inside the band (257
    points and a golden-section search) below the ends. A band of no width gives the h2
    optimum. Validated on 1e-4 <= mu <= 0.5, 0 <= zeta_s <= 0.3, bands 0.5-1 to 1-2 (9,072
    cases, all converged; 0.06 to 0.2 ms per case in a sweep); the tests confirm the optimum by
    a brute-force grid. The robust damper is more heavily damped than the h2 damper: it
    trades effective damping at the nominal frequency for damping at the ends.

    Examples
    --------
    >>> f, z = robust_tuning(0.02, 0.9, 1.1, 0.01)
    >>> round(f, 5), round(z, 5)
    (0.9708, 0.11707)
    >>> round(band_worst_case(0.9, 1.1, 0.2, 0.02, f, z, 0.01)[0], 5)     # worst case
    0.11518
    >>> h2 = optimal_tuning(0.02, "h2", 0.01)                           # against h2
    >>> round(band_worst_case(0.9, 1.1, 0.2, 0.02, *h2, 0.01)[0], 5)
    0.12292

    References
    ----------
    1. G. B. Warburton, "Optimum absorber parameters for various combinations of response and
       excitation parameters", Earthquake Eng. Struct. Dyn. 10:381-401, 1982.
    2. D. E. Newland, An Introduction to Random Vibrations, Spectral & Wavelet Analysis, 3rd ed.,
       Longman, 1993, Appendix 1.
    """
    mu = check_range("mass_ratio", mass_ratio, *ROBUST_LIMITS["mass_ratio"], unit="-")
    lo, hi = _band(band_lower, band_upper)
    zs = check_range("structural_damping", structural_damping,
                     *ROBUST_LIMITS["structural_damping"], unit="-")
    mu, lo, hi, zs = broadcast(mass_ratio=mu, band_lower=lo, band_upper=hi,
                               structural_damping=zs)
    shape = mu.shape
    f, zd = _robust_optimum(*(x.ravel().copy() for x in (mu, zs, lo, hi)))
    return scalar_or_array(f.reshape(shape)), scalar_or_array(zd.reshape(shape))


# --------------------------------------------------------------------------------------------
# mass ratio for the band
# --------------------------------------------------------------------------------------------
def _tuning(mu: float, zs: float, lo: float, hi: float, method: str) -> tuple[float, float]:
    """(f, zeta_d) of ``method`` at one case, as the design chain tunes it (closed forms as
    printed, for an undamped structure; h2 and hinf for the damped one)."""
    m = np.array([mu])
    if method == "robust":
        f, zd = _robust_optimum(m, np.array([zs]), np.array([lo]), np.array([hi]))
        return float(f[0]), float(zd[0])
    f, zd = optimal_tuning(mu, method, 0.0 if method in CLOSED_FORMS else zs)
    return float(f), float(zd)


def _log_worst(mu, zs, lo, hi, k, method) -> float:
    """ln(a_worst / (a sqrt(zeta_s))) of the damper ``method`` tunes for mass ratio mu."""
    f, zd = _tuning(mu, zs, lo, hi, method)
    phi, _ = _worst(*(np.array(x) for x in (lo, hi, mu, f, zd, zs, k)))
    return float(phi)


def band_mass_ratio(acceleration, acceleration_limit, structural_damping, band_lower,
                    band_upper, method="h2", response_exponent=0.0):
    """Mass ratio that meets the limit anywhere in a frequency band.

    .. math::

        \\max_{r_{lo} \\le r \\le r_{hi}} a\\,r^k
        \\sqrt{\\frac{\\zeta_s}{\\zeta_{eff}(\\mu, f(\\mu)/r, \\zeta_d(\\mu), \\zeta_s)}}
        = a_{lim}

    Parameters
    ----------
    acceleration : float or array_like
        Peak acceleration without the damper at the nominal frequency, > 0 [m/s^2].
    acceleration_limit : float or array_like
        Accepted peak acceleration, > 0 [m/s^2].
    structural_damping : float or array_like
        zeta_s of the structure's mode without the damper, in (0, 0.3] [-].
    band_lower : float or array_like
        Lowest frequency factor r = f_actual / f_nominal of the band, in [0.5, 1] [-].
    band_upper : float or array_like
        Highest frequency factor of the band, in [1, 2] [-].
    method : str, optional
        How the damper is tuned, one of :data:`BAND_METHODS`: a nominal method of
        :func:`functions.damper.optimal_tuning` (tuned at the nominal frequency) or
        ``robust`` (:func:`robust_tuning` over the band) [-].
    response_exponent : float or array_like, optional
        k of a(r) = a r^k for the acceleration without the damper, in [-3, 3]; must be 0
        with ``robust`` [-].

    Returns
    -------
    mass_ratio : float or numpy.ndarray
        Least mu whose damper keeps the acceleration within the limit over the whole band; 0
        when the structure alone does [-].

    Raises
    ------
    ValueError
        For an unknown method, an argument outside its range, a band that does not contain the
        nominal frequency, arrays that do not broadcast, response_exponent != 0 with
        ``robust``, or a limit that needs a mass ratio above the searched range (2; 1 for the
        base forms; 0.5 for ``robust``) or below 1e-4.

    Notes
    -----
    Solved with brentq on mu for each element; the worst acceleration over the band is that
    of :func:`band_worst_case` for the damper the method tunes at each trial mu (the closed
    forms as printed, ignoring zeta_s, as the design chain does). With a band of no width
    (1, 1) and k = 0 this is :func:`functions.damper.required_mass_ratio` for the required
    damping zeta_s (a / a_lim)^2.

    Examples
    --------
    >>> round(band_mass_ratio(0.25, 0.15, 0.015, 1.0, 1.0), 5)   # the nominal design
    0.01435
    >>> round(band_mass_ratio(0.25, 0.15, 0.015, 0.9, 1.1), 5)   # h2, tuned at nominal
    0.03339
    >>> round(band_mass_ratio(0.25, 0.15, 0.015, 0.9, 1.1, "robust"), 5)
    0.02863

    References
    ----------
    1. EN 1991-1-4:2005, Eurocode 1: Actions on structures - Wind actions, Annex B, B.2(6).
    2. G. B. Warburton, Earthquake Eng. Struct. Dyn. 10:381-401, 1982.
    """
    if not isinstance(method, str) or method not in BAND_METHODS:
        raise ValueError(f"method={method!r} must be one of {', '.join(BAND_METHODS)}")
    a = check_range("acceleration", acceleration, 0.0, low_open=True, unit="m/s^2")
    lim = check_range("acceleration_limit", acceleration_limit, 0.0, low_open=True,
                      unit="m/s^2")
    zs = _damped(structural_damping, MAX_NUMERICAL_STRUCTURAL_DAMPING)
    lo, hi = _band(band_lower, band_upper)
    k = _exponent(response_exponent)
    if method == "robust" and np.any(k != 0.0):
        raise ValueError(f"response_exponent={float(k[k != 0.0].flat[0])!r} must be 0 for "
                         "method='robust' (the robust tuning holds the acceleration without "
                         "the damper constant across the band)")
    a, lim, zs, lo, hi, k = broadcast(acceleration=a, acceleration_limit=lim,
                                      structural_damping=zs, band_lower=lo, band_upper=hi,
                                      response_exponent=k)
    low = ROBUST_LIMITS["mass_ratio"][0]
    high = {"robust": ROBUST_LIMITS["mass_ratio"][1], "harmonic_base": 1.0,
            "white_noise_base": 1.0}.get(method, 2.0)
    out = np.zeros(a.shape)
    for idx in np.ndindex(a.shape):
        case = tuple(float(x[idx]) for x in (zs, lo, hi, k))
        target = np.log(float(lim[idx]) / (float(a[idx]) * np.sqrt(case[0])))
        if float(a[idx]) * max(case[1] ** case[3], case[2] ** case[3]) <= float(lim[idx]):
            continue                                   # the structure alone meets the limit
        if _log_worst(high, *case, method) > target:
            raise ValueError(f"acceleration_limit={float(lim[idx])!r} needs a mass_ratio above "
                             f"{high:g} over the band {case[1]:g} to {case[2]:g} with "
                             f"method={method!r}; no practical damper reaches it")
        if _log_worst(low, *case, method) < target:
            raise ValueError(f"acceleration_limit={float(lim[idx])!r} needs a mass_ratio below "
                             f"{low:g} with method={method!r}; in practice no damper is "
                             "needed")
        from scipy.optimize import brentq   # lazy import: scipy.optimize's start-up (0.15 s)
        out[idx] = brentq(lambda m: _log_worst(m, *case, method) - target, low, high,
                          xtol=1e-14, rtol=1e-13)
    return scalar_or_array(out)


# --------------------------------------------------------------------------------------------
# hangers and the as-built retune
# --------------------------------------------------------------------------------------------
def hanger_adjustment(frequency, band_lower, band_upper, tuning_ratio, design_swing_deg=0.0,
                      g=STANDARD_GRAVITY):
    """Hanger lengths in tune at the two ends of a frequency band.

    .. math::

        L_{lo,hi} = L_{eq}\\big(f\\,r_{lo,hi}\\,f_s,\\ \\theta_0\\big)
        = \\frac{g}{(2\\pi f r f_s)^2 (1 + e(\\theta_0))^2}

    Parameters
    ----------
    frequency : float or array_like
        Nominal natural frequency f_s of the structure's mode, > 0 [Hz].
    band_lower : float or array_like
        Lowest frequency factor r = f_actual / f_nominal of the band, in [0.5, 1] [-].
    band_upper : float or array_like
        Highest frequency factor of the band, in [1, 2] [-].
    tuning_ratio : float or array_like
        f = f_d / f_actual the damper is retuned to once the frequency is known (the nominal
        method's optimum), > 0 [-].
    design_swing_deg : float or array_like, optional
        Swing at which the pendulum must be in tune, in [0, 180) [deg].
    g : float or array_like, optional
        Acceleration of gravity, > 0 [m/s^2].

    Returns
    -------
    length_at_lower : float or numpy.ndarray
        Hanger length in tune if the building is at the band's lower end (the longest) [m].
    length_at_upper : float or numpy.ndarray
        Hanger length in tune if the building is at the band's upper end (the shortest) [m].

    Raises
    ------
    ValueError
        If the band does not contain the nominal frequency, an argument is outside its range,
        or the arrays do not broadcast.

    Notes
    -----
    The hangers must be adjustable from length_at_upper to length_at_lower (the frequency
    falls as the square root of the length, so a band of +-10 % in frequency needs about
    -17 % to +23 % in length). The length is :func:`functions.pendulum.equivalent_length`:
    in tune at the design swing (pass the design's swing angle; 0 gives the small-angle
    length g / (2 pi f_d)^2). The tuning ratio to the actual building is taken as unchanged
    across the band (for h2 it depends on zeta_s only, for the closed forms on mu only).

    Examples
    --------
    >>> lo, hi = hanger_adjustment(0.15, 0.9, 1.1, 0.98851, 5.0)
    >>> round(lo, 3), round(hi, 3)
    (13.935, 9.329)

    References
    ----------
    1. Abramowitz & Stegun, Handbook of Mathematical Functions (NBS AMS-55, 1964), §17.2.
    """
    fs = check_range("frequency", frequency, 0.0, low_open=True, unit="Hz")
    lo, hi = _band(band_lower, band_upper)
    f = check_range("tuning_ratio", tuning_ratio, 0.0, low_open=True, unit="-")
    fs, lo, hi, f = broadcast(frequency=fs, band_lower=lo, band_upper=hi, tuning_ratio=f)
    return (equivalent_length(f * lo * fs, design_swing_deg, g),
            equivalent_length(f * hi * fs, design_swing_deg, g))


class AsBuiltRetune(NamedTuple):
    """The damper retuned to the measured building (SI units)."""

    tuning_ratio: float | np.ndarray      #: f_d / f_measured [-]
    damper_frequency: float | np.ndarray  #: f_d [Hz]
    pendulum_length: float | np.ndarray   #: hanger length in tune at the design swing [m]
    damper_damping: float | np.ndarray    #: zeta_d on the damper's own frequency [-]
    dashpot: float | np.ndarray           #: c_d = 2 zeta_d m_d omega_d [N s/m]


def as_built_retune(measured_frequency, damper_mass, modal_mass, structural_damping=0.0,
                    method="h2", design_swing_deg=0.0, g=STANDARD_GRAVITY):
    """Damper settings for the building's measured frequency.

    .. math::

        f_d = f\\,f_{meas},\\quad L = L_{eq}(f_d, \\theta_0),\\quad
        c_d = 2\\,\\zeta_d\\,m_d\\,(2\\pi f_d),\\quad
        (f, \\zeta_d) = \\mathrm{opt}(\\mu = m_d / M^*, \\zeta_s)

    Parameters
    ----------
    measured_frequency : float or array_like
        Frequency of the structure's mode as measured on the finished building (without the
        damper's mass; see Notes), > 0 [Hz].
    damper_mass : float or array_like
        Moving mass m_d of the damper as built, > 0 [kg].
    modal_mass : float or array_like
        Generalised mass M* of the mode, normalised to 1 at the damper, > 0 [kg].
    structural_damping : float or array_like, optional
        zeta_s of the mode: the measured value if there is one, else the design value, in
        [0, 0.3] [-].
    method : str, optional
        Tuning method, one of :data:`functions.damper.OPTIMAL_TUNING_METHODS` (the closed
        forms are used as printed, ignoring zeta_s, as in the design chain) [-].
    design_swing_deg : float or array_like, optional
        Swing at which the pendulum must be in tune, in [0, 180) [deg].
    g : float or array_like, optional
        Acceleration of gravity, > 0 [m/s^2].

    Returns
    -------
    tuning_ratio : float or numpy.ndarray
        f = f_d / f_measured [-].
    damper_frequency : float or numpy.ndarray
        New damper frequency f_d [Hz].
    pendulum_length : float or numpy.ndarray
        Hanger length in tune at the design swing [m].
    damper_damping : float or numpy.ndarray
        New damper damping ratio on the damper's own frequency [-].
    dashpot : float or numpy.ndarray
        Dashpot constant c_d = 2 zeta_d m_d (2 pi f_d) [N s/m].

    Raises
    ------
    ValueError
        For an unknown method, an argument outside its range, the arrays not broadcasting, or
        a mass ratio outside the method's range.

    Notes
    -----
    The frequency the design calls f_s is that of the structure without the damper's mass. A
    test with the damper locked to the structure measures sqrt(k_s / (M* + m_d)), so multiply
    such a value by sqrt(1 + mu) first. After the measurement the frequency is known: the
    damper is tuned for it by the nominal method (no band left). The result is returned as
    :class:`AsBuiltRetune`; with the design's own frequency, damping and swing it repeats the
    design chain's damper frequency, pendulum length, damping and dashpot.

    Examples
    --------
    >>> s = as_built_retune(0.14, 287e3, 2.0e7, 0.015, "h2", 5.0)
    >>> round(s.damper_frequency, 5), round(s.pendulum_length, 3), round(s.dashpot)
    (0.13839, 12.958, 29735)

    References
    ----------
    1. G. B. Warburton, Earthquake Eng. Struct. Dyn. 10:381-401, 1982.
    2. Abramowitz & Stegun, Handbook of Mathematical Functions (NBS AMS-55, 1964), §17.2.
    """
    if not isinstance(method, str) or method not in OPTIMAL_TUNING_METHODS:
        raise ValueError(f"method={method!r} must be one of {', '.join(OPTIMAL_TUNING_METHODS)}")
    fm = check_range("measured_frequency", measured_frequency, 0.0, low_open=True, unit="Hz")
    md = check_range("damper_mass", damper_mass, 0.0, low_open=True, unit="kg")
    mm = check_range("modal_mass", modal_mass, 0.0, low_open=True, unit="kg")
    zs = check_range("structural_damping", structural_damping, 0.0,
                     MAX_NUMERICAL_STRUCTURAL_DAMPING, unit="-")
    fm, md, mm, zs = broadcast(measured_frequency=fm, damper_mass=md, modal_mass=mm,
                               structural_damping=zs)
    f, zd = (np.asarray(x) for x in optimal_tuning(
        md / mm, method, np.zeros_like(zs) if method in CLOSED_FORMS else zs))
    fd = f * fm
    length = equivalent_length(fd, design_swing_deg, g)
    dashpot = 2.0 * zd * md * (2.0 * np.pi * fd)
    return AsBuiltRetune(scalar_or_array(f), scalar_or_array(fd), length, scalar_or_array(zd),
                         scalar_or_array(dashpot))
