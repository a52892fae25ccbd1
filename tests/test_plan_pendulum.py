# SPDX-License-Identifier: MIT
"""The Pendulum sheet: the two chain steps that run through helper cells, against the engine.

The design chain's pendulum length (``=fixed_point_length``) and small-angle error
(``=1/agm_at_swing-1``) are the only steps whose worksheet formulas are not one closed form
with a numpy twin (functions/chain.py): they run through the Pendulum sheet's fixed-point and
AGM cells. Here the sheet's planned cells are evaluated by the builder's formula evaluator with
the engine's values in the cells it reads, over the whole valid range: swings from 0 to about
60 deg (a stroke up to 0.75 of the small-angle length; no pendulum reaches a stroke beyond
about 0.77 of it, functions.pendulum.pendulum_length), frequencies 0.01 to 20 Hz (the declared
range of the mode's frequency).

References: functions.pendulum.pendulum_length and small_angle_error (the engine), and the
exact period T = T0 2K(m)/pi, m = sin^2(theta/2) (Abramowitz & Stegun 1964, 17.2 and 17.6:
K(m) = pi / (2 AGM(1, sqrt(1 - m)))) with K from scipy.special.ellipk.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from openpyxl import Workbook
from openpyxl.workbook.defined_name import DefinedName
from scipy.special import ellipk

from functions.chain import SMALL_SWING_ERROR
from functions.pendulum import STANDARD_GRAVITY, pendulum_length, small_angle_error
from functions.worksheet import TWIN_TOLERANCE
from workbook_builder.plan.pendulum import (AGM_STEPS, CONVERGENCE, FIXED_POINT_ITERATIONS,
                                            pendulum_sheet)
from workbook_builder.xlsx.formulas import Evaluator, is_error

from plan_workbooks import evaluator, plan_workbook, set_values

FREQUENCIES = (0.01, 0.2, 3.0, 20.0)                                        # [Hz]
STROKE_RATIOS = (0.0, 1e-4, 1e-3, 0.01, 0.05, 0.1, 0.2, 0.35, 0.5, 0.6, 0.7, 0.75)  # x_d / L_0
READS = ("small_angle_length", "stroke", "pendulum_length", "swing_angle_deg")
#: One unit in the last place of 1.0 (2^-52).
EPS = float(np.finfo(float).eps)


def _ratio_k(theta_deg: float) -> float:
    """Exact over small-angle period, 2 K(m) / pi, m = sin^2(theta/2) (A&S 17.2)."""
    return 2.0 / math.pi * float(ellipk(math.sin(math.radians(theta_deg) / 2.0) ** 2))


@pytest.fixture(scope="module")
def sheet_workbook():
    return plan_workbook([pendulum_sheet().plan], named=dict.fromkeys(READS, 0.0))


def _evaluate(wb, cache, l0, stroke, length, swing):
    set_values(wb, dict(zip(READS, (l0, stroke, length, swing))))
    ev = evaluator(wb, cache)
    return {name: ev.evaluate(f"={name}", "V") for name in
            ("fixed_point_length", "fixed_point_change", "agm_at_swing")}


@pytest.fixture(scope="module")
def cases(sheet_workbook):
    """(f, x_d/L_0, L_0, x_d, engine L, engine swing, sheet values) over the valid range."""
    cache: dict = {}
    out = []
    for f in FREQUENCIES:
        l0 = STANDARD_GRAVITY / (2 * math.pi * f) ** 2         # the chain's small_angle_length
        for ratio in STROKE_RATIOS:
            stroke = ratio * l0
            length = float(pendulum_length(f, stroke, STANDARD_GRAVITY))
            swing = float(np.degrees(np.arcsin(stroke / length)))   # the chain's swing step
            sheet = _evaluate(sheet_workbook, cache, l0, stroke, length, swing)
            out.append((f, ratio, l0, stroke, length, swing, sheet))
    assert max(c[5] for c in out) == pytest.approx(59.5, abs=0.5)
    return out


def test_fixed_point_length_equals_the_engine(cases):
    for f, ratio, _, _, length, _, sheet in cases:
        got = sheet["fixed_point_length"]
        assert abs(got / length - 1) <= 1e-12, (f, ratio, got, length)


def test_fixed_point_length_is_in_tune_at_its_own_swing(cases):
    """L = L_0 (pi / (2 K(m)))^2 at theta = asin(x_d / L): its exact period is the small-angle
    length's period (A&S 17.2; scipy.special.ellipk)."""
    for f, ratio, l0, stroke, _, _, sheet in cases:
        got = sheet["fixed_point_length"]
        theta = math.degrees(math.asin(stroke / got))
        assert abs(got / (l0 / _ratio_k(theta) ** 2) - 1) <= 1e-12, (f, ratio)


def test_fixed_point_converges_within_the_planned_iterations(cases):
    # the Checks sheet's rule: last relative change <= 1e-12
    assert CONVERGENCE == 1e-12
    for f, ratio, *_, sheet in cases:
        assert 0.0 <= sheet["fixed_point_change"] <= CONVERGENCE, (f, ratio)


def test_period_ratio_at_the_design_swing_equals_the_elliptic_integral(cases):
    """1 / AGM(1, cos(theta/2)) = T/T0 = 2K(m)/pi, m = sin^2(theta/2) (A&S 17.2, 17.6), and
    1 + functions.pendulum.small_angle_error: no cancellation in the ratio itself."""
    for f, ratio, _, _, _, swing, sheet in cases:
        period_ratio = 1.0 / sheet["agm_at_swing"]
        assert abs(period_ratio / _ratio_k(swing) - 1) <= 1e-12, (f, ratio, swing)
        assert abs(period_ratio / (1 + small_angle_error(swing)) - 1) <= 1e-12, (f, ratio)


def test_small_angle_error_equals_the_engine(cases):
    """=1/agm_at_swing-1 against functions.pendulum.small_angle_error: relative 1e-12 from a
    swing of 3.5 deg (e >= 2.3e-4); below it the subtraction of two numbers near 1 leaves an
    absolute error of a few units in the last place of 1 (2 eps), whatever the swing
    (computed; the Calculation sheet's formula uses a series there, tested below)."""
    for f, ratio, _, _, _, swing, sheet in cases:
        got = 1.0 / sheet["agm_at_swing"] - 1.0
        want = float(small_angle_error(swing))
        assert abs(got - want) <= 2 * EPS, (f, ratio, swing)
        if swing >= 3.5:
            assert abs(got / want - 1) <= 1e-12, (f, ratio, swing)
    assert [1.0 / c[6]["agm_at_swing"] - 1.0 for c in cases if c[1] == 0.0] == [0.0] * 4


SMALL_SWINGS = (0.01, 0.03, 0.1, 0.5, 1.0, 2.0)          # [deg]


def _sheet_error_at(sheet_workbook, swing):
    """The Calculation sheet's small-angle error at ``swing``: the step's formula
    (functions.chain.SMALL_SWING_ERROR) over the Pendulum sheet's AGM at that swing."""
    stroke = math.sin(math.radians(swing))                  # L = 1 m at that swing
    out = _evaluate(sheet_workbook, {}, 1.0, stroke, 1.0, swing)
    wb = Workbook()
    ws = wb.active
    ws.title = "V"
    for i, (name, value) in enumerate((("swing_angle_deg", swing),
                                       ("agm_at_swing", out["agm_at_swing"])), start=1):
        ws.cell(i, 1, value)
        wb.defined_names.add(DefinedName(name, attr_text=f"V!$A${i}"))
    return Evaluator(wb).evaluate(SMALL_SWING_ERROR, "V")


def test_small_angle_error_keeps_relative_precision_at_small_swings(sheet_workbook):
    for swing in SMALL_SWINGS:
        got = _sheet_error_at(sheet_workbook, swing)
        assert abs(got / small_angle_error(swing) - 1) <= 1e-12, swing


def test_small_angle_error_passes_the_cross_check_at_small_valid_swings(sheet_workbook):
    for swing in SMALL_SWINGS:
        got = _sheet_error_at(sheet_workbook, swing)
        want = float(small_angle_error(swing))
        assert round(abs(got / want - 1), 12) <= TWIN_TOLERANCE, swing


def test_a_stroke_no_pendulum_reaches_never_gives_a_converged_length(sheet_workbook):
    """Beyond about 0.77 L_0 there is no fixed point (the engine refuses): the sheet shows an
    error or an unconverged change, never a converged length."""
    l0 = 1.0
    with pytest.raises(ValueError, match="too large for a pendulum"):
        pendulum_length(math.sqrt(STANDARD_GRAVITY / l0) / (2 * math.pi), 0.8 * l0)
    out = _evaluate(sheet_workbook, {}, l0, 0.8 * l0, 1.0, 45.0)
    assert is_error(out["fixed_point_length"]) or out["fixed_point_change"] > CONVERGENCE


def test_sheet_iterates_from_the_small_angle_length_with_the_planned_steps():
    sh = pendulum_sheet().plan
    names = {c.name: c for c in sh.cells.values() if c.name}
    assert set(names) == {"fixed_point_length", "fixed_point_change", "agm_at_swing"}
    first, last = 5, 5 + FIXED_POINT_ITERATIONS - 1
    assert sh.cells[f"B{first}"].content == "=small_angle_length"
    length = names["fixed_point_length"]
    assert length.ref[1:] == str(last) and length.content.startswith(f"=B{last}+")
    # each iteration starts from the previous one's new length
    assert sh.cells[f"B{last}"].content == f"={length.ref[0]}{last - 1}"
    # the first step is the plain fixed point G(L_0) (slope 0), the later ones secant steps
    slope_col = chr(ord(length.ref[0]) - 1)
    assert sh.cells[f"{slope_col}{first}"].content == 0
    assert sh.cells[f"{slope_col}{first + 1}"].content.startswith("=IF(ABS(")
    # per row: L_k, theta_k, b0, a and b of each AGM step, the AGM, G(L_k), the slope (a
    # constant in row 0), L_(k+1), the change
    row = [c for c in sh.cells.values() if c.kind == "formula" and c.ref[1:] == str(first)]
    assert len(row) == 3 + 2 * AGM_STEPS + 4
    final = int(names["agm_at_swing"].ref[1:])
    assert final > last
    assert sh.cells[f"B{final}"].content == "=pendulum_length"
    assert sh.cells[f"C{final}"].content == "=swing_angle_deg"


def test_rows_after_convergence_are_few(sheet_workbook):
    """The sheet shows the rows that converge, not dozens of identical ones: at a 60 deg
    swing (a stroke of 0.75 L_0) the change reaches 0 (<= 1e-15) by row 8 of the planned
    FIXED_POINT_ITERATIONS, below 12 deg by row 5 (computed)."""
    assert FIXED_POINT_ITERATIONS <= 12
    change_col = chr(ord("A") + 4 + 2 * AGM_STEPS + 4)
    for f in FREQUENCIES:
        l0 = STANDARD_GRAVITY / (2 * math.pi * f) ** 2
        for ratio, by_row in ((0.2, 5), (0.75, 8)):
            stroke = ratio * l0
            length = float(pendulum_length(f, stroke, STANDARD_GRAVITY))
            swing = float(np.degrees(np.arcsin(stroke / length)))
            set_values(sheet_workbook, dict(zip(READS, (l0, stroke, length, swing))))
            ev = evaluator(sheet_workbook, {})
            changes = [ev.evaluate(f"=Pendulum!{change_col}{5 + k}", "V")
                       for k in range(FIXED_POINT_ITERATIONS)]
            assert all(c <= 1e-15 for c in changes[by_row - 1:]), (f, ratio, changes)
            assert changes[0] > 0, (f, ratio)
