# SPDX-License-Identifier: MIT
"""Two wind levels and the occupied floor: the extreme response, the buffers, comfort.

The design chain (:mod:`functions.chain`) sizes the damper at ONE level, the service (comfort)
wind. This module carries that damper to a second, rarer level, the extreme wind (for example
the design wind of the ultimate limit state), and to the occupied floor, whose comfort is
what the service level is judged by.

Assumptions, used everywhere in this module:

* the structure and the damper are linear: the damper's effective damping zeta_eff and its
  stroke ratio (stroke over structure displacement, both at the damper's level) found for the
  service level hold at the extreme level, and every response scales with the input. What the
  pendulum's large swing changes (its frequency falls with the swing) is computed, not
  applied: :func:`extreme_swing` gives the detuning, the user judges it;
* the acceleration with the damper follows the design chain's resonant rule,
  ``a_d = a sqrt(zeta_s / zeta_eff)`` (response ~ 1/sqrt(zeta), EN 1991-1-4:2005 Annex B,
  B.2(6)), at every floor of the one mode;
* one mode: the response at a floor is the mode's ordinate there times the generalised
  coordinate, so the occupied floor and the damper's level differ by the ratio of their
  ordinates, the ``floor_ordinate`` phi = Phi(z_occupied) / Phi(z_damper) (1 when the
  damper sits at the occupied floor's level; :func:`power_law_floor_ordinate` estimates it);
* displacement and acceleration are related as in harmonic motion at the structure's
  frequency, ``x = a / (2 pi f_s)^2``, as in the design chain; the buffer and force formulas
  take the stroke as harmonic at one frequency too (kinematics: a random response needs its
  own statement, e.g. the peak of the velocity from its own spectrum).

Contents: the extreme response from an extreme acceleration without the damper at the
occupied floor (:func:`extreme_response`), or from an extreme displacement without the damper
at the damper's level (:func:`extreme_acceleration_from_displacement` converts it); the swing
and the pendulum's detuning at the extreme stroke (:func:`extreme_swing`); the buffers: stroke
beyond the clearance, contact velocity and energy (:func:`buffer_excess`,
:func:`contact_velocity`, :func:`buffer_energy`); the peak force of the damper on the structure
(:func:`peak_damper_force`); the Melbourne & Palmer comfort criterion
(:func:`melbourne_palmer_limit`); the floor ordinate of a power-law mode shape
(:func:`power_law_floor_ordinate`). :data:`LEVEL_FORMS` holds the closed forms a workbook shows,
each a numpy twin with its native worksheet formula (:func:`functions.worksheet.twin`) over the
design chain's defined names. Imports run one way: levels -> pendulum, worksheet.
"""
from __future__ import annotations

from typing import Any, Callable, NamedTuple

import numpy as np

from functions._validation import (broadcast, check_range, non_negative, positive,
                                   scalar_or_array)
from functions.pendulum import small_angle_error, swing_angle
from functions.worksheet import twin

__all__ = [
    "MELBOURNE_PALMER_FREQUENCIES", "RETURN_PERIODS", "LEVEL_FORMS", "ExtremeResponse",
    "extreme_response", "extreme_acceleration_from_displacement", "ExtremeSwing",
    "extreme_swing", "buffer_excess", "contact_velocity", "buffer_energy", "peak_damper_force",
    "melbourne_palmer_limit", "power_law_floor_ordinate",
]

#: Frequencies for which Melbourne & Palmer (1992) give their criterion, open ends [Hz].
MELBOURNE_PALMER_FREQUENCIES = (0.06, 1.0)

#: Accepted return periods of the comfort criterion [years]: the formula's factor
#: 0.68 + ln(R)/5 falls to zero at R = 0.033 years; 0.1 to 100 years covers practice.
RETURN_PERIODS = (0.1, 100.0)

_TWO_PI = 2.0 * np.pi


# --------------------------------------------------------------------------------------------
# arguments and kernels (the public functions and the worksheet twins share the kernels)
# --------------------------------------------------------------------------------------------
def _ratio(name: str, value) -> np.ndarray:
    return check_range(name, value, 0.0, 1.0, low_open=True, high_open=True, unit="-")


def _with_damper(a, zs, zeta):
    return a * np.sqrt(zs / zeta)


def _displacement(a_d, fs, phi):
    return a_d / (phi * (_TWO_PI * fs) ** 2)


def _contact(stroke, clearance, f):
    return _TWO_PI * f * np.sqrt(np.maximum(0.0, (stroke - clearance) * (stroke + clearance)))


def _force(stroke, k, c, f):
    return stroke * np.sqrt(k * k + (c * _TWO_PI * f) ** 2)


def _melbourne_palmer(n, r, t):
    return (np.sqrt(2.0 * np.log(n * t)) * (0.68 + np.log(r) / 5.0)
            * np.exp(-3.65 - 0.41 * np.log(n)))


# --------------------------------------------------------------------------------------------
# the extreme level
# --------------------------------------------------------------------------------------------
class ExtremeResponse(NamedTuple):
    """The response with the damper at the extreme level (SI units)."""

    acceleration_with_damper: float | np.ndarray  #: peak at the occupied floor [m/s^2]
    displacement: float | np.ndarray              #: structure, at the damper's level [m]
    stroke: float | np.ndarray                    #: damper relative to the structure [m]


def extreme_response(extreme_acceleration, structural_damping, effective_damping,
                     stroke_ratio, frequency, floor_ordinate=1.0):
    """Response with the damper at the extreme wind level.

    .. math::

        a_{x,d} = a_x \\sqrt{\\frac{\\zeta_s}{\\zeta_{eff}}},\\qquad
        x_{s} = \\frac{a_{x,d}}{\\phi\\,(2\\pi f_s)^2},\\qquad
        x_{d} = \\frac{\\sigma_{x_d - x_s}}{\\sigma_{x_s}}\\,x_{s}

    Parameters
    ----------
    extreme_acceleration : float or array_like
        Peak acceleration WITHOUT the damper at the occupied floor at the extreme level, > 0
        [m/s^2].
    structural_damping : float or array_like
        zeta_s of the structure's mode without the damper, in (0, 1) [-].
    effective_damping : float or array_like
        zeta_eff of the structure with its damper (the design chain's), in (0, 1) [-].
    stroke_ratio : float or array_like
        Damper stroke over structure displacement at the damper's level (the design chain's
        sigma ratio), > 0 [-].
    frequency : float or array_like
        Natural frequency f_s of the structure's mode, > 0 [Hz].
    floor_ordinate : float or array_like, optional
        phi = mode ordinate at the occupied floor over that at the damper's level, > 0; 1
        (default) when the two coincide [-].

    Returns
    -------
    acceleration_with_damper : float or numpy.ndarray
        Peak acceleration with the damper at the occupied floor [m/s^2].
    displacement : float or numpy.ndarray
        Peak displacement of the structure at the damper's level with the damper [m].
    stroke : float or numpy.ndarray
        Peak stroke of the damper relative to the structure [m].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    Linear system (module docstring): the effective damping and the stroke ratio of the
    service level hold at the extreme level and the response scales with the input. The
    resonant rule reduces the resonant part of the response only; where the background part
    is large the result is optimistic. The displacement is that of harmonic motion at f_s,
    carried from the occupied floor to the damper's level by phi; stroke and displacement
    are taken with equal peak factors, as in the design chain. Returned as
    :class:`ExtremeResponse`. With the service acceleration and phi = 1 this repeats the
    design chain's ``acceleration_with_damper``, ``structure_displacement`` and ``stroke``.

    Examples
    --------
    >>> r = extreme_response(0.6, 0.015, 0.0416667, 5.6176, 0.15)
    >>> round(r.acceleration_with_damper, 4), round(r.displacement, 4), round(r.stroke, 4)
    (0.36, 0.4053, 2.2767)
    >>> round(extreme_response(0.6, 0.015, 0.0416667, 5.6176, 0.15, 0.9).stroke, 4)
    2.5297

    References
    ----------
    1. EN 1991-1-4:2005, Eurocode 1: Actions on structures - Wind actions, Annex B, B.2(6).
    2. D. E. Newland, An Introduction to Random Vibrations, Spectral & Wavelet Analysis, 3rd ed.,
       Longman, 1993, Appendix 1.
    """
    a = positive("extreme_acceleration", extreme_acceleration, "m/s^2")
    zs = _ratio("structural_damping", structural_damping)
    zeta = _ratio("effective_damping", effective_damping)
    ratio = positive("stroke_ratio", stroke_ratio, "-")
    fs = positive("frequency", frequency, "Hz")
    phi = positive("floor_ordinate", floor_ordinate, "-")
    a, zs, zeta, ratio, fs, phi = broadcast(
        extreme_acceleration=a, structural_damping=zs, effective_damping=zeta,
        stroke_ratio=ratio, frequency=fs, floor_ordinate=phi)
    a_d = _with_damper(a, zs, zeta)
    x = _displacement(a_d, fs, phi)
    return ExtremeResponse(scalar_or_array(a_d), scalar_or_array(x),
                           scalar_or_array(ratio * x))


def extreme_acceleration_from_displacement(displacement_without_damper, frequency,
                                           floor_ordinate=1.0):
    """Occupied-floor acceleration from a displacement at the damper.

    .. math::

        a_x = \\phi\\,(2\\pi f_s)^2\\,x_0

    Parameters
    ----------
    displacement_without_damper : float or array_like
        Peak displacement x_0 of the structure WITHOUT the damper at the damper's level (e.g.
        the extreme level's, from a wind-tunnel test or a code), > 0 [m].
    frequency : float or array_like
        Natural frequency f_s of the structure's mode, > 0 [Hz].
    floor_ordinate : float or array_like, optional
        phi = mode ordinate at the occupied floor over that at the damper's level, > 0 [-].

    Returns
    -------
    acceleration : float or numpy.ndarray
        Peak acceleration without the damper at the occupied floor, the input
        ``extreme_acceleration`` of :func:`extreme_response` [m/s^2].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    Harmonic motion at f_s in one mode (module docstring): the inverse of the displacement
    of :func:`extreme_response`, so a displacement given without the damper passes through
    the same chain. Only the resonant part of a given displacement behaves so; a large static
    (mean) or background part should be removed first.

    Examples
    --------
    >>> round(extreme_acceleration_from_displacement(0.5, 0.15), 5)
    0.44413
    >>> round(extreme_acceleration_from_displacement(0.5, 0.15, 0.9), 5)
    0.39972

    References
    ----------
    1. A. K. Chopra, Dynamics of Structures, 4th ed., Prentice Hall, 2012, ch. 3 (harmonic
       motion) and ch. 12 (modal coordinates).
    """
    x = positive("displacement_without_damper", displacement_without_damper, "m")
    fs = positive("frequency", frequency, "Hz")
    phi = positive("floor_ordinate", floor_ordinate, "-")
    x, fs, phi = broadcast(displacement_without_damper=x, frequency=fs, floor_ordinate=phi)
    return scalar_or_array(phi * (_TWO_PI * fs) ** 2 * x)


class ExtremeSwing(NamedTuple):
    """The pendulum at the extreme stroke."""

    swing_deg: float | np.ndarray   #: swing angle from the vertical [deg]
    detuning: float | np.ndarray    #: relative change of the pendulum's frequency [-]


def extreme_swing(extreme_stroke, pendulum_length, design_swing_deg=0.0):
    """Swing and detuning of the pendulum at the extreme stroke.

    .. math::

        \\theta_x = \\arcsin\\frac{x_d}{L},\\qquad
        \\frac{f(\\theta_x)}{f(\\theta_0)} - 1 = \\frac{1 + e(\\theta_0)}{1 + e(\\theta_x)} - 1,
        \\qquad e(\\theta) = \\frac{T(\\theta)}{T_0} - 1

    Parameters
    ----------
    extreme_stroke : float or array_like
        Peak stroke x_d of the damper at the extreme level, in [0, pendulum_length] [m].
    pendulum_length : float or array_like
        Pendulum length L, > 0 [m].
    design_swing_deg : float or array_like, optional
        Swing theta_0 at which the pendulum is in tune (the design chain's swing angle), in
        [0, 180); 0 (default) compares with small swings [deg].

    Returns
    -------
    swing_deg : float or numpy.ndarray
        Swing angle at the extreme stroke [deg].
    detuning : float or numpy.ndarray
        Relative change of the pendulum's frequency at that swing against its frequency at the
        design swing, negative when the extreme swing is the larger [-].

    Raises
    ------
    ValueError
        If extreme_stroke > pendulum_length (the pendulum cannot reach it), an argument is
        outside its range, or the arrays do not broadcast.

    Notes
    -----
    The exact period of the simple pendulum (:func:`functions.pendulum.small_angle_error`,
    A&S §17.2) on a rigid hanger; springs in parallel with gravity would lessen the detuning
    and are not modelled. The damper, tuned at the design swing, runs this much off at the
    extreme swing: its effective damping there is lower than the linear chain assumes
    (:func:`extreme_response`); judge it with, e.g.,
    :func:`functions.envelope.detuned_effective_damping` at r = 1 / (1 + detuning) as a rough
    guide. Returned as :class:`ExtremeSwing`.

    Examples
    --------
    >>> s = extreme_swing(2.2767, 11.288376, 4.820624)
    >>> round(s.swing_deg, 4), round(s.detuning, 6)
    (11.6355, -0.002136)

    References
    ----------
    1. Abramowitz & Stegun, Handbook of Mathematical Functions (NBS AMS-55, 1964), §17.2.
    """
    x = non_negative("extreme_stroke", extreme_stroke, "m")
    length = positive("pendulum_length", pendulum_length, "m")
    design = check_range("design_swing_deg", design_swing_deg, 0.0, 180.0, high_open=True,
                         unit="deg")
    x, length, design = broadcast(extreme_stroke=x, pendulum_length=length,
                                  design_swing_deg=design)
    beyond = x > length
    if beyond.any():
        i = int(np.flatnonzero(beyond.ravel())[0])
        raise ValueError(f"extreme_stroke={x.ravel()[i].item()!r} must be in [0, "
                         f"pendulum_length] = [0, {length.ravel()[i].item():g}] [m] (the "
                         "pendulum cannot reach it)")
    theta = np.asarray(swing_angle(x, length))
    e_x = np.asarray(small_angle_error(theta))
    e_0 = np.asarray(small_angle_error(design))
    return ExtremeSwing(scalar_or_array(theta), scalar_or_array((e_0 - e_x) / (1.0 + e_x)))


# --------------------------------------------------------------------------------------------
# buffers and forces
# --------------------------------------------------------------------------------------------
def buffer_excess(stroke, clearance):
    """Stroke beyond the clearance to the buffers.

    .. math::

        \\Delta = \\max(0,\\ A - c)

    Parameters
    ----------
    stroke : float or array_like
        Peak stroke A of the damper relative to the structure, >= 0 [m].
    clearance : float or array_like
        Free travel c from rest to the buffers, >= 0 [m].

    Returns
    -------
    excess : float or numpy.ndarray
        How far the stroke would pass the buffers: the buffers' travel needed; 0 when the
        stroke stays within the clearance [m].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    Geometry of the free stroke; the buffers, once touched, shorten the stroke they meet (not
    modelled here).

    Examples
    --------
    >>> round(buffer_excess(2.3, 1.2), 6), buffer_excess(0.9, 1.2)
    (1.1, 0.0)

    References
    ----------
    1. Plane geometry (no published source needed).
    """
    a = non_negative("stroke", stroke, "m")
    c = non_negative("clearance", clearance, "m")
    a, c = broadcast(stroke=a, clearance=c)
    return scalar_or_array(np.maximum(0.0, a - c))


def contact_velocity(stroke, clearance, frequency):
    """Velocity of the damper reaching the buffers in harmonic motion.

    .. math::

        v_c = 2\\pi f \\sqrt{A^2 - c^2}\\quad (A > c),\\qquad v_c = 0\\quad (A \\le c)

    Parameters
    ----------
    stroke : float or array_like
        Amplitude A of the damper's motion relative to the structure, >= 0 [m].
    clearance : float or array_like
        Free travel c from rest to the buffers, >= 0 [m].
    frequency : float or array_like
        Frequency f of the motion, > 0 [Hz].

    Returns
    -------
    velocity : float or numpy.ndarray
        Relative velocity where x = A sin(2 pi f t) reaches x = c [m/s].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    Kinematics of harmonic motion, x = A sin(omega t), v = omega sqrt(A^2 - x^2): the damper
    reaches the buffer with this velocity if it would otherwise swing to A. A random
    response needs its own statement (the velocity at the gap of the largest excursions, e.g.
    from the velocity's own peak statistics); this is the harmonic estimate. For a response at
    the structure's frequency pass f_s (the design chain's frequency of the stroke; for a
    tuning ratio below 1 the larger of f_s and f_d, hence the conservative one). Computed as
    sqrt((A - c)(A + c)), exact near A = c.

    Examples
    --------
    >>> round(contact_velocity(2.3, 1.2, 0.15), 5)
    1.84927
    >>> contact_velocity(0.9, 1.2, 0.15)
    0.0

    References
    ----------
    1. A. K. Chopra, Dynamics of Structures, 4th ed., Prentice Hall, 2012, ch. 3 (harmonic
       motion).
    """
    a = non_negative("stroke", stroke, "m")
    c = non_negative("clearance", clearance, "m")
    f = positive("frequency", frequency, "Hz")
    a, c, f = broadcast(stroke=a, clearance=c, frequency=f)
    return scalar_or_array(_contact(a, c, f))


def buffer_energy(damper_mass, stroke, clearance, frequency):
    """Kinetic energy the buffers must absorb at contact.

    .. math::

        E = \\tfrac12\\,m_d\\,v_c^2 = \\tfrac12\\,m_d\\,(2\\pi f)^2\\,(A^2 - c^2)\\quad (A > c)

    Parameters
    ----------
    damper_mass : float or array_like
        Moving mass m_d of the damper, > 0 [kg].
    stroke : float or array_like
        Amplitude A of the damper's motion relative to the structure, >= 0 [m].
    clearance : float or array_like
        Free travel c from rest to the buffers, >= 0 [m].
    frequency : float or array_like
        Frequency f of the motion, > 0 [Hz].

    Returns
    -------
    energy : float or numpy.ndarray
        Kinetic energy of the damper relative to the structure at contact; 0 when A <= c [J].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    The contact velocity of :func:`contact_velocity` (harmonic motion; a random response needs
    its own statement). The energy is relative to the structure, whose own motion the buffers
    do not absorb; the energy stored in the pendulum's rise and in the dashpot's work during
    the buffer's travel is not counted.

    Examples
    --------
    >>> round(buffer_energy(287e3, 2.3, 1.2, 0.15))
    490744

    References
    ----------
    1. A. K. Chopra, Dynamics of Structures, 4th ed., Prentice Hall, 2012, ch. 3.
    """
    m = positive("damper_mass", damper_mass, "kg")
    v = np.asarray(contact_velocity(stroke, clearance, frequency))
    m, v = broadcast(damper_mass=m, contact_velocity=v)
    return scalar_or_array(0.5 * m * v * v)


def peak_damper_force(stroke, stiffness, dashpot, frequency):
    """Peak force of the damper on the structure in harmonic motion.

    .. math::

        F = \\max_t |k\\,x(t) + c\\,\\dot x(t)| = A\\sqrt{k^2 + (2\\pi f c)^2},
        \\qquad x = A \\sin(2\\pi f t)

    Parameters
    ----------
    stroke : float or array_like
        Amplitude A of the damper's motion relative to the structure, >= 0 [m].
    stiffness : float or array_like
        Restoring stiffness k of the damper (for a pendulum m_d g / L, the design chain's
        m_d (2 pi f_d)^2), > 0 [N/m].
    dashpot : float or array_like
        Linear dashpot constant c, >= 0 [N s/m].
    frequency : float or array_like
        Frequency f of the motion, > 0 [Hz].

    Returns
    -------
    force : float or numpy.ndarray
        Peak horizontal force between the damper and the structure [N].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    Assumptions: a linear spring and a linear dashpot between the damper and the structure;
    harmonic relative motion at one frequency, so the spring force (in phase with x) and the
    dashpot force (with the velocity) are 90 deg apart and the peak of their sum is the root
    of the sum of squares; for a pendulum the gravity restoring force taken as linear
    (m_d g x / L: at large swings the hanger's horizontal pull differs). Buffer forces, once
    touched, come on top. For the response at the structure's frequency pass f_s.

    Examples
    --------
    >>> round(peak_damper_force(2.2767, 249092.2, 31856.5, 0.15))
    571213

    References
    ----------
    1. A. K. Chopra, Dynamics of Structures, 4th ed., Prentice Hall, 2012, ch. 3 (forces of a
       harmonically vibrating spring and damper).
    """
    a = non_negative("stroke", stroke, "m")
    k = positive("stiffness", stiffness, "N/m")
    c = non_negative("dashpot", dashpot, "N s/m")
    f = positive("frequency", frequency, "Hz")
    a, k, c, f = broadcast(stroke=a, stiffness=k, dashpot=c, frequency=f)
    return scalar_or_array(_force(a, k, c, f))


# --------------------------------------------------------------------------------------------
# comfort and the occupied floor
# --------------------------------------------------------------------------------------------
def melbourne_palmer_limit(frequency, return_period, duration=600.0):
    """Melbourne & Palmer peak-acceleration comfort criterion.

    .. math::

        \\hat a = \\sqrt{2 \\ln(n T)}\\left(0.68 + \\frac{\\ln R}{5}\\right)
        \\exp(-3.65 - 0.41 \\ln n)

    Parameters
    ----------
    frequency : float or array_like
        Natural frequency n of the building's mode, 0.06 < n < 1 [Hz].
    return_period : float or array_like
        Return period R of the wind, in [0.1, 100] [years].
    duration : float or array_like, optional
        Duration T of the wind event, > 0 with n T > e (600 s, the paper's 10 minutes) [s].

    Returns
    -------
    acceleration_limit : float or numpy.ndarray
        Accepted peak horizontal acceleration at the occupied floor [m/s^2].

    Raises
    ------
    ValueError
        If frequency is outside (0.06, 1) Hz (where the criterion is given), return_period
        outside [0.1, 100] years, duration not positive or n T <= e, or the arrays do not
        broadcast.

    Notes
    -----
    A peak criterion: the standard-deviation curve exp(-3.65 - 0.41 ln n) [m/s^2] (the form
    of ISO 6897:1984, curve 1) times a peak factor sqrt(2 ln nT) and a factor for the return
    period, 0.68 + ln(R)/5, which is 1 at R = 5 years. Compare it with the peak acceleration
    at the occupied floor for wind of the same return period. For combined motion in two
    directions and torsion the paper discusses further factors (not applied here).

    Examples
    --------
    >>> round(melbourne_palmer_limit(0.2, 1.0), 5), round(melbourne_palmer_limit(0.2, 10.0), 5)
    (0.1058, 0.17745)

    References
    ----------
    1. W. H. Melbourne, T. R. Palmer, "Accelerations and comfort criteria for buildings
       undergoing complex motions", J. Wind Eng. Ind. Aerodyn. 41-44 (1992) 105-116.
    2. ISO 6897:1984, Guidelines for the evaluation of the response of occupants of fixed
       structures, especially buildings and off-shore structures, to low-frequency horizontal
       motion (0.063 to 1 Hz).
    """
    low, high = MELBOURNE_PALMER_FREQUENCIES
    n = check_range("frequency", frequency, low, high, low_open=True, high_open=True,
                    unit="Hz")
    r = check_range("return_period", return_period, *RETURN_PERIODS, unit="years")
    t = positive("duration", duration, "s")
    n, r, t = broadcast(frequency=n, return_period=r, duration=t)
    nt = n * t
    if np.any(nt <= np.e):
        bad = float(nt[nt <= np.e].flat[0])
        raise ValueError(f"frequency*duration={bad!r} must be in (e, inf) [-] for the peak "
                         "factor sqrt(2 ln nT)")
    return scalar_or_array(_melbourne_palmer(n, r, t))


def power_law_floor_ordinate(occupied_height, damper_height, exponent):
    """Mode ordinate of the occupied floor relative to the damper.

    .. math::

        \\phi = \\frac{\\Phi(z_{occ})}{\\Phi(z_d)} = \\left(\\frac{z_{occ}}{z_d}\\right)^{\\zeta},
        \\qquad \\Phi(z) = \\left(\\frac{z}{h}\\right)^{\\zeta}

    Parameters
    ----------
    occupied_height : float or array_like
        Height z_occ of the top occupied floor above ground, > 0 [m].
    damper_height : float or array_like
        Height z_d of the damper's level above ground, > 0 [m].
    exponent : float or array_like
        Exponent zeta of the power-law mode shape, > 0; see
        :data:`functions.structure.MODE_SHAPE_EXPONENTS` [-].

    Returns
    -------
    floor_ordinate : float or numpy.ndarray
        phi, the ``floor_ordinate`` of :func:`extreme_response`; below 1 when the occupied
        floor is below the damper [-].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    The building's height h cancels. A preliminary estimate for buildings cantilevered from
    the ground (:func:`functions.structure.power_law_mode_shape`); use the mode shape of the
    structural model when there is one.

    Examples
    --------
    >>> round(power_law_floor_ordinate(280.0, 300.0, 1.5), 5)
    0.90169

    References
    ----------
    1. EN 1991-1-4:2005, Eurocode 1: Actions on structures - Wind actions, Annex F, (F.3).
    """
    z = positive("occupied_height", occupied_height, "m")
    zd = positive("damper_height", damper_height, "m")
    k = positive("exponent", exponent, "-")
    z, zd, k = broadcast(occupied_height=z, damper_height=zd, exponent=k)
    return scalar_or_array((z / zd) ** k)


# --------------------------------------------------------------------------------------------
# the closed forms a workbook shows, beside their worksheet formulas
# --------------------------------------------------------------------------------------------
_EN_B26 = "Resonant rule, EN 1991-1-4:2005 Annex B, B.2(6), as the design chain"
_HARMONIC = "Harmonic motion at the structure's frequency (kinematics)"
_MP = ("Melbourne & Palmer, J. Wind Eng. Ind. Aerodyn. 41-44 (1992) 105-116, with "
       "T = 600 s")


def _form(formula: str, expression: str, source: str, compute: Callable[..., Any]):
    return twin(formula, compute, expression, source)


#: Result name -> numpy twin with its native worksheet formula, over the design chain's defined
#: names and the inputs ``extreme_acceleration``, ``floor_ordinate`` and ``return_period``.
#: The stroke's motion is taken at the structure's frequency, as the chain does.
LEVEL_FORMS: dict[str, Callable[..., Any]] = {
    "extreme_acceleration_with_damper": _form(
        "=extreme_acceleration*SQRT(structural_damping/effective_damping)",
        "a_x sqrt(zeta_s / zeta_eff)", _EN_B26,
        lambda extreme_acceleration, structural_damping, effective_damping:
        _with_damper(extreme_acceleration, structural_damping, effective_damping)),
    "extreme_displacement": _form(
        "=extreme_acceleration_with_damper/(floor_ordinate*(2*PI()*structure_frequency)^2)",
        "a_x,d / (phi (2 pi f_s)^2)", _HARMONIC + ", at the damper's level",
        lambda extreme_acceleration_with_damper, floor_ordinate, structure_frequency:
        _displacement(extreme_acceleration_with_damper, structure_frequency, floor_ordinate)),
    "extreme_stroke": _form(
        "=stroke_ratio*extreme_displacement", "(x_d / x_s) x_s",
        "Linear: the service level's stroke ratio, equal peak factors",
        lambda stroke_ratio, extreme_displacement: stroke_ratio * extreme_displacement),
    "extreme_swing_deg": _form(
        "=DEGREES(ASIN(extreme_stroke/pendulum_length))", "asin(x_d / L)",
        "Plane trigonometry",
        lambda extreme_stroke, pendulum_length:
        np.degrees(np.arcsin(extreme_stroke / pendulum_length))),
    "buffer_excess": _form(
        "=MAX(0,extreme_stroke-clearance)", "max(0, x_d - c)", "Geometry",
        lambda extreme_stroke, clearance: np.maximum(0.0, extreme_stroke - clearance)),
    "contact_velocity": _form(
        "=2*PI()*structure_frequency*SQRT(MAX(0,(extreme_stroke-clearance)"
        "*(extreme_stroke+clearance)))",
        "2 pi f_s sqrt(x_d^2 - c^2), 0 if x_d <= c",
        _HARMONIC + "; a random response needs its own statement",
        lambda structure_frequency, extreme_stroke, clearance:
        _contact(extreme_stroke, clearance, structure_frequency)),
    "buffer_energy": _form(
        "=damper_mass*contact_velocity^2/2", "m_d v_c^2 / 2", "Kinetic energy",
        lambda damper_mass, contact_velocity: 0.5 * damper_mass * contact_velocity ** 2),
    "extreme_damper_force": _form(
        "=extreme_stroke*SQRT(stiffness^2+(dashpot*2*PI()*structure_frequency)^2)",
        "x_d sqrt(k^2 + (c 2 pi f_s)^2)",
        _HARMONIC + ": linear spring and dashpot, 90 deg apart",
        lambda extreme_stroke, stiffness, dashpot, structure_frequency:
        _force(extreme_stroke, stiffness, dashpot, structure_frequency)),
    "comfort_limit_mp": _form(
        "=SQRT(2*LN(structure_frequency*600))*(0.68+LN(return_period)/5)"
        "*EXP(-3.65-0.41*LN(structure_frequency))",
        "sqrt(2 ln(n T)) (0.68 + ln(R)/5) exp(-3.65 - 0.41 ln n), T = 600 s", _MP,
        lambda structure_frequency, return_period:
        _melbourne_palmer(structure_frequency, return_period, 600.0)),
}
