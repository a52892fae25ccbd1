# SPDX-License-Identifier: MIT
"""Declaration of every spreadsheet function: name, engine call, help texts, defaults.

One list, read by every medium: :mod:`functions.udf` builds the xlwings wrappers from it (function
wizard description, per-argument help, which arguments are optional), the documentation
generator writes the function reference from it, and the tests check every entry against the
engine. Adding a spreadsheet function is one entry in the module of its topic:
:mod:`functions.udf` generates its wrapper at import.

    declaration  the kinds of arguments and functions, Argument, SheetFunction (the cell
                 conventions are described there)
    mechanics    one pendulum, one structural mode, one damper: closed forms and optima
    envelope     the damper over a band of building frequencies
    levels       the extreme wind level, the buffers and the occupied floor's comfort
    directions   one pendulum mass for two sway directions: springs, combined stroke
    design       the time-domain check and the whole design chain (SWAY_DESIGN)

This module assembles them (:data:`FUNCTIONS`, :data:`BY_NAME`), says which public engine
functions have no worksheet function of their own (:data:`COVERED_ELSEWHERE`), lists the
messages of the guide (:data:`MESSAGES`) and writes the function reference
(:func:`reference_markdown`). The names of :mod:`functions.catalogue.declaration` are
re-exported here. No xlwings import here: plain declarations and the pure-text generator of
the function reference.
"""
from __future__ import annotations

import math
from typing import Any, Callable

from functions import damper

from functions.catalogue.declaration import (
    CATEGORY, ELEMENTWISE, FIELDS, FLAG, LISTS, LOOKUP, NUMBER, PREFIX, REQUIRED, ROW_REDUCE,
    ROWS, SUMMARY, TEXT, Argument, SheetFunction, engine_default, python_name,
)
from functions.catalogue.design import DESIGN, SIMULATION, design_sheet_functions
from functions.catalogue.directions import DIRECTIONS
from functions.catalogue.envelope import ENVELOPE
from functions.catalogue.levels import LEVELS
from functions.catalogue.supply import SUPPLY
from functions.catalogue.mechanics import DAMPER, PENDULUM, STRUCTURE

__all__ = [
    "PREFIX", "CATEGORY", "NUMBER", "ROWS", "TEXT", "FLAG", "ELEMENTWISE", "ROW_REDUCE", "LISTS",
    "LOOKUP", "SUMMARY", "FIELDS", "Argument", "SheetFunction", "FUNCTIONS", "BY_NAME",
    "COVERED_ELSEWHERE", "MESSAGES", "TOPICS", "python_name", "engine_default",
    "design_sheet_functions", "reference_markdown",
]

#: Default of a required argument (``declaration.REQUIRED``; the tests read it by this name).
_REQUIRED = REQUIRED

#: Every worksheet function, in documentation order.
FUNCTIONS: tuple[SheetFunction, ...] = (PENDULUM + STRUCTURE + DAMPER + ENVELOPE + LEVELS
                                        + DIRECTIONS + SUPPLY
                                        + SIMULATION + DESIGN)

#: Excel name -> declaration.
BY_NAME: dict[str, SheetFunction] = {f.name: f for f in FUNCTIONS}

#: Public engine functions with no worksheet function of their own, and why.
COVERED_ELSEWHERE: dict[str, str] = {
    "functions.study.design_table":
        "a table of whole designs over input arrays, for scripts; in a sheet, SWAY_DESIGN "
        "copied down rows of inputs gives one design per row",
    "functions.relations.input_relation_errors":
        "checks a whole set of inputs against each other; SWAY_DESIGN returns the same "
        "messages in its cell",
    "functions.design.check_rules":
        "the list of design checks a calculation with optional parts holds, not a number; "
        "SWAY_DESIGN returns the verdicts",
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
    "functions.design.design_second_direction":
        "takes direction 1's DesignResult and returns an object; in a sheet, SWAY_DESIGN gives "
        "direction 1 and SWAY_SPRING_STIFFNESS, SWAY_COMBINED_STROKE with the one-direction "
        "functions (SWAY_OPTIMAL_TUNING_RATIO, SWAY_EFFECTIVE_DAMPING, ...) give direction 2",
    "functions.simulation.hanger_damping":
        "one product and quotient, zeta_d f_d / f_L, used by the workbook builder to pass the "
        "designed dashpot to simulate",
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
    ("SWAY_BAND_WORST_ACCELERATION", (1.05, 1.1, 0.2, 0.02, 0.9846, 0.0702, 0.01),
     "band_lower=1.05 must be in [0.5, 1] [-] (frequency factor f_actual/f_nominal; the band "
     "must contain the nominal, 1)",
     "A band of building frequencies that does not contain the nominal frequency."),
)

TOPICS = {
    "pendulum": "Pendulum",
    "structure": "Structure",
    "damper": "Damper",
    "envelope": "Frequency band",
    "levels": "Extreme level and comfort",
    "directions": "Two sway directions",
    "supply": "Supply specification",
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
