# SPDX-License-Identifier: MIT
"""The declaration of a worksheet function: its kinds, :class:`Argument` and :class:`SheetFunction`.

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

Plain data and the engine's signatures only: no engine module and no xlwings import here.
"""
from __future__ import annotations

import inspect
from dataclasses import dataclass
from typing import Any, Callable

__all__ = [
    "PREFIX", "CATEGORY", "NUMBER", "ROWS", "TEXT", "FLAG", "ELEMENTWISE", "ROW_REDUCE", "LISTS",
    "LOOKUP", "SUMMARY", "FIELDS", "REQUIRED", "Argument", "SheetFunction", "python_name",
    "engine_default",
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

#: Default of an argument that has none (the argument is required).
REQUIRED = object()


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
    default: Any = REQUIRED
    kind: str = NUMBER
    param: str | None = None
    choices: tuple[str, ...] = ()
    fraction: bool = False
    integer: bool = False
    position: bool = False

    @property
    def optional(self) -> bool:
        return self.default is not REQUIRED

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
    """Default value of ``param`` in the engine's signature (``REQUIRED`` if none)."""
    p = fn.parameters[param]
    return REQUIRED if p.default is inspect.Parameter.empty else p.default
