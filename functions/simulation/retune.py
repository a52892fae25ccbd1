# SPDX-License-Identifier: MIT
"""Retuning the hanger for a design swing, with simulations before and after."""
from __future__ import annotations

import math
from dataclasses import dataclass

from functions.pendulum import STANDARD_GRAVITY, equivalent_length, pendulum_frequency
from functions.simulation._inputs import _scalar
from functions.simulation.loads import HarmonicForce  # noqa: F401  (used by the doctest)
from functions.simulation.model import _system
from functions.simulation.results import SimulationResult
from functions.simulation.run import simulate

__all__ = ["RetuneResult", "retune_for_swing"]


@dataclass(frozen=True)
class RetuneResult:
    """Simulations before and after retuning the hanger for a swing.

    Attributes
    ----------
    length, retuned_length : float
        Hanger length before (tuned at small swings) and after (tuned at the design swing) [m].
    design_swing_deg : float
        Swing at which the retuned hanger is in tune [deg].
    target_frequency : float
        Damper frequency aimed at: the small-angle frequency of ``length`` [Hz].
    damper_damping, retuned_damper_damping : float
        zeta_d before and after; the dashpot c_d [N s/m] is kept, so zeta_d scales with
        sqrt(L'/L) [-].
    mistuning, retuned_mistuning : float
        Exact-period frequency at the simulated peak swing / target frequency - 1, before and
        after [-].
    acceleration_ratio, displacement_ratio : float
        Nonlinear RMS building acceleration and displacement after / before [-].
    before, after : SimulationResult
        The two simulations (same load, same seed).
    """

    length: float
    retuned_length: float
    design_swing_deg: float
    target_frequency: float
    damper_damping: float
    retuned_damper_damping: float
    mistuning: float
    retuned_mistuning: float
    acceleration_ratio: float
    displacement_ratio: float
    before: SimulationResult
    after: SimulationResult


def retune_for_swing(modal_mass, frequency, structural_damping, damper_mass, length,
                     damper_damping, load, design_swing_deg=None, duration=600.0, *,
                     g=STANDARD_GRAVITY, **options):
    """Retune the hanger for a design swing and simulate both.

    .. math::

        L' = \\mathrm{equivalent\\_length}(f_t, \\theta_d)
           = \\frac{g}{(2\\pi f_t)^2 (T(\\theta_d)/T_0)^2},
        \\qquad f_t = \\frac{1}{2\\pi}\\sqrt{g/L}

    Parameters
    ----------
    modal_mass : float
        Modal mass M of the building mode [kg].
    frequency : float
        Building frequency f_s [Hz].
    structural_damping : float
        Building damping ratio [-].
    damper_mass : float
        Pendulum mass m_d [kg].
    length : float
        Present hanger length, cut to the small-angle length of the target damper frequency [m].
    damper_damping : float
        Damper damping ratio on the small-angle frequency of ``length`` [-].
    load : HarmonicForce, RandomForce or None
        Force on the building mode, as :func:`simulate` [N].
    design_swing_deg : float or None
        Swing at which the damper must be in tune, in [0, 90]; None takes the peak swing of the
        first (untuned) simulation [deg].
    duration : float
        Record length of each simulation [s].
    g : float
        Acceleration of gravity [m/s^2].
    options : dict
        Further keyword arguments of :func:`simulate` (warmup, samples_per_period, rtol,
        tolerance, integrator...) [-].

    Returns
    -------
    comparison : RetuneResult
        Lengths, damping, mistuning and the two simulations (see :class:`RetuneResult`) [-].

    Raises
    ------
    ValueError
        As :func:`simulate`, or if ``design_swing_deg`` is outside [0, 90].

    Notes
    -----
    The target damper frequency f_t is the small-angle frequency of ``length`` (the linear
    design). The retuned hanger is shorter, so its small-angle frequency is higher and its
    frequency at the design swing equals f_t. The dashpot coefficient c_d = 2 zeta_d m_d
    omega_d(L) is kept (it is a device property), so zeta_d on the new, higher small-angle
    frequency becomes zeta_d sqrt(L'/L). The same load (same seed) drives both simulations.

    Examples
    --------
    A damper cut to the small-angle length for the white-noise optimum (mu = 0.02, f = 0.985,
    zeta_d = 0.070), driven at resonance to a swing near 30 deg (invented demo data):

    >>> c = retune_for_swing(1e6, 0.2, 0.01, 2e4, 6.397, 0.0704, HarmonicForce(1e5, 0.2),
    ...                      None, 100.0, warmup=300.0)
    >>> print(f"{c.retuned_length:.3f} m, mistuning {c.mistuning:+.4f} -> "
    ...       f"{c.retuned_mistuning:+.4f}, acceleration x{c.acceleration_ratio:.3f}")
    6.227 m, mistuning -0.0134 -> -0.0002, acceleration x0.921

    References
    ----------
    1. Abramowitz & Stegun, Handbook of Mathematical Functions (1964), §17.2 (exact period
       behind ``pendulum.equivalent_length``).
    """
    before = simulate(modal_mass, frequency, structural_damping, damper_mass, length,
                      damper_damping, load, duration, g=g, **options)
    p = _system(modal_mass, frequency, structural_damping, damper_mass, length, damper_damping,
                g)
    if design_swing_deg is None:
        swing = min(before.nonlinear.swing_deg, 90.0)
    else:
        swing = _scalar("design_swing_deg", design_swing_deg, 0.0, 90.0, unit="deg")
    f_t = p.wd / (2.0 * math.pi)
    L_new = float(equivalent_length(f_t, swing, p.g))
    zd_new = p.zd * math.sqrt(L_new / p.L)
    after = simulate(modal_mass, frequency, structural_damping, damper_mass, L_new, zd_new,
                     load, duration, g=g, **options)

    def mistuning(L, res):
        s = min(res.nonlinear.swing_deg, 179.0)
        return float(pendulum_frequency(L, s, p.g)) / f_t - 1.0

    return RetuneResult(
        length=p.L, retuned_length=L_new, design_swing_deg=swing, target_frequency=f_t,
        damper_damping=p.zd, retuned_damper_damping=zd_new,
        mistuning=mistuning(p.L, before), retuned_mistuning=mistuning(L_new, after),
        acceleration_ratio=after.nonlinear.acceleration_rms / before.nonlinear.acceleration_rms
        if before.nonlinear.acceleration_rms > 0 else math.nan,
        displacement_ratio=after.nonlinear.displacement_rms / before.nonlinear.displacement_rms
        if before.nonlinear.displacement_rms > 0 else math.nan,
        before=before, after=after,
    )
