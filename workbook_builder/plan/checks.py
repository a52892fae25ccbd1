# SPDX-License-Identifier: MIT
"""The Checks sheet: design checks, the cross-check of every formula against the engine.

Design checks come from :data:`functions.design.CHECK_RULES`, each rule's worksheet verdict
beside the engine's (same rule, same tolerance). The cross-check puts every result formula of
the Calculation sheet beside the engine's value (named ``engine_<result>``) with its relative
difference against :data:`functions.worksheet.TWIN_TOLERANCE`. Then the Pendulum sheet's
convergence, the engine-value flags and, with a Nonlinear sheet, the time-domain checks.
"""
from __future__ import annotations

from functions.chain import steps
from functions.design import check_rules
from functions.quantities import PART_RESULTS, design_results, quantity
from functions.worksheet import TWIN_TOLERANCE

from ..project.units import us_display
from .calculation import engine_flags, unit_format
from .options import PlanOptions
from .pendulum import CONVERGENCE
from .sheet import Looks, SheetLayout

__all__ = ["checks_sheet", "check_name", "engine_name", "cross_checked", "NOT_DEFINED", "SCIENTIFIC",
           "NONLINEAR_CHECKS"]

#: Number format of relative differences and tolerances.
SCIENTIFIC = "0.000E+00"
#: Number format of the values compared with the engine: 5 significant digits (the relative
#: difference beside them shows the agreement to the last digit).
_COMPARED = "0.0000E+00"
#: Shown for an engine value that is not defined (NaN: e.g. no detuning beyond 180 deg).
NOT_DEFINED = "not defined"

#: Checks of the time-domain simulation: (name, label, rule, value, limit, unit, verdict).
NONLINEAR_CHECKS = (
    ("sim_check_departure", "Nonlinear response within the tolerance of the linearised damper",
     "departure <= tolerance", "=sim_departure", "=sim_tolerance", "-", "=sim_verdict"),
    ("sim_check_detuning", "Detuning at the simulated peak swing within the accepted value",
     "|df/f| <= |df/f|_max", f'=IFERROR(ABS(sim_detuning),"{NOT_DEFINED}")', "=max_detuning",
     "-", '=IFERROR(IF(ABS(sim_detuning)<=max_detuning,"OK","NOT OK"),"NOT OK")'),
    ("sim_check_swing", "Simulated peak swing within the accepted angle",
     "theta_sim <= theta_max", "=sim_swing_deg", "=max_swing_deg", "deg",
     '=IF(sim_swing_deg<=max_swing_deg,"OK","NOT OK")'),
)


#: Results of the optional parts of the calculation (their formulas are cross-checked too).
_PART_RESULTS = frozenset(q.cell_name for q in PART_RESULTS)


def check_name(rule_name: str) -> str:
    """Defined name of a design check's verdict cell."""
    return f"check_{rule_name}"


def engine_name(result: str) -> str:
    """Defined name of a result's engine value on the Checks sheet."""
    return f"engine_{result}"


def cross_checked(options: PlanOptions) -> list[str]:
    """The results whose formula is cross-checked against the engine, in sheet order."""
    results = {q.cell_name for q in design_results()}
    return [s.name for s in steps(options.tuning_method, options.mass_ratio_mode, options.parts)
            if s.name in results or (s.name in _PART_RESULTS and not s.is_engine_value)]


def _nonlinear(sh: SheetLayout, row: int) -> int:
    sh.label(row, 1, "Nonlinear check: time-domain simulation (engine values computed when the "
                     "workbook was built; see the Nonlinear sheet)", Looks.BOLD)
    row += 1
    sh.header(row, ["Check", "Rule", "Value", "Limit", "Lower limit", "Unit", "Verdict"])
    row += 1
    first = row
    for name, label, rule, value, limit, unit, verdict in NONLINEAR_CHECKS:
        sh.label(row, 1, label, "wrap box")
        sh.label(row, 2, rule, "box")
        sh.formula(row, 3, value, fmt=unit_format(unit), style="box")
        sh.formula(row, 4, limit, fmt=unit_format(unit), style="box")
        sh.blank(row, 5, "box")
        sh.label(row, 6, unit, "box")
        sh.check(row, 7, verdict, name=name, label=label)
        row += 1
    sh.verdicts(f"G{first}:G{row - 1}")
    sh.label(row, 1, "For information: detuning measured from the simulated swing, and the "
                     "exact-period prediction at the peak swing", "wrap box")
    sh.label(row, 2, "measured / predicted", "box")
    sh.formula(row, 3, "=sim_measured_detuning", fmt=unit_format("-"), style="box")
    sh.formula(row, 4, "=sim_detuning", fmt=unit_format("-"), style="box")
    sh.blank(row, 5, "box")
    sh.label(row, 6, "-", "box")
    sh.label(row, 7, "info", "box")
    return row + 1


def _design_check(sh: SheetLayout, row: int, rule, us: bool) -> None:
    """One design check: value, limit and lower limit in the display unit (US first, the SI
    values beside them in H:J), the verdict in G."""
    sh.label(row, 1, rule.label, "wrap box")
    sh.label(row, 2, rule.rule, "box")
    unit, factor = us_display(rule.unit) if us else (rule.unit, 1.0)
    fmt = unit_format(unit)
    formulas = [rule.value_formula, f"={rule.limit}", f"={rule.lower}" if rule.lower else ""]
    for col, formula in zip((3, 4, 5), formulas):
        if not formula:
            sh.blank(row, col, "box")
        elif factor == 1.0:
            sh.formula(row, col, formula, fmt=fmt, style="box")
        else:
            sh.formula(row, col, f"=({formula[1:]})/{factor!r}", fmt=fmt, style="box")
    sh.label(row, 6, unit, "box")
    sh.check(row, 7, rule.verdict_formula, name=check_name(rule.name), label=rule.label)
    if us:
        for col, formula in zip((8, 9), formulas):
            sh.formula(row, col, formula, fmt=unit_format(rule.unit), style="box secondary")
        sh.label(row, 10, rule.unit, "box secondary")


def checks_sheet(options: PlanOptions) -> SheetLayout:
    """The Checks sheet for ``options``."""
    sh = SheetLayout("Checks")
    sh.label(1, 1, "Checks", Looks.TITLE)
    sh.header(3, ["Design check", "Rule", "Value", "Limit", "Lower limit", "Unit", "Verdict"]
              + (["Value (SI)", "Limit (SI)", "SI unit"] if options.us else []))
    row = 4
    rules = check_rules(options.parts)
    for rule in rules:
        _design_check(sh, row, rule, options.us)
        row += 1
    sh.verdicts(f"G4:G{row - 1}")
    cells = ",".join(f'{check_name(r.name)}="OK"' for r in rules)
    sh.label(row, 1, "All design checks", "bold box")
    sh.check(row, 7, f'=IF(AND({cells}),"OK","NOT OK")', name="all_design_checks",
             label="Verdict of all design checks")
    sh.verdicts(f"G{row}")
    row += 3

    sh.label(row, 1, "Cross-check of every formula result against the engine (functions/, "
                     "computed when the workbook was built or last recalculated by swaytune)",
             Looks.BOLD)
    row += 1
    sh.header(row, ["Quantity", "Symbol", "Workbook formula", "Engine value",
                    "Relative difference (rounded to 1e-12)", "Tolerance", "Verdict"])
    row += 1
    first = row
    for name in cross_checked(options):
        q = quantity(name)
        sh.label(row, 1, q.label, "wrap box")
        sh.label(row, 2, q.symbol, "box")
        sh.formula(row, 3, f"={name}", fmt=_COMPARED, style="box")
        sh.engine(row, 4, ("cell", name), fmt=_COMPARED, name=engine_name(name), unit=q.unit,
                  label=f"Engine value of {q.label.lower()}")
        sh.formula(row, 5, f"=ROUND(IF(D{row}=0,ABS(C{row}),ABS(C{row}/D{row}-1)),12)",
                   fmt=SCIENTIFIC, style="box")
        sh.value(row, 6, TWIN_TOLERANCE, fmt=SCIENTIFIC, style="box")
        sh.check(row, 7, f'=IF(E{row}<=F{row},"OK","NOT OK")')
        row += 1
    sh.verdicts(f"G{first}:G{row - 1}")
    cells = ",".join(f'G{r}="OK"' for r in range(first, row))
    sh.label(row, 1, "All cross-checks", "bold box")
    sh.check(row, 7, f'=IF(AND({cells}),"OK","NOT OK")', name="all_cross_checks",
             label="Verdict of all engine cross-checks")
    sh.verdicts(f"G{row}")
    row += 2
    sh.label(row, 1, f"Pendulum fixed point converged (last relative change <= "
                     f"{CONVERGENCE:g})", "wrap box")
    sh.formula(row, 3, "=fixed_point_change", fmt=SCIENTIFIC, style="box")
    sh.check(row, 7, f'=IF(fixed_point_change<={CONVERGENCE:.0E},"OK","NOT OK")',
             name="fixed_point_converged", label="Verdict: fixed point converged")
    sh.verdicts(f"G{row}")
    row += 1
    for flag, what in engine_flags(options):
        sh.label(row, 1, f"Engine value of the {what} current (inputs unchanged since the "
                         "build)", "wrap box")
        sh.check(row, 7, f'=IF({flag}="current","OK","NOT OK")', name=f"{flag}_ok",
                 label=f"Verdict: engine value of the {what} current")
        sh.verdicts(f"G{row}")
        row += 1
    if options.simulation is not None:
        row = _nonlinear(sh, row + 2)
    sh.widths([40, 25, 14, 14, 12, 10, 10] + ([12, 12, 8] if options.us else []))
    sh.page(landscape=options.us, title_rows="1:3", freeze="A4")
    return sh
