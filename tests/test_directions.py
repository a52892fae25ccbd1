# SPDX-License-Identifier: MIT
"""One pendulum mass for two sway directions (functions.directions), against outside references.

References, each beside its check:

* the small-swing frequency of a mass on a pendulum with a horizontal spring,
  omega^2 = g/L + k/m (textbook: gravity stiffness m g / L and the spring in parallel; written
  out here);
* at a finite swing, a time-domain integration (scipy.integrate.solve_ivp, DOP853) of the
  equation of motion derived here from the moments about the pivot of a point mass on a rigid
  hanger with a horizontal spring force -k L sin(theta):
  m L^2 theta'' = -m g L sin(theta) - k L sin(theta) L cos(theta); the period measured between
  zero crossings;
* the pure-spring limit g = 0, a pendulum in 2 theta of frequency sqrt(k/m): period
  4 K(sin^2 theta_0) / sqrt(k/m) with scipy.special.ellipk (parameter m = k^2, Abramowitz &
  Stegun 1964, 17.2);
* the small-swing expansion omega^2 ~ (g/L)(1 - theta^2/8) + (k/m)(1 - theta^2/2) (Lindstedt's
  method on the cubic term of the same equation, derived here);
* SRSS by hand (3-4-5 triangle);
* the effective damping and stroke ratio of direction 2 against an independent state-space
  (Lyapunov) variance of the two-degree-of-freedom system under white-noise force
  (scipy.linalg.solve_continuous_lyapunov), assembled here from the physical parts: modal mass
  and damping, the pendulum's gravity stiffness plus the springs, the dashpot;
* Den Hartog's optimum f = 1/(1+mu), zeta_d = sqrt(3 mu / (8 (1+mu))) (Mechanical Vibrations,
  4th ed., 1956, §3.3; damping on the damper's own frequency) written out here;
* the worksheet formulas evaluated by the builder's evaluator and, where installed, by
  LibreOffice and Gnumeric recalculating them.

The rule that two identical directions give direction 1's design back (no springs), and the
requirement that the damper mass direction 2 needs meets its limit, are consistency rules:
common practice, no source.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from openpyxl import Workbook
from openpyxl.workbook.defined_name import DefinedName
from scipy.integrate import solve_ivp
from scipy.linalg import solve_continuous_lyapunov
from scipy.special import ellipk

from functions.design import (PART_CHECK_RULES, SecondDirection, design_damper,
                              design_second_direction)
from functions.directions import (DIRECTION_FORMS, DIRECTION_INPUTS, combined_stroke,
                                  spring_pendulum_frequency, spring_stiffness)

#: The checks of the second direction (service level).
DIRECTION_CHECK_RULES = tuple(rule for parts, rule in PART_CHECK_RULES
                              if parts == ("direction_2",))
from functions.worksheet import TWIN_TOLERANCE, formula_names
from workbook_builder.xlsx import gnumeric, libreoffice
from workbook_builder.xlsx.formulas import Evaluator, check_formula

G = 9.80665

# Invented tower: direction 1 at 0.15 Hz (the design's example), direction 2 stiffer.
DESIGN = dict(frequency=0.15, modal_mass=2.0e7, structural_damping=0.015, acceleration=0.25,
              acceleration_limit=0.15, clearance=1.2)
SECOND = dict(frequency=0.17, modal_mass=1.8e7, structural_damping=0.015, acceleration=0.2,
              acceleration_limit=0.15)


def _textbook(L, k, m, g=G):
    """omega^2 = g/L + k/m: small-swing frequency [Hz] (textbook)."""
    return np.sqrt(g / L + k / m) / (2.0 * np.pi)


def _integrated_period(a, b, swing_deg):
    """Period [s] of theta'' = -a sin(theta) - b sin(theta) cos(theta) from rest at swing_deg,
    by DOP853 and the mean spacing of the downward zero crossings over several periods."""
    def rhs(t, y):
        return [y[1], -a * np.sin(y[0]) - b * np.sin(y[0]) * np.cos(y[0])]

    def crossing(t, y):
        return y[0]
    crossing.direction = -1
    t_end = 6.0 * 2.0 * np.pi / np.sqrt(a + b) * 1.5
    sol = solve_ivp(rhs, (0.0, t_end), [np.radians(swing_deg), 0.0], method="DOP853",
                    rtol=1e-12, atol=1e-14, events=crossing)
    t = sol.t_events[0]
    assert len(t) >= 4
    return (t[-1] - t[0]) / (len(t) - 1)


# --------------------------------------------------------------------------------------------
# spring_pendulum_frequency
# --------------------------------------------------------------------------------------------
@pytest.mark.parametrize("L, k, m", [(11.288, 4.1e4, 287e3), (5.0, 0.0, 1e3), (20.0, 1e6, 5e5),
                                     (2.0, 3.0, 0.5)])
def test_small_swing_frequency_is_the_textbook_sum(L, k, m):
    assert spring_pendulum_frequency(L, k, m) == pytest.approx(_textbook(L, k, m), rel=1e-14)


def test_broadcasts_like_numpy():
    L = np.array([5.0, 10.0, 20.0])
    k = np.array([[0.0], [1e4]])
    got = spring_pendulum_frequency(L, k, 1e4)
    assert got.shape == (2, 3)
    np.testing.assert_allclose(got, _textbook(L, k, 1e4), rtol=1e-14)


@pytest.mark.parametrize("L, k, m, swing_deg", [
    (11.288, 4.1e4, 287e3, 5.0),        # the design's scale: springs lift 0.148 Hz by ~8 %
    (11.288, 4.1e4, 287e3, 20.0),
    (10.0, 0.0, 1e3, 15.0),             # no spring: the simple pendulum
    (10.0, 5e3, 1e3, 60.0),             # spring stronger than gravity (b > a)
    (1.0, 1e4, 1e2, 80.0),              # b >> a: the spring's softening dominates (a < b u)
])
def test_finite_swing_against_time_integration(L, k, m, swing_deg):
    a, b = G / L, k / m
    period = _integrated_period(a, b, swing_deg)
    got = spring_pendulum_frequency(L, k, m, swing_deg)
    # DOP853 at rtol 1e-12 over six periods: the mean crossing spacing is good to ~1e-10
    assert got == pytest.approx(1.0 / period, rel=1e-9)


@pytest.mark.parametrize("swing_deg", [10.0, 30.0, 45.0])
def test_pure_spring_is_a_pendulum_in_twice_the_angle(swing_deg):
    # g -> 0 (g must be > 0: 1e-300): theta'' = -(k/m) sin(2 theta)/2, a pendulum in 2 theta
    k, m = 2.0e4, 1.0e3
    th = np.radians(swing_deg)
    period = 4.0 * ellipk(np.sin(th) ** 2) / np.sqrt(k / m)      # A&S 17.2: parameter sin^2
    got = spring_pendulum_frequency(1.0, k, m, swing_deg, g=1e-300)
    assert got == pytest.approx(1.0 / period, rel=1e-13)


def test_the_spring_part_detunes_four_times_faster_than_gravity():
    # Lindstedt on theta'' = -(a + b) theta + (a/6 + 2b/3) theta^3:
    # omega^2 = (a + b) - 3/4 (a/6 + 2b/3) theta0^2 = a (1 - theta0^2/8) + b (1 - theta0^2/2).
    # A rule that detunes the gravity part only (omega^2 = (g/L)(T0/T)^2 + k/m) misses the
    # spring's share; checked here against the integration, not the engine.
    L, k, m, swing_deg = 11.288, 4.1e4, 287e3, 4.0
    a, b, th = G / L, k / m, np.radians(swing_deg)
    true = 1.0 / _integrated_period(a, b, swing_deg)
    lindstedt = np.sqrt(a * (1 - th ** 2 / 8) + b * (1 - th ** 2 / 2)) / (2 * np.pi)
    gravity_only = np.sqrt(a * (1 - th ** 2 / 8) + b) / (2 * np.pi)
    assert lindstedt == pytest.approx(true, rel=1e-6)           # O(theta^4) ~ 6e-7 at 4 deg
    shift = gravity_only / true - 1.0                            # ~ b theta^2 / (4 (a + b))
    assert shift == pytest.approx(b * th ** 2 / (4 * (a + b)), rel=0.02)
    assert shift > 1e-4
    assert spring_pendulum_frequency(L, k, m, swing_deg) == pytest.approx(true, rel=1e-9)


@pytest.mark.parametrize("kwargs, message", [
    (dict(pendulum_length=0.0), r"pendulum_length=0.0 must be in \(0, inf\) \[m\]"),
    (dict(spring_stiffness=-1.0), r"spring_stiffness=-1.0 must be in \[0, inf\) \[N/m\]"),
    (dict(damper_mass=-5.0), r"damper_mass=-5.0 must be in \(0, inf\) \[kg\]"),
    (dict(swing_deg=90.0), r"swing_deg=90.0 must be in \[0, 90\) \[deg\]"),
])
def test_spring_pendulum_frequency_refuses_bad_arguments(kwargs, message):
    args = dict(pendulum_length=10.0, spring_stiffness=1e3, damper_mass=1e3, swing_deg=5.0)
    with pytest.raises(ValueError, match=message):
        spring_pendulum_frequency(**{**args, **kwargs})


# --------------------------------------------------------------------------------------------
# spring_stiffness and combined_stroke
# --------------------------------------------------------------------------------------------
def test_spring_stiffness_by_hand():
    # 1000 kg, L = g / (2 pi 0.5)^2 swings at 0.5 Hz; lifted to 0.6 Hz:
    # k = m ((2 pi 0.6)^2 - (2 pi 0.5)^2) = 1000 * 4 pi^2 * 0.11 N/m
    L = G / (2 * math.pi * 0.5) ** 2
    assert spring_stiffness(1000.0, 0.6, L) == pytest.approx(1000 * 4 * math.pi ** 2 * 0.11,
                                                             rel=1e-13)
    # and the textbook frequency of that pendulum with that spring is the target
    assert _textbook(L, spring_stiffness(1000.0, 0.6, L), 1000.0) == pytest.approx(0.6,
                                                                                    rel=1e-14)


def test_negative_spring_stiffness_names_the_frequency():
    L = G / (2 * math.pi * 0.5) ** 2
    with pytest.raises(ValueError, match=r"damper_frequency=0\.4 must be in \[0\.5, inf\) "
                                         r"\[Hz\].*spring_stiffness would be negative"):
        spring_stiffness(1000.0, 0.4, L)


def test_combined_stroke_is_srss():
    assert combined_stroke(3.0, 4.0) == 5.0                      # 3-4-5 by hand
    assert combined_stroke(0.9, 0.0) == 0.9
    np.testing.assert_allclose(combined_stroke([0.3, 0.5], [[0.4], [1.2]]),
                               [[0.5, math.sqrt(0.41)], [math.sqrt(1.53), 1.3]], rtol=1e-15)
    with pytest.raises(ValueError, match=r"stroke_2=-0.1 must be in \[0, inf\) \[m\]"):
        combined_stroke(0.5, -0.1)


# --------------------------------------------------------------------------------------------
# design_second_direction
# --------------------------------------------------------------------------------------------
SAME = ("mass_ratio", "tuning_ratio", "damper_damping", "damper_frequency",
        "effective_damping", "acceleration_with_damper", "stroke_ratio", "stroke")


@pytest.mark.parametrize("extra", [dict(), dict(tuning_method="den_hartog"),
                                   dict(tuning_method="hinf", mass_ratio=0.02),
                                   dict(tuning_method="white_noise_force", damper_mass=3e5)])
def test_identical_directions_give_direction_one_and_no_springs(extra):
    r = design_damper(**DESIGN, **extra)
    d = design_second_direction(r, DESIGN["frequency"], DESIGN["modal_mass"],
                                DESIGN["structural_damping"], DESIGN["acceleration"],
                                DESIGN["acceleration_limit"])
    for name in SAME:
        assert d.cells[f"{name}_2"] == pytest.approx(r.cells[name], rel=1e-12), name
    assert d.spring_stiffness_2 == 0.0
    assert d.dashpot_2 == pytest.approx(r.cells["dashpot"], rel=1e-12)
    assert d.structure_displacement_2 == pytest.approx(r.cells["structure_displacement"], rel=1e-12)
    assert d.swing_angle_deg_2 == pytest.approx(r.cells["swing_angle_deg"], rel=1e-12)
    # no springs: the frequency at the design swing is the pendulum's, the detuning direction 1's
    assert d.frequency_at_swing_2 == pytest.approx(r.cells["damper_frequency"], rel=1e-12)
    assert d.detuning_2 == pytest.approx(r.cells["detuning"], rel=1e-9)
    assert d.combined_stroke == pytest.approx(math.sqrt(2.0) * r.cells["stroke"], rel=1e-14)
    assert d.stroke_sum == pytest.approx(2.0 * r.cells["stroke"], rel=1e-14)


def _lyapunov_variances(Ms, fs, zs, md, kd, cd):
    """(var x_s, var (x_d - x_s)) of structure + damper under unit white-noise force on the
    structure; states [x_s, x_d, v_s, v_d] (absolute displacements)."""
    ws = 2.0 * np.pi * fs
    ks, cs = Ms * ws ** 2, 2.0 * zs * Ms * ws
    M = np.diag([Ms, md])
    K = np.array([[ks + kd, -kd], [-kd, kd]])
    C = np.array([[cs + cd, -cd], [-cd, cd]])
    Minv = np.linalg.inv(M)
    A = np.block([[np.zeros((2, 2)), np.eye(2)], [-Minv @ K, -Minv @ C]])
    B = np.array([[0.0], [0.0], [1.0 / Ms], [0.0]])
    P = solve_continuous_lyapunov(A, -B @ B.T)
    return P[0, 0], P[0, 0] + P[1, 1] - 2.0 * P[0, 1]


def _bare_variance(Ms, fs, zs):
    ws = 2.0 * np.pi * fs
    A = np.array([[0.0, 1.0], [-ws ** 2, -2.0 * zs * ws]])
    B = np.array([[0.0], [1.0 / Ms]])
    return solve_continuous_lyapunov(A, -B @ B.T)[0, 0]


@pytest.mark.parametrize("method", ["h2", "den_hartog", "hinf"])
def test_direction_two_against_a_state_space_variance(method):
    r = design_damper(**DESIGN, tuning_method=method)
    d = design_second_direction(r, *SECOND.values())
    md = r.cells["damper_mass"]
    # the damper's stiffness in direction 2 from its physical parts: the pendulum's gravity
    # stiffness at direction 1's design swing, m g / L_0, plus the springs
    kd = md * r.cells["gravity"] / r.cells["small_angle_length"] + d.spring_stiffness_2
    assert np.sqrt(kd / md) / (2 * np.pi) == pytest.approx(d.damper_frequency_2, rel=1e-12)
    var, var_rel = _lyapunov_variances(SECOND["modal_mass"], SECOND["frequency"],
                                       SECOND["structural_damping"], md, kd, d.dashpot_2)
    var0 = _bare_variance(SECOND["modal_mass"], SECOND["frequency"],
                          SECOND["structural_damping"])
    # variance of a single oscillator under white noise ~ 1/zeta: zeta_eff = zeta_s var0 / var
    assert d.effective_damping_2 == pytest.approx(SECOND["structural_damping"] * var0 / var,
                                                  rel=1e-9)
    assert d.stroke_ratio_2 == pytest.approx(np.sqrt(var_rel / var), rel=1e-9)
    assert d.acceleration_with_damper_2 == pytest.approx(
        SECOND["acceleration"] * np.sqrt(var / var0), rel=1e-9)


def test_den_hartog_tuning_in_direction_two():
    r = design_damper(**DESIGN, tuning_method="den_hartog")
    d = design_second_direction(r, *SECOND.values())
    mu = r.cells["damper_mass"] / SECOND["modal_mass"]
    assert d.mass_ratio_2 == pytest.approx(mu, rel=1e-15)
    assert d.tuning_ratio_2 == pytest.approx(1.0 / (1.0 + mu), rel=1e-14)       # Den Hartog
    assert d.damper_damping_2 == pytest.approx(math.sqrt(3 * mu / (8 * (1 + mu))), rel=1e-14)
    assert d.damper_frequency_2 == pytest.approx(SECOND["frequency"] / (1 + mu), rel=1e-14)
    assert d.dashpot_2 == pytest.approx(
        2 * d.damper_damping_2 * r.cells["damper_mass"] * 2 * math.pi * d.damper_frequency_2,
        rel=1e-14)


# Direction 2 with a stricter limit than the damper meets: it fails and says what mass it needs.
HARD = dict(frequency=0.17, modal_mass=1.8e7, structural_damping=0.01, acceleration=0.3,
            acceleration_limit=0.12)


@pytest.mark.parametrize("method", ["h2", "nishihara_asami"])
def test_required_damper_mass_meets_the_limit_exactly(method):
    r = design_damper(**DESIGN, tuning_method=method)
    d = design_second_direction(r, *HARD.values())
    assert not d.check("acceleration_2").ok and not d.ok
    assert d.required_damper_mass_2 > r.cells["damper_mass"]
    # the same design with the damper mass raised to direction 2's need
    r2 = design_damper(**DESIGN, tuning_method=method, damper_mass=d.required_damper_mass_2)
    d2 = design_second_direction(r2, *HARD.values())
    assert d2.acceleration_with_damper_2 == pytest.approx(HARD["acceleration_limit"], rel=1e-9)
    assert d2.check("acceleration_2").ok
    # and independently: the Lyapunov variance of that damper reaches the required damping
    md = r2.cells["damper_mass"]
    kd = md * (2 * np.pi * d2.damper_frequency_2) ** 2
    var, _ = _lyapunov_variances(HARD["modal_mass"], HARD["frequency"],
                                 HARD["structural_damping"], md, kd, d2.dashpot_2)
    var0 = _bare_variance(HARD["modal_mass"], HARD["frequency"], HARD["structural_damping"])
    required = HARD["structural_damping"] * (HARD["acceleration"] / HARD["acceleration_limit"]) ** 2
    assert HARD["structural_damping"] * var0 / var == pytest.approx(required, rel=1e-9)


def test_direction_within_its_limit_needs_no_mass():
    r = design_damper(**DESIGN)
    d = design_second_direction(r, 0.17, 1.8e7, 0.015, 0.1, 0.15)
    assert d.required_mass_ratio_2 == 0.0 and d.required_damper_mass_2 == 0.0
    # a need below what a mass ratio of 1e-4 gives (the optima's floor) is negligible: 0 too
    d = design_second_direction(r, 0.17, 1.8e7, 0.015, 0.1501, 0.15)
    assert d.required_damping_2 > 0.015 and d.required_damper_mass_2 == 0.0


def test_combined_stroke_and_swing_by_hand():
    r = design_damper(**DESIGN)
    d = design_second_direction(r, *SECOND.values())
    x1, x2, L = r.cells["stroke"], d.stroke_2, r.cells["pendulum_length"]
    assert d.combined_stroke == pytest.approx(math.sqrt(x1 * x1 + x2 * x2), rel=1e-15)
    assert d.combined_swing_deg == pytest.approx(math.degrees(math.asin(d.combined_stroke / L)),
                                                 rel=1e-14)
    assert d.swing_angle_deg_2 == pytest.approx(math.degrees(math.asin(x2 / L)), rel=1e-14)
    assert x1 < d.combined_stroke < d.stroke_sum == pytest.approx(x1 + x2, rel=1e-15)


def test_checks_fail_where_the_clearance_is_too_small():
    r = design_damper(**{**DESIGN, "clearance": 1.0})      # direction 1 alone fits (0.95 m)
    d = design_second_direction(r, *SECOND.values())
    assert r.check("stroke").ok
    assert not d.check("combined_stroke").ok
    assert "combined stroke" in d.check("combined_stroke").text


def test_detuning_of_direction_two_is_the_spring_pendulum_at_its_swing():
    r = design_damper(**DESIGN)
    d = design_second_direction(r, *SECOND.values())
    L, md = r.cells["pendulum_length"], r.cells["damper_mass"]
    a, b = G / L, d.spring_stiffness_2 / md
    at_swing = 1.0 / _integrated_period(a, b, d.swing_angle_deg_2)
    small = np.sqrt(a + b) / (2 * np.pi)
    assert d.detuning_2 == pytest.approx(at_swing / small - 1.0, rel=1e-6)
    assert d.frequency_error_2 == pytest.approx(at_swing / d.damper_frequency_2 - 1.0,
                                                rel=1e-5)
    assert d.small_swing_frequency_2 == pytest.approx(small, rel=1e-14)


def test_second_direction_fields_and_cells_agree():
    r = design_damper(**DESIGN)
    d = design_second_direction(r, *SECOND.values())
    for name in SecondDirection.__dataclass_fields__:
        if name not in ("cells", "checks"):
            assert getattr(d, name) == d.cells[name]
    assert set(DIRECTION_INPUTS) <= set(d.cells)
    assert set(DIRECTION_FORMS) <= set(d.cells)
    assert [c.name for c in d.checks] == [rule.name for rule in DIRECTION_CHECK_RULES]


def test_lower_frequency_second_direction_is_refused():
    r = design_damper(**DESIGN)
    with pytest.raises(ValueError, match=r"frequency_2=0\.13 Hz needs a damper frequency .*"
                                         r"spring_stiffness_2 would be negative.*main mode"):
        design_second_direction(r, 0.13, 1.8e7, 0.015, 0.2, 0.15)


@pytest.mark.parametrize("position, value, message", [
    (1, 0.0, r"frequency_2=0.0 must be in \[0.01, 20\] \[Hz\]"),
    (2, 0.0, r"modal_mass_2=0.0 must be in \(0, 1e\+11\] \[kg\]"),
    (3, -0.01, r"structural_damping_2=-0.01 must be in"),
    (4, float("nan"), r"acceleration_2=nan must be a finite number"),
    (5, 0.0, r"acceleration_limit_2=0.0 must be in"),
    (2, [1e7, 2e7], r"modal_mass_2=\[10000000.0, 20000000.0\] must be a single number"),
])
def test_bad_inputs_name_the_argument(position, value, message):
    r = design_damper(**DESIGN)
    args = [r, *SECOND.values()]
    args[position] = value
    with pytest.raises(ValueError, match=message):
        design_second_direction(*args)


def test_result_must_be_a_design():
    with pytest.raises(ValueError, match="result=.* must be a DesignResult"):
        design_second_direction(dict(DESIGN), *SECOND.values())


def test_stroke_beyond_the_pendulum_is_refused():
    r = design_damper(**DESIGN)
    with pytest.raises(ValueError, match=r"stroke_2=.* must be below pendulum_length"):
        design_second_direction(r, 0.15, 2.0e9, 0.0005, 10.0, 9.0)


# --------------------------------------------------------------------------------------------
# worksheet formulas
# --------------------------------------------------------------------------------------------
def _cases():
    out = []
    for extra, second in [(dict(), SECOND), (dict(tuning_method="den_hartog"), HARD),
                          (dict(tuning_method="hinf", mass_ratio=0.02), SECOND),
                          (dict(), dict(frequency=DESIGN["frequency"],
                                        modal_mass=DESIGN["modal_mass"],
                                        structural_damping=DESIGN["structural_damping"],
                                        acceleration=DESIGN["acceleration"],
                                        acceleration_limit=DESIGN["acceleration_limit"]))]:
        r = design_damper(**DESIGN, **extra)
        out.append((r, design_second_direction(r, *second.values())))
    return out


CASES = _cases()


def _evaluate(formula, values):
    wb = Workbook()
    ws = wb.active
    ws.title = "V"
    for i, (name, v) in enumerate(values.items(), start=1):
        ws.cell(i, 1, float(v))
        wb.defined_names.add(DefinedName(name, attr_text=f"V!$A${i}"))
    return Evaluator(wb).evaluate(formula, "V")


@pytest.mark.parametrize("k", range(len(CASES)))
def test_every_formula_equals_its_numpy_twin(k):
    r, d = CASES[k]
    cells = {**r.cells, **d.cells}
    for name, form in DIRECTION_FORMS.items():
        check_formula(form.worksheet.formula)
        got = _evaluate(form.worksheet.formula, {n: cells[n] for n in form.worksheet.names})
        want = cells[name]
        assert isinstance(got, float), (name, got)
        assert got == pytest.approx(want, rel=1e-13, abs=1e-300), name


@pytest.mark.parametrize("k", range(len(CASES)))
def test_verdict_formulas_give_the_engine_verdicts(k):
    r, d = CASES[k]
    cells = {**r.cells, **d.cells}
    for rule in DIRECTION_CHECK_RULES:
        names = formula_names(rule.verdict_formula)
        got = _evaluate(rule.verdict_formula, {n: cells[n] for n in names})
        assert got == ("OK" if d.check(rule.name).ok else "NOT OK"), rule.name


def test_formulas_read_design_cells_direction_inputs_or_earlier_forms():
    r, d = CASES[0]
    known = set(r.cells) | set(DIRECTION_INPUTS) | {
        "tuning_ratio_2", "damper_damping_2", "effective_damping_2", "stroke_ratio_2",
        "frequency_at_swing_2", "required_mass_ratio_2",     # the engine values
        "stroke_2"}               # the design chain's own stroke form, renamed for direction 2
    for name, form in DIRECTION_FORMS.items():
        assert set(form.worksheet.names) <= known, (name, set(form.worksheet.names) - known)
        known.add(name)


def _workbook_of_formulas(path):
    """A sheet of values (design cells, direction-2 inputs and engine values) and one of the
    DIRECTION_FORMS formulas, each cell under its defined name; returns name -> formula cell.
    The applications' results are compared with the engine at the project's accepted
    TWIN_TOLERANCE: detuning_2 = f(theta)/f(0) - 1 loses ~1e-12 relative to cancellation when
    an application's SQRT differs from numpy's in the last bit."""
    r, d = CASES[1]
    cells = {**r.cells, **d.cells}
    wb = Workbook()
    ws = wb.active
    ws.title = "V"
    row = 0
    for name, value in cells.items():
        if name in DIRECTION_FORMS:
            continue
        row += 1
        ws.cell(row, 1, float(value))
        wb.defined_names.add(DefinedName(name, attr_text=f"V!$A${row}"))
    where = {}
    for name, form in DIRECTION_FORMS.items():
        row += 1
        ws.cell(row, 1, form.worksheet.formula)
        wb.defined_names.add(DefinedName(name, attr_text=f"V!$A${row}"))
        where[name] = f"A{row}"
    wb.save(path)
    return cells, where


_APPLICATIONS = [
    pytest.param(libreoffice.recalculate, marks=pytest.mark.skipif(
        libreoffice.find_soffice() is None, reason="LibreOffice is not installed"),
        id="libreoffice"),
    pytest.param(gnumeric.recalculate, marks=pytest.mark.skipif(
        gnumeric.find_ssconvert() is None, reason="Gnumeric is not installed"), id="gnumeric"),
]


@pytest.mark.parametrize("recalculate", _APPLICATIONS)
def test_spreadsheet_applications_recalculate_the_formulas_to_the_engine(recalculate, tmp_path):
    cells, where = _workbook_of_formulas(tmp_path / "directions.xlsx")
    values = libreoffice.read_values(recalculate(tmp_path / "directions.xlsx", tmp_path / "out"))
    for name, cell in where.items():
        assert values[("V", cell)] == pytest.approx(cells[name], rel=TWIN_TOLERANCE), name
