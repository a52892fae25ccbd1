# SPDX-License-Identifier: MIT
"""The design chain's part ``supply`` (functions.chain_supply) through design_damper.

Every value is checked against an independent computation written here: hand formulas of
statics and kinematics, the harmonic force of the extreme level (functions.levels, a separate
closed form), and the definitions of the dashpot linearisations (S. J. Elliott, M. Ghandchi
Tehrani, R. S. Langley, "Nonlinear damping and quasi-linear modelling", Phil. Trans. R. Soc. A
373 (2015) 20140402), whose Gamma-function constants are checked by quadrature in
tests/test_dashpots.py. The design data are invented.
"""
from __future__ import annotations

import math

import pytest

from functions.chain import PARTS, sections, valid_parts
from functions.design import DesignInputs, design_damper

#: An invented residential tower with a supply specification (SI).
TOWER = dict(frequency=0.19, modal_mass=24e6, structural_damping=0.012, acceleration=0.206,
             acceleration_limit=0.1275, clearance=1.6, extreme_acceleration=0.47,
             hanger_count=4, hanger_safety_factor=3.0, hanger_axial_stiffness=2.5e8,
             block_length_1=4.5, block_length_2=4.0, available_height=6.0,
             buffer_stiffness=2e6, dashpot_units=4)
#: Its second direction (stiffer).
SECOND = dict(frequency_2=0.21, modal_mass_2=22e6, structural_damping_2=0.012,
              acceleration_2=0.18, acceleration_limit_2=0.1275, extreme_acceleration_2=0.42)
G = 9.80665


def _cells(**kw):
    return design_damper(**{**TOWER, **kw}).cells


def test_parts_and_sections():
    assert design_damper(**TOWER).parts == ("extreme", "supply")
    assert design_damper(**TOWER, dashpot_level="extreme").parts == \
        ("extreme", "supply", "dashpots_at_extreme")
    titles = [s.title for s in sections("h2", "required", ("extreme", "supply"))]
    assert titles[-3:] == ["8  Dashpots", "9  Hangers, mass block and space",
                           "10  Forces on the structure"]
    assert not valid_parts(("supply",))                     # needs the extreme level
    assert not valid_parts(("extreme", "dashpots_at_extreme"))
    assert PARTS[-2:] == ("supply", "dashpots_at_extreme")


def test_linear_dashpot_equals_the_design_dashpot_and_the_harmonic_force():
    c = _cells()
    assert c["dashpot_coefficient"] == pytest.approx(c["dashpot"], rel=1e-13)
    for name in ("dashpot_damping_random", "dashpot_damping_harmonic",
                 "extreme_dashpot_damping_random", "extreme_dashpot_damping_harmonic"):
        assert c[name] == pytest.approx(c["damper_damping"], rel=1e-13), name
    # kinematics: v = 2 pi f_s x for harmonic motion at the structure's frequency
    assert c["damper_velocity"] == pytest.approx(2 * math.pi * 0.19 * c["stroke"], rel=1e-14)
    # a linear spring and dashpot 90 deg apart: the root of the sum of squares, the same as
    # the extreme level's own closed form (functions.levels)
    assert c["extreme_horizontal_force"] == pytest.approx(c["extreme_damper_force"], rel=1e-12)
    assert c["extreme_dashpot_unit_force"] == pytest.approx(
        c["dashpot"] * c["extreme_damper_velocity"] / 4, rel=1e-13)
    # mean power of a linear dashpot under a Gaussian velocity: c sigma^2 (Elliott et al.)
    sigma = c["damper_velocity"] / c["peak_factor"]
    assert c["dashpot_power"] == pytest.approx(c["dashpot"] * sigma ** 2, rel=1e-13)
    assert c["extreme_dashpot_heat"] == pytest.approx(3600 * c["extreme_dashpot_power"])


@pytest.mark.parametrize("level", ["service", "extreme"])
def test_velocity_exponent_dashpot_gives_the_design_damping_at_its_level(level):
    c = _cells(velocity_exponent=0.5, dashpot_level=level)
    here, there = ("", "extreme_") if level == "service" else ("extreme_", "")
    assert c[here + "dashpot_damping_random"] == pytest.approx(c["damper_damping"], rel=1e-12)
    # statistical linearisation: c_eq ~ sigma^(alpha - 1), same peak factor at both levels
    ratio = (c[there + "damper_velocity"] / c[here + "damper_velocity"]) ** (0.5 - 1)
    assert c[there + "dashpot_damping_random"] == pytest.approx(
        c["damper_damping"] * ratio, rel=1e-12)
    # the law through the reference point: F = F_ref (v / v_ref)^alpha
    v_ref = c["dashpot_reference_velocity"]
    assert v_ref == c[here + "damper_velocity"]
    assert c["dashpot_coefficient"] * v_ref ** 0.5 == pytest.approx(
        c["dashpot_reference_force"], rel=1e-13)
    # a softer law damps less at the higher velocity
    assert c["extreme_dashpot_damping_random"] < c["dashpot_damping_random"]


def test_hangers_block_space_and_loads_by_hand():
    c = _cells()
    m, n = c["damper_mass"], 4
    assert c["hanger_static_tension"] == pytest.approx(m * G / n, rel=1e-14)
    theta = math.radians(c["extreme_swing_deg"])
    # tension at the bottom of a free swing: m g (3 - 2 cos theta) (energy + radial equation)
    assert c["extreme_hanger_tension"] == pytest.approx(m * G * (3 - 2 * math.cos(theta)) / n)
    assert c["hanger_breaking_load"] == pytest.approx(3.0 * c["extreme_hanger_tension"])
    stretch = m * G / n * c["pendulum_length"] / 2.5e8
    assert c["hanger_stretch"] == pytest.approx(stretch, rel=1e-14)
    assert c["unstretched_length"] == pytest.approx(c["pendulum_length"] - stretch)
    volume = m / 7850.0
    assert c["block_volume"] == pytest.approx(volume, rel=1e-14)
    assert c["block_height"] == pytest.approx(volume / (4.5 * 4.0), rel=1e-14)
    # 6 m of height: the ~7 m pendulum and the block fold into two stages
    assert c["stage_count"] == math.ceil(c["pendulum_length"] / (6.0 - c["block_height"])) == 2
    assert c["vertical_space"] == pytest.approx(c["pendulum_length"] / 2 + c["block_height"])
    assert c["vertical_space"] <= 6.0
    assert c["plan_space_1"] == pytest.approx(4.5 + 2 * 1.6)
    assert c["static_vertical_load"] == pytest.approx(m * G)
    assert c["buffer_force"] == 0.0                         # no contact at this level


def test_buffers_take_the_contact_energy():
    c = _cells(clearance=1.0)
    assert c["buffer_excess"] > 0
    v, m, k = c["contact_velocity"], c["damper_mass"], 2e6
    # a linear buffer absorbs m v^2 / 2 = k d^2 / 2
    assert 0.5 * k * c["buffer_deflection"] ** 2 == pytest.approx(c["buffer_energy"], rel=1e-12)
    assert c["buffer_force"] == pytest.approx(k * c["buffer_deflection"], rel=1e-12)
    assert c["buffer_force"] == pytest.approx(v * math.sqrt(m * k), rel=1e-12)


def test_second_direction_copies_the_dashpots_and_hangers_take_the_combined_swing():
    c = _cells(**SECOND, velocity_exponent=0.6)
    assert c["dashpot_coefficient_2"] > 0 and c["dashpot_damping_random_2"] == \
        pytest.approx(c["damper_damping_2"], rel=1e-12)
    assert c["damper_velocity_2"] == pytest.approx(2 * math.pi * 0.21 * c["stroke_2"])
    assert c["peak_factor_2"] > c["peak_factor"]            # higher frequency, more cycles
    theta = math.radians(c["extreme_combined_swing_deg"])
    assert c["extreme_hanger_tension"] == pytest.approx(
        c["damper_mass"] * G * (3 - 2 * math.cos(theta)) / 4)
    # the second direction's restoring force includes its springs
    assert c["extreme_horizontal_force_2"] >= c["stiffness_2"] * c["extreme_stroke_2"]


def test_the_table_is_whole_and_needs_the_extreme_level():
    partial = {k: v for k, v in TOWER.items() if k != "buffer_stiffness"}
    with pytest.raises(ValueError, match="buffer_stiffness is missing"):
        DesignInputs(**partial)
    no_extreme = {k: v for k, v in TOWER.items() if k != "extreme_acceleration"}
    with pytest.raises(ValueError, match="extreme_acceleration is missing"):
        DesignInputs(**no_extreme)


@pytest.mark.parametrize("key, value, message", [
    ("block_density", -7850.0, r"block_density=-7850.0 must be in \[500, 25000\]"),
    ("hanger_count", 0, r"hanger_count=0 must be a whole number in \[1, 100\]"),
    ("velocity_exponent", 0.0, r"velocity_exponent=0.0 must be in \(0, 2\]"),
    ("velocity_exponent", 2.5, r"velocity_exponent=2.5 must be in \(0, 2\]"),
    ("hanger_safety_factor", 0.8, r"hanger_safety_factor=0.8 must be in \[1, 20\]"),
    ("dashpot_level", "storm", "dashpot_level='storm' must be one of service, extreme"),
])
def test_bad_inputs_name_the_key(key, value, message):
    with pytest.raises(ValueError, match=message):
        DesignInputs(**{**TOWER, key: value})


def test_a_block_taller_than_the_space_is_refused():
    with pytest.raises(ValueError, match="available_height"):
        design_damper(**{**TOWER, "available_height": 1.0})


def _evaluate(formula: str, values: dict):
    """A formula evaluated by the workbook builder's evaluator over defined names."""
    from openpyxl import Workbook
    from openpyxl.workbook.defined_name import DefinedName
    from workbook_builder.xlsx.formulas import Evaluator
    wb = Workbook()
    ws = wb.active
    ws.title = "V"
    for i, (name, v) in enumerate(values.items(), start=1):
        ws.cell(i, 1, float(v))
        wb.defined_names.add(DefinedName(name, attr_text=f"V!$A${i}"))
    return Evaluator(wb).evaluate(formula, "V")


@pytest.mark.parametrize("alpha, level, two, clearance", [
    (0.15, "service", False, 1.6), (0.5, "extreme", True, 1.0), (1.0, "service", True, 1.6),
    (1.4, "extreme", False, 0.9), (2.0, "service", False, 1.6)])
def test_every_supply_formula_equals_its_numpy_twin(alpha, level, two, clearance):
    """The worksheet formula of each step of the part, evaluated as a spreadsheet would,
    equals the engine's value (the twins' rule, functions/worksheet.py)."""
    kw = dict(TOWER, velocity_exponent=alpha, dashpot_level=level, clearance=clearance,
              **(SECOND if two else {}))
    result = design_damper(**kw)
    names = {s.name for sec in sections("h2", "required", result.parts)
             if sec.title.split(maxsplit=1)[1].startswith(("Dashpots", "Hangers", "Forces"))
             for s in sec.steps}
    assert len(names) >= 35
    from functions.chain import steps
    for step in steps("h2", "required", result.parts):
        if step.name not in names:
            continue
        got = _evaluate(step.formula, {n: result.cells[n] for n in step.reads})
        want = result.cells[step.name]
        assert got == pytest.approx(want, rel=1e-13, abs=1e-300), step.name
