# SPDX-License-Identifier: MIT
"""The building's mode: generalised mass, mode shape, frequency and damping estimates.

A damper acts on one mode. Its mass ratio is taken against the mode's generalised (modal) mass
M* = sum m_i phi_i^2 with the mode shape phi scaled to 1 at the damper's level. Preliminary
estimates of the mode shape, the first frequency and the structural damping follow
EN 1991-1-4:2005 Annex F; they are labelled as such and must be replaced by the structure's own
modal analysis and measured or code-specified damping for design.
"""
from __future__ import annotations

import math
import operator

import numpy as np

from functions._validation import as_array, broadcast, check_range, scalar_or_array

__all__ = [
    "MODE_SHAPE_EXPONENTS",
    "STRUCTURAL_LOG_DECREMENTS",
    "modal_mass",
    "power_law_mode_shape",
    "power_law_modal_mass",
    "annex_f_frequency",
    "damping_from_log_decrement",
    "log_decrement_from_damping",
]

#: Exponent zeta of the fundamental mode shape (z/h)^zeta by structure type,
#: EN 1991-1-4:2005 Annex F, expression (F.3) and its list (from memory, medium-high confidence).
MODE_SHAPE_EXPONENTS: dict[str, float] = {
    "slender_frame_non_load_sharing_walls": 0.6,
    "core_and_peripheral_columns_or_braced": 1.0,
    "slender_cantilever_or_central_concrete_core": 1.5,
    "tower_or_chimney": 2.0,
    "lattice_steel_tower": 2.5,
}

#: Structural logarithmic decrement delta_s of buildings, EN 1991-1-4:2005 Annex F, Table F.2:
#: steel 0.05 (confirmed in a worked example); reinforced concrete 0.10 and mixed 0.08
#: (from memory).
STRUCTURAL_LOG_DECREMENTS: dict[str, float] = {
    "steel_building": 0.05,
    "mixed_building": 0.08,
    "reinforced_concrete_building": 0.10,
}


def modal_mass(floor_masses, mode_shape, damper_level=-1):
    """Generalised mass of a mode, normalised at the damper's level.

    .. math::

        M^* = \\frac{\\sum_i m_i \\phi_i^2}{\\phi_d^2}

    Parameters
    ----------
    floor_masses : array_like
        Lumped mass of each level, >= 0, levels on the last axis [kg].
    mode_shape : array_like
        Mode ordinate of each level, any scaling, levels on the last axis [-].
    damper_level : int, optional
        Index (on the last axis, negative counts from the top) of the level carrying the damper;
        default the last (top) level [-].

    Returns
    -------
    modal_mass : float or numpy.ndarray
        Generalised mass M* for the mode scaled to 1 at the damper [kg].

    Raises
    ------
    ValueError
        If a mass is negative, all masses are zero, the arrays do not broadcast, the damper
        level is not an index of the levels, or the mode ordinate at the damper is zero.

    Notes
    -----
    Scaling the mode shape to 1 at the damper makes the damper's displacement equal to the modal
    coordinate, so mu = m_d / M* is the mass ratio of the equivalent two-degree-of-freedom
    system (Den Hartog 1956, §3.3; Warburton 1982). A damper placed lower than the top sees a
    larger M* (smaller phi_d), hence a smaller mass ratio for the same mass.

    Examples
    --------
    Three storeys of 1000 t, linear mode, damper on top:

    >>> round(modal_mass([1e6, 1e6, 1e6], [1/3, 2/3, 1.0]) / 1e3, 3)
    1555.556

    References
    ----------
    1. J. P. Den Hartog, Mechanical Vibrations, 4th ed., McGraw-Hill, 1956, §3.3.
    2. R. W. Clough, J. Penzien, Dynamics of Structures, 2nd ed., McGraw-Hill, 1993, ch. 8
       (generalised single-degree-of-freedom systems).
    """
    m = check_range("floor_masses", floor_masses, 0.0, unit="kg")
    phi = as_array("mode_shape", mode_shape)
    if m.ndim == 0 or phi.ndim == 0:
        raise ValueError("floor_masses and mode_shape must list the levels on their last axis")
    m, phi = broadcast(floor_masses=m, mode_shape=phi)
    n = m.shape[-1]
    try:
        level = operator.index(damper_level)
    except TypeError:
        raise ValueError(f"damper_level={damper_level!r} must be an integer index") from None
    if not -n <= level < n:
        raise ValueError(f"damper_level={level!r} must be in [{-n}, {n - 1}] (levels: {n})")
    if np.any(np.sum(m, axis=-1) == 0.0):
        raise ValueError("floor_masses must not all be 0 [kg]")
    phi_d = phi[..., level]
    if np.any(phi_d == 0.0):
        raise ValueError(f"mode_shape at damper_level={level} is 0: the damper would not move")
    return scalar_or_array(np.sum(m * phi * phi, axis=-1) / (phi_d * phi_d))


def power_law_mode_shape(height, building_height, exponent):
    """Power-law fundamental mode shape of a tall structure.

    .. math::

        \\Phi(z) = \\left(\\frac{z}{h}\\right)^{\\zeta}

    Parameters
    ----------
    height : float or array_like
        Height z above ground, in [0, building_height] [m].
    building_height : float or array_like
        Height h of the structure, > 0 [m].
    exponent : float or array_like
        Exponent zeta, > 0; see MODE_SHAPE_EXPONENTS [-].

    Returns
    -------
    mode_shape : float or numpy.ndarray
        Mode ordinate, 1 at the top [-].

    Raises
    ------
    ValueError
        If an argument is outside its range, height exceeds building_height, or the arrays do
        not broadcast.

    Notes
    -----
    EN 1991-1-4:2005 Annex F, (F.3) (from memory, medium-high confidence), a preliminary
    estimate for buildings, towers and chimneys cantilevered from the ground.

    Examples
    --------
    >>> round(power_law_mode_shape(100.0, 200.0, MODE_SHAPE_EXPONENTS["tower_or_chimney"]), 6)
    0.25

    References
    ----------
    1. EN 1991-1-4:2005, Eurocode 1: Actions on structures - Wind actions, Annex F, (F.3).
    """
    z = check_range("height", height, 0.0, unit="m")
    h = check_range("building_height", building_height, 0.0, low_open=True, unit="m")
    e = check_range("exponent", exponent, 0.0, low_open=True, unit="-")
    z, h, e = broadcast(height=z, building_height=h, exponent=e)
    if np.any(z > h):
        i = int(np.flatnonzero((z > h).ravel())[0])
        raise ValueError(f"height={z.ravel()[i].item()!r} must be in [0, building_height] = "
                         f"[0, {h.ravel()[i].item():g}] [m]")
    return scalar_or_array((z / h) ** e)


def power_law_modal_mass(mass_per_height, building_height, exponent):
    """Generalised mass of a uniform structure with a power-law mode.

    .. math::

        M^* = \\int_0^h m \\left(\\frac{z}{h}\\right)^{2\\zeta} dz = \\frac{m\\,h}{2\\zeta + 1}

    Parameters
    ----------
    mass_per_height : float or array_like
        Mass per unit height m, > 0 [kg/m].
    building_height : float or array_like
        Height h, > 0 [m].
    exponent : float or array_like
        Mode-shape exponent zeta, > 0 [-].

    Returns
    -------
    modal_mass : float or numpy.ndarray
        Generalised mass for the mode scaled to 1 at the top (damper at the top) [kg].

    Raises
    ------
    ValueError
        If an argument is not positive or the arrays do not broadcast.

    Notes
    -----
    Exact integral for uniform mass; a preliminary estimate. For a damper below the top divide
    by Phi(z_d)^2 (see :func:`modal_mass`).

    Examples
    --------
    >>> round(power_law_modal_mass(1.0e5, 200.0, 1.5) / 1e6, 3)
    5.0

    References
    ----------
    1. EN 1991-1-4:2005, Annex F, (F.3) mode shape; integral computed.
    """
    m = check_range("mass_per_height", mass_per_height, 0.0, low_open=True, unit="kg/m")
    h = check_range("building_height", building_height, 0.0, low_open=True, unit="m")
    e = check_range("exponent", exponent, 0.0, low_open=True, unit="-")
    m, h, e = broadcast(mass_per_height=m, building_height=h, exponent=e)
    return scalar_or_array(m * h / (2.0 * e + 1.0))


def annex_f_frequency(building_height):
    """Preliminary first frequency of a tall multi-storey building.

    .. math::

        n_1 = \\frac{46}{h}

    Parameters
    ----------
    building_height : float or array_like
        Height h of the building, > 50 [m].

    Returns
    -------
    frequency : float or numpy.ndarray
        Estimated fundamental frequency [Hz].

    Raises
    ------
    ValueError
        If building_height <= 50 m (outside the expression's scope) or not finite.

    Notes
    -----
    EN 1991-1-4:2005 Annex F, (F.2), for multi-storey buildings taller than 50 m (from memory,
    high confidence). A PRELIMINARY ESTIMATE only, with a wide scatter: tune a damper to the
    measured or computed frequency, never to this one.

    Examples
    --------
    >>> round(annex_f_frequency(230.0), 4)
    0.2

    References
    ----------
    1. EN 1991-1-4:2005, Eurocode 1: Actions on structures - Wind actions, Annex F, (F.2).
    """
    h = check_range("building_height", building_height, 50.0, low_open=True, unit="m")
    return scalar_or_array(46.0 / h)


def damping_from_log_decrement(log_decrement, exact=False):
    """Damping ratio from a logarithmic decrement.

    .. math::

        \\zeta = \\frac{\\delta}{2\\pi} \\quad\\text{(default)}, \\qquad
        \\zeta = \\frac{\\delta}{\\sqrt{4\\pi^2 + \\delta^2}} \\quad\\text{(exact)}

    Parameters
    ----------
    log_decrement : float or array_like
        Logarithmic decrement delta = ln(x_n / x_(n+1)), >= 0 [-].
    exact : bool, optional
        False (default): delta/(2 pi), the form of EN 1991-1-4 Annex F; True: the exact relation
        of a viscously damped oscillator [-].

    Returns
    -------
    damping_ratio : float or numpy.ndarray
        Fraction of critical damping [-].

    Raises
    ------
    ValueError
        If log_decrement is negative or not finite.

    Notes
    -----
    The two forms differ by the factor sqrt(1 + (delta/2pi)^2): 0.013 % at delta = 0.1. Use the
    default with decrements taken from EN 1991-1-4 (Table F.2), which are defined with it.

    Examples
    --------
    >>> round(damping_from_log_decrement(STRUCTURAL_LOG_DECREMENTS["steel_building"]), 6)
    0.007958

    References
    ----------
    1. EN 1991-1-4:2005, Annex F, F.5 and Table F.2.
    2. R. W. Clough, J. Penzien, Dynamics of Structures, 2nd ed., 1993, §2-7.
    """
    d = check_range("log_decrement", log_decrement, 0.0, unit="-")
    if exact:
        return scalar_or_array(d / np.sqrt(4.0 * math.pi ** 2 + d * d))
    return scalar_or_array(d / (2.0 * math.pi))


def log_decrement_from_damping(damping_ratio, exact=False):
    """Logarithmic decrement from a damping ratio.

    .. math::

        \\delta = 2\\pi\\zeta \\quad\\text{(default)}, \\qquad
        \\delta = \\frac{2\\pi\\zeta}{\\sqrt{1 - \\zeta^2}} \\quad\\text{(exact)}

    Parameters
    ----------
    damping_ratio : float or array_like
        Fraction of critical damping, in [0, 1) [-].
    exact : bool, optional
        False (default): 2 pi zeta, the form of EN 1991-1-4 Annex F; True: exact [-].

    Returns
    -------
    log_decrement : float or numpy.ndarray
        Logarithmic decrement [-].

    Raises
    ------
    ValueError
        If damping_ratio is outside [0, 1).

    Notes
    -----
    Inverse of :func:`damping_from_log_decrement` with the same ``exact`` flag.

    Examples
    --------
    >>> round(log_decrement_from_damping(0.01), 6)
    0.062832

    References
    ----------
    1. EN 1991-1-4:2005, Annex F, F.5.
    """
    z = check_range("damping_ratio", damping_ratio, 0.0, 1.0, high_open=True, unit="-")
    if exact:
        return scalar_or_array(2.0 * math.pi * z / np.sqrt(1.0 - z * z))
    return scalar_or_array(2.0 * math.pi * z)
