# SPDX-License-Identifier: MIT
"""Rules between the design inputs, and the groups of inputs the design envelope adds.

A value can be in its own range and still contradict another input: a mass ratio and a damper
mass both given, a practical range upside down, half a frequency band, a second direction
without its modal mass, an extreme wind below the service wind. :func:`input_relation_errors`
states every such rule once; the engine (:class:`functions.design.DesignInputs`) and the
project-file reader (``workbook_builder.project.reader``) apply the same rules, naming the
input to correct. :data:`OPTIONAL_TABLES` lists the project-file tables that are optional as a
whole and the inputs each must hold; :data:`ENVELOPE_INPUTS` the inputs of the design
envelope. Nothing here imports another module of the engine (:mod:`functions.quantities`
re-exports these names).
"""
from __future__ import annotations

from typing import Any, Mapping

__all__ = ["ENVELOPE_INPUTS", "SUPPLY_INPUT_NAMES", "OPTIONAL_TABLES", "input_relation_errors"]

#: Inputs of the design envelope (occupied floor, extreme level, comfort criterion, frequency
#: band, as-built values, second direction), added in swaytune 0.4: a spreadsheet function
#: lists them after the others, so that positional arguments of existing sheets stay valid.
ENVELOPE_INPUTS: tuple[str, ...] = (
    "floor_ordinate", "extreme_acceleration", "return_period", "band_lower", "band_upper",
    "response_exponent", "measured_frequency", "measured_damping", "frequency_2",
    "modal_mass_2", "structural_damping_2", "acceleration_2", "acceleration_limit_2",
    "extreme_acceleration_2")

#: Project-file tables that are optional as a whole, with the inputs a given table must hold:
#: an input of such a table that has a default takes it only when the table is given (else
#: the workbook has no row for it).
OPTIONAL_TABLES: dict[str, tuple[str, ...]] = {
    "band": ("band_lower", "band_upper"), "as_built": ("measured_frequency",),
    "direction_2": ("frequency_2", "modal_mass_2", "structural_damping_2", "acceleration_2",
                    "acceleration_limit_2"),
    "supply": ("hanger_count", "hanger_safety_factor", "hanger_axial_stiffness",
               "block_length_1", "block_length_2", "available_height", "buffer_stiffness")}

#: Inputs of the damper's supply specification (table ``[supply]``), added in swaytune 0.5:
#: a spreadsheet function lists them after the design envelope's.
SUPPLY_INPUT_NAMES: tuple[str, ...] = (
    "velocity_exponent", "dashpot_units", "dashpot_level") + OPTIONAL_TABLES["supply"][:3] + (
    "block_density",) + OPTIONAL_TABLES["supply"][3:]


def input_relation_errors(values: Mapping[str, Any]) -> list[tuple[str, str]]:
    """Rules between inputs, as ``(input name, message)`` for each one broken.

    ``values`` maps glossary names to SI values (None: not given). The project-file reader
    and :class:`DesignInputs` apply the same rules.

    Examples
    --------
    >>> input_relation_errors({"mass_ratio": 0.02, "damper_mass": 1e5})
    [('damper_mass', 'damper_mass=100000.0 and mass_ratio=0.02: give at most one of them')]
    """
    errors = []
    if values.get("damper_mass") is not None and values.get("mass_ratio") is not None:
        errors.append(("damper_mass", f"damper_mass={values['damper_mass']!r} and mass_ratio="
                                      f"{values['mass_ratio']!r}: give at most one of them"))
    band = values.get("band_lower"), values.get("band_upper")
    if (band[0] is None) != (band[1] is None):
        given, missing = ("band_lower", "band_upper") if band[1] is None else \
            ("band_upper", "band_lower")
        errors.append((missing, f"{given}={values[given]!r} needs {missing} too: give both "
                                "ends of the frequency band"))
    elif band[0] is not None and not band[1] > band[0]:
        errors.append(("band_upper", f"band_upper={band[1]!r} must be above band_lower="
                                     f"{band[0]!r} [-] (the band must contain the nominal "
                                     "frequency, factor 1)"))
    n, r = values.get("frequency"), values.get("return_period")
    if r is not None and n is not None and not 0.06 < n < 1.0:
        errors.append(("return_period", f"return_period={r!r} asks for the Melbourne & Palmer "
                                        f"criterion, which holds for 0.06 < f < 1 Hz; the mode "
                                        f"is at frequency={n!r} Hz: leave return_period out"))
    if values.get("measured_damping") is not None and values.get("measured_frequency") is None:
        errors.append(("measured_damping", f"measured_damping={values['measured_damping']!r} "
                                           "needs measured_frequency: give the measured "
                                           "frequency too"))
    second = OPTIONAL_TABLES["direction_2"]
    given = [n for n in second if values.get(n) is not None]
    if given and len(given) < len(second):
        missing = next(n for n in second if values.get(n) is None)
        errors.append((missing, f"{missing} is missing: the second direction needs "
                                f"{', '.join(second)}"))
    supply = OPTIONAL_TABLES["supply"]
    given_supply = [n for n in supply if values.get(n) is not None]
    if given_supply and len(given_supply) < len(supply):
        missing = next(n for n in supply if values.get(n) is None)
        errors.append((missing, f"{missing} is missing: the supply specification needs "
                                f"{', '.join(supply)}"))
    elif given_supply and values.get("extreme_acceleration") is None:
        errors.append(("extreme_acceleration", "extreme_acceleration is missing: the supply "
                       "specification gives the dashpots, hangers and forces at the extreme "
                       "level too; give the extreme level's acceleration ([wind])"))
    for suffix in ("", "_2"):
        x, a = values.get("extreme_acceleration" + suffix), values.get("acceleration" + suffix)
        if x is not None and a is not None and x < a:
            errors.append(("extreme_acceleration" + suffix,
                           f"extreme_acceleration{suffix}={x!r} must not be below "
                           f"acceleration{suffix}={a!r} [m/s^2] (the extreme level is the "
                           "stronger wind)"))
    if given and (values.get("extreme_acceleration") is None) != \
            (values.get("extreme_acceleration_2") is None):
        name = "extreme_acceleration_2" if values.get("extreme_acceleration") is not None \
            else "extreme_acceleration"
        errors.append((name, f"{name} is missing: with two directions give the extreme level "
                             "in both or in neither"))
    elif not given and values.get("extreme_acceleration_2") is not None:
        errors.append(("extreme_acceleration_2", "extreme_acceleration_2="
                       f"{values['extreme_acceleration_2']!r} needs the second direction "
                       f"({', '.join(second)})"))
    if values.get("tuning_method") == "robust":
        if values.get("band_lower") is None:
            errors.append(("tuning_method", "tuning_method='robust' tunes the damper for a "
                                            "frequency band: give band_lower and band_upper"))
        elif values.get("response_exponent") not in (None, 0.0):
            errors.append(("response_exponent", "response_exponent="
                           f"{values['response_exponent']!r} must be 0 with "
                           "tuning_method='robust' (the robust tuning holds the response "
                           "without the damper constant across the band)"))
    lo, hi = values.get("mass_ratio_min"), values.get("mass_ratio_max")
    if lo is not None and hi is not None and not hi > lo:
        errors.append(("mass_ratio_max", f"mass_ratio_max={hi!r} must be above mass_ratio_min="
                                         f"{lo!r} [-]"))
    return errors
