# SPDX-License-Identifier: MIT
"""A step of the design chain and a section of steps (:mod:`functions.chain` declares them).

A :class:`Step` computes one cell of the calculation; a :class:`Section` groups steps under a
title with a note. :func:`closed_form`, :func:`from_form` and :func:`engine_value` make the
three kinds of step: a closed form written here with its worksheet formula, a twin declared in
an engine module (its expression and source kept), and an engine value guarded by a flag.
Imports run one way: steps -> worksheet.
"""
from __future__ import annotations

import functools
import inspect
from dataclasses import dataclass
from typing import Any, Callable

from functions.worksheet import form_of, renamed, twin

__all__ = ["Step", "Section", "closed_form", "from_form", "engine_value", "second_of"]


@dataclass(frozen=True)
class Step:
    """One cell of the calculation.

    ``compute`` takes the cells it reads as keyword arguments (its parameter names are defined
    names) and returns the cell's value. When it is a twin (:func:`functions.worksheet.twin`)
    its worksheet formula is the step's formula; otherwise ``formula`` names the workbook's
    helper cells that compute the same value (``""``: an engine value, no worksheet formula).
    """

    name: str
    compute: Callable[..., Any]
    expression: str = ""
    source: str = ""
    formula_via_helpers: str = ""
    #: Defined name of the flag that guards an engine value (its inputs changed since it was
    #: computed); '' for a worksheet formula.
    flag: str = ""

    @functools.cached_property
    def reads(self) -> tuple[str, ...]:
        """The cells this step reads (the parameters of ``compute``)."""
        return tuple(inspect.signature(self.compute).parameters)

    @property
    def formula(self) -> str:
        """The worksheet formula of the cell ('' for an engine value)."""
        form = form_of(self.compute)
        return form.formula if form is not None else self.formula_via_helpers

    @property
    def is_engine_value(self) -> bool:
        """True when the workbook shows the engine's number (no closed form)."""
        return not self.formula

    @property
    def is_twin(self) -> bool:
        """True when the worksheet formula and the numpy function are one closed form."""
        return form_of(self.compute) is not None

    def evaluate(self, cells: dict[str, Any]) -> float:
        """The step's value from the cells computed before it."""
        return float(self.compute(**{name: cells[name] for name in self.reads}))


@dataclass(frozen=True)
class Section:
    """A titled group of steps with a note for the reader."""

    title: str
    steps: tuple[Step, ...]
    note: str = ""


def closed_form(name: str, formula: str, compute: Callable[..., Any], expression: str,
                source: str = "") -> Step:
    """A closed-form step: its numpy ``compute`` and worksheet ``formula`` as one twin."""
    return Step(name, twin(formula, compute, expression, source), expression, source)


def from_form(name: str, form: Callable[..., Any]) -> Step:
    """A step from a twin declared in an engine module (its expression and source kept)."""
    return Step(name, form, form.worksheet.expression, form.worksheet.source)


def engine_value(name: str, compute: Callable[..., Any], expression: str, source: str,
                 flag: str) -> Step:
    """An engine value (no closed form), guarded by the flag named ``flag``."""
    return Step(name, compute, expression, source, flag=flag)


def second_of(step: Step, names: dict[str, str]) -> Step:
    """Direction 2's copy of a main-direction step: every name it reads, and its own, renamed
    by ``names``; an engine value guarded by the direction-2 copy of its flag."""
    return Step(names[step.name], renamed(step.compute, names), step.expression + " (dir. 2)",
                step.source, flag=step.flag and step.flag + "_2")
