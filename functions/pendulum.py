# SPDX-License-Identifier: MIT
"""The simple pendulum, exactly: period, small-angle error, tuned length, motion.

A pendulum damper is a mass on hangers. Its small-angle period ``T0 = 2 pi sqrt(L/g)`` is what
tuning charts assume; at a finite swing the true period is longer. This module gives the exact
period through the complete elliptic integral of the first kind K(m), with the parameter
convention m = k^2 = sin^2(theta0/2) of Abramowitz & Stegun ch. 17 and of ``scipy.special.ellipk``.

Accuracy near 180 deg: K is evaluated as ``ellipkm1(p)`` with the complementary parameter
``p = 1 - m = cos^2(theta0/2)`` computed as ``sin^2((180 deg - theta0)/2)``; ``180 - theta0`` is
exact in floating point near 180 deg, so no precision is lost to cancellation.
"""
from __future__ import annotations

import math

import numpy as np
from scipy.special import ellipj, ellipkm1

from functions._validation import as_array, broadcast, check_range, scalar_or_array

__all__ = [
    "STANDARD_GRAVITY",
    "exact_period",
    "small_angle_period",
    "small_angle_error",
    "amplitude_for_error",
    "pendulum_frequency",
    "equivalent_length",
    "compound_pendulum_length",
    "folded_pendulum_length",
    "pendulum_motion",
    "swing_angle",
    "amplitude_detuning",
    "pendulum_length",
]

#: Standard acceleration of gravity g_n [m/s^2], exact by definition (3rd CGPM, 1901).
STANDARD_GRAVITY = 9.80665

#: Largest small-angle error accepted by :func:`amplitude_for_error` [-]; its amplitude is
#: 180 deg less about 1.4e-5 deg, close to the end of what a double can resolve.
MAX_PERIOD_ERROR = 10.0

# Below this parameter m the period-ratio series is summed directly (keeps the relative
# precision of T/T0 - 1 at small swings, where 2K/pi - 1 would cancel).
_SERIES_LIMIT = 0.05
_SERIES_TERMS = 24
_SERIES_COEFFS = np.array(
    [(math.comb(2 * n, n) / 4.0**n) ** 2 for n in range(1, _SERIES_TERMS + 1)]
)


def _length(length) -> np.ndarray:
    return check_range("length", length, 0.0, low_open=True, unit="m")


def _gravity(g) -> np.ndarray:
    return check_range("g", g, 0.0, low_open=True, unit="m/s^2")


def _amplitude(amplitude_deg) -> np.ndarray:
    return check_range("amplitude_deg", amplitude_deg, 0.0, 180.0, high_open=True, unit="deg")


def _complement(amplitude_deg: np.ndarray) -> np.ndarray:
    """Complementary parameter p = 1 - m = cos^2(a/2) = sin^2((180 deg - a)/2), no cancellation."""
    p = np.array(np.subtract(180.0, amplitude_deg), dtype=float, ndmin=0)
    p *= np.pi / 360.0
    np.sin(p, out=p)
    p *= p
    return p


def _parameters(amplitude_deg: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Return (m, p) = (sin^2(a/2), cos^2(a/2)) each without cancellation."""
    m = np.sin(np.radians(amplitude_deg) / 2.0) ** 2
    return m, _complement(amplitude_deg)


def _period_ratio_minus_one(amplitude_deg: np.ndarray) -> np.ndarray:
    """T/T0 - 1 = 2K(m)/pi - 1, accurate in relative terms for small amplitudes too."""
    m, p = _parameters(amplitude_deg)
    out = 2.0 / np.pi * ellipkm1(p) - 1.0
    small = m < _SERIES_LIMIT
    if np.any(small):
        ms = m[small] if out.ndim else m
        # Horner evaluation of sum_{n>=1} c_n m^n
        acc = np.zeros_like(ms)
        for c in _SERIES_COEFFS[::-1]:
            acc = (acc + c) * ms
        if out.ndim:
            out[small] = acc
        else:
            out = acc
    return out


def exact_period(length, amplitude_deg=0.0, g=STANDARD_GRAVITY):
    """Exact period of a simple pendulum released at a swing.

    .. math::

        T = 4 \\sqrt{L/g}\\; K(m), \\qquad m = \\sin^2(\\theta_0/2)
          = \\frac{2\\pi\\sqrt{L/g}}{\\mathrm{AGM}(1, \\cos(\\theta_0/2))}

    Parameters
    ----------
    length : float or array_like
        Pendulum length from pivot to centre of mass, L [m].
    amplitude_deg : float or array_like, optional
        Swing amplitude theta0 measured from the vertical, in [0, 180) [deg].
    g : float or array_like, optional
        Acceleration of gravity, default standard gravity 9.80665 [m/s^2].

    Returns
    -------
    period : float or numpy.ndarray
        Exact period T of a full swing (there and back) [s].

    Raises
    ------
    ValueError
        If ``length`` or ``g`` is not a positive finite number, or ``amplitude_deg`` is outside
        [0, 180).

    Notes
    -----
    Point mass on a massless rigid rod, no friction. K is evaluated as
    ``scipy.special.ellipkm1(cos^2(theta0/2))`` with the complementary parameter formed without
    cancellation, so the relative accuracy stays near 1e-15 up to 179.99 deg. As theta0 -> 180 deg
    the period grows like (2/pi) ln(4/cos(theta0/2)) T0.

    Examples
    --------
    A 10 m hanger swinging 15 deg:

    >>> round(exact_period(10.0, 15.0), 6)
    6.37211
    >>> round(exact_period(10.0, 0.0), 6)   # the small-angle period 2 pi sqrt(L/g)
    6.344823

    References
    ----------
    1. M. Abramowitz, I. A. Stegun, Handbook of Mathematical Functions, NBS AMS-55 (1964),
       §17.2 (parameter m = k^2), §17.6 (arithmetic-geometric mean).
    2. NIST Digital Library of Mathematical Functions, §19.8 (K through the AGM).
    """
    L = _length(length)
    a = _amplitude(amplitude_deg)
    gg = _gravity(g)
    p = _complement(a)
    ellipkm1(p, out=p)
    if gg.ndim == 0:
        root = np.sqrt(L) * (4.0 / np.sqrt(gg))
    else:
        root = 4.0 * np.sqrt(L / gg)
    return scalar_or_array(np.multiply(root, p, out=p if p.shape == np.broadcast(root, p).shape else None))


def small_angle_period(length, g=STANDARD_GRAVITY):
    """Small-angle period of a simple pendulum.

    .. math::

        T_0 = 2\\pi \\sqrt{L/g}

    Parameters
    ----------
    length : float or array_like
        Pendulum length L [m].
    g : float or array_like, optional
        Acceleration of gravity [m/s^2].

    Returns
    -------
    period : float or numpy.ndarray
        Period for vanishing swing T0 [s].

    Raises
    ------
    ValueError
        If ``length`` or ``g`` is not a positive finite number.

    Notes
    -----
    Underestimates the true period by :func:`small_angle_error` at a finite swing.

    Examples
    --------
    >>> round(small_angle_period(1.0), 6)
    2.006409

    References
    ----------
    1. Abramowitz & Stegun (1964), §17.2: K(0) = pi/2, so 4 sqrt(L/g) K(0) = T0.
    """
    L = _length(length)
    gg = _gravity(g)
    return scalar_or_array(2.0 * np.pi * np.sqrt(L / gg))


def small_angle_error(amplitude_deg):
    """Fraction by which the small-angle period is too short.

    .. math::

        e(\\theta_0) = \\frac{T}{T_0} - 1 = \\frac{2}{\\pi} K(\\sin^2(\\theta_0/2)) - 1
        = \\frac{\\theta_0^2}{16} + \\frac{11\\,\\theta_0^4}{3072} + \\dots

    Parameters
    ----------
    amplitude_deg : float or array_like
        Swing amplitude theta0, in [0, 180) [deg].

    Returns
    -------
    error : float or numpy.ndarray
        Relative period error T/T0 - 1, zero or positive [-].

    Raises
    ------
    ValueError
        If ``amplitude_deg`` is outside [0, 180).

    Notes
    -----
    Independent of length and gravity. For m = sin^2(theta0/2) < 0.05 the Legendre series
    sum_n [(2n)!/(2^(2n) (n!)^2)]^2 m^n is summed (24 terms, truncation below 1e-30) so the
    result keeps full relative precision at tiny swings. The trade's rule of thumb, "good to
    about 15 deg", corresponds to an error of about 0.43 %.

    Examples
    --------
    >>> print(f"{small_angle_error(15.0):.4%}")
    0.4301%

    References
    ----------
    1. Abramowitz & Stegun (1964), 17.3.11 (series of K in powers of m).
    """
    a = _amplitude(amplitude_deg)
    return scalar_or_array(_period_ratio_minus_one(a))


def amplitude_for_error(error):
    """Largest swing whose small-angle period error is ``error``.

    .. math::

        \\theta_0 = e^{-1}(\\text{error}), \\qquad e(\\theta_0) = \\frac{2}{\\pi}K(\\sin^2(\\theta_0/2)) - 1

    Parameters
    ----------
    error : float or array_like
        Accepted relative period error T/T0 - 1, in [0, 10] [-].

    Returns
    -------
    amplitude_deg : float or numpy.ndarray
        Swing amplitude at which the small-angle period is short by ``error`` [deg].

    Raises
    ------
    ValueError
        If ``error`` is outside [0, 10] (an error of 10 is reached 1.4e-5 deg short of 180 deg).

    Notes
    -----
    Vectorised bisection (the error is monotonic in the amplitude): on the amplitude up to
    90 deg, and on ln(180 deg - theta0) beyond, 80 halvings each, so the result is exact to a few
    units in the last place of the amplitude.

    Examples
    --------
    The largest swing for a 1 % period error:

    >>> round(amplitude_for_error(0.01), 4)
    22.8138

    References
    ----------
    1. Abramowitz & Stegun (1964), ch. 17.
    """
    e = check_range("error", error, 0.0, MAX_PERIOD_ERROR)
    flat = np.atleast_1d(e).astype(float).ravel()
    out = np.empty_like(flat)
    e90 = float(_period_ratio_minus_one(np.asarray(90.0)))
    low_part = flat <= e90
    # amplitude in [0, 90]
    if low_part.any():
        target = flat[low_part]
        lo = np.zeros_like(target)
        hi = np.full_like(target, 90.0)
        for _ in range(80):
            mid = 0.5 * (lo + hi)
            above = _period_ratio_minus_one(mid) > target
            hi = np.where(above, mid, hi)
            lo = np.where(above, lo, mid)
        out[low_part] = 0.5 * (lo + hi)
    # amplitude in (90, 180): bisect on x = ln(180 - amplitude)
    if (~low_part).any():
        target = flat[~low_part]
        lo = np.full_like(target, math.log(1e-12))  # ln(180 - a) small: amplitude close to 180
        hi = np.full_like(target, math.log(90.0))
        for _ in range(80):
            mid = 0.5 * (lo + hi)
            above = _period_ratio_minus_one(180.0 - np.exp(mid)) > target
            # error too large -> amplitude too close to 180 -> increase x
            lo = np.where(above, mid, lo)
            hi = np.where(above, hi, mid)
        out[~low_part] = 180.0 - np.exp(0.5 * (lo + hi))
    out[flat == 0.0] = 0.0
    return scalar_or_array(out.reshape(np.shape(e)))


def pendulum_frequency(length, amplitude_deg=0.0, g=STANDARD_GRAVITY):
    """Natural frequency of a simple pendulum at a given swing.

    .. math::

        f = 1 / T = \\frac{1}{4\\sqrt{L/g}\\,K(\\sin^2(\\theta_0/2))}

    Parameters
    ----------
    length : float or array_like
        Pendulum length L [m].
    amplitude_deg : float or array_like, optional
        Swing amplitude, in [0, 180) [deg].
    g : float or array_like, optional
        Acceleration of gravity [m/s^2].

    Returns
    -------
    frequency : float or numpy.ndarray
        Frequency of free oscillation at that swing [Hz].

    Raises
    ------
    ValueError
        As :func:`exact_period`.

    Notes
    -----
    The reciprocal of :func:`exact_period`.

    Examples
    --------
    >>> round(pendulum_frequency(10.0), 6)
    0.157609

    References
    ----------
    1. Abramowitz & Stegun (1964), §17.2.
    """
    return scalar_or_array(1.0 / np.asarray(exact_period(length, amplitude_deg, g)))


def equivalent_length(frequency, amplitude_deg=0.0, g=STANDARD_GRAVITY):
    """Hanger length that tunes a pendulum to a frequency at a swing.

    .. math::

        L = \\frac{g}{(2\\pi f)^2} \\left(\\frac{T_0}{T}\\right)^2
          = \\frac{g}{(2\\pi f)^2\\,(1 + e(\\theta_0))^2}

    Parameters
    ----------
    frequency : float or array_like
        Target frequency, e.g. the damper's tuned frequency [Hz].
    amplitude_deg : float or array_like, optional
        Design swing amplitude at which the pendulum must be in tune, in [0, 180) [deg].
    g : float or array_like, optional
        Acceleration of gravity [m/s^2].

    Returns
    -------
    length : float or numpy.ndarray
        Simple-pendulum length whose exact period at ``amplitude_deg`` is 1/frequency [m].

    Raises
    ------
    ValueError
        If ``frequency`` or ``g`` is not positive and finite, or ``amplitude_deg`` is outside
        [0, 180).

    Notes
    -----
    A pendulum cut to the small-angle length ``g/(2 pi f)^2`` runs slow (below ``frequency``) at
    any finite swing; this length is shorter by the factor (1 + e)^-2 so that it is in tune at the
    design swing (and runs fast at smaller swings).

    Examples
    --------
    Hanger for a 0.15 Hz mode, in tune at small swings and at a 10 deg swing:

    >>> round(equivalent_length(0.15), 4)
    11.0402
    >>> round(equivalent_length(0.15, 10.0), 4)
    10.9982

    References
    ----------
    1. Abramowitz & Stegun (1964), §17.2.
    """
    f = check_range("frequency", frequency, 0.0, low_open=True, unit="Hz")
    a = _amplitude(amplitude_deg)
    gg = _gravity(g)
    ratio = 1.0 + _period_ratio_minus_one(a)
    with np.errstate(over="ignore", under="ignore", divide="ignore"):
        length = gg / (2.0 * np.pi * f * ratio) ** 2
    if not np.all(np.isfinite(length)):
        f, length = broadcast(frequency=f, length=length)
        i = int(np.flatnonzero(~np.isfinite(length).ravel())[0])
        raise ValueError(f"frequency={f.ravel()[i].item()!r} [Hz] is too small for a pendulum: "
                         "its length g/(2 pi f)^2 is beyond the largest number")
    return scalar_or_array(length)


def compound_pendulum_length(inertia_about_pivot, mass, pivot_to_centre):
    """Equivalent simple length of a compound (physical) pendulum.

    .. math::

        L_{eq} = \\frac{I_O}{m\\,d}

    Parameters
    ----------
    inertia_about_pivot : float or array_like
        Mass moment of inertia about the pivot axis I_O [kg m^2].
    mass : float or array_like
        Total swinging mass m [kg].
    pivot_to_centre : float or array_like
        Distance from the pivot to the centre of mass d [m].

    Returns
    -------
    length : float or numpy.ndarray
        Length of the simple pendulum with the same period [m].

    Raises
    ------
    ValueError
        If any argument is not positive and finite, or if I_O < m d^2 (physically impossible: the
        parallel-axis theorem gives I_O = I_G + m d^2 with I_G >= 0).

    Notes
    -----
    Rigid body swinging about a fixed horizontal axis. Use the result in :func:`exact_period`
    for large swings too: the equation of motion has the same form as the simple pendulum's.

    Examples
    --------
    A uniform 4 m rod of 100 kg hung from one end, I_O = m l^2 / 3:

    >>> round(compound_pendulum_length(100 * 4.0**2 / 3, 100.0, 2.0), 6)
    2.666667

    References
    ----------
    1. Rigid-body dynamics, e.g. J. L. Meriam, L. G. Kraige, Engineering Mechanics: Dynamics,
       ch. 6 (compound pendulum) — textbook result, from memory.
    """
    inertia = check_range("inertia_about_pivot", inertia_about_pivot, 0.0, low_open=True,
                          unit="kg m^2")
    m = check_range("mass", mass, 0.0, low_open=True, unit="kg")
    d = check_range("pivot_to_centre", pivot_to_centre, 0.0, low_open=True, unit="m")
    inertia, m, d = broadcast(inertia_about_pivot=inertia, mass=m, pivot_to_centre=d)
    bad = inertia < m * d * d * (1.0 - 1e-12)
    if bad.any():
        i = np.flatnonzero(bad.ravel())[0]
        raise ValueError(
            f"inertia_about_pivot={inertia.ravel()[i].item()!r} must be in "
            f"[mass*pivot_to_centre^2, inf) = [{(m * d * d).ravel()[i].item():g}, inf) [kg m^2]"
        )
    return scalar_or_array(inertia / (m * d))


def folded_pendulum_length(stage_lengths):
    """Equivalent length of a multi-stage (folded) pendulum.

    .. math::

        L_{eq} = \\sum_{i=1}^{n} L_i

    Parameters
    ----------
    stage_lengths : array_like
        Hanger length of each stage, along the last axis [m].

    Returns
    -------
    length : float or numpy.ndarray
        Length of the simple pendulum with the same small-swing period [m].

    Raises
    ------
    ValueError
        If any stage length is not positive and finite.

    Notes
    -----
    Stages hang one inside the other (frame from the floor above, mass from the frame, ...) and
    every stage carries the full weight; the frames' own mass is neglected. Each stage adds its
    own horizontal drift at the same restoring force per drift ``W / L_i``, so the stages act like
    springs in series and the lengths add. This fits a long pendulum in a short storey.

    Examples
    --------
    Three 4 m stages act as one 12 m pendulum:

    >>> folded_pendulum_length([4.0, 4.0, 4.0])
    12.0

    References
    ----------
    1. Statics of a pendulum in small swings (restoring force W x / L per stage) — textbook
       result, common practice, no source.
    """
    stages = check_range("stage_lengths", stage_lengths, 0.0, low_open=True, unit="m")
    if stages.ndim == 0:
        stages = stages[None]
    if stages.shape[-1] == 0:
        raise ValueError("stage_lengths=[] must hold at least one stage length [m]")
    return scalar_or_array(stages.sum(axis=-1))


def pendulum_motion(time, length, amplitude_deg, g=STANDARD_GRAVITY):
    """Exact swing angle of a pendulum released from rest.

    .. math::

        \\theta(t) = 2 \\arcsin\\big(k\\, \\mathrm{cd}(\\omega_0 t \\mid m)\\big),
        \\quad k = \\sin(\\theta_0/2),\\; m = k^2,\\; \\omega_0 = \\sqrt{g/L}

    Parameters
    ----------
    time : float or array_like
        Time since release, any sign [s].
    length : float or array_like
        Pendulum length L [m].
    amplitude_deg : float or array_like
        Release angle theta0, in [0, 180) [deg].
    g : float or array_like, optional
        Acceleration of gravity [m/s^2].

    Returns
    -------
    angle : float or numpy.ndarray
        Angle from the vertical at ``time`` [deg].

    Raises
    ------
    ValueError
        If ``time`` is not finite, ``length`` or ``g`` not positive, or ``amplitude_deg`` outside
        [0, 180).

    Notes
    -----
    cd = cn/dn is the Jacobi elliptic function (``scipy.special.ellipj``). The argument is
    reduced modulo the period 4K before evaluation so long times keep their accuracy. Above
    about 179 deg the Jacobi functions lose accuracy near m = 1 (scipy's ellipj); the angle is then
    good to about 1e-6 deg.

    Examples
    --------
    Released at 30 deg, a quarter period later the pendulum passes the vertical:

    >>> T = exact_period(5.0, 30.0)
    >>> round(pendulum_motion(T / 4, 5.0, 30.0), 9) + 0.0
    0.0
    >>> round(pendulum_motion(T / 2, 5.0, 30.0), 9)
    -30.0

    References
    ----------
    1. Abramowitz & Stegun (1964), ch. 16 (Jacobian elliptic functions); DLMF §22.19.2
       (the pendulum).
    """
    t = as_array("time", time)
    L = _length(length)
    a = _amplitude(amplitude_deg)
    gg = _gravity(g)
    m, p = _parameters(a)
    quarter = ellipkm1(p)
    u = np.sqrt(gg / L) * t
    u = np.mod(u, 4.0 * quarter)
    sn, cn, dn, _ = ellipj(u, m)
    k = np.sqrt(m)
    arg = np.clip(k * cn / dn, -1.0, 1.0)
    return scalar_or_array(np.degrees(2.0 * np.arcsin(arg)))


def swing_angle(stroke, length):
    """Swing angle of a pendulum from its horizontal stroke.

    .. math::

        \\theta = \\arcsin(x / L)

    Parameters
    ----------
    stroke : float or array_like
        Horizontal displacement of the mass from its rest position, x >= 0 [m].
    length : float or array_like
        Pendulum length L [m].

    Returns
    -------
    angle : float or numpy.ndarray
        Swing angle from the vertical [deg].

    Raises
    ------
    ValueError
        If ``stroke`` is negative or not finite, ``length`` not positive, or stroke > length
        (the pendulum cannot reach it).

    Notes
    -----
    Exact geometry of a rigid hanger; the small-angle form x/L overstates nothing but hides the
    limit x <= L.

    Examples
    --------
    >>> round(swing_angle(1.0, 10.0), 6)
    5.73917

    References
    ----------
    1. Plane trigonometry.
    """
    x = check_range("stroke", stroke, 0.0, unit="m")
    L = _length(length)
    x, L = broadcast(stroke=x, length=L)
    bad = x > L
    if bad.any():
        i = np.flatnonzero(bad.ravel())[0]
        raise ValueError(f"stroke={x.ravel()[i].item()!r} must be in [0, length] = "
                         f"[0, {L.ravel()[i].item():g}] [m]")
    return scalar_or_array(np.degrees(np.arcsin(x / L)))


def amplitude_detuning(amplitude_deg):
    """Frequency shift of a pendulum at a swing, against small swings.

    .. math::

        \\frac{f(\\theta_0)}{f(0)} - 1 = \\frac{1}{1 + e(\\theta_0)} - 1 = -\\frac{e}{1 + e}

    Parameters
    ----------
    amplitude_deg : float or array_like
        Swing amplitude, in [0, 180) [deg].

    Returns
    -------
    detuning : float or numpy.ndarray
        Relative change of the pendulum's frequency, zero or negative [-].

    Raises
    ------
    ValueError
        If ``amplitude_deg`` is outside [0, 180).

    Notes
    -----
    A damper tuned at small swings runs this much below its target at the design swing; one
    tuned at the design swing runs ``e`` above it at small swings.

    Examples
    --------
    >>> print(f"{amplitude_detuning(15.0):.4%}")
    -0.4282%

    References
    ----------
    1. Abramowitz & Stegun (1964), §17.2.
    """
    a = _amplitude(amplitude_deg)
    e = _period_ratio_minus_one(a)
    return scalar_or_array(-e / (1.0 + e))


def pendulum_length(frequency, stroke, g=STANDARD_GRAVITY):
    """Pendulum length in tune at the swing its own stroke causes.

    .. math::

        L = L_{eq}\\big(f_d, \\theta(L)\\big), \\qquad \\theta(L) = \\arcsin(x_d / L)

    Parameters
    ----------
    frequency : float or array_like
        Damper frequency f_d the pendulum must have at its design swing, > 0 [Hz].
    stroke : float or array_like
        Peak horizontal stroke x_d of the mass, >= 0 [m].
    g : float or array_like, optional
        Acceleration of gravity, > 0 [m/s^2].

    Returns
    -------
    length : float or numpy.ndarray
        Largest L satisfying the equation (the design with the smallest swing) [m].

    Raises
    ------
    ValueError
        If an argument is outside its range, the arrays do not broadcast, or the stroke is too
        large for any pendulum of that frequency (stroke >= length at every candidate).

    Notes
    -----
    Solved by the fixed-point iteration L <- equivalent_length(f_d, swing_angle(x_d, L)) from the
    small-angle length L_0 = g/(2 pi f_d)^2. The map increases with L and L_0 lies above every
    solution, so the iterates fall monotonically to the largest solution; near small swings the
    map's slope is about (x_d/L)^2/4, so a few iterations reach machine precision. If an iterate
    reaches L <= x_d, no fixed point exists (computed: beyond a stroke of about 0.77 L_0, a
    swing near 67 deg) and the stroke cannot be reached at that frequency. The result
    satisfies the equation to a relative residual <= 1e-15.

    Examples
    --------
    >>> L = pendulum_length(0.15, 1.0)
    >>> round(L, 6), round(equivalent_length(0.15, 0.0), 6)
    (11.028864, 11.040238)
    >>> abs(L - equivalent_length(0.15, swing_angle(1.0, L))) <= 1e-15 * L
    True

    References
    ----------
    1. Abramowitz & Stegun, Handbook of Mathematical Functions (NBS AMS-55, 1964), §17.2.
    """
    f = check_range("frequency", frequency, 0.0, low_open=True, unit="Hz")
    x = check_range("stroke", stroke, 0.0, unit="m")
    gg = check_range("g", g, 0.0, low_open=True, unit="m/s^2")
    f, x, gg = broadcast(frequency=f, stroke=x, g=gg)
    length = np.asarray(equivalent_length(f, 0.0, gg), dtype=float)
    l0 = length.copy()
    for _ in range(10000):
        if np.any(x >= length):
            i = int(np.flatnonzero((x >= length).ravel())[0])
            raise ValueError(
                f"stroke={x.ravel()[i].item()!r} m is too large for a pendulum at "
                f"frequency={f.ravel()[i].item()!r} Hz (small-angle length "
                f"{l0.ravel()[i].item():.6g} m): stroke >= length, no hanger length keeps it "
                f"in tune at that swing")
        new = np.asarray(equivalent_length(f, np.degrees(np.arcsin(x / length)), gg))
        done = np.abs(new - length) <= 1e-15 * length
        length = new
        if done.all():
            break
    else:
        raise ValueError("stroke too close to the largest a pendulum at this frequency can "
                         "reach: the length does not converge")
    return scalar_or_array(length)
