# SPDX-License-Identifier: MIT
r"""Loads of the time-domain simulation: harmonic and stationary random force.

* :class:`HarmonicForce` F0 sin(2 pi f t), exact at every Runge-Kutta stage.
* :class:`RandomForce`: stationary Gaussian force, white noise through a first-order low-pass
  filter (an Ornstein-Uhlenbeck process), one-sided spectral density
  S_F(f) = 2 sigma_F^2 / (pi f_c) / (1 + (f/f_c)^2) (so its integral is sigma_F^2). It falls as
  f^-2 above f_c, a simple stand-in for the f^-5/3 of along-wind turbulence. It is sampled EXACTLY
  on the output grid (the AR(1) recursion of the process, seeded numpy Generator) and taken as
  piecewise linear between samples. The output step dt also resolves f_c. Interpolation and
  sampling change the (time-averaged) spectrum to sinc^4(f dt) sum_k S_F(f + k/dt): near the
  building frequency a factor 1 - (2/3)(pi f_s dt)^2 + (pi^2/3) dt^2 (f_c^2 + f_s^2), within
  +-0.7 % at the default 32 samples per period, well below the statistical scatter of any
  practical record (checked: 100 one-hour records averaged 0.999 +- 0.003 of the theoretical
  RMS).
* :func:`_force_at` gives the force the integrators see at any time: exact for the harmonic
  force, piecewise linear between the grid samples for the random one.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from functions._validation import check_range, scalar_or_array
from functions.simulation._inputs import _scalar

__all__ = ["HarmonicForce", "RandomForce", "LOAD_TYPES", "force_spectrum"]

#: Load types accepted by ``simulation_summary`` and ``calibrated_load`` [-].
LOAD_TYPES = ("harmonic", "random")


@dataclass(frozen=True)
class HarmonicForce:
    """Harmonic force F0 sin(2 pi f t) on the building mode.

    Parameters
    ----------
    amplitude : float
        Force amplitude F0 at the damper level (modal force), >= 0 [N].
    frequency : float
        Forcing frequency f, > 0 [Hz].
    """

    amplitude: float
    frequency: float

    def __post_init__(self):
        object.__setattr__(self, "amplitude",
                           _scalar("amplitude", self.amplitude, 0.0, unit="N"))
        object.__setattr__(self, "frequency",
                           _scalar("frequency", self.frequency, 0.0, low_open=True, unit="Hz"))

    def __call__(self, t):
        """Force at times ``t`` [s] -> [N]."""
        return self.amplitude * np.sin(2.0 * np.pi * self.frequency * np.asarray(t, float))


@dataclass(frozen=True)
class RandomForce:
    """Stationary random force: white noise through a low-pass filter.

    The force is an Ornstein-Uhlenbeck process with one-sided spectral density
    S_F(f) = 2 rms^2 / (pi f_c) / (1 + (f/f_c)^2), see :func:`force_spectrum`.

    Parameters
    ----------
    rms : float
        Standard deviation sigma_F of the force (zero mean), >= 0 [N].
    corner_frequency : float
        Corner frequency f_c of the filter, > 0 [Hz].
    seed : int or None
        Seed of the ``numpy.random.Generator`` (PCG64); the same seed gives the same record.
        ``None`` draws a fresh record each call [-].
    """

    rms: float
    corner_frequency: float
    seed: int | None = 0

    def __post_init__(self):
        object.__setattr__(self, "rms", _scalar("rms", self.rms, 0.0, unit="N"))
        object.__setattr__(self, "corner_frequency",
                           _scalar("corner_frequency", self.corner_frequency, 0.0,
                                   low_open=True, unit="Hz"))
        if self.seed is not None and (isinstance(self.seed, bool)
                                      or not isinstance(self.seed, (int, np.integer))
                                      or self.seed < 0):
            raise ValueError(f"seed={self.seed!r} must be None or an integer in [0, inf)")

    def samples(self, n: int, dt: float) -> np.ndarray:
        """Exact samples of the process at spacing ``dt`` [s], stationary from the start [N]."""
        rng = np.random.default_rng(self.seed)
        a = math.exp(-2.0 * math.pi * self.corner_frequency * dt)
        xi = rng.standard_normal(n)
        if n == 0:
            return xi
        first = self.rms * xi[0]
        gain = self.rms * math.sqrt(-math.expm1(2.0 * math.log(a))) if a > 0 else self.rms
        return np.concatenate(([first], _first_order(gain, a, xi[1:], a * first)))


def _first_order(gain: float, a: float, x: np.ndarray, state: float) -> np.ndarray:
    """The recursion y[n] = gain x[n] + a y[n-1], with a y[-1] = ``state`` [N].

    The same operations in the same order as ``scipy.signal.lfilter([gain], [1, -a], x,
    zi=[state])`` (direct form II transposed; a test compares them bit for bit), without
    importing scipy.signal, whose start-up takes half a second.
    """
    out = np.empty(x.size)
    z = state
    for i, v in enumerate(x.tolist()):
        y = gain * v + z
        out[i] = y
        z = a * y
    return out


def force_spectrum(frequency, rms, corner_frequency):
    """One-sided spectral density of the random force model.

    .. math::

        S_F(f) = \\frac{2\\sigma_F^2}{\\pi f_c}\\,\\frac{1}{1 + (f/f_c)^2},
        \\qquad \\int_0^\\infty S_F(f)\\,df = \\sigma_F^2

    Parameters
    ----------
    frequency : float or array_like
        Frequency f at which to evaluate the density, >= 0 [Hz].
    rms : float or array_like
        Standard deviation sigma_F of the force [N].
    corner_frequency : float or array_like
        Corner frequency f_c of the first-order filter [Hz].

    Returns
    -------
    density : float or numpy.ndarray
        One-sided power spectral density of the force [N^2/Hz].

    Raises
    ------
    ValueError
        If ``frequency`` or ``rms`` is negative, ``corner_frequency`` not positive, or any is not
        a finite number.

    Notes
    -----
    The spectrum of an Ornstein-Uhlenbeck process (white noise through a first-order low-pass
    filter with time constant 1/(2 pi f_c)); its autocovariance is sigma_F^2 exp(-2 pi f_c |tau|).

    Examples
    --------
    >>> round(force_spectrum(0.0, 1.0, 1.0 / math.pi), 6)   # 2 sigma^2 / (pi f_c)
    2.0

    References
    ----------
    1. A. Papoulis, Probability, Random Variables and Stochastic Processes, McGraw-Hill, 3rd ed.
       (1991), ch. 10 (spectrum of the exponential autocorrelation); from memory.
    """
    f = check_range("frequency", frequency, 0.0, unit="Hz")
    s = check_range("rms", rms, 0.0, unit="N")
    fc = check_range("corner_frequency", corner_frequency, 0.0, low_open=True, unit="Hz")
    return scalar_or_array(2.0 * s**2 / (np.pi * fc) / (1.0 + (f / fc) ** 2))


def _force_at(load, tau_grid, forces, t):
    """Force at times ``t``: exact for harmonic, piecewise linear on the grid for random."""
    if load is None:
        return np.zeros_like(t)
    if isinstance(load, HarmonicForce):
        return load(t)
    return np.interp(t, tau_grid, forces)
