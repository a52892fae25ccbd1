# SPDX-License-Identifier: MIT
"""The design chain's declared steps: order, variants, worksheet formulas allowed.

Reference values are the engine's functions, themselves tested against published sources
(test_damper.py, test_pendulum.py); the order and variants are our own rules: common practice,
no source.
"""
from __future__ import annotations

import math

import pytest
from scipy.special import ellipk

from functions.chain import (MASS_RATIO_MODES, PART_SETS, PARTS, SMALL_SWING_ERROR, all_variants,
                             mass_ratio_mode, parts_of, sections, steps, valid_parts)
from functions.damper import CLOSED_FORM_METHODS, OPTIMAL_TUNING_METHODS
from functions.design import design_damper
from functions.quantities import DESIGN_INPUTS, DESIGN_RESULTS, quantity
from functions.worksheet import formula_names
from workbook_builder.xlsx.formulas import check_formula

INPUT_CELLS = {q.cell_name for q in DESIGN_INPUTS}
HELPER_CELLS = {"fixed_point_length", "agm_at_swing", "agm_at_extreme_swing"}  # Pendulum sheet


@pytest.mark.parametrize("method, mode, chain", all_variants(parts=True),
                         ids=[f"{m}-{d}-{i % len(PART_SETS)}"
                              for i, (m, d, _) in enumerate(all_variants(parts=True))])
def test_each_step_reads_inputs_or_earlier_steps(method, mode, chain):
    known = set(INPUT_CELLS)
    for step in chain:
        assert set(step.reads) <= known, (step.name, set(step.reads) - known)
        if step.formula:
            check_formula(step.formula)
            names = set(formula_names(step.formula))
            assert names <= known | HELPER_CELLS, (step.name, names - known - HELPER_CELLS)
        quantity(step.name)                       # every step computes a declared quantity
        known.add(step.name)
    results = {q.cell_name for q in DESIGN_RESULTS}
    assert results <= known, results - known


@pytest.mark.parametrize("method", OPTIMAL_TUNING_METHODS)
def test_engine_values_only_where_there_is_no_closed_form(method):
    for mode in MASS_RATIO_MODES:
        engine = [s.name for s in steps(method, mode) if s.is_engine_value]
        expected = (["mass_ratio"] if mode == "required" else []) + (
            [] if method in CLOSED_FORM_METHODS else ["tuning_ratio", "damper_damping"])
        assert engine == expected


def test_twins_and_helper_formulas():
    chain = steps("h2", "required")
    by_name = {s.name: s for s in chain}
    assert by_name["required_damping"].is_twin
    assert not by_name["pendulum_length"].is_twin
    assert by_name["pendulum_length"].formula == "=fixed_point_length"
    assert by_name["small_angle_error"].formula == SMALL_SWING_ERROR
    assert SMALL_SWING_ERROR.endswith(",1/agm_at_swing-1)")


def test_sections_in_checking_order():
    titles = [s.title for s in sections("den_hartog", "chosen_mass_ratio")]
    assert [t.split()[0] for t in titles] == ["1", "2", "3", "4", "5", "6"]


def test_mass_ratio_mode():
    assert mass_ratio_mode(True, False) == "chosen_mass_ratio"
    assert mass_ratio_mode(False, True) == "chosen_damper_mass"
    assert mass_ratio_mode(False, False) == "required"
    with pytest.raises(ValueError, match="mode='x' must be one of"):
        sections("h2", "x")
    with pytest.raises(ValueError, match="method='x' must be one of"):
        sections("x", "required")


# ---------------------------------------------------------------------------------------------
# the optional parts of the calculation (the design envelope), against outside references
# ---------------------------------------------------------------------------------------------

#: Invented tower: 0.15 Hz, 20,000 t, 1.5 %, service 0.25 -> 0.15 m/s^2, extreme 0.6 m/s^2.
ENVELOPE = dict(frequency=0.15, modal_mass=2.0e7, structural_damping=0.015, acceleration=0.25,
                acceleration_limit=0.15, clearance=1.2, extreme_acceleration=0.6)


def _period(theta_deg: float) -> float:
    """T / T0 of a simple pendulum: 2 K(m) / pi, m = sin^2(theta/2) (A&S 17.3; scipy ellipk
    takes the parameter m = k^2)."""
    return 2.0 * float(ellipk(math.sin(math.radians(theta_deg) / 2.0) ** 2)) / math.pi


def test_every_part_set_is_valid_and_named_by_the_inputs():
    assert all(valid_parts(p) for p in PART_SETS) and PART_SETS[-1] == PARTS
    assert not valid_parts(("measured_damping",)) and not valid_parts(("direction_2", "band"))
    assert parts_of({"band_lower": 0.9, "extreme_acceleration": 1.0, "frequency_2": 0.2,
                     "return_period": 1.0}) == ("band", "extreme", "comfort", "direction_2")
    titles = [s.title for s in sections("h2", "required", PARTS)]
    assert [t.split()[0] for t in titles] == [str(n) for n in range(1, len(titles) + 1)]


def test_extreme_level_scales_the_linear_response():
    """A linear system: every response at the extreme level is the service level's times the
    ratio of the inputs (superposition)."""
    r = design_damper(**ENVELOPE)
    c, k = r.cells, 0.6 / 0.25
    assert c["extreme_acceleration_with_damper"] == pytest.approx(
        k * c["acceleration_with_damper"], rel=1e-14)
    assert c["extreme_stroke"] == pytest.approx(k * c["stroke"], rel=1e-14)
    assert c["extreme_displacement"] == pytest.approx(k * c["structure_displacement"], rel=1e-14)


def test_extreme_swing_and_detuning_against_the_elliptic_integral():
    """Swing asin(x/L); the pendulum, in tune at the design swing, runs at
    T(theta_d) / T(theta_x) of its tuned frequency (A&S 17.3, scipy.special.ellipk)."""
    c = design_damper(**ENVELOPE).cells
    swing = math.degrees(math.asin(c["extreme_stroke"] / c["pendulum_length"]))
    assert c["extreme_swing_deg"] == pytest.approx(swing, rel=1e-13)
    want = _period(c["swing_angle_deg"]) / _period(swing) - 1.0
    assert c["extreme_detuning"] == pytest.approx(want, rel=1e-9)
    assert c["extreme_detuning"] < 0 < swing - c["swing_angle_deg"]     # a larger swing: slower


def test_buffers_and_force_against_harmonic_kinematics():
    """Contact velocity of x = A sin(w t) at x = c: w sqrt(A^2 - c^2); energy m v^2 / 2; peak
    force of spring and dashpot A sqrt(k^2 + (c_d w)^2) (kinematics of harmonic motion,
    e.g. S. S. Rao, Mechanical Vibrations, 5th ed., 2011, ch. 1 and 3)."""
    c = design_damper(**ENVELOPE).cells
    a, gap, w = c["extreme_stroke"], 1.2, 2.0 * math.pi * 0.15
    assert a > gap                                     # the buffers engage in this case
    t = math.asin(gap / a) / w                         # first time the mass reaches the gap
    v = a * w * math.cos(w * t)
    assert c["buffer_excess"] == pytest.approx(a - gap, rel=1e-14)
    assert c["contact_velocity"] == pytest.approx(v, rel=1e-12)
    assert c["buffer_energy"] == pytest.approx(c["damper_mass"] * v * v / 2.0, rel=1e-12)
    assert c["extreme_damper_force"] == pytest.approx(
        a * math.hypot(c["stiffness"], c["dashpot"] * w), rel=1e-13)
    inside = design_damper(**{**ENVELOPE, "clearance": 3.0}).cells
    assert inside["buffer_excess"] == inside["contact_velocity"] == inside["buffer_energy"] == 0


def test_floor_ordinate_moves_the_stroke_not_the_comfort_check():
    """Accelerations and limit at the top occupied floor: the damping needed is unchanged
    (a ratio of two accelerations at one floor); the displacement at the damper is the
    occupied floor's divided by the mode-shape ordinate (EN 1991-1-4:2005, F.3)."""
    one, low = design_damper(**ENVELOPE), design_damper(**ENVELOPE, floor_ordinate=0.8)
    assert low.mass_ratio == pytest.approx(one.mass_ratio, rel=1e-12)
    assert low.structure_displacement == pytest.approx(one.structure_displacement / 0.8,
                                                       rel=1e-14)
    assert low.cells["extreme_displacement"] == pytest.approx(
        one.cells["extreme_displacement"] / 0.8, rel=1e-14)


def test_comfort_limit_is_the_melbourne_palmer_formula():
    """a = sqrt(2 ln(n T)) (0.68 + ln R / 5) exp(-3.65 - 0.41 ln n), T = 600 s (Melbourne &
    Palmer, J. Wind Eng. Ind. Aerodyn. 41-44 (1992) 105-116), written here; at n = 0.15 Hz,
    R = 10 years by hand: sqrt(2 ln 90) = 2.99994, 0.68 + ln(10)/5 = 1.14052,
    exp(-3.65 + 0.41 x 1.89712) = 0.056584, product 0.19357 m/s^2."""
    r = design_damper(**ENVELOPE, return_period=10.0)
    n, rp = 0.15, 10.0
    want = math.sqrt(2 * math.log(n * 600)) * (0.68 + math.log(rp) / 5) * math.exp(
        -3.65 - 0.41 * math.log(n))
    assert r.cells["comfort_limit_mp"] == pytest.approx(want, rel=1e-14)
    assert round(want, 5) == 0.19357
    assert r.check("comfort_criterion").ok


def test_second_direction_combined_at_both_levels():
    """SRSS of the two directions' peaks (common practice, no source) at the service and the
    extreme level; the buffers take the radial excess, at the higher mode frequency."""
    r = design_damper(**ENVELOPE, frequency_2=0.17, modal_mass_2=1.8e7,
                      structural_damping_2=0.015, acceleration_2=0.2, acceleration_limit_2=0.15,
                      extreme_acceleration_2=0.5)
    c = r.cells
    assert c["combined_stroke"] == pytest.approx(math.hypot(c["stroke"], c["stroke_2"]),
                                                 rel=1e-14)
    xr = math.hypot(c["extreme_stroke"], c["extreme_stroke_2"])
    assert c["extreme_combined_stroke"] == pytest.approx(xr, rel=1e-14)
    assert c["extreme_stroke_2"] == pytest.approx(c["stroke_2"] * 0.5 / 0.2, rel=1e-13)
    v = 2 * math.pi * 0.17 * math.sqrt(xr ** 2 - 1.2 ** 2)
    assert c["combined_contact_velocity"] == pytest.approx(v, rel=1e-12)
    assert c["combined_buffer_energy"] == pytest.approx(c["damper_mass"] * v * v / 2, rel=1e-12)
    assert not r.check("extreme_combined_stroke").ok and r.check("combined_stroke").ok


def test_second_direction_over_the_band_against_an_independent_variance():
    """Direction 2's worst case over the band: at every r the white-noise displacement variance
    of the detuned 2-DOF system from the state equations (scipy Lyapunov solver; Soong &
    Grigoriu 1993) gives a_2 sqrt(sigma^2 with / sigma^2 without) (EN 1991-1-4:2005, B.2(6));
    the engine's worst case is the largest of them over a fine grid of r."""
    from damper_references import lyapunov_variances
    r = design_damper(**ENVELOPE, frequency_2=0.17, modal_mass_2=1.8e7,
                      structural_damping_2=0.015, acceleration_2=0.2, acceleration_limit_2=0.15,
                      extreme_acceleration_2=0.5, band_lower=0.9, band_upper=1.1)
    c, zs = r.cells, 0.015

    def a2(factor):
        with_damper, _ = lyapunov_variances(c["mass_ratio_2"], c["tuning_ratio_2"] / factor,
                                            c["damper_damping_2"], zs)
        return 0.2 * math.sqrt(with_damper / (math.pi / (2.0 * zs)))
    grid = [0.9 + 0.2 * i / 400 for i in range(401)]
    best = max(grid, key=a2)
    assert c["band_worst_acceleration_2"] == pytest.approx(a2(best), rel=1e-6)
    assert c["band_worst_acceleration_2"] >= a2(best) * (1 - 1e-12)
    assert c["band_worst_factor_2"] == pytest.approx(best, abs=0.2 / 400)
    assert r.check("band_acceleration_2").ok == (c["band_worst_acceleration_2"]
                                                 <= 0.15 * (1 + 1e-9))


def test_a_robust_design_meets_the_limit_over_the_whole_band():
    """tuning_method = "robust": the required mass ratio is the least whose robustly tuned
    damper keeps the acceleration within the limit anywhere in the band. Checked against the
    Lyapunov variance of the detuned 2-DOF system on a fine grid of r (Soong & Grigoriu 1993;
    EN 1991-1-4:2005, B.2(6)); a damper tuned at the nominal frequency (h2) needs more mass
    for the same band."""
    from damper_references import lyapunov_variances
    band = dict(band_lower=0.9, band_upper=1.1)
    r = design_damper(**ENVELOPE, **band, tuning_method="robust")
    c, zs = r.cells, 0.015

    def a(factor):
        with_damper, _ = lyapunov_variances(c["mass_ratio"], c["tuning_ratio"] / factor,
                                            c["damper_damping"], zs)
        return 0.25 * math.sqrt(with_damper / (math.pi / (2.0 * zs)))
    worst = max(a(0.9 + 0.2 * i / 400) for i in range(401))
    assert worst == pytest.approx(0.15, rel=1e-6)
    assert r.check("band_acceleration").ok and r.acceleration_with_damper < 0.15
    nominal = design_damper(**ENVELOPE, **band, tuning_method="h2")
    assert nominal.cells["band_mass_ratio"] > c["mass_ratio"]
    assert [s.name for s in steps("robust", "required", ("band",))
            if s.is_engine_value][:3] == ["mass_ratio", "tuning_ratio", "damper_damping"]
