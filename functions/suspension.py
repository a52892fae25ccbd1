# SPDX-License-Identifier: MIT
"""The pendulum's suspension: hangers, the mass block, stages, space and buffers.

What a supplier needs beyond the design chain's mass, length and stroke: the force in each
hanger and the load it must break at, how much the hangers stretch and what that does to the
tuning, the size of the mass block, how many stages fold the pendulum into the height
available, the plan space of the swing and the buffers' deflection and force.

Assumptions, used everywhere in this module:

* n >= 1 parallel hangers of equal length carry the mass block, which then translates without
  rotating: the pendulum length is the hanger length, pin to pin, and the hangers share the
  load equally. A single hanger makes a compound pendulum; the formulas then take the block
  as a point mass at the hanger's end;
* the tension at the bottom of a free swing of amplitude theta_0 is T = m g (3 - 2 cos
  theta_0) (energy conservation and the radial equation of motion), the largest of the swing;
  the hangers stay taut, so theta_0 <= 90 deg;
* the hangers are linear elastic (axial stiffness E A);
* the buffers are linear springs absorbing the damper's kinetic energy relative to the
  structure at contact.

Contents: :func:`hanger_tension`, :func:`minimum_breaking_load`, :func:`hanger_stretch`,
:func:`stretch_frequency_error`, :func:`mass_block`, :func:`pendulum_stages`,
:func:`swing_space`, :func:`buffer_contact`. :data:`SUSPENSION_FORMS` holds the closed forms a
workbook shows, each a numpy twin with its native worksheet formula over the design chain's
defined names. Imports run one way: suspension -> pendulum, worksheet.
"""
from __future__ import annotations

from typing import Any, Callable, NamedTuple

import numpy as np

from functions._validation import (broadcast, check_range, non_negative, positive,
                                   scalar_or_array)
from functions.pendulum import STANDARD_GRAVITY
from functions.worksheet import renamed, twin

__all__ = [
    "SUSPENSION_FORMS", "hanger_tension", "minimum_breaking_load", "hanger_stretch",
    "stretch_frequency_error", "MassBlock", "mass_block", "PendulumStages", "pendulum_stages",
    "swing_space", "BufferContact", "buffer_contact",
]


# --------------------------------------------------------------------------------------------
# arguments and kernels (the public functions and the worksheet twins share the kernels)
# --------------------------------------------------------------------------------------------
def _count(name: str, value) -> np.ndarray:
    n = check_range(name, value, 1.0, unit="-")
    whole = n == np.round(n)
    if not whole.all():
        bad = n[~whole].flat[0].item() if n.ndim else n.item()
        raise ValueError(f"{name}={bad!r} must be a whole number in [1, inf) [-]")
    return n


def _peak_tension(m, g, theta_deg, n):
    return m * g * (3.0 - 2.0 * np.cos(np.radians(theta_deg))) / n


def _frequency_error(length, stretch):
    return np.sqrt(length / (length + stretch)) - 1.0


def _stage_count(length, available, block):
    gap = available - block
    if np.any(gap <= 0.0):
        bad = np.broadcast_to(available, np.shape(gap))[gap <= 0.0].flat[0]
        bh = np.broadcast_to(block, np.shape(gap))[gap <= 0.0].flat[0]
        raise ValueError(f"available_height={float(bad)!r} must be in (block_height, inf) = "
                         f"({float(bh):g}, inf) [m] (no room for a hanger)")
    return np.maximum(1.0, np.ceil(length / gap))


# --------------------------------------------------------------------------------------------
# hangers
# --------------------------------------------------------------------------------------------
def hanger_tension(damper_mass, amplitude_deg, hanger_count=1, g=STANDARD_GRAVITY):
    """Peak tension in each hanger of a swinging pendulum.

    .. math::

        T = \\frac{m_d\\,g\\,(3 - 2\\cos\\theta_0)}{n}

    Parameters
    ----------
    damper_mass : float or array_like
        Moving mass m_d of the pendulum, > 0 [kg].
    amplitude_deg : float or array_like
        Swing amplitude theta_0 from the vertical, in [0, 90]; 0 gives the static tension
        [deg].
    hanger_count : float or array_like, optional
        Number n of parallel hangers sharing the load, a whole number >= 1 (1 by default)
        [-].
    g : float or array_like, optional
        Acceleration of gravity, > 0 (standard gravity by default) [m/s^2].

    Returns
    -------
    tension : float or numpy.ndarray
        Tension in each hanger at the bottom of the swing, the largest of the swing [N].

    Raises
    ------
    ValueError
        If an argument is outside its range (a hanger count that is not a whole number) or
        the arrays do not broadcast.

    Notes
    -----
    Free swing from rest at theta_0: energy conservation gives L theta'^2 = 2 g (cos theta -
    cos theta_0), the radial equation T_total = m (g cos theta + L theta'^2) = m g (3 cos
    theta - 2 cos theta_0), largest at the bottom, theta = 0. Parallel hangers of equal length
    share it equally (the block translates). Above 90 deg a cable would go slack at the top
    of the swing. A damper driven by the structure swings with nearly this tension at the
    same amplitude; the dynamic factor (3 - 2 cos theta_0) is 1.0076 at 5 deg.

    Examples
    --------
    >>> round(hanger_tension(287e3, 0.0, 4))
    703627
    >>> round(hanger_tension(287e3, 11.6355, 4))
    732546

    References
    ----------
    1. J. L. Meriam, L. G. Kraige, Engineering Mechanics: Dynamics, 7th ed., Wiley, 2012,
       ch. 3 (normal and tangential coordinates; work and energy).
    """
    m = positive("damper_mass", damper_mass, "kg")
    theta = check_range("amplitude_deg", amplitude_deg, 0.0, 90.0, unit="deg")
    n = _count("hanger_count", hanger_count)
    gg = positive("g", g, "m/s^2")
    m, theta, n, gg = broadcast(damper_mass=m, amplitude_deg=theta, hanger_count=n, g=gg)
    return scalar_or_array(_peak_tension(m, gg, theta, n))


def minimum_breaking_load(tension, safety_factor):
    """Minimum breaking load a hanger must have.

    .. math::

        F_{min} = \\gamma\\,T

    Parameters
    ----------
    tension : float or array_like
        Largest tension T in the hanger (e.g. at the extreme swing), >= 0 [N].
    safety_factor : float or array_like
        Safety factor gamma on the breaking load, >= 1: the designer's choice from the code
        or standard that governs the hangers (no default here) [-].

    Returns
    -------
    breaking_load : float or numpy.ndarray
        Minimum breaking load of each hanger [N].

    Raises
    ------
    ValueError
        If tension is negative, safety_factor below 1, or the arrays do not broadcast.

    Notes
    -----
    A product, stated so that a sheet carries the factor beside the load. Fatigue under the
    swing's tension range, bending at the pins and wear are separate checks.

    Examples
    --------
    >>> round(minimum_breaking_load(183103.0, 4.0))
    732412

    References
    ----------
    1. Definition of a safety factor on the breaking load (common practice, no source).
    """
    t = non_negative("tension", tension, "N")
    s = check_range("safety_factor", safety_factor, 1.0, unit="-")
    t, s = broadcast(tension=t, safety_factor=s)
    return scalar_or_array(t * s)


def hanger_stretch(tension, length, axial_stiffness):
    """Elastic stretch of a hanger under its tension.

    .. math::

        \\delta = \\frac{T\\,L}{E A}

    Parameters
    ----------
    tension : float or array_like
        Tension T in the hanger, >= 0 [N].
    length : float or array_like
        Hanger length L, > 0 [m].
    axial_stiffness : float or array_like
        Axial stiffness E A of the hanger, > 0 [N].

    Returns
    -------
    stretch : float or numpy.ndarray
        Elongation delta of the hanger [m].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    Hooke's law for a bar or cable in the linear range; for a wire rope E A is the rope's
    (its maker's) metallic area times its rope modulus, and a new rope adds a permanent
    constructional stretch not counted here.

    Examples
    --------
    >>> round(hanger_stretch(703627.0, 11.29, 1.2e9), 6)
    0.00662

    References
    ----------
    1. S. P. Timoshenko, J. M. Gere, Mechanics of Materials, Van Nostrand Reinhold, 1972,
       ch. 1 (axially loaded bars).
    """
    t = non_negative("tension", tension, "N")
    length_ = positive("length", length, "m")
    ea = positive("axial_stiffness", axial_stiffness, "N")
    t, length_, ea = broadcast(tension=t, length=length_, axial_stiffness=ea)
    return scalar_or_array(t * length_ / ea)


def stretch_frequency_error(length, stretch):
    """Frequency error of a pendulum from its hangers' stretch.

    .. math::

        \\frac{\\Delta f}{f} = \\sqrt{\\frac{L}{L + \\delta}} - 1

    Parameters
    ----------
    length : float or array_like
        Pendulum length L the hangers are cut to, > 0 [m].
    stretch : float or array_like
        Stretch delta of the hangers under the block's weight, >= 0 [m].

    Returns
    -------
    error : float or numpy.ndarray
        Relative change of the pendulum's frequency, <= 0 (the stretched pendulum is
        slower) [-].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    f ~ 1/sqrt(L) for a simple pendulum: hangers cut to L and stretched to L + delta run
    this much slow. Cutting them to L - delta (the unstretched length) removes the error.

    Examples
    --------
    >>> round(stretch_frequency_error(11.29, 0.00662), 7)
    -0.0002931

    References
    ----------
    1. Abramowitz & Stegun, Handbook of Mathematical Functions (NBS AMS-55, 1964), §17.2
       (small-swing period 2 pi sqrt(L/g)).
    """
    length_ = positive("length", length, "m")
    d = non_negative("stretch", stretch, "m")
    length_, d = broadcast(length=length_, stretch=d)
    return scalar_or_array(_frequency_error(length_, d))


# --------------------------------------------------------------------------------------------
# mass block, stages, space
# --------------------------------------------------------------------------------------------
class MassBlock(NamedTuple):
    """The mass block (SI units)."""

    volume: float | np.ndarray  #: [m^3]
    height: float | np.ndarray  #: [m]


def mass_block(damper_mass, density, plan_length_1, plan_length_2):
    """Volume and height of a rectangular mass block.

    .. math::

        V = \\frac{m_d}{\\rho},\\qquad h = \\frac{V}{b_1\\,b_2}

    Parameters
    ----------
    damper_mass : float or array_like
        Moving mass m_d, > 0 [kg].
    density : float or array_like
        Mean density rho of the block (steel plates, concrete, ...), > 0 [kg/m^3].
    plan_length_1 : float or array_like
        Plan length b_1 of the block in sway direction 1, > 0 [m].
    plan_length_2 : float or array_like
        Plan length b_2 of the block in sway direction 2, > 0 [m].

    Returns
    -------
    volume : float or numpy.ndarray
        Volume of the block [m^3].
    height : float or numpy.ndarray
        Height of a solid rectangular block of that plan [m].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    A solid prism of the mean density: frames, hanger pins and voids go into the density.
    Returned as :class:`MassBlock`.

    Examples
    --------
    >>> b = mass_block(287e3, 7850.0, 4.0, 4.0)
    >>> round(b.volume, 4), round(b.height, 4)
    (36.5605, 2.285)

    References
    ----------
    1. Geometry of a prism and the definition of density (no published source needed).
    """
    m = positive("damper_mass", damper_mass, "kg")
    rho = positive("density", density, "kg/m^3")
    b1 = positive("plan_length_1", plan_length_1, "m")
    b2 = positive("plan_length_2", plan_length_2, "m")
    m, rho, b1, b2 = broadcast(damper_mass=m, density=rho, plan_length_1=b1,
                               plan_length_2=b2)
    volume = m / rho
    return MassBlock(scalar_or_array(volume), scalar_or_array(volume / (b1 * b2)))


class PendulumStages(NamedTuple):
    """A pendulum folded into stages (SI units)."""

    count: float | np.ndarray           #: number of stages [-]
    stage_length: float | np.ndarray    #: hanger length of each stage [m]
    vertical_space: float | np.ndarray  #: stage length plus block height [m]


def pendulum_stages(length, available_height, block_height):
    """Stages a pendulum is folded into to fit the height available.

    .. math::

        n = \\max\\!\\left(1, \\left\\lceil \\frac{L}{H - h} \\right\\rceil\\right),\\qquad
        L_s = \\frac{L}{n},\\qquad H_{need} = L_s + h

    Parameters
    ----------
    length : float or array_like
        Pendulum length L the design needs, > 0 [m].
    available_height : float or array_like
        Clear height H available for one stage and the block, > block_height [m].
    block_height : float or array_like
        Height h of the mass block, > 0 [m].

    Returns
    -------
    count : float or numpy.ndarray
        Number n of equal stages [-].
    stage_length : float or numpy.ndarray
        Hanger length of each stage [m].
    vertical_space : float or numpy.ndarray
        Height one stage with the block takes, <= available_height [m].

    Raises
    ------
    ValueError
        If available_height <= block_height (no room for a hanger), an argument is outside
        its range, or the arrays do not broadcast.

    Notes
    -----
    Stages in series, each carrying the full weight, act as one pendulum of the summed length
    (:func:`functions.pendulum.folded_pendulum_length`): n stages of L / n give L. The frames'
    own mass and height are neglected. Returned as :class:`PendulumStages`.

    Examples
    --------
    >>> s = pendulum_stages(11.29, 6.0, 2.285)
    >>> int(s.count), round(s.stage_length, 4), round(s.vertical_space, 4)
    (4, 2.8225, 5.1075)

    References
    ----------
    1. Statics of a pendulum in small swings (restoring force W x / L per stage) — textbook
       result, common practice, no source; see :func:`functions.pendulum.folded_pendulum_length`.
    """
    length_ = positive("length", length, "m")
    big_h = positive("available_height", available_height, "m")
    h = positive("block_height", block_height, "m")
    length_, big_h, h = broadcast(length=length_, available_height=big_h, block_height=h)
    n = _stage_count(length_, big_h, h)
    stage = length_ / n
    return PendulumStages(scalar_or_array(n), scalar_or_array(stage),
                          scalar_or_array(stage + h))


def swing_space(block_length, clearance):
    """Plan space the swinging block needs in one direction.

    .. math::

        s = b + 2\\,c

    Parameters
    ----------
    block_length : float or array_like
        Plan length b of the block in that direction, > 0 [m].
    clearance : float or array_like
        Free travel c from rest to the buffers on each side, >= 0 [m].

    Returns
    -------
    space : float or numpy.ndarray
        Clear plan length between the buffers' faces [m].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    The block at rest in the middle, free to travel c either way; the buffers' own depth and
    any walkway come on top.

    Examples
    --------
    >>> swing_space(4.0, 1.2)
    6.4

    References
    ----------
    1. Plane geometry (no published source needed).
    """
    b = positive("block_length", block_length, "m")
    c = non_negative("clearance", clearance, "m")
    b, c = broadcast(block_length=b, clearance=c)
    return scalar_or_array(b + 2.0 * c)


# --------------------------------------------------------------------------------------------
# buffers
# --------------------------------------------------------------------------------------------
class BufferContact(NamedTuple):
    """A linear buffer stopping the damper (SI units)."""

    deflection: float | np.ndarray  #: largest compression of the buffer [m]
    force: float | np.ndarray       #: largest force of the buffer [N]


def buffer_contact(contact_velocity, damper_mass, buffer_stiffness):
    """Deflection and force of a linear buffer stopping the damper.

    .. math::

        \\tfrac12 k_b\\,u^2 = \\tfrac12 m_d\\,v_c^2:\\qquad
        u = v_c\\sqrt{\\frac{m_d}{k_b}},\\qquad F = k_b\\,u = v_c\\sqrt{m_d\\,k_b}

    Parameters
    ----------
    contact_velocity : float or array_like
        Velocity v_c of the damper relative to the structure at contact, >= 0 [m/s].
    damper_mass : float or array_like
        Moving mass m_d, > 0 [kg].
    buffer_stiffness : float or array_like
        Stiffness k_b of the buffer (all buffers acting together), > 0 [N/m].

    Returns
    -------
    deflection : float or numpy.ndarray
        Largest compression u of the buffer [m].
    force : float or numpy.ndarray
        Largest force of the buffer on the block and the structure [N].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Notes
    -----
    Energy: the buffer takes the kinetic energy m_d v_c^2 / 2 as spring energy k_b u^2 / 2;
    the pendulum's restoring force, the dashpot's work and the structure's motion during the
    contact are neglected (each lessens the deflection), and the buffer is linear. Returned
    as :class:`BufferContact`.

    Examples
    --------
    >>> r = buffer_contact(1.84927, 287e3, 2.0e6)
    >>> round(r.deflection, 5), round(r.force)
    (0.70053, 1401059)

    References
    ----------
    1. J. L. Meriam, L. G. Kraige, Engineering Mechanics: Dynamics, 7th ed., Wiley, 2012,
       ch. 3 (work and energy of a linear spring).
    """
    v = non_negative("contact_velocity", contact_velocity, "m/s")
    m = positive("damper_mass", damper_mass, "kg")
    k = positive("buffer_stiffness", buffer_stiffness, "N/m")
    v, m, k = broadcast(contact_velocity=v, damper_mass=m, buffer_stiffness=k)
    return BufferContact(scalar_or_array(v * np.sqrt(m / k)), scalar_or_array(v * np.sqrt(m * k)))


# --------------------------------------------------------------------------------------------
# the closed forms a workbook shows, beside their worksheet formulas
# --------------------------------------------------------------------------------------------
_TENSION = ("Energy conservation and the radial equation of a free swing (Meriam & Kraige, "
            "Engineering Mechanics: Dynamics), shared by equal parallel hangers")
_HOOKE = "Hooke's law, delta = T L / (E A)"
_BUFFER = "Energy: m_d v_c^2 / 2 = k_b u^2 / 2, linear buffer"


def _form(formula: str, expression: str, source: str, compute: Callable[..., Any]):
    return twin(formula, compute, expression, source)


#: Result name -> numpy twin with its native worksheet formula, over the design chain's defined
#: names and the supply inputs (hanger_count, hanger_safety_factor, hanger_axial_stiffness,
#: block_density, block_length_1, block_length_2, available_height, buffer_stiffness).
SUSPENSION_FORMS: dict[str, Callable[..., Any]] = {
    "hanger_static_tension": _form(
        "=damper_mass*gravity/hanger_count", "m_d g / n", "Statics, equal parallel hangers",
        lambda damper_mass, gravity, hanger_count: damper_mass * gravity / hanger_count),
    "hanger_peak_tension": _form(
        "=damper_mass*gravity*(3-2*COS(RADIANS(swing_angle_deg)))/hanger_count",
        "m_d g (3 - 2 cos theta_0) / n", _TENSION,
        lambda damper_mass, gravity, swing_angle_deg, hanger_count:
        _peak_tension(damper_mass, gravity, swing_angle_deg, hanger_count)),
    "hanger_breaking_load": _form(
        "=hanger_safety_factor*extreme_hanger_tension", "gamma T_x",
        "Safety factor on the breaking load, the designer's choice",
        lambda hanger_safety_factor, extreme_hanger_tension:
        hanger_safety_factor * extreme_hanger_tension),
    "hanger_stretch": _form(
        "=hanger_static_tension*pendulum_length/hanger_axial_stiffness", "T L / (E A)",
        _HOOKE + ", under the static tension",
        lambda hanger_static_tension, pendulum_length, hanger_axial_stiffness:
        hanger_static_tension * pendulum_length / hanger_axial_stiffness),
    "unstretched_length": _form(
        "=pendulum_length-hanger_stretch", "L - delta",
        "Cut length that stretches to the pendulum length under the block",
        lambda pendulum_length, hanger_stretch: pendulum_length - hanger_stretch),
    "stretch_frequency_error": _form(
        "=SQRT(pendulum_length/(pendulum_length+hanger_stretch))-1",
        "sqrt(L / (L + delta)) - 1", "f ~ 1/sqrt(L) (A&S §17.2): hangers cut to L, stretched",
        lambda pendulum_length, hanger_stretch:
        _frequency_error(pendulum_length, hanger_stretch)),
    "block_volume": _form(
        "=damper_mass/block_density", "m_d / rho", "Definition of density",
        lambda damper_mass, block_density: damper_mass / block_density),
    "block_height": _form(
        "=block_volume/(block_length_1*block_length_2)", "V / (b_1 b_2)", "Volume of a prism",
        lambda block_volume, block_length_1, block_length_2:
        block_volume / (block_length_1 * block_length_2)),
    "stage_count": _form(
        "=MAX(1,ROUNDUP(pendulum_length/(available_height-block_height),0))",
        "max(1, ceil(L / (H - h)))",
        "Stages in series add their lengths (functions.pendulum.folded_pendulum_length)",
        lambda pendulum_length, available_height, block_height:
        _stage_count(pendulum_length, available_height, block_height)),
    "stage_length": _form(
        "=pendulum_length/stage_count", "L / n", "Equal stages",
        lambda pendulum_length, stage_count: pendulum_length / stage_count),
    "vertical_space": _form(
        "=stage_length+block_height", "L_s + h", "Geometry",
        lambda stage_length, block_height: stage_length + block_height),
    "plan_space_1": _form(
        "=block_length_1+2*clearance", "b_1 + 2 c", "Geometry",
        lambda block_length_1, clearance: block_length_1 + 2.0 * clearance),
    "static_vertical_load": _form(
        "=damper_mass*gravity", "m_d g", "Statics",
        lambda damper_mass, gravity: damper_mass * gravity),
    "extreme_vertical_load": _form(
        "=damper_mass*gravity*(3-2*COS(RADIANS(extreme_swing_deg)))",
        "m_d g (3 - 2 cos theta_x)", _TENSION.split(", shared")[0] + ", all hangers",
        lambda damper_mass, gravity, extreme_swing_deg:
        _peak_tension(damper_mass, gravity, extreme_swing_deg, 1.0)),
    "buffer_deflection": _form(
        "=contact_velocity*SQRT(damper_mass/buffer_stiffness)", "v_c sqrt(m_d / k_b)", _BUFFER,
        lambda contact_velocity, damper_mass, buffer_stiffness:
        contact_velocity * np.sqrt(damper_mass / buffer_stiffness)),
    "buffer_force": _form(
        "=contact_velocity*SQRT(damper_mass*buffer_stiffness)", "v_c sqrt(m_d k_b)", _BUFFER,
        lambda contact_velocity, damper_mass, buffer_stiffness:
        contact_velocity * np.sqrt(damper_mass * buffer_stiffness)),
}
SUSPENSION_FORMS.update({
    "extreme_hanger_tension": renamed(SUSPENSION_FORMS["hanger_peak_tension"],
                                      {"swing_angle_deg": "extreme_swing_deg"},
                                      "m_d g (3 - 2 cos theta_x) / n"),
    "plan_space_2": renamed(SUSPENSION_FORMS["plan_space_1"],
                            {"block_length_1": "block_length_2"}, "b_2 + 2 c"),
})
