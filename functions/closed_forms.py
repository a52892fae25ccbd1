# SPDX-License-Identifier: MIT
"""Closed-form optima of a tuned mass damper, each beside its worksheet formula.

The published optimum tuning ratio f = omega_d / omega_s and damper damping ratio
zeta_d = c_d / (2 m_d omega_d) (on the damper's OWN frequency, Warburton's convention) for an
UNDAMPED structure, as numpy twins of the mass ratio mu that carry their native worksheet
formula (:func:`functions.worksheet.twin`): the engine
(:func:`functions.damper.optimal_tuning`) and a workbook's Calculation sheet evaluate the same
declaration. Den Hartog prints the damping on the structure's frequency,
sqrt(3 mu / (8 (1+mu)^3)); divided by f = 1/(1+mu) it is referred to the damper's own frequency.

Sources: J. P. Den Hartog, Mechanical Vibrations, 4th ed., 1956, §3.3; G. B. Warburton,
Earthquake Eng. Struct. Dyn. 10:381-401, 1982; O. Nishihara, T. Asami, J. Vib. Acoust.
124(4):576-582, 2002.
"""
from __future__ import annotations

import numpy as np

from functions.worksheet import twin

__all__ = ["CLOSED_FORMS", "CLOSED_FORM_METHODS"]


def _form(formula: str, expression: str, source: str, compute):
    return twin(formula, compute, expression, source)


_DEN_HARTOG = "Den Hartog (1956) §3.3, damping referred to the damper's own frequency"
_WARBURTON_HB = "Warburton (1982), harmonic base acceleration"
_WARBURTON_WF = "Warburton (1982), white-noise force"
_WARBURTON_WB = "Warburton (1982), white-noise base acceleration"
_NISHIHARA_ASAMI = "Nishihara & Asami (2002), exact H-infinity optimum"

#: Method -> (tuning ratio, damper damping), each a numpy twin of the mass ratio.
CLOSED_FORMS: dict[str, tuple] = {
    "den_hartog": (
        _form("=1/(1+mass_ratio)", "1 / (1 + mu)", _DEN_HARTOG,
              lambda mass_ratio: 1.0 / (1.0 + mass_ratio)),
        _form("=SQRT(3*mass_ratio/(8*(1+mass_ratio)))", "sqrt(3 mu / (8 (1 + mu)))",
              _DEN_HARTOG,
              lambda mass_ratio: np.sqrt(3.0 * mass_ratio / (8.0 * (1.0 + mass_ratio))))),
    "harmonic_base": (
        _form("=SQRT(1-mass_ratio/2)/(1+mass_ratio)", "sqrt(1 - mu/2) / (1 + mu)",
              _WARBURTON_HB,
              lambda mass_ratio: np.sqrt(1.0 - mass_ratio / 2.0) / (1.0 + mass_ratio)),
        _form("=SQRT(3*mass_ratio/(8*(1+mass_ratio)*(1-mass_ratio/2)))",
              "sqrt(3 mu / (8 (1 + mu)(1 - mu/2)))", _WARBURTON_HB,
              lambda mass_ratio: np.sqrt(3.0 * mass_ratio / (
                  8.0 * (1.0 + mass_ratio) * (1.0 - mass_ratio / 2.0))))),
    "white_noise_force": (
        _form("=SQRT(1+mass_ratio/2)/(1+mass_ratio)", "sqrt(1 + mu/2) / (1 + mu)",
              _WARBURTON_WF,
              lambda mass_ratio: np.sqrt(1.0 + mass_ratio / 2.0) / (1.0 + mass_ratio)),
        _form("=SQRT(mass_ratio*(1+3*mass_ratio/4)/(4*(1+mass_ratio)*(1+mass_ratio/2)))",
              "sqrt(mu (1 + 3 mu/4) / (4 (1 + mu)(1 + mu/2)))", _WARBURTON_WF,
              lambda mass_ratio: np.sqrt(mass_ratio * (1.0 + 3.0 * mass_ratio / 4.0) / (
                  4.0 * (1.0 + mass_ratio) * (1.0 + mass_ratio / 2.0))))),
    "white_noise_base": (
        _form("=SQRT(1-mass_ratio/2)/(1+mass_ratio)", "sqrt(1 - mu/2) / (1 + mu)",
              _WARBURTON_WB,
              lambda mass_ratio: np.sqrt(1.0 - mass_ratio / 2.0) / (1.0 + mass_ratio)),
        _form("=SQRT(mass_ratio*(1-mass_ratio/4)/(4*(1+mass_ratio)*(1-mass_ratio/2)))",
              "sqrt(mu (1 - mu/4) / (4 (1 + mu)(1 - mu/2)))", _WARBURTON_WB,
              lambda mass_ratio: np.sqrt(mass_ratio * (1.0 - mass_ratio / 4.0) / (
                  4.0 * (1.0 + mass_ratio) * (1.0 - mass_ratio / 2.0))))),
    "nishihara_asami": (
        _form("=SQRT(8*(5+3*mass_ratio+2*SQRT(4+3*mass_ratio))/(3*(16+9*mass_ratio+"
              "4*SQRT(4+3*mass_ratio))*(1+mass_ratio)^2))",
              "sqrt(8 (5 + 3 mu + 2 s) / (3 (16 + 9 mu + 4 s)(1 + mu)^2)), s = sqrt(4 + 3 mu)",
              _NISHIHARA_ASAMI,
              lambda mass_ratio: np.sqrt(8.0 * (5.0 + 3.0 * mass_ratio + 2.0 * np.sqrt(
                  4.0 + 3.0 * mass_ratio)) / (3.0 * (16.0 + 9.0 * mass_ratio + 4.0 * np.sqrt(
                      4.0 + 3.0 * mass_ratio)) * (1.0 + mass_ratio) ** 2))),
        _form("=SQRT((8+9*mass_ratio-4*SQRT(4+3*mass_ratio))/(1+mass_ratio))/4",
              "sqrt((8 + 9 mu - 4 s) / (1 + mu)) / 4", _NISHIHARA_ASAMI,
              lambda mass_ratio: 0.25 * np.sqrt((8.0 + 9.0 * mass_ratio - 4.0 * np.sqrt(
                  4.0 + 3.0 * mass_ratio)) / (1.0 + mass_ratio)))),
}

#: Closed-form optima, derived for an UNDAMPED structure (structural_damping must be 0).
CLOSED_FORM_METHODS = tuple(CLOSED_FORMS)
