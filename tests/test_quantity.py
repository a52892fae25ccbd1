# SPDX-License-Identifier: MIT
"""The declaration of one quantity (functions.quantity): ranges, validation, direction 2.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import math

import pytest

from functions.quantity import (OPTIONAL, REQUIRED, UNIT_KINDS, Quantity, declare,
                                second_direction)


def _length(**kw) -> Quantity:
    return declare("length", "L", "Pendulum length", "m", "length", 0.0, 100.0, low_open=True,
                   **kw)


def test_validate_names_the_quantity_the_value_and_the_range():
    q = _length()
    assert q.validate(2.5) == 2.5
    with pytest.raises(ValueError, match=r"length=0.0 must be in \(0, 100\] \[m\]"):
        q.validate(0.0)
    with pytest.raises(ValueError, match="length=nan"):
        q.validate(math.nan)


def test_counts_are_whole_numbers_and_choices_are_listed():
    n = declare("hanger_count", "n", "Hangers", "-", "count", 1, 100)
    assert n.validate(4) == 4
    for bad in (0, 2.5, True):
        with pytest.raises(ValueError, match="hanger_count=.* must be a whole number in"):
            n.validate(bad)
    c = declare("level", "", "Level", "", "choice", choices=("service", "extreme"))
    assert c.validate("extreme") == "extreme"
    with pytest.raises(ValueError, match="level='storm' must be one of service, extreme"):
        c.validate("storm")


def test_defaults_and_kinds():
    assert _length().required and _length(default=OPTIONAL).optional
    assert _length(default=1.0).has_default and _length().default is REQUIRED
    with pytest.raises(ValueError, match="kind='furlong'"):
        declare("x", "x", "x", "m", "furlong")
    for kind in ("density", "power", "volume", "dashpot_law"):
        assert kind in UNIT_KINDS


def test_second_direction_renames_and_labels():
    q = second_direction(_length(description="Hanger length"), summary=True)
    assert (q.name, q.symbol, q.summary) == ("length_2", "L,2", True)
    assert q.label == "Direction 2: pendulum length"
    assert q.description == "Direction 2: Hanger length"
