# SPDX-License-Identifier: MIT
"""The workbook plan: complete, self-consistent and independent of the numbers.

Options and their JSON: test_plan_options.py; cell kinds: test_plan_model.py.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import itertools

import pytest

from functions.chain import MASS_RATIO_MODES
from functions.damper import OPTIMAL_TUNING_METHODS
from functions.quantities import DESIGN_INPUTS
from functions.worksheet import formula_names
from workbook_builder.plan import PlanOptions, make_plan
from workbook_builder.plan.inputs import entered_name, factor_name, unit_name
from workbook_builder.plan.layout import SHEETS
from workbook_builder.plan.model import refreshed
from workbook_builder.xlsx.formulas import check_formula

NUMERIC = tuple(q.name for q in DESIGN_INPUTS if q.kind != "choice")


#: The inputs of each optional part of the calculation.
PART_INPUTS = {"band": {"band_lower", "band_upper", "response_exponent"},
               "as_built": {"measured_frequency"}, "measured_damping": {"measured_damping"}}
ALL_PARTS = ("band", "as_built", "measured_damping")
#: The supply specification with everything it shows (both directions, the band's range).
SUPPLY_PARTS = ("band", "extreme", "direction_2", "supply", "dashpots_at_extreme")


def _inputs(mode: str, floors: int, parts: tuple[str, ...] = ()) -> tuple[str, ...]:
    drop = {"chosen_mass_ratio": {"damper_mass"}, "chosen_damper_mass": {"mass_ratio"},
            "required": {"mass_ratio", "damper_mass"}}[mode]
    if floors:
        drop = drop | {"modal_mass"}
    for part, names in PART_INPUTS.items():
        if part not in parts:
            drop = drop | names
    return tuple(n for n in NUMERIC if n not in drop)


OPTIONS = [PlanOptions(units=units, tuning_method=method, mass_ratio_mode=mode,
                       inputs=_inputs(mode, floors, parts), floors=floors, template=template,
                       simulation=sim, parts=parts)
           for method, mode, units, floors, template, sim, parts in itertools.product(
               OPTIMAL_TUNING_METHODS, MASS_RATIO_MODES, ("SI", "US"), (0, 4), (False, True),
               (None, ("random", 50, 20), ("harmonic", 30, 10)),
               ((), ("band",), ("as_built",), ALL_PARTS))
           if not (template and sim) and (method in ("h2", "den_hartog") or units == "SI")
           and (not parts or (floors == 0 and not template and sim != ("harmonic", 30, 10)))] + [
    # the robust tuning, with the band it is tuned for
    PlanOptions(units=units, tuning_method="robust", mass_ratio_mode=mode,
                inputs=_inputs(mode, 0, parts), simulation=sim, parts=parts)
    for mode, units, sim, parts in itertools.product(
        MASS_RATIO_MODES, ("SI", "US"), (None, ("random", 50, 20)), (("band",), ALL_PARTS,
                                                            SUPPLY_PARTS))]


@pytest.mark.parametrize("options", OPTIONS, ids=lambda o: f"{o.tuning_method}-{o.mass_ratio_mode}"
                         f"-{o.units}-{o.floors}-{int(o.template)}-{(o.simulation or ['-'])[0]}"
                         f"-{'+'.join(o.parts) or 'core'}")
def test_plan_is_consistent(options):
    plan = make_plan(options)
    names = set(plan.names()) | set(plan.range_names())
    assert [s.title for s in plan.sheets] == [
        t for t in SHEETS if (t != "Nonlinear" or options.simulation)
        and (t != "Band" or "band" in options.parts)
        and (t != "Comfort" or "comfort" in options.parts)
        and (t != "Supply" or "supply" in options.parts)]
    for sheet, cell in plan.cells():
        if cell.kind in ("formula", "check"):
            check_formula(cell.content)
            unknown = set(formula_names(cell.content)) - names
            assert not unknown, f"{sheet}!{cell.ref} {cell.content} reads undefined {unknown}"
        if refreshed(cell):
            # recalculation writes it through a name or a named range
            assert cell.name or any(sheet == s for s, _ in plan.range_names().values())
    for name in options.inputs:
        q = next(q for q in DESIGN_INPUTS if q.name == name)
        for n in (q.cell_name, entered_name(q.cell_name), unit_name(q.cell_name),
                  factor_name(q.cell_name)):
            assert n in names, n
    for sheet in plan.sheets:
        for v in sheet.validations:
            check_formula(v.formula)


def test_every_engine_value_of_the_optional_parts_is_flagged():
    plan = make_plan(PlanOptions(tuning_method="h2", mass_ratio_mode="required",
                                 inputs=_inputs("required", 0, ALL_PARTS), parts=ALL_PARTS))
    names = plan.names()
    flagged = {"engine_flag_band": ("band_lower", "response_exponent", "tuning_ratio"),
               "engine_flag_band_mass": ("acceleration_limit", "band_upper"),
               "engine_flag_robust": ("mass_ratio", "band_lower"),
               "engine_flag_robust_worst": ("robust_tuning_ratio",),
               "engine_flag_as_built": ("mass_ratio", "measured_damping")}
    for flag, deps in flagged.items():
        assert flag in names and f"{flag}_ok" in names
        for dep in deps:
            assert f"{flag}_{dep}" in names
    for name in ("band_worst_acceleration", "band_mass_ratio", "robust_tuning_ratio",
                 "retune_tuning_ratio", "hanger_length_lower", "retune_dashpot",
                 "check_band_acceleration", "check_as_built_length", "chart_band"):
        assert name in names or name in plan.range_names(), name


def test_every_engine_value_of_the_chain_is_flagged():
    plan = make_plan(PlanOptions(tuning_method="hinf", mass_ratio_mode="required",
                                 inputs=_inputs("required", 0)))
    names = plan.names()
    for flag, deps in (("engine_flag_mass_ratio", ("required_damping", "structural_damping")),
                       ("engine_flag_tuning", ("mass_ratio", "structural_damping"))):
        assert flag in names and f"{flag}_ok" in names
        for dep in deps:
            assert f"{flag}_{dep}" in names


@pytest.mark.parametrize("options", OPTIONS[:12], ids=lambda o: f"{o.tuning_method}-"
                         f"{o.mass_ratio_mode}-{o.units}-{o.floors}-{(o.simulation or ['-'])[0]}")
def test_every_sheet_with_a_header_row_freezes_it(options):
    """A sheet whose header rows repeat on every printed page keeps them on screen too."""
    plan = make_plan(options)
    for sheet in plan.sheets:
        heads = [c for c in sheet.cells.values() if c.style.split()[:1] == ["head"]]
        if sheet.title in ("Summary", "Record"):   # one page: its tables' headers are on it
            # (the design envelope's Summary: inputs, then results and verdicts, at full width)
            assert sheet.pages == (0 if sheet.title == "Summary" and options.parts else 1)
            continue
        if not heads:
            assert sheet.title in ("Charts", "Band", "Comfort", "Cautions", "Record"), sheet.title
        if not sheet.title_rows:
            # Inputs with a floor table: its header is not repeated, the panes still freeze
            assert not heads or (sheet.title == "Inputs" and options.floors), sheet.title
            assert sheet.freeze is not None or not heads, sheet.title
            continue
        last = int(sheet.title_rows.split(":")[1])
        assert sheet.freeze is not None, sheet.title
        assert int("".join(ch for ch in sheet.freeze if ch.isdigit())) > last, sheet.title
