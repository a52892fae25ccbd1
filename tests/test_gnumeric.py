# SPDX-License-Identifier: MIT
"""Built workbooks recalculated by a second spreadsheet application (Gnumeric's ssconvert).

Every example workbook and a generated set (every tuning method, every way of setting the
mass ratio, SI and US units, a floor table, designs that fail their checks, a US workbook
with a time-domain simulation) is recalculated
with ``ssconvert --recalc`` (workbook_builder.xlsx.gnumeric). Then: no cell holds an error;
every formula cell's value equals the value the builder cached (the engine's numbers and the
builder's own evaluation of the formulas) to 1e-9 relative, 1e-12 absolute near zero; every
text result (the verdicts "OK" / "NOT OK", the engine-value flags) is the same text; the
design results equal the engine's.

Reference: Gnumeric, a spreadsheet application independent of LibreOffice and of the builder,
recalculating every formula itself. Skipped, with the reason, when ssconvert is not installed
(CI installs the Debian package gnumeric).
"""
from __future__ import annotations

import concurrent.futures as cf
import copy
import math

import pytest

from functions.design import CHECK_RULES, check_rules
from functions.damper import OPTIMAL_TUNING_METHODS
from functions.quantities import DESIGN_RESULTS, PART_RESULTS
from workbook_builder.build import write_workbook
from workbook_builder.plan.checks import check_name
from workbook_builder.project import load_project, parse_project
from workbook_builder.xlsx import gnumeric, libreoffice

from workbook_cases import DEN_HARTOG, EXAMPLES, NAMES

pytestmark = [
    pytest.mark.skipif(gnumeric.find_ssconvert() is None,
                       reason="Gnumeric (ssconvert) is not installed"),
    # Gnumeric's .xlsx has no default cell style; openpyxl says so on reading it
    pytest.mark.filterwarnings("ignore:Workbook contains no default style"),
]


def _variant(number: str, units: str = "SI", **damper) -> dict:
    """An invented project (DEN_HARTOG's building) with other damper settings."""
    data = copy.deepcopy(DEN_HARTOG)
    data["project"] = {"number": number, "title": f"Gnumeric check {number} (invented)",
                       "units": units}
    data["damper"] = {"clearance": 1.5, **damper}
    if units == "US":
        data["mode"]["modal_mass"] = {"value": 19841.6, "unit": "kip"}
        data["wind"] = {"acceleration": {"value": 25.0, "unit": "milli-g"},
                        "acceleration_limit": {"value": 15.0, "unit": "milli-g"}}
        data["damper"]["clearance"] = {"value": 4.5, "unit": "ft"}
    return data


#: The generated set: (name, project data).
GENERATED = (
    [(f"method_{m}", _variant(f"G-{i}", tuning_method=m))
     for i, m in enumerate(OPTIMAL_TUNING_METHODS, start=1)]
    + [("us_chosen_mass", _variant("G-10", "US", tuning_method="h2",
                                   damper_mass={"value": 300.0, "unit": "kip"})),
       ("us_required", _variant("G-11", "US", tuning_method="hinf")),
       ("chosen_ratio", _variant("G-12", tuning_method="nishihara_asami", mass_ratio=0.03)),
       # a clearance far too small and a tight swing limit: checks come out NOT OK
       ("not_ok", _variant("G-13", tuning_method="h2", clearance=0.05, max_swing=1.0)),
       # a US workbook with a Nonlinear sheet (its US rows are formulas of the SI values)
       ("us_simulation", {**_variant("G-14", "US", tuning_method="h2"),
                          "simulation": {"load": "harmonic", "duration": 120}}),
       # the frequency band and the as-built retune (numerical and closed-form tunings)
       ("band_as_built", {**_variant("G-15", tuning_method="h2"),
                          "band": {"lower": 0.88, "upper": 1.12, "response_exponent": -0.3},
                          "as_built": {"frequency": 0.19, "damping": 0.012}}),
       ("us_band_closed_form", {**_variant("G-16", "US", tuning_method="den_hartog",
                                           mass_ratio=0.03),
                                "band": {"lower": 0.9, "upper": 1.15},
                                "as_built": {"frequency": 0.21}}),
       # every optional part: the extreme level, the comfort criterion, two directions
       ("every_part", {**_variant("G-17", tuning_method="hinf"),
                       "mode": {**DEN_HARTOG["mode"], "floor_ordinate": 0.93},
                       "wind": {**DEN_HARTOG["wind"], "extreme_acceleration": 0.7,
                                "return_period": 5},
                       "band": {"lower": 0.9, "upper": 1.1},
                       "as_built": {"frequency": 0.195},
                       "direction_2": {"frequency": 0.23, "modal_mass": 8.5e6,
                                       "structural_damping": 0.012, "acceleration": 0.22,
                                       "acceleration_limit": 0.15,
                                       "extreme_acceleration": 0.6}}),
       ("robust", {**_variant("G-19", tuning_method="robust"),
                   "band": {"lower": 0.88, "upper": 1.1}, "as_built": {"frequency": 0.21},
                   "direction_2": {"frequency": 0.24, "modal_mass": 8.0e6,
                                   "structural_damping": 0.01, "acceleration": 0.2,
                                   "acceleration_limit": 0.15}}),
       ("us_two_directions", {**_variant("G-18", "US", tuning_method="den_hartog"),
                              "direction_2": {"frequency": 0.21, "modal_mass": 18000,
                                              "structural_damping": 0.01,
                                              "acceleration": {"value": 22, "unit": "milli-g"},
                                              "acceleration_limit": {"value": 15,
                                                                     "unit": "milli-g"}}})]
)


def _cases(tmp_path_factory):
    folder = tmp_path_factory.mktemp("gnumeric")
    cases = {}
    for name in NAMES:
        path = folder / f"{name}.xlsx"
        cases[name] = (write_workbook(load_project(EXAMPLES / f"{name}.toml"), path), path)
    for name, data in GENERATED:
        path = folder / f"{name}.xlsx"
        cases[name] = (write_workbook(parse_project(data, source=f"{name}.toml"), path), path)
    return folder, cases


@pytest.fixture(scope="module")
def recalculated(tmp_path_factory):
    """name -> (built workbook, its file, Gnumeric's recalculated copy)."""
    folder, cases = _cases(tmp_path_factory)
    with cf.ThreadPoolExecutor(max_workers=2) as pool:      # one ssconvert per file
        futures = {name: pool.submit(gnumeric.recalculate, path, folder / "gnumeric")
                   for name, (_, path) in cases.items()}
        return {name: (*cases[name], fut.result()) for name, fut in futures.items()}


ALL = list(NAMES) + [name for name, _ in GENERATED]


def _same(mine, theirs) -> bool:
    if isinstance(mine, bool) or isinstance(theirs, bool):
        return mine == theirs
    if isinstance(mine, (int, float)) and isinstance(theirs, (int, float)):
        return math.isclose(mine, theirs, rel_tol=1e-9, abs_tol=1e-12)
    return mine == theirs


@pytest.mark.parametrize("name", ALL)
def test_no_error_cells(recalculated, name):
    *_, out = recalculated[name]
    assert libreoffice.find_error_cells(out) == []


@pytest.mark.parametrize("name", ALL)
def test_every_formula_cell_equals_the_cached_value(recalculated, name):
    built, path, out = recalculated[name]
    mine, theirs = libreoffice.read_values(path), libreoffice.read_values(out)
    formulas = sorted(built.values)
    assert len(formulas) > 200
    bad = [(k, mine.get(k), theirs.get(k)) for k in formulas
           if not _same(mine.get(k), theirs.get(k))]
    assert not bad, f"{len(bad)} of {len(formulas)} formula cell(s) differ, first: {bad[:5]}"
    texts = [k for k in formulas if isinstance(mine.get(k), str)]
    assert len(texts) >= len(CHECK_RULES) + 2         # verdicts and flags compared as texts


@pytest.mark.parametrize("name", ALL)
def test_results_and_verdicts_equal_the_engine(recalculated, name):
    built, _, out = recalculated[name]
    values = libreoffice.read_values(out)
    for q in DESIGN_RESULTS + PART_RESULTS:
        if q.cell_name not in built.result.cells:      # an optional part not given
            continue
        got = values[built.names[q.cell_name]]
        assert math.isclose(got, built.result.cells[q.cell_name], rel_tol=1e-9,
                            abs_tol=1e-12), q.name
    rules = check_rules(built.plan.options.parts)
    verdicts = [values[built.names[check_name(rule.name)]] for rule in rules]
    assert verdicts == ["OK" if c.ok else "NOT OK" for c in built.result.checks]


def test_the_generated_set_covers_failing_checks_and_every_method(recalculated):
    failing = recalculated["not_ok"][0].result.checks
    assert [c.ok for c in failing].count(False) >= 2
    methods = {recalculated[n][0].plan.options.tuning_method for n in ALL}
    assert methods == set(OPTIMAL_TUNING_METHODS) | {"robust"}
    assert {recalculated[n][0].plan.options.units for n in ALL} == {"SI", "US"}
    parts = {recalculated[n][0].plan.options.parts for n in ALL}
    assert ("band", "as_built", "measured_damping") in parts and ("band", "as_built") in parts
    assert ("band", "as_built", "extreme", "comfort", "direction_2") in parts
