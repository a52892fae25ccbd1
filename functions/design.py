# SPDX-License-Identifier: MIT
"""The whole design chain: from a building mode and a comfort limit to a sized pendulum damper.

:func:`design_damper` takes :class:`DesignInputs` and returns a :class:`DesignResult` holding every
quantity in the engineer's checking order plus the verdict of each design check.
:data:`QUANTITIES` declares, once, the symbol, unit and description of every key of
:meth:`DesignResult.to_dict`; workbook sheets and spreadsheet functions read it from here.

This is a preliminary design aid: results must be checked by a licensed engineer against local
codes, wind-tunnel data and the manufacturer's design.
"""
from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass
from typing import Any, NamedTuple

import numpy as np

from functions._validation import broadcast, check_range, scalar_or_array
from functions.damper import (
    CLOSED_FORM_METHODS,
    OPTIMAL_TUNING_METHODS,
    effective_damping,
    optimal_tuning,
    required_damping,
    required_mass_ratio,
    stroke_ratio,
)
from functions.pendulum import (
    STANDARD_GRAVITY,
    amplitude_detuning,
    equivalent_length,
    small_angle_error,
    swing_angle,
)

__all__ = [
    "CAUTION",
    "Quantity",
    "QUANTITIES",
    "INPUT_NAMES",
    "RESULT_NAMES",
    "CHECK_NAMES",
    "DesignInputs",
    "Check",
    "DesignResult",
    "design_damper",
    "pendulum_length",
]

#: Caution shown with every design output.
CAUTION = ("Preliminary design aid: results must be checked by a licensed engineer against local "
           "codes, wind-tunnel data and the manufacturer's design.")

#: Relative tolerance of the acceleration check: a damper sized to the limit exactly lands on it
#: within rounding.
_ACCELERATION_RTOL = 1e-9


class Quantity(NamedTuple):
    """Metadata of one design quantity."""

    symbol: str
    unit: str
    description: str


#: Every key of :meth:`DesignResult.to_dict`, in order: inputs, results, check verdicts.
#: Units: "-" dimensionless, "" for text and yes/no values.
QUANTITIES: dict[str, Quantity] = {
    # inputs
    "frequency": Quantity("f_s", "Hz", "natural frequency of the structure's mode"),
    "modal_mass": Quantity("M*", "kg",
                           "generalised mass of the mode, mode shape = 1 at the damper"),
    "structural_damping": Quantity("zeta_s", "-", "damping ratio of the mode without the damper"),
    "acceleration": Quantity("a", "m/s^2", "peak acceleration without the damper"),
    "acceleration_limit": Quantity("a_lim", "m/s^2", "acceptable peak acceleration"),
    "tuning_method": Quantity("", "", "optimal tuning method (see OPTIMAL_TUNING_METHODS)"),
    "clearance": Quantity("x_max", "m", "available peak stroke of the damper, one side"),
    "max_swing_deg": Quantity("theta_max", "deg", "largest accepted swing angle"),
    "max_detuning": Quantity("|df/f|_max", "-",
                             "largest accepted frequency shift between small and design swing"),
    "mass_ratio_min": Quantity("mu_min", "-",
                               "smallest practical mass ratio (common practice, no source)"),
    "mass_ratio_max": Quantity("mu_max", "-",
                               "largest practical mass ratio (common practice, no source)"),
    "g": Quantity("g", "m/s^2", "acceleration of gravity"),
    # results, engineer's checking order
    "required_damping": Quantity("zeta_req", "-",
                                 "total damping ratio that brings the resonant response to the "
                                 "limit, zeta_s (a/a_lim)^2"),
    "mass_ratio": Quantity("mu", "-", "damper mass over modal mass"),
    "damper_mass": Quantity("m_d", "kg", "moving mass of the damper"),
    "tuning_ratio": Quantity("f", "-", "damper frequency over structure frequency"),
    "damper_damping": Quantity("zeta_d", "-",
                               "damper damping ratio on the damper's own frequency"),
    "damper_frequency": Quantity("f_d", "Hz", "natural frequency of the damper"),
    "small_angle_length": Quantity("L_0", "m",
                                   "pendulum length tuned to f_d at small swings, g/(2 pi f_d)^2"),
    "effective_damping": Quantity("zeta_eff", "-",
                                  "total damping of the structure with its damper, "
                                  "equivalent in displacement variance under white-noise force"),
    "acceleration_with_damper": Quantity("a_d", "m/s^2",
                                         "peak acceleration with the damper, "
                                         "a sqrt(zeta_s/zeta_eff) (resonant response)"),
    "structure_displacement": Quantity("x_s", "m", "peak displacement of the structure "
                                       "with the damper, a_d/(2 pi f_s)^2"),
    "stroke_ratio": Quantity("x_d/x_s", "-",
                             "RMS damper displacement relative to the structure over RMS "
                             "structure displacement"),
    "stroke": Quantity("x_d", "m", "peak damper displacement relative to the structure"),
    "pendulum_length": Quantity("L", "m", "pendulum length in tune at its design swing"),
    "swing_angle_deg": Quantity("theta", "deg", "design swing angle, asin(x_d/L)"),
    "small_angle_error": Quantity("e", "-",
                                  "exact period over small-angle period minus 1 at the swing"),
    "detuning": Quantity("df/f", "-", "frequency at the design swing over frequency at small "
                         "swings, minus 1"),
    "stiffness": Quantity("k_d", "N/m", "equivalent stiffness of the damper, m_d (2 pi f_d)^2"),
    "dashpot": Quantity("c_d", "N s/m",
                        "damping coefficient of the damper, 2 m_d (2 pi f_d) zeta_d"),
    # check verdicts
    "acceleration_ok": Quantity("", "", "acceleration with damper <= limit"),
    "stroke_ok": Quantity("", "", "peak stroke <= clearance"),
    "swing_ok": Quantity("", "", "swing angle <= accepted maximum"),
    "detuning_ok": Quantity("", "", "|detuning| <= accepted maximum"),
    "mass_ratio_ok": Quantity("", "", "mass ratio within the practical range"),
    "all_ok": Quantity("", "", "every check passes"),
}

INPUT_NAMES = ("frequency", "modal_mass", "structural_damping", "acceleration",
               "acceleration_limit", "damper_mass", "mass_ratio", "tuning_method", "clearance",
               "max_swing_deg", "max_detuning", "mass_ratio_min", "mass_ratio_max", "g")
RESULT_NAMES = ("required_damping", "mass_ratio", "damper_mass", "tuning_ratio",
                "damper_damping", "damper_frequency", "small_angle_length", "effective_damping",
                "acceleration_with_damper", "structure_displacement", "stroke_ratio", "stroke",
                "pendulum_length", "swing_angle_deg", "small_angle_error", "detuning",
                "stiffness", "dashpot")
CHECK_NAMES = ("acceleration", "stroke", "swing", "detuning", "mass_ratio")


# --------------------------------------------------------------------------------------------
# pendulum length in tune at its own swing
# --------------------------------------------------------------------------------------------
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
    >>> from functions.pendulum import equivalent_length, swing_angle
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


# --------------------------------------------------------------------------------------------
# inputs and results
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True, kw_only=True)
class DesignInputs:
    """Inputs of the damper design chain (keyword-only; SI units).

    Parameters
    ----------
    frequency : float
        Natural frequency of the structure's mode, > 0 [Hz].
    modal_mass : float
        Generalised mass M* of the mode normalised to 1 at the damper, > 0 [kg].
    structural_damping : float
        Damping ratio of the mode without the damper, in (0, 0.3] [-].
    acceleration : float
        Peak acceleration without the damper, > 0 [m/s^2].
    acceleration_limit : float
        Acceptable peak acceleration, > 0 [m/s^2].
    damper_mass : float or None, optional
        Damper mass if chosen, > 0 [kg].
    mass_ratio : float or None, optional
        Mass ratio if chosen, > 0; give at most one of damper_mass and mass_ratio, neither to
        use the required mass ratio [-].
    tuning_method : str, optional
        One of OPTIMAL_TUNING_METHODS; default "h2" [-].
    clearance : float
        Available peak stroke of the damper, one side, > 0 [m].
    max_swing_deg : float, optional
        Largest accepted swing angle, in (0, 90) [deg].
    max_detuning : float, optional
        Largest accepted |detuning| between small and design swing, in (0, 1) [-].
    mass_ratio_min : float, optional
        Smallest practical mass ratio, > 0 (common practice, no source) [-].
    mass_ratio_max : float, optional
        Largest practical mass ratio, > mass_ratio_min (common practice, no source) [-].
    g : float, optional
        Acceleration of gravity, > 0 [m/s^2].

    Raises
    ------
    ValueError
        Naming the field, its value and its valid range.
    """

    frequency: float
    modal_mass: float
    structural_damping: float
    acceleration: float
    acceleration_limit: float
    damper_mass: float | None = None
    mass_ratio: float | None = None
    tuning_method: str = "h2"
    clearance: float
    max_swing_deg: float = 15.0
    max_detuning: float = 0.01
    mass_ratio_min: float = 0.005
    mass_ratio_max: float = 0.05
    g: float = STANDARD_GRAVITY

    def __post_init__(self) -> None:
        def scalar(name: str, low: float, high: float = math.inf, *, low_open: bool = True,
                   high_open: bool = False, unit: str) -> None:
            value = getattr(self, name)
            arr = check_range(name, value, low, high, low_open=low_open, high_open=high_open,
                              unit=unit)
            if arr.ndim:
                raise ValueError(f"{name}={value!r} must be a single number")
            object.__setattr__(self, name, float(arr))

        scalar("frequency", 0.0, unit="Hz")
        scalar("modal_mass", 0.0, unit="kg")
        scalar("structural_damping", 0.0, 0.3, unit="-")
        scalar("acceleration", 0.0, unit="m/s^2")
        scalar("acceleration_limit", 0.0, unit="m/s^2")
        if self.damper_mass is not None and self.mass_ratio is not None:
            raise ValueError(f"damper_mass={self.damper_mass!r} and mass_ratio="
                             f"{self.mass_ratio!r}: give at most one of them")
        if self.damper_mass is not None:
            scalar("damper_mass", 0.0, unit="kg")
        if self.mass_ratio is not None:
            scalar("mass_ratio", 0.0, unit="-")
        if self.tuning_method not in OPTIMAL_TUNING_METHODS:
            raise ValueError(f"tuning_method={self.tuning_method!r} must be one of "
                             f"{', '.join(OPTIMAL_TUNING_METHODS)}")
        scalar("clearance", 0.0, unit="m")
        scalar("max_swing_deg", 0.0, 90.0, high_open=True, unit="deg")
        scalar("max_detuning", 0.0, 1.0, high_open=True, unit="-")
        scalar("mass_ratio_min", 0.0, unit="-")
        scalar("mass_ratio_max", self.mass_ratio_min, unit="-")
        scalar("g", 0.0, unit="m/s^2")


@dataclass(frozen=True)
class Check:
    """Verdict of one design check: ``lower <= value <= limit`` (``lower`` None: no floor)."""

    name: str
    value: float
    limit: float
    ok: bool
    text: str
    lower: float | None = None


@dataclass(frozen=True)
class DesignResult:
    """Every quantity of the design chain, in the engineer's checking order.

    Units and descriptions of each field are in :data:`QUANTITIES`.
    """

    inputs: DesignInputs
    required_damping: float
    mass_ratio: float
    damper_mass: float
    tuning_ratio: float
    damper_damping: float
    damper_frequency: float
    small_angle_length: float
    effective_damping: float
    acceleration_with_damper: float
    structure_displacement: float
    stroke_ratio: float
    stroke: float
    pendulum_length: float
    swing_angle_deg: float
    small_angle_error: float
    detuning: float
    stiffness: float
    dashpot: float
    checks: tuple[Check, ...]

    @property
    def ok(self) -> bool:
        """True when every check passes."""
        return all(c.ok for c in self.checks)

    def check(self, name: str) -> Check:
        """The check called ``name`` (one of CHECK_NAMES)."""
        for c in self.checks:
            if c.name == name:
                return c
        raise KeyError(name)

    def to_dict(self) -> dict[str, Any]:
        """Flat dict of inputs, results and check verdicts, keyed as in QUANTITIES.

        ``mass_ratio`` and ``damper_mass`` are the values used by the design (given or
        required), not the optional inputs.
        """
        out: dict[str, Any] = {}
        for name in QUANTITIES:
            if name in RESULT_NAMES:
                out[name] = getattr(self, name)
            elif name.endswith("_ok"):
                out[name] = self.ok if name == "all_ok" else self.check(name[:-3]).ok
            else:
                out[name] = getattr(self.inputs, name)
        return out


def _fmt(x: float) -> str:
    return f"{x:.4g}"


def design_damper(inputs: DesignInputs | None = None, **kwargs: Any) -> DesignResult:
    """Size a pendulum tuned mass damper for one structural mode.

    .. math::

        \\zeta_{req} = \\zeta_s (a / a_{lim})^2,\\quad
        a_d = a\\sqrt{\\zeta_s / \\zeta_{eff}},\\quad
        x_d = \\frac{\\sigma_{x_d - x_s}}{\\sigma_{x_s}} \\frac{a_d}{(2\\pi f_s)^2},\\quad
        L = L_{eq}(f_d, \\arcsin(x_d / L))

    Parameters
    ----------
    inputs : DesignInputs or None, optional
        The design inputs [-].
    **kwargs : Any
        Fields of :class:`DesignInputs`; with ``inputs`` they replace its fields, without it
        they build the inputs [-].

    Returns
    -------
    result : DesignResult
        Every quantity with its unit in :data:`QUANTITIES`, and the checks [-].

    Raises
    ------
    ValueError
        If an input is invalid (naming the field); if neither damper_mass nor mass_ratio is given
        and the structure already meets the limit (no damper is required) or the required mass
        ratio is out of reach; if the stroke cannot be reached by a pendulum of that frequency.

    Notes
    -----
    Chain: required damping (resonant rule, EN 1991-1-4 Annex B) -> mass ratio (given, or the
    smallest whose optimal damper reaches the required damping, :func:`required_mass_ratio`,
    always with the variance-equivalent effective damping) -> tuning (``tuning_method``; the
    closed forms are derived for an undamped structure and are used here as printed, ignoring
    the structure's damping; ``h2`` and ``hinf`` account for it) -> effective damping ->
    acceleration with the damper (resonant rule again) -> structure displacement (harmonic
    relation at f_s) -> stroke (RMS stroke ratio applied to peaks, i.e. equal peak factors) ->
    pendulum length in tune at its own design swing (:func:`pendulum_length`) -> swing angle,
    small-angle error and detuning at that swing (the pendulum runs faster by -detuning at small
    swings) -> stiffness and dashpot. The acceleration check allows a relative 1e-9 for
    rounding, since a damper sized by the required mass ratio meets the limit exactly.

    Preliminary design aid: results must be checked by a licensed engineer against local
    codes, wind-tunnel data and the manufacturer's design.

    Examples
    --------
    Invented scenario: a 0.15 Hz tower mode, M* = 20,000 t, 1.5 % damping, 0.25 m/s^2 peak
    against a 0.15 m/s^2 limit, 1.2 m clearance:

    >>> r = design_damper(frequency=0.15, modal_mass=2.0e7, structural_damping=0.015,
    ...                   acceleration=0.25, acceleration_limit=0.15, clearance=1.2)
    >>> round(r.mass_ratio, 5), round(r.damper_mass / 1e3, 1), round(r.tuning_ratio, 5)
    (0.01435, 287.0, 0.98851)
    >>> round(r.acceleration_with_damper, 6), round(r.stroke, 3), round(r.pendulum_length, 3)
    (0.15, 0.949, 11.288)
    >>> r.ok
    True

    References
    ----------
    1. EN 1991-1-4:2005, Eurocode 1: Actions on structures - Wind actions, Annex B, B.2(6).
    2. G. B. Warburton, Earthquake Eng. Struct. Dyn. 10:381-401, 1982.
    3. Abramowitz & Stegun (1964), §17.2.
    """
    if inputs is None:
        inputs = DesignInputs(**kwargs)
    elif kwargs:
        inputs = dataclasses.replace(inputs, **kwargs)
    elif not isinstance(inputs, DesignInputs):
        raise ValueError(f"inputs={inputs!r} must be a DesignInputs")
    p = inputs
    zs = p.structural_damping
    zeta_req = float(required_damping(p.acceleration, p.acceleration_limit, zs))

    if p.mass_ratio is not None:
        mu = p.mass_ratio
    elif p.damper_mass is not None:
        mu = p.damper_mass / p.modal_mass
    else:
        if p.acceleration <= p.acceleration_limit:
            raise ValueError(
                f"acceleration={p.acceleration!r} is already within acceleration_limit="
                f"{p.acceleration_limit!r} [m/s^2]: no damper is required; give damper_mass or "
                f"mass_ratio to size one anyway")
        try:
            mu = float(required_mass_ratio(zeta_req, zs))
        except ValueError as exc:
            raise ValueError(f"acceleration={p.acceleration!r} against acceleration_limit="
                             f"{p.acceleration_limit!r} [m/s^2] needs required_damping="
                             f"{zeta_req:.4g}: {exc}") from None
    md = mu * p.modal_mass

    tuning_zs = 0.0 if p.tuning_method in CLOSED_FORM_METHODS else zs
    f, zd = optimal_tuning(mu, p.tuning_method, tuning_zs)
    fd = f * p.frequency
    l0 = float(equivalent_length(fd, 0.0, p.g))
    zeff = float(effective_damping(mu, f, zd, zs))
    a_d = p.acceleration * math.sqrt(zs / zeff)
    x_s = a_d / (2.0 * math.pi * p.frequency) ** 2
    ratio = float(stroke_ratio(mu, f, zd, zs))
    stroke = ratio * x_s
    length = float(pendulum_length(fd, stroke, p.g))
    swing = float(swing_angle(stroke, length))
    err = float(small_angle_error(swing))
    det = float(amplitude_detuning(swing))
    omega_d = 2.0 * math.pi * fd

    def rel(ok: bool) -> str:
        return "<=" if ok else ">"

    ok_a = a_d <= p.acceleration_limit * (1.0 + _ACCELERATION_RTOL)
    ok_x = stroke <= p.clearance
    ok_s = swing <= p.max_swing_deg
    ok_d = abs(det) <= p.max_detuning
    ok_m = p.mass_ratio_min <= mu <= p.mass_ratio_max
    checks = (
        Check("acceleration", a_d, p.acceleration_limit, ok_a,
              f"acceleration with damper {_fmt(a_d)} m/s^2 {rel(ok_a)} limit "
              f"{_fmt(p.acceleration_limit)} m/s^2"),
        Check("stroke", stroke, p.clearance, ok_x,
              f"peak stroke {_fmt(stroke)} m {rel(ok_x)} clearance {_fmt(p.clearance)} m"),
        Check("swing", swing, p.max_swing_deg, ok_s,
              f"swing angle {_fmt(swing)} deg {rel(ok_s)} {_fmt(p.max_swing_deg)} deg"),
        Check("detuning", abs(det), p.max_detuning, ok_d,
              f"|detuning| {abs(det):.3%} {rel(ok_d)} {p.max_detuning:.3%}"),
        Check("mass_ratio", mu, p.mass_ratio_max, ok_m,
              f"mass ratio {mu:.3%} {'within' if ok_m else 'outside'} "
              f"{p.mass_ratio_min:.3%} to {p.mass_ratio_max:.3%} (common practice, no source)",
              lower=p.mass_ratio_min),
    )
    return DesignResult(
        inputs=p, required_damping=zeta_req, mass_ratio=mu, damper_mass=md, tuning_ratio=f,
        damper_damping=zd, damper_frequency=fd, small_angle_length=l0, effective_damping=zeff,
        acceleration_with_damper=a_d, structure_displacement=x_s, stroke_ratio=ratio,
        stroke=stroke, pendulum_length=length, swing_angle_deg=swing, small_angle_error=err,
        detuning=det, stiffness=md * omega_d ** 2, dashpot=2.0 * md * omega_d * zd,
        checks=checks)
