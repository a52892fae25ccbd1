# SPDX-License-Identifier: MIT
"""The design chain as declared steps, each closed form beside its worksheet formula.

A :class:`Step` computes one cell of the calculation, named by the quantity it computes
(:mod:`functions.quantities`; the name is the workbook's defined name), from cells computed
before it. Most steps are closed forms: their ``compute`` is a numpy twin carrying the native
worksheet formula the workbook writes (:func:`functions.worksheet.twin`), so the engine
(:func:`functions.design.design_damper`) and the workbook evaluate one declaration. Where no
closed form exists (the required mass ratio, the numerical h2 and hinf optima) the step is an
engine value: the workbook shows the engine's number and flags it when its inputs change. The
required mass ratio is solved for the chain's own tuning method, the damper tuned as the chain
tunes it (a closed form as printed, i.e. ignoring the structure's damping; h2 and hinf for the
damped structure), so the required damper meets the limit whatever the method. Two
steps run through helper cells of the Pendulum sheet in a workbook (the pendulum length's fixed
point and the AGM of the swing); their ``formula`` names that helper and the engine computes
them exactly (:func:`functions.pendulum.pendulum_length`,
:func:`functions.pendulum.small_angle_error`).

Steps are in the order an engineer checks the design: required damping, mass ratio, damper
mass, optimal tuning and damping, damper frequency, effective damping, acceleration with the
damper, displacement and stroke, pendulum length with the swing correction, swing angle,
small-angle error, detuning, spring stiffness and dashpot constant. :func:`sections` gives them
for a tuning method and a way of setting the mass ratio (:data:`MASS_RATIO_MODES`).
"""
from __future__ import annotations

import functools
import inspect
from typing import Any, Callable

import numpy as np

from functions.chain_supply import supply_sections
from functions.damper import (CLOSED_FORMS, MIN_NUMERICAL_MASS_RATIO, OPTIMAL_TUNING_METHODS,
                              effective_damping, optimal_tuning,
                              required_mass_ratio)
from functions.directions import DIRECTION_FORMS, spring_pendulum_frequency
from functions.envelope import BAND_METHODS, band_mass_ratio, band_worst_case, robust_tuning
from functions.levels import LEVEL_FORMS
from functions.pendulum import pendulum_length, small_angle_error
from functions.steps import Section, Step, closed_form as _step, engine_value as _engine, \
    from_form as _as_step, second_of
from functions.worksheet import renamed, twin

__all__ = ["Step", "Section", "MASS_RATIO_MODES", "mass_ratio_mode", "sections", "steps",
           "all_variants", "VARIANCE_SOURCE", "SMALL_SWING_ERROR", "PARTS", "parts_of",
           "engine_flag_names", "valid_parts", "PART_SETS"]

#: How the mass ratio is set: a chosen ratio, a chosen damper mass, or the required ratio.
MASS_RATIO_MODES = ("chosen_mass_ratio", "chosen_damper_mass", "required")

#: Optional parts of the calculation, each present when its inputs are given: the frequency
#: band (``band_lower``, ``band_upper``), the as-built retune (``measured_frequency``) and the
#: measured damping it uses (``measured_damping``).
#: ``supply`` (the table ``[supply]``: dashpots, hangers, block, space, forces) with
#: ``dashpots_at_extreme`` when its dashpots are set at the extreme level.
PARTS = ("band", "as_built", "measured_damping", "extreme", "comfort", "direction_2", "supply",
         "dashpots_at_extreme")

#: Source of the white-noise variance steps.
VARIANCE_SOURCE = "I4 integral (Newland 1993, App. 1), regrouped: no cancellation"


def mass_ratio_mode(mass_ratio_given: bool, damper_mass_given: bool) -> str:
    """One of :data:`MASS_RATIO_MODES` from which of the two optional inputs is given."""
    if mass_ratio_given:
        return "chosen_mass_ratio"
    if damper_mass_given:
        return "chosen_damper_mass"
    return "required"


def parts_of(values: Any) -> tuple[str, ...]:
    """The optional parts of the calculation (:data:`PARTS`) that the inputs ask for.

    ``values`` maps glossary names of the design inputs to their values (None or absent: not
    given).

    Examples
    --------
    >>> parts_of({"band_lower": 0.9, "band_upper": 1.1, "measured_frequency": None})
    ('band',)
    """
    given = {"band": values.get("band_lower") is not None,
             "as_built": values.get("measured_frequency") is not None,
             "measured_damping": values.get("measured_damping") is not None,
             "extreme": values.get("extreme_acceleration") is not None,
             "comfort": values.get("return_period") is not None,
             "direction_2": values.get("frequency_2") is not None,
             "supply": values.get("hanger_count") is not None,
             "dashpots_at_extreme": values.get("hanger_count") is not None
             and values.get("dashpot_level") == "extreme"}
    return tuple(part for part in PARTS if given[part])


_TWO_PI = 2.0 * np.pi

# T/T0 - 1 on the worksheet: the series in theta [rad] below 0.1 rad (truncation below
# 3e-13 relative there), 1/AGM - 1 above it (cancellation below 1e-12 relative there): full
# precision at every swing, where 1/AGM - 1 alone loses digits as the swing falls (computed).
_T = "RADIANS(swing_angle_deg)"
SMALL_SWING_ERROR = (f"=IF({_T}<0.1,{_T}^2/16+11*{_T}^4/3072+173*{_T}^6/737280"
                     f"+22931*{_T}^8/1321205760,1/agm_at_swing-1)")


def _required_mass_ratio_step(method: str) -> Step:
    """The required mass ratio for the damper that ``method`` tunes (an engine value)."""
    if method == "robust":
        return Step("mass_ratio", lambda acceleration, acceleration_limit, structural_damping,
                    band_lower, band_upper: band_mass_ratio(
                        acceleration, acceleration_limit, structural_damping, band_lower,
                        band_upper, "robust"),
                    "max over r of a_d(r) = a_lim, the damper tuned robustly for the band",
                    "Least mass ratio whose robustly tuned damper meets the limit anywhere in "
                    "the band; functions.envelope.band_mass_ratio(method='robust') (brentq)",
                    flag="engine_flag_mass_ratio")
    if method in CLOSED_FORMS:
        how = (f"Root of zeta_eff(mu) = zeta_req for the {method} damper, tuned as printed "
               "(undamped structure) on the damped structure (brentq); "
               f"functions.damper.required_mass_ratio(method='{method}')")
    elif method == "h2":
        how = ("Root of zeta_eff(mu) = zeta_req for the h2-optimal damper (brentq); "
               "functions.damper.required_mass_ratio")
    else:
        how = (f"Root of zeta_eff(mu) = zeta_req for the {method}-optimal damper (brentq); "
               f"functions.damper.required_mass_ratio(method='{method}')")
    return Step("mass_ratio",
                lambda required_damping, structural_damping:
                required_mass_ratio(required_damping, structural_damping, method),
                "zeta_eff(mu, f_opt, zeta_opt, zeta_s) = zeta_req", how,
                flag="engine_flag_mass_ratio")


def _mass_steps(method: str, mode: str) -> tuple[Step, ...]:
    if mode == "chosen_mass_ratio":
        return (
            _step("mass_ratio", "=chosen_mass_ratio", lambda chosen_mass_ratio:
                  chosen_mass_ratio, "mu (chosen)", "Project input"),
            _step("damper_mass", "=mass_ratio*modal_mass", lambda mass_ratio, modal_mass:
                  mass_ratio * modal_mass, "mu M*"),
        )
    if mode == "chosen_damper_mass":
        return (
            _step("damper_mass", "=chosen_damper_mass", lambda chosen_damper_mass:
                  chosen_damper_mass, "m_d (chosen)", "Project input"),
            _step("mass_ratio", "=damper_mass/modal_mass", lambda damper_mass, modal_mass:
                  damper_mass / modal_mass, "m_d / M*"),
        )
    if mode != "required":
        raise ValueError(f"mode={mode!r} must be one of {', '.join(MASS_RATIO_MODES)}")
    return (
        _required_mass_ratio_step(method),
        _step("damper_mass", "=mass_ratio*modal_mass", lambda mass_ratio, modal_mass:
              mass_ratio * modal_mass, "mu M*"),
    )


@functools.lru_cache(maxsize=1024)
def _optimum(mass_ratio: float, method: str, structural_damping: float) -> tuple[float, float]:
    """One numerical optimum, computed once for the two steps that read it (pure: cached)."""
    f, zd = optimal_tuning(mass_ratio, method, structural_damping)
    return float(f), float(zd)


def _tuning_steps(method: str) -> tuple[Step, ...]:
    if method == "robust":
        source = ("functions.envelope.robust_tuning: the least effective damping over the band "
                  "maximised (batched Newton); numerical, valid for a damped structure")
        return tuple(
            Step(name, (lambda i: lambda mass_ratio, band_lower, band_upper, structural_damping:
                        _robust(float(mass_ratio), float(band_lower), float(band_upper),
                                float(structural_damping))[i])(i),
                 "max over f, zeta_d of min over r of zeta_eff", source,
                 flag="engine_flag_tuning")
            for i, name in enumerate(("tuning_ratio", "damper_damping")))
    if method in CLOSED_FORMS:
        tuning, damping = CLOSED_FORMS[method]
        return (Step("tuning_ratio", tuning, tuning.worksheet.expression,
                     tuning.worksheet.source),
                Step("damper_damping", damping, damping.worksheet.expression,
                     damping.worksheet.source))
    what = ("minimum displacement variance under white-noise force" if method == "h2"
            else "minimum peak response under harmonic force")
    source = (f"functions.damper.optimal_tuning(method='{method}'): {what}; numerical, no "
              "closed form for a damped structure")
    wf_tuning, wf_damping = CLOSED_FORMS["white_noise_force"]
    return (
        Step("tuning_ratio", lambda mass_ratio, structural_damping:
             _optimum(float(mass_ratio), method, float(structural_damping))[0],
             "numerical optimum", source, flag="engine_flag_tuning"),
        Step("damper_damping", lambda mass_ratio, structural_damping:
             _optimum(float(mass_ratio), method, float(structural_damping))[1],
             "numerical optimum", source, flag="engine_flag_tuning"),
        Step("warburton_tuning_ratio", wf_tuning, wf_tuning.worksheet.expression,
             "Warburton (1982); not used further"),
        Step("warburton_damper_damping", wf_damping, wf_damping.worksheet.expression,
             "Warburton (1982); not used further"),
    )


@functools.lru_cache(maxsize=4096)
def _worst_case(lo: float, hi: float, a: float, mu: float, f: float, zd: float, zs: float,
                k: float) -> tuple[float, float, float]:
    """One worst case over the band, computed once for the three steps that read it."""
    return tuple(float(x) for x in band_worst_case(lo, hi, a, mu, f, zd, zs, k))


@functools.lru_cache(maxsize=4096)
def _robust(mu: float, lo: float, hi: float, zs: float) -> tuple[float, float]:
    return tuple(float(x) for x in robust_tuning(mu, lo, hi, zs))


_BAND_READS = "band_lower, band_upper, acceleration, mass_ratio, tuning_ratio, damper_damping, " \
              "structural_damping, response_exponent"
_EQ_LENGTH = "Simple pendulum in tune at the design swing, L_0 / (1 + e)^2 (A&S 17.6)"


def _band_section(method: str) -> Section:
    """The damper as designed over the band of building frequencies, the mass ratio and the
    robust tuning for the band, and the hanger adjustment."""
    worst = "functions.envelope.band_worst_case: dense grid and golden section over the band"

    def pick(i: int) -> Callable[..., float]:
        def value(band_lower, band_upper, acceleration, mass_ratio, tuning_ratio,
                  damper_damping, structural_damping, response_exponent):
            return _worst_case(float(band_lower), float(band_upper), float(acceleration),
                               float(mass_ratio), float(tuning_ratio), float(damper_damping),
                               float(structural_damping), float(response_exponent))[i]
        return value

    def robust(i: int) -> Callable[..., float]:
        def value(mass_ratio, band_lower, band_upper, structural_damping):
            return _robust(float(mass_ratio), float(band_lower), float(band_upper),
                           float(structural_damping))[i]
        return value

    def band_mu(acceleration, acceleration_limit, structural_damping, band_lower, band_upper,
                response_exponent):
        return band_mass_ratio(acceleration, acceleration_limit, structural_damping,
                               band_lower, band_upper, method, response_exponent)

    def robust_worst(band_lower, band_upper, acceleration, mass_ratio, robust_tuning_ratio,
                     robust_damper_damping, structural_damping, response_exponent):
        return _worst_case(float(band_lower), float(band_upper), float(acceleration),
                           float(mass_ratio), float(robust_tuning_ratio),
                           float(robust_damper_damping), float(structural_damping),
                           float(response_exponent))[0]

    length = "gravity/(2*PI()*damper_frequency*{r})^2/(1+small_angle_error)^2"
    return Section("Frequency band: the building's frequency uncertain", (
        Step("band_worst_acceleration", pick(0), "max over r of a r^k sqrt(zeta_s / "
             "zeta_eff(mu, f/r, zeta_d, zeta_s))", worst, flag="engine_flag_band"),
        Step("band_worst_factor", pick(1), "r where a_d(r) is largest", worst,
             flag="engine_flag_band"),
        Step("band_worst_damping", pick(2), "zeta_eff(mu, f/r_w, zeta_d, zeta_s)", worst,
             flag="engine_flag_band"),
        Step("band_mass_ratio", band_mu, f"least mu with a_w(mu) <= a_lim ({method} tuning)",
             f"functions.envelope.band_mass_ratio(method='{method}') (brentq)",
             flag="engine_flag_band_mass"),
        _step("band_damper_mass", "=band_mass_ratio*modal_mass",
              lambda band_mass_ratio, modal_mass: band_mass_ratio * modal_mass,
              "mu_band M*"),
        Step("robust_tuning_ratio", robust(0), "max over f, zeta_d of min over r of zeta_eff",
             "functions.envelope.robust_tuning (batched Newton)", flag="engine_flag_robust"),
        Step("robust_damper_damping", robust(1), "max over f, zeta_d of min over r of "
             "zeta_eff", "functions.envelope.robust_tuning (batched Newton)",
             flag="engine_flag_robust"),
        Step("robust_worst_acceleration", robust_worst, "a_w for f_rob, zeta_rob", worst,
             flag="engine_flag_robust_worst"),
        _step("hanger_length_lower", "=" + length.format(r="band_lower"),
              lambda gravity, damper_frequency, band_lower, small_angle_error:
              gravity / (_TWO_PI * damper_frequency * band_lower) ** 2
              / (1.0 + small_angle_error) ** 2,
              "g / (2 pi f_d r_lo)^2 / (1 + e)^2", _EQ_LENGTH),
        _step("hanger_length_upper", "=" + length.format(r="band_upper"),
              lambda gravity, damper_frequency, band_upper, small_angle_error:
              gravity / (_TWO_PI * damper_frequency * band_upper) ** 2
              / (1.0 + small_angle_error) ** 2,
              "g / (2 pi f_d r_hi)^2 / (1 + e)^2", _EQ_LENGTH),
        _step("hanger_adjustment_range", "=hanger_length_lower-hanger_length_upper",
              lambda hanger_length_lower, hanger_length_upper:
              hanger_length_lower - hanger_length_upper, "L_lo - L_hi"),
    ), "The damper as designed (tuned at the nominal f_s) on a building at r f_s, "
       "r_lo <= r <= r_hi: mass, damper and structural damping as designed (the frequency "
       "error is a stiffness error). The acceleration without the damper is held constant "
       "across the band unless k gives the rule a r^k. The hanger lengths keep the tuning "
       "ratio f to the actual building.")


def _as_built_section(design_method: str, measured_damping: bool) -> Section:
    """The damper retuned to the measured frequency (and damping) of the finished building
    (a robustly tuned damper is retuned by h2: once measured, the frequency has no band)."""
    method = "h2" if design_method == "robust" else design_method
    names = {"tuning_ratio": "retune_tuning_ratio", "damper_damping": "retune_damper_damping",
             **({"structural_damping": "measured_damping"} if measured_damping else {})}
    optimum = tuple(Step(names[s.name], renamed(s.compute, names), s.expression,
                         s.source + (" (measured zeta_s)" if measured_damping else ""),
                         flag=s.flag and "engine_flag_as_built")
                    for s in _tuning_steps(method)[:2])
    return Section("As built: the damper retuned to the measured building", optimum + (
        _step("retune_damper_frequency", "=retune_tuning_ratio*measured_frequency",
              lambda retune_tuning_ratio, measured_frequency:
              retune_tuning_ratio * measured_frequency, "f_ab f_meas"),
        _step("retune_pendulum_length",
              "=gravity/(2*PI()*retune_damper_frequency)^2/(1+small_angle_error)^2",
              lambda gravity, retune_damper_frequency, small_angle_error:
              gravity / (_TWO_PI * retune_damper_frequency) ** 2
              / (1.0 + small_angle_error) ** 2, "g / (2 pi f_d,ab)^2 / (1 + e)^2",
              _EQ_LENGTH),
        _step("retune_dashpot", "=2*damper_mass*2*PI()*retune_damper_frequency"
                                "*retune_damper_damping",
              lambda damper_mass, retune_damper_frequency, retune_damper_damping:
              2.0 * damper_mass * _TWO_PI * retune_damper_frequency * retune_damper_damping,
              "2 m_d (2 pi f_d,ab) zeta_ab"),
    ), f"Mass ratio as built, tuned by {method}" + (" (the design's robust tuning was for the "
                                                    "band; the measured frequency has none)"
                                                    if design_method == "robust"
                                                    else " (the design's method)") +
       " to the measured "
       f"frequency{' and damping' if measured_damping else ' (design damping zeta_s)'}; "
       "hanger length in tune at the design swing. A frequency measured with the damper "
       "locked must first be multiplied by sqrt(1 + mu).")


_REACH = "raise the damper mass or the clearance"


def _below_length(name: str, form: Callable[..., Any], remedy: str) -> Step:
    """A swing angle asin(stroke / L) that refuses a stroke the pendulum cannot reach (the
    first name the twin ``form`` reads is the stroke)."""
    stroke = form.worksheet.names[0]

    def swing(**cells):
        if not cells[stroke] < cells["pendulum_length"]:
            raise ValueError(f"{stroke}={cells[stroke]!r} m must be below pendulum_length="
                             f"{cells['pendulum_length']!r} m: the pendulum cannot reach it; "
                             f"{remedy}")
        return form(**cells)
    swing.__signature__ = inspect.signature(form)    # type: ignore[attr-defined]
    return Step(name, twin(form.worksheet.formula, swing, form.worksheet.expression,
                           form.worksheet.source), form.worksheet.expression,
                form.worksheet.source)


def _extreme_section() -> Section:
    """The damper at the extreme wind: stroke, swing and detuning, buffers, force."""
    f = LEVEL_FORMS
    error = SMALL_SWING_ERROR.replace("swing_angle_deg", "extreme_swing_deg").replace(
        "agm_at_swing", "agm_at_extreme_swing")
    return Section("Extreme level: stroke, swing, buffers and force", (
        *(_as_step(name, f[name]) for name in ("extreme_acceleration_with_damper",
                                               "extreme_displacement", "extreme_stroke")),
        _below_length("extreme_swing_deg", f["extreme_swing_deg"],
                      "raise the damper mass or lower extreme_acceleration"),
        Step("extreme_small_angle_error", lambda extreme_swing_deg:
             small_angle_error(extreme_swing_deg), "T / T_0 - 1 at theta_x (as step 5.4)",
             "A&S 17.6 (AGM at the extreme swing, Pendulum sheet); series below 0.1 rad",
             error),
        _step("extreme_detuning", "=(small_angle_error-extreme_small_angle_error)"
                                  "/(1+extreme_small_angle_error)",
              lambda small_angle_error, extreme_small_angle_error:
              (small_angle_error - extreme_small_angle_error)
              / (1.0 + extreme_small_angle_error),
              "(1 + e) / (1 + e_x) - 1 = (e - e_x) / (1 + e_x)",
              "Frequency ratio = period ratio^-1; in tune at the design swing"),
        *(_as_step(name, f[name]) for name in ("buffer_excess", "contact_velocity",
                                               "buffer_energy", "extreme_damper_force")),
    ), "The wind of the strength check (extreme_acceleration) on the same linear system: every "
       "response scales with the input. The stroke beyond the clearance is taken by the "
       "buffers: contact velocity and energy from harmonic motion at f_s (kinematics; a random "
       "response needs its own statement). Force: spring and dashpot, harmonic at f_s.")


def _comfort_section() -> Section:
    form = LEVEL_FORMS["comfort_limit_mp"]
    return Section("Comfort criterion of Melbourne & Palmer (1992)", (
        _as_step("comfort_limit_mp", form),
    ), "Peak acceleration criterion at the mode's frequency for the return period R, "
       "T = 600 s (J. Wind Eng. Ind. Aerodyn. 41-44 (1992) 105-116), beside the project's own "
       "limit, which stays the design limit; valid for 0.06 to 1 Hz.")


#: Direction-1 names and their direction-2 cells (the renamed closed forms read them).
_SECOND = {"tuning_ratio": "tuning_ratio_2", "damper_damping": "damper_damping_2",
           "structural_damping": "structural_damping_2", "mass_ratio": "mass_ratio_2",
           "acceleration": "acceleration_2", "structure_frequency": "frequency_2",
           "damper_frequency": "damper_frequency_2", "stroke": "stroke_2",
           "effective_damping": "effective_damping_2", "stroke_ratio": "stroke_ratio_2",
           "acceleration_with_damper": "acceleration_with_damper_2",
           "structure_displacement": "structure_displacement_2",
           "extreme_acceleration": "extreme_acceleration_2",
           "extreme_acceleration_with_damper": "extreme_acceleration_with_damper_2",
           "extreme_displacement": "extreme_displacement_2", "stiffness": "stiffness_2",
           "dashpot": "dashpot_2", "extreme_stroke": "extreme_stroke_2",
           "extreme_damper_force": "extreme_damper_force_2",
           "band_worst_acceleration": "band_worst_acceleration_2",
           "band_worst_factor": "band_worst_factor_2",
           **{f"var_{v}": f"var_{v}_2" for v in "wgxytnd"}}


def _second_of(step: Step) -> Step:
    """Direction 2's copy of a direction-1 step (:func:`functions.steps.second_of`)."""
    return second_of(step, _SECOND)


def _second_direction_section(method: str, core: tuple[Section, ...]) -> Section:
    """The same pendulum mass in the second sway direction: tuning, springs, response."""
    d = DIRECTION_FORMS
    by_name = {s.name: s for sec in core for s in sec.steps}
    tuning = tuple(_second_of(by_name[n]) for n in ("tuning_ratio", "damper_damping"))
    spring = d["spring_stiffness_2"]

    def springs(damper_mass, damper_frequency_2, damper_frequency):
        if damper_frequency_2 < damper_frequency * (1.0 - 1e-12):
            raise ValueError(
                f"needs a damper frequency of {damper_frequency_2:.6g} Hz, below the main "
                f"direction's {damper_frequency:.6g} Hz to which the hangers are cut: "
                "spring_stiffness_2 would be negative. Give the lower-frequency direction as "
                "the main mode ([mode]) and the other as [direction_2]")
        return spring(damper_mass, damper_frequency_2, damper_frequency)

    def at_swing(pendulum_length, spring_stiffness_2, damper_mass, swing_angle_deg_2, gravity):
        return spring_pendulum_frequency(pendulum_length, spring_stiffness_2, damper_mass,
                                         swing_angle_deg_2, gravity)

    def required(required_damping_2, structural_damping_2):
        zs = float(structural_damping_2)
        need = float(required_damping_2)
        if need <= zs:
            return 0.0
        mu = MIN_NUMERICAL_MASS_RATIO
        f, zd = optimal_tuning(mu, method, 0.0 if method in CLOSED_FORMS else zs)
        if float(effective_damping(mu, f, zd, zs)) >= need:
            return 0.0
        return required_mass_ratio(need, zs, method)

    def required_over_band(acceleration_2, acceleration_limit_2, structural_damping_2,
                           band_lower, band_upper):
        return band_mass_ratio(acceleration_2, acceleration_limit_2, structural_damping_2,
                               band_lower, band_upper, "robust")

    variance = [_second_of(by_name[f"var_{v}"]) for v in "wgxytnd"]
    response = [_second_of(by_name[n]) for n in (
        "effective_damping", "acceleration_with_damper", "structure_displacement",
        "stroke_ratio", "stroke")]
    return Section("Second sway direction: the same pendulum mass, springs added", (
        _as_step("mass_ratio_2", d["mass_ratio_2"]),
        _as_step("required_damping_2", d["required_damping_2"]),
        *tuning,
        _as_step("damper_frequency_2", d["damper_frequency_2"]),
        *variance, *response,
        _below_length("swing_angle_deg_2", d["swing_angle_deg_2"], _REACH),
        Step("spring_stiffness_2", twin(spring.worksheet.formula, springs,
                                        spring.worksheet.expression, spring.worksheet.source)),
        _second_of(by_name["stiffness"]),
        _as_step("dashpot_2", d["dashpot_2"]),
        _as_step("small_swing_frequency_2", d["small_swing_frequency_2"]),
        _engine("frequency_at_swing_2", at_swing, "exact period of pendulum and springs",
                "functions.directions.spring_pendulum_frequency (complete elliptic integral)",
                "engine_flag_spring_2"),
        _engine("detuning_2", lambda pendulum_length, spring_stiffness_2, damper_mass,
                swing_angle_deg_2, gravity: at_swing(pendulum_length, spring_stiffness_2,
                                                     damper_mass, swing_angle_deg_2, gravity)
                / at_swing(pendulum_length, spring_stiffness_2, damper_mass, 0.0, gravity) - 1.0,
                "f_2(theta_2) / f_2(0) - 1",
                "functions.directions.spring_pendulum_frequency (exact); an engine value: a "
                "small difference", "engine_flag_spring_2"),
        _engine("frequency_error_2", lambda frequency_at_swing_2, damper_frequency_2:
                frequency_at_swing_2 / damper_frequency_2 - 1.0, "f_2(theta_2) / f_d2 - 1",
                "Off the target at direction 2's own swing (springs sized at direction 1's); "
                "an engine value: a small difference of an engine value",
                "engine_flag_frequency_error_2"),
        _engine("required_mass_ratio_2", required, "zeta_eff(mu, f_opt, zeta_opt, zeta_s2) = "
                "zeta_req2", f"functions.damper.required_mass_ratio(method='{method}') "
                "(0 when the structure alone, or a 1e-4 damper, meets it)",
                "engine_flag_mass_ratio_2") if method != "robust" else
        _engine("required_mass_ratio_2", required_over_band, "max over r of a_d2(r) = a_lim2",
                "functions.envelope.band_mass_ratio(method='robust') for direction 2 (0 when "
                "the structure alone meets it)", "engine_flag_mass_ratio_2"),
        _as_step("required_damper_mass_2", d["required_damper_mass_2"]),
        _as_step("combined_stroke", d["combined_stroke"]),
        _as_step("stroke_sum", d["stroke_sum"]),
        _below_length("combined_swing_deg", d["combined_swing_deg"], _REACH),
    ), "One mass, two mass ratios; the hangers are cut for the main direction (the lower damper "
       "frequency) and horizontal springs lift the pendulum to f_d2 in direction 2: omega^2 = "
       "g/L + k/m (textbook, small swing), sized with g/L_0 at the main direction's swing. "
       "Same tuning method and rules as sections 1-6, and the same floor ordinate phi_occ. "
       "Peaks of the two directions combine by SRSS (uncorrelated responses: common practice, "
       "no source).")


def _second_band_section(method: str) -> Section:
    """The second direction over the frequency band (its frequency off by the same factor)."""
    return Section("Frequency band, second direction", tuple(
        _second_of(step) for step in _band_section(method).steps[:2]),
        "Direction 2's frequency off by the same factor r as the main direction's (one "
        "stiffness error), its damper as designed: the same assumptions as the band of the "
        "main direction.")


def _second_extreme_section() -> Section:
    """The second direction at the extreme wind, and both directions combined."""
    steps_2 = [Step(_SECOND[n], renamed(LEVEL_FORMS[n], _SECOND), "", "")
               for n in ("extreme_acceleration_with_damper", "extreme_displacement",
                         "extreme_stroke", "extreme_damper_force")]
    return Section("Extreme level, second direction and both combined", (
        *steps_2[:3],
        _step("extreme_combined_stroke", "=SQRT(extreme_stroke^2+extreme_stroke_2^2)",
              lambda extreme_stroke, extreme_stroke_2:
              np.sqrt(extreme_stroke ** 2 + extreme_stroke_2 ** 2), "sqrt(x_d,x1^2 + x_d,x2^2)",
              "SRSS of uncorrelated peaks (common practice, no source)"),
        _step("extreme_combined_swing_deg",
              "=DEGREES(ASIN(MIN(1,extreme_combined_stroke/pendulum_length)))",
              lambda extreme_combined_stroke, pendulum_length:
              np.degrees(np.arcsin(np.minimum(1.0, extreme_combined_stroke / pendulum_length))),
              "asin(x_r,x / L)", "Plane trigonometry (90 deg: the stroke reaches L)"),
        _step("combined_buffer_excess", "=MAX(0,extreme_combined_stroke-clearance)",
              lambda extreme_combined_stroke, clearance:
              np.maximum(0.0, extreme_combined_stroke - clearance), "max(0, x_r,x - c)",
              "Geometry"),
        _step("combined_contact_velocity", "=2*PI()*MAX(structure_frequency,frequency_2)"
                                           "*SQRT(MAX(0,(extreme_combined_stroke-clearance)"
                                           "*(extreme_combined_stroke+clearance)))",
              lambda structure_frequency, frequency_2, extreme_combined_stroke, clearance:
              _TWO_PI * np.maximum(structure_frequency, frequency_2) * np.sqrt(np.maximum(
                  0.0, (extreme_combined_stroke - clearance)
                  * (extreme_combined_stroke + clearance))),
              "2 pi max(f_s, f_s2) sqrt(x_r,x^2 - c^2)",
              "Harmonic motion of the SRSS amplitude at the higher mode frequency "
              "(conservative; common practice, no source)"),
        _step("combined_buffer_energy", "=damper_mass*combined_contact_velocity^2/2",
              lambda damper_mass, combined_contact_velocity:
              damper_mass * combined_contact_velocity ** 2 / 2.0, "m_d v_r^2 / 2",
              "Kinetic energy at contact"),
        steps_2[3],
    ), "Direction 2's response at the extreme level scales with its own extreme input; the "
       "radial stroke of both directions (SRSS) governs the clearance, and the buffers take "
       "its excess.")


@functools.lru_cache(maxsize=None)
def sections(method: str, mode: str, parts: tuple[str, ...] = ()) -> tuple[Section, ...]:
    """The calculation's sections for a tuning ``method``, mass-ratio ``mode`` and optional
    ``parts``.

    Built once per method, mode and parts (the steps are immutable), not once per design.

    Parameters
    ----------
    method : str
        Tuning method, one of ``functions.envelope.BAND_METHODS``: the optima of
        ``functions.damper.OPTIMAL_TUNING_METHODS``, or ``robust`` (with the part ``band``) [-].
    mode : str
        One of :data:`MASS_RATIO_MODES` [-].
    parts : tuple of str, optional
        Optional parts, from :data:`PARTS` (:func:`parts_of` gives them for the inputs) [-].

    Returns
    -------
    sections : tuple of Section
        In the engineer's checking order [-].

    Raises
    ------
    ValueError
        For an unknown method or mode.
    """
    if method not in BAND_METHODS:
        raise ValueError(f"method={method!r} must be one of {', '.join(BAND_METHODS)}")
    if method == "robust" and "band" not in parts:
        raise ValueError("method='robust' tunes the damper for a frequency band: it needs the "
                         "band (band_lower, band_upper)")
    if not valid_parts(parts):
        raise ValueError(f"parts={parts!r} must be taken from {', '.join(PARTS)}, in that "
                         "order (measured_damping only with as_built, supply only with "
                         "extreme, dashpots_at_extreme only with supply)")
    core = _core_sections(method, mode)
    extra = []
    if "band" in parts:
        extra.append(_band_section(method))
    if "as_built" in parts:
        extra.append(_as_built_section(method, "measured_damping" in parts))
    if "extreme" in parts:
        extra.append(_extreme_section())
    if "comfort" in parts:
        extra.append(_comfort_section())
    if "direction_2" in parts:
        extra.append(_second_direction_section(method, core))
        if "extreme" in parts:
            extra.append(_second_extreme_section())
        if "band" in parts:
            extra.append(_second_band_section(method))
    if "supply" in parts:
        extra += supply_sections(parts, _SECOND)
    return core + tuple(Section(f"{n}  {sec.title}", sec.steps, sec.note)
                        for n, sec in enumerate(extra, start=len(core) + 1))


def _core_sections(method: str, mode: str) -> tuple[Section, ...]:
    v = VARIANCE_SOURCE
    return (
        Section("1  Damping required", (
            _step("required_damping", "=structural_damping*(acceleration/acceleration_limit)^2",
                  lambda structural_damping, acceleration, acceleration_limit:
                  structural_damping * (acceleration / acceleration_limit) ** 2,
                  "zeta_s (a / a_lim)^2",
                  "Resonant response ~ 1/sqrt(zeta): EN 1991-1-4:2005 Annex B, B.2(6)"),
        ), "Preliminary rule for the resonant part of the response; the background part is "
           "not reduced by a damper."),
        Section("2  Mass ratio and damper mass", _mass_steps(method, mode),
                "M* is the generalised mass of the mode normalised to 1 at the damper."),
        Section("3  Optimal tuning and damping", _tuning_steps(method) + (
            _step("damper_frequency", "=tuning_ratio*structure_frequency",
                  lambda tuning_ratio, structure_frequency: tuning_ratio * structure_frequency,
                  "f f_s"),
        ), "Tuning ratio f = f_d / f_s; damper damping zeta_d = c_d / (2 m_d omega_d) on the "
           "damper's own frequency."),
        Section("4  Effective damping and response with the damper", (
            _step("var_w", "=tuning_ratio^2", lambda tuning_ratio: tuning_ratio ** 2, "f^2", v),
            _step("var_g", "=damper_damping*tuning_ratio", lambda damper_damping, tuning_ratio:
                  damper_damping * tuning_ratio, "zeta_d f", v),
            _step("var_x", "=structural_damping*var_w+var_g",
                  lambda structural_damping, var_w, var_g: structural_damping * var_w + var_g,
                  "zeta_s w + g", v),
            _step("var_y", "=var_g*(1+mass_ratio)+structural_damping",
                  lambda var_g, mass_ratio, structural_damping:
                  var_g * (1.0 + mass_ratio) + structural_damping, "g (1 + mu) + zeta_s", v),
            _step("var_t", "=(1+mass_ratio)*var_w-1", lambda mass_ratio, var_w:
                  (1.0 + mass_ratio) * var_w - 1.0, "(1 + mu) w - 1", v),
            _step("var_n", "=var_g*(var_t^2+mass_ratio*var_w)+4*var_g*var_x*var_y"
                           "+structural_damping*mass_ratio*var_w^2",
                  lambda var_g, var_t, mass_ratio, var_w, var_x, var_y, structural_damping:
                  var_g * (var_t * var_t + mass_ratio * var_w) + 4.0 * var_g * var_x * var_y
                  + structural_damping * mass_ratio * var_w * var_w,
                  "g (t^2 + mu w) + 4 g X Y + zeta_s mu w^2", v),
            _step("var_d", "=mass_ratio*var_g*var_x+structural_damping*mass_ratio*var_w^2*var_y"
                           "+structural_damping*var_g*(var_w-1)*var_t"
                           "+4*structural_damping*var_g*var_x*var_y",
                  lambda mass_ratio, var_g, var_x, structural_damping, var_w, var_y, var_t:
                  mass_ratio * var_g * var_x + structural_damping * mass_ratio * var_w * var_w
                  * var_y + structural_damping * var_g * (var_w - 1.0) * var_t
                  + 4.0 * structural_damping * var_g * var_x * var_y,
                  "mu g X + zeta_s mu w^2 Y + zeta_s g (w - 1) t + 4 zeta_s g X Y", v),
            _step("effective_damping", "=var_d/var_n", lambda var_d, var_n: var_d / var_n,
                  "D / N", "functions.damper.effective_damping (same regrouped closed form)"),
            _step("acceleration_with_damper",
                  "=acceleration*SQRT(structural_damping/effective_damping)",
                  lambda acceleration, structural_damping, effective_damping:
                  acceleration * np.sqrt(structural_damping / effective_damping),
                  "a sqrt(zeta_s / zeta_eff)", "Resonant rule, as for zeta_req"),
            _step("structure_displacement",
                  "=acceleration_with_damper/(floor_ordinate*(2*PI()*structure_frequency)^2)",
                  lambda acceleration_with_damper, floor_ordinate, structure_frequency:
                  acceleration_with_damper / (floor_ordinate
                                              * (_TWO_PI * structure_frequency) ** 2),
                  "a_d / (phi_occ (2 pi f_s)^2)", "Harmonic at the mode's frequency; "
                  "accelerations at the top occupied floor, displacement at the damper"),
            _step("stroke_ratio", "=SQRT(var_x/var_n)", lambda var_x, var_n:
                  np.sqrt(var_x / var_n), "sqrt(X / N)",
                  "functions.damper.stroke_ratio (same regrouped closed form)"),
            _step("stroke", "=stroke_ratio*structure_displacement",
                  lambda stroke_ratio, structure_displacement:
                  stroke_ratio * structure_displacement, "(x_d/x_s) x_s",
                  "Equal peak factors"),
        ), "Variance-equivalent damping of the structure with its damper under white-noise "
           "force (closed form, functions.damper)."),
        Section("5  Pendulum length, swing and detuning", (
            _step("small_angle_length", "=gravity/(2*PI()*damper_frequency)^2",
                  lambda gravity, damper_frequency:
                  gravity / (_TWO_PI * damper_frequency) ** 2, "g / (2 pi f_d)^2",
                  "Simple pendulum, small swings"),
            Step("pendulum_length", lambda damper_frequency, stroke, gravity:
                 pendulum_length(damper_frequency, stroke, gravity),
                 "L = L_0 AGM(1, cos(theta/2))^2, theta = asin(x_d / L)",
                 "Exact period T = T_0 / AGM(1, cos(theta/2)) (A&S 17.6; Villarino 2012); "
                 "fixed point on the Pendulum sheet", "=fixed_point_length"),
            _step("swing_angle_deg", "=DEGREES(ASIN(stroke/pendulum_length))",
                  lambda stroke, pendulum_length:
                  np.degrees(np.arcsin(stroke / pendulum_length)), "asin(x_d / L)"),
            Step("small_angle_error", lambda swing_angle_deg: small_angle_error(swing_angle_deg),
                 "T / T_0 - 1 = 1 / AGM(1, cos(theta/2)) - 1; below 0.1 rad the series "
                 "theta^2/16 + 11 theta^4/3072 + 173 theta^6/737280 + 22931 theta^8/"
                 "1321205760",
                 "A&S 17.6 (AGM, Pendulum sheet); the series (A&S 17.3.11) keeps full "
                 "precision at small swings, where 1/AGM - 1 would cancel", SMALL_SWING_ERROR),
            _step("detuning", "=-small_angle_error/(1+small_angle_error)",
                  lambda small_angle_error: -small_angle_error / (1.0 + small_angle_error),
                  "1 / (1 + e) - 1 = -e / (1 + e)", "Frequency ratio = period ratio^-1"),
        ), "A pendulum cut to L_0 runs slow at a finite swing; L is shorter so that it is in "
           "tune at the design swing (and runs fast at smaller swings)."),
        Section("6  Spring and dashpot equivalents", (
            _step("stiffness", "=damper_mass*(2*PI()*damper_frequency)^2",
                  lambda damper_mass, damper_frequency:
                  damper_mass * (_TWO_PI * damper_frequency) ** 2, "m_d (2 pi f_d)^2"),
            _step("dashpot", "=2*damper_mass*2*PI()*damper_frequency*damper_damping",
                  lambda damper_mass, damper_frequency, damper_damping:
                  2.0 * damper_mass * _TWO_PI * damper_frequency * damper_damping,
                  "2 m_d (2 pi f_d) zeta_d"),
        )),
    )


def steps(method: str, mode: str, parts: tuple[str, ...] = ()) -> list[Step]:
    """Every step of :func:`sections`, in order."""
    return [step for section in sections(method, mode, parts) for step in section.steps]


def engine_flag_names(method: str, mode: str, parts: tuple[str, ...] = ()) -> list[str]:
    """Defined names of the flags that guard the calculation's engine values, in order."""
    return list(dict.fromkeys(s.flag for s in steps(method, mode, parts) if s.flag))


def valid_parts(parts: tuple[str, ...]) -> bool:
    """True for optional parts a calculation can hold: taken from :data:`PARTS`, in its
    order, ``measured_damping`` only with ``as_built``, ``supply`` only with ``extreme``,
    ``dashpots_at_extreme`` only with ``supply``."""
    return (tuple(p for p in PARTS if p in parts) == tuple(parts)
            and ("measured_damping" not in parts or "as_built" in parts)
            and ("supply" not in parts or "extreme" in parts)
            and ("dashpots_at_extreme" not in parts or "supply" in parts))


#: Sets of optional parts that, together, hold every section and every combination of two.
PART_SETS = ((), ("band",), ("as_built", "measured_damping"), ("band", "as_built"),
             ("extreme",), ("comfort",), ("direction_2",), ("extreme", "direction_2"),
             ("extreme", "supply"), ("extreme", "supply", "dashpots_at_extreme"), PARTS)


def all_variants(parts: bool = False) -> list[tuple[str, str, list[Step]]]:
    """``(method, mode, steps)`` for every tuning method and mass-ratio mode (and, with
    ``parts``, every set of optional parts: then the whole step list of each)."""
    sets = PART_SETS if parts else ((),)
    out = [(method, mode, steps(method, mode, p)) for method in OPTIMAL_TUNING_METHODS
           for mode in MASS_RATIO_MODES for p in sets]
    if parts:           # the robust tuning, with the band it is tuned for
        out += [("robust", mode, steps("robust", mode, p)) for mode in MASS_RATIO_MODES
                for p in sets if "band" in p]
    return out
