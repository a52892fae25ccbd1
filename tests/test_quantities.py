# SPDX-License-Identifier: MIT
"""The declarations of functions.quantities: complete, consistent, one per quantity.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import math
import re

import pytest

from functions import quantities as qs
from functions.damper import OPTIMAL_TUNING_METHODS
from functions.design import DesignInputs
from functions.quantities import (DESIGN_INPUTS, DESIGN_RESULTS, FLOOR_TABLE, HELPERS,
                                  SIMULATION_SETTINGS, UNIT_KINDS, design_signature,
                                  input_relation_errors, quantity)
from workbook_builder.compute import run_design
from workbook_builder.project import load_project
from workbook_builder.project.units import SI_UNIT, UNITS
from workbook_builder.xlsx.formulas import ALLOWED_FUNCTIONS

from workbook_cases import EXAMPLES

ALL = DESIGN_INPUTS + DESIGN_RESULTS + HELPERS + SIMULATION_SETTINGS + FLOOR_TABLE
CELL_REF = re.compile(r"^[A-Za-z]{1,3}\d+$")
R1C1 = re.compile(r"^[RrCc]\d*$|^[Rr]\d*[Cc]\d*$")


def test_cell_names_are_unique_and_valid_workbook_names():
    names = [q.cell_name for q in DESIGN_INPUTS + DESIGN_RESULTS + HELPERS + FLOOR_TABLE]
    assert len(names) == len(set(names))
    for name in names:
        assert re.fullmatch(r"[a-z_][a-z0-9_]*", name), name
        # a defined name must not read as a cell address or a worksheet function
        assert not CELL_REF.match(name) and not R1C1.match(name), name
        assert name.upper() not in ALLOWED_FUNCTIONS | {"FREQUENCY", "TRUE", "FALSE"}, name


@pytest.mark.parametrize("q", ALL, ids=lambda q: q.name)
def test_every_quantity_is_fully_declared(q):
    assert q.kind in UNIT_KINDS
    assert q.label and (q.description or q.note), q.name
    if q.kind in UNITS:
        # the engine's SI unit of the kind is the workbook layer's first unit of that kind
        assert SI_UNIT[q.kind] == UNIT_KINDS[q.kind]
        assert q.unit == UNIT_KINDS[q.kind] or (q.kind == "count" and q.unit == "-"), q.name
    if q.has_default and q.kind not in ("choice", "flag"):
        assert q.contains(q.default), f"{q.name}: default {q.default} outside its range"
    if q.kind == "choice":
        assert q.default in q.choices


def test_inputs_are_placed_in_the_project_file():
    keys = [q.file_key for q in DESIGN_INPUTS]
    assert len(keys) == len(set(keys))
    assert all(q.section in ("mode", "wind", "damper", "band", "as_built", "direction_2",
                             "site", "supply") for q in DESIGN_INPUTS)
    assert set(qs.OPTIONAL_TABLES) == {"band", "as_built", "direction_2", "supply"}
    assert qs.by_name(DESIGN_INPUTS)["tuning_method"].choices == OPTIMAL_TUNING_METHODS + (
        "robust",)


@pytest.mark.parametrize("q", [q for q in DESIGN_INPUTS if q.kind not in ("choice",)],
                         ids=lambda q: q.name)
def test_interval_and_contains_agree_at_the_ends(q):
    for end, is_open in ((q.low, q.low_open), (q.high, q.high_open)):
        if math.isfinite(end):
            assert q.contains(end) is (not is_open)
    assert not q.contains(math.nan)
    text = q.interval()
    assert text[0] == ("(" if q.low_open or math.isinf(q.low) else "[")
    assert text[-1] == (")" if q.high_open or math.isinf(q.high) else "]")


def test_validate_names_quantity_value_and_range():
    with pytest.raises(ValueError, match=r"^clearance=0\.0 must be in \(0, 100\] \[m\]$"):
        quantity("clearance").validate(0.0)
    with pytest.raises(ValueError, match=r"tuning_method='x' must be one of den_hartog"):
        quantity("tuning_method").validate("x")
    seed = qs.by_name(SIMULATION_SETTINGS)["seed"]
    with pytest.raises(ValueError, match=r"seed=1\.5 must be a whole number"):
        seed.validate(1.5)
    assert seed.validate(3) == 3 and type(seed.validate(3)) is int


def test_lookup_by_defined_name_or_glossary_name():
    assert quantity("chosen_mass_ratio") is qs.by_name(DESIGN_INPUTS)["mass_ratio"]
    assert quantity("mass_ratio") is qs.by_name(DESIGN_RESULTS)["mass_ratio"]
    assert quantity("frequency").cell_name == "structure_frequency"
    with pytest.raises(KeyError):
        quantity("nonsense")


def test_relations_between_inputs():
    assert input_relation_errors({"mass_ratio_min": 0.01, "mass_ratio_max": 0.05}) == []
    assert [n for n, _ in input_relation_errors({"mass_ratio_min": 0.05,
                                                 "mass_ratio_max": 0.05})] == ["mass_ratio_max"]


def test_signature_lists_every_input_with_its_default():
    sig = design_signature()
    assert list(sig.parameters) == [q.name for q in DESIGN_INPUTS]
    assert sig.parameters["max_swing_deg"].default == 15.0
    assert sig.parameters["mass_ratio"].default is None
    import inspect
    assert inspect.signature(DesignInputs) == sig


def test_help_text_states_range_and_default():
    assert quantity("max_swing_deg").help_text() == ("Largest accepted swing angle, (0, 45] "
                                                     "[deg]. Empty: 15.")
    assert len(quantity("acceleration").help_text()) <= 255


def _shown(value: float, fmt: str) -> str:
    """The digits a number format shows (the formats the declarations use: fixed decimals,
    scientific, and sections with conditions such as ``[<10]0.0000;0.00``)."""
    if fmt.startswith("["):
        for section in fmt.split(";"):
            cond = re.match(r"\[<([0-9.]+)\]", section)
            if cond is None or abs(value) < float(cond.group(1)):
                return _shown(value, section[cond.end():] if cond else section)
    if fmt.endswith("E+00"):
        decimals = len(fmt.split(".")[1]) - 4 if "." in fmt else 0
        return f"{value:.{decimals}e}".split("e")[0]
    decimals = len(fmt.split(".")[1]) if "." in fmt else 0
    return f"{value:.{decimals}f}"


def _significant(text: str) -> int:
    return len(text.lstrip("-").replace(".", "").lstrip("0")) or 1


def test_number_formats_show_what_a_reviewer_reads():
    """3 to 5 significant digits at the example designs' values (a whole-number format
    shows every digit of a mass or a stiffness, whole units being its reading precision);
    the value itself keeps full precision. Our own rule: common practice, no source."""
    numeric = [q for q in DESIGN_INPUTS + DESIGN_RESULTS + HELPERS
               if q.kind not in ("choice", "flag", "count")]
    assert all(q.fmt != "General" for q in numeric), [q.name for q in numeric
                                                      if q.fmt == "General"]
    checked = 0
    for name in ("residential_tower", "observation_mast", "office_tower_us"):
        cells = run_design(load_project(EXAMPLES / f"{name}.toml")).cells
        for q in numeric:
            value = cells.get(q.cell_name)
            if not isinstance(value, float) or value == 0.0 or q.fmt.startswith("#,##0"):
                continue
            digits = _significant(_shown(value, q.fmt))
            assert 3 <= digits <= 6 if q.cell_name == "gravity" else 3 <= digits <= 5, (
                name, q.name, value, q.fmt)
            checked += 1
    assert checked > 60
