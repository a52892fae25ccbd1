# SPDX-License-Identifier: MIT
"""Frequency-domain stationary response of the linearised model to the random force.

The linearised system of :mod:`functions.simulation.model` is augmented with the filter state of
the force (:class:`~functions.simulation.loads.RandomForce`, an Ornstein-Uhlenbeck process); the
stationary covariance solves a Lyapunov equation. Also the bare-building damping ratio that gives
a displacement variance (the effective damping of a random response).
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.linalg import solve_continuous_lyapunov

from functions.pendulum import STANDARD_GRAVITY
from functions.simulation._inputs import _scalar
from functions.simulation.loads import RandomForce
from functions.simulation.model import _System, _bare, _system

__all__ = ["RandomTheory", "random_response_theory"]


@dataclass(frozen=True)
class RandomTheory:
    """Stationary response of the linearised system to the random force (frequency domain).

    Attributes
    ----------
    displacement_rms, acceleration_rms, stroke_rms : float
        Building displacement [m], acceleration [m/s^2] and stroke [m] standard deviations.
    displacement_rms_without_damper, acceleration_rms_without_damper : float
        The same for the bare building [m], [m/s^2].
    effective_damping : float
        Damping ratio of the bare building with the same displacement variance [-].
    displacement_rms_scatter : float
        Relative standard deviation of the displacement RMS estimated from a record of the given
        duration (Gaussian process; sqrt((2/T) int R^2 dtau) / (2 sigma^2)) [-].
    acceleration_rms_scatter, stroke_rms_scatter : float
        The same for the building acceleration and the stroke [-].
    """

    displacement_rms: float
    acceleration_rms: float
    stroke_rms: float
    displacement_rms_without_damper: float
    acceleration_rms_without_damper: float
    effective_damping: float
    displacement_rms_scatter: float
    acceleration_rms_scatter: float
    stroke_rms_scatter: float


def _augmented(A, B, load: RandomForce):
    """State [z, F] with F an OU process: dF = -F/tau dt + sigma sqrt(2/tau) dW."""
    n = A.shape[0]
    tau_c = 1.0 / (2.0 * math.pi * load.corner_frequency)
    Aa = np.zeros((n + 1, n + 1))
    Aa[:n, :n] = A
    Aa[:n, n] = B
    Aa[n, n] = -1.0 / tau_c
    G = np.zeros(n + 1)
    G[n] = load.rms * math.sqrt(2.0 / tau_c)
    return Aa, G


def _stationary(Aa, G):
    P = solve_continuous_lyapunov(Aa, -np.outer(G, G))
    return 0.5 * (P + P.T)


def _scatter(Aa, P, c, duration):
    """Relative std of the mean-square of c^T z over ``duration`` (Gaussian, stationary)."""
    n = Aa.shape[0]
    var = float(c @ P @ c)
    if var <= 0.0:
        return 0.0
    p = P @ c
    ksum = np.kron(Aa, np.eye(n)) + np.kron(np.eye(n), Aa)
    integral = -float(np.kron(c, c) @ np.linalg.solve(ksum, np.kron(p, p)))  # int_0^inf R^2
    return math.sqrt(max(2.0 / duration * 2.0 * integral, 0.0)) / var


def _bare_variance(p: _System, zeta, load: RandomForce):
    Aa, G = _augmented(*_bare(p.M, p.fs, zeta), load)
    return float(_stationary(Aa, G)[0, 0])


def _zeta_from_variance(p: _System, variance, load: RandomForce):
    """Bare-building damping ratio whose displacement variance under ``load`` is ``variance``."""
    lo, hi = 1e-6, 50.0
    if not (variance > 0.0):
        return math.nan
    f = lambda lz: math.log(_bare_variance(p, math.exp(lz), load) / variance)  # noqa: E731
    flo, fhi = f(math.log(lo)), f(math.log(hi))
    if flo < 0.0 or fhi > 0.0:
        return math.nan
    from scipy.optimize import brentq   # lazy import: scipy.optimize's start-up (0.15 s)
    return math.exp(brentq(f, math.log(lo), math.log(hi), xtol=1e-12, rtol=1e-12))


def _bare_rms(A, B, load: RandomForce) -> tuple[float, float]:
    """Stationary RMS displacement [m] and acceleration [m/s^2] of a bare mode (A, B of
    ``model._bare``) under the random force."""
    Aa, G = _augmented(A, B, load)
    P = _stationary(Aa, G)
    ca = np.array([A[1, 0], A[1, 1], B[1]])
    return math.sqrt(float(P[0, 0])), math.sqrt(float(ca @ P @ ca))


def _theory(p: _System, load: RandomForce, duration: float) -> RandomTheory:
    A, B = p.coupled()
    Aa, G = _augmented(A, B, load)
    P = _stationary(Aa, G)
    n = 4
    cx = np.zeros(n + 1)
    cx[0] = 1.0
    cu = np.zeros(n + 1)
    cu[1] = 1.0
    ca = np.zeros(n + 1)
    ca[:n] = A[2]
    ca[n] = B[2]
    bare_x, bare_a = _bare_rms(*p.bare(), load)
    var_x = float(cx @ P @ cx)
    return RandomTheory(
        displacement_rms=math.sqrt(var_x),
        acceleration_rms=math.sqrt(float(ca @ P @ ca)),
        stroke_rms=math.sqrt(float(cu @ P @ cu)),
        displacement_rms_without_damper=bare_x,
        acceleration_rms_without_damper=bare_a,
        effective_damping=_zeta_from_variance(p, var_x, load),
        displacement_rms_scatter=0.5 * _scatter(Aa, P, cx, duration),
        acceleration_rms_scatter=0.5 * _scatter(Aa, P, ca, duration),
        stroke_rms_scatter=0.5 * _scatter(Aa, P, cu, duration),
    )


def random_response_theory(modal_mass, frequency, structural_damping, damper_mass, length,
                           damper_damping, rms, corner_frequency, duration=600.0,
                           g=STANDARD_GRAVITY):
    """Stationary linear response to the random force, with scatter.

    .. math::

        \\sigma_y^2 = \\int_0^\\infty |H_y(f)|^2 S_F(f)\\,df = c_y^T P c_y,
        \\qquad A_a P + P A_a^T + G G^T = 0

    Parameters
    ----------
    modal_mass : float
        Modal mass M of the building mode, normalised to 1 at the damper [kg].
    frequency : float
        Building frequency f_s [Hz].
    structural_damping : float
        Building damping ratio zeta_s, in [0, 1) [-].
    damper_mass : float
        Pendulum mass m_d [kg].
    length : float
        Hanger length L (small-angle damper frequency sqrt(g/L)/(2 pi)) [m].
    damper_damping : float
        Damper damping ratio on its own frequency, zeta_d = c_d / (2 m_d omega_d), in [0, 1] [-].
    rms : float
        Standard deviation of the force [N].
    corner_frequency : float
        Corner frequency of the force spectrum (:func:`force_spectrum`) [Hz].
    duration : float
        Record length for which the scatter of a simulated RMS is given [s].
    g : float
        Acceleration of gravity [m/s^2].

    Returns
    -------
    theory : RandomTheory
        Standard deviations, effective damping and scatter (see :class:`RandomTheory`) [-].

    Raises
    ------
    ValueError
        If an argument is outside its range (message names it).

    Notes
    -----
    The linearised system is augmented with the filter state of the force (an
    Ornstein-Uhlenbeck process) and the stationary covariance P solves the Lyapunov equation;
    this equals the frequency-domain integral of |H|^2 S_F. The effective damping is the
    damping ratio of the bare building whose displacement variance under the SAME force is the
    same; for a white force (f_c >> f_s) it tends to the definition of
    ``damper.effective_damping``. The scatter uses the variance of a Gaussian process'
    mean-square over a record T, (2/T) int R(tau)^2 dtau, with int_0^inf R^2 dtau from the
    Kronecker-sum identity.

    Examples
    --------
    >>> th = random_response_theory(1e6, 0.2, 0.01, 2e4, 6.0, 0.07, 1e4, 1.0, 3600.0)
    >>> print(f"{th.effective_damping:.4f} {th.displacement_rms_scatter:.3f}")
    0.0403 0.034

    References
    ----------
    1. T. T. Soong, M. Grigoriu, Random Vibration of Mechanical and Structural Systems,
       Prentice Hall (1993), ch. 5 (Lyapunov equation for the covariance); from memory.
    2. J. S. Bendat, A. G. Piersol, Random Data, Wiley, 4th ed. (2010), ch. 8 (random error of
       mean-square estimates); from memory.
    """
    p = _system(modal_mass, frequency, structural_damping, damper_mass, length, damper_damping,
                g)
    load = RandomForce(rms, corner_frequency, seed=0)
    T = _scalar("duration", duration, 0.0, low_open=True, unit="s")
    return _theory(p, load, T)
