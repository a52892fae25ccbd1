# SPDX-License-Identifier: MIT
"""Chart tables of the Charts and Nonlinear sheets against independent references."""
from __future__ import annotations

import math
import types

import numpy as np
import pytest
from scipy.special import ellipk

from functions import damper
from functions.damper import effective_damping
from functions.design import design_tuning
from workbook_builder.plan import charts


def standin(mu=0.02, zs=0.01, method="h2", swing=9.0, required=0.035):
    """An object with DesignResult's attribute names, filled from engine calls."""
    f, zd = damper.optimal_tuning(mu, method, 0.0 if method in damper.CLOSED_FORM_METHODS else zs)
    inputs = types.SimpleNamespace(frequency=0.2, structural_damping=zs, tuning_method=method,
                                   mass_ratio_min=0.005, mass_ratio_max=0.05, max_swing_deg=15.0)
    return types.SimpleNamespace(inputs=inputs, mass_ratio=mu, tuning_ratio=f, damper_damping=zd,
                                 swing_angle_deg=swing, required_damping=required,
                                 effective_damping=damper.effective_damping(mu, f, zd, zs),
                                 parts=())


def _design_result(method="h2"):
    design = pytest.importorskip("functions.design")
    return design.design_damper(frequency=0.2, modal_mass=2.0e7, structural_damping=0.01,
                                acceleration=0.25, acceleration_limit=0.15, clearance=1.5,
                                tuning_method=method)


@pytest.fixture(scope="module")
def tables():
    return charts.chart_tables(standin())


def test_period_table_against_elliptic_integral(tables):
    # T/T0 = (2/pi) K(m), m = sin^2(theta0/2): Abramowitz & Stegun (1964) 17.2 (parameter m);
    # reference values from scipy.special.ellipk.
    rows = tables["period"].rows
    assert rows[0][0] == 0.0 and rows[-1][0] == 60.0 and len(rows) == 31
    for amp, exact, small in rows:
        ref = 2 / math.pi * ellipk(math.sin(math.radians(amp) / 2) ** 2)
        assert exact == pytest.approx(ref, rel=1e-12)
        assert small == 1.0
    # 60 deg: T/T0 = 1.0732 (computed: scipy.special.ellipk, the AGM).
    assert rows[-1][1] == pytest.approx(1.0731820071493643, rel=1e-12)


def test_period_marks(tables):
    marks = tables["period_marks"].rows
    # 15 deg rule of thumb: common practice, no source; error there about 0.43 % (computed).
    assert marks[0][1] == marks[1][1] == charts.RULE_OF_THUMB_DEG == 15.0
    assert marks[2][1] == 9.0
    assert marks[2][2] == pytest.approx(2 / math.pi * ellipk(math.sin(math.radians(4.5)) ** 2),
                                        rel=1e-12)


def test_amplitude_range_extends_to_design_swing():
    t = charts.chart_tables(standin(swing=71.0))
    assert t["period"].rows[-1][0] >= 76.0


def _two_dof_amplification(r, mu, f, zd, zs):
    """|x_s| / (F/k_s) from the 2-DOF equations solved directly (independent of the engine).

    Structure mass 1, stiffness 1, damping 2 zs; damper mass mu, stiffness mu f^2, damping
    2 mu zd f (time in 1/omega_s). Den Hartog, Mechanical Vibrations (1956), §3.3 set-up.
    """
    w = r
    k = np.array([[1 + mu * f * f, -mu * f * f], [-mu * f * f, mu * f * f]])
    cd = 2 * mu * zd * f
    c = np.array([[2 * zs + cd, -cd], [-cd, cd]])
    m = np.diag([1.0, mu])
    x = np.linalg.solve(k + 1j * w * c - w * w * m, np.array([1.0, 0.0]))
    return abs(x[0])


def test_response_table_against_direct_solution(tables):
    res = standin()
    for r, bare, with_damper in tables["response"].rows:
        # SDOF: 1 / sqrt((1 - r^2)^2 + (2 zeta r)^2) (Den Hartog 1956, §2.4; textbook).
        assert bare == pytest.approx(1 / math.hypot(1 - r * r, 2 * 0.01 * r), rel=1e-12)
        assert with_damper == pytest.approx(
            _two_dof_amplification(r, res.mass_ratio, res.tuning_ratio, res.damper_damping, 0.01),
            rel=1e-9)
    at_one = [row for row in tables["response"].rows if abs(row[0] - 1.0) < 1e-12][0]
    assert at_one[1] == pytest.approx(50.0, rel=1e-12)          # 1 / (2 zeta_s), zeta_s = 1 %
    assert max(row[2] for row in tables["response"].rows) < 12  # damper removes the peak


def test_damping_table(tables):
    rows = tables["damping"].rows
    assert rows[0][0] == pytest.approx(0.005) and rows[-1][0] == pytest.approx(0.05)
    res = standin()
    for mu, f, zd, zeff in rows:
        f_ref, zd_ref = damper.optimal_tuning(mu, "h2", 0.01)
        assert (f, zd) == pytest.approx((f_ref, zd_ref), rel=1e-12)
        assert zeff == pytest.approx(damper.effective_damping(mu, f_ref, zd_ref, 0.01), rel=1e-12)
    design_row = [row for row in rows if abs(row[0] - 0.02) < 1e-12][0]
    assert design_row[3] == pytest.approx(res.effective_damping, rel=1e-9)
    marks = tables["damping_marks"].rows
    assert marks[0][2] == marks[1][2] == 0.035 and marks[2][1:] == (0.02, res.effective_damping)


def test_effective_damping_nearly_undamped_structure_sqrt_mu_over_4():
    # zeta_eff ~ sqrt(mu)/4 for an optimal damper on an undamped structure (McNamara, J. Struct.
    # Div. ASCE 103, 1977; Luft, J. Struct. Div. ASCE 105, 1979; from memory): within 1 % here
    # (structural damping 1e-6: the response column needs a finite resonance).
    t = charts.chart_tables(standin(zs=1e-6, method="white_noise_force"))
    for mu, _, _, zeff in t["damping"].rows:
        assert zeff == pytest.approx(math.sqrt(mu) / 4, rel=0.01)


def test_mass_ratio_range_extends_to_design():
    t = charts.chart_tables(standin(mu=0.08))
    assert t["damping"].rows[-1][0] == pytest.approx(0.08)


def test_a_practical_range_starting_at_zero_starts_the_axis_above_zero():
    res = standin()
    res.inputs.mass_ratio_min = 0.0
    rows = charts.chart_tables(res)["damping"].rows
    assert rows[0][0] == pytest.approx(0.05 / 100) and rows[-1][0] == pytest.approx(0.05)


def test_table_sizes_are_fixed():
    for swing in (1.0, 30.0, 80.0):
        t = charts.chart_tables(standin(swing=swing))
        assert [len(t[k].rows) for k in t] == [t[k].spec.rows for k in t] == [31, 3, 81, 19, 3]
        assert "band" not in t                  # only with a frequency band


@pytest.mark.parametrize("method", ["h2", "hinf", "den_hartog", "white_noise_force"])
def test_with_engine_design_result(method):
    result = _design_result(method)
    t = charts.chart_tables(result)
    design_mark = t["damping_marks"].rows[2]
    assert design_mark[1:] == (pytest.approx(result.mass_ratio), pytest.approx(
        result.effective_damping))
    # The curve of optimal dampers passes through the design point (same tuning method).
    f, zd = design_tuning(result.mass_ratio, result.inputs.tuning_method,
                          result.inputs.structural_damping)
    curve = effective_damping(result.mass_ratio, f, zd, result.inputs.structural_damping)
    assert curve == pytest.approx(result.effective_damping, rel=1e-6)


# ----------------------------------------------------------------------------- time histories
@pytest.fixture(scope="module")
def simulated():
    sim_mod = pytest.importorskip("functions.simulation")
    # invented demo data: 0.2 Hz mode, 2 % damper on a 6 m hanger, resonant harmonic force
    return sim_mod.simulate(1e6, 0.2, 0.01, 2e4, 6.0, 0.07, sim_mod.HarmonicForce(4e4, 0.2),
                            300.0)


def test_time_history_table_subsamples_the_record(simulated):
    """Exactly max_points rows spread evenly over the record (indices rounded from a linear
    spacing, our own rule), each row the samples of that instant to 6 significant digits."""
    n = simulated.time.size
    t = charts.time_history_table(simulated, max_points=500)
    assert len(t.rows) == 500 < n
    picks = np.round(np.linspace(0, n - 1, 500)).astype(int)
    for k in (0, 1, 250, len(t.rows) - 1):
        i = picks[k]
        want = (simulated.time[i], simulated.without_damper.acceleration[i],
                simulated.nonlinear.acceleration[i], simulated.nonlinear.angle_deg[i],
                simulated.linear.angle_deg[i])
        assert t.rows[k] == pytest.approx(want, rel=5e-6, abs=1e-12)   # 6 significant digits
    assert t.rows[-1][0] == pytest.approx(simulated.time[-1], rel=5e-6)
    full = charts.time_history_table(simulated, max_points=n)
    assert len(full.rows) == n and full.spec.title == "Time histories"
    assert len(charts.time_history_table(simulated, max_points=10 * n).rows) == n
    with pytest.raises(ValueError, match=r"max_points=1 must be >= 2"):
        charts.time_history_table(simulated, max_points=1)


def test_swing_window_table_is_centred_on_the_peak_swing(simulated):
    """``rows`` consecutive output samples around the largest exact swing (our own rule)."""
    t = charts.swing_window_table(simulated, rows=101)
    rows = t.rows
    assert len(rows) == 101
    assert rows[-1][0] - rows[0][0] == pytest.approx(100 * simulated.time_step, rel=1e-4)
    i0 = int(round(rows[0][0] / simulated.time_step))
    for k, (time, exact, linear) in enumerate(rows):
        assert time == pytest.approx(simulated.time[i0 + k], rel=5e-6, abs=1e-9)
        assert exact == pytest.approx(simulated.nonlinear.angle_deg[i0 + k], rel=5e-6, abs=1e-12)
        assert linear == pytest.approx(simulated.linear.angle_deg[i0 + k], rel=5e-6, abs=1e-12)
    assert max(abs(r[1]) for r in rows) == pytest.approx(simulated.nonlinear.swing_deg, rel=5e-6)
    peak = int(np.argmax(np.abs(simulated.nonlinear.angle_deg)))
    assert abs((i0 + 50) - peak) <= 1 or i0 == 0 or i0 + 101 == simulated.time.size
    assert len(charts.swing_window_table(simulated).rows) == min(charts.WINDOW_ROWS,
                                                                 simulated.time.size)
    with pytest.raises(ValueError, match=r"rows=1 must be >= 2"):
        charts.swing_window_table(simulated, rows=1)


# ----------------------------------------------------------------------------- frequency band
def test_band_table_against_an_independent_variance():
    """The band chart's accelerations against the white-noise displacement variances of the
    detuned 2-DOF system from the state equations (scipy Lyapunov solver; Soong & Grigoriu,
    Random Vibration of Mechanical and Structural Systems, 1993): a_d(r) = a sqrt(sigma^2 with
    the damper / sigma^2 without) at the actual frequency r f_s, the design chain's resonant
    rule (EN 1991-1-4:2005, B.2(6)); the damper keeps its own frequency f f_s, so the tuning
    ratio to the actual building is f / r."""
    from functions.design import design_damper
    from damper_references import lyapunov_variances

    # invented demo case: 0.15 Hz mode, 1.5 % damping, 0.25 -> 0.15 m/s^2, +-12 % band
    r = design_damper(frequency=0.15, modal_mass=2.0e7, structural_damping=0.015,
                      acceleration=0.25, acceleration_limit=0.15, clearance=1.2,
                      band_lower=0.88, band_upper=1.12)
    t = charts.chart_tables(r)
    rows = t["band"].rows
    assert len(rows) == t["band"].spec.rows == charts.BAND_POINTS
    assert rows[0][0] == pytest.approx(0.88) and rows[-1][0] == pytest.approx(1.12)
    zs = 0.015
    for factor, nominal, robust, limit, zeta in rows[::8]:
        assert limit == 0.15
        # effective damping: equal displacement variance of a single oscillator, pi / (2 zeta)
        with_damper, _ = lyapunov_variances(r.mass_ratio, r.tuning_ratio / factor,
                                            r.damper_damping, zs)
        assert zeta == pytest.approx(np.pi / (2.0 * with_damper), rel=1e-9)
        for (f, zd), value in (((r.tuning_ratio, r.damper_damping), nominal),
                               ((r.cells["robust_tuning_ratio"],
                                 r.cells["robust_damper_damping"]), robust)):
            with_damper, _ = lyapunov_variances(r.mass_ratio, f / factor, zd, zs)
            bare = np.pi / (2.0 * zs)             # single oscillator, omega_s = 1, s0 = 1
            assert value == pytest.approx(0.25 * math.sqrt(with_damper / bare), rel=1e-9)
    # the worst case of the table is that of the calculation, which is the larger end here
    worst = max(row[1] for row in rows)
    assert worst == pytest.approx(r.cells["band_worst_acceleration"], rel=1e-9)
    # the robust tuning lowers the worst case over the band
    assert max(row[2] for row in rows) < worst
