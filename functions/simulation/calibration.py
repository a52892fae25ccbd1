# SPDX-License-Identifier: MIT
r"""Load and damper damping of a simulation that reproduces a design's wind input.

A design states the peak acceleration of the building WITHOUT the damper under the wind and the
damper's damping on its target frequency; a simulation (``simulate``) needs a force on the
building mode and the damping on the hanger's small-angle frequency:

* :func:`calibrated_load` gives the force whose bare-building peak acceleration is the given
  one: for a random force (corner frequency at the mode's frequency) its stationary RMS
  acceleration (frequency domain, as :mod:`functions.simulation.theory`) times Davenport's peak
  factor over :data:`PEAK_DURATION`; for a harmonic force at the mode's frequency its steady
  amplitude at resonance.
* :func:`hanger_damping` expresses the designed dashpot on the hanger's small-angle frequency.
"""
from __future__ import annotations

from typing import NamedTuple

import numpy as np

from functions._validation import broadcast, check_range, scalar_or_array
from functions.damper import frequency_response, peak_factor
from functions.pendulum import STANDARD_GRAVITY
from functions.simulation._inputs import _scalar
from functions.simulation.loads import LOAD_TYPES, HarmonicForce, RandomForce
from functions.simulation.model import _bare
from functions.simulation.theory import _bare_rms

__all__ = ["PEAK_DURATION", "CalibratedLoad", "calibrated_load", "hanger_damping"]

#: Averaging time of a wind input's peak acceleration, for Davenport's peak factor [s].
PEAK_DURATION = 600.0


class CalibratedLoad(NamedTuple):
    """Outcome of :func:`calibrated_load` (unpacks as ``load, force, peak_factor``).

    Attributes
    ----------
    load : HarmonicForce or RandomForce
        The load to pass to ``simulate`` [N].
    force : float
        Its amplitude (harmonic) or standard deviation (random) [N].
    peak_factor : float or None
        Davenport's peak factor used for a random load; None for a harmonic load [-].
    """

    load: HarmonicForce | RandomForce
    force: float
    peak_factor: float | None


def calibrated_load(acceleration, modal_mass, frequency, structural_damping,
                    load_type="random", duration=PEAK_DURATION, seed=0):
    """Force that gives the bare building a peak acceleration.

    .. math::

        \\text{random: } \\sigma_F = \\frac{a}{g_p\\,\\sigma_{\\ddot x}|_{\\sigma_F = 1}},
        \\quad g_p = \\sqrt{2\\ln(f_s T)} + \\frac{\\gamma}{\\sqrt{2\\ln(f_s T)}};
        \\qquad \\text{harmonic: } F_0 = \\frac{a M}{H(1)} = 2\\zeta_s M a

    Parameters
    ----------
    acceleration : float
        Peak acceleration of the building WITHOUT the damper that the load must produce (the
        wind input, times any load factor), >= 0 [m/s^2].
    modal_mass : float
        Modal mass M* of the building mode, normalised to 1 at the damper, > 0 [kg].
    frequency : float
        Building frequency f_s; also the forcing frequency of the harmonic load and the corner
        frequency of the random load's spectrum, > 0 [Hz].
    structural_damping : float
        Building damping ratio zeta_s, in (0, 1) [-].
    load_type : str
        "random" (stationary random force, :class:`RandomForce`) or "harmonic" (force at
        resonance, :class:`HarmonicForce`) [-].
    duration : float
        Averaging time T of the peak acceleration (random load only), > 0 with f_s T > e [s].
    seed : int or None
        Seed of the random force record (ignored for a harmonic load) [-].

    Returns
    -------
    calibrated : CalibratedLoad
        The load, its force [N] and the peak factor [-] (see :class:`CalibratedLoad`) [-].

    Raises
    ------
    ValueError
        If ``load_type`` is unknown, an argument is outside its range (the message names it),
        or f_s T <= e for a random load (Davenport's asymptotic form does not hold).

    Notes
    -----
    Random load: the bare building's stationary RMS acceleration under a force of unit standard
    deviation with the spectrum of :func:`force_spectrum` (corner frequency f_s) comes from the
    Lyapunov equation of the mode augmented with the force's filter state (the frequency-domain
    integral of |H_a|^2 S_F); it scales with the force. The expected peak over T is that RMS
    times Davenport's peak factor (``damper.peak_factor``) with the mode's frequency as mean
    up-crossing rate (a narrow-band resonant response), gamma = 0.5772 Euler's constant.

    Harmonic load: at resonance the bare mode's steady displacement is 1/(2 zeta_s) times the
    static one (``damper.frequency_response`` at r = 1), so its acceleration amplitude is
    F_0 / (2 zeta_s M).

    The peak of a simulated record differs from the expected one: by statistical scatter
    (random), and by sampling (harmonic: low by up to 1 - cos(pi / samples_per_period)).

    Examples
    --------
    A 0.2 Hz mode, M* = 1e6 kg, 1 % damping, to reach 0.2 m/s^2 (invented demo data):

    >>> c = calibrated_load(0.2, 1e6, 0.2, 0.01, "harmonic")
    >>> print(f"{c.force:.0f} N, {type(c.load).__name__}, {c.peak_factor}")
    4000 N, HarmonicForce, None
    >>> load, force, g_peak = calibrated_load(0.2, 1e6, 0.2, 0.01, "random", seed=3)
    >>> print(f"{force:.0f} N RMS, peak factor {g_peak:.3f}, seed {load.seed}")
    12132 N RMS, peak factor 3.281, seed 3

    References
    ----------
    1. A. G. Davenport, "Note on the distribution of the largest value of a random function with
       application to gust loading", Proc. ICE 28(2):187-196, 1964.
    2. J. P. Den Hartog, Mechanical Vibrations, 4th ed., McGraw-Hill, 1956, ch. 2 (forced
       vibration with viscous damping: amplification 1/(2 zeta) at resonance); from memory.
    3. T. T. Soong, M. Grigoriu, Random Vibration of Mechanical and Structural Systems,
       Prentice Hall (1993), ch. 5 (Lyapunov equation for the covariance); from memory.
    """
    if load_type not in LOAD_TYPES:
        raise ValueError(f"load_type={load_type!r} must be one of {', '.join(LOAD_TYPES)}")
    a = _scalar("acceleration", acceleration, 0.0, unit="m/s^2")
    M = _scalar("modal_mass", modal_mass, 0.0, low_open=True, unit="kg")
    fs = _scalar("frequency", frequency, 0.0, low_open=True, unit="Hz")
    zs = _scalar("structural_damping", structural_damping, 0.0, 1.0, low_open=True,
                 high_open=True, unit="-")
    T = _scalar("duration", duration, 0.0, low_open=True, unit="s")
    if load_type == "random":
        unit_force = RandomForce(1.0, fs, seed=seed)
        _, unit_acceleration_rms = _bare_rms(*_bare(M, fs, zs), unit_force)
        g_peak = float(peak_factor(fs, T))
        force = a / (g_peak * unit_acceleration_rms)
        return CalibratedLoad(RandomForce(force, fs, seed=seed), float(force), g_peak)
    amplification = float(frequency_response(1.0, 0.0, 1.0, 0.0, zs))
    force = a * M / amplification
    return CalibratedLoad(HarmonicForce(force, fs), float(force), None)


def hanger_damping(damper_damping, frequency, length, g=STANDARD_GRAVITY):
    """Damper damping on the hanger's small-angle frequency.

    .. math::

        \\zeta_L = \\zeta_d\\,\\frac{f_d}{f_L}, \\qquad f_L = \\frac{1}{2\\pi}\\sqrt{g/L}

    Parameters
    ----------
    damper_damping : float or array_like
        Damper damping ratio zeta_d = c_d / (2 m_d omega_d) on the target damper frequency, in
        [0, 1) [-].
    frequency : float or array_like
        Target damper frequency f_d on which ``damper_damping`` is given, > 0 [Hz].
    length : float or array_like
        Hanger length L, pivot to centre of mass, > 0 [m].
    g : float or array_like, optional
        Acceleration of gravity, > 0 [m/s^2].

    Returns
    -------
    damping : float or numpy.ndarray
        Damping ratio zeta_L of the same dashpot on the hanger's small-angle frequency f_L [-].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    The dashpot c_d = 2 zeta m_d omega is a property of the device, so the same dashpot on
    another frequency of the same mass has a damping ratio inversely proportional to that
    frequency. A hanger cut to be in tune at its design swing (``pendulum.equivalent_length``)
    is shorter than the small-angle length of f_d, so f_L > f_d and zeta_L < zeta_d. ``simulate``
    takes the damper damping on the small-angle frequency of its ``length``.

    Examples
    --------
    A damper designed for f_d = 0.197 Hz with 7 % damping, on a 6 m hanger (f_L = 0.2035 Hz):

    >>> round(hanger_damping(0.07, 0.197, 6.0), 5)
    0.06777

    References
    ----------
    1. J. P. Den Hartog, Mechanical Vibrations, 4th ed., McGraw-Hill, 1956, ch. 2 (damping ratio
       c / (2 m omega) of a viscous damper); from memory.
    2. G. B. Warburton, "Optimum absorber parameters for various combinations of response and
       excitation parameters", Earthquake Eng. Struct. Dyn. 10(3):381-401, 1982 (damper damping
       on the damper's own frequency); from memory.
    """
    zd = check_range("damper_damping", damper_damping, 0.0, 1.0, high_open=True, unit="-")
    fd = check_range("frequency", frequency, 0.0, low_open=True, unit="Hz")
    L = check_range("length", length, 0.0, low_open=True, unit="m")
    gg = check_range("g", g, 0.0, low_open=True, unit="m/s^2")
    zd, fd, L, gg = broadcast(damper_damping=zd, frequency=fd, length=L, g=gg)
    return scalar_or_array(zd * fd / (np.sqrt(gg / L) / (2.0 * np.pi)))
