# SPDX-License-Identifier: MIT
"""The declaration of one worksheet function: arguments, engine parameters, names, defaults.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import inspect

import pytest

from functions import catalogue, damper, pendulum, structure
from functions.catalogue import declaration
from functions.catalogue.declaration import (
    ELEMENTWISE, LOOKUP, NUMBER, REQUIRED, TEXT, Argument, SheetFunction, engine_default,
    python_name,
)


def test_the_package_re_exports_the_declaration():
    for name in declaration.__all__:
        assert getattr(catalogue, name) is getattr(declaration, name), name
    assert catalogue._REQUIRED is REQUIRED


def test_an_argument_is_optional_when_it_has_a_default():
    required = Argument("length", "Pendulum length, > 0 [m].", "m")
    assert not required.optional and required.default is REQUIRED
    assert required.kind == NUMBER
    assert Argument("g", "Gravity, > 0 [m/s^2].", "m/s^2", default=9.8).optional
    # None (no value) and 0 are defaults too, not "required"
    assert Argument("x", "Some value [-].", "-", default=None).optional
    assert Argument("x", "Some value [-].", "-", default=0.0).optional


def test_engine_parameter_is_the_name_unless_renamed():
    assert Argument("length", "Pendulum length, > 0 [m].", "m").engine_param == "length"
    renamed = Argument("elapsed_time", "Time since release [s].", "s", param="time")
    assert renamed.engine_param == "time" and renamed.name == "elapsed_time"


def _period() -> SheetFunction:
    return SheetFunction("SWAY_TEST_PERIOD", pendulum.exact_period, "A test entry [s].",
                         "Period", "s", (Argument("length", "Length, > 0 [m].", "m"),),
                         "pendulum")


def test_engine_reference_names_the_engine_function_or_table():
    fn = _period()
    assert fn.kind == ELEMENTWISE
    assert fn.engine_ref == "functions.pendulum.exact_period"
    table = SheetFunction("SWAY_TEST_LOOKUP", structure.MODE_SHAPE_EXPONENTS, "A lookup [-].",
                          "Exponent", "-", (Argument("structure_type", "Type [-].", "-",
                                                     kind=TEXT),),
                          "structure", kind=LOOKUP,
                          table="functions.structure.MODE_SHAPE_EXPONENTS")
    assert table.engine_ref == "functions.structure.MODE_SHAPE_EXPONENTS"


def test_parameters_and_defaults_come_from_the_engine_signature():
    fn = _period()
    assert list(fn.parameters) == list(inspect.signature(pendulum.exact_period).parameters)
    assert engine_default(fn, "length") is REQUIRED
    assert engine_default(fn, "amplitude_deg") == 0.0
    assert engine_default(fn, "g") == pendulum.STANDARD_GRAVITY
    with pytest.raises(KeyError):
        engine_default(fn, "no_such_parameter")


def test_signature_of_replaces_a_keyword_only_engine():
    def engine(**kwargs):
        return kwargs

    fn = SheetFunction("SWAY_TEST_TUNING", engine, "A test entry [-].", "Tuning", "-", (),
                       "damper", signature_of=damper.optimal_tuning)
    assert list(fn.parameters) == list(inspect.signature(damper.optimal_tuning).parameters)
    assert engine_default(fn, "method") == "den_hartog"


def test_python_name_is_the_excel_name_in_lower_case():
    assert python_name("SWAY_EXACT_PERIOD") == "sway_exact_period"
    assert _period().python_name == "sway_test_period"
