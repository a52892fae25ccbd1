# SPDX-License-Identifier: MIT
"""Declaration of every spreadsheet function: name, engine call, help texts, defaults.

One list, read by every medium: :mod:`functions.udf` builds the xlwings wrappers from it (function
wizard description, per-argument help, which arguments are optional), the documentation
generator writes the function reference from it, and the tests check every entry against the
engine. Adding a spreadsheet function is one entry here: :mod:`functions.udf` generates its
wrapper at import.

Conventions of the cells (see docs/spreadsheet_functions.md):

* Every :data:`NUMBER` argument takes a single cell or a range; the result has the broadcast
  shape of the ranges (a column in, a column out; a column and a row give a table).
* A :data:`ROWS` argument reads a whole row (or a single column) as one list of values; a block of
  several rows gives one result per row.
* A :data:`TEXT` argument is one cell holding one of the listed choices.
* A :data:`SUMMARY` function returns a column of named numbers for one case (a row of cases gives
  one column per case, a column of cases one row per case); its :data:`FIELDS` partner returns
  the names and units.
* Optional arguments may be left out or left empty; the default below is used.

No xlwings import here: this module is a plain declaration (and the pure-text generator of the
function reference).
"""
from __future__ import annotations

import inspect
import math
from dataclasses import dataclass
from typing import Any, Callable

from functions import damper, design, pendulum, quantities, simulation, structure

__all__ = [
    "PREFIX", "CATEGORY", "NUMBER", "ROWS", "TEXT", "FLAG", "ELEMENTWISE", "ROW_REDUCE", "LISTS",
    "LOOKUP", "SUMMARY", "FIELDS", "Argument", "SheetFunction", "FUNCTIONS", "BY_NAME",
    "COVERED_ELSEWHERE", "MESSAGES", "python_name", "engine_default", "reference_markdown",
]

#: Our prefix for every worksheet function name.
PREFIX = "SWAY_"
#: Function category shown in the classic add-in's function wizard.
CATEGORY = "swaytune"

# Argument kinds.
NUMBER = "number"   #: a cell or a range, evaluated cell by cell (numpy broadcasting)
ROWS = "rows"       #: a row (or one column) read as one list; a block gives one result per row
TEXT = "text"       #: one cell holding one of ``choices``
FLAG = "flag"       #: one cell: TRUE/FALSE (or 1/0); empty takes the default

# Function kinds.
ELEMENTWISE = "elementwise"   #: result has the broadcast shape of the NUMBER arguments
ROW_REDUCE = "row_reduce"     #: one ROWS argument; one result per row
LISTS = "lists"               #: ROWS arguments read as paired lists (one per level) -> one value
LOOKUP = "lookup"             #: a cell or range of names -> the values of an engine table
SUMMARY = "summary"           #: one case -> a column of named numbers (``fields``)
FIELDS = "fields"             #: no argument -> the names and units of a SUMMARY function

_REQUIRED = object()


@dataclass(frozen=True)
class Argument:
    """One argument of a worksheet function.

    ``name`` is the argument name shown in Excel (and the Python/VBA parameter name of the
    wrapper); ``param`` the engine's parameter name when it differs (a few engine names are VBA
    keywords, e.g. ``time`` and ``error``). ``fraction`` marks a ratio given as a fraction
    (damping ratio, mass ratio): a value of ``1`` or more is refused with a hint that ``0.05``
    means 5 %. ``integer`` marks a whole number (e.g. a random seed), passed on as an int;
    ``position`` a 1-based position in the lists of a :data:`LISTS` function (1 = first cell),
    passed on as the engine's 0-based index.
    """

    name: str
    help: str
    unit: str
    default: Any = _REQUIRED
    kind: str = NUMBER
    param: str | None = None
    choices: tuple[str, ...] = ()
    fraction: bool = False
    integer: bool = False
    position: bool = False

    @property
    def optional(self) -> bool:
        return self.default is not _REQUIRED

    @property
    def engine_param(self) -> str:
        return self.param or self.name


@dataclass(frozen=True)
class SheetFunction:
    """One worksheet function: Excel name, engine callable and the texts of the wizard.

    ``output`` selects one item of an engine result that is a tuple (e.g. the tuning ratio of
    ``optimal_tuning``). A :data:`SUMMARY` function returns the numbers named in ``fields``
    ((name, unit, description) triples, in order) of the engine's result (a dict, or an object
    with those attributes); the :data:`FIELDS` function of the same engine lists them. ``slow``
    marks a function that takes seconds (not evaluated while typing in the function wizard).
    ``example`` holds argument values for the documentation; its result is computed from the
    engine when the reference is generated. ``signature_of`` names the callable whose signature
    lists the engine's keyword arguments when the engine takes ``**kwargs``. A :data:`LOOKUP`
    function reads the engine table ``engine`` (a dict, named ``table``) by its keys.
    """

    name: str
    engine: Callable[..., Any]
    description: str
    result: str
    unit: str
    arguments: tuple[Argument, ...]
    topic: str
    kind: str = ELEMENTWISE
    output: int | None = None
    fields: tuple[tuple[str, str, str], ...] = ()
    slow: bool = False
    example: tuple = ()
    notes: str = ""
    signature_of: Callable[..., Any] | None = None
    table: str = ""

    @property
    def engine_ref(self) -> str:
        """Dotted name of the engine function (or table) behind this worksheet function."""
        if self.kind == LOOKUP:
            return self.table
        return f"{self.engine.__module__}.{self.engine.__name__}"

    @property
    def parameters(self) -> dict[str, inspect.Parameter]:
        """The engine's parameters (of ``signature_of`` for an engine taking ``**kwargs``)."""
        return dict(inspect.signature(self.signature_of or self.engine).parameters)

    @property
    def python_name(self) -> str:
        return python_name(self.name)


def python_name(excel_name: str) -> str:
    """Python (and classic-add-in VBA) name of the wrapper: the Excel name in lower case."""
    return excel_name.lower()


def engine_default(fn: SheetFunction, param: str) -> Any:
    """Default value of ``param`` in the engine's signature (``_REQUIRED`` if none)."""
    p = fn.parameters[param]
    return _REQUIRED if p.default is inspect.Parameter.empty else p.default


# ---------------------------------------------------------------------------------------------
# Argument texts used by several functions (<= 255 characters each, unit in brackets).
_G = pendulum.STANDARD_GRAVITY

LENGTH = Argument(
    "length", "Pendulum length from the pivot to the centre of mass, > 0 [m].", "m")
AMPLITUDE = Argument(
    "amplitude_deg", "Swing amplitude from the vertical, 0 to <180 [deg]. Empty: 0 "
    "(small swings).", "deg", default=0.0)
GRAVITY = Argument(
    "g", "Acceleration of gravity, > 0 [m/s^2]. Empty: standard gravity 9.80665 [m/s^2].",
    "m/s^2", default=_G)

PENDULUM: tuple[SheetFunction, ...] = (
    SheetFunction(
        "SWAY_EXACT_PERIOD", pendulum.exact_period,
        "Exact period of a simple pendulum released at a given swing: T = 4 sqrt(L/g) K(m), "
        "m = sin^2(amplitude/2) [s].",
        "Period of a full swing, there and back", "s",
        (LENGTH, AMPLITUDE, GRAVITY), "pendulum", example=(10.0, 15.0)),
    SheetFunction(
        "SWAY_SMALL_ANGLE_PERIOD", pendulum.small_angle_period,
        "Small-angle period of a simple pendulum, T0 = 2 pi sqrt(L/g) [s].",
        "Period for vanishing swing", "s",
        (LENGTH, GRAVITY), "pendulum", example=(10.0,)),
    SheetFunction(
        "SWAY_SMALL_ANGLE_ERROR", pendulum.small_angle_error,
        "Relative error of the small-angle period at a swing, T/T0 - 1 (0.0043 at 15 deg) [-].",
        "Relative period error T/T0 - 1", "-",
        (Argument("amplitude_deg", "Swing amplitude from the vertical, 0 to <180 [deg].",
                  "deg"),),
        "pendulum", example=(15.0,)),
    SheetFunction(
        "SWAY_AMPLITUDE_FOR_ERROR", pendulum.amplitude_for_error,
        "Swing amplitude at which the small-angle period is wrong by a given relative error "
        "(inverse of SWAY_SMALL_ANGLE_ERROR) [deg].",
        "Swing amplitude", "deg",
        (Argument("period_error", "Accepted relative period error T/T0 - 1, 0 to 10 [-] "
                  "(0.01 for 1 %).", "-", param="error"),),
        "pendulum", example=(0.01,)),
    SheetFunction(
        "SWAY_PENDULUM_FREQUENCY", pendulum.pendulum_frequency,
        "Frequency of free swinging of a simple pendulum at a given swing, 1/T [Hz].",
        "Frequency", "Hz",
        (LENGTH, AMPLITUDE, GRAVITY), "pendulum", example=(10.0, 15.0)),
    SheetFunction(
        "SWAY_EQUIVALENT_LENGTH", pendulum.equivalent_length,
        "Pendulum length whose exact period at the design swing is 1/frequency: the length "
        "that tunes a pendulum damper [m].",
        "Pendulum length", "m",
        (Argument("frequency", "Target frequency, e.g. the damper's tuned frequency, > 0 [Hz].",
                  "Hz"),
         Argument("amplitude_deg", "Design swing at which the pendulum must be in tune, 0 to "
                  "<180 [deg]. Empty: 0 (small swings).", "deg", default=0.0),
         GRAVITY),
        "pendulum", example=(0.2, 5.0)),
    SheetFunction(
        "SWAY_COMPOUND_PENDULUM_LENGTH", pendulum.compound_pendulum_length,
        "Simple-pendulum length of a rigid swinging body, L = I / (m d) [m].",
        "Equivalent simple length", "m",
        (Argument("inertia_about_pivot", "Mass moment of inertia about the pivot axis, at least "
                  "mass * pivot_to_centre^2 [kg m^2].", "kg m^2"),
         Argument("mass", "Total swinging mass, > 0 [kg].", "kg"),
         Argument("pivot_to_centre", "Distance from the pivot to the centre of mass, > 0 [m].",
                  "m")),
        "pendulum", example=(1.5e7, 1.0e5, 10.0)),
    SheetFunction(
        "SWAY_FOLDED_PENDULUM_LENGTH", pendulum.folded_pendulum_length,
        "Equivalent length of a multi-stage (folded) pendulum: the sum of the stage lengths [m]. "
        "A row gives one result; a block gives one result per row.",
        "Equivalent simple length", "m",
        (Argument("stage_lengths", "Hanger length of each stage, > 0 [m]: a row or a column; "
                  "empty cells are skipped.", "m", kind=ROWS),),
        "pendulum", kind=ROW_REDUCE, example=([[4.0, 4.0, 4.0]],)),
    SheetFunction(
        "SWAY_PENDULUM_MOTION", pendulum.pendulum_motion,
        "Exact swing angle of a pendulum released from rest, at a given time (Jacobi "
        "elliptic functions) [deg].",
        "Angle from the vertical", "deg",
        (Argument("elapsed_time", "Time since release, any sign [s].", "s", param="time"),
         LENGTH,
         Argument("amplitude_deg", "Release angle from the vertical, 0 to <180 [deg].", "deg"),
         GRAVITY),
        "pendulum", example=(1.0, 10.0, 15.0)),
    SheetFunction(
        "SWAY_SWING_ANGLE", pendulum.swing_angle,
        "Swing angle of a pendulum whose mass is displaced sideways by a stroke, "
        "asin(stroke/length) [deg].",
        "Swing angle from the vertical", "deg",
        (Argument("stroke", "Horizontal displacement of the mass from rest, 0 to length [m].",
                  "m"),
         LENGTH),
        "pendulum", example=(1.0, 10.0)),
    SheetFunction(
        "SWAY_AMPLITUDE_DETUNING", pendulum.amplitude_detuning,
        "Relative drop of a pendulum's frequency at a swing, f(a)/f(0) - 1, zero or negative "
        "[-].",
        "Relative frequency change", "-",
        (Argument("amplitude_deg", "Swing amplitude from the vertical, 0 to <180 [deg].",
                  "deg"),),
        "pendulum", example=(15.0,)),
)

MASS_RATIO = Argument(
    "mass_ratio", "Damper mass over the generalised modal mass, mu > 0 and < 1 (0.02 for "
    "2 %) [-].", "-", fraction=True)
TUNING_RATIO = Argument(
    "tuning_ratio", "Damper frequency over structure frequency, f > 0 [-].", "-")
DAMPER_DAMPING = Argument(
    "damper_damping", "Damper damping ratio on its own frequency, c_d/(2 m_d omega_d), 0 to <1 "
    "(0.07 for 7 %) [-].", "-", fraction=True)
STRUCTURAL_DAMPING_0 = Argument(
    "structural_damping", "Damping ratio of the structure without the damper, 0 to <1 (0.01 "
    "for 1 %) [-]. Empty: 0.", "-", default=0.0, fraction=True)
_METHOD_HELP = ("Optimum: den_hartog, harmonic_base, white_noise_force, white_noise_base, "
                "nishihara_asami (undamped structure only), h2 or hinf (any structural "
                "damping) [-]. Empty: den_hartog.")
_TUNING_ARGS = (
    Argument("mass_ratio", "Damper mass over the generalised modal mass, mu > 0 and < 1 (0.02 "
             "for 2 %) [-].", "-", fraction=True),
    Argument("method", _METHOD_HELP, "-", default="den_hartog", kind=TEXT,
             choices=damper.OPTIMAL_TUNING_METHODS),
    Argument("structural_damping", "Damping ratio of the structure without the damper, 0 to "
             "0.3 for h2 and hinf, must be 0 for the closed forms [-]. Empty: 0.", "-",
             default=0.0, fraction=True),
)
_EXACT = Argument(
    "exact", "FALSE or empty: the EN 1991-1-4 form delta = 2 pi zeta; TRUE: the exact relation "
    "of a viscously damped oscillator [-].", "-", default=False, kind=FLAG)

STRUCTURE: tuple[SheetFunction, ...] = (
    SheetFunction(
        "SWAY_MODAL_MASS", structure.modal_mass,
        "Generalised (modal) mass of a mode scaled to 1 at the damper's level, "
        "sum(m_i phi_i^2) / phi_damper^2 [kg].",
        "Generalised mass M*", "kg",
        (Argument("floor_masses", "Lumped mass of each level, >= 0 [kg]: a row or a column, one "
                  "cell per level.", "kg", kind=ROWS),
         Argument("mode_shape", "Mode ordinate of each level, any scaling [-]: a row or a column "
                  "beside floor_masses.", "-", kind=ROWS),
         Argument("damper_level", "Position of the damper's level in the lists, 1 = first cell "
                  "[-]. Empty: the last cell (the top, when listed bottom up).", "-",
                  default=-1, integer=True, position=True)),
        "structure", kind=LISTS, example=([[1e6, 1e6, 1e6]], [[0.25, 0.5, 1.0]]),
        notes="Empty cells on the same level of both lists are skipped."),
    SheetFunction(
        "SWAY_POWER_LAW_MODE_SHAPE", structure.power_law_mode_shape,
        "Power-law fundamental mode shape (z/h)^exponent, EN 1991-1-4 Annex F (F.3); 1 at the "
        "top [-].",
        "Mode ordinate", "-",
        (Argument("height", "Height above ground, 0 to building_height [m].", "m"),
         Argument("building_height", "Height of the structure, > 0 [m].", "m"),
         Argument("exponent", "Mode-shape exponent, > 0 [-]: 0.6 slender frames, 1.0 core and "
                  "columns or braced, 1.5 slender cantilevers or concrete cores, 2.0 towers, "
                  "2.5 lattice steel towers.", "-")),
        "structure", example=(100.0, 200.0, 1.5)),
    SheetFunction(
        "SWAY_POWER_LAW_MODAL_MASS", structure.power_law_modal_mass,
        "Generalised mass of a uniform structure with a power-law mode shape, damper at the "
        "top: m h / (2 exponent + 1) [kg].",
        "Generalised mass M*", "kg",
        (Argument("mass_per_height", "Mass per unit height, > 0 [kg/m].", "kg/m"),
         Argument("building_height", "Height of the structure, > 0 [m].", "m"),
         Argument("exponent", "Mode-shape exponent, > 0 (see SWAY_POWER_LAW_MODE_SHAPE) [-].",
                  "-")),
        "structure", example=(2.0e5, 200.0, 1.5)),
    SheetFunction(
        "SWAY_ANNEX_F_FREQUENCY", structure.annex_f_frequency,
        "Preliminary first frequency of a multi-storey building taller than 50 m, 46/h "
        "(EN 1991-1-4 Annex F) [Hz].",
        "Estimated first frequency", "Hz",
        (Argument("building_height", "Height of the building, > 50 [m].", "m"),),
        "structure", example=(230.0,)),
    SheetFunction(
        "SWAY_DAMPING_FROM_LOG_DECREMENT", structure.damping_from_log_decrement,
        "Damping ratio from a logarithmic decrement, delta / (2 pi) (EN 1991-1-4 form) or "
        "exact [-].",
        "Damping ratio", "-",
        (Argument("log_decrement", "Logarithmic decrement ln(x_n / x_n+1), >= 0 [-].", "-"),
         _EXACT),
        "structure", example=(0.05,)),
    SheetFunction(
        "SWAY_LOG_DECREMENT_FROM_DAMPING", structure.log_decrement_from_damping,
        "Logarithmic decrement from a damping ratio, 2 pi zeta (EN 1991-1-4 form) or exact "
        "[-].",
        "Logarithmic decrement", "-",
        (Argument("damping_ratio", "Fraction of critical damping, 0 to <1 (0.01 for 1 %) [-].",
                  "-", fraction=True),
         _EXACT),
        "structure", example=(0.01,)),
    SheetFunction(
        "SWAY_MODE_SHAPE_EXPONENT", structure.MODE_SHAPE_EXPONENTS,
        "Exponent of the power-law mode shape (z/h)^exponent for a type of structure, "
        "EN 1991-1-4 Annex F (F.3) [-].",
        "Mode-shape exponent", "-",
        (Argument("structure_type", "Type of structure (a cell or a range of names) [-]: "
                  + ", ".join(structure.MODE_SHAPE_EXPONENTS) + ".", "-", kind=TEXT,
                  choices=tuple(structure.MODE_SHAPE_EXPONENTS)),),
        "structure", kind=LOOKUP, table="functions.structure.MODE_SHAPE_EXPONENTS",
        example=("tower_or_chimney",)),
    SheetFunction(
        "SWAY_STRUCTURAL_LOG_DECREMENT", structure.STRUCTURAL_LOG_DECREMENTS,
        "Structural logarithmic decrement of a type of building, EN 1991-1-4 Annex F, Table F.2; "
        "damping ratio = decrement / (2 pi) [-].",
        "Logarithmic decrement", "-",
        (Argument("building_type", "Type of building (a cell or a range of names) [-]: "
                  + ", ".join(structure.STRUCTURAL_LOG_DECREMENTS) + ".", "-", kind=TEXT,
                  choices=tuple(structure.STRUCTURAL_LOG_DECREMENTS)),),
        "structure", kind=LOOKUP, table="functions.structure.STRUCTURAL_LOG_DECREMENTS",
        example=("steel_building",)),
)


DAMPER: tuple[SheetFunction, ...] = (
    SheetFunction(
        "SWAY_DAMPER_MASS_RATIO", damper.damper_mass_ratio,
        "Mass ratio of a damper on a structural mode, mu = m_d / M* (M* normalised to a unit "
        "mode ordinate at the damper) [-].",
        "Mass ratio mu", "-",
        (Argument("damper_mass", "Moving mass of the damper, > 0 [kg].", "kg"),
         Argument("modal_mass", "Generalised mass of the mode, normalised to 1 at the damper's "
                  "level, > 0 [kg].", "kg")),
        "damper", example=(300e3, 15e6)),
    SheetFunction(
        "SWAY_OPTIMAL_TUNING_RATIO", damper.optimal_tuning,
        "Optimal tuning ratio f = omega_d / omega_s of a tuned mass damper by a published "
        "optimum (Den Hartog, Warburton, Nishihara-Asami) or numerically (h2, hinf) [-].",
        "Optimal tuning ratio f", "-", _TUNING_ARGS, "damper", output=0,
        example=(0.02, "h2", 0.01)),
    SheetFunction(
        "SWAY_OPTIMAL_DAMPER_DAMPING", damper.optimal_tuning,
        "Optimal damper damping ratio on the damper's own frequency, c_d / (2 m_d omega_d), "
        "by a published optimum or numerically (h2, hinf) [-].",
        "Optimal damper damping ratio", "-", _TUNING_ARGS, "damper", output=1,
        example=(0.02, "h2", 0.01)),
    SheetFunction(
        "SWAY_DISPLACEMENT_VARIANCE_RATIO", damper.displacement_variance_ratio,
        "Structure displacement variance under white-noise force, normalised by "
        "pi S0 omega_s / k_s^2 (1/(2 zeta) for a bare structure) [-].",
        "Normalised displacement variance", "-",
        (MASS_RATIO, TUNING_RATIO, DAMPER_DAMPING, STRUCTURAL_DAMPING_0), "damper",
        example=(0.02, 0.985, 0.07, 0.01)),
    SheetFunction(
        "SWAY_EFFECTIVE_DAMPING", damper.effective_damping,
        "Effective damping of a structure with its damper: the damping ratio of the bare "
        "structure with the same displacement variance under white-noise force [-].",
        "Effective damping ratio", "-",
        (MASS_RATIO, TUNING_RATIO, DAMPER_DAMPING, STRUCTURAL_DAMPING_0), "damper",
        example=(0.02, 0.985, 0.07, 0.01)),
    SheetFunction(
        "SWAY_STROKE_RATIO", damper.stroke_ratio,
        "RMS damper displacement relative to the structure over RMS structure displacement, "
        "under white-noise force [-].",
        "Stroke ratio", "-",
        (MASS_RATIO, TUNING_RATIO, DAMPER_DAMPING, STRUCTURAL_DAMPING_0), "damper",
        example=(0.02, 0.985, 0.07, 0.01)),
    SheetFunction(
        "SWAY_REQUIRED_DAMPING", damper.required_damping,
        "Total damping that brings a resonant acceleration down to a limit, "
        "zeta_s (a / a_lim)^2 (resonant response only) [-].",
        "Required total damping ratio", "-",
        (Argument("acceleration", "Peak (or RMS) acceleration without the damper, > 0 "
                  "[m/s^2].", "m/s^2"),
         Argument("acceleration_limit", "Acceptable peak (or RMS, consistently) acceleration, "
                  "> 0 [m/s^2].", "m/s^2"),
         Argument("structural_damping", "Damping ratio of the structure without the damper, "
                  "> 0 and < 1 (0.015 for 1.5 %) [-].", "-", fraction=True)),
        "damper", example=(0.25, 0.15, 0.015)),
    SheetFunction(
        "SWAY_REQUIRED_MASS_RATIO", damper.required_mass_ratio,
        "Smallest mass ratio whose damper, tuned by the method (h2 unless given), gives a "
        "target total (effective) damping; 0 when the structure alone has it [-].",
        "Required mass ratio", "-",
        (Argument("total_damping", "Target effective damping ratio, > 0 and < 1 (0.04 for "
                  "4 %) [-].", "-", fraction=True),
         Argument("structural_damping", "Damping ratio of the structure without the damper, "
                  "0 to 0.3 [-]. Empty: 0.", "-", default=0.0, fraction=True),
         Argument("method", "Tuning method, as the design applies it (a closed form tuned for "
                  "an undamped structure; h2, hinf for the damped one) [-]. Empty: h2.", "-",
                  default="h2", kind=TEXT, choices=damper.OPTIMAL_TUNING_METHODS)),
        "damper", example=(0.04, 0.01)),
    SheetFunction(
        "SWAY_PEAK_FACTOR", damper.peak_factor,
        "Davenport's peak factor: expected largest value over RMS of a random response, "
        "sqrt(2 ln nuT) + 0.5772/sqrt(2 ln nuT) [-].",
        "Peak factor", "-",
        (Argument("frequency", "Mean up-crossing rate, for a resonant response the natural "
                  "frequency, > 0 [Hz].", "Hz"),
         Argument("duration", "Averaging time, frequency * duration > e [s]. Empty: 600 s.",
                  "s", default=600.0)),
        "damper", example=(0.2,)),
    SheetFunction(
        "SWAY_FREQUENCY_RESPONSE", damper.frequency_response,
        "Dynamic amplification |x_s / x_static| of a structure under a harmonic force, with "
        "a damper or bare (mass_ratio 0) [-].",
        "Dynamic amplification", "-",
        (Argument("frequency_ratio", "Forcing frequency over the structure's frequency, >= 0 "
                  "[-].", "-"),
         Argument("mass_ratio", "Damper mass over the generalised modal mass, 0 to <1 [-]. "
                  "Empty: 0 (bare structure).", "-", default=0.0, fraction=True),
         Argument("tuning_ratio", "Damper frequency over structure frequency, > 0 [-]. "
                  "Empty: 1.", "-", default=1.0),
         Argument("damper_damping", "Damper damping ratio on its own frequency, 0 to <1 [-]. "
                  "Empty: 0.", "-", default=0.0, fraction=True),
         Argument("structural_damping", "Damping ratio of the structure, 0 to <1 [-]. Empty: "
                  "0.02.", "-", default=0.02, fraction=True)),
        "damper", example=(1.0, 0.02, 0.98, 0.086, 0.0)),
)


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
                     "m/s^2", default=_G)),
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
        default = _REQUIRED if q.required else (None if q.optional else q.default)
        args.append(Argument(q.name, q.help_text(), q.unit or "-", default=default,
                             kind=TEXT if q.kind == "choice" else NUMBER, choices=q.choices,
                             fraction=q.kind == "fraction" and q.high <= 1.0))
    # required first (a worksheet function lists them before the optional ones)
    return tuple(sorted(args, key=lambda a: a.optional))


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

#: Every worksheet function, in documentation order.
FUNCTIONS: tuple[SheetFunction, ...] = (PENDULUM + STRUCTURE + DAMPER + SIMULATION
                                        + DESIGN)

#: Excel name -> declaration.
BY_NAME: dict[str, SheetFunction] = {f.name: f for f in FUNCTIONS}

#: Public engine functions with no worksheet function of their own, and why.
COVERED_ELSEWHERE: dict[str, str] = {
    "functions.study.design_table":
        "a table of whole designs over input arrays, for scripts; in a sheet, SWAY_DESIGN "
        "copied down rows of inputs gives one design per row",
    "functions.design.design_tuning":
        "the optimum as the design chain applies it; SWAY_OPTIMAL_TUNING_RATIO and "
        "SWAY_OPTIMAL_DAMPER_DAMPING give it (structural_damping 0 for a closed form)",
    "functions.simulation.simulate":
        "returns time histories and result objects; SWAY_SIMULATION_SUMMARY gives its key "
        "numbers",
    "functions.simulation.retune_for_swing":
        "takes load objects and returns two full simulations; a script-level tool, not a cell "
        "formula",
    "functions.simulation.calibrated_load":
        "returns a load object for simulate (the workbook builder's Nonlinear sheet); "
        "SWAY_RANDOM_RESPONSE_THEORY and SWAY_PEAK_FACTOR give its numbers in cells",
    "functions.simulation.hanger_damping":
        "one product and quotient, zeta_d f_d / f_L, used by the workbook builder to pass the "
        "designed dashpot to simulate",
    **{f"functions.envelope.{name}": "frequency band (issue 12): its worksheet functions come "
       "with the band's workbook section" for name in (
           "detuned_effective_damping", "detuned_acceleration", "band_worst_case",
           "robust_tuning", "band_mass_ratio", "hanger_adjustment", "as_built_retune")},
}

#: Messages a worksheet function returns instead of a result: (function, arguments, message,
#: meaning). Rendered into the guide and checked one by one by tests/test_udf.py.
MESSAGES: tuple[tuple[str, tuple, str, str], ...] = (
    ("SWAY_EXACT_PERIOD", (-2.0,), "length=-2.0 must be in (0, inf) [m]",
     "A value outside its valid range: the argument, the value and the range, with its unit."),
    ("SWAY_EXACT_PERIOD", ("ten",), "length='ten' must be a finite number",
     "Text, TRUE/FALSE or an error value such as #DIV/0! where a number belongs."),
    ("SWAY_EXACT_PERIOD", ("#DIV/0!",), "length='#DIV/0!' must be a finite number",
     "An input cell holds an error value (here typed as text; in a sheet, e.g. a cell with "
     "=1/0): fix that cell first."),
    ("SWAY_EFFECTIVE_DAMPING", (0.02, 0.985, 7.0),
     "damper_damping=7.0 must be in [0, 1) [-]: give a fraction, e.g. 0.05 for 5 % "
     "(percent is not accepted)",
     "A damping or mass ratio of 1 or more: ratios are fractions, not percentages."),
    ("SWAY_OPTIMAL_TUNING_RATIO", (0.02, "best"),
     "method='best' must be one of: " + ", ".join(damper.OPTIMAL_TUNING_METHODS),
     "A text argument that is not one of its choices (case and spaces do not matter)."),
    ("SWAY_OPTIMAL_TUNING_RATIO", (0.02, "den_hartog", 0.01),
     "structural_damping=0.01 must be 0 for method='den_hartog' (a closed form for an undamped "
     "structure); use method='h2' or 'hinf' for a damped structure",
     "A closed-form optimum asked for a damped structure."),
    ("SWAY_EXACT_PERIOD", ([[1.0, 2.0, 3.0]], [[0.0, 10.0]]),
     "ranges do not match: length (1x3), amplitude_deg (1x2); give ranges of the same size, or "
     "one cell, one row or one column",
     "Ranges of different sizes that cannot be paired cell by cell."),
    ("SWAY_AMPLITUDE_FOR_ERROR", (11.0,), "period_error=11.0 must be in [0, 10]",
     "A value outside its valid range (an argument without a unit has none in brackets)."),
    ("SWAY_DISPLACEMENT_VARIANCE_RATIO", (0.02, 0.985, 0.0, 0.0),
     "SWAY_DISPLACEMENT_VARIANCE_RATIO: no finite result for these inputs",
     "The inputs are valid but the result is infinite (here: nothing is damped)."),
)

TOPICS = {
    "pendulum": "Pendulum",
    "structure": "Structure",
    "damper": "Damper",
    "simulation": "Simulation",
    "design": "Design chain",
}


# ---------------------------------------------------------------------------------------------
# Function reference (Markdown), generated from the declaration above.

def _fmt_value(value: Any) -> str:
    if value is None:
        return "none"
    if isinstance(value, bool):
        return "FALSE" if not value else "TRUE"
    if isinstance(value, str):
        return f'"{value}"'
    if isinstance(value, float):
        if math.isfinite(value) and value == int(value) and abs(value) < 1e15:
            return f"{value:.1f}" if abs(value) < 1e6 else f"{value:g}"
        return f"{value:.6g}"
    return str(value)


def _example_formula(fn: SheetFunction, args: tuple | None = None) -> str:
    parts = []
    for value in (fn.example if args is None else args):
        if isinstance(value, list):
            parts.append("{" + ";".join(",".join(_fmt_value(v) for v in row)
                                        for row in value) + "}")
        else:
            parts.append(_fmt_value(value))
    return f"={fn.name}({', '.join(parts)})"


def reference_markdown(evaluate: Callable[[SheetFunction, tuple], Any] | None = None) -> str:
    """Function reference in Markdown, one section per worksheet function.

    ``evaluate(fn, example_args)`` computes each example's result (the spreadsheet wrapper);
    without it the examples are listed without results.
    """
    out = ["| Function | Result | Unit |", "| --- | --- | --- |"]
    for fn in FUNCTIONS:
        out.append(f"| [`{fn.name}`](#{fn.name.lower()}) | {_cell(fn.result)} | {fn.unit} |")
    for topic, title in TOPICS.items():
        fns = [fn for fn in FUNCTIONS if fn.topic == topic]
        if not fns:
            continue
        out += ["", f"### {title}"]
        for fn in fns:
            signature = ", ".join(f"[{a.name}]" if a.optional else a.name
                                  for a in fn.arguments)
            out += ["", f"#### {fn.name}", "", f"`{fn.name}({signature})`", "", fn.description,
                    ""]
            if fn.arguments:
                out += ["| Argument | Optional | Default | Help |", "| --- | --- | --- | --- |"]
            else:
                out += ["No arguments."]
            for a in fn.arguments:
                default = ""
                if a.optional:
                    default = "last" if a.position else _fmt_value(a.default)
                help_text = a.help
                if a.choices:
                    help_text += " Choices: " + ", ".join(f"`{c}`" for c in a.choices) + "."
                out.append(f"| `{a.name}` | {'yes' if a.optional else 'no'} | {default} | "
                           f"{_cell(help_text)} |")
            out += ["", f"Returns: {fn.result} [{fn.unit}]. Engine: "
                        f"`{fn.engine_ref}`"
                        + (f", item {fn.output} of its result" if fn.output is not None else "")
                        + "."]
            if fn.kind == SUMMARY:
                out += ["", "| Row | Quantity | Unit | Meaning |", "| --- | --- | --- | --- |"]
                out += [f"| {k} | `{n}` | {u} | {_cell(t)} |"
                        for k, (n, u, t) in enumerate(fn.fields, 1)]
            if fn.notes:
                out += ["", fn.notes]
            if fn.example:
                line = f"Example: `{_example_formula(fn)}`"
                if evaluate is not None:
                    line += f" gives {_fmt_result(evaluate(fn, fn.example))}"
                out += ["", line + "."]
    out += ["", "### Messages", "",
            "A cell shows one of these texts instead of a number when an input is wrong. A bad "
            "cell in a range gives its message in its own result cell; the other cells are "
            "computed. Text in a chain of formulas makes every dependent formula fail visibly.",
            "", "| Example | Message | Meaning |", "| --- | --- | --- |"]
    for name, args, message, meaning in MESSAGES:
        call = _example_formula(BY_NAME[name], args)
        out.append(f"| `{call}` | `{_cell(message)}` | {_cell(meaning)} |")
    return "\n".join(out) + "\n"


def _cell(text: str) -> str:
    """Text safe inside a Markdown table cell."""
    return text.replace("|", "\\|")


def _fmt_result(value: Any) -> str:
    if isinstance(value, list):
        return "the array `" + "; ".join(
            ", ".join(_fmt_result_cell(c) for c in row) for row in value) + "`"
    return f"`{_fmt_result_cell(value)}`"


def _fmt_result_cell(value: Any) -> str:
    if isinstance(value, float):
        return f"{value:.6g}"
    if value is None:
        return "(empty)"
    return str(value)
