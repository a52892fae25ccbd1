# SPDX-License-Identifier: MIT
"""Worksheet twins (functions.worksheet): every formula equals its numpy twin.

A twin is one closed form written twice (functions.worksheet.twin): the numpy function the
engine evaluates and the native formula a workbook shows. Here each formula is evaluated by the
builder's formula evaluator (workbook_builder.xlsx.formulas, the evaluator whose results every
workbook carries as cached values, itself checked against LibreOffice and Gnumeric in the
spreadsheet tests) and compared with the numpy value. The numpy side is checked against
independent references in test_damper.py, test_design.py and test_pendulum.py.

The names a formula reads (formula_names) are what twin() compares with the numpy function's
parameters: strings, numbers, cell references, TRUE/FALSE and function names are not names
(worksheet syntax as Excel and LibreOffice read it, common practice, no source).
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from openpyxl import Workbook
from openpyxl.workbook.defined_name import DefinedName

from functions.closed_forms import CLOSED_FORMS
from functions.design import CHECK_RULES, design_damper
from functions.quantities import DESIGN_INPUTS, by_name
from functions.worksheet import (TWIN_TOLERANCE, WorksheetForm, form_of, formula_names,
                                 twin)
from workbook_builder.xlsx.formulas import Evaluator, check_formula

INPUTS = by_name(DESIGN_INPUTS)


def evaluate(formula: str, values: dict[str, float]):
    """Evaluate a formula over defined names holding ``values``."""
    wb = Workbook()
    ws = wb.active
    ws.title = "V"
    for i, (name, v) in enumerate(values.items(), start=1):
        ws.cell(i, 1, float(v))
        wb.defined_names.add(DefinedName(name, attr_text=f"V!$A${i}"))
    return Evaluator(wb).evaluate(formula, "V")


def _uniform(rng, q, log=False):
    lo = q.low if q.low > 0 or not log else q.high * 1e-4
    lo = max(lo, q.high * 1e-4) if log else lo
    if log:
        return float(math.exp(rng.uniform(math.log(lo), math.log(q.high))))
    x = float(rng.uniform(q.low, q.high))
    return x if q.contains(x) else float(q.high)


def _cases(n=60, seed=20261202):
    """Design inputs spread over their declared valid ranges (engine failures skipped)."""
    rng = np.random.default_rng(seed)
    out = []
    # every method that needs no frequency band (robust: test_chain.py, test_gnumeric.py)
    methods = tuple(m for m in INPUTS["tuning_method"].choices if m != "robust")
    while len(out) < n:
        kw = {name: _uniform(rng, INPUTS[name], log=True) for name in
              ("frequency", "modal_mass", "structural_damping")}
        kw["acceleration_limit"] = _uniform(rng, INPUTS["acceleration_limit"], log=True)
        kw["acceleration"] = min(10.0, kw["acceleration_limit"] * rng.uniform(1.05, 3.0))
        kw["clearance"] = 100.0
        kw["max_swing_deg"] = _uniform(rng, INPUTS["max_swing_deg"])
        kw["max_detuning"] = _uniform(rng, INPUTS["max_detuning"])
        kw["tuning_method"] = methods[len(out) % len(methods)]
        which = len(out) % 3
        if which == 1:
            kw["mass_ratio"] = _uniform(rng, INPUTS["mass_ratio"], log=True)
        elif which == 2:
            kw["damper_mass"] = 0.02 * kw["modal_mass"]
        try:
            out.append(design_damper(**kw))
        except ValueError:
            continue                       # e.g. a stroke no pendulum of that frequency reaches
    return out


CASES = _cases()


def test_cases_cover_every_method_and_mode():
    assert {(r.method, r.mode) for r in CASES} >= {(m, d) for m in ("h2", "den_hartog")
                                                    for d in ("required", "chosen_mass_ratio",
                                                              "chosen_damper_mass")}


@pytest.mark.parametrize("k", range(len(CASES)))
def test_every_step_formula_equals_its_numpy_twin(k):
    from functions.chain import steps
    r = CASES[k]
    for step in steps(r.method, r.mode):
        if not step.is_twin:
            continue
        got = evaluate(step.formula, {n: r.cells[n] for n in step.reads})
        want = r.cells[step.name]
        assert isinstance(got, float), (step.name, got)
        rel = abs(got - want) / abs(want) if want else abs(got)
        assert rel <= 1e-13, (step.name, got, want, rel)


@pytest.mark.parametrize("k", range(len(CASES)))
def test_verdict_formulas_give_the_engine_verdicts(k):
    r = CASES[k]
    for rule in CHECK_RULES:
        names = set(formula_names(rule.verdict_formula))
        got = evaluate(rule.verdict_formula, {n: r.cells[n] for n in names})
        assert got == ("OK" if r.check(rule.name).ok else "NOT OK"), rule.name


@pytest.mark.parametrize("method", list(CLOSED_FORMS))
def test_closed_form_optima_formulas_over_the_mass_ratio_range(method):
    # the whole valid range of the mass ratio input (0, 0.2], and beyond up to 1
    for mu in np.concatenate([np.geomspace(1e-4, 0.2, 25), [0.5, 1.0]]):
        for f in CLOSED_FORMS[method]:
            check_formula(f.worksheet.formula)
            got = evaluate(f.worksheet.formula, {"mass_ratio": mu})
            assert got == pytest.approx(float(f(mu)), rel=1e-14, abs=0.0), (method, mu)


def test_twin_refuses_a_formula_that_reads_other_names():
    with pytest.raises(TypeError, match="reads \\['a', 'b'\\] but its numpy twin takes \\['a'\\]"):
        twin("=a*b", lambda a: a)
    with pytest.raises(TypeError, match="must start with '='"):
        twin("a", lambda a: a)


def test_tolerance_is_what_the_workbooks_accept():
    # the Checks sheet accepts this relative difference between a formula and the engine
    assert TWIN_TOLERANCE == 1e-9


# ----------------------------------------------------------------------------- formula_names
@pytest.mark.parametrize("formula, names", [
    # strings, with doubled quotes inside, hold no names
    ('=IF(a>1,"big name","x")', ("a",)),
    ('=IF(b,"say ""c"" to d","SQRT(e)")', ("b",)),
    ('=""', ()),
    # numbers, with exponents, are not names (the E of 1E-9 is no name)
    ("=1E-9*a+2.5e+3*b+.5E2*c+1.e5*d", ("a", "b", "c", "d")),
    ("=3E8", ()),
    ("=5%*m", ("m",)),
    # cell references and ranges are not names
    ("=A1*a+$A1*b+SUM(A1:B2)*c+XFD1048576*d+aa10*e", ("a", "b", "c", "d", "e")),
    # TRUE and FALSE in any case are values
    ("=IF(TRUE,a,FALSE)+true*b+False*c", ("a", "b", "c")),
    # function names (a name followed by "(", spaces allowed, dots inside) are not names
    ("=SQRT(a)+sqrt (b)+NORM.S.DIST(c,TRUE)+MAX(d,e)", ("a", "b", "c", "d", "e")),
    # names: letters, digits, underscores and dots, first use first, each once
    ("=b*a+b*c+a", ("b", "a", "c")),
    ("=_x+mass_ratio*2+a.b", ("_x", "mass_ratio", "a.b")),
])
def test_formula_names(formula, names):
    assert formula_names(formula) == names


@pytest.mark.parametrize("formula", ["=$B$2*a", "=A$1*a"])
def test_formula_names_absolute_row_references_are_not_names(formula):
    assert formula_names(formula) == ("a",)


@pytest.mark.parametrize("formula", ["=Inputs!B5*a", "='Calc sheet'!B5*a"])
def test_formula_names_sheet_prefixes_are_not_names(formula):
    assert formula_names(formula) == ("a",)


# ----------------------------------------------------------------------------- form_of
def test_form_of_a_twin():
    def compute(a, b):
        return a * b

    made = twin("=b*a", compute, "a b", "common practice, no source")
    assert made is compute                                 # the same function, marked
    form = form_of(compute)
    assert form == WorksheetForm("=b*a", ("a", "b"), "a b", "common practice, no source")
    assert form.names == ("a", "b")                        # in the order of the parameters
    assert compute(2.0, 3.0) == 6.0


def test_form_of_a_plain_function_is_none():
    assert form_of(lambda mass_ratio: 1.0 / (1.0 + mass_ratio)) is None
    assert form_of(math.sqrt) is None


def test_form_of_the_closed_forms():
    tuning, damping = CLOSED_FORMS["den_hartog"]
    assert form_of(tuning).formula == "=1/(1+mass_ratio)"
    assert form_of(damping).names == ("mass_ratio",)
