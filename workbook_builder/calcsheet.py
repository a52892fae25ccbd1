# SPDX-License-Identifier: MIT
"""The calculation steps of a damper design, declared once.

Each :class:`Step` is one row of the Calculation sheet: name (the workbook-scoped defined name
of its cell and, for results, the field of ``functions.design.DesignResult`` it is checked
against), label, symbol, unit, the native worksheet formula, a readable form of the equation
and its source. The builder reads this list to write the Calculation sheet, the defined-name
table, the cached values (by evaluating the formulas) and the engine cross-checks on the Checks
sheet; tests read it to check every formula against the allow-list and against the engine.

Steps are in the order an engineer checks the design: required damping, mass ratio, damper
mass, optimal tuning and damping, damper frequency, effective damping, acceleration with the
damper, displacement and stroke, pendulum length with the swing correction (fixed-point
iteration through the AGM on the Pendulum sheet), swing angle, small-angle error, detuning,
spring stiffness and dashpot constant.

Where no closed form exists (the ``h2``/``hinf`` optima of a damped structure, the required
mass ratio) the step is an :class:`EngineValue`: a visible constant computed by the engine at
build time, with the input values it was computed for and a flag that says when the inputs
have changed since.
"""
from __future__ import annotations

from dataclasses import dataclass, field, replace

__all__ = [
    "Step", "EngineValue", "Section", "DesignCheckRow", "INPUT_NAMES", "sections",
    "design_checks", "AGM_STEPS", "FIXED_POINT_ITERATIONS", "CROSS_CHECK_TOLERANCE",
    "MASS_RATIO_MODES", "mass_ratio_mode", "all_steps",
]

#: AGM iterations per row on the Pendulum sheet (quadratic convergence: 5 are exact in double
#: precision for swings up to 90 deg; computed).
AGM_STEPS = 5
#: Fixed-point iterations of the pendulum length; contraction about theta^2/4 per iteration,
#: so 40 reach 1e-16 for a 60 deg swing and 1e-18 near the 67 deg beyond which no pendulum of
#: that frequency reaches the stroke (functions.design.pendulum_length; computed).
FIXED_POINT_ITERATIONS = 40
#: Largest relative difference accepted between a workbook formula and the engine [-].
CROSS_CHECK_TOLERANCE = 1e-9

#: Defined name of each input's SI cell (keyed by InputSpec.name). Names avoid worksheet
#: function names (FREQUENCY) and anything that reads as a cell address.
INPUT_NAMES = {
    "frequency": "structure_frequency",
    "modal_mass": "modal_mass",
    "structural_damping": "structural_damping",
    "acceleration": "acceleration",
    "acceleration_limit": "acceleration_limit",
    "mass_ratio": "chosen_mass_ratio",
    "damper_mass": "chosen_damper_mass",
    "clearance": "clearance",
    "max_swing_deg": "max_swing_deg",
    "max_detuning": "max_detuning",
    "mass_ratio_min": "mass_ratio_min",
    "mass_ratio_max": "mass_ratio_max",
    "g": "gravity",
}

MASS_RATIO_MODES = ("chosen_mass_ratio", "chosen_damper_mass", "required")


def mass_ratio_mode(project) -> str:
    """How the mass ratio is set: chosen ratio, chosen mass, or the required ratio."""
    if "mass_ratio" in project.inputs:
        return "chosen_mass_ratio"
    if "damper_mass" in project.inputs:
        return "chosen_damper_mass"
    return "required"


@dataclass(frozen=True)
class Step:
    """One formula row of the Calculation sheet.

    ``formula`` refers to inputs and earlier steps by defined name. ``engine`` is the
    DesignResult field the value is cross-checked against (None: a helper cell, checked through
    the results that use it).
    """

    name: str
    label: str
    symbol: str
    unit: str
    formula: str
    expression: str
    source: str = ""
    engine: str | None = None


@dataclass(frozen=True)
class EngineValue:
    """A value without closed form, computed by the engine at build time.

    ``depends_on`` are the defined names whose values at build time are recorded beside it; a
    flag cell compares them with the current values.
    """

    name: str
    label: str
    symbol: str
    unit: str
    engine: str
    depends_on: tuple[str, ...]
    source: str = ""
    expression: str = ""


@dataclass(frozen=True)
class Section:
    title: str
    items: tuple = field(default_factory=tuple)
    note: str = ""


_TWO_PI = "2*PI()"

#: The white-noise variances are I4 integrals (Newland 1993, App. 1), regrouped as in
#: functions.damper.effective_damping so that no large terms cancel: the raw form
#: den / (2 num) loses about -log10(mu) digits; N, D, X keep them (zeta_eff = D / N,
#: stroke ratio = sqrt(X / N)).
_VARIANCE_SOURCE = "I4 integral (Newland 1993, App. 1), regrouped: no cancellation"


def sections(method: str, mode: str) -> tuple[Section, ...]:
    """The Calculation sheet's sections for a tuning ``method`` and mass-ratio ``mode``.

    Parameters
    ----------
    method : str
        Tuning method (``functions.damper.OPTIMAL_TUNING_METHODS``) [-].
    mode : str
        One of :data:`MASS_RATIO_MODES` [-].

    Returns
    -------
    sections : tuple of Section
        In the engineer's checking order [-].
    """
    s1 = Section("1  Damping required", (
        Step("required_damping", "Total damping needed to meet the limit", "zeta_req", "-",
             "=structural_damping*(acceleration/acceleration_limit)^2",
             "zeta_s (a / a_lim)^2",
             "Resonant response ~ 1/sqrt(zeta): EN 1991-1-4:2005 Annex B, B.2(6)",
             "required_damping"),
    ), "Preliminary rule for the resonant part of the response; the background part is not "
       "reduced by a damper.")

    if mode == "chosen_mass_ratio":
        mass_items: tuple = (
            Step("mass_ratio", "Mass ratio", "mu", "-", "=chosen_mass_ratio", "mu (chosen)",
                 "Project input", "mass_ratio"),
            Step("damper_mass", "Damper mass", "m_d", "kg", "=mass_ratio*modal_mass",
                 "mu M*", "", "damper_mass"),
        )
    elif mode == "chosen_damper_mass":
        mass_items = (
            Step("damper_mass", "Damper mass", "m_d", "kg", "=chosen_damper_mass",
                 "m_d (chosen)", "Project input", "damper_mass"),
            Step("mass_ratio", "Mass ratio", "mu", "-", "=damper_mass/modal_mass",
                 "m_d / M*", "", "mass_ratio"),
        )
    else:
        mass_items = (
            EngineValue("mass_ratio", "Mass ratio whose h2-optimal damper gives zeta_req",
                        "mu", "-", "mass_ratio",
                        ("required_damping", "structural_damping"),
                        "Root of zeta_eff(mu) = zeta_req (brentq); "
                        "functions.damper.required_mass_ratio",
                        "zeta_eff(mu, f_opt, zeta_opt, zeta_s) = zeta_req"),
            Step("damper_mass", "Damper mass", "m_d", "kg", "=mass_ratio*modal_mass",
                 "mu M*", "", "damper_mass"),
        )
    s2 = Section("2  Mass ratio and damper mass", mass_items,
                 "M* is the generalised mass of the mode normalised to 1 at the damper.")

    closed = {
        "den_hartog": (
            "=1/(1+mass_ratio)",
            "=SQRT(3*mass_ratio/(8*(1+mass_ratio)))",
            "1 / (1 + mu)", "sqrt(3 mu / (8 (1 + mu)))",
            "Den Hartog (1956) s3.3, damping referred to the damper's own frequency"),
        "harmonic_base": (
            "=SQRT(1-mass_ratio/2)/(1+mass_ratio)",
            "=SQRT(3*mass_ratio/(8*(1+mass_ratio)*(1-mass_ratio/2)))",
            "sqrt(1 - mu/2) / (1 + mu)", "sqrt(3 mu / (8 (1 + mu)(1 - mu/2)))",
            "Warburton (1982), harmonic base acceleration"),
        "white_noise_force": (
            "=SQRT(1+mass_ratio/2)/(1+mass_ratio)",
            "=SQRT(mass_ratio*(1+3*mass_ratio/4)/(4*(1+mass_ratio)*(1+mass_ratio/2)))",
            "sqrt(1 + mu/2) / (1 + mu)", "sqrt(mu (1 + 3 mu/4) / (4 (1 + mu)(1 + mu/2)))",
            "Warburton (1982), white-noise force"),
        "white_noise_base": (
            "=SQRT(1-mass_ratio/2)/(1+mass_ratio)",
            "=SQRT(mass_ratio*(1-mass_ratio/4)/(4*(1+mass_ratio)*(1-mass_ratio/2)))",
            "sqrt(1 - mu/2) / (1 + mu)", "sqrt(mu (1 - mu/4) / (4 (1 + mu)(1 - mu/2)))",
            "Warburton (1982), white-noise base acceleration"),
        "nishihara_asami": (
            "=SQRT(8*(5+3*mass_ratio+2*SQRT(4+3*mass_ratio))/(3*(16+9*mass_ratio+"
            "4*SQRT(4+3*mass_ratio))*(1+mass_ratio)^2))",
            "=SQRT((8+9*mass_ratio-4*SQRT(4+3*mass_ratio))/(1+mass_ratio))/4",
            "sqrt(8 (5 + 3 mu + 2 s) / (3 (16 + 9 mu + 4 s)(1 + mu)^2)), s = sqrt(4 + 3 mu)",
            "sqrt((8 + 9 mu - 4 s) / (1 + mu)) / 4",
            "Nishihara & Asami (2002), exact H-infinity optimum"),
    }
    if method in closed:
        f_formula, z_formula, f_expr, z_expr, src = closed[method]
        tuning: tuple = (
            Step("tuning_ratio", "Optimal tuning ratio", "f", "-", f_formula, f_expr, src,
                 "tuning_ratio"),
            Step("damper_damping", "Optimal damper damping (own frequency)", "zeta_d", "-",
                 z_formula, z_expr, src, "damper_damping"),
        )
    else:
        what = ("minimum displacement variance under white-noise force" if method == "h2"
                else "minimum peak response under harmonic force")
        tuning = (
            EngineValue("tuning_ratio", f"Optimal tuning ratio ({method}: {what})", "f", "-",
                        "tuning_ratio", ("mass_ratio", "structural_damping"),
                        f"functions.damper.optimal_tuning(method='{method}'), numerical; no "
                        "closed form for a damped structure", "numerical optimum"),
            EngineValue("damper_damping", "Optimal damper damping (own frequency)", "zeta_d",
                        "-", "damper_damping", ("mass_ratio", "structural_damping"),
                        f"functions.damper.optimal_tuning(method='{method}')",
                        "numerical optimum"),
            Step("warburton_tuning_ratio", "For comparison: Warburton white-noise-force tuning "
                 "(undamped structure)", "f_W", "-", "=SQRT(1+mass_ratio/2)/(1+mass_ratio)",
                 "sqrt(1 + mu/2) / (1 + mu)", "Warburton (1982); not used further"),
            Step("warburton_damper_damping", "For comparison: Warburton white-noise-force "
                 "damping (undamped structure)", "zeta_W", "-",
                 "=SQRT(mass_ratio*(1+3*mass_ratio/4)/(4*(1+mass_ratio)*(1+mass_ratio/2)))",
                 "sqrt(mu (1 + 3 mu/4) / (4 (1 + mu)(1 + mu/2)))",
                 "Warburton (1982); not used further"),
        )
    tuning = tuning + (
        Step("damper_frequency", "Damper frequency", "f_d", "Hz",
             "=tuning_ratio*structure_frequency", "f f_s", "", "damper_frequency"),
    )
    s3 = Section("3  Optimal tuning and damping", tuning,
                 "Tuning ratio f = f_d / f_s; damper damping zeta_d = c_d / (2 m_d omega_d) on "
                 "the damper's own frequency.")

    s4 = Section("4  Effective damping and response with the damper", (
        Step("var_w", "Helper: w = f^2", "w", "-", "=tuning_ratio^2", "f^2", _VARIANCE_SOURCE),
        Step("var_g", "Helper: g = zeta_d f", "g", "-", "=damper_damping*tuning_ratio",
             "zeta_d f", _VARIANCE_SOURCE),
        Step("var_x", "Helper: X = zeta_s w + g", "X", "-",
             "=structural_damping*var_w+var_g", "zeta_s w + g", _VARIANCE_SOURCE),
        Step("var_y", "Helper: Y = g (1 + mu) + zeta_s", "Y", "-",
             "=var_g*(1+mass_ratio)+structural_damping", "g (1 + mu) + zeta_s",
             _VARIANCE_SOURCE),
        Step("var_t", "Helper: t = (1 + mu) w - 1", "t", "-", "=(1+mass_ratio)*var_w-1",
             "(1 + mu) w - 1", _VARIANCE_SOURCE),
        Step("var_n", "Helper: N (variance numerator)", "N", "-",
             "=var_g*(var_t^2+mass_ratio*var_w)+4*var_g*var_x*var_y"
             "+structural_damping*mass_ratio*var_w^2",
             "g (t^2 + mu w) + 4 g X Y + zeta_s mu w^2", _VARIANCE_SOURCE),
        Step("var_d", "Helper: D (variance denominator)", "D", "-",
             "=mass_ratio*var_g*var_x+structural_damping*mass_ratio*var_w^2*var_y"
             "+structural_damping*var_g*(var_w-1)*var_t+4*structural_damping*var_g*var_x*var_y",
             "mu g X + zeta_s mu w^2 Y + zeta_s g (w - 1) t + 4 zeta_s g X Y",
             _VARIANCE_SOURCE),
        Step("effective_damping", "Effective damping (equal displacement variance)",
             "zeta_eff", "-", "=var_d/var_n", "D / N",
             "functions.damper.effective_damping", "effective_damping"),
        Step("acceleration_with_damper", "Peak acceleration with the damper", "a_d", "m/s^2",
             "=acceleration*SQRT(structural_damping/effective_damping)",
             "a sqrt(zeta_s / zeta_eff)", "Resonant rule, as for zeta_req",
             "acceleration_with_damper"),
        Step("structure_displacement", "Peak displacement of the structure", "x_s", "m",
             f"=acceleration_with_damper/({_TWO_PI}*structure_frequency)^2",
             "a_d / (2 pi f_s)^2", "Harmonic at the mode's frequency",
             "structure_displacement"),
        Step("stroke_ratio", "Stroke ratio (RMS relative / RMS structure)", "r_s", "-",
             "=SQRT(var_x/var_n)", "sqrt(X / N)", "functions.damper.stroke_ratio",
             "stroke_ratio"),
        Step("stroke", "Peak stroke of the damper (relative)", "s", "m",
             "=stroke_ratio*structure_displacement", "(x_d/x_s) x_s", "Equal peak factors",
             "stroke"),
    ), "Variance-equivalent damping of the structure with its damper under white-noise force "
       "(closed form, functions.damper).")

    s5 = Section("5  Pendulum length, swing and detuning", (
        Step("small_angle_length", "Small-angle pendulum length", "L_0", "m",
             f"=gravity/({_TWO_PI}*damper_frequency)^2", "g / (2 pi f_d)^2",
             "Simple pendulum, small swings", "small_angle_length"),
        Step("pendulum_length", "Pendulum length in tune at the design swing", "L", "m",
             "=fixed_point_length", "L = L_0 AGM(1, cos(theta/2))^2, theta = asin(x_d / L)",
             "Exact period T = T_0 / AGM(1, cos(theta/2)) (A&S 17.6; Villarino 2012); "
             "fixed point on the Pendulum sheet", "pendulum_length"),
        Step("swing_angle_deg", "Swing angle at the design stroke", "theta", "deg",
             "=DEGREES(ASIN(stroke/pendulum_length))", "asin(x_d / L)", "",
             "swing_angle_deg"),
        Step("small_angle_error", "Small-angle period error at that swing", "e", "-",
             "=1/agm_at_swing-1", "T / T_0 - 1 = 1 / AGM(1, cos(theta/2)) - 1",
             "A&S 17.6; Pendulum sheet", "small_angle_error"),
        Step("detuning", "Detuning at that swing (f(theta)/f(0) - 1)", "delta", "-",
             "=1/(1+small_angle_error)-1", "1 / (1 + e) - 1",
             "Frequency ratio = period ratio^-1", "detuning"),
    ), "A pendulum cut to L_0 runs slow at a finite swing; L is shorter so that it is in tune "
       "at the design swing (and runs fast at smaller swings).")

    s6 = Section("6  Spring and dashpot equivalents", (
        Step("stiffness", "Equivalent spring stiffness", "k_d", "N/m",
             f"=damper_mass*({_TWO_PI}*damper_frequency)^2", "m_d (2 pi f_d)^2", "",
             "stiffness"),
        Step("dashpot", "Dashpot constant", "c_d", "N s/m",
             f"=2*damper_mass*{_TWO_PI}*damper_frequency*damper_damping",
             "2 m_d (2 pi f_d) zeta_d", "", "dashpot"),
    ))
    return tuple(Section(sec.title, tuple(_engine_metadata(i) for i in sec.items), sec.note)
                 for sec in (s1, s2, s3, s4, s5, s6))


def _engine_metadata(item):
    """Take symbol and unit of an engine-checked quantity from functions.design.QUANTITIES."""
    from functions.design import QUANTITIES
    q = QUANTITIES.get(item.engine) if item.engine else None
    if q is None:
        return item
    return replace(item, symbol=q.symbol, unit=q.unit)


@dataclass(frozen=True)
class DesignCheckRow:
    """One design check: value and limit formulas, verdict rule, engine check it mirrors.

    ``engine_keyword`` is the ``functions.design.Check.name`` it mirrors; ``lower_formula`` a
    lower limit where the check has one.
    """

    label: str
    value_formula: str
    limit_formula: str
    unit: str
    verdict_formula: str
    engine_keyword: str
    rule: str
    lower_formula: str = ""


def design_checks() -> tuple[DesignCheckRow, ...]:
    """Design checks of the Checks sheet (same rules as functions.design)."""
    ok = '"OK","NOT OK"'
    return (
        DesignCheckRow("Acceleration with damper within the limit",
                       "=acceleration_with_damper", "=acceleration_limit", "m/s^2",
                       f"=IF(acceleration_with_damper<=acceleration_limit*(1+1E-9),{ok})",
                       "acceleration", "a_d <= a_lim (1 + 1e-9)"),
        DesignCheckRow("Stroke within the clearance", "=stroke", "=clearance", "m",
                       f"=IF(stroke<=clearance,{ok})", "stroke", "x_d <= x_max"),
        DesignCheckRow("Swing within the accepted angle", "=swing_angle_deg", "=max_swing_deg",
                       "deg", f"=IF(swing_angle_deg<=max_swing_deg,{ok})", "swing",
                       "theta <= theta_max"),
        DesignCheckRow("Detuning within the accepted value", "=ABS(detuning)", "=max_detuning",
                       "-", f"=IF(ABS(detuning)<=max_detuning,{ok})", "detuning",
                       "|df/f| <= |df/f|_max"),
        DesignCheckRow("Mass ratio within the practical range", "=mass_ratio",
                       "=mass_ratio_max", "-",
                       f"=IF(AND(mass_ratio>=mass_ratio_min,mass_ratio<=mass_ratio_max),{ok})",
                       "mass_ratio", "mu_min <= mu <= mu_max", "=mass_ratio_min"),
    )


def all_steps(method: str, mode: str) -> list:
    """Every Step and EngineValue, in sheet order."""
    return [item for sec in sections(method, mode) for item in sec.items]

