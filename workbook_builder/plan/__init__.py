# SPDX-License-Identifier: MIT
"""The workbook plan as data, one module per sheet.

    model        Cell, SheetPlan, Plan, charts and validations as plain data
    options      PlanOptions: everything the layout depends on (stored in the workbook)
    sheet        SheetLayout: the vocabulary the sheet modules lay out cells with
    summary, inputs, calculation, pendulum, checks, charts, nonlinear, reference
                 one module per sheet (reference: Names, Cautions, Record)
    layout       make_plan(options): every sheet in order
    values       the values of sourced cells (project inputs and texts, engine numbers)
"""
from .layout import SHEETS, make_plan
from .model import Plan
from .options import (FORMAT_NAME, PLAN_PROPERTY, PLAN_VERSION, SIMULATION_PROPERTY,
                      PlanOptions, options_for)

__all__ = ["make_plan", "SHEETS", "Plan", "PlanOptions", "options_for", "PLAN_VERSION",
           "FORMAT_NAME", "PLAN_PROPERTY", "SIMULATION_PROPERTY"]
