# SPDX-License-Identifier: MIT
"""Rules between the design inputs (functions/relations.py): each broken rule names the input to
correct, and the engine refuses what the rules refuse.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import pytest

from functions.design import DesignInputs
from functions.relations import ENVELOPE_INPUTS, OPTIONAL_TABLES, input_relation_errors

BASE = dict(frequency=0.2, modal_mass=1e7, structural_damping=0.01, acceleration=0.25,
            acceleration_limit=0.15, clearance=1.5)
SECOND = dict(frequency_2=0.25, modal_mass_2=9e6, structural_damping_2=0.01, acceleration_2=0.2,
              acceleration_limit_2=0.15)


@pytest.mark.parametrize("values, name, words", [
    (dict(mass_ratio=0.02, damper_mass=1e5), "damper_mass", "give at most one"),
    (dict(mass_ratio_min=0.05, mass_ratio_max=0.01), "mass_ratio_max", "must be above"),
    (dict(band_lower=0.9), "band_upper", "give both ends"),
    (dict(band_upper=1.1), "band_lower", "give both ends"),
    (dict(band_lower=1.0, band_upper=1.0), "band_upper", "must be above band_lower"),
    (dict(measured_damping=0.01), "measured_damping", "needs measured_frequency"),
    (dict(return_period=10.0, frequency=1.5), "return_period", "0.06 < f < 1 Hz"),
    (dict(extreme_acceleration=0.2), "extreme_acceleration", "must not be below"),
    ({**SECOND, "modal_mass_2": None}, "modal_mass_2", "is missing"),
    ({**SECOND, "extreme_acceleration": 0.6}, "extreme_acceleration_2", "in both or in neither"),
    (dict(extreme_acceleration_2=0.6), "extreme_acceleration_2", "needs the second direction"),
    (dict(tuning_method="robust"), "tuning_method", "give band_lower and band_upper"),
    (dict(tuning_method="robust", band_lower=0.9, band_upper=1.1, response_exponent=-0.3),
     "response_exponent", "must be 0 with tuning_method='robust'"),
    ({**SECOND, "acceleration_2": 0.3, "extreme_acceleration": 0.6,
      "extreme_acceleration_2": 0.25}, "extreme_acceleration_2", "must not be below"),
])
def test_each_broken_rule_names_the_input_and_the_engine_refuses_it(values, name, words):
    full = {**BASE, **values}
    errors = input_relation_errors(full)
    assert [n for n, _ in errors] == [name], errors
    assert words in errors[0][1]
    with pytest.raises(ValueError, match=words.replace("(", r"\(").replace(")", r"\)")):
        DesignInputs(**{k: v for k, v in full.items() if v is not None})


def test_consistent_inputs_break_no_rule():
    assert input_relation_errors({**BASE, **SECOND, "band_lower": 0.9, "band_upper": 1.1,
                                  "extreme_acceleration": 0.5, "extreme_acceleration_2": 0.4,
                                  "return_period": 1.0, "measured_frequency": 0.19,
                                  "measured_damping": 0.012}) == []


def test_the_optional_tables_and_the_envelope_inputs_are_design_inputs():
    declared = {q.name: q for q in DesignInputs.__signature__.parameters.values()}
    for table, names in OPTIONAL_TABLES.items():
        assert set(names) <= set(declared), table
    assert set(ENVELOPE_INPUTS) <= set(declared)
