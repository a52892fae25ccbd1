# SPDX-License-Identifier: MIT
"""Key numbers of a simulation from flat inputs, for the spreadsheet layer."""
from __future__ import annotations

from functions.pendulum import STANDARD_GRAVITY
from functions.simulation.loads import LOAD_TYPES, HarmonicForce, RandomForce
from functions.simulation.run import simulate

__all__ = ["simulation_summary"]


def simulation_summary(modal_mass, frequency, structural_damping, damper_mass, length,
                       damper_damping, load_type, force, load_frequency, duration=600.0,
                       seed=0, tolerance=0.05, g=STANDARD_GRAVITY, velocity_exponent=1.0,
                       dashpot_coefficient=None):
    """Key numbers of a nonlinear damper simulation, flat inputs.

    .. math::

        \\text{departure} = \\max_q
        \\left|\\frac{q_\\text{nonlinear}}{q_\\text{linear}} - 1\\right|,
        \\quad q \\in \\{x_\\text{rms}, \\ddot x_\\text{rms}, u_\\text{rms}\\}

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
        Hanger length L [m].
    damper_damping : float
        Damper damping ratio on its own small-angle frequency [-].
    load_type : str
        "harmonic" or "random" [-].
    force : float
        Force amplitude (harmonic) or standard deviation (random) [N].
    load_frequency : float
        Forcing frequency (harmonic) or corner frequency of the spectrum (random) [Hz].
    duration : float
        Record length [s].
    seed : int
        Seed of the random record (ignored for harmonic loads) [-].
    tolerance : float
        Accepted departure of nonlinear from linear RMS response [-].
    g : float
        Acceleration of gravity [m/s^2].
    velocity_exponent : float
        Exponent alpha of the nonlinear model's dashpot F = C |v|^alpha, in (0, 2] [-].
    dashpot_coefficient : float or None
        Its coefficient C (None: the linear dashpot of ``damper_damping``) [N (s/m)^alpha].

    Returns
    -------
    summary : dict
        The numbers named in SUMMARY_FIELDS, as floats, in that order; units there [-].

    Raises
    ------
    ValueError
        If ``load_type`` is unknown or any argument is outside its range.

    Notes
    -----
    A thin wrapper of :func:`simulate` with the default integration settings, for the
    spreadsheet layer. The same inputs (and seed) give the same numbers.

    Examples
    --------
    >>> s = simulation_summary(1e6, 0.2, 0.01, 2e4, 6.0, 0.07, "harmonic", 4e4, 0.2, 300.0)
    >>> print(f"{s['swing_deg']:.1f} {s['within_tolerance']:.0f}")
    10.3 1

    References
    ----------
    1. See :func:`simulate`.
    """
    if load_type not in LOAD_TYPES:
        raise ValueError(f"load_type={load_type!r} must be one of {', '.join(LOAD_TYPES)}")
    if load_type == "harmonic":
        load = HarmonicForce(force, load_frequency)
    else:
        load = RandomForce(force, load_frequency, seed=seed)
    res = simulate(modal_mass, frequency, structural_damping, damper_mass, length,
                   damper_damping, load, duration, tolerance=tolerance, g=g,
                   velocity_exponent=velocity_exponent,
                   dashpot_coefficient=dashpot_coefficient)
    return res.summary()
