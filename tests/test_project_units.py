# SPDX-License-Identifier: MIT
"""Units of project files and workbooks: exact factors to SI."""
from __future__ import annotations

import pytest

from workbook_builder.project.units import UNITS, unit_for


@pytest.mark.parametrize("kind, symbol, factor", [
    # Exact by definition: international yard and pound agreement (1959); NIST SP 811 (2008)
    # Appendix B: 1 ft = 0.3048 m, 1 in = 0.0254 m, 1 lb = 0.45359237 kg.
    ("length", "ft", 0.3048),
    ("length", "in", 0.0254),
    ("mass", "lb", 0.45359237),
    ("mass", "kip", 453.59237),
    # Standard gravity 9.80665 m/s^2 exactly (3rd CGPM, 1901).
    ("acceleration", "milli-g", 0.00980665),
    ("acceleration", "ft/s^2", 0.3048),
    ("mass", "t", 1000.0),
    ("fraction", "%", 0.01),
])
def test_unit_factors_are_the_exact_definitions(kind, symbol, factor):
    assert unit_for(kind, symbol).factor == pytest.approx(factor, rel=1e-15)


def test_unknown_unit_lists_the_valid_ones():
    with pytest.raises(ValueError, match=r"unit 'furlong' is not a length unit; use one of 'm'"):
        unit_for("length", "furlong")


def test_every_kind_has_its_si_unit_first():
    from functions.quantities import UNIT_KINDS
    for kind, units in UNITS.items():
        assert next(iter(units)) == UNIT_KINDS[kind], kind
        assert units[next(iter(units))].factor == 1.0
