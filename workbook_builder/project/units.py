# SPDX-License-Identifier: MIT
"""Input units of project files and workbooks, with exact factors to SI.

Each kind of quantity lists the units a project may use for an input and the factor that
turns a value in that unit into the SI unit the engine takes (``si = value * factor``). The
factors are exact by definition, so a workbook converts with an explicit, visible factor
cell instead of CONVERT (whose pound constants differ between applications by ~1e-7).

Sources: international foot 0.3048 m and avoirdupois pound 0.45359237 kg, exact (international
yard and pound agreement, 1959; NIST SP 811 (2008), Appendix B); standard gravity
9.80665 m/s^2, exact (3rd CGPM, 1901). ``kip`` is accepted as a mass unit in the US practice
of giving masses as weights: the mass that weighs 1 kip (1000 lbf) under standard gravity, i.e.
1000 lb of mass; a workbook shows such values labelled as weights (:func:`us_display`).
``kip s^2/ft`` is the mass on which 1 kip gives 1 ft/s^2 (1000 slug).
"""
from __future__ import annotations

from dataclasses import dataclass

from functions.pendulum import STANDARD_GRAVITY

__all__ = ["Unit", "UNITS", "DEFAULT_UNITS", "SI_UNIT", "unit_for", "US_DISPLAY",
           "KIP_WEIGHT", "KIP_MASS", "us_display", "POUND_FORCE", "WEIGHT_UNIT"]

FOOT = 0.3048
INCH = 0.0254
POUND = 0.45359237
#: The mass that weighs 1 kip under standard gravity [kg] (1000 lb, exact).
KIP_WEIGHT = 1000.0 * POUND
#: 1 kip s^2/ft in kg: 1000 lbf / (1 ft/s^2) = 1000 x 0.45359237 x 9.80665 / 0.3048 (exact).
KIP_MASS = 1000.0 * POUND * STANDARD_GRAVITY / FOOT


#: lbf in N, exact: 0.45359237 kg x 9.80665 m/s^2 (NIST SP 811 (2008) App. B).
POUND_FORCE = POUND * STANDARD_GRAVITY


@dataclass(frozen=True)
class Unit:
    """A unit of a kind of quantity and its exact factor to the SI unit."""

    symbol: str
    factor: float
    source: str


_EXACT_1959 = "exact: 1959 international yard and pound; NIST SP 811 (2008) App. B"

#: kind -> {unit symbol: Unit}; the first unit of each kind is the SI unit.
UNITS: dict[str, dict[str, Unit]] = {
    "frequency": {"Hz": Unit("Hz", 1.0, "SI unit")},
    "mass": {
        "kg": Unit("kg", 1.0, "SI unit"),
        "t": Unit("t", 1000.0, "exact: 1 t = 1000 kg (SI Brochure)"),
        "lb": Unit("lb", POUND, _EXACT_1959),
        "kip": Unit("kip", KIP_WEIGHT, "exact: mass weighing 1 kip under standard "
                    "gravity = 1000 lb; " + _EXACT_1959),
        "kip s^2/ft": Unit("kip s^2/ft", KIP_MASS, "exact: 1 kip / (1 ft/s^2) = 1000 slug; "
                           + _EXACT_1959),
    },
    "fraction": {
        "-": Unit("-", 1.0, "fraction"),
        "%": Unit("%", 0.01, "exact: 1 % = 0.01"),
    },
    "acceleration": {
        "m/s^2": Unit("m/s^2", 1.0, "SI unit"),
        "milli-g": Unit("milli-g", STANDARD_GRAVITY / 1000.0,
                        "exact: g_n = 9.80665 m/s^2 (3rd CGPM 1901)"),
        "ft/s^2": Unit("ft/s^2", FOOT, _EXACT_1959),
    },
    "length": {
        "m": Unit("m", 1.0, "SI unit"),
        "mm": Unit("mm", 0.001, "exact: 1 mm = 0.001 m"),
        "ft": Unit("ft", FOOT, _EXACT_1959),
        "in": Unit("in", INCH, _EXACT_1959),
    },
    "angle": {"deg": Unit("deg", 1.0, "degree (the engine's angle unit)")},
    "time": {"s": Unit("s", 1.0, "SI unit")},
    "count": {"-": Unit("-", 1.0, "a whole number")},
    "return_period": {"years": Unit("years", 1.0, "return period of a wind criterion")},
    "force": {
        "N": Unit("N", 1.0, "SI unit"),
        "kN": Unit("kN", 1000.0, "exact: 1 kN = 1000 N"),
        "MN": Unit("MN", 1e6, "exact: 1 MN = 10^6 N"),
        "kip": Unit("kip", 1000.0 * POUND_FORCE, "exact: 1000 lbf; " + _EXACT_1959),
    },
    "stiffness": {
        "N/m": Unit("N/m", 1.0, "SI unit"),
        "kN/m": Unit("kN/m", 1000.0, "exact: 1 kN/m = 1000 N/m"),
        "kN/mm": Unit("kN/mm", 1e6, "exact: 1 kN/mm = 10^6 N/m"),
        "kip/ft": Unit("kip/ft", 1000.0 * POUND_FORCE / FOOT, _EXACT_1959),
        "kip/in": Unit("kip/in", 1000.0 * POUND_FORCE / INCH, _EXACT_1959),
    },
    "density": {
        "kg/m^3": Unit("kg/m^3", 1.0, "SI unit"),
        "t/m^3": Unit("t/m^3", 1000.0, "exact: 1 t/m^3 = 1000 kg/m^3"),
        "lb/ft^3": Unit("lb/ft^3", POUND / FOOT ** 3, _EXACT_1959),
    },
}

#: The SI (engine) unit of each kind (the first of its units; the same as the engine's
#: declaration, functions.quantities.UNIT_KINDS, which a test checks).
SI_UNIT = {kind: next(iter(units)) for kind, units in UNITS.items()}


#: Unit a bare number in a project file is read in, per unit system and kind.
DEFAULT_UNITS: dict[str, dict[str, str]] = {
    "SI": {"frequency": "Hz", "mass": "kg", "fraction": "-", "acceleration": "m/s^2",
           "length": "m", "angle": "deg", "time": "s", "count": "-",
           "return_period": "years", "force": "N", "stiffness": "N/m",
           "density": "kg/m^3"},
    "US": {"frequency": "Hz", "mass": "kip", "fraction": "-", "acceleration": "ft/s^2",
           "length": "ft", "angle": "deg", "time": "s", "count": "-",
           "return_period": "years", "force": "kip", "stiffness": "kip/ft",
           "density": "lb/ft^3"},
}


def unit_for(kind: str, symbol: str) -> Unit:
    """The :class:`Unit` ``symbol`` of ``kind``.

    Raises
    ------
    ValueError
        When ``symbol`` is not a unit of ``kind``; the message lists the valid ones.

    Examples
    --------
    >>> unit_for("length", "ft").factor
    0.3048
    """
    units = UNITS[kind]
    if symbol not in units:
        raise ValueError(f"unit {symbol!r} is not a {kind} unit; use one of "
                         f"{', '.join(repr(u) for u in units)}")
    return units[symbol]


#: Results shown beside the SI value in US customary projects: SI unit -> (unit, factor).
US_DISPLAY: dict[str, tuple[str, float]] = {
    "kg": ("kip", KIP_WEIGHT),
    "m": ("ft", FOOT),
    "m/s^2": ("milli-g", STANDARD_GRAVITY / 1000.0),
    "N/m": ("kip/ft", 1000.0 * POUND_FORCE / FOOT),
    "N s/m": ("kip s/ft", 1000.0 * POUND_FORCE / FOOT),
    "N": ("kip", 1000.0 * POUND_FORCE),
    "m/s": ("ft/s", FOOT),
    "J": ("kip ft", 1000.0 * POUND_FORCE * FOOT),
    "kg/m^3": ("lb/ft^3", POUND / FOOT ** 3),
    "m^3": ("ft^3", FOOT ** 3),
}

#: Unit text of a mass shown in kip: it is the weight under standard gravity.
WEIGHT_UNIT = "kip (weight)"
#: Quantities (defined names) shown in another US unit than their SI unit's default.
_US_BY_NAME = {"gravity": ("ft/s^2", FOOT)}


def us_display(si_unit: str, name: str = "") -> tuple[str, float]:
    """The US customary unit a workbook shows a value of ``si_unit`` in, and its factor to SI.

    Masses are shown as their weight under standard gravity in kip (the unit text says
    "weight"); the acceleration of gravity (``name`` ``gravity``) in ft/s^2, the building's
    accelerations in milli-g; a unit without a US counterpart (Hz, deg, -, s) is kept, factor 1.

    Examples
    --------
    >>> us_display("kg")
    ('kip (weight)', 453.59237)
    >>> us_display("m/s^2", "gravity")
    ('ft/s^2', 0.3048)
    >>> us_display("Hz")
    ('Hz', 1.0)
    """
    if name in _US_BY_NAME:
        return _US_BY_NAME[name]
    if si_unit == "kg":
        return WEIGHT_UNIT, KIP_WEIGHT
    return US_DISPLAY.get(si_unit, (si_unit, 1.0))
