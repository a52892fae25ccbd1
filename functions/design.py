# SPDX-License-Identifier: MIT
"""The whole design chain: from a building mode and a comfort limit to a sized pendulum damper.

:func:`design_damper` takes :class:`DesignInputs` (validated against the declarations of
:mod:`functions.quantities`), evaluates the declared steps of :mod:`functions.chain` in the
engineer's checking order and returns a :class:`DesignResult` holding every cell of the
calculation and the verdict of each design check (:data:`CHECK_RULES`, each rule beside its
worksheet verdict formula).

This is a preliminary design aid: results must be checked by a licensed engineer against local
codes, wind-tunnel data and the manufacturer's design.
"""
from __future__ import annotations

import dataclasses
from dataclasses import dataclass
from typing import Any, Callable, Mapping

import numpy as np

from functions._validation import broadcast, check_range, scalar_or_array
from functions.chain import mass_ratio_mode, parts_of, steps
from functions.damper import CLOSED_FORM_METHODS, optimal_tuning
from functions.quantities import (design_inputs, design_results, design_signature,
                                  input_relation_errors)
from functions.worksheet import twin

__all__ = [
    "CAUTION", "ACCELERATION_RTOL", "CheckRule", "CHECK_RULES", "CHECK_NAMES", "ALL_CHECK_NAMES",
    "PART_CHECK_RULES", "check_rules", "DesignInputs", "SecondDirection",
    "SECOND_DIRECTION_INPUTS", "design_second_direction",
    "Check", "DesignResult", "design_damper", "design_tuning",
]

#: Caution shown with every design output.
CAUTION = ("Preliminary design aid: results must be checked by a licensed engineer against local "
           "codes, wind-tunnel data and the manufacturer's design.")

#: Relative allowance of the acceleration check: a damper sized to the limit exactly lands on
#: it within rounding [-].
ACCELERATION_RTOL = 1e-9


# --------------------------------------------------------------------------------------------
# inputs
# --------------------------------------------------------------------------------------------
class DesignInputs:
    """Validated inputs of the design chain (keyword-only, SI units, frozen).

    The fields are the quantities of :data:`functions.quantities.DESIGN_INPUTS` (glossary
    names): each value is checked against its declared range (ValueError naming the field, the
    value and the range); a required field left out is a TypeError; an optional one left out
    (``mass_ratio``, ``damper_mass``) is None; a field with a default takes it. Read a field as
    an attribute (``inputs.frequency``); :meth:`replace` makes a changed copy.

    Examples
    --------
    >>> p = DesignInputs(frequency=0.2, modal_mass=1e7, structural_damping=0.01,
    ...                  acceleration=0.2, acceleration_limit=0.12, clearance=1.0)
    >>> p.frequency, p.max_swing_deg, p.mass_ratio
    (0.2, 15.0, None)
    """

    __slots__ = ("_values",)

    def __init__(self, **values: Any) -> None:
        declared = design_inputs()
        unknown = sorted(set(values) - {q.name for q in declared})
        if unknown:
            raise TypeError(f"DesignInputs got unexpected field(s) {unknown}; the fields are "
                            f"{', '.join(q.name for q in declared)}")
        out: dict[str, Any] = {}
        for q in declared:
            value = values.get(q.name)
            if isinstance(value, (list, tuple)) or getattr(value, "ndim", 0):
                raise ValueError(
                    f"{q.name}={value!r} must be a single "
                    f"{'text' if q.kind == 'choice' else 'number'}: design_damper "
                    "sizes one damper; for arrays of inputs use functions.design_table, which "
                    "broadcasts them and returns a table of designs")
            if value is not None:
                out[q.name] = q.validate(value)
            elif q.required:
                raise TypeError(f"DesignInputs is missing the required field {q.name!r}")
            else:
                out[q.name] = None if q.optional else q.default
        for _, message in input_relation_errors(out):
            raise ValueError(message)
        object.__setattr__(self, "_values", out)

    def __getattr__(self, name: str) -> Any:
        try:
            return object.__getattribute__(self, "_values")[name]
        except KeyError:
            raise AttributeError(f"DesignInputs has no field {name!r}") from None

    def __setattr__(self, name: str, value: Any) -> None:
        raise dataclasses.FrozenInstanceError(f"cannot assign to field {name!r}")

    def __eq__(self, other: object) -> bool:
        return isinstance(other, DesignInputs) and self._values == other._values

    def __hash__(self) -> int:
        return hash(tuple(sorted(self._values.items())))

    def __repr__(self) -> str:
        return "DesignInputs(" + ", ".join(f"{k}={v!r}" for k, v in self._values.items()) + ")"

    def as_dict(self) -> dict[str, Any]:
        """Every field by glossary name (None for an optional field not given)."""
        return dict(self._values)

    def replace(self, **changes: Any) -> "DesignInputs":
        """A copy with some fields changed (validated again)."""
        return DesignInputs(**{**self._values, **changes})

    def __reduce__(self):
        # pickled (e.g. back from a worker process) as its fields, validated again on loading
        return (_design_inputs, (self._values,))


def _design_inputs(values: dict[str, Any]) -> DesignInputs:
    return DesignInputs(**values)


# --------------------------------------------------------------------------------------------
# checks
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True)
class Check:
    """Verdict of one design check: ``lower <= value <= limit`` (``lower`` None: no floor)."""

    name: str
    value: float
    limit: float
    ok: bool
    text: str
    lower: float | None = None


def _fmt(x: float) -> str:
    return f"{x:.4g}"


@dataclass(frozen=True)
class CheckRule:
    """A design check: ``lower <= value <= limit (1 + rtol)``, beside its worksheet verdict.

    ``value`` is a twin (numpy and worksheet formula) of the checked quantity; ``limit`` and
    ``lower`` are defined names of input cells; ``describe(value, limit, lower, ok)`` words the
    verdict for a report.
    """

    name: str
    label: str
    value: Callable[..., Any]
    limit: str
    rule: str
    describe: Callable[[float, float, float | None, bool], str]
    lower: str = ""
    rtol: float = 0.0
    unit: str = "-"

    @property
    def value_formula(self) -> str:
        return self.value.worksheet.formula

    @property
    def verdict_formula(self) -> str:
        """``=IF(<rule>,"OK","NOT OK")``: the same rule as :meth:`evaluate`."""
        value = self.value_formula[1:]
        upper = f"{value}<={self.limit}" + (f"*(1+{self.rtol:.0E})" if self.rtol else "")
        cond = f"AND({value}>={self.lower},{upper})" if self.lower else upper
        return f'=IF({cond},"OK","NOT OK")'

    def evaluate(self, cells: Mapping[str, Any]) -> Check:
        """The verdict for the cells of a calculation."""
        value = float(self.value(**{n: cells[n] for n in self.value.worksheet.names}))
        limit = float(cells[self.limit])
        lower = float(cells[self.lower]) if self.lower else None
        ok = value <= limit * (1.0 + self.rtol) and (lower is None or value >= lower)
        return Check(self.name, value, limit, bool(ok), self.describe(value, limit, lower, ok),
                     lower)


def _rel(ok: bool) -> str:
    return "<=" if ok else ">"


#: The design checks, in the order of the workbook's Checks sheet.
CHECK_RULES: tuple[CheckRule, ...] = (
    CheckRule("acceleration", "Acceleration with damper within the limit",
              twin("=acceleration_with_damper", lambda acceleration_with_damper:
                   acceleration_with_damper),
              "acceleration_limit", "a_d <= a_lim (1 + 1e-9)",
              lambda v, lim, lo, ok: f"acceleration with damper {_fmt(v)} m/s^2 {_rel(ok)} "
                                     f"limit {_fmt(lim)} m/s^2",
              rtol=ACCELERATION_RTOL, unit="m/s^2"),
    CheckRule("stroke", "Stroke within the clearance",
              twin("=stroke", lambda stroke: stroke), "clearance", "x_d <= x_max",
              lambda v, lim, lo, ok: f"peak stroke {_fmt(v)} m {_rel(ok)} clearance "
                                     f"{_fmt(lim)} m", unit="m"),
    CheckRule("swing", "Swing within the accepted angle",
              twin("=swing_angle_deg", lambda swing_angle_deg: swing_angle_deg),
              "max_swing_deg", "theta <= theta_max",
              lambda v, lim, lo, ok: f"swing angle {_fmt(v)} deg {_rel(ok)} {_fmt(lim)} deg",
              unit="deg"),
    CheckRule("detuning", "Detuning within the accepted value",
              twin("=ABS(detuning)", lambda detuning: np.abs(detuning)), "max_detuning",
              "|df/f| <= |df/f|_max",
              lambda v, lim, lo, ok: f"|detuning| {v:.3%} {_rel(ok)} {lim:.3%}"),
    CheckRule("mass_ratio", "Mass ratio within the practical range",
              twin("=mass_ratio", lambda mass_ratio: mass_ratio), "mass_ratio_max",
              "mu_min <= mu <= mu_max",
              lambda v, lim, lo, ok: f"mass ratio {v:.3%} {'within' if ok else 'outside'} "
                                     f"{lo:.3%} to {lim:.3%} (common practice, no source)",
              lower="mass_ratio_min"),
)

#: Names of the design checks every design has, in order.
CHECK_NAMES = tuple(rule.name for rule in CHECK_RULES)

#: Checks of the optional parts (:data:`functions.chain.PARTS`): ``(parts needed, rule)``.
PART_CHECK_RULES: tuple[tuple[tuple[str, ...], CheckRule], ...] = (
    (("band",), CheckRule(
        "band_acceleration", "Frequency band: worst acceleration with damper within the "
        "limit",
        twin("=band_worst_acceleration", lambda band_worst_acceleration:
             band_worst_acceleration), "acceleration_limit", "a_w <= a_lim (1 + 1e-9)",
        lambda v, lim, lo, ok: f"worst acceleration over the band {_fmt(v)} m/s^2 {_rel(ok)} "
                               f"limit {_fmt(lim)} m/s^2",
        rtol=ACCELERATION_RTOL, unit="m/s^2")),
    (("band", "as_built"), CheckRule(
        "as_built_length", "As built: hanger length within the adjustment range",
        twin("=retune_pendulum_length", lambda retune_pendulum_length:
             retune_pendulum_length), "hanger_length_lower", "L_hi <= L_ab <= L_lo",
        lambda v, lim, lo, ok: f"as-built hanger length {_fmt(v)} m "
                               f"{'within' if ok else 'outside'} {_fmt(lo)} to {_fmt(lim)} m",
        lower="hanger_length_upper", unit="m")),
    (("extreme",), CheckRule(
        "extreme_stroke", "Extreme level: stroke within the clearance (else the buffers take "
        "the excess)", twin("=extreme_stroke", lambda extreme_stroke: extreme_stroke),
        "clearance", "x_d,x <= x_max",
        lambda v, lim, lo, ok: f"extreme-level stroke {_fmt(v)} m {_rel(ok)} clearance "
                               f"{_fmt(lim)} m" + ("" if ok else ": buffers engage"), unit="m")),
    (("extreme",), CheckRule(
        "extreme_swing", "Extreme level: swing within the accepted angle",
        twin("=extreme_swing_deg", lambda extreme_swing_deg: extreme_swing_deg),
        "max_swing_deg", "theta_x <= theta_max",
        lambda v, lim, lo, ok: f"extreme-level swing {_fmt(v)} deg {_rel(ok)} {_fmt(lim)} deg",
        unit="deg")),
    (("extreme",), CheckRule(
        "extreme_detuning", "Extreme level: detuning within the accepted value",
        twin("=ABS(extreme_detuning)", lambda extreme_detuning: np.abs(extreme_detuning)),
        "max_detuning", "|df_x/f| <= |df/f|_max",
        lambda v, lim, lo, ok: f"extreme-level |detuning| {v:.3%} {_rel(ok)} {lim:.3%}")),
    (("comfort",), CheckRule(
        "comfort_criterion", "Comfort criterion (Melbourne & Palmer): acceleration with damper "
        "within it",
        twin("=acceleration_with_damper", lambda acceleration_with_damper:
             acceleration_with_damper), "comfort_limit_mp", "a_d <= a_MP (1 + 1e-9)",
        lambda v, lim, lo, ok: f"acceleration with damper {_fmt(v)} m/s^2 {_rel(ok)} "
                               f"Melbourne & Palmer {_fmt(lim)} m/s^2",
        rtol=ACCELERATION_RTOL, unit="m/s^2")),
    (("direction_2",), CheckRule(
        "acceleration_2", "Direction 2: acceleration with damper within its limit",
        twin("=acceleration_with_damper_2", lambda acceleration_with_damper_2:
             acceleration_with_damper_2), "acceleration_limit_2", "a_d2 <= a_lim2 (1 + 1e-9)",
        lambda v, lim, lo, ok: f"direction 2: acceleration with damper {_fmt(v)} m/s^2 "
                               f"{_rel(ok)} limit {_fmt(lim)} m/s^2",
        rtol=ACCELERATION_RTOL, unit="m/s^2")),
    (("direction_2",), CheckRule(
        "combined_stroke", "Both directions: combined (SRSS) stroke within the clearance",
        twin("=combined_stroke", lambda combined_stroke: combined_stroke), "clearance",
        "SRSS(x_d1, x_d2) <= x_max",
        lambda v, lim, lo, ok: f"combined stroke {_fmt(v)} m {_rel(ok)} clearance "
                               f"{_fmt(lim)} m (SRSS, common practice, no source)", unit="m")),
    (("direction_2",), CheckRule(
        "combined_swing", "Both directions: combined swing within the accepted angle",
        twin("=combined_swing_deg", lambda combined_swing_deg: combined_swing_deg),
        "max_swing_deg", "asin(x_r / L) <= theta_max",
        lambda v, lim, lo, ok: f"combined swing {_fmt(v)} deg {_rel(ok)} {_fmt(lim)} deg",
        unit="deg")),
    (("direction_2",), CheckRule(
        "detuning_2", "Direction 2: detuning within the accepted value",
        twin("=ABS(detuning_2)", lambda detuning_2: np.abs(detuning_2)), "max_detuning",
        "|df_2/f_2| <= |df/f|_max",
        lambda v, lim, lo, ok: f"direction 2: |detuning| {v:.3%} {_rel(ok)} {lim:.3%}")),
    (("band", "direction_2"), CheckRule(
        "band_acceleration_2", "Direction 2, frequency band: worst acceleration with damper "
        "within its limit", twin("=band_worst_acceleration_2", lambda band_worst_acceleration_2:
                                 band_worst_acceleration_2), "acceleration_limit_2",
        "a_w2 <= a_lim2 (1 + 1e-9)",
        lambda v, lim, lo, ok: f"direction 2: worst acceleration over the band {_fmt(v)} "
                               f"m/s^2 {_rel(ok)} limit {_fmt(lim)} m/s^2",
        rtol=ACCELERATION_RTOL, unit="m/s^2")),
    (("direction_2", "extreme"), CheckRule(
        "extreme_combined_stroke", "Extreme level, both directions: combined stroke within the "
        "clearance", twin("=extreme_combined_stroke", lambda extreme_combined_stroke:
                          extreme_combined_stroke), "clearance", "x_r,x <= x_max",
        lambda v, lim, lo, ok: f"extreme-level combined stroke {_fmt(v)} m {_rel(ok)} "
                               f"clearance {_fmt(lim)} m (SRSS)", unit="m")),
    (("direction_2", "extreme"), CheckRule(
        "extreme_combined_swing", "Extreme level, both directions: combined swing within the "
        "accepted angle", twin("=extreme_combined_swing_deg", lambda extreme_combined_swing_deg:
                               extreme_combined_swing_deg), "max_swing_deg",
        "theta_r,x <= theta_max",
        lambda v, lim, lo, ok: f"extreme-level combined swing {_fmt(v)} deg {_rel(ok)} "
                               f"{_fmt(lim)} deg", unit="deg")),
)


def check_rules(parts: tuple[str, ...] = ()) -> tuple[CheckRule, ...]:
    """The design checks of a calculation with optional parts.

    .. math::

        R = R_{core} \\cup \\{r_P : P \\subseteq \\mathrm{parts}\\}

    Parameters
    ----------
    parts : tuple of str, optional
        Optional parts of the calculation, from ``functions.chain.PARTS`` [-].

    Returns
    -------
    rules : tuple of CheckRule
        In the order of the workbook's Checks sheet: :data:`CHECK_RULES`, then those of the
        parts (:data:`PART_CHECK_RULES`) [-].

    Raises
    ------
    ValueError
        Never: unknown parts simply add no check.

    Notes
    -----
    A part's check needs every part it reads: the as-built hanger length is checked against
    the adjustment range of the band only when both are given.

    Examples
    --------
    >>> [rule.name for rule in check_rules(("band",))][-2:]
    ['mass_ratio', 'band_acceleration']

    References
    ----------
    1. EN 1991-1-4:2005, Eurocode 1: Actions on structures - Wind actions, Annex B, B.2(6)
       (the resonant rule behind the acceleration checks).
    """
    return CHECK_RULES + tuple(rule for needs, rule in PART_CHECK_RULES
                               if all(part in parts for part in needs))


#: Names of every check a design can have (those of the parts included), in order.
ALL_CHECK_NAMES = CHECK_NAMES + tuple(rule.name for _, rule in PART_CHECK_RULES)


# --------------------------------------------------------------------------------------------
# results
# --------------------------------------------------------------------------------------------
class _Verdicts:
    """The verdicts of a result holding ``checks`` (a tuple of :class:`Check`)."""

    checks: tuple[Check, ...]

    @property
    def ok(self) -> bool:
        """True when every check passes."""
        return all(c.ok for c in self.checks)

    def check(self, name: str) -> Check:
        """The check called ``name``."""
        for c in self.checks:
            if c.name == name:
                return c
        raise KeyError(name)


@dataclass(frozen=True)
class DesignResult(_Verdicts):
    """Every cell of the design calculation and the checks.

    ``cells`` maps each defined name of the calculation (inputs in SI, every step of
    :func:`functions.chain.steps`, helpers included) to its value; the results of
    :data:`functions.quantities.DESIGN_RESULTS` are also attributes (``result.damper_mass``).
    ``method`` and ``mode`` say which steps ran (tuning method, mass-ratio mode).
    """

    inputs: DesignInputs
    cells: Mapping[str, float]
    checks: tuple[Check, ...]

    @property
    def method(self) -> str:
        """The tuning method that ran [-]."""
        return self.inputs.tuning_method

    @property
    def mode(self) -> str:
        """The mass-ratio mode that ran, one of ``functions.chain.MASS_RATIO_MODES`` [-]."""
        return mass_ratio_mode(self.inputs.mass_ratio is not None,
                               self.inputs.damper_mass is not None)

    def __getattr__(self, name: str) -> Any:
        # only called for names that are not fields: a declared result, read from the cells
        if not name.startswith("_"):
            cells = object.__getattribute__(self, "cells")     # AttributeError while unpickled
            for q in design_results():
                if q.name == name:
                    return cells[q.cell_name]
        raise AttributeError(f"DesignResult has no result {name!r}")

    @property
    def parts(self) -> tuple[str, ...]:
        """The optional parts that ran, from ``functions.chain.PARTS`` [-]."""
        return parts_of(self.inputs.as_dict())

    def to_dict(self) -> dict[str, Any]:
        """Flat dict: inputs, results (checking order), then check verdicts ``<name>_ok``.

        ``mass_ratio`` and ``damper_mass`` are the values used by the design (given or
        required), not the optional inputs.
        """
        results = design_results()
        result_names = {q.name for q in results}
        out: dict[str, Any] = {q.name: getattr(self.inputs, q.name) for q in design_inputs()
                               if q.name not in result_names}
        out.update({q.name: self.cells[q.cell_name] for q in results})
        out.update({f"{c.name}_ok": c.ok for c in self.checks})
        out["all_ok"] = self.ok
        return out


def design_tuning(mass_ratio, tuning_method="h2", structural_damping=0.0):
    """Tuning and damping ratios as the design chain applies a method.

    .. math::

        (f, \\zeta_d) = \\mathrm{optimum}(\\mu, \\zeta_s)\\ \\text{(h2, hinf)}, \\qquad
        (f, \\zeta_d) = \\mathrm{optimum}(\\mu, 0)\\ \\text{(closed forms)}

    Parameters
    ----------
    mass_ratio : float or array_like
        Damper mass over generalised modal mass, > 0 [-].
    tuning_method : str, optional
        One of ``functions.damper.OPTIMAL_TUNING_METHODS`` [-].
    structural_damping : float or array_like, optional
        Damping ratio of the structure without the damper, >= 0 [-].

    Returns
    -------
    tuning_ratio : float or numpy.ndarray
        f = f_d / f_s [-].
    damper_damping : float or numpy.ndarray
        Damper damping on its own frequency [-].

    Raises
    ------
    ValueError
        See :func:`functions.damper.optimal_tuning`.

    Notes
    -----
    The closed forms are derived for an undamped structure; the chain applies them as printed,
    ignoring the structure's damping. ``h2`` and ``hinf`` account for it.

    Examples
    --------
    >>> [round(x, 6) for x in design_tuning(0.02, "den_hartog", 0.01)]
    [0.980392, 0.085749]

    References
    ----------
    1. J. P. Den Hartog, Mechanical Vibrations, 4th ed., McGraw-Hill, 1956, §3.3.
    """
    mu = check_range("mass_ratio", mass_ratio, 0.0, low_open=True, unit="-")
    zs = check_range("structural_damping", structural_damping, 0.0, unit="-")
    mu, zs = broadcast(mass_ratio=mu, structural_damping=zs)
    if tuning_method in CLOSED_FORM_METHODS:
        zs = np.zeros_like(zs)
    f, zd = optimal_tuning(mu, tuning_method, zs)
    return scalar_or_array(f), scalar_or_array(zd)


def _run_steps(p: DesignInputs, parts: tuple[str, ...]) -> dict[str, float]:
    mode = mass_ratio_mode(p.mass_ratio is not None, p.damper_mass is not None)
    cells: dict[str, Any] = {q.cell_name: getattr(p, q.name) for q in design_inputs()
                             if q.kind != "choice" and getattr(p, q.name) is not None}
    for step in steps(p.tuning_method, mode, parts):
        try:
            cells[step.name] = step.evaluate(cells)
        except ValueError as exc:
            if step.name == "spring_stiffness_2":
                raise ValueError(f"frequency_2={p.frequency_2!r} Hz {exc}") from None
            if step.name == "band_mass_ratio":
                raise ValueError(f"band_lower={p.band_lower!r} to band_upper={p.band_upper!r} "
                                 f"[-]: {exc}") from None
            if step.name != "mass_ratio":
                raise
            raise ValueError(
                f"acceleration={p.acceleration!r} against acceleration_limit="
                f"{p.acceleration_limit!r} [m/s^2] needs required_damping="
                f"{cells['required_damping']:.4g}: {exc}") from None
    return cells


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
        Every cell of the calculation (units in :mod:`functions.quantities`) and the checks [-].

    Raises
    ------
    ValueError
        If an input is invalid (naming the field); if neither damper_mass nor mass_ratio is given
        and the structure already meets the limit (no damper is required) or the required mass
        ratio is out of reach; if the stroke cannot be reached by a pendulum of that frequency.

    Notes
    -----
    The steps of :mod:`functions.chain`: required damping (resonant rule, EN 1991-1-4 Annex B)
    -> mass ratio (given, or the smallest whose damper, tuned by ``tuning_method`` as the next
    step tunes it, reaches the required damping,
    :func:`functions.damper.required_mass_ratio`) -> tuning (``tuning_method``; the
    closed forms are derived for an undamped structure and are used as printed, ignoring the
    structure's damping; ``h2`` and ``hinf`` account for it) -> effective damping ->
    acceleration with the damper (resonant rule again) -> structure displacement (harmonic
    relation at f_s) -> stroke (RMS stroke ratio applied to peaks, i.e. equal peak factors) ->
    pendulum length in tune at its own design swing (:func:`functions.pendulum.pendulum_length`)
    -> swing angle, small-angle error and detuning at that swing (the pendulum runs faster by
    -detuning at small swings) -> stiffness and dashpot. The acceleration check allows a
    relative :data:`ACCELERATION_RTOL` for rounding, since a damper sized by the required mass
    ratio meets the limit exactly.

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
    elif not isinstance(inputs, DesignInputs):
        raise ValueError(f"inputs={inputs!r} must be a DesignInputs")
    elif kwargs:
        inputs = inputs.replace(**kwargs)
    p = inputs
    if p.mass_ratio is None and p.damper_mass is None and \
            p.acceleration <= p.acceleration_limit:
        raise ValueError(
            f"acceleration={p.acceleration!r} is already within acceleration_limit="
            f"{p.acceleration_limit!r} [m/s^2]: no damper is required; give damper_mass or "
            f"mass_ratio to size one anyway")
    parts = parts_of(p.as_dict())
    cells = _run_steps(p, parts)
    checks = tuple(rule.evaluate(cells) for rule in check_rules(parts))
    return DesignResult(p, cells, checks)


# --------------------------------------------------------------------------------------------
# the second sway direction of a design
# --------------------------------------------------------------------------------------------
#: Inputs of the second direction, in the order of :func:`design_second_direction`.
SECOND_DIRECTION_INPUTS = ("frequency_2", "modal_mass_2", "structural_damping_2",
                           "acceleration_2", "acceleration_limit_2")


@dataclass(frozen=True)
class SecondDirection(_Verdicts):
    """The damper of a design in its second sway direction (SI units), and the checks.

    The numbers are the direction-2 cells of the design chain (:mod:`functions.chain`, part
    ``direction_2``); ``cells`` holds them with the direction-2 inputs; ``checks`` are the
    checks of that part.
    """

    mass_ratio_2: float
    required_damping_2: float
    tuning_ratio_2: float
    damper_damping_2: float
    damper_frequency_2: float
    spring_stiffness_2: float
    dashpot_2: float
    effective_damping_2: float
    acceleration_with_damper_2: float
    structure_displacement_2: float
    stroke_ratio_2: float
    stroke_2: float
    swing_angle_deg_2: float
    small_swing_frequency_2: float
    frequency_at_swing_2: float
    detuning_2: float
    frequency_error_2: float
    required_mass_ratio_2: float
    required_damper_mass_2: float
    combined_stroke: float
    stroke_sum: float
    combined_swing_deg: float
    cells: Mapping[str, float]
    checks: tuple[Check, ...]


def design_second_direction(result, frequency, modal_mass, structural_damping, acceleration,
                            acceleration_limit, extreme_acceleration=None):
    """The design's pendulum mass in its second sway direction.

    .. math::

        \\mu_2 = \\frac{m_d}{M^*_2},\\quad k_2 = m_d (2\\pi)^2 (f_{d2}^2 - f_{d1}^2),\\quad
        c_2 = 2\\zeta_{d2} m_d (2\\pi f_{d2}),\\quad
        a_{d2} = a_2\\sqrt{\\frac{\\zeta_{s2}}{\\zeta_{eff,2}}},\\quad
        x_r = \\sqrt{x_{d1}^2 + x_{d2}^2}

    Parameters
    ----------
    result : DesignResult
        Direction 1's design (:func:`design_damper`): the damper's mass, tuning method,
        pendulum length and limits (clearance, swing, detuning) [-].
    frequency : float
        Frequency f_s2 of the second sway mode, in the range of the design's frequency [Hz].
    modal_mass : float
        Generalised mass M*_2 of that mode, normalised to 1 at the damper, > 0 [kg].
    structural_damping : float
        Damping ratio of that mode without the damper, in the design's range [-].
    acceleration : float
        Peak acceleration in direction 2 without the damper (service level), > 0 [m/s^2].
    acceleration_limit : float
        Accepted peak acceleration in direction 2, > 0 [m/s^2].
    extreme_acceleration : float or None, optional
        Peak acceleration in direction 2 without the damper at the extreme level; needed when
        the design has an extreme level, else left out [m/s^2].

    Returns
    -------
    direction : SecondDirection
        Every number of direction 2 and the combined stroke and swing (units: Hz, kg, N/m,
        N s/m, m/s^2, m, deg, ratios) with the checks [-].

    Raises
    ------
    ValueError
        If an input is outside its range (named ``frequency_2``, ...); if direction 2 needs a
        lower damper frequency than direction 1's pendulum gives (negative spring stiffness:
        give the lower-frequency direction as the main mode); if direction 2's limit needs a
        mass ratio out of reach.

    Notes
    -----
    The design chain with the second direction's inputs added (the same damper, sections
    "Second sway direction"): one mass, hangers cut for direction 1, springs in direction 2
    sized at direction 1's design swing (textbook omega^2 = g/L + k/m), uncorrelated
    directions combined by SRSS (common practice, no source). Direction 1's own checks stay in
    ``result.checks``. ``required_damper_mass_2`` is the mass direction 2 alone would need to
    meet its limit (0 when the structure alone meets it, or a damper of mass ratio 1e-4 would).

    Preliminary design aid: results must be checked by a licensed engineer against local
    codes, wind-tunnel data and the manufacturer's design.

    Examples
    --------
    Invented scenario: the tower of :func:`design_damper`'s example, its second sway mode at
    0.17 Hz with M*_2 = 18,000 t, 1.5 % damping, 0.2 m/s^2 against 0.15 m/s^2:

    >>> r = design_damper(frequency=0.15, modal_mass=2.0e7, structural_damping=0.015,
    ...                   acceleration=0.25, acceleration_limit=0.15, clearance=1.2)
    >>> d = design_second_direction(r, 0.17, 1.8e7, 0.015, 0.2, 0.15)
    >>> round(d.mass_ratio_2, 5), round(d.damper_frequency_2, 5)
    (0.01594, 0.16784)
    >>> round(d.spring_stiffness_2 / 1e3, 1), round(d.acceleration_with_damper_2, 4)
    (70.1, 0.1177)
    >>> round(d.stroke_2, 3), round(d.combined_stroke, 3), d.ok
    (0.552, 1.098, True)

    References
    ----------
    1. G. B. Warburton, Earthquake Eng. Struct. Dyn. 10:381-401, 1982.
    2. EN 1991-1-4:2005, Eurocode 1: Actions on structures - Wind actions, Annex B, B.2(6).
    3. S. S. Rao, Mechanical Vibrations, 5th ed., Prentice Hall, 2011 (springs in parallel).
    """
    if not isinstance(result, DesignResult):
        raise ValueError(f"result={result!r} must be a DesignResult (functions.design_damper)")
    given = dict(zip(SECOND_DIRECTION_INPUTS, (frequency, modal_mass, structural_damping,
                                               acceleration, acceleration_limit)))
    full = design_damper(result.inputs.replace(**given,
                                               extreme_acceleration_2=extreme_acceleration))
    names = [f.name for f in dataclasses.fields(SecondDirection)][:-2]
    cells = {n: full.cells[n] for n in (*SECOND_DIRECTION_INPUTS, *names)}
    own = {c.name for c in full.checks} - {c.name for c in result.checks}
    return SecondDirection(**{n: cells[n] for n in names}, cells=cells,
                           checks=tuple(c for c in full.checks if c.name in own))



# Tools that read the fields from the signature (help, the spreadsheet functions' catalogue)
# see the declared inputs.
DesignInputs.__signature__ = design_signature()  # type: ignore[attr-defined]
