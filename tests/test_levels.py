# SPDX-License-Identifier: MIT
"""Tests of functions.levels: the extreme wind level, the buffers and the occupied floor.

Every reference comes from outside the module:

* the resonant rule and the stroke from a state-space (Lyapunov) variance of a dimensional
  two-mass model under white-noise force built here (T. T. Soong & M. Grigoriu, Random
  Vibration of Mechanical and Structural Systems, Prentice Hall, 1993, state-space covariance
  equation); the rule itself, sigma ~ 1/sqrt(zeta), is EN 1991-1-4:2005 Annex B, B.2(6);
* the floor ordinate from a power-law mode shape Phi(z) = (z/h)^zeta written here
  (EN 1991-1-4:2005 Annex F, (F.3), from memory, medium-high confidence) and a modal
  coordinate q: a floor moves Phi(z) q;
* the contact velocity from the harmonic motion solved numerically (brentq for the time at
  which A sin(omega t) = c, a central difference for its velocity); the energy by the hand
  formula m v^2 / 2; the damper force from the largest |k x + c x'| over a sampled cycle;
* the swing from plane trigonometry and the detuning from the exact period
  T = 4 sqrt(L/g) K(m), m = sin^2(theta/2), with scipy.special.ellipk (Abramowitz & Stegun,
  Handbook of Mathematical Functions, 1964, §17.2, parameter m);
* Melbourne & Palmer's criterion written out here with mpmath, and two values computed by
  hand (below);
* the worksheet twins evaluated by the builder's formula evaluator and, where installed, by
  LibreOffice and Gnumeric themselves.
"""
from __future__ import annotations

import math

import mpmath
import numpy as np
import pytest
from openpyxl import Workbook
from openpyxl.workbook.defined_name import DefinedName
from scipy.linalg import solve_continuous_lyapunov
from scipy.optimize import brentq
from scipy.special import ellipk

import functions
from functions.damper import effective_damping, optimal_tuning, stroke_ratio
from functions.design import design_damper
from functions.levels import (
    LEVEL_FORMS, MELBOURNE_PALMER_FREQUENCIES, RETURN_PERIODS, ExtremeResponse, ExtremeSwing,
    buffer_energy, buffer_excess, contact_velocity, extreme_acceleration_from_displacement,
    extreme_response, extreme_swing, melbourne_palmer_limit, peak_damper_force,
    power_law_floor_ordinate,
)
from functions.worksheet import form_of
from workbook_builder.xlsx import gnumeric, libreoffice
from workbook_builder.xlsx.formulas import Evaluator, check_formula

MODAL_MASS = 2.0e7        # kg, invented
FS = 0.15                 # Hz, invented
ZS = 0.015                # invented


# ---------------------------------------------------------------------------------------------
# independent reference: a dimensional two-mass model under white-noise force
def _covariance(mu, f, zd, zs, fs=FS, m=MODAL_MASS):
    """Stationary covariance of [x_s, x_d, v_s, v_d] (absolute motions) under a unit white-noise
    force on the structure: A P + P A^T + B B^T = 0 (Soong & Grigoriu 1993)."""
    ws, wd = 2 * math.pi * fs, 2 * math.pi * f * fs
    md = mu * m
    ks, cs = m * ws ** 2, 2 * zs * m * ws
    kd, cd = md * wd ** 2, 2 * zd * md * wd
    mass = np.diag([m, md])
    stiff = np.array([[ks + kd, -kd], [-kd, kd]])
    damp = np.array([[cs + cd, -cd], [-cd, cd]])
    minv = np.linalg.inv(mass)
    a = np.block([[np.zeros((2, 2)), np.eye(2)], [-minv @ stiff, -minv @ damp]])
    b = np.array([[0.0], [0.0], [1.0 / m], [0.0]])
    return solve_continuous_lyapunov(a, -b @ b.T)


def _bare_variance(zs, fs=FS, m=MODAL_MASS):
    """Displacement variance of the structure alone under the same unit white noise."""
    ws = 2 * math.pi * fs
    a = np.array([[0.0, 1.0], [-ws ** 2, -2 * zs * ws]])
    b = np.array([[0.0], [1.0 / m]])
    return solve_continuous_lyapunov(a, -b @ b.T)[0, 0]


MU = 0.02
F_H2, ZD_H2 = optimal_tuning(MU, "h2", ZS)
ZETA = effective_damping(MU, F_H2, ZD_H2, ZS)
RATIO = stroke_ratio(MU, F_H2, ZD_H2, ZS)


def test_resonant_rule_and_stroke_against_a_two_mass_model():
    # EN 1991-1-4:2005 B.2(6): resonant sigma ~ 1/sqrt(zeta); the variance-equivalent damping
    # is the damping of the bare structure with the same displacement variance, so the ratio
    # of the peak responses (equal peak factors) is the ratio of the standard deviations
    p = _covariance(MU, F_H2, ZD_H2, ZS)
    reduction = math.sqrt(p[0, 0] / _bare_variance(ZS))
    rel_stroke = math.sqrt(p[1, 1] - 2 * p[0, 1] + p[0, 0]) / math.sqrt(p[0, 0])
    a_x = 0.55                                          # m/s^2, invented extreme level
    r = extreme_response(a_x, ZS, ZETA, RATIO, FS)
    assert isinstance(r, ExtremeResponse)
    assert r.acceleration_with_damper == pytest.approx(a_x * reduction, rel=1e-9)
    # harmonic motion at f_s: x = a / omega^2 (Chopra, Dynamics of Structures, ch. 3)
    x = a_x * reduction / (2 * math.pi * FS) ** 2
    assert r.displacement == pytest.approx(x, rel=1e-9)
    assert r.stroke == pytest.approx(rel_stroke * x, rel=1e-9)


def test_the_resonant_rule_re_derived_on_a_single_mode():
    # sigma_x^2 = pi S0 / (2 zeta omega^3 m^2), the single oscillator under white noise
    # (D. E. Newland, An Introduction to Random Vibrations, 3rd ed., Longman, 1993): the ratio
    # of the bare structure's variances at two dampings is their inverse ratio
    zeta = 0.06
    ratio = math.sqrt(_bare_variance(zeta) / _bare_variance(ZS))
    assert ratio == pytest.approx(math.sqrt(ZS / zeta), rel=1e-10)
    assert extreme_response(1.0, ZS, zeta, RATIO, FS).acceleration_with_damper == \
        pytest.approx(ratio, rel=1e-10)


def test_the_floor_ordinate_carries_the_occupied_floor_to_the_damper():
    # one mode: a floor at z moves Phi(z) q, Phi(z) = (z/h)^k (EN 1991-1-4 Annex F, F.3)
    h, z_occ, z_d, k = 320.0, 290.0, 310.0, 1.5
    q_amp = 0.8                                              # m, modal coordinate, invented
    w = 2 * math.pi * FS
    a_occ = (z_occ / h) ** k * q_amp * w ** 2               # peak acceleration, occupied
    x_damper = (z_d / h) ** k * q_amp                         # peak displacement at the damper
    phi = power_law_floor_ordinate(z_occ, z_d, k)
    # no damper (zeta_eff = zeta_s): the displacement at the damper's level comes back
    r = extreme_response(a_occ, ZS, ZS, RATIO, FS, phi)
    assert r.acceleration_with_damper == pytest.approx(a_occ, rel=1e-14)
    assert r.displacement == pytest.approx(x_damper, rel=1e-13)
    assert extreme_acceleration_from_displacement(x_damper, FS, phi) == pytest.approx(
        a_occ, rel=1e-13)
    # the power law itself: the height of the building cancels
    assert phi == pytest.approx(((z_occ / h) ** k) / ((z_d / h) ** k), rel=1e-14)
    assert phi == pytest.approx(float(functions.power_law_mode_shape(z_occ, z_d, k)), rel=1e-14)


def test_the_displacement_input_is_the_harmonic_acceleration():
    # x(t) = x0 sin(omega t): the largest |x''| of a sampled cycle, by finite differences
    x0 = 0.42
    w = 2 * math.pi * FS
    t = np.linspace(0.0, 1.0 / FS, 200001)
    acc = np.gradient(np.gradient(x0 * np.sin(w * t), t), t)
    assert extreme_acceleration_from_displacement(x0, FS) == pytest.approx(
        np.max(np.abs(acc[2:-2])), rel=1e-6)


def test_the_service_level_repeats_the_design_chain():
    d = design_damper(frequency=FS, modal_mass=MODAL_MASS, structural_damping=ZS,
                      acceleration=0.25, acceleration_limit=0.15, clearance=1.2)
    c = d.cells
    r = extreme_response(c["acceleration"], c["structural_damping"], c["effective_damping"],
                         c["stroke_ratio"], c["structure_frequency"])
    assert r.acceleration_with_damper == pytest.approx(c["acceleration_with_damper"], rel=1e-14)
    assert r.displacement == pytest.approx(c["structure_displacement"], rel=1e-14)
    assert r.stroke == pytest.approx(c["stroke"], rel=1e-14)
    # linear: three times the input, three times every response
    r3 = extreme_response(3 * c["acceleration"], c["structural_damping"],
                          c["effective_damping"], c["stroke_ratio"], c["structure_frequency"])
    for a, b in zip(r3, r):
        assert a == pytest.approx(3 * b, rel=1e-14)


def test_extreme_response_broadcasts():
    r = extreme_response(np.array([0.3, 0.6]), ZS, ZETA, RATIO, FS, np.array([[1.0], [0.8]]))
    assert r.stroke.shape == (2, 2)
    assert r.stroke[1, 1] == pytest.approx(
        extreme_response(0.6, ZS, ZETA, RATIO, FS, 0.8).stroke, rel=1e-15)


# ---------------------------------------------------------------------------------------------
# swing and detuning
def _exact_frequency_ratio(theta_deg, design_deg):
    """f(theta) / f(theta_0) from T = 4 sqrt(L/g) K(m), m = sin^2(theta/2) (A&S §17.2)."""
    m = math.sin(math.radians(theta_deg) / 2) ** 2
    m0 = math.sin(math.radians(design_deg) / 2) ** 2
    return ellipk(m0) / ellipk(m)


@pytest.mark.parametrize("stroke, length, design", [
    (2.2767, 11.288376, 4.820624), (0.5, 12.0, 0.0), (6.0, 10.0, 20.0), (0.0, 10.0, 5.0),
])
def test_swing_and_detuning_against_the_exact_period(stroke, length, design):
    s = extreme_swing(stroke, length, design)
    assert isinstance(s, ExtremeSwing)
    theta = math.degrees(math.asin(stroke / length))                  # plane trigonometry
    assert s.swing_deg == pytest.approx(theta, rel=1e-14, abs=1e-14)
    assert s.detuning == pytest.approx(_exact_frequency_ratio(theta, design) - 1.0,
                                       rel=1e-10, abs=1e-15)


def test_a_larger_swing_runs_slow():
    s = extreme_swing(3.0, 11.0, 5.0)
    assert s.detuning < 0.0
    assert extreme_swing(0.5, 11.0, 5.0).detuning > 0.0     # smaller than the design swing


def test_a_stroke_beyond_the_pendulum_names_the_argument():
    with pytest.raises(ValueError, match=r"^extreme_stroke=12\.0 must be in \[0, "
                                         r"pendulum_length\] = \[0, 10\] \[m\]"):
        extreme_swing(12.0, 10.0)
    with pytest.raises(ValueError, match=r"^pendulum_length=0\.0 must be in \(0, inf\) \[m\]"):
        extreme_swing(1.0, 0.0)


# ---------------------------------------------------------------------------------------------
# buffers and forces
def _numerical_contact(amplitude, gap, f):
    """Velocity of x = A sin(omega t) where it reaches x = gap, found numerically."""
    w = 2 * math.pi * f
    t_star = brentq(lambda t: amplitude * math.sin(w * t) - gap, 0.0, 0.25 / f, xtol=1e-15)
    h = 1e-6 / f
    return (amplitude * math.sin(w * (t_star + h)) - amplitude * math.sin(w * (t_star - h))) \
        / (2 * h)


@pytest.mark.parametrize("amplitude, gap, f", [
    (2.3, 1.2, 0.15), (1.0, 0.999, 0.2), (0.8, 0.0, 0.12), (3.0, 2.9, 0.5),
])
def test_contact_velocity_against_the_solved_motion(amplitude, gap, f):
    v = _numerical_contact(amplitude, gap, f)
    assert contact_velocity(amplitude, gap, f) == pytest.approx(v, rel=1e-7)
    # energy by the hand formula m v^2 / 2 (kinetic energy)
    m = 287e3
    assert buffer_energy(m, amplitude, gap, f) == pytest.approx(0.5 * m * v * v, rel=2e-7)
    assert buffer_excess(amplitude, gap) == pytest.approx(amplitude - gap, abs=1e-15)


def test_contact_velocity_by_hand():
    # sqrt(2.3^2 - 1.2^2) = sqrt(3.85) = 1.962142; 2 pi 0.15 = 0.942478; product 1.849275
    # (computed by hand to 7 digits)
    assert contact_velocity(2.3, 1.2, 0.15) == pytest.approx(1.849275, abs=1e-6)
    # 287000 * 1.849275^2 / 2 = 490744 J (by hand)
    assert buffer_energy(287e3, 2.3, 1.2, 0.15) == pytest.approx(490744, abs=1.0)


@pytest.mark.parametrize("amplitude, gap", [(0.9, 1.2), (1.2, 1.2), (0.0, 0.0)])
def test_no_contact_within_the_clearance(amplitude, gap):
    assert contact_velocity(amplitude, gap, 0.15) == 0.0
    assert buffer_energy(287e3, amplitude, gap, 0.15) == 0.0
    assert buffer_excess(amplitude, gap) == 0.0


@pytest.mark.parametrize("amplitude, k, c, f", [
    (2.2767, 249092.2, 31856.5, 0.15), (0.5, 1.0e5, 0.0, 0.2), (1.0, 1.0e3, 5.0e4, 0.3),
])
def test_peak_force_against_a_sampled_cycle(amplitude, k, c, f):
    w = 2 * math.pi * f
    t = np.linspace(0.0, 1.0 / f, 400001)
    force = k * amplitude * np.sin(w * t) + c * amplitude * w * np.cos(w * t)
    # sampling a cycle of 400000 steps misses the peak by at most (pi / 4e5)^2 / 2 = 3e-11
    assert peak_damper_force(amplitude, k, c, f) == pytest.approx(np.max(np.abs(force)),
                                                                  rel=1e-10)


# ---------------------------------------------------------------------------------------------
# Melbourne & Palmer (1992)
def _mp(n, r, t=600):
    """The criterion written out with mpmath (Melbourne & Palmer, J. Wind Eng. Ind. Aerodyn.
    41-44 (1992) 105-116; form as quoted in the paper)."""
    mpmath.mp.dps = 30
    n, r, t = mpmath.mpf(n), mpmath.mpf(r), mpmath.mpf(t)
    return float(mpmath.sqrt(2 * mpmath.log(n * t)) * (mpmath.mpf("0.68") + mpmath.log(r) / 5)
                 * mpmath.exp(mpmath.mpf("-3.65") - mpmath.mpf("0.41") * mpmath.log(n)))


def test_melbourne_palmer_by_hand():
    # computed by hand, n = 0.2 Hz, T = 600 s:
    #   ln(120) = 4.787492, sqrt(2 x 4.787492) = 3.094347
    #   exp(-3.65 - 0.41 ln 0.2) = exp(-3.65 + 0.659870) = exp(-2.990130) = 0.050281
    #   R = 1 year:   3.094347 x 0.68     x 0.050281 = 0.10580 m/s^2 (10.8 milli-g)
    #   R = 10 years: 3.094347 x 1.140517 x 0.050281 = 0.17745 m/s^2 (18.1 milli-g)
    assert melbourne_palmer_limit(0.2, 1.0) == pytest.approx(0.10580, abs=1e-5)
    assert melbourne_palmer_limit(0.2, 10.0) == pytest.approx(0.17745, abs=1e-5)


@pytest.mark.parametrize("n", [0.0601, 0.1, 0.2, 0.35, 0.999])
@pytest.mark.parametrize("r", [0.1, 1.0, 5.0, 10.0, 100.0])
def test_melbourne_palmer_against_the_formula(n, r):
    assert melbourne_palmer_limit(n, r) == pytest.approx(_mp(n, r), rel=1e-13)


def test_melbourne_palmer_at_five_years_is_the_peak_of_the_iso_curve():
    # at R = 5 years 0.68 + ln(5)/5 = 1.0019 (the paper's factor is 1 at about 5 years):
    # the limit is the peak factor times the rms curve exp(-3.65 - 0.41 ln n)
    n, t = 0.25, 3600.0
    factor = 0.68 + math.log(5.0) / 5
    want = math.sqrt(2 * math.log(n * t)) * factor * math.exp(-3.65 - 0.41 * math.log(n))
    assert melbourne_palmer_limit(n, 5.0, t) == pytest.approx(want, rel=1e-14)
    assert factor == pytest.approx(1.0, abs=2e-3)


# ---------------------------------------------------------------------------------------------
# bad inputs: the argument, the value and the range
@pytest.mark.parametrize("call, message", [
    (lambda: melbourne_palmer_limit(0.06, 1.0), r"^frequency=0\.06 must be in \(0\.06, 1\) \[Hz\]"),
    (lambda: melbourne_palmer_limit(1.0, 1.0), r"^frequency=1\.0 must be in \(0\.06, 1\) \[Hz\]"),
    (lambda: melbourne_palmer_limit(0.2, 0.05),
     r"^return_period=0\.05 must be in \[0\.1, 100\] \[years\]"),
    (lambda: melbourne_palmer_limit(0.2, 500.0),
     r"^return_period=500\.0 must be in \[0\.1, 100\] \[years\]"),
    (lambda: melbourne_palmer_limit(0.2, 1.0, 10.0),
     r"^frequency\*duration=2\.0 must be in \(e, inf\)"),
    (lambda: melbourne_palmer_limit(0.2, 1.0, -1.0), r"^duration=-1\.0 must be in \(0, inf\)"),
    (lambda: extreme_response(-0.1, ZS, ZETA, RATIO, FS),
     r"^extreme_acceleration=-0\.1 must be in \(0, inf\) \[m/s\^2\]"),
    (lambda: extreme_response(0.5, 1.5, ZETA, RATIO, FS),
     r"^structural_damping=1\.5 must be in \(0, 1\) \[-\]"),
    (lambda: extreme_response(0.5, ZS, 0.0, RATIO, FS),
     r"^effective_damping=0\.0 must be in \(0, 1\) \[-\]"),
    (lambda: extreme_response(0.5, ZS, ZETA, 0.0, FS),
     r"^stroke_ratio=0\.0 must be in \(0, inf\) \[-\]"),
    (lambda: extreme_response(0.5, ZS, ZETA, RATIO, -FS),
     r"^frequency=-0\.15 must be in \(0, inf\) \[Hz\]"),
    (lambda: extreme_response(0.5, ZS, ZETA, RATIO, FS, 0.0),
     r"^floor_ordinate=0\.0 must be in \(0, inf\) \[-\]"),
    (lambda: extreme_response(0.5, ZS, ZETA, RATIO, FS, float("nan")),
     r"^floor_ordinate=nan must be a finite number"),
    (lambda: extreme_response([0.5, 0.6], ZS, ZETA, RATIO, [FS, FS, FS]),
     r"^arrays do not broadcast together: extreme_acceleration\(2,\)"),
    (lambda: extreme_acceleration_from_displacement(0.0, FS),
     r"^displacement_without_damper=0\.0 must be in \(0, inf\) \[m\]"),
    (lambda: extreme_swing(1.0, 10.0, 180.0),
     r"^design_swing_deg=180\.0 must be in \[0, 180\) \[deg\]"),
    (lambda: extreme_swing(-1.0, 10.0), r"^extreme_stroke=-1\.0 must be in \[0, inf\) \[m\]"),
    (lambda: buffer_excess(1.0, -0.1), r"^clearance=-0\.1 must be in \[0, inf\) \[m\]"),
    (lambda: contact_velocity(-1.0, 0.5, FS), r"^stroke=-1\.0 must be in \[0, inf\) \[m\]"),
    (lambda: contact_velocity(1.0, 0.5, 0.0), r"^frequency=0\.0 must be in \(0, inf\) \[Hz\]"),
    (lambda: buffer_energy(0.0, 1.0, 0.5, FS), r"^damper_mass=0\.0 must be in \(0, inf\) \[kg\]"),
    (lambda: peak_damper_force(1.0, 0.0, 1.0, FS),
     r"^stiffness=0\.0 must be in \(0, inf\) \[N/m\]"),
    (lambda: peak_damper_force(1.0, 1.0, -1.0, FS),
     r"^dashpot=-1\.0 must be in \[0, inf\) \[N s/m\]"),
    (lambda: power_law_floor_ordinate(0.0, 300.0, 1.5),
     r"^occupied_height=0\.0 must be in \(0, inf\) \[m\]"),
    (lambda: power_law_floor_ordinate(280.0, -1.0, 1.5),
     r"^damper_height=-1\.0 must be in \(0, inf\) \[m\]"),
    (lambda: power_law_floor_ordinate(280.0, 300.0, 0.0),
     r"^exponent=0\.0 must be in \(0, inf\) \[-\]"),
])
def test_bad_inputs_name_the_argument_value_and_range(call, message):
    with pytest.raises(ValueError, match=message):
        call()


def test_declared_ranges():
    # the paper's frequency range (0.06 to 1 Hz) and the practical return periods
    assert MELBOURNE_PALMER_FREQUENCIES == (0.06, 1.0)
    assert RETURN_PERIODS == (0.1, 100.0)
    # the return-period factor stays positive over the accepted range
    assert 0.68 + math.log(RETURN_PERIODS[0]) / 5 > 0


# ---------------------------------------------------------------------------------------------
# worksheet twins
EXTREME_INPUTS = {"extreme_acceleration": 0.62, "floor_ordinate": 0.93, "return_period": 1.0}
ORDER = ("extreme_acceleration_with_damper", "extreme_displacement", "extreme_stroke",
         "extreme_swing_deg", "buffer_excess", "contact_velocity", "buffer_energy",
         "extreme_damper_force", "comfort_limit_mp")


def _named_workbook(values: dict[str, float], formulas: dict[str, str] | None = None):
    """A sheet V with each value, then each formula, in column B under its defined name;
    returns the workbook and the cell of each formula."""
    wb = Workbook()
    ws = wb.active
    ws.title = "V"
    where = {}
    rows = [(n, float(v)) for n, v in values.items()] + list((formulas or {}).items())
    for row, (name, content) in enumerate(rows, start=1):
        ws.cell(row, 1, name)
        ws.cell(row, 2, content)
        wb.defined_names.add(DefinedName(name, attr_text=f"V!$B${row}"))
        where[name] = f"B{row}"
    return wb, where


def _evaluate(formula: str, values: dict[str, float]):
    """Evaluate a formula over defined names holding ``values`` (workbook_builder's
    evaluator, itself checked against LibreOffice and Gnumeric in the spreadsheet tests)."""
    wb, _ = _named_workbook(values)
    return Evaluator(wb).evaluate(formula, "V")


def _design(clearance=1.2, acceleration=0.25, limit=0.15, frequency=FS):
    return design_damper(frequency=frequency, modal_mass=MODAL_MASS, structural_damping=ZS,
                         acceleration=acceleration, acceleration_limit=limit,
                         clearance=clearance).cells


def _engine(c: dict[str, float], extreme: dict[str, float]) -> dict[str, float]:
    """Every result by the public numpy functions, from the design's cells."""
    r = extreme_response(extreme["extreme_acceleration"], c["structural_damping"],
                         c["effective_damping"], c["stroke_ratio"], c["structure_frequency"],
                         extreme["floor_ordinate"])
    fs = c["structure_frequency"]
    return {
        "extreme_acceleration_with_damper": r.acceleration_with_damper,
        "extreme_displacement": r.displacement, "extreme_stroke": r.stroke,
        "extreme_swing_deg": extreme_swing(r.stroke, c["pendulum_length"]).swing_deg,
        "buffer_excess": buffer_excess(r.stroke, c["clearance"]),
        "contact_velocity": contact_velocity(r.stroke, c["clearance"], fs),
        "buffer_energy": buffer_energy(c["damper_mass"], r.stroke, c["clearance"], fs),
        "extreme_damper_force": peak_damper_force(r.stroke, c["stiffness"], c["dashpot"], fs),
        "comfort_limit_mp": melbourne_palmer_limit(fs, extreme["return_period"]),
    }


def test_level_forms_are_the_listed_results_over_the_chain_names():
    assert tuple(LEVEL_FORMS) == ORDER
    known = set(_design()) | set(EXTREME_INPUTS)
    for name in ORDER:
        form = form_of(LEVEL_FORMS[name])
        assert form is not None and form.expression and form.source, name
        check_formula(form.formula)                 # the allow-list of Excel and LibreOffice
        assert set(form.names) <= known, (name, set(form.names) - known)
        known.add(name)                              # later forms may read earlier results
    assert LEVEL_FORMS["extreme_acceleration_with_damper"].worksheet.formula == \
        "=extreme_acceleration*SQRT(structural_damping/effective_damping)"
    assert LEVEL_FORMS["extreme_swing_deg"].worksheet.formula == \
        "=DEGREES(ASIN(extreme_stroke/pendulum_length))"


@pytest.mark.parametrize("clearance, acceleration, extreme_factor", [
    (1.2, 0.25, 2.48),       # stroke beyond the clearance: contact
    (4.0, 0.25, 1.6),        # within the clearance: no contact
    (1.0, 0.30, 3.0),
])
def test_every_level_formula_equals_the_engine(clearance, acceleration, extreme_factor):
    cells = dict(_design(clearance, acceleration))
    extreme = dict(EXTREME_INPUTS, extreme_acceleration=extreme_factor * acceleration)
    cells.update(extreme)
    want = _engine(cells, extreme)
    for name in ORDER:
        twin = LEVEL_FORMS[name]
        got = _evaluate(twin.worksheet.formula, {n: cells[n] for n in twin.worksheet.names})
        numpy_value = float(twin(**{n: cells[n] for n in twin.worksheet.names}))
        assert isinstance(got, float), (name, got)
        for value in (got, numpy_value):
            assert value == pytest.approx(want[name], rel=1e-13, abs=1e-12), name
        cells[name] = got
    assert (want["contact_velocity"] > 0) == (want["extreme_stroke"] > clearance)


def _spreadsheet_rows():
    """A workbook with the design's cells and the extreme inputs as defined names, and every
    level formula below them."""
    cells = dict(_design())
    cells.update(EXTREME_INPUTS)
    want = _engine(cells, EXTREME_INPUTS)
    wb, where = _named_workbook(cells, {n: LEVEL_FORMS[n].worksheet.formula for n in ORDER})
    return wb, where, want


@pytest.mark.parametrize("application", [
    pytest.param("libreoffice", marks=pytest.mark.skipif(
        libreoffice.find_soffice() is None, reason="LibreOffice (soffice) is not installed")),
    pytest.param("gnumeric", marks=[
        pytest.mark.skipif(gnumeric.find_ssconvert() is None,
                           reason="Gnumeric (ssconvert) is not installed"),
        # openpyxl reading Gnumeric's file, as in tests/test_xlsx_gnumeric.py
        pytest.mark.filterwarnings("ignore:Workbook contains no default style:UserWarning")]),
])
def test_level_formulas_in_a_real_spreadsheet(application, tmp_path):
    # the reference: LibreOffice or Gnumeric recalculating the formulas themselves
    wb, where, want = _spreadsheet_rows()
    path = tmp_path / "levels.xlsx"
    wb.save(path)
    module = libreoffice if application == "libreoffice" else gnumeric
    out = module.recalculate(path, tmp_path / "out")
    values = libreoffice.read_values(out)
    for name in ORDER:
        got = values[("V", where[name])]
        assert isinstance(got, (int, float)), (name, got)
        assert got == pytest.approx(want[name], rel=1e-12, abs=1e-12), name
