# SPDX-License-Identifier: MIT
"""Worksheet functions of a whole design: the time-domain check and the design chain.

The entries of :mod:`functions.simulation` (the damper simulated on the building mode, its
random response in the frequency domain) and of :mod:`functions.design` (``SWAY_DESIGN``, whose
arguments and fields follow from the declarations of :mod:`functions.quantities`).
"""
from __future__ import annotations

from functions import design, pendulum, quantities, simulation
from functions.catalogue.declaration import (
    FIELDS, NUMBER, REQUIRED, SUMMARY, TEXT, Argument, SheetFunction,
)
from functions.catalogue.mechanics import GRAVITY

__all__ = ["RANDOM_THEORY_FIELDS", "SIMULATION", "design_sheet_functions", "DESIGN"]

_G = pendulum.STANDARD_GRAVITY

#: Numbers of :class:`functions.simulation.RandomTheory`, in its field order (a test checks it).
RANDOM_THEORY_FIELDS = (
    ("displacement_rms", "m", "RMS building displacement, with the damper"),
    ("acceleration_rms", "m/s^2", "RMS building acceleration, with the damper"),
    ("stroke_rms", "m", "RMS stroke of the damper relative to the floor"),
    ("displacement_rms_without_damper", "m", "RMS building displacement without the damper"),
    ("acceleration_rms_without_damper", "m/s^2",
     "RMS building acceleration without the damper"),
    ("effective_damping", "-", "damping ratio of the bare building with the same displacement "
                               "variance"),
    ("displacement_rms_scatter", "-", "relative standard deviation of the displacement RMS "
                                      "from a record of the given duration"),
    ("acceleration_rms_scatter", "-", "the same for the acceleration RMS"),
    ("stroke_rms_scatter", "-", "the same for the stroke RMS"),
)

_SIM_ARGS = (
    Argument("modal_mass", "Modal mass of the building mode, normalised to 1 at the damper, "
             "> 0 [kg].", "kg"),
    Argument("frequency", "Building frequency of the mode, > 0 [Hz].", "Hz"),
    Argument("structural_damping", "Building damping ratio without the damper, 0 to <1 (0.01 "
             "for 1 %) [-].", "-", fraction=True),
    Argument("damper_mass", "Pendulum (damper) mass, > 0 [kg].", "kg"),
    Argument("length", "Hanger length of the pendulum, > 0 [m].", "m"),
    Argument("damper_damping", "Damper damping ratio on its own small-angle frequency, 0 to <1 "
             "[-].", "-", fraction=True),
)

SIMULATION: tuple[SheetFunction, ...] = (
    SheetFunction(
        "SWAY_FORCE_SPECTRUM", simulation.force_spectrum,
        "One-sided power spectral density of the random force model (white noise through a "
        "first-order low-pass filter) [N^2/Hz].",
        "Force spectral density", "N^2/Hz",
        (Argument("frequency", "Frequency at which to evaluate the density, >= 0 [Hz].", "Hz"),
         Argument("rms", "Standard deviation of the force, >= 0 [N].", "N"),
         Argument("corner_frequency", "Corner frequency of the low-pass filter, > 0 [Hz].",
                  "Hz")),
        "simulation", example=(0.2, 5e3, 0.5)),
    SheetFunction(
        "SWAY_SIMULATION_SUMMARY", simulation.simulation_summary,
        "Key numbers of a time-domain simulation of the pendulum damper on the building mode, "
        "exact (nonlinear) and linearised, as a column; labels: SWAY_SIMULATION_FIELDS() [-].",
        "Column of the simulation's key numbers", "-",
        _SIM_ARGS + (
            Argument("load_type", "Load on the building mode: harmonic or random [-].", "-",
                     kind=TEXT, choices=("harmonic", "random")),
            Argument("force", "Force amplitude (harmonic) or standard deviation (random), > 0 "
                     "[N].", "N"),
            Argument("load_frequency", "Forcing frequency (harmonic) or corner frequency of the "
                     "force spectrum (random), > 0 [Hz].", "Hz"),
            Argument("duration", "Record length, > 0 [s]. Empty: 600 s.", "s", default=600.0),
            Argument("seed", "Seed of the random record, a whole number >= 0 [-]. Empty: 0.",
                     "-", default=0, integer=True),
            Argument("tolerance", "Accepted departure of nonlinear from linear RMS response "
                     "[-]. Empty: 0.05.", "-", default=0.05),
            Argument("g", "Acceleration of gravity, > 0 [m/s^2]. Empty: 9.80665 [m/s^2].",
                     "m/s^2", default=_G),
            Argument("velocity_exponent", "Exponent alpha of the dashpot law F = C |v|^alpha, "
                     "in (0, 2] [-]. Empty: 1 (linear).", "-", default=1.0),
            Argument("dashpot_coefficient", "Coefficient C of that law, > 0 [N (s/m)^a]. "
                     "Empty: the linear dashpot of damper_damping.", "N (s/m)^a",
                     default=None)),
        "simulation", kind=SUMMARY, fields=simulation.SUMMARY_FIELDS, slow=True,
        example=(1e6, 0.2, 0.01, 2e4, 6.0, 0.07, "harmonic", 5e3, 0.2, 300.0),
        notes="Takes a second or more per case: a time-domain integration. A row of cases "
              "gives one column per case, a column of cases one row per case."),
    SheetFunction(
        "SWAY_SIMULATION_FIELDS", simulation.simulation_summary,
        "Names and units of the numbers of SWAY_SIMULATION_SUMMARY, as a column of texts "
        "(put it beside the summary) [-].",
        "Column of labels", "-", (), "simulation", kind=FIELDS,
        fields=simulation.SUMMARY_FIELDS, example=()),
    SheetFunction(
        "SWAY_RANDOM_RESPONSE_THEORY", simulation.random_response_theory,
        "Stationary response of the linearised building and damper to the random force "
        "(frequency domain), as a column; labels: SWAY_RANDOM_RESPONSE_FIELDS() [-].",
        "Column of RMS responses and effective damping", "-",
        _SIM_ARGS + (
            Argument("rms", "Standard deviation of the force, > 0 [N].", "N"),
            Argument("corner_frequency", "Corner frequency of the force spectrum, > 0 [Hz].",
                     "Hz"),
            Argument("duration", "Record length for the scatter estimate, > 0 [s]. Empty: "
                     "600 s.", "s", default=600.0),
            Argument("g", "Acceleration of gravity, > 0 [m/s^2]. Empty: 9.80665 [m/s^2].",
                     "m/s^2", default=_G)),
        "simulation", kind=SUMMARY,
        fields=RANDOM_THEORY_FIELDS,
        example=(1e6, 0.2, 0.01, 2e4, 6.0, 0.07, 5e3, 0.5)),
    SheetFunction(
        "SWAY_RANDOM_RESPONSE_FIELDS", simulation.random_response_theory,
        "Names and units of the numbers of SWAY_RANDOM_RESPONSE_THEORY, as a column of texts "
        "[-].",
        "Column of labels", "-", (), "simulation", kind=FIELDS,
        fields=RANDOM_THEORY_FIELDS, example=()),
)


def _design_fields() -> tuple[tuple[str, str, str], ...]:
    """Numbers returned by SWAY_DESIGN: every result of the chain, then the check verdicts."""
    out = [(q.name, q.unit, q.description) for q in quantities.design_results()]
    out += [(f"{rule.name}_ok", "-", f"{rule.label} (1 yes, 0 no)")
            for rule in design.CHECK_RULES]
    out.append(("all_ok", "-", "Every design check passes (1 yes, 0 no)"))
    return tuple(out)


def _design_arguments() -> tuple[Argument, ...]:
    """Arguments of SWAY_DESIGN, one per design input, from :mod:`functions.quantities`."""
    args = []
    for q in quantities.design_inputs():
        default = REQUIRED if q.required else (None if q.optional else q.default)
        args.append(Argument(q.name, q.help_text(), q.unit or "-", default=default,
                             kind=TEXT if q.kind == "choice" else NUMBER, choices=q.choices,
                             fraction=q.kind == "fraction" and q.high <= 1.0))
    # required first (a worksheet function lists them before the optional ones), the design
    # envelope's inputs, then the supply's, last (positional arguments of sheets made before
    # them stay valid)
    later = quantities.ENVELOPE_INPUTS + quantities.SUPPLY_INPUT_NAMES
    return tuple(sorted(args, key=lambda a: (a.optional, a.name in later,
                                             a.name in quantities.SUPPLY_INPUT_NAMES)))


def design_sheet_functions() -> tuple[SheetFunction, ...]:
    """SWAY_PENDULUM_LENGTH, SWAY_DESIGN and SWAY_DESIGN_FIELDS from the current declarations."""
    fields = _design_fields()
    return (
        SheetFunction(
            "SWAY_PENDULUM_LENGTH", pendulum.pendulum_length,
            "Pendulum length in tune at the swing its own stroke causes: L = equivalent length "
            "of f_d at asin(stroke / L) [m].",
            "Pendulum length", "m",
            (Argument("frequency", "Damper frequency the pendulum must have at its design "
                      "swing, > 0 [Hz].", "Hz"),
             Argument("stroke", "Peak horizontal stroke of the mass, >= 0 [m].", "m"),
             GRAVITY),
            "design", example=(0.15, 0.95)),
        SheetFunction(
            "SWAY_DESIGN", design.design_damper,
            "Whole damper design chain for one mode: mass, tuning, damping, stroke, pendulum "
            "length, stiffness, dashpot and checks, as a column; labels: SWAY_DESIGN_FIELDS() "
            "[-].",
            "Column of design results and check verdicts", "-", _design_arguments(), "design",
            kind=SUMMARY, fields=fields, signature_of=design.DesignInputs,
            example=(0.15, 2.0e7, 0.015, 0.25, 0.15, 1.2),
            notes="Check verdicts are 1 (passes) or 0 (fails). A row of cases gives one column "
                  "per case, a column of cases one row per case."),
        SheetFunction(
            "SWAY_DESIGN_FIELDS", design.design_damper,
            "Names and units of the numbers of SWAY_DESIGN, as a column of texts (put it beside "
            "the design) [-].",
            "Column of labels", "-", (), "design", kind=FIELDS, fields=fields,
            signature_of=design.DesignInputs),
    )


DESIGN: tuple[SheetFunction, ...] = design_sheet_functions()
