# SPDX-License-Identifier: MIT
"""The whole plan of a workbook, sheet by sheet, from its layout options.

Sheets in order: Summary, Inputs, Calculation, Pendulum, Checks, Charts, Band (with a
frequency band), Comfort (with a comfort criterion), Supply (with a supply specification),
Nonlinear (with a simulation), Names, Cautions, Record. The plan depends only on
:class:`workbook_builder.plan.options.PlanOptions`: a builder draws it, batch recalculation
rebuilds it from the options stored in a workbook and reads the workbook through its names.
"""
from __future__ import annotations

import functools
from collections import Counter

from .calculation import calculation_sheet
from .charts import band_sheet, charts_sheet, comfort_sheet
from .checks import checks_sheet
from .inputs import inputs_sheet
from .model import Plan
from .nonlinear import nonlinear_sheet
from .options import PlanOptions
from .pendulum import pendulum_sheet
from .reference import cautions_sheet, names_sheet, record_sheet
from .summary import summary_sheet
from .supply import supply_sheet

__all__ = ["make_plan", "SHEETS"]

#: Every sheet a plan can hold, in workbook order.
SHEETS = ("Summary", "Inputs", "Calculation", "Pendulum", "Checks", "Charts", "Band", "Comfort",
          "Supply", "Nonlinear", "Names", "Cautions", "Record")


@functools.lru_cache(maxsize=64)
def make_plan(options: PlanOptions) -> Plan:
    """The plan of a workbook laid out for ``options`` (cached and sealed: plans are not
    modified).

    Raises
    ------
    ValueError
        For options no plan can be made for (see :class:`PlanOptions`).
    """
    plan = Plan(options)
    layouts = [summary_sheet(options), inputs_sheet(options), calculation_sheet(options),
               pendulum_sheet("extreme" in options.parts), checks_sheet(options),
               charts_sheet(options)]
    if "band" in options.parts:
        layouts.append(band_sheet(options))
    if "comfort" in options.parts:
        layouts.append(comfort_sheet(options))
    if "supply" in options.parts:
        layouts.append(supply_sheet(options))
    if options.simulation is not None:
        layouts.append(nonlinear_sheet(options))
    plan.sheets = [sh.plan for sh in layouts] + [cautions_sheet().plan,
                                                 record_sheet(options).plan]
    plan.sheets.insert(len(layouts), names_sheet(plan).plan)      # lists every other name
    counts = Counter([c.name for _, c in plan.cells() if c.name] + list(plan.range_names()))
    duplicates = sorted(n for n, k in counts.items() if k > 1)
    if duplicates:
        raise ValueError(f"the plan defines {duplicates} twice")
    return plan.seal()
